"""Slips of units and names in single-column specifications: refused when no one can mean them, warned when odd.

`colstack check` and `colstack section` read lengths in mm, forces in kN and
moments in kNm. A value in the wrong unit (a clear height of 6.5 for 6500 mm,
NEd in N) used to give a meaningless pass; now it is one line naming the file,
the key, the value and what is expected (exit status 2), and an unusual but
possible value is a warning (stderr, the sheet, ``warnings`` in ``--json``).
The thresholds live in ``optimizer.building.plausibility.LIMITS``.

Closed forms used below: the squash load Ac fcd + As fyd is the NRd of
EN 1992-1-1 5.8.9(4); fcd = alpha_cc fck / gamma_c (Eq. (3.15)); fyd = fyk /
gamma_s (3.2.7(2)); strength classes from EN 1992-1-1 Table 3.1.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest

from design.resistance import SectionBatch
from optimizer.building.plausibility import LIMITS, spec_length_problem, spec_moment_problem, spec_side_problem
from optimizer.cli import main
from optimizer.cli.spec import load_spec_file, section_capacity, section_spec
from tests.support import paths

ROOT = paths.ROOT
EXAMPLE = ROOT / "examples" / "column_slender_biaxial.toml"
TEXT = EXAMPLE.read_text(encoding="utf-8")

# The example: 350 x 450 mm, 4H32 + 4H25, C35/45, B500: As = 4 pi 32^2/4 + 4 pi 25^2/4.
AS = math.pi * (4 * 32**2 + 4 * 25**2) / 4
SQUASH_KN = (350 * 450 * 35 / 1.5 + AS * 500 / 1.15) / 1e3  # EN 1992-1-1 5.8.9(4), Eqs. (3.15), 3.2.7(2)


def _write(tmp_path, old: str, new: str, name: str = "col.toml") -> Path:
    assert old in TEXT, old
    p = tmp_path / name
    p.write_text(TEXT.replace(old, new, 1), encoding="utf-8")
    return p


def _error(capsys, argv: list[str]) -> str:
    assert main(argv) == 2
    captured = capsys.readouterr()
    lines = [ln for ln in captured.err.splitlines() if ln.strip()]
    assert len(lines) == 1, captured.err
    assert "Traceback" not in captured.err and captured.out == ""
    return lines[0]


# --------------------------------------------------------------------------- errors: values no one can mean

ERRORS = [
    # (old, new, what the one line must say)
    (
        "height = 6500 ",
        "height = 6.5 ",
        ("col.toml: height = 6.5: a clear height in mm is expected", "6.5 mm is not a storey", "did you mean 6500?"),
    ),
    ("height = 6500 ", "height = 65 ", ("height = 65:", "did you mean 650?")),
    ("height = 6500 ", "height = 65000 ", ("height = 65000:", "500 mm to 30 m")),
    (
        "NEd = 2100 ",
        "NEd = 2100000 ",
        (
            "NEd = 2100000: a force in kN is expected",
            f"the squash load Ac fcd + As fyd = {SQUASH_KN:,.0f} kN",
            "did you mean 2100 (N typed for kN)?",
        ),
    ),
    ("NEd = 2100 ", "NEd = -2100000 ", ("NEd = -2100000:", "tension resistance As fyd")),
    (
        "My = [95, -40]",
        "My = [95000000, -40]",
        ("My[0] = 95000000: a moment in kNm is expected", "did you mean 95 (N mm typed for kNm)?"),
    ),
    ("Mz = [30, 15]", "Mz = [30, 150000]", ("Mz[1] = 150000:", "an eccentricity M/NEd of 71 m")),
    ("b = 350", "b = 0.35", ("b = 0.35: a section dimension in mm is expected", "did you mean 350?")),
    ("h = 450", "h = 45000", ("h = 45000: a section dimension in mm is expected", "100 to 5000 mm")),
    ("dia = 25", "dia = 0.025", ("bars.dia = 0.025: a bar diameter in mm is expected", "did you mean 25?")),
    ("cover = 35", "cover = 0.035", ("cover = 0.035: a nominal cover in mm is expected", "did you mean 35?")),
    ("l0_fi = 2800 ", "l0_fi = 2.8 ", ("l0_fi = 2.8: an effective length in mm is expected", "did you mean 2800?")),
    (
        'grade = "C35/45"',
        'grade = "C35"',
        ("grade = 'C35': a strength class of EN 1992-1-1 Table 3.1 written in full", "did you mean C35/45?"),
    ),
    ('grade = "C35/45"', 'grade = "35/45"', ("grade = '35/45'", "did you mean C35/45?")),
    ('grade = "C35/45"', 'grade = "C35/40"', ("grade = 'C35/40'", "did you mean C35/45?")),
    ('grade = "C35/45"', 'grade = "C33/40"', ("grade = 'C33/40'", "did you mean C")),
    ('grade = "C35/45"', "grade = 35", ("grade = 35:", "written in full")),
]


@pytest.mark.parametrize(("old", "new", "needles"), ERRORS, ids=[e[1].strip() for e in ERRORS])
def test_value_that_cannot_be_meant_is_one_clear_error(tmp_path, capsys, old, new, needles):
    line = _error(capsys, ["check", str(_write(tmp_path, old, new))])
    for needle in needles:
        assert needle in line, (needle, line)


def test_mm_slip_in_an_effective_length_names_the_key(tmp_path, capsys):
    spec = tmp_path / "l0.toml"
    text = TEXT.replace("k1y = 0.4\nk2y = 0.6\n", "l0y = 4.9\n")
    assert "l0y = 4.9" in text
    spec.write_text(text, encoding="utf-8")
    line = _error(capsys, ["check", str(spec)])
    assert "l0y = 4.9: an effective length in mm is expected" in line and "did you mean 4900?" in line


def test_derived_effective_length_beyond_30_m_is_an_error(tmp_path, capsys):
    """l0 from Eq. (5.16) of a 25 m clear height, unbraced, k = 1: far beyond 30 m."""
    spec = _write(tmp_path, "height = 6500 ", "height = 25000 ")
    text = spec.read_text(encoding="utf-8").replace("braced = true", "braced = false")
    spec.write_text(text, encoding="utf-8")
    line = _error(capsys, ["check", str(spec)])
    assert "l0y = " in line and "Eq. (5.16)" in line and "30 m" in line


@pytest.mark.parametrize("grade", ["C35", "c35", "C 35", "C35/"])
def test_section_command_refuses_a_partial_class_name(tmp_path, capsys, grade):
    p = tmp_path / "s.json"
    p.write_text(
        json.dumps(
            {
                "b": 400,
                "h": 600,
                "cover": 35,
                "link": 10,
                "grade": grade,
                "fyk": 500,
                "bars": {"dia": 25, "nb": 3, "nh": 4},
            }
        ),
        encoding="utf-8",
    )
    line = _error(capsys, ["section", str(p)])
    assert "s.json" in line and "grade" in line and "did you mean C35/45?" in line


@pytest.mark.parametrize(
    ("fck", "cube"),
    [
        (12, 15),
        (16, 20),
        (20, 25),
        (25, 30),
        (30, 37),
        (35, 45),
        (40, 50),
        (45, 55),
        (50, 60),
        (55, 67),
        (60, 75),
        (70, 85),
        (80, 95),
        (90, 105),
    ],
)
def test_every_class_of_table_3_1_is_read_in_full(tmp_path, fck, cube):
    """EN 1992-1-1 Table 3.1: fck,cube for each strength class (C12/15 ... C90/105)."""
    data = load_spec_file(EXAMPLE)
    data["grade"] = f"C{fck}/{cube}"
    spec = section_spec(data, str(EXAMPLE), extra_keys=set(data) - {"grade"})
    assert spec.design.concrete.fck == pytest.approx(fck)


# --------------------------------------------------------------------------- warnings: possible but unusual


def test_NEd_above_the_squash_load_warns_and_fails(tmp_path, capsys):
    spec = _write(tmp_path, "NEd = 2100 ", "NEd = 6500 ")
    assert main(["check", str(spec), "--json"]) == 1
    captured = capsys.readouterr()
    out = json.loads(captured.out)
    assert out["ok"] is False
    assert len(out["warnings"]) == 1
    w = out["warnings"][0]
    assert w.startswith(f"{spec}: NEd = 6500: above the squash load") and f"{SQUASH_KN:,.0f} kN" in w
    assert captured.err.strip() == f"colstack check: warning: {w}"
    # the text sheet lists it too
    assert main(["check", str(spec)]) == 1
    assert w in capsys.readouterr().out


def test_very_slender_length_warns(tmp_path, capsys):
    """l0/h = 25,000 / 350 = 71 about z (b = 350 mm), over the warning threshold of 60."""
    spec = tmp_path / "slender.toml"
    text = TEXT.replace("k1z = 0.5\nk2z = 0.8\n", "l0z = 25000\n")
    spec.write_text(text, encoding="utf-8")
    main(["check", str(spec), "--json"])
    out = json.loads(capsys.readouterr().out)
    assert [w for w in out["warnings"] if "l0z = 25000: l0z/b = 71" in w], out["warnings"]


def test_moment_above_any_resistance_warns(tmp_path, capsys):
    """A moment above (Ac fcd + As fyd) h/2 but not absurd (3,000 kNm on this column)."""
    spec = _write(tmp_path, "My = [95, -40]", "My = [3000, -40]")
    assert main(["check", str(spec), "--json"]) == 1
    out = json.loads(capsys.readouterr().out)
    assert [w for w in out["warnings"] if "My[0] = 3000: above (Ac fcd + As fyd) h/2" in w], out["warnings"]


@pytest.mark.parametrize(
    "example", sorted(p for p in (ROOT / "examples").glob("*") if not p.name.startswith("study")), ids=lambda p: p.name
)
def test_bundled_examples_give_no_warning(capsys, example):
    cmd = "check" if "column" in example.name else "fire" if "fire" in example.name else "section"
    code = main([cmd, str(example), "--json"])
    captured = capsys.readouterr()
    assert code == 0 and captured.err == ""
    assert json.loads(captured.out)["warnings"] == []


# --------------------------------------------------------------------------- the thresholds themselves


def test_moment_bound_is_above_every_resistance_of_the_section():
    """(Ac fcd + As fyd) h/2 bounds MRd at every NEd: each stress resultant acts within h/2 of the centroid."""
    spec = section_spec(load_spec_file(EXAMPLE), str(EXAMPLE), extra_keys=set(load_spec_file(EXAMPLE)))
    cap = section_capacity(spec.design)
    assert cap.squash_kN == pytest.approx(SQUASH_KN, rel=1e-9)
    batch = SectionBatch([spec.design])
    for axis in ("y", "z"):
        _, M = batch.interaction_curve(axis, 181, positive=True)
        assert float(np.max(np.abs(M))) / 1e6 < cap.moment_bound_kNm


def test_thresholds_as_documented():
    """The limits the README states: lengths 500 mm..30 m, sides 100 mm..5 m, 50 x squash, l0/h 60."""
    assert LIMITS["spec_length_mm_min"] == pytest.approx(500.0)
    assert LIMITS["spec_length_mm_max"] == pytest.approx(30000.0)
    assert LIMITS["size_mm_min"] == pytest.approx(100.0) and LIMITS["size_mm_max"] == pytest.approx(5000.0)
    assert LIMITS["spec_force_over_squash_error"] == pytest.approx(50.0)
    assert LIMITS["spec_l0_over_side_warn"] == pytest.approx(60.0)
    assert spec_length_problem(500.0, "height") is None and spec_length_problem(30000.0, "l0") is None
    assert spec_length_problem(499.0, "height") is not None and spec_length_problem(30001.0, "l0") is not None
    assert spec_side_problem(100.0) is None and spec_side_problem(99.0) is not None
    spec = section_spec(load_spec_file(EXAMPLE), str(EXAMPLE), extra_keys=set(load_spec_file(EXAMPLE)))
    cap = section_capacity(spec.design)
    # a large moment with a large NEd is plausible; the same moment at 1 kN is an eccentricity of km
    assert spec_moment_problem(cap.moment_bound_kNm * 10, 2100.0, cap) is None
    assert spec_moment_problem(cap.moment_bound_kNm * 10, 1.0, cap) is not None
    assert spec_moment_problem(cap.moment_bound_kNm * 51, 1e6, cap) is not None
