"""Fast schedules without the integer program: per-stack shortest paths, the lower bound and the baseline.

Each stack alone is a shortest path through a layered graph: one layer per
storey (bottom to top), one node per feasible type in that storey (and, when a
section must hold for ``min_run`` storeys, per run length so far), an edge
between two consecutive storeys when the pair of types keeps every continuity
rule, and the weight of the upper node on the edge (plus any starter bars).
:func:`layered_graph` builds that graph with networkx and
:func:`stack_shortest_path` solves it; :func:`stack_dp` is the same dynamic
program on numpy arrays, used where speed matters (the tests hold the two
equal).

On top of that:

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

Notes:
    A stack of ``n`` storeys with ``k`` candidates per storey and minimum run
    ``m`` has ``O(n k m)`` nodes and ``O(n k^2 m)`` edges; the numpy dynamic
    program does the same work in ``n`` dense ``k x k`` steps.
"""

from __future__ import annotations

import heapq
import time
from dataclasses import dataclass, field, replace

import networkx as nx
import numpy as np

from optimizer.schedule.problem import Objective, Schedule, ScheduleProblem, StepRule

__all__ = [
    "Figures",
    "LowerBound",
    "stack_chains",
    "transition",
    "starter_kg",
    "layered_graph",
    "stack_shortest_path",
    "stack_dp",
    "stack_optimum",
    "rationalise",
    "restrict",
    "cellwise_lower_bound",
    "baseline",
    "figures",
]

EPS = 1e-6


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
# candidate tables
# --------------------------------------------------------------------------------------------


@dataclass
class _Level:
    """Candidates of one storey of a unit (a stack or a group of stacks sharing types) in one orientation."""

    types: np.ndarray  # (k,) type index
    cands: np.ndarray  # (k, n_stacks_in_unit) candidate index per stack cell
    weight: np.ndarray  # (k,) summed objective weight
    starter: np.ndarray  # (k,) summed starter objective weight if the step below is large


@dataclass
class _Unit:
    """Stacks scheduled together (one stack, or a group with identical levels)."""

    stacks: tuple[int, ...]
    cells: np.ndarray  # (n_levels, n_stacks) cells, bottom to top
    orients: dict[int, list[_Level]] = field(default_factory=dict)


class _Prepared:
    """Candidate tables of a problem, sorted for quick look-up, and its scheduling units."""

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
        idx = self.order[self.start[c]:self.start[c + 1]]
        if orient is not None:
            idx = idx[self.problem.cand_orient[idx] == orient]
        if c in self.pinned:
            idx = idx[self.problem.cand_type[idx] == self.pinned[c]]
        return idx

    def _units(self) -> tuple[list[_Unit], list[str]]:
        p = self.problem
        index = {name: i for i, name in enumerate(p.stack_names)}
        in_group: set[int] = set()
        units: list[_Unit] = []
        problems: list[str] = []
        for group in p.rules.groups:
            members = [index[g] for g in group if g in index]
            if len(members) < 2:
                continue
            problems += group_problems(p, self.chains, [group])
            in_group.update(members)
            cells = np.stack([self.chains[s] for s in members], axis=1) if not problems else None
            if cells is not None:
                units.append(_Unit(tuple(members), cells))
        for s in range(len(p.stack_names)):
            if s not in in_group:
                units.append(_Unit((s,), self.chains[s][:, None]))
        r = p.rules
        starters_count = StepRule(r.step_rule) is StepRule.STARTERS and Objective(p.objective) is Objective.STEEL
        for u in units:
            free = any(bool(p.stack_free[s]) for s in u.stacks)
            for o in (0, 1) if free else (0,):
                levels_o: list[_Level] = []
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
                    levels_o.append(_Level(types_l, cand_mat, w, st))
                u.orients[o] = levels_o
        return units, problems


# --------------------------------------------------------------------------------------------
# one stack: networkx layered graph and numpy dynamic program
# --------------------------------------------------------------------------------------------


