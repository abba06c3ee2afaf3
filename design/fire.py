"""Fire resistance of braced columns by method A, EN 1992-1-2, 5.3.2.

Table 5.2a (minimum width bmin and axis distance a) and Eq. (5.7) with its
terms. Method A applies only to columns of braced structures within its
conditions of use (5.3.2(2)): effective length in fire l0,fi <= 3 m for the
table (2 to 6 m for Eq. (5.7)), first-order eccentricity in fire
e = M0Ed,fi / N0Ed,fi <= emax = 0.15 h (or b), and As < 0.04 Ac. emax is
checked in each direction against the section dimension in that direction
(ez = M0Ed,fi,y / N0Ed,fi against h, ey = M0Ed,fi,z / N0Ed,fi against b);
the factor 0.15 is the recommended value of the Note to 5.3.2(2) and comes
from ``params.e_max_fire_factor``. Outside the conditions the checks return
``applicable=False`` with a note.

Units: N, mm, MPa; l0,fi in mm (converted to m inside Eq. (5.7)); fire
resistance in minutes.
"""

from __future__ import annotations

from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckResult

__all__ = [
    "FireRating",
    "TABLE_5_2A",
    "TABLE_5_2A_ONE_SIDE",
    "MU_FI_DEFAULT",
    "mu_fi",
    "axis_distance",
    "average_axis_distance",
    "b_prime",
    "R_eta_fi",
    "R_a",
    "R_l",
    "R_b",
    "R_n",
    "R_fire",
    "method_a_conditions",
    "check_fire_table",
    "check_fire_eq_5_7",
]

MU_FI_DEFAULT = 0.7  # EN 1992-1-2, 5.3.2(3): eta_fi = 0.7 may be used instead of mu_fi
L0_FI_MAX_TABLE_MM = 3000.0  # EN 1992-1-2, 5.3.2(2)
RHO_MAX_FIRE = 0.04  # EN 1992-1-2, 5.3.2(2): As < 0.04 Ac


class FireRating(IntEnum):
    """Standard fire resistance classes R (minutes)."""

    R30 = 30
    R60 = 60
    R90 = 90
    R120 = 120
    R180 = 180
    R240 = 240


# EN 1992-1-2 Table 5.2a, columns exposed on more than one side:
# rating -> {mu_fi: [(bmin mm, a mm, needs 8 bars), ...]}. An empty list
# means the table gives no value (R240, mu_fi = 0.7: width > 600 mm and a
# particular assessment of buckling required).
TABLE_5_2A: dict[FireRating, dict[float, list[tuple[float, float, bool]]]] = {
    FireRating.R30: {0.2: [(200, 25, False)], 0.5: [(200, 25, False)], 0.7: [(200, 32, False), (300, 27, False)]},
    FireRating.R60: {
        0.2: [(200, 25, False)],
        0.5: [(200, 36, False), (300, 31, False)],
        0.7: [(250, 46, False), (350, 40, False)],
    },
    FireRating.R90: {
        0.2: [(200, 31, False), (300, 25, False)],
        0.5: [(300, 45, False), (400, 38, False)],
        0.7: [(350, 53, False), (450, 40, True)],
    },
    FireRating.R120: {
        0.2: [(250, 40, False), (350, 35, False)],
        0.5: [(350, 45, True), (450, 40, True)],
        0.7: [(350, 57, True), (450, 51, True)],
    },
    FireRating.R180: {0.2: [(350, 45, True)], 0.5: [(350, 63, True)], 0.7: [(450, 70, True)]},
    FireRating.R240: {0.2: [(350, 61, True)], 0.5: [(450, 75, True)], 0.7: []},
}

# EN 1992-1-2 Table 5.2a, columns exposed on one side, mu_fi = 0.7: (bmin, a).
TABLE_5_2A_ONE_SIDE: dict[FireRating, tuple[float, float]] = {
    FireRating.R30: (155, 25),
    FireRating.R60: (155, 25),
    FireRating.R90: (155, 25),
    FireRating.R120: (175, 35),
    FireRating.R180: (230, 55),
    FireRating.R240: (295, 70),
}

