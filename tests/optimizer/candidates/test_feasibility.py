"""Catalogue generation and the building-wide feasibility matrix (optimizer/candidates/catalogue.py, feasibility.py).

Sources: EN 1992-1-1 8.2(2) (clear spacing), 9.5.2(1)-(3) (bar size, steel ratio), 9.5.3(1) (link size),
8.7.3 (lap length); closed forms for bar masses (area x length x 7850 kg/m3, nominal mass of steel).
The matrix is checked against the single-column check of design.member (the same engineering, exact MRd).
"""

import numpy as np
import pandas as pd
import pytest

from design import laps
from design.member import check_column
from optimizer.building.scenario import load_scenario_text
from optimizer.candidates.catalogue import Shape, build_catalogue, type_arrays
from optimizer.candidates.feasibility import cell_table, check_pairs, check_settings_for
from optimizer.cli import main
from optimizer.errors import InputError
from optimizer.pipeline.assemble import to_problem
from optimizer.pipeline.settings import read_run_settings
from tests.support import paths

SMALL = paths.SMALL


@pytest.fixture(scope="module")
def small(small_matrix):
    return small_matrix


def test_catalogue_detailing_rules(small):
    sc, cat, _, _ = small
    dg = sc.materials.aggregate_mm
    for t in cat.types:
        s = t.design.section
        rho = s.As / s.Ac
        assert 0.002 - 1e-12 <= rho <= 0.04 + 1e-12  # 9.5.2(2), 9.5.2(3)
        assert s.bars.min_dia >= 8  # 9.5.2(1)
        assert s.link >= max(6.0, s.bars.max_dia / 4)  # 9.5.3(1)
        gap = min(s.clear_spacings())
        assert gap >= max(s.bars.max_dia, dg + 5, 20) - 1e-9  # 8.2(2)
        if t.shape is Shape.SQUARE:
            assert s.bars.nb == s.bars.nh
        assert t.link_spacing % 25 == 0
    areas = [t.design.section.Ac for t in cat.types]
    assert areas == sorted(areas)


def test_catalogue_options_and_bad_keys(tmp_path):
    text = SMALL.read_text(encoding="utf-8")
    extra = (
        '\n[catalogue]\nsizes_mm = {min = 300, max = 600, step = 100}\nshapes = ["square"]\n'
        'bar_dias = [20, 25]\nexclude = ["400x400"]\ntypes = [{b = 450, h = 450, bars = "8H32"}]\n'
    )
    sc = load_scenario_text(text + extra, source="cat.toml", base_dir=SMALL.parent)
    cat = build_catalogue(sc)
    sizes = {t.section_key for t in cat.types}
    assert sizes == {"300x300", "500x500", "600x600", "450x450"}
    assert any(t.design.section.bars.notation == "8H32" for t in cat.types)
    assert {t.design.section.bars.max_dia for t in cat.types} <= {20.0, 25.0, 32.0}
    bad = load_scenario_text(text + "\n[catalogue]\nbar_dia = [20]\n", source="bad.toml", base_dir=SMALL.parent)
    with pytest.raises(InputError, match="did you mean 'bar_dias'"):
        build_catalogue(bad)


@pytest.mark.slow
def test_matrix_agrees_with_single_column_check(small):
    """On random pairs the screened matrix and the exact single-column check agree on pass/fail,
    and on utilisation within 0.5 % where the pair passes."""
    sc, cat, act, fe = small
    ct = cell_table(sc, act)
    feasible = {(int(c), int(t), int(o)) for c, t, o in zip(fe.cand_cell, fe.cand_type, fe.cand_orient, strict=True)}
    util = {
        (int(c), int(t), int(o)): u
        for c, t, o, u in zip(fe.cand_cell, fe.cand_type, fe.cand_orient, fe.utilisation, strict=True)
    }
    rng = np.random.default_rng(11)
    from design.resistance import SectionBatch
    from design.section_data import SectionData

    data = SectionData.of(SectionBatch(cat.designs))
    for _ in range(250):
        c = int(rng.integers(len(ct)))
        t = int(rng.integers(len(cat)))
        settings = check_settings_for(sc, ct.exposure[c], ct.fire[c], "flag")
        res, _ = check_pairs(data, np.array([c]), np.array([t]), ct, 0, settings, sc.params, fast=False)
        exact = float(res.utilisation[0])
        # the design section's own single check gives the same
        one = check_column(cat.designs[t], _actions_of(ct, c), settings, sc.params)
        assert one.utilisation == pytest.approx(exact, rel=1e-9) or (np.isinf(one.utilisation) and np.isinf(exact))
        same_grade = cat.types[t].design.concrete.fck == ct.fck[c]
        in_matrix = (c, t, 0) in feasible
        if res.unverified[0]:
            # fire not verifiable by method A: kept only where no candidate of the cell is verifiable
            verified_in_cell = np.any((fe.cand_cell == c) & ~fe.unverified)
            assert in_matrix == (same_grade and exact <= 1.0 + 1e-9 and not verified_in_cell)
        else:
            assert in_matrix == (same_grade and exact <= 1.0 + 1e-9)
        if in_matrix:
            assert util[(c, t, 0)] == pytest.approx(exact, rel=0.005, abs=1e-9)


