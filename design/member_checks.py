"""The phases of the member check of :func:`design.member.check_members`, for many pairs at once.

In the order the check runs them: the effective creep ratio
(5.8.4, Annex B, 3.1.4(4)), the design moment about one axis for one
imperfection case (5.8.8 with 5.8.3.1, 5.2(7), 6.1(4)), the direction-exact
biaxial utilisation on the resistance surface (6.1), shear (6.2),
the compressive stress limit (7.2(2)), link spacing (9.5.3), bar and link
rules (9.5.2, 9.5.3, 8.2), nominal cover and indicative strength (4.4.1,
Annex E) and fire (EN 1992-1-2, 5.3.2, method A). The checks take the per-pair
arrays ``g`` (rows of :class:`design.section_data.SectionData`) and return
:class:`design.results.CheckColumn` values, one per named check.

Units: N, mm, MPa, N mm. Compression positive.
"""

from __future__ import annotations

import dataclasses
from typing import Literal

import numpy as np

from design import cover, creep, detailing, fire, serviceability, shear
from design.cover import Exposure
from design.creep import CreepSettings
from design.fire import FireRating
from design.params import NationalParameters
from design.resistance import SectionBatch
from design.results import CheckColumn, CheckKind
from design.second_order import imperfections, nominal_curvature, slenderness

__all__ = [
    "frame_moments",
    "effective_creep",
    "axis_moments",
    "exact_biaxial",
    "stress_checks",
    "link_spacing",
    "link_spacing_checks",
    "shear_checks",
    "detailing_checks",
    "cover_checks",
    "fire_check",
]

Arrays = dict[str, np.ndarray]


def frame_moments(moments: Arrays) -> tuple[np.ndarray, np.ndarray]:
    """The larger first-order end moment about y and about z (magnitudes), N mm."""
    return (
        np.maximum(np.abs(moments["My_top"]), np.abs(moments["My_bot"])),
        np.maximum(np.abs(moments["Mz_top"]), np.abs(moments["Mz_bot"])),
    )


def effective_creep(
    g: Arrays,
    tr: serviceability.TransformedSection,
    NEd: np.ndarray,
    moments: Arrays,
    phi_ef_given: np.ndarray | None,
    M0Eqp_ratio: np.ndarray | None,
    conditions: CreepSettings,
) -> tuple[np.ndarray, dict[str, np.ndarray]]:
    """Effective creep ratio per pair and the values that explain it.

    EN 1992-1-1, 5.8.4 (Eq. (5.19)), Annex B, and 3.1.4(4): where the
    quasi-permanent compressive stress exceeds 0.45 fck at loading, creep is
    non-linear and phi(inf, t0) is raised by Eq. (3.7). The stress is that of
    the uncracked transformed section under the design actions scaled by
    M0Eqp/M0Ed (short-term modular ratio: on the safe side for the concrete).

    Args:
        g: per-pair section arrays.
        tr: uncracked transformed sections of the pairs.
        NEd: design axial force per pair, N.
        moments: first-order end moments per pair ("My_top", "My_bot", "Mz_top", "Mz_bot"), N mm.
        phi_ef_given: phi_ef given by the user per pair (-), or None to compute it.
        M0Eqp_ratio: M0Eqp/M0Ed per pair (-), or None (1.0, the upper bound).
        conditions: relative humidity, age at loading and cement class for Annex B.
    """
    n_pairs = len(NEd)
    perimeter = np.where(g["circ"], creep.perimeter_circle(g["b"]), creep.perimeter_rectangle(g["b"], g["h"]))
    h0 = creep.notional_size(g["Ac"], perimeter)
    phi_lin = creep.phi_inf_section(g["Ac"], perimeter, g["fck"] + 8.0, conditions)  # fcm, Table 3.1
    ratio_given = M0Eqp_ratio is not None
    ratio = M0Eqp_ratio if M0Eqp_ratio is not None else np.ones(n_pairs)
    my, mz = frame_moments(moments)
    stress = serviceability.sigma_c_uncracked(tr, np.maximum(NEd, 0.0) * ratio, my * ratio, mz * ratio, g["fctm"])
    k_sigma = np.maximum(stress.sigma_c_max, 0.0) / g["fck"]
    phi_inf = creep.phi_nonlinear(phi_lin, k_sigma)
    if phi_ef_given is not None:
        phi_ef = phi_ef_given
        source = "given"
    else:
        phi_ef = creep.phi_ef(phi_inf, ratio)
        source = (
            "Annex B, M0Eqp/M0Ed from the quasi-permanent and design combinations"
            if ratio_given
            else "Annex B, M0Eqp/M0Ed not given: 1.0 taken (upper bound)"
        )
    return phi_ef, {
        "phi_ef": phi_ef,
        "phi_inf": phi_inf,
        "phi_inf_linear": phi_lin,
        "h0": h0,
        "M0Eqp_ratio": ratio,
        "sigma_c_qp": stress.sigma_c_max,
        "k_sigma_qp": k_sigma,
        "creep_nonlinear": k_sigma > creep.K_SIGMA_LINEAR,
        "phi_ef_source": np.full(n_pairs, source),
        "creep_conditions": np.full(n_pairs, conditions.describe()),
    }


