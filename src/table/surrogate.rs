//! An equivalent single-component surrogate of a multicomponent fuel, fitted with the droplet model.
//!
//! The surrogate is one pseudo-component whose liquid density, heat capacity, viscosity, conductivity and
//! surface tension are those of the fuel's initial liquid (least-squares fits of the mixture rules over the
//! liquid range), whose vapour (ideal-gas cp, viscosity, conductivity, Fuller diffusion volume) is the fuel's
//! initial composition as a vapour — the composition of all the vapour a droplet releases over its life —
//! and whose molar mass and critical constants are the initial liquid's (mean molar mass, Kay's rule).
//!
//! Two properties are fitted to droplet runs:
//! - the vapour-pressure curve is the initial liquid's bubble-pressure curve Σ x_i p_sat,i(T), fitted in the
//!   form ln p = A + B/T + C ln T, times a volatility factor `f`;
//! - the latent heat is the initial liquid's mass-weighted latent heat, fitted in the DIPPR-106 form, times a
//!   latent-heat factor `g`.
//!
//! At the reference condition `g` is found for each `f` so that the surrogate's droplet lifetime equals the
//! mixture's (inner root find on ln g), and `f` so that the time to 10 % evaporated (t10, the heat-up measure)
//! matches as well (outer root find on ln f). Both root finds bracket first and then use Brent's method
//! (`numerics::root`), so they cannot diverge. When t10 cannot be matched within the bracket the
//! lifetime is still matched and the t10 error is reported. The fit uses the well-mixed (rapid-mixing,
//! uniform-temperature) droplet model.

use std::sync::Arc;

use serde::Serialize;

use crate::data::component::Formula;
use crate::data::{Component, Constants, Correlation, Form, Sourced};
use crate::fuel::Fuel;
use crate::model::droplet::NoHistory;
use crate::model::{simulate, DropletInputs, Motion};
use crate::props::gas::AmbientGas;
use crate::props::liquid;

use super::fit::{fit_property, least_squares, relative_error, FitForm, FitVariable};
use crate::numerics::root::{brent_from, Tolerance};
use super::{range_limits, vapor_state, TableError};

/// Source marker of every surrogate value.
pub const SOURCE: &str = "estimated:surrogate-fit";
/// Relative tolerance on the lifetime match at the reference condition \[-\].
pub const LIFETIME_TOLERANCE: f64 = 1e-5;
/// Relative tolerance on the t10 match at the reference condition \[-\].
pub const T10_TOLERANCE: f64 = 1e-3;
/// Bracket of the volatility factor f searched for the t10 match \[-\].
pub const VOLATILITY_BRACKET: (f64, f64) = (1e-3, 1e3);
/// Number of points of the least-squares fits of the mixture curves.
pub const FIT_POINTS: usize = 121;

/// A droplet condition for the surrogate fit (SI).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ReferenceCondition {
    /// Ambient gas temperature \[K\].
    pub ambient_temperature: f64,
    /// Ambient pressure \[Pa\].
    pub pressure: f64,
    /// Initial droplet diameter \[m\].
    pub diameter: f64,
    /// Constant relative velocity \[m/s\].
    pub velocity: f64,
    /// Initial droplet temperature \[K\].
    pub droplet_temperature: f64,
}

impl Default for ReferenceCondition {
    fn default() -> Self {
        ReferenceCondition { ambient_temperature: 800.0, pressure: 101_325.0, diameter: 50e-6, velocity: 0.0, droplet_temperature: 300.0 }
    }
}

/// Default conditions at which the fitted surrogate is compared with the mixture: (ambient T \[K\], p \[Pa\]).
pub const DEFAULT_EVALUATION: [(f64, f64); 6] = [(500.0, 1e5), (800.0, 1e5), (1100.0, 1e5), (500.0, 1e6), (800.0, 1e6), (1100.0, 1e6)];

/// How to fit the surrogate and where to report its error.
#[derive(Debug, Clone, PartialEq)]
pub struct SurrogateOptions {
    /// The fit condition.
    pub reference: ReferenceCondition,
    /// Other (ambient temperature, pressure) pairs; diameter, velocity and droplet temperature as the reference.
    pub evaluation: Vec<(f64, f64)>,
}

impl Default for SurrogateOptions {
    fn default() -> Self {
        SurrogateOptions { reference: ReferenceCondition::default(), evaluation: DEFAULT_EVALUATION.to_vec() }
    }
}

