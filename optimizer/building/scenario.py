"""Scenario files: TOML loading and validation into frozen dataclasses.

A scenario describes a building for the column optimiser: metadata, national
parameters, materials, levels (bottom to top), column stacks, floor plates,
design settings and either a load takedown or per-cell actions from an
analysis (``actions = "FILE.csv"``). Every key is documented in
``docs/scenario.md``.

Conventions:

* A *level* is a suspended floor together with the storey of columns directly
  below it. ``height_m`` is the floor-to-floor height of that storey and
  ``slab_depth_mm`` the depth of the floor slab at its top, so the clear height
  of the columns is ``height_m - slab_depth_mm / 1000``. The ground-bearing
  slab is not modelled; the lowest level's columns start at the foundation.
* A *cell* is one column in one storey: ``CellId(stack, level)``; it carries
  the floor of its level at its top.
* Rectangular section b x h: b along the section's local y axis, h along
  local z (EN 1992-1-1, Fig. 5.8). By default local y lies along plan X.

Every user mistake raises :class:`optimizer.errors.InputError` naming the
file, the key, the value and what was expected.
"""

from __future__ import annotations

import difflib
import math
import re
import tomllib
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from enum import Enum
from functools import cached_property
from pathlib import Path
from types import MappingProxyType
from typing import Any, NamedTuple

import networkx as nx
from shapely.geometry import Polygon

from design.creep import CementClass, CreepSettings
from design.materials import Ductility, parse_concrete_class
from design.params import NationalParameters, ParameterSet, parameter_set, with_overrides
from optimizer.building.loads import PSI_FACTORS, Category, Combination, ImposedReduction
from optimizer.errors import InputError, did_you_mean

__all__ = [
    "CellId",
    "Project",
    "ConcreteZone",
    "Materials",
    "Level",
    "Orientation",
    "SupportKind",
    "Stack",
    "Floor",
    "LevelFloor",
    "EffectiveLength",
    "CellSettings",
    "Cell",
    "TakedownOptions",
    "Scenario",
    "load_scenario",
    "load_scenario_text",
    "RESERVED_TABLES",
    "EXPOSURE_CLASSES",
    "FIRE_RESISTANCES",
    "fire_requirement",
    "POSITION_TOLERANCE_M",
]

# Reserved tables accepted as opaque dictionaries for later issues.
RESERVED_TABLES = ("catalogue", "rules", "costs", "optimizer")
TOP_LEVEL_KEYS = (
    "project", "parameters", "materials", "levels", "stacks", "floors",
    "settings", "takedown", "actions", "creep", *RESERVED_TABLES,
)

# Exposure classes of EN 1992-1-1, Table 4.1.
EXPOSURE_CLASSES = frozenset(
    ["X0", "XC1", "XC2", "XC3", "XC4", "XD1", "XD2", "XD3", "XS1", "XS2", "XS3",
     "XF1", "XF2", "XF3", "XF4", "XA1", "XA2", "XA3"]
)
# Standard fire resistance periods of EN 1992-1-2 tables for columns ("none": no requirement).
FIRE_RESISTANCES = ("none", "R30", "R60", "R90", "R120", "R180", "R240")

# Stack ids and level names: safe in CSV files and file names.
_ID_RE = re.compile(r"^[A-Za-z0-9_.\-]+$")

# Two stacks closer than this in plan, over common levels, overlap.
POSITION_TOLERANCE_M = 0.05


class CellId(NamedTuple):
    """One column in one storey: (stack id, level name)."""

    stack: str
    level: str


@dataclass(frozen=True)
class Project:
    """Project metadata (invented scenarios only)."""

    name: str
    description: str = ""


@dataclass(frozen=True)
class ConcreteZone:
    """A concrete class other than the default for some cells."""

    levels: tuple[str, ...]
    stacks: tuple[str, ...] | None
    concrete: str
    fck_MPa: float


@dataclass(frozen=True)
class Materials:
    """Materials of the columns (and the slab density)."""

    concrete: str
    fck_MPa: float
    fyk_MPa: float
    ductility: Ductility
    aggregate_mm: float
    concrete_density_kN_m3: float
    zones: tuple[ConcreteZone, ...] = ()


@dataclass(frozen=True)
class Level:
    """A suspended floor and the storey of columns below it."""

    name: str
    index: int
    height_m: float
    slab_depth_mm: float
    elevation_m: float
    category: Category | None = None

    @property
    def clear_height_m(self) -> float:
        """Clear height of the columns: floor-to-floor height minus slab depth, m."""
        return self.height_m - self.slab_depth_mm / 1000.0

    @property
    def floor_elevation_m(self) -> float:
        """Elevation of the top of this level's floor slab above the foundation, m."""
        return self.elevation_m + self.height_m


class Orientation(str, Enum):
    """Orientation of a stack's sections in plan."""

    B_ALONG_X = "b_along_x"  # local y (along b) along plan X (default)
    B_ALONG_Y = "b_along_y"  # turned 90 degrees: local y along plan Y
    FREE = "free"  # the optimiser may turn the whole stack


