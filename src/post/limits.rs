//! Property windows ("limits files") and checking indicators against them.
//!
//! A limits file is TOML:
//! ```toml
//! title = "..."
//! description = "..."          # optional
//!
//! [limits.flash_point_K]      # an indicator key (see `INDICATOR_KEYS`)
//! label = "Flash point"
//! min = 311.15                # SI number, or for temperatures/pressures a string with a unit ("38degC")
//! unit = "K"                  # optional; if given it must be the key's SI unit (a guard against mm²/s etc.)
//! source = "standard, table/clause"
//! note = "..."                # optional
//! ```
//! Every window needs a `source` and at least one of `min`/`max`.

use std::path::Path;

use serde::Serialize;
use thiserror::Error;

use crate::data::suggest;
use crate::units::{self, Quantity};

use super::indicators::{Indicators, INDICATOR_KEYS};

/// Caution that goes with every indicator and every limits check.
pub const CAUTION: &str = "These indicators are model estimates for screening only, not certification: a fuel conforms to a \
specification only through the standard test methods on real samples. Handling, storage, flash-point safety and fuel \
qualification follow the governing standards, local codes and licensed practice.";

/// The aviation turbine fuel (Jet A-1) screening windows shipped in `limits/aviation-turbine-fuel.toml`.
pub const AVIATION_TURBINE_FUEL_TOML: &str = include_str!("../../limits/aviation-turbine-fuel.toml");

/// Errors raised while reading a limits file; each displays as one line naming file, field and value.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum LimitsError {
    /// The file could not be read.
    #[error("{file}: {message}")]
    Io {
        /// File name.
        file: String,
        /// System message.
        message: String,
    },
    /// The file is not valid TOML.
    #[error("{file}: not valid TOML: {message}")]
    Parse {
        /// File name.
        file: String,
        /// Parser message.
        message: String,
    },
    /// A window names an indicator that does not exist.
    #[error("{file}: limits.{key}: unknown indicator key '{key}'{hint}")]
    UnknownKey {
        /// File name.
        file: String,
        /// The key given.
        key: String,
        /// "did you mean" hint with leading separator, or empty.
        hint: String,
    },
    /// A table has a field this format does not know.
    #[error("{file}: {field}: unknown field (known: {known}){hint}")]
    UnknownField {
        /// File name.
        file: String,
        /// Full field path.
        field: String,
        /// Known field names.
        known: &'static str,
        /// "did you mean" hint with leading separator, or empty.
        hint: String,
    },
    /// A field has an unacceptable value.
    #[error("{file}: {field} = {value}: {message}")]
    InvalidValue {
        /// File name.
        file: String,
        /// Full field path.
        field: String,
        /// The value as written.
        value: String,
        /// What is wrong.
        message: String,
    },
    /// A required field is missing.
    #[error("{file}: {field}: {message}")]
    Missing {
        /// File name.
        file: String,
        /// Full field path.
        field: String,
        /// What is needed.
        message: String,
    },
}

/// One property window.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LimitWindow {
    /// Indicator key.
    pub key: String,
    /// Human label.
    pub label: String,
    /// Lower bound, SI \[unit of the key\].
    pub min: Option<f64>,
    /// Upper bound, SI \[unit of the key\].
    pub max: Option<f64>,
    /// SI unit of the key.
    pub unit: &'static str,
    /// Standard and clause the window comes from.
    pub source: String,
    /// Optional remark.
    pub note: Option<String>,
}

/// A set of windows read from a limits file.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Limits {
    /// Title of the set.
    pub title: String,
    /// Description.
    pub description: String,
    /// Where it was read from.
    pub origin: String,
    /// Windows, in the order of `INDICATOR_KEYS`.
    pub windows: Vec<LimitWindow>,
}

/// Result of checking one window.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum LimitStatus {
    /// Inside the window.
    In,
    /// Outside the window.
    Out,
    /// The indicator could not be estimated.
    Unknown,
}

