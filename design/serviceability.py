"""Stress limitation in the concrete, EN 1992-1-1, 7.2.

The stresses come from an elastic, uncracked, transformed section: the bars
are counted as (alpha_e - 1) times their area (the concrete they displace is
not double counted), with alpha_e = Es / Ec,eff and Ec,eff = Ecm / (1 + phi)
for long-term (quasi-permanent) loads, Eq. (7.20). Pass phi = 0 for
short-term stresses (characteristic combination) if that is the intent.

The section is uncracked while no fibre is in tension beyond fct,eff = fctm
(7.1(2)). Where a fibre exceeds it the uncracked stress is not valid; the
result says so (``cracked``), and a cracked-section stress is not computed:
the check is then returned as not applicable.

Sections: rectangles b x h centred on the origin (b along y, h along z, as in
:mod:`design.sections`) and solid circles of diameter D. Bars are given by
their coordinates (y, z) and areas; arrays of shape (..., n_bars) broadcast
against the section arrays of shape (...), and bars of area 0 may pad a row.
Moments are taken about the centre of the concrete outline, with the axial
force acting there (the convention of :mod:`design.resistance`):
M_y = integral of sigma z dA, M_z = integral of sigma y dA, compression
positive, so a positive M_y compresses the +z face.

Units: N, mm, MPa; moments in N mm.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.cover import Exposure, ExposureClass, parse_exposure
from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckKind, CheckResult

__all__ = [
    "TransformedSection",
    "UncrackedStress",
    "Ec_eff",
    "alpha_e",
    "transformed_rectangle",
    "transformed_circle",
    "sigma_c_uncracked",
    "sigma_c_limit_characteristic",
    "sigma_c_limit_quasi_permanent",
    "needs_characteristic_limit",
    "check_stress_limits",
]

ES_DEFAULT = 200_000.0  # EN 1992-1-1, 3.2.7(4): Es may be taken as 200 GPa


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    if not np.all(ok):
        raise ValueError(msg())


def Ec_eff(Ecm: ArrayLike, phi: ArrayLike) -> NDArray[np.float64]:
    """Effective modulus of concrete for long-term loads Ec,eff = Ecm / (1 + phi), MPa.

    EN 1992-1-1, Eq. (7.20)

    Args:
        Ecm: secant modulus, MPa.
        phi: creep coefficient phi(inf, t0) for the load and time interval (-);
            0 for short-term loads.
        Both broadcast.

    """
    Ecm, phi = _arr(Ecm), _arr(phi)
    _require(Ecm > 0, lambda: f"Ecm must be positive, got Ecm={Ecm} MPa")
    _require(phi >= 0, lambda: f"creep coefficient must not be negative, got phi={phi} (-)")
    return Ecm / (1.0 + phi)


def alpha_e(Ecm: ArrayLike, phi: ArrayLike = 0.0, Es: ArrayLike = ES_DEFAULT) -> NDArray[np.float64]:
    """Modular ratio alpha_e = Es / Ec,eff (-).

    EN 1992-1-1, 7.2, 7.3.4(2) (alpha_e = Es/Ecm) with Ec,eff of Eq. (7.20)

    Args:
        Ecm: secant modulus of the concrete, MPa.
        phi: creep coefficient (-); 0 gives Es/Ecm.
        Es: modulus of the reinforcement, MPa (200 GPa, 3.2.7(4)).
        All broadcast.

    """
    Es = _arr(Es)
    _require(Es > 0, lambda: f"Es must be positive, got Es={Es} MPa")
    return Es / Ec_eff(Ecm, phi)


@dataclass(frozen=True)
class TransformedSection:
    """Uncracked transformed section, properties about the centre of the outline.

    All integrals are over the transformed area (concrete plus (alpha_e - 1)
    times each bar area); y, z are measured from the centre of the concrete
    outline.

    Attributes:
        A: transformed area, mm2.
        Sy: first moment integral of y dA, mm3.
        Sz: first moment integral of z dA, mm3.
        Iyy: integral of y^2 dA, mm4 (second moment about the z axis, "Iz").
        Izz: integral of z^2 dA, mm4 (second moment about the y axis, "Iy").
        Iyz: integral of y z dA, mm4.
        b: outline width along y, mm (D for a circle).
        h: outline depth along z, mm (D for a circle).
        circular: True for a solid circle of diameter b = h.
    """

    A: np.ndarray
    Sy: np.ndarray
    Sz: np.ndarray
    Iyy: np.ndarray
    Izz: np.ndarray
    Iyz: np.ndarray
    b: np.ndarray
    h: np.ndarray
    circular: np.ndarray


def _bars(
    bar_y: ArrayLike, bar_z: ArrayLike, bar_area: ArrayLike, alpha_e: ArrayLike
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Sums over the bars of the added area (alpha_e - 1) As and its moments."""
    y, z, a = np.broadcast_arrays(_arr(bar_y), _arr(bar_z), _arr(bar_area))
    _require(a >= 0, lambda: f"bar areas must not be negative, got {a} mm2")
    ae = _arr(alpha_e)
    _require(ae >= 1.0, lambda: f"modular ratio alpha_e must be at least 1, got alpha_e={ae} (-)")
    w = (ae[..., None] - 1.0) * a
    own = w * a / (4.0 * np.pi)  # each round bar's own second moment, (alpha_e - 1) As^2 / (4 pi)
    return (
        w.sum(-1),
        (w * y).sum(-1),
        (w * z).sum(-1),
        (w * y * y + own).sum(-1),
        (w * z * z + own).sum(-1),
        (w * y * z).sum(-1),
    )


