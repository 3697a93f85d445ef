//! Mixture tables: the liquid of a composition and its equilibrium vapour versus temperature.

use std::sync::Arc;

use serde::Serialize;

use crate::data::Component;
use crate::fuel::Fuel;
use crate::props::diffusion::wilke_chang;
use crate::props::activity::Activity;
use crate::props::gas::{gas_mixture_state, vapor_diffusion_coefficient, AmbientGas};
use crate::props::liquid;

use super::enthalpy::{cumulative_enthalpy, ideal_gas_gap};
use super::fit::{FitForm, FitVariable};
use super::validity::{grade, LIQUID_KEYS, VAPOR_KEYS};
use super::{input, liquid_grid, range_limits, RangeLimits, TableError, TableOptions, TemperatureGrid, Validity};


/// Properties of a fuel vapour (no ambient gas mixed in) and its diffusion in the ambient gas.
#[derive(Debug, Clone, Serialize)]
pub struct VaporState {
    /// Vapour mass fractions \[-\].
    pub mass_fractions: Vec<f64>,
    /// Mean molar mass \[kg/mol\].
    pub molar_mass: f64,
    /// Ideal-gas heat capacity, mass-fraction weighted \[J/(kg·K)\].
    pub cp: f64,
    /// Viscosity by Wilke \[Pa·s\].
    pub viscosity: f64,
    /// Conductivity by Wassiljewa–Mason–Saxena \[W/(m·K)\].
    pub conductivity: f64,
    /// Diffusion coefficient in the ambient gas: mass-fraction-weighted binary Fuller coefficients, each
    /// combined over the gas species by Blanc's law (as the droplet film model lumps them) \[m²/s\].
    pub diffusivity: f64,
}

/// Equilibrium vapour of a liquid at `t` (modified Raoult's law): mole fractions ∝ x_i γ_i p_sat,i(T), as mass
/// fractions (γ from `activity`; 1 for the ideal liquid).
pub fn equilibrium_vapor_mass_fractions(components: &[Arc<Component>], activity: &mut Activity, mole_fractions: &[f64], t: f64) -> Vec<f64> {
    let mut out = vec![0.0; components.len()];
    activity.equilibrium_vapor_mass_fractions(components, mole_fractions, t, &mut out);
    out
}

/// Vapour of mass fractions `vapor_mass_fractions` (summing to 1) at `t` and `p` in `gas`.
pub fn vapor_state(components: &[Arc<Component>], vapor_mass_fractions: &[f64], gas: &AmbientGas, t: f64, p: f64) -> VaporState {
    let g = gas_mixture_state(components, vapor_mass_fractions, gas, t, p);
    let diffusivity = components.iter().zip(vapor_mass_fractions).map(|(c, y)| y * vapor_diffusion_coefficient(c, gas, t, p)).sum();
    VaporState {
        mass_fractions: vapor_mass_fractions.to_vec(),
        molar_mass: g.molar_mass_kg_mol,
        cp: g.cp_J_kgK,
        viscosity: g.viscosity_Pa_s,
        conductivity: g.conductivity_W_mK,
        diffusivity,
    }
}

/// Liquid mass diffusivity of the mixture as the resolved droplet model uses it: Wilke–Chang with the
/// mole-averaged molar volume at the normal boiling point as solute and the mixture as solvent \[m²/s\].
pub fn mixture_liquid_diffusivity(components: &[Arc<Component>], mole_fractions: &[f64], viscosity: f64, t: f64) -> f64 {
    let w_b = liquid::molar_mass(components, mole_fractions);
    let v_a: f64 = components.iter().zip(mole_fractions).map(|(c, x)| x * c.molar_volume_at_boiling()).sum();
    wilke_chang(t, w_b, viscosity, v_a)
}

// ---------------------------------------------------------------------------------------------------------
// Mixture tables
// ---------------------------------------------------------------------------------------------------------

/// A numeric column: name (`snake_case_unit`), description, and the fit form used in fits.csv.
#[derive(Debug, Clone, Copy)]
pub struct Column {
    /// Column name.
    pub name: &'static str,
    /// What it holds.
    pub description: &'static str,
    /// Fit form and variable (None: not fitted).
    pub fit: Option<(FitForm, FitVariable)>,
}

