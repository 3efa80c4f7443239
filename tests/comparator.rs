//! Comparator checks: published examples, the mpmath table, Q-function values, limits,
//! properties and the command line. Each check names its source.

use latchwise::calculator::Calculator;
use latchwise::comparator::{
    evaluate, tau_from_devices, CompCase, CompReport, ComparatorCalculator,
};
use latchwise::numeric::normal::{ln_prob_interval, ln_q};
use latchwise::params::RawInputs;
use latchwise::quantity::Time;
use proptest::prelude::*;
use std::f64::consts::LN_10;
use std::process::Command;

use crate::tolerance::{
    assert_log10, assert_published, assert_quoted, assert_rel, table_rows, ARITH_REL, F64_REL,
    LN_ABS, ROUNDING_LOG10_ABS, SOLVER_LOG10_ABS, TABLE10_REL,
};

fn report(pairs: &[(&str, &str)]) -> CompReport {
    let raw = RawInputs::from_pairs(pairs.iter().map(|(k, v)| (*k, *v)));
    let case = ComparatorCalculator::read(&raw).unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
    ComparatorCalculator::evaluate(&case)
}

const FLASH: [(&str, &str); 7] = [
    ("tau", "70ps"),
    ("vmin", "25mV"),
    ("gain", "5"),
    ("input", "uniform"),
    ("lsb", "10mV"),
    ("fs", "1GHz"),
    ("target-ber", "1e-9"),
];

fn flash(extra: &[(&str, &str)]) -> CompReport {
    let mut p: Vec<(&str, &str)> = FLASH.to_vec();
    p.extend_from_slice(extra);
    report(&p)
}

#[test]
fn flash_converter_published_example() {
    // "Analog Circuit Design" (Kluwer 1993), ADC chapter, as listed in the domain notes:
    // vmin 25 mV, gain 5, lsb 10 mV, tau 70 ps and 0.5 ns to regenerate give about 1e-3;
    // one extra latch with another 0.5 ns about 1e-6. The book prints one digit, so one
    // digit is all that is checked against it.
    assert_published(
        "one latch",
        flash(&[("treg", "0.5ns")]).log10_p_error,
        1e-3,
        1,
    );
    let two = flash(&[
        ("treg", "0.5ns"),
        ("extra-stages", "1"),
        ("stage-time", "0.5ns"),
    ]);
    assert_published("two latches", two.log10_p_error, 1e-6, 1);
}

#[test]
fn flash_converter_closed_form() {
    // The uniform model's closed form (domain notes section 3), evaluated here from the
    // inputs: p = 2 vcrit / lsb with vcrit = (vmin / gain) exp(-treg / tau). For the case
    // above that is 7.9e-4 and 6.2e-7, the two-digit values the domain notes list.
    let p = |treg: f64| 2.0 * (0.025 / 5.0) * (-treg / 70e-12).exp() / 0.010;
    assert_published("closed form, one latch", p(0.5e-9).log10(), 7.9e-4, 2);
    assert_published("closed form, two latches", p(1e-9).log10(), 6.2e-7, 2);
    let one = flash(&[("treg", "0.5ns")]);
    assert_rel(
        "one latch",
        10f64.powf(one.log10_p_error),
        p(0.5e-9),
        F64_REL,
    );
    let two = flash(&[
        ("treg", "0.5ns"),
        ("extra-stages", "1"),
        ("stage-time", "0.5ns"),
    ]);
    assert_rel(
        "two latches",
        10f64.powf(two.log10_p_error),
        p(1e-9),
        F64_REL,
    );
    // Errors per second = fs * p (domain notes section 3), fs = 1 GHz here.
    assert_rel(
        "errors per second",
        10f64.powf(two.log10_errors_per_s),
        1e9 * p(1e-9),
        F64_REL,
    );
}

