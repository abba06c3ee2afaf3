"""Comparing concrete grades on the whole building.

Each variant is the full run (takedown, feasibility, integer program, exact
re-check) of the same scenario with another concrete: one grade throughout,
or a choice of grades per cell (``[catalogue] grades``) under the
continuity rules (the grade never rises going up a stack). The comparison
reports, per variant: steel, concrete, cost, embodied carbon (A1-A3), types
and sections used, the largest ground-level column, the column plan area over
all floors, the rationalisation premium and the solver gap; and it says in
plain sentences what is better than the reference and by how much, computed
from those figures only.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import pandas as pd

from optimizer.building import Scenario
from optimizer.pipeline.run import RunResult, run_scenario
from optimizer.studies.variants import grade_name, with_grade, with_reserved

__all__ = ["Variant", "grade_variants", "result_row", "compare_sentences", "run_variants"]


@dataclass(frozen=True)
class Variant:
    """A named variant of a scenario."""

    name: str
    scenario: Scenario


def grade_variants(scenario: Scenario, grades: list[str], choices: list[list[str]] = ()) -> list[Variant]:
    """One variant per grade (throughout), plus one per list of grades the optimiser may choose from."""
    out = [Variant(grade_name(with_grade(scenario, g).materials.fck_MPa), with_grade(scenario, g)) for g in grades]
    for choice in choices:
        base = with_grade(scenario, choice[-1])
        names = [grade_name(with_grade(scenario, g).materials.fck_MPa) for g in choice]
        out.append(Variant("choice " + "+".join(names), with_reserved(base, "catalogue", {"grades": names})))
    return out


def result_row(name: str, r: RunResult) -> dict:
    """The comparison figures of one run."""
    tot = r.totals
    sc = r.scenario
    ground = sc.levels[0].name
    cells = [c.index for c in sc.cells_at(ground)]
    largest = max(cells, key=lambda i: r.catalogue.types[int(r.chosen_type[i])].design.section.Ac)
    big = r.catalogue.types[int(r.chosen_type[largest])]
    grades = sorted({r.catalogue.types[int(t)].design.concrete.name for t in r.chosen_type})
    return {
        "variant": name,
        "grades_used": " ".join(grades),
        "steel_t": round(tot["steel_t"], 2),
        "concrete_m3": round(tot["concrete_m3"], 1),
        "cost": None if math.isnan(tot["cost"]) else round(tot["cost"], 0),
        "carbon_tCO2e": round(tot["carbon_tCO2e"], 1),
        "types": len(r.types_used),
        "sections": len({r.catalogue.types[u.type_index].section_key for u in r.types_used}),
        "largest_ground_column": f"{big.section_key} {big.design.section.bars.notation}",
        "largest_ground_column_m2": round(big.design.section.Ac / 1e6, 3),
        "column_plan_area_m2": round(tot["plan_area_m2"], 1),
        "premium_percent": round(100 * r.premium, 1),
        "gap_percent": round(100 * r.schedule.gap, 2),
        "solver_status": r.schedule.status,
    }


def _pct(a: float, b: float) -> float:
    return 100.0 * (a - b) / b if b else float("nan")


def compare_sentences(table: pd.DataFrame, reference: str | None = None) -> list[str]:
    """Plain statements of each variant against the reference (default: the first row).

    Only differences of at least 0.5 % are named; nothing is claimed beyond the figures in ``table``.
    """
    if table.empty:
        return []
    ref = table.iloc[0] if reference is None else table[table["variant"] == reference].iloc[0]
    out = []
    measures = (
        ("steel_t", "steel"),
        ("concrete_m3", "concrete"),
        ("column_plan_area_m2", "column plan area"),
        ("carbon_tCO2e", "embodied carbon"),
        ("cost", "cost"),
    )
    for _, row in table.iterrows():
        if row["variant"] == ref["variant"]:
            continue
        parts = []
        for col, label in measures:
            a, b = row[col], ref[col]
            if a is None or b is None or (isinstance(a, float) and math.isnan(a)) or pd.isna(a) or pd.isna(b):
                continue
            d = _pct(float(a), float(b))
            if abs(d) < 0.5:
                parts.append(f"the same {label}")
            else:
                size = f"{abs(d):.1f}" if abs(d) < 10 else f"{abs(d):.0f}"
                parts.append(f"{size} % {'less' if d < 0 else 'more'} {label}")
        dt = int(row["types"]) - int(ref["types"])
        if dt:
            parts.append(f"{abs(dt)} {'fewer' if dt < 0 else 'more'} type{'s' if abs(dt) > 1 else ''}")
        out.append(f"{row['variant']}: " + ", ".join(parts) + f" than {ref['variant']}.")
    return out


def run_variants(
    variants: list[Variant],
    runner: Callable[[Variant], RunResult] | None = None,
    progress: Callable[[str, int, int], None] | None = None,
) -> tuple[pd.DataFrame, dict]:
    """Run every variant one after another; returns the table and the results by name."""
    say = progress or (lambda *_: None)
    results = {}
    rows = []
    for k, v in enumerate(variants):
        say(f"variant {v.name}", k, len(variants))
        r = runner(v) if runner else run_scenario(v.scenario, label=v.name)
        results[v.name] = r
        rows.append(result_row(v.name, r))
        say(f"variant {v.name}", k + 1, len(variants))
    return pd.DataFrame(rows), results


def plot_comparison(table: pd.DataFrame, path_png, reference: str | None = None) -> None:
    """One chart: each measure of each variant relative to the reference (100 %)."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    ref = table.iloc[0] if reference is None else table[table["variant"] == reference].iloc[0]
    measures = [
        ("steel_t", "steel"),
        ("concrete_m3", "concrete"),
        ("column_plan_area_m2", "plan area"),
        ("carbon_tCO2e", "carbon"),
    ]
    if table["cost"].notna().all():
        measures.append(("cost", "cost"))
    fig, ax = plt.subplots(figsize=(1.8 + 1.6 * len(measures), 4.2))
    width = 0.8 / max(len(table), 1)
    x = np.arange(len(measures))
    for j, (_, row) in enumerate(table.iterrows()):
        vals = [100.0 * float(row[c]) / float(ref[c]) if float(ref[c]) else np.nan for c, _ in measures]
        ax.bar(x + (j - (len(table) - 1) / 2) * width, vals, width, label=str(row["variant"]))
    ax.axhline(100, color="0.3", lw=0.8)
    ax.set_xticks(x, [m[1] for m in measures])
    ax.set_ylabel(f"% of {ref['variant']}")
    ax.set_title("Concrete grades compared on the whole building")
    ax.legend(fontsize=8, ncols=2)
    ax.grid(axis="y", lw=0.3)
    fig.text(
        0.5,
        0.005,
        "Concept design only: verify under the local code and national annex.",
        ha="center",
        fontsize=7,
        color="0.4",
    )
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    fig.savefig(path_png, dpi=120)
    plt.close(fig)
