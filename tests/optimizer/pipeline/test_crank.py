"""Cranked bars at size steps: 1 in 12 or flatter (EN 1992-1-1, 9.5.3(5)).

Where the longitudinal bars change direction at a change of column size, the links must take the
lateral force unless the slope is 1 in 12 or flatter. A step of d per face needs a crank of 12 d
below the floor; the run warns where that does not fit in the clear height of the storey below.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np

from optimizer.pipeline.run import crank_warnings
from optimizer.schedule.problem import Rules, TypeTable


def _types(sizes):
    n = len(sizes)
    return TypeTable(
        mark=tuple(f"T{i}" for i in range(n)),
        circ=np.zeros(n, dtype=bool),
        b=np.array(sizes, float),
        h=np.array(sizes, float),
        nb=np.full(n, 2),
        nh=np.full(n, 2),
        dia=np.full(n, 20.0),
        corner_dia=np.full(n, 20.0),
        fck=np.full(n, 40.0),
        section=np.arange(n),
    )


def _case(lower, upper, clear_mm, max_step=300.0):
    problem = SimpleNamespace(types=_types([lower, upper]), above=np.array([1, -1]), rules=Rules(max_step_mm=max_step))
    fe = SimpleNamespace(
        cand_type=np.array([0, 1]),
        cells=SimpleNamespace(l_clear=np.array([clear_mm, clear_mm]), cells=(("A1", "L01"), ("A1", "L02"))),
    )
    return crank_warnings(problem, fe, np.array([0, 1]))


def test_a_75_mm_step_cranks_within_a_storey():
    # 600 -> 450: 75 mm per face, crank 12 x 75 = 900 mm < 3,200 mm clear height: no warning
    assert _case(600.0, 450.0, 3200.0) == []


def test_a_step_whose_crank_does_not_fit_is_named():
    # 900 -> 300: 300 mm per face, crank 3,600 mm > 3,200 mm clear height
    w = _case(900.0, 300.0, 3200.0)
    assert len(w) == 1 and "A1 above L01" in w[0] and "3,600 mm" in w[0] and "9.5.3(5)" in w[0]


def test_no_step_no_crank():
    assert _case(500.0, 500.0, 3000.0) == []
