//! The budget's report: totals per corner, the worst corner and its offenders, the fix
//! plan, the fleet and the spread under uncertainty; readouts and plots.

use serde::Serialize;

use crate::calculator::{FigureColumn, Outcome, RowFigures};
use crate::chart::series::{Curve, Plot, Spacing};
use crate::json_line::{JsonLine, Line};
use crate::numeric::exp10;
use crate::params::serialize_pairs;
use crate::readout::Readout;
use crate::reliability::{fleet_outcome, FleetOutcome, CAUTION, FIT_PER_RATE};
use crate::units::{format_decades, format_log10, format_number};

use super::input::BudgetCase;

/// The most rounds of planning to a lowered nominal target until the 95th percentile is
/// within the budget (each round lowers it by what the percentile still exceeds; two or
/// three suffice, as the percentile's offset from the nominal total changes little).
const FIX_ROUNDS_MOST: usize = 30;

/// The most rows whose own warnings the report lists (the JSON has each row's).
const ROW_WARNINGS_MOST: usize = 20;

/// The most decades the FIT-per-crossing plot shows below the higher of the largest row
/// and the budget.
const ROWS_SPAN_DECADES: f64 = 12.0;
use super::rollup::Rollup;

/// One corner's total.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CornerTotal {
    /// The corner.
    pub name: String,
    /// log10 of its total FIT.
    pub log10_total_fit: f64,
}

/// A whole number as a JSON integer when it is one that JSON readers hold exactly (below
/// 2^53), else as a number.
fn whole_number<S: serde::Serializer>(v: &f64, s: S) -> Result<S::Ok, S::Error> {
    match exact_integer(*v) {
        Some(i) => s.serialize_i64(i),
        None => s.serialize_f64(*v),
    }
}

/// `v` as an integer, when it is a whole number below 2^53 (see [`whole_number`]).
#[allow(clippy::cast_possible_truncation)]
fn exact_integer(v: f64) -> Option<i64> {
    (v.fract() == 0.0 && v.abs() < 9_007_199_254_740_992.0).then_some(v as i64)
}

fn whole_number_opt<S: serde::Serializer>(
    v: &Option<Option<f64>>,
    s: S,
) -> Result<S::Ok, S::Error> {
    match v {
        Some(Some(x)) => whole_number(x, s),
        _ => s.serialize_none(),
    }
}

/// One row at one corner.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RowCorner {
    /// The corner.
    pub name: String,
    /// log10 of the row's FIT there, count included.
    pub log10_fit: f64,
}

/// One row at the worst corner.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RowFit {
    /// The crossing.
    pub name: String,
    /// Its instances.
    #[serde(serialize_with = "whole_number")]
    pub count: f64,
    /// Flip-flops per stage of one instance.
    #[serde(serialize_with = "whole_number")]
    pub width: f64,
    /// Its flip-flops: count x width x stages (0 when tr is given).
    #[serde(serialize_with = "whole_number")]
    pub flip_flops: f64,
    /// Its stages (0 when tr is given).
    pub stages: u32,
    /// The data rate its case implies at the worst corner (from the crossing kind, when
    /// given), Hz.
    pub fdata_hz: f64,
    /// With related clocks: the clock factor K at the worst corner, and its log10 (which
    /// carries it when K is too small for a number).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub clock_factor: Option<f64>,
    /// log10 of K, with related clocks.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_clock_factor: Option<f64>,
    /// Its cell class, when it names one.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub cell: String,
    /// Its sampling clock's domain, when it names one.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub domain: String,
    /// The row at every corner, in the corners' order.
    pub corners: Vec<RowCorner>,
    /// What `latchwise sync` would warn of for the row's own inputs, and its inputs that
    /// its case does not use.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub warnings: Vec<String>,
    /// log10 of its FIT, count included.
    pub log10_fit: f64,
    /// Its share of the worst corner's total.
    pub share: f64,
    /// Its notes (the design's `note` and `note:WORD` columns), where not blank.
    #[serde(skip_serializing_if = "std::collections::BTreeMap::is_empty")]
    pub notes: std::collections::BTreeMap<String, String>,
}

