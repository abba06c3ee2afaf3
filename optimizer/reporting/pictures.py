"""Pictures of a run: the elevation of all stacks, N-M curves per type, the Pareto sweep, the plans.

All drawn with matplotlib on the Agg backend; every figure is closed after
saving. Type colours run from pale (light types, low marks) to dark (heavy
types, high marks), so the elevation reads as a weight map of the building.
Units at this edge: kN, kNm, m.
"""

from __future__ import annotations

import io
import time
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
from matplotlib.colors import LinearSegmentedColormap, to_rgb
from matplotlib.patches import Rectangle

from design.resistance import SectionBatch
from optimizer import CAUTION
from optimizer.pipeline.run import RunResult

__all__ = [
    "type_colours",
    "text_colour",
    "elevation_figure",
    "type_curves_figure",
    "pareto_figure",
    "figure_bytes",
    "write_pictures",
]

# Own ramp: pale sand -> sage -> slate teal -> deep ink blue.
_RAMP = LinearSegmentedColormap.from_list("colstack_weight", ["#f3ead3", "#b9cfa4", "#5f9c92", "#2f5d7c", "#1b2a4a"])
_INK = "#1d2433"
_DEMAND_Y = "#c2410c"  # burnt orange: demand points about y
_DEMAND_Z = "#6d28d9"  # violet: demand points about z


def type_colours(r: RunResult) -> dict[str, str]:
    """Hex colour per type mark, pale for the lightest type, dark for the heaviest."""
    marks = [u.mark for u in r.types_used]
    n = len(marks)
    out = {}
    for k, m in enumerate(marks):
        x = 0.08 + 0.84 * (k / (n - 1) if n > 1 else 0.5)
        rgb = _RAMP(x)[:3]
        out[m] = "#{:02x}{:02x}{:02x}".format(*(int(round(255 * c)) for c in rgb))
    return out


def text_colour(fill: str) -> str:
    """Black or white, whichever reads better on ``fill``."""
    r, g, b = to_rgb(fill)
    lum = 0.2126 * r + 0.7152 * g + 0.0722 * b
    return "#111111" if lum > 0.5 else "#ffffff"


def _type_label(r: RunResult, type_index: int) -> str:
    ct = r.catalogue.types[type_index]
    return f"{ct.section_key} {ct.design.section.bars.notation} {ct.design.concrete.name}"


