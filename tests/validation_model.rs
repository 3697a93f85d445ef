//! Validation of the droplet model against analytic limits (definitions in src/checks/model.rs).
use dropcut::checks::{assert_all_passed, model};
use dropcut::data::Library;

#[test]
fn d2_law_wet_bulb_rayleigh() {
    assert_all_passed(&[model::d2_law(), model::wet_bulb(), model::rayleigh()]);
}

#[test]
fn mass_conservation_and_convergence() {
    let lib = Library::embedded().unwrap();
    assert_all_passed(&[model::mass_conservation(&lib), model::convergence(&lib)]);
}
