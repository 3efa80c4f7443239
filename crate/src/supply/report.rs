//! The supply calculator's report: each operating point's tau with the rule that gave
//! it, its MTBF, FIT and the stages its target needs; the worst point, the
//! residency-weighted rate, the verdict, and the points as budget corners.

use std::f64::consts::LN_10;

use serde::Serialize;

use crate::calculator::{Outcome, TextTable};
use crate::crossing::{warnings as sync_warnings, StagesNeeded};
use crate::numeric::normal::ln_sum_exp_of;
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::{CAUTION, FIT_PER_RATE, YEAR_S};
use crate::units::{format_duration_log10, format_log10, format_number, format_si};

use super::input::{PointCase, SupplyCase};
use super::model::{premise_breaks, Break, Known, Rule};

/// One operating point at one temperature.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PointResult {
    /// The operating point's name.
    pub name: String,
    /// Its name as a budget corner (with the temperature when the characterisation has
    /// several).
    pub corner: String,
    /// Supply voltage, V.
    pub vdd: f64,
    /// Temperature, °C, when the characterisation gives one.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub temp: Option<f64>,
    /// Sampling clock, Hz.
    pub fclk_hz: f64,
    /// tau, s (ageing included when it applies).
    pub tau_s: f64,
    /// The rule that gave tau.
    pub tau_rule: Rule,
    /// The ageing factor in tau (1 when none applies).
    pub ageing_factor: f64,
    /// The window (tw or t0, see the report's `window`), s.
    pub tw_s: f64,
    /// The rule that gave the window.
    pub window_rule: Rule,
    /// Setup time used, s.
    pub tsu_s: f64,
    /// Clock-to-output delay used, s.
    pub tcq_s: f64,
    /// Resolution time of the chain, s.
    pub resolution_time_s: f64,
    /// log10 of the MTBF, s.
    pub log10_mtbf_s: f64,
    /// log10 of the failure rate in FIT.
    pub log10_fit: f64,
    /// The stages the target needs here (with a target; null: see `not_applicable`).
    #[serde(
        skip_serializing_if = "Option::is_none",
        serialize_with = "stages_number"
    )]
    pub min_stages: Option<StagesNeeded>,
}

/// Everything a supply case yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SupplyReport {
    /// Normalised inputs.
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// The window convention: `tw` or `t0`.
    pub window: &'static str,
    /// Every operating point at every temperature it is evaluated at.
    pub points: Vec<PointResult>,
    /// The worst point (its corner name).
    pub worst_point: String,
    /// log10 FIT at the worst point.
    pub log10_fit_worst: f64,
    /// log10 MTBF at the worst point, years.
    pub log10_mtbf_years_worst: f64,
    /// log10 of the residency-weighted FIT (each point at its worst temperature), when
    /// every point has a residency.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_fit_weighted: Option<f64>,
    /// The factor ageing multiplies a fresh characterisation's tau by (with dvt).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub ageing_factor: Option<f64>,
    /// Whether the worst point meets the target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_target: Option<bool>,
    /// Decades by which the worst point meets the target (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<f64>,
    /// The stages the worst-placed point needs for the target: the most over all points
    /// (null: see `not_applicable`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stages_needed: Option<Option<u64>>,
    /// For each result that is null: why it does not apply.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// Suspicious but legal inputs, and what the rules could not prove safe.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

/// A point's stages as JSON writes them: the count, or null when no depth meets the
/// target.
fn stages_number<S: serde::Serializer>(v: &Option<StagesNeeded>, s: S) -> Result<S::Ok, S::Error> {
    match v {
        Some(StagesNeeded::Stages(n)) => s.serialize_u64(*n),
        _ => s.serialize_none(),
    }
}

/// A corner name for a point at a temperature: `name`, or `name_m40C` at -40 °C.
fn corner_name(name: &str, temp: Option<f64>) -> String {
    match temp {
        None => name.to_string(),
        Some(t) => format!("{name}_{}C", format_number(t).replace('-', "m")),
    }
}

fn at_temp(t: Option<f64>) -> String {
    t.map_or(String::new(), |t| format!(" at {} °C", format_number(t)))
}

