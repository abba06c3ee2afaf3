"""Markdown tables of the benchmark records for DEVELOPERS.md, and a check that the page quotes them.

``python bench/quote.py`` prints one block per record in ``bench/results/*.json``: a caption
(date, machine, note) and a table ``what | figure | target``, between the markers
``<!-- bench:<name> -->`` and ``<!-- /bench:<name> -->``. Paste the blocks into the page's
"Benchmarks" section as they are.

``python bench/quote.py --check DEVELOPERS.md`` reads every marked block of the page, prints the
block again from the record, and compares the numbers of the two in order (the words may be
edited, the figures may not): exit 1 when a figure differs, when a block has no record or when a
marker is not closed; exit 0 otherwise (a page without markers passes, with a warning, as there
is nothing to check).

The figures are rounded here (three significant figures; gaps and differences in per cent to two
decimals), so a table shows what the record says at the precision a reader needs.
"""

from __future__ import annotations

import argparse
import json
import math
import re
import sys
from collections.abc import Callable, Mapping
from pathlib import Path

RESULTS_DIR = Path(__file__).resolve().parent / "results"
ORDER = ("resistance", "feasibility", "ip", "large_tower")
SOLVERS = {"highs": "HiGHS", "cbc": "CBC"}
MARKED = re.compile(r"<!--\s*bench:([\w.-]+)\s*-->(.*?)(?:<!--\s*/bench:\1\s*-->|\Z)", re.S)
OPENING = re.compile(r"<!--\s*bench:([\w.-]+)\s*-->")
NUMBER = re.compile(r"\d{4}-\d{2}-\d{2}|(?<![\w.])[-+]?\d+(?:,\d{3})*(?:\.\d+)*")

Row = tuple[str, str, str]


def sig(x: float | None, digits: int = 3) -> str:
    """``x`` to ``digits`` significant figures with thousands separators ("-" for None)."""
    if x is None or not math.isfinite(x):
        return "-"
    if x == 0:
        return "0"
    decimals = digits - 1 - math.floor(math.log10(abs(x)))
    r = round(x, decimals)
    return f"{r:,.{max(decimals, 0)}f}"


def mem(mb: float | None) -> str:
    """A memory figure given in MB: MB below 1,000 MB, else GB to two significant figures."""
    if mb is None:
        return "-"
    return f"{sig(mb)} MB" if mb < 1000 else f"{sig(mb / 1024, 2)} GB"


def mem_target(mb: float) -> str:
    """A memory limit given in MB, as written in a target ("2 GB", "512 MB")."""
    return f"{mb / 1024:g} GB" if mb >= 1024 else f"{mb:g} MB"


def pct(x: float | None, decimals: int = 2) -> str:
    """A figure already in per cent, with its sign only when negative ("-" for None)."""
    return "-" if x is None else f"{x:.{decimals}f} %"


def rows_resistance(doc: Mapping) -> list[Row]:
    """Rows of ``bench_resistance.py``: throughput, memory, scalar path and reference library."""
    i, f = doc["inputs"], doc["figures"]
    rows = [
        (
            f"MRd, {i['n_pairs']:,} (section, NEd) pairs, NEd from {i['NEd_from_ratio']:.1f} to "
            f"{i['NEd_to_ratio']:.1f} NRd, tables included",
            f"{sig(f['pairs_per_s'])} pairs/s ({sig(f['total_s'])} s; {f['ratio_to_target']:.2f} of the target)",
            f"{sig(f['target_pairs_per_s'])} pairs/s",
        ),
        ("peak memory of that run", mem(f["peak_MB"]), f"< {mem_target(f['target_peak_MB'])}"),
    ]
    scalar = (
        f"{sig(f['scalar_ms_per_pair'])} ms per pair ({sig(f['scalar_over_vectorised_x'])}x the vectorised "
        f"pair; largest relative difference {f['scalar_max_rel_diff_ratio']:.0e})"
    )
    if f.get("reference_ms_per_call") is None:
        rows.append(("scalar path (reference library not installed)", scalar, "-"))
    else:
        rows.append(
            (
                f"scalar path / one {i['reference_library']} ultimate-capacity call",
                f"{sig(f['scalar_ms_per_pair'])} ms / {sig(f['reference_ms_per_call'])} ms per pair "
                f"({sig(f['scalar_over_vectorised_x'])}x / "
                f"{sig(f['reference_over_vectorised_x'])}x the vectorised pair);"
                f" scalar and vectorised paths within {f['scalar_max_rel_diff_ratio']:.0e}",
                "-",
            )
        )
    return rows


