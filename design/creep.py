"""Creep coefficient of concrete and the effective creep ratio of columns.

EN 1992-1-1, 3.1.4 (creep), Annex B.1 (the creep coefficient phi(t, t0)) and
5.8.4 (the effective creep ratio phi_ef used by the slenderness limit, Eq.
(5.13N), and by the curvature factor K_phi, Eq. (5.37)).

Only the final value phi(inf, t0) is computed: the development with time,
beta_c(t, t0) of Eq. (B.7), tends to 1 as t -> inf, which is what 5.8.4 asks
for. The concrete is taken at normal temperature: the temperature-adjusted
age of Eq. (B.10) is not applied, t0,T = t0.

Range of validity. phi(inf, t0) is the linear creep coefficient; it applies
when the compressive stress at the age of loading does not exceed
0.45 fck(t0), EN 1992-1-1, 3.1.4(2). Above that, creep is non-linear and the
coefficient is increased by Eq. (3.7), :func:`phi_nonlinear`, 3.1.4(4).
The values of Figure 3.1 are stated for ambient temperatures of -40 to
+40 degC and a mean relative humidity of 40 to 100 % (3.1.4(5)); this module
accepts any RH in (0, 100] and leaves that judgement to the caller.

Effective creep ratio. 5.8.4(2): phi_ef = phi(inf, t0) M0Eqp / M0Ed, Eq.
(5.19), where M0Eqp is the first-order moment in the quasi-permanent load
combination (SLS) and M0Ed the first-order moment in the design load
combination (ULS), both including imperfections. 5.8.4(4) allows phi_ef = 0
when phi(inf, t0) <= 2, lambda <= 75 and M0Ed / NEd >= h all hold; that
decision belongs to the member check, not to this module.

Units: mm, mm2, MPa, days, percent. Every function takes floats or numpy
arrays; unless its docstring says otherwise all numeric arguments broadcast
against each other and the result is a numpy array (0-d for scalars).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "CementClass",
    "CreepSettings",
    "notional_size",
    "perimeter_rectangle",
    "perimeter_circle",
    "alpha_123",
    "phi_RH",
    "beta_fcm",
    "beta_t0",
    "alpha_cement",
    "t0_adjusted",
    "phi_0",
    "phi_inf",
    "phi_ef",
    "phi_inf_section",
    "phi_nonlinear",
    "RATIO_MAX",
    "K_SIGMA_LINEAR",
]

FCM_SWITCH = 35.0  # EN 1992-1-1, Eqs. (B.3a)/(B.3b): fcm <= 35 MPa or > 35 MPa.
T0_MIN_DAYS = 0.5  # EN 1992-1-1, Eq. (B.9): lower limit of the adjusted age, days.
RATIO_MAX = 1.5  # upper bound accepted for M0Eqp / M0Ed in Eq. (5.19) (see phi_ef).
K_SIGMA_LINEAR = 0.45  # EN 1992-1-1, 3.1.4(2) and (4): limit of linear creep, sigma_c / fck(t0).


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


def _check_RH(RH: np.ndarray) -> None:
    _require((RH > 0.0) & (RH <= 100.0), lambda: f"relative humidity RH must lie in (0, 100] %, got RH={RH} %")


def _check_h0(h0: np.ndarray) -> None:
    _require((h0 > 0.0) & np.isfinite(h0), lambda: f"notional size h0 must be positive, got h0={h0} mm")


def _check_fcm(fcm: np.ndarray) -> None:
    _require((fcm > 0.0) & np.isfinite(fcm), lambda: f"fcm must be positive, got fcm={fcm} MPa")


def _check_t0(t0: np.ndarray) -> None:
    _require((t0 > 0.0) & np.isfinite(t0), lambda: f"age at loading t0 must be positive, got t0={t0} days")


class CementClass(StrEnum):
    """Cement class by rate of strength gain.

    EN 1992-1-1, 3.1.2(6)

    S: slow (CEM 32.5 N), N: normal (CEM 32.5 R, CEM 42.5 N), R: rapid
    (CEM 42.5 R, CEM 52.5 N, CEM 52.5 R).
    """

    S = "S"
    N = "N"
    R = "R"


# EN 1992-1-1, Eq. (B.9): exponent alpha of the cement class.
_ALPHA_CEMENT = {CementClass.S: -1.0, CementClass.N: 0.0, CementClass.R: 1.0}


def _cement(cement: CementClass | str) -> CementClass:
    try:
        return CementClass(str(cement).strip().upper())
    except ValueError:
        msg = f"cement class must be one of S, N, R (EN 1992-1-1, 3.1.2(6)), got cement={cement!r}"
        raise ValueError(msg) from None


@dataclass(frozen=True)
class CreepSettings:
    """Conditions that fix the final creep coefficient of a building's columns.

    Attributes:
        RH_percent: mean relative humidity of the ambient air, percent, in
            (0, 100]. 50 % is the usual value for heated interiors at concept
            stage (common practice; EN 1992-1-1 Fig. 3.1 is drawn for inside
            conditions RH = 50 % and outside conditions RH = 80 %).
        t0_days: age of the concrete when the sustained load is applied, days.
        cement: cement class, EN 1992-1-1, 3.1.2(6). A string "S", "N" or "R"
            is accepted and converted.

    """

    RH_percent: float = 50.0
    t0_days: float = 28.0
    cement: CementClass = CementClass.N

    def __post_init__(self) -> None:
        rh, t0 = float(self.RH_percent), float(self.t0_days)
        if not (0.0 < rh <= 100.0):
            msg = f"relative humidity RH_percent must lie in (0, 100] %, got RH_percent={self.RH_percent} %"
            raise ValueError(msg)
        if not (t0 > 0.0 and np.isfinite(t0)):
            msg = f"age at loading t0_days must be positive, got t0_days={self.t0_days} days"
            raise ValueError(msg)
        object.__setattr__(self, "cement", _cement(self.cement))

    def describe(self) -> str:
        """One sentence for a calculation sheet."""
        return (
            f"RH {self.RH_percent:g} %, t0 {self.t0_days:g} days, cement class {self.cement.value} "
            "(EN 1992-1-1 Annex B)"
        )


# --------------------------------------------------------------------------
# Notional size, 3.1.4(5) and B.1(1)
# --------------------------------------------------------------------------


def notional_size(Ac: ArrayLike, u: ArrayLike) -> NDArray[np.float64]:
    """Notional size h0 = 2 Ac / u of the cross-section, mm.

    EN 1992-1-1, 3.1.4(5) and Eq. (B.6)

    Args:
        Ac: concrete cross-sectional area, mm2.
        u: perimeter of the part of the section exposed to drying, mm.
        Both broadcast.

    """
    Ac, u = _arr(Ac), _arr(u)
    _require(Ac > 0, lambda: f"concrete area Ac must be positive, got Ac={Ac} mm2")
    _require(u > 0, lambda: f"drying perimeter u must be positive, got u={u} mm")
    return 2.0 * Ac / u


def perimeter_rectangle(b: ArrayLike, h: ArrayLike) -> NDArray[np.float64]:
    """Perimeter u = 2 (b + h) of a rectangle exposed to drying on all faces, mm.

    EN 1992-1-1, 3.1.4(5) (u for a column drying on its whole perimeter)

    Args:
        b: section width, mm.
        h: section depth, mm.
        Both broadcast.

    """
    b, h = _arr(b), _arr(h)
    _require((b > 0) & (h > 0), lambda: f"section sides must be positive, got b={b} mm, h={h} mm")
    return 2.0 * (b + h)


def perimeter_circle(D: ArrayLike) -> NDArray[np.float64]:
    """Perimeter u = pi D of a circle exposed to drying all round, mm.

    EN 1992-1-1, 3.1.4(5) (u for a column drying on its whole perimeter)

    Args:
        D: diameter, mm. Broadcasts.

    """
    D = _arr(D)
    _require(D > 0, lambda: f"diameter must be positive, got D={D} mm")
    return np.pi * D


# --------------------------------------------------------------------------
# Notional creep coefficient, B.1
# --------------------------------------------------------------------------


def alpha_123(fcm: ArrayLike) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Coefficients (alpha1, alpha2, alpha3) for the influence of concrete strength (-).

    EN 1992-1-1, Eq. (B.8c)
    alpha1 = (35/fcm)^0.7, alpha2 = (35/fcm)^0.2, alpha3 = (35/fcm)^0.5.

    Args:
        fcm: mean compressive strength at 28 days, MPa. Broadcasts.

    """
    fcm = _arr(fcm)
    _check_fcm(fcm)
    r = FCM_SWITCH / fcm
    return r**0.7, r**0.2, r**0.5


