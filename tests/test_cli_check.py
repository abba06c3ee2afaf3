"""`colstack check`: the sheet, the JSON keys, the HTML page, and clear errors."""

import json
import shutil
from pathlib import Path

import pytest

from optimizer.cli import main

EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "column_slender_biaxial.toml"

KEYS = ("lambda_y", "lambda_z", "lambda_lim_y", "lambda_lim_z", "MEdy_kNm", "MEdz_kNm", "MRdy_kNm", "MRdz_kNm",
        "NRd_kN", "utilisation", "governing", "ok", "checks")


def test_json_keys(capsys):
    assert main(["check", str(EXAMPLE), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    for k in KEYS:
        assert k in out
    assert out["lambda_z"] > out["lambda_lim_z"]  # the example is slender about z
    names = {c["name"] for c in out["checks"]}
    assert {"axial resistance", "biaxial interaction", "nominal cover to links", "fire resistance R60"} <= names


def test_sheet_text_and_html(tmp_path, capsys):
    page = tmp_path / "sheet.html"
    assert main(["check", str(EXAMPLE), "--html", str(page)]) == 0
    text = capsys.readouterr().out
    for needle in ("Eq. (5.13N)", "Eq. (5.33)", "Eq. (5.39)", "Eq. (5.32)", "6.1(4)", "concept design"):
        assert needle in text
    html = page.read_text(encoding="utf-8")
    assert html.startswith("<!DOCTYPE html>") and "Eq. (5.36)" in html and "<script" not in html


def test_k1_k2_effective_length(tmp_path, capsys):
    """EN 1992-1-1 Eq. (5.15), braced: l0 = 0.5 l sqrt((1 + k1/(0.45 + k1))(1 + k2/(0.45 + k2)))."""
    assert main(["check", str(EXAMPLE), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    l, k1, k2 = 6500, 0.4, 0.6
    expected = 0.5 * l * ((1 + k1 / (0.45 + k1)) * (1 + k2 / (0.45 + k2))) ** 0.5
    assert out["values"]["l0y"] == pytest.approx(expected)


@pytest.mark.parametrize(
    ("edit", "needle"),
    [
        (lambda s: s.replace("NEd = 2100                 # kN", ""), "NEd"),
        (lambda s: s.replace("My = [95, -40]", "My = [95]"), "My"),
        (lambda s: s.replace('fire = "R60"', 'fire = "R75"'), "fire"),
        (lambda s: s.replace('exposure = "XC3"', 'exposure = "XZ9"'), "exposure"),
        (lambda s: s.replace("height = 6500", "height = -1"), "height"),
        (lambda s: s.replace("k1y = 0.4", "").replace("k2y = 0.6", ""), "l0y"),
        (lambda s: s.replace("phi_ef = 1.8", "phi_eff = 1.8"), "did you mean 'phi_ef'"),
    ],
)
def test_bad_input(tmp_path, capsys, edit, needle):
    bad = tmp_path / "bad.toml"
    bad.write_text(edit(EXAMPLE.read_text(encoding="utf-8")), encoding="utf-8")
    assert main(["check", str(bad)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "bad.toml" in err and needle in err


def test_does_not_overwrite_spec(tmp_path, capsys):
    spec = tmp_path / "c.toml"
    shutil.copy(EXAMPLE, spec)
    assert main(["check", str(spec), "--html", str(spec)]) == 2
    assert spec.read_text(encoding="utf-8") == EXAMPLE.read_text(encoding="utf-8")
