"""``colstack compare SCENARIO --grades C30/37,C40/50,... --out DIR``: grades compared on the whole building.

Runs the full optimisation per grade (and, with ``--choice``, with the grade
chosen per cell from a list), then writes ``compare.csv``, ``compare.xlsx``,
``compare.png`` and ``compare.txt`` (the plain-language comparison), and one
sub-folder of tables per variant.
"""

from __future__ import annotations

import argparse
import re
import sys
from pathlib import Path

from optimizer import CAUTION
from optimizer.building.scenario import load_scenario
from optimizer.errors import InputError
from optimizer.reporting.outputs import atomic_folder, frames
from optimizer.reporting.progress import Progress
from optimizer.studies.compare import compare_sentences, grade_variants, plot_comparison, run_variants

__all__ = ["add_parser", "run"]


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``compare`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "compare",
        help="compare concrete grades: the whole optimisation per grade, one table and one chart",
        description="Concrete grades compared on the whole building. " + CAUTION,
    )
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--grades", required=True, help="comma-separated classes, e.g. C30/37,C40/50,C50/60")
    p.add_argument(
        "--choice",
        action="append",
        default=[],
        metavar="GRADES",
        help="also let the optimiser choose per cell among these classes (comma-separated); repeatable",
    )
    p.add_argument("--out", required=True, help="output folder (replaced as a whole when the comparison succeeds)")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    return p


def _split(text: str) -> list[str]:
    return [g.strip() for g in re.split(r"[,\s]+", text) if g.strip()]


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack compare``."""
    scenario = load_scenario(args.scenario)
    grades = _split(args.grades)
    if not grades:
        raise InputError("--grades", "--grades", args.grades, "at least one class, e.g. C40/50")
    choices = [_split(c) for c in args.choice]
    if any(len(c) < 2 for c in choices):
        raise InputError("--choice", "--choice", args.choice, "at least two classes per choice")
    variants = grade_variants(scenario, grades, choices)
    progress = Progress(sys.stderr, quiet=args.quiet)
    try:
        table, results = run_variants(variants, progress=progress)
    finally:
        progress.close()
    sentences = compare_sentences(table)
    with atomic_folder(Path(args.out), protect=[Path(args.scenario).resolve().parent]) as tmp:
        table.to_csv(tmp / "compare.csv", index=False)
        with _excel(tmp / "compare.xlsx") as xl:
            table.to_excel(xl, sheet_name="Comparison", index=False)
        plot_comparison(table, tmp / "compare.png")
        (tmp / "compare.txt").write_text("\n".join([CAUTION, "", *sentences, ""]), encoding="utf-8")
        for name, r in results.items():
            sub = tmp / re.sub(r"[^A-Za-z0-9+._-]", "_", name)
            sub.mkdir()
            for stem, df in frames(r).items():
                df.to_csv(sub / f"{stem}.csv", index=False)
    print(f"colstack compare  {scenario.project.name}\n{CAUTION}\n")
    print(
        table[
            [
                "variant",
                "steel_t",
                "concrete_m3",
                "carbon_tCO2e",
                "types",
                "column_plan_area_m2",
                "largest_ground_column",
                "premium_percent",
                "gap_percent",
            ]
        ].to_string(index=False)
    )
    print()
    for s in sentences:
        print(f"  {s}")
    print(f"\n  files in {args.out}")
    return 0


def _excel(path: Path):
    import pandas as pd

    return pd.ExcelWriter(path, engine="openpyxl")
