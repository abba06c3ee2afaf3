"""Plausibility warnings: each unit slip is flagged by name and value; the bundled scenarios give none."""

from __future__ import annotations

import pytest

from optimizer.building.actions_csv import read_actions_csv
from optimizer.building.plausibility import LIMITS, plausibility_warnings
from optimizer.building.scenario import load_scenario, load_scenario_text
from optimizer.building.takedown import scenario_actions
from tests.support import paths

ROOT = paths.ROOT
SMALL = ROOT / "scenarios" / "small_building.toml"
ANALYSIS = ROOT / "scenarios" / "analysis_actions.toml"
SMALL_TEXT = SMALL.read_text(encoding="utf-8")
ANALYSIS_TEXT = ANALYSIS.read_text(encoding="utf-8")


def _edit(text: str, old: str, new: str) -> str:
    assert old in text, old
    return text.replace(old, new, 1)


@pytest.fixture(scope="module")
def analysis():
    s = load_scenario(ANALYSIS)
    return s, read_actions_csv(s.actions_file, s)


@pytest.mark.parametrize("name", ["small_building", "analysis_actions", "demo_tower"])
def test_bundled_scenarios_give_no_warning(name):
    s = load_scenario(ROOT / "scenarios" / f"{name}.toml")
    actions = scenario_actions(s)
    assert len(actions) == len(s.cells)
    assert plausibility_warnings(s, actions, s.params) == []


def _only(warnings: list[str], *needles: str) -> str:
    assert len(warnings) == 1, warnings
    for n in needles:
        assert n in warnings[0], (n, warnings[0])
    return warnings[0]


# Scenario-level slips on the small building (checked without actions: the scenario alone).
SCENARIO_SLIPS = [
    ("storey in mm", "height_m = 4.5", "height_m = 4500", ("levels[0].height_m", "4500", "mm instead of m")),
    ("storey too low", "height_m = 4.5", "height_m = 1.2", ("levels[0].height_m", "1.2")),
    ("slab in m", "slab_depth_mm = 225", "slab_depth_mm = 0.225", ("levels[0].slab_depth_mm", "0.225", "m instead")),
    ("slab very deep", "slab_depth_mm = 225", "slab_depth_mm = 2000", ("levels[0].slab_depth_mm", "2000")),
    ("sdl in Pa", "sdl_kPa = 1.5", "sdl_kPa = 1500", ("floors[0].sdl_kPa", "1500", "Pa")),
    ("imposed in Pa", "imposed_kPa = 0.6", "imposed_kPa = 600", ("floors[1].imposed_kPa", "600", "Pa")),
    ("facade in N/m", "facade_kN_m = 6.0", "facade_kN_m = 6000", ("floors[0].facade_kN_m", "6000", "N/m")),
    (
        "density in kg/m3",
        "concrete_density_kN_m3 = 25.0",
        "concrete_density_kN_m3 = 2500",
        ("materials.concrete_density_kN_m3", "2500", "kg/m3"),
    ),
    (
        "density in t/m3",
        "concrete_density_kN_m3 = 25.0",
        "concrete_density_kN_m3 = 2.5",
        ("materials.concrete_density_kN_m3", "2.5", "t/m3"),
    ),
    ("aggregate huge", "aggregate_mm = 20", "aggregate_mm = 200", ("materials.aggregate_mm", "200")),
    (
        "trial size in m",
        "trial_size_mm = [350, 350]",
        "trial_size_mm = [0.35, 0.35]",
        ("settings.trial_size_mm", "0.35", "cell A1, L3"),
    ),
    (
        "trial size huge",
        "trial_size_mm = [400, 400]",
        "trial_size_mm = [400, 40000]",
        ("settings.trial_size_mm", "40000", "cell A1, L1"),
    ),
]


@pytest.mark.parametrize(("old", "new", "needles"), [pytest.param(o, n, w, id=i) for i, o, n, w in SCENARIO_SLIPS])
def test_scenario_slip_is_flagged(old, new, needles):
    s = load_scenario_text(_edit(SMALL_TEXT, old, new), source="slip.toml")
    assert plausibility_warnings(load_scenario(SMALL), None) == []
    _only(plausibility_warnings(s, None), "slip.toml", *needles)


def test_coordinates_in_mm_are_flagged():
    text = SMALL_TEXT.replace("x_m = 15.0", "x_m = 15000.0")
    text = text.replace(
        "[[-0.3, -0.3], [15.3, -0.3], [15.3, 6.3], [-0.3, 6.3]]",
        "[[-0.3, -0.3], [15300, -0.3], [15300, 6.3], [-0.3, 6.3]]",
    )
    w = plausibility_warnings(load_scenario_text(text, source="mm.toml"), None)
    assert len(w) == 4, w  # floors[0], floors[1], stacks C1 and C2
    assert sum("stacks[2].x_m = 15000" in x for x in w) == 1
    assert sum("floors[0].outline_m" in x and "15300" in x for x in w) == 1