def group_problems(problem: ScheduleProblem, chains: list[np.ndarray],
                   groups: tuple[tuple[str, ...], ...] | list[tuple[str, ...]] | None = None) -> list[str]:
    """Groups of stacks the shortest paths cannot treat as one unit (stacks with different storeys), in words."""
    index = {name: i for i, name in enumerate(problem.stack_names)}
    out = []
    for group in problem.rules.groups if groups is None else groups:
        members = [index[g] for g in group if g in index]
        levels = [tuple(problem.cell_names[c][1] for c in chains[s]) for s in members]
        if len(members) >= 2 and any(lv != levels[0] for lv in levels):
            out.append(f"group {', '.join(group)}: stacks with different storeys are not handled by the heuristic")
    return out


def _run_states(problem: ScheduleProblem) -> int:
    r = problem.rules
    if StepRule(r.step_rule) is StepRule.FORBID_ANY:
        return 1
    return max(1, int(r.min_run))


def layered_graph(problem: ScheduleProblem, stack: int, orient: int = 0,
                  allowed_types: np.ndarray | None = None) -> nx.DiGraph:
    """The layered graph of one stack in one orientation.

    Nodes are ``"source"``, ``"sink"`` and ``(level, cand, run)``: candidate
    ``cand`` at position ``level`` (0 = bottom) with the current section held for
    ``run`` storeys (capped at ``min_run``). The weight of an edge is the objective
    weight of its head candidate plus any starter bars.

    Args:
        problem: the problem.
        stack: stack index.
        orient: the stack's orientation (0 or 1).
        allowed_types: boolean mask over types to restrict to, or None for all.

    Returns:
        The directed acyclic graph; a path from source to sink is a buildable schedule of the stack.
    """
    prep = _Prepared(problem)
    chain = prep.chains[stack]
    m = _run_states(problem)
    w = prep.weight
    t = problem.types
    starters_count = (StepRule(problem.rules.step_rule) is StepRule.STARTERS
                      and Objective(problem.objective) is Objective.STEEL)
    g = nx.DiGraph()
    g.add_node("source")
    g.add_node("sink")
    prev: list[int] = []
    for i, c in enumerate(chain):
        cands = prep.cell_cands(int(c), orient)
        if allowed_types is not None:
            cands = cands[allowed_types[problem.cand_type[cands]]]
        if i == 0:
            for k in cands:
                g.add_edge("source", (0, int(k), 1), weight=float(w[k]))
        else:
            lo_t = problem.cand_type[np.array(prev, dtype=int)] if prev else np.zeros(0, dtype=int)
            ok, big = transition(problem, lo_t, problem.cand_type[cands])
            st = starter_kg(problem, int(c), problem.cand_type[cands]) if starters_count else np.zeros(len(cands))
            for a, ka in enumerate(prev):
                for bidx, kb in enumerate(cands):
                    if not ok[a, bidx]:
                        continue
                    same = t.section[problem.cand_type[ka]] == t.section[problem.cand_type[kb]]
                    wt = float(w[kb] + (st[bidx] if big[a, bidx] else 0.0))
                    for run in range(1, m + 1):
                        if (i - 1, int(ka), run) not in g:
                            continue
                        if same:
                            g.add_edge((i - 1, int(ka), run), (i, int(kb), min(run + 1, m)), weight=wt)
                        elif run == m:
                            g.add_edge((i - 1, int(ka), run), (i, int(kb), 1), weight=wt)
        prev = [int(k) for k in cands]
    last = len(chain) - 1
    for node in list(g.nodes):
        if isinstance(node, tuple) and node[0] == last:
            g.add_edge(node, "sink", weight=0.0)
    return g


def stack_shortest_path(problem: ScheduleProblem, stack: int,
                        allowed_types: np.ndarray | None = None) -> tuple[float, np.ndarray | None]:
    """Best schedule of one stack alone (networkx shortest path over both orientations if free).

    Group, cap and price rules are ignored; pinned cells are kept.

    Returns:
        The cost and the candidate per storey (bottom to top), or ``(inf, None)`` when the stack is impossible.
    """
    best: tuple[float, np.ndarray | None] = (np.inf, None)
    for o in (0, 1) if problem.stack_free[stack] else (0,):
        g = layered_graph(problem, stack, o, allowed_types)
        try:
            cost, path = nx.single_source_dijkstra(g, "source", "sink", weight="weight")
        except nx.NetworkXNoPath:
            continue
        if cost < best[0]:
            best = (float(cost), np.array([node[1] for node in path[1:-1]], dtype=int))
    return best


