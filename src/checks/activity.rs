//! Activity coefficients by original UNIFAC (`--activity unifac`) against the outside world:
//! (a) the UNIFAC implementation of the `thermo` package (validation/thermo/unifac_gammas.csv, written by
//! validation/unifac_reference.py) for seven binaries and one ternary. thermo uses the same published parameter
//! set (the DDBST original-UNIFAC matrix: Hansen et al. 1991, Wittig et al. 2003) that our tables transcribe, so
//! this checks the equations and the group bookkeeping of the component files, not the parameters.
//! (b) Published vapour–liquid equilibrium data are not asserted here: see docs/property-methods.md ("Activity
//! coefficients") for the state of that comparison.

use std::sync::Arc;

use crate::data::{Component, Library};
use crate::props::activity::{Activity, ActivityModel};

use super::CheckResult;

/// Report group of these checks.
pub const GROUP_ACTIVITY: &str = "liquid activity coefficients (UNIFAC)";
/// Tolerance of the comparison with thermo's UNIFAC (the 2 %).
pub const TOL_THERMO_GAMMA: f64 = 0.02;

const THERMO_GAMMAS: &str = include_str!("../../validation/thermo/unifac_gammas.csv");

/// Library and version named in the reference file header.
fn thermo_library() -> String {
    THERMO_GAMMAS
        .lines()
        .find_map(|l| l.strip_prefix("# library: "))
        .map(|l| l.split(',').next().unwrap_or(l).to_string())
        .unwrap_or_else(|| "thermo".into())
}

/// (a) γ_i of every row of validation/thermo/unifac_gammas.csv, one check per system and temperature (the
/// largest relative error over its compositions and components).
pub fn thermo_checks(lib: &Library) -> Vec<CheckResult> {
    let source = format!("{} UNIFAC (version 0, original; same published parameter set), validation/thermo/unifac_gammas.csv", thermo_library());
    let mut groups: Vec<(String, f64, f64, usize)> = vec![]; // (system, T, max error, rows)
    let mut reader = csv::ReaderBuilder::new().has_headers(true).comment(Some(b'#')).flexible(true).from_reader(THERMO_GAMMAS.as_bytes());
    for record in reader.records() {
        let Ok(f) = record else { continue };
        if f.len() != 4 {
            continue;
        }
        let ids: Vec<&str> = f[0].split('+').collect();
        let t: f64 = f[1].parse().unwrap_or(f64::NAN);
        let x: Vec<f64> = f[2].split(';').map(|v| v.parse().unwrap_or(f64::NAN)).collect();
        let reference: Vec<f64> = f[3].split(';').map(|v| v.parse().unwrap_or(f64::NAN)).collect();
        let comps: Option<Vec<Arc<Component>>> = ids.iter().map(|id| lib.component(id).cloned()).collect();
        let error = match comps.map(|c| Activity::new(ActivityModel::Unifac, &c)) {
            Some(Ok(mut act)) => {
                let g = act.gammas(&x, t);
                g.iter().zip(&reference).map(|(a, b)| if a.is_finite() && *b > 0.0 { (a / b - 1.0).abs() } else { f64::INFINITY }).fold(0.0, f64::max)
            }
            _ => f64::INFINITY,
        };
        let key = f[0].replace('+', " + ");
        match groups.iter_mut().find(|g| g.0 == key && g.1 == t) {
            Some(g) => {
                g.2 = g.2.max(error);
                g.3 += 1;
            }
            None => groups.push((key, t, error, 1)),
        }
    }
    groups
        .into_iter()
        .map(|(system, t, error, rows)| {
            CheckResult::relative(GROUP_ACTIVITY, format!("γ_i of {system} at {t:.0} K, {rows} compositions"), &source, error, TOL_THERMO_GAMMA)
        })
        .collect()
}

/// Every activity-coefficient check, in report order.
pub fn all(lib: &Library) -> Vec<CheckResult> {
    thermo_checks(lib)
}
