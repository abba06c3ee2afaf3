"""The steps of the calculation sheet, one builder per section, and the number formats they share.

Each builder takes the member check's values (``ColumnCheck.values``, a dict keyed by symbol) and
returns the :class:`Step` rows of one section of the sheet: input, materials, creep, factors A, B
and C of Eq. (5.13N), bending about each axis (with the note on c), biaxial bending, and one row per
check. ``optimizer.reporting.sheet`` puts them together and renders them. Units at this edge: kN,
kNm, mm, MPa. A value the member check does not provide reads as NaN (:func:`value_of`), never a guess.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

from design.member import ColumnActions
from design.params import NationalParameters, ParameterSet, parameter_set
from design.resistance import DesignSection
from design.results import CheckResult
from design.sections import RectSection

__all__ = [
    "DIMENSIONLESS",
    "Step",
    "fmt_kn",
    "fmt_knm",
    "fmt_f",
    "fmt_pair",
    "fmt_signed",
    "value_of",
    "outcome",
    "input_steps",
    "material_steps",
    "creep_steps",
    "factor_steps",
    "axis_steps",
    "c_note",
    "biaxial_steps",
    "check_step",
]

#: Units that mean "no unit": such quantities are printed bare.
DIMENSIONLESS = frozenset({"", "-"})


@dataclass(frozen=True)
class Step:
    """One line of the sheet: what is found, by which formula, with which numbers, the result and clause.

    ``note`` is a sentence about the step (why a method does not apply, where a value came from).
    """

    what: str
    formula: str = ""
    numbers: str = ""
    result: str = ""
    clause: str = ""
    note: str = ""


# ---------------------------------------------------------------------------------------------- numbers
def fmt_kn(x: float) -> str:
    """A force in N as kN with one decimal, e.g. ``1,234.5 kN``."""
    return f"{x / 1e3:,.1f} kN"


def fmt_knm(x: float) -> str:
    """A moment in N mm as kNm with one decimal, e.g. ``123.4 kNm``."""
    return f"{x / 1e6:,.1f} kNm"


def fmt_f(x: float, nd: int = 3) -> str:
    """A number with ``nd`` decimals; a flag as yes or no; a non-finite value as "not applicable"."""
    if isinstance(x, bool):
        return "yes" if x else "no"
    if not math.isfinite(x):
        return "not applicable"
    return f"{x:,.{nd}f}"


def fmt_pair(demand: float, capacity: float, unit: str) -> str:
    """``demand <= capacity unit`` with one number format for both; dimensionless ratios bare."""
    if unit in ("kN", "kNm"):
        nd = 1
    elif unit in ("mm2", "bars"):
        nd = 0
    elif float(demand).is_integer() and float(capacity).is_integer():
        nd = 0
    elif unit in DIMENSIONLESS:
        nd = 1 if max(abs(demand), abs(capacity)) >= 10 else 3
    else:
        nd = 1
    suffix = "" if unit in DIMENSIONLESS else f" {unit}"
    return f"{demand:,.{nd}f}{suffix} <= {capacity:,.{nd}f}{suffix}"


def fmt_signed(x: float, nd: int = 1) -> str:
    """A number for use inside a formula: negative values in brackets."""
    text = f"{x:,.{nd}f}"
    return f"({text})" if x < 0 else text


def value_of(v: dict, key: str, default: float = math.nan) -> float:
    """The value under ``key`` as a float, or ``default`` where it is missing or not a number."""
    x = v.get(key, default)
    try:
        return float(x)
    except (TypeError, ValueError):
        return default


def outcome(ch: CheckResult, flagged: set[str] = frozenset()) -> str:
    """The result cell of a check: utilisation and verdict, or why it cannot be judged."""
    if not ch.applicable:
        if ch.name in flagged:
            return "not applicable: not verified (see warnings)"
        return "not applicable: FAILS"
    if not math.isfinite(ch.utilisation):
        return "no capacity: FAILS"
    if ch.note.startswith("not required"):
        return "not required"
    return f"{ch.utilisation:.3f} {'ok' if ch.ok else 'FAILS'}"


# ---------------------------------------------------------------------------------------------- the steps
def input_steps(design: DesignSection, actions: ColumnActions, v: dict, params: NationalParameters) -> list[Step]:
    """The input: section, bars, links and cover, design actions and national parameters."""
    sec = design.section
    rect = isinstance(sec, RectSection)
    shape = f"{sec.b:g} x {sec.h:g} mm (b along y, h along z)" if rect else f"circular, D = {sec.diameter:g} mm"
    return [
        Step("section", numbers=shape, result=f"Ac = {sec.Ac:,.0f} mm2"),
        Step(
            "longitudinal bars",
            numbers=sec.bars.notation,
            result=f"As = {sec.As:,.0f} mm2 ({100 * sec.As / sec.Ac:.2f} % of Ac)",
        ),
        Step("links and cover", numbers=f"{sec.link:g} mm links, nominal cover {sec.cover:g} mm to the links"),
        Step("design axial force (compression positive)", "NEd", result=fmt_kn(value_of(v, "NEd"))),
        Step(
            "first-order end moments about y",
            "My,top ; My,bot",
            result=f"{fmt_knm(float(actions.My_top))} ; {fmt_knm(float(actions.My_bot))}",
            note="the same sign at both ends means single curvature",
        ),
        Step(
            "first-order end moments about z",
            "Mz,top ; Mz,bot",
            result=f"{fmt_knm(float(actions.Mz_top))} ; {fmt_knm(float(actions.Mz_bot))}",
        ),
        Step("national parameters", numbers=_params_text(params)),
    ]


def _params_text(params: NationalParameters) -> str:
    """The parameter set's name, and the values that differ from the named set (overrides)."""
    for key in ParameterSet:
        base = parameter_set(key)
        if base.name == params.name:
            changed = [
                f"{f.name} = {getattr(params, f.name):g}"
                for f in dataclasses.fields(params)
                if f.name != "name"
                and isinstance(getattr(params, f.name), (int, float))
                and getattr(params, f.name) != getattr(base, f.name)
            ]
            return params.name + (f", with {', '.join(changed)}" if changed else "")
    return params.name


