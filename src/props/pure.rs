//! Pure-component properties in SI mass basis, from published correlations or, where a component file
//! says `corresponding-states`, from the constants by the methods named in docs/property-methods.md.

use crate::data::{Component, Correlation, Form, GAS_CONSTANT};

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

/// Ambrose–Walton corresponding-states vapour pressure [Pa] (Ambrose & Walton 1989; Poling et al. 2001 eq. 7-4.1).
pub fn ambrose_walton_vapor_pressure(t: f64, tc: f64, pc: f64, omega: f64) -> f64 {
    let tr = (t / tc).min(1.0);
    let tau = 1.0 - tr;
    let f = |a: [f64; 4]| (a[0] * tau + a[1] * tau.powf(1.5) + a[2] * tau.powf(2.5) + a[3] * tau.powi(5)) / tr;
    let f0 = f([-5.97616, 1.29874, -0.60394, -1.06841]);
    let f1 = f([-5.03365, 1.11505, -5.41217, -7.46628]);
    let f2 = f([-0.64771, 2.41539, -4.26979, 3.25259]);
    pc * (f0 + omega * f1 + omega * omega * f2).exp()
}

/// Lee–Kesler vapour pressure [Pa] (Lee & Kesler 1975).
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

/// Spencer–Danner modified Rackett saturated-liquid density [kg/m³]; `z_ra` defaults to Yamada–Gunn.
pub fn rackett_density(t: f64, tc: f64, pc: f64, omega: f64, molar_mass: f64, z_ra: Option<f64>) -> f64 {
    let z = z_ra.unwrap_or(0.29056 - 0.08775 * omega);
    let tr = (t / tc).min(MAX_REDUCED_TEMPERATURE);
    let v = GAS_CONSTANT * tc / pc * z.powf(1.0 + (1.0 - tr).powf(2.0 / 7.0));
    molar_mass / v
}

/// Riedel latent heat at the normal boiling point [J/mol] (Riedel 1954; Poling et al. 2001 eq. 7-10.2).
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

/// Rowlinson–Bondi liquid heat capacity [J/(mol·K)] from the ideal-gas value (Poling et al. 2001 eq. 6-6.4).
pub fn rowlinson_bondi_cp(cp_ideal_molar: f64, t: f64, tc: f64, omega: f64) -> f64 {
    let tr = (t / tc).min(0.98);
    let x = 1.0 - tr;
    cp_ideal_molar + GAS_CONSTANT * (1.586 + 0.49 / x + omega * (4.2775 + 6.3 * x.powf(1.0 / 3.0) / tr + 0.4355 / x))
}

/// Letsou–Stiel liquid viscosity [Pa·s], valid about 0.76 < Tr < 0.98 (Letsou & Stiel 1973, SI form).
pub fn letsou_stiel_viscosity(t: f64, tc: f64, pc: f64, omega: f64, molar_mass: f64) -> f64 {
    let tr = (t / tc).min(0.98);
    let xi = 2173.424 * tc.powf(1.0 / 6.0) / (molar_mass * 1e3).sqrt() / pc.powf(2.0 / 3.0);
    let xi0 = (1.5174 - 2.135 * tr + 0.75 * tr * tr) * 1e-5;
    let xi1 = (4.2552 - 7.674 * tr + 3.4 * tr * tr) * 1e-5;
    (xi0 + omega * xi1) / xi
}

/// Liquid viscosity [Pa·s]: Letsou–Stiel above Tr = 0.76, Lewis–Squires extrapolation from that anchor below.
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

/// Sato–Riedel liquid thermal conductivity [W/(m·K)] (Reid, Prausnitz & Poling 1987 eq. 10-9.5).
pub fn sato_riedel_conductivity(t: f64, tb: f64, tc: f64, molar_mass: f64) -> f64 {
    let tr = (t / tc).min(MAX_REDUCED_TEMPERATURE);
    let tbr = tb / tc;
    1.1053 / (molar_mass * 1e3).sqrt() * (3.0 + 20.0 * (1.0 - tr).powf(2.0 / 3.0)) / (3.0 + 20.0 * (1.0 - tbr).powf(2.0 / 3.0))
}

