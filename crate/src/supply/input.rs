//! Reading the supply calculator's inputs: the characterisation and operating-point
//! tables, the safety inputs, and at every operating point (and characterised
//! temperature) the crossing as one synchronizer case, with tau by the section-10 rules.

use crate::crossing::fields as sync;
use crate::crossing::SyncCase;
use crate::error::{ParamError, ParamErrorKind, ParamErrors, TableProblem};
use crate::params::{FieldReader, RawInputs};
use crate::quantity::Voltage;
use crate::reliability::Target;
use crate::table::{read, Column, Table};
use crate::units::{format_number, format_si, Dim};

use super::fields::{CHAR, CROSSING_FIELDS, DOMAIN, DVT, POINTS, SS, TCQ, TSU};
use super::model::{ageing_factor, ln_linear, tau_at, Known, Rule};

/// The most operating points a case may have.
pub const MAX_POINTS: usize = 1000;

/// The characterisation's columns, in this order.
const CHAR_COLUMNS: [Column; 8] = [
    Column::any("vdd", Dim::Voltage)
        .positive()
        .within(1e-3, 100.0),
    Column::of(sync::TAU).positive(),
    Column::of(sync::TW).positive().optional(),
    Column::of(sync::T0).positive().optional(),
    Column::of(sync::TSU).non_negative().optional(),
    Column::of(sync::TCQ).non_negative().optional(),
    Column::any("temp", Dim::Ratio)
        .within(0.0, 1000.0)
        .optional(),
    Column::any("aged", Dim::Text).optional(),
];

/// The operating points' columns, in this order.
const POINT_COLUMNS: [Column; 5] = [
    Column::any("name", Dim::Text),
    Column::any("vdd", Dim::Voltage)
        .positive()
        .within(1e-3, 100.0),
    Column::of(sync::FCLK).positive(),
    Column::any("temp", Dim::Ratio)
        .within(0.0, 1000.0)
        .optional(),
    Column::any("residency", Dim::Ratio)
        .non_negative()
        .within(0.0, 1.0)
        .optional(),
];

/// What a characterisation gives at one temperature (fresh or aged): each value by VDD,
/// sorted by rising VDD.
#[derive(Debug, Clone, PartialEq)]
pub struct CharSet {
    /// Its temperature, °C (`None`: the table gives none).
    pub temp: Option<f64>,
    /// Whether these are aged (end-of-life) characterisations.
    pub aged: bool,
    /// tau by VDD.
    pub tau: Vec<Known>,
    /// The window (tw or t0) by VDD.
    pub window: Vec<Known>,
    /// Setup time by VDD, when the table gives it.
    pub tsu: Option<Vec<Known>>,
    /// Clock-to-output by VDD, when the table gives it.
    pub tcq: Option<Vec<Known>>,
}

/// One operating point as its table gives it.
#[derive(Debug, Clone, PartialEq)]
pub struct OpPoint {
    /// Its line in the table.
    pub line: usize,
    /// Its name.
    pub name: String,
    /// Supply voltage, V.
    pub vdd: f64,
    /// Sampling clock there, Hz.
    pub fclk: f64,
    /// Its temperature, °C, when given.
    pub temp: Option<f64>,
    /// Its share of service time, when given.
    pub residency: Option<f64>,
}

/// One operating point at one temperature: the values the rules give, and the crossing
/// there as a synchronizer case.
#[derive(Debug, Clone, PartialEq)]
pub struct PointCase {
    /// The operating point (index into [`SupplyCase::points`]).
    pub point: usize,
    /// The temperature, °C, when the characterisation gives one.
    pub temp: Option<f64>,
    /// tau, s, with the ageing factor when it applies.
    pub tau: f64,
    /// How tau was obtained.
    pub rule: Rule,
    /// The ageing factor applied (1 when none).
    pub ageing: f64,
    /// The window, s, and how it was obtained.
    pub window: (f64, Rule),
    /// Setup and clock-to-output times used, s.
    pub tsu: f64,
    /// See `tsu`.
    pub tcq: f64,
    /// The crossing at this point.
    pub case: SyncCase,
}

