"""Concrete cover to reinforcement, EN 1992-1-1, 4.4.1.

cmin,b from Table 4.2, the structural class from Table 4.3N, cmin,dur from
Table 4.4N (reinforcing steel), cmin from Eq. (4.2) and cnom from Eq. (4.1).
The structural class for 50 years and the durability allowances are
nationally determined and come from :class:`design.params.NationalParameters`;
Tables 4.3N and 4.4N hold the EN recommended values.

Units: mm, MPa. The value functions broadcast over their numeric arguments
(the exposure class is one value per call).
"""

from __future__ import annotations

from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike

from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckResult

__all__ = [
    "ExposureClass",
    "CMIN_DUR_TABLE_4_4N",
    "cmin_b",
    "structural_class",
    "cmin_dur",
    "cmin",
    "cnom",
    "check_cover",
]


class ExposureClass(StrEnum):
    """Exposure classes of EN 1992-1-1, Table 4.1 (EN 206)."""

    X0 = "X0"
    XC1 = "XC1"
    XC2 = "XC2"
    XC3 = "XC3"
    XC4 = "XC4"
    XD1 = "XD1"
    XD2 = "XD2"
    XD3 = "XD3"
    XS1 = "XS1"
    XS2 = "XS2"
    XS3 = "XS3"


# Columns of Table 4.4N, in order.
_DUR_COLUMN = {
    ExposureClass.X0: 0,
    ExposureClass.XC1: 1,
    ExposureClass.XC2: 2, ExposureClass.XC3: 2,
    ExposureClass.XC4: 3,
    ExposureClass.XD1: 4, ExposureClass.XS1: 4,
    ExposureClass.XD2: 5, ExposureClass.XS2: 5,
    ExposureClass.XD3: 6, ExposureClass.XS3: 6,
}

#: EN 1992-1-1 Table 4.4N, cmin,dur (mm) for reinforcing steel; rows S1..S6,
#: columns X0, XC1, XC2/XC3, XC4, XD1/XS1, XD2/XS2, XD3/XS3.
CMIN_DUR_TABLE_4_4N = np.array([
    [10, 10, 10, 15, 20, 25, 30],
    [10, 10, 15, 20, 25, 30, 35],
    [10, 10, 20, 25, 30, 35, 40],
    [10, 15, 25, 30, 35, 40, 45],
    [15, 20, 30, 35, 40, 45, 50],
    [20, 25, 35, 40, 45, 50, 55],
], dtype=float)

# EN 1992-1-1 Table 4.3N, "strength class" row: fck of the class at or above
# which the structural class may be reduced by 1. Columns X0, XC1, XC2/XC3,
# XC4, XD1, XD2/XS1, XD3/XS2/XS3 (note the grouping differs from Table 4.4N).
_STRENGTH_FCK = {
    ExposureClass.X0: 30.0,  # C30/37
    ExposureClass.XC1: 30.0,  # C30/37
    ExposureClass.XC2: 35.0, ExposureClass.XC3: 35.0,  # C35/45
    ExposureClass.XC4: 40.0,  # C40/50
    ExposureClass.XD1: 40.0,  # C40/50
    ExposureClass.XD2: 40.0, ExposureClass.XS1: 40.0,  # C40/50
    ExposureClass.XD3: 45.0, ExposureClass.XS2: 45.0, ExposureClass.XS3: 45.0,  # C45/55
}

AGGREGATE_LIMIT_MM = 32.0  # EN 1992-1-1, Table 4.2, note: +5 mm if dg > 32 mm
CMIN_ABSOLUTE_MM = 10.0  # EN 1992-1-1, Eq. (4.2)


def _arr(x: ArrayLike) -> np.ndarray:
    return np.asarray(x, dtype=float)


def cmin_b(phi: ArrayLike, dg: ArrayLike = 20.0) -> np.ndarray:
    """Minimum cover for bond, cmin,b = phi (+5 mm if dg > 32 mm), mm.

    EN 1992-1-1, 4.4.1.2(3), Table 4.2 (separated bars; for links pass the
    link diameter, for bundles the equivalent diameter phi_n).

    Args:
        phi: bar diameter, mm.
        dg: nominal maximum aggregate size, mm.
        Both broadcast.

    """
    phi, dg = _arr(phi), _arr(dg)
    if not np.all((phi > 0) & (dg > 0)):
        msg = f"phi and dg must be positive, got phi={phi} mm, dg={dg} mm"
        raise ValueError(msg)
    return phi + np.where(dg > AGGREGATE_LIMIT_MM, 5.0, 0.0)


