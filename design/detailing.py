"""Detailing rules for columns: EN 1992-1-1, 8.2, 9.5.2 and 9.5.3.

Units: N, mm, MPa. The value functions take floats or numpy arrays and
broadcast over all numeric arguments; the ``check_*`` functions return a
:class:`design.results.CheckResult` for one column. Checks of the form
"value must be at least a minimum" store the minimum as demand and the value
provided as capacity (see :class:`~design.results.CheckResult`).
"""

from __future__ import annotations

from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckResult

__all__ = [
    "ColumnShape",
    "As_min",
    "As_max",
    "n_bars_min",
    "min_clear_spacing",
    "link_dia_min",
    "scl_tmax",
    "distance_to_restrained",
    "extra_ties_needed",
    "link_count",
    "check_phi_min",
    "check_As_min",
    "check_As_max",
    "check_bar_count",
    "check_clear_spacing",
    "check_link_diameter",
    "check_link_spacing",
    "check_bar_restraint",
]

RESTRAINT_DISTANCE_MM = 150.0  # EN 1992-1-1, 9.5.3(6)
LAP_LINK_PHI_MM = 14.0  # EN 1992-1-1, 9.5.3(4)(ii): reduced spacing at laps if phi > 14 mm


class ColumnShape(StrEnum):
    """Cross-section shape for the minimum number of bars, 9.5.2(4)."""

    RECTANGULAR = "rectangular"
    CIRCULAR = "circular"


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _positive(name: str, value: np.ndarray, unit: str) -> None:
    if not np.all(value > 0):
        msg = f"{name} must be positive, got {name}={value} {unit}"
        raise ValueError(msg)


# --------------------------------------------------------------------------
# Values
# --------------------------------------------------------------------------


def As_min(
    NEd: ArrayLike, fyd: ArrayLike, Ac: ArrayLike, params: NationalParameters = EN_RECOMMENDED
) -> NDArray[np.float64]:
    """Minimum longitudinal reinforcement max(0.10 NEd/fyd, 0.002 Ac), mm2.

    EN 1992-1-1, 9.5.2(2), Eq. (9.12N)

    Args:
        NEd: design axial compression, N (tension counts as 0).
        fyd: design yield strength, MPa.
        Ac: concrete area, mm2.
        params: national parameters (rho_min_axial, rho_min_area).
        All numeric arguments broadcast.

    """
    fyd, Ac = _arr(fyd), _arr(Ac)
    _positive("fyd", fyd, "MPa")
    _positive("Ac", Ac, "mm2")
    return np.maximum(params.rho_min_axial * np.maximum(_arr(NEd), 0.0) / fyd, params.rho_min_area * Ac)


