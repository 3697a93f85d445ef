//! Stepping API for Lagrangian spray solvers: a droplet state and [`Stepper::advance`], which integrates one
//! solver step in a given far field and returns the exchange terms (mass per species, energy, momentum). Both
//! liquid models run through the same integration core as [`super::simulate`] (well_mixed.rs, resolved.rs).
//!
//! Reference state of the energy term: every pure liquid has zero enthalpy at 298.15 K
//! ([`crate::props::enthalpy`]); the vapour leaving the droplet carries h_L,i(T_s) + L_i(T_s). The energy given to
//! the gas over a step is the droplet's loss of liquid enthalpy, which by the model's energy equation equals
//! ∫ (Σ ṁ_i h_V,i(T_s) − Q_gas) dt. A solver whose vapour enthalpy is zero for the vapour at 298.15 K subtracts
//! Σ mass_i · L_i(298.15 K) ([`Stepper::reference_latent_heats`]).
//!
//! Step size: the integrator's last proposed step is kept in the state and carries across calls. In a far field
//! equal to the previous call's, the integrator runs on past the requested time and the state at that time is
//! taken from its dense output (well-mixed: the Dormand–Prince 4th-order interpolant; resolved: linear between
//! accepted steps), so a life advanced in many small equal steps costs about what the one-shot run costs and
//! follows the very same steps. When the far field changes, the integrator restarts from the state and lands on
//! the requested time exactly.

use std::sync::Arc;

use crate::data::Component;
use crate::props::enthalpy::{liquid_enthalpy, liquid_enthalpy_change, REFERENCE_TEMPERATURE};
use crate::props::liquid;

use super::film::Film;
use super::history::Regime;
use super::inputs::{check_inputs, DropletInputs, Motion};
use super::integrator::{DormandPrince, Stats};
use super::resolved;
use super::well_mixed::{end_of_life, integrate_step, regime_change, WellMixed};
use super::ModelError;

/// The gas around a droplet during one solver step (SI). The carrier gas (air, nitrogen, …) is the one of the
/// [`DropletInputs`] the stepper was made with.
#[derive(Debug, Clone, PartialEq)]
pub struct FarField {
    /// Gas temperature \[K\].
    pub temperature: f64,
    /// Pressure \[Pa\].
    pub pressure: f64,
    /// Fuel-vapour mass fractions in the gas, one per fuel component \[-\] (empty: none).
    pub vapor_mass_fractions: Vec<f64>,
    /// Gas velocity \[m/s\], in the frame of the droplet velocity.
    pub gas_velocity: [f64; 3],
}

impl FarField {
    /// A far field at rest without fuel vapour.
    pub fn new(temperature: f64, pressure: f64) -> Self {
        FarField { temperature, pressure, vapor_mass_fractions: vec![], gas_velocity: [0.0; 3] }
    }

    /// Refuse non-finite or out-of-range values (one line naming the field and value).
    pub fn check(&self, components: usize) -> Result<(), ModelError> {
        let bad = |field: &'static str, value: String, reason: &str| Err(ModelError::Input { field, value, reason: reason.into() });
        if !(self.temperature.is_finite() && (150.0..=4000.0).contains(&self.temperature)) {
            return bad("far-field temperature", format!("{} K", self.temperature), "must lie between 150 K and 4000 K");
        }
        if !(self.pressure.is_finite() && (1e3..=3e7).contains(&self.pressure)) {
            return bad("far-field pressure", format!("{} Pa", self.pressure), "must lie between 1 kPa and 300 bar");
        }
        if !self.vapor_mass_fractions.is_empty() {
            if self.vapor_mass_fractions.len() != components {
                return bad("far-field vapour", format!("{} values", self.vapor_mass_fractions.len()), &format!("needs one mass fraction per fuel component ({components})"));
            }
            let s: f64 = self.vapor_mass_fractions.iter().sum();
            if self.vapor_mass_fractions.iter().any(|y| !y.is_finite() || *y < 0.0) || !(s < 0.5) {
                return bad("far-field vapour", format!("sum {s}"), "mass fractions must be finite, ≥ 0 and sum below 0.5");
            }
        }
        if self.gas_velocity.iter().any(|v| !v.is_finite() || v.abs() > 1e4) {
            return bad("far-field gas velocity", format!("{:?} m/s", self.gas_velocity), "must be finite (each component within ±10 km/s)");
        }
        Ok(())
    }
}

