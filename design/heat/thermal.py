"""Temperature field of a rectangular concrete section exposed to the standard fire.

The gas follows the standard temperature-time curve (EN 1991-1-2, Eq. (3.4)); the concrete has
the thermal properties of EN 1992-1-2, 3.3 (conductivity, specific heat with the moisture peak,
density falling with temperature). Siliceous or calcareous aggregate changes only the thermal
strain and the strength of concrete (EN 1992-1-2, 3.2 and 3.3.1), not these thermal properties,
so there is no aggregate option here.

Boundary (EN 1991-1-2, 3.1): on an exposed face the net heat flux is convection,
alpha_c (theta_g - theta_m), plus radiation, Phi eps_m eps_f sigma ((theta_g + 273)^4 -
(theta_m + 273)^4) with Phi = 1 and eps_f = 1, so only the surface emissivity eps_m (0.7 for
concrete, EN 1992-1-2, 2.2(2)) is a setting. alpha_c = 25 W/m2K for the standard curve
(EN 1991-1-2, 3.2.1(2)). Those three values are recalled from memory; the conductivity limits
were checked against their published form. An unexposed face is adiabatic, or exchanges heat with
the ambient air at 20 C with alpha_c = 9 W/m2K taken to include radiation (EN 1991-1-2, 3.1(5),
recalled from memory).

Method: the section b x h (b along y, h along z, origin at the centre) is covered by a uniform
vertex-centred grid, nodes on the faces included, each node owning the control volume around it
(half cells on the faces, quarter cells at the corners). Each time step is backward Euler. The
properties are taken at the start of the step (lagged one step, ``iterations=1``), or refined by
Picard iterations (``iterations > 1``): the heat capacity is then the chord of the volumetric
enthalpy between the old and the current temperature, which keeps the energy balance through the
moisture peak. The radiation coefficient is linearised about the same temperatures. Each step
solves one sparse symmetric positive-definite system (scipy.sparse; preconditioned conjugate
gradients, direct LU as the fallback). Circular sections are out of scope.

Units: section dimensions and coordinates in mm, temperatures in degrees C, time in minutes at
the interface (seconds for the time step); SI (m, s, W, J) inside the solver. Energies are per
metre length of the column, J/m.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Literal, get_args

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "STEFAN_BOLTZMANN",
    "Face",
    "ConductivityLimit",
    "Material",
    "Exposure",
    "Unexposed",
    "ThermalSettings",
    "ThermalResult",
    "theta_g_standard",
    "lambda_c",
    "c_p",
    "c_p_peak",
    "rho_c",
    "volumetric_enthalpy",
    "solve_section",
    "temperature_at",
    "isotherm_depth",
]

STEFAN_BOLTZMANN = 5.67e-8  # W/m2K4, EN 1991-1-2, 1.6
KELVIN = 273.0  # EN 1991-1-2, Eq. (3.3) uses theta + 273

Face = Literal["+y", "-y", "+z", "-z"]
ConductivityLimit = Literal["lower", "upper"]
Material = Literal["EN1992-1-2", "constant"]
Exposure = Literal["standard_fire", "fixed_temperature"]
Unexposed = Literal["adiabatic", "ambient"]

_FACES: tuple[Face, ...] = get_args(Face)
_CG_RTOL = 1e-12  # relative residual of the conjugate-gradient solve
_THETA_MAX_TABLE = 1400.0  # upper end of the enthalpy table, C (properties held constant above 1200 C)

FloatArray = NDArray[np.float64]


def _arr(x: ArrayLike) -> FloatArray:
    return np.asarray(x, dtype=float)


# --------------------------------------------------------------------------------------------
# Fire curve and thermal properties
# --------------------------------------------------------------------------------------------


def theta_g_standard(t_min: ArrayLike) -> FloatArray:
    """Gas temperature of the standard temperature-time curve, C.

    EN 1991-1-2, Eq. (3.4)

    Args:
        t_min: time from the start of the fire, minutes (broadcasts).

    """
    t = _arr(t_min)
    return 20.0 + 345.0 * np.log10(8.0 * t + 1.0)


def lambda_c(theta: ArrayLike, limit: ConductivityLimit = "lower") -> FloatArray:
    """Thermal conductivity of normal-weight concrete, W/mK.

    EN 1992-1-2, Eq. (3.15) (upper limit) and Eq. (3.16) (lower limit), 20 C <= theta <= 1200 C

    The lower limit is the one the temperature profiles of EN 1992-1-2 Annex A were computed with.
    Temperatures outside 20-1200 C take the value at the nearer end.

    Args:
        theta: concrete temperature, C (broadcasts).
        limit: "lower" (default) or "upper".

    """
    x = np.clip(_arr(theta), 20.0, 1200.0) / 100.0
    if limit == "upper":
        return 2.0 - 0.2451 * x + 0.0107 * x**2
    if limit == "lower":
        return 1.36 - 0.136 * x + 0.0057 * x**2
    msg = f"conductivity limit must be 'lower' or 'upper', got {limit!r}"
    raise ValueError(msg)


def c_p_peak(moisture_percent: float) -> float:
    """Peak specific heat between 100 C and 115 C for a moisture content u, J/kgK.

    EN 1992-1-2, 3.3.2(2): 900 (u = 0 %), 1470 (u = 1.5 %), 2020 (u = 3.0 %) of concrete weight;
    linear between them (values and interpolation recalled from memory)

    Args:
        moisture_percent: moisture content u, % of concrete weight, 0 to 3.

    """
    if not 0.0 <= moisture_percent <= 3.0:
        msg = f"moisture content must be within 0 to 3 % of concrete weight, got u={moisture_percent} %"
        raise ValueError(msg)
    return float(np.interp(moisture_percent, [0.0, 1.5, 3.0], [900.0, 1470.0, 2020.0]))


def c_p(theta: ArrayLike, moisture_percent: float = 1.5) -> FloatArray:
    """Specific heat of normal-weight concrete with the moisture peak, J/kgK.

    EN 1992-1-2, 3.3.2(1) (dry concrete, siliceous or calcareous aggregate)
    EN 1992-1-2, 3.3.2(2) (peak c_p.peak from 100 C to 115 C, linear down to 1000 at 200 C)

    Args:
        theta: concrete temperature, C (broadcasts); held at the 20 C and 1200 C values outside.
        moisture_percent: moisture content u, % of concrete weight (0, 1.5 or 3.0 in the clause).

    """
    th = np.clip(_arr(theta), 20.0, 1200.0)
    dry = np.interp(th, [20.0, 100.0, 200.0, 400.0, 1200.0], [900.0, 900.0, 1000.0, 1100.0, 1100.0])
    peak = np.interp(th, [100.0, 115.0, 200.0], [c_p_peak(moisture_percent), c_p_peak(moisture_percent), 1000.0])
    in_peak = (th >= 100.0) & (th <= 200.0)
    out: FloatArray = np.where(in_peak, np.maximum(dry, peak), dry)
    return out


def rho_c(theta: ArrayLike, rho_20: float = 2300.0) -> FloatArray:
    """Density of normal-weight concrete, falling with the loss of water, kg/m3.

    EN 1992-1-2, 3.3.2(3)

    Args:
        theta: concrete temperature, C (broadcasts); held at the 20 C and 1200 C values outside.
        rho_20: density at 20 C, kg/m3 (2300 by default, the value used for Annex A).

    """
    th = np.clip(_arr(theta), 20.0, 1200.0)
    factor = np.interp(th, [20.0, 115.0, 200.0, 400.0, 1200.0], [1.0, 1.0, 0.98, 0.95, 0.88])
    out: FloatArray = rho_20 * factor
    return out


def volumetric_enthalpy(theta: ArrayLike, moisture_percent: float = 1.5, rho_20: float = 2300.0) -> FloatArray:
    """Heat stored per unit volume above 20 C, H(theta) = integral of rho c_p from 20 C, J/m3.

    EN 1992-1-2, 3.3.2 (the integral of the product of its density and specific heat)

    Tabulated on a 1 C grid (exact for the piecewise-linear density and specific heat up to the
    rounding of their products) and interpolated; below 20 C and above 1400 C it is extended
    linearly.

    Args:
        theta: temperature, C (broadcasts).
        moisture_percent: moisture content u, % of concrete weight.
        rho_20: density at 20 C, kg/m3.

    """
    grid, table = _enthalpy_table(moisture_percent, rho_20)
    th = _arr(theta)
    out = np.interp(th, grid, table)
    slope_lo = float(rho_c(20.0, rho_20) * c_p(20.0, moisture_percent))
    slope_hi = float(rho_c(1200.0, rho_20) * c_p(1200.0, moisture_percent))
    out = np.where(th < grid[0], slope_lo * (th - grid[0]), out)
    result: FloatArray = np.where(th > grid[-1], table[-1] + slope_hi * (th - grid[-1]), out)
    return result


def _enthalpy_table(moisture_percent: float, rho_20: float) -> tuple[FloatArray, FloatArray]:
    grid = np.arange(20.0, _THETA_MAX_TABLE + 0.5, 1.0)
    mid = 0.5 * (grid[1:] + grid[:-1])
    # midpoint of each 1 C interval: exact for a linear integrand, and the products are smooth
    # within an interval because every breakpoint lies on the grid
    steps = rho_c(mid, rho_20) * c_p(mid, moisture_percent)
    table = np.concatenate([[0.0], np.cumsum(steps)])
    return grid, table


# --------------------------------------------------------------------------------------------
# Settings and result
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ThermalSettings:
    """Options of the thermal analysis of a section.

    Attributes:
        cell_mm: target grid spacing, mm (rounded so that b and h hold a whole number of cells).
        step_s: target time step, s (each interval between requested times is cut into equal steps).
        moisture_percent: moisture content u, % of concrete weight (EN 1992-1-2, 3.3.2(2)).
        conductivity: "lower" (Eq. (3.16), the limit of Annex A) or "upper" (Eq. (3.15)).
        rho_20: density at 20 C, kg/m3 (EN 1992-1-2, 3.3.2(3)).
        emissivity: surface emissivity eps_m of concrete (EN 1992-1-2, 2.2(2)).
        convection_W_m2K: alpha_c on exposed faces (EN 1991-1-2, 3.2.1(2), standard curve).
        exposed: the faces heated by the fire.
        unexposed: "adiabatic", or "ambient" (air at ``initial_C`` with ``ambient_convection_W_m2K``).
        ambient_convection_W_m2K: alpha_c on an unexposed face, radiation included (EN 1991-1-2, 3.1(5)).
        iterations: 1 = properties lagged one step; more = Picard iterations per step.
        initial_C: uniform initial temperature and ambient temperature, C.
        material: "EN1992-1-2" (temperature-dependent) or "constant" (for verification).
        constant_conductivity_W_mK: conductivity of the "constant" material, W/mK.
        constant_heat_capacity_J_m3K: volumetric heat capacity rho c of the "constant" material, J/m3K.
        exposure: "standard_fire" (gas on the curve, convection and radiation) or "fixed_temperature"
            (exposed faces held at ``surface_C`` from t = 0, for verification).
        surface_C: surface temperature of the "fixed_temperature" exposure, C.

    """

    cell_mm: float = 10.0
    step_s: float = 30.0
    moisture_percent: float = 1.5
    conductivity: ConductivityLimit = "lower"
    rho_20: float = 2300.0
    emissivity: float = 0.7
    convection_W_m2K: float = 25.0
    exposed: tuple[Face, ...] = field(default=_FACES)
    unexposed: Unexposed = "adiabatic"
    ambient_convection_W_m2K: float = 9.0
    iterations: int = 1
    initial_C: float = 20.0
    material: Material = "EN1992-1-2"
    constant_conductivity_W_mK: float = 1.0
    constant_heat_capacity_J_m3K: float = 2.3e6
    exposure: Exposure = "standard_fire"
    surface_C: float = 1000.0

    def __post_init__(self) -> None:
        positive = {
            "cell_mm": (self.cell_mm, "mm"),
            "step_s": (self.step_s, "s"),
            "rho_20": (self.rho_20, "kg/m3"),
            "constant_conductivity_W_mK": (self.constant_conductivity_W_mK, "W/mK"),
            "constant_heat_capacity_J_m3K": (self.constant_heat_capacity_J_m3K, "J/m3K"),
        }
        for name, (value, unit) in positive.items():
            if not value > 0:
                msg = f"{name} must be positive, got {value} {unit}"
                raise ValueError(msg)
        c_p_peak(self.moisture_percent)  # validates the range
        if not 0.0 <= self.emissivity <= 1.0:
            msg = f"emissivity must be within 0 to 1, got {self.emissivity}"
            raise ValueError(msg)
        if self.convection_W_m2K < 0 or self.ambient_convection_W_m2K < 0:
            msg = (
                f"convection coefficients must not be negative, got {self.convection_W_m2K} and "
                f"{self.ambient_convection_W_m2K} W/m2K"
            )
            raise ValueError(msg)
        bad = [f for f in self.exposed if f not in _FACES]
        if bad or not self.exposed or len(set(self.exposed)) != len(self.exposed):
            msg = f"exposed must be distinct faces among {_FACES}, got {self.exposed}"
            raise ValueError(msg)
        if self.iterations < 1:
            msg = f"iterations must be at least 1, got {self.iterations}"
            raise ValueError(msg)
        options = {
            "conductivity": (self.conductivity, ConductivityLimit),
            "unexposed": (self.unexposed, Unexposed),
            "material": (self.material, Material),
            "exposure": (self.exposure, Exposure),
        }
        for name, (option, kind) in options.items():
            if option not in get_args(kind):
                msg = f"{name} must be one of {get_args(kind)}, got {option!r}"
                raise ValueError(msg)


@dataclass(frozen=True)
class ThermalResult:
    """Temperature field of a section at the requested times.

    Attributes:
        b: section width along y, mm.
        h: section depth along z, mm.
        y: node coordinates along y, mm, shape (ny + 1,), from -b/2 to b/2.
        z: node coordinates along z, mm, shape (nz + 1,), from -h/2 to h/2.
        minutes: the requested times, minutes, shape (nt,).
        theta: node temperatures, C, shape (nt, ny + 1, nz + 1); theta[k, i, j] at (y[i], z[j]).
        theta_gas: gas temperature at each requested time, C, shape (nt,) (the surface
            temperature under the "fixed_temperature" exposure).
        heat_input_J_m: heat that entered the section through its faces since t = 0, J/m, shape (nt,)
            (net of any loss through unexposed faces at ambient).
        settings: the settings of the analysis.
        steps: number of time steps taken.

    """

    b: float
    h: float
    y: FloatArray
    z: FloatArray
    minutes: FloatArray
    theta: FloatArray
    theta_gas: FloatArray
    heat_input_J_m: FloatArray
    settings: ThermalSettings
    steps: int


# --------------------------------------------------------------------------------------------
# Solver
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Grid:
    """Geometry of the vertex-centred grid: node numbering n = i (nz + 1) + j (i along y)."""

    ny: int
    nz: int
    dy: float  # m
    dz: float  # m
    area: FloatArray  # control-volume area per node, m2
    link_a: NDArray[np.int64]  # first node of each link
    link_b: NDArray[np.int64]  # second node of each link
    link_g: FloatArray  # width of the shared control-volume face / node distance (-)
    face_length: dict[Face, FloatArray]  # boundary length per node on each face, m (0 off the face)


def _grid(b: float, h: float, cell_mm: float) -> _Grid:
    ny = max(2, round(b / cell_mm))
    nz = max(2, round(h / cell_mm))
    dy = b / ny / 1000.0
    dz = h / nz / 1000.0
    wy = np.full(ny + 1, dy)
    wy[[0, -1]] = dy / 2.0
    wz = np.full(nz + 1, dz)
    wz[[0, -1]] = dz / 2.0
    area = np.outer(wy, wz).ravel()
    index = np.arange((ny + 1) * (nz + 1)).reshape(ny + 1, nz + 1)
    # links along y between (i, j) and (i + 1, j): shared face of length wz[j] at distance dy
    ay, by = index[:-1, :].ravel(), index[1:, :].ravel()
    gy = np.broadcast_to(wz / dy, (ny, nz + 1)).ravel()
    # links along z between (i, j) and (i, j + 1)
    az, bz = index[:, :-1].ravel(), index[:, 1:].ravel()
    gz = np.broadcast_to((wy / dz)[:, None], (ny + 1, nz)).ravel()
    lengths: dict[Face, FloatArray] = {}
    for face in _FACES:
        length = np.zeros((ny + 1, nz + 1))
        if face == "-y":
            length[0, :] = wz
        elif face == "+y":
            length[-1, :] = wz
        elif face == "-z":
            length[:, 0] = wy
        else:
            length[:, -1] = wy
        lengths[face] = length.ravel()
    return _Grid(
        ny=ny,
        nz=nz,
        dy=dy,
        dz=dz,
        area=area,
        link_a=np.concatenate([ay, az]),
        link_b=np.concatenate([by, bz]),
        link_g=np.concatenate([gy, gz]),
        face_length=lengths,
    )


def _time_steps(minutes: FloatArray, step_s: float) -> tuple[FloatArray, NDArray[np.int64]]:
    """Ends of the time steps, s, and the step index that ends at each requested time."""
    ends: list[float] = []
    marks: list[int] = []
    t_prev = 0.0
    for t_min in minutes:
        t_s = 60.0 * float(t_min)
        n = math.ceil((t_s - t_prev) / step_s - 1e-9)
        ends.extend(t_prev + (t_s - t_prev) * np.arange(1, n + 1) / n if n > 0 else [])
        marks.append(len(ends))  # number of steps taken when this time is reached
        t_prev = t_s
    return np.asarray(ends, dtype=float), np.asarray(marks, dtype=np.int64)


class _Material:
    """Conductivity and volumetric enthalpy of the settings' material."""

    def __init__(self, s: ThermalSettings) -> None:
        self.s = s
        if s.material == "EN1992-1-2":
            self.grid, self.table = _enthalpy_table(s.moisture_percent, s.rho_20)

    def k(self, theta: FloatArray) -> FloatArray:
        if self.s.material == "constant":
            return np.full_like(theta, self.s.constant_conductivity_W_mK)
        return lambda_c(theta, self.s.conductivity)

    def heat_capacity(self, theta_old: FloatArray, theta_new: FloatArray) -> FloatArray:
        """Chord of the volumetric enthalpy between two temperatures (rho c at the old one if equal), J/m3K."""
        s = self.s
        if s.material == "constant":
            return np.full_like(theta_old, s.constant_heat_capacity_J_m3K)
        tangent = rho_c(theta_old, s.rho_20) * c_p(theta_old, s.moisture_percent)
        d = theta_new - theta_old
        big = np.abs(d) > 1e-3
        if not np.any(big):
            return tangent
        h_new = volumetric_enthalpy(theta_new[big], s.moisture_percent, s.rho_20)
        h_old = volumetric_enthalpy(theta_old[big], s.moisture_percent, s.rho_20)
        out = tangent.copy()
        out[big] = (h_new - h_old) / d[big]
        return out


