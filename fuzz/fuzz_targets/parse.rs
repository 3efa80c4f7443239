//! Fuzz target: the number reader. Any text, read for every kind of field, either fails
//! with a message naming the field or gives a finite, normal (or zero) number, and
//! writing that number back never fails either.
#![no_main]

use latchwise::quantity::parse;
use latchwise::units::{format_log10, format_number, format_si, Dim};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    for dim in [
        Dim::Time,
        Dim::Frequency,
        Dim::Voltage,
        Dim::Capacitance,
        Dim::Conductance,
        Dim::Ratio,
        Dim::Count,
    ] {
        match parse("x", text, dim) {
            Ok(v) => {
                assert!(v.is_finite() && (v == 0.0 || v.is_normal()), "{text:?} -> {v}");
                for s in [format_si(v, dim.symbol()), format_number(v)] {
                    assert!(!s.contains("NaN") && !s.contains("inf"), "{text:?} -> {s}");
                }
                if v > 0.0 {
                    let s = format_log10(v.log10(), 3);
                    assert!(!s.contains("NaN") && !s.contains("inf"), "{text:?} -> {s}");
                }
            }
            Err(e) => assert!(e.to_string().starts_with("x: "), "{e}"),
        }
    }
});
