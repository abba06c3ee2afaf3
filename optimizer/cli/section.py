"""``colstack section SPEC``: what one reinforced-concrete column section resists.

Prints NRd, the tension resistance and MRdy, MRdz at the given NEd (at 0 when
NEd is absent); ``--json`` prints one JSON object; ``--plot FILE.png`` draws
both N-M interaction curves with the NEd point marked.

Values that cannot be meant (a side of 0.4 mm, a force fifty times the squash
load: see :mod:`optimizer.building.plausibility`) are input errors (exit status 2);
unusual ones are warnings on stderr and in the ``warnings`` list of ``--json``.
Exit status 0 otherwise: the command reports resistances, it judges nothing.
"""

from __future__ import annotations

import argparse
import json
import sys
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from design.resistance import DesignSection, SectionBatch
from design.sections import RectSection, check_bar_spacing
from optimizer import CAUTION
from optimizer.cli.spec import SectionSpec, load_spec_file, plot_target, section_spec

__all__ = ["add_parser", "run", "SectionReport", "evaluate"]


@dataclass(frozen=True)
class SectionReport:
    """Resistances of one section at one axial load (edge units: kN, kNm, mm2)."""

    label: str
    NEd_kN: float
    NRd_kN: float
    NRd_tension_kN: float
    MRdy_kNm: float
    MRdz_kNm: float
    As_mm2: float
    Ac_mm2: float

    @property
    def rho(self) -> float:
        """Steel ratio As / Ac."""
        return self.As_mm2 / self.Ac_mm2


def evaluate(ds: DesignSection, NEd_kN: float) -> SectionReport:
    """Resistances of ``ds`` at ``NEd_kN`` (compression positive)."""
    batch = SectionBatch([ds])
    NEd = np.array([NEd_kN * 1e3])
    return SectionReport(
        label=ds.section.label,
        NEd_kN=NEd_kN,
        NRd_kN=float(batch.NRd()[0]) / 1e3,
        NRd_tension_kN=float(batch.NRd_tension()[0]) / 1e3,
        MRdy_kNm=float(batch.moment_resistance(NEd, "y")[0]) / 1e6,
        MRdz_kNm=float(batch.moment_resistance(NEd, "z")[0]) / 1e6,
        As_mm2=ds.section.As,
        Ac_mm2=ds.section.Ac,
    )


def add_parser(subparsers: argparse._SubParsersAction) -> argparse.ArgumentParser:
    """Register ``section`` on an argparse subparsers object."""
    p = subparsers.add_parser(
        "section",
        help="resistance of one column section (NRd, MRdy, MRdz at NEd)",
        description="Resistance of one column section by strain compatibility (EN 1992-1-1, 6.1). " + CAUTION,
    )
    p.add_argument("spec", help="section specification, JSON or TOML (keys: see README)")
    p.add_argument("--json", action="store_true", help="print one JSON object instead of text")
    p.add_argument("--plot", metavar="FILE.png", help="draw both N-M interaction curves to FILE.png")
    return p


def _text(spec: SectionSpec, rep: SectionReport, dg_note: str, overrides: dict | None = None) -> str:
    ds = spec.design
    sec, c, s = ds.section, ds.concrete, ds.steel
    if isinstance(sec, RectSection):
        shape = f"{sec.b:g} x {sec.h:g} mm rectangle (b along y, h along z)"
        arm_y, arm_z = "lever arm along h", "lever arm along b"
    else:
        shape = f"circle, diameter {sec.diameter:g} mm"
        arm_y = arm_z = "lever arm along the diameter"
    changed = [f"{k} = {v:g}" for k, v in (overrides or {}).items() if isinstance(v, (int, float))]
    params_text = spec.params.name + (f", with {', '.join(changed)}" if changed else "")
    spacing = check_bar_spacing(sec, spec.aggregate_mm)
    lines = [
        f"colstack section  {Path(spec.path).name}",
        CAUTION,
        "",
        f"  section          {shape}",
        f"  cover, links     {sec.cover:g} mm nominal cover to {sec.link:g} mm links",
        f"  bars             {sec.bars.notation}, As = {rep.As_mm2:,.0f} mm2 "
        f"({100 * rep.rho:.2f} % of Ac = {rep.Ac_mm2:,.0f} mm2)",
        f"  concrete         {c.name}: fck {c.fck:g} MPa, fcd = alpha_cc fck / gamma_c = "
        f"{c.alpha_cc:g} x {c.fck:g} / {c.gamma_c:g} = {c.fcd:.2f} MPa  [EN 1992-1-1 Eq. (3.15)]",
        f"                   {ds.law.value} law, eps_c2 = {1e3 * c.eps_c2:.2f} per mille, eps_cu2 = "
        f"{1e3 * c.eps_cu2:.2f} per mille, n = {c.n:.2f}  [Table 3.1]",
        f"  steel            fyk {s.fyk:g} MPa, fyd = {s.fyd:.1f} MPa, Es = {s.Es / 1e3:g} GPa, class "
        f"{s.ductility.value}, {s.branch.value} top branch  [3.2.7(2)]",
        f"  parameters       {params_text}",
        "",
        f"  NRd              {rep.NRd_kN:,.0f} kN   pure compression, uniform strain eps_c2  [6.1(5)]",
        f"  NRd,t            {rep.NRd_tension_kN:,.0f} kN   pure tension (steel only; tension negative)",
        f"  at NEd = {rep.NEd_kN:,.0f} kN:",
        f"  MRdy             {rep.MRdy_kNm:,.1f} kNm   about y, {arm_y}  [6.1, strain compatibility]",
        f"  MRdz             {rep.MRdz_kNm:,.1f} kNm   about z, {arm_z}",
        f"  bar spacing      clear {spacing.capacity:.0f} mm, minimum {spacing.demand:.0f} mm "
        f"({'ok' if spacing.ok else 'TOO CLOSE'})  [8.2(2)]{dg_note}",
    ]
    if rep.NEd_kN > rep.NRd_kN:
        lines.append(f"  NEd exceeds NRd: the section cannot carry {rep.NEd_kN:,.0f} kN")
    return "\n".join(lines)