def transformed_rectangle(
    b: ArrayLike, h: ArrayLike, bar_y: ArrayLike, bar_z: ArrayLike, bar_area: ArrayLike, alpha_e: ArrayLike
) -> TransformedSection:
    """Uncracked transformed rectangle b x h centred on the origin.

    EN 1992-1-1, 7.2 (elastic stresses; steel transformed with alpha_e)

    Concrete: A = b h, integral z^2 dA = b h^3/12, integral y^2 dA = h b^3/12.
    Each bar adds (alpha_e - 1) As at (y, z), with its own second moment
    (alpha_e - 1) As^2 / (4 pi) (a round bar).

    Args:
        b: width along y, mm; shape (...).
        h: depth along z, mm; shape (...).
        bar_y: bar coordinates y, mm; shape (..., n_bars).
        bar_z: bar coordinates z, mm; shape (..., n_bars).
        bar_area: bar areas, mm2; shape (..., n_bars), 0 for padding.
        alpha_e: modular ratio (-); shape (...).

    """
    b, h = _arr(b), _arr(h)
    _require((b > 0) & (h > 0), lambda: f"b and h must be positive, got b={b} mm, h={h} mm")
    n, sy, sz, iyy, izz, iyz = _bars(bar_y, bar_z, bar_area, alpha_e)
    A, Sy, Sz, Iyy, Izz, Iyz, bb, hh = np.broadcast_arrays(
        b * h + n, sy, sz, h * b**3 / 12.0 + iyy, b * h**3 / 12.0 + izz, iyz, b, h
    )
    return TransformedSection(A, Sy, Sz, Iyy, Izz, Iyz, bb, hh, np.zeros(A.shape, dtype=bool))


def transformed_circle(
    D: ArrayLike, bar_y: ArrayLike, bar_z: ArrayLike, bar_area: ArrayLike, alpha_e: ArrayLike
) -> TransformedSection:
    """Uncracked transformed solid circle of diameter D centred on the origin.

    EN 1992-1-1, 7.2 (elastic stresses; steel transformed with alpha_e)

    Concrete: A = pi D^2/4, integral y^2 dA = integral z^2 dA = pi D^4/64.

    Args:
        D: diameter, mm; shape (...).
        bar_y: bar coordinates y, mm; shape (..., n_bars).
        bar_z: bar coordinates z, mm; shape (..., n_bars).
        bar_area: bar areas, mm2; shape (..., n_bars).
        alpha_e: modular ratio (-); shape (...).

    """
    D = _arr(D)
    _require(D > 0, lambda: f"diameter must be positive, got D={D} mm")
    n, sy, sz, iyy, izz, iyz = _bars(bar_y, bar_z, bar_area, alpha_e)
    I0 = np.pi * D**4 / 64.0
    A, Sy, Sz, Iyy, Izz, Iyz, dd = np.broadcast_arrays(np.pi * D**2 / 4.0 + n, sy, sz, I0 + iyy, I0 + izz, iyz, D)
    return TransformedSection(A, Sy, Sz, Iyy, Izz, Iyz, dd, dd.copy(), np.ones(A.shape, dtype=bool))


