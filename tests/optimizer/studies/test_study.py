"""`colstack study`: the same figures sequentially, on local processes and on Dask; failures, reruns, bad files.

One small study of the small building (two grades x two bar sets on a 100 mm module) is shared by the tests:
two variants run, the two with 6 mm bars fail at once (the catalogue has no column type).
"""

import argparse
import json
import shutil
from pathlib import Path

import pandas as pd
import pytest

from optimizer import CAUTION
from optimizer.building.scenario import load_scenario
from optimizer.candidates.catalogue import read_catalogue_spec
from optimizer.errors import ColstackError, InputError
from optimizer.pipeline.settings import read_run_settings
from optimizer.studies.study import _FIGURES, _pareto, run_study
from optimizer.studies.study_spec import load_study, variant_scenario
from tests.support import paths

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

ROOT = paths.ROOT
SMALL = ROOT / "scenarios" / "small_building.toml"

STUDY = f"""
[study]
name = "test study"
scenario = "{SMALL.as_posix()}"

[vary]
grades = ["C30/37", "C40/50"]
bar_dias = [[16, 20, 25, 32], [6]]
size_step_mm = [100]
"""


def _cli(argv: list[str]) -> int:
    """`colstack study ...` with the error handling of optimizer.cli.main (one line, exit status)."""
    import sys

    from optimizer.cli import study as cli_study

    parser = argparse.ArgumentParser(prog="colstack")
    sub = parser.add_subparsers(dest="command")
    cli_study.add_parser(sub)
    args = parser.parse_args(argv)
    try:
        return cli_study.run(args)
    except ColstackError as exc:
        print(f"colstack study: error: {exc}", file=sys.stderr)
        return exc.exit_code


def _figures(table: pd.DataFrame) -> pd.DataFrame:
    return table[["id", "name", "status", "error", *_FIGURES]].reset_index(drop=True)


@pytest.fixture(scope="module")
def study_file(tmp_path_factory) -> Path:
    p = tmp_path_factory.mktemp("study") / "study.toml"
    p.write_text(STUDY, encoding="utf-8")
    return p


@pytest.fixture(scope="module")
def sequential(study_file, tmp_path_factory):
    out = tmp_path_factory.mktemp("seq") / "out"
    study = load_study(study_file)
    outcome = run_study(study, out, workers=1)
    return study, outcome, out


def test_study_variants_ids_and_names(study_file):
    study = load_study(study_file)
    assert len(study.variants) == 4
    assert len({v.id for v in study.variants}) == 4
    assert [v.name for v in study.variants] == [
        "C30/37, bars 16/20/25/32",
        "C30/37, bars 6",
        "C40/50, bars 16/20/25/32",
        "C40/50, bars 6",
    ]
    again = load_study(study_file)  # ids are stable
    assert [v.id for v in again.variants] == [v.id for v in study.variants]


def test_variant_scenario_applies_overrides():
    base = load_scenario(SMALL)
    sc = variant_scenario(
        base,
        {
            "grades": "C40/50",
            "size_step_mm": 100,
            "bar_dias": [20, 25],
            "max_types": 4,
            "min_run": 2,
            "steel_carbon_per_kg": 1.2,
            "objective": "carbon",
        },
    )
    spec = read_catalogue_spec(sc)
    assert (spec.size_min, spec.size_max, spec.size_step) == (250, 1200, 100)
    assert spec.bar_dias == (20.0, 25.0)
    st = read_run_settings(sc)
    assert st.rules.max_types == 4 and st.rules.min_run == 2
    assert st.costs.steel_carbon_per_kg == pytest.approx(1.2) and st.objective.value == "carbon"
    assert sc.materials.fck_MPa == 40 and all(c.settings.fck_MPa == 40 for c in sc.cells)
    assert base.materials.fck_MPa == 30 and "catalogue" not in base.reserved  # base untouched


