"""Fast schedules without the integer program: the unconstrained optimum, the greedy warm start, bounds and figures.

Built on the per-stack shortest paths of :mod:`optimizer.schedule.stackpaths`:

* :func:`stack_optimum` - every stack (or group of stacks) on its own best
  path: the exact optimum when no cap or price couples the stacks, and a
  starting point otherwise;
* :func:`rationalise` - a greedy reduction of the type set (drop the type
  whose loss costs least, re-route the stacks that used it) until the caps are
  met and no drop pays for itself: the warm start of the integer program;
* :func:`cellwise_lower_bound` - the lightest feasible candidate per cell, no
  continuity, unlimited types;
* :func:`baseline` - the rule of thumb: stacks grouped by load, one type per
  group per band of storeys;
* :func:`figures` - steel, starter steel, cost, carbon and type counts of any
  schedule.
"""

from __future__ import annotations

import heapq
import time
from dataclasses import dataclass, replace

import networkx as nx
import numpy as np

from optimizer.schedule.prepared import EPS, Prepared, run_states, starter_kg, transition
from optimizer.schedule.problem import Objective, Schedule, ScheduleProblem, Status, StepRule
from optimizer.schedule.stackpaths import unit_paths

__all__ = [
    "Figures",
    "LowerBound",
    "stack_optimum",
    "rationalise",
    "restrict",
    "cellwise_lower_bound",
    "baseline",
    "figures",
    "figure_notes",
]


@dataclass(frozen=True)
class Figures:
    """Every figure of a schedule, whatever was minimised.

    Attributes:
        steel_kg: steel of the chosen candidates plus starter bars, kg.
        starter_kg: starter bars at large size steps (included in ``steel_kg``), kg.
        cost: cost of the chosen candidates.
        carbon: embodied carbon of the chosen candidates, kgCO2e.
        n_types: distinct types used.
        n_sections: distinct sections (formwork sets) used.
        objective: the minimised quantity including the prices of types and sections.
    """

    steel_kg: float
    starter_kg: float
    cost: float
    carbon: float
    n_types: int
    n_sections: int
    objective: float


@dataclass(frozen=True)
class LowerBound:
    """The cell-wise lower bound: the lightest feasible candidate per cell.

    Attributes:
        value: sum of the objective weights of the lightest candidates (no prices of types).
        cand: the lightest candidate per cell (-1 where a cell has none).
    """

    value: float
    cand: np.ndarray


def _heuristic_schedule(
    problem: ScheduleProblem, prep: Prepared, paths: dict[int, np.ndarray], solver: str, t0: float
) -> Schedule:
    """The schedule of the chosen unit paths, labelled as a heuristic one (no bound, no gap)."""
    cand = _assemble(problem, prep, paths)
    return Schedule(
        cand=cand,
        status=Status.HEURISTIC,
        objective=figures(problem, cand).objective,
        bound=-np.inf,
        gap=np.inf,
        solver=solver,
        seconds=time.perf_counter() - t0,
    )


def _assemble(problem: ScheduleProblem, prep: Prepared, paths: dict[int, np.ndarray]) -> np.ndarray:
    cand = np.full(problem.n_cells, -1, dtype=int)
    for ui, mat in paths.items():
        cells = prep.units[ui].cells
        cand[cells.ravel()] = mat.ravel()
    return cand


def stack_optimum(problem: ScheduleProblem, allowed_types: np.ndarray | None = None) -> Schedule | None:
    """Every stack (or group of stacks) on its own best path, ignoring caps and prices on types.

    Exact when no cap or price couples the stacks. Returns None when some stack
    is impossible (see :mod:`optimizer.schedule.diagnose`) or a group cannot be handled.
    """
    t0 = time.perf_counter()
    prep = Prepared(problem)
    if prep.problems:
        return None
    paths: dict[int, np.ndarray] = {}
    for ui, unit in enumerate(prep.units):
        cost, mat = unit_paths(prep, unit, allowed_types)
        if mat is None:
            return None
        paths[ui] = mat
    return _heuristic_schedule(problem, prep, paths, "stack shortest paths", t0)


def restrict(problem: ScheduleProblem, per_cell: int) -> tuple[ScheduleProblem, np.ndarray]:
    """The problem with only the ``per_cell`` lightest candidates of each cell (and every candidate of pinned cells).

    A schedule of the restricted problem is a schedule of the full one (its candidates are a subset).

    Returns:
        The restricted problem and the index of each kept candidate in the full problem.
    """
    w = np.asarray(problem.weight(), dtype=float)
    order = np.lexsort((w, problem.cand_cell))
    cells = problem.cand_cell[order]
    rank = np.arange(len(order)) - np.searchsorted(cells, cells, side="left")
    keep = np.zeros(len(order), dtype=bool)
    keep[order[rank < per_cell]] = True
    for c, _t in problem.rules.pinned:
        keep[problem.cand_cell == int(c)] = True
    idx = np.flatnonzero(keep)
    sub = replace(
        problem,
        cand_cell=problem.cand_cell[idx],
        cand_type=problem.cand_type[idx],
        cand_orient=problem.cand_orient[idx],
        steel_kg=problem.steel_kg[idx],
        cost=problem.cost[idx],
        carbon=problem.carbon[idx],
        utilisation=problem.utilisation[idx],
    )
    return sub, idx


