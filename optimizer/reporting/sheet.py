"""Calculation sheet of one column check: each step with formula, numbers, result and clause.

The sheet is built as data (:class:`Sheet` of :class:`Step` rows grouped in
sections) from a :class:`design.member.ColumnCheck`, then rendered as plain
text or as a self-contained HTML page. Units at this edge: kN, kNm, mm, MPa.

It opens with a summary that keeps strength apart from the rules of detailing,
cover and fire (the governing check of each kind, design/results.py
``CheckKind``), and lists the checks grouped by kind. A check whose method
does not apply reads "not applicable" with the reason, never a utilisation of
"inf". Values the member check does not provide are left out rather than
guessed, so checks and values added to ``design.member`` later do not break it.
"""

from __future__ import annotations

import dataclasses
import html
import math
from dataclasses import dataclass, field

from design.member import ColumnActions, ColumnCheck
from design.params import NationalParameters, ParameterSet, parameter_set
from design.resistance import DesignSection
from design.results import CheckKind, CheckResult
from design.sections import RectSection
from optimizer import CAUTION

__all__ = ["Step", "Sheet", "build_sheet", "render_text", "render_html", "render_sections_html", "outcome",
           "utilisation_text", "kind_summary", "DIMENSIONLESS"]

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


@dataclass
class Sheet:
    """A calculation sheet: title, sections of steps, and the verdict."""

    title: str
    sections: list[tuple[str, list[Step]]] = field(default_factory=list)
    verdict: str = ""
    warnings: list[str] = field(default_factory=list)  # plausibility warnings on the input
    passes: bool = True

    def add(self, heading: str, steps: list[Step]) -> None:
        """Append a section."""
        self.sections.append((heading, steps))


# ---------------------------------------------------------------------------------------------- numbers
def _kn(x: float) -> str:
    return f"{x / 1e3:,.1f} kN"


def _knm(x: float) -> str:
    return f"{x / 1e6:,.1f} kNm"


def _f(x: float, nd: int = 3) -> str:
    if isinstance(x, bool):
        return "yes" if x else "no"
    if not math.isfinite(x):
        return "not applicable"
    return f"{x:,.{nd}f}"


def _pair(demand: float, capacity: float, unit: str) -> str:
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


def _signed(x: float, nd: int = 1) -> str:
    """A number for use inside a formula: negative values in brackets."""
    text = f"{x:,.{nd}f}"
    return f"({text})" if x < 0 else text


def utilisation_text(ch: CheckResult) -> str:
    """The utilisation of a check, or "not applicable" where its method does not apply."""
    if not ch.applicable or not math.isfinite(ch.utilisation):
        return "not applicable"
    return f"{ch.utilisation:.3f}"


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


def kind_summary(result: ColumnCheck) -> list[tuple[CheckKind, CheckResult]]:
    """(kind, governing check of that kind) in the order of ``CheckKind``, kinds without checks left out."""
    by_kind = dict(getattr(result, "governing_by_kind", {}) or {})
    if not by_kind:  # a result without kinds: everything counts as resistance
        by_kind = {CheckKind.RESISTANCE: result.governing}
    return [(k, by_kind[k]) for k in CheckKind if k in by_kind]


def _g(v: dict, key: str, default: float = math.nan) -> float:
    x = v.get(key, default)
    try:
        return float(x)
    except (TypeError, ValueError):
        return default


