//! Merge shard outputs into one summary identical, byte for byte, to a single-machine run of the same spec.
//!
//! Shard K of N holds the cases K, K + N, K + 2N, …, so the merged file takes one row from each shard in turn.
//! Every shard must be finished (its `summary.csv` exists), come from the same spec (identical header lines but
//! for the `# shard:` line), and all N shards must be present exactly once. Memory stays flat: rows are streamed.

use std::fs::{self, File};
use std::io::{BufRead, BufReader, BufWriter, Write};
use std::path::{Path, PathBuf};

use super::shard::Shard;
use super::summary;
use super::{SweepError, CASES_DIR, JOURNAL_FILE, SUMMARY_FILE};

/// What a merge did.
#[derive(Debug, Clone)]
pub struct MergeReport {
    /// Number of shards merged.
    pub shards: u64,
    /// Rows in the merged summary.
    pub cases: u64,
    /// Rows with a `failed: ...` status.
    pub failed: u64,
    /// The merged summary file.
    pub summary: PathBuf,
    /// Per-case history folders copied into the output.
    pub histories_copied: u64,
}

struct ShardFile {
    dir: PathBuf,
    path: PathBuf,
    shard: Shard,
    common: Vec<String>,
    reader: BufReader<File>,
}

fn mismatch(path: &Path, message: impl Into<String>) -> SweepError {
    SweepError::Mismatch { path: path.display().to_string(), message: message.into() }
}

fn open_shard(dir: &Path) -> Result<ShardFile, SweepError> {
    let path = if dir.is_file() { dir.to_path_buf() } else { dir.join(SUMMARY_FILE) };
    if !path.is_file() {
        if dir.join(JOURNAL_FILE).is_file() {
            return Err(mismatch(dir, "this shard is not finished (only summary.csv.partial): rerun it with --resume, then merge"));
        }
        return Err(mismatch(dir, "no summary.csv here (expected the --out folder of a sweep shard)"));
    }
    let f = File::open(&path).map_err(|e| SweepError::io(&path, e))?;
    let mut reader = BufReader::new(f);
    let mut common = vec![];
    let mut shard = Shard::WHOLE;
    loop {
        let mut line = String::new();
        let k = reader.read_line(&mut line).map_err(|e| SweepError::io(&path, e))?;
        if k == 0 || !line.ends_with('\n') {
            return Err(mismatch(&path, "ends inside its header lines (not a dropcut sweep summary?)"));
        }
        if let Some(parsed) = summary::parse_shard_line(&line) {
            shard = parsed.map_err(|e| mismatch(&path, format!("bad shard line: {e}")))?;
            continue;
        }
        let is_header = !line.starts_with('#');
        common.push(line);
        if is_header {
            break;
        }
    }
    if !common.first().is_some_and(|l| l.starts_with("# dropcut")) {
        return Err(mismatch(&path, "is not a dropcut sweep summary (no '# dropcut ...' first line)"));
    }
    let dir = if dir.is_file() { dir.parent().unwrap_or(Path::new(".")).to_path_buf() } else { dir.to_path_buf() };
    Ok(ShardFile { dir, path, shard, common, reader })
}

fn same_dir(a: &Path, b: &Path) -> bool {
    match (fs::canonicalize(a), fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    }
}

fn copy_histories(from: &Path, to: &Path) -> Result<u64, SweepError> {
    let src = from.join(CASES_DIR);
    let Ok(entries) = fs::read_dir(&src) else { return Ok(0) };
    let mut n = 0;
    for e in entries {
        let e = e.map_err(|e| SweepError::io(&src, e))?;
        if !e.path().is_dir() {
            continue;
        }
        let dest = to.join(CASES_DIR).join(e.file_name());
        fs::create_dir_all(&dest).map_err(|err| SweepError::io(&dest, err))?;
        for f in fs::read_dir(e.path()).map_err(|err| SweepError::io(&e.path(), err))? {
            let f = f.map_err(|err| SweepError::io(&e.path(), err))?;
            let name = f.file_name();
            if f.path().is_file() && !name.to_string_lossy().contains(".tmp-") {
                fs::copy(f.path(), dest.join(&name)).map_err(|err| SweepError::io(&dest.join(&name), err))?;
            }
        }
        n += 1;
    }
    Ok(n)
}

