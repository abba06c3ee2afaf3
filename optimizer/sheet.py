"""Calculation sheet of one column check: each step with formula, numbers, result and clause.

The sheet is built as data (:class:`Sheet` of :class:`Step` rows grouped in
sections) from a :class:`design.member.ColumnCheck`, then rendered as plain
text or as a self-contained HTML page. Units at this edge: kN, kNm, mm, MPa.
"""

from __future__ import annotations

import html
import math
from dataclasses import dataclass, field

from design.member import ColumnActions, ColumnCheck
from design.params import NationalParameters
from design.resistance import DesignSection
from design.sections import RectSection
from optimizer import CAUTION

__all__ = ["Step", "Sheet", "build_sheet", "render_text", "render_html"]


@dataclass(frozen=True)
class Step:
    """One line of the sheet."""

    what: str
    formula: str = ""
    numbers: str = ""
    result: str = ""
    clause: str = ""


@dataclass
class Sheet:
    """A calculation sheet: title, sections of steps, and the verdict."""

    title: str
    sections: list[tuple[str, list[Step]]] = field(default_factory=list)
    verdict: str = ""

    def add(self, heading: str, steps: list[Step]) -> None:
        """Append a section."""
        self.sections.append((heading, steps))


def _kn(x: float) -> str:
    return f"{x / 1e3:,.1f} kN"


def _knm(x: float) -> str:
    return f"{x / 1e6:,.1f} kNm"


def _f(x: float, nd: int = 3) -> str:
    if isinstance(x, bool):
        return "yes" if x else "no"
    if math.isinf(x):
        return "inf"
    return f"{x:.{nd}f}"


