//! Validation of the residual-liquid indicators (src/post): cetane scale, pure and mixture flash points,
//! distillation numerics, Refutas blending and the drift of weathering residues. The check definitions,
//! reference values and their sources live in src/checks/residue.rs.

use dropcut::checks::residue;
use dropcut::checks::{assert_all_passed, print_results, CheckResult};
use dropcut::data::Library;

fn run(results: Vec<CheckResult>) {
    print_results(&results);
    assert_all_passed(&results);
}

fn lib() -> Library {
    Library::embedded().expect("embedded library")
}

#[test]
fn cetane_scale_astm_d613() {
    run(residue::cetane_scale(&lib()));
}

#[test]
fn pure_flash_points_against_independent_compilation() {
    let r = residue::pure_flash_points(&lib());
    assert!(r.len() >= 6);
    run(r);
}

#[test]
fn flash_point_estimator_against_library_values() {
    run(residue::flash_point_estimator(&lib()));
}

#[test]
fn binary_flash_point_liaw_model() {
    run(residue::binary_flash_point(&lib()));
}

#[test]
fn distillation_against_rayleigh() {
    run(residue::distillation(&lib()));
}

#[test]
fn refutas_against_hand_calculation() {
    run(residue::refutas(&lib()));
}

#[test]
fn weathering_residues_drift_heavier() {
    run(residue::weathering_drift(&lib()));
}
