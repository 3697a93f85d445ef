#!/usr/bin/env python3
"""Compare two fuels with the dropcut Python package: the d² curve of one droplet of each, and how the derived
cetane number (DCN) of the remaining liquid drifts as the droplet evaporates. Writes two PNG charts and one CSV.

    python examples/python/compare_fuels.py OUT_DIR [--fuels demo-narrow demo-wide] [--ambient-temperature 800K]
        [--pressure 10bar] [--diameter 50um] [--velocity 0]

Notebook-free (matplotlib's Agg backend, no display). Quantities take SI numbers or strings with units, as on
the command line. The demo fuels are invented compositions; the indicators are model estimates for screening,
not certification.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402  (after the backend choice)
import pandas as pd  # noqa: E402

import dropcut  # noqa: E402


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("out", type=Path, help="folder for the charts (created)")
    ap.add_argument("--fuels", nargs=2, default=["demo-narrow", "demo-wide"], help="two fuel ids or fuel files")
    ap.add_argument("--ambient-temperature", default="800K")
    ap.add_argument("--pressure", default="10bar")
    ap.add_argument("--diameter", default="50um")
    ap.add_argument("--velocity", default="0")
    args = ap.parse_args(argv)
    args.out.mkdir(parents=True, exist_ok=True)

    conditions = dict(ambient_temperature=args.ambient_temperature, pressure=args.pressure, diameter=args.diameter, velocity=args.velocity)
    try:
        runs = {name: dropcut.simulate(dropcut.Fuel.load(name), **conditions) for name in args.fuels}
    except dropcut.DropcutError as e:
        print(f"error: {e}", file=sys.stderr)
        return 2

    fig, ax = plt.subplots(figsize=(6.4, 4.2), dpi=120)
    for name, r in runs.items():
        h = r.history
        ax.plot(h["time_over_d0sq_s_m2"] * 1e-6, h["d2_ratio"], label=name)  # s/m² → s/mm²
    ax.set_xlabel("t / d₀² [s/mm²]")
    ax.set_ylabel("(d / d₀)² [-]")
    ax.set_title(f"d² curves at {args.ambient_temperature}, {args.pressure}, d₀ = {args.diameter}")
    ax.set_ylim(bottom=0)
    ax.grid(alpha=0.3)
    ax.legend()
    fig.tight_layout()
    fig.savefig(args.out / "d2.png")
    plt.close(fig)

    fig, ax = plt.subplots(figsize=(6.4, 4.2), dpi=120)
    rows = []
    for name, r in runs.items():
        res = r.residue[r.residue["layer"] == "mean"]
        ax.plot(100 * res["evaporated_fraction"], res["dcn"], marker="o", label=name)
        rows.append(pd.DataFrame({"fuel": name, "evaporated_fraction": res["evaporated_fraction"], "dcn": res["dcn"]}))
    ax.set_xlabel("evaporated mass [%]")
    ax.set_ylabel("derived cetane number of the remaining liquid")
    ax.set_title("Residue DCN along the droplet life (model estimate)")
    ax.grid(alpha=0.3)
    ax.legend()
    fig.tight_layout()
    fig.savefig(args.out / "residue_dcn.png")
    plt.close(fig)
    pd.concat(rows).to_csv(args.out / "residue_dcn.csv", index=False)

    for name, r in runs.items():
        o = r.summary
        print(f"{name}: lifetime {o['lifetime_s'] * 1e3:.3f} ms, t50 {o['t50_s'] * 1e3:.3f} ms")
    print(f"wrote d2.png, residue_dcn.png and residue_dcn.csv in {args.out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
