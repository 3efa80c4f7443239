//! Failure counting: tau and the window from counts of unresolved samples at several
//! resolution times, by Poisson maximum likelihood with profile-likelihood intervals.
//!
//! Model (domain notes section 4): the expected count of row i is
//! `mu_i = duration_i fclk fdata w exp(-tr_i / tau)`, log-linear in `a = ln w` and
//! `b = 1/tau`. Rows with no failures carry information and are used as they are.

use std::f64::consts::LN_10;

use crate::numeric::normal::ln_sum_exp;
use crate::numeric::solve::bisect_last;
use crate::numeric::special::chi2_sf;

/// Half the 95 % point of chi-squared with one degree of freedom: the drop of the log
/// likelihood that bounds a profile-likelihood 95 % interval.
pub const HALF_CHI2_95: f64 = 1.920_729_410_347_062;

/// The rows of a counting experiment.
#[derive(Debug, Clone, PartialEq)]
pub struct Counts {
    /// Resolution time of each row, s.
    pub tr: Vec<f64>,
    /// Failures counted in each row (whole numbers, zero allowed).
    pub failures: Vec<f64>,
    /// How long each row counted, s.
    pub duration: Vec<f64>,
}

/// An interval; a side is `None` when the likelihood never falls far enough there.
pub type Interval = (Option<f64>, Option<f64>);

/// The fit of a counting experiment.
#[derive(Debug, Clone, PartialEq)]
pub struct CountsFit {
    /// Maximum-likelihood tau, s.
    pub tau: f64,
    /// Its 95 % profile-likelihood interval.
    pub tau_ci: Interval,
    /// Maximum-likelihood window (tw, or t0 when tr counts from the clock edge), s.
    pub window: f64,
    /// Its 95 % profile-likelihood interval.
    pub window_ci: Interval,
    /// The deviance against the saturated model.
    pub deviance: f64,
    /// Its degrees of freedom, rows - 2.
    pub df: usize,
    /// The goodness-of-fit p-value (chi-squared upper tail), when df > 0.
    pub p_value: Option<f64>,
    /// Expected count of each row at the fit.
    pub expected: Vec<f64>,
    /// Deviance residual of each row.
    pub residuals: Vec<f64>,
}

/// Why counts cannot be fitted.
#[derive(Debug, Clone, PartialEq)]
pub enum CountsProblem {
    /// Every row has the same resolution time.
    OneResolutionTime(f64),
    /// No failures at all; at 95 % the failure probability per data edge at the longest
    /// resolution time is below this bound.
    NoFailures {
        /// The longest resolution time, s.
        tr: f64,
        /// The 95 % upper bound on fclk w exp(-tr/tau) there.
        bound: f64,
    },
    /// The counts do not fall as the resolution time grows.
    NotFalling,
    /// Every failure is at the shortest resolution time: tau is below what the rows resolve.
    AllAtShortest(f64),
}

impl CountsProblem {
    /// The message for the user.
    pub fn message(&self) -> String {
        use crate::units::{format_si, format_sig};
        match self {
            CountsProblem::OneResolutionTime(t) => format!(
                "every row has tr = {}: tau and the window need counts at two or more \
                 resolution times",
                format_si(*t, "s")
            ),
            CountsProblem::NoFailures { tr, bound } => format!(
                "no failures were counted, so tau and the window cannot be fitted; at 95 % \
                 the data do bound the failure probability per data edge at tr = {} below {} \
                 (3.0 over the data edges observed)",
                format_si(*tr, "s"),
                format_sig(*bound, 3)
            ),
            CountsProblem::NotFalling => "the counts do not fall as tr grows: check that the \
                 columns hold what their names say"
                .to_string(),
            CountsProblem::AllAtShortest(t) => format!(
                "every failure is at the shortest tr ({}): tau is too small for these \
                 resolution times to measure; add rows at shorter tr",
                format_si(*t, "s")
            ),
        }
    }
}

/// Offsets `ln(duration fclk fdata)` of each row.
fn offsets(d: &Counts, fclk: f64, fdata: f64) -> Vec<f64> {
    d.duration.iter().map(|x| (x * fclk * fdata).ln()).collect()
}

/// The log likelihood (without the constant `ln k!` terms) at `a = ln w`, `b = 1/tau`.
fn log_lik(d: &Counts, o: &[f64], a: f64, b: f64) -> f64 {
    d.tr.iter()
        .zip(&d.failures)
        .zip(o)
        .map(|((t, k), o)| {
            let eta = a - b * t + o;
            k * eta - eta.exp()
        })
        .sum()
}

/// The best `a` for a given `b`: `a = ln(sum k / sum exp(-b t + o))`.
fn best_a(d: &Counts, o: &[f64], b: f64) -> f64 {
    let total: f64 = d.failures.iter().sum();
    let terms: Vec<f64> = d.tr.iter().zip(o).map(|(t, o)| -b * t + o).collect();
    total.ln() - ln_sum_exp(&terms)
}

/// The best `b` for a given `a`: the root of `sum t exp(a - b t + o) = sum k t`.
fn best_b(d: &Counts, o: &[f64], a: f64, span: f64) -> f64 {
    let target: f64 = d.tr.iter().zip(&d.failures).map(|(t, k)| t * k).sum();
    let excess = |b: f64| -> f64 {
        d.tr.iter()
            .zip(o)
            .map(|(t, o)| t * (a - b * t + o).exp())
            .sum::<f64>()
            - target
    };
    // The left side falls with b; search b over a wide bracket around the data's scale.
    bisect_last(-50.0 / span, 1e4 / span, 0.0, 300, |b| excess(b) >= 0.0)
}