/// Brock–Bird surface tension [N/m] (Brock & Bird 1955; Poling et al. 2001 eq. 12-3.5).
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

/// Chung et al. (1988) low-pressure gas viscosity [Pa·s] for a non-polar molecule.
pub fn chung_gas_viscosity(t: f64, tc: f64, vc: f64, omega: f64, molar_mass: f64) -> f64 {
    let t_star = 1.2593 * t / tc;
    let fc = 1.0 - 0.2756 * omega;
    // 40.785 Fc sqrt(M T) / (Vc^(2/3) Ω) in µP with M in g/mol and Vc in cm³/mol
    let mu_micropoise = 40.785 * fc * (molar_mass * 1e3 * t).sqrt() / (vc * 1e6).powf(2.0 / 3.0) / neufeld_omega_viscosity(t_star);
    mu_micropoise * 1e-7
}

/// Chung et al. (1984) low-pressure gas conductivity [W/(m·K)] from viscosity and cv.
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
    let joback = |t: f64| super::joback::liquid_viscosity(groups, w, t);
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

/// Which published range applies: evaluate inside [t_min, t_max]; outside, scale the corresponding-states
/// estimate so that it meets the published value at the nearest end of the range (a smooth, shape-preserving
/// extrapolation instead of holding or extrapolating the fitted form).
#[inline]
fn anchored(c: &Correlation, t: f64, estimate: impl Fn(f64) -> f64) -> f64 {
    let edge = if t > c.t_max {
        c.t_max
    } else if t < c.t_min {
        c.t_min
    } else {
        return c.eval(t);
    };
    let at_edge = estimate(edge);
    if at_edge > 0.0 && at_edge.is_finite() {
        c.eval(edge) * estimate(t) / at_edge
    } else {
        c.eval(edge)
    }
}

// Positions in `Component::property_scales` (the order of `Component::correlations`). Each public property
// method multiplies its value by its scale (1 outside uncertainty samples: x·1 = x exactly, so the default
// path gives the same bits as before); estimates that use another property use its unscaled value, so that
// the ten perturbations stay independent.
const VAPOR_PRESSURE: usize = 0;
const LIQUID_DENSITY: usize = 1;
const LATENT_HEAT: usize = 2;
const LIQUID_HEAT_CAPACITY: usize = 3;
const LIQUID_VISCOSITY: usize = 4;
const LIQUID_CONDUCTIVITY: usize = 5;
const SURFACE_TENSION: usize = 6;
const IDEAL_GAS_HEAT_CAPACITY: usize = 7;
const VAPOR_VISCOSITY: usize = 8;
const VAPOR_CONDUCTIVITY: usize = 9;

impl Component {
    #[inline]
    fn published(c: &Correlation, t: f64) -> Option<f64> {
        match c.form {
            Form::CorrespondingStates => None,
            _ => Some(c.eval(t)),
        }
    }

    /// Published liquid correlation inside its range, anchored estimate outside; the estimate alone when the
    /// file has no coefficients.
    #[inline]
    fn liquid_property(c: &Correlation, t: f64, estimate: impl Fn(f64) -> f64) -> f64 {
        match c.form {
            Form::CorrespondingStates => estimate(t),
            _ => anchored(c, t, estimate),
        }
    }

    /// Saturation (vapour) pressure at `t` [Pa].
    pub fn vapor_pressure(&self, t: f64) -> f64 {
        let p = Self::published(&self.vapor_pressure, t).unwrap_or_else(|| {
            ambrose_walton_vapor_pressure(t, self.critical_temperature(), self.critical_pressure(), self.acentric_factor())
        });
        p * self.property_scales[VAPOR_PRESSURE]
    }

    /// Saturated liquid density at `t` [kg/m³].
    pub fn liquid_density(&self, t: f64) -> f64 {
        let z = self.constants.rackett_z.as_ref().map(|z| z.value);
        Self::liquid_property(&self.liquid_density, t, |t| {
            rackett_density(t, self.critical_temperature(), self.critical_pressure(), self.acentric_factor(), self.molar_mass(), z)
        }) * self.property_scales[LIQUID_DENSITY]
    }

