"""The benchmark records (bench/record.py) and the figures DEVELOPERS.md quotes from them (bench/quote.py).

Fast: no benchmark runs here; tiny fake results stand in for the measured ones, and the page is
a DEVELOPERS-like text written to tmp_path (the real DEVELOPERS.md is not read).
"""

from __future__ import annotations

import importlib.util
import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from tests.support import paths

BENCH = paths.ROOT / "bench"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(f"bench_{name}", BENCH / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


record = _load("record")
quote = _load("quote")

TINY_INPUTS = {"n_sections": 3, "n_pairs": 12, "label": "tiny"}
TINY_FIGURES = {
    "total_s": 0.125,
    "pairs_per_s": 96.0,
    "peak_MB": 41.5,
    "target_s": 1.0,
    "ratio_to_target": 0.125,
    "stages_s": {"build": 0.025, "solve": 0.1},
    "gap_pct": np.float64(0.04),
    "n_types": np.int64(7),
    "missing_ms": float("nan"),
}

RESISTANCE_INPUTS = {
    "n_sections": 2,
    "n_NEd_per_section": 5,
    "n_pairs": 10,
    "NEd_from_ratio": -0.2,
    "NEd_to_ratio": 1.0,
    "n_scalar_sample": 2,
    "reference_library": "concreteproperties",
}
RESISTANCE_FIGURES = {
    "build_s": 0.01,
    "solve_s": 0.02,
    "total_s": 0.03,
    "pairs_per_s": 333.333,
    "target_pairs_per_s": 500_000,
    "ratio_to_target": 0.000666667,
    "peak_MB": 147.4,
    "target_peak_MB": 2048,
    "scalar_ms_per_pair": 38.2,
    "scalar_over_vectorised_x": 12.7,
    "scalar_max_rel_diff_ratio": 4.7e-11,
    "reference_ms_per_call": 615.0,
    "reference_over_vectorised_x": 205.0,
}


def _write(tmp_path: Path, name: str, inputs: dict, figures: dict) -> Path:
    started = record.machine(["numpy"])
    return record.write_result(
        name, started, inputs, figures, note="tiny fake result", results_dir=tmp_path, script=f"bench/bench_{name}.py"
    )


def _page(tmp_path: Path, blocks: str) -> Path:
    page = tmp_path / "DEVELOPERS.md"
    page.write_text(
        "# colstack\n\n## Benchmarks\n\n`make bench` runs the benchmarks.\n\n"
        + blocks
        + "\n## Working on an issue\n\nCommit early.\n",
        encoding="utf-8",
    )
    return page


def test_writer_produces_valid_json_with_the_machine_and_units_in_the_keys(tmp_path):
    path = _write(tmp_path, "tiny", TINY_INPUTS, TINY_FIGURES)
    assert path == tmp_path / "tiny.json"
    doc = json.loads(path.read_text(encoding="utf-8"))
    assert doc["schema"] == record.SCHEMA and doc["name"] == "tiny" and doc["note"] == "tiny fake result"
    m = doc["machine"]
    assert m["n_cpus"] >= 1 and m["python"].count(".") == 2 and m["numpy"] == np.__version__
    assert m["date"][:4].isdigit() and m["date"][4] == "-"
    assert doc["inputs"] == TINY_INPUTS
    f = doc["figures"]
    assert f["total_s"] == 0.125 and f["stages_s"] == {"build": 0.025, "solve": 0.1}
    assert f["gap_pct"] == 0.04 and f["n_types"] == 7 and isinstance(f["n_types"], int)
    assert f["missing_ms"] is None  # NaN is no JSON: a figure that could not be measured is null
    assert record.keys_without_unit(doc["inputs"]) == [] and record.keys_without_unit(doc["figures"]) == []
    for key in ("total_s", "pairs_per_s", "peak_MB", "target_s", "ratio_to_target", "gap_pct", "n_types"):
        assert record.has_unit(key), key


def test_writer_is_atomic_and_leaves_no_temporary_file(tmp_path):
    _write(tmp_path, "tiny", TINY_INPUTS, TINY_FIGURES)
    _write(tmp_path, "tiny", TINY_INPUTS, {**TINY_FIGURES, "total_s": 0.25})
    assert [p.name for p in tmp_path.iterdir()] == ["tiny.json"]
    assert json.loads((tmp_path / "tiny.json").read_text(encoding="utf-8"))["figures"]["total_s"] == 0.25


@pytest.mark.parametrize("figures", [{"total": 1.5}, {"cells": 3}, {"stages": {"build": 0.1}}, {"time": None}])
def test_writer_refuses_a_figure_whose_key_names_no_unit(tmp_path, figures):
    with pytest.raises(ValueError, match="no unit"):
        _write(tmp_path, "tiny", TINY_INPUTS, figures)
    assert list(tmp_path.iterdir()) == []


def test_labels_need_no_unit_and_units_are_read_from_the_key():
    assert record.keys_without_unit({"status": "optimal", "quick": True, "skipped": ["tower"]}) == []
    assert record.keys_without_unit({"cases": {"demo": {"runs": {"paths": {"time": 1.0}}}}}) == [
        "cases.demo.runs.paths.time"
    ]
    assert all(record.has_unit(k) for k in ("scalar_ms_per_pair", "steel_t", "speedup_x", "n_cells", "peak_GB"))
    assert not any(record.has_unit(k) for k in ("s", "cells", "status", "time", "x"))


@pytest.mark.parametrize(
    "name,inputs,figures", [("tiny", TINY_INPUTS, TINY_FIGURES), ("resistance", RESISTANCE_INPUTS, RESISTANCE_FIGURES)]
)
def test_check_passes_on_a_page_quoting_the_records_and_fails_on_a_changed_figure(
    tmp_path, capsys, name, inputs, figures
):
    results = tmp_path / "results"
    _write(results, name, inputs, figures)
    assert quote.main(["--results", str(results)]) == 0
    blocks = capsys.readouterr().out
    assert f"<!-- bench:{name} -->" in blocks and f"<!-- /bench:{name} -->" in blocks
    assert "| what | figure | target |" in blocks

    page = _page(tmp_path, blocks)
    assert quote.main(["--check", str(page), "--results", str(results)]) == 0

    # the words may change, the figures may not
    reworded = _page(tmp_path, blocks.replace("| what |", "| quantity |"))
    assert quote.main(["--check", str(reworded), "--results", str(results)]) == 0

    figure = "333" if name == "resistance" else "0.125"
    assert figure in blocks
    changed = _page(tmp_path, blocks.replace(figure, "405", 1))
    capsys.readouterr()
    assert quote.main(["--check", str(changed), "--results", str(results)]) == 1
    assert f"bench:{name}: figure" in capsys.readouterr().out


def test_check_fails_on_a_block_without_a_record_or_without_its_closing_marker(tmp_path, capsys):
    results = tmp_path / "results"
    _write(results, "tiny", TINY_INPUTS, TINY_FIGURES)
    orphan = _page(tmp_path, "<!-- bench:gone -->\n| a | 1 s | - |\n<!-- /bench:gone -->\n")
    assert quote.main(["--check", str(orphan), "--results", str(results)]) == 1
    assert "no record" in capsys.readouterr().out
    unclosed = _page(tmp_path, "<!-- bench:tiny -->\n| a | 1 s | - |\n")
    assert quote.main(["--check", str(unclosed), "--results", str(results)]) == 1
    assert "no closing marker" in capsys.readouterr().out


def test_check_runs_as_a_script(tmp_path):
    results = tmp_path / "results"
    _write(results, "tiny", TINY_INPUTS, TINY_FIGURES)
    page = _page(tmp_path, quote.quote(quote.load_results(results)))
    args = [sys.executable, str(BENCH / "quote.py"), "--results", str(results), "--check"]
    assert subprocess.run([*args, str(page)], capture_output=True, check=False).returncode == 0
    page.write_text(page.read_text(encoding="utf-8").replace("96", "97"), encoding="utf-8")
    assert subprocess.run([*args, str(page)], capture_output=True, check=False).returncode == 1


def test_significant_figures_as_the_tables_show_them():
    assert quote.sig(434866.0) == "435,000"
    assert quote.sig(2.29956) == "2.30"
    assert quote.sig(0.04) == "0.0400"
    assert quote.sig(None) == "-" and quote.sig(math.nan) == "-"
    assert quote.mem(147.4) == "147 MB" and quote.mem(1202.7) == "1.2 GB"
