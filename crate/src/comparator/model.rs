//! The comparator model: critical input, error probability per decision for several
//! input models, and the solvers that size regeneration time, tau and extra latch stages.
//! Pure functions of validated inputs.
//!
//! Everything is carried in natural logarithms: `vcrit` reaches 1e-300 V and below in
//! ordinary designs, where CDF differences cancel and `f64` values underflow.

use std::f64::consts::{LN_2, PI};

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind};
use crate::numeric::normal::{ln_prob_interval, ln_q, ln_sum_exp};
use crate::numeric::solve::bisect_last;
use crate::quantity::{Ratio, Time, Voltage};

use super::fields::{EXTRA_STAGES, STAGE_TIME};
pub use crate::latch::{tau_from_devices, TauSource};

/// The most thresholds on each side of zero the sine model sums (a 16-bit converter).
pub const SINE_MAX_THRESHOLDS: f64 = 32768.0;

/// The most extra latch stages the model accepts.
pub const MAX_EXTRA_STAGES: u32 = 1000;

/// Where the comparator's input sits when it decides.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "model", rename_all = "lowercase")]
pub enum InputModel {
    /// Uniform over many thresholds `lsb` apart (flash, and to first order SAR).
    Uniform {
        /// Threshold spacing, V.
        lsb: f64,
    },
    /// Gaussian with `mean` relative to the threshold and deviation `sigma`.
    Gaussian {
        /// Mean, V.
        mean: f64,
        /// Deviation, V.
        sigma: f64,
    },
    /// Two-level data at `+-amp` with Gaussian noise `sigma` (a link slicer).
    Nrz {
        /// Data level, V.
        amp: f64,
        /// Noise, V.
        sigma: f64,
    },
    /// Four-level data at `+-amp`, `+-amp/3`, thresholds 0 and `+-2amp/3`.
    Pam4 {
        /// Outer level, V.
        amp: f64,
        /// Noise, V.
        sigma: f64,
    },
    /// A full-scale sine of peak `amp` into a converter with thresholds at `k * lsb`.
    Sine {
        /// Peak, V.
        amp: f64,
        /// Threshold spacing, V.
        lsb: f64,
    },
}

impl InputModel {
    /// The model's name as the `input` field spells it.
    pub fn name(self) -> &'static str {
        match self {
            InputModel::Uniform { .. } => "uniform",
            InputModel::Gaussian { .. } => "gaussian",
            InputModel::Nrz { .. } => "nrz",
            InputModel::Pam4 { .. } => "pam4",
            InputModel::Sine { .. } => "sine",
        }
    }

    /// The parameters a model reads.
    pub fn uses(name: &str) -> &'static [&'static str] {
        match name {
            "uniform" => &["lsb"],
            "gaussian" => &["sigma", "mean"],
            "nrz" | "pam4" => &["amp", "sigma"],
            "sine" => &["amp", "lsb"],
            _ => &[],
        }
    }
}

/// The parts of a comparator before validation (see [`Comparator::new`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CompParts {
    /// Regeneration time constant.
    pub tau: Time,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// Regeneration time before any extra stage.
    pub treg: Time,
    /// Extra latch stages after the comparator, 0 to [`MAX_EXTRA_STAGES`].
    pub extra_stages: u32,
    /// Resolution time each extra stage adds (positive when there are extra stages).
    pub stage_time: Time,
    /// Decision level.
    pub vmin: Voltage,
    /// Preamplifier gain.
    pub gain: Ratio,
    /// The input model.
    pub input: InputModel,
}

/// A validated comparator: evaluation is infallible. Built only by [`Comparator::new`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Comparator {
    tau: Time,
    tau_source: TauSource,
    treg: Time,
    extra_stages: u32,
    stage_time: Time,
    vmin: Voltage,
    gain: Ratio,
    input: InputModel,
    /// Precomputed sum of the arcsine density over the thresholds (sine model only).
    sine_density_sum: f64,
}

/// Decision time for an input `vin`: `tau * ln(vmin / (gain * vin))`, at least 0.
pub fn decision_time(tau: f64, vmin: f64, gain: f64, vin: f64) -> f64 {
    (tau * (vmin / (gain * vin)).ln()).max(0.0)
}

/// Thresholds `k * lsb` strictly inside `(-amp, amp)`, as multiples of lsb (k >= 0 side).
fn sine_kmax(amp: f64, lsb: f64) -> i64 {
    let k = (amp / lsb).floor() as i64;
    if (k as f64) * lsb >= amp {
        k - 1
    } else {
        k
    }
}

/// Sum over thresholds of the arcsine density `1/(pi sqrt(amp^2 - v^2))`.
fn sine_density_sum(m: InputModel) -> f64 {
    let InputModel::Sine { amp, lsb } = m else {
        return 0.0;
    };
    let kmax = sine_kmax(amp, lsb);
    let f = |v: f64| 1.0 / (PI * ((amp - v) * (amp + v)).sqrt());
    f(0.0) + 2.0 * (1..=kmax).map(|k| f(k as f64 * lsb)).sum::<f64>()
}

