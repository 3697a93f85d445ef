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

use std::sync::Arc;

use super::CheckResult;
use crate::data::{Component, Correlation, Library};
use crate::fuel::{Basis, Fuel};
use crate::model::film::{Film, FilmSetup, TransferCorrelation};
use crate::props::gas::{vapor_diffusion_coefficient, AmbientGas};
use crate::props::liquid;

// ---------------------------------------------------------------------------------------------------------
// Embedded reference tables
// ---------------------------------------------------------------------------------------------------------

macro_rules! coolprop_fluid {
    ($id:literal) => {
        (
            $id,
            include_str!(concat!("../../validation/coolprop/", $id, ".csv")),
            include_str!(concat!("../../validation/coolprop/", $id, "_vapor.csv")),
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

const HANDBOOK_CONSTANTS: &str = include_str!("../../validation/handbook/constants.csv");
const BINARY_BUBBLE: &str = include_str!("../../validation/coolprop/binary_bubble.csv");
const CANTERA_DIFFUSION: &str = include_str!("../../validation/cantera/diffusion.csv");
const DENSITY_VISCOSITY: &str = include_str!("../../validation/handbook/density_viscosity.csv");
const NASA7_DODECANE_CP: &str = include_str!("../../validation/nasa7/n-dodecane_cp.csv");

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
    CheckResult { group: group.into(), check, source: source.into(), tolerance: "–".into(), achieved: why, passed: false }
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

fn pct(e: f64) -> String {
    if e.is_finite() {
        format!("{:.2} %", 100.0 * e)
    } else {
        "non-finite".into()
    }
}

// ---------------------------------------------------------------------------------------------------------
// 1. CoolProp checks
// ---------------------------------------------------------------------------------------------------------

type PropertyFn = fn(&Component, f64) -> f64;

/// One property to check against a CoolProp column.
struct PropertySpec {
    key: &'static str,
    label: &'static str,
    column: &'static str,
    tolerance: f64,
    /// Header key of the reference model (`equation of state`, `viscosity model`, ...).
    model_key: &'static str,
    value: PropertyFn,
    correlation: fn(&Component) -> &Correlation,
    /// Judge the whole window, also where the library extends the published correlation (the extension
    /// methods are what is checked), and dilute-gas rows above the EOS T_max.
    whole_window: bool,
    /// Dilute-gas window [K] (liquid properties use Tb − 60 K … 0.85 Tc).
    gas_window: (f64, f64),
}

const LIQUID_PROPERTIES: [PropertySpec; 7] = [
    PropertySpec { key: "vapor-pressure", label: "vapour pressure", column: "vapor_pressure_Pa", tolerance: TOL_VAPOR_PRESSURE, model_key: "equation of state", value: Component::vapor_pressure, correlation: |c| &c.vapor_pressure , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-density", label: "liquid density", column: "liquid_density_kg_m3", tolerance: TOL_LIQUID_DENSITY, model_key: "equation of state", value: Component::liquid_density, correlation: |c| &c.liquid_density , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "latent-heat", label: "latent heat", column: "latent_heat_J_kg", tolerance: TOL_LATENT_HEAT, model_key: "equation of state", value: Component::latent_heat, correlation: |c| &c.latent_heat , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-heat-capacity", label: "liquid heat capacity", column: "liquid_cp_J_kgK", tolerance: TOL_LIQUID_CP, model_key: "equation of state", value: Component::liquid_heat_capacity, correlation: |c| &c.liquid_heat_capacity , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-viscosity", label: "liquid viscosity", column: "liquid_viscosity_Pa_s", tolerance: TOL_LIQUID_VISCOSITY, model_key: "viscosity model", value: Component::liquid_viscosity, correlation: |c| &c.liquid_viscosity , whole_window: true, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-conductivity", label: "liquid thermal conductivity", column: "liquid_conductivity_W_mK", tolerance: TOL_LIQUID_CONDUCTIVITY, model_key: "thermal conductivity model", value: Component::liquid_conductivity, correlation: |c| &c.liquid_conductivity , whole_window: true, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "surface-tension", label: "surface tension", column: "surface_tension_N_m", tolerance: TOL_SURFACE_TENSION, model_key: "surface tension model", value: Component::surface_tension, correlation: |c| &c.surface_tension , whole_window: false, gas_window: (300.0, 1000.0) },
];

const VAPOR_PROPERTIES: [PropertySpec; 3] = [
    PropertySpec { key: "ideal-gas-heat-capacity", label: "ideal-gas heat capacity", column: "ideal_gas_cp_J_kgK", tolerance: TOL_IDEAL_GAS_CP, model_key: "equation of state", value: Component::ideal_gas_heat_capacity, correlation: |c| &c.ideal_gas_heat_capacity , whole_window: false, gas_window: (300.0, 1500.0) },
    PropertySpec { key: "vapor-viscosity", label: "vapour viscosity", column: "vapor_viscosity_Pa_s", tolerance: TOL_VAPOR_VISCOSITY, model_key: "viscosity model", value: Component::vapor_viscosity, correlation: |c| &c.vapor_viscosity , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "vapor-conductivity", label: "vapour thermal conductivity", column: "vapor_conductivity_W_mK", tolerance: TOL_VAPOR_CONDUCTIVITY, model_key: "thermal conductivity model", value: Component::vapor_conductivity, correlation: |c| &c.vapor_conductivity , whole_window: true, gas_window: (300.0, 900.0) },
];

/// Source text of a CoolProp column: library, kind of model, and the paper from the table header.
fn coolprop_source(table: &Table, spec: &PropertySpec) -> String {
    let lib = table.library();
    let paper = table.comment(spec.model_key).unwrap_or("model not named in the table header");
    match spec.model_key {
        "equation of state" => format!("{lib} reference EOS ({paper})"),
        other => format!("{lib} {other} ({paper})"),
    }
}

/// Saturated-liquid and dilute-gas properties of every component CoolProp covers (validation/coolprop/).
///
/// Liquid properties use the saturated-liquid rows with T from Tb − 60 K to 0.85 Tc (the library component's
/// own Tb and Tc; not below its melting point except for the vapour pressure), the window the issue asks the
/// properties to be valid in. Inside it, each property is judged where its published correlation is valid
/// (t-min … t-max of the component file): a correlation is not held to account where the library
/// extrapolates it, but when the published range cuts the window the check text says so and gives the
/// deviation over the full window too. Ideal-gas cp, vapour viscosity and vapour conductivity use the
/// dilute-gas rows over 300–1000 K in the same way; rows above the EOS upper limit T_max (column
/// `beyond_eos_tmax` = 1) are CoolProp extrapolations (validation/README.md) and are reported, not judged.
/// Tolerances: see the `TOL_*` constants (the vapour ones are our own choice; the issue sets none).
pub fn coolprop_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_COOLPROP, "load the embedded component library".into(), "mixtures/", e)],
    };
    let mut out = vec![];
    for (id, liquid_csv, vapor_csv) in COOLPROP_FLUIDS {
        let Some(c) = lib.component(id) else {
            out.push(failed(GROUP_COOLPROP, format!("{id}: component present in the library"), "validation/coolprop/", "missing from the library".into()));
            continue;
        };
        let liquid = Table::parse(liquid_csv);
        let vapor = Table::parse(vapor_csv);
        let tb = c.normal_boiling_point();
        let tc = c.critical_temperature();
        let tm = c.constants.melting_point.value;
        for spec in &LIQUID_PROPERTIES {
            let lo = if spec.key == "vapor-pressure" { tb - 60.0 } else { (tb - 60.0).max(tm) };
            let window = (lo, 0.85 * tc);
            if let Some(r) = compare(c, &liquid, spec, window, false) {
                out.push(mark_known(r, id, spec.key));
            }
        }
        for spec in &VAPOR_PROPERTIES {
            if let Some(r) = compare(c, &vapor, spec, spec.gas_window, true) {
                out.push(mark_known(r, id, spec.key));
            }
        }
    }
    out
}

