//! Fuels: components with a composition, read from fuel files (mass, mole or volume basis, or blends).
//!
//! A fuel file may define its own components in `[[component]]` tables (same keys as a component file); the
//! composition then refers to them by id like to library components. `dropcut fuel build` writes such files
//! (see [`build`] and docs/fuel-from-lab-data.md).

pub mod build;

use std::collections::BTreeMap;
use std::path::Path;
use std::sync::Arc;

use serde::Deserialize;
use thiserror::Error;

use crate::data::{suggest, toml_error_at, Component, DataError, Library};

/// Errors raised while building a fuel.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum FuelError {
    /// A data-layer error (unknown component, bad file).
    #[error(transparent)]
    Data(#[from] DataError),
    /// A composition problem.
    #[error("{context}: {message}")]
    Composition {
        /// File and field.
        context: String,
        /// What is wrong.
        message: String,
    },
}

/// Basis of the fractions in a fuel file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Basis {
    /// Mass fractions.
    Mass,
    /// Mole fractions.
    Mole,
    /// Liquid volume fractions at 15 °C.
    Volume,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFuel {
    name: Option<String>,
    #[serde(default)]
    description: Option<String>,
    basis: Basis,
    #[serde(default)]
    composition: Option<BTreeMap<String, toml::Value>>,
    #[serde(default)]
    blend: Option<BTreeMap<String, toml::Value>>,
    /// Components defined inside the fuel file (`[[component]]` tables).
    #[serde(default)]
    component: Vec<toml::Table>,
}

/// True when two components are the same apart from the file they were read from.
/// True when some line of `text` starts with one of a fuel or component file's keys or sections (so a syntax
/// error in it may be shown with its line); an environment or key file named by mistake is never echoed.
fn looks_like_fuel_file(text: &str) -> bool {
    const KEYS: [&str; 10] = ["basis", "name", "description", "id", "[composition", "[blend", "[constants", "[[component", "[[composition", "[[blend"];
    text.lines().map(str::trim_start).any(|l| {
        KEYS.iter().any(|k| l.strip_prefix(k).is_some_and(|rest| k.starts_with('[') || rest.trim_start().starts_with('=') || rest.starts_with(']')))
    })
}

fn same_component(a: &Component, b: &Component) -> bool {
    if a.origin == b.origin {
        return a == b;
    }
    let mut b2 = b.clone();
    b2.origin = a.origin.clone();
    *a == b2
}

/// Parse the `[[component]]` tables of a fuel file and check them against the library.
fn embedded_components(tables: &[toml::Table], file: &str, lib: &Library) -> Result<Vec<Arc<Component>>, FuelError> {
    let mut out: Vec<Arc<Component>> = vec![];
    for (i, table) in tables.iter().enumerate() {
        let id = table.get("id").and_then(|v| v.as_str()).unwrap_or("?");
        let origin = format!("{file}: [[component]] #{} ('{id}')", i + 1);
        let text = toml::to_string(table).map_err(|e| DataError::Parse { file: origin.clone(), message: e.to_string() })?;
        let c = Component::parse(&text, &origin)?;
        lib.check_extra_component(&c)?;
        if let Some(other) = out.iter().find(|o| o.answers_to(&c.id) || c.aliases.iter().any(|a| o.answers_to(a))) {
            return Err(FuelError::Composition { context: origin, message: format!("id or alias already used by {}", other.origin) });
        }
        out.push(Arc::new(c));
    }
    Ok(out)
}

/// A liquid fuel: components and their mass fractions (summing to 1).
#[derive(Debug, Clone)]
pub struct Fuel {
    /// Fuel name.
    pub name: String,
    /// One-line description.
    pub description: String,
    /// Components, in file order of first appearance.
    pub components: Vec<Arc<Component>>,
    /// Mass fractions \[-\], same order, sum 1.
    pub mass_fractions: Vec<f64>,
    /// Notices raised while reading (renormalisation, etc.).
    pub notices: Vec<String>,
    /// Where the fuel came from (file or "component").
    pub origin: String,
}

/// Tolerance on the sum of fractions before renormalisation is refused.
pub const SUM_TOLERANCE: f64 = 0.01;

