"""A hand takedown of a small invented building, written out, against the tool.

Building: 3 storeys of 3.5 m, 200 mm flat slab, concrete 25 kN/m3 (EN 1991-1-1,
Table A.1: reinforced concrete 25 kN/m3), columns 300 x 300 mm at
x = 0, 6, 12 m and y = 0, 5 m, slab edge on the column lines, SDL 1.5 kPa,
offices (category B) 2.5 kPa, façade 5 kN/m.
"""

import pytest

from optimizer.building.graph import build_stack_graph, cell_above, cell_below
from optimizer.building.model import CellId
from optimizer.building.scenario import load_scenario_text
from optimizer.building.takedown import takedown

HAND = """
[project]
name = "Hand-check frame (invented)"

[parameters]
set = "EN"

[materials]
concrete = "C30/37"
reinforcement_fyk_MPa = 500
ductility = "B"
aggregate_mm = 20
concrete_density_kN_m3 = 25.0

[[levels]]
name = "L1"
height_m = 3.5
slab_depth_mm = 200
[[levels]]
name = "L2"
height_m = 3.5
slab_depth_mm = 200
[[levels]]
name = "L3"
height_m = 3.5
slab_depth_mm = 200

[[stacks]]
id = "A1"
x_m = 0
y_m = 0
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "B1"
x_m = 6
y_m = 0
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "C1"
x_m = 12
y_m = 0
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "A2"
x_m = 0
y_m = 5
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "B2"
x_m = 6
y_m = 5
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "C2"
x_m = 12
y_m = 5
from_level = "L1"
to_level = "L3"
stands_on = "foundation"

[[floors]]
levels = ["L1", "L3"]
outline_m = [[0, 0], [12, 0], [12, 5], [0, 5]]
sdl_kPa = 1.5
imposed_kPa = 2.5
category = "B"
facade_kN_m = 5.0

[[settings]]
exposure = "XC1"
fire = "R60"
braced = true
l0_factor = 1.0
trial_size_mm = [300, 300]

[takedown]
combination = "COMBINATION"
imposed_reduction = "REDUCTION"
"""


def _scenario(combination="6.10", reduction="alpha_n"):
    text = HAND.replace("COMBINATION", combination).replace("REDUCTION", reduction)
    return load_scenario_text(text, source="hand.toml")


def _row(df, stack, level):
    sub = df[(df["stack"] == stack) & (df["level"] == level)]
    assert len(sub) == 1
    return sub.iloc[0]


# Hand values common to the checks below.
G_KPA = 0.200 * 25.0 + 1.5  # slab 5.0 + SDL 1.5 = 6.5 kPa
SELF = 0.3 * 0.3 * (3.5 - 0.2) * 25.0  # 0.09 m2 x 3.3 m x 25 = 7.425 kN per storey
# B1 (6, 0): tributary 6.0 x 2.5 = 15 m2, façade 6.0 m on y = 0.
G_FLOOR_B1 = 15.0 * G_KPA + 6.0 * 5.0  # 97.5 + 30 = 127.5 kN
Q_FLOOR_B1 = 15.0 * 2.5  # 37.5 kN
# A1 (0, 0): tributary 3.0 x 2.5 = 7.5 m2, façade 3.0 + 2.5 = 5.5 m.
G_FLOOR_A1 = 7.5 * G_KPA + 5.5 * 5.0  # 48.75 + 27.5 = 76.25 kN
Q_FLOOR_A1 = 7.5 * 2.5  # 18.75 kN


def test_axial_forces_eq_6_10_with_alpha_n():
    r = takedown(_scenario("6.10", "alpha_n"))
    # B1 at L1 (bottom): Gk = 3 x (127.5 + 7.425) = 404.775 kN; Qk = 3 x 37.5 = 112.5 kN,
    # alpha_n (n = 3, psi0 = 0.7) = (2 + 0.7) / 3 = 0.9 (EN 1991-1-1, Eq. (6.2)) -> 101.25 kN.
    # NEd = 1.35 x 404.775 + 1.5 x 101.25 = 546.44625 + 151.875 = 698.32125 kN (EN 1990, 6.10).
    assert 3 * (G_FLOOR_B1 + SELF) == pytest.approx(404.775)
    assert _row(r.actions, "B1", "L1")["NEd_kN"] == pytest.approx(698.32125)
    # B1 at L2: Gk = 269.85, Qk = 75 (n = 2: no reduction) -> 364.2975 + 112.5 = 476.7975 kN.
    assert _row(r.actions, "B1", "L2")["NEd_kN"] == pytest.approx(476.7975)
    # B1 at L3: Gk = 134.925, Qk = 37.5 -> 182.14875 + 56.25 = 238.39875 kN.
    assert _row(r.actions, "B1", "L3")["NEd_kN"] == pytest.approx(238.39875)
    # A1 at L1: Gk = 3 x (76.25 + 7.425) = 251.025; Qk = 56.25 x 0.9 = 50.625;
    # NEd = 338.88375 + 75.9375 = 414.82125 kN.
    assert _row(r.actions, "A1", "L1")["NEd_kN"] == pytest.approx(414.82125)
    d = _row(r.detail, "A1", "L1")
    assert d["tributary_m2"] == pytest.approx(7.5)
    assert d["facade_m"] == pytest.approx(5.5)
    assert d["Gk_kN"] == pytest.approx(251.025)
    assert d["Qk_reduced_kN"] == pytest.approx(50.625)
    assert "n=3" in d["reduction"]