_MU_COLUMNS = (0.2, 0.5, 0.7)


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def mu_fi(NEd_fi: ArrayLike, NRd: ArrayLike) -> NDArray[np.float64]:
    """Degree of utilisation in fire, mu_fi = NEd,fi / NRd (-).

    EN 1992-1-2, 5.3.2(3)

    Args:
        NEd_fi: design axial load in the fire situation, N.
        NRd: design axial resistance at normal temperature (EN 1992-1-1,
            gamma_m for persistent situations, incl. second-order effects
            and imperfection eccentricity), N.
        Both broadcast.

    """
    NRd = _arr(NRd)
    if not np.all(NRd > 0):
        msg = f"NRd must be positive, got NRd={NRd} N"
        raise ValueError(msg)
    return _arr(NEd_fi) / NRd


def axis_distance(c_link: ArrayLike, phi_link: ArrayLike, phi_main: ArrayLike) -> NDArray[np.float64]:
    """Axis distance of the main bars a = c_link + phi_link + phi_main / 2, mm.

    EN 1992-1-2, 5.2(1), Fig. 5.2 (nominal values)

    Args:
        c_link: nominal cover to the links, mm.
        phi_link: link diameter, mm.
        phi_main: main bar diameter, mm.
        All broadcast.

    """
    return _arr(c_link) + _arr(phi_link) + _arr(phi_main) / 2.0


def average_axis_distance(areas: ArrayLike, a: ArrayLike) -> float:
    """Area-weighted mean axis distance am = sum(As,i a_i) / sum(As,i), mm.

    EN 1992-1-2, 5.2(15), Eq. (5.5)

    The tables give the axis distance a of each bar of a single layer; the
    mean am is what the standard compares with them where bars lie in
    several layers or are of different sizes (bars of one layer each keep
    their own axis distance, so the member check compares the smallest a_i
    with the table as well, and reports am beside it).

    Args:
        areas: area of each bar, mm2 (1-D).
        a: axis distance of each bar to the nearest exposed surface, mm (1-D).

    """
    areas, a = _arr(areas), _arr(a)
    if areas.shape != a.shape or areas.size == 0 or np.any(areas <= 0):
        msg = f"areas and axis distances must be non-empty arrays of one shape with positive areas, got {areas}, {a}"
        raise ValueError(msg)
    return float(np.sum(areas * a) / np.sum(areas))


def b_prime(b: ArrayLike, h: ArrayLike | None = None) -> NDArray[np.float64]:
    """Equivalent width b' = 2 Ac / (b + h) (rectangle) or the diameter (circle), mm.

    EN 1992-1-2, 5.3.2(2), Eq. (5.7) terms

    Args:
        b: width, or diameter when ``h`` is None, mm.
        h: depth, mm, or None for a circular section.
        Both broadcast.

    """
    b = _arr(b)
    if h is None:
        return b
    h = _arr(h)
    return 2.0 * b * h / (b + h)


def R_eta_fi(mu_fi: ArrayLike, omega: ArrayLike, alpha_cc: float = 1.0) -> NDArray[np.float64]:
    """Term R_eta_fi = 83 (1 - mu_fi (1 + omega) / (0.85/alpha_cc + omega)), minutes.

    EN 1992-1-2, Eq. (5.7)

    Args:
        mu_fi: degree of utilisation in fire (-).
        omega: mechanical reinforcement ratio As fyd/(Ac fcd) at normal temperature (-).
        alpha_cc: coefficient on compressive strength (EN 1992-1-1, 3.1.6).
        mu_fi and omega broadcast.

    """
    mu, om = _arr(mu_fi), _arr(omega)
    return 83.0 * (1.0 - mu * (1.0 + om) / (0.85 / alpha_cc + om))


