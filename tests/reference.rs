//! Reference checks: each names its source beside it.

use latchwise::calculator::Calculator;
use latchwise::params::RawInputs;
use latchwise::synchronizer::{SyncCalculator, SyncReport};

use crate::tolerance::{assert_log10, assert_published, assert_rel, table_rows, ARITH_REL};

fn report(pairs: &[(&str, &str)]) -> SyncReport {
    let raw = RawInputs::from_pairs(pairs.iter().map(|(k, v)| (*k, *v)));
    let case = SyncCalculator::read(&raw).unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
    SyncCalculator::evaluate(&case)
}

/// Published worked example: checks log10 MTBF in seconds against the quoted value.
fn check_published(source: &str, pairs: &[(&str, &str)], mtbf_s: f64, digits: i32) {
    assert_published(source, report(pairs).log10_mtbf_s, mtbf_s, digits);
}

#[test]
fn chu_rtl_hardware_design_using_vhdl_synchronization_chapter() {
    // Chu, "RTL Hardware Design Using VHDL" (Wiley 2006), synchronization chapter:
    // window 0.1 ns counted from the clock edge, tau 0.5 ns, 50 MHz clock, 5 MHz data.
    // Values as listed in the project's domain notes (recalled from the book).
    let base = [
        ("t0", "0.1ns"),
        ("tau", "0.5ns"),
        ("fclk", "50MHz"),
        ("fdata", "5MHz"),
    ];
    let with = |tr| [base[0], base[1], base[2], base[3], ("tr", tr)];
    check_published("Chu tr=0", &with("0"), 4.00e-5, 3);
    check_published("Chu tr=17.5ns", &with("17.5ns"), 6.34e10, 3);
    check_published("Chu tr=35ns", &with("35ns"), 1.01e26, 3);
}

#[test]
fn wakerly_digital_design_synchronizer_section() {
    // Wakerly, "Digital Design: Principles and Practices", synchronizer section:
    // tau 1.0 ns, T0 8.7e-6 s, 16 MHz clock, 1e5 transitions/s, tr 42.5 ns (recalled).
    check_published(
        "Wakerly",
        &[
            ("tau", "1ns"),
            ("t0", "8.7us"),
            ("fclk", "16MHz"),
            ("fdata", "1e5"),
            ("tr", "42.5ns"),
        ],
        2.06e11,
        3,
    );
}

#[test]
fn t0_and_tw_conventions_agree_for_two_stages() {
    // Domain notes section 2: T0 = tw * exp(tcq/tau). For a two-flip-flop chain the two
    // published conventions describe the same failure rate, so they must agree exactly.
    let tau: f64 = 20e-12;
    let (tw, tcq) = (40e-12, 50e-12);
    let t0 = format!("{:e}", tw * (tcq / tau).exp());
    let a = report(&[
        ("tau", "20p"),
        ("tw", "40p"),
        ("fclk", "1G"),
        ("fdata", "100M"),
        ("stages", "2"),
        ("tsu", "30p"),
        ("tcq", "50p"),
    ]);
    let b = report(&[
        ("tau", "20p"),
        ("t0", &t0),
        ("fclk", "1G"),
        ("fdata", "100M"),
        ("stages", "2"),
        ("tsu", "30p"),
    ]);
    // Both equal exp(920/20) / (1e8 * 1e9 * 40e-12) s, by hand.
    let by_hand = 46.0 / std::f64::consts::LN_10 - (1e8 * 1e9 * 40e-12f64).log10();
    assert_log10("tw", a.log10_mtbf_s, by_hand);
    assert_log10("t0", b.log10_mtbf_s, by_hand);
    assert_eq!((a.convention, b.convention), ("tw", "t0"));
}

#[test]
fn fit_is_rate_times_3_6e12() {
    // FIT counts failures per 1e9 device-hours (JEDEC JESD85 defines the unit; common
    // practice): FIT = rate * 3600 * 1e9.
    let r = report(&[
        ("tau", "20p"),
        ("tw", "40p"),
        ("fclk", "1G"),
        ("fdata", "100M"),
        ("tr", "600p"),
    ]);
    // rate = fdata fclk tw exp(-tr/tau) = 1e8 * 1e9 * 40e-12 * exp(-30), by hand.
    let rate = 1e8 * 1e9 * 40e-12 * (-30f64).exp();
    assert_log10("FIT", r.log10_fit, (rate * 3600.0 * 1e9).log10());
}

/// One row of the mpmath table (scripts/gen_reference.py) against the model.
fn check_row(line: &str) {
    let c: Vec<&str> = line.split(',').collect();
    let (name, conv) = (c[0], c[1]);
    let mut pairs = vec![("tau", c[2]), (conv, c[3]), ("fclk", c[4]), ("fdata", c[5])];
    if c[9].is_empty() {
        pairs.extend([("stages", c[6]), ("tsu", c[7]), ("tcq", c[8])]);
    } else {
        pairs.push(("tr", c[9]));
    }
    let r = report(&pairs);
    let num = |i: usize| c[i].parse::<f64>().unwrap();
    let tr_want = num(10);
    if tr_want == 0.0 {
        assert_eq!(r.resolution_time_s, 0.0, "{name} tr");
    } else {
        assert_rel(
            &format!("{name} tr"),
            r.resolution_time_s,
            tr_want,
            ARITH_REL,
        );
    }
    assert_log10(&format!("{name} log10_mtbf_s"), r.log10_mtbf_s, num(11));
    assert_log10(
        &format!("{name} log10_mtbf_years"),
        r.log10_mtbf_years,
        num(12),
    );
    assert_log10(&format!("{name} log10_fit"), r.log10_fit, num(13));
    assert!(r.log10_mtbf_s.is_finite() && r.log10_fit.is_finite());
}

#[test]
fn matches_mpmath_table() {
    // tests/fixtures/sync_reference.csv: 50-digit values from mpmath (PyPI), written by
    // scripts/gen_reference.py from the published formula, independently of this code.
    let text = include_str!("fixtures/sync_reference.csv");
    let rows = table_rows(text);
    assert!(rows.len() >= 15, "table has {} rows", rows.len());
    rows.iter().for_each(|l| check_row(l));
}
