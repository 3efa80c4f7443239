//! Raw named inputs (from a URL query or command-line options) and the field table.
//!
//! One vocabulary serves the URL query, the command line and the JSON output: a
//! calculator declares its fields as [`FieldSpec`]s and reads typed values from
//! [`RawInputs`], which remembers every error so that all of them can be shown at once.

use std::collections::HashSet;

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::quantity;
use crate::units::{self, Dim};

/// One input field of a calculator.
#[derive(Debug, Clone, Copy)]
pub struct FieldSpec {
    /// Parameter name: URL key, CLI option (`--name`) and JSON key.
    pub name: &'static str,
    /// The kind of value, which decides the accepted units.
    pub dim: Dim,
    /// One line of help.
    pub help: &'static str,
    /// The magnitudes the model can use: a non-zero value outside is refused, so that
    /// nothing derived from it can overflow.
    pub limits: (f64, f64),
    /// The magnitudes usual in practice: a non-zero value outside gets a visible note
    /// (a misread unit shows up here), never a refusal.
    pub usual: (f64, f64),
}

impl FieldSpec {
    /// Parses `text` for this field and checks it against the field's limits.
    ///
    /// # Errors
    /// The parse errors of [`quantity::parse`], and `Unusable` outside the limits.
    pub fn parse(&self, text: &str) -> Result<f64, ParamError> {
        let v = quantity::parse(self.name, text, self.dim)?;
        let (lo, hi) = self.limits;
        let a = v.abs();
        if v != 0.0 && !matches!(self.dim, Dim::Choice | Dim::Text) && (a < lo || a > hi) {
            return Err(ParamError::new(
                self.name,
                ParamErrorKind::Unusable {
                    text: text.trim().to_string(),
                    dim: self.dim,
                    bound: if a < lo { lo } else { hi },
                    above: a > hi,
                },
            ));
        }
        Ok(v)
    }

    /// A note when a usable value is far outside the usual range of this field.
    pub fn note(&self, v: f64) -> Option<String> {
        let (lo, hi) = self.usual;
        let a = v.abs();
        if v == 0.0 || matches!(self.dim, Dim::Choice | Dim::Text) || (lo..=hi).contains(&a) {
            return None;
        }
        let show = |x: f64| match self.dim {
            Dim::Count | Dim::Ratio => units::format_number(x),
            d => units::format_si(x, d.symbol()),
        };
        Some(format!(
            "{} = {} is far outside the usual {} to {}: check the value and its unit.",
            self.name,
            show(v),
            show(lo),
            show(hi)
        ))
    }
}

/// Name/value pairs as given, in order, before any parsing.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct RawInputs {
    pairs: Vec<(String, String)>,
}

impl RawInputs {
    /// Wraps pairs taken from any source; a later pair overrides an earlier one.
    pub fn from_pairs<K: Into<String>, V: Into<String>>(
        pairs: impl IntoIterator<Item = (K, V)>,
    ) -> Self {
        RawInputs {
            pairs: pairs
                .into_iter()
                .map(|(k, v)| (k.into(), v.into()))
                .collect(),
        }
    }

    /// Reads the query of a URL (`https://host/page?tau=20p&...`), a bare `?query` or a
    /// bare `query`, as browsers read a page's query: the fragment is dropped, `+` is a
    /// space, `%XX` escapes are decoded, a later `?` belongs to its value. The page and
    /// the command line's `--from-url` both read links with this function.
    ///
    /// # Examples
    /// ```
    /// use latchwise::params::RawInputs;
    /// let r = RawInputs::from_query("file:///x/index.html?tau=20%20ps&fclk=1GHz#plots");
    /// assert_eq!(r.get("tau"), Some("20 ps"));
    /// assert_eq!(r.get("fclk"), Some("1GHz"));
    /// ```
    pub fn from_query(url: &str) -> Self {
        let text = url.split('#').next().unwrap_or("");
        // A '?' before any '=' ends a URL's path (or opens a bare '?query'); a '?' after
        // an '=' is part of a value, as browsers read `tau=20ps?x` too.
        let query = match (text.find('?'), text.find('=')) {
            (Some(q), Some(e)) if q < e => &text[q + 1..],
            (Some(q), None) => &text[q + 1..],
            (_, Some(_)) => text,
            (None, None) => "",
        };
        RawInputs::from_pairs(query.split('&').filter(|p| !p.is_empty()).map(|p| {
            match p.split_once('=') {
                Some((k, v)) => (percent_decode(k), percent_decode(v)),
                None => (percent_decode(p), String::new()),
            }
        }))
    }

