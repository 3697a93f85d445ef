//! The integrator decision on record (docs/model.md, "Integrator"): the same well-mixed droplet integrated by
//! the project's own Dormand–Prince 5(4) stepper and by `ode_solvers::Dopri5` at equal tolerances must reach
//! the same state, and the own stepper must not need more right-hand-side evaluations. Timing is measured by
//! `cargo bench --bench integrators` (a test on a shared machine cannot time reliably).
mod common;
#[path = "support/integrator_problem.rs"]
mod problem;

/// Largest difference between two states, each unknown scaled by its error weight atol_i + rtol·|y_i|.
fn weighted_difference(p: &problem::Problem, a: &[f64], b: &[f64]) -> f64 {
    let tol = &p.tolerances;
    a.iter().zip(b).zip(&tol.atol).map(|((x, y), atol)| (x - y).abs() / (atol + tol.rtol * x.abs().max(y.abs()))).fold(0.0, f64::max)
}

#[test]
fn own_dormand_prince_matches_ode_solvers_at_equal_tolerances() {
    for rtol in [1e-6, 1e-9] {
        let p = problem::problem(rtol);
        let own = problem::own(&p);
        let other = problem::crate_dopri5(&p);
        let n = p.inputs.fuel.len();
        let diff = weighted_difference(&p, &own.state, &other.state);
        let mass_own: f64 = own.state[..n].iter().sum();
        let mass_other: f64 = other.state[..n].iter().sum();
        println!(
            "rtol {rtol:e}: end {:.6e} s; own {} rhs / {} steps / {} rejected; ode_solvers {} rhs / {} steps / {} rejected; \
             mass {:.9e} vs {:.9e} kg, T {:.6} vs {:.6} K, largest weighted difference {diff:.3}",
            p.end_time, own.rhs_calls, own.steps, own.rejected, other.rhs_calls, other.steps, other.rejected, mass_own, mass_other, own.state[n], other.state[n]
        );
        // Both are 5(4) pairs with local error ≤ 1 weight per step: the global difference stays within a few
        // tens of weights over a few hundred steps.
        assert!(diff < 50.0, "states differ by {diff} error weights");
        assert!((mass_own / mass_other - 1.0).abs() < 100.0 * rtol, "mass differs: {mass_own} vs {mass_other}");
        // The own stepper's work stays within 15 % of the crate's (recorded result: it needs no more).
        assert!((own.rhs_calls as f64) < 1.15 * other.rhs_calls as f64, "own {} vs ode_solvers {} rhs calls", own.rhs_calls, other.rhs_calls);
    }
}

/// The 8th-order question of issue 22, measured (run selectively: `cargo test --release --test
/// integrator_choice -- --ignored --nocapture`). The same droplet to half its life, by the own 5(4) stepper and
/// by `ode_solvers::Dop853` at rtol 1e-6 … 1e-11, errors against the own stepper at rtol 1e-12. Recorded in
/// docs/model.md ("Why an own integrator"): at rtol 1e-10 DOP853 needs about half the right-hand sides for a
/// 20× smaller mass error; at rtol 1e-6 and 1e-7 it reaches a 4–7× smaller mass error with the same or fewer
/// right-hand sides; from 1e-7 to 1e-9 neither error falls steadily with the tolerance (not traced; the
/// property kernels' 2e-8 accuracy and their segment joins are one candidate). Not adopted yet: the own
/// stepper's events, dense rows and end-of-life controller would need an 8th-order counterpart first.
#[test]
#[ignore]
fn eighth_order_pair_at_tight_tolerances() {
    let base = problem::problem(1e-6);
    let mut reference = problem::problem(1e-12);
    reference.end_time = base.end_time;
    let r = problem::own(&reference);
    let n = base.inputs.fuel.len();
    let mass_error = |s: &[f64]| -> f64 {
        let (m, mr): (f64, f64) = (s[..n].iter().sum(), r.state[..n].iter().sum());
        (m / mr - 1.0).abs()
    };
    let mut at_1e10 = None;
    for rtol in [1e-6, 1e-7, 1e-8, 1e-9, 1e-10, 1e-11] {
        let mut p = problem::problem(rtol);
        p.end_time = base.end_time;
        let (own, d8) = (problem::own(&p), problem::crate_dop853(&p));
        println!(
            "rtol {rtol:e}: own 5(4) {} rhs, mass error {:.1e}, T error {:.1e} K | DOP853 {} rhs, mass error {:.1e}, T error {:.1e} K",
            own.rhs_calls,
            mass_error(&own.state),
            (own.state[n] - r.state[n]).abs(),
            d8.rhs_calls,
            mass_error(&d8.state),
            (d8.state[n] - r.state[n]).abs()
        );
        if rtol == 1e-10 {
            at_1e10 = Some((own.rhs_calls, mass_error(&own.state), d8.rhs_calls, mass_error(&d8.state)));
        }
    }
    let (own_rhs, own_err, d8_rhs, d8_err) = at_1e10.unwrap();
    assert!(d8_rhs < own_rhs && d8_err <= own_err, "the recorded finding changed: own {own_rhs} rhs / {own_err:e}, DOP853 {d8_rhs} rhs / {d8_err:e}");
}