def build_sheet(
    title: str,
    design: DesignSection,
    actions: ColumnActions,
    result: ColumnCheck,
    params: NationalParameters,
    l0_notes: dict[str, str] | None = None,
) -> Sheet:
    """Assemble the sheet for one checked column (scalar actions)."""
    v = result.values
    sec, c, s = design.section, design.concrete, design.steel
    sh = Sheet(title)
    rect = isinstance(sec, RectSection)
    shape = f"{sec.b:g} x {sec.h:g} mm (b along y, h along z)" if rect else f"circular, D = {sec.diameter:g} mm"
    NEd = float(v["NEd"])
    sh.add("Input", [
        Step("section", numbers=shape, result=f"Ac = {sec.Ac:,.0f} mm2"),
        Step("longitudinal bars", numbers=sec.bars.notation,
             result=f"As = {sec.As:,.0f} mm2 ({100 * sec.As / sec.Ac:.2f} % of Ac)"),
        Step("links, cover", numbers=f"{sec.link:g} mm links, nominal cover {sec.cover:g} mm"),
        Step("design axial force", "NEd", result=_kn(NEd)),
        Step("first-order end moments about y", "My,top ; My,bot",
             numbers=f"{_knm(float(actions.My_top))} ; {_knm(float(actions.My_bot))}"),
        Step("first-order end moments about z", "Mz,top ; Mz,bot",
             numbers=f"{_knm(float(actions.Mz_top))} ; {_knm(float(actions.Mz_bot))}"),
        Step("national parameters", numbers=params.name),
    ])
    sh.add("Materials", [
        Step("design concrete strength", "fcd = alpha_cc fck / gamma_c",
             f"{c.alpha_cc:g} x {c.fck:g} / {c.gamma_c:g}", f"{c.fcd:.2f} MPa", "EN 1992-1-1, Eq. (3.15)"),
        Step("concrete strains", "eps_c2 ; eps_cu2 ; n",
             f"{1e3 * c.eps_c2:.2f} ; {1e3 * c.eps_cu2:.2f} per mille ; {c.n:.2f}", "", "EN 1992-1-1, Table 3.1"),
        Step("design yield strength", "fyd = fyk / gamma_s", f"{s.fyk:g} / {s.gamma_s:g}", f"{s.fyd:.1f} MPa",
             "EN 1992-1-1, 3.2.7(2)"),
        Step("resistance to pure compression", "NRd (uniform strain eps_c2)", "", _kn(float(v["NRd"])),
             "EN 1992-1-1, 6.1(5)"),
    ])
    n, omega = float(v["n"]), float(v["omega"])
    for ax, other, dim in (("y", "z", "h"), ("z", "y", "b")):
        lam, lim = float(v[f"lambda_{ax}"]), float(v[f"lambda_lim_{ax}"])
        i_val = float(v[f"l0{ax}"]) / lam if lam > 0 else float("nan")
        steps = [
            Step(f"effective length l0{ax}", f"l0{ax}", (l0_notes or {}).get(ax, "given"),
                 f"{float(v[f'l0{ax}']):,.0f} mm", "EN 1992-1-1, 5.8.3.2"),
            Step("radius of gyration", f"i{ax} = {dim}/sqrt(12)" if rect else "i = D/4", "", f"{i_val:.1f} mm"),
            Step("slenderness", f"lambda{ax} = l0{ax} / i{ax}", f"{float(v[f'l0{ax}']):,.0f} / {i_val:.1f}",
                 _f(lam, 1), "EN 1992-1-1, Eq. (5.14)"),
            Step("relative normal force", "n = NEd / (Ac fcd)",
                 f"{NEd / 1e3:,.1f} kN / ({sec.Ac:,.0f} x {c.fcd:.2f})", _f(n), "EN 1992-1-1, 5.8.3.1(1)"),
            Step("mechanical reinforcement ratio", "omega = As fyd / (Ac fcd)", "", _f(omega),
                 "EN 1992-1-1, 5.8.3.1(1)"),
            Step("factors A, B, C", "A = 1/(1+0.2 phi_ef); B = sqrt(1+2 omega); C = 1.7 - rm",
                 ("A default 0.7" if v["A_default"] else "from phi_ef") + "; B from omega; "
                 + ("C default 0.7" if v["C_default"] else "C from rm = M01/M02"),
                 f"{_f(float(v[f'A_{ax}']))} ; {_f(float(v[f'B_{ax}']))} ; {_f(float(v[f'C_{ax}']))}",
                 "EN 1992-1-1, 5.8.3.1(1)"),
            Step("slenderness limit", "lambda_lim = 20 A B C / sqrt(n)", "", _f(lim, 1),
                 "EN 1992-1-1, Eq. (5.13N)"),
            Step("slender?", f"lambda{ax} > lambda_lim", f"{_f(lam, 1)} > {_f(lim, 1)}",
                 "yes: second-order moments" if v[f"slender_{ax}"] else "no: first-order moments only",
                 "EN 1992-1-1, 5.8.3.1"),
            Step("imperfection eccentricity", "ei = theta_i l0 / 2, theta_i = theta_0 alpha_h alpha_m",
                 "acts about this axis" if v["imperfection_axis"] == ax else
                 f"not about this axis (acts about {other}, 5.8.9(2))",
                 f"{float(v[f'ei_{ax}']):.1f} mm", "EN 1992-1-1, 5.2(7), Eqs. (5.1), (5.2)"),
            Step("end moments incl. imperfection", "M01 ; M02 (|M02| >= |M01|, M0Ed + NEd ei)", "",
                 f"{_knm(float(v[f'M01_{ax}']))} ; {_knm(float(v[f'M02_{ax}']))}", "EN 1992-1-1, 5.8.8.2(2)"),
            Step("equivalent first-order moment", "M0e = max(0.6 M02 + 0.4 M01, 0.4 M02)", "",
                 _knm(float(v[f"M0e_{ax}"])), "EN 1992-1-1, Eq. (5.32)"),
            Step("minimum eccentricity", f"e0 = max({dim}/30, 20 mm)", "", f"{float(v[f'e0_{ax}']):.1f} mm",
                 "EN 1992-1-1, 6.1(4)"),
        ]
        if v[f"slender_{ax}"]:
            steps += [
                Step("correction for axial load", "Kr = (1 + omega - n) / (1 + omega - 0.4) <= 1", "",
                     _f(float(v[f"Kr_{ax}"])), "EN 1992-1-1, Eq. (5.36)"),
                Step("creep factor", "K_phi = 1 + beta phi_ef >= 1, beta = 0.35 + fck/200 - lambda/150", "",
                     _f(float(v[f"Kphi_{ax}"])), "EN 1992-1-1, Eq. (5.37)"),
                Step("curvature", "1/r = Kr K_phi eps_yd / (0.45 d)", "", f"{float(v[f'inv_r_{ax}']):.3e} 1/mm",
                     "EN 1992-1-1, Eqs. (5.34), (5.35)"),
                Step("second-order eccentricity", "e2 = (1/r) l0^2 / 10", "", f"{float(v[f'e2_{ax}']):.1f} mm",
                     "EN 1992-1-1, Eq. (5.33)"),
                Step("second-order moment", "M2 = NEd e2", "", _knm(float(v[f"M2_{ax}"])),
                     "EN 1992-1-1, 5.8.8.2(3)"),
                Step("design moment", "MEd = max(M0e + M2, M02, M01 + 0.5 M2, NEd e0)", "",
                     _knm(float(v[f"MEd{ax}"])), "EN 1992-1-1, Eq. (5.31), 6.1(4)"),
            ]
        else:
            steps.append(Step("design moment", "MEd = max(M02, NEd e0)", "", _knm(float(v[f"MEd{ax}"])),
                              "EN 1992-1-1, 5.8.2(6), 6.1(4)"))
        steps.append(Step("moment resistance at NEd", f"MRd{ax} (strain compatibility)", "",
                          _knm(float(v[f"MRd{ax}"])), "EN 1992-1-1, 6.1"))
        label = "about y (lever arm along h)" if ax == "y" else "about z (lever arm along b)"
        sh.add(f"Bending {label}", steps)

    bi = [
        Step("slenderness ratio criterion", "lambda_y/lambda_z <= 2 and lambda_z/lambda_y <= 2",
             f"{_f(float(v['lambda_y']), 1)} / {_f(float(v['lambda_z']), 1)}", _f(bool(v["criterion_5_38a"])),
             "EN 1992-1-1, Eq. (5.38a)"),
        Step("relative eccentricity criterion", "(ey/heq)/(ez/beq) <= 0.2 or (ez/beq)/(ey/heq) <= 0.2",
             "ey = MEdz/NEd, ez = MEdy/NEd", _f(bool(v["criterion_5_38b"])), "EN 1992-1-1, Eq. (5.38b)"),
    ]
    if v["separate_checks"]:
        bi.append(Step("outcome", "both criteria met: separate checks in each direction", "", "",
                       "EN 1992-1-1, 5.8.9(3)"))
    else:
        bi += [
            Step("exponent a", "a from NEd/NRd (0.1: 1.0, 0.7: 1.5, 1.0: 2.0), NRd = Ac fcd + As fyd",
                 f"NEd/NRd = {NEd / float(v['NRd_5_39']):.3f}", _f(float(v["a"])), "EN 1992-1-1, 5.8.9(4)"),
            Step("interaction", "(MEdz/MRdz)^a + (MEdy/MRdy)^a <= 1",
                 f"({_knm(float(v['MEdz']))} / {_knm(float(v['MRdz']))})^a + "
                 f"({_knm(float(v['MEdy']))} / {_knm(float(v['MRdy']))})^a",
                 _f(float(v["interaction_5_39"])), "EN 1992-1-1, Eq. (5.39)"),
        ]
    if "utilisation_exact" in v:
        bi.append(Step("direction-exact check (for comparison)",
                       "|MEd| / |MRd| in the direction of (MEdy, MEdz) at NEd", "",
                       _f(float(v["utilisation_exact"])), "EN 1992-1-1, 6.1 (resistance surface)"))
    sh.add("Biaxial bending", bi)
    sh.add("All checks", [
        Step(ch.name, f"{ch.demand:,.2f} <= {ch.capacity:,.2f} {ch.unit}".strip(), ch.note,
             _outcome(ch, flagged={c.name for c in result.unverified}), ch.clause)
        for ch in result.checks
    ])
    sh.add("Lap of the starter bars", [
        Step("lap length", "l0 = alpha6 lb,rqd >= l0,min, lb,rqd = (phi/4)(fyd/fbd), alpha6 = 1.5",
             f"phi = {sec.bars.max_dia:g} mm", f"{float(v['lap_length']):,.0f} mm",
             "EN 1992-1-1, 8.4.3, 8.7.3, Eq. (8.10)"),
        Step("link spacing", "scl,tmax = min(20 phi_min, b, 400 mm); x0.6 near slabs and at laps", "",
             f"{float(v['scl_max']):,.0f} mm ; {float(v['scl_reduced']):,.0f} mm", "EN 1992-1-1, 9.5.3(3), (4)"),
    ])
    g = result.governing
    sh.verdict = (f"{'PASSES' if result.ok else 'FAILS'}: utilisation {_f(result.utilisation)}, "
                  f"governed by {g.name} ({g.clause})")
    if result.unverified:
        sh.verdict += "; not verified: " + ", ".join(c.name for c in result.unverified)
    return sh


