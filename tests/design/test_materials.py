"""Tests of design.materials against EN 1992-1-1 Table 3.1, Eqs. (3.15), (3.19)-(3.22),
Fig. 3.8 and the EN 1992-1-1:2004 material functions of structuralcodes (an
independent open-source implementation).

Strains in design.materials are dimensionless (0.0035); Table 3.1 prints them
in per mille, so the table values below are divided by 1000 before comparing.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from design import materials as mt
from design.materials import Concrete, Reinforcement, parse_concrete_class

sc = pytest.importorskip("structuralcodes.codes.ec2_2004")

# ---------------------------------------------------------------------------------------
# EN 1992-1-1 Table 3.1 (recalled from memory), one row per strength class:
# fck, fck,cube, fcm, fctm, fctk,0.05, Ecm (GPa), eps_c1, eps_cu1, eps_c2, eps_cu2, n,
# eps_c3, eps_cu3 (strains in per mille, as printed in the table).
TABLE_3_1 = [
    # fck cube fcm fctm fctk  Ecm  ec1   ecu1 ec2  ecu2 n     ec3   ecu3
    (12, 15, 20, 1.6, 1.1, 27, 1.8, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (16, 20, 24, 1.9, 1.3, 29, 1.9, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (20, 25, 28, 2.2, 1.5, 30, 2.0, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (25, 30, 33, 2.6, 1.8, 31, 2.1, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (30, 37, 38, 2.9, 2.0, 33, 2.2, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (35, 45, 43, 3.2, 2.2, 34, 2.25, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (40, 50, 48, 3.5, 2.5, 35, 2.3, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (45, 55, 53, 3.8, 2.7, 36, 2.4, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (50, 60, 58, 4.1, 2.9, 37, 2.45, 3.5, 2.0, 3.5, 2.0, 1.75, 3.5),
    (55, 67, 63, 4.2, 3.0, 38, 2.5, 3.2, 2.2, 3.1, 1.75, 1.8, 3.1),
    (60, 75, 68, 4.4, 3.1, 39, 2.6, 3.0, 2.3, 2.9, 1.6, 1.9, 2.9),
    (70, 85, 78, 4.6, 3.2, 41, 2.7, 2.8, 2.4, 2.7, 1.45, 2.0, 2.7),
    (80, 95, 88, 4.8, 3.4, 42, 2.8, 2.8, 2.5, 2.6, 1.4, 2.2, 2.6),
    (90, 105, 98, 5.0, 3.5, 44, 2.8, 2.8, 2.6, 2.6, 1.4, 2.3, 2.6),
]
TABLE_IDS = [f"C{r[0]}/{r[1]}" for r in TABLE_3_1]

# Tolerances = half a unit of the last digit the table prints (plus float slack):
# stresses to 0.1 MPa -> 0.05 MPa; Ecm to 1 GPa -> 0.5 GPa; strains to 0.1 per mille
# (a few to 0.05) -> 0.05 per mille; n to 0.05 -> 0.05.
TOL_STRESS = 0.05 + 1e-9
TOL_ECM = 500.0 + 1e-6  # MPa
TOL_STRAIN = 0.05e-3 + 1e-12
TOL_N = 0.05 + 1e-9
# fctk,0.05 in the table appears to be 0.7 x the *rounded* fctm, then rounded again
# (C60/75: 0.7 x 4.4 = 3.08 -> 3.1, whereas 0.7 x 4.355 = 3.05): allow the rounding of
# fctm carried through the factor 0.7, 0.05 + 0.7 x 0.05 / 2.
TOL_FCTK = 0.05 + 0.0175 + 1e-9


@pytest.mark.parametrize("row", TABLE_3_1, ids=TABLE_IDS)
def test_table_3_1_strengths_and_modulus(row):
    """EN 1992-1-1 Table 3.1 (recalled from memory): fcm, fctm, fctk,0.05, Ecm, one class per row.

    fcm is exact (fck + 8); the others at the table's rounding (see TOL_*).
    """
    fck, _, fcm_t, fctm_t, fctk_t, ecm_t = row[:6]
    assert float(mt.fcm(fck)) == pytest.approx(fcm_t, abs=1e-12)
    assert abs(float(mt.fctm(fck)) - fctm_t) <= TOL_STRESS
    assert abs(float(mt.fctk_005(fck)) - fctk_t) <= TOL_FCTK
    assert abs(float(mt.Ecm(fck)) - 1000.0 * ecm_t) <= TOL_ECM


@pytest.mark.parametrize("row", TABLE_3_1, ids=TABLE_IDS)
def test_table_3_1_strains_and_exponent(row):
    """EN 1992-1-1 Table 3.1 (recalled from memory): eps_c1, eps_cu1, eps_c2, eps_cu2, n, eps_c3, eps_cu3.

    The engine uses the high-strength expressions only for fck > 50, so the C50/60
    column gets the tabulated 2.0 / 3.5 per mille and n = 2.0 (the expressions "for
    fck >= 50" evaluated at 50 give 3.49 per mille and n = 1.999, which the table
    rounds to the same printed values; either way this row must match).
    """
    fck = row[0]
    ec1, ecu1, ec2, ecu2, n, ec3, ecu3 = row[6:]
    assert abs(float(mt.eps_c1(fck)) - ec1 / 1000) <= TOL_STRAIN
    assert abs(float(mt.eps_cu1(fck)) - ecu1 / 1000) <= TOL_STRAIN
    assert abs(float(mt.eps_c2(fck)) - ec2 / 1000) <= TOL_STRAIN
    assert abs(float(mt.eps_cu2(fck)) - ecu2 / 1000) <= TOL_STRAIN
    assert abs(float(mt.n_exponent(fck)) - n) <= TOL_N
    assert abs(float(mt.eps_c3(fck)) - ec3 / 1000) <= TOL_STRAIN
    assert abs(float(mt.eps_cu3(fck)) - ecu3 / 1000) <= TOL_STRAIN


@pytest.mark.parametrize("row", TABLE_3_1, ids=TABLE_IDS)
def test_concrete_dataclass_matches_table_row(row):
    """EN 1992-1-1 Table 3.1 through the Concrete dataclass (class name and properties)."""
    fck, cube = row[0], row[1]
    c = Concrete.from_class(f"C{fck}/{cube}")
    assert c.fck == fck
    assert c.name == f"C{fck}/{cube}"
    assert c.fcm == pytest.approx(row[2], abs=1e-12)
    assert abs(c.fctm - row[3]) <= TOL_STRESS
    assert abs(c.Ecm - 1000.0 * row[5]) <= TOL_ECM
    assert abs(c.eps_c2 - row[8] / 1000) <= TOL_STRAIN
    assert abs(c.eps_cu2 - row[9] / 1000) <= TOL_STRAIN
    assert abs(c.n - row[10]) <= TOL_N


def test_vectorised_functions_broadcast():
    """The functions of fck accept arrays: same values as the scalar calls (Table 3.1 row by row)."""
    fck = np.array([r[0] for r in TABLE_3_1], dtype=float)
    for fn in (
        mt.fcm,
        mt.fctm,
        mt.fctk_005,
        mt.Ecm,
        mt.eps_c1,
        mt.eps_cu1,
        mt.eps_c2,
        mt.eps_cu2,
        mt.n_exponent,
        mt.eps_c3,
        mt.eps_cu3,
        mt.lambda_block,
        mt.eta_block,
    ):
        vec = fn(fck)
        assert vec.shape == fck.shape
        np.testing.assert_allclose(
            vec, [float(fn(f)) for f in fck], rtol=1e-12, atol=0
        )  # a ulp may differ between numpy releases


# ---------------------------------------------------------------------------------------
# structuralcodes (EN 1992-1-1:2004 material functions, module structuralcodes.codes.ec2_2004):
# fcm(fck), fctm(fck), fctk_5(fctm), Ecm(fcm), eps_c1(fcm), eps_cu1(fck), eps_c2(fck),
# eps_cu2(fck), n_parabolic_rectangular(fck), eps_c3(fck), eps_cu3(fck), fcd(fck, alpha_cc,
# gamma_c), fyd(fyk, gamma_s); MPa and dimensionless strains like design.materials.
FCK_SWEEP = [float(f) for f in range(12, 91)] + [50.5, 52.5, 67.5, 89.9]


@pytest.mark.parametrize("fck", FCK_SWEEP)
def test_against_structuralcodes(fck):
    """Every Table 3.1 expression against structuralcodes' EC2-2004 functions, 1e-12 relative."""
    rel = 1e-12
    fcm_ref = sc.fcm(fck)
    fctm_ref = sc.fctm(fck)
    assert float(mt.fcm(fck)) == pytest.approx(fcm_ref, rel=rel)
    assert float(mt.fctm(fck)) == pytest.approx(fctm_ref, rel=rel)
    assert float(mt.fctk_005(fck)) == pytest.approx(sc.fctk_5(fctm_ref), rel=rel)
    assert float(mt.Ecm(fck)) == pytest.approx(sc.Ecm(fcm_ref), rel=rel)
    assert float(mt.eps_c1(fck)) == pytest.approx(sc.eps_c1(fcm_ref), rel=rel)
    assert float(mt.eps_c2(fck)) == pytest.approx(sc.eps_c2(fck), rel=rel)
    assert float(mt.eps_cu2(fck)) == pytest.approx(sc.eps_cu2(fck), rel=rel)
    assert float(mt.n_exponent(fck)) == pytest.approx(sc.n_parabolic_rectangular(fck), rel=rel)
    assert float(mt.eps_c3(fck)) == pytest.approx(sc.eps_c3(fck), rel=rel)
    assert float(mt.eps_cu3(fck)) == pytest.approx(sc.eps_cu3(fck), rel=rel)
    if fck != 50.0:  # see test_eps_cu1_at_c50_threshold
        assert float(mt.eps_cu1(fck)) == pytest.approx(sc.eps_cu1(fck), rel=rel)


