//! No NaN or infinity is ever written: every CSV and JSON file that `dropcut demo` and a sweep over the extreme
//! corners of the valid input range write is scanned. A cell (CSV) or a token (JSON, `#` metadata lines) must
//! not be `NaN`, `nan`, `inf`, `-inf`, `+inf`, `Infinity` or `-Infinity` in any letter case, and every JSON
//! file must parse. Words that merely contain those letters ("Sirignano", "information") are fine, so the scan
//! splits on separators rather than searching substrings.

use std::path::{Path, PathBuf};
use std::process::Command;

mod common;
use common::BIN;

/// The extreme corners: 0.1 µm and 10 mm droplets (zipped with a max-time that keeps the run short),
/// 150 K and 4000 K gas, 1 kPa and 300 bar, 0 and 1000 m/s, well-mixed and resolved liquid, two fuels.
const EXTREME_SPEC: &str = r#"
name = "extreme corners"
fuels = ["demo-narrow", "n-decane"]
zipped = [["diameter", "max-time"]]
[conditions]
diameter = ["0.1um", "10mm"]
max-time = ["20us", "5ms"]
ambient-temperature = ["150K", "4000K"]
pressure = ["1kPa", "300bar"]
velocity = [0, 1000]
liquid-mixing = ["well-mixed", "diffusion"]
[output]
histories = true
"#;

fn temp_dir(tag: &str) -> PathBuf {
    common::scratch("no-nan", tag)
}

fn files(dir: &Path, out: &mut Vec<PathBuf>) {
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.is_dir() {
            files(&p, out);
        } else {
            out.push(p);
        }
    }
}

/// True when `token` spells a non-finite number.
fn non_finite(token: &str) -> bool {
    let t = token.trim_matches(|c: char| c == '+' || c == '-').to_ascii_lowercase();
    matches!(t.as_str(), "nan" | "inf" | "infinity")
}

/// Problems found in one file (empty when clean).
fn scan(path: &Path) -> Vec<String> {
    let text = match std::fs::read_to_string(path) {
        Ok(t) => t,
        Err(e) => return vec![format!("{}: {e}", path.display())],
    };
    let mut problems = vec![];
    let is_json = path.extension().is_some_and(|e| e == "json");
    if is_json {
        if let Err(e) = serde_json::from_str::<serde_json::Value>(&text) {
            problems.push(format!("{}: not valid JSON: {e}", path.display()));
        }
    }
    for (n, line) in text.lines().enumerate() {
        let separators = |c: char| c.is_whitespace() || ",;:=\"'()[]{}".contains(c);
        if let Some(tok) = line.split(separators).find(|t| non_finite(t)) {
            problems.push(format!("{}:{}: '{tok}' in {:?}", path.display(), n + 1, line.chars().take(160).collect::<String>()));
        }
    }
    problems
}

fn scan_tree(dir: &Path) -> (usize, Vec<String>) {
    let mut all = vec![];
    files(dir, &mut all);
    let data: Vec<&PathBuf> = all.iter().filter(|p| p.extension().is_some_and(|e| e == "csv" || e == "json")).collect();
    (data.len(), data.iter().flat_map(|p| scan(p)).collect())
}

#[test]
fn scanner_finds_what_it_must() {
    let dir = temp_dir("self");
    let p = dir.join("t.csv");
    std::fs::write(&p, "# Abramzon-Sirignano information\na,b\n1,NaN\n2,-inf\n").unwrap();
    assert_eq!(scan(&p).len(), 2);
    let j = dir.join("t.json");
    std::fs::write(&j, "{\"a\": Infinity}").unwrap();
    assert_eq!(scan(&j).len(), 2, "{:?}", scan(&j)); // invalid JSON and the token
    let _ = std::fs::remove_dir_all(dir);
}

#[test]
fn demo_writes_no_nan_or_infinity() {
    let dir = temp_dir("demo");
    let o = Command::new(BIN).args(["demo", "--out"]).arg(dir.join("demo")).output().unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let (n, problems) = scan_tree(&dir);
    assert!(n >= 15, "only {n} CSV/JSON files from the demo");
    assert!(problems.is_empty(), "{}", problems.join("\n"));
    let _ = std::fs::remove_dir_all(dir);
}

#[test]
fn extreme_sweep_writes_no_nan_or_infinity() {
    let dir = temp_dir("sweep");
    std::fs::write(dir.join("spec.toml"), EXTREME_SPEC).unwrap();
    let o = Command::new(BIN).args(["sweep", "spec.toml", "--out", "runs"]).current_dir(&dir).output().unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let summary = std::fs::read_to_string(dir.join("runs/summary.csv")).unwrap();
    let rows: Vec<&str> = summary.lines().filter(|l| !l.starts_with('#')).skip(1).collect();
    assert_eq!(rows.len(), 64);
    // Failed cases (the subcritical model past the pseudo-critical pressure) are rows with a reason, not gaps.
    for r in rows.iter().filter(|r| r.contains("failed:")) {
        assert!(r.contains("pseudo-critical") || r.contains("critical temperature"), "a failure without its reason: {r}");
    }
    let (n, problems) = scan_tree(&dir.join("runs"));
    assert!(n > 64, "only {n} CSV/JSON files");
    assert!(problems.is_empty(), "{}", problems.join("\n"));
    let _ = std::fs::remove_dir_all(dir);
}
