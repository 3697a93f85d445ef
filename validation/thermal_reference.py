#!/usr/bin/env python3
"""Reference latent heats and liquid heat capacities for the components whose values the generator now
anchors on a single compilation (VDI PPDS, CRC Handbook, Zabransky et al.), from a DIFFERENT compilation.

Writes validation/handbook/thermal.csv (run from the repository root):

    python3 validation/thermal_reference.py

Rows (id, property, temperature, value in J/mol or J/mol/K, source id, asserted, relative tolerance):
  * latent heat, CRC Handbook 95th ed. section 6 (enthalpy of vaporization at 298.15 K and at Tb; measured
    values), where the component's coefficients came from VDI PPDS; asserted within 3 %.
  * latent heat, Alibakhshi (2017) one-coefficient equation with its per-compound coefficient (fitted by the
    author to measured enthalpies; 4.5 % mean error over 1890 compounds, valid to about 0.8 Tc), at Tb only
    (at 298.15 K it runs 7-26 % below the CRC values for C8-C16 hydrocarbons, so it is no check there);
    asserted within 10 % (about twice the published mean error: a coarse check that catches unit, compound
    and copying errors, not a precision check) where no CRC value is independent of the coefficients,
    reported otherwise.
  * latent heat at 298.15 K, Gharagheizi et al. (2011) data appendix (the compiled experimental set their
    group method was fitted to), reported (asserted = 0): its origin overlaps the CRC values.
  * for components whose latent heat is still the Riedel-Watson estimate: the Alibakhshi value at Tb and the
    Gharagheizi value at 298.15 K, reported only, to show how far the estimate is from what is published.
  * liquid heat capacity at 298.15 K, Poling, Prausnitz & O'Connell 5th ed. Appendix A (Cp liquid at
    298.15 K), where the coefficients came from the CRC Handbook or Zabransky; asserted within 2 %. Both
    compilations draw on the same calorimetric literature, so this row mostly checks that the values were
    copied correctly, not the measurement itself (said in docs/validation.md).

Only the data files of chemicals 1.5.2 are read (plus chemicals.phase_change.Alibakhshi, the published
equation); the component files decide which rows are independent (src/checks/properties/thermal.rs skips a
row whose source id equals the component's own coefficient source).
"""
import csv
import datetime
import glob
import os
import sys
import tomllib

import chemicals

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from chemicals_tables import load, num  # noqa: E402
from chemicals.phase_change import Alibakhshi

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
OUT = os.path.join(ROOT, "validation", "handbook", "thermal.csv")


def main():
    crc_h = load("Phase Change/CRC Handbook Heat of Vaporization.tsv")
    ali = load("Phase Change/Alibakhshi one-coefficient enthalpy of vaporization.tsv")
    gha = load("Phase Change/Ghazerati Appendix Vaporization Enthalpy.tsv")
    poling = load("Heat Capacity/PolingDatabank.tsv")
    rows = []
    for f in sorted(glob.glob(os.path.join(ROOT, "mixtures", "components", "*.toml"))):
        d = tomllib.load(open(f, "rb"))
        cid, cas = d["id"], d["cas"]
        lh_src, cp_src = d["latent-heat"]["source"], d["liquid-heat-capacity"]["source"]
        tc = d["constants"]["critical-temperature"]["value"]
        tb = d["constants"]["normal-boiling-point"]["value"]
        if lh_src in ("vdi-heat-atlas-ppds", "crc95-heat-of-vaporization"):
            r = crc_h.get(cas)
            if r:
                for t, key in ((298.15, "Hvap298"), (num(r[0]["Tb"]) or tb, "HvapTb")):
                    v = num(r[0][key])
                    if v:
                        rows.append((cid, "latent-heat", t, v, "crc95-heat-of-vaporization", 1, 0.03,
                                     "CRC Handbook 95th ed., section 6, enthalpy of vaporization (chemicals 1.5.2 data file)"))
            r = ali.get(cas)
            if r and num(r[0]["C"]) is not None:
                independent_crc = bool(crc_h.get(cas)) and lh_src != "crc95-heat-of-vaporization"
                for t in (tb,):
                    if t < 0.8 * tc:
                        rows.append((cid, "latent-heat", t, round(Alibakhshi(t, tc, num(r[0]["C"])), 1), "alibakhshi-2017",
                                     0 if independent_crc else 1, 0.10,
                                     f"Alibakhshi, Fluid Phase Equilib. 432 (2017) 62, one-coefficient equation, C = {r[0]['C']} J/mol/K (chemicals 1.5.2 data file), Tc of the component file"))
            r = gha.get(cas)
            if r and num(r[0]["Hvap298"]):
                rows.append((cid, "latent-heat", 298.15, num(r[0]["Hvap298"]), "gharagheizi-2011", 0, 0.03,
                             "Gharagheizi et al. 2011 data appendix, enthalpy of vaporization at 298.15 K (chemicals 1.5.2 data file)"))
        if lh_src.startswith("estimated:"):
            # the estimate (Riedel + Watson) against what is published, reported only (asserted = 0)
            r = ali.get(cas)
            if r and num(r[0]["C"]) is not None and tb < 0.8 * tc:
                rows.append((cid, "latent-heat", tb, round(Alibakhshi(tb, tc, num(r[0]["C"])), 1), "alibakhshi-2017", 0, 0.10,
                             f"Alibakhshi, Fluid Phase Equilib. 432 (2017) 62, one-coefficient equation, C = {r[0]['C']} J/mol/K (chemicals 1.5.2 data file), Tc of the component file"))
            r = gha.get(cas)
            if r and num(r[0]["Hvap298"]):
                rows.append((cid, "latent-heat", 298.15, num(r[0]["Hvap298"]), "gharagheizi-2011", 0, 0.03,
                             "Gharagheizi et al. 2011 data appendix, enthalpy of vaporization at 298.15 K (chemicals 1.5.2 data file)"))
        if cp_src in ("crc95-standard-thermo", "zabransky-1996"):
            r = poling.get(cas)
            if r and num(r[0]["Cpl"]):
                rows.append((cid, "liquid-heat-capacity", 298.15, num(r[0]["Cpl"]), "poling5-appendix-a", 1, 0.02,
                             "Poling, Prausnitz & O'Connell 5th ed. Appendix A, liquid Cp at 298.15 K (chemicals 1.5.2 PolingDatabank)"))
    with open(OUT, "w", newline="") as fh:
        fh.write("# Reference latent heats and liquid heat capacities from a compilation other than the one that fed the coefficients\n")
        fh.write(f"# library: chemicals {chemicals.__version__} data files (and its Alibakhshi equation), Python {sys.version.split()[0]}\n")
        fh.write(f"# date: {datetime.date.today().isoformat()}\n")
        fh.write("# command: python3 validation/thermal_reference.py\n")
        fh.write("# columns: id, property (latent-heat | liquid-heat-capacity), temperature_K, value (J/mol or J/mol/K), source_id, asserted (1 = judged, 0 = reported), tolerance_rel, source\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["id", "property", "temperature_K", "value", "source_id", "asserted", "tolerance_rel", "source"])
        for r in rows:
            w.writerow(r)
    print(f"wrote {len(rows)} rows to {OUT}")


if __name__ == "__main__":
    main()
