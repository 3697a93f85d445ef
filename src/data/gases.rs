//! Ambient-gas species (N2, O2, CO2, H2O, Ar) from `mixtures/gases.toml`.

use std::collections::BTreeMap;

use serde::Deserialize;

use super::correlation::{Correlation, Dimension, RawCorrelation};
use super::{toml_error_at, DataError, Sourced};

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
struct RawGas {
    name: String,
    #[serde(default)]
    formula: Option<String>,
    #[serde(default)]
    cas: Option<String>,
    molar_mass: Sourced,
    diffusion_volume: Sourced,
    #[serde(default)]
    lennard_jones_sigma: Option<Sourced>,
    #[serde(default)]
    lennard_jones_epsilon_over_k: Option<Sourced>,
    ideal_gas_heat_capacity: RawCorrelation,
    vapor_viscosity: RawCorrelation,
    vapor_conductivity: RawCorrelation,
}

/// One ambient-gas species with its low-pressure properties.
#[derive(Debug, Clone, PartialEq)]
pub struct GasSpecies {
    /// Id, e.g. `n2`.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Molar mass \[kg/mol\].
    pub molar_mass: Sourced,
    /// Fuller diffusion volume \[-\].
    pub diffusion_volume: Sourced,
    /// Lennard-Jones diameter \[m\].
    pub lennard_jones_sigma: Option<Sourced>,
    /// Lennard-Jones well depth / k \[K\].
    pub lennard_jones_epsilon_over_k: Option<Sourced>,
    /// Ideal-gas heat capacity \[J/(kg·K)\].
    pub ideal_gas_heat_capacity: Correlation,
    /// Viscosity \[Pa·s\].
    pub viscosity: Correlation,
    /// Thermal conductivity \[W/(m·K)\].
    pub conductivity: Correlation,
}

/// Parse the gases file into species by id.
pub fn parse_gases(text: &str, file: &str) -> Result<BTreeMap<String, GasSpecies>, DataError> {
    // the generated file is read by the plain-TOML subset reader (the same table as the full parser,
    // `data::toml_subset`); anything outside its subset by the full parser, which also words the errors
    match super::toml_subset::parse_table(text).and_then(|t| toml::Value::Table(t).try_into::<BTreeMap<String, RawGas>>().ok()) {
        Some(raw) => build_gases(raw, file),
        None => parse_gases_full(text, file),
    }
}

/// [`parse_gases`] by the full TOML parser.
fn parse_gases_full(text: &str, file: &str) -> Result<BTreeMap<String, GasSpecies>, DataError> {
    let raw: BTreeMap<String, RawGas> = toml::from_str(text).map_err(|e| DataError::Parse { file: file.into(), message: toml_error_at(&e, text) })?;
    build_gases(raw, file)
}

fn build_gases(raw: BTreeMap<String, RawGas>, file: &str) -> Result<BTreeMap<String, GasSpecies>, DataError> {
    let mut out = BTreeMap::new();
    for (id, g) in raw {
        let ctx = format!("{file} (gas '{id}')");
        let w = g.molar_mass.value;
        if !(w.is_finite() && w > 0.001 && w < 1.0) {
            return Err(DataError::Invalid { context: format!("{ctx}: molar-mass"), message: format!("{w} kg/mol is not a plausible molar mass") });
        }
        let _ = (&g.formula, &g.cas);
        let species = GasSpecies {
            ideal_gas_heat_capacity: g.ideal_gas_heat_capacity.build(Dimension::SpecificHeat, w, 0.01, &format!("{ctx}: ideal-gas-heat-capacity"))?,
            viscosity: g.vapor_viscosity.build(Dimension::Viscosity, w, 0.02, &format!("{ctx}: vapor-viscosity"))?,
            conductivity: g.vapor_conductivity.build(Dimension::Conductivity, w, 0.03, &format!("{ctx}: vapor-conductivity"))?,
            id: id.clone(),
            name: g.name,
            molar_mass: g.molar_mass,
            diffusion_volume: g.diffusion_volume,
            lennard_jones_sigma: g.lennard_jones_sigma,
            lennard_jones_epsilon_over_k: g.lennard_jones_epsilon_over_k,
        };
        for (name, c) in [("ideal-gas-heat-capacity", &species.ideal_gas_heat_capacity), ("vapor-viscosity", &species.viscosity), ("vapor-conductivity", &species.conductivity)] {
            if matches!(c.form, super::Form::CorrespondingStates) {
                return Err(DataError::Invalid { context: format!("{ctx}: {name}"), message: "ambient gases need published coefficients".into() });
            }
        }
        out.insert(id, species);
    }
    Ok(out)
}

impl GasSpecies {
    /// Molar mass \[kg/mol\].
    #[inline]
    pub fn molar_mass(&self) -> f64 {
        self.molar_mass.value
    }

    /// Every (field, source id) pair, for registry checks.
    pub fn source_ids(&self) -> Vec<(String, String)> {
        let mut v = vec![
            ("molar-mass".to_string(), self.molar_mass.source.clone()),
            ("diffusion-volume".to_string(), self.diffusion_volume.source.clone()),
            ("ideal-gas-heat-capacity".to_string(), self.ideal_gas_heat_capacity.source.clone()),
            ("vapor-viscosity".to_string(), self.viscosity.source.clone()),
            ("vapor-conductivity".to_string(), self.conductivity.source.clone()),
        ];
        if let Some(s) = &self.lennard_jones_sigma {
            v.push(("lennard-jones-sigma".into(), s.source.clone()));
        }
        if let Some(s) = &self.lennard_jones_epsilon_over_k {
            v.push(("lennard-jones-epsilon-over-k".into(), s.source.clone()));
        }
        v
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The embedded gas file gives the same species by the subset reader and by the full parser.
    #[test]
    fn embedded_gases_parse_alike() {
        let (_, text) = super::super::library::EMBEDDED_FILES.iter().find(|(p, _)| *p == "gases.toml").unwrap();
        assert!(super::super::toml_subset::parse_table(text).is_some());
        let fast = parse_gases(text, "gases.toml").unwrap();
        let full = parse_gases_full(text, "gases.toml").unwrap();
        assert_eq!(format!("{fast:?}"), format!("{full:?}"));
        assert!(fast.len() >= 5);
    }
}
