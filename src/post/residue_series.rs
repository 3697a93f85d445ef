//! Indicator values of a series of residues of one parent liquid (the residues along one droplet run): the
//! values [`indicators`] gives each residue, with the per-component work done once for the series and each
//! iterative solve starting where the previous residue's ended.
//!
//! Done once: the basis weights, 15 °C densities and cetane numbers of the components; their pure flash points
//! and vapour pressures there (the Liaw terms); their viscosities and densities at the viscosity temperatures.
//! Per residue, for an ideal liquid whose components are all present: the simulated distillation through
//! [`IsobaricSeries`] (its first bubble solve starts from the previous residue's first bubble point), and the
//! Liaw flash point by Halley's method in 1/T on the analytic vapour-pressure derivatives from the previous
//! residue's flash point. The blends (density, viscosity, cetane number) have the bits of [`indicators`]; the
//! bubble point and the distillation temperatures agree with it to the bubble solve's tolerance (about
//! 1e-8 K) and the flash point to about 1e-10 K. Anything else (activity coefficients, the Refutas rule, other
//! indicators, options [`indicators`] refuses) is handed to
//! [`indicators`] itself.

use std::sync::Arc;

use crate::data::Component;
use crate::props::activity::ActivityModel;
use crate::props::kernels::VaporPressures;
use crate::props::liquid;

use super::indicators::{blend_cetane, component_flash_point, indicators, liaw_flash_point, near_critical, IndicatorOptions, IndicatorSelection, ViscosityRule};
use super::indicators::{T_40C, T_MINUS_20C, T_MINUS_40C};
use super::rayleigh::{basis_weights, slopes_in_inverse_temperature, taylor_move, IsobaricSeries, LogSumMoments, POLISH_LIMIT, POLISH_RESIDUAL};
use super::{normalised, PostError};

/// Keys the series computes itself (the others go to [`indicators`]).
const SERIES_KEYS: [&str; 13] = [
    "bubble_point_K",
    "initial_boiling_point_K",
    "t10_K",
    "t20_K",
    "t50_K",
    "t90_K",
    "final_boiling_point_K",
    "flash_point_K",
    "density_15C_kg_m3",
    "kinematic_viscosity_minus40C_m2_s",
    "kinematic_viscosity_minus20C_m2_s",
    "kinematic_viscosity_40C_m2_s",
    "dcn",
];

/// Node of a distillation key in the list of evaporated fractions 0, 0.1, 0.2, 0.5, 0.9, final fraction.
fn curve_node(key: &str) -> Option<usize> {
    match key {
        "bubble_point_K" | "initial_boiling_point_K" => Some(0),
        "t10_K" => Some(1),
        "t20_K" => Some(2),
        "t50_K" => Some(3),
        "t90_K" => Some(4),
        "final_boiling_point_K" => Some(5),
        _ => None,
    }
}

/// Residual tolerance of the flash-point solve on ln Σ x_i p_sat,i(T)/p_sat,i(T_fp,i); 1e-12 is about 1e-11 K.
const FLASH_TOL: f64 = 1e-12;

/// The Liaw flash point of one residue after another (ideal liquid, every component present).
struct FlashSeries<'a> {
    vapor_pressures: VaporPressures<'a>,
    /// x_i / p_sat,i(T_fp,i) of the current residue \[1/Pa\].
    a: Vec<f64>,
    /// 1 / p_sat,i(T_fp,i) \[1/Pa\].
    inv_p_fp: Vec<f64>,
    p_sat: Vec<f64>,
    slope_b: Vec<f64>,
    curvature_b: Vec<f64>,
    /// Temperature of the last sweep \[K\] (NaN before the first).
    t_swept: f64,
    /// Taylor moves of the kept values since the vapour pressures were last evaluated.
    polished: usize,
}

