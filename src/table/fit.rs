//! Least-squares polynomial fits of tabulated properties, in a scaled variable for conditioning.
//!
//! A fit is `y = P(s)` (form `linear`) or `y = exp(P(s))` (form `log`), with `P(s) = Σ c_k s^k`, degree at most
//! [`MAX_DEGREE`], and the scaled variable `s = (x − center) / half_width` in \[−1, 1\] over the fitted range, where
//! `x` is the temperature T (variable `T`) or its reciprocal 1/T (variable `1/T`, for vapour pressure and
//! viscosity, whose logarithms are nearly linear in 1/T). The degree is the lowest that reproduces every table
//! point within [`TARGET_RELATIVE_ERROR`], or [`MAX_DEGREE`]; the maximum relative error on the table points is
//! measured and reported with the coefficients.
//!
//! Where one polynomial cannot meet [`MAX_FIT_ERROR`] (1 %) over a table's range, [`fit_piecewise`] splits the
//! rows in two halves sharing their middle row and fits each, recursively, down to [`MIN_PIECE_POINTS`] rows a
//! piece; every piece is reported with its range, coefficients and measured error, and a piece still above
//! 1 % is flagged ([`PolyFit::flag`]).

use serde::Serialize;

/// Highest polynomial degree of a property fit.
pub const MAX_DEGREE: usize = 4;

/// Relative error on the table points at which a lower degree is accepted \[-\].
pub const TARGET_RELATIVE_ERROR: f64 = 1e-4;

/// Largest maximum relative error of an unflagged fit piece \[-\].
pub const MAX_FIT_ERROR: f64 = 0.01;

/// Fewest table rows in one piece of a piecewise fit.
pub const MIN_PIECE_POINTS: usize = 6;

/// Whether the polynomial gives the property or its natural logarithm.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FitForm {
    /// y = P(s).
    Linear,
    /// ln y = P(s).
    Log,
}

impl FitForm {
    /// Name as written in fits.csv.
    pub fn as_str(self) -> &'static str {
        match self {
            FitForm::Linear => "linear",
            FitForm::Log => "log",
        }
    }
}

/// The independent variable before scaling.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum FitVariable {
    /// Temperature T \[K\].
    #[serde(rename = "T")]
    Temperature,
    /// Reciprocal temperature 1/T \[1/K\].
    #[serde(rename = "1/T")]
    Reciprocal,
}

impl FitVariable {
    /// Name as written in fits.csv.
    pub fn as_str(self) -> &'static str {
        match self {
            FitVariable::Temperature => "T",
            FitVariable::Reciprocal => "1/T",
        }
    }

    /// The unscaled variable x at temperature `t` \[K or 1/K\].
    #[inline]
    pub fn of(self, t: f64) -> f64 {
        match self {
            FitVariable::Temperature => t,
            FitVariable::Reciprocal => 1.0 / t,
        }
    }
}

/// One fitted property: coefficients, scaling, validity range and the measured error.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PolyFit {
    /// Column name of the fitted property (e.g. `density_kg_m3`).
    pub property: String,
    /// Linear or logarithmic form.
    pub form: FitForm,
    /// Unscaled variable (T or 1/T).
    pub variable: FitVariable,
    /// Centre of the scaled variable \[K or 1/K\].
    pub center: f64,
    /// Half-width of the scaled variable \[K or 1/K\].
    pub half_width: f64,
    /// Coefficients c0..c_degree of P(s).
    pub coefficients: Vec<f64>,
    /// Lowest table temperature fitted \[K\].
    pub t_min: f64,
    /// Highest table temperature fitted \[K\].
    pub t_max: f64,
    /// Number of table points fitted.
    pub points: usize,
    /// Largest |fit/table − 1| over the table points \[-\].
    pub max_relative_error: f64,
    /// Index of this piece, 1-based, in ascending temperature.
    pub piece: usize,
    /// Number of pieces of the property's fit.
    pub pieces: usize,
}

