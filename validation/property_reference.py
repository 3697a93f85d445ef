#!/usr/bin/env python3
"""Reference liquid densities and viscosities for every library component, from data-backed sources.

Writes validation/handbook/density_viscosity.csv (run from the repository root):

    python3 validation/property_reference.py

Rows (one per component, property, temperature and source, in order of preference):
  * density at 288.15 K: CoolProp 8.0 reference EOS; VDI Heat Atlas PPDS density equation; Perry 8th ed.
    Table 2-32 (DIPPR 105). Only inside the source's range (above the melting point).
  * density at the handbook temperature (20 or 25 degC): CRC Handbook 95th ed. (decoded as in
    mixtures/tools/make_components.py), papers (Luning Prak et al. 2014, 2015), CAS Common Chemistry
    (temperature not stated; asserted = 0: reported only).
  * dynamic viscosity at 253.15 K (-20 degC), liquid only (melting point below 253.15 K): CoolProp 8.0;
    VDI PPDS equation 9; Perry Table 2-313 (DIPPR 101); Viswanath & Natarajan 1989; Dutt & Prasad. Only
    inside the published range (VDI: above the melting point). The reference density at the same
    temperature (for kinematic viscosity) comes from the first density source available at 253.15 K.

Only correlations fitted to measured data are used (no estimation method of chemicals or thermo is called).
dropcut decides per component which rows are independent of its own coefficients (a row whose source id
equals the component's coefficient source is not used: src/checks/properties.rs, density_viscosity_checks).

A hold-out test of the two one-point anchoring methods of the generator (Rackett with fitted Z_RA; Andrade
with the Joback slope) on components that have full data is printed at the end and written into the
header of the CSV.
"""
import csv
import datetime
import glob
import math
import os
import sys
import tomllib

import chemicals

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from chemicals_tables import load, num  # noqa: E402
import CoolProp
import CoolProp.CoolProp as CP
from chemicals.volume import volume_VDI_PPDS
from chemicals.viscosity import PPDS9

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
OUT = os.path.join(ROOT, "validation", "handbook", "density_viscosity.csv")
R = 8.314462618

COOLPROP = {"n-hexane": "n-Hexane", "n-heptane": "n-Heptane", "n-octane": "n-Octane", "n-nonane": "n-Nonane",
            "n-decane": "n-Decane", "n-undecane": "n-Undecane", "n-dodecane": "n-Dodecane", "toluene": "Toluene",
            "o-xylene": "o-Xylene", "m-xylene": "m-Xylene", "p-xylene": "p-Xylene", "ethylbenzene": "EthylBenzene",
            "cyclohexane": "CycloHexane", "ethanol": "Ethanol"}

# Published single points (abstract values): CAS -> (T/K, density kg/m3, viscosity mPa s, source id)
PAPERS = {
    "4390-04-9": [(293.15, 784.48, 3.71, "luning-prak-2015")],
    "13475-82-6": [(293.15, 745.21, 1.31, "luning-prak-2015")],
    "540-84-1": [(298.15, 687.70, 0.501, "luning-prak-2014")],
    "142-82-5": [(298.15, 679.61, 0.389, "luning-prak-2014")],
}


TAB = {
    "p105": load("Density/Perry Parameters 105.tsv"),
    "vdirho": load("Density/VDI PPDS Density of Saturated Liquids.tsv"),
    "crc": load("Misc/Physical Constants of Organic Compounds.csv"),
    "cascc": load("Misc/common_chemistry_data.tsv"),
    "p313": load("Viscosity/Table 2-313 Viscosity of Inorganic and Organic Liquids.tsv"),
    "vdimu": load("Viscosity/VDI PPDS Dynamic viscosity of saturated liquids polynomials.tsv"),
    "vn3": load("Viscosity/Viswanath Natarajan Dynamic 3 term.tsv"),
    "dp3": load("Viscosity/Dutt Prasad 3 term.tsv"),
}


def rec(tab, cas):
    r = TAB[tab].get(cas)
    return r[0] if r else None


def perry105(cas, T):
    r = rec("p105", cas)
    if not r or not (num(r["Tmin"]) <= T <= num(r["Tmax"])):
        return None
    A, B, C, D = (num(r[k]) for k in ("C1", "C2", "C3", "C4"))
    return A / B ** (1 + (1 - T / C) ** D)  # mol/m3


def vdi_density(cas, T, Tm):
    r = rec("vdirho", cas)
    if not r or T <= Tm:
        return None
    MW, Tc, rhoc, a, b, c, d = (num(r[k]) for k in ("MW", "Tc", "rhoc", "A", "B", "C", "D"))
    return MW * 1e-3 / volume_VDI_PPDS(T, Tc, rhoc, a, b, c, d, MW)


