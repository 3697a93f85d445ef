//! Gauss–Legendre quadrature on equal panels (Abramowitz & Stegun, Table 25.4).

/// Two-point Gauss–Legendre nodes and weights on \[−1, 1\] (exact for cubics).
pub const GAUSS2: [(f64, f64); 2] = [(-0.577_350_269_189_625_8, 1.0), (0.577_350_269_189_625_8, 1.0)];

/// Five-point Gauss–Legendre nodes and weights on \[−1, 1\] (exact for polynomials of degree 9).
pub const GAUSS5: [(f64, f64); 5] = [
    (0.0, 0.568_888_888_888_888_9),
    (-0.538_469_310_105_683, 0.478_628_670_499_366_5),
    (0.538_469_310_105_683, 0.478_628_670_499_366_5),
    (-0.906_179_845_938_664, 0.236_926_885_056_189),
    (0.906_179_845_938_664, 0.236_926_885_056_189),
];

/// ∫ f from `a` to `b` (either order; 0 when they are equal) with the Gauss–Legendre `rule` on equal panels no
/// wider than `max_panel`.
pub fn gauss_legendre(mut f: impl FnMut(f64) -> f64, a: f64, b: f64, max_panel: f64, rule: &[(f64, f64)]) -> f64 {
    if a == b {
        return 0.0;
    }
    let n = ((b - a).abs() / max_panel).ceil().max(1.0) as usize;
    let h = (b - a) / n as f64;
    let mut sum = 0.0;
    for k in 0..n {
        let mid = a + (k as f64 + 0.5) * h;
        sum += rule.iter().map(|(x, w)| w * f(mid + 0.5 * h * x)).sum::<f64>() * 0.5 * h;
    }
    sum
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rules_integrate_polynomials_exactly() {
        let cubic = |x: f64| 1.0 + x - 2.0 * x * x + 0.5 * x * x * x;
        let exact = |x: f64| x + x * x / 2.0 - 2.0 * x * x * x / 3.0 + x.powi(4) / 8.0;
        for rule in [&GAUSS2[..], &GAUSS5[..]] {
            let v = gauss_legendre(cubic, -1.0, 3.0, 10.0, rule);
            assert!((v - (exact(3.0) - exact(-1.0))).abs() < 1e-12, "{v}");
            assert_eq!(gauss_legendre(cubic, 2.0, 2.0, 1.0, rule), 0.0);
            assert!((gauss_legendre(cubic, 3.0, -1.0, 0.7, rule) + v).abs() < 1e-12);
        }
    }
}