/// One component × property comparison; `None` when the reference has no values for the property.
fn compare(c: &Component, table: &Table, spec: &PropertySpec, window: (f64, f64), dilute_gas: bool) -> Option<CheckResult> {
    let t_col = table.column("temperature_K");
    let v_col = table.column(spec.column);
    let flag_col = table.column("beyond_eos_tmax");
    let corr = (spec.correlation)(c);
    let (pub_lo, pub_hi) = (corr.t_min, corr.t_max);
    let mut judged = Worst::new();
    let mut whole = Worst::new(); // the full window, extrapolated parts included
    let mut beyond_eos = Worst::new();
    let mut any_reference = false;
    for row in &table.rows {
        let (Some(t), Some(reference)) = (table.number(row, t_col), table.number(row, v_col)) else { continue };
        any_reference = true;
        if t < window.0 - 1e-9 || t > window.1 + 1e-9 {
            continue;
        }
        let e = relative_error((spec.value)(c, t), reference);
        if dilute_gas && table.number(row, flag_col).unwrap_or(0.0) > 0.5 {
            beyond_eos.add(t, e);
            if !spec.whole_window {
                continue;
            }
        }
        whole.add(t, e);
        if spec.whole_window || (t >= pub_lo && t <= pub_hi) {
            judged.add(t, e);
        }
    }
    if !any_reference {
        return None;
    }
    let source = coolprop_source(table, spec);
    let mut notes = vec![];
    if whole.points > judged.points && !spec.whole_window {
        notes.push(format!(
            "window {:.0}–{:.0} K cut to the published range {:.1}–{:.1} K of '{}'; over the whole window, extrapolated, max {} ({} points, not judged)",
            window.0, window.1, pub_lo, pub_hi, corr.source, pct(whole.error), whole.points
        ));
    }
    if spec.whole_window && (whole.points > 0) && (pub_lo > window.0 || pub_hi < window.1) {
        notes.push(format!(
            "judged over the whole window, including where the library extends '{}' (published {:.1}–{:.1} K) by its extension method",
            corr.source, pub_lo, pub_hi
        ));
    }
    if beyond_eos.points > 0 {
        let judged_text = if spec.whole_window { "judged (the reference correlation is extrapolated there too)" } else { "not judged" };
        notes.push(format!(
            "{} rows {:.0}–{:.0} K lie above the EOS T_max, where CoolProp extrapolates: max {} there, {judged_text}",
            beyond_eos.points, beyond_eos.t_lo, beyond_eos.t_hi, pct(beyond_eos.error)
        ));
    }
    if spec.key == "surface-tension" && corr.source.starts_with("mulero-cachadina") && source.contains("Mulero") {
        notes.push("the library and the reference use the same published correlation (Mulero et al. 2012): this checks the copied coefficients, not the accuracy".into());
    }
    let notes = if notes.is_empty() { String::new() } else { format!("; {}", notes.join("; ")) };
    if judged.points == 0 {
        let check = format!("{} {}: no reference point inside the published range{notes}", c.id, spec.label);
        return Some(CheckResult {
            group: GROUP_COOLPROP.into(),
            check,
            source,
            tolerance: format!("{:.3} % relative", 100.0 * spec.tolerance),
            achieved: "nothing to judge".into(),
            passed: false,
        });
    }
    let check = format!(
        "{} {}, {:.0}–{:.0} K ({} points, max at {:.0} K){notes}",
        c.id, spec.label, judged.t_lo, judged.t_hi, judged.points, judged.temperature
    );
    Some(CheckResult::relative(GROUP_COOLPROP, check, &source, judged.error, spec.tolerance))
}

