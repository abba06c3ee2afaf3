"""Writing a run's results: tables, workbook, pictures and report, all or nothing.

Everything goes first into a temporary folder next to the target; only when
every file is written is the target replaced (the previous folder is moved
aside and removed last), so an interrupted or failed run leaves the previous
output intact. The scenario's own folder is never written to.

Edge units are named in every column header (kN, kNm, mm, kg, m3, m2).
"""

from __future__ import annotations

import json
import os
import shutil
import tempfile
from collections.abc import Callable
from contextlib import contextmanager
from pathlib import Path

import numpy as np
import pandas as pd

from design.section_data import extra_ties
from design.sections import CircSection
from optimizer import CAUTION, __version__
from optimizer.errors import InputError
from optimizer.pipeline.run import RunResult

__all__ = [
    "frames",
    "write_outputs",
    "atomic_folder",
    "schedule_frame",
    "cells_frame",
    "types_frame",
    "quantities_frame",
    "summary_dict",
]


def schedule_frame(r: RunResult) -> pd.DataFrame:
    """The column schedule: levels as rows, top floor first; stacks as columns; the type mark in each cell."""
    sc = r.scenario
    stacks = [s.id for s in sc.stacks]
    index = {c.id: c.index for c in sc.cells}
    rows = []
    for lv in reversed(sc.levels):
        row = {"level": lv.name}
        for st in stacks:
            i = index.get((st, lv.name))
            row[st] = r.mark_of(i) if i is not None else ""
        rows.append(row)
    return pd.DataFrame(rows, columns=["level", *stacks])


def _links_text(r: RunResult, t: int) -> str:
    ct = r.catalogue.types[t]
    s = ct.design.section
    reduced = 25.0 * np.floor(0.6 * ct.link_spacing / 25.0)
    return f"H{s.link:g} @ {ct.link_spacing:g} ({reduced:g} near slabs and laps)"


def cells_frame(r: RunResult) -> pd.DataFrame:
    """One row per cell: actions, design moments, slenderness, n = NEd/(Ac fcd), phi_ef, type, outcome, steel.

    ``utilisation``/``governing`` are over every check (detailing, cover and fire included);
    ``utilisation_resistance``/``governing_resistance`` are the strength of the column alone
    (axial, bending, biaxial and the other checks of kind resistance, design/results.py).
    """
    v = r.checks.values
    fe = r.feasibility
    util = r.checks.utilisation
    gov = r.checks.governing
    util_res = r.checks.resistance_utilisation
    gov_res = r.checks.governing_resistance
    unverified = r.checks.unverified
    rows = []
    for i, (stack, level) in enumerate(fe.cells.cells):
        t = int(r.chosen_type[i])
        ct = r.catalogue.types[t]
        k = r.chosen_cand[i]
        check = r.checks.checks[int(gov[i])]
        res = r.checks.checks[int(gov_res[i])]
        rows.append(
            {
                "stack": stack,
                "level": level,
                "NEd_kN": round(float(v["NEd"][i]) / 1e3, 1),
                "MEdy_kNm": round(float(v["MEdy"][i]) / 1e6, 1),
                "MEdz_kNm": round(float(v["MEdz"][i]) / 1e6, 1),
                "MRdy_kNm": round(float(v["MRdy"][i]) / 1e6, 1),
                "MRdz_kNm": round(float(v["MRdz"][i]) / 1e6, 1),
                "l0y_mm": round(float(v["l0y"][i])),
                "l0z_mm": round(float(v["l0z"][i])),
                "lambda_y": round(float(v["lambda_y"][i]), 1),
                "lambda_z": round(float(v["lambda_z"][i]), 1),
                "n": round(float(v["n"][i]), 3),
                "phi_ef": round(float(v["phi_ef"][i]), 2),
                "type": r.mark_of(i),
                "section": ct.section_key,
                "bars": ct.design.section.bars.notation,
                "links": _links_text(r, t),
                "grade": ct.design.concrete.name,
                "orientation": "turned 90 deg" if r.chosen_orient[i] else "as given",
                "utilisation": round(float(util[i]), 3),
                "governing": check.name,
                "clause": check.clause,
                "utilisation_resistance": round(float(util_res[i]), 3),
                "governing_resistance": res.name,
                "fire_verified": not bool(unverified[i]),
                "steel_kg": round(float(fe.steel_kg[k]), 2),
                "main_bars_kg": round(float(fe.main_kg[k]), 2),
                "lap_kg": round(float(fe.lap_kg[k]), 2),
                "links_kg": round(float(fe.link_kg[k]), 2),
            }
        )
    return pd.DataFrame(rows)


