"""The study file and its variants: reading and checking it, and the scenario of each variant.

A study file (TOML) names a base scenario and, under ``[vary]``, a list of
values for each of a small fixed set of study variables (concrete grade,
size step, bar diameters, caps on types and sections, minimum run, steel
carbon factor, objective). Every combination is a variant: the base scenario
with those choices, rebuilt from plain data (the scenario text and a dict of
variables) wherever it runs. Running the variants and writing the results is
``optimizer.studies.study``. See docs/studies.md.
"""

from __future__ import annotations

import hashlib
import itertools
import json
import math
import os
import tomllib
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import pandas as pd

from design.materials import Concrete, parse_concrete_class
from optimizer import __version__
from optimizer.building import Scenario, load_scenario_text
from optimizer.candidates.catalogue import CatalogueSpec
from optimizer.errors import InputError, did_you_mean
from optimizer.studies.variants import with_grade, with_reserved

__all__ = [
    "STUDY_VARIABLES",
    "MAX_VARIANTS",
    "Study",
    "StudyVariant",
    "StudyOutcome",
    "bars_text",
    "load_study",
    "variant_id",
    "variant_scenario",
]

MAX_VARIANTS = 2000
"""Largest number of combinations a study may have."""


@dataclass(frozen=True)
class _Var:
    """One study variable: its key in ``[vary]``, its column in the results and how to read a value."""

    key: str
    column: str
    expected: str
    label: Callable[[Any], str]


def bars_text(v: list[int | float]) -> str:
    """Bar diameters in mm as one text, e.g. ``16/20/25``."""
    return "/".join(f"{d:g}" for d in v)


STUDY_VARIABLES: dict[str, _Var] = {
    v.key: v
    for v in (
        _Var("grades", "grade", 'a list of concrete classes, e.g. ["C40/50", "C50/60"]', lambda v: v),
        _Var(
            "size_step_mm",
            "size_step_mm",
            "a list of section size steps in mm, e.g. [50, 100]",
            lambda v: f"step {v:g} mm",
        ),
        _Var(
            "bar_dias",
            "bar_dias",
            "a list of lists of bar diameters in mm, e.g. [[16, 20, 25, 32], [20, 25, 32, 40]]",
            lambda v: f"bars {bars_text(v)}",
        ),
        _Var(
            "max_types",
            "max_types",
            "a list of whole numbers of types, at least 1, e.g. [6, 10]",
            lambda v: f"max {v} types",
        ),
        _Var(
            "max_sections",
            "max_sections",
            "a list of whole numbers of sections, at least 1, e.g. [3, 5]",
            lambda v: f"max {v} sections",
        ),
        _Var(
            "min_run",
            "min_run",
            "a list of whole numbers of storeys, at least 1, e.g. [1, 3]",
            lambda v: f"min run {v}",
        ),
        _Var(
            "steel_carbon_per_kg",
            "steel_carbon_per_kg",
            "a list of kgCO2e per kg of steel, e.g. [1.2, 1.99]",
            lambda v: f"steel {v:g} kgCO2e/kg",
        ),
        _Var(
            "objective", "objective", 'a list of objectives among "steel", "cost", "carbon"', lambda v: f"objective {v}"
        ),
    )
}
"""The study variables (keys of ``[vary]``), in the order they appear in names and tables."""

_STUDY_KEYS = ("name", "scenario", "time_limit_s", "description")
_TOP_KEYS = ("study", "vary")


@dataclass(frozen=True)
class StudyVariant:
    """One combination of the study variables.

    Attributes:
        id: short stable hash of the variables (names the result file).
        name: readable name built from the variables that take more than one value.
        variables: study variable key -> value (plain data: str, int, float, list).
    """

    id: str
    name: str
    variables: dict[str, Any]


@dataclass(frozen=True)
class Study:
    """A study read from its file."""

    path: str
    name: str
    scenario_path: str
    scenario_text: str
    inputs_hash: str  # base scenario text (and its actions file), colstack version, time limit
    variables: dict[str, list[Any]]
    variants: tuple[StudyVariant, ...]
    time_limit_s: float | None = None