def material_steps(design: DesignSection, v: dict) -> list[Step]:
    """Design strengths and strains of the materials, and the resistance to pure compression."""
    c, s = design.concrete, design.steel
    return [
        Step(
            "design concrete strength",
            "fcd = alpha_cc fck / gamma_c",
            f"{c.alpha_cc:g} x {c.fck:g} / {c.gamma_c:g}",
            f"{c.fcd:.2f} MPa",
            "EN 1992-1-1, Eq. (3.15)",
        ),
        Step(
            "concrete strains and exponent",
            "eps_c2 ; eps_cu2 ; n",
            "",
            f"{1e3 * c.eps_c2:.2f} per mille ; {1e3 * c.eps_cu2:.2f} per mille ; {c.n:.2f}",
            "EN 1992-1-1, Table 3.1",
        ),
        Step(
            "design yield strength",
            "fyd = fyk / gamma_s",
            f"{s.fyk:g} / {s.gamma_s:g}",
            f"{s.fyd:.1f} MPa",
            "EN 1992-1-1, 3.2.7(2)",
        ),
        Step(
            "resistance to pure compression",
            "NRd (uniform strain eps_c2)",
            "",
            fmt_kn(value_of(v, "NRd")),
            "EN 1992-1-1, 6.1(5)",
        ),
    ]


