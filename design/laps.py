"""Bond and lap lengths of column bars, EN 1992-1-1, 8.4 and 8.7.3.

Units: N, mm, MPa. All numeric arguments broadcast (bond condition is one
value per call). Concrete properties come from :mod:`design.materials`.
"""

from __future__ import annotations

from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.materials import fctk_005, fyd
from design.params import EN_RECOMMENDED, NationalParameters

__all__ = ["BondCondition", "eta1", "eta2", "fctd", "fbd", "lb_rqd", "alpha6", "l0_min", "l0_lap", "lap_length"]

FCK_BOND_CAP = 60.0  # EN 1992-1-1, 8.4.2(2): fctk,0.05 limited to the C60/75 value
PHI_ETA2_MM = 32.0  # EN 1992-1-1, 8.4.2(2)


class BondCondition(StrEnum):
    """Bond condition of EN 1992-1-1, 8.4.2(2) and Fig. 8.2."""

    GOOD = "good"  # eta1 = 1.0 (vertical column bars are in good bond, Fig. 8.2 (a))
    POOR = "poor"  # eta1 = 0.7


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def eta1(bond: BondCondition = BondCondition.GOOD) -> float:
    """Coefficient for the bond condition, 1.0 good / 0.7 other (-).

    EN 1992-1-1, 8.4.2(2)

    Args:
        bond: :class:`BondCondition`.

    """
    return 1.0 if BondCondition(bond) is BondCondition.GOOD else 0.7


def eta2(phi: ArrayLike) -> NDArray[np.float64]:
    """Coefficient for the bar diameter, 1.0 for phi <= 32, (132 - phi)/100 above (-).

    EN 1992-1-1, 8.4.2(2)

    Args:
        phi: bar diameter, mm. Broadcasts.

    """
    phi = _arr(phi)
    if not np.all(phi > 0):
        msg = f"bar diameter must be positive, got phi={phi} mm"
        raise ValueError(msg)
    return np.where(phi <= PHI_ETA2_MM, 1.0, (132.0 - phi) / 100.0)


