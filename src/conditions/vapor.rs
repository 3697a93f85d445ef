//! Far-field fuel vapour: `component=mass-fraction` pairs, read once as text and resolved against each fuel.

use crate::data::Library;
use crate::fuel::Fuel;

/// One `component=mass-fraction` pair.
#[derive(Debug, Clone, PartialEq)]
pub struct VaporPair {
    /// The component as written (id or alias).
    pub given: String,
    /// Its library id, when the library knows it (a built fuel may hold components the library does not).
    pub library_id: Option<String>,
    /// Why the library does not know it (`unknown component 'x'; did you mean …`), when it does not.
    pub unknown: Option<String>,
    /// Far-field mass fraction \[-\], in [0, 0.5).
    pub mass_fraction: f64,
}

/// Far-field fuel vapour as written, with its pairs.
#[derive(Debug, Clone)]
pub struct VaporValue {
    /// Text as given (trimmed).
    pub text: String,
    /// The pairs, in the order written.
    pub pairs: Vec<VaporPair>,
}

impl VaporValue {
    /// Read `component=mass-fraction` pairs (empty text: no vapour); the numbers are checked here, the components
    /// when the value meets a fuel ([`resolve`](Self::resolve)).
    pub fn parse(lib: &Library, text: &str) -> Result<VaporValue, String> {
        let mut pairs = vec![];
        if !text.trim().is_empty() {
            for item in text.split(',') {
                let (id, y) = item.split_once('=').ok_or_else(|| format!("cannot read '{}': use component=mass-fraction pairs", item.trim()))?;
                let id = id.trim();
                let y: f64 = y.trim().parse().map_err(|_| format!("mass fraction '{}' of '{id}' is not a number", y.trim()))?;
                if !(y.is_finite() && (0.0..0.5).contains(&y)) {
                    return Err(format!("mass fraction {y} of '{id}' must be in [0, 0.5)"));
                }
                let (library_id, unknown) = match lib.require_component(id, "ambient-vapor") {
                    Ok(c) => (Some(c.id.clone()), None),
                    Err(crate::data::DataError::Unknown { kind, id, hint, .. }) => (None, Some(format!("unknown {kind} '{id}'{hint}"))),
                    Err(other) => (None, Some(other.to_string())),
                };
                pairs.push(VaporPair { given: id.to_string(), library_id, unknown, mass_fraction: y });
            }
        }
        Ok(VaporValue { text: text.trim().to_string(), pairs })
    }

    /// Mass fraction per component of `fuel` (empty for no vapour).
    pub fn resolve(&self, fuel: &Fuel) -> Result<Vec<f64>, String> {
        if self.pairs.is_empty() {
            return Ok(vec![]);
        }
        let mut y_all = vec![0.0; fuel.len()];
        let mut seen = vec![false; fuel.len()];
        for p in &self.pairs {
            // the fuel's own components first: a built fuel may hold components the library does not know
            let i = match fuel.components.iter().position(|c| c.answers_to(&p.given)) {
                Some(i) => i,
                None => match (&p.library_id, &p.unknown) {
                    (Some(id), _) => fuel.components.iter().position(|c| &c.id == id).ok_or_else(|| format!("'{}' is not a component of fuel '{}'", p.given, fuel.name))?,
                    (None, Some(unknown)) => return Err(unknown.clone()),
                    (None, None) => return Err(format!("'{}' is not a component of fuel '{}'", p.given, fuel.name)),
                },
            };
            if std::mem::replace(&mut seen[i], true) {
                return Err(format!("component '{}' is given twice (under its id or an alias)", fuel.components[i].id));
            }
            y_all[i] = p.mass_fraction;
        }
        Ok(y_all)
    }

    /// The far-field vapour of `fuel` written as pairs (component ids; zero fractions left out).
    pub fn of(fuel: &Fuel, mass_fractions: &[f64]) -> VaporValue {
        let pairs: Vec<VaporPair> = fuel
            .components
            .iter()
            .zip(mass_fractions)
            .filter(|(_, y)| **y != 0.0)
            .map(|(c, y)| VaporPair { given: c.id.clone(), library_id: Some(c.id.clone()), unknown: None, mass_fraction: *y })
            .collect();
        let text = pairs.iter().map(|p| format!("{}={}", p.given, p.mass_fraction)).collect::<Vec<_>>().join(",");
        VaporValue { text, pairs }
    }

    /// (component, mass fraction) with library ids where known: equal for the same vapour written with aliases.
    pub fn canonical_pairs(&self) -> Vec<(&str, f64)> {
        self.pairs.iter().map(|p| (p.library_id.as_deref().unwrap_or(&p.given), p.mass_fraction)).collect()
    }
}

/// Far-field vapour text → mass fraction per component of `fuel` (empty text → empty vector).
pub fn vapor_fractions(lib: &Library, fuel: &Fuel, text: &str) -> Result<Vec<f64>, String> {
    VaporValue::parse(lib, text)?.resolve(fuel)
}
