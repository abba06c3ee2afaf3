"""Scenario files: TOML loading and validation into the frozen dataclasses of :mod:`optimizer.building.model`.

A scenario describes a building for the column optimiser: metadata, national
parameters, materials, levels (bottom to top), column stacks, floor plates,
design settings and either a load takedown or per-cell actions from an
analysis (``actions = "FILE.csv"``). Every key is documented in
``docs/scenario.md``; the conventions (levels, cells, section axes) are in
:mod:`optimizer.building.model`. Levels, stacks and floor plates are read by
:mod:`optimizer.building.layout`.

Every user mistake raises :class:`optimizer.errors.InputError` naming the
file, the key, the value and what was expected.
"""

from __future__ import annotations

import tomllib
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from types import MappingProxyType
from typing import Any

from design.creep import CementClass, CreepSettings
from design.materials import Ductility, parse_concrete_class
from design.params import NationalParameters, ParameterSet, parameter_set, with_overrides
from optimizer.building.layout import (
    check_stack_supports,
    level_range,
    read_floors,
    read_levels,
    read_stacks,
    stack_list,
)
from optimizer.building.loads import Combination, ImposedReduction
from optimizer.building.model import (
    EXPOSURE_CLASSES,
    FIRE_RESISTANCES,
    RESERVED_TABLES,
    TOP_LEVEL_KEYS,
    Cell,
    CellId,
    CellSettings,
    ConcreteZone,
    EffectiveLength,
    Floor,
    Level,
    LevelFloor,
    Materials,
    Project,
    Scenario,
    Stack,
    TakedownOptions,
)
from optimizer.building.tables import MISSING, TomlTable, number
from optimizer.errors import InputError, did_you_mean

__all__ = ["load_scenario", "load_scenario_text", "exposure_value", "fire_value", "fire_requirement"]


# --------------------------------------------------------------------------- sections


def _read_project(top: TomlTable) -> Project:
    t = top.table("project")
    name = t.str_("name")
    description = t.str_("description", required=False, default="")
    t.done()
    return Project(name=name, description=description)


def _read_parameters(top: TomlTable) -> tuple[ParameterSet, tuple[tuple[str, float], ...], NationalParameters]:
    t = top.table("parameters")
    pset = t.choice("set", ParameterSet)
    overrides: dict[str, float] = {}
    ov = t.table("overrides", required=False)
    if ov is not None:
        for name, value in ov.data.items():
            ov.used.add(name)
            overrides[name] = number(t.file, ov.key(name), value)
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


def _read_materials(top: TomlTable, levels: Sequence[Level], stack_ids: Sequence[str]) -> Materials:
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
        zl = level_range(z.file, z.key("levels"), z.raw("levels"), index, names)
        zs_raw = z.raw("stacks", required=False)
        zs = None if zs_raw is MISSING else stack_list(z.file, z.key("stacks"), zs_raw, stack_ids)
        zc = z.str_("concrete")
        zones.append(ConcreteZone(zl, zs, zc, _concrete(z.file, z.key("concrete"), zc)))
        z.done()
    t.done()
    return Materials(concrete, fck, fyk, ductility, agg, density, tuple(zones))


_SETTING_KEYS = (
    "levels",
    "stacks",
    "exposure",
    "fire",
    "braced",
    "l0_factor",
    "l0y_factor",
    "l0z_factor",
    "k1y",
    "k2y",
    "k1z",
    "k2z",
    "trial_size_mm",
)


@dataclass(frozen=True)
class _Rule:
    levels: tuple[str, ...] | None
    stacks: tuple[str, ...] | None
    values: tuple[tuple[str, Any], ...]


def exposure_value(file: str, key: str, value: object) -> str:
    """An exposure class of EN 1992-1-1 Table 4.1, or several joined by '+', normalised ('xc3+xf1' -> 'XC3+XF1')."""
    if not isinstance(value, str) or not value:
        raise InputError(file, key, value, "an exposure class such as 'XC1' (EN 1992-1-1, Table 4.1)")
    parts = [p.strip().upper() for p in value.split("+")]
    for p in parts:
        if p not in EXPOSURE_CLASSES:
            raise InputError(
                file,
                key,
                value,
                "exposure classes of EN 1992-1-1 Table 4.1, "
                f"joined by '+' (e.g. 'XC3+XF1'){did_you_mean(p, EXPOSURE_CLASSES)}",
            )
    return "+".join(parts)


def fire_requirement(value: str | None) -> str | None:
    """The fire resistance a cell must have: None for "none" (no requirement) or when not given."""
    return None if value in (None, "", "none") else value


def fire_value(file: str, key: str, value: object) -> str:
    """A standard fire resistance period of :data:`FIRE_RESISTANCES` ('none' included)."""
    if value not in FIRE_RESISTANCES:
        raise InputError(
            file, key, value, f"one of {', '.join(FIRE_RESISTANCES)}{did_you_mean(str(value), FIRE_RESISTANCES)}"
        )
    return str(value)


