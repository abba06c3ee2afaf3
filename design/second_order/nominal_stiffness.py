"""Second-order moments of isolated columns by the nominal stiffness method.

EN 1992-1-1, 5.8.7: design modulus Ecd (Eq. (5.20)), nominal stiffness EI
(Eqs. (5.21)-(5.26)), buckling load NB (5.8.7.3(1)) and the moment
magnification of Eqs. (5.28), (5.29).

Units: N, mm, MPa; moments in N mm; curvatures in 1/mm. Compression positive.
Every function takes floats or numpy arrays; unless its docstring says
otherwise all numeric arguments broadcast against each other, so one call
handles every column of a building without a Python loop.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters

__all__ = ["Ecd", "k1_stiffness", "k2_stiffness", "EI_nominal", "NB_buckling", "beta_c0", "magnification"]


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# Nominal stiffness method, 5.8.7
# --------------------------------------------------------------------------


def Ecd(Ecm: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Design modulus of concrete for stiffness, Ecd = Ecm / gamma_cE, MPa.

    EN 1992-1-1, Eq. (5.20)

    Args:
        Ecm: secant modulus, MPa. Broadcasts.
        params: national parameters (gamma_cE, 5.8.6(3)).

    """
    _require(params.gamma_cE > 0, lambda: f"gamma_cE must be positive, got {params.gamma_cE} (-)")
    return _arr(Ecm) / params.gamma_cE


def k1_stiffness(fck: ArrayLike) -> NDArray[np.float64]:
    """Factor k1 = sqrt(fck / 20) of the nominal stiffness (-), fck in MPa.

    EN 1992-1-1, Eq. (5.23)

    Args:
        fck: characteristic cylinder strength, MPa. Broadcasts.

    """
    fck = _arr(fck)
    _require(fck > 0, lambda: f"fck must be positive, got fck={fck} MPa")
    return np.sqrt(fck / 20.0)


def k2_stiffness(n: ArrayLike, lam: ArrayLike | None = None) -> NDArray[np.float64]:
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
) -> NDArray[np.float64]:
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


def NB_buckling(EI: ArrayLike, l0: ArrayLike) -> NDArray[np.float64]:
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


def beta_c0(c0: ArrayLike) -> NDArray[np.float64]:
    """Factor beta = pi^2 / c0 of the moment magnification (-).

    EN 1992-1-1, Eq. (5.29); c0 = 8 for a constant first-order moment, 9.6
    for a parabolic and 12 for a symmetric triangular distribution.

    Args:
        c0: coefficient of the first-order moment distribution (-). Broadcasts.

    """
    c0 = _arr(c0)
    _require(c0 > 0, lambda: f"c0 must be positive, got c0={c0} (-)")
    return np.pi**2 / c0


def magnification(M0Ed: ArrayLike, NEd: ArrayLike, NB: ArrayLike, c0: ArrayLike = 8.0) -> NDArray[np.float64]:
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
    return _arr(M0Ed) * (1.0 + beta_c0(c0) / (ratio - 1.0))  # type: ignore[no-any-return]  # numpy stubs: np.divide with out= is Any
