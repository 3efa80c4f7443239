//! The synchronizer model: failure rate, MTBF and FIT of a flip-flop chain, and the
//! solvers for a target (depth, clock, tau). Pure functions of validated inputs.
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

use super::fields::{FCLK, STAGES};

/// The longest chain the model accepts.
pub const MAX_STAGES: u32 = 1000;

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

/// The parts of a synchronizer before validation (see [`Synchronizer::new`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SyncParts {
    /// Regeneration time constant.
    pub tau: Time,
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
}

/// A validated synchronizer: evaluation is infallible. Built only by [`Synchronizer::new`],
/// so a chain of zero flip-flops or one with no time between stages cannot exist.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Synchronizer {
    tau: Time,
    window: Window,
    fclk: Frequency,
    fdata: Frequency,
    stages: NonZeroU32,
    tsu: Time,
    tcq: Time,
    tr: Option<Time>,
}

/// The most stages the depth solver reports as a number; beyond, the hop is too short
/// for any chain to be the answer.
pub const MAX_STAGES_ANSWER: u64 = 1_000_000;

/// How many stages a target needs.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "stages", rename_all = "snake_case")]
pub enum StagesNeeded {
    /// This many flip-flops (at least 1) meet the target.
    Stages(u64),
    /// More than [`MAX_STAGES_ANSWER`] would be needed.
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
}

/// The largest tau that meets a target.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "tau_s", rename_all = "snake_case")]
pub enum TauLimit {
    /// Any tau up to this value (seconds) meets the target.
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

impl Synchronizer {
    /// Validates the parts.
    ///
    /// # Errors
    /// `OutOfRange` on `stages` outside 1 to [`MAX_STAGES`]; `PeriodTooShort` on `fclk`
    /// when a chain of two or more stages has no time left between them.
    pub fn new(p: SyncParts) -> Result<Synchronizer, ParamError> {
        let stages = NonZeroU32::new(p.stages)
            .filter(|n| n.get() <= MAX_STAGES)
            .ok_or(ParamError::new(
                STAGES.name,
                ParamErrorKind::OutOfRange {
                    value: f64::from(p.stages),
                    range: "1 to 1000",
                },
            ))?;
        let tcq = match p.window {
            Window::Tw(_) => p.tcq,
            Window::T0(_) => Time::ZERO,
        };
        let s = Synchronizer {
            tau: p.tau,
            window: p.window,
            fclk: p.fclk,
            fdata: p.fdata,
            stages,
            tsu: p.tsu,
            tcq,
            tr: p.tr,
        };
        if s.tr.is_none() && s.stages() > 1 && s.hop_time() <= 0.0 {
            return Err(ParamError::new(
                FCLK.name,
                ParamErrorKind::PeriodTooShort {
                    period: 1.0 / s.fclk.get(),
                    needed: s.tsu.get() + s.tcq.get(),
                },
            ));
        }
        Ok(s)
    }

