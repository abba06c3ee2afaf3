"""Per-section geometry and material arrays of a batch, for the member check.

:class:`SectionData` collects, once per batch of candidate sections, what the
member check of :mod:`design.member` needs per section: areas, radii of
gyration, effective depths, materials, bar sizes and spacing, the extra ties
of 9.5.3(6), the axis distances of EN 1992-1-2 5.2, the tension faces of
6.2.2(1) and the uncracked transformed section of 7.2.

Units: N, mm, MPa.
"""

from __future__ import annotations

import functools
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from design import detailing, fire, serviceability
from design.materials import Ecm, fctm
from design.resistance import DesignSection, SectionBatch
from design.sections import CircSection, RectSection

__all__ = ["SectionData", "extra_ties", "batch_of"]


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
    tr: dict[str, np.ndarray]  # uncracked transformed section, alpha_e = Es/Ecm (7.2): A, Sy, Sz, Iyy, Izz, Iyz

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
            batch=batch,
            circ=circ,
            b=b,
            h=h,
            Ac=np.array([s.Ac for s in secs]),
            As=np.array([s.As for s in secs]),
            iy=iy,
            iz=iz,
            dy=np.array([s.effective_depth("y") for s in secs]),
            dz=np.array([s.effective_depth("z") for s in secs]),
            fck=np.array([d.concrete.fck for d in ds]),
            fcd=np.array([d.concrete.fcd for d in ds]),
            fyk=np.array([d.steel.fyk for d in ds]),
            fyd=np.array([d.steel.fyd for d in ds]),
            Es=np.array([d.steel.Es for d in ds]),
            cover=np.array([s.cover for s in secs]),
            link=np.array([s.link for s in secs]),
            dia_max=np.array([s.bars.max_dia for s in secs]),
            dia_min=np.array([s.bars.min_dia for s in secs]),
            n_bars=np.array([s.bars.count for s in secs]),
            min_gap=np.array([float(np.min(s.clear_spacings())) for s in secs]),
            extra_ties=np.array(ties),
            a_fire_min=np.array([a for a, _ in axis]),
            a_fire_mean=np.array([m for _, m in axis]),
            Asl_y=tension[:, 0],
            Asl_z=tension[:, 1],
            dv_y=tension[:, 2],
            dv_z=tension[:, 3],
            fctm=np.array([float(fctm(d.concrete.fck)) for d in ds]),
            tr={k: np.array([float(getattr(x, k)) for x in trs]) for k in ("A", "Sy", "Sz", "Iyy", "Izz", "Iyz")},
        )

    def transformed(self, idx: np.ndarray) -> serviceability.TransformedSection:
        """The uncracked transformed sections of pairs ``idx``."""
        return serviceability.TransformedSection(
            **{k: v[idx] for k, v in self.tr.items()}, b=self.b[idx], h=self.h[idx], circular=self.circ[idx]
        )


def _transformed(design: DesignSection) -> serviceability.TransformedSection:
    """Uncracked transformed section with the short-term modular ratio Es/Ecm.

    EN 1992-1-1, 7.2
    """
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
    return (
        float(area[on_y].sum()),
        float(area[on_z].sum()),
        section.h / 2.0 + float(np.abs(z[on_y]).max()),
        section.b / 2.0 + float(np.abs(y[on_z]).max()),
    )


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
    """Extra ties a section needs so that every bar is within 150 mm of a restrained bar.

    EN 1992-1-1, 9.5.3(6)
    """
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


def batch_of(designs: Sequence[DesignSection]) -> SectionData:
    """SectionData for a list of designs (convenience)."""
    return SectionData.of(SectionBatch(designs))
