"""Tests of design.detailing against EN 1992-1-1 8.2, 9.5.2 and 9.5.3."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from design import detailing as dt
from design.params import EN_RECOMMENDED, with_overrides


def test_As_min_by_hand():
    # EN 1992-1-1 9.5.2(2): max(0.10 NEd/fyd, 0.002 Ac).
    # NEd = 2000 kN, fyd = 434.78 MPa: 0.10 * 2e6/434.78 = 460 mm2 > 0.002 * 90000 = 180 mm2.
    assert float(dt.As_min(2000e3, 500 / 1.15, 300 * 300)) == pytest.approx(460.0)
    # Light load: the area term governs (0.002 * 160000 = 320 mm2).
    assert float(dt.As_min(200e3, 500 / 1.15, 400 * 400)) == pytest.approx(320.0)


@pytest.mark.parametrize(("at_lap", "rho"), [(False, 0.04), (True, 0.08)])
def test_As_max(at_lap, rho):
    """EN 1992-1-1 9.5.2(3): 0.04 Ac outside laps, 0.08 Ac at laps."""
    assert float(dt.As_max(250_000.0, at_lap)) == pytest.approx(rho * 250_000.0)


@pytest.mark.parametrize(
    ("shape", "n", "ok"),
    [
        (dt.ColumnShape.RECTANGULAR, 4, True),
        (dt.ColumnShape.RECTANGULAR, 3, False),
        (dt.ColumnShape.CIRCULAR, 6, True),
        (dt.ColumnShape.CIRCULAR, 5, False),
    ],
)
def test_bar_count_9_5_2_4(shape, n, ok):
    """EN 1992-1-1 9.5.2(4): at least 4 bars (rectangular), 6 (circular)."""
    assert dt.check_bar_count(n, shape).ok is ok


@pytest.mark.parametrize(
    ("phi", "dg", "s"), [(32.0, 20.0, 32.0), (12.0, 20.0, 25.0), (12.0, 10.0, 20.0), (20.0, 32.0, 37.0)]
)
def test_min_clear_spacing_8_2_2(phi, dg, s):
    """EN 1992-1-1 8.2(2), recommended k1 = 1, k2 = 5 mm: max(k1 phi, dg + k2, 20 mm)."""
    assert float(dt.min_clear_spacing(phi, dg)) == pytest.approx(s)


@pytest.mark.parametrize(("phi_max", "d"), [(12.0, 6.0), (20.0, 6.0), (32.0, 8.0), (40.0, 10.0)])
def test_link_dia_min_9_5_3_1(phi_max, d):
    """EN 1992-1-1 9.5.3(1): link diameter >= max(6 mm, phi_max/4)."""
    assert float(dt.link_dia_min(phi_max)) == pytest.approx(d)


@pytest.mark.parametrize(
    ("phi_min", "b", "reduced", "s"),
    [
        (12.0, 300.0, False, 240.0),  # 20 * 12
        (16.0, 300.0, False, 300.0),  # b
        (25.0, 600.0, False, 400.0),  # 400 mm cap
        (16.0, 300.0, True, 180.0),  # 0.6 * 300, 9.5.3(4)
        (25.0, 600.0, True, 240.0),
    ],
)
def test_scl_tmax_9_5_3(phi_min, b, reduced, s):
    """EN 1992-1-1 9.5.3(3), (4): min(20 phi_min, b, 400 mm), x 0.6 in the reduced zones."""
    assert float(dt.scl_tmax(phi_min, b, reduced)) == pytest.approx(s)


def test_scl_tmax_vectorised_equals_scalar():
    phi = np.array([12.0, 16.0, 25.0])
    b = np.array([300.0, 300.0, 600.0])
    red = np.array([False, True, True])
    vec = dt.scl_tmax(phi, b, red)
    assert [float(dt.scl_tmax(p, q, r)) for p, q, r in zip(phi, b, red, strict=True)] == list(vec)


@pytest.mark.parametrize(
    ("positions", "extra"),
    [
        ([0.0, 125.0, 250.0], 0),  # middle bar 125 mm from a corner
        ([0.0, 100.0, 200.0, 300.0, 400.0], 1),  # bar at 200 is 200 mm from both corners
        (list(np.arange(0.0, 901.0, 100.0)), 2),  # ties at 300 and 600
        ([0.0, 300.0], 0),  # corners only
    ],
)
def test_extra_ties_9_5_3_6(positions, extra):
    """EN 1992-1-1 9.5.3(6): no compression bar farther than 150 mm from a restrained bar."""
    assert dt.extra_ties_needed(positions) == extra
    check = dt.check_bar_restraint(positions)
    assert check.ok is (extra == 0)
    assert check.extra["extra_ties"] == extra


def test_bar_restraint_with_tied_middle_bar():
    pos = [0.0, 100.0, 200.0, 300.0, 400.0]
    assert dt.check_bar_restraint(pos, [True, False, True, False, True]).ok


@given(st.lists(st.floats(0.0, 1500.0), min_size=2, max_size=9, unique=True))
def test_extra_ties_equals_brute_force_minimum(pos):
    """The greedy count equals the least number found by trying every subset of bars."""
    import itertools

    x = np.sort(np.asarray(pos))
    inner = range(1, x.size - 1)
    best = None
    for k in range(x.size - 1):
        for chosen in itertools.combinations(inner, k):
            r = np.zeros(x.size, dtype=bool)
            r[[0, -1]] = True
            r[list(chosen)] = True
            if np.max(dt.distance_to_restrained(x, r)) <= 150.0 + 1e-9:
                best = k
                break
        if best is not None:
            break
    assert dt.extra_ties_needed(x) == best


def test_link_count_by_hand():
    # L = 3000, h_max = 400, scl,tmax = 300, reduced 180 (9.5.3(4)(i)), no lap:
    # bottom ceil(400/180) = 3, middle ceil(2200/300) = 8, top 3, + 1 -> 15.
    assert int(dt.link_count(3000.0, 400.0, 300.0, 16.0)) == 15
    # Lap 800 mm of 20 mm bars at the foot (9.5.3(4)(ii)): bottom zone 800 mm at 180:
    # ceil(4.44) = 5, middle ceil(1800/300) = 6, top 3, + 1 -> 15.
    assert int(dt.link_count(3000.0, 400.0, 300.0, 20.0, lap_length=800.0)) == 15
    # Same lap of 12 mm bars: no reduction at the lap (phi <= 14 mm) -> 15 as without lap.
    assert int(dt.link_count(3000.0, 400.0, 300.0, 12.0, lap_length=800.0)) == 15
    # Short column L = 700: zones 400 + 300 -> 3 + 2 + 1 = 6.
    assert int(dt.link_count(700.0, 400.0, 300.0, 16.0)) == 6


def test_link_count_three_links_in_short_lap():
    # Lap 300 mm of 16 mm bars, h_max 250, s = 300 -> reduced 180 but lap/2 = 150:
    # bottom ceil(300/150) = 2 (links at 0, 150, 300), middle ceil(2450/300) = 9,
    # top ceil(250/180) = 2, + 1 -> 14 (EN 1992-1-1 9.5.3(4)(ii): 3 links in the lap).
    assert int(dt.link_count(3000.0, 250.0, 300.0, 16.0, lap_length=300.0)) == 14


def test_link_count_vectorised_equals_scalar():
    L = np.array([3000.0, 4200.0, 700.0])
    hm = np.array([400.0, 600.0, 400.0])
    s = np.array([300.0, 320.0, 300.0])
    phi = np.array([16.0, 25.0, 12.0])
    lap = np.array([0.0, 1000.0, 500.0])
    vec = dt.link_count(L, hm, s, phi, lap)
    for k in range(3):
        assert int(dt.link_count(L[k], hm[k], s[k], phi[k], lap[k])) == vec[k]


def test_checks_report_demand_and_capacity():
    r = dt.check_link_spacing(200.0, 16.0, 300.0, reduced=True)
    assert (r.demand, r.capacity) == pytest.approx((200.0, 180.0))
    assert not r.ok
    assert dt.check_As_min(500.0, 2000e3, 500 / 1.15, 90000.0).ok
    assert not dt.check_As_max(4000.0, 90000.0).ok
    assert dt.check_As_max(4000.0, 90000.0, at_lap=True).ok
    assert dt.check_phi_min(12.0).ok
    assert not dt.check_phi_min(6.0).ok
    assert dt.check_link_diameter(8.0, 32.0).ok
    assert not dt.check_clear_spacing(24.0, 12.0, 20.0).ok


def test_params_drive_the_limits():
    p = with_overrides(EN_RECOMMENDED, phi_min_long=12.0, scl_max_mm=300.0)
    assert not dt.check_phi_min(10.0, p).ok
    assert float(dt.scl_tmax(25.0, 600.0, params=p)) == pytest.approx(300.0)


def test_bad_input_raises():
    with pytest.raises(ValueError, match="mm2"):
        dt.As_min(1e6, 435.0, -1.0)
    with pytest.raises(ValueError, match="mm"):
        dt.link_count(3000.0, 400.0, 0.0, 16.0)
    with pytest.raises(ValueError):
        dt.check_bar_count(4, "hexagonal")
