"""Test oracles: the true optimum of small scheduling problems by exhaustive enumeration.

The enumeration restates every rule literally (its own pair test, its own run-length count, its own
objective) and walks all schedules with an exact branch and bound over whole-stack paths: nothing is
pruned that could be optimal, so its optimum is the true one. Written apart from the solvers it checks.

Two enumerations, written apart from each other too: ``brute_force`` (stacks one by one, branch and
bound over whole-stack paths) and the ``bf_*`` family (candidate lists, pair tests, unit paths with
orientation and groups, the optimum of a whole problem) used by the path formulation's tests.
"""

from __future__ import annotations

import itertools
import math

import numpy as np

from optimizer.schedule.problem import Objective, ScheduleProblem, StepRule

__all__ = [
    "brute_force",
    "bf_chains",
    "bf_bar_area",
    "bf_lap_ok",
    "bf_pair",
    "bf_grade_id",
    "bf_cell_cands",
    "bf_stack_paths",
    "bf_optimum",
    "bf_unit_paths",
]


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
            dfs(i + 1, cost + c_cost, chosen + [combo], types | frozenset(int(p.cand_type[k]) for k in combo))

    del names
    dfs(0, 0.0, [], frozenset())
    if best[1] is None:
        return math.inf, None
    cand = np.full(p.n_cells, -1, dtype=int)
    for s, combo in zip(stacks, best[1], strict=True):
        cand[chains[s]] = combo
    return best[0], cand


# --------------------------------------------------------------------------- the bf_* family


def bf_chains(p: ScheduleProblem) -> dict[int, list[int]]:
    """Cells of every stack, bottom to top: start at the cell nothing stands on and follow ``above``."""
    pointed = {int(a) for a in p.above if a >= 0}
    out: dict[int, list[int]] = {}
    for c in range(p.n_cells):
        if c in pointed:
            continue
        chain, cur = [], c
        while cur >= 0:
            chain.append(cur)
            cur = int(p.above[cur])
        out[int(p.stack[c])] = chain
    return out


def bf_bar_area(p: ScheduleProblem, t: int) -> float:
    """Longitudinal bar area of type t, mm2, counted bar by bar (corner bars first on rectangles)."""
    T = p.types
    if bool(T.circ[t]):
        dias = [float(T.dia[t])] * int(T.nb[t])
    else:
        n_bars = 2 * int(T.nb[t]) + 2 * int(T.nh[t]) - 4
        dias = [float(T.corner_dia[t])] * 4 + [float(T.dia[t])] * (n_bars - 4)
    return sum(math.pi * d * d / 4.0 for d in dias)


def bf_lap_ok(p: ScheduleProblem, lo: int, up: int) -> bool:
    """EN 1992-1-1, 9.5.2(3) at the lap at the foot of the upper storey: As below + As above <= ratio Ac above."""
    ratio = p.rules.lap_steel_ratio_max
    if ratio is None:
        return True
    T = p.types
    d = float(T.b[up])
    ac_up = math.pi * d * d / 4.0 if bool(T.circ[up]) else d * float(T.h[up])
    return bf_bar_area(p, lo) + bf_bar_area(p, up) <= ratio * ac_up + 1e-6


def bf_pair(p: ScheduleProblem, lo: int, up: int) -> tuple[bool, bool]:
    """(may type ``up`` stand on type ``lo``, does it need separate starter bars).

    With separate starter bars (STARTERS and a large step) the lap holds the starters, which repeat the upper
    bars, and the upper bars: not the sum with the bars below, so bf_lap_ok does not apply there."""
    T, r = p.types, p.rules
    if r.monotone_sections:
        if bool(T.circ[lo]) != bool(T.circ[up]):
            return False, False
        if T.b[up] > T.b[lo] or T.h[up] > T.h[lo]:
            return False, False
    if r.monotone_bars:
        if T.nb[up] > T.nb[lo] or T.nh[up] > T.nh[lo]:
            return False, False
        if T.dia[up] > T.dia[lo] or T.corner_dia[up] > T.corner_dia[lo]:
            return False, False
    if r.monotone_grade and T.fck[up] > T.fck[lo]:
        return False, False
    rule = StepRule(r.step_rule)
    if rule is StepRule.FORBID_ANY:
        return bool(T.section[up] == T.section[lo]) and bf_lap_ok(p, lo, up), False
    step = max(abs(float(T.b[lo]) - float(T.b[up])), abs(float(T.h[lo]) - float(T.h[up]))) / 2.0
    if step > r.max_step_mm:
        if rule is StepRule.LIMIT:
            return False, False
        return True, True
    return bf_lap_ok(p, lo, up), False


def bf_grade_id(p: ScheduleProblem) -> dict[float, int]:
    """Grade id of a concrete strength: its rank among the distinct strengths of the catalogue."""
    return {g: i for i, g in enumerate(sorted({float(x) for x in p.types.fck}))}


def bf_cell_cands(p: ScheduleProblem, c: int) -> list[int]:
    """Candidates of a cell (only the pinned type when the cell is pinned)."""
    ks = [int(k) for k in range(len(p.cand_cell)) if int(p.cand_cell[k]) == c]
    pins = [int(t) for cc, t in p.rules.pinned if int(cc) == c]
    if pins:
        ks = [k for k in ks if int(p.cand_type[k]) == pins[0]]
    return ks


