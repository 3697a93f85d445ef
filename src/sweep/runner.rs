//! The parallel runner: workers on a rayon pool take case positions in order from a shared counter, simulate,
//! and put their formatted rows into a shared reorder buffer; the calling thread takes the rows from it in
//! case-id order and appends them to the journal `summary.csv.partial` in whole lines. When every case of the
//! shard is in, the journal is synced and renamed to `summary.csv`, so `summary.csv` only ever exists complete.
//! The calling thread is woken when [`FLUSH_BYTES`] of rows are ready in order, when a case fails to run, at
//! the end, and otherwise every [`FLUSH_EVERY`] (not at every row: a wake-up per case would take a core from
//! the workers).
//!
//! Memory stays flat: cases are generated from their id, and a worker may not start a case more than
//! [`WINDOW`] positions ahead of the first row not yet in the buffer in order, which bounds the reorder buffer.
//!
//! Resume: the journal's header lines must equal this run's (same spec fingerprint, shard and version); its rows
//! are read back while each is whole (ends in a newline), has the right number of fields and carries the next
//! expected case id; the file is cut after the last such row and the run continues from there. A run killed at
//! any moment therefore loses at most the rows it had not yet written, never leaves a truncated or duplicated row
//! behind in the result.

use std::collections::BTreeMap;
use std::fs::{self, File, OpenOptions};
use std::io::{BufRead, BufReader, Read, Seek, SeekFrom, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::{Condvar, Mutex};
use std::time::{Duration, Instant};

use crate::model::{self, droplet::NoHistory};

use super::shard::Shard;
use super::spec::SweepSpec;
use super::summary::{self, ExtraColumns, RowFormatter};
use super::{SweepError, CASES_DIR, JOURNAL_FILE, SUMMARY_FILE};

/// Largest distance (in cases) a worker may run ahead of the first row not yet in the buffer in order.
pub const WINDOW: u64 = 4096;
/// The journal is written at least this often while rows are waiting \[ms\].
pub const FLUSH_EVERY: Duration = Duration::from_millis(250);
/// Bytes of rows ready in order that wake the writing thread for a write.
pub const FLUSH_BYTES: usize = 64 * 1024;
/// The journal is synced to disk at least this often.
const SYNC_EVERY: Duration = Duration::from_secs(2);

/// How to run a sweep.
#[derive(Default)]
pub struct RunOptions {
    /// Worker threads; 0 uses every core.
    pub threads: usize,
    /// Which part of the sweep to run.
    pub shard: Shard,
    /// Write each case's history.csv and summary.json into `cases/<case_id>/`.
    pub histories: bool,
    /// Continue the sweep found in the output folder instead of refusing to touch it.
    pub resume: bool,
    /// Extra summary columns (after the built-in results, before `status`).
    pub extra_columns: Vec<Box<dyn ExtraColumns>>,
}

/// Receives progress from the thread that writes rows.
pub trait Progress {
    /// Called once before the first case: cases in this shard, and how many were already done (resume).
    fn start(&mut self, _total: u64, _already_done: u64) {}
    /// Called when rows were written, and at least every quarter second while running: rows done so far.
    fn update(&mut self, _done: u64) {}
    /// Called once when every row is written.
    fn finish(&mut self, _done: u64) {}
}

/// A progress receiver that does nothing.
#[derive(Debug, Default)]
pub struct NoProgress;

impl Progress for NoProgress {}

/// What a sweep run did.
#[derive(Debug, Clone)]
pub struct SweepReport {
    /// The shard that ran.
    pub shard: Shard,
    /// Cases in this shard.
    pub cases: u64,
    /// Cases found already done (resume).
    pub resumed: u64,
    /// Cases run now.
    pub ran: u64,
    /// Rows with a `failed: ...` status in the summary.
    pub failed: u64,
    /// The finished summary file.
    pub summary: PathBuf,
    /// The folder already held the finished summary of this sweep (nothing ran).
    pub already_complete: bool,
    /// Resume found a damaged row in the journal (case id, what is wrong): it and every later row were run again.
    pub damaged_row: Option<(u64, String)>,
}

/// The rows between the workers and the writing thread.
struct Buffer {
    /// Rows in, by case position (those before `received` wait to be written, in order; later ones wait for
    /// the rows before them).
    pending: BTreeMap<u64, String>,
    /// First case position whose row is not yet in: every row before it is in `pending` or written.
    received: u64,
    /// Bytes of the rows before `received` not yet taken by the writer.
    ready_bytes: usize,
    /// The first case that could not run (the run stops).
    error: Option<SweepError>,
    /// Every worker has returned.
    workers_done: bool,
    /// Workers waiting for the window to move.
    waiting: usize,
}

struct Gate {
    buffer: Mutex<Buffer>,
    /// Wakes workers waiting for the window.
    window: Condvar,
    /// Wakes the writing thread.
    writer: Condvar,
    stop: AtomicBool,
    next: AtomicU64,
}

impl Gate {
    fn lock(&self) -> std::sync::MutexGuard<'_, Buffer> {
        self.buffer.lock().unwrap_or_else(|e| e.into_inner())
    }

    fn halt(&self) {
        let _guard = self.lock();
        self.stop.store(true, Ordering::SeqCst);
        self.window.notify_all();
        self.writer.notify_all();
    }

    /// Put the row of case position `p` in; wake the writer when enough is ready in order, on an error, and
    /// when the last row is in.
    fn put(&self, p: u64, row: Result<String, SweepError>, total: u64) {
        let mut b = self.lock();
        let wake = match row {
            Ok(line) => {
                b.pending.insert(p, line);
                let before = b.received;
                while let Some(line) = b.pending.get(&b.received) {
                    b.ready_bytes += line.len();
                    b.received += 1;
                }
                if b.received != before && b.waiting > 0 {
                    self.window.notify_all();
                }
                b.ready_bytes >= FLUSH_BYTES || b.received == total
            }
            Err(e) => {
                if b.error.is_none() {
                    b.error = Some(e);
                }
                true
            }
        };
        if wake {
            self.writer.notify_one();
        }
    }
}