def _actions_of(ct, c):
    from design.member import ColumnActions

    return ColumnActions(
        NEd=ct.NEd[c],
        My_top=ct.My_top[c],
        My_bot=ct.My_bot[c],
        Mz_top=ct.Mz_top[c],
        Mz_bot=ct.Mz_bot[c],
        l0y=ct.l0y[c],
        l0z=ct.l0z[c],
        l_clear=ct.l_clear[c],
        l0_fi=ct.l0_fi[c],
        M0Eqp_ratio=ct.M0Eqp_ratio[c] if np.isfinite(ct.M0Eqp_ratio[c]) else None,
        char_ratio=ct.char_ratio[c] if np.isfinite(ct.char_ratio[c]) else None,
        eta_fi=ct.eta_fi[c] if np.isfinite(ct.eta_fi[c]) else None,
    )


def test_turned_candidates_only_for_free_stacks_and_rectangles(small):
    sc, cat, _, fe = small
    ta = type_arrays(cat)
    turned = fe.cand_orient == 1
    assert turned.any()
    free_stacks = {s.id for s in sc.stacks if s.orientation.value == "free"}
    assert all(fe.cells.cells[c][0] in free_stacks for c in fe.cand_cell[turned])
    t = fe.cand_type[turned]
    assert np.all(~ta["circ"][t] & (ta["b"][t] != ta["h"][t]))


def test_quantities_by_hand(small):
    """Main bars: As x (floor-to-floor + lap into the storey above) x 7850 kg/m3; no lap at the top."""
    sc, cat, _, fe = small
    k = int(np.argmax(fe.cells.has_above[fe.cand_cell]))
    c, t = fe.cand_cell[k], fe.cand_type[k]
    sec = cat.types[t].design.section
    lap = float(laps.lap_length(sec.bars.max_dia, fe.cells.fck[c], sc.materials.fyk_MPa, params=sc.params))
    assert fe.main_kg[k] == pytest.approx(sec.As * 1e-9 * 7850 * (fe.cells.height[c] + lap))
    assert fe.concrete_m3[k] == pytest.approx(sec.Ac * 1e-6 * fe.cells.l_clear[c] / 1000)
    top = np.nonzero(~fe.cells.has_above[fe.cand_cell])[0][0]
    assert fe.lap_kg[top] == pytest.approx(0.0)
    assert fe.link_kg[k] > 0


def test_lower_bound_and_problem(small):
    sc, _, _, fe = small
    best, total = fe.lower_bound()
    assert np.all(best >= 0)
    for c in range(len(fe.cells)):
        mine = fe.steel_kg[fe.cand_cell == c]
        assert fe.steel_kg[best[c]] == pytest.approx(mine.min())
    assert total == pytest.approx(fe.steel_kg[best].sum())
    prob = to_problem(fe, sc, read_run_settings(sc))
    assert prob.n_cells == len(sc.cells)
    tops = {c for c in range(prob.n_cells) if prob.above[c] < 0}
    assert len(tops) == len(sc.stacks)


def test_undesignable_cells_are_explained(tmp_path, capsys):
    """Loads far beyond any catalogue type: exit 3 and one sentence per cell naming stack, level, best type."""
    text = (SMALL.parent / "analysis_actions.toml").read_text(encoding="utf-8")
    csv = pd.read_csv(SMALL.parent / "analysis_actions.csv")
    csv["NEd_kN"] = csv["NEd_kN"] * 40
    csv.to_csv(tmp_path / "analysis_actions.csv", index=False)
    (tmp_path / "s.toml").write_text(text, encoding="utf-8")
    code = main(["feasibility", str(tmp_path / "s.toml"), "--out", str(tmp_path / "out"), "--quiet"])
    out = capsys.readouterr().out
    assert code == 3
    assert "cell(s) no type can carry" in out and "the best type" in out and "axial resistance" in out
    und = pd.read_csv(tmp_path / "out" / "undesignable.csv")
    assert len(und) > 0 and set(und.columns) >= {"stack", "level", "best_type", "best_utilisation", "governing"}


def test_cli_feasibility_files(tmp_path, capsys):
    assert main(["feasibility", str(SMALL), "--out", str(tmp_path / "f"), "--quiet"]) == 0
    for name in ("catalogue.csv", "lower_bound.csv", "undesignable.csv", "summary.json"):
        assert (tmp_path / "f" / name).exists()
    lb = pd.read_csv(tmp_path / "f" / "lower_bound.csv")
    assert len(lb) == 36 and lb["steel_kg"].gt(0).all()