/// A complete supply case.
#[derive(Debug, Clone, PartialEq)]
pub struct SupplyCase {
    /// The characterisation by temperature.
    pub sets: Vec<CharSet>,
    /// Whether the window is t0 (else tw).
    pub t0: bool,
    /// The operating points.
    pub points: Vec<OpPoint>,
    /// Every point at every temperature it is evaluated at.
    pub cases: Vec<PointCase>,
    /// Subthreshold swing, V per decade.
    pub ss: Option<f64>,
    /// End-of-life threshold shift, V.
    pub dvt: Option<f64>,
    /// The factor ageing multiplies tau by (with dvt).
    pub ageing_factor: Option<f64>,
    /// The target.
    pub target: Option<Target>,
    /// The clock domain the corners export names.
    pub domain: Option<String>,
    /// Notes on values far outside their usual range.
    pub notes: Vec<String>,
    /// Conflicts that leave the case usable (both targets).
    pub conflicts: Vec<ParamError>,
}

fn problem(table: &'static str, line: usize, column: &str, message: String) -> TableProblem {
    TableProblem {
        table,
        line: Some(line),
        columns: if column.is_empty() {
            Vec::new()
        } else {
            vec![column.to_string()]
        },
        message,
    }
}

fn read_table(
    r: &mut FieldReader,
    field: &'static crate::params::FieldSpec,
    columns: &[Column],
) -> Option<Table> {
    let Some(text) = r.table(field) else {
        r.push(ParamError::new(field.name, ParamErrorKind::Missing));
        return None;
    };
    match read(text, columns) {
        Ok(t) if t.is_empty() => {
            r.push(ParamError::new(
                field.name,
                ParamErrorKind::table(vec![problem(
                    field.name,
                    1,
                    "",
                    "no data rows: give one row per point under the header".into(),
                )]),
            ));
            None
        }
        Ok(t) => Some(t),
        Err(problems) => {
            r.push(ParamError::new(
                field.name,
                ParamErrorKind::table(problems.iter().map(|e| e.in_table(field.name)).collect()),
            ));
            None
        }
    }
}

/// One row of the characterisation.
struct CharRow {
    line: usize,
    vdd: f64,
    tau: f64,
    window: f64,
    tsu: Option<f64>,
    tcq: Option<f64>,
    temp: Option<f64>,
    aged: bool,
}

