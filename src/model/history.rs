//! What a droplet run gives back: history rows, radial profiles, observers, the run summary; and the energy
//! balance of a recorded history.

use crate::props::liquid;

use super::film::FilmResult;
use super::integrator::Stats;

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
    /// Time \[s\].
    pub time: f64,
    /// Diameter \[m\].
    pub diameter: f64,
    /// (d/d0)² \[-\].
    pub d2_ratio: f64,
    /// Surface (= droplet) temperature \[K\].
    pub surface_temperature: f64,
    /// Droplet mass \[kg\].
    pub mass: f64,
    /// Evaporated fraction of the initial mass \[-\].
    pub evaporated_fraction: f64,
    /// Relative velocity \[m/s\].
    pub velocity: f64,
    /// Film results at this instant.
    pub film: FilmResult,
    /// Liquid mass fractions \[-\].
    pub liquid_mass_fractions: Vec<f64>,
    /// Mass fractions of the vapour leaving the surface \[-\].
    pub vapor_mass_fractions: Vec<f64>,
    /// Regime.
    pub regime: Regime,
    /// Mass-mean liquid temperature \[K\] (= surface temperature for a uniform droplet).
    pub mean_temperature: f64,
    /// Centre temperature \[K\] (= surface temperature for a uniform droplet).
    pub center_temperature: f64,
    /// Liquid mass fractions at the surface \[-\] (empty for a well-mixed liquid).
    pub surface_liquid_mass_fractions: Vec<f64>,
}

/// Radial profiles inside the droplet at one instant (resolved models).
#[derive(Debug, Clone, serde::Serialize)]
pub struct Profile {
    /// Time \[s\].
    pub time: f64,
    /// Evaporated fraction \[-\].
    pub evaporated_fraction: f64,
    /// Droplet radius \[m\].
    pub radius: f64,
    /// Normalised radius of each cell centre r/r_s \[-\].
    pub radius_fraction: Vec<f64>,
    /// Temperature per cell \[K\].
    pub temperature: Vec<f64>,
    /// Mass fractions per component, per cell \[-\] (component-major).
    pub mass_fractions: Vec<Vec<f64>>,
}

/// Receives each accepted step; can stop the run.
pub trait Observer {
    /// Called after each accepted step with the row at that instant; return true to stop.
    fn on_step(&mut self, _row: &HistoryRow) -> bool {
        false
    }
    /// True when the observer wants full rows (with fractions) at every step; false: the run keeps no rows and
    /// the rows given to [`Observer::on_step`] may have empty liquid and vapour mass fractions.
    fn wants_rows(&self) -> bool {
        true
    }
    /// Times \[s\] at which the run's history holds rows instead of at every accepted step (ascending, finite,
    /// ≥ 0; see [`super::guard::check_history_times`]); empty (the default): a row at every accepted step. The
    /// first row (t = 0), regime changes and the final row (end of life, time limit, stop) are kept either way.
    fn history_times(&self) -> &[f64] {
        &[]
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
    /// Time when `end_mass_fraction` of the initial mass remains \[s\].
    pub lifetime: Option<f64>,
    /// Time at which 10 % of the mass has evaporated \[s\].
    pub t10: Option<f64>,
    /// Time at which 50 % has evaporated \[s\].
    pub t50: Option<f64>,
    /// Time at which 90 % has evaporated \[s\].
    pub t90: Option<f64>,
    /// End of the heat-up period \[s\]: first time the heat into the liquid is below 10 % of the gas heat flux.
    pub heatup_end: Option<f64>,
    /// Highest surface temperature \[K\].
    pub max_surface_temperature: f64,
    /// Time at which boiling started \[s\].
    pub boiling_onset: Option<f64>,
    /// Final time \[s\].
    pub end_time: f64,
    /// Evaporated fraction at the end \[-\].
    pub final_evaporated_fraction: f64,
    /// Notes on regimes and validity.
    pub regime_notes: Vec<String>,
    /// Integrator statistics.
    pub stats: Stats,
    /// Largest relative mass-balance error over components (liquid + evaporated vs initial) \[-\].
    pub mass_balance_error: f64,
    /// Evaporated mass per component at the end \[kg\].
    pub evaporated_mass: Vec<f64>,
    /// Liquid mass fractions at the end \[-\].
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
    /// How the history rows were taken.
    pub row_times: RowTimes,
}

/// How the rows of a run's history were taken (history.csv's metadata says so).
#[derive(Debug, Clone, PartialEq)]
pub enum RowTimes {
    /// A row at every `stride`-th accepted integrator step (1: every step; a long run thins its history by
    /// doubling the stride, see [`super::guard::MAX_HISTORY_ROWS`]), the final row included.
    Steps {
        /// Accepted steps per row.
        stride: usize,
    },
    /// Rows at these requested times \[s\] (those the run reached), plus the first row, regime changes and the
    /// final row.
    Requested(Vec<f64>),
}

impl Default for RowTimes {
    fn default() -> Self {
        RowTimes::Steps { stride: 1 }
    }
}

/// Energy balance of a droplet history: the liquid's sensible heat at its mass-mean temperature T̄ changes as
/// m c_p dT̄/dt = Q_gas + Q_extra − Σ ṁ_i L_i(T_s) − ṁ c_p (T_s − T̄) (the vapour leaves at the surface
/// temperature; the last term is zero for a uniform droplet, where T̄ = T_s). Returns Σ over steps |m̄ c̄_p ΔT̄ −
/// Δt · mean(right side)|, divided by Σ Δt · mean|Q_gas + Q_extra| (trapezoids between recorded rows) \[-\]. The
/// heat terms are recomputed from the recorded gas heat, extra heat, species rates and temperatures, not taken
/// from the model's own heat-to-liquid, so a regime that holds the temperature while heat flows in shows up.
pub fn energy_balance_residual(comps: &[std::sync::Arc<crate::data::Component>], rows: &[HistoryRow]) -> f64 {
    let net = |r: &HistoryRow, cp: f64| -> f64 {
        let latent: f64 = comps.iter().zip(&r.vapor_mass_fractions).map(|(c, y)| y * r.film.evaporation_rate * c.latent_heat(r.surface_temperature)).sum();
        r.film.heat_from_gas + r.film.heat_extra - latent - r.film.evaporation_rate * cp * (r.surface_temperature - r.mean_temperature)
    };
    let (mut err, mut scale) = (0.0, 0.0);
    for (a, b) in rows.iter().zip(rows.iter().skip(1)) {
        let dt = b.time - a.time;
        if dt <= 0.0 {
            continue;
        }
        let w: Vec<f64> = a.liquid_mass_fractions.iter().zip(&b.liquid_mass_fractions).map(|(p, q)| 0.5 * (p + q)).collect();
        let cp = liquid::heat_capacity(comps, &w, 0.5 * (a.mean_temperature + b.mean_temperature));
        let stored = 0.5 * (a.mass + b.mass) * cp * (b.mean_temperature - a.mean_temperature);
        err += (stored - 0.5 * dt * (net(a, cp) + net(b, cp))).abs();
        scale += 0.5 * dt * ((a.film.heat_from_gas + a.film.heat_extra).abs() + (b.film.heat_from_gas + b.film.heat_extra).abs());
    }
    if scale > 0.0 {
        err / scale
    } else {
        0.0
    }
}
