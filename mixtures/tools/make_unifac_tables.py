#!/usr/bin/env python3
"""Write the original-UNIFAC parameter tables used by `--activity unifac` as data files:

  mixtures/unifac/original-unifac-subgroups.csv     subgroup, number, main group, R_k, Q_k
  mixtures/unifac/original-unifac-interactions.csv  main group m, main group n, a_mn [K]

Parameter set: original UNIFAC (Fredenslund, Jones & Prausnitz 1975, AIChE J. 21:1086) with the group volumes,
areas and interaction parameters of the public original-UNIFAC matrix as published by DDBST ("Published
parameters UNIFAC", www.ddbst.com): Hansen, Rasmussen, Fredenslund, Schiller & Gmehling (1991), Ind. Eng. Chem.
Res. 30:2352-2355 (revision and extension 5), with the revision of Wittig, Lohmann & Gmehling (2003), Ind. Eng.
Chem. Res. 42:183-188 (revision and extension 6).

Copy: the thermo package (pip install thermo; the version is written into the header) carries that
DDBST table as `thermo.unifac.UFSG` (subgroups) and the file "UNIFAC original interaction parameters.tsv"
(`thermo.unifac.UFIP`). This script copies them digit for digit; nothing is fitted or changed.

Usage: python3 mixtures/tools/make_unifac_tables.py
"""
import datetime
import os

import thermo
from thermo import unifac

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.normpath(os.path.join(HERE, "..", "unifac"))

SOURCE = ("# Parameter set: original UNIFAC (Fredenslund, Jones & Prausnitz 1975), published DDBST matrix = Hansen et al. (1991) "
          "Ind. Eng. Chem. Res. 30:2352 with Wittig, Lohmann & Gmehling (2003) Ind. Eng. Chem. Res. 42:183")


# Subgroup names that the published table repeats: renamed so that every name is a unique key.
RENAME = {26: "CH-O"}


def header(what):
    today = datetime.date.today().isoformat()
    return [
        f"# {what}",
        SOURCE,
        f"# Transcribed digit for digit from thermo {thermo.__version__} (thermo.unifac.UFSG / UFIP), {today}",
        "# Command: python3 mixtures/tools/make_unifac_tables.py   (do not edit by hand)",
    ]


def main():
    unifac.load_unifac_ip()
    os.makedirs(OUT, exist_ok=True)
    rows = header("Original UNIFAC subgroups: van der Waals group volume R_k and area Q_k (Bondi), main-group number")
    rows.append("# Subgroup 26 (ether CH-O of main group 13) is written CH-O here so names are unique; the published table writes CHO for it and for subgroup 20 (aldehyde)")
    rows.append("subgroup,number,main_group_number,main_group,R,Q")
    names = set()
    for k in sorted(unifac.UFSG):
        s = unifac.UFSG[k]
        name = RENAME.get(k, s.group)
        assert name not in names and "," not in name, name
        names.add(name)
        rows.append(f"{name},{k},{s.main_group_id},{s.main_group},{s.R!r},{s.Q!r}")
    with open(os.path.join(OUT, "original-unifac-subgroups.csv"), "w") as fh:
        fh.write("\n".join(rows) + "\n")
    rows = header("Original UNIFAC main-group interaction parameters a_mn [K]: Psi_mn = exp(-a_mn/T); a_mm = 0; absent pairs have no published value")
    rows.append("main_group_m,main_group_n,a_mn_K")
    n = 0
    for m in sorted(unifac.UFIP):
        for k in sorted(unifac.UFIP[m]):
            rows.append(f"{m},{k},{unifac.UFIP[m][k]!r}")
            n += 1
    with open(os.path.join(OUT, "original-unifac-interactions.csv"), "w") as fh:
        fh.write("\n".join(rows) + "\n")
    print(f"wrote {len(unifac.UFSG)} subgroups and {n} interaction parameters to {OUT}")


if __name__ == "__main__":
    main()
