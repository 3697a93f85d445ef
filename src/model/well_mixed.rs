//! One droplet of a multicomponent fuel: well-mixed (rapid-mixing) liquid with uniform temperature, coupled to
//! the quasi-steady film (film.rs), optionally decelerating by drag, with a heat-limited boiling regime. The
//! integration core (one accepted step, the end of life, regime changes) is shared by the run driver here and
//! by the stepping API (stepping.rs).

use crate::props::activity::Activity;
use crate::props::liquid;

use super::film::{Film, FilmResult};
use super::history::{HistoryRow, Observer, Regime, RunOutcome, RunResult, Status};
use super::inputs::{integration_failure, validity_notes, DropletInputs, Motion};
use super::integrator::{locate_event, DormandPrince, OdeSystem, StepError, Tolerances};
use super::guard::{RowKind, RunRows};
use super::watch::RunWatch;
use super::ModelError;

/// Threshold of Σ X_s at which the heat-limited boiling regime takes over; the regime holds the surface at the
/// temperature where Σ X_s equals it (the bubble point at BOILING_THRESHOLD × p, within a fraction of a kelvin of
/// the bubble point), so that entering and leaving the regime changes no temperature.
pub const BOILING_THRESHOLD: f64 = 0.995;

/// Temperature at which the heat-limited boiling regime holds a liquid of mole fractions `x` at pressure `p` \[K\]:
/// Σ x_i γ_i p_sat,i(T) = BOILING_THRESHOLD · p (γ from `activity`; 1 for the ideal liquid). None when the liquid has no bubble point at that pressure.
pub fn boiling_hold_temperature(comps: &[std::sync::Arc<crate::data::Component>], activity: &mut Activity, x: &[f64], p: f64) -> Option<f64> {
    liquid::bubble_point_with(comps, activity, x, BOILING_THRESHOLD * p).ok()
}

/// The well-mixed droplet as an ODE system: y = [m_1..m_N, T, U, e_1..e_N].
pub struct WellMixed {
    film: Film,
    n: usize,
    regime: Regime,
    fixed_temperature: bool,
    injected: bool,
    w: Vec<f64>,
    x: Vec<f64>,
    latent: Vec<f64>,
    w_probe: Vec<f64>,
    x_probe: Vec<f64>,
    /// Last film result (from the most recent rhs call).
    pub last: FilmResult,
    /// Surface temperature used in the last rhs call \[K\].
    pub last_surface_temperature: f64,
    initial_mass: f64,
    /// Rows carry the liquid and vapour mass fractions (false: empty fractions, for observers that keep no rows).
    rows_with_fractions: bool,
}

impl WellMixed {
    fn unpack(&mut self, y: &[f64]) -> f64 {
        let n = self.n;
        // slices of one length: the loops need no bounds checks
        let (y, w) = (&y[..n], &mut self.w[..n]);
        let mut m = 0.0;
        for i in 0..n {
            m += y[i].max(0.0);
        }
        let m_safe = m.max(1e-300);
        for i in 0..n {
            w[i] = y[i].max(0.0) / m_safe;
        }
        liquid::mass_to_mole_into(&self.film.setup.components, &self.w, &mut self.x);
        m
    }

    /// Boiling-regime (hold) temperature of the composition `x` with the film's activity model \[K\] (see
    /// [`boiling_hold_temperature`]).
    fn bubble_point(film: &mut Film, x: &[f64]) -> f64 {
        let fallback = film.setup.ambient_temperature;
        let pressure = film.setup.pressure;
        boiling_hold_temperature(&film.setup.components, &mut film.setup.activity, x, pressure).unwrap_or(fallback)
    }

    /// Heat into the liquid \[W\] if the droplet at state `y` evaporated at its hold temperature without the
    /// heat limit (the evaporating regime's film at Σ X_s = BOILING_THRESHOLD): positive means the evaporating
    /// regime would heat the droplet past the hold temperature (boiling holds it there); zero or negative means
    /// the heat no longer holds it at the bubble point and it leaves the boiling regime.
    fn heat_at_hold(&mut self, y: &[f64]) -> f64 {
        let n = self.n;
        let m = self.unpack(y);
        let x = std::mem::take(&mut self.x);
        let t_s = Self::bubble_point(&mut self.film, &x);
        let (rho_l, _) = self.film.liquid_state(&self.w, t_s, &mut self.latent);
        let d = crate::numerics::cbrt(6.0 * m.max(1e-300) / (std::f64::consts::PI * rho_l));
        self.film.liquid_density = rho_l;
        let latent = std::mem::take(&mut self.latent);
        let f = self.film.evaluate(&x, t_s, d, y[n + 1], &latent, None);
        self.x = x;
        self.latent = latent;
        f.heat_to_liquid
    }

