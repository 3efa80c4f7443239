//! Reading raw named inputs (URL query or command-line options) into a synchronizer case.

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{positive_number, whole, FieldReader, FieldSpec, RawInputs};
use crate::quantity::{Frequency, Time};
use crate::reliability::{Fleet, Target};
use crate::units::{format_number, format_si, Dim};

use super::clocks::{gcd, RelatedClocks};
use super::fields::{
    ACTIVITY, CROSSING, DEVICES, DUTY, FCLK, FDATA, FLAUNCH, INCREMENTS, JITTER, PHASE, RATIO,
    SERVICE_YEARS, STAGES, T0, TARGET_FIT, TARGET_YEARS, TAU, TAU_MASTER, TAU_SLAVE, TCQ, TR,
    TRANSFERS, TR_MAX, TSU, TW, TW2,
};
use super::model::{Latch, SyncParts, Synchronizer, Window};

/// A complete synchronizer case: the circuit, an optional target and an optional fleet.
#[derive(Debug, Clone, PartialEq)]
pub struct SyncCase {
    /// The circuit.
    pub sync: Synchronizer,
    /// The reliability target, if any.
    pub target: Option<Target>,
    /// The fleet, if any.
    pub fleet: Option<Fleet>,
    /// How the data rate was given.
    pub crossing: Crossing,
    /// Notes on values far outside their usual range.
    pub notes: Vec<String>,
    /// Parameters given that this case does not use (the chain's with `tr` given).
    pub unused: Vec<&'static str>,
    /// Conflicts that leave the rest of the case usable (both targets given).
    pub conflicts: Vec<ParamError>,
    /// The longest resolution time the characterisation covered, if given.
    pub tr_max: Option<Time>,
}

impl SyncCase {
    /// Builds a case from named text inputs (URL query or command-line options).
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<SyncCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let latch = read_latch(&mut r);
        let related = read_related(&mut r);
        let mut unused: Vec<&'static str> = Vec::new();
        let window = match (r.has(&TW), r.has(&T0)) {
            (true, true) => {
                r.push(ParamError::new(TW.name, ParamErrorKind::Conflict(T0.name)));
                None
            }
            (false, true) => r.optional(&T0, Time::positive).map(Window::T0),
            _ => r.required(&TW, Time::positive).map(Window::Tw),
        };
        let fclk = r.required(&FCLK, Frequency::positive);
        let rate = read_rate(&mut r, &mut unused);
        let tr = r.optional(&TR, Time::non_negative);
        let chain_needed = tr.is_none();
        let read_time = |r: &mut FieldReader, spec: &FieldSpec, needed: bool| {
            if needed {
                r.required(spec, Time::non_negative)
            } else {
                r.optional(spec, Time::non_negative)
            }
        };
        let stages = if chain_needed {
            r.required(&STAGES, stages_field)
        } else {
            r.optional(&STAGES, stages_field)
        };
        // The master-slave bound (tw2 given) counts whole periods: no tsu or tcq.
        let bound = r.has(&TW2);
        let tsu = read_time(&mut r, &TSU, chain_needed && !bound);
        let uses_tcq = !matches!(window, Some(Window::T0(_)));
        let tcq = read_time(&mut r, &TCQ, chain_needed && uses_tcq && !bound);
        let target = match (r.has(&TARGET_YEARS), r.has(&TARGET_FIT)) {
            (true, true) => {
                r.conflict(ParamError::new(
                    TARGET_YEARS.name,
                    ParamErrorKind::Conflict(TARGET_FIT.name),
                ));
                None
            }
            (true, false) => r
                .optional(&TARGET_YEARS, positive_number)
                .map(Target::MtbfYears),
            (false, true) => r.optional(&TARGET_FIT, positive_number).map(Target::Fit),
            (false, false) => None,
        };
        let fleet = match (r.has(&DEVICES), r.has(&SERVICE_YEARS)) {
            (false, false) => None,
            _ => {
                let devices = r.required(&DEVICES, |f, v| {
                    whole(f, v, 1, 1_000_000_000_000, "1 to 1e12")
                });
                let years = r.required(&SERVICE_YEARS, positive_number);
                devices
                    .zip(years)
                    .map(|(devices, years)| Fleet { devices, years })
            }
        };
        let tw2 = r.optional(&TW2, Time::positive);
        let tr_max = r.optional(&TR_MAX, Time::positive);
        // With tr given, the chain's inputs are not used; with t0, tcq is not.
        if !chain_needed {
            unused.extend(
                [&STAGES, &TSU, &TCQ]
                    .iter()
                    .filter(|f| r.has(f))
                    .map(|f| f.name),
            );
        } else if bound {
            unused.extend([&TSU, &TCQ].iter().filter(|f| r.has(f)).map(|f| f.name));
        } else if !uses_tcq && r.has(&TCQ) {
            unused.push(TCQ.name);
        }
        // A phase is an offset within one lattice spacing: beyond it, the reduction onto
        // the lattice would rest on digits the typed value does not have.
        if let (Some(Some(c)), Some(f)) = (&related, fclk) {
            let g = c.spacing(f.get());
            if c.phase.is_some_and(|p| p.get() >= g) {
                let text = r.text(&PHASE).unwrap_or_default().trim().to_string();
                r.push(ParamError::new(
                    PHASE.name,
                    ParamErrorKind::Unusable {
                        text,
                        dim: Dim::Time,
                        bound: g,
                        above: true,
                    },
                ));
            }
        }
        let (Some(latch), Some(related), Some(window), Some(fclk), Some((fdata, crossing)), false) =
            (latch, related, window, fclk, rate, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        let sync = Synchronizer::new(SyncParts {
            latch,
            window,
            fclk,
            fdata,
            // Without a chain (tr given) the stage count only labels sweeps: one flip-flop.
            stages: stages.unwrap_or(1),
            tsu: tsu.unwrap_or(Time::ZERO),
            tcq: if uses_tcq {
                tcq.unwrap_or(Time::ZERO)
            } else {
                Time::ZERO
            },
            tr,
            tw2,
            related,
        });
        match sync {
            Ok(sync) => Ok(SyncCase {
                sync,
                target,
                fleet,
                crossing,
                notes: r.notes(),
                unused,
                conflicts: r.conflicts(),
                tr_max,
            }),
            Err(e) => {
                r.push(e);
                Err(r.into_errors())
            }
        }
    }

