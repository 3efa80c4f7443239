//! The one shape every calculator has: a name, its input fields, the reading of raw
//! inputs into a case, an evaluation into a serialisable report, what a person reads of
//! that report, and its plots. The command line, the WebAssembly binding and the tests
//! drive every calculator through this trait alone.

use serde::Serialize;

use crate::chart::Plot;
use crate::error::{ParamError, ParamErrors};
use crate::json_line::JsonLine;
use crate::params::{FieldSpec, RawInputs};
use crate::readout::Readout;

/// One calculator of the tool.
///
/// A readout's `name` is the report's JSON key and the `name` of the page's `<output>`;
/// a field's `name` is its URL key and its command-line option.
pub trait Calculator: 'static {
    /// The command name (`latchwise NAME`), the page's `data-page` and its storage key.
    const NAME: &'static str;
    /// The page's title and the text report's heading.
    const TITLE: &'static str;
    /// One line for the command list.
    const SUMMARY: &'static str;
    /// The page that shows it, relative to the site's root.
    const PAGE: &'static str;
    /// The input fields in display order.
    const FIELDS: &'static [FieldSpec];
    /// The command's help: usage, models and an example (the options table and the
    /// caution are added from `FIELDS` and the shared caution).
    const HELP: &'static str;
    /// Old parameter names still read from links and options, as `(old, new)`.
    const ALIASES: &'static [(&'static str, &'static str)] = &[];
    /// Whether the page shows [`Calculator::text_table`] too (a short table of results,
    /// such as the converter's errors by size), in its `table#results-table`.
    const PAGE_TABLE: bool = false;
    /// The command's option that writes [`Calculator::results_csv`] to a file
    /// (`--results FILE`; the supply calculator's rows are budget corners,
    /// `--corners-out FILE`).
    const RESULTS_OPTION: &'static str = "results";
    /// Fields the command takes as positional operands, in order; a text field's operand
    /// names a file (`-` for standard input).
    const OPERANDS: &'static [&'static str] = &[];

    /// A validated case; evaluating it cannot fail.
    type Case: 'static;
    /// Everything the case yields, as the command line's `--json` prints it.
    type Report: Serialize + 'static;

    /// Reads raw named inputs into a case.
    ///
    /// # Errors
    /// Every field error found, each naming its field.
    fn read(raw: &RawInputs) -> Result<Self::Case, ParamErrors>;

    /// Conflicts among the inputs that still leave a usable case (both of two
    /// alternative targets given). The command refuses the case; the page shows the
    /// message beside the results it can still give.
    fn conflicts(_case: &Self::Case) -> Vec<ParamError> {
        Vec::new()
    }

    /// Evaluates a case.
    fn evaluate(case: &Self::Case) -> Self::Report;

    /// What a person reads of a report, in display order.
    fn outcome(report: &Self::Report) -> Outcome;

    /// The plots of a case, each keyed by its canvas id (`report` is the case's own
    /// evaluation, so that plots need not evaluate it again).
    fn plots(case: &Self::Case, report: &Self::Report) -> Vec<Plot>;

    /// Figures the page shows beside the data rows of its table fields (none by default).
    fn figures(_case: &Self::Case, _report: &Self::Report) -> Vec<RowFigures> {
        Vec::new()
    }

    /// The results row by row as a CSV file, for an audit (`--results FILE`, the page's
    /// "Results CSV"); `None` for a calculator without rows.
    fn results_csv(_case: &Self::Case, _report: &Self::Report) -> Option<String> {
        None
    }

    /// A text that replaces the command's text report when the case asks for one (a fit
    /// named as a corner prints its corners CSV row); `None` by default.
    fn replaces_text_report(_report: &Self::Report) -> Option<String> {
        None
    }

    /// A table for the command's text report: its title, its header and rows (the
    /// largest `most`, or all), and how many rows there are in all; `None` when the
    /// calculator has none. The page shows its own tables instead.
    fn text_table(_report: &Self::Report, _most: Option<usize>) -> Option<TextTable> {
        None
    }

    /// Hands the report to `w` with its bulk rows (the budget's crossings) apart from the
    /// rest, so that a writer can put the rows out on more than one thread; a report
    /// without bulk rows goes whole (the default). The report is as it was afterwards.
    fn rows_apart<W: RowsApart<Self::Report>>(report: &mut Self::Report, w: W) -> W::Out {
        w.whole(report)
    }
}

