"""Concrete and reinforcing-steel properties for design.

Concrete follows EN 1992-1-1 Table 3.1 (including the expressions for
fck > 50 MPa), the parabola-rectangle diagram of 3.1.7(1) and the rectangular
stress block of 3.1.7(3). Steel follows 3.2 with the design diagram of
3.2.7(2): horizontal top branch (default) or inclined top branch.

The functions of fck accept floats or numpy arrays (they broadcast); the
dataclasses :class:`Concrete` and :class:`Reinforcement` sit on top of them.
Stresses in MPa, strains dimensionless (0.0035, not 3.5 per mille).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

from design.params import EN_RECOMMENDED, NationalParameters

__all__ = [
    "Concrete",
    "Reinforcement",
    "Ductility",
    "TopBranch",
    "ConcreteLaw",
    "fcm",
    "fctm",
    "fctk_005",
    "Ecm",
    "eps_c1",
    "eps_cu1",
    "eps_c2",
    "eps_cu2",
    "n_exponent",
    "eps_c3",
    "eps_cu3",
    "lambda_block",
    "eta_block",
    "fcd",
    "fyd",
    "parse_concrete_class",
    "STANDARD_CLASSES",
]

FCK_MIN = 12.0
FCK_MAX = 90.0
STEEL_DENSITY_KG_M3 = 7850.0

# Strength classes of EN 1992-1-1 Table 3.1: fck -> fck,cube (MPa).
STANDARD_CLASSES: dict[int, int] = {
    12: 15,
    16: 20,
    20: 25,
    25: 30,
    30: 37,
    35: 45,
    40: 50,
    45: 55,
    50: 60,
    55: 67,
    60: 75,
    70: 85,
    80: 95,
    90: 105,
}


def _hs(fck: ArrayLike) -> NDArray[np.bool_]:
    """True where the high-strength expressions of Table 3.1 are used (fck > 50).

    EN 1992-1-1, Table 3.1

    Table 3.1 states them "for fck >= 50 MPa", but at fck = 50 they give
    n = 1.999, eps_cu2 = 3.496 per mille where the table's C50/60 column reads
    2.0 and 3.5; using them only above 50 MPa reproduces the tabulated values.
    """
    return np.asarray(fck, dtype=float) > 50.0


def fcm(fck: ArrayLike) -> NDArray[np.float64]:
    """Mean compressive strength, MPa.

    EN 1992-1-1, Table 3.1: fcm = fck + 8.
    """
    return np.asarray(fck, dtype=float) + 8.0


def fctm(fck: ArrayLike) -> NDArray[np.float64]:
    """Mean axial tensile strength, MPa.

    EN 1992-1-1, Table 3.1: 0.30 fck^(2/3) up to C50/60; 2.12 ln(1 + fcm/10) above.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 2.12 * np.log1p(fcm(f) / 10.0), 0.30 * f ** (2.0 / 3.0))


def fctk_005(fck: ArrayLike) -> NDArray[np.float64]:
    """Characteristic axial tensile strength, 5 % fractile, MPa.

    EN 1992-1-1, Table 3.1: fctk,0.05 = 0.7 fctm.
    """
    return 0.7 * fctm(fck)


def Ecm(fck: ArrayLike) -> NDArray[np.float64]:
    """Secant modulus of elasticity, MPa (quartzite aggregate).

    EN 1992-1-1, Table 3.1: Ecm = 22 (fcm/10)^0.3 GPa.
    """
    return 22_000.0 * (fcm(fck) / 10.0) ** 0.3


def eps_c1(fck: ArrayLike) -> NDArray[np.float64]:
    """Strain at peak stress, nonlinear analysis diagram.

    EN 1992-1-1, Table 3.1: eps_c1 = 0.7 fcm^0.31 per mille, at most 2.8 per mille.
    """
    return np.minimum(0.7 * fcm(fck) ** 0.31, 2.8) / 1000.0


def eps_cu1(fck: ArrayLike) -> NDArray[np.float64]:
    """Ultimate strain, nonlinear analysis diagram.

    EN 1992-1-1, Table 3.1: 3.5 per mille; 2.8 + 27 ((98 - fcm)/100)^4 for fck >= 50.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 2.8 + 27.0 * ((98.0 - fcm(f)) / 100.0) ** 4, 3.5) / 1000.0


def eps_c2(fck: ArrayLike) -> NDArray[np.float64]:
    """Strain at reaching the maximum strength, parabola-rectangle diagram.

    EN 1992-1-1, Table 3.1: 2.0 per mille; 2.0 + 0.085 (fck - 50)^0.53 for fck >= 50.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 2.0 + 0.085 * np.maximum(f - 50.0, 0.0) ** 0.53, 2.0) / 1000.0