# ---------------------------------------------------------------------------------------------- the sheet
def build_sheet(
    title: str,
    design: DesignSection,
    actions: ColumnActions,
    result: ColumnCheck,
    params: NationalParameters,
    l0_notes: dict[str, str] | None = None,
    warnings: list[str] | None = None,
) -> Sheet:
    """Assemble the sheet for one checked column (scalar actions)."""
    v = result.values
    sec = design.section
    sh = Sheet(title, warnings=list(warnings or []), passes=bool(result.ok))
    sh.add("Summary", _summary(result))
    sh.add("Input", _input(design, actions, v, params))
    sh.add("Materials", _materials(design, v))
    if "phi_ef" in v:
        sh.add("Creep", _creep(v))
    for ax in ("y", "z"):
        label = "about y (lever arm along h)" if ax == "y" else "about z (lever arm along b)"
        sh.add(f"Bending {label}", _axis(design, v, ax, (l0_notes or {}).get(ax, "given")))
    sh.add("Biaxial bending", _biaxial(design, v))
    flagged = {c.name for c in result.unverified}
    groups: dict[str, list[Step]] = {}
    for ch in result.checks:
        kind = getattr(ch, "kind", CheckKind.RESISTANCE)
        groups.setdefault(str(getattr(kind, "value", kind)), []).append(_check_step(ch, flagged))
    order = [k.value for k in CheckKind]
    for kind in sorted(groups, key=lambda k: order.index(k) if k in order else len(order)):
        sh.add(f"Checks: {kind}", groups[kind])
    lap = []
    if "lap_length" in v:
        lap.append(Step("lap length", "l0 = alpha6 lb,rqd >= l0,min, lb,rqd = (phi/4)(fyd/fbd), alpha6 = 1.5",
                        f"phi = {sec.bars.max_dia:g} mm", f"{_g(v, 'lap_length'):,.0f} mm",
                        "EN 1992-1-1, 8.4.3, 8.7.3, Eq. (8.10)"))
    if "scl_max" in v:
        lap.append(Step("link spacing", "scl,tmax = min(20 phi_min, b, 400 mm); x 0.6 near slabs and at laps",
                        f"phi_min = {sec.bars.min_dia:g} mm" if hasattr(sec.bars, "min_dia") else "",
                        f"{_g(v, 'scl_max'):,.0f} mm ; {_g(v, 'scl_reduced'):,.0f} mm",
                        "EN 1992-1-1, 9.5.3(3), (4)"))
    if lap:
        sh.add("Lap of the starter bars", lap)
    sh.verdict = _verdict(result)
    return sh


def _summary(result: ColumnCheck) -> list[Step]:
    flagged = {c.name for c in result.unverified}
    steps = [Step(f"governing {kind.value} check", numbers=ch.name, result=outcome(ch, flagged), clause=ch.clause,
                  note=ch.note if not ch.applicable else "")
             for kind, ch in kind_summary(result)]
    g = result.governing
    steps.append(Step("overall", numbers=f"governed by {g.name}",
                      result=f"{utilisation_text(g)}{':' if not g.applicable else ''} "
                             f"{'PASSES' if result.ok else 'FAILS'}", clause=g.clause))
    return steps


def _verdict(result: ColumnCheck) -> str:
    g = result.governing
    word = "PASSES" if result.ok else "FAILS"
    if g.applicable and math.isfinite(g.utilisation):
        text = f"{word}: utilisation {g.utilisation:.3f}, governed by {g.name} ({g.clause})"
    elif not g.applicable:
        text = f"{word}: {g.name} not applicable ({g.clause}): {g.note}"
    else:
        text = f"{word}: {g.name} has no capacity ({g.clause})"
    res = dict(kind_summary(result)).get(CheckKind.RESISTANCE)
    if res is not None and res.name != g.name:
        text += f"; resistance {utilisation_text(res)} ({res.name})"
    if result.unverified:
        text += "; not verified: " + ", ".join(c.name for c in result.unverified)
    return text


def _input(design: DesignSection, actions: ColumnActions, v: dict, params: NationalParameters) -> list[Step]:
    sec = design.section
    rect = isinstance(sec, RectSection)
    shape = f"{sec.b:g} x {sec.h:g} mm (b along y, h along z)" if rect else f"circular, D = {sec.diameter:g} mm"
    return [
        Step("section", numbers=shape, result=f"Ac = {sec.Ac:,.0f} mm2"),
        Step("longitudinal bars", numbers=sec.bars.notation,
             result=f"As = {sec.As:,.0f} mm2 ({100 * sec.As / sec.Ac:.2f} % of Ac)"),
        Step("links and cover", numbers=f"{sec.link:g} mm links, nominal cover {sec.cover:g} mm to the links"),
        Step("design axial force (compression positive)", "NEd", result=_kn(_g(v, "NEd"))),
        Step("first-order end moments about y", "My,top ; My,bot",
             result=f"{_knm(float(actions.My_top))} ; {_knm(float(actions.My_bot))}",
             note="the same sign at both ends means single curvature"),
        Step("first-order end moments about z", "Mz,top ; Mz,bot",
             result=f"{_knm(float(actions.Mz_top))} ; {_knm(float(actions.Mz_bot))}"),
        Step("national parameters", numbers=_params_text(params)),
    ]


