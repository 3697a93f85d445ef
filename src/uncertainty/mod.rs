//! Uncertainty bands: how sure is the predicted evaporation and drift? Samples the uncertain inputs
//! (conditions, composition, the stated uncertainty of every property correlation), runs one droplet per
//! sample in parallel, and reduces the runs to percentile bands and rank sensitivities (docs/uncertainty.md).
//!
//! This layer uses data, props, fuel, model and post; it never prints and never reads argv.

pub mod factors;
pub mod random;
pub mod run;
pub mod spec;
pub mod stats;

pub use factors::{perturbed, resolve, Factor, FactorKind, IndicatorInput};
pub use run::{overlaps, run, Method, Overlap, SampleRecord, SampleStatus, Settings, UncertaintyRun, RANKED_OUTPUTS, RESIDUE_KEYS};
pub use spec::{CompositionTarget, ConditionKey, Distribution, IndicatorInputSettings, PropertySettings, Spread, UncertaintySpec};
pub use stats::{Statistics, PERCENTILES};

use thiserror::Error;

/// Errors raised by uncertainty runs.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum UncertaintyError {
    /// A field of an uncertainty file is wrong (bad input).
    #[error("{file}: {field}: {message}")]
    Spec {
        /// File as given.
        file: String,
        /// Field path inside the file, e.g. `conditions.pressure`.
        field: String,
        /// What is wrong, naming the value.
        message: String,
    },
    /// A setting or command-line entry is wrong (bad input).
    #[error("{what}: {message}")]
    Input {
        /// Option or setting concerned.
        what: String,
        /// What is wrong.
        message: String,
    },
    /// The deterministic droplet run failed.
    #[error("deterministic run: {0}")]
    Model(#[from] crate::model::ModelError),
    /// Something that cannot happen did (a bug).
    #[error("internal failure: {0}")]
    Internal(String),
}

impl UncertaintyError {
    /// True when the error comes from the user's input, not from the system.
    pub fn is_input(&self) -> bool {
        match self {
            UncertaintyError::Spec { .. } | UncertaintyError::Input { .. } => true,
            UncertaintyError::Model(e) => matches!(e, crate::model::ModelError::Input { .. }),
            UncertaintyError::Internal(_) => false,
        }
    }
}
