//! Command-line interface: clap definitions, a second stage that validates and converts to SI config
//! structs, and the command handlers. `main.rs` only calls [`run`].

mod args;
mod commands;
mod common;
mod conditions;
mod fuelbuild;
mod sweep;
mod table;
mod plot;
mod uncertainty;

use std::ffi::OsString;
use std::io::Write;

use clap::Parser;

pub use args::Cli;
pub use conditions::{condition_args, droplet_inputs, ConditionArgs};

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
            // an output path that is a device, FIFO, symbolic link or a file where a folder belongs
            crate::output::OutputError::Target { .. } => CliError::input(e.to_string()),
            _ => CliError::runtime(e.to_string()),
        }
    }
}

impl From<crate::model::ModelError> for CliError {
    fn from(e: crate::model::ModelError) -> Self {
        match e {
            // the model names the input by its option name; on the command line it is `--name`
            crate::model::ModelError::Input { field, value, reason } => CliError::input(format!("--{field} = {value}: {reason}")),
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

/// Longest error message printed, in characters; longer ones (a 200 kB id echoed back) keep both ends.
const MAX_MESSAGE_CHARS: usize = 1000;

/// An error message as one printable line: newlines become spaces, other control characters are escaped
/// (`\u{1b}`), and an overlong message keeps its start and end around `…`.
fn printable_line(message: &str) -> String {
    let message = shorten_long_numbers(message);
    let mut s = String::with_capacity(message.len().min(4 * MAX_MESSAGE_CHARS));
    for c in message.chars() {
        match c {
            '\n' | '\r' | '\t' => s.push(' '),
            c if c.is_control() => s.extend(c.escape_default()),
            c => s.push(c),
        }
    }
    let n = s.chars().count();
    if n <= MAX_MESSAGE_CHARS {
        return s;
    }
    let head: String = s.chars().take(MAX_MESSAGE_CHARS * 2 / 3).collect();
    let tail: String = s.chars().skip(n - MAX_MESSAGE_CHARS / 3).collect();
    format!("{head} … ({} characters left out) … {tail}", n - head.chars().count() - tail.chars().count())
}

/// Numbers written out as hundreds of digits (`0.000…0001` for 1e-300) in shortest exponent form.
fn shorten_long_numbers(message: &str) -> String {
    let bytes = message.as_bytes();
    let mut out = String::with_capacity(message.len());
    let mut i = 0;
    while i < bytes.len() {
        let c = bytes[i];
        let starts_number = c.is_ascii_digit() || (c == b'-' && bytes.get(i + 1).is_some_and(u8::is_ascii_digit));
        let after_word = i > 0 && (bytes[i - 1].is_ascii_alphanumeric() || bytes[i - 1] == b'.');
        if starts_number && !after_word {
            let mut j = i + 1;
            while j < bytes.len() && (bytes[j].is_ascii_digit() || bytes[j] == b'.') {
                j += 1;
            }
            let token = &message[i..j];
            match token.parse::<f64>() {
                Ok(v) if j - i > 24 && v.is_finite() => out.push_str(&crate::output::fmt_f64(v).unwrap_or_else(|| token.to_string())),
                _ => out.push_str(token),
            }
            i = j;
        } else {
            let ch = message[i..].chars().next().unwrap_or(' ');
            out.push(ch);
            i += ch.len_utf8();
        }
    }
    out
}

/// Fold clap's multi-line usage error (message, tip, usage, pointer to --help) into one `error:` line.
fn one_line_usage_error(rendered: &str) -> String {
    let mut parts: Vec<String> = vec![];
    for line in rendered.lines().map(str::trim).filter(|l| !l.is_empty()) {
        let line = line.strip_prefix("error:").map(str::trim).unwrap_or(line);
        if line.starts_with("For more information") {
            continue;
        }
        let line = line.strip_prefix("Usage:").map(|u| format!("usage: {}", u.trim())).unwrap_or_else(|| line.to_string());
        parts.push(line);
    }
    let mut s = format!("error: {}", parts.join("; "));
    s.push_str(" (see --help)");
    s
}

/// For `--option 50 um` (a unit given as its own word, which the parser sees as a stray argument): a hint
/// naming the option and the value written as one word.
fn split_unit_hint(args: &[OsString]) -> Option<String> {
    let words: Vec<String> = args.iter().map(|a| a.to_string_lossy().into_owned()).collect();
    for i in 2..words.len() {
        let (option, value, unit) = (&words[i - 2], &words[i - 1], &words[i]);
        let is_unit = !unit.is_empty() && unit.len() <= 6 && !unit.starts_with('-') && unit.chars().all(|c| c.is_alphabetic() || c == '/' || c == 'µ' || c == '°');
        if option.starts_with("--") && !option.contains('=') && value.parse::<f64>().is_ok() && is_unit {
            return Some(format!("{option}: write the value and its unit as one word, e.g. {option} {value}{unit}"));
        }
    }
    None
}

/// Run the CLI with the given arguments (first = program name); returns the exit code.
pub fn run(args: impl IntoIterator<Item = OsString>) -> i32 {
    let args: Vec<OsString> = args.into_iter().collect();
    let cli = match Cli::try_parse_from(&args) {
        Ok(c) => c,
        Err(e) => {
            use clap::error::ErrorKind;
            // --help, --version and a bare `dropcut` print their text as clap lays it out; a usage error is
            // one `error:` line like every other error, so scripts and logs can rely on the last line.
            if !e.use_stderr() || e.kind() == ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand {
                let _ = e.print();
                return if e.use_stderr() { 2 } else { 0 };
            }
            let mut line = one_line_usage_error(&e.render().to_string());
            if e.kind() == ErrorKind::UnknownArgument {
                if let Some(hint) = split_unit_hint(&args) {
                    line = format!("{line} — {hint}");
                }
            }
            let _ = writeln!(std::io::stderr(), "{}", printable_line(&line));
            return 2;
        }
    };
    let result = std::panic::catch_unwind(|| commands::dispatch(cli));
    match result {
        Ok(Ok(())) => 0,
        Ok(Err(e)) => {
            let mut err = std::io::stderr().lock();
            let _ = writeln!(err, "error: {}", printable_line(&e.message));
            e.code
        }
        Err(_) => {
            let _ = writeln!(std::io::stderr(), "error: internal failure (a bug): please report it with the command line that caused it");
            1
        }
    }
}
