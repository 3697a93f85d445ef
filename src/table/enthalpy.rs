//! Specific enthalpies of the liquid and of its vapour with one reference state, consistent with the latent-heat
//! column (docs/tables.md, "Enthalpies").
//!
//! Reference state: the liquid at [`REFERENCE_TEMPERATURE`] (298.15 K) has zero enthalpy, every component alike
//! (ideal solution: no heat of mixing). The liquid enthalpy is the integral of the tabulated liquid heat
//! capacity, h_l(T) = ∫ cp_l dT from 298.15 K, so it follows the same cp the droplet model heats the liquid
//! with; the vapour enthalpy is h_v(T) = h_l(T) + L(T), the energy the droplet model takes from the liquid per
//! kilogram evaporated at T. Hence h_v − h_l equals the latent-heat column on every row by construction. The
//! slope of h_v is cp_l + dL/dT, which differs from the ideal-gas cp of the vapour columns where the published
//! latent-heat and heat-capacity correlations are not mutually consistent (Kirchhoff's relation); the tables
//! report that difference ([`ideal_gas_gap`]).

use crate::numerics::quadrature::{gauss_legendre, GAUSS5};

pub use crate::props::enthalpy::REFERENCE_TEMPERATURE;

/// Widest panel of the Gauss–Legendre quadrature \[K\].
const PANEL: f64 = 5.0;

/// ∫ f dT from `a` to `b` (either order) by five-point Gauss–Legendre on equal panels of at most 5 K.
pub fn integrate(f: &dyn Fn(f64) -> f64, a: f64, b: f64) -> f64 {
    gauss_legendre(f, a, b, PANEL, &GAUSS5)
}

/// h(T_k) = ∫ cp dT from [`REFERENCE_TEMPERATURE`] to each of the ascending temperatures `ts`, accumulated row to
/// row (deterministic: the same rows give the same sums) \[J/kg\].
pub fn cumulative_enthalpy(cp: &dyn Fn(f64) -> f64, ts: &[f64]) -> Vec<f64> {
    let mut out = Vec::with_capacity(ts.len());
    let mut h = 0.0;
    let mut prev = REFERENCE_TEMPERATURE;
    for &t in ts {
        h += integrate(cp, prev, t);
        prev = t;
        out.push(h);
    }
    out
}

/// Largest |(h_v(T) − h_v(T_0)) − ∫ cp_ig dT from T_0 to T| / L(T) over the rows: how far the vapour enthalpy
/// of the tables (liquid enthalpy plus latent heat) departs from the ideal-gas enthalpy path of the vapour cp,
/// relative to the latent heat. `ts` ascending, `h_vapor` and `latent_heat` on the same rows.
pub fn ideal_gas_gap(cp_ideal_gas: &dyn Fn(f64) -> f64, ts: &[f64], h_vapor: &[f64], latent_heat: &[f64]) -> f64 {
    let (Some(&t0), Some(&h0)) = (ts.first(), h_vapor.first()) else { return 0.0 };
    let mut ideal = 0.0;
    let mut prev = t0;
    let mut worst: f64 = 0.0;
    for ((&t, hv), l) in ts.iter().zip(h_vapor).zip(latent_heat) {
        ideal += integrate(cp_ideal_gas, prev, t);
        prev = t;
        if *l > 0.0 {
            worst = worst.max(((hv - h0) - ideal).abs() / l);
        }
    }
    worst
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Gauss–Legendre with five points integrates polynomials up to degree 9 exactly.
    #[test]
    fn quadrature_is_exact_for_polynomials() {
        let f = |t: f64| 1500.0 + 2.0 * t - 3e-3 * t * t + 1e-6 * t * t * t;
        let big_f = |t: f64| 1500.0 * t + t * t - 1e-3 * t.powi(3) + 0.25e-6 * t.powi(4);
        let exact = big_f(612.3) - big_f(231.7);
        assert!((integrate(&f, 231.7, 612.3) - exact).abs() < 1e-9 * exact.abs());
        assert!((integrate(&f, 612.3, 231.7) + exact).abs() < 1e-9 * exact.abs());
        let ts = [250.0, 298.15, 300.0, 450.0];
        let h = cumulative_enthalpy(&f, &ts);
        for (t, hk) in ts.iter().zip(&h) {
            let e = big_f(*t) - big_f(REFERENCE_TEMPERATURE);
            assert!((hk - e).abs() < 1e-9 * e.abs().max(1.0), "{t} {hk} {e}");
        }
        assert_eq!(h[1], 0.0);
    }

    /// Kirchhoff-consistent data (dL/dT = cp_ig − cp_l) give no gap; an inconsistent latent heat gives its error.
    #[test]
    fn ideal_gas_gap_measures_kirchhoff_consistency() {
        let cp_l = |t: f64| 2000.0 + t;
        let cp_g = |t: f64| 1500.0 + 2.0 * t;
        let ts: Vec<f64> = (0..20).map(|k| 300.0 + 10.0 * f64::from(k)).collect();
        let hl = cumulative_enthalpy(&cp_l, &ts);
        // L(T) = L0 + ∫(cp_g − cp_l) = L0 − 500 (T − 300) + (T² − 300²)/2
        let l: Vec<f64> = ts.iter().map(|t| 4e5 - 500.0 * (t - 300.0) + 0.5 * (t * t - 9e4)).collect();
        let hv: Vec<f64> = hl.iter().zip(&l).map(|(a, b)| a + b).collect();
        assert!(ideal_gas_gap(&cp_g, &ts, &hv, &l) < 1e-12);
        // 1 % too large a latent heat: the gap is 0.01 |L(T) − L(T_0)| / (1.01 L(T)), about 5e-4 at 490 K
        let l2: Vec<f64> = l.iter().map(|v| v * 1.01).collect();
        let hv2: Vec<f64> = hl.iter().zip(&l2).map(|(a, b)| a + b).collect();
        assert!(ideal_gas_gap(&cp_g, &ts, &hv2, &l2) > 4e-4);
    }
}
