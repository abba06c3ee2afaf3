"""``colstack run SCENARIO --out DIR``: the main job end to end.

Takedown (or the actions CSV), feasibility, optimisation, exact re-check, then
every output written atomically into DIR: the column schedule (CSV and
workbook), per-cell results, the type catalogue, quantities, a summary, the
pictures and a self-contained report. Ends with a short terminal summary.

``colstack optimize`` runs the same stages and writes only the tables and the
summary (no workbook, pictures or report).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import numpy as np

from optimizer import CAUTION
from optimizer.errors import DesignImpossible
from optimizer.pipeline.run import RunResult, run_scenario
from optimizer.reporting.outputs import write_outputs
from optimizer.reporting.progress import Progress

__all__ = ["add_parser", "run", "terminal_summary"]


def _common(p: argparse.ArgumentParser) -> None:
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--out", required=True, help="output folder (replaced as a whole when the run succeeds)")
    p.add_argument("--time-limit", type=float, metavar="S", help="solver time limit, seconds (scenario default)")
    p.add_argument("--solver", choices=("highs", "cbc"), help="integer-programming solver (scenario default)")
    p.add_argument(
        "--formulation",
        choices=("auto", "paths", "compact"),
        help="integer program over stack paths (column generation) or one binary per cell and type "
        "(scenario default; auto: paths wherever valid)",
    )
    p.add_argument("--max-types", type=int, metavar="K", help="cap on distinct column types")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    p.add_argument("--log-json", metavar="FILE", help="append progress events as JSON lines to FILE")


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``run`` and ``optimize`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "run",
        help="the main job: takedown, feasibility, optimisation, schedule, quantities and report",
        description="Design and rationalise every column of the building. " + CAUTION,
    )
    _common(p)
    p.set_defaults(_full=True)
    q = subparsers.add_parser(
        "optimize",
        help="feasibility and optimisation only: the chosen type per cell and a summary",
        description="Choose a type for every cell by integer programming. " + CAUTION,
    )
    _common(q)
    q.set_defaults(_full=False, _run=run)
    return p


def terminal_summary(r: RunResult, out: Path) -> str:
    """The closing lines printed after a run."""
    tot = r.totals
    s = r.schedule
    sections = {r.catalogue.types[u.type_index].section_key for u in r.types_used}
    lines = [
        f"colstack run  {r.scenario.project.name}",
        CAUTION,
        "",
        f"  cells                {len(r.feasibility.cells):,}",
        f"  types used           {len(r.types_used)} ({len(sections)} sections) from a catalogue of "
        f"{len(r.catalogue):,}",
        f"  reinforcement        {tot['steel_t']:,.1f} t (links {tot['links_t']:,.1f} t, laps {tot['laps_t']:,.1f} t)",
        f"  concrete             {tot['concrete_m3']:,.0f} m3; column plan area {tot['plan_area_m2']:,.0f} m2 "
        "over all floors",
        f"  embodied carbon      {tot['carbon_tCO2e']:,.0f} tCO2e (A1-A3)",
    ]
    if r.settings.costs.has_cost:
        lines.append(f"  cost                 {tot['cost']:,.0f} {r.settings.costs.currency}")
    lines += [
        f"  premium over bound   {100 * r.premium:.1f} % ({r.settings.objective.value}: lower bound "
        f"{r.lower_bound:,.0f})",
        f"  solver               {s.solver}: {s.status}, gap {100 * s.gap:.2f} %, {s.seconds:.1f} s",
        f"  max utilisation      {float(np.max(r.checks.utilisation)):.3f} (every chosen design re-checked exactly)",
    ]
    for w in r.warnings:
        lines.append(f"  warning: {w}")
    lines.append(f"  files in {out}")
    return "\n".join(lines)


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack run`` / ``colstack optimize``."""
    progress = Progress(sys.stderr, quiet=args.quiet, log_json=args.log_json)
    out = Path(args.out)
    try:
        result = run_scenario(
            args.scenario,
            progress=progress,
            time_limit_s=args.time_limit,
            solver=args.solver,
            max_types=args.max_types,
            formulation=args.formulation,
        )
        extras = []
        if getattr(args, "_full", True):
            from optimizer.reporting.pictures import write_pictures
            from optimizer.reporting.report import write_report
            from optimizer.reporting.workbook import write_workbook

            extras = [write_workbook, write_pictures, write_report]
        progress("writing outputs", 0, 0)
        write_outputs(result, out, extras=extras)
    except DesignImpossible as exc:
        progress.close()
        _write_partial(exc, out, args.scenario)
        print(f"colstack: no design possible: {exc}", file=sys.stderr)
        for line in exc.details[:20]:
            print(f"  {line}", file=sys.stderr)
        return exc.exit_code
    finally:
        progress.close()
    print(terminal_summary(result, out))
    return 0


def _write_partial(exc: DesignImpossible, out: Path, scenario_path: str) -> None:
    """Write the feasibility report of a run that could not be completed (atomically)."""
    fe = exc.partial.get("feasibility")
    cat = exc.partial.get("catalogue")
    if fe is None or cat is None:
        return
    import json

    from optimizer.candidates.feasibility import undesignable_frame
    from optimizer.cli.feasibility import catalogue_frame, lower_bound_frame
    from optimizer.reporting.outputs import atomic_folder

    with atomic_folder(out, protect=[Path(scenario_path).resolve().parent]) as tmp:
        catalogue_frame(cat).to_csv(tmp / "catalogue.csv", index=False)
        lower_bound_frame(fe).to_csv(tmp / "lower_bound.csv", index=False)
        undesignable_frame(fe).to_csv(tmp / "undesignable.csv", index=False)
        (tmp / "summary.json").write_text(
            json.dumps(
                {"caution": CAUTION, "status": "no design possible", "reason": str(exc), "details": exc.details},
                indent=2,
            ),
            encoding="utf-8",
        )
    print(f"colstack: wrote the feasibility report to {out}", file=sys.stderr)
