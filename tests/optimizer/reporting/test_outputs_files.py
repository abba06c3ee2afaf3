"""End-to-end outputs of the small scenario: tables, workbook, pictures and report agree with each other.

One run of ``scenarios/small_building.toml`` (module fixture) written with every
extra; the checks compare the files with each other and with the run.
"""

from __future__ import annotations

import html
import json
import math
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from openpyxl import load_workbook

from optimizer import CAUTION
from optimizer.pipeline.run import run_scenario
from optimizer.reporting.outputs import write_outputs
from optimizer.reporting.pictures import pareto_figure, write_pictures
from optimizer.reporting.report import governing_cell, write_report
from optimizer.reporting.workbook import TABLE_SHEETS, write_workbook
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

ROOT = paths.ROOT
SCENARIO = ROOT / "scenarios" / "small_building.toml"
PNG_MAGIC = b"\x89PNG\r\n\x1a\n"


@pytest.fixture(scope="module")
def run():
    """The small scenario, run once."""
    return run_scenario(str(SCENARIO), time_limit_s=30)


@pytest.fixture(scope="module")
def out(run, tmp_path_factory):
    """Every output of the run, in a fresh folder."""
    folder = tmp_path_factory.mktemp("outputs") / "out"
    write_outputs(run, folder, extras=[write_workbook, write_pictures, write_report])
    return folder


@pytest.fixture(scope="module")
def csv(out):
    return {name: pd.read_csv(out / f"{name}.csv") for name in ("schedule", "cells", "types", "quantities")}


def test_every_output_exists(run, out):
    names = [
        "schedule.csv",
        "schedule.xlsx",
        "cells.csv",
        "types.csv",
        "quantities.csv",
        "summary.json",
        "report.html",
        "elevation.png",
        "elevation.svg",
    ]
    for name in names:
        p = out / name
        assert p.is_file() and p.stat().st_size > 100, name
    marks = {u.mark for u in run.types_used}
    assert {p.stem for p in (out / "types").glob("*.png")} == marks
    for p in [out / "elevation.png", *(out / "types").glob("*.png")]:
        assert p.read_bytes()[:8] == PNG_MAGIC, p.name
    root = ET.parse(out / "elevation.svg").getroot()
    assert root.tag.endswith("svg")
    # the takedown route draws the plans too
    assert run.takedown is not None and list((out / "plans").glob("*.png"))
    # no temporary folder is left next to the output
    assert not [p for p in out.parent.iterdir() if p.name.startswith(".out.")]


def test_cell_steel_sums_to_quantities_total(csv, run):
    cells, q = csv["cells"], csv["quantities"]
    total_t = float(q.loc[q["group"] == "reinforcement: total", "quantity"].iloc[0])
    # cells.csv rounds to 0.01 kg per cell, quantities.csv to 0.001 t
    assert cells["steel_kg"].sum() / 1000 == pytest.approx(total_t, abs=1e-3 + len(cells) * 5e-6)
    assert total_t == pytest.approx(run.totals["steel_t"], abs=5e-4)
    # the parts add up to the whole in every row
    parts = cells["main_bars_kg"] + cells["links_kg"]
    assert np.allclose(parts, cells["steel_kg"], atol=0.011)
    # and the by-diameter rows add up to the total
    bars = q[q["group"].str.startswith("reinforcement:") & (q["group"] != "reinforcement: total")]
    assert bars["quantity"].sum() == pytest.approx(total_t, abs=0.002)


def test_schedule_and_cells_agree_on_every_mark(csv, run):
    sched = csv["schedule"].set_index("level")
    cells = csv["cells"]
    assert len(cells) == len(run.scenario.cells)
    for rec in cells.itertuples():
        assert sched.loc[rec.level, rec.stack] == rec.type, (rec.stack, rec.level)
    # levels top-down in the schedule
    assert list(sched.index) == [lv.name for lv in reversed(run.scenario.levels)]
    # and the counts of cells per type agree with types.csv
    counts = cells["type"].value_counts()
    for rec in csv["types"].itertuples():
        assert counts[rec.mark] == rec.cells


