"""The main job end to end: scenario in, a checked and rationalised column design of the building out.

Stages: actions (takedown or analysis CSV), catalogue, feasibility matrix,
integer program, exact re-check of every chosen design, quantities. The
result is plain data (:class:`RunResult`); :mod:`optimizer.reporting.outputs` writes it.
"""

from __future__ import annotations

import functools
import hashlib
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pandas as pd

from design.member import MemberChecks
from design.resistance import SectionBatch
from design.section_data import SectionData
from optimizer import __version__
from optimizer.building import Scenario, TakedownResult, load_scenario, read_actions_csv, takedown
from optimizer.candidates.catalogue import Catalogue, build_catalogue
from optimizer.candidates.feasibility import Feasibility, check_pairs, check_settings_for, feasibility
from optimizer.errors import DesignImpossible, InputError
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.settings import RunSettings, read_run_settings
from optimizer.schedule.problem import Schedule, ScheduleProblem, Status

__all__ = ["RunResult", "TypeUse", "run_scenario", "Stage"]

Stage = Callable[[str, int, int], None]


@dataclass(frozen=True)
class TypeUse:
    """A type used by the schedule, with its schedule mark (larger number = heavier column)."""

    mark: str
    type_index: int
    cells: tuple[int, ...]


@dataclass
class RunResult:
    """Everything a run produced (edge units named in each field)."""

    scenario: Scenario
    scenario_path: str
    settings: RunSettings
    actions: pd.DataFrame
    takedown: TakedownResult | None
    catalogue: Catalogue
    feasibility: Feasibility
    problem: ScheduleProblem
    schedule: Schedule
    chosen_cand: np.ndarray  # (n_cells,) candidate index per cell
    chosen_type: np.ndarray  # (n_cells,) catalogue type index per cell
    chosen_orient: np.ndarray  # (n_cells,) 0 as given, 1 turned
    checks: MemberChecks  # exact re-check of every chosen design, one row per cell
    types_used: list[TypeUse]
    lower_bound: float  # objective units
    premium: float
    baseline: Schedule | None
    timings_s: dict[str, float]
    warnings: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    scenario_hash: str = ""
    version: str = __version__

    def mark_of(self, cell: int) -> str:
        """Schedule mark of the type chosen for ``cell``."""
        return self._marks[int(self.chosen_type[cell])]

    @property
    def _marks(self) -> dict[int, str]:
        return {u.type_index: u.mark for u in self.types_used}

    @functools.cached_property
    def totals(self) -> dict[str, float]:
        """Headline quantities of the schedule."""
        fe, k = self.feasibility, self.chosen_cand
        from optimizer.candidates.costs import candidate_cost_carbon

        cost, carbon = candidate_cost_carbon(fe, self.settings.costs)
        return {
            "steel_t": float(fe.steel_kg[k].sum()) / 1000.0,
            "main_bars_t": float(fe.main_kg[k].sum()) / 1000.0,
            "laps_t": float(fe.lap_kg[k].sum()) / 1000.0,
            "links_t": float(fe.link_kg[k].sum()) / 1000.0,
            "concrete_m3": float(fe.concrete_m3[k].sum()),
            "formwork_m2": float(fe.formwork_m2[k].sum()),
            "plan_area_m2": float(fe.plan_m2[k].sum()),
            "cost": float(np.nansum(cost[k])) if self.settings.costs.has_cost else float("nan"),
            "carbon_tCO2e": float(carbon[k].sum()) / 1000.0,
        }


def _file_hash(path: str) -> str:
    h = hashlib.sha256()
    p = Path(path)
    if not p.is_file():
        return "in-memory"
    h.update(p.read_bytes())
    return h.hexdigest()[:16]


