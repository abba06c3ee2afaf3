"""Column generation over stack paths: a strong bound and good schedules when types are counted.

The compact integer program (:mod:`optimizer.schedule.ip`) has one binary per (cell,
type) and its relaxation lets a stack split itself fractionally over many
types. Here the same problem is written over whole stack *paths* (Dantzig-Wolfe
decomposition): a path is one buildable schedule of one unit (a stack, a group
of stacks sharing types, or identical stacks merged into one with a
multiplicity) in one orientation. The master problem chooses one path per unit
and the types (sections, grades) the chosen paths use::

    min  sum_P c_P lam_P + f sum_t y_t (+ sections)
    s.t. sum_{P of u} lam_P = 1                       for every unit u      (alpha_u)
         sum_{P of u, P uses t} lam_P - y_t <= 0      for every unit u, type t  (-pi_ut)
         sum_t y_t <= K                               (when capped)
         lam, y binary

The linking row is per unit and type, not per cell and type: a path that uses
a type uses it once. Its linear relaxation is at least as strong as the
compact one and in practice much stronger, since each unit's part of it is
the convex hull of that unit's paths.

Paths are generated as they are needed: the pricing problem of a unit is its
shortest path through the layered graph with the cost of entering type t
raised by pi_ut (:mod:`optimizer.schedule.stackdp`). Any dual values give a valid lower
bound (Lasdon): the master's value plus every unit's most negative reduced
cost. The same bound prunes candidates: a row whose cheapest path exceeds the
best path of its unit by more than (incumbent - bound) lies in no schedule
better than the incumbent.

Schedules come from the master with binary variables over the generated paths
(HiGHS or CBC), improved by re-routing every unit over the chosen type set and
by dropping and adding single types, each step an exact shortest path.

Valid when every monotone rule is on (a path then uses each type in one
contiguous run, so charging on entry counts a type once) and no cap on grade
changes per stack is set; :func:`applicable` says why not otherwise.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, replace

import numpy as np

from optimizer.schedule import stackdp
from optimizer.schedule.heuristic import _Prepared, _run_states, figures, group_problems, stack_chains, transition
from optimizer.schedule.problem import Schedule, ScheduleProblem

__all__ = ["applicable", "PathModel", "solve_paths", "min_counts"]


def applicable(problem: ScheduleProblem) -> str | None:
    """Why the path formulation cannot be used for this problem (None when it can)."""
    r = problem.rules
    if not (r.monotone_sections and r.monotone_bars and r.monotone_grade):
        return "a monotone rule is off: a stack could use a type twice, so types cannot be charged on entry"
    if r.max_grade_changes is not None:
        return "a cap on grade changes per stack is a resource inside each path"
    if group_problems(problem, stack_chains(problem)):
        return "a group of stacks with different storeys"
    return None


@dataclass
class _Chain:
    """One unit in one orientation: rows storey by storey (see :mod:`optimizer.schedule.stackdp`)."""

    unit: int
    orient: int
    off: np.ndarray
    typ: np.ndarray
    w: np.ndarray
    st: np.ndarray
    cands: np.ndarray  # (n_rows, n_stacks) candidate of each stack of the unit


@dataclass(frozen=True)
class _Column:
    """A generated path: its unit, its candidates (levels x stacks), true cost, types and grades used."""

    unit: int
    cands: np.ndarray
    cost: float
    types: tuple[int, ...]
    grades: tuple[int, ...]


class PathModel:
    """Units, chains and the type tables of a problem, ready for pricing.

    Identical stacks (same candidates, weights and storey heights, not grouped or
    pinned) are merged into one unit with their count as multiplicity.
    """

    def __init__(self, problem: ScheduleProblem) -> None:
        from optimizer.schedule.ip import _stack_signature

        p = problem
        self.problem = p
        prep = _Prepared(p)
        self.prep = prep
        t_ = p.types
        n_t = len(t_)
        all_t = np.arange(n_t)
        ok, big = transition(p, all_t, all_t)  # [lower, upper]
        self.ok_lo = np.ascontiguousarray(ok)
        self.big_lo = np.ascontiguousarray(big)
        self.ok_up = np.ascontiguousarray(ok.T)
        self.big_up = np.ascontiguousarray(big.T)
        self.sec = np.asarray(t_.section, dtype=np.int64)
        grades, gid = np.unique(np.asarray(t_.fck, dtype=float), return_inverse=True)
        self.grades = grades
        self.gid = gid.astype(np.int64)
        self.m = _run_states(p)
        # merge identical stacks
        grouped = {g for grp in p.rules.groups for g in grp}
        seen: dict[bytes, int] = {}
        self.mult: dict[int, int] = {}  # unit index -> multiplicity
        self.copies: dict[int, list[int]] = {}  # unit index -> stacks it stands for (besides its own)
        unit_of_stack = {u.stacks[0]: ui for ui, u in enumerate(prep.units) if len(u.stacks) == 1}
        for ui, u in enumerate(prep.units):
            self.mult[ui] = 1
            self.copies[ui] = []
            if len(u.stacks) != 1 or p.stack_names[u.stacks[0]] in grouped:
                continue
            sig = _stack_signature(prep, u.stacks[0])
            if sig is None:
                continue
            if sig in seen:
                rep = unit_of_stack[seen[sig]]
                self.mult[rep] += 1
                self.copies[rep].append(u.stacks[0])
                self.mult[ui] = 0
            else:
                seen[sig] = u.stacks[0]
        self.units = [ui for ui in range(len(prep.units)) if self.mult[ui] > 0]
        self.chains: dict[int, list[_Chain]] = {}
        for ui in self.units:
            unit = prep.units[ui]
            self.chains[ui] = [self._chain(ui, o, levels) for o, levels in unit.orients.items()]
        self.weight = prep.weight
        # how many units can use each type (each grade): the split of an unopened type's price among them
        self.avail: dict[int, np.ndarray] = {}  # unit -> types it can use (bool)
        self.gavail: dict[int, np.ndarray] = {}  # unit -> grades it can use (bool)
        for ui in self.units:
            ts = np.unique(np.concatenate([ch.typ for ch in self.chains[ui]] + [np.zeros(0, dtype=np.int64)]))
            self.avail[ui] = np.zeros(n_t, dtype=bool)
            self.avail[ui][ts] = True
            self.gavail[ui] = np.zeros(len(grades), dtype=bool)
            self.gavail[ui][np.unique(self.gid[ts])] = True
        self.type_count = np.maximum(np.sum(list(self.avail.values()), axis=0), 1) if self.units else np.ones(n_t)
        self.grade_count = (np.maximum(np.sum(list(self.gavail.values()), axis=0), 1) if self.units
                            else np.ones(len(grades)))

    def _chain(self, ui: int, o: int, levels: list) -> _Chain:  # noqa: ANN001
        mult = self.mult[ui]
        sizes = np.array([len(lv.types) for lv in levels], dtype=np.int64)
        off = np.zeros(len(levels) + 1, dtype=np.int64)
        np.cumsum(sizes, out=off[1:])
        typ = np.concatenate([lv.types for lv in levels]).astype(np.int64)
        w = np.concatenate([lv.weight for lv in levels]).astype(float) * mult
        st = np.concatenate([lv.starter for lv in levels]).astype(float) * mult
        cands = np.concatenate([lv.cands for lv in levels], axis=0)
        return _Chain(ui, o, off, typ, w, st, cands)

    @property
    def n_rows(self) -> int:
        """Rows (candidates) left in all chains."""
        return int(sum(len(ch.typ) for chs in self.chains.values() for ch in chs))

    def price(self, ui: int, pen: np.ndarray, gpen: np.ndarray, weights: bool = True) -> tuple[float, _Column | None]:
        """Cheapest penalised path of a unit over its orientations, as a column (None when there is none).

        With ``weights=False`` the paths cost only their penalties (phase one: finding paths that keep the caps).
        """
        best: tuple[float, _Chain | None, np.ndarray | None] = (np.inf, None, None)
        for ch in self.chains[ui]:
            if len(ch.typ) == 0:
                continue
            w, st = (ch.w, ch.st) if weights else (np.zeros_like(ch.w), np.zeros_like(ch.st))
            f, back, bs = stackdp.forward(ch.off, ch.typ, w, st, self.ok_up, self.big_up, self.sec, self.gid,
                                          pen, gpen, self.m)
            val, rows = stackdp.trace(ch.off, f, back, bs)
            if rows is not None and val < best[0]:
                best = (val, ch, rows)
        val, ch, rows = best
        if ch is None or rows is None:
            return np.inf, None
        return val, self.column(ch, rows)

    def column(self, ch: _Chain, rows: np.ndarray) -> _Column:
        """The column of a path (rows of a chain, one per storey)."""
        typ = ch.typ[rows]
        cost = float(ch.w[rows].sum())
        if len(rows) > 1:
            big = self.big_up[typ[1:], typ[:-1]]
            cost += float(ch.st[rows[1:]][big].sum())
        return _Column(ch.unit, ch.cands[rows], cost, tuple(np.unique(typ).tolist()),
                       tuple(np.unique(self.gid[typ]).tolist()))

    def column_of(self, ui: int, cand: np.ndarray) -> _Column | None:
        """The column of a unit's part of a full schedule.

        None if a candidate was pruned away, or if two storeys of the path break a continuity rule of the
        type tables (e.g. a warm start made under other rules).
        """
        unit = self.prep.units[ui]
        first = cand[unit.cells[:, 0]]
        o = int(self.problem.cand_orient[first[0]])
        ch = next((c for c in self.chains[ui] if c.orient == o), None)
        if ch is None:
            return None
        rows = np.empty(len(first), dtype=np.int64)
        for i, k in enumerate(first):
            seg = ch.cands[ch.off[i]:ch.off[i + 1], 0]
            hit = np.flatnonzero(seg == k)
            if len(hit) == 0:
                return None
            rows[i] = ch.off[i] + hit[0]
        typ = ch.typ[rows]
        if not self.ok_lo[typ[:-1], typ[1:]].all():
            return None
        return self.column(ch, rows)

    def through(self, ui: int, pen: np.ndarray, gpen: np.ndarray) -> tuple[float, list[np.ndarray]]:
        """The unit's cheapest penalised path (exact) and, per chain, a lower bound on the cheapest through each row.

        The bound through a row is the exact cheapest way up to it (with run states) plus the cheapest way on
        to the top with the minimum run relaxed. The exact cheapest path must come from the run-state values,
        not from the minimum of these bounds, which can be lower.
        """
        out = []
        best = np.inf
        for ch in self.chains[ui]:
            if len(ch.typ) == 0:
                out.append(np.zeros(0))
                continue
            f, _, _ = stackdp.forward(ch.off, ch.typ, ch.w, ch.st, self.ok_up, self.big_up, self.sec, self.gid,
                                      pen, gpen, self.m)
            top = f[ch.off[-2]:ch.off[-1]]
            if top.size:
                best = min(best, float(top.min()))
            b = stackdp.backward(ch.off, ch.typ, ch.w, ch.st, self.ok_lo, self.big_lo, self.gid, pen, gpen)
            out.append(f.min(axis=1) + b - ch.w)
        return best, out

    def prune(self, ui: int, keep: list[np.ndarray]) -> None:
        """Keep only the marked rows of each chain of a unit."""
        new = []
        for ch, k in zip(self.chains[ui], keep, strict=True):
            lv = np.repeat(np.arange(len(ch.off) - 1), np.diff(ch.off))[k]
            off = np.zeros(len(ch.off), dtype=np.int64)
            np.cumsum(np.bincount(lv, minlength=len(ch.off) - 1), out=off[1:])
            new.append(_Chain(ch.unit, ch.orient, off, ch.typ[k], ch.w[k], ch.st[k], ch.cands[k]))
        self.chains[ui] = new

    def assemble(self, columns: dict[int, _Column]) -> np.ndarray:
        """Candidate per cell of a schedule made of one column per unit (merged stacks copy their unit)."""
        p = self.problem
        cand = np.full(p.n_cells, -1, dtype=np.int64)
        for ui, col in columns.items():
            unit = self.prep.units[ui]
            cand[unit.cells.ravel()] = col.cands.ravel()
            for s in self.copies[ui]:
                for c_rep, c in zip(unit.cells[:, 0], self.prep.chains[s], strict=True):
                    k0 = cand[c_rep]
                    ks = self.prep.cell_cands(int(c), int(p.cand_orient[k0]))
                    cand[c] = int(ks[p.cand_type[ks] == p.cand_type[k0]][0])
        return cand


# --------------------------------------------------------------------------------------------
# the master problem
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Counting:
    """What couples the units: counted types, sections and grades, with caps and prices."""

    types: bool
    sections: bool
    grades: bool
    cap_t: int | None
    cap_s: int | None
    cap_g: int | None
    price_t: float
    price_s: float

    @classmethod
    def of(cls, problem: ScheduleProblem, max_types: int | None) -> _Counting:
        r = problem.rules
        cap_t = max_types if max_types is not None else r.max_types
        secs = r.max_sections is not None or r.price_per_section > 0
        types = cap_t is not None or r.price_per_type > 0 or secs
        return cls(types, secs, r.max_grades is not None, cap_t, r.max_sections, r.max_grades,
                   float(r.price_per_type), float(r.price_per_section))

    def price_of(self, problem: ScheduleProblem, types: set[int]) -> float:
        """Prices of a set of types and of their sections."""
        n_s = len({int(problem.types.section[t]) for t in types})
        return self.price_t * len(types) * self.types + self.price_s * n_s * self.sections

    def allows(self, problem: ScheduleProblem, types: set[int]) -> bool:
        """Whether a set of types keeps the caps."""
        t_ = problem.types
        if self.cap_t is not None and len(types) > self.cap_t:
            return False
        if self.cap_s is not None and len({int(t_.section[t]) for t in types}) > self.cap_s:
            return False
        return not (self.cap_g is not None and len({float(t_.fck[t]) for t in types}) > self.cap_g)


@dataclass
class _MasterRows:
    conv: dict[int, int]
    link: dict[tuple[int, int], int]
    glink: dict[tuple[int, int], int]
    lam: list[int]
    y: dict[int, int]
    art: int | None = None
    cap_t: int | None = None  # row of the type cap
    cap_s: int | None = None  # row of the section cap
    cap_g: int | None = None  # row of the grade cap
    sec: dict[int, int] | None = None  # section id -> column
    grade: dict[int, int] | None = None  # grade id -> column


class _Master:
    """The generated columns and the master problem over them."""

    def __init__(self, model: PathModel, counting: _Counting, big_m: float) -> None:
        self.model = model
        self.counting = counting
        self.big_m = big_m
        self.columns: list[_Column] = []
        self._seen: set[tuple[int, bytes]] = set()
        self.phase_one = False  # costs 0 on paths and prices, 1 on the cap slack

    def add(self, col: _Column) -> bool:
        key = (col.unit, col.cands.tobytes())
        if key in self._seen:
            return False
        self._seen.add(key)
        self.columns.append(col)
        return True

    def formulation(self, integer: bool):  # noqa: ANN201 - (Formulation, _MasterRows)
        from optimizer.schedule.ip import Reduction, _Builder

        p = self.model.problem
        cnt = self.counting
        bld = _Builder()
        rows = _MasterRows({}, {}, {}, [], {})
        by_unit: dict[int, list[int]] = {}
        one = 0.0 if self.phase_one else 1.0
        for i, col in enumerate(self.columns):
            rows.lam.append(bld.col(f"path_u{col.unit}_{i}", ("lam", i), cost=col.cost * one, integer=integer))
            by_unit.setdefault(col.unit, []).append(i)
        art = None
        if not integer and (cnt.cap_t is not None or cnt.cap_s is not None or cnt.cap_g is not None):
            art = bld.col("cap_slack", ("art",), ub=np.inf, integer=False,
                          cost=1.0 if self.phase_one else self.big_m)
            rows.art = art
        for u, idx in by_unit.items():
            rows.conv[u] = len(bld.r_name)
            bld.row(f"one_path_u{u}", [rows.lam[i] for i in idx], np.ones(len(idx)), 1.0, 1.0)
        if cnt.types:
            used = sorted({t for col in self.columns for t in col.types})
            for t in used:
                rows.y[t] = bld.col(f"y_t{t}", ("y", t), cost=cnt.price_t * one, integer=integer)
            for u, idx in by_unit.items():
                users: dict[int, list[int]] = {}
                for i in idx:
                    for t in self.columns[i].types:
                        users.setdefault(t, []).append(rows.lam[i])
                for t, lams in users.items():
                    rows.link[(u, t)] = len(bld.r_name)
                    bld.row(f"link_u{u}_t{t}", lams + [rows.y[t]], [1.0] * len(lams) + [-1.0], -np.inf, 0.0)
            if cnt.cap_t is not None:
                extra = [art] if art is not None else []
                rows.cap_t = len(bld.r_name)
                bld.row("cap_types", [rows.y[t] for t in used] + extra, [1.0] * len(used) + [-1.0] * len(extra),
                        -np.inf, float(cnt.cap_t))
            if cnt.sections:
                sec = p.types.section
                s_col = {int(s): bld.col(f"section_{int(s)}", ("sec", int(s)), cost=cnt.price_s * one, integer=integer)
                         for s in np.unique(sec[used])} if used else {}
                rows.sec = s_col
                for t in used:
                    bld.row(f"section_link_t{t}", [rows.y[t], s_col[int(sec[t])]], [1.0, -1.0], -np.inf, 0.0)
                if cnt.cap_s is not None:
                    extra = [art] if art is not None else []
                    rows.cap_s = len(bld.r_name)
                    bld.row("cap_sections", list(s_col.values()) + extra,
                            [1.0] * len(s_col) + [-1.0] * len(extra), -np.inf, float(cnt.cap_s))
        if cnt.grades:
            gs = sorted({g for col in self.columns for g in col.grades})
            g_col = {g: bld.col(f"grade_{g}", ("g", g), integer=integer) for g in gs}
            for u, idx in by_unit.items():
                users = {}
                for i in idx:
                    for g in self.columns[i].grades:
                        users.setdefault(g, []).append(rows.lam[i])
                for g, lams in users.items():
                    rows.glink[(u, g)] = len(bld.r_name)
                    bld.row(f"grade_link_u{u}_g{g}", lams + [g_col[g]], [1.0] * len(lams) + [-1.0], -np.inf, 0.0)
            rows.grade = g_col
            extra = [art] if art is not None else []
            rows.cap_g = len(bld.r_name)
            bld.row("cap_grades", list(g_col.values()) + extra, [1.0] * len(g_col) + [-1.0] * len(extra),
                    -np.inf, float(cnt.cap_g))
        empty = Reduction(np.zeros(0, dtype=bool), np.zeros(0, dtype=int), np.zeros(0, dtype=int))
        form = bld.finish(0, np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), empty)
        return form, rows

    def solve_lp(self, threads: int | None) -> tuple[float, tuple[np.ndarray, np.ndarray], _MasterRows, np.ndarray]:
        """The master's linear relaxation: value, (row duals, column reduced costs), row map and column values."""
        from optimizer.schedule.ip import build_highs

        form, rows = self.formulation(integer=False)
        h = build_highs(form, threads)
        h.run()
        sol = h.getSolution()
        return (float(h.getInfo().objective_function_value), (np.asarray(sol.row_dual), np.asarray(sol.col_dual)),
                rows, np.asarray(sol.col_value))

    def penalties(self, duals: tuple[np.ndarray, np.ndarray], rows: _MasterRows
                  ) -> tuple[dict[int, np.ndarray], dict[int, np.ndarray], dict[int, float]]:
        """Entry costs of types and grades per unit, and the convexity duals.

        A linking row in the master gives its dual. Rows not (yet) in the master share what opening their type
        would cost: the reduced cost of y_t when y_t is in the master, else its price plus the cap's shadow
        price (and its section's when that is not open), split evenly among the units that can use the type.
        The duals then stay feasible for every y column, present or not, so a path using a new type pays its
        share instead of nothing, the Lagrangian bound reaches the relaxation's value when no path prices out,
        and that is then a proof (any non-negative values would give a valid bound; these give a good one).
        """
        row_dual, col_dual = duals
        p = self.model.problem
        cnt = self.counting
        n_t = len(p.types)
        n_g = len(self.model.grades)
        one = 0.0 if self.phase_one else 1.0

        def shadow(row: int | None) -> float:
            return max(0.0, -float(row_dual[row])) if row is not None else 0.0

        base = np.zeros(n_t)
        if cnt.types:
            base[:] = cnt.price_t * one + shadow(rows.cap_t)
            if cnt.sections:
                open_s = set(rows.sec or {})
                closed = ~np.isin(p.types.section, list(open_s))
                base[closed] += cnt.price_s * one + shadow(rows.cap_s)
            for t, j in rows.y.items():
                base[t] = max(0.0, float(col_dual[j]))
            base /= self.model.type_count
        gbase = np.zeros(n_g)
        if cnt.grades:
            gbase[:] = shadow(rows.cap_g)
            for g, j in (rows.grade or {}).items():
                gbase[g] = max(0.0, float(col_dual[j]))
            gbase /= self.model.grade_count
        pen = {u: np.where(self.model.avail[u], base, 0.0) for u in self.model.units}
        gpen = {u: np.where(self.model.gavail[u], gbase, 0.0) for u in self.model.units}
        for (u, t), i in rows.link.items():
            pen[u][t] = max(0.0, -float(row_dual[i]))
        for (u, g), i in rows.glink.items():
            gpen[u][g] = max(0.0, -float(row_dual[i]))
        alpha = {u: float(row_dual[i]) for u, i in rows.conv.items()}
        return pen, gpen, alpha


