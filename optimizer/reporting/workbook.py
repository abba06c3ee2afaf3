"""The run's tables as one formatted workbook (openpyxl): schedule.xlsx.

Sheets: "Read me" (caution, project, solver, units), "Schedule" (levels top
down, stacks across, type marks shaded by type), "Types", "Cells",
"Quantities" and, when the run swept the number of types, "Pareto". Numbers
are written as numbers, the same values as the CSV files; a missing value
(NaN) is an empty cell. Edge units are named in the column headers.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pandas as pd
from openpyxl import Workbook
from openpyxl.styles import Alignment, Border, Font, PatternFill, Side
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from optimizer import CAUTION
from optimizer.pipeline.run import RunResult
from optimizer.reporting.outputs import summary_dict
from optimizer.reporting.pictures import text_colour, type_colours

__all__ = ["write_workbook", "TABLE_SHEETS"]

TABLE_SHEETS = {
    "schedule": "Schedule",
    "types": "Types",
    "cells": "Cells",
    "quantities": "Quantities",
    "pareto": "Pareto",
}

_HEAD_FILL = PatternFill("solid", fgColor="E7ECE9")
_HEAD_FONT = Font(bold=True, color="1D2433")
_CAUTION_FILL = PatternFill("solid", fgColor="FFF4E0")
_THIN = Side(style="thin", color="C8CCD0")
_BOX = Border(left=_THIN, right=_THIN, top=_THIN, bottom=_THIN)


def _plain(x: object) -> object:
    """A cell value: numpy scalars to Python numbers, NaN and None to an empty cell."""
    if x is None:
        return None
    if isinstance(x, (np.bool_, bool)):
        return bool(x)
    if isinstance(x, (int, np.integer)):
        return int(x)
    if isinstance(x, (np.floating, float)):
        return None if not math.isfinite(float(x)) else float(x)
    if isinstance(x, str):
        return x
    if pd.isna(x):
        return None
    return str(x)


def _put_frame(ws: Worksheet, df: pd.DataFrame, start_row: int = 1) -> None:
    """Header row plus data rows; header frozen, auto filter, widths from the content."""
    for j, name in enumerate(df.columns, start=1):
        c = ws.cell(row=start_row, column=j, value=str(name))
        c.fill, c.font, c.border = _HEAD_FILL, _HEAD_FONT, _BOX
        c.alignment = Alignment(horizontal="center", vertical="center", wrap_text=True)
    for i, row in enumerate(df.itertuples(index=False), start=start_row + 1):
        for j, x in enumerate(row, start=1):
            ws.cell(row=i, column=j, value=_plain(x))
    ws.freeze_panes = ws.cell(row=start_row + 1, column=1)
    if len(df.columns):
        ws.auto_filter.ref = f"A{start_row}:{get_column_letter(len(df.columns))}{start_row + len(df)}"
    for j, name in enumerate(df.columns, start=1):
        longest = max([len(str(name))] + [len(str(_plain(x))) for x in df.iloc[:, j - 1].head(500)])
        ws.column_dimensions[get_column_letter(j)].width = min(max(8, longest + 2), 48)


def _schedule_sheet(ws: Worksheet, r: RunResult, df: pd.DataFrame) -> None:
    """Levels top-down as rows, stacks as columns; each mark shaded with its type's colour."""
    _put_frame(ws, df)
    ws.freeze_panes = "B2"
    ws.auto_filter.ref = None
    colours = type_colours(r)
    fills = {m: PatternFill("solid", fgColor=c.lstrip("#").upper()) for m, c in colours.items()}
    fonts = {m: Font(bold=True, color=text_colour(c).lstrip("#").upper()) for m, c in colours.items()}
    for row in ws.iter_rows(min_row=2, max_row=len(df) + 1, min_col=1, max_col=len(df.columns)):
        row[0].font = Font(bold=True)
        for c in row[1:]:
            c.alignment = Alignment(horizontal="center")
            c.border = _BOX
            if c.value in fills:
                c.fill, c.font = fills[c.value], fonts[c.value]
    for j in range(2, len(df.columns) + 1):
        ws.column_dimensions[get_column_letter(j)].width = 8
    # legend to the right of the grid
    col = len(df.columns) + 2
    ws.cell(row=1, column=col, value="type legend").font = _HEAD_FONT
    for k, u in enumerate(r.types_used, start=2):
        ct = r.catalogue.types[u.type_index]
        c = ws.cell(row=k, column=col, value=u.mark)
        c.fill, c.font, c.alignment = fills[u.mark], fonts[u.mark], Alignment(horizontal="center")
        ws.cell(
            row=k,
            column=col + 1,
            value=f"{ct.section_key} mm, {ct.design.section.bars.notation}, {ct.design.concrete.name}, "
            f"{len(u.cells)} cells",
        )
    ws.column_dimensions[get_column_letter(col)].width = 8
    ws.column_dimensions[get_column_letter(col + 1)].width = 40


