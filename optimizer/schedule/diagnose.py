"""Explain why a scheduling problem has no schedule.

The explanations go from the most local to the most global:

1. a cell with no candidate at all, or pinned to a type that fails there;
2. a stack that no path can climb: the first storey that no type allowed
   below can carry on, with the rule that blocks it (found by relaxing one rule
   at a time);
3. a stack that only the minimum run of sections defeats;
4. grouped stacks that share no buildable schedule;
5. a cap on distinct types or sections below the least number needed.

Each finding is one sentence naming the stack and the levels.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from optimizer.schedule.prepared import Prepared, run_states, transition
from optimizer.schedule.problem import Objective, Rules, ScheduleProblem, Status, StepRule
from optimizer.schedule.solve import SolveOptions, solve
from optimizer.schedule.stackpaths import levels_dp

__all__ = ["diagnose"]


def _relaxations(rules: Rules) -> list[tuple[str, Rules]]:
    out = []
    if rules.monotone_bars:
        out.append(("bars", replace(rules, monotone_bars=False)))
    if rules.monotone_sections:
        out.append(("sections", replace(rules, monotone_sections=False)))
    if rules.monotone_grade:
        out.append(("grade", replace(rules, monotone_grade=False)))
    if StepRule(rules.step_rule) is not StepRule.STARTERS:
        out.append(("step", replace(rules, step_rule=StepRule.STARTERS)))
    if rules.lap_steel_ratio_max is not None:
        out.append(("lap", replace(rules, lap_steel_ratio_max=None)))
    return out


def _blocked_sentence(
    problem: ScheduleProblem, stack: str, lv_up: str, lv_lo: str, lower_types: np.ndarray, upper_types: np.ndarray
) -> str:
    r = problem.rules
    culprits = []
    for what, relaxed in _relaxations(r):
        ok, _ = transition(replace(problem, rules=relaxed), lower_types, upper_types)
        if ok.any():
            culprits.append(what)
    phrases = {
        "bars": "more bars per face or larger bars",
        "sections": "a larger section or another shape",
        "grade": "a higher concrete grade",
        "step": (
            "a change of section, which is forbidden,"
            if StepRule(r.step_rule) is StepRule.FORBID_ANY
            else f"a size step of more than {r.max_step_mm:g} mm per face"
        ),
    }
    lap = r.lap_steel_ratio_max
    if culprits == ["lap"]:
        return (
            f"stack {stack}: at level {lv_up} every type laps with the bars of every type allowed below it "
            f"at {lv_lo} with more steel than {lap:g} Ac of the section above "
            "(As below + As above; EN 1992-1-1, 9.5.2(3))"
        )
    also = (
        f" (or a lap with more steel than {lap:g} Ac of the section above, EN 1992-1-1, 9.5.2(3))"
        if "lap" in culprits
        else ""
    )
    culprits = [c for c in culprits if c != "lap"]
    if culprits:
        need = " or ".join(phrases[c] for c in culprits)
        return (
            f"stack {stack}: level {lv_up} needs {need} than any type allowed below it at {lv_lo}{also}"
            if "step" not in culprits or len(culprits) > 1
            else f"stack {stack}: level {lv_up} needs {need} from every type allowed below it at {lv_lo}{also}"
        )
    return (
        f"stack {stack}: no type at level {lv_up} keeps the continuity rules together with the types "
        f"allowed below it at {lv_lo} (several rules combine)"
    )


def diagnose(problem: ScheduleProblem, time_limit_s: float = 30.0) -> list[str]:  # noqa: PLR0912, PLR0915 - one branch per rule it tries alone
    """Reasons why the problem has no schedule (empty when none is found).

    Args:
        problem: the problem.
        time_limit_s: time for the integer program that counts the types needed (cap checks only).

    Returns:
        Sentences naming stack and levels.
    """
    p = problem
    prep = Prepared(replace(p, rules=replace(p.rules, groups=())))
    out: list[str] = []
    empty_cells = set()
    for c in range(p.n_cells):
        stack, level = p.cell_names[c]
        ks = prep.order[prep.start[c] : prep.start[c + 1]]
        if len(ks) == 0:
            out.append(f"stack {stack}: level {level} has no type that passes its checks")
            empty_cells.add(c)
            continue
        if c in prep.pinned and not (p.cand_type[ks] == prep.pinned[c]).any():
            out.append(
                f"stack {stack}: level {level} is pinned to {p.types.mark[prep.pinned[c]]}, "
                "which does not pass its checks there"
            )
            empty_cells.add(c)
    m = run_states(p)
    stack_ok: dict[int, bool] = {}
    for unit in prep.units:
        s = unit.stacks[0]
        name = p.stack_names[s]
        chain = prep.chains[s]
        if any(int(c) in empty_cells for c in chain):
            stack_ok[s] = False
            continue
        sentences = []
        climbable = False
        for levels in unit.orients.values():
            reach = np.ones(len(levels[0].types), dtype=bool)
            blocked = None
            for i in range(1, len(levels)):
                ok, _ = transition(p, levels[i - 1].types[reach], levels[i].types)
                nxt = ok.any(axis=0)
                if not nxt.any():
                    blocked = i
                    break
                reach = nxt
            if blocked is None:
                climbable = True
                break
            i = blocked
            sentences.append(
                _blocked_sentence(
                    p,
                    name,
                    p.cell_names[int(chain[i])][1],
                    p.cell_names[int(chain[i - 1])][1],
                    levels[i - 1].types[reach],
                    levels[i].types,
                )
            )
        if not climbable:
            out.append(
                sentences[0]
                if len(set(sentences)) == 1
                else " ; ".join(f"{sen} (orientation {o})" for o, sen in enumerate(sentences))
            )
            stack_ok[s] = False
            continue
        if m > 1:
            feasible = any(levels_dp(p, levels, m)[1] is not None for levels in unit.orients.values())
            if not feasible:
                out.append(
                    f"stack {name}: no schedule holds each section for at least {m} storeys between "
                    f"levels {p.cell_names[int(chain[0])][1]} and {p.cell_names[int(chain[-1])][1]}"
                )
                stack_ok[s] = False
                continue
        stack_ok[s] = True
    if out:
        return out
    # groups
    full = Prepared(p)
    for text in full.problems:
        out.append(text)
    for unit in full.units:
        if len(unit.stacks) < 2:
            continue
        names = ", ".join(p.stack_names[s] for s in unit.stacks)
        feasible = False
        first_empty = None
        for levels in unit.orients.values():
            for i, lv in enumerate(levels):
                if len(lv.types) == 0 and first_empty is None:
                    first_empty = p.cell_names[int(unit.cells[i, 0])][1]
            if levels_dp(p, levels, m)[1] is not None:
                feasible = True
        if not feasible:
            if first_empty is not None:
                out.append(f"stacks {names} (grouped): no type is feasible in all of them at level {first_empty}")
            else:
                out.append(
                    f"stacks {names} (grouped): each is buildable alone but no single schedule fits all "
                    f"of them from level {p.cell_names[int(unit.cells[0, 0])][1]} to "
                    f"{p.cell_names[int(unit.cells[-1, 0])][1]}"
                )
    if out:
        return out
    out += _cap_findings(p, time_limit_s)
    return out


def _cap_findings(p: ScheduleProblem, time_limit_s: float) -> list[str]:
    """Compare the caps with the least number of types or sections any schedule needs (by the integer program)."""
    r = p.rules
    found = []
    zero = np.zeros(len(p.cand_cell))
    for what, cap, rules in (
        (
            "types",
            r.max_types,
            replace(r, max_types=None, max_sections=None, price_per_type=1.0, price_per_section=0.0),
        ),
        (
            "sections",
            r.max_sections,
            replace(r, max_types=None, max_sections=None, price_per_type=0.0, price_per_section=1.0),
        ),
    ):
        if cap is None:
            continue
        counting = replace(p, rules=rules, steel_kg=zero, cost=zero, carbon=zero, objective=Objective.STEEL)
        res = solve(counting, SolveOptions(time_limit_s=time_limit_s, gap_rel=0.0))
        if res.status is Status.INFEASIBLE:
            found.append("no schedule exists even without the caps")
            break
        need = int(np.ceil(res.bound - 1e-6)) if np.isfinite(res.bound) else None
        if need is not None and need > cap:
            found.append(f"the cap of {cap} distinct {what} is too small: every schedule needs at least {need}")
    return found