/// What one [`Stepper::advance`] gives the gas, over the step (droplet → gas; negative: gas → droplet).
#[derive(Debug, Clone, PartialEq)]
pub struct Exchange {
    /// Mass given to the gas as vapour, per fuel component \[kg\] (negative when it condenses).
    pub mass: Vec<f64>,
    /// Energy given to the gas \[J\]: the droplet's loss of liquid enthalpy (reference: each pure liquid at
    /// 298.15 K; the vapour carries h_L + L at the surface temperature).
    pub energy: f64,
    /// Momentum given to the gas \[kg·m/s\]: the droplet's loss of momentum (drag plus the momentum of the vapour).
    pub momentum: [f64; 3],
    /// Time the droplet advanced \[s\] (less than asked when its life ended inside the step).
    pub time: f64,
    /// True when the droplet reached its end of life (`end_mass_fraction` of its initial mass left) in this step.
    pub finished: bool,
}

/// Integrator memory kept between calls in the same far field.
#[derive(Debug, Clone)]
enum Ahead {
    /// The Dormand–Prince stepper past the state's time, its regime there and the end of life if reached.
    WellMixed { stepper: Box<DormandPrince>, regime: Regime, finished: Option<f64> },
    /// The accepted step that spans the state's time (from `from` to `to`), the next step size, the end of life.
    Resolved { from: Box<resolved::State>, to: Box<resolved::State>, dt: f64, finished: Option<f64> },
}

/// The liquid inside the droplet.
#[derive(Debug, Clone)]
enum Liquid {
    /// Well-mixed: y = [m_1..m_N, T, relative speed, evaporated_1..evaporated_N], and the heat regime.
    WellMixed { y: Vec<f64>, regime: Regime },
    /// Radially resolved: profiles and inventories.
    Resolved(Box<resolved::State>),
}

/// One droplet between solver steps: component masses, temperature (or radial profiles), velocity, the
/// integrator's step size, and the liquid enthalpy it holds. Made by [`Stepper::initial_state`].
#[derive(Debug, Clone)]
pub struct DropletState {
    time: f64,
    liquid: Liquid,
    velocity: [f64; 3],
    initial_mass: f64,
    speed_scale: f64,
    /// Specific liquid enthalpy per component at the mass-mean temperature \[J/kg\].
    specific_enthalpy: Vec<f64>,
    enthalpy: f64,
    step: f64,
    finished: bool,
    far_field: Option<FarField>,
    ahead: Option<Ahead>,
    /// Mass and energy that left before the first step (an adiabatic flash at creation), given with it.
    pending: Option<(Vec<f64>, f64)>,
}

impl DropletState {
    /// Time since the droplet was made \[s\].
    pub fn time(&self) -> f64 {
        self.time
    }

