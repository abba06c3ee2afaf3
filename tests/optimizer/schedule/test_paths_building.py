"""The two formulations agree on a real feasibility matrix (the bundled small building, not synthetic data).

Source of truth: the compact model solved to a zero gap (exact branch and bound over one binary per cell and
type), itself held equal to brute-force enumeration on small instances in test_ip_bruteforce.py and
test_paths.py; the independent rule checker (optimizer.schedule.check) for every schedule.
"""

from dataclasses import replace

import pytest

from optimizer.building.scenario import load_scenario_text
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import build_catalogue
from optimizer.candidates.feasibility import feasibility
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.settings import read_run_settings
from optimizer.schedule.check import check_schedule
from optimizer.schedule.problem import Objective, Rules
from optimizer.schedule.solve import SolveOptions, solve
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

SMALL = paths.SMALL
EXTRA = '\n[catalogue]\nsizes_mm = {min = 300, max = 700, step = 100}\nshapes = ["square"]\nbar_dias = [16, 20, 25]\n'


@pytest.fixture(scope="module")
def problem():
    sc = load_scenario_text(SMALL.read_text(encoding="utf-8") + EXTRA, source="small.toml", base_dir=SMALL.parent)
    fe = feasibility(sc, build_catalogue(sc), scenario_actions(sc))
    return to_problem(fe, sc, read_run_settings(sc))


@pytest.mark.parametrize(
    "rules",
    [
        Rules(min_run=2, price_per_type=50.0),
        Rules(min_run=3, max_types=4),
        Rules(min_run=1, price_per_type=20.0, price_per_section=200.0),
    ],
    ids=["price", "cap", "sections"],
)
def test_paths_equal_compact_on_the_small_building(problem, rules):
    p = replace(problem, rules=rules, objective=Objective.STEEL)
    exact = solve(p, SolveOptions(formulation="compact", gap_rel=0.0, time_limit_s=120))
    assert exact.status == "optimal"
    got = solve(p, SolveOptions(formulation="paths", gap_rel=0.0, time_limit_s=120))
    assert check_schedule(p, got) == []
    assert got.objective == pytest.approx(exact.objective, rel=1e-9)
    assert got.bound <= exact.objective * (1 + 1e-9)
