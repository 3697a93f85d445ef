#!/usr/bin/env python3
"""Sanity checks for mixtures/components/*.toml, mixtures/gases.toml and the fuel files.

Reads the TOML files with the standard library only (Python >= 3.11, tomllib),
evaluates every published correlation at 300 K and at the normal boiling point,
and prints one line per component.  Sections with model = "corresponding-states"
are shown as "CS" (the Rust side estimates them).  Checks:

  * vapour pressure at Tb within 3 % of 101325 Pa
  * liquid density 600..1100 kg/m3 at 300 K (or at Tm + 10 K for solids)
  * latent heat at Tb 200..900 kJ/kg
  * all other properties positive and in broad plausible ranges
  * every source id resolves in mixtures/sources.toml (or is a marker)
  * fuel fractions sum to 1 and name known components / fuels

Usage:  python3 mixtures/tools/check_components.py        (exit status 1 on failure)
"""
import glob
import math
import os
import sys
import tomllib

HERE = os.path.dirname(os.path.abspath(__file__))
MIX = os.path.normpath(os.path.join(HERE, ".."))
R = 8.314462618
UNIT = {"Pa": (1, 0), "kPa": (1e3, 0), "bar": (1e5, 0), "mmHg": (133.322368, 0), "kg/m3": (1, 0),
        "mol/m3": (1, 1), "kmol/m3": (1e3, 1), "J/kg": (1, 0), "J/mol": (1, -1), "J/kmol": (1e-3, -1),
        "kJ/mol": (1e3, -1), "J/kg/K": (1, 0), "J/mol/K": (1, -1), "J/kmol/K": (1e-3, -1), "cp/R": (R, -1),
        "Pa*s": (1, 0), "mPa*s": (1e-3, 0), "W/m/K": (1, 0), "N/m": (1, 0), "mN/m": (1e-3, 0)}
POLY = ("dippr100",)


def raw(sec, T):
    m, c = sec["model"], sec.get("coefficients", [])
    if m in POLY:  # polynomials are held at their end value outside the range (as the loader does)
        T = min(max(T, sec.get("t-min", T)), sec.get("t-max", T))
    if m == "constant":
        return c[0]
    if m == "dippr100":
        return sum(ci * T ** i for i, ci in enumerate(c))
    if m == "dippr101":
        A, B, C, D, E = (list(c) + [0.0] * 5)[:5]
        return math.exp(A + B / T + C * math.log(T) + D * T ** E)
    if m == "dippr102":
        A, B, C, D = (list(c) + [0.0] * 4)[:4]
        return A * T ** B / (1 + C / T + D / T ** 2)
    if m == "dippr105":
        A, B, C, D = c
        return A / B ** (1 + (1 - T / C) ** D)
    if m == "dippr106":
        Tr = T / sec["tc"]
        A, B, C, D, E = (list(c) + [0.0] * 5)[:5]
        return A * (1 - Tr) ** (B + C * Tr + D * Tr ** 2 + E * Tr ** 3) if Tr < 1 else 0.0
    if m == "dippr107":
        A, B, C, D, E = c
        return A + B * ((C / T) / math.sinh(C / T)) ** 2 + D * ((E / T) / math.cosh(E / T)) ** 2
    if m == "dippr114":
        A, B, C, D = c
        t = 1 - T / sec["tc"]
        return A * A / t + B - 2 * A * C * t - A * D * t ** 2 - C * C * t ** 3 / 3 - C * D * t ** 4 / 2 - D * D * t ** 5 / 5
    if m == "antoine":
        A, B, C = c
        return 10 ** (A - B / (T + C))
    if m == "vogel":
        A, B, C = c
        return 10 ** (A + B / (T + C))
    if m == "wagner":
        A, B, C, D = c
        tau = 1 - T / sec["tc"]
        return sec["pc"] * math.exp((A * tau + B * tau ** 1.5 + C * tau ** 2.5 + D * tau ** 5) / (T / sec["tc"]))
    if m == "mulero-cachadina":
        x = max(1 - T / sec["tc"], 0.0)
        return sum(c[i] * x ** c[i + 1] for i in range(0, len(c), 2))
    if m == "ppds-density":  # VDI Heat Atlas PPDS: rhoc + A tau^0.35 + B tau^(2/3) + C tau + D tau^(4/3)
        tau = max(1 - T / sec["tc"], 0.0)
        return c[0] + c[1] * tau ** 0.35 + c[2] * tau ** (2 / 3) + c[3] * tau + c[4] * tau ** (4 / 3)
    if m == "ppds-viscosity":  # PPDS eq. 9: E exp(A x^(1/3) + B x^(4/3)), x = (C - T)/(T - D)
        A, B, C, D, E = c
        T = max(T, D + 5.0)
        x = (C - T) / (T - D)
        x13 = math.copysign(abs(x) ** (1 / 3), x)
        return E * math.exp(A * x13 + B * x * x13)
    if m == "nasa7":
        a = sec["coefficients-low"] if T < sec["t-mid"] else sec["coefficients-high"]
        return sum(a[i] * T ** i for i in range(5))
    raise ValueError(m)


