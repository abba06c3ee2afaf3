"""Cost and embodied carbon of each candidate (concept-stage rates).

Rates per tonne of steel, per m3 of concrete by grade, per m2 of formwork and of plan area, and the
embodied-carbon factors (A1-A3) of steel and concrete; the cost and carbon of every feasible
(cell, type) pair from its quantities.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:
    from optimizer.candidates.feasibility import Feasibility

__all__ = [
    "CostFactors",
    "DEFAULT_CARBON_CONCRETE",
    "DEFAULT_CARBON_STEEL",
    "CONCRETE_DENSITY",
    "carbon_per_m3",
    "candidate_cost_carbon",
]

# kgCO2e per m3 of concrete by fck (MPa), CEM I, ICE v3.0 (values recalled from memory, x 2,400 kg/m3).
DEFAULT_CARBON_CONCRETE = {
    20: 0.112,
    25: 0.119,
    28: 0.126,
    30: 0.138,
    32: 0.149,
    35: 0.159,
    40: 0.170,
    45: 0.180,
    50: 0.190,
    55: 0.200,
    60: 0.210,
}
DEFAULT_CARBON_STEEL = 1.99  # kgCO2e/kg, rebar world typical, ICE v3.0 (recalled from memory)
CONCRETE_DENSITY = 2400.0  # kg/m3 for converting ICE per-kg factors


def carbon_per_m3(fck: float, table: dict[float, float] | None = None) -> float:
    """kgCO2e per m3 for a strength fck, interpolated in the per-kg table (x 2,400 kg/m3)."""
    tab = table or DEFAULT_CARBON_CONCRETE
    keys = sorted(tab)
    if fck <= keys[0]:
        per_kg = tab[keys[0]]
    elif fck >= keys[-1]:
        per_kg = tab[keys[-1]]
    else:
        hi = next(k for k in keys if k >= fck)
        lo = max(k for k in keys if k <= fck)
        per_kg = tab[lo] if hi == lo else tab[lo] + (tab[hi] - tab[lo]) * (fck - lo) / (hi - lo)
    return per_kg * CONCRETE_DENSITY


@dataclass(frozen=True)
class CostFactors:
    """Rates for cost and embodied carbon (A1-A3)."""

    steel_per_t: float | None = None  # currency per tonne of reinforcement, fixed
    concrete_per_m3: dict[float, float] | None = None  # currency per m3 by fck
    formwork_per_m2: float | None = None
    plan_area_per_m2: float | None = None  # value of lettable floor area taken by columns, per m2 per floor
    currency: str = "EUR"
    steel_carbon_per_kg: float = DEFAULT_CARBON_STEEL
    concrete_carbon_per_kg: dict[float, float] = field(default_factory=lambda: dict(DEFAULT_CARBON_CONCRETE))
    carbon_source: str = "ICE v3.0 defaults (recalled from memory; verify)"

    @property
    def has_cost(self) -> bool:
        """True when money rates were given."""
        return self.steel_per_t is not None

    def concrete_rate(self, fck: float) -> float:
        """Currency per m3 for a strength fck (nearest class at or above; else the highest)."""
        if not self.concrete_per_m3:
            return 0.0
        keys = sorted(self.concrete_per_m3)
        above = [k for k in keys if k >= fck - 1e-9]
        return self.concrete_per_m3[above[0] if above else keys[-1]]


def candidate_cost_carbon(feas: Feasibility, costs: CostFactors) -> tuple[np.ndarray, np.ndarray]:
    """Cost and embodied carbon (A1-A3) per candidate from the rates of ``costs``.

    Cost = steel t x rate + concrete m3 x rate(grade) + formwork m2 x rate + plan m2 x rate
    (NaN when no money rates were given); carbon = steel kg x factor + concrete m3 x factor(grade).
    """
    # rates depend on the grade only: evaluate them once per type, then index by candidate
    type_fck = feas.catalogue_fck
    carbon_rate = np.array([carbon_per_m3(f, costs.concrete_carbon_per_kg) for f in type_fck])[feas.cand_type]
    carbon = feas.steel_kg * costs.steel_carbon_per_kg + feas.concrete_m3 * carbon_rate
    if not costs.has_cost:
        return np.full(feas.cand_cell.size, np.nan), carbon
    conc_rate = np.array([costs.concrete_rate(f) for f in type_fck])[feas.cand_type]
    cost = (
        feas.steel_kg / 1000.0 * costs.steel_per_t
        + feas.concrete_m3 * conc_rate
        + feas.formwork_m2 * (costs.formwork_per_m2 or 0.0)
        + feas.plan_m2 * (costs.plan_area_per_m2 or 0.0)
    )
    return cost, carbon