impl PolyFit {
    /// `ok` when the piece meets [`MAX_FIT_ERROR`], else `max-error-above-1-percent`.
    pub fn flag(&self) -> &'static str {
        if self.max_relative_error <= MAX_FIT_ERROR {
            "ok"
        } else {
            "max-error-above-1-percent"
        }
    }

    /// Degree of the polynomial.
    pub fn degree(&self) -> usize {
        self.coefficients.len().saturating_sub(1)
    }

    /// Scaled variable s at temperature `t` \[K\].
    #[inline]
    pub fn scaled(&self, t: f64) -> f64 {
        (self.variable.of(t) - self.center) / self.half_width
    }

    /// Fitted value at `t` \[K\], in the unit of the property.
    pub fn eval(&self, t: f64) -> f64 {
        let s = self.scaled(t);
        let p = self.coefficients.iter().rev().fold(0.0, |acc, c| acc * s + c);
        match self.form {
            FitForm::Linear => p,
            FitForm::Log => p.exp(),
        }
    }

    /// The polynomial expanded in powers of T, `y = Σ a_j T^j` (j = 0..4), for a linear fit in T; None otherwise.
    /// Used to hand fitted curves to the DIPPR-100 form of a component file.
    pub fn raw_polynomial(&self) -> Option<[f64; 5]> {
        if self.form != FitForm::Linear || self.variable != FitVariable::Temperature {
            return None;
        }
        let mut a = [0.0; 5];
        let (m, h) = (self.center, self.half_width);
        for (k, c) in self.coefficients.iter().enumerate() {
            // ((T − m)/h)^k = h^−k Σ_j C(k, j) T^j (−m)^(k−j)
            let scale = c / h.powi(k as i32);
            for (j, aj) in a.iter_mut().enumerate().take(k + 1) {
                *aj += scale * binomial(k, j) * (-m).powi((k - j) as i32);
            }
        }
        Some(a)
    }
}

fn binomial(n: usize, k: usize) -> f64 {
    (0..k).fold(1.0, |acc, i| acc * (n - i) as f64 / (i + 1) as f64)
}

/// Linear least squares (the one implementation, in `numerics`), re-exported for the fits.
pub use crate::numerics::linalg::least_squares;

/// Fit `values` at `temperatures` with the given form and variable; the lowest degree (0..=4, and below the
/// number of points) that meets [`TARGET_RELATIVE_ERROR`], else the highest. Linear forms are fitted with
/// weights 1/|y| (relative least squares); log forms are unweighted in ln y. None when there is no point, a
/// value is not finite, or a log fit meets a value ≤ 0.
pub fn fit_property(property: &str, temperatures: &[f64], values: &[f64], form: FitForm, variable: FitVariable) -> Option<PolyFit> {
    let n = temperatures.len();
    if n == 0 || n != values.len() || temperatures.iter().chain(values).any(|v| !v.is_finite()) || temperatures.iter().any(|t| *t <= 0.0) {
        return None;
    }
    if form == FitForm::Log && values.iter().any(|v| *v <= 0.0) {
        return None;
    }
    let xs: Vec<f64> = temperatures.iter().map(|t| variable.of(*t)).collect();
    let (lo, hi) = xs.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| (a.min(*x), b.max(*x)));
    let center = 0.5 * (lo + hi);
    let half_width = if hi > lo { 0.5 * (hi - lo) } else { 1.0 };
    let ys: Vec<f64> = match form {
        FitForm::Linear => values.to_vec(),
        FitForm::Log => values.iter().map(|v| v.ln()).collect(),
    };
    let t_min = temperatures.iter().copied().fold(f64::INFINITY, f64::min);
    let t_max = temperatures.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    // Linear forms are weighted by 1/|y| so that the least-squares error is relative, like the reported one.
    let weights: Vec<f64> = match form {
        FitForm::Linear if values.iter().all(|v| *v != 0.0) => values.iter().map(|v| 1.0 / v.abs()).collect(),
        _ => vec![1.0; n],
    };
    let rhs: Vec<f64> = ys.iter().zip(&weights).map(|(y, w)| y * w).collect();
    let mut best: Option<PolyFit> = None;
    for degree in 0..=MAX_DEGREE.min(n - 1) {
        let rows: Vec<Vec<f64>> =
            xs.iter().zip(&weights).map(|(x, w)| (0..=degree).map(|k| w * ((x - center) / half_width).powi(k as i32)).collect()).collect();
        let Some(coefficients) = least_squares(&rows, &rhs) else { continue };
        let mut fit = PolyFit {
            property: property.to_string(),
            form,
            variable,
            center,
            half_width,
            coefficients,
            t_min,
            t_max,
            points: n,
            max_relative_error: 0.0,
            piece: 1,
            pieces: 1,
        };
        fit.max_relative_error = temperatures.iter().zip(values).map(|(t, v)| relative_error(fit.eval(*t), *v)).fold(0.0, f64::max);
        let done = fit.max_relative_error <= TARGET_RELATIVE_ERROR;
        best = Some(fit);
        if done {
            break;
        }
    }
    best.filter(|f| f.max_relative_error.is_finite())
}

