"""The integer program: a rationalised, continuous column schedule for the whole building.

One binary per kept candidate (cell, type, orientation); one binary per type
and per section when types or sections are counted; cumulative ("at least")
variables for every monotone attribute along each stack; section-change
indicators for the minimum run; starter-bar indicators where large steps are
paid for; one row per pair of storeys for the maximum steel at the lap
(EN 1992-1-1, 9.5.2(3), :func:`_lap_rows`). The formulation is written out in
``docs/integer_program.md``.

The model is formulated once (:func:`formulate`, rows with readable names) and
handed to a solver through one of two back-ends:

* ``"pulp"`` - :func:`build_model` makes a ``pulp.LpProblem`` (HiGHS through
  PuLP's highspy interface, or CBC through PuLP);
* ``"highspy"`` - the same rows passed to highspy in bulk as arrays, used by
  default for HiGHS on large models because PuLP's construction (one Python
  object per variable, term and row) dominates there.

Before formulating, :func:`reduce_problem` removes what provably cannot change
the optimum (see the docs): identical stacks are merged (one copy, weights
multiplied), candidates that lie on no buildable path of their stack are
dropped, and, given an incumbent, candidates whose cheapest path through the
stack already exceeds the incumbent's value by more than the slack.
"""

from __future__ import annotations

import re
import tempfile
import time
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from enum import StrEnum
from pathlib import Path
from typing import Literal

import numpy as np
import pulp

from optimizer.schedule.heuristic import (
    _Level,
    _Prepared,
    _run_states,
    baseline,
    cellwise_lower_bound,
    figures,
    rationalise,
    stack_optimum,
    starter_kg,
    step_per_face,
    transition,
)
from optimizer.schedule.problem import Objective, Schedule, ScheduleProblem, StepRule

__all__ = [
    "Status",
    "Reduction",
    "Formulation",
    "ModelVariables",
    "reduce_problem",
    "formulate",
    "build_model",
    "build_highs",
    "solve",
    "pareto",
]

SolverName = Literal["highs", "cbc"]
Backend = Literal["auto", "pulp", "highspy"]
Method = Literal["auto", "paths", "compact"]
TypePool = Literal["all", "paths"]
_EPS = 1e-6


class Status(StrEnum):
    """Outcome of a solve, as reported in :attr:`Schedule.status`."""

    OPTIMAL = "optimal"  # proven optimal (gap below 1e-6)
    WITHIN_GAP = "within gap"  # stopped with the proven gap below the requested relative gap
    TIME_LIMIT = "time limit"  # stopped by the time limit with a schedule; see the gap
    NO_SCHEDULE = "no schedule"  # stopped by the time limit without a schedule
    INFEASIBLE = "infeasible"  # proven: no schedule keeps every rule (see optimizer.schedule.diagnose)


# --------------------------------------------------------------------------------------------
# reductions
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Reduction:
    """What :func:`reduce_problem` kept.

    Attributes:
        keep: boolean mask over candidates kept in the model (only representative cells keep any).
        rep: representative cell of every cell (itself unless its stack was merged into an identical one).
        mult: number of identical cells each representative stands for (0 for merged-away cells).
        notes: what was reduced, in words.
        lower_bound: a valid lower bound on the optimum of the full problem (sum over stacks of their cheapest
            path ignoring the minimum run, plus the least price of types and sections), -inf when not computed.
    """

    keep: np.ndarray
    rep: np.ndarray
    mult: np.ndarray
    notes: tuple[str, ...] = ()
    lower_bound: float = -np.inf


def _stack_signature(prep: _Prepared, s: int) -> bytes | None:
    p = prep.problem
    parts = [b"free" if p.stack_free[s] else b"fixed"]
    for c in prep.chains[s]:
        if int(c) in prep.pinned:
            return None
        ks = prep.cell_cands(int(c))
        parts += [p.cand_type[ks].tobytes(), p.cand_orient[ks].tobytes(), np.round(prep.weight[ks], 9).tobytes(),
                  np.float64(p.storey_height_mm[c] if len(p.storey_height_mm) else 0.0).tobytes(), b"|"]
    return b"".join(parts)


def reduce_problem(problem: ScheduleProblem, incumbent: np.ndarray | None = None,
                   merge_stacks: bool = True, prune_paths: bool = True,
                   type_pool: np.ndarray | None = None) -> Reduction:
    """Safe reductions: merge identical stacks, drop candidates that cannot be in an optimal schedule.

    Args:
        problem: the problem.
        incumbent: a feasible schedule (candidate per cell) whose value bounds the optimum from above.
        merge_stacks: merge stacks with identical candidates, weights and storey heights (not grouped, not pinned).
        prune_paths: drop candidates on no buildable path of their stack, and (with an incumbent) those whose
            cheapest path is too dear.
        type_pool: boolean mask of types the model may use (the decomposition's type pool); this one is not safe:
            the optimum over the pool may be worse than the full optimum.

    Returns:
        The reduction; solving the reduced model and expanding gives an optimum of the full problem.
    """
    p = problem
    prep = _Prepared(p)
    n = p.n_cells
    rep = np.arange(n)
    mult = np.ones(n, dtype=int)
    notes: list[str] = []
    grouped = {g for grp in p.rules.groups for g in grp}
    if merge_stacks:
        seen: dict[bytes, int] = {}
        merged = 0
        for s in range(len(p.stack_names)):
            if p.stack_names[s] in grouped:
                continue
            sig = _stack_signature(prep, s)
            if sig is None:
                continue
            if sig in seen:
                r = seen[sig]
                rep[prep.chains[s]] = prep.chains[r]
                mult[prep.chains[r]] += 1
                mult[prep.chains[s]] = 0
                merged += 1
            else:
                seen[sig] = s
        if merged:
            notes.append(f"{merged} stacks merged into identical ones")
    keep = np.zeros(len(p.cand_cell), dtype=bool)
    for c in range(n):
        if mult[c] > 0:
            keep[prep.cell_cands(c)] = True
    if type_pool is not None:
        for unit in prep.units:
            for o, levels in unit.orients.items():
                unit.orients[o] = [_Level(lv.types[type_pool[lv.types]], lv.cands[type_pool[lv.types]],
                                          lv.weight[type_pool[lv.types]], lv.starter[type_pool[lv.types]])
                                   for lv in levels]
    if not prune_paths or prep.problems:
        if type_pool is not None:
            keep &= type_pool[p.cand_type]
            notes.append(f"type pool of {int(type_pool.sum())} types (decomposition: not a safe reduction)")
        return Reduction(keep, rep, mult, tuple(notes))
    # per unit and orientation: forward / backward cheapest paths ignoring the minimum run (a relaxation)
    through = np.full(len(p.cand_cell), np.inf)  # cheapest path of the unit through the candidate, x multiplicity
    unit_lb = np.zeros(n)  # cheapest path of the unit of each cell, x multiplicity
    lb_total = 0.0
    n_before = int(keep.sum())
    for unit in prep.units:
        m = int(mult[unit.cells[0, 0]])
        if m == 0:
            continue
        best = np.inf
        for levels in unit.orients.values():
            fw = [lv.weight.copy() for lv in levels]
            oks = []
            for i in range(1, len(levels)):
                ok, big = transition(p, levels[i - 1].types, levels[i].types)
                oks.append((ok, big))
                extra = np.where(big, levels[i].starter[None, :], 0.0)
                mat = np.where(ok, fw[i - 1][:, None] + extra, np.inf)
                fw[i] = levels[i].weight + (mat.min(axis=0) if len(fw[i - 1]) else np.inf)
            bw = [lv.weight.copy() for lv in levels]
            for i in range(len(levels) - 2, -1, -1):
                ok, big = oks[i]
                extra = np.where(big, levels[i + 1].starter[None, :], 0.0)
                mat = np.where(ok, bw[i + 1][None, :] + extra, np.inf)
                bw[i] = levels[i].weight + (mat.min(axis=1) if len(bw[i + 1]) else np.inf)
            for i, lv in enumerate(levels):
                val = (fw[i] + bw[i] - lv.weight) * m
                if len(val):
                    through[lv.cands] = np.minimum(through[lv.cands], val[:, None])
                    best = min(best, float(val.min()))
        unit_lb[unit.cells.ravel()] = best
        lb_total += best
    r = p.rules
    price_lb = (r.price_per_type + r.price_per_section) if n > 0 else 0.0
    slack = np.inf
    if incumbent is not None:
        slack = figures(p, incumbent).objective - lb_total - price_lb
    with np.errstate(invalid="ignore"):
        excess = through - unit_lb[p.cand_cell]
    keep &= np.isfinite(through) & ~(excess > slack + 1e-7 * max(1.0, abs(lb_total)))
    if type_pool is not None:
        keep &= type_pool[p.cand_type]
        notes.append(f"type pool of {int(type_pool.sum())} types (decomposition: not a safe reduction)")
    notes.append(f"{n_before - int(keep.sum())} of {n_before} candidates pruned (no buildable path"
                 + (f", or dearer than the incumbent by more than the slack {slack:.6g})" if incumbent is not None
                    else ")"))
    valid = type_pool is None  # over a pool, the paths bound only the pool's optimum
    return Reduction(keep, rep, mult, tuple(notes), lower_bound=lb_total + price_lb if valid else -np.inf)


