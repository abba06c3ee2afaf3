"""``colstack takedown SCENARIO --out DIR``: actions table, plan pictures and a summary.

Writes into DIR:

* ``actions.csv``: per-cell actions in the analysis-actions format;
* ``takedown_detail.csv``: areas, characteristic loads, reduction and governing
  expression per cell (takedown route only);
* ``reactions.csv`` and ``level_totals.csv`` (takedown route only);
* ``plans/plan_<levels>.png``: one plan per distinct floor (takedown route only);
* ``summary.txt``: total load per level, reactions, warnings and the method.

On the actions-CSV route the CSV is checked against the scenario and written
back in the normalised format.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TextIO

from optimizer.building import Scenario, TakedownResult, load_scenario, read_actions_csv, takedown, write_actions_csv
from optimizer.errors import ColstackError
from optimizer.reporting.progress import Progress

__all__ = ["add_parser", "run", "summary_text"]


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register the ``takedown`` subcommand on an argparse subparsers object."""
    p = subparsers.add_parser(
        "takedown",
        help="per-cell column actions from a scenario (load takedown or analysis CSV)",
        description="Turn a scenario into the actions on every column in every storey: "
        "actions.csv, plan pictures and a short summary in DIR.",
    )
    p.add_argument("scenario", metavar="SCENARIO", help="scenario file (TOML)")
    p.add_argument("--out", metavar="DIR", required=True, help="output directory")
    p.add_argument("--no-plans", action="store_true", help="do not draw the plan pictures")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    return p


def _table(rows: list[list[str]]) -> list[str]:
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    return [
        "  ".join(c.rjust(w) if j else c.ljust(w) for j, (c, w) in enumerate(zip(r, widths, strict=True))) for r in rows
    ]


def summary_text(scenario: Scenario, result: TakedownResult | None) -> str:
    """Short plain-text summary: loads per level, reactions, warnings, method."""
    lines = [
        f"Project: {scenario.project.name}",
        f"Scenario: {scenario.source}",
        f"National parameters: {scenario.params.name}",
        f"Cells: {len(scenario.cells)} ({len(scenario.stacks)} stacks x {len(scenario.levels)} levels)",
        "",
    ]
    if result is None:
        lines += [
            f"Actions read from an analysis: {scenario.actions_file}",
            "Lateral stability: the columns are braced; the cores are assumed to carry all horizontal actions.",
            "",
        ]
        return "\n".join(lines)
    opts = scenario.takedown
    lines += [
        f"Combination: EN 1990 Eq. ({opts.combination.value}); imposed load reduction: {opts.imposed_reduction.value}",
        "",
        "Total characteristic load per level (carried by the columns):",
    ]
    rows = [["level", "area_m2", "Gk_floor_kN", "Qk_floor_kN", "column_sw_kN"]]
    for r in result.level_totals.itertuples():
        rows.append(
            [
                r.level,
                f"{r.floor_area_m2:.1f}",
                f"{r.Gk_floor_kN:.0f}",
                f"{r.Qk_floor_kN:.0f}",
                f"{r.column_self_weight_kN:.0f}",
            ]
        )
    lines += _table(rows) + [""]
    re_ = result.reactions
    for kind, title in (
        ("foundation", "Reactions at the foundation"),
        ("external", "Reactions on external transfer structures"),
        ("transfer", "Loads delivered by transfer stacks to their supports"),
    ):
        sub = re_[re_["kind"] == kind]
        if sub.empty:
            continue
        lines.append(f"{title}:")
        rows = [["stack", "level", "onto", "share", "Gk_kN", "Qk_kN", "NEd_kN"]]
        for r in sub.itertuples():
            rows.append(
                [r.stack, r.level, r.onto, f"{r.share:.3f}", f"{r.Gk_kN:.0f}", f"{r.Qk_kN:.0f}", f"{r.NEd_kN:.0f}"]
            )
        if kind != "transfer":
            rows.append(
                [
                    "total",
                    "",
                    "",
                    "",
                    f"{sub['Gk_kN'].sum():.0f}",
                    f"{sub['Qk_kN'].sum():.0f}",
                    f"{sub['NEd_kN'].sum():.0f}",
                ]
            )
        lines += _table(rows) + [""]
    if result.warnings:
        lines += ["Warnings:"] + [f"- {w}" for w in result.warnings] + [""]
    lines += ["Method and assumptions:"] + [f"- {n}" for n in result.notes]
    return "\n".join(lines) + "\n"


def _execute(args: argparse.Namespace, err: TextIO) -> list[Path]:
    """Read and compute everything first, then write all files at once into a fresh folder."""
    from optimizer.reporting.outputs import atomic_folder

    progress = Progress(err, quiet=args.quiet, delay_s=0.5)
    scenario = load_scenario(args.scenario)
    out = Path(args.out)
    protect = [Path(args.scenario).resolve().parent]
    if scenario.actions_file is not None:
        protect.append(Path(scenario.actions_file).resolve().parent)
        actions = read_actions_csv(scenario.actions_file, scenario)
        result = None
    else:
        result = takedown(scenario, progress=progress)
        actions = result.actions
    names: list[str] = []
    with atomic_folder(out, protect=protect) as tmp:
        write_actions_csv(actions, tmp / "actions.csv")
        names.append("actions.csv")
        if result is not None:
            for name, df in (
                ("takedown_detail.csv", result.detail),
                ("reactions.csv", result.reactions),
                ("level_totals.csv", result.level_totals),
            ):
                df.to_csv(tmp / name, index=False, float_format="%.3f", lineterminator="\n")
                names.append(name)
            if not args.no_plans:
                from optimizer.reporting.plans import distinct_floors, plot_plan

                groups = distinct_floors(scenario, result.tributary)
                for i, levels in enumerate(groups):
                    name = levels[0] if len(levels) == 1 else f"{levels[0]}-{levels[-1]}"
                    plot_plan(scenario, result.tributary, levels, tmp / "plans" / f"plan_{name}.png")
                    names.append(f"plans/plan_{name}.png")
                    progress("plan pictures", i + 1, len(groups))
        (tmp / "summary.txt").write_text(summary_text(scenario, result), encoding="utf-8")
        names.append("summary.txt")
    return [out / n for n in names]


def run(args: argparse.Namespace) -> int:
    """Run ``colstack takedown``; returns the exit status (0 on success)."""
    try:
        written = _execute(args, sys.stderr)
    except ColstackError as exc:
        print(f"colstack takedown: error: {exc}", file=sys.stderr)
        return exc.exit_code
    print(f"wrote {len(written)} files to {args.out}")
    for p in written:
        print(f"  {p}")
    return 0
