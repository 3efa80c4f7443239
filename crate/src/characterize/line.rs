//! Straight-line least squares with the standard errors and Student-t intervals that the
//! delay-sweep and comparator-sweep fits report.

use crate::numeric::special::t_quantile;

/// A fitted line `y = intercept + slope x` with its uncertainties.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Line {
    /// The intercept.
    pub intercept: f64,
    /// The slope.
    pub slope: f64,
    /// Variance of the intercept.
    pub var_intercept: f64,
    /// Variance of the slope.
    pub var_slope: f64,
    /// Covariance of intercept and slope.
    pub cov: f64,
    /// Residual standard deviation, `sqrt(SSE / (n - 2))`.
    pub spread: f64,
    /// Degrees of freedom, n - 2.
    pub df: usize,
    /// The residual sum of squares.
    pub sse: f64,
}

/// An interval end that a fit can give only when it is a positive, normal number no
/// larger than 1e300 (a time constant below zero, or a voltage of 1e300 V, is no bound at
/// all: the data do not bound the value on that side).
pub fn bound(v: f64) -> Option<f64> {
    Some(v).filter(|v| v.is_normal() && *v > 0.0 && *v <= 1e300)
}

impl Line {
    /// The two-sided 95 % Student-t multiplier for this line's degrees of freedom.
    pub fn t95(&self) -> f64 {
        t_quantile(0.975, self.df as f64)
    }
}

/// Least squares of `y` on `x` (at least two distinct x).
///
/// # References
/// Draper and Smith, "Applied Regression Analysis", 3rd ed., Wiley 1998, chapter 1.
pub fn fit(x: &[f64], y: &[f64]) -> Option<Line> {
    let n = x.len() as f64;
    if x.len() < 2 || x.len() != y.len() {
        return None;
    }
    let mx = x.iter().sum::<f64>() / n;
    let my = y.iter().sum::<f64>() / n;
    let sxx: f64 = x.iter().map(|v| (v - mx).powi(2)).sum();
    if sxx <= 0.0 || sxx.is_nan() {
        return None;
    }
    let sxy: f64 = x.iter().zip(y).map(|(a, b)| (a - mx) * (b - my)).sum();
    let slope = sxy / sxx;
    let intercept = my - slope * mx;
    let sse: f64 = x
        .iter()
        .zip(y)
        .map(|(a, b)| (b - intercept - slope * a).powi(2))
        .sum();
    let df = x.len() - 2;
    let s2 = if df > 0 { sse / df as f64 } else { 0.0 };
    Some(Line {
        intercept,
        slope,
        var_slope: s2 / sxx,
        var_intercept: s2 * (1.0 / n + mx * mx / sxx),
        cov: -s2 * mx / sxx,
        spread: s2.sqrt(),
        df,
        sse,
    })
}
