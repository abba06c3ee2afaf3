"""Plausibility warnings: values that pass validation but look like a unit mistake.

The scenario loader and the actions-CSV reader reject what is impossible; this
module flags what is possible but unlikely enough to be a slip of units: storey
heights typed in mm where m are expected, loads in Pa instead of kPa, forces
in N instead of kN, moments in N·mm instead of kNm, and so on. Each warning is
one sentence naming the file, the key or cell, the value and the likely cause.
The run continues; the warnings go to the summary and the report.

The thresholds are deliberately wide: they should never fire on a real
building described in the documented units.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping

import pandas as pd

from design.params import NationalParameters
from optimizer.scenario import Scenario

__all__ = ["plausibility_warnings", "LIMITS"]

# Thresholds (documented units on the left; what a unit slip would give on the right).
LIMITS = {
    "height_m_max": 20.0,  # a storey taller than 20 m: mm typed for m (3500)
    "height_m_min": 1.5,  # a storey lower than 1.5 m: probably a slab depth or cm
    "slab_depth_mm_min": 1.0,  # below 1 mm: m typed for mm (0.225)
    "slab_depth_mm_max": 1500.0,  # a 1.5 m slab: cm or um slips, or a transfer slab that wants a check
    "area_load_kPa_max": 100.0,  # 100 kPa ~ 10 t/m2: Pa typed for kPa (1500)
    "line_load_kN_m_max": 200.0,  # facade line load: N/m typed for kN/m
    "density_kN_m3_max": 60.0,  # kg/m3 typed for kN/m3 (2500)
    "density_kN_m3_min": 5.0,  # t/m3 or g/cm3 typed for kN/m3 (2.5)
    "coordinate_m_max": 1000.0,  # a plan coordinate beyond 1 km: mm typed for m
    "size_mm_min": 100.0,  # a trial side under 100 mm: m or cm typed for mm
    "size_mm_max": 5000.0,  # a trial side over 5 m
    "aggregate_mm_max": 63.0,  # maximum aggregate size over 63 mm
    "l0_mm_min": 100.0,  # an effective length under 100 mm: m typed for mm
    "l0_over_storey_max": 3.0,  # l0 over three storey heights
    "eccentricity_m_max": 10.0,  # M/N over 10 m with |M| large: N·mm typed for kNm
    "moment_kNm_min_for_units": 1.0e4,  # |M| at least this before the eccentricity test applies
    "column_side_mm_max": 2000.0,
    # NEd / (trial b x h) over this multiple of fck. A gross stress above fck alone is common at concept
    # stage (the steel carries the rest, and the optimiser picks larger sections); N typed for kN gives x1000.
    "stress_over_fck_max": 2.0,  # NEd needing more than a 2 m square column at rho_max
}


def _fmt(x: float) -> str:
    return f"{x:.6g}"


def _scenario_warnings(scenario: Scenario) -> Iterable[str]:
    src = scenario.source
    lim = LIMITS
    for lv in scenario.levels:
        key = f"levels[{lv.index}]"
        if lv.height_m > lim["height_m_max"]:
            yield (f"{src}: {key}.height_m = {_fmt(lv.height_m)} (level {lv.name}): a storey over "
                   f"{lim['height_m_max']:g} m high; was it given in mm instead of m?")
        elif lv.height_m < lim["height_m_min"]:
            yield (f"{src}: {key}.height_m = {_fmt(lv.height_m)} (level {lv.name}): a storey under "
                   f"{lim['height_m_min']:g} m high; is the unit m?")
        if 0 < lv.slab_depth_mm < lim["slab_depth_mm_min"]:
            yield (f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): a slab under "
                   f"{lim['slab_depth_mm_min']:g} mm deep; was it given in m instead of mm?")
        if lv.slab_depth_mm / 1000.0 >= lv.height_m:
            yield (f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): the slab is as "
                   f"deep as the storey is high ({_fmt(lv.height_m)} m); check the units")
        elif lv.slab_depth_mm > lim["slab_depth_mm_max"]:
            yield (f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): a slab over "
                   f"{lim['slab_depth_mm_max']:g} mm deep; check the units")
    for fl in scenario.floors:
        key = f"floors[{fl.index}]"
        for name, value in (("sdl_kPa", fl.sdl_kPa), ("imposed_kPa", fl.imposed_kPa)):
            if value > lim["area_load_kPa_max"]:
                yield (f"{src}: {key}.{name} = {_fmt(value)}: an area load over {lim['area_load_kPa_max']:g} "
                       "kPa; was it given in Pa (N/m2) instead of kPa?")
        if fl.facade_kN_m > lim["line_load_kN_m_max"]:
            yield (f"{src}: {key}.facade_kN_m = {_fmt(fl.facade_kN_m)}: a facade line load over "
                   f"{lim['line_load_kN_m_max']:g} kN/m; was it given in N/m instead of kN/m?")
        far = [c for pt in fl.outline_m for c in pt if abs(c) > lim["coordinate_m_max"]]
        if far:
            yield (f"{src}: {key}.outline_m has a coordinate {_fmt(far[0])}: beyond "
                   f"{lim['coordinate_m_max']:g} m; were the points given in mm instead of m?")
    for s in scenario.stacks:
        for name, value in (("x_m", s.x_m), ("y_m", s.y_m)):
            if abs(value) > lim["coordinate_m_max"]:
                yield (f"{src}: stacks[{s.index}].{name} = {_fmt(value)} (stack {s.id}): beyond "
                       f"{lim['coordinate_m_max']:g} m; was it given in mm instead of m?")
    m = scenario.materials
    if m.concrete_density_kN_m3 > lim["density_kN_m3_max"]:
        yield (f"{src}: materials.concrete_density_kN_m3 = {_fmt(m.concrete_density_kN_m3)}: over "
               f"{lim['density_kN_m3_max']:g} kN/m3; was a mass density in kg/m3 given (25 kN/m3 ~ 2,500 kg/m3)?")
    elif m.concrete_density_kN_m3 < lim["density_kN_m3_min"]:
        yield (f"{src}: materials.concrete_density_kN_m3 = {_fmt(m.concrete_density_kN_m3)}: under "
               f"{lim['density_kN_m3_min']:g} kN/m3; was it given in t/m3 instead of kN/m3?")
    if m.aggregate_mm > lim["aggregate_mm_max"]:
        yield (f"{src}: materials.aggregate_mm = {_fmt(m.aggregate_mm)}: an aggregate over "
               f"{lim['aggregate_mm_max']:g} mm; check the units")
    seen: set[tuple[float, float]] = set()
    for c in scenario.cells:
        b, h = c.settings.trial_b_mm, c.settings.trial_h_mm
        if b is None or h is None or (b, h) in seen:
            continue
        seen.add((b, h))
        for v in (b, h):
            if v < lim["size_mm_min"] or v > lim["size_mm_max"]:
                yield (f"{src}: settings.trial_size_mm = [{_fmt(b)}, {_fmt(h)}] (first at cell {c.stack}, "
                       f"{c.level}): a side of {_fmt(v)} mm is outside {lim['size_mm_min']:g}..."
                       f"{lim['size_mm_max']:g} mm; was it given in m or cm instead of mm?")
                break


def _num(row: Mapping[str, object], col: str) -> float | None:
    if col not in row:
        return None
    try:
        x = float(row[col])
    except (TypeError, ValueError):
        return None
    return x if math.isfinite(x) else None


def _actions_warnings(scenario: Scenario, actions: pd.DataFrame, params: NationalParameters) -> Iterable[str]:
    src = scenario.actions_file or f"{scenario.source} (takedown actions)"
    lim = LIMITS
    fyd = scenario.materials.fyk_MPa / params.gamma_s
    for r in actions.to_dict("records"):
        stack, level = str(r["stack"]), str(r["level"])
        where = f"cell ({stack}, {level})"
        if not scenario.has_cell((stack, level)):
            continue
        cell = scenario.cell((stack, level))
        fck = cell.settings.fck_MPa
        n = _num(r, "NEd_kN")
        if n is not None and n > 0:
            b, h = cell.settings.trial_b_mm, cell.settings.trial_h_mm
            if b and h:
                stress = n * 1e3 / (b * h)
                if stress > lim["stress_over_fck_max"] * fck:
                    yield (f"{src}: {where}: NEd_kN = {_fmt(n)}: the axial stress on the trial section "
                           f"{_fmt(b)} x {_fmt(h)} mm is {stress:.1f} MPa, over {lim['stress_over_fck_max']:g} "
                           f"x fck = {fck:g} MPa; "
                           "was NEd given in N instead of kN, or the trial size too small?")
            fcd = params.alpha_cc * fck / params.gamma_c
            area = n * 1e3 / (fcd + params.rho_max * fyd)
            side = math.sqrt(area)
            if side > lim["column_side_mm_max"]:
                yield (f"{src}: {where}: NEd_kN = {_fmt(n)}: even at the maximum steel ratio this needs a "
                       f"column about {side / 1000:.1f} m square; was NEd given in N instead of kN?")
        for col in ("My_top_kNm", "My_bot_kNm", "Mz_top_kNm", "Mz_bot_kNm"):
            m = _num(r, col)
            if m is None or abs(m) < lim["moment_kNm_min_for_units"]:
                continue
            e = abs(m) / max(n or 0.0, 1.0)
            if e > lim["eccentricity_m_max"]:
                yield (f"{src}: {where}: {col} = {_fmt(m)}: an eccentricity M/N of {e:.3g} m; was the moment "
                       "given in N·mm or Nm instead of kNm?")
        storey_mm = cell.height_m * 1000.0
        for col in ("l0y_mm", "l0z_mm"):
            v = _num(r, col)
            if v is None:
                continue
            if v < lim["l0_mm_min"]:
                yield (f"{src}: {where}: {col} = {_fmt(v)}: an effective length under {lim['l0_mm_min']:g} mm; "
                       "was it given in m instead of mm?")
            elif v > lim["l0_over_storey_max"] * storey_mm:
                yield (f"{src}: {where}: {col} = {_fmt(v)}: over {lim['l0_over_storey_max']:g} times the storey "
                       f"height ({storey_mm:.0f} mm); check the units")


def plausibility_warnings(scenario: Scenario, actions_df: pd.DataFrame | None,
                          params: NationalParameters | None = None) -> list[str]:
    """Warnings for values that look like unit mistakes (empty when all is plausible).

    Args:
        scenario: the validated scenario.
        actions_df: per-cell actions (columns ``stack, level, NEd_kN, My_top_kNm, ...``,
            optionally ``l0y_mm, l0z_mm``), from the takedown or the actions CSV; ``None``
            checks the scenario alone.
        params: national parameters for the design strengths (default: the scenario's).

    Returns:
        One sentence per suspicious value, naming the file, the key or cell and the value.
    """
    params = params if params is not None else scenario.params
    out = list(_scenario_warnings(scenario))
    if actions_df is not None and len(actions_df):
        out += list(_actions_warnings(scenario, actions_df, params))
    return out