def test_every_type_is_used(csv):
    used = set(csv["cells"]["type"])
    marks = set(csv["types"]["mark"])
    assert marks == used
    sched_marks = set(csv["schedule"].drop(columns="level").to_numpy().ravel()) - {""}
    sched_marks = {m for m in sched_marks if isinstance(m, str)}
    assert sched_marks == marks


def test_every_chosen_type_passes_its_exact_check(run, csv):
    assert bool(np.all(run.checks.ok))
    assert float(np.max(run.checks.utilisation)) <= 1.0 + 1e-9
    assert (csv["cells"]["utilisation"] <= 1.0 + 1e-9).all()


def _sheet_frame(ws) -> pd.DataFrame:
    rows = list(ws.iter_rows(values_only=True))
    header = []
    for h in rows[0]:  # the table's header ends at the first empty cell (a legend may follow)
        if h is None:
            break
        header.append(h)
    data = [list(r[: len(header)]) for r in rows[1:]]
    data = [r for r in data if any(x is not None for x in r)]
    return pd.DataFrame(data, columns=header)


def _same(a, b) -> bool:
    """A CSV value and a workbook value are the same (NaN and empty alike; numbers as numbers)."""
    a_missing = a is None or (isinstance(a, float) and math.isnan(a))
    b_missing = b is None or (isinstance(b, float) and math.isnan(b))
    if a_missing or b_missing:
        return a_missing and b_missing
    if isinstance(a, (bool, np.bool_)) or isinstance(b, (bool, np.bool_)):
        return bool(a) == bool(b) and type(b) is bool
    if isinstance(a, (int, float, np.integer, np.floating)):
        return isinstance(b, (int, float)) and float(a) == pytest.approx(float(b), rel=1e-12, abs=1e-12)
    return str(a) == str(b)


def test_workbook_holds_the_csv_numbers(out, csv, run):
    wb = load_workbook(out / "schedule.xlsx")
    assert wb.sheetnames[0] == "Read me"
    for key in ("schedule", "types", "cells", "quantities"):
        ws = wb[TABLE_SHEETS[key]]
        got = _sheet_frame(ws)
        want = csv[key]
        assert list(got.columns) == list(want.columns), key
        assert len(got) == len(want), key
        for col in want.columns:
            for k, (a, b) in enumerate(zip(want[col].tolist(), got[col].tolist(), strict=True)):
                assert _same(a, b), (key, col, k, a, b)
    # numbers are stored as numbers, not text
    cells = wb["Cells"]
    header = [c.value for c in cells[1]]
    j = header.index("NEd_kN") + 1
    assert all(isinstance(cells.cell(row=i, column=j).value, float | int) for i in range(2, cells.max_row + 1))
    # the Read me sheet carries the caution, project, solver status and units
    text = " ".join(str(c) for row in wb["Read me"].iter_rows(values_only=True) for c in row if c is not None)
    assert CAUTION in text
    assert run.scenario.project.name in text
    assert run.schedule.status in text
    assert "kNm" in text and "m3" in text
    # the schedule sheet shades each mark and freezes its header
    ws = wb["Schedule"]
    assert ws.freeze_panes == "B2"
    fills = {
        ws.cell(row=i, column=j).value: ws.cell(row=i, column=j).fill.fgColor.rgb
        for i in range(2, ws.max_row + 1)
        for j in range(2, len(csv["schedule"].columns) + 1)
        if ws.cell(row=i, column=j).value
    }
    assert len(set(fills.values())) == len(fills) == len(run.types_used)


def test_summary_json_matches_run(out, run):
    s = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    assert s["caution"] == CAUTION
    assert s["types_used"] == len(run.types_used)


