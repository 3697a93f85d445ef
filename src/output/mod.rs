//! Outputs: CSV and JSON writers, readers of saved results, charts and HTML pages. Consumers of results,
//! never producers of physics. Files are written to a temporary name and renamed, so an interrupted run never
//! leaves a truncated file behind; only files that a later run relies on are also forced to disk (see
//! [`Durability`]).

#[cfg(feature = "charts")]
pub mod charts;
pub mod compare;
pub mod history;
#[cfg(feature = "charts")]
pub mod html;
pub mod read;
pub mod residue;
#[cfg(feature = "charts")]
pub mod sweep_maps;
pub mod tables;
#[cfg(feature = "charts")]
pub mod uncertainty;

use std::cell::RefCell;
use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

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
    /// An output path that dropcut will not replace: an existing device, FIFO, socket or symbolic link where a
    /// regular file is written, or an existing non-folder where a folder is expected (bad input).
    #[error("{path}: {message}")]
    Target {
        /// Path given.
        path: String,
        /// What it is and what to do.
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

/// Why an existing `path` may not be replaced by a written file, if it may not: only a regular file (not a
/// symbolic link, device, FIFO or socket) is ever replaced.
pub fn refuse_file_target(path: &Path) -> Option<String> {
    let meta = fs::symlink_metadata(path).ok()?;
    let ft = meta.file_type();
    if ft.is_file() {
        return None;
    }
    Some(if ft.is_symlink() {
        "is a symbolic link; dropcut replaces only regular files (give the path it points to, or another name)".to_string()
    } else if ft.is_dir() {
        "is a folder; give a file name".to_string()
    } else {
        "exists and is not a regular file (a device, FIFO or socket); dropcut writes only regular files: give another name".to_string()
    })
}

/// Why an existing `path` cannot be used as an output folder, if it cannot (a symbolic link to a folder is fine).
pub fn refuse_dir_target(path: &Path) -> Option<String> {
    let meta = fs::metadata(path).or_else(|_| fs::symlink_metadata(path)).ok()?;
    if meta.is_dir() {
        return None;
    }
    Some(if meta.is_file() {
        "exists and is a file, not a folder; give a folder name".to_string()
    } else if meta.file_type().is_symlink() {
        "is a symbolic link that leads nowhere; give a folder name".to_string()
    } else {
        "exists and is not a folder (a device, FIFO or socket); give a folder name".to_string()
    })
}

/// Refuse an output file path that is not a regular file (see [`refuse_file_target`]).
pub fn check_file_target(path: &Path) -> Result<(), OutputError> {
    match refuse_file_target(path) {
        Some(message) => Err(OutputError::Target { path: path.display().to_string(), message }),
        None => Ok(()),
    }
}

/// Create a folder (and parents); refuses an existing path that is not a folder, or a parent that is not one.
pub fn ensure_dir(dir: &Path) -> Result<(), OutputError> {
    if dir.as_os_str().is_empty() {
        return Ok(());
    }
    let mut p = Some(dir);
    while let Some(q) = p {
        if !q.as_os_str().is_empty() {
            if let Some(message) = refuse_dir_target(q) {
                return Err(OutputError::Target { path: q.display().to_string(), message });
            }
        }
        p = q.parent();
    }
    fs::create_dir_all(dir).map_err(|e| io_err(dir, e))
}

/// How a written file reaches the disk (docs/validity.md, "Interrupted runs and determinism"). Both kinds go to a
/// temporary file in the same folder and are renamed into place, so a killed process or a failed write never
/// leaves a truncated or half-replaced file; they differ in what survives a power cut or an operating-system crash.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Durability {
    /// Renamed into place, not forced to disk: the results of one command (simulate, table, uncertainty, charts,
    /// pages), which that command recomputes in seconds. After a power cut shortly after the run the file may be
    /// the earlier version, missing or empty (never a mix of two versions); run the command again.
    Atomic,
    /// Also synced: the file before its rename and the folder after it, so it is on disk when the call returns.
    /// For files that a later run trusts without recomputing them (a sweep's per-case histories, whose journal
    /// rows a resumed sweep keeps).
    Synced,
}

/// Number of `fsync` calls made by the writers of this process (files and folders), for tests and diagnostics.
pub fn sync_count() -> u64 {
    SYNCS.load(Ordering::Relaxed)
}

static SYNCS: AtomicU64 = AtomicU64::new(0);