def crc_density(cas):
    r = rec("crc", cas)
    v = num(r["rho"]) if r else None
    if not v:
        return None
    rho = round(v, 1)
    t = round((v - rho) * 1000)
    return (273.15 + t, rho) if 0 <= t <= 40 else None


def density_sources(cid, cas, M, Tm, T):
    """[(value kg/m3, source id, text)] at T, best first."""
    out = []
    if cid in COOLPROP and T > Tm:
        try:
            out.append((CP.PropsSI("D", "T", T, "P", 101325, COOLPROP[cid]), "coolprop-8.0", f"CoolProp {CoolProp.__version__} reference EOS ({COOLPROP[cid]})"))
        except ValueError:
            pass
    v = vdi_density(cas, T, Tm)
    if v:
        out.append((v, "vdi-heat-atlas-ppds", "VDI Heat Atlas 2010 PPDS density equation (via chemicals 1.5.2 data file)"))
    v = perry105(cas, T)
    if v:
        out.append((v * M, "perry8-table-2-32", "Perry 8th ed. Table 2-32 (DIPPR 105, via chemicals 1.5.2 data file)"))
    return out


def viscosity_sources(cid, cas, Tm, T):
    """[(dynamic viscosity Pa s, source id, text)] at T, best first (liquid only)."""
    out = []
    if T <= Tm:
        return out
    if cid in COOLPROP:
        try:
            out.append((CP.PropsSI("V", "T", T, "P", 101325, COOLPROP[cid]), "coolprop-8.0", f"CoolProp {CoolProp.__version__} viscosity correlation ({COOLPROP[cid]})"))
        except ValueError:
            pass
    r = rec("vdimu", cas)
    if r:
        A, B, C, D, E = (num(r[k]) for k in ("A", "B", "C", "D", "E"))
        out.append((PPDS9(T, A, B, C, D, E), "vdi-heat-atlas-ppds", "VDI Heat Atlas 2010 PPDS equation 9 (via chemicals 1.5.2 data file)"))
    r = rec("p313", cas)
    if r and num(r["Tmin"]) <= T <= num(r["Tmax"]):
        c = [num(r[k]) or 0.0 for k in ("C1", "C2", "C3", "C4", "C5")]
        out.append((math.exp(c[0] + c[1] / T + c[2] * math.log(T) + c[3] * T ** c[4]), "perry8-table-2-313", "Perry 8th ed. Table 2-313 (DIPPR 101, via chemicals 1.5.2 data file)"))
    for key, sid, text in (("vn3", "viswanath-natarajan-1989", "Viswanath & Natarajan 1989, 3-term equation"),
                           ("dp3", "dutt-prasad-viswanath-2007", "Viswanath et al. 2007, Dutt-Prasad 3-term equation")):
        r = rec(key, cas)
        if r and num(r["Tmin"]) <= T <= num(r["Tmax"]):
            A, B, C = (num(r[k]) for k in ("A", "B", "C"))
            out.append((10 ** (A + B / (C - T)) * 1e-3, sid, text + " (via chemicals 1.5.2 data file)"))
    return out


def holdout(comps):
    """Estimate components with data as if they had one measured point only."""
    lines = []
    dens, visc = [], []
    for cid, d in comps.items():
        c = d["constants"]
        cas, M, Tm = d["cas"], c["molar-mass"]["value"], c["melting-point"]["value"]
        Tc, Pc = c["critical-temperature"]["value"], c["critical-pressure"]["value"]
        if c["critical-temperature"]["source"].startswith("estimated"):
            continue
        Tb = c["normal-boiling-point"]["value"]
        # density: anchor at 293.15 K on the first data-backed value, predict 253.15 K and 353.15 K
        ref20 = density_sources(cid, cas, M, Tm, 293.15)
        if ref20:
            rho0 = ref20[0][0]
            A = Pc / (R * Tc)
            Z = math.exp(math.log(A / (rho0 / M)) / (1 + (1 - 293.15 / Tc) ** (2 / 7)))
            for T in (253.15, 353.15):
                ref = density_sources(cid, cas, M, Tm, T) if T < Tb - 5 else None
                if ref:
                    est = A * M / Z ** (1 + (1 - T / Tc) ** (2 / 7))
                    dens.append((cid, T, est / ref[0][0] - 1))
        # viscosity: anchor at 293.15 K, slope from Joback, predict 253.15 K and 353.15 K
        g = d.get("joback-groups", {})
        ETA_A = {"CH3": 548.29, "CH2": 94.16, "CH": -322.15, "C": -573.56, "rCH2": 307.53, "rCH": -394.29, "rCHa": 259.65, "rCa": -245.74}
        if g and all(k in ETA_A for k in g):
            B = sum(ETA_A[k] * n for k, n in g.items()) - 597.82
            v0 = viscosity_sources(cid, cas, Tm, 293.15)
            if v0:
                for T in (253.15, 353.15):
                    ref = viscosity_sources(cid, cas, Tm, T) if T < Tb - 5 else None
                    if ref:
                        est = v0[0][0] * math.exp(B * (1 / T - 1 / 293.15))
                        visc.append((cid, T, est / ref[0][0] - 1))
    for name, rows in (("Rackett with Z_RA fitted at 293.15 K", dens), ("Andrade through the 293.15 K value with the Joback slope", visc)):
        for T in (253.15, 353.15):
            e = [abs(x[2]) for x in rows if x[1] == T]
            if e:
                worst = max((x for x in rows if x[1] == T), key=lambda x: abs(x[2]))
                lines.append(f"hold-out {name}, predicted at {T} K: {len(e)} components, mean |error| {100*sum(e)/len(e):.1f} %, "
                             f"max {100*abs(worst[2]):.1f} % ({worst[0]})")
    return lines


