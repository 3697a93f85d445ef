//! `--history-times` end to end through the binary: history rows at exactly the requested times (plus the first
//! row and the end-of-life row), values that agree with a run at a much finer integration tolerance (the
//! reference is the same model integrated more accurately, so the check bounds the error of the rows at the
//! requested times, not a physical validation), for the well-mixed liquid (Dormand–Prince continuous extension)
//! and the resolved liquid (steps landing on the times), and through `compare`.

mod common;
use common::{ok, p, scratch};
use std::path::Path;

/// The history.csv of a run folder: header names and rows of numbers (the regime column as NaN-free 0/1).
fn history(dir: &Path) -> (Vec<String>, Vec<Vec<f64>>) {
    let text = std::fs::read_to_string(dir.join("history.csv")).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<String> = lines.next().unwrap().split(',').map(String::from).collect();
    let rows = lines.map(|l| l.split(',').map(|v| v.parse::<f64>().unwrap_or(if v == "boiling" { 1.0 } else { 0.0 })).collect()).collect();
    (header, rows)
}

fn column(header: &[String], name: &str) -> usize {
    header.iter().position(|h| h == name).unwrap_or_else(|| panic!("no column {name}"))
}

fn lifetime(dir: &Path) -> f64 {
    let v: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(dir.join("summary.json")).unwrap()).unwrap();
    v["lifetime_s"].as_f64().unwrap()
}

/// Rows: 0, then START + k·STEP exactly (the decimal values), then the end-of-life row.
fn assert_rows_at_grid(dir: &Path, step: f64) -> usize {
    let (h, rows) = history(dir);
    let t = column(&h, "time_s");
    let life = lifetime(dir);
    assert_eq!(rows[0][t], 0.0);
    let n = rows.len();
    for (k, r) in rows.iter().enumerate().take(n - 1) {
        let expected: f64 = format!("{:.11e}", k as f64 * step).parse().unwrap();
        assert_eq!(r[t], expected, "row {k}");
        assert!(r[t] < life);
    }
    // the end-of-life row: at the lifetime (well-mixed: located on the continuous extension) or at the end of
    // the step that crossed it (resolved: the lifetime is interpolated inside that step)
    assert!(rows[n - 1][t] >= life && rows[n - 1][t] - rows[n - 2][t] <= step, "the last row is the end of life");
    assert!(life - rows[n - 2][t] <= step, "no requested time before the end of life is missing");
    n
}

/// Largest differences of (d/d0)², surface temperature and evaporated fraction between two histories at the
/// same requested times (the end-of-life rows left out: they sit at each run's own lifetime).
fn differences(a: &Path, b: &Path) -> (f64, f64, f64) {
    let ((ha, ra), (hb, rb)) = (history(a), history(b));
    assert_eq!(ha, hb);
    let n = ra.len().min(rb.len()) - 1;
    let (t, d2, ts, ev) = (column(&ha, "time_s"), column(&ha, "d2_ratio"), column(&ha, "surface_temperature_K"), column(&ha, "evaporated_fraction"));
    let mut worst = (0.0f64, 0.0f64, 0.0f64);
    for k in 0..n {
        assert_eq!(ra[k][t], rb[k][t]);
        worst.0 = worst.0.max((ra[k][d2] - rb[k][d2]).abs());
        worst.1 = worst.1.max((ra[k][ts] - rb[k][ts]).abs());
        worst.2 = worst.2.max((ra[k][ev] - rb[k][ev]).abs());
    }
    worst
}

