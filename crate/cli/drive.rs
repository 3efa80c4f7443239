//! The one driver of every calculator command: options, help, errors, the text report
//! printed from the core's readouts (the labels the pages show), JSON, and exit status.

use std::borrow::Cow;
use std::io::Write;

use std::process::ExitCode;

use crate::json::{write_json, write_json_apart};
use latchwise::calculator::{Calculator, Outcome, RowsApart, TextTable, Visit};
use latchwise::error::ParamErrorKind;
use latchwise::reliability::CAUTION;

use crate::args::{options_help, parse};
use crate::{EXIT_BAD_INPUT, EXIT_TARGET_MISSED};

/// Runs the calculator chosen by name with the command's arguments.
pub struct Run<'a>(pub &'a [String]);

impl Visit for Run<'_> {
    type Out = ExitCode;

    fn visit<C: Calculator>(self) -> ExitCode {
        drive::<C>(self.0)
    }
}

/// Prints the help of the calculator chosen by name.
pub struct Help;

impl Visit for Help {
    type Out = String;

    fn visit<C: Calculator>(self) -> String {
        help::<C>()
    }
}

/// The help text of a calculator command: its usage and models, the options from its
/// fields, the common options, exit statuses and the caution.
pub fn help<C: Calculator>() -> String {
    format!(
        "latchwise {} - {}\n\n{}\nOptions (names equal the web page's URL keys):\n{}  \
         --from-url URL    read parameters from a bookmarked page URL or '?query';\n                    \
         options given explicitly override it\n  --json            print one JSON object \
         instead of the report\n  --help            this text\n\nExit status: 0 success, 1 a \
         target was given and is not met, 2 bad input or output that could not be \
         written.\n\nCaution: {CAUTION}\n",
        C::NAME,
        C::SUMMARY,
        C::HELP,
        options_help(C::FIELDS)
    )
}