# --------------------------------------------------------------------------------------------
# column generation, integer master and local search
# --------------------------------------------------------------------------------------------


@dataclass
class _State:
    """Best schedule found so far and the best bound proven."""

    value: float = np.inf
    columns: dict[int, _Column] | None = None
    bound: float = -np.inf


def _no_schedule(problem: ScheduleProblem, status: str, bound: float, solver: str, t_all: float,
                 notes: list[str]) -> Schedule:
    """A result without a schedule (infeasible, or nothing found in time)."""
    return Schedule(cand=np.full(problem.n_cells, -1, dtype=int), status=status, objective=np.inf, bound=bound,
                    gap=np.inf, solver=solver, seconds=time.perf_counter() - t_all, notes=tuple(notes))


def _unit_name(model: PathModel, ui: int) -> str:
    return ", ".join(model.problem.stack_names[s] for s in model.prep.units[ui].stacks)


def _schedule_value(model: PathModel, counting: _Counting, columns: dict[int, _Column]) -> float:
    used = {t for col in columns.values() for t in col.types}
    return sum(col.cost for col in columns.values()) + counting.price_of(model.problem, used)


def _reroute(model: PathModel, allowed: set[int], units: list[int], pool: ThreadPoolExecutor
             ) -> dict[int, _Column] | None:
    """Every listed unit on its cheapest path using only the allowed types (None if one has none)."""
    n_t = len(model.problem.types)
    pen = np.full(n_t, np.inf)
    pen[list(allowed)] = 0.0
    gpen = np.zeros(len(model.grades))
    found = list(pool.map(lambda u: model.price(u, pen, gpen), units))
    if any(col is None for _, col in found):
        return None
    return {u: col for u, (_, col) in zip(units, found, strict=True)}