def rationalise(  # noqa: PLR0912, PLR0915 - greedy phases of the rationalisation in order
    problem: ScheduleProblem,
    max_types: int | None = None,
    max_sections: int | None = None,
    time_limit_s: float = 60.0,
    per_cell: int | None = None,
) -> Schedule | None:
    """A feasible rationalised schedule by greedy reduction of the type set (warm start for the integer program).

    Start from every stack on its own best path; then repeatedly drop the type
    (or, for the section cap, all types of a section) whose removal raises the
    objective least - net of the price of a type or section - re-routing only the
    stacks that used it, until the caps hold and no drop pays for itself.
    Removal costs are evaluated lazily (a priority queue of stale estimates).

    Args:
        problem: the problem; caps default to the problem's rules.
        max_types: cap on distinct types (None: the rules' cap).
        max_sections: cap on distinct sections (None: the rules' cap).
        time_limit_s: stop dropping after this long (the schedule is still feasible, maybe over a cap).
        per_cell: work only with the lightest ``per_cell`` candidates of each cell (faster on large catalogues;
            None: all candidates). If that finds nothing, all candidates are tried.

    Returns:
        A schedule with status "heuristic" (or None when no schedule was found or a cap could not be met).
    """
    if per_cell is not None:
        sub, idx = restrict(problem, per_cell)
        found = rationalise(sub, max_types, max_sections, time_limit_s, None)
        if found is not None:
            return replace(found, cand=idx[found.cand])
    t0 = time.perf_counter()
    r = problem.rules
    cap_t = max_types if max_types is not None else r.max_types
    cap_s = max_sections if max_sections is not None else r.max_sections
    prep = Prepared(problem)
    if prep.problems:
        return None
    n_t = len(problem.types)
    allowed = np.ones(n_t, dtype=bool)
    paths: dict[int, np.ndarray] = {}
    costs: dict[int, float] = {}
    for ui, unit in enumerate(prep.units):
        cost, mat = unit_paths(prep, unit, None)
        if mat is None:
            return None
        paths[ui], costs[ui] = mat, cost
    sec = problem.types.section

    def used_types() -> dict[int, set[int]]:
        users: dict[int, set[int]] = {}
        for ui, mat in paths.items():
            for t in set(problem.cand_type[mat.ravel()].tolist()):
                users.setdefault(int(t), set()).add(ui)
        return users

    users = used_types()
    allowed[:] = False
    allowed[list(users)] = True

    def n_sections() -> int:
        return len(set(sec[list(users)].tolist()))

    def drop_cost(group: list[int]) -> tuple[float, dict[int, tuple[float, np.ndarray]]]:
        trial = allowed.copy()
        trial[group] = False
        affected = set().union(*(users.get(t, set()) for t in group))
        new: dict[int, tuple[float, np.ndarray]] = {}
        delta = 0.0
        for ui in affected:
            cost, mat = unit_paths(prep, prep.units[ui], trial)
            if mat is None:
                return np.inf, {}
            new[ui] = (cost, mat)
            delta += cost - costs[ui]
        saving = r.price_per_type * len(group)
        secs_left = set(sec[[t for t in users if t not in group]].tolist())
        saving += r.price_per_section * (len(set(sec[list(users)].tolist())) - len(secs_left))
        return delta - saving, new

    def must_drop() -> bool:
        return (cap_t is not None and len(users) > cap_t) or (cap_s is not None and n_sections() > cap_s)

    # items: single types (type cap or price), or all types of a section (section cap)
    estimate: dict[tuple[int, ...], float] = {}
    pays = r.price_per_type > 0 or r.price_per_section > 0
    while must_drop() or pays:
        if time.perf_counter() - t0 > time_limit_s:
            break
        if cap_s is not None and n_sections() > cap_s:
            secs: dict[int, list[int]] = {}
            for t in sorted(users):
                secs.setdefault(int(sec[t]), []).append(t)
            items = [tuple(v) for v in secs.values()]
        else:
            items = [(t,) for t in sorted(users)]
        heap = [(estimate.get(it, -np.inf), it) for it in items]
        heapq.heapify(heap)
        fresh: dict[tuple[int, ...], tuple[float, dict[int, tuple[float, np.ndarray]]]] = {}
        chosen: tuple[float, tuple[int, ...], dict[int, tuple[float, np.ndarray]]] | None = None
        while heap:
            _, it = heapq.heappop(heap)
            if it in fresh:
                chosen = (fresh[it][0], it, fresh[it][1])
                break
            val, new = drop_cost(list(it))
            estimate[it] = val
            fresh[it] = (val, new)
            heapq.heappush(heap, (val, it))
        if chosen is None or not np.isfinite(chosen[0]):
            break
        if chosen[0] >= -EPS and not must_drop():
            break
        for ui, (cost, mat) in chosen[2].items():
            paths[ui], costs[ui] = mat, cost
        # while far above the cap, also apply other drops evaluated this round that cannot interfere:
        # disjoint stacks re-routed, and no re-routed path uses a type dropped by another
        dropped = set(chosen[1])
        changed = set(chosen[2])
        path_types = {int(t) for _, mat in chosen[2].values() for t in problem.cand_type[mat.ravel()]}
        excess = (len(users) - cap_t) if cap_t is not None else 0
        while heap and len(dropped) < excess // 2:
            _, it = heapq.heappop(heap)
            if it not in fresh or not np.isfinite(fresh[it][0]):
                break
            new = fresh[it][1]
            new_types = {int(t) for _, mat in new.values() for t in problem.cand_type[mat.ravel()]}
            if changed & set(new) or set(it) & path_types or new_types & dropped:
                continue
            for ui, (cost, mat) in new.items():
                paths[ui], costs[ui] = mat, cost
            dropped |= set(it)
            changed |= set(new)
            path_types |= new_types
        users = used_types()
        allowed[:] = False
        allowed[list(users)] = True
    if must_drop():
        return None
    return _heuristic_schedule(problem, prep, paths, "greedy type reduction", t0)