def creep_steps(v: dict) -> list[Step]:
    """Effective creep ratio: where it came from (EN 1992-1-1, 5.8.4, Annex B, 3.1.4(4))."""
    phi_ef = value_of(v, "phi_ef")
    source = str(v.get("phi_ef_source", ""))
    steps = []
    if source != "given":
        steps += [
            Step(
                "notional size",
                "h0 = 2 Ac / u (all faces drying)",
                "",
                f"{value_of(v, 'h0'):.0f} mm",
                "EN 1992-1-1, 3.1.4(5)",
            ),
            Step(
                "creep coefficient (linear)",
                "phi(inf, t0) = phi_RH beta(fcm) beta(t0)",
                str(v.get("creep_conditions", "")),
                fmt_f(value_of(v, "phi_inf_linear"), 2),
                "EN 1992-1-1, Annex B, Eqs. (B.1)-(B.5), (B.9)",
            ),
            Step(
                "quasi-permanent stress",
                "sigma_c = (M0Eqp/M0Ed) x design actions on the uncracked section",
                f"k_sigma = sigma_c / fck = {value_of(v, 'k_sigma_qp'):.2f}",
                f"{value_of(v, 'sigma_c_qp'):.1f} MPa",
                "EN 1992-1-1, 3.1.4(4)",
                note=(
                    "above 0.45 fck: non-linear creep, phi raised by exp(1.5 (k_sigma - 0.45))"
                    if bool(v.get("creep_nonlinear", False))
                    else "at most 0.45 fck: linear creep"
                ),
            ),
            Step(
                "creep coefficient",
                "phi(inf, t0), Eq. (3.7) where non-linear",
                "",
                fmt_f(value_of(v, "phi_inf"), 2),
                "EN 1992-1-1, 3.1.4(4), Eq. (3.7)",
            ),
            Step(
                "effective creep ratio",
                "phi_ef = phi(inf, t0) M0Eqp / M0Ed",
                f"{value_of(v, 'phi_inf'):.2f} x {value_of(v, 'M0Eqp_ratio'):.3f}",
                fmt_f(phi_ef, 2),
                "EN 1992-1-1, Eq. (5.19)",
                note=source,
            ),
        ]
    else:
        allowed = bool(v.get("creep_ignorable_5_8_4_4", False))
        note = "given in the specification"
        if phi_ef == 0:
            note += (
                "; 5.8.4(4) allows phi_ef = 0 here (phi(inf, t0) <= 2, lambda <= 75, M0Ed/NEd >= h)"
                if allowed
                else "; the conditions of 5.8.4(4) for ignoring creep (phi(inf, t0) <= 2, lambda <= 75, "
                "M0Ed/NEd >= h) are NOT all met here"
            )
        steps.append(Step("effective creep ratio", "phi_ef", "", fmt_f(phi_ef, 2), "EN 1992-1-1, 5.8.4", note=note))
    return steps


def factor_steps(v: dict, ax: str, n: float, omega: float) -> list[Step]:
    """Factors A, B, C of Eq. (5.13N), each with where it came from."""
    A, B, C = value_of(v, f"A_{ax}"), value_of(v, f"B_{ax}"), value_of(v, f"C_{ax}")
    clause = "EN 1992-1-1, 5.8.3.1(1)"
    if bool(v.get("A_default", False)):
        a_step = Step(
            "factor A",
            "A = 0.7",
            "",
            fmt_f(A),
            clause,
            note=f"A = {A:.1f}, the default where the effective creep ratio phi_ef is not known",
        )
    else:
        phi = value_of(v, "phi_ef", 5.0 * (1.0 / A - 1.0) if A > 0 else math.nan)
        source = v.get("phi_ef_source")
        a_step = Step(
            "factor A",
            "A = 1 / (1 + 0.2 phi_ef)",
            f"1 / (1 + 0.2 x {phi:.2f})",
            fmt_f(A),
            clause,
            note=f"A from phi_ef = {phi:.2f}" + (f", {source}" if isinstance(source, str) and source else ""),
        )
    b_step = Step(
        "factor B",
        "B = sqrt(1 + 2 omega)",
        f"sqrt(1 + 2 x {omega:.3f})",
        fmt_f(B),
        clause,
        note=f"B from the mechanical reinforcement ratio omega = {omega:.3f}",
    )
    if bool(v.get("C_default", False)):
        why = (
            "the member is unbraced"
            if v.get("braced", True) is False
            else "rm = M01/M02 is not used (end moments not from an analysis)"
        )
        c_step = Step("factor C", "C = 0.7", "", fmt_f(C), clause, note=f"C = {C:.1f}, the default: {why}")
    else:
        rm = value_of(v, f"rm_{ax}", 1.7 - C)
        note = f"C from rm = M01/M02 = {rm:.3f}"
        if bool(v.get(f"rm_imperfection_{ax}", False)):
            note += " (the first-order moment is mainly the imperfection's: rm = 1)"
        c_step = Step("factor C", "C = 1.7 - rm", f"1.7 - {fmt_signed(rm, 3)}", fmt_f(C), clause, note=note)
    return [a_step, b_step, c_step]


