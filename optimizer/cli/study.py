"""``colstack study STUDY.toml --out DIR``: the whole optimisation over a grid of choices.

Every combination of the study variables is a variant of the base scenario,
run in parallel on local worker processes (all cores by default) or, with
``--scheduler ADDRESS``, on a running Dask distributed cluster. Each result is
kept in ``DIR/runs/`` as it arrives; a rerun skips the variants already done.
At the end: ``results.csv``, ``results.xlsx``, ``summary.txt`` and the
trade-off charts. Exit status 0 when at least one variant has results, 3 when
none has (2 for bad input, as everywhere).
"""

from __future__ import annotations

import argparse
import sys

from optimizer import CAUTION
from optimizer.errors import EXIT_IMPOSSIBLE, InputError
from optimizer.reporting.progress import Progress
from optimizer.studies.study import run_study
from optimizer.studies.study_spec import load_study

__all__ = ["add_parser", "run"]


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``study`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "study",
        help="a parametric study: the whole optimisation for every combination of grades, bars, caps...",
        description="Run the whole optimisation for every combination of the study variables and tabulate the "
        "trade-offs. " + CAUTION,
    )
    p.add_argument("study", help="study file (TOML), see docs/studies.md")
    p.add_argument("--out", required=True, help="output folder (kept between runs: finished variants are skipped)")
    p.add_argument("--workers", metavar="N", help="local worker processes (default: all cores; 1: one at a time)")
    p.add_argument(
        "--scheduler",
        metavar="ADDRESS",
        help="run on a running Dask distributed cluster, e.g. tcp://10.0.0.5:8786 (needs 'distributed')",
    )
    p.add_argument("--retry-failed", action="store_true", help="also rerun variants that failed before")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    return p


def _workers(text: str | None) -> int | None:
    if text is None:
        return None
    try:
        n = int(text)
    except ValueError:
        n = 0
    if n < 1:
        raise InputError("--workers", "--workers", text, "a whole number of worker processes, at least 1")
    return n


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack study``."""
    workers = _workers(args.workers)
    if workers is not None and args.scheduler:
        raise InputError("--workers", "--workers", args.workers, "no --workers with --scheduler (the cluster decides)")
    study = load_study(args.study)
    progress = Progress(sys.stderr, quiet=args.quiet)
    try:
        outcome = run_study(
            study,
            args.out,
            workers=workers,
            scheduler=args.scheduler,
            progress=progress,
            retry_failed=args.retry_failed,
        )
    finally:
        progress.close()
    t = outcome.table
    print(f"colstack study  {study.name}\n{CAUTION}\n")
    print(
        f"  {len(t)} variants: {outcome.computed} run now, {outcome.skipped} kept from before, "
        f"{outcome.ok} with results, {outcome.failed} failed\n"
    )
    cols = [
        "no",
        "name",
        "status",
        "steel_t",
        "concrete_m3",
        "carbon_tCO2e",
        "types",
        "column_plan_area_m2",
        "premium_percent",
        "gap_percent",
    ]
    print(t[cols].to_string(index=False))
    for _, row in t[t["status"] != "ok"].iterrows():
        print(f"  variant {row['no']} ({row['name']}): {row['error']}")
    print(f"\n  files in {args.out}")
    return 0 if outcome.ok else EXIT_IMPOSSIBLE
