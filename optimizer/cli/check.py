"""``colstack check SPEC``: the full EC2 check of one column in one storey, as a calculation sheet.

SPEC (JSON or TOML) has the keys of ``colstack section`` plus the actions and
buckling data: ``NEd`` (kN), ``My`` = [top, bottom] and ``Mz`` = [top, bottom]
(kNm, first-order, same sign at both ends = single curvature), and either
``l0y``/``l0z`` (mm) or ``height`` (clear height, mm) with ``l0_factor`` (or
``l0_factor_y``/``l0_factor_z``) or the end-restraint flexibilities ``k1y``,
``k2y``, ``k1z``, ``k2z`` (EN 1992-1-1 Eq. (5.15) braced, (5.16) unbraced).
Optional: ``braced``, ``phi_ef``, ``exposure``, ``fire`` ("R90", or "none"),
``mu_fi``, ``imperfection``, ``min_eccentricity``, ``biaxial``,
``working_life_100y``.

Values that cannot be meant (a clear height of 6.5 mm, a force fifty times the
squash load: see :mod:`optimizer.building.plausibility`) are input errors; values that
are merely unusual are printed as warnings on stderr, on the sheet and in the
``warnings`` list of ``--json``.

Exit status: 0 when the column passes every check, 1 when it fails one (the
sheet or the JSON, with ``"ok": false``, is still printed), 2 for bad input
(one line naming the file, the key, the value and what is expected).
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path
from typing import Any

import numpy as np

from design.cover import parse_exposure
from design.creep import CementClass, CreepSettings
from design.fire import FireRating
from design.member import BiaxialMethod, CheckSettings, ColumnActions, MinEccentricity, check_column
from design.results import CheckKind
from design.second_order import slenderness
from design.second_order.imperfections import ImperfectionMethod
from optimizer import CAUTION
from optimizer.building.plausibility import spec_length_problem, spec_moment_problem, spec_warnings
from optimizer.cli.spec import SECTION_KEYS, SectionSpec, check_keys, load_spec_file, number, section_spec
from optimizer.errors import InputError
from optimizer.reporting.sheet import build_sheet, kind_summary, render_html, render_text

__all__ = ["add_parser", "run", "parse_check_spec", "check_warnings", "EXIT_PASS", "EXIT_FAIL"]

EXIT_PASS = 0  # the column passes every check
EXIT_FAIL = 1  # the column fails a check (bad input is 2, optimizer.errors.EXIT_INPUT)

CHECK_KEYS = {
    "My",
    "Mz",
    "l0y",
    "l0z",
    "height",
    "l0_factor",
    "l0_factor_y",
    "l0_factor_z",
    "k1y",
    "k2y",
    "k1z",
    "k2z",
    "braced",
    "phi_ef",
    "exposure",
    "fire",
    "mu_fi",
    "imperfection",
    "min_eccentricity",
    "biaxial",
    "working_life_100y",
    "l0_fi",
    "M0Eqp_ratio",
    "char_ratio",
    "As_below",
    "s_link",
    "s_link_zone",
    "VEd",
    "relative_humidity",
    "age_at_loading",
    "cement_class",
    "curvature_c",
}


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``check`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "check",
        help="full EC2 check of one column in one storey, with a calculation sheet",
        description="Full EN 1992-1-1 check of one column (slenderness, imperfections, second order, "
        "biaxial bending, detailing, cover, fire). " + CAUTION,
    )
    p.add_argument("spec", help="column specification, JSON or TOML (keys: see README)")
    p.add_argument("--json", action="store_true", help="print one JSON object instead of the sheet")
    p.add_argument("--html", metavar="FILE.html", help="also write the sheet as a self-contained page")
    return p


def _pair(path: str, data: dict, key: str, spec: SectionSpec) -> tuple[float, float]:
    value = data.get(key, [0.0, 0.0])
    if not isinstance(value, list) or len(value) != 2:
        raise InputError(path, key, value, "[top, bottom] in kNm")
    out = []
    for j in (0, 1):
        m = number(path, f"{key}[{j}]", value[j], unit="kNm")
        problem = spec_moment_problem(m, spec.NEd_kN or 0.0, spec.capacity)
        if problem is not None:
            raise InputError(path, f"{key}[{j}]", value[j], problem)
        out.append(m)
    return out[0], out[1]


def _length(path: str, data: dict, key: str, what: str) -> float:
    """A length key in mm that must be a storey's or a column's (InputError otherwise)."""
    value = number(path, key, data[key], positive=True, allow_zero=False, unit="mm")
    problem = spec_length_problem(value, what)
    if problem is not None:
        raise InputError(path, key, data[key], problem)
    return value


def _enum(path: str, key: str, value: Any, enum: type) -> Any:
    try:
        return enum(value)
    except ValueError:
        options = ", ".join(repr(e.value) for e in enum)
        raise InputError(path, key, value, f"one of {options}") from None


def _effective_lengths(path: str, data: dict) -> tuple[float, float, float | None, dict[str, str]]:  # noqa: PLR0912 - one branch per way of giving l0 (5.8.3.2)
    """(l0y, l0z, clear height, how each was found) in mm."""
    height = None
    if "height" in data:
        height = _length(path, data, "height", "height")
    braced = data.get("braced", True)
    if not isinstance(braced, bool):
        raise InputError(path, "braced", braced, "true or false")
    notes: dict[str, str] = {}
    l0: dict[str, float] = {}
    for ax in ("y", "z"):
        key = f"l0{ax}"
        ks = (f"k1{ax}", f"k2{ax}")
        fac_key = f"l0_factor_{ax}" if f"l0_factor_{ax}" in data else "l0_factor"
        if key in data:
            l0[ax] = _length(path, data, key, "l0")
            notes[ax] = "given"
        elif all(k in data for k in ks):
            if height is None:
                raise InputError(path, "height", None, f"needed with {ks[0]}/{ks[1]} (clear height, mm)")
            k_given = [number(path, k, data[k], positive=True) for k in ks]
            k1, k2 = (float(slenderness.k_restraint(k)) for k in k_given)
            fn = slenderness.l0_braced if braced else slenderness.l0_unbraced
            l0[ax] = float(fn(height, k1, k2))
            if braced:
                notes[ax] = (
                    f"Eq. (5.15), braced: 0.5 x {height:,.0f} x sqrt((1 + {k1:g}/(0.45 + {k1:g})) "
                    f"(1 + {k2:g}/(0.45 + {k2:g})))"
                )
            else:
                notes[ax] = f"Eq. (5.16), unbraced: clear height {height:,.0f} mm, k1 = {k1:g}, k2 = {k2:g}"
            raised = [
                f"{k} = {v:g}"
                for k, v in zip(ks, k_given, strict=True)
                if v < float(slenderness.k_restraint(v)) - 1e-12
            ]
            if raised:
                notes[ax] += f" ({', '.join(raised)} raised to the recommended minimum 0.1, 5.8.3.2(3))"
        elif fac_key in data:
            if height is None:
                raise InputError(path, "height", None, f"needed with {fac_key} (clear height, mm)")
            f = number(path, fac_key, data[fac_key], positive=True, allow_zero=False)
            l0[ax] = f * height
            notes[ax] = f"{f:g} x clear height {height:,.0f} mm"
        else:
            raise InputError(
                path, key, None, f"missing: give {key} (mm), or height with l0_factor, or {ks[0]} and {ks[1]}"
            )
        problem = spec_length_problem(l0[ax], "l0")
        if problem is not None:  # a derived length: name the inputs it came from
            raise InputError(path, key, round(l0[ax], 1), f"{problem}, from {notes[ax]}")
    return l0["y"], l0["z"], height, notes


def parse_check_spec(data: dict, path: str):  # noqa: PLR0912 - reads and validates one input file, one branch per key
    """(SectionSpec, ColumnActions, CheckSettings, l0 notes) from a loaded specification."""
    check_keys(path, "", data, SECTION_KEYS | CHECK_KEYS)
    spec = section_spec(data, path, extra_keys=CHECK_KEYS)
    if spec.NEd_kN is None:
        raise InputError(path, "NEd", None, "missing: the design axial force in kN (compression positive)")
    my, mz = _pair(path, data, "My", spec), _pair(path, data, "Mz", spec)
    l0y, l0z, height, notes = _effective_lengths(path, data)
    phi_ef = None
    if "phi_ef" in data:
        phi_ef = number(path, "phi_ef", data["phi_ef"], positive=True, maximum=10)
    optional = {}
    for key, scale, upper, unit in (
        ("M0Eqp_ratio", 1.0, 1.5, ""),
        ("char_ratio", 1.0, 1.5, ""),
        ("As_below", 1.0, 1e6, "mm2"),
        ("s_link", 1.0, 1000.0, "mm"),
        ("s_link_zone", 1.0, 1000.0, "mm"),
        ("VEd", 1e3, 1e5, "kN"),
    ):
        if key in data:
            zero_ok = key in ("M0Eqp_ratio", "char_ratio", "As_below", "VEd")
            optional[key] = (
                number(path, key, data[key], positive=True, allow_zero=zero_ok, maximum=upper, unit=unit) * scale
            )
    creep_keys = {"relative_humidity": "RH_percent", "age_at_loading": "t0_days", "cement_class": "cement"}
    creep_args = {}
    for key, field in creep_keys.items():
        if key in data:
            if key == "cement_class":
                creep_args[field] = _enum(path, key, data[key], CementClass)
            elif key == "relative_humidity":
                creep_args[field] = number(path, key, data[key], minimum=20.0, maximum=100.0, unit="%")
            else:
                creep_args[field] = number(
                    path, key, data[key], positive=True, allow_zero=False, maximum=3650.0, unit="days"
                )
    curvature_c = None
    if "curvature_c" in data:
        curvature_c = number(path, "curvature_c", data["curvature_c"], minimum=8.0, maximum=12.0)
    exposure = None
    if "exposure" in data:
        try:
            exposure = parse_exposure(data["exposure"])
        except ValueError as exc:
            raise InputError(path, "exposure", data["exposure"], str(exc)) from None
    fire = None
    if "fire" in data and data["fire"] != "none":
        text = str(data["fire"]).upper().removeprefix("R")
        try:
            fire = FireRating(int(text))
        except ValueError:
            raise InputError(
                path, "fire", data["fire"], "one of 'none', 'R30', 'R60', 'R90', 'R120', 'R180', 'R240'"
            ) from None
    settings = CheckSettings(
        imperfection=_enum(path, "imperfection", data.get("imperfection", "inclination"), ImperfectionMethod),
        min_eccentricity=_enum(path, "min_eccentricity", data.get("min_eccentricity", "both-axes"), MinEccentricity),
        biaxial=_enum(path, "biaxial", data.get("biaxial", "5.39"), BiaxialMethod),
        exact_biaxial=True,
        exposure=exposure,
        creep=CreepSettings(**creep_args),
        curvature_c=curvature_c,
        fire=fire,
        mu_fi=number(path, "mu_fi", data.get("mu_fi", 0.7), positive=True, maximum=1.0),
        aggregate=spec.aggregate_mm,
        working_life_100y=_flag(path, data, "working_life_100y"),
    )
    l0_fi = None
    if "l0_fi" in data:
        l0_fi = _length(path, data, "l0_fi", "l0")
    actions = ColumnActions(
        NEd=spec.NEd_kN * 1e3,
        My_top=my[0] * 1e6,
        My_bot=my[1] * 1e6,
        Mz_top=mz[0] * 1e6,
        Mz_bot=mz[1] * 1e6,
        l0y=l0y,
        l0z=l0z,
        l_clear=height,
        l0_fi=l0_fi,
        phi_ef=phi_ef,
        braced=data.get("braced", True),
        M0Eqp_ratio=optional.get("M0Eqp_ratio"),
        char_ratio=optional.get("char_ratio"),
        As_below=optional.get("As_below"),
        s_link=optional.get("s_link"),
        s_link_zone=optional.get("s_link_zone"),
        V_Ed=optional.get("VEd"),
    )
    return spec, actions, settings, notes


def _flag(path: str, data: dict, key: str) -> bool:
    value = data.get(key, False)
    if not isinstance(value, bool):
        raise InputError(path, key, value, "true or false")
    return value


def _jsonable(x: Any) -> Any:
    if x is None:
        return None
    if isinstance(x, (np.bool_, bool)):
        return bool(x)
    if isinstance(x, (np.floating, float)):
        return None if not np.isfinite(x) else float(x)
    if isinstance(x, (np.integer, int)):
        return int(x)
    return str(x)


def _clean(x: Any) -> Any:
    """JSON-ready copy: numpy scalars to Python, non-finite numbers to null."""
    if isinstance(x, dict):
        return {k: _clean(v) for k, v in x.items()}
    if isinstance(x, list):
        return [_clean(v) for v in x]
    return _jsonable(x) if not isinstance(x, str) else x


def check_warnings(spec: SectionSpec, actions: ColumnActions) -> list[str]:
    """Plausibility warnings of a check specification: the section's, then the moments' and lengths'."""
    moments = {
        f"{key}[{j}]": float(getattr(actions, f"{key}_{end}")) / 1e6
        for key in ("My", "Mz")
        for j, end in enumerate(("top", "bot"))
    }
    lengths = {"l0y": (float(actions.l0y), "y"), "l0z": (float(actions.l0z), "z")}
    section_only = spec_warnings(spec.path, None, spec.capacity)
    more = spec_warnings(spec.path, None, spec.capacity, moments, lengths)
    return [*spec.warnings, *(w for w in more if w not in section_only)]


