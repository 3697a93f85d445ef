//! The indicator record: the keys and units of the numeric indicators, the [`Indicators`] a call of
//! [`super::indicators()`] returns (values, methods, notes), and the [`IndicatorSelection`] of keys to compute.

use std::collections::BTreeMap;

use serde::Serialize;

use super::indicators::{CetaneRule, IndicatorOptions, RecoveryBasis, ViscosityRule};
use super::PostError;

/// Every numeric indicator key with its SI unit, in table order.
pub const INDICATOR_KEYS: [(&str, &str); 24] = [
    ("evaporated_fraction", "-"),
    ("bubble_point_K", "K"),
    ("initial_boiling_point_K", "K"),
    ("t10_K", "K"),
    ("t20_K", "K"),
    ("t50_K", "K"),
    ("t90_K", "K"),
    ("final_boiling_point_K", "K"),
    ("vapor_pressure_38C_Pa", "Pa"),
    ("flash_point_K", "K"),
    ("density_15C_kg_m3", "kg/m3"),
    ("kinematic_viscosity_minus40C_m2_s", "m2/s"),
    ("kinematic_viscosity_minus20C_m2_s", "m2/s"),
    ("kinematic_viscosity_40C_m2_s", "m2/s"),
    ("surface_tension_20C_N_m", "N/m"),
    ("dcn", "-"),
    ("dcn_not_measured_share", "-"),
    ("lhv_J_kg", "J/kg"),
    ("lhv_volume_J_m3", "J/m3"),
    ("hydrogen_mass_fraction", "-"),
    ("hc_ratio", "-"),
    ("aromatics_volume_fraction", "-"),
    ("molar_mass_kg_mol", "kg/mol"),
    ("freezing_point_K", "K"),
];

/// Fuel-quality indicators of one liquid composition. Serialises with snake_case, SI-suffixed keys;
/// `None` is written as null and `notes` says why.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[allow(non_snake_case)]
pub struct Indicators {
    /// Evaporated fraction of the parent liquid this composition is the residue of \[-\] (set by callers).
    pub evaporated_fraction: Option<f64>,
    /// Bubble point at the distillation pressure (1 atm by default) \[K\].
    pub bubble_point_K: Option<f64>,
    /// Initial boiling point of the simulated distillation (= bubble point) \[K\].
    pub initial_boiling_point_K: Option<f64>,
    /// Temperature at 10 % evaporated \[K\].
    pub t10_K: Option<f64>,
    /// Temperature at 20 % evaporated \[K\].
    pub t20_K: Option<f64>,
    /// Temperature at 50 % evaporated \[K\].
    pub t50_K: Option<f64>,
    /// Temperature at 90 % evaporated \[K\].
    pub t90_K: Option<f64>,
    /// Final boiling point: temperature at `final_fraction` evaporated (99.5 % by default) \[K\].
    pub final_boiling_point_K: Option<f64>,
    /// True vapour pressure at 38 °C (Raoult; not a Reid vapour pressure) \[Pa\].
    pub vapor_pressure_38C_Pa: Option<f64>,
    /// Closed-cup flash point estimate \[K\].
    pub flash_point_K: Option<f64>,
    /// Density at 15 °C \[kg/m³\].
    pub density_15C_kg_m3: Option<f64>,
    /// Kinematic viscosity at −40 °C \[m²/s\].
    pub kinematic_viscosity_minus40C_m2_s: Option<f64>,
    /// Kinematic viscosity at −20 °C \[m²/s\].
    pub kinematic_viscosity_minus20C_m2_s: Option<f64>,
    /// Kinematic viscosity at 40 °C \[m²/s\].
    pub kinematic_viscosity_40C_m2_s: Option<f64>,
    /// Surface tension at 20 °C \[N/m\].
    pub surface_tension_20C_N_m: Option<f64>,
    /// Derived cetane number by the chosen blending rule \[-\].
    pub dcn: Option<f64>,
    /// Share of the DCN's blend weight (the blending rule's fractions) carried by components whose cetane
    /// value is not a measured derived cetane number: engine CN, estimates, or values recalled from memory \[-\].
    pub dcn_not_measured_share: Option<f64>,
    /// Lower heating value, mass basis \[J/kg\].
    pub lhv_J_kg: Option<f64>,
    /// Lower heating value per liquid volume at 15 °C \[J/m³\].
    pub lhv_volume_J_m3: Option<f64>,
    /// Hydrogen mass fraction \[-\].
    pub hydrogen_mass_fraction: Option<f64>,
    /// Hydrogen-to-carbon atom ratio \[-\].
    pub hc_ratio: Option<f64>,
    /// Aromatics (alkylbenzenes, cycloaromatics, diaromatics) volume fraction at 15 °C \[-\].
    pub aromatics_volume_fraction: Option<f64>,
    /// Mean molar mass \[kg/mol\].
    pub molar_mass_kg_mol: Option<f64>,
    /// Freezing point estimate (last crystal to disappear) \[K\].
    pub freezing_point_K: Option<f64>,
    /// Pressure of the bubble point and distillation \[Pa\].
    pub distillation_pressure_Pa: f64,
    /// Basis of the distillation recovered fraction.
    pub distillation_basis: RecoveryBasis,
    /// Evaporated fraction that defines the final boiling point \[-\].
    pub final_boiling_fraction: f64,
    /// Viscosity blending rule used.
    pub viscosity_rule: ViscosityRule,
    /// Cetane blending rule used.
    pub cetane_rule: CetaneRule,
    /// How each indicator was estimated, by key.
    pub methods: BTreeMap<&'static str, String>,
    /// Reasons for missing values and caveats (estimated inputs, extrapolations), by key.
    pub notes: BTreeMap<&'static str, String>,
}

