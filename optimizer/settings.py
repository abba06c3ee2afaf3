"""Optimiser rules, objective, solver options and cost/carbon factors from a scenario.

Reads the scenario's ``[rules]``, ``[optimizer]`` and ``[costs]`` tables (all
optional; every key is documented in docs/scenario.md) with the same one-line
errors as the rest of the scenario.

Embodied-carbon factors (A1-A3) default to values recalled from memory of the
Inventory of Carbon and Energy (ICE) database v3.0 (Circular Ecology, 2019):
reinforcing bar, world typical, 1.99 kgCO2e/kg; ready-mixed concrete with
CEM I, per m3 at 2,400 kg/m3, by strength class (below). Verify them against
the current edition and the project's supply chain before use; override in
``[costs]``. Money costs have no default: a cost objective needs the user's
rates.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from optimizer.catalogue import reject_unknown
from optimizer.errors import InputError
from optimizer.problem import Objective, Rules, StepRule
from optimizer.scenario import _MISSING, Scenario, _Table

__all__ = ["CostFactors", "SolverOptions", "RunSettings", "read_run_settings", "DEFAULT_CARBON_CONCRETE"]

# kgCO2e per m3 of concrete by fck (MPa), CEM I, ICE v3.0 (values recalled from memory, x 2,400 kg/m3).
DEFAULT_CARBON_CONCRETE = {20: 0.112, 25: 0.119, 28: 0.126, 30: 0.138, 32: 0.149, 35: 0.159, 40: 0.170,
                           45: 0.180, 50: 0.190, 55: 0.200, 60: 0.210}
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


@dataclass(frozen=True)
class SolverOptions:
    """How the integer program is solved."""

    solver: str = "highs"
    time_limit_s: float = 120.0
    gap_rel: float = 0.01
    formulation: str = "auto"  # "auto" (paths where valid), "paths" or "compact"; see optimizer.ip.solve


@dataclass(frozen=True)
class RunSettings:
    """Everything the optimiser needs besides the feasibility matrix."""

    rules: Rules
    objective: Objective
    solver: SolverOptions
    costs: CostFactors
    fire_rule: str = "flag"
    pinned: tuple[tuple[str, str, str, str, str | None], ...] = ()  # (stack, level, section, bars, grade)


def _grade_table(t: _Table, key: str) -> dict[float, float] | None:
    raw = t.raw(key, required=False)
    if raw is _MISSING:
        return None
    if not isinstance(raw, dict) or not raw:
        raise InputError(t.file, t.key(key), raw, 'a table by grade, e.g. {"C30/37" = 150.0}')
    from design.materials import parse_concrete_class

    out = {}
    for name, value in raw.items():
        try:
            fck = parse_concrete_class(name)
        except ValueError as exc:
            raise InputError(t.file, f"{t.key(key)}.{name}", name, str(exc)) from None
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value < 0:
            raise InputError(t.file, f"{t.key(key)}.{name}", value, "a non-negative number")
        out[fck] = float(value)
    return out


def read_run_settings(scenario: Scenario) -> RunSettings:
    """Rules, objective, solver options and rates from the scenario (defaults where absent)."""
    res = scenario.reserved
    src = scenario.source
    rules_kw: dict = {}
    fire_rule = "flag"
    pinned: tuple = ()
    if "rules" in res:
        t = _Table(src, "rules", dict(res["rules"]))
        for key in ("monotone_sections", "monotone_bars", "monotone_grade"):
            v = t.bool_(key, required=False)
            if v is not None:
                rules_kw[key] = v
        v = t.num("max_step_mm", required=False, minimum=0)
        if v is not None:
            rules_kw["max_step_mm"] = v
        step = t.choice("step_rule", StepRule, required=False)
        if step is not None:
            rules_kw["step_rule"] = step
        v = t.num("min_run", required=False, minimum=1)
        if v is not None:
            if v != int(v):
                raise InputError(src, "rules.min_run", v, "a whole number of storeys")
            rules_kw["min_run"] = int(v)
        for key in ("max_types", "max_sections", "max_grades"):
            v = t.num(key, required=False, minimum=1)
            if v is not None:
                if v != int(v):
                    raise InputError(src, f"rules.{key}", v, "a whole number")
                rules_kw[key] = int(v)
        v = t.num("max_grade_changes", required=False, minimum=0)
        if v is not None:
            if v != int(v):
                raise InputError(src, "rules.max_grade_changes", v, "a whole number")
            rules_kw["max_grade_changes"] = int(v)
        for key in ("price_per_type", "price_per_section"):
            v = t.num(key, required=False, minimum=0)
            if v is not None:
                rules_kw[key] = v
        groups = t.raw("groups", required=False)
        if groups is not _MISSING:
            if not isinstance(groups, list) or not all(isinstance(g, list) and len(g) >= 2 for g in groups):
                raise InputError(src, "rules.groups", groups, 'a list of stack lists, e.g. [["A1", "A6"]]')
            known = {s.id for s in scenario.stacks}
            for g in groups:
                for sid in g:
                    if sid not in known:
                        raise InputError(src, "rules.groups", sid, "a stack id of the scenario")
            rules_kw["groups"] = tuple(tuple(str(x) for x in g) for g in groups)
        pinned = _read_pinned(scenario, t)
        fr = t.str_("fire_outside_method", required=False)
        if fr is not None:
            if fr not in ("fail", "flag"):
                raise InputError(src, "rules.fire_outside_method", fr, "'fail' or 'flag'")
            fire_rule = fr
        reject_unknown(t, {"monotone_sections", "monotone_bars", "monotone_grade", "max_step_mm", "step_rule",
                           "min_run", "max_types", "max_sections", "max_grades", "max_grade_changes", "price_per_type",
                           "price_per_section", "groups",
                           "pinned", "fire_outside_method"})
    objective = Objective.STEEL
    solver = SolverOptions()
    if "optimizer" in res:
        t = _Table(src, "optimizer", dict(res["optimizer"]))
        objective = t.choice("objective", Objective, required=False, default=Objective.STEEL)
        name = t.str_("solver", required=False, default="highs")
        if name not in ("highs", "cbc"):
            raise InputError(src, "optimizer.solver", name, "'highs' or 'cbc'")
        tl = t.num("time_limit_s", required=False, positive=True)
        gap = t.num("gap", required=False, minimum=0, maximum=1)
        form = t.str_("formulation", required=False, default="auto")
        if form not in ("auto", "paths", "compact"):
            raise InputError(src, "optimizer.formulation", form, "'auto', 'paths' or 'compact'")
        solver = SolverOptions(name, tl if tl is not None else 120.0, gap if gap is not None else 0.01, form)
        reject_unknown(t, {"objective", "solver", "time_limit_s", "gap", "formulation"})
    costs = CostFactors()
    if "costs" in res:
        t = _Table(src, "costs", dict(res["costs"]))
        kw: dict = {}
        for key in ("steel_per_t", "formwork_per_m2", "plan_area_per_m2", "steel_carbon_per_kg"):
            v = t.num(key, required=False, minimum=0)
            if v is not None:
                kw[key] = v
        conc = _grade_table(t, "concrete_per_m3")
        if conc is not None:
            kw["concrete_per_m3"] = conc
        carb = _grade_table(t, "concrete_carbon_per_kg")
        if carb is not None:
            kw["concrete_carbon_per_kg"] = carb
            kw["carbon_source"] = "given in the scenario"
        cur = t.str_("currency", required=False)
        if cur is not None:
            kw["currency"] = cur
        reject_unknown(t, {"steel_per_t", "concrete_per_m3", "formwork_per_m2", "plan_area_per_m2", "currency",
                           "steel_carbon_per_kg", "concrete_carbon_per_kg"})
        costs = CostFactors(**kw)
    if objective is Objective.COST and not costs.has_cost:
        raise InputError(src, "costs.steel_per_t", None, "needed for objective = 'cost' (no default money rates)")
    return RunSettings(Rules(**rules_kw), objective, solver, costs, fire_rule, pinned)


def _read_pinned(scenario: Scenario, t: _Table) -> tuple:
    """``pinned = [{stack, level, section, bars, grade?}]``: cells that must take a given type."""
    raw = t.raw("pinned", required=False)
    if raw is _MISSING:
        return ()
    if not isinstance(raw, list):
        raise InputError(t.file, t.key("pinned"), raw,
                         'a list of tables {stack = "A1", level = "L01", section = "600x600", bars = "12H25"}')
    out = []
    for i, item in enumerate(raw):
        key = f"{t.key('pinned')}[{i}]"
        if not isinstance(item, dict) or not {"stack", "level", "section", "bars"} <= set(item):
            raise InputError(t.file, key, item, "a table with stack, level, section and bars (and optionally grade)")
        extra = set(item) - {"stack", "level", "section", "bars", "grade"}
        if extra:
            raise InputError(t.file, f"{key}.{sorted(extra)[0]}", item[sorted(extra)[0]], "unknown key")
        if not scenario.has_cell((str(item["stack"]), str(item["level"]))):
            raise InputError(t.file, key, f"{item['stack']} at {item['level']}", "a cell of the scenario")
        out.append((str(item["stack"]), str(item["level"]), str(item["section"]).replace(" ", ""),
                    str(item["bars"]).replace(" ", ""), str(item["grade"]) if "grade" in item else None))
    return tuple(out)
