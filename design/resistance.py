"""Section resistance by strain compatibility.

EN 1992-1-1, 6.1: plane sections remain plane; concrete carries no tension;
concrete follows the parabola-rectangle diagram of 3.1.7(1) (default) or the
rectangular stress block of 3.1.7(3); steel follows the design diagram of
3.2.7(2); the strain limits are those of 6.1(5) and Fig. 6.1. Concrete
displaced by bars in the compression zone is deducted.

Strain profiles
---------------
A strain profile is fixed by one parameter s in [0, 3] (Fig. 6.1):

* s in [0, 1], pivot A: the deepest bar at the steel strain limit (eps_ud for
  the inclined branch), the most compressed fibre going from -eps_lim to the
  concrete limit eps_cu. With the horizontal branch no steel strain limit
  applies (3.2.7(2)b); a nominal limit of 1.0 is used, which makes this range
  a thin sliver next to pure tension.
* s in [1, 2], pivot B: eps_cu at the most compressed fibre, neutral axis
  depth x going from x_A to the full depth H.
* s in [2, 3], pivot C: the fibre at (1 - eps_c2/eps_cu2) H held at eps_c2
  while the least compressed fibre goes from 0 to eps_c2 (uniform
  compression at s = 3, which gives the squash load NRd).

For the rectangular block, eps_cu3 and eps_c3 take the places of eps_cu2 and
eps_c2.

Solving N(s) = NEd
------------------
The axial force N(s) does not decrease with s. N(s) (and |M(s)|) is tabulated
once per section and compression direction on a fixed grid of 193 values of s
(16 in pivot A, 128 in pivot B, 49 in pivot C). For each (section, NEd) pair:

1. a binary search on the table brackets the root between two grid points;
2. inverse quadratic interpolation through three table points gives the first
   estimate (linear interpolation where it falls outside the bracket);
3. secant steps through the last two iterates refine it, each step kept inside
   the bracket, which shrinks with every evaluation (a step that would leave it
   is replaced by bisection, and after 50 iterations only bisection is used);
4. it stops when |N(s) - NEd| <= 1e-11 of the section's axial range (or the
   bracket is narrower than 1e-15).

Pairs outside [NRd,t, NRd] get no solution (MRd = 0). Pairs are handled in
chunks, shared between threads (numpy releases the GIL). The screening path
:meth:`SectionBatch.moment_resistance_fast` interpolates linearly on the
tabulated N-M curve instead (a chord of the convex domain).

Sign convention: compression positive; moments are M_y = integral of sigma z dA
and M_z = integral of sigma y dA about the centroid, so a section compressed
on its +z face has a positive M_y.

Two implementations are kept: :class:`SectionBatch` evaluates many sections x
many axial loads with numpy (no Python loop per section), and
:func:`moment_resistance_scalar` is a small, plain, independent path
(adaptive quadrature, Brent's root finder) used to test it.
"""

from __future__ import annotations

import math
import os
import warnings
from collections.abc import Callable, Sequence
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass
from typing import Literal

import numpy as np
from scipy import integrate, optimize

from design.materials import Concrete, ConcreteLaw, Reinforcement, TopBranch
from design.sections import CircSection, RectSection, Section

__all__ = [
    "Axis",
    "DesignSection",
    "SectionBatch",
    "axial_resistance",
    "tension_resistance",
    "moment_resistance",
    "moment_resistance_scalar",
    "interaction_curve",
    "resistance_at_angle",
    "HORIZONTAL_BRANCH_STRAIN_LIMIT",
]

Axis = Literal["y", "z"]

# Nominal steel strain limit for the tension pivot when the horizontal top
# branch is used (EN 1992-1-1 3.2.7(2)b sets no limit).
HORIZONTAL_BRANCH_STRAIN_LIMIT = 1.0

# Breakpoints of the s-grid used to bracket N(s) = NEd.
_S_GRID = np.concatenate([np.linspace(0.0, 1.0, 17)[:-1], np.linspace(1.0, 2.0, 129)[:-1], np.linspace(2.0, 3.0, 49)])

_DEFAULT_WORKERS = max(1, min(2, os.cpu_count() or 1))
_GAUSS_CACHE: dict[int, tuple[np.ndarray, np.ndarray]] = {}


def _gauss(n: int) -> tuple[np.ndarray, np.ndarray]:
    if n not in _GAUSS_CACHE:
        _GAUSS_CACHE[n] = np.polynomial.legendre.leggauss(n)
    return _GAUSS_CACHE[n]