def test_report_has_caution_marks_and_one_sheet_per_type(out, run):
    page = (out / "report.html").read_text(encoding="utf-8")
    assert html.escape(CAUTION) in page
    # the caution comes before any result
    assert page.index(html.escape(CAUTION)) < page.index("Headline figures</h2>")
    marks = [u.mark for u in run.types_used]
    sheets = re.findall(r"<section class='sheet' id='sheet-([^']+)'", page)
    assert sorted(sheets) == sorted(marks)
    for m in marks:
        assert f">{m}<" in page  # in the schedule and catalogue
        # the sheet is for the type's most utilised cell
        i = governing_cell(run, m)
        assert i in next(u.cells for u in run.types_used if u.mark == m)
        stack, level = run.feasibility.cells.cells[i]
        assert f"Type {m}: governing cell {stack} at level {level}" in page
        cells = np.array(next(u.cells for u in run.types_used if u.mark == m))
        # the governing cell is where the type's strength works hardest, not where cover or fire govern
        res = np.asarray(run.checks.resistance_utilisation)
        assert res[i] == pytest.approx(res[cells].max(), rel=1e-12)
    assert page.count("PASSES: utilisation") == len(marks)
    # self-contained: no scripts, nothing loaded from elsewhere
    assert "<script" not in page.lower()
    srcs = re.findall(r"""(?:src|href)\s*=\s*['"]([^'"]+)""", page)
    assert srcs and all(s.startswith(("data:image/png;base64,", "#")) for s in srcs)
    assert page.count("data:image/png;base64,") >= 1 + len(marks)  # elevation + curves per type
    # print rules
    assert "@page" in page and "break-before: page" in page


def test_run_checks_keep_their_kinds(run):
    """The exact re-check of the run keeps each check's kind (resistance, detailing, cover, fire)."""
    from design.results import CheckKind

    kinds = {c.name: c.kind for c in run.checks.checks}
    assert kinds["biaxial interaction"] is CheckKind.RESISTANCE
    assert kinds["nominal cover to links"] is CheckKind.COVER
    assert kinds["link diameter"] is CheckKind.DETAILING
    assert {kinds[n] for n in kinds if n.startswith("fire resistance")} == {CheckKind.FIRE}


def test_cells_csv_gives_resistance_beside_overall(csv, run):
    from design.results import CheckKind

    cells = csv["cells"]
    cols = list(cells.columns)
    # the new columns sit beside the overall ones; the old columns are all still there
    assert cols[cols.index("clause") + 1 : cols.index("clause") + 3] == [
        "utilisation_resistance",
        "governing_resistance",
    ]
    for old in ("utilisation", "governing", "clause", "fire_verified", "steel_kg"):
        assert old in cols
    assert np.allclose(cells["utilisation_resistance"], np.round(run.checks.resistance_utilisation, 3), atol=1e-9)
    assert (cells["utilisation_resistance"] <= cells["utilisation"] + 1e-9).all()
    kinds = {c.name: c.kind for c in run.checks.checks}
    assert {kinds[n] for n in cells["governing_resistance"]} == {CheckKind.RESISTANCE}
    # where strength governs overall, both columns name the same check
    same = cells["utilisation_resistance"] == cells["utilisation"]
    assert (cells.loc[same, "governing"] == cells.loc[same, "governing_resistance"]).all()


def test_report_states_lateral_stability_once_and_resistance_per_type(out, run):
    page = html.unescape((out / "report.html").read_text(encoding="utf-8"))
    assert page.count("Lateral stability") == 1
    text = re.sub(r"<[^>]+>", "", page)
    for u in run.types_used:
        i = governing_cell(run, u.mark)
        res = run.checks.checks[int(run.checks.governing_resistance[i])]
        gov = run.checks.checks[int(run.checks.governing[i])]
        want = f"resistance {run.checks.resistance_utilisation[i]:.3f} ({res.name})"
        if gov.name != res.name:
            want += f"; overall {run.checks.utilisation[i]:.3f} ({gov.name})"
        assert want in text, (u.mark, want)
    # each sheet opens with the governing check of every kind
    assert page.count("governing resistance check") == len(run.types_used)