def cellwise_lower_bound(problem: ScheduleProblem) -> LowerBound:
    """The lightest feasible candidate per cell: no continuity, unlimited types (pinned cells keep their type).

    Every schedule weighs at least ``value`` (prices of types and sections not included).
    """
    prep = Prepared(problem)
    cand = np.full(problem.n_cells, -1, dtype=int)
    total = 0.0
    for c in range(problem.n_cells):
        ks = prep.cell_cands(c)
        if len(ks) == 0:
            total = np.inf
            continue
        k = ks[np.argmin(prep.weight[ks])]
        cand[c] = k
        total += float(prep.weight[k])
    return LowerBound(value=total, cand=cand)


def _level_rank(problem: ScheduleProblem, chains: list[np.ndarray]) -> dict[str, int]:
    """Rank of every level name from the bottom of the building (levels ordered by the stacks' own order)."""
    g = nx.DiGraph()
    for ch in chains:
        names = [problem.cell_names[int(c)][1] for c in ch]
        g.add_nodes_from(names)
        g.add_edges_from(zip(names[:-1], names[1:], strict=False))
    order = list(nx.topological_sort(g)) if nx.is_directed_acyclic_graph(g) else sorted(g.nodes)
    return {name: i for i, name in enumerate(order)}


def baseline(problem: ScheduleProblem, band: int = 4, n_groups: int = 3) -> Schedule | None:  # noqa: PLR0912, PLR0915 - the rule-of-thumb schedule, band by band
    """The rule-of-thumb schedule: stacks grouped by load, one type per group per band of storeys.

    Stacks are ranked by the demand at their foot (the weight of the lightest
    candidate of the bottom cell) and split into ``n_groups`` groups of nearly
    equal size. Storeys are banded by level from the bottom of the building, up
    to ``band`` storeys a band; a band ends early where no single type suits all
    its cells (e.g. at a change of concrete grade), as a designer would split it.
    Each group and band takes one type (orientation 0) that is a candidate in
    every cell of the band, so it passes the band's worst cell; going up, the
    bands keep the continuity rules, and a section changes only after a band of
    at least the minimum run. Among such band schedules the lightest is taken
    (a shortest path over the bands: the best a designer could do with bands,
    not a greedy pick that may get stuck). Caps, prices and groups of the rules
    are not considered.

    Returns:
        The schedule (status "baseline"), or None when no band schedule keeps the rules.
    """
    t0 = time.perf_counter()
    prep = Prepared(problem)
    chains = prep.chains
    rank = _level_rank(problem, chains)
    foot = np.array([min((prep.weight[k] for k in prep.cell_cands(int(ch[0]), 0)), default=np.inf) for ch in chains])
    order = np.argsort(foot, kind="stable")
    groups = [g for g in np.array_split(order, max(1, min(n_groups, len(chains)))) if len(g)]
    cand = np.full(problem.n_cells, -1, dtype=int)
    n_t = len(problem.types)
    m_run = run_states(problem)
    sec = problem.types.section
    for g in groups:
        at_rank: dict[int, list[int]] = {}
        for s in g:
            for c in chains[s]:
                at_rank.setdefault(rank[problem.cell_names[int(c)][1]], []).append(int(c))
        ranks = sorted(at_rank)
        # bands: grow up to `band` storeys while some type suits every cell
        bands: list[tuple[list[int], np.ndarray, np.ndarray]] = []  # cells, feasible types, total weight per type
        i = 0
        while i < len(ranks):
            feasible = np.ones(n_t, dtype=bool)
            total = np.zeros(n_t)
            cells: list[int] = []
            size = 0
            while i + size < len(ranks) and size < band:
                trial = feasible.copy()
                add = np.zeros(n_t)
                for c in at_rank[ranks[i + size]]:
                    ks = prep.cell_cands(c, 0)
                    here = np.zeros(n_t, dtype=bool)
                    here[problem.cand_type[ks]] = True
                    trial &= here
                    add[problem.cand_type[ks]] += prep.weight[ks]
                if not trial.any():
                    break
                feasible, total = trial, total + add
                cells += at_rank[ranks[i + size]]
                size += 1
            if size == 0:
                return None
            bands.append((cells, feasible, total))
            i += size
        # lightest band schedule: shortest path over the bands
        types = [np.flatnonzero(f) for _, f, _ in bands]
        cost = bands[0][2][types[0]]
        back: list[np.ndarray] = []
        for b in range(1, len(bands)):
            ok, _ = transition(problem, types[b - 1], types[b])
            short = len({rank[problem.cell_names[c][1]] for c in bands[b - 1][0]}) < m_run
            if short:
                ok &= sec[types[b - 1]][:, None] == sec[types[b]][None, :]
            mat = np.where(ok, cost[:, None], np.inf)
            j = np.argmin(mat, axis=0)
            cost = mat[j, np.arange(len(types[b]))] + bands[b][2][types[b]]
            back.append(j)
        if not np.isfinite(cost).any():
            return None
        j = int(np.argmin(cost))
        chosen = [0] * len(bands)
        for b in range(len(bands) - 1, -1, -1):
            chosen[b] = int(types[b][j])
            if b > 0:
                j = int(back[b - 1][j])
        for (cells, _, _), t in zip(bands, chosen, strict=True):
            for c in cells:
                ks = prep.cell_cands(c, 0)
                cand[c] = int(ks[problem.cand_type[ks] == t][0])
    fig = figures(problem, cand)
    return Schedule(
        cand=cand,
        status=Status.BASELINE,
        objective=fig.objective,
        bound=-np.inf,
        gap=np.inf,
        solver="rule of thumb",
        seconds=time.perf_counter() - t0,
    )


