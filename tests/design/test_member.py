"""The full member check (design/member.py): code facts, edge cases, one implementation.

Sources: EN 1992-1-1 6.1(4) (e0 = max(h/30, 20 mm)), 5.2(7) and (9) (ei = l0/400
simplified; theta_i = theta_0 alpha_h alpha_m), 5.8.3.1 (C = 1.7 - rm), 5.8.9(4)
(exponent a), 9.5.2 (detailing); EN 1992-1-2 5.3.2(2) (conditions of method A).
"""

import math

import numpy as np
import pytest

from design.materials import Concrete, Reinforcement
from design.member import CheckSettings, ColumnActions, MinEccentricity, check_column, check_members
from design.resistance import DesignSection, SectionBatch, axial_resistance, moment_resistance
from design.second_order.imperfections import ImperfectionMethod
from design.section_data import SectionData
from design.sections import CircBars, CircSection, RectBars, RectSection

SQ = DesignSection(RectSection(400, 400, 35, 10, RectBars(25, 3, 3)), Concrete(35), Reinforcement(500))
RECT = DesignSection(RectSection(300, 500, 30, 8, RectBars(20, 2, 3)), Concrete(30), Reinforcement(500))


def test_zero_moments_minimum_eccentricity_governs():
    """6.1(4): with no first-order moment and a stocky column, MEd = NEd max(h/30, 20 mm)."""
    NEd = 1500e3
    r = check_column(
        SQ,
        ColumnActions(NEd=NEd, l0y=2000, l0z=2000, l_clear=2000),
        CheckSettings(min_eccentricity=MinEccentricity.ONE_AXIS),
    )
    v = r.values
    assert not v["slender_y"] and not v["slender_z"]
    # Imperfection ei = theta_i l0/2 = 5 mm is below e0 = 20 mm for l0 = 2 m.
    assert v["MEdy"] == pytest.approx(NEd * max(400 / 30, 20.0))
    assert v["MEdz"] == pytest.approx(0.0)  # one axis at a time (the option), about y here
    assert r.ok


def test_min_eccentricity_both_axes_is_the_default():
    """6.1(4) about each axis: neither design moment below NEd e0 (Concrete Centre worked examples
    let the moment about one axis coexist with NEd e0 about the other)."""
    NEd = 1500e3
    r = check_column(SQ, ColumnActions(NEd=NEd, l0y=2000, l0z=2000, l_clear=2000))
    assert r.values["MEdy"] == pytest.approx(NEd * 20.0)
    assert r.values["MEdz"] == pytest.approx(NEd * 20.0)


def test_e0_large_section_h_over_30():
    """e0 = h/30 once h > 600 mm."""
    big = DesignSection(RectSection(900, 900, 40, 12, RectBars(32, 4, 4)), Concrete(40), Reinforcement(500))
    r = check_column(big, ColumnActions(NEd=8000e3, l0y=3000, l0z=3000, l_clear=3000))
    assert r.values["e0_y"] == pytest.approx(30.0)
    assert r.values["MEdy"] == pytest.approx(8000e3 * 30.0)


def test_simplified_imperfection_l0_over_400():
    r = check_column(
        SQ,
        ColumnActions(NEd=1000e3, My_top=80e6, My_bot=80e6, l0y=6000, l0z=6000, l_clear=6000),
        CheckSettings(imperfection=ImperfectionMethod.SIMPLIFIED),
    )
    assert r.values["ei_y"] == pytest.approx(6000 / 400)


def test_inclination_imperfection_alpha_h():
    """5.2(5): theta_i = theta_0 alpha_h alpha_m, alpha_h = 2/sqrt(l), 2/3 <= alpha_h <= 1; ei = theta_i l0/2."""
    r = check_column(SQ, ColumnActions(NEd=1000e3, l0y=4000, l0z=4000, l_clear=9000))
    alpha_h = 2 / math.sqrt(9.0)
    assert r.values["ei_y"] == pytest.approx(alpha_h / 200 * 4000 / 2)


def test_imperfection_in_one_direction_only():
    """5.8.9(2): the imperfection acts about one axis; the worse direction governs."""
    r = check_column(
        RECT,
        ColumnActions(NEd=1200e3, My_top=60e6, My_bot=60e6, Mz_top=20e6, Mz_bot=20e6, l0y=3000, l0z=3000, l_clear=3000),
    )
    v = r.values
    on = v["imperfection_axis"]
    off = "z" if on == "y" else "y"
    M_first = {"y": 60e6, "z": 20e6}
    assert v[f"M02_{on}"] == pytest.approx(M_first[on] + 1200e3 * v[f"ei_{on}"])
    assert v[f"M02_{off}"] == pytest.approx(M_first[off])


def test_double_curvature_gives_larger_C():
    """5.8.3.1(1): rm = M01/M02 < 0 in double curvature, C = 1.7 - rm > 1.7."""
    r = check_column(
        SQ, ColumnActions(NEd=1500e3, My_top=80e6, My_bot=-40e6, l0y=5000, l0z=5000, l_clear=5000, phi_ef=2.0)
    )
    assert r.values["C_y"] == pytest.approx(1.7 + 0.5)
    assert r.values["M0e_y"] < r.values["M02_y"]


