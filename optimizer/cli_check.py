"""``colstack check SPEC``: the full EC2 check of one column in one storey, as a calculation sheet.

SPEC (JSON or TOML) has the keys of ``colstack section`` plus the actions and
buckling data: ``NEd`` (kN), ``My`` = [top, bottom] and ``Mz`` = [top, bottom]
(kNm, first-order, same sign at both ends = single curvature), and either
``l0y``/``l0z`` (mm) or ``height`` (clear height, mm) with ``l0_factor`` (or
``l0_factor_y``/``l0_factor_z``) or the end-restraint flexibilities ``k1y``,
``k2y``, ``k1z``, ``k2z`` (EN 1992-1-1 Eq. (5.15) braced, (5.16) unbraced).
Optional: ``braced``, ``phi_ef``, ``exposure``, ``fire`` ("R90"), ``mu_fi``,
``imperfection``, ``min_eccentricity``, ``biaxial``, ``working_life_100y``.
"""

from __future__ import annotations

import argparse
import json
from pathlib import Path
from typing import Any

import numpy as np

from design import slenderness
from design.cover import ExposureClass
from design.fire import FireRating
from design.member import BiaxialMethod, CheckSettings, ColumnActions, MinEccentricity, check_column
from design.slenderness import ImperfectionMethod
from optimizer import CAUTION
from optimizer.errors import InputError
from optimizer.sheet import build_sheet, render_html, render_text
from optimizer.spec import SECTION_KEYS, check_keys, load_spec_file, number, section_spec

__all__ = ["add_parser", "run", "parse_check_spec"]

