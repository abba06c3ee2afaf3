"""Concrete cover to reinforcement, EN 1992-1-1, 4.4.1.

cmin,b from Table 4.2, the structural class from Table 4.3N, cmin,dur from
Table 4.4N (reinforcing steel), cmin from Eq. (4.2) and cnom from Eq. (4.1).
The structural class for 50 years and the durability allowances are
nationally determined and come from :class:`design.params.NationalParameters`;
Tables 4.3N and 4.4N hold the EN recommended values.

Exposure classes follow Table 4.1, including freeze/thaw (XF1-XF4) and
chemical attack (XA1-XA3). Tables 4.3N and 4.4N cover only X0, XC, XD and
XS: a member exposed to XF or XA takes its cover from the accompanying
carbonation or chloride class, so such exposures are given as a combination,
:class:`Exposure` (``"XC4+XF1"``); cmin,dur is the largest over the classes
that Table 4.4N covers (:func:`cmin_dur_for`). The single-class functions
(:func:`structural_class`, :func:`cmin_dur`) keep working for X0/XC/XD/XS.

Annex E (informative), Table E.1N: indicative minimum strength classes for
durability (:func:`indicative_fck`, :func:`check_indicative_strength`).

Units: mm, MPa. The value functions broadcast over their numeric arguments
(the exposure is one value per call).
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.materials import STANDARD_CLASSES
from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckKind, CheckResult

__all__ = [
    "ExposureClass",
    "Exposure",
    "CminDur",
    "CMIN_DUR_TABLE_4_4N",
    "INDICATIVE_FCK_TABLE_E1N",
    "parse_exposure",
    "cmin_b",
    "structural_class",
    "cmin_dur",
    "cmin_dur_for",
    "cmin",
    "cnom",
    "check_cover",
    "indicative_fck",
    "check_indicative_strength",
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
    XF1 = "XF1"  # freeze/thaw: moderate water saturation, without de-icing agent
    XF2 = "XF2"  # moderate water saturation, with de-icing agent
    XF3 = "XF3"  # high water saturation, without de-icing agents
    XF4 = "XF4"  # high water saturation, with de-icing agents or sea water
    XA1 = "XA1"  # slightly aggressive chemical environment (EN 206, Table 2)
    XA2 = "XA2"  # moderately aggressive chemical environment
    XA3 = "XA3"  # highly aggressive chemical environment

    @property
    def in_table_4_4N(self) -> bool:
        """True for the classes that Tables 4.3N and 4.4N cover (X0, XC, XD, XS)."""
        return self in _DUR_COLUMN


@dataclass(frozen=True)
class Exposure:
    """The exposure classes of one member, e.g. XC4 + XF1 (EN 1992-1-1, Table 4.1).

    A member may be exposed to several actions at once (4.2(2) with Table
    4.1): carbonation or chlorides for the reinforcement and freeze/thaw or
    chemical attack for the concrete. At least one class must come from
    Table 4.4N (X0, XC, XD or XS) because XF and XA have no cover of their
    own; X0 ("no risk of corrosion or attack") cannot be combined with
    another class. Repeated classes are kept once, in the order given.

    Attributes:
        classes: the classes, as :class:`ExposureClass`.
    """

    classes: tuple[ExposureClass, ...]

    def __post_init__(self) -> None:
        if isinstance(self.classes, (str, ExposureClass)):
            msg = f"Exposure takes a tuple of classes; use Exposure.parse({str(self.classes)!r})"
            raise TypeError(msg)
        seen: list[ExposureClass] = []
        for c in self.classes:
            cls = _exposure_class(c, str(c))
            if cls not in seen:
                seen.append(cls)
        text = "+".join(c.value for c in seen)
        if not seen:
            msg = "an exposure needs at least one class of EN 1992-1-1 Table 4.1, e.g. 'XC3' or 'XC4+XF1'"
            raise ValueError(msg)
        if ExposureClass.X0 in seen and len(seen) > 1:
            msg = f"exposure {text!r}: X0 (no risk of corrosion or attack) cannot be combined with other classes"
            raise ValueError(msg)
        if not any(c.in_table_4_4N for c in seen):
            msg = (
                f"exposure {text!r}: XF and XA classes have no cover of their own (EN 1992-1-1 Table 4.4N); "
                f"give the accompanying carbonation or chloride class too, e.g. 'XC4+{seen[0].value}'"
            )
            raise ValueError(msg)
        object.__setattr__(self, "classes", tuple(seen))

    @classmethod
    def parse(cls, text: str) -> Exposure:
        """Exposure from text such as ``"XC4+XF1"`` (case and spaces ignored)."""
        parts = str(text).split("+")
        return cls(tuple(_exposure_class(p, str(text)) for p in parts))

    @property
    def name(self) -> str:
        """The classes joined by "+", e.g. ``"XC4+XF1"``."""
        return "+".join(c.value for c in self.classes)

    @property
    def cover_classes(self) -> tuple[ExposureClass, ...]:
        """The classes covered by Tables 4.3N and 4.4N (X0, XC, XD, XS)."""
        return tuple(c for c in self.classes if c.in_table_4_4N)

    def __str__(self) -> str:
        return self.name


def _exposure_class(value: object, whole: str) -> ExposureClass:
    """One class from a string or enum, with an error naming the bad part."""
    if isinstance(value, ExposureClass):
        return value
    part = str(value).strip().upper()
    try:
        return ExposureClass(part)
    except ValueError:
        known = ", ".join(c.value for c in ExposureClass)
        msg = (
            f"exposure {whole!r}: {str(value).strip()!r} is not an exposure class of EN 1992-1-1 Table 4.1; "
            f"expected one of {known}, joined by '+' (e.g. 'XC4+XF1')"
        )
        raise ValueError(msg) from None


def parse_exposure(value: Exposure | ExposureClass | str) -> Exposure:
    """An :class:`Exposure` from an Exposure, a single class or text such as ``"XC4+XF1"``."""
    if isinstance(value, Exposure):
        return value
    if isinstance(value, ExposureClass):
        return Exposure((value,))
    return Exposure.parse(str(value))


# Columns of Table 4.4N, in order.
_DUR_COLUMN = {
    ExposureClass.X0: 0,
    ExposureClass.XC1: 1,
    ExposureClass.XC2: 2,
    ExposureClass.XC3: 2,
    ExposureClass.XC4: 3,
    ExposureClass.XD1: 4,
    ExposureClass.XS1: 4,
    ExposureClass.XD2: 5,
    ExposureClass.XS2: 5,
    ExposureClass.XD3: 6,
    ExposureClass.XS3: 6,
}

#: EN 1992-1-1 Table 4.4N, cmin,dur (mm) for reinforcing steel; rows S1..S6,
#: columns X0, XC1, XC2/XC3, XC4, XD1/XS1, XD2/XS2, XD3/XS3.
CMIN_DUR_TABLE_4_4N = np.array(
    [
        [10, 10, 10, 15, 20, 25, 30],
        [10, 10, 15, 20, 25, 30, 35],
        [10, 10, 20, 25, 30, 35, 40],
        [10, 15, 25, 30, 35, 40, 45],
        [15, 20, 30, 35, 40, 45, 50],
        [20, 25, 35, 40, 45, 50, 55],
    ],
    dtype=float,
)

# EN 1992-1-1 Table 4.3N, "strength class" row: fck of the class at or above
# which the structural class may be reduced by 1. Columns X0, XC1, XC2/XC3,
# XC4, XD1, XD2/XS1, XD3/XS2/XS3 (note the grouping differs from Table 4.4N).
_STRENGTH_FCK = {
    ExposureClass.X0: 30.0,  # C30/37
    ExposureClass.XC1: 30.0,  # C30/37
    ExposureClass.XC2: 35.0,
    ExposureClass.XC3: 35.0,  # C35/45
    ExposureClass.XC4: 40.0,  # C40/50
    ExposureClass.XD1: 40.0,  # C40/50
    ExposureClass.XD2: 40.0,
    ExposureClass.XS1: 40.0,  # C40/50
    ExposureClass.XD3: 45.0,
    ExposureClass.XS2: 45.0,
    ExposureClass.XS3: 45.0,  # C45/55
}

AGGREGATE_LIMIT_MM = 32.0  # EN 1992-1-1, Table 4.2, note: +5 mm if dg > 32 mm
CMIN_ABSOLUTE_MM = 10.0  # EN 1992-1-1, Eq. (4.2)


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def cmin_b(phi: ArrayLike, dg: ArrayLike = 20.0) -> NDArray[np.float64]:
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


def _table_class(exposure: ExposureClass | str, table: str) -> ExposureClass:
    """A single class that Tables 4.3N/4.4N cover, with a clear error for XF/XA or a combination."""
    if isinstance(exposure, Exposure) and len(exposure.classes) == 1:
        exposure = exposure.classes[0]
    if isinstance(exposure, Exposure) or "+" in str(exposure):
        msg = (
            f"exposure {str(exposure)!r} is a combination; use cmin_dur_for() / check_cover(), "
            f"which take the largest cmin,dur over its classes"
        )
        raise ValueError(msg)
    exp = _exposure_class(exposure, str(exposure))
    if not exp.in_table_4_4N:
        msg = (
            f"exposure class {exp.value} has no column in EN 1992-1-1 {table}; the cover follows the "
            f"accompanying carbonation or chloride class: give a combination such as 'XC4+{exp.value}'"
        )
        raise ValueError(msg)
    return exp


def structural_class(
    exposure: ExposureClass,
    fck: ArrayLike,
    working_life_100y: bool = False,
    slab_geometry: bool = False,
    special_qc: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.int_]:
    """Structural class (1..6 for S1..S6) after the Table 4.3N modifications.

    EN 1992-1-1, 4.4.1.2(5), Table 4.3N

    Starts from params.structural_class_50y (S4 recommended); +2 for a design
    working life of 100 years; -1 when fck reaches the strength class of the
    table for the exposure class; -1 for a member with slab geometry (not a
    column); -1 for special quality control of concrete production; the
    result is kept within S1..S6.

    Args:
        exposure: :class:`ExposureClass`, one of X0, XC, XD, XS (XF and XA
            raise: see :func:`cmin_dur_for` for combinations).
        fck: concrete strength, MPa. Broadcasts.
        working_life_100y: design working life of 100 years.
        slab_geometry: member with slab geometry (never true for a column).
        special_qc: special quality control of concrete production ensured.
        params: national parameters (structural_class_50y).

    """
    exposure = _table_class(exposure, "Table 4.3N")
    base = params.structural_class_50y
    if base not in range(1, 7):
        msg = f"structural_class_50y must be 1..6 (S1..S6), got {base} (-)"
        raise ValueError(msg)
    fck = _arr(fck)
    s_general = base + (2 if working_life_100y else 0) - (1 if slab_geometry else 0) - (1 if special_qc else 0)
    s = s_general - np.where(fck >= _STRENGTH_FCK[exposure], 1, 0)
    return np.clip(s, 1, 6).astype(int)  # type: ignore[no-any-return]  # numpy stubs: np.clip of an NDArray[Any] is Any


def cmin_dur(exposure: ExposureClass, s_class: ArrayLike) -> NDArray[np.int_]:
    """Minimum cover for durability from Table 4.4N (reinforcing steel), mm.

    EN 1992-1-1, 4.4.1.2(5), Table 4.4N

    Args:
        exposure: :class:`ExposureClass`, one of X0, XC, XD, XS.
        s_class: structural class 1..6 (S1..S6). Broadcasts.

    """
    exposure = _table_class(exposure, "Table 4.4N")
    s = np.asarray(s_class)
    if not np.all((s >= 1) & (s <= 6) & (s == np.round(s))):
        msg = f"structural class must be an integer 1..6 (S1..S6), got {s} (-)"
        raise ValueError(msg)
    return CMIN_DUR_TABLE_4_4N[s.astype(int) - 1, _DUR_COLUMN[exposure]]  # type: ignore[no-any-return]  # numpy stubs: fancy indexing is Any


@dataclass(frozen=True)
class CminDur:
    """cmin,dur of an exposure combination and where it comes from; arrays of the shape of fck.

    Attributes:
        cmin_dur: largest Table 4.4N value over the classes, mm.
        s_class: structural class (1..6) of the governing class.
        governing: the governing class's name (str array), e.g. "XC4".
    """

    cmin_dur: np.ndarray
    s_class: np.ndarray
    governing: np.ndarray


def cmin_dur_for(
    exposure: Exposure | ExposureClass | str,
    fck: ArrayLike,
    working_life_100y: bool = False,
    slab_geometry: bool = False,
    special_qc: bool = False,
    params: NationalParameters = EN_RECOMMENDED,
) -> CminDur:
    """Minimum cover for durability of an exposure combination, mm.

    EN 1992-1-1, 4.4.1.2(5), Tables 4.3N and 4.4N

    For each class that Table 4.4N covers, the structural class follows
    Table 4.3N (:func:`structural_class`) and cmin,dur is read from Table
    4.4N; the result is the largest. XF and XA classes add nothing to the
    cover (the table has no column for them); they act through the concrete
    (Annex E, :func:`check_indicative_strength`).

    Args:
        exposure: :class:`Exposure`, a single class or text such as "XC4+XF1".
        fck: concrete strength, MPa. Broadcasts.
        working_life_100y: design working life of 100 years.
        slab_geometry: member with slab geometry.
        special_qc: special quality control of concrete production.
        params: national parameters.

    """
    exp = parse_exposure(exposure)
    best: tuple[np.ndarray, np.ndarray, np.ndarray] | None = None
    for c in exp.cover_classes:
        s = structural_class(c, fck, working_life_100y, slab_geometry, special_qc, params)
        dur = cmin_dur(c, s)
        name = np.full(np.shape(dur), c.value)
        if best is None:
            best = (dur, s, name)
        else:
            take = dur > best[0]
            best = (np.where(take, dur, best[0]), np.where(take, s, best[1]), np.where(take, name, best[2]))
    if best is None:  # never: an Exposure holds at least one class of Table 4.4N
        msg = f"exposure {exp.name!r} has no class of EN 1992-1-1 Table 4.4N"
        raise ValueError(msg)
    dur, s, name = best
    return CminDur(cmin_dur=np.asarray(dur, dtype=float), s_class=np.asarray(s, dtype=int), governing=np.asarray(name))


def cmin(cmin_b: ArrayLike, cmin_dur: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Minimum cover cmin = max(cmin,b, cmin,dur + dc_gamma - dc_st - dc_add, 10 mm), mm.

    EN 1992-1-1, Eq. (4.2)

    Args:
        cmin_b: minimum cover for bond, mm.
        cmin_dur: minimum cover for durability, mm.
        params: national parameters (delta_c_dur_gamma, delta_c_dur_st,
            delta_c_dur_add).
        cmin_b and cmin_dur broadcast.

    """
    dur = _arr(cmin_dur) + params.delta_c_dur_gamma - params.delta_c_dur_st - params.delta_c_dur_add
    return np.maximum(np.maximum(_arr(cmin_b), dur), CMIN_ABSOLUTE_MM)