def axis_moments(
    NEd: np.ndarray,
    M_top: np.ndarray,
    M_bot: np.ndarray,
    l0: np.ndarray,
    i: np.ndarray,
    h_e0: np.ndarray,
    d: np.ndarray,
    fck: np.ndarray,
    fyd: np.ndarray,
    Es: np.ndarray,
    phi_ef: np.ndarray,
    n: np.ndarray,
    omega: np.ndarray,
    ei_: np.ndarray,
    with_imp: bool,
    with_e0: bool,
    use_rm: np.ndarray,
    braced: np.ndarray,
    c_fixed: float | None,
    params: NationalParameters,
) -> dict[str, np.ndarray]:
    """Design moment about one axis for one imperfection case (arrays; N, mm).

    EN 1992-1-1, 5.8.8 with 5.8.3.1, 5.2(7) and 6.1(4).

    rm = M01/M02 is taken from the first-order end moments including the
    imperfection moment NEd ei, which acts at both ends in the direction of
    M02; where the imperfection moment is at least the larger end moment of
    the analysis, the first-order moment is predominantly due to the
    imperfection and rm = 1 (5.8.3.1(1)). Unbraced members take C = 0.7 and
    MEd = M02 + M2 (the second-order moment adds at the end).
    """
    lam = slenderness.slenderness(l0, i)
    M01, M02 = nominal_curvature.first_order_end_moments(M_top, M_bot, NEd, ei_, with_imp)
    with np.errstate(divide="ignore", invalid="ignore"):
        rm_total = np.where(M02 > 0, M01 / np.where(M02 > 0, M02, 1.0), 1.0)
    m_imp = np.where(with_imp, np.maximum(NEd, 0.0) * ei_, 0.0)
    m_first = np.maximum(np.abs(M_top), np.abs(M_bot))
    predominantly_imp = with_imp & (m_imp >= m_first)
    rm = np.where(predominantly_imp, 1.0, np.clip(rm_total, -1.0, 1.0))
    rm = np.where(use_rm & braced, rm, 1.0)  # C = 0.7 where rm may not be used
    lim = slenderness.lambda_lim(n, phi_ef=phi_ef, omega=omega, r_m=rm, params=params)
    e0 = np.where(with_e0, imperfections.e0_min(h_e0), 0.0)
    kr = nominal_curvature.Kr(np.maximum(n, 0.0), omega)
    kphi = nominal_curvature.Kphi(phi_ef, fck, lam)
    curv = nominal_curvature.inv_r(kr, kphi, nominal_curvature.inv_r0(nominal_curvature.eps_yd(fyd, Es), d))
    c = nominal_curvature.c_curvature(rm_total) if c_fixed is None else np.full_like(NEd, c_fixed)
    e2 = nominal_curvature.e2(curv, l0, c)
    slender = (lam > lim.lambda_lim) & (NEd > 0)
    m2 = np.where(slender, nominal_curvature.M2(NEd, e2), 0.0)
    end_moment = np.maximum(M02 + m2, np.maximum(NEd, 0.0) * e0)  # unbraced: MEd = M02 + M2
    MEd = np.where(
        slender,
        np.where(braced, nominal_curvature.design_moment_second_order(NEd, M01, M02, m2, e0), end_moment),
        nominal_curvature.design_moment_first_order(NEd, M02, e0),
    )
    ones = np.ones_like(NEd)
    return {
        "lambda": lam,
        "lambda_lim": lim.lambda_lim,
        "A": lim.A * ones,
        "B": lim.B * ones,
        "C": lim.C * ones,
        "rm": rm * ones,
        "rm_imperfection": predominantly_imp * ones,
        "M01": M01,
        "M02": M02,
        "M0e": np.abs(nominal_curvature.M0e(M01, M02)),
        "e0": imperfections.e0_min(h_e0),
        "Kr": kr,
        "Kphi": kphi,
        "inv_r": curv,
        "c": c * ones,
        "e2": np.where(slender, e2, 0.0),
        "M2": m2,
        "MEd": MEd,
        "slender": slender,
    }


