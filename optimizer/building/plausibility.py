"""Plausibility warnings: values that pass validation but look like a unit mistake.

The scenario loader and the actions-CSV reader reject what is impossible; this
module flags what is possible but unlikely enough to be a slip of units: storey
heights typed in mm where m are expected, loads in Pa instead of kPa, forces
in N instead of kN, moments in N·mm instead of kNm, and so on. Each warning is
one sentence naming the file, the key or cell, the value and the likely cause.
The run continues; the warnings go to the summary and the report.

The thresholds are deliberately wide: they should never fire on a real
building described in the documented units.

Single-column specifications (``colstack check`` and ``colstack section``)
use the same table of limits through :func:`spec_length_problem`,
:func:`spec_side_problem`, :func:`spec_force_problem`,
:func:`spec_moment_problem` and :func:`spec_warnings`: there a value that
cannot be meant (a 6.5 mm storey, a force fifty times the squash load) is an
error, and one that is merely unusual is a printed warning.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass

import pandas as pd

from design.params import NationalParameters
from optimizer.building.model import Scenario

__all__ = [
    "plausibility_warnings",
    "LIMITS",
    "SectionCapacity",
    "spec_length_problem",
    "spec_side_problem",
    "spec_force_problem",
    "spec_moment_problem",
    "spec_warnings",
]

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
    # Single-column specifications (colstack check / section). Errors: values no one can mean.
    # A storey column has at least ~2 m between floors, and l0 >= 0.5 l when braced (5.8.3.2(3)): a clear height
    # or l0 under 0.5 m is metres or cm typed for mm (6.5 for 6500); over 30 m no column of a building spans
    # between restraints (a 30 m hall column is already exceptional).
    "spec_length_mm_min": 500.0,
    "spec_length_mm_max": 30000.0,
    # Section sides use size_mm_min / size_mm_max above (100 mm to 5 m; 0.4 for 400 is caught).
    # Bar and link diameters: stocked bars run from 6 to 50 mm (common practice); under 4 mm or over 60 mm
    # the value is in m or cm.
    "spec_bar_mm_min": 4.0,
    "spec_bar_mm_max": 60.0,
    # Cover under 5 mm: metres typed for mm (0.035). EN 1992-1-1 4.4.1.2(2) never allows less than 10 mm, so
    # 5..10 mm is left to the cover check, which fails it with its clause.
    "spec_cover_mm_min": 5.0,
    # |NEd| over 50 squash loads (Ac fcd + As fyd; in tension As fyd): N typed for kN gives x1000, and no
    # engineer checks a column at 50 times what it can carry.
    "spec_force_over_squash_error": 50.0,
    # A moment over 50 times (Ac fcd + As fyd) h/2, an upper bound of the moment any strain state of the
    # section resists, or one giving an eccentricity M/NEd over 100 m beyond that bound: N·mm or Nm typed for kNm.
    "spec_moment_over_bound_error": 50.0,
    "spec_eccentricity_m_error": 100.0,
    # Warnings: possible but unusual.
    "spec_force_over_squash_warn": 1.0,  # NEd above the squash load: the column cannot carry it (kN?)
    "spec_force_under_squash_warn": 1.0e-3,  # 0 < NEd under 0.1 % of the squash load: MN typed for kN?
    "spec_moment_over_bound_warn": 1.0,  # a moment above the bound: no strain state resists it (kNm?)
    # l0/h over 60 (lambda ~ 210 for a rectangle): beyond any column in practice and far beyond the range of
    # the nominal-curvature method (the member check flags lambda > 140); likely a length in the wrong unit.
    "spec_l0_over_side_warn": 60.0,
}


def _fmt(x: float) -> str:
    return f"{x:.6g}"


def _whole(x: float) -> str:
    """A value as written by a person: large whole numbers in full (2,100,000, not 2.1e+06)."""
    return f"{x:,.0f}" if abs(x) >= 1e4 and float(x).is_integer() else _fmt(x)


def _scenario_warnings(scenario: Scenario) -> Iterable[str]:  # noqa: PLR0912 - one plausibility rule per branch
    src = scenario.source
    lim = LIMITS
    for lv in scenario.levels:
        key = f"levels[{lv.index}]"
        if lv.height_m > lim["height_m_max"]:
            yield (
                f"{src}: {key}.height_m = {_fmt(lv.height_m)} (level {lv.name}): a storey over "
                f"{lim['height_m_max']:g} m high; was it given in mm instead of m?"
            )
        elif lv.height_m < lim["height_m_min"]:
            yield (
                f"{src}: {key}.height_m = {_fmt(lv.height_m)} (level {lv.name}): a storey under "
                f"{lim['height_m_min']:g} m high; is the unit m?"
            )
        if 0 < lv.slab_depth_mm < lim["slab_depth_mm_min"]:
            yield (
                f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): a slab under "
                f"{lim['slab_depth_mm_min']:g} mm deep; was it given in m instead of mm?"
            )
        if lv.slab_depth_mm / 1000.0 >= lv.height_m:
            yield (
                f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): the slab is as "
                f"deep as the storey is high ({_fmt(lv.height_m)} m); check the units"
            )
        elif lv.slab_depth_mm > lim["slab_depth_mm_max"]:
            yield (
                f"{src}: {key}.slab_depth_mm = {_fmt(lv.slab_depth_mm)} (level {lv.name}): a slab over "
                f"{lim['slab_depth_mm_max']:g} mm deep; check the units"
            )
    for fl in scenario.floors:
        key = f"floors[{fl.index}]"
        for name, value in (("sdl_kPa", fl.sdl_kPa), ("imposed_kPa", fl.imposed_kPa)):
            if value > lim["area_load_kPa_max"]:
                yield (
                    f"{src}: {key}.{name} = {_fmt(value)}: an area load over {lim['area_load_kPa_max']:g} "
                    "kPa; was it given in Pa (N/m2) instead of kPa?"
                )
        if fl.facade_kN_m > lim["line_load_kN_m_max"]:
            yield (
                f"{src}: {key}.facade_kN_m = {_fmt(fl.facade_kN_m)}: a facade line load over "
                f"{lim['line_load_kN_m_max']:g} kN/m; was it given in N/m instead of kN/m?"
            )
        far = [c for pt in fl.outline_m for c in pt if abs(c) > lim["coordinate_m_max"]]
        if far:
            yield (
                f"{src}: {key}.outline_m has a coordinate {_fmt(far[0])}: beyond "
                f"{lim['coordinate_m_max']:g} m; were the points given in mm instead of m?"
            )
    for s in scenario.stacks:
        for name, value in (("x_m", s.x_m), ("y_m", s.y_m)):
            if abs(value) > lim["coordinate_m_max"]:
                yield (
                    f"{src}: stacks[{s.index}].{name} = {_fmt(value)} (stack {s.id}): beyond "
                    f"{lim['coordinate_m_max']:g} m; was it given in mm instead of m?"
                )
    m = scenario.materials
    if m.concrete_density_kN_m3 > lim["density_kN_m3_max"]:
        yield (
            f"{src}: materials.concrete_density_kN_m3 = {_fmt(m.concrete_density_kN_m3)}: over "
            f"{lim['density_kN_m3_max']:g} kN/m3; was a mass density in kg/m3 given (25 kN/m3 ~ 2,500 kg/m3)?"
        )
    elif m.concrete_density_kN_m3 < lim["density_kN_m3_min"]:
        yield (
            f"{src}: materials.concrete_density_kN_m3 = {_fmt(m.concrete_density_kN_m3)}: under "
            f"{lim['density_kN_m3_min']:g} kN/m3; was it given in t/m3 instead of kN/m3?"
        )
    if m.aggregate_mm > lim["aggregate_mm_max"]:
        yield (
            f"{src}: materials.aggregate_mm = {_fmt(m.aggregate_mm)}: an aggregate over "
            f"{lim['aggregate_mm_max']:g} mm; check the units"
        )
    seen: set[tuple[float, float]] = set()
    for c in scenario.cells:
        b, h = c.settings.trial_b_mm, c.settings.trial_h_mm
        if b is None or h is None or (b, h) in seen:
            continue
        seen.add((b, h))
        for v in (b, h):
            if v < lim["size_mm_min"] or v > lim["size_mm_max"]:
                yield (
                    f"{src}: settings.trial_size_mm = [{_fmt(b)}, {_fmt(h)}] (first at cell {c.stack}, "
                    f"{c.level}): a side of {_fmt(v)} mm is outside {lim['size_mm_min']:g}..."
                    f"{lim['size_mm_max']:g} mm; was it given in m or cm instead of mm?"
                )
                break


def _num(row: Mapping[str, object], col: str) -> float | None:
    if col not in row:
        return None
    try:
        x = float(row[col])
    except (TypeError, ValueError):
        return None
    return x if math.isfinite(x) else None


def _actions_warnings(scenario: Scenario, actions: pd.DataFrame, params: NationalParameters) -> Iterable[str]:  # noqa: PLR0912 - one plausibility rule per branch
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
                    yield (
                        f"{src}: {where}: NEd_kN = {_fmt(n)}: the axial stress on the trial section "
                        f"{_fmt(b)} x {_fmt(h)} mm is {stress:.1f} MPa, over {lim['stress_over_fck_max']:g} "
                        f"x fck = {fck:g} MPa; "
                        "was NEd given in N instead of kN, or the trial size too small?"
                    )
            fcd = params.alpha_cc * fck / params.gamma_c
            area = n * 1e3 / (fcd + params.rho_max * fyd)
            side = math.sqrt(area)
            if side > lim["column_side_mm_max"]:
                yield (
                    f"{src}: {where}: NEd_kN = {_fmt(n)}: even at the maximum steel ratio this needs a "
                    f"column about {side / 1000:.1f} m square; was NEd given in N instead of kN?"
                )
        for col in ("My_top_kNm", "My_bot_kNm", "Mz_top_kNm", "Mz_bot_kNm"):
            m = _num(r, col)
            if m is None or abs(m) < lim["moment_kNm_min_for_units"]:
                continue
            e = abs(m) / max(n or 0.0, 1.0)
            if e > lim["eccentricity_m_max"]:
                yield (
                    f"{src}: {where}: {col} = {_fmt(m)}: an eccentricity M/N of {e:.3g} m; was the moment "
                    "given in N·mm or Nm instead of kNm?"
                )
        storey_mm = cell.height_m * 1000.0
        for col in ("l0y_mm", "l0z_mm"):
            v = _num(r, col)
            if v is None:
                continue
            if v < lim["l0_mm_min"]:
                yield (
                    f"{src}: {where}: {col} = {_fmt(v)}: an effective length under {lim['l0_mm_min']:g} mm; "
                    "was it given in m instead of mm?"
                )
            elif v > lim["l0_over_storey_max"] * storey_mm:
                yield (
                    f"{src}: {where}: {col} = {_fmt(v)}: over {lim['l0_over_storey_max']:g} times the storey "
                    f"height ({storey_mm:.0f} mm); check the units"
                )


# ---------------------------------------------------------------------------------------------- single column
@dataclass(frozen=True)
class SectionCapacity:
    """Closed-form bounds of one section for the plausibility of its actions (kN, kNm, mm).

    Attributes:
        squash_kN: Ac fcd + As fyd (the NRd of 5.8.9(4)), an upper bound of the axial resistance.
        tension_kN: As fyd, the tension resistance.
        moment_bound_kNm: (Ac fcd + As fyd) h/2 with h the larger side (or D): no strain state of the
            section resists more (every stress resultant acts within h/2 of the centroid).
        h_y_mm: section depth for bending about y (h; D for a circle).
        h_z_mm: section depth for bending about z (b; D for a circle).
    """

    squash_kN: float
    tension_kN: float
    moment_bound_kNm: float
    h_y_mm: float
    h_z_mm: float


def _suggest(value: float, low: float, high: float, factors: tuple[tuple[float, str], ...]) -> str:
    """``"; did you mean X?"`` for the first unit factor that brings ``value`` into [low, high]."""
    for factor, unit in factors:
        v = value * factor
        if low <= abs(v) <= high:
            return f"; did you mean {_fmt(v)}{f' ({unit})' if unit else ''}?"
    return ""


_TOO_SMALL = ((1000.0, ""), (10.0, ""))  # metres, then centimetres, typed for mm

_LENGTH_WHAT = {"height": ("a clear height", "a storey"), "l0": ("an effective length", "a column length")}


def spec_length_problem(value_mm: float, what: str = "l0") -> str | None:
    """What is expected of a length that cannot be meant (None when it is plausible).

    Args:
        value_mm: the value as given, read as mm.
        what: ``"height"`` (clear height) or ``"l0"`` (effective length).

    Returns:
        The ``expected`` text of an InputError, e.g. "a clear height in mm is expected, 500 mm to 30 m
        (6.5 mm is not a storey; did you mean 6500?)", or None.
    """
    lo, hi = LIMITS["spec_length_mm_min"], LIMITS["spec_length_mm_max"]
    if lo <= value_mm <= hi:
        return None
    noun, thing = _LENGTH_WHAT[what]
    hint = _suggest(value_mm, lo, hi, _TOO_SMALL) if value_mm < lo else ""
    return f"{noun} in mm is expected, {lo:g} mm to {hi / 1000:g} m ({_fmt(value_mm)} mm is not {thing}{hint})"


def spec_side_problem(value_mm: float, kind: str = "side") -> str | None:
    """What is expected of a section side, bar diameter or cover that cannot be meant (None when plausible).

    Args:
        value_mm: the value as given, read as mm.
        kind: ``"side"`` (b, h, D), ``"bar"`` (bar or link diameter) or ``"cover"``.
    """
    if kind == "side":
        lo, hi, noun, thing = LIMITS["size_mm_min"], LIMITS["size_mm_max"], "a section dimension", "a column"
    elif kind == "bar":
        lo, hi, noun, thing = LIMITS["spec_bar_mm_min"], LIMITS["spec_bar_mm_max"], "a bar diameter", "a bar"
    else:
        lo, hi, noun, thing = LIMITS["spec_cover_mm_min"], math.inf, "a nominal cover", "a cover"
    if lo <= value_mm <= hi:
        return None
    hint = _suggest(value_mm, lo, hi, _TOO_SMALL) if value_mm < lo else ""
    span = f"{lo:g} to {hi:g} mm" if math.isfinite(hi) else f"at least {lo:g} mm"
    return f"{noun} in mm is expected, {span} ({_fmt(value_mm)} mm is not {thing}{hint})"


def spec_force_problem(NEd_kN: float, cap: SectionCapacity) -> str | None:
    """What is expected of an axial force that no one can mean for this section (None when plausible)."""
    k = LIMITS["spec_force_over_squash_error"]
    limit = cap.squash_kN if NEd_kN >= 0 else cap.tension_kN
    if abs(NEd_kN) <= k * limit:
        return None
    what = "the squash load Ac fcd + As fyd" if NEd_kN >= 0 else "the tension resistance As fyd"
    hint = _suggest(NEd_kN, 0.0, k * limit, ((1e-3, "N typed for kN"),))
    return (
        f"a force in kN is expected ({_whole(NEd_kN)} kN is {abs(NEd_kN) / limit:,.0f} times {what} = "
        f"{limit:,.0f} kN of this section{hint})"
    )


def spec_moment_problem(M_kNm: float, NEd_kN: float, cap: SectionCapacity) -> str | None:
    """What is expected of an end moment that no one can mean for this section (None when plausible)."""
    bound = cap.moment_bound_kNm
    m = abs(M_kNm)
    if m <= bound:
        return None
    too_big = m > LIMITS["spec_moment_over_bound_error"] * bound
    ecc = m / NEd_kN if NEd_kN > 0 else math.inf
    if not too_big and not (NEd_kN > 0 and ecc > LIMITS["spec_eccentricity_m_error"]):
        return None
    hint = _suggest(M_kNm, 0.0, bound, ((1e-3, "Nm typed for kNm"), (1e-6, "N mm typed for kNm")))
    ecc_text = f"an eccentricity M/NEd of {ecc:,.0f} m, " if math.isfinite(ecc) else ""
    return (
        f"a moment in kNm is expected ({_whole(M_kNm)} kNm is {ecc_text}{m / bound:,.0f} times "
        f"(Ac fcd + As fyd) h/2 = {bound:,.0f} kNm, more than any strain state of this section resists{hint})"
    )


def spec_warnings(
    file: str,
    NEd_kN: float | None,
    cap: SectionCapacity,
    moments_kNm: Mapping[str, float] | None = None,
    lengths_mm: Mapping[str, tuple[float, str]] | None = None,
) -> list[str]:
    """Warnings for values of a single-column specification that are possible but unusual.

    Args:
        file: the specification file, named in every warning.
        NEd_kN: the axial force (None when not given).
        cap: the section's closed-form bounds.
        moments_kNm: end moments by key as written (``My[0]``).
        lengths_mm: effective lengths by key (``l0y``) with the axis they buckle about (``"y"``/``"z"``).

    Returns:
        One sentence per value: the file, the key, the value and why it looks wrong.
    """
    lim = LIMITS
    out: list[str] = []
    if NEd_kN is not None:
        if NEd_kN > lim["spec_force_over_squash_warn"] * cap.squash_kN:
            out.append(
                f"{file}: NEd = {_fmt(NEd_kN)}: above the squash load Ac fcd + As fyd = "
                f"{cap.squash_kN:,.0f} kN of this section, which cannot carry it; is NEd in kN?"
            )
        elif 0 < NEd_kN < lim["spec_force_under_squash_warn"] * cap.squash_kN:
            out.append(
                f"{file}: NEd = {_fmt(NEd_kN)}: under {100 * lim['spec_force_under_squash_warn']:g} % of "
                f"the squash load ({cap.squash_kN:,.0f} kN); was it given in MN instead of kN?"
            )
    for key, m in (moments_kNm or {}).items():
        if abs(m) > lim["spec_moment_over_bound_warn"] * cap.moment_bound_kNm:
            out.append(
                f"{file}: {key} = {_fmt(m)}: above (Ac fcd + As fyd) h/2 = {cap.moment_bound_kNm:,.0f} "
                "kNm, more than any strain state of this section resists; is the moment in kNm?"
            )
    for key, (l0, axis) in (lengths_mm or {}).items():
        depth = cap.h_y_mm if axis == "y" else cap.h_z_mm
        ratio = l0 / depth
        if ratio > lim["spec_l0_over_side_warn"]:
            side = "h" if axis == "y" else "b"
            out.append(
                f"{file}: {key} = {_fmt(l0)}: {key}/{side} = {ratio:.0f}, over "
                f"{lim['spec_l0_over_side_warn']:g}, slenderer than any column in practice; "
                f"are {key} and the section in mm?"
            )
    return out


def plausibility_warnings(
    scenario: Scenario, actions_df: pd.DataFrame | None, params: NationalParameters | None = None
) -> list[str]:
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
