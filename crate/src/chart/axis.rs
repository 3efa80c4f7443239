//! Axes whose tick positions are chosen here, not by plotters: whole decades on log10
//! axes (labelled `1e40`), whole stages, and 1-2-5 steps on linear axes.

use std::ops::Range;

use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};

use super::series::Spacing;

/// A linear f64 axis whose tick positions are chosen by us (decades, whole stages).
#[derive(Debug, Clone)]
pub(super) struct TickedAxis {
    pub(super) lo: f64,
    pub(super) hi: f64,
    pub(super) ticks: Vec<f64>,
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

/// A tick label for 10^e: `1`, `10`, `100`, `1000`, `0.1`, `0.01`, else `1e40`.
pub fn decade_label(e: f64) -> String {
    let e = e.round() as i64;
    match e {
        0..=3 => format!("{}", 10i64.pow(e as u32)),
        -2..=-1 => format!("{}", 10f64.powi(e as i32)),
        _ => format!("1e{e}"),
    }
}

/// The most ticks an axis gets, whatever its data.
const MAX_TICKS: usize = 24;

/// Multiples of `step` from `lo` to `hi`, each computed from its index so that no step
/// is lost to rounding at large magnitudes, at most `cap` of them and none repeated.
fn ladder(lo: f64, hi: f64, step: f64, cap: usize) -> Vec<f64> {
    if !(step > 0.0 && lo.is_finite() && hi.is_finite() && hi >= lo) {
        return Vec::new();
    }
    let first = (lo / step).ceil();
    let last = (hi / step + 1e-9).floor();
    if last < first {
        return Vec::new();
    }
    let count = (last - first).min(cap as f64) as usize + 1;
    let mut v: Vec<f64> = (0..count.min(cap))
        .map(|k| (first + k as f64) * step)
        .collect();
    v.dedup();
    v
}

/// Integer decades from `lo` to `hi` with a step chosen to give at most `max` ticks.
pub fn decade_ticks(lo: f64, hi: f64, max: usize) -> Vec<f64> {
    let span = (hi - lo).max(1.0);
    let mut step = 1.0;
    let mut k = 0;
    // The step grows geometrically, so this ends for any finite span.
    while span / step > max as f64 && step.is_finite() {
        step *= [2.0, 2.5, 2.0][k % 3];
        k += 1;
    }
    ladder(lo, hi, step, max + 1)
}

/// Ticks of a linear y axis: 1-2-5 steps, at most about eight.
pub(super) fn linear_ticks(lo: f64, hi: f64) -> Vec<f64> {
    ladder(lo, hi, nice_step((hi - lo) / 6.0), MAX_TICKS)
}

/// Tick positions on an x axis of the given spacing (log axes in log10 units), aiming
/// at about `most` labels (fewer on a narrow plot, whose labels
/// would otherwise run into each other).
pub(super) fn x_ticks_within(spacing: Spacing, lo: f64, hi: f64, most: f64) -> Vec<f64> {
    let most = most.clamp(2.0, 8.0);
    match spacing {
        Spacing::Integer => {
            let step = nice_step((hi - lo).max(1.0) / most).max(1.0);
            let mut v: Vec<f64> = ladder(lo, hi, step, MAX_TICKS)
                .into_iter()
                .filter(|t| *t >= 1.0)
                .collect();
            // Always label the single flip-flop when it is shown, unless a tick crowds it.
            let room = v.first().map_or(true, |&f| f - 1.0 > step / 2.0);
            if room && lo < 1.0 {
                v.insert(0, 1.0);
            }
            v
        }
        Spacing::Log => {
            // 1-2-5 within a decade only where there is room for three labels a decade.
            let dense = hi - lo < 2.5 && most >= 3.0 * (hi - lo).max(1.0);
            let mantissas: &[f64] = if dense { &[1.0, 2.0, 5.0] } else { &[1.0] };
            let step = nice_step((hi - lo).max(1.0) / most).max(1.0);
            ladder(lo.floor(), hi, step, MAX_TICKS)
                .into_iter()
                .flat_map(|d| mantissas.iter().map(move |m| d + m.log10()))
                .filter(|t| *t >= lo - 1e-9 && *t <= hi + 1e-9)
                .collect()
        }
        Spacing::Linear => ladder(lo, hi, nice_step((hi - lo) / (most * 0.75)), MAX_TICKS),
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
    fn ticks_stay_few_for_any_range() {
        // Flat curves at huge values, tiny spans, and ranges beyond any plot: bounded.
        for (lo, hi) in [
            (4.3e17, 4.3e17 + 1.0),
            (4.3e17 - 0.5, 4.3e17 + 0.5),
            (-1e300, 1e300),
            (1e-300, 2e-300),
            (0.0, 0.0),
            (5.0, 4.0),
        ] {
            assert!(decade_ticks(lo, hi, 8).len() <= 9, "{lo} {hi}");
            for sp in [Spacing::Integer, Spacing::Log, Spacing::Linear] {
                assert!(
                    x_ticks_within(sp, lo, hi, 8.0).len() <= 3 * MAX_TICKS,
                    "{sp:?} {lo} {hi}"
                );
            }
        }
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