/// The two fitted factors.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SurrogateParameters {
    /// Multiplier on the initial liquid's bubble-pressure curve \[-\].
    pub volatility_factor: f64,
    /// Multiplier on the initial liquid's latent heat \[-\].
    pub latent_heat_factor: f64,
}

/// Summary numbers of one droplet run \[s, K\].
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RunSummary {
    /// Lifetime (0.1 % of the mass left) \[s\].
    pub lifetime: Option<f64>,
    /// Time to 10 % evaporated \[s\].
    pub t10: Option<f64>,
    /// Time to 50 % evaporated \[s\].
    pub t50: Option<f64>,
    /// Time to 90 % evaporated \[s\].
    pub t90: Option<f64>,
    /// End of the heat-up period \[s\].
    pub heatup_end: Option<f64>,
    /// Highest surface temperature \[K\].
    pub max_surface_temperature: f64,
}

/// Mixture and surrogate at one condition.
#[derive(Debug, Clone, Serialize)]
pub struct ConditionComparison {
    /// The condition.
    pub condition: ReferenceCondition,
    /// Full mixture.
    pub mixture: RunSummary,
    /// Surrogate.
    pub surrogate: RunSummary,
    /// Surrogate lifetime / mixture lifetime − 1 \[-\] (None if either did not evaporate).
    pub lifetime_error: Option<f64>,
    /// Surrogate t10 / mixture t10 − 1 \[-\].
    pub t10_error: Option<f64>,
}

