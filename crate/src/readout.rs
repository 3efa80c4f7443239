//! Named result values as a page or a script reads them: key, label, text and number.

use serde::Serialize;

use crate::units::format_decades;

/// One displayed result. `name` is the JSON key of the command line's output.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Readout {
    /// The JSON key (and the page's `<output name>`).
    pub name: &'static str,
    /// A short human label.
    pub label: &'static str,
    /// The value formatted for reading.
    pub text: String,
    /// The full-precision number (log10 for log quantities); `None` when there is none.
    pub value: Option<f64>,
    /// A state for styling: `good`, `bad` or "" for neutral.
    pub state: &'static str,
}

impl Readout {
    /// A neutral readout.
    pub fn new(name: &'static str, label: &'static str, text: String, value: Option<f64>) -> Self {
        Readout {
            name,
            label,
            text,
            value,
            state: "",
        }
    }

    /// The verdict against a target under the key `meets_target`: "met by 0.88 decades"
    /// or "missed by 2.90 decades", value 1 or 0, marked good or bad.
    pub fn verdict(met: bool, margin_decades: f64) -> Self {
        let m = format_decades(margin_decades.abs());
        let m = m.trim_start_matches('+');
        Readout::new(
            "meets_target",
            "target",
            format!(
                "{} by {m} decade{}",
                if met { "met" } else { "missed" },
                if m == "1.00" { "" } else { "s" }
            ),
            Some(if met { 1.0 } else { 0.0 }),
        )
        .judged(met)
    }

    /// A result that may not apply: its number formatted by `text`, or else the reason
    /// that `not_applicable` gives for `name`.
    pub fn maybe(
        name: &'static str,
        label: &'static str,
        value: Option<f64>,
        text: impl Fn(f64) -> String,
        not_applicable: &[(&'static str, String)],
    ) -> Self {
        match value {
            Some(v) => Readout::new(name, label, text(v), Some(v)),
            None => {
                let why = not_applicable
                    .iter()
                    .find(|(k, _)| *k == name)
                    .map_or_else(|| "does not apply".to_string(), |(_, w)| w.clone());
                Readout::new(name, label, why, None)
            }
        }
    }

    /// The margin against a target under the key `margin_decades`: "+0.88 decades".
    pub fn margin(margin_decades: f64) -> Self {
        Readout::new(
            "margin_decades",
            "margin",
            format!("{} decades", format_decades(margin_decades)),
            Some(margin_decades),
        )
    }

    /// The same readout marked good (`true`) or bad (`false`).
    pub fn judged(mut self, good: bool) -> Self {
        self.state = if good { "good" } else { "bad" };
        self
    }
}