/// The header lines of an existing summary (metadata and column names), or None when it cannot be read as one.
fn head_lines(path: &Path) -> Option<Vec<String>> {
    let mut reader = BufReader::new(File::open(path).ok()?);
    let mut lines = vec![];
    loop {
        let mut line = String::new();
        if reader.read_line(&mut line).ok()? == 0 || !line.ends_with('\n') {
            return None;
        }
        let is_header = !line.starts_with('#');
        lines.push(line);
        if is_header || lines.len() > 64 {
            return Some(lines);
        }
    }
}

/// The sweep's rules for an output folder, applied to the merge's `out`: not one of the shards, no sweep or
/// merge running or unfinished there, and an existing summary.csv only when it is this sweep's merged result.
fn check_out(out: &Path, files: &[ShardFile]) -> Result<(), SweepError> {
    for f in files {
        if same_dir(&f.dir, out) {
            return Err(mismatch(out, format!("is one of the shard folders ({}); merge into another folder", f.dir.display())));
        }
    }
    let summary = out.join(SUMMARY_FILE);
    if let Some(why) = crate::output::refuse_file_target(&summary) {
        return Err(mismatch(&summary, why));
    }
    if summary.exists() {
        let Some(lines) = head_lines(&summary) else {
            return Err(mismatch(&summary, "exists and is not a dropcut sweep summary; merge into another folder"));
        };
        if lines.iter().any(|l| summary::parse_shard_line(l).is_some()) {
            return Err(mismatch(out, "holds a shard (its summary.csv has a '# shard:' line); merge into another folder"));
        }
        if lines != files[0].common {
            return Err(mismatch(&summary, "holds the summary of another sweep (other spec, dropcut version or columns); merge into another folder"));
        }
    }
    Ok(())
}

