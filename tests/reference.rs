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

#[test]
fn models_beyond_one_tau_match_mpmath() {
    // tests/fixtures/models_reference.csv: mpmath (PyPI) at 50 digits from the formulas of
    // the domain notes section 8 (scripts/gen_reference.py), independently of this code.
    let text = include_str!("fixtures/models_reference.csv");
    let rows = table_rows(text);
    assert!(rows.len() >= 15, "{} rows", rows.len());
    for line in rows {
        let c: Vec<&str> = line.split(';').collect();
        let (name, query, key, want) = (c[0], c[1], c[2], c[3].parse::<f64>().unwrap());
        let case = SyncCalculator::read(&RawInputs::from_query(query))
            .unwrap_or_else(|e| panic!("{name}: {e}"));
        let json = serde_json::to_value(SyncCalculator::evaluate(&case)).unwrap();
        let got = json[key]
            .as_f64()
            .unwrap_or_else(|| panic!("{name}: no {key} in {json}"));
        if key.starts_with("log10") {
            assert_log10(name, got, want);
        } else {
            assert_rel(name, got, want, crate::tolerance::F64_REL);
        }
    }
}

#[test]
fn master_slave_and_clock_factor_check_values_of_the_domain_notes() {
    // Domain notes 8.2 and 8.3 (check values computed from the formulas there): tau_eff
    // 24 ps; log10 MTBF 12.0956, 29.7141, 47.3326 s for 2, 3, 4 flip-flops; K = 19.947 at
    // phase 0 and 2.6995 at 20 ps for 400 MHz into 500 MHz with 10 ps of jitter; 79.788 at
    // 1 GHz with 5 ps. Checked to the digits quoted.
    let json = |q: &str| {
        serde_json::to_value(SyncCalculator::evaluate(
            &SyncCalculator::read(&RawInputs::from_query(q)).unwrap(),
        ))
        .unwrap()
    };
    let ms = "tau-master=20ps&tau-slave=30ps&tw=10ps&tw2=30ps&fclk=1GHz&fdata=100MHz&stages=";
    for (stages, quoted) in [(2, "12.0956"), (3, "29.7141"), (4, "47.3326")] {
        let v = json(&format!("{ms}{stages}"));
        crate::tolerance::assert_quoted("log10 MTBF", v["log10_mtbf_s"].as_f64().unwrap(), quoted);
        crate::tolerance::assert_quoted(
            "tau_eff ps",
            v["tau_eff_s"].as_f64().unwrap() * 1e12,
            "24",
        );
    }
    let rel = "tau=20ps&tw=40ps&stages=2&tsu=30ps&tcq=50ps&fdata=100MHz";
    for (q, quoted) in [
        ("fclk=500MHz&ratio=4/5&jitter=10ps", "19.947"),
        ("fclk=500MHz&ratio=4/5&jitter=10ps&phase=20ps", "2.6995"),
        ("fclk=1GHz&ratio=1/1&jitter=5ps", "79.788"),
    ] {
        let v = json(&format!("{rel}&{q}"));
        crate::tolerance::assert_quoted(q, v["clock_factor"].as_f64().unwrap(), quoted);
    }
}

#[test]
fn tutorial_examples_to_the_precision_it_gives() {
    // Ginosar, "Metastability and Synchronizers: A Tutorial", IEEE Design & Test 2011
    // (recalled): tau 100 ps, tw 200 ps, 1 GHz, 1 kHz, a full period per extra stage:
    // "about a minute" (2 flip-flops), "about a month" (3), "about 1,000 years" (4); and
    // tau 10 ps, tw 20 ps, 1 GHz, 100 MHz, 1 ns: "about 4e29 years". "About" is checked as
    // the same order of magnitude (within half a decade); 4e29 to its one digit.
    let years = |q: &str| {
        SyncCalculator::evaluate(&SyncCalculator::read(&RawInputs::from_query(q)).unwrap())
            .log10_mtbf_years
    };
    let g = "tau=100ps&tw=200ps&fclk=1GHz&fdata=1kHz&tsu=0&tcq=0&stages=";
    let minute = (60.0 / latchwise::reliability::YEAR_S).log10();
    let month = (30.0 * 86400.0 / latchwise::reliability::YEAR_S).log10();
    for (stages, about) in [(2, minute), (3, month), (4, 3.0)] {
        let got = years(&format!("{g}{stages}"));
        assert!(
            (got - about).abs() < 0.5,
            "{stages} flip-flops: 1e{got} years"
        );
    }
    assert_published(
        "fast",
        years("tau=10ps&tw=20ps&fclk=1GHz&fdata=100MHz&tr=1ns"),
        4e29,
        1,
    );
}

/// The README's related-clock example: 400 MHz into 500 MHz from one PLL, no phase given.
const RELATED_DEMO: [(&str, &str); 9] = [
    ("tau", "50ps"),
    ("tw", "35ps"),
    ("fclk", "500MHz"),
    ("fdata", "50MHz"),
    ("stages", "2"),
    ("tsu", "25ps"),
    ("tcq", "40ps"),
    ("ratio", "4/5"),
    ("jitter", "8ps"),
];

/// A phase is an offset within one lattice spacing (here 1/(4 x 500 MHz) = 500 ps): a
/// phase of 1e6 s once printed K = 7.5e-8 where the value for it reduced onto the lattice
/// differs by 8.4 decades (the reduction rests on digits the typed value does not have),
/// so it is refused naming the spacing; a phase within it is kept.
#[test]
fn a_phase_beyond_one_lattice_spacing_is_refused() {
    let base = RELATED_DEMO;
    for (phase, ok) in [
        ("1e6", false),
        ("500ps", false),
        ("499ps", true),
        ("125ps", true),
    ] {
        let mut pairs = base.to_vec();
        pairs.push(("phase", phase));
        let raw = RawInputs::from_pairs(pairs.iter().map(|(k, v)| (k.to_string(), v.to_string())));
        match SyncCalculator::read(&raw) {
            Ok(_) => assert!(ok, "{phase} accepted"),
            Err(e) => {
                assert!(!ok, "{phase}: {e}");
                assert_eq!(
                    e.to_string(),
                    format!(
                        "phase: '{phase}' is too large: the largest the model can use is 500 ps"
                    )
                );
            }
        }
    }
}

/// One line per fact: without a phase the clock factor is the worst phase's, and the
/// report says so once ("(worst phase)"), not again as "K at the worst phase".
#[test]
fn the_worst_phase_is_said_once() {
    let pairs = RELATED_DEMO;
    let names = |extra: Option<(&str, &str)>| {
        let mut p = pairs.to_vec();
        p.extend(extra);
        let raw = RawInputs::from_pairs(p.iter().map(|(k, v)| (k.to_string(), v.to_string())));
        let case = SyncCalculator::read(&raw).unwrap();
        let outcome = SyncCalculator::outcome(&SyncCalculator::evaluate(&case));
        outcome
            .readouts
            .iter()
            .map(|r| (r.name, r.text.clone()))
            .collect::<Vec<_>>()
    };
    let worst = names(None);
    assert!(
        !worst.iter().any(|(n, _)| *n == "log10_clock_factor_worst"),
        "{worst:?}"
    );
    let k = worst
        .iter()
        .find(|(n, _)| *n == "log10_clock_factor")
        .unwrap();
    assert_eq!(k.1, "24.9 (worst phase)");
    let phased = names(Some(("phase", "125ps")));
    assert!(phased.iter().any(|(n, _)| *n == "log10_clock_factor_worst"));
}