def cnom(cmin: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
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
    exposure: Exposure | ExposureClass | str,
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
        exposure: :class:`ExposureClass`, :class:`Exposure` or text such as
            "XC4+XF1" (cmin,dur is the largest over the classes).
        fck: concrete strength, MPa.
        dg: maximum aggregate size, mm.
        working_life_100y: design working life of 100 years.
        special_qc: special quality control of concrete production.
        params: national parameters.

    """
    if c_nom_link < 0:
        msg = f"nominal cover must not be negative, got c_nom_link={c_nom_link} mm"
        raise ValueError(msg)
    exp = parse_exposure(exposure)
    found = cmin_dur_for(exp, fck, working_life_100y, False, special_qc, params)
    dur, s = float(found.cmin_dur), int(found.s_class)
    req_link = float(cnom(cmin(cmin_b(phi_link, dg), dur, params), params))
    req_main = float(cnom(cmin(cmin_b(phi_main, dg), dur, params), params))
    if len(exp.classes) == 1:
        note = f"{exp.name}, S{s}, cmin,dur = {dur:g} mm"
    else:
        note = f"{exp.name} (cover from {found.governing}), S{s}, cmin,dur = {dur:g} mm"
    return [
        CheckResult(
            "nominal cover to links",
            "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
            demand=req_link,
            capacity=float(c_nom_link),
            unit="mm",
            note=note,
        ),
        CheckResult(
            "nominal cover to main bars",
            "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
            demand=req_main,
            capacity=float(c_nom_link + phi_link),
            unit="mm",
            note=note,
        ),
    ]


#: EN 1992-1-1 Annex E (informative), Table E.1N: fck (MPa) of the indicative
#: minimum strength class for each exposure class. XF4 has no column in the
#: table and is not listed (see :func:`check_indicative_strength`).
#: Values recalled from memory and matched to a public secondary reproduction
#: of the table, not to the printed standard; the merged cells are read as
#: XC2/XC3 -> C25/30 and XC4 -> C30/37. (Some web copies give XC3 C30/37 and
#: XF4 C30/37: those are the EN 206 Table F.1 limiting values, not Table E.1N.)
INDICATIVE_FCK_TABLE_E1N: dict[ExposureClass, float] = {
    ExposureClass.X0: 12.0,  # C12/15
    ExposureClass.XC1: 20.0,  # C20/25
    ExposureClass.XC2: 25.0,
    ExposureClass.XC3: 25.0,  # C25/30
    ExposureClass.XC4: 30.0,  # C30/37
    ExposureClass.XD1: 30.0,
    ExposureClass.XD2: 30.0,  # C30/37
    ExposureClass.XD3: 35.0,  # C35/45
    ExposureClass.XS1: 30.0,  # C30/37
    ExposureClass.XS2: 35.0,
    ExposureClass.XS3: 35.0,  # C35/45
    ExposureClass.XF1: 30.0,  # C30/37
    ExposureClass.XF2: 25.0,  # C25/30
    ExposureClass.XF3: 30.0,  # C30/37
    ExposureClass.XA1: 30.0,
    ExposureClass.XA2: 30.0,  # C30/37
    ExposureClass.XA3: 35.0,  # C35/45
}


def _class_name(fck: float) -> str:
    cube = STANDARD_CLASSES.get(int(fck)) if float(fck).is_integer() else None
    return f"C{fck:g}/{cube}" if cube else f"C{fck:g}"


def indicative_fck(exposure: Exposure | ExposureClass | str) -> float:
    """Indicative minimum strength of an exposure, as the fck of its class, MPa.

    EN 1992-1-1, Annex E (informative), E.1(2), Table E.1N

    The largest over the classes of the exposure that the table lists (XF4
    is not in the table and adds nothing).

    Args:
        exposure: :class:`Exposure`, a single class or text such as "XC4+XF1".

    """
    exp = parse_exposure(exposure)
    return max(INDICATIVE_FCK_TABLE_E1N[c] for c in exp.classes if c in INDICATIVE_FCK_TABLE_E1N)


def check_indicative_strength(exposure: Exposure | ExposureClass | str, fck: float) -> CheckResult:
    """Check fck against the indicative strength class of Table E.1N (kind DURABILITY).

    EN 1992-1-1, Annex E (informative), Table E.1N

    "indicative strength class (Annex E)": demand = the required fck (the
    largest over the exposure's classes), capacity = the fck provided, MPa.
    Annex E is informative and a National Annex may replace it; where the
    exposure includes XF4, which Table E.1N does not list, the note says so
    (EN 206 gives the requirements for it; not checked here).

    Args:
        exposure: :class:`Exposure`, a single class or text such as "XC4+XF1".
        fck: characteristic cylinder strength provided, MPa.

    """
    if not fck > 0:
        msg = f"fck must be positive, got fck={fck} MPa"
        raise ValueError(msg)
    exp = parse_exposure(exposure)
    need = indicative_fck(exp)
    by = [c.value for c in exp.classes if INDICATIVE_FCK_TABLE_E1N.get(c) == need]
    note = f"{exp.name}: at least {_class_name(need)} (from {', '.join(by)})"
    missing = [c.value for c in exp.classes if c not in INDICATIVE_FCK_TABLE_E1N]
    if missing:
        note += f"; {', '.join(missing)} not in Table E.1N (see EN 206; not checked)"
    return CheckResult(
        "indicative strength class (Annex E)",
        "EN 1992-1-1, Annex E (informative), Table E.1N",
        demand=need,
        capacity=float(fck),
        unit="MPa",
        note=note,
        kind=CheckKind.DURABILITY,
    )