pub(crate) const LIN: Option<(FitForm, FitVariable)> = Some((FitForm::Linear, FitVariable::Temperature));
pub(crate) const LOG_RECIPROCAL: Option<(FitForm, FitVariable)> = Some((FitForm::Log, FitVariable::Reciprocal));

/// Numeric columns of a mixture table, in file order (then `validity`, `extrapolated_properties` and the
/// [`super::SHARE_COLUMNS`]).
pub const MIXTURE_COLUMNS: [Column; 18] = [
    Column { name: "temperature_K", description: "liquid temperature", fit: None },
    Column { name: "density_kg_m3", description: "liquid density, ideal mixing of molar volumes (Amagat)", fit: LIN },
    Column { name: "cp_J_kgK", description: "liquid heat capacity, mass-fraction weighted", fit: LIN },
    Column { name: "viscosity_Pa_s", description: "liquid dynamic viscosity, Grunberg–Nissan without interaction (ln μ = Σ x_i ln μ_i)", fit: LOG_RECIPROCAL },
    Column { name: "kinematic_viscosity_m2_s", description: "liquid kinematic viscosity μ/ρ", fit: LOG_RECIPROCAL },
    Column { name: "conductivity_W_mK", description: "liquid thermal conductivity, DIPPR 9H (Vredeveld) rule", fit: LIN },
    Column { name: "surface_tension_N_m", description: "surface tension, mole-fraction weighted", fit: LIN },
    Column { name: "latent_heat_J_kg", description: "latent heat of the liquid composition, mass-fraction weighted Σ w_i L_i", fit: LIN },
    Column { name: "vapor_pressure_Pa", description: "bubble (vapour) pressure by Raoult's law, Σ x_i p_sat,i", fit: LOG_RECIPROCAL },
    Column { name: "latent_heat_equilibrium_vapor_J_kg", description: "latent heat per kg of the equilibrium vapour, Σ ε_i L_i with ε the vapour mass fractions", fit: LIN },
    Column { name: "liquid_diffusivity_m2_s", description: "liquid mass diffusivity, Wilke–Chang (mole-averaged solute volume at Tb, mixture solvent), as in the resolved droplet model", fit: LOG_RECIPROCAL },
    Column { name: "vapor_molar_mass_kg_mol", description: "molar mass of the equilibrium vapour", fit: LIN },
    Column { name: "vapor_cp_J_kgK", description: "ideal-gas heat capacity of the equilibrium vapour, mass-fraction weighted", fit: LIN },
    Column { name: "vapor_viscosity_Pa_s", description: "viscosity of the equilibrium vapour, Wilke", fit: LIN },
    Column { name: "vapor_conductivity_W_mK", description: "thermal conductivity of the equilibrium vapour, Wassiljewa–Mason–Saxena", fit: LIN },
    Column { name: "vapor_diffusivity_m2_s", description: "diffusion coefficient of the equilibrium vapour in the ambient gas at the table pressure: Fuller binary coefficients combined over the gas by Blanc's law, mass-fraction weighted over the vapour", fit: LIN },
    Column { name: "liquid_enthalpy_J_kg", description: "specific enthalpy of the liquid, ∫ cp_J_kgK dT from the reference state (liquid at 298.15 K: zero)", fit: None },
    Column { name: "vapor_enthalpy_J_kg", description: "specific enthalpy of the liquid's composition as a vapour, liquid_enthalpy_J_kg + latent_heat_J_kg (same reference state)", fit: None },
];

