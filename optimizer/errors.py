"""Error types that the command line turns into one clear line and an exit status."""

from __future__ import annotations

import difflib
from collections.abc import Iterable, Mapping

__all__ = [
    "ColstackError",
    "InputError",
    "DesignImpossible",
    "EXIT_INPUT",
    "EXIT_IMPOSSIBLE",
    "did_you_mean",
    "reject_unknown_keys",
]

EXIT_INPUT = 2
EXIT_IMPOSSIBLE = 3


class ColstackError(Exception):
    """Base class of the errors colstack reports without a traceback."""

    exit_code = 1


class InputError(ColstackError):
    """Bad user input: names the file, the field (key or row), the value and what is expected."""

    exit_code = EXIT_INPUT

    def __init__(self, file: str, field: str, value: object, expected: str) -> None:
        self.file = str(file)
        self.field = field
        self.value = value
        self.expected = expected
        super().__init__(f"{self.file}: {field} = {value!r}: {expected}")


class DesignImpossible(ColstackError):
    """No design satisfies the rules (a cell no type can carry, an impossible stack).

    ``details`` lists one sentence per problem; ``partial`` keeps what was computed
    (e.g. the feasibility matrix) so that the caller can still write it.
    """

    exit_code = EXIT_IMPOSSIBLE

    def __init__(self, message: str, details: list[str] | None = None, **partial: object) -> None:
        super().__init__(message)
        self.details = list(details or [])
        self.partial = partial


def did_you_mean(word: str, options: Iterable[str]) -> str:
    """``"; did you mean 'x'?"`` for the closest option to a mistyped word, or ``""`` when none is close."""
    close = difflib.get_close_matches(str(word), [str(o) for o in options], n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else ""


def reject_unknown_keys(file: str, where: str, data: Mapping, allowed: Iterable[str]) -> None:
    """InputError for the first key of ``data`` not in ``allowed``, naming the closest allowed key (or all of them).

    Args:
        file: the file the table came from.
        where: the table's key path (e.g. "optimizer"), "" at the top level.
        data: the table.
        allowed: the keys the table may have.
    """
    allowed = sorted(allowed)
    for key in data:
        if key not in allowed:
            hint = did_you_mean(key, allowed) or f"; expected one of {', '.join(allowed)}"
            raise InputError(file, f"{where}.{key}" if where else str(key), data[key], f"unknown key{hint}")
