"""Second-order moments of isolated columns by the nominal curvature method.

EN 1992-1-1, 5.8.8: first-order end moments M01, M02 and the equivalent
moment M0e (5.8.8.2, Eq. (5.32)), the curvature factor c (5.8.8.2(4)), the
curvature 1/r with Kr and K_phi (5.8.8.3, Eqs. (5.34)-(5.37)), the deflection
e2 and the moment M2 (Eq. (5.33)) and the design moment (Eq. (5.31)).
:func:`nominal_curvature` puts these together with the slenderness limit of
5.8.3.1 and the imperfections of 5.2.

Units: N, mm, MPa; moments in N mm; curvatures in 1/mm. Compression positive.
Every function takes floats or numpy arrays; unless its docstring says
otherwise all numeric arguments broadcast against each other, so one call
handles every column of a building without a Python loop.

Sign convention for end moments: pass the values of the first-order bending
moment diagram at the two ends of the member, both in the same sense (for
example "positive when the +z face is in tension"). End moments of the same
sign then put the same face in tension (single curvature); opposite signs
mean double curvature. This is the convention of EN 1992-1-1, 5.8.3.1(1) and
5.8.8.2(2) ("M01 and M02 should have the same sign if they give tension on
the same side").
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters
from design.second_order.imperfections import ImperfectionMethod, e0_min, ei
from design.second_order.slenderness import i_rectangle, lambda_lim, n_relative, omega_mechanical, r_m, slenderness

__all__ = [
    "first_order_end_moments",
    "M0e",
    "eps_yd",
    "inv_r0",
    "Kr",
    "beta_creep",
    "Kphi",
    "inv_r",
    "c_curvature",
    "e2",
    "M2",
    "design_moment_first_order",
    "design_moment_second_order",
    "NominalCurvatureResult",
    "nominal_curvature",
]

N_BAL = 0.4  # EN 1992-1-1, 5.8.8.3(3): n at maximum moment resistance, may be used.
C_CURVATURE = 10.0  # EN 1992-1-1, 5.8.8.2(4): c = 10 (~pi^2) for constant section.


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# First-order moments, 5.8.8.2(2)
# --------------------------------------------------------------------------


def first_order_end_moments(
    M_top: ArrayLike,
    M_bottom: ArrayLike,
    NEd: ArrayLike = 0.0,
    ei: ArrayLike = 0.0,
    include_imperfection: ArrayLike = True,
) -> tuple[np.ndarray, np.ndarray]:
    """Order the end moments as (M01, M02) and add the imperfection moment, N mm.

    EN 1992-1-1, 5.8.8.2(1)-(2) with 5.2(7)

    M02 is the end moment of larger magnitude, returned as a non-negative
    number; M01 is returned relative to it (positive for single curvature,
    negative for double curvature), so that ``M0e(M01, M02)`` applies
    directly. The imperfection moment NEd ei is added to both ends in the
    direction of M02, i.e. the direction that increases |M02| (a uniform
    eccentricity acting with the larger end moment). Where bending is
    biaxial the imperfection needs to act in one direction only (5.8.9(2)):
    set ``include_imperfection`` False for the other axis.

    Args:
        M_top: first-order moment at the top end, N mm (moment-diagram sign).
        M_bottom: first-order moment at the bottom end, N mm (same sign sense).
        NEd: design axial force, N (compression positive; tension adds no
            imperfection moment).
        ei: imperfection eccentricity, mm (>= 0).
        include_imperfection: whether the imperfection acts about this axis
            (bool or bool array).
        All arguments broadcast.

    """
    Mt, Mb, NEd, e = _arr(M_top), _arr(M_bottom), _arr(NEd), _arr(ei)
    _require(e >= 0, lambda: f"ei must not be negative, got ei={e} mm")
    top_larger = np.abs(Mt) >= np.abs(Mb)
    m02 = np.where(top_larger, Mt, Mb)
    m01 = np.where(top_larger, Mb, Mt)
    sign = np.where(m02 < 0, -1.0, 1.0)
    Mi = np.where(np.asarray(include_imperfection, dtype=bool), np.maximum(NEd, 0.0) * e, 0.0)
    return sign * m01 + Mi, np.abs(m02) + Mi


def M0e(M01: ArrayLike, M02: ArrayLike) -> NDArray[np.float64]:
    """Equivalent first-order moment M0e = max(0.6 M02 + 0.4 M01, 0.4 M02), N mm.

    EN 1992-1-1, Eq. (5.32)

    Args:
        M01: smaller end moment, N mm; same sign as M02 when both put the
            same face in tension (single curvature), opposite sign otherwise.
        M02: larger end moment, N mm, |M02| >= |M01|.
        Both broadcast. The result carries the sign of M02.

    """
    M01, M02 = _arr(M01), _arr(M02)
    _require(
        np.abs(M02) >= np.abs(M01) - 1e-9 * np.abs(M02),
        lambda: f"|M02| must be >= |M01| (EN 1992-1-1, 5.8.8.2(2)), got M01={M01}, M02={M02} N mm",
    )
    s = np.where(M02 < 0, -1.0, 1.0)
    a01, a02 = s * M01, s * M02
    return s * np.maximum(0.6 * a02 + 0.4 * a01, 0.4 * a02)


# --------------------------------------------------------------------------
# Nominal curvature method, 5.8.8
# --------------------------------------------------------------------------


def eps_yd(fyd: ArrayLike, Es: ArrayLike = 200_000.0) -> NDArray[np.float64]:
    """Design yield strain of the reinforcement, eps_yd = fyd / Es (-).

    EN 1992-1-1, 5.8.8.3(1)

    Args:
        fyd: design yield strength, MPa.
        Es: modulus of elasticity of steel, MPa (200 000, 3.2.7(4)).
        Both broadcast.

    """
    fyd, Es = _arr(fyd), _arr(Es)
    _require((fyd > 0) & (Es > 0), lambda: f"fyd and Es must be positive, got fyd={fyd} MPa, Es={Es} MPa")
    return fyd / Es


def inv_r0(eps_yd: ArrayLike, d: ArrayLike) -> NDArray[np.float64]:
    """Curvature at yield 1/r0 = eps_yd / (0.45 d), 1/mm.

    EN 1992-1-1, 5.8.8.3(1)

    Args:
        eps_yd: design yield strain (-).
        d: effective depth, mm (h/2 + is when bars are not concentrated on two
            opposite faces, 5.8.8.3(2), Eq. (5.35)).
        Both broadcast.

    """
    eps, d = _arr(eps_yd), _arr(d)
    _require(d > 0, lambda: f"effective depth must be positive, got d={d} mm")
    return eps / (0.45 * d)


def Kr(n: ArrayLike, omega: ArrayLike, n_bal: ArrayLike = N_BAL) -> NDArray[np.float64]:
    """Correction factor for axial load, Kr = (nu - n)/(nu - nbal) <= 1 (-).

    EN 1992-1-1, Eq. (5.36)

    nu = 1 + omega. The result is also bounded below by 0: n > nu means the
    axial force alone exceeds the section's squash resistance, which the
    section check reports.

    Args:
        n: relative normal force NEd/(Ac fcd) (-).
        omega: mechanical reinforcement ratio As fyd/(Ac fcd) (-).
        n_bal: n at maximum moment resistance (-), 0.4 may be used (5.8.8.3(3)).
        All broadcast.

    """
    n, omega, n_bal = _arr(n), _arr(omega), _arr(n_bal)
    _require(omega >= 0, lambda: f"omega must not be negative, got omega={omega} (-)")
    nu = 1.0 + omega
    _require(nu > n_bal, lambda: f"nu = 1 + omega must exceed n_bal, got nu={nu}, n_bal={n_bal} (-)")
    return np.clip((nu - n) / (nu - n_bal), 0.0, 1.0)


def beta_creep(fck: ArrayLike, lam: ArrayLike) -> NDArray[np.float64]:
    """Factor beta = 0.35 + fck/200 - lambda/150 of the creep factor (-).

    EN 1992-1-1, 5.8.8.3(4), Eq. (5.37)

    Args:
        fck: characteristic cylinder strength, MPa.
        lam: slenderness ratio (-).
        Both broadcast.

    """
    return 0.35 + _arr(fck) / 200.0 - _arr(lam) / 150.0


def Kphi(phi_ef: ArrayLike, fck: ArrayLike, lam: ArrayLike) -> NDArray[np.float64]:
    """Creep factor K_phi = max(1 + beta phi_ef, 1) (-).

    EN 1992-1-1, Eq. (5.37)

    Args:
        phi_ef: effective creep ratio (-), >= 0.
        fck: characteristic cylinder strength, MPa.
        lam: slenderness ratio (-).
        All broadcast.

    """
    phi_ef = _arr(phi_ef)
    _require(phi_ef >= 0, lambda: f"phi_ef must not be negative, got phi_ef={phi_ef} (-)")
    return np.maximum(1.0 + beta_creep(fck, lam) * phi_ef, 1.0)


def inv_r(Kr: ArrayLike, Kphi: ArrayLike, inv_r0: ArrayLike) -> NDArray[np.float64]:
    """Curvature 1/r = Kr K_phi / r0, 1/mm.

    EN 1992-1-1, Eq. (5.34)

    Args:
        Kr: axial-load correction factor (-).
        Kphi: creep factor (-).
        inv_r0: basic curvature, 1/mm.
        All broadcast.

    """
    return _arr(Kr) * _arr(Kphi) * _arr(inv_r0)


def c_curvature(r_m_total: ArrayLike) -> NDArray[np.float64]:
    """Factor c of the curvature distribution in Eq. (5.33), from the first-order moment ratio (-).

    EN 1992-1-1, 5.8.8.2(4)
    c = 10 (about pi^2) for a constant cross-section; where the first-order
    moment is constant a lower value should be considered, 8 being the lower
    limit (constant total moment). Between the two cases the value is taken
    linearly, c = 10 - 2 rm for 0 <= rm <= 1 and 10 for double curvature
    (common practice interpolation; the clause names only the end points).

    Args:
        r_m_total: M01/M02 of the first-order end moments including the
            imperfection moment (-), in [-1, 1]; 1 for a constant moment.
            Broadcasts.

    """
    rm = _arr(r_m_total)
    return C_CURVATURE - 2.0 * np.clip(rm, 0.0, 1.0)


def e2(inv_r: ArrayLike, l0: ArrayLike, c: ArrayLike = C_CURVATURE) -> NDArray[np.float64]:
    """Second-order deflection e2 = (1/r) l0^2 / c, mm.

    EN 1992-1-1, Eq. (5.33)

    Args:
        inv_r: curvature, 1/mm.
        l0: effective length, mm.
        c: factor for the curvature distribution (-); 10 (about pi^2) for a
            constant cross-section, not below 8 when the first-order moment
            is constant (5.8.8.2(4)).
        All broadcast.

    """
    c, l0 = _arr(c), _arr(l0)
    _require(c >= 8.0, lambda: f"c must be >= 8 (EN 1992-1-1, 5.8.8.2(4)), got c={c} (-)")
    return _arr(inv_r) * l0**2 / c


def M2(NEd: ArrayLike, e2: ArrayLike) -> NDArray[np.float64]:
    """Nominal second-order moment M2 = NEd e2, N mm.

    EN 1992-1-1, Eq. (5.33)

    Args:
        NEd: design axial force, N (tension gives 0).
        e2: deflection, mm.
        Both broadcast.

    """
    return np.maximum(_arr(NEd), 0.0) * _arr(e2)


def design_moment_first_order(NEd: ArrayLike, M02: ArrayLike, e0: ArrayLike) -> NDArray[np.float64]:
    """Design moment of a column that is not slender, N mm.

    EN 1992-1-1, 5.8.2(6) and 6.1(4): MEd = max(|M02|, NEd e0), M02 including
    the imperfection moment (see :func:`first_order_end_moments`).

    Args:
        NEd: design axial force, N.
        M02: larger first-order end moment incl. imperfection, N mm.
        e0: minimum eccentricity, mm.
        All broadcast.

    """
    return np.maximum(np.abs(_arr(M02)), np.maximum(_arr(NEd), 0.0) * _arr(e0))


def design_moment_second_order(
    NEd: ArrayLike, M01: ArrayLike, M02: ArrayLike, M2: ArrayLike, e0: ArrayLike
) -> NDArray[np.float64]:
    """Design moment of a slender column by the nominal curvature method, N mm.

    EN 1992-1-1, Eq. (5.31) with Eq. (5.32) and 6.1(4)
    MEd = max(M0e + M2, |M02|, |M01| + 0.5 M2, NEd e0).

    M0e + M2 is the mid-height moment; |M02| and |M01| + 0.5 M2 cover the
    ends, where the second-order moment is smaller (distribution of M2 over
    l0, 5.8.8.2(1); the end terms follow the common UK design-guide
    presentation (common practice)). |M01| + 0.5 M2 is used whatever the
    sign of M01, which is on the safe side for double curvature.

    Args:
        NEd: design axial force, N.
        M01: smaller end moment incl. imperfection, relative to M02 (see
            :func:`first_order_end_moments`), N mm.
        M02: larger end moment incl. imperfection, N mm, >= 0.
        M2: nominal second-order moment, N mm.
        e0: minimum eccentricity, mm.
        All broadcast.

    """
    M01, M02, M2_ = _arr(M01), _arr(M02), _arr(M2)
    m0e = np.abs(M0e(M01, M02))
    terms = [m0e + M2_, np.abs(M02), np.abs(M01) + 0.5 * M2_, np.maximum(_arr(NEd), 0.0) * _arr(e0) * np.ones_like(m0e)]
    return np.maximum.reduce(terms)  # type: ignore[no-any-return]  # numpy stubs: ufunc.reduce is Any


@dataclass(frozen=True)
class NominalCurvatureResult:
    """Design moment about one axis and its intermediate values.

    Attributes:
        MEd: design moment, N mm (>= 0, acting in the direction of M02).
        slender: True where lambda > lambda_lim (second-order moment added).
        M01: smaller end moment incl. imperfection, N mm (relative sign).
        M02: larger end moment incl. imperfection, N mm.
        M0e: equivalent first-order moment, N mm.
        M2: nominal second-order moment, N mm (0 where not slender).
        e2: second-order deflection, mm.
        Kr: axial-load correction factor (-).
        Kphi: creep factor (-).
        inv_r: curvature, 1/mm.
        lambda_lim: slenderness limit (-).

    """

    MEd: np.ndarray
    slender: np.ndarray
    M01: np.ndarray
    M02: np.ndarray
    M0e: np.ndarray
    M2: np.ndarray
    e2: np.ndarray
    Kr: np.ndarray
    Kphi: np.ndarray
    inv_r: np.ndarray
    lambda_lim: np.ndarray


def nominal_curvature(
    NEd: ArrayLike,
    M_top: ArrayLike,
    M_bottom: ArrayLike,
    *,
    l0: ArrayLike,
    h: ArrayLike,
    d: ArrayLike,
    Ac: ArrayLike,
    As: ArrayLike,
    fck: ArrayLike,
    fyk: ArrayLike = 500.0,
    Es: ArrayLike = 200_000.0,
    phi_ef: ArrayLike = 0.0,
    i: ArrayLike | None = None,
    r_m_known: bool = False,
    imperfection: ImperfectionMethod = ImperfectionMethod.INCLINATION,
    include_imperfection: ArrayLike = True,
    c: ArrayLike = C_CURVATURE,
    params: NationalParameters = EN_RECOMMENDED,
) -> NominalCurvatureResult:
    """Design moment about one axis by the nominal curvature method, N mm.

    EN 1992-1-1, 5.8.8 (Eqs. (5.31)-(5.37)), with 5.8.3.1 (Eq. (5.13N)),
    5.2 (Eqs. (5.1), (5.2)) and 6.1(4).

    Steps: ei and the end moments incl. NEd ei (5.2(7)); lambda = l0/i and
    lambda_lim (omega and phi_ef always known here; rm from the end moments
    when ``r_m_known``, else the default C); if lambda <= lambda_lim,
    MEd = max(M02, NEd e0); otherwise 1/r = Kr K_phi eps_yd/(0.45 d),
    e2 = (1/r) l0^2/c, M2 = NEd e2 and
    MEd = max(M0e + M2, M02, |M01| + 0.5 M2, NEd e0).

    Args:
        NEd: design axial force, N.
        M_top: first-order end moment at the top, N mm (moment-diagram sign).
        M_bottom: first-order end moment at the bottom, N mm.
        l0: effective length for buckling about this axis, mm.
        h: section depth in the plane of bending (for e0), mm.
        d: effective depth in the plane of bending, mm.
        Ac: concrete area, mm2.
        As: total longitudinal reinforcement, mm2.
        fck: concrete strength, MPa.
        fyk: steel characteristic yield strength, MPa.
        Es: steel modulus, MPa.
        phi_ef: effective creep ratio (-).
        i: radius of gyration about this axis, mm; h/sqrt(12) when None.
        r_m_known: compute C from rm = M01/M02 of the first-order end moments
            (without imperfection); otherwise C = params.lambda_C (rm = 1).
        imperfection: :class:`ImperfectionMethod` for ei.
        include_imperfection: whether the imperfection acts about this axis.
        c: curvature distribution factor of Eq. (5.33) (-).
        params: national parameters (gamma_c, alpha_cc, gamma_s, theta_0, ...).
        The numeric arguments broadcast.

    """
    fcd = params.alpha_cc * _arr(fck) / params.gamma_c
    fyd = _arr(fyk) / params.gamma_s
    ii = i_rectangle(h) if i is None else _arr(i)
    lam = slenderness(l0, ii)
    n = n_relative(NEd, Ac, fcd)
    om = omega_mechanical(As, fyd, Ac, fcd)
    rm = r_m(M_top, M_bottom) if r_m_known else None
    lim = lambda_lim(n, phi_ef=phi_ef, omega=om, r_m=rm, params=params)
    e_i = ei(l0, imperfection, params=params)
    M01, M02 = first_order_end_moments(M_top, M_bottom, NEd, e_i, include_imperfection)
    e0 = e0_min(h)
    kr = Kr(n, om)
    kphi = Kphi(phi_ef, fck, lam)
    curv = inv_r(kr, kphi, inv_r0(eps_yd(fyd, Es), d))
    ecc2 = e2(curv, l0, c)
    slender = lam > lim.lambda_lim
    m2 = np.where(slender, M2(NEd, ecc2), 0.0)
    MEd = np.where(slender, design_moment_second_order(NEd, M01, M02, m2, e0), design_moment_first_order(NEd, M02, e0))
    return NominalCurvatureResult(
        MEd=MEd,
        slender=slender,
        M01=M01,
        M02=M02,
        M0e=M0e(M01, M02),
        M2=m2,
        e2=np.where(slender, ecc2, 0.0),
        Kr=kr,
        Kphi=kphi,
        inv_r=curv,
        lambda_lim=lim.lambda_lim,
    )