/// One row of a mixture table.
#[derive(Debug, Clone, Serialize)]
#[allow(non_snake_case)]
pub struct MixtureRow {
    /// Liquid state (`props::liquid::state`).
    #[serde(flatten)]
    pub liquid: liquid::LiquidState,
    /// Latent heat per kg of equilibrium vapour \[J/kg\].
    pub latent_heat_equilibrium_vapor_J_kg: f64,
    /// Liquid mass diffusivity \[m²/s\].
    pub liquid_diffusivity_m2_s: f64,
    /// Equilibrium vapour at this temperature.
    #[serde(skip)]
    pub vapor: VaporState,
    /// Specific enthalpy of the liquid (reference: liquid at 298.15 K) \[J/kg\].
    pub liquid_enthalpy_J_kg: f64,
    /// Specific enthalpy of the liquid's composition as a vapour, liquid enthalpy + latent heat \[J/kg\].
    pub vapor_enthalpy_J_kg: f64,
    /// Validity flag.
    pub validity: Validity,
    /// Property keys evaluated outside their valid range.
    pub extrapolated_properties: Vec<&'static str>,
    /// Supercritical, near-critical and extrapolated mole fractions of the liquid ([`super::SHARE_COLUMNS`]).
    pub shares: [f64; 3],
}

impl MixtureRow {
    /// The numeric cells in [`MIXTURE_COLUMNS`] order.
    pub fn numbers(&self) -> [f64; 18] {
        let l = &self.liquid;
        let v = &self.vapor;
        [
            l.temperature_K,
            l.density_kg_m3,
            l.cp_J_kgK,
            l.viscosity_Pa_s,
            l.kinematic_viscosity_m2_s,
            l.conductivity_W_mK,
            l.surface_tension_N_m,
            l.latent_heat_J_kg,
            l.vapor_pressure_Pa,
            self.latent_heat_equilibrium_vapor_J_kg,
            self.liquid_diffusivity_m2_s,
            v.molar_mass,
            v.cp,
            v.viscosity,
            v.conductivity,
            v.diffusivity,
            self.liquid_enthalpy_J_kg,
            self.vapor_enthalpy_J_kg,
        ]
    }
}

/// Mass-weighted liquid heat capacity Σ w_i cp_i of mass fractions `w` at `t` (the `props::liquid::state` rule) \[J/(kg·K)\].
pub fn mixture_liquid_cp(components: &[Arc<Component>], w: &[f64], t: f64) -> f64 {
    components.iter().zip(w).map(|(c, w)| w * c.liquid_heat_capacity(t)).sum()
}

/// Evaluate one mixture row at `t` (mass fractions `w`) at table pressure `p` in `gas`, with the liquid activity
/// model `activity` (bubble pressure and equilibrium vapour) and the liquid enthalpy at `t` (from
/// [`super::enthalpy::cumulative_enthalpy`] of [`mixture_liquid_cp`]); the vapour enthalpy is it plus the
/// latent heat.
#[allow(clippy::too_many_arguments)]
pub fn mixture_row(components: &[Arc<Component>], activity: &mut Activity, w: &[f64], gas: &AmbientGas, p: f64, t: f64, limits: &RangeLimits, liquid_enthalpy: f64) -> MixtureRow {
    let x = liquid::mass_to_mole(components, w);
    let mut state = liquid::state(components, w, t);
    state.vapor_pressure_Pa = activity.bubble_pressure(components, &x, t);
    let eps = equilibrium_vapor_mass_fractions(components, activity, &x, t);
    let latent_eq = components.iter().zip(&eps).map(|(c, e)| e * c.latent_heat(t)).sum();
    let vapor = vapor_state(components, &eps, gas, t, p);
    let liquid_diffusivity = mixture_liquid_diffusivity(components, &x, state.viscosity_Pa_s, t);
    let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
    let g = grade(components, &x, t, &keys, limits.bubble_point);
    let vapor_enthalpy = liquid_enthalpy + state.latent_heat_J_kg;
    MixtureRow {
        liquid: state,
        latent_heat_equilibrium_vapor_J_kg: latent_eq,
        liquid_diffusivity_m2_s: liquid_diffusivity,
        vapor,
        liquid_enthalpy_J_kg: liquid_enthalpy,
        vapor_enthalpy_J_kg: vapor_enthalpy,
        shares: g.shares(),
        validity: g.validity,
        extrapolated_properties: g.extrapolated_properties,
    }
}

