//! Fuel-quality indicators of any liquid composition: simulated distillation, bubble point, vapour
//! pressure, flash point, density, viscosity, surface tension, derived cetane number, heating value,
//! hydrogen content, aromatics and freezing point. All values SI; every indicator carries a `method`
//! string, and an indicator that cannot be computed is `None` (JSON null) with a note saying why.
//!
//! These are screening estimates from an ideal-solution model (see [`super::limits::CAUTION`]); a flash
//! point estimate in particular never replaces a measured one for handling or safety decisions.
//!
//! # The simulated distillation curve and the standard ones
//! The curve here is a single-stage batch (Rayleigh) distillation at 1 atm: the vapour leaving is in
//! equilibrium with the whole liquid, which is at its bubble point throughout. The initial boiling point
//! (IBP) is the feed's bubble point; the final boiling point (FBP) is *defined* here as the temperature at
//! 99.5 % evaporated (the curve only reaches the heaviest component's boiling point as F → 1). By default
//! the evaporated fraction is on a liquid-volume basis at 15 °C, as distillations report % recovered.
//!
//! How it relates to the standard curves: a true-boiling-point distillation (TBP, ASTM D2892, many
//! theoretical plates with reflux) separates the components almost by boiling point, so its curve is the
//! widest (lower IBP, higher end point); simulated distillation by gas chromatography (D2887) approximates
//! TBP. ASTM D86 is a nearly single-stage batch distillation without reflux, close to the Rayleigh model,
//! so this curve is the natural D86 proxy — but D86 also has heat losses, vapour hold-up and a
//! thermometer reading the vapour, which shift its ends (its IBP reads high and its end point low
//! compared with the bubble-point curve), and it is not corrected for the ideal-solution assumption. An
//! equilibrium flash vaporisation curve is flatter still. Compare T10/T50/T90 with D86 limits as a
//! screening aid only; the ends of the curve are the least comparable points.

use std::sync::Arc;

use serde::{Deserialize, Serialize};

use crate::data::Component;
use crate::props::activity::{Activity, ActivityModel};
use crate::props::liquid;

pub use super::mixture_rules::{blend_cetane, butler_flash_point, cetane_basis, component_flash_point, freezing_point, is_measured_dcn, liaw_flash_point, FlashPointOrigin};
pub use super::indicator_values::{IndicatorSelection, Indicators, INDICATOR_KEYS};
use super::rayleigh::{self, PathMode};
use super::{normalised, PostError};

/// Standard atmosphere \[Pa\].
pub const STANDARD_PRESSURE: f64 = 101_325.0;
/// 15 °C \[K\].
pub const T_15C: f64 = 288.15;
/// 20 °C \[K\].
pub const T_20C: f64 = 293.15;
/// 38 °C \[K\] (100 °F, the vapour-pressure and flash-point reference temperature).
pub const T_38C: f64 = 311.15;
/// 40 °C \[K\].
pub const T_40C: f64 = 313.15;
/// −20 °C \[K\].
pub const T_MINUS_20C: f64 = 253.15;
/// −40 °C \[K\].
pub const T_MINUS_40C: f64 = 233.15;
/// Default evaporated fraction that defines the final boiling point of the simulated curve \[-\].
pub const DEFAULT_FINAL_FRACTION: f64 = 0.995;
/// Default largest RK4 step in φ = −ln(1 − F) for the simulated distillation \[-\].
pub const DEFAULT_MAX_STEP: f64 = 0.5;

/// Basis of the recovered (evaporated) fraction of a distillation curve.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum RecoveryBasis {
    /// Liquid volume at 15 °C (as standard distillations report % recovered).
    Volume,
    /// Mass.
    Mass,
    /// Moles.
    Mole,
}

impl RecoveryBasis {
    /// Name as written in files and on the command line.
    pub fn as_str(self) -> &'static str {
        match self {
            RecoveryBasis::Volume => "volume",
            RecoveryBasis::Mass => "mass",
            RecoveryBasis::Mole => "mole",
        }
    }
}

/// Blending rule for the mixture liquid viscosity.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum ViscosityRule {
    /// Grunberg–Nissan (1949) with zero interaction: ln μ = Σ x_i ln μ_i, then ν = μ/ρ.
    GrunbergNissan,
    /// Refutas viscosity-blending number on mass fractions (Maples 2000; the ASTM D7152 practice).
    Refutas,
}