// ---------------------------------------------------------------------------------------------------------
// 2. Handbook checks
// ---------------------------------------------------------------------------------------------------------

/// Normal boiling point, critical temperature and pressure, and liquid density (at the temperature the
/// table gives) of every component in validation/handbook/constants.csv, with the file's tolerances and
/// sources. The confidence tag of each value (confirmed / physics-H / from-memory / EOS) is part of the
/// source text.
pub fn handbook_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_HANDBOOK, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(HANDBOOK_CONSTANTS);
    let col = |n: &str| table.column(n);
    let mut out = vec![];
    for row in &table.rows {
        let id = table.text(row, col("id"));
        let Some(c) = lib.component(id) else {
            out.push(failed(GROUP_HANDBOOK, format!("{id}: component present in the library"), "validation/handbook/constants.csv", "missing from the library".into()));
            continue;
        };
        // confidence "tb:physics-H/crit:physics-H/rho:from-memory" → per-property tags
        let confidence = table.text(row, col("confidence"));
        let tag = |key: &str| -> String {
            confidence.split('/').find_map(|p| p.strip_prefix(key).and_then(|r| r.strip_prefix(':'))).unwrap_or("untagged").to_string()
        };
        let src = |column: &str, key: &str| format!("{} [{}] (validation/handbook/constants.csv)", table.text(row, col(column)), tag(key));
        let density_t = table.number(row, col("density_temperature_K"));
        let density_value = density_t.map(|t| c.liquid_density(t)).unwrap_or(f64::INFINITY);
        let items = [
            HandbookItem { key: "normal-boiling-point", label: "normal boiling point", reference: table.number(row, col("normal_boiling_point_K")), tolerance: table.number(row, col("tol_tb_K")), value: c.normal_boiling_point(), unit: "K", scale: 1.0, source: src("source_tb", "tb") },
            HandbookItem { key: "critical-temperature", label: "critical temperature", reference: table.number(row, col("critical_temperature_K")), tolerance: table.number(row, col("tol_tc_K")), value: c.critical_temperature(), unit: "K", scale: 1.0, source: src("source_critical", "crit") },
            HandbookItem { key: "critical-pressure", label: "critical pressure", reference: table.number(row, col("critical_pressure_Pa")), tolerance: table.number(row, col("tol_pc_Pa")), value: c.critical_pressure(), unit: "kPa", scale: 1e-3, source: src("source_critical", "crit") },
            HandbookItem { key: "handbook-density", label: "liquid density", reference: table.number(row, col("liquid_density_kg_m3")), tolerance: table.number(row, col("tol_density_kg_m3")), value: density_value, unit: "kg/m³", scale: 1.0, source: src("source_density", "rho") },
        ];
        for HandbookItem { key, label, reference, tolerance, value, unit, scale, source } in items {
            let (Some(reference), Some(tolerance)) = (reference, tolerance) else { continue };
            let at = if key == "handbook-density" { density_t.map(|t| format!(" at {t:.2} K")).unwrap_or_default() } else { String::new() };
            let check = format!("{id} {label}{at}: library {} vs {} {unit}", fmt_sig(value * scale), fmt_sig(reference * scale));
            let err = if value.is_finite() { (value - reference).abs() * scale } else { f64::INFINITY };
            out.push(mark_known(CheckResult::absolute(GROUP_HANDBOOK, check, &source, err, tolerance * scale, unit), id, key));
        }
    }
    out
}

