//! Property tests: monotonic in every parameter, and finite for every valid input.

use std::num::NonZeroU32;

use latchwise::params::RawInputs;
use latchwise::quantity::{Frequency, Time};
use latchwise::reliability::Target;
use latchwise::synchronizer::{
    evaluate, ClockLimit, StagesNeeded, SyncCase, SyncReport, Synchronizer, TauLimit,
};
use proptest::prelude::*;

use crate::tolerance::{CEILING_REL, F64_REL, ROUNDING_LOG10_ABS, SOLVER_LOG10_ABS};

/// `s` with `n` stages (n >= 1 in every caller).
fn stages(s: &Synchronizer, n: u32) -> Synchronizer {
    s.with_stages(NonZeroU32::new(n).unwrap())
}

fn with_tau(s: &Synchronizer, tau: f64) -> Synchronizer {
    s.with_tau(Time::positive("tau", tau).unwrap())
}

fn with_fclk(s: &Synchronizer, f: f64) -> Synchronizer {
    s.with_fclk(Frequency::positive("fclk", f).unwrap())
}

#[derive(Debug, Clone)]
struct Case {
    tau: f64,
    tw: f64,
    fclk: f64,
    fdata: f64,
    stages: u32,
    tsu: f64,
    tcq: f64,
}

fn log_uniform(lo: f64, hi: f64) -> impl Strategy<Value = f64> {
    (lo.log10()..hi.log10()).prop_map(|e| 10f64.powf(e))
}

fn cases() -> impl Strategy<Value = Case> {
    (
        log_uniform(1e-15, 1e-8),
        log_uniform(1e-15, 1e-9),
        log_uniform(1e3, 1e10),
        log_uniform(1.0, 1e10),
        1u32..=1000,
        0.0..0.45f64,
        0.0..0.45f64,
    )
        .prop_map(|(tau, tw, fclk, fdata, stages, a, b)| Case {
            tau,
            tw,
            fclk,
            fdata,
            stages,
            tsu: a / fclk,
            tcq: b / fclk,
        })
}

fn eval(c: &Case) -> SyncReport {
    let pairs = [
        ("tau", format!("{:e}", c.tau)),
        ("tw", format!("{:e}", c.tw)),
        ("fclk", format!("{:e}", c.fclk)),
        ("fdata", format!("{:e}", c.fdata)),
        ("stages", c.stages.to_string()),
        ("tsu", format!("{:e}", c.tsu)),
        ("tcq", format!("{:e}", c.tcq)),
        ("target-years", "1e9".to_string()),
    ];
    let case = SyncCase::from_inputs(&RawInputs::from_pairs(pairs)).unwrap();
    evaluate(&case)
}

fn finite(r: &SyncReport) -> bool {
    [
        r.resolution_time_s,
        r.log10_p_fail,
        r.log10_rate_per_s,
        r.log10_mtbf_s,
        r.log10_mtbf_years,
        r.log10_fit,
    ]
    .iter()
    .all(|v| v.is_finite())
}

