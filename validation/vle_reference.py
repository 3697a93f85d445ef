#!/usr/bin/env python3
"""Bubble temperatures of binary liquids at 101.325 kPa from two data-backed references.

Writes validation/coolprop/binary_vle.csv with one row per binary, liquid composition and reference:

1. Hydrocarbon pairs (aromatic + paraffin, cycloparaffin + aromatic): CoolProp's multi-fluid mixture model
   (HEOS; Kunz-Wagner / GERG form; pure-fluid reference equations of state; reducing functions with the
   binary interaction parameters beta_T, gamma_T of
     I. H. Bell and E. W. Lemmon, Automatic fitting of binary interaction parameters for multi-fluid
     Helmholtz-energy-explicit mixture models, J. Chem. Eng. Data 61 (2016), doi:10.1021/acs.jced.6b00257
   (citation as in CoolProp's CoolPropBibTeXLibrary.bib, key Bell-JCED-2016), fitted to experimental
   mixture data; beta_v = gamma_v = 1, no departure function). reference = "coolprop-bell2016".

2. Ethanol + hydrocarbon pairs: the NRTL equation with the parameters listed in ChemSep's
   interaction-parameter file nrtl.ipd as "DECHEMA NRTL data @ 1atm" (A12 and A21 in cal/mol, alpha12;
   copyright 2008 H. Kooijman and R. Taylor, Artistic License 2.0), which the thermo package ships
   (thermo/Interaction Parameters/ChemSep/nrtl.ipd). Every parameter set the file lists for a pair is used.
   Each carries a comment such as "p459 1/2c", which we read as a page and a volume/part of the DECHEMA
   Chemistry Data Series (our reading, not stated in the file); two sets for one pair with different pages
   are then fits to different measured data sets, and the spread between them is a measure of the spread
   between experiments. Pure-component vapour pressures: CoolProp's reference equations of state.
   reference = "dechema-nrtl <file comment>".
   CoolProp's reducing-function-only mixture model is not used for the ethanol pairs: for them it differs
   from the DECHEMA fits by up to about 6 K in the dilute-ethanol region (ethanol + n-heptane at x1 = 0.05:
   357.6 K against 351.1-352.9 K), a form too simple for that strongly non-ideal liquid.

Both references are independent of dropcut's activity model (original UNIFAC with the DDBST published
parameter matrix) and of its pure-component vapour-pressure correlations (mixtures/sources.toml).

Rerun:  pip install coolprop==8.0.0 thermo==0.6.1
        python3 validation/vle_reference.py      (from the repository root)
"""

import csv
import datetime
import math
import os

import CoolProp
import CoolProp.CoolProp as CP
from CoolProp.CoolProp import AbstractState

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "coolprop", "binary_vle.csv")
COMMAND = "python3 validation/vle_reference.py"
DATE = datetime.date.today().isoformat()
PRESSURE = 101325.0

R_CAL = 1.98720425864083  # gas constant, cal/(mol K) (thermochemical calorie)
NRTL_FILE = os.path.join(os.path.dirname(__import__("thermo").__file__), "Interaction Parameters", "ChemSep", "nrtl.ipd")

# (dropcut id, CoolProp name) pairs; first component's mole fraction is x1.
PAIRS = [
    (("toluene", "Toluene"), ("n-heptane", "n-Heptane")),
    (("toluene", "Toluene"), ("n-octane", "n-Octane")),
    (("m-xylene", "m-Xylene"), ("n-octane", "n-Octane")),
    (("ethylbenzene", "EthylBenzene"), ("n-octane", "n-Octane")),
    (("cyclohexane", "Cyclohexane"), ("toluene", "Toluene")),
]
# ethanol pairs with DECHEMA NRTL parameters: (dropcut id, CoolProp name, CAS)
ETHANOL = ("ethanol", "Ethanol", "64-17-5")
NRTL_PARTNERS = [("n-hexane", "n-Hexane", "110-54-3"), ("n-heptane", "n-Heptane", "142-82-5"),
                 ("n-octane", "n-Octane", "111-65-9"), ("cyclohexane", "Cyclohexane", "110-82-7"),
                 ("toluene", "Toluene", "108-88-3"), ("ethylbenzene", "EthylBenzene", "100-41-4"),
                 ("p-xylene", "p-Xylene", "106-42-3")]