def rows_feasibility(doc: Mapping) -> list[Row]:
    """Rows of ``bench_feasibility.py``: the matrix, its accuracy, the single-column route, the bound."""
    i, f = doc["inputs"], doc["figures"]
    return [
        (
            f"feasibility matrix, {i['n_storeys']} x {i['n_stacks']} tower ({i['n_cells']:,} cells) x {i['n_types']:,} "
            f"types = {i['n_pairs_checked'] / 1e6:.1f} M checks",
            f"{sig(f['total_s'])} s, {sig(f['checks_per_s'])} checks/s, {mem(f['peak_MB'])} peak; "
            f"{f['n_feasible_pairs']:,} feasible pairs, {f['n_exact_rechecks']:,} re-checked exactly",
            f"< {f['target_s']:g} s, < {mem_target(f['target_peak_MB'])}",
        ),
        (
            f"screened matrix vs exact check on {i['n_sample']:,} pairs",
            f"pass/fail {f['n_pass_fail_agree']}/{i['n_sample']} before the exact re-check band; max difference "
            f"{pct(f['max_diff_bending_pct'])} on the bending checks ({pct(f['max_diff_governing_pct'])} on the "
            "governing check)",
            pct(f["target_max_diff_bending_pct"], 1),
        ),
        (
            "single-column check of one pair",
            f"{sig(f['single_check_ms_per_pair'])} ms; the matrix is {sig(f['single_over_matrix_x'])}x faster per pair",
            "-",
        ),
        (
            "cell-wise lower bound on steel; cells no type can carry",
            f"{sig(f['steel_lower_bound_t'])} t; {f['n_undesignable_cells']:,}",
            "-",
        ),
    ]


def run_text(key: str, run: Mapping) -> str:
    """One solver run of ``bench_ip.py`` in a few words."""
    form, solver = run.get("formulation", key), SOLVERS.get(run.get("solver", ""), run.get("solver", ""))
    if run.get("gap_pct") is None:
        return f"{form}/{solver}: no schedule in {sig(run['time_s'])} s"
    return (
        f"{form}/{solver}: {pct(run['gap_pct'])} in {sig(run['time_s'])} s ({run['status']}, "
        f"{run['n_types']} types, {sig(run['steel_t'])} t)"
    )


def rows_ip(doc: Mapping) -> list[Row]:
    """Rows of ``bench_ip.py``: per case, every run and the rule-of-thumb baseline."""
    rows: list[Row] = []
    for case in doc["figures"]["cases"].values():
        coupling = [f"min run {case['n_min_run_storeys']}"]
        if case.get("price_per_type_kg"):
            coupling.append(f"price {case['price_per_type_kg']:g} kg per type")
        if case.get("n_max_types") is not None:
            coupling.append(f"cap of {case['n_max_types']} types")
        rows.append(
            (
                f"integer program, {case['label']} ({case['n_cells']:,} cells, {case['n_types']:,} types, "
                f"{case['n_feasible_pairs']:,} feasible pairs, {', '.join(coupling)}); proven gap and time",
                "; ".join(run_text(k, r) for k, r in case["runs"].items()),
                f"{case['target_gap_pct']:g} % in < {case['target_s']:g} s",
            )
        )
        b = case.get("baseline")
        if b is not None:
            bound_t = case["cellwise_lower_bound_kg"] / 1000
            rows.append(
                (
                    f"rule-of-thumb baseline, {case['label']}",
                    f"{sig(b['steel_kg'] / 1000)} t steel, {b['n_types']} types ({b['n_sections']} sections); "
                    f"{pct(b['premium_pct'], 1)} over the cell-wise bound of {sig(bound_t)} t",
                    "-",
                )
            )
    f = doc["figures"]
    rows.append(
        (
            "the whole benchmark" + (" (`--quick`: 3,000-cell tower skipped)" if doc["inputs"].get("quick") else ""),
            f"{sig(f['total_s'])} s, {mem(f['peak_MB'])} peak",
            "-",
        )
    )
    return rows


