//! Open-vessel batch evaporation ("weathering") at a fixed temperature, and residue tables.
//!
//! At constant temperature the vapour leaving an ideal liquid has a composition ∝ x_i p_sat,i(T), and the
//! liquid loses moles in that proportion (a Rayleigh path with constant relative volatilities), which has
//! the closed form n_i ∝ n_i0 exp(−p_sat,i s); [`super::rayleigh`] solves for the path parameter s that
//! gives each requested evaporated mass fraction.

use std::sync::Arc;

use serde::Serialize;

use crate::data::Component;
use crate::props::liquid;

use super::indicators::{indicators, IndicatorOptions, Indicators};
use super::rayleigh::{self, PathMode};
use super::{normalised, PostError, RecoveryBasis};

/// Default evaporated mass fractions of a residue table: 0, 0.05, …, 0.95.
pub fn default_fractions() -> Vec<f64> {
    (0..20).map(|i| f64::from(i) * 0.05).collect()
}

/// A residual liquid: what is left of a parent liquid after part of it evaporated.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Residue {
    /// Evaporated mass fraction of the parent liquid \[-\].
    pub evaporated_fraction: f64,
    /// Mass fractions of the residue, in the parent's component order \[-\].
    pub mass_fractions: Vec<f64>,
}

/// One row of a residue table: the residue and its indicators (with `evaporated_fraction` filled in).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResidueRow {
    /// Evaporated mass fraction of the parent liquid \[-\].
    pub evaporated_fraction: f64,
    /// Mass fractions of the residue \[-\].
    pub mass_fractions: Vec<f64>,
    /// Indicators of the residue.
    pub indicators: Indicators,
}

/// Residues of open-vessel evaporation at `temperature` \[K\] at each evaporated mass fraction of
/// `evaporated_fractions` (ascending, each in [0, 1)).
pub fn weathering_residues(
    components: &[Arc<Component>],
    mass_fractions: &[f64],
    temperature: f64,
    evaporated_fractions: &[f64],
    activity: crate::props::activity::ActivityModel,
) -> Result<Vec<Residue>, PostError> {
    let w = normalised(components, mass_fractions, "mass fractions")?;
    let x = liquid::mass_to_mole(components, &w);
    let active: Vec<usize> = (0..components.len()).filter(|&i| x[i] > 0.0).collect();
    let comps: Vec<Arc<Component>> = active.iter().map(|&i| components[i].clone()).collect();
    let xa: Vec<f64> = active.iter().map(|&i| x[i]).collect();
    let weights = rayleigh::basis_weights(&comps, RecoveryBasis::Mass);
    let (pts, _) = rayleigh::integrate(&comps, &xa, &weights, PathMode::Isothermal(temperature), evaporated_fractions, 0.02, activity)?; // ideal: closed form, no step
    Ok(pts
        .into_iter()
        .map(|p| {
            let mut full = vec![0.0; components.len()];
            for (&i, xi) in active.iter().zip(&p.mole_fractions) {
                full[i] = *xi;
            }
            Residue { evaporated_fraction: p.evaporated_fraction, mass_fractions: liquid::mole_to_mass(components, &full) }
        })
        .collect())
}

/// Evaluate the indicators of each residue (any source: weathering or a droplet run).
pub fn residue_table(components: &[Arc<Component>], residues: &[Residue], opts: &IndicatorOptions) -> Result<Vec<ResidueRow>, PostError> {
    residues
        .iter()
        .map(|r| {
            let mut ind = indicators(components, &r.mass_fractions, opts)?;
            ind.evaporated_fraction = Some(r.evaporated_fraction);
            Ok(ResidueRow { evaporated_fraction: r.evaporated_fraction, mass_fractions: r.mass_fractions.clone(), indicators: ind })
        })
        .collect()
}

/// Weathering residues at `temperature` and their indicators, in one call.
pub fn weathering_table(
    components: &[Arc<Component>],
    mass_fractions: &[f64],
    temperature: f64,
    evaporated_fractions: &[f64],
    opts: &IndicatorOptions,
) -> Result<Vec<ResidueRow>, PostError> {
    let residues = weathering_residues(components, mass_fractions, temperature, evaporated_fractions, opts.activity)?;
    residue_table(components, &residues, opts)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;

    /// Against an independent evaluation of n_i(s) = n_i0 exp(−p_sat,i s) (unscaled rates, Brent's method on s).
    #[test]
    fn matches_closed_form() {
        let l = Library::embedded().unwrap();
        let fuel = Fuel::resolve("demo-wide", &l).unwrap();
        let t = 400.0;
        let fr = default_fractions();
        let res = weathering_residues(&fuel.components, &fuel.mass_fractions, t, &fr, Default::default()).unwrap();
        let x0 = fuel.mole_fractions();
        let p: Vec<f64> = fuel.components.iter().map(|c| c.vapor_pressure(t)).collect();
        let m: Vec<f64> = fuel.components.iter().map(|c| c.molar_mass()).collect();
        let mass0: f64 = x0.iter().zip(&m).map(|(x, m)| x * m).sum();
        let remaining = |s: f64| x0.iter().zip(&p).zip(&m).map(|((x, p), m)| x * m * (-p * s).exp()).sum::<f64>() / mass0;
        for r in &res {
            // root of remaining(s) = 1 − F, bracketed by doubling
            let mut hi = 1.0;
            while remaining(hi) > 1.0 - r.evaporated_fraction {
                hi *= 2.0;
            }
            let s = crate::numerics::root::brent(|s| remaining(s) - (1.0 - r.evaporated_fraction), 0.0, hi, crate::numerics::root::Tolerance::relative(1e-15)).unwrap().x;
            let n: Vec<f64> = x0.iter().zip(&p).zip(&m).map(|((x, p), m)| x * m * (-p * s).exp()).collect();
            let tot: f64 = n.iter().sum();
            for (a, b) in r.mass_fractions.iter().zip(&n) {
                assert!((a - b / tot).abs() < 1e-7, "F {}: {a} vs {}", r.evaporated_fraction, b / tot);
            }
        }
        // mass fractions sum to one, first residue is the fuel
        for (a, b) in res[0].mass_fractions.iter().zip(&fuel.mass_fractions) {
            assert!((a - b).abs() < 1e-12);
        }
    }

    #[test]
    fn table_fills_evaporated_fraction() {
        let l = Library::embedded().unwrap();
        let fuel = Fuel::resolve("demo-narrow", &l).unwrap();
        let rows = weathering_table(&fuel.components, &fuel.mass_fractions, 380.0, &[0.0, 0.5, 0.9], &IndicatorOptions::default()).unwrap();
        assert_eq!(rows.len(), 3);
        assert_eq!(rows[1].indicators.evaporated_fraction, Some(0.5));
        assert!(rows[2].indicators.bubble_point_K.unwrap() > rows[0].indicators.bubble_point_K.unwrap());
        assert!(weathering_residues(&fuel.components, &fuel.mass_fractions, 380.0, &[0.5, 0.2], Default::default()).is_err());
        assert!(weathering_residues(&fuel.components, &fuel.mass_fractions, 380.0, &[1.0], Default::default()).is_err());
    }
}