fn fraction_value(v: &toml::Value, context: &str) -> Result<f64, FuelError> {
    let x = match v {
        toml::Value::Float(f) => *f,
        toml::Value::Integer(i) => *i as f64,
        other => {
            return Err(FuelError::Composition { context: context.into(), message: format!("fraction must be a number, found {}", other) });
        }
    };
    if !x.is_finite() {
        return Err(FuelError::Composition { context: context.into(), message: format!("fraction {x} is not a finite number") });
    }
    if x < 0.0 {
        return Err(FuelError::Composition { context: context.into(), message: format!("fraction {x} is negative") });
    }
    if x > 1.0 + SUM_TOLERANCE {
        return Err(FuelError::Composition { context: context.into(), message: format!("fraction {} is above 1 (fractions lie between 0 and 1: 60 % is 0.6)", if x < 1e6 { format!("{x}") } else { format!("{x:e}") }) });
    }
    Ok(x)
}

impl Fuel {
    /// A fuel made of one library component.
    pub fn pure(component: Arc<Component>) -> Self {
        Fuel {
            name: component.id.clone(),
            description: format!("pure {}", component.name),
            origin: "component library".into(),
            components: vec![component],
            mass_fractions: vec![1.0],
            notices: vec![],
        }
    }

    /// Build a fuel from components and fractions on a basis (fractions need not be normalised).
    pub fn from_fractions(name: &str, components: Vec<Arc<Component>>, fractions: &[f64], basis: Basis) -> Result<Self, FuelError> {
        let ctx = format!("fuel '{name}'");
        if components.is_empty() || components.len() != fractions.len() {
            return Err(FuelError::Composition { context: ctx, message: "needs at least one component with one fraction each".into() });
        }
        let mass: Vec<f64> = match basis {
            Basis::Mass => fractions.to_vec(),
            Basis::Mole => fractions.iter().zip(&components).map(|(x, c)| x * c.molar_mass()).collect(),
            Basis::Volume => fractions.iter().zip(&components).map(|(v, c)| v * c.density_15c()).collect(),
        };
        let total: f64 = mass.iter().sum();
        if !(total.is_finite() && total > 0.0) {
            return Err(FuelError::Composition { context: ctx, message: "fractions sum to zero".into() });
        }
        Ok(Fuel {
            name: name.to_string(),
            description: String::new(),
            mass_fractions: mass.iter().map(|m| m / total).collect(),
            components,
            notices: vec![],
            origin: "constructed".into(),
        })
    }

    /// Resolve a fuel given on the command line: a file path, a library fuel id, or a component id.
    pub fn resolve(spec: &str, lib: &Library) -> Result<Self, FuelError> {
        Self::resolve_depth(spec, lib, 0, Path::new(""))
    }

    /// `base` is the folder of the file that names `spec` (a blend entry): a relative file path resolves
    /// against it, so a blend means the same fuel from whatever folder it is used. Empty: the current folder.
    fn resolve_depth(spec: &str, lib: &Library, depth: usize, base: &Path) -> Result<Self, FuelError> {
        if depth > 8 {
            return Err(FuelError::Composition { context: format!("fuel '{spec}'"), message: "blends nest more than 8 levels deep (a blend that includes itself?)".into() });
        }
        let joined;
        let path = if base.as_os_str().is_empty() || Path::new(spec).is_absolute() {
            Path::new(spec)
        } else {
            joined = base.join(spec);
            joined.as_path()
        };
        // an existing path that is not a folder is read as a file (a FIFO or device is then refused, not opened)
        if spec.ends_with(".toml") || (path.exists() && !path.is_dir()) || std::fs::symlink_metadata(path).is_ok_and(|m| !m.is_dir() && !m.is_file() && !m.file_type().is_symlink()) {
            let shown = path.display().to_string();
            let text = crate::data::read_input_file(path).map_err(|message| DataError::Io { file: shown.clone(), message })?;
            let text = String::from_utf8(text).map_err(|_| DataError::Parse { file: shown.clone(), message: "file is not UTF-8 text".into() })?;
            return Self::parse_depth(&text, &shown, lib, depth, path.parent().unwrap_or(Path::new("")));
        }
        if let Some((origin, text)) = lib.fuels.get(spec) {
            return Self::parse_depth(text, origin, lib, depth, Path::new(""));
        }
        if let Some(c) = lib.component(spec) {
            return Ok(Fuel::pure(c.clone()));
        }
        let names = lib.fuels.keys().map(|s| s.as_str()).chain(lib.components().iter().map(|c| c.id.as_str()));
        Err(DataError::Unknown { context: "fuel".into(), kind: "fuel, component or file", id: spec.into(), hint: suggest(spec, names) }.into())
    }

