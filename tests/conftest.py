"""Shared pytest fixtures and hooks.

Fixtures: the small building of ``scenarios/`` loaded once per session (``small_scenario``) and its
feasibility matrix (``small_matrix``: scenario, catalogue, actions, matrix), shared by every test
module that works on it; paths of the bundled files are in ``tests/support/paths.py``.

Hook: the robustness tally printed at the end of the run.

The fuzz tests (tests/test_robustness_fuzz.py) feed bad inputs to the command
line and record each outcome here through the ``robustness_tally`` fixture;
``pytest_terminal_summary`` prints one line with the counts, and nothing at
all when no fuzz test ran.
"""

from __future__ import annotations

import hashlib

import pytest


class RobustnessTally:
    """Counts of bad inputs tried and how the program answered them.

    * clean: exit status 2 and exactly one stderr line naming the file;
    * crash: an unexpected exception (traceback) or an exit status other than 2
      (including 0: a bad input accepted);
    * unclear: exit status 2 but not one line naming the file.

    Inputs are counted once each (hypothesis replays failing examples while
    shrinking; a replay is not a new input).
    """

    def __init__(self) -> None:
        self.seen: dict[str, str] = {}

    def record(self, key: bytes, kind: str) -> None:
        """Record the outcome ``kind`` ('clean', 'crash', 'unclear') of the input identified by ``key``."""
        if kind not in ("clean", "crash", "unclear"):
            raise ValueError(kind)
        self.seen.setdefault(hashlib.sha256(key).hexdigest(), kind)

    def count(self, kind: str) -> int:
        """Number of distinct inputs with outcome ``kind``."""
        return sum(1 for k in self.seen.values() if k == kind)

    @property
    def tried(self) -> int:
        """Number of distinct bad inputs tried."""
        return len(self.seen)

    def line(self) -> str:
        """The one-line summary."""
        text = (
            f"robustness: {self.tried} bad inputs tried, {self.count('clean')} clean errors, "
            f"{self.count('crash')} crashes"
        )
        unclear = self.count("unclear")
        return text + (f", {unclear} unclear messages" if unclear else "")


_TALLY = pytest.StashKey[RobustnessTally]()


@pytest.fixture(scope="session")
def small_scenario():
    """The bundled small building (scenarios/small_building.toml), loaded once."""
    from optimizer.building.scenario import load_scenario
    from tests.support import paths

    return load_scenario(paths.SMALL)


@pytest.fixture(scope="session")
def small_matrix(small_scenario):
    """(scenario, catalogue, actions, feasibility matrix) of the small building, computed once."""
    from optimizer.building.takedown import scenario_actions
    from optimizer.candidates.catalogue import build_catalogue
    from optimizer.candidates.feasibility import feasibility

    cat = build_catalogue(small_scenario)
    act = scenario_actions(small_scenario)
    return small_scenario, cat, act, feasibility(small_scenario, cat, act)


@pytest.fixture(scope="session")
def robustness_tally(pytestconfig: pytest.Config) -> RobustnessTally:
    """The session's robustness tally (kept in the config stash)."""
    return pytestconfig.stash.setdefault(_TALLY, RobustnessTally())


def pytest_terminal_summary(terminalreporter, exitstatus, config) -> None:
    """Print the robustness line when the fuzz tests ran."""
    tally = config.stash.get(_TALLY, None)
    if tally is None or tally.tried == 0:
        return
    terminalreporter.write_line(tally.line())
