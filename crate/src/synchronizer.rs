//! Flip-flop synchronizer MTBF and FIT, target solvers and fleet statistics.
//!
//! Everything is carried as base-10 logarithms so that any valid input gives a finite
//! answer: `exp(tr/tau)` overflows an `f64` once `tr/tau > 709`, which real designs reach.

use std::f64::consts::LN_10;

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{positive_number, whole, FieldReader, FieldSpec, RawInputs};
use crate::quantity::{
    format_duration_log10, format_log10, format_number, format_si, Dim, Frequency, Time,
};
use crate::readout::Readout;

/// Seconds per year used throughout: the Julian year of 365.25 days.
pub const YEAR_S: f64 = 365.25 * 86400.0;
/// Days per year used throughout.
pub const YEAR_DAYS: f64 = 365.25;
/// Device-hours in the FIT unit (1e9) times seconds per hour: FIT = rate * 3.6e12.
pub const FIT_PER_RATE: f64 = 3.6e12;

/// The caution shown with every result (domain notes, section 6).
pub const CAUTION: &str = "Results are first-order estimates. tau and tw depend on process, \
voltage, temperature and ageing; use characterised worst-corner values, keep margin, and \
follow the sign-off rules of your design organisation and any functional-safety standard \
that applies.";

/// The input fields of the synchronizer calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    FieldSpec {
        name: "tau",
        dim: Dim::Time,
        help: "regeneration time constant",
    },
    FieldSpec {
        name: "tw",
        dim: Dim::Time,
        help: "metastability window, referred to tcq (give tw or t0)",
    },
    FieldSpec {
        name: "t0",
        dim: Dim::Time,
        help: "metastability window counted from the clock edge (instead of tw)",
    },
    FieldSpec {
        name: "fclk",
        dim: Dim::Frequency,
        help: "sampling (receiving) clock frequency",
    },
    FieldSpec {
        name: "fdata",
        dim: Dim::Frequency,
        help: "data transition rate (edges per second)",
    },
    FieldSpec {
        name: "stages",
        dim: Dim::Count,
        help: "flip-flops in the synchronizer chain (1 to 1000)",
    },
    FieldSpec {
        name: "tsu",
        dim: Dim::Time,
        help: "setup time of the next flip-flop",
    },
    FieldSpec {
        name: "tcq",
        dim: Dim::Time,
        help: "nominal clock-to-output delay (not used with t0)",
    },
    FieldSpec {
        name: "tr",
        dim: Dim::Time,
        help: "explicit resolution time (overrides stages, tsu, tcq)",
    },
    FieldSpec {
        name: "target-years",
        dim: Dim::Ratio,
        help: "required MTBF in years (optional)",
    },
    FieldSpec {
        name: "target-fit",
        dim: Dim::Ratio,
        help: "allowed FIT (optional, instead of target-years)",
    },
    FieldSpec {
        name: "units",
        dim: Dim::Count,
        help: "devices in the field, for fleet figures (optional)",
    },
    FieldSpec {
        name: "service-years",
        dim: Dim::Ratio,
        help: "operating years per device, for fleet figures (optional)",
    },
];

fn spec(name: &str) -> &'static FieldSpec {
    FIELDS.iter().find(|f| f.name == name).unwrap_or(&FIELDS[0])
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
    fn seconds(self) -> f64 {
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

/// A validated synchronizer: evaluation is infallible.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Synchronizer {
    /// Regeneration time constant.
    pub tau: Time,
    /// Metastability window and its convention.
    pub window: Window,
    /// Sampling clock.
    pub fclk: Frequency,
    /// Data transition rate.
    pub fdata: Frequency,
    /// Flip-flops in the chain (at least 1).
    pub stages: u32,
    /// Setup time of the next flip-flop.
    pub tsu: Time,
    /// Nominal clock-to-output delay (ignored under the T0 convention).
    pub tcq: Time,
    /// Explicit resolution time, overriding the chain formula.
    pub tr: Option<Time>,
}

/// A reliability target, held as the largest allowed failure rate.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "kind", content = "value", rename_all = "snake_case")]
pub enum Target {
    /// MTBF of at least this many years.
    MtbfYears(f64),
    /// At most this many FIT.
    Fit(f64),
}