def eps_cu2(fck: ArrayLike) -> NDArray[np.float64]:
    """Ultimate strain, parabola-rectangle diagram.

    EN 1992-1-1, Table 3.1: 3.5 per mille; 2.6 + 35 ((90 - fck)/100)^4 for fck >= 50.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 2.6 + 35.0 * ((90.0 - f) / 100.0) ** 4, 3.5) / 1000.0


def n_exponent(fck: ArrayLike) -> NDArray[np.float64]:
    """Exponent n of the parabola-rectangle diagram.

    EN 1992-1-1, Table 3.1: 2.0; 1.4 + 23.4 ((90 - fck)/100)^4 for fck >= 50.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 1.4 + 23.4 * ((90.0 - f) / 100.0) ** 4, 2.0)


def eps_c3(fck: ArrayLike) -> NDArray[np.float64]:
    """Strain at reaching the maximum strength, bi-linear diagram.

    EN 1992-1-1, Table 3.1: 1.75 per mille; 1.75 + 0.55 (fck - 50)/40 for fck >= 50.
    """
    f = np.asarray(fck, dtype=float)
    return np.where(_hs(f), 1.75 + 0.55 * (f - 50.0) / 40.0, 1.75) / 1000.0


def eps_cu3(fck: ArrayLike) -> NDArray[np.float64]:
    """Ultimate strain, bi-linear diagram (equal to eps_cu2).

    EN 1992-1-1, Table 3.1.
    """
    return eps_cu2(fck)


def lambda_block(fck: ArrayLike) -> NDArray[np.float64]:
    """Depth factor lambda of the rectangular stress block.

    EN 1992-1-1, Eqs. (3.19) and (3.20).
    """
    f = np.asarray(fck, dtype=float)
    return np.where(f > 50.0, 0.8 - (f - 50.0) / 400.0, 0.8)


def eta_block(fck: ArrayLike) -> NDArray[np.float64]:
    """Strength factor eta of the rectangular stress block.

    EN 1992-1-1, Eqs. (3.21) and (3.22).
    """
    f = np.asarray(fck, dtype=float)
    return np.where(f > 50.0, 1.0 - (f - 50.0) / 200.0, 1.0)


def fcd(fck: ArrayLike, alpha_cc: float = 1.0, gamma_c: float = 1.5) -> NDArray[np.float64]:
    """Design compressive strength, MPa.

    EN 1992-1-1, Eq. (3.15): fcd = alpha_cc fck / gamma_c.
    """
    return alpha_cc * np.asarray(fck, dtype=float) / gamma_c


def fyd(fyk: ArrayLike, gamma_s: float = 1.15) -> NDArray[np.float64]:
    """Design yield strength of reinforcement, MPa.

    EN 1992-1-1, 3.2.7(2) and Fig. 3.8: fyd = fyk / gamma_s.
    """
    return np.asarray(fyk, dtype=float) / gamma_s


_CLASS_RE = re.compile(r"^\s*C?\s*(\d+(?:\.\d+)?)\s*(?:/\s*(\d+(?:\.\d+)?))?\s*$", re.IGNORECASE)


def parse_concrete_class(text: str) -> float:
    """Return fck (MPa) of a strength class written in full, such as ``"C30/37"``.

    EN 1992-1-1, Table 3.1: the class names the cylinder and the cube strength.
    A name written in part ("C35", "35/45") or with a cube strength that is
    not the table's is refused with the class meant, never read silently
    (a strength outside the table is given as fck in MPa instead).
    """
    m = _CLASS_RE.match(str(text))
    fck = float(m.group(1)) if m else None
    expected = STANDARD_CLASSES.get(int(fck)) if fck is not None and fck.is_integer() else None
    meant = f"C{fck:g}/{expected}" if expected is not None else None
    ok = (
        m is not None
        and text.strip()[:1].upper() == "C"
        and m.group(2) is not None
        and expected is not None
        and abs(float(m.group(2)) - expected) < 1e-9
    )
    if not ok or fck is None:  # fck is never None when ok
        hint = f"; did you mean {meant!r}?" if meant else ""
        msg = (
            f"concrete class {text!r} is not a strength class of EN 1992-1-1 Table 3.1 written in full "
            f"(e.g. 'C30/37'){hint}"
        )
        raise ValueError(msg)
    return fck