CHECK_KEYS = {
    "My", "Mz", "l0y", "l0z", "height", "l0_factor", "l0_factor_y", "l0_factor_z", "k1y", "k2y", "k1z",
    "k2z", "braced", "phi_ef", "exposure", "fire", "mu_fi", "imperfection", "min_eccentricity", "biaxial",
    "working_life_100y", "l0_fi",
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


def _pair(path: str, data: dict, key: str) -> tuple[float, float]:
    value = data.get(key, [0.0, 0.0])
    if not isinstance(value, list) or len(value) != 2:
        raise InputError(path, key, value, "[top, bottom] in kNm")
    return (number(path, f"{key}[0]", value[0], unit="kNm"), number(path, f"{key}[1]", value[1], unit="kNm"))


def _enum(path: str, key: str, value: Any, enum: type) -> Any:
    try:
        return enum(value)
    except ValueError:
        options = ", ".join(repr(e.value) for e in enum)
        raise InputError(path, key, value, f"one of {options}") from None


def _effective_lengths(path: str, data: dict) -> tuple[float, float, float | None, dict[str, str]]:
    """(l0y, l0z, clear height, how each was found) in mm."""
    height = None
    if "height" in data:
        height = number(path, "height", data["height"], positive=True, allow_zero=False, unit="mm")
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
            l0[ax] = number(path, key, data[key], positive=True, allow_zero=False, unit="mm")
            notes[ax] = "given"
        elif all(k in data for k in ks):
            if height is None:
                raise InputError(path, "height", None, f"needed with {ks[0]}/{ks[1]} (clear height, mm)")
            k1 = number(path, ks[0], data[ks[0]], positive=True)
            k2 = number(path, ks[1], data[ks[1]], positive=True)
            fn = slenderness.l0_braced if braced else slenderness.l0_unbraced
            l0[ax] = float(fn(height, k1, k2))
            notes[ax] = f"{'Eq. (5.15) braced' if braced else 'Eq. (5.16) unbraced'}, k1 = {k1:g}, k2 = {k2:g}"
        elif fac_key in data:
            if height is None:
                raise InputError(path, "height", None, f"needed with {fac_key} (clear height, mm)")
            f = number(path, fac_key, data[fac_key], positive=True, allow_zero=False)
            l0[ax] = f * height
            notes[ax] = f"{f:g} x clear height {height:,.0f} mm"
        else:
            raise InputError(path, key, None,
                             f"missing: give {key} (mm), or height with l0_factor, or {ks[0]} and {ks[1]}")
    return l0["y"], l0["z"], height, notes


def parse_check_spec(data: dict, path: str):
    """(SectionSpec, ColumnActions, CheckSettings, l0 notes) from a loaded specification."""
    check_keys(path, "", data, SECTION_KEYS | CHECK_KEYS)
    spec = section_spec(data, path, extra_keys=CHECK_KEYS)
    if spec.NEd_kN is None:
        raise InputError(path, "NEd", None, "missing: the design axial force in kN (compression positive)")
    my, mz = _pair(path, data, "My"), _pair(path, data, "Mz")
    l0y, l0z, height, notes = _effective_lengths(path, data)
    phi_ef = None
    if "phi_ef" in data:
        phi_ef = number(path, "phi_ef", data["phi_ef"], positive=True, maximum=10)
    fire = None
    if "fire" in data:
        text = str(data["fire"]).upper().removeprefix("R")
        try:
            fire = FireRating(int(text))
        except ValueError:
            raise InputError(path, "fire", data["fire"], "one of R30, R60, R90, R120, R180, R240") from None
    settings = CheckSettings(
        imperfection=_enum(path, "imperfection", data.get("imperfection", "inclination"), ImperfectionMethod),
        min_eccentricity=_enum(path, "min_eccentricity", data.get("min_eccentricity", "both-axes"),
                               MinEccentricity),
        biaxial=_enum(path, "biaxial", data.get("biaxial", "5.39"), BiaxialMethod),
        exact_biaxial=True,
        exposure=_enum(path, "exposure", data["exposure"], ExposureClass) if "exposure" in data else None,
        fire=fire,
        mu_fi=number(path, "mu_fi", data.get("mu_fi", 0.7), positive=True, maximum=1.0),
        aggregate=spec.aggregate_mm,
        working_life_100y=_flag(path, data, "working_life_100y"),
    )
    l0_fi = None
    if "l0_fi" in data:
        l0_fi = number(path, "l0_fi", data["l0_fi"], positive=True, allow_zero=False, unit="mm")
    actions = ColumnActions(
        NEd=spec.NEd_kN * 1e3, My_top=my[0] * 1e6, My_bot=my[1] * 1e6, Mz_top=mz[0] * 1e6, Mz_bot=mz[1] * 1e6,
        l0y=l0y, l0z=l0z, l_clear=height, l0_fi=l0_fi, phi_ef=phi_ef,
    )
    return spec, actions, settings, notes


def _flag(path: str, data: dict, key: str) -> bool:
    value = data.get(key, False)
    if not isinstance(value, bool):
        raise InputError(path, key, value, "true or false")
    return value


def _jsonable(x: Any) -> Any:
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


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack check``."""
    path = str(args.spec)
    data = load_spec_file(path)
    spec, actions, settings, notes = parse_check_spec(data, path)
    result = check_column(spec.design, actions, settings, spec.params)
    title = f"colstack check  {Path(path).name}  ({spec.design.section.label}, {spec.design.concrete.name})"
    sheet = build_sheet(title, spec.design, actions, result, spec.params, notes)
    if args.html:
        out = Path(args.html)
        if out.resolve() == Path(path).resolve():
            raise InputError("--html", "--html", args.html, "a new file, not the specification itself")
        out.parent.mkdir(parents=True, exist_ok=True)
        out.write_text(render_html(sheet), encoding="utf-8")
    v = result.values
    if args.json:
        payload = {
            "lambda_y": v["lambda_y"], "lambda_z": v["lambda_z"],
            "lambda_lim_y": v["lambda_lim_y"], "lambda_lim_z": v["lambda_lim_z"],
            "MEdy_kNm": v["MEdy"] / 1e6, "MEdz_kNm": v["MEdz"] / 1e6,
            "MRdy_kNm": v["MRdy"] / 1e6, "MRdz_kNm": v["MRdz"] / 1e6,
            "NEd_kN": v["NEd"] / 1e3, "NRd_kN": v["NRd"] / 1e3,
            "utilisation": result.utilisation, "governing": result.governing.name,
            "governing_clause": result.governing.clause, "ok": result.ok,
            "checks": [
                {"name": c.name, "clause": c.clause, "demand": c.demand, "capacity": c.capacity, "unit": c.unit,
                 "utilisation": c.utilisation, "ok": c.ok, "applicable": c.applicable, "note": c.note}
                for c in result.checks
            ],
            "values": {k: _jsonable(x) for k, x in v.items()},
            "caution": CAUTION,
        }
        print(json.dumps(_clean(payload), indent=2, allow_nan=False))
    else:
        print(render_text(sheet))
        if args.html:
            print(f"\nsheet written to {args.html}")
    return 0
