"""Reading single-column specification files (JSON or TOML) for `colstack section` and `check`.

A specification names one section, its materials and, optionally, the
actions on it. Units at this edge: kN, kNm, mm, MPa. Every key is checked:
unknown keys are errors with a suggestion, missing engineering values are
errors (never a silent default), and each message names the file, the key and
the value.
"""

from __future__ import annotations

import difflib
import json
import math
import re
import tomllib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from design.materials import STANDARD_CLASSES, Concrete, ConcreteLaw, Ductility, Reinforcement, TopBranch
from design.params import NationalParameters, parameter_set, with_overrides
from design.resistance import DesignSection
from design.sections import CircBars, CircSection, RectBars, RectSection
from optimizer.building.plausibility import SectionCapacity, spec_force_problem, spec_side_problem, spec_warnings
from optimizer.errors import InputError, reject_unknown_keys

__all__ = [
    "SectionSpec",
    "load_spec_file",
    "section_spec",
    "check_keys",
    "number",
    "concrete_class",
    "section_capacity",
    "plot_target",
]

SECTION_KEYS = {
    "b",
    "h",
    "diameter",
    "cover",
    "link",
    "fck",
    "grade",
    "fyk",
    "ductility",
    "branch",
    "law",
    "bars",
    "NEd",
    "parameters",
    "national",
    "aggregate",
}
PARAMETER_KEYS = {
    "alpha_cc",
    "alpha_ct",
    "gamma_c",
    "gamma_s",
    "theta_0",
    "lambda_A",
    "lambda_B",
    "lambda_C",
    "phi_min_long",
    "delta_c_dev",
}


@dataclass(frozen=True)
class SectionSpec:
    """A parsed section specification."""

    path: str
    design: DesignSection
    params: NationalParameters
    NEd_kN: float | None
    aggregate_mm: float
    capacity: SectionCapacity | None = None
    warnings: tuple[str, ...] = ()  # plausibility warnings (unusual values), one sentence each


def load_spec_file(path: str | Path) -> dict[str, Any]:
    """Read a JSON or TOML file into a dict, with a one-line error for unreadable input."""
    p = Path(path)
    if not p.is_file():
        raise InputError(str(p), "file", str(p), "an existing JSON or TOML file")
    try:
        text = p.read_text(encoding="utf-8")
    except UnicodeDecodeError:
        raise InputError(str(p), "file", p.name, "UTF-8 text") from None
    try:
        if p.suffix.lower() == ".json":
            data = json.loads(text)
        elif p.suffix.lower() == ".toml":
            data = tomllib.loads(text)
        else:
            raise InputError(str(p), "file", p.suffix, "a .json or .toml file")
    except json.JSONDecodeError as exc:
        raise InputError(str(p), f"line {exc.lineno}", exc.msg, "valid JSON") from None
    except tomllib.TOMLDecodeError as exc:
        raise InputError(str(p), "syntax", str(exc), "valid TOML") from None
    if not isinstance(data, dict):
        raise InputError(str(p), "top level", type(data).__name__, "a table of keys")
    return data


def check_keys(path: str, where: str, data: dict, allowed: set[str]) -> None:
    """Raise an InputError for the first unknown key, suggesting the nearest allowed one."""
    reject_unknown_keys(path, where, data, allowed)


