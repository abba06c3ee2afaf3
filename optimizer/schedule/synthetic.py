"""Synthetic scheduling problems for tests and benchmarks.

The generator invents a plausible building and catalogue without any
engineering library: the axial load grows down each stack, the catalogue holds
square (and optionally rectangular and circular) types whose crude capacity
grows with section, bars and grade, and a type is a candidate in a cell when
its crude capacity exceeds the cell's demand. Steel is the bar area times the
storey height times 7,850 kg/m3 (plus a lap and link allowance); cost and
carbon come from steel, concrete and formwork with invented rates.

Nothing here is a design: it only makes instances with the shape of real ones
(nested candidate sets, monotone capacities, symmetric stacks with identical
demands) for the integer program, its heuristics and its checker.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from optimizer.schedule.problem import Objective, Rules, ScheduleProblem, TypeTable

__all__ = ["SyntheticSpec", "synthetic_catalogue", "synthetic_problem", "tower"]

STEEL_DENSITY_KG_M3 = 7850.0
FYK_MPA = 500.0


@dataclass(frozen=True)
class SyntheticSpec:
    """Size and character of a synthetic building.

    Attributes:
        n_stacks: number of column stacks.
        n_levels: storeys of the tallest stack.
        n_types: target size of the catalogue (the generator keeps at most this many).
        seed: random seed; the same spec always gives the same problem.
        rectangles: include rectangular sections (orientation matters for them).
        circles: include circular sections.
        free_fraction: share of stacks whose orientation is left to the optimiser.
        symmetry: stacks come in symmetric families (1, 2 or 4 stacks) with identical demands.
        short_fraction: share of stacks that stop some storeys below the roof.
        storey_height_mm: storey height (the lowest storey is 30 % taller).
        grades: concrete strengths in the catalogue, MPa.
        dias: main bar diameters in the catalogue, mm.
        counts: bars per face in the catalogue.
        sizes_mm: section sizes (square side, or the short side of rectangles), mm.
        load_kn_per_level: mean design axial load added per storey at an interior stack, kN.
        steel_ratio: range of As / Ac kept in the catalogue (default: 0.002 to 0.04, EN 1992-1-1, 9.5.2 (2)
            and (3), crude); a narrow high range such as (0.02, 0.04) makes heavily reinforced catalogues, in
            which the maximum steel at laps between storeys of different sections binds.
    """

    n_stacks: int = 3
    n_levels: int = 4
    n_types: int = 8
    seed: int = 0
    rectangles: bool = False
    circles: bool = False
    free_fraction: float = 0.0
    symmetry: bool = False
    short_fraction: float = 0.0
    storey_height_mm: float = 3200.0
    grades: tuple[float, ...] = (30.0, 40.0, 50.0)
    dias: tuple[float, ...] = (16.0, 20.0, 25.0, 32.0, 40.0)
    counts: tuple[int, ...] = (2, 3, 4, 5, 6)
    sizes_mm: tuple[float, ...] = (250.0, 300.0, 350.0, 400.0, 450.0, 500.0, 550.0, 600.0, 700.0, 800.0)
    load_kn_per_level: float = 600.0
    steel_ratio: tuple[float, float] = (0.002, 0.04)


def _bar_area(dia: np.ndarray) -> np.ndarray:
    return np.pi * dia**2 / 4.0


def synthetic_catalogue(spec: SyntheticSpec, rng: np.random.Generator) -> tuple[TypeTable, np.ndarray, np.ndarray]:
    """A catalogue of types, with the steel area and crude squash capacity of each.

    Returns:
        The type table, the bar area per type (mm2) and the crude capacity per type (kN).
    """
    rows: list[tuple[bool, float, float, int, int, float, float, float]] = []
    for size in spec.sizes_mm:
        shapes: list[tuple[bool, float, float]] = [(False, size, size)]
        if spec.rectangles:
            shapes.append((False, size, size + 200.0))
        if spec.circles:
            shapes.append((True, size, size))
        for circ, b, h in shapes:
            for n in spec.counts:
                for dia in spec.dias:
                    if dia > b / 10.0:  # crude: no 40 mm bars in a 250 mm column
                        continue
                    n_bars = 2 * n + 2 if circ else 2 * n + 2 * (n if h == b else n + 1) - 4
                    ac = np.pi * b * b / 4.0 if circ else b * h
                    rho = n_bars * np.pi * dia**2 / 4.0 / ac
                    if not spec.steel_ratio[0] <= rho <= spec.steel_ratio[1]:
                        continue
                    for fck in spec.grades:
                        nb = 2 * n + 2 if circ else n
                        nh = 0 if circ else (n if h == b else n + 1)
                        rows.append((circ, b, h, nb, nh, dia, dia, fck))
    idx = np.arange(len(rows))
    if len(rows) > spec.n_types:
        # keep the extremes so that every demand stays designable, sample the rest
        order = sorted(idx, key=lambda i: (rows[i][1] * rows[i][2], rows[i][3], rows[i][5], rows[i][7]))
        keep = {int(order[0]), int(order[-1])}
        rest = [int(i) for i in idx if int(i) not in keep]
        keep |= set(int(i) for i in rng.choice(rest, size=spec.n_types - 2, replace=False))
        idx = np.array(sorted(keep))
    sel = [rows[i] for i in idx]
    circ = np.array([r[0] for r in sel], dtype=bool)
    b = np.array([r[1] for r in sel])
    h = np.array([r[2] for r in sel])
    nb = np.array([r[3] for r in sel], dtype=int)
    nh = np.array([r[4] for r in sel], dtype=int)
    dia = np.array([r[5] for r in sel])
    corner = np.array([r[6] for r in sel])
    fck = np.array([r[7] for r in sel])
    n_bars = np.where(circ, nb, 2 * nb + 2 * nh - 4)
    area_s = n_bars * _bar_area(dia)
    area_c = np.where(circ, np.pi * b**2 / 4.0, b * h)
    capacity = (0.567 * fck * (area_c - area_s) + 0.87 * FYK_MPA * area_s) / 1000.0
    keys = list(zip(circ.tolist(), b.tolist(), h.tolist(), strict=True))
    section_of = {k: i for i, k in enumerate(dict.fromkeys(keys))}
    section = np.array([section_of[k] for k in keys], dtype=int)
    marks = tuple(
        (f"D{int(b[i])}" if circ[i] else f"{int(b[i])}x{int(h[i])}") + f"-{n_bars[i]}H{int(dia[i])}-C{int(fck[i])}"
        for i in range(len(sel))
    )
    types = TypeTable(
        mark=marks,
        circ=circ,
        b=b,
        h=h,
        nb=nb,
        nh=nh,
        dia=dia,
        corner_dia=corner,
        fck=fck,
        section=section,
        starter_kg_per_m=area_s * STEEL_DENSITY_KG_M3 * 1e-6,
    )
    return types, area_s, capacity


def synthetic_problem(  # noqa: PLR0915 - the generator's options in order
    spec: SyntheticSpec, rules: Rules | None = None, objective: Objective = Objective.STEEL
) -> ScheduleProblem:
    """A random but plausible ScheduleProblem.

    Demand at a cell is the load of the storeys above it (with a per-stack
    factor for its position: corner, edge or interior), so it grows down each
    stack. A type is a candidate when its crude capacity, reduced for the
    eccentricity of the stack's moment in the chosen orientation, exceeds the
    demand. The largest type is made to pass everywhere so that every cell has
    a candidate.

    Args:
        spec: size and character of the building.
        rules: buildability rules (defaults of :class:`Rules`).
        objective: what the integer program will minimise.

    Returns:
        The problem, with cells stack by stack, bottom to top.
    """
    rng = np.random.default_rng(spec.seed)
    types, area_s, capacity = synthetic_catalogue(spec, rng)
    n_t = len(types)
    # stacks: families of identical demand (symmetry), position factor, height, orientation
    factors: list[float] = []
    heights: list[int] = []
    eccs: list[float] = []
    while len(factors) < spec.n_stacks:
        fam = int(rng.choice([1, 2, 4])) if spec.symmetry else 1
        fac = float(rng.choice([0.35, 0.55, 1.0])) * float(rng.uniform(0.8, 1.2))
        short = rng.random() < spec.short_fraction
        height = spec.n_levels - (int(rng.integers(1, max(2, spec.n_levels // 3 + 1))) if short else 0)
        height = max(1, height)
        ecc = float(rng.uniform(0.0, 0.15))
        for _ in range(min(fam, spec.n_stacks - len(factors))):
            factors.append(fac)
            heights.append(height)
            eccs.append(ecc)
    free = rng.random(spec.n_stacks) < spec.free_fraction
    cell_names: list[tuple[str, str]] = []
    stack_idx: list[int] = []
    above: list[int] = []
    demand: list[float] = []
    storey: list[float] = []
    stack_names = tuple(f"C{s + 1}" for s in range(spec.n_stacks))
    for s in range(spec.n_stacks):
        n = heights[s]
        for lev in range(n):
            c = len(cell_names)
            cell_names.append((stack_names[s], f"L{lev:02d}"))
            stack_idx.append(s)
            above.append(c + 1 if lev < n - 1 else -1)
            storeys_carried = n - lev
            demand.append(factors[s] * spec.load_kn_per_level * storeys_carried)
            storey.append(spec.storey_height_mm * (1.3 if lev == 0 else 1.0))
    demand_a = np.array(demand)
    storey_a = np.array(storey)
    biggest = int(np.argmax(capacity))
    cc, ct, co = [], [], []
    for c in range(len(cell_names)):
        s = stack_idx[c]
        for o in (0, 1) if free[s] else (0,):
            # eccentricity reduces capacity more about the shallower direction
            depth = types.h if o == 0 else types.b
            red = 1.0 - eccs[s] * 400.0 / depth
            if o == 1:
                mask = (types.b != types.h) & ~types.circ  # turning a square or circle changes nothing
            else:
                mask = np.ones(n_t, dtype=bool)
            # capacity, and the minimum steel for the axial load (EN 1992-1-1, 9.5.2 (2), crude)
            ok = mask & (capacity * red >= demand_a[c]) & (area_s >= 0.10 * demand_a[c] * 1000.0 / 435.0)
            if o == 0:
                ok[biggest] = True
            for t in np.flatnonzero(ok):
                cc.append(c)
                ct.append(int(t))
                co.append(o)
    cand_cell = np.array(cc, dtype=int)
    cand_type = np.array(ct, dtype=int)
    cand_orient = np.array(co, dtype=int)
    height_m = storey_a[cand_cell] / 1000.0
    steel = area_s[cand_type] * height_m * STEEL_DENSITY_KG_M3 * 1e-6 * 1.25  # + laps and links
    area_c = np.where(types.circ, np.pi * types.b**2 / 4.0, types.b * types.h)[cand_type] * 1e-6
    perim = np.where(types.circ, np.pi * types.b, 2 * (types.b + types.h))[cand_type] * 1e-3
    vol = area_c * height_m
    fck = types.fck[cand_type]
    cost = 1.3 * steel + vol * (110.0 + 1.5 * fck) + 35.0 * perim * height_m
    carbon = 1.4 * steel + vol * (200.0 + 4.0 * fck)
    cap_c = capacity[cand_type]
    util = np.divide(demand_a[cand_cell], cap_c, out=np.zeros_like(cap_c), where=cap_c > 0)
    return ScheduleProblem(
        cell_names=tuple(cell_names),
        stack_names=stack_names,
        stack=np.array(stack_idx, dtype=int),
        above=np.array(above, dtype=int),
        stack_free=free,
        types=types,
        cand_cell=cand_cell,
        cand_type=cand_type,
        cand_orient=cand_orient,
        steel_kg=steel,
        cost=cost,
        carbon=carbon,
        utilisation=util,
        rules=rules if rules is not None else Rules(),
        objective=objective,
        storey_height_mm=storey_a,
    )


def tower(n_cells: int, n_types: int, seed: int = 1, rules: Rules | None = None) -> ScheduleProblem:
    """A benchmark tower of about ``n_cells`` cells (30 or 40 storeys) with a catalogue of about ``n_types`` types.

    Args:
        n_cells: target number of cells (900 gives 30 stacks x 30 storeys; 3,000 gives 75 x 40).
        n_types: target catalogue size.
        seed: random seed.
        rules: buildability rules.

    Returns:
        The problem.
    """
    n_levels = 30 if n_cells <= 1500 else 40
    n_stacks = max(1, round(n_cells / n_levels))
    sizes = tuple(float(s) for s in range(250, 1250, 50))
    spec = SyntheticSpec(
        n_stacks=n_stacks,
        n_levels=n_levels,
        n_types=n_types,
        seed=seed,
        rectangles=True,
        free_fraction=0.3,
        symmetry=True,
        sizes_mm=sizes,
        counts=(2, 3, 4, 5, 6, 7, 8),
        dias=(12.0, 16.0, 20.0, 25.0, 32.0, 40.0),
        grades=(30.0, 35.0, 40.0, 50.0),
        load_kn_per_level=700.0,
    )
    return synthetic_problem(spec, rules=rules)
