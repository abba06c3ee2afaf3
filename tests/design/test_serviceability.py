"""Tests of design.serviceability (EN 1992-1-1 7.2 stress limits, uncracked transformed sections).

Sources: closed forms of elastic beam theory (N / A_t, M z / I), EN 1992-1-1 Eq. (7.20) and
7.2(2), 7.2(3) (limits k1 fck, k2 fck with the recommended k1 = 0.6, k2 = 0.45), and the
independent library concreteproperties (ConcreteSection.calculate_uncracked_stress, linear
elastic materials) for an unsymmetric bar layout under biaxial bending.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from design import serviceability as sv
from design.cover import Exposure
from design.params import EN_RECOMMENDED, with_overrides
from design.results import CheckKind

A25 = math.pi * 25.0**2 / 4.0  # 490.874 mm2


def _square_4h25(alpha_e: float = 15.0):
    # 400 x 400, 4H25 at (+-150, +-150).
    y = np.array([150.0, -150.0, -150.0, 150.0])
    z = np.array([150.0, 150.0, -150.0, -150.0])
    return sv.transformed_rectangle(400.0, 400.0, y, z, np.full(4, A25), alpha_e)


def test_Ec_eff_and_alpha_e_eq_7_20():
    # Ecm = 33,000, phi = 2: Ec,eff = 11,000 MPa; alpha_e = 200,000 / 11,000 = 18.18.
    assert float(sv.Ec_eff(33_000.0, 2.0)) == pytest.approx(11_000.0, rel=1e-12)
    assert float(sv.alpha_e(33_000.0, 2.0)) == pytest.approx(200_000.0 / 11_000.0, rel=1e-12)
    assert float(sv.alpha_e(33_000.0)) == pytest.approx(200_000.0 / 33_000.0, rel=1e-12)


def test_axially_loaded_square():
    # sigma = N / (Ac + (alpha_e - 1) As) = 2e6 / (160,000 + 14 x 1963.50) = 2e6 / 187,489 = 10.667 MPa,
    # uniform, so max = min, not cracked.
    st = sv.sigma_c_uncracked(_square_4h25(), 2e6, 0.0, 0.0, 2.9)
    expected = 2e6 / (160_000.0 + 14.0 * 4 * A25)
    assert float(st.sigma_c_max) == pytest.approx(expected, rel=1e-12)
    assert float(st.sigma_c_min) == pytest.approx(expected, rel=1e-12)
    assert not bool(st.cracked)


def test_pure_bending_plain_rectangle_M_z_over_I():
    # No bars (area 0): I = b h^3 / 12 = 400 x 400^3 / 12 = 2.1333e9 mm4; M = 50 kNm:
    # sigma = 50e6 x 200 / 2.1333e9 = 4.6875 MPa at the +z face (positive My compresses +z).
    sec = sv.transformed_rectangle(400.0, 400.0, [0.0], [0.0], [0.0], 15.0)
    st = sv.sigma_c_uncracked(sec, 0.0, 50e6, 0.0, 2.9)
    assert float(st.sigma_c_max) == pytest.approx(4.6875, rel=1e-12)
    assert float(st.sigma_c_min) == pytest.approx(-4.6875, rel=1e-12)
    assert float(st.grad_z) > 0.0
    # Tension 4.69 MPa > fctm 2.9: cracked, the uncracked stress is not valid; not cracked for fct 5.
    assert bool(st.cracked)
    assert not bool(sv.sigma_c_uncracked(sec, 0.0, 50e6, 0.0, 5.0).cracked)


def test_biaxial_symmetric_layout_closed_form():
    # sigma_max = N / A_t + |My| (h/2) / I_y,t + |Mz| (b/2) / I_z,t for a doubly symmetric layout,
    # I_t = b h^3 / 12 + (alpha_e - 1) sum(As z^2 + As^2 / (4 pi)).
    ae = 15.0
    sec = sv.transformed_rectangle(
        300.0, 500.0, [100.0, -100.0, -100.0, 100.0], [200.0, 200.0, -200.0, -200.0], np.full(4, A25), ae
    )
    A_t = 300 * 500 + (ae - 1) * 4 * A25
    own = (ae - 1) * 4 * A25**2 / (4 * math.pi)
    Iy_t = 300 * 500**3 / 12 + (ae - 1) * 4 * A25 * 200**2 + own
    Iz_t = 500 * 300**3 / 12 + (ae - 1) * 4 * A25 * 100**2 + own
    N, My, Mz = 1.2e6, 80e6, -30e6
    st = sv.sigma_c_uncracked(sec, N, My, Mz, 3.0)
    assert float(st.sigma_c_max) == pytest.approx(N / A_t + 80e6 * 250 / Iy_t + 30e6 * 150 / Iz_t, rel=1e-12)
    assert float(st.sigma_c_min) == pytest.approx(N / A_t - 80e6 * 250 / Iy_t - 30e6 * 150 / Iz_t, rel=1e-12)


def test_symmetry_sign_and_axes():
    sec = _square_4h25()
    base = sv.sigma_c_uncracked(sec, 1e6, 40e6, 25e6, 2.9)
    for My, Mz in ((-40e6, 25e6), (40e6, -25e6), (-40e6, -25e6), (25e6, 40e6)):
        other = sv.sigma_c_uncracked(sec, 1e6, My, Mz, 2.9)
        assert float(other.sigma_c_max) == pytest.approx(float(base.sigma_c_max), rel=1e-12)
        assert float(other.sigma_c_min) == pytest.approx(float(base.sigma_c_min), rel=1e-12)
    # A 300 x 500 rectangle turned by 90 degrees with My and Mz swapped gives the same stresses.
    a = sv.transformed_rectangle(300.0, 500.0, [100.0, -100.0], [200.0, -200.0], [A25, A25], 12.0)
    b = sv.transformed_rectangle(500.0, 300.0, [200.0, -200.0], [100.0, -100.0], [A25, A25], 12.0)
    sa, sb = sv.sigma_c_uncracked(a, 5e5, 60e6, 10e6, 3.0), sv.sigma_c_uncracked(b, 5e5, 10e6, 60e6, 3.0)
    assert float(sa.sigma_c_max) == pytest.approx(float(sb.sigma_c_max), rel=1e-12)


def test_circle_closed_form_and_rotation():
    # D = 500, 8 bars H25 on a radius of 190: I_t = pi D^4/64 + (ae - 1) sum(As y^2) + own, and with
    # 8 equally spaced bars sum(y^2) = 8 r^2 / 2 about any axis, so any direction of M gives M R / I_t.
    ae, D, r, n = 10.0, 500.0, 190.0, 8
    ang = 2 * np.pi * np.arange(n) / n
    sec = sv.transformed_circle(D, r * np.cos(ang), r * np.sin(ang), np.full(n, A25), ae)
    I_t = math.pi * D**4 / 64 + (ae - 1) * A25 * n * r**2 / 2 + (ae - 1) * n * A25**2 / (4 * math.pi)
    A_t = math.pi * D**2 / 4 + (ae - 1) * n * A25
    for phi in (0.0, 0.3, 1.1):
        st = sv.sigma_c_uncracked(sec, 1.5e6, 100e6 * math.cos(phi), 100e6 * math.sin(phi), 3.0)
        assert float(st.sigma_c_max) == pytest.approx(1.5e6 / A_t + 100e6 * 250 / I_t, rel=1e-12)


def test_unsymmetric_bars_satisfy_equilibrium():
    # Bars on one face only: the stress plane must still return N, My, Mz when integrated
    # (midpoint rule on a 400 x 400 grid of the rectangle, plus the bars).
    ae, b, h = 8.0, 300.0, 500.0
    y = np.array([-100.0, 0.0, 100.0])
    z = np.array([200.0, 200.0, 200.0])
    a = np.full(3, A25)
    sec = sv.transformed_rectangle(b, h, y, z, a, ae)
    N, My, Mz = 9e5, -40e6, 15e6
    st = sv.sigma_c_uncracked(sec, N, My, Mz, 3.0)
    s0, gy, gz = float(st.sigma_0), float(st.grad_y), float(st.grad_z)
    ny = nz = 400
    yc = (np.arange(ny) + 0.5) / ny * b - b / 2
    zc = (np.arange(nz) + 0.5) / nz * h - h / 2
    Y, Z = np.meshgrid(yc, zc)
    sig = s0 + gy * Y + gz * Z
    dA = b * h / (ny * nz)
    bar_sig = s0 + gy * y + gz * z
    w = (ae - 1) * a
    own = (w * a / (4 * math.pi)).sum()  # the bars' own second moments, (ae - 1) As^2 / (4 pi)
    N_int = sig.sum() * dA + (w * bar_sig).sum()
    My_int = (sig * Z).sum() * dA + (w * bar_sig * z).sum() + own * gz
    Mz_int = (sig * Y).sum() * dA + (w * bar_sig * y).sum() + own * gy
    assert N_int == pytest.approx(N, rel=1e-9)
    assert My_int == pytest.approx(My, rel=1e-5)  # midpoint rule error on the z^2 term
    assert Mz_int == pytest.approx(Mz, rel=1e-5)


def test_vectorised_over_sections():
    secs = sv.transformed_rectangle(
        np.array([300.0, 400.0]),
        np.array([500.0, 400.0]),
        np.array([[100.0, -100.0], [150.0, -150.0]]),
        np.array([[200.0, -200.0], [150.0, -150.0]]),
        np.full((2, 2), A25),
        np.array([10.0, 15.0]),
    )
    st = sv.sigma_c_uncracked(secs, np.array([1e6, 2e6]), 50e6, 0.0, 3.0)
    for i, (b, h, c, ae, N) in enumerate(
        ((300.0, 500.0, (100.0, 200.0), 10.0, 1e6), (400.0, 400.0, (150.0, 150.0), 15.0, 2e6))
    ):
        one = sv.transformed_rectangle(b, h, [c[0], -c[0]], [c[1], -c[1]], [A25, A25], ae)
        ref = sv.sigma_c_uncracked(one, N, 50e6, 0.0, 3.0)
        assert float(st.sigma_c_max[i]) == pytest.approx(float(ref.sigma_c_max), rel=1e-12)


def test_against_concreteproperties_unsymmetric_biaxial():
    """concreteproperties' uncracked stress (linear-elastic concrete and steel, moments about its
    elastic centroid) at every mesh node, against our plane (moments moved to the outline centre)."""
    cp_mod = pytest.importorskip("concreteproperties.concrete_section")
    from concreteproperties.material import Concrete as CPConcrete
    from concreteproperties.material import SteelBar
    from concreteproperties.pre import add_bar
    from concreteproperties.stress_strain_profile import ConcreteLinear, EurocodeParabolicUltimate, SteelElasticPlastic
    from sectionproperties.pre.library import rectangular_section

    Ec, Es, b, h = 33_000.0, 200_000.0, 300.0, 500.0
    conc = CPConcrete(
        name="c",
        density=2.4e-6,
        stress_strain_profile=ConcreteLinear(elastic_modulus=Ec),
        ultimate_stress_strain_profile=EurocodeParabolicUltimate(
            compressive_strength=20.0, compressive_strain=0.002, ultimate_strain=0.0035, n=2.0
        ),
        flexural_tensile_strength=3.0,
        colour="grey",
    )
    steel = SteelBar(
        name="s",
        density=7.85e-6,
        stress_strain_profile=SteelElasticPlastic(yield_strength=435.0, elastic_modulus=Es, fracture_strain=0.05),
        colour="black",
    )
    ys = np.array([100.0, -100.0, -100.0, 100.0, 0.0])
    zs = np.array([200.0, 200.0, -200.0, -200.0, 200.0])
    geom = rectangular_section(d=h, b=b, material=conc).shift_section(-b / 2, -h / 2)
    for y, z in zip(ys, zs, strict=True):
        geom = add_bar(geom, area=A25, material=steel, x=float(y), y=float(z), n=32)
    ref = cp_mod.ConcreteSection(geom).calculate_uncracked_stress(n=1e6, m_x=50e6, m_y=20e6)

    sec = sv.transformed_rectangle(b, h, ys, zs, np.full(5, A25), Es / Ec)
    cy, cx = float(sec.Sz / sec.A), float(sec.Sy / sec.A)  # transformed centroid (z, y)
    # concreteproperties applies N at its centroid and m_x (about its x = our y) and m_y about it.
    st = sv.sigma_c_uncracked(sec, 1e6, 50e6 + 1e6 * cy, 20e6 + 1e6 * cx, 3.0)
    worst = 0.0
    for part, sig in zip(ref.concrete_analysis_sections, ref.concrete_stresses, strict=True):
        nodes = np.asarray(part.mesh_nodes)
        ours = float(st.sigma_0) + float(st.grad_y) * nodes[:, 0] + float(st.grad_z) * nodes[:, 1]
        worst = max(worst, float(np.abs(ours - np.asarray(sig)).max()))
    assert worst < 1e-5  # MPa, on stresses up to 12 MPa (the bars are 32-gons there, circles here)
    all_sig = np.concatenate([np.ravel(s) for s in ref.concrete_stresses])
    assert float(st.sigma_c_max) == pytest.approx(float(all_sig.max()), rel=1e-6)
    assert float(st.sigma_c_min) == pytest.approx(float(all_sig.min()), rel=1e-5)


# --------------------------------------------------------------------------
# Limits, 7.2(2) and 7.2(3)
# --------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("exposure", "k1_applies"),
    [
        ("X0", False),
        ("XC1", False),
        ("XC4", False),
        ("XD1", True),
        ("XS2", True),
        ("XC4+XF1", True),
        ("XC3+XA2", False),
        ("XC2+XF3+XA1", True),
    ],
)
def test_characteristic_limit_only_for_xd_xf_xs(exposure, k1_applies):
    """EN 1992-1-1 7.2(2): k1 fck "in areas exposed to environments of exposure classes XD, XF and XS"."""
    assert sv.needs_characteristic_limit(exposure) is k1_applies
    checks = sv.check_stress_limits(10.0, 8.0, 30.0, exposure)
    names = [c.name for c in checks]
    assert ("concrete stress, characteristic combination" in names) is k1_applies
    assert "concrete stress, quasi-permanent combination" in names
    assert all(c.kind is CheckKind.DURABILITY for c in checks)


def test_stress_limit_values_and_outcome():
    # C30/37: k1 fck = 0.6 x 30 = 18 MPa; k2 fck = 0.45 x 30 = 13.5 MPa.
    char, qp = sv.check_stress_limits(17.0, 14.0, 30.0, Exposure.parse("XC4+XF1"))
    assert (char.demand, char.capacity) == pytest.approx((17.0, 18.0), rel=1e-12)
    assert (qp.demand, qp.capacity) == pytest.approx((14.0, 13.5), rel=1e-12)
    assert char.ok and not qp.ok
    assert qp.extra["level"] == "warning" and "non-linear" in qp.note
    p = with_overrides(EN_RECOMMENDED, k1_stress=0.5, k2_stress=0.5)
    char, qp = sv.check_stress_limits(17.0, 14.0, 30.0, "XD1", p)
    assert not char.ok and qp.ok


def test_cracked_section_is_not_applicable():
    char, qp = sv.check_stress_limits(5.0, 4.0, 30.0, "XS1", cracked_char=True)
    assert not char.applicable and not char.ok and "not computed" in char.note
    assert qp.applicable and qp.ok


def test_bad_input_raises():
    with pytest.raises(ValueError, match="alpha_e"):
        sv.transformed_rectangle(300.0, 300.0, [0.0], [0.0], [100.0], 0.5)
    with pytest.raises(ValueError, match="b="):
        sv.transformed_rectangle(0.0, 300.0, [0.0], [0.0], [100.0], 10.0)
    with pytest.raises(ValueError, match="XF1"):
        sv.check_stress_limits(5.0, 4.0, 30.0, "XF1")
