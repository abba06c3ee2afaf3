"""Section geometry and bar layouts (design/sections.py).

Sources: EN 1992-1-1 8.2(2) (clear spacing), 5.8.8.3(2) Eq. (5.35)
(effective depth with distributed bars); bar areas pi d^2/4 (closed form).
"""

import math

import numpy as np
import pytest

from design.detailing import min_clear_spacing
from design.sections import (
    CircBars,
    CircSection,
    RectBars,
    RectSection,
    bar_area,
    check_bar_spacing,
    parse_bar_notation,
)


def test_rect_layout_counts_and_area():
    bars = RectBars(25, nb=3, nh=4, corner_dia=32)
    # 2 nb + 2 nh - 4 bars, corners counted on both faces.
    assert bars.count == 10
    assert bars.area == pytest.approx(4 * math.pi * 32**2 / 4 + 6 * math.pi * 25**2 / 4)
    assert bars.notation == "4H32+6H25"
    assert RectBars(25, 3, 3).notation == "8H25"


def test_rect_bar_coordinates_are_symmetric_and_inside_links():
    sec = RectSection(400, 600, 35, 10, RectBars(25, 3, 4, corner_dia=32))
    y, z, d = sec.bar_coords()
    assert len(y) == 10
    # Corner bar centre = face - cover - link - corner/2 (closed form).
    assert max(y) == pytest.approx(400 / 2 - 35 - 10 - 25 / 2)  # intermediate bar on the h-face
    assert max(z) == pytest.approx(600 / 2 - 35 - 10 - 25 / 2)
    assert np.sum(y * d**2) == pytest.approx(0, abs=1e-9)
    assert np.sum(z * d**2) == pytest.approx(0, abs=1e-9)
    # every bar lies inside the link perimeter
    assert np.all(np.abs(y) + d / 2 <= 400 / 2 - 45 + 1e-9)
    assert np.all(np.abs(z) + d / 2 <= 600 / 2 - 45 + 1e-9)


def test_effective_depth_two_faces_equals_bar_depth():
    """Eq. (5.35): with bars on two opposite faces only, d = h/2 + is = depth to those bars."""
    sec = RectSection(300, 500, 30, 8, RectBars(20, 3, 2))
    assert sec.effective_depth("y") == pytest.approx(500 - 30 - 8 - 10)


def test_effective_depth_circle():
    """Eq. (5.35) with is = rs / sqrt(2) for bars on a circle of radius rs."""
    sec = CircSection(500, 40, 10, CircBars(20, 8))
    rs = 250 - 40 - 10 - 10
    assert sec.effective_depth() == pytest.approx(250 + rs / math.sqrt(2))


def test_clear_spacing_rect_by_hand():
    sec = RectSection(400, 400, 30, 10, RectBars(20, 4, 4))
    pitch = (400 - 2 * 40 - 20) / 3
    assert np.allclose(sec.clear_spacings(), pitch - 20)


def test_circle_spacing_by_hand():
    sec = CircSection(600, 40, 10, CircBars(25, 12))
    rs = 300 - 40 - 10 - 12.5
    assert np.allclose(sec.clear_spacings(), 2 * rs * math.sin(math.pi / 12) - 25)


@pytest.mark.parametrize(("dia", "dg", "expected"), [(16, 20, 25), (32, 20, 32), (12, 10, 20), (40, 32, 40)])
def test_min_clear_spacing_8_2(dia, dg, expected):
    """EN 1992-1-1 8.2(2): max(k1 phi, dg + k2, 20 mm) with k1 = 1, k2 = 5 mm."""
    assert min_clear_spacing(dia, dg) == expected


def test_spacing_check_fails_for_crowded_face():
    sec = RectSection(300, 300, 30, 8, RectBars(32, 5, 5))
    res = check_bar_spacing(sec, dg=20)
    assert not res.ok and res.clause == "EN 1992-1-1, 8.2(2)"


@pytest.mark.parametrize(
    ("text", "parsed"), [("12H25", [(12, 25.0)]), ("4H32+8H25", [(4, 32.0), (8, 25.0)]), (" 6 B 16 ", [(6, 16.0)])]
)
def test_parse_notation(text, parsed):
    assert parse_bar_notation(text) == parsed


@pytest.mark.parametrize("text", ["H25", "12x", "4H32+", "0H25", ""])
def test_parse_notation_rejects(text):
    with pytest.raises(ValueError, match="bar notation"):
        parse_bar_notation(text)


@pytest.mark.parametrize(
    "make",
    [
        lambda: RectSection(0, 400, 30, 8, RectBars(20, 2, 2)),
        lambda: RectSection(200, 200, 80, 10, RectBars(40, 2, 2)),
        lambda: RectBars(20, 1, 3),
        lambda: RectBars(-20, 2, 3),
        lambda: CircBars(20, 2),
        lambda: CircSection(300, 0, 8, CircBars(20, 6)),
    ],
)
def test_bad_geometry_is_refused_with_value(make):
    with pytest.raises(ValueError, match=r"got|do not fit"):
        make()


def test_bar_area_vectorised():
    assert np.allclose(bar_area(np.array([10.0, 20.0])), [78.5398163, 314.1592654])
    assert bar_area(25) == pytest.approx(490.8738521)
