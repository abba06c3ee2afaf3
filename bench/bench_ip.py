"""Benchmark of the integer program on the demo tower and a 3,000-cell tower (figures only, nothing asserted).

Both buildings go through the whole pipeline (takedown, catalogue, feasibility
matrix) to a scheduling problem, then:

* the path formulation (column generation, :mod:`optimizer.schedule.paths`) with the
  master problem solved by HiGHS and by CBC;
* the compact formulation (one binary per cell and type, :mod:`optimizer.schedule.compact`)
  with HiGHS, stopped at the same time limit (and with CBC on the demo only:
  on the tower its root relaxation alone outlasts any sensible limit);
* the same demo tower with a cap of 8 types instead of the price;
* the rule-of-thumb baseline (stacks grouped by load, one type per group per
  band of 4 storeys), the cell-wise lower bound and the rationalisation premium.

Per run: model size, time, objective, proven bound and gap, types and steel.

The 3,000-cell tower is generated: 50 storeys x 60 stacks on a 7 m grid with
columns moved off the grid by up to 0.5 m (seeded), so that no two stacks carry
the same loads (a regular grid has only a handful of distinct stacks, which
the solver merges); catalogue of 1,800 square and rectangular types; minimum
run 3 storeys and a price of 150 kg of steel per distinct type, as the demo.

The figures are also written to ``bench/results/ip.json`` (see ``bench/record.py``); with
``--quick`` the 3,000-cell tower is skipped (both demo-tower cases still run) and the JSON says so.

Run: ``PYTHONPATH=. python bench/bench_ip.py [--quick] [--note TEXT]``.
"""

from __future__ import annotations

import re
import resource
import time
from dataclasses import replace

import numpy as np
from record import argument_parser, machine, write_result

from optimizer.building.generate import generate_tower
from optimizer.building.scenario import load_scenario
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import CatalogueSpec, build_catalogue
from optimizer.candidates.feasibility import feasibility
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.run import optimise
from optimizer.pipeline.settings import read_run_settings
from optimizer.schedule.check import check_schedule
from optimizer.schedule.heuristic import baseline, cellwise_lower_bound, figures
from optimizer.schedule.problem import ScheduleProblem
from optimizer.schedule.solve import lower_bound_premium

TARGETS = {"demo tower": 60.0, "demo tower, cap 8 types": 60.0, "tower 50 x 60": 180.0}
KEYS = {"demo tower": "demo", "demo tower, cap 8 types": "demo_cap8", "tower 50 x 60": "tower_50x60"}
TARGET_GAP_PCT = 1.0


def demo_problem() -> ScheduleProblem:
    """The bundled demo tower, with the scenario's own rules."""
    sc = load_scenario("scenarios/demo_tower.toml")
    settings = read_run_settings(sc)
    fe = feasibility(sc, build_catalogue(sc), scenario_actions(sc), fire_rule=settings.fire_rule)
    return to_problem(fe, sc, settings)


def demo_capped_problem() -> ScheduleProblem:
    """The demo tower with a cap of 8 distinct types instead of a price per type (the harder coupling)."""
    p = demo_problem()
    return replace(p, rules=replace(p.rules, price_per_type=0.0, max_types=8))


def tower_problem() -> ScheduleProblem:
    """The generated 50 x 60 tower (see the module notes)."""
    sc = generate_tower(50, 60, bay_x_m=7.0, bay_y_m=7.0, jitter_m=0.5, seed=7)
    settings = read_run_settings(sc)
    cat = build_catalogue(sc, CatalogueSpec(bar_dias=(12.0, 16.0, 20.0, 25.0, 32.0, 40.0)))
    fe = feasibility(sc, cat, scenario_actions(sc), fire_rule=settings.fire_rule)
    p = to_problem(fe, sc, settings)
    return replace(p, rules=replace(p.rules, min_run=3, price_per_type=150.0))


def _size(notes: tuple[str, ...]) -> tuple[str, str]:
    """Model size and build time (seconds) from a schedule's notes."""
    for n in notes:
        m = re.search(r"path formulation: (\d+) units .*?, (\d+) candidate rows; tables in ([\d.]+) s", n)
        if m:
            paths = next((re.search(r"(\d+) paths", x) for x in notes if x.startswith("column generation")), None)
            return (
                f"{m.group(1)} units, {int(m.group(2)):,} rows, {paths.group(1) if paths else '?'} paths",
                m.group(3),
            )
        m = re.search(r"model: (\d+) binaries, \d+ continuous, (\d+) rows, \d+ nonzeros; formulated in ([\d.]+) s", n)
        if m:
            return f"{int(m.group(1)):,} binaries, {int(m.group(2)):,} rows", m.group(3)
    return "-", "-"


def seconds(text: str) -> float | None:
    """A build time as :func:`_size` returns it ("-" when unknown), in seconds."""
    try:
        return float(text)
    except ValueError:
        return None


