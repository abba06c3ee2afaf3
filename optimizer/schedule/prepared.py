"""The prepared problem: stacks as chains, the pair table of the continuity rules, and scheduling units.

Everything that schedules stacks (the shortest paths, the heuristics, both formulations and the
diagnosis) starts from the same tables, built here once per problem:

* :func:`stack_chains` - the cells of every stack, bottom to top;
* :func:`transition` - which (lower type, upper type) pairs may stand on each other, and which need
  separate starter bars (:func:`step_per_face`, :func:`starter_kg`);
* :class:`Prepared` - every cell's candidates sorted for quick look-up, and the scheduling *units*
  (:class:`Unit`: one stack, or a group of stacks that take identical types level by level), each
  with its candidates storey by storey in each orientation (:class:`Level`);
* :func:`run_states` - the run states of the minimum run of sections;
* :func:`stack_signature` - what makes two stacks identical (merged by both formulations).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from optimizer.schedule.problem import Objective, ScheduleProblem, StepRule

__all__ = [
    "EPS",
    "stack_chains",
    "transition",
    "step_per_face",
    "starter_kg",
    "Level",
    "Unit",
    "Prepared",
    "group_problems",
    "run_states",
    "stack_signature",
]

EPS = 1e-6  # tolerance of comparisons of sizes (mm), bar diameters (mm) and grades (MPa)


def stack_chains(problem: ScheduleProblem) -> list[np.ndarray]:
    """Cells of every stack, bottom to top, following ``above``.

    Returns:
        One array of cell indices per stack (in stack index order).

    Raises:
        ValueError: when ``above`` leaves the stack, branches or forms a cycle.
    """
    n = problem.n_cells
    has_below = np.zeros(n, dtype=bool)
    for c in range(n):
        a = int(problem.above[c])
        if a >= 0:
            if problem.stack[a] != problem.stack[c]:
                raise ValueError(f"cell {problem.cell_names[c]} has a cell above in another stack")
            if has_below[a]:
                raise ValueError(f"cell {problem.cell_names[a]} sits on two cells")
            has_below[a] = True
    chains: list[list[int]] = [[] for _ in problem.stack_names]
    for c in range(n):
        if not has_below[c]:
            s = int(problem.stack[c])
            if chains[s]:
                raise ValueError(f"stack {problem.stack_names[s]} has two bottom cells")
            cur = c
            while cur >= 0:
                chains[s].append(cur)
                cur = int(problem.above[cur])
    seen = sum(len(ch) for ch in chains)
    if seen != n:
        raise ValueError("the cells above form a cycle")
    return [np.array(ch, dtype=int) for ch in chains]


def transition(problem: ScheduleProblem, lower: np.ndarray, upper: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Which (lower type, upper type) pairs may stand on each other.

    Args:
        problem: the problem (its types and rules).
        lower: type indices of the storey below.
        upper: type indices of the storey above.

    Returns:
        ``ok`` (len(lower) x len(upper) booleans: the pair keeps every continuity
        rule) and ``starters`` (the pair is allowed only with separate starter bars).

    Notes:
        Maximum steel at the lap (EN 1992-1-1, 9.5.2(3), ``rules.lap_steel_ratio_max``,
        0.08 recommended): the bars of the storey below run up as starters and lap
        with the upper bars in the upper storey's section, so the pair needs
        As[lower] + As[upper] <= ratio x Ac[upper]. Where the step rule is STARTERS
        and the pair needs separate starter bars, the lower bars stop below the
        floor and the starters repeat the upper bars: the lap then holds
        2 As[upper], a property of the upper type alone that the per-cell check
        ("maximum reinforcement at laps", design.member) already limits, so such
        pairs are not held to the sum.
    """
    t, r = problem.types, problem.rules
    lo = np.asarray(lower, dtype=int)[:, None]
    up = np.asarray(upper, dtype=int)[None, :]
    ok = np.ones((lo.shape[0], up.shape[1]), dtype=bool)
    if r.monotone_sections:
        ok &= (t.circ[lo] == t.circ[up]) & (t.b[up] <= t.b[lo] + EPS) & (t.h[up] <= t.h[lo] + EPS)
    if r.monotone_bars:
        ok &= (t.nb[up] <= t.nb[lo]) & (t.nh[up] <= t.nh[lo])
        ok &= (t.dia[up] <= t.dia[lo] + EPS) & (t.corner_dia[up] <= t.corner_dia[lo] + EPS)
    if r.monotone_grade:
        ok &= t.fck[up] <= t.fck[lo] + EPS
    starters = np.zeros_like(ok)
    rule = StepRule(r.step_rule)
    if rule is StepRule.FORBID_ANY:
        ok &= t.section[up] == t.section[lo]
    else:
        big = step_per_face(t.b[lo], t.h[lo], t.b[up], t.h[up]) > r.max_step_mm + EPS
        if rule is StepRule.LIMIT:
            ok &= ~big
        else:
            starters = big & ok
    if r.lap_steel_ratio_max is not None:
        # lower bars lapping with the upper ones in the upper section; pairs with separate starters hold
        # 2 As[upper] instead (limited per cell, see Notes)
        lap_ok = t.As[lo] + t.As[up] <= r.lap_steel_ratio_max * t.Ac[up] + EPS
        ok &= lap_ok | starters
    return ok, starters


