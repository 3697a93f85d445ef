//! Standard uncertainties of the pure-component inputs of the flash-point and cetane indicators: a published
//! closed-cup flash point, the boiling-point flash-point estimate, a published cetane number and a class-trend
//! cetane estimate. The uncertainty bands (`crate::uncertainty`) sample them, so a band of the residue's flash
//! point or DCN is not narrower than what its inputs are known to.
//!
//! Every number is produced by `validation/estimator_spread.py` from the compilations shipped in the
//! `chemicals` 1.5.2 package and written to `validation/estimator_spread.csv`; `tests/input_spread.rs` checks
//! that the constants here match that file. Saturated and aromatic hydrocarbons with 5–22 carbon atoms only.
//!
//! Not included: the error of the mixing rules themselves (the Liaw et al. 2002 flash-point model and the
//! linear cetane blending rule), for which no published figure was found here.

use crate::data::{Component, HydrocarbonClass};

use super::mixture_rules::{component_flash_point, FlashPointOrigin};

/// Standard uncertainty of one published closed-cup flash point \[K\]: RMS difference between compilations
/// (IEC 60079-20-1:2010, NFPA 497 (2008), DIPPR experimental set of Serat et al. 2017; 38 pairs) / √2.
pub const PUBLISHED_FLASH_POINT_SD: f64 = 2.33;

/// Standard uncertainty of the boiling-point flash-point estimate T_fp = 0.683 T_b + 14.84 K (Butler et al.
/// 1956) \[K\]: its RMS error against 97 measured hydrocarbon flash points of the same compilations.
pub const BOILING_POINT_FLASH_POINT_SD: f64 = 9.55;

/// Standard uncertainty of one published cetane number \[CN units\]: RMS difference between the vom Lehn et
/// al. (2021) and Kessler CombustDB compilations (14 compounds) / √2. Both draw largely on the same NREL
/// compendium, so this is a lower bound; a value's own stated relative uncertainty is used when it is larger.
pub const PUBLISHED_CETANE_SD: f64 = 0.27;

/// Residual standard deviation of measured cetane numbers about a straight line in carbon number, per
/// structural class (vom Lehn et al. 2021 and Kessler CombustDB values) \[CN units\]: (class, SD, compounds).
pub const CLASS_TREND_CETANE_SD: [(&str, f64, usize); 6] = [
    ("n-alkane", 5.34, 16),
    ("iso-alkane", 17.13, 42),
    ("cycloalkane", 9.07, 25),
    ("mono-aromatic", 10.63, 40),
    ("di-aromatic", 10.35, 5),
    ("all-classes", 12.57, 128),
];

fn trend_sd(name: &str) -> f64 {
    CLASS_TREND_CETANE_SD.iter().find(|(n, _, _)| *n == name).map(|(_, sd, _)| *sd).unwrap_or(CLASS_TREND_CETANE_SD[5].1)
}

/// Structural class of `class` in the cetane-trend table.
pub fn cetane_trend_class(class: HydrocarbonClass) -> &'static str {
    match class {
        HydrocarbonClass::NAlkane => "n-alkane",
        HydrocarbonClass::IsoAlkane => "iso-alkane",
        HydrocarbonClass::Monocycloalkane | HydrocarbonClass::Dicycloalkane => "cycloalkane",
        HydrocarbonClass::Alkylbenzene | HydrocarbonClass::Cycloaromatic => "mono-aromatic",
        HydrocarbonClass::Diaromatic => "di-aromatic",
        HydrocarbonClass::Oxygenate | HydrocarbonClass::PetroleumFraction => "all-classes",
    }
}

/// Standard uncertainty of a component's closed-cup flash point \[K\] and what it rests on.
pub fn flash_point_sd(c: &Component) -> (f64, &'static str) {
    match component_flash_point(c).1 {
        FlashPointOrigin::Published => (PUBLISHED_FLASH_POINT_SD, "published value: spread between compilations"),
        FlashPointOrigin::EstimatedButler => (BOILING_POINT_FLASH_POINT_SD, "boiling-point estimate: its RMS error against measured values"),
    }
}

/// Standard uncertainty of a component's cetane number \[CN units\] and what it rests on: the class-trend
/// scatter for an estimate, else the larger of the compilation spread and the value's stated relative
/// uncertainty.
pub fn cetane_sd(c: &Component) -> (f64, &'static str) {
    let v = &c.constants.cetane_number;
    let estimated = v.kind.as_deref() == Some("estimate") || v.source.starts_with("estimated");
    if estimated {
        return (trend_sd(cetane_trend_class(c.class)), "estimate: scatter of measured values about the class trend");
    }
    let stated = v.uncertainty.unwrap_or(0.0) * v.value.abs();
    if stated > PUBLISHED_CETANE_SD {
        (stated, "stated uncertainty of the value")
    } else {
        (PUBLISHED_CETANE_SD, "published value: spread between compilations")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;

    #[test]
    fn every_library_component_gets_a_positive_spread() {
        let lib = Library::embedded().unwrap();
        for c in lib.components() {
            let (f, _) = flash_point_sd(c);
            let (n, _) = cetane_sd(c);
            assert!(f > 0.0 && n > 0.0, "{}", c.id);
        }
        // an estimate is less certain than a published value of the same class
        let est = lib.components().iter().find(|c| c.constants.cetane_number.kind.as_deref() == Some("estimate")).unwrap();
        assert!(cetane_sd(est).0 > PUBLISHED_CETANE_SD);
        let butler = lib.components().iter().find(|c| c.constants.flash_point.is_none()).unwrap();
        assert_eq!(flash_point_sd(butler).0, BOILING_POINT_FLASH_POINT_SD);
    }
}