class SupportKind(str, Enum):
    """What a stack stands on."""

    FOUNDATION = "foundation"
    EXTERNAL = "external"  # a transfer structure outside the model; reactions reported
    TRANSFER = "transfer"  # other stacks of the model, with shares


@dataclass(frozen=True)
class Stack:
    """A column stack: one plan position over a range of levels."""

    id: str
    index: int
    x_m: float
    y_m: float
    orientation: Orientation
    from_level: str
    to_level: str
    support: SupportKind
    carried_by: tuple[tuple[str, float], ...] = ()


@dataclass(frozen=True)
class Floor:
    """A floor plate over a range of levels, with its loads."""

    index: int
    levels: tuple[str, ...]
    outline_m: tuple[tuple[float, float], ...]
    holes_m: tuple[tuple[tuple[float, float], ...], ...]
    sdl_kPa: float
    imposed_kPa: float
    facade_kN_m: float
    category: Category | None
    psi0: float | None

    @cached_property
    def polygon(self) -> Polygon:
        """Outline minus holes (shapely polygon, m)."""
        shell = Polygon(self.outline_m)
        for hole in self.holes_m:
            shell = shell.difference(Polygon(hole))
        return shell


@dataclass(frozen=True)
class LevelFloor:
    """The floor plate of one level with its resolved category and psi0."""

    level: str
    floor: Floor
    category: Category
    psi0: float


@dataclass(frozen=True)
class EffectiveLength:
    """Effective-length settings of a cell: factors on the clear height, or k1/k2.

    Factors give l0 = factor x clear height directly. k1, k2 are the relative
    flexibilities of rotational restraint at the two ends, EN 1992-1-1,
    5.8.3.2(3), for the member check to use in Eq. (5.15).
    """

    l0y_factor: float | None = None
    l0z_factor: float | None = None
    k1y: float | None = None
    k2y: float | None = None
    k1z: float | None = None
    k2z: float | None = None

    @property
    def uses_factors(self) -> bool:
        """True when the length is given by factors on the clear height."""
        return self.l0y_factor is not None


@dataclass(frozen=True)
class CellSettings:
    """Design settings of one cell after applying the ``[[settings]]`` rules."""

    concrete: str
    fck_MPa: float
    exposure: str | None = None
    fire: str | None = None
    braced: bool | None = None
    effective_length: EffectiveLength | None = None
    trial_b_mm: float | None = None
    trial_h_mm: float | None = None


@dataclass(frozen=True)
class Cell:
    """One column in one storey, with its index in :attr:`Scenario.cells`."""

    id: CellId
    index: int
    level_index: int
    height_m: float
    clear_height_m: float
    settings: CellSettings

    @property
    def stack(self) -> str:
        """Stack id."""
        return self.id.stack

    @property
    def level(self) -> str:
        """Level name."""
        return self.id.level

    @property
    def l0y_mm(self) -> float | None:
        """Effective length for bending about local y (My), mm, when a factor is given."""
        el = self.settings.effective_length
        if el is None or el.l0y_factor is None:
            return None
        return el.l0y_factor * self.clear_height_m * 1000.0

    @property
    def l0z_mm(self) -> float | None:
        """Effective length for bending about local z (Mz), mm, when a factor is given."""
        el = self.settings.effective_length
        if el is None or el.l0z_factor is None:
            return None
        return el.l0z_factor * self.clear_height_m * 1000.0


@dataclass(frozen=True)
class TakedownOptions:
    """Choices of the concept-stage load takedown."""

    combination: Combination
    imposed_reduction: ImposedReduction


@dataclass(frozen=True, eq=False)
class Scenario:
    """A validated building scenario. All lookups are by name; nothing is mutable.

    Compared and hashed by identity (usable as a cache key).
    """

    source: str
    project: Project
    parameter_set: ParameterSet
    parameter_overrides: tuple[tuple[str, float], ...]
    params: NationalParameters
    materials: Materials
    levels: tuple[Level, ...]
    stacks: tuple[Stack, ...]
    floors: tuple[Floor, ...]
    level_floors: tuple[LevelFloor, ...]
    takedown: TakedownOptions | None
    actions_file: str | None
    cells: tuple[Cell, ...]
    reserved: Mapping[str, Any]
    creep: CreepSettings = CreepSettings()  # EN 1992-1-1 Annex B conditions for phi_ef
    creep_given: bool = False  # False: the defaults of CreepSettings, said in the run's notes

    @cached_property
    def _level_by_name(self) -> dict[str, Level]:
        return {lv.name: lv for lv in self.levels}

    @cached_property
    def _stack_by_id(self) -> dict[str, Stack]:
        return {st.id: st for st in self.stacks}

    @cached_property
    def _cell_by_id(self) -> dict[CellId, Cell]:
        return {c.id: c for c in self.cells}

    @cached_property
    def _floor_by_level(self) -> dict[str, LevelFloor]:
        return {lf.level: lf for lf in self.level_floors}

    def level(self, name: str) -> Level:
        """The level called ``name``."""
        return self._level_by_name[name]

    def stack(self, stack_id: str) -> Stack:
        """The stack with id ``stack_id``."""
        return self._stack_by_id[stack_id]

    def cell(self, cell_id: CellId | tuple[str, str]) -> Cell:
        """The cell (stack, level)."""
        return self._cell_by_id[CellId(*cell_id)]

    def has_cell(self, cell_id: CellId | tuple[str, str]) -> bool:
        """True when the stack runs through the level."""
        return CellId(*cell_id) in self._cell_by_id

    def floor_at(self, level: str) -> LevelFloor | None:
        """The floor plate of a level (None on the actions-CSV route)."""
        return self._floor_by_level.get(level)

    @cached_property
    def _cells_by_level(self) -> dict[str, tuple[Cell, ...]]:
        out: dict[str, list[Cell]] = {lv.name: [] for lv in self.levels}
        for c in self.cells:
            out[c.level].append(c)
        return {k: tuple(v) for k, v in out.items()}

    def cells_at(self, level: str) -> tuple[Cell, ...]:
        """The cells of one level, in stack order."""
        return self._cells_by_level[level]

    def stack_levels(self, stack_id: str) -> tuple[str, ...]:
        """The levels a stack runs through, bottom to top."""
        st = self.stack(stack_id)
        lo, hi = self.level(st.from_level).index, self.level(st.to_level).index
        return tuple(lv.name for lv in self.levels[lo : hi + 1])


