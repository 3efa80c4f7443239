//! Fuzz target: a link's query, through a whole calculator. The first byte picks the
//! calculator, the rest is the query. Reading, evaluating, the readouts, the JSON
//! report, every plot (drawn to SVG) and its CSV must never panic, hang or show NaN,
//! inf or a null without a reason.
#![no_main]

use latchwise::calculator::{plot_csv, query_inputs, Calculator, Visit};
use latchwise::chart::draw;
use latchwise::registry::{dispatch, ALL};
use libfuzzer_sys::fuzz_target;
use plotters::prelude::*;

struct Whole<'a>(&'a str);

fn clean(what: &str, s: &str) {
    for bad in ["NaN", "inf", "1e300 ", "18446744073709551615", "9223372036854775807"] {
        assert!(!s.contains(bad), "{what}: {s}");
    }
}

impl Visit for Whole<'_> {
    type Out = ();

    fn visit<C: Calculator>(self) {
        let raw = query_inputs::<C>(self.0);
        let Ok(case) = C::read(&raw) else {
            return;
        };
        let report = C::evaluate(&case);
        let outcome = C::outcome(&report);
        for r in &outcome.readouts {
            clean(r.name, &r.text);
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
            clean(plot.id, &csv);
        }
    }
}

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let query = String::from_utf8_lossy(rest);
    let name = ALL[usize::from(pick) % ALL.len()].name;
    dispatch(name, Whole(&query));
});
