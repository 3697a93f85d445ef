//! Property tables for spray CFD: the mixture liquid and its equilibrium vapour versus temperature, every
//! component's liquid and vapour properties with its constants, tables of partly evaporated (weathered)
//! residues, an equivalent single-component surrogate fitted with the droplet model, and least-squares
//! polynomial fits of every tabulated property. See docs/tables.md.
//!
//! Every tabulated value is computed by the library's own property functions (`props::liquid::state`,
//! `props::gas::gas_mixture_state`, the `Component` methods): a table is a sampled view of what the droplet
//! model uses, never a second implementation. This layer computes; `output::tables` writes.

pub mod component;
pub mod enthalpy;
pub mod fit;
pub mod grid;
pub mod mixture;
pub mod surrogate;
pub mod validity;

use serde::Serialize;
use thiserror::Error;

use crate::fuel::Fuel;
use crate::model::ModelError;
use crate::post::PostError;
use crate::props::activity::ActivityModel;
use crate::props::gas::AmbientGas;
use crate::props::PropertyError;

pub use component::{component_table, ComponentRow, ComponentTable, Solvent, COMPONENT_COLUMNS, FIRST_VAPOR_COLUMN};
pub use grid::{liquid_grid, range_limits, vapor_grid, RangeLimits, TemperatureGrid};
pub use mixture::{
    equilibrium_vapor_mass_fractions, mixture_liquid_diffusivity, mixture_row, mixture_table, vapor_state, Column, MixtureRow, MixtureTable, VaporState, MIXTURE_COLUMNS,
};
pub use validity::{describe_excursions, extrapolated_properties, grade, range_excursions, RowValidity, Validity, LIQUID_KEYS, SHARE_COLUMNS, VAPOR_KEYS};

use fit::{fit_piecewise, PolyFit};

/// Mole fraction of the liquid above or near its critical temperature beyond which a row is flagged near-critical,
/// and above which a component counts as major (the surrogate's fit range) \[-\].
pub const MAJOR_MOLE_FRACTION: f64 = 0.01;
/// Rows above this fraction of a major component's critical temperature are flagged near-critical \[-\].
pub const NEAR_CRITICAL_FRACTION: f64 = 0.9;
/// Without a bubble point the default table ends at this fraction of the pseudo-critical temperature \[-\].
pub const END_CRITICAL_FRACTION: f64 = 0.95;
/// Highest temperature a table may reach, as a fraction of the liquid's pseudo-critical temperature (Kay's
/// rule); liquid cells of a component table end at this fraction of the component's own Tc \[-\].
pub const MAX_CRITICAL_FRACTION: f64 = 0.99;
/// Default start when no component has an enthalpy of fusion (no freezing-point estimate) \[K\].
pub const DEFAULT_START: f64 = 230.0;
/// The default start never goes below this temperature, even for a lower freezing-point estimate \[K\].
pub const LOWEST_DEFAULT_START: f64 = 200.0;
/// Lowest temperature a user may ask for \[K\].
pub const MIN_TEMPERATURE: f64 = 150.0;
/// Highest vapour-table temperature a user may ask for \[K\].
pub const MAX_VAPOR_TEMPERATURE: f64 = 4000.0;
/// Largest number of rows in one table.
pub const MAX_ROWS: usize = 20_000;
/// Default vapour-table range of the component tables \[K\].
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

/// Fit every fittable column of a table given as (temperature, cells) rows, piecewise where one polynomial
/// misses 1 % ([`fit::fit_piecewise`]).
pub fn fit_columns(table: &str, columns: &[Column], rows: &[(f64, Vec<Option<f64>>)]) -> TableFits {
    let mut fits = vec![];
    for (j, col) in columns.iter().enumerate() {
        let Some((form, variable)) = col.fit else { continue };
        let (ts, ys): (Vec<f64>, Vec<f64>) = rows.iter().filter_map(|(t, cells)| cells.get(j).copied().flatten().map(|v| (*t, v))).unzip();
        fits.extend(fit_piecewise(col.name, &ts, &ys, form, variable));
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
    /// Table pressure \[Pa\].
    pub pressure: f64,
    /// Ambient gas (vapour diffusivities, surrogate runs).
    pub gas: AmbientGas,
    /// First liquid temperature (None = default) \[K\].
    pub from: Option<f64>,
    /// Last liquid temperature (None = default) \[K\].
    pub to: Option<f64>,
    /// Temperature step \[K\].
    pub step: f64,
    /// First vapour temperature of the component tables \[K\].
    pub vapor_from: f64,
    /// Last vapour temperature of the component tables \[K\].
    pub vapor_to: f64,
    /// Evaporated mass fractions of the weathering residues to tabulate (ascending, each in [0, 1)).
    pub residue_fractions: Vec<f64>,
    /// Temperature of the open-vessel weathering \[K\].
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