/// The mixture curves a surrogate is made of, before the two factors are applied.
#[derive(Debug, Clone)]
pub struct SurrogateBasis {
    /// The surrogate with f = g = 1.
    pub base: Component,
    /// Liquid fit range \[K\].
    pub liquid_range: (f64, f64),
    /// Vapour fit range \[K\].
    pub vapor_range: (f64, f64),
    /// Largest relative deviation of each fitted curve from the mixture rule over its fit range, by
    /// property key (before the factors).
    pub fit_errors: Vec<(&'static str, f64)>,
}

fn sourced(value: f64, note: &str) -> Sourced {
    Sourced { value, source: SOURCE.into(), uncertainty: None, note: if note.is_empty() { None } else { Some(note.into()) }, kind: None }
}

fn correlation(form: Form, range: (f64, f64)) -> Correlation {
    Correlation { form, factor: 1.0, t_min: range.0, t_max: range.1, source: SOURCE.into(), uncertainty: 0.0 }
}

fn points(range: (f64, f64)) -> Vec<f64> {
    (0..FIT_POINTS).map(|i| range.0 + (range.1 - range.0) * i as f64 / (FIT_POINTS - 1) as f64).collect()
}

/// Exponents E tried for the D T^E term of the DIPPR-101 fits (None = no D term).
pub const DIPPR101_EXPONENTS: [Option<f64>; 5] = [None, Some(2.0), Some(6.0), Some(-2.0), Some(-10.0)];

/// Fit ln y = A + B/T + C ln T + D T^E (DIPPR 101) for each exponent of [`DIPPR101_EXPONENTS`]; keep the
/// candidate with the smallest maximum relative error among those that pass `acceptable` (a shape check,
/// e.g. monotonic over the range the model may evaluate). Returns \[A, B, C, D, E\] and the max error.
fn fit_dippr101(ts: &[f64], ys: &[f64], acceptable: impl Fn(&Form) -> bool) -> Result<([f64; 5], f64), TableError> {
    let rhs: Vec<f64> = ys.iter().map(|y| y.ln()).collect();
    let mut best: Option<([f64; 5], f64)> = None;
    for e in DIPPR101_EXPONENTS {
        let rows: Vec<Vec<f64>> = ts
            .iter()
            .map(|t| {
                let mut r = vec![1.0, 1.0 / t, t.ln()];
                if let Some(e) = e {
                    r.push(t.powf(e));
                }
                r
            })
            .collect();
        let Some(c) = least_squares(&rows, &rhs) else { continue };
        let coef = match e {
            Some(e) => [c[0], c[1], c[2], c[3], e],
            None => [c[0], c[1], c[2], 0.0, 0.0],
        };
        let form = Form::Dippr101(coef);
        if !acceptable(&form) {
            continue;
        }
        let err = ts.iter().zip(ys).map(|(t, y)| relative_error(form.eval(*t, 0.0, 1e4), *y)).fold(0.0, f64::max);
        if err.is_finite() && best.is_none_or(|b| err < b.1) {
            best = Some((coef, err));
        }
    }
    best.ok_or_else(|| TableError::Fit("surrogate: no ln-form (DIPPR 101) fit with an acceptable shape".into()))
}

/// True when `form` is strictly monotonic (increasing if `increasing`) on a fine grid over \[lo, hi\].
fn monotonic(form: &Form, lo: f64, hi: f64, increasing: bool) -> bool {
    let n = 400;
    let mut prev = form.eval(lo, 0.0, 1e4);
    for i in 1..=n {
        let v = form.eval(lo + (hi - lo) * f64::from(i) / f64::from(n), 0.0, 1e4);
        if !v.is_finite() || (increasing && v <= prev) || (!increasing && v >= prev) {
            return false;
        }
        prev = v;
    }
    true
}

/// Fit y = A (1 − Tr)^(B + C Tr + D Tr²) (DIPPR 106) with critical temperature `tc`; coefficients and max error.
fn fit_dippr106(ts: &[f64], ys: &[f64], tc: f64) -> Result<([f64; 5], f64), TableError> {
    let rows: Vec<Vec<f64>> = ts
        .iter()
        .map(|t| {
            let tr = t / tc;
            let l = (1.0 - tr).ln();
            vec![1.0, l, tr * l, tr * tr * l]
        })
        .collect();
    let rhs: Vec<f64> = ys.iter().map(|y| y.ln()).collect();
    let c = least_squares(&rows, &rhs).ok_or_else(|| TableError::Fit("surrogate: DIPPR-106 fit failed".into()))?;
    let coef = [c[0].exp(), c[1], c[2], c[3], 0.0];
    let form = Form::Dippr106 { c: coef, tc };
    let err = ts.iter().zip(ys).map(|(t, y)| relative_error(form.eval(*t, 0.0, 1e4), *y)).fold(0.0, f64::max);
    Ok((coef, err))
}

/// Fit a DIPPR-100 polynomial (degree ≤ 4) through the scaled-variable least-squares fit; coefficients, error.
fn fit_dippr100(ts: &[f64], ys: &[f64], what: &str) -> Result<([f64; 5], f64), TableError> {
    let f = fit_property(what, ts, ys, FitForm::Linear, FitVariable::Temperature).ok_or_else(|| TableError::Fit(format!("surrogate: {what} fit failed")))?;
    let raw = f.raw_polynomial().ok_or_else(|| TableError::Fit(format!("surrogate: {what} fit is not a polynomial in T")))?;
    let form = Form::Dippr100(raw);
    let err = ts.iter().zip(ys).map(|(t, y)| relative_error(form.eval(*t, 0.0, 1e4), *y)).fold(0.0, f64::max);
    Ok((raw, err))
}

/// A kebab-case id from a fuel name.
fn surrogate_id(name: &str) -> String {
    let mut s: String = name.to_ascii_lowercase().chars().map(|c| if c.is_ascii_alphanumeric() { c } else { '-' }).collect();
    while s.contains("--") {
        s = s.replace("--", "-");
    }
    let s = s.trim_matches('-');
    if s.is_empty() {
        "surrogate".into()
    } else {
        format!("{s}-surrogate")
    }
}

/// Root of an increasing function on \[lo, hi\] (Brent's method, `numerics`); None without a sign change.
fn increasing_root(f: impl FnMut(f64) -> f64, lo: f64, hi: f64) -> Option<f64> {
    crate::numerics::root::brent(f, lo, hi, Tolerance::relative(1e-12)).ok().map(|r| r.x)
}

impl SurrogateBasis {
    /// Fit the mixture curves of `fuel`'s initial liquid over `liquid_range` and `vapor_range` \[K\]; the
    /// Fuller diffusion volume is matched in `gas`.
    pub fn new(fuel: &Fuel, gas: &AmbientGas, liquid_range: (f64, f64), vapor_range: (f64, f64)) -> Result<Self, TableError> {
        let comps = &fuel.components;
        let w = &fuel.mass_fractions;
        let x = fuel.mole_fractions();
        if !(liquid_range.0 > 0.0 && liquid_range.1 > liquid_range.0 && vapor_range.0 > 0.0 && vapor_range.1 > vapor_range.0) {
            return Err(TableError::Fit(format!("surrogate: empty fit range {liquid_range:?} / {vapor_range:?}")));
        }
        let kay = |f: &dyn Fn(&Component) -> f64| -> f64 { comps.iter().zip(&x).map(|(c, x)| x * f(c)).sum() };
        let molar_mass = fuel.molar_mass();
        let tc = kay(&|c| c.critical_temperature()).max(liquid_range.1 / 0.97);
        let pc = kay(&|c| c.critical_pressure());
        let vc = kay(&|c| c.constants.critical_volume.value);
        let omega = kay(&|c| c.acentric_factor());
        let lts = points(liquid_range);
        let vts = points(vapor_range);
        let mut errors = vec![];
        let mut fit = |key: &'static str, r: Result<([f64; 5], f64), TableError>| -> Result<[f64; 5], TableError> {
            let (c, e) = r?;
            errors.push((key, e));
            Ok(c)
        };
        let col = |f: &dyn Fn(f64) -> f64, ts: &[f64]| -> Vec<f64> { ts.iter().map(|t| f(*t)).collect() };
        // vapour pressure: increasing up to 1.5 Tc (where the bubble-point search of the model looks)
        let p_shape = |f: &Form| monotonic(f, 0.5 * liquid_range.0, 1.5 * tc, true);
        let p = fit("vapor-pressure", fit_dippr101(&lts, &col(&|t| liquid::bubble_pressure(comps, &x, t), &lts), p_shape))?;
        let l = fit("latent-heat", fit_dippr106(&lts, &col(&|t| liquid::latent_heat(comps, w, t), &lts), tc))?;
        let rho = fit("liquid-density", fit_dippr100(&lts, &col(&|t| liquid::density(comps, w, t), &lts), "liquid density"))?;
        let cp = fit("liquid-heat-capacity", fit_dippr100(&lts, &col(&|t| liquid::heat_capacity(comps, w, t), &lts), "liquid heat capacity"))?;
        let mu_shape = |f: &Form| monotonic(f, liquid_range.0, liquid_range.1, false);
        let mu = fit("liquid-viscosity", fit_dippr101(&lts, &col(&|t| liquid::viscosity(comps, &x, t), &lts), mu_shape))?;
        let k = fit("liquid-conductivity", fit_dippr100(&lts, &col(&|t| liquid::conductivity(comps, w, t), &lts), "liquid conductivity"))?;
        let sigma = fit("surface-tension", fit_dippr106(&lts, &col(&|t| liquid::surface_tension(comps, &x, t), &lts), tc))?;
        let vapor = |t: f64| vapor_state(comps, w, gas, t, 1e5);
        let cpv = fit("ideal-gas-heat-capacity", fit_dippr100(&vts, &col(&|t| vapor(t).cp, &vts), "ideal-gas heat capacity"))?;
        let muv = fit("vapor-viscosity", fit_dippr100(&vts, &col(&|t| vapor(t).viscosity, &vts), "vapour viscosity"))?;
        let kv = fit("vapor-conductivity", fit_dippr100(&vts, &col(&|t| vapor(t).conductivity, &vts), "vapour conductivity"))?;
        // Fuller volume whose coefficient equals the mass-weighted mean of the components' coefficients.
        let target: f64 = comps.iter().zip(w).map(|(c, w)| w * gas.fuller_coefficient_of(c.molar_mass(), c.diffusion_volume())).sum();
        let diffusion_volume = increasing_root(|v| target - gas.fuller_coefficient_of(molar_mass, v), 1.0, 1e5)
            .ok_or_else(|| TableError::Fit("surrogate: no Fuller diffusion volume matches the mixture".into()))?;
        let limits = range_limits(comps, w, 101_325.0, crate::props::activity::ActivityModel::Ideal);
        let melting = limits.freezing_point.unwrap_or_else(|| kay(&|c| c.constants.melting_point.value));
        let (lr, vr) = (liquid_range, vapor_range);
        let vapor_pressure = correlation(Form::Dippr101(p), lr);
        let tb = increasing_root(|t| vapor_pressure.eval(t).ln() - 101_325f64.ln(), 50.0, 2.0 * tc).unwrap_or_else(|| kay(&|c| c.normal_boiling_point()));
        let main = w.iter().enumerate().max_by(|a, b| a.1.total_cmp(b.1)).map(|(i, _)| i).unwrap_or(0);
        let atoms = |f: &dyn Fn(&Formula) -> u32| -> u32 { kay(&|c| f64::from(f(&c.formula))).round().max(0.0) as u32 };
        let base = Component {
            id: surrogate_id(&fuel.name),
            name: format!("single-component surrogate of {}", fuel.name),
            aliases: vec![],
            cas: String::new(),
            class: comps[main].class,
            formula: Formula { carbon: atoms(&|f| f.carbon), hydrogen: atoms(&|f| f.hydrogen), oxygen: atoms(&|f| f.oxygen) },
            joback_groups: vec![],
            unifac_groups: vec![],
            constants: Constants {
                molar_mass: sourced(molar_mass, "mean molar mass of the initial liquid"),
                normal_boiling_point: sourced(tb, "where the fitted vapour-pressure curve reaches 1 atm"),
                critical_temperature: sourced(tc, "Kay's rule (mole fractions), at least the fit range end / 0.97"),
                critical_pressure: sourced(pc, "Kay's rule (mole fractions)"),
                critical_volume: sourced(vc, "Kay's rule (mole fractions)"),
                acentric_factor: sourced(omega, "mole-fraction average"),
                melting_point: sourced(melting, "ideal-solubility freezing point of the initial liquid"),
                enthalpy_of_fusion: None,
                density_15c: Some(sourced(liquid::density(comps, w, 288.15), "initial liquid, ideal mixing")),
                lower_heating_value: sourced(comps.iter().zip(w).map(|(c, w)| w * c.constants.lower_heating_value.value).sum(), "mass-fraction average"),
                cetane_number: Sourced { kind: comps[main].constants.cetane_number.kind.clone(), ..sourced(kay(&|c| c.constants.cetane_number.value), "mole-fraction average (not fitted)") },
                flash_point: None,
                rackett_z: None,
                diffusion_volume: Some(sourced(diffusion_volume, "matches the mass-weighted mean Fuller coefficient of the components in the ambient gas")),
                lennard_jones_sigma: None,
                lennard_jones_epsilon_over_k: None,
            },
            vapor_pressure,
            liquid_density: correlation(Form::Dippr100(rho), lr),
            latent_heat: correlation(Form::Dippr106 { c: l, tc }, lr),
            liquid_heat_capacity: correlation(Form::Dippr100(cp), lr),
            liquid_viscosity: correlation(Form::Dippr101(mu), lr),
            liquid_conductivity: correlation(Form::Dippr100(k), lr),
            surface_tension: correlation(Form::Dippr106 { c: sigma, tc }, lr),
            ideal_gas_heat_capacity: correlation(Form::Dippr100(cpv), vr),
            vapor_viscosity: correlation(Form::Dippr100(muv), vr),
            vapor_conductivity: correlation(Form::Dippr100(kv), vr),
            origin: "dropcut table: surrogate fit".into(),
            property_scales: [1.0; 10],
            extensions: std::sync::OnceLock::new(),
            kernels: Default::default(),
        };
        Ok(SurrogateBasis { base, liquid_range, vapor_range, fit_errors: errors })
    }