impl ViscosityRule {
    /// Name as written in files and on the command line.
    pub fn as_str(self) -> &'static str {
        match self {
            ViscosityRule::GrunbergNissan => "grunberg-nissan",
            ViscosityRule::Refutas => "refutas",
        }
    }
}

/// Blending rule for the derived cetane number.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum CetaneRule {
    /// Σ v_i CN_i with liquid volume fractions at 15 °C: the definition of the cetane scale for the
    /// primary reference fuels (ASTM D613) and the usual first approximation for other blends.
    VolumeLinear,
    /// Σ x_i CN_i with mole fractions: a simple alternative, no standard behind it.
    MoleLinear,
    /// Σ w_i CN_i with mass fractions: a simple alternative, no standard behind it.
    MassLinear,
}

impl CetaneRule {
    /// Name as written in files and on the command line.
    pub fn as_str(self) -> &'static str {
        match self {
            CetaneRule::VolumeLinear => "volume-linear",
            CetaneRule::MoleLinear => "mole-linear",
            CetaneRule::MassLinear => "mass-linear",
        }
    }
}

/// Options of [`indicators`].
#[derive(Debug, Clone, PartialEq)]
pub struct IndicatorOptions {
    /// Pressure of the bubble point and the simulated distillation \[Pa\].
    pub pressure: f64,
    /// Basis of the distillation recovered fraction.
    pub recovery_basis: RecoveryBasis,
    /// Viscosity blending rule.
    pub viscosity_rule: ViscosityRule,
    /// Cetane blending rule.
    pub cetane_rule: CetaneRule,
    /// Evaporated fraction that defines the final boiling point \[-\], in (0.5, 1).
    pub final_fraction: f64,
    /// Largest RK4 step in φ = −ln(1 − F) along the distillation \[-\].
    pub max_step: f64,
    /// Liquid activity model of the bubble point, distillation, vapour pressure and flash point.
    pub activity: ActivityModel,
    /// Indicators to compute (default: all). Unrequested indicators are not computed: they stay `None` with
    /// no method and no note; the requested ones have exactly the values, methods and notes of a full call.
    pub selection: IndicatorSelection,
}


impl Default for IndicatorOptions {
    fn default() -> Self {
        IndicatorOptions {
            pressure: STANDARD_PRESSURE,
            recovery_basis: RecoveryBasis::Volume,
            viscosity_rule: ViscosityRule::GrunbergNissan,
            cetane_rule: CetaneRule::VolumeLinear,
            final_fraction: DEFAULT_FINAL_FRACTION,
            max_step: DEFAULT_MAX_STEP,
            activity: ActivityModel::Ideal,
            selection: IndicatorSelection::ALL,
        }
    }
}


/// Temperatures of the simulated batch (Rayleigh) distillation at `pressure` at each evaporated fraction of
/// `fractions` (ascending, in [0, 1)) on `basis` \[K\]. `mole_fractions` may contain zeros.
pub fn distillation_temperatures(
    components: &[Arc<Component>],
    mole_fractions: &[f64],
    pressure: f64,
    basis: RecoveryBasis,
    fractions: &[f64],
    max_step: f64,
    activity: ActivityModel,
) -> Result<Vec<f64>, PostError> {
    let (comps, x): (Vec<Arc<Component>>, Vec<f64>) =
        components.iter().zip(mole_fractions).filter(|(_, x)| **x > 0.0).map(|(c, x)| (c.clone(), *x)).unzip();
    let weights = rayleigh::basis_weights(&comps, basis);
    let (pts, _) = rayleigh::integrate(&comps, &x, &weights, PathMode::Isobaric(pressure), fractions, max_step, activity)?;
    Ok(pts.into_iter().map(|p| p.temperature).collect())
}

/// Names of the components whose viscosity at `t` comes from outside the correlation's validity range or
/// below the melting point (sub-cooled liquid).
fn viscosity_extrapolated<'a>(components: &'a [Arc<Component>], x: &[f64], t: f64) -> Vec<&'a str> {
    components
        .iter()
        .zip(x)
        .filter(|(c, x)| **x > 0.0 && (!c.liquid_viscosity.in_range(t) || t < c.constants.melting_point.value))
        .map(|(c, _)| c.id.as_str())
        .collect()
}

