//! Physical quantities: engineering-notation parsing with a unit check, and the typed
//! quantities (`Time`, `Frequency`, ...) that only hold valid values.
//!
//! Values are written as engineers and circuit simulators write them: `20p`, `20ps`,
//! `20 ps`, `2e-11`, `0.02ns`, `1.5GHz`, `250M`, `1meg`. SI prefixes are case-sensitive
//! (`m` milli, `M` mega); `meg` in any case is mega; `u`, `µ` and `μ` are micro.

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind};
use crate::units::{format_si, Dim};

const ALL_DIMS: [Dim; 6] = [
    Dim::Time,
    Dim::Frequency,
    Dim::Voltage,
    Dim::Capacitance,
    Dim::Conductance,
    Dim::Ratio,
];

/// Returns the power of ten of an SI prefix, or `None` when `p` is not one.
fn prefix_exponent(p: &str) -> Option<i32> {
    if p.eq_ignore_ascii_case("meg") {
        return Some(6);
    }
    Some(match p {
        "a" => -18,
        "f" => -15,
        "p" => -12,
        "n" => -9,
        "u" | "µ" | "μ" => -6,
        "m" => -3,
        "k" => 3,
        "M" => 6,
        "G" => 9,
        "T" => 12,
        _ => return None,
    })
}

/// Splits `suffix` into a power of ten and the kind its unit denotes (`None` for no unit).
fn split_suffix(suffix: &str) -> Option<(i32, Option<Dim>)> {
    if suffix.is_empty() {
        return Some((0, None));
    }
    // A bare unit wins over a prefix ("1F" is one farad, "1f" one femto).
    for d in ALL_DIMS {
        if d.units().contains(&suffix) {
            return Some((0, Some(d)));
        }
    }
    for d in ALL_DIMS {
        for u in d.units() {
            if let Some(p) = suffix.strip_suffix(u) {
                if let Some(e) = prefix_exponent(p) {
                    return Some((e, Some(d)));
                }
            }
        }
    }
    prefix_exponent(suffix).map(|e| (e, None))
}

/// Length in bytes of the leading decimal number (sign, digits, point, exponent) of `s`.
fn number_prefix_len(s: &str) -> usize {
    let b = s.as_bytes();
    let mut i = 0;
    if i < b.len() && (b[i] == b'+' || b[i] == b'-') {
        i += 1;
    }
    let mut digits = 0;
    while i < b.len() && b[i].is_ascii_digit() {
        i += 1;
        digits += 1;
    }
    if i < b.len() && b[i] == b'.' {
        i += 1;
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
            digits += 1;
        }
    }
    if digits == 0 {
        return 0;
    }
    // An exponent needs a digit after `e`, so `1e` stays "1" with suffix "e" (an error),
    // and "1exa" is not mistaken for an exponent.
    if i < b.len() && (b[i] == b'e' || b[i] == b'E') {
        let mut j = i + 1;
        if j < b.len() && (b[j] == b'+' || b[j] == b'-') {
            j += 1;
        }
        let start = j;
        while j < b.len() && b[j].is_ascii_digit() {
            j += 1;
        }
        if j > start {
            i = j;
        }
    }
    i
}

