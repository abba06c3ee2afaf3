"""Each stack alone: a shortest path through a layered graph.

One layer per storey (bottom to top), one node per feasible type in that storey
(and, when a section must hold for ``min_run`` storeys, per run length so far),
an edge between two consecutive storeys when the pair of types keeps every
continuity rule (:func:`optimizer.schedule.prepared.transition`), and the weight
of the upper node on the edge (plus any starter bars).

* :func:`layered_graph` builds that graph with networkx and
  :func:`stack_shortest_path` solves it;
* :func:`levels_dp` is the same dynamic program on numpy arrays over the levels
  of a scheduling unit (the reference the tests hold the compiled pricing of
  :mod:`optimizer.schedule.stackdp` to); :func:`stack_dp` applies it to one
  stack and :func:`unit_paths` to a unit in its best orientation.

Notes:
    A stack of ``n`` storeys with ``k`` candidates per storey and minimum run
    ``m`` has ``O(n k m)`` nodes and ``O(n k^2 m)`` edges; the numpy dynamic
    program does the same work in ``n`` dense ``k x k`` steps.
"""

from __future__ import annotations

from dataclasses import replace

import networkx as nx
import numpy as np

from optimizer.schedule.prepared import Level, Prepared, Unit, run_states, starter_kg, transition
from optimizer.schedule.problem import Objective, ScheduleProblem, StepRule

__all__ = ["layered_graph", "stack_shortest_path", "levels_dp", "stack_dp", "unit_paths"]


def layered_graph(  # noqa: PLR0912 - one branch per continuity rule
    problem: ScheduleProblem, stack: int, orient: int = 0, allowed_types: np.ndarray | None = None
) -> nx.DiGraph:
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
    prep = Prepared(problem)
    chain = prep.chains[stack]
    m = run_states(problem)
    w = prep.weight
    t = problem.types
    starters_count = (
        StepRule(problem.rules.step_rule) is StepRule.STARTERS and Objective(problem.objective) is Objective.STEEL
    )
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


def stack_shortest_path(
    problem: ScheduleProblem, stack: int, allowed_types: np.ndarray | None = None
) -> tuple[float, np.ndarray | None]:
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


def levels_dp(
    problem: ScheduleProblem, levels: list[Level], m: int, allowed: np.ndarray | None = None
) -> tuple[float, np.ndarray | None]:
    """Cheapest path through the levels of one unit in one orientation (the numpy dynamic program).

    Args:
        problem: the problem (its types and rules).
        levels: the unit's candidates storey by storey, bottom to top.
        m: run states of the minimum run (:func:`optimizer.schedule.prepared.run_states`).
        allowed: boolean mask over types to restrict to, or None for all.

    Returns:
        The cost and the chosen row of every level, or ``(inf, None)`` when no path exists.
    """
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


def stack_dp(
    problem: ScheduleProblem, stack: int, allowed_types: np.ndarray | None = None
) -> tuple[float, np.ndarray | None]:
    """Best schedule of one stack alone by the numpy dynamic program (same answer as :func:`stack_shortest_path`).

    Returns:
        The cost and the candidate per storey (bottom to top), or ``(inf, None)`` when the stack is impossible.
    """
    prep = Prepared(replace(problem, rules=replace(problem.rules, groups=())))
    unit = next(u for u in prep.units if u.stacks == (stack,))
    cost, mat = unit_paths(prep, unit, allowed_types)
    return cost, (mat[:, 0].astype(int) if mat is not None else None)


def unit_paths(prep: Prepared, unit: Unit, allowed: np.ndarray | None) -> tuple[float, np.ndarray | None]:
    """Best orientation and path of a unit.

    Args:
        prep: the prepared problem.
        unit: one of its units.
        allowed: boolean mask over types to restrict to, or None for all.

    Returns:
        The cost and the candidates of every cell of the unit (n_levels x n_stacks), or ``(inf, None)``.
    """
    m = run_states(prep.problem)
    best: tuple[float, np.ndarray | None] = (np.inf, None)
    for levels in unit.orients.values():
        cost, rows = levels_dp(prep.problem, levels, m, allowed)
        if rows is not None and cost < best[0]:
            best = (cost, np.stack([levels[i].cands[k] for i, k in enumerate(rows)], axis=0))
    return best