def exact_biaxial(sb: SectionBatch, idx: np.ndarray, NEd: np.ndarray, MEdy: np.ndarray, MEdz: np.ndarray) -> np.ndarray:
    """Utilisation |MEd| / |MRd| with MRd on the resistance surface in the direction of MEd.

    EN 1992-1-1, 6.1: the compression direction theta is found by bisection
    so that the resisting moment (MRdy, MRdz) points along (MEdy, MEdz);
    the sections are doubly symmetric, so the first quadrant suffices.
    """
    target = np.arctan2(np.abs(MEdz), np.abs(MEdy))  # angle of the demand from the y axis
    lo = np.zeros(len(idx))
    hi = np.full(len(idx), np.pi / 2)
    for _ in range(40):
        mid = 0.5 * (lo + hi)
        # theta measured from +y: theta = pi/2 compresses +z (pure MRdy).
        ok, my, mz = sb.resistance_at_angle(NEd, np.pi / 2 - mid, idx)
        ang = np.arctan2(np.abs(mz), np.abs(my))
        go_up = ang < target
        lo = np.where(go_up, mid, lo)
        hi = np.where(go_up, hi, mid)
    mres = np.hypot(my, mz)
    demand = np.hypot(MEdy, MEdz)
    return np.where(ok & (mres > 0), demand / np.where(mres > 0, mres, 1.0), np.where(demand > 0, np.inf, 0.0))


def stress_checks(
    g: Arrays,
    tr: serviceability.TransformedSection,
    NEd: np.ndarray,
    moments: Arrays,
    exposure: Exposure,
    char_ratio: np.ndarray | None,
    values: Arrays,
    params: NationalParameters,
) -> list[CheckColumn]:
    """Compressive stress under the characteristic combination, at most k1 fck in XD, XF, XS exposures.

    EN 1992-1-1, 7.2(2)

    Uncracked transformed section (short-term modular ratio) under the design actions times
    ``char_ratio`` (N and the larger first-order end moments; 1.0 when not given, on the safe side).
    Where the section cracks under those actions the uncracked stress is not valid and the check is
    flagged as not verified (a cracked-section stress is not computed here). No check outside the
    exposures that need the limit.

    Args:
        g: per-pair section arrays.
        tr: uncracked transformed sections of the pairs.
        NEd: design axial force per pair, N.
        moments: first-order end moments per pair, N mm.
        exposure: exposure classes of the member.
        char_ratio: characteristic over design actions per pair (-), or None (1.0).
        values: values of the check so far; the characteristic stress is added.
        params: national parameters (k1_stress).
    """
    if not serviceability.needs_characteristic_limit(exposure):
        return []
    n_pairs = len(NEd)
    given = char_ratio is not None
    ratio = char_ratio if char_ratio is not None else np.ones(n_pairs)
    my, mz = frame_moments(moments)
    s = serviceability.sigma_c_uncracked(tr, np.maximum(NEd, 0.0) * ratio, my * ratio, mz * ratio, g["fctm"])
    values["sigma_c_char"] = s.sigma_c_max
    limit = serviceability.sigma_c_limit_characteristic(g["fck"], params)
    basis = "characteristic actions" if given else "design actions (characteristic not given)"

    def note(i: int) -> str:
        if s.cracked[i]:
            return (
                f"section cracked under the {basis}: uncracked stress not valid, "
                "not verified (cracked-section stress not computed)"
            )
        return f"uncracked transformed section under the {basis}, {exposure.name}"

    return [
        CheckColumn(
            "compressive stress, characteristic combination",
            "EN 1992-1-1, 7.2(2)",
            "MPa",
            np.maximum(s.sigma_c_max, 0.0),
            limit,
            ~s.cracked,
            note,
            blocking=False,
            kind=CheckKind.DURABILITY,
        )
    ]


