//! One bracketed scalar root finder: Brent's method (R. P. Brent, *Algorithms for Minimization without
//! Derivatives*, Prentice-Hall 1973, ch. 4, procedure `zero`): inverse quadratic interpolation or secant steps,
//! falling back to bisection whenever they would not shrink the bracket fast enough, so it never leaves the
//! bracket and needs at most about (log₂(width/tolerance))² evaluations (usually a handful).
//!
//! Termination is explicit ([`Tolerance`]): the bracket around the returned point is narrower than
//! `x_abs + x_rel |x|` (plus 4 ulp of x), or |f(x)| ≤ `f_abs`, or `max_iterations` evaluations were spent
//! (an error carrying the best point). A NaN function value or a non-finite bracket end is an error, never a
//! NaN result; so is a bracket whose ends do not have opposite signs. An infinite value (ln 0 = −∞ at a cold
//! end, say) counts by its sign, and the steps are bisections while one is held; a root estimate whose value
//! is itself infinite (a pole with a sign change) is an error.

use std::fmt;

/// When [`brent`] stops.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Tolerance {
    /// Absolute tolerance on x: the root lies within `x_abs + x_rel |x|` (plus 4 ulp) of the returned x.
    pub x_abs: f64,
    /// Relative tolerance on x (see `x_abs`).
    pub x_rel: f64,
    /// Stop as soon as |f(x)| ≤ `f_abs` (0 = only the x tolerance, or an exact zero, stops).
    pub f_abs: f64,
    /// Most function evaluations after the two bracket ends.
    pub max_iterations: usize,
}

impl Tolerance {
    /// Absolute x tolerance `x_abs`, no relative or f tolerance, at most 200 evaluations.
    pub const fn absolute(x_abs: f64) -> Self {
        Tolerance { x_abs, x_rel: 0.0, f_abs: 0.0, max_iterations: 200 }
    }

    /// Relative x tolerance `x_rel`, no absolute or f tolerance, at most 200 evaluations.
    pub const fn relative(x_rel: f64) -> Self {
        Tolerance { x_abs: 0.0, x_rel, f_abs: 0.0, max_iterations: 200 }
    }

    /// The same with the f tolerance `f_abs`.
    pub const fn with_f_abs(self, f_abs: f64) -> Self {
        Tolerance { f_abs, ..self }
    }

    /// The same with the relative x tolerance `x_rel`.
    pub const fn with_x_rel(self, x_rel: f64) -> Self {
        Tolerance { x_rel, ..self }
    }

    /// The same with at most `max_iterations` evaluations.
    pub const fn with_max_iterations(self, max_iterations: usize) -> Self {
        Tolerance { max_iterations, ..self }
    }
}

/// A root found by [`brent`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Root {
    /// The root estimate x.
    pub x: f64,
    /// f(x) at the estimate.
    pub f: f64,
    /// Function evaluations inside the bracket (the two ends not counted).
    pub iterations: usize,
}

/// Why [`brent`] found no root.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum RootError {
    /// f has the same sign at both ends of the bracket (or an end is not a finite x).
    NoBracket {
        /// Lower end x.
        lo: f64,
        /// Upper end x.
        hi: f64,
        /// f(lo).
        f_lo: f64,
        /// f(hi).
        f_hi: f64,
    },
    /// f returned NaN at x, or the root estimate's value is infinite (a pole).
    NonFinite {
        /// Where.
        x: f64,
        /// The value returned.
        f: f64,
    },
    /// The tolerance was not met within the allowed evaluations; the best point so far is kept.
    MaxIterations {
        /// Best estimate (smallest |f| of the bracket ends).
        x: f64,
        /// f(x).
        f: f64,
        /// Width of the last bracket.
        width: f64,
    },
}

impl RootError {
    /// The best estimate when the iteration budget ran out (a usable, bracketed point), else `None`.
    pub fn best(&self) -> Option<f64> {
        match self {
            RootError::MaxIterations { x, .. } => Some(*x),
            _ => None,
        }
    }
}

impl fmt::Display for RootError {
    fn fmt(&self, out: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RootError::NoBracket { lo, hi, f_lo, f_hi } => write!(out, "no sign change between x = {lo} (f = {f_lo}) and x = {hi} (f = {f_hi})"),
            RootError::NonFinite { x, f } => write!(out, "the function is not finite at x = {x} (f = {f})"),
            RootError::MaxIterations { x, width, .. } => write!(out, "no convergence within the iteration limit (best x = {x}, bracket width {width})"),
        }
    }
}

impl std::error::Error for RootError {}

