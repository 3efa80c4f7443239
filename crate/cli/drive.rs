//! The one driver of every calculator command: options, help, errors, the text report
//! printed from the core's readouts (the labels the pages show), JSON, and exit status.

use std::borrow::Cow;
use std::io::Write;

use serde_json::ser::{CompactFormatter, Formatter, PrettyFormatter};
use std::process::ExitCode;

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
         target was given and is not met, 2 bad input.\n\nCaution: {CAUTION}\n",
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
        say(&help::<C>());
        return ExitCode::SUCCESS;
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
        say(&format!("{text}\n"));
    } else {
        let table = C::text_table(&report, (!parsed.all_rows).then_some(TABLE_ROWS_MOST));
        if parsed.all_rows && table.is_none() {
            complain(&format!(
                "latchwise {name}: --all-rows: this command has no table of rows (the budget has)"
            ));
            return ExitCode::from(EXIT_BAD_INPUT);
        }
        say(&text_report(C::TITLE, &outcome, table.as_ref()));
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
pub fn say(text: &str) {
    write_out(&clean(text));
}

/// Writes `value` as pretty JSON to standard output as it is serialised (no copy of the
/// whole text), with the control characters that JSON strings may hold raw (DEL and the
/// C1 range; serde_json escapes the rest) written as `\\u` escapes, which keep it valid
/// JSON and inert on a terminal. A reader that has gone away ends the output quietly.
///
/// # Errors
/// A value that cannot be serialised.
pub fn say_json(value: &impl serde::Serialize) -> Result<(), serde_json::Error> {
    let out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
    match write_json(out, value) {
        Err(e) if e.is_io() => Ok(()),
        r => r,
    }
}

/// `value` as [`say_json`] writes it, to `out`, with a line end.
///
/// # Errors
/// A value that cannot be serialised, or an output that fails.
fn write_json<W: Write>(out: W, value: &impl serde::Serialize) -> Result<(), serde_json::Error> {
    let mut ser = serde_json::Serializer::with_formatter(out, Inert(PrettyFormatter::new(), 0));
    value.serialize(&mut ser)?;
    let mut out = ser.into_inner();
    out.write_all(b"\n")
        .and_then(|()| out.flush())
        .map_err(serde_json::Error::io)
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

impl<R: serde::Serialize> RowsApart<R> for JsonOut<'_> {
    type Out = Result<(), serde_json::Error>;

    fn whole(self, report: &R) -> Self::Out {
        say_json(&Stamped {
            version: env!("CARGO_PKG_VERSION"),
            input_sha256: self.digest,
            report,
        })
    }

    fn apart<T: serde::Serialize + Sync>(
        self,
        rest: &R,
        key: &'static str,
        rows: &[T],
    ) -> Self::Out {
        let stamped = Stamped {
            version: env!("CARGO_PKG_VERSION"),
            input_sha256: self.digest,
            report: rest,
        };
        let out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
        match write_json_apart(out, &stamped, key, rows) {
            Err(e) if e.is_io() => Ok(()),
            r => r,
        }
    }
}

/// The rows written at a time by each of the two writers of [`write_json_apart`] (about
/// 1.4 MB of a budget's rows).
const ROWS_PER_BLOCK: usize = 4096;

/// Writes `rest` as [`say_json`] does, with `rows` in place of its empty array under
/// `key` (a key at the top level): the same bytes as writing the whole report at once,
/// with the rows written by two threads in turns, block by block: this one writes its
/// blocks straight out, the other into two buffers that this one writes out between its
/// own (buffers used again, so that the memory stays small and warm).
///
/// # Errors
/// A value that cannot be serialised, an output that fails, or `rest` without an empty
/// array under `key`.
pub fn write_json_apart<W: Write, R: serde::Serialize, T: serde::Serialize + Sync>(
    mut out: W,
    rest: &R,
    key: &str,
    rows: &[T],
) -> Result<(), serde_json::Error> {
    use serde::ser::Error;
    let mut head = Vec::new();
    rest.serialize(&mut serde_json::Serializer::with_formatter(
        &mut head,
        Inert(PrettyFormatter::new(), 0),
    ))?;
    // The top level's keys are on lines of their own, indented by two spaces; a string
    // cannot hold a raw line break, so this is the key itself.
    let marker = format!("\n  \"{key}\": []");
    let Some(at) = head
        .windows(marker.len())
        .position(|w| w == marker.as_bytes())
    else {
        return Err(serde_json::Error::custom(format!(
            "the report has no empty '{key}' to fill"
        )));
    };
    let bracket = at + marker.len() - 1;
    let io = serde_json::Error::io;
    out.write_all(&head[..bracket]).map_err(io)?;
    if !rows.is_empty() {
        let blocks: Vec<&[T]> = rows.chunks(ROWS_PER_BLOCK).collect();
        let two =
            blocks.len() > 1 && std::thread::available_parallelism().is_ok_and(|n| n.get() > 1);
        std::thread::scope(|s| -> Result<(), serde_json::Error> {
            // The other writer takes the odd blocks; its buffers come back to it once
            // written out. Either side stopping (an error, a reader gone) stops the other.
            let (full_tx, full_rx) =
                std::sync::mpsc::sync_channel::<Result<Vec<u8>, serde_json::Error>>(2);
            let (free_tx, free_rx) = std::sync::mpsc::channel::<Vec<u8>>();
            let helper = if two {
                for _ in 0..2 {
                    let _ = free_tx.send(Vec::new());
                }
                let odd = &blocks;
                std::thread::Builder::new()
                    .spawn_scoped(s, move || {
                        for k in (1..odd.len()).step_by(2) {
                            let Ok(mut buf) = free_rx.recv() else { return };
                            buf.clear();
                            let done =
                                write_rows(&mut buf, odd[k], k * ROWS_PER_BLOCK).map(|()| buf);
                            if full_tx.send(done).is_err() {
                                return;
                            }
                        }
                    })
                    .is_ok()
            } else {
                false
            };
            for (k, block) in blocks.iter().enumerate() {
                if helper && k % 2 == 1 {
                    let buf = full_rx
                        .recv()
                        .map_err(|_| serde_json::Error::custom("a JSON writer thread failed"))??;
                    out.write_all(&buf).map_err(io)?;
                    let _ = free_tx.send(buf);
                } else {
                    write_rows(&mut out, block, k * ROWS_PER_BLOCK)?;
                }
            }
            Ok(())
        })?;
        out.write_all(b"\n  ").map_err(io)?;
    }
    out.write_all(&head[bracket..]).map_err(io)?;
    out.write_all(b"\n").and_then(|()| out.flush()).map_err(io)
}

/// Rows of the report's top-level array, as [`Inert`] lays them out: a line each, the
/// first of the whole array (`first` is the index of `rows[0]` in it) without a comma.
fn write_rows<W: Write, T: serde::Serialize>(
    w: &mut W,
    rows: &[T],
    first: usize,
) -> Result<(), serde_json::Error> {
    for (i, row) in rows.iter().enumerate() {
        let sep: &[u8] = if first + i == 0 {
            b"\n    "
        } else {
            b",\n    "
        };
        w.write_all(sep).map_err(serde_json::Error::io)?;
        row.serialize(&mut serde_json::Serializer::with_formatter(
            &mut *w,
            Inert(PrettyFormatter::new(), COMPACT_FROM),
        ))?;
    }
    Ok(())
}

/// Pretty JSON whose strings carry no raw DEL or C1 control character, and whose deeper
/// values (each row of a report's arrays, with what it holds) are written on one line:
/// 100,000 rows stay readable one per line at half the bytes.
struct Inert(PrettyFormatter<'static>, usize);

/// The nesting from which values are written compactly: inside the elements of the
/// report's own arrays.
const COMPACT_FROM: usize = 2;

impl Inert {
    /// Whether the value being opened at the current depth is written compactly.
    fn opening_compact(&self) -> bool {
        self.1 >= COMPACT_FROM
    }
    /// Whether the current container's separators are compact.
    fn inside_compact(&self) -> bool {
        self.1 > COMPACT_FROM
    }
}

impl Formatter for Inert {
    fn write_string_fragment<W: ?Sized + Write>(
        &mut self,
        w: &mut W,
        fragment: &str,
    ) -> std::io::Result<()> {
        // DEL is the byte 0x7f and every C1 character starts with the byte 0xc2 in UTF-8:
        // a fragment with neither (nearly all) is written as it is. The test for ASCII and
        // the search for one byte are the standard library's word-at-a-time scans.
        let bytes = fragment.as_bytes();
        let plain = if bytes.is_ascii() {
            !bytes.contains(&0x7f)
        } else {
            !bytes.iter().any(|&b| b == 0x7f || b == 0xc2)
        };
        if plain {
            return w.write_all(bytes);
        }
        let risky = |c: char| c == '\u{7f}' || ('\u{80}'..='\u{9f}').contains(&c);
        let mut rest = fragment;
        while let Some(at) = rest.find(risky) {
            w.write_all(&rest.as_bytes()[..at])?;
            let c = rest[at..].chars().next().unwrap_or(' ');
            write!(w, "\\u{:04x}", u32::from(c))?;
            rest = &rest[at + c.len_utf8()..];
        }
        w.write_all(rest.as_bytes())
    }
    fn begin_array<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        let r = if self.opening_compact() {
            CompactFormatter.begin_array(w)
        } else {
            self.0.begin_array(w)
        };
        self.1 += 1;
        r
    }
    fn end_array<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        self.1 -= 1;
        if self.opening_compact() {
            CompactFormatter.end_array(w)
        } else {
            self.0.end_array(w)
        }
    }
    fn begin_array_value<W: ?Sized + Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        if self.inside_compact() {
            CompactFormatter.begin_array_value(w, first)
        } else {
            self.0.begin_array_value(w, first)
        }
    }
    fn end_array_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        if self.inside_compact() {
            CompactFormatter.end_array_value(w)
        } else {
            self.0.end_array_value(w)
        }
    }
    fn begin_object<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        let r = if self.opening_compact() {
            CompactFormatter.begin_object(w)
        } else {
            self.0.begin_object(w)
        };
        self.1 += 1;
        r
    }
    fn end_object<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        self.1 -= 1;
        if self.opening_compact() {
            CompactFormatter.end_object(w)
        } else {
            self.0.end_object(w)
        }
    }
    fn begin_object_key<W: ?Sized + Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        if self.inside_compact() {
            CompactFormatter.begin_object_key(w, first)
        } else {
            self.0.begin_object_key(w, first)
        }
    }
    fn begin_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        if self.inside_compact() {
            CompactFormatter.begin_object_value(w)
        } else {
            self.0.begin_object_value(w)
        }
    }
    fn end_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        if self.inside_compact() {
            CompactFormatter.end_object_value(w)
        } else {
            self.0.end_object_value(w)
        }
    }
}

