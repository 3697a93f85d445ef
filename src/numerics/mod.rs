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