impl Comparator {
    /// Validates the parts.
    ///
    /// # Errors
    /// `OutOfRange` on `extra-stages` beyond [`MAX_EXTRA_STAGES`]; `Zero` on `stage-time`
    /// when extra stages are asked for without time.
    pub fn new(p: CompParts) -> Result<Comparator, ParamError> {
        if p.extra_stages > MAX_EXTRA_STAGES {
            return Err(ParamError::new(
                EXTRA_STAGES.name,
                ParamErrorKind::OutOfRange {
                    value: f64::from(p.extra_stages),
                    range: "0 to 1000",
                },
            ));
        }
        if p.extra_stages > 0 && p.stage_time.get() <= 0.0 {
            return Err(ParamError::new(
                STAGE_TIME.name,
                ParamErrorKind::Zero(crate::units::Dim::Time),
            ));
        }
        Ok(Comparator {
            tau: p.tau,
            tau_source: p.tau_source,
            treg: p.treg,
            extra_stages: p.extra_stages,
            stage_time: p.stage_time,
            vmin: p.vmin,
            gain: p.gain,
            input: p.input,
            sine_density_sum: sine_density_sum(p.input),
        })
    }

    /// Regeneration time constant.
    pub fn tau(&self) -> Time {
        self.tau
    }
    /// How tau was obtained.
    pub fn tau_source(&self) -> TauSource {
        self.tau_source
    }
    /// Regeneration time before any extra stage.
    pub fn treg(&self) -> Time {
        self.treg
    }
    /// Extra latch stages after the comparator.
    pub fn extra_stages(&self) -> u32 {
        self.extra_stages
    }
    /// Resolution time each extra stage adds.
    pub fn stage_time(&self) -> Time {
        self.stage_time
    }
    /// Decision level.
    pub fn vmin(&self) -> Voltage {
        self.vmin
    }
    /// Preamplifier gain.
    pub fn gain(&self) -> f64 {
        self.gain.get()
    }
    /// The input model.
    pub fn input(&self) -> InputModel {
        self.input
    }
}

impl Comparator {
    /// Total regeneration time: `treg + extra_stages * stage_time`.
    pub fn treg_total(&self) -> f64 {
        self.treg.get() + f64::from(self.extra_stages) * self.stage_time.get()
    }

    /// ln of the input that just reaches vmin in no time: `ln(vmin / gain)`.
    fn ln_v0(&self) -> f64 {
        (self.vmin.get() / self.gain.get()).ln()
    }

    /// ln vcrit for a total regeneration time `treg` and time constant `tau`.
    ///
    /// # Formula
    /// `vcrit = (vmin / gain) * exp(-treg / tau)`
    pub fn ln_vcrit_at(&self, treg: f64, tau: f64) -> f64 {
        self.ln_v0() - treg / tau
    }

    /// ln vcrit of this comparator.
    pub fn ln_vcrit(&self) -> f64 {
        self.ln_vcrit_at(self.treg_total(), self.tau.get())
    }

    /// ln of the error probability per decision for a critical input `exp(ln_vc)`.
    ///
    /// # Formula
    /// Uniform: `2 vcrit / lsb`. Gaussian: `Phi((vcrit-mean)/sigma) - Phi((-vcrit-mean)/sigma)`.
    /// NRZ: the Gaussian case at mean `amp` (both levels alike). PAM4: the sum over the
    /// three thresholds, averaged over the four levels. Sine: the arcsine probability
    /// within `vcrit` of each threshold. All capped at 1.
    ///
    /// # References
    /// van de Plassche, "CMOS Integrated Analog-to-Digital and Digital-to-Analog
    /// Converters" (flash metastability, recalled); domain notes section 3.
    pub fn ln_p_error_at(&self, ln_vc: f64) -> f64 {
        let p = match self.input {
            InputModel::Uniform { lsb } => LN_2 + ln_vc - lsb.ln(),
            InputModel::Gaussian { mean, sigma } => {
                ln_prob_interval(-mean / sigma, ln_vc - sigma.ln())
            }
            InputModel::Nrz { amp, sigma } => ln_prob_interval(amp / sigma, ln_vc - sigma.ln()),
            InputModel::Pam4 { amp, sigma } => {
                let ln_h = ln_vc - sigma.ln();
                let levels = [-amp, -amp / 3.0, amp / 3.0, amp];
                let thresholds = [-2.0 * amp / 3.0, 0.0, 2.0 * amp / 3.0];
                let terms: Vec<f64> = levels
                    .iter()
                    .flat_map(|l| {
                        thresholds
                            .iter()
                            .map(move |t| ln_prob_interval((l - t) / sigma, ln_h))
                    })
                    .collect();
                ln_sum_exp(&terms) - 4f64.ln()
            }
            InputModel::Sine { amp, lsb } => self.ln_p_sine(amp, lsb, ln_vc),
        };
        p.min(0.0)
    }

