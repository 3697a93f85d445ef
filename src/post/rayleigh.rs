//! Single-stage batch (Rayleigh) evaporation of an ideal liquid, at constant pressure (simulated
//! distillation: the liquid is at its bubble point at every instant) or at constant temperature (open-vessel
//! weathering).
//!
//! Material balance: the vapour leaving is in equilibrium with the whole liquid, `y_i = x_i K_i` with
//! Raoult's law `K_i = p_sat,i(T)/p`, and `d(n x_i) = y_i dn`. In logarithmic component amounts this is
//! `d ln n_i / d ln n = K_i`. We integrate in the variable `φ = −ln(1 − F)`, where `F` is the evaporated
//! fraction on the chosen basis (moles, mass or liquid volume at 15 °C, weight `w_i` per mole):
//!
//! `d ln n_i / dφ = −K_i / Σ_j ψ_j K_j`, with `ψ_j = w_j n_j / Σ_k w_k n_k`.
//!
//! The right-hand side is bounded and smooth all the way to `F → 1` (it does not depend on `ln n_i`
//! directly, so strongly depleted light ends are not stiff), and every requested fraction is a grid node,
//! so no interpolation is needed. Classical fourth-order Runge–Kutta with equal sub-steps no longer than
//! `max_step` between requested nodes. At constant pressure each stage solves the bubble point in 1/T, starting at
//! the temperature of the previous vapour-pressure sweep, whose p_sat,i are kept: the residual
//! ln(Σ x_i γ_i p_sat,i/p) of the new composition there is exact and costs no vapour-pressure evaluation. For an
//! ideal liquid the solve is Halley's method on the analytic derivatives of each ln p_sat,i in 1/T kept with the
//! sweep, and a step from a residual below [`POLISH_RESIDUAL`] moves the kept values along their Taylor series
//! instead of sweeping again: about 0.92 sweeps (n vapour pressures each) per stage on demo-wide. With activity
//! coefficients it is a secant iteration (about 2.8 sweeps per stage). [`IsobaricSeries`] runs one path after
//! another of the same components, each starting from the sweep kept at the previous path's first bubble point.
//!
//! At constant temperature the K-values are constant and the path has the closed form
//! `n_i(s) = n_i0 exp(−k_i s)` (`k_i = p_sat,i(T)/max_j p_sat,j(T)`); each requested fraction is reached by
//! solving `F(s) = F_target` by Brent's method (crate::numerics::root), so weathering residues are exact to
//! round-off.

use std::sync::Arc;

use crate::data::Component;
use crate::props::activity::{Activity, ActivityModel};
use crate::numerics::root::{brent, Tolerance};
use crate::props::kernels::VaporPressures;
use crate::props::liquid;

use super::PostError;

/// Which state variable is held fixed along the path.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum PathMode {
    /// Constant pressure \[Pa\]: the liquid is at its bubble point (simulated distillation).
    Isobaric(f64),
    /// Constant temperature \[K\]: vapour composition ∝ x_i p_sat,i(T) (weathering).
    Isothermal(f64),
}

/// Reusable scratch space for the bubble-point solve and the right-hand side.
struct Evaluator<'a> {
    components: &'a [Arc<Component>],
    /// p_sat,i(T) of `components` (the bits of `Component::vapor_pressure`).
    vapor_pressures: VaporPressures<'a>,
    /// Liquid activity model (γ = 1: Raoult's law), K_i = γ_i p_sat,i/p.
    activity: Activity,
    /// Per-mole basis weights.
    weights: Vec<f64>,
    mode: PathMode,
    x: Vec<f64>,
    k: Vec<f64>,
    /// p_sat,i at `t_swept` \[Pa\] (without γ_i).
    p_sat: Vec<f64>,
    /// d ln p_sat,i / d(1/T) at `t_swept` \[K\] (ideal liquid only: the Halley solve).
    slope_b: Vec<f64>,
    /// d² ln p_sat,i / d(1/T)² at `t_swept` \[K²\] (ideal liquid only).
    curvature_b: Vec<f64>,
    /// Whether the bubble solve is Halley's method on analytic derivatives (ideal liquid) rather than the
    /// secant iteration (activity coefficients).
    halley: bool,
    /// Temperature of the last vapour-pressure sweep \[K\] (NaN before the first).
    t_swept: f64,
    /// Start of the first bubble solve \[K\].
    t_guess: f64,
    slope: f64,
    /// Taylor moves of the kept sweep since the vapour pressures were last evaluated.
    polished: usize,
    /// First and second derivatives in 1/T of ln Σ x_i p_sat,i at the last sweep for the current `x` (ideal
    /// liquid).
    derivatives: (f64, f64),
    /// Whether the next bubble solve's sweep is to be kept as the start of the next path ([`IsobaricSeries`]).
    keep: bool,
    /// The sweep kept at the first bubble point of the last path (ideal liquid only).
    kept: Option<KeptSweep>,
    /// Count of right-hand-side evaluations (for tests and statistics).
    evaluations: usize,
    /// Count of vapour-pressure sweeps (for tests and statistics).
    sweeps: usize,
}

