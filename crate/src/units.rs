//! Units of measure: the kinds of quantity a field can hold, and how numbers are written
//! back to the user (SI prefixes, scientific notation, magnitudes given by their logarithm).
//!
//! This module sits below the input errors and the parser: it knows nothing about fields.

use serde::Serialize;

/// The kind of a quantity, which decides the units a field accepts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Dim {
    /// Seconds.
    Time,
    /// Hertz (also events per second).
    Frequency,
    /// Volts.
    Voltage,
    /// Farads.
    Capacitance,
    /// Siemens.
    Conductance,
    /// A dimensionless ratio such as V/V.
    Ratio,
    /// A whole number of things.
    Count,
    /// One of a fixed set of words (not a number).
    Choice,
    /// Free text, such as a table of data.
    Text,
}

impl Dim {
    /// The unit symbol used when formatting.
    pub fn symbol(self) -> &'static str {
        match self {
            Dim::Time => "s",
            Dim::Frequency => "Hz",
            Dim::Voltage => "V",
            Dim::Capacitance => "F",
            Dim::Conductance => "S",
            Dim::Ratio | Dim::Count | Dim::Choice | Dim::Text => "",
        }
    }

    /// The noun used in messages.
    pub fn noun(self) -> &'static str {
        match self {
            Dim::Time => "time",
            Dim::Frequency => "frequency",
            Dim::Voltage => "voltage",
            Dim::Capacitance => "capacitance",
            Dim::Conductance => "conductance",
            Dim::Ratio => "ratio",
            Dim::Count => "count",
            Dim::Choice => "choice",
            Dim::Text => "text",
        }
    }

    /// Unit spellings accepted for this kind (case-sensitive).
    pub(crate) fn units(self) -> &'static [&'static str] {
        match self {
            Dim::Time => &["s", "sec"],
            Dim::Frequency => &["Hz", "hz", "HZ", "/s"],
            Dim::Voltage => &["V"],
            Dim::Capacitance => &["F"],
            Dim::Conductance => &["S", "A/V"],
            Dim::Ratio => &["V/V", "x"],
            Dim::Count | Dim::Choice | Dim::Text => &[],
        }
    }
}

const PREFIXES: [(i32, &str); 11] = [
    (-18, "a"),
    (-15, "f"),
    (-12, "p"),
    (-9, "n"),
    (-6, "µ"),
    (-3, "m"),
    (0, ""),
    (3, "k"),
    (6, "M"),
    (9, "G"),
    (12, "T"),
];

/// Formats `v` with an SI prefix and four significant digits, trailing zeros removed.
///
/// # Examples
/// ```
/// use latchwise::units::format_si;
/// assert_eq!(format_si(20e-12, "s"), "20 ps");
/// assert_eq!(format_si(1.5e9, "Hz"), "1.5 GHz");
/// assert_eq!(format_si(0.0, "s"), "0 s");
/// ```
pub fn format_si(v: f64, unit: &str) -> String {
    format_si_sig(v, unit, 4)
}

/// [`format_si`] with `sig` significant digits (at least 3): for values that are carried
/// on by typing them, where four digits would move an exponential result too far.
///
/// # Examples
/// ```
/// use latchwise::units::format_si_sig;
/// assert_eq!(format_si_sig(18.0431234e-12, "s", 7), "18.04312 ps");
/// assert_eq!(format_si_sig(999.99996e-12, "s", 7), "1 ns");
/// ```
pub fn format_si_sig(v: f64, unit: &str, sig: usize) -> String {
    let sig = sig.max(3);
    // Zero is written "0" whatever its sign bit: never "-0".
    if v == 0.0 {
        return join_unit("0", unit);
    }
    if !v.is_finite() {
        return join_unit(&format!("{v}"), unit);
    }
    let e3 = ((v.abs().log10() + 1e-9).floor() as i32).div_euclid(3) * 3;
    let Some(&(pe, p)) = PREFIXES.iter().find(|(pe, _)| *pe == e3) else {
        return join_unit(&format_sig(v, sig), unit);
    };
    let scaled = v / 10f64.powi(pe);
    let mut s = trim_zeros(&format!("{:.*}", decimals_for(scaled) + sig - 4, scaled));
    // Rounding can carry to 1000 (999.99 ps -> "1000 ps"); step up a prefix then.
    if s.trim_start_matches('-') == "1000" {
        if let Some(&(_, p2)) = PREFIXES.iter().find(|(q, _)| *q == pe + 3) {
            s = if v < 0.0 { "-1".into() } else { "1".into() };
            return join_unit(&s, &format!("{p2}{unit}"));
        }
    }
    join_unit(&s, &format!("{p}{unit}"))
}

fn decimals_for(scaled: f64) -> usize {
    let a = scaled.abs();
    if a >= 100.0 {
        1
    } else if a >= 10.0 {
        2
    } else {
        3
    }
}

fn trim_zeros(s: &str) -> String {
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s.to_string()
    }
}

fn join_unit(num: &str, unit: &str) -> String {
    if unit.is_empty() {
        num.to_string()
    } else {
        format!("{num} {unit}")
    }
}

/// Formats `v` in scientific notation with `sig` significant digits (`3.2e-20`).
pub fn format_sig(v: f64, sig: usize) -> String {
    let s = format!("{:.*e}", sig.saturating_sub(1), v);
    match s.split_once('e') {
        Some((m, e)) => format!("{}e{}", trim_zeros(m), e),
        None => s,
    }
}

