//! The synchronizer model: failure rate, MTBF and FIT of a flip-flop chain, and the
//! solvers for a target (depth, clock, tau). Pure functions of validated inputs.
//!
//! Beyond the one-tau formula it takes a tau per hop, a master-slave chain with its duty
//! cycle and window growth (a lower bound), and related clocks (a clock factor K).
//!
//! Everything is carried as base-10 logarithms so that any valid input gives a finite
//! answer: `exp(tr/tau)` overflows an `f64` once `tr/tau > 709`, which real designs reach.

use std::f64::consts::LN_10;
use std::num::NonZeroU32;

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind};
use crate::numeric::solve::bisect_last;
use crate::quantity::{Frequency, Time};
use crate::reliability::FIT_PER_RATE;

use super::clocks::RelatedClocks;
use super::fields::{DUTY, FCLK, STAGES, TAU, TW2};

/// The longest chain the model accepts.
pub const MAX_STAGES: u32 = 1000;

/// The most stages the depth solver reports as a number; beyond, the hop is too short
/// for any chain to be the answer.
pub const MAX_STAGES_ANSWER: u64 = 1_000_000;

/// The rate law, once for the whole core: log10 of the failure rate of `fdata` data edges
/// per second sampled at `fclk` through a window of `10^log10_window` seconds, with the
/// clock factor `10^log10_k` (0 for unrelated clocks), after `decades` of resolution
/// (the resolution exponent over ln 10). The synchronizer, the design budget (through
/// [`Synchronizer::log10_rate_terms`]) and the fits' per-edge figures call it.
///
/// # Formula
/// `rate = fdata fclk W K exp(-exponent)`.
///
/// # Examples
/// ```
/// use latchwise::crossing::log10_rate;
/// // 100 MHz into 1 GHz, 40 ps, 45 ns / 20 ps of resolution: 4e6 e^-45 per second.
/// let l = log10_rate(1e8, 1e9, 40e-12f64.log10(), 0.0, 45.0 / std::f64::consts::LN_10);
/// assert!((l - (4e6f64.log10() - 45.0 / std::f64::consts::LN_10)).abs() < 1e-12);
/// ```
///
/// # References
/// Veendrick, IEEE JSSC 15(2), 1980; Ginosar, IEEE Design & Test, 2011.
pub fn log10_rate(fdata: f64, fclk: f64, log10_window: f64, log10_k: f64, decades: f64) -> f64 {
    fdata.log10() + fclk.log10() + log10_window + log10_k - decades
}

/// Which published convention the metastability window follows.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Window {
    /// `tw`: resolution time is counted beyond the nominal clock-to-output delay.
    Tw(Time),
    /// `T0`: resolution time is counted from the clock edge; `T0 = tw * exp(tcq/tau)`.
    T0(Time),
}

impl Window {
    /// The window in seconds, whichever the convention.
    pub fn seconds(self) -> f64 {
        match self {
            Window::Tw(t) | Window::T0(t) => t.get(),
        }
    }

    /// The parameter name of the convention, `tw` or `t0`.
    pub fn name(self) -> &'static str {
        match self {
            Window::Tw(_) => "tw",
            Window::T0(_) => "t0",
        }
    }
}

/// How the chain's flip-flops regenerate.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Latch {
    /// One tau for every hop.
    One {
        /// The time constant.
        tau: Time,
    },
    /// One tau per hop, in order (a dedicated first stage, then ordinary flip-flops);
    /// a longer chain repeats the last.
    PerHop {
        /// The time constants, stages - 1 of them.
        taus: Vec<Time>,
    },
    /// A master-slave flip-flop: the master's tau while the clock is high (a fraction
    /// `duty` of the period), the slave's while it is low.
    MasterSlave {
        /// Master latch time constant.
        master: Time,
        /// Slave latch time constant.
        slave: Time,
        /// Fraction of the period the clock is high, in (0, 1).
        duty: f64,
    },
}

impl Latch {
    /// The effective tau of a master-slave flip-flop.
    ///
    /// # Formula
    /// `1/tau_eff = duty/tau_m + (1 - duty)/tau_s`
    ///
    /// # References
    /// Beer, Cox, Chaney, Zar, "MTBF Bounds for Multistage Synchronizers", ASYNC 2013
    /// (recalled); domain notes section 8.2.
    pub fn tau_eff(master: f64, slave: f64, duty: f64) -> f64 {
        1.0 / (duty / master + (1.0 - duty) / slave)
    }