def _parabola_nodes(n_is_2: bool, points: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Quadrature on [0, 1] for the parabolic piece, which starts where eps = eps_c2.

    With n = 2 the integrand is a polynomial and plain Gauss-Legendre with
    ``points`` nodes is exact (rectangles) or converges fast (circles). For
    n < 2 (fck > 50 MPa) the stress (1 - r^n) has a weak singularity at r = 0;
    the substitution position = tau^2 makes the integrand smooth enough for
    a 12-node rule to reach about 1e-12.

    Returns:
        (positions, weights, jacobian) on [0, 1].
    """
    x, w = _gauss(points if n_is_2 else 12)
    tau = 0.5 * (x + 1.0)
    wt = 0.5 * w
    if n_is_2:
        return tau, wt, np.ones_like(tau)
    return tau * tau, wt, 2.0 * tau


@dataclass(frozen=True)
class DesignSection:
    """A section with its materials and the concrete law used for design."""

    section: Section
    concrete: Concrete
    steel: Reinforcement
    law: ConcreteLaw = ConcreteLaw.PARABOLA_RECTANGLE

    def __post_init__(self) -> None:
        object.__setattr__(self, "law", ConcreteLaw(self.law))


@dataclass
class _Projected:
    """Section data seen from one compression direction (struct of arrays).

    ``v`` is the depth of each bar below the most compressed fibre, ``t`` its
    lever arm from the centroid towards the compressed side, ``u`` its
    coordinate across; padding bars have zero area.
    """

    circ: np.ndarray  # (S,) bool
    H: np.ndarray  # (S,) depth of the section along the direction, mm
    width: np.ndarray  # (S,) constant width of a rectangle (principal directions), mm
    R: np.ndarray  # (S,) radius of a circle, mm
    b: np.ndarray  # (S,) rectangle b, mm (angled directions)
    h: np.ndarray  # (S,) rectangle h, mm
    cos: np.ndarray  # (S,) direction cosine (y component of the compression direction)
    sin: np.ndarray  # (S,) direction sine (z component)
    v: np.ndarray  # (S, m)
    t: np.ndarray  # (S, m)
    Au: np.ndarray  # (S, m) area times across-coordinate, mm3
    A: np.ndarray  # (S, m)
    D: np.ndarray  # (S, m) bar diameter of each layer, mm
    dmax: np.ndarray  # (S,)
    mat: dict[str, np.ndarray]  # material arrays, each (S,)
    angled: bool  # True when some rectangle is seen at a non-principal angle
    n2: bool = True  # True when every row has the parabola exponent n = 2 (polynomial stress)

    def take(self, idx: np.ndarray) -> _Projected:
        """The rows ``idx`` (one per pair)."""
        return _Projected(
            circ=self.circ[idx],
            H=self.H[idx],
            width=self.width[idx],
            R=self.R[idx],
            b=self.b[idx],
            h=self.h[idx],
            cos=self.cos[idx],
            sin=self.sin[idx],
            v=self.v[idx],
            t=self.t[idx],
            Au=self.Au[idx],
            A=self.A[idx],
            D=self.D[idx],
            dmax=self.dmax[idx],
            mat={k: a[idx] for k, a in self.mat.items()},
            angled=self.angled,
            n2=self.n2 or bool(np.all(self.mat["n"][idx] == 2.0)),
        )


class SectionBatch:
    """Many design sections evaluated together with numpy.

    All sections of a batch share one concrete law. Bars are stored as padded
    (S, m) arrays; rectangles and circles may be mixed.

    Args:
        designs: the design sections.
    """

    def __init__(self, designs: Sequence[DesignSection]) -> None:
        if not designs:
            msg = "a section batch needs at least one design section"
            raise ValueError(msg)
        laws = {d.law for d in designs}
        if len(laws) != 1:
            msg = "all sections of a batch must use the same concrete law"
            raise ValueError(msg)
        self.designs = tuple(designs)
        self.law: ConcreteLaw = laws.pop()
        S = len(designs)
        coords = [d.section.bar_coords() for d in designs]
        m = max(len(c[0]) for c in coords)
        self.bar_y = np.zeros((S, m))
        self.bar_z = np.zeros((S, m))
        self.bar_A = np.zeros((S, m))
        self.bar_D = np.zeros((S, m))
        for i, (y, z, dia) in enumerate(coords):
            k = len(y)
            self.bar_y[i, :k] = y
            self.bar_z[i, :k] = z
            self.bar_A[i, :k] = np.pi * dia**2 / 4
            self.bar_D[i, :k] = dia
        self.circ = np.array([isinstance(d.section, CircSection) for d in designs])
        self.b = np.array([d.section.b for d in designs], dtype=float)
        self.h = np.array([d.section.h for d in designs], dtype=float)
        self.Ac = np.array([d.section.Ac for d in designs], dtype=float)
        self.As = self.bar_A.sum(axis=1)
        c = [d.concrete for d in designs]
        st = [d.steel for d in designs]
        mat = {
            "fcd": np.array([x.fcd for x in c]),
            "fyd": np.array([x.fyd for x in st]),
            "Es": np.array([x.Es for x in st]),
            "slope": np.array([x.hardening_slope for x in st]),
            "elim": np.array(
                [HORIZONTAL_BRANCH_STRAIN_LIMIT if x.branch is TopBranch.HORIZONTAL else x.eps_ud for x in st]
            ),
        }
        if self.law is ConcreteLaw.PARABOLA_RECTANGLE:
            mat["ecu"] = np.array([x.eps_cu2 for x in c])
            mat["epiv"] = np.array([x.eps_c2 for x in c])
            mat["n"] = np.array([x.n for x in c])
            mat["inv_epiv"] = 1.0 / mat["epiv"]
            self._n_is_2 = bool(np.all(mat["n"] == 2.0))
        else:
            mat["ecu"] = np.array([x.eps_cu3 for x in c])
            mat["epiv"] = np.array([x.eps_c3 for x in c])
            mat["fblock"] = np.array([x.eta * x.fcd for x in c])
            mat["ethr"] = np.array([(1.0 - x.lam) * x.eps_cu3 for x in c])
            mat["n"] = np.full(S, 2.0)  # unused by the block; keeps the polynomial path
            self._n_is_2 = True
        self._horizontal = bool(np.all(mat["slope"] == 0.0))
        self.mat = mat
        self._tables: dict[tuple[Axis, bool], tuple[_Projected, np.ndarray]] = {}  # (P, N on the s-grid)
        self._moment_tables: dict[tuple[Axis, bool], tuple[np.ndarray, np.ndarray]] = {}  # (N, |M|) on the s-grid

    def __len__(self) -> int:
        return len(self.designs)

    # ------------------------------------------------------------------ geometry
    def _project(self, cos: np.ndarray, sin: np.ndarray, principal: bool) -> _Projected:
        """Project the sections on the compression direction (cos, sin)."""
        S = len(self)
        t = self.bar_y * cos[:, None] + self.bar_z * sin[:, None]
        u = -self.bar_y * sin[:, None] + self.bar_z * cos[:, None]
        R = np.where(self.circ, self.b / 2, 0.0)
        H_rect = self.b * np.abs(cos) + self.h * np.abs(sin)
        H = np.where(self.circ, self.b, H_rect)
        width = np.where(np.abs(sin) > 0.5, self.b, self.h) if principal else np.zeros(S)
        v = H[:, None] / 2 - t
        dmax = np.max(np.where(self.bar_A > 0, v, -np.inf), axis=1)
        v, t, A, Au, D = _layers(v, t, self.bar_A, self.bar_A * u, self.bar_D)
        return _Projected(
            circ=self.circ,
            H=H,
            width=width,
            R=R,
            b=self.b,
            h=self.h,
            cos=cos,
            sin=sin,
            v=v,
            t=t,
            Au=Au,
            A=A,
            D=D,
            dmax=dmax,
            mat=self.mat,
            angled=not principal and bool(np.any(~self.circ)),
            n2=self._n_is_2,
        )

    def _direction(self, axis: Axis, positive: bool = True) -> tuple[np.ndarray, np.ndarray]:
        S = len(self)
        sign = 1.0 if positive else -1.0
        if axis == "y":  # bending about y: compression on the +z face
            return np.zeros(S), np.full(S, sign)
        if axis == "z":  # bending about z: compression on the +y face
            return np.full(S, sign), np.zeros(S)
        msg = f"axis must be 'y' or 'z', got {axis!r}"
        raise ValueError(msg)

    def _table(self, axis: Axis, positive: bool = True) -> tuple[_Projected, np.ndarray]:
        key = (axis, positive)
        if key not in self._tables:
            cos, sin = self._direction(axis, positive)
            P = self._project(cos, sin, principal=True)
            N, M = self._grid_resultants(P)
            self._tables[key] = (P, N)
            self._moment_tables[key] = (N, M)
        return self._tables[key]

    def _n_of_s_grid(self, P: _Projected) -> np.ndarray:
        return self._grid_resultants(P)[0]

    def _grid_resultants(self, P: _Projected, step: int = 16_384) -> tuple[np.ndarray, np.ndarray]:
        """N (N) and |M| (N mm) at every point of the s-grid for every row of P, in cache-sized chunks."""
        S = len(P.H)
        K = len(_S_GRID)
        rows = np.repeat(np.arange(S), K)
        s_all = np.tile(_S_GRID, S)
        N = np.empty(S * K)
        M = np.empty(S * K)
        for start in range(0, S * K, step):
            sl = slice(start, start + step)
            Q = P.take(rows[sl])
            eps_top, kappa = _profile(s_all[sl], Q)
            N[sl], st, _ = self._forces(Q, eps_top, kappa, moments=True)
            M[sl] = np.abs(st)
        return N.reshape(S, K), M.reshape(S, K)

    # ------------------------------------------------------------------ physics
    def _concrete_stress(self, eps: np.ndarray, mat: dict[str, np.ndarray], n_is_2: bool) -> np.ndarray:
        """Concrete design stress (MPa) at strain ``eps``; broadcasts (pairs, ...)."""
        extra = (slice(None),) + (None,) * (eps.ndim - 1)
        if self.law is ConcreteLaw.RECTANGULAR_BLOCK:
            return np.where(eps >= mat["ethr"][extra], mat["fblock"][extra], 0.0)
        # fcd (1 - r^n) with r = 1 - eps/eps_c2 clipped to [0, 1]; in place to spare temporaries.
        r = eps * mat["inv_epiv"][extra]
        np.subtract(1.0, r, out=r)
        np.maximum(r, 0.0, out=r)
        np.minimum(r, 1.0, out=r)
        if n_is_2:
            r *= r
        else:
            np.power(r, mat["n"][extra], out=r)
        np.subtract(1.0, r, out=r)
        r *= mat["fcd"][extra]
        return r  # type: ignore[no-any-return]  # numpy stubs: arithmetic on an unparametrised ndarray is Any

    def _forces(
        self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray, moments: bool = True
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Axial force N (N) and moments S_t, S_u (N mm) for one strain profile per row."""
        Nc, St, Su = self._concrete(Q, eps_top, kappa, moments)
        eps = kappa[:, None] * Q.v
        np.subtract(eps_top[:, None], eps, out=eps)
        mat = Q.mat
        if self._horizontal:
            fy = mat["fyd"][:, None]
            sig = eps * mat["Es"][:, None]
            np.minimum(sig, fy, out=sig)
            np.maximum(sig, -fy, out=sig)
        else:
            a = np.abs(eps)
            eyd = (mat["fyd"] / mat["Es"])[:, None]
            sig = np.copysign(
                np.where(a <= eyd, mat["Es"][:, None] * a, mat["fyd"][:, None] + mat["slope"][:, None] * (a - eyd)), eps
            )
        if self.law is ConcreteLaw.RECTANGULAR_BLOCK:
            # Displaced concrete: the share of each bar's diameter inside the block, so that
            # N grows smoothly as the block edge sweeps across a bar.
            kd = kappa[:, None] * Q.D
            with np.errstate(divide="ignore", invalid="ignore"):
                frac = np.where(
                    kd > 0,
                    (eps + 0.5 * kd - mat["ethr"][:, None]) / np.where(kd > 0, kd, 1.0),
                    (eps >= mat["ethr"][:, None]).astype(float),
                )
            sig -= mat["fblock"][:, None] * np.clip(frac, 0.0, 1.0)
        else:
            sig -= self._concrete_stress(eps, mat, Q.n2)  # displaced concrete
        F = Q.A * sig
        N = Nc + F.sum(axis=1)
        if not moments:
            return N, St, Su
        St = St + (F * Q.t).sum(axis=1)
        Su = Su + (sig * Q.Au).sum(axis=1)
        return N, St, Su

    def _concrete(
        self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray, moments: bool
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        n_pairs = len(eps_top)
        N = np.zeros(n_pairs)
        St = np.zeros(n_pairs)
        Su = np.zeros(n_pairs)
        circ = Q.circ
        if Q.angled:
            rect = ~circ
            if rect.any():
                sub = np.nonzero(rect)[0]
                n_, st_, su_ = self._concrete_rect_angled(Q.take(sub), eps_top[sub], kappa[sub])
                N[sub], St[sub], Su[sub] = n_, st_, su_
            if circ.any():
                sub = np.nonzero(circ)[0]
                N[sub], St[sub] = self._concrete_circ(Q.take(sub), eps_top[sub], kappa[sub])
            return N, St, Su
        if circ.any():
            if circ.all():
                return (*self._concrete_circ(Q, eps_top, kappa), Su)
            sub = np.nonzero(circ)[0]
            N[sub], St[sub] = self._concrete_circ(Q.take(sub), eps_top[sub], kappa[sub])
            sub = np.nonzero(~circ)[0]
            N[sub], St[sub] = self._concrete_rect(Q.take(sub), eps_top[sub], kappa[sub])
            return N, St, Su
        N, St = self._concrete_rect(Q, eps_top, kappa)
        return N, St, Su

    def _breaks(self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Depths of the stress-law breakpoints: (v_const_end, v_zero)."""
        mat = Q.mat
        if self.law is ConcreteLaw.RECTANGULAR_BLOCK:
            v1 = _depth_of(mat["ethr"], eps_top, kappa, Q.H)
            return v1, v1
        return _depth_of(mat["epiv"], eps_top, kappa, Q.H), _depth_of(0.0, eps_top, kappa, Q.H)

    def _sigma_fixed(self, Q: _Projected) -> np.ndarray:
        mat = Q.mat
        return mat["fblock"] if self.law is ConcreteLaw.RECTANGULAR_BLOCK else mat["fcd"]

    def _concrete_rect(self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Rectangle seen along a principal direction: constant width."""
        w, H = Q.width, Q.H
        v1, v0 = self._breaks(Q, eps_top, kappa)
        f = self._sigma_fixed(Q)
        N = f * w * v1
        St = f * w * (0.5 * H * v1 - 0.5 * v1 * v1)
        if self.law is ConcreteLaw.PARABOLA_RECTANGLE:
            tau, wt, jac = _parabola_nodes(Q.n2, 2)
            L = v0 - v1
            vg = v1[:, None] + L[:, None] * tau
            sig = self._concrete_stress(eps_top[:, None] - kappa[:, None] * vg, Q.mat, Q.n2)
            wts = wt * jac
            N = N + w * L * (sig @ wts)
            St = St + w * L * ((sig * (0.5 * H[:, None] - vg)) @ wts)
        return N, St

    def _concrete_circ(self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Circle: constant-stress segment in closed form, the rest by Gauss in the angle."""
        R = Q.R
        v1, v0 = self._breaks(Q, eps_top, kappa)
        a1 = np.arccos(np.clip(1.0 - v1 / R, -1.0, 1.0))
        f = self._sigma_fixed(Q)
        s1 = np.sin(a1)
        N = f * R * R * (a1 - s1 * np.cos(a1))
        St = f * (2.0 / 3.0) * R**3 * s1**3
        if self.law is ConcreteLaw.PARABOLA_RECTANGLE:
            a0 = np.arccos(np.clip(1.0 - v0 / R, -1.0, 1.0))
            tau, wt, jac = _parabola_nodes(Q.n2, 10)
            L = a0 - a1
            ag = a1[:, None] + L[:, None] * tau
            ca, sa = np.cos(ag), np.sin(ag)
            vg = R[:, None] * (1.0 - ca)
            sig = self._concrete_stress(eps_top[:, None] - kappa[:, None] * vg, Q.mat, Q.n2)
            dA = 2.0 * (R * R)[:, None] * sa * sa
            wts = wt * jac
            N = N + L * ((sig * dA) @ wts)
            St = St + L * ((sig * dA * R[:, None] * ca) @ wts)
        return N, St

    def _concrete_rect_angled(
        self, Q: _Projected, eps_top: np.ndarray, kappa: np.ndarray
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Rectangle seen at any angle: piecewise-linear width, Gauss per piece."""
        H = Q.H
        v1, v0 = self._breaks(Q, eps_top, kappa)
        c, s = np.abs(Q.cos), np.abs(Q.sin)
        bc, hs = Q.b * c, Q.h * s
        breaks = np.stack([np.zeros_like(H), np.minimum(bc, hs), np.maximum(bc, hs), H, v1, v0], axis=1)
        breaks.sort(axis=1)
        x, wg = _gauss(3 if Q.n2 else 12)
        lo, hi = breaks[:, :-1], breaks[:, 1:]
        half = 0.5 * (hi - lo)
        vg = (0.5 * (hi + lo))[:, :, None] + half[:, :, None] * x  # (P, pieces, G)
        P = len(H)
        vflat = vg.reshape(P, -1)
        umin, umax = _rect_slice(Q, vflat)
        wdt = umax - umin
        q = 0.5 * (umax * umax - umin * umin)
        eps = eps_top[:, None] - kappa[:, None] * vflat
        sig = self._concrete_stress(eps, Q.mat, Q.n2)
        weight = (half[:, :, None] * wg).reshape(P, -1)
        N = (sig * wdt * weight).sum(axis=1)
        St = (sig * wdt * (0.5 * H[:, None] - vflat) * weight).sum(axis=1)
        Su = (sig * q * weight).sum(axis=1)
        return N, St, Su

    # ------------------------------------------------------------------ solving
    def _solve(  # noqa: PLR0915 - one bracketed root search over all pairs; its branches are the pivots of Fig. 6.1
        self, P_all: _Projected, N_tab: np.ndarray, idx: np.ndarray, NEd: np.ndarray, moments: bool = True
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Find s with N(s) = NEd per pair; return (ok, S_t, S_u) at that s."""
        n = len(idx)
        K = N_tab.shape[1]
        inside = (NEd >= N_tab[idx, 0]) & (NEd <= N_tab[idx, -1])
        St = np.zeros(n)
        Su = np.zeros(n)
        rows = np.nonzero(inside)[0]
        if rows.size == 0:
            return inside, St, Su
        target = NEd[rows]
        flat = N_tab.ravel()
        base = idx[rows] * K
        # Binary search on the (non-decreasing) table for N(s_k) < NEd <= N(s_k+1).
        lo = np.zeros(len(rows), dtype=np.int64)
        hi = np.full(len(rows), K - 1, dtype=np.int64)
        while True:
            open_ = hi - lo > 1
            if not open_.any():
                break
            mid = (lo + hi) // 2
            below = flat[base + mid] < target
            lo = np.where(open_ & below, mid, lo)
            hi = np.where(open_ & ~below, mid, hi)
        a, b = _S_GRID[lo], _S_GRID[hi]
        fa = flat[base + lo] - target
        fb = flat[base + hi] - target
        # First guess: inverse quadratic interpolation through three table points.
        third = np.where(lo > 0, lo - 1, np.minimum(hi + 1, K - 1))
        s3, f3 = _S_GRID[third], flat[base + third] - target
        guess = _inverse_quadratic(a, fa, b, fb, s3, f3)
        Nt_range = N_tab[idx[rows], -1] - N_tab[idx[rows], 0]
        Q = P_all.take(idx[rows])
        tol = 1e-11 * Nt_range
        s = np.where(fa >= 0, a, np.where(fb <= 0, b, guess))
        active = (fa < 0) & (fb > 0)
        # Previous iterate for the secant steps: the bracket end nearer the root.
        near_a = np.abs(fa) < np.abs(fb)
        xp, fp = np.where(near_a, a, b), np.where(near_a, fa, fb)
        xc, fcur = s.copy(), np.zeros(len(rows))
        st = np.zeros(len(rows))
        su = np.zeros(len(rows))
        fixed = np.nonzero(~active)[0]
        if fixed.size and moments:
            Qf = Q.take(fixed)
            eps_top, kappa = _profile(s[fixed], Qf)
            _, st[fixed], su[fixed] = self._forces(Qf, eps_top, kappa, moments=True)
        for it in range(100):
            act = np.nonzero(active)[0]
            if act.size == 0:
                break
            Qa = Q.take(act) if act.size < len(rows) else Q
            aa, bb = a[act], b[act]
            if it == 0:
                c = guess[act]
            elif it < 50:
                # Secant through the last two iterates, kept inside the bracket
                # (bisection otherwise): superlinear and safe.
                x1, f1, x0, f0 = xc[act], fcur[act], xp[act], fp[act]
                with np.errstate(divide="ignore", invalid="ignore"):
                    c = x1 - f1 * (x1 - x0) / (f1 - f0)
            else:
                c = 0.5 * (aa + bb)
            c = np.where((c > aa) & (c < bb), c, 0.5 * (aa + bb))
            eps_top, kappa = _profile(c, Qa)
            fc, st_c, su_c = self._forces(Qa, eps_top, kappa, moments=moments)
            fc = fc - target[act]
            s[act], st[act], su[act] = c, st_c, su_c
            if it > 0:
                xp[act], fp[act] = xc[act], fcur[act]
            xc[act], fcur[act] = c, fc
            move_a = fc < 0
            a[act] = np.where(move_a, c, aa)
            b[act] = np.where(move_a, bb, c)
            done = (np.abs(fc) <= tol[act]) | (b[act] - a[act] <= 1e-15)
            active[act[done]] = False
        St[rows], Su[rows] = st, su
        return inside, St, Su

    def moment_resistance(
        self,
        NEd: np.ndarray,
        axis: Axis,
        idx: np.ndarray | None = None,
        positive: bool = True,
        chunk: int = 8192,
        workers: int = _DEFAULT_WORKERS,
    ) -> np.ndarray:
        """Moment resistance MRd (N mm) about ``axis`` at axial load NEd (N) per pair.

        EN 1992-1-1, 6.1 (strain compatibility with the limits of Fig. 6.1).

        Args:
            NEd: axial load per pair, N (compression positive).
            axis: "y" for MRdy (lever arm along h) or "z" for MRdz.
            idx: section index per pair; None when NEd has one value per section.
            positive: compression on the + face (True) or the - face (False).
            chunk: pairs handled at once (bounds memory).
            workers: threads sharing the chunks (default: up to 2 cores).

        Returns:
            MRd >= 0 per pair (0 where NEd lies outside [NRd,t, NRd]).
        """
        NEd = np.asarray(NEd, dtype=float).ravel()
        idx = np.arange(len(self)) if idx is None else np.asarray(idx, dtype=int).ravel()
        if len(idx) != len(NEd):
            msg = f"idx and NEd differ in length ({len(idx)} and {len(NEd)})"
            raise ValueError(msg)
        P, N_tab = self._table(axis, positive)
        out = np.zeros(len(NEd))
        # Pairs whose concrete has n = 2 first: chunks stay on the polynomial path.
        order = np.argsort(self.mat["n"][idx] != 2.0, kind="stable")

        def work(start: int) -> None:
            sel = order[start : start + chunk]
            _, St, _ = self._solve(P, N_tab, idx[sel], NEd[sel])
            out[sel] = np.abs(St)

        starts = range(0, len(NEd), chunk)
        if workers > 1 and len(NEd) > chunk:
            # numpy releases the GIL inside its loops, so threads share the cores.
            with ThreadPoolExecutor(max_workers=workers) as pool:
                list(pool.map(work, starts))
        else:
            for start in starts:
                work(start)
        return out

    def _moment_table(self, axis: Axis) -> tuple[np.ndarray, np.ndarray]:
        """N (N) and M (N mm) at the s-grid for every section, computed once per axis."""
        self._table(axis)
        return self._moment_tables[(axis, True)]

    def moment_resistance_fast(self, NEd: np.ndarray, axis: Axis, idx: np.ndarray | None = None) -> np.ndarray:
        """MRd (N mm) by linear interpolation on the tabulated N-M curve (193 points per section).

        The resistance domain of a reinforced-concrete section is convex, so
        the chord between two tabulated points lies inside it: the value is
        close to a lower bound of :meth:`moment_resistance` (measured on 200,000
        random pairs: between -0.7 % and +0.013 % for NEd below 0.95 NRd; near NRd,
        where M is small and the curve steep, the relative error grows, so
        callers use the exact solver there). Used for the building-wide
        feasibility matrix; near-critical pairs and the chosen designs are
        re-checked with the exact solver.
        """
        NEd = np.asarray(NEd, dtype=float).ravel()
        idx = np.arange(len(self)) if idx is None else np.asarray(idx, dtype=int).ravel()
        N_tab, M_tab = self._moment_table(axis)
        K = N_tab.shape[1]
        fN, fM = N_tab.ravel(), M_tab.ravel()
        base = idx * K
        inside = (NEd >= N_tab[idx, 0]) & (NEd <= N_tab[idx, -1])
        lo = np.zeros(len(NEd), dtype=np.int64)
        hi = np.full(len(NEd), K - 1, dtype=np.int64)
        for _ in range(int(np.ceil(np.log2(K))) + 1):
            mid = (lo + hi) // 2
            below = fN[base + mid] < NEd
            lo = np.where(below, mid, lo)
            hi = np.where(below, hi, mid)
        hi = np.maximum(hi, lo + 1).clip(max=K - 1)
        n0, n1 = fN[base + lo], fN[base + hi]
        m0, m1 = fM[base + lo], fM[base + hi]
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(n1 > n0, (NEd - n0) / np.where(n1 > n0, n1 - n0, 1.0), 0.0)
        out = m0 + np.clip(t, 0.0, 1.0) * (m1 - m0)
        return np.where(inside, np.maximum(out, 0.0), 0.0)

    def NRd(self) -> np.ndarray:
        """Axial resistance in pure compression per section, N (s = 3: uniform eps_c2).

        EN 1992-1-1, 6.1(5) and Fig. 6.1 (pivot C).
        """
        return self._table("y")[1][:, -1]

    def NRd_tension(self) -> np.ndarray:
        """Axial resistance in pure tension per section, N (negative), steel only."""
        return self._table("y")[1][:, 0]

    def interaction_curve(
        self, axis: Axis, n_points: int = 121, positive: bool = True
    ) -> tuple[np.ndarray, np.ndarray]:
        """N-M interaction curve points about ``axis`` for every section.

        Returns:
            (N, M): arrays (S, n_points) in N and N mm; M is the resultant about
            the axis (positive for compression on the chosen face).
        """
        P, _ = self._table(axis, positive)
        S = len(self)
        s = np.concatenate(
            [
                np.linspace(0, 1, n_points // 6 + 1)[:-1],
                np.linspace(1, 2, n_points // 2 + 1)[:-1],
                np.linspace(2, 3, n_points - n_points // 6 - n_points // 2),
            ]
        )
        K = len(s)
        rows = np.repeat(np.arange(S), K)
        Q = P.take(rows)
        eps_top, kappa = _profile(np.tile(s, S), Q)
        N, St, _ = self._forces(Q, eps_top, kappa)
        return N.reshape(S, K), np.abs(St).reshape(S, K)

    def resistance_at_angle(
        self, NEd: np.ndarray, theta: np.ndarray, idx: np.ndarray | None = None
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Resisting moments for a compression direction at angle ``theta`` (rad).

        The strain gradient points along (cos theta, sin theta) in the (y, z)
        plane (theta = pi/2: compression on the +z face, the MRdy case). The
        neutral axis is perpendicular to that direction; the resultant moment
        generally is not parallel to it.

        EN 1992-1-1, 6.1 (biaxial bending by strain compatibility).

        Returns:
            (ok, MRdy, MRdz): ok is False where NEd lies outside the axial range;
            moments in N mm with the signs of the convention in the module docstring.
        """
        NEd = np.asarray(NEd, dtype=float).ravel()
        theta = np.broadcast_to(np.asarray(theta, dtype=float).ravel(), NEd.shape)
        idx = np.arange(len(self)) if idx is None else np.asarray(idx, dtype=int).ravel()
        ok = np.zeros(len(NEd), dtype=bool)
        My = np.zeros(len(NEd))
        Mz = np.zeros(len(NEd))
        # Each pair has its own direction: project per pair on a batch view.
        view = _PairView(self, idx, theta)
        P = view.projected
        N_tab = self._n_of_s_grid(P)
        ok, St, Su = self._solve(P, N_tab, np.arange(len(idx)), NEd)
        c, s = np.cos(theta), np.sin(theta)
        My = St * s + Su * c
        Mz = St * c - Su * s
        return ok, My, Mz


class _PairView(SectionBatch):
    """A batch whose rows are (section, direction) pairs, for angled solves."""

    def __init__(self, parent: SectionBatch, idx: np.ndarray, theta: np.ndarray) -> None:
        self.designs = tuple(parent.designs[i] for i in idx)
        self.law = parent.law
        self._n_is_2 = parent._n_is_2
        self._horizontal = parent._horizontal
        self.bar_y, self.bar_z, self.bar_A = parent.bar_y[idx], parent.bar_z[idx], parent.bar_A[idx]
        self.bar_D = parent.bar_D[idx]
        self.circ, self.b, self.h = parent.circ[idx], parent.b[idx], parent.h[idx]
        self.Ac, self.As = parent.Ac[idx], parent.As[idx]
        self.mat = {k: a[idx] for k, a in parent.mat.items()}
        self._tables = {}
        self._moment_tables = {}
        cos, sin = np.cos(theta), np.sin(theta)
        principal = bool(np.all((np.abs(cos) < 1e-15) | (np.abs(sin) < 1e-15)))
        self.projected = self._project(cos, sin, principal=principal)


def _rect_slice(Q: _Projected, v: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Extent (u_min, u_max) of the slice of a rectangle at depth v (pairs, points)."""
    c, s = Q.cos[:, None], Q.sin[:, None]
    hb, hh = Q.b[:, None] / 2, Q.h[:, None] / 2
    t = Q.H[:, None] / 2 - v
    corners = ((hb, hh), (-hb, hh), (-hb, -hh), (hb, -hh))
    tu = [(y * c + z * s, -y * s + z * c) for y, z in corners]
    umin = np.full(v.shape, np.inf)
    umax = np.full(v.shape, -np.inf)
    for k in range(4):
        (ta, ua), (tb, ub) = tu[k], tu[(k + 1) % 4]
        dt = tb - ta
        safe = np.where(np.abs(dt) > 1e-12, dt, 1.0)
        lam = (t - ta) / safe
        hit = (np.abs(dt) > 1e-12) & (lam >= -1e-12) & (lam <= 1 + 1e-12)
        u = ua + np.clip(lam, 0.0, 1.0) * (ub - ua)
        umin = np.where(hit, np.minimum(umin, u), umin)
        umax = np.where(hit, np.maximum(umax, u), umax)
    empty = ~np.isfinite(umin)
    return np.where(empty, 0.0, umin), np.where(empty, 0.0, umax)


def _layers(
    v: np.ndarray, t: np.ndarray, A: np.ndarray, Au: np.ndarray, D: np.ndarray
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Merge bars of one diameter at the same depth into layers (they share one strain).

    Returns padded (S, L) arrays of depth, lever arm, area, area times the
    across-coordinate and diameter; exact, since every bar of a layer has the
    same strain.
    """
    S = v.shape[0]
    key = np.round(v, 6) * 1e3 + np.round(D, 3)
    groups = []
    for i in range(S):
        real = A[i] > 0
        uniq, inv = np.unique(key[i, real], return_inverse=True)
        groups.append((uniq, inv, real))
    L = max(len(g[0]) for g in groups)
    vl, tl, Al, Aul, Dl = (np.zeros((S, L)) for _ in range(5))
    for i, (uniq, inv, real) in enumerate(groups):
        k = len(uniq)
        cnt = np.bincount(inv, minlength=k)
        Al[i, :k] = np.bincount(inv, weights=A[i, real], minlength=k)
        Aul[i, :k] = np.bincount(inv, weights=Au[i, real], minlength=k)
        vl[i, :k] = np.bincount(inv, weights=v[i, real], minlength=k) / cnt
        tl[i, :k] = np.bincount(inv, weights=t[i, real], minlength=k) / cnt
        Dl[i, :k] = np.bincount(inv, weights=D[i, real], minlength=k) / cnt
    return vl, tl, Al, Aul, Dl


def _inverse_quadratic(
    a: np.ndarray, fa: np.ndarray, b: np.ndarray, fb: np.ndarray, c: np.ndarray, fc: np.ndarray
) -> np.ndarray:
    """Root estimate by inverse quadratic interpolation; linear when it falls outside (a, b)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        q = (
            a * fb * fc / ((fa - fb) * (fa - fc))
            + b * fa * fc / ((fb - fa) * (fb - fc))
            + c * fa * fb / ((fc - fa) * (fc - fb))
        )
        lin = a - fa * (b - a) / (fb - fa)
    lin = np.where(np.isfinite(lin), lin, 0.5 * (a + b))
    return np.where(np.isfinite(q) & (q > a) & (q < b), q, lin)  # type: ignore[no-any-return]  # numpy stubs: np.where of NDArray[Any] values is Any


def _depth_of(e: float | np.ndarray, eps_top: np.ndarray, kappa: np.ndarray, H: np.ndarray) -> np.ndarray:
    """Depth (mm) at which the strain equals ``e``, clipped to [0, H]."""
    with np.errstate(divide="ignore", invalid="ignore"):
        v = np.where(kappa > 0, (eps_top - e) / np.where(kappa > 0, kappa, 1.0), np.where(eps_top >= e, H, 0.0))
    return np.clip(v, 0.0, H)


def _profile(s: np.ndarray, Q: _Projected) -> tuple[np.ndarray, np.ndarray]:
    """Strain at the most compressed fibre and curvature (1/mm) for parameter s.

    EN 1992-1-1, 6.1(5) and Fig. 6.1 (pivots A, B and C).
    """
    s = np.asarray(s, dtype=float)
    mat = Q.mat
    ecu, epiv, elim = mat["ecu"], mat["epiv"], mat["elim"]
    H, dmax = Q.H, Q.dmax
    # Pivot A: deepest bar at -elim.
    top_a = -elim + np.clip(s, 0.0, 1.0) * (ecu + elim)
    kap_a = (top_a + elim) / dmax
    # Pivot B: eps_cu at the top, neutral axis depth from x_A to H.
    xA = ecu * dmax / (ecu + elim)
    x = xA + (np.clip(s, 1.0, 2.0) - 1.0) * (H - xA)
    kap_b = ecu / x
    # Pivot C: eps_c2 held at depth (1 - epiv/ecu) H.
    ebot = (np.clip(s, 2.0, 3.0) - 2.0) * epiv
    vC = (1.0 - epiv / ecu) * H
    top_c = epiv + (epiv - ebot) * vC / (H - vC)
    kap_c = (top_c - ebot) / H
    eps_top = np.where(s < 1.0, top_a, np.where(s < 2.0, ecu, top_c))
    kappa = np.where(s < 1.0, kap_a, np.where(s < 2.0, kap_b, kap_c))
    return eps_top, kappa


# ---------------------------------------------------------------------- single-section API
def _batch(ds: DesignSection) -> SectionBatch:
    return SectionBatch([ds])


def axial_resistance(ds: DesignSection) -> float:
    """NRd, the resistance to pure compression, N.

    EN 1992-1-1, 6.1(5): uniform strain eps_c2 (eps_c3 with the block).
    """
    return float(_batch(ds).NRd()[0])


def tension_resistance(ds: DesignSection) -> float:
    """Resistance to pure tension, N (negative: steel only at the strain limit)."""
    return float(_batch(ds).NRd_tension()[0])


def moment_resistance(ds: DesignSection, NEd: float, axis: Axis) -> float:
    """MRd (N mm) about ``axis`` at axial load NEd (N); 0 outside the axial range.

    EN 1992-1-1, 6.1.
    """
    return float(_batch(ds).moment_resistance(np.array([NEd]), axis)[0])


def interaction_curve(ds: DesignSection, axis: Axis, n_points: int = 121) -> tuple[np.ndarray, np.ndarray]:
    """N-M interaction curve about ``axis``: arrays N (N) and M (N mm)."""
    N, M = _batch(ds).interaction_curve(axis, n_points)
    return N[0], M[0]


def resistance_at_angle(ds: DesignSection, NEd: float, theta: float) -> tuple[float, float]:
    """(MRdy, MRdz) in N mm for the compression direction at ``theta`` (rad)."""
    ok, My, Mz = _batch(ds).resistance_at_angle(np.array([NEd]), np.array([theta]))
    return (float(My[0]), float(Mz[0])) if ok[0] else (0.0, 0.0)


# ---------------------------------------------------------------------- scalar reference path
def moment_resistance_scalar(ds: DesignSection, NEd: float, axis: Axis) -> float:  # noqa: PLR0915 - the scalar reference path, written out for reading beside the vectorised one
    """MRd (N mm) at NEd (N) by a plain scalar route, for testing the vectorised path.

    EN 1992-1-1, 6.1

    Same laws and strain limits as :class:`SectionBatch`; the concrete is integrated
    by adaptive quadrature and N(s) = NEd solved by Brent's method.
    """
    sec, conc, steel = ds.section, ds.concrete, ds.steel
    y, z, dia = sec.bar_coords()
    lever = z if axis == "y" else y
    H = sec.h if axis == "y" else sec.b
    width = sec.b if axis == "y" else sec.h
    areas = [math.pi * d * d / 4 for d in dia]
    depths = [H / 2 - c for c in lever]
    block = ds.law is ConcreteLaw.RECTANGULAR_BLOCK
    ecu = conc.eps_cu3 if block else conc.eps_cu2
    epiv = conc.eps_c3 if block else conc.eps_c2
    elim = HORIZONTAL_BRANCH_STRAIN_LIMIT if steel.branch is TopBranch.HORIZONTAL else steel.eps_ud
    dmax = max(depths)

    def sig_c(e: float) -> float:
        if block:
            return conc.eta * conc.fcd if e >= (1 - conc.lam) * conc.eps_cu3 else 0.0
        if e <= 0:
            return 0.0
        if e >= conc.eps_c2:
            return conc.fcd
        return conc.fcd * (1 - float((1 - e / conc.eps_c2) ** conc.n))  # float ** float is typed Any

    def width_at(v: float) -> float:
        if isinstance(sec, RectSection):
            return width
        r = sec.diameter / 2
        return 2 * math.sqrt(max(r * r - (r - v) ** 2, 0.0))

    def profile(s: float) -> tuple[float, float]:
        if s < 1:
            top = -elim + s * (ecu + elim)
            return top, (top + elim) / dmax
        if s < 2:
            xa = ecu * dmax / (ecu + elim)
            return ecu, ecu / (xa + (s - 1) * (H - xa))
        ebot = (s - 2) * epiv
        vc = (1 - epiv / ecu) * H
        top = epiv + (epiv - ebot) * vc / (H - vc)
        return top, (top - ebot) / H

    def resultants(s: float) -> tuple[float, float]:
        top, kap = profile(s)
        pts = [0.0, H]
        for e in ((1 - conc.lam) * conc.eps_cu3,) if block else (conc.eps_c2, 0.0):
            if kap > 0:
                pts.append(min(max((top - e) / kap, 0.0), H))
        pts = sorted(set(pts))
        N = M = 0.0
        for lo, hi in zip(pts[:-1], pts[1:], strict=True):
            if hi - lo <= 0:
                continue
            N += integrate.quad(
                lambda v: sig_c(top - kap * v) * width_at(v), lo, hi, epsabs=1e-9, epsrel=1e-12, limit=200
            )[0]
            M += integrate.quad(
                lambda v: sig_c(top - kap * v) * width_at(v) * (H / 2 - v), lo, hi, epsabs=1e-9, epsrel=1e-12, limit=200
            )[0]
        for a, d, c, dd in zip(areas, depths, lever, dia, strict=True):
            e = top - kap * d
            if block:  # share of the bar's diameter inside the block, as in the vectorised path
                kd = kap * dd
                thr = (1 - conc.lam) * conc.eps_cu3
                frac = (e + 0.5 * kd - thr) / kd if kd > 0 else float(e >= thr)
                displaced = conc.eta * conc.fcd * min(max(frac, 0.0), 1.0)
            else:
                displaced = sig_c(e)
            force = a * (float(steel.stress(e)) - displaced)
            N += force
            M += force * c
        return N, M

    with warnings.catch_warnings():
        # quad reports round-off once it is at machine precision; the tolerance asked is far tighter than needed
        warnings.simplefilter("ignore", integrate.IntegrationWarning)
        return _solve_scalar(resultants, NEd)


def _solve_scalar(resultants: Callable[[float], tuple[float, float]], NEd: float) -> float:
    """MRd from a scalar resultants(s) -> (N, M) function by Brent's method on s in [0, 3]."""
    n_min, n_max = resultants(0.0)[0], resultants(3.0)[0]
    if not n_min <= NEd <= n_max:
        return 0.0
    s_root = optimize.brentq(lambda s: resultants(s)[0] - NEd, 0.0, 3.0, xtol=1e-15, rtol=1e-15, maxiter=500)
    return abs(resultants(s_root)[1])
