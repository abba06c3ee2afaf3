"""Solver back-ends: a :class:`~optimizer.schedule.builder.Formulation` handed to HiGHS or CBC.

* :func:`solve_highspy` - the rows passed to highspy in bulk as arrays (:func:`build_highs`), used by
  default for HiGHS on large models because PuLP's construction (one Python object per variable,
  term and row) dominates there;
* :func:`solve_pulp` - a ``pulp.LpProblem`` (:func:`pulp_model`) solved by HiGHS through PuLP's
  highspy interface, or by CBC through PuLP.

Both return an :class:`Outcome`: status, column values, objective, best bound, time and notes. The
time limit and relative gap are explicit; the status follows :func:`status_from`.
"""

from __future__ import annotations

import os
import re
import sys
import tempfile
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Literal

import highspy
import numpy as np
import pulp

from optimizer.schedule.builder import Formulation
from optimizer.schedule.problem import Objective, ScheduleProblem, Status

__all__ = [
    "SolverName",
    "Backend",
    "Outcome",
    "status_from",
    "ModelVariables",
    "pulp_model",
    "new_highs",
    "build_highs",
    "solve_highspy",
    "solve_pulp",
]

SolverName = Literal["highs", "cbc"]
Backend = Literal["auto", "pulp", "highspy"]


@dataclass
class Outcome:
    """What a back-end returns.

    Attributes:
        status: the solve's status.
        xval: column values of the best solution (None without one).
        objective: its objective (inf without one).
        bound: the best proven bound (-inf when none).
        seconds: solver time.
        notes: the solver's account, in words.
    """

    status: Status
    xval: np.ndarray | None
    objective: float
    bound: float
    seconds: float
    notes: list[str] = field(default_factory=list)


def status_from(has_solution: bool, infeasible: bool, gap: float, gap_rel: float, stopped: bool) -> Status:
    """The status of a solve: optimal at a gap of 1e-6, within gap only when not stopped by the clock."""
    if infeasible:
        return Status.INFEASIBLE
    if not has_solution:
        return Status.NO_SCHEDULE
    if gap <= 1e-6:
        return Status.OPTIMAL
    if not stopped and gap <= gap_rel + 1e-9:
        return Status.WITHIN_GAP
    return Status.TIME_LIMIT


# --------------------------------------------------------------------------------------------
# PuLP
# --------------------------------------------------------------------------------------------


@dataclass
class ModelVariables:
    """The PuLP variables of a model, by what they mean.

    Attributes:
        columns: every variable, in formulation column order.
        x: variable of each kept candidate (candidate index -> variable).
        y: variable of each counted type (type index -> variable).
        formulation: the formulation the model was built from.
    """

    columns: list[pulp.LpVariable]
    x: dict[int, pulp.LpVariable]
    y: dict[int, pulp.LpVariable]
    formulation: Formulation


def pulp_model(form: Formulation, problem: ScheduleProblem) -> tuple[pulp.LpProblem, ModelVariables]:
    """The formulation as a PuLP problem (named after the problem's objective) and its variables."""
    prob = pulp.LpProblem(f"column_schedule_{Objective(problem.objective).value}", pulp.LpMinimize)
    cols = [
        pulp.LpVariable(
            name,
            lowBound=float(lb),
            upBound=None if ub == np.inf else float(ub),
            cat=pulp.LpBinary
            if (integer and lb == 0 and ub == 1)
            else (pulp.LpInteger if integer else pulp.LpContinuous),
        )
        for name, lb, ub, integer in zip(form.col_name, form.col_lb, form.col_ub, form.col_int, strict=True)
    ]
    nz = np.flatnonzero(form.col_cost)
    prob += pulp.LpAffineExpression([(cols[j], float(form.col_cost[j])) for j in nz]), "objective"
    for i, name in enumerate(form.row_name):
        a, b = form.row_start[i], form.row_start[i + 1]
        expr = pulp.LpAffineExpression(
            [(cols[j], float(v)) for j, v in zip(form.row_idx[a:b], form.row_val[a:b], strict=True)]
        )
        lo, hi = form.row_lo[i], form.row_hi[i]
        if lo == hi:
            prob += (expr == float(lo), name)
        else:
            if lo > -np.inf:
                prob += (expr >= float(lo), name if hi == np.inf else f"{name}_lo")
            if hi < np.inf:
                prob += (expr <= float(hi), name if lo == -np.inf else f"{name}_hi")
    x = {int(k): cols[int(j)] for k, j in enumerate(form.x_col) if j >= 0}
    y = {int(t): cols[int(j)] for t, j in enumerate(form.y_col) if j >= 0}
    return prob, ModelVariables(cols, x, y, form)


