//! Droplet models: the gas film (Abramzon–Sirignano), the well-mixed and the radially resolved liquid side by
//! side, their shared inputs, history rows and watches, the integrator, the run driver (`simulate`) and the
//! stepping API for Lagrangian solvers (`stepping`).
//!
//! Inside the layer: inputs, history, watch, extra_heat, film, integrator, radial ← well_mixed, resolved ← run, stepping
//! (no module imports one to its right; `droplet` only re-exports the paths of earlier versions).

pub mod droplet;
pub mod extra_heat;
pub mod film;
pub mod guard;
pub mod history;
pub mod inputs;
pub mod integrator;
pub mod radial;
pub mod resolved;
pub mod run;
pub mod stepping;
pub mod watch;
pub mod well_mixed;

pub use history::{HistoryRow, Observer, Regime, RowTimes, RunOutcome, RunResult, Status};
pub use inputs::{DropletInputs, Motion};
pub use run::simulate;
pub use stepping::{DropletState, Exchange, FarField, Stepper};
pub use film::TransferCorrelation;

use thiserror::Error;

/// Errors raised by droplet models.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum ModelError {
    /// An input is outside what the model accepts.
    #[error("{field} = {value}: {reason}")]
    Input {
        /// Name of the input (CLI option name).
        field: &'static str,
        /// Its value, printed with unit.
        value: String,
        /// Why it is refused.
        reason: String,
    },
    /// The integration failed.
    #[error("integration failed at t = {time:.6e} s: {reason}")]
    Integration {
        /// Time reached \[s\].
        time: f64,
        /// Reason.
        reason: String,
    },
}
