//! Activity coefficients by original UNIFAC (`--activity unifac`) against the outside world:
//! (a) the UNIFAC implementation of the `thermo` package (validation/thermo/unifac_gammas.csv, written by
//! validation/unifac_reference.py) for seven binaries and one ternary. thermo uses the same published parameter
//! set (the DDBST original-UNIFAC matrix: Hansen et al. 1991, Wittig et al. 2003) that our tables transcribe, so
//! this checks the equations and the group bookkeeping of the component files, not the parameters.
//! (b) Bubble temperatures of twelve binaries at 101.325 kPa (validation/coolprop/binary_vle.csv, written by
//! validation/vle_reference.py): five hydrocarbon pairs against CoolProp's multi-fluid mixture model with the
//! binary interaction parameters of Bell & Lemmon (2016), fitted to experimental mixture data, and seven
//! ethanol–hydrocarbon pairs against NRTL with the parameters ChemSep's nrtl.ipd lists as DECHEMA 1-atm data
//! (the band between two listed data sets where there are two), with CoolProp's pure-fluid vapour pressures.
//! Both references are independent of our UNIFAC parameters and of our pure-component vapour pressures.
//! UNIFAC is asserted within 1.5 K; the ideal liquid (Raoult's law) is reported beside it, so the report shows
//! what the activity model changes. The measured points themselves (published VLE tables) could not be read
//! here: see docs/property-methods.md ("Activity coefficients").

use std::sync::Arc;

use crate::data::{Component, Library};
use crate::props::activity::{Activity, ActivityModel};

use super::CheckResult;

/// Report group of these checks.
pub const GROUP_ACTIVITY: &str = "liquid activity coefficients (UNIFAC)";
/// Tolerance of the comparison with thermo's UNIFAC (the 2 %).
pub const TOL_THERMO_GAMMA: f64 = 0.02;

const THERMO_GAMMAS: &str = include_str!("../../validation/thermo/unifac_gammas.csv");
const COOLPROP_VLE: &str = include_str!("../../validation/coolprop/binary_vle.csv");
/// Tolerance on bubble temperatures against the mixture reference (the 1.5 K).
pub const TOL_BUBBLE_K: f64 = 1.5;

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

/// One binary of validation/coolprop/binary_vle.csv: component ids, the reference tags, and per liquid
/// composition the pressure and the band [lowest, highest] of the references' bubble temperatures.
struct VleSystem {
    ids: (String, String),
    references: Vec<String>,
    rows: Vec<(f64, f64, f64, f64)>,
}

fn vle_systems() -> Vec<VleSystem> {
    let mut systems: Vec<VleSystem> = vec![];
    let mut reader = csv::ReaderBuilder::new().has_headers(true).comment(Some(b'#')).from_reader(COOLPROP_VLE.as_bytes());
    for record in reader.records() {
        let Ok(f) = record else { continue };
        let num = |i: usize| f.get(i).and_then(|v| v.parse::<f64>().ok()).unwrap_or(f64::NAN);
        let ids = (f.get(0).unwrap_or("").to_string(), f.get(1).unwrap_or("").to_string());
        let reference = f.get(6).unwrap_or("").to_string();
        let (x1, p, t) = (num(2), num(3), num(4));
        let i = match systems.iter().position(|s| s.ids == ids) {
            Some(i) => i,
            None => {
                systems.push(VleSystem { ids, references: vec![], rows: vec![] });
                systems.len() - 1
            }
        };
        let s = &mut systems[i];
        if !s.references.contains(&reference) {
            s.references.push(reference);
        }
        match s.rows.iter_mut().find(|r| r.0 == x1 && r.1 == p) {
            Some(r) => {
                r.2 = r.2.min(t);
                r.3 = r.3.max(t);
            }
            None => s.rows.push((x1, p, t, t)),
        }
    }
    systems
}

/// Largest distance of the bubble temperature with `model` from the references' band over a system's rows,
/// and where it occurs (x1).
fn bubble_deviation(comps: &[Arc<Component>], model: ActivityModel, rows: &[(f64, f64, f64, f64)]) -> Result<(f64, f64), String> {
    let mut activity = Activity::new(model, comps).map_err(|e| e.to_string())?;
    let mut worst = (-1.0_f64, f64::NAN);
    for &(x1, p, low, high) in rows {
        let t = crate::props::liquid::bubble_point_with(comps, &mut activity, &[x1, 1.0 - x1], p).map_err(|e| format!("x1 = {x1}: {e}"))?;
        let d = if t < low { low - t } else if t > high { t - high } else { 0.0 };
        if !d.is_finite() {
            return Err(format!("x1 = {x1}: bubble temperature {t} K"));
        }
        if d > worst.0 {
            worst = (d, x1);
        }
    }
    Ok(worst)
}

