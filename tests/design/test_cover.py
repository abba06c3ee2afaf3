"""Tests of design.cover against EN 1992-1-1 4.4.1, Tables 4.2, 4.3N and 4.4N."""

from __future__ import annotations

import numpy as np
import pytest

from design import cover as cv
from design.cover import ExposureClass as X
from design.params import EN_RECOMMENDED, with_overrides
from design.results import CheckKind

# EN 1992-1-1 Table 4.4N (reinforcing steel), cmin,dur in mm (recalled from memory):
#         X0  XC1 XC2/3 XC4 XD1/XS1 XD2/XS2 XD3/XS3
TABLE_4_4N = {
    1: (10, 10, 10, 15, 20, 25, 30),
    2: (10, 10, 15, 20, 25, 30, 35),
    3: (10, 10, 20, 25, 30, 35, 40),
    4: (10, 15, 25, 30, 35, 40, 45),
    5: (15, 20, 30, 35, 40, 45, 50),
    6: (20, 25, 35, 40, 45, 50, 55),
}
COLUMNS = ((X.X0,), (X.XC1,), (X.XC2, X.XC3), (X.XC4,), (X.XD1, X.XS1), (X.XD2, X.XS2), (X.XD3, X.XS3))


@pytest.mark.parametrize(("s_class", "row"), sorted(TABLE_4_4N.items()))
def test_table_4_4N_rows(s_class, row):
    """EN 1992-1-1 Table 4.4N, one structural class (row) per case, every exposure column."""
    for expected, classes in zip(row, COLUMNS, strict=True):
        for exposure in classes:
            assert float(cv.cmin_dur(exposure, s_class)) == expected, (exposure, s_class)


@pytest.mark.parametrize(
    ("exposure", "fck", "life100", "qc", "s_class"),
    [
        (X.XC1, 25.0, False, False, 4),  # S4 recommended, C25/30 < C30/37
        (X.XC1, 30.0, False, False, 3),  # C30/37 reaches the XC1 strength class: -1
        (X.XC3, 30.0, False, False, 4),  # XC2/XC3 needs C35/45
        (X.XC3, 35.0, False, False, 3),
        (X.XC4, 40.0, False, False, 3),  # C40/50
        (X.XD1, 40.0, False, False, 3),
        (X.XS1, 40.0, False, False, 3),  # XS1 grouped with XD2 in Table 4.3N: C40/50
        (X.XD3, 40.0, False, False, 4),  # XD3/XS2/XS3 needs C45/55
        (X.XS2, 45.0, False, False, 3),
        (X.XC1, 25.0, True, False, 6),  # 100 years: +2
        (X.XC1, 30.0, True, True, 4),  # +2 - 1 - 1
        (X.X0, 50.0, False, True, 2),
    ],
)
def test_structural_class_table_4_3N(exposure, fck, life100, qc, s_class):
    """EN 1992-1-1 Table 4.3N modifications from the recommended S4 (4.4.1.2(5) Note)."""
    assert int(cv.structural_class(exposure, fck, life100, special_qc=qc)) == s_class


def test_structural_class_is_clamped():
    p = with_overrides(EN_RECOMMENDED, structural_class_50y=1)
    assert int(cv.structural_class(X.XC1, 50.0, special_qc=True, params=p)) == 1
    p6 = with_overrides(EN_RECOMMENDED, structural_class_50y=6)
    assert int(cv.structural_class(X.XC1, 20.0, working_life_100y=True, params=p6)) == 6


@pytest.mark.parametrize(("phi", "dg", "c"), [(12.0, 20.0, 12.0), (25.0, 32.0, 25.0), (25.0, 40.0, 30.0)])
def test_cmin_b_table_4_2(phi, dg, c):
    """EN 1992-1-1 Table 4.2: cmin,b = phi, +5 mm when dg > 32 mm."""
    assert float(cv.cmin_b(phi, dg)) == c


def test_cmin_and_cnom_eqs_4_1_4_2():
    # Eq. (4.2): max(cmin,b, cmin,dur + 0 - 0 - 0, 10); Eq. (4.1): + 10 mm.
    assert float(cv.cmin(8.0, 15.0)) == pytest.approx(15.0)
    assert float(cv.cmin(25.0, 15.0)) == pytest.approx(25.0)
    assert float(cv.cmin(6.0, 5.0)) == pytest.approx(10.0)
    assert float(cv.cnom(15.0)) == pytest.approx(25.0)
    p = with_overrides(EN_RECOMMENDED, delta_c_dur_gamma=5.0, delta_c_dev=5.0)
    assert float(cv.cnom(cv.cmin(8.0, 15.0, p), p)) == pytest.approx(25.0)


