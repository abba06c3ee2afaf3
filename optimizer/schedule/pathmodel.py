"""Stack paths as columns: the units of the path formulation, their candidate rows and the pricing.

A *path* is one buildable schedule of one unit (a stack, a group of stacks
sharing types, or identical stacks merged into one with a multiplicity) in one
orientation. :class:`PathModel` holds every unit's candidate rows storey by
storey (a :class:`Chain` per orientation) and the type-by-type table of the
continuity rules, and prices a unit - its cheapest path with an entry cost per
type and per grade - with the compiled dynamic programs of
:mod:`optimizer.schedule.stackdp`; a path found is a :class:`Column` of the
master problem (:mod:`optimizer.schedule.master`).

Valid when every monotone rule is on (a path then uses each type in one
contiguous run, so charging on entry counts a type once) and no cap on grade
changes per stack is set; :func:`applicable` says why not otherwise.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from optimizer.schedule import stackdp
from optimizer.schedule.prepared import (
    Level,
    Prepared,
    group_problems,
    run_states,
    stack_chains,
    stack_signature,
    transition,
)
from optimizer.schedule.problem import ScheduleProblem

__all__ = ["applicable", "Chain", "Column", "PathModel"]


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
class Chain:
    """One unit in one orientation: rows storey by storey (see :mod:`optimizer.schedule.stackdp`)."""

    unit: int  # unit index
    orient: int  # 0 or 1
    off: np.ndarray  # (n_levels + 1,) the rows of storey i are off[i]:off[i + 1]
    typ: np.ndarray  # (n_rows,) type of each row
    w: np.ndarray  # (n_rows,) objective weight of each row, times the unit's multiplicity
    st: np.ndarray  # (n_rows,) weight of starter bars when the step below is large, times the multiplicity
    cands: np.ndarray  # (n_rows, n_stacks) candidate of each stack of the unit


@dataclass(frozen=True)
class Column:
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
        p = problem
        self.problem = p
        prep = Prepared(p)
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
        self.m = run_states(p)
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
            sig = stack_signature(prep, u.stacks[0])
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
        self.chains: dict[int, list[Chain]] = {}
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
        self.grade_count = (
            np.maximum(np.sum(list(self.gavail.values()), axis=0), 1) if self.units else np.ones(len(grades))
        )

    def _chain(self, ui: int, o: int, levels: list[Level]) -> Chain:
        mult = self.mult[ui]
        sizes = np.array([len(lv.types) for lv in levels], dtype=np.int64)
        off = np.zeros(len(levels) + 1, dtype=np.int64)
        np.cumsum(sizes, out=off[1:])
        typ = np.concatenate([lv.types for lv in levels]).astype(np.int64)
        w = np.concatenate([lv.weight for lv in levels]).astype(float) * mult
        st = np.concatenate([lv.starter for lv in levels]).astype(float) * mult
        cands = np.concatenate([lv.cands for lv in levels], axis=0)
        return Chain(ui, o, off, typ, w, st, cands)

    @property
    def n_rows(self) -> int:
        """Rows (candidates) left in all chains."""
        return int(sum(len(ch.typ) for chs in self.chains.values() for ch in chs))

    def price(self, ui: int, pen: np.ndarray, gpen: np.ndarray, weights: bool = True) -> tuple[float, Column | None]:
        """Cheapest penalised path of a unit over its orientations, as a column (None when there is none).

        With ``weights=False`` the paths cost only their penalties (phase one: finding paths that keep the caps).
        """
        best: tuple[float, Chain | None, np.ndarray | None] = (np.inf, None, None)
        for ch in self.chains[ui]:
            if len(ch.typ) == 0:
                continue
            w, st = (ch.w, ch.st) if weights else (np.zeros_like(ch.w), np.zeros_like(ch.st))
            f, back, bs = stackdp.forward(
                ch.off, ch.typ, w, st, self.ok_up, self.big_up, self.sec, self.gid, pen, gpen, self.m
            )
            val, rows = stackdp.trace(ch.off, f, back, bs)
            if rows is not None and val < best[0]:
                best = (val, ch, rows)
        val, ch, rows = best
        if ch is None or rows is None:
            return np.inf, None
        return val, self.column(ch, rows)

    def column(self, ch: Chain, rows: np.ndarray) -> Column:
        """The column of a path (rows of a chain, one per storey)."""
        typ = ch.typ[rows]
        cost = float(ch.w[rows].sum())
        if len(rows) > 1:
            big = self.big_up[typ[1:], typ[:-1]]
            cost += float(ch.st[rows[1:]][big].sum())
        return Column(
            ch.unit, ch.cands[rows], cost, tuple(np.unique(typ).tolist()), tuple(np.unique(self.gid[typ]).tolist())
        )

    def column_of(self, ui: int, cand: np.ndarray) -> Column | None:
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
            seg = ch.cands[ch.off[i] : ch.off[i + 1], 0]
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
            f, _, _ = stackdp.forward(
                ch.off, ch.typ, ch.w, ch.st, self.ok_up, self.big_up, self.sec, self.gid, pen, gpen, self.m
            )
            top = f[ch.off[-2] : ch.off[-1]]
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
            new.append(Chain(ch.unit, ch.orient, off, ch.typ[k], ch.w[k], ch.st[k], ch.cands[k]))
        self.chains[ui] = new

    def assemble(self, columns: dict[int, Column]) -> np.ndarray:
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