def _levels_dp(problem: ScheduleProblem, levels: list[_Level], m: int,
               allowed: np.ndarray | None = None) -> tuple[float, np.ndarray | None]:
    """Dynamic program over the layers of one unit; returns the cost and the chosen row per level."""
    sec = problem.types.section
    rows = []
    for lv in levels:
        r = np.arange(len(lv.types))
        if allowed is not None:
            r = r[allowed[lv.types]]
        rows.append(r)
    if any(len(r) == 0 for r in rows):
        return np.inf, None
    lv0 = levels[0]
    f = np.full((m, len(rows[0])), np.inf)
    f[0] = lv0.weight[rows[0]]
    back: list[tuple[np.ndarray, np.ndarray]] = []
    for i in range(1, len(levels)):
        lo, up = levels[i - 1], levels[i]
        tl, tu = lo.types[rows[i - 1]], up.types[rows[i]]
        ok, big = transition(problem, tl, tu)
        extra = np.where(big, up.starter[rows[i]][None, :], 0.0)
        wu = up.weight[rows[i]]
        nu = len(tu)
        nf = np.full((m, nu), np.inf)
        bj = np.full((m, nu), -1, dtype=int)
        br = np.full((m, nu), -1, dtype=int)
        if m == 1:
            mat = np.where(ok, f[0][:, None] + extra, np.inf)
            j = np.argmin(mat, axis=0)
            nf[0] = mat[j, np.arange(nu)] + wu
            bj[0], br[0] = j, 0
        else:
            same = sec[tl][:, None] == sec[tu][None, :]
            cands = [(0, m - 1, ok & ~same)] + [(min(r + 1, m - 1), r, ok & same) for r in range(m)]
            for r_new, r_old, mask in cands:
                mat = np.where(mask, f[r_old][:, None] + extra, np.inf)
                j = np.argmin(mat, axis=0)
                val = mat[j, np.arange(nu)] + wu
                better = val < nf[r_new]
                nf[r_new] = np.where(better, val, nf[r_new])
                bj[r_new] = np.where(better, j, bj[r_new])
                br[r_new] = np.where(better, r_old, br[r_new])
        back.append((bj, br))
        f = nf
    r_end, j_end = np.unravel_index(np.argmin(f), f.shape)
    cost = float(f[r_end, j_end])
    if not np.isfinite(cost):
        return np.inf, None
    path = [int(j_end)]
    r = int(r_end)
    for bj, br in reversed(back):
        j = path[-1]
        j_prev, r_prev = int(bj[r, j]), int(br[r, j])
        path.append(j_prev)
        r = r_prev
    path.reverse()
    return cost, np.array([rows[i][k] for i, k in enumerate(path)], dtype=int)


def stack_dp(problem: ScheduleProblem, stack: int,
             allowed_types: np.ndarray | None = None) -> tuple[float, np.ndarray | None]:
    """Best schedule of one stack alone by the numpy dynamic program (same answer as :func:`stack_shortest_path`).

    Returns:
        The cost and the candidate per storey (bottom to top), or ``(inf, None)`` when the stack is impossible.
    """
    prep = _Prepared(replace(problem, rules=replace(problem.rules, groups=())))
    unit = next(u for u in prep.units if u.stacks == (stack,))
    return _unit_dp(prep, unit, allowed_types)


def _unit_dp(prep: _Prepared, unit: _Unit, allowed: np.ndarray | None) -> tuple[float, np.ndarray | None]:
    """Best orientation and path of a unit; the path is the candidate per level of the unit's first stack."""
    cost, mat = _unit_paths(prep, unit, allowed)
    return cost, (mat[:, 0].astype(int) if mat is not None else None)