proptest! {
    #![proptest_config(crate::seeded::config(400))]

    #[test]
    fn always_finite(c in cases()) {
        let r = eval(&c);
        prop_assert!(finite(&r), "{r:?}");
        prop_assert!(r.margin_decades.unwrap().is_finite());
        prop_assert!(matches!(r.min_stages, Some(Some(n)) if n >= 1));
    }

    #[test]
    fn more_stages_never_hurt(c in cases()) {
        let mut d = c.clone();
        d.stages = c.stages.saturating_add(1).min(1000);
        prop_assert!(eval(&d).log10_mtbf_s >= eval(&c).log10_mtbf_s);
    }

    #[test]
    fn faster_clock_data_wider_window_or_slower_latch_hurt(c in cases(), k in 1.001f64..10.0) {
        let base = eval(&c).log10_mtbf_s;
        // Each change lowers log10 MTBF by at least log10 k: strictly, unless that is
        // below the resolution of a double at the MTBF's size (log10 MTBF of 3e13 s moves
        // by 4e-4 for k = 1.001, under half its last digit's 4e-3), where it may not move.
        let lower = |new: f64| new < base || (new == base && k.log10() < 4.0 * f64::EPSILON * base.abs());
        let mut d = c.clone();
        d.fclk *= k;
        // Keep tsu and tcq absolute; skip when the faster clock leaves no time to resolve
        // (refused even for one flip-flop, which could not meet its own setup).
        if 1.0 / d.fclk > d.tsu + d.tcq {
            let new = eval(&d).log10_mtbf_s;
            prop_assert!(lower(new), "{new} against {base}");
        }
        let mut d = c.clone();
        d.fdata *= k;
        let new = eval(&d).log10_mtbf_s;
        prop_assert!(lower(new), "{new} against {base}");
        let mut d = c.clone();
        d.tw *= k;
        let new = eval(&d).log10_mtbf_s;
        prop_assert!(lower(new), "{new} against {base}");
        let mut d = c.clone();
        d.tau *= k;
        let slower = eval(&d).log10_mtbf_s;
        // tau's change moves the exponent tr/tau by (1 - 1/k) of itself: far beyond a
        // double's resolution wherever tr is.
        if c.stages > 1 { prop_assert!(slower < base) } else { prop_assert!(slower == base) }
    }

    #[test]
    fn longer_resolution_time_helps(tr in 0.0..1e-6f64, extra in 1e-12..1e-6f64, tau in log_uniform(1e-14, 1e-9)) {
        let at = |t: f64| {
            let raw = RawInputs::from_pairs([("tau", format!("{tau:e}")), ("tw", "20p".into()), ("fclk", "1G".into()), ("fdata", "1G".into()), ("tr", format!("{t:e}"))]);
            evaluate(&SyncCase::from_inputs(&raw).unwrap()).log10_mtbf_s
        };
        let (a, b) = (at(tr), at(tr + extra));
        prop_assert!(b > a && a.is_finite() && b.is_finite());
    }

    #[test]
    fn min_stages_meets_and_one_fewer_misses(c in cases(), years in log_uniform(1e-6, 1e300)) {
        let case = SyncCase::from_inputs(&RawInputs::from_pairs([
            ("tau", format!("{:e}", c.tau)), ("tw", format!("{:e}", c.tw)),
            ("fclk", format!("{:e}", c.fclk)), ("fdata", format!("{:e}", c.fdata)),
            ("stages", "1".into()), ("tsu", format!("{:e}", c.tsu)), ("tcq", format!("{:e}", c.tcq)),
        ])).unwrap();
        let m = Target::MtbfYears(years).log10_max_rate();
        if let StagesNeeded::Stages(n) = case.sync.min_stages(m) {
            prop_assume!(n <= 1_000_000);
            let n = n as u32;
            let s = case.sync;
            prop_assert!(stages(&s, n).log10_rate() <= m + ROUNDING_LOG10_ABS);
            if n > 1 {
                prop_assert!(stages(&s, n - 1).log10_rate() > m - ROUNDING_LOG10_ABS);
            }
        }
    }
}