def ev(sec, T, M):
    if sec["model"] == "corresponding-states":
        return None
    f, p = UNIT[sec["unit"]]
    return raw(sec, T) * f * (M ** p if p else 1.0)


def fmt(v, scale=1.0, spec="{:8.3g}"):
    return "      CS" if v is None else spec.format(v * scale)


def main():
    fails = []
    warns = []
    sources = tomllib.load(open(os.path.join(MIX, "sources.toml"), "rb"))
    def src_ok(s, where):
        if s in sources or s in ("common-practice", "from-memory") or s.startswith("estimated:"):
            return
        fails.append(f"{where}: unknown source {s}")
    comps = {}
    for f in sorted(glob.glob(os.path.join(MIX, "components", "*.toml"))):
        d = tomllib.load(open(f, "rb"))
        comps[d["id"]] = d
    hdr = (f"{'id':32s} {'Tb':>6s} {'P(Tb)/atm':>9s} {'rho300':>7s} {'rho15C':>7s} {'L(Tb)kJ/kg':>10s} {'cpl300':>7s} "
           f"{'mul300mPas':>10s} {'kl300':>7s} {'sig300mN':>8s} {'cpg300':>7s} {'cpg1000':>7s} {'muv600uPas':>10s} {'kv600':>7s} {'LHV MJ/kg':>9s} {'CN':>5s}")
    print(hdr)
    for cid, d in comps.items():
        c = d["constants"]
        M = c["molar-mass"]["value"]
        Tb = c["normal-boiling-point"]["value"]
        Tm = c["melting-point"]["value"]
        for k, v in c.items():
            src_ok(v["source"], f"{cid}.{k}")
        need = ["vapor-pressure", "liquid-density", "latent-heat", "liquid-heat-capacity", "liquid-viscosity",
                "liquid-conductivity", "surface-tension", "ideal-gas-heat-capacity", "vapor-viscosity", "vapor-conductivity"]
        for s in need:
            if s not in d:
                fails.append(f"{cid}: missing [{s}]")
            else:
                src_ok(d[s]["source"], f"{cid}.{s}")
        T300 = max(300.0, Tm + 10)
        g = lambda s, T: ev(d[s], T, M)
        p = g("vapor-pressure", Tb)
        rho = g("liquid-density", T300)
        rho15 = g("liquid-density", 288.15)
        L = g("latent-heat", Tb)
        vals = dict(cpl=g("liquid-heat-capacity", T300), mul=g("liquid-viscosity", T300), kl=g("liquid-conductivity", T300),
                    sig=g("surface-tension", T300), cpg=g("ideal-gas-heat-capacity", 300.0), cpg1000=g("ideal-gas-heat-capacity", 1000.0),
                    muv=g("vapor-viscosity", 600.0), kv=g("vapor-conductivity", 600.0))
        print(f"{cid:32s} {Tb:6.1f} {fmt(p, 1/101325, '{:9.4f}')} {fmt(rho, 1, '{:7.1f}')} {fmt(rho15, 1, '{:7.1f}')} {fmt(L, 1e-3, '{:10.1f}')} "
              f"{fmt(vals['cpl'], 1, '{:7.0f}')} {fmt(vals['mul'], 1e3, '{:10.4f}')} {fmt(vals['kl'], 1, '{:7.4f}')} {fmt(vals['sig'], 1e3, '{:8.2f}')} "
              f"{fmt(vals['cpg'], 1, '{:7.0f}')} {fmt(vals['cpg1000'], 1, '{:7.0f}')} {fmt(vals['muv'], 1e6, '{:10.2f}')} {fmt(vals['kv'], 1, '{:7.4f}')} "
              f"{c['lower-heating-value']['value']/1e6:9.3f} {c['cetane-number']['value']:5.1f}")
        if p is not None and abs(p / 101325 - 1) > 0.05:
            fails.append(f"{cid}: P(Tb) = {p:.0f} Pa")
        elif p is not None and abs(p / 101325 - 1) > 0.03:
            warns.append(f"{cid}: P(Tb) = {p:.0f} Pa ({(p/101325-1)*100:+.1f} %, > 3 %)")
        if rho is not None and not 600 <= rho <= 1100:
            fails.append(f"{cid}: rho = {rho:.1f}")
        if L is not None and not 200e3 <= L <= 900e3:
            fails.append(f"{cid}: L(Tb) = {L:.0f}")
        rng = dict(cpl=(1000, 3500), mul=(1e-4, 2e-2), kl=(0.05, 0.3), sig=(0.01, 0.05), cpg=(700, 3000),
                   cpg1000=(1500, 5000), muv=(5e-6, 3e-5), kv=(0.01, 0.1))
        for k, (lo, hi) in rng.items():
            if vals[k] is not None and not lo <= vals[k] <= hi:
                fails.append(f"{cid}: {k} = {vals[k]:.4g} outside {lo}..{hi}")
    # gases
    gp = os.path.join(MIX, "gases.toml")
    if os.path.exists(gp):
        gases = tomllib.load(open(gp, "rb"))
        print("\ngas   cp300 J/kg/K  cp1500  mu300 uPa s  mu1500  k300 W/m/K  k1500")
        for gid, gd in gases.items():
            M = gd["molar-mass"]["value"]
            for k, v in gd.items():
                if isinstance(v, dict) and "source" in v:
                    src_ok(v["source"], f"gas {gid}.{k}")
            r = [ev(gd[s], T, M) for s in ("ideal-gas-heat-capacity", "vapor-viscosity", "vapor-conductivity") for T in (300.0, 1500.0)]
            print(f"{gid:5s} {r[0]:11.1f} {r[1]:8.1f} {r[2]*1e6:10.2f} {r[3]*1e6:8.2f} {r[4]:10.4f} {r[5]:7.4f}")
    # fuels
    print()
    fuels = {}
    for f in sorted(glob.glob(os.path.join(MIX, "*.toml"))):
        if os.path.basename(f) in ("sources.toml", "gases.toml"):
            continue
        fuels[os.path.splitext(os.path.basename(f))[0]] = tomllib.load(open(f, "rb"))
    alias = {a: cid for cid, d in comps.items() for a in d.get("aliases", [])}
    for fid, fd in fuels.items():
        part = fd.get("composition") or fd.get("blend")
        tot = sum(part.values())
        if abs(tot - 1) > 1e-9:
            fails.append(f"fuel {fid}: fractions sum to {tot}")
        for k in part:
            if "composition" in fd and k not in comps and k not in alias:
                fails.append(f"fuel {fid}: unknown component {k}")
            if "blend" in fd and k not in fuels:
                fails.append(f"fuel {fid}: unknown fuel {k}")
        if "composition" in fd:
            print(fuel_summary(fid, fd, comps))
    if warns:
        print("\nWARNINGS:")
        for w in warns:
            print("  " + w)
    if fails:
        print("\nFAILURES:")
        for f in fails:
            print("  " + f)
        sys.exit(1)
    print("\nall checks passed")


