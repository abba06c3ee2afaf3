"""Member check against published EC2 column examples.

Source (one book, three of its column examples):

    The Concrete Centre, "Worked Examples to Eurocode 2: Volume 1",
    Section 5 "Columns" (UK National Annex values: alpha_cc = 0.85,
    gamma_c = 1.5, gamma_s = 1.15). Authors C. H. Goodchild, R. M. Webster
    and K. S. Elliott (authorship recalled from memory). Section 5 covers
    5.2 a non-slender column designed with charts, 5.3 a perimeter column,
    5.4 an internal column and 5.5 a slender column needing R120.

Where the numbers were read: excerpts of a stored public copy of that
chapter (OCR text) at

    [A] https://www.eurocode.us/concrete-structures-eurocode-3/general-1.html
        (list of the examples 5.2 - 5.5)
    [B] https://www.eurocode.us/concrete-structures-eurocode-3/check-for-biaxial-bending.html
        (example 5.2, biaxial check)
    [C] https://www.eurocode.us/concrete-structures-eurocode-3/design-moments-medz-about-z-axis.html
        (example 5.5, design moment about z, nominal curvature)
    [D] https://www.eurocode.us/concrete-structures-eurocode-3/fire-resistance-xsq.html
        (example 5.5, reinforcement and fire check)

Only numbers are taken; every one is listed below the test that uses it with
its page. The OCR is imperfect: where a number had to be reconstructed this
is said, with the check that fixes it. The three tests:

1. ``test_example_twe1_5_2`` - short braced 300x300 column, biaxial bending,
   criteria (5.38), exponent a, Eq. (5.39) with the book's 4H25.
2. ``test_example_twe1_5_5`` - slender braced 350x350 column, nominal
   curvature: lambda, Kr, Kphi, e2, M2, M02, NEd e0, and the book's
   4H32 + 4H25 passing in bending.
3. ``test_example_twe1_5_2_minimum_eccentricity`` - the direction of the
   example 5.2 column with no first-order moment, where the design moment is
   NEd e0 with e0 = max(h/30, 20 mm) (EN 1992-1-1, 6.1(4)).

Run time is about two seconds (each check_column call is one small batch).
"""

from __future__ import annotations

import pytest

from design.materials import Concrete, Reinforcement
from design.member import CheckSettings, ColumnActions, check_column
from design.params import EN_RECOMMENDED, with_overrides
from design.resistance import DesignSection, moment_resistance
from design.second_order import biaxial, nominal_curvature
from design.second_order.imperfections import ImperfectionMethod
from design.sections import RectBars, RectSection

# The book uses the UK National Annex: alpha_cc = 0.85 (fcd = 0.85 x 30 / 1.5 = 17.0 MPa,
# read in [B]: "300^2 x 0.85 x 30 / 1.5 = 1530.0 kN").
UK_LIKE = with_overrides(EN_RECOMMENDED, alpha_cc=0.85)
C30 = Concrete(30.0, alpha_cc=0.85)
B500 = Reinforcement(500.0)

kN = 1e3
kNm = 1e6


def _design(b: float, h: float, bars: RectBars, cover: float = 35.0, link: float = 8.0) -> DesignSection:
    return DesignSection(RectSection(b, h, cover, link, bars), C30, B500)


def _bending_checks_ok(res) -> bool:
    names = ("axial resistance", "bending about y", "bending about z", "biaxial interaction")
    return all(res.check(n).utilisation <= 1.0 + 1e-9 for n in names)