    /// Effective latent heat in the boiling regime: Σ ε_i L_i + c_pL dT_b/d(evaporated fraction along ε).
    fn boiling_latent(&mut self, t_b: f64, cp_l: f64) -> f64 {
        // ε = equilibrium vapour composition (mass) at the bubble point
        let n = self.n;
        let comps = &self.film.setup.components;
        let gamma = self.film.setup.activity.gammas(&self.x, t_b);
        let mut sum = 0.0;
        for i in 0..n {
            self.w_probe[i] = self.x[i] * gamma[i] * comps[i].vapor_pressure(t_b) * comps[i].molar_mass();
            sum += self.w_probe[i];
        }
        let mut l = 0.0;
        for i in 0..n {
            self.w_probe[i] /= sum;
            l += self.w_probe[i] * self.latent[i];
        }
        // composition after evaporating a small fraction h of the liquid along ε: w' = (w − h ε)/(1 − h)
        let h = 1e-4;
        for i in 0..n {
            self.w_probe[i] = ((self.w[i] - h * self.w_probe[i]) / (1.0 - h)).max(0.0);
        }
        liquid::mass_to_mole_into(comps, &self.w_probe, &mut self.x_probe);
        let t_b2 = boiling_hold_temperature(comps, &mut self.film.setup.activity, &self.x_probe, self.film.setup.pressure).unwrap_or(t_b);
        // per unit evaporated mass: dT_b/dm_evap = (t_b2 − t_b)/(h m); sensible heat m cp dT_b = cp (t_b2 − t_b)/h per kg
        l + cp_l * (t_b2 - t_b).max(0.0) / h
    }

    /// Evaluate the film at state y and write derivatives; also used for rows.
    fn evaluate(&mut self, y: &[f64], dydt: &mut [f64]) {
        let n = self.n;
        let m = self.unpack(y);
        let t_state = y[n];
        let t_s = if self.regime == Regime::Boiling { Self::bubble_point(&mut self.film, &self.x) } else { t_state };
        // the four liquid properties of each component from one look-up; the film keeps the vapour pressures
        let (rho_l, cp_l) = self.film.liquid_state(&self.w, t_s, &mut self.latent);
        let d = crate::numerics::cbrt(6.0 * m.max(1e-300) / (std::f64::consts::PI * rho_l));
        let speed = y[n + 1];
        let boiling = if self.regime == Regime::Boiling { Some(self.boiling_latent(t_s, cp_l)) } else { None };
        self.film.liquid_density = rho_l;
        let x = std::mem::take(&mut self.x);
        let latent = std::mem::take(&mut self.latent);
        let f = self.film.evaluate(&x, t_s, d, speed, &latent, boiling);
        self.x = x;
        self.latent = latent;
        self.last = f;
        self.last_surface_temperature = t_s;
        for i in 0..n {
            let rate = self.film.species_rate[i];
            dydt[i] = -rate;
            dydt[n + 2 + i] = rate;
        }
        dydt[n] = if self.fixed_temperature {
            0.0
        } else if let Some(l_eff) = boiling {
            // T follows the bubble point: dT/dt = (L_eff − Σ ε L) / cp_L · mdot / m
            let l_plain: f64 = (0..n).map(|i| self.film.species_rate[i] * self.latent[i]).sum::<f64>() / f.evaporation_rate.max(1e-300);
            (l_eff - l_plain) / cp_l * f.evaporation_rate / m.max(1e-300)
        } else {
            f.heat_to_liquid / (m.max(1e-300) * cp_l)
        };
        dydt[n + 1] = if self.injected && d > 0.0 {
            -0.375 * f.drag_coefficient * f.ambient_density / rho_l * speed * speed.abs() / (0.5 * d)
        } else {
            0.0
        };
        let _ = self.initial_mass;
    }
}

