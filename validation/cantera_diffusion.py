#!/usr/bin/env python3
"""Binary diffusion coefficients of fuel vapours in N2, O2 and air from Cantera.

Cantera's mixture-averaged gas transport evaluates binary diffusion
coefficients by Chapman-Enskog kinetic theory with Lennard-Jones 12-6
collision integrals (Monchick-Mason tables), fitted as polynomials in ln T.

None of the mechanism files bundled with the Cantera 3.2.0 wheel carries
transport (Lennard-Jones) data for liquid-fuel species (see find_bundled()),
so this script writes a small mechanism file, validation/cantera/fuel_lj.yaml,
with
  * fuel Lennard-Jones parameters (sigma, epsilon/k) as published in the
    reference viscosity correlations that CoolProp 8.0.0 implements (the
    numbers are read from CoolProp's fluid library, each paper is named in the
    YAML and in the CSV header), and
  * N2 and O2 transport parameters copied from gri30.yaml bundled with
    Cantera (GRI-Mech 3.0 transport file, CHEMKIN transport database values).
It then loads that file into Cantera and writes validation/cantera/diffusion.csv.

Rerun:  pip install cantera==3.2.0 coolprop==8.0.0
        python3 validation/cantera_diffusion.py
"""

import csv
import datetime
import glob
import json
import math
import os
import sys

import cantera as ct
import CoolProp
import CoolProp.CoolProp as CP

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "cantera")
COMMAND = "python3 validation/cantera_diffusion.py"
DATE = datetime.date.today().isoformat()

TEMPS = [300.0, 400.0, 500.0, 700.0, 1000.0]
PRESSURES = [101325.0, 1.0e6]
AIR = {"N2": 0.79, "O2": 0.21}
X_TRACE = 1e-10  # fuel mole fraction used for the mixture-averaged value in air

# dropcut id -> (CoolProp fluid, species name in fuel_lj.yaml, composition)
FUELS = [
    ("n-hexane", "n-Hexane", "NC6H14", {"C": 6, "H": 14}),
    ("n-heptane", "n-Heptane", "NC7H16", {"C": 7, "H": 16}),
    ("n-octane", "n-Octane", "NC8H18", {"C": 8, "H": 18}),
    ("n-nonane", "n-Nonane", "NC9H20", {"C": 9, "H": 20}),
    ("n-decane", "n-Decane", "NC10H22", {"C": 10, "H": 22}),
    ("n-undecane", "n-Undecane", "NC11H24", {"C": 11, "H": 24}),
    ("n-dodecane", "n-Dodecane", "NC12H26", {"C": 12, "H": 26}),
    ("toluene", "Toluene", "C6H5CH3", {"C": 7, "H": 8}),
    ("o-xylene", "o-Xylene", "OC8H10", {"C": 8, "H": 10}),
    ("m-xylene", "m-Xylene", "MC8H10", {"C": 8, "H": 10}),
    ("p-xylene", "p-Xylene", "PC8H10", {"C": 8, "H": 10}),
    ("ethylbenzene", "EthylBenzene", "C6H5C2H5", {"C": 8, "H": 10}),
    ("cyclohexane", "CycloHexane", "CYC6H12", {"C": 6, "H": 12}),
    ("ethanol", "Ethanol", "C2H5OH", {"C": 2, "H": 6, "O": 1}),
]

sys.path.insert(0, HERE)
from coolprop_reference import cite as _cite  # noqa: E402  (readable reference for a CoolProp BibTeX key)


def cite(key):
    if key == "Huber-RP912":
        return ("[Huber-RP912] (key not in CoolProp's bibliography) M. L. Huber, NIST: extended-corresponding-states "
                "viscosity model of ethylbenzene as distributed with REFPROP 9.1.2; not a journal correlation, so "
                "these LJ parameters are lower confidence than the others")
    return _cite(key)


def find_bundled():
    """List bundled Cantera YAML files that contain C6+ hydrocarbons or ethanol,
    and whether those species carry transport data."""
    data = os.path.join(os.path.dirname(ct.__file__), "data")
    found = []
    for f in sorted(glob.glob(os.path.join(data, "*.yaml")) + glob.glob(os.path.join(data, "*", "*.yaml"))):
        try:
            species = ct.Species.list_from_file(f)
        except Exception:
            continue
        hits, with_tr = [], 0
        for s in species:
            c = s.composition
            C, H, O = c.get("C", 0), c.get("H", 0), c.get("O", 0)
            fuel_like = (C >= 6 and O == 0 and set(c) <= {"C", "H"} and H >= C) or (C == 2 and H == 6 and O == 1)
            if fuel_like:
                hits.append(s.name)
                with_tr += s.transport is not None
        if hits:
            found.append((os.path.relpath(f, data), hits, with_tr))
    return found


