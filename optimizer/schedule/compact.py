"""The compact formulation: one binary per candidate (cell, type, orientation), written out in full.

One binary per kept candidate; one binary per type and per section when types
or sections are counted; cumulative ("at least") variables for every monotone
attribute along each stack; section-change indicators for the minimum run;
starter-bar indicators where large steps are paid for; one row per pair of
storeys for the maximum steel at the lap (EN 1992-1-1, 9.5.2(3),
:func:`lap_rows`). The formulation is written out in ``docs/integer_program.md``;
:func:`formulate` writes it phase by phase, each phase named after a section
there, as named columns and rows (:class:`~optimizer.schedule.builder.Formulation`),
which :mod:`optimizer.schedule.backends` hands to HiGHS or CBC (:func:`build_model`
gives the PuLP model).

:func:`formulate` writes the model of a problem reduced by
:func:`optimizer.schedule.builder.reduce_problem` (identical stacks merged,
candidates that cannot be in an optimal schedule dropped).
:func:`start_values` and :func:`expand` translate a schedule into column values
and back.
"""

from __future__ import annotations

import re

import numpy as np
import pulp

from optimizer.schedule.backends import ModelVariables, pulp_model
from optimizer.schedule.builder import Formulation, ModelBuilder, Reduction
from optimizer.schedule.prepared import EPS, Prepared, run_states, starter_kg, step_per_face, transition
from optimizer.schedule.problem import Objective, ScheduleProblem, StepRule

__all__ = ["formulate", "lap_rows", "build_model", "start_values", "expand"]


# --------------------------------------------------------------------------------------------
# formulation
# --------------------------------------------------------------------------------------------


def _clean(text: str) -> str:
    return re.sub(r"[^A-Za-z0-9_.]", "_", text)


class _Model:
    """The formulation being written: the problem, what the reduction kept, and the columns made so far."""

    def __init__(self, problem: ScheduleProblem, reduction: Reduction) -> None:
        p = problem
        r = p.rules
        self.p, self.r, self.t_ = p, r, p.types
        self.prep = Prepared(p)
        self.reduction = reduction
        self.bld = ModelBuilder()
        self.rule = StepRule(r.step_rule)
        steel_obj = Objective(p.objective) is Objective.STEEL
        self.pay_starters = self.rule is StepRule.STARTERS and steel_obj and len(self.t_.starter_kg_per_m) > 0
        self.m_run = run_states(p)
        self.x_col = np.full(len(p.cand_cell), -1, dtype=np.int64)
        mult = reduction.mult
        self.cells_of_stack = [ch[mult[ch] > 0] if len(ch) else ch for ch in self.prep.chains]
        self.kept_of_cell: dict[int, np.ndarray] = {}
        for ch in self.cells_of_stack:
            for c in ch:
                ks = self.prep.cell_cands(int(c))
                self.kept_of_cell[int(c)] = ks[reduction.keep[ks]]
        # attributes with cumulative variables: monotone ones, and b, h for the size steps
        self.attrs: list[str] = []
        self.eq_attrs: list[str] = []  # attributes that stay equal along a stack
        if r.monotone_sections:
            self.attrs += ["b", "h"]
            self.eq_attrs.append("circ")
        elif self.rule is not StepRule.FORBID_ANY:
            self.attrs += ["b", "h"]
        if r.monotone_bars:
            self.attrs += ["nb", "nh", "dia", "corner_dia"]
        if r.monotone_grade:
            self.attrs.append("fck")

    def cell_label(self, c: int) -> str:
        stack, level = self.p.cell_names[c]
        return _clean(f"{stack}_{level}")

    def pair_label(self, s: int, lo: int, up: int) -> str:
        names = self.p.cell_names
        return f"{_clean(self.p.stack_names[s])}_{_clean(names[up][1])}_on_{_clean(names[lo][1])}"