def link_spacing(
    g: Arrays, s_link: np.ndarray | None, s_link_zone: np.ndarray | None, params: NationalParameters
) -> tuple[np.ndarray, np.ndarray]:
    """Link spacing provided (general, and near beams/slabs and laps), mm.

    EN 1992-1-1, 9.5.3(3) and (4)

    Where not given: scl,tmax and 0.6 scl,tmax rounded down to 25 mm.

    Args:
        g: per-pair section arrays.
        s_link: general spacing given per pair, mm, or None.
        s_link_zone: spacing given near beams, slabs and laps per pair, mm, or None.
        params: national parameters.
    """
    b_min = np.minimum(g["b"], g["h"])
    smax = detailing.scl_tmax(g["dia_min"], b_min, False, params)
    szone = detailing.scl_tmax(g["dia_min"], b_min, True, params)
    s = 25.0 * np.floor(smax / 25.0 + 1e-9) if s_link is None else s_link
    sz = 25.0 * np.floor(szone / 25.0 + 1e-9) if s_link_zone is None else s_link_zone
    if np.any(s <= 0) or np.any(sz <= 0):
        msg = "link spacings s_link, s_link_zone must be positive (mm)"
        raise ValueError(msg)
    return s, sz


def link_spacing_checks(g: Arrays, s: np.ndarray, sz: np.ndarray, params: NationalParameters) -> list[CheckColumn]:
    """Given link spacings against scl,tmax and 0.6 scl,tmax.

    EN 1992-1-1, 9.5.3(3) and (4)
    """
    b_min = np.minimum(g["b"], g["h"])
    ones = np.ones(len(s), dtype=bool)
    return [
        CheckColumn(
            "link spacing",
            "EN 1992-1-1, 9.5.3(3)",
            "mm",
            s,
            detailing.scl_tmax(g["dia_min"], b_min, False, params),
            ones,
            "s <= scl,tmax = min(20 phi_min, b_min, 400 mm)",
            kind=CheckKind.DETAILING,
        ),
        CheckColumn(
            "link spacing near beams, slabs and laps",
            "EN 1992-1-1, 9.5.3(4)",
            "mm",
            sz,
            detailing.scl_tmax(g["dia_min"], b_min, True, params),
            ones,
            "s <= 0.6 scl,tmax over the larger column dimension next to a beam or slab and at laps",
            kind=CheckKind.DETAILING,
        ),
    ]