/// Bubble-point residual tolerance on ln(Σ x_i p_sat,i / p); 1e-10 is ~1e-8 K at 450 K.
const BUBBLE_TOL: f64 = 1e-10;

/// Below this residual a Halley step of an ideal-liquid solve moves the last sweep's vapour pressures along
/// their Taylor series in 1/T instead of evaluating them again: the step in ln p_sat,i is then below about
/// 3e-4, where the series ([`polish_exponent`], [`taylor_exp`]) is exact to about 1e-15 relative.
pub const POLISH_RESIDUAL: f64 = 1e-4;

/// Most Taylor moves in a row (over consecutive solves) before the vapour pressures are evaluated again
/// (bounds the drift of the kept values).
pub const POLISH_LIMIT: usize = 16;

/// Change of ln p_sat over a step `db` in 1/T from its first and second derivatives there (`slope`, `curvature`).
#[inline]
pub fn polish_exponent(slope: f64, curvature: f64, db: f64) -> f64 {
    db * (slope + 0.5 * curvature * db)
}

/// exp(e) for |e| below about 1e-3 by its Taylor polynomial of degree 4 (relative error below e⁵/120).
#[inline]
pub fn taylor_exp(e: f64) -> f64 {
    1.0 + e * (1.0 + e * (0.5 + e * (1.0 / 6.0 + e * (1.0 / 24.0))))
}

/// First and second derivatives of ln p_sat in b = 1/T at `t` from those in T (`d1`, `d2`; d/db = −T² d/dT).
#[inline]
pub fn slopes_in_inverse_temperature(t: f64, d1: f64, d2: f64) -> (f64, f64) {
    let (t2, t3) = (t * t, t * t * t);
    (-t2 * d1, t2 * t2 * d2 + 2.0 * t3 * d1)
}

/// Move one kept vapour pressure and its slope in 1/T by `db` along their Taylor series (`curvature` stays).
#[inline]
pub fn taylor_move(p_sat: &mut f64, slope: &mut f64, curvature: f64, db: f64) {
    *p_sat *= taylor_exp(polish_exponent(*slope, curvature, db));
    *slope += curvature * db;
}

/// Sums Σ w_i, Σ w_i h_i and Σ w_i (c_i + h_i²) of the terms w_i = a_i p_sat,i of a sum whose members have the
/// first and second derivatives h_i, c_i of ln p_sat,i in 1/T: [`LogSumMoments::derivatives`] gives the sum's.
#[derive(Debug, Clone, Copy, Default)]
pub struct LogSumMoments(f64, f64, f64);

impl LogSumMoments {
    /// Add one member (its term `w`, slope `h` and curvature `c`).
    #[inline]
    pub fn add(&mut self, w: f64, h: f64, c: f64) {
        self.0 += w;
        self.1 += w * h;
        self.2 += w * (c + h * h);
    }

    /// ln of the sum, and its first and second derivatives in 1/T (the weighted mean slope; the weighted mean
    /// of curvature + slope² less the squared mean).
    #[inline]
    pub fn derivatives(self) -> (f64, f64, f64) {
        let d1 = self.1 / self.0;
        (self.0.ln(), d1, self.2 / self.0 - d1 * d1)
    }
}

