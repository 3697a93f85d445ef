#!/usr/bin/env python3
"""Ideal-gas heat capacity of n-dodecane from a published NASA 7-coefficient polynomial, for dropcut
validation of the ideal-gas cp above the range of the library's own polynomial (Poling et al. Appendix A,
200-1000 K) -- an independent source: the coefficients below come from a combustion mechanism's thermo
data (group additivity), not from the handbook tables that feed the component files.

Source of the coefficients (transcribed by hand, digits as printed):
  Cantera repository, file data/nDodecane_Reitz.yaml (commit 0b950018976eb74733986daf6bb7052691ebe3a9),
  species c12h26, NASA7, temperature ranges 300-1391-5000 K, thermo note "-therm" (THERM group
  additivity); mechanism: H. Wang, Y. Ra, M. Jia, R. D. Reitz, Development of a reduced n-dodecane-PAH
  mechanism and its application for n-dodecane soot predictions, Fuel 136 (2014) 25-36,
  doi:10.1016/j.fuel.2014.07.028.

Writes validation/nasa7/n-dodecane_cp.csv (300-1500 K, 25 K steps).  Needs only Python.
Rerun:  python3 validation/nasa7_reference.py   (from the repository root)
"""

import datetime
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
R = 8.314462618  # J/(mol K), CODATA 2018
MOLAR_MASS = 0.17034  # kg/mol, C12H26 with atomic weights C 12.011, H 1.008 (as the library)
LOW = [-2.62181594, 0.147237711, -9.43970271e-05, 3.07441268e-08, -4.0360223e-12]
HIGH = [38.5095037, 0.0563550048, -1.914932e-05, 2.96024862e-09, -1.7124415e-13]
T_MID = 1391.0


def cp(t):
    a = LOW if t < T_MID else HIGH
    return R / MOLAR_MASS * sum(a[i] * t ** i for i in range(5))


def main():
    os.makedirs(os.path.join(HERE, "nasa7"), exist_ok=True)
    path = os.path.join(HERE, "nasa7", "n-dodecane_cp.csv")
    with open(path, "w") as f:
        for line in [
            "Ideal-gas heat capacity of n-dodecane from a published NASA 7-coefficient polynomial, for dropcut validation.",
            "library: none (Python %s evaluating transcribed coefficients)" % sys.version.split()[0],
            "date: %s" % datetime.date.today().isoformat(),
            "command: python3 validation/nasa7_reference.py   (run from the repository root)",
            "source: Cantera repository data/nDodecane_Reitz.yaml (commit 0b950018976eb74733986daf6bb7052691ebe3a9), species c12h26,"
            " NASA7 300-1391-5000 K, thermo note '-therm' (THERM group additivity); mechanism of Wang, Ra, Jia & Reitz,"
            " Fuel 136 (2014) 25-36, doi:10.1016/j.fuel.2014.07.028",
            "low-range coefficients a1..a5: %s" % ", ".join(repr(x) for x in LOW),
            "high-range coefficients a1..a5: %s; switch %.0f K" % (", ".join(repr(x) for x in HIGH), T_MID),
            "molar mass: %.5f kg/mol (C12H26, C 12.011, H 1.008)" % MOLAR_MASS,
            "columns:",
            "  temperature_K: temperature, K",
            "  ideal_gas_cp_J_kgK: cp/R = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4, times R/M, J/(kg K)",
        ]:
            f.write("# " + line + "\n")
        f.write("temperature_K,ideal_gas_cp_J_kgK\n")
        t = 300.0
        while t <= 1500.0 + 1e-9:
            f.write("%g,%.10g\n" % (t, cp(t)))
            t += 25.0


if __name__ == "__main__":
    main()
