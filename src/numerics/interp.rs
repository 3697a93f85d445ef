//! Linear interpolation on sorted abscissae, with an explicit policy outside the data.

/// What [`linear`] does outside [x_first, x_last].
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Extrapolation {
    /// Continue the first or last segment's straight line.
    Linear,
    /// Hold the first or last value.
    Hold,
    /// No value outside the data (`None`).
    Refuse,
}

/// The straight line through (x0, y0) and (x1, y1) at `x`: y0 + (y1 − y0)(x − x0)/(x1 − x0).
#[inline]
pub fn lerp(x0: f64, y0: f64, x1: f64, y1: f64, x: f64) -> f64 {
    y0 + (y1 - y0) * (x - x0) / (x1 - x0)
}

/// Linear interpolation in the table of `(x, y)` points at `x`; the points are sorted by x, ascending
/// (repeated x allowed: the first point at `x`, or the first segment that reaches it, is used); at a
/// node the node's own value is returned exactly. `None` for an empty table, a NaN `x`,
/// or outside the data with [`Extrapolation::Refuse`]. One point: its value inside the "range" (x equal to
/// it) and, extrapolating, the held value.
pub fn linear(points: &[(f64, f64)], x: f64, outside: Extrapolation) -> Option<f64> {
    let n = points.len();
    if n == 0 || x.is_nan() {
        return None;
    }
    let (first, last) = (points[0], points[n - 1]);
    if x < first.0 || x > last.0 {
        return match outside {
            Extrapolation::Refuse => None,
            Extrapolation::Hold => Some(if x < first.0 { first.1 } else { last.1 }),
            Extrapolation::Linear if n == 1 => Some(first.1),
            Extrapolation::Linear => {
                let (a, b) = if x < first.0 { (points[0], points[1]) } else { (points[n - 2], points[n - 1]) };
                Some(if b.0 == a.0 { if x < first.0 { a.1 } else { b.1 } } else { lerp(a.0, a.1, b.0, b.1, x) })
            }
        };
    }
    // first point at or beyond x (exists: x ≤ last.0); a node's own value exactly, else its predecessor lies
    // strictly below x
    let i = points.partition_point(|p| p.0 < x);
    if points[i].0 == x {
        return Some(points[i].1);
    }
    let ((x0, y0), (x1, y1)) = (points[i - 1], points[i]);
    Some(lerp(x0, y0, x1, y1, x))
}

/// Whether the abscissae of `points` are finite and sorted ascending (ties allowed).
pub fn is_sorted(points: &[(f64, f64)]) -> bool {
    points.iter().all(|p| p.0.is_finite()) && points.windows(2).all(|w| w[0].0 <= w[1].0)
}

#[cfg(test)]
mod tests {
    use super::*;

    const T: [(f64, f64); 4] = [(0.0, 10.0), (1.0, 20.0), (3.0, 0.0), (4.0, 4.0)];

    #[test]
    fn interpolates_inside_and_hits_the_nodes() {
        for (x, y) in [(0.0, 10.0), (0.5, 15.0), (1.0, 20.0), (2.0, 10.0), (3.0, 0.0), (3.25, 1.0), (4.0, 4.0)] {
            for policy in [Extrapolation::Linear, Extrapolation::Hold, Extrapolation::Refuse] {
                assert!((linear(&T, x, policy).unwrap() - y).abs() < 1e-12, "{x} {policy:?}");
            }
        }
    }

    #[test]
    fn extrapolation_policies() {
        assert_eq!(linear(&T, -1.0, Extrapolation::Linear), Some(0.0));
        assert_eq!(linear(&T, 5.0, Extrapolation::Linear), Some(8.0));
        assert_eq!(linear(&T, -1.0, Extrapolation::Hold), Some(10.0));
        assert_eq!(linear(&T, 5.0, Extrapolation::Hold), Some(4.0));
        assert_eq!(linear(&T, -1.0, Extrapolation::Refuse), None);
        assert_eq!(linear(&T, 5.0, Extrapolation::Refuse), None);
        assert_eq!(linear(&T, f64::NAN, Extrapolation::Hold), None);
        assert_eq!(linear(&[], 1.0, Extrapolation::Hold), None);
        assert_eq!(linear(&[(1.0, 7.0)], 1.0, Extrapolation::Refuse), Some(7.0));
        assert_eq!(linear(&[(1.0, 7.0)], 2.0, Extrapolation::Linear), Some(7.0));
    }

    #[test]
    fn repeated_abscissae_use_the_first_segment_reaching_x() {
        let t = [(0.0, 0.0), (1.0, 1.0), (1.0, 5.0), (2.0, 6.0)];
        assert_eq!(linear(&t, 1.0, Extrapolation::Refuse), Some(1.0));
        assert_eq!(linear(&t, 1.5, Extrapolation::Refuse), Some(5.5));
        assert!(is_sorted(&t));
        assert!(!is_sorted(&[(1.0, 0.0), (0.0, 0.0)]));
    }
}
