"""The report opens in a real browser (headless Chromium): it renders something and logs no console error.

Skipped when no Chromium binary is found. On Debian and Ubuntu:
``apt-get install -y chromium`` (Debian) or ``chromium-browser`` (Ubuntu).
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
from pathlib import Path

import numpy as np
import pytest

from optimizer.pipeline.run import run_scenario
from optimizer.reporting.outputs import write_outputs
from optimizer.reporting.report import write_report
from tests.support import paths

ROOT = paths.ROOT
SCENARIO = ROOT / "scenarios" / "small_building.toml"


def _chromium() -> str | None:
    for name in (
        os.environ.get("COLSTACK_CHROMIUM"),
        "chromium",
        "chromium-browser",
        "google-chrome",
        "/usr/bin/chromium",
    ):
        if name and (found := shutil.which(name)):
            return found
    return None


CHROMIUM = _chromium()
pytestmark = [
    pytest.mark.slow,  # a real browser: left out of `make test-fast`
    pytest.mark.skipif(
        CHROMIUM is None,
        reason="no Chromium binary found (apt-get install -y chromium); "
        "set COLSTACK_CHROMIUM to its path to run the browser test",
    ),
]


def _screenshot(page: Path, png: Path, profile: Path, size: str = "1280,2000") -> str:
    """Load ``page`` in headless Chromium, write a screenshot; return Chromium's stderr log."""
    cmd = [
        CHROMIUM,
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        f"--user-data-dir={profile}",
        "--enable-logging=stderr",
        "--v=0",
        f"--screenshot={png}",
        f"--window-size={size}",
        page.resolve().as_uri(),
    ]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=120, stdin=subprocess.DEVNULL)
    assert png.is_file(), f"no screenshot; exit {proc.returncode}; stderr tail:\n{proc.stderr[-2000:]}"
    return proc.stderr


# Chromium logs every message the page writes to its console (console.log/error, uncaught exceptions) as a
# line "[pid:tid:time:LEVEL:CONSOLE:line] "message", source: <url> (line)" -- at INFO level even for
# errors in current versions, "ERROR:CONSOLE(n)" in some older ones. Everything else on stderr is the
# browser's own start-up noise in a container (D-Bus not found, no GPU, sandbox warnings, ...), which has
# nothing to do with the page and is ignored. So: a line is a page problem when it is a CONSOLE line whose
# source is the page itself, or any line saying "Uncaught". The report runs no script, so it must log
# nothing at all to the console.
_CONSOLE = re.compile(r":CONSOLE[:(]\d+\)?\]")


def page_console_problems(stderr: str, page: Path) -> list[str]:
    """The console lines in Chromium's log that belong to ``page`` (see the comment above)."""
    url = page.resolve().as_uri()
    return [ln for ln in stderr.splitlines() if (_CONSOLE.search(ln) and url in ln) or "Uncaught" in ln]


def _pixels(png: Path) -> np.ndarray:
    import matplotlib.image as mpimg

    return mpimg.imread(png)[..., :3]


@pytest.fixture(scope="module")
def report(tmp_path_factory) -> Path:
    run = run_scenario(str(SCENARIO), time_limit_s=30)
    folder = tmp_path_factory.mktemp("browser") / "out"
    write_outputs(run, folder, extras=[write_report])  # the report draws its own pictures
    return folder / "report.html"


def test_report_renders_without_console_errors(report, tmp_path):
    png = tmp_path / "report.png"
    log = _screenshot(report, png, tmp_path / "profile")
    problems = page_console_problems(log, report)
    assert problems == [], "\n".join(problems)
    px = _pixels(png)
    assert px.shape[0] >= 1900 and px.shape[1] >= 1200
    # not blank: real variation, some dark text, and mostly (but not only) a light page
    assert float(px.std()) > 0.05
    dark = (px.mean(axis=2) < 0.35).mean()
    light = (px.mean(axis=2) > 0.9).mean()
    assert 0.005 < dark < 0.5
    assert light > 0.4
    # the caution band (its orange edge) is painted near the top of the page
    top = px[:400]
    orange = (top[..., 0] > 0.6) & (top[..., 1] < 0.4) & (top[..., 2] < 0.2)
    assert orange.sum() > 200


def test_the_filter_catches_a_page_error(tmp_path):
    """Control: a page that throws is caught by the same filter (so a clean result means something)."""
    page = tmp_path / "bad.html"
    page.write_text(
        "<!DOCTYPE html><html><body><p>control page</p>"
        "<script>console.error('deliberate'); notDefinedAnywhere();</script></body></html>",
        encoding="utf-8",
    )
    log = _screenshot(page, tmp_path / "bad.png", tmp_path / "profile", size="400,300")
    problems = page_console_problems(log, page)
    assert any("notDefinedAnywhere" in p for p in problems), log[-2000:]