/// Root of `f` in the bracket [`lo`, `hi`] (either order; f(lo) and f(hi) of opposite signs or one of them 0)
/// by Brent's method, to the tolerance `tol`.
pub fn brent(mut f: impl FnMut(f64) -> f64, lo: f64, hi: f64, tol: Tolerance) -> Result<Root, RootError> {
    if !(lo.is_finite() && hi.is_finite()) {
        return Err(RootError::NoBracket { lo, hi, f_lo: f64::NAN, f_hi: f64::NAN });
    }
    let f_lo = f(lo);
    if f_lo.is_nan() {
        return Err(RootError::NonFinite { x: lo, f: f_lo });
    }
    let f_hi = f(hi);
    brent_from(f, (lo, f_lo), (hi, f_hi), tol)
}

/// [`brent`] when f is already known at both ends: `lo` = (x, f(x)), `hi` = (x, f(x)).
pub fn brent_from(mut f: impl FnMut(f64) -> f64, lo: (f64, f64), hi: (f64, f64), tol: Tolerance) -> Result<Root, RootError> {
    let (mut a, mut fa) = lo;
    let (mut b, mut fb) = hi;
    if !(a.is_finite() && b.is_finite()) {
        return Err(RootError::NoBracket { lo: a, hi: b, f_lo: fa, f_hi: fb });
    }
    for (x, fx) in [lo, hi] {
        if fx.is_nan() {
            return Err(RootError::NonFinite { x, f: fx });
        }
    }
    if fa == 0.0 {
        return Ok(Root { x: a, f: fa, iterations: 0 });
    }
    if fb == 0.0 {
        return Ok(Root { x: b, f: fb, iterations: 0 });
    }
    if (fa > 0.0) == (fb > 0.0) {
        return Err(RootError::NoBracket { lo: a, hi: b, f_lo: fa, f_hi: fb });
    }
    // b: best estimate; a: previous b; c: the other end of the bracket [b, c] (f(b) f(c) < 0)
    let (mut c, mut fc) = (a, fa);
    let mut d = b - a;
    let mut e = d;
    let mut iterations = 0;
    loop {
        if (fb > 0.0) == (fc > 0.0) {
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol1 = (2.0 * f64::EPSILON * b.abs() + 0.5 * (tol.x_abs + tol.x_rel * b.abs())).max(f64::MIN_POSITIVE);
        let m = 0.5 * (c - b);
        if m.abs() <= tol1 || fb == 0.0 || fb.abs() <= tol.f_abs {
            if fb.is_infinite() {
                return Err(RootError::NonFinite { x: b, f: fb });
            }
            return Ok(Root { x: b, f: fb, iterations });
        }
        if iterations >= tol.max_iterations {
            return Err(RootError::MaxIterations { x: b, f: fb, width: (c - b).abs() });
        }
        if e.abs() >= tol1 && fa.abs() > fb.abs() && fa.is_finite() && fb.is_finite() && fc.is_finite() {
            // interpolation: secant when only two distinct points are known, else inverse quadratic
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * m * s;
                q = 1.0 - s;
            } else {
                let qa = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * m * qa * (qa - r) - (b - a) * (r - 1.0));
                q = (qa - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            } else {
                p = -p;
            }
            // accept the step only if it stays well inside the bracket and shrinks faster than bisection would
            if 2.0 * p < (3.0 * m * q - (tol1 * q).abs()).min((e * q).abs()) {
                e = d;
                d = p / q;
            } else {
                d = m;
                e = m;
            }
        } else {
            d = m;
            e = m;
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol1 { d } else { tol1.copysign(m) };
        fb = f(b);
        iterations += 1;
        if fb.is_nan() {
            return Err(RootError::NonFinite { x: b, f: fb });
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The Illinois regula falsi the film used before (Dowell & Jarratt 1971), kept here to compare
    /// evaluation counts: evaluations until the bracket is narrower than `tol`.
    fn illinois_evaluations(f: impl Fn(f64) -> f64, mut lo: f64, mut hi: f64, tol: f64) -> (f64, usize) {
        let (mut flo, mut fhi) = (f(lo), f(hi));
        let mut side = 0;
        for k in 1..=1000 {
            let x = (lo * fhi - hi * flo) / (fhi - flo);
            let x = if x > lo && x < hi { x } else { 0.5 * (lo + hi) };
            let fx = f(x);
            if fx == 0.0 || hi - lo <= tol {
                return (x, k);
            }
            if fx < 0.0 {
                lo = x;
                flo = fx;
                if side == -1 {
                    fhi *= 0.5;
                }
                side = -1;
            } else {
                hi = x;
                fhi = fx;
                if side == 1 {
                    flo *= 0.5;
                }
                side = 1;
            }
        }
        (0.5 * (lo + hi), 1000)
    }

    /// Plain bisection (the table surrogate's finder) evaluations until the bracket is narrower than `tol`.
    fn bisection_evaluations(lo: f64, hi: f64, tol: f64) -> usize {
        ((hi - lo) / tol).log2().ceil() as usize
    }

    #[test]
    fn finds_simple_roots_to_the_tolerance() {
        let r = brent(|x| x * x - 2.0, 0.0, 2.0, Tolerance::absolute(1e-12)).unwrap();
        assert!((r.x - std::f64::consts::SQRT_2).abs() < 1e-12, "{r:?}");
        // either order of the bracket, decreasing functions too
        let r = brent(|x| 2.0 - x * x, 2.0, 0.0, Tolerance::absolute(1e-12)).unwrap();
        assert!((r.x - std::f64::consts::SQRT_2).abs() < 1e-12);
        // cos x = x (Dottie number 0.739085133215160641…, OEIS A003957)
        let r = brent(|x| x.cos() - x, 0.0, 1.0, Tolerance::absolute(1e-14)).unwrap();
        assert!((r.x - 0.739_085_133_215_160_6).abs() < 2e-14, "{r:?}");
    }

    #[test]
    fn the_tolerance_is_honoured_and_loose_tolerances_stop_early() {
        let f = |x: f64| (x - 1.0 / 3.0) * (1.0 + x * x);
        for tol in [1e-3, 1e-6, 1e-9, 1e-12] {
            let r = brent(f, -5.0, 7.0, Tolerance::absolute(tol)).unwrap();
            assert!((r.x - 1.0 / 3.0).abs() <= tol + 4.0 * f64::EPSILON, "tol {tol}: {r:?}");
        }
        let coarse = brent(f, -5.0, 7.0, Tolerance::absolute(1e-2)).unwrap();
        let fine = brent(f, -5.0, 7.0, Tolerance::absolute(1e-13)).unwrap();
        assert!(coarse.iterations < fine.iterations);
        // relative tolerance at a large root
        let r = brent(|x| x - 1.234e8, 0.0, 1e9, Tolerance::relative(1e-10)).unwrap();
        assert!((r.x / 1.234e8 - 1.0).abs() <= 1e-10);
        // the f tolerance stops as soon as |f| is small enough
        let r = brent(|x| 1e-3 * (x - 0.3), 0.0, 1.0, Tolerance::absolute(1e-15).with_f_abs(1e-6)).unwrap();
        assert!(r.f.abs() <= 1e-6 && (r.x - 0.3).abs() <= 1e-3, "{r:?}");
    }

    #[test]
    fn bracket_errors_and_exact_ends() {
        match brent(|x| x * x + 1.0, -1.0, 1.0, Tolerance::absolute(1e-9)) {
            Err(RootError::NoBracket { f_lo, f_hi, .. }) => assert_eq!((f_lo, f_hi), (2.0, 2.0)),
            other => panic!("{other:?}"),
        }
        assert!(matches!(brent(|x| x, f64::NAN, 1.0, Tolerance::absolute(1e-9)), Err(RootError::NoBracket { .. })));
        assert!(matches!(brent(|x| x, -1.0, f64::INFINITY, Tolerance::absolute(1e-9)), Err(RootError::NoBracket { .. })));
        let r = brent(|x| x - 1.0, 1.0, 3.0, Tolerance::absolute(1e-9)).unwrap();
        assert_eq!((r.x, r.iterations), (1.0, 0));
        let r = brent(|x| x - 3.0, 1.0, 3.0, Tolerance::absolute(1e-9)).unwrap();
        assert_eq!(r.x, 3.0);
        assert!(RootError::NoBracket { lo: 0.0, hi: 1.0, f_lo: 1.0, f_hi: 2.0 }.to_string().contains("no sign change"));
    }

    #[test]
    fn non_finite_values_are_errors_not_nan() {
        // NaN at an end
        assert!(matches!(brent(|x| if x < 0.0 { f64::NAN } else { x }, -1.0, 1.0, Tolerance::absolute(1e-9)), Err(RootError::NonFinite { x, .. }) if x == -1.0));
        // NaN inside the bracket, met on the way
        let e = brent(|x| if x.abs() < 0.4 { f64::NAN } else { x }, -1.0, 2.0, Tolerance::absolute(1e-9)).unwrap_err();
        assert!(matches!(e, RootError::NonFinite { .. }), "{e:?}");
        assert_eq!(e.best(), None);
        // −∞ at the cold end (ln of an underflowed vapour pressure) counts as negative
        let r = brent(|t: f64| (-(3000.0 / t).powi(3)).exp().ln() + 1.0, 1.0, 6000.0, Tolerance::absolute(1e-9)).unwrap();
        assert!((r.x - 3000.0).abs() < 1e-6, "{r:?}");
        let r = brent(|t: f64| if t < 100.0 { f64::NEG_INFINITY } else { (t / 300.0).ln() }, 20.0, 900.0, Tolerance::absolute(1e-9)).unwrap();
        assert!((r.x - 300.0).abs() < 1e-9, "{r:?}");
        // a pole inside the bracket: a sign change without a root; the iteration still ends (at the pole, with a
        // huge |f|) and never returns NaN
        let r = brent(|x| 1.0 / (x - 0.5), 0.0, 1.0, Tolerance::absolute(1e-12));
        match r {
            Ok(r) => assert!((r.x - 0.5).abs() < 1e-9 && r.x.is_finite()),
            Err(e) => assert!(matches!(e, RootError::NonFinite { .. })),
        }
    }

    #[test]
    fn iteration_limit_is_an_error_with_the_best_point() {
        let e = brent(|x| x.powi(3) - 0.1, 0.0, 10.0, Tolerance::absolute(1e-15).with_max_iterations(3)).unwrap_err();
        let best = e.best().unwrap();
        assert!((0.0..=10.0).contains(&best));
        assert!(matches!(e, RootError::MaxIterations { .. }));
    }

    #[test]
    fn pathological_flat_and_steep_functions() {
        // flat: x^9 has a root of multiplicity 9 at 0.3 (f below 1e-40 over a wide band); the x tolerance still holds
        let flat = |x: f64| (x - 0.3).powi(9);
        let r = brent(flat, -1.0, 2.0, Tolerance::absolute(1e-10)).unwrap();
        assert!((r.x - 0.3).abs() <= 1e-10 + 1e-15 || r.f == 0.0, "{r:?}");
        assert!(r.iterations < 250, "{r:?}");
        // flat then steep: exp(20 x) − 1e6 on [−10, 10]
        let r = brent(|x| (20.0 * x).exp() - 1e6, -10.0, 10.0, Tolerance::absolute(1e-13)).unwrap();
        assert!((r.x - 1e6f64.ln() / 20.0).abs() < 1e-12, "{r:?}");
        // a step (discontinuous sign change): converges to the jump
        let r = brent(|x| if x < 0.123 { -1.0 } else { 1.0 }, 0.0, 1.0, Tolerance::absolute(1e-12)).unwrap();
        assert!((r.x - 0.123).abs() < 1e-12, "{r:?}");
        // steep near a bracket end, tiny values elsewhere
        let r = brent(|x| 1e-300 * (x - 0.999_999), 0.0, 1.0, Tolerance::absolute(1e-14)).unwrap();
        assert!((r.x - 0.999_999).abs() < 1e-13, "{r:?}");
        // an extremely narrow bracket around the root
        let r = brent(|x| x - 1.0, 1.0 - 1e-15, 1.0 + 1e-15, Tolerance::absolute(0.0)).unwrap();
        assert!((r.x - 1.0).abs() <= 4.0 * f64::EPSILON);
    }

    #[test]
    fn iteration_counts_against_the_old_finders() {
        // a smooth vapour-pressure-like balance: ln(p(T)/p) with p = exp(A − B/T) (bubble point of n-decane-like
        // constants at 1 atm); Brent needs fewer evaluations than Illinois and far fewer than bisection
        let f = |t: f64| (23.0 - 5200.0 / t) - 101_325f64.ln();
        let tol = 1e-9;
        let r = brent(f, 20.0, 900.0, Tolerance::absolute(tol)).unwrap();
        let (x_old, n_old) = illinois_evaluations(f, 20.0, 900.0, tol);
        assert!((r.x - x_old).abs() < 1e-8, "{} vs {}", r.x, x_old);
        let n_bisect = bisection_evaluations(20.0, 900.0, tol);
        assert!(r.iterations <= n_old, "Brent {} vs Illinois {}", r.iterations, n_old);
        assert!(r.iterations < n_bisect / 2, "Brent {} vs bisection {}", r.iterations, n_bisect);
        // a convex stiff balance where regula falsi stalls without the Illinois fix
        let g = |x: f64| x.powi(12) - 0.5;
        let r = brent(g, 0.0, 1.5, Tolerance::absolute(1e-13)).unwrap();
        let (_, n_old) = illinois_evaluations(g, 0.0, 1.5, 1e-13);
        assert!((r.x - 0.5f64.powf(1.0 / 12.0)).abs() < 1e-13);
        assert!(r.iterations <= n_old + 2, "Brent {} vs Illinois {}", r.iterations, n_old);
        assert!(r.iterations <= 60, "{r:?}");
    }
}
