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

/// Merge the finished shard folders `inputs` (in any order) into `out/summary.csv`, copying any per-case
/// histories into `out/cases/`.
pub fn merge(inputs: &[PathBuf], out: &Path) -> Result<MergeReport, SweepError> {
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
    let n_fields = files[0].common.last().map(|h| summary::field_count(h.trim_end())).unwrap_or(0);

    fs::create_dir_all(out).map_err(|e| SweepError::io(out, e))?;
    let final_path = out.join(SUMMARY_FILE);
    let tmp = out.join(format!("{SUMMARY_FILE}.merging-{}", std::process::id()));
    let result = (|| -> Result<u64, SweepError> {
        let io = |e: std::io::Error| SweepError::io(&tmp, e);
        let mut w = BufWriter::new(File::create(&tmp).map_err(io)?);
        for l in &files[0].common {
            w.write_all(l.as_bytes()).map_err(io)?;
        }
        let mut failed = 0;
        let mut line = String::new();
        for id in 0..total {
            let f = &mut files[(id % count) as usize];
            line.clear();
            let k = f.reader.read_line(&mut line).map_err(|e| SweepError::io(&f.path, e))?;
            let text = line.trim_end_matches('\n');
            if k == 0 || !line.ends_with('\n') || summary::row_case_id(text) != Some(id) || summary::field_count(text) != n_fields {
                return Err(mismatch(&f.path, format!("row for case {id} is missing or damaged: rerun this shard (delete its summary.csv first)")));
            }
            if summary::is_failed_row(text) {
                failed += 1;
            }
            w.write_all(line.as_bytes()).map_err(io)?;
        }
        for f in &mut files {
            line.clear();
            if f.reader.read_line(&mut line).map_err(|e| SweepError::io(&f.path, e))? != 0 {
                return Err(mismatch(&f.path, format!("has rows beyond the {total} cases of the sweep")));
            }
        }
        let file = w.into_inner().map_err(|e| SweepError::io(&tmp, e.error()))?;
        file.sync_all().map_err(io)?;
        Ok(failed)
    })();
    let failed = match result {
        Ok(n) => n,
        Err(e) => {
            let _ = fs::remove_file(&tmp);
            return Err(e);
        }
    };
    fs::rename(&tmp, &final_path).map_err(|e| SweepError::io(&final_path, e))?;
    let mut histories_copied = 0;
    for f in &files {
        if !same_dir(&f.dir, out) {
            histories_copied += copy_histories(&f.dir, out)?;
        }
    }
    Ok(MergeReport { shards: count, cases: total, failed, summary: final_path, histories_copied })
}