def _local_search(model: PathModel, counting: _Counting, columns: dict[int, _Column], pool: ThreadPoolExecutor,
                  deadline: float, add_from: list[int], master: _Master) -> dict[int, _Column]:
    """Improve a schedule: re-route over its type set, then drop, add or swap single types while that pays.

    Every move is exact for the units it touches (their cheapest paths over the new type set); a move is
    applied as soon as it pays (first improvement), and the pass repeats until none pays or time is up.
    """
    p = model.problem
    cur = dict(columns)
    types = {t for col in cur.values() for t in col.types}
    routed = _reroute(model, types, model.units, pool)
    if routed is not None and _schedule_value(model, counting, routed) < _schedule_value(model, counting, cur):
        cur = routed
    for col in cur.values():
        master.add(col)
    has_type = {u: set(np.unique(np.concatenate([ch.typ for ch in model.chains[u]])).tolist()) for u in model.units}

    def used() -> set[int]:
        return {x for col in cur.values() for x in col.types}

    def better(trial_types: set[int], units: list[int]) -> dict[int, _Column] | None:
        """The schedule with ``units`` re-routed over ``trial_types``, if it keeps the caps and pays."""
        if not units or not counting.allows(p, trial_types):
            return None
        new = _reroute(model, trial_types, units, pool)
        if new is None:
            return None
        trial = {**cur, **new}
        if _schedule_value(model, counting, trial) < _schedule_value(model, counting, cur) - 1e-9:
            return trial
        return None

    improved = True
    while improved and time.perf_counter() < deadline:
        improved = False
        # drop one type: re-route only the units that use it
        for t in sorted(used()):
            if time.perf_counter() > deadline:
                break
            found = better(used() - {t}, [u for u, col in cur.items() if t in col.types])
            if found is not None:
                cur, improved = found, True
        # add one type (from the relaxation's support): the units that can use it may move to it
        for t in add_from:
            if t in used() or time.perf_counter() > deadline:
                continue
            found = better(used() | {t}, [u for u in model.units if t in has_type[u]])
            if found is not None:
                cur, improved = found, True
        # swap one type for another (when a cap stops plain additions)
        for t_new in add_from[:12] if not improved else []:
            for t_old in sorted(used()) if t_new not in used() else []:
                if time.perf_counter() > deadline:
                    break
                units = sorted({u for u, col in cur.items() if t_old in col.types}
                               | {u for u in model.units if t_new in has_type[u]})
                found = better((used() - {t_old}) | {t_new}, units)
                if found is not None:
                    cur, improved = found, True
                    break
        for col in cur.values():
            master.add(col)
    return cur