# --------------------------------------------------------------------------------------------
# formulation
# --------------------------------------------------------------------------------------------


@dataclass
class Formulation:
    """The model as named columns and rows (the one formulation both back-ends use).

    Attributes:
        col_name, col_lb, col_ub, col_int, col_cost: columns.
        col_meta: what each column means (kind and indices), for warm starts and reading results.
        row_start, row_idx, row_val: rows in compressed sparse row form.
        row_lo, row_hi, row_name: row bounds and names.
        x_col: column of each kept candidate (-1 when not kept).
        y_col: column of each counted type (-1 when not counted).
        reduction: the reduction the model was built on.
        offset: constant added to the objective.
    """

    col_name: list[str]
    col_lb: np.ndarray
    col_ub: np.ndarray
    col_int: np.ndarray
    col_cost: np.ndarray
    col_meta: list[tuple]
    row_start: np.ndarray
    row_idx: np.ndarray
    row_val: np.ndarray
    row_lo: np.ndarray
    row_hi: np.ndarray
    row_name: list[str]
    x_col: np.ndarray
    y_col: np.ndarray
    reduction: Reduction
    offset: float = 0.0

    @property
    def n_cols(self) -> int:
        """Number of columns."""
        return len(self.col_name)

    @property
    def n_rows(self) -> int:
        """Number of rows."""
        return len(self.row_name)

    @property
    def n_binaries(self) -> int:
        """Number of binary columns."""
        return int(self.col_int.sum())

    @property
    def n_nonzeros(self) -> int:
        """Number of matrix entries."""
        return len(self.row_idx)


class _Builder:
    """Collects columns and rows of a formulation."""

    def __init__(self) -> None:
        self.name: list[str] = []
        self.lb: list[float] = []
        self.ub: list[float] = []
        self.integer: list[bool] = []
        self.cost: list[float] = []
        self.meta: list[tuple] = []
        self.r_idx: list[np.ndarray] = []
        self.r_val: list[np.ndarray] = []
        self.r_len: list[int] = []
        self.r_lo: list[float] = []
        self.r_hi: list[float] = []
        self.r_name: list[str] = []

    def col(self, name: str, meta: tuple, lb: float = 0.0, ub: float = 1.0, integer: bool = True,
            cost: float = 0.0) -> int:
        self.name.append(name)
        self.lb.append(lb)
        self.ub.append(ub)
        self.integer.append(integer)
        self.cost.append(cost)
        self.meta.append(meta)
        return len(self.name) - 1

    def row(self, name: str, idx: list[int] | np.ndarray, val: list[float] | np.ndarray, lo: float,
            hi: float) -> None:
        idx = np.asarray(idx, dtype=np.int64)
        val = np.asarray(val, dtype=float)
        if len(idx) == 0 and lo <= 0.0 <= hi:
            return
        self.r_idx.append(idx)
        self.r_val.append(val)
        self.r_len.append(len(idx))
        self.r_lo.append(lo)
        self.r_hi.append(hi)
        self.r_name.append(name)

    def finish(self, n_cand: int, x_col: np.ndarray, y_col: np.ndarray, reduction: Reduction) -> Formulation:
        starts = np.zeros(len(self.r_len) + 1, dtype=np.int64)
        np.cumsum(self.r_len, out=starts[1:])
        return Formulation(
            col_name=self.name, col_lb=np.array(self.lb), col_ub=np.array(self.ub),
            col_int=np.array(self.integer, dtype=bool), col_cost=np.array(self.cost), col_meta=self.meta,
            row_start=starts,
            row_idx=np.concatenate(self.r_idx) if self.r_idx else np.zeros(0, dtype=np.int64),
            row_val=np.concatenate(self.r_val) if self.r_val else np.zeros(0),
            row_lo=np.array(self.r_lo), row_hi=np.array(self.r_hi), row_name=self.r_name,
            x_col=x_col, y_col=y_col, reduction=reduction)


_ATTRS = ("b", "h", "nb", "nh", "dia", "corner_dia", "fck")


def _clean(text: str) -> str:
    return re.sub(r"[^A-Za-z0-9_.]", "_", text)