# --------------------------------------------------------------------------------------------
# highspy
# --------------------------------------------------------------------------------------------


_HIGHS_GREETED = False


def new_highs():
    """A silent ``highspy.Highs`` object.

    HiGHS prints a banner on stdout when the first object of a process is made, before any option can be set;
    that first construction happens here with stdout (the file descriptor) sent to /dev/null.
    """
    global _HIGHS_GREETED
    if not _HIGHS_GREETED:
        sys.stdout.flush()
        saved = os.dup(1)
        devnull = os.open(os.devnull, os.O_WRONLY)
        try:
            os.dup2(devnull, 1)
            highspy.Highs()
        finally:
            os.dup2(saved, 1)
            os.close(saved)
            os.close(devnull)
        _HIGHS_GREETED = True
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    return h


def build_highs(form: Formulation, threads: int | None = None):
    """The same formulation passed to highspy in bulk (columns, then rows in compressed sparse form).

    Args:
        form: the formulation.
        threads: HiGHS threads (None: its default).

    Returns:
        A ``highspy.Highs`` object holding the model.
    """
    h = new_highs()
    if threads is not None:
        h.setOptionValue("threads", threads)
    inf = highspy.kHighsInf
    lb = np.where(np.isinf(form.col_lb), -inf, form.col_lb)
    ub = np.where(np.isinf(form.col_ub), inf, form.col_ub)
    h.addVars(form.n_cols, lb, ub)
    h.changeColsCost(form.n_cols, np.arange(form.n_cols, dtype=np.int32), form.col_cost)
    ints = np.flatnonzero(form.col_int).astype(np.int32)
    if len(ints):
        h.changeColsIntegrality(len(ints), ints, np.full(len(ints), highspy.HighsVarType.kInteger))
    lo = np.where(np.isinf(form.row_lo), -inf, form.row_lo)
    hi = np.where(np.isinf(form.row_hi), inf, form.row_hi)
    h.addRows(
        form.n_rows,
        lo,
        hi,
        len(form.row_idx),
        form.row_start[:-1].astype(np.int32),
        form.row_idx.astype(np.int32),
        form.row_val,
    )
    return h


# --------------------------------------------------------------------------------------------
# solving
# --------------------------------------------------------------------------------------------


class _HiGHSWarm(pulp.HiGHS):
    """PuLP's HiGHS interface, with the variables' initial values handed to HiGHS as a start."""

    def callSolver(self, lp: pulp.LpProblem) -> None:
        h = lp.solverModel
        values = [v.varValue if v.varValue is not None else 0.0 for v in lp.variables()]
        if any(v.varValue is not None for v in lp.variables()):
            sol = highspy.HighsSolution()
            sol.col_value = values
            sol.value_valid = True
            h.setSolution(sol)
        h.run()


def solve_highspy(
    form: Formulation, start: np.ndarray | None, time_limit_s: float, gap_rel: float, threads: int | None
) -> Outcome:
    """Solve a formulation with HiGHS through highspy.

    Args:
        form: the formulation.
        start: column values of a feasible solution handed to HiGHS (None: no start).
        time_limit_s: HiGHS's time limit, seconds.
        gap_rel: relative gap at which HiGHS stops.
        threads: HiGHS threads (None: its default).
    """
    h = build_highs(form, threads)
    h.setOptionValue("time_limit", float(time_limit_s))
    h.setOptionValue("mip_rel_gap", float(gap_rel))
    if start is not None:
        sol = highspy.HighsSolution()
        sol.col_value = list(start)
        sol.value_valid = True
        h.setSolution(sol)
    t0 = time.perf_counter()
    h.run()
    secs = time.perf_counter() - t0
    ms = h.getModelStatus()
    info = h.getInfo()
    has = info.primal_solution_status == 2  # kSolutionStatusFeasible
    infeasible = ms == highspy.HighsModelStatus.kInfeasible
    xval = np.array(h.getSolution().col_value) if has else None
    # the objective of the returned columns (HiGHS's reported value was seen to differ after a start was set)
    obj = float(form.col_cost @ xval) + form.offset if xval is not None else np.inf
    bound = min(float(info.mip_dual_bound), obj)
    stopped = ms in (highspy.HighsModelStatus.kTimeLimit, highspy.HighsModelStatus.kInterrupt)
    gap = abs(obj - bound) / max(abs(obj), 1e-9) if has else np.inf
    return Outcome(
        status_from(has, infeasible, gap, gap_rel, stopped),
        xval,
        obj,
        bound,
        secs,
        [f"HiGHS status: {h.modelStatusToString(ms)}", f"branch-and-bound nodes: {info.mip_node_count}"],
    )


