//! Liquid-mixture properties for any composition and temperature; the mixing rules are named per function
//! (docs/property-methods.md). Functions take component slices and fractions and never allocate.

use std::sync::Arc;

use crate::data::Component;
use crate::numerics::root::{brent, Tolerance};

use super::activity::Activity;

use super::PropertyError;

/// Mass fractions → mole fractions.
pub fn mass_to_mole(components: &[Arc<Component>], mass_fractions: &[f64]) -> Vec<f64> {
    let mut x = vec![0.0; components.len()];
    mass_to_mole_into(components, mass_fractions, &mut x);
    x
}

/// Mass fractions → mole fractions, written into `out`.
#[inline]
pub fn mass_to_mole_into(components: &[Arc<Component>], mass_fractions: &[f64], out: &mut [f64]) {
    let mut s = 0.0;
    for ((c, w), o) in components.iter().zip(mass_fractions).zip(out.iter_mut()) {
        *o = w / c.molar_mass();
        s += *o;
    }
    if s > 0.0 {
        for o in out.iter_mut() {
            *o /= s;
        }
    }
}

/// Mole fractions → mass fractions.
pub fn mole_to_mass(components: &[Arc<Component>], mole_fractions: &[f64]) -> Vec<f64> {
    let mut w: Vec<f64> = components.iter().zip(mole_fractions).map(|(c, x)| x * c.molar_mass()).collect();
    let s: f64 = w.iter().sum();
    if s > 0.0 {
        w.iter_mut().for_each(|v| *v /= s);
    }
    w
}

/// Mean molar mass from mole fractions \[kg/mol\].
#[inline]
pub fn molar_mass(components: &[Arc<Component>], x: &[f64]) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.molar_mass()).sum()
}

/// Liquid density by ideal mixing of molar volumes (Amagat) \[kg/m³\]; mass fractions `w`.
#[inline]
pub fn density(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    1.0 / components.iter().zip(w).map(|(c, w)| w / c.liquid_density(t)).sum::<f64>()
}

/// Liquid heat capacity, mass-fraction weighted \[J/(kg·K)\].
#[inline]
pub fn heat_capacity(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    components.iter().zip(w).map(|(c, w)| w * c.liquid_heat_capacity(t)).sum()
}

/// Latent heat, mass-fraction weighted \[J/kg\].
#[inline]
pub fn latent_heat(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    components.iter().zip(w).map(|(c, w)| w * c.latent_heat(t)).sum()
}

/// Dynamic viscosity by Grunberg–Nissan with zero interaction (ln μ = Σ x ln μ_i) \[Pa·s\]; mole fractions `x`.
#[inline]
pub fn viscosity(components: &[Arc<Component>], x: &[f64], t: f64) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.liquid_viscosity(t).ln()).sum::<f64>().exp()
}

/// Refutas viscosity-blending number of a kinematic viscosity given in mm²/s (Maples 2000).
#[inline]
pub fn refutas_blending_number(nu_mm2_s: f64) -> f64 {
    14.534 * (nu_mm2_s + 0.8).ln().ln() + 10.975
}

/// Kinematic viscosity \[mm²/s\] from a Refutas blending number (inverse of [`refutas_blending_number`]).
#[inline]
pub fn refutas_viscosity(vbn: f64) -> f64 {
    ((vbn - 10.975) / 14.534).exp().exp() - 0.8
}

/// Kinematic viscosity by the Refutas blending-index method on mass fractions (ASTM D7152 practice) \[m²/s\].
pub fn kinematic_viscosity_refutas(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    let vbn: f64 = components
        .iter()
        .zip(w)
        .map(|(c, w)| w * refutas_blending_number(c.liquid_viscosity(t) / c.liquid_density(t) * 1e6))
        .sum();
    refutas_viscosity(vbn) * 1e-6
}

/// Thermal conductivity by the DIPPR 9H (Vredeveld) rule k = (Σ w k_i⁻²)^(-1/2) \[W/(m·K)\].
#[inline]
pub fn conductivity(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    let s: f64 = components.iter().zip(w).map(|(c, w)| w / c.liquid_conductivity(t).powi(2)).sum();
    1.0 / s.sqrt()
}

