"""Calculation sheet of one column check: each step with formula, numbers, result and clause.

The sheet is built as data (:class:`Sheet` of :class:`Step` rows grouped in
sections) from a :class:`design.member.ColumnCheck`, then rendered as plain
text or as a self-contained HTML page. The rows of each section come from
``optimizer.reporting.sheet_steps``. Units at this edge: kN, kNm, mm, MPa.

It opens with a summary that keeps strength apart from the rules of detailing,
cover and fire (the governing check of each kind, design/results.py
``CheckKind``), and lists the checks grouped by kind. A check whose method
does not apply reads "not applicable" with the reason, never a utilisation of
"inf". Values the member check does not provide are left out rather than
guessed, so checks and values added to ``design.member`` later do not break it.
"""

from __future__ import annotations

import html
import math
from dataclasses import dataclass, field

from design.member import ColumnActions, ColumnCheck
from design.params import NationalParameters
from design.resistance import DesignSection
from design.results import CheckKind, CheckResult
from optimizer import CAUTION
from optimizer.reporting.sheet_steps import (
    Step,
    axis_steps,
    biaxial_steps,
    check_step,
    creep_steps,
    input_steps,
    material_steps,
    outcome,
    value_of,
)

__all__ = [
    "Step",
    "Sheet",
    "build_sheet",
    "render_text",
    "render_html",
    "render_sections_html",
    "outcome",
    "utilisation_text",
    "kind_summary",
]


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


def utilisation_text(ch: CheckResult) -> str:
    """The utilisation of a check, or "not applicable" where its method does not apply."""
    if not ch.applicable or not math.isfinite(ch.utilisation):
        return "not applicable"
    return f"{ch.utilisation:.3f}"


def kind_summary(result: ColumnCheck) -> list[tuple[CheckKind, CheckResult]]:
    """(kind, governing check of that kind) in the order of ``CheckKind``, kinds without checks left out."""
    by_kind = dict(getattr(result, "governing_by_kind", {}) or {})
    if not by_kind:  # a result without kinds: everything counts as resistance
        by_kind = {CheckKind.RESISTANCE: result.governing}
    return [(k, by_kind[k]) for k in CheckKind if k in by_kind]


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
    sh.add("Input", input_steps(design, actions, v, params))
    sh.add("Materials", material_steps(design, v))
    if "phi_ef" in v:
        sh.add("Creep", creep_steps(v))
    for ax in ("y", "z"):
        label = "about y (lever arm along h)" if ax == "y" else "about z (lever arm along b)"
        sh.add(f"Bending {label}", axis_steps(design, v, ax, (l0_notes or {}).get(ax, "given")))
    sh.add("Biaxial bending", biaxial_steps(design, v))
    flagged = {c.name for c in result.unverified}
    groups: dict[str, list[Step]] = {}
    for ch in result.checks:
        kind = getattr(ch, "kind", CheckKind.RESISTANCE)
        groups.setdefault(str(getattr(kind, "value", kind)), []).append(check_step(ch, flagged))
    order = [k.value for k in CheckKind]
    for kind in sorted(groups, key=lambda k: order.index(k) if k in order else len(order)):
        sh.add(f"Checks: {kind}", groups[kind])
    lap = []
    if "lap_length" in v:
        lap.append(
            Step(
                "lap length",
                "l0 = alpha6 lb,rqd >= l0,min, lb,rqd = (phi/4)(fyd/fbd), alpha6 = 1.5",
                f"phi = {sec.bars.max_dia:g} mm",
                f"{value_of(v, 'lap_length'):,.0f} mm",
                "EN 1992-1-1, 8.4.3, 8.7.3, Eq. (8.10)",
            )
        )
    if "scl_max" in v:
        lap.append(
            Step(
                "link spacing",
                "scl,tmax = min(20 phi_min, b, 400 mm); x 0.6 near slabs and at laps",
                f"phi_min = {sec.bars.min_dia:g} mm" if hasattr(sec.bars, "min_dia") else "",
                f"{value_of(v, 'scl_max'):,.0f} mm ; {value_of(v, 'scl_reduced'):,.0f} mm",
                "EN 1992-1-1, 9.5.3(3), (4)",
            )
        )
    if lap:
        sh.add("Lap of the starter bars", lap)
    sh.verdict = _verdict(result)
    return sh


def _summary(result: ColumnCheck) -> list[Step]:
    flagged = {c.name for c in result.unverified}
    steps = [
        Step(
            f"governing {kind.value} check",
            numbers=ch.name,
            result=outcome(ch, flagged),
            clause=ch.clause,
            note=ch.note if not ch.applicable else "",
        )
        for kind, ch in kind_summary(result)
    ]
    g = result.governing
    steps.append(
        Step(
            "overall",
            numbers=f"governed by {g.name}",
            result=f"{utilisation_text(g)}{':' if not g.applicable else ''} {'PASSES' if result.ok else 'FAILS'}",
            clause=g.clause,
        )
    )
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
        parts.append(
            "<div class='warnings'><p><strong>Warnings</strong></p><ul>"
            + "".join(f"<li>{e(w)}</li>" for w in sheet.warnings)
            + "</ul></div>"
        )
    for heading, steps in sheet.sections:
        parts.append(
            f"<{heading_tag}>{e(heading)}</{heading_tag}><table><thead><tr><th>step</th><th>formula</th>"
            "<th>numbers</th><th>result</th><th>clause</th></tr></thead><tbody>"
        )
        for st in steps:
            note = f"<span class='note'>{e(st.note)}</span>" if st.note else ""
            parts.append(
                f"<tr><td>{e(st.what)}{note}</td><td>{e(st.formula)}</td><td>{e(st.numbers)}</td>"
                f"<td class='result'>{e(st.result)}</td><td class='clause'>{e(st.clause)}</td></tr>"
            )
        parts.append("</tbody></table>")
    parts.append(f"<p class='verdict{'' if sheet.passes else ' fails'}'>{e(sheet.verdict)}</p>")
    return "\n".join(parts)


def render_html(sheet: Sheet) -> str:
    """Self-contained HTML page (no external resources)."""
    e = html.escape
    return "\n".join(
        [
            "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
            f"<title>{e(sheet.title)}</title><style>{_CSS}</style></head><body>",
            f"<h1>{e(sheet.title)}</h1><p class='caution'>{e(CAUTION)}</p>",
            render_sections_html(sheet),
            "</body></html>",
        ]
    )
