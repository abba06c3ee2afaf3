"""Robustness: bad scenarios, actions CSVs and column specs end in one clean error line.

Every case goes through the command line (``optimizer.cli.main``) and must end
with exit status 2, exactly one stderr line naming the file, the key or row
and the value, no traceback, and no output folder created. Random mutations of
the bundled scenario (parsed with tomllib, mutated, re-emitted as TOML) come
from hypothesis; hand-written cases cover each category. Cases that show a bug
in the program were first marked ``xfail(strict=True)`` with the reason; the ``*_BUGS`` tables keep those
cases (now fixed) with the reason that described the bug, as regression tests.
"""

from __future__ import annotations

import contextlib
import copy
import io
import json
import math
import shutil
import tempfile
import tomllib
import traceback
from dataclasses import dataclass
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from optimizer.cli import main
from tests.support import paths
from tests.support.toml import dump_toml

pytestmark = pytest.mark.slow  # end to end: left out of `make test-fast`

ROOT = paths.ROOT
SMALL = ROOT / "scenarios" / "small_building.toml"
ANALYSIS = ROOT / "scenarios" / "analysis_actions.toml"
ANALYSIS_CSV = ROOT / "scenarios" / "analysis_actions.csv"
CHECK_SPEC = ROOT / "examples" / "column_slender_biaxial.toml"

SMALL_DATA = tomllib.loads(SMALL.read_text(encoding="utf-8"))
CHECK_DATA = tomllib.loads(CHECK_SPEC.read_text(encoding="utf-8"))
CSV_ROWS = [line.split(",") for line in ANALYSIS_CSV.read_text(encoding="utf-8").splitlines() if line]

FUZZ = settings(
    max_examples=120,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)

# --------------------------------------------------------------------------- running and judging


@dataclass
class Outcome:
    """What one command-line call did."""

    code: int | None
    out: str
    err: str
    crash: str | None  # formatted traceback of an unexpected exception

    @property
    def lines(self) -> list[str]:
        return [ln for ln in self.err.splitlines() if ln.strip()]


def invoke(argv: list[str]) -> Outcome:
    """Run ``colstack ARGV`` in-process, capturing stdout, stderr and any exception."""
    out, err = io.StringIO(), io.StringIO()
    crash = None
    code: int | None = None
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(argv)
        except SystemExit as exc:  # argparse
            code = exc.code if isinstance(exc.code, int) else 1
        except Exception:
            crash = traceback.format_exc()
    return Outcome(code, out.getvalue(), err.getvalue(), crash)


def classify(res: Outcome, file: str) -> str:
    if res.crash is not None or res.code != 2 or "Traceback" in res.err:
        return "crash"
    if len(res.lines) == 1 and file in res.lines[0]:
        return "clean"
    return "unclear"


def judge(
    res: Outcome,
    tally,
    key: bytes,
    file: Path | str,
    field: str | None = None,
    value: str | None = None,
    out_dir: Path | None = None,
) -> None:
    """Record the outcome and assert a clean error naming ``file``, ``field`` and ``value``."""
    file = str(file)
    tally.record(key, classify(res, file))
    assert res.crash is None, f"unexpected exception:\n{res.crash}"
    assert "Traceback" not in res.err, res.err
    assert res.code == 2, f"exit status {res.code} (stdout: {res.out[:300]!r}; stderr: {res.err[:300]!r})"
    assert len(res.lines) == 1, f"expected one stderr line, got: {res.err!r}"
    line = res.lines[0]
    assert file in line, f"file {file!r} not named in {line!r}"
    assert " = " in line, f"no 'field = value' in {line!r}"
    if field is not None:
        assert field in line, f"field {field!r} not named in {line!r}"
    if value is not None:
        assert value in line, f"value {value!r} not shown in {line!r}"
    if out_dir is not None:
        assert not out_dir.exists(), f"output folder {out_dir} was created: {sorted(out_dir.rglob('*'))}"


def test_writer_round_trips_the_bundled_files():
    assert tomllib.loads(dump_toml(SMALL_DATA)) == SMALL_DATA
    assert tomllib.loads(dump_toml(CHECK_DATA)) == CHECK_DATA
    odd = {"a": [math.inf, -math.inf], "b c": {"d": 'é"\\'}}
    back = tomllib.loads(dump_toml(odd))
    assert back["a"] == [math.inf, -math.inf] and back["b c"] == {"d": 'é"\\'}


# --------------------------------------------------------------------------- tree mutations

Path_ = tuple  # a path into the parsed tree: keys (str) and list indices (int)


def walk(node: object, prefix: Path_ = ()):
    """Every (path, value) below ``node`` (not the root itself)."""
    items = node.items() if isinstance(node, dict) else enumerate(node) if isinstance(node, list) else ()
    for k, v in items:
        yield (*prefix, k), v
        yield from walk(v, (*prefix, k))


def get(node: object, path: Path_) -> object:
    for k in path:
        node = node[k]
    return node


def set_(node: object, path: Path_, value: object) -> None:
    get(node, path[:-1])[path[-1]] = value


def is_number(v: object) -> bool:
    return isinstance(v, int | float) and not isinstance(v, bool)


def key_name(path: Path_) -> str:
    """The last key (not index) of a path: what the error message must name."""
    return next(str(k) for k in reversed(path) if isinstance(k, str))


def _match(path: Path_, pattern: tuple) -> bool:
    return len(path) == len(pattern) and all(p == "*" or p == k for k, p in zip(path, pattern, strict=True))


