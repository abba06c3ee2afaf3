"""`colstack fire`: temperatures under the standard fire and the 500 C isotherm method from the command line.

The engineering of the two parts is tested against outside sources in tests/design/test_thermal.py
and tests/design/test_isotherm.py; here: what a user types reaches them, the figures the command
prints are those of the design modules, and bad input is one clear error.
"""

from __future__ import annotations

import json
import tomllib

import pytest

from design.heat.isotherm import fire_resistance
from design.heat.thermal import ThermalSettings, isotherm_depth, solve_section, temperature_at
from design.sections import RectBars, RectSection
from optimizer.cli import main
from tests.support import paths
from tests.support.toml import dump_toml

EXAMPLE = paths.EXAMPLES / "section_fire.toml"


def _run(tmp_path, capsys, data: dict, *extra: str) -> tuple[int, str, str]:
    spec = tmp_path / "fire.toml"
    spec.write_text(dump_toml(data), encoding="utf-8")
    code = main(["fire", str(spec), *extra])
    out = capsys.readouterr()
    return code, out.out, out.err


def _example() -> dict:
    return tomllib.loads(EXAMPLE.read_text(encoding="utf-8"))


def test_json_figures_are_those_of_the_design_modules(tmp_path, capsys):
    code, out, _ = _run(tmp_path, capsys, _example(), "--json")
    assert code == 0
    d = json.loads(out)
    for key in ("bars", "isotherm_500_depth_mm", "NRd_fi_kN", "MRdy_fi_kNm", "MRdz_fi_kNm", "utilisation_fi", "method"):
        assert key in d
    assert d["method"].startswith("500 C isotherm")
    # the same analysis by hand through the design modules
    sec = RectSection(400.0, 400.0, 35.0, 8.0, RectBars(20.0, 3, 3))
    th = solve_section(400.0, 400.0, [90.0], ThermalSettings())
    y, z, _ = sec.bar_coords()
    theta = temperature_at(th, 0, y, z)
    a500 = isotherm_depth(th, 0, 500.0)
    assert [b["theta_C"] for b in d["bars"]] == pytest.approx(list(theta), rel=1e-9)
    assert d["isotherm_500_depth_mm"] == pytest.approx(max(a500.values()), rel=1e-9)
    res = fire_resistance(sec, 30.0, 500.0, theta, a500, 0.65 * 2000e3)
    assert d["NRd_fi_kN"] == pytest.approx(res.NRd_fi / 1e3, rel=1e-9)
    assert d["MRdy_fi_kNm"] == pytest.approx(res.MRdy_fi / 1e6, rel=1e-9)
    # the actions in fire: eta_fi x the design actions, the larger end moment
    assert d["NEd_fi_kN"] == pytest.approx(0.65 * 2000.0)
    assert d["MEdy_fi_kNm"] == pytest.approx(0.65 * 60.0)
    assert d["utilisation_fi"] == pytest.approx(max(c["utilisation"] for c in d["checks"]), rel=1e-12)
    # corner bars are hotter than the middle bars of a face (two faces heat them)
    assert max(b["theta_C"] for b in d["bars"]) > min(b["theta_C"] for b in d["bars"])


def test_text_plot_and_exit_status_of_a_failing_section(tmp_path, capsys):
    data = _example()
    plot = tmp_path / "field.png"
    code, out, _ = _run(tmp_path, capsys, data, "--plot", str(plot))
    assert code == 0 and "PASSES in fire" in out and "standard fire" in out
    assert plot.is_file() and plot.stat().st_size > 10_000
    data["NEd_fi"] = 6000.0  # beyond NRd,fi of the reduced section
    code, out, _ = _run(tmp_path, capsys, data)
    assert code == 1 and "FAILS in fire" in out


def test_one_exposed_face_keeps_the_far_bars_cool(tmp_path, capsys):
    data = _example()
    data["exposed_sides"] = ["+y"]
    code, out, _ = _run(tmp_path, capsys, data, "--json")
    d = json.loads(out)
    far = [b["theta_C"] for b in d["bars"] if b["y_mm"] < 0]
    near = [b["theta_C"] for b in d["bars"] if b["y_mm"] > 0]
    assert max(far) < 100.0 < min(near)
    assert d["isotherm_500_depth_by_face_mm"]["-y"] == pytest.approx(0.0)


def test_default_eta_fi_is_the_simplification_and_said(tmp_path, capsys):
    data = _example()
    data.pop("eta_fi")
    _, out, _ = _run(tmp_path, capsys, data, "--json")
    d = json.loads(out)
    assert d["NEd_fi_kN"] == pytest.approx(0.7 * 2000.0)  # EN 1992-1-2, 2.4.2(3)
    assert "2.4.2(3)" in d["actions"]


@pytest.mark.parametrize(
    ("change", "key"),
    [
        ({"fire": "R45"}, "fire"),
        ({"exposed_sides": ["+x"]}, "exposed_sides"),
        ({"aggregate_type": "basalt"}, "aggregate_type"),
        ({"eta_fi": 1.5}, "eta_fi"),
        ({"NEd": None}, "NEd_fi"),
    ],
)
def test_bad_input_is_one_clear_error(tmp_path, capsys, change, key):
    data = _example()
    for k, v in change.items():
        if v is None:
            data.pop(k)
        else:
            data[k] = v
    code, _, err = _run(tmp_path, capsys, data)
    assert code == 2
    assert key in err and "Traceback" not in err and len(err.strip().splitlines()) == 1
