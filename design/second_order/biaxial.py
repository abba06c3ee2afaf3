"""Biaxial bending of columns, EN 1992-1-1, 5.8.9.

Axis convention (EN 1992-1-1, Fig. 5.8, as everywhere in :mod:`design`):
for a rectangle b x h, b lies along local y and h along local z. MEdy is the
moment about y (lever arm along h), MEdz the moment about z (lever arm
along b). Hence

* iy = h/sqrt(12) (about y) and iz = b/sqrt(12) (about z);
* ez = MEdy/NEd is the eccentricity along z, ey = MEdz/NEd along y
  (5.8.9(3), definitions under Eq. (5.38b));
* beq = iy sqrt(12) = h and heq = iz sqrt(12) = b, so the relative
  eccentricities of Eq. (5.38b) are ey/heq = ey/b and ez/beq = ez/h: each
  eccentricity is divided by the section dimension in its own direction.

Units: N, mm, MPa, moments in N mm. All numeric arguments broadcast.
"""

from __future__ import annotations

from enum import StrEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.results import CheckResult

__all__ = [
    "SectionShape",
    "slenderness_ratio_ok",
    "relative_eccentricity_ok",
    "no_biaxial_check_needed",
    "exponent_a",
    "biaxial_interaction",
    "check_biaxial",
    "beta_enhanced",
    "enhanced_uniaxial_moment",
]


class SectionShape(StrEnum):
    """Section shape for the exponent a of Eq. (5.39)."""

    RECTANGULAR = "rectangular"
    CIRCULAR = "circular"
    ELLIPTICAL = "elliptical"


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def slenderness_ratio_ok(lam_y: ArrayLike, lam_z: ArrayLike) -> NDArray[np.bool_]:
    """Whether lambda_y/lambda_z <= 2 and lambda_z/lambda_y <= 2.

    EN 1992-1-1, Eq. (5.38a)

    Args:
        lam_y: slenderness ratio with respect to the y axis (-), > 0.
        lam_z: slenderness ratio with respect to the z axis (-), > 0.
        Both broadcast.

    """
    ly, lz = _arr(lam_y), _arr(lam_z)
    if not np.all((ly > 0) & (lz > 0)):
        msg = f"slenderness ratios must be positive, got lam_y={ly}, lam_z={lz} (-)"
        raise ValueError(msg)
    return (ly <= 2.0 * lz) & (lz <= 2.0 * ly)


def relative_eccentricity_ok(
    MEdy: ArrayLike, MEdz: ArrayLike, NEd: ArrayLike, iy: ArrayLike, iz: ArrayLike
) -> NDArray[np.bool_]:
    """Whether (ey/heq)/(ez/beq) <= 0.2 or (ez/beq)/(ey/heq) <= 0.2.

    EN 1992-1-1, Eq. (5.38b)

    ey = MEdz/NEd, ez = MEdy/NEd, beq = iy sqrt(12), heq = iz sqrt(12) (see the
    module docstring for the axis mapping). The test is written as
    min(ry, rz) <= 0.2 max(ry, rz) with ry = |ey|/heq, rz = |ez|/beq, which is
    the same condition without division by zero: uniaxial bending (one
    eccentricity zero) satisfies it.

    Args:
        MEdy: design moment about y incl. second order, N mm.
        MEdz: design moment about z incl. second order, N mm.
        NEd: design axial force, N (> 0).
        iy: radius of gyration about y, mm.
        iz: radius of gyration about z, mm.
        All broadcast.

    """
    NEd = _arr(NEd)
    if not np.all(NEd > 0):
        msg = f"Eq. (5.38b) needs a compressive NEd > 0, got NEd={NEd} N"
        raise ValueError(msg)
    ey = np.abs(_arr(MEdz)) / NEd  # eccentricity along y
    ez = np.abs(_arr(MEdy)) / NEd  # eccentricity along z
    beq = _arr(iy) * np.sqrt(12.0)  # = h for a rectangle
    heq = _arr(iz) * np.sqrt(12.0)  # = b for a rectangle
    ry, rz = ey / heq, ez / beq
    return np.minimum(ry, rz) <= 0.2 * np.maximum(ry, rz)  # type: ignore[no-any-return]  # numpy stubs: comparison of NDArray[Any] values is Any


