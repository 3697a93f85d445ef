//! Property tables for spray CFD: the mixture liquid and its equilibrium vapour versus temperature, every
//! component's liquid and vapour properties with its constants, tables of partly evaporated (weathered)
//! residues, an equivalent single-component surrogate fitted with the droplet model, and least-squares
//! polynomial fits of every tabulated property. See docs/tables.md.
//!
//! Every tabulated value is computed by the library's own property functions (`props::liquid::state`,
//! `props::gas::gas_mixture_state`, the `Component` methods): a table is a sampled view of what the droplet
//! model uses, never a second implementation. This layer computes; `output::tables` writes.

pub mod fit;
pub mod surrogate;

use std::sync::Arc;

use serde::Serialize;
use thiserror::Error;

use crate::data::Component;
use crate::fuel::Fuel;
use crate::props::diffusion::wilke_chang;
use crate::model::ModelError;
use crate::post::indicators::freezing_point;
use crate::post::PostError;
use crate::props::gas::{gas_mixture_state, vapor_diffusion_coefficient, AmbientGas};
use crate::props::activity::{Activity, ActivityModel};
use crate::props::liquid;
use crate::props::pure::{merge_excursions, RangeExcursion};
use crate::props::PropertyError;

use fit::{fit_property, FitForm, FitVariable, PolyFit};

/// Mole fraction above which a component counts as major (range end and near-critical flag) [-].
pub const MAJOR_MOLE_FRACTION: f64 = 0.01;
/// Rows above this fraction of a major component's critical temperature are flagged near-critical [-].
pub const NEAR_CRITICAL_FRACTION: f64 = 0.9;
/// The default table ends at this fraction of the lowest critical temperature of a major component [-].
pub const END_CRITICAL_FRACTION: f64 = 0.95;
/// Highest temperature a table may reach, as a fraction of the lowest major critical temperature; liquid
/// cells of a component table end here too (the corresponding-states forms clamp at 0.99 Tc) [-].
pub const MAX_CRITICAL_FRACTION: f64 = 0.99;
/// Default start when no component has an enthalpy of fusion (no freezing-point estimate) [K].
pub const DEFAULT_START: f64 = 230.0;
/// The default start never goes below this temperature, even for a lower freezing-point estimate [K].
pub const LOWEST_DEFAULT_START: f64 = 200.0;
/// Lowest temperature a user may ask for [K].
pub const MIN_TEMPERATURE: f64 = 150.0;
/// Highest vapour-table temperature a user may ask for [K].
pub const MAX_VAPOR_TEMPERATURE: f64 = 4000.0;
/// Largest number of rows in one table.
pub const MAX_ROWS: usize = 20_000;
/// Default vapour-table range of the component tables [K].
pub const DEFAULT_VAPOR_RANGE: (f64, f64) = (250.0, 1500.0);

/// Errors raised while building tables.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum TableError {
    /// An option value is not acceptable (named as on the command line).
    #[error("--{option} {value}: {message}")]
    Input {
        /// Option name without dashes.
        option: &'static str,
        /// Value, with unit.
        value: String,
        /// What is wrong.
        message: String,
    },
    /// A property evaluation failed.
    #[error(transparent)]
    Property(#[from] PropertyError),
    /// A droplet run failed.
    #[error(transparent)]
    Model(#[from] ModelError),
    /// A residue could not be computed.
    #[error(transparent)]
    Post(#[from] PostError),
    /// A fit could not be made.
    #[error("{0}")]
    Fit(String),
}

fn input(option: &'static str, value: String, message: impl Into<String>) -> TableError {
    TableError::Input { option, value, message: message.into() }
}

/// Validity flag of a table row.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Validity {
    /// Every correlation used is inside its published range.
    Ok,
    /// Some correlation is evaluated outside its published range (`Correlation::in_range`).
    Extrapolated,
    /// The liquid is superheated at the table pressure (above its bubble point).
    AboveBubblePoint,
    /// Above 0.9 Tc of a major component: subcritical correlations near their limit.
    NearCritical,
    /// Component tables only: outside the liquid range, vapour columns only.
    VaporOnly,
}

impl Validity {
    /// Text as written in the `validity` column.
    pub fn as_str(self) -> &'static str {
        match self {
            Validity::Ok => "ok",
            Validity::Extrapolated => "extrapolated",
            Validity::AboveBubblePoint => "above-bubble-point",
            Validity::NearCritical => "near-critical",
            Validity::VaporOnly => "vapor-only",
        }
    }
}

/// Correlations that feed the liquid columns (file keys, as in `Component::correlations`).
pub const LIQUID_KEYS: [&str; 7] = ["vapor-pressure", "liquid-density", "latent-heat", "liquid-heat-capacity", "liquid-viscosity", "liquid-conductivity", "surface-tension"];
/// Correlations that feed the vapour columns.
pub const VAPOR_KEYS: [&str; 3] = ["ideal-gas-heat-capacity", "vapor-viscosity", "vapor-conductivity"];

/// Property keys (in `Component::correlations` order) used outside their valid range at `t`
/// ([`Component::valid_range`]: the published correlation's range, or a published extension method inside the
/// range it was stated or checked for) by any component with a positive fraction, among `keys`.
pub fn extrapolated_properties(components: &[Arc<Component>], fractions: &[f64], t: f64, keys: &[&str]) -> Vec<&'static str> {
    let mut out = vec![];
    for k in 0..10 {
        let mut hit: Option<&'static str> = None;
        for (c, f) in components.iter().zip(fractions) {
            if *f <= 0.0 {
                continue;
            }
            let r = c.valid_range(k);
            if keys.contains(&r.key) && !(t >= r.low && t <= r.high) {
                hit = Some(r.key);
                break;
            }
        }
        if let Some(h) = hit {
            out.push(h);
        }
    }
    out
}

/// Every (component, property) among `keys` used outside its valid range somewhere in `[from, to]`, with how
/// far, for the components with a positive fraction.
pub fn range_excursions(components: &[Arc<Component>], fractions: &[f64], from: f64, to: f64, keys: &[&str]) -> Vec<RangeExcursion> {
    merge_excursions(components.iter().zip(fractions).filter(|(_, f)| **f > 0.0).flat_map(|(c, _)| c.outside_valid_ranges(from, to, keys)))
}

