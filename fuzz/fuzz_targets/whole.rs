//! The checks every whole-calculator fuzz target makes: reading, evaluating, the
//! readouts, the JSON report, every plot (drawn to SVG) and its CSV must never panic,
//! hang or show NaN, inf or a null without a reason.

use latchwise::calculator::{plot_csv, Calculator, Visit};
use latchwise::chart::draw;
use latchwise::params::RawInputs;
use plotters::prelude::*;

/// A calculator's inputs, checked whole.
pub struct Whole(pub RawInputs);

/// `s` shows no NaN, infinity or integer sentinel, except as text the inputs hold (a
/// corner may be named "NaN", and its name comes back as it was typed).
fn clean(what: &str, s: &str, typed: &str) {
    for bad in ["NaN", "inf", "1e300 ", "18446744073709551615", "9223372036854775807"] {
        assert!(!s.contains(bad) || typed.contains(bad), "{what}: {s}");
    }
}

impl Visit for Whole {
    type Out = ();

    fn visit<C: Calculator>(self) {
        let raw = self.0;
        let typed: String = raw.pairs().iter().map(|(_, v)| v.as_str()).collect();
        let Ok(case) = C::read(&raw) else {
            return;
        };
        let report = C::evaluate(&case);
        let outcome = C::outcome(&report);
        for r in &outcome.readouts {
            clean(r.name, &r.text, &typed);
            assert!(r.value.is_none_or(f64::is_finite), "{}: {:?}", r.name, r.value);
        }
        let json = serde_json::to_value(&report).expect("a report serialises");
        let reasons = json.get("not_applicable").cloned().unwrap_or_default();
        if let serde_json::Value::Object(map) = &json {
            for (k, v) in map {
                if v.is_null() {
                    assert!(reasons.get(k).is_some_and(|r| r.is_string()), "{k} null without a reason");
                }
            }
        }
        for plot in C::plots(&case, &report) {
            let mut svg = String::new();
            {
                let root = SVGBackend::with_string(&mut svg, (320, 200)).into_drawing_area();
                let drawn = draw(&root, &plot, 1.0).expect("a plot draws");
                assert!(drawn.y_ticks.len() <= 30, "{}: {} ticks", plot.id, drawn.y_ticks.len());
            }
            let csv = plot_csv::<C>(&raw, plot.id, "").expect("its CSV");
            // Its numbers (names, which the user wrote, may hold any word).
            for line in csv.lines().filter(|l| !l.starts_with(['#', '"'])) {
                for cell in line.split(',') {
                    if let Ok(v) = cell.parse::<f64>() {
                        assert!(v.is_finite(), "{}: {line}", plot.id);
                    }
                }
            }
        }
    }
}

