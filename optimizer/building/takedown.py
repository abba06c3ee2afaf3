"""Concept-stage load takedown: tributary areas, combinations, reductions, sub-frame moments.

The takedown is a pure function of the scenario and the trial column sizes:
``takedown(scenario, trial_sizes_mm)`` returns a :class:`TakedownResult` whose
``actions`` table has the same columns as an analysis-actions CSV (see
:data:`ACTION_COLUMNS`), so both routes feed the optimiser identically.

Method (repeated in ``TakedownResult.notes``):

1. Tributary areas per level: Voronoi cells of the columns present at the
   level, clipped to the floor outline minus holes (shapely). Floor area
   outside the convex hull of the columns (cantilevers beyond the last column
   line) falls to the nearest column and is reported. Façade line load is
   taken on the length of outline inside each column's cell.
2. Characteristic loads per floor: slab self-weight (depth x density) plus
   superimposed dead load, façade line load, imposed load by category.
   Column self-weight: trial section area x clear height x density.
3. Accumulation down the stack graph (topological order), transfers by share.
4. Imposed-load reduction, alpha_n (EN 1991-1-1, Eq. (6.2)) or alpha_A
   (Eq. (6.1)), as the scenario chooses; then EN 1990 Eq. (6.10) or the less
   favourable of (6.10a) and (6.10b).
5. End moments at each floor in both plan directions from a simplified
   sub-frame (details in :func:`joint_moments`).
"""

from __future__ import annotations

import csv
import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType
from typing import Any

import pandas as pd
import shapely
from shapely.geometry import LineString, MultiPoint, Point, Polygon, box
from shapely.geometry.base import BaseGeometry

from optimizer.building.graph import build_stack_graph, carried_cells, load_order
from optimizer.building.loads import (
    ALPHA_N_CATEGORIES,
    PSI_FACTORS,
    Category,
    ImposedReduction,
    alpha_A,
    alpha_n,
    combination_factors,
    combine,
)
from optimizer.building.scenario import (
    CellId,
    Orientation,
    Scenario,
    SupportKind,
    _exposure,
    _fire,
)
from optimizer.errors import InputError, did_you_mean

__all__ = [
    "ACTION_COLUMNS",
    "OPTIONAL_COLUMNS",
    "K_COLUMNS",
    "TributaryCell",
    "LevelTributary",
    "TakedownResult",
    "tributary_areas",
    "fixed_end_moment",
    "out_of_balance_moment",
    "distribute_to_columns",
    "joint_moments",
    "takedown",
    "read_actions_csv",
    "write_actions_csv",
    "scenario_actions",
    "GRID_LINE_TOLERANCE_M",
    "SPAN_INSIDE_FRACTION",
]

ACTION_COLUMNS = ("stack", "level", "NEd_kN", "My_top_kNm", "My_bot_kNm", "Mz_top_kNm",
                  "Mz_bot_kNm")
OPTIONAL_COLUMNS = ("l0y_mm", "l0z_mm", "exposure", "fire", "M0Eqp_ratio", "char_ratio")
K_COLUMNS = ("k1y", "k2y", "k1z", "k2z")

# Two columns lie on one grid line when their offset across the line is at most this.
GRID_LINE_TOLERANCE_M = 0.30
# A slab span exists between two columns when this fraction of the line joining them is slab.
SPAN_INSIDE_FRACTION = 0.9

ProgressFn = Callable[[str, int, int], None]


# --------------------------------------------------------------------------- tributary areas


@dataclass(frozen=True)
class TributaryCell:
    """The floor area one column carries at one level.

    ``x_extent_m``/``y_extent_m`` are the plan extents of the cell; the
    equivalent-frame width perpendicular to a span is area / extent along it.
    """

    stack: str
    x_m: float
    y_m: float
    area_m2: float
    cantilever_area_m2: float
    facade_m: float
    x_extent_m: float
    y_extent_m: float
    polygon: BaseGeometry = field(compare=False, repr=False)


