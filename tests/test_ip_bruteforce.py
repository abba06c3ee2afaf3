"""Brute-force enumeration against the integer program on small buildings (3 stacks x 4 levels x 8 types).

The enumeration restates every rule literally (its own pair test, its own
run-length count, its own objective) and walks all schedules with an exact
branch and bound over whole-stack paths: nothing is pruned that could be
optimal, so its optimum is the true one.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import replace

import numpy as np
import pytest

from optimizer.schedule.check import check_schedule
from optimizer.schedule.pathmodel import applicable
from optimizer.schedule.problem import Objective, Rules, ScheduleProblem, StepRule
from optimizer.schedule.solve import SolveOptions, solve
from optimizer.schedule.synthetic import SyntheticSpec, synthetic_problem


def _steel_mm2(p: ScheduleProblem, t: int) -> float:
    """Bar area of type t: circles nb bars; rectangles 4 corner bars and 2 (nb - 2) + 2 (nh - 2) others."""
    T = p.types
    one = math.pi * float(T.dia[t]) ** 2 / 4
    if T.circ[t]:
        return int(T.nb[t]) * one
    return math.pi * float(T.corner_dia[t]) ** 2 + (2 * int(T.nb[t]) + 2 * int(T.nh[t]) - 8) * one


def _concrete_mm2(p: ScheduleProblem, t: int) -> float:
    T = p.types
    return math.pi * float(T.b[t]) ** 2 / 4 if T.circ[t] else float(T.b[t]) * float(T.h[t])


def _lap_ok(p: ScheduleProblem, lo: int, up: int) -> bool:
    """EN 1992-1-1, 9.5.2(3): the bars below lap with the bars above in the section above."""
    ratio = p.rules.lap_steel_ratio_max
    return ratio is None or _steel_mm2(p, lo) + _steel_mm2(p, up) <= ratio * _concrete_mm2(p, up) + 1e-6


def _pair_ok(p: ScheduleProblem, lo: int, up: int) -> tuple[bool, bool]:
    """(allowed, needs starters) for type ``up`` standing on type ``lo``.

    A pair with separate starter bars (STARTERS, large step) laps the upper bars with starters that repeat
    them, so the sum rule of the lap does not apply to it (2 As above is a per-cell matter)."""
    T, r = p.types, p.rules
    if r.monotone_sections:
        if bool(T.circ[lo]) != bool(T.circ[up]) or T.b[up] > T.b[lo] or T.h[up] > T.h[lo]:
            return False, False
    if r.monotone_bars:
        if T.nb[up] > T.nb[lo] or T.nh[up] > T.nh[lo] or T.dia[up] > T.dia[lo] or T.corner_dia[up] > T.corner_dia[lo]:
            return False, False
    if r.monotone_grade and T.fck[up] > T.fck[lo]:
        return False, False
    step = max(abs(T.b[lo] - T.b[up]), abs(T.h[lo] - T.h[up])) / 2
    rule = StepRule(r.step_rule)
    if rule is StepRule.FORBID_ANY:
        return bool(T.section[lo] == T.section[up]) and _lap_ok(p, lo, up), False
    if step > r.max_step_mm:
        return (False, False) if rule is StepRule.LIMIT else (True, True)
    return _lap_ok(p, lo, up), False


def _runs_ok(p: ScheduleProblem, types: list[int]) -> bool:
    sections = [int(p.types.section[t]) for t in types]
    runs = [len(list(g)) for _, g in itertools.groupby(sections)]
    return all(n >= p.rules.min_run for n in runs[:-1])


def _stack_paths(p: ScheduleProblem, chain: list[int]) -> list[tuple[float, tuple[int, ...]]]:
    w = p.weight()
    per_cell = []
    for c in chain:
        ks = [int(k) for k in np.flatnonzero(p.cand_cell == c)]
        pins = [t for cc, t in p.rules.pinned if cc == c]
        if pins:
            ks = [k for k in ks if int(p.cand_type[k]) == pins[0]]
        per_cell.append(ks)
    out = []
    for combo in itertools.product(*per_cell):
        if len({int(p.cand_orient[k]) for k in combo}) > 1:
            continue
        types = [int(p.cand_type[k]) for k in combo]
        cost = float(sum(w[k] for k in combo))
        ok = True
        for i in range(1, len(combo)):
            allowed, starters = _pair_ok(p, types[i - 1], types[i])
            if not allowed:
                ok = False
                break
            if starters and Objective(p.objective) is Objective.STEEL:
                cost += float(p.types.starter_kg_per_m[types[i]] * p.storey_height_mm[chain[i]] / 1000.0)
        if ok and _runs_ok(p, types):
            out.append((cost, combo))
    out.sort()
    return out


def brute_force(p: ScheduleProblem) -> tuple[float, np.ndarray | None]:
    """The true optimum and one optimal schedule (or (inf, None) when there is none)."""
    chains: dict[int, list[int]] = {}
    below = {int(a) for a in p.above if a >= 0}
    for c in range(p.n_cells):
        if c not in below:
            chain, cur = [], c
            while cur >= 0:
                chain.append(cur)
                cur = int(p.above[cur])
            chains[int(p.stack[c])] = chain
    stacks = sorted(chains)
    paths = [_stack_paths(p, chains[s]) for s in stacks]
    if any(not ps for ps in paths):
        return math.inf, None
    r = p.rules
    mins = [ps[0][0] for ps in paths]
    rest = [sum(mins[i:]) for i in range(len(mins))] + [0.0]
    names = {name: i for i, name in enumerate(p.stack_names)}
    best = [math.inf, None]

    def groups_ok(chosen: list[tuple[int, ...]]) -> bool:
        lookup = {}
        for s, combo in zip(stacks, chosen, strict=False):
            for c, k in zip(chains[s], combo, strict=True):
                lookup[(p.stack_names[s], p.cell_names[c][1])] = (int(p.cand_type[k]), int(p.cand_orient[k]))
        for group in r.groups:
            for lv in {lv for (_, lv) in lookup}:
                vals = {lookup[(g, lv)] for g in group if (g, lv) in lookup}
                if len(vals) > 1:
                    return False
        return True

    def dfs(i: int, cost: float, chosen: list[tuple[int, ...]], types: frozenset[int]) -> None:
        secs = {int(p.types.section[t]) for t in types}
        price = r.price_per_type * len(types) + r.price_per_section * len(secs)
        if cost + rest[i] + price >= best[0] - 1e-9:
            return
        if r.max_types is not None and len(types) > r.max_types:
            return
        if r.max_sections is not None and len(secs) > r.max_sections:
            return
        if not groups_ok(chosen):
            return
        if i == len(stacks):
            best[0], best[1] = cost + price, list(chosen)
            return
        for c_cost, combo in paths[i]:
            if cost + c_cost + rest[i + 1] + price >= best[0] - 1e-9:
                break
            dfs(i + 1, cost + c_cost, chosen + [combo],
                types | frozenset(int(p.cand_type[k]) for k in combo))

    del names
    dfs(0, 0.0, [], frozenset())
    if best[1] is None:
        return math.inf, None
    cand = np.full(p.n_cells, -1, dtype=int)
    for s, combo in zip(stacks, best[1], strict=True):
        cand[chains[s]] = combo
    return best[0], cand


CASES = [
    Rules(),
    Rules(max_types=2),
    Rules(max_types=3, min_run=2),
    Rules(min_run=3, price_per_type=15.0),
    Rules(step_rule=StepRule.STARTERS, max_step_mm=50.0, max_types=3),
    Rules(step_rule=StepRule.FORBID_ANY, max_types=4),
    Rules(max_sections=2, price_per_type=5.0),
    Rules(monotone_grade=False, monotone_bars=False, max_types=2),
    Rules(groups=(("C1", "C2"),), max_types=3),
    Rules(pinned=((0, 7),), max_types=3),
]


@pytest.mark.parametrize("seed", [0, 1, 2])
@pytest.mark.parametrize("case", range(len(CASES)))
def test_bruteforce_equals_integer_program(seed: int, case: int) -> None:
    rules = CASES[case]
    spec = SyntheticSpec(n_stacks=3, n_levels=4, n_types=8, seed=seed + 10 * case, circles=case % 2 == 1,
                         rectangles=case % 3 == 0, free_fraction=0.5 if case % 3 == 0 else 0.0)
    p = synthetic_problem(spec, rules=rules, objective=[Objective.STEEL, Objective.COST][seed % 2])
    truth, cand = brute_force(p)
    got = solve(p, SolveOptions(solver="highs", time_limit_s=60, gap_rel=0.0))
    if not math.isfinite(truth):
        assert got.status == "infeasible"
        return
    assert check_schedule(p, cand) == []
    assert got.status == "optimal"
    assert check_schedule(p, got) == []
    assert got.objective == pytest.approx(truth, rel=1e-7, abs=1e-6)


@pytest.mark.parametrize("seed", [3, 4])
def test_bruteforce_equals_cbc(seed: int) -> None:
    spec = SyntheticSpec(n_stacks=3, n_levels=4, n_types=8, seed=seed, rectangles=True, free_fraction=0.5)
    p = synthetic_problem(spec, rules=Rules(max_types=2, min_run=2))
    truth, _ = brute_force(p)
    got = solve(p, SolveOptions(solver="cbc", time_limit_s=60, gap_rel=0.0))
    assert got.objective == pytest.approx(truth, rel=1e-7)
    assert check_schedule(p, got) == []


# Heavily reinforced catalogues (As / Ac from 2.5 % to 4 %, large bars, close sizes, heavy loads): large
# sections full of steel under smaller ones, where the maximum steel at laps (EN 1992-1-1, 9.5.2(3):
# As below + As above <= 0.08 Ac above) binds although every type passes 0.04 Ac alone.
HEAVY = dict(steel_ratio=(0.025, 0.04), sizes_mm=(250.0, 300.0, 350.0, 400.0, 450.0, 500.0, 550.0, 600.0),
             dias=(20.0, 25.0, 32.0, 40.0), counts=(2, 3, 4, 5), load_kn_per_level=1200.0)


def heavy_problem(case: int, seed: int) -> ScheduleProblem:
    """Case ``case`` of CASES on a heavily reinforced catalogue (3 stacks x 4 storeys, 8 types)."""
    spec = SyntheticSpec(n_stacks=3, n_levels=4, n_types=8, seed=500 + seed + 10 * case, circles=case % 2 == 1,
                         rectangles=case % 3 == 0, free_fraction=0.5 if case % 3 == 0 else 0.0, **HEAVY)
    return synthetic_problem(spec, rules=CASES[case], objective=[Objective.STEEL, Objective.COST][seed % 2])


def _without_lap_rule(p: ScheduleProblem) -> ScheduleProblem:
    return replace(p, rules=replace(p.rules, lap_steel_ratio_max=None))


@pytest.mark.parametrize("seed", [0, 1, 2])
@pytest.mark.parametrize("case", range(len(CASES)))
def test_bruteforce_equals_both_formulations_heavy(seed: int, case: int) -> None:
    """Truth: brute_force (the lap rule restated in _lap_ok). The path formulation (where it applies) and the
    compact model (with and without its reductions, whose path pruning knows the rule too), all forced past
    the shortcut for uncoupled stacks, reach the optimum with a schedule the independent checker accepts."""
    p = heavy_problem(case, seed)
    truth, cand = brute_force(p)
    runs = [("compact", True), ("compact", False)] + ([("paths", True)] if applicable(p) is None else [])
    for formulation, reduce in runs:
        got = solve(p, SolveOptions(solver="highs", time_limit_s=60, gap_rel=0.0, formulation=formulation,
                                    exact_decomposition=False, reduce=reduce))
        if not math.isfinite(truth):
            assert got.status == "infeasible", formulation
            continue
        assert check_schedule(p, cand) == []
        assert check_schedule(p, got) == [], formulation
        assert got.objective == pytest.approx(truth, rel=1e-7, abs=1e-6), formulation


def test_heavy_cases_bind_the_lap_rule() -> None:
    """The heavy cases above test the lap rule only if it changes their optimum: brute force with the rule
    and without it (Rules.lap_steel_ratio_max = None) differ in at least a third of the 30 cases."""
    binding = 0
    for case in range(len(CASES)):
        for seed in (0, 1, 2):
            p = heavy_problem(case, seed)
            on, off = brute_force(p)[0], brute_force(_without_lap_rule(p))[0]
            if math.isinf(on) != math.isinf(off) or (math.isfinite(on) and on > off * (1 + 1e-9) + 1e-9):
                binding += 1
            assert on >= off - 1e-9  # a rule more can only cost
    assert binding >= 10, binding
