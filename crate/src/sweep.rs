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

/// Sweeps of a comparator: log10 error probability against its levers, and the latch's
/// output growth curves.
pub mod comparator {
    use std::f64::consts::LN_10;

    use super::{log_space, Series, Spacing};
    use crate::comparator::{Comparator, InputModel};
    use crate::quantity::format_si;

    fn p(c: &Comparator) -> f64 {
        c.ln_p_error() / LN_10
    }

    fn series(
        id: &'static str,
        x_label: &'static str,
        x_unit: &'static str,
        spacing: Spacing,
    ) -> Series {
        Series {
            id,
            x_label,
            x_unit,
            spacing,
            y_name: "log10_p_error",
            y_label: "error probability per decision",
            points: Vec::new(),
            operating_point: (0.0, 0.0),
        }
    }

    /// log10 p against the total regeneration time, from 0 to twice the case's.
    pub fn p_vs_treg(c: &Comparator, n: usize) -> Series {
        let t = c.treg_total();
        let span = (2.0 * t).max(10.0 * c.tau.get());
        let steps = n.saturating_sub(1).max(1) as f64;
        let mut s = series("p-vs-treg", "treg (s)", "s", Spacing::Linear);
        s.points = (0..n)
            .map(|i| {
                let x = span * i as f64 / steps;
                (x, p(&c.with(c.tau.get(), x)))
            })
            .collect();
        s.operating_point = (t, p(c));
        s
    }

    /// log10 p against tau over `tau/4 .. 4 tau` at the case's total regeneration time.
    pub fn p_vs_tau(c: &Comparator, n: usize) -> Series {
        let (tau, t) = (c.tau.get(), c.treg_total());
        let mut s = series("p-vs-tau", "tau (s)", "s", Spacing::Log);
        s.points = log_space(tau / 4.0, tau * 4.0, n)
            .map(|x| (x, p(&c.with(x, t))))
            .collect();
        s.operating_point = (tau, p(c));
        s
    }

    /// log10 p against the input spread: sigma (gaussian, nrz, pam4) or lsb (uniform, sine).
    pub fn p_vs_spread(c: &Comparator, n: usize) -> Series {
        let (x0, lo, hi, label): (f64, f64, f64, &'static str) = match c.input {
            InputModel::Gaussian { sigma, .. }
            | InputModel::Nrz { sigma, .. }
            | InputModel::Pam4 { sigma, .. } => (sigma, sigma / 10.0, sigma * 10.0, "sigma (V)"),
            // Smaller steps would add thresholds beyond the sine model's limit.
            InputModel::Sine { lsb, .. } => (lsb, lsb, lsb * 10.0, "lsb (V)"),
            InputModel::Uniform { lsb } => (lsb, lsb / 10.0, lsb * 10.0, "lsb (V)"),
        };
        let with = |x: f64| {
            let m = match c.input {
                InputModel::Gaussian { mean, .. } => InputModel::Gaussian { mean, sigma: x },
                InputModel::Nrz { amp, .. } => InputModel::Nrz { amp, sigma: x },
                InputModel::Pam4 { amp, .. } => InputModel::Pam4 { amp, sigma: x },
                InputModel::Sine { amp, .. } => InputModel::Sine { amp, lsb: x },
                InputModel::Uniform { .. } => InputModel::Uniform { lsb: x },
            };
            c.with_input(m)
        };
        let mut s = series("p-vs-spread", label, "V", Spacing::Log);
        s.points = log_space(lo, hi, n).map(|x| (x, p(&with(x)))).collect();
        s.operating_point = (x0, p(c));
        s
    }

    /// The latch's output difference `dv(t) = gain vin exp(t/tau)` (log10 volts) for inputs
    /// of vmin/gain times 1e-1, 1e-3, 1e-6, and for vcrit, each up to three times vmin.
    pub fn growth(c: &Comparator, n: usize) -> Vec<(String, Vec<(f64, f64)>)> {
        let tau = c.tau.get();
        let ln_v0 = (c.vmin.get() / c.gain).ln();
        let ln_vc = c.ln_vcrit();
        let mut inputs: Vec<(String, f64)> = [1e-1f64, 1e-3, 1e-6]
            .iter()
            .map(|k| {
                (
                    format!("vin = {}", format_si(c.vmin.get() / c.gain * k, "V")),
                    ln_v0 + k.ln(),
                )
            })
            .filter(|(_, l)| *l > ln_vc)
            .collect();
        inputs.push((
            format!(
                "vin = vcrit ({} V)",
                crate::quantity::format_log10(ln_vc / LN_10, 3)
            ),
            ln_vc,
        ));
        let t_end = (c.treg_total() * 1.15).max(tau * 8.0);
        let steps = n.saturating_sub(1).max(1) as f64;
        let ln_stop = (3.0 * c.vmin.get()).ln();
        inputs
            .into_iter()
            .map(|(label, ln_vin)| {
                let ln_dv0 = c.gain.ln() + ln_vin;
                let pts = (0..n)
                    .map(|i| t_end * i as f64 / steps)
                    .map(|t| (t, ln_dv0 + t / tau))
                    .take_while(|&(_, l)| l <= ln_stop)
                    .map(|(t, l)| (t, l / LN_10))
                    .collect();
                (label, pts)
            })
            .collect()
    }
}