/// Run a sweep (or one shard of it) into `out`; see the module documentation for the files and guarantees.
pub fn run(spec: &SweepSpec, out: &Path, opts: &RunOptions, progress: &mut dyn Progress) -> Result<SweepReport, SweepError> {
    let header = summary::header(&opts.extra_columns);
    let head = summary::head_text(spec, opts.shard, &header);
    let total = opts.shard.len_of(spec.case_count());
    fs::create_dir_all(out).map_err(|e| SweepError::io(out, e))?;
    let final_path = out.join(SUMMARY_FILE);
    let journal = out.join(JOURNAL_FILE);
    let mut report = SweepReport { shard: opts.shard, cases: total, resumed: 0, ran: 0, failed: 0, summary: final_path.clone(), already_complete: false, damaged_row: None };

    if final_path.exists() {
        if !opts.resume {
            return Err(SweepError::Mismatch {
                path: out.display().to_string(),
                message: "already holds a finished sweep (summary.csv); choose another --out, or pass --resume to check it and run nothing".into(),
            });
        }
        let scan = scan_rows(&final_path, &head, spec, opts.shard, &header, total)?;
        if !scan.head_ok || scan.rows != total || scan.valid_end != scan.file_len {
            return Err(SweepError::Mismatch {
                path: final_path.display().to_string(),
                message: if scan.head_ok {
                    let why = match &scan.damaged {
                        Some((id, reason)) => format!("the row of case {id} {reason}"),
                        None => "it ends early or has rows beyond the sweep".to_string(),
                    };
                    format!("holds {} valid rows of {total} (damaged or edited: {why}); delete it to rerun", scan.rows)
                } else {
                    "was written for another spec, shard or dropcut version (its header lines differ); choose another --out".into()
                },
            });
        }
        report.resumed = total;
        report.failed = scan.failed;
        report.already_complete = true;
        return Ok(report);
    }

    let (mut file, done, failed_before) = if journal.exists() {
        if !opts.resume {
            return Err(SweepError::Mismatch {
                path: out.display().to_string(),
                message: "holds an unfinished sweep (summary.csv.partial); pass --resume to continue it, or choose another --out".into(),
            });
        }
        let f = OpenOptions::new().read(true).write(true).open(&journal).map_err(|e| SweepError::io(&journal, e))?;
        lock_journal(&f, &journal, out)?;
        let (f, done, failed, damaged) = recover_journal(f, &journal, &head, spec, opts.shard, &header, total)?;
        report.damaged_row = damaged;
        (f, done, failed)
    } else {
        let mut f = OpenOptions::new().write(true).create_new(true).open(&journal).map_err(|e| SweepError::io(&journal, e))?;
        lock_journal(&f, &journal, out)?;
        f.write_all(head.as_bytes()).and_then(|_| f.sync_data()).map_err(|e| SweepError::io(&journal, e))?;
        (f, 0, 0)
    };
    report.resumed = done;
    progress.start(total, done);

    let buffer = Buffer { pending: BTreeMap::new(), received: done, ready_bytes: 0, error: None, workers_done: false, waiting: 0 };
    let gate = Gate { buffer: Mutex::new(buffer), window: Condvar::new(), writer: Condvar::new(), stop: AtomicBool::new(false), next: AtomicU64::new(done) };
    let pool = rayon::ThreadPoolBuilder::new().num_threads(opts.threads).build().map_err(|e| SweepError::Internal(format!("thread pool: {e}")))?;
    let histories = opts.histories || spec.histories;

    let written = std::thread::scope(|scope| {
        let gate_ref = &gate;
        let header_ref = &header;
        let driver = scope.spawn(move || {
            pool.broadcast(|_| worker(spec, out, histories, &opts.extra_columns, opts.shard, total, header_ref, gate_ref));
            let mut b = gate_ref.lock();
            b.workers_done = true;
            gate_ref.writer.notify_all();
        });
        let result = write_rows(&mut file, &journal, done, total, &gate, progress);
        if result.is_err() {
            gate.halt();
        }
        match driver.join() {
            Ok(()) => result,
            Err(_) => Err(SweepError::Internal("a worker thread stopped unexpectedly".into())),
        }
    })?;
    report.ran = total - done;
    report.failed = failed_before + written;

    file.sync_all().map_err(|e| SweepError::io(&journal, e))?;
    drop(file);
    fs::rename(&journal, &final_path).map_err(|e| SweepError::io(&final_path, e))?;
    if let Ok(dir) = File::open(out) {
        let _ = dir.sync_all();
    }
    progress.finish(total);
    Ok(report)
}