def no_biaxial_check_needed(
    lam_y: ArrayLike, lam_z: ArrayLike, MEdy: ArrayLike, MEdz: ArrayLike, NEd: ArrayLike, iy: ArrayLike, iz: ArrayLike
) -> NDArray[np.bool_]:
    """Whether both Eq. (5.38a) and Eq. (5.38b) hold (no further check).

    EN 1992-1-1, 5.8.9(3)

    Args:
        lam_y: slenderness about y (-).
        lam_z: slenderness about z (-).
        MEdy: moment about y incl. second order, N mm.
        MEdz: moment about z incl. second order, N mm.
        NEd: design axial force, N.
        iy: radius of gyration about y, mm.
        iz: radius of gyration about z, mm.
        All broadcast.

    """
    return slenderness_ratio_ok(lam_y, lam_z) & relative_eccentricity_ok(MEdy, MEdz, NEd, iy, iz)


def exponent_a(NEd: ArrayLike, NRd: ArrayLike, shape: SectionShape = SectionShape.RECTANGULAR) -> NDArray[np.float64]:
    """Exponent a of the biaxial interaction (-).

    EN 1992-1-1, 5.8.9(4), Eq. (5.39)

    Rectangular sections: a = 1.0, 1.5, 2.0 at NEd/NRd = 0.1, 0.7, 1.0, linear
    between, constant outside. Circular and elliptical sections: a = 2.

    Args:
        NEd: design axial force, N.
        NRd: Ac fcd + As fyd, design axial resistance of the section, N (> 0).
        shape: :class:`SectionShape`.
        NEd and NRd broadcast.

    """
    NEd, NRd = _arr(NEd), _arr(NRd)
    if not np.all(NRd > 0):
        msg = f"NRd must be positive, got NRd={NRd} N"
        raise ValueError(msg)
    shape = SectionShape(shape)
    ratio = NEd / NRd
    if shape is not SectionShape.RECTANGULAR:
        return np.full(ratio.shape, 2.0)
    return np.interp(ratio, [0.1, 0.7, 1.0], [1.0, 1.5, 2.0])


def biaxial_interaction(
    MEdy: ArrayLike, MRdy: ArrayLike, MEdz: ArrayLike, MRdz: ArrayLike, a: ArrayLike
) -> NDArray[np.float64]:
    """Interaction value (MEdz/MRdz)^a + (MEdy/MRdy)^a (-); <= 1 passes.

    EN 1992-1-1, Eq. (5.39)

    Args:
        MEdy: design moment about y incl. second order, N mm.
        MRdy: moment resistance about y at NEd, N mm (> 0).
        MEdz: design moment about z incl. second order, N mm.
        MRdz: moment resistance about z at NEd, N mm (> 0).
        a: exponent (-).
        All broadcast.

    """
    MRdy, MRdz = _arr(MRdy), _arr(MRdz)
    if not np.all((MRdy > 0) & (MRdz > 0)):
        msg = f"moment resistances must be positive, got MRdy={MRdy}, MRdz={MRdz} N mm"
        raise ValueError(msg)
    a = _arr(a)
    return (np.abs(_arr(MEdz)) / MRdz) ** a + (np.abs(_arr(MEdy)) / MRdy) ** a


def check_biaxial(
    NEd: float,
    NRd: float,
    MEdy: float,
    MRdy: float,
    MEdz: float,
    MRdz: float,
    shape: SectionShape = SectionShape.RECTANGULAR,
) -> CheckResult:
    """Check of one column under biaxial bending as a :class:`CheckResult`.

    EN 1992-1-1, 5.8.9(4), Eq. (5.39)

    Args:
        NEd: design axial force, N.
        NRd: Ac fcd + As fyd, N.
        MEdy: moment about y incl. second order, N mm.
        MRdy: resistance about y at NEd, N mm.
        MEdz: moment about z incl. second order, N mm.
        MRdz: resistance about z at NEd, N mm.
        shape: :class:`SectionShape`.

    """
    a = float(exponent_a(NEd, NRd, shape))
    value = float(biaxial_interaction(MEdy, MRdy, MEdz, MRdz, a))
    return CheckResult(
        name="biaxial bending",
        clause="EN 1992-1-1, 5.8.9(4), Eq. (5.39)",
        demand=value,
        capacity=1.0,
        unit="-",
        note=f"a = {a:.3f} at NEd/NRd = {NEd / NRd:.3f}",
        extra={"a": a},
    )