impl WellMixed {
    /// The well-mixed system of a run and its initial state (no flash, no checks): for benchmarks and for
    /// library users who drive their own integrator.
    pub fn new(inp: &DropletInputs) -> (Self, Vec<f64>) {
        let n = inp.fuel.len();
        let comps = inp.fuel.components.clone();
        let mut film = Film::new(inp.film_setup());
        // a droplet at constant slip needs no drag coefficient
        film.drag_needed = matches!(inp.motion, Motion::Injected { .. });
        film.heat_iteration_tolerance = crate::model::film::heat_iteration_tolerance(inp.rtol);
        let t0 = inp.initial_temperature;
        let rho0 = liquid::density(&comps, &inp.fuel.mass_fractions, t0);
        let m0 = std::f64::consts::PI / 6.0 * rho0 * inp.initial_diameter.powi(3);
        let velocity0 = match inp.motion {
            Motion::Fixed { velocity } | Motion::Injected { velocity } => velocity,
        };
        let sys = WellMixed {
            film,
            n,
            regime: Regime::Evaporating,
            fixed_temperature: inp.fixed_temperature,
            injected: matches!(inp.motion, Motion::Injected { .. }),
            w: vec![0.0; n],
            x: vec![0.0; n],
            latent: vec![0.0; n],
            w_probe: vec![0.0; n],
            x_probe: vec![0.0; n],
            last: FilmResult::default(),
            last_surface_temperature: t0,
            initial_mass: m0,
            rows_with_fractions: true,
        };
        let mut y0 = vec![0.0; 2 * n + 2];
        for i in 0..n {
            y0[i] = m0 * inp.fuel.mass_fractions[i];
        }
        y0[n] = t0;
        y0[n + 1] = velocity0;
        (sys, y0)
    }
}

impl OdeSystem for WellMixed {
    fn dim(&self) -> usize {
        2 * self.n + 2
    }
    fn rhs(&mut self, _t: f64, y: &[f64], dydt: &mut [f64]) {
        self.evaluate(y, dydt);
    }
}
/// Adiabatic flash of a superheated liquid at pressure `p`: the superheat m cp (T − T_b) evaporates liquid of
/// the equilibrium-vapour composition, in portions of at most 1 %, until the liquid sits at its bubble point.
/// Returns the component masses left and the final temperature \[K\]. `activity`: the liquid activity model.
pub fn adiabatic_flash(comps: &[std::sync::Arc<crate::data::Component>], activity: &mut Activity, w0: &[f64], t0: f64, m0: f64, p: f64, end_mass_fraction: f64) -> (Vec<f64>, f64) {
    let n = comps.len();
    let mut masses: Vec<f64> = (0..n).map(|i| m0 * w0[i]).collect();
    let mut t = t0;
    let mut w = vec![0.0; n];
    let mut x = vec![0.0; n];
    let mut eps = vec![0.0; n];
    for _ in 0..10_000 {
        let m: f64 = masses.iter().sum();
        if m <= end_mass_fraction * m0 {
            break;
        }
        for i in 0..n {
            w[i] = masses[i] / m;
        }
        liquid::mass_to_mole_into(comps, &w, &mut x);
        let tb = liquid::bubble_point_with(comps, activity, &x, p).unwrap_or(t);
        if t <= tb + 1e-9 {
            t = t.max(tb);
            break;
        }
        let gamma = activity.gammas(&x, tb);
        let mut s = 0.0;
        for i in 0..n {
            eps[i] = x[i] * gamma[i] * comps[i].vapor_pressure(tb) * comps[i].molar_mass();
            s += eps[i];
        }
        let mut l = 0.0;
        for i in 0..n {
            eps[i] /= s;
            l += eps[i] * comps[i].latent_heat(tb);
        }
        let cp = liquid::heat_capacity(comps, &w, 0.5 * (t + tb));
        let dm_full = m * cp * (t - tb) / l;
        let dm = dm_full.min(0.01 * m);
        for i in 0..n {
            masses[i] = (masses[i] - dm * eps[i]).max(0.0);
        }
        t = if dm >= dm_full { tb } else { t - dm * l / (m * cp) };
    }

    (masses, t)
}

// ---- Integration core: shared by the run driver below and by the stepping API ----

