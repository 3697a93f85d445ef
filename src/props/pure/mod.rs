//! Pure-component properties in SI mass basis, from published correlations or, where a component file
//! says `corresponding-states`, from the constants by the methods named in docs/property-methods.md.

use crate::data::component::{Extensions, WilhoitCoefficients};
use crate::data::{Component, Correlation, Form, HydrocarbonClass, GAS_CONSTANT};


mod methods;
pub use methods::*;

/// Reduced temperature cap of the takeover from a published liquid-viscosity fit to the Hildebrand fluidity law.
pub const FLUIDITY_TAKEOVER_REDUCED: f64 = 0.70;
/// The fluidity law passes through the published fit at the takeover and this far below it \[K\].
pub const FLUIDITY_SPAN: f64 = 60.0;
/// Reduced temperatures between which the fluidity law is blended log-linearly into Letsou–Stiel \[-\].
pub const LETSOU_STIEL_BLEND: (f64, f64) = (0.80, 1.00);
/// The published vapour-conductivity correlation is used up to this multiple of Tc (and its t_max) \[-\].
pub const VAPOR_CONDUCTIVITY_FIT_LIMIT: f64 = 1.1;
/// The density-scaled liquid conductivity is checked against reference correlations up to this Tr \[-\].
pub const LIQUID_CONDUCTIVITY_CHECKED_TO: f64 = 0.90;
/// Temperatures \[K\] over which the Wilhoit continuation of ideal-gas cp was checked (docs/property-methods.md).
pub const WILHOIT_RANGE: (f64, f64) = (50.0, 1500.0);
/// Upper end \[K\] of the checked range of the vapour transport extensions (they use the Wilhoit cp).
pub const GAS_TRANSPORT_CHECKED_TO: f64 = 1500.0;

/// Where a property rests on published ground (see [`Component::valid_range`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ValidRange {
    /// Property key as in the component file.
    pub key: &'static str,
    /// Lowest temperature \[K\].
    pub low: f64,
    /// Highest temperature \[K\].
    pub high: f64,
    /// The method(s) used over the range.
    pub method: &'static str,
}

/// A property used outside its valid range: which, for which component, and how far.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[allow(non_snake_case)]
pub struct RangeExcursion {
    /// Component id.
    pub component: String,
    /// Property key as in the component file.
    pub property: &'static str,
    /// Method(s) over the valid range.
    pub method: &'static str,
    /// Lower end of the valid range \[K\].
    pub valid_from_K: f64,
    /// Upper end of the valid range \[K\].
    pub valid_to_K: f64,
    /// How far below the lower end the property was used \[K\] (0: not below).
    pub below_K: f64,
    /// How far above the upper end the property was used \[K\] (0: not above).
    pub above_K: f64,
}

impl RangeExcursion {
    /// One line: "n-dodecane liquid-viscosity 12.0 K below 262.1 K".
    pub fn describe(&self) -> String {
        let mut parts = vec![];
        if self.below_K > 0.0 {
            parts.push(format!("{:.1} K below {:.1} K", self.below_K, self.valid_from_K));
        }
        if self.above_K > 0.0 {
            parts.push(format!("{:.1} K above {:.1} K", self.above_K, self.valid_to_K));
        }
        format!("{} {} {}", self.component, self.property, parts.join(" and "))
    }
}

/// Merge excursions of the same component and property (largest distances kept), in first-seen order.
pub fn merge_excursions(list: impl IntoIterator<Item = RangeExcursion>) -> Vec<RangeExcursion> {
    let mut out: Vec<RangeExcursion> = vec![];
    for e in list {
        match out.iter_mut().find(|o| o.component == e.component && o.property == e.property) {
            Some(o) => {
                o.below_K = o.below_K.max(e.below_K);
                o.above_K = o.above_K.max(e.above_K);
            }
            None => out.push(e),
        }
    }
    out
}

/// Wilhoit (1975) ideal-gas heat capacity \[J/(mol·K)\]: cp = cp0 + (cp∞ − cp0) y² \[1 + (y − 1)(a0 + a1 y + a2 y²)\],
/// y = T/(T + B), for `w` = (B, \[a0, a1, a2\], cp0, cp∞).
#[inline]
pub fn wilhoit_cp(t: f64, w: WilhoitCoefficients) -> f64 {
    let (b, a, cp0, cp_inf) = w;
    let y = t.max(0.0) / (t.max(0.0) + b);
    cp0 + (cp_inf - cp0) * y * y * (1.0 + (y - 1.0) * (a[0] + y * (a[1] + y * a[2])))
}