fn join_ids(ids: &[&str]) -> String {
    if ids.len() <= 6 {
        ids.join(", ")
    } else {
        format!("{} and {} more", ids[..6].join(", "), ids.len() - 6)
    }
}

/// Compute every indicator of a liquid with these components and mass fractions (normalised here).
///
/// Errors only for unusable input (lengths, negative or non-finite fractions, bad options); an indicator
/// that cannot be estimated is `None` with a note.
pub fn indicators(components: &[Arc<Component>], mass_fractions: &[f64], opts: &IndicatorOptions) -> Result<Indicators, PostError> {
    let w = normalised(components, mass_fractions, "mass fractions")?;
    if !(opts.pressure.is_finite() && opts.pressure > 0.0) {
        return Err(PostError::Input { what: "pressure", message: format!("{} Pa must be positive", opts.pressure) });
    }
    if !(opts.final_fraction > 0.9 && opts.final_fraction < 1.0) {
        return Err(PostError::Input { what: "final boiling fraction", message: format!("{} must lie in (0.9, 1)", opts.final_fraction) });
    }
    if !(opts.max_step.is_finite() && opts.max_step > 0.0 && opts.max_step <= 1.0) {
        return Err(PostError::Input { what: "distillation step", message: format!("{} must lie in (0, 1]", opts.max_step) });
    }
    let sel = opts.selection;
    let x = liquid::mass_to_mole(components, &w);
    let vol: Vec<f64> = {
        let v: Vec<f64> = components.iter().zip(&w).map(|(c, w)| w / c.density_15c()).collect();
        let s: f64 = v.iter().sum();
        v.iter().map(|v| v / s).collect()
    };
    let mut ind = Indicators::empty(opts);
    let p_text = if (opts.pressure - STANDARD_PRESSURE).abs() < 1e-6 { "1 atm".to_string() } else { format!("{} Pa", opts.pressure) };
    let raoult_text = match opts.activity {
        ActivityModel::Ideal => "Raoult's law, Σ x_i p_sat,i(T) = p",
        ActivityModel::Unifac => "the modified Raoult's law with UNIFAC activity coefficients, Σ x_i γ_i p_sat,i(T) = p",
    };

    // --- bubble point and simulated distillation -------------------------------------------------
    let fb = opts.final_fraction;
    let fractions = [0.0, 0.1, 0.2, 0.5, 0.9, fb];
    // the distillation runs through the nodes of the full curve up to the last requested one
    if let Some(last) = CURVE_KEYS.iter().filter(|(k, _)| sel.contains(k)).map(|(_, node)| *node).max() {
        let basis_text = match opts.recovery_basis {
            RecoveryBasis::Volume => "liquid volume at 15 °C",
            RecoveryBasis::Mass => "mass",
            RecoveryBasis::Mole => "moles",
        };
        let liquid_text = match opts.activity {
            ActivityModel::Ideal => "ideal liquid (Raoult)",
            ActivityModel::Unifac => "liquid activity coefficients by original UNIFAC",
        };
        let curve_method = |what: &str| {
            format!(
                "simulated single-stage batch (Rayleigh) distillation at {p_text}, {liquid_text}, liquid at its bubble point; {what}, evaporated fraction on a {basis_text} basis; {CURVE_INTEGRATION}"
            )
        };
        let requested: Vec<&'static str> = CURVE_KEYS.iter().map(|(k, _)| *k).filter(|k| sel.contains(k)).collect();
        match distillation_temperatures(components, &x, opts.pressure, opts.recovery_basis, &fractions[..=last], opts.max_step, opts.activity) {
            Ok(t) => match near_critical(components, &x, opts, t[0]) {
                Some(reason) => {
                    for &key in &requested {
                        ind.set(key, None, curve_method("distillation"));
                        ind.note(key, reason.clone());
                    }
                }
                None => {
                    for &key in &requested {
                        let (value, method) = match key {
                            "bubble_point_K" => {
                                ind.set(key, Some(t[0]), format!("bubble point at {p_text} by {raoult_text}"));
                                continue;
                            }
                            "initial_boiling_point_K" => (t[0], curve_method("IBP = bubble point of the initial liquid")),
                            "t10_K" => (t[1], curve_method("T at 10 % evaporated")),
                            "t20_K" => (t[2], curve_method("T at 20 % evaporated")),
                            "t50_K" => (t[3], curve_method("T at 50 % evaporated")),
                            "t90_K" => (t[4], curve_method("T at 90 % evaporated")),
                            _ => (t[5], curve_method(&format!("FBP defined as T at {:.1} % evaporated", 100.0 * fb))),
                        };
                        ind.set(key, Some(value), method);
                    }
                }
            },
            Err(e) => {
                for &key in &requested {
                    ind.set(key, None, curve_method("distillation"));
                    ind.note(key, format!("not computed: {e}"));
                }
            }
        }
    }

    // --- vapour pressure at 38 °C ------------------------------------------------------------------
    if sel.contains("vapor_pressure_38C_Pa") {
        let tvp = match Activity::new(opts.activity, components) {
            Ok(mut act) => Some(act.bubble_pressure(components, &x, T_38C)),
            Err(_) => None,
        };
        ind.set(
            "vapor_pressure_38C_Pa",
            tvp,
            format!("true vapour pressure at 38 °C by {raoult_text} at 38 °C (no air, no vapour/liquid ratio: not a Reid vapour pressure)"),
        );
    }

    // --- flash point -------------------------------------------------------------------------------
    if sel.contains("flash_point_K") {
        let mut estimated = vec![];
        let pure_fp: Vec<f64> = components
            .iter()
            .zip(&x)
            .map(|(c, xi)| {
                let (t, origin) = component_flash_point(c);
                if origin == FlashPointOrigin::EstimatedButler && *xi > 0.0 {
                    estimated.push(c.id.as_str());
                }
                t
            })
            .collect();
        let fp = liaw_flash_point(components, &x, &pure_fp, opts.activity);
        ind.set(
            "flash_point_K",
            fp,
            match opts.activity {
                ActivityModel::Ideal => "Liaw et al. (2002) ideal-solution model: Σ x_i p_sat,i(T)/p_sat,i(T_fp,i) = 1 with the components' closed-cup flash points (Le Chatelier + Raoult)",
                ActivityModel::Unifac => "Liaw et al. (2002) non-ideal model: Σ x_i γ_i p_sat,i(T)/p_sat,i(T_fp,i) = 1 with UNIFAC γ_i and the components' closed-cup flash points (Le Chatelier + modified Raoult)",
            },
        );
        if fp.is_none() {
            ind.note("flash_point_K", "not computed: no root between the lowest and highest component flash points");
        }
        if !estimated.is_empty() {
            let ids = join_ids(&estimated);
            ind.note(
                "flash_point_K",
                format!("component flash points estimated from the normal boiling point (Butler et al. 1956, T_fp = 0.683 T_b + 14.84 K, from memory) for: {ids}"),
            );
        }
    }

    // --- density at 15 °C ----------------------------------------------------------------------------
    let rho15 = 1.0 / components.iter().zip(&w).map(|(c, w)| w / c.density_15c()).sum::<f64>();
    if sel.contains("density_15C_kg_m3") {
        ind.set("density_15C_kg_m3", Some(rho15), "ideal volume additivity of the components' 15 °C densities, 1/ρ = Σ w_i/ρ_i");
    }

    // --- kinematic viscosities ---------------------------------------------------------------------
    for (key, t, label) in [
        ("kinematic_viscosity_minus40C_m2_s", T_MINUS_40C, "−40 °C"),
        ("kinematic_viscosity_minus20C_m2_s", T_MINUS_20C, "−20 °C"),
        ("kinematic_viscosity_40C_m2_s", T_40C, "40 °C"),
    ] {
        if !sel.contains(key) {
            continue;
        }
        let (nu, method) = match opts.viscosity_rule {
            ViscosityRule::GrunbergNissan => {
                let mu = liquid::viscosity(components, &x, t);
                let rho = liquid::density(components, &w, t);
                (mu / rho, format!("Grunberg–Nissan ideal blend (ln μ = Σ x_i ln μ_i, no interaction term) at {label}, ν = μ/ρ with ideal-mixing density"))
            }
            ViscosityRule::Refutas => (
                liquid::kinematic_viscosity_refutas(components, &w, t),
                format!("Refutas viscosity-blending number on mass fractions (ASTM D7152-style practice) of the component kinematic viscosities at {label}"),
            ),
        };
        ind.set(key, Some(nu), method);
        let ext = viscosity_extrapolated(components, &x, t);
        if !ext.is_empty() {
            ind.note(key, format!("component viscosities extrapolated outside their correlation range or below their melting point (sub-cooled liquid) for: {}", join_ids(&ext)));
        }
    }

    // --- surface tension at 20 °C --------------------------------------------------------------------
    if sel.contains("surface_tension_20C_N_m") {
        ind.set("surface_tension_20C_N_m", Some(liquid::surface_tension(components, &x, T_20C)), "mole-fraction average of the component surface tensions at 20 °C");
    }

    // --- cetane -------------------------------------------------------------------------------------
    if sel.any(&["dcn", "dcn_not_measured_share"]) {
        let weights = match opts.cetane_rule {
            CetaneRule::VolumeLinear => &vol,
            CetaneRule::MoleLinear => &x,
            CetaneRule::MassLinear => &w,
        };
        let (share, parts) = cetane_basis(components, weights);
        if sel.contains("dcn") {
            let cn = blend_cetane(components, &w, &x, &vol, opts.cetane_rule);
            let cn_method = match opts.cetane_rule {
                CetaneRule::VolumeLinear => "volume-linear blend Σ v_i CN_i of the component cetane numbers (15 °C volume fractions; exact for n-hexadecane/HMN reference blends, ASTM D613 scale)",
                CetaneRule::MoleLinear => "mole-linear blend Σ x_i CN_i of the component cetane numbers (simple alternative, not a standard rule)",
                CetaneRule::MassLinear => "mass-linear blend Σ w_i CN_i of the component cetane numbers (simple alternative, not a standard rule)",
            };
            ind.set("dcn", Some(cn), cn_method);
        }
        if sel.contains("dcn_not_measured_share") {
            ind.set(
                "dcn_not_measured_share",
                Some(share),
                "share of the DCN blend weight carried by components whose value is not a measured derived cetane number (kind CN, kind estimate, or a value from memory or an estimate source)",
            );
        }
        if share > 0.0 && sel.contains("dcn") {
            ind.note("dcn", format!("{:.1} % of the blend weight rests on values that are not measured DCNs ({parts})", 100.0 * share));
        }
    }

    // --- heating value, hydrogen, H/C, aromatics, molar mass ---------------------------------------
    if sel.any(&["lhv_J_kg", "lhv_volume_J_m3"]) {
        let lhv: f64 = components.iter().zip(&w).map(|(c, w)| w * c.constants.lower_heating_value.value).sum();
        if sel.contains("lhv_J_kg") {
            ind.set("lhv_J_kg", Some(lhv), "mass-weighted component lower heating values (liquid, water as vapour), Σ w_i LHV_i");
        }
        if sel.contains("lhv_volume_J_m3") {
            ind.set("lhv_volume_J_m3", Some(lhv * rho15), "mass-basis LHV × density at 15 °C");
        }
    }
    if sel.contains("hydrogen_mass_fraction") {
        let h: f64 = components.iter().zip(&w).map(|(c, w)| w * c.hydrogen_mass_fraction()).sum();
        ind.set("hydrogen_mass_fraction", Some(h), "from the component formulas, Σ w_i w_H,i");
    }
    if sel.contains("hc_ratio") {
        let (hn, cn_atoms) = components.iter().zip(&x).fold((0.0, 0.0), |(a, b), (c, x)| (a + x * f64::from(c.formula.hydrogen), b + x * f64::from(c.formula.carbon)));
        ind.set("hc_ratio", if cn_atoms > 0.0 { Some(hn / cn_atoms) } else { None }, "atom ratio from the component formulas, Σ x_i H_i / Σ x_i C_i");
        if cn_atoms <= 0.0 {
            ind.note("hc_ratio", "not computed: no carbon");
        }
    }
    if sel.contains("aromatics_volume_fraction") {
        let arom: f64 = components.iter().zip(&vol).filter(|(c, _)| c.class.is_aromatic()).fold(0.0, |a, (_, v)| a + v);
        let fractions_vol: f64 = components.iter().zip(&vol).filter(|(c, _)| c.class == crate::data::HydrocarbonClass::PetroleumFraction).fold(0.0, |a, (_, v)| a + v);
        let arom_method = "liquid volume fraction at 15 °C of the alkylbenzene, cycloaromatic and diaromatic components (composition-based, not a D1319 measurement)";
        if fractions_vol > 0.0 {
            ind.set("aromatics_volume_fraction", None, arom_method);
            ind.note("aromatics_volume_fraction", format!("not computed: {:.1} % of the volume is petroleum-fraction pseudo-components, whose aromatic content is unknown", 100.0 * fractions_vol));
        } else {
            ind.set("aromatics_volume_fraction", Some(arom), arom_method);
        }
    }
    if sel.contains("molar_mass_kg_mol") {
        ind.set("molar_mass_kg_mol", Some(liquid::molar_mass(components, &x)), "mole-fraction average Σ x_i M_i");
    }

    // --- freezing point ------------------------------------------------------------------------------
    if sel.contains("freezing_point_K") {
        let (tf, controlling, skipped) = freezing_point(components, &x);
        ind.set(
            "freezing_point_K",
            tf,
            "ideal solid–liquid solubility (Schröder–van Laar, ΔCp neglected): highest T_i = 1/(1/T_m,i − R ln x_i/ΔH_fus,i); no solid solutions",
        );
        match (&controlling, tf) {
            (Some(id), Some(_)) => ind.note("freezing_point_K", format!("controlled by {id}")),
            _ => ind.note("freezing_point_K", "not computed: no component with an enthalpy of fusion"),
        }
        if !skipped.is_empty() {
            let ids: Vec<&str> = skipped.iter().map(|s| s.as_str()).collect();
            ind.note("freezing_point_K", format!("skipped for lack of an enthalpy of fusion: {}", join_ids(&ids)));
        }
    }
    Ok(ind)
}

