//! The one tolerance policy of the test suite.
//!
//! - `LOG10_REL`: log10 results against 50-digit mpmath values. An f64 carries about
//!   16 significant digits; log10 MTBF reaches 1e7 in the extreme cases, so an
//!   absolute tolerance would be meaningless there: the bound is relative to
//!   max(1, |value|) and leaves three digits for the handful of roundings on the way.
//! - `PUBLISHED_REL`: published worked examples quote three significant digits, so
//!   agreement to half a unit in the third digit is all that can be asked.
//! - `SOLVER_LOG10_ABS`: bisection and closed-form solvers must land on the target
//!   to this many decades.

/// Relative tolerance on log10 values against high-precision references.
pub const LOG10_REL: f64 = 1e-12;
/// Absolute tolerance, in decades, of solver results against their target.
pub const SOLVER_LOG10_ABS: f64 = 1e-6;

/// Asserts that `got` is within `LOG10_REL` of `want` (relative to max(1, |want|)).
pub fn assert_log10(what: &str, got: f64, want: f64) {
    let tol = LOG10_REL * want.abs().max(1.0);
    assert!(
        (got - want).abs() <= tol,
        "{what}: got {got}, want {want} (tolerance {tol:e})"
    );
}

/// Asserts that the number 10^`log10_got`, rounded to the `digits` significant digits a
/// source quotes, is the published value: agreement to half a unit in the last digit.
pub fn assert_published(what: &str, log10_got: f64, published: f64, digits: i32) {
    let got = 10f64.powf(log10_got);
    let unit = 10f64.powi(published.abs().log10().floor() as i32 - digits + 1);
    assert!(
        (got - published).abs() <= 0.5 * unit * (1.0 + 1e-9),
        "{what}: got {got:e}, published {published:e} ({digits} digits)"
    );
}

/// The data rows of a reference table under `tests/fixtures/`: comment lines (`#`, which
/// name the source) and the column header are skipped.
pub fn table_rows(text: &str) -> Vec<&str> {
    text.lines()
        .filter(|l| !l.starts_with('#'))
        .skip(1)
        .collect()
}
