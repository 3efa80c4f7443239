//! Failure counting: tau and the window from counts of unresolved samples at several
//! resolution times, by Poisson maximum likelihood with profile-likelihood intervals.
//!
//! Model (domain notes section 4): the expected count of row i is
//! `mu_i = duration_i fclk fdata w exp(-tr_i / tau)`, log-linear in `a = ln w` and
//! `b = 1/tau`. Rows with no failures carry information and are used as they are.

use std::f64::consts::LN_10;

use crate::numeric::batch::exp_nonpositive;
use crate::numeric::normal::{ln_sum_exp, ln_sum_exp_of};
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
    /// Standard deviation of ln tau, from the observed information at the peak.
    pub sd_ln_tau: f64,
    /// Standard deviation of ln of the window, likewise.
    pub sd_ln_window: f64,
    /// Correlation of ln tau and ln of the window, likewise.
    pub corr: f64,
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
    /// The counts fall too little to tell from flat: tau is unbounded above at 95 %, and
    /// at least this, s.
    NotSignificantlyFalling(Option<f64>),
    /// Every failure is at the shortest resolution time: tau is below what the rows resolve.
    AllAtShortest(f64),
    /// The window the counts imply is beyond any time a number holds (its log10, s): the
    /// counts do not follow one exponential in tr.
    WindowBeyondRange(f64),
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
            CountsProblem::NotSignificantlyFalling(lo) => format!(
                "the counts do not fall significantly as tr grows: at 95 % the data bound tau \
                 only from below{}, not from above, so no estimate of tau or the window is \
                 given; count at longer tr, or for longer, until the counts fall",
                lo.map_or(String::new(), |t| format!(
                    " (tau above {})",
                    format_si(t, "s")
                ))
            ),
            CountsProblem::WindowBeyondRange(log10_w) => format!(
                "the counts imply a window of 10^{log10_w:.0} s, beyond any time: they do \
                 not fall as one exponential in tr (rows with more failures than data \
                 edges, or counts that rise again at long tr, do this); check the rows and \
                 their units"
            ),
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

/// The sums of one pass over the (grouped) rows at `b`, scaled by `exp(-max)`:
/// `S_j = sum t^j exp(-b t + o - max)` for j = 0, 1, 2, with `max` the largest exponent.
struct Sums {
    max: f64,
    s0: f64,
    s1: f64,
    s2: f64,
}

fn sums(d: &Counts, o: &[f64], b: f64) -> Sums {
    // The largest exponent (the offsets and tr are finite).
    let mut top = [f64::NEG_INFINITY; 4];
    in_lanes(&d.tr, o, |l, t, o| {
        let v = -b * t + o;
        top[l] = if v > top[l] { v } else { top[l] };
    });
    let max = top.into_iter().fold(f64::NEG_INFINITY, f64::max);
    let mut acc = [[0.0f64; 4]; 3];
    in_lanes(&d.tr, o, |l, t, o| {
        let w = exp_nonpositive(-b * t + o - max);
        acc[0][l] += w;
        acc[1][l] += w * t;
        acc[2][l] += w * t * t;
    });
    let [s0, s1, s2] = acc.map(|a| (a[0] + a[1]) + (a[2] + a[3]));
    Sums { max, s0, s1, s2 }
}

/// Calls `f(lane, tr, offset)` for every row, the rows dealt to four lanes in turn, so that
/// a pass keeping one partial result per lane compiles to vector instructions (a single
/// running sum would fix the order of the additions and keep it scalar).
#[inline(always)]
fn in_lanes(tr: &[f64], o: &[f64], mut f: impl FnMut(usize, f64, f64)) {
    let (tc, oc) = (tr.chunks_exact(4), o.chunks_exact(4));
    let (t_rest, o_rest) = (tc.remainder(), oc.remainder());
    for (t, o) in tc.zip(oc) {
        for l in 0..4 {
            f(l, t[l], o[l]);
        }
    }
    for (l, (t, o)) in t_rest.iter().zip(o_rest).enumerate() {
        f(l, *t, *o);
    }
}