def rows_large_tower(doc: Mapping) -> list[Row]:
    """Row of ``bench_large_tower.py``: the whole job, its stages and its schedule (or where it stopped)."""
    i, f = doc["inputs"], doc["figures"]
    what = f"whole job, {i['n_storeys']} x {i['n_stacks']} tower ({i['n_cells']:,} cells, {i['grade']}"
    target = f"< {f['target_s'] / 60:g} min, < {mem_target(f['target_peak_MB'])}"
    if "error" in f:
        return [
            (
                what + "), `make bench-large`",
                f"stopped after {sig(f['stopped_after_s'])} s ({f['error']}), {mem(f['peak_MB'])} peak",
                target,
            )
        ]
    stages = ", ".join(f"{k} {sig(v)} s" for k, v in f["stages_s"].items())
    return [
        (
            what + f", {f['n_types']:,} types, {f['n_feasible_pairs'] / 1e6:.1f} M feasible pairs), `make bench-large`",
            f"{sig(f['total_s'])} s, {mem(f['peak_MB'])} peak: {stages}; {f['n_types_used']} types, "
            f"{sig(f['steel_t'])} t steel, proven gap {pct(f['gap_pct'])} ({f['solver']}: {f['status']}), "
            f"{pct(f['premium_pct'], 1)} over the "
            "cell-wise bound",
            target,
        )
    ]


def flat(tree: object, path: str = "") -> list[tuple[str, object]]:
    """(dotted key, value) for every leaf of nested mappings."""
    if isinstance(tree, Mapping):
        return [kv for k, v in tree.items() for kv in flat(v, f"{path}.{k}" if path else str(k))]
    return [(path, tree)]


def rows_generic(doc: Mapping) -> list[Row]:
    """Rows of a record this module has no layout for: one per figure, the key naming the unit."""
    out = []
    for k, v in flat(doc["figures"]):
        shown = sig(v) if isinstance(v, float) else f"{v:,}" if isinstance(v, int) and not isinstance(v, bool) else v
        out.append((f"`{k}`", str(shown), "-"))
    return out


LAYOUTS: dict[str, Callable[[Mapping], list[Row]]] = {
    "resistance": rows_resistance,
    "feasibility": rows_feasibility,
    "ip": rows_ip,
    "large_tower": rows_large_tower,
}


def caption(doc: Mapping) -> str:
    """The line above a table: which script, when, on what, and the note."""
    m = doc["machine"]
    load = ""
    if m.get("load_1min_at_start") is not None and m.get("load_1min_at_end") is not None:
        load = f", load average {m['load_1min_at_start']:.1f} at the start and {m['load_1min_at_end']:.1f} at the end"
    text = (
        f"`{doc['script']}`, measured {str(m['date'])[:10]} on {m['n_cpus']} CPUs, Python {m['python']}, "
        f"numpy {m['numpy']}{load} (record: `bench/results/{doc['name']}.json`)."
    )
    if doc.get("note"):
        text += f" Note: {doc['note'].rstrip('.')}."
    return text


def cell(text: str) -> str:
    """Table-cell text: pipes escaped, no line breaks."""
    return " ".join(str(text).split()).replace("|", "\\|")


def block(doc: Mapping) -> str:
    """The Markdown block of one record, markers included."""
    rows = LAYOUTS.get(doc["name"], rows_generic)(doc)
    lines = [f"<!-- bench:{doc['name']} -->", caption(doc), "", "| what | figure | target |", "| --- | --- | --- |"]
    lines += [f"| {cell(w)} | {cell(f)} | {cell(t)} |" for w, f, t in rows]
    lines.append(f"<!-- /bench:{doc['name']} -->")
    return "\n".join(lines)


