//! The standard normal distribution in the log domain: tail probabilities and interval
//! probabilities that stay accurate where plain CDF differences cancel or underflow.

use std::f64::consts::{PI, SQRT_2};

/// ln(1/sqrt(2 pi)).
const LN_INV_SQRT_2PI: f64 = -0.918_938_533_204_672_7;

/// Positive nodes and weights of 16-point Gauss-Legendre quadrature on [-1, 1]
/// (Abramowitz & Stegun, Table 25.4; regenerated with mpmath at 40 digits).
const GL16: [(f64, f64); 8] = [
    (0.095_012_509_837_637_44, 0.189_450_610_455_068_5),
    (0.281_603_550_779_258_9, 0.182_603_415_044_923_6),
    (0.458_016_777_657_227_4, 0.169_156_519_395_002_5),
    (0.617_876_244_402_643_8, 0.149_595_988_816_576_7),
    (0.755_404_408_355_003, 0.124_628_971_255_533_9),
    (0.865_631_202_387_831_7, 0.095_158_511_682_492_79),
    (0.944_575_023_073_232_6, 0.062_253_523_938_647_89),
    (0.989_400_934_991_65, 0.027_152_459_411_754_1),
];

/// ln of the standard normal density at `x`.
pub fn ln_pdf(x: f64) -> f64 {
    LN_INV_SQRT_2PI - 0.5 * x * x
}

/// erf(x) for 0 <= x < 1 by the series `erf x = 2/sqrt(pi) e^(-x^2) sum 2^n x^(2n+1) /
/// (1*3*...*(2n+1))`, whose terms are all positive, so nothing cancels.
///
/// # References
/// Abramowitz & Stegun, Handbook of Mathematical Functions, 7.1.6.
fn erf_series(x: f64) -> f64 {
    let x2 = x * x;
    let mut term = x;
    let mut sum = x;
    let mut n = 0.0;
    while term > sum * 1e-18 {
        n += 1.0;
        term *= 2.0 * x2 / (2.0 * n + 1.0);
        sum += term;
    }
    2.0 / PI.sqrt() * (-x2).exp() * sum
}

/// ln erfc(x) for x >= 0, to a few units in the last place, with no underflow at any x.
///
/// # Formula
/// For x < 1, `erfc = 1 - erf` with erf from its positive series (erfc(1) = 0.157, so
/// less than one digit is lost). For x >= 1 the continued fraction
/// `erfc x = e^(-x^2)/sqrt(pi) / (x + (1/2)/(x + 1/(x + (3/2)/(x + ...))))`
/// evaluated by the modified Lentz method, kept in logarithms.
///
/// # References
/// Abramowitz & Stegun 7.1.14 (continued fraction); Press et al., "Numerical Recipes",
/// 3rd ed., section 5.2 (modified Lentz method).
pub fn ln_erfc(x: f64) -> f64 {
    if x < 1.0 {
        return (-erf_series(x)).ln_1p();
    }
    -x * x - 0.5 * PI.ln() - erfc_fraction(x).ln()
}

/// The continued fraction `f` of `erfc x = e^(-x^2) / (sqrt(pi) f)` for x >= 1 (about x,
/// and known to full relative precision, unlike `-x^2` beside it).
fn erfc_fraction(x: f64) -> f64 {
    const TINY: f64 = 1e-300;
    let mut f = x;
    let mut c = x;
    let mut d = 0.0;
    for n in 1..5000 {
        let a = f64::from(n) / 2.0;
        d = x + a * d;
        d = if d.abs() < TINY { TINY } else { d };
        c = x + a / c;
        c = if c.abs() < TINY { TINY } else { c };
        d = 1.0 / d;
        let delta = c * d;
        f *= delta;
        // Four ulps: a bound below one ulp is never met for some large x (delta
        // alternates between the two neighbours of 1), which ran all 5000 terms.
        if (delta - 1.0).abs() <= 4.0 * f64::EPSILON {
            break;
        }
    }
    f
}

