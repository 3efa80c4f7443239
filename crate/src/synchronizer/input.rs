//! Reading raw named inputs (URL query or command-line options) into a synchronizer case.

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{positive_number, whole, FieldReader, FieldSpec, RawInputs};
use crate::quantity::{Frequency, Time};
use crate::reliability::{Fleet, Target};
use crate::units::{format_number, format_si};

use super::fields::{
    DEVICES, FCLK, FDATA, SERVICE_YEARS, STAGES, T0, TARGET_FIT, TARGET_YEARS, TAU, TCQ, TR, TSU,
    TW,
};
use super::model::{SyncParts, Synchronizer, Window};

/// A complete synchronizer case: the circuit, an optional target and an optional fleet.
#[derive(Debug, Clone, PartialEq)]
pub struct SyncCase {
    /// The circuit.
    pub sync: Synchronizer,
    /// The reliability target, if any.
    pub target: Option<Target>,
    /// The fleet, if any.
    pub fleet: Option<Fleet>,
    /// Notes on values far outside their usual range.
    pub notes: Vec<String>,
    /// Parameters given that this case does not use (the chain's with `tr` given).
    pub unused: Vec<&'static str>,
    /// Conflicts that leave the rest of the case usable (both targets given).
    pub conflicts: Vec<ParamError>,
}

impl SyncCase {
    /// Builds a case from named text inputs (URL query or command-line options).
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    pub fn from_inputs(raw: &RawInputs) -> Result<SyncCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let tau = r.required(&TAU, Time::positive);
        let window = match (r.has(&TW), r.has(&T0)) {
            (true, true) => {
                r.push(ParamError::new(TW.name, ParamErrorKind::Conflict(T0.name)));
                None
            }
            (false, true) => r.optional(&T0, Time::positive).map(Window::T0),
            _ => r.required(&TW, Time::positive).map(Window::Tw),
        };
        let fclk = r.required(&FCLK, Frequency::positive);
        let fdata = r.required(&FDATA, Frequency::positive);
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
        let tsu = read_time(&mut r, &TSU, chain_needed);
        let uses_tcq = !matches!(window, Some(Window::T0(_)));
        let tcq = read_time(&mut r, &TCQ, chain_needed && uses_tcq);
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
        // With tr given, the chain's inputs are not used; with t0, tcq is not.
        let mut unused: Vec<&'static str> = Vec::new();
        if !chain_needed {
            unused.extend(
                [&STAGES, &TSU, &TCQ]
                    .iter()
                    .filter(|f| r.has(f))
                    .map(|f| f.name),
            );
        } else if !uses_tcq && r.has(&TCQ) {
            unused.push(TCQ.name);
        }
        let (Some(tau), Some(window), Some(fclk), Some(fdata), false) =
            (tau, window, fclk, fdata, r.has_errors())
        else {
            return Err(r.into_errors());
        };
        let sync = Synchronizer::new(SyncParts {
            tau,
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
        });
        match sync {
            Ok(sync) => Ok(SyncCase {
                sync,
                target,
                fleet,
                notes: r.notes(),
                unused,
                conflicts: r.conflicts(),
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
        let mut v = vec![
            (TAU.name, s.tau().display()),
            (s.window().name(), format_si(s.window().seconds(), "s")),
            (FCLK.name, s.fclk().display()),
            (FDATA.name, s.fdata().display()),
        ];
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

fn stages_field(field: &'static str, v: f64) -> Result<u32, ParamError> {
    whole(field, v, 1, 1000, "1 to 1000").map(|n| n as u32)
}
