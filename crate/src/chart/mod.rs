//! Chart layout and drawing, generic over the plotters backend (SVG natively, canvas in the browser).
//!
//! Y values arrive as base-10 logarithms and are drawn on a linear axis of those
//! logarithms with decade labels (`1e40`), so the axis stays readable far beyond the
//! range of an `f64`. Log-spaced x values are drawn the same way.

use std::fmt;

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::units::{format_number, format_si};

mod axis;
pub mod series;

pub use axis::{decade_label, decade_ticks};
pub use series::{Curve, Plot, Spacing};

use axis::{linear_ticks, x_ticks_within, TickedAxis};

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

/// Padding around a range: a share of its span, and never less than the rounding of an
/// f64 at that magnitude, so that a flat curve at 1e17 still has a range to draw in.
fn pad(lo: f64, hi: f64, share: f64) -> f64 {
    ((hi - lo) * share)
        .max(0.5)
        .max(lo.abs().max(hi.abs()) * 1e-12)
}

fn y_range(spec: &Plot) -> (f64, f64) {
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
    let mut keys: Vec<f64> = spec
        .hline
        .iter()
        .map(|h| h.0)
        .chain(spec.marker.map(|m| m.1))
        .filter(|y| y.is_finite())
        .collect();

    keys.iter().for_each(|y| see(*y));
    // Where the largest value is the answer (the worst FIT), it stays in view too.
    if spec.y_keep_top && hi.is_finite() {
        keys.push(hi);
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    if let (Some(max), false) = (spec.y_span_max, keys.is_empty()) {
        if hi - lo > max {
            // Keep the operating point and the reference line in view, centred, and
            // let the far ends of the curves leave the plot.
            let klo = keys.iter().copied().fold(f64::INFINITY, f64::min);
            let khi = keys.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let span = max.max((khi - klo) * 1.25 + 2.0);
            let mid = 0.5 * (klo + khi);
            let new_lo = (mid - span / 2.0).max(lo);
            let new_hi = (new_lo + span).min(hi);
            lo = (new_hi - span).max(lo);
            hi = new_hi;
        }
    }
    let p = if spec.y_log {
        pad(lo, hi, 0.06)
    } else {
        // A linear axis in its own unit: a share of the span, or of the value when flat.
        ((hi - lo) * 0.06)
            .max(lo.abs().max(hi.abs()) * 0.05)
            .max(f64::MIN_POSITIVE)
    };
    (lo - p, hi + p)
}

fn x_range(spec: &Plot) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for c in &spec.curves {
        for p in &c.points {
            let x = to_axis_x(spec.spacing, p.0);
            if x.is_finite() {
                lo = lo.min(x);
                hi = hi.max(x);
            }
        }
    }
    // A reference line (a budget, a resolution time) is part of the reading: keep it in
    // view even when the curves lie decades away from it.
    if let Some((v, _)) = &spec.vline {
        let x = to_axis_x(spec.spacing, *v);
        if x.is_finite() && lo.is_finite() && (x < lo || x > hi) {
            // Off the curves' span: a little room so the line is not the axis itself.
            let room = 0.04 * (hi.max(x) - lo.min(x));
            lo = lo.min(x - room);
            hi = hi.max(x + room);
        }
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    match spec.spacing {
        Spacing::Integer => (lo - 0.5, hi + 0.5),
        _ if hi - lo <= 0.0 => {
            let p = pad(lo, hi, 0.0);
            (lo - p, hi + p)
        }
        _ => (lo, hi),
    }
}

fn to_axis_x(spacing: Spacing, x: f64) -> f64 {
    match spacing {
        Spacing::Log => x.log10(),
        _ => x,
    }
}

/// The most named categories an axis labels by name (more would overlap).
const NAMES_ON_AXIS_MOST: usize = 8;

/// The most characters of a category name an axis shows.
const NAME_CHARS_MOST: usize = 14;

/// The most named categories an axis stands on end (read upwards), one a tick.
const NAMES_STANDING_MOST: usize = 30;

/// How a category axis shows its names.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Names {
    /// Numbers only (no names, or no room for them).
    None,
    /// Level, each cut to this many characters.
    Level(usize),
    /// Standing on end, each cut to [`NAME_CHARS_MOST`] characters.
    Standing,
}