def test_eps_cu1_at_c50_threshold():
    """eps_cu1 at fck = 50: structuralcodes applies the high-strength expression from fck = 50
    (2.8 + 27 (40/100)^4 = 3.4912 per mille) while the engine keeps 3.5 up to fck = 50 as
    printed in the C50/60 column of EN 1992-1-1 Table 3.1 (recalled from memory). Both round
    to the table's 3.5; the difference is the documented threshold choice of design.materials.
    """
    assert float(mt.eps_cu1(50.0)) == pytest.approx(3.5e-3, abs=1e-15)
    assert sc.eps_cu1(50.0) == pytest.approx((2.8 + 27 * 0.4**4) / 1000, rel=1e-12)
    assert abs(float(mt.eps_cu1(50.0)) - sc.eps_cu1(50.0)) < 0.01e-3


@pytest.mark.parametrize(
    ("fck", "alpha_cc", "gamma_c"), [(30, 1.0, 1.5), (30, 0.85, 1.5), (45, 0.85, 1.5), (70, 1.0, 1.5), (25, 1.0, 1.2)]
)
def test_fcd_against_structuralcodes_and_hand(fck, alpha_cc, gamma_c):
    """EN 1992-1-1 Eq. (3.15) fcd = alpha_cc fck / gamma_c, by hand and with structuralcodes.fcd."""
    hand = alpha_cc * fck / gamma_c
    assert float(mt.fcd(fck, alpha_cc, gamma_c)) == pytest.approx(hand, rel=1e-14)
    assert float(mt.fcd(fck, alpha_cc, gamma_c)) == pytest.approx(sc.fcd(fck, alpha_cc, gamma_c), rel=1e-14)
    assert Concrete(fck, alpha_cc, gamma_c).fcd == pytest.approx(hand, rel=1e-14)


