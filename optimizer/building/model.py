"""The building scenario as data: frozen dataclasses, enums and the constants of the file format.

A scenario describes a building for the column optimiser: metadata, national
parameters, materials, levels (bottom to top), column stacks, floor plates,
design settings and either a load takedown or per-cell actions from an
analysis. :mod:`optimizer.building.scenario` reads and validates the TOML file
into these types; every key is documented in ``docs/scenario.md``.

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
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from enum import Enum
from functools import cached_property
from typing import Any, NamedTuple

from shapely.geometry import Polygon

from design.creep import CreepSettings
from design.materials import Ductility
from design.params import NationalParameters, ParameterSet
from optimizer.building.loads import Category, Combination, ImposedReduction

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
    "RESERVED_TABLES",
    "TOP_LEVEL_KEYS",
    "EXPOSURE_CLASSES",
    "FIRE_RESISTANCES",
]

# Reserved tables accepted as opaque dictionaries for later issues.
RESERVED_TABLES = ("catalogue", "rules", "costs", "optimizer")
# The keys a scenario file may have at its top level.
TOP_LEVEL_KEYS = (
    "project",
    "parameters",
    "materials",
    "levels",
    "stacks",
    "floors",
    "settings",
    "takedown",
    "actions",
    "creep",
    *RESERVED_TABLES,
)

# Exposure classes of EN 1992-1-1, Table 4.1.
EXPOSURE_CLASSES = frozenset(
    [
        "X0",
        "XC1",
        "XC2",
        "XC3",
        "XC4",
        "XD1",
        "XD2",
        "XD3",
        "XS1",
        "XS2",
        "XS3",
        "XF1",
        "XF2",
        "XF3",
        "XF4",
        "XA1",
        "XA2",
        "XA3",
    ]
)
# Standard fire resistance periods of EN 1992-1-2 tables for columns ("none": no requirement).
FIRE_RESISTANCES = ("none", "R30", "R60", "R90", "R120", "R180", "R240")


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