/// How the plot's category names fit under its axis at `css_width` pixels with type
/// scaled by `k` (about 6.5 px a character at full size, 14 at most): level when a few
/// short names fit side by side, else standing on end when each has a line of its own.
fn names_fit(spec: &Plot, css_width: f64, k: f64) -> Names {
    let n = spec.x_names.len();
    if n == 0 {
        return Names::None;
    }
    let per = (css_width - 90.0) / n as f64;
    let level = ((per - 6.0) / (6.5 * k))
        .floor()
        .min(NAME_CHARS_MOST as f64) as usize;
    if n <= NAMES_ON_AXIS_MOST && level >= 4 {
        let longest = spec
            .x_names
            .iter()
            .map(|s| s.chars().count())
            .max()
            .unwrap_or(0);
        if level >= longest.min(NAME_CHARS_MOST) || n <= 3 {
            return Names::Level(level);
        }
    }
    if n <= NAMES_STANDING_MOST && per >= 13.0 * k {
        return Names::Standing;
    }
    if level >= 4 && n <= NAMES_ON_AXIS_MOST {
        return Names::Level(level);
    }
    Names::None
}

fn x_label_text(spec: &Plot, x: f64, named: Names) -> String {
    let most = match named {
        Names::Level(m) => Some(m),
        Names::Standing => Some(NAME_CHARS_MOST),
        Names::None => None,
    };
    match spec.spacing {
        Spacing::Integer if most.is_some() => {
            let most = most.unwrap_or(NAME_CHARS_MOST);
            let i = (x.round() as usize).wrapping_sub(1);
            spec.x_names.get(i).map_or(String::new(), |n| {
                if n.chars().count() <= most {
                    n.clone()
                } else {
                    let cut: String = n.chars().take(most - 1).collect();
                    format!("{cut}…")
                }
            })
        }
        Spacing::Integer => format!("{}", x.round()),
        // A plain quantity (FIT) reads as 1e6, not as 1 M.
        Spacing::Log if spec.x_unit.is_empty() => format_number(10f64.powf(x)),
        Spacing::Log => format_si(10f64.powf(x), spec.x_unit),
        // A plain fraction reads as 0.25, not as 250 m.
        Spacing::Linear if spec.x_unit.is_empty() => format_number(x),
        Spacing::Linear => format_si(x, spec.x_unit),
    }
}

/// The corner for a legend of `size` (width, height as fractions of the plotting area):
/// the one with the fewest of the points `uv` (plot fractions, 0 to 1 from the lower
/// left) under it; on a tie, upper right for a `falling` curve, else lower right, then
/// the left.
fn legend_corner(uv: &[(f64, f64)], size: (f64, f64), falling: bool) -> SeriesLabelPosition {
    let (w, h) = size;
    let under = |right: bool, upper: bool| {
        uv.iter()
            .filter(|(u, v)| {
                (if right { *u > 1.0 - w } else { *u < w })
                    && (if upper { *v > 1.0 - h } else { *v < h })
            })
            .count()
    };
    let mut corners = vec![
        (SeriesLabelPosition::UpperRight, under(true, true)),
        (SeriesLabelPosition::LowerRight, under(true, false)),
        (SeriesLabelPosition::UpperLeft, under(false, true)),
        (SeriesLabelPosition::LowerLeft, under(false, false)),
    ];
    if !falling {
        corners.swap(0, 1);
    }
    // The first of the emptiest (min_by_key keeps the first of equals).
    corners
        .into_iter()
        .min_by_key(|c| c.1)
        .map_or(SeriesLabelPosition::UpperRight, |c| c.0)
}

/// A chart that could not be drawn: the backend's message.
#[derive(Debug, Clone, PartialEq)]
pub struct DrawError(pub String);

impl fmt::Display for DrawError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "chart could not be drawn: {}", self.0)
    }
}

impl std::error::Error for DrawError {}

