//! The integrator decision on record (docs/model.md, "Integrator"): the same well-mixed droplet integrated by
//! the project's own Dormand–Prince 5(4) stepper and by `ode_solvers::Dopri5` at equal tolerances must reach
//! the same state, and the own stepper must not need more right-hand-side evaluations. Timing is measured by
//! `cargo bench --bench integrators` (a test on a shared machine cannot time reliably).
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