def structural_class(
    exposure: ExposureClass,
    fck: ArrayLike,
    working_life_100y: bool = False,
    slab_geometry: bool = False,
    special_qc: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> np.ndarray:
    """Structural class (1..6 for S1..S6) after the Table 4.3N modifications.

    EN 1992-1-1, 4.4.1.2(5), Table 4.3N

    Starts from params.structural_class_50y (S4 recommended); +2 for a design
    working life of 100 years; -1 when fck reaches the strength class of the
    table for the exposure class; -1 for a member with slab geometry (not a
    column); -1 for special quality control of concrete production; the
    result is kept within S1..S6.

    Args:
        exposure: :class:`ExposureClass`.
        fck: concrete strength, MPa. Broadcasts.
        working_life_100y: design working life of 100 years.
        slab_geometry: member with slab geometry (never true for a column).
        special_qc: special quality control of concrete production ensured.
        params: national parameters (structural_class_50y).

    """
    exposure = ExposureClass(exposure)
    base = params.structural_class_50y
    if base not in range(1, 7):
        msg = f"structural_class_50y must be 1..6 (S1..S6), got {base} (-)"
        raise ValueError(msg)
    fck = _arr(fck)
    s = (base + (2 if working_life_100y else 0) - (1 if slab_geometry else 0)
         - (1 if special_qc else 0))
    s = s - np.where(fck >= _STRENGTH_FCK[exposure], 1, 0)
    return np.clip(s, 1, 6).astype(int)


def cmin_dur(exposure: ExposureClass, s_class: ArrayLike) -> np.ndarray:
    """Minimum cover for durability from Table 4.4N (reinforcing steel), mm.

    EN 1992-1-1, 4.4.1.2(5), Table 4.4N

    Args:
        exposure: :class:`ExposureClass`.
        s_class: structural class 1..6 (S1..S6). Broadcasts.

    """
    exposure = ExposureClass(exposure)
    s = np.asarray(s_class)
    if not np.all((s >= 1) & (s <= 6) & (s == np.round(s))):
        msg = f"structural class must be an integer 1..6 (S1..S6), got {s} (-)"
        raise ValueError(msg)
    return CMIN_DUR_TABLE_4_4N[s.astype(int) - 1, _DUR_COLUMN[exposure]]


def cmin(
    cmin_b: ArrayLike, cmin_dur: ArrayLike, params: NationalParameters = EN_RECOMMENDED
) -> np.ndarray:
    """Minimum cover cmin = max(cmin,b, cmin,dur + dc_gamma - dc_st - dc_add, 10 mm), mm.

    EN 1992-1-1, Eq. (4.2)

    Args:
        cmin_b: minimum cover for bond, mm.
        cmin_dur: minimum cover for durability, mm.
        params: national parameters (delta_c_dur_gamma, delta_c_dur_st,
            delta_c_dur_add).
        cmin_b and cmin_dur broadcast.

    """
    dur = (_arr(cmin_dur) + params.delta_c_dur_gamma - params.delta_c_dur_st
           - params.delta_c_dur_add)
    return np.maximum(np.maximum(_arr(cmin_b), dur), CMIN_ABSOLUTE_MM)


def cnom(cmin: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> np.ndarray:
    """Nominal cover cnom = cmin + delta_c_dev, mm.

    EN 1992-1-1, Eq. (4.1)

    Args:
        cmin: minimum cover, mm. Broadcasts.
        params: national parameters (delta_c_dev, 4.4.1.3(1)P).

    """
    return _arr(cmin) + params.delta_c_dev


def check_cover(
    c_nom_link: float,
    phi_link: float,
    phi_main: float,
    exposure: ExposureClass,
    fck: float,
    dg: float = 20.0,
    working_life_100y: bool = False,
    special_qc: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> list[CheckResult]:
    """Check the nominal cover to the links and to the main bars of a column.

    EN 1992-1-1, 4.4.1, Eqs. (4.1) and (4.2)

    Links: c_nom_link >= max(cmin,b(phi_link), cmin,dur, 10) + delta_c_dev.
    Main bars: c_nom_link + phi_link >= max(cmin,b(phi_main), cmin,dur, 10)
    + delta_c_dev.

    Args:
        c_nom_link: nominal cover to the links provided, mm.
        phi_link: link diameter, mm.
        phi_main: largest main bar diameter, mm.
        exposure: :class:`ExposureClass`.
        fck: concrete strength, MPa.
        dg: maximum aggregate size, mm.
        working_life_100y: design working life of 100 years.
        special_qc: special quality control of concrete production.
        params: national parameters.

    """
    if c_nom_link < 0:
        msg = f"nominal cover must not be negative, got c_nom_link={c_nom_link} mm"
        raise ValueError(msg)
    s = structural_class(exposure, fck, working_life_100y, False, special_qc, params)
    dur = float(cmin_dur(exposure, s))
    req_link = float(cnom(cmin(cmin_b(phi_link, dg), dur, params), params))
    req_main = float(cnom(cmin(cmin_b(phi_main, dg), dur, params), params))
    note = f"{ExposureClass(exposure).value}, S{int(s)}, cmin,dur = {dur:g} mm"
    return [
        CheckResult("nominal cover to links", "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
                    demand=req_link, capacity=float(c_nom_link), unit="mm", note=note),
        CheckResult("nominal cover to main bars", "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
                    demand=req_main, capacity=float(c_nom_link + phi_link), unit="mm", note=note),
    ]