/// A mixture table: the composition, its range and rows.
#[derive(Debug, Clone)]
pub struct MixtureTable {
    /// Label used in file names and fits (`mixture`, `mixture_residue_0.30`).
    pub label: String,
    /// The liquid (name, components, mass fractions).
    pub fuel: Fuel,
    /// Evaporated fraction of the parent fuel for a residue table \[-\].
    pub evaporated_fraction: Option<f64>,
    /// Table pressure \[Pa\].
    pub pressure: f64,
    /// Ambient-gas label.
    pub gas: String,
    /// Range limits (bubble point, critical limit, freezing point).
    pub limits: RangeLimits,
    /// Temperatures.
    pub grid: TemperatureGrid,
    /// Rows.
    pub rows: Vec<MixtureRow>,
    /// Largest departure of the vapour enthalpy column from the ideal-gas enthalpy path of the liquid's
    /// composition as a vapour (Σ w_i cp_ig,i), relative to the latent heat ([`super::enthalpy::ideal_gas_gap`]) \[-\].
    pub ideal_gas_enthalpy_gap: f64,
}

/// Build the mixture table of `fuel` at `opts.pressure` over the user or default range.
pub fn mixture_table(label: &str, fuel: &Fuel, opts: &TableOptions) -> Result<MixtureTable, TableError> {
    let mut activity = Activity::new(opts.activity, &fuel.components).map_err(|e| input("activity", opts.activity.as_str().into(), format!("fuel {}: {e}", fuel.origin)))?;
    let limits = range_limits(&fuel.components, &fuel.mass_fractions, opts.pressure, opts.activity);
    let grid = liquid_grid(&limits, opts.from, opts.to, opts.step)?;
    let (comps, w) = (&fuel.components, &fuel.mass_fractions);
    let h_liquid = cumulative_enthalpy(&|t| mixture_liquid_cp(comps, w, t), &grid.temperatures);
    let rows: Vec<MixtureRow> = grid.temperatures.iter().zip(&h_liquid).map(|(t, h)| mixture_row(comps, &mut activity, w, &opts.gas, opts.pressure, *t, &limits, *h)).collect();
    let h_vapor: Vec<f64> = rows.iter().map(|r| r.vapor_enthalpy_J_kg).collect();
    let latent: Vec<f64> = rows.iter().map(|r| r.liquid.latent_heat_J_kg).collect();
    let cp_ig = |t: f64| comps.iter().zip(w).map(|(c, w)| w * c.ideal_gas_heat_capacity(t)).sum::<f64>();
    let gap = ideal_gas_gap(&cp_ig, &grid.temperatures, &h_vapor, &latent);
    Ok(MixtureTable { label: label.to_string(), fuel: fuel.clone(), evaporated_fraction: None, pressure: opts.pressure, gas: opts.gas.label.clone(), limits, grid, rows, ideal_gas_enthalpy_gap: gap })
}