def test_sequential_results_failures_and_files(sequential):
    study, outcome, out = sequential
    t = outcome.table
    assert list(t["status"]) == ["ok", "failed", "ok", "failed"]
    assert outcome.computed == 4 and outcome.skipped == 0 and outcome.failed == 2 and outcome.ok == 2
    for err in t.loc[t["status"] == "failed", "error"]:
        assert "generates no column type" in err and "\n" not in err
    ok = t[t["status"] == "ok"]
    assert list(ok["grades_used"]) == ["C30/37", "C40/50"]
    assert (ok["steel_t"] > 0).all() and (ok["types"] >= 1).all()
    assert (ok["largest_ground_column"].str.contains("H")).all()
    # one result file per variant, each with the caution; no temporary files left
    files = sorted((out / "runs").iterdir())
    assert sorted(f.name for f in files) == sorted(f"{v.id}.json" for v in study.variants)
    for f in files:
        rec = json.loads(f.read_text(encoding="utf-8"))
        assert rec["caution"] == CAUTION and rec["status"] in ("ok", "failed")
    assert not [p for p in out.rglob("*tmp*")]
    # summary files
    csv = pd.read_csv(out / "results.csv")
    assert list(csv["id"]) == list(t["id"]) and (csv["caution"] == CAUTION).all()
    assert csv.loc[0, "steel_t"] == pytest.approx(t.loc[0, "steel_t"])
    xl = pd.read_excel(out / "results.xlsx", sheet_name=None)
    assert set(xl) == {"Results", "About"} and CAUTION in xl["About"]["value"].tolist()
    assert len(xl["Results"]) == 4
    text = (out / "summary.txt").read_text(encoding="utf-8")
    assert text.startswith(CAUTION) and "failed: 2" in text
    for name in ("tradeoff_steel_types.png", "tradeoff_carbon_steel.png", "tradeoff_steel_plan_area.png"):
        assert (out / name).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_parallel_local_processes_same_figures(sequential, study_file, tmp_path):
    _, seq, _ = sequential
    outcome = run_study(load_study(study_file), tmp_path / "par", workers=2)
    assert outcome.computed == 4
    pd.testing.assert_frame_equal(_figures(outcome.table), _figures(seq.table))


def test_dask_cluster_same_figures(sequential, study_file, tmp_path):
    distributed = pytest.importorskip("distributed")
    _, seq, _ = sequential
    with distributed.LocalCluster(
        processes=False, n_workers=1, threads_per_worker=2, dashboard_address=None
    ) as cluster:
        outcome = run_study(load_study(study_file), tmp_path / "dask", scheduler=cluster.scheduler_address)
    assert outcome.computed == 4
    pd.testing.assert_frame_equal(_figures(outcome.table), _figures(seq.table))


def test_rerun_skips_finished_variants(sequential, study_file, tmp_path, monkeypatch):
    import optimizer.studies.study as study_mod

    _, seq, out = sequential
    work = tmp_path / "again"
    shutil.copytree(out, work)
    calls = []
    real = study_mod.run_variant

    def counting(*args, **kw):
        calls.append(args[2])
        return real(*args, **kw)

    monkeypatch.setattr(study_mod, "run_variant", counting)
    study = load_study(study_file)
    outcome = run_study(study, work, workers=1)
    assert calls == [] and outcome.computed == 0 and outcome.skipped == 4
    pd.testing.assert_frame_equal(_figures(outcome.table), _figures(seq.table))
    # a lost result file is computed again, and only that one (a failing variant: fast)
    failed = study.variants[1]
    (work / "runs" / f"{failed.id}.json").unlink()
    outcome = run_study(study, work, workers=1)
    assert calls == [failed.variables] and outcome.computed == 1 and outcome.skipped == 3
    # a result computed for other inputs (e.g. an edited base scenario) is not reused
    path = work / "runs" / f"{failed.id}.json"
    rec = json.loads(path.read_text(encoding="utf-8"))
    path.write_text(json.dumps({**rec, "inputs": "something else"}), encoding="utf-8")
    calls.clear()
    run_study(study, work, workers=1)
    assert calls == [failed.variables]
    # failures are kept, unless asked to retry them
    calls.clear()
    outcome = run_study(study, work, workers=1, retry_failed=True)
    assert calls == [study.variants[1].variables, study.variants[3].variables]
    assert outcome.computed == 2


def test_interrupted_study_keeps_finished_results(study_file, tmp_path, monkeypatch):
    import optimizer.studies.study as study_mod

    calls = []
    interrupt = [True]

    def fake(scenario_path, scenario_text, variables, time_limit_s=None):
        calls.append(variables)
        if len(calls) == 2 and interrupt[0]:
            interrupt[0] = False
            raise KeyboardInterrupt
        return {
            "status": "ok",
            "error": "",
            "warnings": [],
            "elapsed_s": 0.0,
            "figures": {
                "grades_used": variables["grades"],
                "steel_t": 1.0,
                "types": 1,
                "carbon_tCO2e": 2.0,
                "concrete_m3": 3.0,
                "column_plan_area_m2": 4.0,
                "cost": None,
            },
        }

    monkeypatch.setattr(study_mod, "run_variant", fake)
    study = load_study(study_file)
    out = tmp_path / "out"
    with pytest.raises(KeyboardInterrupt):
        run_study(study, out, workers=1)
    # the first result is kept, complete; nothing half-written; no summary yet
    assert [p.name for p in (out / "runs").iterdir()] == [f"{study.variants[0].id}.json"]
    assert json.loads((out / "runs" / f"{study.variants[0].id}.json").read_text(encoding="utf-8"))["status"] == "ok"
    assert not (out / "results.csv").exists()
    calls.clear()
    outcome = run_study(study, out, workers=1)
    assert calls == [v.variables for v in study.variants[1:]]
    assert outcome.skipped == 1 and outcome.computed == 3 and (outcome.table["status"] == "ok").all()


