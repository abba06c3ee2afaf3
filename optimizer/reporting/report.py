"""The run's report: one self-contained, print-friendly HTML page (report.html).

Contents, in order: the caution; inputs and assumptions; headline figures;
warnings; the column schedule (levels top down) and its elevation picture;
the type catalogue with each type's N-M curves; quantities; the Pareto sweep
and the plans when the run has them; and the calculation sheet of the
governing cell of every type (the cell with the highest resistance utilisation
among the cells of that type: strength, apart from detailing, cover and fire,
which the type headings and the sheets report beside it). Pictures are embedded as base64 PNG; the page loads
nothing from outside and runs no script. Units: kN, kNm, mm, kg, t, m3, m2.
"""

from __future__ import annotations

import base64
import dataclasses
import html
import io
import math
from pathlib import Path

import numpy as np
import pandas as pd

from design.member import ColumnActions
from optimizer import CAUTION, __version__
from optimizer.pipeline.run import RunResult
from optimizer.reporting.outputs import summary_dict
from optimizer.reporting.sheet import Sheet, build_sheet, render_sections_html

__all__ = ["write_report", "render_report", "governing_cell", "cell_actions", "cell_sheet", "sheet_fragment"]

_e = html.escape

_CSS = """
:root { --ink: #1d2433; --muted: #5b6472; --rule: #d6dbe0; --band: #f4f6f5; --accent: #2f5d7c;
        --warn-bg: #fff4e0; --warn-edge: #c2410c; }
* { box-sizing: border-box; }
body { font-family: 'DejaVu Sans', 'Liberation Sans', Arial, sans-serif; color: var(--ink); margin: 0;
       font-size: 10.5pt; line-height: 1.4; background: #ffffff; }
main { max-width: 1180px; margin: 0 auto; padding: 1.5em 2em 3em; }
h1 { font-size: 1.55em; margin: .2em 0 .1em; letter-spacing: .01em; }
h2 { font-size: 1.2em; margin: 1.8em 0 .5em; padding-bottom: .2em; border-bottom: 2px solid var(--accent); }
h3 { font-size: 1.02em; margin: 1.3em 0 .4em; color: var(--accent); }
p.sub { color: var(--muted); margin: 0 0 1em; }
.caution { border-left: 6px solid var(--warn-edge); background: var(--warn-bg); padding: .7em 1em;
           font-weight: bold; margin: 1em 0; }
.caution.small { font-weight: normal; font-size: .9em; padding: .4em .8em; }
nav ol { columns: 2; margin: .3em 0 0; padding-left: 1.4em; color: var(--muted); }
nav a { color: var(--accent); text-decoration: none; }
table { border-collapse: collapse; width: 100%; margin: .4em 0 1em; font-size: .9em; }
th, td { padding: .22em .5em; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
th { background: var(--band); font-weight: bold; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
thead { display: table-header-group; }
tr { break-inside: avoid; page-break-inside: avoid; }
table.kv th { width: 16em; background: none; color: var(--muted); font-weight: normal; }
table.kv.multi th { width: auto; }
h4 { font-size: .95em; margin: 1em 0 .3em; }
.figures { display: grid; grid-template-columns: repeat(auto-fill, minmax(13em, 1fr)); gap: .6em; margin: .5em 0 1em; }
.figure { border: 1px solid var(--rule); border-radius: 4px; padding: .5em .7em; background: #fbfcfb; }
.figure .v { font-size: 1.3em; font-weight: bold; }
.figure .k { color: var(--muted); font-size: .85em; }
table.schedule { width: auto; font-size: .86em; }
table.schedule td, table.schedule th { text-align: center; border: 1px solid #ffffff; padding: .2em .5em;
                                      min-width: 3.2em; }
table.schedule th.level { text-align: right; }
.swatch { display: inline-block; min-width: 3.2em; padding: .05em .4em; border-radius: 3px; text-align: center;
          font-weight: bold; }
.scroll { overflow-x: auto; }
table.types td:nth-child(1) { font-weight: bold; }
img.pic { max-width: min(100%, 820px); height: auto; display: block; margin: .4em 0 1em;
          border: 1px solid var(--rule); }
img.pic.natural { max-width: none; }
.warnings li { margin-bottom: .3em; }
section.sheet { margin-top: 2em; padding-top: .6em; border-top: 3px double var(--rule); }
section.sheet table td.result { font-weight: bold; white-space: nowrap; }
section.sheet table td.clause { color: var(--muted); font-style: italic; white-space: nowrap; }
section.sheet .note { display: block; color: var(--muted); font-size: .9em; }
.verdict { font-weight: bold; padding: .4em .8em; background: var(--band); border-left: 6px solid var(--accent); }
.verdict.fails { border-left-color: #b91c1c; color: #b91c1c; }
footer { color: var(--muted); font-size: .85em; margin-top: 2.5em; border-top: 1px solid var(--rule);
         padding-top: .6em; }
@page { size: A4 portrait; margin: 14mm 12mm 16mm; }
@page wide { size: A3 landscape; margin: 12mm; }
@media print {
  main { max-width: none; padding: 0; }
  body { font-size: 9pt; }
  .major { break-before: page; page-break-before: always; }
  .wide { page: wide; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  img.pic, .figure, .caution, .verdict { break-inside: avoid; page-break-inside: avoid; }
  section.sheet { break-before: page; page-break-before: always; }
  .scroll { overflow: visible; }
  table.schedule { font-size: 6.5pt; }
  table.schedule td, table.schedule th { min-width: 0; padding: .1em .2em; }
  img.pic, img.pic.natural { width: auto !important; max-width: 100% !important; }
  nav { display: none; }
  * { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
"""


