//! Numerical building blocks shared by every layer (the bottom layer: it imports nothing from the crate).
//!
//! - [`root`]: one bracketed scalar root finder (Brent's method) with explicit termination and errors;
//! - [`interp`]: linear interpolation on sorted abscissae with an explicit extrapolation policy;
//! - [`linalg`]: dense linear algebra through `nalgebra` (least squares by QR, symmetric positive-definite
//!   systems by Cholesky, square systems by LU);
//! - [`quadrature`]: Gauss–Legendre quadrature on equal panels;
//! - [`special`]: the error function and the standard normal distribution and quantile, from `statrs`.

pub mod interp;
pub mod linalg;
pub mod quadrature;
pub mod root;
pub mod special;

mod exp_table;

/// Cube root of `x` within 2 ulp of the correctly rounded value, in plain IEEE arithmetic (the same bits on
/// every machine): a bit-level first guess refined by three Halley steps y ← y (y³ + 2x)/(2y³ + x), each
/// cubing the relative error. About a third of the cost of `f64::cbrt`; zero, negative, subnormal and
/// non-finite arguments go to `f64::cbrt`.
#[inline]
pub fn cbrt(x: f64) -> f64 {
    if !(x.is_normal() && x > 0.0) {
        return x.cbrt();
    }
    // exponent divided by three, mantissa bits approximately so: relative error below 4 %
    let mut y = f64::from_bits(x.to_bits() / 3 + 0x2a9f_7893_782d_a1ce);
    for _ in 0..3 {
        let y3 = y * y * y;
        y *= (y3 + 2.0 * x) / (2.0 * y3 + x);
    }
    y
}

/// Shift that rounds a double below 2^51 in magnitude to the nearest integer when added and taken away again
/// (1.5 × 2^52).
const ROUND_SHIFT: f64 = 6_755_399_441_055_744.0;

/// e^x in plain IEEE arithmetic without a library call: Tang's table method (Tang 1989, ACM Trans. Math.
/// Softw. 15:144), e^x = 2^(k/128) e^r with k = round(128 x/ln 2), |r| ≤ ln 2/256, the table 2^(j/128) with its
/// relative remainder (src/numerics/exp_table.rs, from mpmath), and e^r − 1 by its Taylor polynomial of degree 5
/// (dropped terms below 6e-19); the final rounding dominates its error (about 0.5 ulp, as the standard
/// library's). Measured against `f64::exp`: at most 1 ulp apart, the same bits for all but about one argument
/// in a thousand. About half the instructions of `f64::exp`; |x| ≥ 700, infinities and NaN go to `f64::exp`.
#[inline(always)]
pub fn exp(x: f64) -> f64 {
    if !(x.abs() < 700.0) {
        return x.exp();
    }
    // k = round(128 x/ln 2) in the low bits of `shifted` (two's complement below bit 51)
    let shifted = x * exp_table::INV_LN2_N + ROUND_SHIFT;
    let k_bits = shifted.to_bits();
    let kd = shifted - ROUND_SHIFT;
    // |k| ≤ 129 300 < 2^17: k × LN2_HI_N is exact, and so is x − k × LN2_HI_N (within a factor 2 of x when k ≠ 0)
    let r = (x - kd * exp_table::LN2_HI_N) - kd * exp_table::LN2_LO_N;
    let (t_bits, remainder) = exp_table::EXP2_TABLE[(k_bits & 127) as usize];
    // 2^(k/128) = 2^(k >> 7) × 2^(j/128): the power of two goes into the exponent field (no overflow below 700;
    // bits 7..18 of k_bits are those of k >> 7 modulo 2^12, and the shift drops the rest)
    let scale = f64::from_bits(t_bits.wrapping_add((k_bits >> 7) << 52));
    let r2 = r * r;
    let em1 = r + r2 * (0.5 + r * (1.0 / 6.0 + r * (1.0 / 24.0 + r * (1.0 / 120.0))));
    scale + scale * (remainder + em1)
}

#[cfg(test)]
mod exp_tests {
    /// Largest deviation from the standard library's exponential in ulp, and the share of arguments with the
    /// same bits, over `count` arguments spread over [lo, hi].
    fn compare(lo: f64, hi: f64, count: usize) -> (f64, f64) {
        let (mut worst, mut same) = (0.0f64, 0usize);
        // a fixed sequence of arguments (Weyl sequence): the same on every run
        let mut u = 0.5f64;
        for _ in 0..count {
            u = (u + 0.618_033_988_749_894_9).fract();
            let x = lo + (hi - lo) * u;
            let (a, b) = (super::exp(x), x.exp());
            let ulp = f64::from_bits(b.to_bits() + 1) - b;
            worst = worst.max((a - b).abs() / ulp);
            same += usize::from(a.to_bits() == b.to_bits());
        }
        (worst, same as f64 / count as f64)
    }

    /// The exponential agrees with the standard library's to 1 ulp over its whole fast range and the ranges the
    /// property kernels use, with the same bits for almost every argument; edge arguments go to the library.
    #[test]
    fn exponential_matches_the_standard_library() {
        for (lo, hi) in [(-699.9, 699.9), (-1.0, 1.0), (-1e-3, 1e-3), (-40.0, 25.0), (-3e-9, 3e-9)] {
            let (worst, same) = compare(lo, hi, 400_000);
            eprintln!("[{lo}, {hi}]: largest deviation {worst} ulp, same bits {:.4} %", 100.0 * same);
            assert!(worst <= 1.0 && same > 0.995, "[{lo}, {hi}]: {worst} ulp, {same}");
        }
        for x in [0.0, -0.0, 1.0, -1.0, 700.0, -700.0, 709.7, -745.0, -800.0, 710.0, f64::INFINITY, f64::NEG_INFINITY, 1e-300, -1e-300] {
            assert_eq!(super::exp(x).to_bits(), x.exp().to_bits(), "{x}");
        }
        assert!(super::exp(f64::NAN).is_nan());
        // exact points: e^0 = 1, and the table's powers of two
        for j in -20..20 {
            let x = f64::from(j) * std::f64::consts::LN_2 / 128.0;
            assert!((super::exp(x) / x.exp() - 1.0).abs() <= 2.3e-16, "{x}");
        }
    }
}

#[cfg(test)]
mod cbrt_tests {
    /// The cube root agrees with the standard library's to 2 ulp over the normal range and on cubes.
    #[test]
    fn cube_root_matches_the_standard_library() {
        let mut worst = 0.0f64;
        let mut x = 1e-300;
        while x < 1e300 {
            for f in [1.0, 1.37, 2.0, 3.3, 5.9, 7.77] {
                let v = x * f;
                let rel = (super::cbrt(v) / v.cbrt() - 1.0).abs();
                worst = worst.max(rel);
            }
            x *= 10.0;
        }
        assert!(worst <= 4.5e-16, "worst relative deviation {worst:e}");
        for k in 1..2000 {
            let c = k as f64 * 0.37;
            assert!((super::cbrt(c * c * c) / c - 1.0).abs() <= 4.5e-16, "{c}");
        }
        assert_eq!(super::cbrt(0.0), 0.0);
        assert_eq!(super::cbrt(-8.0), -2.0);
        assert!(super::cbrt(f64::NAN).is_nan());
        assert_eq!(super::cbrt(f64::INFINITY), f64::INFINITY);
    }
}