/// A writer of a report that may take its bulk rows apart (see
/// [`Calculator::rows_apart`]).
pub trait RowsApart<R> {
    /// What writing gives.
    type Out;
    /// The report with nothing apart.
    fn whole(self, report: &R) -> Self::Out;
    /// The report with the array under `key` left empty, and that array's `rows`.
    fn apart<T: JsonLine + Sync>(self, rest: &R, key: &'static str, rows: &[T]) -> Self::Out;
}

/// A table of the command's text report (see [`Calculator::text_table`]).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TextTable {
    /// What the table holds.
    pub title: String,
    /// Column headings.
    pub header: Vec<String>,
    /// The rows shown.
    pub rows: Vec<Vec<String>>,
    /// How many rows there are in all.
    pub total: usize,
}

/// Figures a page shows beside each data row of one of its table fields, in the order of
/// the table's data rows (`table::layout`).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RowFigures {
    /// The table field, e.g. `design`.
    pub field: &'static str,
    /// The figures, column by column.
    pub columns: Vec<FigureColumn>,
}

/// One column of [`RowFigures`].
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FigureColumn {
    /// Its key (the report's name for it).
    pub key: &'static str,
    /// Its heading.
    pub label: String,
    /// How a value reads: `log10` (a number given by its log10), `fraction` (shown as a
    /// percentage), `hz` (a frequency) or `count`.
    pub kind: &'static str,
    /// Whether the table may sort by it, largest first.
    pub sorts: bool,
    /// One value per data row (`None`: does not apply to the row).
    pub values: Vec<Option<f64>>,
}

/// A figure as the page's table shows it (see [`FigureColumn::kind`]).
///
/// # Examples
/// ```
/// use latchwise::calculator::format_figure;
/// assert_eq!(format_figure("fraction", 0.4213), "42.1 %");
/// assert_eq!(format_figure("fraction", 2e-7), "< 0.001 %");
/// assert_eq!(format_figure("log10", -3.5), "3.162e-4");
/// assert_eq!(format_figure("count", 3.0), "3");
/// ```
pub fn format_figure(kind: &str, value: f64) -> String {
    match kind {
        "fraction" if value * 100.0 >= 0.1 || value == 0.0 => format!("{:.1} %", value * 100.0),
        "fraction" if value * 100.0 >= 0.001 => format!("{:.3} %", value * 100.0),
        "fraction" => "< 0.001 %".into(),
        "log10" => crate::units::format_log10(value, 4),
        "hz" => crate::units::format_si(value, "Hz"),
        _ => crate::units::format_number(value),
    }
}

/// What a person reads of a report: the inputs as understood, the results, and notes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Outcome {
    /// The inputs as understood, normalised, keyed by parameter name.
    pub inputs: Vec<(&'static str, String)>,
    /// The results, in display order.
    pub readouts: Vec<Readout>,
    /// Standing facts of this result (the year length, the window convention).
    pub facts: Vec<String>,
    /// Suspicious but legal inputs.
    pub warnings: Vec<String>,
    /// Parameters given but not used by this case.
    pub unused: Vec<&'static str>,
    /// A target was given and is not met (the command exits with status 1).
    pub target_missed: bool,
    /// Links that carry results into another calculator: (text, relative address).
    pub links: Vec<(String, String)>,
}

