"""The feasibility matrix of a building turned into its scheduling problem.

Cells and their stack continuity (the cell above each cell), the column types as plain arrays, the
candidates with their steel, cost and carbon, and the rules of the run (with the lap-zone limit of
the scenario's parameter set and the pinned cells looked up in the catalogue).
"""

from __future__ import annotations

import dataclasses

import numpy as np

from design.materials import parse_concrete_class
from optimizer.building import Orientation, Scenario, build_stack_graph, cell_above
from optimizer.candidates.catalogue import STEEL_DENSITY, type_arrays
from optimizer.candidates.costs import candidate_cost_carbon
from optimizer.candidates.feasibility import Feasibility
from optimizer.errors import InputError
from optimizer.pipeline.settings import RunSettings
from optimizer.schedule.problem import ScheduleProblem, TypeTable

__all__ = ["to_problem", "pinned_cell_type"]


def pinned_cell_type(feas: Feasibility, scenario: Scenario, pin: tuple) -> tuple[int, int]:
    """(cell index, type index) of a pinned cell; the type is looked up by section, bars and grade."""
    stack, level, section, bars, grade = pin
    cell = scenario.cell((stack, level))
    fck = parse_concrete_class(grade) if grade else cell.settings.fck_MPa
    for k, t in enumerate(feas.catalogue.types):
        if t.section_key == section and t.design.section.bars.notation == bars and t.design.concrete.fck == fck:
            return cell.index, k
    raise InputError(
        scenario.source,
        "rules.pinned",
        f"{stack} at {level}: {section} {bars}",
        "a section and bars of the catalogue at the cell's grade (see catalogue.csv)",
    )


def to_problem(feas: Feasibility, scenario: Scenario, run: RunSettings) -> ScheduleProblem:
    """The scheduling problem of the building: cells, stack continuity, types and candidates."""
    graph = build_stack_graph(scenario)
    index = {c.id: c.index for c in scenario.cells}
    above = np.array([index[a] if (a := cell_above(graph, c.id)) is not None else -1 for c in scenario.cells])
    stack_ids = tuple(s.id for s in scenario.stacks)
    stack_of = {s: i for i, s in enumerate(stack_ids)}
    ta = type_arrays(feas.catalogue, np.zeros(len(feas.catalogue), dtype=int))
    sec_ids: dict[str, int] = {}
    section = np.array([sec_ids.setdefault(t.section_key, len(sec_ids)) for t in feas.catalogue.types])
    types = TypeTable(
        mark=tuple(t.mark for t in feas.catalogue.types),
        circ=ta["circ"],
        b=ta["b"],
        h=ta["h"],
        nb=ta["nb"],
        nh=ta["nh"],
        dia=ta["dia"],
        corner_dia=ta["corner_dia"],
        fck=ta["fck"],
        section=section,
        starter_kg_per_m=ta["As"] * 1e-6 * STEEL_DENSITY,
    )
    cost, carbon = candidate_cost_carbon(feas, run.costs)
    # the lap-zone limit of 9.5.2(3) comes from the scenario's parameter set
    rules = dataclasses.replace(run.rules, lap_steel_ratio_max=scenario.params.rho_max_lap)
    if run.pinned:
        rules = dataclasses.replace(rules, pinned=tuple(pinned_cell_type(feas, scenario, p) for p in run.pinned))
    return ScheduleProblem(
        cell_names=feas.cells.cells,
        stack_names=stack_ids,
        stack=np.array([stack_of[c.stack] for c in scenario.cells]),
        above=above,
        stack_free=np.array([s.orientation is Orientation.FREE for s in scenario.stacks]),
        types=types,
        cand_cell=feas.cand_cell,
        cand_type=feas.cand_type,
        cand_orient=feas.cand_orient,
        steel_kg=feas.steel_kg,
        cost=np.nan_to_num(cost, nan=0.0),
        carbon=carbon,
        utilisation=feas.utilisation,
        rules=rules,
        objective=run.objective,
        storey_height_mm=feas.cells.height,
    )