    /// The surrogate component for the factors `params`.
    pub fn component(&self, params: SurrogateParameters) -> Arc<Component> {
        let mut c = self.base.clone();
        if let Form::Dippr101(ref mut a) = c.vapor_pressure.form {
            a[0] += params.volatility_factor.ln();
        }
        if let Form::Dippr106 { ref mut c, .. } = c.latent_heat.form {
            c[0] *= params.latent_heat_factor;
        }
        let tb = increasing_root(|t| c.vapor_pressure.eval(t).ln() - 101_325f64.ln(), 50.0, 2.0 * c.critical_temperature());
        if let Some(tb) = tb {
            c.constants.normal_boiling_point.value = tb;
        }
        Arc::new(c)
    }
}

/// Run one droplet of `fuel` at `cond` in `gas` (well-mixed liquid, constant slip velocity).
pub fn run(fuel: &Fuel, gas: &AmbientGas, cond: &ReferenceCondition) -> Result<RunSummary, TableError> {
    let mut inp = DropletInputs::new(fuel.clone(), gas.clone(), cond.ambient_temperature, cond.pressure, cond.diameter, cond.droplet_temperature);
    inp.motion = Motion::Fixed { velocity: cond.velocity };
    let r = simulate(&inp, &mut NoHistory)?;
    let o = r.outcome;
    Ok(RunSummary { lifetime: o.lifetime, t10: o.t10, t50: o.t50, t90: o.t90, heatup_end: o.heatup_end, max_surface_temperature: o.max_surface_temperature })
}

