"""Column generation over stack paths: a strong bound and good schedules when types are counted.

The compact integer program (:mod:`optimizer.schedule.compact`) has one binary per (cell,
type) and its relaxation lets a stack split itself fractionally over many
types. Here the same problem is written over whole stack *paths* (Dantzig-Wolfe
decomposition; the paths and their pricing are in :mod:`optimizer.schedule.pathmodel`,
the master problem over them in :mod:`optimizer.schedule.master`). Its linear
relaxation is at least as strong as the compact one and in practice much
stronger, since each unit's part of it is the convex hull of that unit's paths.

Paths are generated as they are needed: the pricing problem of a unit is its
shortest path through the layered graph with the cost of entering type t
raised by pi_ut (:mod:`optimizer.schedule.stackdp`). Any dual values give a valid lower
bound (Lasdon): the master's value plus every unit's most negative reduced
cost. The same bound prunes candidates: a row whose cheapest path exceeds the
best path of its unit by more than (incumbent - bound) lies in no schedule
better than the incumbent.

Schedules come from the master with binary variables over the generated paths
(HiGHS or CBC), improved by re-routing every unit over the chosen type set and
by dropping and adding single types, each step an exact shortest path.

:func:`search_paths` runs the whole search and returns a :class:`PathSearch`
(its schedule: :meth:`PathSearch.schedule`). There is no branching over paths:
closing a gap the path bound leaves open with the compact model is the job of
:func:`optimizer.schedule.solve.solve_paths`.
"""

from __future__ import annotations

import itertools
import math
import time
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass

import numpy as np

from optimizer.schedule.backends import status_from
from optimizer.schedule.heuristic import figure_notes, figures
from optimizer.schedule.master import Counting, Master, MasterRows, integer_master, integral_columns, y_part
from optimizer.schedule.pathmodel import Column, PathModel, applicable
from optimizer.schedule.problem import Schedule, ScheduleProblem, Status

__all__ = ["State", "PathSearch", "search_paths", "min_counts", "prune"]


@dataclass
class State:
    """Best schedule found so far and the best bound proven."""

    value: float = np.inf
    columns: dict[int, Column] | None = None
    bound: float = -np.inf

    @property
    def gap(self) -> float:
        """Relative gap between the best schedule and the bound."""
        return max(0.0, (self.value - self.bound) / max(abs(self.value), 1e-9))


def _no_schedule(
    problem: ScheduleProblem, status: Status, bound: float, solver: str, t_all: float, notes: list[str]
) -> Schedule:
    """A result without a schedule (infeasible, or nothing found in time)."""
    return Schedule(
        cand=np.full(problem.n_cells, -1, dtype=int),
        status=status,
        objective=np.inf,
        bound=bound,
        gap=np.inf,
        solver=solver,
        seconds=time.perf_counter() - t_all,
        notes=tuple(notes),
    )


def _unit_name(model: PathModel, ui: int) -> str:
    return ", ".join(model.problem.stack_names[s] for s in model.prep.units[ui].stacks)


def _schedule_value(model: PathModel, counting: Counting, columns: dict[int, Column]) -> float:
    used = {t for col in columns.values() for t in col.types}
    return sum(col.cost for col in columns.values()) + counting.price_of(model.problem, used)


def _reroute(
    model: PathModel, allowed: set[int], units: list[int], pool: ThreadPoolExecutor
) -> dict[int, Column] | None:
    """Every listed unit on its cheapest path using only the allowed types (None if one has none)."""
    n_t = len(model.problem.types)
    pen = np.full(n_t, np.inf)
    pen[list(allowed)] = 0.0
    gpen = np.zeros(len(model.grades))
    found = list(pool.map(lambda u: model.price(u, pen, gpen), units))
    if any(col is None for _, col in found):
        return None
    return {u: col for u, (_, col) in zip(units, found, strict=True)}