/// One line per excursion, or a statement that there is none.
pub fn describe_excursions(list: &[RangeExcursion]) -> String {
    if list.is_empty() {
        "none: every property rests on its published correlation or a published extension inside its stated or checked range".into()
    } else {
        list.iter().map(|e| format!("{} ({})", e.describe(), e.method)).collect::<Vec<_>>().join("; ")
    }
}

// ---------------------------------------------------------------------------------------------------------
// Temperature grids
// ---------------------------------------------------------------------------------------------------------

/// The temperatures of a table and how its ends were chosen.
#[derive(Debug, Clone, Serialize)]
pub struct TemperatureGrid {
    /// First temperature [K].
    pub from: f64,
    /// Last temperature asked for (the last row is the last grid point not above it) [K].
    pub to: f64,
    /// Step [K].
    pub step: f64,
    /// How `from` was chosen.
    pub from_rule: String,
    /// How `to` was chosen.
    pub to_rule: String,
    /// Row temperatures [K].
    pub temperatures: Vec<f64>,
}

/// Grid points from + k·step not above `to`, rounded to 1 µK so that decimal steps print cleanly.
fn grid_points(from: f64, to: f64, step: f64) -> Vec<f64> {
    let n = ((to - from) / step + 1e-9).floor().max(0.0) as usize;
    (0..=n).map(|k| ((from + k as f64 * step) * 1e6).round() / 1e6).collect()
}

fn check_step(step: f64) -> Result<(), TableError> {
    if !(1e-3..=500.0).contains(&step) {
        return Err(input("step", format!("{step} K"), "must lie between 0.001 K and 500 K"));
    }
    Ok(())
}

/// Where the liquid range of a composition ends: the bubble point at `pressure` (None above the critical
/// region) and the lowest critical temperature of a major component (with its id).
#[derive(Debug, Clone)]
pub struct RangeLimits {
    /// Bubble point at the table pressure [K] (None at or above the pseudo-critical temperature).
    pub bubble_point: Option<f64>,
    /// Why there is no bubble point (empty when there is one).
    pub bubble_point_note: String,
    /// Lowest critical temperature of a component with mole fraction above 1 % [K].
    pub critical_temperature: f64,
    /// Id of that component.
    pub critical_component: String,
    /// Ideal-solubility freezing point [K] (None when no component has an enthalpy of fusion).
    pub freezing_point: Option<f64>,
    /// Component controlling the freezing point.
    pub freezing_component: Option<String>,
    /// Components skipped by the freezing-point estimate (no enthalpy of fusion).
    pub freezing_skipped: Vec<String>,
}

/// Mole fractions of the major components: above [`MAJOR_MOLE_FRACTION`], or the largest one if none is.
fn major(x: &[f64]) -> Vec<bool> {
    let mut m: Vec<bool> = x.iter().map(|v| *v > MAJOR_MOLE_FRACTION).collect();
    if !m.iter().any(|v| *v) {
        if let Some((i, _)) = x.iter().enumerate().max_by(|a, b| a.1.total_cmp(b.1)) {
            m[i] = true;
        }
    }
    m
}

/// Bubble point (with the liquid activity model `activity`), critical limit and freezing point of a composition.
pub fn range_limits(components: &[Arc<Component>], mass_fractions: &[f64], pressure: f64, activity: ActivityModel) -> RangeLimits {
    let x = liquid::mass_to_mole(components, mass_fractions);
    let m = major(&x);
    let (mut tc, mut id) = (f64::INFINITY, String::new());
    for ((c, _), is_major) in components.iter().zip(&x).zip(&m) {
        if *is_major && c.critical_temperature() < tc {
            tc = c.critical_temperature();
            id = c.id.clone();
        }
    }
    let (tf, controlling, skipped) = freezing_point(components, &x);
    let bubble = match Activity::new(activity, components) {
        Ok(mut a) => liquid::subcritical_bubble_point_with(components, &mut a, &x, pressure),
        Err(e) => Err(e.to_string()),
    };
    RangeLimits {
        bubble_point: bubble.as_ref().ok().copied(),
        bubble_point_note: bubble.err().unwrap_or_default(),
        critical_temperature: tc,
        critical_component: id,
        freezing_point: tf,
        freezing_component: controlling,
        freezing_skipped: skipped,
    }
}