# --------------------------------------------------------------------------------------
# Example 5.2: short braced column, biaxial bending
# --------------------------------------------------------------------------------------
#
# Read in [B]:
#   4 no. H25, As = 1964 mm2; As fyk / (b h fck) = 0.36
#   NEd / (b h fck) = 0.6            -> NEd = 0.6 x 300 x 300 x 30 = 1620 kN
#   MEd / (b h^2 fck) = 0.094 interpolated between the charts for d2/h = 0.15 and 0.20
#                                    -> MRd = 76.1 kNm (same both ways, square, 4 bars)
#   NRd = Ac fcd + As fyd = 1530.0 + 853.9 = 2383.9 kN
#   a = 1.48 (interpolated between 1.0 at NEd/NRd = 0.1 and 1.5 at 0.7)
#   "as a worst case MEdy may coexist with e0 NEd about the orthogonal axis"
#   "biaxial check required", (.../76.1)^1.48 + (.../76.1)^1.48 = 0.36 + 0.28 = 0.64, OK
# Reconstructed from the OCR: the two moments print as "S8.5" and "S2.4". They are
#   38.5 kNm and 32.4 kNm: 32.4 = 0.02 x 1620 (the e0 NEd the text names), and
#   (38.5/76.1)^1.48 = 0.365, (32.4/76.1)^1.48 = 0.283 give the book's 0.36 and 0.28.
# Assumed, not read: 35 mm cover to 8 mm links (the cover read for example 5.5 in [D]);
#   it gives d2/h = (35 + 8 + 12.5)/300 = 0.185, inside the 0.15 - 0.20 range the book
#   interpolates in, which is all [B] says about the bar position.
# l0 of this column was not among the values found. The book classes it as not slender;
#   l0 = 1500 mm (lambda = 17.3, below lambda_lim = 33.6 here) only reproduces that
#   class. The book's 38.5 kNm already contains its imperfection moment, so the
#   first-order input is 38.5 kNm less ei NEd with ei = l0/400: MEdy = 38.5 kNm
#   whatever l0 is.
#
# Method differences:
# * The book reads MRd from design charts (two charts and an interpolation in d2/h);
#   the code integrates the parabola-rectangle law (6.1). Tolerance on MRd: 6 %
#   (reading MEd/bh^2fck = 0.094 to +-0.002 is already +-2 %, the d2/h
#   interpolation and the assumed cover add the rest). Measured: -5.1 %.
# * Eq. (5.39) raises MRd to the power a = 1.48, so a 6 % spread on MRd is about 9 %
#   on the interaction value: tolerance 10 % (measured +9 %, fully explained by MRd:
#   the book's formula with the code's MRd is matched to 0.5 %).
# * "MEdy may coexist with e0 NEd about the orthogonal axis" is the code's
#   min_eccentricity="both-axes" setting (the default). The option "one-axis-at-a-time" pairs the
#   imperfection and e0 about one axis only and gives a lower interaction value
#   (0.61 here, against 0.70 with both axes and the book's 0.64); this difference is
#   asserted below so that a change of either route is noticed.

EX52_NED = 1620.0 * kN
EX52_MEDY = 38.5 * kNm
EX52_L0 = 1500.0


def _ex52_actions() -> ColumnActions:
    ei = EX52_L0 / 400.0
    return ColumnActions(
        NEd=EX52_NED, My_top=EX52_MEDY - ei * EX52_NED, My_bot=0.0, l0y=EX52_L0, l0z=EX52_L0, phi_ef=None
    )


EX52_BOTH = CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED, min_eccentricity="both-axes")


def test_example_twe1_5_2():
    ds = _design(300.0, 300.0, RectBars(25.0, 2, 2))
    assert ds.section.As == pytest.approx(1964.0, rel=1e-3)  # [B]

    res = check_column(ds, _ex52_actions(), EX52_BOTH, UK_LIKE)
    v = res.values

    # Design moments as in the book: 38.5 kNm about y, e0 NEd = 0.02 x 1620 = 32.4 kNm about z.
    # About y (rm = 0, C = 1.7, as the book assumes) the column is not slender. About z there is
    # no first-order moment, so rm = 1 and C = 0.7 (5.8.3.1(1)) and at n = 1.06 the code finds
    # lambda_lim_z = 13.5 < 17.3; its M0e_z + M2_z (about 14 kNm with phi_ef from Annex B and
    # c = 8 for the constant imperfection moment, 5.8.8.2(4)) stays below e0 NEd, so MEdz is
    # the book's 32.4 kNm all the same.
    assert v["slender_y"] is False
    assert v["M0e_z"] + v["M2_z"] < 0.5 * v["MEdz"]
    assert v["MEdy"] / kNm == pytest.approx(38.5, rel=0.01)
    assert v["MEdz"] / kNm == pytest.approx(32.4, rel=0.01)

    # (5.38a) holds for a square column with equal l0; (5.38b) fails: 32.4/38.5 = 0.84 > 0.2,
    # so the book's "biaxial check required".
    assert v["criterion_5_38a"] is True
    assert v["criterion_5_38b"] is False
    assert v["separate_checks"] is False

    # NRd of 5.8.9(4) and the exponent a: same formula as the book, 1 %.
    assert v["NRd_5_39"] / kN == pytest.approx(2383.9, rel=0.01)
    assert v["a"] == pytest.approx(1.48, rel=0.01)

    # MRd against the chart reading (6 %, see above).
    assert v["MRdy"] / kNm == pytest.approx(76.1, rel=0.06)
    assert v["MRdz"] / kNm == pytest.approx(76.1, rel=0.06)
    assert moment_resistance(ds, EX52_NED, "y") == pytest.approx(v["MRdy"], rel=1e-9)

    # Eq. (5.39): the book's formula with the code's own MRd (tight), and the value itself
    # against the book's 0.64 (10 %, the MRd spread raised to the power a).
    u_book_formula = (38.5 * kNm / v["MRdy"]) ** 1.48 + (32.4 * kNm / v["MRdz"]) ** 1.48
    assert v["interaction_5_39"] == pytest.approx(u_book_formula, rel=0.005)
    assert v["interaction_5_39"] == pytest.approx(0.64, rel=0.10)
    assert biaxial.biaxial_interaction(v["MEdy"], v["MRdy"], v["MEdz"], v["MRdz"], v["a"]) == pytest.approx(
        v["interaction_5_39"], rel=1e-9
    )

    # Outcome: the book's 4H25 pass; a clearly lighter 4H20 (-36 % steel) fails on Eq. (5.39).
    assert _bending_checks_ok(res)
    assert res.ok
    light = check_column(_design(300.0, 300.0, RectBars(20.0, 2, 2)), _ex52_actions(), EX52_BOTH, UK_LIKE)
    assert not light.ok
    assert light.governing.name == "biaxial interaction"
    assert light.values["interaction_5_39"] > 1.2

    # The option "one axis at a time" is less onerous than the book's "worst case" (the default).
    one = check_column(
        ds,
        _ex52_actions(),
        CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED, min_eccentricity="one-axis-at-a-time"),
        UK_LIKE,
    )
    assert one.values["interaction_5_39"] < v["interaction_5_39"]
    assert one.values["interaction_5_39"] < 0.64


