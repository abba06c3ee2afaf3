"""Integer program, heuristics, checker and diagnosis on hand-made and synthetic small buildings."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from optimizer.schedule.builder import reduce_problem
from optimizer.schedule.check import check_schedule
from optimizer.schedule.compact import build_model
from optimizer.schedule.diagnose import diagnose
from optimizer.schedule.heuristic import baseline, cellwise_lower_bound, figures, rationalise
from optimizer.schedule.prepared import stack_chains
from optimizer.schedule.problem import Objective, Rules, ScheduleProblem, StepRule, TypeTable
from optimizer.schedule.solve import SolveOptions, lower_bound_premium, pareto, solve
from optimizer.schedule.stackpaths import stack_dp, stack_shortest_path
from optimizer.schedule.synthetic import SyntheticSpec, synthetic_problem, tower


def _types(rows: list[tuple[bool, float, float, int, int, float, float]]) -> TypeTable:
    """Types from (circ, b, h, nb, nh, dia, fck) rows; sections by (circ, b, h)."""
    keys = [(r[0], r[1], r[2]) for r in rows]
    sec = {k: i for i, k in enumerate(dict.fromkeys(keys))}
    return TypeTable(
        mark=tuple(f"T{i}" for i in range(len(rows))),
        circ=np.array([r[0] for r in rows]),
        b=np.array([r[1] for r in rows], dtype=float),
        h=np.array([r[2] for r in rows], dtype=float),
        nb=np.array([r[3] for r in rows]),
        nh=np.array([r[4] for r in rows]),
        dia=np.array([r[5] for r in rows], dtype=float),
        corner_dia=np.array([r[5] for r in rows], dtype=float),
        fck=np.array([r[6] for r in rows], dtype=float),
        section=np.array([sec[k] for k in keys]),
        starter_kg_per_m=np.full(len(rows), 10.0),
    )


def _one_stack(
    types: TypeTable, cands: list[list[int]], weights: list[list[float]], rules: Rules | None = None, name: str = "C4"
) -> ScheduleProblem:
    """A single stack, bottom to top, candidates and weights given per level."""
    n = len(cands)
    cc = [c for c, ks in enumerate(cands) for _ in ks]
    ct = [t for ks in cands for t in ks]
    w = np.array([x for ws in weights for x in ws], dtype=float)
    return ScheduleProblem(
        cell_names=tuple((name, f"L{i:02d}") for i in range(n)),
        stack_names=(name,),
        stack=np.zeros(n, dtype=int),
        above=np.array([i + 1 if i < n - 1 else -1 for i in range(n)]),
        stack_free=np.array([False]),
        types=types,
        cand_cell=np.array(cc),
        cand_type=np.array(ct),
        cand_orient=np.zeros(len(ct), dtype=int),
        steel_kg=w,
        cost=2 * w,
        carbon=3 * w,
        utilisation=np.full(len(ct), 0.5),
        rules=rules or Rules(),
        storey_height_mm=np.full(n, 3000.0),
    )


TYPES = _types(
    [
        (False, 400, 400, 3, 3, 20, 40),  # T0
        (False, 400, 400, 2, 2, 16, 30),  # T1
        (False, 300, 300, 2, 2, 16, 30),  # T2
        (False, 200, 200, 2, 2, 12, 30),  # T3: 100 mm per face below T0/T1
        (False, 300, 300, 4, 4, 20, 30),  # T4: more bars than T1
        (False, 400, 400, 3, 3, 20, 50),  # T5: higher grade than T0
    ]
)


# ----------------------------------------------------------------------------- heuristics


def test_stack_dp_equals_networkx_shortest_path() -> None:
    for seed in range(12):
        rules = Rules(min_run=1 + seed % 3, step_rule=list(StepRule)[seed % 3], max_step_mm=(50.0, 75.0)[seed % 2])
        p = synthetic_problem(
            SyntheticSpec(
                n_stacks=2, n_levels=6, n_types=14, seed=seed, rectangles=True, circles=seed % 2 == 0, free_fraction=0.5
            ),
            rules=rules,
        )
        for s in range(2):
            a, pa = stack_dp(p, s)
            b, pb = stack_shortest_path(p, s)
            assert a == pytest.approx(b)
            if pa is not None:
                assert figures(p, _fill(p, s, pa)).objective >= 0


def _fill(p: ScheduleProblem, s: int, path: np.ndarray) -> np.ndarray:
    cand = np.array([int(np.flatnonzero(p.cand_cell == c)[0]) for c in range(p.n_cells)])
    cand[stack_chains(p)[s]] = path
    return cand


def test_stack_optimum_is_exact_without_coupling() -> None:
    p = synthetic_problem(SyntheticSpec(n_stacks=3, n_levels=4, n_types=8, seed=5), rules=Rules(min_run=2))
    s = solve(p)
    assert s.status == "optimal" and s.gap == pytest.approx(0.0, abs=1e-9)
    mip = solve(p, SolveOptions(exact_decomposition=False, gap_rel=0.0))
    assert mip.objective == pytest.approx(s.objective)
    assert check_schedule(p, s) == []


def test_lower_bound_baseline_and_premium() -> None:
    p = synthetic_problem(SyntheticSpec(n_stacks=4, n_levels=8, n_types=20, seed=3), rules=Rules(max_types=3))
    lb = cellwise_lower_bound(p)
    base = baseline(p)
    best = solve(p, SolveOptions(gap_rel=0.0))
    assert base is not None and check_schedule(p, base) == []
    assert lb.value <= best.objective + 1e-9
    assert best.objective <= figures(p, base.cand).objective + 1e-9 or figures(p, base.cand).n_types > 3
    value, premium = lower_bound_premium(p, best)
    assert value == pytest.approx(lb.value)
    assert premium >= -1e-12


def test_rationalise_meets_the_cap() -> None:
    p = synthetic_problem(
        SyntheticSpec(n_stacks=5, n_levels=6, n_types=20, seed=8, rectangles=True), rules=Rules(max_types=3, min_run=2)
    )
    h = rationalise(p)
    assert h is not None
    assert figures(p, h.cand).n_types <= 3
    assert check_schedule(p, h) == []
    assert solve(p, SolveOptions(gap_rel=0.0)).objective <= h.objective + 1e-9


# ----------------------------------------------------------------------------- integer program


def test_backends_and_solvers_agree() -> None:
    p = synthetic_problem(
        SyntheticSpec(n_stacks=3, n_levels=5, n_types=10, seed=2, rectangles=True, free_fraction=0.5),
        rules=Rules(max_types=3, min_run=2, price_per_section=4),
    )
    values = {
        (solver, backend): solve(p, SolveOptions(solver=solver, backend=backend, gap_rel=0.0, reduce=False)).objective
        for solver, backend in (("highs", "highspy"), ("highs", "pulp"), ("cbc", "pulp"))
    }
    assert max(values.values()) == pytest.approx(min(values.values()))


def test_reductions_keep_the_optimum() -> None:
    p = synthetic_problem(
        SyntheticSpec(n_stacks=6, n_levels=5, n_types=12, seed=4, symmetry=True), rules=Rules(max_types=3)
    )
    full = solve(p, SolveOptions(reduce=False, gap_rel=0.0))
    reduced = solve(p, SolveOptions(reduce=True, gap_rel=0.0))
    assert reduced.objective == pytest.approx(full.objective)
    red = reduce_problem(p, full.cand)
    assert red.keep[full.cand[red.mult > 0]].all()
    assert red.lower_bound <= full.objective + 1e-9


def test_model_names_are_readable_and_unique() -> None:
    p = synthetic_problem(SyntheticSpec(n_stacks=2, n_levels=3, n_types=6, seed=1), rules=Rules(max_types=2, min_run=2))
    prob, variables = build_model(p)
    names = [c.name for c in prob.constraints.values()]
    assert len(names) == len(set(names))
    assert any(n.startswith("assign_C1_L00") for n in names)
    assert any(n.startswith("link_") for n in names) and "cap_types" in names
    assert len(variables.x) == len(p.cand_cell)


@pytest.mark.slow
@pytest.mark.parametrize("formulation", ["compact", "paths"])
def test_time_limited_result_is_not_called_optimal(formulation: str) -> None:
    """A result is "optimal" only with a proven zero gap; anything stopped early says so.

    (The path formulation may well prove this 300-cell problem within 0.5 s; the compact model cannot.)
    """
    p = tower(300, 150, rules=Rules(max_types=4, min_run=2))
    s = solve(p, SolveOptions(time_limit_s=0.5, gap_rel=0.0, formulation=formulation))
    assert s.bound <= s.objective
    if s.status == "optimal":
        assert formulation == "paths" and s.gap <= 1e-6
    else:
        assert s.status in ("time limit", "no schedule")
        assert s.gap > 0.0


def test_pinned_group_and_starters_are_honoured() -> None:
    p = synthetic_problem(SyntheticSpec(n_stacks=3, n_levels=4, n_types=10, seed=7), rules=Rules())
    pin_cell, pin_type = 2, int(p.cand_type[np.flatnonzero(p.cand_cell == 2)[-1]])
    rules = Rules(
        groups=(("C1", "C3"),),
        pinned=((pin_cell, pin_type),),
        step_rule=StepRule.STARTERS,
        max_step_mm=25.0,
        max_types=4,
    )
    q = replace(p, rules=rules)
    s = solve(q, SolveOptions(gap_rel=0.0))
    assert check_schedule(q, s) == []
    assert int(q.cand_type[s.cand[pin_cell]]) == pin_type
    chains = stack_chains(q)
    assert list(q.cand_type[s.cand[chains[0]]]) == list(q.cand_type[s.cand[chains[2]]])


def test_starter_mass_is_counted() -> None:
    rules = Rules(step_rule=StepRule.STARTERS, max_step_mm=75.0)
    p = _one_stack(TYPES, [[1], [3]], [[10.0], [1.0]], rules)
    s = solve(p)
    fig = figures(p, s.cand)
    assert fig.starter_kg == pytest.approx(10.0 * 3.0)
    assert fig.steel_kg == pytest.approx(11.0 + 30.0)
    assert s.objective == pytest.approx(41.0)


def test_pareto_curve_is_monotone() -> None:
    p = synthetic_problem(SyntheticSpec(n_stacks=4, n_levels=5, n_types=12, seed=11), rules=Rules())
    curve = pareto(p, SolveOptions(gap_rel=0.0))
    values = [s.objective for _, s in curve if s.status != "infeasible"]
    assert curve[0][0] == 1
    assert all(b <= a + 1e-9 for a, b in zip(values, values[1:], strict=False))
    for k, s in curve:
        if s.status != "infeasible":
            assert figures(p, s.cand).n_types <= k
            assert check_schedule(replace(p, rules=replace(p.rules, max_types=k)), s) == []


def test_all_three_figures_reported() -> None:
    p = synthetic_problem(
        SyntheticSpec(n_stacks=2, n_levels=3, n_types=6, seed=1), rules=Rules(max_types=2), objective=Objective.CARBON
    )
    s = solve(p)
    text = " ".join(s.notes)
    assert "steel" in text and "cost" in text and "carbon" in text
    assert s.objective == pytest.approx(figures(p, s.cand).carbon)


# ----------------------------------------------------------------------------- checker


def test_checker_names_each_broken_rule() -> None:
    rules = Rules(min_run=2, max_types=1)
    p = _one_stack(TYPES, [[0, 1, 5, 4], [0, 1, 4, 5], [2, 3, 4], [3]], [[1] * 4, [1] * 4, [1] * 3, [1]], rules)

    def cand(types: list[int]) -> np.ndarray:
        return np.array([int(np.flatnonzero((p.cand_cell == c) & (p.cand_type == t))[0]) for c, t in enumerate(types)])

    assert any("more bars" in v and "L01" in v for v in check_schedule(p, cand([1, 4, 4, 3])))
    assert any("grade" in v for v in check_schedule(p, cand([0, 5, 2, 3])))
    assert any("grows" in v and "L01" in v for v in check_schedule(p, cand([4, 1, 2, 3])))
    assert any("step of 100 mm" in v for v in check_schedule(p, cand([1, 1, 3, 3])))
    assert any("holds for 1 storeys" in v for v in check_schedule(p, cand([0, 1, 2, 3])))
    assert any("distinct types" in v for v in check_schedule(p, cand([1, 1, 2, 3])))
    assert "stack C4: level L03 has no type" in check_schedule(p, np.array([0, 4, 8, -1]))


def test_checker_accepts_a_valid_schedule() -> None:
    p = _one_stack(TYPES, [[0, 1], [1], [2], [2]], [[1, 1], [1], [1], [1]], Rules(min_run=2))
    assert check_schedule(p, np.array([1, 2, 3, 4])) == []


# ----------------------------------------------------------------------------- diagnosis


def test_diagnose_names_stack_and_levels() -> None:
    # L01 offers only T4 (4 bars per face): nothing below (T1, 2 per face) can carry it
    p = _one_stack(TYPES, [[1], [4], [2]], [[1], [1], [1]])
    reasons = diagnose(p)
    assert reasons == [
        "stack C4: level L01 needs more bars per face or larger bars than any type allowed below it at L00"
    ]
    assert solve(p).status == "infeasible"


def test_diagnose_step_grade_empty_cell_and_cap() -> None:
    step = diagnose(_one_stack(TYPES, [[1], [3]], [[1], [1]]))
    assert step == [
        "stack C4: level L01 needs a size step of more than 75 mm per face from every type allowed below it at L00"
    ]
    grade = diagnose(_one_stack(TYPES, [[0], [5]], [[1], [1]]))
    assert grade == ["stack C4: level L01 needs a higher concrete grade than any type allowed below it at L00"]
    empty = _one_stack(TYPES, [[0], []], [[1], []])
    assert diagnose(empty) == ["stack C4: level L01 has no type that passes its checks"]
    cap = _one_stack(TYPES, [[0], [1], [2]], [[1], [1], [1]], Rules(max_types=2))
    assert diagnose(cap) == ["the cap of 2 distinct types is too small: every schedule needs at least 3"]
    run = _one_stack(TYPES, [[0], [2], [3]], [[1], [1], [1]], Rules(min_run=2, step_rule=StepRule.STARTERS))
    assert diagnose(run)[0].startswith("stack C4: no schedule holds each section for at least 2 storeys")