/// Compare the mixture and a surrogate component at one condition.
pub fn compare(fuel: &Fuel, surrogate: &Arc<Component>, gas: &AmbientGas, cond: &ReferenceCondition) -> Result<ConditionComparison, TableError> {
    let mixture = run(fuel, gas, cond)?;
    let sur = run(&Fuel::pure(surrogate.clone()), gas, cond)?;
    let err = |a: Option<f64>, b: Option<f64>| match (a, b) {
        (Some(s), Some(m)) if m > 0.0 => Some(s / m - 1.0),
        _ => None,
    };
    Ok(ConditionComparison { condition: *cond, lifetime_error: err(sur.lifetime, mixture.lifetime), t10_error: err(sur.t10, mixture.t10), mixture, surrogate: sur })
}

/// A fitted surrogate with its errors.
#[derive(Debug, Clone)]
pub struct Surrogate {
    /// Fitted mixture curves.
    pub basis: SurrogateBasis,
    /// Fitted factors.
    pub parameters: SurrogateParameters,
    /// The surrogate component.
    pub component: Arc<Component>,
    /// The fit condition.
    pub reference: ReferenceCondition,
    /// Mixture and surrogate at the reference condition.
    pub at_reference: ConditionComparison,
    /// Mixture and surrogate at the evaluation conditions.
    pub evaluations: Vec<ConditionComparison>,
    /// True when t10 was matched as well as the lifetime.
    pub t10_matched: bool,
    /// Droplet runs made by the fit (surrogate runs).
    pub fit_runs: usize,
    /// Notes on the fit.
    pub notes: Vec<String>,
}

