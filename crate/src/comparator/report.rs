//! The comparator's report: every result of a case, its readouts, notes and plots.

use std::f64::consts::LN_10;

use serde::Serialize;

use crate::calculator::Outcome;
use crate::chart::Plot;
use crate::numeric::normal::ln_sum_exp;
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::{CAUTION, YEAR_S};
use crate::units::{format_decades, format_duration_log10, format_log10, format_si};

use super::input::CompCase;
use super::model::{decision_time, InputModel, TauSource};
use super::sweep::{growth, p_vs_spread, p_vs_tau, p_vs_treg};

/// Everything a comparator case yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CompReport {
    /// Normalised inputs.
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// Input model name.
    pub input_model: &'static str,
    /// Regeneration time constant, s.
    pub tau_s: f64,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// Total regeneration time including extra stages, s.
    pub treg_total_s: f64,
    /// Critical input, V (null below the smallest normal f64; see `log10_vcrit_v`).
    pub vcrit_v: Option<f64>,
    /// log10 of the critical input in volts.
    pub log10_vcrit_v: f64,
    /// log10 of the metastability error probability per decision.
    pub log10_p_error: f64,
    /// log10 of metastability errors per second.
    pub log10_errors_per_s: f64,
    /// log10 of the mean time between metastability errors, s.
    pub log10_mean_time_between_errors_s: f64,
    /// log10 of the noise-only error ratio (data-link models).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_p_noise: Option<f64>,
    /// log10 of the total (metastability plus noise) error ratio.
    pub log10_p_total: f64,
    /// The target error ratio.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub target_ber: Option<f64>,
    /// Whether the total error ratio (metastability plus noise) meets the target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_target: Option<bool>,
    /// Decades by which the total meets the target (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<f64>,
    /// Decades by which metastability alone meets the target (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub metastability_margin_decades: Option<f64>,
    /// Total regeneration time needed for the target, noise included, s (null: see
    /// `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub treg_needed_s: Option<Option<f64>>,
    /// Largest tau meeting the target at this regeneration time, s (null: see
    /// `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_tau_s: Option<Option<f64>>,
    /// Extra stages needed beyond treg (null: see `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub extra_stages_needed: Option<Option<u64>>,
    /// Decision time for `vin`, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decision_time_s: Option<f64>,
    /// For each result that is null: why it does not apply.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// Parameters given but not used by the input model.
    pub unused: Vec<&'static str>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

/// Evaluates a comparator case.
pub fn evaluate(case: &CompCase) -> CompReport {
    let c = &case.comp;
    let ln_vc = c.ln_vcrit();
    let ln_p = c.ln_p_error();
    let ln_noise = c.ln_p_noise();
    let ln_total = match ln_noise {
        Some(n) => ln_sum_exp(&[ln_p, n]).min(0.0),
        None => ln_p,
    };
    let ln_rate = ln_p + case.fs.get().ln();
    let ln_target = case.target_ber.map(f64::ln);
    let mut warnings = case.notes.clone();
    let mut not_applicable = Vec::new();
    // What the target leaves for metastability once noise has taken its share.
    let budget = ln_target.map(|t| match ln_noise {
        Some(n) if n >= t => None,
        Some(n) => Some(t + ln_one_minus_exp(n - t)),
        None => Some(t),
    });
    if let (Some(None), Some(n)) = (budget, ln_noise) {
        warnings.push(format!(
            "Noise alone (error ratio {}) misses the target: no regeneration time or tau \
             meets it; the signal-to-noise ratio amp/sigma must rise first.",
            format_log10(n / LN_10, 3)
        ));
        for key in ["treg_needed_s", "max_tau_s", "extra_stages_needed"] {
            not_applicable.push((key, "noise alone misses the target".to_string()));
        }
    }
    let sizing = budget.map(|b| b.map(|b| c.size_for(b)));
    if ln_p >= -1e-12 {
        warnings.push("Every decision is at risk: vcrit is as large as the input spread, so the regeneration time is far too short.".into());
    }
    if let InputModel::Nrz { amp, sigma } | InputModel::Pam4 { amp, sigma } = c.input() {
        if amp / sigma < 3.0 {
            warnings.push(format!(
                "amp/sigma = {:.2}: noise alone causes frequent errors.",
                amp / sigma
            ));
        }
    }
    if c.treg_total() == 0.0 {
        warnings.push(
            "No regeneration time: the comparator decides only inputs already above vmin/gain."
                .into(),
        );
    }
    if !case.gain_given {
        warnings.push("gain not given: taken as 1 (a bare latch with no preamplifier).".into());
    }
    let vcrit_v = Some(ln_vc.exp()).filter(|v| v.is_normal());
    if vcrit_v.is_none() {
        not_applicable.push((
            "vcrit_v",
            "below the smallest normal f64: see log10_vcrit_v".to_string(),
        ));
    }
    let max_tau_s = sizing.map(|z| {
        z.and_then(|z| {
            z.max_tau_s.or_else(|| {
                not_applicable.push((
                    "max_tau_s",
                    "any tau: the target is met without regeneration".to_string(),
                ));
                None
            })
        })
    });
    let extra_stages_needed = sizing.map(|z| {
        z.and_then(|z| {
            z.extra_stages.or_else(|| {
                not_applicable.push(("extra_stages_needed", "give stage-time".to_string()));
                None
            })
        })
    });
    CompReport {
        inputs: case.echo(),
        input_model: c.input().name(),
        tau_s: c.tau().get(),
        tau_source: c.tau_source(),
        treg_total_s: c.treg_total(),
        vcrit_v,
        log10_vcrit_v: ln_vc / LN_10,
        log10_p_error: ln_p / LN_10,
        log10_errors_per_s: ln_rate / LN_10,
        log10_mean_time_between_errors_s: -ln_rate / LN_10,
        log10_p_noise: ln_noise.map(|n| n / LN_10),
        log10_p_total: ln_total / LN_10,
        target_ber: case.target_ber,
        meets_target: ln_target.map(|t| ln_total <= t),
        margin_decades: ln_target.map(|t| (t - ln_total) / LN_10),
        metastability_margin_decades: ln_target.map(|t| (t - ln_p) / LN_10),
        treg_needed_s: sizing.map(|z| z.map(|z| z.treg_needed_s)),
        max_tau_s,
        extra_stages_needed,
        decision_time_s: case
            .vin
            .map(|v| decision_time(c.tau().get(), c.vmin().get(), c.gain(), v.get())),
        not_applicable,
        unused: case.unused.clone(),
        warnings,
        caution: CAUTION,
    }
}

