"""Parametric studies: the whole optimisation of one building over a grid of choices.

The study file and its variants are read by ``optimizer.studies.study_spec``
(:func:`~optimizer.studies.study_spec.load_study`). Each variant is rebuilt
from plain data (the scenario text and a dict of variables) wherever it runs,
so it can be sent to a local worker process or to a Dask distributed cluster.

Results are kept as they arrive: one JSON file per variant under
``OUT/runs/``, written atomically (temporary file, then ``os.replace``), so an
interrupted study loses only the variants that were running; a rerun skips
every variant whose result file exists for the same inputs. At the end the
study writes ``results.csv``, ``results.xlsx``, ``summary.txt`` and the
trade-off charts (PNG). See docs/studies.md.
"""

from __future__ import annotations

import asyncio
import concurrent.futures
import json
import multiprocessing
import os
import socket
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pandas as pd

from optimizer import CAUTION, __version__
from optimizer.building import load_scenario_text
from optimizer.errors import InputError
from optimizer.pipeline.run import run_scenario
from optimizer.studies.compare import compare_sentences, result_row
from optimizer.studies.study_spec import STUDY_VARIABLES, Study, StudyOutcome, StudyVariant, bars_text, variant_scenario

__all__ = ["run_variant", "run_study", "results_table", "plot_tradeoffs"]

Progress = Callable[[str, int, int], None]


# ---------------------------------------------------------------------------------------------------------------
# One variant (runs in a worker)


def _one_line(exc: BaseException) -> str:
    text = " ".join(str(exc).split())
    return f"{type(exc).__name__}: {text}" if text else type(exc).__name__


def run_variant(
    scenario_path: str, scenario_text: str, variables: dict[str, Any], time_limit_s: float | None = None
) -> dict:
    """Run one variant from plain data and return its record (never raises for a failing run).

    Picklable in and out, so it can run in a local worker process or on a Dask worker. The record holds
    ``status`` ("ok" or "failed"), ``error`` (one line), ``figures`` (:func:`optimizer.studies.compare.result_row`
    without the name), the run's ``warnings``, ``elapsed_s`` and where it ran.
    """
    t0 = time.perf_counter()
    rec: dict[str, Any] = {
        "status": "failed",
        "error": "",
        "figures": {},
        "warnings": [],
        "host": socket.gethostname(),
        "pid": os.getpid(),
    }
    try:
        p = Path(scenario_path)
        base = load_scenario_text(scenario_text, source=str(p), base_dir=p.parent)
        r = run_scenario(variant_scenario(base, variables), time_limit_s=time_limit_s)
        figures = result_row("", r)
        figures.pop("variant", None)
        rec.update(status="ok", figures=figures, warnings=list(r.warnings))
    except Exception as exc:  # a failing variant is a result, not a crash of the study
        rec["error"] = _one_line(exc)
    rec["elapsed_s"] = round(time.perf_counter() - t0, 2)
    return rec


# ---------------------------------------------------------------------------------------------------------------
# Files


def _write_atomic(path: Path, write: Callable[[Path], None]) -> None:
    """Write ``path`` through a temporary file in the same folder, then ``os.replace``."""
    tmp = path.with_name(f".{path.stem}.tmp-{os.getpid()}{path.suffix}")
    try:
        write(tmp)
        with open(tmp, "rb+") as fh:
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    finally:
        if tmp.exists():
            tmp.unlink()


def _write_json(path: Path, obj: dict) -> None:
    _write_atomic(path, lambda t: t.write_text(json.dumps(obj, indent=2, default=str) + "\n", encoding="utf-8"))


def _prepare_out(study: Study, out: Path) -> Path:
    """Check the output folder (never one holding the user's files) and write the manifest."""
    out = Path(out).resolve()
    for p in (Path(study.path).resolve().parent, Path(study.scenario_path).resolve().parent):
        if p == out or out in p.parents:
            raise InputError("--out", "--out", str(out), "a folder that does not hold the study's or scenario's files")
    if out.exists() and not out.is_dir():
        raise InputError("--out", "--out", str(out), "a folder (a file of that name exists)")
    if out.is_dir() and any(out.iterdir()) and not (out / "study.json").is_file():
        raise InputError("--out", "--out", str(out), "a new or empty folder, or the folder of an earlier study")
    (out / "runs").mkdir(parents=True, exist_ok=True)
    _write_json(
        out / "study.json",
        {
            "caution": CAUTION,
            "colstack": __version__,
            "study": study.path,
            "name": study.name,
            "scenario": study.scenario_path,
            "inputs": study.inputs_hash,
            "time_limit_s": study.time_limit_s,
            "variables": study.variables,
            "variants": [{"id": v.id, "name": v.name, "variables": v.variables} for v in study.variants],
        },
    )
    return out


