//! The droplet model against published single-droplet experiments (definitions, sources, tolerances and the
//! discussion of the rigs in src/checks/droplet.rs).
//!
//! The n-heptane microgravity pair (Nomura et al. 1996; Chauveau et al.) at 0.1 MPa, 748 K, d0 0.7 mm: each
//! experiment's t/d0² at (d/d0)² = 0.5 must lie inside the band the model spans with that rig's fibre between
//! no radiation and black furnace walls, widened by 10 % (plot reading and model uncertainty), and a free droplet
//! must not be faster than either experiment beyond 10 %. Cases marked "reported, not asserted" (a reference
//! value from memory or read second-hand from a plot, fibre dimensions from memory, or the explained end-of-life
//! disagreement on crossed fibres) appear in the validation report but are not asserted here; today that is every
//! case. What is asserted is the model consistency behind the bands and that each reported case says why.
use dropcut::checks::assert_all_passed;
use dropcut::checks::droplet::{cases, experiment_results, model_value, model_value_with, rig_bounds, Quantity, GROUP};
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
    // A case is asserted only when its reference and rig rest on read publications; every other case says why not.
    for case in cases() {
        assert!(case.asserted || case.note.starts_with("reported, not asserted: "), "{}: no reason for reporting only", case.label);
    }
}

/// A case that is not asserted is marked `reported` in its check results, so the validation report shows it as
/// "reported" and leaves it out of the pass count; an asserted case is not.
#[test]
fn reported_cases_are_marked_and_not_counted() {
    let results = experiment_results();
    assert!(!results.is_empty());
    for (asserted, r) in &results {
        assert_eq!(r.reported, !asserted, "{}", r.check);
    }
    let table = dropcut::checks::markdown_table(&results.iter().map(|(_, r)| r.clone()).collect::<Vec<_>>());
    for (asserted, r) in &results {
        if !asserted {
            let line = table.lines().find(|l| l.contains(&r.check.replace('|', "/"))).unwrap();
            assert!(line.ends_with("| reported (within) |") || line.ends_with("| reported (outside) |"), "{line}");
        }
    }
}

/// The validation proper: the asserted cases within their bands (none today: see src/checks/droplet.rs).
#[test]
fn experiments_within_their_bands() {
    for (asserted, r) in experiment_results() {
        eprintln!("{} | {} | {} | {} | {}", if asserted { "asserted" } else { "reported" }, if r.passed { "pass" } else { "FAIL" }, r.check, r.tolerance, r.achieved);
    }
    let asserted: Vec<_> = experiment_results().into_iter().filter(|(a, _)| *a).map(|(_, r)| r).collect();
    if !asserted.is_empty() {
        assert_all_passed(&asserted);
    }
}

/// Model consistency behind the bands (no reference value involved): a suspending fibre and furnace radiation
/// only add heat, so for every t/d0² case the rig with black walls is no slower than the rig without radiation,
/// which is no slower than the free droplet.
#[test]
fn rig_heat_paths_only_shorten_the_life() {
    let lib = Library::embedded().unwrap();
    for case in cases() {
        if !matches!(case.quantity, Quantity::TimeOverD0Squared { .. }) {
            continue;
        }
        let (slow_rig, fast_rig) = rig_bounds(&case);
        let free = model_value(&case, &lib).unwrap();
        let slow = model_value_with(&case, &lib, slow_rig).unwrap();
        let fast = model_value_with(&case, &lib, fast_rig).unwrap();
        eprintln!("{}: free {free:.4e}, fibre {slow:.4e}, fibre + walls {fast:.4e} s/m²", case.label);
        assert!(fast <= slow * (1.0 + 1e-9) && slow <= free * (1.0 + 1e-9), "{}: {fast} / {slow} / {free}", case.label);
        assert!(fast < free, "{}: the rig heat must shorten the life ({fast} vs {free})", case.label);
    }
}
