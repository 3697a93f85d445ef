//! Fuels from lab data: a class × carbon-number table ([`classes`]), a distillation curve with a density
//! ([`distillation`]), or one molecule given by its structural groups ([`estimate`]). Each builder returns
//! the text of an ordinary fuel (or component) file plus the parsed [`Fuel`] and a report; components that
//! are not in the library are written into the fuel file as `[[component]]` tables, so every other command
//! reads the result with no extra flags. Methods, sources and formats: docs/fuel-from-lab-data.md.
//!
//! This module uses the data and props layers only. The optional calibration of distillation cuts needs a
//! simulated distillation, which lives in a higher layer; the caller passes it in as a [`CurveSimulator`].

pub mod classes;
pub mod curve;
pub mod distillation;
pub mod estimate;
pub mod petroleum;

use std::fmt::Write as _;

use thiserror::Error;

use crate::data::{DataError, HydrocarbonClass, Library};

use super::{Fuel, FuelError};

/// Errors raised while building a fuel or component from lab data.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum BuildError {
    /// The input (file, field, value) is not acceptable.
    #[error("{context}: {message}")]
    Input {
        /// File and field.
        context: String,
        /// What is wrong, with the value.
        message: String,
    },
    /// A data-layer error.
    #[error(transparent)]
    Data(#[from] DataError),
    /// The built fuel could not be read back (a bug, or a value outside the loader's limits).
    #[error(transparent)]
    Fuel(#[from] FuelError),
}

/// Build a [`BuildError::Input`].
/// Read a lab-data file and hand its text to `parse_csv` (for a `.csv` file) or `parse_toml` (anything else),
/// each called with (text, file as shown, file stem as the default fuel name).
pub(crate) fn read_csv_or_toml<T>(
    path: &std::path::Path,
    parse_csv: impl FnOnce(&str, &str, &str) -> Result<T, BuildError>,
    parse_toml: impl FnOnce(&str, &str, &str) -> Result<T, BuildError>,
) -> Result<T, BuildError> {
    let shown = path.display().to_string();
    let bytes = crate::data::read_input_file(path).map_err(|e| input_error(&shown, format!("cannot read: {e}")))?;
    let text = String::from_utf8(bytes).map_err(|_| input_error(&shown, "cannot read: stream did not contain valid UTF-8".to_string()))?;
    let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "fuel".into());
    if path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv")) {
        parse_csv(&text, &shown, &stem)
    } else {
        parse_toml(&text, &shown, &stem)
    }
}

pub(crate) fn input_error(context: impl Into<String>, message: impl Into<String>) -> BuildError {
    // cells and keys echoed from the input may hold line breaks (a quoted CSV field): keep the message one line
    let one_line = |s: String| if s.contains(char::is_control) { s.chars().map(|c| if c.is_control() { ' ' } else { c }).collect() } else { s };
    BuildError::Input { context: one_line(context.into()), message: one_line(message.into()) }
}

/// Simulated distillation used to calibrate distillation cuts: (fuel, evaporated volume fractions in 0..1)
/// → temperatures \[K\] at 1 atm. The CLI and the checks pass `post::indicators::distillation_temperatures`.
pub type CurveSimulator<'a> = dyn Fn(&Fuel, &[f64]) -> Result<Vec<f64>, String> + 'a;

/// A number with its source, as written into a component file.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Value {
    /// Value in SI units.
    pub value: f64,
    /// Source id or `estimated:<method>` marker.
    pub source: String,
    /// Free note naming inputs and caveats.
    pub note: Option<String>,
    /// For cetane numbers: "CN", "DCN" or "estimate".
    pub kind: Option<String>,
    /// Relative uncertainty.
    pub uncertainty: Option<f64>,
}

impl Value {
    /// A value with source and note.
    pub fn new(value: f64, source: &str, note: impl Into<String>) -> Self {
        let note = note.into();
        Value { value, source: source.into(), note: if note.is_empty() { None } else { Some(note) }, kind: None, uncertainty: None }
    }
}

/// An ideal-gas heat capacity polynomial cp = Σ c_k T^k in J/(mol·K) (DIPPR 100 form).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct CpPolynomial {
    /// Coefficients c0..c3 \[J/(mol·K), T in K\].
    pub coefficients: Vec<f64>,
    /// Lowest temperature of use \[K\].
    pub t_min: f64,
    /// Highest temperature of use; held constant above \[K\].
    pub t_max: f64,
    /// Source marker.
    pub source: String,
    /// Note.
    pub note: String,
}

/// Everything needed to write one estimated component file (or `[[component]]` table).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ComponentSpec {
    /// Kebab-case id.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Class.
    pub class: HydrocarbonClass,
    /// Atom counts (C, H, O).
    pub formula: (u32, u32, u32),
    /// Joback groups, if the molecule is given by groups.
    pub joback_groups: Vec<(String, u32)>,
    /// Constants in file order: (key, value).
    pub constants: Vec<(&'static str, Value)>,
    /// Ideal-gas heat capacity polynomial.
    pub ideal_gas_cp: CpPolynomial,
    /// Liquid-viscosity method marker (depends on whether Joback groups are given).
    pub viscosity_source: String,
}

