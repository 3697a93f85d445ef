//! Outputs: CSV and JSON writers, readers of saved results, charts and HTML pages. Consumers of results,
//! never producers of physics. Files are written to a temporary name and renamed, so an interrupted run never
//! leaves a truncated file behind.

pub mod charts;
pub mod compare;
pub mod history;
pub mod html;
pub mod read;
pub mod residue;
pub mod sweep_maps;
pub mod tables;
pub mod uncertainty;

use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};

use thiserror::Error;

/// Errors raised while writing outputs.
#[derive(Debug, Error)]
pub enum OutputError {
    /// File-system failure.
    #[error("{path}: {message}")]
    Io {
        /// Path concerned.
        path: String,
        /// System message.
        message: String,
    },
    /// A value that must never be written (NaN or infinity) reached a writer.
    #[error("{path}: refusing to write a non-finite value in column '{column}'")]
    NonFinite {
        /// File.
        path: String,
        /// Column.
        column: String,
    },
    /// A saved result file that cannot be read (missing, malformed, or lacking a column).
    #[error("{path}: {message}")]
    Read {
        /// File or folder.
        path: String,
        /// What is wrong.
        message: String,
    },
    /// A chart that could not be drawn.
    #[error("{path}: cannot draw the chart: {message}")]
    Chart {
        /// Chart file.
        path: String,
        /// Drawing-library message.
        message: String,
    },
}

fn io_err(path: &Path, e: std::io::Error) -> OutputError {
    OutputError::Io { path: path.display().to_string(), message: e.to_string() }
}

/// Create a folder (and parents).
pub fn ensure_dir(dir: &Path) -> Result<(), OutputError> {
    fs::create_dir_all(dir).map_err(|e| io_err(dir, e))
}

/// Write `contents` to `path` atomically (temporary file in the same folder, then rename).
pub fn write_atomic(path: &Path, contents: &[u8]) -> Result<(), OutputError> {
    write_via_temp(path, contents, true)
}

/// Like [`write_atomic`] but without forcing the data to disk: for files that can be redrawn from saved data
/// (charts, pages), where dozens of syncs per run would dominate the run time.
pub fn write_replace(path: &Path, contents: &[u8]) -> Result<(), OutputError> {
    write_via_temp(path, contents, false)
}

fn write_via_temp(path: &Path, contents: &[u8], sync: bool) -> Result<(), OutputError> {
    if let Some(parent) = path.parent() {
        if !parent.as_os_str().is_empty() {
            ensure_dir(parent)?;
        }
    }
    let tmp: PathBuf = {
        let mut name = path.file_name().map(|s| s.to_os_string()).unwrap_or_default();
        name.push(format!(".tmp-{}", std::process::id()));
        path.with_file_name(name)
    };
    {
        let mut f = fs::File::create(&tmp).map_err(|e| io_err(&tmp, e))?;
        f.write_all(contents).map_err(|e| io_err(&tmp, e))?;
        if sync {
            f.sync_all().map_err(|e| io_err(&tmp, e))?;
        }
    }
    fs::rename(&tmp, path).map_err(|e| io_err(path, e))?;
    if let (Some(dir), Some(name)) = (path.parent(), path.file_name()) {
        let mut prefix = name.to_os_string();
        prefix.push(".tmp-");
        remove_stale_temps(dir, &prefix.to_string_lossy(), "");
    }
    Ok(())
}

/// Remove temporary files `<prefix><anything><suffix>` that an interrupted earlier run left in `dir` (the
/// file the current run just wrote has already been renamed into place). Best effort: failures are ignored.
pub(crate) fn remove_stale_temps(dir: &Path, prefix: &str, suffix: &str) {
    let dir = if dir.as_os_str().is_empty() { Path::new(".") } else { dir };
    let Ok(entries) = fs::read_dir(dir) else { return };
    for e in entries.flatten() {
        let name = e.file_name();
        let name = name.to_string_lossy();
        if name.len() > prefix.len() + suffix.len() && name.starts_with(prefix) && name.ends_with(suffix) {
            let _ = fs::remove_file(e.path());
        }
    }
}