@dataclass(frozen=True)
class LevelTributary:
    """Tributary cells of all the columns at one level."""

    level: str
    floor_index: int
    cells: Mapping[str, TributaryCell]
    floor_area_m2: float

    @property
    def cantilever_area_m2(self) -> float:
        """Floor area beyond the outer column lines, m2 (assigned to the nearest column)."""
        return sum(c.cantilever_area_m2 for c in self.cells.values())


def tributary_areas(floor: Polygon, outline: Polygon,
                    columns: Mapping[str, tuple[float, float]]) -> dict[str, TributaryCell]:
    """Voronoi tributary cells of ``columns`` clipped to ``floor`` (outline minus holes).

    Args:
        floor: the slab, m (outline minus holes).
        outline: the outer outline, m; its boundary carries the façade.
        columns: stack id -> (x, y) plan position, m.
    """
    if not columns:
        return {}
    ids = list(columns)
    pts = [Point(columns[i]) for i in ids]
    minx, miny, maxx, maxy = shapely.MultiPoint(pts).union(floor).bounds
    pad = 10.0 + (maxx - minx) + (maxy - miny)
    envelope = box(minx - pad, miny - pad, maxx + pad, maxy + pad)
    if len(pts) == 1:
        regions = {ids[0]: envelope}
    else:
        polys = list(shapely.voronoi_polygons(MultiPoint(pts), extend_to=envelope).geoms)
        regions = {}
        for sid, p in zip(ids, pts, strict=True):
            match = [poly for poly in polys if poly.covers(p)]
            if not match:  # pragma: no cover - shapely always returns a covering cell
                msg = f"no Voronoi cell found for column {sid}"
                raise RuntimeError(msg)
            regions[sid] = min(match, key=lambda poly: poly.distance(p) + poly.area * 1e-12)
    hull = MultiPoint(pts).convex_hull
    hull = hull if isinstance(hull, Polygon) else Polygon()
    ring = LineString(outline.exterior.coords)
    out = {}
    for sid, region in regions.items():
        region = region.intersection(envelope)
        clipped = region.intersection(floor)
        bx = clipped.bounds if not clipped.is_empty else (0.0, 0.0, 0.0, 0.0)
        cant = clipped.difference(hull).area if not hull.is_empty else clipped.area
        out[sid] = TributaryCell(
            stack=sid, x_m=columns[sid][0], y_m=columns[sid][1], area_m2=clipped.area,
            cantilever_area_m2=cant, facade_m=region.intersection(ring).length,
            x_extent_m=bx[2] - bx[0], y_extent_m=bx[3] - bx[1], polygon=clipped,
        )
    return out


def _level_tributaries(scenario: Scenario, progress: ProgressFn | None) -> dict[str, LevelTributary]:
    cache: dict[tuple[int, tuple[str, ...]], dict[str, TributaryCell]] = {}
    result = {}
    for i, lv in enumerate(scenario.levels):
        lf = scenario.floor_at(lv.name)
        cols = {c.stack: (scenario.stack(c.stack).x_m, scenario.stack(c.stack).y_m)
                for c in scenario.cells_at(lv.name)}
        key = (lf.floor.index, tuple(cols))
        if key not in cache:
            cache[key] = tributary_areas(lf.floor.polygon, Polygon(lf.floor.outline_m), cols)
        result[lv.name] = LevelTributary(lv.name, lf.floor.index, cache[key],
                                         lf.floor.polygon.area)
        if progress:
            progress("tributary areas", i + 1, len(scenario.levels))
    return result


# --------------------------------------------------------------------------- sub-frame moments


def fixed_end_moment(w_kN_m: float, span_m: float) -> float:
    """Fixed-end moment of a uniformly loaded span, kNm.

    Fixed-end moment of a built-in beam under uniform load: M = w L^2 / 12
    (standard beam tables).
    """
    return w_kN_m * span_m**2 / 12.0