/// Corresponding-states sections written for every estimated component: (section, source marker, what the
/// loader computes). The markers name the methods that src/props/pure.rs applies to a `corresponding-states`
/// section.
const CSP_SECTIONS: [(&str, &str, &str); 8] = [
    ("vapor-pressure", "estimated:ambrose-walton", "Ambrose-Walton (1989) vapour pressure from Tc, pc and the acentric factor"),
    ("liquid-density", "estimated:rackett", "Spencer-Danner modified Rackett density (Z_RA from the rackett-z constant if given, else Yamada-Gunn)"),
    ("latent-heat", "estimated:riedel-watson", "Riedel latent heat at Tb, Watson (exponent 0.38) scaling"),
    ("liquid-heat-capacity", "estimated:rowlinson-bondi", "Rowlinson-Bondi liquid cp from the ideal-gas cp"),
    ("liquid-conductivity", "estimated:sato-riedel", "Sato-Riedel liquid thermal conductivity"),
    ("surface-tension", "estimated:brock-bird", "Brock-Bird surface tension"),
    ("vapor-viscosity", "estimated:chung", "Chung et al. (1988) low-pressure gas viscosity"),
    ("vapor-conductivity", "estimated:chung", "Chung et al. (1984) low-pressure gas conductivity"),
];

/// Quote a string for TOML.
pub(crate) fn toml_str(s: &str) -> String {
    toml::Value::String(s.to_string()).to_string()
}

/// A float in TOML form that reads back bit-identical (always with a '.' or an exponent).
pub(crate) fn toml_f64(v: f64) -> String {
    let s = format!("{v:?}");
    if s.contains('.') || s.contains('e') || s.contains("inf") || s.contains("NaN") {
        s
    } else {
        format!("{s}.0")
    }
}

impl ComponentSpec {
    /// TOML text: a standalone component file (`table = None`) or one `[[component]]` table of a fuel file
    /// (`table = Some("component")`).
    pub fn to_toml(&self, table: Option<&str>) -> String {
        let mut s = String::new();
        let sec = |name: &str| match table {
            Some(t) => format!("[{t}.{name}]"),
            None => format!("[{name}]"),
        };
        if let Some(t) = table {
            let _ = writeln!(s, "[[{t}]]");
        }
        let _ = writeln!(s, "id = {}", toml_str(&self.id));
        let _ = writeln!(s, "name = {}", toml_str(&self.name));
        let _ = writeln!(s, "aliases = []");
        let _ = writeln!(s, "cas = \"none\"");
        let _ = writeln!(s, "class = {}", toml_str(self.class.as_str()));
        let (c, h, o) = self.formula;
        let _ = writeln!(s, "formula = {{ C = {c}, H = {h}, O = {o} }}");
        if !self.joback_groups.is_empty() {
            let g: Vec<String> = self.joback_groups.iter().map(|(k, n)| format!("{k} = {n}")).collect();
            let _ = writeln!(s, "joback-groups = {{ {} }}", g.join(", "));
        }
        let _ = writeln!(s, "\n{}", sec("constants"));
        for (key, v) in &self.constants {
            let mut parts = vec![format!("value = {}", toml_f64(v.value))];
            if let Some(k) = &v.kind {
                parts.push(format!("kind = {}", toml_str(k)));
            }
            parts.push(format!("source = {}", toml_str(&v.source)));
            if let Some(u) = v.uncertainty {
                parts.push(format!("uncertainty = {}", toml_f64(u)));
            }
            if let Some(n) = &v.note {
                parts.push(format!("note = {}", toml_str(n)));
            }
            let _ = writeln!(s, "{key} = {{ {} }}", parts.join(", "));
        }
        for (section, source, what) in CSP_SECTIONS.iter().take(4) {
            write_csp(&mut s, &sec(section), source, what);
        }
        let visc_note = if self.viscosity_source == "estimated:joback-letsou-stiel" {
            "Joback liquid viscosity below Tr 0.70, Letsou-Stiel above Tr 0.76, log-linear blend between"
        } else {
            "Letsou-Stiel above Tr 0.76, Lewis-Squires extrapolation below"
        };
        write_csp(&mut s, &sec("liquid-viscosity"), &self.viscosity_source, visc_note);
        for (section, source, what) in CSP_SECTIONS.iter().skip(4).take(2) {
            write_csp(&mut s, &sec(section), source, what);
        }
        let cp = &self.ideal_gas_cp;
        let coeffs: Vec<String> = cp.coefficients.iter().map(|c| toml_f64(*c)).collect();
        let _ = writeln!(
            s,
            "\n{}\nmodel = \"dippr100\"\ncoefficients = [{}]\nunit = \"J/mol/K\"\nt-min = {}\nt-max = {}\nsource = {}\nnote = {}",
            sec("ideal-gas-heat-capacity"),
            coeffs.join(", "),
            toml_f64(cp.t_min),
            toml_f64(cp.t_max),
            toml_str(&cp.source),
            toml_str(&cp.note)
        );
        for (section, source, what) in CSP_SECTIONS.iter().skip(6) {
            write_csp(&mut s, &sec(section), source, what);
        }
        s
    }

