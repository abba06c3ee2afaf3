"""Tributary areas of regular grids against bay areas worked out by hand."""

import pytest
from shapely.geometry import Polygon, box

from optimizer.building.tributary import tributary_areas


def _grid(nx, ny, bx, by):
    return {f"C{i}{j}": (i * bx, j * by) for i in range(nx) for j in range(ny)}


def test_regular_grid_interior_edge_corner():
    # 4 x 3 columns at 8.0 m x 7.5 m, slab edge on the outer column lines.
    # By hand: interior 8.0 x 7.5 = 60.0 m2; edge along X 8.0 x 3.75 = 30.0 m2;
    # edge along Y 4.0 x 7.5 = 30.0 m2; corner 4.0 x 3.75 = 15.0 m2.
    cols = _grid(4, 3, 8.0, 7.5)
    outline = box(0, 0, 24.0, 15.0)
    cells = tributary_areas(outline, outline, cols)
    assert cells["C11"].area_m2 == pytest.approx(60.0)  # interior
    assert cells["C10"].area_m2 == pytest.approx(30.0)  # edge on y = 0
    assert cells["C01"].area_m2 == pytest.approx(30.0)  # edge on x = 0
    assert cells["C00"].area_m2 == pytest.approx(15.0)  # corner
    assert cells["C32"].area_m2 == pytest.approx(15.0)  # opposite corner
    # Sum = floor area 24 x 15 = 360 m2; nothing beyond the column lines.
    assert sum(c.area_m2 for c in cells.values()) == pytest.approx(360.0)
    assert sum(c.cantilever_area_m2 for c in cells.values()) == pytest.approx(0.0, abs=1e-9)
    # Façade length in the corner cell: 4.0 + 3.75 = 7.75 m; interior: none.
    assert cells["C00"].facade_m == pytest.approx(7.75)
    assert cells["C11"].facade_m == pytest.approx(0.0)
    # Frame widths: area / extent = 60/8 = 7.5 m along X; 60/7.5 = 8 m along Y.
    assert cells["C11"].area_m2 / cells["C11"].x_extent_m == pytest.approx(7.5)


def test_overhang_goes_to_nearest_column_and_is_reported():
    # Same grid, slab 1.0 m beyond the column lines on every side.
    # Corner by hand: (4.0 + 1.0) x (3.75 + 1.0) = 23.75 m2, of which 23.75 - 15 = 8.75 m2
    # lies beyond the column lines. Edge on y = 0: 8.0 x 4.75 = 38.0 m2 (8.0 beyond).
    cols = _grid(4, 3, 8.0, 7.5)
    outline = box(-1.0, -1.0, 25.0, 16.0)
    cells = tributary_areas(outline, outline, cols)
    assert cells["C00"].area_m2 == pytest.approx(23.75)
    assert cells["C00"].cantilever_area_m2 == pytest.approx(8.75)
    assert cells["C10"].area_m2 == pytest.approx(38.0)
    assert cells["C10"].cantilever_area_m2 == pytest.approx(8.0)
    assert cells["C11"].cantilever_area_m2 == pytest.approx(0.0, abs=1e-9)
    # Sum = 26 x 17 = 442 m2; overhang = 442 - 360 = 82 m2.
    assert sum(c.area_m2 for c in cells.values()) == pytest.approx(442.0)
    assert sum(c.cantilever_area_m2 for c in cells.values()) == pytest.approx(82.0)
    # Façade: the whole perimeter 2 x (26 + 17) = 86 m is shared out.
    assert sum(c.facade_m for c in cells.values()) == pytest.approx(86.0)


def test_sum_equals_floor_minus_holes():
    # 4 x 3 grid, outline 24 x 15 m, a 4 x 3 m void: 360 - 12 = 348 m2 carried.
    cols = _grid(4, 3, 8.0, 7.5)
    outline = box(0, 0, 24.0, 15.0)
    floor = outline.difference(box(10.0, 6.0, 14.0, 9.0))
    cells = tributary_areas(floor, outline, cols)
    assert sum(c.area_m2 for c in cells.values()) == pytest.approx(348.0)
    # The void lies inside the Voronoi cells of C11 (8, 7.5) and C21 (16, 7.5),
    # split by their bisector x = 12: each loses 2 x 3 = 6 m2 -> 54 m2.
    assert cells["C11"].area_m2 == pytest.approx(54.0)
    assert cells["C21"].area_m2 == pytest.approx(54.0)


def test_irregular_outline_single_column():
    # One column carries everything: an L-shaped 6 x 6 minus 3 x 3 = 27 m2.
    outline = Polygon([(0, 0), (6, 0), (6, 3), (3, 3), (3, 6), (0, 6)])
    cells = tributary_areas(outline, outline, {"K": (1.0, 1.0)})
    assert cells["K"].area_m2 == pytest.approx(27.0)
    assert cells["K"].facade_m == pytest.approx(24.0)  # perimeter 6+3+3+3+3+6