def solve_section(
    b: float, h: float, minutes: Sequence[float], settings: ThermalSettings | None = None
) -> ThermalResult:
    """Temperature field of a rectangular section b x h at the requested times of fire exposure.

    EN 1991-1-2, Eq. (3.4) (gas), 3.1 (net heat flux); EN 1992-1-2, 3.3 (concrete properties)

    Args:
        b: section width along y, mm.
        h: section depth along z, mm.
        minutes: times at which the field is returned, minutes, non-decreasing, >= 0 (0 gives the
            initial field).
        settings: options; ``ThermalSettings()`` by default.

    Returns:
        The field at each requested time on the node grid (see :class:`ThermalResult`).

    """
    s = settings if settings is not None else ThermalSettings()
    if not (b > 0 and h > 0):
        msg = f"section dimensions must be positive, got b={b} mm, h={h} mm"
        raise ValueError(msg)
    times = np.asarray(minutes, dtype=float).ravel()
    if times.size == 0 or np.any(times < 0) or np.any(np.diff(times) < 0):
        msg = f"minutes must be a non-empty non-decreasing sequence of times >= 0, got {list(times)}"
        raise ValueError(msg)
    g = _grid(b, h, s.cell_mm)
    ends, marks = _time_steps(times, s.step_s)
    mat = _Material(s)
    n_nodes = g.area.size

    exposed_length = sum((g.face_length[f] for f in s.exposed), np.zeros(n_nodes))
    ambient_length = np.zeros(n_nodes)
    if s.unexposed == "ambient":
        ambient_length = sum((g.face_length[f] for f in _FACES if f not in s.exposed), np.zeros(n_nodes))
    fixed = exposed_length > 0 if s.exposure == "fixed_temperature" else np.zeros(n_nodes, dtype=bool)
    free = ~fixed
    h_amb = s.ambient_convection_W_m2K * ambient_length  # W/mK per node

    rows = np.concatenate([g.link_a, g.link_b, np.arange(n_nodes)])
    cols = np.concatenate([g.link_b, g.link_a, np.arange(n_nodes)])

    theta = np.full(n_nodes, s.initial_C)
    heat_in = 0.0
    fields: list[FloatArray] = []
    gas: list[float] = []
    heats: list[float] = []
    t_prev = 0.0
    step = 0
    for k_time, mark in enumerate(marks):
        while step < mark:
            t_new = float(ends[step])
            dt = t_new - t_prev
            theta_g = s.surface_C if s.exposure == "fixed_temperature" else float(theta_g_standard(t_new / 60.0))
            theta, dq = _step(theta, theta_g, dt, s, g, mat, exposed_length, h_amb, fixed, free, rows, cols)
            heat_in += dq
            t_prev = t_new
            step += 1
        fields.append(theta.reshape(g.ny + 1, g.nz + 1).copy())
        if s.exposure == "fixed_temperature":
            gas.append(s.surface_C if times[k_time] > 0 else s.initial_C)
        else:
            gas.append(float(theta_g_standard(times[k_time])))
        heats.append(heat_in)
    return ThermalResult(
        b=float(b),
        h=float(h),
        y=np.linspace(-b / 2.0, b / 2.0, g.ny + 1),
        z=np.linspace(-h / 2.0, h / 2.0, g.nz + 1),
        minutes=times,
        theta=np.stack(fields),
        theta_gas=np.asarray(gas),
        heat_input_J_m=np.asarray(heats),
        settings=s,
        steps=step,
    )