def shear_checks(
    g: Arrays,
    NEd: np.ndarray,
    moments: Arrays,
    l0y: np.ndarray,
    l0z: np.ndarray,
    l_clear: np.ndarray | None,
    braced: np.ndarray,
    s_link: np.ndarray,
    V_Ed: np.ndarray | None,
    values: Arrays,
    params: NationalParameters,
) -> list[CheckColumn]:
    """Shear from the end moments in each direction against VRd,c, or the links and the strut.

    EN 1992-1-1, 6.2.2(1) Eq. (6.2), 6.2.3(3) Eqs. (6.8), (6.9)

    VEd = (|M_top| + |M_bot|)/l plus any shear given (``V_Ed``; the sum of the end moments whatever
    their signs: on the safe side). Where the clear height is not known, l = l0 for braced members
    (l0 <= l) and l0/2 for unbraced ones (l0 <= 2 l). The links (two legs of the link bar, at the
    general spacing) are checked where VEd > VRd,c.

    Args:
        g: per-pair section arrays.
        NEd: design axial force per pair, N.
        moments: first-order end moments per pair, N mm.
        l0y: effective length about y per pair, mm.
        l0z: effective length about z per pair, mm.
        l_clear: clear height per pair, mm, or None.
        braced: braced member per pair.
        s_link: link spacing provided per pair, mm.
        V_Ed: shear force given besides that of the end moments per pair, N, or None.
        values: values of the check so far; the shear values are added.
        params: national parameters.
    """
    n_pairs = len(NEd)
    V_given = np.zeros(n_pairs) if V_Ed is None else np.abs(V_Ed)
    out = []
    fywd = g["fyd"]  # links of the same steel as the bars (common practice)
    Asw = 2.0 * np.pi * g["link"] ** 2 / 4.0
    for along, moment, bw, dv, asl, l0 in (
        ("z", "My", g["b"], g["dv_y"], g["Asl_y"], l0y),
        ("y", "Mz", g["h"], g["dv_z"], g["Asl_z"], l0z),
    ):
        length = l_clear if l_clear is not None else np.where(braced, l0, 0.5 * l0)
        VEd = shear.VEd_from_end_moments(moments[f"{moment}_top"], moments[f"{moment}_bot"], length, V_given)
        res = shear.shear_check_arrays(
            VEd, bw, dv, asl, NEd, g["Ac"], g["fck"], g["fcd"], Asw, s_link, fywd, params=params
        )
        for key in ("VEd", "VRd_c", "VRd_s", "VRd_max", "cot_theta"):
            values[f"{key}_{along}"] = getattr(res, key)
        values[f"shear_links_needed_{along}"] = res.needs_links

        def note(i: int, res: shear.ShearArrays = res, moment: str = moment) -> str:
            if not res.needs_links[i]:
                return (
                    f"VEd = (|{moment},top| + |{moment},bot|)/l <= VRd,c = {res.VRd_c[i] / 1e3:.0f} kN: "
                    "no shear links needed beyond those of 9.5.3"
                )
            return (
                f"VEd > VRd,c = {res.VRd_c[i] / 1e3:.0f} kN: links 2 legs @ {s_link[i]:g} mm carry it, "
                f"VRd,s = {res.VRd_s[i] / 1e3:.0f} kN, strut VRd,max = {res.VRd_max[i] / 1e3:.0f} kN "
                f"(cot theta = {res.cot_theta[i]:.2f})"
            )

        out.append(
            CheckColumn(
                f"shear along {along}",
                "EN 1992-1-1, 6.2.2 Eq. (6.2), 6.2.3 Eqs. (6.8), (6.9)",
                "kN",
                res.VEd / 1e3,
                res.capacity / 1e3,
                np.ones(n_pairs, dtype=bool),
                note,
            )
        )
    return out


def detailing_checks(
    g: Arrays,
    NEd: np.ndarray,
    lapped: bool,
    aggregate: float,
    params: NationalParameters,
    As_below: np.ndarray | None = None,
) -> list[CheckColumn]:
    """Bar and link rules: diameters, As,min, As,max (also at laps), number and spacing of bars.

    EN 1992-1-1, 9.5.2, 9.5.3(1) and 8.2(2).

    Args:
        g: per-pair section arrays.
        NEd: design axial force per pair, N.
        lapped: bars are lapped at the floor (As,max at laps, 9.5.2(3)).
        aggregate: maximum aggregate size dg, mm.
        params: national parameters.
        As_below: bars lapping in from the storey below per pair, mm2; None: the same bars.
    """
    n_pairs = len(NEd)
    ones = np.ones(n_pairs, dtype=bool)
    as_min = detailing.As_min(np.maximum(NEd, 0.0), g["fyd"], g["Ac"], params)
    out = [
        CheckColumn(
            "minimum bar diameter",
            "EN 1992-1-1, 9.5.2(1)",
            "mm",
            np.full(n_pairs, params.phi_min_long),
            g["dia_min"],
            ones,
            "phi >= phi_min",
        ),
        CheckColumn(
            "minimum longitudinal reinforcement",
            "EN 1992-1-1, 9.5.2(2)",
            "mm2",
            as_min,
            g["As"],
            ones,
            "As,min = max(0.10 NEd/fyd, 0.002 Ac)",
        ),
        CheckColumn(
            "maximum longitudinal reinforcement",
            "EN 1992-1-1, 9.5.2(3)",
            "mm2",
            g["As"],
            detailing.As_max(g["Ac"], False, params),
            ones,
            "As <= 0.04 Ac outside laps",
        ),
    ]
    if lapped:
        below = g["As"] if As_below is None else As_below
        note = "bars below and this storey's bars in the lap zone: As,below + As <= 0.08 Ac " + (
            "(bars below taken equal to this storey's; a schedule checks the real pair)"
            if As_below is None
            else "(bars below as given)"
        )
        out.append(
            CheckColumn(
                "maximum reinforcement at laps",
                "EN 1992-1-1, 9.5.2(3)",
                "mm2",
                below + g["As"],
                detailing.As_max(g["Ac"], True, params),
                ones,
                note,
            )
        )
    n_min = np.where(g["circ"], 6.0, 4.0)
    spacing = detailing.min_clear_spacing(g["dia_max"], aggregate, params)
    out += [
        CheckColumn(
            "number of bars",
            "EN 1992-1-1, 9.5.2(4)",
            "bars",
            n_min,
            g["n_bars"].astype(float),
            ones,
            "at least 4 bars (rectangular), 6 (circular)",
        ),
        CheckColumn(
            "clear spacing of bars",
            "EN 1992-1-1, 8.2(2)",
            "mm",
            spacing,
            np.maximum(g["min_gap"], 0.0),
            ones,
            f"max(k1 phi, dg + k2, 20 mm), dg = {aggregate:g} mm",
        ),
        CheckColumn(
            "link diameter",
            "EN 1992-1-1, 9.5.3(1)",
            "mm",
            detailing.link_dia_min(g["dia_max"]),
            g["link"],
            ones,
            "max(6 mm, phi_max/4)",
        ),
    ]
    return [dataclasses.replace(c, kind=CheckKind.DETAILING) for c in out]