def _read_settings(top: TomlTable, levels: Sequence[Level], stack_ids: Sequence[str]) -> list[_Rule]:
    index = {lv.name: lv.index for lv in levels}
    names = [lv.name for lv in levels]
    rules = []
    for t in top.array_of_tables("settings", required=False):
        for k in t.data:
            if k not in _SETTING_KEYS:
                raise InputError(
                    t.file,
                    t.key(k),
                    t.data[k],
                    f"unknown key{did_you_mean(k, _SETTING_KEYS)} (known keys here: {', '.join(_SETTING_KEYS)})",
                )
        lv = t.raw("levels", required=False)
        st = t.raw("stacks", required=False)
        sel_levels = None if lv is MISSING else level_range(t.file, t.key("levels"), lv, index, names)
        sel_stacks = None if st is MISSING else stack_list(t.file, t.key("stacks"), st, stack_ids)
        values: dict[str, Any] = {}
        if "exposure" in t.data:
            values["exposure"] = exposure_value(t.file, t.key("exposure"), t.raw("exposure"))
        if "fire" in t.data:
            values["fire"] = fire_value(t.file, t.key("fire"), t.raw("fire"))
        if "braced" in t.data:
            braced = t.bool_("braced")
            if not braced:
                raise InputError(
                    t.file,
                    t.key("braced"),
                    braced,
                    "true: only braced columns are supported; the cores are assumed to provide the lateral stability",
                )
            values["braced"] = True
        values.update(_read_effective_length(t))
        if "trial_size_mm" in t.data:
            v = t.raw("trial_size_mm")
            if not isinstance(v, list) or len(v) != 2:
                raise InputError(t.file, t.key("trial_size_mm"), v, "[b_mm, h_mm]")
            b = number(t.file, t.key("trial_size_mm") + "[0]", v[0], positive=True, maximum=1e6)
            h = number(t.file, t.key("trial_size_mm") + "[1]", v[1], positive=True, maximum=1e6)
            values["trial_size_mm"] = (b, h)
        rules.append(_Rule(sel_levels, sel_stacks, tuple(values.items())))
    return rules


def _read_effective_length(t: TomlTable) -> dict[str, EffectiveLength]:
    """EN 1992-1-1, 5.8.3.2: braced members have 0.5 <= l0 / l <= 1.0 (Eq. (5.15))."""
    f_keys = [k for k in ("l0_factor", "l0y_factor", "l0z_factor") if k in t.data]
    k_keys = [k for k in ("k1y", "k2y", "k1z", "k2z") if k in t.data]
    if not f_keys and not k_keys:
        return {}
    if f_keys and k_keys:
        raise InputError(
            t.file,
            t.key(k_keys[0]),
            t.data[k_keys[0]],
            f"either l0 factors or k1/k2 in one entry, not both (also has {f_keys[0]})",
        )
    if k_keys:
        if len(k_keys) != 4:
            missing = [k for k in ("k1y", "k2y", "k1z", "k2z") if k not in k_keys]
            raise InputError(t.file, t.key(missing[0]), None, "all four of k1y, k2y, k1z, k2z")
        ks = {k: t.num(k, minimum=0.0) for k in k_keys}
        return {"effective_length": EffectiveLength(**ks)}
    f = {k: t.num(k, minimum=0.5, maximum=1.0) for k in f_keys}
    if "l0_factor" in f and len(f) > 1:
        raise InputError(
            t.file, t.key("l0_factor"), f["l0_factor"], "l0_factor alone, or l0y_factor and l0z_factor without it"
        )
    fy = f.get("l0y_factor", f.get("l0_factor"))
    fz = f.get("l0z_factor", f.get("l0_factor"))
    if fy is None or fz is None:
        key = "l0z_factor" if fz is None else "l0y_factor"
        raise InputError(t.file, t.key(key), None, "both l0y_factor and l0z_factor (or l0_factor)")
    return {"effective_length": EffectiveLength(l0y_factor=fy, l0z_factor=fz)}


def _read_creep(top: TomlTable) -> tuple[CreepSettings, bool]:
    """The conditions of the creep coefficient (EN 1992-1-1 Annex B); defaults when the table is absent."""
    t = top.table("creep", required=False)
    if t is None:
        return CreepSettings(), False
    d = CreepSettings()
    rh = t.num("relative_humidity_percent", required=False, minimum=20.0, maximum=100.0)
    t0 = t.num("age_at_loading_days", required=False, positive=True, maximum=3650.0)
    cement = t.choice("cement_class", CementClass, required=False)
    t.done()
    return CreepSettings(
        RH_percent=d.RH_percent if rh is None else rh,
        t0_days=d.t0_days if t0 is None else t0,
        cement=d.cement if cement is None else cement,
    ), True