impl<'a> Evaluator<'a> {
    /// ln Σ x_i γ_i p_sat,i(t), filling `k` with γ_i p_sat,i(t) (a vapour-pressure sweep at `t`).
    #[inline]
    fn log_bubble_pressure(&mut self, t: f64) -> f64 {
        if self.halley {
            return self.log_bubble_pressure_with_slopes(t);
        }
        self.sweeps += 1;
        let mut s = 0.0;
        let gamma = self.activity.gammas(&self.x, t);
        for (i, (((x, k), ps), g)) in self.x.iter().zip(self.k.iter_mut()).zip(self.p_sat.iter_mut()).zip(gamma).enumerate() {
            *ps = self.vapor_pressures.at(i, t);
            *k = g * *ps;
            s += x * *k;
        }
        self.t_swept = t;
        s.ln()
    }

    /// [`Self::log_bubble_pressure`] of an ideal liquid that also keeps the first and second derivatives of each
    /// ln p_sat,i in b = 1/T (from d/db = −T² d/dT).
    #[inline]
    fn log_bubble_pressure_with_slopes(&mut self, t: f64) -> f64 {
        self.sweeps += 1;
        self.polished = 0;
        let mut sums = LogSumMoments::default();
        // slices of one length: the loop needs no bounds checks
        let n = self.x.len();
        let (x, p_sat, k, slope_b, curvature_b) = (&self.x[..n], &mut self.p_sat[..n], &mut self.k[..n], &mut self.slope_b[..n], &mut self.curvature_b[..n]);
        for i in 0..n {
            let (ps, d1, d2) = self.vapor_pressures.at_with_slopes(i, t);
            let (h, c) = slopes_in_inverse_temperature(t, d1, d2);
            p_sat[i] = ps;
            k[i] = ps;
            slope_b[i] = h;
            curvature_b[i] = c;
            sums.add(x[i] * ps, h, c);
        }
        self.t_swept = t;
        self.keep_derivatives(sums)
    }

    /// Keep the derivatives in 1/T of ln Σ x_i p_sat,i from `sums`; returns ln Σ x_i p_sat,i.
    #[inline]
    fn keep_derivatives(&mut self, sums: LogSumMoments) -> f64 {
        let (ln_s, d1, d2) = sums.derivatives();
        self.derivatives = (d1, d2);
        ln_s
    }

    /// ln Σ x_i p_sat,i of the current `x` at the last sweep (ideal liquid), with `k` = p_sat and the derivatives
    /// kept (no vapour-pressure evaluation).
    #[inline]
    fn halley_at_last_sweep(&mut self) -> f64 {
        let mut sums = LogSumMoments::default();
        let n = self.x.len();
        let (x, p_sat, k, slope_b, curvature_b) = (&self.x[..n], &self.p_sat[..n], &mut self.k[..n], &self.slope_b[..n], &self.curvature_b[..n]);
        for i in 0..n {
            let ps = p_sat[i];
            k[i] = ps;
            sums.add(x[i] * ps, slope_b[i], curvature_b[i]);
        }
        self.keep_derivatives(sums)
    }

    /// Move the last sweep by `db` in 1/T along the Taylor series of each ln p_sat,i (no evaluation); returns
    /// ln Σ x_i p_sat,i there and keeps `k` and the derivatives.
    #[inline]
    fn polish(&mut self, db: f64) -> f64 {
        self.polished += 1;
        let mut sums = LogSumMoments::default();
        let n = self.x.len();
        let (x, p_sat, k, slope_b, curvature_b) = (&self.x[..n], &mut self.p_sat[..n], &mut self.k[..n], &mut self.slope_b[..n], &self.curvature_b[..n]);
        for i in 0..n {
            let c = curvature_b[i];
            taylor_move(&mut p_sat[i], &mut slope_b[i], c, db);
            k[i] = p_sat[i];
            sums.add(x[i] * p_sat[i], slope_b[i], c);
        }
        self.keep_derivatives(sums)
    }

