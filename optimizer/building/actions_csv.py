"""The actions CSV: per-cell design actions from an analysis, or written from the takedown.

Both routes give the later stages the same table (:data:`ACTION_COLUMNS`, then
:data:`OPTIONAL_COLUMNS` and :data:`K_COLUMNS` where present): kN, kNm, mm,
compression positive, moments about the section's local axes as oriented.
"""

from __future__ import annotations

import csv
import math
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import pandas as pd

from optimizer.building.model import CellId, Scenario
from optimizer.building.scenario import exposure_value, fire_value
from optimizer.errors import InputError, did_you_mean

__all__ = ["ACTION_COLUMNS", "OPTIONAL_COLUMNS", "K_COLUMNS", "read_actions_csv", "write_actions_csv"]

# Required in every actions table (kN, kNm; compression positive; moments about the local axes).
ACTION_COLUMNS = ("stack", "level", "NEd_kN", "My_top_kNm", "My_bot_kNm", "Mz_top_kNm", "Mz_bot_kNm")
# Optional; blank lengths, exposure and fire come from the scenario's [[settings]], blank ratios are unknown.
OPTIONAL_COLUMNS = ("l0y_mm", "l0z_mm", "exposure", "fire", "M0Eqp_ratio", "char_ratio", "eta_fi")
K_COLUMNS = ("k1y", "k2y", "k1z", "k2z")  # EN 1992-1-1, 5.8.3.2(3): all four or none


def write_actions_csv(actions: pd.DataFrame, path: str | Path) -> Path:
    """Write an actions table in the CSV format (kN, kNm, mm; compression positive).

    Columns: ``stack, level, NEd_kN, My_top_kNm, My_bot_kNm, Mz_top_kNm,
    Mz_bot_kNm`` then, when present, ``l0y_mm, l0z_mm, exposure, fire, M0Eqp_ratio, char_ratio, eta_fi`` and
    ``k1y, k2y, k1z, k2z``.
    """
    missing = [c for c in ACTION_COLUMNS if c not in actions.columns]
    if missing:
        msg = f"actions table lacks columns {missing}"
        raise ValueError(msg)
    cols = list(ACTION_COLUMNS) + [c for c in (*OPTIONAL_COLUMNS, *K_COLUMNS) if c in actions.columns]
    out = Path(path)
    out.parent.mkdir(parents=True, exist_ok=True)
    actions[cols].to_csv(out, index=False, float_format="%.3f", lineterminator="\n")
    return out


def _csv_float(file: str, row: int, col: str, text: str, minimum: float | None = None) -> float:
    where = f"row {row}, column {col}"
    try:
        x = float(text)
    except ValueError:
        raise InputError(file, where, text, "a number") from None
    if not math.isfinite(x):
        raise InputError(file, where, text, "a finite number")
    if minimum is not None and x < minimum:
        raise InputError(file, where, text, f"a number >= {minimum:g}")
    return x