/// Evaluates a supply case.
pub fn evaluate(case: &SupplyCase) -> SupplyReport {
    let mut warnings = case.notes.clone();
    let max_rate = case.target.map(|t| t.log10_max_rate());
    let temps = case.sets.iter().any(|s| s.temp.is_some());
    let points: Vec<PointResult> = case
        .cases
        .iter()
        .map(|pc| point_result(case, pc, temps, max_rate))
        .collect();
    for pc in &case.cases {
        let p = &case.points[pc.point];
        let set = case.sets.iter().find(|s| s.temp == pc.temp);
        let (lo, hi) = set.map_or((p.vdd, p.vdd), |s| (s.tau[0].0, s.tau[s.tau.len() - 1].0));
        let here = format!("{} ({}{})", p.name, format_si(p.vdd, "V"), at_temp(pc.temp));
        if pc.rule == Rule::Held {
            warnings.push(format!(
                "{here}: above the highest characterised VDD ({}), so its tau, window, tsu and \
                 tcq are those of {}; characterise there to sign it off on its own values.",
                format_si(hi, "V"),
                format_si(hi, "V")
            ));
        }
        if pc.rule == Rule::Bounded {
            warnings.push(format!(
                "{here}: below the lowest characterised VDD ({}): tau is the subthreshold-swing \
                 bound (an upper bound), but the window, tsu and tcq are held at {}'s values, \
                 which is not proven conservative (they too grow as VDD falls).",
                format_si(lo, "V"),
                format_si(lo, "V")
            ));
        }
        let log10_p = pc.case.sync.log10_p_fail();
        for w in sync_warnings(&pc.case, log10_p) {
            let w = format!("{here}: {w}");
            if !warnings.contains(&w) {
                warnings.push(w);
            }
        }
    }
    // The characterisation against the premises the rules rest on: where it breaks
    // them, the rules' bounds are not proven for it.
    for set in &case.sets {
        let at = at_temp(set.temp);
        let tau = |k: Known| format!("{} at {}", format_si(k.1, "s"), format_si(k.0, "V"));
        let breaks = premise_breaks(&set.tau, case.ss);
        let rises = breaks
            .iter()
            .filter(|b| matches!(b, Break::Rises(..)))
            .count();
        // One warning for a set that rises: its first rise, and how many more there are.
        let first_rise = breaks.iter().position(|b| matches!(b, Break::Rises(..)));
        for (k, b) in breaks.into_iter().enumerate() {
            if matches!(b, Break::Rises(..)) && Some(k) != first_rise {
                continue;
            }
            warnings.push(match b {
                Break::Rises(a, b) => format!(
                    "The characterisation{at}: tau rises from {} to {}{}, where it falls as \
                     VDD rises; check the table's rows and units. The rules' bounds do not \
                     hold for it.",
                    tau(a),
                    tau(b),
                    if rises > 1 {
                        format!(
                            " (and between {} more pair{} of voltages)",
                            rises - 1,
                            if rises == 2 { "" } else { "s" }
                        )
                    } else {
                        String::new()
                    }
                ),
                Break::Concave(a, m, b) => format!(
                    "The characterisation{at}: tau at {} lies above the line in ln tau from \
                     {} to {} (ln tau is convex in VDD): between those voltages the \
                     interpolation is not proven to over-estimate tau; check that point.",
                    format_si(m.0, "V"),
                    tau(a),
                    tau(b)
                ),
                Break::Steeper(a, b, fits) => format!(
                    "The characterisation{at}: tau falls from {} to {}, faster than ss = \
                     {}/decade allows (at most x10 per 2 ss); an ss of at most {}/decade fits \
                     the data, and the bound below the lowest VDD taken with the larger ss \
                     may under-estimate tau.",
                    tau(a),
                    tau(b),
                    format_si(case.ss.unwrap_or(0.0), "V"),
                    format_si(fits, "V")
                ),
            });
        }
    }
    if case.dvt.is_some() {
        for s in case.sets.iter().filter(|s| s.aged) {
            warnings.push(format!(
                "The characterisation{} is aged: its tau is used as given, without the dvt \
                 factor.",
                at_temp(s.temp)
            ));
        }
    }
    let worst = points.iter().enumerate().fold(0, |b, (i, p)| {
        if p.log10_fit > points[b].log10_fit {
            i
        } else {
            b
        }
    });
    let w = &points[worst];
    // Residency-weighted: each point at its worst temperature.
    let log10_fit_weighted = case
        .points
        .iter()
        .all(|p| p.residency.is_some())
        .then(|| {
            ln_sum_exp_of(case.points.iter().enumerate().map(|(i, p)| {
                let worst_here = points
                    .iter()
                    .zip(&case.cases)
                    .filter(|(_, pc)| pc.point == i)
                    .map(|(r, _)| r.log10_fit)
                    .fold(f64::NEG_INFINITY, f64::max);
                p.residency.unwrap_or(0.0).ln() + worst_here * LN_10
            })) / LN_10
        })
        .filter(|v| v.is_finite());
    let mut not_applicable = Vec::new();
    let stages_needed = max_rate.map(|_| {
        let mut most = Some(0u64);
        for p in &points {
            match p.min_stages {
                Some(StagesNeeded::Stages(n)) => most = most.map(|m| m.max(n)),
                _ => most = None,
            }
        }
        if most.is_none() {
            not_applicable.push((
                "points",
                "a point's min_stages is null where no depth up to the model's limit meets \
                 the target"
                    .to_string(),
            ));
            not_applicable.push((
                "stages_needed",
                "at some point no depth up to the model's limit meets the target".to_string(),
            ));
        }
        most
    });
    let margin = max_rate.map(|m| m - (w.log10_fit - FIT_PER_RATE.log10()));
    SupplyReport {
        inputs: echo(case),
        window: if case.t0 { "t0" } else { "tw" },
        worst_point: w.corner.clone(),
        log10_fit_worst: w.log10_fit,
        log10_mtbf_years_worst: w.log10_mtbf_s - YEAR_S.log10(),
        log10_fit_weighted,
        ageing_factor: case.ageing_factor,
        meets_target: margin.map(|m| m >= 0.0),
        margin_decades: margin,
        stages_needed,
        points,
        not_applicable,
        warnings,
        caution: CAUTION,
    }
}