/// Points of the simulated distillation curve: (indicator key, node in the list of evaporated fractions
/// 0, 0.1, 0.2, 0.5, 0.9, final fraction).
const CURVE_KEYS: [(&str, usize); 7] = [
    ("bubble_point_K", 0),
    ("initial_boiling_point_K", 0),
    ("t10_K", 1),
    ("t20_K", 2),
    ("t50_K", 3),
    ("t90_K", 4),
    ("final_boiling_point_K", 5),
];

/// How the distillation curve is integrated (the end of every curve method string).
const CURVE_INTEGRATION: &str = "RK4 in −ln(1−F)";

/// Bubble temperatures this close below the pseudo-critical temperature \[K\] are checked with a separate
/// bracketed bubble-point solve; the distillation's own bubble point agrees with it to about 1e-8 K.
const NEAR_CRITICAL_MARGIN: f64 = 0.01;

/// Why the curve is not reported when the liquid's bubble point lies at or above its pseudo-critical
/// temperature ([`liquid::subcritical_bubble_point_with`]), given the distillation's bubble point `t_bubble`;
/// None when it lies below. For an ideal liquid (one root of Σ x_i p_sat,i(T) = p) a bubble point more than
/// [`NEAR_CRITICAL_MARGIN`] below the pseudo-critical temperature answers without a second solve.
pub(super) fn near_critical(components: &[Arc<Component>], x: &[f64], opts: &IndicatorOptions, t_bubble: f64) -> Option<String> {
    if opts.activity == ActivityModel::Ideal && t_bubble < liquid::pseudo_critical_temperature(components, x) - NEAR_CRITICAL_MARGIN {
        return None;
    }
    let mut act = Activity::new(opts.activity, components).ok()?;
    liquid::subcritical_bubble_point_with(components, &mut act, x, opts.pressure).err().filter(|_| liquid::bubble_point(components, x, opts.pressure).is_ok())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;

    fn lib() -> Library {
        Library::embedded().unwrap()
    }

    #[test]
    fn butler_conversion_is_exact() {
        // 0.683 T_b[°F] − 119 °F, at T_b = 400 K
        let tb_f = 400.0 * 1.8 - 459.67;
        let tf_f = 0.683 * tb_f - 119.0;
        let expected = (tf_f + 459.67) / 1.8;
        assert!((butler_flash_point(400.0) - expected).abs() < 1e-10);
    }

    #[test]
    fn pure_component_identities() {
        let l = lib();
        let c = l.component("n-decane").unwrap().clone();
        let ind = indicators(std::slice::from_ref(&c), &[1.0], &IndicatorOptions::default()).unwrap();
        // flash point reproduces the component's own input
        let fp = c.constants.flash_point.as_ref().unwrap().value;
        assert!((ind.flash_point_K.unwrap() - fp).abs() < 1e-5);
        // flat distillation
        let ibp = ind.initial_boiling_point_K.unwrap();
        for t in [ind.t10_K, ind.t50_K, ind.t90_K, ind.final_boiling_point_K] {
            assert!((t.unwrap() - ibp).abs() < 1e-6);
        }
        assert!((ind.density_15C_kg_m3.unwrap() - c.density_15c()).abs() < 1e-9);
        assert!((ind.lhv_J_kg.unwrap() - c.constants.lower_heating_value.value).abs() < 1e-3);
        assert!((ind.hc_ratio.unwrap() - 2.2).abs() < 1e-12);
        assert_eq!(ind.aromatics_volume_fraction, Some(0.0));
        // pure freezing point = melting point (ln 1 = 0)
        assert!((ind.freezing_point_K.unwrap() - c.constants.melting_point.value).abs() < 1e-9);
        assert!((ind.dcn.unwrap() - c.constants.cetane_number.value).abs() < 1e-12);
    }

    #[test]
    fn serialises_without_nan_and_with_keys() {
        let l = lib();
        let fuel = Fuel::resolve("demo-wide", &l).unwrap();
        let ind = indicators(&fuel.components, &fuel.mass_fractions, &IndicatorOptions::default()).unwrap();
        let json = serde_json::to_value(&ind).unwrap();
        for (k, _) in INDICATOR_KEYS {
            assert!(json.get(k).is_some(), "missing key {k}");
            assert!(ind.get(k).is_some());
        }
        for (k, _) in INDICATOR_KEYS.iter().skip(1) {
            assert!(ind.get(k).unwrap().is_some(), "{k} not computed: {:?}", ind.notes.get(k));
            assert!(ind.method(k).is_some(), "{k} has no method");
        }
        assert!(ind.get("no_such_key").is_none());
        // the note names the components without a published flash point (alphabetically first ones)
        let mut missing: Vec<&str> = fuel.components.iter().filter(|c| c.constants.flash_point.is_none()).map(|c| c.id.as_str()).collect();
        missing.sort_unstable();
        assert!(!missing.is_empty() && ind.notes["flash_point_K"].contains(missing[0]), "{}", ind.notes["flash_point_K"]);
        // physically ordered distillation
        let t = [ind.initial_boiling_point_K, ind.t10_K, ind.t20_K, ind.t50_K, ind.t90_K, ind.final_boiling_point_K];
        for p in t.windows(2) {
            assert!(p[1].unwrap() > p[0].unwrap());
        }
        // the flash point of a wide cut is far below its IBP
        assert!(ind.flash_point_K.unwrap() < ind.initial_boiling_point_K.unwrap());
    }

    /// Every requested indicator of a selection has the bits, method and notes of a full call, and nothing
    /// else is computed: each key alone, the residue sets of `uncertainty` and sweeps, on demo-wide residues
    /// (weathering at 420 K) with Raoult's law, and one residue with UNIFAC.
    #[test]
    fn selection_matches_full_call() {
        let l = lib();
        let fuel = Fuel::resolve("demo-wide", &l).unwrap();
        let residues = crate::post::weathering_residues(&fuel.components, &fuel.mass_fractions, 420.0, &[0.0, 0.2, 0.5, 0.8, 0.95], ActivityModel::Ideal).unwrap();
        let check = |w: &[f64], base: &IndicatorOptions, keys: &[&str]| {
            let full = indicators(&fuel.components, w, base).unwrap();
            let selection = IndicatorSelection::of(keys).unwrap();
            let part = indicators(&fuel.components, w, &IndicatorOptions { selection, ..base.clone() }).unwrap();
            for (k, _) in INDICATOR_KEYS.iter().skip(1) {
                if keys.contains(k) {
                    assert_eq!(part.get(k).unwrap().map(f64::to_bits), full.get(k).unwrap().map(f64::to_bits), "{k} of {keys:?}");
                    assert_eq!(part.method(k), full.method(k), "{k}");
                    assert_eq!(part.notes.get(k), full.notes.get(k), "{k}");
                } else {
                    assert_eq!(part.get(k), Some(None), "{k} computed without being requested ({keys:?})");
                    assert!(part.method(k).is_none() && !part.notes.contains_key(k), "{k}");
                }
            }
        };
        let ideal = IndicatorOptions::default();
        let uncertainty_keys = crate::uncertainty::RESIDUE_KEYS.map(|(k, _)| k);
        for r in &residues {
            check(&r.mass_fractions, &ideal, &uncertainty_keys);
            check(&r.mass_fractions, &ideal, &crate::sweep::residue::RESIDUE_KEYS);
            for (k, _) in INDICATOR_KEYS.iter().skip(1) {
                check(&r.mass_fractions, &ideal, &[k]);
            }
        }
        let unifac = IndicatorOptions { activity: ActivityModel::Unifac, ..Default::default() };
        check(&residues[2].mass_fractions, &unifac, &uncertainty_keys);
        check(&residues[2].mass_fractions, &unifac, &["t20_K", "vapor_pressure_38C_Pa"]);
        // the selection is a set of known keys
        assert!(IndicatorSelection::of(&["t50_K", "no_such_key"]).is_err());
        assert!(IndicatorSelection::default().is_all() && IndicatorSelection::of(&INDICATOR_KEYS.map(|(k, _)| k)).unwrap().is_all());
        let s = IndicatorSelection::of(&["t50_K"]).unwrap();
        assert!(s.contains("t50_K") && !s.contains("t90_K") && !s.contains("no_such_key") && !s.is_all());
    }

    #[test]
    fn bad_input_is_an_error() {
        let l = lib();
        let c = l.component("n-decane").unwrap().clone();
        assert!(indicators(std::slice::from_ref(&c), &[f64::NAN], &IndicatorOptions::default()).is_err());
        assert!(indicators(std::slice::from_ref(&c), &[1.0, 0.0], &IndicatorOptions::default()).is_err());
        assert!(indicators(std::slice::from_ref(&c), &[-1.0], &IndicatorOptions::default()).is_err());
        let o = IndicatorOptions { final_fraction: 1.0, ..Default::default() };
        assert!(indicators(&[c], &[1.0], &o).is_err());
    }

    #[test]
    fn liaw_binary_lies_between_pure_values() {
        let l = lib();
        let comps = vec![l.component("n-decane").unwrap().clone(), l.component("n-dodecane").unwrap().clone()];
        let fp = [319.15, 347.15];
        let t = liaw_flash_point(&comps, &[0.5, 0.5], &fp, ActivityModel::Ideal).unwrap();
        assert!(t > fp[0] && t < fp[1]);
        // more of the light component lowers it
        let t2 = liaw_flash_point(&comps, &[0.8, 0.2], &fp, ActivityModel::Ideal).unwrap();
        assert!(t2 < t);
    }

    #[test]
    fn basis_options_change_only_what_they_should() {
        let l = lib();
        let fuel = Fuel::resolve("demo-wide", &l).unwrap();
        let a = indicators(&fuel.components, &fuel.mass_fractions, &IndicatorOptions::default()).unwrap();
        let b = indicators(&fuel.components, &fuel.mass_fractions, &IndicatorOptions { recovery_basis: RecoveryBasis::Mass, viscosity_rule: ViscosityRule::Refutas, cetane_rule: CetaneRule::MoleLinear, ..Default::default() }).unwrap();
        assert_eq!(a.initial_boiling_point_K, b.initial_boiling_point_K);
        assert_eq!(a.flash_point_K, b.flash_point_K);
        assert!((a.t50_K.unwrap() - b.t50_K.unwrap()).abs() > 1e-3);
        assert!(a.method("dcn") != b.method("dcn"));
        assert!(b.method("kinematic_viscosity_minus20C_m2_s").unwrap().contains("Refutas"));
    }
}
