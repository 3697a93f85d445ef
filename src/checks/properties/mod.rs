//! Property checks against the outside world: the component library against the reference equations of
//! state and transport correlations carried by CoolProp 8.0.0, against hand-compiled handbook constants, and
//! the mixture rules against independent hand calculations and Cantera 3.2.0.
//!
//! The reference tables live in `validation/` (made by the scripts there; each CSV starts with `#` lines that
//! give library, version, date, command and the paper behind every column). They are embedded with
//! `include_str!`, so the checks run with no file beside the binary.
//!
//! CoolProp is the independent check: the component data come from published handbook tables
//! (mixtures/tools/make_components.py), never from CoolProp. A check that fails is reported as failed; the
//! few failures that were investigated and traced to the published correlation itself (not to a
//! copying or unit error) are listed in [`KNOWN_FAILURES`] with the reason. They still count as
//! failed in the report; the tests only tolerate exactly the listed ones.

use super::CheckResult;
use crate::data::Library;

mod coolprop;
mod handbook;
mod mixture;
mod thermal;

pub use coolprop::{coolprop_checks, high_temperature_cp_checks};
pub use handbook::{density_viscosity_checks, handbook_checks};
pub use mixture::mixture_checks;
pub use thermal::{thermal_anchor_checks, thermal_holdout_checks};

// ---------------------------------------------------------------------------------------------------------
// Embedded reference tables
// ---------------------------------------------------------------------------------------------------------

macro_rules! coolprop_fluid {
    ($id:literal) => {
        (
            $id,
            include_str!(concat!("../../../validation/coolprop/", $id, ".csv")),
            include_str!(concat!("../../../validation/coolprop/", $id, "_vapor.csv")),
        )
    };
}

/// Every fluid of validation/coolprop/: (component id, saturated-liquid table, dilute-gas table).
const COOLPROP_FLUIDS: [(&str, &str, &str); 14] = [
    coolprop_fluid!("n-hexane"),
    coolprop_fluid!("n-heptane"),
    coolprop_fluid!("n-octane"),
    coolprop_fluid!("n-nonane"),
    coolprop_fluid!("n-decane"),
    coolprop_fluid!("n-undecane"),
    coolprop_fluid!("n-dodecane"),
    coolprop_fluid!("toluene"),
    coolprop_fluid!("o-xylene"),
    coolprop_fluid!("m-xylene"),
    coolprop_fluid!("p-xylene"),
    coolprop_fluid!("ethylbenzene"),
    coolprop_fluid!("cyclohexane"),
    coolprop_fluid!("ethanol"),
];

const HANDBOOK_CONSTANTS: &str = include_str!("../../../validation/handbook/constants.csv");
const BINARY_BUBBLE: &str = include_str!("../../../validation/coolprop/binary_bubble.csv");
const CANTERA_DIFFUSION: &str = include_str!("../../../validation/cantera/diffusion.csv");
const DENSITY_VISCOSITY: &str = include_str!("../../../validation/handbook/density_viscosity.csv");
const THERMAL: &str = include_str!("../../../validation/handbook/thermal.csv");
const NASA7_DODECANE_CP: &str = include_str!("../../../validation/nasa7/n-dodecane_cp.csv");

// ---------------------------------------------------------------------------------------------------------
// Tolerances
// ---------------------------------------------------------------------------------------------------------