/// The row as its `Serialize` writes it, by hand: a budget of 100,000 rows is written
/// twice as fast. A test holds the two to the same bytes for every kind of row.
impl JsonLine for RowFit {
    fn json_line(&self, l: &mut Line<'_>) {
        // Every field by name: one added to the row and not written here does not compile.
        let RowFit {
            name,
            count,
            width,
            flip_flops,
            stages,
            fdata_hz,
            clock_factor,
            log10_clock_factor,
            cell,
            domain,
            corners,
            warnings,
            log10_fit,
            share,
            notes,
        } = self;
        let whole = |l: &mut Line<'_>, v: f64| match exact_integer(v) {
            Some(i) => l.i64(i),
            None => l.f64(v),
        };
        l.raw("{\"name\":");
        l.str(name);
        l.raw(",\"count\":");
        whole(l, *count);
        l.raw(",\"width\":");
        whole(l, *width);
        l.raw(",\"flip_flops\":");
        whole(l, *flip_flops);
        l.raw(",\"stages\":");
        l.u32(*stages);
        l.raw(",\"fdata_hz\":");
        l.f64(*fdata_hz);
        if let Some(k) = clock_factor {
            l.raw(",\"clock_factor\":");
            l.f64(*k);
        }
        if let Some(k) = log10_clock_factor {
            l.raw(",\"log10_clock_factor\":");
            l.f64(*k);
        }
        if !cell.is_empty() {
            l.raw(",\"cell\":");
            l.str(cell);
        }
        if !domain.is_empty() {
            l.raw(",\"domain\":");
            l.str(domain);
        }
        l.raw(",\"corners\":[");
        // The row's own log10_fit is its worst corner's: written once, copied after.
        let mut worst = None;
        for (i, c) in corners.iter().enumerate() {
            l.raw(if i == 0 { "{\"name\":" } else { ",{\"name\":" });
            l.str(&c.name);
            l.raw(",\"log10_fit\":");
            let at = l.f64_at(c.log10_fit);
            if c.log10_fit.to_bits() == log10_fit.to_bits() {
                worst = Some(at);
            }
            l.raw("}");
        }
        l.raw("]");
        if !warnings.is_empty() {
            l.raw(",\"warnings\":");
            l.strs(warnings);
        }
        l.raw(",\"log10_fit\":");
        match worst {
            Some(at) => l.again(at),
            None => l.f64(*log10_fit),
        }
        l.raw(",\"share\":");
        l.f64(*share);
        if !notes.is_empty() {
            l.raw(",\"notes\":");
            l.str_map(notes);
        }
        l.raw("}");
    }
}

/// A row the fix plan changes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FixRow {
    /// The crossing.
    pub name: String,
    /// Its new stage count.
    pub stages: u32,
    /// The flip-flops the change adds: its count times its width times the added stages.
    #[serde(serialize_with = "whole_number")]
    pub added_flip_flops: f64,
}

/// Everything a budget yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BudgetReport {
    /// The inputs as understood.
    #[serde(serialize_with = "serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// log10 of the worst corner's total FIT.
    pub log10_total_fit: f64,
    /// The worst corner.
    pub worst_corner: String,
    /// The largest shares at the worst corner, in words.
    pub worst_offenders: String,
    /// Every corner's total.
    pub corners: Vec<CornerTotal>,
    /// Every row at the worst corner, in file order.
    pub rows: Vec<RowFit>,
    /// The budget, FIT.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub budget_fit: Option<f64>,
    /// The statistic that decides the verdict, the exit status and the fix plan: `p95`
    /// (the 95th percentile of the worst total under the sigmas) or `nominal`.
    pub signoff: &'static str,
    /// Whether the signed-off statistic of the worst total is within the budget.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_budget: Option<bool>,
    /// Decades between the signed-off statistic and the budget (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<f64>,
    /// Whether the nominal worst total is within the budget.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_budget_nominal: Option<bool>,
    /// Decades between the nominal worst total and the budget.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades_nominal: Option<f64>,
    /// The rows the fix plan changes (null: the budget cannot be met by adding stages).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fix: Option<Option<Vec<FixRow>>>,
    /// Flip-flops the fix plan adds (count times width times added stages).
    #[serde(
        skip_serializing_if = "Option::is_none",
        serialize_with = "whole_number_opt"
    )]
    pub added_flip_flops: Option<Option<f64>>,
    /// log10 of the worst total after the fix.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_total_fit_after_fix: Option<Option<f64>>,
    /// log10 of the 95th percentile of the worst total after the fix (with sigmas).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_total_fit_p95_after_fix: Option<Option<f64>>,
    /// Median of log10 worst total under the uncertainty.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_total_fit_p50: Option<f64>,
    /// 95th percentile of log10 worst total under the uncertainty: the sign-off figure.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_total_fit_p95: Option<f64>,
    /// Whether the 95th percentile is within the budget (with a budget and sigmas).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_budget_p95: Option<bool>,
    /// Fleet figures: time-weighted over the corners when they give `hours`, else with
    /// every hour at the worst corner.
    #[serde(flatten, skip_serializing_if = "Option::is_none")]
    pub fleet: Option<FleetOutcome>,
    /// With `hours`: log10 of the expected failures with every hour at the worst corner.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_expected_failures_worst: Option<f64>,
    /// With `hours`: log10 of the probability of a failure, every hour at the worst corner.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_p_any_failure_worst: Option<f64>,
    /// With sigmas: log10 of the expected failures at the 95th percentile of the worst
    /// corner's total, every hour there (the sign-off figure's fleet).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_expected_failures_p95: Option<f64>,
    /// For each result that is null: why.
    #[serde(serialize_with = "serialize_pairs")]
    pub not_applicable: Vec<(&'static str, String)>,
    /// What to watch.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
    /// Every row's stages after the fix plan (the JSON lists the changed rows in `fix`).
    #[serde(skip)]
    pub stages_after_fix: Option<Vec<u32>>,
}

