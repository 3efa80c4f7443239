//! Tables of data typed or pasted by the user (CSV with a header row): the delimiter is
//! found from the header, `#` lines are comments, blank lines are skipped, quoted cells
//! follow RFC 4180, and every cell is read in engineering notation for its column. Every
//! problem is reported at once with its line and column; nothing is half-read.

use std::borrow::Cow;
use std::cell::{Cell, RefCell};
use std::collections::HashMap;
use std::fmt;

use serde::Serialize;

use crate::error::ParamErrorKind;
use crate::params::FieldSpec;
use crate::units::Dim;

/// One column a table may have.
#[derive(Debug, Clone, Copy)]
pub struct Column {
    /// Its name in the header (case-insensitive).
    pub name: &'static str,
    /// The kind of its values.
    pub dim: Dim,
    /// Whether the table must have it.
    pub required: bool,
    /// Whether its values must be zero or more (else any sign).
    pub non_negative: bool,
    /// Whether its values must be above zero.
    pub positive: bool,
    /// Whether a cell may be left blank (read as absent).
    pub blank_ok: bool,
    /// The magnitudes the model can use, as a form field's limits: a non-zero value
    /// outside is refused with the same message.
    pub limits: (f64, f64),
}

impl Column {
    /// A required column of any sign, no blanks.
    pub const fn any(name: &'static str, dim: Dim) -> Column {
        Column {
            name,
            dim,
            required: true,
            non_negative: false,
            positive: false,
            blank_ok: false,
            limits: (0.0, f64::MAX),
        }
    }

    /// The column of a form field: its name, kind and limits, so that a cell is held to
    /// what the field would be held to.
    pub const fn of(spec: FieldSpec) -> Column {
        Column::any(spec.name, spec.dim).within(spec.limits.0, spec.limits.1)
    }

    /// The same column under another name (a field's limits for a column of its own).
    pub const fn renamed(mut self, name: &'static str) -> Column {
        self.name = name;
        self
    }

    /// The same column, its non-zero magnitudes limited to `lo..=hi`.
    pub const fn within(mut self, lo: f64, hi: f64) -> Column {
        self.limits = (lo, hi);
        self
    }

    /// The same column, values at least zero.
    pub const fn non_negative(mut self) -> Column {
        self.non_negative = true;
        self
    }

    /// The same column, values above zero.
    pub const fn positive(mut self) -> Column {
        self.non_negative = true;
        self.positive = true;
        self
    }

    /// The same column, not required, and its cells may be blank.
    pub const fn optional(mut self) -> Column {
        self.required = false;
        self.blank_ok = true;
        self
    }
}

/// A problem with one place of a table.
#[derive(Debug, Clone, PartialEq)]
pub struct CellError {
    /// The line in the text, 1-based (the header is line 1 of a table without comments).
    pub line: usize,
    /// The column's name, when the problem is in a column.
    pub column: Option<String>,
    /// What is wrong.
    pub message: String,
}

impl CellError {
    /// This problem as one of `table`'s (`design`, `corners`; empty for a field's one
    /// table).
    pub fn in_table(&self, table: &'static str) -> crate::error::TableProblem {
        crate::error::TableProblem {
            table,
            line: Some(self.line),
            columns: self.column.iter().cloned().collect(),
            message: self.message.clone(),
        }
    }
}

impl fmt::Display for CellError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.column {
            Some(c) => write!(f, "line {}, column {c}: {}", self.line, self.message),
            None => write!(f, "line {}: {}", self.line, self.message),
        }
    }
}

/// A table read in full: for each wanted column its cells (`None` where the table has no
/// such column), and the text line each row came from.
#[derive(Debug, Clone, PartialEq)]
pub struct Table {
    /// Number cells by wanted column (a blank cell is `None`).
    pub numbers: Vec<Option<Vec<Option<f64>>>>,
    /// Text cells by wanted column (for text columns).
    pub texts: Vec<Option<Vec<String>>>,
    /// The line of each row.
    pub lines: Vec<usize>,
    /// Columns of the user's own that the reader was asked to keep (see [`read_keeping`]):
    /// each its header name and its cells, as text, one per row.
    pub kept: Vec<(String, Vec<String>)>,
}

impl Table {
    /// The number of data rows.
    pub fn len(&self) -> usize {
        self.lines.len()
    }