/// Well-mixed demo-wide at 800 K, 30 µm (defaults), rows every 0.25 ms: at exactly those times, and within
/// 1e-5 in (d/d0)² and evaporated fraction and 0.02 K in surface temperature of a run at rtol 1e-10 (measured:
/// 5e-7, 1e-7 and 1.6 mK at the default rtol 1e-6).
#[test]
fn well_mixed_rows_at_a_time_grid_match_a_finer_run() {
    let dir = scratch("history_times", "well_mixed");
    let run = |name: &str, rtol: &str| {
        let out = dir.join(name);
        ok(&["simulate", "demo-wide", "--no-plots", "--out", p(&out), "--rtol", rtol, "--history-times", "0:0.25ms:100ms"]);
        out
    };
    let (coarse, fine) = (run("coarse", "1e-6"), run("fine", "1e-10"));
    let n = assert_rows_at_grid(&coarse, 0.25e-3);
    assert!(n > 50, "{n} rows");
    assert_rows_at_grid(&fine, 0.25e-3);
    let (d2, ts, ev) = differences(&coarse, &fine);
    eprintln!("well-mixed: |Δ(d/d0)²| ≤ {d2:.2e}, |ΔT_s| ≤ {ts:.2e} K, |Δ evaporated| ≤ {ev:.2e}");
    assert!(d2 < 1e-5 && ev < 1e-5 && ts < 0.02, "{d2:.3e} {ts:.3e} K {ev:.3e}");
    // a list of times, with units
    let list = dir.join("list");
    ok(&["simulate", "demo-wide", "--no-plots", "--out", p(&list), "--history-times", "1ms,2.5ms,7000us,0.012s"]);
    let (h, rows) = history(&list);
    let times: Vec<f64> = rows.iter().map(|r| r[column(&h, "time_s")]).collect();
    assert_eq!(times, vec![0.0, 1e-3, 2.5e-3, 7e-3, 0.012, lifetime(&list)]);
    // the same summary as without the option (the stepping is not disturbed)
    let plain = dir.join("plain");
    ok(&["simulate", "demo-wide", "--no-plots", "--out", p(&plain)]);
    assert_eq!(lifetime(&plain), lifetime(&coarse));
}

/// Resolved liquid (diffusion and conduction, 20 cells), rows every 0.5 ms from steps landing on them: at exactly
/// those times, within 2e-3 in (d/d0)² and 1 K of a run at rtol 1e-9 (measured 5.6e-4 and 0.26 K at the
/// default rtol: the step-doubling scheme's own error); landing changes the lifetime by less than 1e-4
/// relative against the run without the option (measured 2.4e-5, against 4.5e-4 between rtol 1e-6 and 1e-9).
#[test]
fn resolved_rows_land_on_the_requested_times() {
    let dir = scratch("history_times", "resolved");
    let run = |name: &str, rtol: &str, times: Option<&str>| {
        let out = dir.join(name);
        let mut args = vec!["simulate", "demo-wide", "--liquid-mixing", "diffusion", "--liquid-heat", "conduction", "--nodes", "20", "--no-plots", "--out", p(&out), "--rtol", rtol];
        if let Some(t) = times {
            args.extend(["--history-times", t]);
        }
        ok(&args);
        out
    };
    let coarse = run("coarse", "1e-6", Some("0:0.5ms:100ms"));
    let fine = run("fine", "1e-9", Some("0:0.5ms:100ms"));
    let plain = run("plain", "1e-6", None);
    assert_rows_at_grid(&coarse, 0.5e-3);
    assert_rows_at_grid(&fine, 0.5e-3);
    let (d2, ts, _) = differences(&coarse, &fine);
    let landing = (lifetime(&coarse) / lifetime(&plain) - 1.0).abs();
    eprintln!("resolved: |Δ(d/d0)²| ≤ {d2:.2e}, |ΔT_s| ≤ {ts:.2e} K; lifetime change by landing {landing:.2e}");
    assert!(d2 < 2e-3 && ts < 1.0, "{d2:.3e} {ts:.3e} K");
    assert!(landing < 1e-4, "{landing:.3e}");
}

/// A boiling droplet keeps its regime-change row between the requested rows; `compare` writes each run's rows
/// at the requested times.
#[test]
fn regime_rows_stay_and_compare_takes_the_option() {
    let dir = scratch("history_times", "boiling");
    let out = dir.join("run");
    ok(&["simulate", "n-decane", "--ambient-temperature", "300K", "--radiation", "4000K", "--diameter", "50um", "--no-plots", "--out", p(&out), "--history-times", "0:20us:2ms"]);
    let (h, rows) = history(&out);
    let (t, regime) = (column(&h, "time_s"), column(&h, "regime"));
    let off_grid: Vec<&Vec<f64>> = rows.iter().filter(|r| (r[t] / 20e-6 - (r[t] / 20e-6).round()).abs() > 1e-6).collect();
    assert_eq!(off_grid.len(), 2, "the boiling onset and the end of life");
    assert_eq!(off_grid[0][regime], 1.0, "the onset row is in the boiling regime");
    assert!(rows.windows(2).all(|w| w[1][t] > w[0][t]));
    let before = rows.iter().filter(|r| r[t] < off_grid[0][t]).all(|r| r[regime] == 0.0);
    let after = rows.iter().filter(|r| r[t] > off_grid[0][t]).all(|r| r[regime] == 1.0);
    assert!(before && after, "rows before the onset evaporate, rows after it boil");

    let cmp = dir.join("compare");
    ok(&["compare", "demo-narrow", "demo-wide", "--no-plots", "--out", p(&cmp), "--history-times", "0:1ms:100ms"]);
    for fuel in ["demo-narrow", "demo-wide"] {
        assert_rows_at_grid(&cmp.join(fuel), 1e-3);
    }
}