def _local_search(  # noqa: PLR0912 - drop, add and swap moves
    model: PathModel,
    counting: Counting,
    columns: dict[int, Column],
    pool: ThreadPoolExecutor,
    deadline: float,
    add_from: list[int],
    master: Master,
) -> dict[int, Column]:
    """Improve a schedule: re-route over its type set, then drop, add or swap single types while that pays.

    Every move is exact for the units it touches (their cheapest paths over the new type set); a move is
    applied as soon as it pays (first improvement), and the pass repeats until none pays or time is up.
    """
    p = model.problem
    cur = dict(columns)
    types = {t for col in cur.values() for t in col.types}
    routed = _reroute(model, types, model.units, pool)
    if routed is not None and _schedule_value(model, counting, routed) < _schedule_value(model, counting, cur):
        cur = routed
    for col in cur.values():
        master.add(col)
    has_type = {u: set(np.unique(np.concatenate([ch.typ for ch in model.chains[u]])).tolist()) for u in model.units}

    def used() -> set[int]:
        return {x for col in cur.values() for x in col.types}

    def better(trial_types: set[int], units: list[int]) -> dict[int, Column] | None:
        """The schedule with ``units`` re-routed over ``trial_types``, if it keeps the caps and pays."""
        if not units or not counting.allows(p, trial_types):
            return None
        new = _reroute(model, trial_types, units, pool)
        if new is None:
            return None
        trial = {**cur, **new}
        if _schedule_value(model, counting, trial) < _schedule_value(model, counting, cur) - 1e-9:
            return trial
        return None

    improved = True
    while improved and time.perf_counter() < deadline:
        improved = False
        # drop one type: re-route only the units that use it
        for t in sorted(used()):
            if time.perf_counter() > deadline:
                break
            found = better(used() - {t}, [u for u, col in cur.items() if t in col.types])
            if found is not None:
                cur, improved = found, True
        # add one type (from the relaxation's support): the units that can use it may move to it
        for t in add_from:
            if t in used() or time.perf_counter() > deadline:
                continue
            found = better(used() | {t}, [u for u in model.units if t in has_type[u]])
            if found is not None:
                cur, improved = found, True
        # swap one type for another (when a cap stops plain additions)
        for t_new in add_from[:12] if not improved else []:
            for t_old in sorted(used()) if t_new not in used() else []:
                if time.perf_counter() > deadline:
                    break
                units = sorted(
                    {u for u, col in cur.items() if t_old in col.types}
                    | {u for u in model.units if t_new in has_type[u]}
                )
                found = better((used() - {t_old}) | {t_new}, units)
                if found is not None:
                    cur, improved = found, True
                    break
        for col in cur.values():
            master.add(col)
    return cur


# --------------------------------------------------------------------------------------------
# the search
# --------------------------------------------------------------------------------------------

_SMOOTH = 0.5  # weight of the stability centre in the pricing duals (Wentges smoothing)


