//! Validity of table rows: which properties rest on their valid ranges, and a graded account of the share of
//! the liquid (mole fraction) that is past its own critical temperature, near it, or outside the valid range
//! of some property (docs/tables.md, "Validity").

use std::sync::Arc;

use serde::Serialize;

use crate::data::Component;
use crate::props::pure::{merge_excursions, RangeExcursion};

use super::mixture::Column;
use super::{MAJOR_MOLE_FRACTION, NEAR_CRITICAL_FRACTION};

/// Kind of a table row, the most severe that applies (declared from least to most severe).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Validity {
    /// Every property of every component rests on its valid range (published correlation or published extension).
    Ok,
    /// Some property of some component is outside its valid range; `extrapolated_share` says how much liquid.
    Extrapolated,
    /// More than 1 % (mole) of the liquid is above 0.9 of its own critical temperature (and none above it).
    NearCritical,
    /// Part of the liquid is above its own critical temperature (`supercritical_share`); the mixture is still
    /// below its bubble point, the component's liquid properties are clamped corresponding-states continuations.
    Supercritical,
    /// The liquid is superheated at the table pressure (above its bubble point).
    AboveBubblePoint,
    /// Component tables only: outside the liquid range, vapour columns only.
    VaporOnly,
}

impl Validity {
    /// Text as written in the `validity` column.
    pub fn as_str(self) -> &'static str {
        match self {
            Validity::Ok => "ok",
            Validity::Extrapolated => "extrapolated",
            Validity::NearCritical => "near-critical",
            Validity::Supercritical => "partly-supercritical",
            Validity::AboveBubblePoint => "above-bubble-point",
            Validity::VaporOnly => "vapor-only",
        }
    }
}

/// The vocabulary of the `validity` column and the share columns (metadata and docs/tables.md).
pub const VALIDITY_TEXT: &str = "ok = every property of every component inside its valid range (its published correlation, or a published extension method inside the range it was stated or checked for; docs/property-methods.md, Ranges); extrapolated = some property of some component outside its valid range (extrapolated_share: the mole fraction of the liquid concerned; extrapolated_properties: which); near-critical = more than 1 % (mole) of the liquid above 0.9 of its own Tc (near_critical_share); partly-supercritical = part of the liquid above its own Tc while the mixture is below its bubble point (supercritical_share: its mole fraction; those components use clamped corresponding-states continuations and count as extrapolated); above-bubble-point = liquid superheated at the table pressure; vapor-only = component tables, outside the liquid range (liquid cells empty); the most severe applies (above-bubble-point > partly-supercritical > near-critical > extrapolated > ok)";

/// The three numeric share columns that follow `validity` and `extrapolated_properties` in every table.
pub const SHARE_COLUMNS: [Column; 3] = [
    Column { name: "supercritical_share", description: "mole fraction of the liquid from components above their own critical temperature [-]", fit: None },
    Column { name: "near_critical_share", description: "mole fraction of the liquid from components between 0.9 Tc and Tc of their own [-]", fit: None },
    Column {
        name: "extrapolated_share",
        description: "mole fraction of the liquid from components with some property outside its valid range (supercritical components included) [-]",
        fit: None,
    },
];

/// Correlations that feed the liquid columns (file keys, as in `Component::correlations`).
pub const LIQUID_KEYS: [&str; 7] = ["vapor-pressure", "liquid-density", "latent-heat", "liquid-heat-capacity", "liquid-viscosity", "liquid-conductivity", "surface-tension"];
/// Correlations that feed the vapour columns.
pub const VAPOR_KEYS: [&str; 3] = ["ideal-gas-heat-capacity", "vapor-viscosity", "vapor-conductivity"];

/// The graded validity of one row.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RowValidity {
    /// Kind (the most severe that applies).
    pub validity: Validity,
    /// Property keys evaluated outside their valid range by some component.
    pub extrapolated_properties: Vec<&'static str>,
    /// Mole fraction of the liquid above its own critical temperature \[-\].
    pub supercritical_share: f64,
    /// Mole fraction of the liquid between 0.9 Tc and Tc of its own \[-\].
    pub near_critical_share: f64,
    /// Mole fraction of the liquid with some property (among the keys graded) outside its valid range \[-\].
    pub extrapolated_share: f64,
}

impl RowValidity {
    /// The three shares in [`SHARE_COLUMNS`] order.
    pub fn shares(&self) -> [f64; 3] {
        [self.supercritical_share, self.near_critical_share, self.extrapolated_share]
    }
}

