"""EN 1990 / EN 1991-1-1 factors of optimizer.building.loads against the standards' text."""

import pytest

from design.params import parameter_set
from optimizer.building.loads import (
    PSI_FACTORS,
    Category,
    Combination,
    alpha_A,
    alpha_n,
    combination_factors,
    combine,
    psi0,
)


@pytest.mark.parametrize(
    ("n", "psi_0", "expected"),
    [
        # EN 1991-1-1, Eq. (6.2): alpha_n = (2 + (n - 2) psi0) / n
        (3, 0.7, (2 + 1 * 0.7) / 3),  # = 0.9000
        (5, 0.7, (2 + 3 * 0.7) / 5),  # = 0.8200
        (10, 0.7, (2 + 8 * 0.7) / 10),  # = 0.7600
        (27, 0.7, (2 + 25 * 0.7) / 27),  # = 0.7222
    ],
)
def test_alpha_n_eq_6_2(n, psi_0, expected):
    assert alpha_n(n, psi_0, Category.B) == pytest.approx(expected, rel=1e-12)


def test_alpha_n_figures_written_out():
    # EN 1991-1-1, Eq. (6.2), by hand: n = 3 -> 2.7/3 = 0.9; n = 5 -> 4.1/5 = 0.82.
    assert alpha_n(3, 0.7) == pytest.approx(0.90)
    assert alpha_n(5, 0.7) == pytest.approx(0.82)


def test_alpha_n_only_above_two_storeys_and_for_a_to_d():
    # EN 1991-1-1, 6.3.1.2(11): n > 2, categories A to D.
    assert alpha_n(1, 0.7) == pytest.approx(1.0)
    assert alpha_n(2, 0.7) == pytest.approx(1.0)
    assert alpha_n(8, 1.0, Category.E) == pytest.approx(1.0)
    assert alpha_n(8, 0.0, Category.H) == pytest.approx(1.0)
    assert alpha_n(8, 0.7, Category.D) == pytest.approx((2 + 6 * 0.7) / 8)


@pytest.mark.parametrize(
    ("area", "cat", "expected"),
    [
        # EN 1991-1-1, Eq. (6.1): alpha_A = 5/7 psi0 + A0/A <= 1.0, A0 = 10 m2
        (10.0, Category.B, 1.0),  # 0.5 + 1.0 -> capped at 1.0
        (20.0, Category.B, 1.0),  # 0.5 + 0.5 = 1.0
        (40.0, Category.B, 0.75),  # 0.5 + 0.25
        (100.0, Category.B, 0.60),  # 0.5 + 0.1
        (1000.0, Category.B, 0.51),  # 0.5 + 0.01
        (1000.0, Category.C, 0.60),  # 0.51 but >= 0.6 for C and D, 6.3.1.2(10)
        (1000.0, Category.D, 0.60),
        (100.0, Category.E, 5 / 7 * 1.0 + 0.1),  # psi0 = 1.0 for E -> 0.8143
        (100.0, Category.H, 1.0),  # not in A-E
    ],
)
def test_alpha_A_eq_6_1(area, cat, expected):
    assert alpha_A(area, PSI_FACTORS[cat].psi0, cat) == pytest.approx(expected, rel=1e-12)


def test_psi0_table_a1_1():
    # EN 1990, Annex A1, Table A1.1 (recommended values).
    assert psi0(Category.A) == pytest.approx(0.7)
    assert psi0(Category.B) == pytest.approx(0.7)
    assert psi0(Category.C) == pytest.approx(0.7)
    assert psi0(Category.D) == pytest.approx(0.7)
    assert psi0(Category.E) == pytest.approx(1.0)
    assert psi0(Category.F) == pytest.approx(0.7)
    assert psi0(Category.G) == pytest.approx(0.7)
    assert psi0(Category.H) == pytest.approx(0.0)
    # psi2 for offices 0.3, storage 0.8 (same table).
    assert PSI_FACTORS[Category.B].psi2 == pytest.approx(0.3)
    assert PSI_FACTORS[Category.E].psi2 == pytest.approx(0.8)


def test_combination_factors_table_a1_2b():
    # EN 1990, Table A1.2(B), recommended: gamma_G,sup = 1.35, gamma_Q = 1.5, xi = 0.85.
    en = parameter_set("EN")
    assert combination_factors(en, Combination.EQ_6_10) == {"6.10": (1.35, 1.5, False)}
    ab = combination_factors(en, Combination.EQ_6_10A_B)
    assert ab["6.10a"] == (1.35, 1.5, True)
    assert ab["6.10b"][0] == pytest.approx(0.85 * 1.35)  # = 1.1475
    assert ab["6.10b"][1] == pytest.approx(1.5)


def test_uk_xi_recalled_from_memory():
    # NA to BS EN 1990, Table NA.A1.2(B): xi = 0.925 (recalled from memory).
    uk = parameter_set("UK")
    assert combination_factors(uk, Combination.EQ_6_10A_B)["6.10b"][0] == pytest.approx(0.925 * 1.35)


def test_combine_picks_less_favourable_of_6_10a_and_6_10b():
    en = parameter_set("EN")
    # Hand: G = 100, Q = 50 (psi0 Q = 35).
    # 6.10a: 1.35*100 + 1.5*35 = 187.5; 6.10b: 1.1475*100 + 1.5*50 = 189.75 -> 6.10b.
    value, expr = combine(100.0, 50.0, 35.0, en, Combination.EQ_6_10A_B)
    assert expr == "6.10b"
    assert value == pytest.approx(189.75)
    # Dead-dominated: G = 500, Q = 50: 6.10a 675 + 52.5 = 727.5; 6.10b 573.75 + 75 = 648.75.
    value, expr = combine(500.0, 50.0, 35.0, en, Combination.EQ_6_10A_B)
    assert (expr, value) == ("6.10a", pytest.approx(727.5))
    # Eq. (6.10): 1.35*500 + 1.5*50 = 750.
    assert combine(500.0, 50.0, 35.0, en, Combination.EQ_6_10) == (pytest.approx(750.0), "6.10")