    /// Liquid mass of each fuel component \[kg\].
    pub fn masses(&self) -> &[f64] {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => &y[..self.components()],
            Liquid::Resolved(s) => &s.inventory,
        }
    }

    /// Droplet mass \[kg\].
    pub fn mass(&self) -> f64 {
        self.masses().iter().sum()
    }

    /// Mass evaporated since the droplet was made, per component \[kg\].
    pub fn evaporated(&self) -> &[f64] {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => &y[self.components() + 2..],
            Liquid::Resolved(s) => &s.evaporated,
        }
    }

    /// Liquid temperature per cell, centre to surface \[K\] (one value for a uniform-temperature droplet).
    pub fn temperatures(&self) -> &[f64] {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => &y[self.components()..self.components() + 1],
            Liquid::Resolved(s) => &s.temp,
        }
    }

    /// Surface temperature \[K\].
    pub fn surface_temperature(&self) -> f64 {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => y[self.components()],
            Liquid::Resolved(s) => s.surface_t,
        }
    }

    /// Liquid mass fractions per component and cell, component-major (one cell for a well-mixed liquid) \[-\].
    pub fn mass_fraction_profiles(&self) -> Vec<f64> {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => {
                let n = self.components();
                let m: f64 = y[..n].iter().map(|v| v.max(0.0)).sum();
                y[..n].iter().map(|v| v.max(0.0) / m.max(1e-300)).collect()
            }
            Liquid::Resolved(s) => s.y.clone(),
        }
    }

    /// Droplet velocity \[m/s\].
    pub fn velocity(&self) -> [f64; 3] {
        self.velocity
    }

    /// Set the droplet velocity \[m/s\] (a solver's wall or body-force update); the next step restarts the integrator.
    pub fn set_velocity(&mut self, velocity: [f64; 3]) {
        self.velocity = velocity;
        self.ahead = None;
    }

    /// Heat regime (evaporating or heat-limited boiling).
    pub fn regime(&self) -> Regime {
        match &self.liquid {
            Liquid::WellMixed { regime, .. } => *regime,
            Liquid::Resolved(_) => Regime::Evaporating,
        }
    }

    /// Liquid enthalpy the droplet holds \[J\] (reference: each pure liquid at 298.15 K), Σ_i m_i h_L,i at the
    /// mass-mean liquid temperature.
    pub fn enthalpy(&self) -> f64 {
        self.enthalpy
    }

    /// Step size the integrator proposes for its next step \[s\] (carried across calls).
    pub fn step_size(&self) -> f64 {
        self.step
    }

    /// True once the droplet reached its end of life; further steps give no exchange.
    pub fn is_finished(&self) -> bool {
        self.finished
    }

    fn components(&self) -> usize {
        match &self.liquid {
            Liquid::WellMixed { y, .. } => (y.len() - 2) / 2,
            Liquid::Resolved(s) => s.inventory.len(),
        }
    }
}

/// The model of one fuel a solver advances droplets with: the liquid model and options of a [`DropletInputs`]
/// (its ambient and motion values only fill the far field until a step gives one), with its work buffers. One
/// stepper serves any number of droplets, one after the other.
///
/// ```
/// use dropcut::data::Library;
/// use dropcut::fuel::Fuel;
/// use dropcut::model::{DropletInputs, FarField, Motion, Stepper};
/// use dropcut::props::gas::AmbientGas;
///
/// let lib = Library::embedded().unwrap();
/// let fuel = Fuel::resolve("n-decane", &lib).unwrap();
/// let mut inputs = DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 30e-6, 300.0);
/// inputs.motion = Motion::Injected { velocity: 0.0 }; // the velocity relaxes toward the gas by drag
/// let mut stepper = Stepper::new(&inputs).unwrap();
/// let mut far_field = FarField::new(900.0, 101_325.0);
/// let mut droplet = stepper.initial_state(&far_field, [3.0, 0.0, 0.0]).unwrap();
/// let m0 = droplet.mass();
/// let (mut vapour, mut energy) = (0.0, 0.0);
/// while !droplet.is_finished() {
///     far_field.temperature += 1.0; // the gas the droplet meets gets hotter
///     let exchange = stepper.advance(&mut droplet, 1e-4, &far_field).unwrap();
///     vapour += exchange.mass.iter().sum::<f64>();
///     energy += exchange.energy;
/// }
/// assert!((vapour - (m0 - droplet.mass())).abs() < 1e-12 * m0);
/// assert!(energy > 0.0 && droplet.time() < 0.02);
/// ```
pub struct Stepper {
    inputs: DropletInputs,
    core: Core,
    far_field: FarField,
    drag: bool,
    buf: Vec<f64>,
    y_end: Vec<f64>,
}

/// The integration core of the chosen liquid model.
enum Core {
    WellMixed(Box<WellMixed>),
    Resolved(Box<resolved::Model>),
}

