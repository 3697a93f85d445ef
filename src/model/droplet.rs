//! One droplet of a multicomponent fuel: well-mixed (rapid-mixing) liquid with uniform temperature, coupled to
//! the quasi-steady film (film.rs), optionally decelerating by drag, with a heat-limited boiling regime.

use crate::fuel::Fuel;
use crate::props::activity::{Activity, ActivityModel};
use crate::props::gas::AmbientGas;
use crate::props::liquid;

use super::film::{DragLaw, ExtraHeat, Film, FilmResult, FilmSetup, TransferCorrelation};
use super::integrator::{locate_event, DormandPrince, OdeSystem, Stats, Tolerances};
use super::ModelError;

/// Relative motion between droplet and gas.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Motion {
    /// A constant slip velocity [m/s].
    Fixed {
        /// Relative velocity [m/s].
        velocity: f64,
    },
    /// A droplet injected into gas at rest with this initial velocity, slowed by drag [m/s].
    Injected {
        /// Initial relative velocity [m/s].
        velocity: f64,
    },
}

/// Everything that defines one droplet run (SI units).
#[derive(Debug, Clone)]
pub struct DropletInputs {
    /// The liquid fuel.
    pub fuel: Fuel,
    /// Ambient gas.
    pub gas: AmbientGas,
    /// Ambient temperature [K].
    pub ambient_temperature: f64,
    /// Ambient pressure [Pa].
    pub pressure: f64,
    /// Far-field fuel-vapour mass fractions per fuel component [-] (empty = none).
    pub ambient_vapor: Vec<f64>,
    /// Initial diameter [m].
    pub initial_diameter: f64,
    /// Initial droplet temperature [K].
    pub initial_temperature: f64,
    /// Relative motion.
    pub motion: Motion,
    /// Nu0/Sh0 correlation.
    pub correlation: TransferCorrelation,
    /// Reference-state weight (1/3 rule).
    pub reference_weight: f64,
    /// Relative tolerance of the integrator.
    pub rtol: f64,
    /// Time at which to give up [s].
    pub max_time: f64,
    /// Hold the droplet temperature at its initial value (analytic tests, Rayleigh limit).
    pub fixed_temperature: bool,
    /// Remaining mass fraction that counts as evaporated (0.001 = 0.1 %).
    pub end_mass_fraction: f64,
    /// Liquid-side model: mixing, heat, grid, non-equilibrium surface.
    pub liquid: LiquidOptions,
    /// Radiation and supporting-fibre heat (none by default: a free droplet in a transparent gas).
    pub extra_heat: ExtraHeat,
    /// Drag law of the evaporating droplet (used with `Motion::Injected`).
    pub drag: DragLaw,
    /// Pure-component properties from per-component kernels (default) or by direct evaluation.
    pub properties: crate::props::kernels::PropertyEvaluation,
}

/// How species mix inside the droplet.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum LiquidMixing {
    /// Rapid mixing: uniform composition.
    WellMixed,
    /// Transient diffusion with the Abramzon–Sirignano effective diffusivity.
    Diffusion,
}

/// How heat moves inside the droplet.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum LiquidHeat {
    /// Infinite conductivity: uniform temperature.
    Uniform,
    /// Transient conduction with the Abramzon–Sirignano effective conductivity.
    Conduction,
}

/// Liquid-side model options.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LiquidOptions {
    /// Species mixing.
    pub mixing: LiquidMixing,
    /// Heat transport.
    pub heat: LiquidHeat,
    /// Radial cells for the resolved models.
    pub nodes: usize,
    /// Langmuir–Knudsen non-equilibrium surface (Miller, Harstad & Bellan 1998).
    pub non_equilibrium: bool,
    /// Multiplier on the liquid diffusivity (1 = Wilke–Chang; tests use 1e4 for the well-mixed limit).
    pub diffusivity_factor: f64,
    /// Multiplier on the liquid conductivity.
    pub conductivity_factor: f64,
    /// Liquid activity model at the surface (ideal = Raoult's law; UNIFAC).
    pub activity: ActivityModel,
}

impl Default for LiquidOptions {
    fn default() -> Self {
        LiquidOptions { mixing: LiquidMixing::WellMixed, heat: LiquidHeat::Uniform, nodes: 40, non_equilibrium: false, diffusivity_factor: 1.0, conductivity_factor: 1.0, activity: ActivityModel::Ideal }
    }
}

impl LiquidOptions {
    /// True when the liquid is resolved radially (anything but well-mixed + uniform).
    pub fn is_resolved(&self) -> bool {
        self.mixing == LiquidMixing::Diffusion || self.heat == LiquidHeat::Conduction
    }
}

impl DropletInputs {
    /// Inputs with the defaults for everything but fuel, gas and condition.
    pub fn new(fuel: Fuel, gas: AmbientGas, ambient_temperature: f64, pressure: f64, initial_diameter: f64, initial_temperature: f64) -> Self {
        DropletInputs {
            fuel,
            gas,
            ambient_temperature,
            pressure,
            ambient_vapor: vec![],
            initial_diameter,
            initial_temperature,
            motion: Motion::Fixed { velocity: 0.0 },
            correlation: TransferCorrelation::Clift,
            reference_weight: 1.0 / 3.0,
            rtol: 1e-6,
            max_time: 30.0,
            fixed_temperature: false,
            end_mass_fraction: 1e-3,
            liquid: LiquidOptions::default(),
            extra_heat: ExtraHeat::default(),
            drag: DragLaw::default(),
            properties: Default::default(),
        }
    }
}