    /// Value of a constant by key.
    pub fn constant(&self, key: &str) -> Option<f64> {
        self.constants.iter().find(|(k, _)| *k == key).map(|(_, v)| v.value)
    }
}

fn write_csp(s: &mut String, header: &str, source: &str, what: &str) {
    let _ = writeln!(s, "\n{header}\nmodel = \"corresponding-states\"\nsource = {}\nnote = {}", toml_str(source), toml_str(what));
}

/// Molar mass of a formula with conventional atomic weights (C 12.011, H 1.008, O 15.999) \[kg/mol\].
pub fn formula_molar_mass(carbon: u32, hydrogen: u32, oxygen: u32) -> f64 {
    12.011e-3 * f64::from(carbon) + 1.008e-3 * f64::from(hydrogen) + 15.999e-3 * f64::from(oxygen)
}

/// Lower heating value of a liquid from its formula and liquid enthalpy of formation at 298.15 K \[J/kg\]
/// (CODATA ΔHf CO2(g) −393.51, H2O(g) −241.826 kJ/mol; water leaves as vapour).
pub fn lhv_from_formation(carbon: u32, hydrogen: u32, liquid_formation_enthalpy: f64, molar_mass: f64) -> f64 {
    let products = f64::from(carbon) * -393.51e3 + f64::from(hydrogen) / 2.0 * -241.826e3;
    -(products - liquid_formation_enthalpy) / molar_mass
}

/// Turn a free name into a kebab-case id (lowercase ASCII letters, digits, single dashes).
pub fn kebab_id(name: &str) -> String {
    let mut out = String::new();
    for ch in name.chars() {
        if ch.is_ascii_alphanumeric() {
            out.push(ch.to_ascii_lowercase());
        } else if !out.ends_with('-') && !out.is_empty() {
            out.push('-');
        }
    }
    out.trim_end_matches('-').to_string()
}

/// One line of a composition: component id and fraction.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct CompositionLine {
    /// Component id (library or embedded).
    pub id: String,
    /// Fraction on the file's basis \[-\].
    pub fraction: f64,
    /// Comment written after the line.
    pub comment: String,
}

/// Text of a fuel file with embedded components.
pub fn fuel_file_text(name: &str, description: &str, header: &[String], basis: &str, composition: &[CompositionLine], embedded: &[ComponentSpec]) -> String {
    let mut s = String::new();
    for h in header {
        for line in h.lines() {
            let _ = writeln!(s, "# {line}");
        }
    }
    let _ = writeln!(s, "name = {}", toml_str(name));
    let _ = writeln!(s, "description = {}", toml_str(description));
    let _ = writeln!(s, "basis = {}\n\n[composition]", toml_str(basis));
    for line in composition {
        let comment = if line.comment.is_empty() { String::new() } else { format!("  # {}", line.comment) };
        let _ = writeln!(s, "{} = {}{comment}", toml_str(&line.id), toml_f64(line.fraction));
    }
    for c in embedded {
        let _ = writeln!(s, "\n# ---------------------------------------------------------------- {}", c.id);
        s.push_str(&c.to_toml(Some("component")));
    }
    s
}

/// A built fuel: the file text, the fuel read back from that text, and the build report.
#[derive(Debug, Clone)]
pub struct BuiltFuel<R> {
    /// Fuel file text (write it as is).
    pub text: String,
    /// The fuel parsed from `text` (exactly what other commands will read).
    pub fuel: Fuel,
    /// What was built and how.
    pub report: R,
}

/// Parse the text of a built fuel file back into a [`Fuel`] (the same code path every command uses).
pub(crate) fn read_back(text: &str, name: &str, lib: &Library) -> Result<Fuel, BuildError> {
    Ok(Fuel::parse(text, &format!("built fuel '{name}'"), lib)?)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn floats_read_back_exactly() {
        for v in [2.0, 1e-7, 0.1 + 0.2, 123456.789, 1e21, -3.5e-12] {
            let t = format!("x = {}", toml_f64(v));
            let back: toml::Table = toml::from_str(&t).unwrap();
            assert_eq!(back["x"].as_float().unwrap().to_bits(), v.to_bits(), "{t}");
        }
    }

    #[test]
    fn ids() {
        assert_eq!(kebab_id("Jet A-1 (batch 7)"), "jet-a-1-batch-7");
        assert_eq!(kebab_id("--x__y--"), "x-y");
    }

    #[test]
    fn lhv_of_n_decane_from_formation_enthalpy() {
        // liquid ΔHf = −300.90 kJ/mol (CRC), as in the library file: 44.237 MJ/kg
        let lhv = lhv_from_formation(10, 22, -300.90e3, formula_molar_mass(10, 22, 0));
        assert!((lhv / 44.237e6 - 1.0).abs() < 1e-4, "{lhv}");
    }
}