/// Write `contents` to `path` atomically ([`Durability::Atomic`]: temporary file in the same folder, renamed
/// into place, not forced to disk). Inside [`together`] the rename waits until the whole group is written.
pub fn write_atomic(path: &Path, contents: &[u8]) -> Result<(), OutputError> {
    write_via_temp(path, contents, Durability::Atomic)
}

/// Write `contents` to `path` atomically and force it to disk ([`Durability::Synced`]: the temporary file is
/// synced before its rename and the folder after it; inside [`together`] the folder is synced once for the group).
pub fn write_synced(path: &Path, contents: &[u8]) -> Result<(), OutputError> {
    write_via_temp(path, contents, Durability::Synced)
}

/// Write `contents` to `path` with the given durability ([`write_atomic`] or [`write_synced`]).
pub fn write_file(path: &Path, contents: &[u8], durability: Durability) -> Result<(), OutputError> {
    write_via_temp(path, contents, durability)
}

/// Marker inside temporary file names: `<file>.tmp-<pid>-<n>`.
const TEMP_MARK: &str = ".tmp-";

/// A temporary name beside `path` that no other thread or process uses: `<name>.tmp-<pid>-<n>` (`n` counts up
/// inside the process). `suffix` is appended (the bitmap encoder needs `.png`).
pub(crate) fn temp_path(path: &Path, prefix: &str, suffix: &str) -> PathBuf {
    static NEXT: AtomicU64 = AtomicU64::new(0);
    let mut name = std::ffi::OsString::from(prefix);
    name.push(path.file_name().unwrap_or_default());
    name.push(format!("{TEMP_MARK}{}-{}{suffix}", std::process::id(), NEXT.fetch_add(1, Ordering::Relaxed)));
    path.with_file_name(name)
}

/// Sync a folder so renames inside it survive a power cut (best effort: not every system allows it).
pub(crate) fn sync_dir(dir: &Path) {
    let dir = if dir.as_os_str().is_empty() { Path::new(".") } else { dir };
    if let Ok(f) = fs::File::open(dir) {
        SYNCS.fetch_add(1, Ordering::Relaxed);
        let _ = f.sync_all();
    }
}

/// A group of files written by [`together`]: temporaries waiting for their rename, files to remove, and whether
/// any of them was written [`Durability::Synced`] (then the folders are synced after the renames).
#[derive(Default)]
struct Group {
    renames: Vec<(PathBuf, PathBuf)>,
    removals: Vec<PathBuf>,
    synced: bool,
}

thread_local! {
    static GROUP: RefCell<Option<Group>> = const { RefCell::new(None) };
}

/// Run `write` so that the files it writes with [`write_atomic`] / [`write_atomic`] (and removes with
/// [`remove_output`]) replace the old ones together or not at all: each file goes to a temporary first, and
/// only when every one is written are they renamed into place. On an error (a full disk) the temporaries are
/// removed and the old files stay as they were. Groups do not nest (an inner group joins the outer one).
pub fn together<T, E: From<OutputError>>(write: impl FnOnce() -> Result<T, E>) -> Result<T, E> {
    let outer = GROUP.with(|g| g.borrow().is_some());
    if outer {
        return write();
    }
    GROUP.with(|g| *g.borrow_mut() = Some(Group::default()));
    let result = write();
    let group = GROUP.with(|g| g.borrow_mut().take()).unwrap_or_default();
    match result {
        Ok(v) => {
            let mut dirs: Vec<PathBuf> = vec![];
            for (tmp, path) in &group.renames {
                if let Err(e) = replace_file(tmp, path, group.synced) {
                    for (t, _) in &group.renames {
                        let _ = fs::remove_file(t);
                    }
                    return Err(io_err(path, e).into());
                }
                let dir = path.parent().map(Path::to_path_buf).unwrap_or_default();
                if !dirs.contains(&dir) {
                    dirs.push(dir);
                }
            }
            for p in &group.removals {
                let _ = fs::remove_file(p);
            }
            if group.synced {
                for d in &dirs {
                    sync_dir(d);
                }
            }
            // one scan of each folder for the temporaries of every file of the group
            for d in &dirs {
                let prefixes: Vec<String> = group
                    .renames
                    .iter()
                    .filter(|(_, path)| path.parent().map(Path::to_path_buf).unwrap_or_default() == *d)
                    .filter_map(|(_, path)| path.file_name().map(|n| format!("{}{TEMP_MARK}", n.to_string_lossy())))
                    .collect();
                remove_stale_temps_any(d, &prefixes, "");
            }
            Ok(v)
        }
        Err(e) => {
            for (tmp, _) in &group.renames {
                let _ = fs::remove_file(tmp);
            }
            Err(e)
        }
    }
}