# Keys of small_building.toml whose removal must be an error (the others are optional
# or covered by another entry, e.g. settings[1] only overrides settings[0]).
SCENARIO_REQUIRED = [
    ("project",),
    ("project", "name"),
    ("parameters",),
    ("parameters", "set"),
    ("materials",),
    *[
        ("materials", k)
        for k in ("concrete", "reinforcement_fyk_MPa", "ductility", "aggregate_mm", "concrete_density_kN_m3")
    ],
    ("levels",),
    *[("levels", "*", k) for k in ("name", "height_m", "slab_depth_mm")],
    ("stacks",),
    *[("stacks", "*", k) for k in ("id", "x_m", "y_m", "from_level", "to_level", "stands_on")],
    ("floors",),
    *[("floors", "*", k) for k in ("levels", "outline_m", "sdl_kPa", "imposed_kPa", "facade_kN_m", "category")],
    ("settings",),
    *[("settings", 0, k) for k in ("exposure", "fire", "braced", "l0_factor", "trial_size_mm")],
    ("takedown",),
    ("takedown", "combination"),
    ("takedown", "imposed_reduction"),
]
# String values that name a level, and keys whose strings are a closed set of choices.
LEVEL_REFS = [
    ("stacks", "*", "from_level"),
    ("stacks", "*", "to_level"),
    ("floors", "*", "levels"),
    ("floors", "*", "levels", "*"),
    ("settings", "*", "levels", "*"),
]
SCENARIO_CHOICES = [
    ("parameters", "set"),
    ("materials", "concrete"),
    ("materials", "ductility"),
    ("stacks", "*", "orientation"),
    ("stacks", "*", "stands_on"),
    ("floors", "*", "category"),
    ("settings", "*", "exposure"),
    ("settings", "*", "fire"),
    ("takedown", "combination"),
    ("takedown", "imposed_reduction"),
]
# Tables or arrays that may be empty without error.
SCENARIO_MAY_BE_EMPTY = [("settings", "*")]

CHECK_REQUIRED = {
    ("b",): "b",
    ("h",): "h",
    ("cover",): "cover",
    ("link",): "link",
    ("grade",): "fck",
    ("fyk",): "fyk",
    ("bars",): "bars",
    ("bars", "dia"): "dia",
    ("bars", "nb"): "nb",
    ("bars", "nh"): "nh",
    ("NEd",): "NEd",
    ("height",): "height",
    ("k1y",): "k1y",
    ("k2y",): "k2y",
    ("k1z",): "k1z",
    ("k2z",): "k2z",
}
CHECK_CHOICES = [("grade",), ("exposure",), ("fire",)]

WRONG_TYPE = {
    "number": ["7.5 m", True, {"value": 1}, ["1"]],
    "string": [7, False, {"name": "x"}, [1]],
    "bool": [1, "true", {}, [True, False]],
    "list": [3, "text", True],
    "table": [3, "text", True, [1, 2]],
}


def kind_of(v: object) -> str:
    if isinstance(v, bool):
        return "bool"
    if is_number(v):
        return "number"
    if isinstance(v, str):
        return "string"
    return "list" if isinstance(v, list) else "table"


@dataclass
class Mutation:
    data: dict
    label: str
    field: str
    value: str | None = None


@st.composite
def tree_mutation(
    draw, base: dict, required, choices, level_refs=(), may_be_empty=(), required_names: dict | None = None
) -> Mutation:
    """One mutation of ``base`` that must make it invalid, with what the error has to name."""
    data = copy.deepcopy(base)
    nodes = list(walk(data))
    kinds = ["extra_key", "drop", "wrong_type", "non_finite", "empty", "bad_choice"]
    if level_refs:
        kinds += ["unknown_level", "duplicate_id"]
    kind = draw(st.sampled_from(kinds))
    if kind == "extra_key":
        tables = [()] + [p for p, v in nodes if isinstance(v, dict)]
        path = draw(st.sampled_from(tables))
        name = draw(st.sampled_from(["zz_unknown", "heigth_m", "Name", "notes"]))
        get(data, path)[name] = draw(st.sampled_from([1, "x", True]))
        return Mutation(data, f"extra key {name!r} at {path}", name)
    if kind == "drop":
        paths = [p for p, _ in nodes if any(_match(p, r) for r in required)]
        path = draw(st.sampled_from(paths))
        del get(data, path[:-1])[path[-1]]
        field = (required_names or {}).get(path, key_name(path))
        return Mutation(data, f"drop {path}", field)
    if kind == "wrong_type":
        paths = [p for p, _ in nodes]
        path = draw(st.sampled_from(paths))
        new = draw(st.sampled_from(WRONG_TYPE[kind_of(get(data, path))]))
        set_(data, path, new)
        return Mutation(data, f"{path} = {new!r}", key_name(path))
    if kind == "non_finite":
        paths = [p for p, v in nodes if is_number(v)]
        path = draw(st.sampled_from(paths))
        new = draw(st.sampled_from([math.nan, math.inf, -math.inf]))
        set_(data, path, new)
        return Mutation(data, f"{path} = {new!r}", key_name(path), "nan" if math.isnan(new) else "inf")
    if kind == "empty":
        paths = [p for p, v in nodes if isinstance(v, dict | list) and not any(_match(p, r) for r in may_be_empty)]
        path = draw(st.sampled_from(paths))
        new = {} if isinstance(get(data, path), dict) else []
        set_(data, path, new)
        return Mutation(data, f"{path} emptied", key_name(path))
    if kind == "bad_choice":
        paths = [p for p, _ in nodes if any(_match(p, r) for r in choices)]
        path = draw(st.sampled_from(paths))
        new = draw(st.sampled_from(["bogus", "C30/99", "", "XZ9", "R45"]))
        set_(data, path, new)
        return Mutation(data, f"{path} = {new!r}", key_name(path))
    if kind == "unknown_level":
        paths = [p for p, v in nodes if isinstance(v, str) and any(_match(p, r) for r in level_refs)]
        path = draw(st.sampled_from(paths))
        set_(data, path, "NO_SUCH_LEVEL")
        return Mutation(data, f"{path} = 'NO_SUCH_LEVEL'", key_name(path), "NO_SUCH_LEVEL")
    # duplicate_id
    group, key = draw(st.sampled_from([("levels", "name"), ("stacks", "id")]))
    n = len(data[group])
    i = draw(st.integers(0, n - 1))
    j = draw(st.integers(0, n - 2))
    j = j if j < i else j + 1
    data[group][j][key] = data[group][i][key]
    return Mutation(data, f"{group}[{j}].{key} = {group}[{i}].{key}", key, data[group][i][key])