def test_interrupted_run_leaves_previous_output_intact(run, tmp_path):
    folder = tmp_path / "out"
    write_outputs(run, folder, extras=[write_workbook])
    before = {p.relative_to(folder): p.read_bytes() for p in folder.rglob("*") if p.is_file()}
    assert Path("schedule.xlsx") in before

    def broken(r, tables, tmp):  # writes part of its output, then fails
        (tmp / "report.html").write_text("<html>half", encoding="utf-8")
        (tmp / "cells.csv").write_text("overwritten", encoding="utf-8")
        raise RuntimeError("interrupted")

    with pytest.raises(RuntimeError, match="interrupted"):
        write_outputs(run, folder, extras=[write_workbook, broken])
    after = {p.relative_to(folder): p.read_bytes() for p in folder.rglob("*") if p.is_file()}
    assert after == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]  # no temporary folder left


def test_pareto_picture_draws_steel_and_cost(run, tmp_path):
    pareto = pd.DataFrame(
        {
            "types": [1, 2, 3, 4],
            "steel_t": [np.nan, 5.5, 4.9, 4.6],
            "cost": [np.nan, 9100.0, 8800.0, 8700.0],
            "objective": [np.nan, 5500, 4900, 4600],
        }
    )
    fig = pareto_figure(run, pareto)
    try:
        lines = [
            ln
            for ax in fig.axes
            for ln in ax.get_lines()
            if ln.get_label() in ("steel (t)",) or ln.get_label().startswith("cost")
        ]
        assert len(lines) == 2
        steel = next(ln for ln in lines if ln.get_label() == "steel (t)")
        assert list(steel.get_xdata()) == [2, 3, 4]  # the infeasible cap is left out
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)


def test_types_csv_reports_cross_ties_and_the_link_steel_counts_them(csv, run):
    """EN 1992-1-1, 9.5.3(6): every bar in a compression zone within 150 mm of a restrained bar.
    types.csv gives the extra ties per type, recounted here bar by bar from the bar coordinates,
    and the link steel of a cell grows with them (counted in links_kg)."""
    from design import detailing

    for rec in csv["types"].itertuples():
        t = next(u.type_index for u in run.types_used if u.mark == rec.mark)
        s = run.catalogue.types[t].design.section
        if not hasattr(s, "bars") or s.__class__.__name__ != "RectSection":
            assert rec.cross_ties == 0
            continue
        y, z, _ = s.bar_coords()
        need = 0
        for along, across in ((y, z), (z, y)):
            for side in (across.max(), across.min()):
                on = np.isclose(across, side, atol=20.0)
                need += detailing.extra_ties_needed(np.sort(along[on]))
        assert rec.cross_ties == need


def test_cross_ties_add_their_steel_to_the_links(run):
    """Each extra tie of 9.5.3(6) adds, per link set, one tie across the section (min(b, h) plus two
    135-degree hooks of 10 diameters, common practice) to the link steel of the cell."""
    import math

    from optimizer.candidates.catalogue import type_arrays
    from optimizer.candidates.feasibility import quantities

    fe, cat = run.feasibility, run.catalogue
    ta = type_arrays(cat)
    with_ties = np.nonzero(ta["extra_ties"] > 0)[0]
    if with_ties.size == 0:
        pytest.skip("no type of this catalogue needs cross-ties")
    t = int(with_ties[0])
    cell = np.array([0])
    base = quantities(fe.cells, ta, cell, np.array([t]), run.scenario)["link_kg"][0]
    none = dict(ta, extra_ties=np.zeros_like(ta["extra_ties"]))
    bare = quantities(fe.cells, none, cell, np.array([t]), run.scenario)["link_kg"][0]
    link = ta["link"][t]
    tie_kg = (min(ta["b"][t], ta["h"][t]) + 20 * link) * math.pi * link**2 / 4 * 1e-9 * 7850.0
    sets = (base - bare) / (ta["extra_ties"][t] * tie_kg)
    assert base > bare
    assert sets == pytest.approx(round(sets), rel=1e-9) and sets >= 2  # a whole number of link sets