fn write_out(text: &str) {
    let mut out = std::io::stdout().lock();
    // A closed pipe is the reader's choice; any other failure has nowhere to be told.
    let _ = out.write_all(text.as_bytes()).and_then(|()| out.flush());
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

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(serde::Serialize)]
    struct Row {
        name: String,
        x: f64,
        corners: Vec<(String, f64)>,
    }

    #[derive(serde::Serialize)]
    struct Report {
        title: String,
        nested: Vec<std::collections::BTreeMap<String, Vec<u8>>>,
        rows: Vec<Row>,
        after: Option<Vec<u32>>,
    }

    /// The rows written apart, by two threads in blocks, give the bytes of the whole
    /// report written at once: for no row, one, a block and one either side of it, and
    /// several blocks, odd and even in number; with names holding control characters,
    /// quotes and the key's own text (escaped inside a string, so never taken for it).
    #[test]
    fn rows_written_apart_are_the_bytes_of_the_whole_report() {
        let names = [
            "plain",
            "line\n  \"rows\": []",
            "del\u{7f} c1\u{85} esc\u{1b}",
            "quote\" back\\",
            "",
        ];
        for n in [
            0,
            1,
            2,
            ROWS_PER_BLOCK - 1,
            ROWS_PER_BLOCK,
            ROWS_PER_BLOCK + 1,
            2 * ROWS_PER_BLOCK + 7,
            3 * ROWS_PER_BLOCK,
        ] {
            let rows: Vec<Row> = (0..n)
                .map(|i| Row {
                    name: format!("{}{i}", names[i % names.len()]),
                    x: (i as f64).mul_add(0.1, -3.0) * 1e-7,
                    corners: vec![("slow\u{9f}".into(), -(i as f64)), ("fast".into(), 1.5)],
                })
                .collect();
            let mut nested = std::collections::BTreeMap::new();
            nested.insert("rows".to_string(), Vec::new());
            let mut report = Report {
                title: "a\n  \"rows\": []".into(),
                nested: vec![nested],
                rows,
                after: Some(vec![1, 2]),
            };
            let mut whole = Vec::new();
            write_json(&mut whole, &report).unwrap();
            let rows = std::mem::take(&mut report.rows);
            let mut apart = Vec::new();
            write_json_apart(&mut apart, &report, "rows", &rows).unwrap();
            assert!(
                whole == apart,
                "{n} rows:\n{}\n---\n{}",
                String::from_utf8_lossy(&whole),
                String::from_utf8_lossy(&apart)
            );
            let v: serde_json::Value = serde_json::from_slice(&apart).unwrap();
            assert_eq!(v["rows"].as_array().map(Vec::len), Some(n));
        }
    }

    /// A report without an empty array under the key is refused, not written short.
    #[test]
    fn rows_apart_need_their_empty_array() {
        let report = Report {
            title: String::new(),
            nested: Vec::new(),
            rows: Vec::new(),
            after: None,
        };
        let rows = [Row {
            name: "a".into(),
            x: 1.0,
            corners: Vec::new(),
        }];
        let mut out = Vec::new();
        let e = write_json_apart(&mut out, &report, "crossings", &rows).unwrap_err();
        assert!(e.to_string().contains("no empty 'crossings'"), "{e}");
    }
}