def load_results(results_dir: Path) -> dict[str, dict]:
    """Every record in ``results_dir`` by name, in the order of :data:`ORDER` then by name."""
    docs = {p.stem: json.loads(p.read_text(encoding="utf-8")) for p in Path(results_dir).glob("*.json")}
    return {k: docs[k] for k in sorted(docs, key=lambda k: (ORDER.index(k) if k in ORDER else len(ORDER), k))}


def quote(results: Mapping[str, Mapping]) -> str:
    """The Markdown of every record, blocks separated by a blank line."""
    return "\n\n".join(block(doc) for doc in results.values()) + "\n"


def numbers(text: str) -> list[str]:
    """The numbers of a text in order, as written (``405,000``, ``-0.2``, ``3.11.7``, ``2026-12-02``)."""
    return NUMBER.findall(text)


def check(page: str, results: Mapping[str, Mapping], page_name: str = "the page") -> tuple[list[str], int]:
    """Differences between the marked blocks of ``page`` and the records, and how many blocks were checked.

    Args:
        page: the text of the page (DEVELOPERS.md).
        results: the records by name (:func:`load_results`).
        page_name: the page's name in the messages.
    """
    problems: list[str] = []
    blocks = [(m.group(1), m.group(2), m.group(0)) for m in MARKED.finditer(page)]
    for name, body, whole in blocks:
        if not re.search(rf"<!--\s*/bench:{re.escape(name)}\s*-->\s*$", whole):
            problems.append(f"bench:{name}: no closing marker <!-- /bench:{name} --> in {page_name}")
            continue
        if name not in results:
            problems.append(f"bench:{name}: quoted in {page_name} but there is no record bench/results/{name}.json")
            continue
        expected = block(results[name])
        expected_body = expected.split("\n", 1)[1].rsplit("\n", 1)[0]
        have, want = numbers(body), numbers(expected_body)
        for k, (h, w) in enumerate(zip(have, want, strict=False)):
            if h != w:
                problems.append(
                    f"bench:{name}: figure {k + 1} is {h} in {page_name} but {w} in the record "
                    f"(... {context(body, k)} ...)"
                )
                break
        else:
            if len(have) != len(want):
                problems.append(
                    f"bench:{name}: {len(have)} figures in {page_name}, {len(want)} in the record "
                    "(paste the block from bench/quote.py whole)"
                )
    return problems, len(blocks)


def context(text: str, k: int, width: int = 40) -> str:
    """A few words around the ``k``-th number of ``text``."""
    m = list(re.finditer(NUMBER, text))[k]
    return " ".join(text[max(m.start() - width, 0) : m.end() + width].split())


def main(argv: list[str] | None = None) -> int:
    """Print the Markdown blocks, or check a page against the records; return the exit status."""
    ap = argparse.ArgumentParser(description=__doc__.strip().splitlines()[0])
    ap.add_argument(
        "--check",
        metavar="PAGE",
        type=Path,
        help="exit 1 if a figure quoted in PAGE between <!-- bench:NAME --> markers differs from "
        "bench/results/NAME.json",
    )
    ap.add_argument(
        "--results",
        metavar="DIR",
        type=Path,
        default=RESULTS_DIR,
        help="folder of the JSON records (default: bench/results next to this script)",
    )
    args = ap.parse_args(argv)
    results = load_results(args.results)
    if args.check is None:
        if not results:
            print(f"no records in {args.results}: run the benchmarks first (make bench)", file=sys.stderr)
            return 1
        sys.stdout.write(quote(results))
        return 0
    try:
        page = args.check.read_text(encoding="utf-8")
    except OSError as exc:
        print(f"{args.check}: cannot read it ({exc.strerror})", file=sys.stderr)
        return 2
    problems, n_blocks = check(page, results, str(args.check))
    for p in problems:
        print(p)
    if n_blocks == 0:
        print(f"{args.check}: no <!-- bench:NAME --> blocks, nothing checked", file=sys.stderr)
    elif not problems:
        print(f"{args.check}: {n_blocks} quoted block(s) agree with {args.results}")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
