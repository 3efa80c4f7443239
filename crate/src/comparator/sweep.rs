//! Sweeps of a comparator: log10 error probability against its levers, and the latch's
//! output growth curves, each as a plot.

use std::f64::consts::LN_10;

use crate::chart::series::{lin_space, log_space, Curve, Plot, Spacing};
use crate::quantity::Time;
use crate::units::{format_log10, format_si};

use super::model::{Comparator, InputModel};

const Y_NAME: &str = "log10_p_error";
const Y_LABEL: &str = "error probability per decision";
/// The most decades a sweep's y axis spans around the case and its target.
const Y_SPAN: f64 = 80.0;

fn p(c: &Comparator) -> f64 {
    c.ln_p_error() / LN_10
}

/// The comparator with another tau and total regeneration time, when both are valid.
fn at(c: &Comparator, tau: f64, treg: f64) -> Option<Comparator> {
    let tau = Time::positive("tau", tau).ok()?;
    let treg = Time::non_negative("treg", treg).ok()?;
    Some(c.with_tau_treg(tau, treg))
}

/// log10 p against the total regeneration time, from 0 to twice the case's, or past
/// `reach` (the regeneration time a target needs) when that is further.
pub fn p_vs_treg(c: &Comparator, reach: Option<f64>, n: usize) -> Plot {
    let t = c.treg_total();
    let span = (2.0 * t)
        .max(10.0 * c.tau().get())
        .max(reach.unwrap_or(0.0) * 1.15);
    let points = lin_space(span, n)
        .filter_map(|x| Some((x, p(&at(c, c.tau().get(), x)?))))
        .collect();
    Plot::new(
        "plot-treg",
        "Error probability against regeneration time",
        // The total: treg and the extra latch stages, as the case's marker is.
        ("total regeneration time (s)", "s", Spacing::Linear),
    )
    .y(Y_NAME, Y_LABEL)
    .clip_y(Y_SPAN)
    .single(points, (t, p(c)))
}

/// log10 p against tau over `tau/4 .. 4 tau` at the case's total regeneration time.
pub fn p_vs_tau(c: &Comparator, n: usize) -> Plot {
    let (tau, t) = (c.tau().get(), c.treg_total());
    let points = log_space(tau / 4.0, tau * 4.0, n)
        .filter_map(|x| Some((x, p(&at(c, x, t)?))))
        .collect();
    Plot::new(
        "plot-ctau",
        "Error probability against tau",
        ("tau (s)", "s", Spacing::Log),
    )
    .y(Y_NAME, Y_LABEL)
    .clip_y(Y_SPAN)
    .single(points, (tau, p(c)))
}

/// log10 p against the input spread: sigma (gaussian, nrz, pam4) or lsb (uniform, sine).
pub fn p_vs_spread(c: &Comparator, n: usize) -> Plot {
    let (x0, lo, hi, label): (f64, f64, f64, &'static str) = match c.input() {
        InputModel::Gaussian { sigma, .. }
        | InputModel::Nrz { sigma, .. }
        | InputModel::Pam4 { sigma, .. } => (sigma, sigma / 10.0, sigma * 10.0, "sigma (V)"),
        // Smaller steps would add thresholds beyond the sine model's limit.
        InputModel::Sine { lsb, .. } => (lsb, lsb, lsb * 10.0, "lsb (V)"),
        InputModel::Uniform { lsb } => (lsb, lsb / 10.0, lsb * 10.0, "lsb (V)"),
    };
    let title = match c.input() {
        InputModel::Gaussian { .. } | InputModel::Nrz { .. } | InputModel::Pam4 { .. } => {
            "Error probability against input noise"
        }
        _ => "Error probability against threshold spacing",
    };
    let with = |x: f64| {
        let m = match c.input() {
            InputModel::Gaussian { mean, .. } => InputModel::Gaussian { mean, sigma: x },
            InputModel::Nrz { amp, .. } => InputModel::Nrz { amp, sigma: x },
            InputModel::Pam4 { amp, .. } => InputModel::Pam4 { amp, sigma: x },
            InputModel::Sine { amp, .. } => InputModel::Sine { amp, lsb: x },
            InputModel::Uniform { .. } => InputModel::Uniform { lsb: x },
        };
        c.with_input(m)
    };
    let points = log_space(lo, hi, n).map(|x| (x, p(&with(x)))).collect();
    Plot::new("plot-spread", title, (label, "V", Spacing::Log))
        .y(Y_NAME, Y_LABEL)
        .clip_y(Y_SPAN)
        .single(points, (x0, p(c)))
}

/// The latch's output difference `dv(t) = gain vin exp(t/tau)` (log10 volts) for inputs
/// of vmin/gain times 1e-1, 1e-3, 1e-6, and for vcrit, each up to three times vmin.
pub fn growth(c: &Comparator, n: usize) -> Plot {
    let tau = c.tau().get();
    let vmin = c.vmin().get();
    let ln_v0 = (vmin / c.gain()).ln();
    let ln_vc = c.ln_vcrit();
    let mut inputs: Vec<(String, f64)> = [1e-1f64, 1e-3, 1e-6]
        .iter()
        .map(|k| {
            (
                format!("vin = {}", format_si(vmin / c.gain() * k, "V")),
                ln_v0 + k.ln(),
            )
        })
        .filter(|(_, l)| *l > ln_vc)
        .collect();
    inputs.push((
        format!("vin = vcrit ({} V)", format_log10(ln_vc / LN_10, 3)),
        ln_vc,
    ));
    let t_end = (c.treg_total() * 1.15).max(tau * 8.0);
    let ln_stop = (3.0 * vmin).ln();
    let mut plot = Plot::new(
        "plot-growth",
        "Latch output growth, dv = gain vin exp(t/tau)",
        ("t (s)", "s", Spacing::Linear),
    )
    .y("log10_dv_v", "output difference dv (V)");
    plot.curves = inputs
        .into_iter()
        .map(|(label, ln_vin)| {
            let ln_dv0 = c.gain().ln() + ln_vin;
            let points = lin_space(t_end, n)
                .map(|t| (t, ln_dv0 + t / tau))
                .take_while(|&(_, l)| l <= ln_stop)
                .map(|(t, l)| (t, l / LN_10))
                .collect();
            Curve {
                label,
                points,
                points_only: false,
            }
        })
        .collect();
    plot.hline = Some((vmin.log10(), "vmin".into()));
    plot.vline = Some((c.treg_total(), "treg".into()));
    plot
}