@pytest.mark.parametrize(("fyk", "gamma_s"), [(500, 1.15), (400, 1.15), (550, 1.15), (500, 1.0)])
def test_fyd_against_structuralcodes_and_hand(fyk, gamma_s):
    """EN 1992-1-1 3.2.7(2), Fig. 3.8: fyd = fyk / gamma_s, by hand and with structuralcodes.fyd."""
    assert float(mt.fyd(fyk, gamma_s)) == pytest.approx(fyk / gamma_s, rel=1e-14)
    assert float(mt.fyd(fyk, gamma_s)) == pytest.approx(sc.fyd(fyk, gamma_s), rel=1e-14)
    assert Reinforcement(fyk, gamma_s=gamma_s).fyd == pytest.approx(fyk / gamma_s, rel=1e-14)


def test_fcd_fyd_worked_values():
    """Hand values: C30/37, alpha_cc = 0.85, gamma_c = 1.5 -> fcd = 17.0 MPa (Eq. (3.15));
    B500, gamma_s = 1.15 -> fyd = 434.78 MPa and eps_yd = 2.174 per mille with Es = 200 GPa
    (3.2.7(4))."""
    assert Concrete(30, 0.85, 1.5).fcd == pytest.approx(17.0, abs=1e-12)
    assert Concrete(30).fcd == pytest.approx(20.0, abs=1e-12)  # EN recommended alpha_cc = 1.0
    s = Reinforcement(500)
    assert s.fyd == pytest.approx(434.7826, abs=1e-4)
    assert s.eps_yd == pytest.approx(2.1739e-3, abs=1e-7)


