"""Brute-force enumeration against the integer program on small buildings (3 stacks x 4 levels x 8 types).

The enumeration restates every rule literally (its own pair test, its own
run-length count, its own objective) and walks all schedules with an exact
branch and bound over whole-stack paths: nothing is pruned that could be
optimal, so its optimum is the true one.
"""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from optimizer.schedule.check import check_schedule
from optimizer.schedule.pathmodel import applicable
from optimizer.schedule.problem import Objective, Rules, ScheduleProblem, StepRule
from optimizer.schedule.solve import SolveOptions, solve
from optimizer.schedule.synthetic import SyntheticSpec, synthetic_problem
from tests.support.oracles import brute_force

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
    spec = SyntheticSpec(
        n_stacks=3,
        n_levels=4,
        n_types=8,
        seed=seed + 10 * case,
        circles=case % 2 == 1,
        rectangles=case % 3 == 0,
        free_fraction=0.5 if case % 3 == 0 else 0.0,
    )
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
HEAVY = dict(
    steel_ratio=(0.025, 0.04),
    sizes_mm=(250.0, 300.0, 350.0, 400.0, 450.0, 500.0, 550.0, 600.0),
    dias=(20.0, 25.0, 32.0, 40.0),
    counts=(2, 3, 4, 5),
    load_kn_per_level=1200.0,
)


def heavy_problem(case: int, seed: int) -> ScheduleProblem:
    """Case ``case`` of CASES on a heavily reinforced catalogue (3 stacks x 4 storeys, 8 types)."""
    spec = SyntheticSpec(
        n_stacks=3,
        n_levels=4,
        n_types=8,
        seed=500 + seed + 10 * case,
        circles=case % 2 == 1,
        rectangles=case % 3 == 0,
        free_fraction=0.5 if case % 3 == 0 else 0.0,
        **HEAVY,
    )
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
        got = solve(
            p,
            SolveOptions(
                solver="highs",
                time_limit_s=60,
                gap_rel=0.0,
                formulation=formulation,
                exact_decomposition=False,
                reduce=reduce,
            ),
        )
        if not math.isfinite(truth):
            assert got.status == "infeasible", formulation
            continue
        assert check_schedule(p, cand) == []
        assert check_schedule(p, got) == [], formulation
        assert got.objective == pytest.approx(truth, rel=1e-7, abs=1e-6), formulation


@pytest.mark.slow
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
