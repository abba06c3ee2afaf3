"""``colstack pareto SCENARIO --out DIR``: steel and cost against the number of distinct types.

Sweeps the cap on distinct types from 1 upwards (each point solved within its
own time limit, exactly as ``colstack optimize`` does) until the cap no longer
binds or ``--max-k`` is reached, then writes ``pareto.csv`` and ``pareto.png``
/ ``pareto.svg``.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import numpy as np
import pandas as pd

from optimizer import CAUTION
from optimizer.building.scenario import load_scenario
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import build_catalogue
from optimizer.candidates.feasibility import feasibility
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.settings import read_run_settings
from optimizer.reporting.outputs import atomic_folder
from optimizer.reporting.progress import Progress

__all__ = ["add_parser", "run", "sweep"]


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``pareto`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "pareto",
        help="sweep the cap on distinct types: steel and cost against the number of types",
        description="Trade-off between the number of column types and steel (and cost). " + CAUTION,
    )
    p.add_argument("scenario", help="scenario file (TOML)")
    p.add_argument("--out", required=True, help="output folder (replaced as a whole)")
    p.add_argument("--max-k", type=int, default=20, metavar="K", help="largest cap tried (default 20)")
    p.add_argument("--time-limit", type=float, default=30.0, metavar="S", help="time limit per point, s")
    p.add_argument("--quiet", action="store_true", help="no progress display")
    return p


def sweep(problem, max_k: int, time_limit_s: float, solver: str, gap: float, progress=None) -> pd.DataFrame:
    """One row per cap k: types used, steel, cost, carbon, objective, status and gap."""
    from optimizer.pipeline.run import optimise
    from optimizer.schedule.heuristic import figures

    rows = []
    free = None
    for k in range(1, max_k + 1):
        if progress:
            progress("pareto sweep", k - 1, max_k)
        sched = optimise(problem, solver, time_limit_s, gap, k)
        if len(sched.cand) == 0 or np.any(np.asarray(sched.cand) < 0):
            rows.append(
                {
                    "cap": k,
                    "types": np.nan,
                    "steel_t": np.nan,
                    "cost": np.nan,
                    "carbon_t": np.nan,
                    "objective": np.nan,
                    "status": sched.status,
                    "gap": np.nan,
                }
            )
            continue
        fig = figures(problem, sched.cand)
        used = len(set(problem.cand_type[sched.cand].tolist()))
        rows.append(
            {
                "cap": k,
                "types": used,
                "steel_t": fig.steel_kg / 1000,
                "cost": fig.cost,
                "carbon_t": fig.carbon / 1000,
                "objective": fig.objective,
                "status": sched.status,
                "gap": sched.gap,
            }
        )
        if free is None:
            from optimizer.schedule.heuristic import stack_optimum

            best = stack_optimum(problem)
            free = len(set(problem.cand_type[best.cand].tolist())) if best is not None else max_k
        if used < k or k >= free:
            break  # the cap no longer binds: more types cannot help
    if progress:
        progress("pareto sweep", max_k, max_k)
    return pd.DataFrame(rows)


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack pareto``."""
    scenario = load_scenario(args.scenario)
    settings = read_run_settings(scenario)
    progress = Progress(sys.stderr, quiet=args.quiet)
    try:
        actions = scenario_actions(scenario)
        cat = build_catalogue(scenario)
        fe = feasibility(scenario, cat, actions, progress=progress, fire_rule=settings.fire_rule)
        problem = to_problem(fe, scenario, settings)
        table = sweep(problem, args.max_k, args.time_limit, settings.solver.solver, settings.solver.gap_rel, progress)
        if not settings.costs.has_cost:
            table["cost"] = np.nan  # no money rates in the scenario
    finally:
        progress.close()
    with atomic_folder(Path(args.out), protect=[Path(args.scenario).resolve().parent]) as tmp:
        table.to_csv(tmp / "pareto.csv", index=False)
        _plot(table, tmp)
        (tmp / "README.txt").write_text(CAUTION + "\n", encoding="utf-8")
    print(f"colstack pareto  {scenario.project.name}\n{CAUTION}\n")
    print(table.to_string(index=False))
    print(f"\n  files in {args.out}")
    return 0


def _plot(table: pd.DataFrame, folder: Path) -> None:
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    df = table.dropna(subset=["types"]).sort_values("types")
    fig, ax = plt.subplots(figsize=(7.5, 4.2))
    ax.plot(df["types"], df["steel_t"], "o-", color="#1f4e5f", label="steel (t)")
    ax.set_xlabel("distinct column types")
    ax.set_ylabel("reinforcement (t)")
    ax.grid(True, lw=0.3)
    if df["cost"].notna().any() and (df["cost"] > 0).any():
        ax2 = ax.twinx()
        ax2.plot(df["types"], df["cost"], "s--", color="#b45309", label="cost")
        ax2.set_ylabel("cost")
    ax.set_title("Steel against the number of types (each point: its own optimisation)")
    fig.text(
        0.5,
        0.005,
        "Concept design only: verify under the local code and national annex.",
        ha="center",
        fontsize=7,
        color="0.4",
    )
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    for ext in ("png", "svg"):
        fig.savefig(folder / f"pareto.{ext}", dpi=120)
    plt.close(fig)