# --------------------------------------------------------------------------- scenario: takedown


def _takedown(
    tally,
    text: str | bytes,
    field: str | None,
    value: str | None = None,
    name: str = "scenario.toml",
    extra: dict[str, bytes] | None = None,
    plans: bool = False,
) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        path = tmp / name
        raw = text.encode("utf-8") if isinstance(text, str) else text
        path.write_bytes(raw)
        for fname, content in (extra or {}).items():
            (tmp / fname).write_bytes(content)
        out = tmp / "out"
        res = invoke(["takedown", str(path), "--out", str(out), *([] if plans else ["--no-plans"])])
        judge(res, tally, b"takedown\0" + raw + repr(sorted((extra or {}).items())).encode(), path, field, value, out)


@FUZZ
@given(tree_mutation(SMALL_DATA, SCENARIO_REQUIRED, SCENARIO_CHOICES, LEVEL_REFS, SCENARIO_MAY_BE_EMPTY))
def test_fuzz_scenario_mutations(robustness_tally, m):
    _takedown(robustness_tally, dump_toml(m.data), m.field, m.value)


SMALL_TEXT = SMALL.read_text(encoding="utf-8")
# Truncating anywhere before the last value is complete leaves a required key missing or bad TOML.
_LAST_SAFE_CUT = SMALL_TEXT.rindex('"alpha_A"') + len('"alpha_')


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.integers(0, _LAST_SAFE_CUT))
def test_fuzz_truncated_scenario(robustness_tally, cut):
    _takedown(robustness_tally, SMALL_TEXT.encode("utf-8")[:cut], None)


@settings(max_examples=20, deadline=None, derandomize=True)
@given(st.integers(0, len(SMALL_TEXT)), st.sampled_from([b"\xff", b"\xc3\x28", b"\x80", b"\xed\xa0\x80"]))
def test_fuzz_non_utf8_scenario(robustness_tally, at, junk):
    raw = SMALL_TEXT.encode("utf-8")
    _takedown(robustness_tally, raw[:at] + junk + raw[at:], "(file)")


def _edit(text: str, old: str, new: str, count: int = 1) -> str:
    assert old in text, old
    return text.replace(old, new, count)