def axis_steps(design: DesignSection, v: dict, ax: str, l0_note: str) -> list[Step]:
    """Bending about axis ``ax`` ("y" or "z"): slenderness, imperfection, second order, design moment, MRd."""
    sec, c = design.section, design.concrete
    rect = isinstance(sec, RectSection)
    other = "z" if ax == "y" else "y"
    dim = "h" if ax == "y" else "b"
    depth = (sec.h if ax == "y" else sec.b) if rect else sec.diameter
    NEd = value_of(v, "NEd")
    n, omega = value_of(v, "n"), value_of(v, "omega")
    l0 = value_of(v, f"l0{ax}")
    lam, lim = value_of(v, f"lambda_{ax}"), value_of(v, f"lambda_lim_{ax}")
    i_val = l0 / lam if lam > 0 else math.nan
    A, B, C = value_of(v, f"A_{ax}"), value_of(v, f"B_{ax}"), value_of(v, f"C_{ax}")
    slender = bool(v.get(f"slender_{ax}", False))
    M01, M02, M0e = value_of(v, f"M01_{ax}"), value_of(v, f"M02_{ax}"), value_of(v, f"M0e_{ax}")
    e0 = value_of(v, f"e0_{ax}")
    MEd = value_of(v, f"MEd{ax}")
    steps = [
        Step(f"effective length l0{ax}", f"l0{ax}", l0_note, f"{l0:,.0f} mm", "EN 1992-1-1, 5.8.3.2"),
        Step(
            "radius of gyration",
            f"i{ax} = {dim} / sqrt(12)" if rect else "i = D / 4",
            f"{depth:g} / sqrt(12)" if rect else f"{depth:g} / 4",
            f"{i_val:.1f} mm",
        ),
        Step(
            "slenderness",
            f"lambda_{ax} = l0{ax} / i{ax}",
            f"{l0:,.0f} / {i_val:.1f}",
            fmt_f(lam, 1),
            "EN 1992-1-1, Eq. (5.14)",
        ),
        Step(
            "relative normal force",
            "n = NEd / (Ac fcd)",
            f"{NEd:,.0f} N / ({sec.Ac:,.0f} mm2 x {c.fcd:.2f} MPa)",
            fmt_f(n),
            "EN 1992-1-1, 5.8.3.1(1)",
        ),
        Step(
            "mechanical reinforcement ratio",
            "omega = As fyd / (Ac fcd)",
            f"{sec.As:,.0f} x {design.steel.fyd:.1f} / ({sec.Ac:,.0f} x {c.fcd:.2f})",
            fmt_f(omega),
            "EN 1992-1-1, 5.8.3.1(1)",
        ),
        *factor_steps(v, ax, n, omega),
        Step(
            "slenderness limit",
            "lambda_lim = 20 A B C / sqrt(n)",
            f"20 x {A:.3f} x {B:.3f} x {C:.3f} / sqrt({n:.3f})" if n > 0 else "no compression",
            fmt_f(lim, 1),
            "EN 1992-1-1, Eq. (5.13N)",
        ),
        Step(
            "second-order effects",
            f"lambda_{ax} > lambda_lim ?",
            f"{fmt_f(lam, 1)} {'>' if lam > lim else '<='} {fmt_f(lim, 1)}",
            "yes: second-order moments" if slender else "no: first-order moments only",
            "EN 1992-1-1, 5.8.3.1",
        ),
    ]
    ei = value_of(v, f"ei_{ax}")
    if v.get("imperfection_axis") == ax:
        steps.append(
            Step(
                "imperfection eccentricity",
                "ei = theta_i l0 / 2, theta_i = theta_0 alpha_h alpha_m",
                "",
                f"{ei:.1f} mm",
                "EN 1992-1-1, 5.2(7), Eqs. (5.1), (5.2)",
                note="the imperfection acts about this axis, where it is more unfavourable (5.8.9(2))",
            )
        )
    else:
        steps.append(
            Step(
                "imperfection eccentricity",
                "ei = theta_i l0 / 2, theta_i = theta_0 alpha_h alpha_m",
                f"{ei:.1f} mm",
                "not applied about this axis",
                "EN 1992-1-1, 5.2(7), 5.8.9(2)",
                note=f"the imperfection acts about {other}, in the one direction where it is more unfavourable",
            )
        )
    steps += [
        Step(
            "end moments with the imperfection",
            "M01 ; M02 (|M02| >= |M01|; M0Ed + NEd ei)",
            "",
            f"{fmt_knm(M01)} ; {fmt_knm(M02)}",
            "EN 1992-1-1, 5.8.8.2(2)",
        ),
        Step(
            "equivalent first-order moment",
            "M0e = max(0.6 M02 + 0.4 M01, 0.4 M02)",
            f"max(0.6 x {fmt_signed(M02 / 1e6)} + 0.4 x {fmt_signed(M01 / 1e6)}, 0.4 x {fmt_signed(M02 / 1e6)})",
            fmt_knm(M0e),
            "EN 1992-1-1, Eq. (5.32)",
        ),
        Step(
            "minimum eccentricity",
            f"e0 = max({dim} / 30, 20 mm)" if rect else "e0 = max(D / 30, 20 mm)",
            f"max({depth:g} / 30, 20)",
            f"{e0:.1f} mm; NEd e0 = {NEd * e0 / 1e6:,.1f} kNm",
            "EN 1992-1-1, 6.1(4)",
        ),
    ]
    m_e0 = max(NEd, 0.0) * e0
    e0_note = (
        ""
        if MEd >= m_e0 * (1 - 1e-9)
        else f"NEd e0 is not applied about {ax} (the minimum moment acts about one axis at a time, "
        "with the imperfection)"
    )
    if slender:
        Kr, Kphi, inv_r = value_of(v, f"Kr_{ax}"), value_of(v, f"Kphi_{ax}"), value_of(v, f"inv_r_{ax}")
        e2, M2 = value_of(v, f"e2_{ax}"), value_of(v, f"M2_{ax}")
        cc = value_of(v, f"c_{ax}", 10.0)
        braced = v.get("braced", True) is not False
        phi = value_of(v, "phi_ef", 5.0 * (1.0 / A - 1.0) if A > 0 else math.nan)
        beta = 0.35 + c.fck / 200.0 - lam / 150.0
        eps_yd = design.steel.fyd / design.steel.Es
        d = Kr * Kphi * eps_yd / (0.45 * inv_r) if inv_r > 0 else math.nan
        steps += [
            Step(
                "correction for axial load",
                "Kr = (1 + omega - n) / (1 + omega - 0.4) <= 1",
                f"(1 + {omega:.3f} - {n:.3f}) / (1 + {omega:.3f} - 0.4)",
                fmt_f(Kr),
                "EN 1992-1-1, Eq. (5.36)",
            ),
            Step(
                "creep factor",
                "K_phi = 1 + beta phi_ef >= 1, beta = 0.35 + fck/200 - lambda/150",
                f"beta = 0.35 + {c.fck:g}/200 - {lam:.1f}/150 = {beta:.3f}; 1 + {fmt_signed(beta, 3)} x {phi:.2f}",
                fmt_f(Kphi),
                "EN 1992-1-1, Eq. (5.37)",
            ),
            Step(
                "curvature",
                "1/r = Kr K_phi eps_yd / (0.45 d), eps_yd = fyd / Es",
                f"{Kr:.3f} x {Kphi:.3f} x {eps_yd:.5f} / (0.45 x {d:,.0f} mm)",
                f"{inv_r:.3e} 1/mm",
                "EN 1992-1-1, Eqs. (5.34), (5.35)",
            ),
            Step(
                "second-order eccentricity",
                "e2 = (1/r) l0^2 / c",
                f"{inv_r:.3e} x {l0:,.0f}^2 / {cc:.2f}",
                f"{e2:.1f} mm",
                "EN 1992-1-1, Eq. (5.33), 5.8.8.2(4)",
                note=c_note(cc, M01, M02),
            ),
            Step(
                "second-order moment",
                "M2 = NEd e2",
                f"{NEd / 1e3:,.1f} kN x {e2:.1f} mm",
                fmt_knm(M2),
                "EN 1992-1-1, 5.8.8.2(3)",
            ),
        ]
        if braced:
            steps.append(
                Step(
                    "design moment",
                    "MEd = max(M0e + M2, M02, M01 + 0.5 M2, NEd e0)",
                    f"max({M0e / 1e6:,.1f} + {M2 / 1e6:,.1f}, {fmt_signed(M02 / 1e6)}, "
                    f"{fmt_signed(M01 / 1e6)} + 0.5 x {M2 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})",
                    fmt_knm(MEd),
                    "EN 1992-1-1, Eq. (5.31), 5.8.8.2(3), 6.1(4)",
                    note=e0_note,
                )
            )
        else:
            steps.append(
                Step(
                    "design moment",
                    "MEd = max(M02 + M2, NEd e0) (unbraced: at the end)",
                    f"max({M02 / 1e6:,.1f} + {M2 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})",
                    fmt_knm(MEd),
                    "EN 1992-1-1, 5.8.8.2, 6.1(4)",
                    note=e0_note,
                )
            )
    else:
        steps.append(
            Step(
                "design moment",
                "MEd = max(M02, NEd e0)",
                f"max({M02 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})",
                fmt_knm(MEd),
                "EN 1992-1-1, 5.8.2(6), 6.1(4)",
                note=e0_note,
            )
        )
    steps.append(
        Step(
            "moment resistance at NEd",
            f"MRd{ax} (strain compatibility)",
            "",
            fmt_knm(value_of(v, f"MRd{ax}")),
            "EN 1992-1-1, 6.1",
        )
    )
    return steps