def number(
    path: str,
    field: str,
    value: Any,
    *,
    positive: bool = False,
    allow_zero: bool = True,
    minimum: float | None = None,
    maximum: float | None = None,
    unit: str = "",
) -> float:
    """Validate a finite number, with range limits; InputError otherwise."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(path, field, value, f"a number{' in ' + unit if unit else ''}")
    try:
        v = float(value)
    except OverflowError:
        raise InputError(path, field, f"{str(value)[:12]}...", "a finite number of sensible size") from None
    if not math.isfinite(v):
        raise InputError(path, field, value, "a finite number")
    if positive and (v < 0 or (v == 0 and not allow_zero)):
        raise InputError(path, field, value, f"a positive number{' in ' + unit if unit else ''}")
    if minimum is not None and v < minimum:
        raise InputError(path, field, value, f"at least {minimum:g}{' ' + unit if unit else ''}")
    if maximum is not None and v > maximum:
        raise InputError(path, field, value, f"at most {maximum:g}{' ' + unit if unit else ''}")
    return v


def _required(path: str, data: dict, key: str, where: str = "") -> Any:
    if key not in data:
        field = f"{where}.{key}" if where else key
        raise InputError(path, field, None, "missing; this engineering value has no default")
    return data[key]


#: The strength classes of EN 1992-1-1 Table 3.1 by their full names ("C35/45" -> 35 MPa).
CLASS_NAMES: dict[str, float] = {f"C{fck}/{cube}": float(fck) for fck, cube in STANDARD_CLASSES.items()}


def concrete_class(path: str, field: str, value: Any) -> float:
    """The fck (MPa) of a strength class written in full as in EN 1992-1-1 Table 3.1 (``"C35/45"``).

    A class written in part (``"C35"``, ``"35/45"``) or with the wrong cube strength is an
    error that names the class meant, never a silent reading.
    """
    expected = 'a strength class of EN 1992-1-1 Table 3.1 written in full, e.g. "C30/37"'
    if not isinstance(value, str):
        raise InputError(path, field, value, expected)
    key = re.sub(r"\s+", "", value).upper()
    if key in CLASS_NAMES:
        return CLASS_NAMES[key]
    m = re.search(r"\d+(?:\.\d+)?", key)
    fck = float(m.group()) if m else None
    meant = next((name for name, f in CLASS_NAMES.items() if f == fck), None)
    if meant is None:
        close = difflib.get_close_matches(key, list(CLASS_NAMES), n=1, cutoff=0.6)
        meant = close[0] if close else None
    hint = f"; did you mean {meant}?" if meant else f" (one of {', '.join(CLASS_NAMES)})"
    raise InputError(path, field, value, expected + hint)


def section_capacity(design: DesignSection) -> SectionCapacity:
    """Closed-form bounds of a section for the plausibility of its actions (kN, kNm, mm)."""
    sec, c, s = design.section, design.concrete, design.steel
    squash = (sec.Ac * c.fcd + sec.As * s.fyd) / 1e3
    if isinstance(sec, CircSection):
        hy = hz = sec.diameter
    else:
        hy, hz = sec.h, sec.b
    return SectionCapacity(
        squash_kN=squash,
        tension_kN=sec.As * s.fyd / 1e3,
        moment_bound_kNm=squash * max(hy, hz) / 2 / 1e3,
        h_y_mm=hy,
        h_z_mm=hz,
    )


def _plausible(path: str, field: str, value: float, kind: str, raw: Any) -> None:
    """InputError (naming the value as written) for a dimension no one can mean."""
    problem = spec_side_problem(value, kind)
    if problem is not None:
        raise InputError(path, field, raw, problem)


def _choice(path: str, field: str, value: Any, enum: type) -> Any:
    try:
        return enum(value)
    except ValueError:
        options = ", ".join(repr(e.value) for e in enum)
        raise InputError(path, field, value, f"one of {options}") from None


def section_spec(data: dict[str, Any], path: str, extra_keys: set[str] = frozenset()) -> SectionSpec:  # noqa: PLR0912, PLR0915 - reads and validates one input file, one branch per key
    """Build the design section described by ``data`` (already loaded from ``path``)."""
    check_keys(path, "", data, SECTION_KEYS | set(extra_keys))
    params = parameter_set("EN")
    if "national" in data:
        try:
            params = parameter_set(data["national"])
        except ValueError:
            raise InputError(path, "national", data["national"], "'EN' or 'UK'") from None
    overrides = data.get("parameters", {})
    if not isinstance(overrides, dict):
        raise InputError(path, "parameters", overrides, "a table of parameter overrides")
    check_keys(path, "parameters", overrides, PARAMETER_KEYS)
    if overrides:
        values = {k: number(path, f"parameters.{k}", v, positive=True) for k, v in overrides.items()}
        try:
            params = with_overrides(params, **values)
        except ValueError as exc:
            raise InputError(path, "parameters", overrides, str(exc)) from None

    # Concrete: fck (MPa) or grade ("C30/37"), not both.
    if "fck" in data and "grade" in data:
        raise InputError(path, "grade", data["grade"], "give either fck or grade, not both")
    if "grade" in data:
        fck = concrete_class(path, "grade", data["grade"])
    else:
        fck = number(path, "fck", _required(path, data, "fck"), minimum=12, maximum=90, unit="MPa")
    try:
        concrete = Concrete(fck, alpha_cc=params.alpha_cc, gamma_c=params.gamma_c)
    except ValueError as exc:
        raise InputError(path, "fck", fck, str(exc)) from None
    fyk = number(path, "fyk", _required(path, data, "fyk"), minimum=400, maximum=600, unit="MPa")
    steel = Reinforcement.with_params(
        fyk,
        _choice(path, "ductility", data.get("ductility", "B"), Ductility),
        _choice(path, "branch", data.get("branch", "horizontal"), TopBranch),
        params,
    )
    law = _choice(path, "law", data.get("law", ConcreteLaw.PARABOLA_RECTANGLE.value), ConcreteLaw)

    cover = number(path, "cover", _required(path, data, "cover"), positive=True, allow_zero=False, unit="mm")
    _plausible(path, "cover", cover, "cover", data["cover"])
    link = number(path, "link", _required(path, data, "link"), positive=True, allow_zero=False, unit="mm")
    _plausible(path, "link", link, "bar", data["link"])
    bars = _required(path, data, "bars")
    if not isinstance(bars, dict):
        raise InputError(path, "bars", bars, "a table such as {dia = 25, nb = 3, nh = 4}")
    try:
        if "diameter" in data:
            if "b" in data or "h" in data:
                raise InputError(path, "diameter", data["diameter"], "give b and h, or diameter, not both")
            check_keys(path, "bars", bars, {"dia", "n"})
            diameter = number(path, "diameter", data["diameter"], positive=True, allow_zero=False, unit="mm")
            _plausible(path, "diameter", diameter, "side", data["diameter"])
            dia = number(
                path, "bars.dia", _required(path, bars, "dia", "bars"), positive=True, allow_zero=False, unit="mm"
            )
            _plausible(path, "bars.dia", dia, "bar", bars["dia"])
            n = _integer(path, "bars.n", _required(path, bars, "n", "bars"), 3)
            section = CircSection(diameter, cover, link, CircBars(dia, n))
        else:
            check_keys(path, "bars", bars, {"dia", "nb", "nh", "corner_dia"})
            b = number(path, "b", _required(path, data, "b"), positive=True, allow_zero=False, unit="mm")
            _plausible(path, "b", b, "side", data["b"])
            h = number(path, "h", _required(path, data, "h"), positive=True, allow_zero=False, unit="mm")
            _plausible(path, "h", h, "side", data["h"])
            dia = number(
                path, "bars.dia", _required(path, bars, "dia", "bars"), positive=True, allow_zero=False, unit="mm"
            )
            _plausible(path, "bars.dia", dia, "bar", bars["dia"])
            nb = _integer(path, "bars.nb", _required(path, bars, "nb", "bars"), 2)
            nh = _integer(path, "bars.nh", _required(path, bars, "nh", "bars"), 2)
            corner = bars.get("corner_dia")
            if corner is not None:
                corner = number(path, "bars.corner_dia", corner, positive=True, allow_zero=False, unit="mm")
                _plausible(path, "bars.corner_dia", corner, "bar", bars["corner_dia"])
            section = RectSection(b, h, cover, link, RectBars(dia, nb, nh, corner))
    except ValueError as exc:
        raise InputError(path, "section", data.get("bars"), str(exc)) from None

    design = DesignSection(section, concrete, steel, law)
    cap = section_capacity(design)
    NEd = None
    if "NEd" in data:
        NEd = number(path, "NEd", data["NEd"], unit="kN")
        problem = spec_force_problem(NEd, cap)
        if problem is not None:
            raise InputError(path, "NEd", data["NEd"], problem)
    aggregate = number(path, "aggregate", data.get("aggregate", 20.0), positive=True, allow_zero=False, unit="mm")
    return SectionSpec(path, design, params, NEd, aggregate, cap, tuple(spec_warnings(path, NEd, cap)))


def _integer(path: str, field: str, value: Any, minimum: int) -> int:
    if isinstance(value, bool) or not isinstance(value, int) or value < minimum:
        raise InputError(path, field, value, f"a whole number >= {minimum}")
    return int(value)


def plot_target(plot: str, spec_path: str | Path) -> Path:
    """The picture file of ``--plot``: a new .png, never the specification itself (InputError otherwise)."""
    target = Path(plot)
    if target.suffix.lower() != ".png":
        raise InputError("--plot", "--plot", plot, "a file name ending in .png")
    if target.resolve() == Path(spec_path).resolve():
        raise InputError("--plot", "--plot", plot, "a new file, not the specification itself")
    return target