# ---------------------------------------------------------------------------------------------- helpers
def _num(x: object, nd: int = 3) -> str:
    if x is None:
        return ""
    if isinstance(x, (bool, np.bool_)):
        return "yes" if x else "no"
    if isinstance(x, (int, np.integer)):
        return f"{int(x):,}"
    if isinstance(x, (float, np.floating)):
        if not math.isfinite(float(x)):
            return ""
        return f"{float(x):,.{nd}f}"
    return str(x)


def _table(df: pd.DataFrame, cls: str = "", digits: dict[str, int] | None = None) -> str:
    """A DataFrame as an HTML table; numbers right-aligned, NaN empty."""
    digits = digits or {}
    head = "".join(
        f"<th class='num'>{_e(str(c))}</th>"
        if pd.api.types.is_numeric_dtype(df[c]) and not pd.api.types.is_bool_dtype(df[c])
        else f"<th>{_e(str(c))}</th>"
        for c in df.columns
    )
    rows = []
    for rec in df.itertuples(index=False):
        tds = []
        for c, x in zip(df.columns, rec, strict=True):
            if isinstance(x, (float, np.floating)) and float(x).is_integer() and c not in digits:
                text = _num(int(x)) if math.isfinite(float(x)) else ""
                tds.append(f"<td class='num'>{_e(text)}</td>")
            elif isinstance(x, (int, float, np.integer, np.floating)) and not isinstance(x, (bool, np.bool_)):
                tds.append(f"<td class='num'>{_e(_num(x, digits.get(c, 3)))}</td>")
            else:
                tds.append(f"<td>{_e(_num(x))}</td>")
        rows.append("<tr>" + "".join(tds) + "</tr>")
    return f"<table class='{cls}'><thead><tr>{head}</tr></thead><tbody>" + "".join(rows) + "</tbody></table>"


def _val(v: object) -> str:
    if isinstance(v, str):
        return v
    if isinstance(v, (float, np.floating)) and math.isfinite(float(v)):
        return f"{float(v):.6g}"
    return _num(v)


def _kv(rows: list[tuple[str, object]], pairs: int = 1) -> str:
    """Key-value table; ``pairs`` key-value pairs side by side per row."""
    body = []
    for k in range(0, len(rows), pairs):
        chunk = rows[k : k + pairs]
        cells = "".join(f"<th>{_e(key)}</th><td>{_e(_val(v))}</td>" for key, v in chunk)
        cells += "<th></th><td></td>" * (pairs - len(chunk))
        body.append(f"<tr>{cells}</tr>")
    return f"<table class='kv{' multi' if pairs > 1 else ''}'><tbody>{''.join(body)}</tbody></table>"


def _img(data: bytes | None, alt: str, natural: bool = False) -> str:
    """A PNG embedded as base64; ``natural``: shown at 80 % of its pixel width in a scrolling box on screen."""
    if not data:
        return f"<p class='sub'>(picture not available: {_e(alt)})</p>"
    b64 = base64.b64encode(data).decode("ascii")
    tag = f"<img class='pic' alt='{_e(alt)}' src='data:image/png;base64,{b64}'>"
    if natural:
        try:
            from PIL import Image

            with Image.open(io.BytesIO(data)) as im:
                width = int(0.8 * im.size[0])
        except Exception:
            return tag
        if width > 1100:
            tag = (
                f"<div class='scroll'><img class='pic natural' style='width:{width}px' alt='{_e(alt)}' "
                f"src='data:image/png;base64,{b64}'></div>"
            )
    return tag