def figures(problem: ScheduleProblem, cand: np.ndarray) -> Figures:
    """Steel (with starter bars), cost, carbon and counts of a schedule given as one candidate per cell."""
    cand = np.asarray(cand, dtype=int)
    t = problem.cand_type[cand]
    starter = 0.0
    if StepRule(problem.rules.step_rule) is StepRule.STARTERS:
        for c in range(problem.n_cells):
            a = int(problem.above[c])
            if a < 0:
                continue
            _, big = transition(problem, np.array([t[c]]), np.array([t[a]]))
            if big[0, 0]:
                starter += float(starter_kg(problem, a, np.array([t[a]]))[0])
    steel = float(problem.steel_kg[cand].sum()) + starter
    cost = float(problem.cost[cand].sum())
    carbon = float(problem.carbon[cand].sum())
    n_types = len(set(t.tolist()))
    n_sections = len(set(problem.types.section[t].tolist()))
    r = problem.rules
    base = {Objective.STEEL: steel, Objective.COST: cost, Objective.CARBON: carbon}[Objective(problem.objective)]
    obj = base + r.price_per_type * n_types + r.price_per_section * n_sections
    return Figures(
        steel_kg=steel,
        starter_kg=starter,
        cost=cost,
        carbon=carbon,
        n_types=n_types,
        n_sections=n_sections,
        objective=obj,
    )


def figure_notes(fig: Figures) -> tuple[str, ...]:
    """The figures of a schedule as a note: steel (with starter bars), cost, carbon, types and sections."""
    return (
        f"steel {fig.steel_kg:.1f} kg (starter bars {fig.starter_kg:.1f} kg), cost {fig.cost:.1f}, "
        f"carbon {fig.carbon:.1f} kgCO2e, {fig.n_types} types, {fig.n_sections} sections",
    )