/// The liquid temperature grid of a composition at `pressure`: user ends where given, else the defaults
/// (docs/tables.md): from the ideal-solubility freezing point (not below 200 K; 230 K when no component has an
/// enthalpy of fusion), rounded up to a multiple of the step, to the lower of the bubble point at `pressure`
/// and 0.95 of the lowest critical temperature of a major component, rounded down to a multiple of the step.
pub fn liquid_grid(limits: &RangeLimits, from: Option<f64>, to: Option<f64>, step: f64) -> Result<TemperatureGrid, TableError> {
    check_step(step)?;
    let tc = limits.critical_temperature;
    let cap = MAX_CRITICAL_FRACTION * tc;
    if let Some(f) = from {
        if !(f.is_finite() && f >= MIN_TEMPERATURE) {
            return Err(input("from", format!("{f} K"), format!("must be at least {MIN_TEMPERATURE} K")));
        }
        if f >= cap {
            return Err(input("from", format!("{f} K"), format!("is at or above 0.99 of the critical temperature of {} ({tc:.1} K): no liquid to tabulate", limits.critical_component)));
        }
    }
    if let Some(t) = to {
        if !t.is_finite() || t > cap {
            return Err(input(
                "to",
                format!("{t} K"),
                format!("is above 0.99 of the critical temperature of {} ({tc:.1} K), where liquid properties are not defined", limits.critical_component),
            ));
        }
    }
    let (default_from, from_rule) = match limits.freezing_point {
        Some(tf) if tf >= LOWEST_DEFAULT_START => (tf, format!("ideal-solubility freezing point {tf:.2} K (controlled by {})", limits.freezing_component.as_deref().unwrap_or("?"))),
        Some(tf) => (LOWEST_DEFAULT_START, format!("{LOWEST_DEFAULT_START} K (the ideal-solubility freezing point {tf:.2} K is lower; the default does not go below {LOWEST_DEFAULT_START} K)")),
        None => (DEFAULT_START, format!("{DEFAULT_START} K (no component has an enthalpy of fusion: no freezing-point estimate)")),
    };
    let crit_end = END_CRITICAL_FRACTION * tc;
    let (default_to, to_rule) = match limits.bubble_point {
        Some(tb) if tb <= crit_end => (tb, format!("bubble point {tb:.2} K at the table pressure")),
        Some(tb) => (crit_end, format!("0.95 of the critical temperature of {} ({crit_end:.2} K), below the bubble point {tb:.2} K", limits.critical_component)),
        None => (crit_end, format!("0.95 of the critical temperature of {} ({crit_end:.2} K); no bubble point at the table pressure", limits.critical_component)),
    };
    let (start, from_rule) = match from {
        Some(f) => (f, format!("--from {f} K")),
        None => ((default_from / step - 1e-9).ceil() * step, format!("{from_rule}, rounded up to a multiple of the step")),
    };
    let (end, to_rule) = match to {
        Some(t) => (t, format!("--to {t} K")),
        None => ((default_to / step + 1e-9).floor() * step, format!("{to_rule}, rounded down to a multiple of the step")),
    };
    // A range narrower than one step between rounded defaults: use the unrounded ends.
    let (start, end) = if start > end && from.is_none() && to.is_none() { (default_from, default_to) } else { (start, end) };
    if start >= end {
        let (option, value) = if to.is_some() { ("to", format!("{end} K")) } else { ("from", format!("{start} K")) };
        return Err(input(option, value, format!("the table would be empty: it must start below its end ({start:.2} K ≥ {end:.2} K; {to_rule})")));
    }
    let n = ((end - start) / step).floor() as usize + 1;
    if n > MAX_ROWS {
        return Err(input("step", format!("{step} K"), format!("gives {n} rows from {start:.2} K to {end:.2} K; at most {MAX_ROWS} are allowed")));
    }
    Ok(TemperatureGrid { from: start, to: end, step, from_rule, to_rule, temperatures: grid_points(start, end, step) })
}

/// The vapour grid of the component tables: from `from` to `to` in steps of `step`.
pub fn vapor_grid(from: f64, to: f64, step: f64) -> Result<TemperatureGrid, TableError> {
    check_step(step)?;
    if !(from.is_finite() && from >= MIN_TEMPERATURE) {
        return Err(input("vapor-from", format!("{from} K"), format!("must be at least {MIN_TEMPERATURE} K")));
    }
    if !(to.is_finite() && to > from && to <= MAX_VAPOR_TEMPERATURE) {
        return Err(input("vapor-to", format!("{to} K"), format!("must lie above --vapor-from ({from} K) and not above {MAX_VAPOR_TEMPERATURE} K")));
    }
    let n = ((to - from) / step).floor() as usize + 1;
    if n > MAX_ROWS {
        return Err(input("step", format!("{step} K"), format!("gives {n} vapour rows; at most {MAX_ROWS} are allowed")));
    }
    Ok(TemperatureGrid { from, to, step, from_rule: "--vapor-from".into(), to_rule: "--vapor-to".into(), temperatures: grid_points(from, to, step) })
}

// ---------------------------------------------------------------------------------------------------------
// Vapour of a liquid
// ---------------------------------------------------------------------------------------------------------

/// Properties of a fuel vapour (no ambient gas mixed in) and its diffusion in the ambient gas.
#[derive(Debug, Clone, Serialize)]
pub struct VaporState {
    /// Vapour mass fractions [-].
    pub mass_fractions: Vec<f64>,
    /// Mean molar mass [kg/mol].
    pub molar_mass: f64,
    /// Ideal-gas heat capacity, mass-fraction weighted [J/(kg·K)].
    pub cp: f64,
    /// Viscosity by Wilke [Pa·s].
    pub viscosity: f64,
    /// Conductivity by Wassiljewa–Mason–Saxena [W/(m·K)].
    pub conductivity: f64,
    /// Diffusion coefficient in the ambient gas: mass-fraction-weighted binary Fuller coefficients, each
    /// combined over the gas species by Blanc's law (as the droplet film model lumps them) [m²/s].
    pub diffusivity: f64,
}

/// Equilibrium vapour of a liquid at `t` (modified Raoult's law): mole fractions ∝ x_i γ_i p_sat,i(T), as mass
/// fractions (γ from `activity`; 1 for the ideal liquid).
pub fn equilibrium_vapor_mass_fractions(components: &[Arc<Component>], activity: &mut Activity, mole_fractions: &[f64], t: f64) -> Vec<f64> {
    let gamma = activity.gammas(mole_fractions, t);
    let y: Vec<f64> = components.iter().zip(mole_fractions).zip(gamma).map(|((c, x), g)| x * g * c.vapor_pressure(t) * c.molar_mass()).collect();
    let s: f64 = y.iter().sum();
    y.iter().map(|v| if s > 0.0 { v / s } else { 0.0 }).collect()
}

/// Vapour of mass fractions `vapor_mass_fractions` (summing to 1) at `t` and `p` in `gas`.
pub fn vapor_state(components: &[Arc<Component>], vapor_mass_fractions: &[f64], gas: &AmbientGas, t: f64, p: f64) -> VaporState {
    let g = gas_mixture_state(components, vapor_mass_fractions, gas, t, p);
    let diffusivity = components.iter().zip(vapor_mass_fractions).map(|(c, y)| y * vapor_diffusion_coefficient(c, gas, t, p)).sum();
    VaporState {
        mass_fractions: vapor_mass_fractions.to_vec(),
        molar_mass: g.molar_mass_kg_mol,
        cp: g.cp_J_kgK,
        viscosity: g.viscosity_Pa_s,
        conductivity: g.conductivity_W_mK,
        diffusivity,
    }
}

/// Liquid mass diffusivity of the mixture as the resolved droplet model uses it: Wilke–Chang with the
/// mole-averaged molar volume at the normal boiling point as solute and the mixture as solvent [m²/s].
pub fn mixture_liquid_diffusivity(components: &[Arc<Component>], mole_fractions: &[f64], viscosity: f64, t: f64) -> f64 {
    let w_b = liquid::molar_mass(components, mole_fractions);
    let v_a: f64 = components.iter().zip(mole_fractions).map(|(c, x)| x * c.molar_volume_at_boiling()).sum();
    wilke_chang(t, w_b, viscosity, v_a)
}