/// Format a float for CSV: shortest round-trip representation; refuses NaN/infinity.
#[inline]
pub fn fmt_f64(v: f64) -> Option<String> {
    if v.is_finite() {
        let a = v.abs();
        if a == 0.0 || (1e-4..1e7).contains(&a) {
            Some(format!("{v}"))
        } else {
            Some(format!("{v:e}"))
        }
    } else {
        None
    }
}

/// A CSV table under construction: `#` metadata lines, a header and rows of numbers or text.
#[derive(Debug, Default, Clone)]
pub struct CsvTable {
    /// Metadata lines (without the leading `# `).
    pub metadata: Vec<String>,
    /// Column names.
    pub header: Vec<String>,
    /// Rows, already formatted.
    pub rows: Vec<Vec<String>>,
}

/// A cell value for [`CsvTable::push`].
#[derive(Debug, Clone)]
pub enum Cell {
    /// A number (must be finite).
    Num(f64),
    /// An optional number (empty cell when None).
    Opt(Option<f64>),
    /// Text.
    Text(String),
}

impl CsvTable {
    /// New table with a header.
    pub fn new(header: Vec<String>) -> Self {
        CsvTable { header, ..Default::default() }
    }

    /// Append a row; a non-finite number is an error naming the column.
    pub fn push(&mut self, cells: Vec<Cell>, path_for_errors: &str) -> Result<(), OutputError> {
        let mut row = Vec::with_capacity(cells.len());
        for (i, c) in cells.into_iter().enumerate() {
            let s = match c {
                Cell::Num(v) => fmt_f64(v).ok_or_else(|| OutputError::NonFinite { path: path_for_errors.into(), column: self.header.get(i).cloned().unwrap_or_default() })?,
                Cell::Opt(None) => String::new(),
                Cell::Opt(Some(v)) => fmt_f64(v).ok_or_else(|| OutputError::NonFinite { path: path_for_errors.into(), column: self.header.get(i).cloned().unwrap_or_default() })?,
                Cell::Text(t) => {
                    if t.contains([',', '"', '\n']) {
                        format!("\"{}\"", t.replace('"', "\"\""))
                    } else {
                        t
                    }
                }
            };
            row.push(s);
        }
        self.rows.push(row);
        Ok(())
    }

    /// Render as text.
    pub fn render(&self) -> String {
        let mut s = String::new();
        for m in &self.metadata {
            s.push_str("# ");
            s.push_str(&m.replace('\n', " "));
            s.push('\n');
        }
        s.push_str(&self.header.join(","));
        s.push('\n');
        for r in &self.rows {
            s.push_str(&r.join(","));
            s.push('\n');
        }
        s
    }

    /// Write atomically to `path`.
    pub fn write(&self, path: &Path) -> Result<(), OutputError> {
        write_atomic(path, self.render().as_bytes())
    }
}

/// Serialize to pretty JSON and write atomically; refuses NaN (serde_json writes null for it, so check first).
pub fn write_json<T: serde::Serialize>(path: &Path, value: &T) -> Result<(), OutputError> {
    let text = to_json_string(value).map_err(|m| OutputError::Io { path: path.display().to_string(), message: m })?;
    write_atomic(path, text.as_bytes())
}

/// Pretty JSON text with a trailing newline.
pub fn to_json_string<T: serde::Serialize>(value: &T) -> Result<String, String> {
    let v = serde_json::to_value(value).map_err(|e| e.to_string())?;
    let mut s = serde_json::to_string_pretty(&v).map_err(|e| e.to_string())?;
    s.push('\n');
    Ok(s)
}

/// Version string written into metadata.
pub const TOOL_VERSION: &str = concat!("dropcut ", env!("CARGO_PKG_VERSION"));