def _small_png(data: bytes) -> bytes:
    """A PNG re-encoded with a 256-colour palette (plans come from elsewhere at full colour depth)."""
    try:
        from PIL import Image

        with Image.open(io.BytesIO(data)) as im:
            small = im.convert("RGB").quantize(colors=256, method=Image.Quantize.FASTOCTREE, dither=Image.Dither.NONE)
            out = io.BytesIO()
            small.save(out, format="png", optimize=True)
        return out.getvalue() if out.tell() < len(data) else data
    except Exception:
        return data


def _picture(folder: Path | None, rel: str, make: object) -> bytes | None:
    """The PNG at ``folder/rel`` when the pictures were written already, else rendered now."""
    if folder is not None and (Path(folder) / rel).is_file():
        return (Path(folder) / rel).read_bytes()
    try:
        return make()  # type: ignore[operator]
    except Exception:
        return None


# ---------------------------------------------------------------------------------------------- sheets
def governing_cell(r: RunResult, mark: str) -> int:
    """The cell with the highest resistance utilisation among the cells of type ``mark``.

    Strength decides: a cell governed by nominal cover at 0.93 says less about a type
    than the cell where its bending is at 0.98 (ties go to the higher overall utilisation).
    """
    use = next(u for u in r.types_used if u.mark == mark)
    cells = np.array(use.cells)
    res = np.asarray(r.checks.resistance_utilisation)[cells]
    overall = np.asarray(r.checks.utilisation)[cells]
    order = np.lexsort((-overall, -res))  # highest resistance first, then highest overall
    return int(cells[order[0]])


def _utilisation_text(r: RunResult, i: int) -> str:
    """Resistance and overall utilisation of cell ``i``, e.g. "resistance 0.612 (bending about z); overall 0.976"."""
    checks = r.checks
    res = checks.checks[int(checks.governing_resistance[i])]
    gov = checks.checks[int(checks.governing[i])]
    u_res, u = float(checks.resistance_utilisation[i]), float(checks.utilisation[i])
    text = f"resistance {_num(u_res, 3) or 'not applicable'} ({res.name})"
    if gov.name != res.name:
        text += f"; overall {_num(u, 3) or 'not applicable'} ({gov.name})"
    return text


def cell_actions(r: RunResult, i: int) -> ColumnActions:
    """The actions of cell ``i`` in the axes of its chosen section (turned stacks swap y and z).

    The same ones the run's exact re-check used (``CellTable.actions``), scalar for the sheet.
    """
    acts = r.feasibility.cells.actions(np.array([i]), int(r.chosen_orient[i]))
    scalar = {
        f.name: (float(np.asarray(v).ravel()[0]) if isinstance(v, np.ndarray) else v)
        for f in dataclasses.fields(acts)
        for v in [getattr(acts, f.name)]
    }
    return ColumnActions(**scalar)


def cell_sheet(r: RunResult, i: int) -> Sheet:
    """Calculation sheet of the chosen type in cell ``i`` (from the run's exact re-check)."""
    stack, level = r.feasibility.cells.cells[i]
    t = int(r.chosen_type[i])
    ct = r.catalogue.types[t]
    turned = int(r.chosen_orient[i]) == 1
    src = "from the actions table" + (" (stack turned 90 deg: plan axes swapped)" if turned else "")
    title = (
        f"Type {r.mark_of(i)}: governing cell {stack} at level {level} "
        f"({ct.section_key}, {ct.design.section.bars.notation}, {ct.design.concrete.name})"
    )
    return build_sheet(
        title, ct.design, cell_actions(r, i), r.checks.column(i), r.scenario.params, {"y": src, "z": src}
    )


def sheet_fragment(sheet: Sheet, mark: str) -> str:
    """A calculation sheet as an HTML fragment (a <section class='sheet'>)."""
    return "\n".join(
        [
            f"<section class='sheet' id='sheet-{_e(mark)}' data-type='{_e(mark)}'>",
            f"<h3>{_e(sheet.title)}</h3>",
            render_sections_html(sheet, "h4"),
            "</section>",
        ]
    )


