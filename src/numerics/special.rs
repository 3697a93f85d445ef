//! The error function and the standard normal distribution, from the `statrs` crate (its `erf`, `erfc` and
//! `erfc_inv`, accurate to a few ulp; see the crate's documentation for the methods).

use std::f64::consts::SQRT_2;

/// Error function erf(x) \[-\].
pub fn erf(x: f64) -> f64 {
    statrs::function::erf::erf(x)
}

/// Complementary error function erfc(x) = 1 − erf(x) \[-\], accurate also where erf(x) is close to 1.
pub fn erfc(x: f64) -> f64 {
    statrs::function::erf::erfc(x)
}

/// Standard normal distribution function Φ(x) = erfc(−x/√2)/2 \[-\].
pub fn normal_cdf(x: f64) -> f64 {
    0.5 * erfc(-x / SQRT_2)
}

/// Standard normal quantile Φ⁻¹(p) = −√2 erfc⁻¹(2p) \[-\], refined by one Newton step on Φ(x) = p (statrs'
/// `erfc_inv` alone round-trips to about 1e-10 relative, its `erfc` to a few ulp); p is held in
/// \[1e-300, 1 − 1e-16\], so the result is always finite (within about ±37.1); NaN in gives NaN out.
pub fn normal_quantile(p: f64) -> f64 {
    let p = p.clamp(1e-300, 1.0 - 1e-16);
    let x = -SQRT_2 * statrs::function::erf::erfc_inv(2.0 * p);
    let density = (-0.5 * x * x).exp() / (2.0 * std::f64::consts::PI).sqrt();
    let step = (normal_cdf(x) - p) / density;
    if density > 0.0 && step.is_finite() {
        x - step
    } else {
        x
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Check values: Abramowitz & Stegun (1964), Table 7.1 (erf, 10 decimals) and Table 26.1 / 26.5
    /// (normal distribution and its percentage points).
    #[test]
    fn handbook_values() {
        for (x, e) in [(0.1, 0.112_462_916_0), (0.5, 0.520_499_877_8), (1.0, 0.842_700_792_9), (1.5, 0.966_105_146_5), (2.0, 0.995_322_265_0)] {
            assert!((erf(x) - e).abs() < 1e-10, "erf({x})");
            assert!((erf(-x) + e).abs() < 1e-10, "erf(-{x})");
            assert!((erfc(x) - (1.0 - e)).abs() < 1e-10, "erfc({x})");
        }
        assert!((normal_cdf(1.0) - 0.841_344_746_1).abs() < 1e-10);
        assert!((normal_cdf(-1.96) - 0.024_997_895_1).abs() < 1e-10);
        for (p, z) in [(0.975, 1.959_963_985), (0.95, 1.644_853_627), (0.99, 2.326_347_874), (0.999, 3.090_232_306)] {
            assert!((normal_quantile(p) - z).abs() < 1e-9, "quantile({p})");
            assert!((normal_quantile(1.0 - p) + z).abs() < 1e-9, "quantile(1-{p})");
        }
        assert!(normal_quantile(0.5).abs() < 1e-15);
    }

    #[test]
    fn quantile_inverts_the_distribution_and_stays_finite() {
        for i in 1..200 {
            let p = i as f64 / 200.0;
            let back = normal_cdf(normal_quantile(p));
            assert!((back / p - 1.0).abs() < 1e-13, "{p}: {back}");
        }
        for p in [0.0, 1.0, -1.0, 2.0, 1e-320] {
            assert!(normal_quantile(p).is_finite(), "{p}");
        }
        assert!(normal_quantile(0.0) < -37.0 && normal_quantile(1.0) > 8.0);
        // the far tail: Φ(−37) is about 5.7e-300 (the Mills-ratio series φ(x)/|x| (1 − 1/x²) gives 5.725e-300)
        let back = normal_cdf(normal_quantile(1e-299));
        assert!((back / 1e-299 - 1.0).abs() < 1e-10, "{back}");
    }
}
