"""Benchmark of the section-resistance engine (run by `make bench`).

Measures MRd evaluations per second for 1,000,000 (section, NEd) pairs
(1,000 random rectangular sections x 1,000 axial loads each), the peak memory
of the process, and, on the same kind of section, the time of one
ultimate-capacity call of the open-source reference library concreteproperties,
printed as a ratio. Figures only: no pass/fail here (speed is not a unit test).
The figures are also written to ``bench/results/resistance.json`` (see ``bench/record.py``).

Run: ``python bench/bench_resistance.py [--note TEXT]``.
"""

from __future__ import annotations

import resource
import time

import numpy as np
from record import argument_parser, machine, write_result

from design.materials import Concrete, Reinforcement
from design.resistance import DesignSection, SectionBatch, moment_resistance_scalar
from design.sections import RectBars, RectSection

TARGET_PAIRS_PER_S = 500_000
TARGET_PEAK_MB = 2048


def random_sections(n: int, seed: int = 1) -> list[DesignSection]:
    """``n`` random rectangular column sections that fit their bars."""
    rng = np.random.default_rng(seed)
    out: list[DesignSection] = []
    while len(out) < n:
        b, h = (float(x) for x in rng.choice(np.arange(250, 1201, 50), 2))
        dia = float(rng.choice([16, 20, 25, 32, 40]))
        nb, nh = (int(x) for x in rng.integers(2, 7, 2))
        fck = float(rng.choice([25, 30, 35, 40, 50, 60]))
        try:
            sec = RectSection(b, h, 35.0, 10.0, RectBars(dia, nb, nh))
        except ValueError:
            continue
        out.append(DesignSection(sec, Concrete(fck), Reinforcement(500.0)))
    return out


