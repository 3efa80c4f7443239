//! Latched-comparator metastability: critical input, error probability per decision for
//! several input models, error rates against a target BER, and the solvers that size
//! regeneration time, tau and extra latch stages.
//!
//! Everything is carried in natural logarithms: `vcrit` reaches 1e-300 V and below in
//! ordinary designs, where CDF differences cancel and `f64` values underflow.

use std::f64::consts::{LN_10, LN_2, PI};

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::normal::{ln_prob_interval, ln_q, ln_sum_exp};
use crate::params::{positive_number, whole, FieldReader, FieldSpec, RawInputs};
use crate::quantity::{
    format_log10, format_number, format_si, Capacitance, Conductance, Dim, Frequency, Time, Voltage,
};
use crate::readout::Readout;
use crate::synchronizer::CAUTION;

/// The input fields of the comparator calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    FieldSpec {
        name: "tau",
        dim: Dim::Time,
        help: "regeneration time constant (or give cl, gm, g0)",
    },
    FieldSpec {
        name: "cl",
        dim: Dim::Capacitance,
        help: "capacitance on each regenerating node",
    },
    FieldSpec {
        name: "gm",
        dim: Dim::Conductance,
        help: "transconductance of the cross-coupled pair (gmn + gmp)",
    },
    FieldSpec {
        name: "g0",
        dim: Dim::Conductance,
        help: "total positive conductance on the node",
    },
    FieldSpec {
        name: "treg",
        dim: Dim::Time,
        help: "regeneration time available",
    },
    FieldSpec {
        name: "extra-stages",
        dim: Dim::Count,
        help: "latch or flip-flop stages after the comparator (default 0)",
    },
    FieldSpec {
        name: "stage-time",
        dim: Dim::Time,
        help: "resolution time each extra stage adds",
    },
    FieldSpec {
        name: "vmin",
        dim: Dim::Voltage,
        help: "output difference that counts as a decision",
    },
    FieldSpec {
        name: "gain",
        dim: Dim::Ratio,
        help: "preamplifier gain before the latch (1 for a bare latch)",
    },
    FieldSpec {
        name: "input",
        dim: Dim::Choice,
        help: "input model: uniform, gaussian, nrz, pam4 or sine",
    },
    FieldSpec {
        name: "lsb",
        dim: Dim::Voltage,
        help: "threshold spacing (uniform, sine)",
    },
    FieldSpec {
        name: "amp",
        dim: Dim::Voltage,
        help: "signal amplitude: data levels +-amp (nrz, pam4) or sine peak (sine)",
    },
    FieldSpec {
        name: "sigma",
        dim: Dim::Voltage,
        help: "Gaussian deviation (gaussian) or noise (nrz, pam4)",
    },
    FieldSpec {
        name: "mean",
        dim: Dim::Voltage,
        help: "mean input relative to the threshold (gaussian, default 0)",
    },
    FieldSpec {
        name: "fs",
        dim: Dim::Frequency,
        help: "decisions per second",
    },
    FieldSpec {
        name: "target-ber",
        dim: Dim::Ratio,
        help: "largest error ratio allowed (optional)",
    },
    FieldSpec {
        name: "vin",
        dim: Dim::Voltage,
        help: "an input whose decision time to report (optional)",
    },
];

/// The choices of the `input` field.
pub const INPUT_CHOICES: &str = "uniform, gaussian, nrz, pam4, sine";

/// The most thresholds on each side of zero the sine model sums (a 16-bit converter).
pub const SINE_MAX_THRESHOLDS: f64 = 32768.0;

fn spec(name: &str) -> &'static FieldSpec {
    FIELDS.iter().find(|f| f.name == name).unwrap_or(&FIELDS[0])
}

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

/// Where tau came from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "source", rename_all = "lowercase")]
pub enum TauSource {
    /// Given directly.
    Given,
    /// Computed as `cl / (gm - g0)`.
    Devices {
        /// Node capacitance, F.
        cl: f64,
        /// Transconductance, S.
        gm: f64,
        /// Node conductance, S.
        g0: f64,
    },
}

/// A validated comparator: evaluation is infallible.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Comparator {
    /// Regeneration time constant.
    pub tau: Time,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// Regeneration time before any extra stage.
    pub treg: Time,
    /// Extra latch stages after the comparator.
    pub extra_stages: u32,
    /// Resolution time each extra stage adds.
    pub stage_time: Time,
    /// Decision level.
    pub vmin: Voltage,
    /// Preamplifier gain.
    pub gain: f64,
    /// The input model.
    pub input: InputModel,
    /// Precomputed sum of the arcsine density over the thresholds (sine model only).
    sine_density_sum: f64,
}

