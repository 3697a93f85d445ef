#!/usr/bin/env python3
"""Reference activity coefficients by the UNIFAC implementation of the `thermo` package, for dropcut validation.

Writes validation/thermo/unifac_gammas.csv: γ_i of binary (and one ternary) liquids of library components at
several compositions and temperatures, by thermo.unifac.UNIFAC (version 0 = original UNIFAC) with thermo's
original-UNIFAC parameter tables UFSG/UFIP (the DDBST published matrix: Hansen et al. 1991, Ind. Eng. Chem. Res.
30:2352, revised by Wittig, Lohmann & Gmehling 2003, Ind. Eng. Chem. Res. 42:183) - the same published set that
dropcut's mixtures/unifac/*.csv transcribe, so this checks dropcut's equations and group bookkeeping, not the
parameters. The subgroup counts are read from dropcut's component files (mixtures/components/<id>.toml,
`unifac-groups`), so the committed assignments are exercised end to end.

Usage (from the repository root): python3 validation/unifac_reference.py
"""
import datetime
import os
import tomllib

import thermo
from thermo.unifac import UFIP, UFSG, UNIFAC

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
OUT = os.path.join(ROOT, "validation", "thermo", "unifac_gammas.csv")
RENAMED = {"CH-O": 26}  # dropcut's unique name for subgroup 26 (the published table writes CHO twice)

# (components, temperature K): aromatic-paraffin, ethanol-hydrocarbon, naphthene and diaromatic systems
SYSTEMS = [
    (["ethanol", "n-heptane"], [320.0, 350.0]),
    (["toluene", "n-dodecane"], [300.0, 400.0]),
    (["ethanol", "toluene"], [340.0]),
    (["1-methylnaphthalene", "n-hexadecane"], [400.0, 450.0]),
    (["tetralin", "n-decane"], [380.0]),
    (["ethylbenzene", "methylcyclohexane"], [360.0]),
    (["2-2-4-trimethylpentane", "1-2-4-trimethylbenzene"], [370.0]),
    (["ethanol", "2-2-4-trimethylpentane", "toluene"], [345.0]),
]
BINARY_X = [0.02, 0.1, 0.3, 0.5, 0.7, 0.9, 0.98]
TERNARY_X = [[0.1, 0.6, 0.3], [0.3, 0.4, 0.3], [0.05, 0.15, 0.8]]


def groups_of(cid):
    with open(os.path.join(ROOT, "mixtures", "components", cid + ".toml"), "rb") as fh:
        data = tomllib.load(fh)
    by_name = {s.group: k for k, s in UFSG.items() if k != 26}
    by_name.update(RENAMED)
    return {by_name[name]: n for name, n in data["unifac-groups"].items()}


def main():
    rows = []
    for comps, temps in SYSTEMS:
        chemgroups = [groups_of(c) for c in comps]
        xs_list = [[x, 1 - x] for x in BINARY_X] if len(comps) == 2 else TERNARY_X
        for t in temps:
            for xs in xs_list:
                model = UNIFAC.from_subgroups(T=t, xs=xs, chemgroups=chemgroups, version=0, interaction_data=UFIP, subgroups=UFSG)
                g = model.gammas()
                rows.append(f"{'+'.join(comps)},{t},{';'.join(repr(x) for x in xs)},{';'.join(f'{v:.10g}' for v in g)}")
    head = [
        "# Activity coefficients by original UNIFAC, for dropcut validation (--activity unifac).",
        f"# library: thermo {thermo.__version__}, thermo.unifac.UNIFAC.from_subgroups(version=0, interaction_data=UFIP, subgroups=UFSG)",
        "# parameters: thermo's original-UNIFAC tables = DDBST published matrix (Hansen et al. 1991 Ind. Eng. Chem. Res. 30:2352;",
        "#   Wittig, Lohmann & Gmehling 2003 Ind. Eng. Chem. Res. 42:183), the same set dropcut transcribes: checks equations, not parameters",
        "# groups: read from mixtures/components/<id>.toml (unifac-groups)",
        f"# date: {datetime.date.today().isoformat()}",
        "# command: python3 validation/unifac_reference.py   (run from the repository root)",
        "# columns: components (a+b[+c]); temperature_K; mole_fractions (same order, ';'); gammas (same order, ';')",
        "components,temperature_K,mole_fractions,gammas",
    ]
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, "w") as fh:
        fh.write("\n".join(head + rows) + "\n")
    print(f"wrote {len(rows)} rows to {OUT}")


if __name__ == "__main__":
    main()