/// Liquid density at 15 °C, handbook/paper density at 20–25 °C and kinematic viscosity at −20 °C of every
/// component that a data-backed reference in validation/handbook/density_viscosity.csv covers (CoolProp 8.0,
/// VDI Heat Atlas PPDS, Perry Table 2-32/2-313, Viswanath & Natarajan, Dutt–Prasad, CRC Handbook, papers).
/// A reference whose source id equals the component's own coefficient source is never used; the first
/// remaining asserted reference is judged, the others are quoted in the check text. Components with no
/// independent reference produce no check (listed in validation/README.md).
pub fn density_viscosity_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_DATA, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(DENSITY_VISCOSITY);
    let col = |n: &str| table.column(n);
    let mut keys: Vec<(String, String, u64)> = vec![];
    for row in &table.rows {
        let t = table.number(row, col("temperature_K")).unwrap_or(0.0);
        let key = (table.text(row, col("id")).to_string(), table.text(row, col("property")).to_string(), (t * 100.0).round() as u64);
        if !keys.contains(&key) {
            keys.push(key);
        }
    }
    let mut out = vec![];
    for (id, property, t_centi) in keys {
        let t = t_centi as f64 / 100.0;
        let Some(c) = lib.component(&id) else {
            out.push(failed(GROUP_DATA, format!("{id}: component present in the library"), "validation/handbook/density_viscosity.csv", "missing from the library".into()));
            continue;
        };
        let rows: Vec<&Vec<String>> = table
            .rows
            .iter()
            .filter(|r| table.text(r, col("id")) == id && table.text(r, col("property")) == property && table.number(r, col("temperature_K")).is_some_and(|x| (x * 100.0).round() as u64 == t_centi))
            .collect();
        let own = if property == "density" { &c.liquid_density.source } else { &c.liquid_viscosity.source };
        if property == "viscosity" && t <= c.constants.melting_point.value {
            continue; // liquid phase only
        }
        let library_value = |rho_ref: Option<f64>| -> (f64, f64) {
            // (library, reference scale): density as is; viscosity as kinematic ν = μ/ρ
            if property == "density" {
                (c.liquid_density(t), 1.0)
            } else {
                (c.liquid_viscosity(t) / c.liquid_density(t), 1.0 / rho_ref.unwrap_or_else(|| c.liquid_density(t)))
            }
        };
        let mut judged: Option<(f64, f64, String, String)> = None;
        let mut also = vec![];
        for r in &rows {
            let src_id = table.text(r, col("source_id"));
            let Some(v) = table.number(r, col("value")) else { continue };
            let rho_ref = table.number(r, col("reference_density_kg_m3"));
            let (lib_v, scale) = library_value(rho_ref);
            let reference = v * scale;
            let e = relative_error(lib_v, reference);
            if src_id == own.as_str() {
                also.push(format!("{src_id} {:+.2} % (coefficient source, not judged)", 100.0 * (lib_v / reference - 1.0)));
            } else if judged.is_none() && table.text(r, col("asserted")) == "1" {
                judged = Some((e, reference, src_id.to_string(), table.text(r, col("source")).to_string()));
            } else {
                also.push(format!("{src_id} {:+.2} %", 100.0 * (lib_v / reference - 1.0)));
            }
        }
        let Some((error, reference, src_id, source)) = judged else { continue };
        let (lib_v, _) = library_value(None);
        let (label, key, tol, unit, shown) = match (property.as_str(), t_centi) {
            ("density", 28815) => ("liquid density at 15 °C", "density-15C", TOL_DENSITY_15C, "kg/m³", 1.0),
            ("density", _) => ("handbook liquid density", "handbook-density-20C", TOL_HANDBOOK_DENSITY, "kg/m³", 1.0),
            _ => ("kinematic viscosity", "kinematic-viscosity", TOL_KINEMATIC_VISCOSITY, "mm²/s", 1e6),
        };
        let also = if also.is_empty() { String::new() } else { format!("; other references: {}", also.join(", ")) };
        let check = format!(
            "{id} {label} at {t:.2} K: library {} vs {} {unit} (coefficients: {own}; reference: {src_id}){also}",
            fmt_sig(lib_v * shown),
            fmt_sig(reference * shown)
        );
        out.push(mark_known(CheckResult::relative(GROUP_DATA, check, &source, error, tol), &id, key));
    }
    out
}

/// One handbook value to compare: file key, label, reference and tolerance from the table (SI), library
/// value (SI), display unit and the factor from SI to it, source text.
struct HandbookItem {
    key: &'static str,
    label: &'static str,
    reference: Option<f64>,
    tolerance: Option<f64>,
    value: f64,
    unit: &'static str,
    scale: f64,
    source: String,
}

fn fmt_sig(v: f64) -> String {
    if !v.is_finite() {
        return "non-finite".into();
    }
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    s.to_string()
}

// ---------------------------------------------------------------------------------------------------------
// 3. Mixture checks
// ---------------------------------------------------------------------------------------------------------

/// Mixture rules: (a) Raoult bubble points and surface equilibrium of n-heptane/n-decane against hand
/// calculations with the reference-EOS vapour pressures, (b) the Refutas viscosity blending on a hand
/// example, (c) Fuller diffusion coefficients against Cantera's Chapman–Enskog values, (d) identities
/// (one-component mixtures, fraction round trips).
pub fn mixture_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_MIXTURE, "load the embedded component library".into(), "mixtures/", e)],
    };
    let mut out = vec![];
    out.extend(bubble_point_checks(&lib));
    out.extend(raoult_surface_checks(&lib));
    out.extend(refutas_checks(&lib));
    out.extend(diffusion_checks(&lib));
    out.extend(identity_checks(&lib));
    out
}

fn heptane_decane(lib: &Library) -> Result<Vec<Arc<Component>>, String> {
    let c7 = lib.component("n-heptane").ok_or("n-heptane missing from the library")?.clone();
    let c10 = lib.component("n-decane").ok_or("n-decane missing from the library")?.clone();
    Ok(vec![c7, c10])
}