def test_exponent_a_rectangle():
    """5.8.9(4): a = 1.0, 1.5, 2.0 at NEd/NRd = 0.1, 0.7, 1.0 with NRd = Ac fcd + As fyd."""
    NRd = SQ.section.Ac * SQ.concrete.fcd + SQ.section.As * SQ.steel.fyd
    for ratio, a in ((0.1, 1.0), (0.4, 1.25), (0.7, 1.5), (0.85, 1.75)):
        r = check_column(SQ, ColumnActions(NEd=ratio * NRd, l0y=3000, l0z=3000, l_clear=3000))
        assert r.values["a"] == pytest.approx(a)


def test_axial_load_above_NRd_fails_clearly():
    NRd = axial_resistance(SQ)
    r = check_column(SQ, ColumnActions(NEd=1.2 * NRd, l0y=3000, l0z=3000, l_clear=3000))
    assert not r.ok
    assert r.governing.name == "axial resistance"
    assert r.governing.utilisation == pytest.approx(1.2)


def test_tension_is_checked():
    r = check_column(SQ, ColumnActions(NEd=-400e3, My_top=30e6, My_bot=30e6, l0y=3000, l0z=3000, l_clear=3000))
    v = r.values
    assert not v["slender_y"] and v["M2_y"] == pytest.approx(0.0)
    assert v["MEdy"] == pytest.approx(30e6)  # no imperfection or e0 moment under tension
    assert v["MRdy"] == pytest.approx(moment_resistance(SQ, -400e3, "y"))
    assert r.ok


def test_very_slender_column_is_flagged():
    r = check_column(SQ, ColumnActions(NEd=300e3, l0y=17000, l0z=17000, l_clear=17000))
    chk = r.check("slenderness within range of method")
    assert chk.demand == pytest.approx(17000 / (400 / math.sqrt(12)))
    assert not chk.ok and not r.ok


def test_fire_method_not_applicable_is_not_a_pass():
    """EN 1992-1-2 5.3.2(2): method A needs l0,fi <= 3 m; beyond it the check says so and does not pass."""
    r = check_column(SQ, ColumnActions(NEd=1000e3, l0y=4000, l0z=4000, l_clear=4000), CheckSettings(fire=60))
    chk = r.check("fire resistance R60")
    assert not chk.applicable and not chk.ok and "does not apply" in chk.note
    ok = check_column(
        SQ, ColumnActions(NEd=1000e3, l0y=4000, l0z=4000, l_clear=4000, l0_fi=2800), CheckSettings(fire=60)
    )
    assert ok.check("fire resistance R60").ok


def test_detailing_failures():
    thin = DesignSection(RectSection(600, 600, 35, 6, RectBars(12, 2, 2)), Concrete(30), Reinforcement(500))
    r = check_column(thin, ColumnActions(NEd=3000e3, l0y=3000, l0z=3000, l_clear=3000))
    assert not r.check("minimum longitudinal reinforcement").ok  # 4H12 < 0.10 NEd/fyd
    crowded = DesignSection(RectSection(250, 250, 30, 8, RectBars(40, 2, 2)), Concrete(30), Reinforcement(500))
    r2 = check_column(crowded, ColumnActions(NEd=500e3, l0y=3000, l0z=3000, l_clear=3000))
    assert not r2.check("maximum longitudinal reinforcement").ok  # 4H40 = 5027 mm2 > 0.04 x 62500
    assert not r2.check("link diameter").ok  # 8 < 40/4


def test_vectorised_equals_single_column():
    designs = [SQ, RECT, DesignSection(CircSection(500, 40, 10, CircBars(20, 8)), Concrete(60), Reinforcement(500))]
    data = SectionData.of(SectionBatch(designs))
    rng = np.random.default_rng(3)
    n = 40
    idx = rng.integers(0, 3, n)
    acts = dict(
        NEd=rng.uniform(-200e3, 4000e3, n),
        My_top=rng.uniform(-150e6, 150e6, n),
        My_bot=rng.uniform(-150e6, 150e6, n),
        Mz_top=rng.uniform(-80e6, 80e6, n),
        Mz_bot=rng.uniform(-80e6, 80e6, n),
        l0y=rng.uniform(2500, 8000, n),
        l0z=rng.uniform(2500, 8000, n),
        l_clear=rng.uniform(2500, 8000, n),
        phi_ef=rng.uniform(0, 2.5, n),
    )
    settings = CheckSettings(exposure="XC3", fire=60)
    many = check_members(data, idx, ColumnActions(**acts), settings)
    for i in range(n):
        one = check_column(designs[idx[i]], ColumnActions(**{k: v[i] for k, v in acts.items()}), settings)
        assert one.utilisation == pytest.approx(many.utilisation[i], rel=1e-12) or (
            math.isinf(one.utilisation) and math.isinf(many.utilisation[i])
        )
        assert one.governing.name == many.column(i).governing.name
        assert one.values["MEdy"] == pytest.approx(many.values["MEdy"][i], rel=1e-12)
        assert one.values["MEdz"] == pytest.approx(many.values["MEdz"][i], rel=1e-12)


def test_exact_biaxial_reported_and_consistent():
    """The direction-exact check on the resistance surface is never more onerous than 5.39 with a >= 1
    for moments along a principal axis (it then equals the uniaxial ratio)."""
    r = check_column(
        SQ,
        ColumnActions(NEd=2000e3, My_top=150e6, My_bot=150e6, l0y=2000, l0z=2000, l_clear=2000, phi_ef=1.0),
        CheckSettings(exact_biaxial=True, min_eccentricity=MinEccentricity.ONE_AXIS),
    )
    v = r.values
    assert v["MEdz"] == pytest.approx(0.0)
    assert v["utilisation_exact"] == pytest.approx(v["MEdy"] / v["MRdy"], rel=1e-3)