impl Indicators {
    /// Value of a numeric indicator by key: `None` for an unknown key, `Some(None)` when not computed.
    pub fn get(&self, key: &str) -> Option<Option<f64>> {
        Some(match key {
            "evaporated_fraction" => self.evaporated_fraction,
            "bubble_point_K" => self.bubble_point_K,
            "initial_boiling_point_K" => self.initial_boiling_point_K,
            "t10_K" => self.t10_K,
            "t20_K" => self.t20_K,
            "t50_K" => self.t50_K,
            "t90_K" => self.t90_K,
            "final_boiling_point_K" => self.final_boiling_point_K,
            "vapor_pressure_38C_Pa" => self.vapor_pressure_38C_Pa,
            "flash_point_K" => self.flash_point_K,
            "density_15C_kg_m3" => self.density_15C_kg_m3,
            "kinematic_viscosity_minus40C_m2_s" => self.kinematic_viscosity_minus40C_m2_s,
            "kinematic_viscosity_minus20C_m2_s" => self.kinematic_viscosity_minus20C_m2_s,
            "kinematic_viscosity_40C_m2_s" => self.kinematic_viscosity_40C_m2_s,
            "surface_tension_20C_N_m" => self.surface_tension_20C_N_m,
            "dcn" => self.dcn,
            "dcn_not_measured_share" => self.dcn_not_measured_share,
            "lhv_J_kg" => self.lhv_J_kg,
            "lhv_volume_J_m3" => self.lhv_volume_J_m3,
            "hydrogen_mass_fraction" => self.hydrogen_mass_fraction,
            "hc_ratio" => self.hc_ratio,
            "aromatics_volume_fraction" => self.aromatics_volume_fraction,
            "molar_mass_kg_mol" => self.molar_mass_kg_mol,
            "freezing_point_K" => self.freezing_point_K,
            _ => return None,
        })
    }

    /// Method string of an indicator, if any.
    pub fn method(&self, key: &str) -> Option<&str> {
        self.methods.get(key).map(|s| s.as_str())
    }

