//! The roll-up of a whole design: every crossing at every corner, the totals, the worst
//! corner, the cheapest fix, and the spread of the total under a shared uncertainty of
//! tau and the window (domain notes section 7).

use std::cmp::Ordering;
use std::collections::BinaryHeap;
use std::f64::consts::{LN_10, PI};

use std::sync::Arc;

use crate::crossing::Synchronizer;
use crate::numeric::exp10;
use crate::numeric::normal::{cdf, ln_sum_exp};
use crate::numeric::solve::{bisect_last, illinois};
use crate::reliability::FIT_PER_RATE;

/// The longest chain the fix plan builds.
pub const MAX_STAGES: u32 = 1000;

/// One crossing at one corner: its synchronizer case (the synchronizer's own model) and
/// its instances, with the two terms of its rate law at its own stages kept for sums at
/// many tau scales.
#[derive(Debug, Clone, PartialEq)]
pub struct Cell {
    /// The row's synchronizer at this corner (shared by equal rows).
    pub sync: Arc<Synchronizer>,
    /// log10 of the instances.
    log10_count: f64,
    /// log10 FIT of the row at its own stages before resolution: count, the rate law's
    /// fdata fclk window K, and 3.6e12.
    pub log10_fit0: f64,
    /// The resolution exponent at its own stages, in decades, at unit tau scale.
    pub decades: f64,
    /// The decades each further stage adds, where that is one number (see
    /// [`Synchronizer::extra_stage_decades`]): the fix plan's deeper chains without the
    /// logarithms again.
    step: Option<f64>,
}

impl Cell {
    /// The cell of `count` instances of `sync`, whose rate law's terms at its own stages
    /// ([`Synchronizer::log10_rate_terms`]) are `(pre, decades)`.
    pub fn with_terms(sync: Arc<Synchronizer>, count: f64, (pre, decades): (f64, f64)) -> Cell {
        let log10_count = count.log10();
        let step = sync.extra_stage_decades();
        Cell {
            sync,
            log10_count,
            log10_fit0: pre + log10_count + FIT_PER_RATE.log10(),
            decades,
            step,
        }
    }

    /// Whether the row gives its resolution time directly (no chain to deepen).
    pub fn tr_given(&self) -> bool {
        self.sync.tr().is_some()
    }

    /// The two terms of log10 FIT with `stages` flip-flops: before resolution, and the
    /// resolution exponent in decades at unit tau scale (which a tau scale divides).
    pub fn terms(&self, stages: u32) -> (f64, f64) {
        let own = self.sync.stages();
        if stages == own {
            return (self.log10_fit0, self.decades);
        }
        if let (Some(step), true) = (self.step, stages > own) {
            return (
                self.log10_fit0,
                self.decades + f64::from(stages - own) * step,
            );
        }
        let (pre, decades) = self.sync.log10_rate_terms(stages);
        (pre + self.log10_count + FIT_PER_RATE.log10(), decades)
    }

    /// log10 FIT with `stages` flip-flops and every tau times `scale`.
    pub fn log10_fit(&self, stages: u32, scale: f64) -> f64 {
        let (fit0, decades) = self.terms(stages);
        fit0 - decades / scale
    }
}

/// The design at its corners: `cells[row][corner]`, each row's stages and count.
#[derive(Debug, Clone, PartialEq)]
pub struct Rollup {
    /// Every row at every corner.
    pub cells: Vec<Vec<Cell>>,
    /// Stages of each row.
    pub stages: Vec<u32>,
    /// Instances of each row.
    pub counts: Vec<f64>,
    /// Flip-flops per stage of one instance of each row (its width; 1 for one bit).
    pub widths: Vec<f64>,
    /// The most stages the fix plan may give each row.
    pub caps: Vec<u32>,
}

/// log10 of a sum of numbers given by their log10.
pub fn log10_sum(logs: impl IntoIterator<Item = f64>) -> f64 {
    let ln: Vec<f64> = logs.into_iter().map(|l| l * LN_10).collect();
    ln_sum_exp(&ln) / LN_10
}