impl WellMixed {
    /// The system and its initial state for `inp`, after an adiabatic flash when the droplet starts at or above
    /// its boiling-regime temperature (then boiling if the net heat holds it there); the note of the flash.
    pub(crate) fn prepare(inp: &DropletInputs) -> (Self, Vec<f64>, Option<String>) {
        let n = inp.fuel.len();
        let comps = inp.fuel.components.clone();
        let (mut sys, mut y0) = WellMixed::new(inp);
        let m0 = sys.initial_mass;
        let w0 = &inp.fuel.mass_fractions;
        let t0 = inp.initial_temperature;
        let x0 = inp.fuel.mole_fractions();
        if inp.fixed_temperature {
            return (sys, y0, None);
        }
        // A start well below the hold temperature (bubble pressure at t0 under 90 % of the hold pressure; it rises
        // with temperature) is told by one bubble-pressure evaluation instead of the root search.
        if sys.film.setup.activity.bubble_pressure(&comps, &x0, t0) < 0.9 * BOILING_THRESHOLD * inp.pressure {
            return (sys, y0, None);
        }
        // No bubble point (vapour pressure below the ambient pressure at every temperature) means no boiling.
        let t_hold0 = boiling_hold_temperature(&comps, &mut sys.film.setup.activity, &x0, inp.pressure).unwrap_or(f64::INFINITY);
        if t0 < t_hold0 - 1e-9 {
            return (sys, y0, None);
        }
        let t_bubble0 = sys.film.bubble_point(&x0).unwrap_or(f64::INFINITY);
        let (masses, tb) = adiabatic_flash(&comps, &mut sys.film.setup.activity, w0, t0, m0, BOILING_THRESHOLD * inp.pressure, inp.end_mass_fraction);
        let m_left: f64 = masses.iter().sum();
        for i in 0..n {
            y0[i] = masses[i];
            y0[n + 2 + i] = m0 * w0[i] - masses[i];
        }
        y0[n] = tb;
        let holds = sys.heat_at_hold(&y0) > 0.0;
        if holds {
            sys.regime = Regime::Boiling;
        }
        let note = format!(
            "initial temperature {t0:.2} K is at or above the bubble point ({t_bubble0:.2} K at the ambient pressure; the boiling regime holds Σ X_s = {BOILING_THRESHOLD}, {t_hold0:.2} K): {:.3} % of the mass flashed at injection (adiabatic flash) down to {tb:.2} K, {}",
            100.0 * (1.0 - m_left / m0),
            if holds { "then heat-limited boiling" } else { "where the net heat cannot hold it at the bubble point: it evaporates below it (no boiling)" }
        );
        (sys, y0, Some(note))
    }

    /// Integrator tolerances of a droplet of initial mass `m0` \[kg\] and initial relative speed `speed0` \[m/s\].
    pub(crate) fn tolerances(rtol: f64, n: usize, m0: f64, speed0: f64) -> Tolerances {
        let mut atol = vec![rtol * 1e-3 * m0; 2 * n + 2];
        atol[n] = rtol * 1.0;
        atol[n + 1] = rtol * speed0.max(1.0) * 1e-3;
        Tolerances { rtol, atol }
    }

    /// Initial droplet mass \[kg\].
    pub(crate) fn initial_mass(&self) -> f64 {
        self.initial_mass
    }

    /// Heat regime the right-hand side is in.
    pub(crate) fn regime(&self) -> Regime {
        self.regime
    }

    /// Set the heat regime (a droplet state taken up again).
    pub(crate) fn set_regime(&mut self, regime: Regime) {
        self.regime = regime;
    }

    /// The gas film (its setup holds the far field).
    pub(crate) fn film_mut(&mut self) -> &mut Film {
        &mut self.film
    }

    /// Set the relative motion: with drag (`true`: the speed relaxes by drag) or at constant slip.
    pub(crate) fn set_drag(&mut self, drag: bool) {
        self.injected = drag;
        self.film.drag_needed = drag;
    }

