"""`colstack section`: JSON keys, plotting, and one clear line for bad input."""

import json

import numpy as np
import pytest

from design.materials import Concrete, Reinforcement
from design.resistance import DesignSection, axial_resistance, moment_resistance
from design.sections import RectBars, RectSection
from optimizer.cli import main


def write(tmp_path, name, text):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


GOOD = """
b = 400
h = 600
cover = 35
link = 10
fck = 40
fyk = 500
NEd = 2500
[bars]
dia = 25
nb = 3
nh = 4
"""


def test_json_output_matches_engine(tmp_path, capsys):
    spec = write(tmp_path, "col.toml", GOOD)
    assert main(["section", str(spec), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    for key in ("NRd_kN", "MRdy_kNm", "MRdz_kNm", "As_mm2"):
        assert key in out
    ds = DesignSection(RectSection(400, 600, 35, 10, RectBars(25, 3, 4)), Concrete(40), Reinforcement(500))
    assert out["NRd_kN"] == pytest.approx(axial_resistance(ds) / 1e3)
    assert out["MRdy_kNm"] == pytest.approx(moment_resistance(ds, 2500e3, "y") / 1e6)
    assert out["MRdz_kNm"] == pytest.approx(moment_resistance(ds, 2500e3, "z") / 1e6)
    assert out["As_mm2"] == pytest.approx(10 * np.pi * 25**2 / 4)
    # h > b, so the section is stronger about y (lever arm along h).
    assert out["MRdy_kNm"] > out["MRdz_kNm"]


def test_text_output_and_plot(tmp_path, capsys):
    spec = write(tmp_path, "col.toml", GOOD)
    png = tmp_path / "out" / "curves.png"
    assert main(["section", str(spec), "--plot", str(png)]) == 0
    text = capsys.readouterr().out
    assert "MRdy" in text and "concept design" in text
    assert png.stat().st_size > 10_000


def test_json_circle_with_overrides(tmp_path, capsys):
    spec = write(
        tmp_path,
        "c.json",
        json.dumps(
            {
                "diameter": 500,
                "cover": 40,
                "link": 10,
                "grade": "C35/45",
                "fyk": 500,
                "bars": {"dia": 20, "n": 8},
                "parameters": {"alpha_cc": 0.85},
            }
        ),
    )
    assert main(["section", str(spec), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["fcd_MPa"] == pytest.approx(0.85 * 35 / 1.5)
    assert out["NEd_kN"] == pytest.approx(0.0)
    assert out["MRdy_kNm"] == pytest.approx(out["MRdz_kNm"], rel=0.02)


@pytest.mark.parametrize(
    ("edit", "needle"),
    [
        (lambda s: s.replace("fck = 40", "fck = -40"), "fck"),
        (lambda s: s.replace("fck = 40", 'fck = "forty"'), "fck"),
        (lambda s: s.replace("cover = 35", ""), "cover"),
        (lambda s: s.replace("link = 10", "lnk = 10"), "did you mean 'link'"),
        (lambda s: s.replace("nb = 3", "nb = 1"), "bars.nb"),
        (lambda s: s.replace("b = 400", "b = 0"), "b = 0"),
        (lambda s: s.replace("fyk = 500", "fyk = 250"), "fyk"),
        (lambda s: s + "\n[parameters]\nalpha_cc = 1.5\n", "alpha_cc"),
        (lambda s: s.replace("h = 600", "h = 600\n["), "valid TOML"),
        (lambda s: s.replace("b = 400", "b = 100"), "do not fit"),
        (lambda s: s.replace("fck = 40", 'grade = "C40"'), "did you mean C40/50?"),
        (lambda s: s.replace("b = 400", "b = 0.4"), "b = 0.4: a section dimension in mm is expected"),
        (lambda s: s.replace("NEd = 2500", "NEd = 2500000"), "did you mean 2500 (N typed for kN)?"),
    ],
)
def test_bad_input_one_line_exit_2(tmp_path, capsys, edit, needle):
    spec = write(tmp_path, "bad.toml", edit(GOOD))
    assert main(["section", str(spec)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1
    assert "bad.toml" in err and needle in err
    assert "Traceback" not in err


def test_missing_file(tmp_path, capsys):
    assert main(["section", str(tmp_path / "nope.toml")]) == 2
    assert "nope.toml" in capsys.readouterr().err


def test_json_lists_warnings_and_stderr_repeats_them(tmp_path, capsys):
    """NEd above the squash load Ac fcd + As fyd (EN 1992-1-1 5.8.9(4)) is possible input, but worth a warning."""
    squash = (400 * 600 * 40 / 1.5 + 10 * np.pi * 25**2 / 4 * 500 / 1.15) / 1e3
    spec = write(tmp_path, "col.toml", GOOD.replace("NEd = 2500", f"NEd = {squash * 1.05:.0f}"))
    assert main(["section", str(spec), "--json"]) == 0
    captured = capsys.readouterr()
    out = json.loads(captured.out)
    assert len(out["warnings"]) == 1 and "above the squash load" in out["warnings"][0]
    assert f"{squash:,.0f} kN" in out["warnings"][0]
    assert captured.err.strip() == f"colstack section: warning: {out['warnings'][0]}"
    assert main(["section", str(write(tmp_path, "ok.toml", GOOD)), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["warnings"] == []
