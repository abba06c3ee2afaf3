"""`colstack check`: the sheet, the JSON keys, the HTML page, and clear errors."""

import json
import re
import shutil
from html import unescape
from pathlib import Path

import pytest

from optimizer.cli import main
from tests.support import paths

EXAMPLE = paths.EXAMPLE

KEYS = (
    "lambda_y",
    "lambda_z",
    "lambda_lim_y",
    "lambda_lim_z",
    "MEdy_kNm",
    "MEdz_kNm",
    "MRdy_kNm",
    "MRdz_kNm",
    "NRd_kN",
    "utilisation",
    "governing",
    "ok",
    "checks",
)


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


# --------------------------------------------------------------------------- exit status, sheet wording, kinds


def _variant(tmp_path, old: str, new: str, name: str = "variant.toml") -> Path:
    text = EXAMPLE.read_text(encoding="utf-8")
    assert old in text, old
    p = tmp_path / name
    p.write_text(text.replace(old, new, 1), encoding="utf-8")
    return p


FAILING = ("NEd = 2100 ", "NEd = 5000 ")  # below the squash load (no warning), far beyond MRd at that NEd
FIRE_OUTSIDE = ("l0_fi = 2800", "l0_fi = 3500")  # EN 1992-1-2 5.3.2(2): method A needs l0,fi <= 3 m