#[allow(clippy::too_many_arguments)]
fn worker(spec: &SweepSpec, out: &Path, histories: bool, extra: &[Box<dyn ExtraColumns>], shard: Shard, total: u64, header: &[String], gate: &Gate) {
    let mut fmt = RowFormatter::new(header.to_vec());
    loop {
        if gate.stop.load(Ordering::SeqCst) {
            return;
        }
        let p = gate.next.fetch_add(1, Ordering::SeqCst);
        if p >= total {
            return;
        }
        {
            let mut b = gate.lock();
            while p >= b.received + WINDOW && !gate.stop.load(Ordering::SeqCst) {
                b.waiting += 1;
                b = gate.window.wait_timeout(b, Duration::from_millis(100)).unwrap_or_else(|e| e.into_inner()).0;
                b.waiting -= 1;
            }
        }
        if gate.stop.load(Ordering::SeqCst) {
            return;
        }
        let row = run_case(spec, shard.case_id(p), out, histories, extra, &mut fmt);
        gate.put(p, row, total);
    }
}

fn run_case(spec: &SweepSpec, id: u64, out: &Path, histories: bool, extra: &[Box<dyn ExtraColumns>], fmt: &mut RowFormatter) -> Result<String, SweepError> {
    let case = spec.case(id).ok_or_else(|| SweepError::Internal(format!("case {id} is outside the sweep")))?;
    let inputs = spec.inputs(&case)?;
    let case_dir = out.join(CASES_DIR).join(id.to_string());
    if histories {
        match fs::remove_dir_all(&case_dir) {
            Ok(()) => {}
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => {}
            Err(e) => return Err(SweepError::io(&case_dir, e)),
        }
    }
    let result = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
        // every case, its history written or not, runs with the requested times: the resolved liquid lands its
        // steps on them, so a summary row is the same with and without --histories
        if !spec.history_times.is_empty() && histories {
            model::simulate(&inputs, &mut model::guard::RowsAt { times: spec.history_times.clone() })
        } else if !spec.history_times.is_empty() {
            model::simulate(&inputs, &mut model::guard::TimesWithoutRows { times: spec.history_times.clone() })
        } else if histories {
            model::simulate(&inputs, &mut model::guard::RowsOnly)
        } else {
            model::simulate(&inputs, &mut NoHistory)
        }
    }));
    match result {
        Ok(Ok(run)) => {
            if histories {
                crate::output::history::write_run(&case_dir, &inputs, &run, crate::output::Durability::Synced)?;
            }
            Ok(fmt.finished(spec, &case, &inputs, &run.outcome, extra))
        }
        Ok(Err(e)) => Ok(fmt.failed(spec, &case, &e.to_string())),
        Err(_) => Ok(fmt.failed(spec, &case, "internal error in the model (a bug: please report this case)")),
    }
}