/// Evaluates a budget case.
pub fn evaluate(c: &BudgetCase) -> BudgetReport {
    let r = &c.rollup;
    let totals = r.totals(&r.stages, 1.0);
    let (worst, log10_total) = Rollup::worst(&totals);
    let fits = r.row_fits(worst, &r.stages);
    // Shares relative to the largest row, so that no difference of two huge logs (whose
    // rounding alone can be 1e11 decades at 1e27) reaches the exponent: each term is at
    // most 1 and their sum at least 1.
    let top = fits.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let rel: Vec<f64> = fits.iter().map(|f| exp10(f - top)).collect();
    let sum: f64 = rel.iter().sum();
    // The clock factor K of row i at the worst corner, with related clocks.
    let log10_k = |i: usize| {
        let s = &r.cells[i][worst].sync;
        s.related().map(|_| s.log10_clock_factor_at(s.fclk().get()))
    };
    let rows: Vec<RowFit> = fits
        .iter()
        .enumerate()
        .map(|(i, f)| RowFit {
            name: c.names[i].clone(),
            count: r.counts[i],
            width: r.widths[i],
            flip_flops: if c.tr_given[i] {
                0.0
            } else {
                r.flip_flops(i, r.stages[i])
            },
            stages: if c.tr_given[i] { 0 } else { r.stages[i] },
            fdata_hz: r.cells[i][worst].sync.fdata().get(),
            clock_factor: log10_k(i).map(exp10).filter(|k| *k > 0.0),
            log10_clock_factor: log10_k(i),
            cell: c.classes[i].clone(),
            domain: c.domains[i].clone(),
            corners: c
                .corners
                .iter()
                .enumerate()
                .map(|(k, name)| RowCorner {
                    name: name.clone(),
                    log10_fit: r.cells[i][k].log10_fit(r.stages[i], 1.0),
                })
                .collect(),
            warnings: c.row_warnings[i].clone(),
            log10_fit: *f,
            share: rel[i] / sum,
            notes: c
                .notes
                .iter()
                .filter(|(_, v)| !v[i].is_empty())
                .map(|(k, v)| (k.clone(), v[i].clone()))
                .collect(),
        })
        .collect();
    let mut order: Vec<usize> = (0..rows.len()).collect();
    order.sort_by(|&a, &b| rows[b].share.total_cmp(&rows[a].share));
    let worst_offenders = order
        .iter()
        .take(3)
        .map(|&i| format!("{} ({:.0} %)", rows[i].name, 100.0 * rows[i].share))
        .collect::<Vec<_>>()
        .join(", ");
    let mut not_applicable = Vec::new();
    let budget = c.budget_fit.map(f64::log10);
    let p95_of = |stages: &[u32]| {
        c.sigmas
            .map(|(ts, ws)| r.percentiles_at(stages, ts, ws, c.corr, &[0.95])[0])
    };
    // The plan's stages, with their 95th percentile when there are sigmas (computed once).
    let planned: Option<Option<(Vec<u32>, Option<f64>)>> = budget.map(|b| {
        if !c.signoff_p95 {
            return r.fix(b).map(|stages| {
                let p95 = p95_of(&stages);
                (stages, p95)
            });
        }
        // The plan meets the budget at the 95th percentile: plan to a nominal target
        // lowered by what the percentile still exceeds, until it is within the budget.
        let mut target = b;
        for _ in 0..FIX_ROUNDS_MOST {
            let stages = r.fix(target)?;
            let p95 = p95_of(&stages)?;
            if p95 <= b {
                return Some((stages, Some(p95)));
            }
            target -= (p95 - b) + 1e-9 * b.abs().max(1.0);
        }
        None
    });
    let fixed: Option<Option<&Vec<u32>>> = planned.as_ref().map(|p| p.as_ref().map(|p| &p.0));
    let fix = fixed.map(|f| {
        f.map(|st| {
            st.iter()
                .enumerate()
                .filter(|(i, s)| **s != r.stages[*i])
                .map(|(i, s)| FixRow {
                    name: c.names[i].clone(),
                    stages: *s,
                    added_flip_flops: r.flip_flops_added(i, *s),
                })
                .collect::<Vec<_>>()
        })
    });
    // The rows the plan may not deepen past their max_stages, named when the plan fails.
    let capped = {
        let names: Vec<&str> = (0..r.caps.len())
            .filter(|&i| r.caps[i] < super::rollup::MAX_STAGES && !c.tr_given[i])
            .map(|i| c.names[i].as_str())
            .collect();
        match names.len() {
            0 => String::new(),
            n if n <= 10 => format!(" or at their max_stages ({})", names.join(", ")),
            n => format!(
                " or at their max_stages ({}, and {} more)",
                names[..10].join(", "),
                n - 10
            ),
        }
    };
    if let Some(None) = fixed {
        for key in ["fix", "added_flip_flops", "log10_total_fit_after_fix"] {
            not_applicable.push((
                key,
                format!(
                    "adding stages cannot meet the budget{}: rows given by tr, at 1000 \
                     stages{capped} already exceed it",
                    if c.signoff_p95 {
                        " at the 95th percentile"
                    } else {
                        ""
                    }
                ),
            ));
        }
    }
    let added = fix.as_ref().map(|f| {
        f.as_ref().map(|rows| {
            rows.iter()
                .map(|x| x.added_flip_flops)
                .fold(0.0, |a, b| a + b)
        })
    });
    let after = fixed.map(|f| f.map(|st| Rollup::worst(&r.totals(st, 1.0)).1));
    let p95_after = c
        .sigmas
        .and(planned.as_ref())
        .map(|p| p.as_ref().and_then(|p| p.1));
    if let Some(None) = p95_after {
        not_applicable.push((
            "log10_total_fit_p95_after_fix",
            "adding stages cannot meet the budget".to_string(),
        ));
    }
    let pcts = c
        .sigmas
        .map(|(ts, ws)| r.percentiles_corr(ts, ws, c.corr, &[0.5, 0.95]));
    let meets_p95 = budget.zip(pcts.as_ref()).map(|(b, p)| p[1] <= b);
    // The statistic that decides.
    let decided = match (&pcts, c.signoff_p95) {
        (Some(p), true) => p[1],
        _ => log10_total,
    };
    let mut warnings = c.design_warnings.clone();
    let warned: Vec<usize> = (0..rows.len())
        .filter(|&i| !c.row_warnings[i].is_empty())
        .collect();
    for &i in warned.iter().take(ROW_WARNINGS_MOST) {
        warnings.push(format!("{}: {}", c.names[i], c.row_warnings[i].join(" ")));
    }
    if warned.len() > ROW_WARNINGS_MOST {
        warnings.push(format!(
            "And {} more rows with warnings (each row's are in the JSON's rows[].warnings).",
            warned.len() - ROW_WARNINGS_MOST
        ));
    }
    if let Some(b) = budget {
        if meets_p95 == Some(false) && log10_total <= b {
            warnings.push(if c.signoff_p95 {
                "The nominal total is within the budget but the 95th percentile, which \
                 decides, is not."
                    .to_string()
            } else {
                "The design meets the budget at its nominal tau and window but not at the \
                 95th percentile of their uncertainty (signoff=nominal was chosen)."
                    .to_string()
            });
        }
    }
    let mut inputs = vec![
        ("design", format!("{} rows", c.names.len())),
        ("corners", c.corners.join(", ")),
    ];
    if let Some(b) = c.budget_fit {
        inputs.push(("budget-fit", format_number(b)));
    }
    if let Some(f) = c.fleet {
        inputs.push(("devices", f.devices.to_string()));
        inputs.push(("service-years", format_number(f.years)));
    }
    if let Some((ts, ws)) = c.sigmas {
        inputs.push(("tau-sigma", format_number(ts)));
        inputs.push(("tw-sigma", format_number(ws)));
        if c.corr != 0.0 {
            inputs.push(("tau-tw-corr", format_number(c.corr)));
        }
    }
    let signoff = if c.signoff_p95 { "p95" } else { "nominal" };
    // With a mission profile, the fleet with every hour at the worst corner beside it.
    let worst_fleet = c
        .fleet
        .filter(|_| c.hours.is_some())
        .map(|f| fleet_outcome(log10_total - FIT_PER_RATE.log10(), f));
    inputs.push(("signoff", signoff.to_string()));
    BudgetReport {
        inputs,
        log10_total_fit: log10_total,
        worst_corner: c.corners[worst].clone(),
        worst_offenders,
        corners: c
            .corners
            .iter()
            .zip(&totals)
            .map(|(n, t)| CornerTotal {
                name: n.clone(),
                log10_total_fit: *t,
            })
            .collect(),
        rows,
        budget_fit: c.budget_fit,
        signoff,
        meets_budget: budget.map(|b| decided <= b),
        margin_decades: budget.map(|b| b - decided),
        meets_budget_nominal: budget.map(|b| log10_total <= b),
        margin_decades_nominal: budget.map(|b| b - log10_total),
        fix,
        added_flip_flops: added,
        log10_total_fit_after_fix: after,
        log10_total_fit_p95_after_fix: p95_after,
        log10_total_fit_p50: pcts.as_ref().map(|p| p[0]),
        log10_total_fit_p95: pcts.as_ref().map(|p| p[1]),
        meets_budget_p95: meets_p95,
        fleet: c.fleet.map(|f| {
            // Time-weighted with a mission profile: sum of hours_k 10^total_k.
            let rate = match &c.hours {
                Some(h) => super::rollup::log10_sum(
                    h.iter()
                        .zip(&totals)
                        .filter(|(h, _)| **h > 0.0)
                        .map(|(h, t)| h.log10() + t),
                ),
                None => log10_total,
            };
            fleet_outcome(rate - FIT_PER_RATE.log10(), f)
        }),
        log10_expected_failures_worst: worst_fleet.map(|f| f.log10_expected_failures),
        log10_p_any_failure_worst: worst_fleet.map(|f| f.log10_p_any_failure),
        log10_expected_failures_p95: c
            .fleet
            .zip(pcts.as_ref())
            .map(|(f, p)| fleet_outcome(p[1] - FIT_PER_RATE.log10(), f).log10_expected_failures),
        not_applicable,
        warnings,
        caution: CAUTION,
        stages_after_fix: planned.and_then(|p| p.map(|p| p.0)),
    }
}