/// Least-squares Wilhoit fit [(B, a, cp0, cp∞), worst relative error] to molar cp values `cp` at `t`, with
/// cp0 = 4R (non-linear molecule) and cp∞ = (3N − 2)R; B scanned over 50–700 K in 10 K steps.
pub fn fit_wilhoit(t: &[f64], cp: &[f64], atoms: u32) -> Option<(WilhoitCoefficients, f64)> {
    let cp0 = 4.0 * GAS_CONSTANT;
    let cp_inf = (3.0 * f64::from(atoms) - 2.0) * GAS_CONSTANT;
    if atoms < 3 || t.len() < 4 || cp.iter().any(|c| !(c.is_finite() && *c > cp0 && *c < cp_inf)) {
        return None;
    }
    let mut best: Option<(WilhoitCoefficients, f64)> = None;
    for step in 0..=65 {
        let b = 50.0 + 10.0 * f64::from(step);
        // (cp − cp0)/((cp∞ − cp0) y²) − 1 = (y − 1)(a0 + a1 y + a2 y²): linear least squares via normal equations
        let mut m = [[0.0f64; 3]; 3];
        let mut r = [0.0f64; 3];
        for (ti, ci) in t.iter().zip(cp) {
            let y = ti / (ti + b);
            let lhs = (ci - cp0) / ((cp_inf - cp0) * y * y) - 1.0;
            let basis = [(y - 1.0), (y - 1.0) * y, (y - 1.0) * y * y];
            for i in 0..3 {
                r[i] += basis[i] * lhs;
                for j in 0..3 {
                    m[i][j] += basis[i] * basis[j];
                }
            }
        }
        let Some(a) = solve3(m, r) else { continue };
        let w = (b, a, cp0, cp_inf);
        let err = t.iter().zip(cp).map(|(ti, ci)| (wilhoit_cp(*ti, w) / ci - 1.0).abs()).fold(0.0, f64::max);
        if err.is_finite() && best.is_none_or(|(_, e)| err < e) {
            best = Some((w, err));
        }
    }
    best
}

/// Solve a 3×3 linear system (LU with partial pivoting, `numerics`).
fn solve3(m: [[f64; 3]; 3], r: [f64; 3]) -> Option<[f64; 3]> {
    let a: Vec<f64> = m.iter().flatten().copied().collect();
    let x = crate::numerics::linalg::solve(&a, &r, 3)?;
    Some([x[0], x[1], x[2]])
}

/// Fit the extensions of a component's published correlations (see [`Extensions`]).
pub fn fit_extensions(c: &Component) -> Extensions {
    Extensions { fluidity: fit_fluidity(c), wilhoit: std::sync::OnceLock::new(), chung_viscosity_factor: chung_viscosity_factor(c.critical_volume(), c.acentric_factor(), c.molar_mass()) }
}

/// The temperature-independent factor of [`chung_gas_viscosity`]: μ = factor · sqrt(T) / Ω_v(1.2593 T/Tc) \[Pa·s/K^½\].
pub fn chung_viscosity_factor(vc: f64, omega: f64, molar_mass: f64) -> f64 {
    let fc = 1.0 - 0.2756 * omega;
    40.785 * fc * (molar_mass * 1e3).sqrt() / (vc * 1e6).powf(2.0 / 3.0) * 1e-7
}

/// Hildebrand (1971) fluidity law 1/μ = a·V + b through the published liquid viscosity at the takeover
/// temperature and FLUIDITY_SPAN below it, V from the component's liquid density; (takeover, a, b).
fn fit_fluidity(c: &Component) -> Option<(f64, f64, f64)> {
    let corr = &c.liquid_viscosity;
    if matches!(corr.form, Form::CorrespondingStates | Form::Constant(_)) {
        return None;
    }
    let tc = c.critical_temperature();
    let takeover = if c.class == HydrocarbonClass::Oxygenate {
        corr.t_max
    } else {
        corr.t_max.min(c.normal_boiling_point()).min(FLUIDITY_TAKEOVER_REDUCED * tc)
    };
    let t1 = (takeover - FLUIDITY_SPAN).max(corr.t_min);
    if takeover - t1 < 10.0 {
        return None;
    }
    let volume = |t: f64| c.molar_mass() / c.unscaled_liquid_density(t);
    let (v1, v2) = (volume(t1), volume(takeover));
    let (f1, f2) = (1.0 / corr.eval(t1), 1.0 / corr.eval(takeover));
    let a = (f2 - f1) / (v2 - v1);
    let b = f1 - a * v1;
    (a.is_finite() && b.is_finite() && a > 0.0 && v2 > v1).then_some((takeover, a, b))
}

/// Wilhoit fit to a published ideal-gas cp polynomial over its range (41 points).
fn fit_component_wilhoit(c: &Component) -> Option<WilhoitCoefficients> {
    let corr = &c.ideal_gas_heat_capacity;
    if !matches!(corr.form, Form::Dippr100(_)) || corr.t_max >= 1e4 {
        return None;
    }
    let ts: Vec<f64> = (0..41).map(|i| corr.t_min + (corr.t_max - corr.t_min) * f64::from(i) / 40.0).collect();
    let cps: Vec<f64> = ts.iter().map(|t| corr.eval(*t) * c.molar_mass()).collect();
    let f = c.formula;
    fit_wilhoit(&ts, &cps, f.carbon + f.hydrogen + f.oxygen).map(|(w, _)| w)
}