/// Vapour pressure, Tb − 60 K … 0.85 Tc: 2 % (tolerance set by the issue).
pub const TOL_VAPOR_PRESSURE: f64 = 0.02;
/// Saturated-liquid density: 1.5 % (issue).
pub const TOL_LIQUID_DENSITY: f64 = 0.015;
/// Latent heat: 3 % (issue).
pub const TOL_LATENT_HEAT: f64 = 0.03;
/// Liquid heat capacity: 5 % (issue).
pub const TOL_LIQUID_CP: f64 = 0.05;
/// Liquid viscosity: 10 % (issue).
pub const TOL_LIQUID_VISCOSITY: f64 = 0.10;
/// Liquid thermal conductivity: 10 % (issue).
pub const TOL_LIQUID_CONDUCTIVITY: f64 = 0.10;
/// Surface tension: 5 % (issue).
pub const TOL_SURFACE_TENSION: f64 = 0.05;
/// Ideal-gas heat capacity, 300–1000 K: 3 %. Our own choice (the issue sets none): a few per cent is the
/// usual agreement between ideal-gas cp polynomials and statistical-mechanics values.
pub const TOL_IDEAL_GAS_CP: f64 = 0.03;
/// Low-pressure vapour viscosity, 300–1000 K: 10 %. Our own choice (the issue sets none), matching the
/// liquid-viscosity tolerance.
pub const TOL_VAPOR_VISCOSITY: f64 = 0.10;
/// Low-pressure vapour thermal conductivity, 300–900 K: 10 % (issue 16; it was 15 % to 1000 K with rows
/// above the EOS T_max not judged).
pub const TOL_VAPOR_CONDUCTIVITY: f64 = 0.10;
/// Ideal-gas heat capacity of n-dodecane against the published NASA 7 polynomial, 300–1500 K: 4 %. Our own
/// choice: that polynomial and CoolProp's EOS ideal-gas part differ from each other by up to 2.6 % at 1500 K.
pub const TOL_IDEAL_GAS_CP_HIGH: f64 = 0.04;
/// Fuller diffusion coefficients against Chapman–Enskog: 10 %. Fuller et al.'s published average error is
/// about 5–10 % (Poling, Prausnitz & O'Connell 2001, Table 11-2 — from memory, not confirmed here).
pub const TOL_DIFFUSION: f64 = 0.10;
/// Liquid density at 15 °C against a data-backed reference other than the coefficient source: 1.0 % (issue).
pub const TOL_DENSITY_15C: f64 = 0.010;
/// Handbook or paper liquid density at 20–25 °C (the temperature of the measurement): 1.5 % (issue).
pub const TOL_HANDBOOK_DENSITY: f64 = 0.015;
/// Kinematic viscosity at −20 °C (and at the temperature of a paper's single measurement): 12 % (issue).
pub const TOL_KINEMATIC_VISCOSITY: f64 = 0.12;
/// Hold-out of the one-value latent-heat anchor (one value at 298.15 K, Watson exponent 0.38) on the
/// components with a full Perry Table 2-150 correlation, 298.15 K … Tb: 8 %. Our own choice, set from the
/// measured hold-out (max 7.7 %, n-hexadecane at Tb; mean 1.1 %): it records the method's error, which the
/// component files carry as the uncertainty of such anchors, and fails if the method gets worse.
pub const TOL_LATENT_HEAT_ONE_POINT: f64 = 0.08;
/// Hold-out of the two-value latent-heat anchor (298.15 K and Tb through A(1 − Tr)^B, Watson 0.38 above Tb),
/// 298.15 K … 0.85 Tc: 5 %. Our own choice from the hold-out (max 4.0 %, tetralin at 0.85 Tc). Between the
/// two values the form reproduces a two-coefficient Perry fit exactly, so only the part above Tb tests it.
pub const TOL_LATENT_HEAT_TWO_POINT: f64 = 0.05;
/// Hold-out of the one-value liquid-cp anchor (298.15 K, Rowlinson–Bondi shape), 250 K … min(Tb, 0.7 Tc):
/// 7 %. Our own choice from the hold-out (max 6.1 %, n-hexadecane at 0.7 Tc; mean 0.9 %).
pub const TOL_LIQUID_CP_HOLDOUT: f64 = 0.07;
/// Bubble point of the n-heptane/n-decane binary against the hand calculation: 1 K (issue).
pub const TOL_BUBBLE_POINT_K: f64 = 1.0;
/// Raoult surface-equilibrium worked check: 3 % (our p_sat correlations are not the reference EOS).
pub const TOL_RAOULT_SURFACE: f64 = 0.03;
/// Identities (one-component mixtures, fraction round trips): 1e-12 relative (floating-point round-off).
pub const TOL_IDENTITY: f64 = 1e-12;

const GROUP_COOLPROP: &str = "pure-component properties vs reference EOS";
const GROUP_HANDBOOK: &str = "pure-component constants vs handbooks";
const GROUP_MIXTURE: &str = "mixture rules";
const GROUP_DATA: &str = "pure-component density and viscosity vs measured data";

// ---------------------------------------------------------------------------------------------------------
// Known failures
// ---------------------------------------------------------------------------------------------------------

/// A check that fails for a reason traced to the published data (not to our copying or code).
#[derive(Debug, Clone, Copy)]
pub struct KnownFailure {
    /// Component id.
    pub component: &'static str,
    /// Property key as in the component file (`liquid-viscosity`), or `handbook-density`.
    pub property: &'static str,
    /// Why it fails and what was checked.
    pub reason: &'static str,
}

