"""Tributary areas: the floor each column carries, from Voronoi cells clipped to the slab (shapely).

Floor area outside the convex hull of the columns (cantilevers beyond the last
column line) falls to the nearest column and is reported; the façade line load
is taken on the length of outline inside each column's cell.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass, field

import shapely
from shapely.geometry import LineString, MultiPoint, Point, Polygon, box
from shapely.geometry.base import BaseGeometry

from optimizer.building.model import Scenario

__all__ = ["TributaryCell", "LevelTributary", "tributary_areas", "level_tributaries"]


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


def tributary_areas(
    floor: Polygon, outline: Polygon, columns: Mapping[str, tuple[float, float]]
) -> dict[str, TributaryCell]:
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
            stack=sid,
            x_m=columns[sid][0],
            y_m=columns[sid][1],
            area_m2=clipped.area,
            cantilever_area_m2=cant,
            facade_m=region.intersection(ring).length,
            x_extent_m=bx[2] - bx[0],
            y_extent_m=bx[3] - bx[1],
            polygon=clipped,
        )
    return out


def level_tributaries(
    scenario: Scenario, progress: Callable[[str, int, int], None] | None = None
) -> dict[str, LevelTributary]:
    """The tributary cells of every level of a scenario on the takedown route.

    Levels with the same floor plate and the same columns share one computation.

    Args:
        scenario: a scenario with floor plates.
        progress: optional callback (stage, done, total).
    """
    cache: dict[tuple[int, tuple[str, ...]], dict[str, TributaryCell]] = {}
    result = {}
    for i, lv in enumerate(scenario.levels):
        lf = scenario.floor_at(lv.name)
        cols = {c.stack: (scenario.stack(c.stack).x_m, scenario.stack(c.stack).y_m) for c in scenario.cells_at(lv.name)}
        key = (lf.floor.index, tuple(cols))
        if key not in cache:
            cache[key] = tributary_areas(lf.floor.polygon, Polygon(lf.floor.outline_m), cols)
        result[lv.name] = LevelTributary(lv.name, lf.floor.index, cache[key], lf.floor.polygon.area)
        if progress:
            progress("tributary areas", i + 1, len(scenario.levels))
    return result