fn point_result(
    case: &SupplyCase,
    pc: &PointCase,
    temps: bool,
    max_rate: Option<f64>,
) -> PointResult {
    let p = &case.points[pc.point];
    let s = &pc.case.sync;
    PointResult {
        name: p.name.clone(),
        corner: corner_name(&p.name, if temps { pc.temp } else { None }),
        vdd: p.vdd,
        temp: pc.temp,
        fclk_hz: p.fclk,
        tau_s: pc.tau,
        tau_rule: pc.rule,
        ageing_factor: pc.ageing,
        tw_s: pc.window.0,
        window_rule: if pc.rule == Rule::Bounded {
            Rule::Held
        } else {
            pc.window.1
        },
        tsu_s: pc.tsu,
        tcq_s: pc.tcq,
        resolution_time_s: s.resolution_time(),
        log10_mtbf_s: s.log10_mtbf_s(),
        log10_fit: s.log10_fit(),
        min_stages: max_rate.map(|m| s.min_stages(m)),
    }
}

fn echo(case: &SupplyCase) -> Vec<(&'static str, String)> {
    let mut v = vec![
        (
            "char",
            format!(
                "{} characterised voltage(s){}",
                case.sets.iter().map(|s| s.tau.len()).max().unwrap_or(0),
                if case.sets.iter().any(|s| s.temp.is_some()) {
                    format!(
                        " at {}",
                        case.sets
                            .iter()
                            .map(|s| format!(
                                "{} °C{}",
                                format_number(s.temp.unwrap_or(0.0)),
                                if s.aged { " (aged)" } else { "" }
                            ))
                            .collect::<Vec<_>>()
                            .join(", ")
                    )
                } else {
                    String::new()
                }
            ),
        ),
        (
            "points",
            format!("{} operating point(s)", case.points.len()),
        ),
    ];
    if let Some(ss) = case.ss {
        v.push(("ss", format!("{}/decade", format_si(ss, "V"))));
    }
    if let Some(d) = case.dvt {
        v.push(("dvt", format_si(d, "V")));
    }
    let first = &case.cases[0].case;
    for (k, t) in first.echo() {
        if matches!(
            k,
            "fdata"
                | "crossing"
                | "flaunch"
                | "activity"
                | "increments"
                | "transfers"
                | "stages"
                | "target-years"
                | "target-fit"
        ) {
            v.push((k, t));
        }
    }
    if let Some(d) = &case.domain {
        v.push(("domain", d.clone()));
    }
    v
}

