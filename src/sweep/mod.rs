//! Batch sweeps: a TOML spec expands lazily into numbered cases (fuels × conditions), a parallel runner writes one
//! summary row per case in case-id order, shards split a sweep into interleaved parts for a cluster job array,
//! `merge` joins shard outputs, and a generator writes the Slurm batch script. The format and the on-disk design
//! (journal file, resume, shards) are described in `docs/sweeps.md`.

pub mod merge;
pub mod residue;
pub mod runner;
pub mod shard;
pub mod slurm;
pub mod spec;
pub mod summary;

pub use merge::{merge, MergeReport};
pub use residue::ResidueIndicators;
pub use runner::{run, Progress, RunOptions, SweepReport};
pub use shard::Shard;
pub use spec::{Case, SweepSpec, Value, ValueText};
pub use summary::ExtraColumns;

use thiserror::Error;

/// Errors raised by sweeps.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum SweepError {
    /// The spec file is unreadable or a field in it is wrong (bad input).
    #[error("{file}: {field}: {message}")]
    Spec {
        /// Spec file as given.
        file: String,
        /// Field path inside the spec, e.g. `conditions.pressure[1]`.
        field: String,
        /// What is wrong, naming the value.
        message: String,
    },
    /// Existing output does not fit this run: another spec, another shard, an unfinished shard (bad input).
    #[error("{path}: {message}")]
    Mismatch {
        /// File or folder concerned.
        path: String,
        /// What does not fit and what to do.
        message: String,
    },
    /// A file-system failure while writing or reading outputs (runtime failure).
    #[error("{path}: {message}")]
    Io {
        /// File or folder concerned.
        path: String,
        /// System message.
        message: String,
    },
    /// Something that cannot happen did (a bug).
    #[error("internal failure: {0}")]
    Internal(String),
}

impl SweepError {
    /// True when the error comes from the user's input (spec, options, existing folders), not from the system.
    pub fn is_input(&self) -> bool {
        matches!(self, SweepError::Spec { .. } | SweepError::Mismatch { .. })
    }

    pub(crate) fn io(path: &std::path::Path, e: impl std::fmt::Display) -> Self {
        SweepError::Io { path: path.display().to_string(), message: e.to_string() }
    }
}

impl From<crate::output::OutputError> for SweepError {
    fn from(e: crate::output::OutputError) -> Self {
        match e {
            crate::output::OutputError::Io { path, message } => SweepError::Io { path, message },
            crate::output::OutputError::Target { path, message } => SweepError::Mismatch { path, message },
            other => SweepError::Internal(other.to_string()),
        }
    }
}

/// Name of the finished summary of a sweep (or shard) inside its output folder.
pub const SUMMARY_FILE: &str = "summary.csv";
/// Name of the journal a running sweep appends rows to; renamed to [`SUMMARY_FILE`] when every case is in.
pub const JOURNAL_FILE: &str = "summary.csv.partial";
/// Folder (inside the output folder) that holds per-case histories, one subfolder per case id.
pub const CASES_DIR: &str = "cases";