def read_actions_csv(path: str | Path, scenario: Scenario) -> pd.DataFrame:  # noqa: PLR0912 - reads and validates one input file, one branch per column rule
    """Read per-cell actions from an analysis and check them against the scenario.

    Required columns :data:`ACTION_COLUMNS`; optional :data:`OPTIONAL_COLUMNS`
    and :data:`K_COLUMNS`. Moments are about the section's local axes as
    oriented (kNm), NEd compression positive (kN), lengths in mm. Every cell of
    the scenario needs exactly one row. Blank optional values are filled from
    the scenario's ``[[settings]]`` where they give one. Rows are numbered as
    lines of the file (the header is row 1).
    """
    p = Path(path)
    file = str(p)
    try:
        with p.open(newline="", encoding="utf-8-sig") as fh:
            rows = list(csv.reader(fh))
    except FileNotFoundError:
        raise InputError(file, "(file)", file, "an existing actions CSV file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(file, "(file)", file, f"a readable UTF-8 CSV file ({exc})") from None
    if not rows:
        raise InputError(file, "row 1", "", f"a header row: {', '.join(ACTION_COLUMNS)}")
    header = [h.strip() for h in rows[0]]
    known = (*ACTION_COLUMNS, *OPTIONAL_COLUMNS, *K_COLUMNS)
    missing = [c for c in ACTION_COLUMNS if c not in header]
    if missing:
        raise InputError(
            file,
            "row 1 (header)",
            ", ".join(missing),
            f"these required columns (header must contain {', '.join(ACTION_COLUMNS)})",
        )
    for h in header:
        if h not in known:
            raise InputError(
                file, "row 1 (header)", h, f"a known column{did_you_mean(h, known)} (known: {', '.join(known)})"
            )
    if len(set(header)) != len(header):
        raise InputError(file, "row 1 (header)", header, "each column once")
    if any(k in header for k in K_COLUMNS) and not all(k in header for k in K_COLUMNS):
        raise InputError(
            file, "row 1 (header)", [k for k in K_COLUMNS if k in header], "all four of k1y, k2y, k1z, k2z or none"
        )
    records: dict[CellId, dict[str, Any]] = {}
    for n, raw in enumerate(rows[1:], start=2):
        if not any(v.strip() for v in raw):
            continue
        if len(raw) != len(header):
            raise InputError(
                file, f"row {n}", ",".join(raw), f"{len(header)} values like the header (found {len(raw)})"
            )
        rec = dict(zip(header, (v.strip() for v in raw), strict=True))
        records_key = _csv_cell(file, n, rec, scenario)
        if records_key in records:
            raise InputError(
                file, f"row {n}", f"{rec['stack']},{rec['level']}", "one row per cell (this cell appears twice)"
            )
        records[records_key] = _csv_record(file, n, rec)
    for c in scenario.cells:
        if c.id not in records:
            raise InputError(
                file, "rows", f"{c.stack},{c.level}", "a row for every cell of the scenario (this one is missing)"
            )
    return _actions_frame(scenario, records, header)


def _csv_cell(file: str, n: int, rec: Mapping[str, str], scenario: Scenario) -> CellId:
    stack, level = rec["stack"], rec["level"]
    ids = [s.id for s in scenario.stacks]
    names = [lv.name for lv in scenario.levels]
    if stack not in ids:
        raise InputError(file, f"row {n}, column stack", stack, f"a stack of the scenario{did_you_mean(stack, ids)}")
    if level not in names:
        raise InputError(file, f"row {n}, column level", level, f"a level of the scenario{did_you_mean(level, names)}")
    cid = CellId(stack, level)
    if not scenario.has_cell(cid):
        st = scenario.stack(stack)
        raise InputError(
            file,
            f"row {n}, column level",
            level,
            f"a level stack {stack!r} runs through ({st.from_level}..{st.to_level})",
        )
    return cid


def _csv_record(file: str, n: int, rec: Mapping[str, str]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for col in ACTION_COLUMNS[2:]:
        if rec[col] == "":
            raise InputError(file, f"row {n}, column {col}", "", "a number (required)")
        minimum = 0.0 if col == "NEd_kN" else None
        out[col] = _csv_float(file, n, col, rec[col], minimum)
    for col in ("l0y_mm", "l0z_mm"):
        if rec.get(col, ""):
            x = _csv_float(file, n, col, rec[col])
            if x <= 0:
                raise InputError(file, f"row {n}, column {col}", rec[col], "a positive length in mm")
            out[col] = x
    for col in K_COLUMNS:
        if rec.get(col, ""):
            out[col] = _csv_float(file, n, col, rec[col], 0.0)
    if rec.get("exposure", ""):
        out["exposure"] = exposure_value(file, f"row {n}, column exposure", rec["exposure"])
    if rec.get("fire", ""):
        out["fire"] = fire_value(file, f"row {n}, column fire", rec["fire"])
    for col, what in (
        ("M0Eqp_ratio", "M0Eqp/M0Ed between 0 and 1.5 (quasi-permanent over design first-order moment)"),
        ("char_ratio", "a ratio between 0 and 1.5 (characteristic over design actions)"),
        ("eta_fi", "a ratio between 0 and 1.5 (design actions in fire over design actions, EN 1992-1-2 2.4.2)"),
    ):
        if rec.get(col, ""):
            x = _csv_float(file, n, col, rec[col], 0.0)
            if x > 1.5:
                raise InputError(file, f"row {n}, column {col}", rec[col], what)
            out[col] = x
    return out


def _actions_frame(scenario: Scenario, records: Mapping[CellId, dict[str, Any]], header: list[str]) -> pd.DataFrame:
    any_k = any(k in header for k in K_COLUMNS) or any(
        c.settings.effective_length is not None and not c.settings.effective_length.uses_factors for c in scenario.cells
    )
    rows = []
    for c in scenario.cells:
        rec = records[c.id]
        el = c.settings.effective_length
        row = {"stack": c.stack, "level": c.level}
        row.update({k: rec[k] for k in ACTION_COLUMNS[2:]})
        row["l0y_mm"] = rec.get("l0y_mm", c.l0y_mm)
        row["l0z_mm"] = rec.get("l0z_mm", c.l0z_mm)
        row["exposure"] = rec.get("exposure", c.settings.exposure)
        row["fire"] = rec.get("fire", c.settings.fire)
        row["M0Eqp_ratio"] = rec.get("M0Eqp_ratio", math.nan)  # blank: not known (phi_ef with 1.0, said)
        row["char_ratio"] = rec.get("char_ratio", math.nan)  # blank: design actions for 7.2(2), said
        row["eta_fi"] = rec.get("eta_fi", math.nan)  # blank: mu_fi = 0.7 for method A (5.3.2(3))
        if any_k:
            for k in K_COLUMNS:
                default = getattr(el, k) if el is not None else None
                row[k] = rec.get(k, default)
        rows.append(row)
    df = pd.DataFrame(rows)
    for col in ("l0y_mm", "l0z_mm", "M0Eqp_ratio", "char_ratio", "eta_fi", *(K_COLUMNS if any_k else ())):
        df[col] = df[col].astype(float)
    return df
