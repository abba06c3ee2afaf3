"""Resistance of a rectangular column section in fire by the 500 C isotherm method.

EN 1992-1-2, Annex B.1, on top of the strain-compatibility engine of
:mod:`design.resistance` (EN 1992-1-1, 6.1), with the design actions in fire
of EN 1992-1-2, 2.4.2.

The method (Annex B.1.1 and the procedure of B.1.2; clause wording recalled
from memory):

* concrete hotter than 500 C is disregarded; the concrete inside the 500 C
  isotherm keeps its full strength and modulus (B.1.1(2)), so with
  alpha_cc = 1.0 and gamma_c,fi = 1.0 (EN 1992-1-2, 2.3) its design strength
  is fcd,fi = fck (the reduction kc(theta) of Table 3.1 is given below for the
  zone method of Annex B.2, which needs it; this method does not use it);
* the reduced section is bounded by the 500 C isotherm. Near a corner
  heated on two faces the isotherm is rounded and lies deeper than a500;
  B.1.2 lets the rounded isotherm be approximated by a rectangle (Figure B.2).
  Here the rectangle is bounded by straight lines at the depth a500 of each
  exposed face, b_fi = b - a500(+y) - a500(-y) and h_fi = h - a500(+z) -
  a500(-z): the corner rounding itself is ignored. A caller whose isotherm
  field shows deep corners should pass, per face, an equivalent depth that
  removes the same area (or the corner depth, which is on the safe side);
* every bar keeps its position and counts with its own temperature theta_i,
  whether it lies inside the reduced section or not (B.1.2: bars outside the
  reduced section may still be included in the resistance), with strength
  ks(theta_i) fyk and gamma_s,fi = 1.0 (4.2.4.3 and 2.3);
* the reduced section is then designed by the ordinary methods of
  EN 1992-1-1 (here: 6.1 strain compatibility, parabola-rectangle concrete,
  horizontal steel branch) and compared with the actions in fire.

Per-bar strength in a one-steel engine
--------------------------------------
The engine has one steel law for all bars of a section (fyk, Es, horizontal
top branch, gamma_s = 1.0 here), and it deducts the concrete stress over the
area of every bar ("displaced concrete"). Each bar's reduced strength
ks fyk is represented by scaling its area, A_eq,i = r_i A_i, with

    r = (ks fyk - fck) / (fyk - fck)   (<= ks; 0 where ks fyk <= fck)

chosen so that, at every strain, the scaled bar carries no more than the bar
it stands for (area A, yield strength ks fyk, same Es, concrete deducted only
inside the reduced section):

* compression, with 0 <= sigma_c <= fck the concrete stress at the bar:
  r (min(Es eps, fyk) - sigma_c) <= min(Es eps, ks fyk) - sigma_c, with
  equality once the bar has yielded and sigma_c = fck (a bar outside the
  reduced section, where there is no concrete, is lower still);
* tension: r min(Es |eps|, fyk) <= ks min(Es |eps|, fyk) <= min(Es |eps|,
  ks fyk): the scaled bar reaches its reduced force only at the ambient
  yield strain fyk/Es instead of ks fyk/Es, and counts with r < ks
  (fck = 30, fyk = 500: r = 0.787 for ks = 0.80, 0.167 for ks = 0.2175).

Plain scaling r = ks would deduct only ks A sigma_c for a bar inside the
reduced section instead of A sigma_c, which is unsafe by up to (1 - ks) A fck
per bar. A bound on every bar force does not by itself bound the resistance
at a given NEd (the neutral axis moves), so tests/design/test_isotherm.py
measures it against an independent per-bar strain-compatibility reference:
over 280 cases of a 400 x 400 mm column with 8H25, C30/37, fyk = 500 MPa
(4 sets of bar temperatures from 200 to 650 C, 5 symmetric and one-sided
isotherms, both senses, NEd from 0 to 0.95 NRd,fi; a sweep run once on
2026-12-02, three of whose cases are kept in the test) the module's
MRd,fi was below the reference in every case, by 0.02 % to 19 % of the
reference's largest moment (median 3.5 %); plain scaling r = ks was up to
4 % above it near NRd,fi, where hot bars inside the section displace
concrete. The gap grows with the bar temperature (r falls faster than ks).
An inside bar with ks fyk <= fck (fck = 30, fyk = 500: above 900 C on
curve 3, which the 500 C isotherm excludes) is rejected.

Moments are about the centroid of the *original* section (where the actions
act): the engine works about the centre of the reduced rectangle, which moves
when the exposure is not symmetric, and M = M' + N e with e the offset of the
reduced centre. For an unsymmetric reduced section the resistances in the two
senses of each axis differ; both are kept.

Units: N, mm, MPa, N mm; temperatures in degrees C.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from enum import StrEnum
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.materials import Concrete, Reinforcement, TopBranch
from design.resistance import DesignSection, SectionBatch
from design.results import CheckKind, CheckResult
from design.second_order.biaxial import biaxial_interaction, exponent_a
from design.sections import RectBars, RectSection, Section

__all__ = [
    "SteelCurve",
    "Aggregate",
    "FACES",
    "ETA_FI_SIMPLIFIED",
    "MIN_WIDTH_TABLE_B1",
    "THETA_TABLE",
    "KS_HOT_ROLLED",
    "KS_COLD_WORKED",
    "KC_SILICEOUS",
    "KC_CALCAREOUS",
    "ks",
    "kc",
    "eta_fi",
    "NEd_fi",
    "ReducedSection",
    "area_factor",
    "reduced_section",
    "FireResistance",
    "fire_resistance",
    "check_fire_isotherm",
]

CLAUSE = "EN 1992-1-2, Annex B.1"
FACES = ("+y", "-y", "+z", "-z")
ETA_FI_SIMPLIFIED = 0.7  # EN 1992-1-2, 2.4.2(3), Note: recommended simplification eta_fi = 0.7

# Temperatures of the rows of EN 1992-1-2 Tables 3.1 and 3.2a, C.
THETA_TABLE = np.array([20, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000, 1100, 1200], dtype=float)
# EN 1992-1-2, Table 3.2a, class N, fsy,theta/fyk (tension, eps_s,fi >= 2 %). Recalled from memory; verify
# against the printed standard.
KS_HOT_ROLLED = np.array([1.0, 1.0, 1.0, 1.0, 1.0, 0.78, 0.47, 0.23, 0.11, 0.06, 0.04, 0.02, 0.0])
KS_COLD_WORKED = np.array([1.0, 1.0, 1.0, 1.0, 0.94, 0.67, 0.40, 0.12, 0.11, 0.08, 0.05, 0.03, 0.0])
# EN 1992-1-2, Table 3.1, fc,theta/fck. Recalled from memory; verify against the printed standard.
KC_SILICEOUS = np.array([1.0, 1.0, 0.95, 0.85, 0.75, 0.60, 0.45, 0.30, 0.15, 0.08, 0.04, 0.01, 0.0])
KC_CALCAREOUS = np.array([1.0, 1.0, 0.97, 0.91, 0.85, 0.74, 0.60, 0.43, 0.27, 0.15, 0.06, 0.02, 0.0])
# EN 1992-1-2, 4.2.4.3, Figure 4.2a, curve 3 (compression, and tension with eps_s,fi < 2 %): breakpoints of its
# piecewise-linear expressions. Recalled from memory; verify against the printed standard.
_CURVE3_THETA = np.array([20.0, 100.0, 400.0, 500.0, 700.0, 1200.0])
_CURVE3_KS = np.array([1.0, 1.0, 0.70, 0.57, 0.10, 0.0])

# EN 1992-1-2, Table B.1 (recalled from memory): minimum width of the section for the 500 C method under the
# standard fire, mm, by fire resistance in minutes.
MIN_WIDTH_TABLE_B1 = {60: 90.0, 90: 120.0, 120: 160.0, 180: 200.0, 240: 280.0}


class SteelCurve(StrEnum):
    """Reduction curve of the reinforcement strength, EN 1992-1-2, 4.2.4.3."""

    HOT_ROLLED = "hot-rolled"  # Table 3.2a class N, tension with eps_s,fi >= 2 %
    COLD_WORKED = "cold-worked"  # Table 3.2a class N, tension with eps_s,fi >= 2 %
    COMPRESSION = "compression"  # Figure 4.2a curve 3: compression, and tension with eps_s,fi < 2 %


class Aggregate(StrEnum):
    """Aggregate of normal-weight concrete, EN 1992-1-2, Table 3.1."""

    SILICEOUS = "siliceous"
    CALCAREOUS = "calcareous"


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _temperatures(theta: ArrayLike) -> NDArray[np.float64]:
    t = _arr(theta)
    if not np.all(np.isfinite(t)) or np.any(t < 0.0):
        msg = f"temperatures must be finite and >= 0 C, got theta={t} C"
        raise ValueError(msg)
    return t


def ks(theta: ArrayLike, curve: SteelCurve = SteelCurve.COMPRESSION) -> NDArray[np.float64]:
    """Reduction factor of the reinforcement strength, ks = fsy,theta / fyk (-).

    EN 1992-1-2, Table 3.2a (class N) and 4.2.4.3, Figure 4.2a (curve 3)

    Linear between the rows; 1.0 below 20 C and 0 above 1200 C.

    Args:
        theta: bar temperature, C. Broadcasts.
        curve: :class:`SteelCurve`; COMPRESSION (the default) is the lowest of the three at every
            temperature, so it is on the safe side for bars in tension as well.

    """
    t = _temperatures(theta)
    curve = SteelCurve(curve)
    if curve is SteelCurve.COMPRESSION:
        return _arr(np.interp(t, _CURVE3_THETA, _CURVE3_KS))
    table = KS_HOT_ROLLED if curve is SteelCurve.HOT_ROLLED else KS_COLD_WORKED
    return _arr(np.interp(t, THETA_TABLE, table))


def kc(theta: ArrayLike, aggregate: Aggregate = Aggregate.SILICEOUS) -> NDArray[np.float64]:
    """Reduction factor of the concrete compressive strength, kc = fc,theta / fck (-).

    EN 1992-1-2, Table 3.1

    Linear between the rows; 1.0 below 20 C and 0 above 1200 C. Not used by
    the 500 C method (full strength inside the isotherm); the zone method of
    Annex B.2 needs it.

    Args:
        theta: concrete temperature, C. Broadcasts.
        aggregate: :class:`Aggregate`.

    """
    table = KC_SILICEOUS if Aggregate(aggregate) is Aggregate.SILICEOUS else KC_CALCAREOUS
    return _arr(np.interp(_temperatures(theta), THETA_TABLE, table))


def eta_fi(
    Gk: ArrayLike,
    Qk: ArrayLike,
    psi_fi: ArrayLike,
    gamma_G: float = 1.35,
    gamma_Q: float = 1.5,
    xi: float = 0.85,
    psi_0: float | None = None,
    combination: Literal["6.10", "6.10a/b"] = "6.10a/b",
) -> NDArray[np.float64]:
    """Reduction factor eta_fi of the design actions for the fire situation (-).

    EN 1992-1-2, 2.4.2(2), Eqs. (2.5), (2.5a), (2.5b)

    * combination "6.10" (EN 1990, Eq. (6.10)):
      eta_fi = (Gk + psi_fi Qk,1) / (gamma_G Gk + gamma_Q,1 Qk,1), Eq. (2.5);
    * combination "6.10a/b": the smaller of
      (Gk + psi_fi Qk,1) / (gamma_G Gk + gamma_Q,1 psi_0,1 Qk,1), Eq. (2.5a), and
      (Gk + psi_fi Qk,1) / (xi gamma_G Gk + gamma_Q,1 Qk,1), Eq. (2.5b).
      Without psi_0 only Eq. (2.5b) is used: it is never below the smaller of
      the two, so it is on the safe side.

    2.4.2(3), Note: eta_fi = 0.7 (:data:`ETA_FI_SIMPLIFIED`) may be used instead.

    Args:
        Gk: characteristic permanent action, N (or any one unit with Qk).
        Qk: characteristic leading variable action, same unit.
        psi_fi: combination factor for the fire situation, psi_1,1 or psi_2,1 (-).
        gamma_G: partial factor of permanent actions (-).
        gamma_Q: partial factor of the leading variable action (-).
        xi: reduction factor of unfavourable permanent actions in Eq. (6.10b) (-).
        psi_0: combination factor psi_0,1 of the leading variable action (-), for Eq. (2.5a).
        combination: "6.10" or "6.10a/b".
        Gk, Qk and psi_fi broadcast.

    """
    G, Q, psi = _arr(Gk), _arr(Qk), _arr(psi_fi)
    if np.any(G < 0) or np.any(Q < 0) or np.any((psi < 0) | (psi > 1)):
        msg = f"Gk, Qk must be >= 0 and psi_fi in [0, 1], got Gk={G}, Qk={Q}, psi_fi={psi}"
        raise ValueError(msg)
    if not np.all(G + Q > 0):
        msg = f"Gk + Qk must be positive, got Gk={G}, Qk={Q}"
        raise ValueError(msg)
    num = G + psi * Q
    if combination == "6.10":
        return num / (gamma_G * G + gamma_Q * Q)
    if combination != "6.10a/b":
        msg = f"combination must be '6.10' or '6.10a/b', got {combination!r}"
        raise ValueError(msg)
    eta_b = num / (xi * gamma_G * G + gamma_Q * Q)
    if psi_0 is None:
        return eta_b
    eta_a = num / (gamma_G * G + gamma_Q * psi_0 * Q)
    return np.minimum(eta_a, eta_b)


def NEd_fi(eta_fi: ArrayLike, NEd: ArrayLike) -> NDArray[np.float64]:
    """Design action in the fire situation Ed,fi = eta_fi Ed (N, or N mm for a moment).

    EN 1992-1-2, 2.4.2(2), Eq. (2.4)

    Args:
        eta_fi: reduction factor (-).
        NEd: design action at normal temperature, N (or N mm).
        Both broadcast.

    """
    return _arr(eta_fi) * _arr(NEd)


@dataclass(frozen=True)
class ReducedSection:
    """The rectangle inside the 500 C isotherm, in the axes of the original section.

    Attributes:
        b_fi: reduced width along y, mm.
        h_fi: reduced depth along z, mm.
        y_c: y of the reduced rectangle's centre, mm (0 when +y and -y lose the same depth).
        z_c: z of the reduced rectangle's centre, mm.
        a500: isotherm depth per face (+y, -y, +z, -z), mm.
    """

    b_fi: float
    h_fi: float
    y_c: float
    z_c: float
    a500: tuple[float, float, float, float]

    @property
    def Ac_fi(self) -> float:
        """Area of the reduced concrete, mm2."""
        return self.b_fi * self.h_fi


def _a500_tuple(a500: Mapping[str, float] | Sequence[float]) -> tuple[float, float, float, float]:
    if isinstance(a500, Mapping):
        unknown = set(a500) - set(FACES)
        missing = [f for f in FACES if f not in a500]
        if unknown or missing:
            msg = (
                f"a500 needs one depth for each face {FACES} (0 for an unexposed face), "
                f"got unknown {sorted(unknown)} and missing {missing}"
            )
            raise ValueError(msg)
        values = [float(a500[f]) for f in FACES]
    else:
        values = [float(v) for v in a500]
        if len(values) != 4:
            msg = f"a500 needs four depths (+y, -y, +z, -z) in mm, got {values}"
            raise ValueError(msg)
    if not all(math.isfinite(v) and v >= 0.0 for v in values):
        msg = f"isotherm depths must be finite and >= 0 mm, got a500={values}"
        raise ValueError(msg)
    return values[0], values[1], values[2], values[3]


def reduced_section(b: float, h: float, a500: Mapping[str, float] | Sequence[float]) -> ReducedSection:
    """Reduced rectangle b_fi x h_fi inside the 500 C isotherm.

    EN 1992-1-2, Annex B.1.2, Figure B.2 (isotherm approximated by a rectangle)

    b_fi = b - a500(+y) - a500(-y) (b - 2 a500 when both faces are exposed,
    b - a500 for one); h_fi likewise with the z faces.

    Args:
        b: width along y, mm.
        h: depth along z, mm.
        a500: depth of the 500 C isotherm below each face, mm: a mapping with the
            keys "+y", "-y", "+z", "-z" or four numbers in that order; 0 for an
            unexposed face.

    """
    ap_y, am_y, ap_z, am_z = a = _a500_tuple(a500)
    b_fi, h_fi = b - ap_y - am_y, h - ap_z - am_z
    if b_fi <= 0 or h_fi <= 0:
        msg = f"the 500 C isotherm leaves no section: b_fi={b_fi:g} mm, h_fi={h_fi:g} mm (b={b:g}, h={h:g}, a500={a})"
        raise ValueError(msg)
    return ReducedSection(b_fi, h_fi, y_c=0.5 * (am_y - ap_y), z_c=0.5 * (am_z - ap_z), a500=a)


@dataclass(frozen=True)
class _ReducedRect(RectSection):
    """The reduced rectangle with the original bars placed about its centre, areas scaled by r.

    The inherited cover, link and bar layout are placeholders that only satisfy
    :class:`RectSection`'s checks; the engine reads b, h, Ac and bar_coords().
    """

    bar_y: tuple[float, ...] = ()
    bar_z: tuple[float, ...] = ()
    bar_dia: tuple[float, ...] = ()

    def bar_coords(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Bar centres about the reduced centre and the diameters of the scaled areas, mm."""
        return np.array(self.bar_y), np.array(self.bar_z), np.array(self.bar_dia)