def fctd(fck: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Design tensile strength for bond, alpha_ct fctk,0.05 / gamma_c, MPa.

    EN 1992-1-1, Eq. (3.16), with fctk,0.05 capped at the C60/75 value (8.4.2(2))

    Args:
        fck: cylinder strength, MPa. Broadcasts.
        params: national parameters (alpha_ct, gamma_c).

    """
    fck = _arr(fck)
    if not np.all(fck > 0):
        msg = f"fck must be positive, got fck={fck} MPa"
        raise ValueError(msg)
    return params.alpha_ct * fctk_005(np.minimum(fck, FCK_BOND_CAP)) / params.gamma_c


def fbd(
    fck: ArrayLike,
    phi: ArrayLike,
    bond: BondCondition = BondCondition.GOOD,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.float64]:
    """Ultimate bond stress fbd = 2.25 eta1 eta2 fctd, MPa.

    EN 1992-1-1, Eq. (8.2)

    Args:
        fck: cylinder strength, MPa.
        phi: bar diameter, mm.
        bond: :class:`BondCondition`.
        params: national parameters.
        fck and phi broadcast.

    """
    return 2.25 * eta1(bond) * eta2(phi) * fctd(fck, params)


def lb_rqd(phi: ArrayLike, sigma_sd: ArrayLike, fbd: ArrayLike) -> NDArray[np.float64]:
    """Basic required anchorage length lb,rqd = (phi/4)(sigma_sd/fbd), mm.

    EN 1992-1-1, Eq. (8.3)

    Args:
        phi: bar diameter, mm.
        sigma_sd: design stress of the bar at the start of the anchorage, MPa.
        fbd: ultimate bond stress, MPa.
        All broadcast.

    """
    fbd = _arr(fbd)
    if not np.all(fbd > 0):
        msg = f"fbd must be positive, got fbd={fbd} MPa"
        raise ValueError(msg)
    return _arr(phi) / 4.0 * np.abs(_arr(sigma_sd)) / fbd


def alpha6(rho1: ArrayLike) -> NDArray[np.float64]:
    """Coefficient alpha6 = (rho1/25)^0.5, between 1.0 and 1.5 (-).

    EN 1992-1-1, 8.7.3(1), Table 8.3

    Args:
        rho1: percentage of reinforcement lapped within 0.65 l0 of the centre
            of the lap considered, % (0..100). Broadcasts.

    """
    rho1 = _arr(rho1)
    if not np.all((rho1 >= 0) & (rho1 <= 100)):
        msg = f"rho1 is a percentage between 0 and 100, got rho1={rho1} %"
        raise ValueError(msg)
    return np.clip(np.sqrt(rho1 / 25.0), 1.0, 1.5)


def l0_min(lb_rqd: ArrayLike, alpha6: ArrayLike, phi: ArrayLike) -> NDArray[np.float64]:
    """Minimum lap length max(0.3 alpha6 lb,rqd, 15 phi, 200 mm), mm.

    EN 1992-1-1, Eq. (8.11)

    Args:
        lb_rqd: basic required anchorage length, mm.
        alpha6: lap coefficient (-).
        phi: bar diameter, mm.
        All broadcast.

    """
    a = 0.3 * _arr(alpha6) * _arr(lb_rqd)
    b = 15.0 * _arr(phi)
    return np.maximum(np.maximum(a, b), 200.0)


def l0_lap(
    lb_rqd: ArrayLike,
    phi: ArrayLike,
    alpha6: ArrayLike,
    alpha1: ArrayLike = 1.0,
    alpha2: ArrayLike = 1.0,
    alpha3: ArrayLike = 1.0,
    alpha5: ArrayLike = 1.0,
) -> NDArray[np.float64]:
    """Design lap length l0 = alpha1 alpha2 alpha3 alpha5 alpha6 lb,rqd >= l0,min, mm.

    EN 1992-1-1, Eq. (8.10) with Eq. (8.11)

    For bars in compression Table 8.2 gives alpha1 = alpha2 = alpha3 = 1.0
    and no alpha5 (taken as 1.0), so the defaults are exact for compression
    laps and conservative for tension laps. alpha2 alpha3 alpha5 >= 0.7
    (Eq. (8.5)).

    Args:
        lb_rqd: basic required anchorage length, mm.
        phi: bar diameter, mm.
        alpha6: coefficient of Table 8.3 (-).
        alpha1: shape of bars (-).
        alpha2: concrete cover (-).
        alpha3: confinement by transverse reinforcement (-).
        alpha5: confinement by transverse pressure (-).
        All broadcast.

    """
    a2, a3, a5 = _arr(alpha2), _arr(alpha3), _arr(alpha5)
    if not np.all(a2 * a3 * a5 >= 0.7 - 1e-12):
        msg = f"alpha2 alpha3 alpha5 must be >= 0.7 (EN 1992-1-1, Eq. (8.5)), got {a2 * a3 * a5} (-)"
        raise ValueError(msg)
    l0 = _arr(alpha1) * a2 * a3 * a5 * _arr(alpha6) * _arr(lb_rqd)
    return np.maximum(l0, l0_min(lb_rqd, alpha6, phi))


def lap_length(
    phi: ArrayLike,
    fck: ArrayLike,
    fyk: ArrayLike = 500.0,
    sigma_sd: ArrayLike | None = None,
    rho1: ArrayLike = 100.0,
    bond: BondCondition = BondCondition.GOOD,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.float64]:
    """Lap length of column bars with alpha1..alpha5 = 1, mm.

    EN 1992-1-1, 8.7.3, Eqs. (8.2), (8.3), (8.10), (8.11)

    sigma_sd defaults to fyd (bar fully stressed, conservative). rho1
    defaults to 100 % (all bars lapped at one section, usual at a column
    splice above a floor), giving alpha6 = 1.5.

    Args:
        phi: bar diameter, mm.
        fck: cylinder strength, MPa.
        fyk: characteristic yield strength, MPa.
        sigma_sd: design bar stress, MPa, or None for fyd.
        rho1: percentage of bars lapped within 0.65 l0, %.
        bond: :class:`BondCondition` (good for vertical column bars).
        params: national parameters (gamma_c, gamma_s, alpha_ct).
        The numeric arguments broadcast.

    """
    sigma = fyd(fyk, params.gamma_s) if sigma_sd is None else _arr(sigma_sd)
    lb = lb_rqd(phi, sigma, fbd(fck, phi, bond, params))
    return l0_lap(lb, phi, alpha6(rho1))