/// Remove an earlier output file that this run does not produce (e.g. profiles.csv of an earlier resolved
/// run); inside [`together`] the removal waits for the group. A missing file is fine.
pub fn remove_output(path: &Path) -> Result<(), OutputError> {
    if fs::symlink_metadata(path).is_err() {
        return Ok(());
    }
    check_file_target(path)?;
    let queued = GROUP.with(|g| match g.borrow_mut().as_mut() {
        Some(group) => {
            group.removals.push(path.to_path_buf());
            true
        }
        None => false,
    });
    if !queued {
        fs::remove_file(path).map_err(|e| io_err(path, e))?;
    }
    Ok(())
}

fn write_via_temp(path: &Path, contents: &[u8], durability: Durability) -> Result<(), OutputError> {
    let sync = durability == Durability::Synced;
    check_file_target(path)?;
    if let Some(parent) = path.parent() {
        if !parent.as_os_str().is_empty() {
            ensure_dir(parent)?;
        }
    }
    let tmp = temp_path(path, "", "");
    let written = (|| -> std::io::Result<()> {
        let mut f = fs::OpenOptions::new().write(true).create_new(true).open(&tmp)?;
        f.write_all(contents)?;
        if sync {
            SYNCS.fetch_add(1, Ordering::Relaxed);
            f.sync_all()?;
        }
        Ok(())
    })();
    if let Err(e) = written {
        let _ = fs::remove_file(&tmp);
        return Err(io_err(&tmp, e));
    }
    let queued = GROUP.with(|g| match g.borrow_mut().as_mut() {
        Some(group) => {
            group.renames.push((tmp.clone(), path.to_path_buf()));
            group.synced |= sync;
            true
        }
        None => false,
    });
    if queued {
        return Ok(());
    }
    if let Err(e) = replace_file(&tmp, path, sync) {
        let _ = fs::remove_file(&tmp);
        return Err(io_err(path, e));
    }
    if sync {
        sync_dir(path.parent().unwrap_or(Path::new("")));
    }
    remove_stale_temps_of(path, "", "");
    Ok(())
}

/// Move the written temporary `tmp` to `path`, replacing an earlier file there in one step (a reader sees the
/// old or the new file, never none). A plain rename over an existing file makes ext4 (`auto_da_alloc`) write the
/// new file's data out before the rename returns: 2–4 ms per file on this project's machine, more than a whole
/// `simulate` computes. For a file written [`Durability::Atomic`] on Linux the two names are therefore exchanged
/// (`renameat2(RENAME_EXCHANGE)`, which that heuristic leaves alone) and the old file, now under the temporary
/// name, is removed; where exchange is not possible (no earlier file, another system or file system) it is a
/// plain rename. A synced file is already on disk, so it is renamed plainly.
pub(crate) fn replace_file(tmp: &Path, path: &Path, synced: bool) -> std::io::Result<()> {
    #[cfg(target_os = "linux")]
    if !synced && exchange(tmp, path).is_ok() {
        // the earlier file is now under the temporary name: only ever a regular file is removed (a link, folder
        // or anything else put there since the check is exchanged back and the write refused)
        match fs::symlink_metadata(tmp) {
            Ok(m) if m.file_type().is_file() => {
                let _ = fs::remove_file(tmp);
                return Ok(());
            }
            _ => {
                let _ = exchange(tmp, path);
                return Err(std::io::Error::other("the output path became a link, folder or special file while writing; nothing was replaced"));
            }
        }
    }
    let _ = synced;
    fs::rename(tmp, path)
}

/// Exchange two existing paths atomically (Linux `renameat2` with `RENAME_EXCHANGE`).
#[cfg(target_os = "linux")]
fn exchange(a: &Path, b: &Path) -> std::io::Result<()> {
    use std::ffi::CString;
    use std::os::unix::ffi::OsStrExt;
    let ca = CString::new(a.as_os_str().as_bytes()).map_err(std::io::Error::other)?;
    let cb = CString::new(b.as_os_str().as_bytes()).map_err(std::io::Error::other)?;
    // SAFETY: two valid NUL-terminated paths; renameat2 reads them and touches no memory of ours
    let r = unsafe { libc::renameat2(libc::AT_FDCWD, ca.as_ptr(), libc::AT_FDCWD, cb.as_ptr(), libc::RENAME_EXCHANGE) };
    if r == 0 {
        Ok(())
    } else {
        Err(std::io::Error::last_os_error())
    }
}