# ---------------------------------------------------------------------------------------------- parts
def _inputs(r: RunResult) -> str:
    sc = r.scenario
    s = summary_dict(r)
    params = s["parameters"]
    rules = r.settings.rules
    rule_rows = [(f.name.replace("_", " "), _rule_text(getattr(rules, f.name))) for f in dataclasses.fields(rules)]
    lateral = [n for n in r.notes if "lateral" in n.lower()]
    other = [n for n in r.notes if n not in lateral]
    # The takedown and the run each state the lateral system; say it once, citing the clause where one does.
    lateral = sorted(lateral, key=lambda n: ("EN 1992" not in n, -len(n)))[:1]
    out = [
        "<section class='major' id='inputs'><h2>3. Inputs and assumptions</h2>",
        _kv(
            [
                ("project", sc.project.name),
                ("description", sc.project.description or ""),
                ("scenario file", r.scenario_path),
                ("scenario SHA-256 (first 16)", r.scenario_hash),
                (
                    "load method",
                    "takedown from the floor plans (tributary areas)"
                    if r.takedown is not None
                    else "actions from an analysis (CSV)",
                ),
                ("objective", r.settings.objective.value),
                (
                    "solver; time limit (s); gap target",
                    f"{r.settings.solver.solver}; {r.settings.solver.time_limit_s:g}; {r.settings.solver.gap_rel:g}",
                ),
                ("storeys; stacks; cells", f"{len(sc.levels)}; {len(sc.stacks)}; {len(r.feasibility.cells)}"),
                ("catalogue", f"{len(r.catalogue)} candidate types"),
            ]
        ),
        "<h3>Lateral system</h3>",
    ]
    out += [f"<p><strong>{_e(n)}</strong></p>" for n in lateral] or ["<p>(not stated)</p>"]
    out.append("<h3>National parameters</h3>")
    out.append(_kv([(k, v) for k, v in params.items()], pairs=3))
    out.append("<h3>Rules of the schedule</h3>")
    out.append(_kv(rule_rows, pairs=2))
    out.append("<h3>Method and assumptions</h3><ul>")
    out += [f"<li>{_e(n)}</li>" for n in other]
    out.append("</ul></section>")
    return "\n".join(out)


def _rule_text(v: object) -> str:
    if v is None:
        return "none"
    if hasattr(v, "value"):
        return str(v.value)
    if isinstance(v, (tuple, list)):
        return ", ".join(str(x) for x in v) if v else "none"
    if isinstance(v, bool):
        return "yes" if v else "no"
    return str(v)


def _headline(r: RunResult) -> str:
    s = summary_dict(r)
    sol = s["solver"]
    obj = r.settings.objective.value
    unit = {"steel": "kg", "cost": r.settings.costs.currency, "carbon": "kgCO2e"}.get(obj, "")
    cards = [
        ("cells (column storeys)", _num(s["cells"])),
        ("types used", _num(s["types_used"])),
        ("sections used", _num(s["sections_used"])),
        ("reinforcement (t)", _num(s["steel_t"], 2)),
        ("concrete (m3)", _num(s["concrete_m3"], 1)),
        ("formwork (m2)", _num(s["formwork_m2"], 0)),
        ("column plan area, all levels (m2)", _num(s["plan_area_m2"], 2)),
        ("embodied carbon A1-A3 (tCO2e)", _num(s["carbon_tCO2e"], 1)),
        ("max resistance utilisation", _num(s["max_resistance_utilisation"], 3)),
        ("max utilisation (with detailing, cover, fire)", _num(s["max_utilisation"], 3)),
    ]
    if s["cost"] is not None:
        cards.append((f"cost ({r.settings.costs.currency})", _num(s["cost"], 0)))
    out = ["<section id='headline'><h2>1. Headline figures</h2><div class='figures'>"]
    out += [f"<div class='figure'><div class='v'>{_e(v)}</div><div class='k'>{_e(k)}</div></div>" for k, v in cards]
    out.append("</div>")
    gap = sol["gap"]
    rows: list[tuple[str, object]] = [
        ("solver; status", f"{sol['name']}; {sol['status']}"),
        (f"objective ({obj}, {unit})", _num(sol["objective"], 1)),
        (f"best bound ({unit})", _num(sol["bound"], 1)),
        ("proven gap", f"{100 * gap:.2f} %" if gap is not None and math.isfinite(gap) else "n/a"),
        ("solve time (s)", _num(sol["seconds"], 1)),
        (f"cell-wise lower bound ({unit}): every cell at its lightest feasible type", _num(s["lower_bound"], 1)),
        (
            "rationalisation premium over the lower bound",
            f"{100 * s['premium']:.1f} %" if s["premium"] is not None and math.isfinite(s["premium"]) else "n/a",
        ),
    ]
    base = s["baseline"]
    if base is not None:
        diff = s["steel_t"] - base["steel_t"]
        rows.append(
            (
                "rule-of-thumb baseline (3 load groups, bands of 4 storeys): steel (t); types",
                f"{base['steel_t']:,.2f}; {base['types']}",
            )
        )
        pct = f" ({100 * diff / base['steel_t']:+.1f} %)" if base["steel_t"] else ""
        rows.append(("this schedule against the baseline: steel (t)", f"{diff:+,.2f}{pct}"))
    else:
        rows.append(("rule-of-thumb baseline", "none (the rule of thumb found no schedule for this building)"))
    out.append(_kv(rows))
    out.append("</section>")
    return "\n".join(out)