    /// History row at time `t` and state `y`; `fresh`: evaluate the film at y first, otherwise the system still
    /// holds the evaluation at y (the last right-hand-side call of an accepted Dormand–Prince step is at its end).
    #[allow(clippy::too_many_arguments)]
    fn row(&mut self, initial_diameter: f64, m0: f64, t: f64, y: &[f64], dydt: &mut [f64], fresh: bool) -> HistoryRow {
        let n = self.n;
        if fresh {
            self.evaluate(y, dydt);
        }
        let m: f64 = y[..n].iter().map(|v| v.max(0.0)).sum();
        // the liquid density of the evaluation at y (its composition at its surface temperature), as
        // `liquid::density` gives it
        let rho = self.film.liquid_density;
        let d = (6.0 * m / (std::f64::consts::PI * rho)).cbrt();
        let mdot = self.last.evaporation_rate;
        let vapor: Vec<f64> = if !self.rows_with_fractions {
            vec![]
        } else if mdot.abs() > 1e-300 {
            self.film.species_rate.iter().map(|r| r / mdot).collect()
        } else {
            let s: f64 = self.film.surface_mass.iter().sum();
            self.film.surface_mass.iter().map(|v| if s > 0.0 { v / s } else { 0.0 }).collect()
        };
        HistoryRow {
            time: t,
            diameter: d,
            d2_ratio: (d / initial_diameter).powi(2),
            surface_temperature: self.last_surface_temperature,
            mass: m,
            evaporated_fraction: 1.0 - m / m0,
            velocity: y[n + 1],
            film: self.last,
            liquid_mass_fractions: if self.rows_with_fractions { self.w.clone() } else { vec![] },
            vapor_mass_fractions: vapor,
            regime: self.regime,
            mean_temperature: self.last_surface_temperature,
            center_temperature: self.last_surface_temperature,
            surface_liquid_mass_fractions: vec![],
        }
    }
}

/// Liquid fraction of the initial mass `m0` left at state `y` of `n` components \[-\].
pub(crate) fn remaining(y: &[f64], n: usize, m0: f64) -> f64 {
    y[..n].iter().sum::<f64>() / m0
}

/// One accepted integrator step (retrying after rejections); a failure becomes a one-line model error naming
/// the state it happened in.
pub(crate) fn integrate_step(sys: &mut WellMixed, stepper: &mut DormandPrince, inp: &DropletInputs) -> Result<(), ModelError> {
    let t_prev = stepper.t;
    if let Err(e) = stepper.step(sys) {
        let what = match e {
            StepError::StepTooSmall { .. } => "the step size fell to the round-off limit",
            StepError::NonFinite { .. } => "the equations gave a non-finite value",
        };
        return Err(integration_failure(inp, t_prev, stepper.y[sys.n], what));
    }
    Ok(())
}

/// End of life inside the last accepted step: the time where `end_mass_fraction` of the initial mass `m0`
/// remains (located on the dense output), with the state there written to `y_end`; None while more remains.
pub(crate) fn end_of_life(stepper: &mut DormandPrince, sys: &mut WellMixed, n: usize, m0: f64, end_mass_fraction: f64, buf: &mut [f64], y_end: &mut [f64]) -> Option<f64> {
    let t_now = stepper.t;
    if remaining(&stepper.y, n, m0) > end_mass_fraction {
        return None;
    }
    stepper.prepare_dense(sys);
    let te = locate_event(stepper, |y| remaining(y, n, m0) - end_mass_fraction, buf, 1e-12 * t_now.max(1e-9));
    stepper.dense(te, y_end);
    Some(te)
}

/// Highest temperature (unknown `n`) on the dense output of the last accepted step, by golden-section search
/// (the step's temperature rises at its start and falls at its end: one interior peak) \[K\].
fn temperature_peak(stepper: &DormandPrince, n: usize, buf: &mut [f64]) -> f64 {
    let ratio = 0.5 * (5f64.sqrt() - 1.0);
    let (mut a, mut b) = (stepper.t_old, stepper.t);
    let mut at = |t: f64| {
        stepper.dense(t, buf);
        buf[n]
    };
    let (mut c, mut d) = (b - ratio * (b - a), a + ratio * (b - a));
    let (mut fc, mut fd) = (at(c), at(d));
    // 0.618^48 ≈ 1e-10 of the step: the peak value is then exact to round-off (it is flat at the peak)
    for _ in 0..48 {
        if fc >= fd {
            b = d;
            d = c;
            fd = fc;
            c = b - ratio * (b - a);
            fc = at(c);
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + ratio * (b - a);
            fd = at(d);
        }
    }
    fc.max(fd)
}

