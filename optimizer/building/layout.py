"""Reading the building's layout: levels, column stacks with their supports, floor plates.

Part of reading a scenario file (:mod:`optimizer.building.scenario`): each function reads one
kind of table into the frozen types of :mod:`optimizer.building.model` and raises
:class:`optimizer.errors.InputError` naming the file, the key, the value and what was expected.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable, Mapping, Sequence

import networkx as nx
from shapely.geometry import Polygon

from optimizer.building.loads import PSI_FACTORS, Category
from optimizer.building.model import Floor, Level, LevelFloor, Orientation, Stack, SupportKind
from optimizer.building.tables import MISSING, TomlTable, number
from optimizer.errors import InputError, did_you_mean

__all__ = [
    "POSITION_TOLERANCE_M",
    "read_levels",
    "level_range",
    "stack_list",
    "read_stacks",
    "check_stack_supports",
    "read_floors",
]

# Stack ids and level names: safe in CSV files and file names.
_ID_RE = re.compile(r"^[A-Za-z0-9_.\-]+$")

# Two stacks closer than this in plan, over common levels, overlap.
POSITION_TOLERANCE_M = 0.05


def _identifier(t: TomlTable, name: str) -> str:
    value = t.str_(name)
    if not _ID_RE.match(value):
        raise InputError(t.file, t.key(name), value, "letters, digits, '_', '-' or '.' only (no spaces or commas)")
    return value


def _points(file: str, key: str, value: object) -> tuple[tuple[float, float], ...]:
    if not isinstance(value, list) or len(value) < 3:
        raise InputError(file, key, value, "a list of at least 3 [x, y] points in m")
    pts = []
    for i, p in enumerate(value):
        if not isinstance(p, list) or len(p) != 2:
            raise InputError(file, f"{key}[{i}]", p, "a point [x, y] in m")
        pts.append((number(file, f"{key}[{i}][0]", p[0]), number(file, f"{key}[{i}][1]", p[1])))
    poly = Polygon(pts)
    if not poly.is_valid or poly.area <= 0:
        raise InputError(file, key, value, "a simple polygon (no self-crossing) with positive area")
    return tuple(pts)


def read_levels(top: TomlTable) -> tuple[Level, ...]:
    """The ``[[levels]]``, bottom to top, with their elevations above the foundation, m."""
    tables = top.array_of_tables("levels")
    levels: list[Level] = []
    elevation = 0.0
    seen: set[str] = set()
    for i, t in enumerate(tables):
        name = _identifier(t, "name")
        if name in seen:
            raise InputError(t.file, t.key("name"), name, "a level name used only once")
        seen.add(name)
        height = t.num("height_m", positive=True, maximum=1e4)
        slab = t.num("slab_depth_mm", minimum=0.0, maximum=1e5)
        if slab >= height * 1000.0:
            raise InputError(
                t.file,
                t.key("slab_depth_mm"),
                slab,
                f"a slab depth smaller than the floor-to-floor height ({height * 1000:g} mm)",
            )
        cat = t.choice("category", Category, required=False)
        t.done()
        levels.append(Level(name, i, height, slab, elevation, cat))
        elevation += height
    return tuple(levels)


def level_range(file: str, key: str, value: object, index: Mapping[str, int], names: Sequence[str]) -> tuple[str, ...]:
    """A level range [first, last] (inclusive, bottom to top) or a single level name."""
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or len(value) not in (1, 2) or not all(isinstance(v, str) for v in value):
        raise InputError(file, key, value, 'a level name or a range ["FIRST", "LAST"]')
    for v in value:
        if v not in index:
            raise InputError(file, key, v, f"a known level name{did_you_mean(v, index)}")
    lo, hi = index[value[0]], index[value[-1]]
    if lo > hi:
        raise InputError(file, key, value, "a range from a lower level to a higher one")
    return tuple(names[lo : hi + 1])


def stack_list(file: str, key: str, value: object, known: Iterable[str]) -> tuple[str, ...]:
    """A list of known stack ids (or a single id)."""
    known = list(known)
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not value or not all(isinstance(v, str) for v in value):
        raise InputError(file, key, value, "a list of stack ids")
    for v in value:
        if v not in known:
            raise InputError(file, key, v, f"a known stack id{did_you_mean(v, known)}")
    return tuple(value)


def read_stacks(top: TomlTable, levels: Sequence[Level]) -> tuple[Stack, ...]:
    """The ``[[stacks]]``: plan position, orientation, levels and what each stands on."""
    index = {lv.name: lv.index for lv in levels}
    stacks: list[Stack] = []
    tables = top.array_of_tables("stacks")
    seen: set[str] = set()
    for i, t in enumerate(tables):
        sid = _identifier(t, "id")
        if sid in seen:
            raise InputError(t.file, t.key("id"), sid, "a stack id used only once")
        seen.add(sid)
        x, y = t.num("x_m", minimum=-1e6, maximum=1e6), t.num("y_m", minimum=-1e6, maximum=1e6)
        orient = t.choice("orientation", Orientation, required=False, default=Orientation.B_ALONG_X)
        lo = t.str_("from_level")
        hi = t.str_("to_level")
        for key, v in (("from_level", lo), ("to_level", hi)):
            if v not in index:
                raise InputError(t.file, t.key(key), v, f"a known level name{did_you_mean(v, index)}")
        if index[lo] > index[hi]:
            raise InputError(t.file, t.key("to_level"), hi, f"a level at or above from_level {lo!r}")
        kind, carried = _read_support(t, sid)
        t.done()
        stacks.append(Stack(sid, i, x, y, orient, lo, hi, kind, carried))
    return tuple(stacks)


def _read_support(t: TomlTable, sid: str) -> tuple[SupportKind, tuple[tuple[str, float], ...]]:
    value = t.raw("stands_on")
    key = t.key("stands_on")
    expected = "'foundation', 'external', or a table of supporting stacks and shares such as { P1 = 0.6, P2 = 0.4 }"
    if isinstance(value, str):
        if value in (SupportKind.FOUNDATION.value, SupportKind.EXTERNAL.value):
            return SupportKind(value), ()
        raise InputError(t.file, key, value, expected + did_you_mean(value, ["foundation", "external"]))
    if not isinstance(value, dict) or not value:
        raise InputError(t.file, key, value, expected)
    carried = []
    for other, share in value.items():
        s = number(t.file, f"{key}.{other}", share)
        if not 0.0 < s <= 1.0:
            raise InputError(t.file, f"{key}.{other}", share, "a share greater than 0 and at most 1")
        if other == sid:
            raise InputError(t.file, f"{key}.{other}", share, "another stack (a stack cannot carry itself)")
        carried.append((other, s))
    total = sum(s for _, s in carried)
    if abs(total - 1.0) > 1e-6:
        raise InputError(t.file, key, value, f"shares summing to 1 (they sum to {total:g})")
    return SupportKind.TRANSFER, tuple(carried)


def check_stack_supports(file: str, stacks: Sequence[Stack], levels: Sequence[Level]) -> None:  # noqa: PLR0912 - validates one input table, one branch per support rule
    """Unknown supports, support cycles, missing support cells, overlapping stacks."""
    by_id = {s.id: s for s in stacks}
    index = {lv.name: lv.index for lv in levels}
    g = nx.DiGraph()
    for s in stacks:
        g.add_node(s.id)
        for other, _ in s.carried_by:
            key = f"stacks[{s.index}].stands_on.{other}"
            if other not in by_id:
                raise InputError(file, key, other, f"a known stack id{did_you_mean(other, by_id)}")
            g.add_edge(s.id, other)
    try:
        cycle = nx.find_cycle(g)
    except nx.NetworkXNoCycle:
        cycle = None
    if cycle:
        names = " -> ".join([a for a, _ in cycle] + [cycle[0][0]])
        raise InputError(file, "stacks.stands_on", names, "stacks that do not carry each other in a cycle")
    for s in stacks:
        if s.support is not SupportKind.TRANSFER:
            continue
        lo = index[s.from_level]
        key = f"stacks[{s.index}].stands_on"
        if lo == 0:
            raise InputError(
                file,
                key,
                dict(s.carried_by),
                f"'foundation' or 'external': stack {s.id!r} starts at the lowest "
                f"level {s.from_level!r}, so no stack can be below it",
            )
        below = levels[lo - 1].name
        for other, _ in s.carried_by:
            o = by_id[other]
            if not index[o.from_level] <= lo - 1 <= index[o.to_level]:
                raise InputError(
                    file,
                    f"{key}.{other}",
                    other,
                    f"a stack that runs through level {below!r} (the level below "
                    f"{s.id!r}'s lowest level {s.from_level!r}); {other!r} runs "
                    f"{o.from_level}..{o.to_level}",
                )
    for i, a in enumerate(stacks):
        for b in stacks[i + 1 :]:
            if math.hypot(a.x_m - b.x_m, a.y_m - b.y_m) > POSITION_TOLERANCE_M:
                continue
            if index[a.from_level] <= index[b.to_level] and index[b.from_level] <= index[a.to_level]:
                raise InputError(
                    file,
                    f"stacks[{b.index}].x_m/y_m",
                    (b.x_m, b.y_m),
                    f"a position not shared with stack {a.id!r} over common levels "
                    f"(stacks closer than {POSITION_TOLERANCE_M * 1000:g} mm overlap)",
                )


def read_floors(top: TomlTable, levels: Sequence[Level]) -> tuple[tuple[Floor, ...], tuple[LevelFloor, ...]]:
    """The ``[[floors]]`` and, per level, its floor plate with the resolved category and psi0."""
    index = {lv.name: lv.index for lv in levels}
    names = [lv.name for lv in levels]
    floors: list[Floor] = []
    owner: dict[str, int] = {}
    level_floors: dict[str, LevelFloor] = {}
    for i, t in enumerate(top.array_of_tables("floors")):
        rng = level_range(t.file, t.key("levels"), t.raw("levels"), index, names)
        outline = _points(t.file, t.key("outline_m"), t.raw("outline_m"))
        holes_raw = t.raw("holes_m", required=False)
        holes: list[tuple[tuple[float, float], ...]] = []
        if holes_raw is not MISSING:
            if not isinstance(holes_raw, list):
                raise InputError(t.file, t.key("holes_m"), holes_raw, "a list of polygons")
            for j, h in enumerate(holes_raw):
                pts = _points(t.file, f"{t.key('holes_m')}[{j}]", h)
                if not Polygon(outline).contains(Polygon(pts)):
                    raise InputError(t.file, f"{t.key('holes_m')}[{j}]", h, "a hole lying inside the outline")
                holes.append(pts)
        floor = Floor(
            index=i,
            levels=rng,
            outline_m=outline,
            holes_m=tuple(holes),
            sdl_kPa=t.num("sdl_kPa", minimum=0.0, maximum=1e4),
            imposed_kPa=t.num("imposed_kPa", minimum=0.0, maximum=1e4),
            facade_kN_m=t.num("facade_kN_m", minimum=0.0, maximum=1e5),
            category=t.choice("category", Category, required=False),
            psi0=t.num("psi0", required=False, minimum=0.0, maximum=1.0),
        )
        t.done()
        if floor.polygon.area <= 0:
            raise InputError(t.file, t.key("holes_m"), holes_raw, "holes leaving some floor area")
        floors.append(floor)
        for name in rng:
            if name in owner:
                raise InputError(t.file, t.key("levels"), name, f"levels not already covered by floors[{owner[name]}]")
            owner[name] = i
            lv = levels[index[name]]
            cat = floor.category or lv.category
            if cat is None:
                raise InputError(
                    t.file, t.key("category"), None, f"a category of use for level {name!r} (on the floor or the level)"
                )
            if floor.category and lv.category and floor.category != lv.category:
                raise InputError(
                    t.file,
                    t.key("category"),
                    floor.category.value,
                    f"the category of level {name!r} ({lv.category.value}) or no category on one of the two",
                )
            p0 = floor.psi0 if floor.psi0 is not None else PSI_FACTORS[cat].psi0
            level_floors[name] = LevelFloor(name, floor, cat, p0)
    missing = [n for n in names if n not in owner]
    if missing:
        raise InputError(
            top.file, "floors", missing[0], "a floor plate for every level (floors[].levels does not cover it)"
        )
    return tuple(floors), tuple(level_floors[n] for n in names)
