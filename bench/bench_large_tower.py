"""Benchmark of the whole job on a large synthetic tower (run by `make bench-large`).

100 storeys x 120 stacks (12,000 cells), C80/95 square columns 400-2000 mm, minimum run of 3
storeys and a price per distinct type; the solver has a time limit. Reports the
time of every stage, the peak memory, the schedule, the proven gap and where
the time goes. Figures only: no pass/fail (target: finish within 15 minutes and
16 GB on this 2-core machine).
"""

from __future__ import annotations

import resource
import sys
import time

from optimizer.building.generate import generate_tower
from optimizer.pipeline.run import run_scenario
from optimizer.studies.variants import with_grade, with_reserved

TIME_LIMIT_S = 240.0


def main() -> None:
    """Run the benchmark and print its figures."""
    print("colstack benchmark: the whole job on a 100-storey x 120-stack tower")
    t0 = time.perf_counter()
    sc = generate_tower(100, 120)
    # A 100-storey tower needs larger and stronger columns than the default catalogue offers.
    sc = with_grade(sc, "C80/95")
    sc = with_reserved(sc, "catalogue", {"sizes_mm": {"min": 400, "max": 2000, "step": 100}, "shapes": ["square"],
                                         "bar_dias": [25, 32, 40]})
    sc = with_reserved(sc, "rules", {"min_run": 3, "price_per_type": 150.0})
    sc = with_reserved(sc, "optimizer", {"time_limit_s": TIME_LIMIT_S})
    print(f"  cells {len(sc.cells):,}; generated in {time.perf_counter() - t0:.1f} s")

    def progress(stage: str, done: int, total: int) -> None:
        if total == 0:
            print(f"  [{time.perf_counter() - t0:7.1f} s] {stage}", flush=True)

    t0 = time.perf_counter()
    try:
        r = run_scenario(sc, progress=progress)
    except Exception as exc:  # noqa: BLE001 - a benchmark reports whatever happened
        print(f"  stopped after {time.perf_counter() - t0:.0f} s: {type(exc).__name__}: {exc}")
        print(f"  peak memory {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:,.0f} MB")
        sys.exit(0)
    total = time.perf_counter() - t0
    tot = r.totals
    s = r.schedule
    print(f"  total                 {total:8.1f} s   target < 900 s   ratio {total / 900:.2f}")
    for stage, sec in r.timings_s.items():
        print(f"    {stage:<20} {sec:8.1f} s")
    print(f"  peak memory           {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:8,.0f} MB"
          "   target < 16,384 MB")
    print(f"  catalogue {len(r.catalogue):,} types; feasible pairs {r.feasibility.cand_cell.size:,}")
    print(f"  schedule: {len(r.types_used)} types, {tot['steel_t']:,.1f} t steel; solver {s.solver}: {s.status}, "
          f"proven gap {100 * s.gap:.2f} %; premium over the cell-wise bound {100 * r.premium:.1f} %")


if __name__ == "__main__":
    main()