/// Runs calculator `C`: options, help, notes, errors, output and exit status.
pub fn drive<C: Calculator>(args: &[String]) -> ExitCode {
    let name = C::NAME;
    let mut parsed = match parse(args, C::FIELDS, C::ALIASES, C::OPERANDS, C::RESULTS_OPTION) {
        Ok(p) => p,
        Err(msg) => {
            complain(&format!("latchwise {name}: {msg}"));
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    };
    if parsed.help {
        return said(name, say(&help::<C>()), ExitCode::SUCCESS);
    }
    if !parsed.ignored.is_empty() {
        let more = parsed.ignored_total - parsed.ignored.len();
        complain(&format!(
            "latchwise {name}: note: ignored unknown parameters in --from-url: {}{}",
            parsed
                .ignored
                .iter()
                .map(|k| format!("'{k}'"))
                .collect::<Vec<_>>()
                .join(", "),
            if more > 0 {
                format!(" and {more} more")
            } else {
                String::new()
            }
        ));
    }
    let case = match C::read(&parsed.raw) {
        Ok(c) => c,
        Err(errs) => {
            for e in &errs.0 {
                match &e.kind {
                    // A table's problems, one line each under the field's name.
                    ParamErrorKind::Table(problems) => {
                        for p in problems {
                            // Named by the file as the user gave it: "design.csv, line 3,
                            // column fdata: ..."; from a link, "design table, ...".
                            let table = if p.table.is_empty() { e.field } else { p.table };
                            let file = parsed
                                .files
                                .iter()
                                .rev()
                                .find(|(f, _)| f == table)
                                .map_or_else(
                                    || format!("{table} table"),
                                    |(_, path)| {
                                        if path == "-" {
                                            "standard input".to_string()
                                        } else {
                                            path.clone()
                                        }
                                    },
                                );
                            let rest = latchwise::error::TableProblem {
                                table: "",
                                ..p.clone()
                            };
                            let sep = if rest.line.is_none() && rest.columns.is_empty() {
                                ": "
                            } else {
                                ", "
                            };
                            complain(&format!("latchwise {name}: {file}{sep}{rest}"));
                        }
                    }
                    _ => complain(&format!("latchwise {name}: {e}")),
                }
            }
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    };
    let conflicts = C::conflicts(&case);
    if !conflicts.is_empty() {
        for e in &conflicts {
            complain(&format!("latchwise {name}: {e}"));
        }
        return ExitCode::from(EXIT_BAD_INPUT);
    }
    let mut report = C::evaluate(&case);
    let outcome = C::outcome(&report);
    if let Some(path) = &parsed.results {
        let Some(csv) = C::results_csv(&case, &report) else {
            complain(&format!(
                "latchwise {name}: --{}: this command has no rows to write (the budget has)",
                C::RESULTS_OPTION
            ));
            return ExitCode::from(EXIT_BAD_INPUT);
        };
        if let Err(e) = std::fs::write(path, csv) {
            complain(&format!("latchwise {name}: cannot write '{path}': {e}"));
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    }
    if parsed.json {
        // The report with its audit stamp: the version and the inputs' digest first.
        let digest = std::mem::take(&mut parsed.input_sha256).hex();
        if let Err(e) = C::rows_apart(&mut report, JsonOut { digest: &digest }) {
            complain(&format!("latchwise {name}: cannot write JSON: {e}"));
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    } else if let Some(text) = C::replaces_text_report(&report) {
        if let Err(code) = said_ok(name, say(&format!("{text}\n"))) {
            return code;
        }
    } else {
        let table = C::text_table(&report, (!parsed.all_rows).then_some(TABLE_ROWS_MOST));
        if parsed.all_rows && table.is_none() {
            complain(&format!(
                "latchwise {name}: --all-rows: this command has no table of rows (the budget has)"
            ));
            return ExitCode::from(EXIT_BAD_INPUT);
        }
        if let Err(code) = said_ok(name, say(&text_report(C::TITLE, &outcome, table.as_ref()))) {
            return code;
        }
    }
    let missed = outcome.target_missed;
    // The process ends here: its memory goes back whole, so the case and the report
    // (100,000 rows of a design, each with its own allocations) are not freed one by one.
    std::mem::forget((case, report, outcome));
    if missed {
        ExitCode::from(EXIT_TARGET_MISSED)
    } else {
        ExitCode::SUCCESS
    }
}

/// `text` with every control character other than line breaks and tabs written as an
/// escape, so that nothing taken from a link can drive the terminal. Text with none (the
/// usual case) is passed through as it is, without a copy.
pub fn clean(text: &str) -> Cow<'_, str> {
    escape_controls(text, |c, out| out.extend(c.escape_unicode()))
}

/// `text` with `escape` applied to each control character other than a line break or a
/// tab; borrowed when there is none.
fn escape_controls(text: &str, escape: impl Fn(char, &mut String)) -> Cow<'_, str> {
    let risky = |c: char| c.is_control() && c != '\n' && c != '\t';
    let Some(first) = text.find(risky) else {
        return Cow::Borrowed(text);
    };
    let mut out = String::with_capacity(text.len() + 16);
    out.push_str(&text[..first]);
    for c in text[first..].chars() {
        if risky(c) {
            escape(c, &mut out);
        } else {
            out.push(c);
        }
    }
    Cow::Owned(out)
}

/// The most rows of the text report's table without `--all-rows`.
pub const TABLE_ROWS_MOST: usize = 20;

/// Writes to standard output; a reader that has gone away (a closed pipe) ends the
/// output quietly instead of aborting.
///
/// # Errors
/// Any other failure to write (a full disk, say), for the caller to report.
pub fn say(text: &str) -> std::io::Result<()> {
    write_out(&clean(text))
}

/// `code` when the output was written, else the failure reported and the bad-output status.
pub fn said(name: &str, written: std::io::Result<()>, code: ExitCode) -> ExitCode {
    match said_ok(name, written) {
        Ok(()) => code,
        Err(failed) => failed,
    }
}

/// The output's failure to be written, reported, as the exit status to end with.
fn said_ok(name: &str, written: std::io::Result<()>) -> Result<(), ExitCode> {
    written.map_err(|e| {
        complain(&format!("latchwise {name}: cannot write the output: {e}"));
        ExitCode::from(EXIT_BAD_INPUT)
    })
}

/// Whether an output failure is the reader's going away (a closed pipe), which ends the
/// output quietly.
fn reader_gone(e: &serde_json::Error) -> bool {
    e.io_error_kind() == Some(std::io::ErrorKind::BrokenPipe)
}

/// Standard output as the JSON writers take it (a buffer in front, the text written as it
/// is serialised, no copy of the whole); a reader that has gone away ends it quietly.
///
/// # Errors
/// What `write` fails with, but for a closed pipe.
fn json_to_stdout(
    write: impl FnOnce(
        std::io::BufWriter<std::io::StdoutLock<'static>>,
    ) -> Result<(), serde_json::Error>,
) -> Result<(), serde_json::Error> {
    let out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
    match write(out) {
        Err(e) if reader_gone(&e) => Ok(()),
        r => r,
    }
}

/// A report as `--json` writes it: its audit stamp (the version and the inputs' digest)
/// first.
#[derive(serde::Serialize)]
struct Stamped<'a, R: serde::Serialize> {
    version: &'static str,
    input_sha256: &'a str,
    #[serde(flatten)]
    report: &'a R,
}

/// Writes a report as `--json` does, its bulk rows (if it has them apart) on more than
/// one thread.
struct JsonOut<'a> {
    digest: &'a str,
}

