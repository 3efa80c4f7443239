//! The one tolerance policy of the test suite: every tolerance a test uses is named here,
//! with its reason.
//!
//! - `LOG10_REL`: log10 results against 50-digit mpmath values. An f64 carries about
//!   16 significant digits; log10 MTBF reaches 1e7 in the extreme cases, so an
//!   absolute tolerance would be meaningless there: the bound is relative to
//!   max(1, |value|) and leaves three digits for the handful of roundings on the way.
//! - Published worked examples are checked to half a unit in the last digit they print
//!   (`assert_published`, `assert_quoted`), never to more digits than the source gives.
//! - `SOLVER_LOG10_ABS`: bisection and closed-form solvers must land on the target
//!   to this many decades.
//!
//! The library's unit tests use this same module; the browser tests name their two
//! tolerances in `tests/browser/harness.mjs`.

/// Relative tolerance on log10 values against high-precision references.
pub const LOG10_REL: f64 = 1e-12;
/// Absolute tolerance, in decades, of solver results against their target.
pub const SOLVER_LOG10_ABS: f64 = 1e-6;
/// Relative tolerance for a value that takes one or two f64 operations from its inputs
/// (a product, a quotient, a sum of two times): a few units in the last place.
pub const ARITH_REL: f64 = 1e-15;
/// Relative tolerance between two f64 formulations of the same quantity whose inputs
/// are exact (a CDF difference against its density form, a closed form against the
/// model): each loses a few digits to cancellation or to `exp`/`ln` of large arguments.
pub const F64_REL: f64 = 1e-12;
/// Absolute tolerance on natural logarithms of magnitude up to about 1000 (ln of a
/// probability of 1e-400): 1e-12 relative of 1000.
pub const LN_ABS: f64 = 1e-9;
/// Decades by which a monotonicity comparison may fail from rounding alone: log10 rates
/// up to about 1e6 in magnitude, each carrying about 1e-15 relative error.
pub const ROUNDING_LOG10_ABS: f64 = 1e-9;
/// Relative tolerance for values tabulated to ten significant digits (Abramowitz &
/// Stegun, Table 26.1): half a unit in the tenth digit.
pub const TABLE10_REL: f64 = 5e-10;

/// Asserts that `got` is within `LOG10_REL` of `want` (relative to max(1, |want|)).
pub fn assert_log10(what: &str, got: f64, want: f64) {
    let tol = LOG10_REL * want.abs().max(1.0);
    assert!(
        (got - want).abs() <= tol,
        "{what}: got {got}, want {want} (tolerance {tol:e})"
    );
}

/// Asserts that `got` equals `want` to `rel` relative error.
pub fn assert_rel(what: &str, got: f64, want: f64, rel: f64) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "{what}: got {got:e}, want {want:e} (relative tolerance {rel:e})"
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

/// Asserts that `got` agrees with a value quoted as the decimal text `quoted` to half a
/// unit in its last printed digit (`"-2173.87149"` allows 5e-6).
pub fn assert_quoted(what: &str, got: f64, quoted: &str) {
    let want: f64 = quoted.parse().unwrap_or(f64::NAN);
    let decimals = quoted.split_once('.').map_or(0, |(_, f)| f.len()) as i32;
    let tol = 0.5 * 10f64.powi(-decimals) * (1.0 + 1e-9);
    assert!(
        (got - want).abs() <= tol,
        "{what}: got {got}, quoted {quoted} (tolerance {tol:e})"
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

/// How close to the clock ceiling (where the hop time runs out) the clock solver's top
/// answer sits: it stops 1e-12 below it, after an `exp(ln)` round trip.
pub const CEILING_REL: f64 = 1e-9;

/// Relative tolerance of a midpoint sum of a smooth periodic function over one period
/// with thousands of points: such sums converge exponentially, far below this bound.
#[allow(dead_code)] // Used by the library's unit tests (crate/src/synchronizer/clocks.rs).
pub const QUADRATURE_REL: f64 = 1e-9;

/// How many standard errors a sample statistic of a seeded simulation may stray from its
/// expectation: five makes a false alarm a one-in-a-million event.
#[allow(dead_code)] // Used by the library's unit tests and the coverage tests.
pub const SAMPLE_SIGMAS: f64 = 5.0;

/// Relative tolerance of fitted estimates and interval ends against the independent
/// mpmath fit: the interval ends are roots of a likelihood difference that is flat near
/// them, which f64 arithmetic places to about 1e-8 relative.
#[allow(dead_code)] // Used by the fit tests.
pub const FIT_REL: f64 = 1e-6;