def cover_checks(
    g: Arrays, exposure: Exposure, aggregate: float, working_life_100y: bool, params: NationalParameters
) -> list[CheckColumn]:
    """Nominal cover (4.4.1) and the indicative strength class (Annex E) of the exposure.

    EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2), Tables 4.3N, 4.4N and Annex E.

    Args:
        g: per-pair section arrays.
        exposure: exposure classes of the member.
        aggregate: maximum aggregate size dg, mm.
        working_life_100y: design working life of 100 years (Table 4.3N).
        params: national parameters.
    """
    dur = cover.cmin_dur_for(exposure, g["fck"], working_life_100y, False, False, params)
    req_link = cover.cnom(cover.cmin(cover.cmin_b(g["link"], aggregate), dur.cmin_dur, params), params)
    req_main = cover.cnom(cover.cmin(cover.cmin_b(g["dia_max"], aggregate), dur.cmin_dur, params), params)
    ones = np.ones(len(g["b"]), dtype=bool)

    def note(i: int) -> str:
        return (
            f"{exposure.name}: S{int(dur.s_class[i])} for {dur.governing[i]}, cmin,dur = {float(dur.cmin_dur[i]):g} mm"
        )

    strength = cover.check_indicative_strength(exposure, float(np.max(g["fck"])))
    need = cover.indicative_fck(exposure)
    return [
        CheckColumn(
            "nominal cover to links",
            "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
            "mm",
            req_link,
            g["cover"],
            ones,
            note,
            kind=CheckKind.COVER,
        ),
        CheckColumn(
            "nominal cover to main bars",
            "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)",
            "mm",
            req_main,
            g["cover"] + g["link"],
            ones,
            note,
            kind=CheckKind.COVER,
        ),
        CheckColumn(
            strength.name,
            strength.clause,
            "MPa",
            np.full(len(g["b"]), need),
            g["fck"],
            ones,
            strength.note,
            kind=CheckKind.DURABILITY,
        ),
    ]