/// The standard normal distribution function `Phi(z) = P(Z <= z)`, to an absolute error
/// below 1e-15 (not relative: a lower tail far below that is better taken from [`ln_q`]),
/// for the sums of probabilities that a quadrature adds up.
///
/// # Formula
/// `Phi(z) = 1 - erfc(z/sqrt 2)/2` above zero and `erfc(|z|/sqrt 2)/2` below, with erfc as
/// `1 - erf` from erf's positive series where `|z|/sqrt 2 < 2.5` (at most 39 terms there,
/// where the continued fraction needs up to 700), and from the continued fraction above
/// (at most 37 terms). [`ln_q`] keeps the continued fraction from 1 up, for its relative
/// accuracy in the tail.
///
/// # References
/// Abramowitz & Stegun 7.1.6 (the series) and 7.1.14 (the continued fraction).
pub fn cdf(z: f64) -> f64 {
    let x = z.abs() / SQRT_2;
    let upper = if x < 2.5 {
        0.5 - 0.5 * erf_series(x)
    } else {
        0.5 * (-x * x).exp() / (PI.sqrt() * erfc_fraction(x))
    };
    if z >= 0.0 {
        1.0 - upper
    } else {
        upper
    }
}

/// ln Q(x), Q the upper tail of the standard normal, for any finite `x`.
///
/// # Formula
/// `Q(x) = erfc(x / sqrt 2) / 2`, and `Q(x) = 1 - Q(-x)` below zero.
///
/// # Examples
/// ```
/// use latchwise::numeric::normal::ln_q;
/// // Q(0) = 1/2; Q(100) = 1.3443e-2174 (far below f64, but its log is fine).
/// assert!((ln_q(0.0) + std::f64::consts::LN_2).abs() < 1e-15);
/// assert!((ln_q(100.0) / std::f64::consts::LN_10 + 2173.8715).abs() < 1e-3);
/// ```
pub fn ln_q(x: f64) -> f64 {
    if x < 0.0 {
        // Q(x) = 1 - Q(-x) with Q(-x) < 1/2: no cancellation.
        return (-ln_q(-x).exp()).ln_1p();
    }
    ln_erfc(x / SQRT_2) - std::f64::consts::LN_2
}

/// The standard normal's upper quantile: the `z` with `Q(z) = alpha`, for
/// `0 < alpha <= 1/2` (down to the smallest double: z = 38.5 at 1e-324).
///
/// # Examples
/// ```
/// use latchwise::numeric::normal::upper_quantile;
/// // z(0.025) = 1.959964 (the two-sided 95 % point, a table value of the trade).
/// assert!((upper_quantile(0.025) - 1.959_963_984_540_054).abs() < 1e-9);
/// ```
pub fn upper_quantile(alpha: f64) -> f64 {
    let target = alpha.ln();
    super::solve::bisect_last(0.0, 40.0, 1e-13, 200, |z| ln_q(z) >= target)
}

/// ln P(a < X < b) for a standard normal X, given the midpoint `m = (a+b)/2` and the
/// natural log of the half-width `h = (b-a)/2`. Accurate for half-widths from 1e-300000
/// (as `ln_h`) up to the whole line, in the tails as well as at the centre.
///
/// # Formula
/// Narrow intervals: `phi(m) * h * sum w_i exp(-m h s_i - (h s_i)^2 / 2)` by 16-point
/// Gauss-Legendre (the density form, exact to rounding there). Wide ones: the
/// difference of tail probabilities, computed as `ln Q(a) + ln(1 - Q(b)/Q(a))` on the
/// side that does not cancel.
pub fn ln_prob_interval(m: f64, ln_h: f64) -> f64 {
    let h = ln_h.exp();
    if h < 0.5 && m.abs() * h < 2.0 {
        let sum: f64 = GL16
            .iter()
            .map(|&(s, w)| {
                let t = h * s;
                w * ((-m * t - 0.5 * t * t).exp() + (m * t - 0.5 * t * t).exp())
            })
            .sum();
        return ln_pdf(m) + ln_h + sum.ln();
    }
    // Far in a tail (reflected onto the upper one), the tails' logs are huge and their
    // difference is lost to rounding: take it exactly instead. With a = |m| - h and
    // b = |m| + h, ln Q(b) - ln Q(a) = -2 h |m| - ln(f(b/sqrt 2) / f(a/sqrt 2)), f the
    // continued fraction of erfc, and P = Q(a) (1 - e^that).
    let far = m.abs();
    if far - h >= SQRT_2 {
        let a = far - h;
        let d =
            -2.0 * h * far - (erfc_fraction((far + h) / SQRT_2) / erfc_fraction(a / SQRT_2)).ln();
        return ln_q(a) + (-d.exp_m1()).ln();
    }
    let (a, b) = (m - h, m + h);
    if a >= 0.0 {
        ln_diff(ln_q(a), ln_q(b))
    } else if b <= 0.0 {
        ln_diff(ln_q(-b), ln_q(-a))
    } else {
        // Both tails outside: 1 - Q(b) - Q(-a), at least 1 - 2 Q(1/2) here.
        (-(ln_q(b).exp() + ln_q(-a).exp())).ln_1p()
    }
}