class PathSearch:
    """Column generation over the paths of one problem, then the integer master and local search.

    Built and run by :func:`search_paths`. The phases: the units' own optima (the first paths and the first
    bound, and infeasibility when a stack has no path), the caps (fewest types each unit needs, phase one),
    stabilised column generation with pruning, schedules from the relaxation's support, and rounds of the
    integer master and local search while time remains and the gap is open.

    Attributes:
        problem: the problem.
        model: the paths' tables (pruned as the search goes).
        counting: what couples the units.
        master: the generated paths and the master over them.
        state: the best schedule (a column per unit) and the best bound.
        notes: the search's account, in words.
        label: the solver's name for the result.
        t_all, deadline: start and end of the time allowed (``time.perf_counter``).
        result: the final result when the search proved that no schedule exists, else None.
    """

    def __init__(
        self,
        problem: ScheduleProblem,
        solver: str,
        time_limit_s: float,
        gap_rel: float,
        max_types: int | None,
        progress: Callable[[str], None] | None,
        threads: int | None,
    ) -> None:
        self.say = progress or (lambda _m: None)
        self.t_all = time.perf_counter()
        self.time_limit_s = time_limit_s
        self.deadline = self.t_all + time_limit_s
        why = applicable(problem)
        if why is not None:
            raise ValueError(f"path formulation not applicable: {why}")
        self.problem = problem
        self.solver, self.gap_rel, self.threads = solver, gap_rel, threads
        self.counting = Counting.of(problem, max_types)
        self.model = PathModel(problem)
        n_units = len(self.model.units)
        merged = len(self.model.prep.units) - n_units
        self.notes = [
            f"path formulation: {n_units} units ({merged} identical stacks merged), {self.model.n_rows} "
            f"candidate rows; tables in {time.perf_counter() - self.t_all:.1f} s"
        ]
        self.say(self.notes[-1])
        self.label = f"path formulation (column generation; {'HiGHS' if solver == 'highs' else 'CBC'} master)"
        self.state = State()
        self.result: Schedule | None = None
        self.master: Master
        self.pool: ThreadPoolExecutor
        self.scale = 1.0
        # column generation so far
        self.rounds = 0
        self.lp_value = np.inf
        self.x_lp = np.zeros(0)
        self.rows_lp: MasterRows | None = None
        self.converged = False
        self.last_slack = np.inf
        self.center: tuple[dict[int, np.ndarray], dict[int, np.ndarray]] | None = None

    @property
    def gap(self) -> float:
        """Relative gap between the best schedule and the bound (inf without a schedule)."""
        return self.state.gap if self.state.columns is not None else np.inf

    def run(self, warm_start: np.ndarray | None) -> None:
        """Every phase of the search, within the time allowed (pricing uses two threads)."""
        self.pool = ThreadPoolExecutor(max_workers=2)
        try:
            self.result = self._first_paths(warm_start)
            if self.result is None:
                self.result = self._caps()
            if self.result is not None:
                return
            t_cg = time.perf_counter()
            self.generate(self.t_all + 0.6 * self.time_limit_s)
            self.notes.append(
                f"column generation: {self.rounds} rounds, {len(self.master.columns)} paths, "
                f"relaxation {self.lp_value:.6g}, bound {self.state.bound:.6g} in "
                f"{time.perf_counter() - t_cg:.1f} s"
            )
            self.say(self.notes[-1])
            support = self._after_generation()
            self._integer_rounds(support)
        finally:
            self.pool.shutdown()
        art = float(self.x_lp[self.rows_lp.art]) if self.rows_lp is not None and self.rows_lp.art is not None else 0.0
        if self.state.columns is None and self.converged and art > 1e-6:
            # the relaxation over all paths needs the cap slack: no schedule keeps the caps
            self.notes.append(
                "the caps cannot be met: the relaxation over all paths needs the cap slack "
                "(see optimizer.schedule.diagnose)"
            )
            self.result = _no_schedule(self.problem, Status.INFEASIBLE, np.inf, self.label, self.t_all, self.notes)

    def _first_paths(self, warm_start: np.ndarray | None) -> Schedule | None:
        """Unit optima (no coupling): the first paths, a schedule if they keep the caps, and the first bound."""
        model, counting, state, problem = self.model, self.counting, self.state, self.problem
        n_t, n_g = len(problem.types), len(model.grades)
        zero_t, zero_g = np.zeros(n_t), np.zeros(n_g)
        first = list(self.pool.map(lambda u: model.price(u, zero_t, zero_g), model.units))
        if any(col is None for _, col in first):
            return _no_schedule(
                problem,
                Status.INFEASIBLE,
                np.inf,
                "path formulation",
                self.t_all,
                ["a stack has no buildable path (see optimizer.schedule.diagnose)"],
            )
        free_cols = {u: col for u, (_, col) in zip(model.units, first, strict=True)}
        self.scale = max(1.0, sum(col.cost for col in free_cols.values()))
        self.master = Master(model, counting, big_m=10.0 * self.scale + 1e6)
        for col in free_cols.values():
            self.master.add(col)
        if counting.allows(problem, {t for col in free_cols.values() for t in col.types}):
            state.value, state.columns = _schedule_value(model, counting, free_cols), free_cols
        if warm_start is not None:
            cols = {u: model.column_of(u, np.asarray(warm_start)) for u in model.units}
            used = {t for c in cols.values() if c is not None for t in c.types}
            if all(c is not None for c in cols.values()) and counting.allows(problem, used):
                v = _schedule_value(model, counting, cols)  # type: ignore[arg-type]
                for c in cols.values():
                    self.master.add(c)  # type: ignore[arg-type]
                if v < state.value:
                    state.value, state.columns = v, cols  # type: ignore[assignment]
        # every schedule costs at least its units' own optima plus one type and one section
        state.bound = sum(col.cost for col in free_cols.values()) + (
            counting.price_t * counting.types + counting.price_s * counting.sections
        )
        return None

    def _caps(self) -> Schedule | None:
        """Under a cap with no schedule yet: the fewest types and grades each unit needs, then phase one."""
        model, counting = self.model, self.counting
        capped = counting.cap_t is not None or counting.cap_s is not None or counting.cap_g is not None
        if not capped or self.state.columns is not None:
            return None
        need_t, need_g = min_counts(model, self.pool)
        why = []
        u_t = max(need_t, key=need_t.get)
        if counting.cap_t is not None and need_t[u_t] > counting.cap_t:
            why.append(
                f"stack {_unit_name(model, u_t)} cannot be built with fewer than {need_t[u_t]} types "
                f"(cap {counting.cap_t})"
            )
        u_g = max(need_g, key=need_g.get)
        if counting.cap_g is not None and need_g[u_g] > counting.cap_g:
            why.append(
                f"stack {_unit_name(model, u_g)} cannot be built with fewer than {need_g[u_g]} concrete "
                f"grades (cap {counting.cap_g})"
            )
        if why:
            return _no_schedule(
                self.problem, Status.INFEASIBLE, np.inf, "path formulation", self.t_all, self.notes + why
            )
        t1 = time.perf_counter()
        ok = _phase_one(model, self.master, self.pool, self.t_all + 0.3 * self.time_limit_s)
        self.notes.append(
            f"phase one (paths within the caps): {ok} in {time.perf_counter() - t1:.1f} s, "
            f"{len(self.master.columns)} paths"
        )
        self.say(self.notes[-1])
        if ok is False:
            self.notes.append(
                "the caps cannot be met: even a mixture of all buildable paths breaks them "
                "(see optimizer.schedule.diagnose)"
            )
            return _no_schedule(self.problem, Status.INFEASIBLE, np.inf, "path formulation", self.t_all, self.notes)
        return None

    def generate(self, until: float) -> None:  # noqa: PLR0912 - column generation rounds: price, add, stabilise, stop
        """Rounds of column generation until the relaxation meets the bound, nothing prices out, or ``until``."""
        model, master, state, counting = self.model, self.master, self.state, self.counting
        while True:
            self.rounds += 1
            self.lp_value, duals, self.rows_lp, self.x_lp = master.solve_lp(self.threads)
            pen_lp, gpen_lp, alpha = master.penalties(duals, self.rows_lp)
            integral = integral_columns(master, self.rows_lp, self.x_lp)
            if integral is not None:  # the relaxation chose one whole path per unit: a schedule
                v = _schedule_value(model, counting, integral)
                if v < state.value - 1e-9 and counting.allows(
                    self.problem, {t for c in integral.values() for t in c.types}
                ):
                    state.value, state.columns = v, integral
            added = 0
            for mix in (_SMOOTH, 0.0) if self.center is not None else (0.0,):
                if mix > 0.0 and self.center is not None:
                    pen = {u: mix * self.center[0][u] + (1.0 - mix) * pen_lp[u] for u in model.units}
                    gpen = {u: mix * self.center[1][u] + (1.0 - mix) * gpen_lp[u] for u in model.units}
                else:
                    pen, gpen = pen_lp, gpen_lp
                priced = list(self.pool.map(lambda u, pen=pen, gpen=gpen: model.price(u, pen[u], gpen[u]), model.units))
                lagr = sum(val for val, _ in priced) + y_part(model, counting, pen, gpen)
                if lagr > state.bound:
                    state.bound = lagr
                    self.center = (pen, gpen)
                for u, (_, col) in zip(model.units, priced, strict=True):
                    if col is None:
                        continue
                    rc = (
                        col.cost
                        - alpha[u]
                        + sum(pen_lp[u][t] for t in col.types)
                        + sum(gpen_lp[u][g] for g in col.grades)
                    )
                    if rc < -1e-7 * self.scale and master.add(col):
                        added += 1
                if added:
                    break  # otherwise the smoothed duals mispriced: price again at the relaxation's own
            gap_lp = (self.lp_value - state.bound) / max(abs(self.lp_value), 1e-9)
            self.say(
                f"round {self.rounds}: relaxation {self.lp_value:.6g}, bound {state.bound:.6g}, {added} paths "
                f"added, {model.n_rows} rows"
            )
            self.converged = added == 0
            if added == 0 or gap_lp < max(1e-6, self.gap_rel / 20) or time.perf_counter() > until:
                break
            slack = state.value - state.bound
            if np.isfinite(slack) and slack < 0.5 * self.last_slack and self.center is not None:
                prune(model, self.center[0], self.center[1], state, self.pool, self.notes, self.say)
                self.last_slack = slack

    def _after_generation(self) -> list[int]:
        """Prune with the incumbent, then, under a cap with no schedule yet, try type sets of the support.

        Returns:
            The support of the relaxation: the types worth trying to add, most used first.
        """
        model, state, counting = self.model, self.state, self.counting
        # prune rows that cannot be in a schedule better than the incumbent
        if np.isfinite(state.value) and self.center is not None:
            prune(model, self.center[0], self.center[1], state, self.pool, self.notes, self.say)
        support = []
        rows, x = self.rows_lp, self.x_lp
        if rows is not None and rows.y:
            support = sorted(rows.y, key=lambda t: -x[rows.y[t]])
            support = [t for t in support if x[rows.y[t]] > 1e-6][:40]
        # under a cap with no schedule yet: small type sets from the relaxation's support, each unit re-routed
        if state.columns is None and counting.cap_t is not None and support:
            found = _support_sets(model, counting, support, self.pool, self.deadline)
            if found is not None:
                state.value, state.columns = _schedule_value(model, counting, found), found
                for col in found.values():
                    self.master.add(col)
                self.notes.append(f"schedule from a type set of the relaxation's support: {state.value:.6g}")
                self.say(self.notes[-1])
        return support

    def _integer_rounds(self, support: list[int]) -> None:
        """Integer master, then local search, repeated while time remains and the gap is open."""
        model, state, counting, say = self.model, self.state, self.counting, self.say
        for attempt in range(3):
            if attempt > 0 and state.columns is not None and state.gap <= self.gap_rel:
                break
            remaining = self.deadline - time.perf_counter()
            if remaining < 1.0:
                break
            if attempt > 0 and not self.converged:  # more paths (and a better bound) before the next integer master
                self.generate(time.perf_counter() + 0.5 * remaining)
                remaining = self.deadline - time.perf_counter()
                if state.columns is not None and state.gap <= self.gap_rel:
                    break
            cols = integer_master(
                self.master,
                state.columns,
                self.solver,
                min(remaining * 0.5, remaining - 0.5),
                self.gap_rel,
                self.threads,
                self.notes,
            )
            say(self.notes[-1])
            if cols is not None:
                v = _schedule_value(model, counting, cols)
                if v < state.value:
                    state.value, state.columns = v, cols
            if state.columns is None:
                continue
            t_ls = time.perf_counter()
            ls_deadline = min(self.deadline, t_ls + max(5.0, 0.25 * (self.deadline - t_ls)))
            cols = _local_search(model, counting, state.columns, self.pool, ls_deadline, support, self.master)
            say(f"local search {_schedule_value(model, counting, cols):.6g} in {time.perf_counter() - t_ls:.1f} s")
            v = _schedule_value(model, counting, cols)
            if v < state.value - 1e-9:
                state.value, state.columns = v, cols
            elif self.converged:
                break  # nothing left to try: no new paths, no better schedule
            say(f"schedule {state.value:.6g}, bound {state.bound:.6g}, gap {state.gap:.2%}")

    def schedule(self) -> Schedule:
        """The result: the best schedule (objective recomputed from the problem) with the bound and proven gap."""
        if self.result is not None:
            return self.result
        problem, state = self.problem, self.state
        secs = time.perf_counter() - self.t_all
        if state.columns is None:
            return _no_schedule(problem, Status.NO_SCHEDULE, state.bound, self.label, self.t_all, self.notes)
        cand = self.model.assemble(state.columns)
        fig = figures(problem, cand)
        bound = min(state.bound, fig.objective)
        gap = max(0.0, (fig.objective - bound) / max(abs(fig.objective), 1e-9))
        status = status_from(True, False, gap, self.gap_rel, stopped=False)
        notes = list(self.notes)
        if status is Status.TIME_LIMIT and time.perf_counter() < self.deadline - 1.0:
            notes.append(
                "the gap left by the path relaxation was not closed (no branching over paths on a problem "
                "this large); status 'time limit' means the proof stopped, not the clock"
            )
        return Schedule(
            cand=cand,
            status=status,
            objective=fig.objective,
            bound=bound,
            gap=gap,
            solver=self.label,
            seconds=secs,
            notes=tuple(notes) + figure_notes(fig),
        )