def _step(
    theta: FloatArray,
    theta_g: float,
    dt: float,
    s: ThermalSettings,
    g: _Grid,
    mat: _Material,
    exposed_length: FloatArray,
    h_amb: FloatArray,
    fixed: NDArray[np.bool_],
    free: NDArray[np.bool_],
    rows: NDArray[np.int64],
    cols: NDArray[np.int64],
) -> tuple[FloatArray, float]:
    """One backward-Euler step; returns the new temperatures and the heat that entered, J/m."""
    current = theta
    n_nodes = theta.size
    heat_in = 0.0
    for _ in range(s.iterations):
        cap = mat.heat_capacity(theta, current) * g.area / dt  # W/mK per node
        k_node = mat.k(current)
        cond = 0.5 * (k_node[g.link_a] + k_node[g.link_b]) * g.link_g  # W/mK per link
        diag_links = np.bincount(g.link_a, cond, n_nodes) + np.bincount(g.link_b, cond, n_nodes)
        rhs = cap * theta + h_amb * s.initial_C
        diag = cap + diag_links + h_amb
        if s.exposure == "standard_fire":
            tg = theta_g + KELVIN
            ts = current + KELVIN
            h_rad = s.emissivity * STEFAN_BOLTZMANN * (tg * tg + ts * ts) * (tg + ts)
            h_bnd = (s.convection_W_m2K + h_rad) * exposed_length  # W/mK per node
            diag = diag + h_bnd
            rhs = rhs + h_bnd * theta_g
            new = _solve_system(rows, cols, -cond, diag, rhs, current)
            heat_in = dt * float(np.sum(h_bnd * (theta_g - new)))
        else:
            data_off = np.where(fixed[g.link_a] | fixed[g.link_b], 0.0, -cond)
            diag_f = np.where(fixed, 1.0, diag)
            rhs_f = np.where(fixed, s.surface_C, rhs)
            # move the known boundary temperatures of each link to the right-hand side
            a_fixed, b_fixed = fixed[g.link_a], fixed[g.link_b]
            rhs_f = rhs_f + np.bincount(g.link_a, np.where(b_fixed & ~a_fixed, cond * s.surface_C, 0.0), n_nodes)
            rhs_f = rhs_f + np.bincount(g.link_b, np.where(a_fixed & ~b_fixed, cond * s.surface_C, 0.0), n_nodes)
            new = _solve_system(rows, cols, data_off, diag_f, rhs_f, current)
            # heat supplied at the fixed nodes: the residual of their own balance
            flow = cond * (new[g.link_a] - new[g.link_b])  # from a to b, W/m
            out_of = np.bincount(g.link_a, flow, n_nodes) - np.bincount(g.link_b, flow, n_nodes)
            supplied = cap * (new - theta) + out_of
            heat_in = dt * float(np.sum(supplied[fixed]))
        heat_in -= dt * float(np.sum(h_amb[free] * (new[free] - s.initial_C)))
        current = new
    return current, heat_in


