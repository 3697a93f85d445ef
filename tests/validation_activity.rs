//! Validation of the liquid activity coefficients (`--activity unifac`): original UNIFAC against the UNIFAC
//! implementation of thermo (validation/thermo/unifac_gammas.csv; same published parameter set, so this checks
//! the equations and the component files' group assignments). Definitions in src/checks/activity.rs.

use dropcut::checks::{activity, assert_all_passed, print_results};
use dropcut::data::Library;

/// γ_i within 2 % of thermo's original UNIFAC for at least five binaries (seven binaries, one ternary).
#[test]
fn unifac_matches_thermo() {
    let lib = Library::embedded().unwrap();
    let results = activity::thermo_checks(&lib);
    print_results(&results);
    let binaries = results.iter().filter(|r| r.check.matches(" + ").count() == 1).map(|r| r.check.split(" at ").next().unwrap_or("").to_string()).collect::<std::collections::BTreeSet<_>>();
    assert!(binaries.len() >= 5, "only {} binaries checked", binaries.len());
    assert_all_passed(&results);
}

/// Every component of the built-in library carries an original-UNIFAC group table, so `--activity unifac`
/// works for every library fuel.
#[test]
fn every_library_component_has_unifac_groups() {
    let lib = Library::embedded().unwrap();
    let missing: Vec<&str> = lib.components().iter().filter(|c| c.unifac_groups.is_empty()).map(|c| c.id.as_str()).collect();
    assert!(missing.is_empty(), "components without unifac-groups: {}", missing.join(", "));
}

/// The group assignments reproduce each component's formula: carbon atoms counted from the subgroups equal
/// the formula's (a check that the table is not mistyped; subgroup carbon counts from the subgroup names).
#[test]
fn unifac_groups_match_formula_carbons() {
    let lib = Library::embedded().unwrap();
    let carbons = |name: &str| -> Option<u32> {
        Some(match name {
            "CH3" | "CH2" | "CH" | "C" | "ACH" | "AC" => 1,
            "ACCH3" | "ACCH2" | "ACCH" => 2,
            "OH" => 0,
            _ => return None,
        })
    };
    for c in lib.components() {
        let mut n = 0;
        let mut known = true;
        for (g, count) in &c.unifac_groups {
            match carbons(&g.name) {
                Some(k) => n += k * count,
                None => known = false,
            }
        }
        if known && !c.unifac_groups.is_empty() {
            assert_eq!(n, c.formula.carbon, "{}: carbon atoms from unifac-groups", c.id);
        }
    }
}