    /// Liquid density at 15 °C [kg/m³]: the published value when the file has one, else the correlation.
    pub fn density_15c(&self) -> f64 {
        self.constants.density_15c.as_ref().map(|d| d.value).unwrap_or_else(|| self.liquid_density(288.15))
    }

    /// Latent heat of vaporisation at `t` [J/kg].
    pub fn latent_heat(&self, t: f64) -> f64 {
        let (tb, tc) = (self.normal_boiling_point(), self.critical_temperature());
        Self::liquid_property(&self.latent_heat, t, |t| {
            let lb = riedel_latent_heat_at_boiling(tb, tc, self.critical_pressure());
            watson_latent_heat(t, tb, lb, tc) / self.molar_mass()
        }) * self.property_scales[LATENT_HEAT]
    }

    /// Liquid heat capacity at `t` [J/(kg·K)].
    pub fn liquid_heat_capacity(&self, t: f64) -> f64 {
        Self::liquid_property(&self.liquid_heat_capacity, t, |t| {
            let cp_ig_molar = self.unscaled_ideal_gas_heat_capacity(t) * self.molar_mass();
            rowlinson_bondi_cp(cp_ig_molar, t, self.critical_temperature(), self.acentric_factor()) / self.molar_mass()
        }) * self.property_scales[LIQUID_HEAT_CAPACITY]
    }

    /// Liquid dynamic viscosity at `t` [Pa·s].
    pub fn liquid_viscosity(&self, t: f64) -> f64 {
        Self::liquid_property(&self.liquid_viscosity, t, |t| estimated_viscosity_with_groups(t, self)) * self.property_scales[LIQUID_VISCOSITY]
    }

    /// Liquid thermal conductivity at `t` [W/(m·K)].
    pub fn liquid_conductivity(&self, t: f64) -> f64 {
        Self::liquid_property(&self.liquid_conductivity, t, |t| sato_riedel_conductivity(t, self.normal_boiling_point(), self.critical_temperature(), self.molar_mass()))
            * self.property_scales[LIQUID_CONDUCTIVITY]
    }

    /// Surface tension at `t` [N/m].
    pub fn surface_tension(&self, t: f64) -> f64 {
        Self::liquid_property(&self.surface_tension, t, |t| brock_bird_surface_tension(t, self.normal_boiling_point(), self.critical_temperature(), self.critical_pressure()))
            * self.property_scales[SURFACE_TENSION]
    }

    /// Ideal-gas heat capacity at `t` [J/(kg·K)] (the component file must give coefficients).
    pub fn ideal_gas_heat_capacity(&self, t: f64) -> f64 {
        self.unscaled_ideal_gas_heat_capacity(t) * self.property_scales[IDEAL_GAS_HEAT_CAPACITY]
    }

    #[inline]
    fn unscaled_ideal_gas_heat_capacity(&self, t: f64) -> f64 {
        // Loader guarantees a published or group-contribution polynomial; a CSP marker is refused there.
        Self::published(&self.ideal_gas_heat_capacity, t).unwrap_or(0.0)
    }

    /// Low-pressure vapour viscosity at `t` [Pa·s].
    pub fn vapor_viscosity(&self, t: f64) -> f64 {
        self.unscaled_vapor_viscosity(t) * self.property_scales[VAPOR_VISCOSITY]
    }

    #[inline]
    fn unscaled_vapor_viscosity(&self, t: f64) -> f64 {
        Self::published(&self.vapor_viscosity, t).unwrap_or_else(|| {
            chung_gas_viscosity(t, self.critical_temperature(), self.constants.critical_volume.value, self.acentric_factor(), self.molar_mass())
        })
    }

