//! Sweeps of the synchronizer model: log10 MTBF in years against stages, clock, tau and
//! resolution time, each a plot with the case's operating point marked.

use std::num::NonZeroU32;

use crate::chart::series::{lin_space, log_space, Plot, Spacing};
use crate::quantity::{Frequency, Time};
use crate::reliability::YEAR_S;

use super::model::{Latch, Synchronizer};

const Y_NAME: &str = "log10_mtbf_years";
const Y_LABEL: &str = "MTBF (years)";
/// The most decades a sweep's y axis spans around the case and its target.
const Y_SPAN: f64 = 80.0;

fn log10_years(s: &Synchronizer) -> f64 {
    s.log10_mtbf_s() - YEAR_S.log10()
}

fn operating_point(s: &Synchronizer, x: f64) -> (f64, f64) {
    (x, log10_years(s))
}

/// log10 MTBF (years) for chains of 1 to `max_stages` flip-flops.
pub fn mtbf_vs_stages(s: &Synchronizer, max_stages: u32) -> Plot {
    let plain = s.with_tr(None);
    let points = (1..=max_stages.max(1))
        .filter_map(NonZeroU32::new)
        .map(|n| (f64::from(n.get()), log10_years(&plain.with_stages(n))))
        .collect();
    Plot::new(
        "plot-stages",
        "MTBF against synchronizer depth",
        ("stages", "", Spacing::Integer),
    )
    .y(Y_NAME, Y_LABEL)
    .single(points, operating_point(s, f64::from(s.stages())))
}

/// log10 MTBF (years) against the clock frequency, from `fclk/4` up to 4 times it or
/// to just below the frequency at which the hop time vanishes.
pub fn mtbf_vs_fclk(s: &Synchronizer, n: usize) -> Plot {
    let f = s.fclk().get();
    let top = match s.fclk_ceiling(s.stages()) {
        Some(ceiling) => (f * 4.0).min(0.98 * ceiling),
        None => f * 4.0,
    };
    let lo = f / 4.0;
    let points = log_space(lo, top.max(lo * 1.01), n)
        .filter_map(|x| Frequency::positive("fclk", x).ok())
        .map(|x| (x.get(), log10_years(&s.with_fclk(x))))
        .collect();
    Plot::new(
        "plot-fclk",
        "MTBF against clock frequency",
        ("fclk (Hz)", "Hz", Spacing::Log),
    )
    .y(Y_NAME, Y_LABEL)
    .clip_y(Y_SPAN)
    .single(points, operating_point(s, f))
}

/// log10 MTBF (years) against tau, over `tau/4` to `4 tau`.
pub fn mtbf_vs_tau(s: &Synchronizer, n: usize) -> Plot {
    sweep_tau(s, s.tau().get() / 4.0, s.tau().get() * 4.0, n)
}

/// log10 MTBF (years) against tau over `lo..=hi` with `n` log-spaced points. With a tau
/// per hop or a master-slave pair, every tau is scaled alike and x is the first hop's (or
/// the effective) tau.
pub fn sweep_tau(s: &Synchronizer, lo: f64, hi: f64, n: usize) -> Plot {
    let tau = s.tau().get();
    let points = log_space(lo, hi, n)
        .filter_map(|x| Some((x, log10_years(&s.with_tau_scaled(x / tau)?))))
        .collect();
    Plot::new(
        "plot-tau",
        "MTBF against tau",
        ("tau (s)", "s", Spacing::Log),
    )
    .y(Y_NAME, Y_LABEL)
    .clip_y(Y_SPAN)
    .single(points, operating_point(s, s.tau().get()))
}

/// log10 MTBF (years) against resolution time, from 0 to twice the case's (or 3 hops).
pub fn mtbf_vs_tr(s: &Synchronizer, n: usize) -> Plot {
    let tr = s.resolution_time();
    let span = (2.0 * tr).max(3.0 * s.hop_time()).max(10.0 * s.tau().get());
    let points = lin_space(span, n)
        .filter_map(|t| Time::non_negative("tr", t).ok())
        .map(|t| (t.get(), log10_years(&s.with_tr(Some(t)))))
        .collect();
    Plot::new(
        "plot-tr",
        "MTBF against resolution time",
        ("tr (s)", "s", Spacing::Linear),
    )
    .y(Y_NAME, Y_LABEL)
    .single(points, operating_point(s, tr))
}

/// log10 MTBF (years) of a master-slave chain against the clock's duty cycle, 5 % to 95 %.
pub fn mtbf_vs_duty(s: &Synchronizer, n: usize) -> Plot {
    let duty = match s.latch() {
        Latch::MasterSlave { duty, .. } => *duty,
        _ => 0.5,
    };
    let points = lin_space(0.9, n)
        .filter_map(|x| Some((0.05 + x, log10_years(&s.with_duty(0.05 + x)?))))
        .collect();
    Plot::new(
        "plot-duty",
        "MTBF against the clock's duty cycle",
        ("duty (fraction high)", "", Spacing::Linear),
    )
    .y(Y_NAME, Y_LABEL)
    .clip_y(Y_SPAN)
    .single(points, operating_point(s, duty))
}

/// log10 MTBF (years) of a related-clock crossing against the phase of the edge lattice,
/// over one lattice spacing.
pub fn mtbf_vs_phase(s: &Synchronizer, n: usize) -> Plot {
    let Some(c) = s.related() else {
        return Plot::new(
            "plot-phase",
            "MTBF against phase",
            ("phase (s)", "s", Spacing::Linear),
        );
    };
    let g = c.spacing(s.fclk().get());
    let phase = c.phase.map_or(0.0, |p| p.get().rem_euclid(g));
    let points = lin_space(g, n)
        .filter_map(|x| Time::non_negative("phase", x).ok())
        .filter_map(|x| Some((x.get(), log10_years(&s.with_phase(x)?))))
        .collect();
    Plot::new(
        "plot-phase",
        "MTBF against the phase of related clocks",
        ("phase (s)", "s", Spacing::Linear),
    )
    .y(Y_NAME, Y_LABEL)
    .single(points, operating_point(s, phase))
}
