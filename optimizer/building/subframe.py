"""End moments of the columns from a simplified sub-frame at every floor, in both plan directions.

At each floor and along each plan direction, the spans to the neighbouring
columns on the same grid line give fixed-end moments under pattern loading
(EN 1992-1-1, 5.1.3(1)P); the out-of-balance moment is shared between the
column below and the column above by stiffness (:func:`joint_moments`).
"""

from __future__ import annotations

from collections.abc import Mapping

from shapely.geometry import LineString
from shapely.geometry.base import BaseGeometry

from optimizer.building.loads import PSI_FACTORS, combination_factors
from optimizer.building.model import CellId, Orientation, Scenario
from optimizer.building.tributary import LevelTributary

__all__ = [
    "fixed_end_moment",
    "out_of_balance_moment",
    "distribute_to_columns",
    "joint_moments",
    "QP",
    "CHAR",
    "GRID_LINE_TOLERANCE_M",
    "SPAN_INSIDE_FRACTION",
]

# Two columns lie on one grid line when their offset across the line is at most this.
GRID_LINE_TOLERANCE_M = 0.30
# A slab span exists between two columns when this fraction of the line joining them is slab.
SPAN_INSIDE_FRACTION = 0.9

QP = "quasi-permanent"  # key of the quasi-permanent sub-frame moments beside the design expressions
CHAR = "characteristic"  # key of the characteristic sub-frame moments


def fixed_end_moment(w_kN_m: float, span_m: float) -> float:
    """Fixed-end moment of a uniformly loaded span, kNm.

    Fixed-end moment of a built-in beam under uniform load: M = w L^2 / 12
    (standard beam tables).
    """
    return w_kN_m * span_m**2 / 12.0


def out_of_balance_moment(
    w_full_kN_m: float, w_dead_kN_m: float, span1_m: float | None, span2_m: float | None
) -> float:
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


def distribute_to_columns(
    m_unbalanced_kNm: float, k_below: float, k_above: float, k_slabs: float
) -> tuple[float, float]:
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


def _section_I_m4(b_mm: float, h_mm: float, orientation: Orientation, direction: str) -> tuple[float, str]:
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


def _spans(
    me: tuple[float, float], others: list[tuple[float, float]], direction: str, floor: BaseGeometry
) -> tuple[float | None, float | None]:
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


def joint_moments(  # noqa: PLR0915 - the sub-frame at every floor and direction, in the order of docs/scenario.md
    scenario: Scenario, tributary: Mapping[str, LevelTributary], sizes: Mapping[CellId, tuple[float, float]]
) -> tuple[dict[tuple[CellId, str, str], float], dict[tuple[CellId, str, str], float], list[str]]:
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
                for sid, p in pos.items()
                for d in ("X", "Y")
            }
        spans = span_cache[key]
        slab_m = lv.slab_depth_mm / 1000.0
        g = slab_m * density + lf.floor.sdl_kPa
        q = lf.floor.imposed_kPa
        for c in cells:
            st = scenario.stack(c.stack)
            trib = tributary[lv.name].cells[c.stack]
            above = CellId(c.stack, scenario.levels[lv.index + 1].name) if lv.index + 1 < len(scenario.levels) else None
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
                    m_below, m_above = distribute_to_columns(
                        out_of_balance_moment(w, g * width, s1, s2), k_below, k_above, k_slabs
                    )
                    top[(c.id, name, axis)] = m_below
                    if above is not None:
                        bot[(above, name, axis)] = m_above
    warnings = []
    if no_span:
        shown = ", ".join(no_span[:8]) + (" ..." if len(no_span) > 8 else "")
        warnings.append(
            f"{len(no_span)} cell/direction(s) have no slab span to a neighbouring column on "
            f"their grid line and get no sub-frame moment there: {shown}"
        )
    return top, bot, warnings
