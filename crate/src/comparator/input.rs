//! Reading raw named inputs (URL query or command-line options) into a comparator case.

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{positive_number, whole, FieldReader, RawInputs};
use crate::quantity::{Frequency, Ratio, Time, Voltage};
use crate::units::{format_number, format_si};

use super::fields::{
    AMP, EXTRA_STAGES, FS, GAIN, INPUT, LSB, MEAN, SIGMA, STAGE_TIME, TARGET_BER, TAU, TREG, VIN,
    VMIN,
};
use super::model::{CompParts, Comparator, InputModel, TauSource, SINE_MAX_THRESHOLDS};
use crate::latch::read_tau;

/// The choices of the `input` field.
pub const INPUT_CHOICES: &str = "uniform, gaussian, nrz, pam4, sine";

/// A complete comparator case.
#[derive(Debug, Clone, PartialEq)]
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
    /// Parameters given but not read by the chosen input model.
    pub unused: Vec<&'static str>,
    /// Notes on values far outside their usual range.
    pub notes: Vec<String>,
}

impl CompCase {
    /// Builds a case from named text inputs.
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<CompCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let tau = read_tau(&mut r);
        let treg = r.required(&TREG, Time::non_negative);
        let extra = r
            .optional(&EXTRA_STAGES, |f, v| whole(f, v, 0, 1000, "0 to 1000"))
            .unwrap_or(0) as u32;
        let stage_time = if extra > 0 {
            r.required(&STAGE_TIME, Time::positive)
        } else {
            r.optional(&STAGE_TIME, Time::non_negative)
        };
        let vmin = r.required(&VMIN, Voltage::positive);
        let gain_given = r.has(&GAIN);
        let gain = r.optional(&GAIN, Ratio::positive);
        let input = read_input(&mut r);
        let fs = r.required(&FS, Frequency::positive);
        // The field's limits keep it at most 1.
        let target_ber = r.optional(&TARGET_BER, positive_number);
        let vin = r.optional(&VIN, Voltage::positive);
        let (Some((tau, tau_source)), Some(treg), Some(vmin), Some(input), Some(fs), false) =
            (tau, treg, vmin, input, fs, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        let one = Ratio::positive(GAIN.name, 1.0);
        let comp = one.and_then(|bare| {
            Comparator::new(CompParts {
                tau,
                tau_source,
                treg,
                extra_stages: extra,
                stage_time: stage_time.unwrap_or(Time::ZERO),
                vmin,
                gain: gain.unwrap_or(bare),
                input,
            })
        });
        match comp {
            Ok(comp) => Ok(CompCase {
                comp,
                fs,
                target_ber,
                vin,
                gain_given,
                unused: unused_fields(raw, input.name()),
                notes: r.notes(),
            }),
            Err(e) => {
                r.push(e);
                Err(r.into_errors())
            }
        }
    }

    /// The inputs as normalised text, keyed by parameter name.
    pub fn echo(&self) -> Vec<(&'static str, String)> {
        let c = &self.comp;
        let mut v = Vec::new();
        match c.tau_source() {
            TauSource::Given => v.push((TAU.name, c.tau().display())),
            TauSource::Devices { cl, gm, g0 } => {
                v.push(("cl", format_si(cl, "F")));
                v.push(("gm", format_si(gm, "S")));
                v.push(("g0", format_si(g0, "S")));
            }
        }
        v.push((TREG.name, c.treg().display()));
        if c.extra_stages() > 0 {
            v.push((EXTRA_STAGES.name, c.extra_stages().to_string()));
            v.push((STAGE_TIME.name, c.stage_time().display()));
        }
        v.push((VMIN.name, c.vmin().display()));
        v.push((
            "gain",
            if self.gain_given {
                format_number(c.gain())
            } else {
                "1 (not given: bare latch)".into()
            },
        ));
        v.push((INPUT.name, c.input().name().into()));
        match c.input() {
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

fn read_input(r: &mut FieldReader) -> Option<InputModel> {
    let Some(text) = r.text(&INPUT) else {
        r.push(ParamError::new(INPUT.name, ParamErrorKind::Missing));
        return None;
    };
    let name = text.to_ascii_lowercase();
    let model = match name.as_str() {
        "uniform" => r
            .required(&LSB, Voltage::positive)
            .map(|l| InputModel::Uniform { lsb: l.get() }),
        "gaussian" => {
            let sigma = r.required(&SIGMA, Voltage::positive);
            let mean = if r.has(&MEAN) {
                r.optional(&MEAN, |_, v| Ok(v))
            } else {
                Some(0.0)
            };
            sigma.zip(mean).map(|(s, m)| InputModel::Gaussian {
                mean: m,
                sigma: s.get(),
            })
        }
        "nrz" | "pam4" => {
            let amp = r.required(&AMP, Voltage::positive);
            let sigma = r.required(&SIGMA, Voltage::positive);
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
            let amp = r.required(&AMP, Voltage::positive);
            let lsb = r.required(&LSB, Voltage::positive);
            match amp.zip(lsb) {
                Some((a, l)) if a.get() / l.get() > SINE_MAX_THRESHOLDS => {
                    r.push(ParamError::new(
                        LSB.name,
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
                INPUT.name,
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

/// Parameters present in `raw` that the chosen input model does not read.
pub fn unused_fields(raw: &RawInputs, model: &str) -> Vec<&'static str> {
    [LSB.name, AMP.name, SIGMA.name, MEAN.name]
        .into_iter()
        .filter(|f| raw.get_nonblank(f).is_some() && !InputModel::uses(model).contains(f))
        .collect()
}