/// Fits tau and the window to failure counts.
///
/// # Formula
/// The profile likelihood of b = 1/tau (a maximised out in closed form) peaks where the
/// exp(-b tr + offset)-weighted mean of tr equals the failure-weighted mean; 95 %
/// intervals are where the profile falls by chi-squared(1, 0.95)/2 = 1.9207.
///
/// # Errors
/// A [`CountsProblem`] when the data cannot identify both parameters.
///
/// # References
/// McCullagh and Nelder, "Generalized Linear Models", 2nd ed., Chapman & Hall 1989
/// (Poisson log-linear models, deviance); Venzon and Moolgavkar, "A Method for Computing
/// Profile-Likelihood-Based Confidence Intervals", Applied Statistics 37, 1988.
pub fn fit(d: &Counts, fclk: f64, fdata: f64) -> Result<CountsFit, CountsProblem> {
    let (tmin, tmax) =
        d.tr.iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), t| {
                (lo.min(*t), hi.max(*t))
            });
    let total: f64 = d.failures.iter().sum();
    if total <= 0.0 {
        let edges: f64 = d.duration.iter().map(|x| x * fdata).sum();
        return Err(CountsProblem::NoFailures {
            tr: tmax,
            // A Poisson count of zero bounds its mean below -ln 0.05 = 3.0 at 95 %.
            bound: -(0.05f64.ln()) / edges,
        });
    }
    if tmax <= tmin {
        return Err(CountsProblem::OneResolutionTime(tmin));
    }
    let span = tmax - tmin;
    let o = offsets(d, fclk, fdata);
    let k_mean: f64 =
        d.tr.iter()
            .zip(&d.failures)
            .map(|(t, k)| t * k)
            .sum::<f64>()
            / total;
    if k_mean <= tmin * (1.0 + 1e-12) {
        return Err(CountsProblem::AllAtShortest(tmin));
    }
    // The weighted mean of tr under weights exp(-b tr + o), in logs.
    let w_mean = |b: f64| {
        let ln_w: Vec<f64> = d.tr.iter().zip(&o).map(|(t, o)| -b * t + o).collect();
        let norm = ln_sum_exp(&ln_w);
        d.tr.iter()
            .zip(&ln_w)
            .map(|(t, l)| t * (l - norm).exp())
            .sum::<f64>()
    };
    if w_mean(0.0) <= k_mean {
        return Err(CountsProblem::NotFalling);
    }
    // w_mean falls with b: find where it meets the failure-weighted mean.
    let b = bisect_last(0.0, 1e4 / span, 0.0, 300, |b| w_mean(b) >= k_mean);
    let a = best_a(d, &o, b);
    let peak = log_lik(d, &o, a, b);
    let profile_b = |bb: f64| log_lik(d, &o, best_a(d, &o, bb), bb);
    let profile_a = |aa: f64| log_lik(d, &o, aa, best_b(d, &o, aa, span));
    let inside_b = |bb: f64| peak - profile_b(bb) <= HALF_CHI2_95;
    let inside_a = |aa: f64| peak - profile_a(aa) <= HALF_CHI2_95;
    // b's interval: below b (towards 0) and above; None where the drop never comes.
    let b_lo = (!inside_b(1e-9 * b)).then(|| {
        let x = bisect_last(-(b.ln()), -(1e-9 * b).ln(), 1e-12, 200, |x| {
            inside_b((-x).exp())
        });
        (-x).exp()
    });
    let b_hi = (!inside_b(1e4 / span)).then(|| bisect_last(b, 1e4 / span, 0.0, 200, inside_b));
    // a's interval: the profile falls within a few tens of nepers on either side.
    let reach = 60.0;
    let a_lo =
        (!inside_a(a - reach)).then(|| -bisect_last(-a, -(a - reach), 0.0, 200, |x| inside_a(-x)));
    let a_hi = (!inside_a(a + reach)).then(|| bisect_last(a, a + reach, 0.0, 200, inside_a));
    let expected: Vec<f64> =
        d.tr.iter()
            .zip(&o)
            .map(|(t, o)| (a - b * t + o).exp())
            .collect();
    let unit: Vec<f64> = d
        .failures
        .iter()
        .zip(&expected)
        .map(|(k, mu)| {
            let term = if *k > 0.0 { k * (k / mu).ln() } else { 0.0 };
            2.0 * (term - (k - mu))
        })
        .collect();
    let deviance: f64 = unit.iter().sum::<f64>().max(0.0);
    let residuals = unit
        .iter()
        .zip(d.failures.iter().zip(&expected))
        .map(|(u, (k, mu))| u.max(0.0).sqrt().copysign(k - mu))
        .collect();
    let df = d.tr.len().saturating_sub(2);
    Ok(CountsFit {
        tau: 1.0 / b,
        // tau = 1/b: the interval's ends swap.
        tau_ci: (b_hi.map(|x| 1.0 / x), b_lo.map(|x| 1.0 / x)),
        window: a.exp(),
        window_ci: (a_lo.map(f64::exp), a_hi.map(f64::exp)),
        deviance,
        df,
        p_value: (df > 0).then(|| chi2_sf(deviance, df as f64)),
        expected,
        residuals,
    })
}

/// log10 of the failure probability per data edge the fit gives at `tr`: `fclk w e^(-tr/tau)`.
pub fn log10_per_edge(fit: &CountsFit, fclk: f64, tr: f64) -> f64 {
    (fclk * fit.window).log10() - tr / (fit.tau * LN_10)
}