// ---------------------------------------------------------------------------------------------------------
// Mixture tables
// ---------------------------------------------------------------------------------------------------------

/// A numeric column: name (`snake_case_unit`), description, and the fit form used in fits.csv.
#[derive(Debug, Clone, Copy)]
pub struct Column {
    /// Column name.
    pub name: &'static str,
    /// What it holds.
    pub description: &'static str,
    /// Fit form and variable (None: not fitted).
    pub fit: Option<(FitForm, FitVariable)>,
}

const LIN: Option<(FitForm, FitVariable)> = Some((FitForm::Linear, FitVariable::Temperature));
const LOG_RECIPROCAL: Option<(FitForm, FitVariable)> = Some((FitForm::Log, FitVariable::Reciprocal));

/// Numeric columns of a mixture table, in file order (then `validity`, `extrapolated_properties`).
pub const MIXTURE_COLUMNS: [Column; 16] = [
    Column { name: "temperature_K", description: "liquid temperature", fit: None },
    Column { name: "density_kg_m3", description: "liquid density, ideal mixing of molar volumes (Amagat)", fit: LIN },
    Column { name: "cp_J_kgK", description: "liquid heat capacity, mass-fraction weighted", fit: LIN },
    Column { name: "viscosity_Pa_s", description: "liquid dynamic viscosity, Grunberg–Nissan without interaction (ln μ = Σ x_i ln μ_i)", fit: LOG_RECIPROCAL },
    Column { name: "kinematic_viscosity_m2_s", description: "liquid kinematic viscosity μ/ρ", fit: LOG_RECIPROCAL },
    Column { name: "conductivity_W_mK", description: "liquid thermal conductivity, DIPPR 9H (Vredeveld) rule", fit: LIN },
    Column { name: "surface_tension_N_m", description: "surface tension, mole-fraction weighted", fit: LIN },
    Column { name: "latent_heat_J_kg", description: "latent heat of the liquid composition, mass-fraction weighted Σ w_i L_i", fit: LIN },
    Column { name: "vapor_pressure_Pa", description: "bubble (vapour) pressure by Raoult's law, Σ x_i p_sat,i", fit: LOG_RECIPROCAL },
    Column { name: "latent_heat_equilibrium_vapor_J_kg", description: "latent heat per kg of the equilibrium vapour, Σ ε_i L_i with ε the vapour mass fractions", fit: LIN },
    Column { name: "liquid_diffusivity_m2_s", description: "liquid mass diffusivity, Wilke–Chang (mole-averaged solute volume at Tb, mixture solvent), as in the resolved droplet model", fit: LOG_RECIPROCAL },
    Column { name: "vapor_molar_mass_kg_mol", description: "molar mass of the equilibrium vapour", fit: LIN },
    Column { name: "vapor_cp_J_kgK", description: "ideal-gas heat capacity of the equilibrium vapour, mass-fraction weighted", fit: LIN },
    Column { name: "vapor_viscosity_Pa_s", description: "viscosity of the equilibrium vapour, Wilke", fit: LIN },
    Column { name: "vapor_conductivity_W_mK", description: "thermal conductivity of the equilibrium vapour, Wassiljewa–Mason–Saxena", fit: LIN },
    Column { name: "vapor_diffusivity_m2_s", description: "diffusion coefficient of the equilibrium vapour in the ambient gas at the table pressure: Fuller binary coefficients combined over the gas by Blanc's law, mass-fraction weighted over the vapour", fit: LIN },
];

/// One row of a mixture table.
#[derive(Debug, Clone, Serialize)]
#[allow(non_snake_case)]
pub struct MixtureRow {
    /// Liquid state (`props::liquid::state`).
    #[serde(flatten)]
    pub liquid: liquid::LiquidState,
    /// Latent heat per kg of equilibrium vapour [J/kg].
    pub latent_heat_equilibrium_vapor_J_kg: f64,
    /// Liquid mass diffusivity [m²/s].
    pub liquid_diffusivity_m2_s: f64,
    /// Equilibrium vapour at this temperature.
    #[serde(skip)]
    pub vapor: VaporState,
    /// Validity flag.
    pub validity: Validity,
    /// Property keys evaluated outside their published range.
    pub extrapolated_properties: Vec<&'static str>,
}

impl MixtureRow {
    /// The numeric cells in [`MIXTURE_COLUMNS`] order.
    pub fn numbers(&self) -> [f64; 16] {
        let l = &self.liquid;
        let v = &self.vapor;
        [
            l.temperature_K,
            l.density_kg_m3,
            l.cp_J_kgK,
            l.viscosity_Pa_s,
            l.kinematic_viscosity_m2_s,
            l.conductivity_W_mK,
            l.surface_tension_N_m,
            l.latent_heat_J_kg,
            l.vapor_pressure_Pa,
            self.latent_heat_equilibrium_vapor_J_kg,
            self.liquid_diffusivity_m2_s,
            v.molar_mass,
            v.cp,
            v.viscosity,
            v.conductivity,
            v.diffusivity,
        ]
    }
}

/// Evaluate one mixture row at `t` (mass fractions `w`) at table pressure `p` in `gas`, with the liquid activity
/// model `activity` (bubble pressure and equilibrium vapour).
pub fn mixture_row(components: &[Arc<Component>], activity: &mut Activity, w: &[f64], gas: &AmbientGas, p: f64, t: f64, limits: &RangeLimits) -> MixtureRow {
    let x = liquid::mass_to_mole(components, w);
    let mut state = liquid::state(components, w, t);
    state.vapor_pressure_Pa = activity.bubble_pressure(components, &x, t);
    let eps = equilibrium_vapor_mass_fractions(components, activity, &x, t);
    let latent_eq = components.iter().zip(&eps).map(|(c, e)| e * c.latent_heat(t)).sum();
    let vapor = vapor_state(components, &eps, gas, t, p);
    let liquid_diffusivity = mixture_liquid_diffusivity(components, &x, state.viscosity_Pa_s, t);
    let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
    let extrapolated = extrapolated_properties(components, w, t, &keys);
    let m = major(&x);
    let near_critical = components.iter().zip(&m).any(|(c, is_major)| *is_major && t > NEAR_CRITICAL_FRACTION * c.critical_temperature());
    let validity = if near_critical {
        Validity::NearCritical
    } else if limits.bubble_point.is_some_and(|tb| t > tb + 1e-9) {
        Validity::AboveBubblePoint
    } else if !extrapolated.is_empty() {
        Validity::Extrapolated
    } else {
        Validity::Ok
    };
    MixtureRow { liquid: state, latent_heat_equilibrium_vapor_J_kg: latent_eq, liquid_diffusivity_m2_s: liquid_diffusivity, vapor, validity, extrapolated_properties: extrapolated }
}