/// A change of heat regime found in the last accepted step; the integrator was restarted at its time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) enum RegimeChange {
    /// Σ X_s reached the boiling threshold; `entered`: the net heat holds the droplet at `hold_temperature` \[K\].
    Onset {
        /// Time \[s\].
        time: f64,
        /// True when the droplet entered the boiling regime.
        entered: bool,
        /// Boiling-regime temperature \[K\].
        hold_temperature: f64,
    },
    /// The net heat no longer holds the droplet at the bubble point: it leaves the boiling regime.
    Exit {
        /// Time \[s\].
        time: f64,
        /// Temperature at the exit \[K\].
        temperature: f64,
    },
}

/// Regime change in the last accepted step (not the final one): boiling onset when Σ X_s reaches the threshold
/// while the heat would carry the droplet past it, or the exit from boiling when the net heat no longer holds
/// the droplet at the bubble point. The state at the change is written to `y_end` and the integrator restarted
/// there.
pub(crate) fn regime_change(sys: &mut WellMixed, stepper: &mut DormandPrince, fixed_temperature: bool, y_end: &mut [f64], buf: &mut [f64]) -> Option<RegimeChange> {
    let n = sys.n;
    let t_now = stepper.t;
    if sys.regime == Regime::Evaporating && !fixed_temperature && sys.last.surface_vapor_mole_fraction >= BOILING_THRESHOLD {
        stepper.prepare_dense(sys);
        let onset = {
            let f = &mut *sys;
            locate_event(
                stepper,
                |y| {
                    let _ = f.unpack(y);
                    let x = std::mem::take(&mut f.x);
                    let s = f.film.surface_equilibrium(&x, y[n]) - BOILING_THRESHOLD;
                    f.x = x;
                    s
                },
                buf,
                1e-10 * t_now.max(1e-9),
            )
        };
        stepper.dense(onset, y_end);
        let _ = sys.unpack(y_end);
        let x = sys.x.clone();
        y_end[n] = WellMixed::bubble_point(&mut sys.film, &x);
        let entered = sys.heat_at_hold(y_end) > 0.0;
        if entered {
            sys.regime = Regime::Boiling;
        }
        stepper.reset(sys, onset, y_end);
        return Some(RegimeChange::Onset { time: onset, entered, hold_temperature: y_end[n] });
    }
    if sys.regime == Regime::Boiling && !fixed_temperature && sys.heat_at_hold(y_end) <= 0.0 {
        stepper.prepare_dense(sys);
        let exit = {
            let f = &mut *sys;
            locate_event(stepper, |y| f.heat_at_hold(y), buf, 1e-10 * t_now.max(1e-9))
        };
        stepper.dense(exit, y_end);
        sys.regime = Regime::Evaporating;
        let _ = sys.unpack(y_end);
        let x = sys.x.clone();
        y_end[n] = WellMixed::bubble_point(&mut sys.film, &x);
        stepper.reset(sys, exit, y_end);
        return Some(RegimeChange::Exit { time: exit, temperature: y_end[n] });
    }
    None
}

// ---- Run driver: a whole droplet life over the integration core ----

/// Bookkeeping of a well-mixed run between steps: watches, crossings, boiling entries and exits, the end.
struct RunLog {
    watch: RunWatch,
    boiling_onset: Option<f64>,
    boiling_entries: usize,
    boiling_exits: usize,
    crossing: [Option<f64>; 3],
    status: Status,
    lifetime: Option<f64>,
    notes: Vec<String>,
}

/// Evaporated-fraction levels whose times the outcome reports (remaining fractions 0.9, 0.5, 0.1: t10, t50, t90).
const LEVELS: [f64; 3] = [0.9, 0.5, 0.1];