def solve_paths(problem: ScheduleProblem, solver: str = "highs", time_limit_s: float = 60.0, gap_rel: float = 0.01,
                max_types: int | None = None, warm_start: np.ndarray | None = None,
                progress: Callable[[str], None] | None = None, threads: int | None = None) -> Schedule:
    """Solve the scheduling problem by column generation over stack paths (see the module notes).

    Args:
        problem: the problem (see :func:`applicable` for when this method may be used).
        solver: "highs" or "cbc" for the master problem with binary variables.
        time_limit_s: overall limit, seconds (building the tables included).
        gap_rel: stop once the schedule is proven within this relative gap.
        max_types: cap on distinct types (None: the rules' cap).
        warm_start: a feasible schedule (candidate per cell), added to the master as columns.
        progress: called with a line of text at each stage.
        threads: solver threads (None: the solver's default); pricing uses two threads.

    Returns:
        The schedule with status, objective (recomputed from the problem), bound and proven gap.
    """
    from optimizer.schedule.ip import Status, _figure_notes

    say = progress or (lambda _m: None)
    t_all = time.perf_counter()
    deadline = t_all + time_limit_s
    why = applicable(problem)
    if why is not None:
        raise ValueError(f"path formulation not applicable: {why}")
    counting = _Counting.of(problem, max_types)
    model = PathModel(problem)
    n_units = len(model.units)
    notes = [f"path formulation: {n_units} units ({len(model.prep.units) - n_units} identical stacks merged), "
             f"{model.n_rows} candidate rows; tables in {time.perf_counter() - t_all:.1f} s"]
    say(notes[-1])
    n_t, n_g = len(problem.types), len(model.grades)
    zero_t, zero_g = np.zeros(n_t), np.zeros(n_g)
    state = _State()
    pool = ThreadPoolExecutor(max_workers=2)
    try:
        # unit optima (no coupling): first columns and the first bound
        first = list(pool.map(lambda u: model.price(u, zero_t, zero_g), model.units))
        if any(col is None for _, col in first):
            return _no_schedule(problem, Status.INFEASIBLE.value, np.inf, "path formulation", t_all,
                                ["a stack has no buildable path (see optimizer.schedule.diagnose)"])
        free_cols = {u: col for u, (_, col) in zip(model.units, first, strict=True)}
        scale = max(1.0, sum(col.cost for col in free_cols.values()))
        master = _Master(model, counting, big_m=10.0 * scale + 1e6)
        for col in free_cols.values():
            master.add(col)
        if counting.allows(problem, {t for col in free_cols.values() for t in col.types}):
            state.value, state.columns = _schedule_value(model, counting, free_cols), free_cols
        if warm_start is not None:
            cols = {u: model.column_of(u, np.asarray(warm_start)) for u in model.units}
            used = {t for c in cols.values() if c is not None for t in c.types}
            if all(c is not None for c in cols.values()) and counting.allows(problem, used):
                v = _schedule_value(model, counting, cols)  # type: ignore[arg-type]
                for c in cols.values():
                    master.add(c)  # type: ignore[arg-type]
                if v < state.value:
                    state.value, state.columns = v, cols  # type: ignore[assignment]
        # every schedule costs at least its units' own optima plus one type and one section
        state.bound = sum(col.cost for col in free_cols.values()) + (
            counting.price_t * counting.types + counting.price_s * counting.sections)
        capped = counting.cap_t is not None or counting.cap_s is not None or counting.cap_g is not None
        if capped and state.columns is None:
            need_t, need_g = min_counts(model, pool)
            why = []
            u_t = max(need_t, key=need_t.get)
            if counting.cap_t is not None and need_t[u_t] > counting.cap_t:
                why.append(f"stack {_unit_name(model, u_t)} cannot be built with fewer than {need_t[u_t]} types "
                           f"(cap {counting.cap_t})")
            u_g = max(need_g, key=need_g.get)
            if counting.cap_g is not None and need_g[u_g] > counting.cap_g:
                why.append(f"stack {_unit_name(model, u_g)} cannot be built with fewer than {need_g[u_g]} concrete "
                           f"grades (cap {counting.cap_g})")
            if why:
                return _no_schedule(problem, Status.INFEASIBLE.value, np.inf, "path formulation", t_all, notes + why)
            t1 = time.perf_counter()
            ok = _phase_one(model, master, pool, t_all + 0.3 * time_limit_s)
            notes.append(f"phase one (paths within the caps): {ok} in {time.perf_counter() - t1:.1f} s, "
                         f"{len(master.columns)} paths")
            say(notes[-1])
            if ok is False:
                notes.append("the caps cannot be met: even a mixture of all buildable paths breaks them "
                             "(see optimizer.schedule.diagnose)")
                return _no_schedule(problem, Status.INFEASIBLE.value, np.inf, "path formulation", t_all, notes)
        # column generation
        t_cg = time.perf_counter()
        cg_deadline = t_all + 0.6 * time_limit_s
        rounds = 0
        lp_value = np.inf
        x_lp = np.zeros(0)
        rows_lp = None
        converged = False
        last_slack = np.inf
        center: tuple[dict[int, np.ndarray], dict[int, np.ndarray]] | None = None
        smooth = 0.5  # weight of the stability centre in the pricing duals (Wentges smoothing)

        def generate(until: float) -> None:
            """Rounds of column generation until the relaxation meets the bound, nothing prices out, or ``until``."""
            nonlocal rounds, lp_value, x_lp, rows_lp, converged, last_slack, center
            while True:
                rounds += 1
                lp_value, duals, rows_lp, x_lp = master.solve_lp(threads)
                pen_lp, gpen_lp, alpha = master.penalties(duals, rows_lp)
                integral = _integral_columns(master, rows_lp, x_lp)
                if integral is not None:  # the relaxation chose one whole path per unit: a schedule
                    v = _schedule_value(model, counting, integral)
                    if v < state.value - 1e-9 and counting.allows(problem, {t for c in integral.values()
                                                                            for t in c.types}):
                        state.value, state.columns = v, integral
                added = 0
                for mix in ((smooth, 0.0) if center is not None else (0.0,)):
                    if mix > 0.0 and center is not None:
                        pen = {u: mix * center[0][u] + (1.0 - mix) * pen_lp[u] for u in model.units}
                        gpen = {u: mix * center[1][u] + (1.0 - mix) * gpen_lp[u] for u in model.units}
                    else:
                        pen, gpen = pen_lp, gpen_lp
                    priced = list(pool.map(lambda u, pen=pen, gpen=gpen: model.price(u, pen[u], gpen[u]), model.units))
                    lagr = sum(val for val, _ in priced) + _y_part(model, counting, pen, gpen)
                    if lagr > state.bound:
                        state.bound = lagr
                        center = (pen, gpen)
                    for u, (_, col) in zip(model.units, priced, strict=True):
                        if col is None:
                            continue
                        rc = col.cost - alpha[u] + sum(pen_lp[u][t] for t in col.types) + sum(
                            gpen_lp[u][g] for g in col.grades)
                        if rc < -1e-7 * scale and master.add(col):
                            added += 1
                    if added:
                        break  # otherwise the smoothed duals mispriced: price again at the relaxation's own
                gap_lp = (lp_value - state.bound) / max(abs(lp_value), 1e-9)
                say(f"round {rounds}: relaxation {lp_value:.6g}, bound {state.bound:.6g}, {added} paths added, "
                    f"{model.n_rows} rows")
                converged = added == 0
                if added == 0 or gap_lp < max(1e-6, gap_rel / 20) or time.perf_counter() > until:
                    break
                slack = state.value - state.bound
                if np.isfinite(slack) and slack < 0.5 * last_slack and center is not None:
                    _prune(model, master, center[0], center[1], state, pool, notes, say)
                    last_slack = slack

        generate(cg_deadline)
        notes.append(f"column generation: {rounds} rounds, {len(master.columns)} paths, relaxation {lp_value:.6g}, "
                     f"bound {state.bound:.6g} in {time.perf_counter() - t_cg:.1f} s")
        say(notes[-1])
        # prune rows that cannot be in a schedule better than the incumbent
        if np.isfinite(state.value) and center is not None:
            _prune(model, master, center[0], center[1], state, pool, notes, say)
        # support of the relaxation: types worth trying to add
        support = []
        if rows_lp is not None and rows_lp.y:
            support = sorted(rows_lp.y, key=lambda t: -x_lp[rows_lp.y[t]])
            support = [t for t in support if x_lp[rows_lp.y[t]] > 1e-6][:40]
        # under a cap with no schedule yet: small type sets from the relaxation's support, each unit re-routed
        if state.columns is None and counting.cap_t is not None and support:
            found = _support_sets(model, counting, support, pool, deadline)
            if found is not None:
                state.value, state.columns = _schedule_value(model, counting, found), found
                for col in found.values():
                    master.add(col)
                notes.append(f"schedule from a type set of the relaxation's support: {state.value:.6g}")
                say(notes[-1])
        # integer master, then local search, repeated while time remains and the gap is open
        for attempt in range(3):
            if attempt > 0 and state.columns is not None and _gap(state) <= gap_rel:
                break
            remaining = deadline - time.perf_counter()
            if remaining < 1.0:
                break
            if attempt > 0 and not converged:  # more paths (and a better bound) before the next integer master
                generate(time.perf_counter() + 0.5 * remaining)
                remaining = deadline - time.perf_counter()
                if state.columns is not None and _gap(state) <= gap_rel:
                    break
            cols = _integer_master(master, state, solver, min(remaining * 0.5, remaining - 0.5), gap_rel, threads,
                                   notes)
            say(notes[-1])
            if cols is not None:
                v = _schedule_value(model, counting, cols)
                if v < state.value:
                    state.value, state.columns = v, cols
            if state.columns is None:
                continue
            t_ls = time.perf_counter()
            ls_deadline = min(deadline, t_ls + max(5.0, 0.25 * (deadline - t_ls)))
            cols = _local_search(model, counting, state.columns, pool, ls_deadline, support, master)
            say(f"local search {_schedule_value(model, counting, cols):.6g} in {time.perf_counter() - t_ls:.1f} s")
            v = _schedule_value(model, counting, cols)
            if v < state.value - 1e-9:
                state.value, state.columns = v, cols
            elif converged:
                break  # nothing left to try: no new paths, no better schedule
            say(f"schedule {state.value:.6g}, bound {state.bound:.6g}, gap {_gap(state):.2%}")
    finally:
        pool.shutdown()
    label = f"path formulation (column generation; {'HiGHS' if solver == 'highs' else 'CBC'} master)"
    art = float(x_lp[rows_lp.art]) if rows_lp is not None and rows_lp.art is not None else 0.0
    if state.columns is None and converged and art > 1e-6:
        # the relaxation over all paths needs the cap slack: no schedule keeps the caps
        notes.append("the caps cannot be met: the relaxation over all paths needs the cap slack "
                     "(see optimizer.schedule.diagnose)")
        return _no_schedule(problem, Status.INFEASIBLE.value, np.inf, label, t_all, notes)
    gap = _gap(state) if state.columns is not None else np.inf
    remaining = deadline - time.perf_counter()
    if gap > gap_rel and remaining > 1.0 and len(problem.cand_cell) <= _FINISH_MAX_CANDIDATES:
        # no branching over paths here: the compact model finishes the proof on small problems
        return _finish_compact(problem, state, model, solver, remaining, gap_rel, max_types, threads, notes, label,
                               t_all)
    secs = time.perf_counter() - t_all
    if state.columns is None:
        return _no_schedule(problem, Status.NO_SCHEDULE.value, state.bound, label, t_all, notes)
    cand = model.assemble(state.columns)
    fig = figures(problem, cand)
    bound = min(state.bound, fig.objective)
    gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9))
    status = Status.OPTIMAL if gap <= 1e-6 else (Status.WITHIN_GAP if gap <= gap_rel + 1e-9 else Status.TIME_LIMIT)
    if status is Status.TIME_LIMIT and time.perf_counter() < deadline - 1.0:
        notes.append("the gap left by the path relaxation was not closed (no branching over paths on a problem "
                     "this large); status 'time limit' means the proof stopped, not the clock")
    return Schedule(cand=cand, status=status.value, objective=fig.objective, bound=bound, gap=gap, solver=label,
                    seconds=secs, notes=tuple(notes) + _figure_notes(fig))