def phi_RH(RH: ArrayLike, h0: ArrayLike, fcm: ArrayLike) -> NDArray[np.float64]:
    """Factor for the effect of relative humidity on the notional creep coefficient (-).

    EN 1992-1-1, Eqs. (B.3a) and (B.3b)
    fcm <= 35 MPa: phi_RH = 1 + (1 - RH/100) / (0.1 h0^(1/3));
    fcm > 35 MPa:  phi_RH = [1 + (1 - RH/100) / (0.1 h0^(1/3)) alpha1] alpha2.

    Args:
        RH: relative humidity of the ambient environment, percent, in (0, 100].
        h0: notional size of the member, mm.
        fcm: mean compressive strength at 28 days, MPa.
        All broadcast.

    """
    RH, h0, fcm = _arr(RH), _arr(h0), _arr(fcm)
    _check_RH(RH)
    _check_h0(h0)
    a1, a2, _ = alpha_123(fcm)
    dry = (1.0 - RH / 100.0) / (0.1 * np.cbrt(h0))
    return np.where(fcm <= FCM_SWITCH, 1.0 + dry, (1.0 + dry * a1) * a2)


def beta_fcm(fcm: ArrayLike) -> NDArray[np.float64]:
    """Factor for the effect of concrete strength, 16.8 / sqrt(fcm) (-).

    EN 1992-1-1, Eq. (B.4)

    Args:
        fcm: mean compressive strength at 28 days, MPa. Broadcasts.

    """
    fcm = _arr(fcm)
    _check_fcm(fcm)
    return 16.8 / np.sqrt(fcm)