    /// The tau of hop `k` (0-based).
    fn tau_of_hop(&self, k: usize) -> f64 {
        match self {
            Latch::One { tau } => tau.get(),
            Latch::PerHop { taus } => taus
                .get(k)
                .or(taus.last())
                .map_or(f64::INFINITY, |t| t.get()),
            Latch::MasterSlave {
                master,
                slave,
                duty,
            } => Latch::tau_eff(master.get(), slave.get(), *duty),
        }
    }

    /// The tau that stands for the latch in one number: the first hop's of a list, the
    /// effective one of a master-slave pair.
    pub fn representative(&self) -> f64 {
        self.tau_of_hop(0)
    }

    /// The same latch with every time constant multiplied by `k`, if all stay valid.
    fn scaled(&self, k: f64) -> Option<Latch> {
        let t = |x: Time| Time::positive("tau", x.get() * k).ok();
        Some(match self {
            Latch::One { tau } => Latch::One { tau: t(*tau)? },
            Latch::PerHop { taus } => Latch::PerHop {
                taus: taus.iter().map(|x| t(*x)).collect::<Option<Vec<_>>>()?,
            },
            Latch::MasterSlave {
                master,
                slave,
                duty,
            } => Latch::MasterSlave {
                master: t(*master)?,
                slave: t(*slave)?,
                duty: *duty,
            },
        })
    }
}

/// The parts of a synchronizer before validation (see [`Synchronizer::new`]).
#[derive(Debug, Clone, PartialEq)]
pub struct SyncParts {
    /// How the flip-flops regenerate.
    pub latch: Latch,
    /// Metastability window and its convention.
    pub window: Window,
    /// Sampling clock.
    pub fclk: Frequency,
    /// Data transition rate.
    pub fdata: Frequency,
    /// Flip-flops in the chain, 1 to [`MAX_STAGES`].
    pub stages: u32,
    /// Setup time of the next flip-flop.
    pub tsu: Time,
    /// Nominal clock-to-output delay (ignored under the T0 convention).
    pub tcq: Time,
    /// Explicit resolution time, overriding the chain formula.
    pub tr: Option<Time>,
    /// The window of a two-flip-flop chain: with it, the master-slave bound replaces the
    /// tsu/tcq hop model.
    pub tw2: Option<Time>,
    /// Related launch and sampling clocks.
    pub related: Option<RelatedClocks>,
}

/// A validated synchronizer: evaluation is infallible. Built only by [`Synchronizer::new`],
/// so a chain of zero flip-flops or one with no time between stages cannot exist.
#[derive(Debug, Clone, PartialEq)]
pub struct Synchronizer {
    latch: Latch,
    window: Window,
    fclk: Frequency,
    fdata: Frequency,
    stages: NonZeroU32,
    tsu: Time,
    tcq: Time,
    tr: Option<Time>,
    tw2: Option<Time>,
    related: Option<RelatedClocks>,
}

/// How many stages a target needs.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "stages", rename_all = "snake_case")]
pub enum StagesNeeded {
    /// This many flip-flops (at least 1) meet the target.
    Stages(u64),
    /// More than [`MAX_STAGES_ANSWER`] would be needed (or no depth helps).
    TooMany,
    /// The resolution time was given explicitly, so the chain length does not apply.
    NotApplicable,
}

/// The highest sampling clock that meets a target.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "hz", rename_all = "snake_case")]
pub enum ClockLimit {
    /// Any clock up to this frequency (Hz) meets the target.
    Max(f64),
    /// Every clock the model accepts meets it.
    Any,
    /// No clock the model accepts meets it.
    None,
    /// The resolution time was given explicitly and does not follow the clock.
    NotApplicable,
    /// The clocks are related: the clock factor changes with the clock.
    Related,
}

/// The largest tau that meets a target.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "tau_s", rename_all = "snake_case")]
pub enum TauLimit {
    /// Any tau up to this value (seconds) meets the target (for a list, the first hop's,
    /// every other scaled alike).
    Max(f64),
    /// The target is met whatever tau is (the rate without resolution time already meets it).
    Any,
    /// No tau meets it (there is no resolution time to work with).
    None,
}