/// Take the rows from the buffer in case-id order and append them to the journal; returns the number of failed
/// rows written.
fn write_rows(file: &mut File, path: &Path, done: u64, total: u64, gate: &Gate, progress: &mut dyn Progress) -> Result<u64, SweepError> {
    let mut next = done;
    let mut failed = 0;
    let mut buf = String::new();
    let mut last_sync = Instant::now();
    let io = |e: std::io::Error| SweepError::io(path, e);
    loop {
        let (error, finished) = {
            let mut b = gate.lock();
            let deadline = Instant::now() + FLUSH_EVERY;
            while b.ready_bytes < FLUSH_BYTES && b.received < total && b.error.is_none() && !b.workers_done && !gate.stop.load(Ordering::SeqCst) {
                let left = deadline.saturating_duration_since(Instant::now());
                if left.is_zero() {
                    break;
                }
                b = gate.writer.wait_timeout(b, left).unwrap_or_else(|e| e.into_inner()).0;
            }
            while next < b.received {
                let Some(line) = b.pending.remove(&next) else { break };
                if summary::is_failed_row(&line) {
                    failed += 1;
                }
                buf.push_str(&line);
                next += 1;
            }
            b.ready_bytes = 0;
            (b.error.take(), b.workers_done)
        };
        if !buf.is_empty() {
            // Whole lines in one write: a kill can cut at most the last line, which resume removes.
            file.write_all(buf.as_bytes()).map_err(io)?;
            buf.clear();
        }
        if let Some(e) = error {
            return Err(e);
        }
        if last_sync.elapsed() >= SYNC_EVERY {
            file.sync_data().map_err(io)?;
            last_sync = Instant::now();
        }
        progress.update(next);
        if finished || next == total || gate.stop.load(Ordering::SeqCst) {
            break;
        }
    }
    if next != total {
        return Err(SweepError::Internal(format!("{} of {total} cases came back from the workers", next)));
    }
    Ok(failed)
}

struct Scan {
    /// The first whole row that failed its check (case id, what is wrong).
    damaged: Option<(u64, String)>,
    head_ok: bool,
    head_is_prefix: bool,
    rows: u64,
    failed: u64,
    valid_end: u64,
    file_len: u64,
}