@dataclass
class StudyOutcome:
    """What :func:`run_study` did."""

    table: pd.DataFrame
    computed: int
    skipped: int
    failed: int
    files: list[Path] = field(default_factory=list)

    @property
    def ok(self) -> int:
        """Number of variants with results."""
        return int((self.table["status"] == "ok").sum()) if len(self.table) else 0


# ---------------------------------------------------------------------------------------------------------------
# Reading the study file


def _is_number(x: object) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def _normalise(file: str, key: str, value: object) -> Any:
    """One value of a study variable, checked and in canonical form (raises InputError)."""
    var = STUDY_VARIABLES[key]
    where = f"vary.{key}"
    if key == "grades":
        try:
            return Concrete(parse_concrete_class(value)).name
        except (ValueError, TypeError) as exc:
            raise InputError(file, where, value, f"a concrete class such as C40/50 ({exc})") from None
    if key == "bar_dias":
        if not isinstance(value, list) or not value or not all(_is_number(d) and d > 0 for d in value):
            raise InputError(file, where, value, var.expected)
        return sorted({int(d) if float(d).is_integer() else float(d) for d in value})
    if key == "objective":
        if value not in ("steel", "cost", "carbon"):
            raise InputError(file, where, value, var.expected)
        return value
    if not _is_number(value):
        raise InputError(file, where, value, var.expected)
    if key in ("max_types", "max_sections", "min_run"):
        if value < 1 or float(value) != int(value):
            raise InputError(file, where, value, var.expected)
        return int(value)
    if key == "size_step_mm":
        if value <= 0:
            raise InputError(file, where, value, var.expected)
    elif value < 0:  # steel_carbon_per_kg
        raise InputError(file, where, value, var.expected)
    return int(value) if float(value).is_integer() else float(value)


def _hash(*parts: str | bytes) -> str:
    h = hashlib.sha256()
    for p in parts:
        h.update(p.encode("utf-8") if isinstance(p, str) else p)
        h.update(b"\0")
    return h.hexdigest()


def variant_id(variables: dict[str, Any]) -> str:
    """Stable short id of a combination of study variables."""
    return _hash(json.dumps(variables, sort_keys=True, separators=(",", ":")))[:10]


def _variant_name(variables: dict[str, Any], varied: list[str]) -> str:
    keys = varied or list(variables)
    if not keys:
        return "base scenario"
    return ", ".join(STUDY_VARIABLES[k].label(variables[k]) for k in keys)


def _read_toml(p: Path) -> dict[str, Any]:
    """The study file's tables, with only [study] and [vary] at the top."""
    file = str(p)
    try:
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError(file, "(file)", file, "an existing study file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(file, "(file)", file, f"a readable UTF-8 text file ({exc})") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(file, "(syntax)", str(exc), "valid TOML") from None
    for key in data:
        if key not in _TOP_KEYS:
            if key in STUDY_VARIABLES:
                raise InputError(file, key, data[key], "a study variable: put it under [vary]")
            raise InputError(file, key, data[key], f"[study] or [vary]{did_you_mean(key, _TOP_KEYS)}")
    return data


def _read_head(p: Path, data: dict[str, Any]) -> tuple[dict[str, Any], Path, str, Scenario]:
    """The [study] table, the base scenario's path and text, and the base scenario read from it."""
    file = str(p)
    head = data.get("study")
    if not isinstance(head, dict):
        raise InputError(file, "study", head, 'a [study] table with scenario = "BUILDING.toml"')
    for key in head:
        if key not in _STUDY_KEYS:
            if key in STUDY_VARIABLES:
                raise InputError(file, f"study.{key}", head[key], "a study variable: put it under [vary]")
            raise InputError(
                file, f"study.{key}", head[key], f"one of {', '.join(_STUDY_KEYS)}{did_you_mean(key, _STUDY_KEYS)}"
            )
    scen = head.get("scenario")
    if not isinstance(scen, str) or not scen.strip():
        raise InputError(file, "study.scenario", scen, "the base scenario file, relative to the study file")
    sp = Path(scen)
    if not sp.is_absolute():
        sp = Path(os.path.normpath(p.parent / sp))
    try:
        scen_text = sp.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError):
        raise InputError(
            file, "study.scenario", scen, "an existing scenario file (relative to the study file)"
        ) from None
    scenario = load_scenario_text(scen_text, source=str(sp), base_dir=sp.parent)  # bad scenario: its own error
    return head, sp, scen_text, scenario


