//! The fit's report: estimates with intervals, goodness of fit, how each row was used,
//! readouts, links into the calculators, and plots on the scales where the law is a line.

use serde::Serialize;

use crate::calculator::Outcome;
use crate::chart::series::{lin_space, log_space, Curve, Plot, Spacing};
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::CAUTION;
use crate::units::{format_number, format_si, format_si_sig, format_sig};

use super::counts::{self, CountsFit};
use super::decision::DecisionFit;
use super::delay::{DelayFit, Use};
use super::input::FitCase;

/// Significant digits shown for the fitted tau, which is carried on by typing it: a
/// result exponential in t/tau moves by (t/tau) times the rounding of tau, so seven
/// digits (rounding at most 5e-7 relative) keep a re-typed tau within 1e-4 of the
/// result up to t = 200 tau. Links carry nine digits.
pub const CARRIED_DIGITS_TAU: usize = 7;
/// Significant digits shown for the fitted window (tw, t0) and v0, which enter results
/// linearly: six digits keep a re-typed value within 1e-5.
pub const CARRIED_DIGITS_WINDOW: usize = 6;

/// A case with its fit done.
#[derive(Debug, Clone, PartialEq)]
pub struct Fitted {
    /// The data and settings.
    pub case: FitCase,
    /// The fit.
    pub fit: Fit,
    /// The name the fit takes as a budget corner, when given.
    pub corner: Option<String>,
    /// The resolution time the pessimistic link looks at, when given, s.
    pub worst_at: Option<f64>,
}

/// The fit of one experiment.
#[derive(Debug, Clone, PartialEq)]
pub enum Fit {
    /// Failure counts.
    Counts(CountsFit),
    /// A delay sweep.
    Delay(DelayFit),
    /// A comparator sweep.
    Comparator(DecisionFit),
}

/// One row of a counting experiment at the fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CountRow {
    /// Its line in the data.
    pub line: usize,
    /// Resolution time, s.
    pub tr_s: f64,
    /// Failures counted.
    pub failures: f64,
    /// Failures the fit expects.
    pub expected: f64,
    /// Deviance residual.
    pub residual: f64,
}

/// One point of a delay sweep and how it was used.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DelayPoint {
    /// Its line in the data.
    pub line: usize,
    /// Data-to-clock offset, s.
    pub offset_s: f64,
    /// Clock-to-output delay, s.
    pub delay_s: f64,
    /// Whether the fit used it.
    pub used: bool,
    /// Why, in words.
    pub reason: &'static str,
    /// Its residual from the whole-sweep fit, s (delay minus the model; absent with the
    /// log law).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub residual_s: Option<f64>,
}

/// Fewer points than this in a delay fit are warned of (the whole-sweep fit has five
/// parameters).
const FEW_POINTS: usize = 10;

/// Everything a fit yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FitReport {
    /// The experiment: counts, delay or comparator.
    pub kind: &'static str,
    /// Normalised inputs (the data as its row count).
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// tau, s.
    pub tau_s: f64,
    /// Low end of tau's 95 % interval, s (null: unbounded, see `not_applicable`).
    pub tau_s_ci_low: Option<f64>,
    /// High end of tau's 95 % interval, s (null: unbounded, see `not_applicable`).
    pub tau_s_ci_high: Option<f64>,
    /// The window tw, s (counts with tr beyond tcq, and delay sweeps).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tw_s: Option<f64>,
    /// Low end of tw's 95 % interval, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tw_s_ci_low: Option<Option<f64>>,
    /// High end of tw's 95 % interval, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tw_s_ci_high: Option<Option<f64>>,
    /// The window t0, s (counts with tr from the clock edge).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub t0_s: Option<f64>,
    /// Low end of t0's 95 % interval, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub t0_s_ci_low: Option<Option<f64>>,
    /// High end of t0's 95 % interval, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub t0_s_ci_high: Option<Option<f64>>,
    /// The longest resolution time the data cover, s (counts: the longest tr of a row
    /// with failures or expecting at least 0.1 at the fit; delay: the longest extra delay
    /// over tcq among the points used): beyond it the exponential is extrapolated. Give it
    /// to the synchronizer as `tr-max`, to a corner as `tr_max`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tr_max_s: Option<f64>,
    /// How a delay sweep was fitted: `coth` (the whole sweep) or `log` (the log law over
    /// the regenerative region).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub method: Option<&'static str>,
    /// The whole-sweep fit's tail shape k (2: ln coth, an exponential return to tcq; near
    /// 0: a power-law one).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tail_shape: Option<f64>,
    /// The log law: how far the local slope drifts across the points used, relative.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slope_drift: Option<f64>,
    /// The fit as a corners CSV (a header and one row: corner, tau, tw or t0, tr_max), with
    /// a corner name given (counts and delay fits).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub corner_csv: Option<String>,
    /// The name the fit takes as a budget corner (`lab` unless given).
    #[serde(skip)]
    pub corner_name: String,
    /// The resolution time of the joint region's worst point, when given (else tr_max).
    #[serde(skip)]
    pub worst_at: Option<f64>,
    /// Standard deviation of ln tau, from the observed information (counts).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sd_ln_tau: Option<f64>,
    /// Standard deviation of ln tw, likewise (counts with the tw window).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sd_ln_tw: Option<f64>,
    /// Correlation of ln tau and ln tw, likewise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub corr_ln_tau_ln_tw: Option<f64>,
    /// Standard deviation of ln t0 (counts with the t0 window).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sd_ln_t0: Option<f64>,
    /// Correlation of ln tau and ln t0.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub corr_ln_tau_ln_t0: Option<f64>,
    /// Deviance against the saturated model (counts).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub deviance: Option<f64>,
    /// Its degrees of freedom (counts).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub deviance_df: Option<usize>,
    /// Goodness-of-fit p-value (counts; null with no degrees of freedom).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub p_value: Option<Option<f64>>,
    /// Each row at the fit (counts).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub rows: Vec<CountRow>,
    /// The balance offset, s (delay).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub offset_m_s: Option<f64>,
    /// The nominal delay used, s (delay).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tcq_s: Option<f64>,
    /// Where tcq came from: given, or the points far from the balance point (delay).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tcq_source: Option<&'static str>,
    /// How many points the fit used (delay).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub points_used: Option<usize>,
    /// Every point and how it was used (delay).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub points: Vec<DelayPoint>,
    /// v0 = vmin / gain, V (comparator).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub v0_v: Option<f64>,
    /// Low end of v0's 95 % interval, V.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub v0_v_ci_low: Option<f64>,
    /// High end of v0's 95 % interval, V.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub v0_v_ci_high: Option<f64>,
    /// Residual spread of the decision times, s (comparator).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub residual_spread_s: Option<f64>,
    /// For each result that is null: why.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// What to watch.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

