"""The building-wide feasibility matrix: every catalogue type checked in every cell.

For each cell (stack, level) and each type of the catalogue, and for stacks
whose orientation is free also with the type turned by 90 degrees, the full
member check of :mod:`design.member` decides pass or fail, with the
utilisation and the governing check. Feasible pairs carry their quantities:
main bars over the storey with the lap into the storey above, links, concrete,
formwork and plan area.

Speed: cells are checked in chunks against all types at once (numpy, no
loop per pair). MRd comes from each type's tabulated N-M curve
(SectionBatch.moment_resistance_fast); above 0.9 NRd and for every pair whose
screened utilisation lies within ``recheck_band`` of 1.0 the exact solver is
used, so no failing design is ever called feasible.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from design import detailing, laps
from design.fire import FireRating
from design.member import CheckSettings, ColumnActions, check_members
from design.resistance import SectionBatch
from design.second_order import slenderness
from design.section_data import SectionData
from optimizer.building import Orientation, Scenario, fire_requirement
from optimizer.candidates.catalogue import STEEL_DENSITY, Catalogue, type_arrays
from optimizer.errors import InputError

__all__ = [
    "CellTable",
    "Feasibility",
    "cell_table",
    "check_pairs",
    "check_settings_for",
    "feasibility",
    "quantities",
    "undesignable_lines",
    "undesignable_frame",
    "RECHECK_BAND",
]

RECHECK_BAND = (0.99, 1.01)  # screened utilisations re-checked with the exact solver
_RESISTANCE_CHECKS = ("bending about y", "bending about z", "biaxial interaction")
_AXIAL_NAME = "axial resistance (EN 1992-1-1, 6.1)"
TIE_LENGTH_FACTOR = 1.0  # an extra tie across the section is about one section width long (common practice)


@dataclass(frozen=True)
class CellTable:
    """Per-cell actions and settings in the scenario's cell order (arrays; N, N mm, mm)."""

    cells: tuple[tuple[str, str], ...]
    NEd: np.ndarray
    My_top: np.ndarray
    My_bot: np.ndarray
    Mz_top: np.ndarray
    Mz_bot: np.ndarray
    l0y: np.ndarray
    l0z: np.ndarray
    l_clear: np.ndarray  # clear height, mm
    height: np.ndarray  # floor-to-floor height, mm
    exposure: tuple[str | None, ...]
    fire: tuple[str | None, ...]
    fck: np.ndarray
    free: np.ndarray  # bool: the stack's orientation is left to the optimiser
    has_above: np.ndarray  # bool: the stack continues above (bars lap into the next storey)
    l0_fi: np.ndarray  # effective length in fire, mm
    M0Eqp_ratio: np.ndarray  # M0Eqp/M0Ed for phi_ef (EN 1992-1-1, 5.8.4(2)); nan where not known
    char_ratio: np.ndarray  # characteristic over design actions for 7.2(2); nan where not known
    eta_fi: np.ndarray  # design actions in fire over design actions (EN 1992-1-2, 2.4.2); nan where not known

    def __len__(self) -> int:
        return len(self.cells)

    def actions(self, cells: np.ndarray, orient: int = 0) -> ColumnActions:
        """Member-check actions of ``cells`` in the axes of a section turned by ``orient`` (1: plan axes swapped).

        Where M0Eqp/M0Ed (or the characteristic ratio) is not known for every one of the cells, 1.0 (its
        upper bound) is used for all of them through ``None``, which the calculation sheet states.
        """
        cc = np.atleast_1d(np.asarray(cells, dtype=int))

        def known(values: np.ndarray) -> np.ndarray | None:
            v = values[cc]
            return None if np.any(~np.isfinite(v)) else v

        y, z = ("My", "Mz") if orient == 0 else ("Mz", "My")
        l0y, l0z = (self.l0y, self.l0z) if orient == 0 else (self.l0z, self.l0y)
        return ColumnActions(
            NEd=self.NEd[cc],
            My_top=getattr(self, f"{y}_top")[cc],
            My_bot=getattr(self, f"{y}_bot")[cc],
            Mz_top=getattr(self, f"{z}_top")[cc],
            Mz_bot=getattr(self, f"{z}_bot")[cc],
            l0y=l0y[cc],
            l0z=l0z[cc],
            l_clear=self.l_clear[cc],
            l0_fi=self.l0_fi[cc],
            M0Eqp_ratio=known(self.M0Eqp_ratio),
            char_ratio=known(self.char_ratio),
            eta_fi=known(self.eta_fi),
        )