impl Rollup {
    /// Flip-flops of row `r` at `stages`: its instances times its width times the stages.
    pub fn flip_flops(&self, r: usize, stages: u32) -> f64 {
        self.counts[r] * self.widths[r] * f64::from(stages)
    }

    /// Flip-flops that taking row `r` from its stages to `stages` adds.
    pub fn flip_flops_added(&self, r: usize, stages: u32) -> f64 {
        self.flip_flops(r, stages) - self.flip_flops(r, self.stages[r])
    }

    /// The number of corners.
    pub fn corners(&self) -> usize {
        self.cells.first().map_or(0, Vec::len)
    }

    /// log10 FIT of every row at `corner`, with `stages`.
    pub fn row_fits(&self, corner: usize, stages: &[u32]) -> Vec<f64> {
        self.cells
            .iter()
            .zip(stages)
            .map(|(c, s)| c[corner].log10_fit(*s, 1.0))
            .collect()
    }

    /// log10 total FIT at each corner with `stages`, taus times `scale`.
    pub fn totals(&self, stages: &[u32], scale: f64) -> Vec<f64> {
        (0..self.corners())
            .map(|k| {
                log10_sum(
                    self.cells
                        .iter()
                        .zip(stages)
                        .map(|(c, s)| c[k].log10_fit(*s, scale)),
                )
            })
            .collect()
    }

    /// The worst corner and its log10 total: the largest total.
    pub fn worst(totals: &[f64]) -> (usize, f64) {
        totals
            .iter()
            .copied()
            .enumerate()
            .fold((0, f64::NEG_INFINITY), |best, (k, t)| {
                if t > best.1 {
                    (k, t)
                } else {
                    best
                }
            })
    }

    /// The fewest added flip-flops, greedily, that bring every corner within
    /// `10^log10_budget` FIT: one stage at a time on the row that removes the most FIT per
    /// added flip-flop at the current worst corner. Rows given by `tr` are left alone.
    /// Returns the new stage counts, or `None` when adding stages cannot meet the budget.
    pub fn fix(&self, log10_budget: f64) -> Option<Vec<u32>> {
        let mut stages = self.stages.clone();
        let budget = exp10(log10_budget);
        let corners = self.corners();
        // Linear FIT for the search (each row's FIT is far from f64's limits under the
        // fields' limits); the report recomputes the totals exactly in logarithms.
        let lin = |k: usize, r: usize, s: u32| exp10(self.cells[r][k].log10_fit(s, 1.0));
        // Each row's FIT at each corner at its current stages, row by row.
        let mut cur: Vec<f64> = (0..self.cells.len())
            .flat_map(|r| (0..corners).map(move |k| (r, k)))
            .map(|(r, k)| lin(k, r, stages[r]))
            .collect();
        let sum_afresh = |cur: &[f64]| -> Vec<f64> {
            (0..corners)
                .map(|k| cur.iter().skip(k).step_by(corners.max(1)).sum())
                .collect()
        };
        let mut totals = sum_afresh(&cur);
        let worst_of = |t: &[f64]| {
            t.iter()
                .copied()
                .enumerate()
                .fold(
                    (0, f64::NEG_INFINITY),
                    |b, (k, v)| if v > b.1 { (k, v) } else { b },
                )
        };
        #[derive(PartialEq)]
        struct Gain(f64, usize, u32);
        impl Eq for Gain {}
        impl PartialOrd for Gain {
            fn partial_cmp(&self, o: &Self) -> Option<Ordering> {
                Some(self.cmp(o))
            }
        }
        impl Ord for Gain {
            fn cmp(&self, o: &Self) -> Ordering {
                self.0.total_cmp(&o.0)
            }
        }
        let gain = |cur: &[f64], k: usize, r: usize, s: u32| {
            // FIT removed per flip-flop added: a stage costs count x width flip-flops.
            (cur[r * corners + k] - lin(k, r, s + 1)) / (self.counts[r] * self.widths[r])
        };
        let candidates = |cur: &[f64], k: usize, stages: &[u32]| -> BinaryHeap<Gain> {
            (0..self.cells.len())
                .filter(|&r| !self.cells[r][k].tr_given() && stages[r] < self.caps[r])
                .map(|r| Gain(gain(cur, k, r, stages[r]), r, stages[r]))
                .collect()
        };
        let (mut at, _) = worst_of(&totals);
        let mut heap = candidates(&cur, at, &stages);
        let mut steps: u64 = 0;
        // Each corner's total when last summed afresh: the running sums carry rounding
        // of that size, so they are summed afresh once they fall 1000-fold below it.
        let mut summed = totals.clone();
        loop {
            if worst_of(&totals).1 <= budget * (1.0 + 1e-12) {
                // Met by the running sums: confirm by summing afresh.
                totals = sum_afresh(&cur);
                summed.clone_from(&totals);
                if worst_of(&totals).1 <= budget * (1.0 + 1e-12) {
                    break;
                }
            }
            steps += 1;
            if steps > 10_000_000 {
                return None;
            }
            let (k, _) = worst_of(&totals);
            if k != at {
                at = k;
                heap = candidates(&cur, at, &stages);
            }
            let Gain(g, r, s) = heap.pop()?;
            if s != stages[r] {
                continue; // Stale: the row has grown since.
            }
            if g <= 0.0 {
                return None;
            }
            stages[r] = s + 1;
            let mut cancelled = false;
            for (k, t) in totals.iter_mut().enumerate() {
                let next = lin(k, r, s + 1);
                *t += next - cur[r * corners + k];
                cur[r * corners + k] = next;
                cancelled |= *t < summed[k] * 1e-3;
            }
            if cancelled {
                totals = sum_afresh(&cur);
                summed.clone_from(&totals);
            }
            if stages[r] < self.caps[r] {
                heap.push(Gain(gain(&cur, at, r, stages[r]), r, stages[r]));
            }
        }
        Some(stages)
    }

