"""The scheduling problem handed from the feasibility matrix to the integer program.

Plain data only (numpy arrays and tuples), so the integer program, the
heuristics, the brute-force tests and the independent rule checker can all be
written against it without knowing how the matrix was computed.

Vocabulary:

* a *cell* is one column in one storey (stack, level);
* a *type* is a column type: section (shape and size), bar set, links and
  concrete grade; its *section* is the formwork (shape and size only);
* a *candidate* is a feasible (cell, type, orientation) triple: the type passes
  every check in that cell when placed in that orientation. Orientation 0
  keeps the section's local y axis along the stack's default direction;
  orientation 1 turns it by 90 degrees (only for stacks whose orientation is
  free, and only for non-square rectangles). A stack keeps one orientation.

Units: mm for sizes, kg for steel, the scenario's currency for cost, kgCO2e
for carbon.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import StrEnum
from functools import cached_property

import numpy as np

from design.params import NationalParameters
from design.sections import bar_area

__all__ = ["Objective", "StepRule", "Status", "Rules", "TypeTable", "ScheduleProblem", "Schedule"]


class Objective(StrEnum):
    """What the integer program minimises."""

    STEEL = "steel"
    COST = "cost"
    CARBON = "carbon"


class StepRule(StrEnum):
    """What happens when a section shrinks by more than ``max_step_mm`` per face between storeys."""

    LIMIT = "limit"  # larger steps are not allowed
    STARTERS = "starters"  # allowed, with separate starter bars whose mass is added
    FORBID_ANY = "forbid-any"  # no change of section at all along a stack


class Status(StrEnum):
    """Outcome of a solve or a heuristic, as reported in :attr:`Schedule.status`."""

    OPTIMAL = "optimal"  # proven optimal (gap below 1e-6)
    WITHIN_GAP = "within gap"  # stopped with the proven gap below the requested relative gap
    TIME_LIMIT = "time limit"  # stopped by the time limit with a schedule; see the gap
    NO_SCHEDULE = "no schedule"  # stopped by the time limit without a schedule
    INFEASIBLE = "infeasible"  # proven: no schedule keeps every rule (see optimizer.schedule.diagnose)
    HEURISTIC = "heuristic"  # a heuristic's schedule, no bound proven
    BASELINE = "baseline"  # the rule-of-thumb schedule (optimizer.schedule.heuristic.baseline)


@dataclass(frozen=True)
class Rules:
    """Buildability rules of a schedule (each on by default)."""

    monotone_sections: bool = True  # b and h never grow going up; circles stay circles
    monotone_bars: bool = True  # bars per face and bar diameters never grow going up
    monotone_grade: bool = True  # concrete grade never rises going up
    max_step_mm: float = 75.0  # largest reduction per face between storeys
    step_rule: StepRule = StepRule.LIMIT
    min_run: int = 1  # storeys a section holds at least (except at the top of a stack)
    max_types: int | None = None  # cap on distinct types building-wide
    max_sections: int | None = None  # cap on distinct sections building-wide
    price_per_type: float = 0.0  # objective units per distinct type
    price_per_section: float = 0.0  # objective units per distinct section
    max_grades: int | None = None  # cap on distinct concrete grades building-wide
    max_grade_changes: int | None = None  # cap on grade changes going up any one stack
    groups: tuple[tuple[str, ...], ...] = ()  # stacks that take identical types level by level
    pinned: tuple[tuple[int, int], ...] = ()  # (cell index, type index) fixed by the user
    # As,max / Ac at a lap, EN 1992-1-1, 9.5.2(3): at the foot of a storey the bars of the storey below
    # (running up as starters) lap with this storey's bars, so As(below) + As(this) <= ratio Ac(this).
    # Default: the EN recommended value (NationalParameters.rho_max_lap, 0.08); the building's run sets
    # its parameter set's value. None switches the pair rule off (only for tests of other rules).
    lap_steel_ratio_max: float | None = NationalParameters.rho_max_lap

    @property
    def couples_stacks(self) -> bool:
        """Whether a cap or price on types, sections or grades ties the stacks together.

        Without one every stack (or group of stacks) can be scheduled on its own shortest path, which is then
        the optimum. A cap on grade changes per stack counts too: the shortest paths do not model it.
        """
        return (
            self.max_types is not None
            or self.max_sections is not None
            or self.price_per_type > 0
            or self.price_per_section > 0
            or self.max_grades is not None
            or self.max_grade_changes is not None
        )


@dataclass(frozen=True)
class TypeTable:
    """Attributes of the column types (arrays of length n_types).

    ``As`` (longitudinal steel) and ``Ac`` (gross concrete area) are derived from the
    other attributes, for the maximum steel at laps between storeys.
    """

    mark: tuple[str, ...]  # label, e.g. "C12"
    circ: np.ndarray  # bool
    b: np.ndarray  # mm (diameter for circles)
    h: np.ndarray  # mm (diameter for circles)
    nb: np.ndarray  # bars on each b-face (circles: total bar count)
    nh: np.ndarray  # bars on each h-face (circles: 0)
    dia: np.ndarray  # main bar diameter, mm
    corner_dia: np.ndarray  # corner bar diameter, mm (= dia when not mixed)
    fck: np.ndarray  # concrete strength, MPa
    section: np.ndarray  # section id (same shape and size -> same id)
    starter_kg_per_m: np.ndarray = field(default_factory=lambda: np.zeros(0))  # bar mass per metre of lap

    def __len__(self) -> int:
        return len(self.mark)

    @cached_property
    def As(self) -> np.ndarray:
        """Longitudinal steel area of each type, mm2.

        Rectangles: 4 corner bars of ``corner_dia`` and 2 (nb - 2) + 2 (nh - 2)
        bars of ``dia``; circles: ``nb`` bars of ``dia``.
        """
        circ = np.asarray(self.circ, dtype=bool)
        nb = np.asarray(self.nb, dtype=float)
        nh = np.asarray(self.nh, dtype=float)
        rect = 4.0 * bar_area(self.corner_dia) + (2.0 * (nb - 2.0) + 2.0 * (nh - 2.0)) * bar_area(self.dia)
        return np.where(circ, nb * bar_area(self.dia), rect)

    @cached_property
    def Ac(self) -> np.ndarray:
        """Gross concrete area of each type (the Ac of EN 1992-1-1, 9.5.2(3)), mm2."""
        b = np.asarray(self.b, dtype=float)
        return np.where(np.asarray(self.circ, dtype=bool), np.pi * b**2 / 4.0, b * np.asarray(self.h, dtype=float))


@dataclass(frozen=True)
class ScheduleProblem:
    """One building's choice: a type (and orientation) for every cell.

    Cells are indexed 0..n_cells-1; ``above[c]`` is the cell directly above c
    in the same stack (-1 at the top of a stack); ``stack[c]`` the stack index.
    Candidates are given as parallel arrays of length n_candidates.
    """

    cell_names: tuple[tuple[str, str], ...]  # (stack, level)
    stack_names: tuple[str, ...]
    stack: np.ndarray  # (n_cells,) stack index
    above: np.ndarray  # (n_cells,) index of the cell above, -1 at the top
    stack_free: np.ndarray  # (n_stacks,) bool: orientation left to the optimiser
    types: TypeTable
    cand_cell: np.ndarray  # (n_cand,) cell index
    cand_type: np.ndarray  # (n_cand,) type index
    cand_orient: np.ndarray  # (n_cand,) 0 or 1
    steel_kg: np.ndarray  # (n_cand,) main bars incl. lap + links, kg
    cost: np.ndarray  # (n_cand,)
    carbon: np.ndarray  # (n_cand,)
    utilisation: np.ndarray  # (n_cand,)
    rules: Rules = Rules()
    objective: Objective = Objective.STEEL
    storey_height_mm: np.ndarray = field(default_factory=lambda: np.zeros(0))  # (n_cells,) for starter bars

    @property
    def n_cells(self) -> int:  # noqa: D102
        return len(self.cell_names)

    def weight(self) -> np.ndarray:
        """Objective coefficient per candidate."""
        return {Objective.STEEL: self.steel_kg, Objective.COST: self.cost, Objective.CARBON: self.carbon}[
            Objective(self.objective)
        ]


@dataclass(frozen=True)
class Schedule:
    """A solution: one candidate per cell, with the solver's account of it.

    ``status`` accepts a :class:`Status` or its value ("optimal", "time limit", ...) and holds the
    :class:`Status`, which compares equal to its value.
    """

    cand: np.ndarray  # (n_cells,) candidate index chosen for each cell
    status: Status
    objective: float
    bound: float
    gap: float  # relative gap proven by the solver (0 when optimal)
    solver: str
    seconds: float
    notes: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        """Hold the status as a :class:`Status` (its value, a string, is converted; anything else is refused)."""
        object.__setattr__(self, "status", Status(self.status))