/// Remove the temporaries of `path` (named by [`temp_path`] with this prefix and suffix) that an interrupted
/// earlier run left behind.
pub(crate) fn remove_stale_temps_of(path: &Path, prefix: &str, suffix: &str) {
    if let (Some(dir), Some(name)) = (path.parent(), path.file_name()) {
        let mut p = std::ffi::OsString::from(prefix);
        p.push(name);
        p.push(TEMP_MARK);
        remove_stale_temps(dir, &p.to_string_lossy(), suffix);
    }
}

/// True when the process `pid` may still be running (so its temporary file may be in flight).
fn process_may_run(pid: u32) -> bool {
    if pid == std::process::id() {
        return true;
    }
    let proc_root = Path::new("/proc");
    if proc_root.join("self").exists() {
        proc_root.join(pid.to_string()).exists()
    } else {
        true
    }
}

/// Remove temporary files `<prefix><pid>-<n><suffix>` that an interrupted earlier run left in `dir`: only those
/// of processes that no longer run (another process's or thread's file in flight is left alone), or, where
/// processes cannot be checked, those older than a day. Best effort: failures are ignored.
pub(crate) fn remove_stale_temps(dir: &Path, prefix: &str, suffix: &str) {
    remove_stale_temps_any(dir, &[prefix.to_string()], suffix)
}

/// [`remove_stale_temps`] for several prefixes in one scan of the folder.
fn remove_stale_temps_any(dir: &Path, prefixes: &[String], suffix: &str) {
    let dir = if dir.as_os_str().is_empty() { Path::new(".") } else { dir };
    let Ok(entries) = fs::read_dir(dir) else { return };
    for e in entries.flatten() {
        let name = e.file_name();
        let name = name.to_string_lossy();
        let Some(prefix) = prefixes.iter().find(|p| name.len() > p.len() + suffix.len() && name.starts_with(p.as_str()) && name.ends_with(suffix)) else { continue };
        let middle = &name[prefix.len()..name.len() - suffix.len()];
        let Some(pid) = middle.split('-').next().and_then(|p| p.parse::<u32>().ok()) else { continue };
        let old = e.metadata().ok().and_then(|m| m.modified().ok()).and_then(|t| t.elapsed().ok()).is_some_and(|a| a.as_secs() > 86_400);
        let is_file = e.file_type().is_ok_and(|t| t.is_file());
        if is_file && (!process_may_run(pid) || (old && pid != std::process::id())) {
            let _ = fs::remove_file(e.path());
        }
    }
}

/// Text for one `#` metadata line: line breaks and tabs become spaces, other control characters (ESC, CR
/// inside names) are written escaped (`\u{1b}`), so no name can start a line or drive a terminal.
pub fn metadata_text(text: &str) -> String {
    let mut s = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '\n' | '\r' | '\t' => s.push(' '),
            c if c.is_control() => s.extend(c.escape_default()),
            c => s.push(c),
        }
    }
    s
}

/// Format a float for CSV: shortest round-trip representation; refuses NaN/infinity. Plain decimals (Rust's
/// `{}`) for 1e-4 ≤ |v| < 1e7 and zero, scientific notation (Rust's `{:e}`) otherwise; the same text as those
/// formats, built from the digits of [`zmij`] where no tie between two shortest candidates is possible (a unit
/// test compares both on millions of values).
#[inline]
pub fn fmt_f64(v: f64) -> Option<String> {
    let mut s = String::new();
    write_f64(v, &mut s).then_some(s)
}