/// Where a rising `f` (negative at `lo`) crosses zero in `[lo, hi]`, `f` giving its value
/// and slope: first a bracket (from `lo + step`, a guess of the
/// distance from the curvature at the peak, doubling the step until it passes the root),
/// then Newton's method kept inside the bracket (bisecting
/// where a step would leave it), which needs a few evaluations where the Illinois method
/// needs a dozen; each evaluation is a pass over every row.
fn crossing_newton(lo: f64, hi: f64, step: f64, f: impl Fn(f64) -> (f64, f64)) -> Option<f64> {
    let step = if step.is_finite() && step > 0.0 {
        step
    } else {
        hi - lo
    };
    // The bracket: f < 0 at `from`; f > 0 at `to` once one is found (until then `to` is
    // `hi`, not yet evaluated).
    let (mut from, mut to, mut found) = (lo, hi, false);
    let mut x = (lo + step).min(hi);
    for _ in 0..200 {
        let (v, slope) = f(x);
        if v > 0.0 {
            to = x;
            found = true;
        } else {
            from = x;
            if x >= hi {
                return None;
            }
        }
        let tol = 1e-10 * from.abs().max(to.abs());
        if v == 0.0 || (found && to - from <= tol) {
            return Some(x);
        }
        let newton = x - v / slope;
        let next = if newton > from && newton < to && newton.is_finite() {
            newton
        } else if found {
            0.5 * (from + to)
        } else {
            // No root seen yet and Newton points past the end: try further out.
            (x + 2.0 * (x - lo).max(step)).min(hi)
        };
        // As the Illinois form did: 1e-10 relative, far inside the intervals' own
        // precision (the likelihood is flat there). A Newton step below 1e-4 of the first
        // guess of the distance (about one standard error) is taken as the last: Newton's
        // method converges quadratically, so the end is then within about 1e-8 standard
        // errors, whatever the coordinate, without one more pass over the rows.
        if ((next - x).abs() <= tol && found) || (next == newton && (next - x).abs() <= 1e-4 * step)
        {
            return Some(next);
        }
        x = next;
    }
    found.then_some(x)
}

/// The rows merged by resolution time: for each distinct tr (ascending), the failures
/// summed and the offset `ln sum exp(o_i)` of its rows. The likelihood differs from the
/// rows' own by a constant (`sum k_i o_i` against `sum K_t o_t`), so the estimates and
/// the profile intervals are the same, at a cost of the distinct tr, not the rows.
fn grouped(d: &Counts, o: &[f64]) -> (Counts, Vec<f64>) {
    // The order within equal tr is immaterial (their offsets are summed). Rows already in
    // order (a sweep as a tester writes it) are taken as they are; otherwise each row's
    // key is sorted with its index beside it (the integer form of `f64::total_cmp`, so
    // the sort compares integers in one array, not rows through an index).
    let order: Vec<usize> = if d.tr.windows(2).all(|w| w[0] <= w[1]) {
        (0..d.tr.len()).collect()
    } else {
        let mut keyed: Vec<(u64, usize)> =
            d.tr.iter()
                .enumerate()
                .map(|(i, t)| {
                    let bits = t.to_bits();
                    // Negative values' bits reversed, and the sign flipped: ascending as
                    // total_cmp orders.
                    let key = if bits >> 63 == 1 {
                        !bits
                    } else {
                        bits | (1 << 63)
                    };
                    (key, i)
                })
                .collect();
        keyed.sort_unstable();
        keyed.into_iter().map(|(_, i)| i).collect()
    };
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
            // One row (every row, where each tr is its own): its offset as it is.
            offsets.push(if run.len() == 1 {
                run[0]
            } else {
                ln_sum_exp(&run)
            });
            run.clear();
        }
    }
    (g, offsets)
}

