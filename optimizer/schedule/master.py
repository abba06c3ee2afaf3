"""The master problem of the path formulation: one path per unit, and the types the chosen paths use.

::

    min  sum_P c_P lam_P + f sum_t y_t (+ sections)
    s.t. sum_{P of u} lam_P = 1                       for every unit u      (alpha_u)
         sum_{P of u, P uses t} lam_P - y_t <= 0      for every unit u, type t  (-pi_ut)
         sum_t y_t <= K                               (when capped)
         lam, y binary

The linking row is per unit and type, not per cell and type: a path that uses
a type uses it once. :class:`Master` holds the generated paths (columns of
:mod:`optimizer.schedule.pathmodel`), solves the linear relaxation for the duals
that price new paths (:meth:`Master.penalties`), and, with binary variables,
gives schedules (:func:`integer_master`). :func:`y_part` completes the
Lagrangian bound with the best choice of types, sections and grades.
"""

from __future__ import annotations

from dataclasses import dataclass

import highspy
import numpy as np

from optimizer.schedule.backends import build_highs, new_highs, solve_highspy, solve_pulp
from optimizer.schedule.builder import Formulation, ModelBuilder, Reduction
from optimizer.schedule.pathmodel import Column, PathModel
from optimizer.schedule.problem import ScheduleProblem

__all__ = ["Counting", "MasterRows", "Master", "y_part", "integral_columns", "integer_master"]


@dataclass(frozen=True)
class Counting:
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
    def of(cls, problem: ScheduleProblem, max_types: int | None) -> Counting:
        """What the problem's rules (with ``max_types`` overriding the cap on types) count."""
        r = problem.rules
        cap_t = max_types if max_types is not None else r.max_types
        secs = r.max_sections is not None or r.price_per_section > 0
        types = cap_t is not None or r.price_per_type > 0 or secs
        return cls(
            types,
            secs,
            r.max_grades is not None,
            cap_t,
            r.max_sections,
            r.max_grades,
            float(r.price_per_type),
            float(r.price_per_section),
        )

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
class MasterRows:
    """Where the master's rows and columns are, for reading duals and values."""

    conv: dict[int, int]  # unit -> its convexity row
    link: dict[tuple[int, int], int]  # (unit, type) -> linking row
    glink: dict[tuple[int, int], int]  # (unit, grade) -> grade linking row
    lam: list[int]  # column of every path
    y: dict[int, int]  # type -> column
    art: int | None = None  # column of the cap slack (relaxation only)
    cap_t: int | None = None  # row of the type cap
    cap_s: int | None = None  # row of the section cap
    cap_g: int | None = None  # row of the grade cap
    sec: dict[int, int] | None = None  # section id -> column
    grade: dict[int, int] | None = None  # grade id -> column


