//! The synchronizer's report: every result of a case, its readouts, notes and plots.

use serde::Serialize;

use crate::calculator::Outcome;
use crate::chart::Plot;
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::{fleet_outcome, FleetOutcome, Target, CAUTION, YEAR_DAYS, YEAR_S};
use crate::units::{format_duration_log10, format_log10, format_si};

use super::input::{Crossing, SyncCase};
use super::model::{ClockLimit, Latch, StagesNeeded, TauLimit, MAX_STAGES, MAX_STAGES_ANSWER};
use super::sweep::{mtbf_vs_duty, mtbf_vs_fclk, mtbf_vs_phase, mtbf_vs_stages, mtbf_vs_tau};
use crate::crossing::input::warnings;

/// Everything a synchronizer case yields, ready to print or to serialise.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SyncReport {
    /// Window convention used, `tw` or `t0`.
    pub convention: &'static str,
    /// Days per year in the year figures.
    pub year_days: f64,
    /// Normalised inputs, serialised as an object in field order.
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// Time per extra stage in seconds (absent with an explicit tr).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub hop_time_s: Option<f64>,
    /// Resolution time in seconds.
    pub resolution_time_s: f64,
    /// log10 failure probability per data transition.
    pub log10_p_fail: f64,
    /// log10 failures per second.
    pub log10_rate_per_s: f64,
    /// log10 MTBF in seconds.
    pub log10_mtbf_s: f64,
    /// log10 MTBF in years.
    pub log10_mtbf_years: f64,
    /// log10 FIT.
    pub log10_fit: f64,
    /// The target, if any.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub target: Option<Target>,
    /// Whether the target is met.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_target: Option<bool>,
    /// Decades by which the target is met (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<f64>,
    /// Smallest chain length meeting the target (null: does not apply, see `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min_stages: Option<Option<u64>>,
    /// Highest fclk meeting the target at this depth, in Hz (null: none, see `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_fclk_hz: Option<Option<f64>>,
    /// Largest tau meeting the target at this resolution time, in seconds (null: see
    /// `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_tau_s: Option<Option<f64>>,
    /// Fleet figures, if a fleet was given.
    #[serde(flatten, skip_serializing_if = "Option::is_none")]
    pub fleet: Option<FleetOutcome>,
    /// Which chain model was used: `hops` (tsu/tcq per hop) or `master-slave bound`.
    pub chain_model: &'static str,
    /// Effective tau of a master-slave flip-flop, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tau_eff_s: Option<f64>,
    /// Each hop of a per-hop tau list: its tau, time and share of the exponent.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub hops: Vec<HopShare>,
    /// The clock factor of related clocks.
    #[serde(flatten, skip_serializing_if = "Option::is_none")]
    pub clocks: Option<ClockFactors>,
    /// The data rate a crossing kind implies, Hz.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fdata_hz: Option<f64>,
    /// For each result that is null: why it does not apply.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// Parameters given that this case does not use.
    pub unused: Vec<&'static str>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

/// One hop of a chain with a tau per hop.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HopShare {
    /// The hop's tau, s.
    pub tau_s: f64,
    /// The hop's resolution time, s.
    pub time_s: f64,
    /// The hop's share of the resolution exponent (and so of the margin it buys).
    pub share: f64,
}

/// The clock factor K of related clocks: the failure rate is K times the standard one.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ClockFactors {
    /// K applied (at the phase given, else at the worst phase); null below the smallest f64.
    pub clock_factor: Option<f64>,
    /// log10 K applied.
    pub log10_clock_factor: f64,
    /// K at the worst phase (edges centred on the sampling edge); null beyond an f64.
    pub clock_factor_worst: Option<f64>,
    /// log10 K at the worst phase.
    pub log10_clock_factor_worst: f64,
    /// K at the best phase (half a lattice spacing away); null below the smallest f64.
    pub clock_factor_best: Option<f64>,
    /// log10 K at the best phase.
    pub log10_clock_factor_best: f64,
    /// Whether the standard formula is within 1 % of K at every phase.
    pub standard_formula_safe: bool,
    /// Whether the phase was given (else the worst phase is used).
    pub phase_given: bool,
    /// The lattice spacing of edge offsets, s.
    pub lattice_spacing_s: f64,
}