class ConcreteLaw(str, Enum):
    """Concrete stress-strain relation used for section design."""

    PARABOLA_RECTANGLE = "parabola-rectangle"  # EN 1992-1-1, 3.1.7(1), Fig. 3.3
    RECTANGULAR_BLOCK = "rectangular-block"  # EN 1992-1-1, 3.1.7(3), Fig. 3.5


class TopBranch(str, Enum):
    """Top branch of the steel design diagram, EN 1992-1-1, 3.2.7(2)."""

    HORIZONTAL = "horizontal"  # (b): no strain limit to check
    INCLINED = "inclined"  # (a): strain limit eps_ud


class Ductility(str, Enum):
    """Ductility class of reinforcement, EN 1992-1-1, Annex C, Table C.1."""

    A = "A"
    B = "B"
    C = "C"


# Minimum k = (ft/fy)k and eps_uk of Table C.1 (EN 1992-1-1 Annex C).
_DUCTILITY = {Ductility.A: (1.05, 0.025), Ductility.B: (1.08, 0.050), Ductility.C: (1.15, 0.075)}


@dataclass(frozen=True)
class Concrete:
    """Normal-weight concrete of characteristic strength ``fck`` (MPa).

    Derived values follow EN 1992-1-1 Table 3.1 and depend on the national
    parameters through ``fcd`` only.
    """

    fck: float
    alpha_cc: float = EN_RECOMMENDED.alpha_cc
    gamma_c: float = EN_RECOMMENDED.gamma_c

    def __post_init__(self) -> None:
        if not (FCK_MIN <= self.fck <= FCK_MAX):
            msg = (
                f"fck must lie between {FCK_MIN:g} and {FCK_MAX:g} MPa (EN 1992-1-1, 3.1.2(2)P), got fck={self.fck} MPa"
            )
            raise ValueError(msg)

    @classmethod
    def from_class(cls, name: str, params: NationalParameters = EN_RECOMMENDED) -> Concrete:
        """Concrete from a class name such as ``"C40/50"``."""
        return cls(parse_concrete_class(name), alpha_cc=params.alpha_cc, gamma_c=params.gamma_c)

    @classmethod
    def with_params(cls, fck: float, params: NationalParameters = EN_RECOMMENDED) -> Concrete:
        """Concrete of strength ``fck`` with the partial factors of ``params``."""
        return cls(fck, alpha_cc=params.alpha_cc, gamma_c=params.gamma_c)

    @property
    def name(self) -> str:
        """Class name, e.g. ``C30/37`` (``C32`` when not a standard class)."""
        cube = STANDARD_CLASSES.get(int(self.fck)) if float(self.fck).is_integer() else None
        return f"C{self.fck:g}/{cube}" if cube else f"C{self.fck:g}"

    @property
    def fcm(self) -> float:  # noqa: D102
        return float(fcm(self.fck))

    @property
    def fctm(self) -> float:  # noqa: D102
        return float(fctm(self.fck))

    @property
    def fctk_005(self) -> float:  # noqa: D102
        return float(fctk_005(self.fck))

    @property
    def Ecm(self) -> float:  # noqa: D102
        return float(Ecm(self.fck))

    @property
    def eps_c2(self) -> float:  # noqa: D102
        return float(eps_c2(self.fck))

    @property
    def eps_cu2(self) -> float:  # noqa: D102
        return float(eps_cu2(self.fck))

    @property
    def n(self) -> float:  # noqa: D102
        return float(n_exponent(self.fck))

    @property
    def eps_c3(self) -> float:  # noqa: D102
        return float(eps_c3(self.fck))

    @property
    def eps_cu3(self) -> float:  # noqa: D102
        return float(eps_cu3(self.fck))

    @property
    def lam(self) -> float:
        """Depth factor lambda of the rectangular stress block (-).

        EN 1992-1-1, Eqs. (3.19), (3.20)
        """
        return float(lambda_block(self.fck))

    @property
    def eta(self) -> float:
        """Strength factor eta of the rectangular stress block (-).

        EN 1992-1-1, Eqs. (3.21), (3.22)
        """
        return float(eta_block(self.fck))

    @property
    def fcd(self) -> float:
        """Design compressive strength fcd = alpha_cc fck / gamma_c, MPa.

        EN 1992-1-1, Eq. (3.15)
        """
        return float(fcd(self.fck, self.alpha_cc, self.gamma_c))


