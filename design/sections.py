"""Column cross-sections and their reinforcement.

Axes (EN 1992-1-1, Fig. 5.8): the section's centroid is the origin; for a
rectangle b x h, b is measured along the local y axis and h along z. Bar
coordinates are (y, z) in mm. Bending about y (MEdy, MRdy) has its lever arm
along h; bending about z (MEdz, MRdz) along b.

Rectangular sections carry a symmetric perimeter layout: ``nb`` bars on each
face of width b (the two faces at z = +-h/2) and ``nh`` bars on each face of
width h (at y = +-b/2), corners counted in both, so the total is
2 nb + 2 nh - 4. The corner bars may have their own diameter. Circular
sections carry ``n`` equally spaced bars.

Trade notation (``12H25``, ``4H32+8H25``) is printed and parsed for people;
the structured fields are the source of truth.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import overload

import numpy as np

from design.detailing import min_clear_spacing
from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckResult

__all__ = [
    "RectBars",
    "CircBars",
    "RectSection",
    "CircSection",
    "Section",
    "parse_bar_notation",
    "bar_area",
    "STANDARD_BAR_DIAMETERS",
    "check_bar_spacing",
]

# Bar diameters commonly stocked (mm); common practice.
STANDARD_BAR_DIAMETERS = (8, 10, 12, 16, 20, 25, 32, 40)


@overload
def bar_area(dia: float) -> float: ...
@overload
def bar_area(dia: np.ndarray) -> np.ndarray: ...
def bar_area(dia: float | np.ndarray) -> float | np.ndarray:
    """Nominal cross-sectional area of a bar of diameter ``dia`` (mm), mm2."""
    area = np.pi * np.asarray(dia, dtype=float) ** 2 / 4.0
    return float(area) if area.ndim == 0 else area


_NOTATION_TERM = re.compile(r"^\s*(\d+)\s*[A-Za-z]\s*(\d+(?:\.\d+)?)\s*$")


def parse_bar_notation(text: str) -> list[tuple[int, float]]:
    """Parse trade notation such as ``"4H32+8H25"`` into [(4, 32.0), (8, 25.0)].

    The letter (H, B, T, ...) names the steel grade in local practice and is
    not interpreted.
    """
    terms = str(text).split("+")
    out: list[tuple[int, float]] = []
    for term in terms:
        m = _NOTATION_TERM.match(term)
        if not m:
            msg = f"bar notation {text!r}: term {term.strip()!r} is not of the form 12H25"
            raise ValueError(msg)
        count, dia = int(m.group(1)), float(m.group(2))
        if count <= 0 or dia <= 0:
            msg = f"bar notation {text!r}: count and diameter must be positive"
            raise ValueError(msg)
        out.append((count, dia))
    return out


def _fmt_dia(d: float) -> str:
    return f"{d:g}"


@dataclass(frozen=True)
class RectBars:
    """Perimeter bars of a rectangular section.

    Attributes:
        dia: main bar diameter, mm.
        nb: bars on each face of width b (faces at z = +-h/2), corners included, >= 2.
        nh: bars on each face of width h (faces at y = +-b/2), corners included, >= 2.
        corner_dia: diameter of the four corner bars, mm (None: same as ``dia``).
    """

    dia: float
    nb: int
    nh: int
    corner_dia: float | None = None

    def __post_init__(self) -> None:
        if not self.dia > 0:
            msg = f"bar diameter must be positive, got dia={self.dia} mm"
            raise ValueError(msg)
        if self.corner_dia is not None and not self.corner_dia > 0:
            msg = f"corner bar diameter must be positive, got corner_dia={self.corner_dia} mm"
            raise ValueError(msg)
        for name in ("nb", "nh"):
            value = getattr(self, name)
            if int(value) != value or value < 2:
                msg = (
                    f"{name} counts the bars on one face including both corners "
                    f"and must be an integer >= 2, got {name}={value}"
                )
                raise ValueError(msg)
        if self.corner_dia is not None and self.corner_dia == self.dia:
            object.__setattr__(self, "corner_dia", None)

    @property
    def count(self) -> int:
        """Total number of bars, 2 nb + 2 nh - 4."""
        return 2 * self.nb + 2 * self.nh - 4

    @property
    def corner(self) -> float:
        """Corner bar diameter, mm."""
        return self.dia if self.corner_dia is None else self.corner_dia

    @property
    def max_dia(self) -> float:  # noqa: D102
        return max(self.dia, self.corner)

    @property
    def min_dia(self) -> float:  # noqa: D102
        return min(self.dia, self.corner) if self.count > 4 else self.corner

    @property
    def area(self) -> float:
        """Total steel area As, mm2."""
        return 4 * bar_area(self.corner) + (self.count - 4) * bar_area(self.dia)

    @property
    def notation(self) -> str:
        """Trade notation, e.g. ``12H25`` or ``4H32+8H25``."""
        if self.corner_dia is None or self.count == 4:
            return f"{self.count}H{_fmt_dia(self.corner)}"
        return f"4H{_fmt_dia(self.corner)}+{self.count - 4}H{_fmt_dia(self.dia)}"


@dataclass(frozen=True)
class CircBars:
    """Equally spaced bars of a circular section.

    Attributes:
        dia: bar diameter, mm.
        n: number of bars (>= 6 for a circular column, EN 1992-1-1 9.5.2(4);
            fewer are accepted here and flagged by the detailing check).
    """

    dia: float
    n: int

    def __post_init__(self) -> None:
        if not self.dia > 0:
            msg = f"bar diameter must be positive, got dia={self.dia} mm"
            raise ValueError(msg)
        if int(self.n) != self.n or self.n < 3:
            msg = f"a circular section needs an integer number of bars >= 3, got n={self.n}"
            raise ValueError(msg)

    @property
    def count(self) -> int:  # noqa: D102
        return int(self.n)

    @property
    def max_dia(self) -> float:  # noqa: D102
        return self.dia

    @property
    def min_dia(self) -> float:  # noqa: D102
        return self.dia

    @property
    def area(self) -> float:
        """Total steel area As, mm2."""
        return self.n * bar_area(self.dia)

    @property
    def notation(self) -> str:  # noqa: D102
        return f"{self.n}H{_fmt_dia(self.dia)}"


def _check_common(cover: float, link: float) -> None:
    if not cover > 0:
        msg = f"nominal cover to the links must be positive, got cover={cover} mm"
        raise ValueError(msg)
    if not link > 0:
        msg = f"link diameter must be positive, got link={link} mm"
        raise ValueError(msg)


@dataclass(frozen=True)
class RectSection:
    """Rectangular column section b x h with a symmetric perimeter bar layout.

    Attributes:
        b: width along local y, mm.
        h: depth along local z, mm.
        cover: nominal cover to the links, mm.
        link: link diameter, mm.
        bars: the longitudinal bars.
    """

    b: float
    h: float
    cover: float
    link: float
    bars: RectBars

    def __post_init__(self) -> None:
        for name in ("b", "h"):
            value = getattr(self, name)
            if not value > 0:
                msg = f"section dimension {name} must be positive, got {name}={value} mm"
                raise ValueError(msg)
        _check_common(self.cover, self.link)
        inner_b = self.b - 2 * (self.cover + self.link) - self.bars.max_dia
        inner_h = self.h - 2 * (self.cover + self.link) - self.bars.max_dia
        if inner_b <= 0 or inner_h <= 0:
            msg = (
                f"bars do not fit: {self.b:g}x{self.h:g} mm with cover {self.cover:g} mm, "
                f"link {self.link:g} mm and {self.bars.max_dia:g} mm bars"
            )
            raise ValueError(msg)

    @property
    def shape(self) -> str:  # noqa: D102
        return "rect"

    @property
    def Ac(self) -> float:
        """Gross concrete area, mm2."""
        return self.b * self.h

    @property
    def As(self) -> float:
        """Total longitudinal steel area, mm2."""
        return self.bars.area

    @property
    def label(self) -> str:
        """E.g. ``400x600 12H25``."""
        return f"{self.b:g}x{self.h:g} {self.bars.notation}"

    def bar_coords(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Bar centres and diameters: arrays (y, z, dia) in mm, corners first.

        Corner bars sit in the link corners; intermediate bars touch the link
        and are evenly spaced between the corner bar centres.
        """
        bars = self.bars
        inset = self.cover + self.link
        yc = self.b / 2 - inset - bars.corner / 2
        zc = self.h / 2 - inset - bars.corner / 2
        ys = [yc, -yc, -yc, yc]
        zs = [zc, zc, -zc, -zc]
        ds = [bars.corner] * 4
        # Intermediate bars on the two b-faces (z = +-h/2), spaced along y.
        zi = self.h / 2 - inset - bars.dia / 2
        for k in range(1, bars.nb - 1):
            y = -yc + 2 * yc * k / (bars.nb - 1)
            ys += [y, y]
            zs += [zi, -zi]
            ds += [bars.dia, bars.dia]
        # Intermediate bars on the two h-faces (y = +-b/2), spaced along z.
        yi = self.b / 2 - inset - bars.dia / 2
        for k in range(1, bars.nh - 1):
            z = -zc + 2 * zc * k / (bars.nh - 1)
            ys += [yi, -yi]
            zs += [z, z]
            ds += [bars.dia, bars.dia]
        return np.array(ys, dtype=float), np.array(zs, dtype=float), np.array(ds, dtype=float)

    def effective_depth(self, axis: str) -> float:
        """Effective depth d (mm) for bending about ``axis`` ("y" or "z").

        EN 1992-1-1, 5.8.8.3(2), Eq. (5.35): d = h/2 + is, with is the radius
        of gyration of the total reinforcement area about the bending axis
        (for bars on two opposite faces only this is their effective depth).
        """
        y, z, dia = self.bar_coords()
        coord, depth = (z, self.h) if axis == "y" else (y, self.b)
        area = dia**2
        i_s = math.sqrt(float(np.sum(area * coord**2) / np.sum(area)))
        return depth / 2 + i_s

    def clear_spacings(self) -> np.ndarray:
        """Clear gaps (mm) between neighbouring bars along the b-faces and the h-faces."""
        bars = self.bars
        inset = self.cover + self.link
        gaps = []
        for width, count in ((self.b, bars.nb), (self.h, bars.nh)):
            pitch = (width - 2 * inset - bars.corner) / (count - 1)
            dias = [bars.corner] + [bars.dia] * (count - 2) + [bars.corner]
            gaps += [pitch - (a + c) / 2 for a, c in zip(dias[:-1], dias[1:], strict=True)]
        return np.asarray(gaps)


