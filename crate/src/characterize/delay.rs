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
    /// The line of extra delay in ln |offset - m| (the log-law fit, or the start of the
    /// whole-sweep fit).
    pub line: Line,
    /// Each point's residual from the whole-sweep fit, s (None for the log-law fit).
    pub residuals: Option<Vec<f64>>,
    /// The whole-sweep fit's tail shape k (2: ln coth; near 0: a power-law tail).
    pub tail_shape: Option<f64>,
    /// The whole-sweep fit: sd of ln tau, sd of ln tw and their correlation, from the
    /// curvature at the fit.
    pub joint: Option<(f64, f64, f64)>,
    /// The log-law fit: how far the local slope drifts across the points it used (the
    /// slope of the nearer half against the farther half, relative).
    pub slope_drift: Option<f64>,
    /// The whole-sweep fit: each used point's leverage h, from the fit's tangent plane
    /// (J (J'J)^-1 J' at the fit; None for a point not used). None for the log-law fit.
    pub leverage: Option<Vec<Option<f64>>>,
}

impl DelayFit {
    /// The whole-sweep fit's delay at `offset`, s (None for the log-law fit).
    pub fn predict(&self, offset: f64) -> Option<f64> {
        let k = self.tail_shape?;
        let x = ((offset - self.offset_m).abs() / (self.tw / 2.0)).max(1e-300);
        Some(self.tcq + self.tau * tail_law(x, k))
    }
}

/// The median of `v` (the mean of the middle two for an even count).
pub(crate) fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    let n = v.len();
    if n % 2 == 1 {
        v[n / 2]
    } else {
        0.5 * (v[n / 2 - 1] + v[n / 2])
    }
}

/// The delays of the quarter of a sweep's points farthest in offset from its longest
/// delay (at least one point): where the delay has returned to tcq.
pub(crate) fn far_quarter(offset: &[f64], delay: &[f64]) -> Vec<f64> {
    let n = offset.len();
    let Some(peak) = (0..n).max_by(|&i, &j| delay[i].total_cmp(&delay[j])) else {
        return Vec::new();
    };
    let centre = offset[peak];
    let mut far: Vec<usize> = (0..n).collect();
    far.sort_by(|&i, &j| {
        (offset[j] - centre)
            .abs()
            .total_cmp(&(offset[i] - centre).abs())
    });
    far.iter().take((n / 4).max(1)).map(|&i| delay[i]).collect()
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
    let tcq_value = tcq.unwrap_or_else(|| median(far_quarter(offset, delay)));
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
        residuals: None,
        slope_drift: None,
        leverage: None,
        tail_shape: None,
        joint: None,
    })
}

/// The log law over the regenerative region (`method=log`), with how far the local slope
/// drifts across the points it used: the slope fitted to the nearer half of them against
/// that of the farther half, relative to the whole fit's. Where the delay has not yet
/// reached the log law (the transition to tcq), the drift shows it.
///
/// # Errors
/// As the fit's own.
pub fn fit_log(offset: &[f64], delay: &[f64], tcq: Option<f64>) -> Result<DelayFit, String> {
    let mut f = fit(offset, delay, tcq)?;
    let mut used: Vec<usize> = (0..offset.len())
        .filter(|&i| f.uses[i] == Use::Used)
        .collect();
    used.sort_by(|&i, &j| {
        (offset[i] - f.offset_m)
            .abs()
            .total_cmp(&(offset[j] - f.offset_m).abs())
    });
    let half = used.len() / 2;
    let slope = |set: &[usize]| {
        let x: Vec<f64> = set
            .iter()
            .map(|&i| (offset[i] - f.offset_m).abs().ln())
            .collect();
        let y: Vec<f64> = set.iter().map(|&i| delay[i] - f.tcq).collect();
        line::fit(&x, &y).map(|l| l.slope)
    };
    if half >= 2 && used.len() - half >= 2 {
        if let (Some(near), Some(far)) = (slope(&used[..half]), slope(&used[half..])) {
            f.slope_drift = Some((far - near).abs() / f.tau);
        }
    }
    Ok(f)
}

/// `ln coth x` for x > 0, accurate at both ends: `ln1p(e) - ln1p(-e)` with `e = exp(-2x)`.
pub fn ln_coth(x: f64) -> f64 {
    let e = (-2.0 * x).exp();
    e.ln_1p() - (-e).ln_1p()
}

/// The extra delay of the whole-sweep model at `x = |offset - m| / ds` with tail shape
/// `k`: `ln(1 + k / (exp(k x) - 1))`, which is `ln coth x` at k = 2 and `ln(1 + 1/x)` as
/// k -> 0; near the balance point every member follows the log law `-ln x`.
pub fn tail_law(x: f64, k: f64) -> f64 {
    let h = (k * x).exp_m1() / k;
    (1.0 / h).ln_1p()
}