/// A mixture table: the composition, its range and rows.
#[derive(Debug, Clone)]
pub struct MixtureTable {
    /// Label used in file names and fits (`mixture`, `mixture_residue_0.30`).
    pub label: String,
    /// The liquid (name, components, mass fractions).
    pub fuel: Fuel,
    /// Evaporated fraction of the parent fuel for a residue table [-].
    pub evaporated_fraction: Option<f64>,
    /// Table pressure [Pa].
    pub pressure: f64,
    /// Ambient-gas label.
    pub gas: String,
    /// Range limits (bubble point, critical limit, freezing point).
    pub limits: RangeLimits,
    /// Temperatures.
    pub grid: TemperatureGrid,
    /// Rows.
    pub rows: Vec<MixtureRow>,
}

/// Build the mixture table of `fuel` at `opts.pressure` over the user or default range.
pub fn mixture_table(label: &str, fuel: &Fuel, opts: &TableOptions) -> Result<MixtureTable, TableError> {
    let mut activity = Activity::new(opts.activity, &fuel.components).map_err(|e| input("activity", opts.activity.as_str().into(), format!("fuel {}: {e}", fuel.origin)))?;
    let limits = range_limits(&fuel.components, &fuel.mass_fractions, opts.pressure, opts.activity);
    let grid = liquid_grid(&limits, opts.from, opts.to, opts.step)?;
    let rows = grid.temperatures.iter().map(|t| mixture_row(&fuel.components, &mut activity, &fuel.mass_fractions, &opts.gas, opts.pressure, *t, &limits)).collect();
    Ok(MixtureTable { label: label.to_string(), fuel: fuel.clone(), evaporated_fraction: None, pressure: opts.pressure, gas: opts.gas.label.clone(), limits, grid, rows })
}

// ---------------------------------------------------------------------------------------------------------
// Component tables
// ---------------------------------------------------------------------------------------------------------

/// Numeric columns of a component table, in file order (then `validity`, `extrapolated_properties`).
pub const COMPONENT_COLUMNS: [Column; 14] = [
    Column { name: "temperature_K", description: "temperature", fit: None },
    Column { name: "vapor_pressure_Pa", description: "saturation pressure", fit: LOG_RECIPROCAL },
    Column { name: "density_kg_m3", description: "saturated-liquid density", fit: LIN },
    Column { name: "cp_J_kgK", description: "liquid heat capacity", fit: LIN },
    Column { name: "viscosity_Pa_s", description: "liquid dynamic viscosity", fit: LOG_RECIPROCAL },
    Column { name: "kinematic_viscosity_m2_s", description: "liquid kinematic viscosity", fit: LOG_RECIPROCAL },
    Column { name: "conductivity_W_mK", description: "liquid thermal conductivity", fit: LIN },
    Column { name: "surface_tension_N_m", description: "surface tension", fit: LIN },
    Column { name: "latent_heat_J_kg", description: "latent heat of vaporisation", fit: LIN },
    Column { name: "liquid_diffusivity_m2_s", description: "liquid mass diffusivity of the component in the fuel's initial liquid, Wilke–Chang (solute volume at Tb, association factor 1)", fit: LOG_RECIPROCAL },
    Column { name: "vapor_cp_J_kgK", description: "ideal-gas heat capacity", fit: LIN },
    Column { name: "vapor_viscosity_Pa_s", description: "low-pressure vapour viscosity", fit: LIN },
    Column { name: "vapor_conductivity_W_mK", description: "low-pressure vapour thermal conductivity", fit: LIN },
    Column { name: "vapor_diffusivity_m2_s", description: "binary diffusion coefficient in the ambient gas at the table pressure (Fuller, Blanc's law over the gas species)", fit: LIN },
];

/// Index of the first vapour column in [`COMPONENT_COLUMNS`].
pub const FIRST_VAPOR_COLUMN: usize = 10;

/// One row of a component table; `liquid` is None outside the liquid range.
#[derive(Debug, Clone)]
pub struct ComponentRow {
    /// Temperature [K].
    pub temperature: f64,
    /// Liquid cells (vapour pressure .. liquid diffusivity), None outside the liquid range.
    pub liquid: Option<[f64; 9]>,
    /// Vapour cells (cp, viscosity, conductivity, diffusivity).
    pub vapor: [f64; 4],
    /// Validity flag.
    pub validity: Validity,
    /// Property keys evaluated outside their published range.
    pub extrapolated_properties: Vec<&'static str>,
}

impl ComponentRow {
    /// The cells in [`COMPONENT_COLUMNS`] order (None = empty).
    pub fn cells(&self) -> [Option<f64>; 14] {
        let mut out = [None; 14];
        out[0] = Some(self.temperature);
        if let Some(l) = &self.liquid {
            for (o, v) in out[1..10].iter_mut().zip(l) {
                *o = Some(*v);
            }
        }
        for (o, v) in out[FIRST_VAPOR_COLUMN..].iter_mut().zip(&self.vapor) {
            *o = Some(*v);
        }
        out
    }
}

/// The solvent of the Wilke–Chang liquid diffusivity in component tables: molar mass [kg/mol] and viscosity
/// function of a liquid.
#[derive(Debug, Clone)]
pub struct Solvent {
    /// Components of the solvent liquid.
    pub components: Vec<Arc<Component>>,
    /// Its mole fractions.
    pub mole_fractions: Vec<f64>,
}