def _params_text(params: NationalParameters) -> str:
    """The parameter set's name, and the values that differ from the named set (overrides)."""
    for key in ParameterSet:
        base = parameter_set(key)
        if base.name == params.name:
            changed = [f"{f.name} = {getattr(params, f.name):g}" for f in dataclasses.fields(params)
                       if f.name != "name" and isinstance(getattr(params, f.name), (int, float))
                       and getattr(params, f.name) != getattr(base, f.name)]
            return params.name + (f", with {', '.join(changed)}" if changed else "")
    return params.name


def _materials(design: DesignSection, v: dict) -> list[Step]:
    c, s = design.concrete, design.steel
    return [
        Step("design concrete strength", "fcd = alpha_cc fck / gamma_c",
             f"{c.alpha_cc:g} x {c.fck:g} / {c.gamma_c:g}", f"{c.fcd:.2f} MPa", "EN 1992-1-1, Eq. (3.15)"),
        Step("concrete strains and exponent", "eps_c2 ; eps_cu2 ; n", "",
             f"{1e3 * c.eps_c2:.2f} per mille ; {1e3 * c.eps_cu2:.2f} per mille ; {c.n:.2f}",
             "EN 1992-1-1, Table 3.1"),
        Step("design yield strength", "fyd = fyk / gamma_s", f"{s.fyk:g} / {s.gamma_s:g}", f"{s.fyd:.1f} MPa",
             "EN 1992-1-1, 3.2.7(2)"),
        Step("resistance to pure compression", "NRd (uniform strain eps_c2)", "", _kn(_g(v, "NRd")),
             "EN 1992-1-1, 6.1(5)"),
    ]


def _creep(v: dict) -> list[Step]:
    """Effective creep ratio: where it came from (EN 1992-1-1, 5.8.4, Annex B, 3.1.4(4))."""
    phi_ef = _g(v, "phi_ef")
    source = str(v.get("phi_ef_source", ""))
    steps = []
    if source != "given":
        steps += [
            Step("notional size", "h0 = 2 Ac / u (all faces drying)", "", f"{_g(v, 'h0'):.0f} mm",
                 "EN 1992-1-1, 3.1.4(5)"),
            Step("creep coefficient (linear)", "phi(inf, t0) = phi_RH beta(fcm) beta(t0)",
                 str(v.get("creep_conditions", "")),
                 _f(_g(v, "phi_inf_linear"), 2), "EN 1992-1-1, Annex B, Eqs. (B.1)-(B.5), (B.9)"),
            Step("quasi-permanent stress", "sigma_c = (M0Eqp/M0Ed) x design actions on the uncracked section",
                 f"k_sigma = sigma_c / fck = {_g(v, 'k_sigma_qp'):.2f}", f"{_g(v, 'sigma_c_qp'):.1f} MPa",
                 "EN 1992-1-1, 3.1.4(4)",
                 note=("above 0.45 fck: non-linear creep, phi raised by exp(1.5 (k_sigma - 0.45))"
                       if bool(v.get("creep_nonlinear", False)) else "at most 0.45 fck: linear creep")),
            Step("creep coefficient", "phi(inf, t0), Eq. (3.7) where non-linear", "", _f(_g(v, "phi_inf"), 2),
                 "EN 1992-1-1, 3.1.4(4), Eq. (3.7)"),
            Step("effective creep ratio", "phi_ef = phi(inf, t0) M0Eqp / M0Ed",
                 f"{_g(v, 'phi_inf'):.2f} x {_g(v, 'M0Eqp_ratio'):.3f}", _f(phi_ef, 2), "EN 1992-1-1, Eq. (5.19)",
                 note=source),
        ]
    else:
        allowed = bool(v.get("creep_ignorable_5_8_4_4", False))
        note = "given in the specification"
        if phi_ef == 0:
            note += ("; 5.8.4(4) allows phi_ef = 0 here (phi(inf, t0) <= 2, lambda <= 75, M0Ed/NEd >= h)" if allowed
                     else "; the conditions of 5.8.4(4) for ignoring creep (phi(inf, t0) <= 2, lambda <= 75, "
                          "M0Ed/NEd >= h) are NOT all met here")
        steps.append(Step("effective creep ratio", "phi_ef", "", _f(phi_ef, 2), "EN 1992-1-1, 5.8.4", note=note))
    return steps