def formulate(problem: ScheduleProblem, max_types: int | None = None,
              reduction: Reduction | None = None) -> Formulation:
    """Write the integer program as named columns and rows.

    Args:
        problem: the problem.
        max_types: cap on distinct types (None: the rules' cap).
        reduction: candidates kept and merged stacks (None: everything kept).

    Returns:
        The formulation.
    """
    p = problem
    r = p.rules
    t_ = p.types
    prep = _Prepared(p)
    if reduction is None:
        reduction = Reduction(np.ones(len(p.cand_cell), dtype=bool), np.arange(p.n_cells),
                              np.ones(p.n_cells, dtype=int))
    keep, mult = reduction.keep, reduction.mult
    cap_t = max_types if max_types is not None else r.max_types
    cap_s = r.max_sections
    count_types = cap_t is not None or r.price_per_type > 0 or cap_s is not None or r.price_per_section > 0
    count_secs = cap_s is not None or r.price_per_section > 0
    rule = StepRule(r.step_rule)
    steel_obj = Objective(p.objective) is Objective.STEEL
    pay_starters = rule is StepRule.STARTERS and steel_obj and len(t_.starter_kg_per_m) > 0
    m_run = _run_states(p)
    weight = prep.weight
    bld = _Builder()
    n_cand = len(p.cand_cell)
    x_col = np.full(n_cand, -1, dtype=np.int64)
    cells_of_stack = [ch[mult[ch] > 0] if len(ch) else ch for ch in prep.chains]
    kept_of_cell: dict[int, np.ndarray] = {}
    for ch in cells_of_stack:
        for c in ch:
            ks = prep.cell_cands(int(c))
            kept_of_cell[int(c)] = ks[keep[ks]]

    def cell_label(c: int) -> str:
        stack, level = p.cell_names[c]
        return _clean(f"{stack}_{level}")

    # x: one binary per kept candidate, weight times multiplicity
    for c, ks in kept_of_cell.items():
        lab = cell_label(c)
        for k in ks:
            t = int(p.cand_type[k])
            x_col[k] = bld.col(f"x_{lab}_t{t}_o{int(p.cand_orient[k])}", ("x", int(k)),
                               cost=float(weight[k]) * int(mult[c]))
    # assignment: exactly one candidate per cell
    for c, ks in kept_of_cell.items():
        bld.row(f"assign_{cell_label(c)}", x_col[ks], np.ones(len(ks)), 1.0, 1.0)
    # pinned cells: only candidates of the pinned type
    for c, t in r.pinned:
        c = int(reduction.rep[int(c)])
        ks = kept_of_cell.get(c, np.zeros(0, dtype=int))
        bad = ks[p.cand_type[ks] != int(t)]
        for k in bad:
            bld.row(f"pin_{cell_label(c)}_t{int(p.cand_type[k])}", [x_col[k]], [1.0], 0.0, 0.0)
    # types and sections: disaggregated linking x[c,t] <= y[t], y[t] <= s[section]
    y_col = np.full(len(t_), -1, dtype=np.int64)
    if count_types:
        all_kept = np.flatnonzero(x_col >= 0)
        used_t = np.unique(p.cand_type[all_kept])
        for t in used_t:
            y_col[t] = bld.col(f"y_{_clean(t_.mark[t])}_t{t}", ("y", int(t)), cost=r.price_per_type)
        for k in all_kept:
            t = int(p.cand_type[k])
            bld.row(f"link_{cell_label(int(p.cand_cell[k]))}_t{t}_o{int(p.cand_orient[k])}",
                    [x_col[k], y_col[t]], [1.0, -1.0], -np.inf, 0.0)
        if cap_t is not None:
            bld.row("cap_types", y_col[used_t], np.ones(len(used_t)), -np.inf, float(cap_t))
        if count_secs:
            sec_col: dict[int, int] = {}
            for s in np.unique(t_.section[used_t]):
                sec_col[int(s)] = bld.col(f"section_{int(s)}", ("sec", int(s)), cost=r.price_per_section)
            for t in used_t:
                s = int(t_.section[t])
                bld.row(f"section_link_t{t}_s{s}", [y_col[t], sec_col[s]], [1.0, -1.0], -np.inf, 0.0)
            if cap_s is not None:
                bld.row("cap_sections", list(sec_col.values()), np.ones(len(sec_col)), -np.inf, float(cap_s))
    # concrete grades: building-wide cap and cap on changes per stack (grade binaries per building / stack,
    # linked cell by cell: the candidates of one grade in a cell sum to at most the grade's binary)
    grades = np.unique(t_.fck)
    if r.max_grades is not None:
        g_col = {float(g): bld.col(f"grade_{g:g}", ("g", float(g))) for g in grades}
        for c, ks in kept_of_cell.items():
            for g in grades:
                kg = ks[t_.fck[p.cand_type[ks]] == g]
                if len(kg):
                    bld.row(f"grade_link_{cell_label(c)}_{g:g}", list(x_col[kg]) + [g_col[float(g)]],
                            [1.0] * len(kg) + [-1.0], -np.inf, 0.0)
        bld.row("cap_grades", list(g_col.values()), np.ones(len(g_col)), -np.inf, float(r.max_grades))
    if r.max_grade_changes is not None:
        # with grades that never rise going up, changes = distinct grades in the stack - 1
        for s, ch in enumerate(cells_of_stack):
            if len(ch) == 0:
                continue
            gs = {float(g): bld.col(f"stack_grade_{_clean(p.stack_names[s])}_{g:g}", ("gs", s, float(g)))
                  for g in grades}
            for c in ch:
                ks = kept_of_cell[int(c)]
                for g in grades:
                    kg = ks[t_.fck[p.cand_type[ks]] == g]
                    if len(kg):
                        bld.row(f"stack_grade_link_{cell_label(int(c))}_{g:g}", list(x_col[kg]) + [gs[float(g)]],
                                [1.0] * len(kg) + [-1.0], -np.inf, 0.0)
            bld.row(f"cap_grade_changes_{_clean(p.stack_names[s])}", list(gs.values()), np.ones(len(gs)), -np.inf,
                    float(r.max_grade_changes + 1))
    # orientation: one per stack
    for s, ch in enumerate(cells_of_stack):
        if not p.stack_free[s] or len(ch) == 0:
            continue
        if not any((p.cand_orient[kept_of_cell[int(c)]] == 1).any() for c in ch):
            continue  # no turned candidate kept: every cell keeps orientation 0
        o = bld.col(f"turn_{_clean(p.stack_names[s])}", ("o", s))
        for c in ch:
            ks = kept_of_cell[int(c)]
            k1 = ks[p.cand_orient[ks] == 1]
            bld.row(f"orient_{cell_label(int(c))}", list(x_col[k1]) + [o], [1.0] * len(k1) + [-1.0], 0.0, 0.0)
    # cumulative variables per stack and attribute: z[c, v] = 1 if attribute at c >= v
    attrs: list[str] = []
    eq_attrs: list[str] = []
    if r.monotone_sections:
        attrs += ["b", "h"]
        eq_attrs.append("circ")
    elif rule is not StepRule.FORBID_ANY:
        attrs += ["b", "h"]
    if r.monotone_bars:
        attrs += ["nb", "nh", "dia", "corner_dia"]
    if r.monotone_grade:
        attrs.append("fck")
    mono = {"b": r.monotone_sections, "h": r.monotone_sections, "nb": True, "nh": True, "dia": True,
            "corner_dia": True, "fck": True}
    for s, ch in enumerate(cells_of_stack):
        if len(ch) < 2:
            continue
        sname = _clean(p.stack_names[s])
        zcols: dict[str, dict[int, dict[float, int]]] = {}
        lowest: dict[str, np.ndarray] = {}
        for attr in attrs + eq_attrs:
            vals_all = getattr(t_, attr).astype(float)
            present = np.unique(np.concatenate([vals_all[p.cand_type[kept_of_cell[int(c)]]] for c in ch]))
            levels = present[1:]  # z at the lowest value is 1
            if len(levels) == 0:
                continue
            zcols[attr] = {}
            lowest[attr] = present
            for c in ch:
                c = int(c)
                ks = kept_of_cell[c]
                av = vals_all[p.cand_type[ks]]
                zc = {float(v): bld.col(f"z_{attr}_{cell_label(c)}_ge{v:g}", ("z", attr, c, float(v)), integer=False)
                      for v in levels}
                zcols[attr][c] = zc
                for j, v in enumerate(levels):
                    nxt = levels[j + 1] if j + 1 < len(levels) else None
                    sel = x_col[ks[np.abs(av - v) < _EPS]]
                    idx = [zc[v]] + ([zc[nxt]] if nxt is not None else []) + list(sel)
                    val = [1.0] + ([-1.0] if nxt is not None else []) + [-1.0] * len(sel)
                    bld.row(f"cum_{attr}_{cell_label(c)}_ge{v:g}", idx, val, 0.0, 0.0)
        for i in range(1, len(ch)):
            lo, up = int(ch[i - 1]), int(ch[i])
            pair = f"{sname}_{_clean(p.cell_names[up][1])}_on_{_clean(p.cell_names[lo][1])}"
            _lap_rows(bld, p, pair, kept_of_cell[lo], kept_of_cell[up], x_col)
            for attr in attrs:
                if attr not in zcols or not mono.get(attr, True):
                    continue
                if attr in ("b", "h") and not r.monotone_sections:
                    continue
                for v, zu in zcols[attr][up].items():
                    bld.row(f"mono_{attr}_{pair}_ge{v:g}", [zu, zcols[attr][lo][v]], [1.0, -1.0], -np.inf, 0.0)
            for attr in eq_attrs:
                if attr not in zcols:
                    continue
                for v, zu in zcols[attr][up].items():
                    bld.row(f"same_{attr}_{pair}", [zu, zcols[attr][lo][v]], [1.0, -1.0], 0.0, 0.0)
            # size steps (per face = half the change of width or depth): if the larger cell has
            # attr >= v, the smaller must have attr >= the first value not below v - 2 * max_step
            if rule not in (StepRule.LIMIT, StepRule.STARTERS):
                continue
            if rule is StepRule.STARTERS and not pay_starters:
                continue  # large steps allowed and not paid for in this objective
            u_col = None
            if rule is StepRule.STARTERS:
                u_col = bld.col(f"starters_{pair}", ("u", up, lo), integer=False)
            for attr in ("b", "h"):
                if attr not in zcols:
                    continue
                allv = lowest[attr]
                directions = [(lo, up)] if r.monotone_sections else [(lo, up), (up, lo)]
                for big_c, small_c in directions:
                    tag = "down" if big_c == lo else "up"
                    for v in allv[1:]:
                        j = int(np.searchsorted(allv, v - 2.0 * r.max_step_mm - _EPS, side="left"))
                        if j == 0:
                            continue  # the lowest value is always reached
                        zb, zs = zcols[attr][big_c][float(v)], zcols[attr][small_c][float(allv[j])]
                        if u_col is None:
                            bld.row(f"step_{attr}_{tag}_{pair}_ge{v:g}", [zb, zs], [1.0, -1.0], -np.inf, 0.0)
                        else:
                            bld.row(f"step_{attr}_{tag}_{pair}_ge{v:g}", [zb, zs, u_col], [1.0, -1.0, -1.0],
                                    -np.inf, 0.0)
            if u_col is not None:
                ks = kept_of_cell[up]
                st = starter_kg(p, up, p.cand_type[ks])
                for k, mass in zip(ks, st, strict=True):
                    if mass <= 0:
                        continue
                    tag = f"{pair}_t{int(p.cand_type[k])}_o{int(p.cand_orient[k])}"
                    v_col = bld.col(f"starter_mass_{tag}", ("v", int(k), lo), integer=False, ub=np.inf,
                                    cost=float(mass) * int(mult[up]))
                    bld.row(f"starter_if_{tag}", [v_col, x_col[k], u_col], [1.0, -1.0, -1.0], -1.0, np.inf)
        # sections: forbidden change, or minimum run via change indicators
        if rule is StepRule.FORBID_ANY or m_run > 1:
            d_cols: list[int | None] = [None]
            for i in range(1, len(ch)):
                lo, up = int(ch[i - 1]), int(ch[i])
                pair = f"{sname}_{_clean(p.cell_names[up][1])}_on_{_clean(p.cell_names[lo][1])}"
                k_lo, k_up = kept_of_cell[lo], kept_of_cell[up]
                s_lo, s_up = t_.section[p.cand_type[k_lo]], t_.section[p.cand_type[k_up]]
                if rule is StepRule.FORBID_ANY:
                    for sec in np.union1d(s_lo, s_up):
                        a, b = x_col[k_up[s_up == sec]], x_col[k_lo[s_lo == sec]]
                        bld.row(f"same_section_{pair}_s{int(sec)}", list(a) + list(b),
                                [1.0] * len(a) + [-1.0] * len(b), 0.0, 0.0)
                    continue
                d = bld.col(f"change_{pair}", ("d", up, lo), integer=False, ub=0.0 if i < m_run else 1.0)
                d_cols.append(d)
                for sec in np.unique(s_up):
                    a, b = x_col[k_up[s_up == sec]], x_col[k_lo[s_lo == sec]]
                    bld.row(f"change_if_{pair}_s{int(sec)}", [d] + list(a) + list(b),
                            [1.0] + [-1.0] * len(a) + [1.0] * len(b), 0.0, np.inf)
            if rule is not StepRule.FORBID_ANY:
                for i in range(1, len(ch) - m_run + 1):
                    window = [d_cols[j] for j in range(i, i + m_run)]
                    bld.row(f"min_run_{sname}_{_clean(p.cell_names[int(ch[i])][1])}", window,
                            np.ones(len(window)), -np.inf, 1.0)
    # groups: identical candidates level by level
    index = {name: i for i, name in enumerate(p.stack_names)}
    for group in r.groups:
        members = [index[g] for g in group if g in index]
        for other in members[1:]:
            ref = members[0]
            by_level = {p.cell_names[int(c)][1]: int(c) for c in prep.chains[ref]}
            for c in prep.chains[other]:
                c = int(c)
                lv = p.cell_names[c][1]
                if lv not in by_level:
                    continue
                c0 = by_level[lv]
                k0, k1 = kept_of_cell[c0], kept_of_cell[c]
                key0 = {(int(p.cand_type[k]), int(p.cand_orient[k])): int(k) for k in k0}
                key1 = {(int(p.cand_type[k]), int(p.cand_orient[k])): int(k) for k in k1}
                for key in sorted(set(key0) | set(key1)):
                    cols = ([x_col[key0[key]]] if key in key0 else []) + ([x_col[key1[key]]] if key in key1 else [])
                    vals = ([1.0] if key in key0 else []) + ([-1.0] if key in key1 else [])
                    bld.row(f"group_{_clean(p.stack_names[ref])}_{_clean(p.stack_names[other])}_{_clean(lv)}"
                            f"_t{key[0]}_o{key[1]}", cols, vals, 0.0, 0.0)
    return bld.finish(n_cand, x_col, y_col, reduction)