@dataclass(frozen=True)
class UncrackedStress:
    """Extreme-fibre concrete stresses of an uncracked section, MPa (compression positive).

    Attributes:
        sigma_c_max: largest compressive stress in the concrete (may be
            negative when the whole section is in tension).
        sigma_c_min: smallest stress (most tensile, negative in tension).
        cracked: True where -sigma_c_min > fct,eff: the uncracked stresses
            are then not valid and no cracked-section stress is computed.
        sigma_0: stress at the origin, and
        grad_y, grad_z: its gradients (MPa/mm); sigma(y, z) = sigma_0 +
            grad_y y + grad_z z in the concrete, alpha_e times that in a bar.
    """

    sigma_c_max: np.ndarray
    sigma_c_min: np.ndarray
    cracked: np.ndarray
    sigma_0: np.ndarray
    grad_y: np.ndarray
    grad_z: np.ndarray


def sigma_c_uncracked(
    section: TransformedSection, N: ArrayLike, My: ArrayLike, Mz: ArrayLike, fct_eff: ArrayLike
) -> UncrackedStress:
    """Extreme-fibre concrete stresses under N, My, Mz on the uncracked transformed section.

    EN 1992-1-1, 7.2 (stress limitation) and 7.1(2) (uncracked while the
    tensile stress does not exceed fct,eff; fctm may be used)

    The plane stress field sigma = s0 + gy y + gz z satisfies
    N = s0 A + gy Sy + gz Sz, Mz = s0 Sy + gy Iyy + gz Iyz and
    My = s0 Sz + gy Iyz + gz Izz (a 3 x 3 system solved per section; it
    reduces to N/A + My z/Izz + Mz y/Iyy for a doubly symmetric layout).
    The extremes of a plane over a rectangle lie at its corners; over a
    circle of radius R they are s0 +/- R sqrt(gy^2 + gz^2).

    Args:
        section: :class:`TransformedSection`.
        N: axial force, N (> 0 compression).
        My: moment about y, N mm (positive compresses the +z face).
        Mz: moment about z, N mm (positive compresses the +y face).
        fct_eff: tensile strength for the cracking test, MPa (fctm).
        N, My, Mz and fct_eff broadcast against the section's shape.

    """
    N, My, Mz, fct = _arr(N), _arr(My), _arr(Mz), _arr(fct_eff)
    _require(fct >= 0, lambda: f"fct_eff must not be negative, got {fct} MPa")
    s = section
    shape = np.broadcast_shapes(s.A.shape, N.shape, My.shape, Mz.shape, fct.shape)
    A, Sy, Sz, Iyy, Izz, Iyz = (np.broadcast_to(x, shape) for x in (s.A, s.Sy, s.Sz, s.Iyy, s.Izz, s.Iyz))
    Nb, Myb, Mzb = (np.broadcast_to(x, shape) for x in (N, My, Mz))
    # doubly symmetric layouts (every section of a catalogue): the closed form, no solve
    s0, gy, gz = (np.array(x, dtype=float) for x in (Nb / A, Mzb / Iyy, Myb / Izz))
    general = (Sy != 0) | (Sz != 0) | (Iyz != 0)
    if np.any(general):
        K = np.empty((int(general.sum()), 3, 3))
        K[:, 0, 0], K[:, 0, 1], K[:, 0, 2] = A[general], Sy[general], Sz[general]
        K[:, 1, 0], K[:, 1, 1], K[:, 1, 2] = Sy[general], Iyy[general], Iyz[general]
        K[:, 2, 0], K[:, 2, 1], K[:, 2, 2] = Sz[general], Iyz[general], Izz[general]
        rhs = np.stack([Nb[general], Mzb[general], Myb[general]], axis=-1)
        sol = np.linalg.solve(K, rhs[..., None])[..., 0]
        s0[general], gy[general], gz[general] = sol[:, 0], sol[:, 1], sol[:, 2]
    circ = np.broadcast_to(s.circular, shape)
    half_b, half_h = np.broadcast_to(s.b, shape) / 2.0, np.broadcast_to(s.h, shape) / 2.0
    rect_span = np.abs(gy) * half_b + np.abs(gz) * half_h  # corners
    circ_span = half_b * np.hypot(gy, gz)
    span = np.where(circ, circ_span, rect_span)
    smax, smin = s0 + span, s0 - span
    return UncrackedStress(sigma_c_max=smax, sigma_c_min=smin, cracked=-smin > fct, sigma_0=s0, grad_y=gy, grad_z=gz)