# --------------------------------------------------------------------------- reading helpers

_MISSING = object()




class _Table:
    """A TOML table being read: tracks used keys, types and the key path for messages."""

    def __init__(self, file: str, path: str, data: object) -> None:
        self.file = file
        self.path = path
        if not isinstance(data, dict):
            raise InputError(file, path or "(top level)", data, "a table")
        self.data = data
        self.used: set[str] = set()

    def key(self, name: str) -> str:
        return f"{self.path}.{name}" if self.path else name

    def raw(self, name: str, required: bool = True) -> object:
        self.used.add(name)
        if name not in self.data:
            if required:
                close = difflib.get_close_matches(name, [str(k) for k in self.data], n=1,
                                                  cutoff=0.6)
                hint = f" (found {close[0]!r}: a misspelling?)" if close else ""
                raise InputError(self.file, self.key(name), None,
                                 f"a required key is missing{hint}")
            return _MISSING
        return self.data[name]

    def str_(self, name: str, required: bool = True, default: str | None = None) -> str | None:
        value = self.raw(name, required)
        if value is _MISSING:
            return default
        if not isinstance(value, str) or not value.strip():
            raise InputError(self.file, self.key(name), value, "a non-empty string")
        return value.strip()

    def choice(self, name: str, enum: type[Enum], required: bool = True,
               default: Enum | None = None) -> Any:
        value = self.raw(name, required)
        if value is _MISSING:
            return default
        options = [e.value for e in enum]
        try:
            return enum(value)
        except ValueError:
            hint = did_you_mean(str(value), options)
            raise InputError(self.file, self.key(name), value,
                             f"one of {', '.join(map(repr, options))}{hint}") from None

    def num(self, name: str, required: bool = True, minimum: float | None = None,
            positive: bool = False, maximum: float | None = None) -> float | None:
        value = self.raw(name, required)
        if value is _MISSING:
            return None
        return _number(self.file, self.key(name), value, minimum, positive, maximum)

    def bool_(self, name: str, required: bool = True) -> bool | None:
        value = self.raw(name, required)
        if value is _MISSING:
            return None
        if not isinstance(value, bool):
            raise InputError(self.file, self.key(name), value, "true or false")
        return value

    def table(self, name: str, required: bool = True) -> _Table | None:
        value = self.raw(name, required)
        if value is _MISSING:
            return None
        return _Table(self.file, self.key(name), value)

    def array_of_tables(self, name: str, required: bool = True) -> list[_Table]:
        value = self.raw(name, required)
        if value is _MISSING:
            return []
        if not isinstance(value, list) or not value:
            raise InputError(self.file, self.key(name), value,
                             f"a non-empty array of tables ([[{self.key(name)}]])")
        return [_Table(self.file, f"{self.key(name)}[{i}]", v) for i, v in enumerate(value)]

    def done(self) -> None:
        for name in self.data:
            if name not in self.used:
                hint = did_you_mean(name, self.used)
                if self.path and name in TOP_LEVEL_KEYS:
                    hint += (f"; a top-level {name!r} must come before the first [table] "
                             "header (TOML puts later keys into that table)")
                known = ", ".join(sorted(self.used))
                raise InputError(self.file, self.key(name), self.data[name],
                                 f"unknown key{hint} (known keys here: {known})")


def _identifier(t: _Table, name: str) -> str:
    value = t.str_(name)
    if not _ID_RE.match(value):
        raise InputError(t.file, t.key(name), value,
                         "letters, digits, '_', '-' or '.' only (no spaces or commas)")
    return value


def _number(file: str, key: str, value: object, minimum: float | None = None,
            positive: bool = False, maximum: float | None = None) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise InputError(file, key, value, "a number")
    try:
        x = float(value)
    except OverflowError:
        raise InputError(file, key, f"{str(value)[:12]}...", "a finite number of sensible size") from None
    if not math.isfinite(x):
        raise InputError(file, key, value, "a finite number")
    if positive and not x > 0:
        raise InputError(file, key, value, "a positive number")
    if minimum is not None and x < minimum:
        raise InputError(file, key, value, f"a number >= {minimum:g}")
    if maximum is not None and x > maximum:
        raise InputError(file, key, value, f"a number <= {maximum:g}")
    return x