/// ln(e^x - e^y) for x > y.
fn ln_diff(x: f64, y: f64) -> f64 {
    x + (-(y - x).exp()).ln_1p()
}

/// ln of a sum of exponentials, safe for any magnitudes.
pub fn ln_sum_exp(terms: &[f64]) -> f64 {
    ln_sum_exp_of(terms.iter().copied())
}

/// [`ln_sum_exp`] of terms made on the fly (read twice: for their largest, then the sum),
/// with no vector of them.
pub fn ln_sum_exp_of(terms: impl Iterator<Item = f64> + Clone) -> f64 {
    let max = terms.clone().fold(f64::NEG_INFINITY, f64::max);
    if !max.is_finite() {
        return max;
    }
    max + terms.map(|t| (t - max).exp()).sum::<f64>().ln()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::{assert_rel, ARITH_REL, F64_REL};

    #[test]
    fn cdf_matches_mpmath_and_the_tail_in_logs() {
        // Source: mpmath 1.3 `ncdf` at 30 digits (python3 -c "import mpmath;
        // mpmath.mp.dps=30; print(mpmath.ncdf(z))"), each the nearest double.
        for (z, want) in [
            (1.0, 0.841_344_746_068_542_9),
            (-2.0, 0.022_750_131_948_179_21),
            (1.96, 0.975_002_104_851_779_5),
            (-3.5, 0.000_232_629_079_035_525_04),
            (0.3, 0.617_911_422_188_952_7),
            (-8.5, 9.479_534_822_203_318e-18),
        ] {
            let got = cdf(z);
            assert!((got - want).abs() <= 1e-15, "cdf({z}) = {got}, want {want}");
        }
        // Far in the lower tail (the continued fraction's range) the error is relative too.
        assert_rel("cdf(-8.5)", cdf(-8.5), 9.479_534_822_203_318e-18, 1e-14);
        // Beside 1 - Q(z) from the tail in logs (itself checked against published values in
        // tests/comparator.rs), over the range a quadrature uses: the same to 1e-15 absolute.
        let mut z = -9.0;
        while z <= 9.0 {
            let by_tail = 1.0 - ln_q(z).exp();
            assert!(
                (cdf(z) - by_tail).abs() <= 1e-15,
                "z = {z}: {} against {by_tail}",
                cdf(z)
            );
            z += 0.001_7;
        }
    }

    #[test]
    fn quadrature_weights_sum_to_two() {
        let s: f64 = GL16.iter().map(|p| 2.0 * p.1).sum();
        assert_rel("sum of weights", s, 2.0, ARITH_REL);
    }

    #[test]
    fn branches_agree_where_they_meet() {
        // Just inside and outside the quadrature branch the two forms must agree.
        for m in [0.0f64, 0.3, 1.0, 3.0, 8.0] {
            let h = (2.0f64 / m.max(4.0)).min(0.5);
            let inside = ln_prob_interval(m, (h * (1.0 - 1e-13)).ln());
            let outside = ln_prob_interval(m, (h * (1.0 + 1e-13)).ln());
            assert_rel(&format!("m={m}"), inside, outside, F64_REL);
        }
    }
}
