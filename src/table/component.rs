//! Component tables: each pure component's liquid and vapour properties versus temperature.

use std::sync::Arc;

use crate::data::Component;
use crate::fuel::Fuel;
use crate::props::diffusion::wilke_chang;
use crate::props::gas::{vapor_diffusion_coefficient, AmbientGas};
use crate::props::liquid;

use super::enthalpy::cumulative_enthalpy;
use super::mixture::{Column, LIN, LOG_RECIPROCAL};
use super::validity::{grade, LIQUID_KEYS, VAPOR_KEYS};
use super::{extrapolated_properties, Validity, MAX_CRITICAL_FRACTION};

/// Numeric columns of a component table, in file order (then `validity`, `extrapolated_properties` and the
/// [`super::SHARE_COLUMNS`]).
pub const COMPONENT_COLUMNS: [Column; 16] = [
    Column { name: "temperature_K", description: "temperature", fit: None },
    Column { name: "vapor_pressure_Pa", description: "saturation pressure", fit: LOG_RECIPROCAL },
    Column { name: "density_kg_m3", description: "saturated-liquid density", fit: LIN },
    Column { name: "cp_J_kgK", description: "liquid heat capacity", fit: LIN },
    Column { name: "viscosity_Pa_s", description: "liquid dynamic viscosity", fit: LOG_RECIPROCAL },
    Column { name: "kinematic_viscosity_m2_s", description: "liquid kinematic viscosity", fit: LOG_RECIPROCAL },
    Column { name: "conductivity_W_mK", description: "liquid thermal conductivity", fit: LIN },
    Column { name: "surface_tension_N_m", description: "surface tension", fit: LIN },
    Column { name: "latent_heat_J_kg", description: "latent heat of vaporisation", fit: LIN },
    Column { name: "liquid_diffusivity_m2_s", description: "liquid mass diffusivity of the component in the fuel's initial liquid, Wilke–Chang (solute volume at Tb, association factor 1)", fit: LOG_RECIPROCAL },
    Column { name: "vapor_cp_J_kgK", description: "ideal-gas heat capacity", fit: LIN },
    Column { name: "vapor_viscosity_Pa_s", description: "low-pressure vapour viscosity", fit: LIN },
    Column { name: "vapor_conductivity_W_mK", description: "low-pressure vapour thermal conductivity", fit: LIN },
    Column { name: "vapor_diffusivity_m2_s", description: "binary diffusion coefficient in the ambient gas at the table pressure (Fuller, Blanc's law over the gas species)", fit: LIN },
    Column { name: "liquid_enthalpy_J_kg", description: "specific enthalpy of the liquid, ∫ cp_J_kgK dT from the reference state (liquid at 298.15 K: zero); liquid rows only", fit: None },
    Column { name: "vapor_enthalpy_J_kg", description: "specific enthalpy of the vapour, liquid_enthalpy_J_kg + latent_heat_J_kg (same reference state); liquid rows only", fit: None },
];

/// Index of the first enthalpy column in [`COMPONENT_COLUMNS`].
pub const FIRST_ENTHALPY_COLUMN: usize = 14;

/// Index of the first vapour column in [`COMPONENT_COLUMNS`].
pub const FIRST_VAPOR_COLUMN: usize = 10;

/// One row of a component table; `liquid` is None outside the liquid range.
#[derive(Debug, Clone)]
pub struct ComponentRow {
    /// Temperature \[K\].
    pub temperature: f64,
    /// Liquid cells (vapour pressure .. liquid diffusivity), None outside the liquid range.
    pub liquid: Option<[f64; 9]>,
    /// Vapour cells (cp, viscosity, conductivity, diffusivity).
    pub vapor: [f64; 4],
    /// Liquid and vapour specific enthalpies (reference: liquid at 298.15 K) \[J/kg\], None outside the liquid range.
    pub enthalpy: Option<[f64; 2]>,
    /// Validity flag.
    pub validity: Validity,
    /// Property keys evaluated outside their valid range.
    pub extrapolated_properties: Vec<&'static str>,
    /// Supercritical, near-critical and extrapolated shares ([`super::SHARE_COLUMNS`]; 0 or 1 for one component).
    pub shares: [f64; 3],
}