/// Grade a liquid of `mole_fractions` at `t` over the properties `keys`, with its bubble point at the table
/// pressure (None: no bubble point, nothing is flagged above-bubble-point).
pub fn grade(components: &[Arc<Component>], mole_fractions: &[f64], t: f64, keys: &[&str], bubble_point: Option<f64>) -> RowValidity {
    let (mut supercritical, mut near, mut extrapolated) = (0.0, 0.0, 0.0);
    for (c, x) in components.iter().zip(mole_fractions) {
        if *x <= 0.0 {
            continue;
        }
        let tc = c.critical_temperature();
        if t > tc {
            supercritical += x;
        } else if t > NEAR_CRITICAL_FRACTION * tc {
            near += x;
        }
        if (0..10).map(|k| c.valid_range(k)).any(|r| keys.contains(&r.key) && !(t >= r.low && t <= r.high)) {
            extrapolated += x;
        }
    }
    let extrapolated_properties = extrapolated_properties(components, mole_fractions, t, keys);
    let validity = if bubble_point.is_some_and(|tb| t > tb + 1e-9) {
        Validity::AboveBubblePoint
    } else if supercritical > 0.0 {
        Validity::Supercritical
    } else if near > MAJOR_MOLE_FRACTION {
        Validity::NearCritical
    } else if extrapolated > 0.0 {
        Validity::Extrapolated
    } else {
        Validity::Ok
    };
    RowValidity { validity, extrapolated_properties, supercritical_share: supercritical, near_critical_share: near, extrapolated_share: extrapolated }
}

/// Property keys (in `Component::correlations` order) used outside their valid range at `t`
/// ([`Component::valid_range`]: the published correlation's range, or a published extension method inside the
/// range it was stated or checked for) by any component with a positive fraction, among `keys`.
pub fn extrapolated_properties(components: &[Arc<Component>], fractions: &[f64], t: f64, keys: &[&str]) -> Vec<&'static str> {
    let mut out = vec![];
    for k in 0..10 {
        let mut hit: Option<&'static str> = None;
        for (c, f) in components.iter().zip(fractions) {
            if *f <= 0.0 {
                continue;
            }
            let r = c.valid_range(k);
            if keys.contains(&r.key) && !(t >= r.low && t <= r.high) {
                hit = Some(r.key);
                break;
            }
        }
        if let Some(h) = hit {
            out.push(h);
        }
    }
    out
}

/// Every (component, property) among `keys` used outside its valid range somewhere in `[from, to]`, with how
/// far, for the components with a positive fraction.
pub fn range_excursions(components: &[Arc<Component>], fractions: &[f64], from: f64, to: f64, keys: &[&str]) -> Vec<RangeExcursion> {
    merge_excursions(components.iter().zip(fractions).filter(|(_, f)| **f > 0.0).flat_map(|(c, _)| c.outside_valid_ranges(from, to, keys)))
}

/// One line per excursion, or a statement that there is none.
pub fn describe_excursions(list: &[RangeExcursion]) -> String {
    if list.is_empty() {
        "none: every property rests on its published correlation or a published extension inside its stated or checked range".into()
    } else {
        list.iter().map(|e| format!("{} ({})", e.describe(), e.method)).collect::<Vec<_>>().join("; ")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;

    /// A minor component past its own Tc is graded by its mole fraction, not table-ending: n-octane
    /// (Tc 568.7 K) in demo-wide at 575 K.
    #[test]
    fn supercritical_share_is_the_mole_fraction() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("demo-wide", &lib).unwrap();
        let x = fuel.mole_fractions();
        let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
        let t = 575.0;
        let g = grade(&fuel.components, &x, t, &keys, Some(580.0));
        let expected: f64 = fuel.components.iter().zip(&x).filter(|(c, _)| c.critical_temperature() < t).map(|(_, x)| x).sum();
        assert!(expected > 0.0 && expected < 0.1, "{expected}");
        assert!((g.supercritical_share - expected).abs() < 1e-15);
        assert_eq!(g.validity, Validity::Supercritical);
        assert!(g.extrapolated_share >= g.supercritical_share && g.extrapolated_share <= 1.0 + 1e-12);
        assert_eq!(grade(&fuel.components, &x, t, &keys, Some(570.0)).validity, Validity::AboveBubblePoint);
    }
}