def run_scenario(  # noqa: PLR0915 - the stages of the main job in order
    path: str | Scenario,
    progress: Stage | None = None,
    time_limit_s: float | None = None,
    solver: str | None = None,
    max_types: int | None = None,
    label: str = "",
    formulation: str | None = None,
) -> RunResult:
    """Run the main job on the scenario at ``path`` (or on a Scenario object, e.g. a variant).

    Raises:
        InputError: bad scenario (exit 2).
        DesignImpossible: a cell no type can carry, or no schedule satisfies the rules (exit 3).
    """
    from optimizer.schedule import diagnose, heuristic
    from optimizer.schedule.solve import lower_bound_premium

    say = progress or (lambda *_: None)
    timings: dict[str, float] = {}
    t = time.perf_counter()
    scenario = path if isinstance(path, Scenario) else load_scenario(path)
    path = scenario.source if isinstance(path, Scenario) else str(path)
    settings = read_run_settings(scenario)
    say("scenario", 1, 1)
    td = None
    if scenario.actions_file is not None:
        actions = read_actions_csv(scenario.actions_file, scenario)
    else:
        td = takedown(scenario, progress=lambda s, d, n: say(f"takedown: {s}", d, n))
        actions = td.actions
    timings["actions"] = time.perf_counter() - t

    t = time.perf_counter()
    cat = build_catalogue(scenario)
    timings["catalogue"] = time.perf_counter() - t
    say("catalogue", 1, 1)

    t = time.perf_counter()
    fe = feasibility(scenario, cat, actions, progress=say, fire_rule=settings.fire_rule)
    timings["feasibility"] = time.perf_counter() - t
    undesignable = fe.undesignable()
    if undesignable:
        from optimizer.candidates.feasibility import undesignable_lines

        lines = undesignable_lines(fe)
        raise DesignImpossible(
            f"{len(lines)} cell(s) no catalogue type can carry; first: {lines[0]}",
            details=lines,
            feasibility=fe,
            catalogue=cat,
        )

    t = time.perf_counter()
    problem = to_problem(fe, scenario, settings)
    opts = settings.solver
    if (formulation or opts.formulation) == "paths":
        from optimizer.schedule.pathmodel import applicable

        why = applicable(problem)
        if why is not None:
            raise InputError(
                path,
                "--formulation" if formulation else "optimizer.formulation",
                "paths",
                f"'auto' or 'compact' for this scenario: {why}",
            )
    schedule = optimise(
        problem,
        solver or opts.solver,
        time_limit_s or opts.time_limit_s,
        opts.gap_rel,
        max_types,
        progress=lambda msg: say(f"integer program: {msg}", 0, 0),
        formulation=formulation or opts.formulation,
    )
    timings["optimise"] = time.perf_counter() - t
    if schedule.cand is None or len(schedule.cand) == 0 or np.any(np.asarray(schedule.cand) < 0):
        why = diagnose.diagnose(problem)
        if why:
            raise DesignImpossible(
                f"no schedule satisfies the rules: {why[0]}", details=list(why), feasibility=fe, catalogue=cat
            )
        raise DesignImpossible(
            f"the solver found no schedule within its limits ({schedule.status}); best bound {schedule.bound:.6g}",
            details=list(schedule.notes),
            feasibility=fe,
            catalogue=cat,
        )
    lb, premium = lower_bound_premium(problem, schedule)
    base = heuristic.baseline(problem)

    t = time.perf_counter()
    cand = np.asarray(schedule.cand)
    chosen_type = fe.cand_type[cand]
    chosen_orient = fe.cand_orient[cand].astype(int)
    checks = recheck(scenario, cat, fe, chosen_type, chosen_orient, settings)
    timings["recheck"] = time.perf_counter() - t
    say("exact re-check", 1, 1)

    from optimizer.building.plausibility import plausibility_warnings

    warnings = list(td.warnings) if td is not None else []
    warnings += plausibility_warnings(scenario, actions, scenario.params)
    failing = np.nonzero(~checks.ok)[0]
    if failing.size:  # a bug, never expected: the matrix said feasible
        names = ", ".join(f"{fe.cells.cells[i][0]}@{fe.cells.cells[i][1]}" for i in failing[:5])
        warnings.append(f"BUG: {failing.size} chosen design(s) fail the exact re-check ({names}); do not use")
    unverified = np.nonzero(checks.unverified)[0]
    if unverified.size:
        names = ", ".join(f"{fe.cells.cells[i][0]}@{fe.cells.cells[i][1]}" for i in unverified[:8])
        more = f" and {unverified.size - 8} more" if unverified.size > 8 else ""
        warnings.append(
            f"fire resistance not verified by EN 1992-1-2 5.3.2 method A in {unverified.size} cell(s) "
            f"(outside its conditions of use; verify by another method): {names}{more}"
        )
    warnings += crank_warnings(problem, fe, cand)
    if schedule.status not in (Status.OPTIMAL, Status.WITHIN_GAP):
        warnings.append(
            f"solver stopped with status '{schedule.status}': proven gap {100 * schedule.gap:.2f} % "
            f"(requested {100 * opts.gap_rel:g} %)"
        )
    # the takedown states lateral stability too; the run's own sentence covers both routes, once
    notes = (
        [n for n in td.notes if not n.startswith("Lateral stability")]
        if td is not None
        else ["actions from an analysis (CSV route)"]
    )
    ratio_known = bool(np.all(np.isfinite(fe.cells.M0Eqp_ratio)))
    notes += [
        "Lateral stability is assumed to be provided by the cores: every column is checked as braced "
        "(EN 1992-1-1 5.8.3.2, Eq. (5.15)).",
        "Second-order effects by the nominal curvature method (EN 1992-1-1 5.8.8); imperfections in the "
        "more unfavourable direction only (5.8.9(2)); minimum moment NEd e0 about both axes (6.1(4)); "
        "rm from the end moments with the imperfection moment (5.8.3.1); c = 8 for a constant first-order "
        "moment, 10 where it changes sign, linear between (5.8.8.2(4)).",
        f"Creep: phi_ef = phi(inf, t0) M0Eqp/M0Ed per cell and section (EN 1992-1-1 5.8.4, Eq. (5.19)), "
        f"phi(inf, t0) by Annex B with {scenario.creep.describe()}"
        + ("" if scenario.creep_given else " (defaults: give [creep] to change them)")
        + "; M0Eqp/M0Ed "
        + (
            "from the quasi-permanent combination Gk + psi2 Qk of the takedown"
            if ratio_known
            else "taken as 1.0 (upper bound) where the actions do not give it"
        )
        + "; non-linear creep (Eq. (3.7)) where the quasi-permanent stress exceeds 0.45 fck.",
        "Shear from the end moments, VEd = (|Mtop| + |Mbot|)/l, against VRd,c or the links (EN 1992-1-1 6.2); "
        "lap zone: bars below plus bars above <= 0.08 Ac (9.5.2(3)), checked on the schedule.",
        "Biaxial bending by EN 1992-1-1 Eq. (5.39) with the criteria of 5.38; section resistance by strain "
        "compatibility (6.1), parabola-rectangle concrete, horizontal steel top branch.",
        "Fire: EN 1992-1-2 5.3.2 method A, Table 5.2a at mu_fi = eta_fi NEd / NRd (5.3.2(3); eta_fi = "
        "(Gk + psi1 Qk) / NEd from the takedown, 0.7 for mu_fi where the actions do not give it; the derived "
        "cover meets the mu_fi = 0.7 column); l0,fi = 0.5 l (0.7 l in the top storey) for R > 30 in the "
        "braced structure.",
        f"Nominal cover: {cat.cover_note}.",
    ]
    return RunResult(
        scenario=scenario,
        scenario_path=str(path),
        settings=settings,
        actions=actions,
        takedown=td,
        catalogue=cat,
        feasibility=fe,
        problem=problem,
        schedule=schedule,
        chosen_cand=cand,
        chosen_type=chosen_type,
        chosen_orient=chosen_orient,
        checks=checks,
        types_used=_marks(cat, chosen_type),
        lower_bound=lb,
        premium=premium,
        baseline=base,
        timings_s=timings,
        warnings=warnings,
        notes=notes,
        scenario_hash=_file_hash(path) + (f"+{label}" if label else ""),
    )