/// Run one droplet with the well-mixed liquid: prepare (flash), integrate step by step with events, sum up.
pub(crate) fn simulate_well_mixed(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    let n = inp.fuel.len();
    let comps = inp.fuel.components.clone();
    let mut notes = validity_notes(inp);
    let (mut sys, y0, flash_note) = WellMixed::prepare(inp);
    notes.extend(flash_note);
    let m0 = sys.initial_mass;
    let tol = WellMixed::tolerances(inp.rtol, n, m0, y0[n + 1]);
    let mut dydt = vec![0.0; 2 * n + 2];
    let mut stepper = DormandPrince::with_method(&mut sys, 0.0, &y0, tol, 0.0, inp.max_time / 20.0, inp.integrator);
    let mut history = RunRows::new(observer.history_times());
    let mut stagnation = super::guard::StagnationGuard::default();
    let wants_rows = observer.wants_rows();
    let mut buf = vec![0.0; 2 * n + 2];
    let mut y_end = vec![0.0; 2 * n + 2];
    let mut y_sample = if history.sampling() { vec![0.0; 2 * n + 2] } else { vec![] };

    // an observer that keeps no rows gets them without fractions (no allocation per step); the watches read
    // the liquid mass fractions from the system
    sys.rows_with_fractions = wants_rows;
    let first = sys.row(inp.initial_diameter, m0, 0.0, &y0, &mut dydt, true);
    let boiling_onset = if sys.regime == Regime::Boiling { Some(0.0) } else { None };
    let mut log = RunLog {
        watch: RunWatch::start(&comps, &sys.w, &first),
        boiling_onset,
        boiling_entries: usize::from(boiling_onset.is_some()),
        boiling_exits: 0,
        // a flash at injection may already have evaporated 10 % or more: those times are 0, not missing
        crossing: LEVELS.map(|lvl| (remaining(&y0, n, m0) <= lvl).then_some(0.0)),
        status: Status::TimeLimit,
        lifetime: None,
        notes,
    };
    if wants_rows {
        observer.on_step(&first);
        history.push(first, RowKind::Event);
    }
    loop {
        let t_prev = stepper.t;
        let rem_prev = remaining(&stepper.y, n, m0);
        integrate_step(&mut sys, &mut stepper, inp)?;
        let rem_now = remaining(&stepper.y, n, m0);
        for (k, lvl) in LEVELS.iter().enumerate() {
            if log.crossing[k].is_none() && rem_prev > *lvl && rem_now <= *lvl {
                stepper.prepare_dense(&mut sys);
                log.crossing[k] = Some(locate_event(&stepper, |y| remaining(y, n, m0) - lvl, &mut buf, 1e-12 * stepper.t.max(1e-9)));
            }
        }
        let _ = t_prev;
        if sys.regime() == Regime::Evaporating && !inp.fixed_temperature {
            // a temperature peak inside the step (rising at its start, falling at its end) is found on the
            // dense output, so the highest surface temperature does not depend on where the steps fall
            let (rise, fall) = stepper.step_slopes(n);
            if rise > 0.0 && fall < 0.0 {
                stepper.prepare_dense(&mut sys);
                log.watch.max_surface_temperature = log.watch.max_surface_temperature.max(temperature_peak(&stepper, n, &mut buf));
            }
        }
        y_end.copy_from_slice(&stepper.y);
        let mut t_now = stepper.t;
        let end = end_of_life(&mut stepper, &mut sys, n, m0, inp.end_mass_fraction, &mut buf, &mut y_end);
        let finished = end.is_some();
        if let Some(te) = end {
            t_now = te;
            log.lifetime = Some(te);
            log.status = Status::Evaporated;
        }
        // evaluated again unless the system is still at the step's end (the 8(5,3) pair's dense output moves it)
        let mut row = sys.row(inp.initial_diameter, m0, t_now, &y_end, &mut dydt, finished || !stepper.system_at_end());
        log.watch.observe(&comps, &sys.w, &row, t_now);
        let regime_in_step = sys.regime();
        let mut changed = false;
        if !finished {
            if let Some(change) = regime_change(&mut sys, &mut stepper, inp.fixed_temperature, &mut y_end, &mut buf) {
                t_now = log.regime_changed(change);
                row = sys.row(inp.initial_diameter, m0, t_now, &y_end, &mut dydt, true);
                changed = true;
            }
        }
        let stop = observer.on_step(&row);
        let event = finished || changed || stop || stepper.t >= inp.max_time;
        if wants_rows && history.sampling() {
            // Rows at the requested times inside this step, up to the event (end of life, regime change) or the
            // step's end, from the Dormand–Prince continuous extension of the step and evaluated in the regime
            // the step was taken in; times after a regime change are served by the steps that follow it.
            let regime_after = sys.regime();
            sys.set_regime(regime_in_step);
            while let Some(ts) = history.take_due(t_now, !event) {
                // (after a regime change's restart the interpolant was built before it)
                stepper.prepare_dense(&mut sys);
                stepper.dense(ts, &mut y_sample);
                let sample = sys.row(inp.initial_diameter, m0, ts, &y_sample, &mut dydt, true);
                history.push(sample, RowKind::Sample);
            }
            sys.set_regime(regime_after);
            if event {
                // a requested time at the event itself is served by the event's row
                let _ = history.take_due(t_now, true);
            }
        }
        if wants_rows {
            history.push(row, if event { RowKind::Event } else { RowKind::Step });
        }
        if finished {
            stepper.y.copy_from_slice(&y_end);
            stepper.t = t_now;
            break;
        }
        if stop {
            log.status = Status::Stopped;
            break;
        }
        if stepper.t >= inp.max_time {
            break;
        }
        if stepper.stats.steps > 2_000_000 {
            return Err(ModelError::Integration { time: stepper.t, reason: "more than 2 000 000 steps".into() });
        }
        if let Some(reason) = stagnation.check(stepper.stats.steps, stepper.t, inp.max_time, 1.0 - remaining(&stepper.y, n, m0), 2_000_000) {
            return Err(ModelError::Integration { time: stepper.t, reason });
        }
    }
    Ok(RunResult { outcome: log.outcome(inp, &stepper, m0), row_times: history.row_times(), history: history.into_rows(), profiles: vec![] })
}