    /// Parse a fuel file's text; `file` names it in messages.
    /// Relative file names in a `[blend]` resolve against the current folder; use [`Fuel::resolve`] on the file
    /// to resolve them against its own folder.
    pub fn parse(text: &str, file: &str, lib: &Library) -> Result<Self, FuelError> {
        Self::parse_depth(text, file, lib, 0, Path::new(""))
    }

    fn parse_depth(text: &str, file: &str, lib: &Library, depth: usize, base: &Path) -> Result<Self, FuelError> {
        // A component file (e.g. from `dropcut fuel build --from-groups`) is read as a pure fuel.
        if let Ok(table) = toml::from_str::<toml::Table>(text) {
            if table.contains_key("constants") && table.contains_key("id") && !table.contains_key("composition") {
                let c = Component::parse(text, file)?;
                if let Some(known) = lib.component(&c.id) {
                    if same_component(known, &c) {
                        return Ok(Fuel::pure(known.clone()));
                    }
                }
                lib.check_extra_component(&c)?;
                let mut fuel = Fuel::pure(Arc::new(c));
                fuel.origin = file.to_string();
                return Ok(fuel);
            }
        }
        let raw: RawFuel = toml::from_str(text).map_err(|e| {
            // A file with none of a fuel file's keys (an environment file, a key file) is not echoed back.
            let looks_like_fuel = text.trim().is_empty() || looks_like_fuel_file(text);
            let message = if looks_like_fuel {
                toml_error_at(&e, text)
            } else {
                "is not a fuel file (no basis, [composition] or [blend]; nothing of it is shown)".to_string()
            };
            DataError::Parse { file: file.into(), message }
        })?;
        let name = raw.name.clone().unwrap_or_else(|| Path::new(file).file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default());
        if let Some(c) = name.chars().find(|c| c.is_control()) {
            return Err(FuelError::Composition {
                context: format!("{file}: name"),
                message: format!("{:?} holds the control character {c:?}; a fuel name is one line of printable text", name),
            });
        }
        let (entries, is_blend) = match (&raw.composition, &raw.blend) {
            (Some(c), None) => (c, false),
            (None, Some(b)) => (b, true),
            (Some(_), Some(_)) => return Err(FuelError::Composition { context: file.into(), message: "has both [composition] and [blend]; use one".into() }),
            (None, None) => return Err(FuelError::Composition { context: file.into(), message: "missing [composition] (component id = fraction) or [blend] (fuel = fraction)".into() }),
        };
        let section = if is_blend { "blend" } else { "composition" };
        let embedded = embedded_components(&raw.component, file, lib)?;
        if is_blend && !embedded.is_empty() {
            return Err(FuelError::Composition { context: file.into(), message: "[[component]] tables are only allowed with [composition], not with [blend]".into() });
        }
        if entries.is_empty() {
            return Err(FuelError::Composition { context: format!("{file}: [{section}]"), message: "is empty".into() });
        }
        let mut fractions = Vec::with_capacity(entries.len());
        let mut sum = 0.0;
        for (key, v) in entries {
            let x = fraction_value(v, &format!("{file}: {section}.{key}"))?;
            sum += x;
            fractions.push((key.clone(), x));
        }
        let mut notices = vec![];
        if (sum - 1.0).abs() > SUM_TOLERANCE {
            return Err(FuelError::Composition {
                context: format!("{file}: [{section}]"),
                message: format!("fractions sum to {sum:.6}, not 1 (within {SUM_TOLERANCE})"),
            });
        }
        if (sum - 1.0).abs() > 1e-9 {
            notices.push(format!("{file}: fractions summed to {sum:.6}; renormalised to 1"));
        }
        // Collect mass of each component.
        let mut components: Vec<Arc<Component>> = vec![];
        let mut masses: Vec<f64> = vec![];
        let mut add = |c: &Arc<Component>, m: f64, key: &str| -> Result<(), FuelError> {
            if let Some(i) = components.iter().position(|x| x.id == c.id) {
                if !same_component(&components[i], c) {
                    return Err(FuelError::Composition {
                        context: format!("{file}: {section}.{key}"),
                        message: format!("component '{}' is defined differently in {} and {}", c.id, components[i].origin, c.origin),
                    });
                }
                if !is_blend {
                    return Err(FuelError::Composition {
                        context: format!("{file}: composition.{key}"),
                        message: format!("component '{}' is listed twice (under another name or alias)", c.id),
                    });
                }
                masses[i] += m;
            } else {
                components.push(c.clone());
                masses.push(m);
            }
            Ok(())
        };
        if is_blend {
            for (key, x) in &fractions {
                let sub = Self::resolve_depth(key, lib, depth + 1, base).map_err(|e| match e {
                    FuelError::Data(DataError::Unknown { kind, id, hint, .. }) => {
                        FuelError::Data(DataError::Unknown { context: format!("{file}: blend.{key}"), kind, id, hint })
                    }
                    // the outermost file names the entry that failed; deeper levels pass the error up as it is
                    other if depth == 0 => FuelError::Composition { context: format!("{file}: blend.{key}"), message: other.to_string() },
                    other => other,
                })?;
                let scale = match raw.basis {
                    Basis::Mass => *x,
                    Basis::Volume => x * sub.density_15c(),
                    Basis::Mole => x * sub.molar_mass(),
                };
                for (c, w) in sub.components.iter().zip(&sub.mass_fractions) {
                    add(c, scale * w, key)?;
                }
                notices.extend(sub.notices);
            }
        } else {
            for (key, x) in &fractions {
                let c = match embedded.iter().find(|c| c.answers_to(key)) {
                    Some(c) => c,
                    None => lib.require_component(key, &format!("{file}: composition")).map_err(|e| match e {
                        DataError::Unknown { context, kind, id, hint } if hint.is_empty() && !embedded.is_empty() => DataError::Unknown {
                            context,
                            kind,
                            hint: suggest(&id, embedded.iter().map(|c| c.id.as_str())),
                            id,
                        },
                        other => other,
                    })?,
                };
                let m = match raw.basis {
                    Basis::Mass => *x,
                    Basis::Mole => x * c.molar_mass(),
                    Basis::Volume => x * c.density_15c(),
                };
                add(c, m, key)?;
            }
        }
        let total: f64 = masses.iter().sum();
        if total.is_nan() || total <= 0.0 {
            return Err(FuelError::Composition { context: format!("{file}: [{section}]"), message: "all fractions are zero".into() });
        }
        // Drop exact zeros: a component with no mass plays no part.
        let mut comps = vec![];
        let mut w = vec![];
        for (c, m) in components.into_iter().zip(masses) {
            if m > 0.0 {
                comps.push(c);
                w.push(m / total);
            }
        }
        Ok(Fuel { name, description: raw.description.unwrap_or_default(), components: comps, mass_fractions: w, notices, origin: file.to_string() })
    }