/// The largest crossings at the worst corner, by share: name, FIT, share, stages now and
/// after the fix plan (the `most` largest, or every one).
pub fn text_table(report: &BudgetReport, most: Option<usize>) -> crate::calculator::TextTable {
    use crate::calculator::format_figure;
    let mut order: Vec<usize> = (0..report.rows.len()).collect();
    order.sort_by(|&a, &b| report.rows[b].share.total_cmp(&report.rows[a].share));
    let after = |i: usize| match report.rows[i].stages {
        0 => "tr given".to_string(),
        s => report
            .stages_after_fix
            .as_ref()
            .map_or(s, |a| a[i])
            .to_string(),
    };
    let with_notes = report.rows.iter().any(|r| !r.notes.is_empty());
    let rows = order
        .iter()
        .take(most.unwrap_or(usize::MAX))
        .map(|&i| {
            let r = &report.rows[i];
            let mut row = vec![
                r.name.clone(),
                format_figure("log10", r.log10_fit),
                format_figure("fraction", r.share),
                if r.stages == 0 {
                    "-".to_string()
                } else {
                    r.stages.to_string()
                },
                after(i),
            ];
            if with_notes {
                row.push(
                    r.notes
                        .iter()
                        .map(|(k, v)| format!("{k}: {v}"))
                        .collect::<Vec<_>>()
                        .join("; "),
                );
            }
            row
        })
        .collect();
    crate::calculator::TextTable {
        title: format!("Largest crossings at {}", report.worst_corner),
        header: [
            "crossing",
            "FIT",
            "share",
            "stages",
            "after the fix",
            "notes",
        ]
        .into_iter()
        .take(if with_notes { 6 } else { 5 })
        .map(String::from)
        .collect(),
        rows,
        total: report.rows.len(),
    }
}