impl RunLog {
    /// Count a regime change and note the first onset and exit; returns its time.
    fn regime_changed(&mut self, change: RegimeChange) -> f64 {
        match change {
            RegimeChange::Onset { time, entered, hold_temperature } => {
                if entered {
                    self.boiling_entries += 1;
                    if self.boiling_onset.is_none() {
                        self.boiling_onset = Some(time);
                        self.notes.push(format!(
                            "surface reached the bubble point (held at {hold_temperature:.2} K, where Σ X_s = {BOILING_THRESHOLD}) at t = {time:.4e} s: heat-limited boiling regime while the net heat holds it there"
                        ));
                    }
                }
                time
            }
            RegimeChange::Exit { time, temperature } => {
                self.boiling_exits += 1;
                if self.boiling_exits == 1 {
                    self.notes.push(format!(
                        "at t = {time:.4e} s the net heat into the liquid no longer holds the droplet at the bubble point ({temperature:.2} K): it leaves the boiling regime and evaporates below it"
                    ));
                }
                time
            }
        }
    }

    /// The run summary at the integrator's final state: notes, mass balance, crossings, final composition.
    fn outcome(mut self, inp: &DropletInputs, stepper: &DormandPrince, m0: f64) -> RunOutcome {
        let n = inp.fuel.len();
        let comps = &inp.fuel.components;
        let w0 = &inp.fuel.mass_fractions;
        let y = &stepper.y;
        let mut mass_err: f64 = 0.0;
        for i in 0..n {
            let initial = m0 * w0[i];
            if initial > 0.0 {
                mass_err = mass_err.max(((y[i] + y[n + 2 + i]) - initial).abs() / initial);
            }
        }
        if self.boiling_entries > 1 || self.boiling_exits > 1 {
            self.notes.push(format!("the droplet entered the boiling regime {} time(s) and left it {} time(s)", self.boiling_entries, self.boiling_exits));
        }
        self.watch.push_notes(comps, inp.correlation, &mut self.notes);
        if self.status == Status::TimeLimit {
            self.notes.push(format!(
                "time limit {:.4e} s reached with {:.2} % of the mass evaporated",
                inp.max_time,
                100.0 * (1.0 - remaining(y, n, m0))
            ));
        }
        let m_end: f64 = y[..n].iter().map(|v| v.max(0.0)).sum();
        RunOutcome {
            status: self.status,
            lifetime: self.lifetime,
            t10: self.crossing[0],
            t50: self.crossing[1],
            t90: self.crossing[2],
            heatup_end: self.watch.heatup_end,
            max_surface_temperature: self.watch.max_surface_temperature,
            boiling_onset: self.boiling_onset,
            end_time: stepper.t,
            final_evaporated_fraction: 1.0 - remaining(y, n, m0),
            regime_notes: self.notes,
            stats: stepper.stats,
            mass_balance_error: mass_err,
            evaporated_mass: y[n + 2..].to_vec(),
            final_liquid_mass_fractions: y[..n].iter().map(|v| v.max(0.0) / m_end.max(1e-300)).collect(),
        }
    }
}

#[cfg(test)]
mod tests;