impl Stepper {
    /// A stepper for the fuel and liquid model of `inputs`. `inputs.motion`: `Injected` lets the droplet's
    /// velocity relax toward the gas by drag (a Lagrangian parcel); `Fixed` holds the slip velocity (a suspended
    /// droplet). Radiation and a supporting fibre are refused: a solver's radiation model owns that heat.
    pub fn new(inputs: &DropletInputs) -> Result<Self, ModelError> {
        check_inputs(inputs)?;
        if !inputs.extra_heat.is_none() {
            return Err(ModelError::Input {
                field: "radiation",
                value: "set".into(),
                reason: "the stepping API takes no radiation or supporting fibre: the solver's radiation model owns that heat".into(),
            });
        }
        let run_inputs = super::inputs::with_kernels(inputs);
        let inputs = run_inputs.as_ref().unwrap_or(inputs);
        let core = if inputs.liquid.is_resolved() { Core::Resolved(Box::new(resolved::Model::prepare(inputs)?.0)) } else { Core::WellMixed(Box::new(WellMixed::new(inputs).0)) };
        let n = inputs.fuel.len();
        let far_field = FarField {
            temperature: inputs.ambient_temperature,
            pressure: inputs.pressure,
            vapor_mass_fractions: if inputs.ambient_vapor.is_empty() { vec![0.0; n] } else { inputs.ambient_vapor.clone() },
            gas_velocity: [0.0; 3],
        };
        Ok(Stepper { drag: matches!(inputs.motion, Motion::Injected { .. }), inputs: inputs.clone(), core, far_field, buf: vec![0.0; 2 * n + 2], y_end: vec![0.0; 2 * n + 2] })
    }

    /// The fuel components, in the order of every per-component vector.
    pub fn components(&self) -> &[Arc<Component>] {
        &self.inputs.fuel.components
    }

    /// Latent heat of each component at 298.15 K \[J/kg\]: subtract Σ mass_i · L_i from [`Exchange::energy`] for a
    /// vapour enthalpy that is zero for the vapour at 298.15 K.
    pub fn reference_latent_heats(&self) -> Vec<f64> {
        self.components().iter().map(|c| c.latent_heat(REFERENCE_TEMPERATURE)).collect()
    }

    /// Droplet diameter \[m\] (density of the mean liquid at its mass-mean temperature).
    pub fn diameter(&self, state: &DropletState) -> f64 {
        let m = state.mass().max(0.0);
        let w: Vec<f64> = state.masses().iter().map(|v| v.max(0.0) / m.max(1e-300)).collect();
        let temps = state.temperatures();
        let t = temps.iter().sum::<f64>() / temps.len() as f64;
        (6.0 * m / (std::f64::consts::PI * liquid::density(self.components(), &w, t))).cbrt()
    }

    /// Use `far_field` from now on (the film is set up again only when it changed).
    fn apply_far_field(&mut self, far_field: &FarField) -> Result<(), ModelError> {
        let n = self.inputs.fuel.len();
        far_field.check(n)?;
        let vapor = if far_field.vapor_mass_fractions.is_empty() { vec![0.0; n] } else { far_field.vapor_mass_fractions.clone() };
        if self.far_field.temperature == far_field.temperature && self.far_field.pressure == far_field.pressure && self.far_field.vapor_mass_fractions == vapor {
            self.far_field.gas_velocity = far_field.gas_velocity;
            return Ok(());
        }
        self.inputs.ambient_temperature = far_field.temperature;
        self.inputs.pressure = far_field.pressure;
        self.inputs.ambient_vapor = vapor.clone();
        let film = match &mut self.core {
            Core::WellMixed(sys) => sys.film_mut(),
            Core::Resolved(model) => model.film_mut(),
        };
        let mut setup = film.setup.clone();
        setup.ambient_temperature = far_field.temperature;
        setup.pressure = far_field.pressure;
        setup.ambient_vapor = vapor.clone();
        let (tolerance, drag) = (film.heat_iteration_tolerance, film.drag_needed);
        *film = Film::new(setup);
        film.heat_iteration_tolerance = tolerance;
        film.drag_needed = drag;
        self.far_field = FarField { vapor_mass_fractions: vapor, ..far_field.clone() };
        Ok(())
    }