impl Surrogate {
    /// The latent-heat scaling cells of a surrogate-table row with latent heat `latent_heat` (None outside the
    /// liquid range): the factor g, the unscaled latent heat L/g and the excess L − L/g \[-, J/kg, J/kg\].
    pub fn scaling_cells(&self, latent_heat: Option<f64>) -> [Option<f64>; 3] {
        let g = self.parameters.latent_heat_factor;
        match latent_heat {
            Some(l) => [Some(g), Some(l / g), Some(l - l / g)],
            None => [None, None, None],
        }
    }
}

/// A point of the outer problem: (ln f, t10 residual, inner solution).
type Point = (f64, f64, Trial);

/// One evaluated point of the inner problem.
#[derive(Clone, Copy)]
struct Trial {
    g: f64,
    residual: f64,
    summary: RunSummary,
}

struct Fitter<'a> {
    basis: &'a SurrogateBasis,
    gas: &'a AmbientGas,
    cond: ReferenceCondition,
    target_life: f64,
    target_t10: f64,
    runs: usize,
}

impl Fitter<'_> {
    fn run(&mut self, f: f64, g: f64) -> Result<RunSummary, TableError> {
        self.runs += 1;
        let c = self.basis.component(SurrogateParameters { volatility_factor: f, latent_heat_factor: g });
        run(&Fuel::pure(c), self.gas, &self.cond)
    }

    /// ln(lifetime/target); a droplet that does not evaporate counts as far too slow.
    fn life_residual(&self, s: &RunSummary) -> f64 {
        match s.lifetime {
            Some(l) if l > 0.0 => (l / self.target_life).ln(),
            _ => 50.0,
        }
    }

    /// Latent-heat factor g matching the lifetime for volatility factor f (lifetime increases with g).
    fn match_lifetime(&mut self, f: f64, g_start: f64) -> Result<Trial, TableError> {
        let eval = |this: &mut Self, g: f64| -> Result<Trial, TableError> {
            let s = this.run(f, g)?;
            Ok(Trial { g, residual: this.life_residual(&s), summary: s })
        };
        let mut a = eval(self, g_start)?;
        if a.residual.abs() <= LIFETIME_TOLERANCE {
            return Ok(a);
        }
        // bracket: move g against the sign of the residual, growing steps
        let mut factor = 1.3f64;
        let mut b = a;
        for _ in 0..40 {
            let g = if a.residual > 0.0 { b.g / factor } else { b.g * factor };
            if !(1e-4..=1e4).contains(&g) {
                break;
            }
            let t = eval(self, g)?;
            if t.residual.abs() <= LIFETIME_TOLERANCE {
                return Ok(t);
            }
            if (t.residual > 0.0) != (a.residual > 0.0) {
                b = t;
                break;
            }
            a = t;
            b = t;
            factor *= 1.5;
        }
        if (a.residual > 0.0) == (b.residual > 0.0) {
            return Err(TableError::Fit(format!(
                "surrogate: no latent-heat factor in 1e-4..1e4 reproduces the mixture lifetime {:.4e} s (volatility factor {f:.4e})",
                self.target_life
            )));
        }
        // Brent's method in ln g from the bracket, keeping the best trial
        let (lo, hi) = if a.residual < 0.0 { (a, b) } else { (b, a) };
        let mut best = if lo.residual.abs() < hi.residual.abs() { lo } else { hi };
        let mut failure: Option<TableError> = None;
        let tolerance = Tolerance::absolute(1e-12).with_f_abs(LIFETIME_TOLERANCE).with_max_iterations(60);
        let _ = brent_from(
            |x| {
                if failure.is_some() {
                    return f64::NAN;
                }
                match eval(self, x.exp()) {
                    Ok(t) => {
                        if t.residual.abs() < best.residual.abs() {
                            best = t;
                        }
                        t.residual
                    }
                    Err(e) => {
                        failure = Some(e);
                        f64::NAN
                    }
                }
            },
            (lo.g.ln(), lo.residual),
            (hi.g.ln(), hi.residual),
            tolerance,
        );
        if let Some(e) = failure {
            return Err(e);
        }
        Ok(best)
    }
}

