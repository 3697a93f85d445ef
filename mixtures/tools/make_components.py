#!/usr/bin/env python3
"""Generator for the dropcut pure-component library (mixtures/components/*.toml).

Transcribes published tables as carried in the data files of the `chemicals`
Python package, version 1.5.2 (pip install chemicals==1.5.2).  Only the data
files (.tsv/.csv) are read, directly with the csv module; no property
*method* of any package is called.  Tables read (file names inside the
chemicals package):

  Vapor Pressure/Table 2-8 Vapor Pressure of Inorganic and Organic Liquids.tsv    Perry 8th ed. Table 2-8 (DIPPR 101)
  Density/Perry Parameters 105.tsv                                                Perry 8th ed. Table 2-32 (DIPPR 105)
  Phase Change/Table 2-150 Heats of Vaporization of Inorganic and Organic Liquids.tsv  Perry 8th ed. Table 2-150 (DIPPR 106)
  Heat Capacity/Perry_Table_2-153_DIPPR_100.tsv, ..._DIPPR_114.tsv                Perry 8th ed. Table 2-153
  Viscosity/Table 2-313 ..., Table 2-312 ...                                      Perry 8th ed. liquid / vapour viscosity
  Thermal Conductivity/Table 2-315 ..., Table 2-314 ...                           Perry 8th ed. liquid / vapour conductivity
  Interface/MuleroCachadinaParameters.tsv                                         Mulero & Cachadina 2012
  Interface/VDI PPDS surface tensions.tsv, Interface/Jasper-Lange.tsv             VDI Heat Atlas 2010 (PPDS), Jasper 1972
  Vapor Pressure/VDI PPDS Boiling temperatures at different pressures.tsv         VDI Heat Atlas (PPDS Wagner 2.5-5 form)
  Vapor Pressure/Wagner Collection Poling.tsv, Antoine Collection Poling.tsv      Poling et al. 5th ed. Appendix A
  Vapor Pressure/Landolt_antoine_V20.tsv                                          Landolt-Boernstein IV/20
  Viscosity/Viswanath Natarajan Dynamic 3 term.tsv, Dutt Prasad 3 term.tsv        Viswanath & Natarajan 1989; Dutt-Prasad
  Viscosity/VDI PPDS Dynamic viscosity of gases polynomials.tsv                   VDI Heat Atlas (PPDS)
  Thermal Conductivity/VDI PPDS Thermal conductivity of saturated liquids.tsv, ...of gases.tsv
  Heat Capacity/PolingDatabank.tsv                                                Poling et al. 5th ed. Appendix A (cp/R polynomial)
  Heat Capacity/TRC Thermodynamics of Organic Compounds in the Gas State.tsv      TRC 1994 (only with --igcp trc)
  Critical Properties/DIPPRPinaMartines.tsv, IUPACOrganicCriticalProps.tsv,
      CRCCriticalOrganics.tsv, Appendix to PSRK Revision 4.tsv, Yaws Collection.tsv
  Misc/Physical Constants of Organic Compounds.csv (CRC), Phase Change/Yaws Boiling Points.tsv,
  Misc/webbook_constants.tsv (NIST WebBook), Phase Change/CRC Handbook Heat of Fusion.tsv,
  Phase Change/CRC Handbook Heat of Vaporization.tsv
  Heat Capacity/CRC Standard Thermodynamic Properties of Chemical Substances.tsv,
      Reactions/ATcT 1.112 (l).tsv, (g).tsv, API TDB Albahri Hf (g).tsv, Yaws Hf S0 (g).tsv
  Safety/IS IEC 60079-20-1 2010.tsv, DIPPR T_flash Serat.csv, NFPA 497 2008.tsv
  Misc/Florian_Liming_CETANE_experimental.tsv (vom Lehn et al. 2021), Travis_Kessler_Combustdb_CETANE.tsv
  Misc/joback_predictions.tsv (only to cross-check our own Joback implementation)
  Viscosity/PolingLJ.tsv (Poling et al. Appendix B), Density/COSTALD Parameters.tsv (Z_RA)

Written 2025 for dropcut.  Regenerate with:

    python3 mixtures/tools/make_components.py            # writes mixtures/components/*.toml
    python3 mixtures/tools/make_components.py --igcp trc # emit model="trc" ideal-gas cp where TRC has data
                                                         # (needs a `trc` form in the loader; not default)

No CoolProp coefficient is used anywhere (CoolProp is the independent test reference).
"""
import argparse
import csv
from decimal import Decimal
import math
import os
import sys

import chemicals  # only to locate its data folder and check its version

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.normpath(os.path.join(HERE, "..", "components"))
DATA = os.path.dirname(chemicals.__file__)
R = 8.314462618
LN10 = math.log(10.0)
ATW = {"C": 12.011, "H": 1.008, "O": 15.999}  # IUPAC conventional atomic weights
DHF_CO2 = -393.51e3   # J/mol, CODATA key values
DHF_H2O_G = -241.826e3

# ----------------------------------------------------------------------------
# component list: id, name, aliases, CAS, class, (C,H,O), Joback groups, aromatic rings
# Joback group keys: CH3 CH2 CH C (non-ring), rCH2 rCH rC (ring, saturated),
# rCHa rCa (ring =CH- / =C<), OH (alcohol)
# ----------------------------------------------------------------------------
def nalk(n):
    return {"CH3": 2, "CH2": n - 2}