    /// The same inputs with the packed values of the fields `names` (a calculator's data
    /// tables) unpacked (see [`crate::link`]). A damaged one stays as it is and is
    /// refused, with the reason, when its field is read; a packed value in any other
    /// field is never unpacked (a 22 kB link cannot put 16 MiB into `tau`), and is
    /// refused as the text it is.
    pub fn unpack_tables(mut self, names: &[&str]) -> Self {
        for (k, v) in &mut self.pairs {
            // Only a packed value reaches the unpacking code (which a page compiles on
            // its first call).
            if v.starts_with(crate::link::MARK) && names.contains(&k.as_str()) {
                if let Some(Ok(text)) = crate::link::unpack(v) {
                    *v = text;
                }
            }
        }
        self
    }

    /// The text given for `name` (the last one wins), if any.
    pub fn get(&self, name: &str) -> Option<&str> {
        self.pairs
            .iter()
            .rev()
            .find(|(k, _)| k == name)
            .map(|(_, v)| v.as_str())
    }

    /// The text given for `name`, `None` when absent or blank.
    pub fn get_nonblank(&self, name: &str) -> Option<&str> {
        self.get(name).filter(|v| !v.trim().is_empty())
    }

    /// All pairs in order.
    pub fn pairs(&self) -> &[(String, String)] {
        &self.pairs
    }

    /// Keys that no field in `fields` knows, each once, in order of appearance: the first
    /// `most` of them, and how many there are in all. Linear in the number of pairs.
    pub fn unknown_keys(&self, fields: &[FieldSpec], most: usize) -> (Vec<String>, usize) {
        let mut seen: HashSet<&str> = HashSet::new();
        let mut out = Vec::new();
        for (k, _) in &self.pairs {
            if !fields.iter().any(|f| f.name == k) && seen.insert(k.as_str()) && out.len() < most {
                out.push(k.clone());
            }
        }
        (out, seen.len())
    }

    /// The same pairs with old parameter names replaced by their current ones
    /// (`(old, new)` pairs, as a calculator's `ALIASES` lists them).
    pub fn renamed(mut self, aliases: &[(&str, &str)]) -> Self {
        for (k, _) in &mut self.pairs {
            if let Some((_, new)) = aliases.iter().find(|(old, _)| old == k) {
                *k = (*new).to_string();
            }
        }
        self
    }
}

/// Decodes `%XX` escapes and `+`; invalid escapes and invalid UTF-8 are kept visibly.
fn percent_decode(s: &str) -> String {
    let b = s.as_bytes();
    let mut out = Vec::with_capacity(b.len());
    let mut i = 0;
    while i < b.len() {
        match b[i] {
            b'+' => out.push(b' '),
            b'%' if i + 2 < b.len() => match (hex(b[i + 1]), hex(b[i + 2])) {
                (Some(h), Some(l)) => {
                    out.push(h * 16 + l);
                    i += 2;
                }
                _ => out.push(b'%'),
            },
            c => out.push(c),
        }
        i += 1;
    }
    String::from_utf8_lossy(&out).into_owned()
}

fn hex(c: u8) -> Option<u8> {
    (c as char).to_digit(16).map(|d| d as u8)
}

/// Reads typed fields from [`RawInputs`], collecting every error instead of stopping at
/// the first, so that a page can flag each bad field beside itself.
pub struct FieldReader<'a> {
    raw: &'a RawInputs,
    errors: Vec<ParamError>,
    notes: Vec<String>,
    conflicts: Vec<ParamError>,
}