# --------------------------------------------------------------------------------------
# Example 5.5: slender braced column, nominal curvature (5.8.8)
# --------------------------------------------------------------------------------------
#
# Read in [C] (bending about z):
#   M02 = 146.1 kNm from analysis + ei NEd with ei = l0/400 = 2965/400, NEd = 1836 kN
#       = 146.1 + 13.6; minimum e0 NEd = 0.02 x 1836 = 36.7 kNm
#   lambda = 29.3 (l0 = 2965 mm, h = 350 mm)
#   Kr = (2.08 - 0.83)/(2.08 - 0.40) = 0.74        (nu = 1 + omega = 2.08, n = 0.83)
#   beta = 0.35 + 30/200 - 29.3/150 = 0.305; Kphi = 1.51 (phi(inf,t0) = 2.4, inside, h = 350)
#   fyd = 434.8 MPa, Es = 200000 MPa, d = 350 - 35 - 8 - 16 = 291 mm
#   1/r = 0.74 x 1.51 x 434.8 / (200000 x 0.45 x 291) = 1.86e-5 /mm
#   e2 = 1.86e-5 x 2965^2 / 10 = 16.3 mm
# Read in [D]: 350 mm square, 4 no. H32 + 4 no. H25 = 5180 mm2 (4.2 %), 35 mm cover to
#   8 mm links; Ac fcd = 2082.5 kN, As fyd = 2252.0 kN; NEd = 1722.7 kN in the fire check.
# Derived: phi_ef = (1.51 - 1)/0.305 = 1.67 (the value behind the book's Kphi).
#   M2 = NEd e2 = 1836 x 16.3 = 29.9 kNm.
# Not found: the smaller end moment M01 and the book's lambda_lim. The book treats the
#   column as slender about z, which with lambda = 29.3 needs a small C; the test uses
#   C = 0.7 (rm not relied on, moments_from_analysis=False) and a zero bottom moment.
#   For any M01 up to M02 - 2.5 M2 = 85 kNm the design moment is then M02 = 159.7 kNm;
#   the bounding case M01 = M02 (single curvature) is checked for the outcome.
#
# Method differences (measured per value):
# * n: the book's Kr uses n = 0.83, i.e. NEd = 0.83 x 2082.5 = 1728 kN - the axial force
#   of its fire check (1722.7 kN), not the 1836 kN of its moments. The code takes n from
#   the NEd it is given (1836 kN: n = 0.882, Kr = 0.714, -3.6 % against 0.74). Kr itself
#   is compared at the book's n (1 %).
# * d: the book uses the corner-bar depth 291 mm; the code uses Eq. (5.35),
#   d = h/2 + i_s over all eight bars (280.2 mm, -3.7 %), which 5.8.8.3(2) asks for when
#   the bars are not all on two opposite faces. e2 is compared after scaling both
#   factors back to the book's inputs (1 %) and directly (5 %: the two differences
#   happen to cancel, measured +0.1 %).
# * 4.2 % steel exceeds As,max = 0.04 Ac of 9.5.2(3); the book accepts it ("say 4.2 %
#   OK"), the code flags it. Only the resistance checks are asserted to pass.