COMPONENTS = [
    ("n-hexane", "n-Hexane", ["hexane"], "110-54-3", "n-alkane", (6, 14, 0), nalk(6), 0),
    ("n-heptane", "n-Heptane", ["heptane"], "142-82-5", "n-alkane", (7, 16, 0), nalk(7), 0),
    ("n-octane", "n-Octane", ["octane"], "111-65-9", "n-alkane", (8, 18, 0), nalk(8), 0),
    ("n-nonane", "n-Nonane", ["nonane"], "111-84-2", "n-alkane", (9, 20, 0), nalk(9), 0),
    ("n-decane", "n-Decane", ["decane"], "124-18-5", "n-alkane", (10, 22, 0), nalk(10), 0),
    ("n-undecane", "n-Undecane", ["undecane"], "1120-21-4", "n-alkane", (11, 24, 0), nalk(11), 0),
    ("n-dodecane", "n-Dodecane", ["dodecane"], "112-40-3", "n-alkane", (12, 26, 0), nalk(12), 0),
    ("n-tridecane", "n-Tridecane", ["tridecane"], "629-50-5", "n-alkane", (13, 28, 0), nalk(13), 0),
    ("n-tetradecane", "n-Tetradecane", ["tetradecane"], "629-59-4", "n-alkane", (14, 30, 0), nalk(14), 0),
    ("n-pentadecane", "n-Pentadecane", ["pentadecane"], "629-62-9", "n-alkane", (15, 32, 0), nalk(15), 0),
    ("n-hexadecane", "n-Hexadecane", ["cetane", "hexadecane"], "544-76-3", "n-alkane", (16, 34, 0), nalk(16), 0),
    ("n-heptadecane", "n-Heptadecane", ["heptadecane"], "629-78-7", "n-alkane", (17, 36, 0), nalk(17), 0),
    ("n-octadecane", "n-Octadecane", ["octadecane"], "593-45-3", "n-alkane", (18, 38, 0), nalk(18), 0),
    ("2-methylheptane", "2-Methylheptane", [], "592-27-8", "iso-alkane", (8, 18, 0), {"CH3": 3, "CH2": 4, "CH": 1}, 0),
    ("2-2-4-trimethylpentane", "2,2,4-Trimethylpentane", ["iso-octane", "isooctane"], "540-84-1", "iso-alkane", (8, 18, 0), {"CH3": 5, "CH2": 1, "CH": 1, "C": 1}, 0),
    ("2-2-4-6-6-pentamethylheptane", "2,2,4,6,6-Pentamethylheptane", ["iso-dodecane", "isododecane"], "13475-82-6", "iso-alkane", (12, 26, 0), {"CH3": 7, "CH2": 2, "CH": 1, "C": 2}, 0),
    ("2-6-10-trimethyldodecane", "2,6,10-Trimethyldodecane", ["farnesane"], "3891-98-3", "iso-alkane", (15, 32, 0), {"CH3": 5, "CH2": 7, "CH": 3}, 0),
    ("2-2-4-4-6-8-8-heptamethylnonane", "2,2,4,4,6,8,8-Heptamethylnonane", ["hmn", "isocetane"], "4390-04-9", "iso-alkane", (16, 34, 0), {"CH3": 9, "CH2": 3, "CH": 1, "C": 3}, 0),
    ("2-methylnonane", "2-Methylnonane", [], "871-83-0", "iso-alkane", (10, 22, 0), {"CH3": 3, "CH2": 6, "CH": 1}, 0),
    ("3-methyldecane", "3-Methyldecane", [], "13151-34-3", "iso-alkane", (11, 24, 0), {"CH3": 3, "CH2": 7, "CH": 1}, 0),
    ("2-methylundecane", "2-Methylundecane", [], "7045-71-8", "iso-alkane", (12, 26, 0), {"CH3": 3, "CH2": 8, "CH": 1}, 0),
    ("2-methyltetradecane", "2-Methyltetradecane", [], "1560-95-8", "iso-alkane", (15, 32, 0), {"CH3": 3, "CH2": 11, "CH": 1}, 0),
    ("2-methyldecane", "2-Methyldecane", [], "6975-98-0", "iso-alkane", (11, 24, 0), {"CH3": 3, "CH2": 7, "CH": 1}, 0),
    ("3-methylundecane", "3-Methylundecane", [], "1002-43-3", "iso-alkane", (12, 26, 0), {"CH3": 3, "CH2": 8, "CH": 1}, 0),
    ("2-methyltridecane", "2-Methyltridecane", [], "1560-96-9", "iso-alkane", (14, 30, 0), {"CH3": 3, "CH2": 10, "CH": 1}, 0),
    ("2-6-dimethyloctane", "2,6-Dimethyloctane", [], "2051-30-1", "iso-alkane", (10, 22, 0), {"CH3": 4, "CH2": 4, "CH": 2}, 0),
    ("2-6-10-14-tetramethylpentadecane", "2,6,10,14-Tetramethylpentadecane", ["pristane"], "1921-70-6", "iso-alkane", (19, 40, 0), {"CH3": 6, "CH2": 9, "CH": 4}, 0),
    ("cyclohexane", "Cyclohexane", [], "110-82-7", "monocycloalkane", (6, 12, 0), {"rCH2": 6}, 0),
    ("methylcyclohexane", "Methylcyclohexane", [], "108-87-2", "monocycloalkane", (7, 14, 0), {"rCH2": 5, "rCH": 1, "CH3": 1}, 0),
    ("ethylcyclohexane", "Ethylcyclohexane", [], "1678-91-7", "monocycloalkane", (8, 16, 0), {"rCH2": 5, "rCH": 1, "CH2": 1, "CH3": 1}, 0),
    ("n-propylcyclohexane", "n-Propylcyclohexane", ["propylcyclohexane"], "1678-92-8", "monocycloalkane", (9, 18, 0), {"rCH2": 5, "rCH": 1, "CH2": 2, "CH3": 1}, 0),
    ("n-butylcyclohexane", "n-Butylcyclohexane", ["butylcyclohexane"], "1678-93-9", "monocycloalkane", (10, 20, 0), {"rCH2": 5, "rCH": 1, "CH2": 3, "CH3": 1}, 0),
    ("isopropylcyclohexane", "Isopropylcyclohexane", [], "696-29-7", "monocycloalkane", (9, 18, 0), {"rCH2": 5, "rCH": 1, "CH": 1, "CH3": 2}, 0),
    ("n-pentylcyclohexane", "n-Pentylcyclohexane", ["pentylcyclohexane"], "4292-92-6", "monocycloalkane", (11, 22, 0), {"rCH2": 5, "rCH": 1, "CH2": 4, "CH3": 1}, 0),
    ("n-hexylcyclohexane", "n-Hexylcyclohexane", ["hexylcyclohexane"], "4292-75-5", "monocycloalkane", (12, 24, 0), {"rCH2": 5, "rCH": 1, "CH2": 5, "CH3": 1}, 0),
    ("n-decylcyclohexane", "n-Decylcyclohexane", ["decylcyclohexane"], "1795-16-0", "monocycloalkane", (16, 32, 0), {"rCH2": 5, "rCH": 1, "CH2": 9, "CH3": 1}, 0),
    ("cis-decalin", "cis-Decahydronaphthalene", ["cis-decahydronaphthalene"], "493-01-6", "dicycloalkane", (10, 18, 0), {"rCH2": 8, "rCH": 2}, 0),
    ("trans-decalin", "trans-Decahydronaphthalene", ["trans-decahydronaphthalene"], "493-02-7", "dicycloalkane", (10, 18, 0), {"rCH2": 8, "rCH": 2}, 0),
    ("toluene", "Toluene", ["methylbenzene"], "108-88-3", "alkylbenzene", (7, 8, 0), {"rCHa": 5, "rCa": 1, "CH3": 1}, 1),
    ("ethylbenzene", "Ethylbenzene", [], "100-41-4", "alkylbenzene", (8, 10, 0), {"rCHa": 5, "rCa": 1, "CH2": 1, "CH3": 1}, 1),
    ("o-xylene", "o-Xylene", ["1-2-dimethylbenzene"], "95-47-6", "alkylbenzene", (8, 10, 0), {"rCHa": 4, "rCa": 2, "CH3": 2}, 1),
    ("m-xylene", "m-Xylene", ["1-3-dimethylbenzene"], "108-38-3", "alkylbenzene", (8, 10, 0), {"rCHa": 4, "rCa": 2, "CH3": 2}, 1),
    ("p-xylene", "p-Xylene", ["1-4-dimethylbenzene"], "106-42-3", "alkylbenzene", (8, 10, 0), {"rCHa": 4, "rCa": 2, "CH3": 2}, 1),
    ("n-propylbenzene", "n-Propylbenzene", ["propylbenzene"], "103-65-1", "alkylbenzene", (9, 12, 0), {"rCHa": 5, "rCa": 1, "CH2": 2, "CH3": 1}, 1),
    ("1-2-4-trimethylbenzene", "1,2,4-Trimethylbenzene", ["pseudocumene"], "95-63-6", "alkylbenzene", (9, 12, 0), {"rCHa": 3, "rCa": 3, "CH3": 3}, 1),
    ("1-3-5-trimethylbenzene", "1,3,5-Trimethylbenzene", ["mesitylene"], "108-67-8", "alkylbenzene", (9, 12, 0), {"rCHa": 3, "rCa": 3, "CH3": 3}, 1),
    ("n-butylbenzene", "n-Butylbenzene", ["butylbenzene"], "104-51-8", "alkylbenzene", (10, 14, 0), {"rCHa": 5, "rCa": 1, "CH2": 3, "CH3": 1}, 1),
    ("1-2-3-trimethylbenzene", "1,2,3-Trimethylbenzene", ["hemimellitene"], "526-73-8", "alkylbenzene", (9, 12, 0), {"rCHa": 3, "rCa": 3, "CH3": 3}, 1),
    ("p-cymene", "1-Isopropyl-4-methylbenzene", ["4-isopropyltoluene"], "99-87-6", "alkylbenzene", (10, 14, 0), {"rCHa": 4, "rCa": 2, "CH": 1, "CH3": 3}, 1),
    ("1-2-3-4-tetramethylbenzene", "1,2,3,4-Tetramethylbenzene", ["prehnitene"], "488-23-3", "alkylbenzene", (10, 14, 0), {"rCHa": 2, "rCa": 4, "CH3": 4}, 1),
    ("n-pentylbenzene", "n-Pentylbenzene", ["pentylbenzene"], "538-68-1", "alkylbenzene", (11, 16, 0), {"rCHa": 5, "rCa": 1, "CH2": 4, "CH3": 1}, 1),
    ("n-hexylbenzene", "n-Hexylbenzene", ["hexylbenzene"], "1077-16-3", "alkylbenzene", (12, 18, 0), {"rCHa": 5, "rCa": 1, "CH2": 5, "CH3": 1}, 1),
    ("n-heptylbenzene", "n-Heptylbenzene", ["heptylbenzene"], "1078-71-3", "alkylbenzene", (13, 20, 0), {"rCHa": 5, "rCa": 1, "CH2": 6, "CH3": 1}, 1),
    ("n-octylbenzene", "n-Octylbenzene", ["octylbenzene"], "2189-60-8", "alkylbenzene", (14, 22, 0), {"rCHa": 5, "rCa": 1, "CH2": 7, "CH3": 1}, 1),
    ("n-decylbenzene", "n-Decylbenzene", ["decylbenzene"], "104-72-3", "alkylbenzene", (16, 26, 0), {"rCHa": 5, "rCa": 1, "CH2": 9, "CH3": 1}, 1),
    ("tetralin", "1,2,3,4-Tetrahydronaphthalene", ["tetrahydronaphthalene"], "119-64-2", "cycloaromatic", (10, 12, 0), {"rCHa": 4, "rCa": 2, "rCH2": 4}, 1),
    ("naphthalene", "Naphthalene", [], "91-20-3", "diaromatic", (10, 8, 0), {"rCHa": 8, "rCa": 2}, 2),
    ("1-methylnaphthalene", "1-Methylnaphthalene", ["alpha-methylnaphthalene", "1-mn"], "90-12-0", "diaromatic", (11, 10, 0), {"rCHa": 7, "rCa": 3, "CH3": 1}, 2),
    ("1-ethylnaphthalene", "1-Ethylnaphthalene", [], "1127-76-0", "diaromatic", (12, 12, 0), {"rCHa": 7, "rCa": 3, "CH2": 1, "CH3": 1}, 2),
    ("1-3-dimethylnaphthalene", "1,3-Dimethylnaphthalene", [], "575-41-7", "diaromatic", (12, 12, 0), {"rCHa": 6, "rCa": 4, "CH3": 2}, 2),
    ("1-6-dimethylnaphthalene", "1,6-Dimethylnaphthalene", [], "575-43-9", "diaromatic", (12, 12, 0), {"rCHa": 6, "rCa": 4, "CH3": 2}, 2),
    ("ethanol", "Ethanol", ["ethyl-alcohol"], "64-17-5", "oxygenate", (2, 6, 1), {"CH3": 1, "CH2": 1, "OH": 1}, 0),
]

# Original UNIFAC subgroups per component id (names as in mixtures/unifac/original-unifac-subgroups.csv;
# subgroup definitions of Fredenslund, Jones & Prausnitz 1975 / Hansen et al. 1991). Ring CH2/CH are the chain
# groups in original UNIFAC; an aromatic carbon carrying an alkyl group is merged with that group's first carbon
# (ACCH3, ACCH2, ACCH); fused aromatic carbons are AC. Emitted as `unifac-groups`; a component without a row
# gets no table (then `--activity unifac` refuses it, naming it).
def unifac_nalk(n):
    return {"CH3": 2, "CH2": n - 2}

UNIFAC_GROUPS = {
    **{cid: unifac_nalk(n) for cid, n in [("n-hexane", 6), ("n-heptane", 7), ("n-octane", 8), ("n-nonane", 9),
       ("n-decane", 10), ("n-undecane", 11), ("n-dodecane", 12), ("n-tridecane", 13), ("n-tetradecane", 14),
       ("n-pentadecane", 15), ("n-hexadecane", 16), ("n-heptadecane", 17), ("n-octadecane", 18)]},
    "2-methylheptane": {"CH3": 3, "CH2": 4, "CH": 1},
    "2-2-4-trimethylpentane": {"CH3": 5, "CH2": 1, "CH": 1, "C": 1},
    "2-2-4-6-6-pentamethylheptane": {"CH3": 7, "CH2": 2, "CH": 1, "C": 2},
    "2-6-10-trimethyldodecane": {"CH3": 5, "CH2": 7, "CH": 3},
    "2-2-4-4-6-8-8-heptamethylnonane": {"CH3": 9, "CH2": 3, "CH": 1, "C": 3},
    "2-methylnonane": {"CH3": 3, "CH2": 6, "CH": 1},
    "3-methyldecane": {"CH3": 3, "CH2": 7, "CH": 1},
    "2-methylundecane": {"CH3": 3, "CH2": 8, "CH": 1},
    "2-methyltetradecane": {"CH3": 3, "CH2": 11, "CH": 1},
    "cyclohexane": {"CH2": 6},
    "methylcyclohexane": {"CH3": 1, "CH2": 5, "CH": 1},
    "ethylcyclohexane": {"CH3": 1, "CH2": 6, "CH": 1},
    "n-propylcyclohexane": {"CH3": 1, "CH2": 7, "CH": 1},
    "n-butylcyclohexane": {"CH3": 1, "CH2": 8, "CH": 1},
    "cis-decalin": {"CH2": 8, "CH": 2},
    "trans-decalin": {"CH2": 8, "CH": 2},
    "toluene": {"ACH": 5, "ACCH3": 1},
    "ethylbenzene": {"ACH": 5, "ACCH2": 1, "CH3": 1},
    "o-xylene": {"ACH": 4, "ACCH3": 2},
    "m-xylene": {"ACH": 4, "ACCH3": 2},
    "p-xylene": {"ACH": 4, "ACCH3": 2},
    "n-propylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 1, "CH3": 1},
    "1-2-4-trimethylbenzene": {"ACH": 3, "ACCH3": 3},
    "1-3-5-trimethylbenzene": {"ACH": 3, "ACCH3": 3},
    "n-butylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 2, "CH3": 1},
    "tetralin": {"ACH": 4, "ACCH2": 2, "CH2": 2},
    "naphthalene": {"ACH": 8, "AC": 2},
    "1-methylnaphthalene": {"ACH": 7, "AC": 2, "ACCH3": 1},
    "n-pentylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 3, "CH3": 1},
    "n-hexylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 4, "CH3": 1},
    "n-heptylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 5, "CH3": 1},
    "n-octylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 6, "CH3": 1},
    "n-decylbenzene": {"ACH": 5, "ACCH2": 1, "CH2": 8, "CH3": 1},
    "1-2-3-trimethylbenzene": {"ACH": 3, "ACCH3": 3},
    "1-2-3-4-tetramethylbenzene": {"ACH": 2, "ACCH3": 4},
    "p-cymene": {"ACH": 4, "ACCH3": 1, "ACCH": 1, "CH3": 2},
    "1-ethylnaphthalene": {"ACH": 7, "AC": 2, "ACCH2": 1, "CH3": 1},
    "1-3-dimethylnaphthalene": {"ACH": 6, "AC": 2, "ACCH3": 2},
    "1-6-dimethylnaphthalene": {"ACH": 6, "AC": 2, "ACCH3": 2},
    "isopropylcyclohexane": {"CH3": 2, "CH2": 5, "CH": 2},
    "n-pentylcyclohexane": {"CH3": 1, "CH2": 9, "CH": 1},
    "n-hexylcyclohexane": {"CH3": 1, "CH2": 10, "CH": 1},
    "n-decylcyclohexane": {"CH3": 1, "CH2": 14, "CH": 1},
    "2-methyldecane": {"CH3": 3, "CH2": 7, "CH": 1},
    "3-methylundecane": {"CH3": 3, "CH2": 8, "CH": 1},
    "2-methyltridecane": {"CH3": 3, "CH2": 10, "CH": 1},
    "2-6-dimethyloctane": {"CH3": 4, "CH2": 4, "CH": 2},
    "2-6-10-14-tetramethylpentadecane": {"CH3": 6, "CH2": 9, "CH": 4},
    "ethanol": {"CH3": 1, "CH2": 1, "OH": 1},
}


