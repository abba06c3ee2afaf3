"""Tests of design.fire against EN 1992-1-2 5.3.2 (method A, Table 5.2a, Eq. (5.7))."""

from __future__ import annotations

import math

import numpy as np
import pytest

from design import fire as fr
from design.fire import FireRating as R
from design.params import EN_RECOMMENDED, with_overrides

# EN 1992-1-2 Table 5.2a, more than one side exposed (recalled from memory):
# rating, mu_fi, [(bmin, a), ...]; "**" options (>= 8 bars) are tested with 8 bars.
TABLE_ROWS = [
    (R.R30, 0.2, [(200, 25)]),
    (R.R30, 0.5, [(200, 25)]),
    (R.R30, 0.7, [(200, 32), (300, 27)]),
    (R.R60, 0.2, [(200, 25)]),
    (R.R60, 0.5, [(200, 36), (300, 31)]),
    (R.R60, 0.7, [(250, 46), (350, 40)]),
    (R.R90, 0.2, [(200, 31), (300, 25)]),
    (R.R90, 0.5, [(300, 45), (400, 38)]),
    (R.R90, 0.7, [(350, 53), (450, 40)]),
    (R.R120, 0.2, [(250, 40), (350, 35)]),
    (R.R120, 0.5, [(350, 45), (450, 40)]),
    (R.R120, 0.7, [(350, 57), (450, 51)]),
    (R.R180, 0.2, [(350, 45)]),
    (R.R180, 0.5, [(350, 63)]),
    (R.R180, 0.7, [(450, 70)]),
    (R.R240, 0.2, [(350, 61)]),
    (R.R240, 0.5, [(450, 75)]),
]

ONE_SIDE_ROWS = [
    (R.R30, 155, 25),
    (R.R60, 155, 25),
    (R.R90, 155, 25),
    (R.R120, 175, 35),
    (R.R180, 230, 55),
    (R.R240, 295, 70),
]


def _check(rating, width, a, mu, n_bars=8, **kw):
    args = dict(
        rating=rating,
        b=width,
        h=width,
        a=a,
        n_bars=n_bars,
        As=0.01 * width**2,
        Ac=float(width**2),
        l0_fi=3000.0,
        mu_fi=mu,
    )
    args.update(kw)
    return fr.check_fire_table(**args)


@pytest.mark.parametrize(("rating", "mu", "options"), TABLE_ROWS)
def test_table_5_2a_rows(rating, mu, options):
    """EN 1992-1-2 Table 5.2a: at (bmin, a) the column passes; 1 mm less axis distance fails."""
    for bmin, amin in options:
        ok = _check(rating, bmin, amin, mu)
        assert ok.applicable and ok.ok, (rating, mu, bmin, amin)
        assert ok.demand == amin
        assert not _check(rating, bmin, amin - 1, mu).ok
    # Narrower than the smallest bmin: fails on width.
    narrow = _check(rating, options[0][0] - 10, 80, mu)
    assert not narrow.ok and narrow.unit == "mm"


@pytest.mark.parametrize(("rating", "bmin", "amin"), ONE_SIDE_ROWS)
def test_table_5_2a_one_side_rows(rating, bmin, amin):
    """EN 1992-1-2 Table 5.2a, last column (exposed on one side, mu_fi = 0.7)."""
    assert _check(rating, bmin, amin, 0.7, exposed_one_side=True).ok
    assert not _check(rating, bmin, amin - 1, 0.7, exposed_one_side=True).ok


def test_r240_mu_07_has_no_table_value():
    r = _check(R.R240, 600, 80, 0.7)
    assert not r.applicable and "no value" in r.note


def test_eight_bar_options_need_eight_bars():
    # R90, mu_fi = 0.7, 450/40 is a ** option: with 4 bars the 350/53 option governs.
    assert _check(R.R90, 450, 40, 0.7, n_bars=8).ok
    r = _check(R.R90, 450, 40, 0.7, n_bars=4)
    assert not r.ok and r.demand == 53


def test_mu_fi_rounds_up_to_next_column_and_defaults_to_07():
    # mu_fi = 0.3 uses the 0.5 column (R60: 200/36).
    assert _check(R.R60, 200, 36, 0.3).ok
    assert not _check(R.R60, 200, 35, 0.3).ok
    r = fr.check_fire_table(R.R60, 250, 250, 46, 4, 600.0, 62500.0, 3000.0)
    assert r.ok and "0.7" in r.note


@pytest.mark.parametrize(
    ("kw", "text"),
    [
        ({"l0_fi": 3100.0}, "l0,fi"),
        ({"e_z": 0.16 * 300}, "emax"),
        ({"e_y": 0.16 * 300}, "emax"),
        ({"As": 0.04 * 300**2}, "0.04"),
        ({"mu_fi": 0.8}, "mu_fi"),
    ],
)
def test_conditions_of_method_a(kw, text):
    """EN 1992-1-2 5.3.2(2): l0,fi <= 3 m, e <= 0.15 h (or b), As < 0.04 Ac."""
    r = _check(R.R60, 300, 60, 0.7, **kw)
    assert not r.applicable and not r.ok
    assert "method A does not apply" in r.note and text in r.note