impl DropletInputs {
    /// The gas-film inputs of these droplet inputs (no far-field vapour = zeros).
    ///
    /// # Panics
    /// When the activity model cannot be prepared for the fuel (a component without UNIFAC groups): `simulate`
    /// refuses such inputs first (`check_inputs`, field `activity`).
    pub fn film_setup(&self) -> FilmSetup {
        let n = self.fuel.len();
        FilmSetup {
            components: crate::props::kernels::run_components(&self.fuel.components, self.properties),
            gas: crate::props::kernels::run_gas(&self.gas, self.properties),
            pressure: self.pressure,
            ambient_temperature: self.ambient_temperature,
            ambient_vapor: if self.ambient_vapor.is_empty() { vec![0.0; n] } else { self.ambient_vapor.clone() },
            reference_weight: self.reference_weight,
            correlation: self.correlation,
            non_equilibrium: self.liquid.non_equilibrium,
            extra_heat: self.extra_heat,
            drag: self.drag,
            activity: Activity::new(self.liquid.activity, &self.fuel.components).unwrap_or_else(|e| panic!("--activity {}: {e}", self.liquid.activity.as_str())),
        }
    }
}

/// Heat regime of the droplet.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Regime {
    /// Heating and evaporating below the bubble point.
    Evaporating,
    /// At the bubble point: evaporation set by the heat flux.
    Boiling,
}

/// One output row of a droplet history.
#[derive(Debug, Clone, serde::Serialize)]
pub struct HistoryRow {
    /// Time [s].
    pub time: f64,
    /// Diameter [m].
    pub diameter: f64,
    /// (d/d0)² [-].
    pub d2_ratio: f64,
    /// Surface (= droplet) temperature [K].
    pub surface_temperature: f64,
    /// Droplet mass [kg].
    pub mass: f64,
    /// Evaporated fraction of the initial mass [-].
    pub evaporated_fraction: f64,
    /// Relative velocity [m/s].
    pub velocity: f64,
    /// Film results at this instant.
    pub film: FilmResult,
    /// Liquid mass fractions [-].
    pub liquid_mass_fractions: Vec<f64>,
    /// Mass fractions of the vapour leaving the surface [-].
    pub vapor_mass_fractions: Vec<f64>,
    /// Regime.
    pub regime: Regime,
    /// Mass-mean liquid temperature [K] (= surface temperature for a uniform droplet).
    pub mean_temperature: f64,
    /// Centre temperature [K] (= surface temperature for a uniform droplet).
    pub center_temperature: f64,
    /// Liquid mass fractions at the surface [-] (empty for a well-mixed liquid).
    pub surface_liquid_mass_fractions: Vec<f64>,
}

/// Radial profiles inside the droplet at one instant (resolved models).
#[derive(Debug, Clone, serde::Serialize)]
pub struct Profile {
    /// Time [s].
    pub time: f64,
    /// Evaporated fraction [-].
    pub evaporated_fraction: f64,
    /// Droplet radius [m].
    pub radius: f64,
    /// Normalised radius of each cell centre r/r_s [-].
    pub radius_fraction: Vec<f64>,
    /// Temperature per cell [K].
    pub temperature: Vec<f64>,
    /// Mass fractions per component, per cell [-] (component-major).
    pub mass_fractions: Vec<Vec<f64>>,
}

/// Receives each accepted step; can stop the run.
pub trait Observer {
    /// Called after each accepted step with the row at that instant; return true to stop.
    fn on_step(&mut self, _row: &HistoryRow) -> bool {
        false
    }
    /// True when the observer wants full rows (with fractions) at every step.
    fn wants_rows(&self) -> bool {
        true
    }
}

/// An observer that keeps every row.
#[derive(Debug, Default)]
pub struct Recorder {
    /// Rows kept.
    pub rows: Vec<HistoryRow>,
}

impl Observer for Recorder {
    fn on_step(&mut self, row: &HistoryRow) -> bool {
        self.rows.push(row.clone());
        false
    }
}

/// An observer that keeps nothing (summary only).
#[derive(Debug, Default)]
pub struct NoHistory;

impl Observer for NoHistory {
    fn wants_rows(&self) -> bool {
        false
    }
}

/// How a run ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Status {
    /// All but `end_mass_fraction` of the mass evaporated.
    Evaporated,
    /// The time limit was reached first.
    TimeLimit,
    /// The observer stopped the run.
    Stopped,
}

/// Summary of one run.
#[derive(Debug, Clone, serde::Serialize)]
pub struct RunOutcome {
    /// How the run ended.
    pub status: Status,
    /// Time when `end_mass_fraction` of the initial mass remains [s].
    pub lifetime: Option<f64>,
    /// Time at which 10 % of the mass has evaporated [s].
    pub t10: Option<f64>,
    /// Time at which 50 % has evaporated [s].
    pub t50: Option<f64>,
    /// Time at which 90 % has evaporated [s].
    pub t90: Option<f64>,
    /// End of the heat-up period [s]: first time the heat into the liquid is below 10 % of the gas heat flux.
    pub heatup_end: Option<f64>,
    /// Highest surface temperature [K].
    pub max_surface_temperature: f64,
    /// Time at which boiling started [s].
    pub boiling_onset: Option<f64>,
    /// Final time [s].
    pub end_time: f64,
    /// Evaporated fraction at the end [-].
    pub final_evaporated_fraction: f64,
    /// Notes on regimes and validity.
    pub regime_notes: Vec<String>,
    /// Integrator statistics.
    pub stats: Stats,
    /// Largest relative mass-balance error over components (liquid + evaporated vs initial) [-].
    pub mass_balance_error: f64,
    /// Evaporated mass per component at the end [kg].
    pub evaporated_mass: Vec<f64>,
    /// Liquid mass fractions at the end [-].
    pub final_liquid_mass_fractions: Vec<f64>,
}

/// Result of a run: the outcome and, when recorded, the history.
#[derive(Debug, Clone)]
pub struct RunResult {
    /// Summary.
    pub outcome: RunOutcome,
    /// History rows (empty with [`NoHistory`]).
    pub history: Vec<HistoryRow>,
    /// Radial profiles (resolved models only).
    pub profiles: Vec<Profile>,
}

/// Threshold of Σ X_s at which the heat-limited boiling regime takes over; the regime holds the surface at the
/// temperature where Σ X_s equals it (the bubble point at BOILING_THRESHOLD × p, within a fraction of a kelvin of
/// the bubble point), so that entering and leaving the regime changes no temperature.
pub const BOILING_THRESHOLD: f64 = 0.995;

