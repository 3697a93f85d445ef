use super::*;

struct Decay;
impl OdeSystem for Decay {
    fn dim(&self) -> usize {
        1
    }
    fn rhs(&mut self, _t: f64, y: &[f64], dy: &mut [f64]) {
        dy[0] = -y[0];
    }
}

/// Integrates y' = −y, y(0) = 1 to `t_end` with `method`, locating y = 1/2 on the dense output: relative error
/// at the end, error of the located ln 2 and the right-hand-side calls.
fn decay_run(method: Method, rtol: f64, atol: f64, t_end: f64, event_tol: f64) -> (f64, f64, u64) {
    let mut sys = Decay;
    let mut dp = DormandPrince::with_method(&mut sys, 0.0, &[1.0], Tolerances { rtol, atol: vec![atol] }, 0.0, 1.0, method);
    let mut buf = [0.0];
    let mut t_half = None;
    while dp.t < t_end {
        let before = dp.y[0];
        dp.step(&mut sys).unwrap();
        if before > 0.5 && dp.y[0] <= 0.5 {
            dp.prepare_dense(&mut sys);
            t_half = Some(locate_event(&dp, |y| y[0] - 0.5, &mut buf, event_tol));
        }
    }
    assert_eq!(dp.method(), method.resolve(rtol));
    ((dp.y[0] / (-dp.t).exp() - 1.0).abs(), (t_half.unwrap() - std::f64::consts::LN_2).abs(), dp.stats.rhs_calls)
}

#[test]
fn exponential_decay_and_event() {
    let (err, event, _) = decay_run(Method::Order5, 1e-10, 1e-12, 2.0, 1e-14);
    assert!(err < 1e-9, "error {err:e}");
    assert!(event < 1e-8, "event {event:e}");
}

struct Oscillator;
impl OdeSystem for Oscillator {
    fn dim(&self) -> usize {
        2
    }
    fn rhs(&mut self, _t: f64, y: &[f64], dy: &mut [f64]) {
        dy[0] = y[1];
        dy[1] = -y[0];
    }
}

/// The transcribed 8(5,3) tableau satisfies what it must: each row of A sums to its node, the weights are
/// exact for polynomials up to degree 7 (Σ b_j c_j^(q−1) = 1/q, q = 1…8), both error estimates vanish on a
/// constant (Σ e_j = 0), and the dense-output stages are consistent (their rows sum to their nodes).
#[test]
fn eighth_order_tableau_satisfies_its_conditions() {
    use super::dop853_tableau::{A, B, C, D, E3, E5, STAGES, STAGES_DENSE};
    for s in 0..STAGES_DENSE {
        let row: f64 = A[s][..s.max(1)].iter().sum();
        assert!((row - C[s]).abs() < 1e-14, "row {s}: {row} vs c = {}", C[s]);
    }
    for q in 1..=8 {
        let quad: f64 = (0..STAGES).map(|j| B[j] * C[j].powi(q - 1)).sum();
        assert!((quad - 1.0 / f64::from(q)).abs() < 1e-14, "degree {}: {quad}", q - 1);
    }
    assert!(B.iter().zip(&A[STAGES]).all(|(b, a)| b == a), "row 12 of A holds the weights");
    for e in [&E5[..], &E3[..]] {
        assert!(e.iter().sum::<f64>().abs() < 1e-14);
    }
    // the interpolant's higher terms vanish for a constant right-hand side
    for d in &D {
        assert!(d.iter().sum::<f64>().abs() < 1e-12, "{}", d.iter().sum::<f64>());
    }
}