def formulate(
    problem: ScheduleProblem, max_types: int | None = None, reduction: Reduction | None = None
) -> Formulation:
    """Write the integer program as named columns and rows.

    The phases follow the sections of ``docs/integer_program.md``: assignment (and pinned cells), type
    linking, concrete grades, orientation, then stack by stack the cumulative attributes, the lap rows,
    the monotone rows, the steps and the minimum run, and last the groups.

    Args:
        problem: the problem.
        max_types: cap on distinct types (None: the rules' cap).
        reduction: candidates kept and merged stacks (None: everything kept).

    Returns:
        The formulation.
    """
    if reduction is None:
        reduction = Reduction.none(len(problem.cand_cell), problem.n_cells)
    m = _Model(problem, reduction)
    _assignment(m)
    y_col = _type_linking(m, max_types if max_types is not None else problem.rules.max_types)
    _grades(m)
    _orientation(m)
    for s, ch in enumerate(m.cells_of_stack):
        if len(ch) < 2:
            continue
        z_col, values = _cumulative_attributes(m, ch)
        for i in range(1, len(ch)):
            lo, up = int(ch[i - 1]), int(ch[i])
            pair = m.pair_label(s, lo, up)
            lap_rows(m.bld, problem, pair, m.kept_of_cell[lo], m.kept_of_cell[up], m.x_col)
            _monotone_rows(m, pair, z_col, lo, up)
            _steps(m, pair, z_col, values, lo, up)
        _minimum_run(m, s, ch)
    _groups(m)
    return m.bld.finish(m.x_col, y_col, reduction)


def _assignment(m: _Model) -> None:
    """x: one binary per kept candidate (weight times multiplicity); exactly one per cell; pinned cells."""
    p, bld = m.p, m.bld
    weight, mult = m.prep.weight, m.reduction.mult
    for c, ks in m.kept_of_cell.items():
        lab = m.cell_label(c)
        for k in ks:
            t = int(p.cand_type[k])
            m.x_col[k] = bld.col(
                f"x_{lab}_t{t}_o{int(p.cand_orient[k])}", ("x", int(k)), cost=float(weight[k]) * int(mult[c])
            )
    for c, ks in m.kept_of_cell.items():
        bld.row(f"assign_{m.cell_label(c)}", m.x_col[ks], np.ones(len(ks)), 1.0, 1.0)
    # pinned cells: only candidates of the pinned type
    for c, t in m.r.pinned:
        c = int(m.reduction.rep[int(c)])
        ks = m.kept_of_cell.get(c, np.zeros(0, dtype=int))
        bad = ks[p.cand_type[ks] != int(t)]
        for k in bad:
            bld.row(f"pin_{m.cell_label(c)}_t{int(p.cand_type[k])}", [m.x_col[k]], [1.0], 0.0, 0.0)


def _type_linking(m: _Model, cap_t: int | None) -> np.ndarray:
    """Types and sections, disaggregated: x[c,t] <= y[t], y[t] <= s[section], with caps; the column of each type."""
    p, r, t_, bld, x_col = m.p, m.r, m.t_, m.bld, m.x_col
    cap_s = r.max_sections
    count_types = cap_t is not None or r.price_per_type > 0 or cap_s is not None or r.price_per_section > 0
    count_secs = cap_s is not None or r.price_per_section > 0
    y_col = np.full(len(t_), -1, dtype=np.int64)
    if not count_types:
        return y_col
    all_kept = np.flatnonzero(x_col >= 0)
    used_t = np.unique(p.cand_type[all_kept])
    for t in used_t:
        y_col[t] = bld.col(f"y_{_clean(t_.mark[t])}_t{t}", ("y", int(t)), cost=r.price_per_type)
    for k in all_kept:
        t = int(p.cand_type[k])
        bld.row(
            f"link_{m.cell_label(int(p.cand_cell[k]))}_t{t}_o{int(p.cand_orient[k])}",
            [x_col[k], y_col[t]],
            [1.0, -1.0],
            -np.inf,
            0.0,
        )
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
    return y_col


def _grades(m: _Model) -> None:
    """Concrete grades: the building-wide cap, and the cap on changes per stack.

    Grade binaries per building (per stack), linked cell by cell: the candidates of one grade in a cell sum to
    at most the grade's binary. With grades that never rise going up, changes = distinct grades in a stack - 1.
    """
    p, r, t_, bld, x_col = m.p, m.r, m.t_, m.bld, m.x_col
    grades = np.unique(t_.fck)
    if r.max_grades is not None:
        g_col = {float(g): bld.col(f"grade_{g:g}", ("g", float(g))) for g in grades}
        for c, ks in m.kept_of_cell.items():
            for g in grades:
                kg = ks[t_.fck[p.cand_type[ks]] == g]
                if len(kg):
                    bld.row(
                        f"grade_link_{m.cell_label(c)}_{g:g}",
                        list(x_col[kg]) + [g_col[float(g)]],
                        [1.0] * len(kg) + [-1.0],
                        -np.inf,
                        0.0,
                    )
        bld.row("cap_grades", list(g_col.values()), np.ones(len(g_col)), -np.inf, float(r.max_grades))
    if r.max_grade_changes is None:
        return
    for s, ch in enumerate(m.cells_of_stack):
        if len(ch) == 0:
            continue
        gs = {float(g): bld.col(f"stack_grade_{_clean(p.stack_names[s])}_{g:g}", ("gs", s, float(g))) for g in grades}
        for c in ch:
            ks = m.kept_of_cell[int(c)]
            for g in grades:
                kg = ks[t_.fck[p.cand_type[ks]] == g]
                if len(kg):
                    bld.row(
                        f"stack_grade_link_{m.cell_label(int(c))}_{g:g}",
                        list(x_col[kg]) + [gs[float(g)]],
                        [1.0] * len(kg) + [-1.0],
                        -np.inf,
                        0.0,
                    )
        bld.row(
            f"cap_grade_changes_{_clean(p.stack_names[s])}",
            list(gs.values()),
            np.ones(len(gs)),
            -np.inf,
            float(r.max_grade_changes + 1),
        )