    /// Bubble temperature of an ideal `self.x` at `p` by Halley's method in 1/T on the analytic derivatives,
    /// starting from the last sweep (exact residual and derivatives of the new composition there, no
    /// vapour-pressure evaluation); leaves p_sat,i(T) in `k`.
    fn bubble_halley(&mut self, p: f64) -> Result<f64, PostError> {
        let lnp = p.ln();
        let (mut t0, mut f0) = if self.t_swept.is_finite() {
            (self.t_swept, self.halley_at_last_sweep() - lnp)
        } else {
            (self.t_guess, self.log_bubble_pressure(self.t_guess) - lnp)
        };
        if f0.abs() < BUBBLE_TOL {
            return Ok(t0);
        }
        for _ in 0..40 {
            let (d1, d2) = self.derivatives;
            let b0 = 1.0 / t0;
            // Newton's step f/f', corrected by Halley's factor where it is moderate
            let newton = if d1.is_finite() && d1 < 0.0 { f0 / d1 } else { f0 / self.slope };
            let factor = 1.0 - 0.5 * f0 * d2 / (d1 * d1);
            let step = if factor.is_finite() && (0.5..=2.0).contains(&factor) { newton / factor } else { newton };
            let b1 = (b0 - step).clamp(b0 / 1.3, b0 * 1.3);
            let t1 = 1.0 / b1;
            let f1 = if f0.abs() < POLISH_RESIDUAL && self.polished < POLISH_LIMIT {
                // a short step: move the last sweep along the Taylor series of each ln p_sat,i in 1/T
                let f = self.polish(b1 - b0) - lnp;
                self.t_swept = t1;
                f
            } else {
                self.log_bubble_pressure(t1) - lnp
            };
            if !f1.is_finite() {
                break;
            }
            if f1.abs() < BUBBLE_TOL {
                self.t_guess = t1;
                return Ok(t1);
            }
            t0 = t1;
            f0 = f1;
        }
        self.bubble_fallback(p)
    }

    /// Bubble temperature of `self.x` at `p` by the bracketed search of the props layer (when an iteration does
    /// not converge), with its sweep kept as the start of the next solve.
    fn bubble_fallback(&mut self, p: f64) -> Result<f64, PostError> {
        let t = liquid::bubble_point_with(self.components, &mut self.activity, &self.x, p)?;
        self.log_bubble_pressure(t);
        self.t_guess = t;
        Ok(t)
    }

    /// [`Self::log_bubble_pressure`] of the current `x` at the temperature of the last sweep, from its kept
    /// vapour pressures (no vapour-pressure evaluation).
    #[inline]
    fn log_bubble_pressure_at_last_sweep(&mut self) -> f64 {
        let mut s = 0.0;
        let gamma = self.activity.gammas(&self.x, self.t_swept);
        for (((x, k), ps), g) in self.x.iter().zip(self.k.iter_mut()).zip(&self.p_sat).zip(gamma) {
            *k = g * ps;
            s += x * *k;
        }
        s.ln()
    }

    /// Bubble temperature of `self.x` at `p`; leaves γ_i p_sat,i(T) in `k`.
    fn bubble(&mut self, p: f64) -> Result<f64, PostError> {
        if self.halley {
            return self.bubble_halley(p);
        }
        let lnp = p.ln();
        // start where the vapour pressures are known (the last sweep), else at the first guess
        let (t0, mut f0) = if self.t_swept.is_finite() {
            (self.t_swept, self.log_bubble_pressure_at_last_sweep() - lnp)
        } else {
            (self.t_guess, self.log_bubble_pressure(self.t_guess) - lnp)
        };
        if f0.abs() < BUBBLE_TOL {
            return Ok(t0);
        }
        let mut g = self.slope; // d f / d(1/T), negative
        let mut b0 = 1.0 / t0;
        for _ in 0..40 {
            let mut b1 = b0 - f0 / g;
            // keep the step within a factor of 1.3 in T
            b1 = b1.clamp(b0 / 1.3, b0 * 1.3);
            let t1 = 1.0 / b1;
            let f1 = self.log_bubble_pressure(t1) - lnp;
            if !f1.is_finite() {
                break;
            }
            if f1.abs() < BUBBLE_TOL {
                let gs = (f1 - f0) / (b1 - b0);
                if gs.is_finite() && gs < 0.0 {
                    self.slope = gs;
                }
                self.t_guess = t1;
                return Ok(t1);
            }
            let gs = (f1 - f0) / (b1 - b0);
            if gs.is_finite() && gs < 0.0 {
                g = gs;
            }
            b0 = b1;
            f0 = f1;
        }
        self.bubble_fallback(p)
    }