# (id, edited text, field the message must name, value it must show)
SCENARIO_CASES = [
    ("empty file", "", "project", None),
    ("only comments", "# nothing here\n", "project", None),
    ("bad toml syntax", _edit(SMALL_TEXT, 'name = "L1"', 'name = "L1'), "(syntax)", None),
    ("table header twice", SMALL_TEXT + '\n[materials]\nconcrete = "C30/37"\n', "(syntax)", None),
    ("missing takedown and actions", _edit(SMALL_TEXT, "[takedown]", "[zz_takedown]"), "zz_takedown", None),
    ("zero height", _edit(SMALL_TEXT, "height_m = 3.5", "height_m = 0"), "height_m", "0"),
    ("negative height", _edit(SMALL_TEXT, "height_m = 3.5", "height_m = -3.5"), "height_m", "-3.5"),
    ("negative slab", _edit(SMALL_TEXT, "slab_depth_mm = 225", "slab_depth_mm = -225"), "slab_depth_mm", "-225"),
    (
        "slab deeper than storey",
        _edit(SMALL_TEXT, "slab_depth_mm = 225", "slab_depth_mm = 4500"),
        "slab_depth_mm",
        "4500",
    ),
    ("zero trial size", _edit(SMALL_TEXT, "[350, 350]", "[0, 350]"), "trial_size_mm", "0"),
    ("negative trial size", _edit(SMALL_TEXT, "[400, 400]", "[400, -400]"), "trial_size_mm", "-400"),
    ("trial size of three", _edit(SMALL_TEXT, "[350, 350]", "[350, 350, 350]"), "trial_size_mm", None),
    ("negative imposed load", _edit(SMALL_TEXT, "imposed_kPa = 2.5", "imposed_kPa = -2.5"), "imposed_kPa", "-2.5"),
    ("negative aggregate", _edit(SMALL_TEXT, "aggregate_mm = 20", "aggregate_mm = -20"), "aggregate_mm", "-20"),
    (
        "zero density",
        _edit(SMALL_TEXT, "concrete_density_kN_m3 = 25.0", "concrete_density_kN_m3 = 0"),
        "concrete_density_kN_m3",
        "0",
    ),
    (
        "fyk out of range",
        _edit(SMALL_TEXT, "reinforcement_fyk_MPa = 500", "reinforcement_fyk_MPa = 5000"),
        "reinforcement_fyk_MPa",
        "5000",
    ),
    ("l0 factor above one", _edit(SMALL_TEXT, "l0_factor = 1.0", "l0_factor = 2.0"), "l0_factor", "2.0"),
    ("unbraced", _edit(SMALL_TEXT, "braced = true", "braced = false"), "braced", "False"),
    ("nan height", _edit(SMALL_TEXT, "height_m = 4.5", "height_m = nan"), "height_m", "nan"),
    ("inf x", _edit(SMALL_TEXT, "x_m = 7.5", "x_m = inf"), "x_m", "inf"),
    ("-inf load", _edit(SMALL_TEXT, "sdl_kPa = 1.5", "sdl_kPa = -inf"), "sdl_kPa", "inf"),
    ("string number", _edit(SMALL_TEXT, "height_m = 4.5", 'height_m = "4.5"'), "height_m", "4.5"),
    ("number with unit", _edit(SMALL_TEXT, "imposed_kPa = 2.5", 'imposed_kPa = "2.5 kPa"'), "imposed_kPa", "kPa"),
    ("empty levels", _edit(SMALL_TEXT, "[[levels]]", "[zz]", 1), "zz", None),
    (
        "levels not tables",
        SMALL_TEXT.replace("[[levels]]", "[[zz_levels]]").replace("[project]", 'levels = ["L1", "L2"]\n[project]'),
        "levels",
        None,
    ),
    ("unknown level in stack", _edit(SMALL_TEXT, 'to_level = "ROOF"', 'to_level = "L9"'), "to_level", "L9"),
    (
        "stack upside down",
        _edit(SMALL_TEXT, 'from_level = "L1"\nto_level = "ROOF"', 'from_level = "ROOF"\nto_level = "L1"'),
        "to_level",
        "L1",
    ),
    (
        "unknown level in floor",
        _edit(SMALL_TEXT, 'levels = ["L1", "L5"]', 'levels = ["L1", "L7"]'),
        "floors[0].levels",
        "L7",
    ),
    (
        "floors leave a level uncovered",
        _edit(SMALL_TEXT, 'levels = ["L1", "L5"]', 'levels = ["L1", "L4"]'),
        "floors",
        "L5",
    ),
    ("level covered twice", _edit(SMALL_TEXT, 'levels = "ROOF"', 'levels = ["L5", "ROOF"]'), "levels", "L5"),
    (
        "unknown level in settings",
        _edit(SMALL_TEXT, 'levels = ["L1", "L2"]', 'levels = ["L1", "LX"]'),
        "settings[1].levels",
        "LX",
    ),
    (
        "unknown stack in settings",
        _edit(SMALL_TEXT, 'levels = ["L1", "L2"]', 'stacks = ["A1", "Z9"]'),
        "settings[1].stacks",
        "Z9",
    ),
    ("duplicate stack id", _edit(SMALL_TEXT, 'id = "B1"', 'id = "A1"'), "stacks[1].id", "A1"),
    ("duplicate level name", _edit(SMALL_TEXT, 'name = "L3"', 'name = "L2"'), "levels[2].name", "L2"),
    ("id with a comma", _edit(SMALL_TEXT, 'id = "B1"', 'id = "B,1"'), "stacks[1].id", "B,1"),
    ("stacks at one place", _edit(SMALL_TEXT, "x_m = 7.5\ny_m = 0.0", "x_m = 0.0\ny_m = 0.0"), "x_m", None),
    (
        "unknown transfer stack",
        _edit(
            SMALL_TEXT,
            'from_level = "L1"\nto_level = "ROOF"\nstands_on = "foundation"',
            'from_level = "L2"\nto_level = "ROOF"\nstands_on = { Q9 = 1.0 }',
        ),
        "stands_on.Q9",
        "Q9",
    ),
    (
        "shares not summing to one",
        _edit(
            SMALL_TEXT,
            'id = "B1"\nx_m = 7.5\ny_m = 0.0\nfrom_level = "L1"\nto_level = "ROOF"\nstands_on = "foundation"',
            'id = "B1"\nx_m = 7.5\ny_m = 0.0\nfrom_level = "L2"\nto_level = "ROOF"\nstands_on = { A1 = 0.5, C1 = 0.4 }',
        ),
        "stands_on",
        "0.5",
    ),
    (
        "self-crossing outline",
        _edit(SMALL_TEXT, "[15.3, 6.3], [-0.3, 6.3]]", "[-0.3, 6.3], [15.3, 6.3]]"),
        "outline_m",
        None,
    ),
    (
        "outline of two points",
        _edit(
            SMALL_TEXT,
            "outline_m = [[-0.3, -0.3], [15.3, -0.3], [15.3, 6.3], [-0.3, 6.3]]",
            "outline_m = [[-0.3, -0.3], [15.3, -0.3]]",
        ),
        "outline_m",
        None,
    ),
    ("unknown concrete", _edit(SMALL_TEXT, '"C30/37"', '"C30/38"'), "concrete", "C30/38"),
    ("unknown exposure", _edit(SMALL_TEXT, '"XC1"', '"XC7"'), "exposure", "XC7"),
    ("unknown fire", _edit(SMALL_TEXT, '"R60"', '"R75"'), "fire", "R75"),
    ("unknown category", _edit(SMALL_TEXT, 'category = "B"', 'category = "Z"'), "category", "Z"),
    ("unknown combination", _edit(SMALL_TEXT, '"6.10a+6.10b"', '"6.10c"'), "combination", "6.10c"),
    ("unknown top-level key", 'colour = "red"\n' + SMALL_TEXT, "colour", "red"),
    ("misspelt key", _edit(SMALL_TEXT, "height_m = 4.5", "heigth_m = 4.5"), "height_m", None),
    ("key after table goes into it", _edit(SMALL_TEXT, "[takedown]", 'actions = "x.csv"\n[takedown]'), "actions", None),
    ("both routes", 'actions = "a.csv"\n' + SMALL_TEXT, "actions", "a.csv"),
    (
        "actions file missing",
        _edit(ANALYSIS.read_text(encoding="utf-8"), '"analysis_actions.csv"', '"none.csv"'),
        "actions",
        "none.csv",
    ),
    ("psi0 above one", _edit(SMALL_TEXT, 'category = "H"', 'category = "H"\npsi0 = 1.5'), "psi0", "1.5"),
    ("unknown national set", _edit(SMALL_TEXT, 'set = "EN"', 'set = "FR"'), "set", "FR"),
    (
        "override out of range",
        _edit(SMALL_TEXT, 'set = "EN"', 'set = "EN"\noverrides = { alpha_cc = -1 }'),
        "overrides",
        None,
    ),
    (
        "unknown override",
        _edit(SMALL_TEXT, 'set = "EN"', 'set = "EN"\noverrides = { alpha_zz = 1 }'),
        "overrides",
        None,
    ),
    ("l0 factor with k", _edit(SMALL_TEXT, "l0_factor = 1.0", "l0_factor = 1.0\nk1y = 0.1"), "k1y", None),
    ("k values incomplete", _edit(SMALL_TEXT, "l0_factor = 1.0", "k1y = 0.1\nk2y = 0.1\nk1z = 0.1"), "k2z", None),
]
# Cases the program gets wrong today: each reason names the file and function to fix.
SCENARIO_BUGS = {
    "huge integer height": (
        _edit(SMALL_TEXT, "height_m = 4.5", "height_m = 1" + "0" * 400),
        "height_m",
        None,
        "optimizer/building/tables.py number: float() of a huge TOML integer raises OverflowError",
    ),
    "huge integer outline": (
        _edit(SMALL_TEXT, "[[-0.3, -0.3], [15.3, -0.3]", "[[-0.3, -0.3], [1" + "0" * 400 + ", -0.3]", 1),
        "outline_m",
        None,
        "optimizer/building/tables.py number: OverflowError on a huge integer",
    ),
    "storey height 1e300 m": (
        _edit(SMALL_TEXT, "height_m = 4.5", "height_m = 1e300"),
        "height_m",
        "1e+300",
        "optimizer/building/layout.py read_levels: no upper bound on height_m; a run with 1e300 m storeys is accepted",
    ),
    "stack at x = 1e300 m": (
        _edit(SMALL_TEXT, "x_m = 15.0", "x_m = 1e300"),
        "x_m",
        "1e+300",
        "optimizer/building/layout.py read_stacks: no bound on x_m/y_m; takedown then fails in "
        "shapely voronoi_polygons with GEOSException (traceback)",
    ),
    "trial size 1e300 mm": (
        _edit(SMALL_TEXT, "[350, 350]", "[1e300, 350]"),
        "trial_size_mm",
        "1e+300",
        "optimizer/building/scenario.py _read_settings: no upper bound on trial_size_mm; "
        "subframe._section_I_m4 raises OverflowError (traceback)",
    ),
    "sdl 1e300 kPa": (
        _edit(SMALL_TEXT, "sdl_kPa = 1.5", "sdl_kPa = 1e300"),
        "sdl_kPa",
        "1e+300",
        "optimizer/building/layout.py read_floors: no upper bound on loads; 1e300 kPa is accepted and "
        "actions.csv is written with 300-digit forces",
    ),
    "density 1e300 kN/m3": (
        _edit(SMALL_TEXT, "concrete_density_kN_m3 = 25.0", "concrete_density_kN_m3 = 1e300"),
        "concrete_density_kN_m3",
        "1e+300",
        "optimizer/building/scenario.py _read_materials: no upper bound on concrete_density_kN_m3",
    ),
    "concrete class below EN 1992 range": (
        _edit(SMALL_TEXT, 'concrete = "C30/37"', 'concrete = "C5"'),
        "concrete",
        "C5",
        "optimizer/building/scenario.py _concrete: fck outside 12..90 MPa accepted",
    ),
    "concrete class above EN 1992 range": (
        _edit(SMALL_TEXT, 'concrete = "C30/37"', 'concrete = "C200"'),
        "concrete",
        "C200",
        "optimizer/building/scenario.py _concrete: fck outside 12..90 MPa accepted",
    ),
}