#[test]
fn q_function_table_values() {
    // Upper-tail normal probabilities as tabulated in Abramowitz & Stegun, Table 26.1
    // (values recalled; the same numbers also come from mpmath's erfc).
    for (x, q) in [
        (1.0, 0.158_655_253_9),
        (2.0, 0.022_750_131_95),
        (3.0, 1.349_898_032e-3),
        (6.0, 9.865_876_450e-10),
        (7.0, 1.279_812_544e-12),
    ] {
        let got = ln_q(x) / LN_10;
        assert_rel(&format!("Q({x})"), 10f64.powf(got), q, TABLE10_REL);
    }
    // Far beyond f64: log10 Q(100) = log10(erfc(100/sqrt 2)/2) = -2173.871542869034...
    // (mpmath at 40 digits); checked to the nine decimals quoted here.
    assert_quoted("log10 Q(100)", ln_q(100.0) / LN_10, "-2173.871542869");
}

#[test]
fn tau_and_decision_time_facts_of_the_trade() {
    // tau = C / (gm - G0) (regenerative latch; common practice, any analog design text).
    assert_rel(
        "tau from devices",
        tau_from_devices(20e-15, 2e-3, 0.4e-3).unwrap(),
        12.5e-12,
        ARITH_REL,
    );
    let r = report(&[
        ("cl", "20f"),
        ("gm", "2m"),
        ("g0", "0.4m"),
        ("treg", "100p"),
        ("vmin", "0.4"),
        ("input", "uniform"),
        ("lsb", "1m"),
        ("fs", "1G"),
    ]);
    assert_rel("tau on the report", r.tau_s, 12.5e-12, ARITH_REL);
    // Time to reach vmin grows with ln(vmin/vin): ten times smaller input, tau*ln(10) longer.
    let t = |vin: &'static str| {
        report(&[
            ("tau", "10p"),
            ("treg", "1n"),
            ("vmin", "0.4"),
            ("input", "uniform"),
            ("lsb", "1m"),
            ("fs", "1G"),
            ("vin", vin),
        ])
        .decision_time_s
        .unwrap()
    };
    assert_rel(
        "ten times smaller",
        t("1uV") - t("10uV"),
        10e-12 * LN_10,
        F64_REL,
    );
    assert_rel(
        "from 1 uV",
        t("1uV"),
        10e-12 * (0.4f64 / 1e-6).ln(),
        F64_REL,
    );
}

fn check_row(line: &str) {
    let c: Vec<&str> = line.split(',').collect();
    let name = c[0];
    let mut pairs = vec![
        ("tau", c[1]),
        ("treg", c[2]),
        ("vmin", c[3]),
        ("gain", c[4]),
        ("input", c[5]),
        ("fs", "1G"),
    ];
    match c[5] {
        "uniform" => pairs.push(("lsb", c[6])),
        "gaussian" => pairs.extend([("sigma", c[6]), ("mean", c[7])]),
        "sine" => pairs.extend([("amp", c[6]), ("lsb", c[7])]),
        _ => pairs.extend([("amp", c[6]), ("sigma", c[7])]),
    }
    let r = report(&pairs);
    let num = |i: usize| c[i].parse::<f64>().unwrap();
    assert_log10(&format!("{name} vcrit"), r.log10_vcrit_v, num(8));
    assert_log10(&format!("{name} p"), r.log10_p_error, num(9));
    if !c[10].is_empty() {
        assert_log10(&format!("{name} noise"), r.log10_p_noise.unwrap(), num(10));
    }
}

#[test]
fn matches_mpmath_table() {
    // tests/fixtures/comparator_reference.csv: mpmath (PyPI), scripts/gen_reference.py.
    let text = include_str!("fixtures/comparator_reference.csv");
    let rows = table_rows(text);
    assert!(rows.len() >= 17, "{} rows", rows.len());
    rows.iter().for_each(|l| check_row(l));
}