fn hop_time(fclk: f64, tsu: f64, tcq: f64, window: Window) -> f64 {
    match window {
        Window::Tw(_) => 1.0 / fclk - tsu - tcq,
        Window::T0(_) => 1.0 / fclk - tsu,
    }
}

fn error(field: &'static str, kind: ParamErrorKind) -> ParamError {
    ParamError::new(field, kind)
}

impl Synchronizer {
    /// Validates the parts.
    ///
    /// # Errors
    /// `OutOfRange` on `stages` outside 1 to [`MAX_STAGES`] or on `duty` outside (0, 1);
    /// `ListLength` on `tau` when a list does not give one tau per hop; `Conflict` on
    /// `tw2` with a window counted from the clock edge; `PeriodTooShort` on `fclk` when a
    /// chain of two or more stages has no time left between them.
    pub fn new(p: SyncParts) -> Result<Synchronizer, ParamError> {
        let stages = NonZeroU32::new(p.stages)
            .filter(|n| n.get() <= MAX_STAGES)
            .ok_or(error(
                STAGES.name,
                ParamErrorKind::OutOfRange {
                    value: f64::from(p.stages),
                    range: "1 to 1000",
                },
            ))?;
        match &p.latch {
            Latch::PerHop { taus } if taus.len() + 1 != stages.get() as usize || p.tr.is_some() => {
                return Err(error(
                    TAU.name,
                    ParamErrorKind::ListLength {
                        given: taus.len(),
                        wanted: if p.tr.is_some() {
                            0
                        } else {
                            stages.get() as usize - 1
                        },
                    },
                ));
            }
            Latch::MasterSlave { duty, .. } if !(*duty > 0.0 && *duty < 1.0) => {
                return Err(error(
                    DUTY.name,
                    ParamErrorKind::OutOfRange {
                        value: *duty,
                        range: "above 0 and below 1",
                    },
                ));
            }
            _ => {}
        }
        if p.tw2.is_some() && matches!(p.window, Window::T0(_)) {
            return Err(error(TW2.name, ParamErrorKind::Conflict("t0")));
        }
        let tcq = match p.window {
            Window::Tw(_) => p.tcq,
            Window::T0(_) => Time::ZERO,
        };
        let s = Synchronizer {
            latch: p.latch,
            window: p.window,
            fclk: p.fclk,
            fdata: p.fdata,
            stages,
            tsu: p.tsu,
            tcq,
            tr: p.tr,
            tw2: p.tw2,
            related: p.related,
        };
        // Even one flip-flop must meet its setup and clock-to-output within a period, and a
        // deeper chain (the depth solver) would have no time to resolve.
        if s.tr.is_none() && s.tw2.is_none() && s.hop_time() <= 0.0 {
            return Err(error(
                FCLK.name,
                ParamErrorKind::PeriodTooShort {
                    period: 1.0 / s.fclk.get(),
                    needed: s.tsu.get() + s.tcq.get(),
                },
            ));
        }
        Ok(s)
    }

    /// How the flip-flops regenerate.
    pub fn latch(&self) -> &Latch {
        &self.latch
    }
    /// The tau that stands for the latch: the single one, the first hop's of a list, or
    /// the effective tau of a master-slave pair.
    pub fn tau(&self) -> Time {
        Time::positive("tau", self.latch.representative()).unwrap_or(Time::ZERO)
    }
    /// Metastability window and its convention.
    pub fn window(&self) -> Window {
        self.window
    }
    /// Sampling clock.
    pub fn fclk(&self) -> Frequency {
        self.fclk
    }
    /// Data transition rate.
    pub fn fdata(&self) -> Frequency {
        self.fdata
    }
    /// Flip-flops in the chain (at least 1).
    pub fn stages(&self) -> u32 {
        self.stages.get()
    }
    /// Setup time of the next flip-flop.
    pub fn tsu(&self) -> Time {
        self.tsu
    }
    /// Nominal clock-to-output delay (zero under the T0 convention).
    pub fn tcq(&self) -> Time {
        self.tcq
    }
    /// The explicit resolution time, if one was given.
    pub fn tr(&self) -> Option<Time> {
        self.tr
    }
    /// The two-flip-flop window of the master-slave bound, if given.
    pub fn tw2(&self) -> Option<Time> {
        self.tw2
    }
    /// The related clocks, if given.
    pub fn related(&self) -> Option<&RelatedClocks> {
        self.related.as_ref()
    }
    /// Whether the master-slave bound (full period per hop, growing window) applies.
    pub fn is_bound(&self) -> bool {
        self.tw2.is_some() && self.tr.is_none()
    }

