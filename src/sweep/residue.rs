//! Residual-liquid indicators as extra summary columns: fuel-quality indicators ([`crate::post::indicators()`]) of
//! the liquid left when a case ended. For a droplet that evaporated this is the last `end-mass-fraction` (0.1 %
//! by default) of its mass, the heaviest part of the fuel; for a case stopped by `max-time`, what was left then.

use crate::model::{DropletInputs, RunOutcome};
use crate::post::{indicators, IndicatorOptions, IndicatorSelection};

use super::summary::ExtraColumns;

/// Indicator keys (of [`crate::post::INDICATOR_KEYS`]) written for the residue, each as column `residue_<key>`.
pub const RESIDUE_KEYS: [&str; 8] = [
    "t50_K",
    "flash_point_K",
    "density_15C_kg_m3",
    "kinematic_viscosity_minus20C_m2_s",
    "dcn",
    "dcn_not_measured_share",
    "freezing_point_K",
    "molar_mass_kg_mol",
];

/// Extra columns `residue_<key>` with the indicators of the liquid left at the end of each case.
#[derive(Debug, Clone, Default)]
pub struct ResidueIndicators {
    /// Options of the indicator calculation (defaults: distillation at 1 atm on a volume basis).
    pub options: IndicatorOptions,
}

impl ExtraColumns for ResidueIndicators {
    fn names(&self) -> Vec<String> {
        RESIDUE_KEYS.iter().map(|k| format!("residue_{k}")).collect()
    }

    fn values(&self, inputs: &DropletInputs, outcome: &RunOutcome) -> Vec<Option<f64>> {
        let w = &outcome.final_liquid_mass_fractions;
        let none = vec![None; RESIDUE_KEYS.len()];
        if w.len() != inputs.fuel.len() || !(w.iter().sum::<f64>() > 0.0) {
            return none;
        }
        // only the RESIDUE_KEYS are written: the other indicators are not computed
        let selection = IndicatorSelection::of(&RESIDUE_KEYS).unwrap_or_default();
        let options = IndicatorOptions { activity: inputs.liquid.activity, selection, ..self.options.clone() };
        match indicators(&inputs.fuel.components, w, &options) {
            Ok(ind) => RESIDUE_KEYS.iter().map(|k| ind.get(k).flatten()).collect(),
            Err(_) => none,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::post::INDICATOR_KEYS;

    #[test]
    fn keys_are_indicator_keys() {
        for k in RESIDUE_KEYS {
            assert!(INDICATOR_KEYS.iter().any(|(key, _)| *key == k), "{k}");
        }
        assert!(IndicatorSelection::of(&RESIDUE_KEYS).is_ok());
    }
}
