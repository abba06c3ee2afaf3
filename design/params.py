"""Nationally determined parameters (NDPs) and other partial factors.

EN 1992-1-1 leaves a number of values to each country's National Annex. They
are collected in one frozen dataclass, :class:`NationalParameters`, whose
defaults are the values *recommended* in the EN text. Every design function
takes the set it should use as an argument; nothing is read from global state.

The EN 1990 combination factors used by the load takedown (gamma_G, gamma_Q,
xi, psi0) sit in the same set because a National Annex fixes them together.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from enum import Enum
from typing import Any

__all__ = ["NationalParameters", "ParameterSet", "EN_RECOMMENDED", "UK_ANNEX", "parameter_set", "with_overrides"]


@dataclass(frozen=True)
class NationalParameters:
    """Nationally determined parameters, EN recommended values by default.

    Attributes:
        name: label printed in reports.
        gamma_c: partial factor for concrete, persistent and transient
            situations. EN 1992-1-1, 2.4.2.4, Table 2.1N.
        gamma_s: partial factor for reinforcing steel. EN 1992-1-1, Table 2.1N.
        alpha_cc: long-term coefficient on compressive strength. EN 1992-1-1,
            3.1.6(1)P.
        alpha_ct: long-term coefficient on tensile strength. EN 1992-1-1,
            3.1.6(2)P.
        theta_0: basic inclination for geometric imperfections, rad.
            EN 1992-1-1, 5.2(5).
        lambda_A: default A of Eq. (5.13N) when phi_ef is unknown.
        lambda_B: default B of Eq. (5.13N) when omega is unknown.
        lambda_C: default C of Eq. (5.13N) when r_m is unknown.
        phi_min_long: minimum longitudinal bar diameter in columns, mm.
            EN 1992-1-1, 9.5.2(1).
        rho_min_axial: factor on NEd/fyd for As,min (0.10). EN 1992-1-1, 9.5.2(2).
        rho_min_area: minimum steel ratio As,min/Ac (0.002). EN 1992-1-1, 9.5.2(2).
        rho_max: maximum steel ratio outside laps (0.04). EN 1992-1-1, 9.5.2(3).
        rho_max_lap: maximum steel ratio at laps (0.08). EN 1992-1-1, 9.5.2(3).
        scl_factor_phi: scl,tmax multiple of the smallest longitudinal bar (20).
            EN 1992-1-1, 9.5.3(3).
        scl_max_mm: absolute cap on scl,tmax, mm (400). EN 1992-1-1, 9.5.3(3).
        scl_reduction: factor on scl,tmax near beams/slabs and at laps (0.6).
            EN 1992-1-1, 9.5.3(4).
        delta_c_dev: allowance in design for deviation of cover, mm.
            EN 1992-1-1, 4.4.1.3(1)P.
        gamma_G: partial factor on permanent actions (unfavourable).
            EN 1990, Table A1.2(B).
        gamma_Q: partial factor on variable actions (unfavourable).
            EN 1990, Table A1.2(B).
        xi: reduction factor on unfavourable permanent actions in Eq. (6.10b).
            EN 1990, Table A1.2(B).
        eps_ud_factor: eps_ud / eps_uk for the inclined top branch (0.9).
            EN 1992-1-1, 3.2.7(2), Note 1.
        k1_spacing: k1 of the minimum clear bar spacing (mm factor on bar
            diameter). EN 1992-1-1, 8.2(2).
        k2_spacing_mm: k2 of the minimum clear bar spacing, mm added to the
            aggregate size. EN 1992-1-1, 8.2(2).
        gamma_cE: partial factor on Ecm for the design modulus Ecd = Ecm/gamma_cE
            of the nominal stiffness method (1.2). EN 1992-1-1, 5.8.6(3).
        structural_class_50y: structural class (1..6 for S1..S6) for a design
            working life of 50 years before the Table 4.3N modifications (4).
            EN 1992-1-1, 4.4.1.2(5), Note 1.
        delta_c_dur_gamma: additive safety element on cmin,dur, mm (0).
            EN 1992-1-1, 4.4.1.2(6).
        delta_c_dur_st: reduction of cmin,dur for stainless steel, mm (0).
            EN 1992-1-1, 4.4.1.2(7).
        delta_c_dur_add: reduction of cmin,dur for additional protection, mm (0).
            EN 1992-1-1, 4.4.1.2(8).
        e_max_fire_factor: emax / h (or b) for the first-order eccentricity
            limit of method A for columns in fire (0.15; the annex may choose
            0.15 to 0.4). EN 1992-1-2, 5.3.2(2), Note.
        k_min_restraint: smallest relative flexibility k1, k2 of an end
            restraint used in Eqs. (5.15), (5.16) (0.1; rigid restraint is
            rare in practice). EN 1992-1-1, 5.8.3.2(3), Note.
        C_Rdc_factor: CRd,c = C_Rdc_factor / gamma_c (0.18). EN 1992-1-1, 6.2.2(1), Note.
        v_min_factor: v_min = v_min_factor k^1.5 fck^0.5 (0.035). EN 1992-1-1, Eq. (6.3N).
        k1_shear: k1 on the axial stress sigma_cp in VRd,c (0.15). EN 1992-1-1, 6.2.2(1), Note.
        cot_theta_max: upper limit of cot(theta) for the strut angle (2.5).
            EN 1992-1-1, 6.2.3(2), Note 1 (lower limit 1).
        k1_stress: compressive stress limit k1 fck under the characteristic
            combination in XD, XF and XS exposures (0.6). EN 1992-1-1, 7.2(2).
        k2_stress: stress limit k2 fck under the quasi-permanent combination
            for linear creep (0.45). EN 1992-1-1, 7.2(3).
    """

    name: str = "EN 1992-1-1 recommended"
    gamma_c: float = 1.5
    gamma_s: float = 1.15
    alpha_cc: float = 1.0
    alpha_ct: float = 1.0
    theta_0: float = 1.0 / 200.0
    lambda_A: float = 0.7
    lambda_B: float = 1.1
    lambda_C: float = 0.7
    phi_min_long: float = 8.0
    rho_min_axial: float = 0.10
    rho_min_area: float = 0.002
    rho_max: float = 0.04
    rho_max_lap: float = 0.08
    scl_factor_phi: float = 20.0
    scl_max_mm: float = 400.0
    scl_reduction: float = 0.6
    delta_c_dev: float = 10.0
    gamma_G: float = 1.35
    gamma_Q: float = 1.5
    xi: float = 0.85
    eps_ud_factor: float = 0.9
    k1_spacing: float = 1.0
    k2_spacing_mm: float = 5.0
    gamma_cE: float = 1.2
    structural_class_50y: int = 4
    delta_c_dur_gamma: float = 0.0
    delta_c_dur_st: float = 0.0
    delta_c_dur_add: float = 0.0
    e_max_fire_factor: float = 0.15
    k_min_restraint: float = 0.1
    C_Rdc_factor: float = 0.18
    v_min_factor: float = 0.035
    k1_shear: float = 0.15
    cot_theta_max: float = 2.5
    k1_stress: float = 0.6
    k2_stress: float = 0.45

    def __post_init__(self) -> None:
        positive = (
            "gamma_c",
            "gamma_s",
            "alpha_cc",
            "alpha_ct",
            "theta_0",
            "lambda_A",
            "lambda_B",
            "lambda_C",
            "phi_min_long",
            "rho_min_area",
            "rho_max",
            "rho_max_lap",
            "scl_factor_phi",
            "scl_max_mm",
            "scl_reduction",
            "gamma_G",
            "gamma_Q",
            "xi",
            "k1_spacing",
            "eps_ud_factor",
            "C_Rdc_factor",
            "v_min_factor",
            "k1_stress",
            "k2_stress",
        )
        for field in positive:
            value = getattr(self, field)
            if not value > 0:
                msg = f"national parameter {field} must be positive, got {field}={value}"
                raise ValueError(msg)
        if not 0.8 <= self.alpha_cc <= 1.0:
            msg = f"alpha_cc must lie between 0.8 and 1.0 (EN 1992-1-1, 3.1.6(1)P), got {self.alpha_cc}"
            raise ValueError(msg)
        if self.delta_c_dev < 0 or self.k2_spacing_mm < 0 or self.rho_min_axial < 0:
            msg = "delta_c_dev, k2_spacing_mm and rho_min_axial must not be negative"
            raise ValueError(msg)
        if self.k_min_restraint < 0 or self.k1_shear < 0:
            msg = (
                f"k_min_restraint and k1_shear must not be negative, got k_min_restraint={self.k_min_restraint}, "
                f"k1_shear={self.k1_shear}"
            )
            raise ValueError(msg)
        if not 1.0 <= self.cot_theta_max <= 3.0:
            msg = f"cot_theta_max must lie between 1 and 3 (EN 1992-1-1, 6.2.3(2)), got {self.cot_theta_max}"
            raise ValueError(msg)
        if self.xi > 1.0 or self.scl_reduction > 1.0:
            msg = (
                f"xi and scl_reduction are reduction factors (<= 1), "
                f"got xi={self.xi}, scl_reduction={self.scl_reduction}"
            )
            raise ValueError(msg)


class ParameterSet(str, Enum):
    """Named parameter sets that ship with colstack."""

    EN = "EN"
    UK = "UK"


EN_RECOMMENDED = NationalParameters()

# UK National Annex values, recalled from memory (NA to BS EN 1992-1-1 and NA to
# BS EN 1990); verify against the current annex before use:
# - alpha_cc = 0.85 for compression in flexure and axial load (NA 2.4.2.4 /
#   3.1.6(1)P); alpha_ct = 1.0.
# - gamma_c = 1.5, gamma_s = 1.15 (same as recommended).
# - xi = 0.925 (NA to BS EN 1990, Table NA.A1.2(B)).
# - phi_min_long = 12 mm (NA to BS EN 1992-1-1, 9.5.2(1)).
# Other values follow the recommended ones here.
UK_ANNEX = NationalParameters(
    name="UK National Annex (values recalled from memory; verify)", alpha_cc=0.85, xi=0.925, phi_min_long=12.0
)

_SETS = {ParameterSet.EN: EN_RECOMMENDED, ParameterSet.UK: UK_ANNEX}


def parameter_set(name: str | ParameterSet) -> NationalParameters:
    """Return the named parameter set ("EN" or "UK")."""
    try:
        key = ParameterSet(name)
    except ValueError:
        known = ", ".join(s.value for s in ParameterSet)
        msg = f"unknown parameter set {name!r}; expected one of: {known}"
        raise ValueError(msg) from None
    return _SETS[key]


def with_overrides(base: NationalParameters, **overrides: Any) -> NationalParameters:
    """Return ``base`` with some fields replaced, checking the field names.

    Each value has the type of its field (most are floats; ``name`` is text and
    ``structural_class_50y`` an integer); NationalParameters checks the values.
    """
    names = {f.name for f in dataclasses.fields(NationalParameters)}
    for key in overrides:
        if key not in names:
            msg = f"unknown national parameter {key!r}; expected one of: {', '.join(sorted(names))}"
            raise ValueError(msg)
    return dataclasses.replace(base, **overrides)
