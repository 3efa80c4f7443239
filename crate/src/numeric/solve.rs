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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::ARITH_REL;

    #[test]
    fn stays_on_the_side_that_holds() {
        for target in [-700.0f64, -3.5, 0.0, 12.25, 1e5] {
            let x = bisect_last(-1e6, 1e6, 0.0, 200, |x| x <= target);
            assert!(x <= target && target - x <= ARITH_REL * target.abs().max(1.0));
        }
    }
}