    /// Whether there are no data rows.
    pub fn is_empty(&self) -> bool {
        self.lines.is_empty()
    }

    /// The values of wanted column `i`, blanks left out (empty when the table has none).
    pub fn column(&self, i: usize) -> Vec<f64> {
        self.numbers
            .get(i)
            .and_then(Option::as_ref)
            .map(|c| c.iter().flatten().copied().collect())
            .unwrap_or_default()
    }

    /// The cells of wanted column `i`, a blank as `None` (empty when the table has none).
    pub fn optional(&self, i: usize) -> Vec<Option<f64>> {
        self.numbers.get(i).cloned().flatten().unwrap_or_default()
    }

    /// Whether the table has wanted column `i`.
    pub fn has(&self, i: usize) -> bool {
        self.numbers.get(i).is_some_and(Option::is_some)
            || self.texts.get(i).is_some_and(Option::is_some)
    }

    /// The text cells of wanted column `i` (empty when the table has none).
    pub fn text(&self, i: usize) -> Vec<String> {
        self.texts.get(i).cloned().flatten().unwrap_or_default()
    }
}

/// Where a table's rows are in its text: what an editor of the table needs to change one
/// row's line and leave every other line (comments, blank lines) as it is.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Layout {
    /// The delimiter found from the header.
    pub delimiter: char,
    /// The header's line, 0-based (`None`: the text has no header yet).
    pub header: Option<usize>,
    /// Each data row's line, 0-based, in order.
    pub rows: Vec<usize>,
}

/// The text of a file's bytes, as a browser reads a dropped file: UTF-8 (a byte-order mark
/// dropped) or UTF-16 of either byte order when its byte-order mark says so; line ends
/// CR LF, LF or a lone CR (old spreadsheets on the Mac) all become LF.
///
/// # Errors
/// Bytes that are not UTF-8, or UTF-16 cut short or with an unpaired surrogate: the
/// message says where.
///
/// # Examples
/// ```
/// use latchwise::table::decode;
/// assert_eq!(decode(b"\xef\xbb\xbfname\rrow\r\n".to_vec()).unwrap(), "name\nrow\n");
/// assert_eq!(decode(b"\xff\xfea\0\r\0b\0".to_vec()).unwrap(), "a\nb");
/// assert!(decode(b"a\xffb".to_vec()).unwrap_err().contains("byte 2"));
/// ```
pub fn decode(mut bytes: Vec<u8>) -> Result<String, String> {
    let utf16 = |body: &[u8], big: bool| -> Result<String, String> {
        if body.len() % 2 == 1 {
            return Err("UTF-16 text cut short (an odd number of bytes)".to_string());
        }
        let units = body.chunks_exact(2).map(|p| {
            if big {
                u16::from_be_bytes([p[0], p[1]])
            } else {
                u16::from_le_bytes([p[0], p[1]])
            }
        });
        char::decode_utf16(units)
            .enumerate()
            .map(|(i, c)| {
                c.map_err(|_| {
                    format!(
                        "not UTF-16 text: an unpaired surrogate at character {}",
                        i + 1
                    )
                })
            })
            .collect()
    };
    let text = match bytes.get(..2) {
        Some([0xff, 0xfe]) => utf16(&bytes[2..], false)?,
        Some([0xfe, 0xff]) => utf16(&bytes[2..], true)?,
        _ => {
            // The byte-order mark is not text; the bytes become the string, no copy.
            let mark = if bytes.starts_with(b"\xef\xbb\xbf") {
                3
            } else {
                0
            };
            bytes.drain(..mark);
            String::from_utf8(bytes).map_err(|e| {
                let at = e.utf8_error().valid_up_to() + 1 + mark;
                format!("not UTF-8 or UTF-16 text (byte {at}); save the file as UTF-8")
            })?
        }
    };
    Ok(if text.contains('\r') {
        text.replace("\r\n", "\n").replace('\r', "\n")
    } else {
        text
    })
}

/// Whether a line is a comment: its first character is `#`, and nothing else makes one
/// (a row whose first cell is blank and whose second starts with `#` is a row).
pub fn is_comment(line: &str) -> bool {
    line.starts_with('#')
}

