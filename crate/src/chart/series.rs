//! What a plot shows, independent of how it is drawn: curves of (x, log10 y) points with
//! their axes, reference lines and the operating point, and the CSV of the same data.

use serde::Serialize;

/// How a plot's x values are spaced (and so how its x axis is drawn).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Spacing {
    /// Whole numbers.
    Integer,
    /// Evenly spaced.
    Linear,
    /// Evenly spaced in log10.
    Log,
}

/// One curve: a legend text ("" for none) and (x, log10 y) points, x in base units.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Curve {
    /// Legend text.
    pub label: String,
    /// (x, y) pairs: y is log10 of the quantity on a log axis, the quantity itself else.
    pub points: Vec<(f64, f64)>,
    /// Drawn as separate points (measured data) rather than a line.
    pub points_only: bool,
}

/// One plot of a calculator: what the page draws into the canvas `id` and what its CSV
/// export holds.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Plot {
    /// The canvas id on the page, also the CSV file stem (`plot-stages`).
    pub id: &'static str,
    /// Title above the plot.
    pub title: String,
    /// X axis title with its unit (`fclk (Hz)`); its first word names the CSV column.
    pub x_label: &'static str,
    /// Unit symbol of x ("" for counts).
    pub x_unit: &'static str,
    /// Spacing of x.
    pub spacing: Spacing,
    /// Column name of y in CSV output (a log10 quantity, `log10_mtbf_years`).
    pub y_name: &'static str,
    /// Y axis title (the quantity whose log10 is plotted).
    pub y_label: &'static str,
    /// The curves.
    pub curves: Vec<Curve>,
    /// A horizontal reference line at this log10 y, with its legend text.
    pub hline: Option<(f64, String)>,
    /// A vertical reference line at this x, with its legend text.
    pub vline: Option<(f64, String)>,
    /// The case being evaluated, as (x, log10 y).
    pub marker: Option<(f64, f64)>,
    /// The most decades the y axis may span: beyond, it shows the span around the
    /// operating point and the reference line, and the curves leave the plot.
    pub y_span_max: Option<f64>,
    /// Whether y is a log10 (decade axis); else a plain linear axis in `y_unit`.
    pub y_log: bool,
    /// Unit symbol of a linear y axis.
    pub y_unit: &'static str,
    /// Whether the largest y is part of the answer and stays in view when the axis is
    /// limited (a plot of FIT, where the worst is what matters).
    pub y_keep_top: bool,
    /// Names of the categories at x = 1, 2, ... (an integer axis of named things, such
    /// as corners): the axis shows them when they are few, and the CSV has them all.
    pub x_names: Vec<String>,
}

impl Plot {
    /// An empty plot with the given axes, to be filled by a sweep.
    pub fn new(id: &'static str, title: &str, x: (&'static str, &'static str, Spacing)) -> Self {
        Plot {
            id,
            title: title.to_string(),
            x_label: x.0,
            x_unit: x.1,
            spacing: x.2,
            y_name: "",
            y_label: "",
            curves: Vec::new(),
            hline: None,
            vline: None,
            marker: None,
            y_span_max: None,
            y_log: true,
            y_unit: "",
            x_names: Vec::new(),
            y_keep_top: false,
        }
    }

    /// The same plot with a linear y axis in `unit` (y values are the quantity itself).
    pub fn linear_y(mut self, unit: &'static str) -> Self {
        self.y_log = false;
        self.y_unit = unit;
        self
    }

    /// The same plot with its y axis limited to `decades` (see [`Plot::y_span_max`]).
    pub fn clip_y(mut self, decades: f64) -> Self {
        self.y_span_max = Some(decades);
        self
    }

    /// The same plot with its y axis named: CSV column and axis title.
    pub fn y(mut self, name: &'static str, label: &'static str) -> Self {
        self.y_name = name;
        self.y_label = label;
        self
    }

    /// The same plot with one unlabelled curve and the operating point.
    pub fn single(mut self, points: Vec<(f64, f64)>, marker: (f64, f64)) -> Self {
        self.curves = vec![Curve {
            label: String::new(),
            points,
            points_only: false,
        }];
        self.marker = Some(marker);
        self
    }