    /// Low-pressure vapour thermal conductivity at `t` [W/(m·K)].
    pub fn vapor_conductivity(&self, t: f64) -> f64 {
        Self::published(&self.vapor_conductivity, t).unwrap_or_else(|| {
            let mu = self.unscaled_vapor_viscosity(t);
            let cp = self.unscaled_ideal_gas_heat_capacity(t) * self.molar_mass();
            chung_gas_conductivity(t, self.critical_temperature(), self.acentric_factor(), self.molar_mass(), mu, cp)
        }) * self.property_scales[VAPOR_CONDUCTIVITY]
    }

    /// Fuller diffusion-volume sum [-]: the file's value, else atomic volumes of Fuller et al. (1966).
    pub fn diffusion_volume(&self) -> f64 {
        self.constants.diffusion_volume.as_ref().map(|d| d.value).unwrap_or_else(|| {
            let f = self.formula;
            15.9 * f64::from(f.carbon) + 2.31 * f64::from(f.hydrogen) + 6.11 * f64::from(f.oxygen) - 18.3 * f64::from(self.class.aromatic_rings())
        })
    }

    /// Liquid molar volume at the normal boiling point [m³/mol].
    pub fn molar_volume_at_boiling(&self) -> f64 {
        self.molar_mass() / self.liquid_density(self.normal_boiling_point())
    }

    /// Hydrogen mass fraction of the molecule [-], from the formula (for a petroleum fraction the formula's mass
    /// may differ slightly from the fraction's molar mass; the formula carries the composition).
    pub fn hydrogen_mass_fraction(&self) -> f64 {
        let f = self.formula;
        let formula_mass = 12.011e-3 * f64::from(f.carbon) + 1.008e-3 * f64::from(f.hydrogen) + 15.999e-3 * f64::from(f.oxygen);
        1.008e-3 * f64::from(f.hydrogen) / formula_mass
    }

    /// Names of the properties that are estimated rather than taken from published coefficients.
    pub fn estimated_properties(&self) -> Vec<&'static str> {
        self.correlations().iter().filter(|(_, c)| c.is_estimated()).map(|(n, _)| *n).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Lee–Kesler worked example: ethylbenzene at 347.2 K, Tc 617.1 K, pc 36 bar, ω 0.299 → 13.08 kPa
    /// (Reid, Prausnitz & Poling 1987, example as reproduced in ../shared physics notes).
    #[test]
    fn lee_kesler_worked_example() {
        let p = lee_kesler_vapor_pressure(347.2, 617.1, 36e5, 0.299);
        assert!((p / 13.08e3 - 1.0).abs() < 2e-3, "{p}");
    }

    /// Ambrose–Walton example (Poling et al. 2001): ethylbenzene 347.25 K → 13.28 kPa.
    #[test]
    fn ambrose_walton_example() {
        let p = ambrose_walton_vapor_pressure(347.25, 617.15, 36.09e5, 0.304);
        assert!((p / 13.28e3 - 1.0).abs() < 0.01, "{p}");
    }

    #[test]
    fn lee_kesler_omega_round_trip() {
        let (tb, tc, pc) = (447.27, 617.7, 2.11e6);
        let w = lee_kesler_acentric_factor(tb, tc, pc);
        let p = lee_kesler_vapor_pressure(tb, tc, pc, w);
        assert!((p / 101_325.0 - 1.0).abs() < 1e-9);
        assert!((w - 0.488).abs() < 0.03, "{w}");
    }

    /// Rackett check (propane 272.04 K, Z_RA 0.2763 → 531.3 kg/m³; API TDB example).
    #[test]
    fn rackett_propane() {
        let rho = rackett_density(272.04, 369.83, 4.248e6, 0.152, 0.044097, Some(0.2763));
        assert!((rho / 531.3 - 1.0).abs() < 0.005, "{rho}");
    }

    /// Neufeld collision integral check values Ω_D(1) = 1.4405, Ω_D(2) = 1.0754 (physics notes B.10).
    #[test]
    fn neufeld_values() {
        assert!((neufeld_omega_diffusion(1.0) - 1.4405).abs() < 2e-4);
        assert!((neufeld_omega_diffusion(2.0) - 1.0754).abs() < 2e-4);
    }
}
