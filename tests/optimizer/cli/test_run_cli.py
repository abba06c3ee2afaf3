"""`colstack optimize` / `run` at the command line: exit codes, files, partial report, nothing half-written."""

import json

import pandas as pd
import pytest

from optimizer.cli import main
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

SCEN = paths.SCENARIOS


def test_optimize_small_building(tmp_path, capsys):
    out = tmp_path / "opt"
    assert (
        main(
            [
                "optimize",
                str(SCEN / "small_building.toml"),
                "--out",
                str(out),
                "--quiet",
                "--log-json",
                str(tmp_path / "log.jsonl"),
            ]
        )
        == 0
    )
    text = capsys.readouterr().out
    assert "types used" in text and "concept design" in text
    for name in ("schedule.csv", "cells.csv", "types.csv", "quantities.csv", "summary.json"):
        assert (out / name).exists()
    summary = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    assert summary["solver"]["status"] in ("optimal", "time limit")
    assert summary["max_utilisation"] <= 1.0
    cells = pd.read_csv(out / "cells.csv")
    assert (cells["utilisation"] <= 1.0).all()
    events = [json.loads(line) for line in (tmp_path / "log.jsonl").read_text(encoding="utf-8").splitlines()]
    assert any(e["stage"] == "feasibility matrix" for e in events)
    # levels top-down in the schedule
    sched = pd.read_csv(out / "schedule.csv")
    assert sched["level"].iloc[0] == "ROOF" and sched["level"].iloc[-1] == "L1"


def test_impossible_design_exit_3_writes_feasibility_report(tmp_path, capsys):
    csv = pd.read_csv(SCEN / "analysis_actions.csv")
    csv["NEd_kN"] = csv["NEd_kN"] * 40
    csv.to_csv(tmp_path / "analysis_actions.csv", index=False)
    (tmp_path / "s.toml").write_text((SCEN / "analysis_actions.toml").read_text(encoding="utf-8"), encoding="utf-8")
    out = tmp_path / "out"
    assert main(["optimize", str(tmp_path / "s.toml"), "--out", str(out), "--quiet"]) == 3
    err = capsys.readouterr().err
    assert "no design possible" in err and "stack" in err
    assert (out / "undesignable.csv").exists()
    assert json.loads((out / "summary.json").read_text(encoding="utf-8"))["status"] == "no design possible"


def test_refuses_to_write_into_the_scenario_folder(tmp_path, capsys):
    (tmp_path / "s.toml").write_text((SCEN / "small_building.toml").read_text(encoding="utf-8"), encoding="utf-8")
    assert main(["optimize", str(tmp_path / "s.toml"), "--out", str(tmp_path), "--quiet"]) == 2
    assert (tmp_path / "s.toml").exists()
    assert "--out" in capsys.readouterr().err


def test_bad_scenario_exit_2(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text(
        (SCEN / "small_building.toml").read_text(encoding="utf-8").replace("[project]", "[projekt]"), encoding="utf-8"
    )
    assert main(["optimize", str(bad), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "bad.toml" in err
    assert not (tmp_path / "o").exists()


@pytest.mark.parametrize(
    "rules",
    [
        "[rules]\nmin_run = 0\n",
        '[rules]\nstep_rule = "sometimes"\n',
        '[optimizer]\nobjective = "cost"\n',
        '[rules]\ngroups = [["A1", "Z9"]]\n',
    ],
)
def test_bad_rules_exit_2(tmp_path, capsys, rules):
    bad = tmp_path / "bad.toml"
    bad.write_text((SCEN / "small_building.toml").read_text(encoding="utf-8") + "\n" + rules, encoding="utf-8")
    assert main(["optimize", str(bad), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err.strip()
    assert "bad.toml" in err and len(err.splitlines()) == 1


@pytest.mark.parametrize("where", ["flag", "scenario"])
def test_path_formulation_asked_where_it_does_not_apply_exit_2(tmp_path, capsys, where):
    """A cap on grade changes per stack is a resource inside each path: the path formulation cannot be used,
    and asking for it (flag or scenario key) is a clean input error naming the reason, not a traceback."""
    text = (SCEN / "small_building.toml").read_text(encoding="utf-8")
    extra = "\n[rules]\nmax_grade_changes = 0\n" if "[rules]" not in text else ""
    text = text.replace("[rules]\n", "[rules]\nmax_grade_changes = 0\n", 1) + extra
    if where == "scenario":
        text = (
            text.replace("[optimizer]\n", '[optimizer]\nformulation = "paths"\n', 1)
            if "[optimizer]" in text
            else text + '\n[optimizer]\nformulation = "paths"\n'
        )
    bad = tmp_path / "gc.toml"
    bad.write_text(text, encoding="utf-8")
    args = ["optimize", str(bad), "--out", str(tmp_path / "o"), "--quiet"]
    assert main(args + (["--formulation", "paths"] if where == "flag" else [])) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "gc.toml" in err and "grade changes" in err
    assert ("--formulation" if where == "flag" else "optimizer.formulation") in err
    assert not (tmp_path / "o").exists()