def solve_pulp(
    problem: ScheduleProblem,
    form: Formulation,
    start: np.ndarray | None,
    solver: SolverName,
    time_limit_s: float,
    gap_rel: float,
    threads: int | None,
) -> Outcome:
    """Solve a formulation through PuLP, with HiGHS or CBC.

    Args:
        problem: the problem the formulation was written for (names the PuLP model).
        form: the formulation.
        start: column values of a feasible solution handed to the solver as a warm start (None: no start).
        solver: "highs" or "cbc".
        time_limit_s: the solver's time limit, seconds.
        gap_rel: relative gap at which the solver stops.
        threads: solver threads (None: its default).
    """
    prob, mv = pulp_model(form, problem)
    if start is not None:
        for var, v in zip(mv.columns, start, strict=True):
            var.setInitialValue(float(v))
    t0 = time.perf_counter()
    if solver == "highs":
        new_highs()  # the banner of the first HiGHS object goes to /dev/null
        cmd = _HiGHSWarm(msg=False, timeLimit=time_limit_s, gapRel=gap_rel, threads=threads)
        prob.solve(cmd)
        secs = time.perf_counter() - t0
        h = prob.solverModel
        ms = h.getModelStatus()
        info = h.getInfo()
        has = info.primal_solution_status == 2
        infeasible = ms == highspy.HighsModelStatus.kInfeasible
        bound = float(info.mip_dual_bound)
        stopped = ms == highspy.HighsModelStatus.kTimeLimit
        notes = [f"HiGHS status: {h.modelStatusToString(ms)}", f"branch-and-bound nodes: {info.mip_node_count}"]
    else:
        with tempfile.TemporaryDirectory() as tmp:
            log = Path(tmp) / "cbc.log"
            cmd = pulp.PULP_CBC_CMD(
                msg=False,
                timeLimit=time_limit_s,
                gapRel=gap_rel,
                warmStart=start is not None,
                threads=threads,
                logPath=str(log),
            )
            prob.solve(cmd)
            secs = time.perf_counter() - t0
            text = log.read_text() if log.exists() else ""
        has = pulp.LpStatus[prob.status] in ("Optimal",) or prob.sol_status in (
            pulp.LpSolutionOptimal,
            pulp.LpSolutionIntegerFeasible,
        )
        has = has and all(v.varValue is not None for v in mv.x.values())
        infeasible = pulp.LpStatus[prob.status] == "Infeasible"
        bound = _cbc_bound(text)
        stopped = "Stopped on time" in text or "stopped on time" in text.lower()
        notes = [f"CBC: {pulp.LpStatus[prob.status]}"]
    xval = np.array([v.varValue if v.varValue is not None else 0.0 for v in mv.columns]) if has else None
    obj = float(pulp.value(prob.objective)) if has else np.inf
    if not np.isfinite(bound):
        bound = obj if (has and not stopped and solver == "cbc") else -np.inf
    gap = abs(obj - bound) / max(abs(obj), 1e-9) if has and np.isfinite(bound) else np.inf
    return Outcome(status_from(has, infeasible, gap, gap_rel, stopped), xval, obj, bound, secs, notes)


def _cbc_bound(log: str) -> float:
    """Best possible objective from a CBC log (NaN-free), or -inf when absent."""
    for pat in (r"Lower bound:\s*([-\d.eE+]+)", r"best possible\s*([-\d.eE+]+)", r"Best possible\s*([-\d.eE+]+)"):
        found = re.findall(pat, log)
        if found:
            try:
                return float(found[-1])
            except ValueError:
                continue
    if re.search(r"Result - Optimal solution found", log):
        m = re.findall(r"Objective value:\s*([-\d.eE+]+)", log)
        if m:
            return float(m[-1])
    return -np.inf
