//! Estimated components: a molecule given by its structural groups (Joback keys `CH3 CH2 CH C rCH2 rCH rCHa
//! rCa OH`) gets its normal boiling point and critical constants by group contribution — Joback & Reid (1987)
//! or, for acyclic alkanes, Constantinou & Gani (1994) first order — its acentric factor from the Lee–Kesler
//! vapour-pressure equation solved at Tb, ideal-gas cp and melting point by Joback, heating value from the
//! Joback enthalpy of formation, cetane number from the library's trend for its class, and every temperature-
//! dependent liquid and vapour property by corresponding states (the loader's methods). Every value is marked
//! with an `estimated:<method>` source.
//!
//! The class representatives used by class × carbon-number tables are defined here too
//! ([`representative_groups`]).

use std::collections::BTreeMap;

use crate::data::joback_groups::{group, group_atoms, Group, GROUPS, MELTING_AND_FORMATION};
use crate::data::{suggest, HydrocarbonClass, Library};
use crate::props::{joback, pure};

use super::{formula_molar_mass, input_error, lhv_from_formation, BuildError, ComponentSpec, CpPolynomial, Value};

/// Group-contribution method for Tb, Tc, pc and Vc.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum GroupMethod {
    /// Joback & Reid (1987).
    Joback,
    /// Constantinou & Gani (1994), first-order groups; acyclic alkanes only (CH3 CH2 CH C).
    ConstantinouGani,
}

impl GroupMethod {
    /// Name as written on the command line and in source markers.
    pub fn as_str(self) -> &'static str {
        match self {
            GroupMethod::Joback => "joback",
            GroupMethod::ConstantinouGani => "constantinou-gani",
        }
    }
}

/// Constantinou & Gani (1994) first-order contributions (tb1, tc1, pc1 \[bar^-0.5\], vc1 \[m³/kmol\]) of the
/// acyclic alkane groups, as recalled in the physics notes (B.11, M: they reproduce n-alkane data closely).
const CG_GROUPS: [(&str, f64, f64, f64, f64); 4] = [
    ("CH3", 0.8894, 1.6781, 0.019904, 0.07504),
    ("CH2", 0.9225, 3.4920, 0.010558, 0.05576),
    ("CH", 0.6033, 4.0330, 0.001315, 0.03153),
    ("C", 0.2878, 4.8823, -0.010404, -0.00034),
];

/// Constantinou–Gani first-order estimates (Tb \[K\], Tc \[K\], pc \[Pa\], Vc \[m³/mol\]) for groups among
/// CH3 CH2 CH C; None when another group is present.
pub fn constantinou_gani(groups: &joback::Groups) -> Option<(f64, f64, f64, f64)> {
    let mut s = [0.0; 4];
    for (g, n) in groups {
        let row = CG_GROUPS.iter().find(|r| r.0 == g.key)?;
        let n = f64::from(*n);
        s[0] += n * row.1;
        s[1] += n * row.2;
        s[2] += n * row.3;
        s[3] += n * row.4;
    }
    let tb = 204.359 * s[0].ln();
    let tc = 181.128 * s[1].ln();
    let pc_bar = (s[2] + 0.10022).powi(-2) + 1.3705;
    let vc = (-0.00435 + s[3]) * 1e-3;
    Some((tb, tc, pc_bar * 1e5, vc))
}

