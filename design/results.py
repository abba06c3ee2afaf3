"""Result types shared by every check in :mod:`design`.

:class:`CheckResult` is one check of one member; :class:`CheckColumn` is one
named check over many (cell, candidate) pairs at once, as arrays, from which
the :class:`CheckResult` of any pair is taken.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from enum import StrEnum

import numpy as np

__all__ = ["CheckKind", "CheckResult", "CheckColumn", "governing"]


class CheckKind(StrEnum):
    """What a check is about, so that strength is reported apart from detailing.

    A column "governed by nominal cover at 0.93" while its bending is at 0.56
    says little about its strength: reports give the governing resistance
    check and the governing check of each other kind separately.
    """

    RESISTANCE = "resistance"  # axial, bending, biaxial, shear, range of the slenderness method
    DETAILING = "detailing"  # bar and link rules of 9.5, 8.2
    COVER = "cover"  # nominal cover, 4.4.1
    FIRE = "fire"  # EN 1992-1-2
    DURABILITY = "durability"  # stress limits of 7.2 and similar serviceability rules


@dataclass(frozen=True)
class CheckResult:
    """One design check: demand against capacity, with the clause it comes from.

    ``utilisation`` is demand / capacity for "demand must not exceed capacity"
    checks; checks of the form "value must be at least a minimum" store the
    minimum as demand and the value provided as capacity, so utilisation > 1
    still means failure. ``applicable`` is False when the method does not
    apply (the check then neither passes nor governs; ``note`` says why).
    """

    name: str
    clause: str
    demand: float
    capacity: float
    unit: str = ""
    note: str = ""
    applicable: bool = True
    extra: dict[str, object] = field(default_factory=dict, compare=False)
    kind: CheckKind = CheckKind.RESISTANCE

    @property
    def utilisation(self) -> float:
        """Demand / capacity; inf when capacity is zero and demand positive."""
        if self.capacity == 0:
            return 0.0 if self.demand == 0 else math.inf
        return self.demand / self.capacity

    @property
    def ok(self) -> bool:
        """True when the check passes (a check that does not apply does not pass)."""
        return self.applicable and self.utilisation <= 1.0 + 1e-12


def governing(checks: list[CheckResult]) -> CheckResult | None:
    """The check with the highest utilisation (a non-applicable check governs first)."""
    if not checks:
        return None
    not_applicable = [c for c in checks if not c.applicable]
    if not_applicable:
        return not_applicable[0]
    return max(checks, key=lambda c: c.utilisation)


@dataclass(frozen=True)
class CheckColumn:
    """One named check over many pairs (arrays), with its clause.

    ``demand``, ``capacity`` and ``applicable`` hold one value per pair; ``note`` is one text for
    every pair, one text per pair, or a function of the pair index (called only for the pairs shown).
    """

    name: str
    clause: str
    unit: str
    demand: np.ndarray
    capacity: np.ndarray
    applicable: np.ndarray
    note: str | np.ndarray | Callable[[int], str] = ""
    blocking: bool = True  # where the method does not apply: fail (True) or flag as not verified (False)
    kind: CheckKind = CheckKind.RESISTANCE

    @property
    def utilisation(self) -> np.ndarray:
        """Demand / capacity per pair; where the method does not apply: inf if blocking, else 0 (flagged)."""
        with np.errstate(divide="ignore", invalid="ignore"):
            u = np.where(
                self.capacity > 0,
                self.demand / np.where(self.capacity > 0, self.capacity, 1.0),
                np.where(self.demand > 0, np.inf, 0.0),
            )
        return np.where(self.applicable, u, np.inf if self.blocking else 0.0)

    def result(self, i: int) -> CheckResult:
        """The check of pair ``i`` as a :class:`CheckResult`."""
        if isinstance(self.note, str):
            note = self.note
        elif callable(self.note):
            note = self.note(i)
        else:
            note = str(self.note[i])
        return CheckResult(
            self.name,
            self.clause,
            float(self.demand[i]),
            float(self.capacity[i]),
            self.unit,
            note,
            bool(self.applicable[i]),
            kind=self.kind,
        )