@dataclass(frozen=True)
class FireResistance:
    """Resistance of a section in fire by the 500 C isotherm method.

    Moments are about the centroid of the original section, signed as in
    :mod:`design.resistance` (positive MRdy: compression on the +z face).

    Attributes:
        reduced: the reduced section.
        bar_theta: temperature of each bar, C (order of ``section.bar_coords()``).
        ks: reduction factor of each bar's strength (-).
        curve: the steel reduction curve used.
        NEd_fi: axial load in fire at which the moments were found, N.
        NRd_fi: resistance to pure compression of the reduced section, N (6.1(5): uniform eps_c2).
        NRd_fi_plastic: b_fi h_fi fck + sum ks fyk As, N (the NRd of Eq. (5.39)'s exponent).
        MRdy_range: (resistance with compression on the -z face, on the +z face) at NEd_fi, N mm.
        MRdz_range: the same about z (-y face, +y face), N mm.
        inside: whether each bar lies inside the reduced rectangle.
        area_factor: factor r on each bar's area in the engine (:func:`area_factor`).
    """

    reduced: ReducedSection
    bar_theta: tuple[float, ...]
    ks: tuple[float, ...]
    curve: SteelCurve
    NEd_fi: float
    NRd_fi: float
    NRd_fi_plastic: float
    MRdy_range: tuple[float, float]
    MRdz_range: tuple[float, float]
    inside: tuple[bool, ...] = field(default=())
    area_factor: tuple[float, ...] = field(default=())

    @property
    def MRdy_fi(self) -> float:
        """The lesser magnitude of the two senses of MRdy at NEd_fi, N mm (0 if NEd_fi is outside the range)."""
        lo, hi = self.MRdy_range
        return max(0.0, min(hi, -lo))

    @property
    def MRdz_fi(self) -> float:
        """The lesser magnitude of the two senses of MRdz at NEd_fi, N mm."""
        lo, hi = self.MRdz_range
        return max(0.0, min(hi, -lo))