def c_note(c: float, M01: float, M02: float) -> str:
    """Why c has its value (EN 1992-1-1, 5.8.8.2(4))."""
    rm = M01 / M02 if M02 > 0 else 1.0
    if c <= 8.0 + 1e-9:
        return f"c = 8: the first-order moment is constant along the member (M01/M02 = {rm:.2f}), 5.8.8.2(4)"
    if c >= 10.0 - 1e-9:
        return f"c = 10 (about pi^2): the first-order moment is zero at one end or changes sign (M01/M02 = {rm:.2f})"
    return (
        f"c = 10 - 2 M01/M02 = {c:.2f}: between 10 (moment zero at one end) and 8 (constant moment), "
        f"M01/M02 = {rm:.2f} with the imperfection"
    )


def biaxial_steps(design: DesignSection, v: dict) -> list[Step]:
    """Biaxial bending: the criteria of Eq. (5.38) and, where they are not met, the interaction of Eq. (5.39)."""
    sec = design.section
    rect = isinstance(sec, RectSection)
    NEd = value_of(v, "NEd")
    lam_y, lam_z = value_of(v, "lambda_y"), value_of(v, "lambda_z")
    MEdy, MEdz, MRdy, MRdz = value_of(v, "MEdy"), value_of(v, "MEdz"), value_of(v, "MRdy"), value_of(v, "MRdz")
    ratio = lam_y / lam_z if lam_z > 0 else math.inf
    bi = [
        Step(
            "slenderness ratio criterion",
            "lambda_y / lambda_z <= 2 and lambda_z / lambda_y <= 2",
            f"{lam_y:.1f} / {lam_z:.1f} = {ratio:.2f}",
            fmt_f(bool(v.get("criterion_5_38a", False))),
            "EN 1992-1-1, Eq. (5.38a)",
        )
    ]
    bw, hw = (sec.b, sec.h) if rect else (sec.diameter, sec.diameter)
    if NEd > 0:
        ey, ez = MEdz / NEd, MEdy / NEd
        ry, rz = ey / bw, ez / hw
        rel = min(ry, rz) / max(ry, rz) if max(ry, rz) > 0 else 0.0
        nums = (
            f"ey/{'b' if rect else 'D'} = {ey:.1f} / {bw:g} = {ry:.3f}; ez/{'h' if rect else 'D'} = "
            f"{ez:.1f} / {hw:g} = {rz:.3f}; smaller / larger = {rel:.2f}"
        )
    else:
        nums = "no compression"
    bi.append(
        Step(
            "relative eccentricity criterion",
            "(ey/b) / (ez/h) <= 0.2 or (ez/h) / (ey/b) <= 0.2, ey = MEdz/NEd, ez = MEdy/NEd",
            nums,
            fmt_f(bool(v.get("criterion_5_38b", False))),
            "EN 1992-1-1, Eq. (5.38b)",
        )
    )
    if bool(v.get("separate_checks", False)):
        bi.append(
            Step("outcome", "both criteria met: separate checks in each direction", "", "", "EN 1992-1-1, 5.8.9(3)")
        )
    else:
        a = value_of(v, "a")
        nrd = value_of(v, "NRd_5_39")
        bi += [
            Step(
                "exponent a",
                "a from NEd/NRd (0.1: 1.0, 0.7: 1.5, 1.0: 2.0), NRd = Ac fcd + As fyd",
                f"NEd/NRd = {NEd / 1e3:,.1f} / {nrd / 1e3:,.1f} = {NEd / nrd:.3f}" if nrd > 0 else "",
                fmt_f(a),
                "EN 1992-1-1, 5.8.9(4)",
            ),
            Step(
                "interaction",
                "(MEdz/MRdz)^a + (MEdy/MRdy)^a <= 1",
                f"({MEdz / 1e6:,.1f} / {MRdz / 1e6:,.1f})^{a:.3f} + ({MEdy / 1e6:,.1f} / {MRdy / 1e6:,.1f})^{a:.3f}",
                fmt_f(value_of(v, "interaction_5_39")),
                "EN 1992-1-1, Eq. (5.39)",
            ),
        ]
    if "utilisation_exact" in v:
        bi.append(
            Step(
                "direction-exact check (for comparison)",
                "|MEd| / |MRd| in the direction of (MEdy, MEdz) at NEd",
                "",
                fmt_f(value_of(v, "utilisation_exact")),
                "EN 1992-1-1, 6.1 (resistance surface)",
            )
        )
    return bi


def check_step(ch: CheckResult, flagged: set[str]) -> Step:
    """One check as a row: demand against capacity, utilisation and verdict (``flagged``: unverified checks)."""
    finite = math.isfinite(ch.demand) and math.isfinite(ch.capacity)
    numbers = fmt_pair(ch.demand, ch.capacity, ch.unit) if finite else ""
    if ch.note.startswith("not required"):
        numbers = ""
    return Step(ch.name, numbers=numbers, result=outcome(ch, flagged), clause=ch.clause, note=ch.note)