@dataclass(frozen=True)
class Reinforcement:
    """Reinforcing steel of characteristic yield strength ``fyk`` (MPa)."""

    fyk: float = 500.0
    ductility: Ductility = Ductility.B
    branch: TopBranch = TopBranch.HORIZONTAL
    Es: float = 200_000.0
    gamma_s: float = EN_RECOMMENDED.gamma_s
    eps_ud_factor: float = EN_RECOMMENDED.eps_ud_factor

    def __post_init__(self) -> None:
        if not (400.0 <= self.fyk <= 600.0):
            msg = f"fyk must lie between 400 and 600 MPa (EN 1992-1-1, 3.2.2(3)P), got fyk={self.fyk} MPa"
            raise ValueError(msg)
        object.__setattr__(self, "ductility", Ductility(self.ductility))
        object.__setattr__(self, "branch", TopBranch(self.branch))

    @classmethod
    def with_params(
        cls,
        fyk: float = 500.0,
        ductility: Ductility | Literal["A", "B", "C"] = Ductility.B,
        branch: TopBranch | Literal["horizontal", "inclined"] = TopBranch.HORIZONTAL,
        params: NationalParameters = EN_RECOMMENDED,
    ) -> Reinforcement:
        """Steel with the partial factor and eps_ud/eps_uk of ``params``."""
        return cls(
            fyk, Ductility(ductility), TopBranch(branch), gamma_s=params.gamma_s, eps_ud_factor=params.eps_ud_factor
        )

    @property
    def fyd(self) -> float:
        """Design yield strength, MPa."""
        return float(fyd(self.fyk, self.gamma_s))

    @property
    def eps_yd(self) -> float:
        """Design yield strain fyd / Es."""
        return self.fyd / self.Es

    @property
    def k(self) -> float:
        """Minimum (ft/fy)k of the ductility class, EN 1992-1-1 Table C.1."""
        return _DUCTILITY[self.ductility][0]

    @property
    def eps_uk(self) -> float:
        """Characteristic strain at maximum load, EN 1992-1-1 Table C.1."""
        return _DUCTILITY[self.ductility][1]

    @property
    def eps_ud(self) -> float:
        """Design strain limit for the inclined branch, 3.2.7(2)."""
        return self.eps_ud_factor * self.eps_uk

    def stress(self, eps: ArrayLike) -> NDArray[np.float64]:
        """Design stress (MPa) at strain ``eps``; compression positive.

        EN 1992-1-1, 3.2.7(2), Fig. 3.8 (horizontal or inclined top branch).
        """
        return steel_stress(np.asarray(eps, dtype=float), self.fyd, self.Es, self.hardening_slope)

    @property
    def hardening_slope(self) -> float:
        """Slope of the top branch of the design diagram, MPa (0 when horizontal).

        EN 1992-1-1, Fig. 3.8: the inclined branch rises from fyd at eps_yd to
        k fyk / gamma_s at eps_uk.
        """
        if self.branch is TopBranch.HORIZONTAL:
            return 0.0
        return (self.k - 1.0) * self.fyd / (self.eps_uk - self.eps_yd)

    @property
    def strain_limit(self) -> float:
        """Steel strain limit used for the tension pivot (inf when horizontal)."""
        return np.inf if self.branch is TopBranch.HORIZONTAL else self.eps_ud


def steel_stress(eps: np.ndarray, fyd_: ArrayLike, Es: ArrayLike, slope: ArrayLike) -> NDArray[np.float64]:
    """Bilinear steel design stress, MPa; broadcasts over all arguments.

    EN 1992-1-1, 3.2.7(2), Fig. 3.8.
    """
    eps_yd = np.asarray(fyd_) / Es
    a = np.abs(eps)
    sig = np.where(a <= eps_yd, Es * a, fyd_ + slope * (a - eps_yd))
    return np.copysign(sig, eps)  # type: ignore[no-any-return]  # numpy stubs: ufunc of an unparametrised ndarray is Any
