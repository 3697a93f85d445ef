//! Corresponding-states and group-contribution estimation methods (docs/property-methods.md): the formulas
//! the pure-component properties fall back on, and the transport relations they share with the kernels.

use crate::data::{Component, GAS_CONSTANT};

/// Highest reduced temperature at which corresponding-states liquid forms are evaluated.
pub const MAX_REDUCED_TEMPERATURE: f64 = 0.99;

/// Neufeld et al. (1972) collision integral for viscosity, Ω_v(T*).
#[inline]
pub fn neufeld_omega_viscosity(t_star: f64) -> f64 {
    1.16145 * t_star.powf(-0.14874) + 0.52487 * (-0.77320 * t_star).exp() + 2.16178 * (-2.43787 * t_star).exp()
}

/// Neufeld et al. (1972) collision integral for diffusion, Ω_D(T*).
#[inline]
pub fn neufeld_omega_diffusion(t_star: f64) -> f64 {
    1.06036 / t_star.powf(0.15610) + 0.19300 / (0.47635 * t_star).exp() + 1.03587 / (1.52996 * t_star).exp() + 1.76474 / (3.89411 * t_star).exp()
}

/// Ambrose–Walton corresponding-states vapour pressure \[Pa\] (Ambrose & Walton 1989; Poling et al. 2001 eq. 7-4.1).
pub fn ambrose_walton_vapor_pressure(t: f64, tc: f64, pc: f64, omega: f64) -> f64 {
    let tr = (t / tc).min(1.0);
    let tau = 1.0 - tr;
    let tau15 = tau * tau.sqrt(); // τ^1.5 and τ^2.5 from one square root
    let tau5 = tau.powi(5);
    let f = |a: [f64; 4]| (a[0] * tau + a[1] * tau15 + a[2] * tau15 * tau + a[3] * tau5) / tr;
    let f0 = f([-5.97616, 1.29874, -0.60394, -1.06841]);
    let f1 = f([-5.03365, 1.11505, -5.41217, -7.46628]);
    let f2 = f([-0.64771, 2.41539, -4.26979, 3.25259]);
    pc * (f0 + omega * f1 + omega * omega * f2).exp()
}

/// Lee–Kesler vapour pressure \[Pa\] (Lee & Kesler 1975).
pub fn lee_kesler_vapor_pressure(t: f64, tc: f64, pc: f64, omega: f64) -> f64 {
    let tr = (t / tc).min(1.0);
    let f0 = 5.92714 - 6.09648 / tr - 1.28862 * tr.ln() + 0.169347 * tr.powi(6);
    let f1 = 15.2518 - 15.6875 / tr - 13.4721 * tr.ln() + 0.43577 * tr.powi(6);
    pc * (f0 + omega * f1).exp()
}

/// Acentric factor that makes the Lee–Kesler vapour pressure pass through (tb, 1 atm) (Lee & Kesler 1975).
pub fn lee_kesler_acentric_factor(tb: f64, tc: f64, pc: f64) -> f64 {
    let tr = tb / tc;
    let f0 = 5.92714 - 6.09648 / tr - 1.28862 * tr.ln() + 0.169347 * tr.powi(6);
    let f1 = 15.2518 - 15.6875 / tr - 13.4721 * tr.ln() + 0.43577 * tr.powi(6);
    ((101_325.0 / pc).ln() - f0) / f1
}

/// Spencer–Danner modified Rackett saturated-liquid density \[kg/m³\]; `z_ra` defaults to Yamada–Gunn.
pub fn rackett_density(t: f64, tc: f64, pc: f64, omega: f64, molar_mass: f64, z_ra: Option<f64>) -> f64 {
    let z = z_ra.unwrap_or(0.29056 - 0.08775 * omega);
    let tr = (t / tc).min(MAX_REDUCED_TEMPERATURE);
    let v = GAS_CONSTANT * tc / pc * z.powf(1.0 + (1.0 - tr).powf(2.0 / 7.0));
    molar_mass / v
}

/// Riedel latent heat at the normal boiling point \[J/mol\] (Riedel 1954; Poling et al. 2001 eq. 7-10.2).
pub fn riedel_latent_heat_at_boiling(tb: f64, tc: f64, pc: f64) -> f64 {
    let tbr = tb / tc;
    1.093 * GAS_CONSTANT * tb * ((pc / 1e5).ln() - 1.013) / (0.930 - tbr)
}

/// Watson scaling of a latent heat from (t1, l1) to t (Watson 1943), exponent 0.38.
pub fn watson_latent_heat(t: f64, t1: f64, l1: f64, tc: f64) -> f64 {
    let tr = (t / tc).min(1.0);
    let tr1 = t1 / tc;
    l1 * ((1.0 - tr) / (1.0 - tr1)).max(0.0).powf(0.38)
}

/// Rowlinson–Bondi liquid heat capacity \[J/(mol·K)\] from the ideal-gas value (Poling et al. 2001 eq. 6-6.4).
pub fn rowlinson_bondi_cp(cp_ideal_molar: f64, t: f64, tc: f64, omega: f64) -> f64 {
    let tr = (t / tc).min(0.98);
    let x = 1.0 - tr;
    cp_ideal_molar + GAS_CONSTANT * (1.586 + 0.49 / x + omega * (4.2775 + 6.3 * x.powf(1.0 / 3.0) / tr + 0.4355 / x))
}

