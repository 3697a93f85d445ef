//! Liquid sensible enthalpy with one stated reference state: each pure liquid has zero enthalpy at
//! [`REFERENCE_TEMPERATURE`] (298.15 K), h_L,i(T) = ∫ c_pL,i dT from there. The vapour leaving a droplet carries
//! h_V,i(T_s) = h_L,i(T_s) + L_i(T_s) in this reference.

use crate::data::Component;
use crate::numerics::quadrature::{gauss_legendre, GAUSS2};

/// Reference temperature of the liquid enthalpies \[K\] (pure liquid at 298.15 K has h = 0).
pub const REFERENCE_TEMPERATURE: f64 = 298.15;

/// Largest temperature panel of the quadrature \[K\].
const PANEL: f64 = 10.0;

/// Change of the liquid's specific enthalpy from `t_a` to `t_b` \[J/kg\]: ∫ c_pL dT by two-point Gauss–Legendre
/// on panels of at most 10 K (exact for a cubic c_p; far below 1e-9 relative for the library's correlations).
pub fn liquid_enthalpy_change(c: &Component, t_a: f64, t_b: f64) -> f64 {
    gauss_legendre(|t| c.liquid_heat_capacity(t), t_a, t_b, PANEL, &GAUSS2)
}

/// Liquid specific enthalpy at `t` relative to the liquid at [`REFERENCE_TEMPERATURE`] \[J/kg\].
pub fn liquid_enthalpy(c: &Component, t: f64) -> f64 {
    liquid_enthalpy_change(c, REFERENCE_TEMPERATURE, t)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The quadrature against a fine trapezoid sum, and additivity over split intervals.
    #[test]
    fn enthalpy_matches_fine_quadrature_and_adds_up() {
        let lib = crate::data::Library::embedded().unwrap();
        let c = lib.component("n-decane").unwrap();
        let (a, b) = (298.15, 420.0);
        let steps = 200_000;
        let h = (b - a) / steps as f64;
        let trapezoid: f64 = (0..steps).map(|k| 0.5 * h * (c.liquid_heat_capacity(a + k as f64 * h) + c.liquid_heat_capacity(a + (k + 1) as f64 * h))).sum();
        let gauss = liquid_enthalpy(c, b);
        assert!((gauss / trapezoid - 1.0).abs() < 1e-8, "{gauss} vs {trapezoid}");
        let split = liquid_enthalpy(c, 350.0) + liquid_enthalpy_change(c, 350.0, b);
        assert!((split / gauss - 1.0).abs() < 1e-10);
        assert_eq!(liquid_enthalpy(c, REFERENCE_TEMPERATURE), 0.0);
    }
}