def _points(file: str, key: str, value: object) -> tuple[tuple[float, float], ...]:
    if not isinstance(value, list) or len(value) < 3:
        raise InputError(file, key, value, "a list of at least 3 [x, y] points in m")
    pts = []
    for i, p in enumerate(value):
        if not isinstance(p, list) or len(p) != 2:
            raise InputError(file, f"{key}[{i}]", p, "a point [x, y] in m")
        pts.append((_number(file, f"{key}[{i}][0]", p[0]), _number(file, f"{key}[{i}][1]", p[1])))
    poly = Polygon(pts)
    if not poly.is_valid or poly.area <= 0:
        raise InputError(file, key, value, "a simple polygon (no self-crossing) with positive area")
    return tuple(pts)


# --------------------------------------------------------------------------- sections


def _read_project(top: _Table) -> Project:
    t = top.table("project")
    name = t.str_("name")
    description = t.str_("description", required=False, default="")
    t.done()
    return Project(name=name, description=description)


def _read_parameters(top: _Table) -> tuple[ParameterSet, tuple[tuple[str, float], ...],
                                           NationalParameters]:
    t = top.table("parameters")
    pset = t.choice("set", ParameterSet)
    overrides: dict[str, float] = {}
    ov = t.table("overrides", required=False)
    if ov is not None:
        for name, value in ov.data.items():
            ov.used.add(name)
            overrides[name] = _number(t.file, ov.key(name), value)
    t.done()
    try:
        params = with_overrides(parameter_set(pset), **overrides)
    except ValueError as exc:
        raise InputError(t.file, t.key("overrides"), overrides, str(exc)) from None
    return pset, tuple(sorted(overrides.items())), params


def _concrete(file: str, key: str, name: str) -> float:
    try:
        fck = parse_concrete_class(name)
    except ValueError as exc:
        raise InputError(file, key, name, f"a concrete class such as 'C30/37' ({exc})") from None
    if not 12.0 <= fck <= 90.0:
        raise InputError(file, key, name, "a class from C12/15 to C90/105 (EN 1992-1-1, 3.1.2(2)P)")
    return fck


def _read_levels(top: _Table) -> tuple[Level, ...]:
    tables = top.array_of_tables("levels")
    levels: list[Level] = []
    elevation = 0.0
    seen: set[str] = set()
    for i, t in enumerate(tables):
        name = _identifier(t, "name")
        if name in seen:
            raise InputError(t.file, t.key("name"), name, "a level name used only once")
        seen.add(name)
        height = t.num("height_m", positive=True, maximum=1e4)
        slab = t.num("slab_depth_mm", minimum=0.0, maximum=1e5)
        if slab >= height * 1000.0:
            raise InputError(t.file, t.key("slab_depth_mm"), slab,
                             f"a slab depth smaller than the floor-to-floor height "
                             f"({height * 1000:g} mm)")
        cat = t.choice("category", Category, required=False)
        t.done()
        levels.append(Level(name, i, height, slab, elevation, cat))
        elevation += height
    return tuple(levels)


def _level_range(file: str, key: str, value: object, index: Mapping[str, int],
                 names: Sequence[str]) -> tuple[str, ...]:
    """A level range [first, last] (inclusive, bottom to top) or a single level name."""
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or len(value) not in (1, 2) or not all(
        isinstance(v, str) for v in value
    ):
        raise InputError(file, key, value, "a level name or a range [\"FIRST\", \"LAST\"]")
    for v in value:
        if v not in index:
            raise InputError(file, key, v, f"a known level name{did_you_mean(v, index)}")
    lo, hi = index[value[0]], index[value[-1]]
    if lo > hi:
        raise InputError(file, key, value, "a range from a lower level to a higher one")
    return tuple(names[lo : hi + 1])


def _stack_list(file: str, key: str, value: object, known: Iterable[str]) -> tuple[str, ...]:
    known = list(known)
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not value or not all(isinstance(v, str) for v in value):
        raise InputError(file, key, value, "a list of stack ids")
    for v in value:
        if v not in known:
            raise InputError(file, key, v, f"a known stack id{did_you_mean(v, known)}")
    return tuple(value)


def _read_materials(top: _Table, levels: Sequence[Level], stack_ids: Sequence[str]) -> Materials:
    t = top.table("materials")
    concrete = t.str_("concrete")
    fck = _concrete(t.file, t.key("concrete"), concrete)
    fyk = t.num("reinforcement_fyk_MPa", minimum=400.0, maximum=600.0)
    ductility = t.choice("ductility", Ductility)
    agg = t.num("aggregate_mm", positive=True, maximum=1e4)
    density = t.num("concrete_density_kN_m3", positive=True, maximum=1e5)
    index = {lv.name: lv.index for lv in levels}
    names = [lv.name for lv in levels]
    zones = []
    for z in t.array_of_tables("concrete_zones", required=False):
        zl = _level_range(z.file, z.key("levels"), z.raw("levels"), index, names)
        zs_raw = z.raw("stacks", required=False)
        zs = None if zs_raw is _MISSING else _stack_list(z.file, z.key("stacks"), zs_raw, stack_ids)
        zc = z.str_("concrete")
        zones.append(ConcreteZone(zl, zs, zc, _concrete(z.file, z.key("concrete"), zc)))
        z.done()
    t.done()
    return Materials(concrete, fck, fyk, ductility, agg, density, tuple(zones))