def search_paths(
    problem: ScheduleProblem,
    solver: str = "highs",
    time_limit_s: float = 60.0,
    gap_rel: float = 0.01,
    max_types: int | None = None,
    warm_start: np.ndarray | None = None,
    progress: Callable[[str], None] | None = None,
    threads: int | None = None,
) -> PathSearch:
    """Search for a schedule by column generation over stack paths (see the module notes).

    Args:
        problem: the problem (see :func:`optimizer.schedule.pathmodel.applicable` for when this method may be used).
        solver: "highs" or "cbc" for the master problem with binary variables.
        time_limit_s: overall limit, seconds (building the tables included).
        gap_rel: stop once the schedule is proven within this relative gap.
        max_types: cap on distinct types (None: the rules' cap).
        warm_start: a feasible schedule (candidate per cell), added to the master as columns.
        progress: called with a line of text at each stage.
        threads: solver threads (None: the solver's default); pricing uses two threads.

    Returns:
        The finished search: its :meth:`PathSearch.schedule` is the result.

    Raises:
        ValueError: when the path formulation does not apply to the problem.
    """
    search = PathSearch(problem, solver, time_limit_s, gap_rel, max_types, progress, threads)
    search.run(warm_start)
    return search


# --------------------------------------------------------------------------------------------
# pieces of the search
# --------------------------------------------------------------------------------------------


