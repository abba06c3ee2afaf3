"""The record a benchmark leaves: one JSON file ``bench/results/<name>.json`` per script.

Every script measures, prints its figures as before, and hands the same figures to
:func:`write_result`, which writes them with the machine they were measured on. DEVELOPERS.md
quotes these files through ``bench/quote.py`` instead of hand-copied numbers.

Schema (``"schema": 1``)::

    {
      "schema": 1,
      "name": "resistance",                  # the file's stem
      "script": "bench/bench_resistance.py",
      "machine": {"n_cpus": 2, "python": "3.11.2", "numpy": "1.26.4", "platform": "...",
                  "date": "2026-12-02T08:00:00+00:00", "commit": "7fb2eb7...",
                  "load_1min_at_start": 0.8,
                  "load_1min_at_end": 1.9, "packages": {"highspy": "1.7.2"}},
      "inputs": {...},                       # the sizes the benchmark ran on
      "figures": {...},                      # every figure it prints
      "note": "..."                          # optional, free text
    }

Units are in the key names. In ``inputs`` and ``figures`` every number (and every ``null``,
a figure that could not be measured) sits under a key that ends with a unit of :data:`UNITS`,
optionally "per" something (``total_s``, ``pairs_per_s``, ``peak_MB``, ``gap_pct``,
``scalar_ms_per_pair``; ``_x`` is "times", ``_ratio`` and ``_pct`` are dimensionless), or starts
with a dimensionless prefix (:data:`UNIT_PREFIXES`: ``n_cells`` is a count, ``ratio_to_target``
a ratio), or inside a mapping whose own key carries the unit (``"stages_s": {"takedown": 3.1}``).
Strings (labels, statuses) need no unit. ``machine`` is metadata and exempt.

Not a package module: the scripts run as ``python bench/<script>.py``, which puts ``bench/`` on
``sys.path``, and import this file as ``record``.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import platform
import re
import subprocess
import sys
import tempfile
from collections.abc import Iterable, Mapping
from datetime import UTC, datetime
from importlib import metadata
from pathlib import Path

import numpy as np

SCHEMA = 1
RESULTS_DIR = Path(__file__).resolve().parent / "results"
UNITS = ("s", "ms", "min", "MB", "GB", "mm", "m", "kN", "kNm", "MPa", "kg", "t", "pct", "x", "ratio")
UNIT_PREFIXES = ("n_", "ratio_")
UNIT_KEY = re.compile(rf"_({'|'.join(UNITS)})(_per_[a-z]+)?$")
SIGNIFICANT_DIGITS = 6


def load_1min() -> float | None:
    """The 1-minute load average of the machine, or None where the system has none."""
    try:
        return round(os.getloadavg()[0], 2)
    except (AttributeError, OSError):
        return None


def commit() -> str | None:
    """The git commit the benchmarks were run from (None outside a git checkout)."""
    try:
        out = subprocess.run(
            ["git", "-C", str(RESULTS_DIR.parent.parent), "rev-parse", "HEAD"],
            capture_output=True,
            text=True,
            timeout=10,
            check=False,
        )
    except (OSError, subprocess.SubprocessError):
        return None
    return (out.stdout.strip() or None) if out.returncode == 0 else None


def machine(packages: Iterable[str] = ()) -> dict:
    """What the figures were measured on; call it when the benchmark starts.

    Args:
        packages: distribution names whose installed versions are recorded beside numpy
            (a missing one is recorded as None).
    """
    versions = {}
    for p in packages:
        try:
            versions[p] = metadata.version(p)
        except metadata.PackageNotFoundError:
            versions[p] = None
    return {
        "n_cpus": os.cpu_count(),
        "python": platform.python_version(),
        "numpy": np.__version__,
        "platform": platform.platform(),
        "date": datetime.now(UTC).isoformat(timespec="seconds"),
        "commit": commit(),
        "load_1min_at_start": load_1min(),
        "packages": versions,
    }


def has_unit(key: str) -> bool:
    """Whether a key names its unit (see the module notes)."""
    return bool(UNIT_KEY.search(key)) or key.startswith(UNIT_PREFIXES)


def keys_without_unit(tree: object, path: str = "", unit_above: bool = False) -> list[str]:
    """Paths (``figures.cases.demo.time``) of the numbers whose key names no unit.

    Args:
        tree: the ``inputs`` or ``figures`` mapping, nested mappings and lists allowed.
        path: the dotted path of ``tree`` itself, for the messages.
        unit_above: whether an enclosing key already carries the unit.
    """
    bad: list[str] = []
    if isinstance(tree, Mapping):
        for k, v in tree.items():
            here = f"{path}.{k}" if path else str(k)
            named = unit_above or has_unit(str(k))
            if isinstance(v, Mapping | list | tuple):
                bad += keys_without_unit(v, here, named)
            elif (v is None or (isinstance(v, int | float) and not isinstance(v, bool))) and not named:
                bad.append(here)
    elif isinstance(tree, list | tuple):
        for i, v in enumerate(tree):
            bad += keys_without_unit(v, f"{path}[{i}]", unit_above)
    return bad


def plain(value: object) -> object:
    """``value`` as plain JSON data: numpy scalars and arrays unwrapped, NaN and inf as None.

    Floats keep :data:`SIGNIFICANT_DIGITS` significant digits (timings carry no more).
    """
    if isinstance(value, Mapping):
        return {str(k): plain(v) for k, v in value.items()}
    if isinstance(value, list | tuple | np.ndarray):
        return [plain(v) for v in value]
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float):
        return float(f"{value:.{SIGNIFICANT_DIGITS}g}") if math.isfinite(value) else None
    return value


def result_document(
    name: str, script: str, machine_info: Mapping, inputs: Mapping, figures: Mapping, note: str | None = None
) -> dict:
    """The JSON document of one benchmark run, checked for units.

    Args:
        name: the result's name (the file is ``<name>.json``).
        script: the script that measured it, relative to the repository.
        machine_info: :func:`machine` as called at the start; the load at the end is added here.
        inputs: the sizes the benchmark ran on.
        figures: every figure the benchmark printed.
        note: free text kept with the figures (e.g. "machine shared with test runs").

    Raises:
        ValueError: a number in ``inputs`` or ``figures`` sits under a key that names no unit.
    """
    doc = {
        "schema": SCHEMA,
        "name": name,
        "script": script,
        "machine": {**plain(machine_info), "load_1min_at_end": load_1min()},
        "inputs": plain(inputs),
        "figures": plain(figures),
    }
    if note:
        doc["note"] = note
    bad = keys_without_unit(doc["inputs"], "inputs") + keys_without_unit(doc["figures"], "figures")
    if bad:
        msg = (
            f"benchmark result {name!r}: no unit in the key of {', '.join(bad)}; expected a key ending in "
            f"_<unit> or _<unit>_per_<thing> with a unit among {', '.join(UNITS)}, or starting with "
            f"{' or '.join(UNIT_PREFIXES)}"
        )
        raise ValueError(msg)
    return doc


def write_atomic(path: Path, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename."""
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    umask = os.umask(0)
    os.umask(umask)
    try:
        os.chmod(tmp, 0o666 & ~umask)  # mkstemp makes it private; a record is an ordinary file
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_result(
    name: str,
    machine_info: Mapping,
    inputs: Mapping,
    figures: Mapping,
    note: str | None = None,
    results_dir: Path = RESULTS_DIR,
    script: str | None = None,
) -> Path:
    """Write ``<results_dir>/<name>.json`` atomically and return its path (arguments as :func:`result_document`).

    Args:
        name: the result's name.
        machine_info: :func:`machine` as called at the start.
        inputs: the sizes the benchmark ran on.
        figures: every figure the benchmark printed.
        note: free text kept with the figures.
        results_dir: the folder (``bench/results`` unless a test says otherwise).
        script: the measuring script; by default the one running, relative to the repository.
    """
    if script is None:
        main = Path(sys.argv[0]).resolve()
        root = RESULTS_DIR.parent.parent
        script = main.relative_to(root).as_posix() if main.is_relative_to(root) else main.name
    doc = result_document(name, script, machine_info, inputs, figures, note)
    path = Path(results_dir) / f"{name}.json"
    write_atomic(path, json.dumps(doc, indent=2, allow_nan=False) + "\n")
    return path


def argument_parser(doc: str | None) -> argparse.ArgumentParser:
    """The command line every benchmark takes: ``--note TEXT`` kept in its JSON (scripts may add more).

    Args:
        doc: the script's docstring; its first line describes the command.
    """
    ap = argparse.ArgumentParser(description=(doc or "").strip().splitlines()[0] if doc else None)
    ap.add_argument(
        "--note",
        help="free text kept with the figures in bench/results/<name>.json (e.g. 'machine shared with test runs')",
    )
    return ap