    /// Regeneration time constant.
    pub fn tau(&self) -> Time {
        self.tau
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

    /// Time per extra stage: `1/fclk - tsu - tcq` (tw convention) or `1/fclk - tsu` (T0).
    pub fn hop_time(&self) -> f64 {
        hop_time(self.fclk.get(), self.tsu.get(), self.tcq.get(), self.window)
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

    /// log10 of the failure probability per data transition.
    ///
    /// # Formula
    /// `p = fclk * tw * exp(-tr / tau)`
    ///
    /// # References
    /// Ginosar, "Metastability and Synchronizers: A Tutorial", IEEE Design & Test, 2011.
    pub fn log10_p_fail(&self) -> f64 {
        self.fclk.get().log10() + self.window.seconds().log10()
            - self.resolution_time() / (self.tau.get() * LN_10)
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
        self.fdata.get().log10() + self.log10_p_fail()
    }

    /// log10 of the failure rate with tau, fclk and resolution time replaced.
    fn log10_rate_with(&self, tau: f64, fclk: f64, tr: f64) -> f64 {
        self.fdata.get().log10() + fclk.log10() + self.window.seconds().log10() - tr / (tau * LN_10)
    }

    /// log10 MTBF in seconds.
    pub fn log10_mtbf_s(&self) -> f64 {
        -self.log10_rate()
    }

    /// log10 FIT (failures per 1e9 device-hours).
    pub fn log10_fit(&self) -> f64 {
        self.log10_rate() + FIT_PER_RATE.log10()
    }

    /// Smallest chain length whose failure rate is at most `10^log10_max_rate`.
    ///
    /// # Formula
    /// `stages = 1 + ceil(tr_needed / hop)`, `tr_needed = tau ln(fdata fclk tw / rate_max)`.
    pub fn min_stages(&self, log10_max_rate: f64) -> StagesNeeded {
        if self.tr.is_some() {
            return StagesNeeded::NotApplicable;
        }
        let hop = self.hop_time();
        let needed = self.tau.get()
            * LN_10
            * (self.log10_rate_with(self.tau.get(), self.fclk.get(), 0.0) - log10_max_rate);
        if needed <= 0.0 {
            return StagesNeeded::Stages(1);
        }
        // The tiny tolerance keeps a case that meets the target exactly from rounding up.
        let hops = (needed / hop * (1.0 - 1e-12)).ceil();
        if hops >= MAX_STAGES_ANSWER as f64 {
            return StagesNeeded::TooMany;
        }
        StagesNeeded::Stages(1 + hops as u64)
    }

    /// The highest clock below which a chain of `stages` flip-flops keeps a positive hop
    /// time, or `None` when no such limit applies (one flip-flop, or `tr` given).
    pub fn fclk_ceiling(&self, stages: u32) -> Option<f64> {
        let busy = match (self.tr, stages) {
            (None, s) if s > 1 => match self.window {
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
        let rate_at = |f: f64| {
            let tr = f64::from(stages.max(1) - 1)
                * hop_time(f, self.tsu.get(), self.tcq.get(), self.window);
            self.log10_rate_with(self.tau.get(), f, tr)
        };
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

    /// Largest tau that meets the target at this resolution time.
    ///
    /// # Formula
    /// `tau_max = tr / (ln 10 * (log10(fdata fclk tw) - log10 rate_max))`
    pub fn max_tau(&self, log10_max_rate: f64) -> TauLimit {
        let excess = self.log10_rate_with(1.0, self.fclk.get(), 0.0) - log10_max_rate;
        let tr = self.resolution_time();
        if excess <= 0.0 {
            TauLimit::Any
        } else if tr <= 0.0 {
            TauLimit::None
        } else {
            TauLimit::Max(tr / (LN_10 * excess))
        }
    }

    /// A copy with another chain length.
    pub fn with_stages(&self, stages: NonZeroU32) -> Synchronizer {
        Synchronizer { stages, ..*self }
    }

    /// A copy with another tau.
    pub fn with_tau(&self, tau: Time) -> Synchronizer {
        Synchronizer { tau, ..*self }
    }

    /// A copy with another sampling clock (the hop time may then vanish: the model still
    /// answers, with the shorter resolution time, as a sweep wants).
    pub fn with_fclk(&self, fclk: Frequency) -> Synchronizer {
        Synchronizer { fclk, ..*self }
    }

    /// A copy with the resolution time given directly (`None`: from the chain).
    pub fn with_tr(&self, tr: Option<Time>) -> Synchronizer {
        Synchronizer { tr, ..*self }
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
            tau: c.sync.tau(),
            window: c.sync.window(),
            fclk: Frequency::positive("fclk", fclk).unwrap(),
            fdata: c.sync.fdata(),
            stages,
            tsu: c.sync.tsu(),
            tcq: c.sync.tcq(),
            tr: None,
        };
        let e = Synchronizer::new(parts(0, 1e9)).unwrap_err();
        assert_eq!(e.field, "stages");
        assert_eq!(
            Synchronizer::new(parts(1001, 1e9)).unwrap_err().field,
            "stages"
        );
        assert_eq!(Synchronizer::new(parts(2, 20e9)).unwrap_err().field, "fclk");
        assert!(Synchronizer::new(parts(1, 20e9)).is_ok());
    }
}
