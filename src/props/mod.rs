//! Properties layer: pure components (published correlations or corresponding states), liquid mixtures,
//! ambient gas and gas-film mixtures.

pub mod activity;
pub mod diffusion;
pub mod enthalpy;
pub mod gas;
pub mod joback;
pub mod kernels;
pub mod liquid;
pub mod pure;

use thiserror::Error;

/// Errors raised by property evaluations.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum PropertyError {
    /// An input value is not acceptable.
    #[error("{what} = {value} is not acceptable")]
    Invalid {
        /// Name of the input.
        what: &'static str,
        /// Its value.
        value: f64,
    },
    /// An equilibrium point could not be found.
    #[error("no {what} found at {pressure} Pa (is the pressure above the mixture's critical region?)")]
    NoSolution {
        /// What was searched.
        what: &'static str,
        /// At which pressure \[Pa\].
        pressure: f64,
    },
    /// An ambient-gas definition problem.
    #[error("{0}")]
    Gas(String),
}