impl Solvent {
    /// The liquid of a fuel.
    pub fn of(fuel: &Fuel) -> Self {
        Solvent { components: fuel.components.clone(), mole_fractions: fuel.mole_fractions() }
    }
}

/// A per-component table: liquid and vapour properties versus temperature.
#[derive(Debug, Clone)]
pub struct ComponentTable {
    /// The component.
    pub component: Arc<Component>,
    /// Lowest and highest temperature with liquid cells [K].
    pub liquid_range: Option<(f64, f64)>,
    /// Saturation temperature at the table pressure (None above the critical pressure) [K].
    pub saturation_temperature: Option<f64>,
    /// Table pressure [Pa].
    pub pressure: f64,
    /// Rows (the union of the liquid and vapour grids).
    pub rows: Vec<ComponentRow>,
}

/// Build a component table on the union of `liquid_temperatures` (cells up to 0.99 Tc) and
/// `vapor_temperatures`, at pressure `p` in `gas`, with liquid diffusivity in `solvent`.
pub fn component_table(c: &Arc<Component>, liquid_temperatures: &[f64], vapor_temperatures: &[f64], gas: &AmbientGas, p: f64, solvent: &Solvent) -> ComponentTable {
    let one = std::slice::from_ref(c);
    let tc = c.critical_temperature();
    let liquid_ts: Vec<f64> = liquid_temperatures.iter().copied().filter(|t| *t < MAX_CRITICAL_FRACTION * tc).collect();
    let mut all: Vec<f64> = liquid_ts.iter().chain(vapor_temperatures).copied().collect();
    all.sort_by(f64::total_cmp);
    all.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
    let is_liquid = |t: f64| liquid_ts.iter().any(|l| (l - t).abs() < 1e-6);
    let t_sat = liquid::bubble_point(one, &[1.0], p).ok();
    let solvent_w = liquid::molar_mass(&solvent.components, &solvent.mole_fractions);
    let v_b = c.molar_volume_at_boiling();
    let rows = all
        .iter()
        .map(|&t| {
            let vapor = [c.ideal_gas_heat_capacity(t), c.vapor_viscosity(t), c.vapor_conductivity(t), vapor_diffusion_coefficient(c, gas, t, p)];
            if is_liquid(t) {
                let rho = c.liquid_density(t);
                let mu = c.liquid_viscosity(t);
                let mu_solvent = liquid::viscosity(&solvent.components, &solvent.mole_fractions, t);
                let l = [
                    c.vapor_pressure(t),
                    rho,
                    c.liquid_heat_capacity(t),
                    mu,
                    mu / rho,
                    c.liquid_conductivity(t),
                    c.surface_tension(t),
                    c.latent_heat(t),
                    wilke_chang(t, solvent_w, mu_solvent, v_b),
                ];
                let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
                let extrapolated = extrapolated_properties(one, &[1.0], t, &keys);
                let validity = if t > NEAR_CRITICAL_FRACTION * tc {
                    Validity::NearCritical
                } else if t_sat.is_some_and(|ts| t > ts + 1e-9) {
                    Validity::AboveBubblePoint
                } else if !extrapolated.is_empty() {
                    Validity::Extrapolated
                } else {
                    Validity::Ok
                };
                ComponentRow { temperature: t, liquid: Some(l), vapor, validity, extrapolated_properties: extrapolated }
            } else {
                let extrapolated = extrapolated_properties(one, &[1.0], t, &VAPOR_KEYS);
                ComponentRow { temperature: t, liquid: None, vapor, validity: Validity::VaporOnly, extrapolated_properties: extrapolated }
            }
        })
        .collect();
    let liquid_range = match (liquid_ts.first(), liquid_ts.last()) {
        (Some(a), Some(b)) => Some((*a, *b)),
        _ => None,
    };
    ComponentTable { component: c.clone(), liquid_range, saturation_temperature: t_sat, pressure: p, rows }
}

// ---------------------------------------------------------------------------------------------------------
// Fits
// ---------------------------------------------------------------------------------------------------------

/// The fits of one table.
#[derive(Debug, Clone, Serialize)]
pub struct TableFits {
    /// Table label (`mixture`, `components/n-decane`, `surrogate`, ...).
    pub table: String,
    /// One fit per fitted column.
    pub fits: Vec<PolyFit>,
}

/// Fit every fittable column of a table given as (temperature, cells) rows.
pub fn fit_columns(table: &str, columns: &[Column], rows: &[(f64, Vec<Option<f64>>)]) -> TableFits {
    let mut fits = vec![];
    for (j, col) in columns.iter().enumerate() {
        let Some((form, variable)) = col.fit else { continue };
        let (ts, ys): (Vec<f64>, Vec<f64>) = rows.iter().filter_map(|(t, cells)| cells.get(j).copied().flatten().map(|v| (*t, v))).unzip();
        if let Some(f) = fit_property(col.name, &ts, &ys, form, variable) {
            fits.push(f);
        }
    }
    TableFits { table: table.to_string(), fits }
}

/// Fits of a mixture table.
pub fn fit_mixture(t: &MixtureTable) -> TableFits {
    let rows: Vec<(f64, Vec<Option<f64>>)> = t.rows.iter().map(|r| (r.liquid.temperature_K, r.numbers().iter().map(|v| Some(*v)).collect())).collect();
    fit_columns(&t.label, &MIXTURE_COLUMNS, &rows)
}

/// Fits of a component table (liquid columns over the liquid rows, vapour columns over all rows).
pub fn fit_component(label: &str, t: &ComponentTable) -> TableFits {
    let rows: Vec<(f64, Vec<Option<f64>>)> = t.rows.iter().map(|r| (r.temperature, r.cells().to_vec())).collect();
    fit_columns(label, &COMPONENT_COLUMNS, &rows)
}

// ---------------------------------------------------------------------------------------------------------
// The whole set
// ---------------------------------------------------------------------------------------------------------