def _solve_system(
    rows: NDArray[np.int64], cols: NDArray[np.int64], off: FloatArray, diag: FloatArray, rhs: FloatArray, x0: FloatArray
) -> FloatArray:
    """Solve the symmetric positive-definite system with off-diagonal entries ``off`` (per link) and ``diag``.

    Conjugate gradients with a diagonal preconditioner, started from ``x0`` (the old field), to a
    relative residual of 1e-12; the capacity term dominates the diagonal at practical time steps,
    so a few tens of iterations suffice. A direct LU solve is the fallback.
    """
    n = diag.size
    data = np.concatenate([off, off, diag])
    matrix = sp.csr_matrix((data, (rows, cols)), shape=(n, n))
    precond = spla.LinearOperator((n, n), matvec=lambda v: v / diag, dtype=float)
    solution, info = spla.cg(matrix, rhs, x0=x0, rtol=_CG_RTOL, atol=0.0, maxiter=10 * n, M=precond)
    if info != 0:  # pragma: no cover - not met at the grid and step sizes tested
        solution = spla.spsolve(matrix.tocsc(), rhs)
    out: FloatArray = np.asarray(solution, dtype=float)
    return out


# --------------------------------------------------------------------------------------------
# Reading the field
# --------------------------------------------------------------------------------------------