fn lines(case: &FitCase) -> &[usize] {
    match case {
        FitCase::Counts { lines, .. }
        | FitCase::Delay { lines, .. }
        | FitCase::Comparator { lines, .. } => lines,
    }
}

/// The fewest failures a counts row must be expected to show at the fit for its zero to
/// test the law at its tr (a zero then has a chance of at most e^-0.1 = 90 %).
const TESTING_EXPECTED: f64 = 0.1;

/// The inputs as understood.
fn echo(case: &FitCase) -> Vec<(&'static str, String)> {
    let mut v = vec![
        ("kind", case.kind().to_string()),
        ("data", format!("{} rows", lines(case).len())),
    ];
    match case {
        FitCase::Counts {
            fclk, fdata, t0, ..
        } => {
            v.push(("fclk", fclk.display()));
            v.push(("fdata", fdata.display()));
            v.push(("window", if *t0 { "t0" } else { "tw" }.to_string()));
        }
        FitCase::Delay { tcq: Some(t), .. } => v.push(("tcq", t.display())),
        _ => {}
    }
    v
}

/// Evaluates a fitted case into its report.
pub fn evaluate(f: &Fitted) -> FitReport {
    let mut r = FitReport {
        kind: f.case.kind(),
        inputs: echo(&f.case),
        tau_s: 0.0,
        tau_s_ci_low: None,
        tau_s_ci_high: None,
        tw_s: None,
        tw_s_ci_low: None,
        tw_s_ci_high: None,
        t0_s: None,
        t0_s_ci_low: None,
        t0_s_ci_high: None,
        deviance: None,
        deviance_df: None,
        p_value: None,
        tr_max_s: None,
        method: None,
        tail_shape: None,
        slope_drift: None,
        corner_csv: None,
        corner_name: f.corner.clone().unwrap_or_else(|| "lab".to_string()),
        worst_at: f.worst_at,
        sd_ln_tau: None,
        sd_ln_tw: None,
        corr_ln_tau_ln_tw: None,
        sd_ln_t0: None,
        corr_ln_tau_ln_t0: None,
        rows: Vec::new(),
        offset_m_s: None,
        tcq_s: None,
        tcq_source: None,
        points_used: None,
        points: Vec::new(),
        v0_v: None,
        v0_v_ci_low: None,
        v0_v_ci_high: None,
        residual_spread_s: None,
        not_applicable: Vec::new(),
        warnings: Vec::new(),
        caution: CAUTION,
    };
    let unbounded = "the likelihood does not fall far enough on this side: the data leave it open";
    match (&f.case, &f.fit) {
        (
            FitCase::Counts {
                counts: d,
                lines,
                t0,
                fclk,
                fdata,
                ..
            },
            Fit::Counts(fit),
        ) => {
            // Each data edge fails at most once: a row with more failures than its
            // duration holds edges (and more than one) has a unit or a column wrong.
            let over: Vec<usize> = (0..d.tr.len())
                .filter(|&i| d.failures[i] > (d.duration[i] * fdata.get()).max(1.0))
                .collect();
            if let Some(&first) = over.first() {
                r.warnings.push(format!(
                    "{} more failures than data edges in {} duration (line {}: {} failures, \
                     {} edges at fdata = {}); a data edge fails at most once: check the \
                     durations' units and fdata.",
                    if over.len() == 1 {
                        "One row counts".to_string()
                    } else {
                        format!("{} rows count", over.len())
                    },
                    if over.len() == 1 { "its" } else { "their" },
                    lines[first],
                    crate::units::format_number(d.failures[first]),
                    crate::units::format_number(d.duration[first] * fdata.get()),
                    fdata.display()
                ));
            }
            r.tau_s = fit.tau;
            (r.tau_s_ci_low, r.tau_s_ci_high) = fit.tau_ci;
            for (key, v) in [
                ("tau_s_ci_low", fit.tau_ci.0),
                ("tau_s_ci_high", fit.tau_ci.1),
            ] {
                if v.is_none() {
                    r.not_applicable.push((key, unbounded.to_string()));
                }
            }
            let (w, lo, hi) = (
                Some(fit.window),
                Some(fit.window_ci.0),
                Some(fit.window_ci.1),
            );
            let keys = if *t0 {
                (r.t0_s, r.t0_s_ci_low, r.t0_s_ci_high) = (w, lo, hi);
                ["t0_s_ci_low", "t0_s_ci_high"]
            } else {
                (r.tw_s, r.tw_s_ci_low, r.tw_s_ci_high) = (w, lo, hi);
                ["tw_s_ci_low", "tw_s_ci_high"]
            };
            for (key, v) in keys.into_iter().zip([fit.window_ci.0, fit.window_ci.1]) {
                if v.is_none() {
                    r.not_applicable.push((key, unbounded.to_string()));
                }
            }
            // The longest tr at which the data test the law: a row with failures, or one
            // whose zero the fit makes a test (at least 0.1 failures expected). A row
            // expecting far fewer (no failures in an hour at 1 us, beside counts at 100
            // ps) bounds the rate there but would show none whatever tau is near the fit:
            // taking its tr would hide the extrapolation from the synchronizer and the
            // budget.
            let tests = |i: usize| d.failures[i] > 0.0 || fit.expected[i] >= TESTING_EXPECTED;
            let longest = d.tr.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let tested = (0..d.tr.len())
                .filter(|&i| tests(i))
                .map(|i| d.tr[i])
                .fold(f64::NEG_INFINITY, f64::max);
            r.tr_max_s = Some(tested);
            if longest > tested {
                let beyond = (0..d.tr.len()).filter(|&i| d.tr[i] > tested).count();
                r.warnings.push(format!(
                    "{} beyond tr = {} count{} no failures where the fit expects fewer than \
                     {TESTING_EXPECTED}: {} the failure rate there but cannot test the \
                     exponential, so the data characterise tr up to {} (tr_max), not {}.",
                    if beyond == 1 {
                        "One row".to_string()
                    } else {
                        format!("{beyond} rows")
                    },
                    format_si(tested, "s"),
                    if beyond == 1 { "s" } else { "" },
                    if beyond == 1 {
                        "it bounds"
                    } else {
                        "they bound"
                    },
                    format_si(tested, "s"),
                    format_si(longest, "s")
                ));
            }
            // The joint uncertainty, from the curvature at the peak: not computable where
            // the expected counts sit all at one tr (the curvature does not tell tau and
            // the window apart there), said rather than shown as a number.
            let joint = [fit.sd_ln_tau, fit.sd_ln_window, fit.corr];
            let joint = joint.iter().all(|v| v.is_finite()).then_some(joint);
            r.sd_ln_tau = joint.map(|j| j[0]);
            let (w, c) = (joint.map(|j| j[1]), joint.map(|j| j[2]));
            let keys = if *t0 {
                (r.sd_ln_t0, r.corr_ln_tau_ln_t0) = (w, c);
                ["sd_ln_tau", "sd_ln_t0", "corr_ln_tau_ln_t0"]
            } else {
                (r.sd_ln_tw, r.corr_ln_tau_ln_tw) = (w, c);
                ["sd_ln_tau", "sd_ln_tw", "corr_ln_tau_ln_tw"]
            };
            if joint.is_none() {
                for key in keys {
                    r.not_applicable.push((
                        key,
                        "not computable: at the fit the expected failures sit almost all at \
                         one resolution time, so the likelihood's curvature does not tell \
                         tau and the window apart"
                            .to_string(),
                    ));
                }
            }
            r.deviance = Some(fit.deviance);
            r.deviance_df = Some(fit.df);
            r.p_value = Some(fit.p_value);
            if fit.p_value.is_none() {
                r.not_applicable.push((
                    "p_value",
                    "two rows: no degrees of freedom left to test the fit".to_string(),
                ));
            }
            if fit.p_value.is_some_and(|p| p < 0.01) {
                r.warnings.push(format!(
                    "The counts scatter more than Poisson counts would (p = {}): look for \
                     drift between rows or a second failure mechanism before trusting the \
                     intervals.",
                    format_sig(fit.p_value.unwrap_or(0.0), 2)
                ));
            }
            let far = far_count_rows(d, fclk.get(), fdata.get(), fit);
            if !far.is_empty() {
                let named: Vec<String> = far
                    .iter()
                    .enumerate()
                    .map(|(k, &(i, log10_expected))| {
                        format!(
                            "{} {} ({} failure{}, where the fit without it expects {})",
                            if k == 0 { "Line" } else { "line" },
                            lines[i],
                            crate::units::format_log10(d.failures[i].log10(), 6),
                            if d.failures[i] == 1.0 { "" } else { "s" },
                            crate::units::format_log10(log10_expected, 3)
                        )
                    })
                    .collect();
                r.warnings.push(far_out_warning(
                    &named,
                    |_| "a standardized deviance residual beyond a 1 % chance over the rows".into(),
                    "; each named with the rows fitted again without those before",
                    ("row", "rows"),
                    "tau and tw",
                ));
            }
            r.rows = lines
                .iter()
                .enumerate()
                .map(|(i, line)| CountRow {
                    line: *line,
                    tr_s: d.tr[i],
                    failures: d.failures[i],
                    expected: fit.expected[i],
                    residual: fit.residuals[i],
                })
                .collect();
        }
        (
            FitCase::Delay {
                offset,
                delay,
                lines,
                tcq,
                ..
            },
            Fit::Delay(fit),
        ) => {
            r.tau_s = fit.tau;
            (r.tau_s_ci_low, r.tau_s_ci_high) = fit.tau_ci;
            r.tw_s = Some(fit.tw);
            r.tw_s_ci_low = Some(fit.tw_ci.0);
            r.tw_s_ci_high = Some(fit.tw_ci.1);
            let open = "the data do not bound it on this side";
            for (key, v) in [
                ("tau_s_ci_low", fit.tau_ci.0),
                ("tau_s_ci_high", fit.tau_ci.1),
                ("tw_s_ci_low", fit.tw_ci.0),
                ("tw_s_ci_high", fit.tw_ci.1),
            ] {
                if v.is_none() {
                    r.not_applicable.push((key, open.to_string()));
                }
            }
            r.offset_m_s = Some(fit.offset_m);
            r.tcq_s = Some(fit.tcq);
            // The delay never falls below tcq: a given tcq above the delay of the points
            // farthest from the balance point (the quarter the fit would take tcq from)
            // by more than their own scatter is wrong, and every point's residual with it.
            let mut tcq_wrong = false;
            if fit.tcq_given {
                if let Some((far, scatter)) = far_delay(offset, delay) {
                    if fit.tcq - far > (5.0 * scatter).max(1e-3 * fit.tcq) {
                        tcq_wrong = true;
                        r.warnings.push(format!(
                            "The given tcq = {} is above the delay of the points farthest \
                             from the balance point (their median {}), and the delay never \
                             falls below tcq: check tcq, or leave it empty to fit it with \
                             the sweep. No point is named as far out of this fit, as every \
                             residual is taken against that tcq.",
                            format_si(fit.tcq, "s"),
                            format_si(far, "s")
                        ));
                    }
                }
            }
            r.tcq_source = Some(if fit.tcq_given {
                "given"
            } else if fit.residuals.is_some() {
                "fitted with the whole sweep"
            } else {
                "the delay far from the balance point"
            });
            r.points_used = Some(fit.uses.iter().filter(|u| **u == Use::Used).count());
            // Five parameters on a handful of points: the intervals say little.
            let used = r.points_used.unwrap_or(0);
            if used < FEW_POINTS {
                r.warnings.push(format!(
                    "The fit rests on {used} points: one point more or less can move tau and \
                     the window well beyond their intervals; sweep more offsets."
                ));
            }
            r.tr_max_s = delay
                .iter()
                .zip(&fit.uses)
                .filter(|(_, u)| **u == Use::Used)
                .map(|(d, _)| d - fit.tcq)
                .reduce(f64::max);
            r.points = lines
                .iter()
                .enumerate()
                .map(|(i, line)| DelayPoint {
                    line: *line,
                    offset_s: offset[i],
                    delay_s: delay[i],
                    used: fit.uses[i] == Use::Used,
                    reason: if fit.residuals.is_some() && fit.uses[i] == Use::Used {
                        "used: the whole sweep is fitted"
                    } else {
                        fit.uses[i].reason()
                    },
                    residual_s: fit.residuals.as_ref().map(|r| r[i]),
                })
                .collect();
            r.method = Some(if fit.residuals.is_some() {
                "coth"
            } else {
                "log"
            });
            r.slope_drift = fit.slope_drift;
            r.tail_shape = fit.tail_shape;
            if let Some((st, sw, c)) = fit.joint {
                (r.sd_ln_tau, r.sd_ln_tw, r.corr_ln_tau_ln_tw) = (Some(st), Some(sw), Some(c));
            }
            if fit.residuals.is_some() && !tcq_wrong {
                let far = far_delay_points(offset, delay, tcq.map(|t| t.get()), fit);
                if !far.is_empty() {
                    let named: Vec<String> = far
                        .iter()
                        .enumerate()
                        .map(|(k, &i)| {
                            format!("{} {}", if k == 0 { "Line" } else { "line" }, lines[i])
                        })
                        .collect();
                    r.warnings.push(far_out_warning(
                        &named,
                        |it| {
                            format!(
                                "a residual beyond 5 robust standard deviations, or a distance \
                                 from the sweep fitted without {it} beyond a 1 % chance over \
                                 the sweep"
                            )
                        },
                        "; each named with the sweep fitted again without those before",
                        ("point", "points"),
                        "tau and tw",
                    ));
                }
            }
            if let Some(d) = fit.slope_drift.filter(|d| *d > 0.05) {
                r.warnings.push(format!(
                    "The local slope drifts by {:.1} % across the points the log law used: \
                     part of them lie in the transition to tcq, which flattens tau. The \
                     whole-sweep fit (method=coth) follows the transition.",
                    100.0 * d
                ));
            }
            if !fit.tcq_given && fit.residuals.is_none() {
                r.warnings.push(format!(
                    "tcq not given: taken as {}, the median delay of the points farthest from \
                     the balance point.",
                    format_si(fit.tcq, "s")
                ));
            }
        }
        (
            FitCase::Comparator {
                vin, time, lines, ..
            },
            Fit::Comparator(fit),
        ) => {
            // Each point's residual against the line fitted without it (externally
            // studentized: a point at the end of the sweep pulls the line towards itself,
            // so its plain residual understates it), named where it is beyond Student's t
            // at a 1 % chance over the whole sweep (Bonferroni), so that a clean sweep is
            // flagged once in a hundred (18 of 2,000 in the tests). Cook and Weisberg,
            // "Residuals and Influence in Regression", Chapman & Hall 1982 (recalled). With
            // three points the line left by one has no spread to judge by: none is named.
            let x: Vec<f64> = vin.iter().map(|v| v.ln()).collect();
            let n = x.len() as f64;
            let limit = if n > 3.0 {
                crate::numeric::special::t_quantile(1.0 - 0.005 / n, n - 3.0)
            } else {
                f64::INFINITY
            };
            let mean = x.iter().sum::<f64>() / n;
            let sxx: f64 = x.iter().map(|v| (v - mean) * (v - mean)).sum();
            let e: Vec<f64> = (0..x.len())
                .map(|i| time[i] - (fit.line.intercept + fit.line.slope * x[i]))
                .collect();
            let sse: f64 = e.iter().map(|v| v * v).sum();
            let far: Vec<String> = (0..x.len())
                .filter(|&i| {
                    let h = 1.0 / n + (x[i] - mean) * (x[i] - mean) / sxx;
                    let s2 = (sse - e[i] * e[i] / (1.0 - h)) / (n - 3.0);
                    h < 1.0 && s2 > 0.0 && e[i].abs() > limit * (s2 * (1.0 - h)).sqrt()
                })
                .enumerate()
                .map(|(k, i)| format!("{} {}", if k == 0 { "Line" } else { "line" }, lines[i]))
                .collect();
            if !far.is_empty() {
                r.warnings.push(far_out_warning(
                    &far,
                    |it| {
                        format!(
                            "beyond the line fitted without {it} by more than a 1 % chance \
                             over the sweep allows"
                        )
                    },
                    "",
                    ("point", "points"),
                    "tau and v0",
                ));
            }
            // The law gives a regeneration time only below v0: an input above it (a
            // saturated decision, or a unit off by a factor) is outside it.
            let above: Vec<usize> = (0..vin.len()).filter(|&i| vin[i] > fit.v0).collect();
            if let Some(&first) = above.first() {
                r.warnings.push(format!(
                    "{} above the fitted v0 = {} (line {}: vin = {}), where tau ln(v0/vin) \
                     is below zero: the law holds for inputs below v0 only. Leave such rows \
                     out, or check their units.",
                    if above.len() == 1 {
                        "One row's input is".to_string()
                    } else {
                        format!("{} rows' inputs are", above.len())
                    },
                    format_si(fit.v0, "V"),
                    lines[first],
                    format_si(vin[first], "V")
                ));
            }
            r.tau_s = fit.tau;
            (r.tau_s_ci_low, r.tau_s_ci_high) = fit.tau_ci;
            r.v0_v = Some(fit.v0);
            (r.v0_v_ci_low, r.v0_v_ci_high) = fit.v0_ci;
            let open = "the data do not bound it on this side";
            for (key, v) in [
                ("tau_s_ci_low", fit.tau_ci.0),
                ("tau_s_ci_high", fit.tau_ci.1),
                ("v0_v_ci_low", fit.v0_ci.0),
                ("v0_v_ci_high", fit.v0_ci.1),
            ] {
                if v.is_none() {
                    r.not_applicable.push((key, open.to_string()));
                }
            }
            r.residual_spread_s = Some(fit.spread);
        }
        _ => {}
    }
    if f.corner.is_some() {
        r.corner_csv = r.corner_table();
    }
    r
}