def _unit_paths(prep: _Prepared, unit: _Unit, allowed: np.ndarray | None) -> tuple[float, np.ndarray | None]:
    """Best orientation and path of a unit: the candidates of every cell of the unit (n_levels x n_stacks)."""
    m = _run_states(prep.problem)
    best: tuple[float, np.ndarray | None] = (np.inf, None)
    for levels in unit.orients.values():
        cost, rows = _levels_dp(prep.problem, levels, m, allowed)
        if rows is not None and cost < best[0]:
            best = (cost, np.stack([levels[i].cands[k] for i, k in enumerate(rows)], axis=0))
    return best


# --------------------------------------------------------------------------------------------
# whole building
# --------------------------------------------------------------------------------------------


def _assemble(problem: ScheduleProblem, prep: _Prepared, paths: dict[int, np.ndarray]) -> np.ndarray:
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
    prep = _Prepared(problem)
    if prep.problems:
        return None
    paths: dict[int, np.ndarray] = {}
    for ui, unit in enumerate(prep.units):
        cost, mat = _unit_paths(prep, unit, allowed_types)
        if mat is None:
            return None
        paths[ui] = mat
    cand = _assemble(problem, prep, paths)
    fig = figures(problem, cand)
    return Schedule(cand=cand, status="heuristic", objective=fig.objective, bound=-np.inf, gap=np.inf,
                    solver="stack shortest paths", seconds=time.perf_counter() - t0)


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
    sub = replace(problem, cand_cell=problem.cand_cell[idx], cand_type=problem.cand_type[idx],
                  cand_orient=problem.cand_orient[idx], steel_kg=problem.steel_kg[idx], cost=problem.cost[idx],
                  carbon=problem.carbon[idx], utilisation=problem.utilisation[idx])
    return sub, idx


def rationalise(problem: ScheduleProblem, max_types: int | None = None, max_sections: int | None = None,
                time_limit_s: float = 60.0, per_cell: int | None = None) -> Schedule | None:
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
    prep = _Prepared(problem)
    if prep.problems:
        return None
    n_t = len(problem.types)
    allowed = np.ones(n_t, dtype=bool)
    paths: dict[int, np.ndarray] = {}
    costs: dict[int, float] = {}
    for ui, unit in enumerate(prep.units):
        cost, mat = _unit_paths(prep, unit, None)
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
            cost, mat = _unit_paths(prep, prep.units[ui], trial)
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
    cand = _assemble(problem, prep, paths)
    fig = figures(problem, cand)
    return Schedule(cand=cand, status="heuristic", objective=fig.objective, bound=-np.inf, gap=np.inf,
                    solver="greedy type reduction", seconds=time.perf_counter() - t0)


def cellwise_lower_bound(problem: ScheduleProblem) -> LowerBound:
    """The lightest feasible candidate per cell: no continuity, unlimited types (pinned cells keep their type).

    Every schedule weighs at least ``value`` (prices of types and sections not included).
    """
    prep = _Prepared(problem)
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


def baseline(problem: ScheduleProblem, band: int = 4, n_groups: int = 3) -> Schedule | None:
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
    prep = _Prepared(problem)
    chains = prep.chains
    rank = _level_rank(problem, chains)
    foot = np.array([
        min((prep.weight[k] for k in prep.cell_cands(int(ch[0]), 0)), default=np.inf) for ch in chains])
    order = np.argsort(foot, kind="stable")
    groups = [g for g in np.array_split(order, max(1, min(n_groups, len(chains)))) if len(g)]
    cand = np.full(problem.n_cells, -1, dtype=int)
    n_t = len(problem.types)
    m_run = _run_states(problem)
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
    return Schedule(cand=cand, status="baseline", objective=fig.objective, bound=-np.inf, gap=np.inf,
                    solver="rule of thumb", seconds=time.perf_counter() - t0)


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
    return Figures(steel_kg=steel, starter_kg=starter, cost=cost, carbon=carbon, n_types=n_types,
                   n_sections=n_sections, objective=obj)
