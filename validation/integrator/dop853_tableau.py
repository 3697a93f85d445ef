"""Write src/model/integrator/dop853_tableau.rs: the published coefficients of Dormand and Prince's 8(5,3) pair
and its 7th-order dense output (Hairer, Norsett & Wanner, Solving ODEs I, 2nd ed., 1993, DOP853), as transcribed
in SciPy (scipy/integrate/_ivp/dop853_coefficients.py). Each float is written by repr (shortest round trip), so
the Rust constants are the same doubles as SciPy's.

Run from the repository root: python3 validation/integrator/dop853_tableau.py
"""
import datetime

import scipy
import scipy.integrate._ivp.dop853_coefficients as m


def f(x):
    r = repr(float(x))
    if "e" not in r and "." not in r:
        r += ".0"
    return r


def main():
    A, C, B, E3, E5, D = m.A, m.C, m.B, m.E3, m.E5, m.D
    out = [
        "//! Butcher tableau of Dormand and Prince's explicit Runge–Kutta pair of order 8(5,3) with its 7th-order dense",
        "//! output (Hairer, Nørsett & Wanner, Solving Ordinary Differential Equations I, 2nd ed., Springer 1993, §II.5",
        "//! and §II.6; the DOP853 code of the same authors). The numbers are the published coefficients as transcribed",
        "//! in SciPy %s (`scipy/integrate/_ivp/dop853_coefficients.py`), written here by" % scipy.__version__,
        "//! `validation/integrator/dop853_tableau.py` (%s); `tests` in integrator.rs check the order conditions"
        % datetime.date.today().isoformat(),
        "//! they must satisfy (row sums, weights).",
        "",
        "/// Stages of one step (the 13th, f at the step's end, is the next step's first: first same as last).",
        "pub(super) const STAGES: usize = 12;",
        "/// Stages including the three extra ones of the dense output.",
        "pub(super) const STAGES_DENSE: usize = 16;",
        "",
        "/// Nodes c_s.",
        "pub(super) const C: [f64; STAGES_DENSE] = [%s];" % ", ".join(f(x) for x in C),
        "",
        "/// Coupling coefficients a_sj (row s, j < s): rows 0–11 the step's stages, row 12 the 8th-order weights b_j,",
        "/// rows 13–15 the dense output's extra stages.",
        "pub(super) const A: [[f64; STAGES_DENSE]; STAGES_DENSE] = [",
    ]
    out += ["    [%s]," % ", ".join(f(x) for x in A[s]) for s in range(16)]
    out += [
        "];",
        "",
        "/// 8th-order weights b_j.",
        "pub(super) const B: [f64; STAGES] = [%s];" % ", ".join(f(x) for x in B),
        "",
        "/// Error weights of the embedded 5th-order estimate (over the 13 stages).",
        "pub(super) const E5: [f64; STAGES + 1] = [%s];" % ", ".join(f(x) for x in E5),
        "",
        "/// Error weights of the embedded 3rd-order estimate (over the 13 stages).",
        "pub(super) const E3: [f64; STAGES + 1] = [%s];" % ", ".join(f(x) for x in E3),
        "",
        "/// Dense-output coefficients d_rj of the interpolant's terms 4–7 (over the 16 stages).",
        "pub(super) const D: [[f64; STAGES_DENSE]; 4] = [",
    ]
    out += ["    [%s]," % ", ".join(f(x) for x in D[r]) for r in range(4)]
    out.append("];")
    with open("src/model/integrator/dop853_tableau.rs", "w") as fh:
        fh.write("\n".join(out) + "\n")


if __name__ == "__main__":
    main()