/// One window checked against one set of indicators.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LimitFlag {
    /// Indicator key.
    pub key: String,
    /// Human label.
    pub label: String,
    /// Indicator value \[unit\].
    pub value: Option<f64>,
    /// Lower bound \[unit\].
    pub min: Option<f64>,
    /// Upper bound \[unit\].
    pub max: Option<f64>,
    /// SI unit.
    pub unit: &'static str,
    /// In, out or unknown.
    pub status: LimitStatus,
    /// Source of the window.
    pub source: String,
    /// One-line explanation.
    pub message: String,
}

const WINDOW_FIELDS: &str = "label, min, max, unit, source, note";
const TOP_FIELDS: &str = "title, description, limits";

fn value_text(v: &toml::Value) -> String {
    match v {
        toml::Value::String(s) => format!("{s:?}"),
        other => other.to_string(),
    }
}

fn quantity_of(unit: &str) -> Option<Quantity> {
    match unit {
        "K" => Some(Quantity::Temperature),
        "Pa" => Some(Quantity::Pressure),
        _ => None,
    }
}

impl Limits {
    /// The shipped aviation turbine fuel windows.
    pub fn aviation_turbine_fuel() -> Self {
        Self::parse(AVIATION_TURBINE_FUEL_TOML, "limits/aviation-turbine-fuel.toml").expect("shipped limits file parses")
    }

    /// Read a limits file from disk.
    pub fn load(path: &Path) -> Result<Self, LimitsError> {
        let file = path.display().to_string();
        let bytes = crate::data::read_input_file(path).map_err(|message| LimitsError::Io { file: file.clone(), message })?;
        let text = String::from_utf8(bytes).map_err(|_| LimitsError::Parse { file: file.clone(), message: "file is not UTF-8 text".into() })?;
        Self::parse(&text, &file)
    }

