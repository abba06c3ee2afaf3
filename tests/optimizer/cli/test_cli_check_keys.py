"""`colstack check` keys for the safety review: unbraced members, creep, c, laps, links, shear, stresses.

The worked examples are those of tests/test_safety_review.py (EN 1992-1-1 clauses cited there), run
through the command line: what a user types reaches the member check, and the exit status says
whether the column passes (0), fails (1) or the input is wrong (2).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from optimizer.cli import main

UNBRACED = """
b = 400
h = 400
cover = 30
link = 8
grade = "C30/37"
fyk = 500
NEd = 1500
My = [200, -200]
height = 3000
k1y = 0.3
k2y = 0.3
k1z = 0.3
k2z = 0.3
phi_ef = 0
{extra}
[bars]
dia = 20
nb = 3
nh = 3
"""


def _run(tmp_path: Path, capsys, extra: str = "", json_out: bool = True) -> tuple[int, dict | str]:
    spec = tmp_path / "col.toml"
    spec.write_text(UNBRACED.format(extra=extra))
    args = ["check", str(spec)] + (["--json"] if json_out else [])
    code = main(args)
    out = capsys.readouterr()
    if json_out and code in (0, 1):
        return code, json.loads(out.out)
    return code, out.out + out.err


def test_braced_false_reaches_the_member_check(tmp_path, capsys):
    """5.8.3.1(1), 5.8.8.2: before the fix `braced = false` changed only l0 (a pass at about 0.9)."""
    code_b, braced = _run(tmp_path, capsys, "braced = true")
    code_u, unbraced = _run(tmp_path, capsys, "braced = false")
    assert code_b == 0 and braced["utilisation_resistance"] < 1.0
    assert code_u == 1 and unbraced["utilisation_resistance"] > 1.0
    assert unbraced["values"]["C_y"] == pytest.approx(0.7)
    assert unbraced["values"]["braced"] is False


def test_creep_keys_and_ratio(tmp_path, capsys):
    """5.8.4: phi_ef given (0 here) wins and is said to be given; without it Annex B with the given
    conditions (RH 80 %, class R) and the ratio: phi_ef = phi(inf, t0) x 0.6."""
    code, out = _run(tmp_path, capsys, "braced = true")
    assert out["values"]["phi_ef"] == pytest.approx(0.0)
    assert out["values"]["phi_ef_source"] == "given"
    spec = tmp_path / "creep.toml"
    spec.write_text(
        UNBRACED.format(extra='braced = true\nM0Eqp_ratio = 0.6\nrelative_humidity = 80\ncement_class = "R"').replace(
            "phi_ef = 0\n", ""
        )
    )
    assert main(["check", str(spec), "--json"]) in (0, 1)
    v = json.loads(capsys.readouterr().out)["values"]
    assert "RH 80 %" in v["creep_conditions"] and "class R" in v["creep_conditions"]
    assert v["phi_ef"] == pytest.approx(0.6 * v["phi_inf"], rel=1e-9)
    assert v["M0Eqp_ratio"] == pytest.approx(0.6)


def test_k_below_0_1_is_raised_and_said(tmp_path, capsys):
    """5.8.3.2(3): k = 0 (full fixity) is raised to the recommended minimum 0.1, and the sheet says so."""
    spec = tmp_path / "k.toml"
    spec.write_text(UNBRACED.format(extra="").replace("k1z = 0.3", "k1z = 0").replace("k2z = 0.3", "k2z = 0"))
    assert main(["check", str(spec)]) in (0, 1)
    out = capsys.readouterr().out
    assert "k1z = 0, k2z = 0 raised to the recommended minimum 0.1" in out


def test_lap_links_shear_and_exposure_keys(tmp_path, capsys):
    extra = (
        'braced = true\nAs_below = 9000\ns_link = 450\nVEd = 50\nexposure = "XC4+XF1"\n'
        "char_ratio = 0.7\ncurvature_c = 10"
    )
    code, out = _run(tmp_path, capsys, extra)
    assert code == 1  # the link spacing given (450 mm > 400 mm) fails
    checks = {c["name"]: c for c in out["checks"]}
    assert checks["maximum reinforcement at laps"]["demand"] == pytest.approx(9000 + 2513.3, rel=1e-3)
    assert checks["link spacing"]["demand"] == pytest.approx(450.0)
    assert checks["link spacing"]["capacity"] == pytest.approx(400.0)  # min(20 x 20, 400, 400) mm, 9.5.3(3)
    assert "shear along z" in checks
    assert out["values"]["VEd_z"] == pytest.approx((200e6 + 200e6) / 3000.0 + 50e3, rel=1e-9)
    assert "indicative strength class (Annex E)" in checks
    assert out["values"]["c_y"] == pytest.approx(10.0)


@pytest.mark.parametrize(
    ("extra", "key"),
    [
        ("M0Eqp_ratio = 3", "M0Eqp_ratio"),
        ("s_link = -5", "s_link"),
        ('cement_class = "Q"', "cement_class"),
        ("relative_humidity = 5", "relative_humidity"),
        ("curvature_c = 6", "curvature_c"),
        ('exposure = "XF1"', "exposure"),
        ('exposure = "XC9"', "exposure"),
    ],
)
def test_bad_values_of_the_new_keys_are_one_clear_error(tmp_path, capsys, extra, key):
    code, text = _run(tmp_path, capsys, extra, json_out=False)
    assert code == 2
    assert key in text and "Traceback" not in text