/// Surface tension, mole-fraction weighted \[N/m\].
#[inline]
pub fn surface_tension(components: &[Arc<Component>], x: &[f64], t: f64) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.surface_tension(t)).sum()
}

/// Bubble pressure by Raoult's law Σ x_i p_sat,i(T) \[Pa\].
#[inline]
pub fn bubble_pressure(components: &[Arc<Component>], x: &[f64], t: f64) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.vapor_pressure(t)).sum()
}

/// Highest temperature at which bubble and dew points are searched \[K\].
fn search_ceiling(components: &[Arc<Component>]) -> f64 {
    components.iter().map(|c| c.critical_temperature()).fold(0.0, f64::max) * 1.5
}

/// Temperature tolerance of the bubble- and dew-point searches (Brent's method on [20 K, 1.5 max T_c]).
const POINT_TOLERANCE: Tolerance = Tolerance::absolute(1e-9);

/// Bubble-point temperature at pressure `p` (Raoult's law) \[K\].
pub fn bubble_point(components: &[Arc<Component>], x: &[f64], p: f64) -> Result<f64, PropertyError> {
    if !(p.is_finite() && p > 0.0) {
        return Err(PropertyError::Invalid { what: "pressure", value: p });
    }
    let hi = search_ceiling(components);
    brent(|t| (bubble_pressure(components, x, t) / p).ln(), 20.0, hi, POINT_TOLERANCE)
        .map(|r| r.x)
        .map_err(|_| PropertyError::NoSolution { what: "bubble point", pressure: p })
}

/// Dew-point temperature at pressure `p` for vapour mole fractions `y` (Raoult's law) \[K\].
pub fn dew_point(components: &[Arc<Component>], y: &[f64], p: f64) -> Result<f64, PropertyError> {
    if !(p.is_finite() && p > 0.0) {
        return Err(PropertyError::Invalid { what: "pressure", value: p });
    }
    let hi = search_ceiling(components);
    // Σ y_i p / p_sat,i(T) = 1, decreasing in T: solve -ln(Σ...) increasing.
    brent(|t| -(components.iter().zip(y).map(|(c, y)| y * p / c.vapor_pressure(t)).sum::<f64>()).ln(), 20.0, hi, POINT_TOLERANCE)
        .map(|r| r.x)
        .map_err(|_| PropertyError::NoSolution { what: "dew point", pressure: p })
}

/// Bubble-point temperature at pressure `p` with activity coefficients: Σ x_i γ_i(x, T) p_sat,i(T) = p \[K\]
/// (the ideal `activity` gives [`bubble_point`]). No allocation.
pub fn bubble_point_with(components: &[Arc<Component>], activity: &mut Activity, x: &[f64], p: f64) -> Result<f64, PropertyError> {
    if activity.is_ideal() {
        return bubble_point(components, x, p);
    }
    if !(p.is_finite() && p > 0.0) {
        return Err(PropertyError::Invalid { what: "pressure", value: p });
    }
    let hi = search_ceiling(components);
    brent(|t| (activity.bubble_pressure(components, x, t) / p).ln(), 20.0, hi, POINT_TOLERANCE)
        .map(|r| r.x)
        .map_err(|_| PropertyError::NoSolution { what: "bubble point", pressure: p })
}

/// Dew-point temperature at pressure `p` for vapour mole fractions `y` with activity coefficients of the
/// equilibrium liquid: Σ y_i p/(γ_i p_sat,i(T)) = 1 \[K\] (the ideal `activity` gives [`dew_point`]).
pub fn dew_point_with(components: &[Arc<Component>], activity: &mut Activity, y: &[f64], p: f64) -> Result<f64, PropertyError> {
    if activity.is_ideal() {
        return dew_point(components, y, p);
    }
    if !(p.is_finite() && p > 0.0) {
        return Err(PropertyError::Invalid { what: "pressure", value: p });
    }
    let hi = search_ceiling(components);
    brent(|t| -activity.dew_sum(components, y, p, t).ln(), 20.0, hi, POINT_TOLERANCE)
        .map(|r| r.x)
        .map_err(|_| PropertyError::NoSolution { what: "dew point", pressure: p })
}