    /// Time per extra stage: `1/fclk - tsu - tcq` (tw convention) or `1/fclk - tsu` (T0);
    /// the whole period under the master-slave bound.
    pub fn hop_time(&self) -> f64 {
        self.hop_time_at(self.fclk.get())
    }

    fn hop_time_at(&self, fclk: f64) -> f64 {
        if self.is_bound() {
            1.0 / fclk
        } else {
            hop_time(fclk, self.tsu.get(), self.tcq.get(), self.window)
        }
    }

    /// Resolution time: the explicit `tr`, else `(stages - 1) * hop_time`.
    ///
    /// # Formula
    /// `tr = (stages - 1) * (1/fclk - tsu - tcq)` (tw) or `(stages - 1) * (1/fclk - tsu)` (T0).
    pub fn resolution_time(&self) -> f64 {
        match self.tr {
            Some(t) => t.get(),
            None => f64::from(self.stages() - 1) * self.hop_time(),
        }
    }

    /// The resolution exponent (natural log units) of a chain of `stages` at `fclk` with
    /// every tau multiplied by `scale`: each hop's time over its own tau, summed.
    ///
    /// # Formula
    /// `sum_k S_k / tau_k` (domain notes 8.1); `tr / tau` with `tr` given.
    fn exponent(&self, stages: u32, fclk: f64, scale: f64) -> f64 {
        if let Some(tr) = self.tr {
            return tr.get() / (self.latch.representative() * scale);
        }
        let hop = self.hop_time_at(fclk);
        (0..stages.saturating_sub(1) as usize)
            .map(|k| hop / (self.latch.tau_of_hop(k) * scale))
            .sum()
    }

    /// log10 of the window of a chain of `stages`: `tw`, or under the master-slave bound
    /// `tw (tw2/tw)^(n-1)` with n = stages - 1 resolving hops.
    fn log10_window(&self, stages: u32) -> f64 {
        let tw = self.window.seconds().log10();
        match (self.is_bound(), self.tw2) {
            (true, Some(tw2)) if stages > 2 => {
                tw + f64::from(stages - 2) * (tw2.get().log10() - tw)
            }
            _ => tw,
        }
    }

    /// log10 of the clock factor K at `fclk` (0 for unrelated clocks).
    pub fn log10_clock_factor_at(&self, fclk: f64) -> f64 {
        self.related.map_or(0.0, |r| r.log10_factor(fclk))
    }

    /// log10 of the failure rate before the resolution exponent.
    fn log10_rate_pre(&self, stages: u32, fclk: f64) -> f64 {
        log10_rate(
            self.fdata.get(),
            fclk,
            self.log10_window(stages),
            self.log10_clock_factor_at(fclk),
            0.0,
        )
    }

    /// The resolution decades (at unit tau scale) that each stage beyond this chain's adds,
    /// where that is one number: a chain timed by hops (no `tr`) outside the master-slave
    /// bound, whose later hops all take the last tau. Deepening by `n` stages then lowers
    /// log10 rate by `n` times this.
    pub fn extra_stage_decades(&self) -> Option<f64> {
        (self.tr.is_none() && !self.is_bound())
            .then(|| self.hop_time() / (self.latch.tau_of_hop(self.stages() as usize - 1) * LN_10))
    }

    /// The rate law in two terms, for a chain of `stages` at the synchronizer's clock:
    /// log10 of the rate before resolution (`fdata fclk window K`) and the resolution
    /// exponent in decades at unit tau scale. With every tau times `s`, log10 rate is
    /// the first less the second over `s`; the design budget sums its rows by these.
    pub fn log10_rate_terms(&self, stages: u32) -> (f64, f64) {
        let f = self.fclk.get();
        (
            self.log10_rate_pre(stages, f),
            self.exponent(stages, f, 1.0) / LN_10,
        )
    }

    /// log10 of the failure rate of a chain of `stages` at `fclk`, taus times `scale`.
    fn log10_rate_at(&self, stages: u32, fclk: f64, scale: f64) -> f64 {
        self.log10_rate_pre(stages, fclk) - self.exponent(stages, fclk, scale) / LN_10
    }

