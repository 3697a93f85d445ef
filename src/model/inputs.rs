//! Everything that defines one droplet run: fuel, ambient, motion, liquid-side model options; the input checks
//! and the validity notes of a condition (shared by the well-mixed and the resolved liquid models).

use crate::fuel::Fuel;
use crate::props::activity::{Activity, ActivityModel};
use crate::props::gas::AmbientGas;
use crate::props::liquid;

use super::film::{DragLaw, ExtraHeat, FilmSetup, TransferCorrelation, VapourDiffusion};
use super::ModelError;

/// Relative motion between droplet and gas.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Motion {
    /// A constant slip velocity \[m/s\].
    Fixed {
        /// Relative velocity \[m/s\].
        velocity: f64,
    },
    /// A droplet injected into gas at rest with this initial velocity, slowed by drag \[m/s\].
    Injected {
        /// Initial relative velocity \[m/s\].
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
    /// Ambient temperature \[K\].
    pub ambient_temperature: f64,
    /// Ambient pressure \[Pa\].
    pub pressure: f64,
    /// Far-field fuel-vapour mass fractions per fuel component \[-\] (empty = none).
    pub ambient_vapor: Vec<f64>,
    /// Initial diameter \[m\].
    pub initial_diameter: f64,
    /// Initial droplet temperature \[K\].
    pub initial_temperature: f64,
    /// Relative motion.
    pub motion: Motion,
    /// Nu0/Sh0 correlation.
    pub correlation: TransferCorrelation,
    /// Reference-state weight (1/3 rule).
    pub reference_weight: f64,
    /// Relative tolerance of the integrator.
    pub rtol: f64,
    /// Time at which to give up \[s\].
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
    /// Mixture-averaged or per-component vapour diffusivities in the species rates of the film.
    pub vapour_diffusion: VapourDiffusion,
    /// Pure-component properties from per-component kernels (default) or by direct evaluation.
    pub properties: crate::props::kernels::PropertyEvaluation,
    /// Runge–Kutta pair of the well-mixed liquid (default: chosen by `rtol`, [`crate::model::integrator::Method::Auto`]).
    pub integrator: crate::model::integrator::Method,
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
            vapour_diffusion: VapourDiffusion::default(),
            properties: Default::default(),
            integrator: Default::default(),
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
            vapour_diffusion: self.vapour_diffusion,
            activity: Activity::new(self.liquid.activity, &self.fuel.components).unwrap_or_else(|e| panic!("--activity {}: {e}", self.liquid.activity.as_str())),
        }
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
    if !(v.is_finite() && (0.0..=1000.0).contains(&v)) {
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
    if inp.liquid.activity == crate::props::activity::ActivityModel::Ideal {
        let polar: Vec<&str> = comps.iter().zip(&x).filter(|(c, x)| **x > 0.0 && c.class == crate::data::HydrocarbonClass::Oxygenate).map(|(c, _)| c.id.as_str()).collect();
        if !polar.is_empty() && x.iter().filter(|x| **x > 0.0).count() > 1 {
            notes.push(format!(
                "the liquid contains {} and is treated as ideal (Raoult's law): for ethanol with hydrocarbons that misses bubble temperatures at 1 atm by 14-32 K, where --activity unifac stays within about 1.5 K (docs/validation.md, liquid activity coefficients); use --activity unifac for this fuel",
                polar.join(", ")
            ));
        }
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
/// fractions `x` \[K\] and the component that crystallises first; None when no component has an enthalpy of
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

/// The inputs a run integrates with: with kernel evaluation (the default), the fuel's components carry their
/// per-component property kernels (None when nothing changes, e.g. direct evaluation).
pub(crate) fn with_kernels(inp: &DropletInputs) -> Option<DropletInputs> {
    crate::props::kernels::swap_components(&inp.fuel.components, inp.properties).map(|components| {
        let mut i = inp.clone();
        i.fuel.components = components;
        i
    })
}
