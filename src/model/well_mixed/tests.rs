use super::*;
use crate::data::Library;
use crate::model::history::Recorder;
use crate::model::run::simulate;
use crate::props::gas::AmbientGas;
use crate::fuel::Fuel;

#[test]
fn decane_droplet_evaporates_and_conserves_mass() {
    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("n-decane", &lib).unwrap();
    let gas = AmbientGas::air(&lib).unwrap();
    let inp = DropletInputs::new(fuel, gas, 800.0, 101_325.0, 50e-6, 300.0);
    let mut rec = Recorder::default();
    let r = simulate(&inp, &mut rec).unwrap();
    let o = &r.outcome;
    eprintln!("{:?} life {:?} t50 {:?} Tmax {} heatup {:?} stats {:?} notes {:?}", o.status, o.lifetime, o.t50, o.max_surface_temperature, o.heatup_end, o.stats, o.regime_notes);
    assert_eq!(o.status, Status::Evaporated);
    assert!(o.mass_balance_error < 1e-9, "{}", o.mass_balance_error);
    let life = o.lifetime.unwrap();
    // order of magnitude: K ≈ 0.3–1 mm²/s for decane at 800 K → lifetime 2.5–10 ms for 50 µm
    assert!(life > 1e-3 && life < 2e-2, "{life}");
}

/// A run whose observer keeps no rows (rows without fractions, the watches reading the system's liquid)
/// gives the outcome of a run that keeps every row: notes (freezing of an enriched heavy end, boiling),
/// heat-up end, maximum surface temperature, crossings and statistics.
#[test]
fn runs_without_rows_watch_as_runs_with_rows() {
    use crate::model::history::NoHistory;
    let lib = Library::embedded().unwrap();
    let two = |a: &str, b: &str, wa: f64| {
        let comps = vec![lib.component(a).unwrap().clone(), lib.component(b).unwrap().clone()];
        Fuel::from_fractions("pair", comps, &[wa, 1.0 - wa], crate::fuel::Basis::Mass).unwrap()
    };
    let gas = AmbientGas::air(&lib).unwrap();
    // cold heptane/hexadecane: the heavy end enriches while evaporative cooling holds the surface cold
    let mut cold = DropletInputs::new(two("n-heptane", "n-hexadecane", 0.3), gas.clone(), 290.0, 101_325.0, 50e-6, 284.0);
    cold.max_time = 0.05;
    let mut fast = DropletInputs::new(two("n-hexane", "n-dodecane", 0.5), gas.clone(), 900.0, 101_325.0, 80e-6, 300.0);
    fast.motion = Motion::Injected { velocity: 40.0 };
    for (k, inp) in [cold, fast, boiling_decane(1e-6)].iter().enumerate() {
        let kept = simulate(inp, &mut Recorder::default()).unwrap();
        let bare = simulate(inp, &mut NoHistory).unwrap();
        assert!(bare.history.is_empty() && !kept.history.is_empty());
        assert_eq!(format!("{:?}", bare.outcome), format!("{:?}", kept.outcome));
        if k == 0 {
            // the freezing watch fires after the start (the heavy end enriches), from the system's fractions
            let note = kept.outcome.regime_notes.iter().find(|n| n.contains("freezing point")).expect("freezing note");
            assert!(!note.contains("t = 0.0000e0 s"), "{note}");
        }
    }
}

/// n-decane, 50 µm at 300 K in 300 K air under 4000 K black-body radiation: evaporating, then held at the
/// bubble point (a regime change inside a step).
fn boiling_decane(rtol: f64) -> DropletInputs {
    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("n-decane", &lib).unwrap();
    let gas = AmbientGas::air(&lib).unwrap();
    let mut inp = DropletInputs::new(fuel, gas, 300.0, 101_325.0, 50e-6, 300.0);
    inp.extra_heat = crate::model::film::ExtraHeat { radiation: Some(crate::model::film::Radiation { temperature: Some(4000.0), absorption_efficiency: 1.0 }), fibre: None };
    inp.rtol = rtol;
    inp
}

#[test]
fn rows_at_requested_times_come_from_the_continuous_extension() {
    use crate::model::guard::{RowsAt, RowsOnly};
    let inp = boiling_decane(1e-6);
    let plain = simulate(&inp, &mut RowsOnly).unwrap();
    assert!(plain.history.iter().any(|r| r.regime == Regime::Boiling));
    // Asking for the plain run's own step times gives its rows back (the extension at θ = 1 is the step's
    // end; regime-change and end-of-life rows are not doubled), and the stepping is not disturbed.
    let step_times: Vec<f64> = plain.history.iter().map(|r| r.time).filter(|t| *t > 0.0).collect();
    let again = simulate(&inp, &mut RowsAt { times: step_times }).unwrap();
    assert_eq!(again.outcome.lifetime, plain.outcome.lifetime);
    assert_eq!(again.outcome.stats, plain.outcome.stats);
    assert_eq!(again.history.len(), plain.history.len());
    for (a, b) in again.history.iter().zip(&plain.history) {
        assert_eq!((a.time, a.regime), (b.time, b.regime));
        assert!((a.mass / b.mass - 1.0).abs() < 1e-9 && (a.surface_temperature - b.surface_temperature).abs() < 1e-7, "t = {}: {} / {} kg, {} / {} K", a.time, a.mass, b.mass, a.surface_temperature, b.surface_temperature);
    }
    // Midway between steps the rows agree with a run at a 10⁴ times finer tolerance (whose rows at those
    // times are its own extension, accurate to about 1e-10) within the default tolerance's error.
    let mids: Vec<f64> = plain.history.windows(2).map(|w| 0.5 * (w[0].time + w[1].time)).collect();
    let coarse = simulate(&inp, &mut RowsAt { times: mids.clone() }).unwrap().history;
    let fine = simulate(&boiling_decane(1e-10), &mut RowsAt { times: mids.clone() }).unwrap().history;
    let samples = |h: &[HistoryRow]| h.iter().filter(|r| mids.contains(&r.time)).cloned().collect::<Vec<_>>();
    let (coarse, fine) = (samples(&coarse), samples(&fine));
    assert!(coarse.len() + 2 >= mids.len() && coarse.len() == fine.len(), "{} / {} / {}", coarse.len(), fine.len(), mids.len());
    let (mut worst_d2, mut worst_t) = (0.0f64, 0.0f64);
    for (a, b) in coarse.iter().zip(&fine) {
        assert_eq!(a.time, b.time);
        worst_d2 = worst_d2.max((a.d2_ratio - b.d2_ratio).abs());
        worst_t = worst_t.max((a.surface_temperature - b.surface_temperature).abs());
    }
    eprintln!("{} rows midway between steps: |Δ(d/d0)²| ≤ {worst_d2:.2e}, |ΔT_s| ≤ {worst_t:.2e} K against rtol 1e-10", coarse.len());
    assert!(worst_d2 < 1e-5 && worst_t < 0.01, "{worst_d2:.3e} {worst_t:.3e} K");
}
