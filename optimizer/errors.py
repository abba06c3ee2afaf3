"""Error types that the command line turns into one clear line and an exit status."""

from __future__ import annotations

__all__ = ["ColstackError", "InputError", "DesignImpossible", "EXIT_INPUT", "EXIT_IMPOSSIBLE"]

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