def temperature_at(result: ThermalResult, t_index: int, y: ArrayLike, z: ArrayLike) -> FloatArray:
    """Temperature at points of the section by bilinear interpolation of the node field, C.

    Args:
        result: a solved field.
        t_index: index into ``result.minutes``.
        y: point coordinates along y, mm (broadcast with z), within -b/2..b/2.
        z: point coordinates along z, mm, within -h/2..h/2.

    """
    yy, zz = np.broadcast_arrays(_arr(y), _arr(z))
    tol = 1e-9 * max(result.b, result.h)
    if np.any(np.abs(yy) > result.b / 2.0 + tol) or np.any(np.abs(zz) > result.h / 2.0 + tol):
        msg = f"points must lie within the section b x h = {result.b} x {result.h} mm (origin at the centre)"
        raise ValueError(msg)
    field_k = result.theta[t_index]
    ny, nz = result.y.size - 1, result.z.size - 1
    dy, dz = result.b / ny, result.h / nz
    fy = (yy + result.b / 2.0) / dy
    fz = (zz + result.h / 2.0) / dz
    i = np.clip(np.floor(fy).astype(np.int64), 0, ny - 1)
    j = np.clip(np.floor(fz).astype(np.int64), 0, nz - 1)
    uy = np.clip(fy - i, 0.0, 1.0)
    uz = np.clip(fz - j, 0.0, 1.0)
    out: FloatArray = (
        field_k[i, j] * (1 - uy) * (1 - uz)
        + field_k[i + 1, j] * uy * (1 - uz)
        + field_k[i, j + 1] * (1 - uy) * uz
        + field_k[i + 1, j + 1] * uy * uz
    )
    return out