@dataclass(frozen=True)
class CircSection:
    """Circular column section with equally spaced bars.

    Attributes:
        diameter: outer diameter, mm.
        cover: nominal cover to the links (or helix), mm.
        link: link diameter, mm.
        bars: the longitudinal bars.
        first_bar_angle: angle of the first bar from the +y axis, degrees
            (default 90: a bar on the +z axis).
    """

    diameter: float
    cover: float
    link: float
    bars: CircBars
    first_bar_angle: float = 90.0

    def __post_init__(self) -> None:
        if not self.diameter > 0:
            msg = f"section diameter must be positive, got diameter={self.diameter} mm"
            raise ValueError(msg)
        _check_common(self.cover, self.link)
        if self.bar_radius <= 0:
            msg = (
                f"bars do not fit: diameter {self.diameter:g} mm with cover {self.cover:g} mm, "
                f"link {self.link:g} mm and {self.bars.dia:g} mm bars"
            )
            raise ValueError(msg)

    @property
    def shape(self) -> str:  # noqa: D102
        return "circ"

    @property
    def b(self) -> float:
        """Width along y (the diameter), mm."""
        return self.diameter

    @property
    def h(self) -> float:
        """Depth along z (the diameter), mm."""
        return self.diameter

    @property
    def bar_radius(self) -> float:
        """Radius of the circle through the bar centres, mm."""
        return self.diameter / 2 - self.cover - self.link - self.bars.dia / 2

    @property
    def Ac(self) -> float:
        """Gross concrete area, mm2."""
        return math.pi * self.diameter**2 / 4

    @property
    def As(self) -> float:
        """Total longitudinal steel area, mm2."""
        return self.bars.area

    @property
    def label(self) -> str:
        """E.g. ``D600 8H25``."""
        return f"D{self.diameter:g} {self.bars.notation}"

    def bar_coords(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Bar centres and diameters: arrays (y, z, dia) in mm."""
        n = self.bars.n
        ang = np.radians(self.first_bar_angle) + 2 * np.pi * np.arange(n) / n
        r = self.bar_radius
        return r * np.cos(ang), r * np.sin(ang), np.full(n, float(self.bars.dia))

    def effective_depth(self, axis: str = "y") -> float:
        """Effective depth d (mm) = D/2 + is, with is = rs / sqrt(2) for bars on a circle of radius rs.

        EN 1992-1-1, 5.8.8.3(2), Eq. (5.35).
        """
        return self.diameter / 2 + self.bar_radius / math.sqrt(2)

    def clear_spacings(self) -> np.ndarray:
        """Clear gaps (mm) between neighbouring bars around the circle."""
        chord = 2 * self.bar_radius * math.sin(math.pi / self.bars.n)
        return np.full(self.bars.n, chord - self.bars.dia)


Section = RectSection | CircSection


def check_bar_spacing(section: Section, dg: float = 20.0, params: NationalParameters = EN_RECOMMENDED) -> CheckResult:
    """Check the smallest clear gap between bars against 8.2(2) (rule in design.detailing.min_clear_spacing)."""
    required = float(min_clear_spacing(section.bars.max_dia, dg, params))
    provided = float(np.min(section.clear_spacings()))
    return CheckResult(
        name="clear spacing of bars",
        clause="EN 1992-1-1, 8.2(2)",
        demand=required,
        capacity=max(provided, 0.0),
        unit="mm",
        note=f"minimum max(k1 phi, dg + k2, 20) with dg = {dg:g} mm",
    )