    /// log10 of the failure probability per data transition.
    ///
    /// # Formula
    /// `p = K fclk tw exp(-sum_k S_k / tau_k)`; K = 1 for unrelated clocks.
    ///
    /// # References
    /// Ginosar, "Metastability and Synchronizers: A Tutorial", IEEE Design & Test, 2011.
    pub fn log10_p_fail(&self) -> f64 {
        self.log10_rate() - self.fdata.get().log10()
    }

    /// log10 of the failure rate per second.
    ///
    /// # Formula
    /// `rate = fdata * fclk * tw * exp(-tr / tau)`; MTBF = 1/rate.
    ///
    /// # Examples
    /// ```
    /// use latchwise::params::RawInputs;
    /// use latchwise::synchronizer::SyncCase;
    /// // Chu, "RTL Hardware Design Using VHDL": T0 0.1 ns, tau 0.5 ns, 50 MHz, 5 MHz.
    /// let raw = RawInputs::from_query("t0=0.1n&tau=0.5n&fclk=50M&fdata=5M&tr=17.5n");
    /// let case = SyncCase::from_inputs(&raw).unwrap();
    /// let mtbf_s = 10f64.powf(-case.sync.log10_rate());
    /// assert!((mtbf_s / 6.34e10 - 1.0).abs() < 2e-3);
    /// ```
    ///
    /// # References
    /// Veendrick, "The behavior of flip-flops used as synchronizers and prediction of
    /// their failure rate", IEEE JSSC 15(2), 1980.
    pub fn log10_rate(&self) -> f64 {
        self.log10_rate_at(self.stages(), self.fclk.get(), 1.0)
    }

    /// log10 MTBF in seconds.
    pub fn log10_mtbf_s(&self) -> f64 {
        -self.log10_rate()
    }

    /// log10 FIT (failures per 1e9 device-hours).
    pub fn log10_fit(&self) -> f64 {
        self.log10_rate() + FIT_PER_RATE.log10()
    }

    /// Each hop's part of the resolution exponent, in order: (tau, hop time, share).
    pub fn hop_shares(&self) -> Vec<(f64, f64, f64)> {
        if self.tr.is_some() {
            return Vec::new();
        }
        let total = self.exponent(self.stages(), self.fclk.get(), 1.0);
        let hop = self.hop_time();
        (0..self.stages() as usize - 1)
            .map(|k| {
                let tau = self.latch.tau_of_hop(k);
                (tau, hop, if total > 0.0 { hop / tau / total } else { 0.0 })
            })
            .collect()
    }

    /// Smallest chain length whose failure rate is at most `10^log10_max_rate`; hops
    /// beyond a tau list use its last tau.
    ///
    /// # Formula
    /// Each added hop lowers ln rate by its hop time over its tau (less the window's
    /// growth under the master-slave bound); past the listed hops the gain per hop is
    /// constant and the count follows in closed form.
    pub fn min_stages(&self, log10_max_rate: f64) -> StagesNeeded {
        if self.tr.is_some() {
            return StagesNeeded::NotApplicable;
        }
        let fclk = self.fclk.get();
        let hop = self.hop_time();
        let growth = match (self.is_bound(), self.tw2) {
            (true, Some(tw2)) => (tw2.get() / self.window.seconds()).ln(),
            _ => 0.0,
        };
        // ln of how far one flip-flop misses the target.
        let mut excess = (self.log10_rate_pre(1, fclk) - log10_max_rate) * LN_10;
        if excess <= 0.0 {
            return StagesNeeded::Stages(1);
        }
        let listed = match &self.latch {
            Latch::PerHop { taus } => taus.len(),
            _ => 0,
        };
        let gain = |k: usize| {
            // The first resolving hop brings the window to tw; only later hops grow it.
            hop / self.latch.tau_of_hop(k) - if k == 0 { 0.0 } else { growth }
        };
        for k in 0..listed {
            excess -= gain(k);
            if excess <= 0.0 {
                return StagesNeeded::Stages(k as u64 + 2);
            }
        }
        let (first, later) = (gain(listed), gain(listed + 1));
        let rest = excess - first;
        if rest <= 0.0 {
            return StagesNeeded::Stages(listed as u64 + 2);
        }
        if later <= 0.0 {
            return StagesNeeded::TooMany;
        }
        // The tiny tolerance keeps a case that meets the target exactly from rounding up.
        let hops = (rest / later * (1.0 - 1e-12)).ceil();
        if hops >= MAX_STAGES_ANSWER as f64 {
            return StagesNeeded::TooMany;
        }
        StagesNeeded::Stages(listed as u64 + 2 + hops as u64)
    }

