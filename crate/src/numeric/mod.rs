//! Numerical tools the models share: the normal distribution in logarithms and root finding.

pub mod batch;
pub mod normal;
pub mod random;
pub mod solve;
pub mod special;

/// `10^x` as `exp(x ln 10)`: several times faster than `powf` in WebAssembly, whose `pow`
/// is a software routine. The rounding of `x ln 10` makes the relative error at most
/// about `|x| 2.6e-16` (8e-14 at the edge of the `f64` range), for sums whose result is
/// computed again in logarithms where it is reported.
pub fn exp10(x: f64) -> f64 {
    (x * std::f64::consts::LN_10).exp()
}