impl FlashSeries<'_> {
    /// ln Σ a_i p_sat,i(t), keeping p_sat,i and the derivatives of ln p_sat,i in b = 1/T.
    fn sweep(&mut self, t: f64) -> f64 {
        let mut s = 0.0;
        for i in 0..self.a.len() {
            let (ps, d1, d2) = self.vapor_pressures.at_with_slopes(i, t);
            self.p_sat[i] = ps;
            (self.slope_b[i], self.curvature_b[i]) = slopes_in_inverse_temperature(t, d1, d2);
            s += self.a[i] * ps;
        }
        self.t_swept = t;
        self.polished = 0;
        s.ln()
    }

    /// The residual at the last sweep for the current `a`, and its first and second derivatives in 1/T.
    fn at_last_sweep(&self) -> (f64, f64, f64) {
        let mut sums = LogSumMoments::default();
        for i in 0..self.a.len() {
            sums.add(self.a[i] * self.p_sat[i], self.slope_b[i], self.curvature_b[i]);
        }
        sums.derivatives()
    }

    /// The flash point of mole fractions `x` by Halley's method in 1/T; None when it does not converge inside
    /// the bracket of [`liaw_flash_point`] (the pure flash points of the components present, widened by 0.5 K;
    /// the caller then asks that function).
    fn solve(&mut self, x: &[f64], pure_fp: &[f64]) -> Option<f64> {
        let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
        for (((a, x), inv), tf) in self.a.iter_mut().zip(x).zip(&self.inv_p_fp).zip(pure_fp) {
            *a = x * inv;
            if *x > 0.0 {
                lo = lo.min(*tf);
                hi = hi.max(*tf);
            }
        }
        if !self.t_swept.is_finite() {
            let t0 = x.iter().zip(pure_fp).map(|(x, t)| x * t).sum::<f64>() / x.iter().sum::<f64>();
            self.sweep(t0);
        }
        let (lo, hi) = (lo - 0.5, hi + 0.5);
        for _ in 0..40 {
            let (g, d1, d2) = self.at_last_sweep();
            if !(g.is_finite() && d1.is_finite() && d1 < 0.0) {
                return None;
            }
            let t0 = self.t_swept;
            if g.abs() < FLASH_TOL {
                return (lo..=hi).contains(&t0).then_some(t0);
            }
            let b0 = 1.0 / t0;
            let factor = 1.0 - 0.5 * g * d2 / (d1 * d1);
            let newton = g / d1;
            let step = if factor.is_finite() && (0.5..=2.0).contains(&factor) { newton / factor } else { newton };
            let b1 = (b0 - step).clamp(b0 / 1.3, b0 * 1.3);
            if g.abs() < POLISH_RESIDUAL && self.polished < POLISH_LIMIT {
                // a short step: the kept values move along their Taylor series (as the distillation's bubble solve)
                self.polished += 1;
                let db = b1 - b0;
                for i in 0..self.a.len() {
                    taylor_move(&mut self.p_sat[i], &mut self.slope_b[i], self.curvature_b[i], db);
                }
                self.t_swept = 1.0 / b1;
            } else {
                self.sweep(1.0 / b1);
            }
        }
        None
    }
}

/// Indicator values of one residue after another of the same components (see the module documentation).
pub struct ResidueSeries<'a> {
    components: &'a [Arc<Component>],
    opts: IndicatorOptions,
    keys: Vec<&'static str>,
    /// Every residue goes to [`indicators`] (a key or an option the series does not handle).
    direct: bool,
    density_15c: Vec<f64>,
    pure_fp: Vec<f64>,
    /// (temperature, ln μ_i, ρ_i) of each requested viscosity temperature.
    viscosity: Vec<(f64, Vec<f64>, Vec<f64>)>,
    /// Last node of the distillation curve needed (None: no curve key).
    last_node: Option<usize>,
    distillation: Option<IsobaricSeries<'a>>,
    flash: Option<FlashSeries<'a>>,
}

