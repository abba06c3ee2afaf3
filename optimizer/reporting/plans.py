"""Plan pictures of the tributary areas, one per distinct floor (matplotlib, Agg backend).

A *distinct floor* is a floor plate with one set of columns: consecutive or
not, levels that share both are drawn once, titled with their level names.
Each picture shows the outline, the holes, the columns with their ids, the
tributary cells shaded and each cell's area in m2.
"""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt
from matplotlib.patches import PathPatch
from matplotlib.path import Path as MplPath
from shapely.geometry import Polygon
from shapely.geometry.base import BaseGeometry

from optimizer.building import LevelTributary, Scenario

__all__ = ["distinct_floors", "plot_plan", "write_plans"]


def distinct_floors(scenario: Scenario, tributary: Mapping[str, LevelTributary]) -> list[tuple[str, ...]]:
    """Group the levels that share a floor plate and a set of columns (bottom to top)."""
    groups: dict[tuple[int, tuple[str, ...]], list[str]] = {}
    for lv in scenario.levels:
        lt = tributary[lv.name]
        groups.setdefault((lt.floor_index, tuple(sorted(lt.cells))), []).append(lv.name)
    return [tuple(v) for v in groups.values()]


def _polygons(geom: BaseGeometry) -> list[Polygon]:
    if geom.is_empty:
        return []
    if isinstance(geom, Polygon):
        return [geom]
    return [g for part in getattr(geom, "geoms", []) for g in _polygons(part)]


def _patch(poly: Polygon, **kwargs: object) -> PathPatch:
    rings = [poly.exterior, *poly.interiors]
    path = MplPath.make_compound_path(*[MplPath(list(r.coords), closed=True) for r in rings])
    return PathPatch(path, **kwargs)


def _title(levels: tuple[str, ...]) -> str:
    if len(levels) == 1:
        return f"Level {levels[0]}"
    return f"Levels {levels[0]} to {levels[-1]} ({len(levels)} levels)"


def plot_plan(
    scenario: Scenario, tributary: Mapping[str, LevelTributary], levels: tuple[str, ...], path: str | Path
) -> Path:
    """Draw one distinct floor to ``path`` (PNG); axes in m, areas in m2."""
    lt = tributary[levels[0]]
    floor = scenario.floors[lt.floor_index]
    fig, ax = plt.subplots(figsize=(10, 8))
    outline = Polygon(floor.outline_m)
    ax.add_patch(_patch(outline, facecolor="none", edgecolor="black", linewidth=1.5))
    for hole in floor.holes_m:
        ax.add_patch(_patch(Polygon(hole), facecolor="0.85", edgecolor="black", hatch="//", linewidth=1.0))
    cmap = plt.get_cmap("tab20")
    for i, (sid, cell) in enumerate(sorted(lt.cells.items())):
        for poly in _polygons(cell.polygon):
            ax.add_patch(_patch(poly, facecolor=cmap(i % 20), alpha=0.45, edgecolor="0.3", linewidth=0.5))
        ax.plot(cell.x_m, cell.y_m, "s", color="black", markersize=5)
        ax.annotate(
            f"{sid}\n{cell.area_m2:.1f} m2", (cell.x_m, cell.y_m), textcoords="offset points", xytext=(4, 4), fontsize=7
        )
    minx, miny, maxx, maxy = outline.bounds
    pad = 0.05 * max(maxx - minx, maxy - miny, 1.0)
    ax.set_xlim(minx - pad, maxx + pad)
    ax.set_ylim(miny - pad, maxy + pad)
    ax.set_aspect("equal")
    ax.set_xlabel("plan X (m)")
    ax.set_ylabel("plan Y (m)")
    total = sum(c.area_m2 for c in lt.cells.values())
    ax.set_title(
        f"{scenario.project.name}: {_title(levels)}\ntributary areas, total {total:.1f} m2 on {len(lt.cells)} columns"
    )
    out = Path(path)
    out.parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(out, dpi=110, bbox_inches="tight")
    plt.close(fig)
    return out


def write_plans(scenario: Scenario, tributary: Mapping[str, LevelTributary], out_dir: str | Path) -> list[Path]:
    """Write one PNG per distinct floor into ``out_dir``; returns the paths."""
    paths = []
    for levels in distinct_floors(scenario, tributary):
        name = levels[0] if len(levels) == 1 else f"{levels[0]}-{levels[-1]}"
        paths.append(plot_plan(scenario, tributary, levels, Path(out_dir) / f"plan_{name}.png"))
    return paths