    /// A new droplet of the inputs' diameter and temperature, moving at `velocity` \[m/s\] in `far_field`. A droplet
    /// made at or above its bubble point flashes at once (as in `simulate`); what left is given with the first step.
    pub fn initial_state(&mut self, far_field: &FarField, velocity: [f64; 3]) -> Result<DropletState, ModelError> {
        if velocity.iter().any(|v| !v.is_finite()) {
            return Err(ModelError::Input { field: "droplet velocity", value: format!("{velocity:?} m/s"), reason: "must be finite".into() });
        }
        self.apply_far_field(far_field)?;
        let n = self.inputs.fuel.len();
        let speed = relative(velocity, far_field.gas_velocity).0;
        let mut inputs = self.inputs.clone();
        inputs.motion = if self.drag { Motion::Injected { velocity: speed } } else { Motion::Fixed { velocity: speed } };
        let comps = self.inputs.fuel.components.clone();
        let (liquid, m0) = match &self.core {
            Core::WellMixed(_) => {
                let (sys, y0, _) = WellMixed::prepare(&inputs);
                (Liquid::WellMixed { y: y0, regime: sys.regime() }, sys.initial_mass())
            }
            Core::Resolved(_) => {
                let (_, state, m0, _) = resolved::Model::prepare(&inputs)?;
                (Liquid::Resolved(Box::new(state)), m0)
            }
        };
        let mut state = DropletState {
            time: 0.0,
            liquid,
            velocity,
            initial_mass: m0,
            speed_scale: speed,
            specific_enthalpy: vec![],
            enthalpy: 0.0,
            step: 0.0,
            finished: false,
            far_field: None,
            ahead: None,
            pending: None,
        };
        let t_mean = self.mean_temperature(&state);
        state.specific_enthalpy = comps.iter().map(|c| liquid_enthalpy(c, t_mean)).collect();
        state.enthalpy = enthalpy_of(&state);
        let flashed: Vec<f64> = state.evaporated().to_vec();
        if flashed.iter().any(|m| *m != 0.0) {
            let before: f64 = (0..n).map(|i| m0 * self.inputs.fuel.mass_fractions[i] * liquid_enthalpy(&comps[i], self.inputs.initial_temperature)).sum();
            state.pending = Some((flashed, before - state.enthalpy));
        }
        Ok(state)
    }

    /// Advance `state` by `dt` \[s\] in `far_field`: integrate the droplet (one solver step, any number of
    /// integrator steps) and return what it gave the gas. The state is updated in place; on an error it is left
    /// as it was. A finished droplet gives an empty exchange.
    pub fn advance(&mut self, state: &mut DropletState, dt: f64, far_field: &FarField) -> Result<Exchange, ModelError> {
        if !(dt.is_finite() && dt >= 0.0) {
            return Err(ModelError::Input { field: "step", value: format!("{dt} s"), reason: "must be a finite time ≥ 0".into() });
        }
        let n = self.inputs.fuel.len();
        if state.components() != n {
            return Err(ModelError::Input { field: "state", value: format!("{} components", state.components()), reason: format!("belongs to another fuel (this stepper has {n})") });
        }
        self.apply_far_field(far_field)?;
        let mut exchange = Exchange { mass: vec![0.0; n], energy: 0.0, momentum: [0.0; 3], time: 0.0, finished: state.finished };
        if state.finished || dt == 0.0 {
            state.far_field = Some(far_field.clone());
            return Ok(self.with_pending(state, exchange));
        }
        let same = state.far_field.as_ref() == Some(far_field);
        let overshoot = same || state.far_field.is_none();
        if !same {
            state.ahead = None;
        }
        let (speed, direction) = relative(state.velocity, far_field.gas_velocity);
        let mass_before = state.mass();
        let masses_before = state.masses().to_vec();
        let momentum_before = state.velocity.map(|v| v * mass_before);
        let t_start = state.time;
        let (mut next, finished) = match &self.core {
            Core::WellMixed(_) => self.advance_well_mixed(state, dt, speed, overshoot)?,
            Core::Resolved(_) => self.advance_resolved(state, dt, speed, overshoot)?,
        };
        // velocity: the relative speed along the unchanged direction (drag acts along it), on the gas velocity
        let new_speed = match &next.liquid {
            Liquid::WellMixed { y, .. } => y[n + 1],
            Liquid::Resolved(s) => s.velocity,
        };
        for k in 0..3 {
            next.velocity[k] = far_field.gas_velocity[k] + direction[k] * new_speed;
        }
        next.far_field = Some(far_field.clone());
        self.update_enthalpy(state, &mut next);
        next.finished = finished;
        let mass_after = next.mass();
        for i in 0..n {
            exchange.mass[i] = masses_before[i] - next.masses()[i];
        }
        exchange.energy = state.enthalpy - next.enthalpy;
        for k in 0..3 {
            exchange.momentum[k] = momentum_before[k] - mass_after * next.velocity[k];
        }
        exchange.time = next.time - t_start;
        exchange.finished = finished;
        next.pending = state.pending.take();
        *state = next;
        Ok(self.with_pending(state, exchange))
    }