/// The characterisation by temperature, aged rows preferred where a temperature has any.
fn char_sets(t: &Table) -> Result<(Vec<CharSet>, bool), Vec<TableProblem>> {
    let mut problems = Vec::new();
    let t0 = t.has(3);
    if t.has(2) == t0 {
        problems.push(problem(
            "char",
            1,
            "",
            "give the window as one column, tw or t0".into(),
        ));
        return Err(problems);
    }
    let col = |i: usize| t.optional(i);
    let (vdd, tau, win) = (col(0), col(1), col(if t0 { 3 } else { 2 }));
    let (tsu, tcq, temp) = (col(4), col(5), col(6));
    let aged_text = t.text(7);
    let mut rows = Vec::new();
    for (k, &line) in t.lines.iter().enumerate() {
        let aged = match aged_text.get(k).map(|s| s.trim().to_ascii_lowercase()) {
            None => false,
            Some(s) if s.is_empty() || s == "no" => false,
            Some(s) if s == "yes" => true,
            Some(s) => {
                problems.push(problem(
                    "char",
                    line,
                    "aged",
                    format!("'{s}' is not yes or no"),
                ));
                false
            }
        };
        let Some(w) = win[k] else {
            problems.push(problem(
                "char",
                line,
                if t0 { "t0" } else { "tw" },
                "a value is required".into(),
            ));
            continue;
        };
        for (i, name) in [(4, "tsu"), (5, "tcq")] {
            if t.has(i) && col(i).get(k).copied().flatten().is_none() {
                problems.push(problem(
                    "char",
                    line,
                    name,
                    format!("give {name} on every row or on none"),
                ));
            }
        }
        rows.push(CharRow {
            line,
            vdd: vdd[k].unwrap_or(1.0),
            tau: tau[k].unwrap_or(1.0),
            window: w,
            tsu: tsu.get(k).copied().flatten(),
            tcq: tcq.get(k).copied().flatten(),
            temp: temp.get(k).copied().flatten(),
            aged,
        });
    }
    if t.has(6) && temp.iter().any(Option::is_none) {
        problems.push(problem(
            "char",
            1,
            "temp",
            "give temp on every row or on none".into(),
        ));
    }
    let mut temps: Vec<Option<f64>> = Vec::new();
    for r in &rows {
        if !temps.contains(&r.temp) {
            temps.push(r.temp);
        }
    }
    temps.sort_by(|a, b| a.unwrap_or(0.0).total_cmp(&b.unwrap_or(0.0)));
    let mut sets = Vec::new();
    for temp in temps {
        let at: Vec<&CharRow> = rows.iter().filter(|r| r.temp == temp).collect();
        let aged = at.iter().any(|r| r.aged);
        let mut chosen: Vec<&CharRow> = at.into_iter().filter(|r| r.aged == aged).collect();
        chosen.sort_by(|a, b| a.vdd.total_cmp(&b.vdd));
        let mut kept: Vec<&CharRow> = Vec::new();
        for r in chosen {
            match kept.last() {
                Some(p) if p.vdd == r.vdd => {
                    if (p.tau, p.window, p.tsu, p.tcq) != (r.tau, r.window, r.tsu, r.tcq) {
                        problems.push(problem(
                            "char",
                            r.line,
                            "vdd",
                            format!(
                                "{} is characterised twice{} with different values (also line {})",
                                format_si(r.vdd, "V"),
                                temp.map_or(String::new(), |t| format!(
                                    " at {} °C",
                                    format_number(t)
                                )),
                                p.line
                            ),
                        ));
                    }
                }
                _ => kept.push(r),
            }
        }
        let by = |f: fn(&CharRow) -> Option<f64>| {
            kept.iter()
                .map(|r| f(r).map(|v| (r.vdd, v)))
                .collect::<Option<Vec<Known>>>()
        };
        sets.push(CharSet {
            temp,
            aged,
            tau: kept.iter().map(|r| (r.vdd, r.tau)).collect(),
            window: kept.iter().map(|r| (r.vdd, r.window)).collect(),
            tsu: by(|r| r.tsu),
            tcq: by(|r| r.tcq),
        });
    }
    if problems.is_empty() {
        Ok((sets, t0))
    } else {
        Err(problems)
    }
}

fn op_points(t: &Table) -> Result<Vec<OpPoint>, Vec<TableProblem>> {
    let mut problems = Vec::new();
    let names = t.text(0);
    let (vdd, fclk, temp, res) = (t.optional(1), t.optional(2), t.optional(3), t.optional(4));
    let mut out: Vec<OpPoint> = Vec::new();
    for (k, &line) in t.lines.iter().enumerate() {
        let name = names[k].trim().to_string();
        if name.is_empty() {
            problems.push(problem("points", line, "name", "a name is required".into()));
        } else if out.iter().any(|p| p.name == name) {
            problems.push(problem(
                "points",
                line,
                "name",
                format!("'{name}' is named twice"),
            ));
        }
        out.push(OpPoint {
            line,
            name,
            vdd: vdd[k].unwrap_or(1.0),
            fclk: fclk[k].unwrap_or(1.0),
            temp: temp.get(k).copied().flatten(),
            residency: res.get(k).copied().flatten(),
        });
    }
    if out.len() > MAX_POINTS {
        problems.push(problem(
            "points",
            out[MAX_POINTS].line,
            "",
            format!("at most {MAX_POINTS} operating points"),
        ));
    }
    let given = out.iter().filter(|p| p.residency.is_some()).count();
    if given > 0 && given < out.len() {
        let first = out
            .iter()
            .find(|p| p.residency.is_none())
            .map_or(1, |p| p.line);
        problems.push(problem(
            "points",
            first,
            "residency",
            "give residency for every point or for none".into(),
        ));
    } else if given > 0 {
        let sum: f64 = out.iter().filter_map(|p| p.residency).sum();
        if (sum - 1.0).abs() > 1e-9 {
            problems.push(problem(
                "points",
                out[0].line,
                "residency",
                format!("the residencies sum to {}, not 1", format_number(sum)),
            ));
        }
    }
    if problems.is_empty() {
        Ok(out)
    } else {
        Err(problems)
    }
}

