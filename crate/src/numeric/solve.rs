//! Root finding for monotone conditions, as the target solvers need it.

/// The largest `x` in `[lo, hi]` for which `ok(x)` holds, given that `ok` holds at `lo`,
/// fails at `hi` and changes only once in between (a monotone condition).
///
/// Bisects until the bracket is narrower than `tol`, or for at most `max_steps` halvings,
/// and returns the end of the bracket where `ok` holds, so the answer always satisfies it.
///
/// # Examples
/// ```
/// use latchwise::numeric::solve::bisect_last;
/// let x = bisect_last(0.0, 4.0, 1e-12, 200, |x| x * x <= 2.0);
/// assert!((x - 2f64.sqrt()).abs() < 1e-11 && x * x <= 2.0);
/// ```
pub fn bisect_last(
    mut lo: f64,
    mut hi: f64,
    tol: f64,
    max_steps: u32,
    ok: impl Fn(f64) -> bool,
) -> f64 {
    for _ in 0..max_steps {
        if hi - lo <= tol {
            break;
        }
        let mid = 0.5 * (lo + hi);
        if ok(mid) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    lo
}

/// The root of a rising continuous `f` in `[lo, hi]` (`f(lo) <= 0 <= f(hi)`), by the
/// Illinois variant of regula falsi (Dowell and Jarratt, BIT 11, 1971): superlinear where
/// `f` is smooth, and never slower than about bisection, as the end that stays is given
/// half its weight each time it stays. Stops when the bracket is narrower than `tol` or
/// after `max_steps` evaluations, and returns the bracket's low end, where `f <= 0`.
///
/// # Examples
/// ```
/// use latchwise::numeric::solve::illinois;
/// let x = illinois(0.0, 4.0, 1e-12, 100, |x| x * x - 2.0);
/// assert!((x - 2f64.sqrt()).abs() < 1e-11 && x * x <= 2.0);
/// ```
pub fn illinois(mut lo: f64, mut hi: f64, tol: f64, max_steps: u32, f: impl Fn(f64) -> f64) -> f64 {
    let (mut f_lo, mut f_hi) = (f(lo), f(hi));
    if f_lo >= 0.0 {
        return lo;
    }
    if f_hi <= 0.0 {
        return hi;
    }
    // Which end stayed last time (-1 low, 1 high, 0 none).
    let mut stayed = 0;
    for _ in 0..max_steps {
        if hi - lo <= tol {
            break;
        }
        let mut x = hi - f_hi * (hi - lo) / (f_hi - f_lo);
        if !(x > lo && x < hi) {
            x = 0.5 * (lo + hi);
        }
        let fx = f(x);
        if fx == 0.0 {
            return x;
        }
        if fx < 0.0 {
            lo = x;
            f_lo = fx;
            if stayed == 1 {
                f_hi *= 0.5;
            }
            stayed = 1;
        } else {
            hi = x;
            f_hi = fx;
            if stayed == -1 {
                f_lo *= 0.5;
            }
            stayed = -1;
        }
    }
    lo
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::ARITH_REL;

    #[test]
    fn illinois_finds_roots_of_steep_and_flat_functions_as_bisection_does() {
        // A normal CDF far out (flat, then steep) and a cubic: against bisection.
        let cdf = |x: f64| 0.5 * (1.0 + libm_erf(x / 2f64.sqrt()));
        for (f, lo, hi) in [
            (
                Box::new(move |x: f64| cdf(x) - 0.95) as Box<dyn Fn(f64) -> f64>,
                -40.0,
                40.0,
            ),
            (Box::new(move |x: f64| cdf(x) - 1e-6), -40.0, 40.0),
            (Box::new(|x: f64| x * x * x - 5.0), -10.0, 10.0),
        ] {
            let by_bisection = bisect_last(lo, hi, 1e-12, 200, |x| f(x) <= 0.0);
            let fast = illinois(lo, hi, 1e-12, 200, &f);
            assert!((fast - by_bisection).abs() < 1e-10, "{fast} {by_bisection}");
            assert!(f(fast) <= 0.0);
        }
    }

    /// erf by Abramowitz and Stegun 7.1.26 (error below 1.5e-7): smooth and rising,
    /// all a test function for root finding needs.
    fn libm_erf(x: f64) -> f64 {
        let t = 1.0 / (1.0 + 0.327_591_1 * x.abs());
        let y = 1.0
            - (((((1.061_405_429 * t - 1.453_152_027) * t) + 1.421_413_741) * t - 0.284_496_736)
                * t
                + 0.254_829_592)
                * t
                * (-x * x).exp();
        y.copysign(x)
    }

    #[test]
    fn stays_on_the_side_that_holds() {
        for target in [-700.0f64, -3.5, 0.0, 12.25, 1e5] {
            let x = bisect_last(-1e6, 1e6, 0.0, 200, |x| x <= target);
            assert!(x <= target && target - x <= ARITH_REL * target.abs().max(1.0));
        }
    }
}
