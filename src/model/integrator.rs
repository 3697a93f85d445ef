//! Adaptive explicit Runge–Kutta integrators of Dormand and Prince: the 5(4) pair with FSAL, the error control
//! and step-size rule of Hairer, Nørsett & Wanner (Solving ODEs I, 2nd ed., §II.4–5) and its 4th-order dense
//! output (ibid. §II.6); and for tight tolerances the 8(5,3) pair with its 7th-order dense output (ibid. §II.5,
//! §II.6; their DOP853), whose three extra dense-output stages are spent only in a step whose dense output is
//! used ([`DormandPrince::prepare_dense`]). Events are located on the dense output by Brent's method. Buffers
//! are allocated once; stepping never allocates.

mod dop853_tableau;

/// An ODE system y' = f(t, y) of fixed dimension.
pub trait OdeSystem {
    /// Number of unknowns.
    fn dim(&self) -> usize;
    /// Right-hand side written into `dydt` (no allocation).
    fn rhs(&mut self, t: f64, y: &[f64], dydt: &mut [f64]);
}

/// Integration statistics, pinned in tests so slowdowns show.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, serde::Serialize)]
pub struct Stats {
    /// Accepted steps.
    pub steps: u64,
    /// Rejected steps.
    pub rejected: u64,
    /// Right-hand-side evaluations.
    pub rhs_calls: u64,
}

/// Tolerances: error of unknown i is scaled by `atol[i] + rtol·|y_i|`.
#[derive(Debug, Clone)]
pub struct Tolerances {
    /// Relative tolerance.
    pub rtol: f64,
    /// Absolute tolerance per unknown.
    pub atol: Vec<f64>,
}

/// Which Dormand–Prince pair a stepper uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
pub enum Method {
    /// The 5(4) pair above a relative tolerance of [`EIGHTH_ORDER_FROM`], the 8(5,3) pair at or below it.
    #[default]
    Auto,
    /// Dormand–Prince 5(4), 7 stages (6 per step with first same as last), 4th-order dense output.
    Order5,
    /// Dormand–Prince 8(5,3), 12 stages per step (13 with first same as last), 7th-order dense output from 3 more.
    Order8,
}

/// Relative tolerance at and below which [`Method::Auto`] takes the 8(5,3) pair (docs/model.md, "Integrator":
/// from 1e-10 down it reaches the 5(4) pair's accuracy at the same tolerance with 1.4–2.3× fewer right-hand
/// sides on whole droplet lives; at 1e-8–1e-9 it saves 1.1–1.8× but is up to 10× less accurate).
pub const EIGHTH_ORDER_FROM: f64 = 1e-10;

impl Method {
    /// The pair a run at relative tolerance `rtol` uses ([`Method::Order5`] or [`Method::Order8`]).
    pub fn resolve(self, rtol: f64) -> Method {
        match self {
            Method::Auto if rtol <= EIGHTH_ORDER_FROM => Method::Order8,
            Method::Auto => Method::Order5,
            m => m,
        }
    }

    /// The word of this choice in run conditions and outputs: `auto`, `dp54` or `dp853`.
    pub const fn as_str(self) -> &'static str {
        match self {
            Method::Auto => "auto",
            Method::Order5 => "dp54",
            Method::Order8 => "dp853",
        }
    }

    /// The choice a word names ([`Method::as_str`]), None for any other word.
    pub fn parse(word: &str) -> Option<Method> {
        [Method::Auto, Method::Order5, Method::Order8].into_iter().find(|m| m.as_str() == word)
    }
}