def R_a(a: ArrayLike) -> NDArray[np.float64]:
    """Term R_a = 1.60 (a - 30), minutes, a in mm (25 <= a <= 80).

    EN 1992-1-2, Eq. (5.7)

    Args:
        a: axis distance, mm. Broadcasts.

    """
    return 1.60 * (_arr(a) - 30.0)


def R_l(l0_fi: ArrayLike) -> NDArray[np.float64]:
    """Term R_l = 9.60 (5 - l0,fi), minutes, l0,fi in m (2 <= l0,fi <= 6).

    EN 1992-1-2, Eq. (5.7)

    Args:
        l0_fi: effective length in fire, mm (converted to m). Broadcasts.

    """
    return 9.60 * (5.0 - _arr(l0_fi) / 1000.0)


def R_b(b_prime: ArrayLike) -> NDArray[np.float64]:
    """Term R_b = 0.09 b', minutes, b' in mm (200 <= b' <= 450).

    EN 1992-1-2, Eq. (5.7)

    Args:
        b_prime: equivalent width, mm. Broadcasts.

    """
    return 0.09 * _arr(b_prime)


def R_n(n_bars: ArrayLike) -> NDArray[np.float64]:
    """Term R_n = 0 for 4 bars (corner bars only), 12 for more, minutes.

    EN 1992-1-2, Eq. (5.7)

    Args:
        n_bars: number of longitudinal bars. Broadcasts.

    """
    return np.where(_arr(n_bars) > 4, 12.0, 0.0)


def R_fire(R_eta_fi: ArrayLike, R_a: ArrayLike, R_l: ArrayLike, R_b: ArrayLike, R_n: ArrayLike) -> NDArray[np.float64]:
    """Fire resistance R = 120 ((R_eta_fi + R_a + R_l + R_b + R_n) / 120)^1.8, minutes.

    EN 1992-1-2, Eq. (5.7)

    A non-positive sum gives R = 0.

    Args:
        R_eta_fi: load term, minutes.
        R_a: axis-distance term, minutes.
        R_l: effective-length term, minutes.
        R_b: width term, minutes.
        R_n: bar-count term, minutes.
        All broadcast.

    """
    total = _arr(R_eta_fi) + _arr(R_a) + _arr(R_l) + _arr(R_b) + _arr(R_n)
    return 120.0 * (np.maximum(total, 0.0) / 120.0) ** 1.8


def method_a_conditions(
    l0_fi: float,
    b: float,
    h: float,
    As: float,
    Ac: float,
    e_y: float = 0.0,
    e_z: float = 0.0,
    l0_fi_max: float = L0_FI_MAX_TABLE_MM,
    params: NationalParameters = EN_RECOMMENDED,
) -> list[str]:
    """Reasons why method A does not apply (empty list when it applies).

    EN 1992-1-2, 5.3.2(2)

    Args:
        l0_fi: effective length in fire, mm.
        b: width along y (diameter for a circle), mm.
        h: depth along z (diameter for a circle), mm.
        As: longitudinal reinforcement, mm2.
        Ac: concrete area, mm2.
        e_y: first-order eccentricity in fire along y, M0Ed,fi,z / N0Ed,fi, mm.
        e_z: first-order eccentricity in fire along z, M0Ed,fi,y / N0Ed,fi, mm.
        l0_fi_max: limit on l0,fi, mm (3000 for Table 5.2a).
        params: national parameters (e_max_fire_factor).

    """
    if min(b, h, Ac) <= 0 or l0_fi <= 0 or As < 0:
        msg = (
            f"b, h, Ac, l0_fi must be positive and As >= 0, got b={b} mm, h={h} mm, "
            f"Ac={Ac} mm2, l0_fi={l0_fi} mm, As={As} mm2"
        )
        raise ValueError(msg)
    k = params.e_max_fire_factor
    reasons = []
    if l0_fi > l0_fi_max:
        reasons.append(f"l0,fi = {l0_fi:g} mm > {l0_fi_max:g} mm")
    if abs(e_z) > k * h:
        reasons.append(f"e along z = {abs(e_z):g} mm > emax = {k:g} h = {k * h:g} mm")
    if abs(e_y) > k * b:
        reasons.append(f"e along y = {abs(e_y):g} mm > emax = {k:g} b = {k * b:g} mm")
    if As >= RHO_MAX_FIRE * Ac:
        reasons.append(f"As = {As:g} mm2 is not below 0.04 Ac = {RHO_MAX_FIRE * Ac:g} mm2")
    return reasons