/// The most parameters of the whole-sweep fit: tau, m, ln ds, ln k, tcq.
const NP: usize = 5;

/// The whole-sweep fit: `delay = tcq + tau ln(1 + k / (exp(k |offset - m| / ds) - 1))`,
/// `tw = 2 ds`: near the balance point the log law `tcq + tau ln(tw / (2 |offset - m|))`,
/// far from it a smooth return to tcq whose shape k the sweep decides (k = 2: `ln coth`,
/// an exponential tail; k -> 0: `ln(1 + tw / (2 |offset - m|))`, a slower one), by
/// Levenberg-Marquardt least squares over every point off a saturated plateau (tcq
/// fitted too unless given; derivatives by central differences); 95 % Student-t intervals
/// from the curvature at the fit.
///
/// # Errors
/// The reason in words: too few points, no delay above tcq, or a fit that does not settle.
pub fn fit_coth(offset: &[f64], delay: &[f64], tcq: Option<f64>) -> Result<DelayFit, String> {
    // The log-law fit gives the start (and the plateau and the points' uses).
    let start = fit(offset, delay, tcq)?;
    let n = offset.len();
    let uses: Vec<Use> = start
        .uses
        .iter()
        .map(|u| {
            if *u == Use::Saturated {
                Use::Saturated
            } else {
                Use::Used
            }
        })
        .collect();
    let idx: Vec<usize> = (0..n).filter(|&i| uses[i] == Use::Used).collect();
    let fit_tcq = tcq.is_none();
    let p = if fit_tcq { NP } else { NP - 1 };
    if idx.len() <= p + 1 {
        return Err(format!(
            "{} points off the plateau: the whole-sweep fit needs more than {}",
            idx.len(),
            p + 1
        ));
    }
    // Parameters: tau, m, ln ds, ln k, tcq; in units near one (ps, ps, nepers).
    let unit = start.tau.max(f64::MIN_POSITIVE);
    let mut th = [
        start.tau / unit,
        start.offset_m / unit,
        (start.tw / 2.0).ln(),
        2f64.ln(),
        start.tcq / unit,
    ];
    let value = |th: &[f64; NP], i: usize| -> f64 {
        let (tau, m, ds, k) = (th[0] * unit, th[1] * unit, th[2].exp(), th[3].exp());
        let x = ((offset[i] - m).abs() / ds).max(1e-300);
        th[4] * unit + tau * tail_law(x, k)
    };
    let jac = |th: &[f64; NP], i: usize| -> [f64; NP] {
        let mut j = [0.0; NP];
        for u in 0..p {
            let h = 1e-6 * th[u].abs().max(1e-3);
            let (mut up, mut down) = (*th, *th);
            up[u] += h;
            down[u] -= h;
            j[u] = (value(&up, i) - value(&down, i)) / (2.0 * h);
        }
        j
    };
    let sse_of = |th: &[f64; NP]| -> f64 {
        idx.iter()
            .map(|&i| {
                let r = delay[i] - value(th, i);
                r * r
            })
            .sum()
    };
    let mut sse = sse_of(&th);
    let mut lambda = 1e-3;
    let mut settled = false;
    for _ in 0..500 {
        let mut a = [[0.0f64; NP]; NP];
        let mut b = [0.0f64; NP];
        for &i in &idx {
            let r = delay[i] - value(&th, i);
            let j = jac(&th, i);
            for u in 0..p {
                b[u] += j[u] * r;
                for v in 0..p {
                    a[u][v] += j[u] * j[v];
                }
            }
        }
        let mut improved = false;
        for _ in 0..40 {
            let mut damped = a;
            for (u, row) in damped.iter_mut().enumerate().take(p) {
                row[u] *= 1.0 + lambda;
            }
            let Some(step) = solve(&damped, &b, p) else {
                lambda *= 10.0;
                continue;
            };
            let mut next = th;
            for u in 0..p {
                next[u] += step[u];
            }
            let s = sse_of(&next);
            // ln k within [-30, 6]: k = 0 would leave the tail law 0/0.
            if s.is_finite() && s <= sse && next[0] > 0.0 && (-30.0..6.0).contains(&next[3]) {
                let small = (0..p).all(|u| step[u].abs() <= 1e-9 * th[u].abs().max(1e-3));
                let gain = sse - s;
                th = next;
                sse = s;
                lambda = (lambda / 10.0).max(1e-12);
                improved = true;
                settled = small || gain <= 1e-12 * sse;
                break;
            }
            lambda *= 10.0;
        }
        if settled || !improved {
            settled = true;
            break;
        }
    }
    if !settled || !th.iter().all(|v| v.is_finite()) || th[0] <= 0.0 {
        return Err(
            "the whole-sweep fit did not settle: check the sweep, or try method=log".into(),
        );
    }
    // The curvature at the fit: covariance s^2 (J'J)^-1 with n - p degrees of freedom.
    // A tail shape the sweep leaves open (k near 0 or large, where the model no longer
    // changes with it) is held at its fit, so that tau and tw keep their intervals.
    let curvature = |free: &[usize]| -> Option<[[f64; NP]; NP]> {
        let mut a = [[0.0f64; NP]; NP];
        for &i in &idx {
            let j = jac(&th, i);
            for (u, &fu) in free.iter().enumerate() {
                for (v, &fv) in free.iter().enumerate() {
                    a[u][v] += j[fu] * j[fv];
                }
            }
        }
        invert(&a, free.len())
    };
    let all: Vec<usize> = (0..p).collect();
    let held: Vec<usize> = (0..p).filter(|&u| u != 3).collect();
    let (inv, free) = match curvature(&all).filter(|m| (0..p).all(|u| m[u][u] > 0.0)) {
        Some(m) => (m, all),
        None => (
            curvature(&held).ok_or("the sweep cannot separate tau from the window: widen it")?,
            held,
        ),
    };
    let df = idx.len() - p;
    let s2 = sse / df as f64;
    let t = crate::numeric::special::t_quantile(0.975, df as f64);
    let se_tau = (s2 * inv[0][0]).max(0.0).sqrt() * unit;
    let se_lnds = (s2 * inv[2][2]).max(0.0).sqrt();
    let (tau, m, lnds) = (th[0] * unit, th[1] * unit, th[2]);
    let tw = 2.0 * lnds.exp();
    if !tw.is_normal() {
        return Err("the fitted tw is beyond any time: check the data".into());
    }
    let residuals: Vec<f64> = (0..n).map(|i| delay[i] - value(&th, i)).collect();
    let leverage: Vec<Option<f64>> = (0..n)
        .map(|i| {
            (uses[i] == Use::Used).then(|| {
                let j = jac(&th, i);
                let mut h = 0.0;
                for (u, &fu) in free.iter().enumerate() {
                    for (v, &fv) in free.iter().enumerate() {
                        h += j[fu] * inv[u][v] * j[fv];
                    }
                }
                h.clamp(0.0, 1.0)
            })
        })
        .collect();
    Ok(DelayFit {
        tau,
        tau_ci: (line::bound(tau - t * se_tau), line::bound(tau + t * se_tau)),
        tw,
        tw_ci: (
            line::bound(2.0 * (lnds - t * se_lnds).exp()),
            line::bound(2.0 * (lnds + t * se_lnds).exp()),
        ),
        offset_m: m,
        tcq: th[4] * unit,
        tcq_given: !fit_tcq,
        uses,
        line: start.line,
        residuals: Some(residuals),
        slope_drift: None,
        leverage: Some(leverage),
        tail_shape: Some(th[3].exp()),
        // ln tw = ln 2 + ln ds; sd(ln tau) = sd(tau)/tau.
        // Undefined for a sweep the model fits exactly (no spread to correlate).
        joint: (se_tau > 0.0 && se_lnds > 0.0).then(|| {
            (
                se_tau / tau,
                se_lnds,
                (s2 * inv[0][2] * unit / (se_tau * se_lnds)).clamp(-1.0, 1.0),
            )
        }),
    })
}