def test_cmin_dur_vectorised_equals_scalar():
    s = np.array([1, 3, 6])
    vec = cv.cmin_dur(X.XC3, s)
    assert [float(cv.cmin_dur(X.XC3, k)) for k in s] == list(vec)


def test_check_cover_by_hand():
    # XC3, C30/37 (< C35/45): S4 -> cmin,dur = 25; links H8: cmin,b = 8 -> cmin = 25,
    # cnom = 35 mm. Main H32: cmin,b = 32 -> cnom = 42; cover to bars = 35 + 8 = 43 >= 42.
    link, main = cv.check_cover(35.0, 8.0, 32.0, X.XC3, 30.0)
    assert (link.demand, link.capacity) == pytest.approx((35.0, 35.0))
    assert link.ok
    assert (main.demand, main.capacity) == pytest.approx((42.0, 43.0))
    assert main.ok
    # Same with H40 bars: cnom,main = 50 > 43: main bar cover fails, link cover passes.
    link, main = cv.check_cover(35.0, 10.0, 40.0, X.XC3, 30.0)
    assert link.ok and not main.ok


def test_bad_input_raises():
    with pytest.raises(ValueError, match="structural class"):
        cv.cmin_dur(X.XC1, 7)
    with pytest.raises(ValueError):
        cv.cmin_dur("XC9", 4)
    with pytest.raises(ValueError, match="mm"):
        cv.cmin_b(-8.0)


# --------------------------------------------------------------------------
# XF / XA classes and combinations (EN 1992-1-1 Table 4.1; Table 4.4N covers X0, XC, XD, XS only)
# --------------------------------------------------------------------------


def test_table_4_1_has_freeze_thaw_and_chemical_classes():
    names = {c.value for c in X}
    assert {"XF1", "XF2", "XF3", "XF4", "XA1", "XA2", "XA3"} <= names
    assert len(names) == 18  # X0, XC1-4, XD1-3, XS1-3, XF1-4, XA1-3


def test_exposure_parse_and_name():
    e = cv.Exposure.parse("xc4 + XF1")
    assert e.classes == (X.XC4, X.XF1) and e.name == "XC4+XF1" and str(e) == "XC4+XF1"
    assert e.cover_classes == (X.XC4,)
    assert cv.Exposure.parse("XC3+XC3").classes == (X.XC3,)  # repeated class kept once
    assert cv.parse_exposure(X.XD1) == cv.Exposure((X.XD1,))
    assert cv.parse_exposure(e) is e


@pytest.mark.parametrize(
    ("text", "match"),
    [
        ("XC4+XF9", "'XF9' is not an exposure class"),
        ("XC4+", "'' is not an exposure class"),
        ("XF1", "accompanying carbonation or chloride class"),
        ("XA2+XF3", "accompanying carbonation or chloride class"),
        ("X0+XF1", "X0"),
    ],
)
def test_exposure_errors_name_the_bad_part(text, match):
    with pytest.raises(ValueError, match=match):
        cv.Exposure.parse(text)


def test_single_class_functions_refuse_xf_xa_and_combinations():
    with pytest.raises(ValueError, match="no column in EN 1992-1-1 Table 4.4N"):
        cv.cmin_dur(X.XF1, 4)
    with pytest.raises(ValueError, match="'XC4\\+XA1'"):
        cv.structural_class(X.XA1, 30.0)
    with pytest.raises(ValueError, match="combination"):
        cv.cmin_dur("XC4+XF1", 4)
    # A one-class Exposure is accepted where a single class is expected.
    assert float(cv.cmin_dur(cv.Exposure.parse("XC3"), 4)) == 25.0


@pytest.mark.parametrize(
    ("text", "fck", "dur", "s_class", "governing"),
    [
        # XC4 + XF1, C30/37 (< C40/50): S4, Table 4.4N XC4 column: 30 mm; XF1 adds nothing.
        ("XC4+XF1", 30.0, 30.0, 4, "XC4"),
        # XC3 + XD1, C40/50: XC3 reaches C35/45 -> S3 -> 20; XD1 reaches C40/50 -> S3 -> 30. Max 30 (XD1).
        ("XC3+XD1", 40.0, 30.0, 3, "XD1"),
        # XC4 + XS1 + XF2, C35/45: XC4 S4 -> 30; XS1 (C40/50 not reached) S4 -> 35; max 35 (XS1).
        ("XC4+XS1+XF2", 35.0, 35.0, 4, "XS1"),
        # A single class gives the single-class value: XC3, C30/37, S4 -> 25.
        ("XC3", 30.0, 25.0, 4, "XC3"),
    ],
)
def test_cmin_dur_for_combinations(text, fck, dur, s_class, governing):
    """cmin,dur = largest Table 4.4N value over the classes the table covers (structural class per class)."""
    r = cv.cmin_dur_for(text, fck)
    assert float(r.cmin_dur) == pytest.approx(dur)
    assert int(r.s_class) == s_class and str(r.governing) == governing