def area_factor(ks_i: ArrayLike, design_fck: float, fyk: float) -> NDArray[np.float64]:
    """Factor r on each bar's area that represents its strength ks fyk in the one-steel engine (-).

    EN 1992-1-2, Annex B.1.2 (bar strengths); the choice of r is this module's (module docstring)

    r = max((ks fyk - fck) / (fyk - fck), 0).

    Args:
        ks_i: reduction factor of each bar (-). Broadcasts.
        design_fck: fck, MPa.
        fyk: fyk at 20 C, MPa.

    """
    return np.maximum((_arr(ks_i) * fyk - design_fck) / (fyk - design_fck), 0.0)


def _design_section(
    section: RectSection, design_fck: float, fyk: float, red: ReducedSection, k: NDArray[np.float64]
) -> DesignSection:
    y, z, dia = section.bar_coords()
    tiny = 1e-3  # placeholder cover, link and bar of the inherited checks, mm
    rect = _ReducedRect(
        b=red.b_fi,
        h=red.h_fi,
        cover=tiny,
        link=tiny,
        bars=RectBars(dia=tiny, nb=2, nh=2),
        bar_y=tuple(float(v) for v in y - red.y_c),
        bar_z=tuple(float(v) for v in z - red.z_c),
        bar_dia=tuple(float(v) for v in dia * np.sqrt(k)),
    )
    concrete = Concrete(design_fck, alpha_cc=1.0, gamma_c=1.0)  # EN 1992-1-2, 2.3: gamma_c,fi = 1.0
    steel = Reinforcement(fyk, branch=TopBranch.HORIZONTAL, gamma_s=1.0)  # gamma_s,fi = 1.0
    return DesignSection(rect, concrete, steel)