def out_of_balance_moment(w_full_kN_m: float, w_dead_kN_m: float,
                          span1_m: float | None, span2_m: float | None) -> float:
    """Out-of-balance moment at a joint with spans on one or both sides, kNm.

    Pattern loading, EN 1992-1-1, 5.1.3(1)P: full design load on one side,
    design permanent load only on the other; the larger of the two arrangements.
    An edge joint (one span) takes the whole fixed-end moment of the edge span
    under full design load. No span: 0.
    """
    spans = [s for s in (span1_m, span2_m) if s]
    if not spans:
        return 0.0
    if len(spans) == 1:
        return fixed_end_moment(w_full_kN_m, spans[0])
    a, b = spans
    m1 = fixed_end_moment(w_full_kN_m, a) - fixed_end_moment(w_dead_kN_m, b)
    m2 = fixed_end_moment(w_full_kN_m, b) - fixed_end_moment(w_dead_kN_m, a)
    return max(abs(m1), abs(m2))


def distribute_to_columns(m_unbalanced_kNm: float, k_below: float, k_above: float,
                          k_slabs: float) -> tuple[float, float]:
    """Share of the out-of-balance moment taken by the columns below and above, kNm.

    Simplified sub-frame (far ends fixed), slab stiffness halved:
        M_col = M_ub * K_col / (K_below + K_above + 0.5 * sum(K_slab))
    with K = I / L (same E for slab and column). Recalled from common concise
    Eurocode 2 design guidance; not an EN 1992-1-1 equation.
    """
    denom = k_below + k_above + 0.5 * k_slabs
    if denom <= 0:
        return 0.0, 0.0
    return m_unbalanced_kNm * k_below / denom, m_unbalanced_kNm * k_above / denom


QP = "quasi-permanent"  # key of the quasi-permanent sub-frame moments beside the design expressions
CHAR = "characteristic"  # key of the characteristic sub-frame moments


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


def _section_I_m4(b_mm: float, h_mm: float, orientation: Orientation,
                  direction: str) -> tuple[float, str]:
    """Column second moment of area for bending in a plan direction, and the local axis.

    Slab spanning along plan X bends the column in the X-vertical plane. With
    local y along plan X (b along X) the lever arm is along b: moment about
    local z, Iz = h b^3 / 12. Turned 90 degrees: about local y, Iy = b h^3 / 12.
    """
    b, h = b_mm / 1000.0, h_mm / 1000.0
    b_along_span = (orientation is not Orientation.B_ALONG_Y) == (direction == "X")
    if b_along_span:
        return h * b**3 / 12.0, "z"
    return b * h**3 / 12.0, "y"


def _spans(me: tuple[float, float], others: list[tuple[float, float]], direction: str,
           floor: BaseGeometry) -> tuple[float | None, float | None]:
    """Distances to the nearest columns on the same grid line on each side, m."""
    axis, across = (0, 1) if direction == "X" else (1, 0)
    neg, pos = None, None
    for o in others:
        if abs(o[across] - me[across]) > GRID_LINE_TOLERANCE_M:
            continue
        d = o[axis] - me[axis]
        if d > 0 and (pos is None or d < pos[0]):
            pos = (d, o)
        elif d < 0 and (neg is None or -d < neg[0]):
            neg = (-d, o)
    result = []
    for cand in (neg, pos):
        if cand is None:
            result.append(None)
            continue
        seg = LineString([me, cand[1]])
        inside = seg.intersection(floor).length
        result.append(cand[0] if inside >= SPAN_INSIDE_FRACTION * seg.length else None)
    return result[0], result[1]


@dataclass(frozen=True)
class _JointInput:
    g_kPa: float
    q_kPa: float
    psi0: float
    slab_m: float