def types_frame(r: RunResult) -> pd.DataFrame:
    """One row per type mark used by the schedule."""
    sc = r.scenario
    rows = []
    for u in r.types_used:
        ct = r.catalogue.types[u.type_index]
        s = ct.design.section
        stacks = sorted({sc.cells[i].stack for i in u.cells})
        levels = sorted({sc.cells[i].level_index for i in u.cells})
        circ = isinstance(s, CircSection)
        rows.append(
            {
                "mark": u.mark,
                "shape": ct.shape.value,
                "b_mm": s.b if not circ else np.nan,
                "h_mm": s.h if not circ else np.nan,
                "diameter_mm": s.diameter if circ else np.nan,
                "bars": s.bars.notation,
                "As_mm2": round(s.As, 0),
                "rho_percent": round(100 * s.As / s.Ac, 2),
                "links": _links_text(r, u.type_index),
                # 9.5.3(6): extra ties so that every bar is within 150 mm of a restrained bar (their steel is
                # counted with the links)
                "cross_ties": int(extra_ties(s)),
                "cover_mm": s.cover,
                "grade": ct.design.concrete.name,
                "cells": len(u.cells),
                "stacks": " ".join(stacks),
                "levels": f"{sc.levels[levels[0]].name} to {sc.levels[levels[-1]].name}",
                "catalogue_type": ct.mark,
            }
        )
    return pd.DataFrame(rows)


def quantities_frame(r: RunResult) -> pd.DataFrame:
    """Quantities in long form: group, item, quantity, unit."""
    fe, k = r.feasibility, r.chosen_cand
    sc = r.scenario
    rows: list[dict] = []

    def add(group: str, item: str, qty: float, unit: str) -> None:
        rows.append({"group": group, "item": item, "quantity": round(float(qty), 3), "unit": unit})

    # main bars and laps by diameter (a mixed layout is split by bar area)
    by_main: dict[float, float] = {}
    by_lap: dict[float, float] = {}
    for i, t in enumerate(r.chosen_type):
        s = r.catalogue.types[t].design.section
        bars = s.bars
        if isinstance(s, CircSection):
            parts = [(bars.dia, s.As)]
        else:
            parts = [(bars.dia, (bars.count - 4) * np.pi * bars.dia**2 / 4), (bars.corner, np.pi * bars.corner**2)]
        for d, a in parts:
            share = a / s.As
            by_main[d] = by_main.get(d, 0.0) + share * (fe.main_kg[k[i]] - fe.lap_kg[k[i]])
            by_lap[d] = by_lap.get(d, 0.0) + share * fe.lap_kg[k[i]]
    for d in sorted(by_main):
        add("reinforcement: main bars", f"H{d:g}", by_main[d] / 1000, "t")
    for d in sorted(by_lap):
        add("reinforcement: laps", f"H{d:g}", by_lap[d] / 1000, "t")
    by_link: dict[float, float] = {}
    for i, t in enumerate(r.chosen_type):
        d = r.catalogue.types[t].design.section.link
        by_link[d] = by_link.get(d, 0.0) + fe.link_kg[k[i]]
    for d in sorted(by_link):
        add("reinforcement: links and ties", f"H{d:g}", by_link[d] / 1000, "t")
    tot = r.totals
    add("reinforcement: total", "all bars", tot["steel_t"], "t")
    by_grade: dict[str, float] = {}
    for i, t in enumerate(r.chosen_type):
        g = r.catalogue.types[t].design.concrete.name
        by_grade[g] = by_grade.get(g, 0.0) + fe.concrete_m3[k[i]]
    for g in sorted(by_grade):
        add("concrete", g, by_grade[g], "m3")
    add("formwork", "column faces", tot["formwork_m2"], "m2")
    add("ratios", "steel per m3 of concrete", 1000 * tot["steel_t"] / tot["concrete_m3"], "kg/m3")
    for lv in sc.levels:
        cells = [c.index for c in sc.cells_at(lv.name)]
        add("column plan area", lv.name, float(fe.plan_m2[k[cells]].sum()), "m2")
    add("column plan area", "all levels", tot["plan_area_m2"], "m2")
    if r.settings.costs.has_cost:
        add("cost", "columns (steel, concrete, formwork, floor area)", tot["cost"], r.settings.costs.currency)
    add(
        "embodied carbon (A1-A3)",
        f"steel and concrete ({r.settings.costs.carbon_source})",
        tot["carbon_tCO2e"],
        "tCO2e",
    )
    return pd.DataFrame(rows, columns=["group", "item", "quantity", "unit"])