_FINISH_MAX_CANDIDATES = 20_000  # the compact model stays within its time limit at this size


def _finish_compact(problem: ScheduleProblem, state: _State, model: PathModel, solver: str, remaining: float,
                    gap_rel: float, max_types: int | None, threads: int | None, notes: list[str], label: str,
                    t_all: float) -> Schedule:
    """Close the gap with the compact model (branch and bound), warm-started, keeping the path bound."""
    from optimizer.schedule.ip import Status, _figure_notes, solve

    warm = None
    if state.columns is not None:
        cand = model.assemble(state.columns)
        warm = Schedule(cand=cand, status="heuristic", objective=state.value, bound=state.bound, gap=_gap(state),
                        solver=label, seconds=0.0)
    out = solve(problem, solver=solver, time_limit_s=remaining, gap_rel=gap_rel, max_types=max_types,
                warm_start=warm, threads=threads, method="compact")
    notes = notes + [f"path bound {state.bound:.6g} left a gap above {gap_rel:g}: compact model run to finish "
                     f"({out.status})"] + [n for n in out.notes if not n.startswith("steel ")]
    secs = time.perf_counter() - t_all
    if out.status == Status.INFEASIBLE.value:
        return replace(out, notes=tuple(notes), seconds=secs)
    if np.any(np.asarray(out.cand) < 0):
        return replace(out, bound=max(out.bound, state.bound), notes=tuple(notes), seconds=secs)
    fig = figures(problem, out.cand)
    bound = min(max(out.bound, state.bound), fig.objective)
    gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9))
    status = Status.OPTIMAL if gap <= 1e-6 else (Status.WITHIN_GAP if gap <= gap_rel + 1e-9 else Status.TIME_LIMIT)
    return Schedule(cand=np.asarray(out.cand), status=status.value, objective=fig.objective, bound=bound, gap=gap,
                    solver=f"{label}; finished by {out.solver}", seconds=secs,
                    notes=tuple(notes) + _figure_notes(fig))