def _abc(v: dict, ax: str, n: float, omega: float) -> list[Step]:
    """Factors A, B, C of Eq. (5.13N), each with where it came from."""
    A, B, C = _g(v, f"A_{ax}"), _g(v, f"B_{ax}"), _g(v, f"C_{ax}")
    clause = "EN 1992-1-1, 5.8.3.1(1)"
    if bool(v.get("A_default", False)):
        a_step = Step("factor A", "A = 0.7", "", _f(A), clause,
                      note=f"A = {A:.1f}, the default where the effective creep ratio phi_ef is not known")
    else:
        phi = _g(v, "phi_ef", 5.0 * (1.0 / A - 1.0) if A > 0 else math.nan)
        source = v.get("phi_ef_source")
        a_step = Step("factor A", "A = 1 / (1 + 0.2 phi_ef)", f"1 / (1 + 0.2 x {phi:.2f})", _f(A), clause,
                      note=f"A from phi_ef = {phi:.2f}" + (f", {source}" if isinstance(source, str) and source
                                                           else ""))
    b_step = Step("factor B", "B = sqrt(1 + 2 omega)", f"sqrt(1 + 2 x {omega:.3f})", _f(B), clause,
                  note=f"B from the mechanical reinforcement ratio omega = {omega:.3f}")
    if bool(v.get("C_default", False)):
        why = ("the member is unbraced" if v.get("braced", True) is False
               else "rm = M01/M02 is not used (end moments not from an analysis)")
        c_step = Step("factor C", "C = 0.7", "", _f(C), clause, note=f"C = {C:.1f}, the default: {why}")
    else:
        rm = _g(v, f"rm_{ax}", 1.7 - C)
        note = f"C from rm = M01/M02 = {rm:.3f}"
        if bool(v.get(f"rm_imperfection_{ax}", False)):
            note += " (the first-order moment is mainly the imperfection's: rm = 1)"
        c_step = Step("factor C", "C = 1.7 - rm", f"1.7 - {_signed(rm, 3)}", _f(C), clause, note=note)
    return [a_step, b_step, c_step]