/// (a) Bubble temperature of liquid n-heptane/n-decane by Raoult's law against validation/coolprop/
/// binary_bubble.csv: the same law solved by hand (bisection) with CoolProp's pure-fluid vapour pressures
/// (validation/mixture_reference.py). Tolerance 1 K.
fn bubble_point_checks(lib: &Library) -> Vec<CheckResult> {
    let table = Table::parse(BINARY_BUBBLE);
    let source = format!("hand calculation (Raoult's law) with {} pure-fluid vapour pressures of the reference EOS (validation/mixture_reference.py)", table.library());
    let comps = match heptane_decane(lib) {
        Ok(c) => c,
        Err(e) => return vec![failed(GROUP_MIXTURE, "n-heptane/n-decane bubble point".into(), &source, e)],
    };
    let (cx, cp, ct) = (table.column("x_n_heptane"), table.column("pressure_Pa"), table.column("bubble_temperature_K"));
    let mut out = vec![];
    for row in &table.rows {
        let (Some(x), Some(p), Some(t_ref)) = (table.number(row, cx), table.number(row, cp), table.number(row, ct)) else { continue };
        let check = format!("bubble point of liquid n-heptane/n-decane, x_heptane = {x:.2}, {:.3} kPa (Raoult): reference {t_ref:.2} K", p / 1e3);
        match liquid::bubble_point(&comps, &[x, 1.0 - x], p) {
            Ok(t) => out.push(CheckResult::absolute(GROUP_MIXTURE, format!("{check}, library {t:.2} K"), &source, (t - t_ref).abs(), TOL_BUBBLE_POINT_K, "K")),
            Err(e) => out.push(failed(GROUP_MIXTURE, check, &source, e.to_string())),
        }
    }
    if out.is_empty() {
        out.push(failed(GROUP_MIXTURE, "n-heptane/n-decane bubble point".into(), &source, "no rows in validation/coolprop/binary_bubble.csv".into()));
    }
    out
}

/// (a) The worked Raoult surface check of the physics notes (../shared/physics.md (the project notes beside the repository) A.7): equimolar
/// n-heptane/n-decane liquid at T_s = 300 K, 101.325 kPa, dry air, no fuel vapour far away. Expected values
/// (computed there with CoolProp 8.0 reference-EOS vapour pressures 6.675 / 0.207 kPa; recomputed with more
/// digits by validation/mixture_reference.py into validation/coolprop/raoult_surface.csv: 0.0329381,
/// 0.0010219, 0.105039, 0.00462738, 0.123175, 0.957805, 0.0421949):
/// X_s = 0.0329 / 0.00102, Y_s = 0.1050 / 0.00463, B_M = 0.1232, eps = 0.958 / 0.042.
/// Evaluated through the film model (`Film::evaluate`), so eps comes from the species rates.
/// Tolerance 3 %: our vapour-pressure correlations are not the reference EOS.
fn raoult_surface_checks(lib: &Library) -> Vec<CheckResult> {
    let source = "physics notes A.7 worked check (computed with CoolProp 8.0 reference-EOS vapour pressures); confirmed by validation/mixture_reference.py";
    let comps = match heptane_decane(lib) {
        Ok(c) => c,
        Err(e) => return vec![failed(GROUP_MIXTURE, "Raoult surface equilibrium".into(), source, e)],
    };
    let gas = match AmbientGas::air(lib) {
        Ok(g) => g,
        Err(e) => return vec![failed(GROUP_MIXTURE, "Raoult surface equilibrium".into(), source, e.to_string())],
    };
    let t_s = 300.0; // K, physics notes A.7
    let setup = FilmSetup {
        components: comps.clone(),
        gas,
        pressure: 101_325.0, // Pa, physics notes A.7
        ambient_temperature: t_s, // arbitrary: the surface equilibrium does not depend on it
        ambient_vapor: vec![0.0, 0.0], // dry air, no fuel far away
        reference_weight: 1.0 / 3.0,              // 1/3 rule (physics notes A.5); irrelevant here
        correlation: TransferCorrelation::Clift, // irrelevant here
        non_equilibrium: false,
        extra_heat: Default::default(),
        drag: Default::default(),
        activity: crate::props::activity::Activity::ideal(2), // Raoult's law, as the worked check
    };
    let mut film = Film::new(setup);
    let x = [0.5, 0.5]; // equimolar liquid
    let latent: Vec<f64> = comps.iter().map(|c| c.latent_heat(t_s)).collect();
    // Diameter 50 µm and zero slip are arbitrary: X_s, Y_s, B_M and eps do not depend on them.
    let r = film.evaluate(&x, t_s, 50e-6, 0.0, &latent, None);
    let eps: Vec<f64> = film.species_rate.iter().map(|m| m / r.evaporation_rate).collect();
    // (quantity, value from the library, expected value from physics notes A.7)
    let items = [
        ("X_s n-heptane", film.surface_mole[0], 0.0329),
        ("X_s n-decane", film.surface_mole[1], 0.00102),
        ("Y_s n-heptane", film.surface_mass[0], 0.1050),
        ("Y_s n-decane", film.surface_mass[1], 0.00463),
        ("B_M", r.spalding_mass, 0.1232),
        ("eps n-heptane", eps[0], 0.958),
        ("eps n-decane", eps[1], 0.042),
    ];
    items
        .iter()
        .map(|(name, value, expected)| {
            let check = format!("Raoult surface of equimolar n-heptane/n-decane at 300 K, 101.325 kPa, dry air: {name} = {value:.5} (expected {expected})");
            CheckResult::relative(GROUP_MIXTURE, check, source, relative_error(*value, *expected), TOL_RAOULT_SURFACE)
        })
        .collect()
}

