//! Rows that write their own JSON: a budget's rows are many and small, and the command's
//! `--json` writes them by their own code, to the bytes their `Serialize` gives, much
//! faster than through the serialiser. The command line's writer puts each on its line.

use serde_json::ser::{CompactFormatter, Formatter};

/// A row that writes itself as its `Serialize` does, compact (as an element of a
/// report's top-level array is written by the command's `--json`), with strings escaped
/// as there: no raw control character, DEL or C1 character.
pub trait JsonLine {
    /// Appends the row to `line`.
    fn json_line(&self, line: &mut Line<'_>);
}

/// The line a [`JsonLine`] row is written on.
pub struct Line<'a>(pub &'a mut Vec<u8>);

impl Line<'_> {
    /// JSON text as it is: punctuation, and keys that need no escape.
    pub fn raw(&mut self, text: &str) {
        self.0.extend_from_slice(text.as_bytes());
    }

    /// A string, escaped as serde_json escapes one (`\"`, `\\`, the short escapes, the
    /// other characters below U+0020 as `\u00xx`), and DEL and the C1 range as `\u00xx`
    /// too (which a terminal would obey).
    pub fn str(&mut self, text: &str) {
        let out = &mut *self.0;
        out.push(b'"');
        let mut rest = text;
        while let Some(at) = rest.find(|c: char| {
            c < '\u{20}' || c == '"' || c == '\\' || ('\u{7f}'..='\u{9f}').contains(&c)
        }) {
            out.extend_from_slice(&rest.as_bytes()[..at]);
            let c = rest[at..].chars().next().unwrap_or(' ');
            match c {
                '"' => out.extend_from_slice(b"\\\""),
                '\\' => out.extend_from_slice(b"\\\\"),
                '\u{8}' => out.extend_from_slice(b"\\b"),
                '\t' => out.extend_from_slice(b"\\t"),
                '\n' => out.extend_from_slice(b"\\n"),
                '\u{c}' => out.extend_from_slice(b"\\f"),
                '\r' => out.extend_from_slice(b"\\r"),
                _ => {
                    const HEX: &[u8; 16] = b"0123456789abcdef";
                    let n = u32::from(c);
                    out.extend_from_slice(b"\\u00");
                    out.push(HEX[(n >> 4) as usize & 15]);
                    out.push(HEX[n as usize & 15]);
                }
            }
            rest = &rest[at + c.len_utf8()..];
        }
        out.extend_from_slice(rest.as_bytes());
        out.push(b'"');
    }

    /// Strings as a JSON array.
    pub fn strs<'s>(&mut self, items: impl IntoIterator<Item = &'s String>) {
        self.raw("[");
        for (i, s) in items.into_iter().enumerate() {
            if i > 0 {
                self.raw(",");
            }
            self.str(s);
        }
        self.raw("]");
    }

    /// A map of strings as a JSON object, in the map's order.
    pub fn str_map<'s>(&mut self, items: impl IntoIterator<Item = (&'s String, &'s String)>) {
        self.raw("{");
        for (i, (k, v)) in items.into_iter().enumerate() {
            if i > 0 {
                self.raw(",");
            }
            self.str(k);
            self.raw(":");
            self.str(v);
        }
        self.raw("}");
    }

    /// A float as serde_json writes one: its shortest round-trip digits, or `null` when
    /// it is not finite.
    pub fn f64(&mut self, v: f64) {
        if v.is_finite() {
            // Writing to a vector cannot fail.
            let _ = CompactFormatter.write_f64(&mut *self.0, v);
        } else {
            self.0.extend_from_slice(b"null");
        }
    }

    /// [`Line::f64`], giving where on the line it went, for [`Line::again`].
    pub fn f64_at(&mut self, v: f64) -> std::ops::Range<usize> {
        let from = self.0.len();
        self.f64(v);
        from..self.0.len()
    }

    /// The text written at `at` (from [`Line::f64_at`]) once more.
    pub fn again(&mut self, at: std::ops::Range<usize>) {
        self.0.extend_from_within(at);
    }

    /// An integer.
    pub fn i64(&mut self, v: i64) {
        let _ = CompactFormatter.write_i64(&mut *self.0, v);
    }

    /// An unsigned integer.
    pub fn u32(&mut self, v: u32) {
        let _ = CompactFormatter.write_u32(&mut *self.0, v);
    }
}
