"""Solving the scheduling problem: the formulation chosen, the warm start, reductions, solver and result.

:func:`solve` is the entry point. Without a cap or price that couples the stacks,
every stack's own shortest path is the optimum and is returned at once. Otherwise
the path formulation (column generation over stack paths, :func:`solve_paths`) is
used wherever it is valid, and the compact model
(:mod:`optimizer.schedule.compact`) elsewhere or when asked for; both start from
the greedy rationalised schedule (:func:`greedy_start`) under caps. When the path
bound leaves the gap open on a small problem, :func:`solve_paths` finishes the
proof with the compact model's branch and bound.

:func:`pareto` sweeps the cap on types; :func:`lower_bound_premium` compares a
schedule with the cell-wise lower bound.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Literal

import numpy as np

from optimizer.schedule.backends import Backend, Outcome, SolverName, solve_highspy, solve_pulp, status_from
from optimizer.schedule.builder import Formulation, Reduction, reduce_problem
from optimizer.schedule.check import check_schedule
from optimizer.schedule.compact import expand, formulate, start_values
from optimizer.schedule.heuristic import (
    baseline,
    cellwise_lower_bound,
    figure_notes,
    figures,
    rationalise,
    stack_optimum,
)
from optimizer.schedule.pathmodel import applicable
from optimizer.schedule.paths import PathSearch, search_paths
from optimizer.schedule.problem import Objective, Schedule, ScheduleProblem, Status

__all__ = [
    "FormulationName",
    "TypePool",
    "SolveOptions",
    "solve",
    "solve_paths",
    "greedy_start",
    "pareto",
    "lower_bound_premium",
    "FINISH_MAX_CANDIDATES",
]

FormulationName = Literal["auto", "paths", "compact"]
TypePool = Literal["all", "paths"]

FINISH_MAX_CANDIDATES = 20_000  # the compact model finishes the path formulation's proof up to this size


@dataclass(frozen=True)
class SolveOptions:
    """How to solve: the solver and its limits, the formulation, and the compact model's settings.

    Attributes:
        solver: "highs" or "cbc".
        time_limit_s: time limit, seconds (for the compact model, the solver's limit: the reductions and the
            model build come on top; for the path formulation, the whole solve).
        gap_rel: relative gap at which the solver stops.
        threads: solver threads (None: the solver's default).
        formulation: "paths" (column generation over stack paths), "compact" (one binary per candidate) or
            "auto" (paths whenever something couples the stacks and the path formulation is valid, else compact).
        backend: the compact model's back-end: "pulp", "highspy" (HiGHS only) or "auto" (highspy for HiGHS,
            PuLP for CBC).
        reduce: apply the safe reductions of :func:`optimizer.schedule.builder.reduce_problem`.
        exact_decomposition: when nothing couples the stacks (no cap or price on types or sections), return
            the per-stack shortest paths, which are then optimal.
        type_pool: "all" (every type: the solver's bound is a bound of the problem), or "paths" (decomposition:
            only the types of the stacks' own cheapest paths, of the warm start and of the baseline; the
            reported bound is then the per-stack bound of the full problem, not the solver's).
    """

    solver: SolverName = "highs"
    time_limit_s: float = 60.0
    gap_rel: float = 0.01
    threads: int | None = None
    formulation: FormulationName = "auto"
    backend: Backend = "auto"
    reduce: bool = True
    exact_decomposition: bool = True
    type_pool: TypePool = "all"

    def __post_init__(self) -> None:
        """Refuse the highspy back-end with another solver than HiGHS."""
        if self.backend == "highspy" and self.solver != "highs":
            raise ValueError("the highspy back-end solves with HiGHS only")


def solve(
    problem: ScheduleProblem,
    options: SolveOptions = SolveOptions(),
    *,
    max_types: int | None = None,
    warm_start: Schedule | None = None,
    progress: Callable[[str], None] | None = None,
) -> Schedule:
    """Solve the scheduling problem to a proven gap (or the time limit).

    Args:
        problem: the problem.
        options: solver, limits, formulation and the compact model's settings.
        max_types: cap on distinct types (None: the rules' cap).
        warm_start: a feasible schedule handed to the solver (None: the greedy heuristic's).
        progress: called with a line of text at each stage.

    Returns:
        The schedule with status, objective (recomputed from the problem), best bound and proven gap.

    Raises:
        ValueError: when the path formulation is asked for and does not apply.
    """
    say = progress or (lambda _msg: None)
    t_all = time.perf_counter()
    coupled = problem.rules.couples_stacks or max_types is not None
    if not coupled and options.exact_decomposition:
        sched = _independent_stacks(problem, say, t_all)
        if sched is not None:
            return sched
    notes: list[str] = []
    if options.formulation != "compact":
        why = applicable(problem)
        if why is None:
            return _by_paths(problem, options, max_types, warm_start, say, t_all)
        if options.formulation == "paths":
            raise ValueError(f"the path formulation does not apply: {why}")
        notes.append(f"compact formulation: {why}")
    return _compact(problem, options, max_types, warm_start, say, t_all, notes)


def _independent_stacks(problem: ScheduleProblem, say: Callable[[str], None], t_all: float) -> Schedule | None:
    """Nothing couples the stacks: their own shortest paths are the optimum (None when a stack has none)."""
    sched = stack_optimum(problem)
    if sched is None:
        return None
    fig = figures(problem, sched.cand)
    say(f"stacks are independent: shortest paths give the optimum {fig.objective:.6g}")
    return Schedule(
        cand=sched.cand,
        status=Status.OPTIMAL,
        objective=fig.objective,
        bound=fig.objective,
        gap=0.0,
        solver="stack shortest paths (exact: no coupling)",
        seconds=time.perf_counter() - t_all,
        notes=figure_notes(fig),
    )


def _by_paths(
    problem: ScheduleProblem,
    options: SolveOptions,
    max_types: int | None,
    warm_start: Schedule | None,
    say: Callable[[str], None],
    t_all: float,
) -> Schedule:
    """The path formulation, started from the warm start or (under a cap) the greedy schedule."""
    r = problem.rules
    cap_t = max_types if max_types is not None else r.max_types
    start = np.asarray(warm_start.cand) if warm_start is not None else None
    if start is not None and _breaks_rules(problem, start):
        start = None  # made under other rules: as an incumbent it could prune every valid schedule
    if start is None and (cap_t is not None or r.max_sections is not None or r.max_grades is not None):
        heur = greedy_start(problem, cap_t, options.time_limit_s)
        start = heur.cand if heur is not None else None
    left = max(1.0, options.time_limit_s - (time.perf_counter() - t_all))
    return solve_paths(
        problem, replace(options, time_limit_s=left), max_types=max_types, warm_start=start, progress=say
    )


# --------------------------------------------------------------------------------------------
# the compact model
# --------------------------------------------------------------------------------------------


def _compact(
    problem: ScheduleProblem,
    options: SolveOptions,
    max_types: int | None,
    warm_start: Schedule | None,
    say: Callable[[str], None],
    t_all: float,
    notes: list[str],
) -> Schedule:
    """The compact model: incumbent, reductions, formulation, solver, result."""
    cap_t = max_types if max_types is not None else problem.rules.max_types
    incumbent = _incumbent(problem, warm_start, cap_t, options.time_limit_s, say, notes)
    pool_mask = _type_pool(problem, incumbent) if options.type_pool == "paths" else None
    red = _reductions(problem, incumbent, options.reduce, pool_mask, say, notes)
    covered = np.zeros(problem.n_cells, dtype=bool)
    covered[problem.cand_cell[red.keep]] = True
    if (~covered & (red.mult > 0)).any():
        c = int(np.flatnonzero(~covered & (red.mult > 0))[0])
        notes.append(
            f"stack {problem.cell_names[c][0]}: level {problem.cell_names[c][1]} lies on no buildable "
            "path (see optimizer.schedule.diagnose)"
        )
        return Schedule(
            cand=np.full(problem.n_cells, -1, dtype=int),
            status=Status.INFEASIBLE,
            objective=np.inf,
            bound=np.inf,
            gap=np.inf,
            solver="reductions",
            seconds=time.perf_counter() - t_all,
            notes=tuple(notes),
        )
    t0 = time.perf_counter()
    form = formulate(problem, max_types=cap_t, reduction=red)
    start = start_values(problem, form, incumbent) if incumbent is not None else None
    size = (
        f"model: {form.n_binaries} binaries, {form.n_cols - form.n_binaries} continuous, "
        f"{form.n_rows} rows, {form.n_nonzeros} nonzeros; formulated in {time.perf_counter() - t0:.1f} s"
    )
    say(size)
    notes.append(size)
    out, label = _run_solver(problem, form, start, options, say, notes)
    if out.xval is None:
        return _without_solution(problem, out, red, incumbent, pool_mask, label, notes, t_all)
    cand = expand(problem, form, out.xval)
    fig = figures(problem, cand)
    bound = min(out.bound, fig.objective) if pool_mask is None else -np.inf
    if pool_mask is not None and np.isfinite(out.bound):
        notes.append(f"solver bound over the type pool only: {out.bound:.6g}")
    bound = max(bound, red.lower_bound, cellwise_lower_bound(problem).value)
    gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9)) if np.isfinite(bound) else np.inf
    status = status_from(True, False, gap, options.gap_rel, out.status is Status.TIME_LIMIT)
    return Schedule(
        cand=cand,
        status=status,
        objective=fig.objective,
        bound=bound,
        gap=gap,
        solver=label,
        seconds=time.perf_counter() - t_all,
        notes=tuple(notes) + figure_notes(fig),
    )


def _incumbent(
    problem: ScheduleProblem,
    warm_start: Schedule | None,
    cap_t: int | None,
    time_limit_s: float,
    say: Callable[[str], None],
    notes: list[str],
) -> np.ndarray | None:
    """The warm start if it keeps every rule, else (without one) the greedy schedule; None when there is none."""
    if warm_start is not None:
        incumbent = np.asarray(warm_start.cand)
        if _breaks_rules(problem, incumbent):
            notes.append("warm start ignored: it breaks a rule of this problem")
            return None
        return incumbent
    t0 = time.perf_counter()
    heur = greedy_start(problem, cap_t, time_limit_s)
    if heur is None:
        return None
    say(f"greedy warm start {heur.objective:.6g} in {time.perf_counter() - t0:.1f} s")
    notes.append(f"warm start (greedy type reduction): {heur.objective:.6g}")
    return heur.cand


def _type_pool(problem: ScheduleProblem, incumbent: np.ndarray | None) -> np.ndarray:
    """The decomposition's type pool: the lightest types of the cells, the baseline's and the incumbent's."""
    pool_mask = np.zeros(len(problem.types), dtype=bool)
    lightest = cellwise_lower_bound(problem).cand
    pool_mask[problem.cand_type[lightest[lightest >= 0]]] = True
    base = baseline(problem)
    if base is not None:
        pool_mask[problem.cand_type[base.cand]] = True
    if incumbent is not None:
        pool_mask[problem.cand_type[incumbent]] = True
    return pool_mask


def _reductions(
    problem: ScheduleProblem,
    incumbent: np.ndarray | None,
    reduce: bool,
    pool_mask: np.ndarray | None,
    say: Callable[[str], None],
    notes: list[str],
) -> Reduction:
    """The reductions (safe unless over a type pool), with the per-stack bound of the full problem."""
    t0 = time.perf_counter()
    red = reduce_problem(problem, incumbent, prune_paths=reduce, merge_stacks=reduce, type_pool=pool_mask)
    say(f"reductions in {time.perf_counter() - t0:.1f} s: " + "; ".join(red.notes))
    notes += list(red.notes)
    if pool_mask is not None and len(problem.cand_cell) <= 1_000_000:
        # the per-stack bound of the full problem (the pool's own bound is not one)
        full = reduce_problem(problem, None, merge_stacks=reduce, prune_paths=True)
        red = replace(red, lower_bound=full.lower_bound)
    return red


def _run_solver(
    problem: ScheduleProblem,
    form: Formulation,
    start: np.ndarray | None,
    options: SolveOptions,
    say: Callable[[str], None],
    notes: list[str],
) -> tuple[Outcome, str]:
    """The formulation through the chosen back-end; the outcome and the solver's label."""
    solver = options.solver
    use_highspy = solver == "highs" and options.backend in ("auto", "highspy")
    t0 = time.perf_counter()
    if use_highspy:
        out = solve_highspy(form, start, options.time_limit_s, options.gap_rel, options.threads)
    else:
        out = solve_pulp(problem, form, start, solver, options.time_limit_s, options.gap_rel, options.threads)
    say(f"{solver} ({'highspy' if use_highspy else 'pulp'}): {out.status.value} in {time.perf_counter() - t0:.1f} s")
    notes += out.notes
    notes.append(f"solver {solver}, time limit {options.time_limit_s:g} s, relative gap {options.gap_rel:g}")
    return out, f"{'HiGHS' if solver == 'highs' else 'CBC'} via {'highspy' if use_highspy else 'PuLP'}"


def _without_solution(
    problem: ScheduleProblem,
    out: Outcome,
    red: Reduction,
    incumbent: np.ndarray | None,
    pool_mask: np.ndarray | None,
    label: str,
    notes: list[str],
    t_all: float,
) -> Schedule:
    """The solver kept no schedule: the incumbent (if any) with the best bound, or no schedule."""
    cand = incumbent if incumbent is not None else np.full(problem.n_cells, -1, dtype=int)
    status = out.status
    if incumbent is not None and status is Status.NO_SCHEDULE:
        status = Status.TIME_LIMIT
        notes.append("the solver kept no schedule: the warm start is returned")
    obj = figures(problem, cand).objective if incumbent is not None else np.inf
    if status is not Status.INFEASIBLE:
        out.bound = max(out.bound if pool_mask is None else -np.inf, red.lower_bound)
    gap = abs(obj - out.bound) / max(abs(obj), 1e-9) if np.isfinite(obj) and np.isfinite(out.bound) else np.inf
    return Schedule(
        cand=np.asarray(cand),
        status=status,
        objective=obj,
        bound=out.bound,
        gap=gap,
        solver=label,
        seconds=time.perf_counter() - t_all,
        notes=tuple(notes),
    )


def _breaks_rules(problem: ScheduleProblem, cand: np.ndarray) -> bool:
    """Whether a schedule breaks a rule (the greedy stage does not know every rule, e.g. grade caps).

    Such a schedule must not serve as an incumbent: its value would prune every schedule that keeps the rules.
    """
    return bool(check_schedule(problem, np.asarray(cand)))


def greedy_start(
    problem: ScheduleProblem, cap_t: int | None, time_limit_s: float, share: float = 0.25
) -> Schedule | None:
    """The greedy rationalised schedule (on the lightest candidates when there are many), if it keeps every rule.

    It gets ``share`` of the time limit (at least 5 s). The greedy stage does not know every rule (e.g. grade
    caps); a schedule that breaks one is not returned, since as an incumbent it would prune every valid one.
    """
    big = len(problem.cand_cell) > 200 * max(1, problem.n_cells) or len(problem.cand_cell) > 1_000_000
    heur = rationalise(
        problem, max_types=cap_t, time_limit_s=max(5.0, share * time_limit_s), per_cell=40 if big else None
    )
    return heur if heur is not None and not _breaks_rules(problem, heur.cand) else None


# --------------------------------------------------------------------------------------------
# the path formulation, finished by the compact model
# --------------------------------------------------------------------------------------------


def solve_paths(
    problem: ScheduleProblem,
    options: SolveOptions = SolveOptions(),
    *,
    max_types: int | None = None,
    warm_start: np.ndarray | None = None,
    progress: Callable[[str], None] | None = None,
) -> Schedule:
    """Solve by column generation over stack paths; on small problems the compact model closes an open gap.

    There is no branching over paths: when the path bound leaves a gap above ``options.gap_rel`` with time
    left and at most :data:`FINISH_MAX_CANDIDATES` candidates, the compact model is run to finish the proof,
    warm-started from the best schedule, and the better bound is kept.

    Args:
        problem: the problem (see :func:`optimizer.schedule.pathmodel.applicable` for when this may be used).
        options: solver (of the master with binary variables), overall time limit, gap and threads; the other
            fields are not used.
        max_types: cap on distinct types (None: the rules' cap).
        warm_start: a feasible schedule (candidate per cell), added to the master as columns.
        progress: called with a line of text at each stage.

    Returns:
        The schedule with status, objective (recomputed from the problem), bound and proven gap.

    Raises:
        ValueError: when the path formulation does not apply to the problem.
    """
    search = search_paths(
        problem,
        solver=options.solver,
        time_limit_s=options.time_limit_s,
        gap_rel=options.gap_rel,
        max_types=max_types,
        warm_start=warm_start,
        progress=progress,
        threads=options.threads,
    )
    if search.result is not None:
        return search.result
    remaining = search.deadline - time.perf_counter()
    if search.gap > options.gap_rel and remaining > 1.0 and len(problem.cand_cell) <= FINISH_MAX_CANDIDATES:
        return _finish_compact(problem, search, options, max_types, remaining)
    return search.schedule()


def _finish_compact(
    problem: ScheduleProblem, search: PathSearch, options: SolveOptions, max_types: int | None, remaining: float
) -> Schedule:
    """Close the gap with the compact model (branch and bound), warm-started, keeping the path bound."""
    state = search.state
    warm = None
    if state.columns is not None:
        cand = search.model.assemble(state.columns)
        warm = Schedule(
            cand=cand,
            status=Status.HEURISTIC,
            objective=state.value,
            bound=state.bound,
            gap=state.gap,
            solver=search.label,
            seconds=0.0,
        )
    compact = SolveOptions(
        solver=options.solver,
        time_limit_s=remaining,
        gap_rel=options.gap_rel,
        threads=options.threads,
        formulation="compact",
    )
    out = solve(problem, compact, max_types=max_types, warm_start=warm)
    notes = (
        search.notes
        + [
            f"path bound {state.bound:.6g} left a gap above {options.gap_rel:g}: compact model run "
            f"to finish ({out.status})"
        ]
        + [n for n in out.notes if not n.startswith("steel ")]
    )
    secs = time.perf_counter() - search.t_all
    if out.status is Status.INFEASIBLE:
        return replace(out, notes=tuple(notes), seconds=secs)
    if np.any(np.asarray(out.cand) < 0):
        return replace(out, bound=max(out.bound, state.bound), notes=tuple(notes), seconds=secs)
    fig = figures(problem, out.cand)
    bound = min(max(out.bound, state.bound), fig.objective)
    gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9))
    return Schedule(
        cand=np.asarray(out.cand),
        status=status_from(True, False, gap, options.gap_rel, stopped=False),
        objective=fig.objective,
        bound=bound,
        gap=gap,
        solver=f"{search.label}; finished by {out.solver}",
        seconds=secs,
        notes=tuple(notes) + figure_notes(fig),
    )


# --------------------------------------------------------------------------------------------
# the cap on types swept, and the premium over the lower bound
# --------------------------------------------------------------------------------------------


def pareto(
    problem: ScheduleProblem,
    options: SolveOptions = SolveOptions(),
    *,
    k_max: int | None = None,
    progress: Callable[[str], None] | None = None,
) -> list[tuple[int, Schedule]]:
    """Sweep the cap on distinct types: 1, 2, ... until a larger cap gains nothing.

    Each point is warm-started from the previous one (feasible for a larger
    cap). The sweep stops at ``k_max``, or when the schedule of cap k uses fewer
    than k types (a larger cap cannot help), or when the unconstrained optimum
    (per-stack shortest paths) is reached.

    Args:
        problem: the problem.
        options: how each point is solved.
        k_max: the largest cap tried (None: as many types as the unconstrained optimum uses).
        progress: called with a line of text per point.

    Returns:
        (cap, schedule) pairs; infeasible caps are included with status "infeasible".
    """
    say = progress or (lambda _msg: None)
    free = stack_optimum(problem)
    free_obj = figures(problem, free.cand).objective if free is not None else -np.inf
    free_types = figures(problem, free.cand).n_types if free is not None else len(problem.types)
    limit = min(k_max if k_max is not None else free_types, free_types)
    out: list[tuple[int, Schedule]] = []
    prev: Schedule | None = None
    for k in range(1, limit + 1):
        warm = prev if prev is not None and prev.status is not Status.INFEASIBLE else None
        sched = solve(problem, options, max_types=k, warm_start=warm)
        out.append((k, sched))
        say(f"k = {k}: {sched.status}, objective {sched.objective:.6g}")
        if sched.status is Status.INFEASIBLE:
            continue
        prev = sched
        used = figures(problem, sched.cand).n_types
        if used < k or sched.objective <= free_obj * (1 + 1e-9):
            break
    return out


def lower_bound_premium(problem: ScheduleProblem, schedule: Schedule) -> tuple[float, float]:
    """The cell-wise lower bound and the rationalisation premium of a schedule.

    The premium compares the minimised quantity without the prices of types and
    sections: (schedule - lower bound) / lower bound.

    Returns:
        (lower bound, premium).
    """
    lb = cellwise_lower_bound(problem).value
    fig = figures(problem, schedule.cand)
    base = {Objective.STEEL: fig.steel_kg, Objective.COST: fig.cost, Objective.CARBON: fig.carbon}[
        Objective(problem.objective)
    ]
    return lb, (base - lb) / lb if lb > 0 else np.inf