def _orientation(m: _Model) -> None:
    """One orientation per stack: the turned candidates of every cell sum to the stack's turn binary."""
    p, bld = m.p, m.bld
    for s, ch in enumerate(m.cells_of_stack):
        if not p.stack_free[s] or len(ch) == 0:
            continue
        if not any((p.cand_orient[m.kept_of_cell[int(c)]] == 1).any() for c in ch):
            continue  # no turned candidate kept: every cell keeps orientation 0
        o = bld.col(f"turn_{_clean(p.stack_names[s])}", ("o", s))
        for c in ch:
            ks = m.kept_of_cell[int(c)]
            k1 = ks[p.cand_orient[ks] == 1]
            bld.row(f"orient_{m.cell_label(int(c))}", list(m.x_col[k1]) + [o], [1.0] * len(k1) + [-1.0], 0.0, 0.0)


def _cumulative_attributes(
    m: _Model, ch: np.ndarray
) -> tuple[dict[str, dict[int, dict[float, int]]], dict[str, np.ndarray]]:
    """z[c, v] = 1 if the attribute at c >= v, for every value above the stack's lowest.

    Returns:
        The z column of every attribute, cell and value, and the values present of every attribute.
    """
    p, bld = m.p, m.bld
    z_col: dict[str, dict[int, dict[float, int]]] = {}
    values: dict[str, np.ndarray] = {}
    for attr in m.attrs + m.eq_attrs:
        vals_all = getattr(m.t_, attr).astype(float)
        present = np.unique(np.concatenate([vals_all[p.cand_type[m.kept_of_cell[int(c)]]] for c in ch]))
        levels = present[1:]  # z at the lowest value is 1
        if len(levels) == 0:
            continue
        z_col[attr] = {}
        values[attr] = present
        for c in ch:
            c = int(c)
            ks = m.kept_of_cell[c]
            av = vals_all[p.cand_type[ks]]
            zc = {
                float(v): bld.col(f"z_{attr}_{m.cell_label(c)}_ge{v:g}", ("z", attr, c, float(v)), integer=False)
                for v in levels
            }
            z_col[attr][c] = zc
            for j, v in enumerate(levels):
                nxt = levels[j + 1] if j + 1 < len(levels) else None
                sel = m.x_col[ks[np.abs(av - v) < EPS]]
                idx = [zc[v]] + ([zc[nxt]] if nxt is not None else []) + list(sel)
                val = [1.0] + ([-1.0] if nxt is not None else []) + [-1.0] * len(sel)
                bld.row(f"cum_{attr}_{m.cell_label(c)}_ge{v:g}", idx, val, 0.0, 0.0)
    return z_col, values


def _monotone_rows(m: _Model, pair: str, z_col: dict[str, dict[int, dict[float, int]]], lo: int, up: int) -> None:
    """Monotone attributes: z[upper, v] <= z[lower, v]; circular stays circular (equal z)."""
    for attr in m.attrs:
        if attr not in z_col or (attr in ("b", "h") and not m.r.monotone_sections):
            continue
        for v, zu in z_col[attr][up].items():
            m.bld.row(f"mono_{attr}_{pair}_ge{v:g}", [zu, z_col[attr][lo][v]], [1.0, -1.0], -np.inf, 0.0)
    for attr in m.eq_attrs:
        if attr not in z_col:
            continue
        for v, zu in z_col[attr][up].items():
            m.bld.row(f"same_{attr}_{pair}", [zu, z_col[attr][lo][v]], [1.0, -1.0], 0.0, 0.0)