def beta_t0(t0: ArrayLike) -> NDArray[np.float64]:
    """Factor for the effect of the age at loading, 1 / (0.1 + t0^0.20) (-).

    EN 1992-1-1, Eq. (B.5)

    Args:
        t0: age of the concrete at loading, days; pass the age adjusted for
            the cement class, :func:`t0_adjusted`. Broadcasts.

    """
    t0 = _arr(t0)
    _check_t0(t0)
    return 1.0 / (0.1 + t0**0.20)


def alpha_cement(cement: CementClass | str) -> float:
    """Exponent alpha of the cement class: -1 (S), 0 (N), 1 (R) (-).

    EN 1992-1-1, B.1(2), Eq. (B.9)

    Args:
        cement: cement class (a single value, not an array).

    """
    return _ALPHA_CEMENT[_cement(cement)]


def t0_adjusted(t0: ArrayLike, cement: CementClass | str = CementClass.N) -> NDArray[np.float64]:
    """Age at loading modified for the type of cement, days.

    EN 1992-1-1, Eq. (B.9)
    t0 = t0,T (9 / (2 + t0,T^1.2) + 1)^alpha >= 0.5, alpha = -1 (S), 0 (N), 1 (R).

    Normal temperature is assumed: the temperature-adjusted age t0,T of
    Eq. (B.10) is taken equal to the age t0 (out of scope here).

    Args:
        t0: age of the concrete at loading, days. Broadcasts.
        cement: cement class, one value for the whole call.

    """
    t0 = _arr(t0)
    _check_t0(t0)
    a = alpha_cement(cement)
    return np.maximum(t0 * (9.0 / (2.0 + t0**1.2) + 1.0) ** a, T0_MIN_DAYS)


def phi_0(
    RH: ArrayLike, h0: ArrayLike, fcm: ArrayLike, t0: ArrayLike, cement: CementClass | str = CementClass.N
) -> NDArray[np.float64]:
    """Notional creep coefficient phi_0 = phi_RH beta(fcm) beta(t0) (-).

    EN 1992-1-1, Eq. (B.2)

    beta(t0) is evaluated at the age adjusted for the cement class, Eq. (B.9).

    Args:
        RH: relative humidity, percent, in (0, 100].
        h0: notional size, mm.
        fcm: mean compressive strength at 28 days, MPa.
        t0: age of the concrete at loading, days.
        cement: cement class, one value for the whole call.
        RH, h0, fcm and t0 broadcast.

    """
    return phi_RH(RH, h0, fcm) * beta_fcm(fcm) * beta_t0(t0_adjusted(t0, cement))