const C2: f64 = 1.0 / 5.0;
const C3: f64 = 3.0 / 10.0;
const C4: f64 = 4.0 / 5.0;
const C5: f64 = 8.0 / 9.0;
const A21: f64 = 1.0 / 5.0;
const A31: f64 = 3.0 / 40.0;
const A32: f64 = 9.0 / 40.0;
const A41: f64 = 44.0 / 45.0;
const A42: f64 = -56.0 / 15.0;
const A43: f64 = 32.0 / 9.0;
const A51: f64 = 19372.0 / 6561.0;
const A52: f64 = -25360.0 / 2187.0;
const A53: f64 = 64448.0 / 6561.0;
const A54: f64 = -212.0 / 729.0;
const A61: f64 = 9017.0 / 3168.0;
const A62: f64 = -355.0 / 33.0;
const A63: f64 = 46732.0 / 5247.0;
const A64: f64 = 49.0 / 176.0;
const A65: f64 = -5103.0 / 18656.0;
const A71: f64 = 35.0 / 384.0;
const A73: f64 = 500.0 / 1113.0;
const A74: f64 = 125.0 / 192.0;
const A75: f64 = -2187.0 / 6784.0;
const A76: f64 = 11.0 / 84.0;
const E1: f64 = 71.0 / 57600.0;
const E3: f64 = -71.0 / 16695.0;
const E4: f64 = 71.0 / 1920.0;
const E5: f64 = -17253.0 / 339200.0;
const E6: f64 = 22.0 / 525.0;
const E7: f64 = -1.0 / 40.0;
const D1: f64 = -12715105075.0 / 11282082432.0;
const D3: f64 = 87487479700.0 / 32700410799.0;
const D4: f64 = -10690763975.0 / 1880347072.0;
const D5: f64 = 701980252875.0 / 199316789632.0;
const D6: f64 = -1453857185.0 / 822651844.0;
const D7: f64 = 69997945.0 / 29380423.0;

/// Largest factor by which a rejected step is shrunk before it is retried (Hairer's DOPRI5 uses 10).
pub const MAX_SHRINK_AFTER_REJECTION: f64 = 10.0;

/// Dormand–Prince 5(4) stepper with dense output of the last accepted step.
#[derive(Debug, Clone)]
pub struct DormandPrince {
    n: usize,
    k: [Vec<f64>; 7],
    y_stage: Vec<f64>,
    y_new: Vec<f64>,
    err: Vec<f64>,
    rcont: [Vec<f64>; 5],
    /// Current time.
    pub t: f64,
    /// Current state.
    pub y: Vec<f64>,
    /// Time at the start of the last accepted step.
    pub t_old: f64,
    /// Length of the last accepted step.
    pub h_last: f64,
    h: f64,
    /// Statistics so far.
    pub stats: Stats,
    tol: Tolerances,
    fsal_ready: bool,
    /// Largest allowed step.
    pub h_max: f64,
    /// ln of the previous accepted step's error (at least 1e-4), for the PI controller.
    ln_fac_old: f64,
    /// Length and error of the previous accepted step (0: none since the start or the last reset), for the
    /// predictive controller.
    h_acc: f64,
    /// ln of the previous accepted step's error (at least 1e-2), for the predictive controller.
    ln_err_acc: f64,
    /// The 8(5,3) pair's stages and dense output (None: the 5(4) pair).
    eighth: Option<Box<Eighth>>,
    /// The system's last right-hand-side call was at (t, y) (an accepted step's last stage, or a restart).
    system_at_end: bool,
}

/// Buffers of the 8(5,3) pair.
#[derive(Debug, Clone)]
struct Eighth {
    /// Stages k_0..k_15 (k_12 = f at the step's end; k_13..k_15 the dense output's extra stages).
    k: [Vec<f64>; dop853_tableau::STAGES_DENSE],
    /// State at the start of the last accepted step.
    y_old: Vec<f64>,
    /// Terms of the 7th-order interpolant of the last accepted step.
    terms: [Vec<f64>; 7],
    /// The interpolant of the last accepted step is built.
    dense_ready: bool,
    /// k_12 of the last accepted step is still to become the next step's k_0.
    fsal_pending: bool,
}

/// Why a step failed.
#[derive(Debug, Clone, PartialEq)]
pub enum StepError {
    /// The step size fell below the round-off limit.
    StepTooSmall {
        /// Time reached.
        t: f64,
    },
    /// The right-hand side produced a non-finite value.
    NonFinite {
        /// Time reached.
        t: f64,
    },
}

impl DormandPrince {
    /// New stepper at (t0, y0) with a first step guess `h0` (0 = automatic).
    pub fn new<S: OdeSystem>(sys: &mut S, t0: f64, y0: &[f64], tol: Tolerances, h0: f64, h_max: f64) -> Self {
        Self::with_method(sys, t0, y0, tol, h0, h_max, Method::Auto)
    }