/// The median delay of the quarter of a sweep's points farthest from its largest delay
/// (where the delay has returned to tcq), and their scatter (1.4826 times the median
/// absolute deviation). None for fewer than eight points.
fn far_delay(offset: &[f64], delay: &[f64]) -> Option<(f64, f64)> {
    use super::delay::{far_quarter, median};
    if offset.len() < 8 {
        return None;
    }
    let far = far_quarter(offset, delay);
    let mid = median(far.clone());
    let scatter = 1.4826 * median(far.iter().map(|d| (d - mid).abs()).collect());
    Some((mid, scatter))
}

/// The warning that names rows or points far out of a fit: `named` as they are listed
/// (the first with a capital), `test` what puts them there (given "it" for one, "each"
/// for more), `refitted` the note for more than one, `thing` its singular and plural,
/// and `trusting` what they put in doubt.
fn far_out_warning(
    named: &[String],
    test: impl Fn(&str) -> String,
    refitted: &str,
    thing: (&str, &str),
    trusting: &str,
) -> String {
    let one = named.len() == 1;
    format!(
        "{} stand{} far out of the fit ({}{}): check {} {} before trusting {trusting}.",
        named.join(", "),
        if one { "s" } else { "" },
        test(if one { "it" } else { "each" }),
        if one { "" } else { refitted },
        if one { "that" } else { "those" },
        if one { thing.0 } else { thing.1 },
    )
}