def peak_rss_mb() -> float:
    """Peak resident memory of this process, MB (Linux reports kB)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def reference_library_time(ds: DesignSection) -> float | None:
    """Seconds for one concreteproperties ultimate bending capacity call, or None if absent."""
    try:
        from concreteproperties.concrete_section import ConcreteSection
        from concreteproperties.material import Concrete as CpConcrete
        from concreteproperties.material import SteelBar
        from concreteproperties.stress_strain_profile import (
            ConcreteLinearNoTension,
            EurocodeParabolicUltimate,
            SteelElasticPlastic,
        )
        from sectionproperties.pre.library.concrete_sections import concrete_rectangular_section
    except ImportError:
        return None
    c, s, sec = ds.concrete, ds.steel, ds.section
    conc = CpConcrete(
        name="concrete",
        density=2.4e-6,
        stress_strain_profile=ConcreteLinearNoTension(
            elastic_modulus=c.Ecm, ultimate_strain=c.eps_cu2, compressive_strength=c.fcd
        ),
        ultimate_stress_strain_profile=EurocodeParabolicUltimate(
            compressive_strength=c.fcd, compressive_strain=c.eps_c2, ultimate_strain=c.eps_cu2, n=c.n
        ),
        flexural_tensile_strength=0.0,
        colour="lightgrey",
    )
    steel = SteelBar(
        name="steel",
        density=7.85e-6,
        stress_strain_profile=SteelElasticPlastic(yield_strength=s.fyd, elastic_modulus=s.Es, fracture_strain=1.0),
        colour="grey",
    )
    geom = concrete_rectangular_section(
        d=sec.h,
        b=sec.b,
        dia_top=sec.bars.dia,
        area_top=np.pi * sec.bars.dia**2 / 4,
        n_top=sec.bars.nb,
        c_top=sec.cover + sec.link,
        dia_bot=sec.bars.dia,
        area_bot=np.pi * sec.bars.dia**2 / 4,
        n_bot=sec.bars.nb,
        c_bot=sec.cover + sec.link,
        dia_side=sec.bars.dia,
        area_side=np.pi * sec.bars.dia**2 / 4,
        n_side=sec.bars.nh - 2,
        c_side=sec.cover + sec.link,
        n_circle=8,
        conc_mat=conc,
        steel_mat=steel,
    )
    section = ConcreteSection(geom)
    n_ed = 0.3 * ds.section.Ac * c.fcd
    t0 = time.perf_counter()
    section.ultimate_bending_capacity(theta=0.0, n=n_ed)
    return time.perf_counter() - t0


def main(note: str | None = None) -> None:
    """Run the benchmark, print its figures and write them to ``bench/results/resistance.json``."""
    started = machine(["concreteproperties"])
    print("colstack benchmark: section resistance by strain compatibility (EN 1992-1-1, 6.1)")
    n_sections, per_section = 1_000, 1_000
    NEd_from, NEd_to = -0.2, 1.0
    designs = random_sections(n_sections)
    rng = np.random.default_rng(7)

    t0 = time.perf_counter()
    batch = SectionBatch(designs)
    NRd = batch.NRd()
    t_build = time.perf_counter() - t0

    idx = np.repeat(np.arange(n_sections), per_section)
    NEd = rng.uniform(NEd_from, NEd_to, idx.size) * NRd[idx]
    t0 = time.perf_counter()
    MRd = batch.moment_resistance(NEd, "y", idx)
    t_solve = time.perf_counter() - t0
    pairs = idx.size
    rate = pairs / (t_build + t_solve)
    peak = peak_rss_mb()
    print(f"  pairs (section, NEd)          {pairs:,}")
    print(f"  batch build + N(s) tables     {t_build:8.2f} s")
    print(f"  MRd solve                     {t_solve:8.2f} s")
    print(
        f"  throughput (all included)     {rate:12,.0f} pairs/s   target {TARGET_PAIRS_PER_S:,}  "
        f"ratio {rate / TARGET_PAIRS_PER_S:.2f}"
    )
    print(f"  peak memory                   {peak:8.0f} MB    target < {TARGET_PEAK_MB} MB")

    # Scalar reference path on a sample, for the ratio and a spot check.
    n_sample = 20
    sample = rng.choice(pairs, n_sample, replace=False)
    t0 = time.perf_counter()
    worst = 0.0
    for k in sample:
        m = moment_resistance_scalar(designs[idx[k]], NEd[k], "y")
        if m > 0:
            worst = max(worst, abs(m - MRd[k]) / m)
    t_scalar = (time.perf_counter() - t0) / len(sample)
    print(
        f"  scalar path (quadrature)      {1e3 * t_scalar:8.1f} ms per pair   "
        f"vectorised is {t_scalar * rate:,.0f}x faster; max rel. diff {worst:.1e}"
    )

    t_ref = reference_library_time(designs[0])
    if t_ref is None:
        print("  reference library             not installed (pip install concreteproperties)")
    else:
        print(
            f"  concreteproperties            {1e3 * t_ref:8.1f} ms per ultimate-capacity call   "
            f"ratio to one vectorised pair: {t_ref * rate:,.0f}x"
        )

    write_result(
        "resistance",
        started,
        inputs={
            "n_sections": n_sections,
            "n_NEd_per_section": per_section,
            "n_pairs": pairs,
            "NEd_from_ratio": NEd_from,  # NEd / NRd of the section
            "NEd_to_ratio": NEd_to,
            "n_scalar_sample": n_sample,
            "reference_library": "concreteproperties",
        },
        figures={
            "build_s": t_build,
            "solve_s": t_solve,
            "total_s": t_build + t_solve,
            "pairs_per_s": rate,
            "target_pairs_per_s": TARGET_PAIRS_PER_S,
            "ratio_to_target": rate / TARGET_PAIRS_PER_S,
            "peak_MB": peak,
            "target_peak_MB": TARGET_PEAK_MB,
            "scalar_ms_per_pair": 1e3 * t_scalar,
            "scalar_over_vectorised_x": t_scalar * rate,
            "scalar_max_rel_diff_ratio": worst,
            "reference_ms_per_call": None if t_ref is None else 1e3 * t_ref,
            "reference_over_vectorised_x": None if t_ref is None else t_ref * rate,
        },
        note=note,
    )


if __name__ == "__main__":
    main(argument_parser(__doc__).parse_args().note)