def _read_stacks(top: _Table, levels: Sequence[Level]) -> tuple[Stack, ...]:
    index = {lv.name: lv.index for lv in levels}
    stacks: list[Stack] = []
    tables = top.array_of_tables("stacks")
    seen: set[str] = set()
    for i, t in enumerate(tables):
        sid = _identifier(t, "id")
        if sid in seen:
            raise InputError(t.file, t.key("id"), sid, "a stack id used only once")
        seen.add(sid)
        x, y = t.num("x_m", minimum=-1e6, maximum=1e6), t.num("y_m", minimum=-1e6, maximum=1e6)
        orient = t.choice("orientation", Orientation, required=False, default=Orientation.B_ALONG_X)
        lo = t.str_("from_level")
        hi = t.str_("to_level")
        for key, v in (("from_level", lo), ("to_level", hi)):
            if v not in index:
                raise InputError(t.file, t.key(key), v, f"a known level name{did_you_mean(v, index)}")
        if index[lo] > index[hi]:
            raise InputError(t.file, t.key("to_level"), hi,
                             f"a level at or above from_level {lo!r}")
        kind, carried = _read_support(t, sid)
        t.done()
        stacks.append(Stack(sid, i, x, y, orient, lo, hi, kind, carried))
    return tuple(stacks)


def _read_support(t: _Table, sid: str) -> tuple[SupportKind, tuple[tuple[str, float], ...]]:
    value = t.raw("stands_on")
    key = t.key("stands_on")
    expected = ("'foundation', 'external', or a table of supporting stacks and shares "
                "such as { P1 = 0.6, P2 = 0.4 }")
    if isinstance(value, str):
        if value in (SupportKind.FOUNDATION.value, SupportKind.EXTERNAL.value):
            return SupportKind(value), ()
        raise InputError(t.file, key, value, expected + did_you_mean(value, ["foundation", "external"]))
    if not isinstance(value, dict) or not value:
        raise InputError(t.file, key, value, expected)
    carried = []
    for other, share in value.items():
        s = _number(t.file, f"{key}.{other}", share)
        if not 0.0 < s <= 1.0:
            raise InputError(t.file, f"{key}.{other}", share, "a share greater than 0 and at most 1")
        if other == sid:
            raise InputError(t.file, f"{key}.{other}", share, "another stack (a stack cannot carry itself)")
        carried.append((other, s))
    total = sum(s for _, s in carried)
    if abs(total - 1.0) > 1e-6:
        raise InputError(t.file, key, value, f"shares summing to 1 (they sum to {total:g})")
    return SupportKind.TRANSFER, tuple(carried)


def _check_stack_supports(file: str, stacks: Sequence[Stack], levels: Sequence[Level]) -> None:
    """Unknown supports, support cycles, missing support cells, overlapping stacks."""
    by_id = {s.id: s for s in stacks}
    index = {lv.name: lv.index for lv in levels}
    g = nx.DiGraph()
    for s in stacks:
        g.add_node(s.id)
        for other, _ in s.carried_by:
            key = f"stacks[{s.index}].stands_on.{other}"
            if other not in by_id:
                raise InputError(file, key, other, f"a known stack id{did_you_mean(other, by_id)}")
            g.add_edge(s.id, other)
    try:
        cycle = nx.find_cycle(g)
    except nx.NetworkXNoCycle:
        cycle = None
    if cycle:
        names = " -> ".join([a for a, _ in cycle] + [cycle[0][0]])
        raise InputError(file, "stacks.stands_on", names,
                         "stacks that do not carry each other in a cycle")
    for s in stacks:
        if s.support is not SupportKind.TRANSFER:
            continue
        lo = index[s.from_level]
        key = f"stacks[{s.index}].stands_on"
        if lo == 0:
            raise InputError(file, key, dict(s.carried_by),
                             f"'foundation' or 'external': stack {s.id!r} starts at the lowest "
                             f"level {s.from_level!r}, so no stack can be below it")
        below = levels[lo - 1].name
        for other, _ in s.carried_by:
            o = by_id[other]
            if not index[o.from_level] <= lo - 1 <= index[o.to_level]:
                raise InputError(
                    file, f"{key}.{other}", other,
                    f"a stack that runs through level {below!r} (the level below "
                    f"{s.id!r}'s lowest level {s.from_level!r}); {other!r} runs "
                    f"{o.from_level}..{o.to_level}")
    for i, a in enumerate(stacks):
        for b in stacks[i + 1:]:
            if math.hypot(a.x_m - b.x_m, a.y_m - b.y_m) > POSITION_TOLERANCE_M:
                continue
            if index[a.from_level] <= index[b.to_level] and index[b.from_level] <= index[a.to_level]:
                raise InputError(
                    file, f"stacks[{b.index}].x_m/y_m", (b.x_m, b.y_m),
                    f"a position not shared with stack {a.id!r} over common levels "
                    f"(stacks closer than {POSITION_TOLERANCE_M * 1000:g} mm overlap)")


