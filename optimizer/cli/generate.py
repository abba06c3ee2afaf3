"""``colstack generate``: write a synthetic tower scenario (N storeys x M stacks) for benchmarks."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from optimizer.building.generate import TowerSpec, generate_tower_toml
from optimizer.building.scenario import load_scenario_text
from optimizer.errors import ColstackError

__all__ = ["add_parser", "run"]


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"{text!r} must be at least 1")
    return value


def _positive_float(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a number") from None
    if not value > 0:
        raise argparse.ArgumentTypeError(f"{text!r} must be positive")
    return value


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register the ``generate`` subcommand on an argparse subparsers object."""
    d = TowerSpec(1, 1)
    p = subparsers.add_parser(
        "generate",
        help="write a synthetic tower scenario for benchmarks",
        description="Write an invented tower of N storeys x M column stacks on a regular "
        "grid (flat slabs, office loads) as a scenario file.",
    )
    p.add_argument("--storeys", type=_positive_int, required=True, metavar="N", help="number of levels")
    p.add_argument("--stacks", type=_positive_int, required=True, metavar="M", help="number of column stacks")
    p.add_argument("--out", required=True, metavar="FILE", help="scenario file to write (TOML)")
    p.add_argument(
        "--bay-x-m",
        type=_positive_float,
        default=d.bay_x_m,
        help=f"grid spacing along plan X, m (default {d.bay_x_m:g})",
    )
    p.add_argument(
        "--bay-y-m",
        type=_positive_float,
        default=d.bay_y_m,
        help=f"grid spacing along plan Y, m (default {d.bay_y_m:g})",
    )
    p.add_argument(
        "--storey-height-m",
        type=_positive_float,
        default=d.storey_height_m,
        help=f"typical floor-to-floor height, m (default {d.storey_height_m:g})",
    )
    p.add_argument(
        "--ground-height-m",
        type=_positive_float,
        default=d.ground_height_m,
        help=f"lowest floor-to-floor height, m (default {d.ground_height_m:g})",
    )
    p.add_argument(
        "--slab-depth-mm",
        type=_positive_float,
        default=d.slab_depth_mm,
        help=f"flat-slab depth, mm (default {d.slab_depth_mm:g})",
    )
    p.add_argument("--concrete", default=d.concrete, help=f"concrete class of the columns (default {d.concrete})")
    p.add_argument(
        "--trial-size-mm",
        type=_positive_float,
        nargs=2,
        metavar=("B_MM", "H_MM"),
        default=list(d.trial_size_mm),
        help="trial column section b h, mm",
    )
    p.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    return p


def run(args: argparse.Namespace) -> int:
    """Run ``colstack generate``; returns the exit status (0 on success)."""
    out = Path(args.out)
    if out.exists() and not args.force:
        print(f"colstack generate: error: {out} exists (use --force to overwrite)", file=sys.stderr)
        return 2
    try:
        spec = TowerSpec(
            storeys=args.storeys,
            stacks=args.stacks,
            bay_x_m=args.bay_x_m,
            bay_y_m=args.bay_y_m,
            storey_height_m=args.storey_height_m,
            ground_height_m=args.ground_height_m,
            slab_depth_mm=args.slab_depth_mm,
            concrete=args.concrete,
            trial_size_mm=tuple(args.trial_size_mm),
        )
        text = generate_tower_toml(spec)
        load_scenario_text(text, source=str(out))
    except ColstackError as exc:
        print(f"colstack generate: error: {exc}", file=sys.stderr)
        return exc.exit_code
    except ValueError as exc:
        print(f"colstack generate: error: {exc}", file=sys.stderr)
        return 2
    out.parent.mkdir(parents=True, exist_ok=True)
    out.write_text(text, encoding="utf-8")
    print(f"wrote {out}: {args.storeys} storeys x {args.stacks} stacks")
    return 0