def phi_inf(
    RH: ArrayLike, h0: ArrayLike, fcm: ArrayLike, t0: ArrayLike, cement: CementClass | str = CementClass.N
) -> NDArray[np.float64]:
    """Final creep coefficient phi(inf, t0) (-).

    EN 1992-1-1, Eq. (B.1)
    phi(inf, t0) = phi_0 beta_c(inf, t0), with beta_c(inf, t0) = 1 from Eq. (B.7) as t -> inf.

    Linear creep: valid for a compressive stress at t0 of at most 0.45 fck(t0),
    3.1.4(2); see :func:`phi_nonlinear` above that.

    Args:
        RH: relative humidity, percent, in (0, 100].
        h0: notional size, mm.
        fcm: mean compressive strength at 28 days, MPa.
        t0: age of the concrete at loading, days.
        cement: cement class, one value for the whole call.
        RH, h0, fcm and t0 broadcast.

    """
    beta_c_inf = 1.0  # Eq. (B.7): ((t - t0) / (beta_H + t - t0))^0.3 -> 1 as t -> inf
    return phi_0(RH, h0, fcm, t0, cement) * beta_c_inf


def phi_inf_section(Ac: ArrayLike, u: ArrayLike, fcm: ArrayLike, settings: CreepSettings) -> NDArray[np.float64]:
    """Final creep coefficient phi(inf, t0) of sections under the given settings (-).

    EN 1992-1-1, Eq. (B.1) with h0 = 2 Ac / u, 3.1.4(5)

    Args:
        Ac: concrete cross-sectional area, mm2.
        u: perimeter exposed to drying, mm (whole perimeter for a column:
            :func:`perimeter_rectangle`, :func:`perimeter_circle`).
        fcm: mean compressive strength at 28 days, MPa.
        settings: humidity, age at loading and cement class.
        Ac, u and fcm broadcast.

    """
    h0 = notional_size(Ac, u)
    return phi_inf(settings.RH_percent, h0, fcm, settings.t0_days, settings.cement)


# --------------------------------------------------------------------------
# Effective creep ratio, 5.8.4, and non-linear creep, 3.1.4(4)
# --------------------------------------------------------------------------


def phi_ef(phi_inf: ArrayLike, M0Eqp_over_M0Ed: ArrayLike) -> NDArray[np.float64]:
    """Effective creep ratio phi_ef = phi(inf, t0) M0Eqp / M0Ed (-).

    EN 1992-1-1, 5.8.4(2), Eq. (5.19)

    The ratio is normally between 0 and 1 (the quasi-permanent moment is part
    of the design moment). A ratio above 1 is unusual but possible, e.g. when
    a favourable variable action lowers the ULS moment below the SLS one;
    values up to 1.5 are accepted. If the ratio varies along the member it may
    be taken at the section of maximum moment or as a representative mean,
    5.8.4(2).

    Args:
        phi_inf: final creep coefficient phi(inf, t0) (-), >= 0.
        M0Eqp_over_M0Ed: first-order moment in the quasi-permanent combination
            over the first-order moment in the design combination (-), in
            [0, 1.5]; both moments include imperfections.
        Both broadcast.

    """
    phi, ratio = _arr(phi_inf), _arr(M0Eqp_over_M0Ed)
    _require(
        (phi >= 0) & np.isfinite(phi),
        lambda: f"creep coefficient phi(inf, t0) must not be negative, got phi_inf={phi} (-)",
    )
    _require(
        (ratio >= 0.0) & (ratio <= RATIO_MAX),
        lambda: f"moment ratio M0Eqp/M0Ed must lie in [0, {RATIO_MAX:g}], got {ratio} (-)",
    )
    return phi * ratio


def phi_nonlinear(phi: ArrayLike, k_sigma: ArrayLike) -> NDArray[np.float64]:
    """Creep coefficient increased for non-linear creep (-).

    EN 1992-1-1, 3.1.4(4), Eq. (3.7)
    phi_nl(inf, t0) = phi(inf, t0) exp(1.5 (k_sigma - 0.45)) for k_sigma > 0.45.

    Used when the compressive stress at the age of loading, sigma_c, exceeds
    0.45 fck(t0) (3.1.4(4)); for k_sigma <= 0.45 creep is linear and ``phi``
    is returned unchanged.

    Args:
        phi: linear creep coefficient phi(inf, t0) (-), >= 0.
        k_sigma: stress-strength ratio sigma_c / fck(t0) at the age of
            loading (-), >= 0.
        Both broadcast.

    """
    phi, k = _arr(phi), _arr(k_sigma)
    _require((phi >= 0) & np.isfinite(phi), lambda: f"creep coefficient must not be negative, got phi={phi} (-)")
    _require((k >= 0) & np.isfinite(k), lambda: f"stress-strength ratio k_sigma must not be negative, got {k} (-)")
    return np.where(k > K_SIGMA_LINEAR, phi * np.exp(1.5 * (k - K_SIGMA_LINEAR)), phi)