def unifac_line(cid):
    """The `unifac-groups` line of a component file, or None when the component has no assignment."""
    groups = UNIFAC_GROUPS.get(cid)
    if not groups:
        return None
    key = lambda g: g if g.replace("_", "").replace("-", "").isalnum() else '"' + g + '"'
    return ("unifac-groups = { " + ", ".join(f"{key(g)} = {n}" for g, n in groups.items())
            + " }  # original UNIFAC subgroups (mixtures/unifac/)")


# Joback & Reid (1987) group increments, as reprinted in Poling et al. 5th ed. Table 2-2 / Table C-1:
# (Tc, Pc, Vc, Tb, Tm, Hf, a, b, c, d)
JOBACK = {
    "CH3":  (0.0141, -0.0012, 65, 23.58, -5.10, -76.45, 1.95e1, -8.08e-3, 1.53e-4, -9.67e-8),
    "CH2":  (0.0189, 0.0000, 56, 22.88, 11.27, -20.64, -9.09e-1, 9.50e-2, -5.44e-5, 1.19e-8),
    "CH":   (0.0164, 0.0020, 41, 21.74, 12.64, 29.89, -2.30e1, 2.04e-1, -2.65e-4, 1.20e-7),
    "C":    (0.0067, 0.0043, 27, 18.25, 46.43, 82.23, -6.62e1, 4.27e-1, -6.41e-4, 3.01e-7),
    "rCH2": (0.0100, 0.0025, 48, 27.15, 7.75, -26.80, -6.03, 8.54e-2, -8.00e-6, -1.80e-8),
    "rCH":  (0.0122, 0.0004, 38, 21.78, 19.88, 8.67, -2.05e1, 1.62e-1, -1.60e-4, 6.24e-8),
    "rCHa": (0.0082, 0.0011, 41, 26.73, 8.13, 2.09, -2.14, 5.74e-2, -1.64e-6, -1.59e-8),
    "rCa":  (0.0143, 0.0008, 32, 31.01, 37.02, 46.43, -8.25, 1.01e-1, -1.42e-4, 6.78e-8),
    "OH":   (0.0741, 0.0112, 28, 92.88, 44.45, -208.04, 2.57e1, -6.91e-2, 1.77e-4, -9.88e-8),
}


def joback(groups, natoms, Tb=None):
    s = lambda i: sum(JOBACK[g][i] * n for g, n in groups.items())
    tb = 198.0 + s(3)
    Tb_used = Tb if Tb else tb
    tc = Tb_used / (0.584 + 0.965 * s(0) - s(0) ** 2)
    pc = 1e5 / (0.113 + 0.0032 * natoms - s(1)) ** 2
    vc = (17.5 + s(2)) * 1e-6
    tm = 122.5 + s(4)
    hf = (68.29 + s(5)) * 1e3
    cp = [s(6) - 37.93, s(7) + 0.210, s(8) - 3.91e-4, s(9) + 2.06e-7]
    return dict(Tb=tb, Tc=tc, Pc=pc, Vc=vc, Tm=tm, Hf=hf, cp=cp)


def groups_text(groups):
    names = {"CH3": "-CH3", "CH2": "-CH2-", "CH": ">CH-", "C": ">C<", "rCH2": "ring -CH2-", "rCH": "ring >CH-",
             "rCHa": "ring =CH-", "rCa": "ring =C<", "OH": "-OH (alcohol)"}
    return ", ".join(f"{n} x {names[g]}" for g, n in groups.items())

# ----------------------------------------------------------------------------
# table loading
# ----------------------------------------------------------------------------
def load(rel, delim="\t"):
    d = {}
    with open(os.path.join(DATA, rel), encoding="utf-8", errors="replace") as fh:
        r = csv.reader(fh, delimiter=delim)
        head = [h.strip() for h in next(r)]
        for row in r:
            if not row:
                continue
            rec = dict(zip(head, [x.strip().strip('"') for x in row]))
            d.setdefault(row[0].strip().strip('"'), []).append(rec)
    return d


def num(x):
    try:
        v = float(x)
    except (TypeError, ValueError):
        return None
    return v if math.isfinite(v) else None


def first(tab, cas, *keys):
    recs = tab.get(cas)
    if not recs:
        return None
    r = recs[0]
    vals = [num(r.get(k)) for k in keys]
    if any(v is None for v in vals):
        return None
    return vals if len(vals) > 1 else vals[0]


T = {}
def tables():
    L = lambda k, f, **kw: T.__setitem__(k, load(f, **kw))
    L("p28", "Vapor Pressure/Table 2-8 Vapor Pressure of Inorganic and Organic Liquids.tsv")
    L("p105", "Density/Perry Parameters 105.tsv")
    L("p150", "Phase Change/Table 2-150 Heats of Vaporization of Inorganic and Organic Liquids.tsv")
    L("p153a", "Heat Capacity/Perry_Table_2-153_DIPPR_100.tsv")
    L("p153b", "Heat Capacity/Perry_Table_2-153_DIPPR_114.tsv")
    L("p313", "Viscosity/Table 2-313 Viscosity of Inorganic and Organic Liquids.tsv")
    L("p312", "Viscosity/Table 2-312 Vapor Viscosity of Inorganic and Organic Substances.tsv")
    L("p315", "Thermal Conductivity/Table 2-315 Thermal Conductivity of Inorganic and Organic Liquids.tsv")
    L("p314", "Thermal Conductivity/Table 2-314 Vapor Thermal Conductivity of Inorganic and Organic Substances.tsv")
    L("mc", "Interface/MuleroCachadinaParameters.tsv")
    L("vdisig", "Interface/VDI PPDS surface tensions.tsv")
    L("jasper", "Interface/Jasper-Lange.tsv")
    L("vdipsat", "Vapor Pressure/VDI PPDS Boiling temperatures at different pressures.tsv")
    L("wagpol", "Vapor Pressure/Wagner Collection Poling.tsv")
    L("antpol", "Vapor Pressure/Antoine Collection Poling.tsv")
    L("landolt", "Vapor Pressure/Landolt_antoine_V20.tsv")
    L("vn3", "Viscosity/Viswanath Natarajan Dynamic 3 term.tsv")
    L("dp3", "Viscosity/Dutt Prasad 3 term.tsv")
    L("vdimug", "Viscosity/VDI PPDS Dynamic viscosity of gases polynomials.tsv")
    L("vdikl", "Thermal Conductivity/VDI PPDS Thermal conductivity of saturated liquids.tsv")
    L("vdikg", "Thermal Conductivity/VDI PPDS Thermal conductivity of gases.tsv")
    L("poling", "Heat Capacity/PolingDatabank.tsv")
    L("trc", "Heat Capacity/TRC Thermodynamics of Organic Compounds in the Gas State.tsv")
    L("dippr", "Critical Properties/DIPPRPinaMartines.tsv")
    L("iupac", "Critical Properties/IUPACOrganicCriticalProps.tsv")
    L("crcc", "Critical Properties/CRCCriticalOrganics.tsv")
    L("psrk", "Critical Properties/Appendix to PSRK Revision 4.tsv")
    L("yaws", "Critical Properties/Yaws Collection.tsv")
    L("crcphys", "Misc/Physical Constants of Organic Compounds.csv")
    L("yawstb", "Phase Change/Yaws Boiling Points.tsv")
    L("webbook", "Misc/webbook_constants.tsv")
    L("hfus", "Phase Change/CRC Handbook Heat of Fusion.tsv")
    L("crchvap", "Phase Change/CRC Handbook Heat of Vaporization.tsv")
    L("crcstd", "Heat Capacity/CRC Standard Thermodynamic Properties of Chemical Substances.tsv")
    L("atctl", "Reactions/ATcT 1.112 (l).tsv")
    L("atctg", "Reactions/ATcT 1.112 (g).tsv")
    L("api", "Reactions/API TDB Albahri Hf (g).tsv")
    L("yawshf", "Reactions/Yaws Hf S0 (g).tsv")
    L("iec", "Safety/IS IEC 60079-20-1 2010.tsv")
    L("serat", "Safety/DIPPR T_flash Serat.csv")
    L("nfpa", "Safety/NFPA 497 2008.tsv")
    L("cnvl", "Misc/Florian_Liming_CETANE_experimental.tsv")
    L("cnkess", "Misc/Travis_Kessler_Combustdb_CETANE.tsv")
    L("jobpred", "Misc/joback_predictions.tsv")
    L("polinglj", "Viscosity/PolingLJ.tsv")
    L("costald", "Density/COSTALD Parameters.tsv")
    L("vdirho", "Density/VDI PPDS Density of Saturated Liquids.tsv")
    L("vdimu", "Viscosity/VDI PPDS Dynamic viscosity of saturated liquids polynomials.tsv")
    L("cascc", "Misc/common_chemistry_data.tsv")
    L("vdihvap", "Phase Change/VDI PPDS Enthalpies of vaporization.tsv")
    L("zab", "Heat Capacity/Zabransky.tsv")


def webbook(cas, key):
    return first(T["webbook"], cas.replace("-", ""), key)

# ----------------------------------------------------------------------------
# property evaluation (used for the built-in consistency checks; the checker
# script re-implements the forms independently)
# ----------------------------------------------------------------------------
def ev(sec, T_, M):
    m = sec["model"]
    c = sec.get("coefficients", [])
    if m == "constant":
        y = c[0]
    elif m == "dippr101":
        A, B, C, D, E = (list(c) + [0, 0, 0])[:5]
        y = math.exp(A + B / T_ + C * math.log(T_) + D * T_ ** E)
    elif m == "dippr100":
        y = sum(ci * T_ ** i for i, ci in enumerate(c))
    elif m == "dippr105":
        A, B, C, D = c
        y = A / B ** (1 + (1 - T_ / C) ** D)
    elif m == "dippr106":
        Tr = T_ / sec["tc"]
        A, B, C, D, E = (list(c) + [0, 0, 0])[:5]
        y = A * (1 - Tr) ** (B + C * Tr + D * Tr ** 2 + E * Tr ** 3)
    elif m == "dippr102":
        A, B, C, D = (list(c) + [0, 0])[:4]
        y = A * T_ ** B / (1 + C / T_ + D / T_ ** 2)
    elif m == "dippr114":
        A, B, C, D = c
        t = 1 - T_ / sec["tc"]
        y = A * A / t + B - 2 * A * C * t - A * D * t ** 2 - C * C * t ** 3 / 3 - C * D * t ** 4 / 2 - D * D * t ** 5 / 5
    elif m == "antoine":
        A, B, C = c
        y = 10 ** (A - B / (T_ + C))
    elif m == "vogel":
        A, B, C = c
        y = 10 ** (A + B / (T_ + C))
    elif m == "wagner":
        A, B, C, D = c
        tau = 1 - T_ / sec["tc"]
        y = sec["pc"] * math.exp((A * tau + B * tau ** 1.5 + C * tau ** 2.5 + D * tau ** 5) / (T_ / sec["tc"]))
    elif m == "mulero-cachadina":
        y = sum(c[i] * (1 - T_ / sec["tc"]) ** c[i + 1] for i in range(0, len(c), 2))
    else:
        return None
    u = sec["unit"]
    conv = {"Pa": 1, "kPa": 1e3, "bar": 1e5, "kmol/m3": M * 1e3, "mol/m3": M, "kg/m3": 1, "J/kmol": 1e-3 / M,
            "J/mol": 1 / M, "J/kg": 1, "J/kmol/K": 1e-3 / M, "J/mol/K": 1 / M, "cp/R": R / M, "Pa*s": 1,
            "mPa*s": 1e-3, "W/m/K": 1, "N/m": 1, "mN/m": 1e-3}[u]
    return y * conv