@pytest.mark.parametrize(("text", "field", "value"), [pytest.param(t, f, v, id=i) for i, t, f, v in SCENARIO_CASES])
def test_bad_scenario(robustness_tally, text, field, value):
    _takedown(robustness_tally, text, field, value)


@pytest.mark.parametrize(
    ("text", "field", "value"), [pytest.param(t, f, v, id=i) for i, (t, f, v, _r) in SCENARIO_BUGS.items()]
)
def test_bad_scenario_fixed_bugs(robustness_tally, text, field, value):
    _takedown(robustness_tally, text, field, value)


def test_missing_scenario_file(robustness_tally, tmp_path):
    path, out = tmp_path / "nope.toml", tmp_path / "out"
    res = invoke(["takedown", str(path), "--out", str(out)])
    judge(res, robustness_tally, b"missing file", path, "(file)", "nope.toml", out)


def test_scenario_is_a_folder(robustness_tally, tmp_path):
    out = tmp_path / "out"
    res = invoke(["takedown", str(tmp_path), "--out", str(out)])
    judge(res, robustness_tally, b"folder as scenario", tmp_path, "(file)", None, out)


def test_out_is_an_existing_file(robustness_tally, tmp_path):
    scen = tmp_path / "s.toml"
    scen.write_text(SMALL_TEXT, encoding="utf-8")
    out = tmp_path / "out.txt"
    out.write_text("keep me", encoding="utf-8")
    res = invoke(["takedown", str(scen), "--out", str(out), "--no-plans"])
    try:
        judge(res, robustness_tally, b"out is a file", "--out", "--out", None)
    finally:
        assert out.read_text(encoding="utf-8") == "keep me"