impl ComponentRow {
    /// The cells in [`COMPONENT_COLUMNS`] order (None = empty).
    pub fn cells(&self) -> [Option<f64>; 16] {
        let mut out = [None; 16];
        out[0] = Some(self.temperature);
        if let Some(l) = &self.liquid {
            for (o, v) in out[1..10].iter_mut().zip(l) {
                *o = Some(*v);
            }
        }
        for (o, v) in out[FIRST_VAPOR_COLUMN..FIRST_ENTHALPY_COLUMN].iter_mut().zip(&self.vapor) {
            *o = Some(*v);
        }
        if let Some(h) = &self.enthalpy {
            out[FIRST_ENTHALPY_COLUMN] = Some(h[0]);
            out[FIRST_ENTHALPY_COLUMN + 1] = Some(h[1]);
        }
        out
    }
}

/// The solvent of the Wilke–Chang liquid diffusivity in component tables: molar mass \[kg/mol\] and viscosity
/// function of a liquid.
#[derive(Debug, Clone)]
pub struct Solvent {
    /// Components of the solvent liquid.
    pub components: Vec<Arc<Component>>,
    /// Its mole fractions.
    pub mole_fractions: Vec<f64>,
}

impl Solvent {
    /// The liquid of a fuel.
    pub fn of(fuel: &Fuel) -> Self {
        Solvent { components: fuel.components.clone(), mole_fractions: fuel.mole_fractions() }
    }
}

/// A per-component table: liquid and vapour properties versus temperature.
#[derive(Debug, Clone)]
pub struct ComponentTable {
    /// The component.
    pub component: Arc<Component>,
    /// Lowest and highest temperature with liquid cells \[K\].
    pub liquid_range: Option<(f64, f64)>,
    /// Saturation temperature at the table pressure (None above the critical pressure) \[K\].
    pub saturation_temperature: Option<f64>,
    /// Table pressure \[Pa\].
    pub pressure: f64,
    /// Rows (the union of the liquid and vapour grids).
    pub rows: Vec<ComponentRow>,
}

/// Build a component table on the union of `liquid_temperatures` (cells up to 0.99 Tc) and
/// `vapor_temperatures`, at pressure `p` in `gas`, with liquid diffusivity in `solvent`.
pub fn component_table(c: &Arc<Component>, liquid_temperatures: &[f64], vapor_temperatures: &[f64], gas: &AmbientGas, p: f64, solvent: &Solvent) -> ComponentTable {
    let one = std::slice::from_ref(c);
    let tc = c.critical_temperature();
    let liquid_ts: Vec<f64> = liquid_temperatures.iter().copied().filter(|t| *t < MAX_CRITICAL_FRACTION * tc).collect();
    let mut all: Vec<f64> = liquid_ts.iter().chain(vapor_temperatures).copied().collect();
    all.sort_by(f64::total_cmp);
    all.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
    let t_sat = liquid::bubble_point(one, &[1.0], p).ok();
    let solvent_w = liquid::molar_mass(&solvent.components, &solvent.mole_fractions);
    let v_b = c.molar_volume_at_boiling();
    let h_liquid = cumulative_enthalpy(&|t| c.liquid_heat_capacity(t), &liquid_ts);
    let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
    let rows = all
        .iter()
        .map(|&t| {
            let vapor = [c.ideal_gas_heat_capacity(t), c.vapor_viscosity(t), c.vapor_conductivity(t), vapor_diffusion_coefficient(c, gas, t, p)];
            if let Some(k) = liquid_ts.iter().position(|l| (l - t).abs() < 1e-6) {
                let rho = c.liquid_density(t);
                let mu = c.liquid_viscosity(t);
                let mu_solvent = liquid::viscosity(&solvent.components, &solvent.mole_fractions, t);
                let latent = c.latent_heat(t);
                let l = [
                    c.vapor_pressure(t),
                    rho,
                    c.liquid_heat_capacity(t),
                    mu,
                    mu / rho,
                    c.liquid_conductivity(t),
                    c.surface_tension(t),
                    latent,
                    wilke_chang(t, solvent_w, mu_solvent, v_b),
                ];
                let g = grade(one, &[1.0], t, &keys, t_sat);
                let enthalpy = Some([h_liquid[k], h_liquid[k] + latent]);
                ComponentRow { temperature: t, liquid: Some(l), vapor, enthalpy, shares: g.shares(), validity: g.validity, extrapolated_properties: g.extrapolated_properties }
            } else {
                let extrapolated = extrapolated_properties(one, &[1.0], t, &VAPOR_KEYS);
                let share = if extrapolated.is_empty() { 0.0 } else { 1.0 };
                ComponentRow { temperature: t, liquid: None, vapor, enthalpy: None, shares: [0.0, 0.0, share], validity: Validity::VaporOnly, extrapolated_properties: extrapolated }
            }
        })
        .collect();
    let liquid_range = match (liquid_ts.first(), liquid_ts.last()) {
        (Some(a), Some(b)) => Some((*a, *b)),
        _ => None,
    };
    ComponentTable { component: c.clone(), liquid_range, saturation_temperature: t_sat, pressure: p, rows }
}