/// Merge the finished shard folders `inputs` (in any order) into `out/summary.csv`, copying any per-case
/// histories into `out/cases/`.
///
/// Every row is checked ([`summary::check_row`]): its case id, finite results, a known status, and with `spec`
/// (whose fingerprint must be the shards') the inputs its case id stands for; a damaged row stops the merge,
/// naming the shard and the case. When a shard holds histories (`cases/`), every finished case of every shard
/// must have its folder. The merged rows go to `summary.csv.partial` (locked, like a running sweep) and are
/// renamed to `summary.csv` last, after the histories are copied: a killed merge never looks finished.
pub fn merge(inputs: &[PathBuf], out: &Path, spec: Option<&super::SweepSpec>) -> Result<MergeReport, SweepError> {
    if inputs.is_empty() {
        return Err(mismatch(out, "nothing to merge: name the shard folders"));
    }
    let mut files = inputs.iter().map(|d| open_shard(d)).collect::<Result<Vec<_>, _>>()?;
    let count = files[0].shard.count;
    for f in &files[1..] {
        if f.common != files[0].common {
            return Err(mismatch(&f.path, format!("belongs to another sweep than {} (their header lines differ)", files[0].path.display())));
        }
        if f.shard.count != count {
            return Err(mismatch(&f.path, format!("is shard {} but {} is shard {}: all shards must split the sweep the same way", f.shard, files[0].path.display(), files[0].shard)));
        }
    }
    files.sort_by_key(|f| f.shard.index);
    for w in files.windows(2) {
        if w[0].shard.index == w[1].shard.index {
            return Err(mismatch(&w[1].path, format!("shard {} is given twice (also {})", w[1].shard, w[0].path.display())));
        }
    }
    if files.len() as u64 != count {
        let have: Vec<u64> = files.iter().map(|f| f.shard.index).collect();
        let missing: Vec<String> = (0..count).filter(|k| !have.contains(k)).take(10).map(|k| format!("{k}/{count}")).collect();
        return Err(mismatch(&files[0].dir, format!("shard(s) {} missing: merge needs all {count} shards", missing.join(", "))));
    }
    let total = files[0]
        .common
        .iter()
        .find_map(|l| summary::parse_cases_line(l))
        .ok_or_else(|| mismatch(&files[0].path, "has no '# cases:' line (not a dropcut sweep summary?)"))?;
    let header_line = files[0].common.last().cloned().unwrap_or_default();
    let header: Vec<String> = header_line.trim_end().split(',').map(str::to_string).collect();
    let n_fields = summary::field_count(header_line.trim_end());
    if let Some(spec) = spec {
        let line = format!("# spec fingerprint: {}\n", spec.fingerprint());
        if !files[0].common.contains(&line) {
            return Err(mismatch(&files[0].path, "was not written for the spec given with --spec (its spec fingerprint differs)"));
        }
        if spec.case_count() != total {
            return Err(mismatch(&files[0].path, format!("holds {total} cases but the spec has {}", spec.case_count())));
        }
    }
    let with_histories = files.iter().any(|f| f.dir.join(CASES_DIR).is_dir());

    crate::output::ensure_dir(out)?;
    check_out(out, &files)?;
    let final_path = out.join(SUMMARY_FILE);
    let journal = out.join(JOURNAL_FILE);
    if let Some(why) = crate::output::refuse_file_target(&journal) {
        return Err(mismatch(&journal, why));
    }
    let mut file = match fs::OpenOptions::new().read(true).write(true).create_new(true).open(&journal) {
        Ok(f) => f,
        Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {
            // An earlier merge or sweep left its journal: take it over only if nobody holds it and it is ours.
            let f = fs::OpenOptions::new().read(true).write(true).open(&journal).map_err(|e| SweepError::io(&journal, e))?;
            if let Err(std::fs::TryLockError::WouldBlock) = f.try_lock() {
                return Err(mismatch(out, format!("a dropcut sweep or merge is writing {} right now; wait for it or choose another --out", journal.display())));
            }
            match head_lines(&journal) {
                Some(lines) if lines == files[0].common => f,
                _ => {
                    return Err(mismatch(
                        out,
                        "holds an unfinished sweep (summary.csv.partial) of another spec or shard; finish it with dropcut sweep --resume, or merge into another folder",
                    ))
                }
            }
        }
        Err(e) => return Err(SweepError::io(&journal, e)),
    };
    let _ = file.try_lock();
    let result = (|| -> Result<(u64, u64), SweepError> {
        let io = |e: std::io::Error| SweepError::io(&journal, e);
        file.set_len(0).map_err(io)?;
        let mut w = BufWriter::new(&mut file);
        for l in &files[0].common {
            w.write_all(l.as_bytes()).map_err(io)?;
        }
        let mut fmt = spec.map(|_| summary::RowFormatter::new(header.clone()));
        let mut failed = 0;
        let mut line = Vec::new();
        for id in 0..total {
            let f = &mut files[(id % count) as usize];
            line.clear();
            let k = f.reader.read_until(b'\n', &mut line).map_err(|e| SweepError::io(&f.path, e))?;
            let damaged = |why: String| mismatch(&f.path, format!("the row of case {id} {why}: rerun this shard (delete its summary.csv first)"));
            if k == 0 || line.last() != Some(&b'\n') {
                return Err(damaged("is missing or cut short".into()));
            }
            let text = std::str::from_utf8(&line[..k - 1]).map_err(|_| damaged("is not UTF-8 text".into()))?;
            let prefix = match (spec, fmt.as_mut()) {
                (Some(spec), Some(fmt)) => spec.case(id).map(|case| fmt.input_prefix(spec, &case)),
                _ => None,
            };
            summary::check_row(text, id, n_fields, prefix.as_deref()).map_err(damaged)?;
            let is_failed = summary::is_failed_row(text);
            if is_failed {
                failed += 1;
            } else if with_histories && !f.dir.join(CASES_DIR).join(id.to_string()).join("history.csv").is_file() {
                return Err(mismatch(&f.dir, format!("holds no history for case {id} (cases/{id}/history.csv) while the sweep wrote histories: rerun this shard with --resume --histories")));
            }
            w.write_all(&line).map_err(io)?;
        }
        for f in &mut files {
            line.clear();
            if f.reader.read_until(b'\n', &mut line).map_err(|e| SweepError::io(&f.path, e))? != 0 {
                return Err(mismatch(&f.path, format!("has rows beyond the {total} cases of the sweep")));
            }
        }
        w.flush().map_err(io)?;
        drop(w);
        file.sync_all().map_err(io)?;
        let mut copied = 0;
        for f in &files {
            copied += copy_histories(&f.dir, out)?;
        }
        Ok((failed, copied))
    })();
    let (failed, histories_copied) = match result {
        Ok(n) => n,
        Err(e) => {
            let _ = fs::remove_file(&journal);
            return Err(e);
        }
    };
    // summary.csv appears last, complete, when everything else is in place
    fs::rename(&journal, &final_path).map_err(|e| SweepError::io(&final_path, e))?;
    crate::output::sync_dir(out);
    Ok(MergeReport { shards: count, cases: total, failed, summary: final_path, histories_copied })
}
