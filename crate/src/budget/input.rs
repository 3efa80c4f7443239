//! Reading a design and its corners into a roll-up: every row checked against every
//! corner, every problem reported with its file, line and column.

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{positive_number, whole, FieldReader, RawInputs};
use crate::quantity::Time;
use crate::reliability::Fleet;
use crate::synchronizer::fields as sync;
use crate::table::{read, read_keeping, Column};
use crate::units::{format_si, Dim};

use super::fields::{
    BUDGET_FIT, CORNERS, DESIGN, DEVICES, SERVICE_YEARS, SIGNOFF, T0, TAU, TAU_SIGMA, TCQ, TSU, TW,
    TW_SIGMA,
};
use super::rollup::{Cell, Rollup, MAX_STAGES};

/// A window and whether it counts from the clock edge (t0) or beyond tcq (tw).
#[derive(Debug, Clone, Copy, PartialEq)]
struct Win {
    value: f64,
    t0: bool,
}

/// A named corner.
#[derive(Debug, Clone, PartialEq)]
pub struct Corner {
    /// Its name.
    pub name: String,
    tau: Option<f64>,
    window: Option<Win>,
    tsu: Option<f64>,
    tcq: Option<f64>,
    hours: Option<f64>,
}

/// A budget case: the roll-up, names, and the questions asked of it.
#[derive(Debug, Clone, PartialEq)]
pub struct BudgetCase {
    /// Every row at every corner.
    pub rollup: Rollup,
    /// Row names, in file order.
    pub names: Vec<String>,
    /// Which rows give tr directly (the fix plan leaves them alone).
    pub tr_given: Vec<bool>,
    /// Corner names.
    pub corners: Vec<String>,
    /// Whether the corners come from the corners table (else the one corner `given`).
    pub corners_from_table: bool,
    /// The FIT budget.
    pub budget_fit: Option<f64>,
    /// The fleet.
    pub fleet: Option<Fleet>,
    /// Standard deviations of ln tau and ln tw, when given.
    pub sigmas: Option<(f64, f64)>,
    /// Whether the verdict, exit status and fix plan use the 95th percentile (the default
    /// with sigmas; else the nominal total).
    pub signoff_p95: bool,
    /// Each corner's share of service time (a mission profile), when the corners give it.
    pub hours: Option<Vec<f64>>,
    /// The design's note columns: each its name and one text per row.
    pub notes: Vec<(String, Vec<String>)>,
}

/// The design's columns: each a synchronizer field, with that field's limits.
const DESIGN_COLUMNS: [Column; 13] = [
    Column::any("name", Dim::Text),
    Column::of(sync::FCLK).positive(),
    Column::of(sync::FDATA).positive(),
    Column::of(sync::STAGES).positive().optional(),
    Column::of(sync::TR).non_negative().optional(),
    Column::any("count", Dim::Count)
        .within(1.0, MAX_COUNT)
        .positive()
        .optional(),
    Column::of(sync::TAU).positive().optional(),
    Column::of(sync::TW).positive().optional(),
    Column::of(sync::T0).positive().optional(),
    Column::of(sync::TSU).non_negative().optional(),
    Column::of(sync::TCQ).non_negative().optional(),
    // Flip-flops per stage of one instance (a 5-bit Gray pointer: 5): the fix plan's cost.
    Column::any("width", Dim::Count)
        .within(1.0, 1e6)
        .positive()
        .optional(),
    // The most stages the fix plan may give the row.
    Column::of(sync::STAGES)
        .renamed("max_stages")
        .positive()
        .optional(),
];

/// Which of a design's own columns are kept: `note` and `note:WORD` (an owner, a waiver,
/// a ticket) travel with their rows into every export; any other is refused, with how to
/// carry it.
fn note_column(name: &str) -> Option<Result<(), &'static str>> {
    Some(if name == "note" || name.starts_with("note:") {
        Ok(())
    } else {
        Err(
            "to carry a column of your own with each row, name it note or note:WORD \
             (note:owner, note:waiver)",
        )
    })
}

/// The most instances one row may count (a billion: far beyond any chip's crossings).
pub const MAX_COUNT: f64 = 1e9;

