"""The stack graph: cells, carrying edges with shares, order, above/below, cycles."""

import networkx as nx
import pytest

from optimizer.building.graph import (
    build_stack_graph,
    carried_cells,
    cell_above,
    cell_below,
    check_acyclic,
    load_order,
    supports_of,
)
from optimizer.building.model import CellId
from optimizer.building.scenario import load_scenario
from optimizer.errors import InputError
from tests.support import paths

ROOT = paths.ROOT


@pytest.fixture(scope="module")
def demo():
    return load_scenario(ROOT / "scenarios/demo_tower.toml")


def test_demo_graph_shape(demo):
    g = build_stack_graph(demo)
    assert g.number_of_nodes() == len(demo.cells)
    assert nx.is_directed_acyclic_graph(g)
    # Attributes: index, stack, level.
    node = g.nodes[CellId("B2", "L05")]
    assert node["stack"] == "B2" and node["level"] == "L05"
    assert demo.cells[node["index"]].id == CellId("B2", "L05")


def test_transfer_edges_carry_shares(demo):
    g = build_stack_graph(demo)
    # A3 (x = 16) starts at L04 on transfer beams at L03 over PA1 (x = 12) and PA2 (x = 28):
    # lever rule 12/16 = 0.75 and 4/16 = 0.25 (as written in the scenario).
    sup = dict(supports_of(g, CellId("A3", "L04")))
    assert sup == pytest.approx({CellId("PA1", "L03"): 0.75, CellId("PA2", "L03"): 0.25})
    carried = dict(carried_cells(g, CellId("PA1", "L03")))
    assert carried[CellId("A2", "L04")] == pytest.approx(0.666667)
    assert carried[CellId("A3", "L04")] == pytest.approx(0.75)
    assert carried[CellId("A4", "L04")] == pytest.approx(0.25)
    # Transfer supports are not the continuity "cell below".
    assert cell_below(g, CellId("A3", "L04")) is None
    assert cell_above(g, CellId("PA1", "L03")) is None


def test_above_below(demo):
    g = build_stack_graph(demo)
    assert cell_above(g, CellId("B2", "L05")) == CellId("B2", "L06")
    assert cell_below(g, CellId("B2", "L05")) == CellId("B2", "L04")
    assert cell_above(g, CellId("B2", "L30")) is None
    assert cell_below(g, CellId("B2", "L01")) is None


def test_load_order_visits_carried_cells_first(demo):
    g = build_stack_graph(demo)
    order = list(load_order(g))
    pos = {c: i for i, c in enumerate(order)}
    assert len(order) == len(demo.cells)
    for u, v in g.edges:
        assert pos[u] < pos[v]


def test_cycle_check_names_the_cycle():
    g = nx.DiGraph()
    g.add_edge(CellId("A", "L2"), CellId("B", "L2"))
    g.add_edge(CellId("B", "L2"), CellId("A", "L2"))
    with pytest.raises(InputError) as info:
        check_acyclic(g, "graph.toml")
    assert info.value.value == "(A, L2) -> (B, L2) -> (A, L2)"