# ----------------------------------------------------------------------------
# correlation selection
# ----------------------------------------------------------------------------
def sec(model, coeffs, unit, tmin, tmax, source, **extra):
    d = {"model": model, "coefficients": [float(x) for x in coeffs], "unit": unit}
    if tmin is not None:
        d["t-min"] = float(tmin)
    if tmax is not None:
        d["t-max"] = float(tmax)
    d.update({k.replace("_", "-"): v for k, v in extra.items() if k != "note"})
    d["source"] = source
    if extra.get("note"):
        d["note"] = extra["note"]
    return d


CS_METHOD = {"ambrose-walton": "Ambrose-Walton vapour pressure", "rackett": "Rackett (Spencer-Danner Z_RA) density",
             "riedel-watson": "Riedel at Tb + Watson latent heat", "rowlinson-bondi": "Rowlinson-Bondi liquid cp from the ideal-gas cp",
             "letsou-stiel": "Letsou-Stiel liquid viscosity", "latini": "Latini liquid conductivity",
             "brock-bird": "Brock-Bird surface tension", "chung": "Chung et al. low-pressure gas viscosity/conductivity"}


def cs(method):
    return {"model": "corresponding-states", "source": "estimated:corresponding-states",
            "note": f"no published coefficients found in the compilations used; the loader's default estimate applies ({CS_METHOD[method]})"}


def perry(tab, cas, ncoef):
    r = T[tab].get(cas)
    if not r:
        return None
    r = r[0]
    keys = ["C1", "C2", "C3", "C4", "C5"][:ncoef] if "C1" in r else ["A", "B", "C", "D", "E"][:ncoef]
    c = [num(r[k]) for k in keys]
    return c, num(r["Tmin"]), num(r["Tmax"]), r


def vapor_pressure(cas):
    p = perry("p28", cas, 5)
    if p:
        return sec("dippr101", p[0], "Pa", p[1], p[2], "perry8-table-2-8")
    r = first(T["vdipsat"], cas, "A", "B", "C", "D", "Tc", "Pc", "Tm")
    if r:
        A, B, C, D, tc, pc, tm = r
        return sec("wagner", [A, B, C, D], "Pa", tm, tc, "vdi-heat-atlas-ppds", tc=tc, pc=pc,
                   note="VDI PPDS vapour-pressure equation (Wagner 2.5-5 form); t-min set to the melting point listed in the VDI table")
    r = first(T["wagpol"], cas, "A", "B", "C", "D", "Tc", "Pc", "Tmin", "Tmax")
    if r:
        A, B, C, D, tc, pc, tmin, tmax = r
        return sec("wagner", [A, B, C, D], "Pa", tmin, tmax, "poling5-appendix-a-wagner", tc=tc, pc=pc)
    r = first(T["landolt"], cas, "A", "B", "C", "Tmin", "Tmax")
    if r:
        A, B, C, tmin, tmax = r
        return sec("antoine", [float(f"{A / LN10:.12g}"), float(f"{B / LN10:.12g}"), C], "Pa", tmin, tmax, "landolt-boernstein-iv-20",
                   note=f"chemicals stores ln(P/Pa) = A - B/(T/K + C) with A = {A!r}, B = {B!r}; converted to log10 by dividing A and B by ln(10) (12 significant digits)")
    r = first(T["antpol"], cas, "A", "B", "C", "Tmin", "Tmax")
    if r:
        A, B, C, tmin, tmax = r
        return sec("antoine", [A, B, C], "Pa", tmin, tmax, "poling5-appendix-a-antoine",
                   note="Poling prints log10(P/bar) = A - B/(T/K + C - 273.15); chemicals carries it converted to Pa and K (A + 5, C - 273.15)")
    return cs("ambrose-walton")


# Published single measurements (papers read in this session; the numbers are quoted in the abstracts):
# CAS -> list of (T/K, density kg/m3, dynamic viscosity mPa s or None, source id).
LITERATURE_POINTS = {
    # Luning Prak, Jones, Cowart, Trulove, J. Chem. Eng. Data 60 (2015): pure-component values at 293.15 K
    "4390-04-9": [(293.15, 784.48, 3.71, "luning-prak-2015")],
    "13475-82-6": [(293.15, 745.21, 1.31, "luning-prak-2015")],
}


def crc_density(cas):
    """CRC density with its temperature. chemicals 1.5.2 stores the CRC entry d(t) in g/cm3 at t degC as
    1000 d + t/1000 (e.g. 875.82 = 0.8758 g/cm3 at 20 degC; 862.325 = 0.8623 at 25 degC). Checked against
    CoolProp 8.0 for 14 fluids (agreement within 0.2 % at the decoded temperature except n-hexane)."""
    v = first(T["crcphys"], cas, "rho")
    if not v:
        return None
    rho = round(v, 1)
    t_c = round((v - rho) * 1000)
    if not 0 <= t_c <= 40:
        return None
    return 273.15 + t_c, rho


def common_chemistry_density(cas, M):
    """Liquid density from the molar volume carried for CAS Common Chemistry (experimental property page);
    chemicals 1.5.2 does not carry the temperature."""
    v = first(T["cascc"], cas.replace("-", ""), "Vml")
    return M / v if v else None


def rackett_anchored(T0, rho0, M, Tc, Pc, Tm, source, how):
    """Rackett form with Z_RA fitted to one measured density: rho = (Pc/(R Tc)) / Z^(1 + (1 - T/Tc)^(2/7)),
    written as DIPPR 105 (A = Pc/(R Tc) in kmol/m3, B = Z_RA, C = Tc, D = 2/7)."""
    A = Pc / (R * Tc) / 1000.0
    rho_m = rho0 / M / 1000.0  # kmol/m3
    expo = 1.0 + (1.0 - T0 / Tc) ** (2.0 / 7.0)
    Z = math.exp(math.log(A / rho_m) / expo)
    return sec("dippr105", [float(f"{A:.8g}"), float(f"{Z:.8g}"), Tc, float(f"{2/7:.10g}")], "kmol/m3", Tm, Tc, source,
               uncertainty=0.01,
               note=f"Rackett equation with Z_RA = {Z:.5f} fitted to the measured density {rho0} kg/m3 at {T0:.2f} K ({how}); "
                    f"A = Pc/(R Tc) from the critical constants of this file; temperature dependence from the Rackett form "
                    f"(hold-out error in validation/README.md)")


def liquid_density(cas, k):
    p = perry("p105", cas, 4)
    if p:
        c1 = T["p105"][cas][0]["C1"]
        c = [float(Decimal(c1) / 1000)] + p[0][1:]
        return sec("dippr105", c, "kmol/m3", p[1], p[2], "perry8-table-2-32",
                   note=f"chemicals carries C1 = {c1} (mol/m3 basis); restored to the printed kmol/m3 value C1/1000")
    r = first(T["vdirho"], cas, "Tc", "rhoc", "A", "B", "C", "D")
    if r:
        tc, rhoc, A, B, C, D = r
        return sec("ppds-density", [rhoc, A, B, C, D], "kg/m3", k["Tm"], tc, "vdi-heat-atlas-ppds", tc=tc,
                   note="VDI Heat Atlas PPDS saturated-liquid density, rho = rhoc + A tau^0.35 + B tau^(2/3) + C tau + D tau^(4/3), "
                        "tau = 1 - T/Tc (Tc of the VDI table); t-min set to the melting point")
    M, Tc, Pc = k["M"], k["Tc"], k["Pc"]
    for T0, rho0, _mu, src in LITERATURE_POINTS.get(cas, []):
        return rackett_anchored(T0, rho0, M, Tc, Pc, k["Tm"], src, "published measurement")
    crc = crc_density(cas)
    if crc:
        return rackett_anchored(crc[0], crc[1], M, Tc, Pc, k["Tm"], "crc95-physical-constants",
                                "CRC Handbook, density column as decoded from chemicals 1.5.2")
    rho = common_chemistry_density(cas, M)
    if rho:
        return rackett_anchored(293.15, round(rho, 1), M, Tc, Pc, k["Tm"], "cas-common-chemistry",
                                "CAS Common Chemistry experimental density; the temperature is not carried by chemicals 1.5.2, 20 degC assumed")
    return cs("rackett")


def latent_heat(cas):
    r = T["p150"].get(cas)
    if r:
        r = r[0]
        c = [float(Decimal(r["C1"]) * 1000)] + [num(r[k]) for k in ("C2", "C3", "C4")]
        while len(c) > 2 and c[-1] == 0:
            c.pop()
        return sec("dippr106", c, "J/kmol", num(r["Tmin"]), num(r["Tmax"]), "perry8-table-2-150", tc=num(r["Tc"]),
                   note=f"chemicals carries C1 = {r['C1']} (J/mol basis); restored to the printed J/kmol value C1*1000")
    return cs("riedel-watson")


def ppds12(T_, Tc, A, B, C, D, E):
    """VDI Heat Atlas PPDS equation 12 for the enthalpy of vaporization [J/mol]:
    R Tc (A tau^(1/3) + B tau^(2/3) + C tau + D tau^2 + E tau^6), tau = 1 - T/Tc."""
    tau = 1.0 - T_ / Tc
    return R * Tc * (A * tau ** (1 / 3) + B * tau ** (2 / 3) + C * tau + D * tau ** 2 + E * tau ** 6)


def dippr106_fit(ts, hs, tc, nterms):
    """Least-squares fit of DIPPR 106, ln H = ln A + (B + C Tr + D Tr^2 + ...) ln(1 - Tr), linear in the
    unknowns; returns [A, B, C, ...] (A in the unit of hs)."""
    import numpy as np
    tr = np.array(ts) / tc
    lx = np.log(1.0 - tr)
    cols = [np.ones_like(tr)] + [lx * tr ** i for i in range(nterms - 1)]
    sol, *_ = np.linalg.lstsq(np.vstack(cols).T, np.log(np.array(hs)), rcond=None)
    return [float(math.exp(sol[0]))] + [float(x) for x in sol[1:]]


