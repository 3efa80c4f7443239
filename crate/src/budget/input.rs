//! Reading a design and its corners into a roll-up: every row checked against every
//! corner, every problem reported with its file, line and column. A row at a corner is
//! one synchronizer case (see [`super::row`]).

use std::collections::{BTreeSet, HashMap};
use std::sync::Arc;

use crate::crossing::fields as sync;
use crate::error::{ParamError, ParamErrorKind, ParamErrors, TableProblem};
use crate::params::{positive_number, whole, FieldReader, RawInputs};
use crate::quantity::Time;
use crate::reliability::Fleet;
use crate::table::{read_keeping, Column};
use crate::units::Dim;

use super::fields::{
    BUDGET_FIT, CORNERS, DESIGN, DEVICES, SERVICE_YEARS, SIGNOFF, T0, TAU, TAU_SIGMA, TAU_TW_CORR,
    TCQ, TSU, TW, TW_SIGMA,
};
use super::rollup::{Cell, Rollup, MAX_STAGES};
use super::row::{lent_error, Lent, RowCase, RowReader, ROW_FIELDS};

/// A named corner.
#[derive(Debug, Clone, PartialEq)]
pub struct Corner {
    /// Its name.
    pub name: String,
    /// Its plain values, lent to rows of no class (and to classes without columns).
    plain: Lent,
    /// Its per-class and per-domain values (`tau@fast`, `fclk@core`), by column name;
    /// a blank cell is absent.
    at: HashMap<String, f64>,
    hours: Option<f64>,
    /// The longest resolution time its characterisation covered.
    tr_max: Option<f64>,
    /// Its line in the corners table (None: the one corner given by options).
    line: Option<usize>,
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
    /// The correlation of ln tau and ln tw (0 unless given).
    pub corr: f64,
    /// Whether the verdict, exit status and fix plan use the 95th percentile (the default
    /// with sigmas; else the nominal total).
    pub signoff_p95: bool,
    /// Each corner's share of service time (a mission profile), when the corners give it.
    pub hours: Option<Vec<f64>>,
    /// The design's note columns: each its name and one text per row.
    pub notes: Vec<(String, Vec<String>)>,
    /// Each row's cell class and clock domain as written (blank when none).
    pub classes: Vec<String>,
    /// Each row's sampling clock domain as written (blank when none).
    pub domains: Vec<String>,
    /// Each row's warnings, as `latchwise sync` gives them for the row's own inputs,
    /// and the row's inputs its case does not use.
    pub row_warnings: Vec<Vec<String>>,
    /// Whether each row gives its rate by a crossing kind (so its fdata is implied).
    pub kind_given: Vec<bool>,
    /// Warnings on the design as a whole: classes that take the corners' plain values,
    /// rows fixed at every corner, corner columns no row uses.
    pub design_warnings: Vec<String>,
}

/// The design's own columns; after them, every synchronizer input (see [`ROW_FIELDS`]),
/// as text for the synchronizer's reader.
const OWN_COLUMNS: [Column; 7] = [
    Column::any("name", Dim::Text),
    Column::any("count", Dim::Count)
        .within(1.0, MAX_COUNT)
        .positive()
        .optional(),
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
    // The row's cell class: `tau@CLASS` and its kin in the corners.
    Column::any("cell", Dim::Text).optional(),
    // The sampling clock's domain: `fclk@DOMAIN` in the corners.
    Column::any("domain", Dim::Text).optional(),
    // The launching clock's domain (crossing=signal): `flaunch@DOMAIN` or `fclk@DOMAIN`.
    Column::any("launch_domain", Dim::Text).optional(),
];

/// The design's columns: its own, then every synchronizer input by the same name.
fn design_columns() -> Vec<Column> {
    let mut v = OWN_COLUMNS.to_vec();
    v.extend(
        ROW_FIELDS
            .iter()
            .map(|f| Column::any(f.name, Dim::Text).optional()),
    );
    v
}

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
const CORNER_COLUMNS: [Column; 8] = [
    Column::any("corner", Dim::Text),
    Column::of(sync::TAU).positive(),
    Column::of(sync::TW).positive().optional(),
    Column::of(sync::T0).positive().optional(),
    Column::of(sync::TSU).non_negative().optional(),
    Column::of(sync::TCQ).non_negative().optional(),
    // The share of service time spent at the corner (a mission profile).
    Column::any("hours", Dim::Ratio)
        .within(1e-300, 1.0)
        .non_negative()
        .optional(),
    // The longest resolution time in the lab data behind the corner's tau.
    Column::of(sync::TR_MAX)
        .renamed("tr_max")
        .positive()
        .optional(),
];