    /// SI unit of an indicator key, if the key is known.
    pub fn unit(key: &str) -> Option<&'static str> {
        INDICATOR_KEYS.iter().find(|(k, _)| *k == key).map(|(_, u)| *u)
    }

    /// No indicator yet: every value None, the options' settings recorded.
    pub(super) fn empty(opts: &IndicatorOptions) -> Self {
        Indicators {
            evaporated_fraction: None,
            bubble_point_K: None,
            initial_boiling_point_K: None,
            t10_K: None,
            t20_K: None,
            t50_K: None,
            t90_K: None,
            final_boiling_point_K: None,
            vapor_pressure_38C_Pa: None,
            flash_point_K: None,
            density_15C_kg_m3: None,
            kinematic_viscosity_minus40C_m2_s: None,
            kinematic_viscosity_minus20C_m2_s: None,
            kinematic_viscosity_40C_m2_s: None,
            surface_tension_20C_N_m: None,
            dcn: None,
            dcn_not_measured_share: None,
            lhv_J_kg: None,
            lhv_volume_J_m3: None,
            hydrogen_mass_fraction: None,
            hc_ratio: None,
            aromatics_volume_fraction: None,
            molar_mass_kg_mol: None,
            freezing_point_K: None,
            distillation_pressure_Pa: opts.pressure,
            distillation_basis: opts.recovery_basis,
            final_boiling_fraction: opts.final_fraction,
            viscosity_rule: opts.viscosity_rule,
            cetane_rule: opts.cetane_rule,
            methods: BTreeMap::new(),
            notes: BTreeMap::new(),
        }
    }

    /// The value of `key` (unknown keys: `evaporated_fraction`).
    fn slot(&mut self, key: &str) -> &mut Option<f64> {
        match key {
            "bubble_point_K" => &mut self.bubble_point_K,
            "initial_boiling_point_K" => &mut self.initial_boiling_point_K,
            "t10_K" => &mut self.t10_K,
            "t20_K" => &mut self.t20_K,
            "t50_K" => &mut self.t50_K,
            "t90_K" => &mut self.t90_K,
            "final_boiling_point_K" => &mut self.final_boiling_point_K,
            "vapor_pressure_38C_Pa" => &mut self.vapor_pressure_38C_Pa,
            "flash_point_K" => &mut self.flash_point_K,
            "density_15C_kg_m3" => &mut self.density_15C_kg_m3,
            "kinematic_viscosity_minus40C_m2_s" => &mut self.kinematic_viscosity_minus40C_m2_s,
            "kinematic_viscosity_minus20C_m2_s" => &mut self.kinematic_viscosity_minus20C_m2_s,
            "kinematic_viscosity_40C_m2_s" => &mut self.kinematic_viscosity_40C_m2_s,
            "surface_tension_20C_N_m" => &mut self.surface_tension_20C_N_m,
            "dcn" => &mut self.dcn,
            "dcn_not_measured_share" => &mut self.dcn_not_measured_share,
            "lhv_J_kg" => &mut self.lhv_J_kg,
            "lhv_volume_J_m3" => &mut self.lhv_volume_J_m3,
            "hydrogen_mass_fraction" => &mut self.hydrogen_mass_fraction,
            "hc_ratio" => &mut self.hc_ratio,
            "aromatics_volume_fraction" => &mut self.aromatics_volume_fraction,
            "molar_mass_kg_mol" => &mut self.molar_mass_kg_mol,
            "freezing_point_K" => &mut self.freezing_point_K,
            _ => &mut self.evaporated_fraction,
        }
    }

    /// Store a value with its method; a non-finite value becomes None with a note.
    pub(super) fn set(&mut self, key: &'static str, value: Option<f64>, method: impl Into<String>) {
        self.methods.insert(key, method.into());
        match value {
            Some(v) if v.is_finite() => *self.slot(key) = Some(v),
            Some(v) => {
                *self.slot(key) = None;
                self.note(key, format!("not computed: the estimate was not a finite number ({v})"));
            }
            None => *self.slot(key) = None,
        }
    }

    /// Add a note to `key` (joined with "; " to earlier ones).
    pub(super) fn note(&mut self, key: &'static str, text: impl Into<String>) {
        let text = text.into();
        self.notes.entry(key).and_modify(|s| {
            s.push_str("; ");
            s.push_str(&text);
        }).or_insert(text);
    }
}

/// A set of indicator keys of [`INDICATOR_KEYS`] that [`super::indicators()`] computes.
///
/// The simulated distillation integrates only as far as the largest requested point of the curve, through the
/// same nodes as the full curve (so its values are identical to a full call's).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct IndicatorSelection {
    /// Bit k set: key k of [`INDICATOR_KEYS`] is requested.
    bits: u32,
}

impl IndicatorSelection {
    /// Every indicator.
    pub const ALL: IndicatorSelection = IndicatorSelection { bits: (1u32 << INDICATOR_KEYS.len()) - 1 };

    /// The indicators named by `keys` (keys of [`INDICATOR_KEYS`]); an unknown key is an input error.
    pub fn of(keys: &[&str]) -> Result<Self, PostError> {
        let mut bits = 0u32;
        for key in keys {
            let Some(k) = INDICATOR_KEYS.iter().position(|(name, _)| name == key) else {
                return Err(PostError::Input { what: "indicator selection", message: format!("unknown indicator key '{key}'") });
            };
            bits |= 1 << k;
        }
        Ok(IndicatorSelection { bits })
    }

    /// Whether indicator `key` is requested (false for an unknown key).
    pub fn contains(self, key: &str) -> bool {
        INDICATOR_KEYS.iter().position(|(name, _)| *name == key).is_some_and(|k| self.bits & (1 << k) != 0)
    }

    /// Whether any of `keys` is requested.
    pub fn any(self, keys: &[&str]) -> bool {
        keys.iter().any(|k| self.contains(k))
    }

    /// Whether every indicator is requested.
    pub fn is_all(self) -> bool {
        self == Self::ALL
    }
}

impl Default for IndicatorSelection {
    fn default() -> Self {
        Self::ALL
    }
}
