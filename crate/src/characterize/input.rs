//! Reading the fit's raw inputs: the experiment, its table of data and its settings.

use crate::error::{ParamError, ParamErrorKind, ParamErrors, TableProblem};
use crate::params::{FieldReader, RawInputs};
use crate::quantity::{Frequency, Time};
use crate::table::{read, Column, Table};
use crate::units::Dim;

use super::counts::Counts;
use super::fields::{DATA, FCLK, FDATA, KIND, METHOD, TCQ, WINDOW};

/// The choices of the `kind` field.
pub const KIND_CHOICES: &str = "counts, delay, comparator";

/// A fit case: the experiment and its data, read and checked.
#[derive(Debug, Clone, PartialEq)]
pub enum FitCase {
    /// Failure counts at several resolution times.
    Counts {
        /// The rows.
        counts: Counts,
        /// The text line of each row.
        lines: Vec<usize>,
        /// The sampling clock.
        fclk: Frequency,
        /// The data edge rate.
        fdata: Frequency,
        /// Whether tr counts from the clock edge (a t0 window).
        t0: bool,
    },
    /// A delay sweep.
    Delay {
        /// Data-to-clock offsets, s.
        offset: Vec<f64>,
        /// Clock-to-output delays, s.
        delay: Vec<f64>,
        /// The text line of each row.
        lines: Vec<usize>,
        /// The nominal delay, when given.
        tcq: Option<Time>,
        /// Whether to fit the log law over the regenerative region only (`method=log`)
        /// instead of the whole sweep.
        log_law: bool,
    },
    /// A comparator's decision-time sweep.
    Comparator {
        /// Inputs, V.
        vin: Vec<f64>,
        /// Decision times, s.
        time: Vec<f64>,
        /// The text line of each row.
        lines: Vec<usize>,
    },
}

/// The longest resolution, offset, delay or decision time a lab table may hold (one
/// second: a million times any latch's; beyond it a unit was misread).
const LAB_TIME_MAX: f64 = 1.0;

/// Data columns and their limits: failures at most 1e15, durations from 1 ns to 1e10 s
/// (317 years), inputs from 1e-30 to 1 kV; a value outside is refused at its cell, as a
/// form field's would be.
const fn col(name: &'static str, dim: Dim, non_negative: bool) -> Column {
    let c = Column::any(name, dim);
    if non_negative {
        c.non_negative()
    } else {
        c
    }
}

const fn positive(name: &'static str, dim: Dim) -> Column {
    Column::any(name, dim).positive()
}

/// Reads the table for `columns`, recording its problems on the `data` field.
fn table(r: &mut FieldReader, columns: &[Column]) -> Option<Table> {
    let Some(text) = r.table(&DATA) else {
        r.push(ParamError::new(DATA.name, ParamErrorKind::Missing));
        return None;
    };
    match read(text, columns) {
        Ok(t) => Some(t),
        Err(problems) => {
            r.push(ParamError::new(
                DATA.name,
                ParamErrorKind::table(problems.iter().map(|e| e.in_table("")).collect()),
            ));
            None
        }
    }
}

fn table_problem(r: &mut FieldReader, problems: Vec<TableProblem>) {
    r.push(ParamError::new(DATA.name, ParamErrorKind::table(problems)));
}

impl FitCase {
    /// Reads a fit case from named text inputs.
    ///
    /// # Errors
    /// Every field error found, each naming its field; a table's problems each with its
    /// line and column.
    pub fn from_inputs(raw: &RawInputs) -> Result<FitCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let kind = r.text(&KIND).map(str::to_ascii_lowercase);
        let case = match kind.as_deref() {
            Some("counts") => {
                let fclk = r.required(&FCLK, Frequency::positive);
                let fdata = r.required(&FDATA, Frequency::positive);
                let t0 = match r.text(&WINDOW).map(str::to_ascii_lowercase).as_deref() {
                    None | Some("tw") => Some(false),
                    Some("t0") => Some(true),
                    Some(other) => {
                        r.push(ParamError::new(
                            WINDOW.name,
                            ParamErrorKind::UnknownChoice {
                                text: other.to_string(),
                                choices: "tw, t0",
                            },
                        ));
                        None
                    }
                };
                let t = table(
                    &mut r,
                    &[
                        col("tr", Dim::Time, true).within(1e-21, LAB_TIME_MAX),
                        col("failures", Dim::Count, true).within(1.0, 1e15),
                        positive("duration", Dim::Time).within(1e-9, 1e10),
                    ],
                );
                let t = t.and_then(|t| {
                    let failures = t.column(1);
                    let problems: Vec<TableProblem> = t
                        .lines
                        .iter()
                        .zip(&failures)
                        .filter(|(_, k)| k.fract() != 0.0)
                        .map(|(line, k)| {
                            TableProblem::at(
                                "",
                                Some(*line),
                                &["failures"],
                                format!("'{k}' is not a whole number"),
                            )
                        })
                        .collect();
                    if problems.is_empty() {
                        Some(t)
                    } else {
                        table_problem(&mut r, problems);
                        None
                    }
                });
                match (fclk, fdata, t0, t) {
                    (Some(fclk), Some(fdata), Some(t0), Some(t)) => Some(FitCase::Counts {
                        counts: Counts {
                            tr: t.column(0),
                            failures: t.column(1),
                            duration: t.column(2),
                        },
                        lines: t.lines,
                        fclk,
                        fdata,
                        t0,
                    }),
                    _ => None,
                }
            }
            Some("delay") => {
                let tcq = r.optional(&TCQ, Time::positive);
                let log_law = match r.text(&METHOD).map(str::to_ascii_lowercase).as_deref() {
                    None | Some("coth") => false,
                    Some("log") => true,
                    Some(other) => {
                        r.push(ParamError::new(
                            METHOD.name,
                            ParamErrorKind::UnknownChoice {
                                text: other.to_string(),
                                choices: "coth, log",
                            },
                        ));
                        false
                    }
                };
                let t = table(
                    &mut r,
                    &[
                        col("offset", Dim::Time, false).within(1e-21, LAB_TIME_MAX),
                        col("delay", Dim::Time, true).within(1e-21, LAB_TIME_MAX),
                    ],
                );
                t.map(|t| FitCase::Delay {
                    offset: t.column(0),
                    delay: t.column(1),
                    lines: t.lines,
                    tcq,
                    log_law,
                })
            }
            Some("comparator") => {
                let t = table(
                    &mut r,
                    &[
                        positive("vin", Dim::Voltage).within(1e-30, 1e3),
                        col("time", Dim::Time, true).within(1e-21, LAB_TIME_MAX),
                    ],
                );
                t.map(|t| FitCase::Comparator {
                    vin: t.column(0),
                    time: t.column(1),
                    lines: t.lines,
                })
            }
            None => {
                r.push(ParamError::new(KIND.name, ParamErrorKind::Missing));
                None
            }
            Some(other) => {
                r.push(ParamError::new(
                    KIND.name,
                    ParamErrorKind::UnknownChoice {
                        text: other.to_string(),
                        choices: KIND_CHOICES,
                    },
                ));
                None
            }
        };
        match case {
            Some(c) if !r.has_errors() => Ok(c),
            _ => Err(r.into_errors()),
        }
    }

    /// The experiment's name as the `kind` field spells it.
    pub fn kind(&self) -> &'static str {
        match self {
            FitCase::Counts { .. } => "counts",
            FitCase::Delay { .. } => "delay",
            FitCase::Comparator { .. } => "comparator",
        }
    }
}