def lj_from_coolprop(name):
    j = json.loads(CP.get_fluid_param_string(name, "JSON"))
    j = j[0] if isinstance(j, list) else j
    v = j.get("TRANSPORT", {}).get("viscosity", {})
    if "sigma_eta" in v and "epsilon_over_k" in v:
        return v["sigma_eta"] * 1e10, float(v["epsilon_over_k"]), v.get("BibTeX", "")
    return None


def write_mechanism(path):
    gri = {s.name: s for s in ct.Species.list_from_file("gri30.yaml")}
    used, skipped = [], []
    lines = [
        "description: |-",
        "  Minimal gas mechanism (no reactions) for binary diffusion coefficients of",
        "  fuel vapours in N2 / O2, written by validation/cantera_diffusion.py on %s." % DATE,
        "  Fuel Lennard-Jones parameters: the values published in the reference",
        "  viscosity correlations implemented in CoolProp %s (read from its fluid" % CoolProp.__version__,
        "  library; the paper is named above each species). N2 and O2: copied from",
        "  gri30.yaml bundled with Cantera %s (GRI-Mech 3.0 transport data)." % ct.__version__,
        "  Thermo entries are constant-cp PLACEHOLDERS: binary diffusion coefficients",
        "  depend only on T, p, molar masses and the Lennard-Jones parameters, not on",
        "  thermo; do not use this file for anything else.",
        "  Fuels are treated as non-polar (dipole 0): the published parameters are",
        "  effective 12-6 values fitted to viscosity.",
        "units: {length: cm, time: s, quantity: mol, energy: J}",
        "phases:",
        "- name: gas",
        "  thermo: ideal-gas",
        "  elements: [C, H, O, N]",
        "  species: [N2, O2, %s]",
        "  transport: mixture-averaged",
        "  state: {T: 300.0, P: 1 atm}",
        "species:",
    ]
    species_lines = []

    def thermo_block():
        return ["  thermo:", "    model: constant-cp", "    T0: 298.15 K", "    h0: 0.0 J/mol", "    s0: 0.0 J/mol/K",
                "    cp0: 100.0 J/mol/K", "    T-min: 200.0 K", "    T-max: 1100.0 K"]

    for nm in ("N2", "O2"):
        s = gri[nm]
        t = s.transport
        species_lines += [
            "# %s: transport parameters from gri30.yaml (Cantera %s data directory)" % (nm, ct.__version__),
            "- name: %s" % nm,
            "  composition: {%s}" % ", ".join("%s: %g" % kv for kv in s.composition.items()),
        ] + thermo_block() + [
            "  transport:",
            "    model: gas",
            "    geometry: %s" % t.geometry,
            "    well-depth: %.6g" % (t.well_depth / ct.boltzmann),
            "    diameter: %.6g" % (t.diameter * 1e10),
            "    polarizability: %.6g" % (t.polarizability * 1e30),
            "    rotational-relaxation: %.6g" % t.rotational_relaxation,
        ]
    for fid, cpname, sp, comp in FUELS:
        lj = lj_from_coolprop(cpname)
        if lj is None:
            skipped.append((fid, cpname, CP.get_fluid_param_string(cpname, "BibTeX-VISCOSITY")))
            continue
        sigma, eps, key = lj
        used.append((fid, sp, sigma, eps, key))
        species_lines += [
            "# %s (%s): sigma = %.6g Angstrom, epsilon/k = %.6g K from" % (fid, cpname, sigma, eps),
            "#   %s" % cite(key),
            "- name: %s" % sp,
            "  composition: {%s}" % ", ".join("%s: %d" % kv for kv in comp.items()),
        ] + thermo_block() + [
            "  transport:",
            "    model: gas",
            "    geometry: nonlinear",
            "    well-depth: %.6g" % eps,
            "    diameter: %.6g" % sigma,
            "    rotational-relaxation: 1.0",
        ]
    lines[lines.index("  species: [N2, O2, %s]")] = "  species: [N2, O2, %s]" % ", ".join(u[1] for u in used)
    with open(path, "w") as f:
        f.write("\n".join(lines + species_lines) + "\n")
    return used, skipped


def omega_d_neufeld(tstar):
    return (1.06036 / tstar ** 0.15610 + 0.19300 / math.exp(0.47635 * tstar)
            + 1.03587 / math.exp(1.52996 * tstar) + 1.76474 / math.exp(3.89411 * tstar))