/// Failures investigated and traced to the published correlation. Each entry still reports FAIL; the tests
/// tolerate exactly these, and fail if a listed check starts to pass (then remove the entry).
/// Pending the project lead's decision (see the report that came with this file).
pub const KNOWN_FAILURES: &[KnownFailure] = &[
    KnownFailure {
        component: "ethanol",
        property: "latent-heat",
        reason: "two-coefficient Perry Table 2-150 (DIPPR 106) fit, +3.5 % at 0.85 Tc (within 3 % up to 430 K); coefficients match the table",
    },
    KnownFailure {
        component: "ethanol",
        property: "liquid-heat-capacity",
        reason: "Perry Table 2-153 (DIPPR 100) polynomial, +5.5 % at its own upper limit 390 K (within 5 % up to 380 K); coefficients match the table",
    },
    KnownFailure {
        component: "n-nonane",
        property: "liquid-heat-capacity",
        reason: "the published Perry Table 2-153 polynomial ends at 325 K, below the whole check window (Tb − 60 K = 364 K upwards): nothing to validate there (the Rowlinson–Bondi continuation is within 0.4 % over the window, reported)",
    },
    KnownFailure {
        component: "n-dodecane",
        property: "liquid-heat-capacity",
        reason: "the published Perry Table 2-153 polynomial ends at 330 K, below the whole check window (Tb − 60 K = 429 K upwards): nothing to validate there (the Rowlinson–Bondi continuation is within 1.3 % over the window, reported)",
    },
    KnownFailure {
        component: "n-nonane",
        property: "vapor-viscosity",
        reason: "Perry Table 2-312 (DIPPR 102) is 10.5 % below the reference at 300 K (8.9 % at 325 K, within 5 % from 425 K); coefficients match the table",
    },
    KnownFailure {
        component: "p-xylene",
        property: "vapor-conductivity",
        reason: "Perry Table 2-314 (DIPPR 102) is 14.8 % low at 325 K, just above its own lower limit 320 K (9.8 % at 350 K, within 5 % from 400 K); below 320 K the Chung et al. shape anchored there carries that offset (15.7 % at 300 K); coefficients match the table",
    },
    KnownFailure {
        component: "ethylbenzene",
        property: "vapor-viscosity",
        reason: "Perry Table 2-312 is 6–12 % below the reference; the reference here is CoolProp's extended-corresponding-states model (REFPROP 9.1.2, not a journal correlation) and equals plain Chapman–Enskog with its LJ parameters; the Chung et al. (1988) estimate sides with Perry (within 4 %)",
    },
    KnownFailure {
        component: "m-xylene",
        property: "vapor-conductivity",
        reason: "Perry Table 2-314 (DIPPR 102) is 19 % low at 325 K, just above its own lower limit 320 K (within 5 % from 375 K); below 320 K the Chung et al. shape anchored there carries that offset; coefficients match the table",
    },
    KnownFailure {
        component: "n-heptane",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 685.8 kg/m³ at 20 °C against 683.8 (+0.29 %); the file's 1 kg/m³ tolerance is the scatter between measured values, tighter than the fit",
    },
    KnownFailure {
        component: "n-octane",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 706.8 kg/m³ at 20 °C against 702.6 (+0.59 %); coefficients match the table",
    },
    KnownFailure {
        component: "n-decane",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 731.6 kg/m³ at 20 °C against 730.4 (+0.17 %); the file's 1 kg/m³ tolerance is tighter than the fit",
    },
    KnownFailure {
        component: "2-2-4-trimethylpentane",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 694.4 kg/m³ at 20 °C against 691.9 (+0.36 %); coefficients match the table",
    },
    KnownFailure {
        component: "toluene",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 868.5 kg/m³ at 20 °C against 866.9 (+0.18 %); the file's 1 kg/m³ tolerance is tighter than the fit",
    },
    KnownFailure {
        component: "cyclohexane",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 777.6 kg/m³ at 20 °C against 778.7 (−0.14 %); the file's 1 kg/m³ tolerance is tighter than the fit",
    },
    KnownFailure {
        component: "ethanol",
        property: "handbook-density",
        reason: "Perry Table 2-32 (DIPPR 105) gives 790.3 kg/m³ at 20 °C against 789.3 (+0.13 %); the file's 0.5 kg/m³ tolerance is tighter than the fit",
    },
    KnownFailure {
        component: "n-hexane",
        property: "vapor-diffusion",
        reason: "Fuller is 10.7–10.9 % above the reference at 300 K (within 6.2 % at 1000 K); the reference uses σ = 6.334 Å, ε/k = 378.4 K from the n-hexane viscosity correlation (Michailidou et al. 2013), a larger σ than n-heptane's 6.136 Å; with the Poling et al. Appendix B parameters (5.949 Å, 399.3 K) Chapman–Enskog is within 3.6 % of Fuller",
    },
];

/// Marker put in the check text of a known failure.
pub const KNOWN_FAILURE_MARKER: &str = "KNOWN FAILURE";

fn known_failure(component: &str, property: &str) -> Option<&'static KnownFailure> {
    KNOWN_FAILURES.iter().find(|k| k.component == component && k.property == property)
}

/// True when the result is one of [`KNOWN_FAILURES`].
pub fn is_known_failure(r: &CheckResult) -> bool {
    r.check.contains(KNOWN_FAILURE_MARKER)
}