/// The values a corner may give per cell class (`tau@CLASS`...) and per clock domain
/// (`fclk@DOMAIN`, `flaunch@DOMAIN`): each with the synchronizer field whose limits hold.
const PER_CLASS: [(&str, Column); 5] = [
    ("tau", Column::of(sync::TAU).positive()),
    ("tw", Column::of(sync::TW).positive()),
    ("t0", Column::of(sync::T0).positive()),
    ("tsu", Column::of(sync::TSU).non_negative()),
    ("tcq", Column::of(sync::TCQ).non_negative()),
];
const PER_DOMAIN: [(&str, Column); 2] = [
    ("fclk", Column::of(sync::FCLK).positive()),
    ("flaunch", Column::of(sync::FLAUNCH).positive()),
];

/// The column of a per-class or per-domain value, by its base name.
fn at_column(base: &str) -> Option<Column> {
    PER_CLASS
        .iter()
        .chain(&PER_DOMAIN)
        .find(|(n, _)| *n == base)
        .map(|(_, c)| *c)
}

/// Which of the corners' own columns are kept: `VALUE@NAME` for a cell class or a clock
/// domain.
fn corner_column(name: &str) -> Option<Result<(), &'static str>> {
    Some(match name.split_once('@') {
        Some((base, word)) if at_column(base).is_some() && !word.trim().is_empty() => Ok(()),
        _ => Err(
            "per cell class give tau@CLASS, tw@CLASS, t0@CLASS, tsu@CLASS or tcq@CLASS; \
             per clock domain fclk@DOMAIN or flaunch@DOMAIN",
        ),
    })
}

/// How far the corners' `hours` may sum from 1.
pub const HOURS_SUM_TOLERANCE: f64 = 1e-9;

fn window(tw: Option<f64>, t0: Option<f64>) -> Result<Option<(f64, bool)>, &'static str> {
    match (tw, t0) {
        (Some(_), Some(_)) => Err("give tw or t0, not both"),
        (Some(v), None) => Ok(Some((v, false))),
        (None, Some(v)) => Ok(Some((v, true))),
        (None, None) => Ok(None),
    }
}

/// One cell of a kept column, held to its column's limits.
fn kept_cell(col: &Column, text: &str) -> Result<Option<f64>, String> {
    let text = text.trim();
    if text.is_empty() {
        return Ok(None);
    }
    let spec = crate::params::FieldSpec {
        name: col.name,
        dim: col.dim,
        help: "",
        limits: col.limits,
        usual: (0.0, f64::MAX),
    };
    match spec.parse(text) {
        Ok(v) if col.non_negative && v < 0.0 => {
            Err(format!("'{}' is negative", crate::error::short(text)))
        }
        Ok(v) if col.positive && v <= 0.0 => Err("must be above zero".to_string()),
        Ok(v) => Ok(Some(v)),
        Err(e) => Err(message_of(&e)),
    }
}

/// An error's message without its field's name in front (the place names the column).
fn message_of(e: &ParamError) -> String {
    let s = e.to_string();
    match s.strip_prefix(&format!("{}: ", e.field)) {
        Some(m) => m.to_string(),
        None => s,
    }
}