def _read_floors(top: _Table, levels: Sequence[Level]) -> tuple[tuple[Floor, ...],
                                                                   tuple[LevelFloor, ...]]:
    index = {lv.name: lv.index for lv in levels}
    names = [lv.name for lv in levels]
    floors: list[Floor] = []
    owner: dict[str, int] = {}
    level_floors: dict[str, LevelFloor] = {}
    for i, t in enumerate(top.array_of_tables("floors")):
        rng = _level_range(t.file, t.key("levels"), t.raw("levels"), index, names)
        outline = _points(t.file, t.key("outline_m"), t.raw("outline_m"))
        holes_raw = t.raw("holes_m", required=False)
        holes: list[tuple[tuple[float, float], ...]] = []
        if holes_raw is not _MISSING:
            if not isinstance(holes_raw, list):
                raise InputError(t.file, t.key("holes_m"), holes_raw, "a list of polygons")
            for j, h in enumerate(holes_raw):
                pts = _points(t.file, f"{t.key('holes_m')}[{j}]", h)
                if not Polygon(outline).contains(Polygon(pts)):
                    raise InputError(t.file, f"{t.key('holes_m')}[{j}]", h,
                                     "a hole lying inside the outline")
                holes.append(pts)
        floor = Floor(
            index=i, levels=rng, outline_m=outline, holes_m=tuple(holes),
            sdl_kPa=t.num("sdl_kPa", minimum=0.0, maximum=1e4),
            imposed_kPa=t.num("imposed_kPa", minimum=0.0, maximum=1e4),
            facade_kN_m=t.num("facade_kN_m", minimum=0.0, maximum=1e5),
            category=t.choice("category", Category, required=False),
            psi0=t.num("psi0", required=False, minimum=0.0, maximum=1.0),
        )
        t.done()
        if floor.polygon.area <= 0:
            raise InputError(t.file, t.key("holes_m"), holes_raw, "holes leaving some floor area")
        floors.append(floor)
        for name in rng:
            if name in owner:
                raise InputError(t.file, t.key("levels"), name,
                                 f"levels not already covered by floors[{owner[name]}]")
            owner[name] = i
            lv = levels[index[name]]
            cat = floor.category or lv.category
            if cat is None:
                raise InputError(t.file, t.key("category"), None,
                                 f"a category of use for level {name!r} (on the floor or the level)")
            if floor.category and lv.category and floor.category != lv.category:
                raise InputError(t.file, t.key("category"), floor.category.value,
                                 f"the category of level {name!r} ({lv.category.value}) "
                                 "or no category on one of the two")
            p0 = floor.psi0 if floor.psi0 is not None else PSI_FACTORS[cat].psi0
            level_floors[name] = LevelFloor(name, floor, cat, p0)
    missing = [n for n in names if n not in owner]
    if missing:
        raise InputError(top.file, "floors", missing[0],
                         "a floor plate for every level (floors[].levels does not cover it)")
    return tuple(floors), tuple(level_floors[n] for n in names)


_SETTING_KEYS = ("levels", "stacks", "exposure", "fire", "braced", "l0_factor", "l0y_factor",
                 "l0z_factor", "k1y", "k2y", "k1z", "k2z", "trial_size_mm")


@dataclass(frozen=True)
class _Rule:
    levels: tuple[str, ...] | None
    stacks: tuple[str, ...] | None
    values: tuple[tuple[str, Any], ...]


def _exposure(file: str, key: str, value: object) -> str:
    if not isinstance(value, str) or not value:
        raise InputError(file, key, value, "an exposure class such as 'XC1' (EN 1992-1-1, Table 4.1)")
    parts = [p.strip().upper() for p in value.split("+")]
    for p in parts:
        if p not in EXPOSURE_CLASSES:
            raise InputError(file, key, value, "exposure classes of EN 1992-1-1 Table 4.1, "
                             f"joined by '+' (e.g. 'XC3+XF1'){did_you_mean(p, EXPOSURE_CLASSES)}")
    return "+".join(parts)


def fire_requirement(value: str | None) -> str | None:
    """The fire resistance a cell must have: None for "none" (no requirement) or when not given."""
    return None if value in (None, "", "none") else value


def _fire(file: str, key: str, value: object) -> str:
    if value not in FIRE_RESISTANCES:
        raise InputError(file, key, value, f"one of {', '.join(FIRE_RESISTANCES)}"
                         f"{did_you_mean(str(value), FIRE_RESISTANCES)}")
    return str(value)