/// Investigated disagreements between UNIFAC and a bubble-temperature reference, (component 1, component 2,
/// explanation); each must still fail (tests/validation_activity.rs), so a fixed one is taken off the list.
pub const KNOWN_BUBBLE_FAILURES: &[(&str, &str, &str)] = &[
    (
        "m-xylene",
        "n-octane",
        "UNIFAC puts this pair 2.8 K below Raoult's law at x1 = 0.5, as it does toluene + n-octane (where the reference agrees within 0.4 K); the fitted mixture model makes m-xylene + n-octane nearly ideal (γ_T 0.993 against 0.980 for toluene + n-octane), so either that fit or UNIFAC's aromatic–paraffin interaction misses for the xylene; the measured data were not readable here",
    ),
    (
        "ethanol",
        "n-octane",
        "1.50 K above the one DECHEMA data set at x1 = 0.05 (363.55 against 362.05 K), within 1.5 K elsewhere; at that dilute end the pairs with two DECHEMA data sets differ between themselves by 1.8 K (ethanol + n-heptane), 1.3 K (ethanol + p-xylene) and 4.6 K (ethanol + toluene), more than this miss",
    ),
];

fn known_bubble_failure(ids: &(String, String)) -> Option<&'static str> {
    KNOWN_BUBBLE_FAILURES.iter().find(|k| k.0 == ids.0 && k.1 == ids.1).map(|k| k.2)
}

/// (b) Bubble temperatures against data-backed references: UNIFAC asserted, the ideal liquid reported.
pub fn bubble_checks(lib: &Library) -> Vec<CheckResult> {
    let library = COOLPROP_VLE.lines().find_map(|l| l.strip_prefix("# library: ")).unwrap_or("CoolProp").to_string();
    let mut out = vec![];
    for system in vle_systems() {
        let name = format!("{} + {}", system.ids.0, system.ids.1);
        let dechema: Vec<&str> = system.references.iter().filter_map(|r| r.strip_prefix("dechema-nrtl ")).collect();
        let source = if dechema.is_empty() {
            format!(
                "{library}: multi-fluid mixture model with the binary interaction parameters of I. H. Bell and E. W. Lemmon, J. Chem. Eng. Data 61 (2016), doi:10.1021/acs.jced.6b00257 (fitted to experimental mixture data); validation/coolprop/binary_vle.csv"
            )
        } else {
            format!(
                "NRTL with the DECHEMA parameters at 1 atm as listed in ChemSep's nrtl.ipd (\"DECHEMA NRTL data @ 1atm\", shipped by thermo; file comments {}, read by us as page and DECHEMA Chemistry Data Series volume/part) and CoolProp pure-fluid vapour pressures; the band spans the listed data sets; {library}; validation/coolprop/binary_vle.csv",
                dechema.join(", ")
            )
        };
        let label = format!(
            "bubble temperature of {name} at 101.325 kPa, x1 = {}{}",
            system.rows.iter().map(|r| format!("{}", r.0)).collect::<Vec<_>>().join("/"),
            if dechema.len() > 1 { format!(", distance from the band of {} data sets", dechema.len()) } else { String::new() }
        );
        let comps: Option<Vec<Arc<Component>>> = [&system.ids.0, &system.ids.1].iter().map(|id| lib.component(id).cloned()).collect();
        let Some(comps) = comps else {
            out.push(CheckResult::failed(GROUP_ACTIVITY, label, &source, format!("{name}: component not in the library")));
            continue;
        };
        let ideal = bubble_deviation(&comps, ActivityModel::Ideal, &system.rows);
        match bubble_deviation(&comps, ActivityModel::Unifac, &system.rows) {
            Ok((d, x1)) => {
                let ideal_text = match ideal {
                    Ok((di, xi)) => format!("ideal liquid (Raoult's law) off by up to {di:.2} K (x1 = {xi}), reported"),
                    Err(e) => format!("ideal liquid not computed: {e}"),
                };
                let mut r = CheckResult::absolute(GROUP_ACTIVITY, format!("{label}: UNIFAC, worst at x1 = {x1}; {ideal_text}"), &source, d, TOL_BUBBLE_K, "K");
                if let (false, Some(why)) = (r.passed, known_bubble_failure(&system.ids)) {
                    r.check = format!("{} [{}: {why}]", r.check, crate::checks::properties::KNOWN_FAILURE_MARKER);
                }
                out.push(r);
            }
            Err(e) => out.push(CheckResult::failed(GROUP_ACTIVITY, label, &source, e)),
        }
    }
    out
}

/// Largest bubble-temperature miss \[K\] of each reference binary of validation/coolprop/binary_vle.csv with
/// `model` (distance from the references' band): the component ids and the miss, or why it was not computed.
pub fn bubble_misses(lib: &Library, model: ActivityModel) -> Vec<((String, String), Result<f64, String>)> {
    vle_systems()
        .into_iter()
        .map(|system| {
            let comps: Option<Vec<Arc<Component>>> = [&system.ids.0, &system.ids.1].iter().map(|id| lib.component(id).cloned()).collect();
            let miss = match comps {
                Some(comps) => bubble_deviation(&comps, model, &system.rows).map(|(d, _)| d),
                None => Err("component not in the library".into()),
            };
            (system.ids, miss)
        })
        .collect()
}

/// Every activity-coefficient check, in report order.
pub fn all(lib: &Library) -> Vec<CheckResult> {
    let mut v = thermo_checks(lib);
    v.extend(bubble_checks(lib));
    v
}
