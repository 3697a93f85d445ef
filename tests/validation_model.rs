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

#[test]
fn radial_solver_against_series_solutions() {
    assert_all_passed(&model::radial_series_checks());
}

#[test]
fn resolved_liquid_limits_and_grid_convergence() {
    let lib = Library::embedded().unwrap();
    assert_all_passed(&model::resolved_limit_checks(&lib));
}

#[test]
fn joback_viscosity_estimate_against_published_correlations() {
    let lib = Library::embedded().unwrap();
    assert_all_passed(&dropcut::checks::estimation::joback_viscosity_checks(&lib));
}

#[test]
fn diffusion_limit_of_a_binary_droplet() {
    let results = model::diffusion_limit();
    assert_all_passed(&results);
}
