//! Data layer: component, gas and source files (TOML), validated at load time, and the embedded library.

pub mod component;
pub mod correlation;
pub mod gases;
pub mod joback_groups;
pub mod library;
pub mod sources;
pub mod toml_subset;
pub mod unifac_groups;

pub use component::{Component, Constants, HydrocarbonClass, Sourced};
pub use correlation::{Correlation, Dimension, Form, GAS_CONSTANT};
pub use gases::GasSpecies;
pub use library::Library;
pub use sources::SourceRegistry;

use thiserror::Error;

/// Errors raised while reading or checking data files.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum DataError {
    /// A file could not be parsed as TOML or has the wrong shape.
    #[error("{file}: {message}")]
    Parse {
        /// File name.
        file: String,
        /// Parser message (names the key and line).
        message: String,
    },
    /// A value is present but not acceptable.
    #[error("{context}: {message}")]
    Invalid {
        /// File and field.
        context: String,
        /// What is wrong.
        message: String,
    },
    /// A referenced id is unknown.
    #[error("{context}: unknown {kind} '{id}'{hint}")]
    Unknown {
        /// File and field.
        context: String,
        /// What kind of id (component, source, fuel, gas).
        kind: &'static str,
        /// The id given.
        id: String,
        /// A suggestion, with leading separator, or empty.
        hint: String,
    },
    /// An I/O failure.
    #[error("{file}: {message}")]
    Io {
        /// File name.
        file: String,
        /// System message.
        message: String,
    },
}

/// Largest input file read (fuel, component, spec, limits, spreads, class tables) \[bytes\]: anything bigger is
/// not one of dropcut's input files.
pub const MAX_INPUT_BYTES: u64 = 64 * 1024 * 1024;

/// Read an input file, refusing what is not a regular file (a FIFO would block forever, a device never ends)
/// and what is larger than [`MAX_INPUT_BYTES`]; the error is the message, without the file name.
pub fn read_input_file(path: &std::path::Path) -> Result<Vec<u8>, String> {
    use std::io::Read;
    let meta = std::fs::metadata(path).map_err(|e| e.to_string())?;
    if meta.is_dir() {
        return Err("is a folder, not a file".into());
    }
    if !meta.is_file() {
        return Err("is not a regular file (a FIFO, device or socket); dropcut reads its inputs from regular files".into());
    }
    if meta.len() > MAX_INPUT_BYTES {
        return Err(format!("is {} MB; no dropcut input file is larger than {} MB", meta.len() / 1_000_000, MAX_INPUT_BYTES / 1_048_576));
    }
    let f = std::fs::File::open(path).map_err(|e| e.to_string())?;
    let mut bytes = vec![];
    f.take(MAX_INPUT_BYTES + 1).read_to_end(&mut bytes).map_err(|e| e.to_string())?;
    if bytes.len() as u64 > MAX_INPUT_BYTES {
        return Err(format!("is larger than {} MB; no dropcut input file is", MAX_INPUT_BYTES / 1_048_576));
    }
    Ok(bytes)
}

/// Reduce a TOML parser error to one line naming what and where.
pub fn toml_error_line(e: &toml::de::Error) -> String {
    let msg = e.message().replace('\n', " ");
    match e.span() {
        Some(span) => format!("{} (at byte {})", msg.trim(), span.start),
        None => msg.trim().to_string(),
    }
}

/// Reduce a TOML parser error on `text` to one line naming what and where: line, column and the start of
/// that line (control characters shown as `?`, cut at 60 characters).
pub fn toml_error_at(e: &toml::de::Error, text: &str) -> String {
    let msg = e.message().split_whitespace().collect::<Vec<_>>().join(" ");
    let Some(span) = e.span() else { return msg };
    if span.start == 0 && span.end >= text.trim_end().len() {
        return msg; // the whole document (e.g. a missing top-level field): no line to point at
    }
    let start = span.start.min(text.len());
    let start = (0..=start).rev().find(|&i| text.is_char_boundary(i)).unwrap_or(0);
    let before = &text[..start];
    let line = before.matches('\n').count() + 1;
    let line_start = before.rfind('\n').map(|i| i + 1).unwrap_or(0);
    let column = text[line_start..start].chars().count() + 1;
    let line_text: String = text[line_start..].lines().next().unwrap_or("").chars().take(60).map(|c| if c.is_control() { '?' } else { c }).collect();
    if line_text.trim().is_empty() {
        format!("line {line}, column {column}: {msg}")
    } else {
        format!("line {line}, column {column} (`{}`): {msg}", line_text.trim())
    }
}

/// Closest id in `candidates` to `id` (for "did you mean" hints), by Levenshtein distance (`strsim`).
pub fn suggest<'a>(id: &str, candidates: impl Iterator<Item = &'a str>) -> String {
    if id.len() > 100 {
        return String::new(); // no id is that long, and the distance would cost O(len) per candidate
    }
    let mut best: Option<(usize, &str)> = None;
    for c in candidates {
        let d = strsim::levenshtein(id, c);
        if best.is_none_or(|(bd, _)| d < bd) {
            best = Some((d, c));
        }
    }
    match best {
        Some((d, c)) if d <= 3.max(id.len() / 3) => format!(" (did you mean '{c}'?)"),
        _ => String::new(),
    }
}