    /// Right-hand side d ln n_i / dφ at `ln_n`, written to `out`; returns the temperature.
    fn rhs(&mut self, ln_n: &[f64], out: &mut [f64]) -> Result<f64, PostError> {
        self.evaluations += 1;
        let m = ln_n.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
        let mut s = 0.0;
        for (x, l) in self.x.iter_mut().zip(ln_n) {
            *x = crate::numerics::exp(l - m);
            s += *x;
        }
        for x in self.x.iter_mut() {
            *x /= s;
        }
        let t = match self.mode {
            PathMode::Isobaric(p) => {
                let t = self.bubble(p)?;
                for k in self.k.iter_mut() {
                    *k /= p;
                }
                t
            }
            PathMode::Isothermal(t) => {
                // k holds p_sat,i(T) for the ideal liquid (any common scale cancels); γ_i p_sat,i(T) otherwise
                // (the vapour pressures at the fixed T are kept from the first sweep)
                if !self.activity.is_ideal() {
                    if self.t_swept == t {
                        self.log_bubble_pressure_at_last_sweep();
                    } else {
                        self.log_bubble_pressure(t);
                    }
                }
                t
            }
        };
        let mut num = 0.0;
        let mut den = 0.0;
        for ((x, w), k) in self.x.iter().zip(&self.weights).zip(&self.k) {
            num += x * w * k;
            den += x * w;
        }
        let mean_k = num / den;
        for (o, k) in out.iter_mut().zip(&self.k) {
            *o = -k / mean_k;
        }
        Ok(t)
    }
}

/// A state reached at a requested evaporated fraction.
#[derive(Debug, Clone, PartialEq)]
pub struct PathPoint {
    /// Evaporated fraction on the path's basis \[-\].
    pub evaporated_fraction: f64,
    /// Liquid temperature \[K\] (bubble point, or the fixed temperature).
    pub temperature: f64,
    /// Liquid mole fractions \[-\].
    pub mole_fractions: Vec<f64>,
}

/// Work of one [`integrate`] call.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct PathCounts {
    /// Right-hand-side evaluations.
    pub evaluations: usize,
    /// Vapour-pressure sweeps (each evaluates p_sat,i of every component once).
    pub sweeps: usize,
}

/// Integrate a Rayleigh path from liquid mole fractions `x0` and report the state at each evaporated
/// fraction in `fractions` (ascending, each in [0, 1)). `weights` are the per-mole basis weights (1 for a
/// mole basis, molar mass for mass, molar volume at 15 °C for liquid volume). `max_step` bounds the RK4
/// step in φ = −ln(1 − F). Components with zero amount must be filtered out by the caller.
/// Returns the points and the work it took (right-hand sides and vapour-pressure sweeps).
pub fn integrate(
    components: &[Arc<Component>],
    x0: &[f64],
    weights: &[f64],
    mode: PathMode,
    fractions: &[f64],
    max_step: f64,
    activity: ActivityModel,
) -> Result<(Vec<PathPoint>, PathCounts), PostError> {
    let n = components.len();
    let activity = Activity::new(activity, components).map_err(|e| PostError::Input { what: "activity", message: e.to_string() })?;
    if n == 0 || x0.len() != n || weights.len() != n {
        return Err(PostError::Input { what: "rayleigh path", message: "components, fractions and weights differ in length".into() });
    }
    check_path(x0, fractions, max_step)?;
    let t_start = match mode {
        PathMode::Isobaric(p) => {
            if !(p.is_finite() && p > 0.0) {
                return Err(PostError::Input { what: "pressure", message: format!("{p} Pa must be positive") });
            }
            cold_start(components, x0)
        }
        PathMode::Isothermal(t) => {
            if !(t.is_finite() && t > 0.0) {
                return Err(PostError::Input { what: "temperature", message: format!("{t} K must be positive") });
            }
            t
        }
    };
    let ideal = activity.is_ideal();
    let mut ev = Evaluator::new(components, activity, weights, mode, t_start);
    if let PathMode::Isothermal(t) = mode {
        for (k, c) in ev.k.iter_mut().zip(components) {
            *k = c.vapor_pressure(t);
        }
        if ev.k.iter().any(|k| !(k.is_finite() && *k > 0.0)) {
            return Err(PostError::Input { what: "weathering temperature", message: format!("vapour pressures at {t} K are not all positive") });
        }
        if ideal {
            let total: f64 = x0.iter().sum();
            return Ok((isothermal(&ev.k, x0, total, weights, fractions, t), PathCounts { evaluations: 0, sweeps: 0 }));
        }
    }
    rk4_path(&mut ev, x0, fractions, max_step)
}

