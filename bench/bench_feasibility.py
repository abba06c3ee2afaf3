"""Benchmark of the building-wide feasibility matrix (run by `make bench`).

A synthetic tower of 50 storeys x 60 stacks (3,000 cells) against a catalogue
of at least 1,500 types: cell-type checks per second, total time, peak memory;
the scalar single-column path on a sample, as a ratio; and the accuracy of
the screened matrix against the exact single-column check on 1,000 random
pairs. Figures only: no pass/fail (speed is not a unit test). The figures are also written
to ``bench/results/feasibility.json`` (see ``bench/record.py``).

Run: ``python bench/bench_feasibility.py [--note TEXT]``.
"""

from __future__ import annotations

import resource
import time

import numpy as np
from record import argument_parser, machine, write_result

from design.member import check_column
from design.resistance import SectionBatch
from design.section_data import SectionData
from optimizer.building.generate import generate_tower
from optimizer.building.takedown import scenario_actions
from optimizer.candidates.catalogue import CatalogueSpec, build_catalogue
from optimizer.candidates.feasibility import cell_table, check_pairs, check_settings_for, feasibility

TARGET_S = 20.0
TARGET_PEAK_MB = 4096
TARGET_DIFF_PCT = 0.5  # screened matrix against the exact check, bending checks (DEVELOPERS.md)
STOREYS, STACKS = 50, 60
N_SAMPLE, N_TIMED = 1000, 50


def main(note: str | None = None) -> None:
    """Run the benchmark, print its figures and write them to ``bench/results/feasibility.json``."""
    started = machine()
    print("colstack benchmark: feasibility matrix (every type in every cell)")
    t0 = time.perf_counter()
    sc = generate_tower(STOREYS, STACKS)
    actions = scenario_actions(sc)
    t_takedown = time.perf_counter() - t0
    spec = CatalogueSpec(bar_dias=(12.0, 16.0, 20.0, 25.0, 32.0, 40.0))
    cat = build_catalogue(sc, spec)
    print(f"  tower {STOREYS} storeys x {STACKS} stacks: {len(sc.cells):,} cells; takedown {t_takedown:.1f} s")
    print(f"  catalogue: {len(cat):,} types ({cat.cover_note})")

    t0 = time.perf_counter()
    fe = feasibility(sc, cat, actions)
    total = time.perf_counter() - t0
    rate = fe.pairs_checked / total
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"  pairs checked                 {fe.pairs_checked:,}")
    print(f"  feasible pairs                {fe.cand_cell.size:,}; re-checked exactly {fe.exact_rechecks:,}")
    print(f"  total time                    {total:8.1f} s   target < {TARGET_S:g} s   ratio {total / TARGET_S:.2f}")
    print(f"  checks per second             {rate:12,.0f}")
    print(f"  peak memory                   {rss:8.0f} MB    target < {TARGET_PEAK_MB} MB")
    _, lb = fe.lower_bound()
    n_undesignable = len(fe.undesignable())
    print(f"  lower bound on steel          {lb / 1000:8.1f} t; cells no type can carry: {n_undesignable}")

    ct = cell_table(sc, actions)
    rng = np.random.default_rng(5)
    sample = [(int(rng.integers(len(ct))), int(rng.integers(len(cat)))) for _ in range(N_SAMPLE)]
    t0 = time.perf_counter()
    for c, t in sample[:N_TIMED]:
        check_column(
            cat.designs[t],
            ct.actions(np.array([c])),  # the actions the matrix itself checks
            check_settings_for(sc, ct.exposure[c], ct.fire[c]),
            sc.params,
        )
    t_single = (time.perf_counter() - t0) / N_TIMED
    print(
        f"  single-column check           {1e3 * t_single:8.2f} ms per pair; the matrix is "
        f"{t_single * rate:,.0f}x faster per pair"
    )

    data = SectionData.of(SectionBatch(cat.designs))
    agree = 0
    worst = 0.0
    worst_res = 0.0
    resist = ("bending about y", "bending about z", "biaxial interaction")
    for c, t in sample:
        st = check_settings_for(sc, ct.exposure[c], ct.fire[c])
        fast, _ = check_pairs(data, np.array([c]), np.array([t]), ct, 0, st, sc.params, fast=True)
        exact, _ = check_pairs(data, np.array([c]), np.array([t]), ct, 0, st, sc.params, fast=False)
        uf, ue = float(fast.utilisation[0]), float(exact.utilisation[0])
        agree += (uf <= 1.0) == (ue <= 1.0)
        if np.isfinite(ue) and ue > 0.05 and np.isfinite(uf):
            worst = max(worst, abs(uf - ue) / ue)
        cols = [k for k, ch in enumerate(exact.checks) if ch.name in resist]
        rf, re_ = fast.utilisation_matrix[0, cols].max(), exact.utilisation_matrix[0, cols].max()
        if np.isfinite(re_) and re_ > 0.05 and np.isfinite(rf) and exact.values["NEd"][0] <= exact.values["NRd"][0]:
            worst_res = max(worst_res, abs(rf - re_) / re_)
    print(
        f"  accuracy on {N_SAMPLE:,} pairs       pass/fail agree {agree}/{N_SAMPLE} before the exact re-check band; "
        f"max |du|/u = {100 * worst:.2f} % (governing), {100 * worst_res:.2f} % (bending checks alone)"
    )

    write_result(
        "feasibility",
        started,
        inputs={
            "n_storeys": STOREYS,
            "n_stacks": STACKS,
            "n_cells": len(sc.cells),
            "n_types": len(cat),
            "cover_note": cat.cover_note,
            "n_pairs_checked": fe.pairs_checked,
            "n_sample": N_SAMPLE,
            "n_timed_single_checks": N_TIMED,
        },
        figures={
            "takedown_s": t_takedown,
            "n_feasible_pairs": fe.cand_cell.size,
            "n_exact_rechecks": fe.exact_rechecks,
            "total_s": total,
            "target_s": TARGET_S,
            "ratio_to_target": total / TARGET_S,
            "checks_per_s": rate,
            "peak_MB": rss,
            "target_peak_MB": TARGET_PEAK_MB,
            "steel_lower_bound_t": lb / 1000,
            "n_undesignable_cells": n_undesignable,
            "single_check_ms_per_pair": 1e3 * t_single,
            "single_over_matrix_x": t_single * rate,
            "n_pass_fail_agree": agree,
            "max_diff_governing_pct": 100 * worst,
            "max_diff_bending_pct": 100 * worst_res,
            "target_max_diff_bending_pct": TARGET_DIFF_PCT,
        },
        note=note,
    )


if __name__ == "__main__":
    main(argument_parser(__doc__).parse_args().note)