def _y_part(model: PathModel, counting: _Counting, pen: dict[int, np.ndarray], gpen: dict[int, np.ndarray]) -> float:
    """The type, section and grade part of the Lagrangian: min over counted sets of (price - entry costs paid).

    With the linking rows priced out, choosing types is separate from choosing paths: a type is worth
    ``price_per_type - sum_u pen_u[type]``, a grade ``- sum_u gpen_u[grade]``; the best sets within the caps
    (a small integer program when sections are counted as well) complete the bound.
    """
    p = model.problem
    value = 0.0
    if counting.types:
        coef = counting.price_t - np.sum([pen[u] for u in model.units], axis=0)
        neg = np.flatnonzero(coef < 0.0)
        if not counting.sections:
            vals = np.sort(coef[neg])
            value += float(vals[:counting.cap_t].sum() if counting.cap_t is not None else vals.sum())
        elif len(neg):
            value += _types_and_sections(p, counting, neg, coef[neg])
    if counting.grades:
        gcoef = -np.sum([gpen[u] for u in model.units], axis=0)
        vals = np.sort(gcoef[gcoef < 0.0])
        value += float(vals[:counting.cap_g].sum())
    return value


def _types_and_sections(problem: ScheduleProblem, counting: _Counting, types: np.ndarray, coef: np.ndarray) -> float:
    """Least value of y (types) and s (sections) with y_t <= s_section(t), the caps, and prices (exact, small MIP)."""
    import highspy

    from optimizer.schedule.ip import new_highs

    sec = problem.types.section[types]
    secs, sec_of = np.unique(sec, return_inverse=True)
    n_y, n_s = len(types), len(secs)
    h = new_highs()
    h.addVars(n_y + n_s, np.zeros(n_y + n_s), np.ones(n_y + n_s))
    h.changeColsCost(n_y + n_s, np.arange(n_y + n_s, dtype=np.int32),
                     np.concatenate([coef, np.full(n_s, counting.price_s)]))
    h.changeColsIntegrality(n_y + n_s, np.arange(n_y + n_s, dtype=np.int32),
                            np.full(n_y + n_s, highspy.HighsVarType.kInteger))
    for i in range(n_y):
        h.addRow(-highspy.kHighsInf, 0.0, 2, np.array([i, n_y + sec_of[i]], dtype=np.int32), np.array([1.0, -1.0]))
    if counting.cap_t is not None:
        h.addRow(-highspy.kHighsInf, float(counting.cap_t), n_y, np.arange(n_y, dtype=np.int32), np.ones(n_y))
    if counting.cap_s is not None:
        h.addRow(-highspy.kHighsInf, float(counting.cap_s), n_s, np.arange(n_y, n_y + n_s, dtype=np.int32),
                 np.ones(n_s))
    h.run()
    info = h.getInfo()
    # the MIP's dual bound is a valid lower bound even if it stopped early
    return float(min(info.mip_dual_bound, info.objective_function_value))