/// Draws `spec` on `area`, at `scale` device pixels per CSS pixel so that text and lines
/// stay crisp on high-DPI screens.
///
/// # Errors
/// The backend's drawing error.
pub fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &Plot,
    scale: f64,
) -> Result<Drawn, DrawError> {
    let s = scale.clamp(0.5, 4.0);
    let px = |v: f64| (v * s).round() as u32;
    let err = |e: DrawingAreaErrorKind<DB::ErrorType>| DrawError(e.to_string());
    area.fill(&WHITE).map_err(err)?;
    let (ylo, yhi) = y_range(spec);
    let (xlo, xhi) = x_range(spec);
    let y_ticks = if spec.y_log {
        decade_ticks(ylo, yhi, 8)
    } else {
        linear_ticks(ylo, yhi)
    };
    let y_text = |y: f64| {
        if spec.y_log {
            decade_label(y)
        } else if spec.y_unit.is_empty() {
            format_number(y)
        } else {
            format_si(y, spec.y_unit)
        }
    };
    // Small charts (a phone, a printed page) get smaller text and room for it, so that
    // the plot keeps most of its area: full size from 420 CSS pixels wide.
    let css_width = f64::from(area.dim_in_pixel().0) / s;
    let k = (css_width / 420.0).clamp(0.72, 1.0);
    // About one x label per 55 pixels of plot, so that labels never run together; names
    // standing on end take a tick each.
    let named = names_fit(spec, css_width, k);
    let xk = match named {
        Names::Standing => (1..=spec.x_names.len()).map(|i| i as f64).collect(),
        _ => x_ticks_within(spec.spacing, xlo, xhi, (css_width - 80.0) / (55.0 * k)),
    };
    // Standing names need the height of the longest below the axis.
    let x_area = match named {
        Names::Standing => {
            let longest = spec
                .x_names
                .iter()
                .map(|s| s.chars().count().min(NAME_CHARS_MOST))
                .max()
                .unwrap_or(4) as f64;
            (24.0 + 6.2 * longest) * k
        }
        _ => 42.0 * k,
    };
    let font = |size: f64| ("sans-serif", size * s * k).into_font().color(&AXIS);
    // Room for the longest decade label ("1e-399153" needs more than "1e40").
    let widest = y_ticks
        .iter()
        .map(|t| y_text(*t).chars().count())
        .max()
        .unwrap_or(4) as f64;
    // A title fits its plot: a long one on a small (printed) plot gets smaller type
    // rather than losing its ends (about 0.55 em per character of sans-serif).
    let title_chars = spec.title.chars().count().max(1) as f64;
    let title_size = 15.0_f64
        .min(0.92 * css_width / (0.55 * title_chars * k))
        .max(7.0);
    let mut chart = ChartBuilder::on(area)
        .margin(px(10.0))
        .margin_right(px(18.0))
        .caption(&spec.title, font(title_size))
        .x_label_area_size(px(x_area))
        .y_label_area_size(px((30.0 + 7.0 * widest) * k))
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
    // Standing names are drawn below the axis after the mesh (the mesh would centre a
    // turned label on its tick, half of it over the plot).
    let standing = named == Names::Standing;
    let x_fmt = |x: &f64| {
        if standing {
            String::new()
        } else {
            x_label_text(spec, *x, named)
        }
    };
    let y_fmt = |y: &f64| y_text(*y);
    chart
        .configure_mesh()
        .x_desc(spec.x_label)
        .y_desc(spec.y_label)
        .x_label_formatter(&x_fmt)
        .y_label_formatter(&y_fmt)
        .label_style(font(12.0))
        .axis_desc_style(font(12.5))
        .bold_line_style(GRID.stroke_width(px(1.0).max(1)))
        .light_line_style(TRANSPARENT)
        .axis_style(AXIS.stroke_width(px(1.0).max(1)))
        .draw()
        .map_err(err)?;
    if standing {
        // Read downwards from just below each tick, anchored at the name's start.
        let style = font(11.0)
            .transform(FontTransform::Rotate90)
            .pos(Pos::new(HPos::Left, VPos::Center));
        for i in 1..=spec.x_names.len() {
            let x = i as f64;
            let (cx, cy) = chart.backend_coord(&(x, ylo));
            let label = x_label_text(spec, x, named);
            area.draw(&Text::new(label, (cx, cy + px(6.0) as i32), style.clone()))
                .map_err(err)?;
        }
    }
    let mut points = 0;
    let mut legend = false;
    for (i, c) in spec.curves.iter().enumerate() {
        let color = INK[i % INK.len()];
        let pts: Vec<(f64, f64)> = c
            .points
            .iter()
            .map(|&(x, y)| (to_axis_x(spec.spacing, x), y))
            .filter(|(x, y)| x.is_finite() && y.is_finite())
            .collect();
        points += pts.len();
        let style = color.stroke_width(px(2.0).max(1));
        if c.points_only {
            let dot = px(3.5);
            let series = chart
                .draw_series(pts.iter().map(|&p| Circle::new(p, dot, color.filled())))
                .map_err(err)?;
            if !c.label.is_empty() {
                legend = true;
                series
                    .label(c.label.clone())
                    .legend(move |(x, y)| Circle::new((x + 9, y), dot, color.filled()));
            }
            continue;
        }
        let series = chart
            .draw_series(LineSeries::new(pts.clone(), style))
            .map_err(err)?;
        if !c.label.is_empty() {
            legend = true;
            series
                .label(c.label.clone())
                .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
        }
        if spec.spacing == Spacing::Integer && pts.len() <= 40 {
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
        let ax = to_axis_x(spec.spacing, *x);
        let style = GUIDE.stroke_width(px(1.5).max(1));
        chart
            .draw_series(LineSeries::new(vec![(ax, ylo), (ax, yhi)], style))
            .map_err(err)?
            .label(label.clone())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
        legend = true;
    }
    if let Some((x, y)) = spec.marker {
        let p = (to_axis_x(spec.spacing, x), y);
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
        // Keep the legend off the data: the corner of the plot with the fewest points
        // under it, the right-hand ones first (descending curves leave the upper right
        // free, rising ones the lower right).
        let falling = spec
            .curves
            .first()
            .and_then(|c| Some((c.points.first()?.1, c.points.last()?.1)))
            .is_some_and(|(a, b)| b < a);
        let (xs, ys) = (
            (xhi - xlo).max(f64::MIN_POSITIVE),
            (yhi - ylo).max(f64::MIN_POSITIVE),
        );
        let uv: Vec<(f64, f64)> = spec
            .curves
            .iter()
            .flat_map(|c| c.points.iter())
            .chain(spec.marker.iter())
            .map(|&(x, y)| ((to_axis_x(spec.spacing, x) - xlo) / xs, (y - ylo) / ys))
            .filter(|(u, v)| u.is_finite() && v.is_finite())
            .collect();
        let labels: Vec<&str> = spec
            .curves
            .iter()
            .map(|c| c.label.as_str())
            .filter(|l| !l.is_empty())
            .chain(spec.hline.iter().map(|h| h.1.as_str()))
            .chain(spec.vline.iter().map(|v| v.1.as_str()))
            .chain(spec.marker.iter().map(|_| "this case"))
            .collect();
        // The legend's size with its inset from the corner, as a fraction of the
        // plotting area.
        let (pw, ph) = chart.plotting_area().dim_in_pixel();
        let longest = labels.iter().map(|l| l.chars().count()).max().unwrap_or(0) as f64;
        let size = (
            (((longest * 6.8 + 42.0) * k + 12.0) * s / f64::from(pw.max(1))).min(0.9),
            (((labels.len() as f64 * 19.0 + 12.0) * k + 12.0) * s / f64::from(ph.max(1))).min(0.9),
        );
        let corner = legend_corner(&uv, size, falling);
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
    fn the_legend_goes_where_no_points_are() {
        let upper_right = [(0.9, 0.9), (0.95, 0.8)];
        assert!(matches!(
            legend_corner(&upper_right, (0.4, 0.2), true),
            SeriesLabelPosition::LowerRight
        ));
        // Points in both right-hand corners (the corners plot of a budget): the left.
        let right = [(0.95, 0.05), (0.95, 0.95), (0.5, 0.5)];
        assert!(matches!(
            legend_corner(&right, (0.4, 0.2), false),
            SeriesLabelPosition::UpperLeft
        ));
        // Nothing in the way: upper right for a falling curve, lower right otherwise.
        assert!(matches!(
            legend_corner(&[], (0.4, 0.3), true),
            SeriesLabelPosition::UpperRight
        ));
        assert!(matches!(
            legend_corner(&[], (0.4, 0.3), false),
            SeriesLabelPosition::LowerRight
        ));
    }
}
