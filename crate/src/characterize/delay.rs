//! A simulated delay sweep: tau, the window and the balance offset from clock-to-output
//! delays measured at several data-to-clock offsets.
//!
//! Model (domain notes section 4): near the balance offset `m`, the extra delay beyond the
//! nominal `tcq` is `tau ln(tw / (2 |offset - m|))`, a straight line in `ln |offset - m|`
//! of slope `-tau`. Only the regenerative region follows it: far from `m` the extra delay
//! is noise around zero, and at `m` itself a simulation saturates.

use super::line::{self, Line};

/// Share of the largest extra delay below which a point is taken as nominal.
pub const NOMINAL_SHARE: f64 = 0.05;
/// Share of the largest extra delay above which points form a plateau when two or more
/// reach it: the simulation has saturated there.
pub const SATURATED_SHARE: f64 = 0.98;

/// Why a point was used or left out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Use {
    /// In the regenerative region: used.
    Used,
    /// Extra delay too small to tell from the nominal delay.
    Nominal,
    /// Too close to the balance offset: the delay has saturated.
    Saturated,
}

impl Use {
    /// The reason in words.
    pub fn reason(self) -> &'static str {
        match self {
            Use::Used => "used: in the regenerative region",
            Use::Nominal => "left out: extra delay below 5 % of the largest, nominal delay",
            Use::Saturated => "left out: on the plateau of the largest extra delay, saturated near the balance point",
        }
    }
}

/// The delay-sweep fit.
#[derive(Debug, Clone, PartialEq)]
pub struct DelayFit {
    /// tau, s.
    pub tau: f64,
    /// Its 95 % interval (Student t, with the balance offset held at its fit); an end is
    /// `None` where the data do not bound it.
    pub tau_ci: (Option<f64>, Option<f64>),
    /// tw, s.
    pub tw: f64,
    /// Its 95 % interval (delta method on ln tw, balance offset held).
    pub tw_ci: (Option<f64>, Option<f64>),
    /// The balance offset, s.
    pub offset_m: f64,
    /// The nominal clock-to-output delay used, s.
    pub tcq: f64,
    /// Whether tcq was given (else taken from the points far from the balance point).
    pub tcq_given: bool,
    /// How each point was used, in row order.
    pub uses: Vec<Use>,
    /// The line of extra delay in ln |offset - m|.
    pub line: Line,
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    let n = v.len();
    if n % 2 == 1 {
        v[n / 2]
    } else {
        0.5 * (v[n / 2 - 1] + v[n / 2])
    }
}