/// Solves the `p` by `p` system `a x = b` by Gaussian elimination with partial pivoting.
fn solve(a: &[[f64; NP]; NP], b: &[f64; NP], p: usize) -> Option<[f64; NP]> {
    let mut m = *a;
    let mut y = *b;
    for c in 0..p {
        let piv = (c..p).max_by(|&i, &j| m[i][c].abs().total_cmp(&m[j][c].abs()))?;
        if m[piv][c] == 0.0 || !m[piv][c].is_finite() {
            return None;
        }
        m.swap(c, piv);
        y.swap(c, piv);
        let pivot = m[c];
        for r in c + 1..p {
            let f = m[r][c] / pivot[c];
            for (v, pv) in m[r].iter_mut().zip(pivot).take(p).skip(c) {
                *v -= f * pv;
            }
            y[r] -= f * y[c];
        }
    }
    let mut x = [0.0f64; NP];
    for c in (0..p).rev() {
        let s: f64 = (c + 1..p).map(|k| m[c][k] * x[k]).sum();
        x[c] = (y[c] - s) / m[c][c];
    }
    x.iter().all(|v| v.is_finite()).then_some(x)
}

/// The inverse of the leading `p` by `p` block of `a`, column by column.
fn invert(a: &[[f64; NP]; NP], p: usize) -> Option<[[f64; NP]; NP]> {
    let mut inv = [[0.0f64; NP]; NP];
    for c in 0..p {
        let mut e = [0.0f64; NP];
        e[c] = 1.0;
        let x = solve(a, &e, p)?;
        for r in 0..p {
            inv[r][c] = x[r];
        }
    }
    Some(inv)
}