def _payload(result, v: dict, warnings: list[str]) -> dict:
    """The ``--json`` object: overall outcome, governing check of each kind, every check, every value."""
    flagged = {c.name for c in result.unverified}
    payload = {
        "lambda_y": v["lambda_y"],
        "lambda_z": v["lambda_z"],
        "lambda_lim_y": v["lambda_lim_y"],
        "lambda_lim_z": v["lambda_lim_z"],
        "MEdy_kNm": v["MEdy"] / 1e6,
        "MEdz_kNm": v["MEdz"] / 1e6,
        "MRdy_kNm": v["MRdy"] / 1e6,
        "MRdz_kNm": v["MRdz"] / 1e6,
        "NEd_kN": v["NEd"] / 1e3,
        "NRd_kN": v["NRd"] / 1e3,
        "utilisation": result.utilisation,
        "governing": result.governing.name,
        "governing_clause": result.governing.clause,
        "governing_applicable": result.governing.applicable,
        "ok": result.ok,
    }
    by_kind = dict(kind_summary(result))
    for kind in CheckKind:
        ch = by_kind.get(kind)
        payload[f"utilisation_{kind.value}"] = None if ch is None else (ch.utilisation if ch.applicable else None)
        payload[f"governing_{kind.value}"] = None if ch is None else ch.name
        payload[f"governing_{kind.value}_clause"] = None if ch is None else ch.clause
    payload.update(
        {
            "not_verified": sorted(flagged),
            "checks": [
                {
                    "name": c.name,
                    "kind": str(getattr(c.kind, "value", c.kind)),
                    "clause": c.clause,
                    "demand": c.demand,
                    "capacity": c.capacity,
                    "unit": c.unit,
                    "utilisation": c.utilisation if c.applicable else None,
                    "ok": c.ok,
                    "applicable": c.applicable,
                    "note": c.note,
                }
                for c in result.checks
            ],
            "values": {k: _jsonable(x) for k, x in v.items()},
            "warnings": list(warnings),
            "caution": CAUTION,
        }
    )
    return payload


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack check``: 0 when the column passes, 1 when it fails (2 for bad input, raised)."""
    path = str(args.spec)
    data = load_spec_file(path)
    spec, actions, settings, notes = parse_check_spec(data, path)
    if args.html and Path(args.html).resolve() == Path(path).resolve():
        raise InputError("--html", "--html", args.html, "a new file, not the specification itself")
    warnings = check_warnings(spec, actions)
    result = check_column(spec.design, actions, settings, spec.params)
    title = f"colstack check  {Path(path).name}  ({spec.design.section.label}, {spec.design.concrete.name})"
    sheet = build_sheet(title, spec.design, actions, result, spec.params, notes, warnings)
    if args.html:
        out = Path(args.html)
        out.parent.mkdir(parents=True, exist_ok=True)
        out.write_text(render_html(sheet), encoding="utf-8")
    for w in warnings:
        print(f"colstack check: warning: {w}", file=sys.stderr)
    if args.json:
        print(json.dumps(_clean(_payload(result, result.values, warnings)), indent=2, allow_nan=False))
    else:
        print(render_text(sheet))
        if args.html:
            print(f"\nsheet written to {args.html}")
    return EXIT_PASS if result.ok else EXIT_FAIL