def summary_dict(r: RunResult) -> dict:
    """All headline figures of a run (JSON-ready)."""
    s = r.schedule
    tot = r.totals
    sections = {r.catalogue.types[u.type_index].section_key for u in r.types_used}
    base = None
    if r.baseline is not None:
        from optimizer.schedule.heuristic import figures

        f = figures(r.problem, r.baseline.cand)
        base = {"steel_t": f.steel_kg / 1000, "types": int(len(set(r.feasibility.cand_type[r.baseline.cand])))}
    import pulp

    try:
        import highspy

        highs_version = getattr(highspy, "__version__", "installed")
    except ImportError:  # pragma: no cover
        highs_version = "not installed"
    return {
        "caution": CAUTION,
        "project": r.scenario.project.name,
        "scenario": r.scenario_path,
        "scenario_sha256_16": r.scenario_hash,
        "versions": {"colstack": __version__, "pulp": pulp.__version__, "highspy": highs_version},
        "parameters": {
            "name": r.scenario.params.name,
            **{k: v for k, v in vars(r.scenario.params).items() if k != "name"},
        },
        "objective": r.settings.objective.value,
        "cells": len(r.feasibility.cells),
        "catalogue_types": len(r.catalogue),
        "types_used": len(r.types_used),
        "sections_used": len(sections),
        "steel_t": tot["steel_t"],
        "concrete_m3": tot["concrete_m3"],
        "formwork_m2": tot["formwork_m2"],
        "plan_area_m2": tot["plan_area_m2"],
        "cost": None if np.isnan(tot["cost"]) else tot["cost"],
        "carbon_tCO2e": tot["carbon_tCO2e"],
        "lower_bound": r.lower_bound,
        "premium": r.premium,
        "solver": {
            "name": s.solver,
            "status": s.status,
            "objective": s.objective,
            "bound": s.bound,
            "gap": s.gap,
            "seconds": s.seconds,
            "time_limit_s": r.settings.solver.time_limit_s,
            "gap_target": r.settings.solver.gap_rel,
            "notes": list(s.notes),
        },
        "baseline": base,
        "max_utilisation": float(np.max(r.checks.utilisation)),
        "max_resistance_utilisation": float(np.max(r.checks.resistance_utilisation)),
        "timings_s": r.timings_s,
        "warnings": r.warnings,
        "notes": r.notes,
    }


def frames(r: RunResult) -> dict[str, pd.DataFrame]:
    """All tables of a run, by file stem."""
    return {
        "schedule": schedule_frame(r),
        "cells": cells_frame(r),
        "types": types_frame(r),
        "quantities": quantities_frame(r),
    }


@contextmanager
def atomic_folder(target: Path, protect: list[Path] = ()):
    """Yield a fresh temporary folder; on success it replaces ``target``, on failure it is removed.

    Raises:
        InputError: the target is a file, or contains a protected path (the scenario's own files).
    """
    target = Path(target).resolve()
    for p in protect:
        p = Path(p).resolve()
        if p == target or target in p.parents:
            raise InputError("--out", "--out", str(target), "a folder that does not hold the scenario's own files")
    if target.exists() and not target.is_dir():
        raise InputError("--out", "--out", str(target), "a folder (a file of that name exists)")
    target.parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.new-", dir=target.parent))
    try:
        yield tmp
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    os.chmod(tmp, 0o755)  # mkdtemp makes it private; an output folder is for sharing
    old = None
    if target.exists():
        old = Path(tempfile.mkdtemp(prefix=f".{target.name}.old-", dir=target.parent))
        old.rmdir()
        os.replace(target, old)
    os.replace(tmp, target)
    if old is not None:
        shutil.rmtree(old, ignore_errors=True)


def write_outputs(r: RunResult, out: Path, extras: list[Callable[[RunResult, dict, Path], None]] = ()) -> Path:
    """Write every output of a run into ``out`` atomically; ``extras`` add files (workbook, pictures, report)."""
    tables = frames(r)
    scenario_dir = Path(r.scenario_path).resolve().parent
    with atomic_folder(out, protect=[scenario_dir]) as tmp:
        for name, df in tables.items():
            df.to_csv(tmp / f"{name}.csv", index=False)
        (tmp / "summary.json").write_text(
            json.dumps(summary_dict(r), indent=2, default=_json_default), encoding="utf-8"
        )
        for extra in extras:
            extra(r, tables, tmp)
    return Path(out)


def _json_default(x):
    if isinstance(x, (np.integer,)):
        return int(x)
    if isinstance(x, (np.floating,)):
        return None if not np.isfinite(x) else float(x)
    if isinstance(x, np.ndarray):
        return x.tolist()
    return str(x)