/// (b) The "ASTM D7152 blending-index method": Refutas viscosity blending numbers (Maples 2000),
/// VBN = 14.534 ln(ln(ν + 0.8)) + 10.975 with ν in mm²/s, blended by mass fraction and inverted.
///
/// Hand example (every step by hand, 5–6 digits):
/// blend of 30 % (mass) of a 1.2 mm²/s, 50 % of a 3.5 mm²/s and 20 % of a 12.0 mm²/s liquid, all at the same T.
/// - 1.2: ln(2.0) = 0.693147, ln(0.693147) = −0.366513, ×14.534 = −5.32690, VBN = 5.64810
/// - 3.5: ln(4.3) = 1.458615, ln(1.458615) = 0.377487, ×14.534 = 5.48640, VBN = 16.46140
/// - 12.0: ln(12.8) = 2.549445, ln(2.549445) = 0.935876, ×14.534 = 13.60202, VBN = 24.57702
/// - blend: 0.3·5.64810 + 0.5·16.46140 + 0.2·24.57702 = 1.69443 + 8.23070 + 4.91540 = 14.84053
/// - invert: (14.84053 − 10.975)/14.534 = 0.265965; exp → 1.304689; exp → 3.686544; − 0.8 → ν = 2.88654 mm²/s
///
/// Plus a consistency check of `kinematic_viscosity_refutas` on library components (equal masses of
/// n-heptane and n-dodecane at 293.15 K) against the same three steps applied to the components' own ν.
fn refutas_checks(lib: &Library) -> Vec<CheckResult> {
    let source = "hand calculation with the Refutas equations (Maples 2000), shown in src/checks/properties.rs";
    let mut out = vec![];
    let parts = [(0.30, 1.2), (0.50, 3.5), (0.20, 12.0)]; // (mass fraction, ν mm²/s): the hand example
    let expected_vbn = [5.64810, 16.46140, 24.57702]; // hand values above
    for ((_, nu), vbn_hand) in parts.iter().zip(expected_vbn) {
        let vbn = liquid::refutas_blending_number(*nu);
        // tolerance 1e-4: the hand arithmetic above is carried to 5–6 significant digits
        out.push(CheckResult::absolute(GROUP_MIXTURE, format!("Refutas blending number of {nu} mm²/s: {vbn:.5} (hand {vbn_hand})"), source, (vbn - vbn_hand).abs(), 1e-4, "(VBN units)"));
    }
    let vbn_blend: f64 = parts.iter().map(|(w, nu)| w * liquid::refutas_blending_number(*nu)).sum();
    let nu_blend = liquid::refutas_viscosity(vbn_blend);
    out.push(CheckResult::absolute(
        GROUP_MIXTURE,
        format!("ASTM D7152 blending-index method (Refutas), 30/50/20 % mass of 1.2/3.5/12.0 mm²/s: ν = {nu_blend:.5} mm²/s (hand 2.88654)"),
        source,
        (nu_blend - 2.88654).abs(), // hand value above
        1e-4,                       // hand arithmetic carried to 5–6 digits
        "mm²/s",
    ));
    // consistency of the mixture function with the same formula on the components' own ν
    if let (Some(c7), Some(c12)) = (lib.component("n-heptane"), lib.component("n-dodecane")) {
        let comps = vec![c7.clone(), c12.clone()];
        let w = [0.5, 0.5]; // arbitrary blend
        let t = 293.15; // K, arbitrary (20 °C)
        let nu_mix = liquid::kinematic_viscosity_refutas(&comps, &w, t) * 1e6;
        let vbn: f64 = comps.iter().zip(w).map(|(c, w)| w * liquid::refutas_blending_number(c.liquid_viscosity(t) / c.liquid_density(t) * 1e6)).sum();
        let nu_hand = liquid::refutas_viscosity(vbn);
        out.push(CheckResult {
            group: GROUP_MIXTURE.into(),
            check: format!("Refutas blend of library components (50/50 % mass n-heptane/n-dodecane, 293.15 K): ν = {nu_mix:.5} mm²/s equals the three steps on the components' own ν"),
            source: "identity (same formula, mass fractions)".into(),
            tolerance: format!("{TOL_IDENTITY:.0e} relative"),
            achieved: format!("{:.1e}", relative_error(nu_mix, nu_hand)),
            passed: relative_error(nu_mix, nu_hand) <= TOL_IDENTITY,
        });
    }
    out
}

