//! Command-line interface: clap definitions, a second stage that validates and converts to SI config
//! structs, and the command handlers. `main.rs` only calls [`run`].

mod args;
mod commands;
mod fuelbuild;
mod sweep;
mod table;
mod plot;
mod uncertainty;

use std::ffi::OsString;
use std::io::Write;

use clap::Parser;

pub use args::Cli;

/// A CLI failure with its exit code: 2 for bad input or usage, 1 for runtime failures.
#[derive(Debug)]
pub struct CliError {
    /// Exit code.
    pub code: i32,
    /// One-line message.
    pub message: String,
}

impl CliError {
    /// Bad input (exit 2).
    pub fn input(message: impl Into<String>) -> Self {
        CliError { code: 2, message: message.into() }
    }
    /// Runtime failure (exit 1).
    pub fn runtime(message: impl Into<String>) -> Self {
        CliError { code: 1, message: message.into() }
    }
}

impl From<crate::data::DataError> for CliError {
    fn from(e: crate::data::DataError) -> Self {
        match e {
            crate::data::DataError::Io { .. } => CliError::input(e.to_string()),
            _ => CliError::input(e.to_string()),
        }
    }
}

impl From<crate::fuel::FuelError> for CliError {
    fn from(e: crate::fuel::FuelError) -> Self {
        CliError::input(e.to_string())
    }
}

impl From<crate::props::PropertyError> for CliError {
    fn from(e: crate::props::PropertyError) -> Self {
        CliError::input(e.to_string())
    }
}

impl From<crate::output::OutputError> for CliError {
    fn from(e: crate::output::OutputError) -> Self {
        match e {
            // saved files given by the user (plot, compare inputs) that cannot be read: bad input
            crate::output::OutputError::Read { .. } => CliError::input(e.to_string()),
            _ => CliError::runtime(e.to_string()),
        }
    }
}

impl From<crate::model::ModelError> for CliError {
    fn from(e: crate::model::ModelError) -> Self {
        match e {
            crate::model::ModelError::Input { .. } => CliError::input(e.to_string()),
            _ => CliError::runtime(e.to_string()),
        }
    }
}

impl From<crate::sweep::SweepError> for CliError {
    fn from(e: crate::sweep::SweepError) -> Self {
        if e.is_input() {
            CliError::input(e.to_string())
        } else {
            CliError::runtime(e.to_string())
        }
    }
}

impl From<crate::uncertainty::UncertaintyError> for CliError {
    fn from(e: crate::uncertainty::UncertaintyError) -> Self {
        if e.is_input() {
            CliError::input(e.to_string())
        } else {
            CliError::runtime(e.to_string())
        }
    }
}

impl From<crate::units::UnitError> for CliError {
    fn from(e: crate::units::UnitError) -> Self {
        CliError::input(e.to_string())
    }
}

/// Run the CLI with the given arguments (first = program name); returns the exit code.
pub fn run(args: impl IntoIterator<Item = OsString>) -> i32 {
    let cli = match Cli::try_parse_from(args) {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return code;
        }
    };
    let result = std::panic::catch_unwind(|| commands::dispatch(cli));
    match result {
        Ok(Ok(())) => 0,
        Ok(Err(e)) => {
            let mut err = std::io::stderr().lock();
            let _ = writeln!(err, "error: {}", e.message.replace('\n', " "));
            e.code
        }
        Err(_) => {
            let _ = writeln!(std::io::stderr(), "error: internal failure (a bug): please report it with the command line that caused it");
            1
        }
    }
}