def _read_takedown(top: TomlTable) -> TakedownOptions | None:
    t = top.table("takedown", required=False)
    if t is None:
        return None
    opts = TakedownOptions(t.choice("combination", Combination), t.choice("imposed_reduction", ImposedReduction))
    t.done()
    return opts


def _resolve_cells(
    file: str,
    levels: Sequence[Level],
    stacks: Sequence[Stack],
    materials: Materials,
    rules: Sequence[_Rule],
    takedown_route: bool,
) -> tuple[Cell, ...]:
    index = {lv.name: lv.index for lv in levels}
    cells: list[Cell] = []
    for st in stacks:
        for lv in levels[index[st.from_level] : index[st.to_level] + 1]:
            values: dict[str, Any] = {}
            for r in rules:
                if (r.levels is None or lv.name in r.levels) and (r.stacks is None or st.id in r.stacks):
                    values.update(r.values)
            concrete, fck = materials.concrete, materials.fck_MPa
            for z in materials.zones:
                if lv.name in z.levels and (z.stacks is None or st.id in z.stacks):
                    concrete, fck = z.concrete, z.fck_MPa
            if takedown_route:
                for key in ("exposure", "fire", "braced", "effective_length", "trial_size_mm"):
                    if key not in values:
                        shown = "l0_factor (or k1y..k2z)" if key == "effective_length" else key
                        raise InputError(
                            file,
                            f"settings.{shown}",
                            None,
                            f"a value for cell ({st.id}, {lv.name}): no [[settings]] entry covering it gives one",
                        )
            b_h = values.get("trial_size_mm", (None, None))
            settings = CellSettings(
                concrete=concrete,
                fck_MPa=fck,
                exposure=values.get("exposure"),
                fire=fire_requirement(values.get("fire")),
                braced=values.get("braced"),
                effective_length=values.get("effective_length"),
                trial_b_mm=b_h[0],
                trial_h_mm=b_h[1],
            )
            cells.append(Cell(CellId(st.id, lv.name), len(cells), lv.index, lv.height_m, lv.clear_height_m, settings))
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


def load_scenario_text(text: str, source: str = "<scenario>", base_dir: str | Path | None = None) -> Scenario:  # noqa: PLR0912, PLR0915 - reads the scenario's tables in order, one branch per route
    """Validate scenario TOML text; ``base_dir`` resolves a relative ``actions`` path."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(source, "(syntax)", str(exc), "valid TOML") from None
    top = TomlTable(source, "", data)
    for key in data:
        if key not in TOP_LEVEL_KEYS:
            raise InputError(
                source,
                key,
                data[key],
                f"a known top-level key{did_you_mean(key, TOP_LEVEL_KEYS)} (known: {', '.join(TOP_LEVEL_KEYS)})",
            )
    project = _read_project(top)
    pset, overrides, params = _read_parameters(top)
    levels = read_levels(top)
    stacks = read_stacks(top, levels)
    stack_ids = [s.id for s in stacks]
    materials = _read_materials(top, levels, stack_ids)
    check_stack_supports(source, stacks, levels)

    actions = top.str_("actions", required=False)
    has_takedown = "takedown" in data or "floors" in data
    if actions is not None and has_takedown:
        raise InputError(
            source, "actions", actions, 'either actions = "FILE.csv" or [takedown] with [[floors]], not both'
        )
    if actions is None and not has_takedown:
        misplaced = _find_key(data, "actions")
        hint = (
            (
                f" (an 'actions' key was found under {misplaced!r}: in TOML, top-level keys "
                "must come before the first [table] header)"
            )
            if misplaced
            else ""
        )
        raise InputError(source, "takedown", None, 'a [takedown] table with [[floors]], or actions = "FILE.csv"' + hint)
    actions_file = None
    floors: tuple[Floor, ...] = ()
    level_floors: tuple[LevelFloor, ...] = ()
    takedown = None
    if actions is not None:
        ap = Path(actions)
        if not ap.is_absolute() and base_dir is not None:
            ap = Path(base_dir) / ap
        if not ap.is_file():
            raise InputError(source, "actions", actions, "an existing CSV file (relative to the scenario file)")
        actions_file = str(ap)
    else:
        takedown = _read_takedown(top)
        if takedown is None:
            raise InputError(source, "takedown", None, "a [takedown] table (combination, imposed_reduction)")
        floors, level_floors = read_floors(top, levels)
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
        source=source,
        project=project,
        parameter_set=pset,
        parameter_overrides=overrides,
        params=params,
        materials=materials,
        levels=levels,
        stacks=stacks,
        floors=floors,
        level_floors=level_floors,
        takedown=takedown,
        actions_file=actions_file,
        cells=cells,
        reserved=MappingProxyType(reserved),
        creep=creep,
        creep_given=creep_given,
    )