def _phase_one(model: PathModel, master: Master, pool: ThreadPoolExecutor, deadline: float) -> bool | None:
    """Find paths whose mixture keeps the caps (the relaxation without its cap slack); False if none can.

    Column generation on the master with zero costs and the cap slack priced at 1: when no path has a negative
    reduced cost and the slack is still positive, the relaxation over all paths breaks the caps, so no schedule
    keeps them (a proof). Returns True when the slack reached 0, None when time ran out first.
    """
    master.phase_one = True
    try:
        while time.perf_counter() < deadline:
            value, duals, rows, _ = master.solve_lp(None)
            if value <= 1e-9:
                return True
            pen, gpen, alpha = master.penalties(duals, rows)
            priced = list(
                pool.map(lambda u, pen=pen, gpen=gpen: model.price(u, pen[u], gpen[u], weights=False), model.units)
            )
            added = 0
            for u, (val, col) in zip(model.units, priced, strict=True):
                if col is not None and val - alpha[u] < -1e-9 and master.add(col):
                    added += 1
            if added == 0 or _phase_one_bound(model, master.counting, pen, priced) > 1e-9:
                return False
        return None
    finally:
        master.phase_one = False


def _phase_one_bound(model: PathModel, counting: Counting, pen: dict[int, np.ndarray], priced: list) -> float:
    """A lower bound on the cap slack any schedule needs (types capped alone; -inf otherwise).

    Relaxing the linking rows with ``pen``: the paths cost their entry penalties (``priced``); the types are
    then worth ``c_t = sum_u pen_u[t]`` each, the first ``cap`` of them free and every further one at the price
    of one unit of slack. Positive means no schedule keeps the cap.
    """
    if counting.cap_t is None or counting.sections or counting.grades:
        return -np.inf
    c = np.sort(np.sum([pen[u] for u in model.units], axis=0))[::-1]
    k = counting.cap_t
    return float(sum(v for v, _ in priced) - c[:k].sum() - np.maximum(c[k:] - 1.0, 0.0).sum())