/// The lines that hold the table, 1-based with their text: not blank, not `#` comments.
/// A byte-order mark at the start of the text is not part of the first line.
fn content_lines(text: &str) -> impl Iterator<Item = (usize, &str)> {
    text.strip_prefix('\u{feff}')
        .unwrap_or(text)
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end_matches('\r')))
        .filter(|(_, l)| !l.trim().is_empty() && !is_comment(l))
}

/// The delimiter of a table from its header: the most frequent of comma, semicolon and
/// tab (comma when there is none).
fn delimiter(header: &str) -> char {
    [',', ';', '\t']
        .into_iter()
        .max_by_key(|d| header.matches(*d).count())
        .filter(|d| header.contains(*d))
        .unwrap_or(',')
}

/// Where the header and data rows of `text` are, as [`read`] finds them.
///
/// # Examples
/// ```
/// use latchwise::table::layout;
/// let l = layout("# chip\nname;fclk\n\na;1GHz\nb;2GHz\n");
/// assert_eq!((l.delimiter, l.header, l.rows), (';', Some(1), vec![3, 4]));
/// ```
pub fn layout(text: &str) -> Layout {
    let mut lines = content_lines(text);
    let Some((h, header)) = lines.next() else {
        return Layout {
            delimiter: ',',
            header: None,
            rows: Vec::new(),
        };
    };
    Layout {
        delimiter: delimiter(header),
        header: Some(h - 1),
        rows: lines.map(|(i, _)| i - 1).collect(),
    }
}

/// One row's cells as a line at `delim`, quoted as RFC 4180 does where a cell needs it
/// (a delimiter, a quote, spaces at its ends, or a `#` that would start a comment), so
/// that [`split`] reads the same cells back.
///
/// # Examples
/// ```
/// use latchwise::table::{join, split};
/// let row = vec!["bus \"a\", b".to_string(), "1GHz".to_string()];
/// let line = join(&row, ',');
/// assert_eq!(line, "\"bus \"\"a\"\", b\",1GHz");
/// assert_eq!(split(&line, ','), row);
/// ```
pub fn join(cells: &[String], delim: char) -> String {
    let line = cells
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let c = c.replace(['\n', '\r'], " ");
            let needs = c.contains(delim)
                || c.contains('"')
                || c.trim() != c
                || (i == 0 && c.starts_with('#'));
            if needs {
                format!("\"{}\"", c.replace('"', "\"\""))
            } else {
                c
            }
        })
        .collect::<Vec<_>>()
        .join(&delim.to_string());
    // A row of blank cells must not read as a blank line (which is skipped).
    if line.trim().is_empty() {
        format!("\"\"{line}")
    } else {
        line
    }
}

/// One line's cells at `delim`, as [`read`] splits them.
pub fn split(line: &str, delim: char) -> Vec<String> {
    cells(line, delim)
        .into_iter()
        .map(Cow::into_owned)
        .collect()
}

/// Splits one line into trimmed cells at `delim`, honouring double quotes ("" inside
/// quotes is a quote). A line without quotes is cut into slices of itself, with no copy.
fn cells(line: &str, delim: char) -> Vec<Cow<'_, str>> {
    let mut out = Vec::new();
    cells_into(line, delim, &mut out);
    out
}

/// [`cells`] into `out` (cleared first), so that a reader of many rows reuses one vector.
fn cells_into<'a>(line: &'a str, delim: char, out: &mut Vec<Cow<'a, str>>) {
    out.clear();
    if !line.contains('"') {
        if delim.is_ascii() {
            // One pass over the bytes: cells are short, where a search per cell costs
            // more than the cell.
            let (bytes, d) = (line.as_bytes(), delim as u8);
            let mut start = 0;
            for (i, &b) in bytes.iter().enumerate() {
                if b == d {
                    // Both ends are at an ASCII byte: char boundaries.
                    out.push(Cow::Borrowed(line[start..i].trim()));
                    start = i + 1;
                }
            }
            out.push(Cow::Borrowed(line[start..].trim()));
        } else {
            out.extend(line.split(delim).map(|c| Cow::Borrowed(c.trim())));
        }
        return;
    }
    out.extend(quoted_cells(line, delim));
}

