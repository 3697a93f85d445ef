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
    /// Reported only, not asserted: its reference rests on values from memory or second-hand readings, so its
    /// outcome is printed (result column "reported") and left out of the pass count.
    pub reported: bool,
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
            reported: false,
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
            reported: false,
        }
    }
}

impl CheckResult {
    /// A check that could not be carried out (a step failed: broken input, a run that stopped, no root):
    /// recorded as failed, with the reason in place of the achieved error.
    pub fn failed(group: &str, check: String, source: &str, reason: String) -> Self {
        CheckResult { group: group.into(), check, source: source.into(), tolerance: "–".into(), achieved: format!("not computed: {reason}"), passed: false, reported: false }
    }
}

/// A check's result, or [`CheckResult::failed`] with the reason when a step of it failed.
pub fn or_failed(group: &str, check: &str, source: &str, result: Result<CheckResult, String>) -> CheckResult {
    result.unwrap_or_else(|reason| CheckResult::failed(group, check.into(), source, reason))
}

/// Checks' results, or one [`CheckResult::failed`] with the reason when a step they share failed.
pub fn or_failed_all(group: &str, check: &str, source: &str, result: Result<Vec<CheckResult>, String>) -> Vec<CheckResult> {
    result.unwrap_or_else(|reason| vec![CheckResult::failed(group, check.into(), source, reason)])
}

/// Turns a failed step of a check into a reason ("what: error"), for `?` inside checks (no panics).
pub trait Reason<T> {
    /// The value, or the reason naming the step `what`.
    fn or_reason(self, what: &str) -> Result<T, String>;
}

impl<T, E: std::fmt::Display> Reason<T> for Result<T, E> {
    fn or_reason(self, what: &str) -> Result<T, String> {
        self.map_err(|e| format!("{what}: {e}"))
    }
}

impl<T> Reason<T> for Option<T> {
    fn or_reason(self, what: &str) -> Result<T, String> {
        self.ok_or_else(|| format!("{what}: not available"))
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
            match (r.reported, r.passed) {
                (true, true) => "reported (within)",
                (true, false) => "reported (outside)",
                (false, true) => "pass",
                (false, false) => "FAIL",
            }
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

#[cfg(test)]
mod tests {
    use super::*;

    /// A check whose input is broken (here: a library without its fuel files and gases, so the demo fuel and
    /// air cannot be resolved) is recorded as a failed check with the reason, not a panic of `validate`.
    #[test]
    fn a_check_with_broken_input_is_recorded_as_failed_not_a_panic() {
        let mut lib = crate::data::Library::embedded().unwrap();
        lib.fuels.clear();
        lib.gases.clear();
        let mut results = vec![model::mass_conservation(&lib), model::convergence(&lib)];
        results.extend(model::resolved_limit_checks(&lib));
        results.extend(residue::weathering_drift(&lib));
        assert_eq!(results.len(), 4);
        for r in &results {
            assert!(!r.passed, "{r:?}");
            assert!(r.achieved.starts_with("not computed: demo-wide"), "{r:?}");
        }
        let table = markdown_table(&results);
        assert!(table.contains("FAIL") && !table.contains("pass |"));
    }

    #[test]
    fn reasons_name_the_failed_step() {
        let r: Result<f64, String> = Err("no root".into());
        assert_eq!(r.or_reason("wet-bulb").unwrap_err(), "wet-bulb: no root");
        assert_eq!(None::<f64>.or_reason("profile").unwrap_err(), "profile: not available");
        let failed = or_failed("g", "c", "s", Err("x: y".into()));
        assert!(!failed.passed && failed.achieved == "not computed: x: y");
    }
}
