//! Failure counting: tau and the window from counts of unresolved samples at several
//! resolution times, by Poisson maximum likelihood with profile-likelihood intervals.
//!
//! Model (domain notes section 4): the expected count of row i is
//! `mu_i = duration_i fclk fdata w exp(-tr_i / tau)`, log-linear in `a = ln w` and
//! `b = 1/tau`. Rows with no failures carry information and are used as they are.

use std::f64::consts::LN_10;

use crate::numeric::normal::{ln_sum_exp, ln_sum_exp_of};
use crate::numeric::solve::illinois;
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
    total.ln() - ln_sum_exp_of(d.tr.iter().zip(o).map(|(t, o)| -b * t + o))
}

/// The best `b` for a given `a`: the root of `sum t exp(a - b t + o) = sum k t`, by
/// Newton's method on its logarithm `h(b) = ln sum t exp(a - b t + o) - ln sum k t`, from
/// `b0` (the fit's own b: the root moves little as a moves). `h` falls and is convex
/// (its slope is minus the weighted mean of t, which falls with b), so every step after
/// the first approaches the root from below without passing it.
fn best_b(d: &Counts, o: &[f64], ln_t: &[f64], a: f64, b0: f64) -> f64 {
    let target: f64 = d.tr.iter().zip(&d.failures).map(|(t, k)| t * k).sum();
    let ln_target = target.ln();
    let mut b = b0;
    for _ in 0..100 {
        // ln sum t w and ln sum t^2 w, w = exp(a - b t + o), in logs.
        let (m1, m2) = log_moments(d, o, ln_t, a, b);
        let h = m1 - ln_target;
        let slope = -(m2 - m1).exp();
        let step = h / slope;
        if !step.is_finite() {
            break;
        }
        b -= step;
        if step.abs() <= 4.0 * f64::EPSILON * b.abs() {
            break;
        }
    }
    b
}

/// `ln sum t w` and `ln sum t^2 w` over the rows with t > 0, w = exp(a - b t + o), given
/// `ln_t` (ln t of each row, -inf at t = 0).
fn log_moments(d: &Counts, o: &[f64], ln_t: &[f64], a: f64, b: f64) -> (f64, f64) {
    let exponent = |(t, (o, l)): (&f64, (&f64, &f64))| l + a - b * t + o;
    let rows = || d.tr.iter().zip(o.iter().zip(ln_t));
    let max = rows().map(exponent).fold(f64::NEG_INFINITY, f64::max);
    let (mut s1, mut s2) = (0.0, 0.0);
    for row in rows() {
        let w = (exponent(row) - max).exp();
        s1 += w;
        s2 += w * row.0;
    }
    (max + s1.ln(), max + s2.ln())
}

/// Where a rising `f` (negative at `lo`) crosses zero in `[lo, hi]`: the low end of the
/// bracket at full precision (`None` when `f` never reaches zero there). The search
/// starts at `lo + step` (a guess of the distance, from the curvature at the peak) and
/// doubles the step until it passes the root, so the root finder works on a bracket a
/// few guesses wide rather than the whole range.
fn crossing(lo: f64, hi: f64, step: f64, f: impl Fn(f64) -> f64) -> Option<f64> {
    let mut step = if step.is_finite() && step > 0.0 {
        step
    } else {
        hi - lo
    };
    let (mut from, mut to) = (lo, (lo + step).min(hi));
    while f(to) <= 0.0 {
        if to >= hi {
            return None;
        }
        from = to;
        step *= 2.0;
        to = (to + step).min(hi);
    }
    // 1e-10 relative: far inside the intervals' own precision (the likelihood is flat
    // there, see the fit tests' tolerance) at half the evaluations of full precision.
    let tol = 1e-10 * from.abs().max(to.abs());
    Some(illinois(from, to, tol, 200, &f))
}