# ---------------------------------------------------------------------------------------
# Rectangular stress block, EN 1992-1-1 Eqs. (3.19)-(3.22).
@pytest.mark.parametrize(
    ("fck", "lam", "eta"),
    [
        (20, 0.8, 1.0),
        (30, 0.8, 1.0),
        (50, 0.8, 1.0),
        (55, 0.7875, 0.975),
        (60, 0.775, 0.95),
        (70, 0.75, 0.9),
        (80, 0.725, 0.85),
        (90, 0.7, 0.8),
    ],
)
def test_stress_block_factors(fck, lam, eta):
    """EN 1992-1-1 Eqs. (3.19)/(3.20): lambda = 0.8 (fck <= 50), 0.8 - (fck - 50)/400 (50 < fck <= 90);
    Eqs. (3.21)/(3.22): eta = 1.0 (fck <= 50), 1.0 - (fck - 50)/200. Values worked by hand."""
    assert float(mt.lambda_block(fck)) == pytest.approx(lam, abs=1e-14)
    assert float(mt.eta_block(fck)) == pytest.approx(eta, abs=1e-14)
    c = Concrete(fck)
    assert c.lam == pytest.approx(lam, abs=1e-14)
    assert c.eta == pytest.approx(eta, abs=1e-14)


@given(st.floats(min_value=12.0, max_value=90.0))
def test_stress_block_continuous_and_monotone(fck):
    """Eqs. (3.19)-(3.22) join continuously at 50 MPa and never increase with fck."""
    lam, eta = float(mt.lambda_block(fck)), float(mt.eta_block(fck))
    assert 0.7 - 1e-12 <= lam <= 0.8 and 0.8 - 1e-12 <= eta <= 1.0
    assert float(mt.lambda_block(fck + 0.5)) <= lam + 1e-15
    assert float(mt.eta_block(fck + 0.5)) <= eta + 1e-15