/// What to tabulate (SI units; the CLI converts options into this).
#[derive(Debug, Clone)]
pub struct TableOptions {
    /// Table pressure [Pa].
    pub pressure: f64,
    /// Ambient gas (vapour diffusivities, surrogate runs).
    pub gas: AmbientGas,
    /// First liquid temperature (None = default) [K].
    pub from: Option<f64>,
    /// Last liquid temperature (None = default) [K].
    pub to: Option<f64>,
    /// Temperature step [K].
    pub step: f64,
    /// First vapour temperature of the component tables [K].
    pub vapor_from: f64,
    /// Last vapour temperature of the component tables [K].
    pub vapor_to: f64,
    /// Evaporated mass fractions of the weathering residues to tabulate (ascending, each in [0, 1)).
    pub residue_fractions: Vec<f64>,
    /// Temperature of the open-vessel weathering [K].
    pub residue_temperature: f64,
    /// Surrogate fit (None = skip).
    pub surrogate: Option<surrogate::SurrogateOptions>,
    /// Liquid activity model of the bubble point, bubble pressure, equilibrium vapour and weathering.
    pub activity: ActivityModel,
}

impl TableOptions {
    /// Defaults: 1 atm, the given gas, default ranges, 5 K steps, vapour 250–1500 K, no residues, surrogate
    /// at the default reference condition.
    pub fn new(gas: AmbientGas) -> Self {
        TableOptions {
            pressure: 101_325.0,
            gas,
            from: None,
            to: None,
            step: 5.0,
            vapor_from: DEFAULT_VAPOR_RANGE.0,
            vapor_to: DEFAULT_VAPOR_RANGE.1,
            residue_fractions: vec![],
            residue_temperature: 350.0,
            surrogate: Some(surrogate::SurrogateOptions::default()),
            activity: ActivityModel::Ideal,
        }
    }
}

/// Every table of one fuel.
#[derive(Debug, Clone)]
pub struct TableSet {
    /// Options used.
    pub options: TableOptions,
    /// Mixture table of the fuel.
    pub mixture: MixtureTable,
    /// Vapour grid of the component tables.
    pub vapor_grid: TemperatureGrid,
    /// One table per component, in fuel order.
    pub components: Vec<ComponentTable>,
    /// Mixture tables of the weathering residues.
    pub residues: Vec<MixtureTable>,
    /// The surrogate and its table.
    pub surrogate: Option<(surrogate::Surrogate, ComponentTable)>,
    /// Fits of every table.
    pub fits: Vec<TableFits>,
}

/// File label of a residue table, e.g. `mixture_residue_0.30`.
pub fn residue_label(evaporated_fraction: f64) -> String {
    format!("mixture_residue_{evaporated_fraction:.2}")
}

fn check_pressure(p: f64) -> Result<(), TableError> {
    if !(p.is_finite() && (1e3..=3e7).contains(&p)) {
        return Err(input("pressure", format!("{p} Pa"), "must lie between 1 kPa and 300 bar"));
    }
    Ok(())
}