/// Same state at fixed steps of h and h/2 (tolerance loose, the step bounded by h_max): the 8(5,3) pair's
/// global error falls by about 2^8 and its dense output's by at least 2^7.
#[test]
fn eighth_order_pair_converges_at_its_order() {
    let run = |h: f64| {
        let mut sys = Oscillator;
        let tol = Tolerances { rtol: 1.0, atol: vec![1e6; 2] };
        let mut dp = DormandPrince::with_method(&mut sys, 0.0, &[0.0, 1.0], tol, h, h, Method::Order8);
        let mut buf = [0.0; 2];
        let mut dense_error: f64 = 0.0;
        while dp.t < 4.0 - 1e-12 {
            dp.step(&mut sys).unwrap();
            dp.prepare_dense(&mut sys);
            let tm = dp.t_old + 0.37 * dp.h_last;
            dp.dense(tm, &mut buf);
            dense_error = dense_error.max((buf[0] - tm.sin()).abs());
        }
        assert_eq!(dp.stats.rejected, 0);
        ((dp.y[0] - dp.t.sin()).abs(), dense_error)
    };
    let (coarse, coarse_dense) = run(0.4);
    let (fine, fine_dense) = run(0.2);
    let ratio = coarse / fine;
    println!("fixed steps 0.4 / 0.2: step error {coarse:e} / {fine:e} = {ratio:.0}, dense {coarse_dense:e} / {fine_dense:e}");
    assert!((150.0..450.0).contains(&ratio), "step error ratio {ratio} ({coarse:e} vs {fine:e})");
    assert!(coarse_dense / fine_dense > 100.0, "dense error ratio {} ({coarse_dense:e} vs {fine_dense:e})", coarse_dense / fine_dense);
}

#[test]
fn eighth_order_pair_decay_event_and_work() {
    let run = |method| decay_run(method, 1e-12, 1e-14, 3.0, 1e-15);
    let (err8, event8, calls8) = run(Method::Auto);
    let (err5, _, calls5) = run(Method::Order5);
    println!("decay at rtol 1e-12: 8(5,3) {calls8} rhs, error {err8:e}, event {event8:e}; 5(4) {calls5} rhs, error {err5:e}");
    assert!(err8 < 1e-11 && event8 < 1e-12, "error {err8:e}, event {event8:e}");
    assert!(err5 < 1e-10);
    assert!(calls8 * 2 < calls5, "8(5,3): {calls8} right-hand sides, 5(4): {calls5}");
}

#[test]
fn methods_resolve_by_tolerance() {
    assert_eq!(Method::Auto.resolve(1e-6), Method::Order5);
    assert_eq!(Method::Auto.resolve(1e-9), Method::Order5);
    assert_eq!(Method::Auto.resolve(EIGHTH_ORDER_FROM), Method::Order8);
    assert_eq!(Method::Order5.resolve(1e-12), Method::Order5);
    assert_eq!(Method::Order8.resolve(1e-3), Method::Order8);
}

#[test]
#[should_panic(expected = "before prepare_dense")]
fn eighth_order_dense_output_needs_preparing() {
    let mut sys = Decay;
    let mut dp = DormandPrince::with_method(&mut sys, 0.0, &[1.0], Tolerances { rtol: 1e-9, atol: vec![1e-12] }, 0.0, 1.0, Method::Order8);
    dp.step(&mut sys).unwrap();
    let mut out = [0.0];
    dp.dense(dp.t, &mut out);
}

#[test]
fn dense_output_is_accurate() {
    let mut sys = Oscillator;
    let mut dp = DormandPrince::with_method(&mut sys, 0.0, &[0.0, 1.0], Tolerances { rtol: 1e-9, atol: vec![1e-12; 2] }, 0.0, 10.0, Method::Order5);
    let mut buf = [0.0; 2];
    let mut worst: f64 = 0.0;
    while dp.t < 10.0 {
        dp.step(&mut sys).unwrap();
        let tm = 0.5 * (dp.t_old + dp.t);
        dp.dense(tm, &mut buf);
        worst = worst.max((buf[0] - tm.sin()).abs());
    }
    assert!(worst < 1e-7, "{worst}");
    assert!(dp.stats.rhs_calls < 2000, "{:?}", dp.stats);
}