# BS 8110-1:1997, Table 3.22 (recalled from memory): beta against N/(b h fcu).
_BETA_N = np.array([0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6])
_BETA_VALUES = np.array([1.00, 0.88, 0.77, 0.65, 0.53, 0.42, 0.30])


def beta_enhanced(NEd: ArrayLike, b: ArrayLike, h: ArrayLike, f_cu: ArrayLike) -> NDArray[np.float64]:
    """Coefficient beta of the enhanced uniaxial moment method (-).

    BS 8110-1:1997, 3.8.4.5, Table 3.22 (recalled from memory)

    beta falls linearly from 1.00 at N/(b h fcu) = 0 to 0.30 at >= 0.6
    (0.88, 0.77, 0.65, 0.53, 0.42 at 0.1 ... 0.5). The table is indexed by
    the cube strength fcu; pass fck,cube (EN 1992-1-1 Table 3.1, e.g. 37 MPa
    for C30/37). This is an optional comparison, not an EN 1992 method, and
    never the pass/fail route: at high axial load it can be unconservative
    (about 0.92 where strain compatibility gives 1.00 at 0.6 NRd; see
    tests/test_safety_review.py).

    Args:
        NEd: design axial force, N.
        b: section width, mm.
        h: section depth, mm.
        f_cu: characteristic cube strength, MPa.
        All broadcast.

    """
    b, h, f_cu = _arr(b), _arr(h), _arr(f_cu)
    if not np.all((b > 0) & (h > 0) & (f_cu > 0)):
        msg = f"b, h and f_cu must be positive, got b={b} mm, h={h} mm, f_cu={f_cu} MPa"
        raise ValueError(msg)
    ratio = np.maximum(_arr(NEd), 0.0) / (b * h * f_cu)
    return np.interp(ratio, _BETA_N, _BETA_VALUES)  # type: ignore[no-any-return]  # numpy stubs: np.interp of an NDArray[Any] is Any


def enhanced_uniaxial_moment(
    NEd: ArrayLike,
    MEdy: ArrayLike,
    MEdz: ArrayLike,
    b: ArrayLike,
    h: ArrayLike,
    d_y: ArrayLike,
    d_z: ArrayLike,
    f_cu: ArrayLike,
) -> tuple[np.ndarray, np.ndarray]:
    """Enhanced uniaxial design moments (M'y, M'z), N mm; the other one is 0.

    BS 8110-1:1997, 3.8.4.5, Eqs. (40) and (41) (recalled from memory), for
    symmetrically reinforced rectangular sections. With h' = d_z (effective
    depth for bending about y) and b' = d_y (effective depth for bending
    about z):

    * if |MEdy|/h' >= |MEdz|/b': M'y = |MEdy| + beta (h'/b') |MEdz|, M'z = 0;
    * otherwise M'z = |MEdz| + beta (b'/h') |MEdy|, M'y = 0.

    Args:
        NEd: design axial force, N.
        MEdy: moment about y (lever arm along h), N mm.
        MEdz: moment about z (lever arm along b), N mm.
        b: width along y, mm.
        h: depth along z, mm.
        d_y: effective depth for bending about z (along b), mm (b').
        d_z: effective depth for bending about y (along h), mm (h').
        f_cu: cube strength, MPa.
        All broadcast.

    """
    My, Mz = np.abs(_arr(MEdy)), np.abs(_arr(MEdz))
    hp, bp = _arr(d_z), _arr(d_y)
    if not np.all((hp > 0) & (bp > 0)):
        msg = f"effective depths must be positive, got d_y={bp} mm, d_z={hp} mm"
        raise ValueError(msg)
    beta = beta_enhanced(NEd, b, h, f_cu)
    about_y = My / hp >= Mz / bp
    My_enh = np.where(about_y, My + beta * hp / bp * Mz, 0.0)
    Mz_enh = np.where(about_y, 0.0, Mz + beta * bp / hp * My)
    return My_enh, Mz_enh