def test_out_would_overwrite_the_users_csv(robustness_tally, tmp_path):
    scen_text = _edit(ANALYSIS.read_text(encoding="utf-8"), '"analysis_actions.csv"', '"actions.csv"')
    original = ANALYSIS_CSV.read_bytes().replace(b"1480.5", b"1480.50")  # a byte the writer would change
    (tmp_path / "actions.csv").write_bytes(original)
    scen = tmp_path / "s.toml"
    scen.write_text(scen_text, encoding="utf-8")
    res = invoke(["takedown", str(scen), "--out", str(tmp_path)])
    try:
        judge(res, robustness_tally, b"out over input", "--out", "--out", None)
    finally:
        assert (tmp_path / "actions.csv").read_bytes() == original, "the user's actions.csv was overwritten"


# --------------------------------------------------------------------------- [rules], [optimizer], [costs]
# These tables are read by feasibility/optimize (read_run_settings), not by takedown. A rejected
# value costs nothing through the command line; an accepted one would start an 11 s run, so the
# table cases call the reader directly and one case goes through ``colstack feasibility``.


def _run_settings_outcome(path: Path) -> Outcome:
    from optimizer.building.scenario import load_scenario
    from optimizer.errors import ColstackError
    from optimizer.pipeline.settings import read_run_settings

    try:
        read_run_settings(load_scenario(path))
    except ColstackError as exc:
        return Outcome(exc.exit_code, "", f"colstack feasibility: error: {exc}\n", None)
    except Exception:
        return Outcome(None, "", "", traceback.format_exc())
    return Outcome(0, "", "", None)


RULES_CASES = [
    ("unknown step rule", '[rules]\nstep_rule = "bogus"\n', "rules.step_rule", "bogus"),
    ("fractional min_run", "[rules]\nmin_run = 1.5\n", "rules.min_run", "1.5"),
    ("zero max_types", "[rules]\nmax_types = 0\n", "rules.max_types", "0"),
    ("monotone not a bool", '[rules]\nmonotone_sections = "yes"\n', "rules.monotone_sections", "yes"),
    ("group with unknown stack", '[rules]\ngroups = [["A1", "Z9"]]\n', "rules.groups", "Z9"),
    ("group of one", '[rules]\ngroups = [["A1"]]\n', "rules.groups", "A1"),
    ("unknown rules key", "[rules]\nmonotone = true\n", "rules.monotone", None),
    ("unknown solver", '[optimizer]\nsolver = "glpk"\n', "optimizer.solver", "glpk"),
    ("gap above one", "[optimizer]\ngap = 2\n", "optimizer.gap", "2"),
    ("zero time limit", "[optimizer]\ntime_limit_s = 0\n", "optimizer.time_limit_s", "0"),
    ("cost objective without rates", '[optimizer]\nobjective = "cost"\n', "costs.steel_per_t", None),
    ("negative steel rate", "[costs]\nsteel_per_t = -1\n", "costs.steel_per_t", "-1"),
    ("nan steel rate", "[costs]\nsteel_per_t = nan\n", "costs.steel_per_t", "nan"),
    ("bad grade in rates", '[costs]\nconcrete_per_m3 = { "C30/38" = 150 }\n', "costs.concrete_per_m3", "C30/38"),
    ("inf concrete rate", '[costs]\nconcrete_per_m3 = { "C30/37" = inf }\n', "costs.concrete_per_m3", "inf"),
    ("unknown costs key", "[costs]\nsteel = 900\n", "costs.steel", None),
]
RULES_BUGS = {
    "fractional max_types": (
        "[rules]\nmax_types = 1.5\n",
        "rules.max_types",
        "1.5",
        "optimizer/pipeline/settings.py read_run_settings: int(1.5) silently truncates max_types "
        "(and max_sections) to 1",
    ),
    "pinned is never read": (
        "[rules]\npinned = 5\n",
        "rules.pinned",
        "5",
        "optimizer/pipeline/settings.py read_run_settings: 'pinned' is in the allowed keys but never "
        "parsed: any value is accepted and ignored",
    ),
}


def _rules(tally, table: str, field: str | None, value: str | None) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "scenario.toml"
        path.write_text(_edit(SMALL_TEXT, "[takedown]", table + "\n[takedown]"), encoding="utf-8")
        judge(_run_settings_outcome(path), tally, b"rules\0" + table.encode(), path, field, value)


@pytest.mark.parametrize(("table", "field", "value"), [pytest.param(t, f, v, id=i) for i, t, f, v in RULES_CASES])
def test_bad_run_settings(robustness_tally, table, field, value):
    _rules(robustness_tally, table, field, value)


@pytest.mark.parametrize(
    ("table", "field", "value"), [pytest.param(t, f, v, id=i) for i, (t, f, v, _why) in RULES_BUGS.items()]
)
def test_bad_run_settings_fixed_bugs(robustness_tally, table, field, value):
    _rules(robustness_tally, table, field, value)


def test_bad_rules_through_feasibility(robustness_tally, tmp_path):
    path, out = tmp_path / "scenario.toml", tmp_path / "out"
    path.write_text(_edit(SMALL_TEXT, "[takedown]", '[rules]\nstep_rule = "bogus"\n[takedown]'), encoding="utf-8")
    res = invoke(["feasibility", str(path), "--out", str(out), "--quiet"])
    judge(res, robustness_tally, b"feasibility rules", path, "rules.step_rule", "bogus", out)


# --------------------------------------------------------------------------- actions CSV


def _csv_text(rows: list[list[str]]) -> str:
    return "\n".join(",".join(r) for r in rows) + "\n"


def _run_csv(tally, raw: bytes):
    """Run takedown on the analysis scenario with ``raw`` as its CSV; returns (result, csv path, out)."""
    tmp = Path(tempfile.mkdtemp())
    try:
        shutil.copy(ANALYSIS, tmp / ANALYSIS.name)
        csv_path = tmp / ANALYSIS_CSV.name
        csv_path.write_bytes(raw)
        out = tmp / "out"
        res = invoke(["takedown", str(tmp / ANALYSIS.name), "--out", str(out), "--no-plans"])
        return res, csv_path, out, out.exists()
    finally:
        shutil.rmtree(tmp)


