//! Validation checks against the outside world (reference libraries, handbooks, analytical solutions,
//! published experiments). The same definitions drive the tests in `tests/validation_*.rs` and the report
//! written by `dropcut validate` into docs/validation.md, so the two cannot drift apart.

use serde::Serialize;

pub mod activity;
pub mod droplet;
pub mod estimation;
pub mod fuelbuild;
pub mod model;
pub mod properties;
pub mod residue;
pub mod tables;

/// Outcome of one validation check.
#[derive(Debug, Clone, Serialize)]
pub struct CheckResult {
    /// Group, e.g. "pure-component properties".
    pub group: String,
    /// What was checked, e.g. "n-decane vapour pressure, 387–556 K (61 points)".
    pub check: String,
    /// Where the reference value comes from (library + version, handbook, paper, "analytical").
    pub source: String,
    /// Tolerance as stated, e.g. "2 % relative".
    pub tolerance: String,
    /// Achieved error in the same terms, e.g. "0.41 % (max)".
    pub achieved: String,
    /// Whether the check passed.
    pub passed: bool,
}

impl CheckResult {
    /// A relative-error check: `max_rel_error` against `tolerance_rel` (both fractions).
    pub fn relative(group: &str, check: String, source: &str, max_rel_error: f64, tolerance_rel: f64) -> Self {
        CheckResult {
            group: group.into(),
            check,
            source: source.into(),
            tolerance: format!("{:.3} % relative", 100.0 * tolerance_rel),
            achieved: format!("{} % (max)", compact(100.0 * max_rel_error)),
            passed: max_rel_error.is_finite() && max_rel_error <= tolerance_rel,
        }
    }

    /// An absolute-error check with a unit, e.g. K.
    pub fn absolute(group: &str, check: String, source: &str, abs_error: f64, tolerance: f64, unit: &str) -> Self {
        CheckResult {
            group: group.into(),
            check,
            source: source.into(),
            tolerance: format!("{tolerance} {unit}"),
            achieved: format!("{} {unit}", compact(abs_error)),
            passed: abs_error.is_finite() && abs_error <= tolerance,
        }
    }
}

/// Three significant digits, in exponent form below 1e-3.
pub fn compact(v: f64) -> String {
    if !v.is_finite() {
        return "not computed".into();
    }
    if v != 0.0 && v.abs() < 1e-3 {
        format!("{v:.2e}")
    } else {
        format!("{v:.4}")
    }
}

/// One line per result on stdout, `pass`/`FAIL | check | tolerance | achieved | source` (shown by
/// `cargo test -- --nocapture`).
pub fn print_results(results: &[CheckResult]) {
    for r in results {
        println!("{} | {} | {} | {} | {}", if r.passed { "pass" } else { "FAIL" }, r.check, r.tolerance, r.achieved, r.source);
    }
}

/// Panic with a readable table of the failed checks (for tests).
pub fn assert_all_passed(results: &[CheckResult]) {
    assert!(!results.is_empty(), "no checks ran");
    let failed: Vec<_> = results.iter().filter(|r| !r.passed).collect();
    if !failed.is_empty() {
        let lines: Vec<String> = failed.iter().map(|r| format!("- {} | {} | tol {} | got {}", r.check, r.source, r.tolerance, r.achieved)).collect();
        panic!("{} of {} checks failed:\n{}", failed.len(), results.len(), lines.join("\n"));
    }
}

/// Render results as a Markdown table.
pub fn markdown_table(results: &[CheckResult]) -> String {
    let mut s = String::from("| group | check | source | tolerance | achieved | result |\n|---|---|---|---|---|---|\n");
    for r in results {
        s.push_str(&format!(
            "| {} | {} | {} | {} | {} | {} |\n",
            r.group,
            r.check.replace('|', "/"),
            r.source.replace('|', "/"),
            r.tolerance,
            r.achieved,
            if r.passed { "pass" } else { "FAIL" }
        ));
    }
    s
}

/// Every validation check of the project, in report order.
pub fn all() -> Vec<CheckResult> {
    let mut v = vec![];
    if let Ok(lib) = crate::data::Library::embedded() {
        v.extend(properties::all());
        v.extend(activity::all(&lib));
        v.extend(residue::all(&lib));
        v.extend(estimation::joback_viscosity_checks(&lib));
        v.extend(model::analytic_checks(&lib));
        v.extend(droplet::experiment_checks());
        v.extend(fuelbuild::all(&lib));
        v.extend(tables::all(&lib));
    }
    v
}