def _lap_rows(bld: _Builder, p: ScheduleProblem, pair: str, k_lo: np.ndarray, k_up: np.ndarray,
              x_col: np.ndarray) -> None:
    """Maximum steel at the lap between two storeys of a stack (EN 1992-1-1, 9.5.2(3)).

    As[lower] + As[upper] <= ratio Ac[upper] for the chosen pair, written as one row over the kept
    candidates of both cells: sum As x[lo] + sum (As - ratio Ac) x[up] <= 0. It is exact because each
    cell takes exactly one candidate. The row is left out when no kept pair can break it.

    With the STARTERS step rule a pair whose step needs separate starter bars is exempt (the lap then
    holds 2 As[upper], limited per cell; see :func:`optimizer.schedule.heuristic.transition`). Whether a pair
    is such a step depends only on the two sections, so there is then one row per upper section S over
    the lower candidates L_S not stepped from S:

        sum_{L_S} As x[lo] + D sum_{not L_S} x[lo] + sum_{S} (As - ratio Ac) x[up] - M sum_{not S} x[up] <= 0

    with D = min over S of (ratio Ac - As) (a stepped lower candidate under S never binds) and
    M = max(max As over L_S, D) (an upper candidate of another section never binds). Each is exact on
    the pairs it describes, and the rows of all upper sections together say exactly the rule.
    """
    r = p.rules
    ratio = r.lap_steel_ratio_max
    if ratio is None or len(k_lo) == 0 or len(k_up) == 0:
        return
    t_ = p.types
    t_lo, t_up = p.cand_type[k_lo], p.cand_type[k_up]
    a_lo = t_.As[t_lo]
    c_up = t_.As[t_up] - ratio * t_.Ac[t_up]  # <= 0 when the upper type alone passes
    exempt = None
    if StepRule(r.step_rule) is StepRule.STARTERS:
        exempt = step_per_face(t_.b[t_lo][:, None], t_.h[t_lo][:, None], t_.b[t_up][None, :],
                               t_.h[t_up][None, :]) > r.max_step_mm + _EPS
        if not exempt.any():
            exempt = None
    if exempt is None:
        if a_lo.max() + c_up.max() <= _EPS:
            return  # cannot bind
        bld.row(f"lap_As_max_{pair}", np.concatenate([x_col[k_lo], x_col[k_up]]), np.concatenate([a_lo, c_up]),
                -np.inf, _EPS)
        return
    sec_up = t_.section[t_up]
    for sec in np.unique(sec_up):
        in_s = sec_up == sec
        j = int(np.flatnonzero(in_s)[0])
        held = ~exempt[:, j]  # lower candidates lapping with the bars of section `sec` (the same for all of S)
        if not held.any() or a_lo[held].max() + c_up[in_s].max() <= _EPS:
            continue
        d = float(-c_up[in_s].max())
        big_m = max(float(a_lo[held].max()), d)
        val_lo = np.where(held, a_lo, d)
        val_up = np.where(in_s, c_up, -big_m)
        bld.row(f"lap_As_max_{pair}_s{int(sec)}", np.concatenate([x_col[k_lo], x_col[k_up]]),
                np.concatenate([val_lo, val_up]), -np.inf, _EPS)