/// Fits tau, tw and the balance offset to (offset, delay) rows; `tcq` when known.
///
/// # Formula
/// tcq, when not given, is the median delay of the quarter of points farthest from the
/// longest delay. The balance offset minimises the residual sum of squares of the line of
/// extra delay in ln |offset - m| (golden-section search between the used points nearest
/// to the longest delay on either side).
///
/// # Errors
/// The reason in words: too few points in the regenerative region, or none on a side.
pub fn fit(offset: &[f64], delay: &[f64], tcq: Option<f64>) -> Result<DelayFit, String> {
    let n = offset.len();
    if n < 5 {
        return Err(format!(
            "{n} rows: a delay sweep needs at least five (offset, delay) rows"
        ));
    }
    let peak = (0..n)
        .max_by(|&i, &j| delay[i].total_cmp(&delay[j]))
        .unwrap_or(0);
    let centre = offset[peak];
    let tcq_value = tcq.unwrap_or_else(|| {
        let mut far: Vec<usize> = (0..n).collect();
        far.sort_by(|&i, &j| {
            (offset[j] - centre)
                .abs()
                .total_cmp(&(offset[i] - centre).abs())
        });
        median(far.iter().take((n / 4).max(1)).map(|&i| delay[i]).collect())
    });
    let extra: Vec<f64> = delay.iter().map(|d| d - tcq_value).collect();
    let top = extra[peak];
    if top <= 0.0 || top.is_nan() {
        return Err(
            "no delay exceeds tcq: the sweep does not reach the regenerative region".into(),
        );
    }
    // A plateau: two or more points within 2 % of the largest extra delay.
    let plateau = extra
        .iter()
        .filter(|e| **e >= SATURATED_SHARE * top)
        .count()
        >= 2;
    let uses: Vec<Use> = extra
        .iter()
        .map(|e| {
            if *e <= NOMINAL_SHARE * top {
                Use::Nominal
            } else if plateau && *e >= SATURATED_SHARE * top {
                Use::Saturated
            } else {
                Use::Used
            }
        })
        .collect();
    let used: Vec<usize> = (0..n).filter(|&i| uses[i] == Use::Used).collect();
    if used.len() < 4 {
        return Err(format!(
            "{} points in the regenerative region (extra delay above 5 % of the largest and \
             off any plateau): at least four are needed; sweep the offset more finely near \
             the balance point",
            used.len()
        ));
    }
    // m lies between the used points nearest the peak on either side.
    let left = used
        .iter()
        .filter(|&&i| offset[i] < centre)
        .map(|&i| offset[i])
        .fold(f64::NEG_INFINITY, f64::max);
    let right = used
        .iter()
        .filter(|&&i| offset[i] > centre)
        .map(|&i| offset[i])
        .fold(f64::INFINITY, f64::min);
    let span = offset.iter().fold(0.0f64, |s, o| s.max((o - centre).abs()));
    let (lo, hi) = match (left.is_finite(), right.is_finite()) {
        (true, true) => (left, right),
        (true, false) => (left, centre + span),
        (false, true) => (centre - span, right),
        (false, false) => return Err("no used point on either side of the balance point".into()),
    };
    let line_at = |m: f64| {
        let x: Vec<f64> = used.iter().map(|&i| (offset[i] - m).abs().ln()).collect();
        let y: Vec<f64> = used.iter().map(|&i| extra[i]).collect();
        line::fit(&x, &y)
    };
    let sse = |m: f64| line_at(m).map_or(f64::INFINITY, |l| l.sse);
    // Golden-section search, keeping clear of the end points where ln |offset - m| diverges.
    let eps = 1e-9 * (hi - lo).abs().max(f64::MIN_POSITIVE);
    let (mut a, mut b) = (lo + eps, hi - eps);
    let r = 0.5 * (5f64.sqrt() - 1.0);
    let (mut c, mut d) = (b - r * (b - a), a + r * (b - a));
    for _ in 0..200 {
        if sse(c) < sse(d) {
            b = d;
        } else {
            a = c;
        }
        c = b - r * (b - a);
        d = a + r * (b - a);
    }
    let m = 0.5 * (a + b);
    let l = line_at(m).ok_or("the used points do not spread in distance from the balance point")?;
    if l.slope >= 0.0 {
        return Err(
            "the extra delay does not fall away from the balance point: check the columns".into(),
        );
    }
    let tau = -l.slope;
    let t = l.t95();
    // ln(tw/2) = intercept / tau = -intercept / slope; delta method for its variance.
    let ln_half = -l.intercept / l.slope;
    let (da, db) = (-1.0 / l.slope, l.intercept / (l.slope * l.slope));
    let var = da * da * l.var_intercept + db * db * l.var_slope + 2.0 * da * db * l.cov;
    let se = var.max(0.0).sqrt();
    let se_tau = l.var_slope.sqrt();
    let tw = 2.0 * ln_half.exp();
    if !tw.is_normal() {
        return Err(
            "the fitted tw is beyond any time: the delays do not follow \
                    tau ln(tw / (2 |offset - m|)); check the data"
                .into(),
        );
    }
    Ok(DelayFit {
        tau,
        tau_ci: (line::bound(tau - t * se_tau), line::bound(tau + t * se_tau)),
        tw,
        tw_ci: (
            line::bound(2.0 * (ln_half - t * se).exp()),
            line::bound(2.0 * (ln_half + t * se).exp()),
        ),
        offset_m: m,
        tcq: tcq_value,
        tcq_given: tcq.is_some(),
        uses,
        line: l,
    })
}