def joint_moments(scenario: Scenario, tributary: Mapping[str, LevelTributary],
                  sizes: Mapping[CellId, tuple[float, float]],
                  ) -> tuple[dict[tuple[CellId, str, str], float],
                             dict[tuple[CellId, str, str], float], list[str]]:
    """Column end moments from a simplified sub-frame at every floor, kNm.

    For each floor and each plan direction: spans to the neighbouring columns
    on the same grid line; line loads = area loads x frame width (tributary
    area / tributary extent along the span); fixed-end moments w L^2 / 12 with
    pattern loading (EN 1992-1-1, 5.1.3(1)P); out-of-balance moment shared
    between the column below and above in proportion to their stiffnesses,
    slab stiffness halved (:func:`distribute_to_columns`). Done for each
    expression of the combination, full load = fG g + fQ q (psi0 q in 6.10a),
    dead = fG g.

    Returns:
        top, bottom: (cell, expression, local axis "y"/"z") -> moment, kNm,
        magnitudes; and a list of warnings.
    """
    top: dict[tuple[CellId, str, str], float] = {}
    bot: dict[tuple[CellId, str, str], float] = {}
    no_span: list[str] = []
    density = scenario.materials.concrete_density_kN_m3
    exprs = combination_factors(scenario.params, scenario.takedown.combination)
    span_cache: dict[tuple[int, tuple[str, ...]], dict[tuple[str, str], tuple]] = {}
    for lv in scenario.levels:
        lf = scenario.floor_at(lv.name)
        cells = scenario.cells_at(lv.name)
        pos = {c.stack: (scenario.stack(c.stack).x_m, scenario.stack(c.stack).y_m) for c in cells}
        key = (lf.floor.index, tuple(pos))
        if key not in span_cache:
            span_cache[key] = {
                (sid, d): _spans(p, [q for o, q in pos.items() if o != sid], d, lf.floor.polygon)
                for sid, p in pos.items() for d in ("X", "Y")
            }
        spans = span_cache[key]
        slab_m = lv.slab_depth_mm / 1000.0
        g = slab_m * density + lf.floor.sdl_kPa
        q = lf.floor.imposed_kPa
        for c in cells:
            st = scenario.stack(c.stack)
            trib = tributary[lv.name].cells[c.stack]
            above = CellId(c.stack, scenario.levels[lv.index + 1].name) \
                if lv.index + 1 < len(scenario.levels) else None
            if above is not None and not scenario.has_cell(above):
                above = None
            for d in ("X", "Y"):
                s1, s2 = spans[(c.stack, d)]
                if s1 is None and s2 is None:
                    no_span.append(f"({c.stack}, {lv.name}) {d}")
                    continue
                extent = trib.x_extent_m if d == "X" else trib.y_extent_m
                width = trib.area_m2 / extent if extent > 0 else 0.0
                i_slab = width * slab_m**3 / 12.0
                k_slabs = sum(i_slab / s for s in (s1, s2) if s)
                i_below, axis = _section_I_m4(*sizes[c.id], st.orientation, d)
                k_below = i_below / lv.height_m
                k_above = 0.0
                if above is not None:
                    i_above, _ = _section_I_m4(*sizes[above], st.orientation, d)
                    k_above = i_above / scenario.level(above.level).height_m
                for name, (fG, fQ, use_psi) in exprs.items():
                    q_eff = lf.psi0 * q if use_psi else q
                    w_full = (fG * g + fQ * q_eff) * width
                    w_dead = fG * g * width
                    m_ub = out_of_balance_moment(w_full, w_dead, s1, s2)
                    m_below, m_above = distribute_to_columns(m_ub, k_below, k_above, k_slabs)
                    top[(c.id, name, axis)] = m_below
                    if above is not None:
                        bot[(above, name, axis)] = m_above
                # quasi-permanent combination Gk + psi2 Qk (EN 1990, Eq. (6.16b)) for M0Eqp of
                # EN 1992-1-1, 5.8.4(2): the same sub-frame, unfactored, pattern of psi2 q
                # and the characteristic combination Gk + Qk (EN 1990, Eq. (6.14b)) for 7.2(2)
                for name, w in ((QP, (g + PSI_FACTORS[lf.category].psi2 * q) * width), (CHAR, (g + q) * width)):
                    m_below, m_above = distribute_to_columns(out_of_balance_moment(w, g * width, s1, s2),
                                                             k_below, k_above, k_slabs)
                    top[(c.id, name, axis)] = m_below
                    if above is not None:
                        bot[(above, name, axis)] = m_above
    warnings = []
    if no_span:
        shown = ", ".join(no_span[:8]) + (" ..." if len(no_span) > 8 else "")
        warnings.append(
            f"{len(no_span)} cell/direction(s) have no slab span to a neighbouring column on "
            f"their grid line and get no sub-frame moment there: {shown}")
    return top, bot, warnings


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