def main():
    os.makedirs(OUT, exist_ok=True)
    bundled = find_bundled()
    mech = os.path.join(OUT, "fuel_lj.yaml")
    used, skipped = write_mechanism(mech)
    gas = ct.Solution(mech)
    rows = []
    worst = 0.0
    for fid, sp, sigma, eps, key in used:
        k = gas.species_index(sp)
        for p in PRESSURES:
            for T in TEMPS:
                gas.TPX = T, p, {"N2": 1.0}
                D = gas.binary_diff_coeffs
                for g in ("N2", "O2"):
                    j = gas.species_index(g)
                    rows.append([fid, sp, g, T, p, D[k, j]])
                    # independent check: Chapman-Enskog with Neufeld's Omega_D
                    sj = gas.species(g).transport
                    sab = 0.5 * (sigma + sj.diameter * 1e10)
                    eab = math.sqrt(eps * sj.well_depth / ct.boltzmann)
                    wab = 2.0 / (1.0 / gas.molecular_weights[k] + 1.0 / gas.molecular_weights[j])
                    dce = 0.00266 * T ** 1.5 / (p / 1e5 * math.sqrt(wab) * sab ** 2 * omega_d_neufeld(T / eab)) * 1e-4
                    worst = max(worst, abs(D[k, j] / dce - 1.0))
                X = {sp: X_TRACE, "N2": AIR["N2"] * (1 - X_TRACE), "O2": AIR["O2"] * (1 - X_TRACE)}
                gas.TPX = T, p, X
                rows.append([fid, sp, "air", T, p, gas.mix_diff_coeffs_mole[k]])
    hdr = [
        "Binary diffusion coefficients of fuel vapours for dropcut validation.",
        "library: Cantera %s (mixture-averaged gas transport), Python %s; LJ parameters read from CoolProp %s"
        % (ct.__version__, sys.version.split()[0], CoolProp.__version__),
        "date: %s" % DATE,
        "command: %s   (run from the repository root)" % COMMAND,
        "model: Chapman-Enskog first approximation, Lennard-Jones 12-6 collision integrals (Cantera's Monchick-Mason",
        "  tables, polynomial fits in ln T over 200-1100 K); ideal gas, so D scales exactly as 1/p (no dense-gas",
        "  correction; at 1e6 Pa this is the kinetic-theory value, not a real-gas value).",
        "bundled Cantera %s mechanism files searched for fuel species (C>=6 hydrocarbons, ethanol):" % ct.__version__,
    ]
    for f, hits, ntr in bundled:
        shown = ", ".join(hits[:12]) + (", ... (%d in all)" % len(hits) if len(hits) > 12 else "")
        hdr.append("  %s: %s; species with transport data: %d" % (f, shown, ntr))
    hdr += [
        "  => no bundled file has Lennard-Jones data for these fuels, so the mechanism file",
        "     validation/cantera/fuel_lj.yaml (written by this script) is used instead.",
        "mechanism file: validation/cantera/fuel_lj.yaml, phase 'gas'",
        "gas-side parameters: N2 (97.53 K, 3.621 A) and O2 (107.4 K, 3.458 A) from gri30.yaml bundled with Cantera",
        "fuel species and Lennard-Jones parameters (epsilon/k, sigma) with their sources:",
    ]
    for fid, sp, sigma, eps, key in used:
        hdr.append("  %s = species %s: %.6g K, %.6g A; %s" % (fid, sp, eps, sigma, cite(key)))
    if skipped:
        hdr.append("fuels without published LJ parameters in CoolProp (not in this table):")
        for fid, cpname, key in skipped:
            hdr.append("  %s (%s; viscosity model: %s)" % (fid, cpname, key or "none"))
    hdr += [
        "note: ethanol is treated as non-polar; its parameters (362.6 K, 4.53 A) are effective values from viscosity.",
        "check: the N2/O2 values agree with a direct Chapman-Enskog evaluation using Neufeld et al. (1972)'s Omega_D",
        "  fit (0.00266 T^1.5 / (p[bar] W_AB^0.5 sigma_AB^2 Omega_D) cm^2/s) within %.2f %% (largest deviation)." % (100 * worst),
        "columns:",
        "  species: dropcut component id of the fuel vapour",
        "  cantera_species: species name in fuel_lj.yaml",
        "  gas: N2 or O2 (binary coefficient D_fuel,gas), or air = mixture-averaged coefficient of a trace of fuel",
        "       (mole fraction %g) in N2 0.79 / O2 0.21 by mole (Cantera mix_diff_coeffs_mole,"
        " = 1/(0.79/D_N2 + 0.21/D_O2))" % X_TRACE,
        "  temperature_K: temperature, K",
        "  pressure_Pa: pressure, Pa",
        "  diffusion_m2_s: diffusion coefficient, m^2/s",
    ]
    with open(os.path.join(OUT, "diffusion.csv"), "w", newline="") as f:
        for ln in hdr:
            f.write("# " + ln + "\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["species", "cantera_species", "gas", "temperature_K", "pressure_Pa", "diffusion_m2_s"])
        for r in rows:
            w.writerow([r[0], r[1], r[2], "%g" % r[3], "%g" % r[4], "%.6g" % r[5]])
    print("bundled files with fuel-like species:")
    for f, hits, ntr in bundled:
        print("  %-40s %3d fuel-like species, %d with transport" % (f, len(hits), ntr))
    print("fuels written:", ", ".join(u[0] for u in used))
    print("fuels skipped (no LJ data):", ", ".join(s[0] for s in skipped))
    print("max deviation vs Neufeld Chapman-Enskog: %.3f %%" % (100 * worst))
    print("rows:", len(rows))


if __name__ == "__main__":
    main()