    /// The inputs as normalised text, keyed by parameter name, for echoing back.
    pub fn echo(&self) -> Vec<(&'static str, String)> {
        let s = &self.sync;
        let mut v = match s.latch() {
            Latch::One { tau } => vec![(TAU.name, tau.display())],
            Latch::PerHop { taus } => vec![(
                TAU.name,
                taus.iter()
                    .map(|t| t.display())
                    .collect::<Vec<_>>()
                    .join(", "),
            )],
            Latch::MasterSlave {
                master,
                slave,
                duty,
            } => vec![
                (TAU_MASTER.name, master.display()),
                (TAU_SLAVE.name, slave.display()),
                (DUTY.name, format_number(*duty)),
            ],
        };
        v.push((s.window().name(), format_si(s.window().seconds(), "s")));
        if let Some(tw2) = s.tw2() {
            v.push((TW2.name, tw2.display()));
        }
        v.push((FCLK.name, s.fclk().display()));
        match self.crossing {
            Crossing::Data => {}
            Crossing::Signal { flaunch, activity } => {
                v.push((CROSSING.name, "signal".into()));
                v.push((FLAUNCH.name, flaunch.display()));
                v.push((ACTIVITY.name, format_number(activity)));
            }
            Crossing::Gray { increments } => {
                v.push((CROSSING.name, "gray".into()));
                v.push((INCREMENTS.name, increments.display()));
            }
            Crossing::Handshake { transfers } => {
                v.push((CROSSING.name, "handshake".into()));
                v.push((TRANSFERS.name, transfers.display()));
            }
        }
        v.push((FDATA.name, s.fdata().display()));
        match s.tr() {
            Some(tr) => v.push((TR.name, tr.display())),
            None => {
                v.push((STAGES.name, s.stages().to_string()));
                v.push((TSU.name, s.tsu().display()));
                if matches!(s.window(), Window::Tw(_)) {
                    v.push((TCQ.name, s.tcq().display()));
                }
            }
        }
        if let Some(c) = s.related() {
            v.push((RATIO.name, format!("{}/{}", c.ratio.0, c.ratio.1)));
            v.push((JITTER.name, c.jitter.display()));
            if let Some(p) = c.phase {
                v.push((PHASE.name, p.display()));
            }
        }
        match self.target {
            Some(Target::MtbfYears(y)) => v.push((TARGET_YEARS.name, format_number(y))),
            Some(Target::Fit(f)) => v.push((TARGET_FIT.name, format_number(f))),
            None => {}
        }
        if let Some(f) = self.fleet {
            v.push((DEVICES.name, f.devices.to_string()));
            v.push((SERVICE_YEARS.name, format_number(f.years)));
        }
        v
    }
}

