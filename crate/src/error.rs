//! Typed input errors: every one names the field it belongs to and what is wrong.

use std::fmt;

use crate::units::Dim;

/// What is wrong with one input field.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum ParamErrorKind {
    /// The field is required and was left empty.
    Missing,
    /// The text is not a number in engineering notation.
    NotANumber(String),
    /// The text names infinity or NaN.
    NotFinite(String),
    /// The number is too large to represent.
    Overflow(String),
    /// The number is non-zero but too small to represent.
    Underflow(String),
    /// A unit suffix that no field knows.
    UnknownUnit(String),
    /// A unit that belongs to another kind of quantity.
    WrongUnit {
        /// The text as typed.
        text: String,
        /// The kind the unit denotes.
        found: Dim,
        /// The kind the field expects.
        expected: Dim,
    },
    /// A negative value where only positive ones make sense.
    Negative(Dim),
    /// Zero where only positive values make sense.
    Zero(Dim),
    /// A count that is not a whole number.
    NotInteger(String),
    /// A value outside the range the field accepts.
    OutOfRange {
        /// The value as parsed.
        value: f64,
        /// A description of the accepted range, e.g. "1 to 1000".
        range: &'static str,
    },
    /// Two fields that exclude each other were both given.
    Conflict(&'static str),
    /// The sampling period leaves no time to resolve between stages.
    PeriodTooShort {
        /// The clock period in seconds.
        period: f64,
        /// The time the next stage needs (setup plus clock-to-output) in seconds.
        needed: f64,
    },
    /// The latch transconductance does not exceed the node conductance.
    NotRegenerative {
        /// Transconductance in siemens.
        gm: f64,
        /// Node conductance in siemens.
        g0: f64,
    },
    /// A number the model cannot use: beyond the field's limits.
    Unusable {
        /// The text as typed.
        text: String,
        /// The kind of the field.
        dim: Dim,
        /// The limit passed.
        bound: f64,
        /// Whether the value is above the upper limit (else below the lower one).
        above: bool,
    },
    /// A unit spelling whose prefix means one thing in lower case and another in upper.
    Ambiguous {
        /// The text as typed.
        text: String,
        /// The two readings, upper-case prefix first (`400MHz`, `400mHz`).
        readings: [String; 2],
    },
    /// A list with the wrong number of values.
    ListLength {
        /// Values given.
        given: usize,
        /// Values wanted (0: no list is possible here).
        wanted: usize,
    },
    /// A packed value in a link that cannot be unpacked, and why.
    Damaged(String),
    /// Problems in a table of data, each with its table, line and columns.
    Table(Vec<TableProblem>),
    /// Data that cannot give the fit asked of it, and why.
    Unfittable(String),
    /// A ratio that is not two positive whole numbers `P/Q`.
    BadRatio(String),
    /// A value outside a range that depends on another field (a code beyond 2^B - 1).
    OutOfRangeFor {
        /// The value as understood, with its unit.
        value: String,
        /// The accepted range, e.g. "1 to 1023 (2^bits - 1)".
        range: String,
    },
    /// A field that needs another field given as well.
    NeedsAlso(&'static str),
    /// A field left blank that the case needs, and why.
    NeededFor(String),
    /// A field that applies only when another field has a certain value.
    OnlyWith {
        /// The field it depends on.
        other: &'static str,
        /// The value of that field it needs.
        value: &'static str,
    },
    /// A choice field got a value it does not know.
    UnknownChoice {
        /// The text as typed.
        text: String,
        /// The accepted values, comma separated.
        choices: &'static str,
    },
}

impl ParamErrorKind {
    /// A table's problems, one line each: at most [`TABLE_LINES_MOST`], then one line
    /// that counts the rest (100,000 bad rows must not make a 100,000-line message).
    pub fn table(mut problems: Vec<TableProblem>) -> ParamErrorKind {
        if problems.len() > TABLE_LINES_MOST {
            let rest = problems.len() - TABLE_LINES_MOST;
            problems.truncate(TABLE_LINES_MOST);
            problems.push(TableProblem {
                table: "",
                line: None,
                columns: Vec::new(),
                message: format!(
                    "and {rest} more problems (the first {TABLE_LINES_MOST} are listed)"
                ),
            });
        }
        ParamErrorKind::Table(problems)
    }
}

/// One problem of a table, as data: which table, line and columns, and what is wrong.
/// The page marks cells from these, the command line names the file from `table`; its
/// text reads "design, line 3, column fdata: ...".
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TableProblem {
    /// The table as its case names it (`design`, `corners`), or empty for a field's one
    /// table (a fit's data).
    pub table: &'static str,
    /// The line in the table's text, 1-based, when the problem has one.
    pub line: Option<usize>,
    /// The columns concerned, by their header names.
    pub columns: Vec<String>,
    /// What is wrong.
    pub message: String,
}

impl TableProblem {
    /// A problem of `table` at `line` in `columns`.
    pub fn at(
        table: &'static str,
        line: Option<usize>,
        columns: &[&str],
        message: impl Into<String>,
    ) -> TableProblem {
        TableProblem {
            table,
            line,
            columns: columns.iter().map(|c| (*c).to_string()).collect(),
            message: message.into(),
        }
    }
}

impl fmt::Display for TableProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let mut place: Vec<String> = Vec::new();
        if !self.table.is_empty() {
            place.push(self.table.to_string());
        }
        if let Some(l) = self.line {
            place.push(format!("line {l}"));
        }
        match self.columns.len() {
            0 => {}
            1 => place.push(format!("column {}", self.columns[0])),
            _ => place.push(format!("columns {}", self.columns.join(", "))),
        }
        if place.is_empty() {
            write!(f, "{}", self.message)
        } else {
            write!(f, "{}: {}", place.join(", "), self.message)
        }
    }
}

