//! The SAR converter's report: how often a conversion has a late decision, the code errors
//! it leaves by size, parked inputs, the verdict against a target, readouts and table.

use std::collections::BTreeMap;
use std::f64::consts::{LN_10, LN_2};

use serde::Serialize;

use crate::calculator::{Outcome, TextTable};
use crate::latch::TauSource;
use crate::numeric::normal::ln_sum_exp_of;
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::{CAUTION, FIT_PER_RATE, YEAR_S};
use crate::units::{format_decades, format_duration_log10, format_log10, format_number, format_si};

use super::input::{Consume, ConvCase, Target, Timing};
use super::model::{async_timeouts, ln_p_static, ln_p_sync, sync_hard_errors, worst_static_code};

/// Code errors of at least `lsb` LSB per conversion.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SizeRate {
    /// The error size, LSB.
    pub lsb: u64,
    /// log10 of its probability per conversion (null: no error this large can occur).
    pub log10_p: Option<f64>,
}

/// Everything a converter case yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ConvReport {
    /// Normalised inputs.
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// `sync` or `async`.
    pub timing: &'static str,
    /// Resolution B.
    pub bits: u32,
    /// Regeneration time constant, s.
    pub tau_s: f64,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// The LSB, V.
    pub lsb_v: f64,
    /// The decision level at the comparator's input, vmin / gain, in LSB.
    pub vx_lsb: f64,
    /// The time the decisions of a conversion share, tconv - B tfix, s (async).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decision_budget_s: Option<f64>,
    /// The regeneration time of a decision (sync) or the shared budget (async), in tau.
    pub time_in_tau: f64,
    /// log10 of the probability per conversion that a decision is late.
    pub log10_p_meta: f64,
    /// log10 of late decisions per second.
    pub log10_errors_per_s: f64,
    /// log10 of the mean time between late decisions, s.
    pub log10_mean_time_between_errors_s: f64,
    /// Code errors of at least k LSB per conversion, k = 1, 2, 4, ... 2^(B-1).
    pub p_error_at_least: Vec<SizeRate>,
    /// The share of late decisions in the last step (async).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub last_step_share: Option<f64>,
    /// The share of late decisions at each step, MSB first.
    pub timeout_share_by_step: Vec<f64>,
    /// Mean square code error, LSB^2 (0 when below the smallest f64; see the log).
    pub mean_square_error_lsb2: f64,
    /// log10 of the mean square code error in LSB^2.
    pub log10_mean_square_error_lsb2: f64,
    /// The ENOB lost to these errors, bits (0 when below the smallest f64; see the log).
    pub enob_loss_bits: f64,
    /// log10 of the ENOB loss in bits.
    pub log10_enob_loss_bits: f64,
    /// The threshold code where a parked input has late decisions most often.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub worst_static_code: Option<u64>,
    /// log10 of late decisions per conversion for an input parked at the worst code.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_p_static_worst: Option<f64>,
    /// log10 of late decisions per conversion for an input parked at `static`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_p_static: Option<f64>,
    /// The error size the target counts, LSB (margin-lsb; 0 when every late decision counts).
    pub counted_lsb: u64,
    /// log10 of code errors of at least margin-lsb per conversion (null: none can occur).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_ber_meta: Option<Option<f64>>,
    /// The target as counted errors per conversion, log10.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_target_per_conversion: Option<f64>,
    /// Whether the counted errors meet the target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_target: Option<bool>,
    /// Decades by which the target is met (negative: missed; null: see `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<Option<f64>>,
    /// The regeneration time per bit that meets the target, s (sync).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tbit_needed_s: Option<Option<f64>>,
    /// The conversion time that meets the target, s (async).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tconv_needed_s: Option<Option<f64>>,
    /// For each result that is null: why it does not apply.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// Parameters given but not used by this timing.
    pub unused: Vec<&'static str>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

/// Where a case's late decisions land and the code errors they leave (ln probabilities
/// per conversion).
struct Errors {
    ln_p_meta: f64,
    share_by_step: Vec<f64>,
    ln_p_error: BTreeMap<u64, f64>,
}