/// A complete comparator case.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CompCase {
    /// The comparator.
    pub comp: Comparator,
    /// Decisions per second.
    pub fs: Frequency,
    /// Target error ratio, if any.
    pub target_ber: Option<f64>,
    /// An input whose decision time to report.
    pub vin: Option<Voltage>,
    /// Whether gain was given (it defaults to 1, a bare latch, and says so).
    pub gain_given: bool,
}

/// Regeneration time constant of a cross-coupled latch.
///
/// # Formula
/// `tau = C / (gm - G0)`
///
/// # Errors
/// `NotRegenerative` (on field `gm`) when `gm <= g0`.
///
/// # Examples
/// ```
/// use latchwise::comparator::tau_from_devices;
/// let tau = tau_from_devices(10e-15, 1e-3, 0.2e-3).unwrap();
/// assert!((tau - 12.5e-12).abs() < 1e-24);
/// assert!(tau_from_devices(10e-15, 1e-3, 1e-3).is_err());
/// ```
///
/// # References
/// Razavi, "Design of Analog CMOS Integrated Circuits", comparator chapter (recalled).
pub fn tau_from_devices(cl: f64, gm: f64, g0: f64) -> Result<f64, ParamError> {
    if gm <= g0 {
        return Err(ParamError::new(
            "gm",
            ParamErrorKind::NotRegenerative { gm, g0 },
        ));
    }
    Ok(cl / (gm - g0))
}

/// Decision time for an input `vin`: `tau * ln(vmin / (gain * vin))`, at least 0.
pub fn decision_time(tau: f64, vmin: f64, gain: f64, vin: f64) -> f64 {
    (tau * (vmin / (gain * vin)).ln()).max(0.0)
}

impl CompCase {
    /// Builds a case from named text inputs.
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<CompCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let devices = ["cl", "gm", "g0"].iter().any(|f| r.has(f));
        let tau = if r.has("tau") && devices {
            r.push(ParamError::new(
                "tau",
                ParamErrorKind::Conflict("cl, gm, g0"),
            ));
            None
        } else if devices {
            let cl = r.required(spec("cl"), Capacitance::positive);
            let gm = r.required(spec("gm"), Conductance::positive);
            let g0 = r.required(spec("g0"), Conductance::non_negative);
            match (cl, gm, g0) {
                (Some(cl), Some(gm), Some(g0)) => {
                    match tau_from_devices(cl.get(), gm.get(), g0.get()) {
                        Ok(t) => Some((
                            t,
                            TauSource::Devices {
                                cl: cl.get(),
                                gm: gm.get(),
                                g0: g0.get(),
                            },
                        )),
                        Err(e) => {
                            r.push(e);
                            None
                        }
                    }
                }
                _ => None,
            }
        } else {
            r.required(spec("tau"), Time::positive)
                .map(|t| (t.get(), TauSource::Given))
        };
        let treg = r.required(spec("treg"), Time::non_negative);
        let extra = r
            .optional(spec("extra-stages"), |f, v| {
                whole(f, v, 0, 1000, "0 to 1000")
            })
            .unwrap_or(0) as u32;
        let stage_time = if extra > 0 {
            r.required(spec("stage-time"), Time::positive)
        } else {
            r.optional(spec("stage-time"), Time::non_negative)
        };
        let vmin = r.required(spec("vmin"), Voltage::positive);
        let gain_given = r.has("gain");
        let gain = r.optional(spec("gain"), positive_number);
        let input = read_input(&mut r, raw);
        let fs = r.required(spec("fs"), Frequency::positive);
        let target_ber = r.optional(spec("target-ber"), |f, v| {
            if v > 1.0 {
                Err(ParamError::new(
                    f,
                    ParamErrorKind::OutOfRange {
                        value: v,
                        range: "above 0, at most 1",
                    },
                ))
            } else {
                positive_number(f, v)
            }
        });
        let vin = r.optional(spec("vin"), Voltage::positive);
        let (Some((tau, tau_source)), Some(treg), Some(vmin), Some(input), Some(fs), false) =
            (tau, treg, vmin, input, fs, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        let Ok(tau) = Time::positive("tau", tau) else {
            // cl / (gm - g0) overflowed or underflowed: say so on the inputs.
            r.push(ParamError::new(
                "cl",
                ParamErrorKind::OutOfRange {
                    value: tau,
                    range: "giving a finite, non-zero tau",
                },
            ));
            return Err(r.into_errors());
        };
        let comp = Comparator {
            tau,
            tau_source,
            treg,
            extra_stages: extra,
            stage_time: stage_time.unwrap_or(Time::ZERO),
            vmin,
            gain: gain.unwrap_or(1.0),
            input,
            sine_density_sum: sine_density_sum(input),
        };
        Ok(CompCase {
            comp,
            fs,
            target_ber,
            vin,
            gain_given,
        })
    }