def step_per_face(b_lo: np.ndarray, h_lo: np.ndarray, b_up: np.ndarray, h_up: np.ndarray) -> np.ndarray:
    """Change of size per face between two storeys (concentric sections): half the change of width or depth."""
    return np.maximum(np.abs(b_lo - b_up), np.abs(h_lo - h_up)) / 2.0


def starter_kg(problem: ScheduleProblem, upper_cell: int, upper_types: np.ndarray) -> np.ndarray:
    """Mass of separate starter bars for the types above a large step, kg.

    The starter bars repeat the upper type's bars: ``starter_kg_per_m`` of the
    upper type times the storey height of the upper cell (zero when either is
    not given).
    """
    upper_types = np.asarray(upper_types, dtype=int)
    per_m = problem.types.starter_kg_per_m
    if len(per_m) == 0 or len(problem.storey_height_mm) == 0:
        return np.zeros(len(upper_types))
    return per_m[upper_types] * float(problem.storey_height_mm[upper_cell]) / 1000.0


# --------------------------------------------------------------------------------------------
# candidate tables and scheduling units
# --------------------------------------------------------------------------------------------


@dataclass
class Level:
    """Candidates of one storey of a unit (a stack or a group of stacks sharing types) in one orientation."""

    types: np.ndarray  # (k,) type index
    cands: np.ndarray  # (k, n_stacks_in_unit) candidate index per stack cell
    weight: np.ndarray  # (k,) summed objective weight
    starter: np.ndarray  # (k,) summed starter objective weight if the step below is large


@dataclass
class Unit:
    """Stacks scheduled together (one stack, or a group with identical levels)."""

    stacks: tuple[int, ...]
    cells: np.ndarray  # (n_levels, n_stacks) cells, bottom to top
    orients: dict[int, list[Level]] = field(default_factory=dict)