/// The corners' columns, with the synchronizer's limits.
const CORNER_COLUMNS: [Column; 7] = [
    Column::any("corner", Dim::Text),
    Column::of(sync::TAU).positive(),
    Column::of(sync::TW).positive().optional(),
    Column::of(sync::T0).positive().optional(),
    Column::of(sync::TSU).non_negative(),
    Column::of(sync::TCQ).non_negative().optional(),
    // The share of service time spent at the corner (a mission profile).
    Column::any("hours", Dim::Ratio)
        .within(1e-300, 1.0)
        .non_negative()
        .optional(),
];

/// How far the corners' `hours` may sum from 1.
pub const HOURS_SUM_TOLERANCE: f64 = 1e-9;

fn window(tw: Option<f64>, t0: Option<f64>) -> Result<Option<Win>, &'static str> {
    match (tw, t0) {
        (Some(_), Some(_)) => Err("give tw or t0, not both"),
        (Some(v), None) => Ok(Some(Win {
            value: v,
            t0: false,
        })),
        (None, Some(v)) => Ok(Some(Win { value: v, t0: true })),
        (None, None) => Ok(None),
    }
}

/// The corners from the corners file, or the one corner `given` by options.
fn read_corners(r: &mut FieldReader) -> Option<Vec<Corner>> {
    if let Some(text) = r.text(&CORNERS) {
        let table = match read(text, &CORNER_COLUMNS) {
            Ok(t) => t,
            Err(p) => {
                r.push(ParamError::new(
                    CORNERS.name,
                    ParamErrorKind::table(p.iter().map(|e| format!("corners, {e}")).collect()),
                ));
                return None;
            }
        };
        let names = table.text(0);
        let (tau, tw, t0, tsu, tcq, hours) = (
            table.optional(1),
            table.optional(2),
            table.optional(3),
            table.optional(4),
            table.optional(5),
            table.optional(6),
        );
        let mut problems = Vec::new();
        let mut out: Vec<Corner> = Vec::new();
        for (i, line) in table.lines.iter().enumerate() {
            let name = names[i].clone();
            if name.is_empty() {
                problems.push(format!(
                    "corners, line {line}, column corner: the corner needs a name"
                ));
            } else if out.iter().any(|c| c.name == name) {
                problems.push(format!(
                    "corners, line {line}, column corner: '{name}' is named twice"
                ));
            }
            let w = match window(tw.get(i).copied().flatten(), t0.get(i).copied().flatten()) {
                Ok(w) => w,
                Err(m) => {
                    problems.push(format!("corners, line {line}: {m}"));
                    None
                }
            };
            if w.is_none() {
                problems.push(format!("corners, line {line}: the corner needs tw or t0"));
            }
            let h = hours.get(i).copied().flatten();
            if table.has(6) && h.is_none() {
                problems.push(format!(
                    "corners, line {line}, column hours: give every corner its share of the \
                     service time (0 for none)"
                ));
            }
            out.push(Corner {
                name,
                tau: tau[i],
                window: w,
                tsu: tsu[i],
                tcq: tcq.get(i).copied().flatten(),
                hours: h,
            });
        }
        if table.has(6) && problems.is_empty() {
            let sum: f64 = out.iter().filter_map(|c| c.hours).sum();
            if (sum - 1.0).abs() > HOURS_SUM_TOLERANCE {
                problems.push(format!(
                    "corners, column hours: the shares of service time sum to {sum}, not 1"
                ));
            }
        }
        if problems.is_empty() {
            return Some(out);
        }
        r.push(ParamError::new(
            CORNERS.name,
            ParamErrorKind::table(problems),
        ));
        return None;
    }
    let tau = r.optional(&TAU, Time::positive).map(Time::get);
    let tw = r.optional(&TW, Time::positive).map(Time::get);
    let t0 = r.optional(&T0, Time::positive).map(Time::get);
    if tw.is_some() && t0.is_some() {
        r.push(ParamError::new(TW.name, ParamErrorKind::Conflict(T0.name)));
        return None;
    }
    let tsu = r.optional(&TSU, Time::non_negative).map(Time::get);
    let tcq = r.optional(&TCQ, Time::non_negative).map(Time::get);
    Some(vec![Corner {
        name: "given".into(),
        tau,
        window: window(tw, t0).ok().flatten(),
        tsu,
        tcq,
        hours: None,
    }])
}