def test_exit_status_is_1_when_the_column_fails(tmp_path, capsys):
    spec = _variant(tmp_path, *FAILING)
    assert main(["check", str(spec)]) == 1
    text = capsys.readouterr().out
    assert text.rstrip().splitlines()[-1].startswith("FAILS: utilisation")
    assert main(["check", str(spec), "--json"]) == 1
    out = json.loads(capsys.readouterr().out)
    assert out["ok"] is False and out["utilisation"] > 1.0
    # and 0 when it passes (the bundled example)
    assert main(["check", str(EXAMPLE), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["ok"] is True


def test_method_not_applicable_reads_not_applicable_and_exits_1(tmp_path, capsys):
    """EN 1992-1-2 5.3.2(2): Table 5.2a holds for l0,fi <= 3 m only; beyond, the check cannot be judged."""
    spec = _variant(tmp_path, *FIRE_OUTSIDE)
    page = tmp_path / "sheet.html"
    assert main(["check", str(spec), "--html", str(page)]) == 1
    text = capsys.readouterr().out
    html = unescape(page.read_text(encoding="utf-8"))
    for doc in (text, html):
        assert not re.search(r"\binf\b", doc), "a utilisation of inf is printed"
        assert "not applicable" in doc and "l0,fi = 3,500 mm > 3000 mm" in doc
    verdict = next(ln for ln in text.splitlines() if ln.startswith(("PASSES", "FAILS")))
    assert verdict.startswith("FAILS: fire resistance R60 not applicable") and "resistance 0.6" in verdict
    assert main(["check", str(spec), "--json"]) == 1
    out = json.loads(capsys.readouterr().out)
    assert out["governing"] == "fire resistance R60" and out["governing_applicable"] is False
    assert out["utilisation"] is None and out["utilisation_fire"] is None
    assert out["utilisation_resistance"] == pytest.approx(0.62, abs=0.05)


def test_sheet_says_where_A_B_C_came_from_and_prints_no_stray_units(capsys):
    """EN 1992-1-1 5.8.3.1(1): A = 1/(1 + 0.2 phi_ef), B = sqrt(1 + 2 omega), C = 1.7 - rm."""
    assert main(["check", str(EXAMPLE)]) == 0
    text = capsys.readouterr().out
    assert "from phi_ef; B from omega" not in text
    omega = 5180.5 * (500 / 1.15) / (350 * 450 * 35 / 1.5)  # As fyd / (Ac fcd), 4H32 + 4H25
    assert "A from phi_ef = 1.80" in text and f"{1 / (1 + 0.2 * 1.8):.3f}" in text
    assert f"B from the mechanical reinforcement ratio omega = {omega:.3f}" in text
    assert f"{(1 + 2 * omega) ** 0.5:.3f}" in text
    rm_y = -40 / 95  # about y the imperfection acts elsewhere: rm = M01/M02 of the given end moments
    assert f"C from rm = M01/M02 = {rm_y:.3f}" in text and f"{1.7 - rm_y:.3f}" in text
    lines = text.splitlines()
    assert not [ln for ln in lines if re.search(r"\d -\s*(->|=|$)", ln)], "a '-' printed where a unit belongs"
    biaxial = lines[lines.index("  biaxial interaction") + 1]
    assert re.match(r"\s+0\.\d{3} <= 1\.000  ->  0\.\d{3} ok$", biaxial), biaxial
    assert not re.search(r"\binf\b", text)


def test_sheet_A_default_is_a_sentence():
    """With phi_ef unknown, EN 1992-1-1 5.8.3.1(1) allows A = 0.7: the sheet says that this is the default."""
    import dataclasses

    from design.member import check_column
    from optimizer.cli.check import parse_check_spec
    from optimizer.cli.spec import load_spec_file
    from optimizer.reporting.sheet import build_sheet, render_text

    spec, actions, settings, notes = parse_check_spec(load_spec_file(EXAMPLE), str(EXAMPLE))
    res = check_column(spec.design, actions, settings, spec.params)
    values = {**res.values, "A_default": True, "A_y": 0.7, "A_z": 0.7}
    text = render_text(build_sheet("t", spec.design, actions, dataclasses.replace(res, values=values), spec.params))
    assert "A = 0.7, the default where the effective creep ratio phi_ef is not known" in text


def test_json_and_sheet_give_resistance_apart_from_detailing_cover_fire(capsys):
    assert main(["check", str(EXAMPLE), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    kinds = {c["name"]: c["kind"] for c in out["checks"]}
    assert kinds["biaxial interaction"] == "resistance" and kinds["nominal cover to links"] == "cover"
    assert kinds["fire resistance R60"] == "fire" and kinds["link diameter"] == "detailing"
    # the overall check is the cover; strength is the biaxial interaction, well below it
    assert out["governing"] == "nominal cover to main bars"
    assert out["governing_cover"] == "nominal cover to main bars"
    assert out["utilisation_cover"] == pytest.approx(out["utilisation"], rel=1e-12)
    assert kinds[out["governing_resistance"]] == "resistance"
    res = [c for c in out["checks"] if c["kind"] == "resistance"]
    assert out["utilisation_resistance"] == pytest.approx(max(c["utilisation"] for c in res), rel=1e-12)
    for kind in ("detailing", "cover", "fire", "durability"):
        same = [c for c in out["checks"] if c["kind"] == kind]
        if not same:  # a kind without checks is reported as null
            assert out[f"governing_{kind}"] is None and out[f"utilisation_{kind}"] is None
            continue
        assert out[f"utilisation_{kind}"] == pytest.approx(max(c["utilisation"] for c in same), rel=1e-12)
        assert kinds[out[f"governing_{kind}"]] == kind
    assert out["utilisation_resistance"] < out["utilisation"]
    assert out["warnings"] == []
    # the sheet's summary block and verdict say the same
    assert main(["check", str(EXAMPLE)]) == 0
    text = capsys.readouterr().out
    summary = text[text.index("Summary") : text.index("Input")]
    for kind in ("resistance", "detailing", "cover", "fire"):
        name = out[f"governing_{kind}"]
        assert f"governing {kind} check\n    {name}  ->  {out[f'utilisation_{kind}']:.3f} ok" in summary
    assert (
        text.rstrip()
        .splitlines()[-1]
        .endswith(f"; resistance {out['utilisation_resistance']:.3f} ({out['governing_resistance']})")
    )