/// A calculator's identity, for lists and navigation.
#[derive(Debug, Clone, Copy)]
pub struct About {
    /// See [`Calculator::NAME`].
    pub name: &'static str,
    /// See [`Calculator::TITLE`].
    pub title: &'static str,
    /// See [`Calculator::SUMMARY`].
    pub summary: &'static str,
    /// See [`Calculator::PAGE`].
    pub page: &'static str,
    /// See [`Calculator::FIELDS`].
    pub fields: &'static [FieldSpec],
    /// See [`Calculator::HELP`].
    pub help: &'static str,
}

impl About {
    /// The identity of `C`.
    pub const fn of<C: Calculator>() -> About {
        About {
            name: C::NAME,
            title: C::TITLE,
            summary: C::SUMMARY,
            page: C::PAGE,
            fields: C::FIELDS,
            help: C::HELP,
        }
    }
}

/// The raw inputs of a link's query for calculator `C`: old names read as their new ones.
pub fn query_inputs<C: Calculator>(query: &str) -> RawInputs {
    let raw = RawInputs::from_query(query).renamed(C::ALIASES);
    if const { has_tables(C::FIELDS) } {
        raw.unpack_tables(&table_fields(C::FIELDS))
    } else {
        raw
    }
}

/// Whether `fields` hold a data table (a field a link may pack). Known when compiling: a
/// page whose calculator has none carries no packing code in its module.
pub const fn has_tables(fields: &[FieldSpec]) -> bool {
    let mut i = 0;
    while i < fields.len() {
        if matches!(fields[i].dim, crate::units::Dim::Text) {
            return true;
        }
        i += 1;
    }
    false
}

/// The names of the data-table fields among `fields` (the ones a link may pack).
pub fn table_fields(fields: &[FieldSpec]) -> Vec<&'static str> {
    fields
        .iter()
        .filter(|f| f.dim == crate::units::Dim::Text)
        .map(|f| f.name)
        .collect()
}

/// The CSV of plot `plot` (its canvas id) of the case `raw` describes, opening with the
/// case itself: the calculator, the plot's title, every input as understood with its
/// unit, the link to the case (when given) and what the y column holds. `None` when
/// the inputs are not valid or there is no such plot.
pub fn plot_csv<C: Calculator>(raw: &RawInputs, plot: &str, link: &str) -> Option<String> {
    let case = C::read(raw).ok()?;
    let report = C::evaluate(&case);
    let p = C::plots(&case, &report)
        .into_iter()
        .find(|p| p.id == plot)?;
    let outcome = C::outcome(&report);
    let mut preface = vec![format!("latchwise {}: {}", C::NAME, p.title)];
    preface.extend(outcome.inputs.iter().map(|(k, v)| format!("{k} = {v}")));
    if !link.is_empty() {
        preface.push(format!("link: {link}"));
    }
    // Say what the y column holds: a log10 only where the axis is one.
    preface.push(if p.y_log {
        format!("{} is log10 of {}", p.y_name, p.y_label)
    } else {
        format!("{} is {}", p.y_name, p.y_label)
    });
    Some(p.to_csv(&preface))
}

/// A link's query for calculator `C` with its long text values (data tables) packed,
/// where that makes them shorter (see [`crate::link`]).
pub fn compact_query<C: Calculator>(query: &str) -> String {
    if !const { has_tables(C::FIELDS) } {
        return crate::link::encode_pairs(RawInputs::from_query(query).pairs());
    }
    let texts = table_fields(C::FIELDS);
    crate::link::pack_pairs(
        RawInputs::from_query(query).unpack_tables(&texts).pairs(),
        &texts,
    )
}

/// Something to do with a calculator chosen by name at run time (see
/// `registry::dispatch`): each adapter writes its work once, generic over the calculator.
pub trait Visit {
    /// What the work returns.
    type Out;
    /// Does the work with calculator `C`.
    fn visit<C: Calculator>(self) -> Self::Out;
}
