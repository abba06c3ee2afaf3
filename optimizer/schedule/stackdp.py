"""Compiled dynamic programs over the layered graph of one stack (the inner loop of column generation).

A *chain* is one scheduling unit (a stack, or a group of stacks sharing types)
in one orientation: its candidate rows listed storey by storey, bottom to top
(``off[i]:off[i + 1]`` are the rows of storey ``i``), each row with a type, an
objective weight and the extra weight of starter bars when the step below it
is large. The continuity rules between two storeys are precomputed once per
problem as a type-by-type table (``ok_up[upper, lower]``), so the inner loop is
a table look-up per pair of rows.

The forward program carries, for every row, the cheapest way to reach it from
the bottom of the stack in each *run state* (storeys the current section has
held, capped at the minimum run ``m``). Entering a type (coming from a
different type below, or at the bottom) costs ``pen[type]``; entering a
concrete grade costs ``gpen[grade]``. With every monotone rule on, a path
leaves a type (or a grade) at most once, so charging on entry charges each
used type exactly once: the penalised path cost is the reduced cost of the
path in the path master problem (see ``docs/integer_program.md``).

The backward program (no run states: a relaxation) gives, with the forward
one, the cheapest path through every row, for pruning.

Compiled with numba; the numpy reference :func:`optimizer.schedule.stackpaths.levels_dp`
is held equal to it by the tests.
"""

from __future__ import annotations

import numpy as np
from numba import njit

__all__ = ["forward", "backward", "trace"]


@njit(cache=True, nogil=True)
def forward(off, typ, w, st, ok_up, big_up, sec, gid, pen, gpen, m):  # noqa: PLR0912, PLR0915 - compiled kernel: the DP's states written out for numba
    """Cheapest penalised cost of reaching every (row, run state) from the bottom.

    Args:
        off: (n_levels + 1,) row offsets per storey, bottom to top.
        typ: (n_rows,) type of each row.
        w: (n_rows,) objective weight of each row.
        st: (n_rows,) extra weight (starter bars) when the step below the row is large.
        ok_up: (n_types, n_types) bool, ``ok_up[upper, lower]``: the pair keeps every continuity rule.
        big_up: (n_types, n_types) bool, ``big_up[upper, lower]``: allowed only with starter bars.
        sec: (n_types,) section id of each type.
        gid: (n_types,) grade id of each type.
        pen: (n_types,) cost of entering a type.
        gpen: (n_grades,) cost of entering a grade.
        m: minimum run in storeys (1: no run states).

    Returns:
        ``f`` (n_rows, m) costs, ``back`` (n_rows, m) predecessor row, ``back_state`` (n_rows, m) its state.
    """
    n = typ.shape[0]
    n_lv = off.shape[0] - 1
    f = np.full((n, m), np.inf)
    back = np.full((n, m), -1, dtype=np.int64)
    back_state = np.full((n, m), -1, dtype=np.int64)
    for j in range(off[0], off[1]):
        tj = typ[j]
        f[j, 0] = w[j] + pen[tj] + gpen[gid[tj]]
    best = np.empty(m)
    bk = np.empty(m, dtype=np.int64)
    bs = np.empty(m, dtype=np.int64)
    for i in range(1, n_lv):
        for j in range(off[i], off[i + 1]):
            tj = typ[j]
            row = ok_up[tj]
            brow = big_up[tj]
            pj = pen[tj]
            gj = gid[tj]
            sj = sec[tj]
            for r in range(m):
                best[r] = np.inf
                bk[r] = -1
                bs[r] = -1
            for k in range(off[i - 1], off[i]):
                tk = typ[k]
                if not row[tk]:
                    continue
                if tk == tj:
                    for r in range(m):
                        v = f[k, r]
                        rn = r + 1 if r + 1 < m else m - 1
                        if v < best[rn]:
                            best[rn] = v
                            bk[rn] = k
                            bs[rn] = r
                    continue
                add = pj
                if gid[tk] != gj:
                    add += gpen[gj]
                if sec[tk] == sj:
                    for r in range(m):
                        v = f[k, r] + add
                        rn = r + 1 if r + 1 < m else m - 1
                        if v < best[rn]:
                            best[rn] = v
                            bk[rn] = k
                            bs[rn] = r
                else:
                    v = f[k, m - 1] + add
                    if brow[tk]:
                        v += st[j]
                    if v < best[0]:
                        best[0] = v
                        bk[0] = k
                        bs[0] = m - 1
            for r in range(m):
                f[j, r] = best[r] + w[j]
                back[j, r] = bk[r]
                back_state[j, r] = bs[r]
    return f, back, back_state


@njit(cache=True, nogil=True)
def backward(off, typ, w, st, ok_lo, big_lo, gid, pen, gpen):
    """Cheapest penalised cost from every row to the top of the stack, ignoring the minimum run.

    Args:
        off: (n_levels + 1,) row offsets per storey, bottom to top.
        typ: (n_rows,) type of each row.
        w: (n_rows,) objective weight of each row.
        st: (n_rows,) extra weight (starter bars) when the step below the row is large.
        ok_lo: (n_types, n_types) bool, ``ok_lo[lower, upper]`` (the transpose of ``ok_up``).
        big_lo: (n_types, n_types) bool, ``big_lo[lower, upper]``.
        gid: (n_types,) grade id of each type.
        pen: (n_types,) cost of entering a type.
        gpen: (n_grades,) cost of entering a grade.

    Returns:
        (n_rows,) costs including the row's own weight (its entry cost is not included).
    """
    n = typ.shape[0]
    n_lv = off.shape[0] - 1
    b = np.full(n, np.inf)
    for k in range(off[n_lv - 1], off[n_lv]):
        b[k] = w[k]
    for i in range(n_lv - 2, -1, -1):
        for k in range(off[i], off[i + 1]):
            tk = typ[k]
            row = ok_lo[tk]
            brow = big_lo[tk]
            gk = gid[tk]
            best = np.inf
            for j in range(off[i + 1], off[i + 2]):
                tj = typ[j]
                if not row[tj]:
                    continue
                v = b[j]
                if tj != tk:
                    v += pen[tj]
                    if gid[tj] != gk:
                        v += gpen[gid[tj]]
                    if brow[tj]:
                        v += st[j]
                if v < best:
                    best = v
            b[k] = best + w[k]
    return b


def trace(off: np.ndarray, f: np.ndarray, back: np.ndarray, back_state: np.ndarray) -> tuple[float, np.ndarray | None]:
    """The cheapest complete path of a forward pass: its cost and its row per storey (None when there is none)."""
    top = f[off[-2] : off[-1]]
    if top.size == 0 or not np.isfinite(top).any():
        return np.inf, None
    j, r = np.unravel_index(int(np.argmin(top)), top.shape)
    cost = float(top[j, r])
    rows = np.empty(len(off) - 1, dtype=np.int64)
    k, s = int(off[-2] + j), int(r)
    for i in range(len(off) - 2, -1, -1):
        rows[i] = k
        k, s = int(back[k, s]), int(back_state[k, s])
    return cost, rows