impl JsonOut<'_> {
    /// `report` with the stamp before it.
    fn stamped<'r, R: serde::Serialize>(&'r self, report: &'r R) -> Stamped<'r, R> {
        Stamped {
            version: env!("CARGO_PKG_VERSION"),
            input_sha256: self.digest,
            report,
        }
    }
}

impl<R: serde::Serialize> RowsApart<R> for JsonOut<'_> {
    type Out = Result<(), serde_json::Error>;

    fn whole(self, report: &R) -> Self::Out {
        json_to_stdout(|out| write_json(out, &self.stamped(report)))
    }

    fn apart<T: latchwise::json_line::JsonLine + Sync>(
        self,
        rest: &R,
        key: &'static str,
        rows: &[T],
    ) -> Self::Out {
        json_to_stdout(|out| write_json_apart(out, &self.stamped(rest), key, rows))
    }
}

fn write_out(text: &str) -> std::io::Result<()> {
    let mut out = std::io::stdout().lock();
    // A closed pipe is the reader's choice; any other failure is the caller's to report.
    match out.write_all(text.as_bytes()).and_then(|()| out.flush()) {
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        r => r,
    }
}

/// Writes one message line to standard error, every control character escaped (a line
/// break inside a message too).
pub fn complain(line: &str) {
    let one = clean(line).replace('\n', "\\n");
    let _ = writeln!(std::io::stderr().lock(), "{one}");
}

/// The human-readable report: inputs as understood, results, notes, warnings, caution.
pub fn text_report(title: &str, o: &Outcome, table: Option<&TextTable>) -> String {
    let width = o
        .readouts
        .iter()
        .map(|r| r.label.chars().count())
        .chain(o.inputs.iter().map(|(k, _)| k.chars().count()))
        .max()
        .unwrap_or(0)
        + 2;
    let mut s = format!("{title}\n\nInputs (as understood)\n");
    for (k, v) in &o.inputs {
        s.push_str(&format!("  {k:<width$}{v}\n"));
    }
    s.push_str("\nResults\n");
    for r in &o.readouts {
        let flag = match (r.name, r.state) {
            ("meets_target" | "meets_budget", "bad") => "  <-- MISSED",
            (_, "bad") => "  <--",
            _ => "",
        };
        s.push_str(&format!("  {:<width$}{}{flag}\n", r.label, r.text));
    }
    if let Some(t) = table {
        s.push_str(&format!("\n{}\n", t.title));
        let cols = t.header.len();
        let widths: Vec<usize> = (0..cols)
            .map(|c| {
                t.rows
                    .iter()
                    .map(|r| r[c].chars().count())
                    .chain([t.header[c].chars().count()])
                    .max()
                    .unwrap_or(0)
            })
            .collect();
        for row in std::iter::once(&t.header).chain(&t.rows) {
            let cells: Vec<String> = row
                .iter()
                .enumerate()
                .map(|(c, v)| {
                    // The first column (names) to the left, figures to the right.
                    if c == 0 {
                        format!("{v:<w$}", w = widths[c])
                    } else {
                        format!("{v:>w$}", w = widths[c])
                    }
                })
                .collect();
            s.push_str(&format!("  {}\n", cells.join("  ").trim_end()));
        }
        if t.total > t.rows.len() {
            s.push_str(&format!(
                "  ... and {} more (--all-rows lists every one; --results writes them to a file)\n",
                t.total - t.rows.len()
            ));
        }
    }
    if !o.unused.is_empty() {
        s.push_str(&format!(
            "\nNot used by this case: {}\n",
            o.unused.join(", ")
        ));
    }
    if !o.warnings.is_empty() {
        s.push_str("\nWarnings\n");
        for w in &o.warnings {
            s.push_str(&format!("  - {w}\n"));
        }
    }
    if !o.links.is_empty() {
        s.push_str("\nOpen in a calculator (relative to the site)\n");
        for (text, href) in &o.links {
            s.push_str(&format!("  {text}: {href}\n"));
        }
    }
    s.push('\n');
    for f in &o.facts {
        s.push_str(&format!("{f}\n"));
    }
    s.push_str(&format!("Caution: {CAUTION}\n"));
    s
}
