"""Shear resistance of columns, EN 1992-1-1, 6.2.

A column without transverse load carries the shear that its end moments
imply (:func:`VEd_from_end_moments`). The resistance follows 6.2.2 for the
concrete alone (VRd,c, Eqs. (6.2a), (6.2b)) and 6.2.3 for members with
vertical links (VRd,s, Eq. (6.8); VRd,max, Eq. (6.9)) with the strut angle
chosen as flat as the strut allows (:func:`cot_theta_for`).

Where VEd <= VRd,c no shear reinforcement is needed by calculation (6.2.1(4));
a column always carries the links of 9.5.3, which are then enough. Where
VEd > VRd,c the links provided must carry the whole shear (VEd <= VRd,s) and
the struts must not crush (VEd <= VRd,max); the concrete term is then not
added (6.2.3(1): the truss model alone).

Each direction of shear is checked on its own with the width bw across the
shear and the effective depth d along it (common practice; EN 1992-1-1 gives
no interaction rule for shear in two directions of a column).

Units: N, mm, MPa. Compression positive (NEd > 0, sigma_cp > 0). Every value
function takes floats or numpy arrays and broadcasts over its numeric
arguments.

Signs of end moments follow :mod:`design.second_order.slenderness`: the two values of the
first-order bending-moment diagram at the ends, in the same sense (same sign
= single curvature).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters
from design.results import CheckKind, CheckResult

__all__ = [
    "ShearArrays",
    "VEd_from_end_moments",
    "k_size",
    "rho_l",
    "sigma_cp",
    "v_min",
    "VRd_c",
    "nu_1",
    "alpha_cw",
    "VRd_s",
    "VRd_max",
    "cot_theta_for",
    "z_lever_arm",
    "shear_check_arrays",
    "check_shear",
]

RHO_L_MAX = 0.02  # EN 1992-1-1, 6.2.2(1): rho_l <= 0.02
K_SIZE_MAX = 2.0  # EN 1992-1-1, 6.2.2(1): k <= 2.0
SIGMA_CP_CAP = 0.2  # EN 1992-1-1, 6.2.2(1): sigma_cp < 0.2 fcd
Z_FACTOR = 0.9  # EN 1992-1-1, 6.2.3(1): z = 0.9 d may normally be used


def _arr(x: ArrayLike) -> NDArray[np.float64]:
    return np.asarray(x, dtype=float)


def _require(ok: np.ndarray | bool, msg: Callable[[], str]) -> None:
    """Raise ValueError(msg()) unless ``ok`` holds everywhere (the message is built only then)."""
    if not np.all(ok):
        raise ValueError(msg())


# --------------------------------------------------------------------------
# Design shear force
# --------------------------------------------------------------------------


def VEd_from_end_moments(
    M_top: ArrayLike, M_bot: ArrayLike, l: ArrayLike, V_given: ArrayLike = 0.0, conservative: bool = True
) -> NDArray[np.float64]:
    """Design shear force of a column from its end moments, N.

    EN 1992-1-1, 6.2.1(1) (VEd from the analysis); equilibrium of a member without transverse load.

    With the moment-diagram sign convention of :mod:`design.second_order.slenderness`
    (same sign at both ends = single curvature) the shear of a member with
    end moments M_top, M_bot and no transverse load is |M_top - M_bot| / l:
    the moments add in double curvature and subtract in single curvature.

    - ``conservative=True`` (default): (|M_top| + |M_bot|) / l + |V_given|,
      the largest shear either sign convention could give; safe when the
      signs of the end moments are not reliable (for instance envelopes of
      several load cases, where the end values need not come from one case).
    - ``conservative=False``: |M_top - M_bot| / l + |V_given|, exact for one
      load case with consistently signed end moments.

    Args:
        M_top: first-order moment at the top end, N mm.
        M_bot: first-order moment at the bottom end, N mm (same sense).
        l: clear height between the end restraints, mm.
        V_given: any further shear given by the analysis (transverse load),
            N; its magnitude is added.
        conservative: see above.
        All numeric arguments broadcast.

    """
    M_top, M_bot, l, V_given = _arr(M_top), _arr(M_bot), _arr(l), _arr(V_given)
    _require(l > 0, lambda: f"clear height l must be positive, got l={l} mm")
    M = np.abs(M_top) + np.abs(M_bot) if conservative else np.abs(M_top - M_bot)
    return M / l + np.abs(V_given)


# --------------------------------------------------------------------------
# Members not requiring design shear reinforcement, 6.2.2
# --------------------------------------------------------------------------


def k_size(d: ArrayLike) -> NDArray[np.float64]:
    """Size factor k = min(1 + sqrt(200/d), 2.0) (-).

    EN 1992-1-1, 6.2.2(1), Eq. (6.2a)

    Args:
        d: effective depth, mm. Broadcasts.

    """
    d = _arr(d)
    _require(d > 0, lambda: f"effective depth d must be positive, got d={d} mm")
    return np.minimum(1.0 + np.sqrt(200.0 / d), K_SIZE_MAX)


def rho_l(Asl: ArrayLike, bw: ArrayLike, d: ArrayLike) -> NDArray[np.float64]:
    """Longitudinal tension reinforcement ratio rho_l = min(Asl / (bw d), 0.02) (-).

    EN 1992-1-1, 6.2.2(1), Eq. (6.2a)

    Args:
        Asl: area of the tension reinforcement, mm2 (for a column: the bars on
            the tension face only, see :func:`VRd_c`).
        bw: smallest width of the section in the tensile area, mm.
        d: effective depth, mm.
        All arguments broadcast.

    """
    Asl, bw, d = _arr(Asl), _arr(bw), _arr(d)
    _require(Asl >= 0, lambda: f"Asl must not be negative, got Asl={Asl} mm2")
    _require((bw > 0) & (d > 0), lambda: f"bw and d must be positive, got bw={bw} mm, d={d} mm")
    return np.minimum(Asl / (bw * d), RHO_L_MAX)


def sigma_cp(NEd: ArrayLike, Ac: ArrayLike, fcd: ArrayLike) -> NDArray[np.float64]:
    """Axial stress sigma_cp = min(NEd / Ac, 0.2 fcd), MPa (compression positive).

    EN 1992-1-1, 6.2.2(1), Eq. (6.2a)

    Tension gives a negative sigma_cp, which is kept (it lowers VRd,c); only
    compression is capped at 0.2 fcd.

    Args:
        NEd: axial force due to loading, N (> 0 compression).
        Ac: area of the concrete section, mm2.
        fcd: design compressive strength, MPa.
        All arguments broadcast.

    """
    NEd, Ac, fcd = _arr(NEd), _arr(Ac), _arr(fcd)
    _require((Ac > 0) & (fcd > 0), lambda: f"Ac and fcd must be positive, got Ac={Ac} mm2, fcd={fcd} MPa")
    return np.minimum(NEd / Ac, SIGMA_CP_CAP * fcd)


def v_min(k: ArrayLike, fck: ArrayLike, params: NationalParameters = EN_RECOMMENDED) -> NDArray[np.float64]:
    """Minimum shear stress resistance v_min = 0.035 k^1.5 fck^0.5, MPa.

    EN 1992-1-1, Eq. (6.3N)

    Args:
        k: size factor from :func:`k_size` (-).
        fck: characteristic cylinder strength, MPa.
        params: national parameters (v_min_factor, 0.035 recommended).
        k and fck broadcast.

    """
    k, fck = _arr(k), _arr(fck)
    _require(fck > 0, lambda: f"fck must be positive, got fck={fck} MPa")
    return params.v_min_factor * k**1.5 * np.sqrt(fck)


def VRd_c(
    bw: ArrayLike,
    d: ArrayLike,
    Asl: ArrayLike,
    NEd: ArrayLike,
    Ac: ArrayLike,
    fck: ArrayLike,
    fcd: ArrayLike,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.float64]:
    """Shear resistance of the concrete without shear reinforcement, N.

    EN 1992-1-1, Eqs. (6.2a) and (6.2b)
    VRd,c = [CRd,c k (100 rho_l fck)^(1/3) + k1 sigma_cp] bw d
    >= (v_min + k1 sigma_cp) bw d, with CRd,c = 0.18 / gamma_c and k1 = 0.15
    recommended (6.2.2(1), Note).

    For a column Asl is taken, simply and on the safe side, as the bars on
    the tension face only (the face opposite the compression for the
    direction of shear considered); side-face bars are not counted. Where
    axial tension makes the expression negative the resistance is taken as
    zero (a negative resistance has no meaning; common practice).

    Args:
        bw: width of the section across the shear, mm.
        d: effective depth along the shear, mm.
        Asl: tension reinforcement, mm2.
        NEd: axial force, N (> 0 compression).
        Ac: concrete area, mm2.
        fck: characteristic cylinder strength, MPa.
        fcd: design compressive strength, MPa (caps sigma_cp at 0.2 fcd).
        params: national parameters (gamma_c, C_Rdc_factor, k1_shear,
            v_min_factor).
        All numeric arguments broadcast.

    """
    bw, d, fck = _arr(bw), _arr(d), _arr(fck)
    k = k_size(d)
    s_cp = sigma_cp(NEd, Ac, fcd)
    C_Rdc = params.C_Rdc_factor / params.gamma_c
    v_c = C_Rdc * k * np.cbrt(100.0 * rho_l(Asl, bw, d) * fck)
    v = np.maximum(v_c, v_min(k, fck, params)) + params.k1_shear * s_cp
    return np.maximum(v, 0.0) * bw * d


# --------------------------------------------------------------------------
# Members requiring design shear reinforcement, 6.2.3 (vertical links)
# --------------------------------------------------------------------------


def nu_1(fck: ArrayLike) -> NDArray[np.float64]:
    """Strength reduction factor for concrete cracked in shear, nu_1 = nu = 0.6 (1 - fck/250) (-).

    EN 1992-1-1, Eq. (6.6N); 6.2.3(3), Note 1 (recommended nu_1 = nu)

    The alternative nu_1 of Note 2 (Eqs. (6.10aN/bN), when the design stress
    of the links is below 0.8 fyk) is not used.

    Args:
        fck: characteristic cylinder strength, MPa. Broadcasts.

    """
    fck = _arr(fck)
    _require(fck > 0, lambda: f"fck must be positive, got fck={fck} MPa")
    return 0.6 * (1.0 - fck / 250.0)


def alpha_cw(sigma_cp: ArrayLike, fcd: ArrayLike, axial_compression: bool = True) -> NDArray[np.float64]:
    """Coefficient for the state of stress in the compression chord alpha_cw (-).

    EN 1992-1-1, 6.2.3(3), Note 3, Eqs. (6.11aN), (6.11bN), (6.11cN)

    Note 3 recommends alpha_cw = 1 "for non-prestressed structures" and
    1 + sigma_cp/fcd for 0 < sigma_cp <= 0.25 fcd, 1.25 for 0.25 fcd <
    sigma_cp <= 0.5 fcd, 2.5 (1 - sigma_cp/fcd) for 0.5 fcd < sigma_cp <=
    1.0 fcd, "where sigma_cp is the mean compressive stress, measured
    positive, in the concrete due to the design axial force".

    ``axial_compression=True`` (default) uses the sigma_cp expressions: a
    column is an axially compressed member and the Note defines sigma_cp by
    the design axial force, not by prestress. This matters for safety: above
    sigma_cp = 0.6 fcd the expression falls below 1 (to 0 at fcd), so taking
    alpha_cw = 1 for a heavily loaded column would overstate VRd,max. The
    reading that "non-prestressed structures" covers every reinforced column
    (alpha_cw = 1 throughout) is available with ``axial_compression=False``.
    Which reading a National Annex intends is not settled by the EN text
    (interpretation, not confirmed against a national annex). No tension
    (sigma_cp <= 0) gives 1; sigma_cp >= fcd gives 0.

    Args:
        sigma_cp: mean compressive stress NEd / Ac, MPa (> 0 compression),
            not capped at 0.2 fcd.
        fcd: design compressive strength, MPa.
        axial_compression: use the sigma_cp expressions (see above).
        sigma_cp and fcd broadcast.

    """
    s, fcd = _arr(sigma_cp), _arr(fcd)
    _require(fcd > 0, lambda: f"fcd must be positive, got fcd={fcd} MPa")
    if not axial_compression:
        return np.ones(np.broadcast(s, fcd).shape)
    r = s / fcd
    return np.select([r <= 0.0, r <= 0.25, r <= 0.5, r <= 1.0], [1.0, 1.0 + r, 1.25, 2.5 * (1.0 - r)], default=0.0)


def VRd_s(Asw: ArrayLike, s: ArrayLike, z: ArrayLike, fywd: ArrayLike, cot_theta: ArrayLike) -> NDArray[np.float64]:
    """Shear resistance of vertical links VRd,s = (Asw / s) z fywd cot(theta), N.

    EN 1992-1-1, Eq. (6.8)

    Args:
        Asw: area of one set of links across the shear (legs x bar area), mm2.
        s: spacing of the links, mm.
        z: lever arm, mm (0.9 d, see :func:`z_lever_arm`).
        fywd: design yield strength of the links, MPa.
        cot_theta: cot of the strut angle (-), 1 to cot_theta_max.
        All arguments broadcast.

    """
    Asw, s, z, fywd, cot = _arr(Asw), _arr(s), _arr(z), _arr(fywd), _arr(cot_theta)
    _require(Asw >= 0, lambda: f"Asw must not be negative, got Asw={Asw} mm2")
    _require(
        (s > 0) & (z > 0) & (fywd > 0),
        lambda: f"s, z and fywd must be positive, got s={s} mm, z={z} mm, fywd={fywd} MPa",
    )
    return Asw / s * z * fywd * cot


def VRd_max(
    bw: ArrayLike, z: ArrayLike, fcd: ArrayLike, nu1: ArrayLike, alpha_cw: ArrayLike, cot_theta: ArrayLike
) -> NDArray[np.float64]:
    """Crushing resistance of the struts VRd,max = alpha_cw bw z nu_1 fcd / (cot + tan), N.

    EN 1992-1-1, Eq. (6.9) (vertical links)

    Args:
        bw: width across the shear, mm.
        z: lever arm, mm.
        fcd: design compressive strength, MPa.
        nu1: strength reduction factor :func:`nu_1` (-).
        alpha_cw: coefficient :func:`alpha_cw` (-).
        cot_theta: cot of the strut angle (-), > 0.
        All arguments broadcast.

    """
    bw, z, fcd, nu1, acw, cot = _arr(bw), _arr(z), _arr(fcd), _arr(nu1), _arr(alpha_cw), _arr(cot_theta)
    _require(cot > 0, lambda: f"cot(theta) must be positive, got {cot} (-)")
    return acw * bw * z * nu1 * fcd / (cot + 1.0 / cot)


def cot_theta_for(
    VEd: ArrayLike,
    bw: ArrayLike,
    z: ArrayLike,
    fcd: ArrayLike,
    nu1: ArrayLike,
    alpha_cw: ArrayLike,
    params: NationalParameters = EN_RECOMMENDED,
) -> NDArray[np.float64]:
    """Largest cot(theta) in [1, cot_theta_max] with VRd,max >= VEd; nan where none (-).

    EN 1992-1-1, Eq. (6.9) solved for cot(theta); limits 6.2.3(2), Eq. (6.7N)

    With A = alpha_cw bw z nu_1 fcd, Eq. (6.9) reads VRd,max = A c / (1 + c^2)
    for c = cot(theta), largest at c = 1 (A/2) and falling for c > 1. The
    condition VEd (1 + c^2) <= A c holds for c up to the larger root
    c+ = (A + sqrt(A^2 - 4 VEd^2)) / (2 VEd); the result is
    min(c+, cot_theta_max), cot_theta_max where VEd = 0, and nan where
    A < 2 VEd (the strut crushes even at theta = 45 degrees). The flattest
    admissible strut gives the largest VRd,s (Eq. (6.8) grows with cot).

    Args:
        VEd: design shear force, N (its magnitude is used).
        bw: width across the shear, mm.
        z: lever arm, mm.
        fcd: design compressive strength, MPa.
        nu1: strength reduction factor (-).
        alpha_cw: coefficient (-).
        params: national parameters (cot_theta_max).
        All numeric arguments broadcast.

    """
    V = np.abs(_arr(VEd))
    A = _arr(alpha_cw) * _arr(bw) * _arr(z) * _arr(nu1) * _arr(fcd)
    V, A = np.broadcast_arrays(V, A)
    disc = A * A - 4.0 * V * V
    with np.errstate(divide="ignore", invalid="ignore"):
        c_plus = np.where(V > 0, (A + np.sqrt(np.maximum(disc, 0.0))) / (2.0 * V), np.inf)
    c = np.minimum(c_plus, params.cot_theta_max)
    return np.where(disc >= 0.0, c, np.nan)


def z_lever_arm(d: ArrayLike) -> NDArray[np.float64]:
    """Inner lever arm for shear z = 0.9 d, mm.

    EN 1992-1-1, 6.2.3(1) (approximate value that may normally be used)

    Args:
        d: effective depth, mm. Broadcasts.

    """
    d = _arr(d)
    _require(d > 0, lambda: f"effective depth d must be positive, got d={d} mm")
    return Z_FACTOR * d


# --------------------------------------------------------------------------
# Checks
# --------------------------------------------------------------------------


@dataclass(frozen=True)
class ShearArrays:
    """Shear check of many (cell, candidate) pairs, one direction; arrays of one shape.

    Attributes:
        VEd: design shear force, N.
        VRd_c: resistance without shear reinforcement, Eq. (6.2), N.
        VRd_s: resistance of the links provided at ``cot_theta``, Eq. (6.8), N.
        VRd_max: strut crushing resistance at ``cot_theta``, Eq. (6.9), N.
        cot_theta: strut inclination used: the largest admissible one
            (:func:`cot_theta_for`), or 1 where even theta = 45 degrees does
            not satisfy VRd,max >= VEd (the strut check then fails).
        needs_links: VEd > VRd,c, so the links must carry the shear (6.2.3).
        utilisation: VEd / VRd,c where no links are needed, else
            max(VEd / VRd,s, VEd / VRd,max); inf where the governing
            resistance is zero and VEd > 0.
    """

    VEd: np.ndarray
    VRd_c: np.ndarray
    VRd_s: np.ndarray
    VRd_max: np.ndarray
    cot_theta: np.ndarray
    needs_links: np.ndarray
    utilisation: np.ndarray

    @property
    def capacity(self) -> NDArray[np.float64]:
        """Governing resistance, N: VRd,c, or min(VRd,s, VRd,max) where links are needed."""
        return np.where(self.needs_links, np.minimum(self.VRd_s, self.VRd_max), self.VRd_c)

    @property
    def governs(self) -> NDArray[np.str_]:
        """Which resistance governs each pair: "concrete", "links" or "strut"."""
        links_or_strut = np.where(self.VRd_s <= self.VRd_max, "links", "strut")
        return np.where(self.needs_links, links_or_strut, "concrete")

    @property
    def ok(self) -> NDArray[np.bool_]:
        """True where the shear check passes."""
        return self.utilisation <= 1.0 + 1e-12


def _ratio(demand: np.ndarray, capacity: np.ndarray) -> NDArray[np.float64]:
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(capacity > 0, demand / np.where(capacity > 0, capacity, 1.0), np.where(demand > 0, np.inf, 0.0))


def shear_check_arrays(
    VEd: ArrayLike,
    bw: ArrayLike,
    d: ArrayLike,
    Asl: ArrayLike,
    NEd: ArrayLike,
    Ac: ArrayLike,
    fck: ArrayLike,
    fcd: ArrayLike,
    Asw: ArrayLike,
    s: ArrayLike,
    fywd: ArrayLike,
    z: ArrayLike | None = None,
    params: NationalParameters = EN_RECOMMENDED,
    axial_compression: bool = True,
) -> ShearArrays:
    """Shear check of a column in one direction, vectorised over pairs.

    EN 1992-1-1, 6.2.1(4), 6.2.2(1) Eq. (6.2), 6.2.3(3) Eqs. (6.8), (6.9)

    Args:
        VEd: design shear force, N (magnitude used).
        bw: width across the shear, mm.
        d: effective depth along the shear, mm.
        Asl: bars on the tension face, mm2 (see :func:`VRd_c`).
        NEd: axial force, N (> 0 compression).
        Ac: concrete area, mm2.
        fck: characteristic cylinder strength, MPa.
        fcd: design compressive strength, MPa.
        Asw: area of one set of links across the shear (legs x bar area), mm2.
        s: link spacing, mm.
        fywd: design yield strength of the links, MPa.
        z: lever arm, mm; None takes 0.9 d (6.2.3(1)).
        params: national parameters.
        axial_compression: alpha_cw from sigma_cp (default) or 1, see
            :func:`alpha_cw`.
        All numeric arguments broadcast; the result has their common shape.

    """
    V = np.abs(_arr(VEd))
    d = _arr(d)
    z = z_lever_arm(d) if z is None else _arr(z)
    Ac, fcd, fck = _arr(Ac), _arr(fcd), _arr(fck)
    vrdc = VRd_c(bw, d, Asl, NEd, Ac, fck, fcd, params)
    nu1 = nu_1(fck)
    acw = alpha_cw(_arr(NEd) / Ac, fcd, axial_compression)
    cot = cot_theta_for(V, bw, z, fcd, nu1, acw, params)
    cot = np.where(np.isnan(cot), 1.0, cot)
    vrds = VRd_s(Asw, s, z, fywd, cot)
    vrdmax = VRd_max(bw, z, fcd, nu1, acw, cot)
    V, vrdc, vrds, vrdmax, cot = np.broadcast_arrays(V, vrdc, vrds, vrdmax, cot)
    needs = V > vrdc
    util = np.where(needs, np.maximum(_ratio(V, vrds), _ratio(V, vrdmax)), _ratio(V, vrdc))
    return ShearArrays(
        VEd=V.copy(),
        VRd_c=vrdc.copy(),
        VRd_s=vrds.copy(),
        VRd_max=vrdmax.copy(),
        cot_theta=cot.copy(),
        needs_links=needs,
        utilisation=util,
    )


def check_shear(
    VEd: float,
    bw: float,
    d: float,
    Asl: float,
    NEd: float,
    Ac: float,
    fck: float,
    fcd: float,
    Asw: float,
    s: float,
    fywd: float,
    z: float | None = None,
    params: NationalParameters = EN_RECOMMENDED,
    axial_compression: bool = True,
    direction: str = "",
) -> list[CheckResult]:
    """Shear checks of one column in one direction, as :class:`CheckResult` values.

    EN 1992-1-1, 6.2

    Returns ["shear, concrete only"] where VEd <= VRd,c (no links needed
    beyond those of 9.5.3), else ["shear, links", "shear, strut"] (the
    concrete term is then not counted). All are of kind RESISTANCE, in N.

    Args:
        VEd: design shear force, N.
        bw: width across the shear, mm.
        d: effective depth along the shear, mm.
        Asl: bars on the tension face, mm2.
        NEd: axial force, N (> 0 compression).
        Ac: concrete area, mm2.
        fck: characteristic cylinder strength, MPa.
        fcd: design compressive strength, MPa.
        Asw: area of one set of links across the shear, mm2.
        s: link spacing, mm.
        fywd: design yield strength of the links, MPa.
        z: lever arm, mm; None takes 0.9 d.
        params: national parameters.
        axial_compression: see :func:`alpha_cw`.
        direction: label appended to the names, e.g. "y" (optional).

    """
    r = shear_check_arrays(VEd, bw, d, Asl, NEd, Ac, fck, fcd, Asw, s, fywd, z, params, axial_compression)
    suffix = f" ({direction})" if direction else ""
    V, vrdc, vrds, vrdmax, cot = (float(r.VEd), float(r.VRd_c), float(r.VRd_s), float(r.VRd_max), float(r.cot_theta))
    extra: dict[str, object] = {"VRd_c": vrdc, "VRd_s": vrds, "VRd_max": vrdmax, "cot_theta": cot}
    if not bool(r.needs_links):
        return [
            CheckResult(
                f"shear, concrete only{suffix}",
                "EN 1992-1-1, 6.2.2(1), Eqs. (6.2a), (6.2b)",
                demand=V,
                capacity=vrdc,
                unit="N",
                note="VEd <= VRd,c: no shear links needed beyond those of 9.5.3 (6.2.1(4))",
                extra=extra,
                kind=CheckKind.RESISTANCE,
            )
        ]
    # cot_theta_for gives nan (then 1 is used) only where VRd,max(cot = 1) < VEd.
    strut_note = (
        f"cot(theta) = {cot:.3g}, the flattest strut with VRd,max >= VEd"
        if vrdmax >= V
        else "the strut crushes even at cot(theta) = 1 (theta = 45 degrees)"
    )
    return [
        CheckResult(
            f"shear, links{suffix}",
            "EN 1992-1-1, 6.2.3(3), Eq. (6.8)",
            demand=V,
            capacity=vrds,
            unit="N",
            note=f"VEd > VRd,c = {vrdc:.4g} N; Asw/s = {Asw / s:.4g} mm2/mm, cot(theta) = {cot:.3g}",
            extra=extra,
            kind=CheckKind.RESISTANCE,
        ),
        CheckResult(
            f"shear, strut{suffix}",
            "EN 1992-1-1, 6.2.3(3), Eq. (6.9)",
            demand=V,
            capacity=vrdmax,
            unit="N",
            note=strut_note,
            extra=extra,
            kind=CheckKind.RESISTANCE,
        ),
    ]