    /// The highest clock below which a chain of `stages` flip-flops keeps a positive hop
    /// time, or `None` when no such limit applies (one flip-flop, `tr` given, or the
    /// master-slave bound, whose hop is the whole period).
    pub fn fclk_ceiling(&self, stages: u32) -> Option<f64> {
        let busy = match (self.tr, stages, self.is_bound()) {
            (None, s, false) if s > 1 => match self.window {
                Window::Tw(_) => self.tsu.get() + self.tcq.get(),
                Window::T0(_) => self.tsu.get(),
            },
            _ => 0.0,
        };
        (busy > 0.0).then(|| 1.0 / busy)
    }

    /// Highest clock frequency, within the clocks the model accepts, at which `stages`
    /// flip-flops still meet the target.
    ///
    /// # Formula
    /// Bisection on ln fclk of `rate(fclk) <= rate_max`, the rate rising with the clock
    /// while the hop time stays positive; the search ends where the hop time runs out.
    pub fn max_fclk(&self, stages: u32, log10_max_rate: f64) -> ClockLimit {
        if self.tr.is_some() {
            return ClockLimit::NotApplicable;
        }
        if self.related.is_some() {
            return ClockLimit::Related;
        }
        let rate_at = |f: f64| self.log10_rate_at(stages.max(1), f, 1.0);
        let (lo, limit) = FCLK.limits;
        let ceiling = self.fclk_ceiling(stages).map(|c| c * (1.0 - 1e-12));
        let top = ceiling.map_or(limit, |c| c.min(limit));
        if top <= lo || rate_at(lo) > log10_max_rate {
            return ClockLimit::None;
        }
        if rate_at(top) <= log10_max_rate {
            return if top < limit {
                ClockLimit::Max(top)
            } else {
                ClockLimit::Any
            };
        }
        let ln_f = bisect_last(lo.ln(), top.ln(), 0.0, 200, |x| {
            rate_at(x.exp()) <= log10_max_rate
        });
        ClockLimit::Max(ln_f.exp())
    }

    /// Largest tau that meets the target at this resolution time (for a list, the first
    /// hop's with every other scaled alike; for a master-slave pair, the effective tau).
    ///
    /// # Formula
    /// `tau_max = tau * E / (ln 10 * (log10 rate_pre - log10 rate_max))`, E the resolution
    /// exponent at the case's taus and `rate_pre` the rate before it.
    pub fn max_tau(&self, log10_max_rate: f64) -> TauLimit {
        let fclk = self.fclk.get();
        let excess = self.log10_rate_pre(self.stages(), fclk) - log10_max_rate;
        let e = self.exponent(self.stages(), fclk, 1.0);
        if excess <= 0.0 {
            TauLimit::Any
        } else if e <= 0.0 {
            TauLimit::None
        } else {
            TauLimit::Max(self.latch.representative() * e / (LN_10 * excess))
        }
    }

    /// A copy with another chain length.
    pub fn with_stages(&self, stages: NonZeroU32) -> Synchronizer {
        Synchronizer {
            stages,
            ..self.clone()
        }
    }

    /// A copy with one tau for every hop.
    pub fn with_tau(&self, tau: Time) -> Synchronizer {
        Synchronizer {
            latch: Latch::One { tau },
            ..self.clone()
        }
    }

    /// A copy with every tau multiplied by `k`, when all stay valid.
    pub fn with_tau_scaled(&self, k: f64) -> Option<Synchronizer> {
        Some(Synchronizer {
            latch: self.latch.scaled(k)?,
            ..self.clone()
        })
    }

    /// A copy of a master-slave chain with another duty cycle (others unchanged).
    pub fn with_duty(&self, duty: f64) -> Option<Synchronizer> {
        match self.latch {
            Latch::MasterSlave { master, slave, .. } if duty > 0.0 && duty < 1.0 => {
                Some(Synchronizer {
                    latch: Latch::MasterSlave {
                        master,
                        slave,
                        duty,
                    },
                    ..self.clone()
                })
            }
            _ => None,
        }
    }

