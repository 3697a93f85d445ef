//! The droplet model with UNIFAC activity coefficients is self-consistent: the film's surface vapour sums to 1
//! exactly at the UNIFAC bubble point (so the boiling switch and the boiling-regime temperature agree), and a
//! run that reaches the boiling regime with `--activity unifac` finishes with a sound mass balance.

use dropcut::data::Library;
use dropcut::fuel::{Basis, Fuel};
use dropcut::model::droplet::NoHistory;
use dropcut::model::film::Film;
use dropcut::model::{simulate, DropletInputs, Status};
use dropcut::props::activity::ActivityModel;
use dropcut::props::gas::AmbientGas;

fn inputs(lib: &Library, fuel: Fuel, activity: ActivityModel) -> DropletInputs {
    let mut inp = DropletInputs::new(fuel, AmbientGas::air(lib).unwrap(), 1500.0, 101_325.0, 50e-6, 300.0);
    inp.liquid.activity = activity;
    inp
}

#[test]
fn surface_vapour_sums_to_one_at_the_unifac_bubble_point() {
    let lib = Library::embedded().unwrap();
    let comps = ["ethanol", "toluene", "n-dodecane"].iter().map(|id| lib.component(id).unwrap().clone()).collect();
    let fuel = Fuel::from_fractions("e-t-d", comps, &[0.1, 0.2, 0.7], Basis::Mass).unwrap();
    for activity in [ActivityModel::Ideal, ActivityModel::Unifac] {
        let inp = inputs(&lib, fuel.clone(), activity);
        let mut film = Film::new(inp.film_setup());
        let x = fuel.mole_fractions();
        let tb = film.bubble_point(&x).unwrap();
        let sum = film.surface_equilibrium(&x, tb);
        assert!((sum - 1.0).abs() < 1e-8, "{}: Σ X_s = {sum} at {tb} K", activity.as_str());
    }
    // UNIFAC lowers this liquid's bubble point (ethanol and toluene are more volatile in the alkane)
    let mut a = Film::new(inputs(&lib, fuel.clone(), ActivityModel::Ideal).film_setup());
    let mut b = Film::new(inputs(&lib, fuel.clone(), ActivityModel::Unifac).film_setup());
    let x = fuel.mole_fractions();
    assert!(b.bubble_point(&x).unwrap() < a.bubble_point(&x).unwrap() - 5.0);
}

#[test]
fn boiling_run_with_unifac_conserves_mass() {
    let lib = Library::embedded().unwrap();
    let mut inp = inputs(&lib, Fuel::resolve("demo-blend", &lib).unwrap(), ActivityModel::Unifac);
    inp.initial_temperature = 480.0; // above the bubble point: flash at injection, then the boiling regime
    let res = simulate(&inp, &mut NoHistory).unwrap();
    assert_eq!(res.outcome.status, Status::Evaporated, "{:?}", res.outcome.regime_notes);
    assert!(res.outcome.regime_notes.iter().any(|n| n.contains("flashed at injection")), "{:?}", res.outcome.regime_notes);
    assert!(res.outcome.mass_balance_error.abs() < 1e-6, "mass balance {}", res.outcome.mass_balance_error);
}
