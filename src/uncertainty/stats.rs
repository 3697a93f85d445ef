//! Sample statistics: percentiles (linear interpolation between order statistics), mean and standard
//! deviation, ranks with ties averaged, and Spearman's rank correlation. Missing values (`None`) are skipped;
//! nothing here returns NaN.

use crate::numerics::linalg;

use serde::Serialize;

/// The percentiles every band reports \[%\].
pub const PERCENTILES: [f64; 3] = [5.0, 50.0, 95.0];

/// Percentile `q` \[%\] of sorted finite values: linear interpolation between order statistics at position
/// (n − 1) q/100 (Hyndman & Fan 1996, definition 7); `None` for no values.
pub fn percentile_sorted(sorted: &[f64], q: f64) -> Option<f64> {
    match sorted.len() {
        0 => None,
        1 => Some(sorted[0]),
        n => {
            let h = (n - 1) as f64 * (q / 100.0).clamp(0.0, 1.0);
            let lo = h.floor() as usize;
            let hi = (lo + 1).min(n - 1);
            Some(sorted[lo] + (h - lo as f64) * (sorted[hi] - sorted[lo]))
        }
    }
}

/// The finite values of `values`, sorted.
pub fn sorted_finite(values: impl IntoIterator<Item = Option<f64>>) -> Vec<f64> {
    let mut v: Vec<f64> = values.into_iter().flatten().filter(|x| x.is_finite()).collect();
    // values equal under total_cmp have the same bits: an unstable sort gives the stable sort's result
    v.sort_unstable_by(f64::total_cmp);
    v
}

/// Summary of one sampled output.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Statistics {
    /// Samples with a value.
    pub n: usize,
    /// Mean.
    pub mean: Option<f64>,
    /// Sample standard deviation (n − 1).
    pub sd: Option<f64>,
    /// 5th percentile.
    pub p05: Option<f64>,
    /// Median.
    pub p50: Option<f64>,
    /// 95th percentile.
    pub p95: Option<f64>,
}

impl Statistics {
    /// Statistics of the finite values among `values`.
    pub fn of(values: impl IntoIterator<Item = Option<f64>>) -> Self {
        let v = sorted_finite(values);
        let n = v.len();
        let mean = if n > 0 { Some(v.iter().sum::<f64>() / n as f64) } else { None };
        let sd = match (mean, n) {
            (Some(m), n) if n > 1 => Some((v.iter().map(|x| (x - m) * (x - m)).sum::<f64>() / (n - 1) as f64).sqrt()),
            _ => None,
        };
        Statistics { n, mean, sd, p05: percentile_sorted(&v, PERCENTILES[0]), p50: percentile_sorted(&v, PERCENTILES[1]), p95: percentile_sorted(&v, PERCENTILES[2]) }
    }

    /// The 5–95 % interval, when both ends exist.
    pub fn band(&self) -> Option<(f64, f64)> {
        Some((self.p05?, self.p95?))
    }
}

/// Ranks 1..n of `values` (ties get the mean of their ranks).
pub fn ranks(values: &[f64]) -> Vec<f64> {
    let n = values.len();
    let mut idx: Vec<usize> = (0..n).collect();
    // a total order (ties broken by position): the unstable sort gives the one permutation a stable sort gives
    idx.sort_unstable_by(|&a, &b| values[a].total_cmp(&values[b]).then(a.cmp(&b)));
    let mut r = vec![0.0; n];
    let mut i = 0;
    while i < n {
        let mut j = i;
        while j + 1 < n && values[idx[j + 1]] == values[idx[i]] {
            j += 1;
        }
        let mean_rank = (i + j) as f64 / 2.0 + 1.0;
        for &k in &idx[i..=j] {
            r[k] = mean_rank;
        }
        i = j + 1;
    }
    r
}

/// Pearson correlation of two equally long series; `None` when either has no variance or fewer than 3 points.
pub fn pearson(a: &[f64], b: &[f64]) -> Option<f64> {
    let n = a.len().min(b.len());
    if n < 3 {
        return None;
    }
    let ma = a[..n].iter().sum::<f64>() / n as f64;
    let mb = b[..n].iter().sum::<f64>() / n as f64;
    let (mut sab, mut saa, mut sbb) = (0.0, 0.0, 0.0);
    for i in 0..n {
        let (da, db) = (a[i] - ma, b[i] - mb);
        sab += da * db;
        saa += da * da;
        sbb += db * db;
    }
    if saa <= 0.0 || sbb <= 0.0 {
        return None;
    }
    let r = sab / (saa * sbb).sqrt();
    r.is_finite().then_some(r.clamp(-1.0, 1.0))
}

