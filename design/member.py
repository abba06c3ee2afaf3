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
moment-diagram convention of :mod:`design.slenderness` (same sign at both
ends = single curvature).
"""

from __future__ import annotations

import dataclasses
import functools
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from enum import StrEnum
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike

from design import biaxial, cover, creep, detailing, fire, laps, serviceability, shear, slenderness
from design.biaxial import SectionShape
from design.cover import Exposure, ExposureClass, parse_exposure
from design.creep import CreepSettings
from design.fire import MU_FI_DEFAULT, FireRating
from design.materials import Ecm, fctm
from design.params import EN_RECOMMENDED, NationalParameters
from design.resistance import DesignSection, SectionBatch
from design.results import CheckKind, CheckResult
from design.sections import CircSection, RectSection
from design.slenderness import ImperfectionMethod

__all__ = [
    "MinEccentricity",
    "BiaxialMethod",
    "CheckSettings",
    "ColumnActions",
    "CheckColumn",
    "MemberChecks",
    "ColumnCheck",
    "SectionData",
    "check_members",
    "check_column",
    "SLENDERNESS_CAP",
]

# Beyond this slenderness the simplified methods of 5.8.8 are not relied on
# here and the column is flagged (common practice; EN 1992-1-1 sets no limit).
SLENDERNESS_CAP = 140.0


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
            :func:`design.slenderness.c_curvature`); a number in [8, 12] fixes it.
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


@dataclass
class SectionData:
    """Per-section geometry and material arrays of a batch (struct of arrays)."""

    batch: SectionBatch
    circ: np.ndarray
    b: np.ndarray
    h: np.ndarray
    Ac: np.ndarray
    As: np.ndarray
    iy: np.ndarray
    iz: np.ndarray
    dy: np.ndarray
    dz: np.ndarray
    fck: np.ndarray
    fcd: np.ndarray
    fyk: np.ndarray
    fyd: np.ndarray
    Es: np.ndarray
    cover: np.ndarray
    link: np.ndarray
    dia_max: np.ndarray
    dia_min: np.ndarray
    n_bars: np.ndarray
    min_gap: np.ndarray
    extra_ties: np.ndarray
    a_fire_min: np.ndarray  # smallest axis distance of any bar to its nearest face, mm (EN 1992-1-2, 5.2)
    a_fire_mean: np.ndarray  # area-weighted mean axis distance am, mm (EN 1992-1-2, Eq. (5.5))
    Asl_y: np.ndarray  # bars of the tension face for bending about y (shear along z), mm2 (6.2.2(1))
    Asl_z: np.ndarray  # bars of the tension face for bending about z (shear along y), mm2
    dv_y: np.ndarray  # effective depth to that face's bars, shear along z, mm
    dv_z: np.ndarray  # effective depth to that face's bars, shear along y, mm
    fctm: np.ndarray  # mean tensile strength, MPa (Table 3.1)
    tr: dict  # uncracked transformed section, short-term alpha_e = Es/Ecm (7.2): A, Sy, Sz, Iyy, Izz, Iyz

    @classmethod
    def of(cls, batch: SectionBatch) -> SectionData:
        """Collect the arrays of ``batch`` (one pass over its sections)."""
        ds = batch.designs
        secs = [d.section for d in ds]
        circ = np.array([isinstance(s, CircSection) for s in secs])
        b = np.array([s.b for s in secs], dtype=float)
        h = np.array([s.h for s in secs], dtype=float)
        iy = np.where(circ, h / 4.0, h / np.sqrt(12.0))
        iz = np.where(circ, b / 4.0, b / np.sqrt(12.0))
        ties = [extra_ties(s) for s in secs]
        axis = [_axis_distances(s) for s in secs]
        tension = np.array([_tension_face(s) for s in secs], dtype=float).reshape(-1, 4)
        trs = [_transformed(d) for d in ds]
        return cls(
            batch=batch, circ=circ, b=b, h=h,
            Ac=np.array([s.Ac for s in secs]), As=np.array([s.As for s in secs]),
            iy=iy, iz=iz,
            dy=np.array([s.effective_depth("y") for s in secs]),
            dz=np.array([s.effective_depth("z") for s in secs]),
            fck=np.array([d.concrete.fck for d in ds]), fcd=np.array([d.concrete.fcd for d in ds]),
            fyk=np.array([d.steel.fyk for d in ds]), fyd=np.array([d.steel.fyd for d in ds]),
            Es=np.array([d.steel.Es for d in ds]),
            cover=np.array([s.cover for s in secs]), link=np.array([s.link for s in secs]),
            dia_max=np.array([s.bars.max_dia for s in secs]),
            dia_min=np.array([s.bars.min_dia for s in secs]),
            n_bars=np.array([s.bars.count for s in secs]),
            min_gap=np.array([float(np.min(s.clear_spacings())) for s in secs]),
            extra_ties=np.array(ties),
            a_fire_min=np.array([a for a, _ in axis]), a_fire_mean=np.array([m for _, m in axis]),
            Asl_y=tension[:, 0], Asl_z=tension[:, 1], dv_y=tension[:, 2], dv_z=tension[:, 3],
            fctm=np.array([float(fctm(d.concrete.fck)) for d in ds]),
            tr={k: np.array([float(getattr(x, k)) for x in trs]) for k in ("A", "Sy", "Sz", "Iyy", "Izz", "Iyz")},
        )

    def transformed(self, idx: np.ndarray) -> serviceability.TransformedSection:
        """The uncracked transformed sections of pairs ``idx``."""
        return serviceability.TransformedSection(
            **{k: v[idx] for k, v in self.tr.items()}, b=self.b[idx], h=self.h[idx], circular=self.circ[idx])


def _transformed(design: DesignSection) -> serviceability.TransformedSection:
    """Uncracked transformed section with the short-term modular ratio Es/Ecm (EN 1992-1-1, 7.2)."""
    s = design.section
    y, z, dia = s.bar_coords()
    ae = serviceability.alpha_e(float(Ecm(design.concrete.fck)), 0.0, design.steel.Es)
    area = np.pi * dia**2 / 4.0
    if isinstance(s, CircSection):
        return serviceability.transformed_circle(s.diameter, y, z, area, ae)
    return serviceability.transformed_rectangle(s.b, s.h, y, z, area, ae)


def _tension_face(section: RectSection | CircSection) -> tuple[float, float, float, float]:
    """(Asl about y, Asl about z, d about y, d about z) for the shear resistance VRd,c, mm2 and mm.

    EN 1992-1-1, 6.2.2(1): Asl is the tensile reinforcement. For bending about y
    the tension face is a b-face (bars at the extreme z); about z an h-face.
    A circle takes the bars beyond half the bar radius on the tension side
    (common practice, about a third of the bars) and d to the extreme bar.
    """
    y, z, dia = section.bar_coords()
    area = np.pi * dia**2 / 4.0
    if isinstance(section, CircSection):
        r = section.bar_radius
        asl = float(area[z <= -0.5 * r + 1e-6].sum())
        d = section.diameter / 2.0 + r
        return asl, asl, d, d
    on_y = np.isclose(z, z.min(), atol=20.0)
    on_z = np.isclose(y, y.min(), atol=20.0)
    return (float(area[on_y].sum()), float(area[on_z].sum()),
            section.h / 2.0 + float(np.abs(z[on_y]).max()), section.b / 2.0 + float(np.abs(y[on_z]).max()))


def _axis_distances(section: RectSection | CircSection) -> tuple[float, float]:
    """Smallest and area-weighted mean axis distance of the bars to the nearest face, mm.

    EN 1992-1-2, 5.2(1) and Eq. (5.5): a bar's axis distance is measured from
    its centre to the nearest exposed surface (all faces exposed).
    """
    y, z, dia = section.bar_coords()
    if isinstance(section, CircSection):
        a = section.diameter / 2.0 - np.hypot(y, z)
    else:
        a = np.minimum(section.b / 2.0 - np.abs(y), section.h / 2.0 - np.abs(z))
    return float(a.min()), fire.average_axis_distance(np.pi * dia**2 / 4.0, a)


def extra_ties(section: RectSection | CircSection) -> int:
    """Extra ties a section needs so that every bar is within 150 mm of a restrained bar (9.5.3(6))."""
    if isinstance(section, CircSection):
        return 0  # a circular link restrains every bar
    y, z, _ = section.bar_coords()
    return _extra_ties_rect(y, z)


def _extra_ties_rect(y: np.ndarray, z: np.ndarray) -> int:
    """Extra ties so that every bar lies within 150 mm of a restrained bar (9.5.3(6))."""
    total = 0
    for along, across in ((y, z), (z, y)):
        for side in (across.max(), across.min()):
            on_face = np.isclose(across, side, atol=20.0)
            total += _face_ties(tuple(np.round(np.sort(along[on_face]), 1)))
    return total


@functools.lru_cache(maxsize=4096)
def _face_ties(positions: tuple[float, ...]) -> int:
    return int(detailing.extra_ties_needed(np.array(positions)))


@dataclass(frozen=True)
class CheckColumn:
    """One named check over many pairs (arrays), with its clause."""

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
            u = np.where(self.capacity > 0, self.demand / np.where(self.capacity > 0, self.capacity, 1.0),
                         np.where(self.demand > 0, np.inf, 0.0))
        return np.where(self.applicable, u, np.inf if self.blocking else 0.0)

    def result(self, i: int) -> CheckResult:
        """The check of pair ``i`` as a :class:`CheckResult`."""
        if isinstance(self.note, str):
            note = self.note
        elif callable(self.note):
            note = self.note(i)
        else:
            note = str(self.note[i])
        return CheckResult(self.name, self.clause, float(self.demand[i]), float(self.capacity[i]),
                           self.unit, note, bool(self.applicable[i]), kind=self.kind)


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
        return m[np.arange(m.shape[0]), self.governing]

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
        return gov

    @functools.cached_property
    def governing_resistance(self) -> np.ndarray:
        """Index into ``checks`` of the governing resistance check per pair (strength apart from detailing)."""
        return self.governing_of(CheckKind.RESISTANCE)

    @property
    def resistance_utilisation(self) -> np.ndarray:
        """Utilisation of the governing resistance check per pair."""
        m = self.utilisation_matrix
        return m[np.arange(m.shape[0]), self.governing_resistance]

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
            checks=results, governing=gov, ok=bool(self.ok[i]), utilisation=float(self.utilisation[i]),
            unverified=flagged, governing_by_kind=by_kind,
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


def _b(x: ArrayLike | None, n: int) -> np.ndarray | None:
    return None if x is None else np.broadcast_to(np.asarray(x, dtype=float), (n,)).copy()


def _axis_moments(
    NEd, M_top, M_bot, l0, i, h_e0, d, fck, fyd, Es, phi_ef, n, omega, ei_, with_imp,
    with_e0, use_rm, braced, c_fixed, params,
):
    """Design moment about one axis for one imperfection case (arrays; N, mm).

    EN 1992-1-1, 5.8.8 with 5.8.3.1, 5.2(7) and 6.1(4).

    rm = M01/M02 is taken from the first-order end moments including the
    imperfection moment NEd ei, which acts at both ends in the direction of
    M02; where the imperfection moment is at least the larger end moment of
    the analysis, the first-order moment is predominantly due to the
    imperfection and rm = 1 (5.8.3.1(1)). Unbraced members take C = 0.7 and
    MEd = M02 + M2 (the second-order moment adds at the end).
    """
    lam = slenderness.slenderness(l0, i)
    M01, M02 = slenderness.first_order_end_moments(M_top, M_bot, NEd, ei_, with_imp)
    with np.errstate(divide="ignore", invalid="ignore"):
        rm_total = np.where(M02 > 0, M01 / np.where(M02 > 0, M02, 1.0), 1.0)
    m_imp = np.where(with_imp, np.maximum(NEd, 0.0) * ei_, 0.0)
    m_first = np.maximum(np.abs(M_top), np.abs(M_bot))
    predominantly_imp = with_imp & (m_imp >= m_first)
    rm = np.where(predominantly_imp, 1.0, np.clip(rm_total, -1.0, 1.0))
    rm = np.where(use_rm & braced, rm, 1.0)  # C = 0.7 where rm may not be used
    lim = slenderness.lambda_lim(n, phi_ef=phi_ef, omega=omega, r_m=rm, params=params)
    e0 = np.where(with_e0, slenderness.e0_min(h_e0), 0.0)
    kr = slenderness.Kr(np.maximum(n, 0.0), omega)
    kphi = slenderness.Kphi(phi_ef, fck, lam)
    curv = slenderness.inv_r(kr, kphi, slenderness.inv_r0(slenderness.eps_yd(fyd, Es), d))
    c = slenderness.c_curvature(rm_total) if c_fixed is None else np.full_like(NEd, c_fixed)
    e2 = slenderness.e2(curv, l0, c)
    slender = (lam > lim.lambda_lim) & (NEd > 0)
    m2 = np.where(slender, slenderness.M2(NEd, e2), 0.0)
    end_moment = np.maximum(M02 + m2, np.maximum(NEd, 0.0) * e0)  # unbraced: MEd = M02 + M2
    MEd = np.where(
        slender,
        np.where(braced, slenderness.design_moment_second_order(NEd, M01, M02, m2, e0), end_moment),
        slenderness.design_moment_first_order(NEd, M02, e0),
    )
    ones = np.ones_like(NEd)
    return {
        "lambda": lam, "lambda_lim": lim.lambda_lim, "A": lim.A * ones,
        "B": lim.B * ones, "C": lim.C * ones, "rm": rm * ones, "rm_imperfection": predominantly_imp * ones,
        "M01": M01, "M02": M02,
        "M0e": np.abs(slenderness.M0e(M01, M02)), "e0": slenderness.e0_min(h_e0),
        "Kr": kr, "Kphi": kphi, "inv_r": curv, "c": c * ones, "e2": np.where(slender, e2, 0.0), "M2": m2,
        "MEd": MEd, "slender": slender,
    }


def check_members(
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
    g = {k: getattr(data, k)[idx] for k in (
        "circ", "b", "h", "Ac", "As", "iy", "iz", "dy", "dz", "fck", "fcd", "fyk", "fyd", "Es",
        "cover", "link", "dia_max", "dia_min", "n_bars", "min_gap", "extra_ties", "a_fire_min", "a_fire_mean",
        "Asl_y", "Asl_z", "dv_y", "dv_z", "fctm")}
    l0y, l0z = _b(actions.l0y, n_pairs), _b(actions.l0z, n_pairs)
    if np.any(l0y <= 0) or np.any(l0z <= 0):
        msg = "effective lengths l0y, l0z must be positive (mm)"
        raise ValueError(msg)
    l_clear = _b(actions.l_clear, n_pairs)
    moments = {k: _b(getattr(actions, k), n_pairs) for k in ("My_top", "My_bot", "Mz_top", "Mz_bot")}
    braced = np.full(n_pairs, bool(actions.braced))

    n = NEd / (g["Ac"] * g["fcd"])
    omega = g["As"] * g["fyd"] / (g["Ac"] * g["fcd"])
    ei_y = slenderness.ei(l0y, settings.imperfection, l=l_clear, params=params)
    ei_z = slenderness.ei(l0z, settings.imperfection, l=l_clear, params=params)
    use_rm = np.full(n_pairs, bool(actions.moments_from_analysis))
    both = settings.min_eccentricity is MinEccentricity.BOTH_AXES
    phi_ef, creep_values = _creep(g, data.transformed(idx), NEd, moments, actions, settings, n_pairs)

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
    a_exp = np.where(g["circ"], 2.0,
                     biaxial.exponent_a(np.maximum(NEd, 0.0), NRd_a, SectionShape.RECTANGULAR))

    common = dict(NEd=NEd, fck=g["fck"], fyd=g["fyd"], Es=g["Es"], phi_ef=phi_ef, n=n, omega=omega,
                  braced=braced, use_rm=use_rm, c_fixed=settings.curvature_c, params=params)
    cases = []
    for imp_on_y in (True, False):
        ay = _axis_moments(M_top=moments["My_top"], M_bot=moments["My_bot"], l0=l0y, i=g["iy"], h_e0=g["h"],
                           d=g["dy"], ei_=ei_y, with_imp=imp_on_y, with_e0=imp_on_y or both, **common)
        az = _axis_moments(M_top=moments["Mz_top"], M_bot=moments["Mz_bot"], l0=l0z, i=g["iz"], h_e0=g["b"],
                           d=g["dz"], ei_=ei_z, with_imp=not imp_on_y, with_e0=(not imp_on_y) or both,
                           **common)
        uy = _ratio(ay["MEd"], MRdy)
        uz = _ratio(az["MEd"], MRdz)
        crit_a = biaxial.slenderness_ratio_ok(ay["lambda"], az["lambda"])
        with np.errstate(divide="ignore", invalid="ignore"):
            ey = az["MEd"] / np.where(NEd > 0, NEd, 1.0)
            ez = ay["MEd"] / np.where(NEd > 0, NEd, 1.0)
            ry, rz = ey / (g["iz"] * np.sqrt(12.0)), ez / (g["iy"] * np.sqrt(12.0))
            crit_b = (np.minimum(ry, rz) <= 0.2 * np.maximum(ry, rz)) | (NEd <= 0)
        separate = crit_a & crit_b
        inter = np.where(separate, 0.0, uz ** a_exp + uy ** a_exp)
        worst = np.maximum.reduce([uy, uz, inter])
        cases.append({"y": ay, "z": az, "uy": uy, "uz": uz, "crit_a": crit_a, "crit_b": crit_b,
                      "separate": separate, "inter": inter, "worst": worst})
    pick_y = cases[0]["worst"] >= cases[1]["worst"]

    def sel(key, sub=None):
        c0 = cases[0][key] if sub is None else cases[0][sub][key]
        c1 = cases[1][key] if sub is None else cases[1][sub][key]
        return np.where(pick_y, c0, c1)

    MEdy, MEdz = sel("MEd", "y"), sel("MEd", "z")
    separate = sel("separate")
    inter = sel("inter")
    values: dict[str, np.ndarray] = {
        "NEd": NEd, "NRd": NRd, "NRd_5_39": NRd_a, "MRdy": MRdy, "MRdz": MRdz, "MEdy": MEdy, "MEdz": MEdz,
        "n": n, "omega": omega, "ei_y": ei_y * np.ones(n_pairs), "ei_z": ei_z * np.ones(n_pairs),
        "imperfection_axis": np.where(pick_y, "y", "z"), "a": a_exp, "criterion_5_38a": sel("crit_a"),
        "criterion_5_38b": sel("crit_b"), "separate_checks": separate, "interaction_5_39": inter,
        "l0y": l0y, "l0z": l0z, "shape": shape,
    }
    for ax in ("y", "z"):
        for key in ("lambda", "lambda_lim", "A", "B", "C", "rm", "rm_imperfection", "M01", "M02", "M0e", "e0",
                    "Kr", "Kphi", "inv_r", "c", "e2", "M2", "slender"):
            values[f"{key}_{ax}"] = sel(key, ax)
    values["A_default"] = np.zeros(n_pairs, dtype=bool)  # A always comes from phi_ef now (5.8.4)
    values["C_default"] = ~(use_rm & braced)
    values["braced"] = braced
    values.update(creep_values)
    # 5.8.4(4): creep may be ignored (phi_ef = 0) where phi(inf, t0) <= 2, lambda <= 75 and M0Ed/NEd >= h
    with np.errstate(divide="ignore", invalid="ignore"):
        ecc_ok = ((values["M02_y"] / np.where(NEd > 0, NEd, np.inf) >= g["h"])
                  & (values["M02_z"] / np.where(NEd > 0, NEd, np.inf) >= g["b"]))
    values["creep_ignorable_5_8_4_4"] = ((creep_values["phi_inf"] <= 2.0)
                                         & (np.maximum(values["lambda_y"], values["lambda_z"]) <= 75.0) & ecc_ok)

    ones = np.ones(n_pairs, dtype=bool)
    checks = [
        CheckColumn("axial resistance", "EN 1992-1-1, 6.1", "kN", NEd / 1e3, NRd / 1e3, ones,
                    "NRd by strain compatibility, uniform strain eps_c2 (6.1(5))"),
        CheckColumn("bending about y", "EN 1992-1-1, 5.8.9(3), 6.1", "kNm", MEdy / 1e6, MRdy / 1e6, ones,
                    "MEdy <= MRdy at NEd"),
        CheckColumn("bending about z", "EN 1992-1-1, 5.8.9(3), 6.1", "kNm", MEdz / 1e6, MRdz / 1e6, ones,
                    "MEdz <= MRdz at NEd"),
        CheckColumn("biaxial interaction", "EN 1992-1-1, 5.8.9(4), Eq. (5.39)", "-", inter, np.ones(n_pairs),
                    ones, np.where(separate, "not required: criteria (5.38a) and (5.38b) met",
                                   "(MEdz/MRdz)^a + (MEdy/MRdy)^a <= 1")),
    ]
    if settings.exact_biaxial:
        u_exact = _exact_biaxial(sb, idx, NEd, MEdy, MEdz)
        values["utilisation_exact"] = u_exact
        if settings.biaxial is BiaxialMethod.EXACT:
            checks[3] = CheckColumn("biaxial, direction-exact", "EN 1992-1-1, 6.1 (resistance surface)", "-",
                                    u_exact, np.ones(n_pairs), ones,
                                    "resultant MEd against MRd in its direction at NEd")
    lam_max = np.maximum(values["lambda_y"], values["lambda_z"])
    checks.append(CheckColumn("slenderness within range of method", "EN 1992-1-1, 5.8.8 (limit: common practice)",
                              "-", lam_max, np.full(n_pairs, settings.slenderness_cap), ones,
                              f"lambda above {settings.slenderness_cap:g} is flagged"))
    s_link, s_zone = _link_spacing(g, actions, n_pairs, params)
    values["s_link"], values["s_link_zone"] = s_link, s_zone
    checks += _shear_checks(g, NEd, moments, l0y, l0z, l_clear, braced, s_link, actions, values, params)
    checks += [dataclasses.replace(c, kind=CheckKind.DETAILING) for c in _detailing_checks(g, NEd, settings, params,
                                                                             _b(actions.As_below, n_pairs))]
    if actions.s_link is not None or actions.s_link_zone is not None:
        # derived spacings meet 9.5.3(3), (4) by construction; given ones are checked
        checks += _link_spacing_checks(g, s_link, s_zone, params)
    if settings.exposure is not None:
        checks += _cover_checks(g, settings, params)
        checks += _stress_checks(g, data.transformed(idx), NEd, moments, actions, settings, values, params)
    if settings.fire is not None:
        l0_fi = _b(actions.l0_fi, n_pairs)
        values["l0_fi"] = np.maximum(l0y, l0z) if l0_fi is None else l0_fi
        checks.append(dataclasses.replace(_fire_check(g, NEd, values, settings, params), kind=CheckKind.FIRE))

    # Quantities that feed the schedule (not pass/fail).
    values["lap_length"] = laps.lap_length(g["dia_max"], g["fck"], g["fyk"], params=params)
    values["scl_max"] = detailing.scl_tmax(g["dia_min"], np.minimum(g["b"], g["h"]), False, params)
    values["scl_reduced"] = detailing.scl_tmax(g["dia_min"], np.minimum(g["b"], g["h"]), True, params)
    values["extra_ties"] = g["extra_ties"]
    return MemberChecks(idx=idx, checks=checks, values=values)


def _frame_moments(moments: dict) -> tuple[np.ndarray, np.ndarray]:
    """The larger first-order end moment about y and about z (magnitudes), N mm."""
    return (np.maximum(np.abs(moments["My_top"]), np.abs(moments["My_bot"])),
            np.maximum(np.abs(moments["Mz_top"]), np.abs(moments["Mz_bot"])))


def _creep(g: dict, tr: serviceability.TransformedSection, NEd: np.ndarray, moments: dict,
           actions: ColumnActions, settings: CheckSettings, n_pairs: int):
    """Effective creep ratio per pair and the values that explain it.

    EN 1992-1-1, 5.8.4 (Eq. (5.19)), Annex B, and 3.1.4(4): where the
    quasi-permanent compressive stress exceeds 0.45 fck at loading, creep is
    non-linear and phi(inf, t0) is raised by Eq. (3.7). The stress is that of
    the uncracked transformed section under the design actions scaled by
    M0Eqp/M0Ed (short-term modular ratio: on the safe side for the concrete).
    """
    perimeter = np.where(g["circ"], creep.perimeter_circle(g["b"]), creep.perimeter_rectangle(g["b"], g["h"]))
    h0 = creep.notional_size(g["Ac"], perimeter)
    phi_lin = creep.phi_inf_section(g["Ac"], perimeter, g["fck"] + 8.0, settings.creep)  # fcm, Table 3.1
    given = actions.phi_ef is not None
    ratio_given = actions.M0Eqp_ratio is not None
    ratio = _b(actions.M0Eqp_ratio, n_pairs) if ratio_given else np.ones(n_pairs)
    my, mz = _frame_moments(moments)
    stress = serviceability.sigma_c_uncracked(tr, np.maximum(NEd, 0.0) * ratio, my * ratio, mz * ratio, g["fctm"])
    k_sigma = np.maximum(stress.sigma_c_max, 0.0) / g["fck"]
    phi_inf = creep.phi_nonlinear(phi_lin, k_sigma)
    if given:
        phi_ef = _b(actions.phi_ef, n_pairs)
        source = "given"
    else:
        phi_ef = creep.phi_ef(phi_inf, ratio)
        source = ("Annex B, M0Eqp/M0Ed from the quasi-permanent and design combinations" if ratio_given
                  else "Annex B, M0Eqp/M0Ed not given: 1.0 taken (upper bound)")
    return phi_ef, {
        "phi_ef": phi_ef, "phi_inf": phi_inf, "phi_inf_linear": phi_lin, "h0": h0, "M0Eqp_ratio": ratio,
        "sigma_c_qp": stress.sigma_c_max, "k_sigma_qp": k_sigma, "creep_nonlinear": k_sigma > creep.K_SIGMA_LINEAR,
        "phi_ef_source": np.full(n_pairs, source), "creep_conditions": np.full(n_pairs, settings.creep.describe()),
    }


def _stress_checks(g: dict, tr: serviceability.TransformedSection, NEd: np.ndarray, moments: dict,
                   actions: ColumnActions, settings: CheckSettings, values: dict,
                   params: NationalParameters) -> list[CheckColumn]:
    """Compressive stress under the characteristic combination, k1 fck in XD, XF, XS (EN 1992-1-1, 7.2(2)).

    Uncracked transformed section (short-term modular ratio) under the design actions times
    ``char_ratio`` (N and the larger first-order end moments; 1.0 when not given, on the safe side).
    Where the section cracks under those actions the uncracked stress is not valid and the check is
    flagged as not verified (a cracked-section stress is not computed here).
    """
    if settings.exposure is None or not serviceability.needs_characteristic_limit(settings.exposure):
        return []
    n_pairs = len(NEd)
    given = actions.char_ratio is not None
    ratio = _b(actions.char_ratio, n_pairs) if given else np.ones(n_pairs)
    my, mz = _frame_moments(moments)
    s = serviceability.sigma_c_uncracked(tr, np.maximum(NEd, 0.0) * ratio, my * ratio, mz * ratio, g["fctm"])
    values["sigma_c_char"] = s.sigma_c_max
    limit = serviceability.sigma_c_limit_characteristic(g["fck"], params)
    basis = "characteristic actions" if given else "design actions (characteristic not given)"

    def note(i: int) -> str:
        if s.cracked[i]:
            return (f"section cracked under the {basis}: uncracked stress not valid, "
                    "not verified (cracked-section stress not computed)")
        return f"uncracked transformed section under the {basis}, {settings.exposure.name}"

    return [CheckColumn("compressive stress, characteristic combination", "EN 1992-1-1, 7.2(2)", "MPa",
                        np.maximum(s.sigma_c_max, 0.0), limit, ~s.cracked, note, blocking=False,
                        kind=CheckKind.DURABILITY)]


def _link_spacing(g: dict, actions: ColumnActions, n_pairs: int, params: NationalParameters):
    """Link spacing provided (general, and near beams/slabs and laps), mm (9.5.3(3), (4))."""
    b_min = np.minimum(g["b"], g["h"])
    smax = detailing.scl_tmax(g["dia_min"], b_min, False, params)
    szone = detailing.scl_tmax(g["dia_min"], b_min, True, params)
    s = _b(actions.s_link, n_pairs)
    sz = _b(actions.s_link_zone, n_pairs)
    s = 25.0 * np.floor(smax / 25.0 + 1e-9) if s is None else s
    sz = 25.0 * np.floor(szone / 25.0 + 1e-9) if sz is None else sz
    if np.any(s <= 0) or np.any(sz <= 0):
        msg = "link spacings s_link, s_link_zone must be positive (mm)"
        raise ValueError(msg)
    return s, sz


def _link_spacing_checks(g: dict, s: np.ndarray, sz: np.ndarray, params: NationalParameters) -> list[CheckColumn]:
    b_min = np.minimum(g["b"], g["h"])
    ones = np.ones(len(s), dtype=bool)
    return [
        CheckColumn("link spacing", "EN 1992-1-1, 9.5.3(3)", "mm", s,
                    detailing.scl_tmax(g["dia_min"], b_min, False, params), ones,
                    "s <= scl,tmax = min(20 phi_min, b_min, 400 mm)", kind=CheckKind.DETAILING),
        CheckColumn("link spacing near beams, slabs and laps", "EN 1992-1-1, 9.5.3(4)", "mm", sz,
                    detailing.scl_tmax(g["dia_min"], b_min, True, params), ones,
                    "s <= 0.6 scl,tmax over the larger column dimension next to a beam or slab and at laps",
                    kind=CheckKind.DETAILING),
    ]


def _shear_checks(g: dict, NEd: np.ndarray, moments: dict, l0y: np.ndarray, l0z: np.ndarray,
                  l_clear: np.ndarray | None, braced: np.ndarray, s_link: np.ndarray, actions: ColumnActions,
                  values: dict, params: NationalParameters) -> list[CheckColumn]:
    """Shear from the end moments in each direction against VRd,c, or the links and the strut.

    EN 1992-1-1, 6.2.2(1) Eq. (6.2), 6.2.3(3) Eqs. (6.8), (6.9). VEd = (|M_top| + |M_bot|)/l plus any
    shear given (the sum of the end moments whatever their signs: on the safe side). Where the clear
    height is not known, l = l0 for braced members (l0 <= l) and l0/2 for unbraced ones (l0 <= 2 l).
    The links (two legs of the link bar, at the general spacing) are checked where VEd > VRd,c.
    """
    n_pairs = len(NEd)
    V_given = np.zeros(n_pairs) if actions.V_Ed is None else np.abs(_b(actions.V_Ed, n_pairs))
    out = []
    fywd = g["fyd"]  # links of the same steel as the bars (common practice)
    Asw = 2.0 * np.pi * g["link"] ** 2 / 4.0
    for along, moment, bw, dv, asl, l0 in (("z", "My", g["b"], g["dv_y"], g["Asl_y"], l0y),
                                           ("y", "Mz", g["h"], g["dv_z"], g["Asl_z"], l0z)):
        length = l_clear if l_clear is not None else np.where(braced, l0, 0.5 * l0)
        VEd = shear.VEd_from_end_moments(moments[f"{moment}_top"], moments[f"{moment}_bot"], length, V_given)
        res = shear.shear_check_arrays(VEd, bw, dv, asl, NEd, g["Ac"], g["fck"], g["fcd"], Asw, s_link, fywd,
                                       params=params)
        for key in ("VEd", "VRd_c", "VRd_s", "VRd_max", "cot_theta"):
            values[f"{key}_{along}"] = getattr(res, key)
        values[f"shear_links_needed_{along}"] = res.needs_links

        def note(i: int, res=res, moment=moment) -> str:
            if not res.needs_links[i]:
                return (f"VEd = (|{moment},top| + |{moment},bot|)/l <= VRd,c = {res.VRd_c[i] / 1e3:.0f} kN: "
                        "no shear links needed beyond those of 9.5.3")
            return (f"VEd > VRd,c = {res.VRd_c[i] / 1e3:.0f} kN: links 2 legs @ {s_link[i]:g} mm carry it, "
                    f"VRd,s = {res.VRd_s[i] / 1e3:.0f} kN, strut VRd,max = {res.VRd_max[i] / 1e3:.0f} kN "
                    f"(cot theta = {res.cot_theta[i]:.2f})")

        out.append(CheckColumn(f"shear along {along}", "EN 1992-1-1, 6.2.2 Eq. (6.2), 6.2.3 Eqs. (6.8), (6.9)",
                               "kN", res.VEd / 1e3, res.capacity / 1e3, np.ones(n_pairs, dtype=bool), note))
    return out


def _ratio(demand: np.ndarray, capacity: np.ndarray) -> np.ndarray:
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(capacity > 0, demand / np.where(capacity > 0, capacity, 1.0),
                        np.where(demand > 0, np.inf, 0.0))


def _detailing_checks(g: dict, NEd: np.ndarray, settings: CheckSettings, params: NationalParameters,
                      As_below: np.ndarray | None = None):
    n_pairs = len(NEd)
    ones = np.ones(n_pairs, dtype=bool)
    as_min = detailing.As_min(np.maximum(NEd, 0.0), g["fyd"], g["Ac"], params)
    out = [
        CheckColumn("minimum bar diameter", "EN 1992-1-1, 9.5.2(1)", "mm",
                    np.full(n_pairs, params.phi_min_long), g["dia_min"], ones, "phi >= phi_min"),
        CheckColumn("minimum longitudinal reinforcement", "EN 1992-1-1, 9.5.2(2)", "mm2", as_min, g["As"], ones,
                    "As,min = max(0.10 NEd/fyd, 0.002 Ac)"),
        CheckColumn("maximum longitudinal reinforcement", "EN 1992-1-1, 9.5.2(3)", "mm2", g["As"],
                    detailing.As_max(g["Ac"], False, params), ones, "As <= 0.04 Ac outside laps"),
    ]
    if settings.lapped:
        below = g["As"] if As_below is None else As_below
        note = ("bars below and this storey's bars in the lap zone: As,below + As <= 0.08 Ac "
                + ("(bars below taken equal to this storey's; a schedule checks the real pair)"
                   if As_below is None else "(bars below as given)"))
        out.append(CheckColumn("maximum reinforcement at laps", "EN 1992-1-1, 9.5.2(3)", "mm2", below + g["As"],
                               detailing.As_max(g["Ac"], True, params), ones, note))
    n_min = np.where(g["circ"], 6.0, 4.0)
    spacing = detailing.min_clear_spacing(g["dia_max"], settings.aggregate, params)
    out += [
        CheckColumn("number of bars", "EN 1992-1-1, 9.5.2(4)", "bars", n_min, g["n_bars"].astype(float), ones,
                    "at least 4 bars (rectangular), 6 (circular)"),
        CheckColumn("clear spacing of bars", "EN 1992-1-1, 8.2(2)", "mm", spacing, np.maximum(g["min_gap"], 0.0),
                    ones, f"max(k1 phi, dg + k2, 20 mm), dg = {settings.aggregate:g} mm"),
        CheckColumn("link diameter", "EN 1992-1-1, 9.5.3(1)", "mm", detailing.link_dia_min(g["dia_max"]), g["link"],
                    ones, "max(6 mm, phi_max/4)"),
    ]
    return out


def _cover_checks(g: dict, settings: CheckSettings, params: NationalParameters):
    """Nominal cover (4.4.1) and the indicative strength class (Annex E) of the exposure."""
    exp = settings.exposure
    dur = cover.cmin_dur_for(exp, g["fck"], settings.working_life_100y, False, False, params)
    req_link = cover.cnom(cover.cmin(cover.cmin_b(g["link"], settings.aggregate), dur.cmin_dur, params), params)
    req_main = cover.cnom(cover.cmin(cover.cmin_b(g["dia_max"], settings.aggregate), dur.cmin_dur, params), params)
    ones = np.ones(len(g["b"]), dtype=bool)

    def note(i: int) -> str:
        return f"{exp.name}: S{int(dur.s_class[i])} for {dur.governing[i]}, cmin,dur = {float(dur.cmin_dur[i]):g} mm"

    strength = cover.check_indicative_strength(exp, float(np.max(g["fck"])))
    need = cover.indicative_fck(exp)
    return [
        CheckColumn("nominal cover to links", "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)", "mm", req_link,
                    g["cover"], ones, note, kind=CheckKind.COVER),
        CheckColumn("nominal cover to main bars", "EN 1992-1-1, 4.4.1, Eqs. (4.1), (4.2)", "mm", req_main,
                    g["cover"] + g["link"], ones, note, kind=CheckKind.COVER),
        CheckColumn(strength.name, strength.clause, "MPa", np.full(len(g["b"]), need), g["fck"], ones,
                    strength.note,
                    kind=CheckKind.DURABILITY),
    ]


def _fire_check(g: dict, NEd: np.ndarray, values: dict, settings: CheckSettings, params: NationalParameters):
    """EN 1992-1-2 Table 5.2a (method A), vectorised over pairs for one rating."""
    rating = settings.fire
    n_pairs = len(NEd)
    a = g["a_fire_min"]  # each bar's own axis distance: the smallest must meet the table (5.2(15))
    values["a_fire_min"] = a
    values["a_fire_mean"] = g["a_fire_mean"]
    width = np.minimum(g["b"], g["h"])
    l0_fi = values["l0_fi"]
    with np.errstate(divide="ignore", invalid="ignore"):
        Npos = np.where(NEd > 0, NEd, np.inf)
        # First-order eccentricities in fire, taken as the ULS first-order ones (imperfection excluded).
        e_z = np.maximum(np.abs(values["M02_y"]) - values["ei_y"] * np.maximum(NEd, 0) *
                         (values["imperfection_axis"] == "y"), 0.0) / Npos
        e_y = np.maximum(np.abs(values["M02_z"]) - values["ei_z"] * np.maximum(NEd, 0) *
                         (values["imperfection_axis"] == "z"), 0.0) / Npos
    kmax = params.e_max_fire_factor
    bad = np.stack([l0_fi > fire.L0_FI_MAX_TABLE_MM, e_z > kmax * g["h"], e_y > kmax * g["b"],
                    g["As"] >= fire.RHO_MAX_FIRE * g["Ac"]], axis=1)
    cond = ~bad.any(axis=1)
    col = next(m for m in (0.2, 0.5, 0.7) if settings.mu_fi <= m + 1e-12) if settings.mu_fi <= 0.7 else None
    options = fire.TABLE_5_2A[rating][col] if col is not None else []
    demand = np.full(n_pairs, np.inf)
    for bmin, amin, needs8 in options:
        usable = (width >= bmin) & ((g["n_bars"] >= 8) | (not needs8))
        demand = np.where(usable, np.minimum(demand, amin), demand)
    applicable = cond & bool(options)

    def reasons(i: int) -> str:
        if not options:
            return f"Table 5.2a gives no value for {rating.name} at mu_fi = {settings.mu_fi:g}"
        if cond[i]:
            if np.isfinite(demand[i]):
                return (f"axis distance of the nearest bar a = c + phi_link + phi/2 = {a[i]:g} mm "
                        f"(area-weighted mean am = {g['a_fire_mean'][i]:.1f} mm, Eq. (5.5)); "
                        f"mu_fi column {col}, width {width[i]:g} mm")
            return "section narrower than every bmin of Table 5.2a (or fewer than 8 bars)"
        why = [f"l0,fi = {l0_fi[i]:,.0f} mm > 3000 mm", f"e = {e_z[i]:.0f} mm > {kmax:g} h",
               f"e = {e_y[i]:.0f} mm > {kmax:g} b", "As >= 0.04 Ac"]
        return "method A does not apply: " + "; ".join(w for w, b in zip(why, bad[i], strict=True) if b)

    dem = np.where(np.isfinite(demand), demand, 1e6)
    return CheckColumn(f"fire resistance {rating.name}", "EN 1992-1-2, 5.3.2, Table 5.2a", "mm", dem, a,
                       applicable, reasons, blocking=settings.fire_outside_method == "fail")


def _exact_biaxial(sb: SectionBatch, idx: np.ndarray, NEd: np.ndarray, MEdy: np.ndarray,
                   MEdz: np.ndarray) -> np.ndarray:
    """Utilisation |MEd| / |MRd| with MRd on the resistance surface in the direction of MEd.

    EN 1992-1-1, 6.1: the compression direction theta is found by bisection
    so that the resisting moment (MRdy, MRdz) points along (MEdy, MEdz);
    the sections are doubly symmetric, so the first quadrant suffices.
    """
    target = np.arctan2(np.abs(MEdz), np.abs(MEdy))  # angle of the demand from the y axis
    lo = np.zeros(len(idx))
    hi = np.full(len(idx), np.pi / 2)
    my = mz = None
    for _ in range(40):
        mid = 0.5 * (lo + hi)
        # theta measured from +y: theta = pi/2 compresses +z (pure MRdy).
        ok, my, mz = sb.resistance_at_angle(NEd, np.pi / 2 - mid, idx)
        ang = np.arctan2(np.abs(mz), np.abs(my))
        go_up = ang < target
        lo = np.where(go_up, mid, lo)
        hi = np.where(go_up, hi, mid)
    mres = np.hypot(my, mz)
    demand = np.hypot(MEdy, MEdz)
    return np.where(ok & (mres > 0), demand / np.where(mres > 0, mres, 1.0), np.where(demand > 0, np.inf, 0.0))


def check_column(
    design: DesignSection,
    actions: ColumnActions,
    settings: CheckSettings = CheckSettings(),
    params: NationalParameters = EN_RECOMMENDED,
) -> ColumnCheck:
    """The full check of one column: a view of :func:`check_members` for one pair."""
    res = check_members(SectionBatch([design]), np.array([0]), actions, settings, params)
    return res.column(0)


def batch_of(designs: Sequence[DesignSection]) -> SectionData:
    """SectionData for a list of designs (convenience)."""
    return SectionData.of(SectionBatch(designs))