def _axis(design: DesignSection, v: dict, ax: str, l0_note: str) -> list[Step]:
    sec, c = design.section, design.concrete
    rect = isinstance(sec, RectSection)
    other = "z" if ax == "y" else "y"
    dim = "h" if ax == "y" else "b"
    depth = (sec.h if ax == "y" else sec.b) if rect else sec.diameter
    NEd = _g(v, "NEd")
    n, omega = _g(v, "n"), _g(v, "omega")
    l0 = _g(v, f"l0{ax}")
    lam, lim = _g(v, f"lambda_{ax}"), _g(v, f"lambda_lim_{ax}")
    i_val = l0 / lam if lam > 0 else math.nan
    A, B, C = _g(v, f"A_{ax}"), _g(v, f"B_{ax}"), _g(v, f"C_{ax}")
    slender = bool(v.get(f"slender_{ax}", False))
    M01, M02, M0e = _g(v, f"M01_{ax}"), _g(v, f"M02_{ax}"), _g(v, f"M0e_{ax}")
    e0 = _g(v, f"e0_{ax}")
    MEd = _g(v, f"MEd{ax}")
    steps = [
        Step(f"effective length l0{ax}", f"l0{ax}", l0_note, f"{l0:,.0f} mm", "EN 1992-1-1, 5.8.3.2"),
        Step("radius of gyration", f"i{ax} = {dim} / sqrt(12)" if rect else "i = D / 4",
             f"{depth:g} / sqrt(12)" if rect else f"{depth:g} / 4", f"{i_val:.1f} mm"),
        Step("slenderness", f"lambda_{ax} = l0{ax} / i{ax}", f"{l0:,.0f} / {i_val:.1f}", _f(lam, 1),
             "EN 1992-1-1, Eq. (5.14)"),
        Step("relative normal force", "n = NEd / (Ac fcd)",
             f"{NEd:,.0f} N / ({sec.Ac:,.0f} mm2 x {c.fcd:.2f} MPa)", _f(n), "EN 1992-1-1, 5.8.3.1(1)"),
        Step("mechanical reinforcement ratio", "omega = As fyd / (Ac fcd)",
             f"{sec.As:,.0f} x {design.steel.fyd:.1f} / ({sec.Ac:,.0f} x {c.fcd:.2f})", _f(omega),
             "EN 1992-1-1, 5.8.3.1(1)"),
        *_abc(v, ax, n, omega),
        Step("slenderness limit", "lambda_lim = 20 A B C / sqrt(n)",
             f"20 x {A:.3f} x {B:.3f} x {C:.3f} / sqrt({n:.3f})" if n > 0 else "no compression", _f(lim, 1),
             "EN 1992-1-1, Eq. (5.13N)"),
        Step("second-order effects", f"lambda_{ax} > lambda_lim ?",
             f"{_f(lam, 1)} {'>' if lam > lim else '<='} {_f(lim, 1)}",
             "yes: second-order moments" if slender else "no: first-order moments only", "EN 1992-1-1, 5.8.3.1"),
    ]
    ei = _g(v, f"ei_{ax}")
    if v.get("imperfection_axis") == ax:
        steps.append(Step("imperfection eccentricity", "ei = theta_i l0 / 2, theta_i = theta_0 alpha_h alpha_m",
                          "", f"{ei:.1f} mm", "EN 1992-1-1, 5.2(7), Eqs. (5.1), (5.2)",
                          note="the imperfection acts about this axis, where it is more unfavourable (5.8.9(2))"))
    else:
        steps.append(Step("imperfection eccentricity", "ei = theta_i l0 / 2, theta_i = theta_0 alpha_h alpha_m",
                          f"{ei:.1f} mm", "not applied about this axis", "EN 1992-1-1, 5.2(7), 5.8.9(2)",
                          note=f"the imperfection acts about {other}, in the one direction where it is more "
                               "unfavourable"))
    steps += [
        Step("end moments with the imperfection", "M01 ; M02 (|M02| >= |M01|; M0Ed + NEd ei)", "",
             f"{_knm(M01)} ; {_knm(M02)}", "EN 1992-1-1, 5.8.8.2(2)"),
        Step("equivalent first-order moment", "M0e = max(0.6 M02 + 0.4 M01, 0.4 M02)",
             f"max(0.6 x {_signed(M02 / 1e6)} + 0.4 x {_signed(M01 / 1e6)}, 0.4 x {_signed(M02 / 1e6)})",
             _knm(M0e),
             "EN 1992-1-1, Eq. (5.32)"),
        Step("minimum eccentricity", f"e0 = max({dim} / 30, 20 mm)" if rect else "e0 = max(D / 30, 20 mm)",
             f"max({depth:g} / 30, 20)", f"{e0:.1f} mm; NEd e0 = {NEd * e0 / 1e6:,.1f} kNm",
             "EN 1992-1-1, 6.1(4)"),
    ]
    m_e0 = max(NEd, 0.0) * e0
    e0_note = ("" if MEd >= m_e0 * (1 - 1e-9) else
               f"NEd e0 is not applied about {ax} (the minimum moment acts about one axis at a time, "
               "with the imperfection)")
    if slender:
        Kr, Kphi, inv_r = _g(v, f"Kr_{ax}"), _g(v, f"Kphi_{ax}"), _g(v, f"inv_r_{ax}")
        e2, M2 = _g(v, f"e2_{ax}"), _g(v, f"M2_{ax}")
        cc = _g(v, f"c_{ax}", 10.0)
        braced = v.get("braced", True) is not False
        phi = _g(v, "phi_ef", 5.0 * (1.0 / A - 1.0) if A > 0 else math.nan)
        beta = 0.35 + c.fck / 200.0 - lam / 150.0
        eps_yd = design.steel.fyd / design.steel.Es
        d = Kr * Kphi * eps_yd / (0.45 * inv_r) if inv_r > 0 else math.nan
        steps += [
            Step("correction for axial load", "Kr = (1 + omega - n) / (1 + omega - 0.4) <= 1",
                 f"(1 + {omega:.3f} - {n:.3f}) / (1 + {omega:.3f} - 0.4)", _f(Kr), "EN 1992-1-1, Eq. (5.36)"),
            Step("creep factor", "K_phi = 1 + beta phi_ef >= 1, beta = 0.35 + fck/200 - lambda/150",
                 f"beta = 0.35 + {c.fck:g}/200 - {lam:.1f}/150 = {beta:.3f}; 1 + {_signed(beta, 3)} x {phi:.2f}",
                 _f(Kphi), "EN 1992-1-1, Eq. (5.37)"),
            Step("curvature", "1/r = Kr K_phi eps_yd / (0.45 d), eps_yd = fyd / Es",
                 f"{Kr:.3f} x {Kphi:.3f} x {eps_yd:.5f} / (0.45 x {d:,.0f} mm)", f"{inv_r:.3e} 1/mm",
                 "EN 1992-1-1, Eqs. (5.34), (5.35)"),
            Step("second-order eccentricity", "e2 = (1/r) l0^2 / c",
                 f"{inv_r:.3e} x {l0:,.0f}^2 / {cc:.2f}", f"{e2:.1f} mm", "EN 1992-1-1, Eq. (5.33), 5.8.8.2(4)",
                 note=_c_note(cc, M01, M02)),
            Step("second-order moment", "M2 = NEd e2", f"{NEd / 1e3:,.1f} kN x {e2:.1f} mm", _knm(M2),
                 "EN 1992-1-1, 5.8.8.2(3)"),
        ]
        if braced:
            steps.append(Step("design moment", "MEd = max(M0e + M2, M02, M01 + 0.5 M2, NEd e0)",
                              f"max({M0e / 1e6:,.1f} + {M2 / 1e6:,.1f}, {_signed(M02 / 1e6)}, "
                              f"{_signed(M01 / 1e6)} + 0.5 x {M2 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})",
                              _knm(MEd), "EN 1992-1-1, Eq. (5.31), 5.8.8.2(3), 6.1(4)", note=e0_note))
        else:
            steps.append(Step("design moment", "MEd = max(M02 + M2, NEd e0) (unbraced: at the end)",
                              f"max({M02 / 1e6:,.1f} + {M2 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})", _knm(MEd),
                              "EN 1992-1-1, 5.8.8.2, 6.1(4)", note=e0_note))
    else:
        steps.append(Step("design moment", "MEd = max(M02, NEd e0)", f"max({M02 / 1e6:,.1f}, {m_e0 / 1e6:,.1f})",
                          _knm(MEd), "EN 1992-1-1, 5.8.2(6), 6.1(4)", note=e0_note))
    steps.append(Step("moment resistance at NEd", f"MRd{ax} (strain compatibility)", "", _knm(_g(v, f"MRd{ax}")),
                      "EN 1992-1-1, 6.1"))
    return steps