def _num(df: pd.DataFrame, col: str) -> np.ndarray:
    return df[col].to_numpy(dtype=float) if col in df.columns else np.full(len(df), np.nan)


def cell_table(scenario: Scenario, actions: pd.DataFrame) -> CellTable:
    """Join the actions table (takedown or analysis CSV) with the cells' settings.

    Effective lengths come from the actions table when it has them, else from
    the cell's factors on the clear height, else from its k1/k2 by
    EN 1992-1-1 Eq. (5.15) (braced); a cell with none of these is an error.
    """
    df = actions.set_index(["stack", "level"])
    n = len(scenario.cells)
    out = {
        k: np.zeros(n)
        for k in ("NEd", "My_top", "My_bot", "Mz_top", "Mz_bot", "l0y", "l0z", "l_clear", "height", "fck")
    }
    exposure, fire, names = [], [], []
    free = np.zeros(n, dtype=bool)
    has_above = np.zeros(n, dtype=bool)
    l0y_csv, l0z_csv = _num(actions, "l0y_mm"), _num(actions, "l0z_mm")
    row_of = {key: i for i, key in enumerate(zip(actions["stack"], actions["level"], strict=True))}
    for c in scenario.cells:
        key = (c.stack, c.level)
        if key not in row_of:
            raise InputError(
                scenario.source,
                f"actions for {c.stack} at {c.level}",
                None,
                "a row in the actions table for every cell",
            )
        r = df.loc[key]
        i = c.index
        names.append(key)
        out["NEd"][i] = float(r["NEd_kN"]) * 1e3
        for col, name in (
            ("My_top_kNm", "My_top"),
            ("My_bot_kNm", "My_bot"),
            ("Mz_top_kNm", "Mz_top"),
            ("Mz_bot_kNm", "Mz_bot"),
        ):
            out[name][i] = float(r[col]) * 1e6
        out["l_clear"][i] = c.clear_height_m * 1000.0
        out["height"][i] = c.height_m * 1000.0
        out["fck"][i] = c.settings.fck_MPa
        j = row_of[key]
        for ax, csv, prop in (("y", l0y_csv, c.l0y_mm), ("z", l0z_csv, c.l0z_mm)):
            if np.isfinite(csv[j]):
                val = csv[j]
            elif prop is not None:
                val = prop
            else:
                el = c.settings.effective_length
                k1 = getattr(el, f"k1{ax}", None) if el else None
                k2 = getattr(el, f"k2{ax}", None) if el else None
                if k1 is None or k2 is None:
                    raise InputError(
                        scenario.source,
                        f"effective length of {c.stack} at {c.level}",
                        None,
                        f"l0{ax}_mm in the actions, an l0 factor, or k1{ax}/k2{ax} in [[settings]]",
                    )
                val = float(slenderness.l0_braced(out["l_clear"][i], k1, k2))
            out[f"l0{ax}"][i] = val
        exp = r["exposure"] if "exposure" in r.index and isinstance(r["exposure"], str) and r["exposure"] else None
        fr = r["fire"] if "fire" in r.index and isinstance(r["fire"], str) and r["fire"] else None
        exposure.append(exp or c.settings.exposure)
        # a rating in the actions overrides the scenario's; "none" there removes the requirement
        fire.append(c.settings.fire if fr is None else fire_requirement(fr))
        st = scenario.stack(c.stack)
        free[i] = st.orientation is Orientation.FREE
        has_above[i] = c.level != st.to_level
    # Effective length in fire, EN 1992-1-2 5.3.2(2): the structure is braced (by its cores), so for
    # R > 30 take 0.5 l in intermediate storeys and 0.7 l (the upper bound) in the top storey of a
    # stack, l the floor-to-floor length; otherwise l0,fi = l0.
    rating = np.array([int(str(f).upper().removeprefix("R")) if f else 0 for f in fire])
    l0_fi = np.where(rating > 30, np.where(has_above, 0.5, 0.7) * out["height"], np.maximum(out["l0y"], out["l0z"]))
    ratios = {}
    for col in ("M0Eqp_ratio", "char_ratio", "eta_fi"):
        ratios[col] = np.full(n, np.nan)
        if col in actions.columns:
            by_key = dict(
                zip(
                    zip(actions["stack"], actions["level"], strict=True),
                    actions[col].to_numpy(dtype=float),
                    strict=True,
                )
            )
            ratios[col] = np.array([by_key[key] for key in names], dtype=float)
    return CellTable(
        cells=tuple(names),
        exposure=tuple(exposure),
        fire=tuple(fire),
        free=free,
        has_above=has_above,
        l0_fi=l0_fi,
        **ratios,
        **out,
    )