/// Read a journal or summary back: does it start with `head`, and how many valid rows follow in order.
///
/// Each row is checked against the spec ([`summary::check_row`]): the inputs its case id stands for, finite
/// results, a known status; the scan stops at the first row that fails and names it.
fn scan_rows(path: &Path, head: &str, spec: &SweepSpec, shard: Shard, header: &[String], total: u64) -> Result<Scan, SweepError> {
    let n_fields = header.len();
    let mut fmt = RowFormatter::new(header.to_vec());
    let f = File::open(path).map_err(|e| SweepError::io(path, e))?;
    let file_len = f.metadata().map_err(|e| SweepError::io(path, e))?.len();
    let mut reader = BufReader::new(f);
    let mut got = Vec::with_capacity(head.len());
    (&mut reader).take(head.len() as u64).read_to_end(&mut got).map_err(|e| SweepError::io(path, e))?;
    let mut scan = Scan { damaged: None, head_ok: got == head.as_bytes(), head_is_prefix: head.as_bytes().starts_with(&got), rows: 0, failed: 0, valid_end: 0, file_len };
    if !scan.head_ok {
        return Ok(scan);
    }
    scan.valid_end = head.len() as u64;
    let mut line = Vec::new();
    loop {
        line.clear();
        let k = reader.read_until(b'\n', &mut line).map_err(|e| SweepError::io(path, e))?;
        if k == 0 || line.last() != Some(&b'\n') {
            break;
        }
        let id = shard.case_id(scan.rows);
        let Ok(text) = std::str::from_utf8(&line[..k - 1]) else {
            scan.damaged = Some((id, "is not UTF-8 text".into()));
            break;
        };
        if scan.rows >= total {
            break;
        }
        let prefix = spec.case(id).map(|case| fmt.input_prefix(spec, &case));
        if let Err(reason) = summary::check_row(text, id, n_fields, prefix.as_deref()) {
            scan.damaged = Some((id, reason));
            break;
        }
        if summary::is_failed_row(text) {
            scan.failed += 1;
        }
        scan.rows += 1;
        scan.valid_end += k as u64;
    }
    Ok(scan)
}

/// Hold an advisory lock on the journal while the run writes it, so a second run on the same folder stops at
/// once instead of interleaving rows. The lock ends with the process, however it ends.
fn lock_journal(file: &File, journal: &Path, out: &Path) -> Result<(), SweepError> {
    match file.try_lock() {
        Ok(()) => Ok(()),
        Err(std::fs::TryLockError::WouldBlock) => Err(SweepError::Mismatch {
            path: out.display().to_string(),
            message: format!("another dropcut sweep is writing {} right now; wait for it or choose another --out", journal.display()),
        }),
        // File systems without locks: go on without one.
        Err(std::fs::TryLockError::Error(_)) => Ok(()),
    }
}

#[allow(clippy::type_complexity)]
fn recover_journal(mut f: File, path: &Path, head: &str, spec: &SweepSpec, shard: Shard, header: &[String], total: u64) -> Result<(File, u64, u64, Option<(u64, String)>), SweepError> {
    let scan = scan_rows(path, head, spec, shard, header, total)?;
    let io = |e: std::io::Error| SweepError::io(path, e);
    if !scan.head_ok {
        if scan.head_is_prefix {
            // Killed while writing the header lines: start over.
            f.set_len(0).map_err(io)?;
            f.write_all(head.as_bytes()).and_then(|_| f.sync_data()).map_err(io)?;
            return Ok((f, 0, 0, None));
        }
        return Err(SweepError::Mismatch {
            path: path.display().to_string(),
            message: "was written for another spec, shard or dropcut version (its header lines differ); choose another --out, or delete the folder to start over".into(),
        });
    }
    f.set_len(scan.valid_end).map_err(io)?;
    f.seek(SeekFrom::End(0)).map_err(io)?;
    f.sync_data().map_err(io)?;
    Ok((f, scan.rows, scan.failed, scan.damaged))
}