/// Issue 22, item 3: the own 8(5,3) pair on whole droplet lives (events t10/t50/t90, end of life, boiling
/// onset and exit, a temperature peak inside a step, dense output). Errors of lifetime, t10, t50, t90 and the
/// highest surface temperature against the same life at rtol 1e-12 (the smallest a run takes) by the 8(5,3)
/// pair; the 5(4) pair at the same tolerance for comparison. Finding (docs/model.md, "Integrator"): from rtol
/// 1e-10 down the 8(5,3) pair is as accurate with 1.4–2.3× fewer right-hand sides, so `Method::Auto` takes it
/// there; at 1e-8–1e-9 it saves 1.1–1.8× but is up to 10× less accurate, so the 5(4) pair stays.
#[test]
fn own_eighth_order_pair_on_whole_lives() {
    use dropcut::data::Library;
    use dropcut::fuel::{Basis, Fuel};
    use dropcut::model::droplet::{NoHistory, Recorder};
    use dropcut::model::film::{ExtraHeat, Radiation};
    use dropcut::model::integrator::Method;
    use dropcut::model::{simulate, DropletInputs, Motion};
    use dropcut::props::gas::AmbientGas;
    let lib = Library::embedded().unwrap();
    let make = |fuel: &[(&str, f64)], t_inf: f64| {
        let comps = fuel.iter().map(|(id, _)| lib.component(id).unwrap().clone()).collect();
        let w: Vec<f64> = fuel.iter().map(|(_, w)| *w).collect();
        let fuel = Fuel::from_fractions("test", comps, &w, Basis::Mass).unwrap();
        DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), t_inf, 101_325.0, 50e-6, 300.0)
    };
    let radiation = |t: f64| ExtraHeat { radiation: Some(Radiation { temperature: Some(t), absorption_efficiency: 1.0 }), fibre: None };
    let mut cases = vec![];
    let mut c = problem::problem(1e-6).inputs;
    c.motion = Motion::Fixed { velocity: 5.0 };
    cases.push(("ten-component, 800 K, 5 m/s", c));
    cases.push(("n-decane, 800 K", make(&[("n-decane", 1.0)], 800.0)));
    let mut c = make(&[("n-heptane", 0.5), ("n-dodecane", 0.5)], 600.0);
    c.extra_heat = radiation(3000.0);
    cases.push(("n-heptane/n-dodecane boiling under 3000 K radiation", c));
    // radiation ∝ d² against conduction ∝ d: the temperature peaks mid-life and falls as the droplet shrinks
    let mut c = make(&[("n-decane", 1.0)], 300.0);
    c.extra_heat = radiation(2000.0);
    cases.push(("n-decane under 2000 K radiation in 300 K air (temperature peak)", c));
    let outputs = |inp: &DropletInputs, rtol: f64, method: Method| {
        let mut inp = inp.clone();
        inp.rtol = rtol;
        inp.integrator = method;
        let r = simulate(&inp, &mut NoHistory).unwrap();
        let o = &r.outcome;
        ([o.lifetime.unwrap(), o.t10.unwrap(), o.t50.unwrap(), o.t90.unwrap(), o.max_surface_temperature], o.stats.rhs_calls)
    };
    for (name, inp) in &cases {
        let (reference, _) = outputs(inp, 1e-12, Method::Order8);
        let errors = |o: &[f64; 5]| o.map(|x| x).iter().zip(&reference).map(|(x, y)| (x / y - 1.0).abs()).collect::<Vec<_>>();
        let text = |e: &[f64]| e.iter().map(|x| format!("{x:.1e}")).collect::<Vec<_>>().join(" ");
        let mut runs = vec![];
        for rtol in [1e-6, 1e-7, 1e-8, 1e-9, 1e-10, 1e-11] {
            let (o5, c5) = outputs(inp, rtol, Method::Order5);
            let (o8, c8) = outputs(inp, rtol, Method::Order8);
            let (e5, e8) = (errors(&o5), errors(&o8));
            let (w5, w8) = (e5.iter().fold(0.0, |a: f64, b| a.max(*b)), e8.iter().fold(0.0, |a: f64, b| a.max(*b)));
            println!("{name}: rtol {rtol:e}: 5(4) {c5} rhs, errors [{}] | 8(5,3) {c8} rhs, errors [{}]", text(&e5), text(&e8));
            if rtol >= 1e-10 {
                assert!(w5 < 200.0 * rtol, "{name} at {rtol:e}: 5(4) error {w5:e}");
            }
            runs.push((rtol, c5, w5, c8, w8));
        }
        // at equal accuracy: each 8(5,3) run from 1e-10 down needs fewer right-hand sides than the cheapest 5(4)
        // run (over all the tolerances) that is at least as accurate
        for &(rtol, c5_same, _, c8, w8) in runs.iter().filter(|r| r.0 <= 1e-10) {
            assert_eq!(Method::Auto.resolve(rtol), Method::Order8);
            assert!(w8 < 100.0 * rtol, "{name} at {rtol:e}: 8(5,3) error {w8:e}");
            let cheapest = runs.iter().filter(|r| r.2 <= w8).map(|r| r.1).min();
            println!("{name}: rtol {rtol:e}: 8(5,3) {c8} rhs for {w8:.1e}; 5(4) as accurate from {cheapest:?} rhs ({c5_same} at the same tolerance)");
            assert!(cheapest.is_none_or(|c5| c8 < c5), "{name} at {rtol:e}: 8(5,3) {c8} rhs / {w8:e}, 5(4) {cheapest:?}");
        }
    }
    // the highest surface temperature is the peak of the solution, not of the rows at the step ends
    let (name, inp) = &cases[3];
    let (reference, _) = outputs(inp, 1e-12, Method::Order8);
    for method in [Method::Order5, Method::Order8] {
        let mut inp = inp.clone();
        inp.rtol = 1e-6;
        inp.integrator = method;
        let mut rec = Recorder::default();
        let r = simulate(&inp, &mut rec).unwrap();
        let highest_row = rec.rows.iter().map(|r| r.surface_temperature).fold(f64::MIN, f64::max);
        let peak = r.outcome.max_surface_temperature;
        println!("{name}, rtol 1e-6, {method:?}: peak {peak:.9} K, highest row {highest_row:.9} K, reference {:.9} K", reference[4]);
        assert!(peak > highest_row && (peak / reference[4] - 1.0).abs() < 1e-6, "{method:?}: peak {peak} vs reference {}", reference[4]);
    }
}