def _steps(  # noqa: PLR0912 - one branch per step rule
    m: _Model, pair: str, z_col: dict[str, dict[int, dict[float, int]]], values: dict[str, np.ndarray], lo: int, up: int
) -> None:
    """Step per face (half the change of width or depth), with the starter bars they need under the starter rule.

    If the larger cell has attr >= v, the smaller must have attr >= the first value not below v - 2 max_step.
    """
    p, r, bld = m.p, m.r, m.bld
    if m.rule not in (StepRule.LIMIT, StepRule.STARTERS):
        return
    if m.rule is StepRule.STARTERS and not m.pay_starters:
        return  # large steps allowed and not paid for in this objective
    u_col = None
    if m.rule is StepRule.STARTERS:
        u_col = bld.col(f"starters_{pair}", ("u", up, lo), integer=False)
    for attr in ("b", "h"):
        if attr not in z_col:
            continue
        allv = values[attr]
        directions = [(lo, up)] if r.monotone_sections else [(lo, up), (up, lo)]
        for big_c, small_c in directions:
            tag = "down" if big_c == lo else "up"
            for v in allv[1:]:
                j = int(np.searchsorted(allv, v - 2.0 * r.max_step_mm - EPS, side="left"))
                if j == 0:
                    continue  # the lowest value is always reached
                zb, zs = z_col[attr][big_c][float(v)], z_col[attr][small_c][float(allv[j])]
                if u_col is None:
                    bld.row(f"step_{attr}_{tag}_{pair}_ge{v:g}", [zb, zs], [1.0, -1.0], -np.inf, 0.0)
                else:
                    bld.row(f"step_{attr}_{tag}_{pair}_ge{v:g}", [zb, zs, u_col], [1.0, -1.0, -1.0], -np.inf, 0.0)
    if u_col is None:
        return
    ks = m.kept_of_cell[up]
    st = starter_kg(p, up, p.cand_type[ks])
    for k, mass in zip(ks, st, strict=True):
        if mass <= 0:
            continue
        tag = f"{pair}_t{int(p.cand_type[k])}_o{int(p.cand_orient[k])}"
        v_col = bld.col(
            f"starter_mass_{tag}",
            ("v", int(k), lo),
            integer=False,
            ub=np.inf,
            cost=float(mass) * int(m.reduction.mult[up]),
        )
        bld.row(f"starter_if_{tag}", [v_col, m.x_col[k], u_col], [1.0, -1.0, -1.0], -1.0, np.inf)


def _minimum_run(m: _Model, s: int, ch: np.ndarray) -> None:
    """Sections: no change at all (forbid any), or the minimum run through change indicators and window rows."""
    p, bld, x_col = m.p, m.bld, m.x_col
    sec = m.t_.section
    if m.rule is not StepRule.FORBID_ANY and m.m_run <= 1:
        return
    d_cols: list[int | None] = [None]
    for i in range(1, len(ch)):
        lo, up = int(ch[i - 1]), int(ch[i])
        pair = m.pair_label(s, lo, up)
        k_lo, k_up = m.kept_of_cell[lo], m.kept_of_cell[up]
        s_lo, s_up = sec[p.cand_type[k_lo]], sec[p.cand_type[k_up]]
        if m.rule is StepRule.FORBID_ANY:
            for sc in np.union1d(s_lo, s_up):
                a, b = x_col[k_up[s_up == sc]], x_col[k_lo[s_lo == sc]]
                bld.row(
                    f"same_section_{pair}_s{int(sc)}", list(a) + list(b), [1.0] * len(a) + [-1.0] * len(b), 0.0, 0.0
                )
            continue
        d = bld.col(f"change_{pair}", ("d", up, lo), integer=False, ub=0.0 if i < m.m_run else 1.0)
        d_cols.append(d)
        for sc in np.unique(s_up):
            a, b = x_col[k_up[s_up == sc]], x_col[k_lo[s_lo == sc]]
            bld.row(
                f"change_if_{pair}_s{int(sc)}",
                [d] + list(a) + list(b),
                [1.0] + [-1.0] * len(a) + [1.0] * len(b),
                0.0,
                np.inf,
            )
    if m.rule is StepRule.FORBID_ANY:
        return
    for i in range(1, len(ch) - m.m_run + 1):
        window = [d_cols[j] for j in range(i, i + m.m_run)]
        bld.row(
            f"min_run_{_clean(p.stack_names[s])}_{_clean(p.cell_names[int(ch[i])][1])}",
            window,
            np.ones(len(window)),
            -np.inf,
            1.0,
        )


