//! Mixture rules behind the fuel-quality indicators of [`indicators`](mod@super::indicators): the pure-component and mixture
//! flash points (Butler et al. 1956 estimate; Liaw et al. 2002 mixture rule), the blend cetane number and
//! where it comes from, and the freezing point (the first solid of an ideal solution).
//!
//! Screening estimates only (see [`super::limits::CAUTION`]): a flash point estimate never replaces a measured
//! one for handling or safety decisions.

use std::sync::Arc;

use crate::data::{Component, GAS_CONSTANT};
use crate::numerics::root::{brent, Tolerance};
use crate::props::activity::{Activity, ActivityModel};
use crate::props::kernels::VaporPressures;

use super::indicators::CetaneRule;

/// Where a component's pure flash point comes from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FlashPointOrigin {
    /// The component file's published closed-cup value.
    Published,
    /// Estimated from the normal boiling point by [`butler_flash_point`].
    EstimatedButler,
}

/// Flash point estimated from the normal boiling point, T_fp = 0.683 T_b + 14.84 \[K\].
///
/// Butler et al. (1956), Ind. Eng. Chem. 48, 808, as the °F form T_fp = 0.683 T_b − 119 °F (recalled
/// from memory, not read in the original), converted exactly to kelvin. Checked in
/// `checks::residue` against the published flash points of the component library's hydrocarbons.
pub fn butler_flash_point(normal_boiling_point: f64) -> f64 {
    0.683 * normal_boiling_point + (-119.0 + 459.67 - 0.683 * 459.67) / 1.8
}

/// A component's closed-cup flash point \[K\]: the file's value, else the Butler estimate.
pub fn component_flash_point(c: &Component) -> (f64, FlashPointOrigin) {
    match &c.constants.flash_point {
        Some(f) => (f.value, FlashPointOrigin::Published),
        None => (butler_flash_point(c.normal_boiling_point()), FlashPointOrigin::EstimatedButler),
    }
}

/// Liaw et al. (2002) flash point of a liquid mixture \[K\]: the T that solves
/// Σ x_i γ_i p_sat,i(T) / p_sat,i(T_fp,i) = 1 (Le Chatelier's rule with the modified Raoult's law; γ = 1 for the
/// ideal model, UNIFAC γ_i(x, T) for the non-ideal one, as in Liaw et al.'s non-ideal form), given each
/// component's closed-cup flash point `pure_flash_points[i]`. Components with x_i = 0 are ignored. `None` when
/// no solution is bracketed or the activity model cannot be prepared.
pub fn liaw_flash_point(components: &[Arc<Component>], mole_fractions: &[f64], pure_flash_points: &[f64], activity: ActivityModel) -> Option<f64> {
    let mut act = Activity::new(activity, components).ok()?;
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    // (component index, x_i, p_sat,i at its flash point)
    let mut terms: Vec<(usize, f64, f64)> = Vec::with_capacity(components.len());
    for (i, ((c, &x), &tf)) in components.iter().zip(mole_fractions).zip(pure_flash_points).enumerate() {
        if x > 0.0 {
            let p_fp = c.vapor_pressure(tf);
            if !(p_fp.is_finite() && p_fp > 0.0) {
                return None;
            }
            terms.push((i, x, p_fp));
            lo = lo.min(tf);
            hi = hi.max(tf);
        }
    }
    if terms.is_empty() {
        return None;
    }
    let ideal = act.is_ideal();
    let mut vapor_pressures = VaporPressures::new(components);
    let g = |t: f64| {
        if ideal {
            terms.iter().map(|&(i, x, p_fp)| x * vapor_pressures.at(i, t) / p_fp).sum::<f64>().ln()
        } else {
            let gamma = act.gammas(mole_fractions, t);
            let mut s = 0.0;
            for &(i, x, p_fp) in &terms {
                s += x * gamma[i] * vapor_pressures.at(i, t) / p_fp;
            }
            s.ln()
        }
    };
    // Ideal: the root lies between the lowest and the highest pure flash point (each term is ≤ x_i at the
    // lowest and ≥ x_i at the highest); widen slightly for round-off. With activity coefficients above 1 the
    // mixture can flash below its lowest component: search from 100 K below.
    let lo = if ideal { lo - 0.5 } else { (lo - 100.0).max(100.0) };
    brent(g, lo, hi + 0.5, Tolerance::absolute(1e-10)).ok().map(|r| r.x)
}