class Prepared:
    """Candidate tables of a problem, sorted for quick look-up, and its scheduling units.

    Attributes:
        problem: the problem.
        weight: objective weight of every candidate.
        order, start: candidates sorted by (cell, orientation, type); those of cell c are
            ``order[start[c]:start[c + 1]]``.
        chains: cells of every stack, bottom to top (:func:`stack_chains`).
        pinned: type of every pinned cell.
        units: the scheduling units.
        problems: groups the units cannot represent (stacks with different storeys), in words.
    """

    def __init__(self, problem: ScheduleProblem) -> None:
        self.problem = problem
        self.weight = np.asarray(problem.weight(), dtype=float)
        order = np.lexsort((problem.cand_type, problem.cand_orient, problem.cand_cell))
        self.order = order
        self.start = np.searchsorted(problem.cand_cell[order], np.arange(problem.n_cells + 1))
        self.chains = stack_chains(problem)
        self.pinned = {int(c): int(t) for c, t in problem.rules.pinned}
        self.units, self.problems = self._units()

    def cell_cands(self, c: int, orient: int | None = None) -> np.ndarray:
        """Candidate indices of cell c (of one orientation if given), sorted by type."""
        idx = self.order[self.start[c] : self.start[c + 1]]
        if orient is not None:
            idx = idx[self.problem.cand_orient[idx] == orient]
        if c in self.pinned:
            idx = idx[self.problem.cand_type[idx] == self.pinned[c]]
        return idx

    def _units(self) -> tuple[list[Unit], list[str]]:
        p = self.problem
        index = {name: i for i, name in enumerate(p.stack_names)}
        in_group: set[int] = set()
        units: list[Unit] = []
        problems: list[str] = []
        for group in p.rules.groups:
            members = [index[g] for g in group if g in index]
            if len(members) < 2:
                continue
            problems += group_problems(p, self.chains, [group])
            in_group.update(members)
            cells = np.stack([self.chains[s] for s in members], axis=1) if not problems else None
            if cells is not None:
                units.append(Unit(tuple(members), cells))
        for s in range(len(p.stack_names)):
            if s not in in_group:
                units.append(Unit((s,), self.chains[s][:, None]))
        r = p.rules
        starters_count = StepRule(r.step_rule) is StepRule.STARTERS and Objective(p.objective) is Objective.STEEL
        for u in units:
            free = any(bool(p.stack_free[s]) for s in u.stacks)
            for o in (0, 1) if free else (0,):
                levels_o: list[Level] = []
                for i in range(u.cells.shape[0]):
                    per_stack = [self.cell_cands(int(c), o) for c in u.cells[i]]
                    common = per_stack[0] if len(per_stack) == 1 else None
                    if common is None:
                        ts = per_stack[0]
                        tset = p.cand_type[ts]
                        for other in per_stack[1:]:
                            tset = np.intersect1d(tset, p.cand_type[other])
                        cols = [ps[np.isin(p.cand_type[ps], tset)] for ps in per_stack]
                        cand_mat = np.stack(cols, axis=1) if len(tset) else np.zeros((0, len(per_stack)), dtype=int)
                    else:
                        cand_mat = common[:, None]
                    types_l = p.cand_type[cand_mat[:, 0]] if len(cand_mat) else np.zeros(0, dtype=int)
                    w = self.weight[cand_mat].sum(axis=1) if len(cand_mat) else np.zeros(0)
                    st = np.zeros(len(types_l))
                    if starters_count and i > 0:
                        st = sum(starter_kg(p, int(c), types_l) for c in u.cells[i])
                    levels_o.append(Level(types_l, cand_mat, w, st))
                u.orients[o] = levels_o
        return units, problems


def group_problems(
    problem: ScheduleProblem,
    chains: list[np.ndarray],
    groups: tuple[tuple[str, ...], ...] | list[tuple[str, ...]] | None = None,
) -> list[str]:
    """Groups of stacks the shortest paths cannot treat as one unit (stacks with different storeys), in words."""
    index = {name: i for i, name in enumerate(problem.stack_names)}
    out = []
    for group in problem.rules.groups if groups is None else groups:
        members = [index[g] for g in group if g in index]
        levels = [tuple(problem.cell_names[c][1] for c in chains[s]) for s in members]
        if len(members) >= 2 and any(lv != levels[0] for lv in levels):
            out.append(f"group {', '.join(group)}: stacks with different storeys are not handled by the heuristic")
    return out


def run_states(problem: ScheduleProblem) -> int:
    """Run states of the minimum run: storeys a section has held, capped at ``min_run`` (1: sections never change)."""
    r = problem.rules
    if StepRule(r.step_rule) is StepRule.FORBID_ANY:
        return 1
    return max(1, int(r.min_run))


def stack_signature(prep: Prepared, s: int) -> bytes | None:
    """What makes stack ``s`` interchangeable with another: orientation freedom, candidates, weights, storey heights.

    Two stacks with the same signature can be modelled once with their weights multiplied (a safe reduction,
    see ``docs/integer_program.md``). None for a stack with a pinned cell, which is never merged.
    """
    p = prep.problem
    parts = [b"free" if p.stack_free[s] else b"fixed"]
    for c in prep.chains[s]:
        if int(c) in prep.pinned:
            return None
        ks = prep.cell_cands(int(c))
        parts += [
            p.cand_type[ks].tobytes(),
            p.cand_orient[ks].tobytes(),
            np.round(prep.weight[ks], 9).tobytes(),
            np.float64(p.storey_height_mm[c] if len(p.storey_height_mm) else 0.0).tobytes(),
            b"|",
        ]
    return b"".join(parts)
