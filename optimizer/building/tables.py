"""Reading TOML tables with one-line errors: the reader the scenario, catalogue and settings share.

A :class:`TomlTable` wraps one table of a parsed TOML file. Each read names the
key it wants and what it must be; a wrong value, a missing key or a key nobody
read (a misspelling) raises :class:`optimizer.errors.InputError` naming the
file, the full key path, the value and what was expected.
"""

from __future__ import annotations

import difflib
import math
from enum import Enum
from typing import Any

from optimizer.building.model import TOP_LEVEL_KEYS
from optimizer.errors import InputError, did_you_mean

__all__ = ["MISSING", "TomlTable", "number"]

# What :meth:`TomlTable.raw` returns for an optional key that is absent.
MISSING = object()


def number(
    file: str,
    key: str,
    value: object,
    minimum: float | None = None,
    positive: bool = False,
    maximum: float | None = None,
) -> float:
    """A finite number within the given bounds, as a float.

    Args:
        file: the file the value came from (for the message).
        key: its key path (for the message).
        value: the value as read from TOML.
        minimum: the smallest value allowed, if any.
        positive: True when the value must be greater than 0.
        maximum: the largest value allowed, if any.
    """
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise InputError(file, key, value, "a number")
    try:
        x = float(value)
    except OverflowError:
        raise InputError(file, key, f"{str(value)[:12]}...", "a finite number of sensible size") from None
    if not math.isfinite(x):
        raise InputError(file, key, value, "a finite number")
    if positive and not x > 0:
        raise InputError(file, key, value, "a positive number")
    if minimum is not None and x < minimum:
        raise InputError(file, key, value, f"a number >= {minimum:g}")
    if maximum is not None and x > maximum:
        raise InputError(file, key, value, f"a number <= {maximum:g}")
    return x


class TomlTable:
    """A TOML table being read: tracks used keys, types and the key path for messages.

    Attributes:
        file: the file the table came from.
        path: its key path ("" at the top level).
        data: the table itself.
        used: the keys read so far (:meth:`done` rejects the others).
    """

    def __init__(self, file: str, path: str, data: object) -> None:
        self.file = file
        self.path = path
        if not isinstance(data, dict):
            raise InputError(file, path or "(top level)", data, "a table")
        self.data = data
        self.used: set[str] = set()

    def key(self, name: str) -> str:
        """The full key path of ``name`` in this table, for messages."""
        return f"{self.path}.{name}" if self.path else name

    def raw(self, name: str, required: bool = True) -> object:
        """The value of ``name`` as TOML gave it; :data:`MISSING` when absent and not required."""
        self.used.add(name)
        if name not in self.data:
            if required:
                close = difflib.get_close_matches(name, [str(k) for k in self.data], n=1, cutoff=0.6)
                hint = f" (found {close[0]!r}: a misspelling?)" if close else ""
                raise InputError(self.file, self.key(name), None, f"a required key is missing{hint}")
            return MISSING
        return self.data[name]

    def str_(self, name: str, required: bool = True, default: str | None = None) -> str | None:
        """A non-empty string, stripped; ``default`` when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return default
        if not isinstance(value, str) or not value.strip():
            raise InputError(self.file, self.key(name), value, "a non-empty string")
        return value.strip()

    def choice(self, name: str, enum: type[Enum], required: bool = True, default: Enum | None = None) -> Any:
        """A member of ``enum`` given by its value; ``default`` when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return default
        options = [e.value for e in enum]
        try:
            return enum(value)
        except ValueError:
            hint = did_you_mean(str(value), options)
            raise InputError(
                self.file, self.key(name), value, f"one of {', '.join(map(repr, options))}{hint}"
            ) from None

    def num(
        self,
        name: str,
        required: bool = True,
        minimum: float | None = None,
        positive: bool = False,
        maximum: float | None = None,
    ) -> float | None:
        """A number within the bounds (see :func:`number`); None when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return None
        return number(self.file, self.key(name), value, minimum, positive, maximum)

    def bool_(self, name: str, required: bool = True) -> bool | None:
        """True or false; None when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return None
        if not isinstance(value, bool):
            raise InputError(self.file, self.key(name), value, "true or false")
        return value

    def table(self, name: str, required: bool = True) -> TomlTable | None:
        """The sub-table ``name``; None when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return None
        return TomlTable(self.file, self.key(name), value)

    def array_of_tables(self, name: str, required: bool = True) -> list[TomlTable]:
        """The non-empty array of tables ``[[name]]``; empty when absent and not required."""
        value = self.raw(name, required)
        if value is MISSING:
            return []
        if not isinstance(value, list) or not value:
            raise InputError(self.file, self.key(name), value, f"a non-empty array of tables ([[{self.key(name)}]])")
        return [TomlTable(self.file, f"{self.key(name)}[{i}]", v) for i, v in enumerate(value)]

    def done(self) -> None:
        """Reject the first key that was never read (unknown or misspelt)."""
        for name in self.data:
            if name not in self.used:
                hint = did_you_mean(name, self.used)
                if self.path and name in TOP_LEVEL_KEYS:
                    hint += (
                        f"; a top-level {name!r} must come before the first [table] "
                        "header (TOML puts later keys into that table)"
                    )
                known = ", ".join(sorted(self.used))
                raise InputError(
                    self.file, self.key(name), self.data[name], f"unknown key{hint} (known keys here: {known})"
                )
