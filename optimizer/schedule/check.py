"""Independent checker of column schedules.

Written apart from the integer program and the heuristics (plain Python loops,
no shared helpers) so that a mistake in one is not repeated in the other. Every
rule of :class:`optimizer.schedule.problem.Rules` is verified; each violation is one
readable sentence naming the stack and the levels.
"""

from __future__ import annotations

import math

import numpy as np

from optimizer.schedule.problem import Schedule, ScheduleProblem, StepRule

__all__ = ["check_schedule"]

_TOL = 1e-6


def _stack_cells(problem: ScheduleProblem) -> dict[int, list[int]]:
    """Cells of each stack, bottom to top (walking ``above`` from the cell no other cell points to)."""
    pointed = {int(a) for a in problem.above if a >= 0}
    out: dict[int, list[int]] = {}
    for c in range(problem.n_cells):
        if c in pointed:
            continue
        chain = []
        cur = c
        while cur >= 0 and len(chain) <= problem.n_cells:
            chain.append(cur)
            cur = int(problem.above[cur])
        out.setdefault(int(problem.stack[c]), []).extend(chain)
    return out


def _describe(problem: ScheduleProblem, t: int) -> str:
    return problem.types.mark[t]


def _bar_set(problem: ScheduleProblem, t: int) -> tuple[str, float]:
    """Bar notation (e.g. ``12H32`` or ``4H32+8H25``) and total bar area (mm2) of type t, from its counts."""
    T = problem.types
    dia, corner = float(T.dia[t]), float(T.corner_dia[t])
    if bool(T.circ[t]):
        n = int(T.nb[t])
        return f"{n}H{dia:g}", n * math.pi * dia * dia / 4.0
    n = 2 * int(T.nb[t]) + 2 * int(T.nh[t]) - 4
    area = 4 * math.pi * corner * corner / 4.0 + (n - 4) * math.pi * dia * dia / 4.0
    if abs(corner - dia) < _TOL or n == 4:
        return f"{n}H{corner if n == 4 else dia:g}", area
    return f"4H{corner:g}+{n - 4}H{dia:g}", area


def _concrete_area(problem: ScheduleProblem, t: int) -> float:
    """Gross concrete area of type t, mm2."""
    T = problem.types
    b = float(T.b[t])
    return math.pi * b * b / 4.0 if bool(T.circ[t]) else b * float(T.h[t])


