#!/usr/bin/env python3
"""Saturated-liquid and saturated-vapour specific enthalpies of n-dodecane for the table enthalpy check.

Writes validation/coolprop/n-dodecane_enthalpy.csv: h(Q=0) and h(Q=1) at T on a 5 K grid from 300 K to
590 K (0.9 Tc), both relative to the saturated liquid at 298.15 K (the reference state of dropcut's table
enthalpy columns), from CoolProp's reference equation of state for n-dodecane (Lemmon & Huber 2004).

Rerun:  pip install coolprop==8.0.0
        python3 validation/enthalpy_reference.py
"""

import datetime
import os

import CoolProp
import CoolProp.CoolProp as CP

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "coolprop", "n-dodecane_enthalpy.csv")
FLUID = "n-Dodecane"
T_REF = 298.15


def main():
    h_ref = CP.PropsSI("H", "T", T_REF, "Q", 0, FLUID)
    lines = [
        "# Saturated-liquid and saturated-vapour specific enthalpies of n-dodecane relative to the saturated liquid at 298.15 K.",
        f"# library: CoolProp {CoolProp.__version__} (git {CoolProp.__gitrevision__}), HEOS backend",
        f"# date: {datetime.date.today().isoformat()}",
        "# command: python3 validation/enthalpy_reference.py   (run from the repository root)",
        "# equation of state: [Lemmon-EF-2004] Eric W. Lemmon and Marcia L. Huber, Thermodynamic Properties of n-Dodecane, Energy & Fuels, 18, 960-967, 2004, doi:10.1021/ef0341062",
        "# columns:",
        "#   temperature_K: temperature, K",
        "#   liquid_enthalpy_J_kg: h(T, Q=0) - h(298.15 K, Q=0), J/kg",
        "#   vapor_enthalpy_J_kg: h(T, Q=1) - h(298.15 K, Q=0), J/kg",
        "temperature_K,liquid_enthalpy_J_kg,vapor_enthalpy_J_kg",
    ]
    t = 300.0
    while t <= 590.0 + 1e-9:
        hl = CP.PropsSI("H", "T", t, "Q", 0, FLUID) - h_ref
        hv = CP.PropsSI("H", "T", t, "Q", 1, FLUID) - h_ref
        lines.append(f"{t:.2f},{hl!r},{hv!r}")
        t += 5.0
    with open(OUT, "w") as f:
        f.write("\n".join(lines) + "\n")
    print(f"wrote {OUT}")


if __name__ == "__main__":
    main()
