"""The stack graph: cells (stack, level) and what carries them (networkx).

Nodes are :class:`optimizer.building.scenario.CellId`; node attributes ``index``,
``stack``, ``level``, ``level_index``. An edge runs from each cell to the
cell(s) that carry it, attribute ``share`` (the fraction of the cell's load
delivered). Within a stack each cell points to the cell below with share 1; a
transfer stack's lowest cell points to its supports on the level below. The
lowest cell of a stack on the foundation or on an external transfer has no
out-edge (node attribute ``support``).

Loads accumulate in topological order: every cell is visited after all the
cells it carries.
"""

from __future__ import annotations

from collections.abc import Iterator

import networkx as nx

from optimizer.building.model import CellId, Scenario, SupportKind
from optimizer.errors import InputError

__all__ = [
    "build_stack_graph",
    "cell_above",
    "cell_below",
    "supports_of",
    "carried_cells",
    "load_order",
    "check_acyclic",
]


def build_stack_graph(scenario: Scenario) -> nx.DiGraph:
    """Directed graph of cells, edges from each cell to the cells that carry it."""
    g = nx.DiGraph()
    for c in scenario.cells:
        g.add_node(c.id, index=c.index, stack=c.stack, level=c.level, level_index=c.level_index, support=None)
    for st in scenario.stacks:
        names = scenario.stack_levels(st.id)
        for upper, lower in zip(names[1:], names[:-1], strict=True):
            g.add_edge(CellId(st.id, upper), CellId(st.id, lower), share=1.0, kind="stack")
        bottom = CellId(st.id, names[0])
        g.nodes[bottom]["support"] = st.support
        if st.support is SupportKind.TRANSFER:
            below = scenario.levels[scenario.level(st.from_level).index - 1].name
            for other, share in st.carried_by:
                target = CellId(other, below)
                if not scenario.has_cell(target):
                    raise InputError(
                        scenario.source,
                        f"stacks[{st.index}].stands_on.{other}",
                        other,
                        f"a stack that runs through level {below!r}",
                    )
                g.add_edge(bottom, target, share=share, kind="transfer")
    check_acyclic(g, scenario.source)
    _check_shares(g, scenario)
    return g


def check_acyclic(graph: nx.DiGraph, source: str = "<graph>") -> None:
    """Raise an InputError naming the cycle when the graph has one."""
    if nx.is_directed_acyclic_graph(graph):
        return
    try:
        cycle = nx.find_cycle(graph)
    except nx.NetworkXNoCycle:
        return
    names = " -> ".join([f"({a[0]}, {a[1]})" for a, _ in cycle] + [f"({cycle[0][0][0]}, {cycle[0][0][1]})"])
    raise InputError(source, "stacks.stands_on", names, "cells that do not carry each other in a cycle")


def _check_shares(graph: nx.DiGraph, scenario: Scenario) -> None:
    for node in graph.nodes:
        out = [d["share"] for _, _, d in graph.out_edges(node, data=True)]
        if out and abs(sum(out) - 1.0) > 1e-6:
            st = scenario.stack(node[0])
            raise InputError(scenario.source, f"stacks[{st.index}].stands_on", sum(out), "shares summing to 1")


def cell_above(graph: nx.DiGraph, cell: CellId) -> CellId | None:
    """The cell of the same stack one level up, or None at the top of the stack."""
    for pred in graph.predecessors(cell):
        if pred[0] == cell[0]:
            return pred
    return None


def cell_below(graph: nx.DiGraph, cell: CellId) -> CellId | None:
    """The cell of the same stack one level down, or None at the bottom of the stack."""
    for succ in graph.successors(cell):
        if succ[0] == cell[0]:
            return succ
    return None


def supports_of(graph: nx.DiGraph, cell: CellId) -> list[tuple[CellId, float]]:
    """The cells that carry ``cell`` with their shares (empty on foundation/external)."""
    return [(t, d["share"]) for _, t, d in graph.out_edges(cell, data=True)]


def carried_cells(graph: nx.DiGraph, cell: CellId) -> list[tuple[CellId, float]]:
    """The cells that ``cell`` carries directly, with the share each delivers."""
    return [(s, d["share"]) for s, _, d in graph.in_edges(cell, data=True)]


def load_order(graph: nx.DiGraph) -> Iterator[CellId]:
    """Cells in load-accumulation order: each after every cell it carries.

    Ties are broken top level first, then by cell index, so the order is stable.
    """
    return iter(
        nx.lexicographical_topological_sort(
            graph, key=lambda n: (-graph.nodes[n]["level_index"], graph.nodes[n]["index"])
        )
    )