def elevation_figure(r: RunResult) -> plt.Figure:  # noqa: PLR0915 - one drawing, element by element
    """All stacks side by side (scenario order), levels bottom to top; cell = mark and utilisation."""
    sc = r.scenario
    stacks = [s.id for s in sc.stacks]
    levels = [lv.name for lv in sc.levels]  # bottom to top
    n_s, n_l = len(stacks), len(levels)
    col = {s: k for k, s in enumerate(stacks)}
    row = {lv: k for k, lv in enumerate(levels)}
    colours = type_colours(r)
    util = r.checks.utilisation
    ok = r.checks.ok
    unverified = r.checks.unverified

    cell_w, cell_h = 0.62, 0.36  # inches per cell
    legend_w = 2.6
    rotate = n_s > 24
    fs = 6.5 if n_s > 20 else 8.0
    top_in = 0.55
    bottom_in = 0.62 + (0.075 * max(len(s) for s in stacks) if rotate else 0.0)
    fig_w = max(7.0, n_s * cell_w + 1.2 + legend_w)
    fig_h = max(3.0, n_l * cell_h + top_in + bottom_in)
    fig = plt.figure(figsize=(fig_w, fig_h))
    left = 1.0 / fig_w
    right = 1.0 - (legend_w + 0.2) / fig_w
    box = (left, bottom_in / fig_h, right - left, 1.0 - (top_in + bottom_in) / fig_h)
    ax = fig.add_axes(box)
    for i, (stack, level) in enumerate(r.feasibility.cells.cells):
        x, y = col[stack], row[level]
        mark = r.mark_of(i)
        fill = colours[mark]
        ax.add_patch(
            Rectangle(
                (x + 0.04, y + 0.05),
                0.92,
                0.90,
                facecolor=fill,
                edgecolor="#b91c1c" if not ok[i] else "white",
                linewidth=2.0 if not ok[i] else 0.6,
            )
        )
        tc = text_colour(fill)
        ax.text(x + 0.5, y + 0.64, mark, ha="center", va="center", fontsize=fs, color=tc, fontweight="bold")
        ax.text(x + 0.5, y + 0.30, f"{util[i]:.3f}", ha="center", va="center", fontsize=fs - 1, color=tc)
        if r.chosen_orient[i]:  # turned stack: small triangle in the top-right corner
            ax.add_patch(
                plt.Polygon(
                    [(x + 0.96, y + 0.95), (x + 0.74, y + 0.95), (x + 0.96, y + 0.68)],
                    closed=True,
                    facecolor=tc,
                    edgecolor="none",
                    alpha=0.8,
                )
            )
        if unverified[i]:  # fire not verified by method A: small open circle, bottom-left
            ax.plot(
                x + 0.15,
                y + 0.2,
                marker="o",
                markersize=3.2,
                markerfacecolor="none",
                markeredgecolor=tc,
                markeredgewidth=0.8,
            )
    ax.set_xlim(0, n_s)
    ax.set_ylim(0, n_l)
    ax.set_xticks(np.arange(n_s) + 0.5)
    ax.set_xticklabels(stacks, fontsize=fs, rotation=90 if rotate else 0)
    ax.set_yticks(np.arange(n_l) + 0.5)
    ax.set_yticklabels(levels, fontsize=fs)
    ax.tick_params(length=0)
    for side in ("top", "right", "left", "bottom"):
        ax.spines[side].set_visible(False)
    ax.set_xlabel("column stack", fontsize=fs + 1)
    ax.set_ylabel("level (storey below the named slab)", fontsize=fs + 1)
    status = r.schedule.status
    fig.suptitle(
        f"{sc.project.name}: column types by cell (mark, utilisation); solver {status}",
        fontsize=11,
        x=left,
        ha="left",
        y=1.0 - 0.12 / fig_h,
        va="top",
        color=_INK,
    )
    fig.text(left, 0.08 / fig_h, CAUTION, fontsize=7.5, color="#92400e", ha="left", va="bottom")

    # legend: one swatch per type with its section, bars and grade, plus the markers
    lax = fig.add_axes((right + 0.1 / fig_w, box[1], (legend_w - 0.1) / fig_w, box[3]))
    lax.set_axis_off()
    entries = [(u.mark, _type_label(r, u.type_index), len(u.cells)) for u in r.types_used]
    n_e = len(entries) + 3
    step = min(1.0 / n_e, 0.2 / (box[3] * fig_h))  # about 0.2 inch per entry
    lfs = 7 if len(entries) <= 40 else 5.5
    lax.text(0, 1.0, "types (cells)", fontsize=lfs + 1, fontweight="bold", va="top", color=_INK)
    for k, (mark, label, count) in enumerate(entries):
        yy = 1.0 - (k + 1.2) * step
        lax.add_patch(
            Rectangle(
                (0, yy - 0.35 * step),
                0.12,
                0.7 * step,
                facecolor=colours[mark],
                edgecolor="#888888",
                linewidth=0.4,
                transform=lax.transAxes,
            )
        )
        lax.text(0.16, yy, f"{mark}  {label}  ({count})", fontsize=lfs, va="center", color=_INK)
    yy = 1.0 - (len(entries) + 1.6) * step
    lax.text(0, yy, "\u25e5 stack turned 90 deg", fontsize=lfs, va="center", color=_INK)
    lax.text(0, yy - step, "\u25cb fire not verified by method A", fontsize=lfs, va="center", color=_INK)
    return fig


def type_curves_figure(r: RunResult, mark: str) -> plt.Figure:
    """N-M interaction curves about y and z of one type with the demand points of all its cells."""
    use = next(u for u in r.types_used if u.mark == mark)
    ct = r.catalogue.types[use.type_index]
    batch = SectionBatch([ct.design])
    cells = np.array(use.cells)
    v = r.checks.values
    NEd = np.asarray(v["NEd"], dtype=float)[cells] / 1e3
    fig, axes = plt.subplots(1, 2, figsize=(9.5, 4.6), sharey=True)
    for ax, axis, key, colour in ((axes[0], "y", "MEdy", _DEMAND_Y), (axes[1], "z", "MEdz", _DEMAND_Z)):
        N, M = batch.interaction_curve(axis, 121, positive=True)
        N, M = N[0] / 1e3, M[0] / 1e6
        ax.fill_betweenx(N, 0, M, color="#dfe8e4", zorder=0)
        ax.plot(M, N, color=_INK, linewidth=1.4, zorder=2, label=f"MRd{axis}(N) (strain compatibility)")
        MEd = np.abs(np.asarray(v[key], dtype=float)[cells]) / 1e6
        ax.scatter(
            MEd,
            NEd,
            s=28,
            color=colour,
            edgecolor="white",
            linewidth=0.5,
            zorder=3,
            label=f"(NEd, MEd{axis}) of {len(cells)} cell(s)",
        )
        ax.axhline(0, color="#999999", linewidth=0.6)
        ax.set_xlim(left=0)
        ax.set_xlabel(f"MEd{axis}, MRd{axis} (kNm)")
        lever = "h" if axis == "y" else "b"
        ax.set_title(f"bending about {axis} (lever arm along {lever})", fontsize=10)
        ax.grid(True, color="#e5e5e5", linewidth=0.5)
        ax.legend(fontsize=7.5, loc="lower right", frameon=False)
    axes[0].set_ylabel("N (kN, compression positive)")
    fig.suptitle(f"Type {mark}: {_type_label(r, use.type_index)}  ({len(cells)} cells)", fontsize=11, color=_INK)
    fig.text(
        0.01,
        0.01,
        "Uniaxial curves; the biaxial interaction (EN 1992-1-1 Eq. (5.39)) is checked separately.\n" + CAUTION,
        fontsize=6.5,
        color="#92400e",
        ha="left",
        va="bottom",
    )
    fig.subplots_adjust(left=0.08, right=0.98, top=0.86, bottom=0.2, wspace=0.06)
    return fig