EX55_NED = 1836.0 * kN
EX55_L0 = 2965.0
EX55_PHI_EF = (1.51 - 1.0) / 0.305
EX55_BARS = RectBars(25.0, 3, 3, corner_dia=32.0)
EX55_SETTINGS = CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED)


def _ex55_actions(M_bot: float = 0.0, from_analysis: bool = False) -> ColumnActions:
    return ColumnActions(
        NEd=EX55_NED,
        Mz_top=146.1 * kNm,
        Mz_bot=M_bot,
        l0y=EX55_L0,
        l0z=EX55_L0,
        phi_ef=EX55_PHI_EF,
        moments_from_analysis=from_analysis,
    )


def test_example_twe1_5_5():
    ds = _design(350.0, 350.0, EX55_BARS)
    sec = ds.section
    assert sec.As == pytest.approx(5180.0, rel=1e-3)  # [D]
    assert ds.concrete.fcd * sec.Ac / kN == pytest.approx(2082.5, rel=1e-3)  # [D]
    assert ds.steel.fyd * sec.As / kN == pytest.approx(2252.0, rel=1e-3)  # [D]

    res = check_column(ds, _ex55_actions(), EX55_SETTINGS, UK_LIKE)
    v = res.values
    assert v["imperfection_axis"] == "z"

    # Slenderness and creep factor: same formulas and inputs, 1 %.
    assert v["lambda_z"] == pytest.approx(29.3, rel=0.01)
    assert v["slender_z"] is True
    assert v["lambda_z"] > v["lambda_lim_z"]
    assert nominal_curvature.beta_creep(30.0, v["lambda_z"]) == pytest.approx(0.305, rel=0.01)
    assert v["Kphi_z"] == pytest.approx(1.51, rel=0.01)
    assert v["omega"] == pytest.approx(2.08 - 1.0, rel=0.01)

    # Kr at the book's n = 0.83 (1 %); the member check's own Kr uses n from 1836 kN.
    assert nominal_curvature.Kr(0.83, v["omega"]) == pytest.approx(0.74, rel=0.01)
    n_1836 = EX55_NED / (sec.Ac * ds.concrete.fcd)
    assert v["n"] == pytest.approx(n_1836, rel=1e-9)
    assert v["Kr_z"] == pytest.approx(nominal_curvature.Kr(n_1836, v["omega"]), rel=1e-9)

    # e2: scaled back to the book's Kr, d and c (1 %), and as computed (5 %). The book takes
    # c = 10; the code lowers c towards 8 as the first-order moment approaches a constant
    # (5.8.8.2(4)): here the imperfection moment at the bottom end gives rm = 13.6/159.7 and
    # c = 10 - 2 x 0.085 = 9.83.
    d_code = sec.effective_depth("z")
    assert d_code == pytest.approx(280.2, abs=0.5)  # Eq. (5.35) for 4H32 + 4H25
    assert v["c_z"] == pytest.approx(10.0 - 2.0 * 13.6 / 159.7, rel=0.01)
    e2_book_inputs = v["e2_z"] * (0.74 / v["Kr_z"]) * (d_code / 291.0) * (v["c_z"] / 10.0)
    assert e2_book_inputs == pytest.approx(16.3, rel=0.01)
    assert v["e2_z"] == pytest.approx(16.3, rel=0.05)
    assert v["M2_z"] / kNm == pytest.approx(1836.0 * 16.3e-3, rel=0.05)

    # First-order moment with the imperfection, and the minimum moment (20 mm > 350/30).
    assert v["M02_z"] / kNm == pytest.approx(146.1 + 13.6, rel=0.01)
    assert v["e0_z"] == pytest.approx(20.0)
    assert v["e0_z"] * EX55_NED / kNm == pytest.approx(36.7, rel=0.01)

    # Design moment (5.31): with M01 ~ 0 the end moment M02 governs.
    assert v["M0e_z"] + v["M2_z"] < v["M02_z"]
    assert v["MEdz"] / kNm == pytest.approx(159.7, rel=0.01)

    # Outcome: the book's bars resist the bending in the bounding single-curvature case
    # too; 4H25 alone (38 % of the steel) does not.
    # In that bounding case the first-order moment is constant, so c = 8 (5.8.8.2(4)) and
    # MEd = M0e + M2 at mid-height (the book's M2 scaled by 10/8: the code's Kr and d differ
    # from the book's as measured above).
    bound = check_column(ds, _ex55_actions(M_bot=146.1 * kNm), EX55_SETTINGS, UK_LIKE)
    bv = bound.values
    assert bv["c_z"] == pytest.approx(8.0)
    assert bv["MEdz"] == pytest.approx(bv["M0e_z"] + bv["M2_z"], rel=1e-9)
    assert bv["M2_z"] == pytest.approx(v["M2_z"] * v["c_z"] / 8.0, rel=1e-9)
    for r in (res, bound):
        assert _bending_checks_ok(r)
        # 4.2 % > 4 %: flagged by the code, accepted by the book (see above).
        assert r.check("maximum longitudinal reinforcement").utilisation > 1.0
        assert r.governing.name == "maximum longitudinal reinforcement"
    light = check_column(_design(350.0, 350.0, RectBars(25.0, 2, 2)), _ex55_actions(), EX55_SETTINGS, UK_LIKE)
    assert light.check("bending about z").utilisation > 1.1


