//! Related clocks: when the launch and sampling clocks come from one reference, data edges
//! land on a lattice of offsets from the sampling edge instead of spreading evenly. The
//! clock factor K is the density of edges at the sampling edge relative to even spreading;
//! the failure rate is K times the standard one.

use std::f64::consts::{LN_10, PI};

use serde::Serialize;

use crate::numeric::normal::ln_sum_exp;
use crate::quantity::Time;

/// Launch over sampling frequency as a ratio of whole numbers in lowest terms, with the
/// relative jitter of the edges and, if known, the static phase of the edge lattice.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RelatedClocks {
    /// Launch frequency over sampling frequency: `(P, Q)`, in lowest terms.
    pub ratio: (u32, u32),
    /// rms of the relative edge jitter.
    pub jitter: Time,
    /// Static offset of the lattice from the sampling edge; `None`: sign off at the worst.
    pub phase: Option<Time>,
}

/// The greatest common divisor.
pub fn gcd(a: u32, b: u32) -> u32 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

impl RelatedClocks {
    /// The lattice spacing of data-edge offsets, `g = 1 / (P fclk)`.
    pub fn spacing(&self, fclk: f64) -> f64 {
        1.0 / (f64::from(self.ratio.0) * fclk)
    }

    /// log10 K at `phase` (seconds, any value: the lattice repeats every spacing).
    ///
    /// # Formula
    /// `K = g * sum_n phi_sigma(phase + n g)` for `sigma < g/3` (kept in logarithms: K at
    /// the best phase is astronomically small); else the Fourier form
    /// `K = 1 + 2 sum_{m>=1} exp(-2 pi^2 m^2 sigma^2 / g^2) cos(2 pi m phase / g)`.
    ///
    /// # Examples
    /// ```
    /// use latchwise::quantity::Time;
    /// use latchwise::synchronizer::clocks::RelatedClocks;
    /// // 400 MHz into 500 MHz, 10 ps of jitter: K = g / (sigma sqrt(2 pi)) = 19.947 at phase 0.
    /// let c = RelatedClocks { ratio: (4, 5), jitter: Time::positive("jitter", 10e-12).unwrap(), phase: None };
    /// assert!((10f64.powf(c.log10_factor_at(500e6, 0.0)) - 19.947).abs() < 1e-3);
    /// ```
    ///
    /// # References
    /// Beer, Ginosar, Dobkin, Weizman, "MTBF Estimation in Coherent Clock Domains",
    /// ASYNC 2013 (recalled); domain notes section 8.3.
    pub fn log10_factor_at(&self, fclk: f64, phase: f64) -> f64 {
        let g = self.spacing(fclk);
        let s = self.jitter.get();
        let x = phase.rem_euclid(g);
        if s < g / 3.0 {
            // Terms further than 40 sigma from the sampling edge are below 1e-340.
            let reach = (40.0 * s / g).ceil() as i64 + 1;
            let ln_norm = -(s * (2.0 * PI).sqrt()).ln();
            let terms: Vec<f64> = (-reach..=reach)
                .map(|n| {
                    let d = x + n as f64 * g;
                    ln_norm - d * d / (2.0 * s * s)
                })
                .collect();
            (g.ln() + ln_sum_exp(&terms)) / LN_10
        } else {
            let r = s / g;
            let sum: f64 = (1..=20)
                .map(|m| {
                    let m = f64::from(m);
                    (-2.0 * PI * PI * m * m * r * r).exp() * (2.0 * PI * m * x / g).cos()
                })
                .sum();
            (1.0 + 2.0 * sum).log10()
        }
    }

    /// log10 K at the case's phase, or at the worst phase (0) when none is given.
    pub fn log10_factor(&self, fclk: f64) -> f64 {
        self.log10_factor_at(fclk, self.phase.map_or(0.0, Time::get))
    }

    /// log10 K at the worst phase (edges centred on the sampling edge) and the best
    /// (half a spacing away).
    pub fn log10_factor_range(&self, fclk: f64) -> (f64, f64) {
        let g = self.spacing(fclk);
        (
            self.log10_factor_at(fclk, 0.0),
            self.log10_factor_at(fclk, g / 2.0),
        )
    }

    /// Whether the standard formula is within 1 % of K at every phase: jitter above
    /// 0.518 of the lattice spacing (the spacing under about 1.93 jitter rms).
    pub fn standard_formula_safe(&self, fclk: f64) -> bool {
        self.jitter.get() / self.spacing(fclk) > STANDARD_SAFE_JITTER
    }
}

/// Jitter over lattice spacing above which K is within 1 % of 1 at every phase.
pub const STANDARD_SAFE_JITTER: f64 = 0.518;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::{assert_rel, F64_REL, QUADRATURE_REL};

    fn clocks(p: u32, q: u32, jitter: f64) -> RelatedClocks {
        RelatedClocks {
            ratio: (p, q),
            jitter: Time::positive("jitter", jitter).unwrap_or(Time::ZERO),
            phase: None,
        }
    }

    #[test]
    fn both_forms_agree_where_they_meet() {
        // At sigma = g/3 either form may be used; they must give the same K.
        let c = clocks(1, 1, 1e-9 / 3.0);
        for phase in [0.0, 0.1e-9, 0.25e-9, 0.5e-9] {
            let lattice = 1e-9;
            let s: f64 = 1e-9 / 3.0;
            let direct: f64 = (-30..=30)
                .map(|n| {
                    let d = phase + f64::from(n) * lattice;
                    lattice * (-d * d / (2.0 * s * s)).exp() / (s * (2.0 * PI).sqrt())
                })
                .sum();
            assert_rel(
                "K",
                10f64.powf(c.log10_factor_at(1e9, phase)),
                direct,
                F64_REL,
            );
        }
    }

    #[test]
    fn the_factor_averages_to_one_over_all_phases() {
        for (p, q, s) in [(4, 5, 10e-12), (1, 1, 5e-12), (3, 7, 200e-12)] {
            let c = clocks(p, q, s);
            let g = c.spacing(1e9);
            let n = 4000;
            let mean: f64 = (0..n)
                .map(|i| {
                    10f64.powf(c.log10_factor_at(1e9, g * (f64::from(i) + 0.5) / f64::from(n)))
                })
                .sum::<f64>()
                / f64::from(n);
            assert_rel(&format!("{p}/{q}"), mean, 1.0, QUADRATURE_REL);
        }
    }
}