def bf_stack_paths(p: ScheduleProblem, chain: list[int]) -> list[tuple[float, tuple[int, ...]]]:
    """Every buildable schedule of one stack alone, as (weight incl. starter bars, candidate per storey)."""
    w = np.asarray(p.weight(), dtype=float)
    r = p.rules
    pay_starters = StepRule(r.step_rule) is StepRule.STARTERS and Objective(p.objective) is Objective.STEEL
    out = []
    for combo in itertools.product(*[bf_cell_cands(p, c) for c in chain]):
        if len({int(p.cand_orient[k]) for k in combo}) != 1:
            continue  # a stack keeps one orientation
        types = [int(p.cand_type[k]) for k in combo]
        cost = sum(float(w[k]) for k in combo)
        good = True
        for i in range(1, len(combo)):
            allowed, starters = bf_pair(p, types[i - 1], types[i])
            if not allowed:
                good = False
                break
            if starters and pay_starters:
                cost += float(p.types.starter_kg_per_m[types[i]]) * float(p.storey_height_mm[chain[i]]) / 1000.0
        if not good:
            continue
        # minimum run: every run of one section except the topmost holds at least min_run storeys
        secs = [int(p.types.section[t]) for t in types]
        runs = [len(list(g)) for _, g in itertools.groupby(secs)]
        if any(n < r.min_run for n in runs[:-1]):
            continue
        if r.max_grade_changes is not None:
            grades = [float(p.types.fck[t]) for t in types]
            if sum(1 for a, b in zip(grades[:-1], grades[1:], strict=True) if a != b) > r.max_grade_changes:
                continue
        out.append((cost, tuple(combo)))
    out.sort()
    return out


def bf_optimum(p: ScheduleProblem) -> tuple[float, np.ndarray | None]:
    """The true optimum over all schedules (exact branch and bound over whole-stack schedules).

    Objective: chosen weights + starter bars + price_per_type x distinct types + price_per_section x
    distinct sections. Caps on types, sections and grades, groups (same type and orientation level by
    level) and pins are enforced literally. The bound used for pruning (cost so far + the cheapest
    schedule of every remaining stack + prices of the types already used) never exceeds the value of a
    completion, so nothing that could be optimal is cut.
    """
    r = p.rules
    chains = bf_chains(p)
    stacks = sorted(chains)
    all_paths = [bf_stack_paths(p, chains[s]) for s in stacks]
    if any(not ps for ps in all_paths):
        return math.inf, None
    mins = [ps[0][0] for ps in all_paths]
    rest = [sum(mins[i:]) for i in range(len(mins))] + [0.0]
    level_of = {c: p.cell_names[c][1] for c in range(p.n_cells)}
    group_of: dict[str, int] = {}
    for gi, grp in enumerate(r.groups):
        for name in grp:
            group_of[name] = gi
    T = p.types
    best: list = [math.inf, None]

    def price(types: frozenset[int]) -> float:
        return r.price_per_type * len(types) + r.price_per_section * len({int(T.section[t]) for t in types})

    def caps_ok(types: frozenset[int]) -> bool:
        if r.max_types is not None and len(types) > r.max_types:
            return False
        if r.max_sections is not None and len({int(T.section[t]) for t in types}) > r.max_sections:
            return False
        return r.max_grades is None or len({float(T.fck[t]) for t in types}) <= r.max_grades

    def dfs(i: int, cost: float, chosen: list, seen: dict, types: frozenset[int]) -> None:
        if cost + rest[i] + price(types) >= best[0] - 1e-9 or not caps_ok(types):
            return
        if i == len(stacks):
            best[0], best[1] = cost + price(types), list(chosen)
            return
        s = stacks[i]
        gi = group_of.get(p.stack_names[s])
        for c_cost, combo in all_paths[i]:
            if cost + c_cost + rest[i + 1] + price(types) >= best[0] - 1e-9:
                break
            new_seen = seen
            if gi is not None:
                new_seen = dict(seen)
                clash = False
                for c, k in zip(chains[s], combo, strict=True):
                    key = (gi, level_of[c])
                    val = (int(p.cand_type[k]), int(p.cand_orient[k]))
                    if new_seen.setdefault(key, val) != val:
                        clash = True
                        break
                if clash:
                    continue
            dfs(i + 1, cost + c_cost, chosen + [combo], new_seen, types | frozenset(int(p.cand_type[k]) for k in combo))

    dfs(0, 0.0, [], {}, frozenset())
    if best[1] is None:
        return math.inf, None
    cand = np.full(p.n_cells, -1, dtype=int)
    for s, combo in zip(stacks, best[1], strict=True):
        cand[chains[s]] = combo
    return float(best[0]), cand


def bf_unit_paths(p: ScheduleProblem, stacks: tuple[int, ...]) -> list[tuple[float, tuple[int, ...], int]]:
    """Every buildable schedule of a unit (one stack, or grouped stacks taking the same type and orientation
    level by level): (summed weight incl. starter bars of every stack, candidates of the first stack, orientation).
    """
    chains = bf_chains(p)
    first = chains[stacks[0]]
    by_key = {(int(p.cand_cell[k]), int(p.cand_type[k]), int(p.cand_orient[k])): k for k in range(len(p.cand_cell))}
    own = {s: {combo: cost for cost, combo in bf_stack_paths(p, chains[s])} for s in stacks}
    out = []
    for combo, cost in own[stacks[0]].items():
        total = cost
        for s in stacks[1:]:
            other = []
            for c_first, c, k in zip(first, chains[s], combo, strict=True):
                assert p.cell_names[c_first][1] == p.cell_names[c][1]
                other.append(by_key.get((c, int(p.cand_type[k]), int(p.cand_orient[k])), -1))
            other_t = tuple(other)
            if other_t not in own[s]:
                total = math.inf
                break
            total += own[s][other_t]
        if math.isfinite(total):
            out.append((total, combo, int(p.cand_orient[combo[0]])))
    return out