def plot_interaction(ds: DesignSection, NEd_kN: float, path: Path) -> None:
    """Draw the N-M curves about y and z (both bending senses) with the NEd point."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    batch = SectionBatch([ds])
    fig, axes = plt.subplots(1, 2, figsize=(10, 5), sharey=True)
    NEd = np.array([NEd_kN * 1e3])
    panels = ((axes[0], "y", "bending about y (MRdy)"), (axes[1], "z", "bending about z (MRdz)"))
    for ax, axis, title in panels:
        Np, Mp = batch.interaction_curve(axis, 181, positive=True)
        Nn, Mn = batch.interaction_curve(axis, 181, positive=False)
        ax.plot(Mp[0] / 1e6, Np[0] / 1e3, color="tab:blue", label="resistance")
        ax.plot(-Mn[0] / 1e6, Nn[0] / 1e3, color="tab:blue")
        MRd = batch.moment_resistance(NEd, axis)[0] / 1e6
        ax.axhline(NEd_kN, color="0.6", lw=0.8, ls="--")
        ax.plot([MRd, -MRd], [NEd_kN, NEd_kN], "o", color="tab:red", label=f"MRd at NEd = {MRd:,.0f} kNm")
        ax.set_title(title)
        ax.set_xlabel("M [kNm]")
        ax.grid(True, lw=0.3)
        ax.legend(loc="lower right", fontsize=8)
    axes[0].set_ylabel("N [kN] (compression positive)")
    fig.suptitle(f"{ds.section.label}, {ds.concrete.name}: N-M interaction (EN 1992-1-1, 6.1)")
    fig.text(
        0.5,
        0.005,
        "Concept design only: verify under the local code and national annex.",
        ha="center",
        fontsize=7,
        color="0.4",
    )
    fig.tight_layout(rect=(0, 0.02, 1, 1))
    path.parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(path, dpi=120)
    plt.close(fig)


def run(args: argparse.Namespace) -> int:
    """Execute ``colstack section``."""
    data = load_spec_file(args.spec)
    spec = section_spec(data, str(args.spec))
    NEd_kN = spec.NEd_kN if spec.NEd_kN is not None else 0.0
    rep = evaluate(spec.design, NEd_kN)
    if args.plot:
        plot_interaction(spec.design, NEd_kN, plot_target(args.plot, args.spec))
    for w in spec.warnings:
        print(f"colstack section: warning: {w}", file=sys.stderr)
    if args.json:
        payload = {
            "section": rep.label,
            "NEd_kN": rep.NEd_kN,
            "NRd_kN": rep.NRd_kN,
            "NRd_tension_kN": rep.NRd_tension_kN,
            "MRdy_kNm": rep.MRdy_kNm,
            "MRdz_kNm": rep.MRdz_kNm,
            "As_mm2": rep.As_mm2,
            "Ac_mm2": rep.Ac_mm2,
            "rho": rep.rho,
            "fck_MPa": spec.design.concrete.fck,
            "fcd_MPa": spec.design.concrete.fcd,
            "fyd_MPa": spec.design.steel.fyd,
            "law": spec.design.law.value,
            "parameters": spec.params.name,
            "warnings": list(spec.warnings),
            "caution": CAUTION,
        }
        print(json.dumps(payload, indent=2))
    else:
        note = "" if "aggregate" in data else " (aggregate 20 mm assumed)"
        overrides = data.get("parameters") if isinstance(data.get("parameters"), dict) else None
        print(_text(spec, rep, note, overrides))
        if args.plot:
            print(f"\n  interaction curves written to {args.plot}")
    sys.stdout.flush()
    return 0