def _c_note(c: float, M01: float, M02: float) -> str:
    """Why c has its value (EN 1992-1-1, 5.8.8.2(4))."""
    rm = M01 / M02 if M02 > 0 else 1.0
    if c <= 8.0 + 1e-9:
        return f"c = 8: the first-order moment is constant along the member (M01/M02 = {rm:.2f}), 5.8.8.2(4)"
    if c >= 10.0 - 1e-9:
        return f"c = 10 (about pi^2): the first-order moment is zero at one end or changes sign (M01/M02 = {rm:.2f})"
    return (f"c = 10 - 2 M01/M02 = {c:.2f}: between 10 (moment zero at one end) and 8 (constant moment), "
            f"M01/M02 = {rm:.2f} with the imperfection")


def _biaxial(design: DesignSection, v: dict) -> list[Step]:
    sec = design.section
    rect = isinstance(sec, RectSection)
    NEd = _g(v, "NEd")
    lam_y, lam_z = _g(v, "lambda_y"), _g(v, "lambda_z")
    MEdy, MEdz, MRdy, MRdz = _g(v, "MEdy"), _g(v, "MEdz"), _g(v, "MRdy"), _g(v, "MRdz")
    ratio = lam_y / lam_z if lam_z > 0 else math.inf
    bi = [Step("slenderness ratio criterion", "lambda_y / lambda_z <= 2 and lambda_z / lambda_y <= 2",
               f"{lam_y:.1f} / {lam_z:.1f} = {ratio:.2f}", _f(bool(v.get("criterion_5_38a", False))),
               "EN 1992-1-1, Eq. (5.38a)")]
    bw, hw = (sec.b, sec.h) if rect else (sec.diameter, sec.diameter)
    if NEd > 0:
        ey, ez = MEdz / NEd, MEdy / NEd
        ry, rz = ey / bw, ez / hw
        rel = min(ry, rz) / max(ry, rz) if max(ry, rz) > 0 else 0.0
        nums = (f"ey/{'b' if rect else 'D'} = {ey:.1f} / {bw:g} = {ry:.3f}; ez/{'h' if rect else 'D'} = "
                f"{ez:.1f} / {hw:g} = {rz:.3f}; smaller / larger = {rel:.2f}")
    else:
        nums = "no compression"
    bi.append(Step("relative eccentricity criterion",
                   "(ey/b) / (ez/h) <= 0.2 or (ez/h) / (ey/b) <= 0.2, ey = MEdz/NEd, ez = MEdy/NEd", nums,
                   _f(bool(v.get("criterion_5_38b", False))), "EN 1992-1-1, Eq. (5.38b)"))
    if bool(v.get("separate_checks", False)):
        bi.append(Step("outcome", "both criteria met: separate checks in each direction", "", "",
                       "EN 1992-1-1, 5.8.9(3)"))
    else:
        a = _g(v, "a")
        nrd = _g(v, "NRd_5_39")
        bi += [
            Step("exponent a", "a from NEd/NRd (0.1: 1.0, 0.7: 1.5, 1.0: 2.0), NRd = Ac fcd + As fyd",
                 f"NEd/NRd = {NEd / 1e3:,.1f} / {nrd / 1e3:,.1f} = {NEd / nrd:.3f}" if nrd > 0 else "",
                 _f(a), "EN 1992-1-1, 5.8.9(4)"),
            Step("interaction", "(MEdz/MRdz)^a + (MEdy/MRdy)^a <= 1",
                 f"({MEdz / 1e6:,.1f} / {MRdz / 1e6:,.1f})^{a:.3f} + ({MEdy / 1e6:,.1f} / {MRdy / 1e6:,.1f})^{a:.3f}",
                 _f(_g(v, "interaction_5_39")), "EN 1992-1-1, Eq. (5.39)"),
        ]
    if "utilisation_exact" in v:
        bi.append(Step("direction-exact check (for comparison)",
                       "|MEd| / |MRd| in the direction of (MEdy, MEdz) at NEd", "",
                       _f(_g(v, "utilisation_exact")), "EN 1992-1-1, 6.1 (resistance surface)"))
    return bi