/// Upper end of the temperatures where the published vapour-conductivity correlation of `c` is used \[K\].
pub fn vapor_conductivity_fit_limit(c: &Component) -> f64 {
    c.vapor_conductivity_fit_limit()
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

/// The liquid properties a droplet right-hand side needs of one component at one temperature (SI units).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct LiquidPoint {
    /// Vapour pressure \[Pa\].
    pub vapor_pressure: f64,
    /// Saturated liquid density \[kg/m³\].
    pub density: f64,
    /// Latent heat of vaporization \[J/kg\].
    pub latent_heat: f64,
    /// Liquid heat capacity \[J/(kg·K)\].
    pub heat_capacity: f64,
}

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

    /// The coefficients of the extensions past the published ranges, fitted on first use.
    #[inline]
    pub fn extensions(&self) -> &Extensions {
        self.extensions.get_or_init(|| fit_extensions(self))
    }

    /// The Wilhoit continuation of the published ideal-gas cp (fitted on first use; None without one).
    pub fn wilhoit(&self) -> Option<WilhoitCoefficients> {
        *self.extensions().wilhoit.get_or_init(|| fit_component_wilhoit(self))
    }

    /// Unscaled property `index` at `t` from this copy's kernel when it has one and it serves `t`, else direct.
    #[inline(always)]
    fn kernel_or(&self, index: usize, t: f64, direct: impl FnOnce() -> f64) -> f64 {
        if let Some(k) = super::kernels::active(self) {
            if let Some(v) = k.eval(self, index, t) {
                return v;
            }
        }
        direct()
    }

    /// Unscaled property `index` (in [`Component::correlations`] order) at `t`, always by direct evaluation of
    /// the published correlations and their extensions (what the property kernels interpolate).
    pub fn unscaled_direct(&self, index: usize, t: f64) -> f64 {
        match index {
            VAPOR_PRESSURE => self.direct_vapor_pressure(t),
            LIQUID_DENSITY => self.unscaled_liquid_density(t),
            LATENT_HEAT => self.direct_latent_heat(t),
            LIQUID_HEAT_CAPACITY => self.direct_liquid_heat_capacity(t),
            LIQUID_VISCOSITY => self.unscaled_liquid_viscosity(t),
            LIQUID_CONDUCTIVITY => self.direct_liquid_conductivity(t),
            SURFACE_TENSION => self.direct_surface_tension(t),
            IDEAL_GAS_HEAT_CAPACITY => self.unscaled_ideal_gas_heat_capacity(t),
            VAPOR_VISCOSITY => self.unscaled_vapor_viscosity(t),
            _ => self.direct_vapor_conductivity(t),
        }
    }

    /// Saturation (vapour) pressure at `t` \[Pa\].
    pub fn vapor_pressure(&self, t: f64) -> f64 {
        self.kernel_or(VAPOR_PRESSURE, t, || self.direct_vapor_pressure(t)) * self.property_scales[VAPOR_PRESSURE]
    }

    fn direct_vapor_pressure(&self, t: f64) -> f64 {
        Self::published(&self.vapor_pressure, t).unwrap_or_else(|| ambrose_walton_vapor_pressure(t, self.critical_temperature(), self.critical_pressure(), self.acentric_factor()))
    }

    /// Saturated liquid density at `t` \[kg/m³\].
    pub fn liquid_density(&self, t: f64) -> f64 {
        self.kernel_or(LIQUID_DENSITY, t, || self.unscaled_liquid_density(t)) * self.property_scales[LIQUID_DENSITY]
    }

    #[inline]
    fn unscaled_liquid_density(&self, t: f64) -> f64 {
        let z = self.constants.rackett_z.as_ref().map(|z| z.value);
        Self::liquid_property(&self.liquid_density, t, |t| {
            rackett_density(t, self.critical_temperature(), self.critical_pressure(), self.acentric_factor(), self.molar_mass(), z)
        })
    }

    /// Liquid density at 15 °C \[kg/m³\]: the published value when the file has one, else the correlation.
    pub fn density_15c(&self) -> f64 {
        self.constants.density_15c.as_ref().map(|d| d.value).unwrap_or_else(|| self.liquid_density(288.15))
    }

    /// Latent heat of vaporisation at `t` \[J/kg\].
    pub fn latent_heat(&self, t: f64) -> f64 {
        self.kernel_or(LATENT_HEAT, t, || self.direct_latent_heat(t)) * self.property_scales[LATENT_HEAT]
    }

    fn direct_latent_heat(&self, t: f64) -> f64 {
        let (tb, tc) = (self.normal_boiling_point(), self.critical_temperature());
        Self::liquid_property(&self.latent_heat, t, |t| {
            let lb = riedel_latent_heat_at_boiling(tb, tc, self.critical_pressure());
            watson_latent_heat(t, tb, lb, tc) / self.molar_mass()
        })
    }

    /// Liquid heat capacity at `t` \[J/(kg·K)\].
    pub fn liquid_heat_capacity(&self, t: f64) -> f64 {
        self.kernel_or(LIQUID_HEAT_CAPACITY, t, || self.direct_liquid_heat_capacity(t)) * self.property_scales[LIQUID_HEAT_CAPACITY]
    }

    fn direct_liquid_heat_capacity(&self, t: f64) -> f64 {
        Self::liquid_property(&self.liquid_heat_capacity, t, |t| {
            let cp_ig_molar = self.unscaled_ideal_gas_heat_capacity(t) * self.molar_mass();
            rowlinson_bondi_cp(cp_ig_molar, t, self.critical_temperature(), self.acentric_factor()) / self.molar_mass()
        })
    }

    /// Liquid dynamic viscosity at `t` \[Pa·s\]: the published correlation up to the takeover temperature
    /// (`min(t_max, Tb, 0.70 Tc)`; `t_max` for oxygenates), then the Hildebrand fluidity law fitted to it,
    /// blended log-linearly into Letsou–Stiel from 0.80 Tc (docs/property-methods.md).
    pub fn liquid_viscosity(&self, t: f64) -> f64 {
        self.kernel_or(LIQUID_VISCOSITY, t, || self.unscaled_liquid_viscosity(t)) * self.property_scales[LIQUID_VISCOSITY]
    }

    #[inline]
    fn unscaled_liquid_viscosity(&self, t: f64) -> f64 {
        let c = &self.liquid_viscosity;
        if matches!(c.form, Form::CorrespondingStates) || t <= c.t_min {
            return Self::liquid_property(c, t, |t| estimated_viscosity_with_groups(t, self));
        }
        match self.extensions().fluidity {
            Some((takeover, a, b)) if t > takeover => {
                let fluidity = a * self.molar_mass() / self.unscaled_liquid_density(t) + b;
                let (tc, pc, omega, w) = (self.critical_temperature(), self.critical_pressure(), self.acentric_factor(), self.molar_mass());
                let hildebrand = 1.0 / fluidity;
                let (lo, hi) = LETSOU_STIEL_BLEND;
                let s = ((t / tc - lo) / (hi - lo)).clamp(0.0, 1.0);
                if s <= 0.0 {
                    hildebrand
                } else {
                    let ls = letsou_stiel_viscosity(t, tc, pc, omega, w);
                    ((1.0 - s) * hildebrand.ln() + s * ls.ln()).exp()
                }
            }
            Some(_) => c.eval(t),
            None => Self::liquid_property(c, t, |t| estimated_viscosity_with_groups(t, self)),
        }
    }

    /// Liquid thermal conductivity at `t` \[W/(m·K)\]: the published correlation inside its range; above it,
    /// k/ρ held at its value at the upper limit (density scaling); below it and without coefficients,
    /// Sato–Riedel (anchored).
    pub fn liquid_conductivity(&self, t: f64) -> f64 {
        self.kernel_or(LIQUID_CONDUCTIVITY, t, || self.direct_liquid_conductivity(t)) * self.property_scales[LIQUID_CONDUCTIVITY]
    }

    fn direct_liquid_conductivity(&self, t: f64) -> f64 {
        let c = &self.liquid_conductivity;
        let sato = |t| sato_riedel_conductivity(t, self.normal_boiling_point(), self.critical_temperature(), self.molar_mass());
        if !matches!(c.form, Form::CorrespondingStates) && t > c.t_max {
            let t = t.min(MAX_REDUCED_TEMPERATURE * self.critical_temperature()).max(c.t_max);
            c.eval(c.t_max) * self.unscaled_liquid_density(t) / self.unscaled_liquid_density(c.t_max)
        } else {
            Self::liquid_property(c, t, sato)
        }
    }

    /// Surface tension at `t` \[N/m\].
    pub fn surface_tension(&self, t: f64) -> f64 {
        self.kernel_or(SURFACE_TENSION, t, || self.direct_surface_tension(t)) * self.property_scales[SURFACE_TENSION]
    }

    fn direct_surface_tension(&self, t: f64) -> f64 {
        Self::liquid_property(&self.surface_tension, t, |t| brock_bird_surface_tension(t, self.normal_boiling_point(), self.critical_temperature(), self.critical_pressure()))
    }

    /// Ideal-gas heat capacity at `t` \[J/(kg·K)\] (the component file must give coefficients); a polynomial is
    /// continued outside its range by the Wilhoit form fitted to it (rising to the classical limit).
    pub fn ideal_gas_heat_capacity(&self, t: f64) -> f64 {
        self.kernel_or(IDEAL_GAS_HEAT_CAPACITY, t, || self.unscaled_ideal_gas_heat_capacity(t)) * self.property_scales[IDEAL_GAS_HEAT_CAPACITY]
    }

    #[inline]
    fn unscaled_ideal_gas_heat_capacity(&self, t: f64) -> f64 {
        // Loader guarantees a published or group-contribution polynomial; a CSP marker is refused there.
        let c = &self.ideal_gas_heat_capacity;
        if t >= c.t_min && t <= c.t_max {
            return Self::published(c, t).unwrap_or(0.0);
        }
        match self.wilhoit() {
            Some(w) => {
                let edge = t.clamp(c.t_min, c.t_max);
                c.eval(edge) * wilhoit_cp(t, w) / wilhoit_cp(edge, w)
            }
            None => Self::published(c, t).unwrap_or(0.0),
        }
    }

    /// Ideal-gas heat capacity \[J/(kg·K)\], low-pressure vapour viscosity \[Pa·s\] and conductivity \[W/(m·K)\] at
    /// `t`, as the three methods give them (one kernel segment look-up; direct evaluation reuses the viscosity
    /// and heat capacity in the Chung et al. conductivity).
    #[inline]
    pub fn vapor_properties(&self, t: f64) -> (f64, f64, f64) {
        self.vapor_properties_via(super::kernels::active(self), t)
    }

    /// [`Component::vapor_properties`] through the kernels `kernels`, which must be this copy's
    /// ([`super::kernels::active`]; a caller that evaluates often keeps them instead of looking them up per call).
    #[inline(always)]
    pub fn vapor_properties_via(&self, kernels: Option<&super::kernels::PropertyKernels>, t: f64) -> (f64, f64, f64) {
        let s = &self.property_scales;
        if let Some(k) = kernels {
            if let Some([cp, mu, kv]) = k.vapour_group(self, t) {
                return (cp * s[IDEAL_GAS_HEAT_CAPACITY], mu * s[VAPOR_VISCOSITY], kv * s[VAPOR_CONDUCTIVITY]);
            }
        }
        let (cp, mu) = (self.unscaled_ideal_gas_heat_capacity(t), self.unscaled_vapor_viscosity(t));
        let kv = self.direct_vapor_conductivity_with(t, Some((mu, cp)));
        (cp * s[IDEAL_GAS_HEAT_CAPACITY], mu * s[VAPOR_VISCOSITY], kv * s[VAPOR_CONDUCTIVITY])
    }

    /// Vapour pressure \[Pa\] and latent heat \[J/kg\] at `t`: those fields of [`Component::liquid_point_via`], bit for bit.
    #[inline]
    pub fn pressure_and_latent_via(&self, kernels: Option<&super::kernels::PropertyKernels>, t: f64) -> (f64, f64) {
        let s = &self.property_scales;
        if let Some(k) = kernels {
            if let Some([p, l]) = k.pressure_and_latent(self, t) {
                return (p * s[VAPOR_PRESSURE], l * s[LATENT_HEAT]);
            }
        }
        (self.vapor_pressure(t), self.latent_heat(t))
    }

    /// Liquid density \[kg/m³\] and heat capacity \[J/(kg·K)\] at `t`: those fields of [`Component::liquid_point`], bit for bit.
    #[inline]
    pub fn density_and_heat_capacity(&self, t: f64) -> (f64, f64) {
        let s = &self.property_scales;
        if let Some(k) = super::kernels::active(self) {
            if let Some([rho, cp]) = k.density_and_heat_capacity(self, t) {
                return (rho * s[LIQUID_DENSITY], cp * s[LIQUID_HEAT_CAPACITY]);
            }
        }
        (self.liquid_density(t), self.liquid_heat_capacity(t))
    }

    /// Vapour pressure, liquid density, latent heat and liquid heat capacity at `t` (the values, bit for bit,
    /// of the four single-property methods), from one kernel look-up when this copy has kernels.
    #[inline]
    pub fn liquid_point(&self, t: f64) -> LiquidPoint {
        self.liquid_point_via(super::kernels::active(self), t)
    }

    /// [`Component::liquid_point`] through the kernels `kernels`, which must be this copy's
    /// ([`super::kernels::active`]; a caller that evaluates often keeps them instead of looking them up per call).
    #[inline(always)]
    pub fn liquid_point_via(&self, kernels: Option<&super::kernels::PropertyKernels>, t: f64) -> LiquidPoint {
        let s = &self.property_scales;
        if let Some(k) = kernels {
            if let Some([p, rho, l, cp]) = k.liquid_group(self, t) {
                return LiquidPoint {
                    vapor_pressure: p * s[VAPOR_PRESSURE],
                    density: rho * s[LIQUID_DENSITY],
                    latent_heat: l * s[LATENT_HEAT],
                    heat_capacity: cp * s[LIQUID_HEAT_CAPACITY],
                };
            }
        }
        LiquidPoint { vapor_pressure: self.vapor_pressure(t), density: self.liquid_density(t), latent_heat: self.latent_heat(t), heat_capacity: self.liquid_heat_capacity(t) }
    }

    /// Low-pressure vapour viscosity at `t` \[Pa·s\].
    pub fn vapor_viscosity(&self, t: f64) -> f64 {
        self.kernel_or(VAPOR_VISCOSITY, t, || self.unscaled_vapor_viscosity(t)) * self.property_scales[VAPOR_VISCOSITY]
    }

    #[inline]
    fn chung_viscosity(&self, t: f64) -> f64 {
        // chung_gas_viscosity with its temperature-independent factor computed once per component
        let factor = self.extensions().chung_viscosity_factor;
        factor * t.sqrt() / neufeld_omega_viscosity(1.2593 * t / self.critical_temperature())
    }

    #[inline]
    fn unscaled_vapor_viscosity(&self, t: f64) -> f64 {
        let c = &self.vapor_viscosity;
        match c.form {
            Form::CorrespondingStates => self.chung_viscosity(t),
            Form::Constant(_) => c.eval(t),
            _ => anchored(c, t, |t| self.chung_viscosity(t)),
        }
    }

    #[inline]
    fn chung_conductivity(&self, t: f64) -> f64 {
        self.chung_conductivity_from(t, self.unscaled_vapor_viscosity(t), self.unscaled_ideal_gas_heat_capacity(t))
    }

    /// Chung et al. conductivity at `t` from the unscaled vapour viscosity and ideal-gas cp \[J/(kg·K)\] there.
    #[inline]
    fn chung_conductivity_from(&self, t: f64, viscosity: f64, cp_mass: f64) -> f64 {
        chung_gas_conductivity(t, self.critical_temperature(), self.acentric_factor(), self.molar_mass(), viscosity, cp_mass * self.molar_mass())
    }

    /// Low-pressure vapour thermal conductivity at `t` \[W/(m·K)\]: the published correlation from its lower
    /// limit to min(t_max, 1.1 Tc); outside, the Chung et al. temperature dependence (with this component's
    /// vapour viscosity and ideal-gas cp) anchored at the nearest end.
    pub fn vapor_conductivity(&self, t: f64) -> f64 {
        self.kernel_or(VAPOR_CONDUCTIVITY, t, || self.direct_vapor_conductivity(t)) * self.property_scales[VAPOR_CONDUCTIVITY]
    }

    fn direct_vapor_conductivity(&self, t: f64) -> f64 {
        self.direct_vapor_conductivity_with(t, None)
    }

    /// Direct vapour conductivity at `t`; `at_t` = (unscaled vapour viscosity, ideal-gas cp) at `t` when the
    /// caller has them (the Chung et al. shape then reuses them).
    fn direct_vapor_conductivity_with(&self, t: f64, at_t: Option<(f64, f64)>) -> f64 {
        let chung_at_t = || match at_t {
            Some((mu, cp)) => self.chung_conductivity_from(t, mu, cp),
            None => self.chung_conductivity(t),
        };
        let c = &self.vapor_conductivity;
        match c.form {
            Form::CorrespondingStates => chung_at_t(),
            Form::Constant(_) => c.eval(t),
            _ => {
                let hi = self.vapor_conductivity_fit_limit();
                let edge = t.clamp(c.t_min, hi);
                if edge == t {
                    c.eval(t)
                } else {
                    let at_edge = self.chung_conductivity(edge);
                    if at_edge > 0.0 && at_edge.is_finite() {
                        c.eval(edge) * chung_at_t() / at_edge
                    } else {
                        c.eval(edge)
                    }
                }
            }
        }
    }

    /// Upper end of the temperatures where the published vapour-conductivity correlation is used \[K\].
    #[inline]
    fn vapor_conductivity_fit_limit(&self) -> f64 {
        let c = &self.vapor_conductivity;
        (VAPOR_CONDUCTIVITY_FIT_LIMIT * self.critical_temperature()).min(c.t_max).max(c.t_min)
    }

    /// Temperature range \[K\] over which property `index` (in [`Component::correlations`] order) rests on a
    /// published correlation inside its range or on a published extension method inside the range it was
    /// stated or checked for, with a short name of the method used there (docs/property-methods.md, "Ranges").
    pub fn valid_range(&self, index: usize) -> ValidRange {
        let (key, c) = self.correlations()[index.min(9)];
        let tc = self.critical_temperature();
        let estimated = matches!(c.form, Form::CorrespondingStates);
        let tm = self.constants.melting_point.value;
        let liquid_low = if estimated { tm } else { c.t_min };
        let (low, high, method) = match index {
            VAPOR_PRESSURE => (liquid_low, tc, if estimated { "Ambrose-Walton" } else { "published; Ambrose-Walton shape beyond" }),
            LIQUID_DENSITY => (liquid_low, MAX_REDUCED_TEMPERATURE * tc, if estimated { "Rackett" } else { "published; Rackett shape beyond" }),
            LATENT_HEAT => (liquid_low, tc, if estimated { "Riedel-Watson" } else { "published; Watson shape beyond" }),
            LIQUID_HEAT_CAPACITY => (liquid_low, 0.98 * tc, if estimated { "Rowlinson-Bondi" } else { "published; Rowlinson-Bondi shape beyond" }),
            LIQUID_VISCOSITY => (liquid_low, 0.98 * tc, if estimated { "Joback / Letsou-Stiel" } else { "published; Hildebrand fluidity then Letsou-Stiel above the takeover" }),
            LIQUID_CONDUCTIVITY => (liquid_low, LIQUID_CONDUCTIVITY_CHECKED_TO * tc, if estimated { "Sato-Riedel" } else { "published; density scaling beyond" }),
            SURFACE_TENSION => (liquid_low, tc, if estimated { "Brock-Bird" } else { "published; Brock-Bird shape beyond" }),
            IDEAL_GAS_HEAT_CAPACITY => match c.form {
                Form::Dippr100(_) if self.wilhoit().is_some() => (WILHOIT_RANGE.0.min(c.t_min), WILHOIT_RANGE.1.max(c.t_max), "published; Wilhoit beyond"),
                _ => (c.t_min, c.t_max, "published"),
            },
            _ => {
                // vapour viscosity and conductivity: Chung et al. shape, Neufeld collision integral 0.3 ≤ T* ≤ 100
                let low = (0.3 / 1.2593 * tc).min(c.t_min);
                let high = GAS_TRANSPORT_CHECKED_TO.max(if index == VAPOR_CONDUCTIVITY { self.vapor_conductivity_fit_limit() } else { c.t_max });
                (low, high, if estimated { "Chung et al." } else { "published; Chung et al. shape beyond" })
            }
        };
        let (low, high) = if matches!(c.form, Form::Constant(_)) { (c.t_min, c.t_max) } else { (low, high) };
        ValidRange { key, low, high, method }
    }

    /// Every property whose valid range (see [`Component::valid_range`]) misses `[from, to]`, with how far.
    pub fn outside_valid_ranges(&self, from: f64, to: f64, keys: &[&str]) -> Vec<RangeExcursion> {
        (0..10)
            .filter_map(|k| {
                // every valid range of the ideal-gas cp holds its published range: inside it, no Wilhoit fit is needed
                let published = &self.ideal_gas_heat_capacity;
                if k == IDEAL_GAS_HEAT_CAPACITY && from >= published.t_min && to <= published.t_max {
                    return None;
                }
                let r = self.valid_range(k);
                if !keys.contains(&r.key) {
                    return None;
                }
                let below = (r.low - from).max(0.0);
                let above = (to - r.high).max(0.0);
                (below > 1e-9 || above > 1e-9).then(|| RangeExcursion { component: self.id.clone(), property: r.key, method: r.method, valid_from_K: r.low, valid_to_K: r.high, below_K: below, above_K: above })
            })
            .collect()
    }

    /// Fuller diffusion-volume sum \[-\]: the file's value, else atomic volumes of Fuller et al. (1966).
    pub fn diffusion_volume(&self) -> f64 {
        self.constants.diffusion_volume.as_ref().map(|d| d.value).unwrap_or_else(|| {
            let f = self.formula;
            15.9 * f64::from(f.carbon) + 2.31 * f64::from(f.hydrogen) + 6.11 * f64::from(f.oxygen) - 18.3 * f64::from(self.class.aromatic_rings())
        })
    }

    /// Liquid molar volume at the normal boiling point \[m³/mol\].
    pub fn molar_volume_at_boiling(&self) -> f64 {
        self.molar_mass() / self.liquid_density(self.normal_boiling_point())
    }

    /// Hydrogen mass fraction of the molecule \[-\], from the formula (for a petroleum fraction the formula's mass
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

    fn dodecane() -> std::sync::Arc<Component> {
        crate::data::Library::embedded().unwrap().component("n-dodecane").unwrap().clone()
    }

    /// The extensions meet the published correlations without a jump and behave physically beyond them:
    /// ideal-gas cp keeps rising past 1000 K below the classical limit (3N − 2)R; liquid viscosity and
    /// conductivity are continuous at the takeover and fall monotonically to 0.9 Tc; vapour conductivity is
    /// continuous at 1.1 Tc.
    #[test]
    fn extensions_are_continuous_and_physical() {
        let c = dodecane();
        let w = c.molar_mass();
        let cp = |t: f64| c.ideal_gas_heat_capacity(t);
        assert!((cp(1000.0 - 1e-9) / cp(1000.0 + 1e-9) - 1.0).abs() < 1e-6);
        let limit = (3.0 * 38.0 - 2.0) * GAS_CONSTANT / w;
        let mut last = cp(1000.0);
        for t in [1100.0, 1200.0, 1500.0, 2000.0, 3000.0] {
            assert!(cp(t) > last && cp(t) < limit, "{t}: {}", cp(t));
            last = cp(t);
        }
        let (takeover, ..) = c.extensions().fluidity.expect("fluidity fitted");
        let mu = |t: f64| c.liquid_viscosity(t);
        assert!((mu(takeover - 1e-7) / mu(takeover + 1e-7) - 1.0).abs() < 1e-5, "takeover {takeover}");
        let tc = c.critical_temperature();
        let mut last = mu(300.0);
        let mut t = 305.0;
        while t < 0.9 * tc {
            assert!(mu(t) < last && mu(t) > 0.0, "{t}");
            last = mu(t);
            t += 5.0;
        }
        let k = |t: f64| c.liquid_conductivity(t);
        let t_max = c.liquid_conductivity.t_max;
        assert!((k(t_max - 1e-7) / k(t_max + 1e-7) - 1.0).abs() < 1e-5);
        assert!(k(0.9 * tc) < k(t_max) && k(0.9 * tc) > 0.0);
        let kv = |t: f64| c.vapor_conductivity(t);
        let edge = 1.1 * tc;
        assert!((kv(edge - 1e-7) / kv(edge + 1e-7) - 1.0).abs() < 1e-5);
        assert!(kv(1500.0) > kv(1000.0));
    }

    /// Every library component's liquid viscosity falls smoothly from its melting point to 0.9 Tc: no 2 K step
    /// changes ln μ by more than 3 times its neighbours' mean change (n-hexylbenzene stepped 22 % at 423 K, where
    /// its PPDS coefficient set passes its parameter C).
    #[test]
    fn library_liquid_viscosities_have_no_steps() {
        let lib = crate::data::Library::embedded().unwrap();
        for c in lib.components() {
            let (lo, hi) = (c.constants.melting_point.value + 2.0, 0.9 * c.critical_temperature());
            let ts: Vec<f64> = (0..).map(|i| lo + 2.0 * f64::from(i)).take_while(|t| *t <= hi).collect();
            let d: Vec<f64> = ts.windows(2).map(|w| (c.liquid_viscosity(w[1]) / c.liquid_viscosity(w[0])).ln()).collect();
            if let Some(k) = d.iter().position(|x| *x >= 0.0) {
                panic!("{}: viscosity rises from {} to {} K", c.id, ts[k], ts[k + 1]);
            }
            for k in 1..d.len() - 1 {
                let neighbours = 0.5 * (d[k - 1] + d[k + 1]);
                assert!(d[k] > 3.0 * neighbours, "{}: step at {} K ({:.3} vs {:.3})", c.id, ts[k], d[k], neighbours);
            }
        }
    }

    /// Valid ranges: the published range widened by the extension methods; CSP forms start at the melting point.
    #[test]
    fn valid_ranges() {
        let c = dodecane();
        let vis = c.valid_range(4);
        assert_eq!(vis.key, "liquid-viscosity");
        assert!((vis.low - c.liquid_viscosity.t_min).abs() < 1e-12 && (vis.high - 0.98 * c.critical_temperature()).abs() < 1e-9);
        let cp = c.valid_range(7);
        assert!(cp.high >= 1500.0, "{cp:?}");
        assert!(c.outside_valid_ranges(300.0, 480.0, &["liquid-viscosity", "liquid-heat-capacity"]).is_empty());
        let out = c.outside_valid_ranges(250.0, 480.0, &["liquid-viscosity"]);
        assert_eq!(out.len(), 1);
        assert!((out[0].below_K - (c.liquid_viscosity.t_min - 250.0)).abs() < 1e-9);
        assert!(out[0].describe().contains("n-dodecane liquid-viscosity"));
    }

    /// Wilhoit fit reproduces values generated by a Wilhoit form exactly (B on the scan grid).
    #[test]
    fn wilhoit_fit_recovers_its_own_form() {
        let w = (300.0, [0.2, -0.5, 0.1], 4.0 * GAS_CONSTANT, 100.0 * GAS_CONSTANT);
        let ts: Vec<f64> = (0..41).map(|i| 200.0 + 20.0 * f64::from(i)).collect();
        let cps: Vec<f64> = ts.iter().map(|t| wilhoit_cp(*t, w)).collect();
        let (fit, err) = fit_wilhoit(&ts, &cps, 34).unwrap();
        assert!(err < 1e-9 && (fit.0 - 300.0).abs() < 1e-9, "{fit:?} {err}");
    }

    /// The per-component Chung viscosity factor reproduces the full formula.
    #[test]
    fn chung_factor_matches_full_formula() {
        let (tc, vc, omega, w) = (617.7, 624e-6, 0.49, 0.142);
        let f = chung_viscosity_factor(vc, omega, w);
        for t in [300.0, 600.0, 1200.0] {
            let full = chung_gas_viscosity(t, tc, vc, omega, w);
            assert!((f * t.sqrt() / neufeld_omega_viscosity(1.2593 * t / tc) / full - 1.0).abs() < 1e-14);
        }
    }

    /// Neufeld collision integral check values Ω_D(1) = 1.4405, Ω_D(2) = 1.0754 (physics notes B.10).
    #[test]
    fn neufeld_values() {
        assert!((neufeld_omega_diffusion(1.0) - 1.4405).abs() < 2e-4);
        assert!((neufeld_omega_diffusion(2.0) - 1.0754).abs() < 2e-4);
    }
}