def min_counts(model: PathModel, pool: ThreadPoolExecutor) -> tuple[dict[int, int], dict[int, int]]:
    """Fewest distinct types and fewest distinct grades any path of each unit can use (exact, per unit).

    Paths weighted by nothing but an entry cost of 1 per type (or per grade): every type is entered once
    along a path, so the cheapest such path uses the fewest types.
    """
    n_t, n_g = len(model.problem.types), len(model.grades)
    ones_t, zero_t, ones_g, zero_g = np.ones(n_t), np.zeros(n_t), np.ones(n_g), np.zeros(n_g)
    types = list(pool.map(lambda u: model.price(u, ones_t, zero_g, weights=False)[0], model.units))
    grades = list(pool.map(lambda u: model.price(u, zero_t, ones_g, weights=False)[0], model.units))
    return (
        {u: round(v) for u, v in zip(model.units, types, strict=True) if np.isfinite(v)},
        {u: round(v) for u, v in zip(model.units, grades, strict=True) if np.isfinite(v)},
    )


def _support_sets(
    model: PathModel,
    counting: Counting,
    support: list[int],
    pool: ThreadPoolExecutor,
    deadline: float,
    max_sets: int = 200,
) -> dict[int, Column] | None:
    """The best schedule whose types are at most ``cap`` of the relaxation's most used types (every unit re-routed).

    All subsets of the ``cap + 6`` most used types when there are at most ``max_sets`` of them, else the most
    used ``cap`` types alone; a subset with a unit that cannot be built from it is skipped.
    """
    k = int(counting.cap_t)
    top = support[: k + 6]
    sets = (
        list(itertools.combinations(top, min(k, len(top))))
        if math.comb(len(top), min(k, len(top))) <= max_sets
        else [tuple(top[:k])]
    )
    best: tuple[float, dict[int, Column]] | None = None
    for chosen in sets:
        if time.perf_counter() > deadline:
            break
        if not counting.allows(model.problem, set(chosen)):
            continue
        routed = _reroute(model, set(chosen), model.units, pool)
        if routed is None:
            continue
        v = _schedule_value(model, counting, routed)
        if best is None or v < best[0]:
            best = (v, routed)
    return best[1] if best is not None else None