def test_cmin_dur_for_broadcasts_over_fck():
    # XC3 + XD1 at C30 (both S4: 25, 35), C35 (XC3 S3 20, XD1 S4 35), C40 (20, 30).
    r = cv.cmin_dur_for("XC3+XD1", [30.0, 35.0, 40.0])
    np.testing.assert_allclose(r.cmin_dur, [35.0, 35.0, 30.0])
    assert list(r.governing) == ["XD1", "XD1", "XD1"]


def test_check_cover_accepts_combinations_and_keeps_single_note():
    (link, _) = cv.check_cover(35.0, 8.0, 32.0, X.XC3, 30.0)
    assert link.note == "XC3, S4, cmin,dur = 25 mm"
    # XC4 + XF1, C30/37: cmin,dur = 30 -> links H8: cnom = 30 + 10 = 40 > 35 -> fails.
    link, main = cv.check_cover(35.0, 8.0, 32.0, "XC4+XF1", 30.0)
    assert link.demand == pytest.approx(40.0) and not link.ok
    assert "XC4+XF1 (cover from XC4)" in link.note


# --------------------------------------------------------------------------
# Annex E (informative), Table E.1N
# --------------------------------------------------------------------------

# EN 1992-1-1:2004 Table E.1N, indicative strength classes (fck, MPa). Values recalled from memory
# and cross-checked against a public secondary reproduction of the table (a durability module in a
# public repository lists the same values, with XF4 absent from the table); not read from the
# standard itself. XF4 has no column in Table E.1N.
TABLE_E_1N = {
    "X0": 12.0,  # C12/15
    "XC1": 20.0,
    "XC2": 25.0,
    "XC3": 25.0,
    "XC4": 30.0,  # C20/25, C25/30 (XC2, XC3), C30/37
    "XD1": 30.0,
    "XD2": 30.0,
    "XD3": 35.0,  # C30/37, C35/45
    "XS1": 30.0,
    "XS2": 35.0,
    "XS3": 35.0,  # C30/37, C35/45
    "XF1": 30.0,
    "XF2": 25.0,
    "XF3": 30.0,  # C30/37, C25/30, C30/37
    "XA1": 30.0,
    "XA2": 30.0,
    "XA3": 35.0,  # C30/37, C35/45
}


@pytest.mark.parametrize(("cls", "fck"), sorted(TABLE_E_1N.items()))
def test_table_E_1N_rows(cls, fck):
    """EN 1992-1-1 Annex E, Table E.1N, one exposure class per case."""
    assert cv.INDICATIVE_FCK_TABLE_E1N[X(cls)] == pytest.approx(fck)
    if X(cls).in_table_4_4N:
        assert cv.indicative_fck(cls) == pytest.approx(fck)
    else:  # XF/XA need their carbonation class; XC1 (C20/25) never governs them here
        assert cv.indicative_fck(f"XC1+{cls}") == pytest.approx(max(fck, 20.0))


def test_xf4_is_not_in_table_E_1N():
    assert X.XF4 not in cv.INDICATIVE_FCK_TABLE_E1N
    r = cv.check_indicative_strength("XC4+XF4", 30.0)
    assert r.demand == pytest.approx(30.0)  # from XC4 only
    assert "XF4 not in Table E.1N" in r.note


def test_check_indicative_strength():
    # XD3 + XF2: max(C35/45, C25/30) = C35/45; C32/40 fails, C40/50 passes.
    r = cv.check_indicative_strength("XD3+XF2", 32.0)
    assert r.name == "indicative strength class (Annex E)" and r.kind is CheckKind.DURABILITY
    assert (r.demand, r.capacity) == pytest.approx((35.0, 32.0))
    assert not r.ok and "C35/45 (from XD3)" in r.note
    assert cv.check_indicative_strength(X.XC1, 20.0).ok
    with pytest.raises(ValueError, match="fck"):
        cv.check_indicative_strength("XC1", 0.0)
