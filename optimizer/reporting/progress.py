"""Progress display for long runs: stage name, a bar with counts, elapsed time; or JSON lines.

``Progress(stream)`` is called as ``progress(stage, done, total)``; with
``total == 0`` the stage is a message (for example a solver log line). Updates
are throttled to a few per second. ``quiet`` silences the display;
``delay_s`` keeps it silent for short runs (nothing is shown before that many
seconds); ``log_json`` writes one JSON object per event to a file for machines.
The one progress display of every command.
"""

from __future__ import annotations

import json
import sys
import time
from pathlib import Path
from typing import TextIO

__all__ = ["Progress"]


class Progress:
    """Stage-aware progress display (callable)."""

    def __init__(
        self,
        stream: TextIO | None = None,
        quiet: bool = False,
        log_json: str | Path | None = None,
        width: int = 28,
        delay_s: float = 0.0,
    ) -> None:
        self.stream = stream or sys.stderr
        self.quiet = quiet
        self.delay_s = delay_s
        self.width = width
        self.start = time.monotonic()
        self.stage_start = self.start
        self.stage = ""
        self.last = 0.0
        self.open_line = False
        self.log = open(log_json, "a", encoding="utf-8") if log_json else None

    def __call__(self, stage: str, done: int, total: int) -> None:
        """Report progress of ``stage``: ``done`` of ``total`` (total 0: a message)."""
        now = time.monotonic()
        if stage != self.stage:
            self._end_line()
            self.stage = stage
            self.stage_start = now
        if self.log is not None:
            self.log.write(
                json.dumps({"t_s": round(now - self.start, 3), "stage": stage, "done": done, "total": total}) + "\n"
            )
            self.log.flush()
        if self.quiet or now - self.start < self.delay_s:
            return
        finished = total > 0 and done >= total
        if not finished and now - self.last < 0.2:
            return
        self.last = now
        elapsed = now - self.start
        if total > 0:
            frac = min(done / total, 1.0)
            fill = int(round(frac * self.width))
            bar = "#" * fill + "." * (self.width - fill)
            text = f"\r  {stage:<28.28} [{bar}] {100 * frac:5.1f} % ({done:,}/{total:,})  {elapsed:6.1f} s"
            self.stream.write(text)
            self.open_line = True
            if finished:
                self._end_line()
        else:
            self._end_line()
            self.stream.write(f"  {stage}  ({elapsed:.1f} s)\n")
        self.stream.flush()

    def _end_line(self) -> None:
        if self.open_line:
            self.stream.write("\n")
            self.open_line = False

    def close(self) -> None:
        """Finish the display and the log."""
        self._end_line()
        if self.log is not None:
            self.log.close()
            self.log = None