impl Errors {
    fn of(case: &ConvCase) -> Errors {
        let (bits, vx) = (case.bits, case.vx_lsb());
        match case.timing {
            Timing::Sync { tbit, consume } => {
                let ln_p = ln_p_sync(bits, tbit.get() / case.tau.get(), vx);
                let n = ((1u64 << bits) - 1) as f64;
                let ln_p_meta = ln_p + n.ln();
                let ln_p_error = match consume {
                    // The search stays consistent: the code is the threshold's or the one
                    // below, each half of the time, so half the late decisions are 1 LSB off.
                    Consume::Benign => BTreeMap::from([(1, ln_p_meta - LN_2)]),
                    Consume::Hard => sync_hard_errors(bits, ln_p),
                };
                Errors {
                    ln_p_meta,
                    share_by_step: (1..=bits).map(|i| f64::from(1u32 << (i - 1)) / n).collect(),
                    ln_p_error,
                }
            }
            Timing::Async { fill, .. } => {
                let r = async_timeouts(bits, budget_tau(case), vx, fill);
                Errors {
                    ln_p_meta: r.ln_p_meta,
                    share_by_step: r.share_by_step,
                    ln_p_error: r.ln_p_error,
                }
            }
        }
    }

    /// ln P(|e| >= k); -inf when no error is that large.
    fn ln_at_least(&self, k: u64) -> f64 {
        ln_sum_exp_of(self.ln_p_error.range(k..).map(|(_, p)| *p))
    }

    /// ln E[e^2] in LSB^2.
    fn ln_mean_square(&self) -> f64 {
        ln_sum_exp_of(
            self.ln_p_error
                .iter()
                .map(|(e, p)| 2.0 * (*e as f64).ln() + p),
        )
    }
}

/// The time the decisions share (async) or each decision gets (sync), in tau.
fn budget_tau(case: &ConvCase) -> f64 {
    match case.timing {
        Timing::Sync { tbit, .. } => tbit.get() / case.tau.get(),
        Timing::Async { tconv, tfix, .. } => {
            (tconv.get() - f64::from(case.bits) * tfix.get()) / case.tau.get()
        }
    }
}

/// ln of the ENOB loss, 0.5 log2(1 + 12 E[e^2]), from ln E[e^2], accurate when tiny.
fn ln_enob_loss(ln_e2: f64) -> f64 {
    let x = 12f64.ln() + ln_e2;
    if x < -30.0 {
        // log2(1 + y) / 2 = y / (2 ln 2) to within y^2.
        x - (2.0 * LN_2).ln()
    } else {
        (0.5 * x.exp().ln_1p() / LN_2).ln()
    }
}

/// ln of the late decisions per conversion of an input parked at `code`, and the worst
/// threshold code with its rate (domain notes section 11).
fn parked(case: &ConvCase, sigma: f64, code: Option<u64>) -> (u64, f64, Option<f64>) {
    let (bits, vx) = (case.bits, case.vx_lsb());
    let sigma_lsb = sigma / case.lsb();
    match case.timing {
        Timing::Sync { .. } => {
            // Every threshold gets the same time: the MSB's is named, its error the largest.
            let ln_phi0 = -0.5 * (2.0 * std::f64::consts::PI).ln();
            let ln = (2.0 * vx / sigma_lsb).ln() + ln_phi0 - budget_tau(case);
            (1 << (bits - 1), ln, code.map(|_| ln))
        }
        Timing::Async { .. } => {
            let tb = budget_tau(case);
            let (worst, _) = worst_static_code(bits, vx);
            let ln_worst = ln_p_static(bits, tb, vx, sigma_lsb, worst).0;
            let at = code.map(|c| ln_p_static(bits, tb, vx, sigma_lsb, c).0);
            (worst, ln_worst, at)
        }
    }
}