def run_case(name: str, make, runs: list[tuple[str, str]]) -> dict:
    """Build one problem, solve it every listed way and return its figures (keys with units)."""
    t0 = time.perf_counter()
    p = make()
    limit = TARGETS[name]
    out: dict = {
        "label": name,
        "n_cells": p.n_cells,
        "n_types": len(p.types),
        "n_feasible_pairs": len(p.cand_cell),
        "n_min_run_storeys": p.rules.min_run,
        "price_per_type_kg": p.rules.price_per_type,  # objective units: kg of steel (both problems minimise steel)
        "n_max_types": p.rules.max_types,
        "objective": str(p.objective),
        "build_s": time.perf_counter() - t0,
        "target_s": limit,
        "target_gap_pct": TARGET_GAP_PCT,
    }
    print(
        f"\n== {name}: {p.n_cells:,} cells, {len(p.types):,} types, {len(p.cand_cell):,} feasible (cell, type) "
        f"pairs; min run {p.rules.min_run}, price per type {p.rules.price_per_type:g}, cap on types "
        f"{p.rules.max_types if p.rules.max_types is not None else 'none'}; built in "
        f"{time.perf_counter() - t0:.1f} s; target: within 1 % in under {limit:g} s"
    )
    lb = cellwise_lower_bound(p)
    print(f"cell-wise lower bound (no continuity, unlimited types): {lb.value:,.0f} kg")
    out["cellwise_lower_bound_kg"] = lb.value
    t0 = time.perf_counter()
    base = baseline(p)
    if base is not None:
        fb = figures(p, base.cand)
        t_base = time.perf_counter() - t0
        print(
            f"rule-of-thumb baseline: steel {fb.steel_kg:,.0f} kg, {fb.n_types} types ({fb.n_sections} sections), "
            f"objective {fb.objective:,.0f}, premium {(fb.steel_kg - lb.value) / lb.value:.1%} "
            f"({t_base:.1f} s)"
        )
        out["baseline"] = {
            "steel_kg": fb.steel_kg,
            "n_types": fb.n_types,
            "n_sections": fb.n_sections,
            "objective_kg": fb.objective,
            "premium_pct": 100 * (fb.steel_kg - lb.value) / lb.value,
            "time_s": t_base,
        }
    out["runs"] = {}
    print(
        f"{'formulation':12} {'solver':6} {'model':>40} {'build s':>7} {'time s':>7} {'objective':>12} "
        f"{'bound':>12} {'gap':>7} "
        f"{'types':>5} {'steel t':>8} {'premium':>8}  status"
    )
    for form, solver in runs:
        t0 = time.perf_counter()
        s = optimise(p, solver, limit, TARGET_GAP_PCT / 100, None, formulation=form)
        secs = time.perf_counter() - t0
        run: dict = {
            "formulation": form,
            "solver": solver,
            "time_s": secs,
            "ratio_to_target": secs / limit,
            "bound_kg": s.bound,
        }
        out["runs"][f"{form}_{solver}"] = run
        if s.cand is None or np.any(np.asarray(s.cand) < 0):
            size, build = _size(s.notes)
            print(f"{form:12} {solver:6} {size:>40} {build:>7} {secs:7.1f} {'-':>12} {s.bound:12,.0f}  no schedule")
            run.update(model=size, model_build_s=seconds(build), status="no schedule")
            continue
        f = figures(p, s.cand)
        _, premium = lower_bound_premium(p, s)
        bad = check_schedule(p, s)
        size, build = _size(s.notes)
        print(
            f"{form:12} {solver:6} {size:>40} {build:>7} {secs:7.1f} {s.objective:12,.0f} {s.bound:12,.0f} "
            f"{s.gap:7.2%} {f.n_types:5d} {f.steel_kg / 1000:8.1f} {premium:8.1%}  {s.status}"
            + ("" if not bad else f"  CHECKER: {len(bad)} violations")
        )
        run.update(
            model=size,
            model_build_s=seconds(build),
            objective_kg=s.objective,
            gap_pct=100 * s.gap,
            n_types=f.n_types,
            steel_t=f.steel_kg / 1000,
            premium_pct=100 * premium,
            status=s.status,
            n_checker_violations=len(bad),
        )
        if base is not None:
            fb = figures(p, base.cand)
            print(f"{'':20} vs baseline: steel {f.steel_kg / fb.steel_kg - 1:+.1%}, types {f.n_types} vs {fb.n_types}")
            run["steel_vs_baseline_pct"] = 100 * (f.steel_kg / fb.steel_kg - 1)
    return out


def main(quick: bool = False, note: str | None = None) -> None:
    """Run the benchmark, print its figures and write them to ``bench/results/ip.json``.

    Args:
        quick: skip the 3,000-cell tower (recorded in the JSON).
        note: free text kept with the figures.
    """
    started = machine(["highspy", "pulp", "numba"])
    print("colstack benchmark: integer program (path and compact formulations, HiGHS and CBC)")
    t_all = time.perf_counter()
    cases = {}
    cases[KEYS["demo tower"]] = run_case(
        "demo tower", demo_problem, [("paths", "highs"), ("paths", "cbc"), ("compact", "highs"), ("compact", "cbc")]
    )
    cases[KEYS["demo tower, cap 8 types"]] = run_case(
        "demo tower, cap 8 types", demo_capped_problem, [("paths", "highs"), ("paths", "cbc"), ("compact", "highs")]
    )
    if not quick:
        cases[KEYS["tower 50 x 60"]] = run_case(
            "tower 50 x 60", tower_problem, [("paths", "highs"), ("paths", "cbc"), ("compact", "highs")]
        )
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    total = time.perf_counter() - t_all
    print(f"\nbenchmark time {total:.0f} s, peak memory {rss:.0f} MB")
    write_result(
        "ip",
        started,
        inputs={
            "quick": quick,
            "skipped": [KEYS["tower 50 x 60"]] if quick else [],
            "gap_requested_pct": TARGET_GAP_PCT,
        },
        figures={"cases": cases, "total_s": total, "peak_MB": rss},
        note=note,
    )


if __name__ == "__main__":
    ap = argument_parser(__doc__)
    ap.add_argument("--quick", action="store_true", help="skip the 3,000-cell tower (both demo cases still run)")
    args = ap.parse_args()
    main(quick=args.quick, note=args.note)
