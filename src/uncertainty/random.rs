//! Small self-contained random numbers: SplitMix64 mixing as a counter-based generator (one uniform per
//! (seed, factor, sample) triple, whatever thread computes it), xoshiro256** for the Latin-hypercube
//! permutations, and truncated normal draws (the normal distribution and quantile: crate::numerics::special).

use crate::numerics::special::{normal_cdf, normal_quantile};

/// SplitMix64 finaliser (Steele, Lea & Flood 2014): a bijective 64-bit mix with good avalanche.
#[inline]
pub fn mix64(mut z: u64) -> u64 {
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// FNV-1a hash of a name \[-\]: a stable key for a factor, independent of which other factors exist.
pub fn name_key(name: &str) -> u64 {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in name.bytes() {
        h ^= u64::from(b);
        h = h.wrapping_mul(0x0100_0000_01b3);
    }
    h
}

/// Uniform number in the open interval (0, 1) from a 64-bit word (53 random bits, never 0 or 1).
#[inline]
pub fn unit_open(bits: u64) -> f64 {
    ((bits >> 11) as f64 + 0.5) * (1.0 / (1u64 << 53) as f64)
}

/// The uniform draw in (0, 1) of one factor in one sample: a hash of (seed, factor key, sample index, stream).
pub fn counter_uniform(seed: u64, factor: u64, sample: u64, stream: u64) -> f64 {
    let mut h = mix64(seed ^ 0x005E_ED0F_D20C);
    h = mix64(h ^ factor);
    h = mix64(h ^ sample.wrapping_mul(0xD1B5_4A32_D192_ED03));
    h = mix64(h ^ stream);
    unit_open(h)
}

/// xoshiro256** (Blackman & Vigna 2018), seeded through SplitMix64.
#[derive(Debug, Clone)]
pub struct Xoshiro256 {
    s: [u64; 4],
}

impl Xoshiro256 {
    /// A generator whose state is filled from `seed` by SplitMix64 steps.
    pub fn new(seed: u64) -> Self {
        let mut x = seed;
        let mut s = [0u64; 4];
        for v in &mut s {
            x = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
            *v = mix64(x.wrapping_sub(0x9E37_79B9_7F4A_7C15));
        }
        if s.iter().all(|v| *v == 0) {
            s[0] = 1;
        }
        Xoshiro256 { s }
    }

    /// Next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        let result = self.s[1].wrapping_mul(5).rotate_left(7).wrapping_mul(9);
        let t = self.s[1] << 17;
        self.s[2] ^= self.s[0];
        self.s[3] ^= self.s[1];
        self.s[1] ^= self.s[2];
        self.s[0] ^= self.s[3];
        self.s[2] ^= t;
        self.s[3] = self.s[3].rotate_left(45);
        result
    }

    /// Uniform integer in 0..n (n > 0), by Lemire's multiply-shift with rejection (no modulo bias).
    pub fn below(&mut self, n: u64) -> u64 {
        let threshold = n.wrapping_neg() % n;
        loop {
            let m = u128::from(self.next_u64()) * u128::from(n);
            if (m as u64) >= threshold {
                return (m >> 64) as u64;
            }
        }
    }

    /// A uniformly random permutation of 0..n (Fisher–Yates).
    pub fn permutation(&mut self, n: usize) -> Vec<u32> {
        let mut p: Vec<u32> = (0..n as u32).collect();
        for i in (1..n).rev() {
            let j = self.below(i as u64 + 1) as usize;
            p.swap(i, j);
        }
        p
    }
}

/// Largest |z| of a truncated standard normal draw.
pub const TRUNCATION: f64 = 3.0;

/// Standard normal truncated to ±[`TRUNCATION`], by inversion of a uniform `u` in (0, 1): the draw keeps the
/// stratification of a Latin-hypercube design.
pub fn truncated_normal(u: f64) -> f64 {
    // Φ(∓TRUNCATION), computed once per process (the same bits as at every call)
    static BOUNDS: std::sync::OnceLock<(f64, f64)> = std::sync::OnceLock::new();
    let &(lo, hi) = BOUNDS.get_or_init(|| (normal_cdf(-TRUNCATION), normal_cdf(TRUNCATION)));
    normal_quantile(lo + u * (hi - lo)).clamp(-TRUNCATION, TRUNCATION)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quantile_inverts_the_distribution() {
        for &p in &[1e-6, 0.001, 0.02, 0.1, 0.3, 0.5, 0.7, 0.9, 0.98, 0.999] {
            let x = normal_quantile(p);
            assert!((normal_cdf(x) - p).abs() < 2e-7 * p.max(1e-3), "{p} {x}");
        }
        assert!(normal_quantile(0.5).abs() < 1e-12);
        assert!((normal_quantile(0.975) - 1.959_963_985).abs() < 1e-8);
    }

    #[test]
    fn truncated_normal_stays_inside_and_is_symmetric() {
        assert!((truncated_normal(0.5)).abs() < 1e-9);
        assert!((truncated_normal(1e-12) + 3.0).abs() < 1e-6);
        assert!((truncated_normal(1.0 - 1e-12) - 3.0).abs() < 1e-6);
        for &u in &[0.01, 0.2, 0.4] {
            assert!((truncated_normal(u) + truncated_normal(1.0 - u)).abs() < 1e-8);
        }
    }

    #[test]
    fn counter_uniforms_look_uniform() {
        let n = 20_000;
        let (mut s, mut s2) = (0.0, 0.0);
        for i in 0..n {
            let u = counter_uniform(7, name_key("x"), i, 0);
            assert!(u > 0.0 && u < 1.0);
            s += u;
            s2 += u * u;
        }
        let mean = s / n as f64;
        let var = s2 / n as f64 - mean * mean;
        assert!((mean - 0.5).abs() < 0.01, "{mean}");
        assert!((var - 1.0 / 12.0).abs() < 0.003, "{var}");
        assert_ne!(counter_uniform(7, name_key("x"), 3, 0), counter_uniform(8, name_key("x"), 3, 0));
        assert_ne!(counter_uniform(7, name_key("x"), 3, 0), counter_uniform(7, name_key("y"), 3, 0));
    }

    #[test]
    fn permutations_are_permutations() {
        let mut g = Xoshiro256::new(42);
        let mut p = g.permutation(1000);
        p.sort_unstable();
        assert!(p.iter().enumerate().all(|(i, v)| *v as usize == i));
    }
}
