//! Joback & Reid (1987) group contributions for hydrocarbon (and alcohol) groups: normal boiling point,
//! critical constants, ideal-gas heat capacity and liquid viscosity. Group keys as in component files:
//! `CH3 CH2 CH C` (chain), `rCH2 rCH` (saturated ring), `rCHa rCa` (aromatic ring =CH−, =C<), `OH` (alcohol).
//!
//! Sources: Tc, Pc, Vc, Tb and cp increments as reprinted in Poling, Prausnitz & O'Connell, The Properties of
//! Gases and Liquids, 5th ed. (2001), Table C-1. The liquid-viscosity increments (η_a, η_b) are Joback &
//! Reid's, identical to the Joback table carried by thermo 0.6.1 (group_contribution/joback.py, mua/mub), and are checked in src/checks against published viscosity
//! correlations of the library (alkanes and alkylbenzenes within about 20 % at 250–350 K; fused rings are
//! under-predicted by up to a factor of 3, a known weakness of the method).

use crate::data::GAS_CONSTANT;

pub use crate::data::joback_groups::{group, Group, GROUPS};

/// Group counts of one molecule.
pub type Groups = [(&'static Group, u32)];

fn sum(groups: &Groups, f: impl Fn(&Group) -> f64) -> f64 {
    groups.iter().map(|(g, n)| f(g) * f64::from(*n)).sum()
}

/// Normal boiling point Tb = 198 + ΣΔTb \[K\] (Joback & Reid 1987).
pub fn boiling_point(groups: &Groups) -> f64 {
    198.0 + sum(groups, |g| g.tb)
}

/// Critical temperature from a (measured or estimated) boiling point \[K\].
pub fn critical_temperature(groups: &Groups, tb: f64) -> f64 {
    let s = sum(groups, |g| g.tc);
    tb / (0.584 + 0.965 * s - s * s)
}

/// Critical pressure \[Pa\].
pub fn critical_pressure(groups: &Groups) -> f64 {
    let atoms: f64 = groups.iter().map(|(g, n)| f64::from(g.atoms * n)).sum();
    1e5 / (0.113 + 0.0032 * atoms - sum(groups, |g| g.pc)).powi(2)
}

/// Critical volume \[m³/mol\].
pub fn critical_volume(groups: &Groups) -> f64 {
    (17.5 + sum(groups, |g| g.vc)) * 1e-6
}

/// Ideal-gas heat capacity polynomial coefficients (J/(mol·K); a + bT + cT² + dT³).
pub fn cp_coefficients(groups: &Groups) -> [f64; 4] {
    [sum(groups, |g| g.cp[0]) - 37.93, sum(groups, |g| g.cp[1]) + 0.210, sum(groups, |g| g.cp[2]) - 3.91e-4, sum(groups, |g| g.cp[3]) + 2.06e-7]
}

/// Ideal-gas heat capacity \[J/(mol·K)\] (valid about 280–1000 K; held at 1000 K above).
pub fn ideal_gas_cp(groups: &Groups, t: f64) -> f64 {
    let c = cp_coefficients(groups);
    let t = t.clamp(200.0, 1000.0);
    (c[0] + t * (c[1] + t * (c[2] + t * c[3]))).max(GAS_CONSTANT * 4.0)
}

/// Liquid viscosity \[Pa·s\]: μ = W exp[(Ση_a − 597.82)/T + Ση_b − 11.202], W in g/mol; None when a group has no
/// viscosity increments. Intended for Tr below about 0.7.
pub fn liquid_viscosity(groups: &Groups, molar_mass: f64, t: f64) -> Option<f64> {
    if groups.is_empty() || groups.iter().any(|(g, _)| g.eta.is_none()) {
        return None;
    }
    let a = sum(groups, |g| g.eta.map_or(0.0, |e| e.0));
    let b = sum(groups, |g| g.eta.map_or(0.0, |e| e.1));
    Some(molar_mass * 1e3 * ((a - 597.82) / t + b - 11.202).exp())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn groups(list: &[(&str, u32)]) -> Vec<(&'static Group, u32)> {
        list.iter().map(|(k, n)| (group(k).unwrap(), *n)).collect()
    }

    /// Joback n-dodecane by hand with Poling's form Tb = 198 + ΣΔTb: Tb = 198 + 2·23.58 + 10·22.88 = 473.96 K;
    /// S = 0.2172, Tc = 473.96/(0.584 + 0.965 S − S²) = 635.0 K; pc 17.8 bar (the physics notes' 474.2/635.2 K
    /// use 198.2 as the constant).
    #[test]
    fn n_dodecane_constants() {
        let g = groups(&[("CH3", 2), ("CH2", 10)]);
        let tb = boiling_point(&g);
        assert!((tb - 473.96).abs() < 0.01, "{tb}");
        assert!((critical_temperature(&g, tb) - 635.0).abs() < 0.1);
        assert!((critical_pressure(&g) / 1e5 - 17.8).abs() < 0.1);
    }
}