    fn ln_p_sine(&self, amp: f64, lsb: f64, ln_vc: f64) -> f64 {
        let kmax = sine_kmax(amp, lsb);
        let edge = amp - kmax as f64 * lsb;
        // The density form is exact to rounding while vcrit is tiny against the
        // threshold spacing and the distance of the outermost threshold to the peak.
        if ln_vc < (1e-7 * lsb.min(edge)).ln() {
            return LN_2 + ln_vc + self.sine_density_sum.ln();
        }
        let vc = ln_vc.exp();
        let cdf = |v: f64| 0.5 + (v / amp).clamp(-1.0, 1.0).asin() / PI;
        let mut p = cdf(vc) - cdf(-vc);
        for k in 1..=kmax {
            let t = k as f64 * lsb;
            p += 2.0 * (cdf(t + vc) - cdf(t - vc));
        }
        p.min(1.0).ln()
    }

    /// ln of the error probability per decision of this comparator.
    pub fn ln_p_error(&self) -> f64 {
        self.ln_p_error_at(self.ln_vcrit())
    }

    /// ln of the noise-only error ratio of the data-link models, `None` for the others.
    ///
    /// # Formula
    /// NRZ: `Q(amp/sigma)`. PAM4 symbol errors: `2 (1 - 1/4) Q((amp/3)/sigma)`.
    ///
    /// # References
    /// Proakis, "Digital Communications", M-ary PAM symbol error probability (recalled).
    pub fn ln_p_noise(&self) -> Option<f64> {
        match self.input {
            InputModel::Nrz { amp, sigma } => Some(ln_q(amp / sigma)),
            InputModel::Pam4 { amp, sigma } => Some(1.5f64.ln() + ln_q(amp / (3.0 * sigma))),
            _ => None,
        }
    }

    /// ln vcrit at which the error probability equals `exp(ln_target)`, or `None` when
    /// even no regeneration at all meets it (then any treg does).
    fn ln_vcrit_for(&self, ln_target: f64) -> Option<f64> {
        let hi0 = self.ln_v0();
        if self.ln_p_error_at(hi0) <= ln_target {
            return None;
        }
        // Bisect until the bracket is at the resolution of an f64 at this magnitude.
        let tol = 1e-13 * hi0.abs().max(1.0);
        Some(bisect_last(hi0 - 2.5e6, hi0, tol, 400, |x| {
            self.ln_p_error_at(x) <= ln_target
        }))
    }

    /// Sizing for an error probability of at most `exp(ln_target)`: the total
    /// regeneration time needed, the largest tau allowed at this regeneration time, and the
    /// extra stages needed beyond `treg`.
    ///
    /// # Formula
    /// With `vcrit*` the critical input that meets the target (found by bisection on
    /// ln vcrit, the error probability rising monotonically with it):
    /// `treg_needed = tau ln(vmin/(gain vcrit*))`, `tau_max = treg_total / ln(vmin/(gain vcrit*))`,
    /// `stages = ceil((treg_needed - treg) / stage_time)`.
    pub fn size_for(&self, ln_target: f64) -> Sizing {
        let Some(lv) = self.ln_vcrit_for(ln_target) else {
            return Sizing {
                treg_needed_s: 0.0,
                max_tau_s: None,
                extra_stages: Some(0),
            };
        };
        let decades = self.ln_v0() - lv;
        let treg_needed_s = self.tau.get() * decades;
        let short = treg_needed_s - self.treg.get();
        let st = self.stage_time.get();
        Sizing {
            treg_needed_s,
            max_tau_s: Some(self.treg_total() / decades),
            extra_stages: if short <= 0.0 {
                Some(0)
            } else if st > 0.0 {
                Some((short / st * (1.0 - 1e-12)).ceil() as u64)
            } else {
                None
            },
        }
    }

    /// A copy with another tau and a total regeneration time `treg` (no extra stages),
    /// for sweeps and solver checks.
    pub fn with_tau_treg(&self, tau: Time, treg: Time) -> Comparator {
        Comparator {
            tau,
            treg,
            extra_stages: 0,
            ..*self
        }
    }

    /// A copy with another input model.
    pub fn with_input(&self, input: InputModel) -> Comparator {
        let mut c = *self;
        c.input = input;
        c.sine_density_sum = sine_density_sum(input);
        c
    }
}

/// What a target asks of a comparator (see [`Comparator::size_for`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Sizing {
    /// Total regeneration time needed, s.
    pub treg_needed_s: f64,
    /// Largest tau allowed at this regeneration time, s (`None`: any tau).
    pub max_tau_s: Option<f64>,
    /// Extra stages needed beyond treg (`None`: no stage time given).
    pub extra_stages: Option<u64>,
}