# --------------------------------------------------------------------------------------
# Example 5.2, direction without first-order moment: minimum eccentricity governs
# --------------------------------------------------------------------------------------
#
# In [B] the moment about the axis without first-order moment is e0 NEd = 32.4 kNm with
# NEd = 1620 kN: e0 = max(h/30, 20 mm) = max(10, 20) = 20 mm (EN 1992-1-1, 6.1(4)). In
# [C] the same rule gives 0.02 x 1836 = 36.7 kNm for h = 350 (350/30 = 11.7 < 20).
# Here the column carries NEd alone. With the code's default (imperfection and e0 about
# one axis at a time) MEd = max(ei NEd, e0 NEd) = e0 NEd about the imperfection axis,
# since ei = l0/400 = 3.75 mm < 20 mm (true for any l0 < 8 m; l0 as in the first test), and
# here also above M0e + M2 = ei NEd + NEd e2 (about 9 kNm: with rm = 1 for a column without
# first-order moments the code classes it as slender at n = 1.06).
# Outcome: 32.4 kNm against MRd (about 72 kNm, see the first test): passes, as the book's
# column does.


def test_example_twe1_5_2_minimum_eccentricity():
    ds = _design(300.0, 300.0, RectBars(25.0, 2, 2))
    act = ColumnActions(NEd=EX52_NED, l0y=EX52_L0, l0z=EX52_L0)
    res = check_column(
        ds,
        act,
        CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED, min_eccentricity="one-axis-at-a-time"),
        UK_LIKE,
    )
    v = res.values
    ax = v["imperfection_axis"]
    other = "z" if ax == "y" else "y"

    assert v[f"e0_{ax}"] == pytest.approx(max(300.0 / 30.0, 20.0))
    assert v[f"ei_{ax}"] * EX52_NED < v[f"e0_{ax}"] * EX52_NED
    assert v[f"MEd{ax}"] / kNm == pytest.approx(32.4, rel=0.01)
    # About the other axis: no first-order moment, no imperfection, no e0 (one axis at a time);
    # at n = 1.06 with C = 0.7 the code still adds the nominal second-order moment there
    # (lambda = 17.3 > lambda_lim = 13.5), which stays well below the design moment of the
    # other axis (phi_ef from Annex B, c = 8 for a constant moment).
    assert v[f"MEd{other}"] == pytest.approx(v[f"M2_{other}"], rel=1e-9)
    assert v[f"MEd{other}"] < 0.3 * v[f"MEd{ax}"]
    # With that M2 the relative eccentricities differ by less than the factor 5 of (5.38b), so
    # Eq. (5.39) is evaluated; it stays far below 1.
    assert v["separate_checks"] is False
    assert v["interaction_5_39"] < 0.5

    u = res.check(f"bending about {ax}").utilisation
    assert u == pytest.approx(32.4 * kNm / v[f"MRd{ax}"], rel=1e-6)
    assert u < 0.5
    assert _bending_checks_ok(res)

    # Same rule at the 350 mm column of example 5.5 ([C]: 0.02 x 1836 = 36.7 kNm).
    ds55 = _design(350.0, 350.0, EX55_BARS)
    r55 = check_column(
        ds55,
        ColumnActions(NEd=EX55_NED, l0y=EX52_L0, l0z=EX52_L0),
        CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED),
        UK_LIKE,
    )
    ax55 = r55.values["imperfection_axis"]
    assert r55.values[f"M0e_{ax55}"] + r55.values[f"M2_{ax55}"] < r55.values[f"MEd{ax55}"]
    assert r55.values[f"MEd{ax55}"] / kNm == pytest.approx(36.7, rel=0.01)
