"""Hypothesis: random small buildings and catalogues against brute force, the checker and the bounds."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from optimizer.schedule.check import check_schedule
from optimizer.schedule.diagnose import diagnose
from optimizer.schedule.heuristic import baseline, cellwise_lower_bound, figures, rationalise, stack_optimum
from optimizer.schedule.problem import Objective, Rules, StepRule
from optimizer.schedule.solve import SolveOptions, solve
from optimizer.schedule.synthetic import SyntheticSpec, synthetic_problem
from tests.support.oracles import brute_force

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

rules_st = st.builds(
    Rules,
    monotone_sections=st.booleans(),
    monotone_bars=st.booleans(),
    monotone_grade=st.booleans(),
    max_step_mm=st.sampled_from([25.0, 50.0, 75.0, 150.0]),
    step_rule=st.sampled_from(list(StepRule)),
    min_run=st.integers(1, 3),
    max_types=st.one_of(st.none(), st.integers(1, 4)),
    max_sections=st.one_of(st.none(), st.integers(1, 3)),
    price_per_type=st.sampled_from([0.0, 0.0, 20.0]),
    price_per_section=st.sampled_from([0.0, 10.0]),
)

spec_st = st.builds(
    SyntheticSpec,
    n_stacks=st.integers(1, 3),
    n_levels=st.integers(1, 4),
    n_types=st.integers(3, 8),
    seed=st.integers(0, 10_000),
    rectangles=st.booleans(),
    circles=st.booleans(),
    free_fraction=st.sampled_from([0.0, 0.5]),
    symmetry=st.booleans(),
    short_fraction=st.sampled_from([0.0, 0.5]),
    load_kn_per_level=st.sampled_from([300.0, 600.0, 1500.0]),
    steel_ratio=st.sampled_from([(0.002, 0.04), (0.025, 0.04)]),  # the second: laps between storeys bind
)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(spec=spec_st, rules=rules_st, objective=st.sampled_from(list(Objective)))
def test_integer_program_matches_brute_force(spec: SyntheticSpec, rules: Rules, objective: Objective) -> None:
    p = synthetic_problem(spec, rules=rules, objective=objective)
    truth, _ = brute_force(p)
    got = solve(p, SolveOptions(time_limit_s=60, gap_rel=0.0))
    if not math.isfinite(truth):
        assert got.status == "infeasible"
        assert diagnose(p, time_limit_s=20) != []
        return
    assert got.status == "optimal"
    assert check_schedule(p, got) == []
    assert np.isclose(got.objective, truth, rtol=1e-7, atol=1e-6)
    assert cellwise_lower_bound(p).value <= got.objective + 1e-6
    assert got.bound <= got.objective + 1e-6


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(spec=spec_st, rules=rules_st)
def test_heuristic_schedules_keep_every_rule(spec: SyntheticSpec, rules: Rules) -> None:
    p = synthetic_problem(spec, rules=rules)
    free = stack_optimum(p)
    if free is not None:
        loose = Rules(**{**rules.__dict__, "max_types": None, "max_sections": None})
        assert check_schedule(p.__class__(**{**p.__dict__, "rules": loose}), free) == []
    greedy = rationalise(p)
    if greedy is not None:
        assert check_schedule(p, greedy) == []
        assert greedy.objective == pytest.approx(figures(p, greedy.cand).objective, rel=1e-12)
    base = baseline(p)
    if base is not None and rules.min_run <= 4:
        loose = Rules(**{**rules.__dict__, "max_types": None, "max_sections": None})
        assert check_schedule(p.__class__(**{**p.__dict__, "rules": loose}), base) == []