/// The rows of a counts fit that stand out of it, one at a time (at most
/// [`FAR_POINTS_MOST`]): the row whose deviance residual, standardized by its leverage in
/// the Poisson log-linear fit (h = mu (1/S0 + (tr - c)^2/S2), S the mu-weighted sums
/// about their mean c), is largest and beyond the normal quantile at a 1 % chance over
/// the rows (Bonferroni) is named, and the rows fitted again without it: one mistyped
/// count pulls the fit and, with it, its neighbours' residuals. McCullagh and Nelder,
/// "Generalized Linear Models", 2nd ed., Chapman & Hall 1989, section 12.5 (recalled).
/// Returns each named row's index, with log10 of the failures that the fit without it
/// expects there.
fn far_count_rows(
    d: &super::counts::Counts,
    fclk: f64,
    fdata: f64,
    fit: &super::counts::CountsFit,
) -> Vec<(usize, f64)> {
    let mut far = Vec::new();
    let mut keep: Vec<usize> = (0..d.tr.len()).collect();
    let mut now = (d.clone(), fit.clone());
    while far.len() < FAR_POINTS_MOST && keep.len() > 3 {
        let (sub, f) = &now;
        let mu = &f.expected;
        let s0: f64 = mu.iter().sum();
        if s0.is_nan() || s0 <= 0.0 {
            break;
        }
        let c = mu.iter().zip(&sub.tr).map(|(m, t)| m * t).sum::<f64>() / s0;
        let s2: f64 = mu
            .iter()
            .zip(&sub.tr)
            .map(|(m, t)| m * (t - c) * (t - c))
            .sum();
        let limit = crate::numeric::normal::upper_quantile(0.005 / sub.tr.len() as f64);
        let worst = (0..sub.tr.len())
            .filter_map(|i| {
                let spread = if s2 > 0.0 {
                    (sub.tr[i] - c).powi(2) / s2
                } else {
                    0.0
                };
                let h = mu[i] * (1.0 / s0 + spread);
                (h < 1.0 - 1e-9).then(|| (i, (f.residuals[i] / (1.0 - h).sqrt()).abs()))
            })
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .filter(|(_, z)| *z > limit);
        let Some((i, _)) = worst else {
            break;
        };
        let mut rest = sub.clone();
        for v in [&mut rest.tr, &mut rest.failures, &mut rest.duration] {
            v.remove(i);
        }
        let Ok(again) = super::counts::fit(&rest, fclk, fdata) else {
            break;
        };
        // The failures the fit without the row expects there (log10): the rate law per
        // data edge, times the row's data edges.
        let log10_expected = super::counts::log10_per_edge(&again, fclk, sub.tr[i])
            + (sub.duration[i] * fdata).log10();
        far.push((keep.remove(i), log10_expected));
        now = (rest, again);
    }
    far
}