def test_emax_factor_from_params():
    p = with_overrides(EN_RECOMMENDED, e_max_fire_factor=0.3)
    assert _check(R.R60, 300, 60, 0.7, e_z=0.25 * 300, params=p).applicable


def test_axis_distance():
    # a = 30 + 8 + 25/2 = 50.5 mm (EN 1992-1-2 Fig. 5.2).
    assert float(fr.axis_distance(30.0, 8.0, 25.0)) == pytest.approx(50.5)


def test_eq_5_7_by_hand():
    # EN 1992-1-2 Eq. (5.7), 300 x 300, 8 bars, a = 40, l0,fi = 3 m, omega = 0.3,
    # mu_fi = 0.7, alpha_cc = 1:
    # R_eta = 83 (1 - 0.7*1.3/1.15) = 17.32; R_a = 1.6*10 = 16; R_l = 9.6*2 = 19.2;
    # R_b = 0.09*300 = 27; R_n = 12; R = 120 (91.52/120)^1.8 = 73.7 min.
    r_eta = 83 * (1 - 0.7 * 1.3 / 1.15)
    total = r_eta + 16 + 19.2 + 27 + 12
    expected = 120 * (total / 120) ** 1.8
    assert float(fr.R_eta_fi(0.7, 0.3)) == pytest.approx(r_eta)
    assert float(fr.R_a(40)) == pytest.approx(16.0)
    assert float(fr.R_l(3000)) == pytest.approx(19.2)
    assert float(fr.R_b(fr.b_prime(300, 300))) == pytest.approx(27.0)
    assert float(fr.R_n(8)) == pytest.approx(12.0) and float(fr.R_n(4)) == pytest.approx(0.0)
    chk = fr.check_fire_eq_5_7(R.R60, 300, 300, 40, 8, 900.0, 90000.0, 3000.0, omega=0.3)
    assert chk.capacity == pytest.approx(expected, rel=1e-9)
    assert chk.capacity == pytest.approx(73.7, abs=0.1)
    assert chk.ok
    assert not fr.check_fire_eq_5_7(R.R90, 300, 300, 40, 8, 900.0, 90000.0, 3000.0, omega=0.3).ok


def test_eq_5_7_ranges():
    base = dict(rating=R.R60, b=300, h=300, a=40, n_bars=8, As=900.0, Ac=90000.0, l0_fi=3000.0, omega=0.3)
    # l0,fi below 2 m is taken as 2 m (5.3.2(2)).
    short = fr.check_fire_eq_5_7(**{**base, "l0_fi": 1000.0})
    two = fr.check_fire_eq_5_7(**{**base, "l0_fi": 2000.0})
    assert short.capacity == pytest.approx(two.capacity)
    # Outside the ranges: not applicable.
    assert not fr.check_fire_eq_5_7(**{**base, "l0_fi": 6500.0}).applicable
    assert not fr.check_fire_eq_5_7(**{**base, "a": 20}).applicable
    assert not fr.check_fire_eq_5_7(**{**base, "b": 180, "h": 180, "Ac": 32400.0}).applicable
    assert not fr.check_fire_eq_5_7(**{**base, "b": 200, "h": 400, "Ac": 80000.0}).applicable
    # b' for a rectangle 2Ac/(b + h), a circle its diameter.
    assert float(fr.b_prime(300, 450)) == pytest.approx(2 * 300 * 450 / 750)
    assert float(fr.b_prime(400)) == pytest.approx(400.0)


def test_eq_5_7_terms_vectorised_equals_scalar():
    mu = np.array([0.2, 0.5, 0.7])
    om = np.array([0.1, 0.3, 0.6])
    vec = fr.R_eta_fi(mu, om)
    assert [float(fr.R_eta_fi(m, o)) for m, o in zip(mu, om, strict=True)] == pytest.approx(list(vec))


def test_mu_fi():
    assert float(fr.mu_fi(700e3, 1000e3)) == pytest.approx(0.7)
    with pytest.raises(ValueError, match="NRd"):
        fr.mu_fi(1.0, 0.0)


def test_r_fire_monotonic_in_sum():
    s = np.linspace(0, 200, 11)
    r = fr.R_fire(s, 0, 0, 0, 0)
    assert np.all(np.diff(r) > 0)
    assert float(fr.R_fire(120, 0, 0, 0, 0)) == pytest.approx(120.0)
    assert math.isclose(float(fr.R_fire(-10, 0, 0, 0, 0)), 0.0)