def _solve_child(conn, problem, solver, time_limit_s, gap_rel, max_types, warm):
    """Child process: the integer program, with its result sent back through ``conn``."""
    import os

    from optimizer.schedule.solve import SolveOptions, solve

    devnull = os.open(os.devnull, os.O_WRONLY)
    os.dup2(devnull, 1)  # the solver library prints a banner on stdout; the user's terminal is the parent's

    try:
        conn.send(
            solve(
                problem,
                SolveOptions(solver=solver, time_limit_s=time_limit_s, gap_rel=gap_rel, formulation="compact"),
                max_types=max_types,
                warm_start=warm,
            )
        )
    except Exception as exc:
        conn.send(exc)
    finally:
        conn.close()


def optimise(
    problem: ScheduleProblem,
    solver: str,
    time_limit_s: float,
    gap_rel: float,
    max_types: int | None,
    progress: Callable[[str], None] | None = None,
    formulation: str = "auto",
) -> Schedule:
    """The schedule within a hard time limit.

    Without a cap or a price on types the stacks are independent and the exact
    per-stack shortest paths are returned. Otherwise, where it is valid (every
    monotone rule on, no cap on grade changes per stack) and not declined by
    ``formulation="compact"``, column generation over stack paths
    (:mod:`optimizer.schedule.paths`) finds the schedule and its bound within the limit;
    under a cap it starts from the greedy rationalised schedule.

    For the compact formulation, a greedy rationalised
    schedule is found first (a feasible incumbent within seconds), then the
    integer program runs in a child process, warm-started from it, and is
    stopped at the time limit whatever phase the solver is in (some solvers
    check their limit only between phases). The better schedule is returned
    with the best proven bound; a schedule not proven within the gap is
    labelled "time limit", never optimal.
    """
    import multiprocessing as mp

    from optimizer.schedule import heuristic
    from optimizer.schedule.pathmodel import applicable
    from optimizer.schedule.solve import SolveOptions, greedy_start, solve

    say = progress or (lambda _m: None)
    t0 = time.perf_counter()
    r = problem.rules
    cap = max_types if max_types is not None else r.max_types
    if not (r.couples_stacks or max_types is not None):
        return solve(
            problem,
            SolveOptions(solver=solver, time_limit_s=time_limit_s, gap_rel=gap_rel),
            max_types=max_types,
            progress=say,
        )
    if formulation != "compact":
        why = applicable(problem)
        if why is None:  # the same route as solve: greedy start under caps, then column generation
            return solve(
                problem,
                SolveOptions(solver=solver, time_limit_s=time_limit_s, gap_rel=gap_rel, formulation="paths"),
                max_types=max_types,
                progress=say,
            )
        if formulation == "paths":
            raise ValueError(f"the path formulation does not apply: {why}")
        say(f"compact formulation: {why}")
    warm = greedy_start(problem, cap, time_limit_s, share=0.3)
    lb = heuristic.cellwise_lower_bound(problem).value
    if warm is not None:
        fig = heuristic.figures(problem, warm.cand)
        say(f"greedy rationalised schedule {fig.objective:.6g} in {time.perf_counter() - t0:.1f} s")
    remaining = time_limit_s - (time.perf_counter() - t0)
    best = None
    if remaining > 5.0:
        ctx = mp.get_context("spawn")
        parent, child = ctx.Pipe(duplex=False)
        proc = ctx.Process(
            target=_solve_child, args=(child, problem, solver, 0.7 * remaining, gap_rel, max_types, warm), daemon=True
        )
        proc.start()
        child.close()
        if parent.poll(remaining):
            got = parent.recv()
            best = got if isinstance(got, Schedule) else None
            if best is None:
                say(f"integer program failed: {got}")
        else:
            say(f"integer program stopped at the time limit ({time_limit_s:g} s)")
        proc.terminate()
        proc.join(5)
    if best is not None and np.all(np.asarray(best.cand) >= 0):
        if warm is None or best.objective <= heuristic.figures(problem, warm.cand).objective + 1e-9:
            return best
    if warm is None:
        return Schedule(
            cand=np.full(problem.n_cells, -1, dtype=int),
            status=Status.NO_SCHEDULE,
            objective=np.inf,
            bound=lb,
            gap=np.inf,
            solver=f"{solver} (stopped)",
            seconds=time.perf_counter() - t0,
        )
    obj = heuristic.figures(problem, warm.cand).objective
    bound = max(lb, best.bound if best is not None and np.isfinite(best.bound) else -np.inf)
    gap = max(0.0, (obj - bound) / max(abs(obj), 1e-9))
    return Schedule(
        cand=np.asarray(warm.cand),
        status=Status.OPTIMAL if gap <= 1e-9 else Status.TIME_LIMIT,
        objective=obj,
        bound=bound,
        gap=gap,
        solver=f"greedy rationalisation; {solver} integer program within {time_limit_s:g} s did not improve it",
        seconds=time.perf_counter() - t0,
        notes=("bound: cell-wise lower bound or the solver's, whichever is higher",),
    )