/// The cells of a line with quotes in it.
fn quoted_cells(line: &str, delim: char) -> Vec<Cow<'_, str>> {
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut quoted = false;
    let mut chars = line.chars().peekable();
    while let Some(c) = chars.next() {
        match (c, quoted) {
            ('"', true) if chars.peek() == Some(&'"') => {
                cur.push('"');
                chars.next();
            }
            ('"', _) => quoted = !quoted,
            (c, false) if c == delim => out.push(std::mem::take(&mut cur)),
            (c, _) => cur.push(c),
        }
    }
    out.push(cur);
    out.into_iter()
        .map(|c| Cow::Owned(c.trim().to_string()))
        .collect()
}

/// One wanted column's cell of a row, as read.
#[derive(Debug, Clone, PartialEq)]
enum RowCell {
    /// The table has no such column, or the cell could not be read.
    Absent,
    /// A text cell.
    Text(String),
    /// A number cell (`None`: blank where blanks are allowed).
    Number(Option<f64>),
}

/// A row read: its cells by wanted column, or its problems as (column, message).
type Parsed = Result<Vec<RowCell>, Vec<(Option<&'static str>, String)>>;

/// A fast hash for the remembered lines (the multiply-rotate hash of the Rust compiler's
/// own tables): the keys are the user's own text, so resistance to crafted collisions,
/// which the standard hash buys with speed, is not needed here.
#[derive(Default, Clone, Copy)]
pub struct LineHasher(u64);

impl std::hash::Hasher for LineHasher {
    fn write(&mut self, bytes: &[u8]) {
        for chunk in bytes.chunks(8) {
            let mut word = [0u8; 8];
            word[..chunk.len()].copy_from_slice(chunk);
            self.0 = (self.0.rotate_left(5) ^ u64::from_le_bytes(word))
                .wrapping_mul(0x51_7c_c1_b7_27_22_0a_95);
        }
    }

    fn finish(&self) -> u64 {
        self.0
    }
}

/// A map keyed by the user's own text, with [`LineHasher`].
pub type TextMap<K, V> = HashMap<K, V, std::hash::BuildHasherDefault<LineHasher>>;

/// Remembered lines of one table.
type Lines = HashMap<String, Parsed, std::hash::BuildHasherDefault<LineHasher>>;

thread_local! {
    /// Whether [`read`] remembers the rows it read (see [`remember_rows`]).
    static REMEMBER: Cell<bool> = const { Cell::new(false) };
    /// The rows last read, by table (its columns, delimiter and header) and line text.
    static REMEMBERED: RefCell<HashMap<String, Lines>> = RefCell::new(HashMap::new());
}

/// Makes [`read`] remember each line it reads (or stop remembering), so that reading the
/// same table again with a few lines changed reads only those lines: a page reads its
/// design again on every edit. Results are the same either way; the command line, which
/// reads each table once, leaves it off.
pub fn remember_rows(on: bool) {
    REMEMBER.with(|r| r.set(on));
}

/// Whether reads are remembered (see [`remember_rows`]): a page reading its tables again
/// on every edit.
pub fn remembering() -> bool {
    REMEMBER.with(Cell::get)
}

/// Reads one data line: each wanted column's cell, or every problem of the line.
fn parse_row<'a>(
    text: &'a str,
    delim: char,
    width: usize,
    at: &[Option<usize>],
    columns: &[Column],
    row: &mut Vec<Cow<'a, str>>,
) -> Parsed {
    cells_into(text, delim, row);
    if row.len() != width {
        return Err(vec![(
            None,
            format!("{} cells, the header has {}", row.len(), width),
        )]);
    }
    let mut out = Vec::with_capacity(columns.len());
    let mut problems = Vec::new();
    for (k, c) in columns.iter().enumerate() {
        let Some(i) = at[k] else {
            out.push(RowCell::Absent);
            continue;
        };
        let cell = &row[i];
        if c.dim == Dim::Text {
            out.push(RowCell::Text(cell.to_string()));
            continue;
        }
        if c.blank_ok && cell.is_empty() {
            out.push(RowCell::Number(None));
            continue;
        }
        let spec = FieldSpec {
            name: c.name,
            dim: c.dim,
            help: "",
            limits: c.limits,
            usual: (0.0, f64::MAX),
        };
        let v = match spec.parse(cell) {
            Ok(v) if c.non_negative && v < 0.0 => {
                Err(format!("'{}' is negative", crate::error::short(cell)))
            }
            Ok(v) if c.positive && v <= 0.0 => Err("must be above zero".to_string()),
            Ok(v) => Ok(v),
            Err(e) => Err(match e.kind {
                ParamErrorKind::Missing => "the cell is empty".to_string(),
                _ => e
                    .to_string()
                    .split_once(": ")
                    .map_or(e.to_string(), |(_, m)| m.to_string()),
            }),
        };
        match v {
            Ok(v) => out.push(RowCell::Number(Some(v))),
            Err(message) => {
                problems.push((Some(c.name), message));
                out.push(RowCell::Absent);
            }
        }
    }
    if problems.is_empty() {
        Ok(out)
    } else {
        Err(problems)
    }
}