/// [`fit_property`] over the whole range, split into pieces where one polynomial misses [`MAX_FIT_ERROR`]:
/// the rows (ascending temperatures) are halved at their middle row, which both halves share, and each half is
/// fitted the same way, as long as every piece keeps at least [`MIN_PIECE_POINTS`] rows. Pieces in ascending
/// temperature, numbered; empty when the rows cannot be fitted at all.
pub fn fit_piecewise(property: &str, temperatures: &[f64], values: &[f64], form: FitForm, variable: FitVariable) -> Vec<PolyFit> {
    let mut pieces = vec![];
    split_fit(property, temperatures, values, form, variable, &mut pieces);
    let n = pieces.len();
    for (k, p) in pieces.iter_mut().enumerate() {
        p.piece = k + 1;
        p.pieces = n;
    }
    pieces
}

fn split_fit(property: &str, ts: &[f64], ys: &[f64], form: FitForm, variable: FitVariable, out: &mut Vec<PolyFit>) {
    let Some(whole) = fit_property(property, ts, ys, form, variable) else { return };
    let n = ts.len();
    if whole.max_relative_error <= MAX_FIT_ERROR || n < 2 * MIN_PIECE_POINTS - 1 {
        out.push(whole);
        return;
    }
    let mid = n / 2;
    let mut left = vec![];
    let mut right = vec![];
    split_fit(property, &ts[..=mid], &ys[..=mid], form, variable, &mut left);
    split_fit(property, &ts[mid..], &ys[mid..], form, variable, &mut right);
    if left.is_empty() || right.is_empty() {
        out.push(whole);
    } else {
        out.extend(left);
        out.extend(right);
    }
}

