#!/usr/bin/env python3
"""Raoult's-law reference values for the n-heptane / n-decane binary, computed with CoolProp.

Writes, under validation/coolprop/ (next to this script):
  binary_bubble.csv    bubble temperature of liquid n-heptane/n-decane mixtures by Raoult's law
                       (ideal liquid, ideal gas), sum_i x_i p_sat,i(T) = p, with p_sat,i from the
                       reference equations of state in CoolProp (pure fluids only; CoolProp's
                       mixture models are NOT used)
  raoult_surface.csv   the surface-equilibrium numbers of the worked check in
                       ../shared/physics.md (the project notes beside the repository) A.7 (equimolar liquid at 300 K, 101325 Pa, dry air),
                       recomputed here with more digits

The calculation is done by hand in this script (bisection on T); only CoolProp's pure-fluid
saturation pressure PropsSI('P', 'T', T, 'Q', 0, fluid) and molar mass are called.

Rerun:  pip install coolprop==8.0.0
        python3 validation/mixture_reference.py      (from the repository root)
"""

import csv
import datetime
import os

import CoolProp
import CoolProp.CoolProp as CP

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "coolprop")
COMMAND = "python3 validation/mixture_reference.py"
DATE = datetime.date.today().isoformat()

LIGHT, HEAVY = ("n-heptane", "n-Heptane"), ("n-decane", "n-Decane")
X_LIGHT = [0.25, 0.5, 0.75]          # liquid mole fractions of n-heptane
PRESSURES = [101325.0]               # Pa
# Dry air as dropcut builds it (src/props/gas.rs AIR): N2 0.7812, O2 0.2096, Ar 0.0092 by mole, with
# IUPAC conventional atomic weights -> W_air [kg/mol].
W_AIR = 0.7812 * 0.028014 + 0.2096 * 0.031998 + 0.0092 * 0.039948


def psat(fluid, t):
    return CP.PropsSI("P", "T", t, "Q", 0, fluid)


def molar_mass(fluid):
    return CP.PropsSI("M", fluid)


def bubble_temperature(x1, p):
    """Solve x1 p1(T) + (1 - x1) p2(T) = p by bisection (both p_sat increase with T)."""
    f = lambda t: x1 * psat(LIGHT[1], t) + (1.0 - x1) * psat(HEAVY[1], t) - p
    lo, hi = 250.0, 530.0  # below the lower critical temperature (n-heptane EOS T_c 541.2 K)
    assert f(lo) < 0.0 < f(hi)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if f(mid) < 0.0:
            lo = mid
        else:
            hi = mid
        if hi - lo < 1e-9:
            break
    return 0.5 * (lo + hi)


def header(title, columns, extra=()):
    lines = [
        f"# {title}",
        f"# library: CoolProp {CoolProp.__version__} (git {CoolProp.__gitrevision__}), HEOS backend, pure-fluid saturation pressures only",
        f"# date: {DATE}",
        f"# command: {COMMAND}   (run from the repository root)",
        "# equations of state: n-heptane [Span-IJT-2003B] R. Span and W. Wagner, Int. J. Thermophys. 24 (2003) 41-109;",
        "#   n-decane [Lemmon-JCED-2006] E.W. Lemmon and R. Span, J. Chem. Eng. Data 51 (2006) 785-850",
        "# model: Raoult's law (activity coefficients 1, ideal gas), computed by hand in the script (bisection on T)",
    ]
    lines += [f"# {e}" for e in extra]
    lines.append("# columns:")
    lines += [f"#   {c}" for c in columns]
    return lines


def main():
    os.makedirs(OUT, exist_ok=True)
    rows = []
    for p in PRESSURES:
        for x1 in X_LIGHT:
            t = bubble_temperature(x1, p)
            y1 = x1 * psat(LIGHT[1], t) / p
            rows.append((x1, p, t, y1))
    path = os.path.join(OUT, "binary_bubble.csv")
    cols = [
        "x_n_heptane: liquid mole fraction of n-heptane (rest n-decane), -",
        "pressure_Pa: pressure, Pa",
        "bubble_temperature_K: T with x p_sat,heptane(T) + (1 - x) p_sat,decane(T) = p, K (bisection to 1e-9 K)",
        "y_n_heptane: vapour mole fraction of n-heptane at the bubble point, -",
    ]
    with open(path, "w", newline="") as fh:
        fh.write("\n".join(header("Bubble points of liquid n-heptane/n-decane by Raoult's law, for dropcut validation.", cols)) + "\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["x_n_heptane", "pressure_Pa", "bubble_temperature_K", "y_n_heptane"])
        for x1, p, t, y1 in rows:
            w.writerow([f"{x1:.4f}", f"{p:.1f}", f"{t:.6f}", f"{y1:.6f}"])
    print(f"wrote {path}")

    # Worked surface check of physics.md A.7: equimolar liquid, 300 K, 101325 Pa, dry air, no fuel far away.
    t, p = 300.0, 101325.0
    x = {LIGHT[0]: 0.5, HEAVY[0]: 0.5}
    ps = {LIGHT[0]: psat(LIGHT[1], t), HEAVY[0]: psat(HEAVY[1], t)}
    wm = {LIGHT[0]: molar_mass(LIGHT[1]), HEAVY[0]: molar_mass(HEAVY[1])}
    xs = {k: x[k] * ps[k] / p for k in x}
    denom = sum(xs[k] * wm[k] for k in x) + (1.0 - sum(xs.values())) * W_AIR
    ys = {k: xs[k] * wm[k] / denom for k in x}
    yf = sum(ys.values())
    b_m = yf / (1.0 - yf)
    eps = {k: ys[k] / yf for k in x}
    path = os.path.join(OUT, "raoult_surface.csv")
    cols = [
        "quantity: name (p_sat = pure saturation pressure, X_s = surface vapour mole fraction,",
        "  Y_s = surface vapour mass fraction, B_M = Spalding mass-transfer number (Y_Fs - 0)/(1 - Y_Fs),",
        "  eps = evaporation fraction Y_s,i / Y_Fs); species = dropcut component id or 'fuel'",
        "species: component id, or 'fuel' for B_M",
        "value: value in SI units (Pa for p_sat, - otherwise)",
    ]
    extra = [
        "state: equimolar liquid n-heptane/n-decane at T_s = 300 K, p = 101325 Pa, dry air far away (no fuel vapour)",
        f"ambient molar mass: dry air N2 0.7812 / O2 0.2096 / Ar 0.0092 by mole = {W_AIR * 1e3:.4f} g/mol",
        "purpose: recomputes the worked check of ../shared/physics.md (the project notes beside the repository) A.7 (X_s 0.0329/0.00102, Y_s 0.1050/0.00463, B_M 0.1232, eps 0.958/0.042)",
    ]
    with open(path, "w", newline="") as fh:
        fh.write("\n".join(header("Raoult surface equilibrium of an n-heptane/n-decane droplet surface, for dropcut validation.", cols, extra)) + "\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["quantity", "species", "value"])
        for k in x:
            w.writerow(["p_sat", k, f"{ps[k]:.6g}"])
        for k in x:
            w.writerow(["X_s", k, f"{xs[k]:.6g}"])
        for k in x:
            w.writerow(["Y_s", k, f"{ys[k]:.6g}"])
        w.writerow(["B_M", "fuel", f"{b_m:.6g}"])
        for k in x:
            w.writerow(["eps", k, f"{eps[k]:.6g}"])
    print(f"wrote {path}")


if __name__ == "__main__":
    main()