/// Mixture pseudo-critical temperature by Kay's rule Σ x_i T_c,i \[K\].
pub fn pseudo_critical_temperature(components: &[Arc<Component>], x: &[f64]) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.critical_temperature()).sum()
}

/// Mixture pseudo-critical pressure by Kay's rule Σ x_i p_c,i \[Pa\].
pub fn pseudo_critical_pressure(components: &[Arc<Component>], x: &[f64]) -> f64 {
    components.iter().zip(x).map(|(c, x)| x * c.critical_pressure()).sum()
}

/// Bubble point \[K\] only where it lies below the liquid's pseudo-critical temperature (Kay's rule, Σ x_i T_c,i):
/// a Raoult bubble point at or above it is an extrapolation of the vapour-pressure correlations into the critical
/// region (e.g. n-dodecane at 30 bar: 698 K against T_c = 658 K) and is reported as none, with the reason.
pub fn subcritical_bubble_point(components: &[Arc<Component>], x: &[f64], pressure: f64) -> Result<f64, String> {
    subcritical_bubble_point_with(components, &mut Activity::ideal(components.len()), x, pressure)
}

/// [`subcritical_bubble_point`] with a liquid activity model (ideal: Raoult's law) \[K\].
pub fn subcritical_bubble_point_with(components: &[Arc<Component>], activity: &mut Activity, x: &[f64], pressure: f64) -> Result<f64, String> {
    let t_b = bubble_point_with(components, activity, x, pressure).map_err(|e| e.to_string())?;
    let t_pc = pseudo_critical_temperature(components, x);
    if t_b >= t_pc {
        let law = if activity.is_ideal() { "Raoult's law" } else { "the modified Raoult's law (UNIFAC)" };
        return Err(format!(
            "no bubble point at {:.4} MPa: {law} would put it at {t_b:.1} K, at or above the liquid's pseudo-critical temperature {t_pc:.1} K (Kay's rule): the liquid is in its critical region, outside the ideal-solution model",
            pressure / 1e6
        ));
    }
    Ok(t_b)
}

/// A snapshot of the mixture liquid properties at one temperature.
#[derive(Debug, Clone, serde::Serialize)]
#[allow(non_snake_case)]
pub struct LiquidState {
    /// Temperature \[K\].
    pub temperature_K: f64,
    /// Bubble (vapour) pressure \[Pa\].
    pub vapor_pressure_Pa: f64,
    /// Density \[kg/m³\].
    pub density_kg_m3: f64,
    /// Latent heat \[J/kg\].
    pub latent_heat_J_kg: f64,
    /// Heat capacity \[J/(kg·K)\].
    pub cp_J_kgK: f64,
    /// Dynamic viscosity \[Pa·s\].
    pub viscosity_Pa_s: f64,
    /// Kinematic viscosity \[m²/s\].
    pub kinematic_viscosity_m2_s: f64,
    /// Thermal conductivity \[W/(m·K)\].
    pub conductivity_W_mK: f64,
    /// Surface tension \[N/m\].
    pub surface_tension_N_m: f64,
}

/// Density, heat capacity, viscosity and conductivity of a liquid mixture at one temperature.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct TransportMix {
    /// Density \[kg/m³\] ([`density`]).
    pub density: f64,
    /// Heat capacity \[J/(kg·K)\] ([`heat_capacity`]).
    pub heat_capacity: f64,
    /// Dynamic viscosity \[Pa·s\] ([`viscosity`]).
    pub viscosity: f64,
    /// Thermal conductivity \[W/(m·K)\] ([`conductivity`]).
    pub conductivity: f64,
}