/// ln(1 - e^x) for x < 0, accurate at both ends.
fn ln_one_minus_exp(x: f64) -> f64 {
    if x > -std::f64::consts::LN_2 {
        (-x.exp_m1()).ln()
    } else {
        (-x.exp()).ln_1p()
    }
}

impl CompReport {
    /// The results as named readouts; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        // A PAM4 decision is a symbol, made by three slicers at once: say so.
        let pam4 = self.input_model == "pam4";
        let pick = |plain: &'static str, symbol: &'static str| if pam4 { symbol } else { plain };
        let na = &self.not_applicable;
        let mut v = vec![
            Readout::new("tau_s", "tau", format_si(self.tau_s, "s"), Some(self.tau_s)),
            Readout::new(
                "treg_total_s",
                "total regeneration time",
                format_si(self.treg_total_s, "s"),
                Some(self.treg_total_s),
            ),
            Readout::new(
                "log10_vcrit_v",
                "critical input vcrit",
                format!("{} V", format_log10(self.log10_vcrit_v, 3)),
                Some(self.log10_vcrit_v),
            ),
            Readout::new(
                "log10_p_error",
                pick(
                    "metastability error probability",
                    "metastability symbol error probability",
                ),
                format_log10(self.log10_p_error, 3),
                Some(self.log10_p_error),
            ),
            Readout::new(
                "log10_errors_per_s",
                pick(
                    "metastability errors per second",
                    "metastability symbol errors per second",
                ),
                format!("{} /s", format_log10(self.log10_errors_per_s, 3)),
                Some(self.log10_errors_per_s),
            ),
            Readout::new(
                "log10_mean_time_between_errors_s",
                "mean time between errors",
                format_duration_log10(self.log10_mean_time_between_errors_s, YEAR_S.log10()),
                Some(self.log10_mean_time_between_errors_s),
            ),
        ];
        if let Some(n) = self.log10_p_noise {
            v.push(Readout::new(
                "log10_p_noise",
                pick("noise-only error ratio", "noise-only symbol error ratio"),
                format_log10(n, 3),
                Some(n),
            ));
        }
        v.push(Readout::new(
            "log10_p_total",
            pick("total error ratio", "total symbol error ratio"),
            format_log10(self.log10_p_total, 3),
            Some(self.log10_p_total),
        ));
        if let (Some(met), Some(m)) = (self.meets_target, self.margin_decades) {
            v.push(Readout::verdict(met, m));
            v.push(Readout::margin(m));
        }
        if let Some(m) = self.metastability_margin_decades {
            v.push(
                Readout::new(
                    "metastability_margin_decades",
                    "margin of metastability alone",
                    format!("{} decades", format_decades(m)),
                    Some(m),
                )
                .judged(m >= 0.0),
            );
        }
        if let Some(t) = self.treg_needed_s {
            v.push(Readout::maybe(
                "treg_needed_s",
                "regeneration time needed",
                t,
                |t| format_si(t, "s"),
                na,
            ));
        }
        if let Some(t) = self.max_tau_s {
            v.push(Readout::maybe(
                "max_tau_s",
                "largest tau allowed",
                t,
                |t| format_si(t, "s"),
                na,
            ));
        }
        if let Some(n) = self.extra_stages_needed {
            v.push(Readout::maybe(
                "extra_stages_needed",
                "extra stages needed",
                n.map(|n| n as f64),
                |n| format!("{n:.0}"),
                na,
            ));
        }
        if let Some(t) = self.decision_time_s {
            v.push(Readout::new(
                "decision_time_s",
                "decision time for vin",
                format_si(t, "s"),
                Some(t),
            ));
        }
        v
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let mut facts = vec![format!(
            "Input model: {}. Probabilities are per decision.",
            self.input_model
        )];
        if self.input_model == "pam4" {
            facts.push(
                "PAM4: a decision is one symbol, made by three slicers at once; fs counts \
                 symbols per second and the ratios are symbol error ratios (with Gray \
                 coding a symbol error is about one bit error in two bits)."
                    .to_string(),
            );
        } else if self.log10_p_noise.is_some() {
            facts.push(
                "For a receiver the probabilities are bit-error ratios; the target is met by \
                 the total, metastability plus noise."
                    .to_string(),
            );
        }
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
}

/// The plots of a case: error probability against regeneration time, tau and the input
/// spread, with the target line; and the latch's output growth for a few inputs.
pub fn plots(case: &CompCase) -> Vec<Plot> {
    let c = &case.comp;
    let target = case.target_ber.map(|t| (t.log10(), "target".to_string()));
    let reach = evaluate(case).treg_needed_s.flatten();
    let mut v = vec![
        p_vs_treg(c, reach, 200),
        p_vs_tau(c, 200),
        p_vs_spread(c, 60),
    ];
    for p in &mut v {
        p.hline.clone_from(&target);
    }
    v.push(growth(c, 240));
    v
}