def pareto_figure(r: RunResult, pareto: pd.DataFrame) -> plt.Figure:
    """Steel (and cost when present) against the number of types of the Pareto sweep."""
    df = pareto.copy()
    df = df[np.isfinite(pd.to_numeric(df["steel_t"], errors="coerce"))].sort_values("types")
    fig, ax = plt.subplots(figsize=(7.5, 4.2))
    ax.plot(df["types"], df["steel_t"], marker="o", color="#2f5d7c", linewidth=1.6, label="steel (t)")
    ax.set_xlabel("number of types")
    ax.set_ylabel("steel (t)", color="#2f5d7c")
    ax.grid(True, color="#e5e5e5", linewidth=0.5)
    chosen = len(r.types_used)
    ax.axvline(chosen, color="#b45309", linestyle="--", linewidth=1.0, label=f"this schedule: {chosen} types")
    if len(df):
        ax.set_xticks(sorted(set(int(t) for t in df["types"])))
    handles, labels = ax.get_legend_handles_labels()
    if "cost" in df.columns:
        cost = pd.to_numeric(df["cost"], errors="coerce")
        if np.isfinite(cost).any() and (cost.fillna(0) != 0).any():
            ax2 = ax.twinx()
            cur = r.settings.costs.currency
            ax2.plot(
                df["types"], cost, marker="s", color="#7c8a3a", linewidth=1.2, linestyle=":", label=f"cost ({cur})"
            )
            ax2.set_ylabel(f"cost ({cur})", color="#7c8a3a")
            h2, l2 = ax2.get_legend_handles_labels()
            handles, labels = handles + h2, labels + l2
    ax.legend(handles, labels, fontsize=8, frameon=False)
    ax.set_title(f"{r.scenario.project.name}: quantity against the number of types", fontsize=10)
    fig.text(0.01, 0.01, CAUTION, fontsize=6.5, color="#92400e", ha="left", va="bottom")
    fig.subplots_adjust(left=0.1, right=0.88, top=0.9, bottom=0.18)
    return fig


def _png(fig: plt.Figure, dpi: int) -> bytes:
    """PNG bytes with an adaptive palette of 256 colours (flat colours and lines: a third of the size)."""
    from PIL import Image

    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi)
    buf.seek(0)
    with Image.open(buf) as im:
        small = im.convert("RGB").quantize(colors=256, method=Image.Quantize.FASTOCTREE, dither=Image.Dither.NONE)
        out = io.BytesIO()
        small.save(out, format="png", optimize=True)
    return out.getvalue()


def figure_bytes(fig: plt.Figure, fmt: str = "png", dpi: int = 110) -> bytes:
    """Render ``fig`` to bytes (PNG with a reduced palette, or any matplotlib format) and close it."""
    try:
        if fmt == "png":
            return _png(fig, dpi)
        buf = io.BytesIO()
        fig.savefig(buf, format=fmt, dpi=dpi)
        return buf.getvalue()
    finally:
        plt.close(fig)


def _save(fig: plt.Figure, paths: list[Path], dpi: int = 110) -> None:
    try:
        for p in paths:
            p.parent.mkdir(parents=True, exist_ok=True)
            if p.suffix == ".png":
                p.write_bytes(_png(fig, dpi))
            else:
                fig.savefig(p, dpi=dpi)
    finally:
        plt.close(fig)


def write_pictures(r: RunResult, tables: dict, folder: Path) -> dict[str, float]:
    """Write elevation.png/.svg, types/<mark>.png, pareto.png/.svg (if a sweep) and plans/*.png.

    Returns:
        Render time per group of pictures, s.
    """
    folder = Path(folder)
    times: dict[str, float] = {}
    t = time.perf_counter()
    with plt.rc_context({"svg.fonttype": "none"}):  # SVG text stays text (small, searchable)
        _save(elevation_figure(r), [folder / "elevation.png", folder / "elevation.svg"])
    times["elevation"] = time.perf_counter() - t
    t = time.perf_counter()
    for u in r.types_used:
        _save(type_curves_figure(r, u.mark), [folder / "types" / f"{u.mark}.png"])
    times["types"] = time.perf_counter() - t
    pareto = tables.get("pareto")
    if isinstance(pareto, pd.DataFrame) and len(pareto):
        t = time.perf_counter()
        with plt.rc_context({"svg.fonttype": "none"}):
            _save(pareto_figure(r, pareto), [folder / "pareto.png", folder / "pareto.svg"])
        times["pareto"] = time.perf_counter() - t
    if r.takedown is not None:
        from optimizer.reporting.plans import write_plans

        t = time.perf_counter()
        write_plans(r.scenario, r.takedown.tributary, folder / "plans")
        times["plans"] = time.perf_counter() - t
    return times