# --------------------------------------------------------------------------------------------
# back-ends
# --------------------------------------------------------------------------------------------


@dataclass
class ModelVariables:
    """The PuLP variables of a model, by what they mean.

    Attributes:
        columns: every variable, in formulation column order.
        x: variable of each kept candidate (candidate index -> variable).
        y: variable of each counted type (type index -> variable).
        formulation: the formulation the model was built from.
    """

    columns: list[pulp.LpVariable]
    x: dict[int, pulp.LpVariable]
    y: dict[int, pulp.LpVariable]
    formulation: Formulation


def build_model(problem: ScheduleProblem, max_types: int | None = None,
                reduction: Reduction | None = None) -> tuple[pulp.LpProblem, ModelVariables]:
    """The integer program as a PuLP problem.

    Args:
        problem: the problem (plain data).
        max_types: cap on distinct types (None: the rules' cap).
        reduction: candidates kept and stacks merged (None: the full model).

    Returns:
        The PuLP problem and its variables.
    """
    form = formulate(problem, max_types=max_types, reduction=reduction)
    return _pulp_from(form, problem)


def _pulp_from(form: Formulation, problem: ScheduleProblem) -> tuple[pulp.LpProblem, ModelVariables]:
    prob = pulp.LpProblem(f"column_schedule_{Objective(problem.objective).value}", pulp.LpMinimize)
    cols = [pulp.LpVariable(name, lowBound=float(lb), upBound=None if ub == np.inf else float(ub),
                            cat=pulp.LpBinary if (integer and lb == 0 and ub == 1) else
                            (pulp.LpInteger if integer else pulp.LpContinuous))
            for name, lb, ub, integer in zip(form.col_name, form.col_lb, form.col_ub, form.col_int, strict=True)]
    nz = np.flatnonzero(form.col_cost)
    prob += pulp.LpAffineExpression([(cols[j], float(form.col_cost[j])) for j in nz]), "objective"
    for i, name in enumerate(form.row_name):
        a, b = form.row_start[i], form.row_start[i + 1]
        expr = pulp.LpAffineExpression([(cols[j], float(v)) for j, v in zip(form.row_idx[a:b], form.row_val[a:b],
                                                                             strict=True)])
        lo, hi = form.row_lo[i], form.row_hi[i]
        if lo == hi:
            prob += (expr == float(lo), name)
        else:
            if lo > -np.inf:
                prob += (expr >= float(lo), name if hi == np.inf else f"{name}_lo")
            if hi < np.inf:
                prob += (expr <= float(hi), name if lo == -np.inf else f"{name}_hi")
    x = {int(k): cols[int(j)] for k, j in enumerate(form.x_col) if j >= 0}
    y = {int(t): cols[int(j)] for t, j in enumerate(form.y_col) if j >= 0}
    return prob, ModelVariables(cols, x, y, form)


_HIGHS_GREETED = False


def new_highs():  # noqa: ANN201 - highspy is typed loosely
    """A silent ``highspy.Highs`` object.

    HiGHS prints a banner on stdout when the first object of a process is made, before any option can be set;
    that first construction happens here with stdout (the file descriptor) sent to /dev/null.
    """
    import os
    import sys

    import highspy

    global _HIGHS_GREETED  # noqa: PLW0603 - once per process
    if not _HIGHS_GREETED:
        sys.stdout.flush()
        saved = os.dup(1)
        devnull = os.open(os.devnull, os.O_WRONLY)
        try:
            os.dup2(devnull, 1)
            highspy.Highs()
        finally:
            os.dup2(saved, 1)
            os.close(saved)
            os.close(devnull)
        _HIGHS_GREETED = True
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    return h


def build_highs(form: Formulation, threads: int | None = None):  # noqa: ANN201 - highspy is typed loosely
    """The same formulation passed to highspy in bulk (columns, then rows in compressed sparse form).

    Args:
        form: the formulation.
        threads: HiGHS threads (None: its default).

    Returns:
        A ``highspy.Highs`` object holding the model.
    """
    import highspy

    h = new_highs()
    if threads is not None:
        h.setOptionValue("threads", threads)
    inf = highspy.kHighsInf
    lb = np.where(np.isinf(form.col_lb), -inf, form.col_lb)
    ub = np.where(np.isinf(form.col_ub), inf, form.col_ub)
    h.addVars(form.n_cols, lb, ub)
    h.changeColsCost(form.n_cols, np.arange(form.n_cols, dtype=np.int32), form.col_cost)
    ints = np.flatnonzero(form.col_int).astype(np.int32)
    if len(ints):
        h.changeColsIntegrality(len(ints), ints, np.full(len(ints), highspy.HighsVarType.kInteger))
    lo = np.where(np.isinf(form.row_lo), -inf, form.row_lo)
    hi = np.where(np.isinf(form.row_hi), inf, form.row_hi)
    h.addRows(form.n_rows, lo, hi, len(form.row_idx), form.row_start[:-1].astype(np.int32),
              form.row_idx.astype(np.int32), form.row_val)
    return h