/// Spearman's rank correlation of the pairs where both values exist and are finite.
pub fn spearman(x: &[Option<f64>], y: &[Option<f64>]) -> Option<f64> {
    let (a, b): (Vec<f64>, Vec<f64>) = x.iter().zip(y).filter_map(|(a, b)| match (a, b) {
        (Some(a), Some(b)) if a.is_finite() && b.is_finite() => Some((*a, *b)),
        _ => None,
    }).unzip();
    pearson(&ranks(&a), &ranks(&b))
}

/// The samples a rank regression of an output on the columns `x` uses: those where the output `y` and every
/// column have a finite value.
pub fn regression_samples(x: &[Vec<f64>], y: &[Option<f64>]) -> Vec<usize> {
    (0..y.len()).filter(|&i| y[i].is_some_and(f64::is_finite) && x.iter().all(|c| c.get(i).is_some_and(|v| v.is_finite()))).collect()
}

/// What a rank regression on the columns `x` over the samples `keep` needs whatever the output: the centred
/// ranks of each column and the Cholesky factor of their Gram matrix (none when a column has no variance or
/// the columns are collinear). Outputs with the same samples share it.
#[derive(Debug, Clone)]
pub struct RankDesign {
    /// Samples used (positions in the sample list).
    pub keep: Vec<usize>,
    m: usize,
    /// Centred ranks of each column over `keep`.
    cols: Vec<Vec<f64>>,
    /// Lower Cholesky factor of XᵀX; None: singular.
    l: Option<linalg::Factor>,
}

/// Ranks of `v` less their mean (n + 1)/2.
fn centred_ranks(v: &[f64]) -> Vec<f64> {
    let mean = (v.len() as f64 + 1.0) / 2.0;
    ranks(v).into_iter().map(|q| q - mean).collect()
}

/// The rank-regression design of columns `x` over samples `keep` (None when there are no columns or too few
/// samples: fewer than columns + 3).
pub fn rank_design(x: &[Vec<f64>], keep: Vec<usize>) -> Option<RankDesign> {
    let m = x.len();
    let n = keep.len();
    if m == 0 || n < m + 3 {
        return None;
    }
    let cols: Vec<Vec<f64>> = x.iter().map(|c| centred_ranks(&keep.iter().map(|&i| c[i]).collect::<Vec<f64>>())).collect();
    // normal equations (XᵀX) b = Xᵀy, XᵀX = L Lᵀ by Cholesky (nalgebra); a pivot at or below 1e-12 of its
    // diagonal entry means a column with no variance, or collinear columns
    let mut a = vec![0.0; m * m];
    for j in 0..m {
        for k in 0..=j {
            a[j * m + k] = cols[j].iter().zip(&cols[k]).map(|(p, q)| p * q).sum();
        }
    }
    let l = linalg::cholesky(&a, m, 1e-12);
    Some(RankDesign { keep, m, cols, l })
}

/// Adjusted R² of the rank regression of `y` on a design's columns; `y` must have a finite value at every
/// sample of `design.keep`.
pub fn rank_r2_with(design: &RankDesign, y: &[Option<f64>]) -> Option<f64> {
    let (m, n) = (design.m, design.keep.len());
    let ry = centred_ranks(&design.keep.iter().map(|&i| y[i].unwrap_or(0.0)).collect::<Vec<f64>>());
    let syy: f64 = ry.iter().map(|v| v * v).sum();
    if syy <= 0.0 {
        return None;
    }
    let b: Vec<f64> = design.cols.iter().map(|c| c.iter().zip(&ry).map(|(p, q)| p * q).sum()).collect();
    let l = design.l.as_ref()?;
    // solve L w = Xᵀy; then R² = |w|² / yᵀy (since bᵀXᵀy = wᵀw)
    let w = linalg::solve_lower(l, &b)?;
    let r2 = (w.iter().map(|v| v * v).sum::<f64>() / syy).clamp(0.0, 1.0);
    let adjusted = 1.0 - (1.0 - r2) * (n - 1) as f64 / (n - m - 1) as f64;
    adjusted.is_finite().then_some(adjusted.clamp(0.0, 1.0))
}

