"""Shared pieces of the test suite: paths of the bundled files, test oracles, a TOML writer."""