/// Checks of a path's start and its requested fractions shared by [`integrate`] and [`IsobaricSeries`].
fn check_path(x0: &[f64], fractions: &[f64], max_step: f64) -> Result<(), PostError> {
    if x0.iter().any(|x| !(x.is_finite() && *x > 0.0)) {
        return Err(PostError::Input { what: "rayleigh path", message: "every component needs a positive amount".into() });
    }
    if !(max_step.is_finite() && max_step > 0.0) {
        return Err(PostError::Input { what: "rayleigh path", message: format!("max step {max_step} must be positive") });
    }
    let mut last = -1.0;
    for &f in fractions {
        if !(f.is_finite() && (0.0..1.0).contains(&f) && f >= last) {
            return Err(PostError::Input { what: "evaporated fractions", message: format!("{f} must lie in [0, 1) and the list must be ascending") });
        }
        last = f;
    }
    Ok(())
}

/// First temperature of a bubble solve without a previous one: the mole-fraction mean normal boiling point \[K\].
fn cold_start(components: &[Arc<Component>], x0: &[f64]) -> f64 {
    components.iter().zip(x0).map(|(c, x)| x * c.normal_boiling_point()).sum::<f64>()
}

impl<'a> Evaluator<'a> {
    /// An evaluator with nothing swept yet, whose first bubble solve starts at `t_start`.
    fn new(components: &'a [Arc<Component>], activity: Activity, weights: &[f64], mode: PathMode, t_start: f64) -> Self {
        let n = components.len();
        let halley = activity.is_ideal() && matches!(mode, PathMode::Isobaric(_));
        Evaluator {
            components,
            vapor_pressures: VaporPressures::new(components),
            activity,
            weights: weights.to_vec(),
            mode,
            x: vec![0.0; n],
            k: vec![0.0; n],
            p_sat: vec![0.0; n],
            slope_b: vec![0.0; if halley { n } else { 0 }],
            curvature_b: vec![0.0; if halley { n } else { 0 }],
            halley,
            t_swept: f64::NAN,
            t_guess: t_start,
            // Trouton's rule, ΔH/(R T_b) ≈ 10.5, for the first slope of ln p against 1/T
            slope: -10.5 * t_start,
            polished: 0,
            derivatives: (f64::NAN, f64::NAN),
            keep: false,
            kept: None,
            evaluations: 0,
            sweeps: 0,
        }
    }

    /// Keep the last sweep (the first bubble point of a path) when asked to ([`IsobaricSeries`]).
    fn after_first_solve(&mut self) {
        if !self.keep {
            return;
        }
        self.keep = false;
        let k = self.kept.get_or_insert_with(|| KeptSweep { t: f64::NAN, p_sat: vec![], slope_b: vec![], curvature_b: vec![], slope: 0.0, polished: 0 });
        k.polished = self.polished;
        k.t = self.t_swept;
        k.slope = self.slope;
        k.p_sat.clone_from(&self.p_sat);
        k.slope_b.clone_from(&self.slope_b);
        k.curvature_b.clone_from(&self.curvature_b);
    }