/// Build every table of `fuel`.
pub fn build(fuel: &Fuel, opts: &TableOptions) -> Result<TableSet, TableError> {
    check_pressure(opts.pressure)?;
    if !(opts.residue_temperature.is_finite() && (MIN_TEMPERATURE..=800.0).contains(&opts.residue_temperature)) {
        return Err(input("residue-temperature", format!("{} K", opts.residue_temperature), "must lie between 150 K and 800 K"));
    }
    for (i, f) in opts.residue_fractions.iter().enumerate() {
        if !(f.is_finite() && (0.0..1.0).contains(f)) || (i > 0 && *f <= opts.residue_fractions[i - 1]) {
            let list: Vec<String> = opts.residue_fractions.iter().map(|v| v.to_string()).collect();
            return Err(input("residue", list.join(","), "evaporated fractions must increase and each lie in [0, 1)"));
        }
    }
    let mixture = mixture_table("mixture", fuel, opts)?;
    let vgrid = vapor_grid(opts.vapor_from, opts.vapor_to, opts.step)?;
    let solvent = Solvent::of(fuel);
    let components: Vec<ComponentTable> =
        fuel.components.iter().map(|c| component_table(c, &mixture.grid.temperatures, &vgrid.temperatures, &opts.gas, opts.pressure, &solvent)).collect();
    let mut residues = vec![];
    if !opts.residue_fractions.is_empty() {
        let res = crate::post::weathering_residues(&fuel.components, &fuel.mass_fractions, opts.residue_temperature, &opts.residue_fractions, opts.activity)?;
        for r in res {
            let label = residue_label(r.evaporated_fraction);
            let name = format!("{} residue {:.2} (weathered at {} K)", fuel.name, r.evaporated_fraction, opts.residue_temperature);
            let rf = fuel.with_mass_fractions(&name, &r.mass_fractions);
            let mut t = mixture_table(&label, &rf, opts)?;
            t.evaporated_fraction = Some(r.evaporated_fraction);
            residues.push(t);
        }
    }
    let surrogate = match &opts.surrogate {
        Some(so) => {
            let s = surrogate::fit_surrogate(fuel, &opts.gas, &mixture.grid, (opts.vapor_from, opts.vapor_to), so)?;
            let sc = s.component.clone();
            let solvent = Solvent { components: vec![sc.clone()], mole_fractions: vec![1.0] };
            let table = component_table(&sc, &mixture.grid.temperatures, &vgrid.temperatures, &opts.gas, opts.pressure, &solvent);
            Some((s, table))
        }
        None => None,
    };
    let mut fits = vec![fit_mixture(&mixture)];
    for r in &residues {
        fits.push(fit_mixture(r));
    }
    for t in &components {
        fits.push(fit_component(&format!("components/{}", t.component.id), t));
    }
    if let Some((_, t)) = &surrogate {
        fits.push(fit_component("surrogate", t));
    }
    Ok(TableSet { options: opts.clone(), mixture, vapor_grid: vgrid, components, residues, surrogate, fits })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;

    fn setup(fuel: &str) -> (Library, Fuel, AmbientGas) {
        let lib = Library::embedded().unwrap();
        let f = Fuel::resolve(fuel, &lib).unwrap();
        let g = AmbientGas::air(&lib).unwrap();
        (lib, f, g)
    }

    fn close(a: f64, b: f64) -> bool {
        (a - b).abs() <= 1e-12 * b.abs().max(1e-300)
    }

    /// Identity: a one-component mixture row equals the component's own properties.
    #[test]
    fn one_component_row_is_the_component() {
        let (_, fuel, gas) = setup("n-decane");
        let c = &fuel.components[0];
        let limits = range_limits(&fuel.components, &fuel.mass_fractions, 101_325.0, ActivityModel::Ideal);
        let mut ideal = Activity::ideal(fuel.components.len());
        for t in [260.0, 350.0, 440.0] {
            let r = mixture_row(&fuel.components, &mut ideal, &fuel.mass_fractions, &gas, 101_325.0, t, &limits);
            let l = &r.liquid;
            assert!(close(l.density_kg_m3, c.liquid_density(t)) && close(l.cp_J_kgK, c.liquid_heat_capacity(t)) && close(l.viscosity_Pa_s, c.liquid_viscosity(t)));
            assert!(close(l.conductivity_W_mK, c.liquid_conductivity(t)) && close(l.surface_tension_N_m, c.surface_tension(t)));
            assert!(close(l.latent_heat_J_kg, c.latent_heat(t)) && close(l.vapor_pressure_Pa, c.vapor_pressure(t)));
            assert!(close(r.latent_heat_equilibrium_vapor_J_kg, c.latent_heat(t)));
            assert!(close(r.vapor.cp, c.ideal_gas_heat_capacity(t)) && close(r.vapor.viscosity, c.vapor_viscosity(t)) && close(r.vapor.conductivity, c.vapor_conductivity(t)));
            assert!(close(r.vapor.diffusivity, vapor_diffusion_coefficient(c, &gas, t, 101_325.0)) && close(r.vapor.molar_mass, c.molar_mass()));
        }
    }

    /// Default ends: n-dodecane freezes at 263.6 K (first row 265 K) and boils at 489.5 K at 1 atm (last row
    /// 485 K); at 10 bar the bubble point (614.1 K) is below 0.95 Tc = 625.1 K (last row 610 K), rows above
    /// 0.9 Tc = 592.2 K are near-critical; rows above the bubble point of a user range are flagged.
    #[test]
    fn default_range_and_flags() {
        let (lib, fuel, gas) = setup("n-dodecane");
        let mut opts = TableOptions::new(gas);
        opts.surrogate = None;
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        assert!((t.grid.from - 265.0).abs() < 1e-9 && (t.grid.to - 485.0).abs() < 1e-9, "{:?}", t.grid);
        assert_eq!(t.rows.len(), 45);
        // cp's published polynomial ends at 330 K, but its Rowlinson–Bondi continuation is valid to 0.98 Tc:
        // ok at 400 K; the surface tension (Mulero–Cachadiña from 273.15 K) is extrapolated below it
        let r400 = t.rows.iter().find(|r| (r.liquid.temperature_K - 400.0).abs() < 1e-9).unwrap();
        assert_eq!(r400.validity, Validity::Ok, "{:?}", r400.extrapolated_properties);
        let flagged: Vec<f64> = t.rows.iter().filter(|r| r.validity == Validity::Extrapolated).map(|r| r.liquid.temperature_K).collect();
        assert_eq!(flagged, vec![265.0, 270.0]);
        assert_eq!(t.rows[0].extrapolated_properties, vec!["surface-tension"]);
        let outside = range_excursions(&fuel.components, &fuel.mass_fractions, 265.0, 485.0, &LIQUID_KEYS);
        assert_eq!(outside.len(), 1);
        assert!((outside[0].below_K - (273.15 - 265.0)).abs() < 1e-9 && outside[0].above_K == 0.0, "{outside:?}");
        opts.pressure = 1e6;
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        assert!((t.grid.to - 610.0).abs() < 1e-9, "{:?}", t.grid);
        for r in &t.rows {
            let tt = r.liquid.temperature_K;
            assert_eq!(r.validity == Validity::NearCritical, tt > 0.9 * 658.0, "{tt}");
        }
        opts.pressure = 101_325.0;
        opts.to = Some(520.0);
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        let above: Vec<f64> = t.rows.iter().filter(|r| r.validity == Validity::AboveBubblePoint).map(|r| r.liquid.temperature_K).collect();
        assert_eq!(above, vec![490.0, 495.0, 500.0, 505.0, 510.0, 515.0, 520.0]);
        // errors name the option
        opts.to = Some(700.0);
        let e = mixture_table("mixture", &fuel, &opts).unwrap_err().to_string();
        assert!(e.starts_with("--to 700 K"), "{e}");
        let _ = lib;
    }

    /// Component tables: union of the liquid and vapour grids, empty liquid cells outside the liquid range.
    #[test]
    fn component_table_grid() {
        let (_, fuel, gas) = setup("test-heptane-decane");
        let liquid: Vec<f64> = (0..10).map(|i| 300.0 + 10.0 * f64::from(i)).collect();
        let vapor: Vec<f64> = (0..5).map(|i| 250.0 + 100.0 * f64::from(i)).collect();
        let heptane = fuel.components.iter().find(|c| c.id == "n-heptane").unwrap();
        let t = component_table(heptane, &liquid, &vapor, &gas, 101_325.0, &Solvent::of(&fuel));
        let ts: Vec<f64> = t.rows.iter().map(|r| r.temperature).collect();
        assert_eq!(ts, vec![250.0, 300.0, 310.0, 320.0, 330.0, 340.0, 350.0, 360.0, 370.0, 380.0, 390.0, 450.0, 550.0, 650.0]);
        for r in &t.rows {
            assert_eq!(r.liquid.is_some(), (300.0..=390.0).contains(&r.temperature));
            assert_eq!(r.validity == Validity::VaporOnly, r.liquid.is_none());
        }
        // n-heptane boils at 371.6 K at 1 atm: 380 and 390 K are superheated
        assert_eq!(t.rows.iter().filter(|r| r.validity == Validity::AboveBubblePoint).count(), 2);
    }

    #[test]
    fn grid_points_are_clean() {
        let g = grid_points(250.0, 251.0, 0.1);
        assert_eq!(g.len(), 11);
        assert_eq!(format!("{}", g[3]), "250.3");
        assert!(check_step(0.0).is_err() && check_step(f64::NAN).is_err());
    }
}
