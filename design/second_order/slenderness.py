"""Slenderness criterion and effective length of isolated columns.

EN 1992-1-1, 5.8.3: effective length l0 (5.8.3.2, Eqs. (5.15), (5.16)),
radius of gyration and slenderness lambda = l0/i (Eq. (5.14)), and the
slenderness limit lambda_lim with its factors A, B, C and the moment ratio
rm (5.8.3.1, Eq. (5.13N)).

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

__all__ = [
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
    "SlendernessLimit",
    "lambda_lim",
]


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# Effective length and slenderness, 5.8.3.2
# --------------------------------------------------------------------------


def k_restraint(k: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
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


def l0_braced(
    l: ArrayLike, k1: ArrayLike, k2: ArrayLike, params: NationalParameters = EN_RECOMMENDED
) -> NDArray[np.float64]:
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
    r1, r2 = k_restraint(k1, params), k_restraint(k2, params)  # raised to the minimum of 5.8.3.2(3)
    f1 = np.where(np.isinf(r1), 2.0, 1.0 + r1 / (0.45 + np.where(np.isinf(r1), 1.0, r1)))
    f2 = np.where(np.isinf(r2), 2.0, 1.0 + r2 / (0.45 + np.where(np.isinf(r2), 1.0, r2)))
    return 0.5 * l * np.sqrt(f1 * f2)  # type: ignore[no-any-return]  # numpy stubs: sqrt of an NDArray[Any] product is Any


def l0_unbraced(
    l: ArrayLike, k1: ArrayLike, k2: ArrayLike, params: NationalParameters = EN_RECOMMENDED
) -> NDArray[np.float64]:
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
    _require(
        (k1 >= 0) & (k2 >= 0) & np.isfinite(k1) & np.isfinite(k2),
        lambda: f"k1, k2 must be finite and not negative, got k1={k1}, k2={k2} (-)",
    )
    r1, r2 = k_restraint(k1, params), k_restraint(k2, params)  # raised to the minimum of 5.8.3.2(3)
    s = r1 + r2
    a = np.sqrt(1.0 + 10.0 * np.divide(r1 * r2, s, out=np.zeros_like(s * 1.0), where=s > 0))
    b = (1.0 + r1 / (1.0 + r1)) * (1.0 + r2 / (1.0 + r2))
    return l * np.maximum(a, b)


def l0_from_factor(l: ArrayLike, factor: ArrayLike) -> NDArray[np.float64]:
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


def i_rectangle(h: ArrayLike) -> NDArray[np.float64]:
    """Radius of gyration of a rectangle about the axis normal to h, mm.

    EN 1992-1-1, 5.8.3.2(1): i = sqrt(I/A) = h/sqrt(12).

    Args:
        h: section dimension along the lever arm (h for bending about y,
            b for bending about z), mm. Broadcasts.

    """
    h = _arr(h)
    _require(h > 0, lambda: f"section dimension must be positive, got {h} mm")
    return h / np.sqrt(12.0)  # type: ignore[no-any-return]  # numpy stubs: sqrt of a Python float is Any


def i_circle(D: ArrayLike) -> NDArray[np.float64]:
    """Radius of gyration of a solid circle, mm.

    EN 1992-1-1, 5.8.3.2(1): i = sqrt(I/A) = D/4.

    Args:
        D: diameter, mm. Broadcasts.

    """
    D = _arr(D)
    _require(D > 0, lambda: f"diameter must be positive, got D={D} mm")
    return D / 4.0


def slenderness(l0: ArrayLike, i: ArrayLike) -> NDArray[np.float64]:
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


def n_relative(NEd: ArrayLike, Ac: ArrayLike, fcd: ArrayLike) -> NDArray[np.float64]:
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


def omega_mechanical(As: ArrayLike, fyd: ArrayLike, Ac: ArrayLike, fcd: ArrayLike) -> NDArray[np.float64]:
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


def A_creep(phi_ef: ArrayLike) -> NDArray[np.float64]:
    """Factor A = 1 / (1 + 0.2 phi_ef) of the slenderness limit (-).

    EN 1992-1-1, 5.8.3.1(1), Eq. (5.13N)

    Args:
        phi_ef: effective creep ratio (-), >= 0 (5.8.4). Broadcasts.

    """
    phi_ef = _arr(phi_ef)
    _require(phi_ef >= 0, lambda: f"phi_ef must not be negative, got phi_ef={phi_ef} (-)")
    return 1.0 / (1.0 + 0.2 * phi_ef)


def B_reinforcement(omega: ArrayLike) -> NDArray[np.float64]:
    """Factor B = sqrt(1 + 2 omega) of the slenderness limit (-).

    EN 1992-1-1, 5.8.3.1(1), Eq. (5.13N)

    Args:
        omega: mechanical reinforcement ratio (-), >= 0. Broadcasts.

    """
    omega = _arr(omega)
    _require(omega >= 0, lambda: f"omega must not be negative, got omega={omega} (-)")
    return np.sqrt(1.0 + 2.0 * omega)


def C_moment_ratio(r_m: ArrayLike) -> NDArray[np.float64]:
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


def r_m(M01: ArrayLike, M02: ArrayLike) -> NDArray[np.float64]:
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
