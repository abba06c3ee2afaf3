"""Concept-stage load takedown: tributary areas, combinations, reductions, sub-frame moments.

The takedown is a pure function of the scenario and the trial column sizes:
``takedown(scenario, trial_sizes_mm)`` returns a :class:`TakedownResult` whose
``actions`` table has the same columns as an analysis-actions CSV (see
:data:`optimizer.building.actions_csv.ACTION_COLUMNS`), so both routes feed the
optimiser identically; :func:`scenario_actions` gives a scenario's actions by
whichever route it uses.

Method (repeated in ``TakedownResult.notes``):

1. Tributary areas per level (:mod:`optimizer.building.tributary`): Voronoi
   cells of the columns present at the level, clipped to the floor outline
   minus holes (shapely). Floor area outside the convex hull of the columns
   (cantilevers beyond the last column line) falls to the nearest column and
   is reported. Façade line load is taken on the length of outline inside
   each column's cell.
2. Characteristic loads per floor: slab self-weight (depth x density) plus
   superimposed dead load, façade line load, imposed load by category.
   Column self-weight: trial section area x clear height x density.
3. Accumulation down the stack graph (topological order), transfers by share.
4. Imposed-load reduction, alpha_n (EN 1991-1-1, Eq. (6.2)) or alpha_A
   (Eq. (6.1)), as the scenario chooses; then EN 1990 Eq. (6.10) or the less
   favourable of (6.10a) and (6.10b).
5. End moments at each floor in both plan directions from a simplified
   sub-frame (:mod:`optimizer.building.subframe`).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Any

import pandas as pd

from optimizer.building.actions_csv import K_COLUMNS, read_actions_csv
from optimizer.building.graph import build_stack_graph, carried_cells, load_order
from optimizer.building.loads import (
    ALPHA_N_CATEGORIES,
    PSI_FACTORS,
    Category,
    ImposedReduction,
    alpha_A,
    alpha_n,
    combine,
)
from optimizer.building.model import CellId, Scenario, SupportKind
from optimizer.building.subframe import CHAR, QP, joint_moments
from optimizer.building.tributary import LevelTributary, level_tributaries
from optimizer.errors import InputError

__all__ = ["TakedownResult", "m0eqp_ratio", "takedown", "scenario_actions"]

ProgressFn = Callable[[str, int, int], None]


def m0eqp_ratio(NEd_kN: float, N_qp_kN: float, moments: Sequence[tuple[float, float]]) -> float:
    """M0Eqp / M0Ed of a cell for the effective creep ratio, in [0, 1].

    EN 1992-1-1, 5.8.4(2), Eq. (5.19): phi_ef = phi(inf, t0) M0Eqp / M0Ed, with
    M0Eqp and M0Ed the first-order moments in the quasi-permanent and the
    design combination, imperfections included. The first-order moment of
    a column is its end moment from the frame plus N ei; the ratio of the
    sums lies between the ratio of the frame moments and that of the axial
    forces (ei is the same in both), so the larger of the two bounds it from
    above whatever ei is: that is what is returned (the larger over both axes).

    Args:
        NEd_kN: design axial force, kN.
        N_qp_kN: axial force under the quasi-permanent combination, kN.
        moments: per axis, (design end moment, quasi-permanent end moment), kNm,
            the larger end of each.
    """
    ratios = [N_qp_kN / NEd_kN if NEd_kN > 0 else 1.0]
    ratios += [m_qp / m_ed for m_ed, m_qp in moments if m_ed > 1e-9]
    return float(min(max(max(ratios), 0.0), 1.0))


# --------------------------------------------------------------------------- accumulation


@dataclass
class _Load:
    """Characteristic loads reaching a cell (mutable only inside :func:`takedown`)."""

    G_kN: float = 0.0
    # (category, psi0) -> [Qk unreduced, Qk after alpha_A, set of levels]
    Q: dict[tuple[Category, float], list[Any]] = field(default_factory=dict)

    def add(self, other: _Load, share: float) -> None:
        self.G_kN += share * other.G_kN
        for k, (qu, qa, lvls) in other.Q.items():
            mine = self.Q.setdefault(k, [0.0, 0.0, set()])
            mine[0] += share * qu
            mine[1] += share * qa
            mine[2] |= lvls

    @property
    def Qk_kN(self) -> float:
        return sum(v[0] for v in self.Q.values())


def _reduced(load: _Load, mode: ImposedReduction) -> tuple[float, float, str]:
    """(Qk after reduction, sum psi0 Qk, description) for one cell."""
    psi_q = sum(p0 * v[0] for (cat, p0), v in load.Q.items())
    if mode is ImposedReduction.NONE:
        return load.Qk_kN, psi_q, "none"
    if mode is ImposedReduction.ALPHA_A:
        total = sum(v[1] for v in load.Q.values())
        ratio = total / load.Qk_kN if load.Qk_kN > 0 else 1.0
        return total, psi_q, f"alpha_A per floor (overall {ratio:.3f})"
    total, parts = 0.0, []
    for (cat, p0), (qu, _, lvls) in sorted(load.Q.items(), key=lambda kv: kv[0][0].value):
        a = alpha_n(len(lvls), p0, cat)
        total += a * qu
        if cat in ALPHA_N_CATEGORIES and qu > 0:
            parts.append(f"{cat.value}: n={len(lvls)} alpha_n={a:.3f}")
    return total, psi_q, "alpha_n " + "; ".join(parts) if parts else "alpha_n n/a"


@dataclass(frozen=True)
class TakedownResult:
    """Everything the takedown produces.

    Attributes:
        actions: per-cell actions in the CSV format (:data:`ACTION_COLUMNS` ...).
        detail: per-cell breakdown (areas, characteristic loads, reduction,
            governing expression).
        tributary: level name -> tributary cells.
        reactions: loads at the foundation, at external transfers and
            delivered by transfer stacks to their supports.
        level_totals: characteristic load per level.
        warnings: things the engineer should look at.
        notes: the method and its assumptions, for the output.
    """

    actions: pd.DataFrame
    detail: pd.DataFrame
    tributary: Mapping[str, LevelTributary]
    reactions: pd.DataFrame
    level_totals: pd.DataFrame
    warnings: tuple[str, ...]
    notes: tuple[str, ...]


def _trial_sizes(
    scenario: Scenario, trial_sizes_mm: Mapping[Any, tuple[float, float]] | None
) -> dict[CellId, tuple[float, float]]:
    sizes = {}
    for c in scenario.cells:
        if c.settings.trial_b_mm is None:
            raise InputError(
                scenario.source, "settings.trial_size_mm", None, f"a trial size for cell ({c.stack}, {c.level})"
            )
        sizes[c.id] = (c.settings.trial_b_mm, c.settings.trial_h_mm)
    for key, bh in (trial_sizes_mm or {}).items():
        cid = CellId(*key)
        if cid not in sizes:
            msg = f"trial size given for unknown cell {cid}"
            raise ValueError(msg)
        b, h = (float(v) for v in bh)
        if not (b > 0 and h > 0):
            msg = f"trial size of cell {cid} must be positive, got {bh}"
            raise ValueError(msg)
        sizes[cid] = (b, h)
    return sizes


def takedown(
    scenario: Scenario,
    trial_sizes_mm: Mapping[CellId | tuple[str, str], tuple[float, float]] | None = None,
    progress: ProgressFn | None = None,
) -> TakedownResult:
    """Per-cell actions of a scenario from the concept-stage takedown.

    Args:
        scenario: a scenario on the takedown route ([takedown] + [[floors]]).
        trial_sizes_mm: optional (b_mm, h_mm) per cell, overriding the
            scenario's ``trial_size_mm``; used for the column self-weight and
            the column stiffness in the sub-frame (so the optimiser can iterate).
        progress: optional callback (stage, done, total).
    """
    if scenario.takedown is None:
        raise InputError(
            scenario.source,
            "takedown",
            None,
            "a [takedown] table: this scenario gives its actions in a CSV (use read_actions_csv)",
        )
    sizes = _trial_sizes(scenario, trial_sizes_mm)
    graph = build_stack_graph(scenario)
    trib = level_tributaries(scenario, progress)
    mode = scenario.takedown.imposed_reduction
    density = scenario.materials.concrete_density_kN_m3

    loads: dict[CellId, _Load] = {}
    floor_rows: dict[CellId, dict[str, float]] = {}
    order = list(load_order(graph))
    for n, cid in enumerate(order):
        cell = scenario.cell(cid)
        lv = scenario.level(cid.level)
        lf = scenario.floor_at(cid.level)
        tc = trib[cid.level].cells[cid.stack]
        g_kPa = lv.slab_depth_mm / 1000.0 * density + lf.floor.sdl_kPa
        G_floor = tc.area_m2 * g_kPa + tc.facade_m * lf.floor.facade_kN_m
        Q_floor = tc.area_m2 * lf.floor.imposed_kPa
        Q_floor_A = Q_floor * alpha_A(tc.area_m2, lf.psi0, lf.category)
        b, h = sizes[cid]
        self_w = b * h * 1e-6 * cell.clear_height_m * density
        load = _Load()
        for carried, share in carried_cells(graph, cid):
            load.add(loads[carried], share)
        load.G_kN += G_floor + self_w
        if Q_floor > 0:
            k = (lf.category, lf.psi0)
            entry = load.Q.setdefault(k, [0.0, 0.0, set()])
            entry[0] += Q_floor
            entry[1] += Q_floor_A
            entry[2].add(cid.level)
        loads[cid] = load
        floor_rows[cid] = {"G_floor": G_floor, "Q_floor": Q_floor, "self": self_w}
        if progress:
            progress("accumulating loads", n + 1, len(order))

    top, bot, warnings = joint_moments(scenario, trib, sizes)
    actions, detail = _tables(scenario, loads, floor_rows, trib, top, bot, mode)
    reactions = _reactions(scenario, graph, loads, detail)
    totals = _level_totals(scenario, trib, floor_rows)
    warnings.extend(_cantilever_warnings(trib))
    return TakedownResult(actions, detail, MappingProxyType(trib), reactions, totals, tuple(warnings), _notes(scenario))


def _cantilever_warnings(trib: Mapping[str, LevelTributary]) -> list[str]:
    """One warning listing the levels with floor beyond the outer column lines."""
    parts = [f"{lt.level} {lt.cantilever_area_m2:.1f}" for lt in trib.values() if lt.cantilever_area_m2 > 0.01]
    if not parts:
        return []
    shown = ", ".join(parts[:12]) + (" ..." if len(parts) > 12 else "")
    return [
        f"floor area beyond the outer column lines (m2 per level: {shown}) is assigned to "
        "the nearest columns; see cantilever_m2 in the detail table"
    ]


def _tables(
    scenario: Scenario,
    loads: Mapping[CellId, _Load],
    floor_rows: Mapping[CellId, dict[str, float]],
    trib: Mapping[str, LevelTributary],
    top: Mapping,
    bot: Mapping,
    mode: ImposedReduction,
) -> tuple[pd.DataFrame, pd.DataFrame]:
    rows, details = [], []
    any_k = any(
        c.settings.effective_length is not None and not c.settings.effective_length.uses_factors for c in scenario.cells
    )
    for c in scenario.cells:
        load = loads[c.id]
        q_red, psi_q, reduction = _reduced(load, mode)
        NEd, expr = combine(load.G_kN, q_red, psi_q, scenario.params, scenario.takedown.combination)
        N_qp = load.G_kN + sum(PSI_FACTORS[cat].psi2 * v[0] for (cat, _), v in load.Q.items())
        # EN 1992-1-2, 2.4.2(2): eta_fi = Ed,fi / Ed with Ed,fi = Gk + psi_fi Qk (EN 1990, Eq. (6.11b));
        # psi_fi = psi1, the more onerous of the two choices of EN 1991-1-2, 4.3.1(2) (recalled from memory)
        N_fi = load.G_kN + sum(PSI_FACTORS[cat].psi1 * v[0] for (cat, _), v in load.Q.items())
        eta = min(N_fi / NEd, 1.0) if NEd > 0 else 1.0
        N_char = load.G_kN + q_red

        def ends(key: str, ax: str, cid: CellId = c.id) -> float:
            return max(top.get((cid, key, ax), 0.0), bot.get((cid, key, ax), 0.0))

        ratio = m0eqp_ratio(NEd, N_qp, [(ends(expr, ax), ends(QP, ax)) for ax in ("y", "z")])
        char = m0eqp_ratio(NEd, N_char, [(ends(expr, ax), ends(CHAR, ax)) for ax in ("y", "z")])
        row = {
            "stack": c.stack,
            "level": c.level,
            "NEd_kN": NEd,
            "My_top_kNm": top.get((c.id, expr, "y"), 0.0),
            "My_bot_kNm": bot.get((c.id, expr, "y"), 0.0),
            "Mz_top_kNm": top.get((c.id, expr, "z"), 0.0),
            "Mz_bot_kNm": bot.get((c.id, expr, "z"), 0.0),
            "l0y_mm": c.l0y_mm,
            "l0z_mm": c.l0z_mm,
            "exposure": c.settings.exposure,
            "fire": c.settings.fire,
            "M0Eqp_ratio": ratio,
            "char_ratio": char,
            "eta_fi": eta,
        }
        if any_k:
            el = c.settings.effective_length
            for k in K_COLUMNS:
                row[k] = getattr(el, k) if el is not None else None
        rows.append(row)
        tc = trib[c.level].cells[c.stack]
        fr = floor_rows[c.id]
        details.append(
            {
                "stack": c.stack,
                "level": c.level,
                "tributary_m2": tc.area_m2,
                "cantilever_m2": tc.cantilever_area_m2,
                "facade_m": tc.facade_m,
                "Gk_floor_kN": fr["G_floor"],
                "Qk_floor_kN": fr["Q_floor"],
                "self_weight_kN": fr["self"],
                "Gk_kN": load.G_kN,
                "Qk_kN": load.Qk_kN,
                "Qk_reduced_kN": q_red,
                "reduction": reduction,
                "expression": expr,
                "NEd_kN": NEd,
                "N_qp_kN": N_qp,
                "M0Eqp_ratio": ratio,
                "N_char_kN": N_char,
                "char_ratio": char,
                "N_fi_kN": N_fi,
                "eta_fi": eta,
            }
        )
    actions = pd.DataFrame(rows)
    for col in ("l0y_mm", "l0z_mm"):
        actions[col] = actions[col].astype(float)
    return actions, pd.DataFrame(details)


def _reactions(scenario: Scenario, graph: Any, loads: Mapping[CellId, _Load], detail: pd.DataFrame) -> pd.DataFrame:
    ned = dict(zip(zip(detail["stack"], detail["level"], strict=True), detail["NEd_kN"], strict=True))
    rows = []
    for st in scenario.stacks:
        cid = CellId(st.id, st.from_level)
        load = loads[cid]
        if st.support is SupportKind.TRANSFER:
            for other, share in st.carried_by:
                below = scenario.levels[scenario.level(st.from_level).index - 1].name
                rows.append(
                    {
                        "kind": "transfer",
                        "stack": st.id,
                        "level": st.from_level,
                        "onto": f"{other}@{below}",
                        "share": share,
                        "Gk_kN": share * load.G_kN,
                        "Qk_kN": share * load.Qk_kN,
                        "NEd_kN": share * ned[cid],
                    }
                )
        else:
            rows.append(
                {
                    "kind": st.support.value,
                    "stack": st.id,
                    "level": st.from_level,
                    "onto": st.support.value,
                    "share": 1.0,
                    "Gk_kN": load.G_kN,
                    "Qk_kN": load.Qk_kN,
                    "NEd_kN": ned[cid],
                }
            )
    return pd.DataFrame(rows)


def _level_totals(
    scenario: Scenario, trib: Mapping[str, LevelTributary], floor_rows: Mapping[CellId, dict[str, float]]
) -> pd.DataFrame:
    rows = []
    for lv in scenario.levels:
        cells = scenario.cells_at(lv.name)
        lt = trib[lv.name]
        rows.append(
            {
                "level": lv.name,
                "elevation_m": lv.floor_elevation_m,
                "floor_area_m2": lt.floor_area_m2,
                "cantilever_m2": lt.cantilever_area_m2,
                "columns": len(cells),
                "Gk_floor_kN": sum(floor_rows[c.id]["G_floor"] for c in cells),
                "Qk_floor_kN": sum(floor_rows[c.id]["Q_floor"] for c in cells),
                "column_self_weight_kN": sum(floor_rows[c.id]["self"] for c in cells),
            }
        )
    return pd.DataFrame(rows)


def _notes(scenario: Scenario) -> tuple[str, ...]:
    opts = scenario.takedown
    p = scenario.params
    red = {
        ImposedReduction.NONE: "no reduction of imposed loads",
        ImposedReduction.ALPHA_N: "alpha_n of EN 1991-1-1 Eq. (6.2) on the imposed load of "
        "each category A-D, n = number of storeys of that category carried by the cell "
        "(n > 2; 1.0 otherwise)",
        ImposedReduction.ALPHA_A: "alpha_A of EN 1991-1-1 Eq. (6.1) applied floor by floor "
        "to each column's tributary area (categories A-E; >= 0.6 for C and D)",
    }[opts.imposed_reduction]
    return (
        "Lateral stability: the columns are braced; the cores are assumed to carry all "
        "horizontal actions (none are applied to the columns).",
        "Tributary areas: Voronoi cells of the columns at each level clipped to the floor "
        "outline minus holes; floor beyond the outer column lines goes to the nearest column; "
        "load on holes (cores, voids) is not carried by the columns.",
        "Loads: slab self-weight = slab depth x concrete density "
        f"({scenario.materials.concrete_density_kN_m3:g} kN/m3) + superimposed dead; façade "
        "line load on the outline length inside each cell; column self-weight = trial "
        "section area x clear height x density.",
        f"Imposed load reduction: {red}. In Eq. (6.10a) only psi0 applies (EN 1991-1-1, "
        "3.3.1(2)P); all imposed loads on a column act as one variable action.",
        f"Combination: EN 1990 Eq. ({opts.combination.value}) with gamma_G = {p.gamma_G:g}, "
        f"gamma_Q = {p.gamma_Q:g}, xi = {p.xi:g} ({p.name}); where 6.10a and 6.10b are both "
        "used the larger NEd governs the cell and its moments use the same expression.",
        "NEd is the axial force at the bottom of each cell, including its own self-weight.",
        "End moments: simplified sub-frame at every floor in both plan directions (flat slab "
        "as equivalent frame of width = tributary area / tributary extent along the span); "
        "fixed-end moments w L^2/12 with full design load on one side and design permanent "
        "load on the other (EN 1992-1-1, 5.1.3(1)P); the out-of-balance moment is shared "
        "between the columns above and below by I/L, slab stiffness halved; edge and corner "
        "columns take the whole edge-span moment; cantilever moments are ignored; the limit "
        "on moment transfer to flat-slab edge columns (EN 1992-1-1, Annex I) is not applied.",
        "Moments are magnitudes reported with the same sign at both ends (single curvature, "
        "the conservative case for EN 1992-1-1, 5.8.3.1); at a foundation or transfer the "
        "column base takes no sub-frame moment. Minimum eccentricity and imperfections are "
        "for the member check.",
        "Orientation: moments are about the section's local axes; stacks left 'free' are "
        "reported in the default orientation (b along plan X).",
    )


def scenario_actions(
    scenario: Scenario, trial_sizes_mm: Mapping[CellId | tuple[str, str], tuple[float, float]] | None = None
) -> pd.DataFrame:
    """The actions table of a scenario by whichever route it uses (CSV or takedown)."""
    if scenario.actions_file is not None:
        return read_actions_csv(scenario.actions_file, scenario)
    return takedown(scenario, trial_sizes_mm).actions