    /// Number of components.
    pub fn len(&self) -> usize {
        self.components.len()
    }

    /// True when the fuel has no component (never, for a built fuel).
    pub fn is_empty(&self) -> bool {
        self.components.is_empty()
    }

    /// Mole fractions \[-\].
    pub fn mole_fractions(&self) -> Vec<f64> {
        crate::props::liquid::mass_to_mole(&self.components, &self.mass_fractions)
    }

    /// Liquid volume fractions at 15 °C \[-\].
    pub fn volume_fractions(&self) -> Vec<f64> {
        let v: Vec<f64> = self.components.iter().zip(&self.mass_fractions).map(|(c, w)| w / c.density_15c()).collect();
        let s: f64 = v.iter().sum();
        v.iter().map(|x| x / s).collect()
    }

    /// Mean molar mass \[kg/mol\].
    pub fn molar_mass(&self) -> f64 {
        1.0 / self.components.iter().zip(&self.mass_fractions).map(|(c, w)| w / c.molar_mass()).sum::<f64>()
    }

    /// Density at 15 °C by ideal volume additivity of the components' 15 °C densities \[kg/m³\].
    pub fn density_15c(&self) -> f64 {
        1.0 / self.components.iter().zip(&self.mass_fractions).map(|(c, w)| w / c.density_15c()).sum::<f64>()
    }