def test_axial_forces_6_10a_b_and_no_reduction():
    r = takedown(_scenario("6.10a+6.10b", "alpha_n"))
    # B1 at L1: 6.10a = 1.35 x 404.775 + 1.5 x 0.7 x 112.5 = 546.44625 + 118.125 = 664.57125
    # (psi0 only, EN 1991-1-1, 3.3.1(2)P); 6.10b = 0.85 x 1.35 x 404.775 + 1.5 x 101.25
    # = 464.4793 + 151.875 = 616.3543 -> 6.10a governs.
    row = _row(r.detail, "B1", "L1")
    assert row["expression"] == "6.10a"
    assert row["NEd_kN"] == pytest.approx(664.57125)
    r0 = takedown(_scenario("6.10", "none"))
    # Without reduction: 546.44625 + 1.5 x 112.5 = 715.19625 kN.
    assert _row(r0.actions, "B1", "L1")["NEd_kN"] == pytest.approx(715.19625)


def test_alpha_A_per_floor():
    r = takedown(_scenario("6.10", "alpha_A"))
    # B1: A = 15 m2 per floor: alpha_A = 5/7 x 0.7 + 10/15 = 1.1667 -> 1.0 (EN 1991-1-1, Eq. (6.1)).
    assert _row(r.actions, "B1", "L1")["NEd_kN"] == pytest.approx(715.19625)


def test_reactions_balance_total_load():
    r = takedown(_scenario())
    # Per floor by hand: 60 m2 x 6.5 kPa = 390 kN + façade 2 x (12 + 5) = 34 m x 5 = 170 kN,
    # columns 6 x 7.425 = 44.55 kN -> 604.55 kN; three floors 1813.65 kN.
    fnd = r.reactions[r.reactions["kind"] == "foundation"]
    assert fnd["Gk_kN"].sum() == pytest.approx(1813.65)
    assert fnd["Qk_kN"].sum() == pytest.approx(3 * 60 * 2.5)  # 450 kN
    assert r.level_totals["floor_area_m2"].tolist() == pytest.approx([60.0] * 3)


def test_sub_frame_end_moments_by_hand():
    r = takedown(_scenario("6.10", "alpha_n"))
    # Stiffnesses K = I / L (E cancels):
    k_col = (0.3**4 / 12) / 3.5  # 6.75e-4 / 3.5 = 1.92857e-4 m3
    # --- B1 (6, 0), spans along X: 6 m each side; frame width = 15 / 6 = 2.5 m.
    w_full = (1.35 * 6.5 + 1.5 * 2.5) * 2.5  # 31.3125 kN/m
    w_dead = 1.35 * 6.5 * 2.5  # 21.9375 kN/m (EN 1992-1-1, 5.1.3(1)P pattern)
    m_ub = (w_full - w_dead) * 6.0**2 / 12  # = 28.125 kNm
    k_slab = (2.5 * 0.2**3 / 12) / 6.0  # 2.7778e-4 m3 per span
    m_l1 = m_ub * k_col / (2 * k_col + 0.5 * 2 * k_slab)  # = 8.1751 kNm
    m_l3 = m_ub * k_col / (k_col + 0.5 * 2 * k_slab)  # roof, no column above: 11.5251 kNm
    assert m_ub == pytest.approx(28.125)
    assert m_l1 == pytest.approx(8.1751, abs=1e-4)
    # Local y along plan X (default), slab along X bends about local z -> Mz.
    b1 = _row(r.actions, "B1", "L1")
    assert b1["Mz_top_kNm"] == pytest.approx(m_l1)
    assert b1["Mz_bot_kNm"] == pytest.approx(0.0)  # foundation: no sub-frame moment at the base
    assert _row(r.actions, "B1", "L2")["Mz_bot_kNm"] == pytest.approx(m_l1)
    assert _row(r.actions, "B1", "L3")["Mz_top_kNm"] == pytest.approx(m_l3)
    assert m_l3 == pytest.approx(11.5251, abs=1e-4)
    # --- B1 along Y: edge column, one span of 5 m to B2; frame width = 15 / 2.5 = 6 m.
    w_full_y = (1.35 * 6.5 + 1.5 * 2.5) * 6.0  # 75.15 kN/m
    m_edge = w_full_y * 5.0**2 / 12  # whole edge-span moment 156.5625 kNm
    k_slab_y = (6.0 * 0.2**3 / 12) / 5.0  # 8.0e-4 m3
    m_y = m_edge * k_col / (2 * k_col + 0.5 * k_slab_y)  # = 38.4290 kNm
    assert m_y == pytest.approx(38.4290, abs=1e-4)
    assert b1["My_top_kNm"] == pytest.approx(m_y)


def test_trial_sizes_change_self_weight_only_through_area():
    s = _scenario("6.10", "none")
    base = takedown(s)
    bigger = {CellId(c.stack, c.level): (400.0, 400.0) for c in s.cells}
    r = takedown(s, trial_sizes_mm=bigger)
    # Extra self-weight per storey: (0.16 - 0.09) x 3.3 x 25 = 5.775 kN; three storeys at L1,
    # design x 1.35: 3 x 5.775 x 1.35 = 23.38875 kN.
    diff = _row(r.actions, "B1", "L1")["NEd_kN"] - _row(base.actions, "B1", "L1")["NEd_kN"]
    assert diff == pytest.approx(23.38875)


def test_graph_relations_of_hand_building():
    s = _scenario()
    g = build_stack_graph(s)
    assert cell_above(g, CellId("B1", "L1")) == CellId("B1", "L2")
    assert cell_below(g, CellId("B1", "L1")) is None
    assert cell_above(g, CellId("B1", "L3")) is None
    assert g.number_of_nodes() == 18 and g.number_of_edges() == 12