    /// Parse a limits file's text; `file` names it in messages.
    pub fn parse(text: &str, file: &str) -> Result<Self, LimitsError> {
        let f = || file.to_string();
        let table: toml::Table = toml::from_str(text).map_err(|e| LimitsError::Parse { file: f(), message: crate::data::toml_error_at(&e, text) })?;
        for k in table.keys() {
            if !["title", "description", "limits"].contains(&k.as_str()) {
                return Err(LimitsError::UnknownField { file: f(), field: k.clone(), known: TOP_FIELDS, hint: suggest(k, ["title", "description", "limits"].into_iter()) });
            }
        }
        let text_field = |key: &str| -> Result<Option<String>, LimitsError> {
            match table.get(key) {
                None => Ok(None),
                Some(toml::Value::String(s)) => Ok(Some(s.clone())),
                Some(v) => Err(LimitsError::InvalidValue { file: f(), field: key.into(), value: value_text(v), message: "must be a string".into() }),
            }
        };
        let title = text_field("title")?.ok_or_else(|| LimitsError::Missing { file: f(), field: "title".into(), message: "a limits file needs a title".into() })?;
        let description = text_field("description")?.unwrap_or_default();
        let limits = match table.get("limits") {
            Some(toml::Value::Table(t)) => t,
            Some(v) => return Err(LimitsError::InvalidValue { file: f(), field: "limits".into(), value: value_text(v), message: "must be a table of [limits.<indicator key>] sections".into() }),
            None => return Err(LimitsError::Missing { file: f(), field: "limits".into(), message: "no [limits.<indicator key>] sections".into() }),
        };
        if title.trim().is_empty() {
            return Err(LimitsError::InvalidValue { file: f(), field: "title".into(), value: "\"\"".into(), message: "must not be empty".into() });
        }
        if limits.is_empty() {
            return Err(LimitsError::Missing { file: f(), field: "limits".into(), message: "is empty: add [limits.<indicator key>] sections".into() });
        }
        let mut windows = vec![];
        for (key, v) in limits {
            let Some(unit) = Indicators::unit(key) else {
                return Err(LimitsError::UnknownKey { file: f(), key: key.clone(), hint: suggest(key, INDICATOR_KEYS.iter().map(|(k, _)| *k)) });
            };
            let path = format!("limits.{key}");
            let toml::Value::Table(w) = v else {
                return Err(LimitsError::InvalidValue { file: f(), field: path, value: value_text(v), message: "must be a table with min/max/source".into() });
            };
            for field in w.keys() {
                if !["label", "min", "max", "unit", "source", "note"].contains(&field.as_str()) {
                    return Err(LimitsError::UnknownField {
                        file: f(),
                        field: format!("{path}.{field}"),
                        known: WINDOW_FIELDS,
                        hint: suggest(field, ["label", "min", "max", "unit", "source", "note"].into_iter()),
                    });
                }
            }
            let string = |name: &str| -> Result<Option<String>, LimitsError> {
                match w.get(name) {
                    None => Ok(None),
                    Some(toml::Value::String(s)) => Ok(Some(s.clone())),
                    Some(v) => Err(LimitsError::InvalidValue { file: f(), field: format!("{path}.{name}"), value: value_text(v), message: "must be a string".into() }),
                }
            };
            if let Some(u) = string("unit")? {
                if u != unit {
                    return Err(LimitsError::InvalidValue {
                        file: f(),
                        field: format!("{path}.unit"),
                        value: format!("{u:?}"),
                        message: format!("bounds are SI numbers in {unit} for this key"),
                    });
                }
            }
            let number = |name: &str| -> Result<Option<f64>, LimitsError> {
                let field = format!("{path}.{name}");
                let bad = |v: &toml::Value, message: String| LimitsError::InvalidValue { file: f(), field: field.clone(), value: value_text(v), message };
                let x = match w.get(name) {
                    None => return Ok(None),
                    Some(toml::Value::Float(x)) => *x,
                    Some(toml::Value::Integer(i)) => *i as f64,
                    Some(v @ toml::Value::String(s)) => match quantity_of(unit) {
                        Some(q) => units::parse(s, q).map_err(|e| bad(v, e.to_string()))?,
                        None => return Err(bad(v, format!("expected a plain number in SI units ({unit})"))),
                    },
                    Some(v) => return Err(bad(v, format!("expected a number in SI units ({unit})"))),
                };
                if !x.is_finite() {
                    return Err(bad(&w[name], "must be a finite number".into()));
                }
                let (lo, hi, hint) = plausible_bounds(key, unit);
                if !(lo..=hi).contains(&x) {
                    let u = if unit == "-" { String::new() } else { format!(" {unit}") };
                    return Err(bad(&w[name], format!("{x}{u} is outside the plausible {lo}–{hi}{u} for this key{hint}")));
                }
                Ok(Some(x))
            };
            let min = number("min")?;
            let max = number("max")?;
            if min.is_none() && max.is_none() {
                return Err(LimitsError::Missing { file: f(), field: path, message: "needs 'min', 'max' or both".into() });
            }
            if let (Some(a), Some(b)) = (min, max) {
                if a > b {
                    return Err(LimitsError::InvalidValue { file: f(), field: format!("{path}.min"), value: a.to_string(), message: format!("is above max = {b}") });
                }
            }
            let source = string("source")?.ok_or_else(|| LimitsError::Missing { file: f(), field: format!("{path}.source"), message: "every window needs a source (standard and clause)".into() })?;
            if source.trim().is_empty() {
                return Err(LimitsError::InvalidValue { file: f(), field: format!("{path}.source"), value: "\"\"".into(), message: "must name the standard and clause".into() });
            }
            windows.push(LimitWindow { key: key.clone(), label: string("label")?.unwrap_or_else(|| key.clone()), min, max, unit, source, note: string("note")? });
        }
        // toml tables do not keep file order: use the indicator table order
        windows.sort_by_key(|w| INDICATOR_KEYS.iter().position(|(k, _)| *k == w.key));
        Ok(Limits { title, description, origin: file.to_string(), windows })
    }

