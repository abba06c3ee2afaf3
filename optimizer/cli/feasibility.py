"""``colstack feasibility SCENARIO --out DIR``: every catalogue type checked in every cell.

Writes into DIR: ``catalogue.csv`` (the types), ``lower_bound.csv`` (per cell
the lightest feasible type: the steel no rationalised schedule can beat),
``undesignable.csv`` (cells no type can carry, with the best type's
utilisation and governing check) and ``summary.json``.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

import numpy as np
import pandas as pd

from optimizer import CAUTION
from optimizer.building.scenario import load_scenario
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import Catalogue, build_catalogue
from optimizer.candidates.feasibility import Feasibility, feasibility, undesignable_frame, undesignable_lines
from optimizer.errors import InputError
from optimizer.pipeline.settings import read_run_settings
from optimizer.reporting.progress import Progress

__all__ = ["add_parser", "run", "catalogue_frame", "lower_bound_frame"]


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``feasibility`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "feasibility",
        help="check every catalogue type in every cell; lower bound on steel; cells no type can carry",
        description="Building-wide feasibility matrix (EN 1992-1-1, EN 1992-1-2). " + CAUTION,
    )
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--out", required=True, help="output folder (created; files in it are replaced)")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    return p


def catalogue_frame(cat: Catalogue) -> pd.DataFrame:
    """One row per type."""
    rows = []
    for t in cat.types:
        s = t.design.section
        rows.append(
            {
                "mark": t.mark,
                "shape": t.shape.value,
                "b_mm": s.b,
                "h_mm": s.h,
                "bars": s.bars.notation,
                "As_mm2": round(s.As, 1),
                "rho_percent": round(100 * s.As / s.Ac, 3),
                "link_mm": s.link,
                "link_spacing_mm": t.link_spacing,
                "cover_mm": s.cover,
                "grade": t.design.concrete.name,
            }
        )
    return pd.DataFrame(rows)


def lower_bound_frame(fe: Feasibility) -> pd.DataFrame:
    """Per cell: the lightest feasible candidate (no continuity, unlimited types)."""
    best, _ = fe.lower_bound()
    rows = []
    for i, (stack, level) in enumerate(fe.cells.cells):
        k = best[i]
        if k < 0:
            rows.append(
                {
                    "stack": stack,
                    "level": level,
                    "type": "",
                    "section": "",
                    "grade": "",
                    "orientation": "",
                    "steel_kg": np.nan,
                    "utilisation": np.nan,
                    "governing": "none feasible",
                }
            )
            continue
        t = fe.catalogue.types[fe.cand_type[k]]
        rows.append(
            {
                "stack": stack,
                "level": level,
                "type": t.mark,
                "section": t.design.section.label,
                "grade": t.design.concrete.name,
                "orientation": "turned" if fe.cand_orient[k] else "as given",
                "steel_kg": round(float(fe.steel_kg[k]), 2),
                "utilisation": round(float(fe.utilisation[k]), 4),
                "governing": fe.check_names[fe.governing[k]],
            }
        )
    return pd.DataFrame(rows)


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack feasibility``."""
    scenario = load_scenario(args.scenario)
    settings = read_run_settings(scenario)
    out = Path(args.out)
    if out.exists() and not out.is_dir():
        raise InputError("--out", "--out", args.out, "a folder")
    if Path(args.scenario).resolve().parent == out.resolve():
        raise InputError("--out", "--out", args.out, "a folder other than the scenario's own")
    progress = Progress(sys.stderr, quiet=args.quiet, delay_s=0.5)
    actions = scenario_actions(scenario)
    cat = build_catalogue(scenario)
    fe = feasibility(scenario, cat, actions, progress=progress, fire_rule=settings.fire_rule)
    out.mkdir(parents=True, exist_ok=True)
    catalogue_frame(cat).to_csv(out / "catalogue.csv", index=False)
    lower_bound_frame(fe).to_csv(out / "lower_bound.csv", index=False)
    undesignable_frame(fe).to_csv(out / "undesignable.csv", index=False)
    _, lb = fe.lower_bound()
    lines = undesignable_lines(fe)
    summary = {
        "scenario": str(args.scenario),
        "cells": len(fe.cells),
        "types": len(cat),
        "cover": cat.cover_note,
        "pairs_checked": fe.pairs_checked,
        "feasible_pairs": int(fe.cand_cell.size),
        "exact_rechecks": fe.exact_rechecks,
        "seconds": round(fe.seconds, 2),
        "lower_bound_steel_kg": round(lb, 1),
        "undesignable_cells": lines,
        "caution": CAUTION,
    }
    (out / "summary.json").write_text(json.dumps(summary, indent=2), encoding="utf-8")
    print(f"colstack feasibility  {scenario.project.name}\n{CAUTION}\n")
    print(
        f"  cells {len(fe.cells)}, types {len(cat)}, pairs checked {fe.pairs_checked:,} "
        f"({fe.exact_rechecks:,} re-checked exactly), feasible {fe.cand_cell.size:,}, {fe.seconds:.1f} s"
    )
    print(f"  lower bound on steel (lightest feasible type per cell): {lb / 1000:,.1f} t")
    if lines:
        print(f"  {len(lines)} cell(s) no type can carry:")
        for line in lines[:20]:
            print(f"    {line}")
    print(f"  files in {out}")
    return 3 if lines else 0