/// (c) Fuller diffusion coefficients (with Blanc's law for air) against validation/cantera/diffusion.csv
/// (Chapman–Enskog, Lennard-Jones parameters of the reference viscosity correlations), per fuel species
/// and gas (N2, air) over all temperatures and pressures of the table. Cantera's air is N2 0.79 / O2 0.21;
/// ours is N2 0.7812 / O2 0.2096 / Ar 0.0092 (src/props/gas.rs) — a difference far below the tolerance.
fn diffusion_checks(lib: &Library) -> Vec<CheckResult> {
    let table = Table::parse(CANTERA_DIFFUSION);
    let source = format!("{} Chapman–Enskog (validation/cantera/diffusion.csv; LJ parameters per species in its header)", table.library());
    let gases = [("N2", AmbientGas::parse(lib, "n2")), ("air", AmbientGas::air(lib))];
    let (cs, cg, ct, cp, cd) = (table.column("species"), table.column("gas"), table.column("temperature_K"), table.column("pressure_Pa"), table.column("diffusion_m2_s"));
    let mut species: Vec<String> = vec![];
    for row in &table.rows {
        let s = table.text(row, cs).to_string();
        if !s.is_empty() && !species.contains(&s) {
            species.push(s);
        }
    }
    let mut out = vec![];
    for s in &species {
        let Some(c) = lib.component(s) else {
            out.push(failed(GROUP_MIXTURE, format!("{s} vapour diffusion: component present in the library"), &source, "missing from the library".into()));
            continue;
        };
        for (gas_name, gas) in &gases {
            let gas = match gas {
                Ok(g) => g,
                Err(e) => {
                    out.push(failed(GROUP_MIXTURE, format!("{s} vapour diffusion in {gas_name}"), &source, e.to_string()));
                    continue;
                }
            };
            let mut worst = Worst::new();
            let mut p_lo = f64::INFINITY;
            let mut p_hi = 0.0f64;
            for row in table.rows.iter().filter(|r| table.text(r, cs) == s && table.text(r, cg) == *gas_name) {
                let (Some(t), Some(p), Some(d_ref)) = (table.number(row, ct), table.number(row, cp), table.number(row, cd)) else { continue };
                worst.add(t, relative_error(vapor_diffusion_coefficient(c, gas, t, p), d_ref));
                p_lo = p_lo.min(p);
                p_hi = p_hi.max(p);
            }
            if worst.points == 0 {
                continue;
            }
            let check = format!(
                "{s} vapour diffusion coefficient in {gas_name} (Fuller), {:.0}–{:.0} K, {}–{} MPa ({} points, max at {:.0} K)",
                worst.t_lo,
                worst.t_hi,
                fmt_sig(p_lo / 1e6),
                fmt_sig(p_hi / 1e6),
                worst.points,
                worst.temperature
            );
            out.push(mark_known(CheckResult::relative(GROUP_MIXTURE, check, &source, worst.error, TOL_DIFFUSION), s, "vapor-diffusion"));
        }
    }
    out
}

/// (d) Identities: a one-component mixture (and the same component split in two parts) equals the pure
/// component for every liquid property of `props::liquid::state`; mass ↔ mole ↔ volume fractions of a
/// many-component fuel survive round trips; fractions sum to 1.
fn identity_checks(lib: &Library) -> Vec<CheckResult> {
    let source = "identity (exact up to round-off)";
    let mut out = vec![];
    // One component of each kind of data (n-alkanes, aromatic, dicycloalkane, diaromatic, oxygenate) at
    // temperatures across the liquid range; the identity must hold for any choice.
    let ids = ["n-heptane", "n-dodecane", "toluene", "trans-decalin", "1-methylnaphthalene", "ethanol"];
    let temperatures = [260.0, 300.0, 350.0, 420.0]; // K
    let mut worst_single = 0.0f64;
    let mut worst_split = 0.0f64;
    let mut n = 0;
    for id in ids {
        let Some(c) = lib.component(id) else {
            out.push(failed(GROUP_MIXTURE, format!("one-component mixture of {id}"), source, "missing from the library".into()));
            continue;
        };
        for t in temperatures {
            let pure = [
                c.vapor_pressure(t),
                c.liquid_density(t),
                c.latent_heat(t),
                c.liquid_heat_capacity(t),
                c.liquid_viscosity(t),
                c.liquid_viscosity(t) / c.liquid_density(t),
                c.liquid_conductivity(t),
                c.surface_tension(t),
            ];
            let fields = |s: &liquid::LiquidState| {
                [s.vapor_pressure_Pa, s.density_kg_m3, s.latent_heat_J_kg, s.cp_J_kgK, s.viscosity_Pa_s, s.kinematic_viscosity_m2_s, s.conductivity_W_mK, s.surface_tension_N_m]
            };
            let single = liquid::state(std::slice::from_ref(c), &[1.0], t);
            let split = liquid::state(&[c.clone(), c.clone()], &[0.3, 0.7], t); // arbitrary split
            for ((p, a), b) in pure.iter().zip(fields(&single)).zip(fields(&split)) {
                worst_single = worst_single.max(relative_error(a, *p));
                worst_split = worst_split.max(relative_error(b, *p));
            }
            n += 1;
        }
    }
    let props = "vapour pressure, density, latent heat, cp, viscosity, kinematic viscosity, conductivity, surface tension";
    out.push(identity(format!("one-component mixture equals the pure component ({props}; {} components × 4 temperatures, {n} states)", ids.len()), source, worst_single));
    out.push(identity(format!("a component split into two parts (30/70 % mass) equals the pure component (same properties, {n} states)"), source, worst_split));

    // Fraction round trips on a many-component fuel (demo-wide: 25 components, given on a volume basis).
    let fuel = match lib.fuels.get("demo-wide").map(|(origin, text)| Fuel::parse(text, origin, lib)) {
        Some(Ok(f)) => f,
        Some(Err(e)) => {
            out.push(failed(GROUP_MIXTURE, "fraction round trips on demo-wide".into(), source, e.to_string()));
            return out;
        }
        None => {
            out.push(failed(GROUP_MIXTURE, "fraction round trips on demo-wide".into(), source, "fuel file demo-wide missing from the library".into()));
            return out;
        }
    };
    let w = fuel.mass_fractions.clone();
    let comps = fuel.components.clone();
    let max_diff = |a: &[f64], b: &[f64]| a.iter().zip(b).map(|(x, y)| relative_error(*x, *y)).fold(0.0f64, f64::max);
    let x = fuel.mole_fractions();
    let w_back = liquid::mole_to_mass(&comps, &x);
    out.push(identity(format!("mass → mole → mass fractions of demo-wide ({} components)", comps.len()), source, max_diff(&w_back, &w)));
    let from_mole = Fuel::from_fractions("round-trip", comps.clone(), &x, Basis::Mole).map(|f| max_diff(&f.mass_fractions, &w)).unwrap_or(f64::INFINITY);
    out.push(identity(format!("mole fractions → fuel (mole basis) → mass fractions of demo-wide ({} components)", comps.len()), source, from_mole));
    let v = fuel.volume_fractions();
    let from_volume = Fuel::from_fractions("round-trip", comps.clone(), &v, Basis::Volume).map(|f| max_diff(&f.mass_fractions, &w)).unwrap_or(f64::INFINITY);
    out.push(identity(format!("volume fractions (15 °C) → fuel (volume basis) → mass fractions of demo-wide ({} components)", comps.len()), source, from_volume));
    let sums = [w.iter().sum::<f64>(), x.iter().sum::<f64>(), v.iter().sum::<f64>()];
    let sum_err = sums.iter().map(|s| (s - 1.0).abs()).fold(0.0f64, f64::max);
    out.push(identity("mass, mole and volume fractions of demo-wide each sum to 1".into(), source, sum_err));
    let w_mean = liquid::molar_mass(&comps, &x);
    out.push(identity("mean molar mass of demo-wide from mole fractions equals 1 / Σ (w_i / W_i)".into(), source, relative_error(w_mean, fuel.molar_mass())));
    out
}

