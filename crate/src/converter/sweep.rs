//! The converter's plots: code errors by size, the counted error rate against the time
//! the decisions get, and where the late decisions land by step.

use std::f64::consts::LN_10;

use crate::chart::series::{lin_space, Curve, Plot, Spacing};

use super::input::{ConvCase, Timing};
use super::report::ConvReport;

/// The most decades a plot's y axis spans around the case and its target.
const Y_SPAN: f64 = 80.0;

/// log10 P(|e| >= k) per conversion against k = 1, 2, 4, ... (the sizes that can occur).
pub fn sizes(report: &ConvReport) -> Plot {
    let points: Vec<(f64, f64)> = report
        .p_error_at_least
        .iter()
        .filter_map(|s| Some((s.lsb as f64, s.log10_p?)))
        .collect();
    let mut p = Plot::new(
        "plot-sizes",
        "Code errors by size",
        ("error size (LSB)", "LSB", Spacing::Log),
    )
    .y(
        "log10_p",
        "code errors of at least this size per conversion",
    )
    .clip_y(Y_SPAN);
    p.curves = vec![Curve {
        label: String::new(),
        points,
        points_only: true,
    }];
    p
}

/// log10 of the counted errors per conversion against the regeneration time per bit
/// (sync) or the conversion time (async): every term scales as exp(-t / tau), so the
/// curve is the case's rate moved along that law, up to past the time the target needs.
pub fn rate_vs_time(case: &ConvCase, report: &ConvReport, n: usize) -> Plot {
    let tau = case.tau.get();
    let counted = if report.counted_lsb == 0 {
        Some(report.log10_p_meta)
    } else {
        report.log10_ber_meta.flatten()
    };
    let needed = report
        .tbit_needed_s
        .or(report.tconv_needed_s)
        .flatten()
        .unwrap_or(0.0);
    let (t0, lo, id, title, x) = match case.timing {
        Timing::Sync { tbit, .. } => (
            tbit.get(),
            0.0,
            "plot-time",
            "Counted errors against regeneration time per bit",
            ("tbit (s)", "s", Spacing::Linear),
        ),
        Timing::Async { tconv, tfix, .. } => (
            tconv.get(),
            f64::from(case.bits) * tfix.get(),
            "plot-time",
            "Counted errors against conversion time",
            ("tconv (s)", "s", Spacing::Linear),
        ),
    };
    let hi = (2.0 * t0).max(needed * 1.15).max(lo + 10.0 * tau);
    let label = if report.counted_lsb == 0 {
        "late decisions per conversion"
    } else {
        "code errors of margin-lsb or more per conversion"
    };
    let mut p = Plot::new(id, title, x).y("log10_p", label).clip_y(Y_SPAN);
    if let Some(c) = counted {
        // The unclamped rate at t0, as the solver uses it.
        let at = |t: f64| (c - (t - t0) / tau / LN_10).min(0.0);
        let points = lin_space(hi - lo, n)
            .map(|x| lo + x)
            .filter(|&t| t > lo || lo == 0.0)
            .map(|t| (t, at(t)))
            .collect();
        p = p.single(points, (t0, c));
    }
    p.hline = report
        .log10_target_per_conversion
        .map(|t| (t, "target".to_string()));
    p
}

/// The share of late decisions at each step (1 = MSB), log10.
pub fn by_step(report: &ConvReport) -> Plot {
    let points = report
        .timeout_share_by_step
        .iter()
        .enumerate()
        .filter(|(_, s)| **s > 0.0)
        .map(|(i, s)| ((i + 1) as f64, s.log10()))
        .collect();
    let mut p = Plot::new(
        "plot-steps",
        "Where late decisions land",
        ("step (1 = MSB)", "", Spacing::Integer),
    )
    .y("log10_share", "share of late decisions")
    .clip_y(Y_SPAN);
    p.curves = vec![Curve {
        label: String::new(),
        points,
        points_only: true,
    }];
    p
}
