"""Load factors of EN 1990 and EN 1991-1-1 used by the concept-stage takedown.

Categories of use and their psi factors (EN 1990, Annex A1, Table A1.1,
recommended values), the imposed-load reduction factors alpha_A and alpha_n
(EN 1991-1-1, 6.3.1.2(10) and (11)) and the ULS fundamental combinations
(EN 1990, Eqs. (6.10), (6.10a), (6.10b)). The partial factors gamma_G, gamma_Q
and xi come from :class:`design.params.NationalParameters`.

All functions are pure; loads are in kN (or kPa) and compression is positive.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum

from design.params import NationalParameters

__all__ = [
    "Category",
    "PsiFactors",
    "PSI_FACTORS",
    "Combination",
    "ImposedReduction",
    "psi0",
    "alpha_n",
    "alpha_A",
    "combine",
    "combination_factors",
    "A0_M2",
]

# Reference area of EN 1991-1-1, 6.3.1.2(10), Eq. (6.1).
A0_M2 = 10.0


class Category(str, Enum):
    """Category of use of a floor, EN 1991-1-1 Table 6.1 (A-E), 6.3.3 (F, G), 6.3.4 (H)."""

    A = "A"  # domestic and residential
    B = "B"  # office
    C = "C"  # congregation
    D = "D"  # shopping
    E = "E"  # storage
    F = "F"  # traffic, vehicle weight <= 30 kN
    G = "G"  # traffic, 30 kN < vehicle weight <= 160 kN
    H = "H"  # roofs not accessible except for maintenance


@dataclass(frozen=True)
class PsiFactors:
    """psi0, psi1, psi2 of one category of use (EN 1990, Table A1.1)."""

    psi0: float
    psi1: float
    psi2: float


# EN 1990, Annex A1, Table A1.1 (recommended values for buildings).
PSI_FACTORS: dict[Category, PsiFactors] = {
    Category.A: PsiFactors(0.7, 0.5, 0.3),
    Category.B: PsiFactors(0.7, 0.5, 0.3),
    Category.C: PsiFactors(0.7, 0.7, 0.6),
    Category.D: PsiFactors(0.7, 0.7, 0.6),
    Category.E: PsiFactors(1.0, 0.9, 0.8),
    Category.F: PsiFactors(0.7, 0.7, 0.6),
    Category.G: PsiFactors(0.7, 0.5, 0.3),
    Category.H: PsiFactors(0.0, 0.0, 0.0),
}

# Categories to which each reduction may be applied.
ALPHA_N_CATEGORIES = frozenset({Category.A, Category.B, Category.C, Category.D})
ALPHA_A_CATEGORIES = frozenset({Category.A, Category.B, Category.C, Category.D, Category.E})


class Combination(str, Enum):
    """Which ULS fundamental combination the takedown uses (EN 1990, 6.4.3.2)."""

    EQ_6_10 = "6.10"
    EQ_6_10A_B = "6.10a+6.10b"


class ImposedReduction(str, Enum):
    """Reduction of imposed loads on columns chosen by the scenario (never both at once)."""

    NONE = "none"
    ALPHA_N = "alpha_n"  # EN 1991-1-1, 6.3.1.2(11), Eq. (6.2)
    ALPHA_A = "alpha_A"  # EN 1991-1-1, 6.3.1.2(10), Eq. (6.1)


def psi0(category: Category) -> float:
    """Combination factor psi0 of a category of use.

    EN 1990, Annex A1, Table A1.1 (recommended values).
    """
    return PSI_FACTORS[Category(category)].psi0


def alpha_n(n_storeys: int, psi_0: float, category: Category = Category.A) -> float:
    """Reduction factor on the imposed loads of n storeys above a column.

    EN 1991-1-1, 6.3.1.2(11), Eq. (6.2):
        alpha_n = (2 + (n - 2) psi0) / n
    It applies to categories A to D and to n > 2 storeys of the same category;
    otherwise the factor is 1.0.
    """
    if n_storeys < 0:
        msg = f"number of storeys must not be negative, got {n_storeys}"
        raise ValueError(msg)
    if Category(category) not in ALPHA_N_CATEGORIES or n_storeys <= 2:
        return 1.0
    return (2.0 + (n_storeys - 2) * psi_0) / n_storeys


def alpha_A(area_m2: float, psi_0: float, category: Category = Category.A) -> float:
    """Reduction factor on imposed load by loaded area.

    EN 1991-1-1, 6.3.1.2(10), Eq. (6.1):
        alpha_A = 5/7 psi0 + A0 / A <= 1.0,  A0 = 10.0 m2
    with alpha_A >= 0.6 for categories C and D. Categories A to E only;
    otherwise the factor is 1.0.
    """
    if area_m2 < 0:
        msg = f"loaded area must not be negative, got {area_m2} m2"
        raise ValueError(msg)
    cat = Category(category)
    if cat not in ALPHA_A_CATEGORIES or area_m2 == 0:
        return 1.0
    value = min(5.0 / 7.0 * psi_0 + A0_M2 / area_m2, 1.0)
    if cat in (Category.C, Category.D):
        value = max(value, 0.6)
    return value


def combination_factors(params: NationalParameters, combination: Combination) -> dict[str, tuple[float, float, bool]]:
    """Factors (on Gk, on Qk, psi0 applied) for each expression of a combination.

    EN 1990, Eq. (6.10): gamma_G Gk + gamma_Q Qk
    EN 1990, Eq. (6.10a): gamma_G Gk + gamma_Q psi0 Qk
    EN 1990, Eq. (6.10b): xi gamma_G Gk + gamma_Q Qk
    EN 1990, Table A1.2(B) gives gamma_G, gamma_Q and xi.
    """
    gG, gQ, xi = params.gamma_G, params.gamma_Q, params.xi
    if Combination(combination) is Combination.EQ_6_10:
        return {"6.10": (gG, gQ, False)}
    return {"6.10a": (gG, gQ, True), "6.10b": (xi * gG, gQ, False)}


def combine(
    Gk_kN: float, Qk_reduced_kN: float, psi0_Qk_kN: float, params: NationalParameters, combination: Combination
) -> tuple[float, str]:
    """Design value and the governing expression for one column cell.

    ``Qk_reduced_kN`` is the imposed load after alpha_n or alpha_A;
    ``psi0_Qk_kN`` is sum(psi0_i Qk_i) without them: when imposed loads are
    accompanying (6.10a) only one of psi and alpha applies,
    EN 1991-1-1, 3.3.1(2)P.
    EN 1990, Eq. (6.10): gamma_G Gk + gamma_Q Qk
    EN 1990, Eq. (6.10a): gamma_G Gk + gamma_Q psi0 Qk
    EN 1990, Eq. (6.10b): xi gamma_G Gk + gamma_Q Qk
    The less favourable (larger) of 6.10a and 6.10b governs.
    """
    best = (-float("inf"), "")
    for name, (fG, fQ, use_psi) in combination_factors(params, combination).items():
        value = fG * Gk_kN + fQ * (psi0_Qk_kN if use_psi else Qk_reduced_kN)
        if value > best[0]:
            best = (value, name)
    return best
