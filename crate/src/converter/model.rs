//! Metastability of a successive-approximation converter (domain notes section 11): which
//! conversions run out of time, at which step, and how large the code error is.
//!
//! Units: codes and residues in LSB (V_FS = 2^B LSB), times in units of tau. The input is
//! uniform over the full scale; a decision on residue r takes `ln(V_x / |r|)` (no time
//! when |r| >= V_x). Probabilities are carried by their natural logarithms.

use std::collections::BTreeMap;

use crate::numeric::normal::ln_sum_exp;

/// What one asynchronous conversion does near threshold `t`: the step that tests it, and
/// the time the other decisions take (in tau).
#[derive(Debug, Clone, Copy, PartialEq)]
struct Threshold {
    /// The threshold code, 1 to 2^B - 1.
    code: u64,
    /// The binary-search step that tests it (1 = MSB).
    step: u32,
    /// The decisions before it: their residues are the distances to its ancestors.
    before: f64,
}

/// Threshold `code` (1 to 2^B - 1) of a `bits`-bit search: the step that tests it, and the
/// time its ancestors' decisions take for an input at the threshold (O(bits), no table).
fn threshold(bits: u32, vx_lsb: f64, code: u64) -> Threshold {
    let (mut lo, mut hi) = (0u64, 1u64 << bits);
    let mut before = 0.0;
    let mut step = 0;
    for m in 1..=bits {
        let mid = (lo + hi) / 2;
        if mid == code {
            step = m;
            break;
        }
        before += (vx_lsb / code.abs_diff(mid) as f64).ln().max(0.0);
        if code < mid {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    Threshold { code, step, before }
}

/// Each threshold of a `bits`-bit search, in code order.
fn thresholds(bits: u32, vx_lsb: f64) -> impl Iterator<Item = Threshold> {
    (1..1u64 << bits).map(move |code| threshold(bits, vx_lsb, code))
}

/// The time (in tau) of the decision at step `m` after a hard one: its residue is exactly
/// 2^(B - m) LSB.
fn after(bits: u32, vx_lsb: f64, m: u32) -> f64 {
    (vx_lsb / 2f64.powi((bits - m) as i32)).ln().max(0.0)
}

/// `ln(exp(a) - exp(b))` for a >= b.
fn ln_diff(a: f64, b: f64) -> f64 {
    if b == f64::NEG_INFINITY {
        a
    } else {
        a + (-(b - a).exp_m1()).ln()
    }
}

/// How a timed-out bit and the ones after it are filled.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Fill {
    /// The timed-out bit and the rest stay 0.
    Reset,
    /// The timed-out bit is set to 1, the rest to 0.
    Midpoint,
}

/// An asynchronous converter's timeouts: where they land and the code errors they leave.
#[derive(Debug, Clone, PartialEq)]
pub struct AsyncTimeouts {
    /// ln of the probability per conversion that a decision times out.
    pub ln_p_meta: f64,
    /// The share of timeouts landing at each step, 1 (MSB) to B.
    pub share_by_step: Vec<f64>,
    /// ln of the probability of each code error size |e| > 0 (LSB).
    pub ln_p_error: BTreeMap<u64, f64>,
}

impl AsyncTimeouts {
    /// ln P(|e| >= k) per conversion (k >= 1).
    pub fn ln_p_at_least(&self, k: u64) -> f64 {
        let terms: Vec<f64> = self.ln_p_error.range(k..).map(|(_, p)| *p).collect();
        ln_sum_exp(&terms)
    }
}

/// The timeouts of an asynchronous SAR converter of `bits` bits whose decisions share a
/// budget of `tb` tau, with the decision level `vx_lsb` (V_x in LSB).
///
/// # Formula
/// For threshold T tested at step s, with E_b the time its ancestors' decisions take
/// (residues |T - T_k|) and S_m the time of the decisions at steps s+1..m (residues
/// exactly 2^(B-m) LSB), the conversion times out at step s when the hard decision's
/// residue is below V_x e^-(tb - E_b), and at step m > s when the time runs out there:
/// `P_s = 2 (V_x / V_FS) e^-(tb - E_b)`, `P_m = 2 (V_x / V_FS) (e^-(tb - E_b - S_m) -
/// e^-(tb - E_b - S_(m-1)))`; their sum over T and m is P_meta (domain notes section 11).
/// An input just above T has code T, just below T - 1, each half of the time; the bits
/// before the timeout are right, the rest are filled by `fill`.
pub fn async_timeouts(bits: u32, tb: f64, vx_lsb: f64, fill: Fill) -> AsyncTimeouts {
    let n = 1u64 << bits;
    let ln_c = (2.0 * vx_lsb / n as f64).ln();
    let mut by_step = vec![Vec::new(); bits as usize + 1];
    let mut errors: BTreeMap<u64, Vec<f64>> = BTreeMap::new();
    let mut all = Vec::new();
    for t in thresholds(bits, vx_lsb) {
        let mut landings = Vec::with_capacity((bits - t.step + 1) as usize);
        let mut prev = ln_c - (tb - t.before);
        landings.push((t.step, prev));
        let mut s = 0.0;
        for m in t.step + 1..=bits {
            let e = after(bits, vx_lsb, m);
            if e > 0.0 {
                s += e;
                let cur = ln_c - (tb - t.before - s);
                landings.push((m, ln_diff(cur, prev)));
                prev = cur;
            }
        }
        for (m, lp) in landings {
            by_step[m as usize].push(lp);
            all.push(lp);
            for code in [t.code, t.code - 1] {
                // Bits 1..m-1 (MSB first) as the code has them; bit m by the fill; the
                // rest 0.
                let keep = bits - m + 1;
                let high = (code >> keep) << keep;
                let out = match fill {
                    Fill::Reset => high,
                    Fill::Midpoint => high | (1 << (keep - 1)),
                };
                let e = code.abs_diff(out);
                if e > 0 {
                    errors
                        .entry(e)
                        .or_default()
                        .push(lp - std::f64::consts::LN_2);
                }
            }
        }
    }
    let ln_p_meta = ln_sum_exp(&all);
    AsyncTimeouts {
        ln_p_meta,
        share_by_step: by_step[1..]
            .iter()
            .map(|v| (ln_sum_exp(v) - ln_p_meta).exp())
            .collect(),
        ln_p_error: errors
            .into_iter()
            .map(|(e, v)| (e, ln_sum_exp(&v)))
            .collect(),
    }
}

/// A parked (DC) input at threshold `code` with comparator noise `sigma_lsb` (LSB rms):
/// ln of its timeout probability per conversion, and the time the other decisions take.
///
/// # Formula
/// `2 (V_x / sigma_n) phi(0) e^-(tb - E_b - E_a)`: the noise spreads the residue around
/// zero with density phi(0)/sigma_n there.
pub fn ln_p_static(bits: u32, tb: f64, vx_lsb: f64, sigma_lsb: f64, code: u64) -> (f64, f64) {
    let t = threshold(bits, vx_lsb, code);
    let e_after: f64 = (t.step + 1..=bits).map(|m| after(bits, vx_lsb, m)).sum();
    let used = t.before + e_after;
    let ln_phi0 = -0.5 * (2.0 * std::f64::consts::PI).ln();
    (
        (2.0 * vx_lsb / sigma_lsb).ln() + ln_phi0 - (tb - used),
        used,
    )
}

/// The threshold code where a parked input fails most often: the one whose other
/// decisions take the longest, and that time (in tau).
pub fn worst_static_code(bits: u32, vx_lsb: f64) -> (u64, f64) {
    thresholds(bits, vx_lsb)
        .map(|t| {
            let e_after: f64 = (t.step + 1..=bits).map(|m| after(bits, vx_lsb, m)).sum();
            (t.code, t.before + e_after)
        })
        .fold((0, f64::NEG_INFINITY), |b, x| if x.1 > b.1 { x } else { b })
}

/// A synchronous converter (`tbit` per bit): ln of p, the probability per threshold per
/// conversion that its decision is late, `p = 2 V_x e^-(tbit/tau) / V_FS`.
pub fn ln_p_sync(bits: u32, tbit: f64, vx_lsb: f64) -> f64 {
    (2.0 * vx_lsb).ln() - tbit - f64::from(bits) * std::f64::consts::LN_2
}

/// A synchronous converter whose late bit can disagree between the DAC and the register
/// (`hard` consumption): each size |e| of code error (LSB) with ln of its probability per
/// conversion, given ln p.
///
/// # Formula
/// Step i (MSB = 1) is late with probability 2^(i-1) p, and leaves |e| = 2^(B-i) or
/// 2^(B-i) - 1, equally likely (domain notes section 11).
pub fn sync_hard_errors(bits: u32, ln_p: f64) -> BTreeMap<u64, f64> {
    let mut out: BTreeMap<u64, Vec<f64>> = BTreeMap::new();
    for i in 1..=bits {
        let lp = ln_p + f64::from(i - 1) * std::f64::consts::LN_2 - std::f64::consts::LN_2;
        let big = 1u64 << (bits - i);
        for e in [big, big - 1] {
            if e > 0 {
                out.entry(e).or_default().push(lp);
            }
        }
    }
    out.into_iter().map(|(e, v)| (e, ln_sum_exp(&v))).collect()
}

/// The mean square code error (LSB^2) of an error distribution given by ln probabilities.
pub fn mean_square(errors: &BTreeMap<u64, f64>) -> f64 {
    errors
        .iter()
        .map(|(e, lp)| (*e as f64).powi(2) * lp.exp())
        .sum()
}

/// The ENOB loss (bits) of a mean square code error `e2` (LSB^2) on top of quantisation:
/// `0.5 log2(1 + 12 E[e^2])`.
pub fn enob_loss(e2: f64) -> f64 {
    0.5 * (12.0 * e2).ln_1p() / std::f64::consts::LN_2
}