    /// Check each window against `ind`.
    pub fn check(&self, ind: &Indicators) -> Vec<LimitFlag> {
        self.windows
            .iter()
            .map(|w| {
                let value = ind.get(&w.key).flatten();
                let (status, message) = match value {
                    None => {
                        let why = ind.notes.get(w.key.as_str()).cloned().unwrap_or_else(|| "not computed".into());
                        (LimitStatus::Unknown, format!("{}: unknown ({why})", w.label))
                    }
                    Some(v) => {
                        if let Some(m) = w.min.filter(|m| v < *m) {
                            (LimitStatus::Out, format!("{}: {} {} is below the minimum {} {}", w.label, fmt(v), w.unit, fmt(m), w.unit))
                        } else if let Some(m) = w.max.filter(|m| v > *m) {
                            (LimitStatus::Out, format!("{}: {} {} is above the maximum {} {}", w.label, fmt(v), w.unit, fmt(m), w.unit))
                        } else {
                            (LimitStatus::In, format!("{}: {} {} is within the window", w.label, fmt(v), w.unit))
                        }
                    }
                };
                LimitFlag { key: w.key.clone(), label: w.label.clone(), value, min: w.min, max: w.max, unit: w.unit, status, source: w.source.clone(), message }
            })
            .collect()
    }
}

/// Broad plausible bounds of a window value of `key` (in its SI `unit`), with a hint at the usual unit slip:
/// they catch percentages written for fractions, mm²/s or g/cm³ numbers, temperatures below absolute zero.
fn plausible_bounds(key: &str, unit: &str) -> (f64, f64, &'static str) {
    match (key, unit) {
        (_, "K") => (1.0, 2000.0, " (temperatures are in K; \"38degC\" style strings are accepted)"),
        (_, "Pa") => (0.0, 1e8, " (pressures are in Pa)"),
        (_, "kg/m3") => (100.0, 3000.0, " (densities are in kg/m3, not g/cm3)"),
        (_, "m2/s") => (0.0, 0.01, " (kinematic viscosities are in m2/s: 8 mm2/s is 8.0e-6)"),
        (_, "N/m") => (0.0, 1.0, " (surface tensions are in N/m: 25 mN/m is 0.025)"),
        (_, "J/kg") => (1e6, 2e8, " (heating values are in J/kg: 42.8 MJ/kg is 42.8e6)"),
        (_, "J/m3") => (1e8, 1e12, " (heating values per volume are in J/m3)"),
        (_, "kg/mol") => (0.001, 2.0, " (molar masses are in kg/mol)"),
        ("dcn", _) => (0.0, 150.0, ""),
        ("hc_ratio", _) => (0.0, 10.0, " (molar H/C ratio)"),
        _ => (0.0, 1.0, " (fractions are between 0 and 1: 25 % is 0.25)"),
    }
}

