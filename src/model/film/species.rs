//! Per-component vapour diffusivities in the film (`--vapour-diffusion species`). Each fuel vapour i crosses
//! the quasi-steady film with its own binary diffusivity D_i in the ambient gas (Fuller, Schettler & Giddings
//! 1966, Blanc's law over the ambient species) and the common Stefan flow ṁ. Species conservation,
//! ṁ_i = ṁ Y_i − 4π r² ρ_g D_i dY_i/dr = ε_i ṁ, integrated from the surface to the far field gives for every i
//!
//!   ṁ = G_i ln(1 + B_M,i),  B_M,i = (Y_s,i − Y_∞,i)/(ε_i − Y_s,i),  G_i = 2π ρ_g D_i r_s Sh*_i,
//!
//! (4π ρ_g D_i r_s for the stagnant film, Sh*_i/2 for convection as in Abramzon & Sirignano 1989), i.e.
//! ε_i = Y_s,i + (Y_s,i − Y_∞,i)/(exp(ṁ/G_i) − 1), and the ambient gas carries no net flux: Σ ε_i = 1 fixes ṁ.
//! With equal D_i this is the single-diffusivity result ε_i = [(1 + B_M) Y_s,i − Y_∞,i]/B_M exactly.

use super::{film_correction, TransferCorrelation};
use crate::numerics::root::{brent_from, Tolerance};

/// The film's state needed by [`species_rates`]: per-component Fuller coefficients (D_i = coefficient ·
/// T_ref^1.75/p), surface and far-field vapour mass fractions.
pub(super) struct SpeciesFilm<'a> {
    /// Fuller coefficients per component.
    pub fuller: &'a [f64],
    /// Surface vapour mass fractions Y_s,i.
    pub surface: &'a [f64],
    /// Far-field vapour mass fractions Y_∞,i.
    pub ambient: &'a [f64],
    /// Nu0/Sh0 correlation.
    pub correlation: TransferCorrelation,
}

/// Species rates with per-component diffusivities into `rates` (they sum to the total rate), the conductances
/// G_i into `conductance`. `re`: the film Reynolds number, `mu_g`, `rho_g`: film viscosity and density, `r`:
/// droplet radius, `diffusivity_scale`: T_ref^1.75/p, `b_m`: the mixture Spalding number (its film correction
/// F(B_M) is used for every Sh*_i), `one_minus_surface_fuel`: 1 − Y_F,s. False (rates untouched) when the
/// Stefan-flow solution has no bracketed root: no net evaporation (B_M ≤ 0) or a component condensing from the
/// ambient; the caller then uses the mixture-averaged diffusivity.
#[allow(clippy::too_many_arguments)]
pub(super) fn species_rates(film: &SpeciesFilm, conductance: &mut [f64], rates: &mut [f64], re: f64, mu_g: f64, rho_g: f64, r: f64, diffusivity_scale: f64, b_m: f64, one_minus_surface_fuel: f64) -> bool {
    let n = rates.len();
    let (surface, ambient) = (film.surface, film.ambient);
    if !(b_m > 1e-12 && b_m.is_finite()) {
        return false;
    }
    let correction = film_correction(b_m);
    let (mut g_min, mut g_max) = (f64::INFINITY, 0.0f64);
    for i in 0..n {
        if surface[i] < ambient[i] {
            return false;
        }
        let d_i = film.fuller[i] * diffusivity_scale;
        let sh0 = film.correlation.nusselt0(re, mu_g / (rho_g * d_i));
        let g = 2.0 * std::f64::consts::PI * rho_g * d_i * r * (2.0 + (sh0 - 2.0) / correction);
        conductance[i] = g;
        if surface[i] > ambient[i] {
            g_min = g_min.min(g);
            g_max = g_max.max(g);
        }
    }
    if !(g_max > 0.0 && g_min.is_finite()) {
        return false;
    }
    let lambda = b_m.ln_1p();
    let conductance: &[f64] = conductance;
    // Σ ε_i − 1 = Σ c_i/(exp(ṁ/G_i) − 1) − (1 − Y_F,s), c_i = Y_s,i − Y_∞,i ≥ 0: it falls with ṁ, and
    // ṁ = G_min ln(1 + B_M) and G_max ln(1 + B_M) bracket its root (equal G_i give ln(1 + B_M) exactly).
    let residual = |m: f64| -> f64 { (0..n).map(|i| (surface[i] - ambient[i]) / (m / conductance[i]).exp_m1()).sum::<f64>() - one_minus_surface_fuel };
    let mdot = if g_max - g_min <= 1e-14 * g_max {
        g_max * lambda
    } else {
        let lo = (g_min * lambda, residual(g_min * lambda));
        let hi = (g_max * lambda, residual(g_max * lambda));
        if lo.1 <= 0.0 {
            lo.0
        } else if hi.1 >= 0.0 {
            hi.0
        } else {
            brent_from(residual, lo, hi, Tolerance::relative(1e-14)).map(|root| root.x).unwrap_or_else(|e| e.best().unwrap_or(hi.0))
        }
    };
    for i in 0..n {
        let c = surface[i] - ambient[i];
        let eps = if c > 0.0 { surface[i] + c / (mdot / conductance[i]).exp_m1() } else { surface[i] };
        rates[i] = eps * mdot;
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Three vapours of different diffusivities from a surface into air holding some of one of them: the rates
    /// satisfy ṁ = G_i ln(1 + B_M,i), B_M,i = (Y_s,i − Y_∞,i)/(ε_i − Y_s,i), for every component, the ε_i sum
    /// to 1, and equal diffusivities give the single-diffusivity fractions [(1 + B_M) Y_s,i − Y_∞,i]/B_M.
    #[test]
    fn stefan_flow_solution_with_individual_diffusivities() {
        let surface = [0.20, 0.15, 0.05];
        let ambient = [0.01, 0.0, 0.0];
        let y_fs: f64 = surface.iter().sum();
        let b_m = (y_fs - 0.01) / (1.0 - y_fs);
        let (re, mu, rho, r, scale) = (20.0, 2.5e-5, 0.6, 25e-6, 1.0);
        for fuller in [[8e-6, 6e-6, 4e-6], [6e-6, 6e-6, 6e-6]] {
            let film = SpeciesFilm { fuller: &fuller, surface: &surface, ambient: &ambient, correlation: TransferCorrelation::Clift };
            let (mut g, mut rates) = ([0.0; 3], [0.0; 3]);
            assert!(species_rates(&film, &mut g, &mut rates, re, mu, rho, r, scale, b_m, 1.0 - y_fs));
            let mdot: f64 = rates.iter().sum();
            for i in 0..3 {
                let eps = rates[i] / mdot;
                let b_i = (surface[i] - ambient[i]) / (eps - surface[i]);
                assert!((g[i] * b_i.ln_1p() / mdot - 1.0).abs() < 1e-10, "component {i}: {} vs {mdot}", g[i] * b_i.ln_1p());
                if fuller[0] == fuller[2] {
                    assert!((eps - ((1.0 + b_m) * surface[i] - ambient[i]) / b_m).abs() < 1e-14);
                }
            }
        }
        // condensing component: no bracketed solution, the caller falls back to the mixture average
        let film = SpeciesFilm { fuller: &[8e-6, 6e-6, 4e-6], surface: &surface, ambient: &[0.3, 0.0, 0.0], correlation: TransferCorrelation::Clift };
        assert!(!species_rates(&film, &mut [0.0; 3], &mut [0.0; 3], re, mu, rho, r, scale, b_m, 1.0 - y_fs));
    }
}