/// A number as text that reads back as the same number.
fn exact(v: f64) -> String {
    format!("{v:e}")
}

impl SupplyCase {
    /// Builds a case from named text inputs.
    ///
    /// # Errors
    /// Every field error found, each naming its field; the tables' problems by line.
    pub fn from_inputs(raw: &RawInputs) -> Result<SupplyCase, ParamErrors> {
        let mut r = FieldReader::new(raw);
        let sets = read_table(&mut r, &CHAR, &CHAR_COLUMNS).and_then(|t| match char_sets(&t) {
            Ok(s) => Some(s),
            Err(p) => {
                r.push(ParamError::new(CHAR.name, ParamErrorKind::table(p)));
                None
            }
        });
        let points =
            read_table(&mut r, &POINTS, &POINT_COLUMNS).and_then(|t| match op_points(&t) {
                Ok(p) => Some(p),
                Err(p) => {
                    r.push(ParamError::new(POINTS.name, ParamErrorKind::table(p)));
                    None
                }
            });
        let ss = r.optional(&SS, Voltage::positive).map(Voltage::get);
        let dvt = r.optional(&DVT, Voltage::positive).map(Voltage::get);
        let domain = r.text(&DOMAIN).map(str::to_string);
        if let Some(d) = &domain {
            if d.contains([',', '@', '"', '\n', ';', '\t']) {
                r.push(ParamError::new(
                    DOMAIN.name,
                    ParamErrorKind::UnknownChoice {
                        text: d.clone(),
                        choices: "a name without , @ ; \" or tabs",
                    },
                ));
            }
        }
        // The crossing's own fields are read at each point by the synchronizer's reader;
        // these are checked once here so that an error names the field, not a point.
        let crossing: Vec<(&'static str, String)> = CROSSING_FIELDS
            .iter()
            .filter_map(|f| raw.get_nonblank(f.name).map(|v| (f.name, v.to_string())))
            .collect();
        let tsu_field = raw.get_nonblank(TSU.name);
        let tcq_field = raw.get_nonblank(TCQ.name);
        if dvt.is_some() && ss.is_none() {
            r.push(ParamError::new(
                SS.name,
                ParamErrorKind::NeededFor("dvt: the ageing factor is 10^(dvt/ss)".into()),
            ));
        }
        let (Some((sets, t0)), Some(points), false) = (sets, points, r.has_errors()) else {
            return Err(r.into_errors());
        };
        for (spec, field, in_table) in [
            (&TSU, tsu_field, sets.iter().any(|s| s.tsu.is_some())),
            (&TCQ, tcq_field, sets.iter().any(|s| s.tcq.is_some())),
        ] {
            if in_table && field.is_some() {
                r.push(ParamError::new(
                    spec.name,
                    ParamErrorKind::Conflict("the column of the same name in char"),
                ));
            }
        }
        let ageing = dvt.zip(ss).map(|(d, s)| ageing_factor(d, s));
        let temps: Vec<Option<f64>> = sets.iter().map(|s| s.temp).collect();
        let mut cases = Vec::new();
        let mut problems = Vec::new();
        for (i, p) in points.iter().enumerate() {
            let at: Vec<&CharSet> = match (p.temp, temps.iter().any(Option::is_some)) {
                (Some(t), true) => {
                    let found: Vec<&CharSet> = sets.iter().filter(|s| s.temp == Some(t)).collect();
                    if found.is_empty() {
                        problems.push(problem(
                            "points",
                            p.line,
                            "temp",
                            format!(
                                "no characterisation at {} °C (characterised at {})",
                                format_number(t),
                                temps
                                    .iter()
                                    .flatten()
                                    .map(|t| format!("{} °C", format_number(*t)))
                                    .collect::<Vec<_>>()
                                    .join(", ")
                            ),
                        ));
                    }
                    found
                }
                _ => sets.iter().collect(),
            };
            for set in at {
                let lowest = set.tau[0].0;
                let Some((tau, rule)) = tau_at(&set.tau, p.vdd, ss) else {
                    r.push(ParamError::new(
                        SS.name,
                        ParamErrorKind::NeededFor(format!(
                            "point {} at {}, below the lowest characterised VDD ({}): its \
                             tau is bounded by the subthreshold swing (a straight-line \
                             extension would be unsafe)",
                            p.name,
                            format_si(p.vdd, "V"),
                            format_si(lowest, "V")
                        )),
                    ));
                    continue;
                };
                let factor = if set.aged { 1.0 } else { ageing.unwrap_or(1.0) };
                let window = ln_linear(&set.window, p.vdd);
                let pick = |known: &Option<Vec<Known>>, field: Option<&str>| match known {
                    Some(k) => Some(exact(ln_linear(k, p.vdd).0)),
                    None => field.map(str::to_string),
                };
                let mut pairs: Vec<(&'static str, String)> = crossing.clone();
                pairs.push((sync::TAU.name, exact(tau * factor)));
                pairs.push((
                    if t0 { sync::T0.name } else { sync::TW.name },
                    exact(window.0),
                ));
                if let Some(v) = pick(&set.tsu, tsu_field) {
                    pairs.push((sync::TSU.name, v));
                }
                if !t0 {
                    if let Some(v) = pick(&set.tcq, tcq_field) {
                        pairs.push((sync::TCQ.name, v));
                    }
                }
                pairs.push((sync::FCLK.name, exact(p.fclk)));
                match SyncCase::from_inputs(&RawInputs::from_pairs(pairs)) {
                    Ok(case) => cases.push(PointCase {
                        point: i,
                        temp: set.temp,
                        tau: tau * factor,
                        rule,
                        ageing: factor,
                        window,
                        tsu: case.sync.tsu().get(),
                        tcq: case.sync.tcq().get(),
                        case,
                    }),
                    Err(e) => {
                        for err in e.0 {
                            // A crossing field's own error names the field; the rest
                            // belong to this point.
                            if CROSSING_FIELDS.iter().any(|f| f.name == err.field)
                                || (err.field == TSU.name && tsu_field.is_some())
                                || (err.field == TCQ.name && tcq_field.is_some())
                            {
                                r.push(err);
                            } else {
                                problems.push(problem(
                                    "points",
                                    p.line,
                                    "",
                                    format!(
                                        "{}{}: {err}",
                                        p.name,
                                        set.temp.map_or(String::new(), |t| format!(
                                            " at {} °C",
                                            format_number(t)
                                        ))
                                    ),
                                ));
                            }
                        }
                    }
                }
            }
        }
        if !problems.is_empty() {
            r.push(ParamError::new(
                POINTS.name,
                ParamErrorKind::table(problems),
            ));
        }
        if r.has_errors() {
            return Err(r.into_errors());
        }
        let first = &cases[0].case;
        Ok(SupplyCase {
            sets,
            t0,
            points,
            target: first.target,
            conflicts: first.conflicts.clone(),
            cases,
            ss,
            dvt,
            ageing_factor: ageing,
            domain,
            notes: r.notes(),
        })
    }
}