def _csv_case(tally, raw: bytes, field: str | None, value: str | None) -> None:
    # The output-folder part of the rule is checked in test_bad_csv_leaves_no_output_folder (a known bug).
    res, csv_path, _, _ = _run_csv(tally, raw)
    judge(res, tally, b"csv\0" + raw, csv_path, field, value)


NUMERIC_COLS = ["NEd_kN", "My_top_kNm", "My_bot_kNm", "Mz_top_kNm", "Mz_bot_kNm", "l0y_mm", "l0z_mm"]


@st.composite
def csv_mutation(draw):
    """A mutation of the analysis CSV that must be rejected, with the field and value to name."""
    rows = [list(r) for r in CSV_ROWS]
    header = rows[0]
    kind = draw(
        st.sampled_from(
            [
                "drop_col",
                "rename_col",
                "bad_number",
                "non_finite",
                "dup_row",
                "drop_row",
                "unknown_stack",
                "unknown_level",
                "short_row",
                "bad_choice",
            ]
        )
    )
    r = draw(st.integers(1, len(rows) - 1))
    line = f"row {r + 1}"
    if kind == "drop_col":
        c = draw(st.integers(0, 6))
        name = header[c]
        rows = [row[:c] + row[c + 1 :] for row in rows]
        return rows, "row 1 (header)", name
    if kind == "rename_col":
        c = draw(st.integers(0, len(header) - 1))
        rows[0][c] = rows[0][c] + "_x"
        return rows, "row 1 (header)", None
    if kind in ("bad_number", "non_finite"):
        # l0 columns are optional (blank allowed): fill one of them with the bad value.
        col = draw(st.sampled_from(NUMERIC_COLS))
        new = draw(
            st.sampled_from(
                ["abc", "1.2.3", "12kN", "--5", "0x1F", "true"]
                if kind == "bad_number"
                else ["nan", "NaN", "inf", "-inf", "1e999", "Infinity"]
            )
        )
        rows[r][header.index(col)] = new
        return rows, f"{line}, column {col}", new
    if kind == "dup_row":
        rows.append(list(rows[r]))
        return rows, f"row {len(rows)}", f"{rows[r][0]},{rows[r][1]}"
    if kind == "drop_row":
        gone = rows.pop(r)
        return rows, "rows", f"{gone[0]},{gone[1]}"
    if kind == "unknown_stack":
        rows[r][0] = draw(st.sampled_from(["K9", "k1", "A1", "K 1"]))
        return rows, f"{line}, column stack", rows[r][0]
    if kind == "unknown_level":
        rows[r][1] = draw(st.sampled_from(["G5", "G0", "g1", "L1"]))
        return rows, f"{line}, column level", rows[r][1]
    if kind == "short_row":
        del rows[r][draw(st.integers(0, len(header) - 1))]
        return rows, line, None
    col = draw(st.sampled_from(["exposure", "fire"]))
    rows[r][header.index(col)] = draw(st.sampled_from(["XC9", "R45", "xx", "R 60"]))
    return rows, f"{line}, column {col}", rows[r][header.index(col)]


@settings(max_examples=80, deadline=None, derandomize=True)
@given(csv_mutation())
def test_fuzz_csv_mutations(robustness_tally, case):
    rows, field, value = case
    _csv_case(robustness_tally, _csv_text(rows).encode("utf-8"), field, value)


CSV_TEXT = ANALYSIS_CSV.read_text(encoding="utf-8")
CSV_CASES = [
    ("empty file", b"", "row 1", None),
    ("header only", CSV_TEXT.splitlines()[0].encode() + b"\n", "rows", "K1,G1"),
    ("no header", "\n".join(CSV_TEXT.splitlines()[1:]).encode(), "row 1 (header)", None),
    (
        "column twice",
        CSV_TEXT.replace("fire\n", "fire,fire\n", 1)
        .replace(",R60\n", ",R60,R60\n")
        .replace(",,,,\n", ",,,,,\n")
        .encode(),
        "row 1 (header)",
        None,
    ),
    (
        "k columns incomplete",
        CSV_TEXT.replace("fire\n", "fire,k1y\n", 1)
        .replace(",R60\n", ",R60,0.1\n")
        .replace(",,,,\n", ",,,,,\n")
        .encode(),
        "row 1 (header)",
        "k1y",
    ),
    ("negative NEd", CSV_TEXT.replace("K1,G2,1105.0", "K1,G2,-1105.0").encode(), "row 3, column NEd_kN", "-1105.0"),
    ("blank NEd", CSV_TEXT.replace("K1,G2,1105.0", "K1,G2,").encode(), "row 3, column NEd_kN", None),
    ("zero l0", CSV_TEXT.replace("3700,3700,XC3", "0,3700,XC3", 1).encode(), "row 2, column l0y_mm", "0"),
    ("decimal comma", CSV_TEXT.replace("K1,G2,1105.0", 'K1,G2,"1105,0"').encode(), "row 3, column NEd_kN", "1105,0"),
    ("non-utf8 byte", CSV_TEXT.encode().replace(b"K3,G2", b"K\xff3,G2"), "(file)", None),
    ("latin-1 text", CSV_TEXT.replace("K1,G2", "K\u00e91,G2").encode("latin-1"), "(file)", None),
    ("utf-16", CSV_TEXT.encode("utf-16"), "(file)", None),
    ("row for a level the stack skips", CSV_TEXT.replace("K4,G4", "K4,G9").encode(), "row 17, column level", "G9"),
    ("semicolon separated", CSV_TEXT.replace(",", ";").encode(), "row 1 (header)", None),
]