def test_slab_as_deep_as_storey_is_flagged_when_it_reaches_the_check():
    """The loader rejects it; a scenario built by other code is still checked."""
    s = load_scenario(SMALL)
    lv = s.levels[1]
    object.__setattr__(lv, "slab_depth_mm", 3600.0)
    try:
        w = plausibility_warnings(s, None)
    finally:
        object.__setattr__(lv, "slab_depth_mm", 225.0)
    _only(w, "levels[1].slab_depth_mm = 3600", "as deep as the storey")


# Actions-level slips on the analysis route: one cell edited in the table the CSV reader returns.
def test_force_in_newtons_is_flagged(analysis):
    s, a = analysis
    df = a.copy()
    df.loc[(df["stack"] == "K2") & (df["level"] == "G3"), "NEd_kN"] = 1252.6e3
    _only(
        plausibility_warnings(s, df, s.params),
        str(ANALYSIS.parent / "analysis_actions.csv"),
        "cell (K2, G3)",
        "NEd_kN = 1.2526e+06",
        "N instead of kN",
    )


def test_stress_on_trial_section_is_flagged():
    s = load_scenario(SMALL)
    df = scenario_actions(s)
    i = df.index[(df["stack"] == "B1") & (df["level"] == "L3")][0]
    # 350 x 350 trial, C30/37: 2 x fck x A = 7350 kN is the limit; 8000 kN passes the 2 m column test.
    df.loc[i, "NEd_kN"] = 8000.0
    w = _only(
        plausibility_warnings(s, df, s.params), "(takedown actions)", "cell (B1, L3)", "NEd_kN = 8000", "350 x 350"
    )
    assert "65.3 MPa" in w
    df.loc[i, "NEd_kN"] = 2 * 30 * 350 * 350 / 1e3 * 0.99
    assert plausibility_warnings(s, df, s.params) == []


@pytest.mark.parametrize("col", ["My_top_kNm", "My_bot_kNm", "Mz_top_kNm", "Mz_bot_kNm"])
def test_moment_in_newton_millimetres_is_flagged(analysis, col):
    s, a = analysis
    df = a.copy()
    i = df.index[(df["stack"] == "K1") & (df["level"] == "G4")][0]
    df.loc[i, col] = df.loc[i, col] * 1e6
    _only(plausibility_warnings(s, df, s.params), "cell (K1, G4)", col, "N·mm")


def test_large_moment_with_large_force_is_not_flagged(analysis):
    s, a = analysis
    df = a.copy()
    i = df.index[(df["stack"] == "K4") & (df["level"] == "G1")][0]
    df.loc[i, "My_top_kNm"] = 2.0e4  # 20 MNm with 4150 kN: e = 4.8 m, under the 10 m limit
    assert df.loc[i, "NEd_kN"] * LIMITS["eccentricity_m_max"] > 2.0e4
    assert plausibility_warnings(s, df, s.params) == []


def test_effective_length_in_metres_is_flagged(analysis):
    s, a = analysis
    df = a.copy()
    df.loc[(df["stack"] == "K3") & (df["level"] == "G1"), "l0z_mm"] = 3.7
    _only(plausibility_warnings(s, df, s.params), "cell (K3, G1)", "l0z_mm = 3.7", "m instead of mm")
    df.loc[(df["stack"] == "K3") & (df["level"] == "G1"), "l0z_mm"] = 37000.0
    _only(plausibility_warnings(s, df, s.params), "cell (K3, G1)", "l0z_mm = 37000", "storey height")


def test_warnings_come_from_the_csv_through_the_reader(tmp_path):
    """End to end: a CSV written in N and N·mm gives one warning per slipped value."""
    csv = (ROOT / "scenarios" / "analysis_actions.csv").read_text(encoding="utf-8")
    csv = csv.replace("K1,G2,1105.0,35.6", "K1,G2,1105000.0,35600000")
    (tmp_path / "analysis_actions.csv").write_text(csv, encoding="utf-8")
    (tmp_path / "s.toml").write_text(ANALYSIS_TEXT, encoding="utf-8")
    s = load_scenario(tmp_path / "s.toml")
    w = plausibility_warnings(s, read_actions_csv(s.actions_file, s), s.params)
    assert len(w) == 2, w
    assert any("NEd_kN = 1.105e+06" in x for x in w)
    assert any("My_top_kNm = 3.56e+07" in x for x in w)
    assert all("cell (K1, G2)" in x for x in w)