def measured_latent_heat(cas, k):
    """Latent heat where Perry Table 2-150 has no correlation: (1) the VDI Heat Atlas PPDS equation 12,
    refitted exactly enough into the DIPPR 106 form the loader reads; (2) the two CRC Handbook measurements
    (at 298.15 K and at Tb) through a two-parameter DIPPR 106 (Watson-type) form; (3) one CRC measurement
    with the Watson exponent 0.38. Outside t-min..t-max the loader continues the value with the
    Riedel-Watson shape anchored at the edge. None when no published value exists."""
    M, Tc, Tm, Tb = k["M"], k["Tc"], k["Tm"], k["Tb"]
    r = first(T["vdihvap"], cas, "Tc", "A", "B", "C", "D", "E")
    if r:
        tcv, A, B, C, D, E = r
        lo, hi = max(Tm, 0.35 * tcv), 0.95 * tcv
        ts = [lo + (hi - lo) * i / 199 for i in range(200)]
        hs = [ppds12(t, tcv, A, B, C, D, E) for t in ts]
        c = dippr106_fit(ts, hs, tcv, 5)
        c = [float(f"{c[0] * 1000:.8g}")] + [float(f"{x:.8g}") for x in c[1:]]
        sec_ = sec("dippr106", c, "J/kmol", lo, hi, "vdi-heat-atlas-ppds", tc=tcv)
        dev = max(abs(ev(sec_, t, M) * M / h - 1) for t, h in zip(ts, hs))
        sec_["note"] = (f"VDI Heat Atlas PPDS equation 12 (A = {A}, B = {B}, C = {C}, D = {D}, E = {E}, Tc = {tcv} K) "
                        f"refitted by least squares into DIPPR 106 over {lo:.1f}-{hi:.1f} K (largest deviation from the "
                        f"PPDS equation {100 * dev:.3f} %); tc is the VDI critical temperature")
        return sec_
    r = T["crchvap"].get(cas)
    if r:
        hb, h298, tbc = num(r[0].get("HvapTb")), num(r[0].get("Hvap298")), num(r[0].get("Tb"))
        tb_ = tbc or Tb
        if hb and h298 and tb_ > 320.0:
            lx1, lx2 = math.log(1 - 298.15 / Tc), math.log(1 - tb_ / Tc)
            B = math.log(h298 / hb) / (lx1 - lx2)
            A = h298 / math.exp(B * lx1)
            if 0.2 < B < 0.6:
                return sec("dippr106", [float(f"{A * 1000:.8g}"), float(f"{B:.6g}")], "J/kmol", 298.15, tb_,
                           "crc95-heat-of-vaporization", tc=Tc,
                           note=f"two-parameter DIPPR 106 (A (1 - Tr)^B) through the CRC Handbook values {h298:.0f} J/mol at "
                                f"298.15 K and {hb:.0f} J/mol at {tb_} K; exponent B = {B:.4f} (Watson 0.38); tc is the "
                                f"critical temperature of this file; outside the two points the Riedel-Watson shape is "
                                f"anchored at the nearer point (hold-out error in validation/README.md)")
        for t0, h0 in ((298.15, h298), (tb_, hb)):
            if h0:
                A = h0 / (1 - t0 / Tc) ** 0.38
                return sec("dippr106", [float(f"{A * 1000:.8g}"), 0.38], "J/kmol", t0 - 0.05, t0 + 0.05,
                           "crc95-heat-of-vaporization", tc=Tc,
                           note=f"one CRC Handbook value, {h0:.0f} J/mol at {t0} K, with the Watson exponent 0.38; the "
                                f"loader continues it with the Riedel-Watson shape anchored at this point")
    return None


def one_point(value, unit, T0, source, note):
    """A single published measurement at T0 as a constant over T0 +- 0.05 K: the loader continues it outside
    that band with its estimation method's shape anchored at the measured point (docs/property-methods.md)."""
    return sec("constant", [value], unit, round(T0 - 0.05, 2), round(T0 + 0.05, 2), source, note=note)


def measured_liquid_cp(cas):
    """Liquid heat capacity where Perry Table 2-153 has no correlation: Zabransky et al. (1996) recommended
    values (one cubic spline segment, converted exactly to DIPPR 100; or a single recommended value), else the
    CRC Handbook value at 298.15 K; both single values anchor the Rowlinson-Bondi shape. None otherwise."""
    rows = T["zab"].get(cas) or T["zab"].get(cas + " ")
    if rows and len(rows) == 1:
        r = rows[0]
        a = [num(r["A1-spline"]), num(r["A2-spline"]), num(r["A3-spline"]), num(r["A4-spline"])]
        tmin, tmax = num(r["Tmin"]), num(r["Tmax"])
        if all(x is not None for x in a) and tmin and tmax:
            if tmax - tmin > 1.0:
                c = [R * a[0], R * a[1] / 1e2, R * a[2] / 1e4, R * a[3] / 1e6]
                while len(c) > 1 and c[-1] == 0:
                    c.pop()
                return sec("dippr100", [float(f"{x:.8g}") for x in c], "J/mol/K", tmin, tmax, "zabransky-1996",
                           note=f"Zabransky et al. (1996) recommended cubic spline Cp/R = {a[0]} + {a[1]} (T/100) + {a[2]} (T/100)^2 + "
                                f"{a[3]} (T/100)^3 (data type {r['Data Type']}, uncertainty class {r['Uncertainty']}), "
                                f"rewritten exactly as a polynomial in T in J/mol/K")
            return one_point(float(f"{R * a[0]:.6g}"), "J/mol/K", tmin, "zabransky-1996",
                             f"Zabransky et al. (1996) recommended value Cp/R = {a[0]} at {tmin} K (uncertainty class "
                             f"{r['Uncertainty']}); Rowlinson-Bondi shape anchored at it outside {tmin} +- 0.05 K")
    v = first(T["crcstd"], cas, "Cpl")
    if v:
        return one_point(v, "J/mol/K", 298.15, "crc95-standard-thermo",
                         f"CRC Handbook liquid heat capacity {v} J/mol/K at 298.15 K; Rowlinson-Bondi shape anchored at it "
                         f"outside 298.15 +- 0.05 K (hold-out error in validation/README.md)")
    return None


def liquid_cp(cas, Tc):
    p = perry("p153a", cas, 5)
    if p:
        c = p[0]
        while len(c) > 1 and c[-1] == 0:
            c.pop()
        return sec("dippr100", c, "J/kmol/K", p[1], p[2], "perry8-table-2-153")
    p = perry("p153b", cas, 4)
    if p:
        return sec("dippr114", p[0], "J/kmol/K", p[1], p[2], "perry8-table-2-153", tc=Tc,
                   note="Perry Table 2-153 gives this compound in DIPPR eq. 114; tc is the DIPPR critical temperature (same as the constants section)")
    return cs("rowlinson-bondi")


def joback_viscosity_slope(groups):
    """Joback & Reid (1987) liquid viscosity ln(mu) = ln(M) + (sum eta_a - 597.82)/T + sum eta_b - 11.202:
    the 1/T slope sum eta_a - 597.82 [K] (increments as carried by thermo's Joback table)."""
    ETA_A = {"CH3": 548.29, "CH2": 94.16, "CH": -322.15, "C": -573.56, "rCH2": 307.53, "rCH": -394.29,
             "rCHa": 259.65, "rCa": -245.74}
    if any(g not in ETA_A for g in groups):
        return None
    return sum(ETA_A[g] * n for g, n in groups.items()) - 597.82


PPDS_TURN_MARGIN = 100.0  # K below the minimum of a PPDS viscosity curve where a coefficient set ends
PPDS_D_MARGIN = 30.0  # K above the pole D of a PPDS viscosity curve where a coefficient set starts


def ppds_viscosity_shape(A, B, C, D, E, t_lo, t_hi):
    """On a 1 K scan of [t_lo, t_hi]: the first temperature from which the PPDS viscosity curve falls faster in
    ln mu than just below it (None if never), and the first where it stops falling (None if never)."""
    def ln_mu(t):
        x = (C - t) / (t - D)
        r = math.copysign(abs(x) ** (1 / 3), x)
        return math.log(E) + A * r + B * r ** 4
    steepens = turn = None
    t = t_lo
    drops = []
    while t + 1 <= t_hi:
        drops.append((t, ln_mu(t) - ln_mu(t + 1)))
        t += 1
    for (t0, d0), (t1, d1) in zip(drops, drops[1:]):
        if turn is None and d1 <= 0:
            turn = t1
        if steepens is None and t0 > t_lo + 30 and d1 > d0:
            steepens = t0
    return steepens, turn


def liquid_viscosity(cas, comp=None, k=None):
    p = perry("p313", cas, 5)
    if p:
        c = p[0]
        while len(c) > 2 and c[-1] == 0:
            c.pop()
        return sec("dippr101", c, "Pa*s", p[1], p[2], "perry8-table-2-313")
    r = first(T["vdimu"], cas, "A", "B", "C", "D", "E")
    if r and k:
        A, B, C, D, E = r
        # A liquid's viscosity falls ever more slowly as it warms (Andrade: d ln mu/dT = -B/T^2). A PPDS set whose
        # curve instead starts to fall faster (its parameter C, where the slope diverges, is near: n-hexylbenzene,
        # C = 423.3 K) ends where that begins; one whose curve turns up (the naphthalenes) ends PPDS_TURN_MARGIN
        # below the turn. Above t-max the fluidity law takes over (src/props/pure).
        form = "VDI Heat Atlas PPDS equation 9, mu = E exp(A x^(1/3) + B x^(4/3)), x = (C - T)/(T - D); chemicals does not carry the validity range: "
        # the form has a pole at T = D: a set whose D lies near the melting point starts PPDS_D_MARGIN above D
        t_min, low = k["Tm"], "t-min set to Tm"
        if D + PPDS_D_MARGIN > t_min:
            t_min, low = round(D + PPDS_D_MARGIN, 2), f"t-min {PPDS_D_MARGIN:g} K above the pole of the form at D = {D:g} K"
        t_max, high = k["Tb"], "t-max to Tb"
        steepens, turn = ppds_viscosity_shape(A, B, C, D, E, t_min, min(t_max, C - 1.0))
        if turn is not None and turn - PPDS_TURN_MARGIN < t_max:
            t_max = round(turn - PPDS_TURN_MARGIN, 2)
            high = (f"t-max {PPDS_TURN_MARGIN:g} K below {turn:.1f} K, where the fitted curve stops falling "
                    "(a judgement: it flattens well before)")
        elif steepens is not None and steepens < t_max:
            t_max = round(steepens, 2)
            high = ("t-max where the fitted curve starts to fall faster with temperature, unlike a liquid's "
                    f"(its slope diverges at C = {C:g} K)")
        note = form + low + ", " + high
        return sec("ppds-viscosity", [A, B, C, D, E], "Pa*s", t_min, t_max, "vdi-heat-atlas-ppds", note=note)
    for key, src in (("vn3", "viswanath-natarajan-1989"), ("dp3", "dutt-prasad-viswanath-2007")):
        r = first(T[key], cas, "A", "B", "C", "Tmin", "Tmax")
        if r:
            A, B, C, tmin, tmax = r
            return sec("vogel", [A, -B, -C], "mPa*s", tmin, tmax, src,
                       note=f"published as log10(mu/cP) = A + B/(C - T) with A = {A!r}, B = {B!r}, C = {C!r}; rewritten exactly as log10(mu/mPa s) = A + (-B)/(T + (-C))")
    pts = [p for p in LITERATURE_POINTS.get(cas, []) if p[2]]
    slope = joback_viscosity_slope(comp[6]) if comp else None
    if pts and slope and k:
        T0, _rho, mu0, src = pts[0]
        A = math.log(mu0 * 1e-3) - slope / T0
        return sec("dippr101", [float(f"{A:.8g}"), float(f"{slope:.6g}")], "Pa*s", k["Tm"], 0.7 * k["Tc"], src,
                   uncertainty=0.15,
                   note=f"Andrade form ln(mu/Pa s) = A + B/T through the measured {mu0} mPa s at {T0:.2f} K; the slope "
                        f"B = {slope:.2f} K is the Joback & Reid (1987) group value (sum eta_a - 597.82); hold-out error of "
                        f"this one-point method in validation/README.md")
    return cs("letsou-stiel")


def liquid_conductivity(cas, Tm, Tb):
    p = perry("p315", cas, 5)
    if p:
        c = p[0]
        while len(c) > 1 and c[-1] == 0:
            c.pop()
        return sec("dippr100", c, "W/m/K", p[1], p[2], "perry8-table-2-315")
    r = first(T["vdikl"], cas, "A", "B", "C", "D", "E")
    if r:
        c = list(r)
        while len(c) > 1 and c[-1] == 0:
            c.pop()
        return sec("dippr100", c, "W/m/K", Tm, Tb, "vdi-heat-atlas-ppds",
                   note="VDI Heat Atlas saturated-liquid polynomial; chemicals does not carry the validity range: t-min/t-max set to Tm..Tb here (conservative)")
    return cs("latini")