def _trial_sizes(scenario: Scenario, trial_sizes_mm: Mapping[Any, tuple[float, float]] | None,
                 ) -> dict[CellId, tuple[float, float]]:
    sizes = {}
    for c in scenario.cells:
        if c.settings.trial_b_mm is None:
            raise InputError(scenario.source, "settings.trial_size_mm", None,
                             f"a trial size for cell ({c.stack}, {c.level})")
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


def takedown(scenario: Scenario,
             trial_sizes_mm: Mapping[CellId | tuple[str, str], tuple[float, float]] | None = None,
             progress: ProgressFn | None = None) -> TakedownResult:
    """Per-cell actions of a scenario from the concept-stage takedown.

    Args:
        scenario: a scenario on the takedown route ([takedown] + [[floors]]).
        trial_sizes_mm: optional (b_mm, h_mm) per cell, overriding the
            scenario's ``trial_size_mm``; used for the column self-weight and
            the column stiffness in the sub-frame (so the optimiser can iterate).
        progress: optional callback (stage, done, total).
    """
    if scenario.takedown is None:
        raise InputError(scenario.source, "takedown", None,
                         "a [takedown] table: this scenario gives its actions in a CSV "
                         "(use read_actions_csv)")
    sizes = _trial_sizes(scenario, trial_sizes_mm)
    graph = build_stack_graph(scenario)
    trib = _level_tributaries(scenario, progress)
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
    return TakedownResult(actions, detail, MappingProxyType(trib), reactions, totals,
                          tuple(warnings), _notes(scenario))


def _cantilever_warnings(trib: Mapping[str, LevelTributary]) -> list[str]:
    """One warning listing the levels with floor beyond the outer column lines."""
    parts = [f"{lt.level} {lt.cantilever_area_m2:.1f}" for lt in trib.values()
             if lt.cantilever_area_m2 > 0.01]
    if not parts:
        return []
    shown = ", ".join(parts[:12]) + (" ..." if len(parts) > 12 else "")
    return [f"floor area beyond the outer column lines (m2 per level: {shown}) is assigned to "
            "the nearest columns; see cantilever_m2 in the detail table"]


def _tables(scenario: Scenario, loads: Mapping[CellId, _Load],
            floor_rows: Mapping[CellId, dict[str, float]],
            trib: Mapping[str, LevelTributary],
            top: Mapping, bot: Mapping, mode: ImposedReduction,
            ) -> tuple[pd.DataFrame, pd.DataFrame]:
    rows, details = [], []
    any_k = any(c.settings.effective_length is not None
                and not c.settings.effective_length.uses_factors for c in scenario.cells)
    for c in scenario.cells:
        load = loads[c.id]
        q_red, psi_q, reduction = _reduced(load, mode)
        NEd, expr = combine(load.G_kN, q_red, psi_q, scenario.params,
                            scenario.takedown.combination)
        N_qp = load.G_kN + sum(PSI_FACTORS[cat].psi2 * v[0] for (cat, _), v in load.Q.items())
        N_char = load.G_kN + q_red

        def ends(key: str, ax: str, cid: CellId = c.id) -> float:
            return max(top.get((cid, key, ax), 0.0), bot.get((cid, key, ax), 0.0))

        ratio = m0eqp_ratio(NEd, N_qp, [(ends(expr, ax), ends(QP, ax)) for ax in ("y", "z")])
        char = m0eqp_ratio(NEd, N_char, [(ends(expr, ax), ends(CHAR, ax)) for ax in ("y", "z")])
        row = {
            "stack": c.stack, "level": c.level, "NEd_kN": NEd,
            "My_top_kNm": top.get((c.id, expr, "y"), 0.0),
            "My_bot_kNm": bot.get((c.id, expr, "y"), 0.0),
            "Mz_top_kNm": top.get((c.id, expr, "z"), 0.0),
            "Mz_bot_kNm": bot.get((c.id, expr, "z"), 0.0),
            "l0y_mm": c.l0y_mm, "l0z_mm": c.l0z_mm,
            "exposure": c.settings.exposure, "fire": c.settings.fire,
            "M0Eqp_ratio": ratio, "char_ratio": char,
        }
        if any_k:
            el = c.settings.effective_length
            for k in K_COLUMNS:
                row[k] = getattr(el, k) if el is not None else None
        rows.append(row)
        tc = trib[c.level].cells[c.stack]
        fr = floor_rows[c.id]
        details.append({
            "stack": c.stack, "level": c.level, "tributary_m2": tc.area_m2,
            "cantilever_m2": tc.cantilever_area_m2, "facade_m": tc.facade_m,
            "Gk_floor_kN": fr["G_floor"], "Qk_floor_kN": fr["Q_floor"],
            "self_weight_kN": fr["self"], "Gk_kN": load.G_kN, "Qk_kN": load.Qk_kN,
            "Qk_reduced_kN": q_red, "reduction": reduction, "expression": expr, "NEd_kN": NEd,
            "N_qp_kN": N_qp, "M0Eqp_ratio": ratio, "N_char_kN": N_char, "char_ratio": char,
        })
    actions = pd.DataFrame(rows)
    for col in ("l0y_mm", "l0z_mm"):
        actions[col] = actions[col].astype(float)
    return actions, pd.DataFrame(details)