def _readme_sheet(ws: Worksheet, r: RunResult) -> None:
    s = summary_dict(r)
    sol = s["solver"]
    ws.column_dimensions["A"].width = 30
    ws.column_dimensions["B"].width = 100
    c = ws.cell(row=1, column=1, value="Column schedule workbook")
    c.font = Font(bold=True, size=14)
    c = ws.cell(row=2, column=1, value=CAUTION)
    ws.merge_cells("A2:B2")
    c.font = Font(bold=True, color="8A3B00")
    c.fill = _CAUTION_FILL
    c.alignment = Alignment(wrap_text=True, vertical="center")
    ws.row_dimensions[2].height = 32
    gap = sol["gap"]
    unit = {"steel": "kg", "cost": r.settings.costs.currency, "carbon": "kgCO2e"}.get(s["objective"], "")
    rows: list[tuple[str, object]] = [
        ("project", s["project"]),
        ("scenario", s["scenario"]),
        ("scenario SHA-256 (first 16)", s["scenario_sha256_16"]),
        ("national parameters", s["parameters"]["name"]),
        ("objective", s["objective"]),
        ("solver", sol["name"]),
        ("solver status", sol["status"]),
        ("proven gap (fraction)", None if gap is None or not math.isfinite(gap) else float(gap)),
        (f"objective value ({unit})", _plain(sol["objective"])),
        (f"best bound ({unit})", _plain(sol["bound"])),
        ("cells", s["cells"]),
        ("types used", s["types_used"]),
        ("sections used", s["sections_used"]),
        ("steel (t)", s["steel_t"]),
        ("concrete (m3)", s["concrete_m3"]),
        ("max utilisation", s["max_utilisation"]),
        ("colstack version", s["versions"]["colstack"]),
        ("", ""),
        (
            "units",
            "forces kN, moments kNm, lengths mm, steel kg (t in quantities), concrete m3, areas m2; "
            "the unit of every column is named in its header",
        ),
        (
            "Schedule",
            "levels top down (roof first), column stacks across; each cell holds its type mark, "
            "shaded by type (pale = light type, dark = heavy type)",
        ),
        ("Types", "the type catalogue of this schedule: section, bars, links, cover, grade, where used"),
        (
            "Cells",
            "one row per column and storey: actions, design moments, resistances, slenderness, "
            "utilisation, governing check, steel",
        ),
        ("Quantities", "reinforcement by diameter, concrete by grade, formwork, plan area, cost, carbon"),
        ("Pareto", "when present: the best schedule for each cap on the number of types"),
    ]
    for k, (key, val) in enumerate(rows, start=4):
        ws.cell(row=k, column=1, value=key).font = Font(bold=True)
        cell = ws.cell(row=k, column=2, value=_plain(val) if not isinstance(val, str) else val)
        cell.alignment = Alignment(wrap_text=True, horizontal="left", vertical="top")
    k = 4 + len(rows) + 1
    for title, items in (("warnings", r.warnings), ("assumptions", r.notes)):
        ws.cell(row=k, column=1, value=title).font = Font(bold=True)
        for item in items or ["none"]:
            cell = ws.cell(row=k, column=2, value=item)
            cell.alignment = Alignment(wrap_text=True, vertical="top")
            k += 1
        k += 1


def write_workbook(r: RunResult, tables: dict[str, pd.DataFrame], folder: Path) -> Path:
    """Write ``schedule.xlsx`` into ``folder`` (an extra for :func:`optimizer.reporting.outputs.write_outputs`)."""
    wb = Workbook()
    _readme_sheet(wb.active, r)
    wb.active.title = "Read me"
    for key, title in TABLE_SHEETS.items():
        df = tables.get(key)
        if not isinstance(df, pd.DataFrame):
            continue
        ws = wb.create_sheet(title)
        if key == "schedule":
            _schedule_sheet(ws, r, df)
        else:
            _put_frame(ws, df)
    for ws in wb.worksheets:
        ws.page_setup.orientation = "landscape"
        ws.page_setup.fitToWidth = 1
        ws.page_setup.fitToHeight = 0
        ws.sheet_properties.pageSetUpPr.fitToPage = True
        ws.oddFooter.left.text = "Concept design only: verify by a qualified engineer"
    path = Path(folder) / "schedule.xlsx"
    wb.save(path)
    return path