    /// The points of the first curve (a sweep has one).
    pub fn points(&self) -> &[(f64, f64)] {
        self.curves.first().map_or(&[], |c| &c.points)
    }

    /// The points as CSV: `preface` lines first as `#` comments (the case, its link),
    /// then a header naming the columns and their units; with more than one curve a first
    /// column names the curve. Numbers are in plain scientific notation (`1.5e-13`),
    /// whole-number x values (stage counts) as integers.
    pub fn to_csv(&self, preface: &[String]) -> String {
        let unit = if self.x_unit.is_empty() {
            String::new()
        } else {
            format!("_{}", self.x_unit)
        };
        // The axis label's words before its parenthesis, joined: "total regeneration
        // time (s)" is the column total_regeneration_time_s.
        let x_col = self
            .x_label
            .split(" (")
            .next()
            .map(|w| w.trim().replace(' ', "_"))
            .filter(|w| !w.is_empty())
            .unwrap_or_else(|| "x".to_string());
        let many = self.curves.len() > 1;
        let mut out = String::new();
        for line in preface {
            out.push_str(&comment_line(line));
            out.push('\n');
        }
        if many {
            out.push_str("curve,");
        }
        let named = !self.x_names.is_empty();
        if named {
            out.push_str("name,");
        }
        out.push_str(&format!("{x_col}{unit},{}\n", self.y_name));
        for c in &self.curves {
            for (x, y) in &c.points {
                if many {
                    out.push_str(&text_cell(&c.label));
                    out.push(',');
                }
                if named {
                    let i = (x.round() as usize).wrapping_sub(1);
                    out.push_str(&text_cell(self.x_names.get(i).map_or("", String::as_str)));
                    out.push(',');
                }
                if self.spacing == Spacing::Integer {
                    out.push_str(&format!("{x:.0},{y:e}\n"));
                } else {
                    out.push_str(&format!("{x:e},{y:e}\n"));
                }
            }
        }
        out
    }
}

/// A text cell of an exported CSV that a spreadsheet shows as the text it is: quoted, and
/// when it begins with `=`, `+`, `-` (not a number), `@`, a tab or a carriage return (what
/// a spreadsheet would run as a formula), led by an apostrophe inside the quotes, the
/// common practice against CSV injection (OWASP's advice). Line breaks become spaces.
///
/// # Examples
/// ```
/// use latchwise::chart::series::text_cell;
/// assert_eq!(text_cell("=2+2"), "\"'=2+2\"");
/// assert_eq!(text_cell("-1.5"), "\"-1.5\"");
/// assert_eq!(text_cell("a \"b\", c"), "\"a \"\"b\"\", c\"");
/// ```
pub fn text_cell(text: &str) -> String {
    let text = text.replace('\n', " ");
    let risky = match text.chars().next() {
        Some('=' | '+' | '@' | '\t' | '\r') => true,
        Some('-') => text.trim().parse::<f64>().is_err(),
        _ => false,
    };
    let lead = if risky { "'" } else { "" };
    format!("\"{lead}{}\"", text.replace('\r', " ").replace('"', "\"\""))
}

/// A line of an exported CSV's preface: `# ` and the text, one line whatever it holds. A
/// text with a comma, quote or tab (a design echoed with a crossing's name) is written as
/// one quoted cell, so that a spreadsheet shows the whole line as text in one cell and no
/// part of it as a formula.
pub fn comment_line(text: &str) -> String {
    let line = format!("# {}", text.replace(['\n', '\r'], " "));
    if line.contains([',', '"', '\t', ';']) {
        text_cell(&line)
    } else {
        line
    }
}

/// `n` values evenly spaced in log10 between `lo` and `hi` (both positive).
pub fn log_space(lo: f64, hi: f64, n: usize) -> impl Iterator<Item = f64> {
    let (a, b) = (lo.log10(), hi.log10());
    let steps = n.saturating_sub(1).max(1) as f64;
    (0..n).map(move |i| 10f64.powf(a + (b - a) * i as f64 / steps))
}

/// `n` values evenly spaced from 0 to `span`.
pub fn lin_space(span: f64, n: usize) -> impl Iterator<Item = f64> {
    let steps = n.saturating_sub(1).max(1) as f64;
    (0..n).map(move |i| span * i as f64 / steps)
}
