//! The supply calculator: the supply issue's check values and the demo against the mpmath
//! table (scripts/gen_reference.py), the rules' safety against a device-current model that
//! made the points, bad inputs, and the corners export read back by the budget.

use std::process::Command;

use latchwise::calculator::Calculator;
use latchwise::params::RawInputs;
use latchwise::supply::model::{
    ageing_factor, ln_linear, premise_breaks, tau_at, tau_bound_below, Rule,
};
use latchwise::supply::{SupplyCalculator, SupplyReport};
use proptest::prelude::*;

use crate::tolerance::{assert_log10, assert_rel, table_rows, F64_REL};

fn example(name: &str) -> String {
    std::fs::read_to_string(format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

fn raw(char: &str, points: &str, extra: &[(&str, &str)]) -> RawInputs {
    let mut pairs = vec![("char", char.to_string()), ("points", points.to_string())];
    pairs.extend(extra.iter().map(|(k, v)| (*k, v.to_string())));
    RawInputs::from_pairs(pairs)
}

/// The report of a case; panics naming the error when it is refused.
fn check(char: &str, points: &str, extra: &[(&str, &str)]) -> SupplyReport {
    let case = SupplyCalculator::read(&raw(char, points, extra)).unwrap_or_else(|e| panic!("{e}"));
    SupplyCalculator::evaluate(&case)
}

/// The message of a refused case.
fn refused(char: &str, points: &str, extra: &[(&str, &str)]) -> String {
    match SupplyCalculator::read(&raw(char, points, extra)) {
        Ok(_) => panic!("accepted: {char} / {points} / {extra:?}"),
        Err(e) => e.to_string(),
    }
}

const DEMO: [(&str, &str); 5] = [
    ("ss", "62.5mV"),
    ("dvt", "20mV"),
    ("fdata", "20MHz"),
    ("stages", "2"),
    ("target-years", "1e4"),
];

#[test]
fn the_rules_give_the_check_values() {
    // tests/fixtures/supply_reference.csv (mpmath), from the supply issue's checks.
    let text = include_str!("fixtures/supply_reference.csv");
    let a = [(0.55, 123e-12), (0.7, 25.9e-12), (0.9, 10.0e-12)];
    let ss = 79.8651e-3;
    let mut seen = 0;
    for line in table_rows(text) {
        let f: Vec<&str> = line.split(';').collect();
        let want: f64 = f[2].parse().unwrap();
        match f[0] {
            "interpolated" => {
                let v: f64 = f[1].parse().unwrap();
                let (t, rule) = ln_linear(&a, v);
                assert_eq!(rule, Rule::Interpolated);
                assert_rel(line, t, want, F64_REL);
            }
            "bounded" => {
                let v: f64 = f[1].parse().unwrap();
                let (t, rule) = tau_at(&a, v, Some(ss)).unwrap();
                assert_eq!(rule, Rule::Bounded);
                assert_rel(line, t, want, F64_REL);
            }
            "chord" => {
                // The straight-line extension of the last chord is never returned: the
                // bound is well above it.
                let v: f64 = f[1].parse().unwrap();
                let (t, _) = tau_at(&a, v, Some(ss)).unwrap();
                assert!(t > want * 1.2, "{line}: {t} against the chord's {want}");
            }
            "ageing" => {
                let s: f64 = f[1].parse().unwrap();
                assert_rel(line, ageing_factor(30e-3, s), want, F64_REL);
            }
            _ => continue,
        }
        seen += 1;
    }
    assert_eq!(seen, 11);
    // The issue's own figures, to the digits it gives.
    assert_rel("0.8 V", ln_linear(&a, 0.8).0, 16.09348e-12, 1e-6);
    assert_rel("0.62 V", ln_linear(&a, 0.62).0, 59.45056e-12, 1e-6);
    for (v, want) in [
        (0.5, 252.8907e-12),
        (0.45, 519.9489e-12),
        (0.4, 1069.026e-12),
    ] {
        assert_rel("bound", tau_bound_below(0.55, 123e-12, ss, v), want, 1e-6);
    }
    for (s, want) in [
        (79.8651e-3, 2.374834),
        (62.4536e-3, 3.022430),
        (106.652e-3, 1.911123),
    ] {
        assert_rel("ageing", ageing_factor(30e-3, s), want, 1e-6);
    }
}

#[test]
fn the_demo_matches_the_mpmath_table_point_by_point() {
    let r = check(
        &example("supply-char.csv"),
        &example("supply-points.csv"),
        &DEMO,
    );
    let text = include_str!("fixtures/supply_reference.csv");
    let mut seen = 0;
    for line in table_rows(text) {
        let f: Vec<&str> = line.split(';').collect();
        let want: f64 = f[2].parse().unwrap();
        let Some(p) = r.points.iter().find(|p| p.corner == f[1]) else {
            continue;
        };
        match f[0] {
            "demo_tau" => assert_rel(line, p.tau_s, want, F64_REL),
            "demo_log10_fit" => assert_log10(line, p.log10_fit, want),
            _ => continue,
        }
        seen += 1;
    }
    assert_eq!(seen, 16, "every point at both temperatures");
    // The rules as the demo's points need them.
    let rule = |c: &str| r.points.iter().find(|p| p.corner == c).unwrap().tau_rule;
    assert_eq!(rule("turbo_m40C"), Rule::Held);
    assert_eq!(rule("nominal_125C"), Rule::Interpolated);
    assert_eq!(rule("eco_m40C"), Rule::Characterised);
    assert_eq!(rule("standby_m40C"), Rule::Bounded);
    assert_eq!(r.worst_point, "eco_m40C");
    // Residency-weighted: each point at its worse temperature.
    let worst = |n: &str| {
        r.points
            .iter()
            .filter(|p| p.name == n)
            .map(|p| p.log10_fit)
            .fold(f64::NEG_INFINITY, f64::max)
    };
    let weighted = [
        ("turbo", 0.05),
        ("nominal", 0.6),
        ("eco", 0.3),
        ("standby", 0.05),
    ]
    .iter()
    .map(|(n, w)| w * 10f64.powf(worst(n)))
    .sum::<f64>()
    .log10();
    assert_log10("weighted", r.log10_fit_weighted.unwrap(), weighted);
}

/// tau = C / gm at VDD/2, gm from the EKV interpolation of the drain current
/// (I = Is ln^2(1 + e^x), x = (V - VT) / (2 n UT)): the model the rules are derived for.
fn ekv_tau(vdd: f64, vt: f64, n: f64, ut: f64) -> f64 {
    let x = (vdd / 2.0 - vt) / (2.0 * n * ut);
    let gm = x.exp().ln_1p() / (1.0 + (-x).exp()) / (n * ut);
    1e-15 / gm
}

proptest! {
    #![proptest_config(crate::seeded::config(400))]

    /// Points made by the device model at three voltages: every interpolated tau is at or
    /// above the model's, and every bounded one too, with ss = n UT ln 10 of that model.
    #[test]
    fn no_rule_falls_below_the_model_that_made_the_points(
        vt in 0.15..0.5f64,
        n in 1.0..1.8f64,
        kelvin in 230.0..400.0f64,
        v1 in 0.3..0.8f64,
        gaps in (0.05..0.3f64, 0.05..0.3f64),
        at in 0.0..1.0f64,
    ) {
        let ut = 8.617333262e-5 * kelvin;
        let vs = [v1, v1 + gaps.0, v1 + gaps.0 + gaps.1];
        let known: Vec<(f64, f64)> = vs.iter().map(|&v| (v, ekv_tau(v, vt, n, ut))).collect();
        let ss = n * ut * std::f64::consts::LN_10;
        // Between the points.
        let v = vs[0] + (vs[2] - vs[0]) * at;
        let (t, _) = tau_at(&known, v, Some(ss)).unwrap();
        prop_assert!(t >= ekv_tau(v, vt, n, ut) * (1.0 - 1e-12), "interpolated at {v}");
        // Below them, down to a quarter of the lowest.
        let v = vs[0] * (0.25 + 0.75 * at);
        let (t, rule) = tau_at(&known, v, Some(ss)).unwrap();
        prop_assert_eq!(rule, Rule::Bounded);
        prop_assert!(t >= ekv_tau(v, vt, n, ut) * (1.0 - 1e-12), "bounded at {v}");
        // And the model's points break none of the premises the rules rest on.
        let breaks = premise_breaks(&known, Some(ss));
        prop_assert!(breaks.is_empty(), "{breaks:?}");
    }
}

/// A characterisation that breaks the premises is said to: tau rising with VDD (a table
/// upside down), a middle point above the chord in ln tau, and a fall steeper than the
/// given ss allows (with the ss that fits: ln 10 / (2 ln(1270/60) / 0.15 V) = 56.58
/// mV/decade, by hand). The demo's breaks none.
#[test]
fn a_characterisation_that_breaks_the_premises_is_said_to() {
    let said = |char: &str| -> Vec<String> {
        let mut set = DEMO.to_vec();
        if !char.contains("tsu") {
            set.extend([("tsu", "20ps"), ("tcq", "30ps")]);
        }
        check(char, &example("supply-points.csv"), &set)
            .warnings
            .into_iter()
            .filter(|w| w.starts_with("The characterisation"))
            .collect()
    };
    assert_eq!(said(&example("supply-char.csv")), Vec::<String>::new());
    let rising = said("vdd,tau,tw\n0.6,12ps,20ps\n0.75,28ps,40ps\n0.9,127ps,200ps\n");
    assert_eq!(rising.len(), 1, "{rising:?}");
    assert!(
        rising[0]
            .contains("tau rises from 12 ps at 600 mV to 28 ps at 750 mV (and between 1 more pair"),
        "{rising:?}"
    );
    let concave = said("vdd,tau,tw\n0.6,127ps,20ps\n0.75,60ps,40ps\n0.9,12ps,200ps\n");
    assert_eq!(concave.len(), 1, "{concave:?}");
    assert!(
        concave[0].contains("tau at 750 mV lies above the line in ln tau"),
        "{concave:?}"
    );
    let steep = said("vdd,tau,tw\n0.6,1270ps,20ps\n0.75,60ps,40ps\n0.9,12ps,200ps\n");
    assert_eq!(steep.len(), 1, "{steep:?}");
    assert!(
        steep[0].contains("an ss of at most 56.58 mV/decade"),
        "{steep:?}"
    );
}

#[test]
fn bad_inputs_are_refused_naming_the_field_and_line() {
    let char = "vdd,tau,tw,tsu,tcq\n0.7,30ps,40ps,30ps,50ps\n0.9,12ps,20ps,20ps,35ps\n";
    let points = "name,vdd,fclk\nlow,0.7,400MHz\nhigh,0.9,1GHz\n";
    let base = [("fdata", "10MHz"), ("stages", "2")];
    // No ss where a bound is needed.
    let m = refused(char, "name,vdd,fclk\nsleep,0.5,50MHz\n", &base);
    assert!(m.starts_with("ss: needed for point sleep at 500 mV"), "{m}");
    // dvt without ss.
    let m = refused(
        char,
        points,
        &[("fdata", "10MHz"), ("stages", "2"), ("dvt", "30mV")],
    );
    assert!(m.starts_with("ss: needed for dvt"), "{m}");
    // Residencies that do not sum to 1, or given for some points only.
    let m = refused(
        char,
        "name,vdd,fclk,residency\nlow,0.7,400MHz,0.5\nhigh,0.9,1GHz,0.6\n",
        &base,
    );
    assert!(
        m.contains("points, line 2, column residency: the residencies sum to 1.1"),
        "{m}"
    );
    let m = refused(
        char,
        "name,vdd,fclk,residency\nlow,0.7,400MHz,0.5\nhigh,0.9,1GHz,\n",
        &base,
    );
    assert!(m.contains("residency for every point or for none"), "{m}");
    // A VDD of 0, in either table.
    let m = refused(char, "name,vdd,fclk\nlow,0,400MHz\n", &base);
    assert!(m.contains("points, line 2, column vdd"), "{m}");
    let m = refused("vdd,tau,tw\n0,30ps,40ps\n", points, &base);
    assert!(m.contains("char, line 2, column vdd"), "{m}");
    // Two characterised points at one VDD with different tau.
    let m = refused(
        "vdd,tau,tw,tsu,tcq\n0.7,30ps,40ps,30ps,50ps\n0.7,31ps,40ps,30ps,50ps\n",
        points,
        &base,
    );
    assert!(m.contains("char, line 3, column vdd: 700 mV is characterised twice with different values (also line 2)"), "{m}");
    // A window in neither or both conventions, a temperature nobody characterised.
    let m = refused("vdd,tau\n0.7,30ps\n", points, &base);
    assert!(m.contains("give the window as one column, tw or t0"), "{m}");
    let m = refused(
        "vdd,temp,tau,tw,tsu,tcq\n0.7,25,30ps,40ps,30ps,50ps\n",
        "name,vdd,fclk,temp\nlow,0.7,400MHz,85\n",
        &base,
    );
    assert!(
        m.contains("no characterisation at 85 °C (characterised at 25 °C)"),
        "{m}"
    );
    // tsu both as a column and a field; a clock too fast for the chain, at its line.
    let m = refused(
        char,
        points,
        &[("fdata", "10MHz"), ("stages", "2"), ("tsu", "20ps")],
    );
    assert!(m.starts_with("tsu: give either tsu or the column"), "{m}");
    let m = refused(
        char,
        "name,vdd,fclk\nlow,0.7,400MHz\nhigh,0.9,30GHz\n",
        &base,
    );
    assert!(m.contains("points, line 3: high: fclk"), "{m}");
    // An unsorted characterisation is accepted and sorted: the same report.
    let sorted = check(char, points, &base);
    let unsorted = check(
        "vdd,tau,tw,tsu,tcq\n0.9,12ps,20ps,20ps,35ps\n0.7,30ps,40ps,30ps,50ps\n",
        points,
        &base,
    );
    assert_eq!(sorted.points, unsorted.points);
    // An identical duplicate is one point.
    let dup = check("vdd,tau,tw,tsu,tcq\n0.9,12ps,20ps,20ps,35ps\n0.7,30ps,40ps,30ps,50ps\n0.9,12ps,20ps,20ps,35ps\n", points, &base);
    assert_eq!(sorted.points, dup.points);
}

#[test]
fn aged_characterisation_replaces_the_ageing_factor() {
    let char = "vdd,tau,tw,tsu,tcq,aged\n0.7,30ps,40ps,30ps,50ps,no\n0.9,12ps,20ps,20ps,35ps,no\n0.7,36ps,40ps,30ps,50ps,yes\n0.9,14ps,20ps,20ps,35ps,yes\n";
    let points = "name,vdd,fclk\nmid,0.8,600MHz\n";
    let r = check(
        char,
        points,
        &[
            ("fdata", "10MHz"),
            ("stages", "2"),
            ("ss", "80mV"),
            ("dvt", "30mV"),
        ],
    );
    // The aged points, ln-linear at 0.8 V, no factor on top.
    assert_rel(
        "aged tau",
        r.points[0].tau_s,
        (36e-12f64 * 14e-12).sqrt(),
        F64_REL,
    );
    assert_eq!(r.points[0].ageing_factor, 1.0);
    assert!(
        r.warnings.iter().any(|w| w.contains("aged")),
        "{:?}",
        r.warnings
    );
    // Fresh only: the factor applies.
    let fresh = "vdd,tau,tw,tsu,tcq\n0.7,30ps,40ps,30ps,50ps\n0.9,12ps,20ps,20ps,35ps\n";
    let r = check(
        fresh,
        points,
        &[
            ("fdata", "10MHz"),
            ("stages", "2"),
            ("ss", "80mV"),
            ("dvt", "30mV"),
        ],
    );
    assert_rel(
        "fresh x ageing",
        r.points[0].tau_s,
        (30e-12f64 * 12e-12).sqrt() * 10f64.powf(0.375),
        F64_REL,
    );
}

#[test]
fn the_corners_export_signs_the_design_off_at_every_point() {
    // latchwise supply --corners-out, then latchwise budget --corners on that file: a
    // one-row design in the exported domain gives, at each corner, the supply's FIT.
    let dir = std::env::temp_dir().join(format!("latchwise-supply-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let corners = dir.join("corners.csv");
    let root = env!("CARGO_MANIFEST_DIR");
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .arg("supply")
        .arg(format!("{root}/examples/supply-char.csv"))
        .arg("--points")
        .arg(format!("{root}/examples/supply-points.csv"))
        .args([
            "--ss", "62.5mV", "--dvt", "20mV", "--fdata", "20MHz", "--stages", "2",
        ])
        .args(["--domain", "cpu", "--json", "--corners-out"])
        .arg(&corners)
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let supply: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let design = dir.join("design.csv");
    std::fs::write(&design, "name,fdata,stages,domain\nirq_sync,20MHz,2,cpu\n").unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .arg("budget")
        .arg(&design)
        .arg("--corners")
        .arg(&corners)
        .arg("--json")
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let budget: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let points = supply["points"].as_array().unwrap();
    assert_eq!(points.len(), 8);
    for p in points {
        let name = p["corner"].as_str().unwrap();
        let at = budget["corners"]
            .as_array()
            .unwrap()
            .iter()
            .find(|c| c["name"] == name)
            .unwrap_or_else(|| panic!("no corner {name}: {}", budget["corners"]));
        assert_log10(
            name,
            at["log10_total_fit"].as_f64().unwrap(),
            p["log10_fit"].as_f64().unwrap(),
        );
    }
    std::fs::remove_dir_all(&dir).ok();
}