def fire_resistance(
    section: Section,
    design_fck: float,
    fyk: float,
    bar_theta: ArrayLike,
    a500: Mapping[str, float] | Sequence[float],
    NEd_fi: float,
    curve: SteelCurve = SteelCurve.COMPRESSION,
) -> FireResistance:
    """Axial and moment resistance of a rectangular section in fire, 500 C isotherm method.

    EN 1992-1-2, Annex B.1; EN 1992-1-1, 6.1 on the reduced section

    Args:
        section: a :class:`RectSection` (circular sections are not handled yet).
        design_fck: characteristic cylinder strength fck, MPa (fcd,fi = fck).
        fyk: characteristic yield strength of the bars at 20 C, MPa.
        bar_theta: temperature of each bar at the required time, C, in the order of
            ``section.bar_coords()`` (corner bars first).
        a500: depth of the 500 C isotherm per face, mm (see :func:`reduced_section`).
        NEd_fi: axial load in fire, N (compression positive).
        curve: the steel reduction curve (:class:`SteelCurve`).

    """
    if not isinstance(section, RectSection):
        msg = f"the 500 C isotherm method is implemented for rectangular sections only, got {type(section).__name__}"
        raise TypeError(msg)
    y, z, dia = section.bar_coords()
    theta = _temperatures(bar_theta).ravel()
    if theta.shape != y.shape:
        msg = f"bar_theta needs one temperature per bar ({len(y)} bars), got {theta.size}"
        raise ValueError(msg)
    k = ks(theta, curve)
    if not np.any(k > 0):
        msg = f"every bar is at ks = 0 (bar_theta={theta} C): the section has no reinforcement left"
        raise ValueError(msg)
    red = reduced_section(section.b, section.h, a500)
    inside = (np.abs(y - red.y_c) <= red.b_fi / 2) & (np.abs(z - red.z_c) <= red.h_fi / 2)
    if np.any(inside & (k * fyk <= design_fck)):
        msg = (
            f"a bar inside the reduced section has ks fyk <= fck (ks={k[inside]}, fyk={fyk:g} MPa, "
            f"fck={design_fck:g} MPa): bar temperatures and isotherm depths disagree"
        )
        raise ValueError(msg)
    r = area_factor(k, design_fck, fyk)
    if not np.any(r > 0):
        msg = f"every bar has ks fyk <= fck (bar_theta={theta} C): no reinforcement left to count"
        raise ValueError(msg)
    batch = SectionBatch([_design_section(section, design_fck, fyk, red, r)])
    theta_dir = np.array([-np.pi / 2, np.pi / 2, np.pi, 0.0])  # -z, +z, -y, +y faces compressed
    ok, My, Mz = batch.resistance_at_angle(np.full(4, float(NEd_fi)), theta_dir, np.zeros(4, dtype=int))
    My = np.where(ok, My + NEd_fi * red.z_c, np.nan)  # about the original centroid: M = M' + N e
    Mz = np.where(ok, Mz + NEd_fi * red.y_c, np.nan)
    As = np.pi * dia**2 / 4
    return FireResistance(
        reduced=red,
        bar_theta=tuple(float(t) for t in theta),
        ks=tuple(float(v) for v in k),
        curve=SteelCurve(curve),
        NEd_fi=float(NEd_fi),
        NRd_fi=float(batch.NRd()[0]),
        NRd_fi_plastic=float(red.Ac_fi * design_fck + np.sum(k * fyk * As)),
        MRdy_range=(_bound(My[0], lower=True), _bound(My[1], lower=False)),
        MRdz_range=(_bound(Mz[2], lower=True), _bound(Mz[3], lower=False)),
        inside=tuple(bool(v) for v in inside),
        area_factor=tuple(float(v) for v in r),
    )