    /// A short hash of the composition (FNV-1a over ids and fractions printed to 1e-12), for table metadata.
    pub fn composition_hash(&self) -> String {
        let mut h: u64 = 0xcbf29ce484222325;
        for (c, w) in self.components.iter().zip(&self.mass_fractions) {
            for b in format!("{}={:.12e};", c.id, w).bytes() {
                h ^= u64::from(b);
                h = h.wrapping_mul(0x100000001b3);
            }
        }
        format!("{h:016x}")
    }

    /// Same fuel with new mass fractions (e.g. a residue), same component order.
    pub fn with_mass_fractions(&self, name: &str, mass_fractions: &[f64]) -> Self {
        let s: f64 = mass_fractions.iter().sum();
        Fuel {
            name: name.to_string(),
            description: self.description.clone(),
            components: self.components.clone(),
            mass_fractions: mass_fractions.iter().map(|w| w / s).collect(),
            notices: vec![],
            origin: self.origin.clone(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::fuel::build::estimate::{estimate_component, parse_groups, EstimateOptions};

    fn lib() -> Library {
        Library::embedded().unwrap()
    }

    fn embedded_text(lib: &Library, id: &str) -> String {
        let g = parse_groups("CH3=3,CH2=10,CH=1", "t").unwrap();
        estimate_component(lib, id, id, &g, &EstimateOptions::default(), "t").unwrap().to_toml(Some("component"))
    }

    /// A fuel file may define components in [\[component\]] tables and mix them with library components.
    #[test]
    fn embedded_components_are_read() {
        let lib = lib();
        let text = format!("name = \"f\"\nbasis = \"mass\"\n[composition]\nn-decane = 0.5\nmy-iso = 0.5\n\n{}", embedded_text(&lib, "my-iso"));
        let f = Fuel::parse(&text, "f.toml", &lib).unwrap();
        assert_eq!(f.len(), 2);
        let c = f.components.iter().find(|c| c.id == "my-iso").unwrap();
        assert!(c.origin.contains("[[component]] #1"), "{}", c.origin);
        // typo in the composition: suggestion among the embedded ids
        let bad = text.replace("my-iso = 0.5", "my-isa = 0.5");
        let e = Fuel::parse(&bad, "f.toml", &lib).unwrap_err().to_string();
        assert!(e.contains("did you mean 'my-iso'"), "{e}");
    }

    #[test]
    fn embedded_components_are_checked() {
        let lib = lib();
        let c = embedded_text(&lib, "my-iso");
        let twice = format!("basis = \"mass\"\n[composition]\nmy-iso = 1.0\n\n{c}\n{c}");
        assert!(Fuel::parse(&twice, "f.toml", &lib).unwrap_err().to_string().contains("already used"));
        let clash = format!("basis = \"mass\"\n[composition]\nn-decane = 1.0\n\n{}", embedded_text(&lib, "n-decane"));
        assert!(Fuel::parse(&clash, "f.toml", &lib).unwrap_err().to_string().contains("already a library component"));
        let blend = format!("basis = \"mass\"\n[blend]\ndemo-wide = 1.0\n\n{c}");
        assert!(Fuel::parse(&blend, "f.toml", &lib).unwrap_err().to_string().contains("only allowed with [composition]"));
        let unknown_source = format!("basis = \"mass\"\n[composition]\nmy-iso = 1.0\n\n{}", c.replace("estimated:joback\"", "jobak\""));
        assert!(Fuel::parse(&unknown_source, "f.toml", &lib).unwrap_err().to_string().contains("unknown source 'jobak'"));
    }

    /// A component file given where a fuel is expected is a pure fuel.
    #[test]
    fn component_file_is_a_pure_fuel() {
        let lib = lib();
        let g = parse_groups("CH3=3,CH2=10,CH=1", "t").unwrap();
        let text = estimate_component(&lib, "my-iso", "my iso", &g, &EstimateOptions::default(), "t").unwrap().to_toml(None);
        let f = Fuel::parse(&text, "my-iso.toml", &lib).unwrap();
        assert_eq!(f.len(), 1);
        assert!((f.mass_fractions[0] - 1.0).abs() < 1e-15);
        assert_eq!(f.origin, "my-iso.toml");
    }
}
