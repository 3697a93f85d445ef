#!/usr/bin/env python3
"""Reference property tables for dropcut validation, computed with CoolProp.

Writes, under validation/coolprop/ (next to this script):
  <id>.csv         saturated-liquid properties (Q = 0) on a 5 K grid
  <id>_vapor.csv   dilute-gas properties on a 25 K grid, 300-1500 K
  constants.csv    molar mass, critical point, acentric factor, normal
                   boiling point, triple point and EOS reference per fluid

Only CoolProp's own high-accuracy (HEOS) backend is used: reference
Helmholtz-energy equations of state plus the transport and surface-tension
correlations that CoolProp carries for each fluid.  Where CoolProp has no
model for a property the cell is left empty (never NaN).

Rerun:  pip install coolprop==8.0.0
        python3 validation/coolprop_reference.py
"""

import csv
import datetime
import math
import os
import re
import sys

import CoolProp
import CoolProp.CoolProp as CP

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "coolprop")
COMMAND = "python3 validation/coolprop_reference.py"
DATE = datetime.date.today().isoformat()

# dropcut component id -> CoolProp fluid name (None: CoolProp has no such fluid)
FLUIDS = [
    ("n-hexane", "n-Hexane"),
    ("n-heptane", "n-Heptane"),
    ("n-octane", "n-Octane"),
    ("n-nonane", "n-Nonane"),
    ("n-decane", "n-Decane"),
    ("n-undecane", "n-Undecane"),
    ("n-dodecane", "n-Dodecane"),
    ("toluene", "Toluene"),
    ("o-xylene", "o-Xylene"),
    ("m-xylene", "m-Xylene"),
    ("p-xylene", "p-Xylene"),
    ("ethylbenzene", "EthylBenzene"),
    ("cyclohexane", "CycloHexane"),
    ("methylcyclohexane", None),
    ("2-2-4-trimethylpentane", None),
    ("ethanol", "Ethanol"),
]
# names tried for the fluids marked None, to document that they are absent
ABSENT_TRIES = {
    "methylcyclohexane": ["MethylCyclohexane", "Methylcyclohexane", "methylcyclohexane", "108-87-2"],
    "2-2-4-trimethylpentane": ["Isooctane", "IsoOctane", "iso-octane", "2,2,4-trimethylpentane", "540-84-1"],
}

T_VAPOR_END = 1500.0  # K; upper end of the dilute-gas grid (ideal-gas cp checked to 1500 K)
R_PA_DILUTE = 1.0  # Pa; pressure of the dilute-gas state (zero-density limit in practice)
P_ATM = 101325.0
FMT = "%.10g"


def load_bib():
    path = os.path.join(os.path.dirname(CoolProp.__file__), "CoolPropBibTeXLibrary.bib")
    text = open(path, encoding="utf-8", errors="replace").read()
    entries = {}
    for m in re.finditer(r"@\w+\{([^,\s]+),(.*?)\n\}", text, re.S):
        key, body = m.group(1), m.group(2)
        fields = {}
        for fm in re.finditer(r"(\w+)\s*=\s*\{(.*?)\},?\s*$", body, re.S | re.M):
            fields[fm.group(1).lower()] = re.sub(r"\s+", " ", fm.group(2)).replace("{", "").replace("}", "")
        entries[key] = fields
    return entries


BIB = load_bib()


def cite(key):
    """Readable reference for a CoolProp BibTeX key."""
    if not key:
        return ""
    e = BIB.get(key)
    if not e:
        return key
    tex = {r"\~n": "n", r"\"u": "u", r"\"o": "o", r"\"a": "a", r"\'e": "e", r"\&": "&", "\\": ""}
    parts = []
    for f in ("author", "title", "journal", "volume", "pages", "year", "doi"):
        v = e.get(f, "")
        for a, b in tex.items():
            v = v.replace(a, b)
        if v:
            parts.append(("doi:" + v) if f == "doi" else v)
    return "[" + key + "] " + ", ".join(parts)


def fmt(x):
    if x is None or not math.isfinite(x):
        return ""
    return FMT % x


def safe(fn, notes, label):
    try:
        v = fn()
    except ValueError as e:
        msg = str(e).strip().splitlines()[0]
        notes.setdefault(label, msg)
        return None
    if not math.isfinite(v):
        notes.setdefault(label, "non-finite result")
        return None
    return v


def header(lines, f):
    for ln in lines:
        f.write("# " + ln + "\n" if ln else "#\n")