/// `10^x` written exactly from its log10 (ten significant digits), at any magnitude: a
/// FIT of 1e-400 is written `1e-400`, not 0.
fn decimal_of_log10(x: f64) -> String {
    let e = x.floor();
    let mut m = exp10(x - e);
    let mut e = e as i64;
    // Rounding to ten digits can carry to 10.
    if format!("{m:.9}").starts_with("10") {
        m /= 10.0;
        e += 1;
    }
    format!("{m:.9}e{e}")
}

/// Every crossing at every corner as one CSV: its name, the corner, its FIT (log10 and
/// plain), its share of that corner's total, its stages now and after the fix plan, and
/// the flip-flops the plan adds to it. Names are written as a spreadsheet shows text.
pub fn results_csv(c: &BudgetCase, report: &BudgetReport) -> String {
    use crate::chart::series::text_cell;
    let r = &c.rollup;
    let mut out = String::from("name");
    for (k, _) in &c.notes {
        out.push(',');
        out.push_str(&text_cell(k));
    }
    out.push_str(",corner,log10_fit,fit,share,stages,stages_after_fix,flip_flops_added\n");
    let after = report.stages_after_fix.as_ref();
    for (k, corner) in c.corners.iter().enumerate() {
        let fits = r.row_fits(k, &r.stages);
        let total = report.corners[k].log10_total_fit;
        for (i, f) in fits.iter().enumerate() {
            let now = r.stages[i];
            let (stages, later) = if c.tr_given[i] {
                (String::new(), String::new())
            } else {
                let later = after.map_or(now, |a| a[i]);
                (now.to_string(), later.to_string())
            };
            let added = match after {
                Some(a) if !c.tr_given[i] => r.flip_flops_added(i, a[i]),
                _ => 0.0,
            };
            let notes: String = c
                .notes
                .iter()
                .map(|(_, v)| format!(",{}", text_cell(&v[i])))
                .collect();
            out.push_str(&format!(
                "{}{notes},{},{f:e},{},{:e},{stages},{later},{added}\n",
                text_cell(&c.names[i]),
                text_cell(corner),
                decimal_of_log10(*f),
                exp10(f - total).min(1.0),
            ));
        }
    }
    out
}