def check_schedule(problem: ScheduleProblem, schedule: Schedule | np.ndarray) -> list[str]:  # noqa: PLR0912, PLR0915 - the independent checker restates every rule, one branch each
    """Every rule broken by a schedule, as sentences; empty when the schedule is valid.

    Args:
        problem: the problem.
        schedule: a :class:`Schedule` or an array with the chosen candidate of every cell.

    Returns:
        One sentence per violation, naming stack and levels.
    """
    cand = np.asarray(schedule.cand if isinstance(schedule, Schedule) else schedule)
    p = problem
    T = p.types
    r = p.rules
    out: list[str] = []
    n_cand = len(p.cand_cell)
    if cand.shape != (p.n_cells,):
        return [f"the schedule gives {cand.size} choices for {p.n_cells} cells"]
    chosen_type: list[int | None] = []
    chosen_orient: list[int | None] = []
    for c in range(p.n_cells):
        k = int(cand[c])
        stack, level = p.cell_names[c]
        if k < 0 or k >= n_cand:
            out.append(f"stack {stack}: level {level} has no type")
            chosen_type.append(None)
            chosen_orient.append(None)
            continue
        if int(p.cand_cell[k]) != c:
            other = p.cell_names[int(p.cand_cell[k])]
            out.append(
                f"stack {stack}: level {level} uses a candidate checked for {other[0]} at {other[1]}, not for this cell"
            )
        chosen_type.append(int(p.cand_type[k]))
        chosen_orient.append(int(p.cand_orient[k]))
        if int(p.cand_orient[k]) == 1 and not bool(p.stack_free[int(p.stack[c])]):
            out.append(f"stack {stack}: level {level} is turned although the stack's orientation is fixed")
    chains = _stack_cells(p)
    for s, chain in chains.items():
        name = p.stack_names[s]
        orients = {chosen_orient[c] for c in chain if chosen_orient[c] is not None}
        if len(orients) > 1:
            out.append(f"stack {name}: mixes orientations 0 and 1 along the stack")
        sections_run: list[tuple[int, int]] = []  # (section, first position)
        for pos, c in enumerate(chain):
            t = chosen_type[c]
            if t is None:
                sections_run = []
                continue
            sec = int(T.section[t])
            if not sections_run or sections_run[-1][0] != sec:
                sections_run.append((sec, pos))
            if pos == 0:
                continue
            lo_c = chain[pos - 1]
            lo = chosen_type[lo_c]
            if lo is None:
                continue
            lv_lo, lv_up = p.cell_names[lo_c][1], p.cell_names[c][1]
            where = f"stack {name}: level {lv_up} ({_describe(p, t)}) on level {lv_lo} ({_describe(p, lo)})"
            if r.monotone_sections:
                if bool(T.circ[t]) != bool(T.circ[lo]):
                    out.append(f"{where} changes shape between circular and rectangular")
                if T.b[t] > T.b[lo] + _TOL or T.h[t] > T.h[lo] + _TOL:
                    out.append(f"{where}: the section grows going up")
            if r.monotone_bars:
                if T.nb[t] > T.nb[lo] or T.nh[t] > T.nh[lo]:
                    out.append(f"{where}: more bars on a face than below")
                if T.dia[t] > T.dia[lo] + _TOL:
                    out.append(f"{where}: a larger main bar than below")
                if T.corner_dia[t] > T.corner_dia[lo] + _TOL:
                    out.append(f"{where}: a larger corner bar than below")
            if r.monotone_grade and T.fck[t] > T.fck[lo] + _TOL:
                out.append(f"{where}: a higher concrete grade than below")
            rule = StepRule(r.step_rule)
            step = max(abs(float(T.b[lo]) - float(T.b[t])), abs(float(T.h[lo]) - float(T.h[t]))) / 2.0
            if rule is StepRule.FORBID_ANY:
                if int(T.section[t]) != int(T.section[lo]):
                    out.append(f"{where}: the section changes, which is forbidden")
            elif rule is StepRule.LIMIT:
                if step > r.max_step_mm + _TOL:
                    out.append(f"{where}: a step of {step:g} mm per face exceeds {r.max_step_mm:g} mm")
            # EN 1992-1-1, 9.5.2(3): the bars below lap with this storey's bars in this storey's section;
            # with separate starter bars at a large step the lap holds twice the upper bars (a per-cell check)
            separate_starters = rule is StepRule.STARTERS and step > r.max_step_mm + _TOL
            if r.lap_steel_ratio_max is not None and not separate_starters:
                bars_lo, as_lo = _bar_set(p, lo)
                bars_up, as_up = _bar_set(p, t)
                ac_up = _concrete_area(p, t)
                limit = r.lap_steel_ratio_max * ac_up
                if as_lo + as_up > limit + _TOL:
                    out.append(
                        f"{where}: at the lap at the foot of level {lv_up} the bars below ({bars_lo}, "
                        f"{as_lo:,.0f} mm2) and above ({bars_up}, {as_up:,.0f} mm2) give "
                        f"{as_lo + as_up:,.0f} mm2, more than {r.lap_steel_ratio_max:g} Ac = "
                        f"{r.lap_steel_ratio_max:g} x {ac_up:,.0f} = {limit:,.0f} mm2 of the section "
                        "above (EN 1992-1-1, 9.5.2(3))"
                    )
        if r.min_run > 1:
            for j, (_sec, first) in enumerate(sections_run[:-1]):
                length = sections_run[j + 1][1] - first
                if length < r.min_run:
                    lv_a = p.cell_names[chain[first]][1]
                    lv_b = p.cell_names[chain[first + length - 1]][1]
                    out.append(
                        f"stack {name}: the section of levels {lv_a} to {lv_b} holds for {length} storeys, "
                        f"fewer than {r.min_run}"
                    )
    # groups: identical type and orientation level by level
    index = {n: i for i, n in enumerate(p.stack_names)}
    for group in r.groups:
        members = [g for g in group if g in index]
        for other in members[1:]:
            ref = members[0]
            by_level = {p.cell_names[c][1]: c for c in chains.get(index[ref], [])}
            for c in chains.get(index[other], []):
                lv = p.cell_names[c][1]
                if lv not in by_level:
                    continue
                c0 = by_level[lv]
                if (chosen_type[c], chosen_orient[c]) != (chosen_type[c0], chosen_orient[c0]):
                    out.append(f"stacks {ref} and {other} (grouped): different types at level {lv}")
    for c, t in r.pinned:
        if chosen_type[int(c)] is not None and chosen_type[int(c)] != int(t):
            stack, level = p.cell_names[int(c)]
            out.append(
                f"stack {stack}: level {level} is pinned to {T.mark[int(t)]} but uses {T.mark[chosen_type[int(c)]]}"
            )
    used = {t for t in chosen_type if t is not None}
    if r.max_types is not None and len(used) > r.max_types:
        out.append(f"the building uses {len(used)} distinct types, more than the cap of {r.max_types}")
    secs = {int(T.section[t]) for t in used}
    if r.max_sections is not None and len(secs) > r.max_sections:
        out.append(f"the building uses {len(secs)} distinct sections, more than the cap of {r.max_sections}")
    grades = {float(T.fck[t]) for t in used}
    if r.max_grades is not None and len(grades) > r.max_grades:
        out.append(f"the building uses {len(grades)} concrete grades, more than the cap of {r.max_grades}")
    if r.max_grade_changes is not None:
        for s, ch in chains.items():
            seq = [float(T.fck[chosen_type[c]]) for c in ch if chosen_type[c] is not None]
            changes = sum(1 for a, b in zip(seq[:-1], seq[1:], strict=True) if a != b)
            if changes > r.max_grade_changes:
                out.append(
                    f"stack {p.stack_names[s]}: the grade changes {changes} times, more than the cap of "
                    f"{r.max_grade_changes}"
                )
    return out