def surface_tension(cas):
    r = T["mc"].get(cas)
    if r:
        r = r[0]
        c = []
        for i in range(3):
            s, n = num(r[f"sigma{i}"]), num(r[f"n{i}"])
            if s:
                c += [s, n]
        return sec("mulero-cachadina", c, "N/m", num(r["Tmin"]), num(r["Tmax"]), "mulero-cachadina-2012", tc=num(r["Tc"]))
    r = first(T["vdisig"], cas, "A", "B", "C", "D", "E", "Tc", "Tm")
    if r:
        A, B, C, D, E, tc, tm = r
        c = [A, B, C, D, E]
        while len(c) > 2 and c[-1] == 0:
            c.pop()
        return sec("dippr106", c, "N/m", tm, tc, "vdi-heat-atlas-ppds", tc=tc,
                   note="VDI PPDS surface-tension equation sigma = A (1-Tr)^(B + C Tr + D Tr^2 + E Tr^3), identical to dippr106; t-min = melting point from the VDI table")
    r = first(T["jasper"], cas, "a", "b", "Tmin", "Tmax")
    if r:
        a, b, tmin, tmax = r
        return sec("dippr100", [a + 273.15 * b, -b], "mN/m", tmin, tmax, "jasper-1972",
                   note=f"published sigma/(mN/m) = a - b t/degC with a = {a!r}, b = {b!r}; rewritten exactly in kelvin as (a + 273.15 b) - b T")
    return cs("brock-bird")


def ideal_gas_cp(cas, comp, igcp_mode):
    if igcp_mode == "trc":
        r = T["trc"].get(cas)
        if r:
            r = r[0]
            c = [num(r[k]) for k in ("a0", "a1", "a2", "a3", "a4", "a5", "a6", "a7")]
            return sec("trc", c, "cp/R", num(r["Tmin"]), num(r["Tmax"]), "trc-1994",
                       note="TRC form cp/R = a0 + a1/T^2 exp(-a2/T) + a3 y^2 + (a4 - a5/(T-a6)^2) y^8, y = (T-a7)/T for T > a7 else 0")
    r = T["poling"].get(cas)
    if r and num(r[0].get("a0")) is not None:
        r = r[0]
        c = [num(r[k]) for k in ("a0", "a1", "a2", "a3", "a4")]
        return sec("dippr100", c, "cp/R", num(r["Tmin"]), num(r["Tmax"]), "poling5-appendix-a-cp",
                   note="Poling prints a1*1e3, a2*1e5, a3*1e8, a4*1e11; the scale factors are applied here (exact)")
    C, H, O = comp[5]
    j = joback(comp[6], C + H + O)
    return sec("dippr100", [float(f"{x:.6g}") for x in j["cp"]], "J/mol/K", 200, 1000, "estimated:joback",
               note="Joback & Reid (1987) ideal-gas cp; groups: " + groups_text(comp[6]))


def vapor_viscosity(cas):
    p = perry("p312", cas, 4)
    if p:
        c = p[0]
        while len(c) > 2 and c[-1] == 0:
            c.pop()
        return sec("dippr102", c, "Pa*s", p[1], p[2], "perry8-table-2-312")
    r = first(T["vdimug"], cas, "A", "B", "C", "D", "E")
    if r:
        c = list(r)
        while len(c) > 1 and c[-1] == 0:
            c.pop()
        return sec("dippr100", c, "Pa*s", 250, 1000, "vdi-heat-atlas-ppds",
                   note="VDI Heat Atlas low-pressure gas polynomial; validity range not carried by chemicals, 250..1000 K assumed")
    return cs("chung")


def vapor_conductivity(cas):
    p = perry("p314", cas, 4)
    if p:
        c = p[0]
        while len(c) > 2 and c[-1] == 0:
            c.pop()
        return sec("dippr102", c, "W/m/K", p[1], p[2], "perry8-table-2-314")
    r = first(T["vdikg"], cas, "A", "B", "C", "D", "E")
    if r:
        c = list(r)
        while len(c) > 1 and c[-1] == 0:
            c.pop()
        return sec("dippr100", c, "W/m/K", 250, 1000, "vdi-heat-atlas-ppds",
                   note="VDI Heat Atlas low-pressure gas polynomial; validity range not carried by chemicals, 250..1000 K assumed")
    return cs("chung")

# ----------------------------------------------------------------------------
# constants
# ----------------------------------------------------------------------------
def lee_kesler_omega(Tb, Tc, Pc):
    t = Tb / Tc
    f0 = 5.92714 - 6.09648 / t - 1.28862 * math.log(t) + 0.169347 * t ** 6
    f1 = 15.2518 - 15.6875 / t - 13.4721 * math.log(t) + 0.43577 * t ** 6
    return (math.log(101325.0 / Pc) - f0) / f1


def riedel_watson(Tb, Tc, Pc, T_):
    Tbr = Tb / Tc
    Hb = 1.092 * R * Tb * (math.log(Pc / 1e5) - 1.013) / (0.930 - Tbr)
    return Hb * ((1 - T_ / Tc) / (1 - Tbr)) ** 0.38


