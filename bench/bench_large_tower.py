"""Benchmark of the whole job on a large synthetic tower (run by `make bench-large`).

100 storeys x 120 stacks (12,000 cells), C80/95 square columns 400-2000 mm, minimum run of 3
storeys and a price per distinct type; the solver has a time limit. Reports the
time of every stage, the peak memory, the schedule, the proven gap and where
the time goes. Figures only: no pass/fail (target: finish within 15 minutes and
16 GB on this 2-core machine). The figures are also written to
``bench/results/large_tower.json`` (see ``bench/record.py``), also when the job stops.

Run: ``python bench/bench_large_tower.py [--note TEXT]``.
"""

from __future__ import annotations

import resource
import sys
import time

from record import argument_parser, machine, write_result

from optimizer.building.generate import generate_tower
from optimizer.pipeline.run import run_scenario
from optimizer.studies.variants import with_grade, with_reserved

TIME_LIMIT_S = 240.0
TARGET_S = 900.0
TARGET_PEAK_MB = 16_384
STOREYS, STACKS = 100, 120
GRADE = "C80/95"
CATALOGUE = {"sizes_mm": {"min": 400, "max": 2000, "step": 100}, "shapes": ["square"], "bar_dias": [25, 32, 40]}
RULES = {"min_run": 3, "price_per_type": 150.0}


def peak_mb() -> float:
    """Peak resident memory of this process, MB (Linux reports kB)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def main(note: str | None = None) -> None:
    """Run the benchmark, print its figures and write them to ``bench/results/large_tower.json``."""
    started = machine(["highspy", "pulp", "numba"])
    print(f"colstack benchmark: the whole job on a {STOREYS}-storey x {STACKS}-stack tower")
    t0 = time.perf_counter()
    sc = generate_tower(STOREYS, STACKS)
    # A 100-storey tower needs larger and stronger columns than the default catalogue offers.
    sc = with_grade(sc, GRADE)
    sc = with_reserved(sc, "catalogue", CATALOGUE)
    sc = with_reserved(sc, "rules", RULES)
    sc = with_reserved(sc, "optimizer", {"time_limit_s": TIME_LIMIT_S})
    t_generate = time.perf_counter() - t0
    print(f"  cells {len(sc.cells):,}; generated in {t_generate:.1f} s")
    inputs = {
        "n_storeys": STOREYS,
        "n_stacks": STACKS,
        "n_cells": len(sc.cells),
        "grade": GRADE,
        "catalogue_sizes_mm": CATALOGUE["sizes_mm"],
        "catalogue_shapes": CATALOGUE["shapes"],
        "catalogue_bar_dias_mm": CATALOGUE["bar_dias"],
        "n_min_run_storeys": RULES["min_run"],
        "price_per_type_kg": RULES["price_per_type"],
        "time_limit_s": TIME_LIMIT_S,
    }

    def progress(stage: str, done: int, total: int) -> None:
        if total == 0:
            print(f"  [{time.perf_counter() - t0:7.1f} s] {stage}", flush=True)

    t0 = time.perf_counter()
    try:
        r = run_scenario(sc, progress=progress)
    except Exception as exc:
        stopped = time.perf_counter() - t0
        print(f"  stopped after {stopped:.0f} s: {type(exc).__name__}: {exc}")
        print(f"  peak memory {peak_mb():,.0f} MB")
        write_result(
            "large_tower",
            started,
            inputs,
            {
                "generate_s": t_generate,
                "stopped_after_s": stopped,
                "error": f"{type(exc).__name__}: {exc}",
                "peak_MB": peak_mb(),
                "target_s": TARGET_S,
                "target_peak_MB": TARGET_PEAK_MB,
            },
            note=note,
        )
        sys.exit(0)
    total = time.perf_counter() - t0
    tot = r.totals
    s = r.schedule
    print(f"  total                 {total:8.1f} s   target < {TARGET_S:.0f} s   ratio {total / TARGET_S:.2f}")
    for stage, sec in r.timings_s.items():
        print(f"    {stage:<20} {sec:8.1f} s")
    peak = peak_mb()
    print(f"  peak memory           {peak:8,.0f} MB   target < {TARGET_PEAK_MB:,} MB")
    print(f"  catalogue {len(r.catalogue):,} types; feasible pairs {r.feasibility.cand_cell.size:,}")
    print(
        f"  schedule: {len(r.types_used)} types, {tot['steel_t']:,.1f} t steel; solver {s.solver}: {s.status}, "
        f"proven gap {100 * s.gap:.2f} %; premium over the cell-wise bound {100 * r.premium:.1f} %"
    )
    write_result(
        "large_tower",
        started,
        inputs,
        {
            "generate_s": t_generate,
            "total_s": total,
            "target_s": TARGET_S,
            "ratio_to_target": total / TARGET_S,
            "stages_s": dict(r.timings_s),
            "peak_MB": peak,
            "target_peak_MB": TARGET_PEAK_MB,
            "n_types": len(r.catalogue),
            "n_feasible_pairs": r.feasibility.cand_cell.size,
            "n_types_used": len(r.types_used),
            "steel_t": tot["steel_t"],
            "solver": s.solver,
            "status": s.status,
            "gap_pct": 100 * s.gap,
            "premium_pct": 100 * r.premium,
        },
        note=note,
    )


if __name__ == "__main__":
    main(argument_parser(__doc__).parse_args().note)