def recheck(
    scenario: Scenario,
    cat: Catalogue,
    fe: Feasibility,
    chosen_type: np.ndarray,
    chosen_orient: np.ndarray,
    settings: RunSettings,
) -> MemberChecks:
    """Exact member check (exact MRd, direction-exact biaxial reported) of the chosen type in every cell.

    One row per cell, in cell order. Cells are grouped by (exposure, fire, orientation) and checked
    together; the rows are then put back in cell order.
    """
    ct = fe.cells
    data = SectionData.of(SectionBatch(cat.designs))
    n = len(ct)
    groups: dict[tuple, list[int]] = {}
    for i in range(n):
        groups.setdefault((ct.exposure[i], ct.fire[i], int(chosen_orient[i])), []).append(i)
    parts = []
    for (exp, fire, orient), cells in groups.items():
        cc = np.array(cells)
        st = check_settings_for(scenario, exp, fire, settings.fire_rule)
        res, _ = check_pairs(data, cc, chosen_type[cc], ct, orient, st, scenario.params, fast=False)
        parts.append((cc, res))
    return _merge(parts, n)


CRANK_SLOPE = 12.0  # bars cranked at 1 in 12 or flatter need no check of the lateral force (9.5.3(5))


def crank_warnings(problem, fe: Feasibility, cand: np.ndarray) -> list[str]:
    """Size steps whose cranked bars cannot reach 1 in 12 within the clear height of the storey below.

    EN 1992-1-1, 9.5.3(5): where the bars change direction at a change of column size, the links must
    take the lateral force, which may be ignored at a slope of 1 in 12 or flatter. A step of d per face
    (plus half the change of bar size) then needs a crank of 12 d below the floor; where that does not
    fit in the clear height of the storey below, separate starter bars (step_rule = "starters") or a
    smaller step are needed.
    """
    from optimizer.schedule.prepared import step_per_face

    t = problem.types
    typ = fe.cand_type[np.asarray(cand)]
    out = []
    for lo, up in enumerate(problem.above):
        if up < 0:
            continue
        a, b = int(typ[lo]), int(typ[up])
        step = float(step_per_face(t.b[a], t.h[a], t.b[b], t.h[b]))
        offset = step + abs(float(t.corner_dia[a] - t.corner_dia[b])) / 2
        need = CRANK_SLOPE * offset
        if offset > 0 and need > fe.cells.l_clear[lo] and step <= problem.rules.max_step_mm:
            stack, level = fe.cells.cells[lo]
            out.append(
                f"{stack} above {level}: a step of {offset:g} mm per face needs bars cranked over "
                f"{need:,.0f} mm at 1 in 12 (EN 1992-1-1 9.5.3(5)), more than the clear height "
                f"{fe.cells.l_clear[lo]:,.0f} mm below; use separate starter bars or links for the "
                "lateral force"
            )
    return out