def common_header(name, what):
    return [
        what,
        "library: CoolProp %s (git %s), HEOS backend, Python %s"
        % (CoolProp.__version__, getattr(CoolProp, "__gitrevision__", "?"), sys.version.split()[0]),
        "date: %s" % DATE,
        "command: %s   (run from the repository root)" % COMMAND,
        "CoolProp fluid name: %s (CAS %s)" % (name, CP.get_fluid_param_string(name, "CAS")),
        "equation of state: " + cite(CP.get_fluid_param_string(name, "BibTeX-EOS")),
        "ideal-gas heat capacity: "
        + (cite(CP.get_fluid_param_string(name, "BibTeX-CP0")) or "part of the equation of state above"),
        "viscosity model: " + (cite(CP.get_fluid_param_string(name, "BibTeX-VISCOSITY")) or "none in CoolProp (cells empty)"),
        "thermal conductivity model: "
        + (cite(CP.get_fluid_param_string(name, "BibTeX-CONDUCTIVITY")) or "none in CoolProp (cells empty)"),
        "surface tension model: "
        + (cite(CP.get_fluid_param_string(name, "BibTeX-SURFACE_TENSION")) or "none in CoolProp (cells empty)"),
    ]


def saturated_table(fid, name):
    AS = CP.AbstractState("HEOS", name)
    Tc, Tt = AS.T_critical(), AS.Ttriple()
    AS.update(CP.PQ_INPUTS, P_ATM, 0.0)
    Tb = AS.T()
    T0 = max(Tt, Tb - 80.0)
    Tstart = 5.0 * math.ceil(T0 / 5.0 - 1e-9)
    Tend = 0.9 * Tc
    temps = []
    T = Tstart
    while T <= Tend + 1e-9:
        temps.append(T)
        T += 5.0
    notes = {}
    rows = []
    for T in temps:
        AS.update(CP.QT_INPUTS, 0.0, T)
        p = AS.p()
        rho = AS.rhomass()
        hL = AS.hmass()
        cp = safe(AS.cpmass, notes, "liquid_cp")
        mu = safe(AS.viscosity, notes, "liquid_viscosity")
        k = safe(AS.conductivity, notes, "liquid_conductivity")
        sig = safe(AS.surface_tension, notes, "surface_tension")
        AS.update(CP.QT_INPUTS, 1.0, T)
        L = AS.hmass() - hL
        rows.append([T, p, rho, L, cp, mu, k, sig])
    cols = [
        ("temperature_K", "temperature, K (ITS-90 as used by the EOS)"),
        ("vapor_pressure_Pa", "saturation pressure, Pa"),
        ("liquid_density_kg_m3", "saturated-liquid density, kg/m^3"),
        ("latent_heat_J_kg", "enthalpy of vaporization h(Q=1) - h(Q=0) at T, J/kg"),
        ("liquid_cp_J_kgK", "saturated-liquid isobaric heat capacity cp, J/(kg K)"),
        ("liquid_viscosity_Pa_s", "saturated-liquid dynamic viscosity, Pa s"),
        ("liquid_conductivity_W_mK", "saturated-liquid thermal conductivity, W/(m K)"),
        ("surface_tension_N_m", "vapour-liquid surface tension, N/m"),
    ]
    hdr = common_header(name, "Saturated-liquid (Q = 0) reference properties of %s for dropcut validation." % fid)
    hdr += [
        "grid: T from %.0f K to %.2f K in 5 K steps; start = max(triple point %.3f K, T_b - 80 K = %.3f K) rounded up"
        " to a multiple of 5 K; end <= 0.9 T_c (T_c = %.3f K)" % (Tstart, temps[-1], Tt, Tb - 80.0, Tc),
        "columns:",
    ] + ["  %s: %s" % c for c in cols]
    if notes:
        hdr.append("empty cells (CoolProp message):")
        hdr += ["  %s: %s" % kv for kv in sorted(notes.items())]
    else:
        hdr.append("empty cells: none (CoolProp has a model for every column)")
    path = os.path.join(OUT, fid + ".csv")
    with open(path, "w", newline="") as f:
        header(hdr, f)
        w = csv.writer(f, lineterminator="\n")
        w.writerow([c[0] for c in cols])
        for r in rows:
            w.writerow([fmt(x) for x in r])
    return notes, (Tstart, temps[-1], len(rows))