def _read_settings(top: _Table, levels: Sequence[Level], stack_ids: Sequence[str]) -> list[_Rule]:
    index = {lv.name: lv.index for lv in levels}
    names = [lv.name for lv in levels]
    rules = []
    for t in top.array_of_tables("settings", required=False):
        for k in t.data:
            if k not in _SETTING_KEYS:
                raise InputError(t.file, t.key(k), t.data[k],
                                 f"unknown key{did_you_mean(k, _SETTING_KEYS)} "
                                 f"(known keys here: {', '.join(_SETTING_KEYS)})")
        lv = t.raw("levels", required=False)
        st = t.raw("stacks", required=False)
        sel_levels = None if lv is _MISSING else _level_range(t.file, t.key("levels"), lv, index,
                                                              names)
        sel_stacks = None if st is _MISSING else _stack_list(t.file, t.key("stacks"), st, stack_ids)
        values: dict[str, Any] = {}
        if "exposure" in t.data:
            values["exposure"] = _exposure(t.file, t.key("exposure"), t.raw("exposure"))
        if "fire" in t.data:
            values["fire"] = _fire(t.file, t.key("fire"), t.raw("fire"))
        if "braced" in t.data:
            braced = t.bool_("braced")
            if not braced:
                raise InputError(t.file, t.key("braced"), braced,
                                 "true: only braced columns are supported; the cores are "
                                 "assumed to provide the lateral stability")
            values["braced"] = True
        values.update(_read_effective_length(t))
        if "trial_size_mm" in t.data:
            v = t.raw("trial_size_mm")
            if not isinstance(v, list) or len(v) != 2:
                raise InputError(t.file, t.key("trial_size_mm"), v, "[b_mm, h_mm]")
            b = _number(t.file, t.key("trial_size_mm") + "[0]", v[0], positive=True, maximum=1e6)
            h = _number(t.file, t.key("trial_size_mm") + "[1]", v[1], positive=True, maximum=1e6)
            values["trial_size_mm"] = (b, h)
        rules.append(_Rule(sel_levels, sel_stacks, tuple(values.items())))
    return rules


def _read_effective_length(t: _Table) -> dict[str, EffectiveLength]:
    """EN 1992-1-1, 5.8.3.2: braced members have 0.5 <= l0 / l <= 1.0 (Eq. (5.15))."""
    f_keys = [k for k in ("l0_factor", "l0y_factor", "l0z_factor") if k in t.data]
    k_keys = [k for k in ("k1y", "k2y", "k1z", "k2z") if k in t.data]
    if not f_keys and not k_keys:
        return {}
    if f_keys and k_keys:
        raise InputError(t.file, t.key(k_keys[0]), t.data[k_keys[0]],
                         f"either l0 factors or k1/k2 in one entry, not both (also has {f_keys[0]})")
    if k_keys:
        if len(k_keys) != 4:
            missing = [k for k in ("k1y", "k2y", "k1z", "k2z") if k not in k_keys]
            raise InputError(t.file, t.key(missing[0]), None, "all four of k1y, k2y, k1z, k2z")
        ks = {k: t.num(k, minimum=0.0) for k in k_keys}
        return {"effective_length": EffectiveLength(**ks)}
    f = {k: t.num(k, minimum=0.5, maximum=1.0) for k in f_keys}
    if "l0_factor" in f and len(f) > 1:
        raise InputError(t.file, t.key("l0_factor"), f["l0_factor"],
                         "l0_factor alone, or l0y_factor and l0z_factor without it")
    fy = f.get("l0y_factor", f.get("l0_factor"))
    fz = f.get("l0z_factor", f.get("l0_factor"))
    if fy is None or fz is None:
        key = "l0z_factor" if fz is None else "l0y_factor"
        raise InputError(t.file, t.key(key), None, "both l0y_factor and l0z_factor (or l0_factor)")
    return {"effective_length": EffectiveLength(l0y_factor=fy, l0z_factor=fz)}


def _read_creep(top: _Table) -> tuple[CreepSettings, bool]:
    """The conditions of the creep coefficient (EN 1992-1-1 Annex B); defaults when the table is absent."""
    t = top.table("creep", required=False)
    if t is None:
        return CreepSettings(), False
    d = CreepSettings()
    rh = t.num("relative_humidity_percent", required=False, minimum=20.0, maximum=100.0)
    t0 = t.num("age_at_loading_days", required=False, positive=True, maximum=3650.0)
    cement = t.choice("cement_class", CementClass, required=False)
    t.done()
    return CreepSettings(RH_percent=d.RH_percent if rh is None else rh, t0_days=d.t0_days if t0 is None else t0,
                         cement=d.cement if cement is None else cement), True


def _read_takedown(top: _Table) -> TakedownOptions | None:
    t = top.table("takedown", required=False)
    if t is None:
        return None
    opts = TakedownOptions(t.choice("combination", Combination),
                           t.choice("imposed_reduction", ImposedReduction))
    t.done()
    return opts