/// Letsou–Stiel liquid viscosity \[Pa·s\], valid about 0.76 < Tr < 0.98 (Letsou & Stiel 1973, SI form).
pub fn letsou_stiel_viscosity(t: f64, tc: f64, pc: f64, omega: f64, molar_mass: f64) -> f64 {
    let tr = (t / tc).min(0.98);
    let xi = 2173.424 * tc.powf(1.0 / 6.0) / (molar_mass * 1e3).sqrt() / pc.powf(2.0 / 3.0);
    let xi0 = (1.5174 - 2.135 * tr + 0.75 * tr * tr) * 1e-5;
    let xi1 = (4.2552 - 7.674 * tr + 3.4 * tr * tr) * 1e-5;
    (xi0 + omega * xi1) / xi
}

/// Liquid viscosity \[Pa·s\]: Letsou–Stiel above Tr = 0.76, Lewis–Squires extrapolation from that anchor below.
pub fn estimated_liquid_viscosity(t: f64, tc: f64, pc: f64, omega: f64, molar_mass: f64) -> f64 {
    let t_anchor = 0.76 * tc;
    if t >= t_anchor {
        return letsou_stiel_viscosity(t, tc, pc, omega, molar_mass);
    }
    // Lewis & Squires (1934): mu^-0.2661 = mu_ref^-0.2661 + (T - T_ref)/233, mu in cP (Poling et al. 2001 eq. 9-10.4).
    let mu_ref_cp = letsou_stiel_viscosity(t_anchor, tc, pc, omega, molar_mass) * 1e3;
    let x = mu_ref_cp.powf(-0.2661) + (t - t_anchor) / 233.0;
    let x = x.max(0.05);
    x.powf(-1.0 / 0.2661) * 1e-3
}

/// Sato–Riedel liquid thermal conductivity \[W/(m·K)\] (Reid, Prausnitz & Poling 1987 eq. 10-9.5).
pub fn sato_riedel_conductivity(t: f64, tb: f64, tc: f64, molar_mass: f64) -> f64 {
    let tr = (t / tc).min(MAX_REDUCED_TEMPERATURE);
    let tbr = tb / tc;
    1.1053 / (molar_mass * 1e3).sqrt() * (3.0 + 20.0 * (1.0 - tr).powf(2.0 / 3.0)) / (3.0 + 20.0 * (1.0 - tbr).powf(2.0 / 3.0))
}

/// Brock–Bird surface tension \[N/m\] (Brock & Bird 1955; Poling et al. 2001 eq. 12-3.5).
pub fn brock_bird_surface_tension(t: f64, tb: f64, tc: f64, pc: f64) -> f64 {
    let tr = t / tc;
    if tr >= 1.0 {
        return 0.0;
    }
    let tbr = tb / tc;
    let pc_bar = pc / 1e5;
    let q = 0.1196 * (1.0 + tbr * (pc_bar / 1.01325).ln() / (1.0 - tbr)) - 0.279;
    (pc_bar.powf(2.0 / 3.0) * tc.powf(1.0 / 3.0) * q * (1.0 - tr).powf(11.0 / 9.0) * 1e-3).max(0.0)
}

/// Chung et al. (1988) low-pressure gas viscosity \[Pa·s\] for a non-polar molecule.
pub fn chung_gas_viscosity(t: f64, tc: f64, vc: f64, omega: f64, molar_mass: f64) -> f64 {
    let t_star = 1.2593 * t / tc;
    let fc = 1.0 - 0.2756 * omega;
    // 40.785 Fc sqrt(M T) / (Vc^(2/3) Ω) in µP with M in g/mol and Vc in cm³/mol
    let mu_micropoise = 40.785 * fc * (molar_mass * 1e3 * t).sqrt() / (vc * 1e6).powf(2.0 / 3.0) / neufeld_omega_viscosity(t_star);
    mu_micropoise * 1e-7
}

/// Chung et al. (1984) low-pressure gas conductivity \[W/(m·K)\] from viscosity and cv.
#[allow(clippy::approx_constant)] // 0.6366 is the published Chung et al. coefficient, not 2/π
pub fn chung_gas_conductivity(t: f64, tc: f64, omega: f64, molar_mass: f64, viscosity: f64, cp_ideal_molar: f64) -> f64 {
    let cv_r = cp_ideal_molar / GAS_CONSTANT - 1.0;
    let alpha = cv_r - 1.5;
    let beta = 0.7862 - 0.7109 * omega + 1.3168 * omega * omega;
    let tr = t / tc;
    let z = 2.0 + 10.5 * tr * tr;
    let psi = 1.0 + alpha * ((0.215 + 0.28288 * alpha - 1.061 * beta + 0.26665 * z) / (0.6366 + beta * z + 1.061 * alpha * beta));
    3.75 * psi * viscosity * GAS_CONSTANT / molar_mass
}

/// Liquid viscosity from Joback groups below Tr = 0.70, Letsou–Stiel above Tr = 0.76, log-linear blend between;
/// without usable groups, Letsou–Stiel with the Lewis–Squires extrapolation below Tr = 0.76.
pub fn estimated_viscosity_with_groups(t: f64, c: &Component) -> f64 {
    let (tc, pc, omega, w) = (c.critical_temperature(), c.critical_pressure(), c.acentric_factor(), c.molar_mass());
    let groups = &c.joback_groups;
    let joback = |t: f64| crate::props::joback::liquid_viscosity(groups, w, t);
    let (t_lo, t_hi) = (0.70 * tc, 0.76 * tc);
    match joback(t.min(t_lo)) {
        None => estimated_liquid_viscosity(t, tc, pc, omega, w),
        Some(_) if t >= t_hi => letsou_stiel_viscosity(t, tc, pc, omega, w),
        Some(j) if t <= t_lo => j,
        Some(_) => {
            let a = joback(t_lo).unwrap_or(1e-3).ln();
            let b = letsou_stiel_viscosity(t_hi, tc, pc, omega, w).ln();
            let s = (t - t_lo) / (t_hi - t_lo);
            (a + s * (b - a)).exp()
        }
    }
}