    /// New stepper as [`DormandPrince::new`] with the pair chosen by `method` (resolved at `tol.rtol`).
    pub fn with_method<S: OdeSystem>(sys: &mut S, t0: f64, y0: &[f64], tol: Tolerances, h0: f64, h_max: f64, method: Method) -> Self {
        let n = y0.len();
        let eighth = (method.resolve(tol.rtol) == Method::Order8).then(|| {
            Box::new(Eighth { k: std::array::from_fn(|_| vec![0.0; n]), y_old: vec![0.0; n], terms: std::array::from_fn(|_| vec![0.0; n]), dense_ready: false, fsal_pending: false })
        });
        let z = || vec![0.0; n];
        let mut s = DormandPrince {
            n,
            k: [z(), z(), z(), z(), z(), z(), z()],
            y_stage: z(),
            y_new: z(),
            err: z(),
            rcont: [z(), z(), z(), z(), z()],
            t: t0,
            y: y0.to_vec(),
            t_old: t0,
            h_last: 0.0,
            h: h0,
            stats: Stats::default(),
            tol,
            fsal_ready: false,
            h_max,
            ln_fac_old: (1e-4f64).ln(),
            h_acc: 0.0,
            ln_err_acc: 0.0,
            eighth,
            system_at_end: true,
        };
        sys.rhs(t0, &s.y, &mut s.k[0]);
        s.stats.rhs_calls += 1;
        s.fsal_ready = true;
        if s.h <= 0.0 {
            s.h = s.initial_step(sys);
        }
        if let Some(e) = &mut s.eighth {
            e.k[0].copy_from_slice(&s.k[0]);
        }
        s.system_at_end = s.stats.rhs_calls == 1;
        s
    }

    /// The pair this stepper uses ([`Method::Order5`] or [`Method::Order8`]).
    pub fn method(&self) -> Method {
        if self.eighth.is_some() {
            Method::Order8
        } else {
            Method::Order5
        }
    }

    /// True when the system's last right-hand-side call was at the current (t, y): after an accepted step (its
    /// last stage) or a restart, and false after the starting-step probe or [`DormandPrince::prepare_dense`]
    /// moved it (a caller that reads quantities the system kept from its last call evaluates it again).
    pub fn system_at_end(&self) -> bool {
        self.system_at_end
    }

    /// Takes the attempted step from `t` of size `h` (its end state in `y_new`), proposes `h_new` (at most the
    /// largest step) for the next one, and returns the new time.
    fn accept(&mut self, t: f64, h: f64, h_new: f64) -> f64 {
        self.t_old = t;
        self.h_last = h;
        self.t = t + h;
        std::mem::swap(&mut self.y, &mut self.y_new);
        self.stats.steps += 1;
        self.system_at_end = true;
        self.h = h_new.min(self.h_max);
        self.t
    }

    /// Counts an attempt whose stages went non-finite as rejected and retries from a tenth of its step `h`
    /// (an error once the step falls below 1e-300 s).
    fn retry_after_non_finite(&mut self, h: f64) -> Result<(), StepError> {
        self.stats.rejected += 1;
        self.h = h * 0.1;
        if self.h < 1e-300 {
            return Err(StepError::NonFinite { t: self.t });
        }
        Ok(())
    }

    fn norm(&self, v: &[f64], y: &[f64]) -> f64 {
        let mut acc = 0.0;
        for i in 0..self.n {
            let sc = self.tol.atol[i] + self.tol.rtol * y[i].abs();
            let r = v[i] / sc;
            acc += r * r;
        }
        (acc / self.n as f64).sqrt()
    }

    fn initial_step<S: OdeSystem>(&mut self, sys: &mut S) -> f64 {
        // Hairer's starting-step heuristic (Solving ODEs I, §II.4).
        let d0 = self.norm(&self.y, &self.y);
        let d1 = self.norm(&self.k[0], &self.y);
        let h0 = if d0 < 1e-5 || d1 < 1e-5 { 1e-6 } else { 0.01 * d0 / d1 };
        let h0 = h0.min(self.h_max);
        for i in 0..self.n {
            self.y_stage[i] = self.y[i] + h0 * self.k[0][i];
        }
        sys.rhs(self.t + h0, &self.y_stage, &mut self.k[1]);
        self.stats.rhs_calls += 1;
        for i in 0..self.n {
            self.err[i] = self.k[1][i] - self.k[0][i];
        }
        let d2 = self.norm(&self.err, &self.y) / h0;
        // (0.01/max(d1, d2))^(1/(p+1)) with p the order of the error estimate's lower member (4, or 7 for the
        // 8(5,3) pair as in Hairer's DOP853)
        let exponent = if self.eighth.is_some() { 1.0 / 8.0 } else { 0.2 };
        let h1 = if d1.max(d2) <= 1e-15 { (h0 * 1e-3).max(1e-6) } else { (0.01 / d1.max(d2)).powf(exponent) };
        (100.0 * h0).min(h1).min(self.h_max)
    }