#[test]
fn density_form_and_exact_difference_agree_in_their_limits() {
    // vcrit << sigma: P(|X - mean| < vcrit) -> 2 vcrit phi(mean/sigma)/sigma (domain notes §3).
    for m in [0.0f64, 1.0, 5.0, 30.0] {
        for ln_h in [-700.0f64, -50.0, -20.0] {
            let density =
                (2.0f64).ln() + ln_h - 0.5 * m * m - 0.5 * (2.0 * std::f64::consts::PI).ln();
            assert!(
                (ln_prob_interval(m, ln_h) - density).abs() < LN_ABS,
                "m={m} ln_h={ln_h}"
            );
        }
    }
    // Large vcrit: the plain CDF difference is accurate there and must agree.
    let phi = |x: f64| 1.0 - ln_q(x).exp();
    for (m, h) in [(0.0, 1.0), (1.5, 2.0), (-2.0, 0.7), (0.3, 4.0)] {
        let plain: f64 = phi(m + h) - phi(m - h);
        let got = ln_prob_interval(m, f64::ln(h)).exp();
        assert_rel(&format!("m={m} h={h}"), got, plain, F64_REL);
    }
}

#[test]
fn vcrit_far_below_f64_stays_finite() {
    // treg/tau = 1e5: vcrit = 1e-43430 V. Every model must still answer in logs.
    for model in [
        &[("input", "uniform"), ("lsb", "1m")][..],
        &[("input", "gaussian"), ("sigma", "1m")],
        &[("input", "nrz"), ("amp", "50m"), ("sigma", "5m")],
        &[("input", "pam4"), ("amp", "150m"), ("sigma", "8m")],
        &[("input", "sine"), ("amp", "0.5"), ("lsb", "1m")],
    ] {
        let mut p = vec![
            ("tau", "1ps"),
            ("treg", "100ns"),
            ("vmin", "0.4"),
            ("gain", "1"),
            ("fs", "10G"),
            ("target-ber", "1e-15"),
        ];
        p.extend_from_slice(model);
        let r = report(&p);
        assert!(
            r.log10_p_error.is_finite() && r.log10_p_error < -43_000.0,
            "{model:?}: {}",
            r.log10_p_error
        );
        assert!(r.log10_errors_per_s.is_finite() && r.log10_p_total.is_finite());
        assert_eq!(r.vcrit_v, None, "no zero stands in for 1e-43430 V");
        // Metastability alone meets 1e-15 by tens of thousands of decades (PAM4 noise may not).
        assert!(
            r.metastability_margin_decades.unwrap() > 40_000.0,
            "{model:?}"
        );
    }
}

#[test]
fn solvers_meet_the_target_exactly() {
    let r = flash(&[("treg", "0.5ns"), ("stage-time", "0.5ns")]);
    let need = r.treg_needed_s.unwrap().unwrap();
    // Closed form for the uniform model: p = exp(-t/tau) here, so t = 70 ps * ln(1e9).
    assert_rel(
        "regeneration time needed",
        need,
        70e-12 * 1e9f64.ln(),
        F64_REL,
    );
    let at = flash(&[("treg", &format!("{need:e}"))]);
    assert!(
        (at.log10_p_error + 9.0).abs() < SOLVER_LOG10_ABS,
        "{}",
        at.log10_p_error
    );
    // 1.45 ns needed, 0.5 ns given: two more 0.5 ns stages.
    assert_eq!(r.extra_stages_needed, Some(Some(2)));
    let tau = r.max_tau_s.unwrap().unwrap();
    assert!(tau < 70e-12);
}

fn p_at(tau: f64, treg: f64, gain: f64, vmin: f64) -> f64 {
    let f = |x: f64| format!("{x:e}");
    let raw = RawInputs::from_pairs([
        ("tau", f(tau)),
        ("treg", f(treg)),
        ("gain", f(gain)),
        ("vmin", f(vmin)),
        ("input", "nrz".into()),
        ("amp", "40m".into()),
        ("sigma", "4m".into()),
        ("fs", "1G".into()),
    ]);
    evaluate(&CompCase::from_inputs(&raw).unwrap()).log10_p_error
}

