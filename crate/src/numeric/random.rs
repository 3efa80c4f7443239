//! A small seeded random source for synthetic data and Monte Carlo: reproducible from its
//! seed on every platform, with Poisson and normal draws.

/// SplitMix64: a fast 64-bit generator whose whole state is one word.
///
/// # References
/// Steele, Lea, Flood, "Fast Splittable Pseudorandom Number Generators", OOPSLA 2014.
#[derive(Debug, Clone)]
pub struct Random {
    state: u64,
}

impl Random {
    /// A generator started from `seed`.
    pub fn new(seed: u64) -> Self {
        Random { state: seed }
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.state = self.state.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.state;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// A uniform draw in (0, 1): never exactly 0 or 1.
    pub fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }

    /// A standard normal draw (Box-Muller).
    pub fn normal(&mut self) -> f64 {
        let (u, v) = (self.uniform(), self.uniform());
        (-2.0 * u.ln()).sqrt() * (2.0 * std::f64::consts::PI * v).cos()
    }

    /// A Poisson draw of mean `mu`: by multiplying uniforms below 30, by inverting the
    /// cumulative distribution from the mode outward above.
    pub fn poisson(&mut self, mu: f64) -> u64 {
        if mu <= 0.0 || mu.is_nan() {
            return 0;
        }
        if mu < 30.0 {
            let limit = (-mu).exp();
            let mut k = 0;
            let mut p = self.uniform();
            while p > limit {
                k += 1;
                p *= self.uniform();
            }
            return k;
        }
        // Sequential search of the CDF, started at 0 in log space for stability.
        let u = self.uniform();
        let mut k: u64 = 0;
        let mut ln_p = -mu;
        let mut cdf = ln_p.exp();
        while cdf < u && k < 100_000_000 {
            k += 1;
            ln_p += mu.ln() - (k as f64).ln();
            cdf += ln_p.exp();
        }
        k
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::SAMPLE_SIGMAS;

    #[test]
    fn same_seed_same_draws_and_sane_moments() {
        let (mut a, mut b) = (Random::new(7), Random::new(7));
        assert_eq!(a.next_u64(), b.next_u64());
        let mut r = Random::new(1);
        for mu in [0.5, 4.0, 80.0] {
            let n = 20_000;
            let mean = (0..n).map(|_| r.poisson(mu) as f64).sum::<f64>() / f64::from(n);
            // The sample mean's standard error is sqrt(mu/n).
            let se = (mu / f64::from(n)).sqrt();
            assert!((mean - mu).abs() < SAMPLE_SIGMAS * se, "{mu}: {mean}");
        }
    }
}