/// Fit the surrogate of `fuel` in `gas`: liquid curves over the table's liquid grid (extended down to the
/// reference droplet temperature) up to 0.95 of the lowest major critical temperature, vapour curves over
/// `vapor_range` (extended to the highest ambient temperature of the runs).
pub fn fit_surrogate(fuel: &Fuel, gas: &AmbientGas, liquid_grid: &super::TemperatureGrid, vapor_range: (f64, f64), opts: &SurrogateOptions) -> Result<Surrogate, TableError> {
    let cond = opts.reference;
    let limits = range_limits(&fuel.components, &fuel.mass_fractions, cond.pressure, crate::props::activity::ActivityModel::Ideal);
    let t_hi = super::END_CRITICAL_FRACTION * limits.critical_temperature;
    let t_lo = liquid_grid.from.min(cond.droplet_temperature);
    let t_max_ambient = opts.evaluation.iter().map(|e| e.0).chain(std::iter::once(cond.ambient_temperature)).fold(0.0, f64::max);
    let vr = (vapor_range.0.min(t_lo), vapor_range.1.max(t_max_ambient));
    let basis = SurrogateBasis::new(fuel, gas, (t_lo, t_hi.max(t_lo + 1.0)), vr)?;
    let mixture = run(fuel, gas, &cond)?;
    let (Some(life), Some(t10)) = (mixture.lifetime, mixture.t10) else {
        return Err(TableError::Input {
            option: "reference",
            value: format!("ambient-temperature={} K, pressure={} Pa", cond.ambient_temperature, cond.pressure),
            message: "the mixture droplet does not evaporate within 30 s at this condition; choose a hotter reference".into(),
        });
    };
    let mut fitter = Fitter { basis: &basis, gas, cond, target_life: life, target_t10: t10, runs: 0 };
    let mut notes = vec![];
    // outer: ln f such that t10 matches, at matched lifetime
    let t10_residual = |t: &Trial, target: f64| -> f64 {
        match t.summary.t10 {
            Some(v) if v > 0.0 => (v / target).ln(),
            _ => 50.0,
        }
    };
    let mut evals: Vec<(f64, Trial, f64)> = vec![]; // (ln f, trial, residual)
    let mut g = 1.0;
    let evaluate = |fitter: &mut Fitter, u: f64, g: &mut f64, evals: &mut Vec<(f64, Trial, f64)>| -> Result<(Trial, f64), TableError> {
        let t = fitter.match_lifetime(u.exp(), *g)?;
        *g = t.g;
        let r = t10_residual(&t, fitter.target_t10);
        evals.push((u, t, r));
        Ok((t, r))
    };
    let (u_lo, u_hi) = (VOLATILITY_BRACKET.0.ln(), VOLATILITY_BRACKET.1.ln());
    let (t0, r0) = evaluate(&mut fitter, 0.0, &mut g, &mut evals)?;
    let mut chosen: (f64, Trial) = (0.0, t0);
    let mut matched = r0.abs() <= T10_TOLERANCE;
    if !matched {
        let (t1, r1) = evaluate(&mut fitter, std::f64::consts::LN_2, &mut g, &mut evals)?;
        // walk towards the root: direction from the local slope, growing steps
        let slope = (r1 - r0) / std::f64::consts::LN_2;
        let dir = if slope == 0.0 { 1.0 } else if (r0 > 0.0) == (slope > 0.0) { -1.0 } else { 1.0 };
        let (mut a, mut ra, mut ta) = if dir > 0.0 { (std::f64::consts::LN_2, r1, t1) } else { (0.0, r0, t0) };
        let mut bracket: Option<(Point, Point)> = None;
        if (r0 > 0.0) != (r1 > 0.0) {
            bracket = Some(((0.0, r0, t0), (std::f64::consts::LN_2, r1, t1)));
        }
        let mut step = std::f64::consts::LN_2;
        while bracket.is_none() {
            let u = a + dir * step;
            if u < u_lo || u > u_hi {
                break;
            }
            let (t, r) = evaluate(&mut fitter, u, &mut g, &mut evals)?;
            if (r > 0.0) != (ra > 0.0) {
                bracket = Some(((a, ra, ta), (u, r, t)));
                break;
            }
            a = u;
            ra = r;
            ta = t;
            step *= 1.5;
        }
        if let Some((p, q)) = bracket {
            // Brent's method in ln f; every evaluation is kept in `evals` and the best one is chosen below
            let mut failure: Option<TableError> = None;
            let tolerance = Tolerance::absolute(1e-10).with_f_abs(T10_TOLERANCE).with_max_iterations(40);
            let _ = brent_from(
                |u| {
                    if failure.is_some() {
                        return f64::NAN;
                    }
                    match evaluate(&mut fitter, u, &mut g, &mut evals) {
                        Ok((_, r)) => r,
                        Err(e) => {
                            failure = Some(e);
                            f64::NAN
                        }
                    }
                },
                (p.0, p.1),
                (q.0, q.1),
                tolerance,
            );
            if let Some(e) = failure {
                return Err(e);
            }
        }
        // the best evaluated point (all have the lifetime matched)
        let best = evals.iter().min_by(|a, b| a.2.abs().total_cmp(&b.2.abs())).map(|e| (e.0, e.1, e.2)).unwrap_or((0.0, t0, r0));
        chosen = (best.0, best.1);
        matched = best.2.abs() <= T10_TOLERANCE;
        if !matched {
            notes.push(format!(
                "t10 could not be matched for a volatility factor in {:.0e}..{:.0e}: the lifetime is matched and the t10 error at the reference is {:+.2} %",
                VOLATILITY_BRACKET.0,
                VOLATILITY_BRACKET.1,
                100.0 * ((best.2).exp() - 1.0)
            ));
        }
    }
    let parameters = SurrogateParameters { volatility_factor: chosen.0.exp(), latent_heat_factor: chosen.1.g };
    let component = basis.component(parameters);
    let at_reference = compare(fuel, &component, gas, &cond)?;
    let mut evaluations = vec![];
    for (t_inf, p) in &opts.evaluation {
        let c = ReferenceCondition { ambient_temperature: *t_inf, pressure: *p, ..cond };
        evaluations.push(compare(fuel, &component, gas, &c)?);
    }
    let runs = fitter.runs;
    Ok(Surrogate { basis, parameters, component, reference: cond, at_reference, evaluations, t10_matched: matched, fit_runs: runs, notes })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;

    #[test]
    fn factors_scale_vapor_pressure_and_latent_heat_only() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("test-heptane-decane", &lib).unwrap();
        let gas = AmbientGas::air(&lib).unwrap();
        let b = SurrogateBasis::new(&fuel, &gas, (240.0, 500.0), (240.0, 1500.0)).unwrap();
        let one = b.component(SurrogateParameters { volatility_factor: 1.0, latent_heat_factor: 1.0 });
        let s = b.component(SurrogateParameters { volatility_factor: 2.0, latent_heat_factor: 1.5 });
        for t in [260.0, 350.0, 450.0] {
            assert!((s.vapor_pressure(t) / one.vapor_pressure(t) - 2.0).abs() < 1e-12);
            assert!((s.latent_heat(t) / one.latent_heat(t) - 1.5).abs() < 1e-12);
            assert!((s.liquid_density(t) - one.liquid_density(t)).abs() < 1e-12 * one.liquid_density(t));
            assert!((s.ideal_gas_heat_capacity(t) - one.ideal_gas_heat_capacity(t)).abs() < 1e-12 * one.ideal_gas_heat_capacity(t));
        }
        // a more volatile surrogate boils lower
        assert!(s.normal_boiling_point() < one.normal_boiling_point());
        // the base curves follow the mixture rules closely
        for (k, e) in &b.fit_errors {
            assert!(*e < 0.03, "{k}: {e}");
        }
        let x = fuel.mole_fractions();
        for t in [300.0, 400.0] {
            let p = liquid::bubble_pressure(&fuel.components, &x, t);
            assert!((one.vapor_pressure(t) / p - 1.0).abs() < 0.01);
            assert!((one.liquid_density(t) / liquid::density(&fuel.components, &fuel.mass_fractions, t) - 1.0).abs() < 0.005);
        }
    }

    #[test]
    fn ids() {
        assert_eq!(surrogate_id("Jet A-1 (batch 7)"), "jet-a-1-batch-7-surrogate");
        assert_eq!(surrogate_id("--"), "surrogate");
    }
}
