"""`colstack compare`: files, figures equal to an independent run, and the arithmetic of the sentences."""

import math

import pandas as pd
import pytest

from optimizer import CAUTION
from optimizer.building.scenario import load_scenario
from optimizer.cli import main
from optimizer.pipeline.run import run_scenario
from optimizer.studies.compare import compare_sentences
from optimizer.studies.variants import with_grade
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

SMALL = paths.SMALL
# A 100 mm size module halves the catalogue: the same building, faster runs.
COARSE = "\n[catalogue]\nsizes_mm = {min = 250, max = 1200, step = 100}\n"


@pytest.fixture(scope="module")
def compared(tmp_path_factory):
    root = tmp_path_factory.mktemp("compare")
    scen = root / "scen" / "small.toml"
    scen.parent.mkdir()
    scen.write_text(SMALL.read_text(encoding="utf-8") + COARSE, encoding="utf-8")
    out = root / "out"
    code = main(["compare", str(scen), "--grades", "C30/37, C40/50", "--out", str(out), "--quiet"])
    return code, scen, out


def test_compare_writes_every_file(compared, capsys):
    code, scen, out = compared
    assert code == 0
    for name in ("compare.csv", "compare.xlsx", "compare.png", "compare.txt"):
        assert (out / name).is_file() and (out / name).stat().st_size > 0
    assert (out / "compare.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    for sub in ("C30_37", "C40_50"):
        for stem in ("schedule", "cells", "types", "quantities"):
            assert (out / sub / f"{stem}.csv").is_file()
    text = (out / "compare.txt").read_text(encoding="utf-8")
    assert text.startswith(CAUTION) and "C40/50:" in text and "than C30/37" in text
    table = pd.read_csv(out / "compare.csv")
    assert list(table["variant"]) == ["C30/37", "C40/50"]
    assert list(table["grades_used"]) == ["C30/37", "C40/50"]
    xl = pd.read_excel(out / "compare.xlsx", sheet_name="Comparison")
    assert list(xl["variant"]) == ["C30/37", "C40/50"] and xl["steel_t"].tolist() == pytest.approx(
        table["steel_t"].tolist()
    )
    # the sentence in the text file follows from the table's own figures
    a, b = table.set_index("variant").loc["C40/50"], table.set_index("variant").loc["C30/37"]
    d = 100 * (a["steel_t"] - b["steel_t"]) / b["steel_t"]
    size = f"{abs(d):.1f}" if abs(d) < 10 else f"{abs(d):.0f}"  # one decimal below 10 %
    expected = "the same steel" if abs(d) < 0.5 else f"{size} % {'less' if d < 0 else 'more'} steel"
    assert expected in text
    assert scen.is_file()  # the user's scenario is untouched


def test_compare_figures_equal_an_independent_run(compared):
    _, scen, out = compared
    table = pd.read_csv(out / "compare.csv").set_index("variant")
    r = run_scenario(with_grade(load_scenario(scen), "C40/50"))
    tot = r.totals
    row = table.loc["C40/50"]
    assert row["steel_t"] == pytest.approx(round(tot["steel_t"], 2))
    assert row["concrete_m3"] == pytest.approx(round(tot["concrete_m3"], 1))
    assert row["carbon_tCO2e"] == pytest.approx(round(tot["carbon_tCO2e"], 1))
    assert row["column_plan_area_m2"] == pytest.approx(round(tot["plan_area_m2"], 1))
    assert row["types"] == len(set(int(t) for t in r.chosen_type))
    assert row["premium_percent"] == pytest.approx(round(100 * r.premium, 1))
    assert math.isnan(row["cost"])  # no money rates in the scenario: no cost is invented
    # every cell in C40/50
    assert {r.catalogue.types[int(t)].design.concrete.name for t in r.chosen_type} == {"C40/50"}


def _row(name, steel, concrete, area, carbon, cost, types):
    return {
        "variant": name,
        "steel_t": steel,
        "concrete_m3": concrete,
        "column_plan_area_m2": area,
        "carbon_tCO2e": carbon,
        "cost": cost,
        "types": types,
    }


def test_sentences_arithmetic_and_threshold():
    table = pd.DataFrame(
        [
            _row("REF", 10.0, 100.0, 20.0, 50.0, 1000.0, 8),
            _row("A", 8.0, 100.4, 19.902, 55.0, 1250.0, 5),  # -20 %, +0.4 %, -0.49 %, +10 %, +25 %, 3 fewer
            _row("B", 10.04, 130.0, 20.0, 49.8, 1000.0, 9),  # +0.4 %, +30 %, 0, -0.4 %, 0, 1 more
        ]
    )
    s = compare_sentences(table)
    assert len(s) == 2  # no sentence about the reference itself
    a, b = s
    assert a.startswith("A: ") and a.endswith("than REF.")
    assert "20 % less steel" in a
    assert "10 % more embodied carbon" in a and "25 % more cost" in a
    assert "3 fewer types" in a
    # differences under 0.5 % make no claim either way
    assert "the same concrete" in a and "the same column plan area" in a
    assert "% more concrete" not in a and "% less column plan area" not in a
    assert "the same steel" in b and "the same embodied carbon" in b and "the same cost" in b
    assert "30 % more concrete" in b and b.endswith("1 more type than REF.")
    assert "% less" not in b


def test_sentences_against_a_named_reference_and_missing_cost():
    table = pd.DataFrame([_row("X", 12.0, 90.0, 18.0, 40.0, None, 6), _row("Y", 15.0, 90.0, 18.0, 40.0, None, 6)])
    (s,) = compare_sentences(table, reference="Y")
    assert s.startswith("X: ") and s.endswith("than Y.")
    assert "20 % less steel" in s  # (12 - 15) / 15
    assert "cost" not in s  # no cost figures: no claim about cost
    assert "type" not in s  # same number of types
    assert compare_sentences(table.iloc[:0]) == []
