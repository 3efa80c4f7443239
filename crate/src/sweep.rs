//! Sweeps of the synchronizer model: log10 MTBF against stages, clock, tau and resolution time.

use serde::Serialize;

use crate::synchronizer::{Synchronizer, YEAR_S};

/// How a sweep's x values are spaced (and so how a chart should draw the x axis).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Spacing {
    /// Whole numbers.
    Integer,
    /// Evenly spaced.
    Linear,
    /// Evenly spaced in log10.
    Log,
}

/// One curve: x values and log10 MTBF in years, plus the operating point.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Series {
    /// Stable identifier, also the CSV file stem (`mtbf-vs-stages`).
    pub id: &'static str,
    /// Axis title of x, with its unit.
    pub x_label: &'static str,
    /// Unit symbol of x ("" for counts).
    pub x_unit: &'static str,
    /// Spacing of x.
    pub spacing: Spacing,
    /// Column name of y in CSV output (a log10 quantity).
    pub y_name: &'static str,
    /// Axis title of y (the quantity whose log10 is y).
    pub y_label: &'static str,
    /// (x, y) pairs; y is a base-10 logarithm.
    pub points: Vec<(f64, f64)>,
    /// The case being evaluated, as (x, log10 MTBF years).
    pub operating_point: (f64, f64),
}

impl Series {
    /// The points as CSV with a header naming both columns and their units.
    pub fn to_csv(&self) -> String {
        let unit = if self.x_unit.is_empty() {
            String::new()
        } else {
            format!("_{}", self.x_unit)
        };
        let mut out = format!(
            "{}{unit},{}\n",
            self.x_label.split(' ').next().unwrap_or("x"),
            self.y_name
        );
        for (x, y) in &self.points {
            out.push_str(&format!("{x:e},{y}\n"));
        }
        out
    }
}

fn log10_years(s: &Synchronizer) -> f64 {
    s.log10_mtbf_s() - YEAR_S.log10()
}

/// `n` values evenly spaced in log10 between `lo` and `hi` (both positive).
pub fn log_space(lo: f64, hi: f64, n: usize) -> impl Iterator<Item = f64> {
    let (a, b) = (lo.log10(), hi.log10());
    let steps = n.saturating_sub(1).max(1) as f64;
    (0..n).map(move |i| 10f64.powf(a + (b - a) * i as f64 / steps))
}

/// log10 MTBF (years) for chains of 1 to `max_stages` flip-flops.
pub fn mtbf_vs_stages(s: &Synchronizer, max_stages: u32) -> Series {
    let tau = s.tau.get();
    let fclk = s.fclk.get();
    let mut plain = *s;
    plain.tr = None;
    Series {
        id: "mtbf-vs-stages",
        x_label: "stages",
        x_unit: "",
        y_name: "log10_mtbf_years",
        y_label: "MTBF (years)",
        spacing: Spacing::Integer,
        points: (1..=max_stages.max(1))
            .map(|n| (f64::from(n), log10_years(&plain.with(n, tau, fclk))))
            .collect(),
        operating_point: (f64::from(s.stages), log10_years(s)),
    }
}

/// log10 MTBF (years) against the clock frequency, from `fclk/4` up to 4 times it or
/// to just below the frequency at which the hop time vanishes.
pub fn mtbf_vs_fclk(s: &Synchronizer, n: usize) -> Series {
    let f = s.fclk.get();
    let busy = 1.0 / f - s.hop_time();
    let top = if s.tr.is_none() && s.stages > 1 && busy > 0.0 {
        (f * 4.0).min(0.98 / busy)
    } else {
        f * 4.0
    };
    let lo = f / 4.0;
    Series {
        id: "mtbf-vs-fclk",
        x_label: "fclk (Hz)",
        x_unit: "Hz",
        y_name: "log10_mtbf_years",
        y_label: "MTBF (years)",
        spacing: Spacing::Log,
        points: log_space(lo, top.max(lo * 1.01), n)
            .map(|x| (x, log10_years(&s.with(s.stages, s.tau.get(), x))))
            .collect(),
        operating_point: (f, log10_years(s)),
    }
}

/// log10 MTBF (years) against tau, over `tau/4` to `4 tau`.
pub fn mtbf_vs_tau(s: &Synchronizer, n: usize) -> Series {
    sweep_tau(s, s.tau.get() / 4.0, s.tau.get() * 4.0, n)
}

/// log10 MTBF (years) against tau over `lo..=hi` with `n` log-spaced points.
pub fn sweep_tau(s: &Synchronizer, lo: f64, hi: f64, n: usize) -> Series {
    Series {
        id: "mtbf-vs-tau",
        x_label: "tau (s)",
        x_unit: "s",
        y_name: "log10_mtbf_years",
        y_label: "MTBF (years)",
        spacing: Spacing::Log,
        points: log_space(lo, hi, n)
            .map(|x| (x, log10_years(&s.with(s.stages, x, s.fclk.get()))))
            .collect(),
        operating_point: (s.tau.get(), log10_years(s)),
    }
}

/// log10 MTBF (years) against resolution time, from 0 to twice the case's (or 3 hops).
pub fn mtbf_vs_tr(s: &Synchronizer, n: usize) -> Series {
    let tr = s.resolution_time();
    let span = (2.0 * tr).max(3.0 * s.hop_time()).max(10.0 * s.tau.get());
    let steps = n.saturating_sub(1).max(1) as f64;
    let at = |t: f64| {
        let mut c = *s;
        c.tr = crate::quantity::Time::non_negative("tr", t).ok();
        log10_years(&c)
    };
    Series {
        id: "mtbf-vs-tr",
        x_label: "tr (s)",
        x_unit: "s",
        y_name: "log10_mtbf_years",
        y_label: "MTBF (years)",
        spacing: Spacing::Linear,
        points: (0..n)
            .map(|i| {
                let t = span * i as f64 / steps;
                (t, at(t))
            })
            .collect(),
        operating_point: (tr, log10_years(s)),
    }
}