def _phase_one(model: PathModel, master: _Master, pool: ThreadPoolExecutor, deadline: float) -> bool | None:
    """Find paths whose mixture keeps the caps (the relaxation without its cap slack); False if none can.

    Column generation on the master with zero costs and the cap slack priced at 1: when no path has a negative
    reduced cost and the slack is still positive, the relaxation over all paths breaks the caps, so no schedule
    keeps them (a proof). Returns True when the slack reached 0, None when time ran out first.
    """
    master.phase_one = True
    try:
        while time.perf_counter() < deadline:
            value, duals, rows, _ = master.solve_lp(None)
            if value <= 1e-9:
                return True
            pen, gpen, alpha = master.penalties(duals, rows)
            priced = list(pool.map(lambda u, pen=pen, gpen=gpen: model.price(u, pen[u], gpen[u], weights=False),
                                   model.units))
            added = 0
            for u, (val, col) in zip(model.units, priced, strict=True):
                if col is not None and val - alpha[u] < -1e-9 and master.add(col):
                    added += 1
            if added == 0 or _phase_one_bound(model, master.counting, pen, priced) > 1e-9:
                return False
        return None
    finally:
        master.phase_one = False


def _phase_one_bound(model: PathModel, counting: _Counting, pen: dict[int, np.ndarray], priced: list) -> float:
    """A lower bound on the cap slack any schedule needs (types capped alone; -inf otherwise).

    Relaxing the linking rows with ``pen``: the paths cost their entry penalties (``priced``); the types are
    then worth ``c_t = sum_u pen_u[t]`` each, the first ``cap`` of them free and every further one at the price
    of one unit of slack. Positive means no schedule keeps the cap.
    """
    if counting.cap_t is None or counting.sections or counting.grades:
        return -np.inf
    c = np.sort(np.sum([pen[u] for u in model.units], axis=0))[::-1]
    k = counting.cap_t
    return float(sum(v for v, _ in priced) - c[:k].sum() - np.maximum(c[k:] - 1.0, 0.0).sum())