/// The figures beside the design's rows (FIT at the worst corner, share, stages after
/// the fix) and beside the corners' rows (total FIT), for the page's tables.
pub fn figures(c: &BudgetCase, report: &BudgetReport) -> Vec<RowFigures> {
    let mut design = vec![
        FigureColumn {
            key: "log10_fit",
            label: format!("FIT at {}", report.worst_corner),
            kind: "log10",
            sorts: true,
            values: report.rows.iter().map(|r| Some(r.log10_fit)).collect(),
        },
        FigureColumn {
            key: "share",
            label: "share".into(),
            kind: "fraction",
            sorts: true,
            values: report.rows.iter().map(|r| Some(r.share)).collect(),
        },
    ];
    // The columns a design of kinds, related clocks or widths needs, and only then.
    if c.kind_given.iter().any(|k| *k) {
        design.push(FigureColumn {
            key: "fdata_hz",
            label: "fdata (implied)".into(),
            kind: "hz",
            sorts: false,
            values: report
                .rows
                .iter()
                .zip(&c.kind_given)
                .map(|(r, k)| k.then_some(r.fdata_hz))
                .collect(),
        });
    }
    if report.rows.iter().any(|r| r.log10_clock_factor.is_some()) {
        design.push(FigureColumn {
            key: "log10_clock_factor",
            label: "clock factor K".into(),
            kind: "log10",
            sorts: false,
            values: report.rows.iter().map(|r| r.log10_clock_factor).collect(),
        });
    }
    if report.rows.iter().any(|r| r.width != 1.0) {
        design.push(FigureColumn {
            key: "flip_flops",
            label: "flip-flops".into(),
            kind: "count",
            sorts: true,
            values: report
                .rows
                .iter()
                .map(|r| (r.stages > 0).then_some(r.flip_flops))
                .collect(),
        });
    }
    if let Some(after) = &report.stages_after_fix {
        design.push(FigureColumn {
            key: "fix",
            label: "fix: stages".into(),
            kind: "count",
            sorts: false,
            values: after
                .iter()
                .zip(&c.rollup.stages)
                .zip(&c.tr_given)
                .map(|((a, s), tr)| (!tr && a != s).then_some(f64::from(*a)))
                .collect(),
        });
    }
    let mut out = vec![RowFigures {
        field: "design",
        columns: design,
    }];
    if c.corners_from_table {
        out.push(RowFigures {
            field: "corners",
            columns: vec![FigureColumn {
                key: "log10_total_fit",
                label: "total FIT".into(),
                kind: "log10",
                sorts: false,
                values: report
                    .corners
                    .iter()
                    .map(|k| Some(k.log10_total_fit))
                    .collect(),
            }],
        });
    }
    out
}

