"""Brute-force enumeration against the integer program on small buildings (3 stacks x 4 levels x 8 types).

The enumeration restates every rule literally (its own pair test, its own
run-length count, its own objective) and walks all schedules with an exact
branch and bound over whole-stack paths: nothing is pruned that could be
optimal, so its optimum is the true one.
"""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest

from optimizer.ip import solve
from optimizer.problem import Objective, Rules, ScheduleProblem, StepRule
from optimizer.schedule_check import check_schedule
from optimizer.synthetic import SyntheticSpec, synthetic_problem


def _pair_ok(p: ScheduleProblem, lo: int, up: int) -> tuple[bool, bool]:
    """(allowed, needs starters) for type ``up`` standing on type ``lo``."""
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
        return bool(T.section[lo] == T.section[up]), False
    if step > r.max_step_mm:
        return (False, False) if rule is StepRule.LIMIT else (True, True)
    return True, False


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
    got = solve(p, solver="highs", time_limit_s=60, gap_rel=0.0)
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
    got = solve(p, solver="cbc", time_limit_s=60, gap_rel=0.0)
    assert got.objective == pytest.approx(truth, rel=1e-7)
    assert check_schedule(p, got) == []