# cetane numbers that are not in the tables chemicals carries (see sources.toml)
CN_EXTRA = {
    # definition of the scale (ASTM D613)
    "544-76-3": (100.0, "CN", "astm-d613", "primary reference fuel, CN = 100 by definition"),
    "4390-04-9": (15.0, "CN", "astm-d613", "secondary low reference fuel, CN = 15 by definition"),
    "90-12-0": (0.0, "CN", "astm-d613", "former low reference fuel, CN = 0 by definition"),
    # recalled values / trend values (not confirmed against a compendium in this session)
    "111-65-9": (64.0, "CN", "from-memory", "recalled compendium-level value for n-octane; not re-confirmed; not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
    "111-84-2": (72.0, "estimate", "estimated:class-trend", "n-alkane trend between the neighbouring n-alkanes; not a measurement"),
    "124-18-5": (77.0, "CN", "from-memory", "recalled compendium-level value (CN 76-77; IQT DCN is lower, about 66); not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
    "1120-21-4": (80.0, "estimate", "estimated:class-trend", "n-alkane trend between the neighbouring n-alkanes; not a measurement"),
    "112-40-3": (82.0, "CN", "from-memory", "recalled compendium-level value (about 80-87); IQT DCN is lower, about 74; not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
    "629-59-4": (95.0, "estimate", "estimated:class-trend", "n-alkane trend between n-tridecane (90) and n-pentadecane (96, CombustDB); not a measurement"),
    "3891-98-3": (58.0, "DCN", "from-memory", "recalled DCN of farnesane (about 58-59); not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
    "871-83-0": (66.0, "estimate", "estimated:class-trend", "trend value for a 2-methyl alkane slightly below the n-alkane of the same carbon number; not a measurement"),
    "13151-34-3": (68.0, "estimate", "estimated:class-trend", "trend value; not a measurement"),
    "7045-71-8": (72.0, "estimate", "estimated:class-trend", "trend value; not a measurement"),
    "1560-95-8": (82.0, "estimate", "estimated:class-trend", "trend value; not a measurement"),
    "6975-98-0": (68.0, "estimate", "estimated:class-trend", "trend value for a 2-methyl alkane slightly below the n-alkane of the same carbon number; not a measurement"),
    "1002-43-3": (70.0, "estimate", "estimated:class-trend", "trend value for a 3-methyl alkane below the n-alkane of the same carbon number; not a measurement"),
    "1560-96-9": (78.0, "estimate", "estimated:class-trend", "trend value for a 2-methyl alkane below the n-alkane of the same carbon number; not a measurement"),
    "1921-70-6": (45.0, "estimate", "estimated:class-trend", "trend value for a multiply methyl-branched alkane (between 2,6-dimethyloctane 51.7 and farnesane); not a measurement"),
    "696-29-7": (40.0, "estimate", "estimated:class-trend", "trend value for a C9 alkylcyclohexane with a branched side chain, below n-propylcyclohexane (52, CombustDB); not a measurement"),
    "4292-92-6": (55.0, "estimate", "estimated:class-trend", "n-alkylcyclohexane trend (n-propyl 52, n-butyl 47.8 in CombustDB scatter); not a measurement"),
    "4292-75-5": (58.0, "estimate", "estimated:class-trend", "n-alkylcyclohexane trend; not a measurement"),
    "1795-15-9": (65.0, "estimate", "estimated:class-trend", "n-alkylcyclohexane trend; not a measurement"),
    "1795-16-0": (70.0, "estimate", "estimated:class-trend", "n-alkylcyclohexane trend; not a measurement"),
    "99-87-6": (8.0, "estimate", "estimated:class-trend", "C10 alkylbenzene trend (xylenes and trimethylbenzenes 6-10 in the vom Lehn compilation); not a measurement"),
    "488-23-3": (10.0, "estimate", "estimated:class-trend", "C10 polymethylbenzene trend (trimethylbenzenes 8-10); not a measurement"),
    "104-72-3": (45.0, "estimate", "estimated:class-trend", "n-alkylbenzene trend (n-hexyl 26, n-heptyl 35, n-octyl 37.5 in CombustDB); not a measurement"),
    "1127-76-0": (5.0, "estimate", "estimated:class-trend", "alkylnaphthalene trend (1-methylnaphthalene 0 by definition); not a measurement"),
    "575-41-7": (5.0, "estimate", "estimated:class-trend", "alkylnaphthalene trend (1-methylnaphthalene 0 by definition); not a measurement"),
    "575-43-9": (5.0, "estimate", "estimated:class-trend", "alkylnaphthalene trend (1-methylnaphthalene 0 by definition); not a measurement"),
    "493-01-6": (42.0, "CN", "from-memory", "recalled (cis-decalin about 41-46); not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
    "91-20-3": (0.0, "estimate", "estimated:class-trend", "naphthalene: no usable measurement (solid); assigned the 1-methylnaphthalene low-reference value"),
    "64-17-5": (8.0, "CN", "from-memory", "recalled (ethanol CN about 5-8); not in the vom Lehn 2021, CombustDB or ECRL compilations (checked), and the NREL compendium (Yanowitz et al. 2017, NREL/TP-5400-67585) was readable here only as its title pages"),
}


# Measurement method of compilation cetane values, from the ECRL fuel-property database (Kessler et al.,
# repository ecrl/ecnet, file databases/properties_master.csv, commit d9bfc444905d8786cdc3457a6494eef25ea2faab;
# columns cetane_number value / method / source), read for these rows only. Used only where the value equals
# the one our compilation gives: the kind becomes DCN when the method is the Ignition Quality Tester (a
# constant-volume combustion chamber, ASTM D6890). CAS -> (value, method as printed, original source as printed).
CN_METHOD = {
    "142-82-5": (52.8, "IQT", "Marquardt (2015)"),
    "108-87-2": (24.4, "IQT", "Marquardt (2015)"),
    "108-38-3": (7.0, "IQT", "NREL (2014)"),
    "95-63-6": (8.9, "IQT", "NREL (2014)"),  # listed there under CAS 95-36-3 with PubChem CID 7247 (1,2,4-trimethylbenzene)
    "108-67-8": (8.0, "80% Blend, IQT", "NREL (2014)"),
    "103-65-1": (16.0, "80% Blend, IQT", "NREL (2014)"),
    "493-02-7": (37.4, "IQT", "Heyne (2009)"),
    "104-51-8": (12.0, "IQT", "NREL (2014)"),
    "540-84-1": (18.0, "IQT", "NREL (2014)"),
    "538-68-1": (18.0, "Blend", "NREL (2014)"),
}


def cetane_kind(cas, value, note):
    """(kind, note) for a compilation cetane value: DCN when CN_METHOD names the IQT for the same value."""
    m = CN_METHOD.get(cas)
    if not m:
        return "CN", note
    v, method, orig = m
    if abs(v - value) > 1e-9:
        return "CN", note + f"; the ECRL fuel-property database lists {v} ({method}, {orig}) instead, so the kind stays unresolved"
    if "IQT" not in method:
        return "CN", note + f"; the ECRL fuel-property database gives the method as '{method}' ({orig}), not a constant-volume chamber"
    blend = "Blend" in method
    return "DCN", (note.split(";")[0] + f"; measurement method from the ECRL fuel-property database (ecrl-properties-master): "
                   f"{method}, {orig}" + (" - measured in a blend and back-calculated to the neat compound" if blend else ""))


def constants(comp, vp_sec, lh_sec):
    cid, name, aliases, cas, cls, (C, H, O), groups, nring = comp
    out = {}
    notes_report = []
    M = (C * ATW["C"] + H * ATW["H"] + O * ATW["O"]) * 1e-3
    out["molar-mass"] = {"value": round(M, 8), "source": "iupac-atomic-weights",
                         "note": f"from formula C{C}H{H}O{O} with conventional atomic weights C 12.011, H 1.008, O 15.999"}
    jb = joback(groups, C + H + O)

    # normal boiling point
    tb = first(T["crcphys"], cas, "Tb")
    tby = first(T["yawstb"], cas, "Tb")
    if tb and tby and abs(tb - tby) > 1.0 and vp_sec["model"] != "corresponding-states":
        pc_, py_ = ev(vp_sec, tb, 1.0), ev(vp_sec, tby, 1.0)
        if abs(math.log(py_ / 101325)) < abs(math.log(pc_ / 101325)):
            out["normal-boiling-point"] = {"value": tby, "source": "yaws-2014",
                                           "note": f"CRC gives {tb} K; the Yaws value is used because it agrees with the published vapour-pressure correlation (P = {py_:.0f} Pa vs {pc_:.0f} Pa at the CRC value)"}
            tb = tby
    if "normal-boiling-point" in out:
        pass
    elif tb:
        out["normal-boiling-point"] = {"value": tb, "source": "crc95-physical-constants"}
    elif first(T["yawstb"], cas, "Tb"):
        tb = first(T["yawstb"], cas, "Tb")
        out["normal-boiling-point"] = {"value": tb, "source": "yaws-2014"}
    elif webbook(cas, "Tb"):
        tb = webbook(cas, "Tb")
        out["normal-boiling-point"] = {"value": tb, "source": "nist-webbook"}
    else:
        tb = jb["Tb"]
        out["normal-boiling-point"] = {"value": round(tb, 2), "source": "estimated:joback"}

    # critical constants
    d = T["dippr"].get(cas)
    crit_src = None
    if d and num(d[0]["Tc"]):
        Tc, Pc, Vc = num(d[0]["Tc"]), num(d[0]["Pc"]), num(d[0]["Vc"])
        crit_src = "dippr-pina-martinez-2021"
    elif T["yaws"].get(cas):
        y = T["yaws"][cas][0]
        Tc, Pc, Vc = num(y["Tc"]), num(y["Pc"]), num(y["Vc"])
        jp = first(T["jobpred"], cas.replace("-", ""), "Pc")
        if jp and abs(jp / Pc - 1) < 2e-3:
            crit_src = "estimated:joback"
            Tc, Pc, Vc = joback(groups, C + H + O, Tb=tb)["Tc"], jb["Pc"], jb["Vc"]
        else:
            crit_src = "yaws-2014"
    else:
        crit_src = "estimated:joback"
        Tc, Pc, Vc = joback(groups, C + H + O, Tb=tb)["Tc"], jb["Pc"], jb["Vc"]
    xchk = []
    for key, lab in (("iupac", "IUPAC/Ambrose-Tsonopoulos"), ("crcc", "CRC"), ("psrk", "PSRK")):
        r = T[key].get(cas)
        if r and num(r[0]["Tc"]):
            tcx, pcx = num(r[0]["Tc"]), num(r[0]["Pc"])
            s = f"{lab} Tc {tcx:g} K" + (f", Pc {pcx/1e6:g} MPa" if pcx else "")
            if abs(tcx / Tc - 1) > 0.005 or (pcx and abs(pcx / Pc - 1) > 0.03):
                s += " (DISAGREES, not used)"
            xchk.append(s)
    xnote = "cross-check: " + "; ".join(xchk) if xchk else "no second compilation available"
    if crit_src == "estimated:joback":
        xnote = "Joback & Reid (1987) with the boiling point above (Tc = Tb/(0.584 + 0.965 S - S^2)); groups: " + groups_text(groups) + ("; Yaws 2014 lists the same Joback values" if T["yaws"].get(cas) else "")
    out["critical-temperature"] = {"value": round(Tc, 3), "source": crit_src, "note": xnote}
    out["critical-pressure"] = {"value": round(Pc, 1), "source": crit_src}
    out["critical-volume"] = {"value": float(f"{Vc:.6g}"), "source": crit_src}

    # acentric factor
    lk = lee_kesler_omega(tb, Tc, Pc)
    y = T["yaws"].get(cas)
    if crit_src != "estimated:joback" and y and num(y[0]["omega"]) is not None and abs(num(y[0]["omega"]) - lk) < 0.025:
        om = num(y[0]["omega"])
        out["acentric-factor"] = {"value": om, "source": "yaws-2014", "note": f"Lee-Kesler value from Tb, Tc, Pc: {lk:.3f}"}
    elif crit_src != "estimated:joback" and T["psrk"].get(cas) and abs(num(T["psrk"][cas][0]["omega"]) - lk) < 0.025:
        om = num(T["psrk"][cas][0]["omega"])
        out["acentric-factor"] = {"value": om, "source": "psrk-rev4", "note": f"Lee-Kesler value from Tb, Tc, Pc: {lk:.3f}"}
    else:
        om = lk
        other = ""
        if y and num(y[0]["omega"]) is not None:
            other = f"; Yaws 2014 lists {num(y[0]['omega'])}, inconsistent with Tb, Tc, Pc used here (or itself an estimate)"
        out["acentric-factor"] = {"value": round(lk, 4), "source": "estimated:lee-kesler-omega",
                                  "note": "omega = (ln(101325/Pc) - f0(Tbr)) / f1(Tbr), Lee-Kesler vapour-pressure equation solved at Tb" + other}

    # melting point, fusion
    tm = first(T["crcphys"], cas, "Tm")
    if tm:
        out["melting-point"] = {"value": tm, "source": "crc95-physical-constants"}
    elif webbook(cas, "Tm"):
        out["melting-point"] = {"value": round(webbook(cas, "Tm"), 2), "source": "nist-webbook"}
    else:
        tm = round(jb["Tm"], 1)
        out["melting-point"] = {"value": tm, "source": "estimated:joback", "note": "Joback Tm is poor for branched alkanes (typically too high); only used as a freezing warning"}
    hf = first(T["hfus"], cas, "Hfus")
    if hf:
        out["enthalpy-of-fusion"] = {"value": hf, "source": "crc95-heat-of-fusion"}

    # lower heating value
    M_g = M * 1e3
    def hvap298():
        if lh_sec["model"] == "dippr106":
            return ev(lh_sec, 298.15, M) * M, "Perry Table 2-150 correlation at 298.15 K"
        h = first(T["crchvap"], cas, "Hvap298")
        if h:
            return h, "CRC Handbook enthalpy of vaporization at 298.15 K"
        return riedel_watson(tb, Tc, Pc, 298.15), "Riedel at Tb + Watson (n = 0.38) to 298.15 K"
    hfl = None
    for key, col, src in (("atctl", "Hfl", "atct-1-112"), ("crcstd", "Hfl", "crc95-standard-thermo")):
        v = first(T[key], cas, col)
        if v is not None:
            hfl, hsrc, how = v, src, "liquid standard enthalpy of formation"
            break
    if hfl is None and webbook(cas, "Hfl") is not None:
        hfl, hsrc, how = webbook(cas, "Hfl"), "nist-webbook", "liquid standard enthalpy of formation"
    if hfl is None:
        for key, col, src in (("atctg", "Hfg", "atct-1-112"), ("crcstd", "Hfg", "crc95-standard-thermo"),
                              ("api", "Hfg", "api-tdb-albahri"), ("yawshf", "Hfg", "yaws-2014")):
            v = first(T[key], cas, col)
            if v is not None and abs(v - jb["Hf"]) > 60e3:
                # a compilation entry far from the group estimate is a copying error in that table
                # (e.g. API TDB/Albahri n-octylbenzene +538.81 kJ/mol); try the next compilation
                continue
            if v is not None:
                hv, hvsrc = hvap298()
                hfl, hsrc, how = v - hv, src, f"gas enthalpy of formation {v/1e3:.2f} kJ/mol minus enthalpy of vaporisation {hv/1e3:.2f} kJ/mol ({hvsrc})"
                if src == "yaws-2014" and first(T["jobpred"], cas.replace("-", ""), "Hfg") == v:
                    hsrc = "estimated:joback"
                break
    if hfl is None:
        hv, hvsrc = hvap298()
        hfl, hsrc, how = jb["Hf"] - hv, "estimated:joback", f"Joback gas enthalpy of formation {jb['Hf']/1e3:.2f} kJ/mol minus enthalpy of vaporisation {hv/1e3:.2f} kJ/mol ({hvsrc})"
    dHc = C * DHF_CO2 + H / 2 * DHF_H2O_G - hfl
    lhv = -dHc / M
    out["lower-heating-value"] = {"value": round(lhv, -3), "source": hsrc,
                                  "note": f"computed from {how} = {hfl/1e3:.2f} kJ/mol (liquid, 298.15 K) and CODATA dHf CO2(g) -393.51, H2O(g) -241.826 kJ/mol"}

    # cetane number
    if cas in CN_EXTRA:
        v, kind, src, note = CN_EXTRA[cas]
        out["cetane-number"] = {"value": v, "kind": kind, "source": src, "note": note}
        if src == "from-memory":
            out["cetane-number"]["uncertainty"] = 0.15
    else:
        v = first(T["cnvl"], cas, "CETANE")
        if v is not None:
            kind, note = cetane_kind(cas, v, "compilation value; the compilation does not separate engine CN from derived CN")
            out["cetane-number"] = {"value": v, "kind": kind, "source": "vom-lehn-2021", "note": note}
        else:
            v = first(T["cnkess"], cas, "CETANE")
            if v is not None:
                kind, note = cetane_kind(cas, v, "compilation value (CombustDB, drawn largely from the NREL cetane compendium); kind not separated")
                out["cetane-number"] = {"value": v, "kind": kind, "source": "combustdb-kessler", "note": note}
            else:
                raise SystemExit(f"no cetane number for {cid}")

    # flash point
    for key, src in (("iec", "iec-60079-20-1-2010"), ("serat", "dippr-serat-2017"), ("nfpa", "nfpa-497-2008")):
        v = first(T[key], cas, "T_flash")
        if v:
            out["flash-point"] = {"value": round(v, 2), "source": src}
            break

    # Rackett Z_RA
    z = first(T["costald"], cas, "Z_RA")
    if z:
        out["rackett-z"] = {"value": z, "source": "costald-hankinson-thomson-1979"}

    # Fuller diffusion volume
    dv = C * 15.9 + H * 2.31 + O * 6.11 - 18.3 * nring
    out["diffusion-volume"] = {"value": round(dv, 2), "source": "poling5-table-11-1",
                               "note": f"sum of Fuller atomic increments C 15.9, H 2.31, O 6.11" + (f", {nring} aromatic ring(s) x -18.3" if nring else "") + "; ring increment applied to aromatic rings only, as tabulated"}

    # Lennard-Jones (Poling Appendix B only)
    r = T["polinglj"].get(cas)
    if r:
        out["lennard-jones-sigma"] = {"value": num(r[0]["molecular_diameter"]) * 1e-10, "source": "poling5-appendix-b"}
        out["lennard-jones-epsilon-over-k"] = {"value": num(r[0]["Stockmayer"]), "source": "poling5-appendix-b"}
    return out, dict(M=M, Tb=tb, Tc=Tc, Pc=Pc, Tm=out["melting-point"]["value"], omega=om)

# ----------------------------------------------------------------------------
# TOML writing
# ----------------------------------------------------------------------------
def tv(v):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return repr(float(v))
    if isinstance(v, float):
        return repr(v)
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(v, list):
        return "[" + ", ".join(tv(x) for x in v) + "]"
    raise TypeError(v)


def inline(d):
    return "{ " + ", ".join(f"{k} = {tv(v)}" for k, v in d.items()) + " }"


SECTIONS = ["vapor-pressure", "liquid-density", "latent-heat", "liquid-heat-capacity", "liquid-viscosity",
            "liquid-conductivity", "surface-tension", "ideal-gas-heat-capacity", "vapor-viscosity", "vapor-conductivity"]
CONST_ORDER = ["molar-mass", "normal-boiling-point", "critical-temperature", "critical-pressure", "critical-volume",
               "acentric-factor", "melting-point", "enthalpy-of-fusion", "lower-heating-value", "cetane-number",
               "flash-point", "rackett-z", "diffusion-volume", "lennard-jones-sigma", "lennard-jones-epsilon-over-k"]


def write(comp, consts, secs):
    cid, name, aliases, cas, cls, (C, H, O), groups, nring = comp
    L = ["# Generated by mixtures/tools/make_components.py from published tables (see mixtures/sources.toml).",
         "# Do not edit by hand: change the generator and re-run it.",
         f"id = {tv(cid)}", f"name = {tv(name)}", f"aliases = {tv(aliases)}", f"cas = {tv(cas)}", f"class = {tv(cls)}",
         f"formula = {{ C = {C}, H = {H}, O = {O} }}",
         "joback-groups = { " + ", ".join(f"{g} = {n}" for g, n in groups.items()) + " }  # Joback & Reid (1987) groups"]
    if unifac_line(cid) is not None:
        L.append(unifac_line(cid))
    L += ["", "[constants]"]
    for k in CONST_ORDER:
        if k in consts:
            L.append(f"{k} = {inline(consts[k])}")
    for s in SECTIONS:
        L.append("")
        L.append(f"[{s}]")
        for k, v in secs[s].items():
            L.append(f"{k} = {tv(v)}")
    with open(os.path.join(OUT, cid + ".toml"), "w") as fh:
        fh.write("\n".join(L) + "\n")



# ----------------------------------------------------------------------------
# ambient gases (mixtures/gases.toml)
# ----------------------------------------------------------------------------
# GRI-Mech 3.0 thermo30.dat, NASA 7-coefficient polynomials copied digit for digit:
# (t-min, t-max, t-mid, high-T a1..a7, low-T a1..a7)
GRI30 = {
    "N2": (300.0, 5000.0, 1000.0,
           [0.02926640E+02, 0.14879768E-02, -0.05684760E-05, 0.10097038E-09, -0.06753351E-13, -0.09227977E+04, 0.05980528E+02],
           [0.03298677E+02, 0.14082404E-02, -0.03963222E-04, 0.05641515E-07, -0.02444854E-10, -0.10208999E+04, 0.03950372E+02]),
    "O2": (200.0, 3500.0, 1000.0,
           [3.28253784E+00, 1.48308754E-03, -7.57966669E-07, 2.09470555E-10, -2.16717794E-14, -1.08845772E+03, 5.45323129E+00],
           [3.78245636E+00, -2.99673416E-03, 9.84730201E-06, -9.68129509E-09, 3.24372837E-12, -1.06394356E+03, 3.65767573E+00]),
    "CO2": (200.0, 3500.0, 1000.0,
            [3.85746029E+00, 4.41437026E-03, -2.21481404E-06, 5.23490188E-10, -4.72084164E-14, -4.87591660E+04, 2.27163806E+00],
            [2.35677352E+00, 8.98459677E-03, -7.12356269E-06, 2.45919022E-09, -1.43699548E-13, -4.83719697E+04, 9.90105222E+00]),
    "H2O": (200.0, 3500.0, 1000.0,
            [3.03399249E+00, 2.17691804E-03, -1.64072518E-07, -9.70419870E-11, 1.68200992E-14, -3.00042971E+04, 4.96677010E+00],
            [4.19864056E+00, -2.03643410E-03, 6.52040211E-06, -5.48797062E-09, 1.77197817E-12, -3.02937267E+04, -8.49032208E-01]),
    "AR": (300.0, 5000.0, 1000.0,
           [0.02500000E+02, 0.0, 0.0, 0.0, 0.0, -0.07453750E+04, 0.04366000E+02],
           [0.02500000E+02, 0.0, 0.0, 0.0, 0.0, -0.07453750E+04, 0.04366000E+02]),
}
GASES = [  # id, name, CAS, formula dict, GRI name, Fuller diffusion volume (Poling Table 11-1)
    ("n2", "Nitrogen", "7727-37-9", {"N": 2}, "N2", 18.5),
    ("o2", "Oxygen", "7782-44-7", {"O": 2}, "O2", 16.3),
    ("co2", "Carbon dioxide", "124-38-9", {"C": 1, "O": 2}, "CO2", 26.9),
    ("h2o", "Water", "7732-18-5", {"H": 2, "O": 1}, "H2O", 13.1),
    ("ar", "Argon", "7440-37-1", {"Ar": 1}, "AR", 16.2),
]
ATW_GAS = {"C": 12.011, "H": 1.008, "O": 15.999, "N": 14.007, "Ar": 39.95}


def write_gases():
    path = os.path.normpath(os.path.join(OUT, "..", "gases.toml"))
    L = ["# Ambient-gas species for dropcut. Generated by mixtures/tools/make_components.py; do not edit by hand.",
         "# Layout: one TOML table per gas, [<id>] with id in n2 | o2 | co2 | h2o | ar. Inside each table the keys",
         "# follow docs/component-format.md: constants as inline tables { value, source } at table level, and the",
         "# correlations as sub-tables [<id>.ideal-gas-heat-capacity], [<id>.vapor-viscosity], [<id>.vapor-conductivity].",
         "# ideal-gas-heat-capacity uses model = \"nasa7\" (NOT yet in component-format.md): cp/R = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4,",
         "# coefficients-low for t-min <= T < t-mid, coefficients-high for t-mid <= T <= t-max; 7 numbers each as published",
         "# (a6, a7 are the enthalpy and entropy integration constants), unit = \"cp/R\".",
         "# Fuller diffusion volume of air (Poling et al. Table 11-1): 19.7.", ""]
    for gid, name, cas, form, gri, dv in GASES:
        M = sum(ATW_GAS[e] * n for e, n in form.items()) * 1e-3
        tmin, tmax, tmid, hi, lo = GRI30[gri]
        L += [f"[{gid}]", f"name = {tv(name)}", f"cas = {tv(cas)}",
              f"molar-mass = {inline({'value': round(M, 6), 'source': 'iupac-atomic-weights'})}",
              f"diffusion-volume = {inline({'value': dv, 'source': 'poling5-table-11-1'})}"]
        lj = T["polinglj"].get(cas)[0]
        sig = float("%.6g" % (num(lj["molecular_diameter"]) * 1e-10))
        L += ["lennard-jones-sigma = " + inline({"value": sig, "source": "poling5-appendix-b"}),
              "lennard-jones-epsilon-over-k = " + inline({"value": num(lj["Stockmayer"]), "source": "poling5-appendix-b"}), ""]
        L += [f"[{gid}.ideal-gas-heat-capacity]", 'model = "nasa7"', f"coefficients-low = {tv(lo)}", f"coefficients-high = {tv(hi)}",
              f"t-mid = {tv(tmid)}", 'unit = "cp/R"', f"t-min = {tv(tmin)}", f"t-max = {tv(tmax)}", 'source = "gri-mech-3-thermo"', ""]
        for secname, tab in (("vapor-viscosity", "p312"), ("vapor-conductivity", "p314")):
            p = perry(tab, cas, 4)
            c = p[0]
            while len(c) > 2 and c[-1] == 0:
                c.pop()
            unit = "Pa*s" if tab == "p312" else "W/m/K"
            src = "perry8-table-2-312" if tab == "p312" else "perry8-table-2-314"
            L += [f"[{gid}.{secname}]", 'model = "dippr102"', f"coefficients = {tv(c)}", f"unit = {tv(unit)}",
                  f"t-min = {tv(p[1])}", f"t-max = {tv(p[2])}", f"source = {tv(src)}", ""]
    with open(path, "w") as fh:
        fh.write("\n".join(L))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--igcp", choices=["default", "trc"], default="default")
    args = ap.parse_args()
    if chemicals.__version__ != "1.5.2":
        print(f"warning: transcribed from chemicals 1.5.2, found {chemicals.__version__}", file=sys.stderr)
    tables()
    os.makedirs(OUT, exist_ok=True)
    # self-check of our Joback implementation against the Joback table carried by chemicals
    for comp in COMPONENTS:
        jp = T["jobpred"].get(comp[3].replace("-", ""))
        if jp and num(jp[0]["Cpg0"]) is not None:
            mine = joback(comp[6], sum(comp[5]))
            ref = [num(jp[0][f"Cpg{i}"]) for i in range(4)]
            cp_m = sum(c * 500.0 ** i for i, c in enumerate(mine["cp"]))
            cp_r = sum(c * 500.0 ** i for i, c in enumerate(ref))
            if abs(cp_m / cp_r - 1) > 0.01:
                print(f"joback mismatch {comp[0]}: {cp_m:.2f} vs {cp_r:.2f} J/mol/K at 500 K", file=sys.stderr)
    for comp in COMPONENTS:
        cas = comp[3]
        lh = latent_heat(cas)
        vp = vapor_pressure(cas)
        consts, k = constants(comp, vp, lh)
        if lh["model"] == "corresponding-states":
            lh = measured_latent_heat(cas, k) or lh
        cpl = liquid_cp(cas, k["Tc"])
        if cpl["model"] == "corresponding-states":
            cpl = measured_liquid_cp(cas) or cpl
        secs = {
            "vapor-pressure": vp,
            "liquid-density": liquid_density(cas, k),
            "latent-heat": lh,
            "liquid-heat-capacity": cpl,
            "liquid-viscosity": liquid_viscosity(cas, comp, k),
            "liquid-conductivity": liquid_conductivity(cas, k["Tm"], k["Tb"]),
            "surface-tension": surface_tension(cas),
            "ideal-gas-heat-capacity": ideal_gas_cp(cas, comp, args.igcp),
            "vapor-viscosity": vapor_viscosity(cas),
            "vapor-conductivity": vapor_conductivity(cas),
        }
        write(comp, consts, secs)
    for comp in COMPONENTS:
        if comp[0] not in UNIFAC_GROUPS:
            print(f"warning: {comp[0]} has no row in UNIFAC_GROUPS (no unifac-groups table written)", file=sys.stderr)
    write_gases()
    print(f"wrote {len(COMPONENTS)} files to {OUT} and gases.toml")


if __name__ == "__main__":
    main()