def isotherm_depth(result: ThermalResult, t_index: int, theta: float = 500.0) -> dict[Face, float]:
    """Depth of an isotherm below the middle of each exposed face, mm.

    Read along the centre line normal to the face (linear between nodes). The depth is 0 where the
    surface is cooler than ``theta``, and the whole dimension where the centre line is hotter
    throughout.

    Args:
        result: a solved field.
        t_index: index into ``result.minutes``.
        theta: temperature of the isotherm, C.

    """
    depths: dict[Face, float] = {}
    for face in result.settings.exposed:
        if face in ("-y", "+y"):
            coord = result.y if face == "-y" else result.y[::-1]
            profile = temperature_at(result, t_index, coord, 0.0)
            depth = np.abs(coord - coord[0])
        else:
            coord = result.z if face == "-z" else result.z[::-1]
            profile = temperature_at(result, t_index, 0.0, coord)
            depth = np.abs(coord - coord[0])
        below = np.nonzero(profile < theta)[0]
        if below.size == 0:
            depths[face] = float(depth[-1])
        elif below[0] == 0:
            depths[face] = 0.0
        else:
            k = int(below[0])
            t0, t1 = profile[k - 1], profile[k]
            depths[face] = float(depth[k - 1] + (t0 - theta) / (t0 - t1) * (depth[k] - depth[k - 1]))
    return depths