def fuel_summary(fid, fd, comps):
    """density at 15 C with ideal volume additivity; boiling range of the components."""
    part = fd["composition"]
    basis = fd["basis"]
    rows = []
    for k, x in part.items():
        d = comps[k]
        M = d["constants"]["molar-mass"]["value"]
        rho = ev(d["liquid-density"], 288.15, M)
        if rho is None:  # same default as the loader: Rackett with Spencer-Danner Z_RA (Yamada-Gunn if absent)
            c = d["constants"]
            Tc, Pc, om = c["critical-temperature"]["value"], c["critical-pressure"]["value"], c["acentric-factor"]["value"]
            z = c.get("rackett-z", {}).get("value", 0.29056 - 0.08775 * om)
            rho = M / (R * Tc / Pc * z ** (1 + (1 - 288.15 / Tc) ** (2 / 7)))
        rows.append((k, x, M, rho, d["constants"]["normal-boiling-point"]["value"], d["class"]))
    if basis == "volume":
        mass = [x * rho for _, x, _, rho, _, _ in rows]
    elif basis == "mass":
        mass = [x for _, x, *_ in rows]
    else:
        mass = [x * M for _, x, M, *_ in rows]
    mt = sum(mass)
    vol = sum(m / r[3] for m, r in zip(mass, rows))
    arom = sum(m / r[3] for m, r in zip(mass, rows) if r[5] in ("alkylbenzene", "cycloaromatic", "diaromatic")) / vol
    tbs = sorted(r[4] for r in rows)
    return (f"fuel {fid:22s} {len(rows):2d} components  rho(15 C) = {mt / vol:6.1f} kg/m3  aromatics {arom*100:4.1f} vol%  "
            f"Tb {tbs[0]-273.15:5.1f}..{tbs[-1]-273.15:5.1f} C")


if __name__ == "__main__":
    main()