/// Formats a positive number given by its base-10 logarithm, at any magnitude.
///
/// Between 1e-3 and 1e6 the number is written plainly; outside, as `3.2e412`; beyond
/// an exponent of 1e12, as the power of ten itself: `10^(4.34e19)`.
///
/// # Examples
/// ```
/// use latchwise::units::format_log10;
/// assert_eq!(format_log10(412.0 + 2f64.log10(), 2), "2e412");
/// assert_eq!(format_log10(1.0, 3), "10");
/// assert_eq!(format_log10(-5.0, 3), "1e-5");
/// ```
pub fn format_log10(l: f64, sig: usize) -> String {
    if !l.is_finite() {
        return if l.is_nan() {
            "undefined".into()
        } else if l > 0.0 {
            "unbounded".into()
        } else {
            "0".into()
        };
    }
    let sig = sig.max(1);
    // Beyond 1e12 the fraction of the logarithm no longer holds `sig` digits of mantissa
    // (an f64 keeps about 16 digits in all): write the power of ten itself.
    if l.abs() >= 1e12 {
        return format!("10^({})", format_sig(l, 3));
    }
    let mut e = l.floor();
    let mut m = 10f64.powf(l - e);
    // Round the mantissa first so that 9.999 becomes 10 and carries into the exponent.
    let scale = 10f64.powi(sig as i32 - 1);
    m = (m * scale).round() / scale;
    if m >= 10.0 {
        m /= 10.0;
        e += 1.0;
    }
    if (-3.0..6.0).contains(&e) {
        let v = m * 10f64.powf(e);
        let decimals = (sig as i32 - 1 - e as i32).max(0) as usize;
        return trim_zeros(&format!("{v:.decimals$}"));
    }
    format!("{}e{}", trim_zeros(&format!("{m:.*}", sig - 1)), e as i64)
}

/// Formats a number of decades, signed, to two decimals: `+0.88`, `-4.19`; beyond a
/// million decades in scientific notation (`+4.34e17`).
///
/// # Examples
/// ```
/// use latchwise::units::format_decades;
/// assert_eq!(format_decades(0.884), "+0.88");
/// assert_eq!(format_decades(-4.343e17), "-4.34e17");
/// ```
pub fn format_decades(d: f64) -> String {
    if d == 0.0 {
        return "0.00".to_string();
    }
    // A margin that would round to zero keeps its sign and shows its size: never "-0.00".
    if d.abs() < 0.005 {
        return format!("{}{}", if d < 0.0 { "" } else { "+" }, format_sig(d, 2));
    }
    if d.abs() < 1e6 {
        format!("{d:+.2}")
    } else {
        format!("{}{}", if d < 0.0 { "" } else { "+" }, format_sig(d, 3))
    }
}

/// Formats a plain number with four significant digits: `4`, `0.25`, `1e9`, `-3.5e-7`.
pub fn format_number(v: f64) -> String {
    if v == 0.0 || !v.is_finite() {
        return format!("{v}");
    }
    let body = format_log10(v.abs().log10(), 4);
    if v < 0.0 {
        format!("-{body}")
    } else {
        body
    }
}

/// Formats a duration given by its log10 in seconds in a readable unit (s, h, days, years).
pub fn format_duration_log10(log10_s: f64, log10_year_s: f64) -> String {
    const LOG10_HOUR: f64 = 3.556_302_500_767_287; // log10(3600)
    const LOG10_DAY: f64 = 4.936_513_742_478_893; // log10(86400)
    if log10_s < -15.0 {
        // Below the femtosecond the SI prefixes end and 10^x may underflow: keep the log.
        format!("{} s", format_log10(log10_s, 3))
    } else if log10_s < 0.0 {
        format_si(10f64.powf(log10_s), "s")
    } else if log10_s < LOG10_HOUR {
        format!("{} s", format_log10(log10_s, 3))
    } else if log10_s < LOG10_DAY + 2f64.log10() {
        format!("{} h", format_log10(log10_s - LOG10_HOUR, 3))
    } else if log10_s < log10_year_s {
        format!("{} days", format_log10(log10_s - LOG10_DAY, 3))
    } else {
        format!("{} years", format_log10(log10_s - log10_year_s, 3))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formats_like_an_engineer() {
        assert_eq!(format_si(20e-12, "s"), "20 ps");
        assert_eq!(format_si(1.5e9, "Hz"), "1.5 GHz");
        assert_eq!(format_si(999.9999e-12, "s"), "1 ns");
        assert_eq!(format_si(33.333333e-9, "s"), "33.33 ns");
        assert_eq!(format_si(-2e-3, "V"), "-2 mV");
        assert_eq!(format_si(3e-21, "s"), "3e-21 s");
        assert_eq!(format_si(4.0, ""), "4");
        assert_eq!(format_log10(412.0 + 3.2f64.log10(), 2), "3.2e412");
        assert_eq!(format_log10(-300.5, 3), "3.16e-301");
        assert_eq!(format_log10(2.0 - 1e-12, 3), "100");
        assert_eq!(format_log10(5.0 + 0.99999999, 3), "1e6");
        assert_eq!(format_log10(f64::NAN, 3), "undefined");
        assert_eq!(format_log10(4.343e19, 3), "10^(4.34e19)");
        assert_eq!(format_log10(-4.343e19, 3), "10^(-4.34e19)");
        assert_eq!(format_log10(999_999_999_999.5, 3), "3.16e999999999999");
    }
}