    /// Add the flash at creation (if not given yet) to the first exchange.
    fn with_pending(&self, state: &mut DropletState, mut exchange: Exchange) -> Exchange {
        if let Some((mass, energy)) = state.pending.take() {
            for (e, m) in exchange.mass.iter_mut().zip(&mass) {
                *e += m;
            }
            exchange.energy += energy;
        }
        exchange
    }

    /// Mass-mean liquid temperature of a state \[K\] (the temperature itself for a uniform droplet).
    fn mean_temperature(&self, state: &DropletState) -> f64 {
        match (&state.liquid, &self.core) {
            (Liquid::Resolved(s), Core::Resolved(model)) => model.tgrid.mean(&s.temp),
            _ => state.temperatures()[0],
        }
    }

    /// Specific enthalpies at the new mean temperature (each advanced from the old by its quadrature) and the total.
    fn update_enthalpy(&self, old: &DropletState, next: &mut DropletState) {
        let (t_old, t_new) = (self.mean_temperature(old), self.mean_temperature(next));
        let mut h = old.specific_enthalpy.clone();
        if t_old != t_new {
            for (h, c) in h.iter_mut().zip(self.components()) {
                *h += liquid_enthalpy_change(c, t_old, t_new);
            }
        }
        next.specific_enthalpy = h;
        next.enthalpy = enthalpy_of(next);
    }