def _read_record(path: Path) -> dict | None:
    try:
        return json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None


# ---------------------------------------------------------------------------------------------------------------
# Running


def _cores() -> int:
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # pragma: no cover - not on Linux
        return os.cpu_count() or 1


def _submit_local(
    study: Study, todo: list[StudyVariant], workers: int, done: Callable[[StudyVariant, dict | None, str], None]
) -> None:
    # spawn: a fresh interpreter per worker (forking a process that already runs solver threads is unsafe).
    pool = concurrent.futures.ProcessPoolExecutor(
        max_workers=min(workers, len(todo)), mp_context=multiprocessing.get_context("spawn")
    )
    try:
        futures = {
            pool.submit(run_variant, study.scenario_path, study.scenario_text, v.variables, study.time_limit_s): v
            for v in todo
        }
        for fut in concurrent.futures.as_completed(futures):
            try:
                rec = fut.result()
            except Exception as exc:  # a lost worker: reported, not kept (a rerun retries it)
                done(futures[fut], None, f"worker failed: {_one_line(exc)}")
            else:
                done(futures[fut], rec, "")
    except BaseException:
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown(wait=True)


def _check_address(address: str) -> None:
    """A scheduler address Dask can parse (checked first: a client that failed to start is slow to close)."""
    try:
        from distributed.comm.addressing import parse_address, parse_host_port
    except ImportError:
        raise InputError(
            "--scheduler", "--scheduler", address, "the 'distributed' package installed (pip install 'colstack[dask]')"
        ) from None
    try:
        scheme, loc = parse_address(address)
        if scheme in ("tcp", "tls", "ws", "wss"):
            parse_host_port(loc)
    except (ValueError, TypeError) as exc:
        raise InputError(
            "--scheduler",
            "--scheduler",
            address,
            f"a Dask scheduler address such as tcp://HOST:8786 ({_one_line(exc)})",
        ) from None


def _submit_dask(
    study: Study, todo: list[StudyVariant], scheduler: str, done: Callable[[StudyVariant, dict | None, str], None]
) -> None:
    from distributed import Client, as_completed

    try:
        client = Client(scheduler, timeout="15s", set_as_default=False)
    except (OSError, TimeoutError, ValueError) as exc:
        raise InputError(
            "--scheduler",
            "--scheduler",
            scheduler,
            f"the address of a running Dask scheduler, e.g. tcp://HOST:8786 ({_one_line(exc)})",
        ) from None
    futures = {}
    try:
        for v in todo:
            fut = client.submit(
                run_variant,
                study.scenario_path,
                study.scenario_text,
                v.variables,
                study.time_limit_s,
                key=f"colstack-study-{v.id}-{os.urandom(4).hex()}",
                pure=False,
            )
            futures[fut.key] = (fut, v)
        for fut in as_completed([f for f, _ in futures.values()], loop=client.loop):
            v = futures[fut.key][1]
            try:
                rec = fut.result()
            except (Exception, asyncio.CancelledError) as exc:  # lost worker: reported, not kept
                done(v, None, f"worker failed: {_one_line(exc)}")
            else:
                done(v, rec, "")
    finally:
        pending = [f for f, _ in futures.values() if not f.done()]
        if pending:
            client.cancel(pending)
        client.close()