/// Evaluates a converter case.
pub fn evaluate(case: &ConvCase) -> ConvReport {
    let errs = Errors::of(case);
    let tau = case.tau.get();
    let ln_fs = case.fs.get().ln();
    let mut warnings = case.notes.clone();
    let mut not_applicable = Vec::new();
    if errs.ln_p_meta > -0.1 {
        warnings.push(
            "Most conversions have a late decision: the time is far too short, and the \
             small-probability model behind these figures no longer holds (probabilities \
             are shown at most 1)."
                .into(),
        );
    }
    if !case.gain_given {
        warnings.push("gain not given: taken as 1 (a bare latch with no preamplifier).".into());
    }
    let clamp = |ln: f64| ln.min(0.0) / LN_10;
    // Past the model's reach (P_meta above 1) the error sizes are scaled to one late
    // decision per conversion, so that no rate and no mean square is larger than that.
    let excess = errs.ln_p_meta.max(0.0);
    let p_error_at_least: Vec<SizeRate> = (0..case.bits)
        .map(|j| {
            let k = 1u64 << j;
            let ln = errs.ln_at_least(k) - excess;
            SizeRate {
                lsb: k,
                log10_p: ln.is_finite().then(|| clamp(ln)),
            }
        })
        .collect();
    if p_error_at_least.iter().any(|s| s.log10_p.is_none()) {
        not_applicable.push((
            "p_error_at_least",
            "benign consumption keeps every code error within 1 LSB".to_string(),
        ));
    }
    let ln_e2 = errs.ln_mean_square() - excess;
    let ln_enob = ln_enob_loss(ln_e2);
    let static_result = case
        .sigma_n
        .map(|s| parked(case, s.get(), case.static_code));
    if let Some(s) = case.sigma_n {
        if s.get() > case.lsb() {
            warnings.push(format!(
                "sigma-n is {:.3} LSB: the parked-input figure takes the other decisions' \
                 inputs as free of noise, which holds for noise well below 1 LSB.",
                s.get() / case.lsb()
            ));
        }
    }
    // What the target counts: every late decision, or code errors of margin-lsb or more.
    let counted_lsb = case.margin_lsb.unwrap_or(0);
    let ln_counted = match case.margin_lsb {
        Some(k) => errs.ln_at_least(k),
        None => errs.ln_p_meta,
    };
    let log10_ber_meta = case
        .margin_lsb
        .map(|_| ln_counted.is_finite().then(|| clamp(ln_counted - excess)));
    let none_counted =
        format!("no code error of {counted_lsb} LSB or more can occur under benign consumption");
    if log10_ber_meta == Some(None) {
        not_applicable.push(("log10_ber_meta", none_counted.clone()));
    }
    let ln_target = case.target.map(|t| match t {
        Target::Ber(b) => b.ln(),
        Target::Fit(f) => f.ln() - ln_fs - FIT_PER_RATE.ln(),
    });
    let margin_decades = ln_target.map(|t| {
        ln_counted
            .is_finite()
            .then(|| (t - ln_counted.min(0.0)) / LN_10)
    });
    // Every late-decision probability scales as exp(-time / tau) in both timings, so the
    // time that meets the target follows in closed form.
    let needed = ln_target.map(|t| {
        ln_counted.is_finite().then(|| match case.timing {
            Timing::Sync { tbit, .. } => (tbit.get() + tau * (ln_counted - t)).max(0.0),
            Timing::Async { tconv, tfix, .. } => {
                (tconv.get() + tau * (ln_counted - t)).max(f64::from(case.bits) * tfix.get())
            }
        })
    });
    if matches!(margin_decades, Some(None)) {
        not_applicable.push(("margin_decades", none_counted.clone()));
    }
    let (tbit_needed_s, tconv_needed_s) = match case.timing {
        Timing::Sync { .. } => {
            if matches!(needed, Some(None)) {
                not_applicable.push(("tbit_needed_s", none_counted.clone()));
            }
            (needed, None)
        }
        Timing::Async { .. } => {
            if matches!(needed, Some(None)) {
                not_applicable.push(("tconv_needed_s", none_counted.clone()));
            }
            (None, needed)
        }
    };
    let (timing, decision_budget_s, last_step_share) = match case.timing {
        Timing::Sync { .. } => ("sync", None, None),
        Timing::Async { .. } => (
            "async",
            Some(budget_tau(case) * tau),
            errs.share_by_step.last().copied(),
        ),
    };
    ConvReport {
        inputs: case.echo(),
        timing,
        bits: case.bits,
        tau_s: tau,
        tau_source: case.tau_source,
        lsb_v: case.lsb(),
        vx_lsb: case.vx_lsb(),
        decision_budget_s,
        time_in_tau: budget_tau(case),
        log10_p_meta: clamp(errs.ln_p_meta),
        log10_errors_per_s: (errs.ln_p_meta.min(0.0) + ln_fs) / LN_10,
        log10_mean_time_between_errors_s: -(errs.ln_p_meta.min(0.0) + ln_fs) / LN_10,
        p_error_at_least,
        last_step_share,
        timeout_share_by_step: errs.share_by_step.clone(),
        mean_square_error_lsb2: ln_e2.exp(),
        log10_mean_square_error_lsb2: ln_e2 / LN_10,
        enob_loss_bits: ln_enob.exp(),
        log10_enob_loss_bits: ln_enob / LN_10,
        worst_static_code: static_result.map(|s| s.0),
        log10_p_static_worst: static_result.map(|s| clamp(s.1)),
        log10_p_static: static_result.and_then(|s| s.2).map(clamp),
        counted_lsb,
        log10_ber_meta,
        log10_target_per_conversion: ln_target.map(|t| t / LN_10),
        meets_target: ln_target.map(|t| (ln_counted - excess).min(0.0) <= t),
        margin_decades,
        tbit_needed_s,
        tconv_needed_s,
        not_applicable,
        unused: case.unused.clone(),
        warnings,
        caution: CAUTION,
    }
}

