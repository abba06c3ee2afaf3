"""Variants of a scenario for comparisons and studies (same building, other choices).

Scenarios are frozen; a variant is a new Scenario built with
``dataclasses.replace``, never an edit of the user's file.
"""

from __future__ import annotations

import dataclasses
from types import MappingProxyType
from typing import Any

from design.materials import Concrete, parse_concrete_class
from optimizer.building import Scenario
from optimizer.errors import InputError

__all__ = ["with_grade", "with_reserved", "grade_name"]


def grade_name(fck: float) -> str:
    """Class name of a strength, e.g. 40 -> ``C40/50``."""
    return Concrete(fck).name


def with_grade(scenario: Scenario, grade: str) -> Scenario:
    """The scenario with every column cast in ``grade`` (concrete zones dropped)."""
    try:
        fck = parse_concrete_class(grade)
    except ValueError as exc:
        raise InputError(scenario.source, "--grades", grade, str(exc)) from None
    name = grade_name(fck)
    cells = tuple(
        dataclasses.replace(c, settings=dataclasses.replace(c.settings, concrete=name, fck_MPa=fck))
        for c in scenario.cells
    )
    materials = dataclasses.replace(scenario.materials, concrete=name, fck_MPa=fck, zones=())
    return dataclasses.replace(scenario, cells=cells, materials=materials)


def with_reserved(scenario: Scenario, table: str, updates: dict[str, Any]) -> Scenario:
    """The scenario with keys of a reserved table ([catalogue], [rules], [costs], [optimizer]) replaced."""
    reserved = {k: dict(v) for k, v in scenario.reserved.items()}
    merged = dict(reserved.get(table, {}))
    merged.update(updates)
    reserved[table] = merged
    return dataclasses.replace(
        scenario, reserved=MappingProxyType({k: MappingProxyType(v) for k, v in reserved.items()})
    )