@dataclass
class Feasibility:
    """Feasible (cell, type, orientation) candidates and their quantities, with per-cell summaries."""

    catalogue: Catalogue
    cells: CellTable
    cand_cell: np.ndarray
    cand_type: np.ndarray
    cand_orient: np.ndarray
    utilisation: np.ndarray
    governing: np.ndarray  # index into check_names
    unverified: np.ndarray  # bool: fire resistance not verifiable by method A (kept only where nothing else is)
    main_kg: np.ndarray  # main bars over the storey incl. the lap into the storey above
    lap_kg: np.ndarray  # of which the lap
    link_kg: np.ndarray  # links and extra ties
    concrete_m3: np.ndarray
    formwork_m2: np.ndarray
    plan_m2: np.ndarray
    check_names: list[str]
    best_util: np.ndarray  # per cell: lowest utilisation over all types
    best_type: np.ndarray  # per cell: the type reaching it
    best_check: list[str]  # per cell: its governing check (name and clause)
    pairs_checked: int
    exact_rechecks: int
    seconds: float
    notes: list[str] = field(default_factory=list)

    @property
    def catalogue_fck(self) -> np.ndarray:
        """Strength fck of every catalogue type, MPa."""
        return np.array([t.design.concrete.fck for t in self.catalogue.types])

    @property
    def steel_kg(self) -> np.ndarray:
        """Main bars + links per candidate, kg."""
        return self.main_kg + self.link_kg

    def lower_bound(self) -> tuple[np.ndarray, float]:
        """Lightest feasible candidate per cell (-1 where none) and the total steel, kg."""
        n = len(self.cells)
        best = np.full(n, -1)
        best_kg = np.full(n, np.inf)
        order = np.lexsort((self.steel_kg, self.cand_cell))
        first = np.ones(len(order), dtype=bool)
        first[1:] = self.cand_cell[order][1:] != self.cand_cell[order][:-1]
        sel = order[first]
        best[self.cand_cell[sel]] = sel
        best_kg[self.cand_cell[sel]] = self.steel_kg[sel]
        ok = best >= 0
        return best, float(best_kg[ok].sum())

    def undesignable(self) -> list[int]:
        """Cells with no feasible candidate."""
        has = np.zeros(len(self.cells), dtype=bool)
        has[self.cand_cell] = True
        return [int(i) for i in np.nonzero(~has)[0]]


def check_settings_for(
    scenario: Scenario, exposure: str | None, fire: str | None, fire_rule: str = "flag"
) -> CheckSettings:
    """Member-check settings of the cells of one (exposure, fire) group of a scenario."""
    rating = None
    if fire:
        rating = FireRating(int(str(fire).upper().removeprefix("R")))
    return CheckSettings(
        exposure=exposure or None,
        fire=rating,
        aggregate=scenario.materials.aggregate_mm,
        fire_outside_method=fire_rule,
        creep=scenario.creep,
    )


