"""A small TOML writer for the tests that build scenario and specification files (the inverse of tomllib)."""

from __future__ import annotations

import json
import math
import re

__all__ = ["dump_toml", "toml_value"]

_BARE = re.compile(r"^[A-Za-z0-9_-]+$")


def _toml_key(k: str) -> str:
    return k if _BARE.match(k) else json.dumps(k, ensure_ascii=False)


def toml_value(v: object) -> str:
    """One TOML value (inline tables and arrays; nan and inf spelled the TOML way)."""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v, ensure_ascii=False)
    if isinstance(v, list):
        return "[" + ", ".join(toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_toml_key(k)} = {toml_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(type(v))


def dump_toml(data: dict) -> str:
    """A TOML document with every top-level key as ``key = inline value``."""
    return "".join(f"{_toml_key(k)} = {toml_value(v)}\n" for k, v in data.items())