def run_study(
    study: Study,
    out: str | Path,
    workers: int | None = None,
    scheduler: str | None = None,
    progress: Progress | None = None,
    retry_failed: bool = False,
) -> StudyOutcome:
    """Run every variant of ``study`` not yet done, keep each result as it arrives, then write the summary files.

    Args:
        study: from :func:`load_study`.
        out: output folder (created; an existing one must be empty or hold an earlier study).
        workers: local worker processes (default: all cores); 1 runs the variants one after another in this
            process. Ignored with ``scheduler``.
        scheduler: address of a running Dask distributed scheduler: one task per variant on that cluster.
        progress: called as ``progress(stage, done, total)``; ``total == 0`` for a message.
        retry_failed: also rerun variants whose stored result is a failure.

    Raises:
        InputError: a bad output folder, worker count or scheduler address.
    """
    say = progress or (lambda *_: None)
    if workers is not None and (not isinstance(workers, int) or isinstance(workers, bool) or workers < 1):
        raise InputError("--workers", "--workers", workers, "a whole number of worker processes, at least 1")
    if scheduler:
        _check_address(scheduler)
    out = _prepare_out(study, Path(out))
    runs = out / "runs"
    records: dict[str, dict] = {}
    todo: list[StudyVariant] = []
    for v in study.variants:
        rec = _read_record(runs / f"{v.id}.json")
        if (
            rec is not None
            and rec.get("inputs") == study.inputs_hash
            and rec.get("variables") == v.variables
            and not (retry_failed and rec.get("status") != "ok")
        ):
            records[v.id] = rec
        else:
            todo.append(v)
    skipped = len(records)
    total = len(study.variants)
    finished = [skipped]
    say("study runs", skipped, total)

    def done(v: StudyVariant, rec: dict | None, infra_error: str) -> None:
        if rec is None:
            rec = {"status": "failed", "error": infra_error, "figures": {}, "warnings": []}
        rec = {
            "caution": CAUTION,
            "id": v.id,
            "name": v.name,
            "variables": v.variables,
            "inputs": study.inputs_hash,
            "scenario": study.scenario_path,
            **rec,
        }
        if not infra_error:  # a lost worker is not a result of the variant: a rerun tries again
            _write_json(runs / f"{v.id}.json", rec)
        records[v.id] = rec
        finished[0] += 1
        if rec["status"] != "ok":
            say(f"failed: {v.name}: {rec['error']}", 0, 0)
        say("study runs", finished[0], total)

    if todo:
        if scheduler:
            _submit_dask(study, todo, scheduler, done)
        elif (workers or _cores()) == 1 or len(todo) == 1:
            for v in todo:
                done(v, run_variant(study.scenario_path, study.scenario_text, v.variables, study.time_limit_s), "")
        else:
            _submit_local(study, todo, workers or _cores(), done)
    table = results_table(study, records)
    files = _write_summary(study, table, out)
    failed = int((table["status"] != "ok").sum())
    return StudyOutcome(table=table, computed=len(todo), skipped=skipped, failed=failed, files=files)


# ---------------------------------------------------------------------------------------------------------------
# Results


_FIGURES = (
    "grades_used",
    "steel_t",
    "concrete_m3",
    "cost",
    "carbon_tCO2e",
    "types",
    "sections",
    "largest_ground_column",
    "largest_ground_column_m2",
    "column_plan_area_m2",
    "premium_percent",
    "gap_percent",
    "solver_status",
)


def _cell(key: str, value: Any) -> Any:
    return bars_text(value) if key == "bar_dias" else value


def results_table(study: Study, records: dict[str, dict]) -> pd.DataFrame:
    """One row per variant in study order: its variables, status, error and the figures of ``result_row``."""
    rows = []
    for no, v in enumerate(study.variants, start=1):
        rec = records.get(v.id, {"status": "not run", "error": "", "figures": {}, "warnings": []})
        row: dict[str, Any] = {"no": no, "id": v.id, "name": v.name}
        for key, value in v.variables.items():
            row[STUDY_VARIABLES[key].column] = _cell(key, value)
        row["status"] = rec.get("status", "failed")
        row["error"] = rec.get("error", "")
        figs = rec.get("figures") or {}
        for f in _FIGURES:
            row[f] = figs.get(f)
        row["warnings"] = len(rec.get("warnings") or [])
        row["elapsed_s"] = rec.get("elapsed_s")
        row["caution"] = CAUTION
        rows.append(row)
    return pd.DataFrame(rows)


def _pareto(points: list[tuple[float, float]]) -> list[tuple[float, float]]:
    """The points no other point beats in both coordinates (both minimised), by increasing x."""
    front: list[tuple[float, float]] = []
    for x, y in sorted(points):
        if not front or y < front[-1][1]:
            front.append((x, y))
    return front


TRADEOFFS = (
    ("types", "steel_t", "distinct column types", "steel (t)", "tradeoff_steel_types.png"),
    ("steel_t", "carbon_tCO2e", "steel (t)", "embodied carbon A1-A3 (tCO2e)", "tradeoff_carbon_steel.png"),
    (
        "column_plan_area_m2",
        "steel_t",
        "column plan area, all floors (m2)",
        "steel (t)",
        "tradeoff_steel_plan_area.png",
    ),
)
"""The trade-off charts: (x column, y column, x label, y label, file name)."""