fn mark_known(mut r: CheckResult, component: &str, property: &str) -> CheckResult {
    if let Some(k) = known_failure(component, property) {
        r.check = format!("{} [{KNOWN_FAILURE_MARKER}: {}]", r.check, k.reason);
    }
    r
}

// ---------------------------------------------------------------------------------------------------------
// A small CSV reader for the embedded tables
// ---------------------------------------------------------------------------------------------------------

/// A reference table: its `#` comment lines and its rows as text cells.
struct Table {
    comments: Vec<String>,
    columns: Vec<String>,
    rows: Vec<Vec<String>>,
}

impl Table {
    fn parse(text: &str) -> Table {
        let comments = text.lines().filter_map(|l| l.strip_prefix('#')).map(|l| l.trim().to_string()).collect();
        let body: String = text.lines().filter(|l| !l.starts_with('#') && !l.trim().is_empty()).map(|l| format!("{l}\n")).collect();
        let mut reader = csv::ReaderBuilder::new().has_headers(true).from_reader(body.as_bytes());
        let columns = reader.headers().map(|h| h.iter().map(|s| s.trim().to_string()).collect()).unwrap_or_default();
        let rows = reader.records().filter_map(|r| r.ok()).map(|r| r.iter().map(|s| s.trim().to_string()).collect()).collect();
        Table { comments, columns, rows }
    }

    fn column(&self, name: &str) -> Option<usize> {
        self.columns.iter().position(|c| c == name)
    }

    /// Numeric cell: `None` for an empty, missing or non-finite cell (never NaN).
    fn number(&self, row: &[String], col: Option<usize>) -> Option<f64> {
        let s = row.get(col?)?;
        s.parse::<f64>().ok().filter(|v| v.is_finite())
    }

    fn text<'a>(&self, row: &'a [String], col: Option<usize>) -> &'a str {
        col.and_then(|c| row.get(c)).map(|s| s.as_str()).unwrap_or("")
    }

    /// Value of a `# key: value` comment line.
    fn comment(&self, key: &str) -> Option<&str> {
        self.comments.iter().find_map(|l| l.strip_prefix(key).and_then(|r| r.strip_prefix(':')).map(str::trim))
    }

    /// Library and version named in the `# library:` line, e.g. "CoolProp 8.0.0".
    fn library(&self) -> String {
        self.comment("library").map(|l| l.split(" (").next().unwrap_or(l).split(',').next().unwrap_or(l).trim().to_string()).unwrap_or_else(|| "unknown library".into())
    }
}

// ---------------------------------------------------------------------------------------------------------
// Helpers
// ---------------------------------------------------------------------------------------------------------

fn library() -> Result<Library, String> {
    Library::embedded().map_err(|e| e.to_string())
}

fn failed(group: &str, check: String, source: &str, why: String) -> CheckResult {
    CheckResult { group: group.into(), check, source: source.into(), tolerance: "–".into(), achieved: why, passed: false, reported: false }
}

/// |a/b − 1|, or +∞ when either is not a finite number or b is zero (so the check fails, never NaN).
fn relative_error(value: f64, reference: f64) -> f64 {
    if value.is_finite() && reference.is_finite() && reference != 0.0 {
        (value / reference - 1.0).abs()
    } else {
        f64::INFINITY
    }
}

/// Largest error and where it occurred.
#[derive(Clone, Copy)]
struct Worst {
    error: f64,
    temperature: f64,
    points: usize,
    t_lo: f64,
    t_hi: f64,
}

impl Worst {
    fn new() -> Self {
        Worst { error: 0.0, temperature: f64::NAN, points: 0, t_lo: f64::INFINITY, t_hi: f64::NEG_INFINITY }
    }

    fn add(&mut self, t: f64, e: f64) {
        self.points += 1;
        self.t_lo = self.t_lo.min(t);
        self.t_hi = self.t_hi.max(t);
        if self.points == 1 || e > self.error || e.is_nan() {
            self.error = if e.is_nan() { f64::INFINITY } else { e };
            self.temperature = t;
        }
    }
}

/// Three decimals with trailing zeros dropped; "non-finite" for NaN or ±∞.
fn fmt_sig(v: f64) -> String {
    if !v.is_finite() {
        return "non-finite".into();
    }
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    s.to_string()
}

fn pct(e: f64) -> String {
    if e.is_finite() {
        format!("{:.2} %", 100.0 * e)
    } else {
        "non-finite".into()
    }
}

/// Every property check of this module, in report order.
pub fn all() -> Vec<CheckResult> {
    let mut v = coolprop_checks();
    v.extend(high_temperature_cp_checks());
    v.extend(handbook_checks());
    v.extend(density_viscosity_checks());
    v.extend(thermal_anchor_checks());
    v.extend(thermal_holdout_checks());
    v.extend(mixture_checks());
    v
}