    /// The well-mixed droplet over one solver step; returns the new state and whether its life ended.
    fn advance_well_mixed(&mut self, state: &mut DropletState, dt: f64, speed: f64, overshoot: bool) -> Result<(DropletState, bool), ModelError> {
        let n = self.inputs.fuel.len();
        let Core::WellMixed(sys) = &mut self.core else { unreachable!("well-mixed core") };
        let sys: &mut WellMixed = sys;
        sys.set_drag(self.drag);
        let h_max = self.inputs.max_time / 20.0;
        let t_target = state.time + dt;
        let Liquid::WellMixed { y, regime } = &state.liquid else { unreachable!("well-mixed state") };
        let (mut stepper, mut finished_at) = match state.ahead.take() {
            Some(Ahead::WellMixed { stepper, regime, finished }) => {
                sys.set_regime(regime);
                (stepper, finished)
            }
            _ => {
                sys.set_regime(*regime);
                let mut y0 = y.clone();
                y0[n + 1] = speed;
                let tol = WellMixed::tolerances(self.inputs.rtol, n, state.initial_mass, state.speed_scale);
                (Box::new(DormandPrince::with_method(sys, state.time, &y0, tol, state.step, h_max, self.inputs.integrator)), None)
            }
        };
        let mut regime_in_last_step = sys.regime();
        let mut carried = None;
        let mut steps = 0u64;
        while finished_at.is_none() && stepper.t < t_target {
            let remaining_time = t_target - stepper.t;
            if !overshoot {
                if remaining_time <= 1e-12 * t_target.abs().max(dt) {
                    break;
                }
                let proposal = stepper.proposed_step();
                stepper.h_max = h_max.min(remaining_time);
                carried = (remaining_time < proposal).then_some(proposal);
            }
            regime_in_last_step = sys.regime();
            integrate_step(sys, &mut stepper, &self.inputs)?;
            self.y_end.copy_from_slice(&stepper.y);
            if let Some(te) = end_of_life(&mut stepper, sys, n, state.initial_mass, self.inputs.end_mass_fraction, &mut self.buf, &mut self.y_end) {
                stepper.y.copy_from_slice(&self.y_end);
                stepper.t = te;
                finished_at = Some(te);
            } else {
                let _ = regime_change(sys, &mut stepper, self.inputs.fixed_temperature, &mut self.y_end, &mut self.buf);
            }
            steps += 1;
            if steps > 2_000_000 {
                return Err(ModelError::Integration { time: stepper.t, reason: "more than 2 000 000 steps in one solver step".into() });
            }
        }
        stepper.h_max = h_max;
        let finished = finished_at.is_some_and(|te| te <= t_target);
        let (time, y_new, regime_new) = if finished || stepper.t <= t_target {
            (if finished { stepper.t } else { t_target }, stepper.y.clone(), sys.regime())
        } else {
            let mut y_new = vec![0.0; 2 * n + 2];
            stepper.prepare_dense(sys);
            stepper.dense(t_target, &mut y_new);
            (t_target, y_new, regime_in_last_step)
        };
        let step = carried.unwrap_or_else(|| stepper.proposed_step());
        let ahead = (overshoot && !finished).then(|| Ahead::WellMixed { regime: sys.regime(), finished: finished_at, stepper });
        let next = DropletState { time, liquid: Liquid::WellMixed { y: y_new, regime: regime_new }, step, ahead, ..state.clone_light() };
        Ok((next, finished))
    }

    /// The resolved droplet over one solver step; returns the new state and whether its life ended.
    fn advance_resolved(&mut self, state: &mut DropletState, dt: f64, speed: f64, overshoot: bool) -> Result<(DropletState, bool), ModelError> {
        let Core::Resolved(model) = &mut self.core else { unreachable!("resolved core") };
        let model: &mut resolved::Model = model;
        model.set_drag(self.drag);
        let tol = resolved::step_tolerance(self.inputs.rtol);
        let t_target = state.time + dt;
        let end = self.inputs.end_mass_fraction;
        let m0 = state.initial_mass;
        let Liquid::Resolved(current) = &state.liquid else { unreachable!("resolved state") };
        let (mut from, mut to, mut h, mut finished_at) = match state.ahead.take() {
            Some(Ahead::Resolved { from, to, dt, finished }) => (from, to, dt, finished),
            _ => {
                let mut s = current.clone();
                s.velocity = speed;
                (s.clone(), s, if state.step > 0.0 { state.step } else { resolved::first_step(self.inputs.initial_diameter) }, None)
            }
        };
        let mut stats = Stats::default();
        let mut carried = None;
        while finished_at.is_none() && to.time < t_target {
            let remaining_time = t_target - to.time;
            if !overshoot && remaining_time <= 1e-12 * t_target.abs().max(dt) {
                break;
            }
            let mut step = if overshoot { h } else { h.min(remaining_time) };
            if !overshoot && remaining_time < h {
                carried = Some(h);
            }
            match resolved::attempt_step(model, &to, &mut step, tol, m0, &mut stats) {
                resolved::Attempt::Accepted(new, err, _) => {
                    let (rem_prev, rem_now) = (to.mass / m0, new.mass / m0);
                    if rem_now <= end {
                        finished_at = Some(resolved::crossing_time(to.time, step, rem_prev, rem_now, end));
                    }
                    h = resolved::grown_step(step, tol, err);
                    from = std::mem::replace(&mut to, Box::new(new));
                }
                resolved::Attempt::Retry => {
                    h = step;
                    carried = None;
                }
                resolved::Attempt::Failed(e) => return Err(super::inputs::integration_failure(&self.inputs, to.time, to.surface_t, &format!("the step size fell to the round-off limit ({e})"))),
            }
            if stats.steps > 1_000_000 {
                return Err(ModelError::Integration { time: to.time, reason: "more than 1 000 000 steps in one solver step".into() });
            }
        }
        let finished = finished_at.is_some_and(|te| te <= t_target);
        let at = if finished { finished_at.unwrap_or(t_target) } else { t_target };
        let new_state = if to.time <= at { (*to).clone() } else { interpolate(&from, &to, at) };
        let time = if finished { at } else { t_target };
        let ahead = (overshoot && !finished).then_some(Ahead::Resolved { from, to, dt: h, finished: finished_at });
        let next = DropletState { time, liquid: Liquid::Resolved(Box::new(resolved::State { time, ..new_state })), step: carried.unwrap_or(h), ahead, ..state.clone_light() };
        Ok((next, finished))
    }
}