impl Target {
    /// log10 of the largest failure rate (per second) that meets the target.
    pub fn log10_max_rate(self) -> f64 {
        match self {
            Target::MtbfYears(y) => -(y.log10() + YEAR_S.log10()),
            Target::Fit(f) => f.log10() - FIT_PER_RATE.log10(),
        }
    }
}

/// A fleet of devices each carrying the synchronizer.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Fleet {
    /// Number of devices.
    pub units: u64,
    /// Operating years of each device.
    pub years: f64,
}

/// A complete synchronizer case: the circuit, an optional target and an optional fleet.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SyncCase {
    /// The circuit.
    pub sync: Synchronizer,
    /// The reliability target, if any.
    pub target: Option<Target>,
    /// The fleet, if any.
    pub fleet: Option<Fleet>,
}

impl SyncCase {
    /// Builds a case from named text inputs (URL query or command-line options).
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<SyncCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let tau = r.required(spec("tau"), Time::positive);
        let window = match (r.has("tw"), r.has("t0")) {
            (true, true) => {
                r.push(ParamError::new("tw", ParamErrorKind::Conflict("t0")));
                None
            }
            (false, true) => r.optional(spec("t0"), Time::positive).map(Window::T0),
            _ => r.required(spec("tw"), Time::positive).map(Window::Tw),
        };
        let fclk = r.required(spec("fclk"), Frequency::positive);
        let fdata = r.required(spec("fdata"), Frequency::positive);
        let tr = r.optional(spec("tr"), Time::non_negative);
        let chain_needed = tr.is_none();
        let read_time = |r: &mut FieldReader, name: &str, needed: bool| {
            if needed {
                r.required(spec(name), Time::non_negative)
            } else {
                r.optional(spec(name), Time::non_negative)
            }
        };
        let stages = if chain_needed {
            r.required(spec("stages"), stages_field)
        } else {
            r.optional(spec("stages"), stages_field)
        };
        let tsu = read_time(&mut r, "tsu", chain_needed);
        let uses_tcq = !matches!(window, Some(Window::T0(_)));
        let tcq = read_time(&mut r, "tcq", chain_needed && uses_tcq);
        let target = match (r.has("target-years"), r.has("target-fit")) {
            (true, true) => {
                r.push(ParamError::new(
                    "target-years",
                    ParamErrorKind::Conflict("target-fit"),
                ));
                None
            }
            (true, false) => r
                .optional(spec("target-years"), positive_number)
                .map(Target::MtbfYears),
            (false, true) => r
                .optional(spec("target-fit"), positive_number)
                .map(Target::Fit),
            (false, false) => None,
        };
        let fleet = match (r.has("units"), r.has("service-years")) {
            (false, false) => None,
            _ => {
                let units = r.required(spec("units"), |f, v| {
                    whole(f, v, 1, 1_000_000_000_000, "1 to 1e12")
                });
                let years = r.required(spec("service-years"), positive_number);
                units
                    .zip(years)
                    .map(|(units, years)| Fleet { units, years })
            }
        };
        let (Some(tau), Some(window), Some(fclk), Some(fdata), false) =
            (tau, window, fclk, fdata, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        let zero = Time::ZERO;
        let sync = Synchronizer {
            tau,
            window,
            fclk,
            fdata,
            stages: stages.unwrap_or(1),
            tsu: tsu.unwrap_or(zero),
            tcq: if uses_tcq { tcq.unwrap_or(zero) } else { zero },
            tr,
        };
        if sync.tr.is_none() && sync.stages > 1 && sync.hop_time() <= 0.0 {
            r.push(ParamError::new(
                "fclk",
                ParamErrorKind::PeriodTooShort {
                    period: 1.0 / fclk.get(),
                    needed: sync.tsu.get() + sync.tcq.get(),
                },
            ));
        }
        if r.has_errors() {
            return Err(r.into_errors());
        }
        Ok(SyncCase {
            sync,
            target,
            fleet,
        })
    }