def _warnings(r: RunResult) -> str:
    out = ["<section id='warnings'><h2>2. Warnings</h2>"]
    if r.warnings:
        out.append("<ul class='warnings'>" + "".join(f"<li>{_e(w)}</li>" for w in r.warnings) + "</ul>")
    else:
        out.append("<p>No warnings.</p>")
    out.append("</section>")
    return "\n".join(out)


def _schedule(r: RunResult, tables: dict, folder: Path | None) -> str:
    from optimizer.reporting.pictures import elevation_figure, figure_bytes, text_colour, type_colours

    df = tables["schedule"]
    colours = type_colours(r)
    head = "<th class='level'>level</th>" + "".join(f"<th>{_e(str(c))}</th>" for c in df.columns[1:])
    rows = []
    for rec in df.itertuples(index=False):
        tds = [f"<th class='level'>{_e(str(rec[0]))}</th>"]
        for m in rec[1:]:
            m = "" if (m is None or (isinstance(m, float) and math.isnan(m))) else str(m)
            if m in colours:
                tds.append(f"<td style='background:{colours[m]};color:{text_colour(colours[m])}'>{_e(m)}</td>")
            else:
                tds.append(f"<td>{_e(m)}</td>")
        rows.append("<tr>" + "".join(tds) + "</tr>")
    out = [
        "<section class='major wide' id='schedule'><h2>4. Column schedule</h2>",
        "<p class='sub'>Type mark per column stack (across) and level (top floor first). A higher mark is a "
        "heavier column (larger section, then more steel, then a stronger grade); the shading follows the "
        "same order, pale to dark.</p>",
        f"<div class='scroll'><table class='schedule'><thead><tr>{head}</tr></thead><tbody>"
        + "".join(rows)
        + "</tbody></table></div>",
        "<h3>Elevation: type and utilisation of every cell</h3>",
        _img(_picture(folder, "elevation.png", lambda: figure_bytes(elevation_figure(r))), "elevation", natural=True),
        "</section>",
    ]
    return "\n".join(out)


def _types(r: RunResult, tables: dict, folder: Path | None) -> str:
    from optimizer.reporting.pictures import figure_bytes, text_colour, type_colours, type_curves_figure

    colours = type_colours(r)
    df = tables["types"].copy()
    df = df[[c for c in df.columns if not df[c].isna().all()]]  # e.g. no diameter column without circles
    out = [
        "<section class='major' id='types'><h2>5. Type catalogue</h2>",
        "<p class='sub'>b along plan y, h along plan z (as given; turned stacks swap them). Dimensions mm, "
        "areas mm2.</p>",
        f"<div class='scroll'>{_table(df, cls='types', digits={'rho_percent': 2})}</div>",
    ]
    for u in r.types_used:
        c = colours[u.mark]
        ct = r.catalogue.types[u.type_index]
        i = governing_cell(r, u.mark)
        stack, level = r.feasibility.cells.cells[i]
        out.append(
            f"<h3><span class='swatch' style='background:{c};color:{text_colour(c)}'>{_e(u.mark)}</span> "
            f"{_e(ct.section_key)} mm, {_e(ct.design.section.bars.notation)}, {_e(ct.design.concrete.name)}"
            f" &middot; {len(u.cells)} cells &middot; governing cell {_e(stack)} at {_e(level)}: "
            f"{_e(_utilisation_text(r, i))}</h3>"
        )
        out.append(
            _img(
                _picture(folder, f"types/{u.mark}.png", lambda m=u.mark: figure_bytes(type_curves_figure(r, m))),
                f"N-M curves of type {u.mark}",
            )
        )
    out.append("</section>")
    return "\n".join(out)