impl DropletState {
    /// A copy without the liquid and the integrator memory (filled in by the caller).
    fn clone_light(&self) -> DropletState {
        DropletState {
            time: self.time,
            liquid: Liquid::WellMixed { y: vec![], regime: Regime::Evaporating },
            velocity: self.velocity,
            initial_mass: self.initial_mass,
            speed_scale: self.speed_scale,
            specific_enthalpy: vec![],
            enthalpy: self.enthalpy,
            step: self.step,
            finished: self.finished,
            far_field: None,
            ahead: None,
            pending: None,
        }
    }
}

/// Relative speed |u_d − u_g| \[m/s\] and its direction (zero vector at no slip).
fn relative(droplet: [f64; 3], gas: [f64; 3]) -> (f64, [f64; 3]) {
    let rel = [droplet[0] - gas[0], droplet[1] - gas[1], droplet[2] - gas[2]];
    let speed = (rel[0] * rel[0] + rel[1] * rel[1] + rel[2] * rel[2]).sqrt();
    if speed > 0.0 {
        (speed, rel.map(|r| r / speed))
    } else {
        (0.0, [0.0; 3])
    }
}

/// Liquid enthalpy of a state from its specific enthalpies at its mass-mean temperature \[J\]: Σ_i m_i h_L,i(T̄).
/// For a resolved droplet the mean temperature is that of the radial profile: the resolved model's energy
/// equation carries the properties of the mean liquid, so its energy content is that of the mean state.
fn enthalpy_of(state: &DropletState) -> f64 {
    state.masses().iter().zip(&state.specific_enthalpy).map(|(m, h)| m * h).sum()
}

/// The resolved state at time `t` between the accepted states `a` and `b`, linear in time.
fn interpolate(a: &resolved::State, b: &resolved::State, t: f64) -> resolved::State {
    let s = if b.time > a.time { ((t - a.time) / (b.time - a.time)).clamp(0.0, 1.0) } else { 1.0 };
    let mix = |x: &[f64], y: &[f64]| -> Vec<f64> { x.iter().zip(y).map(|(p, q)| p + s * (q - p)).collect() };
    let inventory = mix(&a.inventory, &b.inventory);
    resolved::State {
        time: t,
        mass: inventory.iter().sum(),
        y: mix(&a.y, &b.y),
        temp: mix(&a.temp, &b.temp),
        evaporated: mix(&a.evaporated, &b.evaporated),
        inventory,
        velocity: a.velocity + s * (b.velocity - a.velocity),
        surface_y: mix(&a.surface_y, &b.surface_y),
        surface_t: a.surface_t + s * (b.surface_t - a.surface_t),
        boiling: if s < 1.0 { a.boiling } else { b.boiling },
        heat_inward: a.heat_inward + s * (b.heat_inward - a.heat_inward),
    }
}