    /// log10 of the worst corner's total with every tau times `scale`.
    pub fn log10_worst_at(&self, scale: f64) -> f64 {
        self.terms().log10_worst_at(scale)
    }

    /// Each corner's rows (at their own stages) merged by exponent, for sums at many tau
    /// scales: rows sharing resolution time and tau (the same clock, depth and corner,
    /// as most rows of a design do) add their FIT at zero resolution time once.
    pub fn terms(&self) -> Terms {
        self.terms_at(&self.stages)
    }

    /// As [`Rollup::terms`], with the rows at `stages` (a fix plan's) instead of their own.
    pub fn terms_at(&self, stages: &[u32]) -> Terms {
        Terms(
            (0..self.corners())
                .map(|k| {
                    let mut t: Vec<(f64, f64)> = self
                        .cells
                        .iter()
                        .zip(stages)
                        .map(|(c, s)| c[k].terms(*s))
                        .collect();
                    t.sort_unstable_by(|a, b| a.1.total_cmp(&b.1));
                    let mut merged: Vec<(f64, f64)> = Vec::new();
                    let mut start = 0;
                    for i in 1..=t.len() {
                        if i == t.len() || t[i].1.to_bits() != t[start].1.to_bits() {
                            merged.push((log10_sum(t[start..i].iter().map(|x| x.0)), t[start].1));
                            start = i;
                        }
                    }
                    merged
                })
                .collect(),
        )
    }

    /// The distribution of log10 of the worst corner's total under the uncertainty, as
    /// `n` points (log10 total, probability of a total at most this), for plotting.
    ///
    /// # Formula
    /// As [`Rollup::percentiles`]: with one uncertain quantity the points follow from the
    /// normal quantiles directly; with both, the cumulative distribution is evaluated by
    /// the same quadrature on a grid of totals.
    pub fn distribution(&self, tau_sigma: f64, tw_sigma: f64, n: usize) -> Vec<(f64, f64)> {
        self.distribution_corr(tau_sigma, tw_sigma, 0.0, n)
    }