def _quantities(r: RunResult, tables: dict) -> str:
    df = tables["quantities"]
    return (
        "<section class='major' id='quantities'><h2>6. Quantities</h2>"
        "<p class='sub'>Main bars over the storey height plus the lap into the storey above; links and "
        "ties by the spacing rules of EN 1992-1-1 9.5.3. Mass from nominal bar areas and 7850 kg/m3.</p>"
        + _table(df)
        + "</section>"
    )


def _extras(r: RunResult, tables: dict, folder: Path | None) -> str:
    out = []
    pareto = tables.get("pareto")
    if isinstance(pareto, pd.DataFrame) and len(pareto):
        from optimizer.reporting.pictures import figure_bytes, pareto_figure

        out.append("<section class='major' id='pareto'><h2>Quantity against the number of types</h2>")
        out.append(_img(_picture(folder, "pareto.png", lambda: figure_bytes(pareto_figure(r, pareto))), "pareto"))
        out.append(_table(pareto) + "</section>")
    if folder is not None and (Path(folder) / "plans").is_dir():
        plans = sorted((Path(folder) / "plans").glob("*.png"))
        if plans:
            out.append("<section class='major' id='plans'><h2>Plans: tributary areas</h2>")
            out += [_img(_small_png(p.read_bytes()), p.stem) for p in plans]
            out.append("</section>")
    return "\n".join(out)


def _sheets(r: RunResult) -> str:
    out = [
        "<section class='major' id='sheets'><h2>7. Calculation sheets</h2>",
        "<p class='sub'>For each type, the cell where its strength works hardest (highest resistance "
        "utilisation), from the exact re-check of the run; each sheet's summary gives the governing "
        "resistance, detailing, cover and fire checks apart. Forces kN, moments kNm, lengths mm, "
        "stresses MPa.</p>",
        f"<p class='caution small'>{_e(CAUTION)}</p>",
    ]
    for u in r.types_used:
        out.append(sheet_fragment(cell_sheet(r, governing_cell(r, u.mark)), u.mark))
    out.append("</section>")
    return "\n".join(out)


def render_report(r: RunResult, tables: dict, folder: Path | None = None) -> str:
    """The whole report page as a string; pictures already in ``folder`` are reused."""
    sc = r.scenario
    toc = [
        ("headline", "Headline figures"),
        ("warnings", "Warnings"),
        ("inputs", "Inputs and assumptions"),
        ("schedule", "Column schedule"),
        ("types", "Type catalogue"),
        ("quantities", "Quantities"),
        ("sheets", "Calculation sheets"),
    ]
    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        "<meta name='viewport' content='width=device-width, initial-scale=1'>",
        f"<title>Column schedule report: {_e(sc.project.name)}</title><style>{_CSS}</style></head><body><main>",
        f"<h1>Column schedule report: {_e(sc.project.name)}</h1>",
        f"<p class='sub'>Reinforced-concrete columns to EN 1992-1-1 and EN 1992-1-2 &middot; "
        f"{_e(r.scenario.params.name)} &middot; colstack {_e(__version__)}</p>",
        f"<p class='caution' id='caution'>{_e(CAUTION)}</p>",
        "<nav><strong>Contents</strong><ol>"
        + "".join(f"<li><a href='#{a}'>{_e(t)}</a></li>" for a, t in toc)
        + "</ol></nav>",
        _headline(r),
        _warnings(r),
        _inputs(r),
        _schedule(r, tables, folder),
        _types(r, tables, folder),
        _quantities(r, tables),
        _extras(r, tables, folder),
        _sheets(r),
        f"<footer>{_e(CAUTION)} Scenario {_e(r.scenario_path)} (SHA-256 {_e(r.scenario_hash)}).</footer>",
        "</main></body></html>",
    ]
    return "\n".join(parts)


def write_report(r: RunResult, tables: dict, folder: Path) -> Path:
    """Write ``report.html`` into ``folder`` (an extra for :func:`optimizer.reporting.outputs.write_outputs`)."""
    path = Path(folder) / "report.html"
    path.write_text(render_report(r, tables, Path(folder)), encoding="utf-8")
    return path