/// The most points a sweep's search for far-out points names.
const FAR_POINTS_MOST: usize = 5;

/// The points of a whole-sweep delay fit that stand far out of it, one at a time: the
/// used point with the largest residual, where it is beyond 5 robust standard deviations
/// (from the median absolute residual of the used points), is named and the sweep fitted
/// again without it, until none is (at most [`FAR_POINTS_MOST`]). One bad point pulls the
/// fit (tcq, say) and so the residuals of its neighbours; named against the first fit
/// alone, they would be named with it.
///
/// A bad point can also pull the fit so far that it hides in the spread it causes (a
/// 90 ps point 0.5 ns out, beside a sweep back at 45 ps there, halves tau and spreads
/// every residual to 15 ps). So where the largest residual is within 5 robust deviations
/// but beyond what a clean sweep gives in one case in four (its externally studentized
/// residual from the leverage at the fit, against Student's t, Bonferroni), the sweep is
/// fitted again without it, and the point is named when its distance from that fit,
/// studentized the same way with the refit's spread, is beyond Student's t at a 1 %
/// chance over the sweep (Cook and Weisberg, "Residuals and Influence in Regression",
/// Chapman & Hall 1982, recalled). Returns indices into the rows.
fn far_delay_points(
    offset: &[f64],
    delay: &[f64],
    tcq: Option<f64>,
    fit: &super::delay::DelayFit,
) -> Vec<usize> {
    use crate::numeric::special::t_quantile;
    // The fitted parameters: tau, m, ds, k and tcq unless given.
    let p = if tcq.is_some() { 4 } else { 5 };
    // A fit's used points, its sum of squared residuals over them, and its degrees of
    // freedom.
    let spread = |f: &super::delay::DelayFit| {
        let res = f.residuals.clone().unwrap_or_default();
        let used: Vec<usize> = (0..res.len()).filter(|&k| f.uses[k] == Use::Used).collect();
        let sse: f64 = used.iter().map(|&k| res[k] * res[k]).sum();
        let df = used.len().saturating_sub(p);
        (res, used, sse, df)
    };
    let mut far: Vec<usize> = Vec::new();
    let mut keep: Vec<usize> = (0..offset.len()).collect();
    let mut now = fit.clone();
    while far.len() < FAR_POINTS_MOST {
        let (res, used, sse, df) = spread(&now);
        let scale = 1.4826 * super::delay::median(used.iter().map(|&k| res[k].abs()).collect());
        let Some(worst) = used
            .iter()
            .copied()
            .max_by(|&a, &b| res[a].abs().total_cmp(&res[b].abs()))
        else {
            break;
        };
        if scale <= 0.0 {
            break;
        }
        let plain = res[worst].abs() > 5.0 * scale;
        let h = now
            .leverage
            .as_ref()
            .and_then(|l| l[worst])
            .filter(|h| *h < 1.0 - 1e-9);
        if !plain {
            // The screen: the point's externally studentized residual at this fit.
            let (Some(h), true) = (h, df >= 2) else {
                break;
            };
            let r = res[worst];
            let s2 = (sse - r * r / (1.0 - h)) / (df - 1) as f64;
            let screen = t_quantile(1.0 - 0.125 / used.len() as f64, (df - 1) as f64);
            if !(s2 > 0.0 && r.abs() > screen * (s2 * (1.0 - h)).sqrt()) {
                break;
            }
        }
        let mut without = keep.clone();
        without.remove(worst);
        let (o, d): (Vec<f64>, Vec<f64>) = without.iter().map(|&i| (offset[i], delay[i])).unzip();
        let Ok(again) = super::delay::fit_coth(&o, &d, tcq) else {
            break;
        };
        if !plain {
            // The point against the sweep fitted without it.
            let (_, _, sse_again, df_again) = spread(&again);
            let i = keep[worst];
            let (Some(h), Some(predicted), true) = (h, again.predict(offset[i]), df_again >= 1)
            else {
                break;
            };
            let s = (sse_again / df_again as f64).sqrt();
            let limit = t_quantile(1.0 - 0.005 / used.len() as f64, df_again as f64);
            if !(s > 0.0 && (delay[i] - predicted).abs() * (1.0 - h).sqrt() > limit * s) {
                break;
            }
        }
        far.push(keep[worst]);
        keep = without;
        now = again;
    }
    far
}