    /// As [`Rollup::distribution`], with ln tau and ln tw correlated by `rho`.
    pub fn distribution_corr(
        &self,
        tau_sigma: f64,
        tw_sigma: f64,
        rho: f64,
        n: usize,
    ) -> Vec<(f64, f64)> {
        let n = n.max(2);
        let zs: Vec<f64> = (0..n)
            .map(|i| -3.5 + 7.0 * i as f64 / (n - 1) as f64)
            .collect();
        let phi = cdf;
        if tau_sigma <= 0.0 || tw_sigma <= 0.0 {
            let terms = self.terms();
            let g = terms.log10_worst_at(1.0);
            return zs
                .iter()
                .map(|&z| {
                    let x = if tau_sigma <= 0.0 {
                        g + tw_sigma * z / LN_10
                    } else {
                        terms.log10_worst_at((tau_sigma * z).exp())
                    };
                    (x, phi(z))
                })
                .collect();
        }
        let nodes = self.terms().spread_nodes(tau_sigma);
        // From the total at tau's -3.5 sigma (z = -8 + 4.5) to that at +3.5 sigma, with
        // tw's shift along it.
        let at = |z: f64| {
            let n = nodes[((z + 8.0) / SPREAD_STEP).round() as usize];
            n.1 + rho * tw_sigma * n.2
        };
        let lo = at(-3.5).min(at(3.5)) - 3.5 * tw_sigma;
        let hi = at(3.5).max(at(-3.5)) + 3.5 * tw_sigma;
        (0..n)
            .map(|i| {
                let x = lo + (hi - lo) * i as f64 / (n - 1) as f64;
                let p = spread_cdf(&nodes, tw_sigma, rho, x);
                (x / LN_10, p.clamp(0.0, 1.0))
            })
            .collect()
    }

    /// Percentiles (as fractions, e.g. 0.5 and 0.95) of log10 of the worst corner's total
    /// when ln tau and ln tw are normal with standard deviations `tau_sigma`, `tw_sigma`,
    /// shared by every row and independent of each other.
    ///
    /// # Formula
    /// The worst total is `s_w G(s_tau)` with G rising in `s_tau`. So
    /// `P(ln T <= x) = integral of phi(z) Phi((x - ln G(exp(tau_sigma z))) / tw_sigma) dz`,
    /// by the trapezoid rule on z in [-8, 8] in steps of 0.05 (within 1e-9 of an
    /// independent quadrature);
    /// each percentile by the Illinois method on x. With `tw_sigma = 0` the percentile is G at the
    /// same percentile of `s_tau`; with `tau_sigma = 0` the total is lognormal.
    pub fn percentiles(&self, tau_sigma: f64, tw_sigma: f64, ps: &[f64]) -> Vec<f64> {
        self.percentiles_corr(tau_sigma, tw_sigma, 0.0, ps)
    }

    /// As [`Rollup::percentiles`], with ln tau and ln tw correlated by `rho` (-1 < rho <
    /// 1), as a fit of both from the same lab data gives them.
    ///
    /// # Formula
    /// Given tau's z, ln tw is normal with mean `rho tw_sigma z` and standard deviation
    /// `tw_sigma sqrt(1 - rho^2)`, so `P(ln T <= x) = integral of phi(z) Phi((x - ln G(exp(
    /// tau_sigma z)) - rho tw_sigma z) / (tw_sigma sqrt(1 - rho^2))) dz`, by the same
    /// trapezoid rule; rho = 0 is the independent case.
    pub fn percentiles_corr(
        &self,
        tau_sigma: f64,
        tw_sigma: f64,
        rho: f64,
        ps: &[f64],
    ) -> Vec<f64> {
        self.percentiles_at(&self.stages, tau_sigma, tw_sigma, rho, ps)
    }

