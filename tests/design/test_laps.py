"""Tests of design.laps against EN 1992-1-1 8.4 and 8.7.3."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from design import laps as lp
from design.params import EN_RECOMMENDED, UK_ANNEX, with_overrides


@pytest.mark.parametrize(
    ("fck", "fctk_table"), [(20, 1.5), (25, 1.8), (30, 2.0), (35, 2.2), (40, 2.5), (45, 2.7), (50, 2.9), (60, 3.1)]
)
def test_fbd_good_bond_from_table_3_1(fck, fctk_table):
    """EN 1992-1-1 Table 3.1, fctk,0.05 row (recalled from memory), through Eqs. (3.16), (8.2).

    fbd = 2.25 * 1.0 * 1.0 * fctk,0.05 / 1.5; the table rounds fctk,0.05 to 0.1 MPa.
    """
    assert float(lp.fbd(fck, 20.0)) == pytest.approx(2.25 * fctk_table / 1.5, abs=0.08)


def test_fbd_c30_is_3_0_mpa():
    # fbd = 3.0 MPa for C30/37, good bond, phi <= 32 (common practice; design-aid tables).
    assert float(lp.fbd(30.0, 16.0)) == pytest.approx(3.04, abs=0.01)


def test_fctk_capped_at_c60():
    """EN 1992-1-1 8.4.2(2): fctk,0.05 limited to the C60/75 value."""
    assert float(lp.fctd(90.0)) == pytest.approx(float(lp.fctd(60.0)))
    assert float(lp.fctd(70.0)) > float(lp.fctd(50.0))


@pytest.mark.parametrize(("phi", "eta2"), [(12.0, 1.0), (32.0, 1.0), (40.0, 0.92)])
def test_eta2(phi, eta2):
    """EN 1992-1-1 8.4.2(2): eta2 = 1.0 for phi <= 32 mm, (132 - phi)/100 above."""
    assert float(lp.eta2(phi)) == pytest.approx(eta2)


def test_eta1_poor_bond():
    assert lp.eta1(lp.BondCondition.POOR) == pytest.approx(0.7)
    assert float(lp.fbd(30.0, 20.0, lp.BondCondition.POOR)) == pytest.approx(0.7 * float(lp.fbd(30.0, 20.0)))


def test_lb_rqd_eq_8_3_by_hand():
    # phi 20, sigma = fyd = 434.78, fbd = 3.0417 (C30/37): 5 * 434.78 / 3.0417 = 714.7 mm (35.7 phi).
    fb = float(lp.fbd(30.0, 20.0))
    assert float(lp.lb_rqd(20.0, 500 / 1.15, fb)) == pytest.approx(20 / 4 * (500 / 1.15) / fb)
    assert float(lp.lb_rqd(20.0, 500 / 1.15, fb)) == pytest.approx(714.7, abs=0.5)


@pytest.mark.parametrize(
    ("rho1", "a6"), [(10.0, 1.0), (25.0, 1.0), (33.0, 1.15), (50.0, 1.4), (75.0, 1.5), (100.0, 1.5)]
)
def test_alpha6_table_8_3(rho1, a6):
    """EN 1992-1-1 Table 8.3: alpha6 = 1, 1.15, 1.4, 1.5 for rho1 < 25, 33, 50, > 50 %."""
    assert float(lp.alpha6(rho1)) == pytest.approx(a6, abs=0.015)


def test_l0_min_eq_8_11():
    # max(0.3 * 1.5 * 100, 15 * 12, 200) = 200; max(0.3*1.5*1000, 15*25, 200) = 450.
    assert float(lp.l0_min(100.0, 1.5, 12.0)) == pytest.approx(200.0)
    assert float(lp.l0_min(1000.0, 1.5, 25.0)) == pytest.approx(450.0)
    assert float(lp.l0_min(100.0, 1.0, 20.0)) == pytest.approx(300.0)


def test_lap_length_by_hand():
    # phi 20, C30/37, fyd, all bars lapped (alpha6 = 1.5): l0 = 1.5 * 714.7 = 1072 mm (Eq. (8.10)).
    assert float(lp.lap_length(20.0, 30.0)) == pytest.approx(1.5 * 714.7, abs=1.0)
    # Half the bars lapped (rho1 = 50 %): alpha6 = sqrt(2).
    assert float(lp.lap_length(20.0, 30.0, rho1=50.0)) == pytest.approx(np.sqrt(2) * 714.7, abs=1.0)


def test_lap_length_follows_params():
    # alpha_cc does not enter the bond strength: the UK set (alpha_cc = 0.85) gives the same lap.
    uk = float(lp.lap_length(16.0, 30.0, params=UK_ANNEX))
    assert uk == pytest.approx(float(lp.lap_length(16.0, 30.0)))
    # l0 is proportional to gamma_c / alpha_ct (Eqs. (3.16), (8.2), (8.3)) when above l0,min.
    p = with_overrides(EN_RECOMMENDED, gamma_c=1.65)
    assert float(lp.lap_length(16.0, 30.0, params=p)) == pytest.approx(1.1 * float(lp.lap_length(16.0, 30.0)))


def test_lap_length_vectorised_equals_scalar():
    phi = np.array([12.0, 16.0, 25.0, 40.0])
    fck = np.array([25.0, 30.0, 40.0, 70.0])
    vec = lp.lap_length(phi, fck)
    for k in range(4):
        assert float(lp.lap_length(phi[k], fck[k])) == pytest.approx(vec[k])


@given(phi=st.floats(8.0, 40.0), fck=st.floats(12.0, 90.0), rho1=st.floats(0.0, 100.0))
def test_lap_at_least_minimum(phi, fck, rho1):
    l0 = float(lp.lap_length(phi, fck, rho1=rho1))
    assert l0 >= max(15 * phi, 200.0) - 1e-9


def test_bad_input_raises():
    with pytest.raises(ValueError, match="Eq. \\(8.5\\)"):
        lp.l0_lap(500.0, 16.0, 1.0, alpha2=0.7, alpha3=0.7)
    with pytest.raises(ValueError, match="%"):
        lp.alpha6(120.0)
    with pytest.raises(ValueError, match="mm"):
        lp.eta2(0.0)