/// `--integrator` end to end through the binary: each choice reaches the well-mixed run and the input echo names
/// the pair that ran; both pairs agree on the lifetime to well within the tolerance; a sweep varies it as a
/// condition and writes it as a summary column.
#[test]
fn integrator_option_reaches_the_run_and_the_outputs() {
    use common::{ok, p, scratch};
    let dir = scratch("integrator_choice", "option");
    let run = |extra: &[&str], name: &str| {
        let out = dir.join(name);
        let mut args = vec!["simulate", "n-decane", "--no-plots", "--json", "--out", p(&out)];
        args.extend_from_slice(extra);
        serde_json::from_str::<serde_json::Value>(&ok(&args)).expect("json")
    };
    let echo = |v: &serde_json::Value| v["input"]["integrator"].as_str().unwrap_or_else(|| panic!("no input.integrator in {}", v["input"])).to_string();
    let rhs = |v: &serde_json::Value| v["integrator"]["rhs_calls"].as_u64().unwrap();
    let life = |v: &serde_json::Value| v["lifetime_s"].as_f64().unwrap();
    let auto6 = run(&[], "auto6");
    let dp853_6 = run(&["--integrator", "dp853"], "dp853-6");
    let auto11 = run(&["--rtol", "1e-11"], "auto11");
    let dp54_11 = run(&["--rtol", "1e-11", "--integrator", "dp54"], "dp54-11");
    assert_eq!(echo(&auto6), "auto: dp54");
    assert_eq!(echo(&dp853_6), "dp853");
    assert_eq!(echo(&auto11), "auto: dp853");
    assert_eq!(echo(&dp54_11), "dp54");
    // the choice changes the step sequence (different work) but not the answer beyond the tolerances
    assert_ne!(rhs(&auto6), rhs(&dp853_6));
    assert!((life(&auto6) / life(&dp853_6) - 1.0).abs() < 1e-4, "{} vs {}", life(&auto6), life(&dp853_6));
    assert!((life(&auto11) / life(&dp54_11) - 1.0).abs() < 1e-8, "{} vs {}", life(&auto11), life(&dp54_11));
    assert!(rhs(&auto11) < rhs(&dp54_11), "8(5,3) {} vs 5(4) {} right-hand sides at 1e-11", rhs(&auto11), rhs(&dp54_11));
    let resolved = run(&["--liquid-mixing", "diffusion", "--nodes", "10"], "resolved");
    assert_eq!(echo(&resolved), "auto: resolved liquid, own implicit steps");

    let spec = dir.join("spec.toml");
    std::fs::write(&spec, "fuels = [\"n-decane\"]\n[conditions]\nintegrator = [\"dp54\", \"dp853\"]\nrtol = \"1e-10\"\n").unwrap();
    let out = dir.join("sweep");
    ok(&["sweep", p(&spec), "--threads", "1", "--out", p(&out)]);
    let summary = std::fs::read_to_string(out.join("summary.csv")).unwrap();
    let mut rows = summary.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<&str> = rows.next().unwrap().split(',').collect();
    let col = header.iter().position(|h| *h == "integrator").expect("integrator column");
    let life_col = header.iter().position(|h| *h == "lifetime_s").expect("lifetime column");
    let rows: Vec<Vec<&str>> = rows.map(|l| l.split(',').collect()).collect();
    assert_eq!(rows.iter().map(|r| r[col]).collect::<Vec<_>>(), ["dp54", "dp853"]);
    let (a, b): (f64, f64) = (rows[0][life_col].parse().unwrap(), rows[1][life_col].parse().unwrap());
    assert!((a / b - 1.0).abs() < 1e-7, "sweep lifetimes {a} / {b}");
}