#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;

    /// Component tables: union of the liquid and vapour grids, empty liquid cells outside the liquid range.
    #[test]
    fn component_table_grid() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("test-heptane-decane", &lib).unwrap();
        let gas = AmbientGas::air(&lib).unwrap();
        let liquid: Vec<f64> = (0..10).map(|i| 300.0 + 10.0 * f64::from(i)).collect();
        let vapor: Vec<f64> = (0..5).map(|i| 250.0 + 100.0 * f64::from(i)).collect();
        let heptane = fuel.components.iter().find(|c| c.id == "n-heptane").unwrap();
        let t = component_table(heptane, &liquid, &vapor, &gas, 101_325.0, &Solvent::of(&fuel));
        let ts: Vec<f64> = t.rows.iter().map(|r| r.temperature).collect();
        assert_eq!(ts, vec![250.0, 300.0, 310.0, 320.0, 330.0, 340.0, 350.0, 360.0, 370.0, 380.0, 390.0, 450.0, 550.0, 650.0]);
        for r in &t.rows {
            assert_eq!(r.liquid.is_some(), (300.0..=390.0).contains(&r.temperature));
            assert_eq!(r.enthalpy.is_some(), r.liquid.is_some());
            assert_eq!(r.validity == Validity::VaporOnly, r.liquid.is_none());
            if let (Some(l), Some(h)) = (r.liquid, r.enthalpy) {
                assert!(((h[1] - h[0]) - l[7]).abs() <= 1e-9 * l[7], "h_v - h_l = L");
            }
        }
        // n-heptane boils at 371.6 K at 1 atm: 380 and 390 K are superheated
        assert_eq!(t.rows.iter().filter(|r| r.validity == Validity::AboveBubblePoint).count(), 2);
    }

    /// Vapour cp past the published polynomial (n-dodecane: Poling Appendix A, 200–1000 K) is the Wilhoit
    /// continuation the droplet model uses: it keeps rising up to 1500 K without a flag, and rows above the
    /// valid range (1500 K) name the ideal-gas cp.
    #[test]
    fn vapor_cp_keeps_its_temperature_dependence() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("n-dodecane", &lib).unwrap();
        let gas = AmbientGas::air(&lib).unwrap();
        let c = &fuel.components[0];
        let vapor: Vec<f64> = (0..=36).map(|i| 250.0 + 50.0 * f64::from(i)).collect();
        let t = component_table(c, &[300.0], &vapor, &gas, 101_325.0, &Solvent::of(&fuel));
        let cp: Vec<(f64, f64)> = t.rows.iter().map(|r| (r.temperature, r.vapor[0])).collect();
        for w in cp.windows(2) {
            assert!(w[1].1 > w[0].1, "{w:?}");
        }
        for r in &t.rows {
            assert_eq!(r.vapor[0], c.ideal_gas_heat_capacity(r.temperature));
            let flagged = r.extrapolated_properties.contains(&"ideal-gas-heat-capacity");
            assert_eq!(flagged, r.temperature > 1500.0, "{}", r.temperature);
        }
    }
}
