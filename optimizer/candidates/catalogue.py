"""The candidate catalogue: every column type the optimiser may choose from.

A column type is a section (rectangle b x h or circle D), a bar set (layout
as in :mod:`design.sections`), a link arrangement and a concrete grade. The
catalogue is generated from the scenario's ``[catalogue]`` table (all keys
optional; see docs/scenario.md):

``sizes_mm = {min = 250, max = 1200, step = 50}``, ``shapes`` (any of
"square", "rectangular", "circular"), ``aspects`` (h/b ratios of the
rectangles, default [1.5, 2.0], h rounded to the size step; at most 4:
EN 1992-1-1 5.3.1(7) calls a section with h > 4b a wall), ``bar_dias``,
``mixed_corners`` (corner bars one size up), ``max_bar_pitch_mm`` (largest
centre spacing of bars along a face), ``max_steel_ratio``, ``cover_mm``,
``min_size_mm``, ``exclude`` (sizes "BxH" or "D600"), ``types`` (explicit
types, e.g. ``{b = 500, h = 500, bars = "12H25"}``).

Generation rules (each a fact of the trade or a clause):

* bars fit with the clear spacing of EN 1992-1-1 8.2(2) and are no further
  apart than ``max_bar_pitch_mm`` (common practice: 300 mm);
* the steel ratio lies between 0.002 (9.5.2(2)) and ``max_steel_ratio``
  (default 0.04, 9.5.2(3)); bars at least phi_min (9.5.2(1));
* square sections carry the same number of bars on every face, rectangles
  the count on the long faces that spaces the bars most nearly as on the
  short faces (an even perimeter spacing, common practice); the link
  diameter is max(8 mm, phi_max/4) rounded up to a stocked size (9.5.3(1));
  the link spacing is scl,tmax rounded down to 25 mm (9.5.3(3)).

Pruning: a type that no cell of the building can use is removed after the
feasibility matrix is computed (that is always safe). Dominance pruning
("a lighter type of the same section with fewer, smaller bars is at least as
strong") is *not* applied: under the continuity rules a cell above must
carry no more bars per face and no larger bars than the cell below, so
swapping a type for a lighter one with fewer bars can break the stack above;
the integer program needs the heavier type to stay available.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

import numpy as np

from design import detailing
from design.cover import cmin, cmin_b, cmin_dur_for, cnom, parse_exposure
from design.fire import TABLE_5_2A, FireRating
from design.materials import Concrete, Reinforcement, parse_concrete_class
from design.params import NationalParameters
from design.resistance import DesignSection
from design.section_data import extra_ties
from design.sections import CircBars, CircSection, RectBars, RectSection, parse_bar_notation
from optimizer.building import MISSING, Scenario, TomlTable
from optimizer.errors import InputError, reject_unknown_keys

__all__ = [
    "Shape",
    "CatalogueSpec",
    "ColumnType",
    "Catalogue",
    "read_catalogue_spec",
    "build_catalogue",
    "reject_unknown",
    "type_arrays",
    "STEEL_DENSITY",
    "LINK_DIAS",
]

LINK_DIAS = (8.0, 10.0, 12.0, 16.0)
STEEL_DENSITY = 7850.0  # kg/m3, nominal mass of reinforcing steel (EN 10080 nominal mass)


class Shape(StrEnum):
    """Section shapes the catalogue may contain."""

    SQUARE = "square"
    RECTANGULAR = "rectangular"
    CIRCULAR = "circular"


@dataclass(frozen=True)
class CatalogueSpec:
    """Settings that generate the catalogue (sizes in mm)."""

    size_min: float = 250.0
    size_max: float = 1200.0
    size_step: float = 50.0
    shapes: tuple[Shape, ...] = (Shape.SQUARE, Shape.RECTANGULAR)
    aspects: tuple[float, ...] = (1.5, 2.0)
    bar_dias: tuple[float, ...] = (16.0, 20.0, 25.0, 32.0, 40.0)
    mixed_corners: bool = False
    max_bar_pitch: float = 300.0
    max_steel_ratio: float = 0.04
    cover: float | None = None
    min_size: float = 0.0
    exclude: tuple[str, ...] = ()
    explicit: tuple[tuple[float, float, float | None, str], ...] = ()  # (b, h, D, bars) — D for circles
    grades: tuple[float, ...] = ()  # fck of the grades the optimiser may choose per cell (empty: the cell's own)

    def __post_init__(self) -> None:
        if not 0 < self.size_min <= self.size_max:
            msg = f"catalogue sizes: need 0 < min <= max, got min={self.size_min} mm, max={self.size_max} mm"
            raise ValueError(msg)
        if not all(1.0 < a <= 4.0 for a in self.aspects):
            msg = f"aspects (h/b) must lie above 1 and at most 4 (EN 1992-1-1 5.3.1(7)), got {self.aspects}"
            raise ValueError(msg)


@dataclass(frozen=True)
class ColumnType:
    """One column type: a design section (section, bars, links, grade) and its link spacing."""

    mark: str
    design: DesignSection
    link_spacing: float  # mm, scl,tmax rounded down to 25 mm
    shape: Shape

    @property
    def section_key(self) -> str:
        """The formwork: shape and size, e.g. ``400x600`` or ``D600``."""
        s = self.design.section
        return f"D{s.diameter:g}" if isinstance(s, CircSection) else f"{s.b:g}x{s.h:g}"

    @property
    def label(self) -> str:
        """E.g. ``400x600 12H25 C40/50``."""
        return f"{self.design.section.label} {self.design.concrete.name}"

    @property
    def steel_kg_per_m(self) -> float:
        """Mass of the main bars per metre of column, kg/m."""
        return self.design.section.As * 1e-6 * STEEL_DENSITY


@dataclass(frozen=True)
class Catalogue:
    """The generated types, ordered by plan area, then steel, then grade (mark numbers follow)."""

    types: tuple[ColumnType, ...]
    cover_note: str
    grade_choice: bool = False  # True: every cell may take any grade of the catalogue

    def __len__(self) -> int:
        return len(self.types)

    @property
    def designs(self) -> list[DesignSection]:  # noqa: D102
        return [t.design for t in self.types]


def _floats(t: TomlTable, key: str, default: tuple[float, ...]) -> tuple[float, ...]:
    value = t.raw(key, required=False)
    if value is MISSING:
        return default
    if (
        not isinstance(value, list)
        or not value
        or not all(isinstance(v, (int, float)) and not isinstance(v, bool) and v > 0 for v in value)
    ):
        raise InputError(t.file, t.key(key), value, "a non-empty list of positive numbers (mm)")
    return tuple(float(v) for v in value)


def read_catalogue_spec(scenario: Scenario) -> CatalogueSpec:  # noqa: PLR0912, PLR0915 - reads and validates one input table, one branch per key
    """The ``[catalogue]`` table of a scenario as a CatalogueSpec (defaults where absent)."""
    raw = scenario.reserved.get("catalogue")
    if raw is None:
        return CatalogueSpec()
    t = TomlTable(scenario.source, "catalogue", dict(raw))
    kw: dict = {}
    sizes = t.table("sizes_mm", required=False)
    if sizes is not None:
        kw["size_min"] = sizes.num("min", positive=True)
        kw["size_max"] = sizes.num("max", positive=True)
        kw["size_step"] = sizes.num("step", positive=True)
        reject_unknown(sizes, {"min", "max", "step"})
    shapes = t.raw("shapes", required=False)
    if isinstance(shapes, list):
        try:
            kw["shapes"] = tuple(Shape(s) for s in shapes)
        except ValueError:
            raise InputError(t.file, t.key("shapes"), shapes, "a list of 'square', 'rectangular', 'circular'") from None
    elif shapes is not MISSING:
        raise InputError(t.file, t.key("shapes"), shapes, "a list of 'square', 'rectangular', 'circular'")
    kw["aspects"] = _floats(t, "aspects", CatalogueSpec.aspects)
    for key, name in (
        ("max_bar_pitch_mm", "max_bar_pitch"),
        ("max_steel_ratio", "max_steel_ratio"),
        ("cover_mm", "cover"),
        ("min_size_mm", "min_size"),
    ):
        v = t.num(key, required=False, positive=True)
        if v is not None:
            kw[name] = v
    bars = _floats(t, "bar_dias", CatalogueSpec.bar_dias)
    kw["bar_dias"] = bars
    mixed = t.bool_("mixed_corners", required=False)
    if mixed is not None:
        kw["mixed_corners"] = mixed
    excl = t.raw("exclude", required=False)
    if isinstance(excl, list):
        kw["exclude"] = tuple(str(e) for e in excl)
    elif excl is not MISSING:
        raise InputError(t.file, t.key("exclude"), excl, 'a list of sizes such as "400x400" or "D600"')
    listed = t.raw("types", required=False)
    if listed is not MISSING and not isinstance(listed, list):
        raise InputError(t.file, t.key("types"), listed, "an array of tables {b, h, bars} or {diameter, bars}")
    explicit = []
    for i, item in enumerate(listed if isinstance(listed, list) else []):
        if not isinstance(item, dict) or "bars" not in item:
            raise InputError(t.file, f"catalogue.types[{i}]", item, "a table {b, h, bars} or {diameter, bars}")
        try:
            parse_bar_notation(item["bars"])
        except ValueError as exc:
            raise InputError(t.file, f"catalogue.types[{i}].bars", item["bars"], str(exc)) from None
        explicit.append((item.get("b"), item.get("h"), item.get("diameter"), item["bars"]))
    kw["explicit"] = tuple(explicit)
    grades = t.raw("grades", required=False)
    if grades is not MISSING:
        if not isinstance(grades, list) or not grades:
            raise InputError(t.file, t.key("grades"), grades, 'a list of concrete classes, e.g. ["C40/50", "C50/60"]')
        fcks = []
        for g in grades:
            try:
                fcks.append(parse_concrete_class(g))
            except ValueError as exc:
                raise InputError(t.file, t.key("grades"), g, str(exc)) from None
        kw["grades"] = tuple(sorted(set(fcks)))
    reject_unknown(
        t,
        {
            "sizes_mm",
            "shapes",
            "aspects",
            "bar_dias",
            "grades",
            "mixed_corners",
            "max_bar_pitch_mm",
            "max_steel_ratio",
            "cover_mm",
            "min_size_mm",
            "exclude",
            "types",
        },
    )
    try:
        return CatalogueSpec(**kw)
    except ValueError as exc:
        raise InputError(scenario.source, "catalogue", dict(raw), str(exc)) from None


def reject_unknown(t: TomlTable, allowed: set[str]) -> None:
    """InputError for the first key of ``t`` not in ``allowed``, with a "did you mean" suggestion."""
    reject_unknown_keys(t.file, t.path, t.data, allowed)


def required_cover(scenario: Scenario, spec: CatalogueSpec, params: NationalParameters):
    """Nominal cover to the links as a function of the bars, and how it was found.

    Given in the scenario (the same for every type), or derived for the most
    onerous exposure class of the building: the links need
    max(cmin,b(link), cmin,dur, 10 mm) + delta_c_dev and the main bars
    max(cmin,b(phi), cmin,dur, 10 mm) + delta_c_dev measured to the bar
    (EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2), Table 4.2), so the cover to the
    links grows for large bars; rounded up to 5 mm. The cover check of every
    cell confirms it for its own exposure class.

    Returns:
        (cover(phi_max, link) -> mm, note)
    """
    if spec.cover is not None:
        fixed = spec.cover
        return (lambda phi, link, width=0.0, n_bars=4: fixed), f"{fixed:g} mm given in the scenario"
    dg = scenario.materials.aggregate_mm
    worst_dur, worst_exp = -1.0, None
    fck_min = min(c.settings.fck_MPa for c in scenario.cells)
    ratings = {int(str(c.settings.fire).upper().removeprefix("R")) for c in scenario.cells if c.settings.fire}
    worst_fire = FireRating(max(ratings)) if ratings else None
    for c in scenario.cells:
        if c.settings.exposure is None:
            continue
        exp = parse_exposure(c.settings.exposure)
        dur = float(cmin_dur_for(exp, fck_min, params=params).cmin_dur)
        if dur > worst_dur:
            worst_dur, worst_exp = dur, exp
    if worst_exp is None:
        raise InputError(
            scenario.source,
            "catalogue.cover_mm",
            None,
            "missing: give cover_mm, or exposure classes in [[settings]] to derive it",
        )

    def cover(phi: float, link: float, width: float = 0.0, n_bars: int = 4, phi_small: float | None = None) -> float:
        to_link = float(cnom(cmin(cmin_b(link, dg), worst_dur, params), params))
        to_bar = float(cnom(cmin(cmin_b(phi, dg), worst_dur, params), params)) - link
        need = max(to_link, to_bar)
        if worst_fire is not None:
            # axis distance of EN 1992-1-2 Table 5.2a (mu_fi = 0.7 column) for this width, met by every
            # bar: the smallest bar (phi_small, e.g. the middle bars under larger corners) sits closest
            usable = [a for b, a, eight in TABLE_5_2A[worst_fire][0.7] if width >= b and (n_bars >= 8 or not eight)]
            if usable:
                need = max(need, min(usable) - link - (phi if phi_small is None else phi_small) / 2)
        return 5.0 * math.ceil(need / 5.0 - 1e-9)

    fire_note = f" and {worst_fire.name} (EN 1992-1-2 Table 5.2a axis distance)" if worst_fire else ""
    return cover, (
        f"derived for exposure {worst_exp.name} (cmin,dur = {worst_dur:g} mm){fire_note} and each "
        "type's bars (EN 1992-1-1 4.4.1), rounded up to 5 mm"
    )


def _link_for(phi_max: float) -> float:
    need = max(8.0, phi_max / 4.0)  # 9.5.3(1), 8 mm as the smallest stocked link (common practice)
    return next(d for d in LINK_DIAS if d >= need - 1e-9)


def _face_counts(
    width: float, cover: float, link: float, dia: float, spec: CatalogueSpec, dg: float, params: NationalParameters
) -> list[int]:
    """Bar counts per face (corners included) that fit and are not too far apart."""
    usable = width - 2 * (cover + link) - dia  # centre-to-centre length between corner bars
    if usable <= 0:
        return []
    gap_min = float(detailing.min_clear_spacing(dia, dg, params))  # 8.2(2)
    out = []
    for n in range(2, 40):
        pitch = usable / (n - 1)
        if pitch - dia < gap_min - 1e-9:
            break
        if pitch <= spec.max_bar_pitch + 1e-9:
            out.append(n)
    return out


def _sizes(spec: CatalogueSpec) -> list[float]:
    n = int(math.floor((spec.size_max - spec.size_min) / spec.size_step + 1e-9)) + 1
    return [spec.size_min + k * spec.size_step for k in range(n) if spec.size_min + k * spec.size_step >= spec.min_size]


def build_catalogue(scenario: Scenario, spec: CatalogueSpec | None = None) -> Catalogue:  # noqa: PLR0912, PLR0915 - generates the types shape by shape, one branch per catalogue rule
    """Generate the catalogue of a scenario (every grade used in the building)."""
    params = scenario.params
    spec = spec or read_catalogue_spec(scenario)
    cover_for, note = required_cover(scenario, spec, params)
    dg = scenario.materials.aggregate_mm
    steel = Reinforcement.with_params(scenario.materials.fyk_MPa, scenario.materials.ductility, params=params)
    fcks = sorted(spec.grades) if spec.grades else sorted({c.settings.fck_MPa for c in scenario.cells})
    concretes = [Concrete.with_params(f, params) for f in fcks]
    excluded = {e.replace(" ", "").lower() for e in spec.exclude}
    sections: list[tuple[Shape, float, float, float | None]] = []
    sizes = _sizes(spec)
    top = spec.size_max + 1e-9
    for b in sizes:
        if Shape.SQUARE in spec.shapes and f"{b:g}x{b:g}" not in excluded:
            sections.append((Shape.SQUARE, b, b, None))
        if Shape.RECTANGULAR in spec.shapes:
            for ratio in spec.aspects:
                h = spec.size_step * round(b * ratio / spec.size_step)
                if b < h <= top and f"{b:g}x{h:g}" not in excluded and (Shape.RECTANGULAR, b, h, None) not in sections:
                    sections.append((Shape.RECTANGULAR, b, h, None))
        if Shape.CIRCULAR in spec.shapes and f"d{b:g}" not in excluded:
            sections.append((Shape.CIRCULAR, b, b, b))

    raw: list[tuple[DesignSection, float, Shape]] = []
    for shape, b, h, D in sections:
        for dia in spec.bar_dias:
            if dia < params.phi_min_long:
                continue
            link = _link_for(dia)
            cover = cover_for(dia, link, b, 8)
            if shape is Shape.CIRCULAR:
                raw += _circular_types(D, cover, link, dia, spec, dg, params, concretes, steel)
                continue
            nbs = _face_counts(b, cover, link, dia, spec, dg, params)
            nhs = _face_counts(h, cover, link, dia, spec, dg, params)
            corners = [None]
            if spec.mixed_corners:
                bigger = [d for d in spec.bar_dias if d > dia]
                if bigger:
                    corners.append(bigger[0])
            for nb in nbs:
                if shape is Shape.SQUARE:
                    pick = [nb] if nb in nhs else []
                else:
                    pitch_b = (b - 2 * (cover + link) - dia) / (nb - 1)
                    pick = sorted(nhs, key=lambda n: abs((h - 2 * (cover + link) - dia) / (n - 1) - pitch_b))[:1]
                for nh in pick:
                    for corner in corners:
                        if corner is not None and nb == 2 and nh == 2:
                            continue
                        big = max(dia, corner or 0.0)
                        try:
                            sec = RectSection(
                                b,
                                h,
                                cover_for(big, _link_for(big), b, 2 * nb + 2 * nh - 4, dia),
                                _link_for(big),
                                RectBars(dia, nb, nh, corner),
                            )
                        except ValueError:
                            continue
                        if not _ratio_ok(sec, spec, params):
                            continue
                        for conc in concretes:
                            raw.append((DesignSection(sec, conc, steel), _scl(sec, params), shape))
    for b, h, D, bars in spec.explicit:
        raw += _explicit(b, h, D, bars, cover_for, concretes, steel, params, scenario)
    raw.sort(key=lambda r: (r[0].section.Ac, r[0].section.As, r[0].concrete.fck, r[0].section.label))
    seen = set()
    types = []
    for ds, scl, shape in raw:
        key = (ds.section.label, ds.concrete.fck, ds.section.link)
        if key in seen:
            continue
        seen.add(key)
        types.append(ColumnType(f"T{len(types) + 1}", ds, scl, shape))
    if not types:
        raise InputError(scenario.source, "catalogue", "", "generates no column type; widen sizes or bar_dias")
    return Catalogue(tuple(types), note, grade_choice=bool(spec.grades))


def _ratio_ok(sec, spec: CatalogueSpec, params: NationalParameters) -> bool:
    rho = sec.As / sec.Ac
    return params.rho_min_area - 1e-12 <= rho <= spec.max_steel_ratio + 1e-12


def _scl(sec, params: NationalParameters) -> float:
    """scl,tmax rounded down to 25 mm (EN 1992-1-1, 9.5.3(3))."""
    smax = float(detailing.scl_tmax(sec.bars.min_dia, min(sec.b, sec.h), False, params))
    return 25.0 * math.floor(smax / 25.0 + 1e-9)


def _circular_types(D, cover, link, dia, spec, dg, params, concretes, steel):
    out = []
    rs = D / 2 - cover - link - dia / 2
    if rs <= 0:
        return out
    gap_min = float(detailing.min_clear_spacing(dia, dg, params))
    for n in range(6, 60):  # at least 6 bars in a circular column, 9.5.2(4)
        chord = 2 * rs * math.sin(math.pi / n)
        if chord - dia < gap_min - 1e-9:
            break
        if chord > spec.max_bar_pitch + 1e-9:
            continue
        sec = CircSection(D, cover, link, CircBars(dia, n))
        if not _ratio_ok(sec, spec, params):
            continue
        for conc in concretes:
            out.append((DesignSection(sec, conc, steel), _scl(sec, params), Shape.CIRCULAR))
    return out


def _explicit(b, h, D, bars, cover_for, concretes, steel, params, scenario):
    terms = parse_bar_notation(bars)
    dias = [d for _, d in terms]
    link = _link_for(max(dias))
    cover = cover_for(max(dias), link, min(float(b or D or 0), float(h or D or 0)), sum(n for n, _ in terms), min(dias))
    total = sum(n for n, _ in terms)
    try:
        if D is not None:
            sec = CircSection(float(D), cover, link, CircBars(dias[0], total))
            shape = Shape.CIRCULAR
        else:
            b, h = float(b), float(h)
            corner = terms[0][1] if len(terms) == 2 and terms[0][0] == 4 else None
            main = terms[-1][1]
            # symmetric perimeter layout: split the bars between the faces in proportion to b and h
            per = total - 4
            nb_extra = round(per / 2 * b / (b + h))
            nh_extra = per // 2 - nb_extra
            sec = RectSection(b, h, cover, link, RectBars(main, nb_extra + 2, nh_extra + 2, corner))
            shape = Shape.SQUARE if b == h else Shape.RECTANGULAR
    except (TypeError, ValueError) as exc:
        raise InputError(scenario.source, "catalogue.types", bars, str(exc)) from None
    return [(DesignSection(sec, c, steel), _scl(sec, params), shape) for c in concretes]


def type_arrays(cat: Catalogue, ties: np.ndarray | None = None) -> dict[str, np.ndarray]:
    """Per-type attribute arrays used by the feasibility matrix and the integer program.

    Args:
        cat: the catalogue.
        ties: extra ties per type when already known (e.g. from design.member.SectionData).
    """
    secs = [t.design.section for t in cat.types]
    circ = np.array([isinstance(s, CircSection) for s in secs])
    return {
        "circ": circ,
        "b": np.array([s.b for s in secs], dtype=float),
        "h": np.array([s.h for s in secs], dtype=float),
        "nb": np.array([s.bars.n if isinstance(s, CircSection) else s.bars.nb for s in secs]),
        "nh": np.array([0 if isinstance(s, CircSection) else s.bars.nh for s in secs]),
        "dia": np.array([s.bars.dia for s in secs], dtype=float),
        "corner_dia": np.array(
            [s.bars.dia if isinstance(s, CircSection) else s.bars.corner for s in secs], dtype=float
        ),
        "fck": np.array([t.design.concrete.fck for t in cat.types], dtype=float),
        "As": np.array([s.As for s in secs]),
        "Ac": np.array([s.Ac for s in secs]),
        "link": np.array([s.link for s in secs], dtype=float),
        "link_spacing": np.array([t.link_spacing for t in cat.types], dtype=float),
        "count": np.array([s.bars.count for s in secs]),
        "cover": np.array([s.cover for s in secs], dtype=float),
        "extra_ties": np.array([extra_ties(s) for s in secs]) if ties is None else np.asarray(ties),
        "max_dia": np.array([s.bars.max_dia for s in secs], dtype=float),
    }
