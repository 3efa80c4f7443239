//! tau across supply voltage (domain notes section 10): ln-linear interpolation between
//! characterised voltages, the subthreshold-swing bound below the lowest, the value held
//! above the highest, and the ageing factor. Every rule errs on the side of a larger tau.

use serde::Serialize;

/// How a value at an operating point was obtained.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Rule {
    /// A characterised point at this voltage, used unchanged.
    Characterised,
    /// Between two characterised voltages, ln-linear in VDD (an over-estimate of tau:
    /// ln tau is convex in VDD).
    Interpolated,
    /// Below the lowest characterised voltage: the subthreshold-swing upper bound.
    Bounded,
    /// Above the highest characterised voltage: its value reused.
    Held,
}

impl Rule {
    /// The rule's name as reports print it.
    pub fn name(self) -> &'static str {
        match self {
            Rule::Characterised => "characterised",
            Rule::Interpolated => "interpolated",
            Rule::Bounded => "bounded",
            Rule::Held => "held",
        }
    }
}

/// One characterised voltage: its VDD and a positive value there (tau, a window, tsu...).
pub type Known = (f64, f64);

/// The value at `vdd` from characterised points sorted by rising VDD (at least one, no
/// two at one VDD): ln-linear between two, held at the ends (the caller bounds tau below
/// the lowest). Returns the value and the rule.
///
/// # Formula
/// `ln y = ln y1 + (ln y2 - ln y1) (V - V1) / (V2 - V1)` for `V1 <= V <= V2`.
///
/// # Examples
/// ```
/// use latchwise::supply::model::{ln_linear, Rule};
/// // Between 0.7 V (25.9 ps) and 0.9 V (10.0 ps), at 0.8 V: 16.09348 ps.
/// let (t, rule) = ln_linear(&[(0.7, 25.9e-12), (0.9, 10.0e-12)], 0.8);
/// assert!((t / 16.09348e-12 - 1.0).abs() < 1e-6);
/// assert_eq!(rule, Rule::Interpolated);
/// ```
pub fn ln_linear(known: &[Known], vdd: f64) -> (f64, Rule) {
    let (lo, hi) = (known[0], known[known.len() - 1]);
    if let Some(k) = known.iter().find(|k| k.0 == vdd) {
        return (k.1, Rule::Characterised);
    }
    if vdd < lo.0 {
        return (lo.1, Rule::Held);
    }
    if vdd > hi.0 {
        return (hi.1, Rule::Held);
    }
    let i = known
        .iter()
        .position(|k| k.0 > vdd)
        .unwrap_or(known.len() - 1);
    let ((v1, y1), (v2, y2)) = (known[i - 1], known[i]);
    let s = (vdd - v1) / (v2 - v1);
    (
        (y1.ln() + (y2.ln() - y1.ln()) * s).exp(),
        Rule::Interpolated,
    )
}

/// tau below the lowest characterised voltage `v1` (tau1 there), bounded by the
/// subthreshold swing `ss` (volts per decade): the slope of ln tau in VDD is at most
/// ln 10 / (2 SS), since tau = C / gm at VDD/2 and gm rises at most a decade per SS.
///
/// # Formula
/// `tau(V) <= tau(V1) 10^((V1 - V) / (2 SS))` (domain notes section 10, P2).
///
/// # Examples
/// ```
/// use latchwise::supply::model::tau_bound_below;
/// let t = tau_bound_below(0.55, 123e-12, 79.8651e-3, 0.5);
/// assert!((t / 252.8907e-12 - 1.0).abs() < 1e-6);
/// ```
///
/// # References
/// Sakurai and Newton, "Alpha-power law MOSFET model", IEEE JSSC 25(2), 1990, and the EKV
/// interpolation (Enz, Krummenacher and Vittoz, 1995, recalled) for the current models.
pub fn tau_bound_below(v1: f64, tau1: f64, ss: f64, vdd: f64) -> f64 {
    tau1 * 10f64.powf((v1 - vdd) / (2.0 * ss))
}

/// The most a threshold shift `dvt` multiplies tau by: `10^(dvt / SS)` (domain notes
/// section 10, P3).
///
/// # Examples
/// ```
/// use latchwise::supply::model::ageing_factor;
/// assert!((ageing_factor(30e-3, 79.8651e-3) / 2.374834 - 1.0).abs() < 1e-6);
/// ```
pub fn ageing_factor(dvt: f64, ss: f64) -> f64 {
    10f64.powf(dvt / ss)
}

/// tau at `vdd` by the rules, from characterised taus sorted by rising VDD: ln-linear
/// between, the bound below the lowest (needs `ss`), held above the highest.
pub fn tau_at(known: &[Known], vdd: f64, ss: Option<f64>) -> Option<(f64, Rule)> {
    let (v1, tau1) = known[0];
    if vdd < v1 {
        return ss.map(|ss| (tau_bound_below(v1, tau1, ss, vdd), Rule::Bounded));
    }
    Some(ln_linear(known, vdd))
}

/// Where characterised taus (sorted by rising VDD) break the premises the rules rest on
/// (domain notes section 10): tau falls as VDD rises, ln tau is convex in VDD (P1), and
/// falls no faster than ln 10 / (2 SS) per volt (P2, with `ss`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Break {
    /// tau does not fall from the first voltage to the second.
    Rises(Known, Known),
    /// The middle point lies above the chord of its neighbours in ln tau.
    Concave(Known, Known, Known),
    /// tau falls faster between the two than `ss` allows; the largest SS that allows it.
    Steeper(Known, Known, f64),
}

/// The [`Break`]s of characterised taus sorted by rising VDD.
///
/// # Examples
/// ```
/// use latchwise::supply::model::{premise_breaks, Break};
/// // Falling, convex, and within 62.5 mV/decade: no break.
/// let good = [(0.6, 127e-12), (0.75, 28.1e-12), (0.9, 12.0e-12)];
/// assert!(premise_breaks(&good, Some(62.5e-3)).is_empty());
/// // The same table upside down rises with VDD.
/// let bad = [(0.6, 12.0e-12), (0.75, 28.1e-12), (0.9, 127e-12)];
/// assert!(matches!(premise_breaks(&bad, None)[0], Break::Rises(..)));
/// ```
pub fn premise_breaks(tau: &[Known], ss: Option<f64>) -> Vec<Break> {
    let mut out = Vec::new();
    // Slopes of ln tau between neighbours, per volt.
    let slope = |a: Known, b: Known| (b.1.ln() - a.1.ln()) / (b.0 - a.0);
    for w in tau.windows(2) {
        let (a, b) = (w[0], w[1]);
        if b.1 >= a.1 {
            out.push(Break::Rises(a, b));
        } else if let Some(ss) = ss {
            let s = -slope(a, b);
            // 1e-9: a table written from the bound itself is not flagged by rounding.
            if s > std::f64::consts::LN_10 / (2.0 * ss) * (1.0 + 1e-9) {
                out.push(Break::Steeper(a, b, std::f64::consts::LN_10 / (2.0 * s)));
            }
        }
    }
    // A table that rises is wrong at its root: the finer premises are not judged on it.
    if out.iter().any(|b| matches!(b, Break::Rises(..))) {
        out.retain(|b| matches!(b, Break::Rises(..)));
        return out;
    }
    for w in tau.windows(3) {
        // Convex: the slopes rise (grow less negative) with VDD.
        if slope(w[0], w[1]) > slope(w[1], w[2]) * (1.0 - 1e-9) + 1e-12 {
            out.push(Break::Concave(w[0], w[1], w[2]));
        }
    }
    out
}