def _bound(value: float, lower: bool) -> float:
    """A NaN (NEd outside the axial range) becomes an empty interval: +inf as lower, -inf as upper bound."""
    if math.isnan(value):
        return math.inf if lower else -math.inf
    return float(value)


def _moment_check(name: str, MEd: float, rng: tuple[float, float], note: str) -> CheckResult:
    """MEd against the resisting interval [lo, hi] at NEd,fi, in the sense of MEd.

    A moment outside the interval fails (capacity 0): beyond the resistance of
    its own sense, or, for an unsymmetric reduced section near NRd,fi, on the
    far side of the other sense's resistance (the interval need not contain 0).
    """
    lo, hi = rng
    if not lo <= MEd <= hi:
        where = "NEd,fi outside the axial range" if lo > hi else f"MEd outside [{lo:.4g}, {hi:.4g}] N mm"
        return CheckResult(name, CLAUSE, max(abs(MEd), 1.0), 0.0, "N mm", f"{note}; {where}", kind=CheckKind.FIRE)
    capacity = hi if MEd >= 0 else -lo
    return CheckResult(name, CLAUSE, abs(MEd), capacity, "N mm", note, kind=CheckKind.FIRE)


def check_fire_isotherm(
    section: Section,
    design_fck: float,
    fyk: float,
    bar_theta: ArrayLike,
    a500: Mapping[str, float] | Sequence[float],
    NEd_fi: float,
    MEdy_fi: float,
    MEdz_fi: float,
    curve: SteelCurve = SteelCurve.COMPRESSION,
    rating_minutes: int | None = None,
    resistance: FireResistance | None = None,
) -> list[CheckResult]:
    """Checks of a column section in fire by the 500 C isotherm method.

    EN 1992-1-2, Annex B.1; EN 1992-1-1, 6.1 and 5.8.9(4), Eq. (5.39)

    Returns the axial check (NEd,fi against NRd,fi), the moment checks about y
    and z at NEd,fi (in the sense of each moment; a moment that lies beyond
    the resistance of the other sense, possible for an unsymmetric reduced
    section near NRd,fi, fails), and the biaxial interaction of EN 1992-1-1
    Eq. (5.39) applied to the reduced section as at normal temperature, with
    NRd = b_fi h_fi fck + sum ks fyk As in its exponent. All are of kind FIRE.
    The moments are the design moments in fire about the original centroid
    (second-order effects included by the caller).

    Args:
        section: the :class:`RectSection`.
        design_fck: fck, MPa.
        fyk: fyk of the bars at 20 C, MPa.
        bar_theta: temperature of each bar, C (order of ``section.bar_coords()``).
        a500: isotherm depth per face, mm.
        NEd_fi: axial load in fire, N.
        MEdy_fi: moment about y in fire, N mm.
        MEdz_fi: moment about z in fire, N mm.
        curve: the steel reduction curve.
        rating_minutes: required standard fire resistance R, minutes; when given, a fifth check
            compares the smaller section dimension with the minimum width of Table B.1 (60 to 240).
        resistance: :func:`fire_resistance` of the same inputs when the caller has it already (not
            computed twice).

    """
    r = (
        resistance
        if resistance is not None
        else fire_resistance(section, design_fck, fyk, bar_theta, a500, NEd_fi, curve)
    )
    red = r.reduced
    geom = f"b_fi x h_fi = {red.b_fi:g} x {red.h_fi:g} mm, min ks = {min(r.ks):.2f}"
    checks = [
        CheckResult(
            "axial resistance in fire (500 C isotherm)", CLAUSE, float(NEd_fi), r.NRd_fi, "N", geom, kind=CheckKind.FIRE
        ),
        _moment_check("bending about y in fire (500 C isotherm)", float(MEdy_fi), r.MRdy_range, geom),
        _moment_check("bending about z in fire (500 C isotherm)", float(MEdz_fi), r.MRdz_range, geom),
    ]
    My_cap, Mz_cap = checks[1].capacity, checks[2].capacity
    if My_cap > 0 and Mz_cap > 0 and 0 < NEd_fi:
        a = float(exponent_a(NEd_fi, r.NRd_fi_plastic))
        value = float(biaxial_interaction(MEdy_fi, My_cap, MEdz_fi, Mz_cap, a))
        ratio = NEd_fi / r.NRd_fi_plastic
        note = f"EN 1992-1-1, Eq. (5.39) on the reduced section, a = {a:.3f} at NEd,fi/NRd,fi = {ratio:.3f}"
        checks.append(
            CheckResult("biaxial bending in fire (500 C isotherm)", CLAUSE, value, 1.0, "-", note, kind=CheckKind.FIRE)
        )
    else:
        reason = "Eq. (5.39) needs compression and positive resistances about both axes"
        checks.append(
            CheckResult(
                "biaxial bending in fire (500 C isotherm)",
                CLAUSE,
                0.0,
                0.0,
                "-",
                reason,
                applicable=False,
                kind=CheckKind.FIRE,
            )
        )
    if rating_minutes is not None:
        if rating_minutes not in MIN_WIDTH_TABLE_B1:
            msg = f"Table B.1 gives minimum widths for R {sorted(MIN_WIDTH_TABLE_B1)} minutes, got {rating_minutes}"
            raise ValueError(msg)
        checks.append(
            CheckResult(
                f"minimum width for the 500 C isotherm method, R{rating_minutes}",
                "EN 1992-1-2, Annex B.1.1(3), Table B.1",
                MIN_WIDTH_TABLE_B1[rating_minutes],
                float(min(section.b, section.h)),
                "mm",
                "standard fire exposure (values recalled from memory)",
                kind=CheckKind.FIRE,
            )
        )
    return checks