impl BudgetReport {
    /// The results as readouts, the verdict first; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let na = &self.not_applicable;
        let mut v = Vec::new();
        if let (Some(met), Some(m)) = (self.meets_budget, self.margin_decades) {
            let words = format_decades(m.abs());
            let at = if self.signoff == "p95" {
                " at the 95th percentile"
            } else {
                ""
            };
            v.push(
                Readout::new(
                    "meets_budget",
                    "budget",
                    format!(
                        "{}{at} by {} decades",
                        if met { "met" } else { "missed" },
                        words.trim_start_matches('+')
                    ),
                    Some(if met { 1.0 } else { 0.0 }),
                )
                .judged(met),
            );
            v.push(Readout::margin(m));
        }
        v.push(Readout::new(
            "log10_total_fit",
            "total FIT at the worst corner",
            format_log10(self.log10_total_fit, 3),
            Some(self.log10_total_fit),
        ));
        v.push(Readout::new(
            "worst_corner",
            "worst corner",
            self.worst_corner.clone(),
            None,
        ));
        v.push(Readout::new(
            "worst_offenders",
            "largest shares",
            self.worst_offenders.clone(),
            None,
        ));
        if let Some(a) = self.added_flip_flops {
            v.push(Readout::maybe(
                "added_flip_flops",
                "flip-flops the fix adds",
                a,
                |n| format!("{n:.0}"),
                na,
            ));
        }
        if let Some(t) = self.log10_total_fit_after_fix {
            v.push(Readout::maybe(
                "log10_total_fit_after_fix",
                "total FIT after the fix",
                t,
                |t| format_log10(t, 3),
                na,
            ));
        }
        if let Some(t) = self.log10_total_fit_p95_after_fix {
            v.push(Readout::maybe(
                "log10_total_fit_p95_after_fix",
                "total FIT after the fix, 95th percentile",
                t,
                |t| format_log10(t, 3),
                na,
            ));
        }
        if let (Some(p50), Some(p95)) = (self.log10_total_fit_p50, self.log10_total_fit_p95) {
            v.push(Readout::new(
                "log10_total_fit_p50",
                "total FIT, median under uncertainty",
                format_log10(p50, 3),
                Some(p50),
            ));
            v.push(Readout::new(
                "log10_total_fit_p95",
                "total FIT, 95th percentile (sign off with this)",
                format_log10(p95, 3),
                Some(p95),
            ));
        }
        if let Some(f) = self.fleet {
            v.extend(f.readouts());
        }
        if let Some(m) = self.log10_expected_failures_worst {
            v.push(Readout::new(
                "log10_expected_failures_worst",
                "expected failures, every hour at the worst corner",
                format_log10(m, 3),
                Some(m),
            ));
        }
        if let Some(p) = self.log10_p_any_failure_worst {
            v.push(Readout::new(
                "log10_p_any_failure_worst",
                "probability of at least one, every hour at the worst corner",
                format_log10(p, 3),
                Some(p),
            ));
        }
        if let Some(m) = self.log10_expected_failures_p95 {
            v.push(Readout::new(
                "log10_expected_failures_p95",
                "expected failures at the 95th percentile",
                format_log10(m, 3),
                Some(m),
            ));
        }
        v
    }

    /// What a person reads of the report.
    pub fn outcome(&self) -> Outcome {
        let mut facts: Vec<String> = self
            .corners
            .iter()
            .map(|c| {
                format!(
                    "Corner {}: total FIT {}.",
                    c.name,
                    format_log10(c.log10_total_fit, 3)
                )
            })
            .collect();
        match &self.fix {
            Some(Some(rows)) if !rows.is_empty() => {
                let named = rows
                    .iter()
                    .take(MOST_FIXES_NAMED)
                    .map(|r| format!("{} to {} stages", r.name, r.stages))
                    .collect::<Vec<_>>()
                    .join(", ");
                facts.push(if rows.len() > MOST_FIXES_NAMED {
                    format!(
                        "Fix plan ({} crossings): {named}, and {} more; the JSON report \
                         lists every change.",
                        rows.len(),
                        rows.len() - MOST_FIXES_NAMED
                    )
                } else {
                    format!("Fix plan: {named}.")
                });
            }
            Some(Some(_)) => facts.push("Fix plan: nothing to change.".into()),
            _ => {}
        }
        if self.log10_total_fit_p95.is_some() {
            facts.push(
                "The uncertainty of tau and tw is systematic, shared by every row: sign off \
                 with the 95th percentile of the worst corner's total."
                    .into(),
            );
        }
        if self.log10_expected_failures_worst.is_some() {
            facts.push(
                "Fleet figures weight each corner by its share of service time (hours); \
                 every hour at the worst corner is shown beside them."
                    .into(),
            );
        }
        facts.push("Independent crossings add their FIT; a row counts its instances.".into());
        Outcome {
            inputs: self.inputs.clone(),
            readouts: self.readouts(),
            facts,
            warnings: self.warnings.clone(),
            unused: Vec::new(),
            target_missed: self.meets_budget == Some(false),
            links: Vec::new(),
        }
    }
}