impl<'a> FieldReader<'a> {
    /// Starts reading `raw`.
    pub fn new(raw: &'a RawInputs) -> Self {
        FieldReader {
            raw,
            errors: Vec::new(),
            notes: Vec::new(),
            conflicts: Vec::new(),
        }
    }

    /// Whether a non-blank value was given for the field.
    pub fn has(&self, spec: &FieldSpec) -> bool {
        self.raw.get_nonblank(spec.name).is_some()
    }

    /// The trimmed text given for the field, `None` when absent or blank. A data table is
    /// read with [`FieldReader::table`] instead.
    pub fn text(&mut self, spec: &FieldSpec) -> Option<&'a str> {
        debug_assert!(
            spec.dim != Dim::Text,
            "{}: a data table is read with FieldReader::table",
            spec.name
        );
        self.raw.get_nonblank(spec.name).map(str::trim)
    }

    /// The trimmed text given for a data-table field, `None` when absent or blank. A
    /// packed value that could not be unpacked (see [`crate::link`]) is an error. (Apart
    /// from [`FieldReader::text`], so that a page without data tables carries no
    /// unpacking code.)
    pub fn table(&mut self, spec: &FieldSpec) -> Option<&'a str> {
        let text = self.raw.get_nonblank(spec.name).map(str::trim)?;
        // A data table still packed here is one that did not unpack: say why.
        if text.starts_with(crate::link::MARK) {
            if let Some(Err(why)) = crate::link::unpack(text) {
                self.push(ParamError::new(spec.name, ParamErrorKind::Damaged(why)));
                return None;
            }
        }
        Some(text)
    }

    /// Records an error found by the caller.
    pub fn push(&mut self, e: ParamError) {
        if !self.errors.iter().any(|x| x.field == e.field) {
            self.errors.push(e);
        }
    }

    /// Parses `spec` if given; `None` (no error) when absent or blank.
    pub fn optional<T>(
        &mut self,
        spec: &FieldSpec,
        make: fn(&'static str, f64) -> Result<T, ParamError>,
    ) -> Option<T> {
        let text = self.raw.get_nonblank(spec.name)?;
        let parsed = spec.parse(text).inspect(|&v| {
            if let Some(n) = spec.note(v) {
                self.notes.push(n);
            }
        });
        match parsed.and_then(|v| make(spec.name, v)) {
            Ok(v) => Some(v),
            Err(e) => {
                self.push(e);
                None
            }
        }
    }

    /// Parses `spec`, recording `Missing` when it is absent or blank.
    pub fn required<T>(
        &mut self,
        spec: &FieldSpec,
        make: fn(&'static str, f64) -> Result<T, ParamError>,
    ) -> Option<T> {
        if !self.has(spec) {
            self.push(ParamError::new(spec.name, ParamErrorKind::Missing));
            return None;
        }
        self.optional(spec, make)
    }

    /// Finishes: every error recorded, in the order found.
    pub fn into_errors(self) -> ParamErrors {
        ParamErrors(self.errors)
    }

    /// Records a conflict that leaves the rest of the case usable (both of two
    /// alternative targets given): the case is still built, without either, and the
    /// adapters show the message beside the results (the command exits 2).
    pub fn conflict(&mut self, e: ParamError) {
        self.conflicts.push(e);
    }

    /// The conflicts recorded with [`FieldReader::conflict`].
    pub fn conflicts(&self) -> Vec<ParamError> {
        self.conflicts.clone()
    }

    /// The notes on values far outside their usual range, in the order read.
    pub fn notes(&self) -> Vec<String> {
        self.notes.clone()
    }

    /// Whether any error has been recorded.
    pub fn has_errors(&self) -> bool {
        !self.errors.is_empty()
    }
}

/// A whole number in `lo..=hi`, as a constructor for [`FieldReader`].
///
/// # Errors
/// `NotInteger` or `OutOfRange`, naming `field`.
pub fn whole(
    field: &'static str,
    v: f64,
    lo: u64,
    hi: u64,
    range: &'static str,
) -> Result<u64, ParamError> {
    if v.fract() != 0.0 {
        return Err(ParamError::new(
            field,
            ParamErrorKind::NotInteger(format!("{v}")),
        ));
    }
    if v < lo as f64 || v > hi as f64 {
        return Err(ParamError::new(
            field,
            ParamErrorKind::OutOfRange { value: v, range },
        ));
    }
    Ok(v as u64)
}

/// A finite positive plain number, as a constructor for [`FieldReader`].
///
/// # Errors
/// `Negative` or `Zero`, naming `field`.
pub fn positive_number(field: &'static str, v: f64) -> Result<f64, ParamError> {
    if v < 0.0 {
        Err(ParamError::new(field, ParamErrorKind::Negative(Dim::Ratio)))
    } else if v == 0.0 {
        Err(ParamError::new(field, ParamErrorKind::Zero(Dim::Ratio)))
    } else {
        Ok(v)
    }
}

/// One field as the page shows it: the text typed and, if it parses, its normalised echo.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FieldEcho {
    /// Parameter name.
    pub name: &'static str,
    /// The text as given ("" when absent).
    pub text: String,
    /// The value re-written with an SI prefix, when the text parses on its own.
    pub normalized: Option<String>,
    /// A note when the value is far outside the field's usual range.
    pub note: Option<String>,
}