/// The rows merged by resolution time: for each distinct tr (ascending), the failures
/// summed and the offset `ln sum exp(o_i)` of its rows. The likelihood differs from the
/// rows' own by a constant (`sum k_i o_i` against `sum K_t o_t`), so the estimates and
/// the profile intervals are the same, at a cost of the distinct tr, not the rows.
fn grouped(d: &Counts, o: &[f64]) -> (Counts, Vec<f64>) {
    let mut order: Vec<usize> = (0..d.tr.len()).collect();
    order.sort_by(|&i, &j| d.tr[i].total_cmp(&d.tr[j]));
    let mut g = Counts {
        tr: Vec::new(),
        failures: Vec::new(),
        duration: Vec::new(),
    };
    let mut offsets: Vec<f64> = Vec::new();
    let mut run: Vec<f64> = Vec::new();
    for (n, &i) in order.iter().enumerate() {
        if g.tr.last() != Some(&d.tr[i]) {
            g.tr.push(d.tr[i]);
            g.failures.push(0.0);
            g.duration.push(0.0);
        }
        let last = g.failures.len() - 1;
        g.failures[last] += d.failures[i];
        g.duration[last] += d.duration[i];
        run.push(o[i]);
        if order.get(n + 1).map_or(true, |&j| d.tr[j] != d.tr[i]) {
            offsets.push(ln_sum_exp(&run));
            run.clear();
        }
    }
    (g, offsets)
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
    let rows_o = offsets(d, fclk, fdata);
    let (rows, (d, o)) = (d, grouped(d, &rows_o));
    let d = &d;
    let k_mean: f64 =
        d.tr.iter()
            .zip(&d.failures)
            .map(|(t, k)| t * k)
            .sum::<f64>()
            / total;
    if k_mean <= tmin * (1.0 + 1e-12) {
        return Err(CountsProblem::AllAtShortest(tmin));
    }
    // The mean and variance of tr under weights exp(-b tr + o), in logs.
    let w_moments = |b: f64| {
        let max =
            d.tr.iter()
                .zip(&o)
                .map(|(t, o)| -b * t + o)
                .fold(f64::NEG_INFINITY, f64::max);
        let (mut s0, mut s1, mut s2) = (0.0, 0.0, 0.0);
        for (t, o) in d.tr.iter().zip(&o) {
            let w = (-b * t + o - max).exp();
            s0 += w;
            s1 += w * t;
            s2 += w * t * t;
        }
        let mean = s1 / s0;
        (mean, (s2 / s0 - mean * mean).max(0.0))
    };
    if w_moments(0.0).0 <= k_mean {
        return Err(CountsProblem::NotFalling);
    }
    // The weighted mean falls with b (its slope is minus the weighted variance): find
    // where it meets the failure-weighted mean by Newton's method kept inside a bracket
    // that every step narrows (bisecting where a Newton step would leave it).
    let (mut lo, mut hi) = (0.0, 1e4 / span);
    let mut b = 1.0 / span;
    for _ in 0..300 {
        let (mean, var) = w_moments(b);
        let f = mean - k_mean;
        if f > 0.0 {
            lo = b;
        } else {
            hi = b;
        }
        let newton = b + f / var;
        let next = if newton > lo && newton < hi && var > 0.0 {
            newton
        } else {
            0.5 * (lo + hi)
        };
        let done =
            (next - b).abs() <= 4.0 * f64::EPSILON * b.abs() || hi - lo <= 4.0 * f64::EPSILON * hi;
        b = next;
        if done {
            break;
        }
    }
    let a = best_a(d, &o, b);
    let peak = log_lik(d, &o, a, b);
    let profile_b = |bb: f64| log_lik(d, &o, best_a(d, &o, bb), bb);
    let ln_t: Vec<f64> = d.tr.iter().map(|t| t.ln()).collect();
    // Each best b starts from the last one found (the crossing's steps are near).
    let last_b = std::cell::Cell::new(b);
    let profile_a = |aa: f64| {
        let bb = best_b(d, &o, &ln_t, aa, last_b.get());
        if bb.is_finite() {
            last_b.set(bb);
        }
        log_lik(d, &o, aa, bb)
    };
    let drop_b = |bb: f64| peak - profile_b(bb) - HALF_CHI2_95;
    let drop_a = |aa: f64| peak - profile_a(aa) - HALF_CHI2_95;
    // Standard errors from the observed information at the peak, the first guesses of
    // each interval end's distance (the profile falls by 1.92 about 1.96 of them away).
    let (mut i_aa, mut i_ab, mut i_bb) = (0.0, 0.0, 0.0);
    for (t, o) in d.tr.iter().zip(&o) {
        let mu = (a - b * t + o).exp();
        i_aa += mu;
        i_ab += mu * t;
        i_bb += mu * t * t;
    }
    let det = i_aa * i_bb - i_ab * i_ab;
    let (se_a, se_b) = ((i_bb / det).sqrt(), (i_aa / det).sqrt());
    // b's interval: below b (towards 0, in -ln b) and above; None where the drop never
    // comes.
    let b_lo = crossing(-(b.ln()), -(1e-9 * b).ln(), 1.5 * se_b / b, |x| {
        drop_b((-x).exp())
    })
    .map(|x| (-x).exp());
    let b_hi = crossing(b, 1e4 / span, 1.5 * se_b, drop_b);
    // a's interval: the profile falls within a few tens of nepers on either side.
    let reach = 60.0;
    let a_lo = crossing(-a, -(a - reach), 1.5 * se_a, |x| drop_a(-x)).map(|x| -x);
    let a_hi = crossing(a, a + reach, 1.5 * se_a, drop_a);
    let d = rows;
    // Each row's expected count, and its unit deviance from ln mu (a count far below the
    // f64 range has a finite log, where k ln(k / mu) would be infinite).
    let ln_mu: Vec<f64> =
        d.tr.iter()
            .zip(&rows_o)
            .map(|(t, o)| a - b * t + o)
            .collect();
    let expected: Vec<f64> = ln_mu.iter().map(|l| l.exp()).collect();
    let unit: Vec<f64> = d
        .failures
        .iter()
        .zip(ln_mu.iter().zip(&expected))
        .map(|(k, (l, mu))| {
            let term = if *k > 0.0 { k * (k.ln() - l) } else { 0.0 };
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
    // The rate law per data edge: one edge per second.
    crate::crossing::log10_rate(1.0, fclk, fit.window.log10(), 0.0, tr / (fit.tau * LN_10))
}
