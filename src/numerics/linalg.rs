//! Dense linear algebra: a fixed-order dot product, and through `nalgebra` linear least squares (Householder QR
//! with column equilibration), symmetric positive-definite systems (Cholesky) and square systems (LU with partial
//! pivoting).

use nalgebra::{DMatrix, DVector};

/// Σ_j w_j v_j over the shorter length, in four partial sums (independent chains the processor runs side by side)
/// added pairwise: a fixed summation order, so the same inputs give the same bits everywhere.
#[inline]
pub fn dot(w: &[f64], v: &[f64]) -> f64 {
    let mut acc = [0.0; 4];
    let len = w.len().min(v.len());
    let (w_wide, w_rest) = w[..len].split_at(len / 4 * 4);
    let (v_wide, v_rest) = v[..len].split_at(len / 4 * 4);
    for (w4, v4) in w_wide.chunks_exact(4).zip(v_wide.chunks_exact(4)) {
        acc[0] += w4[0] * v4[0];
        acc[1] += w4[1] * v4[1];
        acc[2] += w4[2] * v4[2];
        acc[3] += w4[3] * v4[3];
    }
    for (w, v) in w_rest.iter().zip(v_rest) {
        acc[0] += w * v;
    }
    (acc[0] + acc[1]) + (acc[2] + acc[3])
}

/// A lower Cholesky factor ([`cholesky`]), for [`solve_lower`].
pub type Factor = DMatrix<f64>;

/// Solve the linear least-squares problem min ‖A c − b‖ for the rows `rows` of A and right-hand side `rhs`,
/// by Householder QR of A with its columns scaled to unit norm (equilibration). `None` when there are fewer
/// rows than unknowns, a non-finite entry, or A is rank-deficient (a diagonal entry of R below 1e-12 of
/// the largest).
pub fn least_squares(rows: &[Vec<f64>], rhs: &[f64]) -> Option<Vec<f64>> {
    let n = rows.len();
    let m = rows.first()?.len();
    if m == 0 || n < m || rhs.len() != n || rows.iter().any(|r| r.len() != m) {
        return None;
    }
    if rows.iter().flatten().chain(rhs).any(|v| !v.is_finite()) {
        return None;
    }
    let mut a = DMatrix::from_fn(n, m, |i, j| rows[i][j]);
    let mut scale = vec![0.0; m];
    for (j, s) in scale.iter_mut().enumerate() {
        let norm = a.column(j).norm();
        if norm == 0.0 {
            return None;
        }
        *s = norm;
        a.column_mut(j).unscale_mut(norm);
    }
    let qr = a.qr();
    let r = qr.r();
    let largest = r.diagonal().iter().fold(0.0f64, |acc, v| acc.max(v.abs()));
    if r.diagonal().iter().any(|v| v.abs() <= 1e-12 * largest) {
        return None;
    }
    let mut qtb = DVector::from_column_slice(rhs);
    qr.q_tr_mul(&mut qtb);
    let y = r.solve_upper_triangular(&qtb.rows(0, m).into_owned())?;
    let c: Vec<f64> = y.iter().zip(&scale).map(|(v, s)| v / s).collect();
    c.iter().all(|v| v.is_finite()).then_some(c)
}

/// Cholesky factor L (lower, A = L Lᵀ) of the symmetric matrix `a` (`m` × `m`, row-major; only the lower
/// triangle is read), or `None` when a pivot is not above `rel_pivot` times the matching diagonal entry of A
/// (not positive definite, or numerically singular: a column without variance or collinear columns).
pub fn cholesky(a: &[f64], m: usize, rel_pivot: f64) -> Option<DMatrix<f64>> {
    if m == 0 || a.len() != m * m || a.iter().any(|v| !v.is_finite()) {
        return None;
    }
    let full = DMatrix::from_fn(m, m, |i, j| if i >= j { a[i * m + j] } else { a[j * m + i] });
    let l = full.clone().cholesky()?.unpack();
    for j in 0..m {
        if l[(j, j)] * l[(j, j)] <= rel_pivot * full[(j, j)].max(1e-300) {
            return None;
        }
    }
    Some(l)
}

/// Solve L w = b for a lower-triangular `l` (forward substitution); `None` on a zero pivot.
pub fn solve_lower(l: &DMatrix<f64>, b: &[f64]) -> Option<Vec<f64>> {
    let w = l.solve_lower_triangular(&DVector::from_column_slice(b))?;
    Some(w.iter().copied().collect())
}

