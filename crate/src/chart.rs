//! Chart layout and drawing, generic over the plotters backend (SVG natively, canvas in the browser).
//!
//! Y values arrive as base-10 logarithms and are drawn on a linear axis of those
//! logarithms with decade labels (`1e40`), so the axis stays readable far beyond the
//! range of an `f64`. Log-spaced x values are drawn the same way.

use std::ops::Range;

use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};
use plotters::coord::Shift;
use plotters::prelude::*;

use crate::quantity::format_si;
use crate::sweep::{Series, Spacing};

/// Series colours, in order: our own calm palette.
const INK: [RGBColor; 4] = [
    RGBColor(0x1d, 0x4e, 0x6b),
    RGBColor(0x5b, 0x7f, 0x3a),
    RGBColor(0x7a, 0x4a, 0x8c),
    RGBColor(0x2f, 0x7f, 0x7a),
];
const TARGET: RGBColor = RGBColor(0xc0, 0x5a, 0x12);
const MARK: RGBColor = RGBColor(0xb0, 0x1e, 0x2e);
const GUIDE: RGBColor = RGBColor(0x6b, 0x72, 0x80);
const GRID: RGBColor = RGBColor(0xe3, 0xe6, 0xea);
const AXIS: RGBColor = RGBColor(0x44, 0x4b, 0x55);

/// One curve to draw.
#[derive(Debug, Clone)]
pub struct Curve<'a> {
    /// Legend text ("" for none).
    pub label: String,
    /// (x, log10 y) points; x is in base units.
    pub points: &'a [(f64, f64)],
}

/// Everything one chart shows.
#[derive(Debug, Clone)]
pub struct ChartSpec<'a> {
    /// Title above the plot.
    pub title: String,
    /// X axis title.
    pub x_label: String,
    /// Unit of x, used in tick labels.
    pub x_unit: &'a str,
    /// X spacing: integer, linear or log.
    pub x_spacing: Spacing,
    /// Y axis title (the quantity whose log10 is plotted).
    pub y_label: String,
    /// The curves.
    pub curves: Vec<Curve<'a>>,
    /// A horizontal reference line at this log10 y, with its legend text.
    pub hline: Option<(f64, String)>,
    /// A vertical reference line at this x, with its legend text.
    pub vline: Option<(f64, String)>,
    /// The operating point (x, log10 y).
    pub marker: Option<(f64, f64)>,
    /// Device pixels per CSS pixel, so text and lines stay crisp on high-DPI screens.
    pub scale: f64,
}

impl<'a> ChartSpec<'a> {
    /// A chart of one sweep, with an optional target line (log10, in the y units of the series).
    pub fn from_series(s: &'a Series, title: &str, target_log10: Option<f64>, scale: f64) -> Self {
        ChartSpec {
            title: title.to_string(),
            x_label: s.x_label.to_string(),
            x_unit: s.x_unit,
            x_spacing: s.spacing,
            y_label: s.y_label.to_string(),
            curves: vec![Curve {
                label: String::new(),
                points: &s.points,
            }],
            hline: target_log10.map(|t| (t, "target".to_string())),
            vline: None,
            marker: Some(s.operating_point),
            scale,
        }
    }
}

/// A linear f64 axis whose tick positions are chosen by us (decades, whole stages).
#[derive(Debug, Clone)]
struct TickedAxis {
    lo: f64,
    hi: f64,
    ticks: Vec<f64>,
}

impl Ranged for TickedAxis {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;

    fn map(&self, v: &f64, limit: (i32, i32)) -> i32 {
        let span = self.hi - self.lo;
        if span <= 0.0 {
            return (limit.0 + limit.1) / 2;
        }
        let frac = (v - self.lo) / span;
        let px = f64::from(limit.0) + frac * f64::from(limit.1 - limit.0);
        // Far-off points (a curve leaving the view) are clamped well outside the area
        // so that the line still leaves at the right angle without i32 overflow.
        px.clamp(-1e6, 1e6).round() as i32
    }

    fn key_points<H: KeyPointHint>(&self, _hint: H) -> Vec<f64> {
        self.ticks.clone()
    }

    fn range(&self) -> Range<f64> {
        self.lo..self.hi
    }
}

/// What was drawn, for tests and for the page's own checks.
#[derive(Debug, Clone, PartialEq)]
pub struct Drawn {
    /// The y tick values (log10), bottom to top.
    pub y_ticks: Vec<f64>,
    /// The y range (log10) shown.
    pub y_range: (f64, f64),
    /// Points drawn over all curves.
    pub points: usize,
}

/// A tick label for 10^e: `1`, `10`, `100`, `1000`, `0.1`, `0.01`, else `1e40`.
pub fn decade_label(e: f64) -> String {
    let e = e.round() as i64;
    match e {
        0..=3 => format!("{}", 10i64.pow(e as u32)),
        -2..=-1 => format!("{}", 10f64.powi(e as i32)),
        _ => format!("1e{e}"),
    }
}

