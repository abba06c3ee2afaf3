"""Grade choice per cell with caps: grades used in the building and grade changes per stack.

Checked by the independent rule checker (optimizer.schedule.check) and by counting in the schedule.
"""

import numpy as np
import pytest

from optimizer.building.scenario import load_scenario_text
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import build_catalogue
from optimizer.candidates.feasibility import feasibility
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.run import optimise
from optimizer.pipeline.settings import read_run_settings
from optimizer.schedule.check import check_schedule
from optimizer.schedule.problem import Rules
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

SMALL = paths.SMALL
EXTRA = (
    '\n[catalogue]\nsizes_mm = {min = 300, max = 900, step = 100}\nshapes = ["square"]\n'
    'bar_dias = [16, 20, 25]\ngrades = ["C30/37", "C50/60"]\n'
)


@pytest.fixture(scope="module")
def problem():
    sc = load_scenario_text(SMALL.read_text(encoding="utf-8") + EXTRA, source="grades.toml", base_dir=SMALL.parent)
    cat = build_catalogue(sc)
    assert {t.design.concrete.name for t in cat.types} == {"C30/37", "C50/60"}
    fe = feasibility(sc, cat, scenario_actions(sc))
    return to_problem(fe, sc, read_run_settings(sc))


def _grades(problem, sched):
    return problem.types.fck[problem.cand_type[np.asarray(sched.cand)]]


def test_cap_on_grades_in_the_building(problem):
    import dataclasses

    p = dataclasses.replace(problem, rules=Rules(max_grades=1))
    sched = optimise(p, "highs", 60.0, 1e-4, None)
    assert check_schedule(p, sched) == []
    assert len(set(_grades(p, sched).tolist())) == 1
    free = optimise(dataclasses.replace(problem, rules=Rules()), "highs", 60.0, 1e-4, None)
    assert sched.objective >= free.objective - 1e-6  # a cap never helps


def test_cap_on_grade_changes_per_stack(problem):
    import dataclasses

    p = dataclasses.replace(problem, rules=Rules(max_grade_changes=0))
    sched = optimise(p, "highs", 60.0, 1e-4, None)
    assert check_schedule(p, sched) == []
    g = _grades(p, sched)
    for s in range(len(p.stack_names)):
        assert len(set(g[p.stack == s].tolist())) == 1


def test_checker_flags_a_broken_cap(problem):
    import dataclasses

    free = optimise(dataclasses.replace(problem, rules=Rules()), "highs", 60.0, 1e-4, None)
    if len(set(_grades(problem, free).tolist())) > 1:
        capped = dataclasses.replace(problem, rules=Rules(max_grades=1))
        assert any("concrete grades" in line for line in check_schedule(capped, free))