/// Adjusted coefficient of determination of a least-squares fit of the ranks of `y` on the ranks of the
/// columns of `x` (standardised rank regression): the share of the output's rank variance the inputs explain
/// together, corrected for the fit's degrees of freedom, 1 − (1 − R²)(n − 1)/(n − m − 1), held in \[0, 1\].
/// For one column it is the adjusted square of Spearman's coefficient. Pairs with a missing or non-finite
/// value anywhere are skipped; `None` when fewer than m + 3 remain or the columns are degenerate.
pub fn rank_r2(x: &[Vec<f64>], y: &[Option<f64>]) -> Option<f64> {
    let design = rank_design(x, regression_samples(x, y))?;
    rank_r2_with(&design, y)
}

/// Whether an input stands out from sampling noise: for one factor, |Spearman| > 1.96/√(n − 1) (a rough two-sided
/// 5 % test for independent samples); for a group of m factors, adjusted rank R² > 2√(2m)/(n − m − 1) (about two
/// standard deviations of the adjusted R² of m unrelated inputs). `None` when n is too small.
pub fn above_noise(factors: usize, samples: usize, spearman: Option<f64>, r2: Option<f64>) -> Option<bool> {
    let (m, n) = (factors as f64, samples as f64);
    if factors == 1 {
        (samples > 2).then_some(spearman?.abs() > 1.96 / (n - 1.0).sqrt())
    } else {
        (samples > factors + 2).then_some(r2? > 2.0 * (2.0 * m).sqrt() / (n - m - 1.0))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn percentiles_interpolate() {
        let v = [1.0, 2.0, 3.0, 4.0, 5.0];
        assert_eq!(percentile_sorted(&v, 50.0), Some(3.0));
        assert_eq!(percentile_sorted(&v, 0.0), Some(1.0));
        assert_eq!(percentile_sorted(&v, 100.0), Some(5.0));
        assert!((percentile_sorted(&v, 5.0).unwrap() - 1.2).abs() < 1e-12);
        assert_eq!(percentile_sorted(&[], 50.0), None);
        let s = Statistics::of([Some(1.0), None, Some(3.0), Some(f64::NAN)]);
        assert_eq!(s.n, 2);
        assert_eq!(s.mean, Some(2.0));
        assert!((s.sd.unwrap() - 2f64.sqrt()).abs() < 1e-12);
    }

    #[test]
    fn ranks_average_ties() {
        assert_eq!(ranks(&[10.0, 20.0, 10.0, 5.0]), vec![2.5, 4.0, 2.5, 1.0]);
    }

    #[test]
    fn spearman_sees_monotone_relations() {
        let x: Vec<Option<f64>> = (0..50).map(|i| Some(i as f64)).collect();
        let y: Vec<Option<f64>> = (0..50).map(|i| Some((i as f64).powi(3))).collect();
        assert!((spearman(&x, &y).unwrap() - 1.0).abs() < 1e-12);
        let yr: Vec<Option<f64>> = y.iter().rev().cloned().collect();
        assert!((spearman(&x, &yr).unwrap() + 1.0).abs() < 1e-12);
        let flat = vec![Some(1.0); 50];
        assert_eq!(spearman(&x, &flat), None);
    }

    #[test]
    fn noise_thresholds() {
        // one factor: 1.96/sqrt(99) = 0.197
        assert_eq!(above_noise(1, 100, Some(0.25), None), Some(true));
        assert_eq!(above_noise(1, 100, Some(-0.15), None), Some(false));
        // ten factors: 2 sqrt(20)/89 = 0.1005
        assert_eq!(above_noise(10, 100, None, Some(0.12)), Some(true));
        assert_eq!(above_noise(10, 100, None, Some(0.08)), Some(false));
        assert_eq!(above_noise(10, 11, None, Some(0.9)), None);
        assert_eq!(above_noise(1, 100, None, None), None);
    }

    #[test]
    fn rank_regression_explains_sums_and_matches_spearman() {
        // y = a + b: each alone explains about half, both together everything
        let n = 400;
        let a: Vec<f64> = (0..n).map(|i| ((i * 7919) % n) as f64).collect();
        let b: Vec<f64> = (0..n).map(|i| ((i * 104_729 + 13) % n) as f64).collect();
        let y: Vec<Option<f64>> = (0..n).map(|i| Some(a[i] + b[i])).collect();
        let both = rank_r2(&[a.clone(), b.clone()], &y).unwrap();
        assert!(both > 0.97, "{both}");
        let one = rank_r2(std::slice::from_ref(&a), &y).unwrap();
        assert!((0.35..0.65).contains(&one), "{one}");
        // one column: adjusted square of Spearman
        let rho = spearman(&a.iter().map(|v| Some(*v)).collect::<Vec<_>>(), &y).unwrap();
        let adj = 1.0 - (1.0 - rho * rho) * (n - 1) as f64 / (n - 2) as f64;
        assert!((one - adj).abs() < 1e-9, "{one} {adj}");
        // opposite effects that cancel in a mean are still seen as a group
        let y2: Vec<Option<f64>> = (0..n).map(|i| Some(a[i] - b[i])).collect();
        let mean: Vec<f64> = (0..n).map(|i| 0.5 * (a[i] + b[i])).collect();
        assert!(rank_r2(&[mean], &y2).unwrap() < 0.05);
        assert!(rank_r2(&[a, b], &y2).unwrap() > 0.97);
    }

    /// The hand-written Cholesky solve this module used before nalgebra: |w|² for L w = Xᵀy, XᵀX = L Lᵀ.
    fn old_explained(cols: &[Vec<f64>], ry: &[f64]) -> Option<f64> {
        let m = cols.len();
        let mut a = vec![vec![0.0; m]; m];
        let mut b = vec![0.0; m];
        for j in 0..m {
            b[j] = cols[j].iter().zip(ry).map(|(p, q)| p * q).sum();
            for k in 0..=j {
                let v: f64 = cols[j].iter().zip(&cols[k]).map(|(p, q)| p * q).sum();
                a[j][k] = v;
                a[k][j] = v;
            }
        }
        let mut l = vec![vec![0.0; m]; m];
        for j in 0..m {
            let d = a[j][j] - l[j][..j].iter().map(|v| v * v).sum::<f64>();
            if d <= 1e-12 * a[j][j].max(1e-300) {
                return None;
            }
            let d = d.sqrt();
            l[j][j] = d;
            for i in j + 1..m {
                let v = a[i][j] - l[i][..j].iter().zip(&l[j][..j]).map(|(p, q)| p * q).sum::<f64>();
                l[i][j] = v / d;
            }
        }
        let mut w = vec![0.0; m];
        for i in 0..m {
            let mut v = b[i];
            for k in 0..i {
                v -= l[i][k] * w[k];
            }
            w[i] = v / l[i][i];
        }
        Some(w.iter().map(|v| v * v).sum())
    }

    #[test]
    fn rank_regression_through_nalgebra_matches_the_old_cholesky() {
        let n = 300;
        let centred = |v: Vec<f64>| -> Vec<f64> { ranks(&v).into_iter().map(|q| q - (n as f64 + 1.0) / 2.0).collect() };
        let cols: Vec<Vec<f64>> = (0..4).map(|k| (0..n).map(|i| ((i * (7919 + 104 * k) + 31 * k) % n) as f64 + 0.1 * (i as f64 * (k as f64 + 1.0)).sin()).collect()).collect();
        let y: Vec<Option<f64>> = (0..n).map(|i| Some(cols[0][i] + 0.5 * cols[1][i] - 0.2 * cols[3][i] + ((i * 37) % 11) as f64)).collect();
        let ry = centred(y.iter().map(|v| v.unwrap()).collect());
        let syy: f64 = ry.iter().map(|v| v * v).sum();
        for m in 1..=4 {
            let rc: Vec<Vec<f64>> = cols[..m].iter().map(|c| centred(c.clone())).collect();
            let r2_old = (old_explained(&rc, &ry).unwrap() / syy).clamp(0.0, 1.0);
            let adjusted_old = (1.0 - (1.0 - r2_old) * (n - 1) as f64 / (n - m - 1) as f64).clamp(0.0, 1.0);
            let new = rank_r2(&cols[..m], &y).unwrap();
            assert!((new - adjusted_old).abs() < 1e-12, "m = {m}: {new} vs {adjusted_old}");
        }
        // collinear columns: both refuse
        let twin = vec![cols[0].clone(), cols[0].clone()];
        assert!(rank_r2(&twin, &y).is_none());
        assert!(old_explained(&[centred(cols[0].clone()), centred(cols[0].clone())], &ry).is_none());
    }
}