    /// The inputs as normalised text, keyed by parameter name, for echoing back.
    pub fn echo(&self) -> Vec<(&'static str, String)> {
        let s = &self.sync;
        let mut v = vec![
            ("tau", s.tau.display()),
            (s.window.name(), format_si(s.window.seconds(), "s")),
            ("fclk", s.fclk.display()),
            ("fdata", s.fdata.display()),
        ];
        match s.tr {
            Some(tr) => v.push(("tr", tr.display())),
            None => {
                v.push(("stages", s.stages.to_string()));
                v.push(("tsu", s.tsu.display()));
                if matches!(s.window, Window::Tw(_)) {
                    v.push(("tcq", s.tcq.display()));
                }
            }
        }
        match self.target {
            Some(Target::MtbfYears(y)) => v.push(("target-years", format_number(y))),
            Some(Target::Fit(f)) => v.push(("target-fit", format_number(f))),
            None => {}
        }
        if let Some(f) = self.fleet {
            v.push(("units", f.units.to_string()));
            v.push(("service-years", format_number(f.years)));
        }
        v
    }
}

fn stages_field(field: &'static str, v: f64) -> Result<u32, ParamError> {
    whole(field, v, 1, 1000, "1 to 1000").map(|n| n as u32)
}

/// How many stages a target needs.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "status", content = "stages", rename_all = "snake_case")]
pub enum StagesNeeded {
    /// This many flip-flops (at least 1) meet the target.
    Stages(u64),
    /// The resolution time was given explicitly, so the chain length does not apply.
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

impl Synchronizer {
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
            None => f64::from(self.stages - 1) * self.hop_time(),
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
        if hop <= 0.0 {
            return StagesNeeded::NotApplicable;
        }
        // The tiny tolerance keeps a case that meets the target exactly from rounding up.
        let hops = (needed / hop * (1.0 - 1e-12)).ceil();
        StagesNeeded::Stages(if hops >= 1e18 {
            u64::MAX
        } else {
            1 + hops as u64
        })
    }