/// Parses one value in engineering notation for a field of kind `dim`.
///
/// # Errors
/// [`ParamErrorKind::Missing`] for empty text, `NotANumber`, `NotFinite`, `Overflow`,
/// `Underflow`, `UnknownUnit`, and `WrongUnit` when the unit belongs to another kind.
///
/// # Examples
/// ```
/// use latchwise::quantity::parse;
/// use latchwise::units::Dim;
/// assert_eq!(parse("tau", "20ps", Dim::Time).unwrap(), 20e-12);
/// assert_eq!(parse("fclk", "1.5 GHz", Dim::Frequency).unwrap(), 1.5e9);
/// assert_eq!(parse("fdata", "1meg", Dim::Frequency).unwrap(), 1e6);
/// let e = parse("fclk", "5ns", Dim::Frequency).unwrap_err();
/// assert_eq!(e.to_string(), "fclk: '5ns' is a time, expected a frequency");
/// // Lab durations in minutes, hours and days (no prefix on these).
/// assert_eq!(parse("duration", "2min", Dim::Time).unwrap(), 120.0);
/// assert_eq!(parse("duration", "1.5 h", Dim::Time).unwrap(), 5400.0);
/// assert_eq!(parse("duration", "2d", Dim::Time).unwrap(), 172800.0);
/// ```
pub fn parse(field: &'static str, text: &str, dim: Dim) -> Result<f64, ParamError> {
    let err = |kind| ParamError::new(field, kind);
    let t = text.trim();
    if t.is_empty() {
        return Err(err(ParamErrorKind::Missing));
    }
    // A plain decimal number (the usual cell of a file written by a script): read as it
    // is, the same nearest double the general path below gives.
    if t.bytes()
        .all(|c| c.is_ascii_digit() || matches!(c, b'.' | b'e' | b'E' | b'+' | b'-'))
    {
        if let Ok(v) = t.parse::<f64>() {
            if v.is_normal()
                || (v == 0.0
                    && !t
                        .bytes()
                        .take_while(|c| !matches!(c, b'e' | b'E'))
                        .any(|c| (b'1'..=b'9').contains(&c)))
            {
                return Ok(v);
            }
        }
    }
    let unsigned = t.trim_start_matches(['+', '-']);
    if ["inf", "infinity", "nan"]
        .iter()
        .any(|w| unsigned.eq_ignore_ascii_case(w))
    {
        return Err(err(ParamErrorKind::NotFinite(t.to_string())));
    }
    let n = number_prefix_len(t);
    if n == 0 {
        return Err(err(ParamErrorKind::NotANumber(t.to_string())));
    }
    let (num, rest) = t.split_at(n);
    let suffix = rest.trim_start();
    // An all-lower-case unit whose prefix changes meaning with case: `400mhz` is read as
    // megahertz by many people and as millihertz by SI. Ask instead of guessing.
    if suffix == "mhz" {
        return Err(err(ParamErrorKind::Ambiguous {
            text: t.to_string(),
            readings: [format!("{num}MHz"), format!("{num}mHz")],
        }));
    }
    // Clock units of time, for lab durations: minutes, hours, days (not powers of ten).
    let clock = match suffix {
        "min" => Some(60.0),
        "h" => Some(3600.0),
        "d" => Some(86400.0),
        _ => None,
    };
    if let Some(factor) = clock {
        if dim != Dim::Time {
            return Err(err(ParamErrorKind::WrongUnit {
                text: t.to_string(),
                found: Dim::Time,
                expected: dim,
            }));
        }
        let (mantissa, e10) = match num.find(['e', 'E']) {
            Some(k) => (&num[..k], exponent(&num[k + 1..])),
            None => (num, 0),
        };
        let value = scaled(mantissa, e10)
            .map(|v| v * factor)
            .ok_or_else(|| err(ParamErrorKind::NotANumber(t.to_string())))?;
        if !value.is_finite() {
            return Err(err(ParamErrorKind::Overflow(t.to_string())));
        }
        if value != 0.0 && !value.is_normal() {
            return Err(err(ParamErrorKind::Underflow(t.to_string())));
        }
        return Ok(value);
    }
    let Some((exp, unit)) = split_suffix(suffix) else {
        return Err(err(if suffix.starts_with(|c: char| c.is_ascii_digit()) {
            ParamErrorKind::NotANumber(t.to_string())
        } else {
            ParamErrorKind::UnknownUnit(suffix.to_string())
        }));
    };
    if let Some(found) = unit {
        if found != dim {
            return Err(err(ParamErrorKind::WrongUnit {
                text: t.to_string(),
                found,
                expected: dim,
            }));
        }
    }
    if dim == Dim::Count && exp != 0 && unit.is_none() && exp < 0 {
        return Err(err(ParamErrorKind::NotInteger(t.to_string())));
    }
    // Scaling through the decimal exponent text keeps 20p exactly equal to 20e-12.
    let (mantissa, e10) = match num.find(['e', 'E']) {
        Some(k) => (&num[..k], exponent(&num[k + 1..])),
        None => (num, 0),
    };
    let total = e10.saturating_add(i64::from(exp));
    let value =
        scaled(mantissa, total).ok_or_else(|| err(ParamErrorKind::NotANumber(t.to_string())))?;
    if !value.is_finite() {
        return Err(err(ParamErrorKind::Overflow(t.to_string())));
    }
    let mantissa_nonzero = mantissa.bytes().any(|c| (b'1'..=b'9').contains(&c));
    // Subnormal values have lost precision already; the models need normal ones.
    if value == 0.0 && mantissa_nonzero || value != 0.0 && !value.is_normal() {
        return Err(err(ParamErrorKind::Underflow(t.to_string())));
    }
    Ok(value)
}