fn fmt(v: f64) -> String {
    if v != 0.0 && (v.abs() < 1e-3 || v.abs() >= 1e6) {
        format!("{v:.4e}")
    } else {
        format!("{v:.4}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;
    use crate::post::indicators::{indicators, IndicatorOptions};

    #[test]
    fn shipped_file_parses_with_the_published_numbers() {
        let l = Limits::aviation_turbine_fuel();
        let get = |k: &str| l.windows.iter().find(|w| w.key == k).unwrap().clone();
        assert_eq!(get("density_15C_kg_m3").min, Some(775.0));
        assert_eq!(get("density_15C_kg_m3").max, Some(840.0));
        assert!((get("flash_point_K").min.unwrap() - 311.15).abs() < 1e-9);
        assert!((get("freezing_point_K").max.unwrap() - 226.15).abs() < 1e-9);
        assert!((get("kinematic_viscosity_minus20C_m2_s").max.unwrap() - 8.0e-6).abs() < 1e-15);
        assert_eq!(get("lhv_J_kg").min, Some(42.8e6));
        assert!((get("t10_K").max.unwrap() - 478.15).abs() < 1e-9);
        assert!((get("final_boiling_point_K").max.unwrap() - 573.15).abs() < 1e-9);
        assert_eq!(get("aromatics_volume_fraction").max, Some(0.25));
        assert!(l.windows.iter().all(|w| !w.source.is_empty()));
    }

    #[test]
    fn errors_are_one_line_and_name_file_field_value() {
        let e = Limits::parse("title = \"x\"\n[limits.flash_pont_K]\nmin = 300\nsource = \"s\"\n", "my.toml").unwrap_err();
        let s = e.to_string();
        assert!(s.contains("my.toml") && s.contains("flash_pont_K") && s.contains("did you mean 'flash_point_K'"), "{s}");
        let e = Limits::parse("title = \"x\"\n[limits.flash_point_K]\nmin = \"38 furlongs\"\nsource = \"s\"\n", "my.toml").unwrap_err();
        let s = e.to_string();
        assert!(s.contains("limits.flash_point_K.min") && s.contains("38 furlongs") && !s.contains('\n'), "{s}");
        let e = Limits::parse("title = \"x\"\n[limits.kinematic_viscosity_minus20C_m2_s]\nmax = \"8 mm2/s\"\nsource = \"s\"\n", "my.toml").unwrap_err();
        assert!(e.to_string().contains("SI units (m2/s)"), "{e}");
        let e = Limits::parse("title = \"x\"\n[limits.dcn]\nmin = 40\n", "my.toml").unwrap_err();
        assert!(e.to_string().contains("limits.dcn.source"), "{e}");
        let e = Limits::parse("title = \"x\"\n[limits.dcn]\nminn = 40\nsource = \"s\"\n", "my.toml").unwrap_err();
        assert!(e.to_string().contains("did you mean 'min'"), "{e}");
        let e = Limits::parse("title = \"x\"\n[limits.dcn]\nmin = 40\nunit = \"mm2/s\"\nsource = \"s\"\n", "my.toml").unwrap_err();
        assert!(e.to_string().contains("limits.dcn.unit"), "{e}");
        assert!(Limits::parse("title = [", "my.toml").unwrap_err().to_string().starts_with("my.toml: not valid TOML"));
        // a temperature with a unit is accepted
        let l = Limits::parse("title = \"x\"\n[limits.flash_point_K]\nmin = \"38degC\"\nsource = \"s\"\n", "my.toml").unwrap();
        assert!((l.windows[0].min.unwrap() - 311.15).abs() < 1e-9);
    }

    #[test]
    fn check_flags_in_out_unknown() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("demo-wide", &lib).unwrap();
        let mut ind = indicators(&fuel.components, &fuel.mass_fractions, &IndicatorOptions::default()).unwrap();
        let l = Limits::parse(
            "title = \"t\"\n[limits.density_15C_kg_m3]\nmin = 900\nmax = 1000\nsource = \"s\"\n[limits.dcn]\nmin = 0\nsource = \"s\"\n[limits.freezing_point_K]\nmax = 1000\nsource = \"s\"\n",
            "t.toml",
        )
        .unwrap();
        ind.freezing_point_K = None;
        let flags = l.check(&ind);
        let status = |k: &str| flags.iter().find(|f| f.key == k).unwrap().status;
        assert_eq!(status("density_15C_kg_m3"), LimitStatus::Out);
        assert_eq!(status("dcn"), LimitStatus::In);
        assert_eq!(status("freezing_point_K"), LimitStatus::Unknown);
        assert_eq!(flags[0].key, "density_15C_kg_m3");
    }
}
