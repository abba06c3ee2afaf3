"""Paths of the project's bundled files, for the tests (one place instead of one per test module)."""

from __future__ import annotations

from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
SCENARIOS = ROOT / "scenarios"
SMALL = SCENARIOS / "small_building.toml"
DEMO = SCENARIOS / "demo_tower.toml"
ANALYSIS = SCENARIOS / "analysis_actions.toml"
ANALYSIS_CSV = SCENARIOS / "analysis_actions.csv"
EXAMPLES = ROOT / "examples"
EXAMPLE = EXAMPLES / "column_slender_biaxial.toml"
