"""Geometric imperfections of isolated columns and the minimum eccentricity.

EN 1992-1-1, 5.2 (inclination theta_i, Eqs. (5.1), (5.2), the simplified
l0/400 of 5.2(9)) and 6.1(4) (minimum eccentricity e0).

Units: N, mm, MPa; moments in N mm; curvatures in 1/mm. Compression positive.
Every function takes floats or numpy arrays; unless its docstring says
otherwise all numeric arguments broadcast against each other, so one call
handles every column of a building without a Python loop.
"""

from __future__ import annotations

from collections.abc import Callable
from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters

__all__ = ["ImperfectionMethod", "alpha_h", "alpha_m", "theta_i", "ei_inclination", "ei_simplified", "ei", "e0_min"]


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# Geometric imperfections, 5.2, and minimum eccentricity, 6.1(4)
# --------------------------------------------------------------------------


class ImperfectionMethod(StrEnum):
    """How the eccentricity ei of an isolated column is found (EN 1992-1-1, 5.2)."""

    INCLINATION = "inclination"  # ei = theta_i l0 / 2, Eqs. (5.1), (5.2)
    SIMPLIFIED = "simplified"  # ei = l0 / 400, 5.2(9) (alpha_h = 1)


def alpha_h(l: ArrayLike) -> NDArray[np.float64]:
    """Reduction factor for length or height, 2/3 <= alpha_h <= 1 (-).

    EN 1992-1-1, 5.2(5): alpha_h = 2 / sqrt(l), l in metres.

    Args:
        l: length or height, mm (converted to m inside). Broadcasts.

    """
    l = _arr(l)
    _require(l > 0, lambda: f"length l must be positive, got l={l} mm")
    return np.clip(2.0 / np.sqrt(l / 1000.0), 2.0 / 3.0, 1.0)


def alpha_m(m: ArrayLike) -> NDArray[np.float64]:
    """Reduction factor for the number of members, sqrt(0.5 (1 + 1/m)) (-).

    EN 1992-1-1, 5.2(5)

    Args:
        m: number of vertical members contributing to the total effect (-),
            >= 1 (1 for an isolated member, 5.2(6)). Broadcasts.

    """
    m = _arr(m)
    _require(m >= 1, lambda: f"number of members m must be >= 1, got m={m} (-)")
    return np.sqrt(0.5 * (1.0 + 1.0 / m))


def theta_i(l: ArrayLike, m: ArrayLike = 1.0, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Inclination imperfection theta_i = theta_0 alpha_h alpha_m, rad.

    EN 1992-1-1, Eq. (5.1)

    Args:
        l: length (isolated member: its actual length), mm.
        m: number of vertical members contributing (-), 1 for an isolated member.
        params: national parameters (theta_0).
        l and m broadcast.

    """
    return params.theta_0 * alpha_h(l) * alpha_m(m)


def ei_inclination(theta_i: ArrayLike, l0: ArrayLike) -> NDArray[np.float64]:
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


def ei_simplified(l0: ArrayLike) -> NDArray[np.float64]:
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
) -> NDArray[np.float64]:
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


def e0_min(h: ArrayLike) -> NDArray[np.float64]:
    """Minimum eccentricity e0 = max(h/30, 20 mm), mm.

    EN 1992-1-1, 6.1(4)

    Args:
        h: section depth in the direction of the eccentricity, mm. Broadcasts.

    """
    h = _arr(h)
    _require(h > 0, lambda: f"section depth must be positive, got h={h} mm")
    return np.maximum(h / 30.0, 20.0)