def As_max(Ac: ArrayLike, at_lap: bool = False, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Maximum longitudinal reinforcement, 0.04 Ac (0.08 Ac at laps), mm2.

    EN 1992-1-1, 9.5.2(3)

    Args:
        Ac: concrete area, mm2. Broadcasts.
        at_lap: True for the lapped zone.
        params: national parameters (rho_max, rho_max_lap).

    """
    Ac = _arr(Ac)
    _positive("Ac", Ac, "mm2")
    return (params.rho_max_lap if at_lap else params.rho_max) * Ac


def n_bars_min(shape: ColumnShape) -> int:
    """Minimum number of longitudinal bars: 4 rectangular, 6 circular.

    EN 1992-1-1, 9.5.2(4)

    Args:
        shape: :class:`ColumnShape`.

    """
    return 4 if ColumnShape(shape) is ColumnShape.RECTANGULAR else 6


def min_clear_spacing(
    phi: ArrayLike, dg: ArrayLike, params: NationalParameters = EN_RECOMMENDED
) -> NDArray[np.float64]:
    """Minimum clear distance between bars max(k1 phi, dg + k2, 20 mm), mm.

    EN 1992-1-1, 8.2(2)

    Args:
        phi: bar diameter, mm.
        dg: maximum aggregate size, mm.
        params: national parameters (k1_spacing, k2_spacing_mm).
        phi and dg broadcast.

    """
    phi, dg = _arr(phi), _arr(dg)
    _positive("phi", phi, "mm")
    _positive("dg", dg, "mm")
    return np.maximum(np.maximum(params.k1_spacing * phi, dg + params.k2_spacing_mm), 20.0)


def link_dia_min(phi_max: ArrayLike) -> NDArray[np.float64]:
    """Minimum diameter of links max(6 mm, phi_max / 4), mm.

    EN 1992-1-1, 9.5.3(1)

    Args:
        phi_max: largest longitudinal bar diameter, mm. Broadcasts.

    """
    phi_max = _arr(phi_max)
    _positive("phi_max", phi_max, "mm")
    return np.maximum(6.0, phi_max / 4.0)


def scl_tmax(
    phi_min: ArrayLike, b_min: ArrayLike, reduced: ArrayLike = False, params: NationalParameters = EN_RECOMMENDED
) -> NDArray[np.float64]:
    """Maximum spacing of links min(20 phi_min, b_min, 400 mm), times 0.6 where reduced, mm.

    EN 1992-1-1, 9.5.3(3) and (4)

    Args:
        phi_min: smallest longitudinal bar diameter, mm.
        b_min: lesser dimension of the column, mm.
        reduced: True within the larger section dimension of a beam or slab
            and at laps of bars > 14 mm (9.5.3(4)); bool or bool array.
        params: national parameters (scl_factor_phi, scl_max_mm, scl_reduction).
        The arguments broadcast.

    """
    phi_min, b_min = _arr(phi_min), _arr(b_min)
    _positive("phi_min", phi_min, "mm")
    _positive("b_min", b_min, "mm")
    s = np.minimum(np.minimum(params.scl_factor_phi * phi_min, b_min), params.scl_max_mm)
    return np.where(np.asarray(reduced, dtype=bool), params.scl_reduction * s, s)


def distance_to_restrained(positions: ArrayLike, restrained: ArrayLike) -> NDArray[np.float64]:
    """Distance from each bar of one face to the nearest restrained bar, mm.

    EN 1992-1-1, 9.5.3(6) (centre-to-centre along the face; taking centres
    rather than clear gaps is on the safe side).

    Args:
        positions: bar centre coordinates along the face, mm (1-D).
        restrained: bool mask of the bars held by a link corner or tie (1-D,
            same length); at least one bar must be restrained.

    """
    x = _arr(positions).ravel()
    r = np.asarray(restrained, dtype=bool).ravel()
    if x.shape != r.shape or not r.any():
        msg = (
            f"positions and restrained need the same length and one restrained bar, "
            f"got {x.size} positions, {r.size} flags, {int(r.sum())} restrained bars"
        )
        raise ValueError(msg)
    return np.min(np.abs(x[:, None] - x[r][None, :]), axis=1)  # type: ignore[no-any-return]  # numpy stubs: np.min with axis= is Any


def extra_ties_needed(
    positions: ArrayLike, restrained: ArrayLike | None = None, max_distance: float = RESTRAINT_DISTANCE_MM
) -> int:
    """Least number of extra restrained bars so no bar of a face is over 150 mm from one.

    EN 1992-1-1, 9.5.3(6)

    Greedy cover of the bars from one end (optimal for points on a line):
    the first bar not yet within ``max_distance`` of a restrained bar gets
    the farthest bar within ``max_distance`` of it restrained. Loops over the
    bars of one face only.

    Args:
        positions: bar centre coordinates along the face, mm (1-D).
        restrained: bool mask of already restrained bars; None = the two end
            (corner) bars.
        max_distance: 150 mm (9.5.3(6)).

    """
    x = np.sort(_arr(positions).ravel())
    if x.size == 0:
        return 0
    if restrained is None:
        r = np.zeros(x.size, dtype=bool)
        r[[0, -1]] = True
    else:
        order = np.argsort(_arr(positions).ravel(), kind="stable")
        r = np.asarray(restrained, dtype=bool).ravel()[order].copy()
    tol = 1e-9
    extra = 0
    for k in range(x.size):
        if np.any(r & (np.abs(x - x[k]) <= max_distance + tol)):
            continue
        reach = np.nonzero(x <= x[k] + max_distance + tol)[0][-1]
        r[reach] = True
        extra += 1
    return extra


def link_count(
    l_clear: ArrayLike,
    h_max: ArrayLike,
    s_max: ArrayLike,
    phi_max_long: ArrayLike,
    lap_length: ArrayLike = 0.0,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.int_]:
    """Link sets needed over one storey's clear height (count, -).

    EN 1992-1-1, 9.5.3(3) and (4)

    Zones, from the bottom of the clear height: a reduced-spacing zone of
    length max(h_max, lap length) (the lap is taken just above the floor,
    common practice); the normal zone; a reduced-spacing zone of length h_max
    below the beam or slab above. Reduced spacing = scl_reduction x s_max.
    At laps of bars larger than 14 mm the bottom zone also keeps at least
    three links in the lap length (spacing <= lap/2). Short columns whose
    zones overlap get reduced spacing throughout. Links sit at both ends of
    the clear height and at the zone boundaries:
    count = ceil(Lb/sb) + ceil(Lm/s) + ceil(Lt/sr) + 1.

    Args:
        l_clear: clear storey height, mm.
        h_max: larger dimension of the column section, mm.
        s_max: maximum link spacing scl,tmax outside the zones, mm.
        phi_max_long: largest longitudinal bar diameter, mm.
        lap_length: lap length of the longitudinal bars at the foot, mm (0 = none).
        params: national parameters (scl_reduction).
        All numeric arguments broadcast.

    """
    L, hm, s, phi, lap = (_arr(v) for v in (l_clear, h_max, s_max, phi_max_long, lap_length))
    for name, v, u in (("l_clear", L, "mm"), ("h_max", hm, "mm"), ("s_max", s, "mm"), ("phi_max_long", phi, "mm")):
        _positive(name, v, u)
    if not np.all(lap >= 0):
        msg = f"lap_length must not be negative, got lap_length={lap} mm"
        raise ValueError(msg)
    s_red = params.scl_reduction * s
    lap_zone = (phi > LAP_LINK_PHI_MM) & (lap > 0)
    s_bot = np.where(lap_zone, np.minimum(s_red, np.where(lap > 0, lap, 1.0) / 2.0), s_red)
    Lb = np.minimum(np.maximum(hm, np.where(lap_zone, lap, 0.0)), L)
    Lt = np.minimum(hm, L - Lb)
    Lm = L - Lb - Lt

    def n(length: np.ndarray, spacing: np.ndarray) -> NDArray[np.float64]:
        return np.ceil(length / spacing - 1e-9)  # type: ignore[no-any-return]  # numpy stubs: ufunc of an unparametrised ndarray is Any

    return (n(Lb, s_bot) + n(Lm, s) + n(Lt, s_red) + 1).astype(int)


# --------------------------------------------------------------------------
# Checks
# --------------------------------------------------------------------------


def check_phi_min(phi: float, params: NationalParameters = EN_RECOMMENDED) -> CheckResult:
    """Longitudinal bar diameter phi >= phi_min (9.5.2(1)).

    Args:
        phi: smallest longitudinal bar diameter, mm.
        params: national parameters (phi_min_long).

    """
    return CheckResult(
        "longitudinal bar diameter", "EN 1992-1-1, 9.5.2(1)", demand=params.phi_min_long, capacity=float(phi), unit="mm"
    )


def check_As_min(
    As: float, NEd: float, fyd: float, Ac: float, params: NationalParameters = EN_RECOMMENDED
) -> CheckResult:
    """Longitudinal steel As >= As,min (9.5.2(2)).

    Args:
        As: longitudinal reinforcement provided, mm2.
        NEd: design axial force, N.
        fyd: design yield strength, MPa.
        Ac: concrete area, mm2.
        params: national parameters.

    """
    return CheckResult(
        "minimum longitudinal reinforcement",
        "EN 1992-1-1, 9.5.2(2)",
        demand=float(As_min(NEd, fyd, Ac, params)),
        capacity=float(As),
        unit="mm2",
    )


def check_As_max(
    As: float, Ac: float, at_lap: bool = False, params: NationalParameters = EN_RECOMMENDED
) -> CheckResult:
    """Longitudinal steel As <= As,max (9.5.2(3)); at laps pass the lapped total.

    Args:
        As: longitudinal reinforcement, mm2 (at laps: both sets of bars).
        Ac: concrete area, mm2.
        at_lap: True for the lapped zone (0.08 Ac).
        params: national parameters.

    """
    return CheckResult(
        "maximum longitudinal reinforcement" + (" at laps" if at_lap else ""),
        "EN 1992-1-1, 9.5.2(3)",
        demand=float(As),
        capacity=float(As_max(Ac, at_lap, params)),
        unit="mm2",
    )


def check_bar_count(n_bars: int, shape: ColumnShape = ColumnShape.RECTANGULAR) -> CheckResult:
    """Check the bar count >= 4 (rectangular) or 6 (circular) (9.5.2(4)).

    Args:
        n_bars: number of longitudinal bars.
        shape: :class:`ColumnShape`.

    """
    if n_bars < 0 or int(n_bars) != n_bars:
        msg = f"n_bars must be a non-negative integer, got n_bars={n_bars} bars"
        raise ValueError(msg)
    return CheckResult(
        "number of longitudinal bars",
        "EN 1992-1-1, 9.5.2(4)",
        demand=float(n_bars_min(shape)),
        capacity=float(n_bars),
        unit="bars",
    )


def check_clear_spacing(
    clear: float, phi: float, dg: float, params: NationalParameters = EN_RECOMMENDED
) -> CheckResult:
    """Smallest clear distance between bars >= max(k1 phi, dg + k2, 20 mm) (8.2(2)).

    Args:
        clear: smallest clear distance between bars provided, mm.
        phi: largest bar diameter, mm.
        dg: maximum aggregate size, mm.
        params: national parameters (k1_spacing, k2_spacing_mm).

    """
    return CheckResult(
        "clear distance between bars",
        "EN 1992-1-1, 8.2(2)",
        demand=float(min_clear_spacing(phi, dg, params)),
        capacity=float(clear),
        unit="mm",
    )


def check_link_diameter(phi_link: float, phi_max: float) -> CheckResult:
    """Link diameter >= max(6 mm, phi_max/4) (9.5.3(1)).

    Args:
        phi_link: link diameter, mm.
        phi_max: largest longitudinal bar diameter, mm.

    """
    return CheckResult(
        "link diameter",
        "EN 1992-1-1, 9.5.3(1)",
        demand=float(link_dia_min(phi_max)),
        capacity=float(phi_link),
        unit="mm",
    )


def check_link_spacing(
    s: float, phi_min: float, b_min: float, reduced: bool = False, params: NationalParameters = EN_RECOMMENDED
) -> CheckResult:
    """Link spacing s <= scl,tmax (9.5.3(3)), or 0.6 scl,tmax in the zones of 9.5.3(4).

    Args:
        s: link spacing provided, mm.
        phi_min: smallest longitudinal bar diameter, mm.
        b_min: lesser column dimension, mm.
        reduced: zone near a beam or slab, or at a lap of bars > 14 mm.
        params: national parameters.

    """
    clause = "EN 1992-1-1, 9.5.3(4)" if reduced else "EN 1992-1-1, 9.5.3(3)"
    return CheckResult(
        "link spacing" + (" (reduced zone)" if reduced else ""),
        clause,
        demand=float(s),
        capacity=float(scl_tmax(phi_min, b_min, reduced, params)),
        unit="mm",
    )


def check_bar_restraint(positions: ArrayLike, restrained: ArrayLike | None = None) -> CheckResult:
    """No compression bar farther than 150 mm from a restrained bar, one face (9.5.3(6)).

    Demand is the largest distance from a bar to the nearest restrained bar;
    ``extra["extra_ties"]`` gives the least number of extra ties that would
    make the face comply.

    Args:
        positions: bar centre coordinates along the face, mm (1-D).
        restrained: bool mask of restrained bars; None = the two end (corner) bars.

    """
    x = _arr(positions).ravel()
    if restrained is None:
        r = np.zeros(x.size, dtype=bool)
        r[[int(np.argmin(x)), int(np.argmax(x))]] = True
    else:
        r = np.asarray(restrained, dtype=bool).ravel()
    worst = float(np.max(distance_to_restrained(x, r)))
    extra = extra_ties_needed(x, r)
    return CheckResult(
        "restraint of compression bars",
        "EN 1992-1-1, 9.5.3(6)",
        demand=worst,
        capacity=RESTRAINT_DISTANCE_MM,
        unit="mm",
        note=f"{extra} extra tie(s) needed on this face" if extra else "",
        extra={"extra_ties": extra},
    )