    /// Start from the sweep [`Self::after_first_solve`] kept (ideal liquid); false when there is none.
    fn restore_kept_sweep(&mut self) -> bool {
        let Some(k) = self.kept.as_ref().filter(|_| self.halley) else { return false };
        self.t_swept = k.t;
        self.t_guess = k.t;
        self.slope = k.slope;
        self.polished = k.polished;
        self.p_sat.copy_from_slice(&k.p_sat);
        self.slope_b.copy_from_slice(&k.slope_b);
        self.curvature_b.copy_from_slice(&k.curvature_b);
        true
    }
}

/// The RK4 path from `x0` through `fractions` (checked by the caller) with the evaluator as it stands.
fn rk4_path(ev: &mut Evaluator, x0: &[f64], fractions: &[f64], max_step: f64) -> Result<(Vec<PathPoint>, PathCounts), PostError> {
    let n = x0.len();
    let total: f64 = x0.iter().sum();
    let mut ln_n: Vec<f64> = x0.iter().map(|x| (x / total).ln()).collect();
    let mut stage = vec![0.0; n];
    let mut k1 = vec![0.0; n];
    let mut k2 = vec![0.0; n];
    let mut k3 = vec![0.0; n];
    let mut k4 = vec![0.0; n];
    let mut out = Vec::with_capacity(fractions.len());
    let mut phi = 0.0;
    // k1 at the current state and its temperature
    let mut t_here = ev.rhs(&ln_n, &mut k1)?;
    ev.after_first_solve();
    for &f in fractions {
        let phi_target = -(1.0 - f).ln();
        let span = phi_target - phi;
        if span > 0.0 {
            let steps = (span / max_step).ceil().max(1.0) as usize;
            let h = span / steps as f64;
            for _ in 0..steps {
                for i in 0..n {
                    stage[i] = ln_n[i] + 0.5 * h * k1[i];
                }
                ev.rhs(&stage, &mut k2)?;
                for i in 0..n {
                    stage[i] = ln_n[i] + 0.5 * h * k2[i];
                }
                ev.rhs(&stage, &mut k3)?;
                for i in 0..n {
                    stage[i] = ln_n[i] + h * k3[i];
                }
                ev.rhs(&stage, &mut k4)?;
                for i in 0..n {
                    ln_n[i] += h / 6.0 * (k1[i] + 2.0 * k2[i] + 2.0 * k3[i] + k4[i]);
                }
                t_here = ev.rhs(&ln_n, &mut k1)?;
            }
            phi = phi_target;
        }
        out.push(PathPoint { evaporated_fraction: f, temperature: t_here, mole_fractions: ev.x.clone() });
    }
    Ok((out, PathCounts { evaluations: ev.evaluations, sweeps: ev.sweeps }))
}

/// The sweep kept at the first bubble point of the last path of an [`IsobaricSeries`].
#[derive(Debug, Clone)]
struct KeptSweep {
    t: f64,
    p_sat: Vec<f64>,
    slope_b: Vec<f64>,
    curvature_b: Vec<f64>,
    slope: f64,
    polished: usize,
}

/// Constant-pressure paths of one list of components from one start composition after another (the residues of
/// one droplet run): each path is [`integrate`]'s, except that its first bubble solve starts from the sweep
/// kept at the previous path's first bubble point (an exact residual and derivatives for the new composition,
/// no evaporation), and the vapour-pressure segments stay remembered. The points agree with [`integrate`]'s to
/// the bubble solve's tolerance (about 1e-8 K).
pub struct IsobaricSeries<'a> {
    ev: Evaluator<'a>,
}

impl<'a> IsobaricSeries<'a> {
    /// A series at pressure `p` \[Pa\] with per-mole basis `weights`.
    pub fn new(components: &'a [Arc<Component>], weights: &[f64], p: f64, activity: ActivityModel) -> Result<Self, PostError> {
        let activity = Activity::new(activity, components).map_err(|e| PostError::Input { what: "activity", message: e.to_string() })?;
        if components.is_empty() || weights.len() != components.len() {
            return Err(PostError::Input { what: "rayleigh path", message: "components and weights differ in length".into() });
        }
        if !(p.is_finite() && p > 0.0) {
            return Err(PostError::Input { what: "pressure", message: format!("{p} Pa must be positive") });
        }
        Ok(IsobaricSeries { ev: Evaluator::new(components, activity, weights, PathMode::Isobaric(p), f64::NAN) })
    }