fn normal(log10: f64) -> Option<f64> {
    Some(10f64.powf(log10)).filter(|v| v.is_normal())
}

/// Evaluates a case: results, solver answers for the target, fleet figures and warnings.
pub fn evaluate(case: &SyncCase) -> SyncReport {
    let s = &case.sync;
    let log10_rate = s.log10_rate();
    let log10_p = s.log10_p_fail();
    let target_max = case.target.map(Target::log10_max_rate);
    let mut not_applicable = Vec::new();
    let mut reason = |key: &'static str, why: &str| not_applicable.push((key, why.to_string()));
    let min_stages = target_max.map(|m| match s.min_stages(m) {
        StagesNeeded::Stages(n) => Some(n),
        StagesNeeded::TooMany => {
            reason(
                "min_stages",
                &format!(
                    "more than {MAX_STAGES_ANSWER}: the time per stage is far too short \
                     for this target"
                ),
            );
            None
        }
        StagesNeeded::NotApplicable => {
            reason("min_stages", "tr given: no chain to size");
            None
        }
    });
    let max_fclk_hz = target_max.map(|m| match s.max_fclk(s.stages(), m) {
        ClockLimit::Max(f) => Some(f),
        ClockLimit::Any => {
            reason("max_fclk_hz", "any clock up to 1 EHz meets the target");
            None
        }
        ClockLimit::None => {
            reason("max_fclk_hz", "no clock meets the target at this depth");
            None
        }
        ClockLimit::NotApplicable => {
            reason(
                "max_fclk_hz",
                "tr given: the resolution time does not follow the clock",
            );
            None
        }
        ClockLimit::Related => {
            reason(
                "max_fclk_hz",
                "related clocks: the clock factor changes with the clock",
            );
            None
        }
    });
    let fclk = s.fclk().get();
    let clocks = s.related().map(|c| {
        let (worst, best) = c.log10_factor_range(fclk);
        let applied = c.log10_factor(fclk);
        ClockFactors {
            clock_factor: normal(applied),
            log10_clock_factor: applied,
            clock_factor_worst: normal(worst),
            log10_clock_factor_worst: worst,
            clock_factor_best: normal(best),
            log10_clock_factor_best: best,
            standard_formula_safe: c.standard_formula_safe(fclk),
            phase_given: c.phase.is_some(),
            lattice_spacing_s: c.spacing(fclk),
        }
    });
    if let Some(k) = &clocks {
        for (key, v) in [
            ("clock_factor", k.clock_factor),
            ("clock_factor_worst", k.clock_factor_worst),
            ("clock_factor_best", k.clock_factor_best),
        ] {
            if v.is_none() {
                reason(key, "beyond the range of an f64: see its log10");
            }
        }
    }
    let tau_eff_s = match s.latch() {
        Latch::MasterSlave { .. } => Some(s.tau().get()),
        _ => None,
    };
    let hops = match s.latch() {
        Latch::PerHop { .. } => s
            .hop_shares()
            .into_iter()
            .map(|(tau_s, time_s, share)| HopShare {
                tau_s,
                time_s,
                share,
            })
            .collect(),
        _ => Vec::new(),
    };
    let max_tau_s = target_max.map(|m| match s.max_tau(m) {
        TauLimit::Max(t) => Some(t),
        TauLimit::Any => {
            reason(
                "max_tau_s",
                "any tau: the target is met without resolution time",
            );
            None
        }
        TauLimit::None => {
            reason("max_tau_s", "none: no resolution time to work with");
            None
        }
    });
    SyncReport {
        convention: s.window().name(),
        year_days: YEAR_DAYS,
        inputs: case.echo(),
        hop_time_s: s.tr().is_none().then(|| s.hop_time()),
        resolution_time_s: s.resolution_time(),
        log10_p_fail: log10_p,
        log10_rate_per_s: log10_rate,
        log10_mtbf_s: -log10_rate,
        log10_mtbf_years: -log10_rate - YEAR_S.log10(),
        log10_fit: s.log10_fit(),
        target: case.target,
        meets_target: target_max.map(|m| log10_rate <= m),
        margin_decades: target_max.map(|m| m - log10_rate),
        min_stages,
        max_fclk_hz,
        max_tau_s,
        fleet: case.fleet.map(|f| fleet_outcome(log10_rate, f)),
        chain_model: if s.is_bound() {
            "master-slave bound"
        } else {
            "hops"
        },
        tau_eff_s,
        hops,
        clocks,
        fdata_hz: (case.crossing != Crossing::Data).then(|| s.fdata().get()),
        not_applicable,
        unused: case.unused.clone(),
        warnings: warnings(case, log10_p),
        caution: CAUTION,
    }
}