def _outcome(ch, flagged: set[str]) -> str:  # noqa: ANN001
    if not ch.applicable:
        if ch.name in flagged:
            return "not verified: the method does not apply (flagged, see warnings)"
        return "FAILS: the method does not apply"
    return f"{_f(ch.utilisation)} {'ok' if ch.ok else 'FAILS'}"


def render_text(sheet: Sheet) -> str:
    """Plain-text rendering, in the order an engineer checks by hand."""
    lines = [sheet.title, CAUTION, ""]
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
            if st.clause:
                lines.append(f"    [{st.clause}]")
        lines.append("")
    lines.append(sheet.verdict)
    return "\n".join(lines)


_CSS = """
body { font-family: Georgia, 'Times New Roman', serif; margin: 2em auto; max-width: 60em; color: #1d1d1d; }
h1 { font-size: 1.4em; } h2 { font-size: 1.1em; border-bottom: 1px solid #999; margin-top: 1.6em; }
.caution { border: 1px solid #b45309; background: #fff7ed; padding: .6em 1em; }
table { border-collapse: collapse; width: 100%; font-size: .92em; }
td, th { border-bottom: 1px solid #ddd; padding: .25em .5em; vertical-align: top; text-align: left; }
td.clause { color: #555; font-style: italic; white-space: nowrap; }
td.result { font-weight: bold; white-space: nowrap; }
.verdict { font-size: 1.1em; font-weight: bold; margin-top: 1.5em; }
@media print { h2 { page-break-after: avoid; } table { page-break-inside: auto; } }
"""


def render_html(sheet: Sheet) -> str:
    """Self-contained HTML page (no external resources)."""
    e = html.escape
    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{e(sheet.title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{e(sheet.title)}</h1><p class='caution'>{e(CAUTION)}</p>",
    ]
    for heading, steps in sheet.sections:
        parts.append(f"<h2>{e(heading)}</h2><table><tr><th>step</th><th>formula</th><th>numbers</th>"
                     "<th>result</th><th>clause</th></tr>")
        for st in steps:
            parts.append(f"<tr><td>{e(st.what)}</td><td>{e(st.formula)}</td><td>{e(st.numbers)}</td>"
                         f"<td class='result'>{e(st.result)}</td><td class='clause'>{e(st.clause)}</td></tr>")
        parts.append("</table>")
    parts.append(f"<p class='verdict'>{e(sheet.verdict)}</p></body></html>")
    return "\n".join(parts)
