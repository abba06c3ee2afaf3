"""Creep in the building path: M0Eqp/M0Ed from the takedown, the [creep] table, the actions CSV.

EN 1992-1-1, 5.8.4(2), Eq. (5.19): phi_ef = phi(inf, t0) M0Eqp / M0Ed, with M0Eqp under the
quasi-permanent combination (EN 1990, Eq. (6.16b): Gk + psi2 Qk, psi2 from Table A1.1) and M0Ed
under the design combination. phi(inf, t0) from Annex B (design/creep.py, tested on its own).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from design.creep import CementClass, CreepSettings
from optimizer.building.actions_csv import read_actions_csv, write_actions_csv
from optimizer.building.loads import PSI_FACTORS, Category
from optimizer.building.scenario import load_scenario, load_scenario_text
from optimizer.building.takedown import m0eqp_ratio, scenario_actions, takedown
from optimizer.candidates.feasibility import cell_table, check_settings_for
from optimizer.errors import InputError
from tests.support import paths

ROOT = paths.ROOT
SMALL = ROOT / "scenarios" / "small_building.toml"
ANALYSIS = ROOT / "scenarios" / "analysis_actions.toml"


def test_ratio_is_the_larger_of_the_axial_and_moment_ratios():
    # M0 = M_frame + N ei: the ratio of the sums lies between the two ratios, so the larger bounds it.
    assert m0eqp_ratio(1000.0, 600.0, [(100.0, 55.0)]) == pytest.approx(0.6)
    assert m0eqp_ratio(1000.0, 600.0, [(100.0, 70.0), (50.0, 10.0)]) == pytest.approx(0.7)
    # no frame moment: the axial ratio alone
    assert m0eqp_ratio(1000.0, 640.0, [(0.0, 0.0)]) == pytest.approx(0.64)
    # never above 1
    assert m0eqp_ratio(1000.0, 1200.0, []) == pytest.approx(1.0)
    n, nqp, m, mqp = 2000.0, 1300.0, 150.0, 90.0
    for ei_m in (0.0, 0.01, 0.05, 0.5):  # any imperfection eccentricity
        assert (mqp + nqp * ei_m) / (m + n * ei_m) <= m0eqp_ratio(n, nqp, [(m, mqp)]) + 1e-12


def test_takedown_gives_the_ratio_for_every_cell(small_scenario):
    sc = small_scenario
    r = takedown(sc)
    a, d = r.actions, r.detail
    assert "M0Eqp_ratio" in a.columns
    ratio = a["M0Eqp_ratio"].to_numpy()
    assert np.all((ratio > 0.0) & (ratio <= 1.0))
    # N_qp = Gk + psi2 Qk: never below the axial ratio, and the axial ratio by hand for one cell
    assert np.all(ratio >= d["N_qp_kN"].to_numpy() / d["NEd_kN"].to_numpy() - 1e-12)
    row = d.iloc[0]
    cats = {lf.category for lf in sc.level_floors}
    if len(cats) == 1:
        psi2 = PSI_FACTORS[cats.pop()].psi2
        assert row["N_qp_kN"] == pytest.approx(row["Gk_kN"] + psi2 * row["Qk_kN"], rel=1e-9)
    # office floors (category B): psi2 = 0.3 (EN 1990 Table A1.1)
    assert PSI_FACTORS[Category.B].psi2 == pytest.approx(0.3)


def test_ratio_reaches_the_member_check(small_scenario):
    sc = small_scenario
    act = scenario_actions(sc)
    ct = cell_table(sc, act)
    assert np.all(np.isfinite(ct.M0Eqp_ratio))
    acts = ct.actions(np.arange(3))
    assert acts.M0Eqp_ratio == pytest.approx(ct.M0Eqp_ratio[:3])


def test_actions_csv_carries_the_ratio_and_a_blank_is_unknown(tmp_path, small_scenario):
    sc = small_scenario
    r = takedown(sc)
    path = write_actions_csv(r.actions, tmp_path / "a.csv")
    back = read_actions_csv(path, sc)
    assert back["M0Eqp_ratio"].tolist() == pytest.approx(r.actions["M0Eqp_ratio"].tolist(), abs=1e-3)
    # the shipped analysis CSV has no ratio: unknown cells take the upper bound 1.0 in the check
    an = load_scenario(ANALYSIS)
    ct = cell_table(an, scenario_actions(an))
    assert np.all(np.isnan(ct.M0Eqp_ratio))
    assert ct.actions(np.arange(2)).M0Eqp_ratio is None


def test_bad_ratio_in_the_csv_is_one_clear_error(tmp_path, small_scenario):
    sc = small_scenario
    r = takedown(sc)
    a = r.actions.copy()
    a.loc[0, "M0Eqp_ratio"] = 7.0
    path = write_actions_csv(a, tmp_path / "bad.csv")
    with pytest.raises(InputError) as err:
        read_actions_csv(path, sc)
    assert "M0Eqp_ratio" in str(err.value) and "7" in str(err.value)


def _with_creep(table: str) -> str:
    text = SMALL.read_text()
    return text.replace("[takedown]", table + "\n\n[takedown]", 1)


def test_creep_table_sets_the_annex_b_conditions(small_scenario):
    sc = small_scenario
    assert sc.creep == CreepSettings() and not sc.creep_given  # RH 50 %, t0 28 d, class N
    text = _with_creep('[creep]\nrelative_humidity_percent = 80\nage_at_loading_days = 14\ncement_class = "R"')
    sc2 = load_scenario_text(text, source=str(SMALL), base_dir=SMALL.parent)
    assert sc2.creep_given
    assert sc2.creep.RH_percent == pytest.approx(80.0)
    assert sc2.creep.t0_days == pytest.approx(14.0)
    assert sc2.creep.cement is CementClass.R
    assert check_settings_for(sc2, None, None).creep == sc2.creep


@pytest.mark.parametrize(
    ("table", "key"),
    [
        ("[creep]\nrelative_humidity_percent = 500", "relative_humidity_percent"),
        ("[creep]\nage_at_loading_days = -3", "age_at_loading_days"),
        ('[creep]\ncement_class = "X"', "cement_class"),
        ("[creep]\nhumidity = 50", "humidity"),
    ],
)
def test_bad_creep_values_are_clear_errors(table, key):
    with pytest.raises(InputError) as err:
        load_scenario_text(_with_creep(table), source="s.toml", base_dir=SMALL.parent)
    assert key in str(err.value)


def test_a_drier_environment_gives_more_creep():
    """phi(inf, t0) falls with RH (Annex B, Eq. (B.3)): indoor air (50 %) creeps more than outdoor (80 %)."""
    from design.creep import phi_inf

    assert float(phi_inf(50.0, 200.0, 48.0, 28.0)) > float(phi_inf(80.0, 200.0, 48.0, 28.0))
    assert not math.isnan(float(phi_inf(80.0, 200.0, 48.0, 28.0)))


def test_takedown_gives_eta_fi_from_the_loads(small_scenario):
    """EN 1992-1-2, 2.4.2(2): eta_fi = Ed,fi / Ed with Ed,fi = Gk + psi1 Qk (EN 1990 Eq. (6.11b); psi1 of
    EN 1990 Table A1.1, office floors 0.5), by hand from the takedown's own detail table."""
    r = takedown(small_scenario)
    a, d = r.actions, r.detail
    assert "eta_fi" in a.columns
    cats = {lf.category for lf in small_scenario.level_floors}
    for i in range(len(d)):
        row = d.iloc[i]
        if len(cats) == 1:
            psi1 = PSI_FACTORS[next(iter(cats))].psi1
            assert row["N_fi_kN"] == pytest.approx(row["Gk_kN"] + psi1 * row["Qk_kN"], rel=1e-9)
        assert a["eta_fi"].iloc[i] == pytest.approx(row["N_fi_kN"] / row["NEd_kN"], rel=1e-9)
    # the usual range of Figure 2.1 of EN 1992-1-2 (about 0.5 to 0.7; recalled from memory)
    assert a["eta_fi"].between(0.4, 0.75).all()
