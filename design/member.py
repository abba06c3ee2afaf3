"""The full EC2 check of a column in one storey, for many (cell, candidate) pairs at once.

One implementation serves both the building optimiser (thousands of pairs in
one call) and the single-column calculation sheet: :func:`check_members`
works on arrays, and :func:`check_column` is a view of one row of it.

What one check covers (EN 1992-1-1 unless stated):

1. slenderness about each axis, lambda = l0/i, and lambda_lim of Eq. (5.13N)
   with A, B, C from phi_ef, omega and rm when known (5.8.3.1);
2. geometric imperfections ei = theta_i l0/2 (5.2) or l0/400, acting in the
   one direction where they are most unfavourable (5.8.9(2)): both directions
   are evaluated and the worse governs;
3. first-order end moments M01, M02 with their signs, M0e (Eq. (5.32));
4. the minimum moment NEd e0 with e0 = max(h/30, 20 mm) (6.1(4)) about each
   axis, so that neither design moment is below its NEd e0 (the default; the
   published Concrete Centre worked examples let the design moment about one
   axis coexist with NEd e0 about the other); "one-axis-at-a-time" is an option;
5. second-order moments by the nominal curvature method (5.8.8) where
   lambda > lambda_lim; Kr with omega of the candidate's own steel, so no
   iteration is needed when checking a given design;
6. biaxial bending (5.8.9): the criteria (5.38a), (5.38b), separate checks
   when both hold, the interaction of Eq. (5.39) otherwise; and, on request,
   a direction-exact check on the section's resistance surface;
7. detailing (9.5.2, 9.5.3, 8.2), cover (4.4.1), fire (EN 1992-1-2 5.3.2,
   method A) and the lap length of the starter bars (8.4, 8.7.3).

Units: N, mm, MPa, N mm. Compression positive. End moments follow the
moment-diagram convention of :mod:`design.second_order.slenderness` (same sign
at both ends = single curvature).

The per-section arrays come from :mod:`design.section_data`; the phases of the
check (creep ratio, design moment about one axis, direction-exact biaxial
utilisation, shear, stresses, detailing, cover, fire) are the functions of
:mod:`design.member_checks`.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, field
from enum import StrEnum
from typing import Any, Literal, overload

import numpy as np
from numpy.typing import ArrayLike

from design import detailing, laps
from design.cover import Exposure, ExposureClass, parse_exposure
from design.creep import CreepSettings
from design.fire import MU_FI_DEFAULT, FireRating
from design.member_checks import (
    axis_moments,
    cover_checks,
    detailing_checks,
    effective_creep,
    exact_biaxial,
    fire_check,
    link_spacing,
    link_spacing_checks,
    shear_checks,
    stress_checks,
)
from design.params import EN_RECOMMENDED, NationalParameters
from design.resistance import DesignSection, SectionBatch
from design.results import CheckColumn, CheckKind, CheckResult
from design.second_order import biaxial, imperfections
from design.second_order.biaxial import SectionShape
from design.second_order.imperfections import ImperfectionMethod
from design.section_data import SectionData

__all__ = [
    "MinEccentricity",
    "BiaxialMethod",
    "CheckSettings",
    "ColumnActions",
    "MemberChecks",
    "ColumnCheck",
    "check_members",
    "check_column",
    "SLENDERNESS_CAP",
]

# Beyond this slenderness the simplified methods of 5.8.8 are not relied on
# here and the column is flagged (common practice; EN 1992-1-1 sets no limit).
SLENDERNESS_CAP = 140.0

# The per-section arrays of SectionData that the checks read, taken for every pair.
_PAIR_ARRAYS = tuple(
    "circ b h Ac As iy iz dy dz fck fcd fyk fyd Es cover link dia_max dia_min n_bars min_gap extra_ties"
    " a_fire_min a_fire_mean Asl_y Asl_z dv_y dv_z fctm".split()
)


class MinEccentricity(StrEnum):
    """How the minimum moment NEd e0 of 6.1(4) is applied under biaxial bending."""

    ONE_AXIS = "one-axis-at-a-time"  # with the imperfection, about one axis at a time
    BOTH_AXES = "both-axes"  # about both axes together (default, more conservative)


class BiaxialMethod(StrEnum):
    """Which biaxial check decides pass/fail (both are always reported when computed)."""

    EQ_5_39 = "5.39"  # EN 1992-1-1 Eq. (5.39) with the criteria of 5.38
    EXACT = "exact"  # resultant moment against the resistance surface in its direction


@dataclass(frozen=True)
class CheckSettings:
    """Options of the member check that are the same for every pair of one call.

    Attributes:
        imperfection: route for ei (5.2(7) inclination, or l0/400).
        min_eccentricity: application of 6.1(4) under biaxial bending.
        biaxial: method that decides the biaxial check.
        exact_biaxial: compute the direction-exact utilisation (costly).
        exposure: exposure classes for the cover and Annex E checks, e.g. "XC4+XF1" (None: not checked).
        fire: standard fire resistance (None: not checked).
        mu_fi: degree of utilisation in fire (0.7 is the conservative value
            EN 1992-1-2 5.3.2(3) allows).
        aggregate: maximum aggregate size dg, mm.
        working_life_100y: design working life of 100 years (Table 4.3N).
        lapped: bars are lapped at the floor (As,max at laps, 9.5.2(3)).
        slenderness_cap: flag columns above this slenderness.
        fire_outside_method: where fire method A does not apply (EN 1992-1-2 5.3.2(2)),
            "fail" the check, or "flag" it as not verified (another method, e.g.
            5.3.3 or Annex B, must then be used; reported as a warning).
        creep: conditions for the creep coefficient of Annex B (relative
            humidity, age at loading, cement class) where phi_ef is not given.
        curvature_c: factor c of Eq. (5.33); None (default): from the shape of
            the first-order moment, 8 where it is constant and 10 where it
            changes sign, linear between (5.8.8.2(4), see
            :func:`design.second_order.nominal_curvature.c_curvature`); a number in [8, 12] fixes it.
    """

    imperfection: ImperfectionMethod = ImperfectionMethod.INCLINATION
    min_eccentricity: MinEccentricity = MinEccentricity.BOTH_AXES
    biaxial: BiaxialMethod = BiaxialMethod.EQ_5_39
    exact_biaxial: bool = False
    exposure: Exposure | ExposureClass | str | None = None
    fire: FireRating | None = None
    mu_fi: float = MU_FI_DEFAULT
    aggregate: float = 20.0
    working_life_100y: bool = False
    lapped: bool = True
    slenderness_cap: float = SLENDERNESS_CAP
    fire_outside_method: Literal["fail", "flag"] = "fail"
    creep: CreepSettings = CreepSettings()
    curvature_c: float | None = None

    def __post_init__(self) -> None:
        if self.curvature_c is not None and not 8.0 <= self.curvature_c <= 12.0:
            msg = f"curvature_c must lie between 8 and 12 (EN 1992-1-1, 5.8.8.2(4)), got c={self.curvature_c}"
            raise ValueError(msg)
        object.__setattr__(self, "imperfection", ImperfectionMethod(self.imperfection))
        object.__setattr__(self, "min_eccentricity", MinEccentricity(self.min_eccentricity))
        object.__setattr__(self, "biaxial", BiaxialMethod(self.biaxial))
        if self.exposure is not None:
            object.__setattr__(self, "exposure", parse_exposure(self.exposure))
        if self.fire is not None:
            object.__setattr__(self, "fire", FireRating(self.fire))
        if self.biaxial is BiaxialMethod.EXACT:
            object.__setattr__(self, "exact_biaxial", True)
        if not 0.0 <= self.mu_fi <= 1.0:
            msg = f"mu_fi must lie between 0 and 1, got mu_fi={self.mu_fi}"
            raise ValueError(msg)
        if self.fire_outside_method not in ("fail", "flag"):
            msg = f"fire_outside_method must be 'fail' or 'flag', got {self.fire_outside_method!r}"
            raise ValueError(msg)
        if not self.aggregate > 0:
            msg = f"aggregate size must be positive, got dg={self.aggregate} mm"
            raise ValueError(msg)


@dataclass(frozen=True)
class ColumnActions:
    """Actions and buckling data per pair (floats or arrays that broadcast).

    Attributes:
        NEd: design axial force, N (compression positive).
        My_top, My_bot: first-order moments about y at the top and bottom, N mm.
        Mz_top, Mz_bot: first-order moments about z at the top and bottom, N mm.
        l0y: effective length for buckling about y (lever arm along h), mm.
        l0z: effective length for buckling about z, mm.
        l_clear: clear height, mm (alpha_h of 5.2(5), shear from end moments);
            None when not known: alpha_h = 1 and, for shear, l = l0 (braced)
            or l0/2 (unbraced), both on the safe side.
        l0_fi: effective length in fire, mm; None: max(l0y, l0z), which EN 1992-1-2
            5.3.2(2) allows in all cases (braced structures may use less).
        phi_ef: effective creep ratio given by the user (0 allowed, 5.8.4(4));
            None: computed per pair as phi(inf, t0) M0Eqp/M0Ed (Eq. (5.19)) with
            phi(inf, t0) from Annex B (``CheckSettings.creep``) and the ratio
            ``M0Eqp_ratio``. The same phi_ef gives A of Eq. (5.13N) and K_phi
            of Eq. (5.37).
        M0Eqp_ratio: M0Eqp / M0Ed, first-order moment under the quasi-permanent
            combination over that under the design combination (5.8.4(2));
            None: 1.0, its usual upper bound, said on the sheet. The same
            ratio scales the design actions to the quasi-permanent ones for
            the stress that decides whether creep is linear (3.1.4(4)).
        char_ratio: characteristic over design actions (N and first-order
            moments) for the stress limit of 7.2(2); None: 1.0 (the design
            actions, on the safe side), said in the check's note.
        moments_from_analysis: rm = M01/M02 may be used for C (braced members
            whose end moments come from an analysis, 5.8.3.1(1)); else C = 0.7.
        braced: the member belongs to a braced structure. Unbraced members take
            C = 0.7 (rm not used, 5.8.3.1(1)) and MEd = M02 + M2 at the end
            (5.8.8.2); l0 is the caller's (Eq. (5.16)).
        As_below: area of the bars lapping into the foot of this storey from the
            storey below, mm2 (9.5.2(3)); None: the same bars as this storey.
        V_Ed: shear force given besides that of the end moments, N (>= 0), added in
            both directions.
        s_link: link spacing provided over the column, mm; None: scl,tmax of
            9.5.3(3) rounded down to 25 mm (the catalogue's rule).
        s_link_zone: link spacing provided near beams and slabs and at laps, mm;
            None: 0.6 scl,tmax (9.5.3(4)) rounded down to 25 mm.
        eta_fi: reduction factor of the design actions in fire, NEd,fi = eta_fi NEd
            (EN 1992-1-2, 2.4.2); with it mu_fi = NEd,fi / NRd per pair for method A
            (5.3.2(3)); None: ``CheckSettings.mu_fi`` (0.7, on the safe side).
    """

    NEd: ArrayLike
    My_top: ArrayLike = 0.0
    My_bot: ArrayLike = 0.0
    Mz_top: ArrayLike = 0.0
    Mz_bot: ArrayLike = 0.0
    l0y: ArrayLike = 3000.0
    l0z: ArrayLike = 3000.0
    l_clear: ArrayLike | None = None
    l0_fi: ArrayLike | None = None
    phi_ef: ArrayLike | None = None
    M0Eqp_ratio: ArrayLike | None = None
    char_ratio: ArrayLike | None = None
    moments_from_analysis: bool = True
    braced: bool = True
    As_below: ArrayLike | None = None
    V_Ed: ArrayLike | None = None
    s_link: ArrayLike | None = None
    s_link_zone: ArrayLike | None = None
    eta_fi: ArrayLike | None = None


@dataclass
class MemberChecks:
    """Results of :func:`check_members` (struct of arrays, one row per pair)."""

    idx: np.ndarray
    checks: list[CheckColumn]
    values: dict[str, np.ndarray] = field(default_factory=dict)

    @functools.cached_property
    def utilisation_matrix(self) -> np.ndarray:
        """(pairs, checks) utilisations."""
        return np.stack([c.utilisation for c in self.checks], axis=1)

    @property
    def utilisation(self) -> np.ndarray:
        """Utilisation of the governing check per pair (inf where a blocking method does not apply).

        This is the largest utilisation, except where NEd exceeds NRd: then the axial check
        governs and its ratio NEd/NRd is reported (the bending checks have no resistance left).
        """
        m = self.utilisation_matrix
        return m[np.arange(m.shape[0]), self.governing]  # type: ignore[no-any-return]  # numpy stubs: fancy indexing is Any

    @functools.cached_property
    def governing(self) -> np.ndarray:
        """Index into ``checks`` of the governing check per pair.

        Where NEd exceeds NRd the axial check governs: the bending checks then
        have no resistance at all (MRd = 0), which says less.
        """
        gov = self.utilisation_matrix.argmax(axis=1)
        axial = self.checks[0].utilisation
        return np.where(axial > 1.0, 0, gov)

    def governing_of(self, kind: CheckKind) -> np.ndarray:
        """Index into ``checks`` of the governing check of one kind per pair (-1 where there is none)."""
        cols = [j for j, c in enumerate(self.checks) if c.kind is kind]
        if not cols:
            return np.full(len(self.idx), -1)
        sub = self.utilisation_matrix[:, cols]
        gov = np.asarray(cols)[sub.argmax(axis=1)]
        if kind is CheckKind.RESISTANCE:
            gov = np.where(self.checks[0].utilisation > 1.0, 0, gov)  # axial first, as in ``governing``
        return gov  # type: ignore[no-any-return]  # numpy stubs: fancy indexing is Any

    @functools.cached_property
    def governing_resistance(self) -> np.ndarray:
        """Index into ``checks`` of the governing resistance check per pair (strength apart from detailing)."""
        return self.governing_of(CheckKind.RESISTANCE)

    @property
    def resistance_utilisation(self) -> np.ndarray:
        """Utilisation of the governing resistance check per pair."""
        m = self.utilisation_matrix
        return m[np.arange(m.shape[0]), self.governing_resistance]  # type: ignore[no-any-return]  # numpy stubs: fancy indexing is Any

    @property
    def ok(self) -> np.ndarray:
        """True where every check passes (checks flagged as not verified do not decide)."""
        return self.utilisation <= 1.0 + 1e-9

    @property
    def unverified(self) -> np.ndarray:
        """True where a non-blocking check could not be verified by its method (a warning)."""
        flags = [~c.applicable for c in self.checks if not c.blocking]
        return np.logical_or.reduce(flags) if flags else np.zeros(len(self.idx), dtype=bool)

    def column(self, i: int) -> ColumnCheck:
        """The single-column view of pair ``i``."""
        results = [c.result(i) for c in self.checks]
        gov = results[int(self.governing[i])]
        flagged = [r for r, c in zip(results, self.checks, strict=True) if not c.blocking and not r.applicable]
        by_kind = {}
        for kind in CheckKind:
            j = int(self.governing_of(kind)[i])
            if j >= 0:
                by_kind[kind] = results[j]
        return ColumnCheck(
            checks=results,
            governing=gov,
            ok=bool(self.ok[i]),
            utilisation=float(self.utilisation[i]),
            unverified=flagged,
            governing_by_kind=by_kind,
            values={k: (v[i].item() if isinstance(v, np.ndarray) else v) for k, v in self.values.items()},
        )


@dataclass(frozen=True)
class ColumnCheck:
    """The full check of one column in one storey."""

    checks: list[CheckResult]
    governing: CheckResult
    ok: bool
    utilisation: float
    values: dict[str, float | bool | str]
    unverified: list[CheckResult] = field(default_factory=list)  # methods that do not apply (flagged)
    governing_by_kind: dict[CheckKind, CheckResult] = field(default_factory=dict)

    @property
    def governing_resistance(self) -> CheckResult:
        """The governing resistance check (axial, bending, biaxial, shear), apart from detailing and cover."""
        return self.governing_by_kind[CheckKind.RESISTANCE]

    def check(self, name: str) -> CheckResult:
        """The check called ``name``."""
        for c in self.checks:
            if c.name == name:
                return c
        msg = f"no check named {name!r}"
        raise KeyError(msg)


@overload
def _b(x: None, n: int) -> None: ...
@overload
def _b(x: ArrayLike, n: int) -> np.ndarray: ...
def _b(x: ArrayLike | None, n: int) -> np.ndarray | None:
    """``x`` as a float array of ``n`` pairs (a copy); None stays None."""
    return None if x is None else np.broadcast_to(np.asarray(x, dtype=float), (n,)).copy()


def check_members(  # noqa: PLR0915 - the member check's phases in clause order, one vectorised pass
    batch: SectionBatch | SectionData,
    idx: ArrayLike,
    actions: ColumnActions,
    settings: CheckSettings = CheckSettings(),
    params: NationalParameters = EN_RECOMMENDED,
    fast: bool = False,
) -> MemberChecks:
    """Check many (cell, candidate) pairs at once.

    EN 1992-1-1, 5.2, 5.8, 6.1, 8.2, 9.5 and 4.4.1; EN 1992-1-2, 5.3.2.

    Args:
        batch: the candidate sections (a SectionBatch, or its SectionData to
            reuse the collected arrays).
        idx: section index per pair.
        actions: the actions per pair (broadcast to the number of pairs).
        settings: options shared by all pairs.
        params: national parameters.
        fast: take MRd from each section's tabulated N-M curve (conservative chord,
            see SectionBatch.moment_resistance_fast) except above 0.9 NRd, where the
            exact solver is used; for screening many pairs, with an exact re-check of
            near-critical ones by the caller.

    Returns:
        MemberChecks with one row per pair.
    """
    data = batch if isinstance(batch, SectionData) else SectionData.of(batch)
    sb = data.batch
    idx = np.asarray(idx, dtype=int).ravel()
    n_pairs = len(idx)
    NEd = _b(actions.NEd, n_pairs)
    g = {k: getattr(data, k)[idx] for k in _PAIR_ARRAYS}
    l0y, l0z = _b(actions.l0y, n_pairs), _b(actions.l0z, n_pairs)
    if np.any(l0y <= 0) or np.any(l0z <= 0):
        msg = "effective lengths l0y, l0z must be positive (mm)"
        raise ValueError(msg)
    l_clear = _b(actions.l_clear, n_pairs)
    moments = {k: _b(getattr(actions, k), n_pairs) for k in ("My_top", "My_bot", "Mz_top", "Mz_bot")}
    braced = np.full(n_pairs, bool(actions.braced))

    n = NEd / (g["Ac"] * g["fcd"])
    omega = g["As"] * g["fyd"] / (g["Ac"] * g["fcd"])
    ei_y = imperfections.ei(l0y, settings.imperfection, l=l_clear, params=params)
    ei_z = imperfections.ei(l0z, settings.imperfection, l=l_clear, params=params)
    use_rm = np.full(n_pairs, bool(actions.moments_from_analysis))
    both = settings.min_eccentricity is MinEccentricity.BOTH_AXES
    phi_ef, creep_values = effective_creep(
        g,
        data.transformed(idx),
        NEd,
        moments,
        _b(actions.phi_ef, n_pairs),
        _b(actions.M0Eqp_ratio, n_pairs),
        settings.creep,
    )

    # Resistances at NEd (independent of the imperfection case).
    NRd = sb.NRd()[idx]
    if fast:
        MRdy = sb.moment_resistance_fast(NEd, "y", idx)
        MRdz = sb.moment_resistance_fast(NEd, "z", idx)
        near = np.nonzero((NEd > 0.9 * NRd) & (NEd <= NRd))[0]
        if near.size:
            MRdy[near] = sb.moment_resistance(NEd[near], "y", idx[near])
            MRdz[near] = sb.moment_resistance(NEd[near], "z", idx[near])
    else:
        MRdy = sb.moment_resistance(NEd, "y", idx)
        MRdz = sb.moment_resistance(NEd, "z", idx)
    NRd_a = g["Ac"] * g["fcd"] + g["As"] * g["fyd"]  # as defined for Eq. (5.39) in 5.8.9(4)
    shape = np.where(g["circ"], "circular", "rectangular")
    a_exp = np.where(g["circ"], 2.0, biaxial.exponent_a(np.maximum(NEd, 0.0), NRd_a, SectionShape.RECTANGULAR))

    common = dict(
        NEd=NEd,
        fck=g["fck"],
        fyd=g["fyd"],
        Es=g["Es"],
        phi_ef=phi_ef,
        n=n,
        omega=omega,
        braced=braced,
        use_rm=use_rm,
        c_fixed=settings.curvature_c,
        params=params,
    )
    cases: list[dict[str, Any]] = []
    for imp_on_y in (True, False):
        ay = axis_moments(
            M_top=moments["My_top"],
            M_bot=moments["My_bot"],
            l0=l0y,
            i=g["iy"],
            h_e0=g["h"],
            d=g["dy"],
            ei_=ei_y,
            with_imp=imp_on_y,
            with_e0=imp_on_y or both,
            **common,
        )
        az = axis_moments(
            M_top=moments["Mz_top"],
            M_bot=moments["Mz_bot"],
            l0=l0z,
            i=g["iz"],
            h_e0=g["b"],
            d=g["dz"],
            ei_=ei_z,
            with_imp=not imp_on_y,
            with_e0=(not imp_on_y) or both,
            **common,
        )
        uy = _ratio(ay["MEd"], MRdy)
        uz = _ratio(az["MEd"], MRdz)
        crit_a = biaxial.slenderness_ratio_ok(ay["lambda"], az["lambda"])
        with np.errstate(divide="ignore", invalid="ignore"):
            ey = az["MEd"] / np.where(NEd > 0, NEd, 1.0)
            ez = ay["MEd"] / np.where(NEd > 0, NEd, 1.0)
            ry, rz = ey / (g["iz"] * np.sqrt(12.0)), ez / (g["iy"] * np.sqrt(12.0))
            crit_b = (np.minimum(ry, rz) <= 0.2 * np.maximum(ry, rz)) | (NEd <= 0)
        separate = crit_a & crit_b
        inter = np.where(separate, 0.0, uz**a_exp + uy**a_exp)
        worst = np.maximum.reduce([uy, uz, inter])
        cases.append(
            {
                "y": ay,
                "z": az,
                "uy": uy,
                "uz": uz,
                "crit_a": crit_a,
                "crit_b": crit_b,
                "separate": separate,
                "inter": inter,
                "worst": worst,
            }
        )
    pick_y = cases[0]["worst"] >= cases[1]["worst"]

    def sel(key: str, sub: str | None = None) -> np.ndarray:
        c0 = cases[0][key] if sub is None else cases[0][sub][key]
        c1 = cases[1][key] if sub is None else cases[1][sub][key]
        return np.where(pick_y, c0, c1)  # type: ignore[no-any-return]  # numpy stubs: np.where of Any values is Any

    MEdy, MEdz = sel("MEd", "y"), sel("MEd", "z")
    separate = sel("separate")
    inter = sel("inter")
    values: dict[str, np.ndarray] = {
        "NEd": NEd,
        "NRd": NRd,
        "NRd_5_39": NRd_a,
        "MRdy": MRdy,
        "MRdz": MRdz,
        "MEdy": MEdy,
        "MEdz": MEdz,
        "n": n,
        "omega": omega,
        "ei_y": ei_y * np.ones(n_pairs),
        "ei_z": ei_z * np.ones(n_pairs),
        "imperfection_axis": np.where(pick_y, "y", "z"),
        "a": a_exp,
        "criterion_5_38a": sel("crit_a"),
        "criterion_5_38b": sel("crit_b"),
        "separate_checks": separate,
        "interaction_5_39": inter,
        "l0y": l0y,
        "l0z": l0z,
        "shape": shape,
    }
    for ax in ("y", "z"):
        for key in "lambda lambda_lim A B C rm rm_imperfection M01 M02 M0e e0 Kr Kphi inv_r c e2 M2 slender".split():
            values[f"{key}_{ax}"] = sel(key, ax)
    values["A_default"] = np.zeros(n_pairs, dtype=bool)  # A always comes from phi_ef now (5.8.4)
    values["C_default"] = ~(use_rm & braced)
    values["braced"] = braced
    values.update(creep_values)
    # 5.8.4(4): creep may be ignored (phi_ef = 0) where phi(inf, t0) <= 2, lambda <= 75 and M0Ed/NEd >= h
    with np.errstate(divide="ignore", invalid="ignore"):
        ecc_ok = (values["M02_y"] / np.where(NEd > 0, NEd, np.inf) >= g["h"]) & (
            values["M02_z"] / np.where(NEd > 0, NEd, np.inf) >= g["b"]
        )
    values["creep_ignorable_5_8_4_4"] = (
        (creep_values["phi_inf"] <= 2.0) & (np.maximum(values["lambda_y"], values["lambda_z"]) <= 75.0) & ecc_ok
    )

    ones = np.ones(n_pairs, dtype=bool)
    checks = [
        CheckColumn(
            "axial resistance",
            "EN 1992-1-1, 6.1",
            "kN",
            NEd / 1e3,
            NRd / 1e3,
            ones,
            "NRd by strain compatibility, uniform strain eps_c2 (6.1(5))",
        ),
        CheckColumn(
            "bending about y", "EN 1992-1-1, 5.8.9(3), 6.1", "kNm", MEdy / 1e6, MRdy / 1e6, ones, "MEdy <= MRdy at NEd"
        ),
        CheckColumn(
            "bending about z", "EN 1992-1-1, 5.8.9(3), 6.1", "kNm", MEdz / 1e6, MRdz / 1e6, ones, "MEdz <= MRdz at NEd"
        ),
        CheckColumn(
            "biaxial interaction",
            "EN 1992-1-1, 5.8.9(4), Eq. (5.39)",
            "-",
            inter,
            np.ones(n_pairs),
            ones,
            np.where(separate, "not required: criteria (5.38a) and (5.38b) met", "(MEdz/MRdz)^a + (MEdy/MRdy)^a <= 1"),
        ),
    ]
    if settings.exact_biaxial:
        u_exact = exact_biaxial(sb, idx, NEd, MEdy, MEdz)
        values["utilisation_exact"] = u_exact
        if settings.biaxial is BiaxialMethod.EXACT:
            checks[3] = CheckColumn(
                "biaxial, direction-exact",
                "EN 1992-1-1, 6.1 (resistance surface)",
                "-",
                u_exact,
                np.ones(n_pairs),
                ones,
                "resultant MEd against MRd in its direction at NEd",
            )
    lam_max = np.maximum(values["lambda_y"], values["lambda_z"])
    checks.append(
        CheckColumn(
            "slenderness within range of method",
            "EN 1992-1-1, 5.8.8 (limit: common practice)",
            "-",
            lam_max,
            np.full(n_pairs, settings.slenderness_cap),
            ones,
            f"lambda above {settings.slenderness_cap:g} is flagged",
        )
    )
    s_link, s_zone = link_spacing(g, _b(actions.s_link, n_pairs), _b(actions.s_link_zone, n_pairs), params)
    values["s_link"], values["s_link_zone"] = s_link, s_zone
    checks += shear_checks(
        g, NEd, moments, l0y, l0z, l_clear, braced, s_link, _b(actions.V_Ed, n_pairs), values, params
    )
    checks += detailing_checks(g, NEd, settings.lapped, settings.aggregate, params, _b(actions.As_below, n_pairs))
    if actions.s_link is not None or actions.s_link_zone is not None:
        # derived spacings meet 9.5.3(3), (4) by construction; given ones are checked
        checks += link_spacing_checks(g, s_link, s_zone, params)
    if settings.exposure is not None:
        exposure = parse_exposure(settings.exposure)  # already parsed in CheckSettings: the same value, typed
        checks += cover_checks(g, exposure, settings.aggregate, settings.working_life_100y, params)
        checks += stress_checks(
            g, data.transformed(idx), NEd, moments, exposure, _b(actions.char_ratio, n_pairs), values, params
        )
    if settings.fire is not None:
        l0_fi = _b(actions.l0_fi, n_pairs)
        values["l0_fi"] = np.maximum(l0y, l0z) if l0_fi is None else l0_fi
        # 5.3.2(3): mu_fi = NEd,fi / NRd with NEd,fi = eta_fi NEd (2.4.2) where eta_fi is known, else the setting
        mu_fi = settings.mu_fi if actions.eta_fi is None else _b(actions.eta_fi, n_pairs) * NEd / values["NRd"]
        checks.append(fire_check(g, NEd, values, settings.fire, mu_fi, settings.fire_outside_method, params))

    # Quantities that feed the schedule (not pass/fail).
    values["lap_length"] = laps.lap_length(g["dia_max"], g["fck"], g["fyk"], params=params)
    values["scl_max"] = detailing.scl_tmax(g["dia_min"], np.minimum(g["b"], g["h"]), False, params)
    values["scl_reduced"] = detailing.scl_tmax(g["dia_min"], np.minimum(g["b"], g["h"]), True, params)
    values["extra_ties"] = g["extra_ties"]
    return MemberChecks(idx=idx, checks=checks, values=values)


def _ratio(demand: np.ndarray, capacity: np.ndarray) -> np.ndarray:
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(capacity > 0, demand / np.where(capacity > 0, capacity, 1.0), np.where(demand > 0, np.inf, 0.0))


def check_column(
    design: DesignSection,
    actions: ColumnActions,
    settings: CheckSettings = CheckSettings(),
    params: NationalParameters = EN_RECOMMENDED,
) -> ColumnCheck:
    """The full check of one column: a view of :func:`check_members` for one pair."""
    res = check_members(SectionBatch([design]), np.array([0]), actions, settings, params)
    return res.column(0)