def _start_values(problem: ScheduleProblem, form: Formulation, cand: np.ndarray) -> np.ndarray | None:
    """Column values of a full-problem schedule in the (reduced) formulation, or None if it does not fit."""
    p = problem
    t_ = p.types
    rep = form.reduction.rep
    type_of = p.cand_type[cand]
    # representative cells must hold candidates that were kept
    x_of_cell = {}
    for c in range(p.n_cells):
        if form.reduction.mult[c] > 0:
            k = int(cand[c])
            if form.x_col[k] < 0:
                return None
            x_of_cell[c] = k
    used = set(type_of[[c for c in range(p.n_cells) if rep[c] == c]].tolist())
    val = np.zeros(form.n_cols)
    for j, meta in enumerate(form.col_meta):
        kind = meta[0]
        if kind == "x":
            k = meta[1]
            val[j] = 1.0 if x_of_cell.get(int(p.cand_cell[k])) == k else 0.0
        elif kind == "y":
            val[j] = 1.0 if meta[1] in used else 0.0
        elif kind == "sec":
            val[j] = 1.0 if any(int(t_.section[t]) == meta[1] for t in used) else 0.0
        elif kind == "o":
            s = meta[1]
            cs = [c for c in x_of_cell if p.stack[c] == s]
            val[j] = float(p.cand_orient[x_of_cell[cs[0]]]) if cs else 0.0
        elif kind == "z":
            _, attr, c, v = meta
            val[j] = 1.0 if float(getattr(t_, attr)[type_of[c]]) >= v - _EPS else 0.0
        elif kind == "d":
            _, up, lo = meta
            val[j] = 1.0 if t_.section[type_of[up]] != t_.section[type_of[lo]] else 0.0
        elif kind == "u":
            _, up, lo = meta
            _, big = transition(p, np.array([type_of[lo]]), np.array([type_of[up]]))
            val[j] = 1.0 if big[0, 0] else 0.0
        elif kind == "v":
            _, k, lo = meta
            up = int(p.cand_cell[k])
            _, big = transition(p, np.array([type_of[lo]]), np.array([type_of[up]]))
            val[j] = 1.0 if (big[0, 0] and x_of_cell.get(up) == k) else 0.0
    return val


def _expand(problem: ScheduleProblem, form: Formulation, xval: np.ndarray) -> np.ndarray:
    """Candidate per cell from the x columns (merged cells copy their representative's type and orientation)."""
    p = problem
    cand = np.full(p.n_cells, -1, dtype=int)
    kept = np.flatnonzero(form.x_col >= 0)
    chosen = kept[xval[form.x_col[kept]] > 0.5]
    cand[p.cand_cell[chosen]] = chosen
    rep = form.reduction.rep
    prep = None
    for c in range(p.n_cells):
        if rep[c] != c:
            if prep is None:
                prep = _Prepared(p)
            k0 = cand[rep[c]]
            ks = prep.cell_cands(c, int(p.cand_orient[k0]))
            cand[c] = int(ks[p.cand_type[ks] == p.cand_type[k0]][0])
    return cand


# --------------------------------------------------------------------------------------------
# solving
# --------------------------------------------------------------------------------------------


class _HiGHSWarm(pulp.HiGHS):
    """PuLP's HiGHS interface, with the variables' initial values handed to HiGHS as a start."""

    def callSolver(self, lp: pulp.LpProblem) -> None:  # noqa: D102
        import highspy

        h = lp.solverModel
        values = [v.varValue if v.varValue is not None else 0.0 for v in lp.variables()]
        if any(v.varValue is not None for v in lp.variables()):
            sol = highspy.HighsSolution()
            sol.col_value = values
            sol.value_valid = True
            h.setSolution(sol)
        h.run()


@dataclass
class _Outcome:
    status: Status
    xval: np.ndarray | None
    objective: float
    bound: float
    seconds: float
    notes: list[str] = field(default_factory=list)


def _status_from(has_solution: bool, infeasible: bool, gap: float, gap_rel: float, stopped: bool) -> Status:
    if infeasible:
        return Status.INFEASIBLE
    if not has_solution:
        return Status.NO_SCHEDULE
    if gap <= 1e-6:
        return Status.OPTIMAL
    if not stopped and gap <= gap_rel + 1e-9:
        return Status.WITHIN_GAP
    return Status.TIME_LIMIT


def _solve_highspy(form: Formulation, start: np.ndarray | None, time_limit_s: float, gap_rel: float,
                   threads: int | None) -> _Outcome:
    import highspy

    h = build_highs(form, threads)
    h.setOptionValue("time_limit", float(time_limit_s))
    h.setOptionValue("mip_rel_gap", float(gap_rel))
    if start is not None:
        sol = highspy.HighsSolution()
        sol.col_value = list(start)
        sol.value_valid = True
        h.setSolution(sol)
    t0 = time.perf_counter()
    h.run()
    secs = time.perf_counter() - t0
    ms = h.getModelStatus()
    info = h.getInfo()
    has = info.primal_solution_status == 2  # kSolutionStatusFeasible
    infeasible = ms == highspy.HighsModelStatus.kInfeasible
    xval = np.array(h.getSolution().col_value) if has else None
    # the objective of the returned columns (HiGHS's reported value was seen to differ after a start was set)
    obj = float(form.col_cost @ xval) + form.offset if xval is not None else np.inf
    bound = min(float(info.mip_dual_bound), obj)
    stopped = ms in (highspy.HighsModelStatus.kTimeLimit, highspy.HighsModelStatus.kInterrupt)
    gap = abs(obj - bound) / max(abs(obj), 1e-9) if has else np.inf
    return _Outcome(_status_from(has, infeasible, gap, gap_rel, stopped), xval, obj, bound, secs,
                    [f"HiGHS status: {h.modelStatusToString(ms)}", f"branch-and-bound nodes: {info.mip_node_count}"])


def _solve_pulp(problem: ScheduleProblem, form: Formulation, start: np.ndarray | None, solver: SolverName,
                time_limit_s: float, gap_rel: float, threads: int | None) -> _Outcome:
    prob, mv = _pulp_from(form, problem)
    if start is not None:
        for var, v in zip(mv.columns, start, strict=True):
            var.setInitialValue(float(v))
    t0 = time.perf_counter()
    if solver == "highs":
        new_highs()  # the banner of the first HiGHS object goes to /dev/null
        cmd = _HiGHSWarm(msg=False, timeLimit=time_limit_s, gapRel=gap_rel, threads=threads)
        prob.solve(cmd)
        secs = time.perf_counter() - t0
        import highspy

        h = prob.solverModel
        ms = h.getModelStatus()
        info = h.getInfo()
        has = info.primal_solution_status == 2
        infeasible = ms == highspy.HighsModelStatus.kInfeasible
        bound = float(info.mip_dual_bound)
        stopped = ms == highspy.HighsModelStatus.kTimeLimit
        notes = [f"HiGHS status: {h.modelStatusToString(ms)}", f"branch-and-bound nodes: {info.mip_node_count}"]
    else:
        with tempfile.TemporaryDirectory() as tmp:
            log = Path(tmp) / "cbc.log"
            cmd = pulp.PULP_CBC_CMD(msg=False, timeLimit=time_limit_s, gapRel=gap_rel, warmStart=start is not None,
                                    threads=threads, logPath=str(log))
            prob.solve(cmd)
            secs = time.perf_counter() - t0
            text = log.read_text() if log.exists() else ""
        has = pulp.LpStatus[prob.status] in ("Optimal",) or prob.sol_status in (
            pulp.LpSolutionOptimal, pulp.LpSolutionIntegerFeasible)
        has = has and all(v.varValue is not None for v in mv.x.values())
        infeasible = pulp.LpStatus[prob.status] == "Infeasible"
        bound = _cbc_bound(text)
        stopped = "Stopped on time" in text or "stopped on time" in text.lower()
        notes = [f"CBC: {pulp.LpStatus[prob.status]}"]
    xval = np.array([v.varValue if v.varValue is not None else 0.0 for v in mv.columns]) if has else None
    obj = float(pulp.value(prob.objective)) if has else np.inf
    if not np.isfinite(bound):
        bound = obj if (has and not stopped and solver == "cbc") else -np.inf
    gap = abs(obj - bound) / max(abs(obj), 1e-9) if has and np.isfinite(bound) else np.inf
    return _Outcome(_status_from(has, infeasible, gap, gap_rel, stopped), xval, obj, bound, secs, notes)