/// |a/b − 1|, with 0 for a = b = 0 and +∞ when b = 0 ≠ a.
#[inline]
pub fn relative_error(a: f64, b: f64) -> f64 {
    if a == b {
        0.0
    } else if b == 0.0 {
        f64::INFINITY
    } else {
        (a / b - 1.0).abs()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_polynomial_is_recovered_with_its_degree() {
        let ts: Vec<f64> = (0..30).map(|i| 250.0 + 10.0 * f64::from(i)).collect();
        let ys: Vec<f64> = ts.iter().map(|t| 900.0 - 0.7 * t + 1e-4 * t * t).collect();
        let f = fit_property("density_kg_m3", &ts, &ys, FitForm::Linear, FitVariable::Temperature).unwrap();
        assert_eq!(f.degree(), 2);
        assert!(f.max_relative_error < 1e-12, "{}", f.max_relative_error);
        let raw = f.raw_polynomial().unwrap();
        assert!((raw[0] - 900.0).abs() < 1e-8 && (raw[1] + 0.7).abs() < 1e-10 && (raw[2] - 1e-4).abs() < 1e-13, "{raw:?}");
        assert!(raw[3].abs() < 1e-15 && raw[4].abs() < 1e-18);
    }

    #[test]
    fn clausius_clapeyron_is_linear_in_reciprocal_temperature() {
        let ts: Vec<f64> = (0..40).map(|i| 260.0 + 6.0 * f64::from(i)).collect();
        let ys: Vec<f64> = ts.iter().map(|t| (23.0 - 5200.0 / t).exp()).collect();
        let f = fit_property("vapor_pressure_Pa", &ts, &ys, FitForm::Log, FitVariable::Reciprocal).unwrap();
        assert_eq!(f.degree(), 1);
        for t in &ts {
            assert!(relative_error(f.eval(*t), (23.0 - 5200.0 / t).exp()) <= f.max_relative_error * (1.0 + 1e-9) + 1e-15);
        }
    }

    /// A latent heat vanishing at a critical temperature inside the range, L = 3e5 (1 − T/600)^0.38 clamped at zero
    /// above 600 K (the Watson shape of a component passing its Tc), cannot be met by one quartic: the pieces meet
    /// 1 % except the one that ends at the cusp, which is flagged.
    #[test]
    fn piecewise_fit_splits_where_one_polynomial_fails() {
        let ts: Vec<f64> = (0..120).map(|i| 250.0 + 3.0 * f64::from(i)).collect();
        let ys: Vec<f64> = ts.iter().map(|t| 2e5 + 3e5 * (1.0 - t / 600.0).max(0.0).powf(0.38)).collect();
        let one = fit_property("latent_heat_J_kg", &ts, &ys, FitForm::Linear, FitVariable::Temperature).unwrap();
        let pieces = fit_piecewise("latent_heat_J_kg", &ts, &ys, FitForm::Linear, FitVariable::Temperature);
        assert!(pieces.len() > 1, "{}", one.max_relative_error);
        for (k, p) in pieces.iter().enumerate() {
            assert_eq!((p.piece, p.pieces), (k + 1, pieces.len()));
            assert!(p.points >= MIN_PIECE_POINTS);
            for (t, y) in ts.iter().zip(&ys).filter(|(t, _)| **t >= p.t_min && **t <= p.t_max) {
                assert!(relative_error(p.eval(*t), *y) <= p.max_relative_error * (1.0 + 1e-9) + 1e-15);
            }
            assert_eq!(p.flag() == "ok", p.max_relative_error <= MAX_FIT_ERROR);
            if k > 0 {
                assert_eq!(p.t_min, pieces[k - 1].t_max, "pieces share their boundary row");
            }
        }
        assert_eq!((pieces[0].t_min, pieces.last().unwrap().t_max), (250.0, ts[119]));
        let worst = pieces.iter().map(|p| p.max_relative_error).fold(0.0, f64::max);
        assert!(worst < one.max_relative_error, "{worst} {}", one.max_relative_error);
        // a smooth curve stays one piece
        let smooth: Vec<f64> = ts.iter().map(|t| 900.0 - 0.7 * t).collect();
        assert_eq!(fit_piecewise("density_kg_m3", &ts, &smooth, FitForm::Linear, FitVariable::Temperature).len(), 1);
    }

    #[test]
    fn degenerate_inputs() {
        assert!(fit_property("x", &[], &[], FitForm::Linear, FitVariable::Temperature).is_none());
        assert!(fit_property("x", &[300.0, 310.0], &[1.0, -1.0], FitForm::Log, FitVariable::Temperature).is_none());
        assert!(fit_property("x", &[300.0, 310.0], &[1.0, f64::NAN], FitForm::Linear, FitVariable::Temperature).is_none());
        let one = fit_property("x", &[300.0], &[2.5], FitForm::Linear, FitVariable::Temperature).unwrap();
        assert_eq!(one.degree(), 0);
        assert!((one.eval(300.0) - 2.5).abs() < 1e-15);
        assert!(least_squares(&[vec![1.0, 2.0], vec![2.0, 4.0]], &[1.0, 2.0]).is_none());
    }
}
