"""An integer program as named columns and rows: the one form every model is written in and every back-end reads.

Both formulations (the compact model of :mod:`optimizer.schedule.compact` and the path master of
:mod:`optimizer.schedule.master`) add their columns and rows to a :class:`ModelBuilder`, which
gives a :class:`Formulation`: columns with bounds, integrality, costs and what they mean, rows in
compressed sparse row form with readable names. :mod:`optimizer.schedule.backends` hands a
formulation to HiGHS or CBC.

Before formulating, :func:`reduce_problem` removes what provably cannot change
the optimum (see ``docs/integer_program.md``): identical stacks are merged (one copy, weights
multiplied), candidates that lie on no buildable path of their stack are
dropped, and, given an incumbent, candidates whose cheapest path through the
stack already exceeds the incumbent's value by more than the slack. The
:class:`Reduction` it gives is what a formulation is built on.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from optimizer.schedule.heuristic import figures
from optimizer.schedule.prepared import Level, Prepared, stack_signature, transition
from optimizer.schedule.problem import ScheduleProblem

__all__ = ["Reduction", "reduce_problem", "Formulation", "ModelBuilder"]


@dataclass(frozen=True)
class Reduction:
    """What :func:`reduce_problem` kept.

    Attributes:
        keep: boolean mask over candidates kept in the model (only representative cells keep any).
        rep: representative cell of every cell (itself unless its stack was merged into an identical one).
        mult: number of identical cells each representative stands for (0 for merged-away cells).
        notes: what was reduced, in words.
        lower_bound: a valid lower bound on the optimum of the full problem (sum over stacks of their cheapest
            path ignoring the minimum run, plus the least price of types and sections), -inf when not computed.
    """

    keep: np.ndarray
    rep: np.ndarray
    mult: np.ndarray
    notes: tuple[str, ...] = ()
    lower_bound: float = -np.inf

    @classmethod
    def none(cls, n_cand: int, n_cells: int) -> Reduction:
        """No reduction: every candidate kept, every cell its own representative."""
        return cls(np.ones(n_cand, dtype=bool), np.arange(n_cells), np.ones(n_cells, dtype=int))


def reduce_problem(  # noqa: PLR0912, PLR0915 - one branch per safe reduction
    problem: ScheduleProblem,
    incumbent: np.ndarray | None = None,
    merge_stacks: bool = True,
    prune_paths: bool = True,
    type_pool: np.ndarray | None = None,
) -> Reduction:
    """Safe reductions: merge identical stacks, drop candidates that cannot be in an optimal schedule.

    Args:
        problem: the problem.
        incumbent: a feasible schedule (candidate per cell) whose value bounds the optimum from above.
        merge_stacks: merge stacks with identical candidates, weights and storey heights (not grouped, not pinned).
        prune_paths: drop candidates on no buildable path of their stack, and (with an incumbent) those whose
            cheapest path is too dear.
        type_pool: boolean mask of types the model may use (the decomposition's type pool); this one is not safe:
            the optimum over the pool may be worse than the full optimum.

    Returns:
        The reduction; solving the reduced model and expanding gives an optimum of the full problem.
    """
    p = problem
    prep = Prepared(p)
    n = p.n_cells
    rep = np.arange(n)
    mult = np.ones(n, dtype=int)
    notes: list[str] = []
    grouped = {g for grp in p.rules.groups for g in grp}
    if merge_stacks:
        seen: dict[bytes, int] = {}
        merged = 0
        for s in range(len(p.stack_names)):
            if p.stack_names[s] in grouped:
                continue
            sig = stack_signature(prep, s)
            if sig is None:
                continue
            if sig in seen:
                r = seen[sig]
                rep[prep.chains[s]] = prep.chains[r]
                mult[prep.chains[r]] += 1
                mult[prep.chains[s]] = 0
                merged += 1
            else:
                seen[sig] = s
        if merged:
            notes.append(f"{merged} stacks merged into identical ones")
    keep = np.zeros(len(p.cand_cell), dtype=bool)
    for c in range(n):
        if mult[c] > 0:
            keep[prep.cell_cands(c)] = True
    if type_pool is not None:
        for unit in prep.units:
            for o, levels in unit.orients.items():
                unit.orients[o] = [
                    Level(
                        lv.types[type_pool[lv.types]],
                        lv.cands[type_pool[lv.types]],
                        lv.weight[type_pool[lv.types]],
                        lv.starter[type_pool[lv.types]],
                    )
                    for lv in levels
                ]
    if not prune_paths or prep.problems:
        if type_pool is not None:
            keep &= type_pool[p.cand_type]
            notes.append(f"type pool of {int(type_pool.sum())} types (decomposition: not a safe reduction)")
        return Reduction(keep, rep, mult, tuple(notes))
    # per unit and orientation: forward / backward cheapest paths ignoring the minimum run (a relaxation)
    through = np.full(len(p.cand_cell), np.inf)  # cheapest path of the unit through the candidate, x multiplicity
    unit_lb = np.zeros(n)  # cheapest path of the unit of each cell, x multiplicity
    lb_total = 0.0
    n_before = int(keep.sum())
    for unit in prep.units:
        m = int(mult[unit.cells[0, 0]])
        if m == 0:
            continue
        best = np.inf
        for levels in unit.orients.values():
            fw = [lv.weight.copy() for lv in levels]
            oks = []
            for i in range(1, len(levels)):
                ok, big = transition(p, levels[i - 1].types, levels[i].types)
                oks.append((ok, big))
                extra = np.where(big, levels[i].starter[None, :], 0.0)
                mat = np.where(ok, fw[i - 1][:, None] + extra, np.inf)
                fw[i] = levels[i].weight + (mat.min(axis=0) if len(fw[i - 1]) else np.inf)
            bw = [lv.weight.copy() for lv in levels]
            for i in range(len(levels) - 2, -1, -1):
                ok, big = oks[i]
                extra = np.where(big, levels[i + 1].starter[None, :], 0.0)
                mat = np.where(ok, bw[i + 1][None, :] + extra, np.inf)
                bw[i] = levels[i].weight + (mat.min(axis=1) if len(bw[i + 1]) else np.inf)
            for i, lv in enumerate(levels):
                val = (fw[i] + bw[i] - lv.weight) * m
                if len(val):
                    through[lv.cands] = np.minimum(through[lv.cands], val[:, None])
                    best = min(best, float(val.min()))
        unit_lb[unit.cells.ravel()] = best
        lb_total += best
    r = p.rules
    price_lb = (r.price_per_type + r.price_per_section) if n > 0 else 0.0
    slack = np.inf
    if incumbent is not None:
        slack = figures(p, incumbent).objective - lb_total - price_lb
    with np.errstate(invalid="ignore"):
        excess = through - unit_lb[p.cand_cell]
    keep &= np.isfinite(through) & ~(excess > slack + 1e-7 * max(1.0, abs(lb_total)))
    if type_pool is not None:
        keep &= type_pool[p.cand_type]
        notes.append(f"type pool of {int(type_pool.sum())} types (decomposition: not a safe reduction)")
    notes.append(
        f"{n_before - int(keep.sum())} of {n_before} candidates pruned (no buildable path"
        + (f", or dearer than the incumbent by more than the slack {slack:.6g})" if incumbent is not None else ")")
    )
    valid = type_pool is None  # over a pool, the paths bound only the pool's optimum
    return Reduction(keep, rep, mult, tuple(notes), lower_bound=lb_total + price_lb if valid else -np.inf)


@dataclass
class Formulation:
    """The model as named columns and rows (the one formulation both back-ends use).

    Attributes:
        col_name, col_lb, col_ub, col_int, col_cost: columns.
        col_meta: what each column means (kind and indices), for warm starts and reading results.
        row_start, row_idx, row_val: rows in compressed sparse row form.
        row_lo, row_hi, row_name: row bounds and names.
        x_col: column of each kept candidate (-1 when not kept).
        y_col: column of each counted type (-1 when not counted).
        reduction: the reduction the model was built on.
        offset: constant added to the objective.
    """

    col_name: list[str]
    col_lb: np.ndarray
    col_ub: np.ndarray
    col_int: np.ndarray
    col_cost: np.ndarray
    col_meta: list[tuple]
    row_start: np.ndarray
    row_idx: np.ndarray
    row_val: np.ndarray
    row_lo: np.ndarray
    row_hi: np.ndarray
    row_name: list[str]
    x_col: np.ndarray
    y_col: np.ndarray
    reduction: Reduction
    offset: float = 0.0

    @property
    def n_cols(self) -> int:
        """Number of columns."""
        return len(self.col_name)

    @property
    def n_rows(self) -> int:
        """Number of rows."""
        return len(self.row_name)

    @property
    def n_binaries(self) -> int:
        """Number of binary columns."""
        return int(self.col_int.sum())

    @property
    def n_nonzeros(self) -> int:
        """Number of matrix entries."""
        return len(self.row_idx)


class ModelBuilder:
    """Collects the columns and rows of a formulation, in the order they are added."""

    def __init__(self) -> None:
        self.name: list[str] = []
        self.lb: list[float] = []
        self.ub: list[float] = []
        self.integer: list[bool] = []
        self.cost: list[float] = []
        self.meta: list[tuple] = []
        self.r_idx: list[np.ndarray] = []
        self.r_val: list[np.ndarray] = []
        self.r_len: list[int] = []
        self.r_lo: list[float] = []
        self.r_hi: list[float] = []
        self.r_name: list[str] = []

    def col(
        self, name: str, meta: tuple, lb: float = 0.0, ub: float = 1.0, integer: bool = True, cost: float = 0.0
    ) -> int:
        """Add a column.

        Args:
            name: readable name.
            meta: what the column means (kind and indices, e.g. ``("x", candidate)``), for starts and results.
            lb: lower bound.
            ub: upper bound (inf for none).
            integer: integer (binary with the default bounds) or continuous.
            cost: objective coefficient.

        Returns:
            The column's index.
        """
        self.name.append(name)
        self.lb.append(lb)
        self.ub.append(ub)
        self.integer.append(integer)
        self.cost.append(cost)
        self.meta.append(meta)
        return len(self.name) - 1

    def row(self, name: str, idx: list[int] | np.ndarray, val: list[float] | np.ndarray, lo: float, hi: float) -> None:
        """Add the row ``lo <= sum val[i] x[idx[i]] <= hi`` (left out when empty and trivially kept).

        Args:
            name: readable name.
            idx: column indices.
            val: coefficients.
            lo: lower bound (-inf for none).
            hi: upper bound (inf for none).
        """
        idx = np.asarray(idx, dtype=np.int64)
        val = np.asarray(val, dtype=float)
        if len(idx) == 0 and lo <= 0.0 <= hi:
            return
        self.r_idx.append(idx)
        self.r_val.append(val)
        self.r_len.append(len(idx))
        self.r_lo.append(lo)
        self.r_hi.append(hi)
        self.r_name.append(name)

    @property
    def n_rows(self) -> int:
        """Rows added so far (the index the next row will take)."""
        return len(self.r_name)

    def finish(self, x_col: np.ndarray, y_col: np.ndarray, reduction: Reduction) -> Formulation:
        """The formulation of the columns and rows added.

        Args:
            x_col: column of each kept candidate (-1 when not kept).
            y_col: column of each counted type (-1 when not counted).
            reduction: the reduction the model was built on.
        """
        starts = np.zeros(len(self.r_len) + 1, dtype=np.int64)
        np.cumsum(self.r_len, out=starts[1:])
        return Formulation(
            col_name=self.name,
            col_lb=np.array(self.lb),
            col_ub=np.array(self.ub),
            col_int=np.array(self.integer, dtype=bool),
            col_cost=np.array(self.cost),
            col_meta=self.meta,
            row_start=starts,
            row_idx=np.concatenate(self.r_idx) if self.r_idx else np.zeros(0, dtype=np.int64),
            row_val=np.concatenate(self.r_val) if self.r_val else np.zeros(0),
            row_lo=np.array(self.r_lo),
            row_hi=np.array(self.r_hi),
            row_name=self.r_name,
            x_col=x_col,
            y_col=y_col,
            reduction=reduction,
        )
