"""Every documented choice runs: test cases generated from the documentation's keys tables.

The tables of docs/scenario.md and the README's tables of `colstack section` and
`colstack check` keys are parsed; every key whose documented values are quoted
strings (``"none"``, ``"R30"``, ``"alpha_n"``, ``"forbid-any"``, ...) gives one
test per value, so that a value added to the documentation is tested the moment
it is written. Each value is put into a small input and the smallest command
that uses it is run in-process:

* scenario keys: ``scenarios/small_building.toml`` with a small catalogue
  (the key set to the value), through ``colstack optimize`` (takedown,
  feasibility, integer program, exact re-check, tables), and ``fire = "none"``
  also through ``colstack run`` with every output (it used to crash there);
* spec keys: ``colstack check`` on ``examples/column_slender_biaxial.toml``, and
  for the section keys also ``colstack section`` on
  ``examples/section_600x400.toml``.

A documented value must never crash and never be refused as bad input: exit 0,
1 (a column that fails its check) or 3 (no design for the building) only.
A documented key with quoted values but no recipe here fails
``test_every_documented_enumeration_has_a_recipe``: write one.
"""

from __future__ import annotations

import copy
import json
import re
import tomllib
from collections.abc import Callable

import pytest

from optimizer.cli import main
from tests.support import paths
from tests.support.toml import dump_toml

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

ROOT = paths.ROOT
SCENARIO_DOC = ROOT / "docs" / "scenario.md"
README = ROOT / "README.md"
SMALL = ROOT / "scenarios" / "small_building.toml"
CHECK_EXAMPLE = ROOT / "examples" / "column_slender_biaxial.toml"
SECTION_EXAMPLE = ROOT / "examples" / "section_600x400.toml"

# A catalogue small enough for about half a second per optimisation of the small building.
SMALL_CATALOGUE = {"sizes_mm": {"min": 300, "max": 800, "step": 100}, "bar_dias": [16, 25], "aspects": [1.5]}
TIME_LIMIT = "10"


# --------------------------------------------------------------------------- reading the documentation


def _cells(line: str) -> list[str]:
    return [c.strip() for c in line.strip().strip("|").split("|")]


def doc_tables(text: str, sections: tuple[str, ...] | None = None) -> list[tuple[str, list[list[str]]]]:
    """(section name, rows of cells) of every Markdown table, the section named after the heading above it.

    A heading with a TOML table name in backticks (```[takedown]```, ```[[levels]]```) gives that name;
    ``sections`` keeps only tables under ``##`` headings containing one of those strings.
    """
    out: list[tuple[str, list[list[str]]]] = []
    name, chapter = "", ""
    rows: list[list[str]] = []
    for line in [*text.splitlines(), ""]:
        if line.startswith("#"):
            if line.startswith("## "):
                chapter = line
            m = re.search(r"`\[\[?([\w.]+)\]\]?`", line)
            name = m.group(1) if m else line.lstrip("#").strip()
        if line.startswith("|"):
            rows.append(_cells(line))
            continue
        if rows:
            if sections is None or any(s in chapter for s in sections):
                body = [r for r in rows[1:] if not set("".join(r)) <= set("-: ")]
                out.append((name, body))
            rows = []
    return out


_QUOTED = re.compile(r'`"([^"`]+)"`')
_RANGE = re.compile(r'`"([A-Z])"`\s*(?:…|\.\.\.)\s*`"([A-Z])"`')


def quoted_values(cell: str) -> list[str]:
    """The values a table cell lists as quoted strings, ``"A"``…``"H"`` expanded to A, B, ..., H."""
    values: list[str] = []
    for m in _RANGE.finditer(cell):
        values += [chr(c) for c in range(ord(m.group(1)), ord(m.group(2)) + 1)]
    for v in _QUOTED.findall(_RANGE.sub("", cell)):
        if v not in values:
            values.append(v)
    return values


def enumerations(tables: list[tuple[str, list[list[str]]]]) -> dict[tuple[str, str], list[str]]:
    """(section, key) -> documented values, for every row whose other cells quote string values."""
    out: dict[tuple[str, str], list[str]] = {}
    for section, rows in tables:
        for row in rows:
            keys = re.findall(r"`([\w.]+)`", row[0])
            values = [v for cell in row[1:] for v in quoted_values(cell)]
            if keys and values:
                known = out.setdefault((section, keys[-1]), [])
                for v in values:
                    if v not in known:
                        known.append(v)
    return out