/// Parse a group list like `CH3=2,CH2=10` (keys as in component files); unknown keys get a "did you mean".
pub fn parse_groups(spec: &str, context: &str) -> Result<Vec<(&'static Group, u32)>, BuildError> {
    let mut map: BTreeMap<usize, u32> = BTreeMap::new();
    if spec.trim().is_empty() {
        return Err(input_error(context, "no groups given (e.g. \"CH3=2,CH2=10\")"));
    }
    if spec.chars().any(char::is_control) {
        return Err(input_error(context, format!("{:?} contains a control character (a line break?); give the groups on one line like CH3=2,CH2=10", spec.chars().take(60).collect::<String>())));
    }
    for item in spec.split(',') {
        let item = item.trim();
        if item.is_empty() {
            continue;
        }
        let (key, count) = item.split_once('=').ok_or_else(|| input_error(context, format!("cannot read '{item}': use GROUP=COUNT pairs like CH3=2")))?;
        let key = key.trim();
        let idx = GROUPS.iter().position(|g| g.key == key).ok_or_else(|| {
            let known = GROUPS.iter().map(|g| g.key).collect::<Vec<_>>().join(" ");
            input_error(context, format!("unknown group '{key}'{} (known: {known})", suggest(key, GROUPS.iter().map(|g| g.key))))
        })?;
        let n: u32 = count.trim().parse().map_err(|_| input_error(context, format!("count '{}' of group {key} is not a whole number ≥ 0", count.trim())))?;
        if map.insert(idx, n).is_some() {
            return Err(input_error(context, format!("group {key} is given twice")));
        }
    }
    let groups: Vec<(&'static Group, u32)> = map.into_iter().filter(|(_, n)| *n > 0).map(|(i, n)| (&GROUPS[i], n)).collect();
    check_groups(&groups, context)?;
    Ok(groups)
}

/// Basic structure checks: at least two carbons; an acyclic molecule needs CH3 = 2 + CH + 2·C; aromatic ring
/// carbons come in rings of six.
fn check_groups(groups: &[(&'static Group, u32)], context: &str) -> Result<(), BuildError> {
    let count = |k: &str| groups.iter().find(|(g, _)| g.key == k).map_or(0, |(_, n)| *n);
    let (c, _, _) = formula_of(groups);
    if c < 2 {
        return Err(input_error(context, "needs at least two carbon atoms"));
    }
    let ring = count("rCH2") + count("rCH") + count("rCHa") + count("rCa");
    let ends = 2 + count("CH") + 2 * count("C");
    if ring == 0 && count("CH3") + count("OH") != ends {
        return Err(input_error(
            context,
            format!("these chain groups do not close into one acyclic molecule: CH3 + OH = {} but 2 + CH + 2·C = {ends}", count("CH3") + count("OH")),
        ));
    }
    let aromatic = count("rCHa") + count("rCa");
    if aromatic > 0 && aromatic < 6 {
        return Err(input_error(context, format!("{aromatic} aromatic ring carbons (rCHa + rCa): an aromatic ring has six")));
    }
    Ok(())
}

/// Atom counts (C, H, O) of a group list.
pub fn formula_of(groups: &[(&'static Group, u32)]) -> (u32, u32, u32) {
    groups.iter().fold((0, 0, 0), |(c, h, o), (g, n)| {
        let (gc, gh, go) = group_atoms(g.key).unwrap_or((0, 0, 0));
        (c + gc * n, h + gh * n, o + go * n)
    })
}

/// Class of a molecule from its groups: OH → oxygenate; ≥ 10 aromatic carbons → diaromatic; aromatic with
/// saturated ring groups → cycloaromatic; aromatic → alkylbenzene; saturated rings → mono- or dicycloalkane by
/// the ring count (2C + 2 − H)/2; branched chain → iso-alkane; else n-alkane.
pub fn infer_class(groups: &[(&'static Group, u32)]) -> HydrocarbonClass {
    let count = |k: &str| groups.iter().find(|(g, _)| g.key == k).map_or(0, |(_, n)| *n);
    let (c, h, _) = formula_of(groups);
    let aromatic = count("rCHa") + count("rCa");
    let saturated_ring = count("rCH2") + count("rCH");
    if count("OH") > 0 {
        HydrocarbonClass::Oxygenate
    } else if aromatic >= 10 {
        HydrocarbonClass::Diaromatic
    } else if aromatic > 0 && saturated_ring > 0 {
        HydrocarbonClass::Cycloaromatic
    } else if aromatic > 0 {
        HydrocarbonClass::Alkylbenzene
    } else if saturated_ring > 0 {
        let rings = (2 * c + 2).saturating_sub(h) / 2;
        if rings >= 2 {
            HydrocarbonClass::Dicycloalkane
        } else {
            HydrocarbonClass::Monocycloalkane
        }
    } else if count("CH") + count("C") > 0 {
        HydrocarbonClass::IsoAlkane
    } else {
        HydrocarbonClass::NAlkane
    }
}

/// Smallest carbon number a class representative exists for.
pub fn minimum_carbon_number(class: HydrocarbonClass) -> Option<u32> {
    match class {
        HydrocarbonClass::NAlkane => Some(2),
        HydrocarbonClass::IsoAlkane => Some(4),
        HydrocarbonClass::Monocycloalkane => Some(6),
        HydrocarbonClass::Dicycloalkane => Some(8),
        HydrocarbonClass::Alkylbenzene => Some(6),
        HydrocarbonClass::Cycloaromatic => Some(9),
        HydrocarbonClass::Diaromatic => Some(10),
        HydrocarbonClass::Oxygenate | HydrocarbonClass::PetroleumFraction => None,
    }
}

/// Representative molecule of a class at carbon number `n`, as Joback groups, and its name:
/// n-alkane = CnH2n+2; iso-alkane = 2-methyl-(n−1)-alkane; monocycloalkane = n-alkylcyclohexane;
/// dicycloalkane = bicyclo\[3.3.0\]octane (C8), hydrindane (C9), decalin (C10), n-alkyl-decalin (C11+);
/// alkylbenzene = n-alkylbenzene; cycloaromatic = indane (C9), tetralin (C10), n-alkyl-tetralin on the
/// aromatic ring (C11+); diaromatic = naphthalene (C10), n-alkyl-naphthalene (C11+).
pub fn representative_groups(class: HydrocarbonClass, n: u32) -> Option<(Vec<(&'static Group, u32)>, String)> {
    let min = minimum_carbon_number(class)?;
    if n < min {
        return None;
    }
    let g = |list: &[(&str, u32)]| -> Vec<(&'static Group, u32)> { list.iter().filter(|(_, c)| *c > 0).map(|(k, c)| (group(k).expect("table key"), *c)).collect() };
    let chain = |k: u32| -> String {
        match k {
            1 => "methyl".into(),
            2 => "ethyl".into(),
            3 => "n-propyl".into(),
            4 => "n-butyl".into(),
            5 => "n-pentyl".into(),
            6 => "n-hexyl".into(),
            k => format!("n-C{k}-alkyl"),
        }
    };
    Some(match class {
        HydrocarbonClass::NAlkane => (g(&[("CH3", 2), ("CH2", n - 2)]), format!("n-alkane C{n}")),
        HydrocarbonClass::IsoAlkane => (g(&[("CH3", 3), ("CH2", n - 4), ("CH", 1)]), format!("2-methyl-alkane C{n}")),
        HydrocarbonClass::Monocycloalkane if n == 6 => (g(&[("rCH2", 6)]), "cyclohexane".into()),
        HydrocarbonClass::Monocycloalkane => (g(&[("rCH2", 5), ("rCH", 1), ("CH3", 1), ("CH2", n - 7)]), format!("{}cyclohexane (C{n})", chain(n - 6))),
        HydrocarbonClass::Dicycloalkane if n <= 10 => (g(&[("rCH2", n - 2), ("rCH", 2)]), format!("bicyclic C{n} ({})", ["bicyclo[3.3.0]octane", "hydrindane", "decalin"][(n - 8) as usize])),
        HydrocarbonClass::Dicycloalkane => (g(&[("rCH2", 7), ("rCH", 3), ("CH3", 1), ("CH2", n - 11)]), format!("{}decalin (C{n})", chain(n - 10))),
        HydrocarbonClass::Alkylbenzene if n == 6 => (g(&[("rCHa", 6)]), "benzene".into()),
        HydrocarbonClass::Alkylbenzene => (g(&[("rCHa", 5), ("rCa", 1), ("CH3", 1), ("CH2", n - 7)]), format!("{}benzene (C{n})", chain(n - 6))),
        HydrocarbonClass::Cycloaromatic if n == 9 => (g(&[("rCHa", 4), ("rCa", 2), ("rCH2", 3)]), "indane".into()),
        HydrocarbonClass::Cycloaromatic if n == 10 => (g(&[("rCHa", 4), ("rCa", 2), ("rCH2", 4)]), "tetralin".into()),
        HydrocarbonClass::Cycloaromatic => (g(&[("rCHa", 3), ("rCa", 3), ("rCH2", 4), ("CH3", 1), ("CH2", n - 11)]), format!("{}tetralin (C{n})", chain(n - 10))),
        HydrocarbonClass::Diaromatic if n == 10 => (g(&[("rCHa", 8), ("rCa", 2)]), "naphthalene".into()),
        HydrocarbonClass::Diaromatic => (g(&[("rCHa", 7), ("rCa", 3), ("CH3", 1), ("CH2", n - 11)]), format!("{}naphthalene (C{n})", chain(n - 10))),
        HydrocarbonClass::Oxygenate | HydrocarbonClass::PetroleumFraction => return None,
    })
}

/// Structural distance between two group lists: Σ |Δ count| over all groups.
pub fn group_distance(a: &[(&'static Group, u32)], b: &[(&'static Group, u32)]) -> u32 {
    GROUPS
        .iter()
        .map(|g| {
            let ca = a.iter().find(|(x, _)| x.key == g.key).map_or(0, |(_, n)| *n);
            let cb = b.iter().find(|(x, _)| x.key == g.key).map_or(0, |(_, n)| *n);
            ca.abs_diff(cb)
        })
        .sum()
}

/// Cetane number of a class at carbon number `n` from the library: least-squares line CN(n) through the
/// library components of that class whose groups are the class representative's at their carbon number (the
/// homologous series); fewer than two carbon numbers → the mean of all library components of the class.
/// Clamped to 0–110. Returns (value, note).
pub fn class_trend_cetane(lib: &Library, class: HydrocarbonClass, n: u32) -> (f64, String) {
    let members: Vec<(f64, f64, String)> = lib
        .components()
        .iter()
        .filter(|c| c.class == class && !c.joback_groups.is_empty())
        .map(|c| (f64::from(c.formula.carbon), c.constants.cetane_number.value, c.id.clone(), representative_groups(class, c.formula.carbon).is_some_and(|(g, _)| group_distance(&g, &c.joback_groups) == 0)))
        .filter(|m| m.3)
        .map(|(a, b, c, _)| (a, b, c))
        .collect();
    let distinct: std::collections::BTreeSet<i64> = members.iter().map(|m| m.0 as i64).collect();
    let (value, how) = if distinct.len() >= 2 {
        let k = members.len() as f64;
        let mx = members.iter().map(|m| m.0).sum::<f64>() / k;
        let my = members.iter().map(|m| m.1).sum::<f64>() / k;
        let sxy: f64 = members.iter().map(|m| (m.0 - mx) * (m.1 - my)).sum();
        let sxx: f64 = members.iter().map(|m| (m.0 - mx).powi(2)).sum();
        let slope = sxy / sxx;
        (my + slope * (f64::from(n) - mx), format!("least-squares line through the library's {} series ({})", class.as_str(), members.iter().map(|m| m.2.as_str()).collect::<Vec<_>>().join(", ")))
    } else {
        let all: Vec<(f64, String)> = lib.components().iter().filter(|c| c.class == class).map(|c| (c.constants.cetane_number.value, c.id.clone())).collect();
        if all.is_empty() {
            (30.0, "no library component of this class; a neutral 30 is used".to_string())
        } else {
            (all.iter().map(|a| a.0).sum::<f64>() / all.len() as f64, format!("mean of the library's {} components ({})", class.as_str(), all.iter().map(|a| a.1.as_str()).collect::<Vec<_>>().join(", ")))
        }
    };
    let clamped = value.clamp(0.0, 110.0);
    let note = if (clamped - value).abs() > 1e-9 { format!("{how}; {value:.1} clamped to {clamped:.0}") } else { how };
    (clamped, note)
}

/// Options of [`estimate_component`].
#[derive(Debug, Clone, PartialEq)]
pub struct EstimateOptions {
    /// Method for Tb, Tc, pc, Vc.
    pub method: GroupMethod,
    /// A measured normal boiling point to use instead of the estimate \[K\] (Joback Tc then uses it).
    pub boiling_point: Option<f64>,
    /// Class to write (inferred from the groups when None).
    pub class: Option<HydrocarbonClass>,
}

impl Default for EstimateOptions {
    fn default() -> Self {
        EstimateOptions { method: GroupMethod::Joback, boiling_point: None, class: None }
    }
}

/// Estimate the full property set of a molecule given by its groups; `context` names the input in errors.
pub fn estimate_component(lib: &Library, id: &str, name: &str, groups: &[(&'static Group, u32)], opts: &EstimateOptions, context: &str) -> Result<ComponentSpec, BuildError> {
    check_groups(groups, context)?;
    let (c, h, o) = formula_of(groups);
    let w = formula_molar_mass(c, h, o);
    let atoms = f64::from(c + h + o);
    let groups_text = groups.iter().map(|(g, n)| format!("{n} x {}", g.key)).collect::<Vec<_>>().join(", ");
    let method = opts.method;
    let (tb_est, tc_cg, pc, vc, src_crit) = match method {
        GroupMethod::Joback => (joback::boiling_point(groups), None, joback::critical_pressure(groups), joback::critical_volume(groups), "estimated:joback"),
        GroupMethod::ConstantinouGani => {
            let (tb, tc, pc, vc) = constantinou_gani(groups).ok_or_else(|| {
                input_error(context, "Constantinou-Gani is implemented for acyclic alkane groups only (CH3 CH2 CH C); use the Joback method for rings, aromatics and OH")
            })?;
            (tb, Some(tc), pc, vc, "estimated:constantinou-gani")
        }
    };
    let (tb, tb_value) = match opts.boiling_point {
        Some(t) => {
            if !(t.is_finite() && t > 150.0 && t < 1000.0) {
                return Err(input_error(context, format!("boiling point {t} K is outside 150–1000 K")));
            }
            (t, Value::new(t, "user", format!("given by the user; the {} estimate was {tb_est:.2} K", method.as_str())))
        }
        None => (tb_est, Value::new(tb_est, src_crit, format!("{} normal boiling point; groups: {groups_text}", method.as_str()))),
    };
    let tc = match tc_cg {
        Some(t) => t,
        None => joback::critical_temperature(groups, tb),
    };
    if !(tc > tb && pc > 1e5) {
        return Err(input_error(context, format!("the estimate gives Tc {tc:.1} K ≤ Tb {tb:.1} K or pc {pc:.0} Pa: these groups are outside the method's range")));
    }
    let omega = pure::lee_kesler_acentric_factor(tb, tc, pc);
    let tc_note = match method {
        GroupMethod::Joback => format!("Joback Tc = Tb/(0.584 + 0.965 S - S^2) with Tb = {tb:.2} K"),
        GroupMethod::ConstantinouGani => "Constantinou-Gani first order, Tc = 181.128 ln(sum tc1)".into(),
    };
    // melting point (Joback), kept below Tb
    let tm_sum: f64 = groups.iter().map(|(g, n)| MELTING_AND_FORMATION.iter().find(|r| r.0 == g.key).map_or(0.0, |r| r.1) * f64::from(*n)).sum();
    let tm_joback = 122.5 + tm_sum;
    let (tm, tm_note) = if tm_joback < tb - 20.0 && tm_joback > 50.0 {
        (tm_joback, "Joback melting point (poor for branched molecules; only used for sub-cooling notes, no enthalpy of fusion is given)".to_string())
    } else {
        (0.6 * tb, format!("Joback gives {tm_joback:.1} K, not below Tb; 0.6 Tb used as a placeholder (no enthalpy of fusion is given)"))
    };
    // heating value from the Joback gas enthalpy of formation and Riedel + Watson enthalpy of vaporisation at 298.15 K
    let hf_gas = (68.29 + groups.iter().map(|(g, n)| MELTING_AND_FORMATION.iter().find(|r| r.0 == g.key).map_or(0.0, |r| r.2) * f64::from(*n)).sum::<f64>()) * 1e3;
    let hvap_298 = pure::watson_latent_heat(298.15, tb, pure::riedel_latent_heat_at_boiling(tb, tc, pc), tc);
    let lhv = lhv_from_formation(c, h, hf_gas - hvap_298, w);
    let class = opts.class.unwrap_or_else(|| infer_class(groups));
    let (cn, cn_note) = class_trend_cetane(lib, class, c);
    let mut cn_value = Value::new(cn, "estimated:class-trend", format!("cetane number of the class at C{c}: {cn_note}"));
    cn_value.kind = Some("estimate".into());
    cn_value.uncertainty = Some(0.3);
    let cp = joback::cp_coefficients(groups);
    let constants = vec![
        ("molar-mass", Value::new(w, "iupac-atomic-weights", format!("from formula C{c}H{h}O{o}"))),
        ("normal-boiling-point", tb_value),
        ("critical-temperature", Value::new(tc, src_crit, tc_note)),
        ("critical-pressure", Value::new(pc, src_crit, format!("{} critical pressure ({} atoms)", method.as_str(), atoms))),
        ("critical-volume", Value::new(vc, src_crit, format!("{} critical volume", method.as_str()))),
        ("acentric-factor", Value::new(omega, "estimated:lee-kesler-omega", "Lee-Kesler vapour-pressure equation solved at Tb with the Tc, pc above")),
        ("melting-point", Value::new(tm, "estimated:joback", tm_note)),
        (
            "lower-heating-value",
            Value::new(
                lhv,
                "estimated:joback",
                format!(
                    "from the Joback gas enthalpy of formation {:.2} kJ/mol minus the enthalpy of vaporisation at 298.15 K {:.2} kJ/mol (Riedel at Tb + Watson), CODATA dHf CO2(g) -393.51, H2O(g) -241.826 kJ/mol",
                    hf_gas / 1e3,
                    hvap_298 / 1e3
                ),
            ),
        ),
        ("cetane-number", cn_value),
    ];
    let has_eta = groups.iter().all(|(g, _)| g.eta.is_some());
    Ok(ComponentSpec {
        id: id.to_string(),
        name: name.to_string(),
        class,
        formula: (c, h, o),
        joback_groups: groups.iter().map(|(g, n)| (g.key.to_string(), *n)).collect(),
        constants,
        ideal_gas_cp: CpPolynomial {
            coefficients: cp.to_vec(),
            t_min: 200.0,
            t_max: 1000.0,
            source: "estimated:joback".into(),
            note: format!("Joback & Reid (1987) ideal-gas cp; groups: {groups_text}"),
        },
        viscosity_source: if has_eta { "estimated:joback-letsou-stiel".into() } else { "estimated:letsou-stiel-lewis-squires".into() },
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lib() -> Library {
        Library::embedded().unwrap()
    }

    #[test]
    fn parse_and_check_groups() {
        let g = parse_groups("CH3=2, CH2=10", "x").unwrap();
        assert_eq!(formula_of(&g), (12, 26, 0));
        let e = parse_groups("CH3=2,CH22=10", "x").unwrap_err().to_string();
        assert!(e.contains("did you mean 'CH2'"), "{e}");
        assert!(parse_groups("CH3=3,CH2=4", "x").unwrap_err().to_string().contains("acyclic"));
        assert!(parse_groups("CH3=-1", "x").is_err());
        assert!(parse_groups("rCHa=3,rCa=1,CH3=1", "x").unwrap_err().to_string().contains("six"));
        assert!(parse_groups("", "x").is_err());
    }

    #[test]
    fn classes_from_groups() {
        let c = |s: &str| infer_class(&parse_groups(s, "x").unwrap());
        assert_eq!(c("CH3=2,CH2=8"), HydrocarbonClass::NAlkane);
        assert_eq!(c("CH3=3,CH2=6,CH=1"), HydrocarbonClass::IsoAlkane);
        assert_eq!(c("rCH2=5,rCH=1,CH3=1"), HydrocarbonClass::Monocycloalkane);
        assert_eq!(c("rCH2=8,rCH=2"), HydrocarbonClass::Dicycloalkane);
        assert_eq!(c("rCHa=5,rCa=1,CH3=1"), HydrocarbonClass::Alkylbenzene);
        assert_eq!(c("rCHa=4,rCa=2,rCH2=4"), HydrocarbonClass::Cycloaromatic);
        assert_eq!(c("rCHa=7,rCa=3,CH3=1"), HydrocarbonClass::Diaromatic);
    }

    /// Every representative has the carbon number it claims and is classified back into its own class.
    #[test]
    fn representatives_are_consistent() {
        for class in HydrocarbonClass::ALL {
            let Some(min) = minimum_carbon_number(class) else { continue };
            for n in min..=24 {
                let (g, name) = representative_groups(class, n).unwrap();
                assert_eq!(formula_of(&g).0, n, "{name}");
                assert_eq!(infer_class(&g), class, "{name}");
                check_groups(&g, &name).unwrap();
            }
            assert!(representative_groups(class, min - 1).is_none());
        }
    }

    /// Constantinou–Gani n-dodecane (physics notes B.11, computed there): Tb 490.1 K, Tc 660.2 K, pc 17.95 bar,
    /// Vc 0.703 m³/kmol.
    #[test]
    fn constantinou_gani_dodecane() {
        let g = parse_groups("CH3=2,CH2=10", "x").unwrap();
        let (tb, tc, pc, vc) = constantinou_gani(&g).unwrap();
        assert!((tb - 490.1).abs() < 0.1 && (tc - 660.2).abs() < 0.1, "{tb} {tc}");
        assert!((pc / 1e5 - 17.95).abs() < 0.02 && (vc * 1e3 - 0.703).abs() < 0.001, "{pc} {vc}");
        assert!(constantinou_gani(&parse_groups("rCH2=6", "x").unwrap()).is_none());
    }

    /// An estimated n-decane is a valid component file, and its heating value from the Joback enthalpy of
    /// formation is within 0.5 % of the library's value from the measured one.
    #[test]
    fn estimated_decane_reads_back() {
        let lib = lib();
        let g = parse_groups("CH3=2,CH2=8", "x").unwrap();
        let spec = estimate_component(&lib, "my-decane", "my decane", &g, &EstimateOptions::default(), "x").unwrap();
        let text = spec.to_toml(None);
        let c = crate::data::Component::parse(&text, "my-decane.toml").unwrap_or_else(|e| panic!("{e}\n{text}"));
        lib.check_extra_component(&c).unwrap();
        let lhv_lib = lib.component("n-decane").unwrap().constants.lower_heating_value.value;
        assert!((c.constants.lower_heating_value.value / lhv_lib - 1.0).abs() < 0.005);
        assert!(c.vapor_pressure(c.normal_boiling_point()) / 101_325.0 - 1.0 < 0.02);
        let cn = c.constants.cetane_number.value;
        assert!(cn > 60.0 && cn < 85.0, "{cn}");
    }
}