/// Solve the square system A x = b (`a` row-major, `m` × `m`) by LU with partial pivoting; `None` when A is
/// singular or the solution is not finite.
pub fn solve(a: &[f64], b: &[f64], m: usize) -> Option<Vec<f64>> {
    if m == 0 || a.len() != m * m || b.len() != m {
        return None;
    }
    let x = DMatrix::from_row_slice(m, m, a).lu().solve(&DVector::from_column_slice(b))?;
    x.iter().all(|v| v.is_finite()).then(|| x.iter().copied().collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The four-chain dot product: exact on integers for every length 0–11 (whole groups of four and the rest),
    /// stops at the shorter slice, and adds its chains pairwise ((c0 + c1) + (c2 + c3)).
    #[test]
    fn dot_in_four_chains() {
        for n in 0..12 {
            let w: Vec<f64> = (0..n).map(|j| (j + 1) as f64).collect();
            let v: Vec<f64> = (0..n).map(|j| (2 * j) as f64 - 3.0).collect();
            let want: f64 = w.iter().zip(&v).map(|(a, b)| a * b).sum();
            assert_eq!(dot(&w, &v), want, "length {n}");
            assert_eq!(dot(&w, &v[..n / 2]), w.iter().zip(&v[..n / 2]).map(|(a, b)| a * b).sum::<f64>());
        }
        // chains: 1e16 in chain 0 and 1.0 in chain 1 are added before the chain-2 and chain-3 terms
        let (w, v) = ([1.0; 4], [1e16, 1.0, 1.0, -1e16]);
        assert_eq!(dot(&w, &v), (1e16 + 1.0) + (1.0 - 1e16));
    }

    #[test]
    fn least_squares_reproduces_an_exact_polynomial_and_a_hand_fit() {
        // y = 1 − 2x + 3x² sampled exactly: the fit recovers the coefficients
        let xs: Vec<f64> = (0..9).map(|i| i as f64 * 0.25).collect();
        let rows: Vec<Vec<f64>> = xs.iter().map(|x| vec![1.0, *x, x * x]).collect();
        let rhs: Vec<f64> = xs.iter().map(|x| 1.0 - 2.0 * x + 3.0 * x * x).collect();
        let c = least_squares(&rows, &rhs).unwrap();
        for (got, want) in c.iter().zip([1.0, -2.0, 3.0]) {
            assert!((got - want).abs() < 1e-12, "{c:?}");
        }
        // a line through (0,0), (1,1), (2,3): slope 1.5, intercept −1/6 (hand-solved normal equations)
        let c = least_squares(&[vec![1.0, 0.0], vec![1.0, 1.0], vec![1.0, 2.0]], &[0.0, 1.0, 3.0]).unwrap();
        assert!((c[0] + 1.0 / 6.0).abs() < 1e-14 && (c[1] - 1.5).abs() < 1e-14, "{c:?}");
    }

    #[test]
    fn least_squares_refuses_degenerate_problems() {
        assert!(least_squares(&[vec![1.0, 2.0], vec![2.0, 4.0]], &[1.0, 2.0]).is_none(), "rank-deficient");
        assert!(least_squares(&[vec![1.0, 2.0]], &[1.0]).is_none(), "fewer rows than unknowns");
        assert!(least_squares(&[vec![1.0, 0.0], vec![1.0, 0.0]], &[1.0, 2.0]).is_none(), "a zero column");
        assert!(least_squares(&[vec![1.0], vec![f64::NAN]], &[1.0, 2.0]).is_none());
        assert!(least_squares(&[], &[]).is_none());
    }

    #[test]
    fn cholesky_and_triangular_solve() {
        // A = [[4, 2], [2, 3]] = L Lᵀ with L = [[2, 0], [1, √2]]
        let l = cholesky(&[4.0, 0.0, 2.0, 3.0], 2, 1e-12).unwrap();
        assert!((l[(0, 0)] - 2.0).abs() < 1e-15 && (l[(1, 0)] - 1.0).abs() < 1e-15 && (l[(1, 1)] - 2f64.sqrt()).abs() < 1e-15);
        let w = solve_lower(&l, &[2.0, 1.0 + 2f64.sqrt()]).unwrap();
        assert!((w[0] - 1.0).abs() < 1e-15 && (w[1] - 1.0).abs() < 1e-15, "{w:?}");
        assert!(cholesky(&[1.0, 1.0, 1.0, 1.0], 2, 1e-12).is_none(), "singular");
        assert!(cholesky(&[1.0, 0.0, 0.0, -1.0], 2, 1e-12).is_none(), "indefinite");
    }

    #[test]
    fn lu_solves_square_systems() {
        let x = solve(&[0.0, 2.0, 1.0, 1.0], &[4.0, 3.0], 2).unwrap(); // needs a row swap
        assert!((x[0] - 1.0).abs() < 1e-15 && (x[1] - 2.0).abs() < 1e-15, "{x:?}");
        assert!(solve(&[1.0, 2.0, 2.0, 4.0], &[1.0, 2.0], 2).is_none());
    }
}