def _check_step(ch: CheckResult, flagged: set[str]) -> Step:
    finite = math.isfinite(ch.demand) and math.isfinite(ch.capacity)
    numbers = _pair(ch.demand, ch.capacity, ch.unit) if finite else ""
    if ch.note.startswith("not required"):
        numbers = ""
    return Step(ch.name, numbers=numbers, result=outcome(ch, flagged), clause=ch.clause, note=ch.note)


# ---------------------------------------------------------------------------------------------- rendering
def render_text(sheet: Sheet) -> str:
    """Plain-text rendering, in the order an engineer checks by hand."""
    lines = [sheet.title, CAUTION, ""]
    if sheet.warnings:
        lines += ["Warnings", "--------", *(f"  {w}" for w in sheet.warnings), ""]
    for heading, steps in sheet.sections:
        lines.append(heading)
        lines.append("-" * len(heading))
        for st in steps:
            lines.append(f"  {st.what}")
            detail = "    "
            if st.formula:
                detail += st.formula
            if st.numbers:
                detail += ("  =  " if st.formula else "") + st.numbers
            if st.result:
                detail += f"  ->  {st.result}"
            if detail.strip():
                lines.append(detail)
            if st.note:
                lines.append(f"    note: {st.note}")
            if st.clause:
                lines.append(f"    [{st.clause}]")
        lines.append("")
    lines.append(sheet.verdict)
    return "\n".join(lines)


