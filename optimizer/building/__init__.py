"""The building: what stands where and what it carries.

Imports only ``optimizer.errors`` and ``design``. The modules, in the order they depend on each other:

* ``loads``: EN 1990 / EN 1991-1-1 factors (psi, alpha_n, alpha_A, combinations);
* ``model``: the scenario as frozen dataclasses and enums;
* ``tables``: the TOML table reader shared with the catalogue and the run settings;
* ``layout`` and ``scenario``: reading and validating a scenario file;
* ``graph``: the stack graph (cells, supports, cell above and below);
* ``tributary``, ``subframe`` and ``takedown``: the concept-stage load takedown;
* ``actions_csv``: the actions table from an analysis, and written from the takedown;
* ``plausibility``: warnings for likely unit mistakes; ``generate``: synthetic towers.

The names below are what the later stages use.
"""

from optimizer.building.actions_csv import (
    ACTION_COLUMNS,
    K_COLUMNS,
    OPTIONAL_COLUMNS,
    read_actions_csv,
    write_actions_csv,
)
from optimizer.building.generate import TowerSpec, generate_tower, generate_tower_toml
from optimizer.building.graph import build_stack_graph, cell_above, cell_below
from optimizer.building.model import Cell, CellId, Level, Orientation, Scenario, Stack, SupportKind
from optimizer.building.plausibility import plausibility_warnings
from optimizer.building.scenario import fire_requirement, load_scenario, load_scenario_text
from optimizer.building.tables import MISSING, TomlTable
from optimizer.building.takedown import TakedownResult, scenario_actions, takedown
from optimizer.building.tributary import LevelTributary

__all__ = [
    "ACTION_COLUMNS",
    "OPTIONAL_COLUMNS",
    "K_COLUMNS",
    "Cell",
    "CellId",
    "Level",
    "LevelTributary",
    "MISSING",
    "Orientation",
    "Scenario",
    "Stack",
    "SupportKind",
    "TakedownResult",
    "TomlTable",
    "TowerSpec",
    "build_stack_graph",
    "cell_above",
    "cell_below",
    "fire_requirement",
    "generate_tower",
    "generate_tower_toml",
    "load_scenario",
    "load_scenario_text",
    "plausibility_warnings",
    "read_actions_csv",
    "scenario_actions",
    "takedown",
    "write_actions_csv",
]