    /// Take one accepted step (retrying internally after rejections); returns the new time.
    ///
    /// Step control: PI controller of Hairer's DOPRI5 (β = 0.04, safety 0.9, growth ≤ 10×, shrink ≤ 5× after an
    /// accepted step), or Gustafsson's predictive controller from the last two accepted steps where that gives
    /// the smaller step (Hairer & Wanner, Solving ODEs II, §IV.8); after a rejection the step shrinks by at most [`MAX_SHRINK_AFTER_REJECTION`] and the step
    /// that follows the next acceptance does not grow (Hairer, Nørsett & Wanner, Solving ODEs I, §II.4).
    pub fn step<S: OdeSystem>(&mut self, sys: &mut S) -> Result<f64, StepError> {
        if self.eighth.is_some() {
            return self.step_eighth(sys);
        }
        let n = self.n;
        let mut rejected_here = false;
        loop {
            let h = self.h.min(self.h_max);
            if h.abs() < 1e-14 * self.t.abs().max(1e-300) || h < 1e-300 {
                return Err(StepError::StepTooSmall { t: self.t });
            }
            let t = self.t;
            {
                // stage loops over slices of one length: no bounds checks inside
                let y = &self.y[..n];
                let [k0, k1, k2, k3, k4, k5, k6] = &mut self.k;
                let (k0, k1, k2, k3, k4, k5, k6) = (&mut k0[..n], &mut k1[..n], &mut k2[..n], &mut k3[..n], &mut k4[..n], &mut k5[..n], &mut k6[..n]);
                let ys = &mut self.y_stage[..n];
                for i in 0..n {
                    ys[i] = y[i] + h * (A21 * k0[i]);
                }
                sys.rhs(t + C2 * h, ys, k1);
                for i in 0..n {
                    ys[i] = y[i] + h * (A31 * k0[i] + A32 * k1[i]);
                }
                sys.rhs(t + C3 * h, ys, k2);
                for i in 0..n {
                    ys[i] = y[i] + h * (A41 * k0[i] + A42 * k1[i] + A43 * k2[i]);
                }
                sys.rhs(t + C4 * h, ys, k3);
                for i in 0..n {
                    ys[i] = y[i] + h * (A51 * k0[i] + A52 * k1[i] + A53 * k2[i] + A54 * k3[i]);
                }
                sys.rhs(t + C5 * h, ys, k4);
                for i in 0..n {
                    ys[i] = y[i] + h * (A61 * k0[i] + A62 * k1[i] + A63 * k2[i] + A64 * k3[i] + A65 * k4[i]);
                }
                sys.rhs(t + h, ys, k5);
                let yn = &mut self.y_new[..n];
                for i in 0..n {
                    yn[i] = y[i] + h * (A71 * k0[i] + A73 * k2[i] + A74 * k3[i] + A75 * k4[i] + A76 * k5[i]);
                }
                sys.rhs(t + h, yn, k6);
                let err = &mut self.err[..n];
                for i in 0..n {
                    err[i] = h * (E1 * k0[i] + E3 * k2[i] + E4 * k3[i] + E5 * k4[i] + E6 * k5[i] + E7 * k6[i]);
                }
            }
            self.stats.rhs_calls += 6;
            if self.y_new.iter().chain(self.k[6].iter()).any(|v| !v.is_finite()) {
                rejected_here = true;
                self.retry_after_non_finite(h)?;
                continue;
            }
            // error norm with max(|y|, |y_new|) scaling
            let mut acc = 0.0;
            {
                let (y, yn, e, atol) = (&self.y[..n], &self.y_new[..n], &self.err[..n], &self.tol.atol[..n]);
                for i in 0..n {
                    let sc = atol[i] + self.tol.rtol * y[i].abs().max(yn[i].abs());
                    let r = e[i] / sc;
                    acc += r * r;
                }
            }
            let err = (acc / n as f64).sqrt();
            // PI step-size control (Hairer's DOPRI5: beta = 0.04, safety 0.9, factors 0.2..10). The powers of the
            // errors are taken from their logarithms (one ln per step, the previous steps' ln kept): one ln and
            // at most two exp instead of three pow.
            let ln_err = err.max(1e-300).ln();
            // err^0.17 / fac_old^0.04
            let fac = (((0.2 - 0.04 * 0.75) * ln_err - 0.04 * self.ln_fac_old).exp() / 0.9).clamp(0.1, 5.0);
            let mut h_new = h / fac;
            if err <= 1.0 {
                self.ln_fac_old = ln_err.max((1e-4f64).ln());
                if self.h_acc > 0.0 {
                    // Gustafsson's predictive controller (Hairer & Wanner, Solving ODEs II, §IV.8, as in RADAU5),
                    // taken when smaller: an error growing from step to step (a droplet's last stretch, where
                    // m ~ (τ − t)^{3/2}) shrinks the step before it fails instead of after.
                    // (err² / err_acc)^0.2
                    let fac_pred = (self.h_acc / h * (0.2 * (2.0 * ln_err - self.ln_err_acc)).exp() / 0.9).clamp(0.1, 5.0);
                    h_new = h_new.min(h / fac_pred);
                }
                self.h_acc = h;
                self.ln_err_acc = ln_err.max((1e-2f64).ln());
                if rejected_here {
                    h_new = h_new.min(h);
                }
                // dense output coefficients
                {
                    let y = &self.y[..n];
                    let yn = &self.y_new[..n];
                    let [k0, _, k2, k3, k4, k5, k6] = &self.k;
                    let (k0, k2, k3, k4, k5, k6) = (&k0[..n], &k2[..n], &k3[..n], &k4[..n], &k5[..n], &k6[..n]);
                    let [r0, r1, r2, r3, r4] = &mut self.rcont;
                    let (r0, r1, r2, r3, r4) = (&mut r0[..n], &mut r1[..n], &mut r2[..n], &mut r3[..n], &mut r4[..n]);
                    for i in 0..n {
                        let ydiff = yn[i] - y[i];
                        let bspl = h * k0[i] - ydiff;
                        r0[i] = y[i];
                        r1[i] = ydiff;
                        r2[i] = bspl;
                        r3[i] = ydiff - h * k6[i] - bspl;
                        r4[i] = h * (D1 * k0[i] + D3 * k2[i] + D4 * k3[i] + D5 * k4[i] + D6 * k5[i] + D7 * k6[i]);
                    }
                }
                self.k.swap(0, 6);
                return Ok(self.accept(t, h, h_new));
            }
            self.stats.rejected += 1;
            rejected_here = true;
            let fac11 = (0.2 * ln_err).exp();
            self.h = h / (fac11 / 0.9).clamp(1.0, MAX_SHRINK_AFTER_REJECTION);
        }
    }

