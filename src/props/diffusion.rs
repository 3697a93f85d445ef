//! Diffusion in the liquid: the Wilke–Chang correlation (used by the radially resolved droplet and the
//! property tables).

/// Wilke–Chang liquid diffusion coefficient \[m²/s\] of a solute of molar volume `v_a` (at its normal boiling
/// point, m³/mol) in a solvent of molar mass `w_b` \[kg/mol\] and viscosity `mu_b` \[Pa·s\], association factor 1
/// (Wilke & Chang 1955; Poling et al. 2001 eq. 11-9.1).
pub fn wilke_chang(t: f64, w_b: f64, mu_b: f64, v_a: f64) -> f64 {
    7.4e-8 * (w_b * 1e3).sqrt() * t / (mu_b * 1e3 * (v_a * 1e6).powf(0.6)) * 1e-4
}