    /// A copy of a related-clock crossing with the lattice at another phase.
    pub fn with_phase(&self, phase: Time) -> Option<Synchronizer> {
        let mut r = self.related?;
        r.phase = Some(phase);
        Some(Synchronizer {
            related: Some(r),
            ..self.clone()
        })
    }

    /// A copy with another sampling clock (the hop time may then vanish: the model still
    /// answers, with the shorter resolution time, as a sweep wants).
    pub fn with_fclk(&self, fclk: Frequency) -> Synchronizer {
        Synchronizer {
            fclk,
            ..self.clone()
        }
    }

    /// A copy with the resolution time given directly (`None`: from the chain).
    pub fn with_tr(&self, tr: Option<Time>) -> Synchronizer {
        Synchronizer { tr, ..self.clone() }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::params::RawInputs;
    use crate::reliability::Target;
    use crate::synchronizer::SyncCase;
    use crate::tolerance::{ROUNDING_LOG10_ABS, SOLVER_LOG10_ABS};

    fn case(q: &str) -> SyncCase {
        SyncCase::from_inputs(&RawInputs::from_query(q)).unwrap_or_else(|e| panic!("{q}: {e}"))
    }

    fn n(k: u32) -> NonZeroU32 {
        NonZeroU32::new(k).unwrap_or(NonZeroU32::MIN)
    }

    #[test]
    fn min_stages_is_the_smallest_that_meets() {
        let c = case("tau=20p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p");
        for years in [1e-3, 1.0, 1e3, 1e9, 1e30, 1e200] {
            let m = Target::MtbfYears(years).log10_max_rate();
            let StagesNeeded::Stages(k) = c.sync.min_stages(m) else {
                panic!()
            };
            let k = k as u32;
            assert!(
                c.sync.with_stages(n(k)).log10_rate() <= m + ROUNDING_LOG10_ABS,
                "{years}"
            );
            if k > 1 {
                assert!(c.sync.with_stages(n(k - 1)).log10_rate() > m, "{years}");
            }
        }
    }

    #[test]
    fn max_fclk_and_max_tau_sit_on_the_target() {
        let c = case("tau=20p&tw=40p&fclk=1G&fdata=100M&stages=3&tsu=30p&tcq=50p");
        let m = Target::MtbfYears(1e6).log10_max_rate();
        let ClockLimit::Max(f) = c.sync.max_fclk(3, m) else {
            panic!()
        };
        let at = c
            .sync
            .with_fclk(Frequency::positive("fclk", f).unwrap())
            .log10_rate();
        assert!((at - m).abs() < SOLVER_LOG10_ABS, "{at} vs {m}");
        let TauLimit::Max(t) = c.sync.max_tau(m) else {
            panic!()
        };
        let at = c
            .sync
            .with_tau(Time::positive("tau", t).unwrap())
            .log10_rate();
        assert!((at - m).abs() < SOLVER_LOG10_ABS, "{at} vs {m}");
    }

    #[test]
    fn invalid_chains_cannot_be_built() {
        let c = case("tau=20p&tw=40p&fclk=1G&fdata=100M&stages=3&tsu=30p&tcq=50p");
        let parts = |stages, fclk| SyncParts {
            latch: Latch::One { tau: c.sync.tau() },
            window: c.sync.window(),
            fclk: Frequency::positive("fclk", fclk).unwrap(),
            fdata: c.sync.fdata(),
            stages,
            tsu: c.sync.tsu(),
            tcq: c.sync.tcq(),
            tr: None,
            tw2: None,
            related: None,
        };
        let e = Synchronizer::new(parts(0, 1e9)).unwrap_err();
        assert_eq!(e.field, "stages");
        assert_eq!(
            Synchronizer::new(parts(1001, 1e9)).unwrap_err().field,
            "stages"
        );
        assert_eq!(Synchronizer::new(parts(2, 20e9)).unwrap_err().field, "fclk");
        // One flip-flop cannot meet its own setup and clock-to-output either.
        assert_eq!(Synchronizer::new(parts(1, 20e9)).unwrap_err().field, "fclk");
        assert!(Synchronizer::new(parts(1, 1e9)).is_ok());
    }
}