    /// The inputs as normalised text, keyed by parameter name.
    pub fn echo(&self) -> Vec<(&'static str, String)> {
        let c = &self.comp;
        let mut v = Vec::new();
        match c.tau_source {
            TauSource::Given => v.push(("tau", c.tau.display())),
            TauSource::Devices { cl, gm, g0 } => {
                v.push(("cl", format_si(cl, "F")));
                v.push(("gm", format_si(gm, "S")));
                v.push(("g0", format_si(g0, "S")));
            }
        }
        v.push(("treg", c.treg.display()));
        if c.extra_stages > 0 {
            v.push(("extra-stages", c.extra_stages.to_string()));
            v.push(("stage-time", c.stage_time.display()));
        }
        v.push(("vmin", c.vmin.display()));
        v.push((
            "gain",
            if self.gain_given {
                format_number(c.gain)
            } else {
                "1 (not given: bare latch)".into()
            },
        ));
        v.push(("input", c.input.name().into()));
        match c.input {
            InputModel::Uniform { lsb } => v.push(("lsb", format_si(lsb, "V"))),
            InputModel::Gaussian { mean, sigma } => {
                v.push(("sigma", format_si(sigma, "V")));
                v.push(("mean", format_si(mean, "V")));
            }
            InputModel::Nrz { amp, sigma } | InputModel::Pam4 { amp, sigma } => {
                v.push(("amp", format_si(amp, "V")));
                v.push(("sigma", format_si(sigma, "V")));
            }
            InputModel::Sine { amp, lsb } => {
                v.push(("amp", format_si(amp, "V")));
                v.push(("lsb", format_si(lsb, "V")));
            }
        }
        v.push(("fs", self.fs.display()));
        if let Some(t) = self.target_ber {
            v.push(("target-ber", format_number(t)));
        }
        if let Some(x) = self.vin {
            v.push(("vin", x.display()));
        }
        v
    }
}