/// A first guess of b = 1/tau without a pass of exponentials: the failure rates per unit
/// of exposure (duration) of the shorter and the longer half of the (grouped, ascending)
/// resolution times, and their exposure-weighted mean tr, `b = ln(rate_short /
/// rate_long) / (mean_long - mean_short)`. None where a half has no failures.
fn start_b(d: &Counts) -> Option<f64> {
    let h = d.tr.len() / 2;
    let half = |r: std::ops::Range<usize>| {
        let (mut k, mut e, mut et) = (0.0, 0.0, 0.0);
        for i in r {
            k += d.failures[i];
            e += d.duration[i];
            et += d.duration[i] * d.tr[i];
        }
        (k / e, et / e)
    };
    let ((r0, t0), (r1, t1)) = (half(0..h), half(h..d.tr.len()));
    let b = (r0 / r1).ln() / (t1 - t0);
    (b.is_finite() && b > 0.0).then_some(b)
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
        let m = sums(d, &o, b);
        let mean = m.s1 / m.s0;
        (mean, (m.s2 / m.s0 - mean * mean).max(0.0))
    };
    if w_moments(0.0).0 <= k_mean {
        return Err(CountsProblem::NotFalling);
    }
    // The weighted mean falls with b (its slope is minus the weighted variance) towards
    // the shortest tr, roughly as 1/b once the weights are steep: so Newton's method works
    // on g = ln(mean - tmin) - ln(k_mean - tmin) in x = ln b, nearly a straight line there
    // (dg/dx = -b var / (mean - tmin)), kept inside a bracket that every step narrows
    // (bisecting where a step would leave it).
    // The bracket's top starts where exp(-b span) is e^-10000. A root beyond it (tr spread
    // over many decades puts it far beyond 1/span) leaves the search at the top: the top
    // then grows a thousandfold and the search runs again, until the root is inside. The
    // mean tends to tmin, below k_mean, as b grows, so the growth ends; b tr stays finite.
    let b_most = (1e300 / tmax).min(f64::MAX);
    let ln_target = (k_mean - tmin).ln();
    let solve = |top: f64| {
        let (mut lo, mut hi) = (0.0, top);
        let mut b = start_b(d)
            .filter(|x| *x > lo && *x < hi)
            .unwrap_or((1.0 / span).min(0.5 * hi));
        for _ in 0..300 {
            let (mean, var) = w_moments(b);
            if mean > k_mean {
                lo = b;
            } else {
                hi = b;
            }
            let above = mean - tmin;
            let g = above.ln() - ln_target;
            let slope = -b * var / above;
            let newton = b * (-g / slope).exp();
            // Converged: Newton's method converges quadratically, so a step of 1e-10
            // relative leaves b within about 1e-20 of the root once taken (and a smaller
            // one may fall either side of the bracket's end that b itself is).
            if (newton - b).abs() <= 1e-10 * b && newton.is_finite() {
                return newton;
            }
            let next = if newton > lo && newton < hi && var > 0.0 && newton.is_finite() {
                newton
            } else {
                0.5 * (lo + hi)
            };
            let done = (next - b).abs() <= 4.0 * f64::EPSILON * b.abs()
                || hi - lo <= 4.0 * f64::EPSILON * hi;
            b = next;
            if done {
                break;
            }
        }
        b
    };
    let mut top = 1e4 / span;
    let b = loop {
        let b = solve(top);
        // Inside the bracket, or at a top where the mean has fallen below k_mean (the
        // root is there).
        if b < top * (1.0 - 1e-6) || w_moments(top).0 <= k_mean {
            break b;
        }
        if top >= b_most {
            return Err(CountsProblem::AllAtShortest(tmin));
        }
        top = (top * 1e3).min(b_most);
    };
    let a = best_a(d, &o, b);
    // A window beyond 1e300 s is no estimate (the invariant of every report): said, not
    // printed as a number or an infinity.
    if a > 1e300f64.ln() {
        return Err(CountsProblem::WindowBeyondRange(a / LN_10));
    }
    let peak = log_lik(d, &o, a, b);
    // The profile in b in one pass over the rows: at the best a the expected counts sum
    // to the failures, so log_lik = K a - b sum k t + sum k o - K, a = ln K - ln S0; its
    // slope in b is K S1/S0 - sum k t.
    let sum_kt: f64 = d.tr.iter().zip(&d.failures).map(|(t, k)| t * k).sum();
    let sum_ko: f64 = o.iter().zip(&d.failures).map(|(o, k)| o * k).sum();
    let profile_b = |bb: f64| {
        let m = sums(d, &o, bb);
        let aa = total.ln() - (m.max + m.s0.ln());
        (
            total * aa - bb * sum_kt + sum_ko - total,
            total * m.s1 / m.s0 - sum_kt,
        )
    };
    // The profile in a, traced by b: where b is best for a, sum t exp(a - b t + o) =
    // sum k t, so a = A(b) = ln sum k t - ln S1 (S1 scaled back), which rises with b (its
    // slope is S2/S1, the weighted mean of t); the profile there is V = K A - b sum k t +
    // sum k o - sum k t S0/S1, with slope (S2/S1)(K - sum k t S0/S1). One pass per point.
    let trace = |bb: f64| {
        let m = sums(d, &o, bb);
        let aa = sum_kt.ln() - (m.max + m.s1.ln());
        let ratio = m.s0 / m.s1;
        (
            aa,
            total * aa - bb * sum_kt + sum_ko - sum_kt * ratio,
            (m.s2 / m.s1) * (total - sum_kt * ratio),
        )
    };
    let drop_b = |bb: f64| {
        let (v, slope) = profile_b(bb);
        (peak - v - HALF_CHI2_95, -slope)
    };
    let drop_trace = |bb: f64| {
        let (_, v, slope) = trace(bb);
        (peak - v - HALF_CHI2_95, -slope)
    };
    // Standard errors from the observed information at the peak, the first guesses of
    // each interval end's distance (the profile falls by 1.92 about 1.96 of them away).
    // The information about b is taken about the expected counts' mean tr (c_bb, a sum
    // of squares, in one pass by West's weighted update), not as i_bb - i_ab^2 / i_aa,
    // whose difference of near-equal terms loses every digit when the expected counts sit
    // almost all at one tr: det = i_aa c_bb. Where they sit all at one tr, c_bb is 0 and
    // the errors are not computable (infinite: the report says so). D. H. D. West,
    // "Updating mean and variance estimates: an improved method", CACM 22(9), 1979.
    let (mut i_aa, mut t_bar, mut c_bb) = (0.0, 0.0, 0.0);
    for (t, o) in d.tr.iter().zip(&o) {
        let mu = (a - b * t + o).exp();
        if mu > 0.0 {
            i_aa += mu;
            let step = t - t_bar;
            t_bar += step * mu / i_aa;
            c_bb += mu * step * (t - t_bar);
        }
    }
    let i_ab = i_aa * t_bar;
    let i_bb = c_bb + i_aa * t_bar * t_bar;
    // var a = i_bb / det = 1/i_aa + t_bar^2 / c_bb, var b = i_aa / det = 1 / c_bb.
    let (se_a, se_b) = (
        (1.0 / i_aa + t_bar * t_bar / c_bb).sqrt(),
        (1.0 / c_bb).sqrt(),
    );
    // b's interval: below b (towards 0, in x = -ln b, where the slope in x is minus b
    // times the slope in b) and above; None where the drop never comes.
    let in_x = |g: &dyn Fn(f64) -> (f64, f64), x: f64| {
        let bb = (-x).exp();
        let (v, slope) = g(bb);
        (v, -bb * slope)
    };
    let b_lo = crossing_newton(-(b.ln()), -(1e-9 * b).ln(), 1.5 * se_b / b, |x| {
        in_x(&drop_b, x)
    })
    .map(|x| (-x).exp());
    // The upper ends in b are sought up to nine decades above b, as the lower ends down
    // to nine below: not up to a bound set by the tr span, which one row far out (a zero
    // count at 1 us beside counts at 100 ps) would bring below the interval's end.
    let b_top = (1e9 * b).min(b_most);
    let b_hi = crossing_newton(b, b_top, 1.5 * se_b, drop_b);
    // No lower end of b: tau unbounded above, the counts indistinguishable from flat.
    if b_lo.is_none() {
        return Err(CountsProblem::NotSignificantlyFalling(
            b_hi.map(|x| 1.0 / x),
        ));
    }
    // a's interval, along the trace: A rises with b, so its low end lies below b and
    // its high end above, each where the trace's profile has fallen by 1.92. The first
    // guess of the distance in b: a's standard error over A's slope there (the mean t).
    let step_b = 1.5 * se_a / k_mean;
    let a_lo = crossing_newton(-(b.ln()), -(1e-9 * b).ln(), step_b / b, |x| {
        in_x(&drop_trace, x)
    })
    .map(|x| trace((-x).exp()).0);
    let a_hi = crossing_newton(b, b_top, step_b, drop_trace).map(|x| trace(x).0);
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
        // An end beyond 1e300 s is left open, as one the likelihood never reaches.
        window_ci: (
            a_lo.map(f64::exp).filter(|w| *w <= 1e300),
            a_hi.map(f64::exp).filter(|w| *w <= 1e300),
        ),
        // The inverse information: var a = I_bb/det, var b = I_aa/det, and I_ab = -i_ab
        // (d eta/d b = -t), so cov(a, b) = i_ab/det > 0; ln tau = -ln b, so sd(ln tau) =
        // sd(b)/b and the correlation of ln tau and ln w is minus that of a and b.
        sd_ln_tau: se_b / b,
        sd_ln_window: se_a,
        corr: -i_ab / (i_aa * i_bb).sqrt(),
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
