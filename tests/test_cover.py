"""Tests of design.cover against EN 1992-1-1 4.4.1, Tables 4.2, 4.3N and 4.4N."""

from __future__ import annotations

import numpy as np
import pytest

from design import cover as cv
from design.cover import ExposureClass as X
from design.params import EN_RECOMMENDED, with_overrides

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
COLUMNS = (
    (X.X0,), (X.XC1,), (X.XC2, X.XC3), (X.XC4,), (X.XD1, X.XS1), (X.XD2, X.XS2), (X.XD3, X.XS3),
)


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