/// `mantissa` times ten to the `e10`, read as one decimal text (`20e-12`) so that the
/// result is the nearest double to the exact decimal value; written on the stack for the
/// usual short mantissa.
fn scaled(mantissa: &str, e10: i64) -> Option<f64> {
    let mut buf = [0u8; 64];
    let m = mantissa.as_bytes();
    let mut exp = [0u8; 24];
    let mut k = exp.len();
    let mut e = e10.unsigned_abs();
    loop {
        k -= 1;
        exp[k] = b'0' + (e % 10) as u8;
        e /= 10;
        if e == 0 {
            break;
        }
    }
    if e10 < 0 {
        k -= 1;
        exp[k] = b'-';
    }
    let digits = &exp[k..];
    let len = m.len() + 1 + digits.len();
    if len > buf.len() {
        return format!("{mantissa}e{e10}").parse().ok();
    }
    buf[..m.len()].copy_from_slice(m);
    buf[m.len()] = b'e';
    buf[m.len() + 1..len].copy_from_slice(digits);
    std::str::from_utf8(&buf[..len]).ok()?.parse().ok()
}

/// The decimal exponent written after `e`. The digits were checked by
/// `number_prefix_len`; an exponent too long for an `i64` saturates (to a value that
/// overflows or underflows any `f64`) instead of being read as some default.
fn exponent(text: &str) -> i64 {
    text.parse::<i64>().unwrap_or(if text.starts_with('-') {
        i64::MIN
    } else {
        i64::MAX
    })
}