@pytest.mark.parametrize(("raw", "field", "value"), [pytest.param(r, f, v, id=i) for i, r, f, v in CSV_CASES])
def test_bad_csv(robustness_tally, raw, field, value):
    _csv_case(robustness_tally, raw, field, value)


@pytest.mark.parametrize("raw", [pytest.param(r, id=i) for i, r, _, _ in CSV_CASES[:3]])
def test_bad_csv_leaves_no_output_folder(robustness_tally, raw):
    res, _, out, existed = _run_csv(robustness_tally, raw)
    assert res.code == 2
    assert not existed, f"{out} was created although the input was rejected"


def test_missing_csv_after_loading(robustness_tally, tmp_path):
    """A scenario naming a CSV that is a folder: the loader rejects it."""
    shutil.copy(ANALYSIS, tmp_path / ANALYSIS.name)
    (tmp_path / ANALYSIS_CSV.name).mkdir()
    out = tmp_path / "out"
    res = invoke(["takedown", str(tmp_path / ANALYSIS.name), "--out", str(out)])
    judge(res, robustness_tally, b"csv is a folder", tmp_path / ANALYSIS.name, "actions", None, out)


# --------------------------------------------------------------------------- check specs


def _check(tally, raw: bytes, field: str | None, value: str | None, suffix: str = ".toml") -> None:
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        path = tmp / f"column{suffix}"
        path.write_bytes(raw)
        out = tmp / "out"
        res = invoke(["check", str(path), "--html", str(out / "sheet.html")])
        judge(res, tally, b"check\0" + suffix.encode() + raw, path, field, value, out)


@settings(
    max_examples=80,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
@given(tree_mutation(CHECK_DATA, list(CHECK_REQUIRED), CHECK_CHOICES, required_names=CHECK_REQUIRED))
def test_fuzz_check_spec_mutations(robustness_tally, m):
    _check(robustness_tally, dump_toml(m.data).encode("utf-8"), m.field, m.value)


CHECK_JSON = json.dumps(CHECK_DATA)
CHECK_CASES = [
    ("json nan", CHECK_JSON.replace('"NEd": 2100', '"NEd": NaN'), ".json", "NEd", "nan"),
    ("json infinity", CHECK_JSON.replace('"b": 350', '"b": Infinity'), ".json", "b", "inf"),
    ("json syntax", CHECK_JSON[:-5], ".json", "line 1", None),
    ("json list at top", "[1, 2]", ".json", "top level", None),
    ("yaml suffix", "b: 350", ".yaml", "file", ".yaml"),
    ("empty toml", "", ".toml", None, None),
    ("negative cover", CHECK_JSON.replace('"cover": 35', '"cover": -35'), ".json", "cover", "-35"),
    ("zero width", CHECK_JSON.replace('"b": 350', '"b": 0'), ".json", "b", "0"),
    ("bars of one", CHECK_JSON.replace('"nb": 3', '"nb": 1'), ".json", "bars.nb", "1"),
    ("fractional bars", CHECK_JSON.replace('"nb": 3', '"nb": 3.5'), ".json", "bars.nb", "3.5"),
    ("fck and grade", CHECK_JSON.replace('"fyk": 500', '"fyk": 500, "fck": 35'), ".json", "grade", None),
    (
        "l0 factor without height",
        CHECK_JSON.replace('"height": 6500, ', "").replace('"k1y": 0.4', '"k1y": 0.4, "l0_factor": 1'),
        ".json",
        "height",
        None,
    ),
    ("moment pair of three", CHECK_JSON.replace('"My": [95, -40]', '"My": [95, -40, 3]'), ".json", "My", None),
    (
        "national not a string",
        CHECK_JSON.replace('"b": 350', '"b": 350, "national": ["EN"]'),
        ".json",
        "national",
        None,
    ),
    ("non-utf8", CHECK_SPEC.read_bytes().replace(b"350", b"3\xff50", 1), ".toml", "file", None),
]
CHECK_BUGS = {
    "huge json integer": (
        CHECK_JSON.replace('"b": 350', '"b": 1' + "0" * 400),
        ".json",
        "b",
        None,
        "optimizer/cli/spec.py number: float() of a huge integer raises OverflowError",
    ),
    "grade not a string": (
        CHECK_JSON.replace('"grade": "C35/45"', '"grade": 35'),
        ".json",
        "grade",
        "35",
        "optimizer/cli/spec.py section_spec: grade = 35 is read as 'C35' via str(); a number is "
        "accepted where a class name is required",
    ),
    "working life as text": (
        CHECK_JSON.replace('"braced": true', '"braced": true, "working_life_100y": "no"'),
        ".json",
        "working_life_100y",
        "no",
        "optimizer/cli/check.py parse_check_spec: bool('no') is True; the value is not checked to be true or false",
    ),
}


@pytest.mark.parametrize(
    ("raw", "suffix", "field", "value"), [pytest.param(r, s, f, v, id=i) for i, r, s, f, v in CHECK_CASES]
)
def test_bad_check_spec(robustness_tally, raw, suffix, field, value):
    _check(robustness_tally, raw.encode("utf-8") if isinstance(raw, str) else raw, field, value, suffix)


@pytest.mark.parametrize(
    ("raw", "suffix", "field", "value"),
    [pytest.param(r, s, f, v, id=i) for i, (r, s, f, v, _why) in CHECK_BUGS.items()],
)
def test_bad_check_spec_fixed_bugs(robustness_tally, raw, suffix, field, value):
    _check(robustness_tally, raw.encode("utf-8"), field, value, suffix)


def test_tally_counts_what_ran(robustness_tally):
    """The registry behind the end-of-run line holds real outcomes of this module."""
    assert robustness_tally.tried >= 1
    assert (
        robustness_tally.count("clean") + robustness_tally.count("crash") + robustness_tally.count("unclear")
        == robustness_tally.tried
    )
