"""The actions CSV: the takedown writes it, the reader checks it row by row."""

import pytest

from optimizer.building.actions_csv import ACTION_COLUMNS, read_actions_csv, write_actions_csv
from optimizer.building.scenario import load_scenario
from optimizer.building.takedown import scenario_actions, takedown
from optimizer.errors import InputError
from tests.support import paths

ROOT = paths.ROOT

HEADER = "stack,level,NEd_kN,My_top_kNm,My_bot_kNm,Mz_top_kNm,Mz_bot_kNm"


@pytest.fixture(scope="module")
def analysis():
    return load_scenario(ROOT / "scenarios/analysis_actions.toml")


@pytest.fixture(scope="module")
def small(small_scenario):
    return small_scenario


def _good_rows(scenario):
    return [f"{c.stack},{c.level},1000,10,-5,8,4" for c in scenario.cells]


def _write(tmp_path, lines):
    p = tmp_path / "actions.csv"
    p.write_text("\n".join(lines) + "\n")
    return p


def test_round_trip_takedown_to_csv(small, tmp_path):
    r = takedown(small)
    path = write_actions_csv(r.actions, tmp_path / "out.csv")
    header = path.read_text().splitlines()[0].split(",")
    assert header[:7] == list(ACTION_COLUMNS)
    assert header[7:] == ["l0y_mm", "l0z_mm", "exposure", "fire", "M0Eqp_ratio", "char_ratio", "eta_fi"]
    back = read_actions_csv(path, small)
    for col in (*ACTION_COLUMNS[2:], "M0Eqp_ratio"):
        assert back[col].tolist() == pytest.approx(r.actions[col].tolist(), abs=1e-3)
    assert back["exposure"].tolist() == r.actions["exposure"].tolist()


def test_analysis_scenario_fills_blanks_from_settings(analysis):
    df = scenario_actions(analysis)
    assert len(df) == 16
    row = df[(df["stack"] == "K1") & (df["level"] == "G2")].iloc[0]
    # Blank l0 in the CSV: 0.85 x clear height (3.4 - 0.275) = 0.85 x 3.125 m = 2656.25 mm.
    assert row["l0y_mm"] == pytest.approx(2656.25)
    assert row["exposure"] == "XC1"
    row = df[(df["stack"] == "K1") & (df["level"] == "G1")].iloc[0]
    assert row["l0y_mm"] == pytest.approx(3700.0) and row["exposure"] == "XC3"
    assert row["My_bot_kNm"] == pytest.approx(-12.4)  # signs kept: double curvature


def _expect(tmp_path, scenario, lines, field_part, value_part=None):
    p = _write(tmp_path, lines)
    with pytest.raises(InputError) as info:
        read_actions_csv(p, scenario)
    err = info.value
    assert err.file == str(p)
    assert field_part in err.field, str(err)
    if value_part is not None:
        assert value_part in str(err.value), str(err)
    return err


def test_missing_columns(analysis, tmp_path):
    lines = ["stack,level,NEd_kN,My_top_kNm"] + ["K1,G1,1,2"]
    err = _expect(tmp_path, analysis, lines, "row 1", "My_bot_kNm")
    assert "required columns" in err.expected


def test_non_numeric_value(analysis, tmp_path):
    rows = _good_rows(analysis)
    rows[2] = rows[2].replace(",1000,", ",12a,")
    err = _expect(tmp_path, analysis, [HEADER, *rows], "row 4, column NEd_kN", "12a")
    assert err.expected == "a number"


def test_unknown_stack_and_level(analysis, tmp_path):
    rows = _good_rows(analysis)
    rows[0] = rows[0].replace("K1,", "K9,", 1)
    _expect(tmp_path, analysis, [HEADER, *rows], "row 2, column stack", "K9")
    rows = _good_rows(analysis)
    rows[0] = rows[0].replace(",G1,", ",G7,", 1)
    _expect(tmp_path, analysis, [HEADER, *rows], "row 2, column level", "G7")


def test_missing_and_duplicate_cells(analysis, tmp_path):
    rows = _good_rows(analysis)
    err = _expect(tmp_path, analysis, [HEADER, *rows[:-1]], "rows", "K4,G4")
    assert "missing" in err.expected
    _expect(tmp_path, analysis, [HEADER, *rows, rows[0]], "row 18", "K1,G1")


def test_tension_and_unknown_column_refused(analysis, tmp_path):
    rows = _good_rows(analysis)
    rows[0] = rows[0].replace(",1000,", ",-50,")
    _expect(tmp_path, analysis, [HEADER, *rows], "row 2, column NEd_kN", "-50")
    err = _expect(tmp_path, analysis, [HEADER + ",l0y_m", *[r + ",3" for r in rows]], "row 1", "l0y_m")
    assert "l0y_mm" in err.expected


def test_wrong_number_of_values(analysis, tmp_path):
    rows = _good_rows(analysis)
    rows[1] = rows[1] + ",7"
    _expect(tmp_path, analysis, [HEADER, *rows], "row 3")


def test_bad_exposure_in_csv(analysis, tmp_path):
    rows = [r + ",XC2" for r in _good_rows(analysis)]
    rows[5] = rows[5][:-3] + "ZZ1"
    _expect(tmp_path, analysis, [HEADER + ",exposure", *rows], "row 7, column exposure", "ZZ1")