def min_counts(model: PathModel, pool: ThreadPoolExecutor) -> tuple[dict[int, int], dict[int, int]]:
    """Fewest distinct types and fewest distinct grades any path of each unit can use (exact, per unit).

    Paths weighted by nothing but an entry cost of 1 per type (or per grade): every type is entered once
    along a path, so the cheapest such path uses the fewest types.
    """
    n_t, n_g = len(model.problem.types), len(model.grades)
    ones_t, zero_t, ones_g, zero_g = np.ones(n_t), np.zeros(n_t), np.ones(n_g), np.zeros(n_g)
    types = list(pool.map(lambda u: model.price(u, ones_t, zero_g, weights=False)[0], model.units))
    grades = list(pool.map(lambda u: model.price(u, zero_t, ones_g, weights=False)[0], model.units))
    return ({u: round(v) for u, v in zip(model.units, types, strict=True) if np.isfinite(v)},
            {u: round(v) for u, v in zip(model.units, grades, strict=True) if np.isfinite(v)})


def _support_sets(model: PathModel, counting: _Counting, support: list[int], pool: ThreadPoolExecutor,
                  deadline: float, max_sets: int = 200) -> dict[int, _Column] | None:
    """The best schedule whose types are at most ``cap`` of the relaxation's most used types (every unit re-routed).

    All subsets of the ``cap + 6`` most used types when there are at most ``max_sets`` of them, else the most
    used ``cap`` types alone; a subset with a unit that cannot be built from it is skipped.
    """
    import itertools
    import math

    k = int(counting.cap_t)
    top = support[:k + 6]
    sets = (list(itertools.combinations(top, min(k, len(top)))) if math.comb(len(top), min(k, len(top))) <= max_sets
            else [tuple(top[:k])])
    best: tuple[float, dict[int, _Column]] | None = None
    for chosen in sets:
        if time.perf_counter() > deadline:
            break
        if not counting.allows(model.problem, set(chosen)):
            continue
        routed = _reroute(model, set(chosen), model.units, pool)
        if routed is None:
            continue
        v = _schedule_value(model, counting, routed)
        if best is None or v < best[0]:
            best = (v, routed)
    return best[1] if best is not None else None


def _integral_columns(master: _Master, rows: _MasterRows, x: np.ndarray) -> dict[int, _Column] | None:
    """The chosen path of every unit when the relaxation's solution is integral in the paths (else None)."""
    lam = x[rows.lam] if len(x) else np.zeros(0)
    if len(lam) == 0 or np.any((lam > 1e-6) & (lam < 1.0 - 1e-6)):
        return None
    if rows.art is not None and x[rows.art] > 1e-6:
        return None
    chosen = {}
    for i in np.flatnonzero(lam > 0.5):
        col = master.columns[i]
        chosen[col.unit] = col
    return chosen if len(chosen) == len(master.model.units) else None


def _gap(state: _State) -> float:
    return max(0.0, (state.value - state.bound) / max(abs(state.value), 1e-9))


def _prune(model: PathModel, master: _Master, pen: dict[int, np.ndarray], gpen: dict[int, np.ndarray], state: _State,
           pool: ThreadPoolExecutor, notes: list[str], say: Callable[[str], None]) -> None:
    """Drop rows whose cheapest penalised path exceeds their unit's best by more than (incumbent - bound)."""
    before = model.n_rows
    slack = state.value - state.bound
    if slack < -1e-7 * max(1.0, abs(state.value)):
        notes.append(f"pruning skipped: bound {state.bound:.6g} above the incumbent {state.value:.6g}")
        return
    thr = list(pool.map(lambda u: model.through(u, pen[u], gpen[u]), model.units))
    for u, (best, parts) in zip(model.units, thr, strict=True):
        keep = [x <= best + slack + 1e-7 * max(1.0, abs(state.value)) for x in parts]
        model.prune(u, keep)
    notes.append(f"pruned {before - model.n_rows} of {before} candidate rows (reduced cost above the gap "
                 f"{slack:.6g})")
    say(notes[-1])


def _master_start(master: _Master, state: _State, form) -> np.ndarray | None:  # noqa: ANN001
    """Column values of the incumbent in the integer master (None when one of its paths is not a column)."""
    if state.columns is None:
        return None
    index = {id(col): i for i, col in enumerate(master.columns)}
    if any(id(c) not in index for c in state.columns.values()):
        return None
    chosen = {index[id(c)] for c in state.columns.values()}
    types = {t for c in state.columns.values() for t in c.types}
    t_ = master.model.problem.types
    start = np.zeros(form.n_cols)
    for j, meta in enumerate(form.col_meta):
        if meta[0] == "lam":
            start[j] = float(meta[1] in chosen)
        elif meta[0] == "y":
            start[j] = float(meta[1] in types)
        elif meta[0] == "sec":
            start[j] = float(any(int(t_.section[t]) == meta[1] for t in types))
        elif meta[0] == "g":
            start[j] = float(any(int(master.model.gid[t]) == meta[1] for t in types))
    return start


def _integer_master(master: _Master, state: _State, solver: str, limit: float, gap_rel: float, threads: int | None,
                    notes: list[str]) -> dict[int, _Column] | None:
    """The master with binary variables over the generated paths; the chosen column of every unit."""
    from optimizer.schedule.ip import _solve_highspy as solve_highspy
    from optimizer.schedule.ip import _solve_pulp as solve_pulp

    form, _ = master.formulation(integer=True)
    if solver == "highs":
        # no start handed to HiGHS here: with highspy 1.16 a start made it report the start as optimal with an
        # objective that was not the start's (measured on the demo tower); the master is small enough without
        out = solve_highspy(form, None, limit, gap_rel * 0.1, threads)
    else:
        out = solve_pulp(master.model.problem, form, _master_start(master, state, form), "cbc", limit,
                         gap_rel * 0.1, threads)
    notes.append(f"integer master: {form.n_binaries} binaries, {form.n_rows} rows; {out.status.value} in "
                 f"{out.seconds:.1f} s, value {out.objective:.6g}")
    if out.xval is None:
        return None
    cols = {}
    for j, meta in enumerate(form.col_meta):
        if meta[0] == "lam" and out.xval[j] > 0.5:
            col = master.columns[meta[1]]
            cols[col.unit] = col
    return cols if len(cols) == len(master.model.units) else None