/// The `#` metadata line of a history.csv that says how its rows were taken.
fn rows_note(dir: &Path) -> String {
    let text = std::fs::read_to_string(dir.join("history.csv")).unwrap();
    let notes: Vec<&str> = text.lines().filter(|l| l.starts_with("# rows: ")).collect();
    assert_eq!(notes.len(), 1, "{text:.600}");
    notes[0].to_string()
}

/// history.csv says whether its rows are at requested times (and which) or at integrator steps.
#[test]
fn history_metadata_says_how_rows_were_taken() {
    let dir = scratch("history_times", "metadata");
    let steps = dir.join("steps");
    ok(&["simulate", "test-heptane-decane", "--diameter", "10um", "--no-plots", "--out", p(&steps)]);
    assert_eq!(rows_note(&steps), "# rows: one per accepted integrator step (adaptive; not evenly spaced in time)");
    let listed = dir.join("listed");
    ok(&["simulate", "test-heptane-decane", "--diameter", "10um", "--no-plots", "--out", p(&listed), "--history-times", "0.1ms,0.2ms,0.5ms"]);
    let note = rows_note(&listed);
    assert!(note.starts_with("# rows: at requested times (dense output of the integrator) plus the first row"), "{note}");
    assert!(note.contains("requested t = 0.0001, 0.0002, 0.0005 s"), "{note}");
    let grid = dir.join("grid");
    ok(&["simulate", "test-heptane-decane", "--diameter", "10um", "--no-plots", "--out", p(&grid), "--history-times", "0:0.01ms:2ms", "--liquid-mixing", "diffusion"]);
    let note = rows_note(&grid);
    assert!(note.contains("(steps landed exactly on each time)") && note.contains("requested 201 times from t = 0 s to 0.002 s every 1e-5 s"), "{note}");
    // `plot` reads the file back with its new line
    ok(&["plot", p(&grid)]);
}

/// `[output] history-times` in a sweep spec: the case histories have rows at those times (and say so), the
/// times enter the spec's fingerprint (a resume with other times is refused), and the summary rows are the same
/// with and without `--histories`.
#[test]
fn sweep_specs_take_history_times() {
    let dir = scratch("history_times", "sweep");
    let spec = |times: &str| format!("fuels = [\"test-heptane-decane\"]\n[conditions]\ndiameter = [\"10um\", \"12um\"]\n[output]\nhistory-times = {times}\n");
    std::fs::write(dir.join("grid.toml"), spec("\"0:0.05ms:5ms\"")).unwrap();
    std::fs::write(dir.join("list.toml"), spec("[\"0.1ms\", 0.0002, \"300us\"]")).unwrap();
    std::fs::write(dir.join("plain.toml"), "fuels = [\"test-heptane-decane\"]\n[conditions]\ndiameter = [\"10um\", \"12um\"]\n").unwrap();
    let with = dir.join("with");
    ok(&["sweep", p(&dir.join("grid.toml")), "--out", p(&with), "--histories"]);
    for case in ["0", "1"] {
        let case_dir = with.join("cases").join(case);
        assert_rows_at_grid(&case_dir, 0.05e-3);
        assert!(rows_note(&case_dir).contains("101 times from t = 0 s to 0.005 s every 5e-5 s"), "{}", rows_note(&case_dir));
    }
    let without = dir.join("without");
    ok(&["sweep", p(&dir.join("grid.toml")), "--out", p(&without)]);
    let summary = |d: &Path| std::fs::read_to_string(d.join("summary.csv")).unwrap();
    assert_eq!(summary(&with), summary(&without), "histories on or off, the same summary");
    let list = dir.join("list");
    ok(&["sweep", p(&dir.join("list.toml")), "--out", p(&list), "--histories"]);
    let (h, rows) = history(&list.join("cases").join("0"));
    let times: Vec<f64> = rows.iter().map(|r| r[column(&h, "time_s")]).collect();
    assert_eq!(&times[..4], &[0.0, 1e-4, 2e-4, 3e-4]);
    // another set of times is another spec: a resume is refused, naming the spec change
    for other in ["list.toml", "plain.toml"] {
        let out = common::run(&["sweep", p(&dir.join(other)), "--out", p(&with), "--resume", "--histories"]);
        assert_eq!(out.status.code(), Some(2), "{other}");
        assert!(String::from_utf8_lossy(&out.stderr).contains("another spec"), "{}", String::from_utf8_lossy(&out.stderr));
    }
}