def _reactions(scenario: Scenario, graph: Any, loads: Mapping[CellId, _Load],
               detail: pd.DataFrame) -> pd.DataFrame:
    ned = dict(zip(zip(detail["stack"], detail["level"], strict=True), detail["NEd_kN"],
                   strict=True))
    rows = []
    for st in scenario.stacks:
        cid = CellId(st.id, st.from_level)
        load = loads[cid]
        if st.support is SupportKind.TRANSFER:
            for other, share in st.carried_by:
                below = scenario.levels[scenario.level(st.from_level).index - 1].name
                rows.append({"kind": "transfer", "stack": st.id, "level": st.from_level,
                             "onto": f"{other}@{below}", "share": share,
                             "Gk_kN": share * load.G_kN, "Qk_kN": share * load.Qk_kN,
                             "NEd_kN": share * ned[cid]})
        else:
            rows.append({"kind": st.support.value, "stack": st.id, "level": st.from_level,
                         "onto": st.support.value, "share": 1.0, "Gk_kN": load.G_kN,
                         "Qk_kN": load.Qk_kN, "NEd_kN": ned[cid]})
    return pd.DataFrame(rows)


def _level_totals(scenario: Scenario, trib: Mapping[str, LevelTributary],
                  floor_rows: Mapping[CellId, dict[str, float]]) -> pd.DataFrame:
    rows = []
    for lv in scenario.levels:
        cells = scenario.cells_at(lv.name)
        lt = trib[lv.name]
        rows.append({
            "level": lv.name, "elevation_m": lv.floor_elevation_m,
            "floor_area_m2": lt.floor_area_m2, "cantilever_m2": lt.cantilever_area_m2,
            "columns": len(cells),
            "Gk_floor_kN": sum(floor_rows[c.id]["G_floor"] for c in cells),
            "Qk_floor_kN": sum(floor_rows[c.id]["Q_floor"] for c in cells),
            "column_self_weight_kN": sum(floor_rows[c.id]["self"] for c in cells),
        })
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


# --------------------------------------------------------------------------- actions CSV


def write_actions_csv(actions: pd.DataFrame, path: str | Path) -> Path:
    """Write an actions table in the CSV format (kN, kNm, mm; compression positive).

    Columns: ``stack, level, NEd_kN, My_top_kNm, My_bot_kNm, Mz_top_kNm,
    Mz_bot_kNm`` then, when present, ``l0y_mm, l0z_mm, exposure, fire, M0Eqp_ratio, char_ratio`` and
    ``k1y, k2y, k1z, k2z``.
    """
    missing = [c for c in ACTION_COLUMNS if c not in actions.columns]
    if missing:
        msg = f"actions table lacks columns {missing}"
        raise ValueError(msg)
    cols = list(ACTION_COLUMNS) + [c for c in (*OPTIONAL_COLUMNS, *K_COLUMNS)
                                   if c in actions.columns]
    out = Path(path)
    out.parent.mkdir(parents=True, exist_ok=True)
    actions[cols].to_csv(out, index=False, float_format="%.3f", lineterminator="\n")
    return out