SCENARIO_VALUES = enumerations(doc_tables(SCENARIO_DOC.read_text(encoding="utf-8")))
SPEC_VALUES = enumerations(
    doc_tables(
        README.read_text(encoding="utf-8"),
        ("Section specification", "Column specification", "Fire resistance of a section"),
    )
)


# --------------------------------------------------------------------------- recipes: the value into an input


def _set(*path: str | int) -> Callable[[dict, str], None]:
    """A recipe that sets ``value`` at ``path`` in the scenario (tables created on the way)."""

    def apply(data: dict, value: str) -> None:
        node = data
        for k in path[:-1]:
            node = node.setdefault(k, {}) if isinstance(k, str) else node[k]
        node[path[-1]] = value

    return apply


def _as_list(*path: str) -> Callable[[dict, str], None]:
    def apply(data: dict, value: str) -> None:
        _set(*path)(data, [value])

    return apply


def _level_category(data: dict, value: str) -> None:
    """The category of the office floors, given on each of their levels (and on the plate, which must agree)."""
    for lv in data["levels"][:-1]:
        lv["category"] = value
    data["floors"][0]["category"] = value


def _objective(data: dict, value: str) -> None:
    data.setdefault("optimizer", {})["objective"] = value
    if value == "cost":  # the cost objective needs rates (invented round figures)
        data["costs"] = {
            "steel_per_t": 1000.0,
            "concrete_per_m3": {data["materials"]["concrete"]: 150.0},
            "formwork_per_m2": 30.0,
        }


def _exclude(data: dict, value: str) -> None:
    data["catalogue"]["exclude"] = [value]
    if value.upper().startswith("D"):
        data["catalogue"]["shapes"] = ["square", "circular"]


SCENARIO_RECIPES: dict[tuple[str, str], Callable[[dict, str], None]] = {
    ("parameters", "set"): _set("parameters", "set"),
    ("materials", "concrete"): _set("materials", "concrete"),
    ("materials", "ductility"): _set("materials", "ductility"),
    ("levels", "category"): _level_category,
    ("stacks", "orientation"): _set("stacks", 0, "orientation"),
    ("stacks", "stands_on"): _set("stacks", 0, "stands_on"),
    ("floors", "category"): _set("floors", 0, "category"),
    ("settings", "exposure"): _set("settings", 0, "exposure"),
    ("settings", "fire"): _set("settings", 0, "fire"),
    ("takedown", "combination"): _set("takedown", "combination"),
    ("takedown", "imposed_reduction"): _set("takedown", "imposed_reduction"),
    ("creep", "cement_class"): _set("creep", "cement_class"),
    ("catalogue", "shapes"): _as_list("catalogue", "shapes"),
    ("catalogue", "exclude"): _exclude,
    ("rules", "step_rule"): _set("rules", "step_rule"),
    ("rules", "fire_outside_method"): _set("rules", "fire_outside_method"),
    ("optimizer", "objective"): _objective,
    ("optimizer", "solver"): _set("optimizer", "solver"),
    ("optimizer", "formulation"): _set("optimizer", "formulation"),
    ("costs", "currency"): _set("costs", "currency"),
}

# Values whose whole route (outputs, pictures, report) is run besides the optimisation.
FULL_RUN = {(("settings", "fire"), "none")}

FIRE_SECTION = "Fire resistance of a section"  # every key of its table is read by `colstack fire`

SPEC_RECIPES: dict[str, tuple[str, ...]] = {
    # key: the commands that read it
    "ductility": ("section", "check"),
    "branch": ("section", "check"),
    "law": ("section", "check"),
    "national": ("section", "check"),
    "grade": ("section", "check"),
    "exposure": ("check",),
    "fire": ("check",),
    "imperfection": ("check",),
    "min_eccentricity": ("check",),
    "biaxial": ("check",),
    "cement_class": ("check",),
}


# --------------------------------------------------------------------------- fixtures


@pytest.fixture(scope="module")
def base_scenario() -> dict:
    """The small building with a small catalogue (shared by every scenario case)."""
    data = tomllib.loads(SMALL.read_text(encoding="utf-8"))
    data["catalogue"] = copy.deepcopy(SMALL_CATALOGUE)
    return data