    /// Highest clock frequency at which `stages` flip-flops still meet the target, or
    /// `None` if none does. With an explicit `tr`, the resolution time is held fixed.
    pub fn max_fclk(&self, stages: u32, log10_max_rate: f64) -> Option<f64> {
        let rate_at = |f: f64| {
            let tr = match self.tr {
                Some(t) => t.get(),
                None => {
                    f64::from(stages - 1) * hop_time(f, self.tsu.get(), self.tcq.get(), self.window)
                }
            };
            self.log10_rate_with(self.tau.get(), f, tr)
        };
        // The rate rises monotonically with fclk while the hop time stays positive.
        let busy = match (self.tr, stages) {
            (None, s) if s > 1 => match self.window {
                Window::Tw(_) => self.tsu.get() + self.tcq.get(),
                Window::T0(_) => self.tsu.get(),
            },
            _ => 0.0,
        };
        let mut hi = if busy > 0.0 {
            (1.0 / busy).ln()
        } else {
            300.0 * LN_10
        };
        let mut lo = -300.0 * LN_10;
        if rate_at(lo.exp()) > log10_max_rate {
            return None;
        }
        let top = hi.exp() * (1.0 - 1e-12);
        if rate_at(top) <= log10_max_rate {
            return Some(top);
        }
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if rate_at(mid.exp()) <= log10_max_rate {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        Some(lo.exp())
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

    /// A copy with another stage count, tau or clock, for sweeps.
    pub fn with(&self, stages: u32, tau: f64, fclk: f64) -> Synchronizer {
        let mut s = *self;
        s.stages = stages.max(1);
        s.tau = Time::positive("tau", tau).unwrap_or(self.tau);
        s.fclk = Frequency::positive("fclk", fclk).unwrap_or(self.fclk);
        s
    }
}

fn hop_time(fclk: f64, tsu: f64, tcq: f64, window: Window) -> f64 {
    match window {
        Window::Tw(_) => 1.0 / fclk - tsu - tcq,
        Window::T0(_) => 1.0 / fclk - tsu,
    }
}

/// Expected failures and the probability of at least one, for a fleet.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct FleetOutcome {
    /// log10 of the expected number of failures over the fleet's service.
    pub log10_expected_failures: f64,
    /// log10 of the probability of at least one failure (at most 0).
    pub log10_p_any_failure: f64,
}

/// Fleet statistics for a failure rate `10^log10_rate` per second per device.
///
/// # Formula
/// `m = rate * units * years * YEAR_S`; `P(at least one) = 1 - exp(-m)` (Poisson).
pub fn fleet_outcome(log10_rate: f64, fleet: Fleet) -> FleetOutcome {
    let log10_m = log10_rate + (fleet.units as f64).log10() + fleet.years.log10() + YEAR_S.log10();
    FleetOutcome {
        log10_expected_failures: log10_m,
        log10_p_any_failure: log10_one_minus_exp_neg(log10_m),
    }
}

/// log10(1 - exp(-m)) given log10 m, accurate for m from 1e-300000 to 1e300000.
fn log10_one_minus_exp_neg(log10_m: f64) -> f64 {
    if log10_m < -300.0 {
        // 1 - exp(-m) = m (1 - m/2 + ...) and m/2 is far below f64 resolution.
        log10_m
    } else if log10_m > 3.0 {
        // exp(-m) < 1e-434: the probability is 1 to f64 precision.
        0.0
    } else {
        (-(-(10f64.powf(log10_m))).exp_m1()).log10()
    }
}

/// Everything a synchronizer case yields, ready to print or to serialise.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SyncReport {
    /// Window convention used, `tw` or `t0`.
    pub convention: &'static str,
    /// Days per year in the year figures.
    pub year_days: f64,
    /// Normalised inputs, serialised as an object in field order.
    #[serde(serialize_with = "crate::params::serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// Time per extra stage in seconds (absent with an explicit tr).
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
    /// Smallest chain length meeting the target (null when tr was given).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min_stages: Option<Option<u64>>,
    /// Highest fclk meeting the target at this depth, in Hz (null: none).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_fclk_hz: Option<Option<f64>>,
    /// Largest tau meeting the target at this resolution time.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_tau: Option<TauLimit>,
    /// Fleet figures, if a fleet was given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fleet: Option<FleetOutcome>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

impl SyncReport {
    /// The results as named readouts, in display order; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let l10y = YEAR_S.log10();
        let mut v = vec![
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
        ];
        if let (Some(met), Some(margin)) = (self.meets_target, self.margin_decades) {
            v.push(Readout::verdict(met, margin));
            v.push(Readout::new(
                "margin_decades",
                "margin",
                format!("{margin:+.2} decades"),
                Some(margin),
            ));
        }
        if let Some(ms) = self.min_stages {
            v.push(match ms {
                Some(n) => Readout::new(
                    "min_stages",
                    "smallest stage count",
                    n.to_string(),
                    Some(n as f64),
                ),
                None => Readout::new(
                    "min_stages",
                    "smallest stage count",
                    "n/a: tr given".into(),
                    None,
                ),
            });
        }
        if let Some(f) = self.max_fclk_hz {
            v.push(match f {
                Some(f) => Readout::new(
                    "max_fclk_hz",
                    "highest fclk at this depth",
                    format_si(f, "Hz"),
                    Some(f),
                ),
                None => Readout::new(
                    "max_fclk_hz",
                    "highest fclk at this depth",
                    "none".into(),
                    None,
                ),
            });
        }
        if let Some(t) = self.max_tau {
            v.push(match t {
                TauLimit::Max(t) => Readout::new(
                    "max_tau_s",
                    "largest tau at this tr",
                    format_si(t, "s"),
                    Some(t),
                ),
                TauLimit::Any => {
                    Readout::new("max_tau_s", "largest tau at this tr", "any".into(), None)
                }
                TauLimit::None => {
                    Readout::new("max_tau_s", "largest tau at this tr", "none".into(), None)
                }
            });
        }
        if let Some(f) = self.fleet {
            v.push(Readout::new(
                "log10_expected_failures",
                "expected failures in the fleet",
                format_log10(f.log10_expected_failures, 3),
                Some(f.log10_expected_failures),
            ));
            v.push(Readout::new(
                "log10_p_any_failure",
                "probability of at least one",
                format_log10(f.log10_p_any_failure, 3),
                Some(f.log10_p_any_failure),
            ));
        }
        v
    }
}