def _groups(m: _Model) -> None:
    """Groups: identical candidates level by level (a candidate missing in one cell is fixed to 0 in the other)."""
    p, prep = m.p, m.prep
    index = {name: i for i, name in enumerate(p.stack_names)}
    for group in m.r.groups:
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
                k0, k1 = m.kept_of_cell[c0], m.kept_of_cell[c]
                key0 = {(int(p.cand_type[k]), int(p.cand_orient[k])): int(k) for k in k0}
                key1 = {(int(p.cand_type[k]), int(p.cand_orient[k])): int(k) for k in k1}
                for key in sorted(set(key0) | set(key1)):
                    cols = ([m.x_col[key0[key]]] if key in key0 else []) + ([m.x_col[key1[key]]] if key in key1 else [])
                    vals = ([1.0] if key in key0 else []) + ([-1.0] if key in key1 else [])
                    m.bld.row(
                        f"group_{_clean(p.stack_names[ref])}_{_clean(p.stack_names[other])}_{_clean(lv)}"
                        f"_t{key[0]}_o{key[1]}",
                        cols,
                        vals,
                        0.0,
                        0.0,
                    )


def lap_rows(
    bld: ModelBuilder, p: ScheduleProblem, pair: str, k_lo: np.ndarray, k_up: np.ndarray, x_col: np.ndarray
) -> None:
    """Maximum steel at the lap between two storeys of a stack (EN 1992-1-1, 9.5.2(3)).

    As[lower] + As[upper] <= ratio Ac[upper] for the chosen pair, written as one row over the kept
    candidates of both cells: sum As x[lo] + sum (As - ratio Ac) x[up] <= 0. It is exact because each
    cell takes exactly one candidate. The row is left out when no kept pair can break it.

    With the STARTERS step rule a pair whose step needs separate starter bars is exempt (the lap then
    holds 2 As[upper], limited per cell; see :func:`optimizer.schedule.prepared.transition`). Whether a pair
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
        exempt = (
            step_per_face(t_.b[t_lo][:, None], t_.h[t_lo][:, None], t_.b[t_up][None, :], t_.h[t_up][None, :])
            > r.max_step_mm + EPS
        )
        if not exempt.any():
            exempt = None
    if exempt is None:
        if a_lo.max() + c_up.max() <= EPS:
            return  # cannot bind
        bld.row(
            f"lap_As_max_{pair}", np.concatenate([x_col[k_lo], x_col[k_up]]), np.concatenate([a_lo, c_up]), -np.inf, EPS
        )
        return
    sec_up = t_.section[t_up]
    for sec in np.unique(sec_up):
        in_s = sec_up == sec
        j = int(np.flatnonzero(in_s)[0])
        held = ~exempt[:, j]  # lower candidates lapping with the bars of section `sec` (the same for all of S)
        if not held.any() or a_lo[held].max() + c_up[in_s].max() <= EPS:
            continue
        d = float(-c_up[in_s].max())
        big_m = max(float(a_lo[held].max()), d)
        val_lo = np.where(held, a_lo, d)
        val_up = np.where(in_s, c_up, -big_m)
        bld.row(
            f"lap_As_max_{pair}_s{int(sec)}",
            np.concatenate([x_col[k_lo], x_col[k_up]]),
            np.concatenate([val_lo, val_up]),
            -np.inf,
            EPS,
        )


def build_model(
    problem: ScheduleProblem, max_types: int | None = None, reduction: Reduction | None = None
) -> tuple[pulp.LpProblem, ModelVariables]:
    """The compact integer program as a PuLP problem.

    Args:
        problem: the problem (plain data).
        max_types: cap on distinct types (None: the rules' cap).
        reduction: candidates kept and stacks merged (None: the full model).

    Returns:
        The PuLP problem and its variables.
    """
    form = formulate(problem, max_types=max_types, reduction=reduction)
    return pulp_model(form, problem)


# --------------------------------------------------------------------------------------------
# schedules in and out of the model
# --------------------------------------------------------------------------------------------


def start_values(problem: ScheduleProblem, form: Formulation, cand: np.ndarray) -> np.ndarray | None:
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
            val[j] = 1.0 if float(getattr(t_, attr)[type_of[c]]) >= v - EPS else 0.0
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


def expand(problem: ScheduleProblem, form: Formulation, xval: np.ndarray) -> np.ndarray:
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
                prep = Prepared(p)
            k0 = cand[rep[c]]
            ks = prep.cell_cands(c, int(p.cand_orient[k0]))
            cand[c] = int(ks[p.cand_type[ks] == p.cand_type[k0]][0])
    return cand