/// True when a component's cetane value is a measured derived cetane number: kind "DCN" from a published
/// source (not `from-memory`, `common-practice` or `estimated:`).
pub fn is_measured_dcn(c: &Component) -> bool {
    let v = &c.constants.cetane_number;
    v.kind.as_deref() == Some("DCN") && !(v.source == "from-memory" || v.source == "common-practice" || v.source.starts_with("estimated"))
}

/// Share of the blend weights `f` carried by components without a measured DCN, and a short breakdown
/// ("engine CN 40.0 %, estimate 10.0 %, from memory 5.0 %").
pub fn cetane_basis(components: &[Arc<Component>], f: &[f64]) -> (f64, String) {
    let total: f64 = f.iter().filter(|v| **v > 0.0).sum();
    if total <= 0.0 {
        return (0.0, String::new());
    }
    let (mut cn, mut est, mut memory) = (0.0, 0.0, 0.0);
    for (c, f) in components.iter().zip(f) {
        if *f <= 0.0 || is_measured_dcn(c) {
            continue;
        }
        let v = &c.constants.cetane_number;
        if v.source == "from-memory" || v.source == "common-practice" {
            memory += f;
        } else if v.kind.as_deref() == Some("estimate") || v.source.starts_with("estimated") {
            est += f;
        } else {
            cn += f;
        }
    }
    let parts: Vec<String> = [("engine CN", cn), ("estimate", est), ("recalled from memory", memory)]
        .iter()
        .filter(|(_, v)| *v > 0.0)
        .map(|(n, v)| format!("{n} {:.1} %", 100.0 * v / total))
        .collect();
    ((cn + est + memory) / total, parts.join(", "))
}

/// Blend of component cetane numbers by `rule`; `w` mass fractions, `x` mole fractions, `v` volume fractions.
pub fn blend_cetane(components: &[Arc<Component>], w: &[f64], x: &[f64], v: &[f64], rule: CetaneRule) -> f64 {
    let f = match rule {
        CetaneRule::VolumeLinear => v,
        CetaneRule::MoleLinear => x,
        CetaneRule::MassLinear => w,
    };
    components.iter().zip(f).map(|(c, f)| f * c.constants.cetane_number.value).sum()
}

/// Ideal solid–liquid solubility (Schröder–van Laar, ΔCp neglected): the saturation temperature of each
/// component with an enthalpy of fusion, T_i = 1 / (1/T_m,i − R ln x_i / ΔH_fus,i); the freezing point is
/// the highest. Returns the value (None if no component qualifies), the controlling component, and the
/// ids of components skipped for lack of an enthalpy of fusion.
pub fn freezing_point(components: &[Arc<Component>], mole_fractions: &[f64]) -> (Option<f64>, Option<String>, Vec<String>) {
    let mut best: Option<(f64, &str)> = None;
    let mut skipped = vec![];
    for (c, &x) in components.iter().zip(mole_fractions) {
        if x <= 0.0 {
            continue;
        }
        let Some(h) = c.constants.enthalpy_of_fusion.as_ref() else {
            skipped.push(c.id.clone());
            continue;
        };
        let tm = c.constants.melting_point.value;
        let t = 1.0 / (1.0 / tm - GAS_CONSTANT * x.ln() / h.value);
        if best.is_none_or(|(b, _)| t > b) {
            best = Some((t, c.id.as_str()));
        }
    }
    (best.map(|b| b.0), best.map(|b| b.1.to_string()), skipped)
}