def _cbc_bound(log: str) -> float:
    """Best possible objective from a CBC log (NaN-free), or -inf when absent."""
    for pat in (r"Lower bound:\s*([-\d.eE+]+)", r"best possible\s*([-\d.eE+]+)", r"Best possible\s*([-\d.eE+]+)"):
        found = re.findall(pat, log)
        if found:
            try:
                return float(found[-1])
            except ValueError:
                continue
    if re.search(r"Result - Optimal solution found", log):
        m = re.findall(r"Objective value:\s*([-\d.eE+]+)", log)
        if m:
            return float(m[-1])
    return -np.inf


def solve(problem: ScheduleProblem, solver: SolverName = "highs", time_limit_s: float = 60.0,
          gap_rel: float = 0.01, max_types: int | None = None, warm_start: Schedule | None = None,
          progress: Callable[[str], None] | None = None, backend: Backend = "auto", reduce: bool = True,
          threads: int | None = None, exact_decomposition: bool = True,
          type_pool: TypePool = "all", method: Method = "auto") -> Schedule:
    """Solve the scheduling problem to a proven gap (or the time limit).

    Args:
        problem: the problem.
        solver: "highs" (default) or "cbc".
        time_limit_s: solver time limit, seconds (the reductions and the model build come on top).
        gap_rel: relative gap at which the solver stops.
        max_types: cap on distinct types (None: the rules' cap).
        warm_start: a feasible schedule handed to the solver (None: the greedy heuristic's).
        progress: called with a line of text at each stage.
        backend: "pulp", "highspy" (HiGHS only) or "auto" (highspy for HiGHS, PuLP for CBC).
        reduce: apply the safe reductions of :func:`reduce_problem`.
        threads: solver threads (None: the solver's default).
        exact_decomposition: when nothing couples the stacks (no cap or price on types or sections), return
            the per-stack shortest paths, which are then optimal.
        type_pool: "all" (every type: the solver's bound is a bound of the problem), or "paths" (decomposition:
            only the types of the stacks' own cheapest paths, of the warm start and of the baseline; the reported
            bound is then the per-stack bound of the full problem, not the solver's).
        method: "paths" (column generation over stack paths, :mod:`optimizer.schedule.paths`; the time limit is then
            the whole solve), "compact" (this module's model, one binary per candidate) or "auto" (paths
            whenever something couples the stacks and the path formulation is valid, else compact).

    Returns:
        The schedule with status, objective (recomputed from the problem), best bound and proven gap.
    """
    say = progress or (lambda _msg: None)
    t_all = time.perf_counter()
    r = problem.rules
    cap_t = max_types if max_types is not None else r.max_types
    coupled = (cap_t is not None or r.max_sections is not None or r.price_per_type > 0
               or r.price_per_section > 0 or r.max_grades is not None or r.max_grade_changes is not None)
    notes: list[str] = []
    if not coupled and exact_decomposition:
        sched = stack_optimum(problem)
        if sched is not None:
            fig = figures(problem, sched.cand)
            say(f"stacks are independent: shortest paths give the optimum {fig.objective:.6g}")
            return Schedule(cand=sched.cand, status=Status.OPTIMAL.value, objective=fig.objective,
                            bound=fig.objective, gap=0.0, solver="stack shortest paths (exact: no coupling)",
                            seconds=time.perf_counter() - t_all, notes=_figure_notes(fig))
    if method != "compact":
        from optimizer.schedule import paths

        why = paths.applicable(problem)
        if why is None:
            start = np.asarray(warm_start.cand) if warm_start is not None else None
            if start is not None and _breaks_rules(problem, start):
                start = None  # made under other rules: as an incumbent it could prune every valid schedule
            if start is None and (cap_t is not None or r.max_sections is not None or r.max_grades is not None):
                heur = greedy_start(problem, cap_t, time_limit_s)
                start = heur.cand if heur is not None else None
            left = max(1.0, time_limit_s - (time.perf_counter() - t_all))
            return paths.solve_paths(problem, solver=solver, time_limit_s=left, gap_rel=gap_rel,
                                     max_types=max_types, warm_start=start, progress=say, threads=threads)
        if method == "paths":
            raise ValueError(f"the path formulation does not apply: {why}")
        notes.append(f"compact formulation: {why}")
    incumbent = None
    if warm_start is not None:
        incumbent = np.asarray(warm_start.cand)
        if _breaks_rules(problem, incumbent):
            incumbent = None
            notes.append("warm start ignored: it breaks a rule of this problem")
    else:
        t0 = time.perf_counter()
        heur = greedy_start(problem, cap_t, time_limit_s)
        if heur is not None:
            incumbent = heur.cand
            say(f"greedy warm start {heur.objective:.6g} in {time.perf_counter() - t0:.1f} s")
            notes.append(f"warm start (greedy type reduction): {heur.objective:.6g}")
    pool_mask = None
    if type_pool == "paths":
        pool_mask = np.zeros(len(problem.types), dtype=bool)
        lightest = cellwise_lower_bound(problem).cand
        pool_mask[problem.cand_type[lightest[lightest >= 0]]] = True
        base = baseline(problem)
        if base is not None:
            pool_mask[problem.cand_type[base.cand]] = True
        if incumbent is not None:
            pool_mask[problem.cand_type[incumbent]] = True
    t0 = time.perf_counter()
    red = reduce_problem(problem, incumbent if incumbent is not None else None, prune_paths=reduce,
                         merge_stacks=reduce, type_pool=pool_mask)
    say(f"reductions in {time.perf_counter() - t0:.1f} s: " + "; ".join(red.notes))
    notes += list(red.notes)
    if pool_mask is not None and len(problem.cand_cell) <= 1_000_000:
        # the per-stack bound of the full problem (the pool's own bound is not one)
        full = reduce_problem(problem, None, merge_stacks=reduce, prune_paths=True)
        red = replace(red, lower_bound=full.lower_bound)
    covered = np.zeros(problem.n_cells, dtype=bool)
    covered[problem.cand_cell[red.keep]] = True
    if (~covered & (red.mult > 0)).any():
        c = int(np.flatnonzero(~covered & (red.mult > 0))[0])
        notes.append(f"stack {problem.cell_names[c][0]}: level {problem.cell_names[c][1]} lies on no buildable "
                     "path (see optimizer.schedule.diagnose)")
        return Schedule(cand=np.full(problem.n_cells, -1, dtype=int), status=Status.INFEASIBLE.value,
                        objective=np.inf, bound=np.inf, gap=np.inf, solver="reductions",
                        seconds=time.perf_counter() - t_all, notes=tuple(notes))
    t0 = time.perf_counter()
    form = formulate(problem, max_types=cap_t, reduction=red)
    start = _start_values(problem, form, incumbent) if incumbent is not None else None
    t_build = time.perf_counter() - t0
    size = (f"model: {form.n_binaries} binaries, {form.n_cols - form.n_binaries} continuous, "
            f"{form.n_rows} rows, {form.n_nonzeros} nonzeros; formulated in {t_build:.1f} s")
    say(size)
    notes.append(size)
    use_highspy = solver == "highs" and backend in ("auto", "highspy")
    if backend == "highspy" and solver != "highs":
        raise ValueError("the highspy back-end solves with HiGHS only")
    t0 = time.perf_counter()
    if use_highspy:
        out = _solve_highspy(form, start, time_limit_s, gap_rel, threads)
    else:
        out = _solve_pulp(problem, form, start, solver, time_limit_s, gap_rel, threads)
    say(f"{solver} ({'highspy' if use_highspy else 'pulp'}): {out.status.value} in {time.perf_counter() - t0:.1f} s")
    notes += out.notes
    notes.append(f"solver {solver}, time limit {time_limit_s:g} s, relative gap {gap_rel:g}")
    label = f"{'HiGHS' if solver == 'highs' else 'CBC'} via {'highspy' if use_highspy else 'PuLP'}"
    if out.xval is None:
        cand = incumbent if incumbent is not None else np.full(problem.n_cells, -1, dtype=int)
        status = out.status
        if incumbent is not None and status is Status.NO_SCHEDULE:
            status = Status.TIME_LIMIT
            notes.append("the solver kept no schedule: the warm start is returned")
        obj = figures(problem, cand).objective if incumbent is not None else np.inf
        if status is not Status.INFEASIBLE:
            out.bound = max(out.bound if pool_mask is None else -np.inf, red.lower_bound)
        gap = abs(obj - out.bound) / max(abs(obj), 1e-9) if np.isfinite(obj) and np.isfinite(out.bound) else np.inf
        return Schedule(cand=np.asarray(cand), status=status.value, objective=obj, bound=out.bound, gap=gap,
                        solver=label, seconds=time.perf_counter() - t_all, notes=tuple(notes))
    cand = _expand(problem, form, out.xval)
    fig = figures(problem, cand)
    bound = min(out.bound, fig.objective) if pool_mask is None else -np.inf
    if pool_mask is not None and np.isfinite(out.bound):
        notes.append(f"solver bound over the type pool only: {out.bound:.6g}")
    bound = max(bound, red.lower_bound, cellwise_lower_bound(problem).value)
    gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9)) if np.isfinite(bound) else np.inf
    status = _status_from(True, False, gap, gap_rel, out.status is Status.TIME_LIMIT)
    return Schedule(cand=cand, status=status.value, objective=fig.objective, bound=bound, gap=gap, solver=label,
                    seconds=time.perf_counter() - t_all, notes=tuple(notes) + _figure_notes(fig))