macro_rules! quantity {
    ($(#[$doc:meta])* $name:ident, $dim:expr) => {
        $(#[$doc])*
        #[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Serialize)]
        pub struct $name(f64);

        impl $name {
            /// The kind of this quantity.
            pub const DIM: Dim = $dim;
            /// Zero.
            pub const ZERO: Self = $name(0.0);

            /// A strictly positive finite value.
            ///
            /// # Errors
            /// `NotFinite`, `Negative` or `Zero`, naming `field`.
            pub fn positive(field: &'static str, v: f64) -> Result<Self, ParamError> {
                check_finite(field, v)?;
                if v < 0.0 {
                    return Err(ParamError::new(field, ParamErrorKind::Negative(Self::DIM)));
                }
                if v == 0.0 {
                    return Err(ParamError::new(field, ParamErrorKind::Zero(Self::DIM)));
                }
                Ok($name(v))
            }

            /// A finite value that is zero or positive.
            ///
            /// # Errors
            /// `NotFinite` or `Negative`, naming `field`.
            pub fn non_negative(field: &'static str, v: f64) -> Result<Self, ParamError> {
                check_finite(field, v)?;
                if v < 0.0 {
                    return Err(ParamError::new(field, ParamErrorKind::Negative(Self::DIM)));
                }
                Ok($name(v.abs()))
            }

            /// The value in base units.
            pub fn get(self) -> f64 {
                self.0
            }

            /// The value formatted with an SI prefix.
            pub fn display(self) -> String {
                format_si(self.0, Self::DIM.symbol())
            }
        }
    };
}

fn check_finite(field: &'static str, v: f64) -> Result<(), ParamError> {
    if v.is_finite() {
        Ok(())
    } else {
        Err(ParamError::new(
            field,
            ParamErrorKind::NotFinite(format!("{v}")),
        ))
    }
}

quantity!(
    /// A time in seconds.
    Time,
    Dim::Time
);
quantity!(
    /// A frequency or event rate in hertz.
    Frequency,
    Dim::Frequency
);
quantity!(
    /// A voltage in volts.
    Voltage,
    Dim::Voltage
);
quantity!(
    /// A capacitance in farads.
    Capacitance,
    Dim::Capacitance
);
quantity!(
    /// A conductance in siemens.
    Conductance,
    Dim::Conductance
);
quantity!(
    /// A dimensionless ratio (V/V).
    Ratio,
    Dim::Ratio
);

#[cfg(test)]
mod tests {
    use super::*;

    fn ok(text: &str, dim: Dim, want: f64) {
        // Scaling goes through the decimal text, so the value is the correctly rounded
        // f64 of the decimal number: exactly what the literal `want` is.
        let got = parse("x", text, dim).unwrap_or_else(|e| panic!("{text}: {e}"));
        assert_eq!(got, want, "{text}");
    }

    fn bad(text: &str, dim: Dim, msg: &str) {
        let e = parse("x", text, dim).expect_err(text);
        assert!(e.to_string().contains(msg), "{text}: {e}");
    }

    #[test]
    fn notation_from_the_domain_notes() {
        ok("20p", Dim::Time, 20e-12);
        ok("20ps", Dim::Time, 20e-12);
        ok("20 ps", Dim::Time, 20e-12);
        ok("2e-11", Dim::Time, 2e-11);
        ok("0.02ns", Dim::Time, 20e-12);
        ok("1.5GHz", Dim::Frequency, 1.5e9);
        ok("250M", Dim::Frequency, 250e6);
        ok("1meg", Dim::Frequency, 1e6);
        ok("1MEG", Dim::Frequency, 1e6);
        ok("1megHz", Dim::Frequency, 1e6);
        ok("3u", Dim::Time, 3e-6);
        ok("3µs", Dim::Time, 3e-6);
        ok("3μs", Dim::Time, 3e-6);
        ok("1m", Dim::Time, 1e-3);
        ok("1ms", Dim::Time, 1e-3);
        ok("10fF", Dim::Capacitance, 10e-15);
        ok("10f", Dim::Capacitance, 10e-15);
        ok("1F", Dim::Capacitance, 1.0);
        ok("2mS", Dim::Conductance, 2e-3);
        ok("4", Dim::Ratio, 4.0);
        ok("4V/V", Dim::Ratio, 4.0);
        ok("+5", Dim::Count, 5.0);
        ok("-1.5e3mV", Dim::Voltage, -1.5);
        ok(".5", Dim::Voltage, 0.5);
        ok("0e99999999999999999999", Dim::Voltage, 0.0);
        ok("0e-99999999999999999999", Dim::Voltage, 0.0);
        ok("5.", Dim::Voltage, 5.0);
    }

    #[test]
    fn case_matters_for_prefixes() {
        ok("1M", Dim::Frequency, 1e6);
        ok("1m", Dim::Frequency, 1e-3);
    }

    #[test]
    fn rejects_with_named_reasons() {
        bad("", Dim::Time, "a value is required");
        bad("   ", Dim::Time, "a value is required");
        bad("abc", Dim::Time, "is not a number");
        bad("NaN", Dim::Time, "not a finite number");
        bad("inf", Dim::Time, "not a finite number");
        bad("-Infinity", Dim::Time, "not a finite number");
        bad(
            "5ns",
            Dim::Frequency,
            "'5ns' is a time, expected a frequency",
        );
        bad("1GHz", Dim::Time, "is a frequency, expected a time");
        bad("1e999", Dim::Time, "too large");
        bad("1e-999", Dim::Time, "too small");
        bad("1e300T", Dim::Frequency, "too large");
        bad("1e99999999999999999999", Dim::Time, "too large");
        bad("20e-99999999999999999999ps", Dim::Time, "too small");
        bad("-1e99999999999999999999", Dim::Voltage, "too large");
        bad("1e-310", Dim::Frequency, "too small");
        bad("4.9e-324", Dim::Time, "too small");
        bad("5 parsecs", Dim::Time, "unknown unit");
        bad("1e", Dim::Time, "unknown unit");
        bad("1.2.3", Dim::Time, "unknown unit");
        bad("1 2", Dim::Time, "not a number");
        bad("1s", Dim::Conductance, "is a time, expected a conductance");
        bad("1u", Dim::Count, "not a whole number");
        bad(
            "400mhz",
            Dim::Frequency,
            "'400mhz' is ambiguous: write 400MHz for megahertz or 400mHz for millihertz",
        );
        bad("400 mhz", Dim::Frequency, "write 400MHz for megahertz");
    }
}