fn read_input(r: &mut FieldReader, raw: &RawInputs) -> Option<InputModel> {
    let Some(text) = raw.get_nonblank("input") else {
        r.push(ParamError::new("input", ParamErrorKind::Missing));
        return None;
    };
    let name = text.trim().to_ascii_lowercase();
    let model = match name.as_str() {
        "uniform" => r
            .required(spec("lsb"), Voltage::positive)
            .map(|l| InputModel::Uniform { lsb: l.get() }),
        "gaussian" => {
            let sigma = r.required(spec("sigma"), Voltage::positive);
            let mean = if r.has("mean") {
                r.optional(spec("mean"), |_, v| Ok(v))
            } else {
                Some(0.0)
            };
            sigma.zip(mean).map(|(s, m)| InputModel::Gaussian {
                mean: m,
                sigma: s.get(),
            })
        }
        "nrz" | "pam4" => {
            let amp = r.required(spec("amp"), Voltage::positive);
            let sigma = r.required(spec("sigma"), Voltage::positive);
            amp.zip(sigma).map(|(a, s)| {
                if name == "nrz" {
                    InputModel::Nrz {
                        amp: a.get(),
                        sigma: s.get(),
                    }
                } else {
                    InputModel::Pam4 {
                        amp: a.get(),
                        sigma: s.get(),
                    }
                }
            })
        }
        "sine" => {
            let amp = r.required(spec("amp"), Voltage::positive);
            let lsb = r.required(spec("lsb"), Voltage::positive);
            match amp.zip(lsb) {
                Some((a, l)) if a.get() / l.get() > SINE_MAX_THRESHOLDS => {
                    r.push(ParamError::new(
                        "lsb",
                        ParamErrorKind::OutOfRange {
                            value: l.get(),
                            range: "at least amp / 32768 (up to 16-bit converters; use the uniform model beyond)",
                        },
                    ));
                    None
                }
                Some((a, l)) => Some(InputModel::Sine {
                    amp: a.get(),
                    lsb: l.get(),
                }),
                None => None,
            }
        }
        _ => {
            r.push(ParamError::new(
                "input",
                ParamErrorKind::UnknownChoice {
                    text: text.to_string(),
                    choices: INPUT_CHOICES,
                },
            ));
            None
        }
    };
    model
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
    /// Total regeneration time: `treg + extra_stages * stage_time`.
    pub fn treg_total(&self) -> f64 {
        self.treg.get() + f64::from(self.extra_stages) * self.stage_time.get()
    }

    /// ln of the input that just reaches vmin in no time: `ln(vmin / gain)`.
    fn ln_v0(&self) -> f64 {
        (self.vmin.get() / self.gain).ln()
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
        let (mut lo, mut hi) = (hi0 - 2.5e6, hi0);
        // Bisect until the bracket is at the resolution of an f64 at this magnitude.
        while hi - lo > 1e-13 * hi.abs().max(1.0) {
            let mid = 0.5 * (lo + hi);
            if self.ln_p_error_at(mid) <= ln_target {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        Some(lo)
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

    /// A copy with another tau and regeneration time, for sweeps.
    pub fn with(&self, tau: f64, treg: f64) -> Comparator {
        let mut c = *self;
        c.tau = Time::positive("tau", tau).unwrap_or(self.tau);
        c.treg = Time::non_negative("treg", treg).unwrap_or(self.treg);
        c.extra_stages = 0;
        c
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

/// Everything a comparator case yields.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CompReport {
    /// Normalised inputs.
    #[serde(serialize_with = "crate::params::serialize_pairs")]
    pub inputs: Vec<(&'static str, String)>,
    /// Input model name.
    pub input_model: &'static str,
    /// Regeneration time constant, s.
    pub tau_s: f64,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// Total regeneration time including extra stages, s.
    pub treg_total_s: f64,
    /// Critical input, V (0 when below the smallest f64; see `log10_vcrit_v`).
    pub vcrit_v: f64,
    /// log10 of the critical input in volts.
    pub log10_vcrit_v: f64,
    /// log10 of the metastability error probability per decision.
    pub log10_p_error: f64,
    /// log10 of metastability errors per second.
    pub log10_errors_per_s: f64,
    /// log10 of the mean time between metastability errors, s.
    pub log10_mean_time_between_errors_s: f64,
    /// log10 of the noise-only error ratio (data-link models).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log10_p_noise: Option<f64>,
    /// log10 of the total (metastability plus noise) error ratio.
    pub log10_p_total: f64,
    /// The target error ratio.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub target_ber: Option<f64>,
    /// Whether the metastability error probability meets the target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub meets_target: Option<bool>,
    /// Decades of margin (negative: missed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub margin_decades: Option<f64>,
    /// Whether the total error ratio (with noise) meets the target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub total_meets_target: Option<bool>,
    /// Total regeneration time needed for the target, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub treg_needed_s: Option<f64>,
    /// Largest tau meeting the target at this regeneration time, s (null: any).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_tau_s: Option<Option<f64>>,
    /// Extra stages needed beyond treg (null: no stage time given).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub extra_stages_needed: Option<Option<u64>>,
    /// Decision time for `vin`, s.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decision_time_s: Option<f64>,
    /// Parameters given but not used by the input model.
    pub unused: Vec<&'static str>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// The standing caution.
    pub caution: &'static str,
}

/// Parameters present in `raw` that the chosen input model does not read.
pub fn unused_fields(raw: &RawInputs, model: &str) -> Vec<&'static str> {
    ["lsb", "amp", "sigma", "mean"]
        .into_iter()
        .filter(|f| raw.get_nonblank(f).is_some() && !InputModel::uses(model).contains(f))
        .collect()
}

/// Evaluates a comparator case.
pub fn evaluate(case: &CompCase, unused: Vec<&'static str>) -> CompReport {
    let c = &case.comp;
    let ln_vc = c.ln_vcrit();
    let ln_p = c.ln_p_error();
    let ln_noise = c.ln_p_noise();
    let ln_total = match ln_noise {
        Some(n) => ln_sum_exp(&[ln_p, n]).min(0.0),
        None => ln_p,
    };
    let ln_rate = ln_p + case.fs.get().ln();
    let ln_target = case.target_ber.map(f64::ln);
    let sizing = ln_target.map(|t| c.size_for(t));
    let mut warnings = Vec::new();
    if ln_p >= -1e-12 {
        warnings.push("Every decision is at risk: vcrit is as large as the input spread, so the regeneration time is far too short.".into());
    }
    if let InputModel::Nrz { amp, sigma } | InputModel::Pam4 { amp, sigma } = c.input {
        if amp / sigma < 3.0 {
            warnings.push(format!(
                "amp/sigma = {:.2}: noise alone causes frequent errors.",
                amp / sigma
            ));
        }
    }
    if c.treg_total() == 0.0 {
        warnings.push(
            "No regeneration time: the comparator decides only inputs already above vmin/gain."
                .into(),
        );
    }
    if !case.gain_given {
        warnings.push("gain not given: taken as 1 (a bare latch with no preamplifier).".into());
    }
    CompReport {
        inputs: case.echo(),
        input_model: c.input.name(),
        tau_s: c.tau.get(),
        tau_source: c.tau_source,
        treg_total_s: c.treg_total(),
        vcrit_v: ln_vc.exp(),
        log10_vcrit_v: ln_vc / LN_10,
        log10_p_error: ln_p / LN_10,
        log10_errors_per_s: ln_rate / LN_10,
        log10_mean_time_between_errors_s: -ln_rate / LN_10,
        log10_p_noise: ln_noise.map(|n| n / LN_10),
        log10_p_total: ln_total / LN_10,
        target_ber: case.target_ber,
        meets_target: ln_target.map(|t| ln_p <= t),
        margin_decades: ln_target.map(|t| (t - ln_p) / LN_10),
        total_meets_target: ln_target.map(|t| ln_total <= t),
        treg_needed_s: sizing.map(|z| z.treg_needed_s),
        max_tau_s: sizing.map(|z| z.max_tau_s),
        extra_stages_needed: sizing.map(|z| z.extra_stages),
        decision_time_s: case
            .vin
            .map(|v| decision_time(c.tau.get(), c.vmin.get(), c.gain, v.get())),
        unused,
        warnings,
        caution: CAUTION,
    }
}

impl CompReport {
    /// The results as named readouts; keys equal the JSON keys.
    pub fn readouts(&self) -> Vec<Readout> {
        let mut v = vec![
            Readout::new("tau_s", "tau", format_si(self.tau_s, "s"), Some(self.tau_s)),
            Readout::new(
                "treg_total_s",
                "total regeneration time",
                format_si(self.treg_total_s, "s"),
                Some(self.treg_total_s),
            ),
            Readout::new(
                "log10_vcrit_v",
                "critical input vcrit",
                format!("{} V", format_log10(self.log10_vcrit_v, 3)),
                Some(self.log10_vcrit_v),
            ),
            Readout::new(
                "log10_p_error",
                "metastability error probability",
                format_log10(self.log10_p_error, 3),
                Some(self.log10_p_error),
            ),
            Readout::new(
                "log10_errors_per_s",
                "metastability errors per second",
                format!("{} /s", format_log10(self.log10_errors_per_s, 3)),
                Some(self.log10_errors_per_s),
            ),
            Readout::new(
                "log10_mean_time_between_errors_s",
                "mean time between errors",
                crate::quantity::format_duration_log10(
                    self.log10_mean_time_between_errors_s,
                    crate::synchronizer::YEAR_S.log10(),
                ),
                Some(self.log10_mean_time_between_errors_s),
            ),
        ];
        if let Some(n) = self.log10_p_noise {
            v.push(Readout::new(
                "log10_p_noise",
                "noise-only error ratio",
                format_log10(n, 3),
                Some(n),
            ));
        }
        v.push(Readout::new(
            "log10_p_total",
            "total error ratio",
            format_log10(self.log10_p_total, 3),
            Some(self.log10_p_total),
        ));
        if let (Some(met), Some(m)) = (self.meets_target, self.margin_decades) {
            v.push(Readout::verdict(met, m));
        }
        if let Some(t) = self.total_meets_target {
            v.push(
                Readout::new(
                    "total_meets_target",
                    "total, with noise",
                    if t { "met".into() } else { "missed".into() },
                    Some(if t { 1.0 } else { 0.0 }),
                )
                .judged(t),
            );
        }
        if let Some(t) = self.treg_needed_s {
            v.push(Readout::new(
                "treg_needed_s",
                "regeneration time needed",
                format_si(t, "s"),
                Some(t),
            ));
        }
        if let Some(t) = self.max_tau_s {
            v.push(match t {
                Some(t) => Readout::new(
                    "max_tau_s",
                    "largest tau allowed",
                    format_si(t, "s"),
                    Some(t),
                ),
                None => Readout::new("max_tau_s", "largest tau allowed", "any".into(), None),
            });
        }
        if let Some(n) = self.extra_stages_needed {
            v.push(match n {
                Some(n) => Readout::new(
                    "extra_stages_needed",
                    "extra stages needed",
                    n.to_string(),
                    Some(n as f64),
                ),
                None => Readout::new(
                    "extra_stages_needed",
                    "extra stages needed",
                    "give stage-time".into(),
                    None,
                ),
            });
        }
        if let Some(t) = self.decision_time_s {
            v.push(Readout::new(
                "decision_time_s",
                "decision time for vin",
                format_si(t, "s"),
                Some(t),
            ));
        }
        v
    }
}