/// The most problems of one table that are listed; the rest are counted in one more line.
pub const PROBLEMS_MOST: usize = 40;

/// Reads `text` as a table with the given columns.
///
/// # Errors
/// Every problem found: an empty table, a missing or unknown or repeated column, a row
/// with too few or too many cells, an unreadable or negative cell.
///
/// # Examples
/// ```
/// use latchwise::table::{read, Column};
/// use latchwise::units::Dim;
/// let cols = [Column::any("tr", Dim::Time).non_negative()];
/// let t = read("# a comment\ntr\n1ns\n\n2 ns\n", &cols).unwrap();
/// assert_eq!(t.column(0), &[1e-9, 2e-9]);
/// assert_eq!(t.lines, vec![3, 5]);
/// let e = read("tr\nfast\n", &cols).unwrap_err();
/// assert_eq!(e[0].to_string(), "line 2, column tr: 'fast' is not a number (write e.g. 20p, 20 ps, 2e-11 or 1.5GHz)");
/// ```
pub fn read(text: &str, columns: &[Column]) -> Result<Table, Vec<CellError>> {
    read_keeping(text, columns, |_| None)
}

/// As [`read`], and columns of the user's own that `keep` accepts (say, notes) are kept
/// as text instead of refused; for any other unknown column `keep` may give a hint that
/// the message adds (how to carry such a column).
///
/// # Errors
/// As [`read`].
pub fn read_keeping(
    text: &str,
    columns: &[Column],
    keep: impl Fn(&str) -> Option<Result<(), &'static str>>,
) -> Result<Table, Vec<CellError>> {
    let mut errors = Vec::new();
    let mut lines = content_lines(text);
    let Some((header_line, header)) = lines.next() else {
        return Err(vec![CellError {
            line: 1,
            column: None,
            message: "the table is empty: give a header row naming the columns, then data rows"
                .into(),
        }]);
    };
    let delim = delimiter(header);
    let names: Vec<String> = cells(header, delim)
        .iter()
        .map(|n| n.to_ascii_lowercase())
        .collect();
    let known: Vec<&str> = columns.iter().map(|c| c.name).collect();
    let mut at: Vec<Option<usize>> = vec![None; columns.len()];
    let mut kept_at: Vec<(String, usize)> = Vec::new();
    for (i, n) in names.iter().enumerate() {
        match columns.iter().position(|c| c.name == n) {
            None if keep(n) == Some(Ok(())) => {
                if kept_at.iter().any(|(k, _)| k == n) {
                    errors.push(CellError {
                        line: header_line,
                        column: Some(n.clone()),
                        message: "the column is named twice".into(),
                    });
                } else {
                    kept_at.push((n.clone(), i));
                }
            }
            Some(k) if at[k].is_some() => errors.push(CellError {
                line: header_line,
                column: Some(n.clone()),
                message: "the column is named twice".into(),
            }),
            Some(k) => at[k] = Some(i),
            None => errors.push(CellError {
                line: header_line,
                column: Some(if n.is_empty() {
                    "(blank)".into()
                } else {
                    n.clone()
                }),
                message: match keep(n) {
                    Some(Err(hint)) => {
                        format!("unknown column (known: {}); {hint}", known.join(", "))
                    }
                    _ => format!("unknown column (known: {})", known.join(", ")),
                },
            }),
        }
    }
    for (k, c) in columns.iter().enumerate() {
        if c.required && at[k].is_none() {
            errors.push(CellError {
                line: header_line,
                column: Some(c.name.into()),
                message: "the column is missing".into(),
            });
        }
    }
    // Room for every line as a row, so that long tables are not copied as they grow.
    let most_rows = text.bytes().filter(|&b| b == b'\n').count() + 1;
    let mut values: Vec<Option<Vec<Option<f64>>>> = at
        .iter()
        .zip(columns)
        .map(|(a, c)| {
            a.filter(|_| c.dim != Dim::Text)
                .map(|_| Vec::with_capacity(most_rows))
        })
        .collect();
    let mut texts: Vec<Option<Vec<String>>> = at
        .iter()
        .zip(columns)
        .map(|(a, c)| a.filter(|_| c.dim == Dim::Text).map(|_| Vec::new()))
        .collect();
    let mut rows = Vec::with_capacity(most_rows);
    let mut kept: Vec<(String, Vec<String>)> = kept_at
        .iter()
        .map(|(n, _)| (n.clone(), Vec::new()))
        .collect();
    let mut keep_row = |text: &str| {
        if kept_at.is_empty() {
            return;
        }
        let row = cells(text, delim);
        for (k, (_, i)) in kept_at.iter().enumerate() {
            kept[k]
                .1
                .push(row.get(*i).map(|c| c.to_string()).unwrap_or_default());
        }
    };
    let mut remembered = REMEMBER.with(Cell::get).then(|| {
        let key = format!("{}\u{0}{}\u{0}{header}", known.join(","), delim);
        REMEMBERED.with(|r| {
            let old: Lines = r.borrow_mut().remove(&key).unwrap_or_default();
            let new = Lines::with_capacity_and_hasher(old.len(), Default::default());
            (key, old, new)
        })
    });
    let mut row_cells = Vec::with_capacity(names.len());
    for (line, text) in lines {
        let parsed = match remembered.as_mut() {
            Some((_, old, new)) => {
                let (key, p) = match old.remove_entry(text) {
                    Some(kept) => kept,
                    None => (
                        text.to_string(),
                        parse_row(text, delim, names.len(), &at, columns, &mut row_cells),
                    ),
                };
                let p: &Parsed = new.entry(key).or_insert(p);
                Cow::Borrowed(p)
            }
            None => Cow::Owned(parse_row(
                text,
                delim,
                names.len(),
                &at,
                columns,
                &mut row_cells,
            )),
        };
        match parsed.as_ref() {
            Err(problems) => {
                errors.extend(problems.iter().map(|(column, message)| CellError {
                    line,
                    column: column.map(str::to_string),
                    message: message.clone(),
                }));
                if problems.iter().any(|(c, _)| c.is_none()) {
                    continue;
                }
                // A row with bad cells still counts as a row.
                rows.push(line);
                keep_row(text);
            }
            Ok(cells) => {
                rows.push(line);
                keep_row(text);
                for (k, cell) in cells.iter().enumerate() {
                    match cell {
                        RowCell::Absent => {}
                        RowCell::Text(t) => {
                            if let Some(col) = texts[k].as_mut() {
                                col.push(t.clone());
                            }
                        }
                        RowCell::Number(v) => {
                            if let Some(col) = values[k].as_mut() {
                                col.push(*v);
                            }
                        }
                    }
                }
            }
        }
    }
    if let Some((key, _, new)) = remembered {
        REMEMBERED.with(|r| {
            let mut r = r.borrow_mut();
            // A few tables at most (a page's design and corners); the rest are dropped.
            if r.len() >= 4 {
                r.clear();
            }
            r.insert(key, new);
        });
    }
    if rows.is_empty() && errors.is_empty() {
        errors.push(CellError {
            line: header_line,
            column: None,
            message: "the table has a header but no data rows".into(),
        });
    }
    if errors.len() > PROBLEMS_MOST {
        let rest = errors.len() - PROBLEMS_MOST;
        let line = errors[PROBLEMS_MOST].line;
        errors.truncate(PROBLEMS_MOST);
        errors.push(CellError {
            line,
            column: None,
            message: format!(
                "and {rest} more problem{} from here on (the first {PROBLEMS_MOST} are listed)",
                if rest == 1 { "" } else { "s" }
            ),
        });
    }
    if errors.is_empty() {
        Ok(Table {
            numbers: values,
            texts,
            lines: rows,
            kept,
        })
    } else {
        Err(errors)
    }
}