    /// Dense output of the last accepted step at time `t` (t_old ≤ t ≤ t) into `out`. With the 8(5,3) pair,
    /// [`DormandPrince::prepare_dense`] must have been called after the step (a missing call is a bug and panics).
    pub fn dense(&self, t: f64, out: &mut [f64]) {
        if let Some(e) = &self.eighth {
            assert!(e.dense_ready, "dense output of the 8(5,3) pair used before prepare_dense (a bug)");
            let theta = if self.h_last > 0.0 { (t - self.t_old) / self.h_last } else { 1.0 };
            let theta1 = 1.0 - theta;
            let [f0, f1, f2, f3, f4, f5, f6] = &e.terms;
            for i in 0..self.n {
                // y_old + θ(F0 + θ'(F1 + θ(F2 + θ'(F3 + θ(F4 + θ'(F5 + θ F6)))))), θ' = 1 − θ
                let inner = f4[i] + theta1 * (f5[i] + theta * f6[i]);
                out[i] = e.y_old[i] + theta * (f0[i] + theta1 * (f1[i] + theta * (f2[i] + theta1 * (f3[i] + theta * inner))));
            }
            return;
        }
        let theta = if self.h_last > 0.0 { (t - self.t_old) / self.h_last } else { 1.0 };
        let theta1 = 1.0 - theta;
        for i in 0..self.n {
            out[i] = self.rcont[0][i] + theta * (self.rcont[1][i] + theta1 * (self.rcont[2][i] + theta * (self.rcont[3][i] + theta1 * self.rcont[4][i])));
        }
    }