/// Echoes every field of `fields`: what was typed and how it was understood.
pub fn echo_fields(raw: &RawInputs, fields: &[FieldSpec]) -> Vec<FieldEcho> {
    fields
        .iter()
        .map(|f| {
            let text = raw.get(f.name).unwrap_or("").to_string();
            if f.dim == Dim::Text {
                // A table is shown as typed; its problems come from the reader.
                return FieldEcho {
                    name: f.name,
                    normalized: None,
                    text,
                    note: None,
                };
            }
            if f.dim == Dim::Choice {
                let t = text.trim().to_ascii_lowercase();
                return FieldEcho {
                    name: f.name,
                    normalized: (!t.is_empty()).then_some(t),
                    text,
                    note: None,
                };
            }
            let value = f.parse(&text).ok();
            let normalized = value.map(|v| match f.dim {
                Dim::Count if v.fract() == 0.0 && v.abs() < 1e15 => format!("{v:.0}"),
                Dim::Count | Dim::Ratio => units::format_number(v),
                d => units::format_si(v, d.symbol()),
            });
            FieldEcho {
                name: f.name,
                text,
                normalized,
                note: value.and_then(|v| f.note(v)),
            }
        })
        .collect()
}

/// Serialises name/value pairs as one object, keeping their order.
///
/// # Errors
/// Whatever the serializer reports.
pub fn serialize_pairs<S: serde::Serializer>(
    pairs: &[(&'static str, String)],
    ser: S,
) -> Result<S::Ok, S::Error> {
    use serde::ser::SerializeMap;
    let mut m = ser.serialize_map(Some(pairs.len()))?;
    for (k, v) in pairs {
        m.serialize_entry(k, v)?;
    }
    m.end()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn query_decoding() {
        let r = RawInputs::from_query("?tau=20+ps&tw=%3Cimg%3E&x&bad=%zz&tau=30p");
        assert_eq!(r.get("tau"), Some("30p"));
        assert_eq!(r.get("tw"), Some("<img>"));
        assert_eq!(r.get("x"), Some(""));
        assert_eq!(r.get("bad"), Some("%zz"));
        assert_eq!(RawInputs::from_query("a=1%").get("a"), Some("1%"));
        assert_eq!(RawInputs::from_query("a=%4").get("a"), Some("%4"));
        assert_eq!(RawInputs::from_query("a=%C2%B5s").get("a"), Some("µs"));
        assert_eq!(RawInputs::from_query("index.html").pairs().len(), 0);
    }
}