@given(st.floats(min_value=12.0, max_value=89.0))
def test_table_3_1_expressions_monotone(fck):
    """Physical sense of Table 3.1: fctm, Ecm, eps_c2 never fall and eps_cu2, n never rise with fck."""
    g = fck + 1.0
    assert float(mt.fctm(g)) >= float(mt.fctm(fck)) - 1e-12
    assert float(mt.Ecm(g)) > float(mt.Ecm(fck))
    assert float(mt.eps_c2(g)) >= float(mt.eps_c2(fck))
    assert float(mt.eps_cu2(g)) <= float(mt.eps_cu2(fck))
    assert float(mt.n_exponent(g)) <= float(mt.n_exponent(fck))
    assert float(mt.eps_cu2(fck)) > float(mt.eps_c2(fck))  # the plateau always exists


# ---------------------------------------------------------------------------------------
# parse_concrete_class: class names "C<fck>/<fck,cube>" of EN 1992-1-1 Table 3.1.
@pytest.mark.parametrize(
    ("text", "fck"),
    [
        ("C30/37", 30.0),
        ("c30/37", 30.0),
        (" C 30 / 37 ", 30.0),
        ("C12/15", 12.0),
        ("C50/60", 50.0),
        ("C55/67", 55.0),
        ("C90/105", 90.0),
    ],
)
def test_parse_concrete_class_good(text, fck):
    """Class names written in full with the cube strength of EN 1992-1-1 Table 3.1."""
    assert parse_concrete_class(text) == fck


@pytest.mark.parametrize(
    "text",
    [
        "C30/35",
        "C30/30",
        "C32/40",
        "C27.5/35",
        "C30/37/45",
        "B30",
        "LC30/33",
        "",
        "C",
        "C/37",
        "C-30",
        "C30x37",
        "thirty",
        "C30",
        "30",
        "35/45",
        "C32",
        "C27.5",
    ],
)
def test_parse_concrete_class_bad(text):
    """Malformed names, names written in part (read silently as a class before: "C35" was taken as
    C35/45) and cube strengths that do not match EN 1992-1-1 Table 3.1 are refused."""
    with pytest.raises(ValueError):
        parse_concrete_class(text)


def test_partial_class_name_says_what_was_meant():
    with pytest.raises(ValueError, match="did you mean 'C35/45'"):
        parse_concrete_class("C35")


@pytest.mark.parametrize("row", TABLE_3_1, ids=TABLE_IDS)
def test_parse_every_table_class(row):
    """Every fck/fck,cube pair of EN 1992-1-1 Table 3.1 (recalled from memory) parses to fck,
    and STANDARD_CLASSES holds the same pair."""
    fck, cube = row[0], row[1]
    assert parse_concrete_class(f"C{fck}/{cube}") == fck
    assert mt.STANDARD_CLASSES[fck] == cube


@pytest.mark.parametrize("fck", [11.9, 95.0, 100.0])
def test_concrete_outside_table_range_refused(fck):
    """EN 1992-1-1 3.1.2(2)P: classes from C12/15 up to C90/105 only."""
    with pytest.raises(ValueError):
        Concrete(fck)


def test_from_class_outside_range_refused():
    """A well-formed name outside EN 1992-1-1 3.1.2(2)P (C100/115) is refused by the dataclass."""
    with pytest.raises(ValueError):
        Concrete.from_class("C100")


def test_hs_threshold_continuity():
    """Just above 50 MPa the high-strength expressions of Table 3.1 join the normal values
    closely (within 0.01 per mille / 0.005 on n): no jump at the switch (EN 1992-1-1 Table 3.1)."""
    f = 50.0 + 1e-9
    assert abs(float(mt.eps_cu2(f)) - 3.5e-3) < 0.01e-3
    assert abs(float(mt.n_exponent(f)) - 2.0) < 0.005
    assert abs(float(mt.eps_c3(f)) - 1.75e-3) < 1e-9
    assert abs(float(mt.fctm(f)) - 0.3 * 50 ** (2 / 3)) < 0.01  # 4.072 vs 4.064 MPa
    assert math.isclose(float(mt.eps_c2(f)), 2.0e-3, abs_tol=1e-7)