    /// As [`Rollup::percentiles_corr`], with the rows at `stages` (a fix plan's).
    pub fn percentiles_at(
        &self,
        stages: &[u32],
        tau_sigma: f64,
        tw_sigma: f64,
        rho: f64,
        ps: &[f64],
    ) -> Vec<f64> {
        let z_of = |p: f64| bisect_last(-40.0, 40.0, 1e-13, 200, |z| cdf(z) <= p);
        let terms = self.terms_at(stages);
        if tau_sigma <= 0.0 {
            let g = terms.log10_worst_at(1.0) * LN_10;
            return ps
                .iter()
                .map(|&p| (g + tw_sigma * z_of(p)) / LN_10)
                .collect();
        }
        if tw_sigma <= 0.0 {
            return ps
                .iter()
                .map(|&p| terms.log10_worst_at((tau_sigma * z_of(p)).exp()))
                .collect();
        }
        let nodes = terms.spread_nodes(tau_sigma);
        let shifted = |n: &(f64, f64, f64)| n.1 + rho * tw_sigma * n.2;
        let lo = nodes.iter().map(shifted).fold(f64::INFINITY, f64::min) - 10.0 * tw_sigma;
        let hi = nodes.iter().map(shifted).fold(f64::NEG_INFINITY, f64::max) + 10.0 * tw_sigma;
        ps.iter()
            .map(|&p| {
                illinois(lo, hi, 1e-12, 200, |x| {
                    spread_cdf(&nodes, tw_sigma, rho, x) - p
                }) / LN_10
            })
            .collect()
    }
}

/// A design's terms at each corner, as [`Rollup::terms`] merges them: (log10 of the
/// summed FIT at zero resolution time, log10 of the factor resolution time divides it by
/// at unit tau scale).
#[derive(Debug, Clone, PartialEq)]
pub struct Terms(Vec<Vec<(f64, f64)>>);

impl Terms {
    /// log10 of the worst corner's total with every tau times `scale`: each term's
    /// exponent divides by the scale, as tr / (tau scale) does.
    pub fn log10_worst_at(&self, scale: f64) -> f64 {
        self.0
            .iter()
            .map(|c| log10_sum(c.iter().map(|(p, e)| p - e / scale)))
            .fold(f64::NEG_INFINITY, f64::max)
    }

    /// The quadrature nodes of [`Rollup::percentiles`]: z from -8 to 8 by 0.1, each as
    /// (trapezoid weight times the normal density at z, ln of the worst total with every
    /// tau scaled by `exp(tau_sigma z)`).
    fn spread_nodes(&self, tau_sigma: f64) -> Vec<(f64, f64, f64)> {
        (0..=SPREAD_NODES_LAST)
            .map(|i| {
                let z = -8.0 + SPREAD_STEP * f64::from(i);
                let weight = (-0.5 * z * z).exp() / (2.0 * PI).sqrt() * SPREAD_STEP;
                (
                    weight,
                    self.log10_worst_at((tau_sigma * z).exp()) * LN_10,
                    z,
                )
            })
            .collect()
    }
}

/// The step in z of the spread's quadrature: 0.05 (321 nodes on [-8, 8]) puts the
/// percentiles within 1e-9 of an independent quadrature (at 0.1 they were 1.3e-6 off:
/// the trapezoid rule converges exponentially here, so halving the step squares the error).
const SPREAD_STEP: f64 = 0.05;
/// The last node's index: z = 8.
const SPREAD_NODES_LAST: u32 = 320;

/// `P(ln T <= x)` by the quadrature over [`Terms::spread_nodes`]: each node's weight
/// times the normal probability that ln tw's shift (correlated by `rho` with the node's
/// z) keeps the total at most `x`.
fn spread_cdf(nodes: &[(f64, f64, f64)], tw_sigma: f64, rho: f64, x: f64) -> f64 {
    let sd = tw_sigma * (1.0 - rho * rho).sqrt();
    nodes
        .iter()
        .map(|(w, ln_g, zt)| {
            let z = (x - ln_g - rho * tw_sigma * zt) / sd;
            // Beyond 9 standard deviations the normal probability is 0 or 1 to within
            // 1.2e-19: no need to evaluate it.
            if z > 9.0 {
                *w
            } else if z < -9.0 {
                0.0
            } else {
                w * cdf(z)
            }
        })
        .sum()
}
