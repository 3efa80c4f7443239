//! The JSON the command line writes (`--json`): pretty at the top level, each element of
//! the report's arrays on a line of its own, strings inert on a terminal, and a report's
//! bulk rows written by their own code on two threads.

use std::io::Write;

use serde_json::ser::{CompactFormatter, Formatter, PrettyFormatter};

use latchwise::json_line::{JsonLine, Line};

/// `value` as the command's `--json` writes it, to `out`, with a line end: pretty at the
/// top, each element of the top-level arrays on one line, no raw DEL or C1 character.
///
/// # Errors
/// A value that cannot be serialised, or an output that fails.
pub fn write_json<W: Write>(
    out: W,
    value: &impl serde::Serialize,
) -> Result<(), serde_json::Error> {
    let mut ser = serde_json::Serializer::with_formatter(out, Inert(PrettyFormatter::new(), 0));
    value.serialize(&mut ser)?;
    let mut out = ser.into_inner();
    out.write_all(b"\n")
        .and_then(|()| out.flush())
        .map_err(serde_json::Error::io)
}

/// The rows written at a time by each of the two writers of [`write_json_apart`] (about
/// 1.4 MB of a budget's rows).
const ROWS_PER_BLOCK: usize = 4096;

/// Writes `rest` as [`write_json`] does, with `rows` in place of its empty array under
/// `key` (a key at the top level): the same bytes as writing the whole report at once,
/// with the rows written by two threads in turns, block by block: this one writes its
/// blocks straight out, the other into two buffers that this one writes out between its
/// own (buffers used again, so that the memory stays small and warm).
///
/// # Errors
/// A value that cannot be serialised, an output that fails, or `rest` without an empty
/// array under `key`.
pub fn write_json_apart<W: Write, R: serde::Serialize, T: JsonLine + Sync>(
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
fn write_rows<W: Write, T: JsonLine>(
    w: &mut W,
    rows: &[T],
    first: usize,
) -> Result<(), serde_json::Error> {
    // Each row is put together in a small buffer that stays in the cache, then handed on
    // in one piece: far fewer, larger writes than the serialiser's own.
    let mut line = Vec::with_capacity(1024);
    for (i, row) in rows.iter().enumerate() {
        line.clear();
        line.extend_from_slice(if first + i == 0 {
            b"\n    "
        } else {
            b",\n    "
        });
        row.json_line(&mut Line(&mut line));
        w.write_all(&line).map_err(serde_json::Error::io)?;
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

/// `$method` of the compact formatter where `$compact` holds, else of the pretty one.
macro_rules! either {
    ($s:ident, $compact:expr, $method:ident($($arg:expr),*)) => {
        if $compact {
            CompactFormatter.$method($($arg),*)
        } else {
            $s.0.$method($($arg),*)
        }
    };
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
        let r = either!(self, self.opening_compact(), begin_array(w));
        self.1 += 1;
        r
    }
    fn end_array<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        self.1 -= 1;
        either!(self, self.opening_compact(), end_array(w))
    }
    fn begin_array_value<W: ?Sized + Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        either!(self, self.inside_compact(), begin_array_value(w, first))
    }
    fn end_array_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        either!(self, self.inside_compact(), end_array_value(w))
    }
    fn begin_object<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        let r = either!(self, self.opening_compact(), begin_object(w));
        self.1 += 1;
        r
    }
    fn end_object<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        self.1 -= 1;
        either!(self, self.opening_compact(), end_object(w))
    }
    fn begin_object_key<W: ?Sized + Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        either!(self, self.inside_compact(), begin_object_key(w, first))
    }
    fn begin_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        either!(self, self.inside_compact(), begin_object_value(w))
    }
    fn end_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> std::io::Result<()> {
        either!(self, self.inside_compact(), end_object_value(w))
    }
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

    impl JsonLine for Row {
        fn json_line(&self, line: &mut Line<'_>) {
            let Row { name, x, corners } = self;
            line.raw("{\"name\":");
            line.str(name);
            line.raw(",\"x\":");
            line.f64(*x);
            line.raw(",\"corners\":[");
            for (i, (c, v)) in corners.iter().enumerate() {
                line.raw(if i == 0 { "[" } else { ",[" });
                line.str(c);
                line.raw(",");
                line.f64(*v);
                line.raw("]");
            }
            line.raw("]}");
        }
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

    /// The command writes a budget's rows by hand (two threads, each row by its own code):
    /// the bytes are those of the whole report serialised at once, for rows of every kind
    /// (related clocks, a cell class, a domain, warnings, notes, a row given by tr, names
    /// with quotes, control characters and non-ASCII text), at three corners and at one, and
    /// for rows holding values JSON cannot carry (written as null, as serde_json does).
    #[test]
    fn rows_written_by_hand_are_the_serialised_rows() {
        use latchwise::budget::report::{RowCorner, RowFit};
        use latchwise::budget::BudgetCalculator;
        use latchwise::calculator::Calculator;
        use latchwise::params::RawInputs;
        use serde_json::Value;
        let design =
            "name,fclk,fdata,stages,count,width,ratio,jitter,cell,domain,tr,note,note:owner\n\
            \"q\"\"uote\u{7f}\u{85}\u{1b}\",1.2GHz,2MHz,2,16,1,,,,core,,a note,ana\n\
            rel,400MHz,10MHz,2,4,1,5/16,20ps,,,,,\n\
            fast,1.2GHz,300MHz,1,8,2,,,fastsync,,,,\n\
            bytr,1GHz,1MHz,,1,1,,,,,500ps,,\n\
            \u{e9}t\u{e9} \u{20ac},3GHz,100MHz,3,3,1,,,,,,,\n\
            far,125MHz,20MHz,2,1,1,,,,,,,\n";
        let corners = std::fs::read_to_string(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/examples/budget-corners.csv"
        ))
        .unwrap();
        let one_corner = [
            ("tau", "20ps"),
            ("tw", "40ps"),
            ("tsu", "30ps"),
            ("tcq", "50ps"),
        ];
        let check = |mut report: latchwise::budget::BudgetReport| {
            let mut whole = Vec::new();
            write_json(&mut whole, &report).unwrap();
            let rows = std::mem::take(&mut report.rows);
            let mut apart = Vec::new();
            write_json_apart(&mut apart, &report, "rows", &rows).unwrap();
            assert!(
                whole == apart,
                "by hand:\n{}\nserialised:\n{}",
                String::from_utf8_lossy(&apart),
                String::from_utf8_lossy(&whole)
            );
            serde_json::from_slice::<Value>(&apart).unwrap()
        };
        for (corners, pairs) in [(Some(corners.as_str()), &[][..]), (None, &one_corner[..])] {
            let mut all = vec![("design".to_string(), design.to_string())];
            if let Some(c) = corners {
                all.push(("corners".into(), c.into()));
            }
            all.extend(pairs.iter().map(|(k, v)| (k.to_string(), v.to_string())));
            let case = BudgetCalculator::read(&RawInputs::from_pairs(all)).unwrap();
            let v = check(BudgetCalculator::evaluate(&case));
            let rows = v["rows"].as_array().unwrap();
            assert_eq!(rows.len(), 6);
            for key in ["clock_factor", "cell", "domain", "warnings", "notes"] {
                assert!(
                    rows.iter().any(|r| r.get(key).is_some()),
                    "no row has {key}"
                );
            }
        }
        // Rows made by hand, with what no evaluation gives: non-finite values, a count past
        // 2^53, a negative zero, no corners.
        let case = BudgetCalculator::read(&RawInputs::from_pairs([
            (
                "design".to_string(),
                "name,fclk,fdata,stages\na,1GHz,1MHz,2\n".to_string(),
            ),
            ("tau".into(), "20ps".into()),
            ("tw".into(), "40ps".into()),
            ("tsu".into(), "30ps".into()),
            ("tcq".into(), "50ps".into()),
        ]))
        .unwrap();
        let mut report = BudgetCalculator::evaluate(&case);
        let row = report.rows[0].clone();
        for (i, x) in [
            f64::NAN,
            f64::INFINITY,
            -0.0,
            1e300,
            9_007_199_254_740_993.0,
            0.5,
        ]
        .into_iter()
        .enumerate()
        {
            report.rows.push(RowFit {
                name: format!("made {i}"),
                count: x,
                width: x,
                flip_flops: x,
                fdata_hz: x,
                clock_factor: Some(x),
                log10_clock_factor: Some(x),
                corners: if i % 2 == 0 {
                    Vec::new()
                } else {
                    vec![RowCorner {
                        name: "c\u{9f}".into(),
                        log10_fit: x,
                    }]
                },
                log10_fit: x,
                share: x,
                ..row.clone()
            });
        }
        check(report);
    }

    /// A string by the rows' own code is escaped as the serialiser escapes it, for every
    /// character up to U+07FF and a few beyond, alone and between others.
    #[test]
    fn strings_by_hand_are_escaped_as_serialised() {
        let chars = (0..0x800u32)
            .chain([0xfeff, 0x2028, 0x2029, 0xfffd, 0x1f600])
            .filter_map(char::from_u32);
        for c in chars {
            for text in [c.to_string(), format!("a{c}b{c}{c}")] {
                let mut by_hand = Vec::new();
                Line(&mut by_hand).str(&text);
                let mut serialised = Vec::new();
                serde::Serialize::serialize(
                    &text,
                    &mut serde_json::Serializer::with_formatter(
                        &mut serialised,
                        Inert(PrettyFormatter::new(), COMPACT_FROM),
                    ),
                )
                .unwrap();
                assert_eq!(
                    String::from_utf8_lossy(&by_hand),
                    String::from_utf8_lossy(&serialised),
                    "U+{:04X}",
                    u32::from(c)
                );
            }
        }
    }
}