def fire_check(
    g: Arrays,
    NEd: np.ndarray,
    values: Arrays,
    rating: FireRating,
    mu_fi: float | np.ndarray,
    outside_method: Literal["fail", "flag"],
    params: NationalParameters,
) -> CheckColumn:
    """Fire resistance by the tabulated data of method A, vectorised over pairs for one rating.

    EN 1992-1-2, 5.3.2, Table 5.2a, with the conditions of use of 5.3.2(2):
    l0,fi <= 3 m, first-order eccentricity e <= e_max b (or h), As < 0.04 Ac.

    Args:
        g: per-pair section arrays.
        NEd: design axial force per pair, N.
        values: values of the check so far (l0_fi, M02_y, M02_z, ei_y, ei_z, imperfection_axis); the
            axis distances are added.
        rating: standard fire resistance.
        mu_fi: degree of utilisation in fire (-), one value or one per pair; each pair takes the
            column of Table 5.2a at or above its mu_fi (0.2, 0.5, 0.7: no interpolation, on the safe side).
        outside_method: where method A does not apply, "fail" the check or "flag" it as not verified.
        params: national parameters (e_max_fire_factor).
    """
    n_pairs = len(NEd)
    a = g["a_fire_min"]  # each bar's own axis distance: the smallest must meet the table (5.2(15))
    values["a_fire_min"] = a
    values["a_fire_mean"] = g["a_fire_mean"]
    width = np.minimum(g["b"], g["h"])
    l0_fi = values["l0_fi"]
    with np.errstate(divide="ignore", invalid="ignore"):
        Npos = np.where(NEd > 0, NEd, np.inf)
        # First-order eccentricities in fire, taken as the ULS first-order ones (imperfection excluded).
        e_z = (
            np.maximum(
                np.abs(values["M02_y"]) - values["ei_y"] * np.maximum(NEd, 0) * (values["imperfection_axis"] == "y"),
                0.0,
            )
            / Npos
        )
        e_y = (
            np.maximum(
                np.abs(values["M02_z"]) - values["ei_z"] * np.maximum(NEd, 0) * (values["imperfection_axis"] == "z"),
                0.0,
            )
            / Npos
        )
    kmax = params.e_max_fire_factor
    bad = np.stack(
        [
            l0_fi > fire.L0_FI_MAX_TABLE_MM,
            e_z > kmax * g["h"],
            e_y > kmax * g["b"],
            g["As"] >= fire.RHO_MAX_FIRE * g["Ac"],
        ],
        axis=1,
    )
    cond = np.asarray(~bad.any(axis=1))
    mu = np.broadcast_to(np.asarray(mu_fi, dtype=float), (n_pairs,))
    values["mu_fi"] = mu.copy()
    col = np.full(n_pairs, np.nan)  # the column of Table 5.2a each pair reads
    demand = np.full(n_pairs, np.inf)
    has_values = np.zeros(n_pairs, dtype=bool)
    lower = -np.inf
    for m in (0.2, 0.5, 0.7):
        here = (mu > lower + 1e-12) & (mu <= m + 1e-12)
        lower = m
        col[here] = m
        options = fire.TABLE_5_2A[rating][m]
        has_values |= here & bool(options)
        for bmin, amin, needs8 in options:
            usable = here & (width >= bmin) & ((g["n_bars"] >= 8) | (not needs8))
            demand = np.where(usable, np.minimum(demand, amin), demand)
    applicable = cond & has_values

    def reasons(i: int) -> str:
        if not has_values[i]:
            return f"Table 5.2a gives no value for {rating.name} at mu_fi = {mu[i]:.2f}"
        if cond[i]:
            if np.isfinite(demand[i]):
                return (
                    f"axis distance of the nearest bar a = c + phi_link + phi/2 = {a[i]:g} mm "
                    f"(area-weighted mean am = {g['a_fire_mean'][i]:.1f} mm, Eq. (5.5)); "
                    f"mu_fi = {mu[i]:.2f}: column {col[i]:g}, width {width[i]:g} mm"
                )
            return "section narrower than every bmin of Table 5.2a (or fewer than 8 bars)"
        why = [
            f"l0,fi = {l0_fi[i]:,.0f} mm > 3000 mm",
            f"e = {e_z[i]:.0f} mm > {kmax:g} h",
            f"e = {e_y[i]:.0f} mm > {kmax:g} b",
            "As >= 0.04 Ac",
        ]
        return "method A does not apply: " + "; ".join(w for w, b in zip(why, bad[i], strict=True) if b)

    dem = np.where(np.isfinite(demand), demand, 1e6)
    return CheckColumn(
        f"fire resistance {rating.name}",
        "EN 1992-1-2, 5.3.2, Table 5.2a",
        "mm",
        dem,
        a,
        applicable,
        reasons,
        blocking=outside_method == "fail",
        kind=CheckKind.FIRE,
    )