def prune(
    model: PathModel,
    pen: dict[int, np.ndarray],
    gpen: dict[int, np.ndarray],
    state: State,
    pool: ThreadPoolExecutor,
    notes: list[str],
    say: Callable[[str], None],
) -> None:
    """Drop rows whose cheapest penalised path exceeds their unit's best by more than (incumbent - bound).

    Args:
        model: the paths' tables (pruned in place).
        pen: entry cost of every type per unit (from the duals of the best bound).
        gpen: entry cost of every grade per unit.
        state: the incumbent's value and the bound they prove.
        pool: threads for the pricing.
        notes: the run's notes; one is added.
        say: progress.
    """
    before = model.n_rows
    slack = state.value - state.bound
    if slack < -1e-7 * max(1.0, abs(state.value)):
        notes.append(f"pruning skipped: bound {state.bound:.6g} above the incumbent {state.value:.6g}")
        return
    thr = list(pool.map(lambda u: model.through(u, pen[u], gpen[u]), model.units))
    for u, (best, parts) in zip(model.units, thr, strict=True):
        keep = [x <= best + slack + 1e-7 * max(1.0, abs(state.value)) for x in parts]
        model.prune(u, keep)
    notes.append(f"pruned {before - model.n_rows} of {before} candidate rows (reduced cost above the gap {slack:.6g})")
    say(notes[-1])