/// The most changed crossings the fix plan's sentence names; the JSON has them all.
const MOST_FIXES_NAMED: usize = 12;

/// The most crossings the per-row plot shows, the largest, each named on its axis; the
/// title counts the rest, and the results CSV has them all.
const MOST_ROWS_PLOTTED: usize = 30;

/// The plots: each row's FIT at the worst corner, largest first, and each corner's total,
/// with the budget line; the spread of the total under uncertainty when it is asked.
pub fn plots(c: &BudgetCase, report: &BudgetReport) -> Vec<Plot> {
    let budget = report.budget_fit.map(|b| (b.log10(), "budget".to_string()));
    let mut order: Vec<usize> = (0..report.rows.len()).collect();
    order.sort_by(|&a, &b| {
        report.rows[b]
            .log10_fit
            .total_cmp(&report.rows[a].log10_fit)
    });
    // The answer in view: the largest row and the budget, and at most ROWS_SPAN_DECADES
    // below the higher of them; a row far below (a slow clock at 1e-389803 FIT) is
    // counted in the title, not allowed to flatten the rest onto one edge.
    let top = order.first().map_or(0.0, |&i| report.rows[i].log10_fit);
    let floor = top.min(budget.as_ref().map_or(top, |b| b.0)) - 1.0;
    let floor = floor.min(top.max(budget.as_ref().map_or(top, |b| b.0)) - ROWS_SPAN_DECADES);
    let shown: Vec<usize> = order
        .iter()
        .copied()
        .filter(|&i| report.rows[i].log10_fit >= floor)
        .take(MOST_ROWS_PLOTTED)
        .collect();
    let below = order
        .iter()
        .filter(|&&i| report.rows[i].log10_fit < floor)
        .count();
    let mut title = if shown.len() < order.len() {
        format!(
            "FIT of each crossing, the largest {} of {}",
            shown.len(),
            order.len()
        )
    } else {
        "FIT of each crossing, largest first".to_string()
    };
    if below > 0 {
        title.push_str(&format!(
            " ({below} below {} FIT not shown)",
            format_log10(floor, 2)
        ));
    }
    let mut rows = Plot::new("plot-rows", &title, ("rank", "", Spacing::Integer))
        .y("log10_fit", "FIT at the worst corner");
    rows.curves = vec![Curve {
        label: String::new(),
        points: shown
            .iter()
            .enumerate()
            .map(|(k, &i)| ((k + 1) as f64, report.rows[i].log10_fit))
            .collect(),
        points_only: true,
    }];
    rows.x_names = shown.iter().map(|&i| report.rows[i].name.clone()).collect();
    rows.hline.clone_from(&budget);
    let mut corners = Plot::new(
        "plot-corners",
        "Total FIT at each corner",
        ("corner", "", Spacing::Integer),
    )
    .y("log10_total_fit", "total FIT")
    // The worst corner and the budget in view; a corner far below leaves the plot.
    .clip_y(ROWS_SPAN_DECADES);
    corners.y_keep_top = true;
    corners.x_names = report.corners.iter().map(|k| k.name.clone()).collect();
    corners.curves = vec![Curve {
        label: String::new(),
        points: report
            .corners
            .iter()
            .enumerate()
            .map(|(i, t)| ((i + 1) as f64, t.log10_total_fit))
            .collect(),
        points_only: true,
    }];
    corners.hline.clone_from(&budget);
    let mut v = vec![rows, corners];
    if let Some((ts, ws)) = c.sigmas {
        let dist = c.rollup.distribution_corr(ts, ws, c.corr, 120);
        // Totals beyond what an f64 holds (below 1e-300 or above 1e300 FIT, as with
        // extreme inputs) are plotted by their log10 on a plain axis, so that the curve
        // and its CSV keep their values instead of turning into 0.
        let extreme = dist.iter().any(|(x, _)| x.abs() > 300.0);
        let axis = if extreme {
            ("log10_FIT (log10 of the total FIT)", "", Spacing::Linear)
        } else {
            ("FIT", "", Spacing::Log)
        };
        let to_x = |x: f64| if extreme { x } else { 10f64.powf(x) };
        let mut spread = Plot::new("plot-spread", "The worst total under the uncertainty", axis)
            .y("probability", "probability of a total at most this")
            .linear_y("");
        spread.curves = vec![Curve {
            label: String::new(),
            points: dist.iter().map(|(x, p)| (to_x(*x), *p)).collect(),
            points_only: false,
        }];
        spread.vline = report
            .budget_fit
            .map(|b| (if extreme { b.log10() } else { b }, "budget".to_string()));
        v.push(spread);
    }
    v
}