def feasibility(  # noqa: PLR0915 - screening, exact re-check band and quantities in one pass over chunks
    scenario: Scenario,
    catalogue: Catalogue,
    actions: pd.DataFrame,
    progress: Callable[[str, int, int], None] | None = None,
    max_pairs: int = 100_000,
    workers: int = 1,
    fire_rule: str = "flag",
) -> Feasibility:
    """Check every catalogue type in every cell (both orientations for free stacks).

    EN 1992-1-1 and EN 1992-1-2 through :func:`design.member.check_members`.

    Args:
        scenario: the building.
        catalogue: the candidate types.
        actions: the per-cell actions table (takedown or analysis CSV).
        progress: called with (stage, done, total) as the matrix fills.
        max_pairs: pairs per chunk (bounds memory).
        workers: threads sharing the chunks (measured: one is faster on two cores, because the
            exact solver inside already uses both and small numpy calls contend for the GIL).
        fire_rule: where fire method A does not apply, "flag" the cell's fire
            resistance as not verified (a warning) or "fail" the pair.
    """
    t0 = time.perf_counter()
    params = scenario.params
    ct = cell_table(scenario, actions)
    batch = SectionBatch(catalogue.designs)
    data = SectionData.of(batch)
    ta = type_arrays(catalogue, data.extra_ties)
    NRd = batch.NRd()
    n_types = len(catalogue)
    square = (~ta["circ"]) & (ta["b"] == ta["h"])
    turnable = np.nonzero(~ta["circ"] & ~square)[0]

    groups: dict[tuple, list[int]] = {}
    for i in range(len(ct)):
        groups.setdefault((ct.exposure[i], ct.fire[i]), []).append(i)
    jobs = []
    for key, cells in groups.items():
        cells_arr = np.array(cells)
        jobs.append((key, cells_arr, 0, np.arange(n_types)))
        rot = cells_arr[ct.free[cells_arr]]
        if rot.size and turnable.size:
            jobs.append((key, rot, 1, turnable))
    total_pairs = sum(len(c) * len(t) for _, c, _, t in jobs)
    done = 0
    acc: dict[str, list] = {k: [] for k in ("cell", "type", "orient", "util", "gov", "unverified")}
    n_cells = len(ct)
    best_util = np.full(n_cells, np.inf)
    best_type = np.full(n_cells, -1)
    best_gov = np.full(n_cells, -1)
    check_names: list[str] = []
    rechecks = 0
    checked = 0
    tasks = []
    for (exp, fire), cells_arr, orient, types_arr in jobs:
        settings = check_settings_for(scenario, exp, fire, fire_rule)
        per_chunk = max(1, max_pairs // len(types_arr))
        for start in range(0, len(cells_arr), per_chunk):
            tasks.append((cells_arr[start : start + per_chunk], types_arr, orient, settings))

    def work(task):
        cs, types_arr, orient, settings = task
        # The types of each cell's own concrete grade (or of any grade when the catalogue offers a choice).
        cc = np.repeat(cs, len(types_arr))
        tt = np.tile(types_arr, len(cs))
        if not catalogue.grade_choice:
            keep = ta["fck"][tt] == ct.fck[cc]
            cc, tt = cc[keep], tt[keep]
        if cc.size == 0:
            return cs, types_arr, orient, cc, tt, np.zeros(0), np.zeros(0, dtype=int), [], 0, np.zeros(0, bool)
        # A type whose squash load NRd is below NEd fails the axial check (6.1) whatever else
        # holds: record that without running the full check.
        axial = ct.NEd[cc] / NRd[tt]
        full = np.nonzero(axial <= 1.0)[0]
        util = axial.copy()
        gov = np.zeros(cc.size, dtype=int)  # check 0 is the axial resistance check
        unver = np.zeros(cc.size, dtype=bool)
        if full.size == 0:
            return cs, types_arr, orient, cc, tt, util, gov, [_AXIAL_NAME], 0, unver
        res, names = check_pairs(data, cc[full], tt[full], ct, orient, settings, params, fast=True)
        util[full] = res.utilisation
        gov[full] = res.governing
        unver[full] = res.unverified
        # Re-check exactly where a resistance check (the only ones using the tabulated MRd)
        # lies near 1.0 and could decide pass or fail.
        umat = res.utilisation_matrix
        cols = [k for k, c in enumerate(res.checks) if c.name in _RESISTANCE_CHECKS]
        others = np.delete(umat, cols, axis=1)
        u_res = umat[:, cols].max(axis=1)
        band = full[
            np.nonzero((u_res >= RECHECK_BAND[0]) & (u_res <= RECHECK_BAND[1]) & (others.max(axis=1) <= 1.0 + 1e-9))[0]
        ]
        if band.size:
            exact, _ = check_pairs(data, cc[band], tt[band], ct, orient, settings, params, fast=False)
            util = util.copy()
            gov = gov.copy()
            util[band] = exact.utilisation
            gov[band] = exact.governing
        return cs, types_arr, orient, cc, tt, util, gov, names, band.size, unver

    with ThreadPoolExecutor(max_workers=workers) as pool:
        for cs, types_arr, orient, cc, tt, util, gov, names, n_band, unver in pool.map(work, tasks):
            done += len(cs) * len(types_arr)
            checked += cc.size
            rechecks += n_band
            if progress:
                progress("feasibility matrix", min(done, total_pairs), total_pairs)
            if cc.size == 0:
                continue
            gid = _global_check_ids(names, check_names)
            ok = util <= 1.0 + 1e-9
            acc["cell"].append(cc[ok])
            acc["type"].append(tt[ok])
            acc["orient"].append(np.full(ok.sum(), orient, dtype=np.int8))
            acc["util"].append(util[ok])
            acc["gov"].append(gid[gov[ok]])
            acc["unverified"].append(unver[ok])
            # best type per cell (for the diagnosis of cells no type can carry)
            order = np.lexsort((util, cc))
            first = np.ones(order.size, dtype=bool)
            first[1:] = cc[order][1:] != cc[order][:-1]
            sel = order[first]
            better = (util[sel] < best_util[cc[sel]]) | (best_type[cc[sel]] < 0)
            tgt = cc[sel][better]
            best_util[tgt] = util[sel][better]
            best_type[tgt] = tt[sel][better]
            best_gov[tgt] = gid[gov[sel][better]]
    cand_cell = np.concatenate(acc["cell"]) if acc["cell"] else np.zeros(0, dtype=int)
    cand_type = np.concatenate(acc["type"]) if acc["type"] else np.zeros(0, dtype=int)
    cand_orient = np.concatenate(acc["orient"]) if acc["orient"] else np.zeros(0, dtype=np.int8)
    util = np.concatenate(acc["util"]) if acc["util"] else np.zeros(0)
    gov = np.concatenate(acc["gov"]) if acc["gov"] else np.zeros(0, dtype=int)
    unverified = np.concatenate(acc["unverified"]) if acc["unverified"] else np.zeros(0, dtype=bool)
    # A candidate whose fire resistance cannot be verified by method A is kept only in cells where no
    # candidate can be verified (the run then warns); elsewhere the verified candidates are used.
    verified_somewhere = np.zeros(n_cells, dtype=bool)
    verified_somewhere[cand_cell[~unverified]] = True
    keep = ~unverified | ~verified_somewhere[cand_cell]
    cand_cell, cand_type, cand_orient = cand_cell[keep], cand_type[keep], cand_orient[keep]
    util, gov, unverified = util[keep], gov[keep], unverified[keep]
    q = quantities(ct, ta, cand_cell, cand_type, scenario)
    best_check = [check_names[g] if g >= 0 else "" for g in best_gov]
    return Feasibility(
        catalogue=catalogue,
        cells=ct,
        cand_cell=cand_cell,
        cand_type=cand_type,
        cand_orient=cand_orient,
        utilisation=util,
        governing=gov,
        unverified=unverified,
        check_names=check_names,
        best_util=best_util,
        best_type=best_type,
        best_check=best_check,
        pairs_checked=checked,
        exact_rechecks=rechecks,
        seconds=time.perf_counter() - t0,
        **q,
    )


def _global_check_ids(names: list[str], registry: list[str]) -> np.ndarray:
    ids = []
    for n in names:
        if n not in registry:
            registry.append(n)
        ids.append(registry.index(n))
    return np.array(ids, dtype=int)


def check_pairs(
    data: SectionData,
    cc: np.ndarray,
    tt: np.ndarray,
    ct: CellTable,
    orient: int,
    settings: CheckSettings,
    params,
    fast: bool,
):
    """Member check of pairs (cell cc, type tt); orientation 1 swaps the plan axes."""
    res = check_members(data, tt, ct.actions(cc, orient), settings, params, fast=fast)
    names = [f"{c.name} ({c.clause})" for c in res.checks]
    return res, names


def quantities(ct: CellTable, ta: dict, cell: np.ndarray, typ: np.ndarray, scenario: Scenario) -> dict:
    """Quantities per candidate (kg, m3, m2).

    Main bars run the floor-to-floor height plus the lap into the storey above
    (none at the top of a stack); lap length by EN 1992-1-1 8.7.3 with alpha6 =
    1.5 (all bars lapped at one section). Links by the spacing rules of 9.5.3
    (reduced zones near the slabs and over the lap), each a closed link around
    the bars with two 135-degree hooks of 10 diameters (common practice), plus
    the extra ties of 9.5.3(6). Bar mass from the nominal area and 7850 kg/m3.
    """
    params = scenario.params
    if cell.size == 0:
        z = np.zeros(0)
        return dict(main_kg=z, lap_kg=z, link_kg=z, concrete_m3=z, formwork_m2=z, plan_m2=z)
    As, Ac = ta["As"][typ], ta["Ac"][typ]
    fck = ta["fck"][typ]  # the type's own grade
    lap = laps.lap_length(ta["max_dia"][typ], fck, scenario.materials.fyk_MPa, params=params)
    lap = np.where(ct.has_above[cell], lap, 0.0)
    kg_per_mm = As * 1e-9 * STEEL_DENSITY  # mm2 x mm -> m3 x density
    main_kg = kg_per_mm * (ct.height[cell] + lap)
    lap_kg = kg_per_mm * lap
    b, h, circ = ta["b"][typ], ta["h"][typ], ta["circ"][typ]
    link = ta["link"][typ]
    cov = ta["cover"][typ]
    inner_b, inner_h = b - 2 * cov - link, h - 2 * cov - link
    perim = np.where(circ, math.pi * (b - 2 * cov - link), 2 * (inner_b + inner_h)) + 2 * 10 * link
    n_links = detailing.link_count(
        ct.l_clear[cell],
        np.maximum(b, h),
        ta["link_spacing"][typ],
        ta["max_dia"][typ],
        np.where(ct.has_above[cell], lap, 0.0),
        params,
    )
    tie_len = TIE_LENGTH_FACTOR * np.minimum(b, h) + 2 * 10 * link
    link_area = math.pi * link**2 / 4
    link_kg = (n_links * perim + n_links * ta["extra_ties"][typ] * tie_len) * link_area * 1e-9 * STEEL_DENSITY
    clear_m = ct.l_clear[cell] / 1000.0
    concrete = Ac * 1e-6 * clear_m
    formwork = np.where(circ, math.pi * b, 2 * (b + h)) * 1e-3 * clear_m
    return dict(
        main_kg=main_kg, lap_kg=lap_kg, link_kg=link_kg, concrete_m3=concrete, formwork_m2=formwork, plan_m2=Ac * 1e-6
    )


def undesignable_lines(fe: Feasibility) -> list[str]:
    """One sentence per cell that no type can carry."""
    out = []
    for i in fe.undesignable():
        stack, level = fe.cells.cells[i]
        if fe.best_type[i] < 0:
            out.append(f"stack {stack} at level {level}: no type of its grade in the catalogue")
            continue
        t = fe.catalogue.types[fe.best_type[i]]
        u = fe.best_util[i]
        reach = "cannot be checked" if not np.isfinite(u) else f"reaches {u:.2f}"
        out.append(f"stack {stack} at level {level}: the best type {t.label} {reach} in {fe.best_check[i]}")
    return out


def undesignable_frame(fe: Feasibility) -> pd.DataFrame:
    """Cells no type can carry, with the best type."""
    rows = []
    for i in fe.undesignable():
        stack, level = fe.cells.cells[i]
        t = fe.catalogue.types[fe.best_type[i]] if fe.best_type[i] >= 0 else None
        rows.append(
            {
                "stack": stack,
                "level": level,
                "NEd_kN": round(fe.cells.NEd[i] / 1e3, 1),
                "best_type": t.label if t else "",
                "best_utilisation": fe.best_util[i],
                "governing": fe.best_check[i],
            }
        )
    return pd.DataFrame(rows, columns=["stack", "level", "NEd_kN", "best_type", "best_utilisation", "governing"])