@pytest.fixture(scope="module")
def spec_data() -> dict[str, dict]:
    return {
        "check": tomllib.loads(CHECK_EXAMPLE.read_text(encoding="utf-8")),
        "section": tomllib.loads(SECTION_EXAMPLE.read_text(encoding="utf-8")),
        "fire": tomllib.loads((ROOT / "examples" / "section_fire.toml").read_text(encoding="utf-8")),
    }


# --------------------------------------------------------------------------- the tests


def test_the_documentation_is_read():
    """The parser finds the enumerations the brief of this file names (a broken parser must not pass silently)."""
    fire = SCENARIO_VALUES[("settings", "fire")]
    assert fire[0] == "none" and {"R30", "R60", "R90", "R120", "R180", "R240"} <= set(fire)
    assert SCENARIO_VALUES[("takedown", "imposed_reduction")] == ["none", "alpha_n", "alpha_A"]
    assert SCENARIO_VALUES[("rules", "step_rule")] == ["limit", "starters", "forbid-any"]
    assert SCENARIO_VALUES[("levels", "category")] == list("ABCDEFGH")
    assert {"steel", "cost", "carbon"} == set(SCENARIO_VALUES[("optimizer", "objective")])
    for key in (
        "imperfection",
        "min_eccentricity",
        "biaxial",
        "ductility",
        "branch",
        "law",
        "national",
        "exposure",
        "fire",
    ):
        assert key in {k for _, k in SPEC_VALUES}, key
    assert "none" in SPEC_VALUES[("Column specification (`colstack check`)", "fire")]


def test_every_documented_enumeration_has_a_recipe():
    missing = sorted(set(SCENARIO_VALUES) - set(SCENARIO_RECIPES))
    assert not missing, f"documented scenario keys with quoted values but no recipe in this file: {missing}"
    spec_missing = sorted({k for s, k in SPEC_VALUES if not s.startswith(FIRE_SECTION)} - set(SPEC_RECIPES))
    assert not spec_missing, f"documented spec keys with quoted values but no recipe in this file: {spec_missing}"


SCENARIO_CASES = [pytest.param(sk, v, id=f"{sk[0]}.{sk[1]}={v}") for sk, vals in SCENARIO_VALUES.items() for v in vals]


@pytest.mark.parametrize(("section_key", "value"), SCENARIO_CASES)
def test_documented_scenario_value_runs(base_scenario, tmp_path, capsys, section_key, value):
    recipe = SCENARIO_RECIPES.get(section_key)
    if recipe is None:
        pytest.fail(f"no recipe for {section_key} (see test_every_documented_enumeration_has_a_recipe)")
    data = copy.deepcopy(base_scenario)
    recipe(data, value)
    path = tmp_path / "scenario.toml"
    path.write_text(dump_toml(data), encoding="utf-8")
    commands = ["optimize"] + (["run"] if (section_key, value) in FULL_RUN else [])
    for cmd in commands:
        code = main([cmd, str(path), "--out", str(tmp_path / cmd), "--quiet", "--time-limit", TIME_LIMIT])
        err = capsys.readouterr().err
        assert code in (0, 3), f"{cmd} with {section_key[0]}.{section_key[1]} = {value!r}: exit {code}: {err}"
        if code == 0:
            assert (tmp_path / cmd / "cells.csv").is_file()
    if (section_key, value) in FULL_RUN:
        assert (tmp_path / "run" / "report.html").is_file()


SPEC_CASES = [
    pytest.param(k, v, cmd, id=f"{cmd}.{k}={v}")
    for (section, k), vals in SPEC_VALUES.items()
    for v in vals
    for cmd in (("fire",) if section.startswith(FIRE_SECTION) else SPEC_RECIPES.get(k, ("check",)))
]


@pytest.mark.parametrize(("key", "value", "command"), SPEC_CASES)
def test_documented_spec_value_runs(spec_data, tmp_path, capsys, key, value, command):
    data = copy.deepcopy(spec_data[command])
    if key == "grade":
        data.pop("fck", None)
    data[key] = value
    path = tmp_path / "spec.toml"
    path.write_text(dump_toml(data), encoding="utf-8")
    code = main([command, str(path), "--json"])
    captured = capsys.readouterr()
    assert code in (0, 1), f"{command} with {key} = {value!r}: exit {code}: {captured.err}"
    json.loads(captured.out)