def _merge(parts: list[tuple[np.ndarray, MemberChecks]], n: int) -> MemberChecks:
    """Put per-group check results back in cell order (checks present in a group only are padded)."""
    from design.results import CheckColumn, CheckKind

    names: list[tuple[str, str, str]] = []
    for _, res in parts:
        for c in res.checks:
            key = (c.name, c.clause, c.unit)
            if key not in names:
                names.append(key)
    cols = []
    for name, clause, unit in names:
        demand = np.zeros(n)
        capacity = np.ones(n)
        applicable = np.ones(n, dtype=bool)
        notes = [""] * n
        blocking = True
        kind = CheckKind.RESISTANCE
        for cc, res in parts:
            match = [c for c in res.checks if (c.name, c.clause, c.unit) == (name, clause, unit)]
            if not match:
                for i in cc:
                    notes[i] = "not required for this cell"
                continue
            c = match[0]
            blocking, kind = c.blocking, c.kind
            demand[cc], capacity[cc], applicable[cc] = c.demand, c.capacity, c.applicable
            for j, i in enumerate(cc):
                notes[i] = c.result(j).note
        cols.append(
            CheckColumn(name, clause, unit, demand, capacity, applicable, np.array(notes, dtype=object), blocking, kind)
        )
    values: dict[str, np.ndarray] = {}
    for key in parts[0][1].values:
        sample = parts[0][1].values[key]
        arr = np.empty(n, dtype=np.asarray(sample).dtype if np.ndim(sample) else object)
        for cc, res in parts:
            v = res.values.get(key)
            if v is None:
                continue
            arr[cc] = v
        values[key] = arr
    return MemberChecks(idx=np.arange(n), checks=cols, values=values)


def _marks(cat: Catalogue, chosen_type: np.ndarray) -> list[TypeUse]:
    """Schedule marks C1, C2, ... ordered by plan area, then steel, then grade (a larger number is heavier)."""
    used = sorted(
        set(int(t) for t in chosen_type),
        key=lambda t: (
            cat.types[t].design.section.Ac,
            cat.types[t].design.section.As,
            cat.types[t].design.concrete.fck,
        ),
    )
    width = len(str(len(used)))
    out = []
    for k, t in enumerate(used, start=1):
        cells = tuple(int(i) for i in np.nonzero(chosen_type == t)[0])
        out.append(TypeUse(f"C{k:0{width}d}", t, cells))
    return out