/// An input error tied to a named field (the parameter name of the domain notes).
#[derive(Debug, Clone, PartialEq)]
pub struct ParamError {
    /// The parameter name, e.g. `tau`.
    pub field: &'static str,
    /// What is wrong.
    pub kind: ParamErrorKind,
}

impl ParamError {
    /// Creates an error for `field`.
    pub fn new(field: &'static str, kind: ParamErrorKind) -> Self {
        ParamError { field, kind }
    }
}

impl fmt::Display for ParamError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use crate::units::format_si;
        use ParamErrorKind::*;
        write!(f, "{}: ", self.field)?;
        match &self.kind {
            Missing => write!(f, "a value is required"),
            NotANumber(t) => write!(
                f,
                "'{}' is not a number (write e.g. 20p, 20 ps, 2e-11 or 1.5GHz)",
                short(t)
            ),
            NotFinite(t) => write!(f, "'{}' is not a finite number", short(t)),
            Overflow(t) => write!(f, "'{}' is too large to represent", short(t)),
            Underflow(t) => write!(f, "'{}' is too small to represent", short(t)),
            UnknownUnit(u) => write!(f, "unknown unit or prefix '{}'", short(u)),
            WrongUnit {
                text,
                found,
                expected,
            } => write!(
                f,
                "'{}' is a {}, expected a {}",
                short(text),
                found.noun(),
                expected.noun()
            ),
            Negative(d) => write!(f, "negative {}", d.noun()),
            Zero(d) => write!(f, "must be a positive {}, not zero", d.noun()),
            NotInteger(t) => write!(f, "'{}' is not a whole number", short(t)),
            OutOfRange { value, range } => {
                write!(
                    f,
                    "{} is out of range (allowed: {range})",
                    fmt_plain(*value)
                )
            }
            Conflict(other) => write!(f, "give either {} or {other}, not both", self.field),
            PeriodTooShort { period, needed } => write!(
                f,
                "clock period {} is not longer than tsu + tcq = {}: no time is left to resolve",
                format_si(*period, "s"),
                format_si(*needed, "s")
            ),
            NotRegenerative { gm, g0 } => write!(
                f,
                "gm = {} does not exceed g0 = {}: the latch would not regenerate",
                format_si(*gm, "S"),
                format_si(*g0, "S")
            ),
            Unusable {
                text,
                dim,
                bound,
                above,
            } => {
                let b = match dim {
                    Dim::Count | Dim::Ratio | Dim::Choice | Dim::Text => {
                        crate::units::format_number(*bound)
                    }
                    d => format_si(*bound, d.symbol()),
                };
                if *above {
                    write!(
                        f,
                        "'{}' is too large: the largest the model can use is {b}",
                        short(text)
                    )
                } else {
                    write!(
                        f,
                        "'{}' is too small: the smallest the model can use is {b}",
                        short(text)
                    )
                }
            }
            Ambiguous { text, readings } => write!(
                f,
                "'{}' is ambiguous: write {} for megahertz or {} for millihertz",
                short(text),
                readings[0],
                readings[1]
            ),
            ListLength { given, wanted: 0 } => write!(
                f,
                "a list of {given} values needs the chain (stages, tsu, tcq), not tr"
            ),
            ListLength { given, wanted } => write!(
                f,
                "{given} values given, {wanted} wanted: one per hop, stages - 1"
            ),
            Damaged(why) => write!(
                f,
                "the packed value in the link cannot be read: {why}; ask for a fresh link \
                 or the CSV file"
            ),
            Table(problems) => {
                for (i, p) in problems.iter().enumerate() {
                    if i > 0 {
                        writeln!(f)?;
                    }
                    write!(f, "{p}")?;
                }
                Ok(())
            }
            Unfittable(why) => write!(f, "{why}"),
            BadRatio(t) => write!(
                f,
                "'{}' is not a ratio of two positive whole numbers such as 4/5 \
                 (launch over sampling frequency)",
                short(t)
            ),
            OutOfRangeFor { value, range } => {
                write!(f, "{value} is out of range (allowed: {range})")
            }
            NeedsAlso(other) => write!(f, "needs {other} as well"),
            NeededFor(why) => write!(f, "needed for {why}"),
            OnlyWith { other, value } => write!(
                f,
                "applies only with {other} = {value}: clear it, or set {other} to {value}"
            ),
            UnknownChoice { text, choices } => {
                write!(f, "'{}' is not one of: {choices}", short(text))
            }
        }
    }
}