def _csv_float(file: str, row: int, col: str, text: str, minimum: float | None = None) -> float:
    where = f"row {row}, column {col}"
    try:
        x = float(text)
    except ValueError:
        raise InputError(file, where, text, "a number") from None
    if not math.isfinite(x):
        raise InputError(file, where, text, "a finite number")
    if minimum is not None and x < minimum:
        raise InputError(file, where, text, f"a number >= {minimum:g}")
    return x


def read_actions_csv(path: str | Path, scenario: Scenario) -> pd.DataFrame:
    """Read per-cell actions from an analysis and check them against the scenario.

    Required columns :data:`ACTION_COLUMNS`; optional :data:`OPTIONAL_COLUMNS`
    and :data:`K_COLUMNS`. Moments are about the section's local axes as
    oriented (kNm), NEd compression positive (kN), lengths in mm. Every cell of
    the scenario needs exactly one row. Blank optional values are filled from
    the scenario's ``[[settings]]`` where they give one. Rows are numbered as
    lines of the file (the header is row 1).
    """
    p = Path(path)
    file = str(p)
    try:
        with p.open(newline="", encoding="utf-8-sig") as fh:
            rows = list(csv.reader(fh))
    except FileNotFoundError:
        raise InputError(file, "(file)", file, "an existing actions CSV file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(file, "(file)", file, f"a readable UTF-8 CSV file ({exc})") from None
    if not rows:
        raise InputError(file, "row 1", "", f"a header row: {', '.join(ACTION_COLUMNS)}")
    header = [h.strip() for h in rows[0]]
    known = (*ACTION_COLUMNS, *OPTIONAL_COLUMNS, *K_COLUMNS)
    missing = [c for c in ACTION_COLUMNS if c not in header]
    if missing:
        raise InputError(file, "row 1 (header)", ", ".join(missing),
                         f"these required columns (header must contain {', '.join(ACTION_COLUMNS)})")
    for h in header:
        if h not in known:
            raise InputError(file, "row 1 (header)", h,
                             f"a known column{did_you_mean(h, known)} (known: {', '.join(known)})")
    if len(set(header)) != len(header):
        raise InputError(file, "row 1 (header)", header, "each column once")
    if any(k in header for k in K_COLUMNS) and not all(k in header for k in K_COLUMNS):
        raise InputError(file, "row 1 (header)", [k for k in K_COLUMNS if k in header],
                         "all four of k1y, k2y, k1z, k2z or none")
    records: dict[CellId, dict[str, Any]] = {}
    for n, raw in enumerate(rows[1:], start=2):
        if not any(v.strip() for v in raw):
            continue
        if len(raw) != len(header):
            raise InputError(file, f"row {n}", ",".join(raw),
                             f"{len(header)} values like the header (found {len(raw)})")
        rec = dict(zip(header, (v.strip() for v in raw), strict=True))
        records_key = _csv_cell(file, n, rec, scenario)
        if records_key in records:
            raise InputError(file, f"row {n}", f"{rec['stack']},{rec['level']}",
                             "one row per cell (this cell appears twice)")
        records[records_key] = _csv_record(file, n, rec)
    for c in scenario.cells:
        if c.id not in records:
            raise InputError(file, "rows", f"{c.stack},{c.level}",
                             "a row for every cell of the scenario (this one is missing)")
    return _actions_frame(scenario, records, header)


def _csv_cell(file: str, n: int, rec: Mapping[str, str], scenario: Scenario) -> CellId:
    stack, level = rec["stack"], rec["level"]
    ids = [s.id for s in scenario.stacks]
    names = [lv.name for lv in scenario.levels]
    if stack not in ids:
        raise InputError(file, f"row {n}, column stack", stack,
                         f"a stack of the scenario{did_you_mean(stack, ids)}")
    if level not in names:
        raise InputError(file, f"row {n}, column level", level,
                         f"a level of the scenario{did_you_mean(level, names)}")
    cid = CellId(stack, level)
    if not scenario.has_cell(cid):
        st = scenario.stack(stack)
        raise InputError(file, f"row {n}, column level", level,
                         f"a level stack {stack!r} runs through ({st.from_level}..{st.to_level})")
    return cid


def _csv_record(file: str, n: int, rec: Mapping[str, str]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for col in ACTION_COLUMNS[2:]:
        if rec[col] == "":
            raise InputError(file, f"row {n}, column {col}", "", "a number (required)")
        minimum = 0.0 if col == "NEd_kN" else None
        out[col] = _csv_float(file, n, col, rec[col], minimum)
    for col in ("l0y_mm", "l0z_mm"):
        if rec.get(col, ""):
            x = _csv_float(file, n, col, rec[col])
            if x <= 0:
                raise InputError(file, f"row {n}, column {col}", rec[col], "a positive length in mm")
            out[col] = x
    for col in K_COLUMNS:
        if rec.get(col, ""):
            out[col] = _csv_float(file, n, col, rec[col], 0.0)
    if rec.get("exposure", ""):
        out["exposure"] = _exposure(file, f"row {n}, column exposure", rec["exposure"])
    if rec.get("fire", ""):
        out["fire"] = _fire(file, f"row {n}, column fire", rec["fire"])
    for col, what in (("M0Eqp_ratio", "M0Eqp/M0Ed between 0 and 1.5 (quasi-permanent over design first-order moment)"),
                      ("char_ratio", "a ratio between 0 and 1.5 (characteristic over design actions)")):
        if rec.get(col, ""):
            x = _csv_float(file, n, col, rec[col], 0.0)
            if x > 1.5:
                raise InputError(file, f"row {n}, column {col}", rec[col], what)
            out[col] = x
    return out


def _actions_frame(scenario: Scenario, records: Mapping[CellId, dict[str, Any]],
                   header: list[str]) -> pd.DataFrame:
    any_k = any(k in header for k in K_COLUMNS) or any(
        c.settings.effective_length is not None and not c.settings.effective_length.uses_factors
        for c in scenario.cells)
    rows = []
    for c in scenario.cells:
        rec = records[c.id]
        el = c.settings.effective_length
        row = {"stack": c.stack, "level": c.level}
        row.update({k: rec[k] for k in ACTION_COLUMNS[2:]})
        row["l0y_mm"] = rec.get("l0y_mm", c.l0y_mm)
        row["l0z_mm"] = rec.get("l0z_mm", c.l0z_mm)
        row["exposure"] = rec.get("exposure", c.settings.exposure)
        row["fire"] = rec.get("fire", c.settings.fire)
        row["M0Eqp_ratio"] = rec.get("M0Eqp_ratio", math.nan)  # blank: not known (phi_ef with 1.0, said)
        row["char_ratio"] = rec.get("char_ratio", math.nan)  # blank: design actions for 7.2(2), said
        if any_k:
            for k in K_COLUMNS:
                default = getattr(el, k) if el is not None else None
                row[k] = rec.get(k, default)
        rows.append(row)
    df = pd.DataFrame(rows)
    for col in ("l0y_mm", "l0z_mm", "M0Eqp_ratio", "char_ratio", *(K_COLUMNS if any_k else ())):
        df[col] = df[col].astype(float)
    return df


def scenario_actions(scenario: Scenario,
                     trial_sizes_mm: Mapping[CellId | tuple[str, str], tuple[float, float]]
                     | None = None) -> pd.DataFrame:
    """The actions table of a scenario by whichever route it uses (CSV or takedown)."""
    if scenario.actions_file is not None:
        return read_actions_csv(scenario.actions_file, scenario)
    return takedown(scenario, trial_sizes_mm).actions