    /// Replace the state (after a regime switch) and recompute the FSAL derivative.
    pub fn reset<S: OdeSystem>(&mut self, sys: &mut S, t: f64, y: &[f64]) {
        self.t = t;
        self.y.copy_from_slice(y);
        match &mut self.eighth {
            Some(e) => {
                // the last step's interpolant, if built, stays usable (its stages are no longer needed)
                sys.rhs(t, &self.y, &mut e.k[0]);
                e.fsal_pending = false;
            }
            None => sys.rhs(t, &self.y, &mut self.k[0]),
        }
        self.system_at_end = true;
        self.stats.rhs_calls += 1;
        self.h = (self.h * 0.1).max(1e-12);
        self.h_acc = 0.0;
    }

    /// Next step size the controller proposes \[s\].
    pub fn proposed_step(&self) -> f64 {
        self.h
    }

    /// Derivative of unknown `i` at the start and at the end of the last accepted step (read right after
    /// [`DormandPrince::step`], before a restart).
    pub fn step_slopes(&self, i: usize) -> (f64, f64) {
        match &self.eighth {
            Some(e) => (e.k[0][i], e.k[dop853_tableau::STAGES][i]),
            // after an accepted step k_0 holds f at its end and k_6 f at its start
            None => (self.k[6][i], self.k[0][i]),
        }
    }

    /// Build the dense output of the last accepted step if it is not built yet: nothing to do for the 5(4) pair;
    /// three more right-hand sides for the 8(5,3) pair (the system is then left at the last of them, see
    /// [`DormandPrince::system_at_end`]). Call it after a step and before the first [`DormandPrince::dense`] or
    /// [`locate_event`] on that step, and before a [`DormandPrince::reset`] that is to be followed by them.
    pub fn prepare_dense<S: OdeSystem>(&mut self, sys: &mut S) {
        use dop853_tableau::{A, C, D, STAGES, STAGES_DENSE};
        let n = self.n;
        let (h, t_old) = (self.h_last, self.t_old);
        let Some(e) = &mut self.eighth else { return };
        if e.dense_ready {
            return;
        }
        assert!(e.fsal_pending, "dense output of the 8(5,3) pair prepared after a restart (a bug)");
        let ys = &mut self.y_stage[..n];
        for s in STAGES + 1..STAGES_DENSE {
            stage_state(ys, &e.y_old[..n], h, &A[s][..s], &e.k[..s]);
            sys.rhs(t_old + C[s] * h, ys, &mut e.k[s]);
        }
        self.stats.rhs_calls += (STAGES_DENSE - STAGES - 1) as u64;
        self.system_at_end = false;
        let (y, y_old) = (&self.y[..n], &e.y_old[..n]);
        let [f0, f1, f2, rest @ ..] = &mut e.terms;
        let (k0, k_end) = (&e.k[0][..n], &e.k[STAGES][..n]);
        for i in 0..n {
            let dy = y[i] - y_old[i];
            f0[i] = dy;
            f1[i] = h * k0[i] - dy;
            f2[i] = 2.0 * dy - h * (k_end[i] + k0[i]);
        }
        for (term, d) in rest.iter_mut().zip(&D) {
            stage_state(&mut term[..n], &[], h, d, &e.k);
        }
        e.dense_ready = true;
    }