impl SyncReport {
    /// The results as named readouts, in display order; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let l10y = YEAR_S.log10();
        let mut v = Vec::new();
        if let Some(h) = self.hop_time_s {
            v.push(Readout::new(
                "hop_time_s",
                "time per extra stage",
                format_si(h, "s"),
                Some(h),
            ));
        }
        v.extend([
            Readout::new(
                "resolution_time_s",
                "resolution time",
                format_si(self.resolution_time_s, "s"),
                Some(self.resolution_time_s),
            ),
            Readout::new(
                "log10_mtbf_years",
                "MTBF",
                format_duration_log10(self.log10_mtbf_s, l10y),
                Some(self.log10_mtbf_years),
            ),
            Readout::new(
                "log10_mtbf_s",
                "MTBF in seconds",
                format!("{} s", format_log10(self.log10_mtbf_s, 3)),
                Some(self.log10_mtbf_s),
            ),
            Readout::new(
                "log10_fit",
                "FIT",
                format_log10(self.log10_fit, 3),
                Some(self.log10_fit),
            ),
            Readout::new(
                "log10_p_fail",
                "failure probability per data edge",
                format_log10(self.log10_p_fail, 3),
                Some(self.log10_p_fail),
            ),
            Readout::new(
                "log10_rate_per_s",
                "failure rate",
                format!("{} /s", format_log10(self.log10_rate_per_s, 3)),
                Some(self.log10_rate_per_s),
            ),
        ]);
        if let Some(t) = self.tau_eff_s {
            v.push(Readout::new(
                "tau_eff_s",
                "effective tau (master-slave)",
                format_si(t, "s"),
                Some(t),
            ));
        }
        if let Some(f) = self.fdata_hz {
            v.push(Readout::new(
                "fdata_hz",
                "data edge rate implied",
                format_si(f, "Hz"),
                Some(f),
            ));
        }
        if let Some(k) = &self.clocks {
            let at = if k.phase_given { "" } else { " (worst phase)" };
            v.push(Readout::new(
                "log10_clock_factor",
                "clock factor K",
                format!("{}{at}", format_log10(k.log10_clock_factor, 3)),
                Some(k.log10_clock_factor),
            ));
            // Without a phase, K is the worst phase's already: one line per fact.
            if k.phase_given {
                v.push(Readout::new(
                    "log10_clock_factor_worst",
                    "K at the worst phase",
                    format_log10(k.log10_clock_factor_worst, 3),
                    Some(k.log10_clock_factor_worst),
                ));
            }
            v.extend([
                Readout::new(
                    "log10_clock_factor_best",
                    "K at the best phase",
                    format_log10(k.log10_clock_factor_best, 3),
                    Some(k.log10_clock_factor_best),
                ),
                Readout::new(
                    "standard_formula_safe",
                    "standard formula safe at every phase",
                    if k.standard_formula_safe { "yes" } else { "no" }.into(),
                    Some(if k.standard_formula_safe { 1.0 } else { 0.0 }),
                )
                .judged(k.standard_formula_safe),
            ]);
        }
        if let (Some(met), Some(margin)) = (self.meets_target, self.margin_decades) {
            v.push(Readout::verdict(met, margin));
            v.push(Readout::margin(margin));
        }
        if let Some(n) = self.min_stages {
            v.push(Readout::maybe(
                "min_stages",
                "smallest stage count for the target",
                n.map(|n| n as f64),
                |n| format!("{n:.0}"),
                &self.not_applicable,
            ));
        }
        if let Some(f) = self.max_fclk_hz {
            v.push(Readout::maybe(
                "max_fclk_hz",
                "highest fclk at this depth",
                f,
                |f| format_si(f, "Hz"),
                &self.not_applicable,
            ));
        }
        if let Some(t) = self.max_tau_s {
            v.push(Readout::maybe(
                "max_tau_s",
                "largest tau at this tr",
                t,
                |t| format_si(t, "s"),
                &self.not_applicable,
            ));
        }
        if let Some(f) = self.fleet {
            v.extend(f.readouts());
        }
        v
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let convention = if self.convention == "t0" {
            "Window convention: t0, counted from the clock edge."
        } else {
            "Window convention: tw, referred to the nominal clock-to-output delay."
        };
        let mut facts = vec![convention.to_string()];
        if self.chain_model == "master-slave bound" {
            facts.push(
                "Chain model: master-slave lower bound; each hop resolves for the whole \
                 period and the window grows as tw (tw2/tw)^(n-1)."
                    .to_string(),
            );
        }
        if !self.hops.is_empty() {
            let shares: Vec<String> = self
                .hops
                .iter()
                .enumerate()
                .map(|(i, h)| {
                    format!(
                        "hop {} (tau {}) {:.0} %",
                        i + 1,
                        format_si(h.tau_s, "s"),
                        100.0 * h.share
                    )
                })
                .collect();
            facts.push(format!(
                "Each hop's share of the margin: {}.",
                shares.join(", ")
            ));
        }
        if let Some(k) = &self.clocks {
            facts.push(format!(
                "Related clocks: data edges fall on a lattice {} apart; the failure rate is \
                 K times the standard one{}.",
                format_si(k.lattice_spacing_s, "s"),
                if k.standard_formula_safe {
                    ", and the standard formula is within 1 % of it at every phase"
                } else {
                    ""
                }
            ));
        }
        if let Some(f) = self.fdata_hz {
            let why = match self.inputs.iter().find(|(k, _)| *k == "crossing") {
                Some((_, kind)) if kind == "gray" => {
                    "a Gray-coded pointer changes exactly one bit per increment, so its bits \
                     together see one data edge per increment (not one per bit)"
                }
                Some((_, kind)) if kind == "handshake" => {
                    "request and acknowledge each toggle twice per four-phase transfer; the \
                     two synchronizers together fail at twice this rate"
                }
                _ => "a signal toggling with its activity on its launch clock",
            };
            facts.push(format!("fdata = {}: {why}.", format_si(f, "Hz")));
        }
        facts.push(format!(
            "A year is {} days; FIT counts failures per 1e9 device-hours.",
            self.year_days
        ));
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

/// The plots of a case: MTBF against depth, clock and tau, with the target line.
pub fn plots(case: &SyncCase) -> Vec<Plot> {
    let s = &case.sync;
    let target = case
        .target
        .map(|t| (t.log10_mtbf_years(), "target".to_string()));
    // The depth plot reaches past the depth the target needs, when one is asked.
    let needed = case
        .target
        .and_then(|t| match s.min_stages(t.log10_max_rate()) {
            StagesNeeded::Stages(n) => Some(n.min(u64::from(MAX_STAGES)) as u32),
            _ => None,
        })
        .unwrap_or(1);
    let deepest = (s.stages() + 4)
        .max(6)
        .max(needed.saturating_add(1))
        .min(MAX_STAGES);
    let mut v = vec![
        mtbf_vs_stages(s, deepest),
        mtbf_vs_fclk(s, 200),
        mtbf_vs_tau(s, 200),
    ];
    if matches!(s.latch(), Latch::MasterSlave { .. }) {
        v.push(mtbf_vs_duty(s, 91));
    }
    if s.related().is_some() {
        v.push(mtbf_vs_phase(s, 241));
    }
    for p in &mut v {
        p.hline.clone_from(&target);
    }
    v
}
