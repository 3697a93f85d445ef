//! Interrupted runs leave no truncated file behind. `simulate` and `table` write every file through a
//! temporary file in the same folder that is renamed into place (`<name>.tmp-<pid>`, charts
//! `.<stem>.tmp-<pid>.png`), so a run killed at any moment leaves only complete files (from this or an earlier
//! run) and possibly temporary files; the next run that writes the same file removes those leftovers.
//! (tests/sweep.rs kills and resumes sweeps.)
//!
//! Each test runs the command once to the end, then kills it with SIGKILL at ten points spread over that run
//! time, checks every file in the output folder after each kill, then lets one run finish and checks that no
//! temporary file is left.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::Duration;

mod common;
use common::BIN;

fn temp_dir(tag: &str) -> PathBuf {
    common::scratch("interrupted", tag)
}

fn files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(rd) = std::fs::read_dir(dir) else { return };
    for e in rd {
        let p = e.unwrap().path();
        if p.is_dir() {
            files(&p, out);
        } else {
            out.push(p);
        }
    }
}

fn is_temp(p: &Path) -> bool {
    p.file_name().is_some_and(|n| n.to_string_lossy().contains(".tmp-"))
}

/// Why `p` is not a complete file of its kind, if it is not.
fn incomplete(p: &Path) -> Option<String> {
    let bytes = std::fs::read(p).ok()?;
    let ext = p.extension().map(|e| e.to_string_lossy().into_owned()).unwrap_or_default();
    let text = || String::from_utf8_lossy(&bytes).into_owned();
    match ext.as_str() {
        "csv" => {
            if !bytes.ends_with(b"\n") {
                return Some("does not end with a newline".into());
            }
            let mut r = csv::ReaderBuilder::new().comment(Some(b'#')).flexible(false).from_reader(bytes.as_slice());
            let mut rows = 0;
            for rec in r.records() {
                if let Err(e) = rec {
                    return Some(format!("bad CSV row: {e}"));
                }
                rows += 1;
            }
            (rows == 0).then(|| "no data rows".into())
        }
        "json" => serde_json::from_slice::<serde_json::Value>(&bytes).err().map(|e| format!("not JSON: {e}")),
        "html" => (!text().trim_end().ends_with("</html>")).then(|| "no closing </html>".into()),
        "svg" => (!text().trim_end().ends_with("</svg>")).then(|| "no closing </svg>".into()),
        "png" => (!bytes.ends_with(&[0x49, 0x45, 0x4e, 0x44, 0xae, 0x42, 0x60, 0x82])).then(|| "no IEND chunk".into()),
        _ => (!bytes.is_empty() && !bytes.ends_with(b"\n")).then(|| "does not end with a newline".into()),
    }
}

/// Kill `args` after each delay; check the folder after every kill, then after one finished run.
fn kill_and_check(tag: &str, args: &[&str]) {
    let dir = temp_dir(tag);
    let out = dir.join("out");
    // One finished run first: its length sets the kill times (5 %, 15 %, ..., 95 % of it), so kills land in the
    // computation and in the writing on a fast or a slow machine; its files are the 'earlier run' ones.
    let start = std::time::Instant::now();
    let o = Command::new(BIN).args(args).arg(&out).output().unwrap();
    assert!(o.status.success(), "{tag}: {}", String::from_utf8_lossy(&o.stderr));
    let full_ms = start.elapsed().as_secs_f64() * 1e3;
    let delays_ms: Vec<u64> = (0..10).map(|k| ((k as f64 + 0.5) / 10.0 * full_ms) as u64).collect();
    let mut killed = 0;
    let mut temps_seen = 0;
    let mut complete_seen = 0;
    for &d in &delays_ms {
        let mut child = Command::new(BIN).args(args).arg(&out).stdout(Stdio::null()).stderr(Stdio::null()).spawn().unwrap();
        std::thread::sleep(Duration::from_millis(d));
        if child.try_wait().unwrap().is_none() {
            let _ = child.kill();
            killed += 1;
        }
        let _ = child.wait();
        let mut all = vec![];
        files(&out, &mut all);
        for p in &all {
            if is_temp(p) {
                temps_seen += 1;
            } else if let Some(why) = incomplete(p) {
                panic!("{tag}: killed after {d} ms: {} {why}", p.display());
            } else {
                complete_seen += 1;
            }
        }
    }
    let o = Command::new(BIN).args(args).arg(&out).output().unwrap();
    assert!(o.status.success(), "{tag}: {}", String::from_utf8_lossy(&o.stderr));
    let mut all = vec![];
    files(&out, &mut all);
    assert!(!all.is_empty());
    for p in &all {
        assert!(!is_temp(p), "{tag}: the finished run left the temporary file {}", p.display());
        if let Some(why) = incomplete(p) {
            panic!("{tag}: after the finished run: {} {why}", p.display());
        }
    }
    eprintln!("{tag}: {killed} of {} runs killed mid-way; after the kills {temps_seen} temporary and {complete_seen} complete files were checked", delays_ms.len());
    let _ = std::fs::remove_dir_all(dir);
}

#[test]
fn killed_simulate_leaves_no_truncated_file() {
    // A 0.1 µm droplet in cold thin gas: thousands of history rows (megabytes) and charts, so kills land in the
    // middle of writing as well as in the computation.
    kill_and_check("simulate", &["simulate", "demo-narrow", "--diameter", "0.1um", "--ambient-temperature", "150K", "--pressure", "1kPa", "--max-time", "5ms", "--out"]);
}

#[test]
fn killed_table_leaves_no_truncated_file() {
    kill_and_check("table", &["table", "demo-wide", "--no-date", "--residue", "0,0.3,0.6", "--out"]);
}