_CSS = """
body { font-family: Georgia, 'Times New Roman', serif; margin: 2em auto; max-width: 60em; color: #1d1d1d; }
h1 { font-size: 1.4em; } h2 { font-size: 1.1em; border-bottom: 1px solid #999; margin-top: 1.6em; }
.caution { border: 1px solid #b45309; background: #fff7ed; padding: .6em 1em; }
.warnings { border-left: 4px solid #b45309; padding: .2em 1em; }
table { border-collapse: collapse; width: 100%; font-size: .92em; }
td, th { border-bottom: 1px solid #ddd; padding: .25em .5em; vertical-align: top; text-align: left; }
td.clause { color: #555; font-style: italic; white-space: nowrap; }
td.result { font-weight: bold; white-space: nowrap; }
.note { display: block; color: #555; font-size: .9em; }
.verdict { font-size: 1.1em; font-weight: bold; margin-top: 1.5em; }
.verdict.fails { color: #b91c1c; }
@media print { h2 { page-break-after: avoid; } table { page-break-inside: auto; } }
"""


def render_sections_html(sheet: Sheet, heading_tag: str = "h2") -> str:
    """The warnings, sections and verdict of a sheet as HTML (no page around them; shared with the report)."""
    e = html.escape
    parts = []
    if sheet.warnings:
        parts.append("<div class='warnings'><p><strong>Warnings</strong></p><ul>"
                     + "".join(f"<li>{e(w)}</li>" for w in sheet.warnings) + "</ul></div>")
    for heading, steps in sheet.sections:
        parts.append(f"<{heading_tag}>{e(heading)}</{heading_tag}><table><thead><tr><th>step</th><th>formula</th>"
                     "<th>numbers</th><th>result</th><th>clause</th></tr></thead><tbody>")
        for st in steps:
            note = f"<span class='note'>{e(st.note)}</span>" if st.note else ""
            parts.append(f"<tr><td>{e(st.what)}{note}</td><td>{e(st.formula)}</td><td>{e(st.numbers)}</td>"
                         f"<td class='result'>{e(st.result)}</td><td class='clause'>{e(st.clause)}</td></tr>")
        parts.append("</tbody></table>")
    parts.append(f"<p class='verdict{'' if sheet.passes else ' fails'}'>{e(sheet.verdict)}</p>")
    return "\n".join(parts)


def render_html(sheet: Sheet) -> str:
    """Self-contained HTML page (no external resources)."""
    e = html.escape
    return "\n".join([
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{e(sheet.title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{e(sheet.title)}</h1><p class='caution'>{e(CAUTION)}</p>",
        render_sections_html(sheet),
        "</body></html>",
    ])