    /// One step of the 8(5,3) pair (retrying after rejections), with the step-size rule of Hairer's DOP853
    /// (err^(1/8), safety 0.9, growth ≤ 6×, shrink ≤ 3×, no growth right after a rejection).
    fn step_eighth<S: OdeSystem>(&mut self, sys: &mut S) -> Result<f64, StepError> {
        use dop853_tableau::{A, B, C, E3, E5, STAGES};
        let n = self.n;
        let mut rejected_here = false;
        {
            let e = self.eighth.as_mut().expect("8(5,3) buffers");
            if e.fsal_pending {
                e.k.swap(0, STAGES);
                e.fsal_pending = false;
            }
            e.dense_ready = false;
        }
        loop {
            let h = self.h.min(self.h_max);
            if h.abs() < 1e-14 * self.t.abs().max(1e-300) || h < 1e-300 {
                return Err(StepError::StepTooSmall { t: self.t });
            }
            let t = self.t;
            let e = self.eighth.as_mut().expect("8(5,3) buffers");
            let (y, ys, yn) = (&self.y[..n], &mut self.y_stage[..n], &mut self.y_new[..n]);
            for s in 1..STAGES {
                stage_state(ys, y, h, &A[s][..s], &e.k[..s]);
                sys.rhs(t + C[s] * h, ys, &mut e.k[s]);
            }
            stage_state(yn, y, h, &B, &e.k[..STAGES]);
            sys.rhs(t + h, yn, &mut e.k[STAGES]);
            self.stats.rhs_calls += STAGES as u64;
            self.system_at_end = false;
            if yn.iter().chain(e.k[STAGES][..n].iter()).any(|v| !v.is_finite()) {
                rejected_here = true;
                self.retry_after_non_finite(h)?;
                continue;
            }
            // error: the 5th-order estimate damped by the 3rd-order one (Hairer's DOP853),
            // err = |h| Σe5² / sqrt(n (Σe5² + 0.01 Σe3²)), each component scaled by atol + rtol·max(|y|, |y_new|)
            let (mut sum5, mut sum3) = (0.0, 0.0);
            let atol = &self.tol.atol[..n];
            for i in 0..n {
                let sc = atol[i] + self.tol.rtol * y[i].abs().max(yn[i].abs());
                let (mut e5, mut e3) = (0.0, 0.0);
                for (j, k) in e.k[..=STAGES].iter().enumerate() {
                    e5 += E5[j] * k[i];
                    e3 += E3[j] * k[i];
                }
                sum5 += (e5 / sc) * (e5 / sc);
                sum3 += (e3 / sc) * (e3 / sc);
            }
            let denominator = sum5 + 0.01 * sum3;
            let err = if denominator > 0.0 { h.abs() * sum5 / (denominator * n as f64).sqrt() } else { 0.0 };
            let fac11 = err.max(1e-300).powf(1.0 / 8.0);
            if err <= 1.0 {
                let mut h_new = h / (fac11 / 0.9).clamp(1.0 / 6.0, 3.0);
                if rejected_here {
                    h_new = h_new.min(h);
                }
                e.y_old[..n].copy_from_slice(y);
                e.fsal_pending = true;
                return Ok(self.accept(t, h, h_new));
            }
            self.stats.rejected += 1;
            rejected_here = true;
            self.h = h / (fac11 / 0.9).clamp(1.0, 3.0);
        }
    }
}

/// `out = base + h Σ_j a_j k_j` over the stages with a nonzero coefficient (one pass over the unknowns per
/// stage; an empty `base` means zero).
#[inline]
fn stage_state(out: &mut [f64], base: &[f64], h: f64, a: &[f64], k: &[Vec<f64>]) {
    let n = out.len();
    if base.is_empty() {
        out.fill(0.0);
    } else {
        out.copy_from_slice(&base[..n]);
    }
    for (aj, kj) in a.iter().zip(k) {
        if *aj != 0.0 {
            let c = h * aj;
            for (o, v) in out.iter_mut().zip(&kj[..n]) {
                *o += c * v;
            }
        }
    }
}

/// Find t in [t_a, t_b] (within the last step) where `g(dense(t))` crosses zero, by Brent's method (`numerics::root`) to `tol`; the step's end when the interpolant has no sign change.
pub fn locate_event(stepper: &DormandPrince, mut g: impl FnMut(&[f64]) -> f64, buf: &mut [f64], tol: f64) -> f64 {
    let (a, b) = (stepper.t_old, stepper.t);
    let tolerance = crate::numerics::root::Tolerance::absolute(tol);
    let root = crate::numerics::root::brent(
        |t| {
            stepper.dense(t, buf);
            g(buf)
        },
        a,
        b,
        tolerance,
    );
    match root {
        Ok(r) => r.x,
        // no sign change on the interpolant (the event lies at an end) or a non-finite value: the step's end
        Err(e) => e.best().unwrap_or(b),
    }
}

#[cfg(test)]
mod tests;