/// A count of LSB as a person writes it: `1024`, `102.4`, else 4 significant digits.
fn plain_or_sig(v: f64) -> String {
    if (1.0..1e7).contains(&v) {
        let t = format!("{v:.3}");
        t.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        crate::units::format_sig(v, 4)
    }
}

impl ConvReport {
    /// The results as named readouts; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let na = &self.not_applicable;
        let mut v = vec![
            Readout::new("tau_s", "tau", format_si(self.tau_s, "s"), Some(self.tau_s)),
            Readout::new("lsb_v", "LSB", format_si(self.lsb_v, "V"), Some(self.lsb_v)),
            Readout::new(
                "vx_lsb",
                "decision level at the input, vmin/gain",
                format!(
                    "{} LSB ({})",
                    plain_or_sig(self.vx_lsb),
                    format_si(self.vx_lsb * self.lsb_v, "V")
                ),
                Some(self.vx_lsb),
            ),
        ];
        if let Some(b) = self.decision_budget_s {
            v.push(Readout::new(
                "decision_budget_s",
                "time the decisions share, tconv - bits x tfix",
                format!(
                    "{} = {} tau",
                    format_si(b, "s"),
                    format_number(self.time_in_tau)
                ),
                Some(b),
            ));
        }
        v.push(Readout::new(
            "log10_p_meta",
            "late decisions per conversion",
            format_log10(self.log10_p_meta, 4),
            Some(self.log10_p_meta),
        ));
        v.push(Readout::new(
            "log10_errors_per_s",
            "late decisions per second",
            format!("{} /s", format_log10(self.log10_errors_per_s, 4)),
            Some(self.log10_errors_per_s),
        ));
        v.push(Readout::new(
            "log10_mean_time_between_errors_s",
            "mean time between late decisions",
            format_duration_log10(self.log10_mean_time_between_errors_s, YEAR_S.log10()),
            Some(self.log10_mean_time_between_errors_s),
        ));
        if let Some(s) = self.last_step_share {
            v.push(Readout::new(
                "last_step_share",
                "share of late decisions in the last step",
                format!("{:.5} %", s * 100.0),
                Some(s),
            ));
        }
        if let Some(b) = self.log10_ber_meta {
            v.push(Readout::maybe(
                "log10_ber_meta",
                "code errors of margin-lsb or more per conversion",
                b,
                |b| format_log10(b, 4),
                na,
            ));
        }
        v.push(Readout::new(
            "mean_square_error_lsb2",
            "mean square code error",
            format!(
                "{} LSB²",
                format_log10(self.log10_mean_square_error_lsb2, 4)
            ),
            Some(self.mean_square_error_lsb2),
        ));
        v.push(Readout::new(
            "enob_loss_bits",
            "ENOB loss",
            format!("{} bit", format_log10(self.log10_enob_loss_bits, 4)),
            Some(self.enob_loss_bits),
        ));
        if let Some(c) = self.worst_static_code {
            v.push(Readout::new(
                "worst_static_code",
                "worst code for a parked input",
                format!("{c} ({:0w$b})", c, w = self.bits as usize),
                Some(c as f64),
            ));
        }
        if let Some(p) = self.log10_p_static_worst {
            v.push(Readout::new(
                "log10_p_static_worst",
                "parked at the worst code: late decisions per conversion",
                format_log10(p, 4),
                Some(p),
            ));
        }
        if let Some(p) = self.log10_p_static {
            v.push(Readout::new(
                "log10_p_static",
                "parked at the static code: late decisions per conversion",
                format_log10(p, 4),
                Some(p),
            ));
        }
        if let (Some(met), Some(m)) = (self.meets_target, self.margin_decades) {
            match m {
                Some(m) => {
                    v.push(Readout::verdict(met, m));
                    v.push(Readout::margin(m));
                }
                None => {
                    v.push(
                        Readout::new(
                            "meets_target",
                            "target",
                            "met: no error this large".into(),
                            Some(1.0),
                        )
                        .judged(true),
                    );
                    v.push(Readout::maybe(
                        "margin_decades",
                        "margin",
                        None,
                        format_decades,
                        na,
                    ));
                }
            }
        }
        if let Some(t) = self.tbit_needed_s {
            v.push(Readout::maybe(
                "tbit_needed_s",
                "regeneration time per bit needed",
                t,
                |t| format_si(t, "s"),
                na,
            ));
        }
        if let Some(t) = self.tconv_needed_s {
            v.push(Readout::maybe(
                "tconv_needed_s",
                "conversion time needed",
                t,
                |t| format_si(t, "s"),
                na,
            ));
        }
        v
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let mut facts = vec![format!(
            "Probabilities are per conversion, for an input spread evenly over the full \
             scale ({} bits, {} thresholds).",
            self.bits,
            (1u64 << self.bits) - 1
        )];
        facts.push(if self.counted_lsb == 0 {
            "The target counts every late decision (give margin-lsb to count only code \
             errors of that size or more)."
                .to_string()
        } else {
            format!(
                "The target counts code errors of {} LSB or more.",
                self.counted_lsb
            )
        });
        let how = self
            .inputs
            .iter()
            .find(|(k, _)| *k == "consume" || *k == "fill")
            .map(|(_, v)| v.as_str());
        facts.push(match (self.timing, how) {
            ("sync", Some("benign")) => "sync, benign: a late decision resolves one way for \
                 both the DAC and the register, so the code is off by at most 1 LSB, in half \
                 of the cases."
                .to_string(),
            ("sync", _) => "sync, hard: a late decision at step i (MSB = 1) leaves an error \
                 of 2^(bits-i) or 2^(bits-i) - 1 LSB, equally likely; the MSB's is half the \
                 full scale. So P(|e| >= 2^k) = (3 x 2^(bits-k-2) - 1) p for k <= bits - 2; \
                 the simpler bound (2^(bits-k) - 1) p also counts the smaller error of step \
                 bits - k."
                .to_string(),
            (_, Some("midpoint")) => format!(
                "async, midpoint: a timed-out bit is set to 1 and the rest to 0. The shared \
                 budget is {} tau; nearly every timeout lands in the last decision.",
                format_number(self.time_in_tau)
            ),
            _ => format!(
                "async, reset: a timed-out bit and the rest stay 0. The shared budget is \
                 {} tau; nearly every timeout lands in the last decision.",
                format_number(self.time_in_tau)
            ),
        });
        facts.push(
            "ENOB loss is 0.5 log2(1 + 12 E[e^2]): tests of SNDR cannot see metastability \
             at rates that matter, so judge by the code-error rates."
                .to_string(),
        );
        Outcome {
            inputs: self.inputs.clone(),
            readouts: self.readouts(),
            facts,
            warnings: self.warnings.clone(),
            unused: self.unused.clone(),
            target_missed: self.meets_target == Some(false),
            links: Vec::new(),
        }
    }

    /// The code errors by size: per conversion, per second and per day at `fs`.
    pub fn size_table(&self) -> TextTable {
        let ln_fs = self.log10_errors_per_s - self.log10_p_meta;
        let day = 86400f64.log10();
        TextTable {
            title: "Code errors of at least k LSB".into(),
            header: vec![
                "k (LSB)".into(),
                "per conversion".into(),
                "per second".into(),
                "per day".into(),
            ],
            rows: self
                .p_error_at_least
                .iter()
                .map(|s| {
                    let mut row = vec![s.lsb.to_string()];
                    match s.log10_p {
                        Some(p) => row.extend([
                            format_log10(p, 4),
                            format_log10(p + ln_fs, 4),
                            format_log10(p + ln_fs + day, 4),
                        ]),
                        None => row.extend(["cannot occur".to_string(), "0".into(), "0".into()]),
                    }
                    row
                })
                .collect(),
            total: self.p_error_at_least.len(),
        }
    }
}