proptest! {
    #![proptest_config(crate::seeded::config(200))]

    #[test]
    fn solvers_land_on_the_target(c in cases(), years in log_uniform(1e-3, 1e30)) {
        let case = SyncCase::from_inputs(&RawInputs::from_pairs([
            ("tau", format!("{:e}", c.tau)), ("tw", format!("{:e}", c.tw)),
            ("fclk", format!("{:e}", c.fclk)), ("fdata", format!("{:e}", c.fdata)),
            ("stages", c.stages.max(2).to_string()), ("tsu", format!("{:e}", c.tsu)), ("tcq", format!("{:e}", c.tcq)),
        ])).unwrap();
        let s = case.sync;
        let m = Target::MtbfYears(years).log10_max_rate();
        match s.max_fclk(s.stages(), m) {
            ClockLimit::Max(f) => {
                let at = with_fclk(&s, f).log10_rate();
                // Never above the target, and not below it either unless the clock is at
                // the top of the usable range (where the hop time runs out): a clock
                // that is too low fails here as surely as one that is too high.
                prop_assert!(at <= m + SOLVER_LOG10_ABS, "{at} vs {m}");
                let ceiling = s.fclk_ceiling(s.stages()).unwrap_or(f64::INFINITY);
                // Near the ceiling the rate is so steep in fclk that the clock's own f64
                // resolution moves it by more than SOLVER_LOG10_ABS: then a clock higher
                // by F64_REL must already miss.
                let higher_misses = f * (1.0 + F64_REL) < ceiling
                    && with_fclk(&s, f * (1.0 + F64_REL)).log10_rate() > m;
                prop_assert!(
                    at >= m - SOLVER_LOG10_ABS || higher_misses || f >= ceiling * (1.0 - CEILING_REL),
                    "clock {f:e} too low: rate {at} vs target {m}, ceiling {ceiling:e}"
                );
            }
            // No clock meets it: even the slowest one the model accepts misses.
            ClockLimit::None => prop_assert!(with_fclk(&s, 1e-9).log10_rate() > m),
            // Every clock up to the model's limit meets it.
            ClockLimit::Any => prop_assert!(with_fclk(&s, 1e18).log10_rate() <= m),
            ClockLimit::NotApplicable | ClockLimit::Related => prop_assert!(false, "no tr, no related clocks"),
        }
        match s.max_tau(m) {
            TauLimit::Max(t) => {
                let at = with_tau(&s, t).log10_rate();
                prop_assert!((at - m).abs() < SOLVER_LOG10_ABS * m.abs().max(1.0), "{at} vs {m}");
            }
            TauLimit::Any => prop_assert!(with_tau(&s, 1.0).log10_rate() <= m + ROUNDING_LOG10_ABS),
            TauLimit::None => prop_assert!(s.resolution_time() <= 0.0),
        }
    }

}

fn log10_mtbf(q: &str) -> f64 {
    evaluate(&SyncCase::from_inputs(&RawInputs::from_query(q)).unwrap()).log10_mtbf_s
}

proptest! {
    #![proptest_config(crate::seeded::config(200))]

    #[test]
    fn a_list_of_equal_taus_is_the_single_tau(tau in log_uniform(1e-13, 1e-10), stages in 2u32..8) {
        let list = vec![format!("{tau:e}"); stages as usize - 1].join(",");
        let base = format!("tw=40ps&fclk=1GHz&fdata=100MHz&stages={stages}&tsu=30ps&tcq=50ps");
        let one = log10_mtbf(&format!("tau={tau:e}&{base}"));
        let many = log10_mtbf(&format!("tau={list}&{base}"));
        prop_assert!((one - many).abs() <= crate::tolerance::F64_REL * one.abs().max(1.0), "{one} vs {many}");
    }

    #[test]
    fn equal_master_and_slave_taus_are_that_tau_at_any_duty(tau in log_uniform(1e-13, 1e-10), duty in 0.01..0.99f64, stages in 2u32..6) {
        let base = format!("tw=10ps&tw2=30ps&fclk=1GHz&fdata=100MHz&stages={stages}");
        let one = log10_mtbf(&format!("tau={tau:e}&{base}"));
        let pair = log10_mtbf(&format!("tau-master={tau:e}&tau-slave={tau:e}&duty={duty}&{base}"));
        prop_assert!((one - pair).abs() <= crate::tolerance::F64_REL * one.abs().max(1.0), "{one} vs {pair}");
    }

    #[test]
    fn the_clock_factor_multiplies_the_rate(jitter in log_uniform(1e-12, 1e-9), phase in 0.0..1.2e-10f64, p in 1u32..9, q in 1u32..9) {
        // Phases within the smallest lattice spacing drawn, 1/(8 x 1 GHz) = 125 ps.

        let base = "tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps";
        let plain = log10_mtbf(base);
        let v = evaluate(&SyncCase::from_inputs(&RawInputs::from_query(&format!(
            "{base}&ratio={p}/{q}&jitter={jitter:e}&phase={phase:e}"
        ))).unwrap());
        let k = v.clocks.as_ref().unwrap();
        prop_assert!((v.log10_mtbf_s - (plain - k.log10_clock_factor)).abs() < crate::tolerance::ROUNDING_LOG10_ABS);
        prop_assert!(k.log10_clock_factor_best <= k.log10_clock_factor + crate::tolerance::ROUNDING_LOG10_ABS);
        prop_assert!(k.log10_clock_factor <= k.log10_clock_factor_worst + crate::tolerance::ROUNDING_LOG10_ABS);
    }
}