impl FitReport {
    /// The results as readouts; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let na = &self.not_applicable;
        let s = |v: f64| format_si(v, "s");
        let mut v = vec![Readout::new(
            "tau_s",
            "tau",
            format_si_sig(self.tau_s, "s", CARRIED_DIGITS_TAU),
            Some(self.tau_s),
        )];
        v.push(Readout::maybe(
            "tau_s_ci_low",
            "tau, 95 % interval from",
            self.tau_s_ci_low,
            s,
            na,
        ));
        v.push(Readout::maybe(
            "tau_s_ci_high",
            "tau, 95 % interval to",
            self.tau_s_ci_high,
            s,
            na,
        ));
        for (name, lo, hi, label, lo_label, hi_label, value, low, high) in [
            (
                "tw_s",
                "tw_s_ci_low",
                "tw_s_ci_high",
                "window tw",
                "tw, 95 % interval from",
                "tw, 95 % interval to",
                self.tw_s,
                self.tw_s_ci_low,
                self.tw_s_ci_high,
            ),
            (
                "t0_s",
                "t0_s_ci_low",
                "t0_s_ci_high",
                "window t0",
                "t0, 95 % interval from",
                "t0, 95 % interval to",
                self.t0_s,
                self.t0_s_ci_low,
                self.t0_s_ci_high,
            ),
        ] {
            if let Some(w) = value {
                v.push(Readout::new(
                    name,
                    label,
                    format_si_sig(w, "s", CARRIED_DIGITS_WINDOW),
                    Some(w),
                ));
                v.push(Readout::maybe(lo, lo_label, low.flatten(), s, na));
                v.push(Readout::maybe(hi, hi_label, high.flatten(), s, na));
            }
        }
        if let Some(t) = self.tr_max_s {
            v.push(Readout::new(
                "tr_max_s",
                "characterised up to (tr)",
                s(t),
                Some(t),
            ));
        }
        for (key, label, value) in [
            ("sd_ln_tau", "sd of ln tau", self.sd_ln_tau),
            ("sd_ln_tw", "sd of ln tw", self.sd_ln_tw),
            ("sd_ln_t0", "sd of ln t0", self.sd_ln_t0),
            (
                "corr_ln_tau_ln_tw",
                "correlation of ln tau, ln tw",
                self.corr_ln_tau_ln_tw,
            ),
            (
                "corr_ln_tau_ln_t0",
                "correlation of ln tau, ln t0",
                self.corr_ln_tau_ln_t0,
            ),
        ] {
            if let Some(x) = value {
                v.push(Readout::new(key, label, format_number(x), Some(x)));
            }
        }
        if let (Some(d), Some(df)) = (self.deviance, self.deviance_df) {
            v.push(Readout::new(
                "deviance",
                "deviance",
                format!("{d:.3}"),
                Some(d),
            ));
            v.push(Readout::new(
                "deviance_df",
                "degrees of freedom",
                df.to_string(),
                Some(df as f64),
            ));
        }
        if let Some(p) = self.p_value {
            v.push(Readout::maybe(
                "p_value",
                "goodness of fit, p-value",
                p,
                format_number,
                na,
            ));
        }
        if let Some(m) = self.offset_m_s {
            v.push(Readout::new("offset_m_s", "balance offset", s(m), Some(m)));
        }
        if let Some(t) = self.tcq_s {
            v.push(Readout::new("tcq_s", "tcq used", s(t), Some(t)));
        }
        if let Some(k) = self.tail_shape {
            v.push(Readout::new(
                "tail_shape",
                "tail shape k (2: ln coth)",
                format_number(k),
                Some(k),
            ));
        }
        if let Some(d) = self.slope_drift {
            v.push(Readout::new(
                "slope_drift",
                "local slope drift",
                format!("{:.1} %", 100.0 * d),
                Some(d),
            ));
        }
        if let Some(n) = self.points_used {
            v.push(Readout::new(
                "points_used",
                "points used",
                format!("{n} of {}", self.points.len()),
                Some(n as f64),
            ));
        }
        if let Some(x) = self.v0_v {
            let volts = |x: f64| format_si(x, "V");
            v.push(Readout::new(
                "v0_v",
                "v0 = vmin / gain",
                format_si_sig(x, "V", CARRIED_DIGITS_WINDOW),
                Some(x),
            ));
            v.push(Readout::maybe(
                "v0_v_ci_low",
                "v0, 95 % interval from",
                self.v0_v_ci_low,
                volts,
                na,
            ));
            v.push(Readout::maybe(
                "v0_v_ci_high",
                "v0, 95 % interval to",
                self.v0_v_ci_high,
                volts,
                na,
            ));
        }
        if let Some(x) = self.residual_spread_s {
            v.push(Readout::new(
                "residual_spread_s",
                "residual spread",
                s(x),
                Some(x),
            ));
        }
        v
    }

    /// Links that open a calculator with the fitted values: the estimate, and the
    /// pessimistic end of each interval (the larger tau and window).
    fn links(&self) -> Vec<(String, String)> {
        let e = |x: f64| format!("{x:.8e}");
        let pessimistic_tau = self.tau_s_ci_high.unwrap_or(self.tau_s);
        match self.kind {
            "comparator" => {
                let (Some(v0), hi) = (self.v0_v, self.v0_v_ci_high) else {
                    return Vec::new();
                };
                vec![
                    (
                        "Open the comparator with these estimates".into(),
                        format!(
                            "comparator.html?tau={}&vmin={}&gain=1",
                            e(self.tau_s),
                            e(v0)
                        ),
                    ),
                    (
                        "Open the comparator with the pessimistic ends".into(),
                        format!(
                            "comparator.html?tau={}&vmin={}&gain=1",
                            e(pessimistic_tau),
                            e(hi.unwrap_or(v0))
                        ),
                    ),
                ]
            }
            _ => {
                let (key, w, hi) = match (self.tw_s, self.t0_s) {
                    (Some(w), _) => ("tw", w, self.tw_s_ci_high.flatten()),
                    (None, Some(w)) => ("t0", w, self.t0_s_ci_high.flatten()),
                    _ => return Vec::new(),
                };
                // Carried over the synchronizer's last case (from=...): its clock, depth
                // and timing stay, tau and the window change, and the range the data cover.
                let tr_max = self
                    .tr_max_s
                    .map_or(String::new(), |t| format!("&tr-max={}", e(t)));
                let open = |tau: f64, win: f64| {
                    format!(
                        "index.html?from=characterize&tau={}&{key}={}{tr_max}",
                        e(tau),
                        e(win)
                    )
                };
                let mut v = vec![(
                    "Open the synchronizer with these estimates".to_string(),
                    open(self.tau_s, w),
                )];
                match self.worst_point() {
                    Some((tau, win, tr)) => v.push((
                        format!(
                            "Open the synchronizer at the joint 95 % region's worst point for \
                             tr = {} (tau {}, {key} {})",
                            format_si(tr, "s"),
                            format_si(tau, "s"),
                            format_si(win, "s")
                        ),
                        open(tau, win),
                    )),
                    None => v.push((
                        "Open the synchronizer with the pessimistic ends".to_string(),
                        open(pessimistic_tau, hi.unwrap_or(w)),
                    )),
                }
                if let Some(c) = self.budget_corner() {
                    v.push((format!("Use as a budget corner ({})", self.corner_name), c));
                }
                v
            }
        }
    }

    /// With the joint uncertainty (counts): the point of the joint 95 % region of (ln w,
    /// 1/tau) that gives the highest failure rate at the longest resolution time in the
    /// data (or at `worst-at` when given): tau, the window and that tr.
    ///
    /// # Formula
    /// ln rate = a - b tr + const is linear in (a, b) = (ln w, 1/tau); over the Wald
    /// ellipse `(x - x^)' C^-1 (x - x^) <= chi2(2, 0.95) = 5.991` its largest value is at
    /// `x^ + C g sqrt(5.991 / g' C g)`, g = (1, -tr), with C the inverse observed
    /// information.
    pub fn worst_point(&self) -> Option<(f64, f64, f64)> {
        let (sd_w, corr) = match (self.sd_ln_tw, self.sd_ln_t0) {
            (Some(s), _) => (s, self.corr_ln_tau_ln_tw?),
            (None, Some(s)) => (s, self.corr_ln_tau_ln_t0?),
            _ => return None,
        };
        let tr = self.worst_at.or(self.tr_max_s)?;
        let b = 1.0 / self.tau_s;
        let a = self.tw_s.or(self.t0_s)?.ln();
        // Back to (a, b): sd(b) = b sd(ln tau), corr(a, b) = -corr(ln tau, ln w).
        let sd_b = b * self.sd_ln_tau?;
        let (vaa, vbb, vab) = (sd_w * sd_w, sd_b * sd_b, -corr * sd_w * sd_b);
        let (g_a, g_b) = (1.0, -tr);
        let (cg_a, cg_b) = (vaa * g_a + vab * g_b, vab * g_a + vbb * g_b);
        let q = g_a * cg_a + g_b * cg_b;
        if q <= 0.0 || !q.is_finite() {
            return None;
        }
        // chi2(2, 0.95) = -2 ln 0.05.
        let k = (-2.0 * 0.05f64.ln() / q).sqrt();
        let (a1, b1) = (a + k * cg_a, b + k * cg_b);
        (b1 > 0.0).then(|| (1.0 / b1, a1.exp(), tr))
    }

    /// The fit as a corners CSV, a header and one row: the corner's name, tau, the window
    /// (tw or t0) and tr_max, ready to append to a corners file (counts and delay fits).
    pub fn corner_table(&self) -> Option<String> {
        let e = |x: f64| format!("{x:.8e}");
        let (key, w) = match (self.tw_s, self.t0_s) {
            (Some(w), _) => ("tw", w),
            (None, Some(w)) => ("t0", w),
            _ => return None,
        };
        let mut cols = vec![
            ("corner", self.corner_name.clone()),
            ("tau", e(self.tau_s)),
            (key, e(w)),
        ];
        if let Some(t) = self.tr_max_s {
            cols.push(("tr_max", e(t)));
        }
        let header: Vec<String> = cols.iter().map(|c| c.0.to_string()).collect();
        let row: Vec<String> = cols.iter().map(|c| c.1.clone()).collect();
        // Joined as the table reader reads them back: a name with a comma is quoted.
        Some(format!(
            "{}\n{}",
            crate::table::join(&header, ','),
            crate::table::join(&row, ',')
        ))
    }

    /// The link that adds the fit to the design budget as a corner (named `lab` unless
    /// named otherwise): tau, the
    /// window and tr_max in the corner, and the uncertainty (sds and correlation of the
    /// logarithms) in the budget's fields, over the budget's last case.
    pub fn budget_corner(&self) -> Option<String> {
        let e = |x: f64| format!("{x:.8e}");
        let corner = self.corner_table()?;
        let mut q = format!(
            "budget.html?from=characterize&add-corner={}",
            crate::link::encode(&corner)
        );
        let sd_w = self.sd_ln_tw.or(self.sd_ln_t0);
        let corr = self.corr_ln_tau_ln_tw.or(self.corr_ln_tau_ln_t0);
        if let (Some(st), Some(sw), Some(r)) = (self.sd_ln_tau, sd_w, corr) {
            q.push_str(&format!(
                "&tau-sigma={}&tw-sigma={}&tau-tw-corr={r:.6}",
                e(st),
                e(sw)
            ));
        }
        Some(q)
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let mut facts = vec![match self.kind {
            "counts" => "Poisson maximum likelihood; 95 % intervals from the profile \
                         likelihood; rows with no failures are used as they are."
                .to_string(),
            "delay" if self.method == Some("coth") => "Least squares of the whole sweep to \
                tcq + tau ln(1 + k / (exp(k |offset - m| / ds) - 1)), tw = 2 ds (k = 2: tau ln \
                coth(|offset - m| / ds)), which follows the log law near the balance point \
                and returns to tcq smoothly far from it (Levenberg-Marquardt); 95 % Student-t \
                intervals from the curvature at the fit."
                .to_string(),
            "delay" => "Least squares of the extra delay against ln |offset - balance offset| \
                        over the regenerative region (method=log); 95 % Student-t intervals \
                        with the balance offset held at its fit."
                .to_string(),
            _ => "Least squares of the decision time against ln vin; 95 % Student-t intervals."
                .to_string(),
        }];
        if self.kind == "delay" {
            facts.push(
                "Window convention: near the balance point the extra delay is tau ln(tw / (2 \
                 |offset - m|)), so the offsets leaving more than tr of extra delay span tw \
                 exp(-tr/tau) in all (the synchronizer's tw). A flow that writes tau ln(w / \
                 |offset - m|) has w = tw/2: halve the tw here to compare."
                    .to_string(),
            );
            let left: Vec<String> = self
                .points
                .iter()
                .filter(|p| !p.used)
                .map(|p| {
                    format!(
                        "line {} ({})",
                        p.line,
                        p.reason.trim_start_matches("left out: ")
                    )
                })
                .collect();
            if !left.is_empty() {
                facts.push(format!("Left out: {}.", left.join("; ")));
            }
        }
        Outcome {
            inputs: self.inputs.clone(),
            readouts: self.readouts(),
            facts,
            warnings: self.warnings.clone(),
            unused: Vec::new(),
            target_missed: false,
            links: self.links(),
        }
    }
}