def _resolve_cells(file: str, levels: Sequence[Level], stacks: Sequence[Stack],
                   materials: Materials, rules: Sequence[_Rule],
                   takedown_route: bool) -> tuple[Cell, ...]:
    index = {lv.name: lv.index for lv in levels}
    cells: list[Cell] = []
    for st in stacks:
        for lv in levels[index[st.from_level] : index[st.to_level] + 1]:
            values: dict[str, Any] = {}
            for r in rules:
                if (r.levels is None or lv.name in r.levels) and (
                    r.stacks is None or st.id in r.stacks
                ):
                    values.update(r.values)
            concrete, fck = materials.concrete, materials.fck_MPa
            for z in materials.zones:
                if lv.name in z.levels and (z.stacks is None or st.id in z.stacks):
                    concrete, fck = z.concrete, z.fck_MPa
            if takedown_route:
                for key in ("exposure", "fire", "braced", "effective_length", "trial_size_mm"):
                    if key not in values:
                        shown = "l0_factor (or k1y..k2z)" if key == "effective_length" else key
                        raise InputError(file, f"settings.{shown}", None,
                                         f"a value for cell ({st.id}, {lv.name}): no "
                                         "[[settings]] entry covering it gives one")
            b_h = values.get("trial_size_mm", (None, None))
            settings = CellSettings(
                concrete=concrete, fck_MPa=fck, exposure=values.get("exposure"),
                fire=fire_requirement(values.get("fire")), braced=values.get("braced"),
                effective_length=values.get("effective_length"),
                trial_b_mm=b_h[0], trial_h_mm=b_h[1],
            )
            cells.append(Cell(CellId(st.id, lv.name), len(cells), lv.index, lv.height_m,
                              lv.clear_height_m, settings))
    return tuple(cells)


# --------------------------------------------------------------------------- entry points


def _find_key(data: object, key: str, path: str = "") -> str | None:
    """Path of the first nested table holding ``key`` (to explain misplaced keys)."""
    if isinstance(data, dict):
        for k, v in data.items():
            here = f"{path}.{k}" if path else k
            if k == key and path:
                return path
            found = _find_key(v, key, here)
            if found:
                return found
    elif isinstance(data, list):
        for i, v in enumerate(data):
            found = _find_key(v, key, f"{path}[{i}]")
            if found:
                return found
    return None


def load_scenario(path: str | Path) -> Scenario:
    """Read and validate a scenario file (TOML)."""
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError(str(p), "(file)", str(p), "an existing scenario file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(str(p), "(file)", str(p), f"a readable UTF-8 text file ({exc})") from None
    return load_scenario_text(text, source=str(p), base_dir=p.parent)


def load_scenario_text(text: str, source: str = "<scenario>",
                       base_dir: str | Path | None = None) -> Scenario:
    """Validate scenario TOML text; ``base_dir`` resolves a relative ``actions`` path."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(source, "(syntax)", str(exc), "valid TOML") from None
    top = _Table(source, "", data)
    for key in data:
        if key not in TOP_LEVEL_KEYS:
            raise InputError(source, key, data[key],
                             f"a known top-level key{did_you_mean(key, TOP_LEVEL_KEYS)} "
                             f"(known: {', '.join(TOP_LEVEL_KEYS)})")
    project = _read_project(top)
    pset, overrides, params = _read_parameters(top)
    levels = _read_levels(top)
    stacks = _read_stacks(top, levels)
    stack_ids = [s.id for s in stacks]
    materials = _read_materials(top, levels, stack_ids)
    _check_stack_supports(source, stacks, levels)

    actions = top.str_("actions", required=False)
    has_takedown = "takedown" in data or "floors" in data
    if actions is not None and has_takedown:
        raise InputError(source, "actions", actions,
                         "either actions = \"FILE.csv\" or [takedown] with [[floors]], not both")
    if actions is None and not has_takedown:
        misplaced = _find_key(data, "actions")
        hint = (f" (an 'actions' key was found under {misplaced!r}: in TOML, top-level keys "
                "must come before the first [table] header)") if misplaced else ""
        raise InputError(source, "takedown", None,
                         "a [takedown] table with [[floors]], or actions = \"FILE.csv\"" + hint)
    actions_file = None
    floors: tuple[Floor, ...] = ()
    level_floors: tuple[LevelFloor, ...] = ()
    takedown = None
    if actions is not None:
        ap = Path(actions)
        if not ap.is_absolute() and base_dir is not None:
            ap = Path(base_dir) / ap
        if not ap.is_file():
            raise InputError(source, "actions", actions,
                             "an existing CSV file (relative to the scenario file)")
        actions_file = str(ap)
    else:
        takedown = _read_takedown(top)
        if takedown is None:
            raise InputError(source, "takedown", None,
                             "a [takedown] table (combination, imposed_reduction)")
        floors, level_floors = _read_floors(top, levels)
    rules = _read_settings(top, levels, stack_ids)
    creep, creep_given = _read_creep(top)
    reserved = {}
    for name in RESERVED_TABLES:
        tbl = top.table(name, required=False)
        if tbl is not None:
            reserved[name] = MappingProxyType(dict(tbl.data))
    top.done()
    cells = _resolve_cells(source, levels, stacks, materials, rules, takedown is not None)
    used_levels = {c.level for c in cells}
    empty = [lv.name for lv in levels if lv.name not in used_levels]
    if empty:
        raise InputError(source, "levels", empty[0], "a level that at least one stack runs through")
    return Scenario(
        source=source, project=project, parameter_set=pset, parameter_overrides=overrides,
        params=params, materials=materials, levels=levels, stacks=stacks, floors=floors,
        level_floors=level_floors, takedown=takedown, actions_file=actions_file, cells=cells,
        reserved=MappingProxyType(reserved), creep=creep, creep_given=creep_given,
    )