def _breaks_rules(problem: ScheduleProblem, cand: np.ndarray) -> bool:
    """Whether a schedule breaks a rule (the greedy stage does not know every rule, e.g. grade caps).

    Such a schedule must not serve as an incumbent: its value would prune every schedule that keeps the rules.
    """
    from optimizer.schedule.check import check_schedule

    return bool(check_schedule(problem, np.asarray(cand)))


def greedy_start(problem: ScheduleProblem, cap_t: int | None, time_limit_s: float,
                 share: float = 0.25) -> Schedule | None:
    """The greedy rationalised schedule (on the lightest candidates when there are many), if it keeps every rule.

    It gets ``share`` of the time limit (at least 5 s). The greedy stage does not know every rule (e.g. grade
    caps); a schedule that breaks one is not returned, since as an incumbent it would prune every valid one.
    """
    big = len(problem.cand_cell) > 200 * max(1, problem.n_cells) or len(problem.cand_cell) > 1_000_000
    heur = rationalise(problem, max_types=cap_t, time_limit_s=max(5.0, share * time_limit_s),
                       per_cell=40 if big else None)
    return heur if heur is not None and not _breaks_rules(problem, heur.cand) else None


def _figure_notes(fig) -> tuple[str, ...]:  # noqa: ANN001
    return (f"steel {fig.steel_kg:.1f} kg (starter bars {fig.starter_kg:.1f} kg), cost {fig.cost:.1f}, "
            f"carbon {fig.carbon:.1f} kgCO2e, {fig.n_types} types, {fig.n_sections} sections",)


def pareto(problem: ScheduleProblem, k_max: int | None = None, solver: SolverName = "highs",
           time_limit_s: float = 60.0, gap_rel: float = 0.01,
           progress: Callable[[str], None] | None = None) -> list[tuple[int, Schedule]]:
    """Sweep the cap on distinct types: 1, 2, ... until a larger cap gains nothing.

    Each point is warm-started from the previous one (feasible for a larger
    cap). The sweep stops at ``k_max``, or when the schedule of cap k uses fewer
    than k types (a larger cap cannot help), or when the unconstrained optimum
    (per-stack shortest paths) is reached.

    Returns:
        (cap, schedule) pairs; infeasible caps are included with status "infeasible".
    """
    say = progress or (lambda _msg: None)
    free = stack_optimum(problem)
    free_obj = figures(problem, free.cand).objective if free is not None else -np.inf
    free_types = figures(problem, free.cand).n_types if free is not None else len(problem.types)
    limit = min(k_max if k_max is not None else free_types, free_types)
    out: list[tuple[int, Schedule]] = []
    prev: Schedule | None = None
    for k in range(1, limit + 1):
        warm = prev if prev is not None and prev.status != Status.INFEASIBLE.value else None
        sched = solve(problem, solver=solver, time_limit_s=time_limit_s, gap_rel=gap_rel, max_types=k,
                      warm_start=warm)
        out.append((k, sched))
        say(f"k = {k}: {sched.status}, objective {sched.objective:.6g}")
        if sched.status == Status.INFEASIBLE.value:
            continue
        prev = sched
        used = figures(problem, sched.cand).n_types
        if used < k or sched.objective <= free_obj * (1 + 1e-9):
            break
    return out


def lower_bound_premium(problem: ScheduleProblem, schedule: Schedule) -> tuple[float, float]:
    """The cell-wise lower bound and the rationalisation premium of a schedule.

    The premium compares the minimised quantity without the prices of types and
    sections: (schedule - lower bound) / lower bound.

    Returns:
        (lower bound, premium).
    """
    lb = cellwise_lower_bound(problem).value
    fig = figures(problem, schedule.cand)
    base = {Objective.STEEL: fig.steel_kg, Objective.COST: fig.cost,
            Objective.CARBON: fig.carbon}[Objective(problem.objective)]
    return lb, (base - lb) / lb if lb > 0 else np.inf


__all__ += ["lower_bound_premium", "step_per_face", "greedy_start"]
