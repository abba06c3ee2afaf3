"""``colstack fire SPEC``: fire resistance of one rectangular column section by the 500 C isotherm method.

The temperature field of the section under the standard fire (EN 1991-1-2, Eq. (3.4)) comes from a
two-dimensional transient heat-conduction analysis with the thermal properties of EN 1992-1-2, 3.3
(``design.heat.thermal``); the resistance from the 500 C isotherm method of EN 1992-1-2, Annex B.1
(``design.heat.isotherm``): the concrete hotter than 500 C is disregarded, each bar counts at the
strength of its own temperature (Table 3.2a), partial factors 1.0.

SPEC (JSON or TOML) has the keys of ``colstack section`` (a rectangle) plus ``fire`` (the rating,
"R30" to "R240"), and the actions in fire either as ``NEd_fi``, ``My_fi``, ``Mz_fi`` (kN, kNm) or
as the design actions ``NEd``, ``My``, ``Mz`` (kN, kNm: the larger end moment) times ``eta_fi``
(EN 1992-1-2, 2.4.2; 0.7 when not given, the simplification of 2.4.2(3), said in the output);
optional ``exposed_sides`` (the faces "+y", "-y", "+z", "-z" heated by the fire; all four by
default) and ``aggregate_type`` ("siliceous" or "calcareous": it does not change the thermal
properties of 3.3 nor the 500 C method, only the zone method, and is recorded). The key
``aggregate`` keeps its meaning of ``colstack section`` (maximum aggregate size, mm).

Exit status: 0 when the section passes in fire, 1 when it fails a check, 2 for bad input.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path
from typing import Any

import numpy as np

from design.fire import FireRating
from design.heat.isotherm import ETA_FI_SIMPLIFIED, MIN_WIDTH_TABLE_B1, check_fire_isotherm, fire_resistance
from design.heat.thermal import ThermalSettings, isotherm_depth, solve_section, temperature_at
from design.sections import RectSection
from optimizer import CAUTION
from optimizer.cli.spec import load_spec_file, number, plot_target, section_spec
from optimizer.errors import InputError

__all__ = ["add_parser", "run", "FIRE_KEYS", "FIRE_CAUTION"]

FIRE_KEYS = {"fire", "NEd_fi", "My_fi", "Mz_fi", "My", "Mz", "eta_fi", "exposed_sides", "aggregate_type"}
FACES = ("+y", "-y", "+z", "-z")
METHOD = "500 C isotherm, EN 1992-1-2 Annex B.1"
FIRE_CAUTION = (
    "Fire: the verification is for the standard fire (EN 1991-1-2, 3.2.1) only; the assumptions of the "
    "500 C isotherm method are the engineer's responsibility, and local regulations and a competent fire "
    "engineer decide."
)


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``fire`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "fire",
        help="fire resistance of one section: temperatures and the 500 C isotherm method",
        description="Temperatures of one rectangular column section under the standard fire and its "
        "resistance by the 500 C isotherm method (EN 1992-1-2, Annex B.1). " + CAUTION,
    )
    p.add_argument("spec", help="section specification with a fire rating, JSON or TOML (keys: see README)")
    p.add_argument("--json", action="store_true", help="print one JSON object instead of text")
    p.add_argument("--plot", metavar="FILE.png", help="draw the temperature field, the bars and the 500 C line")
    return p


def _moment(path: str, data: dict[str, Any], key: str) -> float:
    """The larger end moment of ``key`` (a number or [top, bottom]), kNm, as a magnitude."""
    value = data[key]
    if isinstance(value, list):
        if len(value) != 2:
            raise InputError(path, key, value, "a moment in kNm or [top, bottom] in kNm")
        return max(abs(number(path, f"{key}[{j}]", value[j], unit="kNm")) for j in (0, 1))
    return abs(number(path, key, value, unit="kNm"))


def _actions(path: str, data: dict[str, Any], NEd_kN: float | None) -> tuple[float, float, float, str]:
    """(NEd,fi kN, MEdy,fi kNm, MEdz,fi kNm, how they were found)."""
    if "NEd_fi" in data:
        n = number(path, "NEd_fi", data["NEd_fi"], unit="kN")
        my = abs(number(path, "My_fi", data.get("My_fi", 0.0), unit="kNm"))
        mz = abs(number(path, "Mz_fi", data.get("Mz_fi", 0.0), unit="kNm"))
        return n, my, mz, "actions in fire given"
    if NEd_kN is None:
        raise InputError(path, "NEd_fi", None, "the axial load in fire (kN), or NEd (kN) with eta_fi")
    if "eta_fi" in data:
        eta = number(path, "eta_fi", data["eta_fi"], positive=True, allow_zero=False, maximum=1.0)
        how = f"eta_fi = {eta:g} given (EN 1992-1-2, 2.4.2)"
    else:
        eta = ETA_FI_SIMPLIFIED
        how = f"eta_fi = {eta:g}, the simplification of EN 1992-1-2, 2.4.2(3) (give eta_fi for less)"
    my = _moment(path, data, "My") if "My" in data else 0.0
    mz = _moment(path, data, "Mz") if "Mz" in data else 0.0
    return eta * NEd_kN, eta * my, eta * mz, how


def _faces(path: str, data: dict[str, Any]) -> tuple[str, ...]:
    value = data.get("exposed_sides", list(FACES))
    if not isinstance(value, list) or not value or any(v not in FACES for v in value) or len(set(value)) != len(value):
        raise InputError(path, "exposed_sides", value, 'a list of distinct faces among "+y", "-y", "+z", "-z"')
    return tuple(v for v in FACES if v in value)


def _rating(path: str, data: dict[str, Any]) -> FireRating:
    if "fire" not in data:
        raise InputError(path, "fire", None, 'missing: the fire rating, e.g. "R90"')
    text = str(data["fire"]).upper().removeprefix("R")
    try:
        return FireRating(int(text))
    except ValueError:
        options = ", ".join(repr(r.name) for r in FireRating)
        raise InputError(path, "fire", data["fire"], f"one of {options}") from None


def analyse(data: dict[str, Any], path: str) -> dict[str, Any]:
    """The whole fire analysis of a specification, as plain data (kN, kNm, mm, C)."""
    spec = section_spec(data, path, extra_keys=FIRE_KEYS)
    sec = spec.design.section
    if not isinstance(sec, RectSection):
        raise InputError(path, "diameter", data.get("diameter"), "a rectangle (b, h): circles are not yet analysed")
    rating = _rating(path, data)
    faces = _faces(path, data)
    aggregate = data.get("aggregate_type", "siliceous")
    if aggregate not in ("siliceous", "calcareous"):
        raise InputError(path, "aggregate_type", aggregate, '"siliceous" or "calcareous"')
    NEd_fi, My_fi, Mz_fi, how = _actions(path, data, spec.NEd_kN)
    thermal = solve_section(sec.b, sec.h, [float(rating.value)], ThermalSettings(exposed=faces))
    y, z, dia = sec.bar_coords()
    theta = temperature_at(thermal, 0, y, z)
    depth = isotherm_depth(thermal, 0, 500.0)
    a500 = {f: float(depth.get(f, 0.0)) for f in FACES}
    fck, fyk = spec.design.concrete.fck, spec.design.steel.fyk
    res = fire_resistance(sec, fck, fyk, theta, a500, NEd_fi * 1e3)
    # Table B.1 gives minimum widths from R60 on (none for R30)
    in_table = rating.value if rating.value in MIN_WIDTH_TABLE_B1 else None
    checks = check_fire_isotherm(
        sec, fck, fyk, theta, a500, NEd_fi * 1e3, My_fi * 1e6, Mz_fi * 1e6, rating_minutes=in_table, resistance=res
    )
    utils = [c.utilisation if c.applicable else float("inf") for c in checks]
    governing = checks[int(np.argmax(utils))]
    return {
        "section": sec.label,
        "grade": spec.design.concrete.name,
        "rating": rating.name,
        "method": METHOD,
        "exposed_sides": list(faces),
        "aggregate_type": aggregate,
        "actions": how,
        "NEd_fi_kN": NEd_fi,
        "MEdy_fi_kNm": My_fi,
        "MEdz_fi_kNm": Mz_fi,
        "bars": [
            {"y_mm": float(yy), "z_mm": float(zz), "dia_mm": float(d), "theta_C": float(t), "ks": float(k)}
            for yy, zz, d, t, k in zip(y, z, dia, theta, res.ks, strict=True)
        ],
        "isotherm_500_depth_mm": max(a500[f] for f in faces),
        "isotherm_500_depth_by_face_mm": a500,
        "reduced_section_mm": [res.reduced.b_fi, res.reduced.h_fi],
        "NRd_fi_kN": res.NRd_fi / 1e3,
        "MRdy_fi_kNm": res.MRdy_fi / 1e6,
        "MRdz_fi_kNm": res.MRdz_fi / 1e6,
        "utilisation_fi": max(utils),
        "governing": governing.name,
        "ok": all(c.ok for c in checks),
        "checks": [
            {
                "name": c.name,
                "clause": c.clause,
                "demand": c.demand,
                "capacity": c.capacity,
                "unit": c.unit,
                "utilisation": c.utilisation if c.applicable else None,
                "ok": c.ok,
                "note": c.note,
            }
            for c in checks
        ],
        "warnings": list(spec.warnings),
        "_thermal": thermal,
    }


def _text(out: dict[str, Any], path: str) -> str:
    lines = [
        f"colstack fire  {Path(path).name}  ({out['section']}, {out['grade']}, {out['rating']})",
        CAUTION,
        FIRE_CAUTION,
        "",
    ]
    lines.append(f"  method           {out['method']}; exposed faces {', '.join(out['exposed_sides'])}")
    lines.append(
        f"  actions in fire  NEd,fi = {out['NEd_fi_kN']:,.0f} kN, MEdy,fi = {out['MEdy_fi_kNm']:,.1f} kNm, "
        f"MEdz,fi = {out['MEdz_fi_kNm']:,.1f} kNm ({out['actions']})"
    )
    lines.append(
        f"  500 C isotherm   {out['isotherm_500_depth_mm']:.0f} mm below the middle of a heated face; "
        f"reduced section {out['reduced_section_mm'][0]:.0f} x {out['reduced_section_mm'][1]:.0f} mm"
    )
    hot = max(out["bars"], key=lambda b: b["theta_C"])
    cool = min(out["bars"], key=lambda b: b["theta_C"])
    lines.append(
        f"  bars             {len(out['bars'])} bars from {cool['theta_C']:.0f} C (ks {cool['ks']:.2f}) to "
        f"{hot['theta_C']:.0f} C (ks {hot['ks']:.2f})  [Table 3.2a]"
    )
    lines.append(f"  NRd,fi           {out['NRd_fi_kN']:,.0f} kN")
    lines.append(f"  MRdy,fi, MRdz,fi {out['MRdy_fi_kNm']:,.1f} kNm, {out['MRdz_fi_kNm']:,.1f} kNm at NEd,fi")
    lines.append("")
    for c in out["checks"]:
        u = "not applicable" if c["utilisation"] is None else f"{c['utilisation']:.3f}"
        lines.append(f"  {c['name']:<52.52} {u:>14}  {'ok' if c['ok'] else 'FAILS'}  [{c['clause']}]")
    verdict = "PASSES" if out["ok"] else "FAILS"
    lines += ["", f"{verdict} in fire: utilisation {out['utilisation_fi']:.3f}, governed by {out['governing']}"]
    return "\n".join(lines)


def _plot(out: dict[str, Any], path: Path) -> None:
    """Temperature field of the section at the rating, the bars and the 500 C line."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    th = out["_thermal"]
    fig, ax = plt.subplots(figsize=(6, 5.5))
    Y, Z = np.meshgrid(th.y, th.z, indexing="ij")
    cs = ax.contourf(Y, Z, th.theta[0], levels=20, cmap="inferno")
    ax.contour(Y, Z, th.theta[0], levels=[500.0], colors="cyan", linewidths=1.5)
    for bar in out["bars"]:
        ax.add_patch(plt.Circle((bar["y_mm"], bar["z_mm"]), bar["dia_mm"] / 2, fill=False, color="white"))
    fig.colorbar(cs, ax=ax, label="temperature [C]")
    ax.set_aspect("equal")
    ax.set_xlabel("y [mm]")
    ax.set_ylabel("z [mm]")
    ax.set_title(f"{out['section']}, {out['rating']}: 500 C line (cyan)", fontsize=10)
    fig.text(
        0.5,
        0.005,
        "Concept design only: standard fire; verify under local regulations.",
        ha="center",
        fontsize=7,
        color="0.4",
    )
    path.parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(path, dpi=120)
    plt.close(fig)


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack fire``."""
    data = load_spec_file(args.spec)
    out = analyse(data, str(args.spec))
    if args.plot:
        _plot(out, plot_target(args.plot, args.spec))
    for w in out["warnings"]:
        print(f"colstack fire: warning: {w}", file=sys.stderr)
    out.pop("_thermal")
    if args.json:
        out["caution"] = CAUTION + " " + FIRE_CAUTION
        print(json.dumps(out, indent=2))
    else:
        print(_text(out, str(args.spec)))
        if args.plot:
            print(f"\n  temperature field written to {args.plot}")
    return 0 if out["ok"] else 1