proptest! {
    #![proptest_config(crate::seeded::config(300))]
    #[test]
    fn p_falls_with_treg_and_gain_and_rises_with_tau_and_vmin(
        tau in 1e-12..1e-10f64, treg in 1e-11..2e-9f64, gain in 1.0..20.0f64, vmin in 0.05..0.8f64, k in 1.01..3.0f64
    ) {
        let base = p_at(tau, treg, gain, vmin);
        prop_assert!(base.is_finite());
        if base < -ROUNDING_LOG10_ABS {
            prop_assert!(p_at(tau, treg * k, gain, vmin) < base);
            prop_assert!(p_at(tau, treg, gain * k, vmin) < base);
        }
        prop_assert!(p_at(tau * k, treg, gain, vmin) >= base);
        prop_assert!(p_at(tau, treg, gain, vmin * k) >= base);
    }
}

fn cli(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .arg("comparator")
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

#[test]
fn cli_json_keys_exit_statuses_and_bad_input() {
    let base = [
        "--tau", "15ps", "--treg", "80ps", "--vmin", "0.4", "--gain", "4", "--input", "uniform",
        "--lsb", "1mV", "--fs", "5GHz",
    ];
    // The base case with the options in `extra` replacing its own.
    let with = |extra: &[&'static str]| {
        let mut a: Vec<&str> = base
            .chunks(2)
            .filter(|p| !extra.contains(&p[0]))
            .flatten()
            .copied()
            .collect();
        a.extend_from_slice(extra);
        cli(&a)
    };
    let (code, out, _) = with(&["--json", "--target-ber", "1e-12"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    for k in [
        "tau_s",
        "vcrit_v",
        "log10_p_error",
        "log10_errors_per_s",
        "meets_target",
    ] {
        assert!(v.get(k).is_some(), "{k}");
    }
    assert_eq!(
        code,
        if v["meets_target"] == serde_json::json!(true) {
            0
        } else {
            1
        }
    );
    assert_eq!(with(&["--target-ber", "1e-300"]).0, 1);
    assert_eq!(with(&["--target-ber", "0.999"]).0, 0);
    for (opt, val, msg) in [
        (
            "--input",
            "ternary",
            "input: 'ternary' is not one of: uniform, gaussian, nrz, pam4, sine",
        ),
        ("--lsb", "1ns", "lsb: '1ns' is a time, expected a voltage"),
        ("--target-ber", "2", "target-ber: '2' is too large"),
        ("--gm", "1m", "tau: give either tau or cl, gm, g0, not both"),
        ("--vmin", "-1", "vmin: negative voltage"),
    ] {
        let (code, _, err) = with(&[opt, val]);
        assert_eq!(code, 2, "{opt} {val}");
        assert!(err.contains(msg), "{opt} {val}: {err}");
    }
    let (code, _, err) = cli(&[
        "--cl", "10f", "--gm", "1m", "--g0", "2m", "--treg", "1n", "--vmin", "0.4", "--input",
        "nrz", "--amp", "50m", "--sigma", "5m", "--fs", "1G",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.contains("gm: gm = 1 mS does not exceed g0 = 2 mS: the latch would not regenerate"),
        "{err}"
    );
    let (code, out, _) = cli(&["--help"]);
    assert_eq!(code, 0);
    assert!(out.contains("--target-ber") && out.contains("first-order estimates"));
}

#[test]
fn ln_erfc_matches_mpmath() {
    // tests/fixtures/erfc_reference.csv: mpmath (PyPI) at 50 digits, scripts/gen_reference.py.
    let text = include_str!("fixtures/erfc_reference.csv");
    let rows = table_rows(text);
    assert!(rows.len() >= 20);
    for l in rows {
        let (x, v) = l.split_once(',').unwrap();
        let got = latchwise::numeric::normal::ln_erfc(x.parse().unwrap());
        assert_log10(&format!("ln erfc({x})"), got, v.parse().unwrap());
    }
}

proptest! {
    #![proptest_config(crate::seeded::config(150))]
    #[test]
    fn sizing_lands_on_the_target_for_every_model(
        model in 0usize..5, log_target in -30.0..-3.0f64, tau in 5e-12..50e-12f64, treg in 1e-11..3e-10f64
    ) {
        let models: [&[(&str, &str)]; 5] = [
            &[("input", "uniform"), ("lsb", "1m")],
            &[("input", "gaussian"), ("sigma", "2m"), ("mean", "1m")],
            &[("input", "nrz"), ("amp", "30m"), ("sigma", "6m")],
            &[("input", "pam4"), ("amp", "150m"), ("sigma", "20m")],
            &[("input", "sine"), ("amp", "0.5"), ("lsb", "3.90625m")],
        ];
        let (tau_s, treg_s) = (format!("{tau:e}"), format!("{treg:e}"));
        let mut p: Vec<(&str, &str)> = vec![("tau", &tau_s), ("treg", &treg_s), ("vmin", "0.4"), ("gain", "4"), ("fs", "1G")];
        p.extend_from_slice(models[model]);
        let case = CompCase::from_inputs(&RawInputs::from_pairs(p.iter().map(|(k, v)| (*k, *v)))).unwrap();
        let c = case.comp;
        let ln_t = log_target * LN_10;
        let z = c.size_for(ln_t);
        let at = |tau: f64, t: f64| {
            c.with_tau_treg(Time::positive("tau", tau).unwrap(), Time::non_negative("treg", t).unwrap())
                .ln_p_error()
                / LN_10
        };
        if z.treg_needed_s > 0.0 {
            prop_assert!((at(tau, z.treg_needed_s) - log_target).abs() < SOLVER_LOG10_ABS * log_target.abs());
            let mt = z.max_tau_s.unwrap();
            prop_assert!((at(mt, treg) - log_target).abs() < SOLVER_LOG10_ABS * log_target.abs());
        } else {
            prop_assert!(at(tau, 0.0) <= log_target + ROUNDING_LOG10_ABS);
        }
    }
}

#[test]
fn the_verdict_counts_noise_and_says_when_noise_alone_misses() {
    // A 28 Gb/s slicer: tau 10 ps, noise 10 mV, target 1e-12; treg and amp vary.
    let slicer = |treg: &str, amp: &str| {
        report(&[
            ("tau", "10ps"),
            ("treg", treg),
            ("vmin", "0.4"),
            ("gain", "4"),
            ("input", "nrz"),
            ("amp", amp),
            ("sigma", "10mV"),
            ("fs", "28GHz"),
            ("target-ber", "1e-12"),
        ])
    };
    // At amp/sigma = 6, Q(6) = 9.87e-10 (Abramowitz & Stegun 26.1) misses 1e-12 whatever
    // the latch does.
    let r = slicer("200ps", "60mV");
    assert_eq!(r.meets_target, Some(false));
    assert!(
        r.metastability_margin_decades.unwrap() > 0.0,
        "metastability alone meets it"
    );
    assert!(
        r.margin_decades.unwrap() < -2.9,
        "the total misses by Q(6)/1e-12"
    );
    assert_eq!(r.treg_needed_s, Some(None));
    assert!(
        r.warnings.iter().any(|w| w.starts_with("Noise alone")),
        "{:?}",
        r.warnings
    );
    // With noise well below the target the sizing leaves noise its share: the total at
    // the regeneration time needed sits on the target.
    let need = slicer("100ps", "80mV").treg_needed_s.unwrap().unwrap();
    let at = slicer(&format!("{need:e}"), "80mV");
    assert!(
        (at.log10_p_total + 12.0).abs() < SOLVER_LOG10_ABS,
        "{}",
        at.log10_p_total
    );
}

#[test]
fn pam4_reports_say_symbol_error_ratio() {
    let (code, out, _) = cli(&[
        "--tau", "12ps", "--treg", "60ps", "--vmin", "0.3", "--gain", "3", "--input", "pam4",
        "--amp", "150mV", "--sigma", "8mV", "--fs", "53GHz",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("total symbol error ratio"), "{out}");
    assert!(out.contains("PAM4: a decision is one symbol"), "{out}");
    assert!(!out.contains("bit-error ratio"), "{out}");
}
