"""The ``colstack`` command line.

Each subcommand lives in its own module exposing ``add_parser(subparsers)`` and
``run(args) -> int``. Errors of the project's own types become one line on
stderr and an exit status (2: bad input, 3: no design possible); anything
else is a bug and keeps its traceback.
"""

from __future__ import annotations

import argparse
import importlib
import sys

from optimizer import CAUTION, __version__
from optimizer.errors import ColstackError

__all__ = ["main", "build_parser"]


_COMMAND_MODULES = (
    "optimizer.cli.section",
    "optimizer.cli.check",
    "optimizer.cli.fire",
    "optimizer.cli.takedown",
    "optimizer.cli.generate",
    "optimizer.cli.feasibility",
    "optimizer.cli.run",
    "optimizer.cli.pareto",
    "optimizer.cli.compare",
    "optimizer.cli.study",
)


def build_parser() -> argparse.ArgumentParser:
    """The argument parser with every subcommand registered."""
    parser = argparse.ArgumentParser(
        prog="colstack", description="Eurocode 2 design and rationalisation of reinforced-concrete columns. " + CAUTION
    )
    parser.add_argument("--version", action="version", version=f"colstack {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    sub.required = True
    for name in _COMMAND_MODULES:
        module = importlib.import_module(name)
        p = module.add_parser(sub)
        p.set_defaults(_run=module.run)
    return parser


def main(argv: list[str] | None = None) -> int:
    """Entry point of the ``colstack`` console script."""
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        return int(args._run(args) or 0)
    except ColstackError as exc:
        print(f"colstack {args.command}: error: {exc}", file=sys.stderr)
        return exc.exit_code
    except KeyboardInterrupt:
        print(f"colstack {args.command}: interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