/// [`density`], [`heat_capacity`], [`viscosity`] and [`conductivity`] of mass fractions `w` (mole fractions `x`)
/// at `t` in one pass over the components, density and heat capacity from one grouped look-up per component
/// (`Component::density_and_heat_capacity`): the same values, bit for bit (each mixing sum over the components in
/// order).
pub fn transport_mix(components: &[Arc<Component>], w: &[f64], x: &[f64], t: f64) -> TransportMix {
    // (float sums start from −0.0, as `Iterator::sum` does)
    let (mut inv_rho, mut cp, mut ln_mu, mut inv_k2) = (-0.0, -0.0, -0.0, -0.0);
    for ((c, &w), &x) in components.iter().zip(w).zip(x) {
        let (density, heat_capacity) = c.density_and_heat_capacity(t);
        inv_rho += w / density;
        cp += w * heat_capacity;
        ln_mu += x * c.liquid_viscosity(t).ln();
        inv_k2 += w / c.liquid_conductivity(t).powi(2);
    }
    TransportMix { density: 1.0 / inv_rho, heat_capacity: cp, viscosity: ln_mu.exp(), conductivity: 1.0 / inv_k2.sqrt() }
}

/// Evaluate all mixture liquid properties at `t` for mass fractions `w`.
#[allow(non_snake_case)]
pub fn state(components: &[Arc<Component>], w: &[f64], t: f64) -> LiquidState {
    let x = mass_to_mole(components, w);
    let rho = density(components, w, t);
    let mu = viscosity(components, &x, t);
    LiquidState {
        temperature_K: t,
        vapor_pressure_Pa: bubble_pressure(components, &x, t),
        density_kg_m3: rho,
        latent_heat_J_kg: latent_heat(components, w, t),
        cp_J_kgK: heat_capacity(components, w, t),
        viscosity_Pa_s: mu,
        kinematic_viscosity_m2_s: mu / rho,
        conductivity_W_mK: conductivity(components, w, t),
        surface_tension_N_m: surface_tension(components, &x, t),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The one-pass mixture gives the bits of the four single-property mixing rules, with and without kernels.
    #[test]
    fn transport_mix_has_the_bits_of_the_separate_rules() {
        let lib = crate::data::Library::embedded().unwrap();
        let ids = ["n-heptane", "n-dodecane", "toluene", "1-methylnaphthalene", "n-hexadecane"];
        let direct: Vec<Arc<Component>> = ids.iter().map(|id| lib.component(id).unwrap().clone()).collect();
        let kernel: Vec<Arc<Component>> = direct.iter().map(crate::props::kernels::with_kernels).collect();
        let w = [0.3, 0.25, 0.2, 0.15, 0.1];
        for comps in [&direct, &kernel] {
            let x = mass_to_mole(comps, &w);
            for t in [280.0, 333.3, 410.0, 505.5] {
                let m = transport_mix(comps, &w, &x, t);
                assert_eq!(m.density.to_bits(), density(comps, &w, t).to_bits(), "{t}");
                assert_eq!(m.heat_capacity.to_bits(), heat_capacity(comps, &w, t).to_bits(), "{t}");
                assert_eq!(m.viscosity.to_bits(), viscosity(comps, &x, t).to_bits(), "{t}");
                assert_eq!(m.conductivity.to_bits(), conductivity(comps, &w, t).to_bits(), "{t}");
            }
        }
    }

    /// Refutas round trip and the ASTM D7152-style hand calculation: equal masses of 2 and 10 mm²/s.
    #[test]
    fn refutas_round_trip_and_blend() {
        for nu in [0.5, 1.0, 2.0, 8.0, 100.0] {
            assert!((refutas_viscosity(refutas_blending_number(nu)) - nu).abs() < 1e-9 * nu.max(1.0));
        }
        let vbn = 0.5 * refutas_blending_number(2.0) + 0.5 * refutas_blending_number(10.0);
        // hand calculation with the Refutas equations (Maples 2000): VBN(2) = 10.975 + 14.534·ln(ln 2.8)
        // = 11.39924; VBN(10) = 10.975 + 14.534·ln(ln 10.8) = 23.57467; mean 17.48695 → ν = 3.98390 mm²/s
        assert!((vbn - 17.48695).abs() < 1e-4, "{vbn}");
        let nu = refutas_viscosity(vbn);
        assert!((nu - 3.98390).abs() < 1e-4, "{nu}");
    }
}