def main():
    comps = {}
    for f in sorted(glob.glob(os.path.join(ROOT, "mixtures", "components", "*.toml"))):
        d = tomllib.load(open(f, "rb"))
        comps[d["id"]] = d
    rows = []
    for cid, d in comps.items():
        c = d["constants"]
        cas, M, Tm = d["cas"], c["molar-mass"]["value"], c["melting-point"]["value"]
        for v, sid, text in density_sources(cid, cas, M, Tm, 288.15):
            rows.append([cid, "density", 288.15, f"{v:.6g}", "", sid, 1, text])
        crc = crc_density(cas)
        if crc and crc[0] > Tm:
            rows.append([cid, "density", crc[0], f"{crc[1]:.6g}", "", "crc95-physical-constants", 1,
                         f"CRC Handbook 95th ed., Physical Constants of Organic Compounds, d at {crc[0] - 273.15:.0f} degC (via chemicals 1.5.2 data file)"])
        for T, rho, _mu, sid in PAPERS.get(cas, []):
            rows.append([cid, "density", T, f"{rho:.6g}", "", sid, 1, f"{sid} (measured, abstract value)"])
        v = TAB["cascc"].get(cas.replace("-", ""))
        if v and num(v[0]["Vml"]):
            rows.append([cid, "density", 293.15, f"{M / num(v[0]['Vml']):.6g}", "", "cas-common-chemistry", 0,
                         "CAS Common Chemistry via chemicals 1.5.2 (temperature not stated; reported only)"])
        T = 253.15
        dens = density_sources(cid, cas, M, Tm, T)
        for mu, sid, text in viscosity_sources(cid, cas, Tm, T):
            rho = ""
            if dens:
                rho = f"{dens[0][0]:.6g}"
                text += f"; density for kinematic viscosity: {dens[0][1]}"
            rows.append([cid, "viscosity", T, f"{mu:.6g}", rho, sid, 1, text])
        for T, _rho, mu, sid in PAPERS.get(cas, []):
            rows.append([cid, "viscosity", T, f"{mu * 1e-3:.6g}", f"{_rho:.6g}", sid, 1, f"{sid} (measured, abstract value)"])
    notes = holdout(comps)
    for n in notes:
        print(n)
    with open(OUT, "w", newline="") as fh:
        fh.write("# Reference liquid densities and viscosities from data-backed sources (measured-data fits and handbook values)\n")
        fh.write(f"# library: chemicals {chemicals.__version__} data files, CoolProp {CoolProp.__version__}, Python {sys.version.split()[0]}\n")
        fh.write(f"# date: {datetime.date.today().isoformat()}\n")
        fh.write("# command: python3 validation/property_reference.py\n")
        fh.write("# columns: id, property (density | viscosity), temperature_K, value (kg/m3 or Pa s), reference_density_kg_m3 (viscosity rows: for kinematic viscosity), source_id, asserted (1 = used as a check, 0 = reported), source\n")
        for n in notes:
            fh.write(f"# {n}\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["id", "property", "temperature_K", "value", "reference_density_kg_m3", "source_id", "asserted", "source"])
        for r in rows:
            w.writerow(r)
    print(f"wrote {len(rows)} rows to {OUT}")


if __name__ == "__main__":
    main()