fn identity(check: String, source: &str, error: f64) -> CheckResult {
    CheckResult {
        group: GROUP_MIXTURE.into(),
        check,
        source: source.into(),
        tolerance: format!("{TOL_IDENTITY:.0e} relative"),
        achieved: if error.is_finite() { format!("{error:.1e}") } else { "non-finite".into() },
        passed: error <= TOL_IDENTITY,
    }
}

/// Ideal-gas cp of n-dodecane over 300–1500 K against the published NASA 7 polynomial in
/// validation/nasa7/n-dodecane_cp.csv (group-additivity thermo data of a published combustion mechanism,
/// independent of the Poling et al. Appendix A polynomial that feeds the library, which ends at 1000 K):
/// checks the Wilhoit continuation above 1000 K. Tolerance [`TOL_IDEAL_GAS_CP_HIGH`].
pub fn high_temperature_cp_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_COOLPROP, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(NASA7_DODECANE_CP);
    let source = format!("published NASA 7 polynomial ({}; validation/nasa7/n-dodecane_cp.csv)", table.comment("source").unwrap_or("source not named"));
    let Some(c) = lib.component("n-dodecane") else {
        return vec![failed(GROUP_COOLPROP, "n-dodecane: component present in the library".into(), &source, "missing".into())];
    };
    let (t_col, v_col) = (table.column("temperature_K"), table.column("ideal_gas_cp_J_kgK"));
    let mut inside = Worst::new();
    let mut beyond = Worst::new();
    for row in &table.rows {
        let (Some(t), Some(reference)) = (table.number(row, t_col), table.number(row, v_col)) else { continue };
        let e = relative_error(c.ideal_gas_heat_capacity(t), reference);
        if t > c.ideal_gas_heat_capacity.t_max {
            beyond.add(t, e);
        } else {
            inside.add(t, e);
        }
    }
    let mut all = inside;
    if beyond.points > 0 {
        for (t, e) in [(beyond.temperature, beyond.error)] {
            if e > all.error || all.points == 0 {
                all.error = e;
                all.temperature = t;
            }
        }
        all.points += beyond.points;
        all.t_hi = all.t_hi.max(beyond.t_hi);
        all.t_lo = all.t_lo.min(beyond.t_lo);
    }
    let check = format!(
        "n-dodecane ideal-gas heat capacity, {:.0}–{:.0} K ({} points, max at {:.0} K); inside the published polynomial's range (to {:.0} K) max {}, above it (Wilhoit continuation) max {}",
        all.t_lo, all.t_hi, all.points, all.temperature, c.ideal_gas_heat_capacity.t_max, pct(inside.error), pct(beyond.error)
    );
    vec![CheckResult::relative(GROUP_COOLPROP, check, &source, all.error, TOL_IDEAL_GAS_CP_HIGH)]
}

/// Every property check of this module, in report order.
pub fn all() -> Vec<CheckResult> {
    let mut v = coolprop_checks();
    v.extend(high_temperature_cp_checks());
    v.extend(handbook_checks());
    v.extend(density_viscosity_checks());
    v.extend(mixture_checks());
    v
}