/// How the data rate was given: directly, or as the engineer knows the crossing.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Crossing {
    /// `fdata` given directly.
    Data,
    /// A signal toggling with `activity` on a launch clock: `fdata = activity * flaunch`.
    Signal {
        /// The launching clock.
        flaunch: Frequency,
        /// Toggles per launch cycle.
        activity: f64,
    },
    /// A Gray-coded FIFO pointer: one bit changes per increment, so the pointer's bits
    /// together see one data edge per increment: `fdata = increments`.
    Gray {
        /// Pointer increments per second.
        increments: Frequency,
    },
    /// A four-phase handshake: request and acknowledge each toggle twice per transfer:
    /// `fdata = 2 * transfers` for each of the two synchronizers.
    Handshake {
        /// Transfers per second.
        transfers: Frequency,
    },
}

/// The choices of the `crossing` field.
pub const CROSSING_CHOICES: &str = "data, signal, gray, handshake";

/// The latch: one tau, a tau per hop (comma-separated), or a master-slave pair.
fn read_latch(r: &mut FieldReader) -> Option<Latch> {
    let pair = r.has(&TAU_MASTER) || r.has(&TAU_SLAVE);
    if pair && r.has(&TAU) {
        r.push(ParamError::new(
            TAU.name,
            ParamErrorKind::Conflict("tau-master, tau-slave"),
        ));
        return None;
    }
    if pair {
        let master = r.required(&TAU_MASTER, Time::positive);
        let slave = r.required(&TAU_SLAVE, Time::positive);
        let duty = if r.has(&DUTY) {
            r.optional(&DUTY, duty_field)
        } else {
            Some(0.5)
        };
        return Some(Latch::MasterSlave {
            master: master?,
            slave: slave?,
            duty: duty?,
        });
    }
    match r.text(&TAU) {
        Some(text) if text.contains(',') => {
            let mut taus = Vec::new();
            for part in text.split(',') {
                match TAU.parse(part).and_then(|v| Time::positive(TAU.name, v)) {
                    Ok(t) => taus.push(t),
                    Err(e) => {
                        r.push(e);
                        return None;
                    }
                }
            }
            Some(Latch::PerHop { taus })
        }
        _ => r
            .required(&TAU, Time::positive)
            .map(|tau| Latch::One { tau }),
    }
}

fn duty_field(field: &'static str, v: f64) -> Result<f64, ParamError> {
    if v > 0.0 && v < 1.0 {
        Ok(v)
    } else {
        Err(ParamError::new(
            field,
            ParamErrorKind::OutOfRange {
                value: v,
                range: "above 0 and below 1",
            },
        ))
    }
}

/// Related clocks: `Some(None)` when none are given, `None` on an error.
fn read_related(r: &mut FieldReader) -> Option<Option<RelatedClocks>> {
    let Some(text) = r.text(&RATIO) else {
        for spec in [&JITTER, &PHASE] {
            if r.has(spec) {
                r.push(ParamError::new(RATIO.name, ParamErrorKind::Missing));
                return None;
            }
        }
        return Some(None);
    };
    let ratio = parse_ratio(text);
    if ratio.is_none() {
        r.push(ParamError::new(
            RATIO.name,
            ParamErrorKind::BadRatio(text.to_string()),
        ));
    }
    let jitter = r.required(&JITTER, Time::positive);
    let phase = r.optional(&PHASE, Time::non_negative);
    let (p, q) = ratio?;
    let g = gcd(p, q);
    Some(Some(RelatedClocks {
        ratio: (p / g, q / g),
        jitter: jitter?,
        phase,
    }))
}

/// `P/Q` (or `P:Q`) with whole numbers from 1 to a million.
fn parse_ratio(text: &str) -> Option<(u32, u32)> {
    let (p, q) = text.split_once(['/', ':'])?;
    let whole = |s: &str| {
        s.trim()
            .parse::<u32>()
            .ok()
            .filter(|n| (1..=1_000_000).contains(n))
    };
    Some((whole(p)?, whole(q)?))
}