#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::props::activity::ActivityModel;
    use crate::table::{range_excursions, LIQUID_KEYS};

    fn setup(fuel: &str) -> (Fuel, AmbientGas) {
        let lib = Library::embedded().unwrap();
        let f = Fuel::resolve(fuel, &lib).unwrap();
        let g = AmbientGas::air(&lib).unwrap();
        (f, g)
    }

    fn close(a: f64, b: f64) -> bool {
        (a - b).abs() <= 1e-12 * b.abs().max(1e-300)
    }

    /// Identity: a one-component mixture row equals the component's own properties.
    #[test]
    fn one_component_row_is_the_component() {
        let (fuel, gas) = setup("n-decane");
        let c = &fuel.components[0];
        let limits = range_limits(&fuel.components, &fuel.mass_fractions, 101_325.0, ActivityModel::Ideal);
        let mut ideal = Activity::ideal(fuel.components.len());
        for t in [260.0, 350.0, 440.0] {
            let r = mixture_row(&fuel.components, &mut ideal, &fuel.mass_fractions, &gas, 101_325.0, t, &limits, 123.0);
            let l = &r.liquid;
            assert!(close(l.density_kg_m3, c.liquid_density(t)) && close(l.cp_J_kgK, c.liquid_heat_capacity(t)) && close(l.viscosity_Pa_s, c.liquid_viscosity(t)));
            assert!(close(l.conductivity_W_mK, c.liquid_conductivity(t)) && close(l.surface_tension_N_m, c.surface_tension(t)));
            assert!(close(l.latent_heat_J_kg, c.latent_heat(t)) && close(l.vapor_pressure_Pa, c.vapor_pressure(t)));
            assert!(close(r.latent_heat_equilibrium_vapor_J_kg, c.latent_heat(t)));
            assert!(close(r.vapor.cp, c.ideal_gas_heat_capacity(t)) && close(r.vapor.viscosity, c.vapor_viscosity(t)) && close(r.vapor.conductivity, c.vapor_conductivity(t)));
            assert!(close(r.vapor.diffusivity, vapor_diffusion_coefficient(c, &gas, t, 101_325.0)) && close(r.vapor.molar_mass, c.molar_mass()));
            assert!(r.liquid_enthalpy_J_kg == 123.0 && close(r.vapor_enthalpy_J_kg, 123.0 + c.latent_heat(t)));
        }
    }

    /// The enthalpy quadrature uses the same cp as the cp column: Σ w_i cp_i equals `liquid::state`'s cp.
    #[test]
    fn enthalpy_integrand_is_the_cp_column() {
        let (fuel, _) = setup("demo-wide");
        for t in [240.0, 400.0, 560.0] {
            let s = liquid::state(&fuel.components, &fuel.mass_fractions, t);
            assert!((mixture_liquid_cp(&fuel.components, &fuel.mass_fractions, t) - s.cp_J_kgK).abs() < 1e-9 * s.cp_J_kgK);
        }
    }

    /// Default ends: n-dodecane freezes at 263.6 K (first row 265 K) and boils at 489.5 K at 1 atm (last row
    /// 485 K); at 10 bar the bubble point is 614.1 K (last row 610 K) and rows above 0.9 Tc = 592.2 K are
    /// near-critical; rows above the bubble point of a user range are flagged.
    #[test]
    fn default_range_and_flags() {
        let (fuel, gas) = setup("n-dodecane");
        let mut opts = TableOptions::new(gas);
        opts.surrogate = None;
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        assert!((t.grid.from - 265.0).abs() < 1e-9 && (t.grid.to - 485.0).abs() < 1e-9, "{:?}", t.grid);
        assert_eq!(t.rows.len(), 45);
        // Every row from the lower end of the Mulero–Cachadiña surface-tension range (273.15 K) to the last row below
        // Tb is ok; below it only the surface tension is outside its published range, graded as the whole liquid.
        for r in &t.rows {
            let tt = r.liquid.temperature_K;
            if tt >= 273.15 {
                assert_eq!(r.validity, Validity::Ok, "{tt} {:?}", r.extrapolated_properties);
                assert_eq!(r.shares, [0.0, 0.0, 0.0]);
            } else {
                assert_eq!((r.validity, r.extrapolated_properties.clone(), r.shares), (Validity::Extrapolated, vec!["surface-tension"], [0.0, 0.0, 1.0]), "{tt}");
            }
        }
        let outside = range_excursions(&fuel.components, &fuel.mass_fractions, 265.0, 485.0, &LIQUID_KEYS);
        assert_eq!(outside.len(), 1);
        assert!((outside[0].below_K - (273.15 - 265.0)).abs() < 1e-9 && outside[0].above_K == 0.0, "{outside:?}");
        opts.pressure = 1e6;
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        assert!((t.grid.to - 610.0).abs() < 1e-9, "{:?}", t.grid);
        for r in &t.rows {
            let tt = r.liquid.temperature_K;
            assert_eq!(r.validity == Validity::NearCritical, tt > 0.9 * 658.0, "{tt}");
        }
        opts.pressure = 101_325.0;
        opts.to = Some(520.0);
        let t = mixture_table("mixture", &fuel, &opts).unwrap();
        let above: Vec<f64> = t.rows.iter().filter(|r| r.validity == Validity::AboveBubblePoint).map(|r| r.liquid.temperature_K).collect();
        assert_eq!(above, vec![490.0, 495.0, 500.0, 505.0, 510.0, 515.0, 520.0]);
        // errors name the option
        opts.to = Some(700.0);
        let e = mixture_table("mixture", &fuel, &opts).unwrap_err().to_string();
        assert!(e.starts_with("--to 700 K"), "{e}");
    }
}