X1 = [0.05, 0.1, 0.25, 0.5, 0.75, 0.9]


def pair_parameters(a, b):
    ca, cb = CP.get_fluid_param_string(a, "CAS"), CP.get_fluid_param_string(b, "CAS")
    for x, y in ((ca, cb), (cb, ca)):
        try:
            return {k: CP.get_mixture_binary_pair_data(x, y, k) for k in ("BibTeX", "betaT", "gammaT", "betaV", "gammaV", "F")}
        except ValueError:
            continue
    raise SystemExit(f"CoolProp has no binary interaction parameters for {a} & {b}")


def bubble(a, b, x1):
    state = AbstractState("HEOS", f"{a}&{b}")
    state.set_mole_fractions([x1, 1.0 - x1])
    state.update(CoolProp.PQ_INPUTS, PRESSURE, 0.0)
    return state.T(), state.mole_fractions_vapor()[0]


def psat(fluid, t):
    return CP.PropsSI("P", "T", t, "Q", 0, fluid)


def nrtl_sets(cas1, cas2):
    """Every (A12, A21, alpha, comment) line of nrtl.ipd for the pair, oriented as (cas1, cas2)."""
    out = []
    with open(NRTL_FILE) as f:
        for line in f:
            parts = line.split()
            if len(parts) < 6 or parts[0].startswith("#"):
                continue
            a, b = parts[0], parts[1]
            try:
                a12, a21, alpha = float(parts[2]), float(parts[3]), float(parts[4])
            except ValueError:
                continue
            comment = " ".join(parts[6:])
            if (a, b) == (cas1, cas2):
                out.append((a12, a21, alpha, comment))
            elif (a, b) == (cas2, cas1):
                out.append((a21, a12, alpha, comment))
    if not out:
        raise SystemExit(f"no NRTL parameters for {cas1} / {cas2} in {NRTL_FILE}")
    return out


def nrtl_gammas(x1, t, a12, a21, alpha):
    x2 = 1.0 - x1
    t12, t21 = a12 / (R_CAL * t), a21 / (R_CAL * t)
    g12, g21 = math.exp(-alpha * t12), math.exp(-alpha * t21)
    ln1 = x2 * x2 * (t21 * (g21 / (x1 + x2 * g21)) ** 2 + t12 * g12 / (x2 + x1 * g12) ** 2)
    ln2 = x1 * x1 * (t12 * (g12 / (x2 + x1 * g12)) ** 2 + t21 * g21 / (x1 + x2 * g21) ** 2)
    return math.exp(ln1), math.exp(ln2)


def nrtl_bubble(f1, f2, x1, par):
    """Solve x1 g1 p1(T) + x2 g2 p2(T) = p by bisection (modified Raoult's law, ideal gas)."""
    def f(t):
        g1, g2 = nrtl_gammas(x1, t, *par[:3])
        return x1 * g1 * psat(f1, t) + (1.0 - x1) * g2 * psat(f2, t) - PRESSURE
    lo, hi = 300.0, 450.0
    assert f(lo) < 0.0 < f(hi)
    while hi - lo > 1e-9:
        mid = 0.5 * (lo + hi)
        if f(mid) < 0.0:
            lo = mid
        else:
            hi = mid
    t = 0.5 * (lo + hi)
    g1, _ = nrtl_gammas(x1, t, *par[:3])
    return t, x1 * g1 * psat(f1, t) / PRESSURE


