"""Slenderness, imperfections and second-order moments of isolated columns.

EN 1992-1-1, 5.2 (geometric imperfections), 5.8.3 (slenderness criterion and
effective length), 5.8.7 (nominal stiffness method), 5.8.8 (nominal curvature
method) and 6.1(4) (minimum eccentricity).

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
from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike

from design.params import EN_RECOMMENDED, NationalParameters

__all__ = [
    "ImperfectionMethod",
    "SlendernessLimit",
    "NominalCurvatureResult",
    "k_restraint",
    "l0_braced",
    "l0_unbraced",
    "l0_from_factor",
    "i_rectangle",
    "i_circle",
    "slenderness",
    "n_relative",
    "omega_mechanical",
    "A_creep",
    "B_reinforcement",
    "C_moment_ratio",
    "r_m",
    "lambda_lim",
    "alpha_h",
    "alpha_m",
    "theta_i",
    "ei_inclination",
    "ei_simplified",
    "ei",
    "e0_min",
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
    "nominal_curvature",
    "Ecd",
    "k1_stiffness",
    "k2_stiffness",
    "EI_nominal",
    "NB_buckling",
    "beta_c0",
    "magnification",
]

N_BAL = 0.4  # EN 1992-1-1, 5.8.8.3(3): n at maximum moment resistance, may be used.
C_CURVATURE = 10.0  # EN 1992-1-1, 5.8.8.2(4): c = 10 (~pi^2) for constant section.


def _arr(x: ArrayLike) -> np.ndarray:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# Effective length and slenderness, 5.8.3.2
# --------------------------------------------------------------------------


def k_restraint(k: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> np.ndarray:
    """Relative flexibility of an end restraint, not below the recommended minimum (-).

    EN 1992-1-1, 5.8.3.2(3), Note: rigid restraint (k = 0) is rare in practice;
    0.1 is recommended as the minimum value of k1 and k2.

    Args:
        k: relative flexibility as given (-), >= 0, inf for a pin. Broadcasts.
        params: national parameters (k_min_restraint).

    """
    k = _arr(k)
    _require(k >= 0, lambda: f"k must not be negative, got k={k} (-)")
    return np.maximum(k, params.k_min_restraint)


def l0_braced(l: ArrayLike, k1: ArrayLike, k2: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> np.ndarray:
    """Effective length of a braced member, mm.

    EN 1992-1-1, Eq. (5.15)
    l0 = 0.5 l sqrt((1 + k1/(0.45 + k1)) (1 + k2/(0.45 + k2))).

    Args:
        l: clear height between end restraints, mm.
        k1: relative flexibility of the rotational restraint at end 1 (-),
            0 = fully fixed, inf = pinned; raised to the recommended minimum
            0.1 of 5.8.3.2(3) (:func:`k_restraint`).
        k2: same at end 2 (-).
        params: national parameters (k_min_restraint).
        The numeric arguments broadcast.

    """
    l, k1, k2 = _arr(l), _arr(k1), _arr(k2)
    _require(l > 0, lambda: f"clear height l must be positive, got l={l} mm")
    _require((k1 >= 0) & (k2 >= 0), lambda: f"k1, k2 must not be negative, got k1={k1}, k2={k2} (-)")
    k1, k2 = k_restraint(k1, params), k_restraint(k2, params)
    f1 = np.where(np.isinf(k1), 2.0, 1.0 + k1 / (0.45 + np.where(np.isinf(k1), 1.0, k1)))
    f2 = np.where(np.isinf(k2), 2.0, 1.0 + k2 / (0.45 + np.where(np.isinf(k2), 1.0, k2)))
    return 0.5 * l * np.sqrt(f1 * f2)


def l0_unbraced(l: ArrayLike, k1: ArrayLike, k2: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> np.ndarray:
    """Effective length of an unbraced (sway) member, mm.

    EN 1992-1-1, Eq. (5.16)
    l0 = l max(sqrt(1 + 10 k1 k2/(k1 + k2)), (1 + k1/(1 + k1)) (1 + k2/(1 + k2))).

    Args:
        l: clear height, mm.
        k1: relative flexibility at end 1 (-), finite; raised to the
            recommended minimum 0.1 of 5.8.3.2(3) (:func:`k_restraint`).
        k2: relative flexibility at end 2 (-), finite.
        params: national parameters (k_min_restraint).
        The numeric arguments broadcast.

    """
    l, k1, k2 = _arr(l), _arr(k1), _arr(k2)
    _require(l > 0, lambda: f"clear height l must be positive, got l={l} mm")
    _require((k1 >= 0) & (k2 >= 0) & np.isfinite(k1) & np.isfinite(k2),
             lambda: f"k1, k2 must be finite and not negative, got k1={k1}, k2={k2} (-)")
    k1, k2 = k_restraint(k1, params), k_restraint(k2, params)
    s = k1 + k2
    a = np.sqrt(1.0 + 10.0 * np.divide(k1 * k2, s, out=np.zeros_like(s * 1.0), where=s > 0))
    b = (1.0 + k1 / (1.0 + k1)) * (1.0 + k2 / (1.0 + k2))
    return l * np.maximum(a, b)


def l0_from_factor(l: ArrayLike, factor: ArrayLike) -> np.ndarray:
    """Effective length as a factor times the clear height, mm.

    EN 1992-1-1, 5.8.3.2(1) and Fig. 5.7 (l0 = factor x l).

    Args:
        l: clear height, mm.
        factor: effective-length factor (-), > 0.
        Both arguments broadcast.

    """
    l, factor = _arr(l), _arr(factor)
    _require(l > 0, lambda: f"clear height l must be positive, got l={l} mm")
    _require(factor > 0, lambda: f"effective-length factor must be positive, got {factor} (-)")
    return factor * l


def i_rectangle(h: ArrayLike) -> np.ndarray:
    """Radius of gyration of a rectangle about the axis normal to h, mm.

    EN 1992-1-1, 5.8.3.2(1): i = sqrt(I/A) = h/sqrt(12).

    Args:
        h: section dimension along the lever arm (h for bending about y,
            b for bending about z), mm. Broadcasts.

    """
    h = _arr(h)
    _require(h > 0, lambda: f"section dimension must be positive, got {h} mm")
    return h / np.sqrt(12.0)


def i_circle(D: ArrayLike) -> np.ndarray:
    """Radius of gyration of a solid circle, mm.

    EN 1992-1-1, 5.8.3.2(1): i = sqrt(I/A) = D/4.

    Args:
        D: diameter, mm. Broadcasts.

    """
    D = _arr(D)
    _require(D > 0, lambda: f"diameter must be positive, got D={D} mm")
    return D / 4.0


def slenderness(l0: ArrayLike, i: ArrayLike) -> np.ndarray:
    """Slenderness ratio lambda = l0 / i (-).

    EN 1992-1-1, Eq. (5.14)

    Args:
        l0: effective length, mm.
        i: radius of gyration of the uncracked concrete section, mm.
        Both broadcast.

    """
    l0, i = _arr(l0), _arr(i)
    _require(l0 > 0, lambda: f"effective length must be positive, got l0={l0} mm")
    _require(i > 0, lambda: f"radius of gyration must be positive, got i={i} mm")
    return l0 / i


# --------------------------------------------------------------------------
# Slenderness criterion, 5.8.3.1
# --------------------------------------------------------------------------


def n_relative(NEd: ArrayLike, Ac: ArrayLike, fcd: ArrayLike) -> np.ndarray:
    """Relative normal force n = NEd / (Ac fcd) (-).

    EN 1992-1-1, 5.8.3.1(1)

    Args:
        NEd: design axial force, N (compression positive).
        Ac: concrete cross-section area, mm2.
        fcd: design compressive strength, MPa.
        All broadcast.

    """
    NEd, Ac, fcd = _arr(NEd), _arr(Ac), _arr(fcd)
    _require(Ac > 0, lambda: f"Ac must be positive, got Ac={Ac} mm2")
    _require(fcd > 0, lambda: f"fcd must be positive, got fcd={fcd} MPa")
    return NEd / (Ac * fcd)


def omega_mechanical(As: ArrayLike, fyd: ArrayLike, Ac: ArrayLike, fcd: ArrayLike) -> np.ndarray:
    """Mechanical reinforcement ratio omega = As fyd / (Ac fcd) (-).

    EN 1992-1-1, 5.8.3.1(1)

    Args:
        As: total area of longitudinal reinforcement, mm2.
        fyd: design yield strength of the reinforcement, MPa.
        Ac: concrete area, mm2.
        fcd: design compressive strength, MPa.
        All broadcast.

    """
    As, fyd, Ac, fcd = _arr(As), _arr(fyd), _arr(Ac), _arr(fcd)
    _require(As >= 0, lambda: f"As must not be negative, got As={As} mm2")
    _require((Ac > 0) & (fcd > 0), lambda: f"Ac and fcd must be positive, got Ac={Ac} mm2, fcd={fcd} MPa")
    return As * fyd / (Ac * fcd)


def A_creep(phi_ef: ArrayLike) -> np.ndarray:
    """Factor A = 1 / (1 + 0.2 phi_ef) of the slenderness limit (-).

    EN 1992-1-1, 5.8.3.1(1), Eq. (5.13N)

    Args:
        phi_ef: effective creep ratio (-), >= 0 (5.8.4). Broadcasts.

    """
    phi_ef = _arr(phi_ef)
    _require(phi_ef >= 0, lambda: f"phi_ef must not be negative, got phi_ef={phi_ef} (-)")
    return 1.0 / (1.0 + 0.2 * phi_ef)


def B_reinforcement(omega: ArrayLike) -> np.ndarray:
    """Factor B = sqrt(1 + 2 omega) of the slenderness limit (-).

    EN 1992-1-1, 5.8.3.1(1), Eq. (5.13N)

    Args:
        omega: mechanical reinforcement ratio (-), >= 0. Broadcasts.

    """
    omega = _arr(omega)
    _require(omega >= 0, lambda: f"omega must not be negative, got omega={omega} (-)")
    return np.sqrt(1.0 + 2.0 * omega)


def C_moment_ratio(r_m: ArrayLike) -> np.ndarray:
    """Factor C = 1.7 - rm of the slenderness limit (-).

    EN 1992-1-1, 5.8.3.1(1), Eq. (5.13N)

    Args:
        r_m: moment ratio M01/M02 (-), between -1 and 1; positive for single
            curvature. Take 1.0 for unbraced members and for braced members
            whose first-order moments come mainly from imperfections or
            transverse load (5.8.3.1(1)). Broadcasts.

    """
    r_m = _arr(r_m)
    _require((r_m >= -1.0) & (r_m <= 1.0), lambda: f"r_m must lie in [-1, 1], got r_m={r_m} (-)")
    return 1.7 - r_m


def r_m(M01: ArrayLike, M02: ArrayLike) -> np.ndarray:
    """Moment ratio rm = M01 / M02 with |M02| >= |M01| (-).

    EN 1992-1-1, 5.8.3.1(1)

    The two end moments may be passed in either order; the one of larger
    magnitude is taken as M02. Same signs (single curvature) give rm > 0.
    rm = 1 when both end moments are zero.

    Args:
        M01: first-order moment at one end, N mm.
        M02: first-order moment at the other end, N mm.
        Both broadcast.

    """
    a, b = _arr(M01), _arr(M02)
    big = np.where(np.abs(a) > np.abs(b), a, b)
    small = np.where(np.abs(a) > np.abs(b), b, a)
    return np.divide(small, big, out=np.ones(np.broadcast(a, b).shape), where=big != 0)


@dataclass(frozen=True)
class SlendernessLimit:
    """Result of :func:`lambda_lim`.

    Attributes:
        lambda_lim: slenderness limit (-); inf where n <= 0 (no compression).
        A: factor A used (-).
        B: factor B used (-).
        C: factor C used (-).
        n: relative normal force (-).
        A_default: True when A is the default of the parameter set.
        B_default: True when B is the default of the parameter set.
        C_default: True when C is the default of the parameter set.

    """

    lambda_lim: np.ndarray
    A: np.ndarray
    B: np.ndarray
    C: np.ndarray
    n: np.ndarray
    A_default: bool
    B_default: bool
    C_default: bool


def lambda_lim(
    n: ArrayLike,
    phi_ef: ArrayLike | None = None,
    omega: ArrayLike | None = None,
    r_m: ArrayLike | None = None,
    params: NationalParameters = EN_RECOMMENDED,
) -> SlendernessLimit:
    """Slenderness below which second-order effects may be ignored (-).

    EN 1992-1-1, Eq. (5.13N)
    lambda_lim = 20 A B C / sqrt(n).

    A, B and C are computed from ``phi_ef``, ``omega`` and ``r_m`` when given,
    otherwise the defaults of ``params`` (EN: 0.7, 1.1, 0.7) are used. With
    no compression (n <= 0) there is no second-order effect and lambda_lim
    is returned as inf.

    Args:
        n: relative normal force NEd/(Ac fcd) (-).
        phi_ef: effective creep ratio (-) or None.
        omega: mechanical reinforcement ratio (-) or None.
        r_m: moment ratio M01/M02 (-) or None.
        params: national parameters (lambda_A, lambda_B, lambda_C).
        The numeric arguments broadcast.

    """
    n = _arr(n)
    A = A_creep(phi_ef) if phi_ef is not None else _arr(params.lambda_A)
    B = B_reinforcement(omega) if omega is not None else _arr(params.lambda_B)
    C = C_moment_ratio(r_m) if r_m is not None else _arr(params.lambda_C)
    safe_n = np.where(n > 0, n, 1.0)
    lim = np.where(n > 0, 20.0 * A * B * C / np.sqrt(safe_n), np.inf)
    return SlendernessLimit(lim, A, B, C, n, phi_ef is None, omega is None, r_m is None)


# --------------------------------------------------------------------------
# Geometric imperfections, 5.2, and minimum eccentricity, 6.1(4)
# --------------------------------------------------------------------------


class ImperfectionMethod(StrEnum):
    """How the eccentricity ei of an isolated column is found (EN 1992-1-1, 5.2)."""

    INCLINATION = "inclination"  # ei = theta_i l0 / 2, Eqs. (5.1), (5.2)
    SIMPLIFIED = "simplified"  # ei = l0 / 400, 5.2(9) (alpha_h = 1)


def alpha_h(l: ArrayLike) -> np.ndarray:
    """Reduction factor for length or height, 2/3 <= alpha_h <= 1 (-).

    EN 1992-1-1, 5.2(5): alpha_h = 2 / sqrt(l), l in metres.

    Args:
        l: length or height, mm (converted to m inside). Broadcasts.

    """
    l = _arr(l)
    _require(l > 0, lambda: f"length l must be positive, got l={l} mm")
    return np.clip(2.0 / np.sqrt(l / 1000.0), 2.0 / 3.0, 1.0)


def alpha_m(m: ArrayLike) -> np.ndarray:
    """Reduction factor for the number of members, sqrt(0.5 (1 + 1/m)) (-).

    EN 1992-1-1, 5.2(5)

    Args:
        m: number of vertical members contributing to the total effect (-),
            >= 1 (1 for an isolated member, 5.2(6)). Broadcasts.

    """
    m = _arr(m)
    _require(m >= 1, lambda: f"number of members m must be >= 1, got m={m} (-)")
    return np.sqrt(0.5 * (1.0 + 1.0 / m))


def theta_i(
    l: ArrayLike, m: ArrayLike = 1.0, params: NationalParameters = EN_RECOMMENDED
) -> np.ndarray:
    """Inclination imperfection theta_i = theta_0 alpha_h alpha_m, rad.

    EN 1992-1-1, Eq. (5.1)

    Args:
        l: length (isolated member: its actual length), mm.
        m: number of vertical members contributing (-), 1 for an isolated member.
        params: national parameters (theta_0).
        l and m broadcast.

    """
    return params.theta_0 * alpha_h(l) * alpha_m(m)


def ei_inclination(theta_i: ArrayLike, l0: ArrayLike) -> np.ndarray:
    """Eccentricity for an isolated member, ei = theta_i l0 / 2, mm.

    EN 1992-1-1, Eq. (5.2)

    Args:
        theta_i: inclination, rad.
        l0: effective length, mm.
        Both broadcast.

    """
    theta_i, l0 = _arr(theta_i), _arr(l0)
    _require(l0 > 0, lambda: f"effective length must be positive, got l0={l0} mm")
    return theta_i * l0 / 2.0


def ei_simplified(l0: ArrayLike) -> np.ndarray:
    """Simplified eccentricity ei = l0 / 400, mm (walls and isolated columns in braced systems).

    EN 1992-1-1, 5.2(9), Note

    Args:
        l0: effective length, mm. Broadcasts.

    """
    l0 = _arr(l0)
    _require(l0 > 0, lambda: f"effective length must be positive, got l0={l0} mm")
    return l0 / 400.0


def ei(
    l0: ArrayLike,
    method: ImperfectionMethod = ImperfectionMethod.INCLINATION,
    l: ArrayLike | None = None,
    m: ArrayLike = 1.0,
    params: NationalParameters = EN_RECOMMENDED,
) -> np.ndarray:
    """Imperfection eccentricity of an isolated column, mm.

    EN 1992-1-1, 5.2(7) and (9): Eq. (5.2) with Eq. (5.1), or l0/400.

    Args:
        l0: effective length, mm.
        method: :class:`ImperfectionMethod`.
        l: actual member length for alpha_h, mm (5.2(5) defines alpha_h by the
            length, not by l0); None when not known: alpha_h = 1, its upper
            bound (l0 in its place would understate alpha_h for unbraced
            members, whose l0 exceeds l).
        m: number of members for alpha_m (-), 1 for an isolated member.
        params: national parameters (theta_0).
        The numeric arguments broadcast.

    """
    method = ImperfectionMethod(method)
    if method is ImperfectionMethod.SIMPLIFIED:
        return ei_simplified(l0)
    if l is None:
        return ei_inclination(params.theta_0 * alpha_m(m), l0)  # alpha_h = 1 (upper bound)
    return ei_inclination(theta_i(l, m, params), l0)


def e0_min(h: ArrayLike) -> np.ndarray:
    """Minimum eccentricity e0 = max(h/30, 20 mm), mm.

    EN 1992-1-1, 6.1(4)

    Args:
        h: section depth in the direction of the eccentricity, mm. Broadcasts.

    """
    h = _arr(h)
    _require(h > 0, lambda: f"section depth must be positive, got h={h} mm")
    return np.maximum(h / 30.0, 20.0)


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


def M0e(M01: ArrayLike, M02: ArrayLike) -> np.ndarray:
    """Equivalent first-order moment M0e = max(0.6 M02 + 0.4 M01, 0.4 M02), N mm.

    EN 1992-1-1, Eq. (5.32)

    Args:
        M01: smaller end moment, N mm; same sign as M02 when both put the
            same face in tension (single curvature), opposite sign otherwise.
        M02: larger end moment, N mm, |M02| >= |M01|.
        Both broadcast. The result carries the sign of M02.

    """
    M01, M02 = _arr(M01), _arr(M02)
    _require(np.abs(M02) >= np.abs(M01) - 1e-9 * np.abs(M02),
             lambda: f"|M02| must be >= |M01| (EN 1992-1-1, 5.8.8.2(2)), got M01={M01}, M02={M02} N mm")
    s = np.where(M02 < 0, -1.0, 1.0)
    a01, a02 = s * M01, s * M02
    return s * np.maximum(0.6 * a02 + 0.4 * a01, 0.4 * a02)


# --------------------------------------------------------------------------
# Nominal curvature method, 5.8.8
# --------------------------------------------------------------------------


def eps_yd(fyd: ArrayLike, Es: ArrayLike = 200_000.0) -> np.ndarray:
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


def inv_r0(eps_yd: ArrayLike, d: ArrayLike) -> np.ndarray:
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


def Kr(n: ArrayLike, omega: ArrayLike, n_bal: ArrayLike = N_BAL) -> np.ndarray:
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


def beta_creep(fck: ArrayLike, lam: ArrayLike) -> np.ndarray:
    """Factor beta = 0.35 + fck/200 - lambda/150 of the creep factor (-).

    EN 1992-1-1, 5.8.8.3(4), Eq. (5.37)

    Args:
        fck: characteristic cylinder strength, MPa.
        lam: slenderness ratio (-).
        Both broadcast.

    """
    return 0.35 + _arr(fck) / 200.0 - _arr(lam) / 150.0


def Kphi(phi_ef: ArrayLike, fck: ArrayLike, lam: ArrayLike) -> np.ndarray:
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


def inv_r(Kr: ArrayLike, Kphi: ArrayLike, inv_r0: ArrayLike) -> np.ndarray:
    """Curvature 1/r = Kr K_phi / r0, 1/mm.

    EN 1992-1-1, Eq. (5.34)

    Args:
        Kr: axial-load correction factor (-).
        Kphi: creep factor (-).
        inv_r0: basic curvature, 1/mm.
        All broadcast.

    """
    return _arr(Kr) * _arr(Kphi) * _arr(inv_r0)


def c_curvature(r_m_total: ArrayLike) -> np.ndarray:
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


def e2(inv_r: ArrayLike, l0: ArrayLike, c: ArrayLike = C_CURVATURE) -> np.ndarray:
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


def M2(NEd: ArrayLike, e2: ArrayLike) -> np.ndarray:
    """Nominal second-order moment M2 = NEd e2, N mm.

    EN 1992-1-1, Eq. (5.33)

    Args:
        NEd: design axial force, N (tension gives 0).
        e2: deflection, mm.
        Both broadcast.

    """
    return np.maximum(_arr(NEd), 0.0) * _arr(e2)


def design_moment_first_order(NEd: ArrayLike, M02: ArrayLike, e0: ArrayLike) -> np.ndarray:
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
) -> np.ndarray:
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
    return np.maximum.reduce([
        m0e + M2_,
        np.abs(M02),
        np.abs(M01) + 0.5 * M2_,
        np.maximum(_arr(NEd), 0.0) * _arr(e0) * np.ones_like(m0e),
    ])


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
    MEd = np.where(
        slender,
        design_moment_second_order(NEd, M01, M02, m2, e0),
        design_moment_first_order(NEd, M02, e0),
    )
    return NominalCurvatureResult(
        MEd=MEd, slender=slender, M01=M01, M02=M02, M0e=M0e(M01, M02), M2=m2,
        e2=np.where(slender, ecc2, 0.0), Kr=kr, Kphi=kphi, inv_r=curv,
        lambda_lim=lim.lambda_lim,
    )


# --------------------------------------------------------------------------
# Nominal stiffness method, 5.8.7
# --------------------------------------------------------------------------


def Ecd(Ecm: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> np.ndarray:
    """Design modulus of concrete for stiffness, Ecd = Ecm / gamma_cE, MPa.

    EN 1992-1-1, Eq. (5.20)

    Args:
        Ecm: secant modulus, MPa. Broadcasts.
        params: national parameters (gamma_cE, 5.8.6(3)).

    """
    _require(params.gamma_cE > 0, lambda: f"gamma_cE must be positive, got {params.gamma_cE} (-)")
    return _arr(Ecm) / params.gamma_cE


def k1_stiffness(fck: ArrayLike) -> np.ndarray:
    """Factor k1 = sqrt(fck / 20) of the nominal stiffness (-), fck in MPa.

    EN 1992-1-1, Eq. (5.23)

    Args:
        fck: characteristic cylinder strength, MPa. Broadcasts.

    """
    fck = _arr(fck)
    _require(fck > 0, lambda: f"fck must be positive, got fck={fck} MPa")
    return np.sqrt(fck / 20.0)


def k2_stiffness(n: ArrayLike, lam: ArrayLike | None = None) -> np.ndarray:
    """Factor k2 = n lambda / 170 <= 0.20, or n 0.30 <= 0.20 without lambda (-).

    EN 1992-1-1, Eqs. (5.24) and (5.25)

    Args:
        n: relative normal force (-).
        lam: slenderness ratio (-) or None.
        Both broadcast.

    """
    n = np.maximum(_arr(n), 0.0)
    k2 = n * 0.30 if lam is None else n * _arr(lam) / 170.0
    return np.minimum(k2, 0.20)


def EI_nominal(
    fck: ArrayLike,
    Ecm: ArrayLike,
    Ic: ArrayLike,
    Is: ArrayLike,
    n: ArrayLike,
    lam: ArrayLike | None,
    phi_ef: ArrayLike,
    rho: ArrayLike,
    Es: ArrayLike = 200_000.0,
    simplified: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> np.ndarray:
    """Nominal flexural stiffness EI = Kc Ecd Ic + Ks Es Is, N mm2.

    EN 1992-1-1, Eqs. (5.21)-(5.26)

    Default (rho >= 0.002): Ks = 1, Kc = k1 k2 / (1 + phi_ef) (Eq. (5.22)).
    ``simplified`` (rho >= 0.01): Ks = 0, Kc = 0.3 / (1 + 0.5 phi_ef) (Eq. (5.26)).

    Args:
        fck: cylinder strength, MPa.
        Ecm: secant modulus of concrete, MPa.
        Ic: second moment of area of the concrete section, mm4.
        Is: second moment of area of the reinforcement about the centroid, mm4.
        n: relative normal force (-).
        lam: slenderness ratio (-) or None.
        phi_ef: effective creep ratio (-).
        rho: geometric reinforcement ratio As/Ac (-).
        Es: steel modulus, MPa.
        simplified: use Eq. (5.26).
        params: national parameters (gamma_cE).
        The numeric arguments broadcast.

    """
    rho, phi_ef = _arr(rho), _arr(phi_ef)
    _require(phi_ef >= 0, lambda: f"phi_ef must not be negative, got phi_ef={phi_ef} (-)")
    ecd = Ecd(Ecm, params)
    if simplified:
        _require(rho >= 0.01, lambda: f"Eq. (5.26) needs rho >= 0.01, got rho={rho} (-)")
        return 0.3 / (1.0 + 0.5 * phi_ef) * ecd * _arr(Ic)
    _require(rho >= 0.002, lambda: f"Eq. (5.22) needs rho >= 0.002, got rho={rho} (-)")
    Kc = k1_stiffness(fck) * k2_stiffness(n, lam) / (1.0 + phi_ef)
    return Kc * ecd * _arr(Ic) + _arr(Es) * _arr(Is)


def NB_buckling(EI: ArrayLike, l0: ArrayLike) -> np.ndarray:
    """Buckling load based on nominal stiffness, NB = pi^2 EI / l0^2, N.

    EN 1992-1-1, 5.8.7.3(1)

    Args:
        EI: nominal stiffness, N mm2.
        l0: effective length, mm.
        Both broadcast.

    """
    l0 = _arr(l0)
    _require(l0 > 0, lambda: f"effective length must be positive, got l0={l0} mm")
    return np.pi**2 * _arr(EI) / l0**2


def beta_c0(c0: ArrayLike) -> np.ndarray:
    """Factor beta = pi^2 / c0 of the moment magnification (-).

    EN 1992-1-1, Eq. (5.29); c0 = 8 for a constant first-order moment, 9.6
    for a parabolic and 12 for a symmetric triangular distribution.

    Args:
        c0: coefficient of the first-order moment distribution (-). Broadcasts.

    """
    c0 = _arr(c0)
    _require(c0 > 0, lambda: f"c0 must be positive, got c0={c0} (-)")
    return np.pi**2 / c0


def magnification(
    M0Ed: ArrayLike, NEd: ArrayLike, NB: ArrayLike, c0: ArrayLike = 8.0
) -> np.ndarray:
    """Total design moment MEd = M0Ed (1 + beta / (NB/NEd - 1)), N mm.

    EN 1992-1-1, Eq. (5.28)

    Raises ValueError where NEd >= NB (the member buckles).

    Args:
        M0Ed: first-order moment incl. imperfection, N mm (M0e for differing
            end moments, then c0 = 8, 5.8.7.3(2)).
        NEd: design axial force, N.
        NB: buckling load based on nominal stiffness, N.
        c0: moment distribution coefficient (-).
        All broadcast.

    """
    NEd, NB = np.maximum(_arr(NEd), 0.0), _arr(NB)
    _require(NEd < NB, lambda: f"NEd must be below the buckling load NB, got NEd={NEd} N, NB={NB} N")
    ratio = np.divide(NB, NEd, out=np.full(np.broadcast(NB, NEd).shape, np.inf), where=NEd > 0)
    return _arr(M0Ed) * (1.0 + beta_c0(c0) / (ratio - 1.0))