/// Evaluates a case: results, solver answers for the target, fleet figures and warnings.
pub fn evaluate(case: &SyncCase) -> SyncReport {
    let s = &case.sync;
    let log10_rate = s.log10_rate();
    let log10_p = s.log10_p_fail();
    let mut warnings = Vec::new();
    if s.fdata.get() > s.fclk.get() {
        warnings.push(format!(
            "fdata ({}) exceeds fclk ({}): a plain synchronizer cannot pass every value; \
             a handshake or an asynchronous FIFO is the usual remedy.",
            s.fdata.display(),
            s.fclk.display()
        ));
    }
    if log10_p > 0.0 {
        warnings.push(
            "The failure probability per transition comes out above 1: the resolution time \
             is too short for this first-order model, which then only says 'fails often'."
                .into(),
        );
    }
    if s.tr.is_none() && s.stages == 1 {
        warnings.push(
            "stages = 1 leaves no resolution time: the sampled value goes straight into logic."
                .into(),
        );
    }
    if let (Window::T0(_), true) = (s.window, case.sync.tr.is_none()) {
        warnings.push(
            "Window counted from the clock edge (t0): tcq is not used; resolution time is \
             (stages - 1) * (1/fclk - tsu)."
                .into(),
        );
    }
    if s.window.seconds() > 1e-9 && matches!(s.window, Window::Tw(_)) {
        warnings.push(format!(
            "tw = {} is unusually wide for a CMOS flip-flop (tens of ps is typical); \
             if it is counted from the clock edge, enter it as t0.",
            format_si(s.window.seconds(), "s")
        ));
    }
    let target_max = case.target.map(Target::log10_max_rate);
    SyncReport {
        convention: s.window.name(),
        year_days: YEAR_DAYS,
        inputs: case.echo(),
        hop_time_s: s.tr.is_none().then(|| s.hop_time()),
        resolution_time_s: s.resolution_time(),
        log10_p_fail: log10_p,
        log10_rate_per_s: log10_rate,
        log10_mtbf_s: -log10_rate,
        log10_mtbf_years: -log10_rate - YEAR_S.log10(),
        log10_fit: s.log10_fit(),
        target: case.target,
        meets_target: target_max.map(|m| log10_rate <= m),
        margin_decades: target_max.map(|m| m - log10_rate),
        min_stages: target_max.map(|m| match s.min_stages(m) {
            StagesNeeded::Stages(n) => Some(n),
            StagesNeeded::NotApplicable => None,
        }),
        max_fclk_hz: target_max.map(|m| s.max_fclk(s.stages, m)),
        max_tau: target_max.map(|m| s.max_tau(m)),
        fleet: case.fleet.map(|f| fleet_outcome(log10_rate, f)),
        warnings,
        caution: CAUTION,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn case(q: &str) -> SyncCase {
        SyncCase::from_inputs(&RawInputs::from_query(q)).unwrap_or_else(|e| panic!("{q}: {e}"))
    }

    #[test]
    fn min_stages_is_the_smallest_that_meets() {
        let c = case("tau=20p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p");
        for years in [1e-3, 1.0, 1e3, 1e9, 1e30, 1e200] {
            let m = Target::MtbfYears(years).log10_max_rate();
            let StagesNeeded::Stages(n) = c.sync.min_stages(m) else {
                panic!()
            };
            let n = n as u32;
            assert!(
                c.sync.with(n, 20e-12, 1e9).log10_rate() <= m + 1e-9,
                "{years}"
            );
            if n > 1 {
                assert!(c.sync.with(n - 1, 20e-12, 1e9).log10_rate() > m, "{years}");
            }
        }
    }

    #[test]
    fn max_fclk_and_max_tau_sit_on_the_target() {
        let c = case("tau=20p&tw=40p&fclk=1G&fdata=100M&stages=3&tsu=30p&tcq=50p");
        let m = Target::MtbfYears(1e6).log10_max_rate();
        let f = c.sync.max_fclk(3, m).unwrap();
        let at = c.sync.with(3, 20e-12, f).log10_rate();
        assert!((at - m).abs() < 1e-6, "{at} vs {m}");
        let TauLimit::Max(t) = c.sync.max_tau(m) else {
            panic!()
        };
        let at = c.sync.with(3, t, 1e9).log10_rate();
        assert!((at - m).abs() < 1e-9, "{at} vs {m}");
    }

    #[test]
    fn fleet_probability_limits() {
        assert_eq!(log10_one_minus_exp_neg(-400.0), -400.0);
        assert_eq!(log10_one_minus_exp_neg(5.0), 0.0);
        let m: f64 = 1e-3;
        let want = (1.0 - (-m).exp()).log10();
        assert!((log10_one_minus_exp_neg(m.log10()) - want).abs() < 1e-12);
    }
}