/// The data rate and how it was given; the fields of other kinds go to `unused`.
fn read_rate(r: &mut FieldReader, unused: &mut Vec<&'static str>) -> Option<(Frequency, Crossing)> {
    let kind = r.text(&CROSSING).map(str::to_ascii_lowercase);
    let own: &[&FieldSpec] = match kind.as_deref() {
        None | Some("data") => &[&FDATA],
        Some("signal") => &[&FLAUNCH, &ACTIVITY],
        Some("gray") => &[&INCREMENTS],
        Some("handshake") => &[&TRANSFERS],
        Some(other) => {
            r.push(ParamError::new(
                CROSSING.name,
                ParamErrorKind::UnknownChoice {
                    text: other.to_string(),
                    choices: CROSSING_CHOICES,
                },
            ));
            return None;
        }
    };
    for spec in [&FDATA, &FLAUNCH, &ACTIVITY, &INCREMENTS, &TRANSFERS] {
        if r.has(spec) && !own.iter().any(|o| o.name == spec.name) {
            unused.push(spec.name);
        }
    }
    let implied = |r: &mut FieldReader, hz: f64| match Frequency::positive(FDATA.name, hz) {
        Ok(f) if hz >= FDATA.limits.0 && hz <= FDATA.limits.1 => Some(f),
        _ => {
            r.push(ParamError::new(
                CROSSING.name,
                ParamErrorKind::OutOfRange {
                    value: hz,
                    range: "an implied fdata from 1e-9 Hz to 1e18 Hz",
                },
            ));
            None
        }
    };
    match kind.as_deref() {
        Some("signal") => {
            let flaunch = r.required(&FLAUNCH, Frequency::positive);
            let activity = r.required(&ACTIVITY, positive_number);
            let (flaunch, activity) = (flaunch?, activity?);
            let f = implied(r, flaunch.get() * activity)?;
            Some((f, Crossing::Signal { flaunch, activity }))
        }
        Some("gray") => {
            let increments = r.required(&INCREMENTS, Frequency::positive)?;
            Some((increments, Crossing::Gray { increments }))
        }
        Some("handshake") => {
            let transfers = r.required(&TRANSFERS, Frequency::positive)?;
            let f = implied(r, 2.0 * transfers.get())?;
            Some((f, Crossing::Handshake { transfers }))
        }
        _ => r
            .required(&FDATA, Frequency::positive)
            .map(|f| (f, Crossing::Data)),
    }
}

fn stages_field(field: &'static str, v: f64) -> Result<u32, ParamError> {
    whole(field, v, 1, 1000, "1 to 1000").map(|n| n as u32)
}

/// The warnings on a case: values far outside their usual range, and what the model
/// cannot see (a data rate above the clock, a single flip-flop, related clocks...).
pub fn warnings(case: &SyncCase, log10_p: f64) -> Vec<String> {
    let s = &case.sync;
    let mut w = case.notes.clone();
    if let Some(e) = case
        .tr_max
        .and_then(|m| extrapolation(s.resolution_time(), m.get()))
    {
        w.push(e);
    }
    if s.fdata().get() < s.fclk().get() * 1e-9 {
        w.push(format!(
            "fdata = {} on a {} clock is an unusually low data rate: fdata counts data \
             edges per second, not a clock.",
            s.fdata().display(),
            s.fclk().display()
        ));
    }
    if s.fdata().get() > s.fclk().get() {
        w.push(format!(
            "fdata ({}) exceeds fclk ({}): a plain synchronizer cannot pass every value; \
             a handshake or an asynchronous FIFO is the usual remedy.",
            s.fdata().display(),
            s.fclk().display()
        ));
    }
    if log10_p > 0.0 {
        w.push(
            "The failure probability per transition comes out above 1: the resolution time \
             is too short for this first-order model, which then only says 'fails often'."
                .into(),
        );
    }
    if s.tr().is_none() && s.stages() == 1 {
        w.push(
            "stages = 1 leaves no resolution time: the sampled value goes straight into logic."
                .into(),
        );
    }
    if let (Window::T0(_), None) = (s.window(), s.tr()) {
        w.push(
            "Window counted from the clock edge (t0): tcq is not used; resolution time is \
             (stages - 1) * (1/fclk - tsu)."
                .into(),
        );
    }
    if let Some(c) = s.related() {
        if c.phase.is_none() {
            w.push(
                "Related clocks with no phase given: signed off at the worst phase (edges \
                 centred on the sampling edge); the best phase is shown beside it."
                    .into(),
            );
        }
    }
    if s.window().seconds() > 1e-9 && matches!(s.window(), Window::Tw(_)) {
        w.push(format!(
            "tw = {} is unusually wide for a CMOS flip-flop (tens of ps is typical); \
             if it is counted from the clock edge, enter it as t0.",
            format_si(s.window().seconds(), "s")
        ));
    }
    w
}

/// The warning for a resolution time `tr` beyond the characterised `tr_max`, if it is.
pub fn extrapolation(tr: f64, tr_max: f64) -> Option<String> {
    (tr > tr_max).then(|| {
        format!(
            "The resolution time {} extrapolates the exponential {} times beyond the \
             characterised range (tr-max {}): the lab data say nothing of tau out there.",
            format_si(tr, "s"),
            crate::units::format_log10((tr / tr_max).log10(), 2),
            format_si(tr_max, "s")
        )
    })
}