def _not_applicable(name: str, clause: str, reasons: list[str]) -> CheckResult:
    return CheckResult(
        name,
        clause,
        demand=0.0,
        capacity=0.0,
        unit="",
        note="method A does not apply: " + "; ".join(reasons),
        applicable=False,
    )


def check_fire_table(
    rating: FireRating,
    b: float,
    h: float,
    a: float,
    n_bars: int,
    As: float,
    Ac: float,
    l0_fi: float,
    mu_fi: float = MU_FI_DEFAULT,
    e_y: float = 0.0,
    e_z: float = 0.0,
    exposed_one_side: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> CheckResult:
    """Check a column against Table 5.2a (method A).

    EN 1992-1-2, 5.3.2(2)-(3), Table 5.2a

    mu_fi defaults to 0.7, the value 5.3.2(3) allows instead of the actual
    utilisation; it is the highest column of the table and so conservative.
    A given mu_fi is rounded up to the next column (0.2, 0.5, 0.7); no
    interpolation. Options marked ** in the table (at least 8 bars) count
    only with n_bars >= 8. The governing width is the lesser dimension
    min(b, h). Demand is the axis distance required for that width and
    capacity the axis distance provided; if the width is below every bmin,
    demand/capacity are the least bmin and the width.

    Args:
        rating: :class:`FireRating`.
        b: width along y (diameter for a circle), mm.
        h: depth along z (diameter for a circle), mm.
        a: axis distance of the main bars, mm.
        n_bars: number of longitudinal bars.
        As: longitudinal reinforcement, mm2.
        Ac: concrete area, mm2.
        l0_fi: effective length in fire, mm.
        mu_fi: degree of utilisation in fire (-), 0..0.7.
        e_y: first-order eccentricity in fire along y, mm.
        e_z: first-order eccentricity in fire along z, mm.
        exposed_one_side: column exposed on one side only (mu_fi = 0.7 column).
        params: national parameters (e_max_fire_factor).

    """
    rating = FireRating(rating)
    name = f"fire resistance {rating.name}, Table 5.2a"
    clause = "EN 1992-1-2, 5.3.2, Table 5.2a"
    if not 0.0 <= mu_fi <= 1.0:
        msg = f"mu_fi must lie between 0 and 1, got mu_fi={mu_fi} (-)"
        raise ValueError(msg)
    reasons = method_a_conditions(l0_fi, b, h, As, Ac, e_y, e_z, params=params)
    if mu_fi > _MU_COLUMNS[-1]:
        reasons.append(f"mu_fi = {mu_fi:g} > 0.7 is outside Table 5.2a")
    if reasons:
        return _not_applicable(name, clause, reasons)
    width = min(b, h)
    if exposed_one_side:
        bmin, amin = TABLE_5_2A_ONE_SIDE[rating]
        options = [(bmin, amin, False)]
        col = 0.7
    else:
        col = next(m for m in _MU_COLUMNS if mu_fi <= m + 1e-12)
        options = TABLE_5_2A[rating][col]
        if not options:
            return _not_applicable(
                name,
                clause,
                [
                    f"Table 5.2a gives no value for {rating.name} at mu_fi = 0.7 "
                    "(width > 600 mm and an assessment of buckling needed)"
                ],
            )
    usable = [(bm, am) for bm, am, eight in options if n_bars >= 8 or not eight]
    if not usable:
        return CheckResult(
            name,
            clause,
            demand=8.0,
            capacity=float(n_bars),
            unit="bars",
            note=f"the options for mu_fi = {col:g} need at least 8 bars",
        )
    fitting = [am for bm, am in usable if width >= bm]
    if not fitting:
        return CheckResult(
            name,
            clause,
            demand=float(min(bm for bm, _ in usable)),
            capacity=float(width),
            unit="mm",
            note=f"section width below bmin (mu_fi column {col:g})",
        )
    return CheckResult(
        name,
        clause,
        demand=float(min(fitting)),
        capacity=float(a),
        unit="mm",
        note=f"axis distance, mu_fi column {col:g}, width {width:g} mm",
    )


def check_fire_eq_5_7(
    rating: FireRating,
    b: float,
    h: float | None,
    a: float,
    n_bars: int,
    As: float,
    Ac: float,
    l0_fi: float,
    omega: float,
    mu_fi: float = MU_FI_DEFAULT,
    e_y: float = 0.0,
    e_z: float = 0.0,
    params: NationalParameters = EN_RECOMMENDED,
) -> CheckResult:
    """Check a column by Eq. (5.7) of method A: R >= the required rating.

    EN 1992-1-2, 5.3.2(2), Eq. (5.7)

    Ranges of validity: 25 <= a <= 80 mm, 2 <= l0,fi <= 6 m, 200 <= b' <= 450
    mm, h <= 1.5 b, plus e <= emax and As < 0.04 Ac. Values on the safe side
    of a range are clipped to its end (l0,fi < 2 m taken as 2 m, as the
    clause allows; a > 80 mm as 80; b' > 450 as 450); values on the unsafe
    side make the check not applicable. mu_fi defaults to 0.7 (conservative,
    5.3.2(3)).

    Args:
        rating: required :class:`FireRating`.
        b: width (diameter for a circle), mm.
        h: depth, mm, or None for a circular section.
        a: axis distance, mm.
        n_bars: number of longitudinal bars.
        As: longitudinal reinforcement, mm2.
        Ac: concrete area, mm2.
        l0_fi: effective length in fire, mm.
        omega: mechanical reinforcement ratio at normal temperature (-).
        mu_fi: degree of utilisation in fire (-).
        e_y: first-order eccentricity in fire along y, mm.
        e_z: first-order eccentricity in fire along z, mm.
        params: national parameters (alpha_cc, e_max_fire_factor).

    """
    rating = FireRating(rating)
    name = f"fire resistance {rating.name}, Eq. (5.7)"
    clause = "EN 1992-1-2, 5.3.2, Eq. (5.7)"
    hh = b if h is None else h
    reasons = method_a_conditions(l0_fi, b, hh, As, Ac, e_y, e_z, l0_fi_max=6000.0, params=params)
    bp = float(b_prime(b, h))
    if a < 25.0:
        reasons.append(f"a = {a:g} mm < 25 mm")
    if bp < 200.0:
        reasons.append(f"b' = {bp:g} mm < 200 mm")
    if h is not None and max(b, h) > 1.5 * min(b, h):
        reasons.append(f"h = {max(b, h):g} mm > 1.5 b = {1.5 * min(b, h):g} mm")
    if reasons:
        return _not_applicable(name, clause, reasons)
    R = float(
        R_fire(
            R_eta_fi(mu_fi, omega, params.alpha_cc),
            R_a(min(a, 80.0)),
            R_l(max(l0_fi, 2000.0)),
            R_b(min(bp, 450.0)),
            R_n(n_bars),
        )
    )
    return CheckResult(name, clause, demand=float(rating.value), capacity=R, unit="min", note=f"R = {R:.0f} min")
