"""The package layout holds: stages in order, no import cycles, no private names across modules.

Read from the source with ``ast`` (nothing is imported), so a violation fails here before it
confuses anyone. The rules, and the stated exceptions to the size limits, are in DEVELOPERS.md.

* ``optimizer`` is one subpackage per stage of the data's path; a stage imports only the stages
  before it (``building`` -> ``candidates`` -> ``schedule`` -> ``pipeline`` -> ``reporting`` ->
  ``studies`` -> ``cli``); ``schedule`` works on plain data and imports no other stage;
  ``optimizer.errors`` and ``optimizer`` itself (CAUTION, __version__) are below every stage.
* nothing outside ``optimizer.cli`` imports it; ``design`` never imports ``optimizer``.
* no import cycle between modules (imports inside functions count; ``if TYPE_CHECKING:`` blocks
  do not, as they never run).
* no module imports another module's private name (one leading underscore).
* no folder holds more than 15 modules; no module is over 700 lines unless DEVELOPERS.md names it
  with its reason (section "Large modules").
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import networkx as nx
import pytest

from tests.support import paths

ROOT = paths.ROOT
PACKAGES = ("design", "optimizer")
STAGES = ("building", "candidates", "schedule", "pipeline", "reporting", "studies", "cli")
MAX_MODULES = 15
MAX_LINES = 700


def _module_name(path: Path) -> str:
    rel = path.relative_to(ROOT).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def _sources() -> dict[str, Path]:
    out = {}
    for pkg in PACKAGES:
        for path in sorted((ROOT / pkg).rglob("*.py")):
            out[_module_name(path)] = path
    return out


SOURCES = _sources()


def _type_checking_nodes(tree: ast.AST) -> set[int]:
    skip: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            for child in node.body:
                for sub in ast.walk(child):
                    skip.add(id(sub))
    return skip


def _imports(name: str, path: Path) -> list[tuple[str, list[str], int]]:
    """(imported module, names taken from it, line) for every import that runs."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    skip = _type_checking_nodes(tree)
    is_pkg = path.name == "__init__.py"
    out = []
    for node in ast.walk(tree):
        if id(node) in skip:
            continue
        if isinstance(node, ast.Import):
            out += [(a.name, [], node.lineno) for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = name.split(".") if is_pkg else name.split(".")[:-1]
                base = base[: len(base) - (node.level - 1)]
                mod = ".".join(base + ([node.module] if node.module else []))
            else:
                mod = node.module or ""
            names = [a.name for a in node.names]
            # "from pkg import module" takes a module, not a name
            subs = [n for n in names if f"{mod}.{n}" in SOURCES]
            out += [(f"{mod}.{n}", [], node.lineno) for n in subs]
            rest = [n for n in names if n not in subs]
            if rest:
                out.append((mod, rest, node.lineno))
    return [(m, n, ln) for m, n, ln in out if m.split(".")[0] in PACKAGES]


IMPORTS = {name: _imports(name, path) for name, path in SOURCES.items()}


def _stage(module: str) -> str | None:
    parts = module.split(".")
    return parts[1] if parts[0] == "optimizer" and len(parts) > 1 and parts[1] in STAGES else None


def test_design_never_imports_optimizer():
    bad = [
        f"{m} line {ln}: {t}"
        for m, imps in IMPORTS.items()
        if m.startswith("design")
        for t, _, ln in imps
        if t.startswith("optimizer")
    ]
    assert not bad, bad


def test_stages_import_only_earlier_stages():
    bad = []
    for m, imps in IMPORTS.items():
        here = _stage(m)
        if here is None:
            if m.startswith("optimizer"):  # optimizer itself and optimizer.errors: below every stage
                bad += [f"{m} line {ln}: imports {t}" for t, _, ln in imps if _stage(t) is not None]
            continue
        for t, _, ln in imps:
            there = _stage(t)
            if there is None or there == here:
                continue
            if here == "schedule" or STAGES.index(there) > STAGES.index(here):
                bad.append(f"{m} line {ln}: the {here} stage imports {t} ({there})")
    assert not bad, "\n".join(bad)


def test_nothing_outside_cli_imports_cli():
    bad = [
        f"{m} line {ln}: {t}"
        for m, imps in IMPORTS.items()
        if _stage(m) != "cli"
        for t, _, ln in imps
        if _stage(t) == "cli"
    ]
    assert not bad, bad


def test_no_import_cycles():
    g = nx.DiGraph()
    for m, imps in IMPORTS.items():
        g.add_node(m)
        for t, _, _ in imps:
            target = t if t in SOURCES else next((s for s in (t.rsplit(".", 1)[0],) if s in SOURCES), None)
            if target is not None and target != m:
                g.add_edge(m, target)
    # a package's __init__ importing its own modules is how a package shows its face, not a cycle
    for m in list(g.nodes):
        for t in list(g.successors(m)):
            if t.startswith(m + "."):
                g.remove_edge(m, t)
    cycles = list(nx.simple_cycles(g))
    assert not cycles, "import cycles: " + "; ".join(" -> ".join(c + [c[0]]) for c in cycles[:10])


def test_no_private_name_is_imported_across_modules():
    bad = []
    for m, imps in IMPORTS.items():
        for t, names, ln in imps:
            if t == m:
                continue
            private = [n for n in names if n.startswith("_") and not (n.startswith("__") and n.endswith("__"))]
            if private:
                bad.append(f"{m} line {ln}: {', '.join(private)} from {t}")
    assert not bad, "\n".join(bad)


def _stated_large_modules() -> set[str]:
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    m = re.search(r"^### Large modules\n(.*?)(?=^#)", text, re.M | re.S)
    return set(re.findall(r"`([\w/]+\.py)`", m.group(1))) if m else set()


def test_no_folder_over_15_modules():
    folders: dict[Path, int] = {}
    for path in SOURCES.values():
        if path.name != "__init__.py":
            folders[path.parent] = folders.get(path.parent, 0) + 1
    bad = {str(f.relative_to(ROOT)): n for f, n in folders.items() if n > MAX_MODULES}
    assert not bad, bad


@pytest.mark.parametrize("name", sorted(SOURCES))
def test_no_module_over_700_lines_without_a_stated_reason(name):
    path = SOURCES[name]
    n = len(path.read_text(encoding="utf-8").splitlines())
    rel = str(path.relative_to(ROOT))
    if n > MAX_LINES:
        assert rel in _stated_large_modules(), f"{rel}: {n} lines; split it or state why in DEVELOPERS.md"