/// Temperature at which the heat-limited boiling regime holds a liquid of mole fractions `x` at pressure `p` [K]:
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
    /// Surface temperature used in the last rhs call [K].
    pub last_surface_temperature: f64,
    initial_mass: f64,
}

impl WellMixed {
    fn unpack(&mut self, y: &[f64]) -> f64 {
        let n = self.n;
        let mut m = 0.0;
        for i in 0..n {
            m += y[i].max(0.0);
        }
        let m_safe = m.max(1e-300);
        for i in 0..n {
            self.w[i] = y[i].max(0.0) / m_safe;
        }
        liquid::mass_to_mole_into(&self.film.setup.components, &self.w, &mut self.x);
        m
    }

    /// Boiling-regime (hold) temperature of the composition `x` with the film's activity model [K] (see
    /// [`boiling_hold_temperature`]).
    fn bubble_point(film: &mut Film, x: &[f64]) -> f64 {
        let fallback = film.setup.ambient_temperature;
        let pressure = film.setup.pressure;
        boiling_hold_temperature(&film.setup.components, &mut film.setup.activity, x, pressure).unwrap_or(fallback)
    }

    /// Heat into the liquid [W] if the droplet at state `y` evaporated at its hold temperature without the
    /// heat limit (the evaporating regime's film at Σ X_s = BOILING_THRESHOLD): positive means the evaporating
    /// regime would heat the droplet past the hold temperature (boiling holds it there); zero or negative means
    /// the heat no longer holds it at the bubble point and it leaves the boiling regime.
    fn heat_at_hold(&mut self, y: &[f64]) -> f64 {
        let n = self.n;
        let m = self.unpack(y);
        let x = std::mem::take(&mut self.x);
        let t_s = Self::bubble_point(&mut self.film, &x);
        let comps = &self.film.setup.components;
        for i in 0..n {
            self.latent[i] = comps[i].latent_heat(t_s);
        }
        let rho_l = liquid::density(comps, &self.w, t_s);
        let d = (6.0 * m.max(1e-300) / (std::f64::consts::PI * rho_l)).cbrt();
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
        let comps = &self.film.setup.components;
        for i in 0..n {
            self.latent[i] = comps[i].latent_heat(t_s);
        }
        let rho_l = liquid::density(comps, &self.w, t_s);
        let cp_l = liquid::heat_capacity(comps, &self.w, t_s);
        let d = (6.0 * m.max(1e-300) / (std::f64::consts::PI * rho_l)).cbrt();
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
        let film = Film::new(inp.film_setup());
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

/// End-of-run note when the largest Reynolds number left the range the Nu0/Sh0 correlation was fitted to
/// (Clift et al. 1978: Re ≤ 400; Ranz & Marshall 1952: Re ≤ 200, from memory) or the drag law's (Re ≤ 1000).
pub(crate) fn reynolds_note(correlation: TransferCorrelation, max_re: f64) -> Option<String> {
    let (name, limit) = match correlation {
        TransferCorrelation::Clift => ("Clift", 400.0),
        TransferCorrelation::RanzMarshall => ("Ranz–Marshall", 200.0),
    };
    if max_re > 1000.0 {
        Some(format!("Reynolds number reached {max_re:.0}, above the {limit:.0} to which the {name} correlation was fitted and above 1000, where the standard drag law is held at C_D = 0.424: transfer rates and drag are extrapolated"))
    } else if max_re > limit {
        Some(format!("Reynolds number reached {max_re:.0}, above the {limit:.0} to which the {name} correlation was fitted: transfer rates are extrapolated"))
    } else {
        None
    }
}

pub(crate) fn check_inputs(inp: &DropletInputs) -> Result<(), ModelError> {
    let bad = |field: &'static str, value: String, reason: &str| Err(ModelError::Input { field, value, reason: reason.into() });
    if !(inp.ambient_temperature.is_finite() && inp.ambient_temperature >= 150.0 && inp.ambient_temperature <= 4000.0) {
        return bad("ambient-temperature", format!("{} K", inp.ambient_temperature), "must lie between 150 K and 4000 K");
    }
    if !(inp.pressure.is_finite() && inp.pressure >= 1e3 && inp.pressure <= 3e7) {
        return bad("pressure", format!("{} Pa", inp.pressure), "must lie between 1 kPa and 300 bar");
    }
    if !(inp.initial_diameter.is_finite() && inp.initial_diameter >= 1e-7 && inp.initial_diameter <= 0.01) {
        return bad("diameter", format!("{} m", inp.initial_diameter), "must lie between 0.1 µm and 10 mm");
    }
    if !(inp.initial_temperature.is_finite() && inp.initial_temperature >= 150.0 && inp.initial_temperature <= 1000.0) {
        return bad("droplet-temperature", format!("{} K", inp.initial_temperature), "must lie between 150 K and 1000 K");
    }
    let v = match inp.motion {
        Motion::Fixed { velocity } | Motion::Injected { velocity } => velocity,
    };
    if !(v.is_finite() && v >= 0.0 && v <= 1000.0) {
        return bad("velocity", format!("{v} m/s"), "must lie between 0 and 1000 m/s");
    }
    if !(inp.rtol.is_finite() && inp.rtol >= 1e-12 && inp.rtol <= 1e-2) {
        return bad("rtol", format!("{}", inp.rtol), "must lie between 1e-12 and 1e-2");
    }
    if !(inp.max_time.is_finite() && inp.max_time > 0.0) {
        return bad("max-time", format!("{} s", inp.max_time), "must be a positive time");
    }
    if !(inp.reference_weight.is_finite() && (0.0..=1.0).contains(&inp.reference_weight)) {
        return bad("reference-weight", format!("{}", inp.reference_weight), "must lie between 0 and 1");
    }
    if let Err(e) = Activity::new(inp.liquid.activity, &inp.fuel.components) {
        return bad("activity", inp.liquid.activity.as_str().to_string(), &format!("fuel {}: {e}", inp.fuel.origin));
    }
    if let Some(r) = inp.extra_heat.radiation {
        if let Some(t) = r.temperature {
            if !(t.is_finite() && t > 0.0 && t <= 5000.0) {
                return bad("radiation", format!("{t} K"), "must lie between 0 K and 5000 K (or be 'off' / 'ambient')");
            }
        }
        if !(r.absorption_efficiency.is_finite() && r.absorption_efficiency > 0.0 && r.absorption_efficiency <= 1.0) {
            return bad("absorption-efficiency", format!("{}", r.absorption_efficiency), "must lie in (0, 1]");
        }
    }
    if let Some(f) = inp.extra_heat.fibre {
        if !(f.diameter.is_finite() && f.diameter > 0.0 && f.diameter < inp.initial_diameter) {
            return bad("fibre-diameter", format!("{} m", f.diameter), &format!("must be positive and smaller than the droplet ({} m)", inp.initial_diameter));
        }
        if !(f.conductivity.is_finite() && f.conductivity > 0.0 && f.conductivity <= 500.0) {
            return bad("fibre-conductivity", format!("{} W/(m·K)", f.conductivity), "must lie in (0, 500]");
        }
        if !(1..=4).contains(&f.stems) {
            return bad("fibre-stems", f.stems.to_string(), "must be a whole number from 1 to 4");
        }
    }
    if !inp.ambient_vapor.is_empty() {
        if inp.ambient_vapor.len() != inp.fuel.len() {
            return bad("ambient-vapor", format!("{} values", inp.ambient_vapor.len()), "needs one mass fraction per fuel component");
        }
        let s: f64 = inp.ambient_vapor.iter().sum();
        if inp.ambient_vapor.iter().any(|y| !y.is_finite() || *y < 0.0) || s >= 0.5 {
            return bad("ambient-vapor", format!("sum {s}"), "mass fractions must be ≥ 0 and sum below 0.5");
        }
    }
    Ok(())
}

/// Validity notes for a condition (pressure vs critical, freezing, hot droplet).
pub(crate) fn validity_notes(inp: &DropletInputs) -> Vec<String> {
    let comps = &inp.fuel.components;
    let x = inp.fuel.mole_fractions();
    let mut notes = vec![];
    let p_pc = liquid::pseudo_critical_pressure(comps, &x);
    let p_c_min = comps.iter().map(|c| c.critical_pressure()).fold(f64::INFINITY, f64::min);
    if inp.pressure >= p_pc {
        notes.push(format!(
            "ambient pressure {:.3} MPa is at or above the liquid's pseudo-critical pressure {:.3} MPa: the subcritical model (Raoult's law, ideal gas, no gas solubility) is outside its validity range; results are indicative only",
            inp.pressure / 1e6,
            p_pc / 1e6
        ));
    } else if inp.pressure >= 0.5 * p_c_min {
        notes.push(format!(
            "ambient pressure {:.3} MPa exceeds half the lowest component critical pressure ({:.3} MPa): real-gas effects and gas solubility, neglected here, become significant",
            inp.pressure / 1e6,
            p_c_min / 1e6
        ));
    }
    // components with an enthalpy of fusion are watched along the run (freezing point of the surface liquid);
    // for the others only the pure melting point is known
    let t_m_max = comps
        .iter()
        .zip(&x)
        .filter(|(c, x)| **x > 0.01 && c.constants.enthalpy_of_fusion.is_none())
        .map(|(c, _)| c.constants.melting_point.value)
        .fold(0.0, f64::max);
    if inp.initial_temperature < t_m_max - 30.0 {
        notes.push(format!(
            "initial droplet temperature {:.1} K is far below the melting point of a major component without fusion data ({:.1} K): the liquid may not be liquid; properties are extrapolated",
            inp.initial_temperature, t_m_max
        ));
    }
    if let Some((t_f, id)) = ideal_solubility_freezing_point(comps, &x) {
        if inp.ambient_temperature < t_f {
            notes.push(format!(
                "ambient temperature {:.1} K is below the fuel's ideal-solubility freezing point {t_f:.1} K (first crystals: {id}): the droplet cools toward the gas and may freeze; solidification is not modelled, liquid properties are extrapolated below the freezing point",
                inp.ambient_temperature
            ));
        }
    }
    if let Some(r) = inp.extra_heat.radiation {
        notes.push(format!(
            "radiation from black surroundings at {:.1} K is absorbed with efficiency {} (grey sphere, transparent gas, absorbed at the surface); hydrocarbon droplets are semi-transparent, so the efficiency depends on size and wavelength and is the user's estimate",
            r.temperature.unwrap_or(inp.ambient_temperature),
            r.absorption_efficiency
        ));
    }
    if let Some(f) = inp.extra_heat.fibre {
        notes.push(format!(
            "suspended droplet: {} fibre stem(s) of {:.0} µm, k = {} W/(m·K), conduct heat in (infinite fin, Churchill–Bernstein h); the fibre's share grows as the droplet shrinks, and the late life describes the suspended droplet, not a free one",
            f.stems,
            f.diameter * 1e6,
            f.conductivity
        ));
    }
    if inp.initial_temperature > inp.ambient_temperature {
        notes.push("droplet starts hotter than the gas: it cools while evaporating (documented behaviour)".into());
    }
    if !inp.ambient_vapor.is_empty() && inp.ambient_vapor.iter().any(|y| *y > 0.0) {
        notes.push("ambient contains fuel vapour: components may condense on the droplet (negative species rates)".into());
        // Far-field partial pressure of each vapour against its saturation pressure at the gas temperature.
        let y_total: f64 = inp.ambient_vapor.iter().sum();
        let moles: f64 = inp.ambient_vapor.iter().zip(comps).map(|(y, c)| y / c.molar_mass()).sum::<f64>() + (1.0 - y_total) / inp.gas.molar_mass;
        for (c, y) in comps.iter().zip(&inp.ambient_vapor) {
            if *y <= 0.0 || inp.ambient_temperature >= c.critical_temperature() {
                continue;
            }
            let p_i = inp.pressure * (y / c.molar_mass()) / moles;
            let p_sat = c.vapor_pressure(inp.ambient_temperature);
            if p_sat.is_finite() && p_i > p_sat {
                notes.push(format!(
                    "ambient {} vapour is supersaturated: partial pressure {p_i:.4e} Pa above its saturation pressure {p_sat:.4e} Pa at the ambient {:.1} K; the far field is kept as given and the vapour condenses onto the droplet (it can grow); fog formation in the gas is not modelled",
                    c.id, inp.ambient_temperature
                ));
            }
        }
    }
    notes
}

/// An integration failure with the state it happened in, and the likely reason when the condition is past the
/// model's validity (docs/validity.md): a one-line stop instead of an integrator's internal code.
pub(crate) fn integration_failure(inp: &DropletInputs, time: f64, surface_temperature: f64, what: &str) -> ModelError {
    let comps = &inp.fuel.components;
    let p_pc = liquid::pseudo_critical_pressure(comps, &inp.fuel.mole_fractions());
    let t_c = comps.iter().map(|c| c.critical_temperature()).fold(f64::INFINITY, f64::min);
    let mut reason = format!("{what} (surface temperature {surface_temperature:.1} K)");
    if inp.pressure >= p_pc {
        reason.push_str(&format!(
            "; the ambient pressure {:.3} MPa is at or above the liquid's pseudo-critical pressure {:.3} MPa, where the subcritical droplet model breaks down: lower the pressure or treat the result as out of range",
            inp.pressure / 1e6,
            p_pc / 1e6
        ));
    } else if surface_temperature >= t_c {
        reason.push_str(&format!("; the surface is above a component's critical temperature ({t_c:.1} K), outside the subcritical model"));
    }
    ModelError::Integration { time, reason }
}

/// Ideal solid–liquid solubility (Schröder–van Laar, ΔCp neglected) freezing point of a liquid of mole
/// fractions `x` [K] and the component that crystallises first; None when no component has an enthalpy of
/// fusion. The same estimate as the residue indicators' freezing point.
fn ideal_solubility_freezing_point(comps: &[std::sync::Arc<crate::data::Component>], x: &[f64]) -> Option<(f64, String)> {
    let mut best: Option<(f64, String)> = None;
    for (c, &xi) in comps.iter().zip(x) {
        let Some(h) = c.constants.enthalpy_of_fusion.as_ref() else { continue };
        if xi <= 0.0 {
            continue;
        }
        let t = 1.0 / (1.0 / c.constants.melting_point.value - crate::data::GAS_CONSTANT * xi.ln() / h.value);
        if t.is_finite() && best.as_ref().is_none_or(|(b, _)| t > *b) {
            best = Some((t, c.id.clone()));
        }
    }
    best
}

/// Watches the surface temperature against the critical temperatures of the components present at the
/// surface (liquid mole fraction above 1 %), so a light component that has already evaporated raises no alarm.
#[derive(Debug, Default)]
pub(crate) struct CriticalWatch {
    /// Worst case so far: (T_s / T_c, T_s [K], T_c [K], component index, mole fraction, time [s]).
    worst: Option<(f64, f64, f64, usize, f64, f64)>,
    /// First state with the surface below the ideal-solubility freezing point of the surface liquid:
    /// (T_s [K], freezing point [K], component index of the first crystals, time [s]).
    frozen: Option<(f64, f64, usize, f64)>,
}

impl CriticalWatch {
    /// Look at one state: surface liquid mass fractions `w`, surface temperature and time.
    #[inline]
    pub(crate) fn observe(&mut self, comps: &[std::sync::Arc<crate::data::Component>], w: &[f64], surface_temperature: f64, time: f64) {
        let moles: f64 = comps.iter().zip(w).map(|(c, w)| w.max(0.0) / c.molar_mass()).sum();
        if moles.is_nan() || moles <= 0.0 {
            return;
        }
        for (i, (c, w)) in comps.iter().zip(w).enumerate() {
            let x = w.max(0.0) / c.molar_mass() / moles;
            let ratio = surface_temperature / c.critical_temperature();
            if x > 0.01 && ratio > 0.95 && self.worst.is_none_or(|b| ratio > b.0) {
                self.worst = Some((ratio, surface_temperature, c.critical_temperature(), i, x, time));
            }
            if self.frozen.is_none() && x > 0.0 {
                if let Some(h) = c.constants.enthalpy_of_fusion.as_ref() {
                    let t_f = 1.0 / (1.0 / c.constants.melting_point.value - crate::data::GAS_CONSTANT * x.ln() / h.value);
                    if surface_temperature < t_f {
                        self.frozen = Some((surface_temperature, t_f, i, time));
                    }
                }
            }
        }
    }

    /// The note, if the surface was ever below the freezing point of the surface liquid.
    pub(crate) fn freezing_note(&self, comps: &[std::sync::Arc<crate::data::Component>]) -> Option<String> {
        let (t_s, t_f, i, time) = self.frozen?;
        Some(format!(
            "surface temperature {t_s:.1} K was below the ideal-solubility freezing point of the surface liquid ({t_f:.1} K, first crystals: {}) at t = {time:.4e} s: the droplet may start to freeze; solidification is not modelled, liquid properties are extrapolated",
            comps[i].id
        ))
    }

    /// The note, if the surface came within 5 % of (or rose above) a present component's critical temperature.
    pub(crate) fn note(&self, comps: &[std::sync::Arc<crate::data::Component>]) -> Option<String> {
        let (ratio, t_s, t_c, i, x, time) = self.worst?;
        let id = &comps[i].id;
        Some(if ratio >= 1.0 {
            format!(
                "surface temperature {t_s:.1} K rose above the critical temperature of {id} ({t_c:.1} K, {:.1} mol% of the surface liquid) at t = {time:.4e} s: there is no sharp liquid-vapour interface in reality (supercritical mixing); the subcritical model runs on with its correlations clamped at or extrapolated past the critical point, so results are indicative only",
                100.0 * x
            )
        } else {
            format!(
                "surface temperature {t_s:.1} K came within 5 % of the critical temperature of {id} ({t_c:.1} K, {:.1} mol% of the surface liquid) at t = {time:.4e} s: subcritical correlations are near their limit",
                100.0 * x
            )
        })
    }
}

/// Run one droplet with the well-mixed liquid model.
pub fn simulate(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    check_inputs(inp)?;
    if inp.liquid.non_equilibrium {
        // Run the equilibrium case as well and say when the Langmuir–Knudsen correction matters (> 1 % lifetime).
        let mut eq = inp.clone();
        eq.liquid.non_equilibrium = false;
        let reference = simulate(&eq, &mut NoHistory)?;
        let mut res = activity_note(inp, simulate_model(inp, observer)?);
        if let (Some(a), Some(b)) = (res.outcome.lifetime, reference.outcome.lifetime) {
            let change = a / b - 1.0;
            let note = format!("non-equilibrium (Langmuir–Knudsen) surface changes the lifetime by {:+.2} % against the equilibrium surface", 100.0 * change);
            if change.abs() > 0.01 {
                res.outcome.regime_notes.push(note);
            } else {
                res.outcome.regime_notes.push(format!("{note} (below 1 %: negligible at this condition)"));
            }
        }
        return Ok(res);
    }
    simulate_model(inp, observer).map(|r| activity_note(inp, r))
}

/// With UNIFAC, say when the surface got hotter than the parameters' regression range (docs/property-methods.md).
fn activity_note(inp: &DropletInputs, mut res: RunResult) -> RunResult {
    let t_max = res.outcome.max_surface_temperature;
    if inp.liquid.activity == ActivityModel::Unifac && t_max > crate::props::activity::UNIFAC_UPPER_TEMPERATURE {
        res.outcome.regime_notes.push(format!(
            "surface temperature reached {t_max:.1} K, above the about {:.0} K up to which the original-UNIFAC parameters were fitted: activity coefficients are extrapolated there",
            crate::props::activity::UNIFAC_UPPER_TEMPERATURE
        ));
    }
    res
}

fn simulate_model(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    let mut run_inputs = None;
    if let Some(components) = crate::props::kernels::swap_components(&inp.fuel.components, inp.properties) {
        let mut i = inp.clone();
        i.fuel.components = components;
        run_inputs = Some(i);
    }
    let inp = run_inputs.as_ref().unwrap_or(inp);
    if inp.liquid.is_resolved() {
        return super::resolved::simulate_resolved(inp, observer);
    }
    let n = inp.fuel.len();
    let comps = inp.fuel.components.clone();
    let (mut sys, mut y0) = WellMixed::new(inp);
    let m0 = sys.initial_mass;
    let mut notes = validity_notes(inp);
    let w0 = &inp.fuel.mass_fractions;
    let t0 = inp.initial_temperature;
    let velocity0 = y0[n + 1];
    // Starting at or above the boiling-regime temperature: flash to it at once, then boil if the net heat holds
    // the droplet there.
    let x0 = inp.fuel.mole_fractions();
    // No bubble point (vapour pressure below the ambient pressure at every temperature) means no boiling.
    let t_bubble0 = sys.film.bubble_point(&x0).unwrap_or(f64::INFINITY);
    let t_hold0 = boiling_hold_temperature(&comps, &mut sys.film.setup.activity, &x0, inp.pressure).unwrap_or(f64::INFINITY);
    if !inp.fixed_temperature && t0 >= t_hold0 - 1e-9 {
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
        notes.push(format!(
            "initial temperature {t0:.2} K is at or above the bubble point ({t_bubble0:.2} K at the ambient pressure; the boiling regime holds Σ X_s = {BOILING_THRESHOLD}, {t_hold0:.2} K): {:.3} % of the mass flashed at injection (adiabatic flash) down to {tb:.2} K, {}",
            100.0 * (1.0 - m_left / m0),
            if holds { "then heat-limited boiling" } else { "where the net heat cannot hold it at the bubble point: it evaporates below it (no boiling)" }
        ));
    }
    let mut atol = vec![inp.rtol * 1e-3 * m0; 2 * n + 2];
    atol[n] = inp.rtol * 1.0;
    atol[n + 1] = inp.rtol * velocity0.max(1.0) * 1e-3;
    let tol = Tolerances { rtol: inp.rtol, atol };
    let mut dydt = vec![0.0; 2 * n + 2];
    let mut stepper = DormandPrince::new(&mut sys, 0.0, &y0, tol, 0.0, inp.max_time / 20.0);
    let mut history = super::guard::ThinnedHistory::new();
    let mut stagnation = super::guard::StagnationGuard::default();
    let wants_rows = observer.wants_rows();
    let mut buf = vec![0.0; 2 * n + 2];

    // `fresh`: evaluate the film at y; otherwise the system still holds the evaluation at y (the last
    // right-hand-side call of an accepted Dormand–Prince step is at its end point).
    let make_row = |sys: &mut WellMixed, t: f64, y: &[f64], dydt: &mut [f64], fresh: bool| -> HistoryRow {
        if fresh {
            sys.evaluate(y, dydt);
        }
        let m: f64 = y[..n].iter().map(|v| v.max(0.0)).sum();
        let rho = liquid::density(&sys.film.setup.components, &sys.w, sys.last_surface_temperature);
        let d = (6.0 * m / (std::f64::consts::PI * rho)).cbrt();
        let mdot = sys.last.evaporation_rate;
        let vapor: Vec<f64> = if mdot.abs() > 1e-300 {
            sys.film.species_rate.iter().map(|r| r / mdot).collect()
        } else {
            let s: f64 = sys.film.surface_mass.iter().sum();
            sys.film.surface_mass.iter().map(|v| if s > 0.0 { v / s } else { 0.0 }).collect()
        };
        HistoryRow {
            time: t,
            diameter: d,
            d2_ratio: (d / inp.initial_diameter).powi(2),
            surface_temperature: sys.last_surface_temperature,
            mass: m,
            evaporated_fraction: 1.0 - m / m0,
            velocity: y[n + 1],
            film: sys.last,
            liquid_mass_fractions: sys.w.clone(),
            vapor_mass_fractions: vapor,
            regime: sys.regime,
            mean_temperature: sys.last_surface_temperature,
            center_temperature: sys.last_surface_temperature,
            surface_liquid_mass_fractions: vec![],
        }
    };
    let remaining = |y: &[f64]| -> f64 { y[..n].iter().sum::<f64>() / m0 };

    let first = make_row(&mut sys, 0.0, &y0, &mut dydt, true);
    let mut critical = CriticalWatch::default();
    critical.observe(&comps, &first.liquid_mass_fractions, first.surface_temperature, 0.0);
    let mut max_t = first.surface_temperature;
    let mut max_re = first.film.reynolds;
    let mut heatup_end = if first.film.heat_to_liquid.abs() <= 0.1 * first.film.heat_from_gas.abs() { Some(0.0) } else { None };
    let mut boiling_onset = if sys.regime == Regime::Boiling { Some(0.0) } else { None };
    let mut boiling_entries = usize::from(boiling_onset.is_some());
    let mut boiling_exits = 0usize;
    if wants_rows {
        observer.on_step(&first);
        history.push(first);
    }
    let levels = [0.9, 0.5, 0.1];
    // a flash at injection may already have evaporated 10 % or more: those times are 0, not missing
    let mut crossing = levels.map(|lvl| (remaining(&y0) <= lvl).then_some(0.0));
    let mut status = Status::TimeLimit;
    let mut lifetime = None;
    loop {
        let t_prev = stepper.t;
        let rem_prev = remaining(&stepper.y);
        let step = stepper.step(&mut sys);
        if let Err(e) = step {
            let what = match e {
                super::integrator::StepError::StepTooSmall { .. } => "the step size fell to the round-off limit",
                super::integrator::StepError::NonFinite { .. } => "the equations gave a non-finite value",
            };
            return Err(integration_failure(inp, t_prev, stepper.y[n], what));
        }
        let mut t_now = stepper.t;
        let rem_now = remaining(&stepper.y);
        for (k, lvl) in levels.iter().enumerate() {
            if crossing[k].is_none() && rem_prev > *lvl && rem_now <= *lvl {
                crossing[k] = Some(locate_event(&stepper, |y| remaining(y) - lvl, &mut buf, 1e-12 * t_now.max(1e-9)));
            }
        }
        let mut finished = false;
        let mut y_end = stepper.y.clone();
        if rem_now <= inp.end_mass_fraction {
            let te = locate_event(&stepper, |y| remaining(y) - inp.end_mass_fraction, &mut buf, 1e-12 * t_now.max(1e-9));
            stepper.dense(te, &mut y_end);
            t_now = te;
            lifetime = Some(te);
            status = Status::Evaporated;
            finished = true;
        }
        let mut row = make_row(&mut sys, t_now, &y_end, &mut dydt, finished);
        max_t = max_t.max(row.surface_temperature);
        critical.observe(&comps, &row.liquid_mass_fractions, row.surface_temperature, t_now);
        max_re = max_re.max(row.film.reynolds);
        if heatup_end.is_none() && row.film.heat_to_liquid.abs() <= 0.1 * row.film.heat_from_gas.abs() {
            heatup_end = Some(t_now);
        }
        // boiling onset: Σ X_s reaches the threshold while the heat would carry the droplet past it
        if sys.regime == Regime::Evaporating && !inp.fixed_temperature && row.film.surface_vapor_mole_fraction >= BOILING_THRESHOLD && !finished {
            let onset = {
                let f = &mut sys;
                locate_event(
                    &stepper,
                    |y| {
                        let _ = f.unpack(y);
                        let x = std::mem::take(&mut f.x);
                        let s = f.film.surface_equilibrium(&x, y[n]) - BOILING_THRESHOLD;
                        f.x = x;
                        s
                    },
                    &mut buf,
                    1e-10 * t_now.max(1e-9),
                )
            };
            stepper.dense(onset, &mut y_end);
            let _ = sys.unpack(&y_end);
            let x = sys.x.clone();
            y_end[n] = WellMixed::bubble_point(&mut sys.film, &x);
            if sys.heat_at_hold(&y_end) > 0.0 {
                sys.regime = Regime::Boiling;
                boiling_entries += 1;
                if boiling_onset.is_none() {
                    boiling_onset = Some(onset);
                    notes.push(format!(
                        "surface reached the bubble point (held at {:.2} K, where Σ X_s = {BOILING_THRESHOLD}) at t = {:.4e} s: heat-limited boiling regime while the net heat holds it there",
                        y_end[n], onset
                    ));
                }
            }
            stepper.reset(&mut sys, onset, &y_end);
            t_now = onset;
            row = make_row(&mut sys, t_now, &y_end, &mut dydt, true);
        } else if sys.regime == Regime::Boiling && !inp.fixed_temperature && !finished && sys.heat_at_hold(&y_end) <= 0.0 {
            // leaving the boiling regime: the heat into the liquid (gas, radiation, fibre) no longer holds it
            let exit = {
                let f = &mut sys;
                locate_event(&stepper, |y| f.heat_at_hold(y), &mut buf, 1e-10 * t_now.max(1e-9))
            };
            stepper.dense(exit, &mut y_end);
            sys.regime = Regime::Evaporating;
            let _ = sys.unpack(&y_end);
            let x = sys.x.clone();
            y_end[n] = WellMixed::bubble_point(&mut sys.film, &x);
            boiling_exits += 1;
            if boiling_exits == 1 {
                notes.push(format!(
                    "at t = {exit:.4e} s the net heat into the liquid no longer holds the droplet at the bubble point ({:.2} K): it leaves the boiling regime and evaporates below it",
                    y_end[n]
                ));
            }
            stepper.reset(&mut sys, exit, &y_end);
            t_now = exit;
            row = make_row(&mut sys, t_now, &y_end, &mut dydt, true);
        }
        let stop = observer.on_step(&row);
        if wants_rows {
            history.push(row);
        }
        if finished {
            stepper.y.copy_from_slice(&y_end);
            stepper.t = t_now;
            break;
        }
        if stop {
            status = Status::Stopped;
            break;
        }
        if stepper.t >= inp.max_time {
            break;
        }
        if stepper.stats.steps > 2_000_000 {
            return Err(ModelError::Integration { time: stepper.t, reason: "more than 2 000 000 steps".into() });
        }
        if let Some(reason) = stagnation.check(stepper.stats.steps, stepper.t, inp.max_time, 1.0 - remaining(&stepper.y), 2_000_000) {
            return Err(ModelError::Integration { time: stepper.t, reason });
        }
    }
    let y = &stepper.y;
    let mut mass_err: f64 = 0.0;
    for i in 0..n {
        let initial = m0 * w0[i];
        if initial > 0.0 {
            mass_err = mass_err.max(((y[i] + y[n + 2 + i]) - initial).abs() / initial);
        }
    }
    if boiling_entries > 1 || boiling_exits > 1 {
        notes.push(format!("the droplet entered the boiling regime {boiling_entries} time(s) and left it {boiling_exits} time(s)"));
    }
    if let Some(note) = critical.note(&comps) {
        notes.push(note);
    }
    if let Some(note) = critical.freezing_note(&comps) {
        notes.push(note);
    }
    if let Some(note) = reynolds_note(inp.correlation, max_re) {
        notes.push(note);
    }
    if status == Status::TimeLimit {
        notes.push(format!(
            "time limit {:.4e} s reached with {:.2} % of the mass evaporated",
            inp.max_time,
            100.0 * (1.0 - remaining(y))
        ));
    }
    let m_end: f64 = y[..n].iter().map(|v| v.max(0.0)).sum();
    let outcome = RunOutcome {
        status,
        lifetime,
        t10: crossing[0],
        t50: crossing[1],
        t90: crossing[2],
        heatup_end,
        max_surface_temperature: max_t,
        boiling_onset,
        end_time: stepper.t,
        final_evaporated_fraction: 1.0 - remaining(y),
        regime_notes: notes,
        stats: stepper.stats,
        mass_balance_error: mass_err,
        evaporated_mass: y[n + 2..].to_vec(),
        final_liquid_mass_fractions: y[..n].iter().map(|v| v.max(0.0) / m_end.max(1e-300)).collect(),
    };
    Ok(RunResult { outcome, history: history.into_rows(), profiles: vec![] })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;

    #[test]
    fn decane_droplet_evaporates_and_conserves_mass() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("n-decane", &lib).unwrap();
        let gas = AmbientGas::air(&lib).unwrap();
        let inp = DropletInputs::new(fuel, gas, 800.0, 101_325.0, 50e-6, 300.0);
        let mut rec = Recorder::default();
        let r = simulate(&inp, &mut rec).unwrap();
        let o = &r.outcome;
        eprintln!("{:?} life {:?} t50 {:?} Tmax {} heatup {:?} stats {:?} notes {:?}", o.status, o.lifetime, o.t50, o.max_surface_temperature, o.heatup_end, o.stats, o.regime_notes);
        assert_eq!(o.status, Status::Evaporated);
        assert!(o.mass_balance_error < 1e-9, "{}", o.mass_balance_error);
        let life = o.lifetime.unwrap();
        // order of magnitude: K ≈ 0.3–1 mm²/s for decane at 800 K → lifetime 2.5–10 ms for 50 µm
        assert!(life > 1e-3 && life < 2e-2, "{life}");
    }
}

/// Energy balance of a uniform-temperature droplet history: Σ over steps |m̄ c̄_p ΔT − Δt · mean(Q_gas + Q_extra −
/// Σ ṁ_i L_i(T_s))|, divided by Σ Δt · mean|Q_gas + Q_extra| (trapezoids between recorded rows) [-]. The heat
/// terms are recomputed from the recorded gas heat, extra heat, species rates and surface temperature, not taken
/// from the model's own heat-to-liquid, so a regime that holds the temperature while heat flows in shows up.
pub fn energy_balance_residual(comps: &[std::sync::Arc<crate::data::Component>], rows: &[HistoryRow]) -> f64 {
    let net = |r: &HistoryRow| -> f64 {
        let latent: f64 = comps.iter().zip(&r.vapor_mass_fractions).map(|(c, y)| y * r.film.evaporation_rate * c.latent_heat(r.surface_temperature)).sum();
        r.film.heat_from_gas + r.film.heat_extra - latent
    };
    let (mut err, mut scale) = (0.0, 0.0);
    for (a, b) in rows.iter().zip(rows.iter().skip(1)) {
        let dt = b.time - a.time;
        if dt <= 0.0 {
            continue;
        }
        let w: Vec<f64> = a.liquid_mass_fractions.iter().zip(&b.liquid_mass_fractions).map(|(p, q)| 0.5 * (p + q)).collect();
        let cp = liquid::heat_capacity(comps, &w, 0.5 * (a.surface_temperature + b.surface_temperature));
        let stored = 0.5 * (a.mass + b.mass) * cp * (b.surface_temperature - a.surface_temperature);
        err += (stored - 0.5 * dt * (net(a) + net(b))).abs();
        scale += 0.5 * dt * ((a.film.heat_from_gas + a.film.heat_extra).abs() + (b.film.heat_from_gas + b.film.heat_extra).abs());
    }
    if scale > 0.0 {
        err / scale
    } else {
        0.0
    }
}

/// Adiabatic flash of a superheated liquid at pressure `p`: the superheat m cp (T − T_b) evaporates liquid of
/// the equilibrium-vapour composition, in portions of at most 1 %, until the liquid sits at its bubble point.
/// Returns the component masses left and the final temperature [K]. `activity`: the liquid activity model.
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