/// The corners from the corners file, or the one corner `given` by options.
fn read_corners(r: &mut FieldReader) -> Option<Vec<Corner>> {
    if let Some(text) = r.table(&CORNERS) {
        let table = match read_keeping(text, &CORNER_COLUMNS, corner_column) {
            Ok(t) => t,
            Err(p) => {
                r.push(ParamError::new(
                    CORNERS.name,
                    ParamErrorKind::table(p.iter().map(|e| e.in_table("corners")).collect()),
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
        let tr_max = table.optional(7);
        let mut problems = Vec::new();
        let mut out: Vec<Corner> = Vec::new();
        for (i, line) in table.lines.iter().enumerate() {
            let name = names[i].clone();
            if name.is_empty() {
                problems.push(TableProblem::at(
                    "corners",
                    Some(*line),
                    &["corner"],
                    "the corner needs a name",
                ));
            } else if out.iter().any(|c| c.name == name) {
                problems.push(TableProblem::at(
                    "corners",
                    Some(*line),
                    &["corner"],
                    format!("'{}' is named twice", crate::error::short(&name)),
                ));
            }
            let w = match window(tw.get(i).copied().flatten(), t0.get(i).copied().flatten()) {
                Ok(Some(w)) => Some(w),
                Ok(None) => {
                    problems.push(TableProblem::at(
                        "corners",
                        Some(*line),
                        &[],
                        "the corner needs tw or t0",
                    ));
                    None
                }
                Err(m) => {
                    problems.push(TableProblem::at("corners", Some(*line), &["tw", "t0"], m));
                    None
                }
            };
            let h = hours.get(i).copied().flatten();
            if table.has(6) && h.is_none() {
                problems.push(TableProblem::at(
                    "corners",
                    Some(*line),
                    &["hours"],
                    "give every corner its share of the service time (0 for none)",
                ));
            }
            let mut at = HashMap::new();
            for (col, cells) in &table.kept {
                let base = col.split_once('@').map_or("", |(b, _)| b);
                let Some(spec) = at_column(base) else {
                    continue;
                };
                match kept_cell(&spec, &cells[i]) {
                    Ok(Some(v)) => {
                        at.insert(col.clone(), v);
                    }
                    Ok(None) => {}
                    Err(m) => problems.push(TableProblem::at("corners", Some(*line), &[col], m)),
                }
            }
            for (col, _) in &table.kept {
                if let Some(class) = col.strip_prefix("tw@") {
                    let other = format!("t0@{class}");
                    if at.contains_key(col) && at.contains_key(&other) {
                        problems.push(TableProblem::at(
                            "corners",
                            Some(*line),
                            &[col, &other],
                            "give tw or t0, not both",
                        ));
                    }
                }
            }
            out.push(Corner {
                name,
                plain: Lent {
                    tau: tau[i],
                    window: w,
                    tsu: tsu.get(i).copied().flatten(),
                    tcq: tcq.get(i).copied().flatten(),
                    fclk: None,
                    flaunch: None,
                },
                at,
                hours: h,
                tr_max: tr_max.get(i).copied().flatten(),
                line: Some(*line),
            });
        }
        if table.has(6) && problems.is_empty() {
            let sum: f64 = out.iter().filter_map(|c| c.hours).sum();
            if (sum - 1.0).abs() > HOURS_SUM_TOLERANCE {
                problems.push(TableProblem::at(
                    "corners",
                    None,
                    &["hours"],
                    format!("the shares of service time sum to {sum}, not 1"),
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
        plain: Lent {
            tau,
            window: window(tw, t0).ok().flatten(),
            tsu,
            tcq,
            fclk: None,
            flaunch: None,
        },
        at: HashMap::new(),
        hours: None,
        tr_max: None,
        line: None,
    }])
}

/// The names of the corners' per-class or per-domain columns for `base` and `word`.
fn at_key(base: &str, word: &str) -> String {
    format!("{base}@{}", word.trim().to_ascii_lowercase())
}

/// What corner `c` lends a row of class `class` in domains `domain` and `launch`.
fn lent_at(c: &Corner, class: &str, domain: &str, launch: &str) -> Lent {
    let get = |base: &str, word: &str| {
        (!word.trim().is_empty())
            .then(|| c.at.get(&at_key(base, word)).copied())
            .flatten()
    };
    let p = &c.plain;
    let window = match (get("tw", class), get("t0", class)) {
        (Some(w), _) => Some((w, false)),
        (None, Some(w)) => Some((w, true)),
        (None, None) => p.window,
    };
    Lent {
        tau: get("tau", class).or(p.tau),
        window,
        tsu: get("tsu", class).or(p.tsu),
        tcq: get("tcq", class).or(p.tcq),
        fclk: get("fclk", domain),
        flaunch: get("flaunch", launch).or(get("fclk", launch)),
    }
}

/// A design row read at every corner, kept for the rows like it.
struct RowRead {
    /// Its case at each corner.
    cases: Vec<Arc<RowCase>>,
    /// Its warnings.
    warnings: Vec<String>,
    /// It gives its own tau or window, which no corner changes.
    own_tau_or_window: bool,
    /// It names a crossing kind other than plain data.
    kind_given: bool,
}

/// Why a row could not be read at the corners: a problem at its line (columns and
/// message), or a corner of the table that lacks a value the row needs.
enum RowFailure {
    Problem(Vec<&'static str>, String),
    CornerNeeds(usize, &'static str),
}

/// A design row read at every corner: its case at each (the synchronizer's reader and
/// model), its warnings (the farthest extrapolation beyond a corner's characterised range
/// among them) and its flags; or why it cannot be read.
fn read_at_corners(
    own: &[(&'static str, &str)],
    class: &str,
    domain: &str,
    launch: &str,
    corners: &[Corner],
    reader: &mut RowReader,
) -> Result<RowRead, Vec<RowFailure>> {
    let has = |f: &str| own.iter().any(|(k, _)| *k == f);
    let mut cases: Vec<Arc<RowCase>> = Vec::with_capacity(corners.len());
    let mut warnings: Vec<String> = Vec::new();
    for (ci, c) in corners.iter().enumerate() {
        let lent = lent_at(c, class, domain, launch);
        if !domain.is_empty() && lent.fclk.is_none() && !has(sync::FCLK.name) {
            return Err(vec![RowFailure::Problem(
                vec!["domain"],
                format!(
                    "corner {} leaves fclk@{} blank, and the row gives no fclk",
                    c.name,
                    crate::error::short(&domain.to_ascii_lowercase())
                ),
            )]);
        }
        match reader.read(own, &lent) {
            Ok(case) => {
                for w in &case.warnings {
                    if !warnings.contains(w) {
                        warnings.push(w.clone());
                    }
                }
                cases.push(case);
            }
            Err(errors) => {
                let mut failures = Vec::new();
                for e in &errors.0 {
                    let lendable = [
                        sync::TAU.name,
                        sync::TW.name,
                        sync::TSU.name,
                        sync::TCQ.name,
                    ];
                    let missing = e.kind == ParamErrorKind::Missing && lendable.contains(&e.field);
                    // A corner of the table without a value the rows need: said once, at
                    // the corner's line, not at every row.
                    if let (true, Some(_)) = (missing, c.line) {
                        failures.push(RowFailure::CornerNeeds(ci, e.field));
                        continue;
                    }
                    let m = if missing {
                        "a value is required, in the row or the corner".to_string()
                    } else {
                        message_of(e)
                    };
                    failures.push(RowFailure::Problem(
                        vec![e.field],
                        if lent_error(e, own, &lent) {
                            format!("at corner {}, with the corner's value: {m}", c.name)
                        } else {
                            m
                        },
                    ));
                }
                return Err(failures);
            }
        }
    }
    // Beyond the characterised range: the farthest corner, said once per row.
    let far = cases
        .iter()
        .zip(corners)
        .filter_map(|(case, c)| {
            let tr = case.sync.resolution_time();
            c.tr_max
                .filter(|m| tr > *m)
                .map(|m| (tr / m, tr, m, &c.name))
        })
        .fold(
            None,
            |best: Option<(f64, f64, f64, &String)>, x| match best {
                Some(b) if b.0 >= x.0 => Some(b),
                _ => Some(x),
            },
        );
    if let Some((_, tr, m, name)) = far {
        if let Some(e) = crate::crossing::input::extrapolation(tr, m) {
            warnings.push(format!("At corner {name}: {e}"));
        }
    }
    let own_tau_or_window = [
        sync::TAU.name,
        sync::TAU_MASTER.name,
        sync::TAU_SLAVE.name,
        sync::TW.name,
        sync::T0.name,
    ]
    .iter()
    .any(|f| has(f));
    let kind_given = own
        .iter()
        .any(|(k, t)| *k == sync::CROSSING.name && !t.eq_ignore_ascii_case("data"));
    Ok(RowRead {
        cases,
        warnings,
        own_tau_or_window,
        kind_given,
    })
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
        let corr = if r.has(&TAU_TW_CORR) {
            if r.has(&TAU_SIGMA) && r.has(&TW_SIGMA) {
                r.optional(&TAU_TW_CORR, |f, v| {
                    if v > -1.0 && v < 1.0 {
                        Ok(v)
                    } else {
                        Err(ParamError::new(
                            f,
                            ParamErrorKind::OutOfRange {
                                value: v,
                                range: "above -1 and below 1",
                            },
                        ))
                    }
                })
                .unwrap_or(0.0)
            } else {
                r.push(ParamError::new(
                    TAU_TW_CORR.name,
                    ParamErrorKind::Unfittable(
                        "a correlation needs both uncertainties: give tau-sigma and tw-sigma"
                            .to_string(),
                    ),
                ));
                0.0
            }
        } else {
            0.0
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
        let Some(text) = r.table(&DESIGN) else {
            r.push(ParamError::new(DESIGN.name, ParamErrorKind::Missing));
            return Err(r.into_errors());
        };
        let table = match read_keeping(text, &design_columns(), note_column) {
            Ok(t) => Some(t),
            Err(p) => {
                r.push(ParamError::new(
                    DESIGN.name,
                    ParamErrorKind::table(p.iter().map(|e| e.in_table("design")).collect()),
                ));
                None
            }
        };
        let (Some(mut table), Some(corners)) = (table, corners) else {
            return Err(r.into_errors());
        };
        let names = table.text(0);
        let (count, width, cap) = (table.optional(1), table.optional(2), table.optional(3));
        let (classes, domains, launches) = (table.text(4), table.text(5), table.text(6));
        // The synchronizer's columns the design has, borrowed (no copy of 10,000 cells).
        let own_texts: Vec<(&'static str, &[String])> = ROW_FIELDS
            .iter()
            .enumerate()
            .filter_map(|(k, f)| {
                table
                    .texts
                    .get(OWN_COLUMNS.len() + k)
                    .and_then(|c| c.as_deref())
                    .map(|c| (f.name, c))
            })
            .collect();
        let mut own: Vec<(&'static str, &str)> = Vec::with_capacity(own_texts.len());
        let at = |v: &Vec<Option<f64>>, i: usize| v.get(i).copied().flatten();
        fn word(v: &[String], i: usize) -> &str {
            v.get(i).map_or("", |s| s.trim())
        }
        let mut problems: Vec<TableProblem> = Vec::new();
        let n_rows = table.len();
        let mut cells = Vec::with_capacity(n_rows);
        let mut row_stages = Vec::with_capacity(n_rows);
        let mut counts = Vec::with_capacity(n_rows);
        let mut widths = Vec::with_capacity(n_rows);
        let mut caps = Vec::with_capacity(n_rows);
        let mut tr_given = Vec::with_capacity(n_rows);
        let mut row_warnings = Vec::with_capacity(n_rows);
        let mut kind_given = Vec::with_capacity(n_rows);
        let mut fixed: Vec<String> = Vec::new();
        let mut reader = RowReader::new();
        // (corner, field) -> (the first row's line, rows) that need a value the corner lacks.
        let mut corner_needs: std::collections::BTreeMap<(usize, &'static str), (usize, usize)> =
            std::collections::BTreeMap::new();
        // Each crossing by its own name: the fix plan and the results name rows.
        let mut first_line: crate::table::TextMap<&str, usize> =
            crate::table::TextMap::with_capacity_and_hasher(n_rows, Default::default());
        // Rows that give the same inputs (the synchronizer's columns, the cell class and the
        // domains) read the same at every corner: a design's rows mostly repeat a few
        // clocks, rates and depths, so each distinct row is read at the corners once, and
        // a row like it takes its cases and warnings (its count and width are its own).
        // The distinct rows read, and where each is by its key (one lookup per row).
        let mut reads: Vec<RowRead> = Vec::new();
        let mut same_rows: crate::table::TextMap<Vec<u8>, usize> = crate::table::TextMap::default();
        let mut row_key: Vec<u8> = Vec::new();
        for (i, line) in table.lines.iter().enumerate() {
            let here =
                |columns: &[&str], m: String| TableProblem::at("design", Some(*line), columns, m);
            if let Some(name) = names.get(i).filter(|n| !n.is_empty()) {
                let first = *first_line.entry(name.as_str()).or_insert(*line);
                if first != *line {
                    problems.push(here(
                        &["name"],
                        format!(
                            "'{}' names line {first} already: each crossing needs a name of its own",
                            crate::error::short(name)
                        ),
                    ));
                }
            }
            own.clear();
            own.extend(own_texts.iter().filter_map(|(k, v)| {
                v.get(i)
                    .map(|t| t.trim())
                    .filter(|t| !t.is_empty())
                    .map(|t| (*k, t))
            }));
            let n = at(&count, i).unwrap_or(1.0);
            let wd = at(&width, i).unwrap_or(1.0);
            if wd.fract() != 0.0 {
                problems.push(here(&["width"], format!("'{wd}' is not a whole number")));
            }
            if n.fract() != 0.0 {
                problems.push(here(&["count"], format!("'{n}' is not a whole number")));
            }
            let (class, domain, launch) =
                (word(&classes, i), word(&domains, i), word(&launches, i));
            row_key.clear();
            let pieces = own.iter().flat_map(|(k, t)| [*k, *t]);
            super::row::push_pieces(&mut row_key, pieces.chain([class, domain, launch]));
            // A row like one already read passed the same checks and reads the same.
            let k = if let Some(&k) = same_rows.get(row_key.as_slice()) {
                k
            } else {
                let has = |f: &str| own.iter().any(|(k, _)| *k == f);
                // A named domain must give the clock, or the row its own.
                let missing = |base: &str, dom: &str| {
                    !dom.is_empty()
                        && !corners
                            .iter()
                            .any(|c| c.at.contains_key(&at_key(base, dom)))
                };
                if missing("fclk", domain) && !has(sync::FCLK.name) {
                    problems.push(here(
                        &["domain"],
                        format!(
                            "no corner gives fclk@{}, and the row gives no fclk",
                            crate::error::short(&domain.to_ascii_lowercase())
                        ),
                    ));
                    continue;
                }
                let signal = own
                    .iter()
                    .any(|(k, t)| *k == sync::CROSSING.name && t.eq_ignore_ascii_case("signal"));
                if signal
                    && missing("flaunch", launch)
                    && missing("fclk", launch)
                    && !has(sync::FLAUNCH.name)
                {
                    problems.push(here(
                        &["launch_domain"],
                        format!(
                            "no corner gives flaunch@{0} or fclk@{0}, and the row gives no flaunch",
                            crate::error::short(&launch.to_ascii_lowercase())
                        ),
                    ));
                    continue;
                }
                match read_at_corners(&own, class, domain, launch, &corners, &mut reader) {
                    Ok(read) => {
                        reads.push(read);
                        same_rows.insert(row_key.clone(), reads.len() - 1);
                        reads.len() - 1
                    }
                    Err(failures) => {
                        for f in failures {
                            match f {
                                RowFailure::Problem(columns, m) => problems.push(here(&columns, m)),
                                RowFailure::CornerNeeds(ci, field) => {
                                    let at = corner_needs.entry((ci, field)).or_insert((*line, 0));
                                    at.1 += 1;
                                }
                            }
                        }
                        continue;
                    }
                }
            };
            let read = &reads[k];
            let row: Vec<Cell> = read
                .cases
                .iter()
                .map(|case| Cell::with_terms(Arc::clone(&case.sync), n, case.terms))
                .collect();
            let warnings = read.warnings.clone();
            let sync0 = &row[0].sync;
            let st = sync0.stages();
            let trv = sync0.tr().is_some();
            let most = at(&cap, i);
            if let Some(m) = most {
                if m.fract() != 0.0 {
                    problems.push(here(
                        &["max_stages"],
                        format!("'{m}' is not a whole number from 1 to 1000"),
                    ));
                } else if m < f64::from(st) {
                    problems.push(here(
                        &["max_stages"],
                        format!("{m} is below the row's stages, {st}"),
                    ));
                }
            }
            if read.own_tau_or_window {
                fixed.push(names[i].clone());
            }
            cells.push(row);
            row_stages.push(st);
            counts.push(n);
            widths.push(wd);
            caps.push(most.map_or(MAX_STAGES, |m| m as u32));
            tr_given.push(trv);
            row_warnings.push(warnings);
            kind_given.push(read.kind_given);
        }
        reader.finish();
        if !problems.is_empty() {
            r.push(ParamError::new(
                DESIGN.name,
                ParamErrorKind::table(problems),
            ));
        }
        if !corner_needs.is_empty() {
            let needs = corner_needs
                .iter()
                .map(|((ci, field), (first, n))| {
                    let c = &corners[*ci];
                    TableProblem::at(
                        "corners",
                        c.line,
                        &[field],
                        format!(
                            "corner {} gives no {field}, which {} of the design's rows need \
                             (the first at line {first}) and do not give themselves",
                            crate::error::short(&c.name),
                            n
                        ),
                    )
                })
                .collect();
            r.push(ParamError::new(CORNERS.name, ParamErrorKind::table(needs)));
        }
        if r.has_errors() {
            return Err(r.into_errors());
        }
        let hours = corners
            .iter()
            .map(|c| c.hours)
            .collect::<Option<Vec<f64>>>();
        let notes = std::mem::take(&mut table.kept);
        let design_warnings = design_warnings(&corners, &classes, &domains, &launches, &fixed);
        let (classes, domains) = (
            (0..names.len())
                .map(|i| word(&classes, i).to_string())
                .collect::<Vec<_>>(),
            (0..names.len())
                .map(|i| word(&domains, i).to_string())
                .collect::<Vec<_>>(),
        );
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
            corr,
            signoff_p95,
            classes,
            domains,
            row_warnings,
            kind_given,
            design_warnings,
        })
    }
}

/// The most names a design warning lists before counting the rest.
const NAMES_MOST: usize = 10;

fn listed(names: &[String]) -> String {
    if names.len() <= NAMES_MOST {
        names.join(", ")
    } else {
        format!(
            "{} and {} more",
            names[..NAMES_MOST].join(", "),
            names.len() - NAMES_MOST
        )
    }
}

/// What the report says once for the design: each class that takes the corners' plain
/// values for some of its own, rows that hold their own tau or window at every corner,
/// and corner columns that no row's class or domain uses.
fn design_warnings(
    corners: &[Corner],
    classes: &[String],
    domains: &[String],
    launches: &[String],
    fixed: &[String],
) -> Vec<String> {
    let mut out = Vec::new();
    let columns: BTreeSet<&String> = corners.iter().flat_map(|c| c.at.keys()).collect();
    let used: BTreeSet<String> = classes
        .iter()
        .filter(|c| !c.is_empty())
        .map(|c| c.to_ascii_lowercase())
        .collect();
    for class in &used {
        let plain: Vec<&str> = ["tau", "tsu", "tcq"]
            .into_iter()
            .filter(|b| !columns.contains(&at_key(b, class)))
            .chain(
                (!columns.contains(&at_key("tw", class))
                    && !columns.contains(&at_key("t0", class)))
                .then_some("tw or t0"),
            )
            .collect();
        if !plain.is_empty() {
            out.push(format!(
                "Cell class {}: no corner column of its own for {}, so it takes the corners' \
                 plain value there.",
                crate::error::short(class),
                plain.join(", ")
            ));
        }
    }
    let words: BTreeSet<String> = domains
        .iter()
        .chain(launches)
        .filter(|c| !c.is_empty())
        .map(|c| c.to_ascii_lowercase())
        .collect();
    let unused: Vec<String> = columns
        .iter()
        .filter(|col| {
            let (base, word) = col.split_once('@').unwrap_or(("", ""));
            let by = if PER_DOMAIN.iter().any(|(b, _)| *b == base) {
                &words
            } else {
                &used
            };
            !by.contains(word)
        })
        .map(|c| c.to_string())
        .collect();
    if !unused.is_empty() {
        out.push(format!(
            "Corner columns that no row's cell or domain names (check the spelling): {}.",
            listed(&unused)
        ));
    }
    if !fixed.is_empty() {
        out.push(format!(
            "Fixed at every corner (the row gives its own tau or window, which no corner \
             changes): {}.",
            listed(fixed)
        ));
    }
    out
}
