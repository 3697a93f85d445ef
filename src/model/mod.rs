//! Droplet models: the gas film (Abramzon–Sirignano), the well-mixed multicomponent liquid, the integrator
//! and the run driver with events, regimes and observers.

pub mod droplet;
pub mod film;
pub mod guard;
pub mod integrator;
pub mod radial;
pub mod resolved;

pub use droplet::{simulate, DropletInputs, HistoryRow, Motion, Observer, Regime, RunOutcome, RunResult, Status};
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
        /// Time reached [s].
        time: f64,
        /// Reason.
        reason: String,
    },
}