/// Integer decades from `lo` to `hi` with a step chosen to give at most `max` ticks.
pub fn decade_ticks(lo: f64, hi: f64, max: usize) -> Vec<f64> {
    let span = (hi - lo).max(1.0);
    let mut step = 1.0;
    let mut k = 0;
    while span / step > max as f64 {
        step *= [2.0, 2.5, 2.0][k % 3];
        k += 1;
    }
    let first = (lo / step).ceil() * step;
    let mut v = Vec::new();
    let mut t = first;
    while t <= hi + 1e-9 {
        v.push(t);
        t += step;
    }
    v
}

fn y_range(spec: &ChartSpec) -> (f64, f64) {
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    let mut see = |y: f64| {
        if y.is_finite() {
            lo = lo.min(y);
            hi = hi.max(y);
        }
    };
    for c in &spec.curves {
        c.points.iter().for_each(|p| see(p.1));
    }
    if let Some((y, _)) = &spec.hline {
        see(*y);
    }
    if let Some((_, y)) = spec.marker {
        see(y);
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    let pad = ((hi - lo) * 0.06).max(0.5);
    (lo - pad, hi + pad)
}

fn x_range(spec: &ChartSpec) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for c in &spec.curves {
        for p in c.points.iter() {
            let x = to_axis_x(spec.x_spacing, p.0);
            if x.is_finite() {
                lo = lo.min(x);
                hi = hi.max(x);
            }
        }
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    match spec.x_spacing {
        Spacing::Integer => (lo - 0.5, hi + 0.5),
        _ if hi - lo <= 0.0 => (lo - 0.5, hi + 0.5),
        _ => (lo, hi),
    }
}

fn to_axis_x(spacing: Spacing, x: f64) -> f64 {
    match spacing {
        Spacing::Log => x.log10(),
        _ => x,
    }
}

fn x_ticks(spec: &ChartSpec, lo: f64, hi: f64) -> Vec<f64> {
    match spec.x_spacing {
        Spacing::Integer => {
            let step = nice_step((hi - lo).max(1.0) / 8.0).max(1.0);
            let mut v = Vec::new();
            let mut t = (lo / step).ceil() * step;
            while t <= hi {
                if t >= 1.0 {
                    v.push(t);
                }
                t += step;
            }
            // Always label the single flip-flop when it is shown, unless a tick crowds it.
            let room = v.first().map_or(true, |&f| f - 1.0 > step / 2.0);
            if room && lo < 1.0 {
                v.insert(0, 1.0);
            }
            v
        }
        Spacing::Log => {
            let mut v = Vec::new();
            let dense = hi - lo < 2.5;
            let mut d = lo.floor();
            while d <= hi {
                for m in if dense {
                    &[1.0, 2.0, 5.0][..]
                } else {
                    &[1.0][..]
                } {
                    let t = d + f64::log10(*m);
                    if t >= lo - 1e-9 && t <= hi + 1e-9 {
                        v.push(t);
                    }
                }
                d += 1.0;
            }
            v
        }
        Spacing::Linear => {
            let step = nice_step((hi - lo) / 6.0);
            let mut v = Vec::new();
            let mut t = (lo / step).ceil() * step;
            while t <= hi + step * 1e-9 {
                v.push(t);
                t += step;
            }
            v
        }
    }
}

/// The smallest of 1, 2, 5 times a power of ten that is at least `raw`.
fn nice_step(raw: f64) -> f64 {
    let mag = 10f64.powf(raw.log10().floor());
    [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw * (1.0 - 1e-9))
        .unwrap_or(10.0 * mag)
}

fn x_label_text(spec: &ChartSpec, x: f64) -> String {
    match spec.x_spacing {
        Spacing::Integer => format!("{}", x.round()),
        Spacing::Log => format_si(10f64.powf(x), spec.x_unit),
        Spacing::Linear => format_si(x, spec.x_unit),
    }
}

/// Draws `spec` on `area`.
///
/// # Errors
/// The backend's drawing error, as text.
pub fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &ChartSpec,
) -> Result<Drawn, String> {
    let s = spec.scale.clamp(0.5, 4.0);
    let px = |v: f64| (v * s).round() as u32;
    let err = |e: DrawingAreaErrorKind<DB::ErrorType>| e.to_string();
    area.fill(&WHITE).map_err(err)?;
    let (ylo, yhi) = y_range(spec);
    let (xlo, xhi) = x_range(spec);
    let y_ticks = decade_ticks(ylo, yhi, 8);
    let xk = x_ticks(spec, xlo, xhi);
    let font = |size: f64| ("sans-serif", size * s).into_font().color(&AXIS);
    // Room for the longest decade label ("1e-399153" needs more than "1e40").
    let widest = y_ticks
        .iter()
        .map(|t| decade_label(*t).len())
        .max()
        .unwrap_or(4) as f64;
    let mut chart = ChartBuilder::on(area)
        .margin(px(10.0))
        .margin_right(px(18.0))
        .caption(&spec.title, font(15.0))
        .x_label_area_size(px(42.0))
        .y_label_area_size(px(30.0 + 7.0 * widest))
        .build_cartesian_2d(
            TickedAxis {
                lo: xlo,
                hi: xhi,
                ticks: xk,
            },
            TickedAxis {
                lo: ylo,
                hi: yhi,
                ticks: y_ticks.clone(),
            },
        )
        .map_err(err)?;
    let x_fmt = |x: &f64| x_label_text(spec, *x);
    let y_fmt = |y: &f64| decade_label(*y);
    chart
        .configure_mesh()
        .x_desc(&spec.x_label)
        .y_desc(&spec.y_label)
        .x_label_formatter(&x_fmt)
        .y_label_formatter(&y_fmt)
        .label_style(font(12.0))
        .axis_desc_style(font(12.5))
        .bold_line_style(GRID.stroke_width(px(1.0).max(1)))
        .light_line_style(TRANSPARENT)
        .axis_style(AXIS.stroke_width(px(1.0).max(1)))
        .draw()
        .map_err(err)?;
    let mut points = 0;
    let mut legend = false;
    for (i, c) in spec.curves.iter().enumerate() {
        let color = INK[i % INK.len()];
        let pts: Vec<(f64, f64)> = c
            .points
            .iter()
            .map(|&(x, y)| (to_axis_x(spec.x_spacing, x), y))
            .filter(|(x, y)| x.is_finite() && y.is_finite())
            .collect();
        points += pts.len();
        let style = color.stroke_width(px(2.0).max(1));
        let series = chart
            .draw_series(LineSeries::new(pts.clone(), style))
            .map_err(err)?;
        if !c.label.is_empty() {
            legend = true;
            series
                .label(c.label.clone())
                .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
        }
        if spec.x_spacing == Spacing::Integer && pts.len() <= 40 {
            chart
                .draw_series(pts.iter().map(|&p| Circle::new(p, px(2.5), color.filled())))
                .map_err(err)?;
        }
    }
    if let Some((y, label)) = &spec.hline {
        let style = TARGET.stroke_width(px(1.5).max(1));
        chart
            .draw_series(LineSeries::new(vec![(xlo, *y), (xhi, *y)], style))
            .map_err(err)?
            .label(label.clone())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
        legend = true;
    }
    if let Some((x, label)) = &spec.vline {
        let ax = to_axis_x(spec.x_spacing, *x);
        let style = GUIDE.stroke_width(px(1.5).max(1));
        chart
            .draw_series(LineSeries::new(vec![(ax, ylo), (ax, yhi)], style))
            .map_err(err)?
            .label(label.clone())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
        legend = true;
    }
    if let Some((x, y)) = spec.marker {
        let p = (to_axis_x(spec.x_spacing, x), y);
        if p.0.is_finite() && p.1.is_finite() {
            chart
                .draw_series(std::iter::once(Circle::new(p, px(5.0), MARK.filled())))
                .map_err(err)?
                .label("this case")
                .legend(move |(x, y)| Circle::new((x + 9, y), px(4.0), MARK.filled()));
            legend = true;
        }
    }
    if legend {
        // Keep the legend off the curve: descending curves leave the upper right free.
        let falling = spec
            .curves
            .first()
            .and_then(|c| Some((c.points.first()?.1, c.points.last()?.1)))
            .is_some_and(|(a, b)| b < a);
        let corner = if falling {
            SeriesLabelPosition::UpperRight
        } else {
            SeriesLabelPosition::LowerRight
        };
        chart
            .configure_series_labels()
            .label_font(font(11.5))
            .background_style(WHITE.mix(0.85))
            .border_style(GRID)
            .position(corner)
            .draw()
            .map_err(err)?;
    }
    area.present().map_err(err)?;
    Ok(Drawn {
        y_ticks,
        y_range: (ylo, yhi),
        points,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn decade_labels() {
        assert_eq!(decade_label(0.0), "1");
        assert_eq!(decade_label(3.0), "1000");
        assert_eq!(decade_label(-2.0), "0.01");
        assert_eq!(decade_label(412.0), "1e412");
        assert_eq!(decade_label(-7.0), "1e-7");
    }

    #[test]
    fn decade_ticks_stay_few_and_whole() {
        for (lo, hi) in [(-3.2, 2.1), (0.0, 40.0), (-10.0, 5000.0), (1e5, 1e5 + 0.3)] {
            let t = decade_ticks(lo, hi, 8);
            assert!(t.len() <= 9, "{lo} {hi}: {t:?}");
            assert!(t.iter().all(|v| v.fract() == 0.0), "{t:?}");
        }
    }
}
