//! The droplet model against published single-droplet experiments (definitions, sources, tolerances and the
//! discussion of the rigs in src/checks/droplet.rs).
//!
//! The n-heptane microgravity pair (Nomura et al. 1996; Chauveau et al.) at 0.1 MPa, 748 K, d0 0.7 mm: each
//! experiment's t/d0² at (d/d0)² = 0.5 must lie inside the band the model spans with that rig's fibre between
//! no radiation and black furnace walls, widened by 10 % (plot reading and model uncertainty), and a free droplet
//! must not be faster than either experiment beyond 10 %. Cases marked "reported, not asserted" (a reference
//! value from memory, or the explained end-of-life disagreement on crossed fibres) appear in the validation
//! report but are not asserted here.
use dropcut::checks::assert_all_passed;
use dropcut::checks::droplet::{cases, experiment_results, model_value, GROUP};
use dropcut::data::Library;

/// Every experiment case runs through the public API and yields a finite model value.
#[test]
fn experiment_cases_run() {
    let lib = Library::embedded().unwrap();
    for case in cases() {
        let v = model_value(&case, &lib).unwrap_or_else(|e| panic!("{}: {e}", case.label));
        assert!(v.is_finite() && v > 0.0, "{}: {v}", case.label);
    }
    let results = experiment_results();
    assert!(results.iter().all(|(_, r)| r.group == GROUP && !r.source.is_empty() && !r.tolerance.is_empty()));
    assert!(results.iter().filter(|(asserted, _)| *asserted).count() >= 4, "both experiments, band and free-droplet checks");
}

/// The validation proper: the asserted cases within their bands.
#[test]
fn experiments_within_their_bands() {
    for (asserted, r) in experiment_results() {
        eprintln!("{} | {} | {} | {} | {}", if asserted { "asserted" } else { "reported" }, if r.passed { "pass" } else { "FAIL" }, r.check, r.tolerance, r.achieved);
    }
    let asserted: Vec<_> = experiment_results().into_iter().filter(|(a, _)| *a).map(|(_, r)| r).collect();
    assert_all_passed(&asserted);
}