def plot_tradeoffs(table: pd.DataFrame, folder: str | Path, title: str = "") -> list[Path]:
    """One PNG per trade-off of :data:`TRADEOFFS`, points coloured by the grades used, the best front dashed.

    Each point is labelled with the variant's row number (``no``). Returns the files written (none when no
    variant has results).
    """
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    from matplotlib.ticker import MaxNLocator

    ok = table[table["status"] == "ok"]
    if ok.empty:
        return []
    folder = Path(folder)
    written = []
    grades = sorted(ok["grades_used"].astype(str).unique())
    colours = plt.get_cmap("viridis")
    for xcol, ycol, xlabel, ylabel, fname in TRADEOFFS:
        fig, ax = plt.subplots(figsize=(6.4, 4.6))
        for j, g in enumerate(grades):
            sub = ok[ok["grades_used"].astype(str) == g]
            colour = colours(j / max(len(grades) - 1, 1) * 0.85)
            ax.scatter(sub[xcol].astype(float), sub[ycol].astype(float), s=36, color=colour, label=g, zorder=3)
        for _, row in ok.iterrows():
            ax.annotate(
                str(row["no"]),
                (float(row[xcol]), float(row[ycol])),
                textcoords="offset points",
                xytext=(4, 4),
                fontsize=7,
                color="0.25",
            )
        front = _pareto(list(zip(ok[xcol].astype(float), ok[ycol].astype(float), strict=True)))
        if len(front) > 1:
            ax.plot(
                *zip(*front, strict=True),
                ls="--",
                lw=0.9,
                color="0.4",
                drawstyle="steps-post",
                label="best trade-off",
                zorder=2,
            )
        if xcol == "types":
            ax.xaxis.set_major_locator(MaxNLocator(integer=True))
        ax.set_xlabel(xlabel)
        ax.set_ylabel(ylabel)
        ax.set_title(
            f"{title}: {ylabel.split(' (')[0]} against {xlabel.split(' (')[0]}"
            if title
            else f"{ylabel.split(' (')[0]} against {xlabel.split(' (')[0]}",
            fontsize=10,
        )
        ax.grid(lw=0.3)
        ax.legend(fontsize=8, title="grades used", title_fontsize=8)
        fig.text(0.5, 0.005, CAUTION, ha="center", fontsize=6, color="0.4", wrap=True)
        fig.tight_layout(rect=(0, 0.04, 1, 1))
        path = folder / fname
        _write_atomic(path, lambda t, fig=fig: fig.savefig(t, dpi=120, format="png"))
        plt.close(fig)
        written.append(path)
    return written


def _summary_lines(study: Study, table: pd.DataFrame) -> list[str]:
    ok = table[table["status"] == "ok"]
    lines = [
        CAUTION,
        "",
        f"Study: {study.name}",
        f"Base scenario: {study.scenario_path}",
        f"Variants: {len(table)}, with results: {len(ok)}, failed: {len(table) - len(ok)}",
        "",
    ]
    for _, row in table[table["status"] != "ok"].iterrows():
        lines.append(f"  failed  {row['no']}  {row['name']}: {row['error']}")
    if len(ok) > 1:
        cmp = ok.rename(columns={"name": "variant"})
        lines += [f"Against variant {ok.iloc[0]['no']} ({ok.iloc[0]['name']}):"]
        lines += [f"  {s}" for s in compare_sentences(cmp)]
        lines.append("")
    if len(ok):
        for col, what in (
            ("steel_t", "least steel"),
            ("carbon_tCO2e", "least embodied carbon"),
            ("types", "fewest types"),
        ):
            best = ok.loc[ok[col].astype(float).idxmin()]
            lines.append(f"{what}: variant {best['no']} ({best['name']}), {best[col]}")
    return [*lines, ""]


def _write_summary(study: Study, table: pd.DataFrame, out: Path) -> list[Path]:
    files = [out / "results.csv", out / "results.xlsx", out / "summary.txt"]
    _write_atomic(files[0], lambda t: table.to_csv(t, index=False))

    def excel(t: Path) -> None:
        about = pd.DataFrame(
            {
                "item": ["caution", "study", "base scenario", "colstack"],
                "value": [CAUTION, study.name, study.scenario_path, __version__],
            }
        )
        with pd.ExcelWriter(t, engine="openpyxl") as xl:
            table.drop(columns=["caution"]).to_excel(xl, sheet_name="Results", index=False)
            about.to_excel(xl, sheet_name="About", index=False)

    _write_atomic(files[1], excel)
    _write_atomic(files[2], lambda t: t.write_text("\n".join(_summary_lines(study, table)), encoding="utf-8"))
    return files + plot_tradeoffs(table, out, study.name)