/// Temperature of a kinematic-viscosity key \[K\].
fn viscosity_temperature(key: &str) -> Option<f64> {
    match key {
        "kinematic_viscosity_minus40C_m2_s" => Some(T_MINUS_40C),
        "kinematic_viscosity_minus20C_m2_s" => Some(T_MINUS_20C),
        "kinematic_viscosity_40C_m2_s" => Some(T_40C),
        _ => None,
    }
}

impl<'a> ResidueSeries<'a> {
    /// A series of residues of `components` for the indicator `keys` (keys of
    /// [`super::INDICATOR_KEYS`]) under `opts` (its selection is replaced by `keys`). The per-component work
    /// happens here; an unknown key is an error.
    pub fn new(components: &'a [Arc<Component>], opts: &IndicatorOptions, keys: &[&'static str]) -> Result<Self, PostError> {
        let selection = IndicatorSelection::of(keys)?;
        let opts = IndicatorOptions { selection, ..opts.clone() };
        let valid_options = opts.pressure.is_finite() && opts.pressure > 0.0 && opts.final_fraction > 0.9 && opts.final_fraction < 1.0 && opts.max_step.is_finite() && opts.max_step > 0.0 && opts.max_step <= 1.0;
        let has_viscosity = keys.iter().any(|k| viscosity_temperature(k).is_some());
        let direct = components.is_empty()
            || opts.activity != ActivityModel::Ideal
            || !valid_options
            || (has_viscosity && opts.viscosity_rule != ViscosityRule::GrunbergNissan)
            || keys.iter().any(|k| !SERIES_KEYS.contains(k));
        let mut series = ResidueSeries {
            components,
            opts,
            keys: keys.to_vec(),
            direct,
            density_15c: vec![],
            pure_fp: vec![],
            viscosity: vec![],
            last_node: keys.iter().filter_map(|k| curve_node(k)).max(),
            distillation: None,
            flash: None,
        };
        if direct {
            return Ok(series);
        }
        series.density_15c = components.iter().map(|c| c.density_15c()).collect();
        for t in keys.iter().filter_map(|k| viscosity_temperature(k)) {
            let ln_mu = components.iter().map(|c| c.liquid_viscosity(t).ln()).collect();
            let rho = components.iter().map(|c| c.liquid_density(t)).collect();
            series.viscosity.push((t, ln_mu, rho));
        }
        if series.last_node.is_some() {
            let weights = basis_weights(components, series.opts.recovery_basis);
            series.distillation = Some(IsobaricSeries::new(components, &weights, series.opts.pressure, ActivityModel::Ideal)?);
        }
        if keys.contains(&"flash_point_K") {
            series.pure_fp = components.iter().map(|c| component_flash_point(c).0).collect();
            let p_fp: Vec<f64> = components.iter().zip(&series.pure_fp).map(|(c, t)| c.vapor_pressure(*t)).collect();
            // a pure flash point without a positive vapour pressure: the direct function answers (None)
            if p_fp.iter().all(|p| p.is_finite() && *p > 0.0) {
                let n = components.len();
                series.flash = Some(FlashSeries {
                    vapor_pressures: VaporPressures::new(components),
                    a: vec![0.0; n],
                    inv_p_fp: p_fp.iter().map(|p| 1.0 / p).collect(),
                    p_sat: vec![0.0; n],
                    slope_b: vec![0.0; n],
                    curvature_b: vec![0.0; n],
                    t_swept: f64::NAN,
                    polished: 0,
                });
            }
        }
        Ok(series)
    }

    /// The value of each key (in the order given to [`Self::new`]) for the residue with these mass fractions,
    /// as [`indicators`] gives it (errors as [`indicators`]).
    pub fn values(&mut self, mass_fractions: &[f64]) -> Result<Vec<Option<f64>>, PostError> {
        if self.direct {
            return self.direct_values(mass_fractions);
        }
        let components = self.components;
        let w = normalised(components, mass_fractions, "mass fractions")?;
        let x = liquid::mass_to_mole(components, &w);

        // the distillation curve (as indicators: through the nodes up to the last requested one)
        let curve: Option<Vec<f64>> = match (self.last_node, self.distillation.as_mut()) {
            (Some(last), Some(series)) => {
                let fb = self.opts.final_fraction;
                let fractions = [0.0, 0.1, 0.2, 0.5, 0.9, fb];
                match series.path(&x, &fractions[..=last], self.opts.max_step) {
                    Ok((pts, _)) if near_critical(components, &x, &self.opts, pts[0].temperature).is_none() => Some(pts.iter().map(|p| p.temperature).collect()),
                    _ => None,
                }
            }
            _ => None,
        };
        let flash = match self.flash.as_mut() {
            Some(f) if self.keys.contains(&"flash_point_K") => match f.solve(&x, &self.pure_fp) {
                Some(t) => Some(t),
                None => liaw_flash_point(components, &x, &self.pure_fp, ActivityModel::Ideal),
            },
            _ if self.keys.contains(&"flash_point_K") => liaw_flash_point(components, &x, &self.pure_fp, ActivityModel::Ideal),
            _ => None,
        };
        let inv_rho15 = self.density_15c.iter().zip(&w).map(|(d, w)| w / d).sum::<f64>();
        let mut out = Vec::with_capacity(self.keys.len());
        for key in &self.keys {
            let value = if let Some(node) = curve_node(key) {
                curve.as_ref().map(|t| t[node])
            } else if let Some(t) = viscosity_temperature(key) {
                // as liquid::viscosity and liquid::density on the kept component values
                self.viscosity.iter().find(|(tv, _, _)| *tv == t).map(|(_, ln_mu, rho)| {
                    let mu = ln_mu.iter().zip(&x).map(|(l, x)| x * l).sum::<f64>().exp();
                    let rho = 1.0 / rho.iter().zip(&w).map(|(r, w)| w / r).sum::<f64>();
                    mu / rho
                })
            } else {
                match *key {
                    "flash_point_K" => flash,
                    "density_15C_kg_m3" => Some(1.0 / inv_rho15),
                    "dcn" => {
                        let vol: Vec<f64> = {
                            let v: Vec<f64> = self.density_15c.iter().zip(&w).map(|(d, w)| w / d).collect();
                            let s: f64 = v.iter().sum();
                            v.iter().map(|v| v / s).collect()
                        };
                        Some(blend_cetane(components, &w, &x, &vol, self.opts.cetane_rule))
                    }
                    _ => None, // not a series key: `new` sends such a series to `indicators`
                }
            };
            out.push(value);
        }
        Ok(out)
    }

    fn direct_values(&self, mass_fractions: &[f64]) -> Result<Vec<Option<f64>>, PostError> {
        let ind = indicators(self.components, mass_fractions, &self.opts)?;
        Ok(self.keys.iter().map(|k| ind.get(k).flatten()).collect())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;
    use crate::post::{weathering_residues, INDICATOR_KEYS};

    /// Residues of demo-wide (open-vessel evaporation at 420 K, 0 to 95 %) through the kernels, as an
    /// uncertainty sample evaluates them.
    fn residues() -> (Vec<Arc<Component>>, Vec<Vec<f64>>) {
        let l = Library::embedded().unwrap();
        let fuel = Fuel::resolve("demo-wide", &l).unwrap();
        let comps = crate::props::kernels::run_components(&fuel.components, crate::props::kernels::PropertyEvaluation::Kernels);
        let fractions: Vec<f64> = (0..20).map(|i| f64::from(i) * 0.05).collect();
        let res = weathering_residues(&comps, &fuel.mass_fractions, 420.0, &fractions, ActivityModel::Ideal).unwrap();
        (comps, res.into_iter().map(|r| r.mass_fractions).collect())
    }

    /// Every key the series computes itself, against `indicators` on each residue: the blends have the same
    /// bits, the distillation temperatures agree to 1e-7 K and the flash point to 1e-9 K.
    #[test]
    fn series_matches_indicators() {
        let (comps, residues) = residues();
        let keys: Vec<&'static str> = SERIES_KEYS.to_vec();
        let opts = IndicatorOptions::default();
        let mut series = ResidueSeries::new(&comps, &opts, &keys).unwrap();
        assert!(!series.direct);
        let (mut worst_curve, mut worst_flash) = (0.0f64, 0.0f64);
        // one residue: the series against indicators (curve and flash point to the worst seen, the rest bit for bit)
        let mut compare = |series: &mut ResidueSeries, w: &[f64]| {
            let fast = series.values(w).unwrap();
            let full = indicators(&comps, w, &opts).unwrap();
            for (key, v) in keys.iter().zip(&fast) {
                let d = full.get(key).unwrap();
                match *key {
                    k if curve_node(k).is_some() => worst_curve = worst_curve.max((v.unwrap() - d.unwrap()).abs()),
                    "flash_point_K" => worst_flash = worst_flash.max((v.unwrap() - d.unwrap()).abs()),
                    _ => assert_eq!(v.map(f64::to_bits), d.map(f64::to_bits), "{key}"),
                }
            }
        };
        for w in &residues {
            compare(&mut series, w);
        }
        // residues without their first or their last component (left out of the sums, as indicators does)
        for drop in [0, comps.len() - 1] {
            for w in &residues[..3] {
                let mut w = w.clone();
                w[drop] = 0.0;
                compare(&mut series, &w);
            }
        }
        eprintln!("largest differences: distillation {worst_curve:.2e} K, flash point {worst_flash:.2e} K");
        assert!(worst_curve < 1e-7 && worst_flash < 1e-9, "{worst_curve} {worst_flash}");
    }

    /// What the series does not handle goes to `indicators` itself (the same bits): activity coefficients, the
    /// Refutas rule, a key outside the series; and unknown keys are refused.
    #[test]
    fn other_cases_are_the_direct_call() {
        let (comps, residues) = residues();
        let check = |opts: &IndicatorOptions, keys: &[&'static str], w: &[f64], expect_direct: bool| {
            let mut series = ResidueSeries::new(&comps, opts, keys).unwrap();
            assert_eq!(series.direct, expect_direct, "{keys:?}");
            let fast = series.values(w).unwrap();
            let full = indicators(&comps, w, opts).unwrap();
            for (key, v) in keys.iter().zip(&fast) {
                assert_eq!(v.map(f64::to_bits), full.get(key).unwrap().map(f64::to_bits), "{key}");
            }
        };
        let unifac = IndicatorOptions { activity: ActivityModel::Unifac, ..Default::default() };
        check(&unifac, &["t50_K", "flash_point_K", "dcn"], &residues[3], true);
        let refutas = IndicatorOptions { viscosity_rule: ViscosityRule::Refutas, ..Default::default() };
        check(&refutas, &["kinematic_viscosity_minus20C_m2_s", "dcn"], &residues[3], true);
        check(&IndicatorOptions::default(), &["t50_K", "lhv_J_kg"], &residues[3], true);

        assert!(ResidueSeries::new(&comps, &IndicatorOptions::default(), &["no_such_key"]).is_err());
        // every key the series computes is an indicator key
        assert!(SERIES_KEYS.iter().all(|k| INDICATOR_KEYS.iter().any(|(i, _)| i == k)));
        // bad options: the same error as indicators
        let bad = IndicatorOptions { max_step: 2.0, ..Default::default() };
        let mut series = ResidueSeries::new(&comps, &bad, &["t50_K"]).unwrap();
        assert_eq!(series.values(&residues[0]).unwrap_err(), indicators(&comps, &residues[0], &bad).unwrap_err());
    }
}