/// [`fmt_f64`] appended to `s` (no allocation of its own); false (and nothing appended) for NaN or infinity.
pub fn write_f64(v: f64, s: &mut String) -> bool {
    use std::fmt::Write;
    if !v.is_finite() {
        return false;
    }
    let a = v.abs();
    if a == 0.0 {
        s.push_str(if v.is_sign_negative() { "-0" } else { "0" });
        return true;
    }
    let mut buffer = zmij::Buffer::new();
    let mut store = [0u8; 32];
    let (len, point) = decimal_digits(buffer.format_finite(a), &mut store);
    // Two shortest candidates can be equally near only when the exact binary value has at most 18 significant
    // decimal digits (m·2^q with m odd has point − q of them); std then rounds the tie up, zmij to even. Those
    // values (short decimals, small integers) take the std formats.
    let bits = a.to_bits();
    let (mantissa, exponent) = match (bits >> 52) as i32 {
        0 => (bits & ((1 << 52) - 1), -1074),
        e => ((bits & ((1 << 52) - 1)) | (1 << 52), e - 1075),
    };
    if point - (exponent + mantissa.trailing_zeros() as i32) <= 19 {
        // writing into a String cannot fail
        let _ = if (1e-4..1e7).contains(&a) { write!(s, "{v}") } else { write!(s, "{v:e}") };
        return true;
    }
    // the digits are ASCII
    let digits = std::str::from_utf8(&store[..len]).unwrap_or("0");
    s.reserve(len + 8);
    if v < 0.0 {
        s.push('-');
    }
    let n = len as i32;
    if (1e-4..1e7).contains(&a) {
        // plain: `point` digits before the decimal point (none or negative: leading zeros after "0.")
        if point <= 0 {
            s.push_str("0.");
            s.extend(std::iter::repeat_n('0', (-point) as usize));
            s.push_str(digits);
        } else if point >= n {
            s.push_str(digits);
            s.extend(std::iter::repeat_n('0', (point - n) as usize));
        } else {
            s.push_str(&digits[..point as usize]);
            s.push('.');
            s.push_str(&digits[point as usize..]);
        }
    } else {
        s.push_str(&digits[..1]);
        if n > 1 {
            s.push('.');
            s.push_str(&digits[1..]);
        }
        let _ = write!(s, "e{}", point - 1);
    }
    true
}