impl BudgetCase {
    /// Reads a budget case.
    ///
    /// # Errors
    /// Every problem found, the design's and the corners' each with its line and column.
    pub fn from_inputs(raw: &RawInputs) -> Result<BudgetCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let corners_from_table = r.has(&CORNERS);
        let corners = read_corners(&mut r);
        let budget_fit = r.optional(&BUDGET_FIT, positive_number);
        let fleet = match (r.has(&DEVICES), r.has(&SERVICE_YEARS)) {
            (false, false) => None,
            _ => {
                let d = r.required(&DEVICES, |f, v| {
                    whole(f, v, 1, 1_000_000_000_000, "1 to 1e12")
                });
                let y = r.required(&SERVICE_YEARS, positive_number);
                d.zip(y).map(|(devices, years)| Fleet { devices, years })
            }
        };
        let sigmas = match (r.has(&TAU_SIGMA), r.has(&TW_SIGMA)) {
            (false, false) => None,
            _ => {
                let sigma = |r: &mut FieldReader, spec| {
                    if r.has(spec) {
                        r.optional(spec, positive_number)
                    } else {
                        Some(0.0)
                    }
                };
                let a = sigma(&mut r, &TAU_SIGMA);
                let b = sigma(&mut r, &TW_SIGMA);
                a.zip(b)
            }
        };
        let signoff_p95 = match r.text(&SIGNOFF).map(str::to_ascii_lowercase).as_deref() {
            None => r.has(&TAU_SIGMA) || r.has(&TW_SIGMA),
            Some("nominal") => false,
            Some("p95") if r.has(&TAU_SIGMA) || r.has(&TW_SIGMA) => true,
            Some("p95") => {
                r.push(ParamError::new(
                    SIGNOFF.name,
                    ParamErrorKind::Unfittable(
                        "p95 needs the uncertainty: give tau-sigma or tw-sigma".to_string(),
                    ),
                ));
                false
            }
            Some(other) => {
                r.push(ParamError::new(
                    SIGNOFF.name,
                    ParamErrorKind::UnknownChoice {
                        text: other.to_string(),
                        choices: "p95, nominal",
                    },
                ));
                false
            }
        };
        let Some(text) = r.text(&DESIGN) else {
            r.push(ParamError::new(DESIGN.name, ParamErrorKind::Missing));
            return Err(r.into_errors());
        };
        let table = match read_keeping(text, &DESIGN_COLUMNS, note_column) {
            Ok(t) => Some(t),
            Err(p) => {
                r.push(ParamError::new(
                    DESIGN.name,
                    ParamErrorKind::table(p.iter().map(|e| format!("design, {e}")).collect()),
                ));
                None
            }
        };
        let (Some(mut table), Some(corners)) = (table, corners) else {
            return Err(r.into_errors());
        };
        let names = table.text(0);
        let col = |i| table.optional(i);
        let (fclk, fdata, stages, tr, count) = (col(1), col(2), col(3), col(4), col(5));
        let (tau, tw, t0, tsu, tcq) = (col(6), col(7), col(8), col(9), col(10));
        let (width, cap) = (col(11), col(12));
        let at = |v: &Vec<Option<f64>>, i: usize| v.get(i).copied().flatten();
        let mut problems: Vec<String> = Vec::new();
        let mut cells = Vec::with_capacity(table.len());
        let mut row_stages = Vec::with_capacity(table.len());
        let mut counts = Vec::with_capacity(table.len());
        let mut widths = Vec::with_capacity(table.len());
        let mut caps = Vec::with_capacity(table.len());
        let mut tr_given = Vec::with_capacity(table.len());
        // Each crossing by its own name: the fix plan and the results name rows.
        let mut first_line: std::collections::HashMap<&str, usize> =
            std::collections::HashMap::with_capacity(table.len());
        for (i, line) in table.lines.iter().enumerate() {
            let here = |m: String| format!("design, line {line}, {m}");
            if let Some(name) = names.get(i).filter(|n| !n.is_empty()) {
                let first = *first_line.entry(name.as_str()).or_insert(*line);
                if first != *line {
                    problems.push(here(format!(
                        "column name: '{}' names line {first} already: each crossing needs a name of its own",
                        crate::error::short(name)
                    )));
                }
            }
            let (Some(fc), Some(fd)) = (at(&fclk, i), at(&fdata, i)) else {
                continue;
            };
            let n = at(&count, i).unwrap_or(1.0);
            let wd = at(&width, i).unwrap_or(1.0);
            if wd.fract() != 0.0 {
                problems.push(here(format!("column width: '{wd}' is not a whole number")));
            }
            let most = at(&cap, i);
            if let Some(m) = most {
                if m.fract() != 0.0 {
                    problems.push(here(format!(
                        "column max_stages: '{m}' is not a whole number from 1 to 1000"
                    )));
                } else if m < at(&stages, i).unwrap_or(1.0) {
                    problems.push(here(format!(
                        "column max_stages: {m} is below the row's stages, {}",
                        at(&stages, i).unwrap_or(1.0)
                    )));
                }
            }
            if n.fract() != 0.0 {
                problems.push(here(format!("column count: '{n}' is not a whole number")));
            }
            let st = at(&stages, i);
            if let Some(s) = st {
                if s.fract() != 0.0 || s > f64::from(MAX_STAGES) {
                    problems.push(here(format!(
                        "column stages: '{s}' is not a whole number from 1 to 1000"
                    )));
                }
            }
            let trv = at(&tr, i);
            if st.is_none() == trv.is_none() {
                problems.push(here("columns stages, tr: give one of the two".into()));
                continue;
            }
            let row_w = match window(at(&tw, i), at(&t0, i)) {
                Ok(w) => w,
                Err(m) => {
                    problems.push(here(format!("columns tw, t0: {m}")));
                    continue;
                }
            };
            let mut row = Vec::with_capacity(corners.len());
            for c in &corners {
                let tau_v = at(&tau, i).or(c.tau);
                let w = row_w.or(c.window);
                let (Some(tau_v), Some(w)) = (tau_v, w) else {
                    problems.push(here(format!(
                        "corner {}: no tau or window, in the row or the corner",
                        c.name
                    )));
                    break;
                };
                let tsu_v = at(&tsu, i).or(c.tsu).unwrap_or(0.0);
                let tcq_v = if w.t0 {
                    0.0
                } else {
                    at(&tcq, i).or(c.tcq).unwrap_or(0.0)
                };
                let hop = 1.0 / fc - tsu_v - tcq_v;
                // As the synchronizer: even one flip-flop needs tsu + tcq within a period.
                if trv.is_none() && hop <= 0.0 {
                    problems.push(here(format!(
                        "corner {}: the clock period {} is not longer than tsu + tcq = {}",
                        c.name,
                        format_si(1.0 / fc, "s"),
                        format_si(tsu_v + tcq_v, "s")
                    )));
                    break;
                }
                row.push(Cell::new(n, fd, fc, w.value, hop.max(0.0), trv, tau_v));
            }
            cells.push(row);
            row_stages.push(st.unwrap_or(1.0) as u32);
            counts.push(n);
            widths.push(wd);
            caps.push(most.map_or(MAX_STAGES, |m| m as u32));
            tr_given.push(trv.is_some());
        }
        if !problems.is_empty() {
            r.push(ParamError::new(
                DESIGN.name,
                ParamErrorKind::table(problems),
            ));
        }
        if r.has_errors() {
            return Err(r.into_errors());
        }
        let hours = corners
            .iter()
            .map(|c| c.hours)
            .collect::<Option<Vec<f64>>>();
        let notes = std::mem::take(&mut table.kept);
        Ok(BudgetCase {
            rollup: Rollup {
                cells,
                stages: row_stages,
                counts,
                widths,
                caps,
            },
            names,
            tr_given,
            hours,
            notes,
            corners: corners.into_iter().map(|c| c.name).collect(),
            corners_from_table,
            budget_fit,
            fleet,
            sigmas,
            signoff_p95,
        })
    }
}
