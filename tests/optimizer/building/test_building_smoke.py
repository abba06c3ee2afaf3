"""Every scenario loads and is taken down; the generator and both commands run."""

import pandas as pd
import pytest

from optimizer.building.actions_csv import ACTION_COLUMNS
from optimizer.building.generate import TowerSpec, generate_tower, generate_tower_toml
from optimizer.building.model import SupportKind
from optimizer.building.scenario import load_scenario
from optimizer.building.takedown import scenario_actions, takedown
from optimizer.cli import main
from tests.support import paths

ROOT = paths.ROOT

SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))


def test_the_three_scenarios_exist():
    names = {p.name for p in SCENARIOS}
    assert {"demo_tower.toml", "small_building.toml", "analysis_actions.toml"} <= names


@pytest.mark.parametrize("path", SCENARIOS, ids=lambda p: p.name)
def test_scenario_loads_and_takes_down(path):
    s = load_scenario(path)
    df = scenario_actions(s)
    assert list(df.columns[:7]) == list(ACTION_COLUMNS)
    assert len(df) == len(s.cells)
    assert (df["NEd_kN"] > 0).all()
    assert df[list(ACTION_COLUMNS[2:])].notna().all().all()


def test_demo_tower_is_what_the_issue_asks():
    s = load_scenario(ROOT / "scenarios/demo_tower.toml")
    assert 25 <= len(s.levels) <= 35 and 30 <= len(s.stacks) <= 40
    transfers = [st for st in s.stacks if st.support is SupportKind.TRANSFER]
    assert 3 <= len(transfers) <= 4
    assert any(f.holes_m for f in s.floors)  # the core
    r = takedown(s)
    # Equilibrium: the foundation carries every floor load and column self-weight
    # (characteristic permanent load), transfers only pass load on.
    fnd = r.reactions[r.reactions["kind"].isin(["foundation", "external"])]
    total_g = (r.level_totals["Gk_floor_kN"] + r.level_totals["column_self_weight_kN"]).sum()
    assert fnd["Gk_kN"].sum() == pytest.approx(total_g, rel=1e-9)
    assert fnd["Qk_kN"].sum() == pytest.approx(r.level_totals["Qk_floor_kN"].sum(), rel=1e-9)
    assert any("braced" in n and "cores" in n for n in r.notes)


def test_generator_function():
    s = generate_tower(12, 10)
    assert len(s.levels) == 12 and len(s.stacks) == 10 and len(s.cells) == 120
    r = takedown(s)
    # 10 stacks -> 4 per row: two full rows and a row of 2, bays 8.0 x 7.5 m, 0.5 m edges.
    # By hand: full rows box (24 + 1) x (7.5 + 1) = 212.5 m2; last row box (8 + 1) x
    # (7.5 + 0.5) = 72.0 m2 from y = 7.5 to 15.5; overlap 9 x 0.5 = 4.5 m2 -> 280.0 m2.
    assert r.level_totals["floor_area_m2"].iloc[0] == pytest.approx(280.0)
    text = generate_tower_toml(TowerSpec(3, 4, bay_x_m=6.0))
    assert "x_m = 6" in text


def test_takedown_command_writes_outputs(tmp_path):
    assert main(["takedown", str(ROOT / "scenarios/small_building.toml"), "--out", str(tmp_path), "--quiet"]) == 0
    actions = pd.read_csv(tmp_path / "actions.csv")
    assert list(actions.columns[:7]) == list(ACTION_COLUMNS)
    assert (tmp_path / "summary.txt").read_text().count("Reactions at the foundation") == 1
    assert sorted(p.name for p in (tmp_path / "plans").glob("*.png")) == ["plan_L1-L5.png", "plan_ROOF.png"]


def test_takedown_command_reports_bad_input_without_traceback(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text((ROOT / "scenarios/small_building.toml").read_text().replace("height_m = 4.5", "height_m = -4.5"))
    assert main(["takedown", str(bad), "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert "levels[0].height_m = -4.5" in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1


def test_generate_command(tmp_path):
    out = tmp_path / "tower.toml"
    argv = ["generate", "--storeys", "8", "--stacks", "12", "--out", str(out)]
    assert main(argv) == 0
    s = load_scenario(out)
    assert len(s.cells) == 96
    assert main(argv) == 2  # refuses to overwrite without --force