/// The most lines of a table's problems that a message lists (the table reader already
/// stops at 40 and counts the rest; checks after it may add a few).
pub const TABLE_LINES_MOST: usize = 60;

/// The most characters of a typed value that an error message repeats.
pub const ECHO_MOST: usize = 40;

/// A typed value as an error message repeats it: whole when short, else its first
/// [`ECHO_MOST`] characters and how long it is (a 16 MiB value pasted by mistake must not
/// make a 16 MiB message).
pub fn short(text: &str) -> std::borrow::Cow<'_, str> {
    match text.char_indices().nth(ECHO_MOST) {
        None => std::borrow::Cow::Borrowed(text),
        Some((cut, _)) => std::borrow::Cow::Owned(format!(
            "{}… ({} characters)",
            &text[..cut],
            text.chars().count()
        )),
    }
}

fn fmt_plain(v: f64) -> String {
    if v == v.trunc() && v.abs() < 1e15 {
        format!("{v:.0}")
    } else {
        format!("{v}")
    }
}

impl std::error::Error for ParamError {}

/// All the field errors found in one set of inputs, in field order.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ParamErrors(pub Vec<ParamError>);

impl fmt::Display for ParamErrors {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, e) in self.0.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{e}")?;
        }
        Ok(())
    }
}

impl std::error::Error for ParamErrors {}