def test_cli_rerun_prints_caution_and_counts(sequential, study_file, tmp_path, capsys):
    _, _, out = sequential
    work = tmp_path / "cli"
    shutil.copytree(out, work)
    assert _cli(["study", str(study_file), "--out", str(work), "--quiet"]) == 0
    text = capsys.readouterr().out
    assert CAUTION in text and "0 run now, 4 kept from before, 2 with results, 2 failed" in text


def test_pareto_front():
    pts = [(3, 4.96), (6, 4.74), (3, 4.89), (6, 4.67), (4, 4.95), (5, 4.70)]
    assert _pareto(pts) == [(3, 4.89), (5, 4.70), (6, 4.67)]


BAD = [
    ("[study]\nscenario = 'S'\n[vary]\ngrade = ['C40/50']\n", "vary.grade", "did you mean 'grades'"),
    ("[study]\nscenario = 'S'\nmax_types = [3]\n", "study.max_types", "under [vary]"),
    ("grades = ['C40/50']\n[study]\nscenario = 'S'\n", "grades", "under [vary]"),
    ("[studdy]\nscenario = 'S'\n", "studdy", "did you mean 'study'"),
    ("[study]\nname = 'x'\n", "study.scenario", "base scenario"),
    ("[study]\nscenario = 'missing.toml'\n", "study.scenario", "existing scenario file"),
    ("[study]\nscenario = 'S'\n[vary]\ngrades = ['C40/55']\n", "vary.grades", "concrete class"),
    ("[study]\nscenario = 'S'\n[vary]\nbar_dias = [16, 20]\n", "vary.bar_dias", "list of lists"),
    ("[study]\nscenario = 'S'\n[vary]\nmax_types = [0, 4]\n", "vary.max_types", "whole numbers"),
    ("[study]\nscenario = 'S'\n[vary]\nmin_run = [1.5]\n", "vary.min_run", "whole numbers"),
    ("[study]\nscenario = 'S'\n[vary]\nsize_step_mm = 50\n", "vary.size_step_mm", "list of section size steps"),
    ("[study]\nscenario = 'S'\n[vary]\ngrades = ['C40/50', 'c40/50']\n", "vary.grades", "repeat"),
    ("[study]\nscenario = 'S'\n[vary]\nobjective = ['weight']\n", "vary.objective", "objectives"),
    ("[study]\nscenario = 'S'\ntime_limit_s = -1\n", "study.time_limit_s", "above 0"),
    ("[study\nscenario = 'S'\n", "(syntax)", "valid TOML"),
]


@pytest.mark.parametrize(("text", "field", "expected"), BAD, ids=[b[1] + str(i) for i, b in enumerate(BAD)])
def test_bad_study_files(tmp_path, text, field, expected):
    p = tmp_path / "bad.toml"
    p.write_text(text.replace("'S'", f"'{SMALL.as_posix()}'"), encoding="utf-8")
    with pytest.raises(InputError) as exc:
        load_study(p)
    assert exc.value.field == field and exc.value.file == str(p)
    assert expected in str(exc.value) and "\n" not in str(exc.value)


def test_bad_study_at_the_command_line_one_line_exit_2(tmp_path, capsys):
    p = tmp_path / "bad.toml"
    p.write_text(f"[study]\nscenario = '{SMALL.as_posix()}'\n[vary]\nmax_typs = [3]\n", encoding="utf-8")
    assert _cli(["study", str(p), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "bad.toml" in err and "max_types" in err
    assert not (tmp_path / "o").exists()
    assert _cli(["study", str(p), "--out", str(tmp_path / "o"), "--workers", "0"]) == 2
    assert "--workers" in capsys.readouterr().err


def test_output_folder_guards(study_file, tmp_path):
    study = load_study(study_file)
    with pytest.raises(InputError, match="--out"):  # the study's own folder
        run_study(study, study_file.parent, workers=1)
    foreign = tmp_path / "mine"
    foreign.mkdir()
    (foreign / "notes.txt").write_text("keep me", encoding="utf-8")
    with pytest.raises(InputError, match="empty folder"):
        run_study(study, foreign, workers=1)
    assert (foreign / "notes.txt").read_text(encoding="utf-8") == "keep me"
    assert sorted(p.name for p in foreign.iterdir()) == ["notes.txt"]


def test_bad_scheduler_address_is_an_input_error(study_file, tmp_path):
    pytest.importorskip("distributed")
    with pytest.raises(InputError) as exc:
        run_study(load_study(study_file), tmp_path / "o", scheduler="nonsense")
    assert exc.value.field == "--scheduler" and "tcp://HOST:8786" in str(exc.value)
    assert not (tmp_path / "o").exists()
