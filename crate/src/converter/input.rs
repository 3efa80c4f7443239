//! Reading raw named inputs (URL query or command-line options) into a SAR converter case.

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::latch::{read_tau, TauSource};
use crate::params::{positive_number, whole, FieldReader, FieldSpec, RawInputs};
use crate::quantity::{Frequency, Ratio, Time, Voltage};
use crate::units::{format_number, format_si};

use super::fields::{
    BITS, CONSUME, FILL, FS, GAIN, MARGIN_LSB, SIGMA_N, STATIC, TARGET_BER, TARGET_FIT, TAU, TBIT,
    TCONV, TFIX, TIMING, VFS, VMIN,
};
use super::model::Fill;

/// How a synchronous converter's late decision is used.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Consume {
    /// One capture latch feeds the DAC and the register: the search stays consistent.
    Benign,
    /// The DAC and the register can disagree, or a late bit keeps its reset value.
    Hard,
}

/// How the decisions are timed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Timing {
    /// A fixed regeneration time per bit.
    Sync {
        /// Regeneration time of each decision.
        tbit: Time,
        /// How a late decision is used.
        consume: Consume,
    },
    /// One budget shared by all decisions.
    Async {
        /// Conversion time available for the decisions.
        tconv: Time,
        /// Fixed time per bit besides the decision.
        tfix: Time,
        /// What a timed-out conversion writes.
        fill: Fill,
    },
}

/// The rate of counted errors allowed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Target {
    /// Per conversion.
    Ber(f64),
    /// In FIT (per 1e9 hours).
    Fit(f64),
}

/// A complete SAR converter case.
#[derive(Debug, Clone, PartialEq)]
pub struct ConvCase {
    /// Resolution B, 1 to 16.
    pub bits: u32,
    /// The latch's regeneration time constant.
    pub tau: Time,
    /// How tau was obtained.
    pub tau_source: TauSource,
    /// Decision level.
    pub vmin: Voltage,
    /// Preamplifier gain (1 when not given).
    pub gain: f64,
    /// Whether gain was given.
    pub gain_given: bool,
    /// Full scale.
    pub vfs: Voltage,
    /// Conversions per second.
    pub fs: Frequency,
    /// The timing of the decisions.
    pub timing: Timing,
    /// Comparator noise, input-referred.
    pub sigma_n: Option<Voltage>,
    /// A parked input's threshold code.
    pub static_code: Option<u64>,
    /// Code errors of at least this many LSB count.
    pub margin_lsb: Option<u64>,
    /// The rate of counted errors allowed.
    pub target: Option<Target>,
    /// Parameters given but not read by this timing.
    pub unused: Vec<&'static str>,
    /// Notes on values far outside their usual range.
    pub notes: Vec<String>,
    /// Both targets given: neither is used.
    pub conflicts: Vec<ParamError>,
}

fn read_choice<T>(
    r: &mut FieldReader,
    spec: &'static FieldSpec,
    choices: &'static str,
    pick: fn(&str) -> Option<T>,
) -> Option<T> {
    let text = r.text(spec)?;
    match pick(&text.to_ascii_lowercase()) {
        Some(v) => Some(v),
        None => {
            r.push(ParamError::new(
                spec.name,
                ParamErrorKind::UnknownChoice {
                    text: text.to_string(),
                    choices,
                },
            ));
            None
        }
    }
}

