//! Post-processing: fuel-quality indicators of any liquid composition (distillation curve, flash point,
//! density, viscosity, DCN, heating value, freezing point, ...), open-vessel weathering residues, and
//! property windows read from limits files.
//!
//! This layer uses data, props and fuel; it never prints and never reads argv. Every indicator is a
//! screening estimate — see [`limits::CAUTION`].

pub mod droplet;
pub mod indicator_values;
pub mod indicators;
pub mod input_spread;
pub mod limits;
pub mod mixture_rules;
pub mod rayleigh;
pub mod residue_series;
pub mod weathering;

use std::sync::Arc;

use thiserror::Error;

use crate::data::Component;
use crate::props::PropertyError;

pub use indicators::{indicators, CetaneRule, IndicatorOptions, IndicatorSelection, Indicators, RecoveryBasis, ViscosityRule, INDICATOR_KEYS};
pub use limits::{LimitFlag, LimitStatus, Limits, LimitsError, CAUTION};
pub use weathering::{residue_table, weathering_residues, Residue, ResidueRow};

/// Errors raised by the post-processing layer.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum PostError {
    /// An input (composition, option) is not acceptable.
    #[error("{what}: {message}")]
    Input {
        /// Which input.
        what: &'static str,
        /// What is wrong with it.
        message: String,
    },
    /// A property evaluation failed.
    #[error(transparent)]
    Property(#[from] PropertyError),
    /// A limits file could not be read.
    #[error(transparent)]
    Limits(#[from] LimitsError),
}

/// Check a composition (same length as `components`, finite, non-negative, positive sum) and return it
/// normalised to sum 1.
pub(crate) fn normalised(components: &[Arc<Component>], fractions: &[f64], what: &'static str) -> Result<Vec<f64>, PostError> {
    if components.is_empty() {
        return Err(PostError::Input { what, message: "no components".into() });
    }
    if components.len() != fractions.len() {
        return Err(PostError::Input { what, message: format!("{} fractions for {} components", fractions.len(), components.len()) });
    }
    if let Some((i, f)) = fractions.iter().enumerate().find(|(_, f)| !(f.is_finite() && **f >= 0.0)) {
        return Err(PostError::Input { what, message: format!("fraction of '{}' is {f}; fractions must be finite and non-negative", components[i].id) });
    }
    let s: f64 = fractions.iter().sum();
    if s.is_nan() || s <= 0.0 {
        return Err(PostError::Input { what, message: "fractions sum to zero".into() });
    }
    Ok(fractions.iter().map(|f| f / s).collect())
}