fn points(label: &str, pts: Vec<(f64, f64)>) -> Curve {
    Curve {
        label: label.to_string(),
        points: pts,
        points_only: true,
    }
}

fn line(label: &str, pts: Vec<(f64, f64)>) -> Curve {
    Curve {
        label: label.to_string(),
        points: pts,
        points_only: false,
    }
}

/// The plots: the data and the fit on the scales where the law is a straight line, and
/// the residuals.
pub fn plots(f: &Fitted) -> Vec<Plot> {
    match (&f.case, &f.fit) {
        (
            FitCase::Counts {
                counts: d,
                fclk,
                fdata,
                ..
            },
            Fit::Counts(fit),
        ) => {
            let fclk = fclk.get();
            let measured: Vec<(f64, f64)> = (0..d.tr.len())
                .filter(|&i| d.failures[i] > 0.0)
                .map(|i| {
                    (
                        d.tr[i],
                        (d.failures[i] / (d.duration[i] * fdata.get())).log10(),
                    )
                })
                .collect();
            let (lo, hi) =
                d.tr.iter()
                    .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), t| {
                        (a.min(*t), b.max(*t))
                    });
            let fitted: Vec<(f64, f64)> = lin_space(hi - lo, 100)
                .map(|x| lo + x)
                .map(|t| (t, counts::log10_per_edge(fit, fclk, t)))
                .collect();
            let mut p = Plot::new(
                "plot-fit",
                "Failures per data edge against resolution time (rows with none are off the log axis)",
                ("tr (s)", "s", Spacing::Linear),
            )
            .y("log10_failures_per_edge", "failures per data edge");
            p.curves = vec![points("measured", measured), line("fit", fitted)];
            let mut res = Plot::new(
                "plot-residuals",
                "Deviance residuals against resolution time",
                ("tr (s)", "s", Spacing::Linear),
            )
            .y("residual", "deviance residual")
            .linear_y("");
            res.curves = vec![points(
                "",
                d.tr.iter()
                    .copied()
                    .zip(fit.residuals.iter().copied())
                    .collect(),
            )];
            vec![p, res]
        }
        (FitCase::Delay { offset, delay, .. }, Fit::Delay(fit)) => {
            let dist = |o: f64| (o - fit.offset_m).abs();
            let split = |used: bool| -> Vec<(f64, f64)> {
                (0..offset.len())
                    .filter(|&i| (fit.uses[i] == Use::Used) == used && dist(offset[i]) > 0.0)
                    .map(|i| (dist(offset[i]), delay[i] - fit.tcq))
                    .collect()
            };
            let used = split(true);
            let (lo, hi) = used.iter().fold((f64::INFINITY, 0.0f64), |(a, b), p| {
                (a.min(p.0), b.max(p.0))
            });
            // The fitted extra delay at a distance: the whole-sweep model, or the log law.
            let model = |x: f64| match fit.tail_shape {
                Some(k) => fit.tau * super::delay::tail_law(x / (fit.tw / 2.0), k),
                None => fit.line.intercept + fit.line.slope * x.ln(),
            };
            let fitted = log_space(lo.max(f64::MIN_POSITIVE), hi.max(lo * 1.01), 60)
                .map(|x| (x, model(x)))
                .collect();
            let mut p = Plot::new(
                "plot-fit",
                "Extra delay against distance from the balance point",
                ("distance (s)", "s", Spacing::Log),
            )
            .y("extra_delay_s", "extra delay")
            .linear_y("s");
            p.curves = vec![
                points("used", used.clone()),
                points("left out", split(false)),
                line("fit", fitted),
            ];
            let mut res = Plot::new(
                "plot-residuals",
                "Residuals of the used points",
                ("distance (s)", "s", Spacing::Log),
            )
            .y("residual_s", "residual")
            .linear_y("s");
            res.curves = vec![points(
                "",
                used.iter().map(|&(x, y)| (x, y - model(x))).collect(),
            )];
            vec![p, res]
        }
        (FitCase::Comparator { vin, time, .. }, Fit::Comparator(fit)) => {
            let (lo, hi) = vin
                .iter()
                .fold((f64::INFINITY, 0.0f64), |(a, b), v| (a.min(*v), b.max(*v)));
            let fitted = log_space(lo, hi.max(lo * 1.01), 60)
                .map(|v| (v, fit.line.intercept + fit.line.slope * v.ln()))
                .collect();
            let mut p = Plot::new(
                "plot-fit",
                "Decision time against input",
                ("vin (V)", "V", Spacing::Log),
            )
            .y("time_s", "decision time")
            .linear_y("s");
            p.curves = vec![
                points(
                    "measured",
                    vin.iter().copied().zip(time.iter().copied()).collect(),
                ),
                line("fit", fitted),
            ];
            let mut res = Plot::new(
                "plot-residuals",
                "Residuals",
                ("vin (V)", "V", Spacing::Log),
            )
            .y("residual_s", "residual")
            .linear_y("s");
            res.curves = vec![points(
                "",
                vin.iter()
                    .zip(time)
                    .map(|(v, t)| (*v, t - fit.line.intercept - fit.line.slope * v.ln()))
                    .collect(),
            )];
            vec![p, res]
        }
        _ => Vec::new(),
    }
}
