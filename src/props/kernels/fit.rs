//! Fitting of the kernels' interpolants: Chebyshev interpolation of a property on a segment, converted to
//! monomials, truncated and checked against the direct evaluation.

use std::sync::OnceLock;

use super::{horner, Poly, PolyGroup, Segment, ACCEPTED_DEVIATION, COEFFICIENTS, TRUNCATION, VAPOR_PRESSURE};
use crate::data::Component;

/// The interpolants of `properties` of `c` on `seg`, fitted one by one ([`fit`]) and stored as a group.
pub(super) fn fit_group<const N: usize>(c: &Component, properties: [usize; N], seg: &Segment) -> PolyGroup<N> {
    let mut group = PolyGroup { c: [[0.0; N]; COEFFICIENTS], degree: 0, ok: [false; N], all_ok: false };
    for (j, &property) in properties.iter().enumerate() {
        let poly = fit(c, property, seg);
        group.ok[j] = poly.ok;
        group.degree = group.degree.max(poly.degree);
        for k in 0..COEFFICIENTS {
            group.c[k][j] = poly.c[k];
        }
    }
    group.all_ok = group.ok.iter().all(|ok| *ok);
    group
}

/// Chebyshev interpolant of property `property` of `c` on `seg`, converted to monomials in u, and checked.
fn fit(c: &Component, property: usize, seg: &Segment) -> Poly {
    fit_function(&|t| c.unscaled_direct(property, t), property == VAPOR_PRESSURE, seg)
}

/// Cosines of the Chebyshev interpolation, computed once per process (the same expressions, hence the same
/// bits, as evaluating them at every fit).
struct ChebyshevTable {
    /// Nodes x_k = cos(π (k + ½)/N).
    nodes: [f64; COEFFICIENTS],
    /// cos(π j (k + ½)/N), `cosines[j][k]`.
    cosines: [[f64; COEFFICIENTS]; COEFFICIENTS],
    /// Extrema cos(π k/N), k = 0..=N.
    extrema: [f64; COEFFICIENTS + 1],
}

/// The process-wide [`ChebyshevTable`].
fn chebyshev_table() -> &'static ChebyshevTable {
    static TABLE: OnceLock<ChebyshevTable> = OnceLock::new();
    TABLE.get_or_init(|| {
        const N: usize = COEFFICIENTS;
        let mut t = ChebyshevTable { nodes: [0.0; N], cosines: [[0.0; N]; N], extrema: [0.0; N + 1] };
        for k in 0..N {
            t.nodes[k] = (std::f64::consts::PI * (k as f64 + 0.5) / N as f64).cos();
            for j in 0..N {
                t.cosines[j][k] = (std::f64::consts::PI * j as f64 * (k as f64 + 0.5) / N as f64).cos();
            }
        }
        for k in 0..=N {
            t.extrema[k] = (std::f64::consts::PI * k as f64 / N as f64).cos();
        }
        t
    })
}

/// Chebyshev interpolant of `direct` (of ln `direct` when `log`) on `seg`, in monomials of u, truncated
/// ([`TRUNCATION`]) and checked.
pub(super) fn fit_function(direct: &dyn Fn(f64) -> f64, log: bool, seg: &Segment) -> Poly {
    fit_function_truncated(direct, log, seg, TRUNCATION)
}

/// [`fit_function`] with the bound `truncation` on the dropped tail (0 keeps every coefficient).
pub(super) fn fit_function_truncated(direct: &dyn Fn(f64) -> f64, log: bool, seg: &Segment, truncation: f64) -> Poly {
    const N: usize = COEFFICIENTS;
    let half = 0.5 * (seg.hi - seg.lo);
    let value = |t: f64| -> f64 {
        let v = direct(t);
        if log {
            if v > 0.0 { v.ln() } else { f64::NAN }
        } else {
            v
        }
    };
    let failed = Poly { c: [0.0; N], degree: 0, ok: false };
    // Chebyshev coefficients from values at the nodes x_k = cos(π (k + ½)/N)
    let table = chebyshev_table();
    let mut f = [0.0; N];
    for (k, fk) in f.iter_mut().enumerate() {
        *fk = value(seg.mid + half * table.nodes[k]);
        if !fk.is_finite() {
            return failed;
        }
    }
    let mut a = [0.0; N];
    for (j, aj) in a.iter_mut().enumerate() {
        let mut s = 0.0;
        for (k, fk) in f.iter().enumerate() {
            s += fk * table.cosines[j][k];
        }
        *aj = 2.0 / N as f64 * s;
    }
    a[0] *= 0.5;
    // drop the highest terms whose coefficients sum below TRUNCATION of the property's smallest magnitude on the
    // segment (|T_j| ≤ 1: the dropped part is at most that sum)
    let scale = if log { 1.0 } else { f.iter().fold(f64::INFINITY, |m, v| m.min(v.abs())) };
    let mut degree = N - 1;
    let mut dropped = 0.0;
    while degree > 1 {
        dropped += a[degree].abs();
        if !(dropped <= truncation * scale) {
            break;
        }
        a[degree] = 0.0;
        degree -= 1;
    }
    // monomial coefficients: Σ a_j T_j(u), T_{j+1} = 2u T_j − T_{j−1}
    let mut c_out = [0.0; N];
    let mut t_prev = [0.0; N];
    let mut t_cur = [0.0; N];
    t_prev[0] = 1.0; // T_0
    t_cur[1] = 1.0; // T_1
    c_out[0] += a[0];
    for (m, cm) in c_out.iter_mut().enumerate() {
        *cm += a[1] * t_cur[m];
    }
    for aj in a.iter().take(degree + 1).skip(2) {
        let mut t_next = [0.0; N];
        for m in 0..N {
            t_next[m] = if m > 0 { 2.0 * t_cur[m - 1] } else { 0.0 } - t_prev[m];
        }
        for m in 0..N {
            c_out[m] += aj * t_next[m];
        }
        t_prev = t_cur;
        t_cur = t_next;
    }
    let poly = Poly { c: c_out, degree, ok: true };
    // check at the N + 1 Chebyshev extrema (ends included), where the interpolation error peaks
    for &u in &table.extrema {
        let t = (seg.mid + half * u).clamp(seg.lo, seg.hi);
        let direct = direct(t);
        let v = horner(&poly, (t - seg.mid) * seg.inv_half);
        let v = if log { v.exp() } else { v };
        if !(direct.is_finite() && direct != 0.0 && (v / direct - 1.0).abs() <= ACCEPTED_DEVIATION) {
            return failed;
        }
    }
    poly
}