def vapor_table(fid, name):
    AS = CP.AbstractState("HEOS", name)
    Tmax_eos = AS.Tmax()
    Ru = CP.PropsSI("gas_constant", name)
    notes = {}
    rows = []
    T = 300.0
    while T <= T_VAPOR_END + 1e-9:
        rho_molar = R_PA_DILUTE / (Ru * T)  # ideal-gas density at 1 Pa
        AS.update(CP.DmolarT_INPUTS, rho_molar, T)
        cp0 = safe(AS.cp0mass, notes, "ideal_gas_cp")
        mu = safe(AS.viscosity, notes, "vapor_viscosity")
        k = safe(AS.conductivity, notes, "vapor_conductivity")
        rows.append([T, cp0, mu, k, 1 if T > Tmax_eos + 1e-9 else 0])
        T += 25.0
    cols = [
        ("temperature_K", "temperature, K"),
        ("ideal_gas_cp_J_kgK", "ideal-gas isobaric heat capacity cp0(T), J/(kg K) (from the EOS ideal-gas part)"),
        ("vapor_viscosity_Pa_s", "gas viscosity at %.0f Pa (practically the zero-density limit), Pa s" % R_PA_DILUTE),
        ("vapor_conductivity_W_mK", "gas thermal conductivity at %.0f Pa (zero-density limit), W/(m K)" % R_PA_DILUTE),
        ("beyond_eos_tmax", "1 if T exceeds the EOS upper temperature limit T_max = %.1f K (CoolProp still evaluates;"
         " values are extrapolations of the EOS / correlations), else 0" % Tmax_eos),
    ]
    hdr = common_header(name, "Dilute-gas reference properties of %s vapour for dropcut validation." % fid)
    hdr += [
        "state: T on a 25 K grid 300..%.0f K,"
        % T_VAPOR_END + " molar density = (%.0f Pa)/(R T) set with DmolarT inputs"
        " (well below the saturation pressure at every T of the grid)" % R_PA_DILUTE,
        "EOS stated range: T_triple %.3f K .. T_max %.1f K; CoolProp evaluates above T_max without error, see beyond_eos_tmax"
        % (AS.Ttriple(), Tmax_eos),
        "columns:",
    ] + ["  %s: %s" % c for c in cols]
    if notes:
        hdr.append("empty cells (CoolProp message):")
        hdr += ["  %s: %s" % kv for kv in sorted(notes.items())]
    else:
        hdr.append("empty cells: none")
    path = os.path.join(OUT, fid + "_vapor.csv")
    with open(path, "w", newline="") as f:
        header(hdr, f)
        w = csv.writer(f, lineterminator="\n")
        w.writerow([c[0] for c in cols])
        for r in rows:
            w.writerow([fmt(x) for x in r[:-1]] + [str(r[-1])])
    return notes, Tmax_eos


def check_absent(fid):
    for n in ABSENT_TRIES.get(fid, []):
        try:
            CP.get_fluid_param_string(n, "name")
            return n  # found after all
        except ValueError:
            pass
    return None


def main():
    os.makedirs(OUT, exist_ok=True)
    const_rows = []
    summary = []
    absent = []
    for fid, name in FLUIDS:
        if name is None:
            found = check_absent(fid)
            if found is None:
                absent.append("%s (tried %s)" % (fid, ", ".join(ABSENT_TRIES[fid])))
                summary.append((fid, "NOT IN CoolProp %s" % CoolProp.__version__))
                continue
            name = found
        sat_notes, (t0, t1, n) = saturated_table(fid, name)
        vap_notes, tmax = vapor_table(fid, name)
        AS = CP.AbstractState("HEOS", name)
        AS.update(CP.PQ_INPUTS, P_ATM, 0.0)
        Tb = AS.T()
        const_rows.append([
            fid, fmt(AS.molar_mass()), fmt(AS.T_critical()), fmt(AS.p_critical()), fmt(AS.acentric_factor()),
            fmt(Tb), fmt(AS.Ttriple()), cite(CP.get_fluid_param_string(name, "BibTeX-EOS")),
        ])
        missing = sorted(set(sat_notes) | set(vap_notes))
        summary.append((fid, "%s: sat %g..%g K (%d rows), EOS Tmax %g K, missing: %s"
                        % (name, t0, t1, n, tmax, ", ".join(missing) or "none")))
    hdr = [
        "Fluid constants from CoolProp reference equations of state, for dropcut validation.",
        "library: CoolProp %s (git %s), HEOS backend" % (CoolProp.__version__, getattr(CoolProp, "__gitrevision__", "?")),
        "date: %s" % DATE,
        "command: %s   (run from the repository root)" % COMMAND,
        "columns:",
        "  id: dropcut component id",
        "  molar_mass_kg_mol: molar mass, kg/mol",
        "  critical_temperature_K: critical temperature of the EOS, K",
        "  critical_pressure_Pa: critical pressure of the EOS, Pa",
        "  acentric_factor: acentric factor as stored with the CoolProp fluid, -",
        "  normal_boiling_point_K: saturation temperature at 101325 Pa computed from the EOS, K",
        "  triple_point_K: triple-point temperature (lower limit of the EOS), K",
        "  eos_reference: reference equation of state used by CoolProp for the fluid",
        "fluids requested but absent from CoolProp %s: %s" % (CoolProp.__version__, "; ".join(absent) or "none"),
    ]
    with open(os.path.join(OUT, "constants.csv"), "w", newline="") as f:
        header(hdr, f)
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["id", "molar_mass_kg_mol", "critical_temperature_K", "critical_pressure_Pa", "acentric_factor",
                    "normal_boiling_point_K", "triple_point_K", "eos_reference"])
        w.writerows(const_rows)
    for fid, s in summary:
        print("%-24s %s" % (fid, s))


if __name__ == "__main__":
    main()