def _read_vary(file: str, data: dict[str, Any]) -> dict[str, list[Any]]:
    """The [vary] table: each study variable's values, checked and in canonical form, in the fixed order."""
    vary = data.get("vary", {})
    if not isinstance(vary, dict):
        raise InputError(file, "vary", vary, "a [vary] table of study variables")
    for key in vary:
        if key not in STUDY_VARIABLES:
            raise InputError(
                file,
                f"vary.{key}",
                vary[key],
                f"a study variable{did_you_mean(key, STUDY_VARIABLES)} (known: {', '.join(STUDY_VARIABLES)})",
            )
    variables: dict[str, list[Any]] = {}
    for key in STUDY_VARIABLES:  # fixed order
        if key not in vary:
            continue
        values = vary[key]
        if not isinstance(values, list) or not values:
            raise InputError(file, f"vary.{key}", values, STUDY_VARIABLES[key].expected)
        if key == "bar_dias" and not all(isinstance(v, list) for v in values):
            raise InputError(file, f"vary.{key}", values, STUDY_VARIABLES[key].expected)
        norm = [_normalise(file, key, v) for v in values]
        seen = []
        for raw, v in zip(values, norm, strict=True):
            if v in seen:
                raise InputError(file, f"vary.{key}", raw, "values that differ from one another (a repeat)")
            seen.append(v)
        variables[key] = norm
    return variables


def load_study(path: str | Path) -> Study:
    """Read and check a study file; every problem raises one :class:`InputError`."""
    p = Path(path)
    file = str(p)
    data = _read_toml(p)
    head, sp, scen_text, scenario = _read_head(p, data)
    name = head.get("name", p.stem)
    if not isinstance(name, str):
        raise InputError(file, "study.name", name, "a text")
    tl = head.get("time_limit_s")
    if tl is not None and (not _is_number(tl) or tl <= 0):
        raise InputError(file, "study.time_limit_s", tl, "a solver time limit per variant in seconds, above 0")

    variables = _read_vary(file, data)
    count = math.prod(len(v) for v in variables.values())
    if count > MAX_VARIANTS:
        raise InputError(file, "vary", f"{count} combinations", f"at most {MAX_VARIANTS} combinations")
    varied = [k for k, v in variables.items() if len(v) > 1]
    variants = []
    for combo in itertools.product(*variables.values()):
        vs = dict(zip(variables, combo, strict=True))
        variants.append(StudyVariant(variant_id(vs), _variant_name(vs, varied), vs))
    extra = b""
    if scenario.actions_file is not None:
        extra = Path(scenario.actions_file).read_bytes()
    inputs = _hash(scen_text, extra, __version__, repr(tl))
    return Study(
        path=file,
        name=name,
        scenario_path=str(sp),
        scenario_text=scen_text,
        inputs_hash=inputs[:16],
        variables=variables,
        variants=tuple(variants),
        time_limit_s=None if tl is None else float(tl),
    )


# ---------------------------------------------------------------------------------------------------------------
# The scenario of one variant


def variant_scenario(scenario: Scenario, variables: dict[str, Any]) -> Scenario:
    """The base scenario with the study variables applied (a new Scenario; the base is unchanged)."""
    sc = scenario
    if "grades" in variables:
        sc = with_grade(sc, variables["grades"])
    catalogue: dict[str, Any] = {}
    if "size_step_mm" in variables:
        sizes = dict(sc.reserved.get("catalogue", {}).get("sizes_mm", {}))
        catalogue["sizes_mm"] = {
            "min": sizes.get("min", CatalogueSpec.size_min),
            "max": sizes.get("max", CatalogueSpec.size_max),
            "step": variables["size_step_mm"],
        }
    if "bar_dias" in variables:
        catalogue["bar_dias"] = list(variables["bar_dias"])
    rules = {k: variables[k] for k in ("max_types", "max_sections", "min_run") if k in variables}
    costs = {k: variables[k] for k in ("steel_carbon_per_kg",) if k in variables}
    opt = {k: variables[k] for k in ("objective",) if k in variables}
    for table, updates in (("catalogue", catalogue), ("rules", rules), ("costs", costs), ("optimizer", opt)):
        if updates:
            sc = with_reserved(sc, table, updates)
    return sc