/// The significant digits (no leading or trailing zeros) of a positive decimal written as `ddd.ddd` or
/// `d.ddde±x`, copied into `out`, with their count and the position of the decimal point after the first of them
/// (value = 0.d₁d₂… × 10^point).
fn decimal_digits(text: &str, out: &mut [u8; 32]) -> (usize, i32) {
    let bytes = text.as_bytes();
    // `mantissa` e `exponent`; the mantissa `int.frac`
    let (mantissa, exponent) = match bytes.iter().position(|&b| b == b'e' || b == b'E') {
        Some(i) => {
            let (negative, digits) = match bytes.get(i + 1) {
                Some(b'-') => (true, &bytes[i + 2..]),
                Some(b'+') => (false, &bytes[i + 2..]),
                _ => (false, &bytes[i + 1..]),
            };
            let e = digits.iter().fold(0i32, |e, d| e * 10 + i32::from(d.wrapping_sub(b'0')));
            (&bytes[..i], if negative { -e } else { e })
        }
        None => (bytes, 0),
    };
    let (int, frac) = match mantissa.iter().position(|&b| b == b'.') {
        Some(i) => (&mantissa[..i], &mantissa[i + 1..]),
        None => (mantissa, &mantissa[mantissa.len()..]),
    };
    // leading zeros of the digits int ++ frac: before the point they are not counted, after it each moves the
    // point left
    let lead_int = int.iter().take_while(|&&b| b == b'0').count();
    let lead_frac = if lead_int == int.len() { frac.iter().take_while(|&&b| b == b'0').count() } else { 0 };
    let point = (int.len() - lead_int) as i32 - lead_frac as i32 + exponent;
    let (int, frac) = (&int[lead_int..], &frac[lead_frac..]);
    let mut len = int.len().min(out.len());
    out[..len].copy_from_slice(&int[..len]);
    let more = frac.len().min(out.len() - len);
    out[len..len + more].copy_from_slice(&frac[..more]);
    len += more;
    while len > 1 && out[len - 1] == b'0' {
        len -= 1;
    }
    if len == 0 {
        out[0] = b'0';
        return (1, 1);
    }
    (len, point)
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
        let row = self.format_row(cells, path_for_errors)?;
        self.rows.push(row);
        Ok(())
    }

    /// The text of a whole row, its cells as [`CsvTable::format_row`] gives them joined by commas, in one string
    /// (no string per cell); kept as a row of this one cell, [`CsvTable::render`] writes the same text as the row
    /// of separate cells would give.
    pub fn format_row_text(&self, cells: Vec<Cell>, path_for_errors: &str) -> Result<String, OutputError> {
        let mut row = String::with_capacity(24 * cells.len());
        for (i, c) in cells.into_iter().enumerate() {
            if i > 0 {
                row.push(',');
            }
            let ok = match c {
                Cell::Num(v) | Cell::Opt(Some(v)) => write_f64(v, &mut row),
                Cell::Opt(None) => true,
                Cell::Text(t) => {
                    if t.contains([',', '"', '\n']) {
                        row.push('"');
                        row.push_str(&t.replace('"', "\"\""));
                        row.push('"');
                    } else {
                        row.push_str(&t);
                    }
                    true
                }
            };
            if !ok {
                return Err(OutputError::NonFinite { path: path_for_errors.into(), column: self.header.get(i).cloned().unwrap_or_default() });
            }
        }
        Ok(row)
    }

    /// The text of a row as [`CsvTable::push`] appends it (for rows formatted on several threads and appended
    /// in order); a non-finite number is an error naming the column.
    pub fn format_row(&self, cells: Vec<Cell>, path_for_errors: &str) -> Result<Vec<String>, OutputError> {
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
        Ok(row)
    }

    /// Render as text.
    pub fn render(&self) -> String {
        let mut s = String::new();
        for m in &self.metadata {
            s.push_str("# ");
            s.push_str(&metadata_text(m));
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

    /// Write atomically to `path` ([`Durability::Atomic`]).
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

#[cfg(test)]
mod tests {
    use super::fmt_f64;

    /// The formatting `fmt_f64` stands for: Rust's `{}` and `{:e}` (shortest round-trip digits).
    fn reference(v: f64) -> Option<String> {
        if !v.is_finite() {
            return None;
        }
        let a = v.abs();
        Some(if a == 0.0 || (1e-4..1e7).contains(&a) { format!("{v}") } else { format!("{v:e}") })
    }

    #[test]
    fn csv_numbers_match_the_std_formats() {
        let mut state: u64 = 0x2545_f491_4f6c_dd1d;
        let mut next = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state
        };
        let mut values = vec![0.0, -0.0, 1.0, -1.0, 0.1, 0.2, 0.3, 1e-4, 1e7, 9_999_999.999_999_998, 1e-5, 123.456, 1e21, 1e22, 1e23, 5e-324, f64::from_bits(0xc316_4c2a_3b9f_596d), f64::MIN_POSITIVE, f64::MAX, f64::MIN, f64::EPSILON, 300.0, 2.5e-3];
        for edge in [1e-4f64, 1e7, 1.0, 10.0, 1e-3, 1e6] {
            values.extend([f64::from_bits(edge.to_bits() - 1), f64::from_bits(edge.to_bits() + 1)]);
        }
        for _ in 0..1_000_000 {
            // any bit pattern (every exponent) and values of the sizes the tables hold
            values.push(f64::from_bits(next()));
            let m = (next() >> 11) as f64 / (1u64 << 53) as f64;
            let e = (next() % 40) as i32 - 20;
            values.push(m * 10f64.powi(e) * if next() & 1 == 0 { 1.0 } else { -1.0 });
            // short decimals, as read from input files
            values.push(((next() % 1_000_000) as f64) / 10f64.powi((next() % 12) as i32));
            // large values with few fraction bits, where two shortest candidates can tie (std rounds ties up)
            values.push((next() >> 11) as f64 * 2f64.powi((next() % 16) as i32 - 8));
        }
        for v in values {
            assert_eq!(fmt_f64(v), reference(v), "{:?} (bits {:#x})", v, v.to_bits());
        }
        assert_eq!(fmt_f64(f64::NAN), None);
        assert_eq!(fmt_f64(f64::INFINITY), None);
    }

    /// A row formatted as one string is the row of separate cells joined by commas, and refuses what it refuses.
    #[test]
    fn row_text_is_the_joined_cells() {
        use super::{Cell, CsvTable};
        let t = CsvTable::new(vec!["a".into(), "b".into(), "c".into(), "d".into(), "e".into(), "f".into()]);
        let cells = || vec![Cell::Num(3.0), Cell::Text("x, \"y\"".into()), Cell::Opt(None), Cell::Opt(Some(-1.25e-9)), Cell::Num(0.1 + 0.2), Cell::Text("plain".into())];
        assert_eq!(t.format_row_text(cells(), "p").unwrap(), t.format_row(cells(), "p").unwrap().join(","));
        assert_eq!(t.format_row_text(vec![], "p").unwrap(), "");
        let bad = t.format_row_text(vec![Cell::Num(1.0), Cell::Opt(Some(f64::NAN))], "p").unwrap_err().to_string();
        assert_eq!(bad, t.format_row(vec![Cell::Num(1.0), Cell::Opt(Some(f64::NAN))], "p").unwrap_err().to_string());
    }
}