impl SupplyReport {
    /// The results as named readouts; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let mut v = vec![
            Readout::new(
                "worst_point",
                "worst operating point",
                self.worst_point.clone(),
                None,
            ),
            Readout::new(
                "log10_fit_worst",
                "FIT at the worst point",
                format_log10(self.log10_fit_worst, 3),
                Some(self.log10_fit_worst),
            ),
            Readout::new(
                "log10_mtbf_years_worst",
                "MTBF at the worst point",
                format_duration_log10(self.log10_mtbf_years_worst + YEAR_S.log10(), YEAR_S.log10()),
                Some(self.log10_mtbf_years_worst),
            ),
        ];
        if let Some(f) = self.log10_fit_weighted {
            v.push(Readout::new(
                "log10_fit_weighted",
                "residency-weighted FIT",
                format_log10(f, 3),
                Some(f),
            ));
        }
        if let Some(a) = self.ageing_factor {
            v.push(Readout::new(
                "ageing_factor",
                "ageing factor on tau",
                format!("x {}", format_number(a)),
                Some(a),
            ));
        }
        if let (Some(met), Some(m)) = (self.meets_target, self.margin_decades) {
            v.push(Readout::verdict(met, m));
            v.push(Readout::margin(m));
        }
        if let Some(n) = self.stages_needed {
            v.push(Readout::maybe(
                "stages_needed",
                "stages needed at every point",
                n.map(|n| n as f64),
                |n| format!("{n:.0}"),
                &self.not_applicable,
            ));
        }
        v
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let mut facts = vec![
            "Sign-off per instance normally uses the worst operating point; a \
             residency-weighted rate is a mission-profile figure, shown beside it."
                .to_string(),
            "Rules for tau: characterised (used unchanged); interpolated (ln tau linear in \
             VDD between two characterised voltages, an over-estimate since ln tau is convex \
             in VDD); bounded (below the lowest, tau(V1) x 10^((V1 - V)/(2 ss)), an upper \
             bound, never the straight-line extension, which is unsafe); held (above the \
             highest, its tau)."
                .to_string(),
            format!(
                "The window ({}), tsu and tcq are interpolated the same way; that is not \
                 proven conservative for them.",
                self.window
            ),
        ];
        if let Some(a) = self.ageing_factor {
            facts.push(format!(
                "Ageing: a fresh characterisation's tau is multiplied by 10^(dvt/ss) = {} \
                 (an upper bound).",
                format_number(a)
            ));
        }
        Outcome {
            inputs: self.inputs.clone(),
            readouts: self.readouts(),
            facts,
            warnings: self.warnings.clone(),
            unused: Vec::new(),
            target_missed: self.meets_target == Some(false),
            links: Vec::new(),
        }
    }

    /// The operating points as a table.
    pub fn point_table(&self) -> TextTable {
        let stages = |s: &Option<StagesNeeded>| match s {
            Some(StagesNeeded::Stages(n)) => n.to_string(),
            Some(StagesNeeded::TooMany) => "too many".into(),
            Some(StagesNeeded::NotApplicable) | None => "".into(),
        };
        let mut header: Vec<String> = [
            "point",
            "VDD",
            "temp",
            "fclk",
            "tau",
            "rule",
            self.window,
            "tr",
            "MTBF",
            "FIT",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect();
        let with_target = self.points.iter().any(|p| p.min_stages.is_some());
        if with_target {
            header.push("stages needed".into());
        }
        TextTable {
            title: "Operating points".into(),
            header,
            rows: self
                .points
                .iter()
                .map(|p| {
                    let mut row = vec![
                        p.corner.clone(),
                        format_si(p.vdd, "V"),
                        p.temp
                            .map_or("".into(), |t| format!("{} °C", format_number(t))),
                        format_si(p.fclk_hz, "Hz"),
                        format_si(p.tau_s, "s"),
                        p.tau_rule.name().to_string(),
                        format_si(p.tw_s, "s"),
                        format_si(p.resolution_time_s, "s"),
                        format_duration_log10(p.log10_mtbf_s, YEAR_S.log10()),
                        format_log10(p.log10_fit, 3),
                    ];
                    if with_target {
                        row.push(stages(&p.min_stages));
                    }
                    row
                })
                .collect(),
            total: self.points.len(),
        }
    }

    /// The operating points as budget corners (`latchwise budget --corners`): one row per
    /// point and temperature, with `fclk@DOMAIN` when a domain is named.
    pub fn corners_csv(&self, domain: Option<&str>) -> String {
        let mut out = format!(
            "# Budget corners from latchwise supply: one per operating point{}.\n\
             corner,tau,{},tsu,tcq",
            if self.points.iter().any(|p| p.temp.is_some()) {
                " and temperature"
            } else {
                ""
            },
            self.window
        );
        if let Some(d) = domain {
            out.push_str(&format!(",fclk@{d}"));
        }
        out.push('\n');
        for p in &self.points {
            out.push_str(&format!(
                "{},{:e},{:e},{:e},{:e}",
                p.corner, p.tau_s, p.tw_s, p.tsu_s, p.tcq_s
            ));
            if domain.is_some() {
                out.push_str(&format!(",{:e}", p.fclk_hz));
            }
            out.push('\n');
        }
        out
    }
}
