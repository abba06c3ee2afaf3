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
from dataclasses import dataclass

from optimizer.building.model import Scenario
from optimizer.building.tables import MISSING, TomlTable
from optimizer.candidates.catalogue import reject_unknown
from optimizer.candidates.costs import DEFAULT_CARBON_CONCRETE, CostFactors
from optimizer.errors import InputError
from optimizer.schedule.problem import Objective, Rules, StepRule

__all__ = ["CostFactors", "SolverOptions", "RunSettings", "read_run_settings", "DEFAULT_CARBON_CONCRETE"]


@dataclass(frozen=True)
class SolverOptions:
    """How the integer program is solved."""

    solver: str = "highs"
    time_limit_s: float = 120.0
    gap_rel: float = 0.01
    formulation: str = "auto"  # "auto" (paths where valid), "paths" or "compact"; see optimizer.schedule.solve.solve


@dataclass(frozen=True)
class RunSettings:
    """Everything the optimiser needs besides the feasibility matrix."""

    rules: Rules
    objective: Objective
    solver: SolverOptions
    costs: CostFactors
    fire_rule: str = "flag"
    pinned: tuple[tuple[str, str, str, str, str | None], ...] = ()  # (stack, level, section, bars, grade)


def _grade_table(t: TomlTable, key: str) -> dict[float, float] | None:
    raw = t.raw(key, required=False)
    if raw is MISSING:
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


def read_run_settings(scenario: Scenario) -> RunSettings:  # noqa: PLR0912, PLR0915 - reads and validates three input tables, one branch per key
    """Rules, objective, solver options and rates from the scenario (defaults where absent)."""
    res = scenario.reserved
    src = scenario.source
    rules_kw: dict = {}
    fire_rule = "flag"
    pinned: tuple = ()
    if "rules" in res:
        t = TomlTable(src, "rules", dict(res["rules"]))
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
        if groups is not MISSING:
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
        reject_unknown(
            t,
            {
                "monotone_sections",
                "monotone_bars",
                "monotone_grade",
                "max_step_mm",
                "step_rule",
                "min_run",
                "max_types",
                "max_sections",
                "max_grades",
                "max_grade_changes",
                "price_per_type",
                "price_per_section",
                "groups",
                "pinned",
                "fire_outside_method",
            },
        )
    objective = Objective.STEEL
    solver = SolverOptions()
    if "optimizer" in res:
        t = TomlTable(src, "optimizer", dict(res["optimizer"]))
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
        t = TomlTable(src, "costs", dict(res["costs"]))
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
        reject_unknown(
            t,
            {
                "steel_per_t",
                "concrete_per_m3",
                "formwork_per_m2",
                "plan_area_per_m2",
                "currency",
                "steel_carbon_per_kg",
                "concrete_carbon_per_kg",
            },
        )
        costs = CostFactors(**kw)
    if objective is Objective.COST and not costs.has_cost:
        raise InputError(src, "costs.steel_per_t", None, "needed for objective = 'cost' (no default money rates)")
    return RunSettings(Rules(**rules_kw), objective, solver, costs, fire_rule, pinned)


def _read_pinned(scenario: Scenario, t: TomlTable) -> tuple:
    """``pinned = [{stack, level, section, bars, grade?}]``: cells that must take a given type."""
    raw = t.raw("pinned", required=False)
    if raw is MISSING:
        return ()
    if not isinstance(raw, list):
        raise InputError(
            t.file,
            t.key("pinned"),
            raw,
            'a list of tables {stack = "A1", level = "L01", section = "600x600", bars = "12H25"}',
        )
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
        out.append(
            (
                str(item["stack"]),
                str(item["level"]),
                str(item["section"]).replace(" ", ""),
                str(item["bars"]).replace(" ", ""),
                str(item["grade"]) if "grade" in item else None,
            )
        )
    return tuple(out)