class Master:
    """The generated columns and the master problem over them."""

    def __init__(self, model: PathModel, counting: Counting, big_m: float) -> None:
        self.model = model
        self.counting = counting
        self.big_m = big_m
        self.columns: list[Column] = []
        self._seen: set[tuple[int, bytes]] = set()
        self.phase_one = False  # costs 0 on paths and prices, 1 on the cap slack

    def add(self, col: Column) -> bool:
        """Add a column unless the same path of the same unit is there already; whether it was added."""
        key = (col.unit, col.cands.tobytes())
        if key in self._seen:
            return False
        self._seen.add(key)
        self.columns.append(col)
        return True

    def formulation(self, integer: bool) -> tuple[Formulation, MasterRows]:  # noqa: PLR0912 - one branch per row family of the master
        """The master over the columns so far, with binary (``integer``) or continuous path and type variables."""
        p = self.model.problem
        cnt = self.counting
        bld = ModelBuilder()
        rows = MasterRows({}, {}, {}, [], {})
        by_unit: dict[int, list[int]] = {}
        one = 0.0 if self.phase_one else 1.0
        for i, col in enumerate(self.columns):
            rows.lam.append(bld.col(f"path_u{col.unit}_{i}", ("lam", i), cost=col.cost * one, integer=integer))
            by_unit.setdefault(col.unit, []).append(i)
        art = None
        if not integer and (cnt.cap_t is not None or cnt.cap_s is not None or cnt.cap_g is not None):
            art = bld.col("cap_slack", ("art",), ub=np.inf, integer=False, cost=1.0 if self.phase_one else self.big_m)
            rows.art = art
        for u, idx in by_unit.items():
            rows.conv[u] = bld.n_rows
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
                    rows.link[(u, t)] = bld.n_rows
                    bld.row(f"link_u{u}_t{t}", lams + [rows.y[t]], [1.0] * len(lams) + [-1.0], -np.inf, 0.0)
            if cnt.cap_t is not None:
                extra = [art] if art is not None else []
                rows.cap_t = bld.n_rows
                bld.row(
                    "cap_types",
                    [rows.y[t] for t in used] + extra,
                    [1.0] * len(used) + [-1.0] * len(extra),
                    -np.inf,
                    float(cnt.cap_t),
                )
            if cnt.sections:
                sec = p.types.section
                s_col = (
                    {
                        int(s): bld.col(f"section_{int(s)}", ("sec", int(s)), cost=cnt.price_s * one, integer=integer)
                        for s in np.unique(sec[used])
                    }
                    if used
                    else {}
                )
                rows.sec = s_col
                for t in used:
                    bld.row(f"section_link_t{t}", [rows.y[t], s_col[int(sec[t])]], [1.0, -1.0], -np.inf, 0.0)
                if cnt.cap_s is not None:
                    extra = [art] if art is not None else []
                    rows.cap_s = bld.n_rows
                    bld.row(
                        "cap_sections",
                        list(s_col.values()) + extra,
                        [1.0] * len(s_col) + [-1.0] * len(extra),
                        -np.inf,
                        float(cnt.cap_s),
                    )
        if cnt.grades:
            gs = sorted({g for col in self.columns for g in col.grades})
            g_col = {g: bld.col(f"grade_{g}", ("g", g), integer=integer) for g in gs}
            for u, idx in by_unit.items():
                users = {}
                for i in idx:
                    for g in self.columns[i].grades:
                        users.setdefault(g, []).append(rows.lam[i])
                for g, lams in users.items():
                    rows.glink[(u, g)] = bld.n_rows
                    bld.row(f"grade_link_u{u}_g{g}", lams + [g_col[g]], [1.0] * len(lams) + [-1.0], -np.inf, 0.0)
            rows.grade = g_col
            extra = [art] if art is not None else []
            rows.cap_g = bld.n_rows
            bld.row(
                "cap_grades",
                list(g_col.values()) + extra,
                [1.0] * len(g_col) + [-1.0] * len(extra),
                -np.inf,
                float(cnt.cap_g),
            )
        form = bld.finish(np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), Reduction.none(0, 0))
        return form, rows

    def solve_lp(self, threads: int | None) -> tuple[float, tuple[np.ndarray, np.ndarray], MasterRows, np.ndarray]:
        """The master's linear relaxation: value, (row duals, column reduced costs), row map and column values."""
        form, rows = self.formulation(integer=False)
        h = build_highs(form, threads)
        h.run()
        sol = h.getSolution()
        return (
            float(h.getInfo().objective_function_value),
            (np.asarray(sol.row_dual), np.asarray(sol.col_dual)),
            rows,
            np.asarray(sol.col_value),
        )

    def penalties(
        self, duals: tuple[np.ndarray, np.ndarray], rows: MasterRows
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


def y_part(model: PathModel, counting: Counting, pen: dict[int, np.ndarray], gpen: dict[int, np.ndarray]) -> float:
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
            value += float(vals[: counting.cap_t].sum() if counting.cap_t is not None else vals.sum())
        elif len(neg):
            value += _types_and_sections(p, counting, neg, coef[neg])
    if counting.grades:
        gcoef = -np.sum([gpen[u] for u in model.units], axis=0)
        vals = np.sort(gcoef[gcoef < 0.0])
        value += float(vals[: counting.cap_g].sum())
    return value


def _types_and_sections(problem: ScheduleProblem, counting: Counting, types: np.ndarray, coef: np.ndarray) -> float:
    """Least value of y (types) and s (sections) with y_t <= s_section(t), the caps, and prices (exact, small MIP)."""
    sec = problem.types.section[types]
    secs, sec_of = np.unique(sec, return_inverse=True)
    n_y, n_s = len(types), len(secs)
    h = new_highs()
    h.addVars(n_y + n_s, np.zeros(n_y + n_s), np.ones(n_y + n_s))
    h.changeColsCost(
        n_y + n_s, np.arange(n_y + n_s, dtype=np.int32), np.concatenate([coef, np.full(n_s, counting.price_s)])
    )
    h.changeColsIntegrality(
        n_y + n_s, np.arange(n_y + n_s, dtype=np.int32), np.full(n_y + n_s, highspy.HighsVarType.kInteger)
    )
    for i in range(n_y):
        h.addRow(-highspy.kHighsInf, 0.0, 2, np.array([i, n_y + sec_of[i]], dtype=np.int32), np.array([1.0, -1.0]))
    if counting.cap_t is not None:
        h.addRow(-highspy.kHighsInf, float(counting.cap_t), n_y, np.arange(n_y, dtype=np.int32), np.ones(n_y))
    if counting.cap_s is not None:
        h.addRow(
            -highspy.kHighsInf, float(counting.cap_s), n_s, np.arange(n_y, n_y + n_s, dtype=np.int32), np.ones(n_s)
        )
    h.run()
    info = h.getInfo()
    # the MIP's dual bound is a valid lower bound even if it stopped early
    return float(min(info.mip_dual_bound, info.objective_function_value))


def integral_columns(master: Master, rows: MasterRows, x: np.ndarray) -> dict[int, Column] | None:
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


def _master_start(master: Master, incumbent: dict[int, Column] | None, form: Formulation) -> np.ndarray | None:
    """Column values of the incumbent in the integer master (None when one of its paths is not a column)."""
    if incumbent is None:
        return None
    index = {id(col): i for i, col in enumerate(master.columns)}
    if any(id(c) not in index for c in incumbent.values()):
        return None
    chosen = {index[id(c)] for c in incumbent.values()}
    types = {t for c in incumbent.values() for t in c.types}
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


def integer_master(
    master: Master,
    incumbent: dict[int, Column] | None,
    solver: str,
    limit: float,
    gap_rel: float,
    threads: int | None,
    notes: list[str],
) -> dict[int, Column] | None:
    """The master with binary variables over the generated paths; the chosen column of every unit.

    Args:
        master: the master and its columns.
        incumbent: the best schedule so far (a column per unit), handed to CBC as a start (None: no start).
        solver: "highs" or "cbc".
        limit: time limit, seconds.
        gap_rel: relative gap of the schedule sought (the master is solved to a tenth of it).
        threads: solver threads (None: the solver's default).
        notes: the run's notes; one is added.

    Returns:
        The chosen column of every unit, or None when the solver found no complete schedule.
    """
    form, _ = master.formulation(integer=True)
    if solver == "highs":
        # no start handed to HiGHS here: with highspy 1.16 a start made it report the start as optimal with an
        # objective that was not the start's (measured on the demo tower); the master is small enough without
        out = solve_highspy(form, None, limit, gap_rel * 0.1, threads)
    else:
        out = solve_pulp(
            master.model.problem, form, _master_start(master, incumbent, form), "cbc", limit, gap_rel * 0.1, threads
        )
    notes.append(
        f"integer master: {form.n_binaries} binaries, {form.n_rows} rows; {out.status.value} in "
        f"{out.seconds:.1f} s, value {out.objective:.6g}"
    )
    if out.xval is None:
        return None
    cols = {}
    for j, meta in enumerate(form.col_meta):
        if meta[0] == "lam" and out.xval[j] > 0.5:
            col = master.columns[meta[1]]
            cols[col.unit] = col
    return cols if len(cols) == len(master.model.units) else None