impl ConvCase {
    /// Builds a case from named text inputs.
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<ConvCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let bits = r
            .required(&BITS, |f, v| whole(f, v, 1, 16, "1 to 16"))
            .map(|b| b as u32);
        let is_sync = read_choice(&mut r, &TIMING, "sync, async", |t| match t {
            "sync" => Some(true),
            "async" => Some(false),
            _ => None,
        });
        if is_sync.is_none() && !r.has(&TIMING) {
            r.push(ParamError::new(TIMING.name, ParamErrorKind::Missing));
        }
        let tau = read_tau(&mut r);
        let vmin = r.required(&VMIN, Voltage::positive);
        let gain_given = r.has(&GAIN);
        let gain = r.optional(&GAIN, Ratio::positive).map(Ratio::get);
        let vfs = r.required(&VFS, Voltage::positive);
        let fs = r.required(&FS, Frequency::positive);
        let mut unused = Vec::new();
        let only = |r: &mut FieldReader, spec: &FieldSpec, value: &'static str| {
            if r.has(spec) {
                r.push(ParamError::new(
                    spec.name,
                    ParamErrorKind::OnlyWith {
                        other: TIMING.name,
                        value,
                    },
                ));
            }
        };
        let timing = match is_sync {
            Some(true) => {
                only(&mut r, &FILL, "async");
                unused.extend([&TCONV, &TFIX].iter().filter(|f| r.has(f)).map(|f| f.name));
                let tbit = r.required(&TBIT, Time::non_negative);
                let consume = read_choice(&mut r, &CONSUME, "benign, hard", |t| match t {
                    "benign" => Some(Consume::Benign),
                    "hard" => Some(Consume::Hard),
                    _ => None,
                });
                if !r.has(&CONSUME) {
                    r.push(ParamError::new(CONSUME.name, ParamErrorKind::Missing));
                }
                tbit.zip(consume)
                    .map(|(tbit, consume)| Timing::Sync { tbit, consume })
            }
            Some(false) => {
                only(&mut r, &CONSUME, "sync");
                unused.extend(r.has(&TBIT).then_some(TBIT.name));
                let tconv = r.required(&TCONV, Time::positive);
                let tfix = r.required(&TFIX, Time::non_negative);
                let fill = read_choice(&mut r, &FILL, "reset, midpoint", |t| match t {
                    "reset" => Some(Fill::Reset),
                    "midpoint" => Some(Fill::Midpoint),
                    _ => None,
                });
                if !r.has(&FILL) {
                    r.push(ParamError::new(FILL.name, ParamErrorKind::Missing));
                }
                match (tconv, tfix, fill, bits) {
                    (Some(tconv), Some(tfix), Some(fill), Some(b)) => {
                        if tconv.get() <= f64::from(b) * tfix.get() {
                            r.push(ParamError::new(
                                TCONV.name,
                                ParamErrorKind::OutOfRangeFor {
                                    value: tconv.display(),
                                    range: format!(
                                        "more than bits x tfix = {}, which leaves no time to decide",
                                        format_si(f64::from(b) * tfix.get(), "s")
                                    ),
                                },
                            ));
                            None
                        } else {
                            Some(Timing::Async { tconv, tfix, fill })
                        }
                    }
                    _ => None,
                }
            }
            None => None,
        };
        let sigma_n = r.optional(&SIGMA_N, Voltage::positive);
        let static_code = r.optional(&STATIC, |f, v| whole(f, v, 1, 65535, "1 to 65535"));
        if let (Some(code), Some(b)) = (static_code, bits) {
            if code >= 1 << b {
                r.push(ParamError::new(
                    STATIC.name,
                    ParamErrorKind::OutOfRangeFor {
                        value: code.to_string(),
                        range: format!("1 to {} (2^bits - 1)", (1u64 << b) - 1),
                    },
                ));
            }
        }
        if static_code.is_some() && !r.has(&SIGMA_N) {
            r.push(ParamError::new(
                STATIC.name,
                ParamErrorKind::NeedsAlso(SIGMA_N.name),
            ));
        }
        let margin_lsb = r.optional(&MARGIN_LSB, |f, v| whole(f, v, 1, 32768, "1 to 32768"));
        if let (Some(k), Some(b)) = (margin_lsb, bits) {
            if k > 1 << (b - 1) {
                r.push(ParamError::new(
                    MARGIN_LSB.name,
                    ParamErrorKind::OutOfRangeFor {
                        value: k.to_string(),
                        range: format!(
                            "1 to {} (2^(bits - 1), the largest code error)",
                            1u64 << (b - 1)
                        ),
                    },
                ));
            }
        }
        let target = match (r.has(&TARGET_BER), r.has(&TARGET_FIT)) {
            (true, true) => {
                r.conflict(ParamError::new(
                    TARGET_BER.name,
                    ParamErrorKind::Conflict(TARGET_FIT.name),
                ));
                None
            }
            (true, false) => r.optional(&TARGET_BER, positive_number).map(Target::Ber),
            (false, true) => r.optional(&TARGET_FIT, positive_number).map(Target::Fit),
            (false, false) => None,
        };
        let (
            Some(bits),
            Some((tau, tau_source)),
            Some(vmin),
            Some(vfs),
            Some(fs),
            Some(timing),
            false,
        ) = (bits, tau, vmin, vfs, fs, timing, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        Ok(ConvCase {
            bits,
            tau,
            tau_source,
            vmin,
            gain: gain.unwrap_or(1.0),
            gain_given,
            vfs,
            fs,
            timing,
            sigma_n,
            static_code,
            margin_lsb,
            target,
            unused,
            notes: r.notes(),
            conflicts: r.conflicts(),
        })
    }

    /// The size of an LSB, V.
    pub fn lsb(&self) -> f64 {
        self.vfs.get() / f64::from(1u32 << self.bits)
    }

    /// The decision level at the comparator's input, V_x = vmin / gain, in LSB.
    pub fn vx_lsb(&self) -> f64 {
        self.vmin.get() / self.gain / self.lsb()
    }

    /// The inputs as normalised text, keyed by parameter name.
    pub fn echo(&self) -> Vec<(&'static str, String)> {
        let mut v = vec![("bits", self.bits.to_string())];
        v.push((
            "timing",
            match self.timing {
                Timing::Sync { .. } => "sync",
                Timing::Async { .. } => "async",
            }
            .into(),
        ));
        match self.tau_source {
            TauSource::Given => v.push((TAU.name, self.tau.display())),
            TauSource::Devices { cl, gm, g0 } => {
                v.push(("cl", format_si(cl, "F")));
                v.push(("gm", format_si(gm, "S")));
                v.push(("g0", format_si(g0, "S")));
            }
        }
        v.push((VMIN.name, self.vmin.display()));
        v.push((
            "gain",
            if self.gain_given {
                format_number(self.gain)
            } else {
                "1 (not given: bare latch)".into()
            },
        ));
        v.push((VFS.name, self.vfs.display()));
        v.push((FS.name, self.fs.display()));
        match self.timing {
            Timing::Sync { tbit, consume } => {
                v.push((TBIT.name, tbit.display()));
                v.push((
                    CONSUME.name,
                    match consume {
                        Consume::Benign => "benign",
                        Consume::Hard => "hard",
                    }
                    .into(),
                ));
            }
            Timing::Async { tconv, tfix, fill } => {
                v.push((TCONV.name, tconv.display()));
                v.push((TFIX.name, tfix.display()));
                v.push((
                    FILL.name,
                    match fill {
                        Fill::Reset => "reset",
                        Fill::Midpoint => "midpoint",
                    }
                    .into(),
                ));
            }
        }
        if let Some(s) = self.sigma_n {
            v.push((SIGMA_N.name, s.display()));
        }
        if let Some(c) = self.static_code {
            v.push((STATIC.name, c.to_string()));
        }
        if let Some(k) = self.margin_lsb {
            v.push((MARGIN_LSB.name, k.to_string()));
        }
        match self.target {
            Some(Target::Ber(t)) => v.push((TARGET_BER.name, format_number(t))),
            Some(Target::Fit(t)) => v.push((TARGET_FIT.name, format_number(t))),
            None => {}
        }
        v
    }
}