# --------------------------------------------------------------------------
# Limits and checks
# --------------------------------------------------------------------------


def sigma_c_limit_characteristic(fck: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Compressive stress limit k1 fck under the characteristic combination, MPa.

    EN 1992-1-1, 7.2(2) (exposure classes XD, XF, XS; k1 = 0.6 recommended)

    Args:
        fck: characteristic cylinder strength, MPa. Broadcasts.
        params: national parameters (k1_stress).

    """
    return params.k1_stress * _arr(fck)


def sigma_c_limit_quasi_permanent(fck: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Stress k2 fck under quasi-permanent loads up to which creep is linear, MPa.

    EN 1992-1-1, 7.2(3) (k2 = 0.45 recommended)

    Args:
        fck: characteristic cylinder strength, MPa. Broadcasts.
        params: national parameters (k2_stress).

    """
    return params.k2_stress * _arr(fck)


_K1_FAMILIES = ("XD", "XF", "XS")


def needs_characteristic_limit(exposure: Exposure | ExposureClass | str) -> bool:
    """True when the exposure includes a class of XD, XF or XS.

    EN 1992-1-1, 7.2(2)

    Args:
        exposure: an :class:`~design.cover.Exposure`, a single class or a
            string such as "XC4+XF1".

    """
    exp = parse_exposure(exposure)
    return any(c.value.startswith(_K1_FAMILIES) for c in exp.classes)


def check_stress_limits(
    sigma_char: float,
    sigma_qp: float,
    fck: float,
    exposures: Exposure | ExposureClass | str,
    params: NationalParameters = EN_RECOMMENDED,
    cracked_char: bool = False,
    cracked_qp: bool = False,
) -> list[CheckResult]:
    """Concrete compressive stress limits of 7.2 for one column (kind DURABILITY).

    EN 1992-1-1, 7.2(2), 7.2(3)

    - "concrete stress, characteristic combination": sigma_c <= k1 fck, only
      when the exposure includes XD, XF or XS (7.2(2), against longitudinal
      cracks). Omitted otherwise.
    - "concrete stress, quasi-permanent combination": sigma_c <= k2 fck
      (7.2(3)). Beyond it creep is non-linear and should be considered
      (3.1.4); this is a warning rather than a failure of resistance, marked
      ``extra["level"] = "warning"``.

    A check whose stress comes from a cracked section (``cracked_*`` True)
    is returned as not applicable: the uncracked stress is not valid there
    and a cracked-section stress is not computed.

    Args:
        sigma_char: largest concrete compressive stress, characteristic
            combination, MPa.
        sigma_qp: largest concrete compressive stress, quasi-permanent
            combination, MPa.
        fck: characteristic cylinder strength, MPa.
        exposures: exposure class or combination (e.g. "XC4+XF1").
        params: national parameters (k1_stress, k2_stress).
        cracked_char: the characteristic-combination section is cracked.
        cracked_qp: the quasi-permanent section is cracked.

    """
    _require(fck > 0, lambda: f"fck must be positive, got fck={fck} MPa")
    exp = parse_exposure(exposures)
    not_valid = "section cracked (tension above fctm, 7.1(2)): uncracked stress not valid; cracked stress not computed"
    out: list[CheckResult] = []
    if needs_characteristic_limit(exp):
        limit = float(sigma_c_limit_characteristic(fck, params))
        out.append(
            CheckResult(
                "concrete stress, characteristic combination",
                "EN 1992-1-1, 7.2(2)",
                demand=float(sigma_char),
                capacity=limit,
                unit="MPa",
                note=not_valid
                if cracked_char
                else f"{exp.name}: sigma_c <= k1 fck = {params.k1_stress:g} fck (longitudinal cracks)",
                applicable=not cracked_char,
                kind=CheckKind.DURABILITY,
            )
        )
    limit = float(sigma_c_limit_quasi_permanent(fck, params))
    out.append(
        CheckResult(
            "concrete stress, quasi-permanent combination",
            "EN 1992-1-1, 7.2(3)",
            demand=float(sigma_qp),
            capacity=limit,
            unit="MPa",
            note=not_valid
            if cracked_qp
            else f"sigma_c <= k2 fck = {params.k2_stress:g} fck: beyond it creep is "
            "non-linear and should be considered (3.1.4); a warning, not a failure of resistance",
            applicable=not cracked_qp,
            extra={"level": "warning"},
            kind=CheckKind.DURABILITY,
        )
    )
    return out