def main():
    rows, notes = [], []
    for (id1, cp1), (id2, cp2) in PAIRS:
        par = pair_parameters(cp1, cp2)
        if par["BibTeX"] != "Bell-JCED-2016" or float(par["F"]) != 0.0:
            raise SystemExit(f"{cp1}&{cp2}: unexpected parameter source {par}")
        notes.append(f"#   {id1} + {id2}: beta_T {float(par['betaT']):.6f}, gamma_T {float(par['gammaT']):.6f}, beta_v {par['betaV']}, gamma_v {par['gammaV']}, departure function none")
        for x1 in X1:
            t, y1 = bubble(cp1, cp2, x1)
            rows.append((id1, id2, f"{x1:.4f}", f"{PRESSURE:.1f}", f"{t:.4f}", f"{y1:.5f}", "coolprop-bell2016"))
    for id2, cp2, cas2 in NRTL_PARTNERS:
        for a12, a21, alpha, comment in nrtl_sets(ETHANOL[2], cas2):
            page = comment.split()[-2:] if len(comment.split()) >= 2 else [comment]
            tag = "dechema-nrtl " + " ".join(page)
            notes.append(f"#   ethanol + {id2} ({tag}): A12 {a12} cal/mol, A21 {a21} cal/mol, alpha12 {alpha} (file comment: {comment})")
            for x1 in X1:
                t, y1 = nrtl_bubble(ETHANOL[1], cp2, x1, (a12, a21, alpha))
                rows.append((ETHANOL[0], id2, f"{x1:.4f}", f"{PRESSURE:.1f}", f"{t:.4f}", f"{y1:.5f}", tag))
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, "w", newline="") as f:
        f.write("# Bubble temperatures of binary liquids at 101325 Pa, for dropcut validation (activity coefficients).\n")
        f.write(f"# library: CoolProp {CoolProp.__version__} (git {CoolProp.__gitrevision__}), HEOS multi-fluid mixture model and pure-fluid vapour pressures; thermo {__import__('thermo').__version__} (ChemSep nrtl.ipd)\n")
        f.write(f"# date: {DATE}\n")
        f.write(f"# command: {COMMAND}   (run from the repository root)\n")
        f.write("# binary interaction parameters: I. H. Bell and E. W. Lemmon, Automatic fitting of binary interaction parameters for\n")
        f.write("#   multi-fluid Helmholtz-energy-explicit mixture models, J. Chem. Eng. Data 61 (2016), doi:10.1021/acs.jced.6b00257\n")
        f.write("#   (CoolProp BibTeX key Bell-JCED-2016), fitted to experimental mixture data; values as shipped by CoolProp;\n")
        f.write("# ethanol pairs: NRTL with DECHEMA parameters fitted to isobaric VLE data at 1 atm, as transcribed in ChemSep's nrtl.ipd\n")
        f.write("#   (shipped by thermo), each listed data set separately, with CoolProp pure-fluid vapour pressures:\n")
        for n in notes:
            f.write(n + "\n")
        f.write("# columns:\n")
        f.write("#   component_1, component_2: dropcut component ids\n")
        f.write("#   x1: liquid mole fraction of component 1, -\n")
        f.write("#   pressure_Pa: pressure, Pa\n")
        f.write("#   bubble_temperature_K: CoolProp PQ flash at Q = 0 (coolprop rows); bisection to 1e-9 K of the NRTL modified Raoult's law (dechema rows), K\n")
        f.write("#   y1: vapour mole fraction of component 1 at the bubble point, -\n")
        f.write("#   reference: coolprop-bell2016, or dechema-nrtl <file comment> (read as page and DECHEMA Chemistry Data Series volume/part)\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["component_1", "component_2", "x1", "pressure_Pa", "bubble_temperature_K", "y1", "reference"])
        w.writerows(rows)
    print(f"wrote {OUT} ({len(rows)} rows)")


if __name__ == "__main__":
    main()