    /// The path from mole fractions `x0`, as [`integrate`] with `PathMode::Isobaric` on the components whose
    /// fraction is positive (the others have zero fractions all along).
    pub fn path(&mut self, x0: &[f64], fractions: &[f64], max_step: f64) -> Result<(Vec<PathPoint>, PathCounts), PostError> {
        let ev = &mut self.ev;
        if x0.len() != ev.x.len() {
            return Err(PostError::Input { what: "rayleigh path", message: "components and fractions differ in length".into() });
        }
        // absent components (x = 0, ln n = −∞) stay absent and add nothing to any sum: the path of the others
        let present: Vec<f64> = x0.iter().copied().filter(|x| *x != 0.0).collect();
        if present.is_empty() || x0.iter().any(|x| *x < 0.0) {
            return Err(PostError::Input { what: "rayleigh path", message: "every component needs a positive or zero amount, and one a positive amount".into() });
        }
        check_path(&present, fractions, max_step)?;
        ev.evaluations = 0;
        ev.sweeps = 0;
        if !ev.restore_kept_sweep() {
            let t_start = cold_start(ev.components, x0);
            ev.t_swept = f64::NAN;
            ev.polished = 0;
            ev.t_guess = t_start;
            ev.slope = -10.5 * t_start;
        }
        ev.keep = ev.halley;
        rk4_path(ev, x0, fractions, max_step)
    }
}

/// Closed-form constant-temperature path: n_i = x0_i exp(−k_i s); `p_sat` holds p_sat,i(T).
fn isothermal(p_sat: &[f64], x0: &[f64], total: f64, weights: &[f64], fractions: &[f64], t: f64) -> Vec<PathPoint> {
    let p_max = p_sat.iter().cloned().fold(0.0, f64::max);
    let k: Vec<f64> = p_sat.iter().map(|p| p / p_max).collect();
    let n0: Vec<f64> = x0.iter().map(|x| x / total).collect();
    let w0: f64 = n0.iter().zip(weights).map(|(n, w)| n * w).sum();
    // remaining basis fraction R(s) = Σ w_i n_i0 e^(−k_i s) / W0
    let remaining = |s: f64| -> f64 { n0.iter().zip(weights).zip(&k).map(|((n, w), k)| w * n * (-k * s).exp()).sum::<f64>() / w0 };
    let mut out = Vec::with_capacity(fractions.len());
    let mut s_lo = 0.0;
    for &f in fractions {
        let target = 1.0 - f;
        let mut lo = s_lo;
        let mut hi = (lo + 1.0) * 2.0;
        while remaining(hi) > target {
            lo = hi;
            hi *= 2.0;
        }
        // R(s) − target decreases from ≥ 0 at lo to ≤ 0 at hi: Brent's method to 1e-15 relative in s
        let s = if f == 0.0 {
            0.0
        } else {
            let tol = Tolerance::relative(1e-15).with_f_abs(1e-15 * target);
            brent(|s| remaining(s) - target, lo, hi, tol).map(|r| r.x).unwrap_or_else(|e| e.best().unwrap_or(0.5 * (lo + hi)))
        };
        s_lo = s;
        let mut x: Vec<f64> = n0.iter().zip(&k).map(|(n, k)| n * (-k * s).exp()).collect();
        let sx: f64 = x.iter().sum();
        x.iter_mut().for_each(|v| *v /= sx);
        out.push(PathPoint { evaporated_fraction: f, temperature: t, mole_fractions: x });
    }
    out
}

/// Per-mole weights for a basis: liquid volume at 15 °C \[m³/mol\], mass \[kg/mol\] or moles \[-\].
pub fn basis_weights(components: &[Arc<Component>], basis: super::RecoveryBasis) -> Vec<f64> {
    components
        .iter()
        .map(|c| match basis {
            super::RecoveryBasis::Volume => c.molar_mass() / c.density_15c(),
            super::RecoveryBasis::Mass => c.molar_mass(),
            super::RecoveryBasis::Mole => 1.0,
        })
        .collect()
}

#[cfg(test)]
mod tests;
