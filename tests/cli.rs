//! The command line: exit statuses, JSON keys, bad input and --from-url.

use std::process::Command;

const DEMO: &[&str] = &[
    "--tau", "20ps", "--tw", "40ps", "--fclk", "1GHz", "--fdata", "100MHz", "--stages", "2",
    "--tsu", "30ps", "--tcq", "50ps",
];

struct Run {
    code: i32,
    stdout: String,
    stderr: String,
}

fn run(args: &[&str]) -> Run {
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(args)
        .output()
        .unwrap();
    Run {
        code: out.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&out.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

/// `latchwise sync` with the demo case, options in `extra` replacing the demo's own.
fn sync(extra: &[&str]) -> Run {
    let mut a = vec!["sync"];
    for pair in DEMO.chunks(2) {
        if !extra.contains(&pair[0]) {
            a.extend_from_slice(pair);
        }
    }
    a.extend_from_slice(extra);
    run(&a)
}

fn json(extra: &[&str]) -> serde_json::Value {
    let mut a = vec!["--json"];
    a.extend_from_slice(extra);
    let r = sync(&a);
    assert!(r.code == 0 || r.code == 1, "{}", r.stderr);
    serde_json::from_str(&r.stdout).unwrap()
}

/// Runs `latchwise sync` with the demo case and one option replaced, expecting exit 2 and
/// `msg` on stderr, nothing on stdout.
fn check_bad(option: &str, value: &str, msg: &str) {
    let mut a: Vec<&str> = vec!["sync"];
    let mut i = 0;
    while i < DEMO.len() {
        if DEMO[i] != option {
            a.extend_from_slice(&DEMO[i..i + 2]);
        }
        i += 2;
    }
    a.extend_from_slice(&[option, value]);
    let r = run(&a);
    assert_eq!(r.code, 2, "{option} {value}: {}", r.stderr);
    assert!(
        r.stderr.contains(msg),
        "{option} {value}: stderr was {}",
        r.stderr
    );
    assert!(
        r.stdout.is_empty(),
        "{option} {value}: stdout was {}",
        r.stdout
    );
}

#[test]
fn bad_inputs_exit_2_naming_the_field() {
    check_bad("--tau", "", "tau: a value is required");
    check_bad("--tau", "NaN", "tau: 'NaN' is not a finite number");
    check_bad("--tau", "inf", "tau: 'inf' is not a finite number");
    check_bad("--tau", "-20p", "tau: negative time");
    check_bad("--tau", "0", "tau: must be a positive time, not zero");
    check_bad(
        "--fclk",
        "5ns",
        "fclk: '5ns' is a time, expected a frequency",
    );
    check_bad("--tw", "1GHz", "tw: '1GHz' is a frequency, expected a time");
    check_bad("--fdata", "lots", "fdata: 'lots' is not a number");
    check_bad("--tau", "1e99999", "tau: '1e99999' is too large");
    check_bad("--tau", "1e-99999", "tau: '1e-99999' is too small");
    check_bad(
        "--tau",
        "20 parsecs",
        "tau: unknown unit or prefix 'parsecs'",
    );
    check_bad("--stages", "2.5", "stages: '2.5' is not a whole number");
    check_bad("--stages", "0", "stages: 0 is out of range");
    check_bad(
        "--fclk",
        "20GHz",
        "fclk: clock period 50 ps is not longer than tsu + tcq = 80 ps",
    );
    check_bad("--t0", "1n", "tw: give either tw or t0, not both");
    // An exponent too long for any integer type is an error, never read as 0.
    check_bad(
        "--tau",
        "1e99999999999999999999",
        "tau: '1e99999999999999999999' is too large",
    );
    check_bad(
        "--tau",
        "20e-99999999999999999999ps",
        "tau: '20e-99999999999999999999ps' is too small",
    );
    check_bad("--fclk", "1e-310", "fclk: '1e-310' is too small");
    let r = sync(&["--target-years", "1e99999999999999999999"]);
    assert_eq!(r.code, 2, "{}", r.stdout);
    assert!(r
        .stderr
        .contains("target-years: '1e99999999999999999999' is too large"));
}

#[test]
fn missing_and_unknown_options() {
    let r = run(&["sync", "--tau", "20p"]);
    assert_eq!(r.code, 2);
    for f in ["tw", "fclk", "fdata", "stages", "tsu", "tcq"] {
        assert!(
            r.stderr.contains(&format!("{f}: a value is required")),
            "{f}: {}",
            r.stderr
        );
    }
    let r = sync(&["--colour", "blue"]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("unknown option --colour"), "{}", r.stderr);
    assert_eq!(sync(&["--tau"]).code, 2);
    assert_eq!(run(&["frobnicate"]).code, 2);
    assert_eq!(run(&[]).code, 2);
}

#[test]
fn exit_status_follows_the_target() {
    // The demo case has MTBF about 7.5e5 years (see the mpmath table, row demo-2ff).
    assert_eq!(sync(&[]).code, 0);
    assert_eq!(sync(&["--target-years", "1e5"]).code, 0);
    assert_eq!(sync(&["--target-years", "1e6"]).code, 1);
    assert_eq!(sync(&["--target-fit", "1"]).code, 0);
    assert_eq!(sync(&["--target-fit", "0.1"]).code, 1);
    let r = sync(&["--target-years", "1e6"]);
    assert!(r.stdout.contains("MISSED"), "{}", r.stdout);
}

#[test]
fn json_has_the_documented_keys() {
    let v = json(&["--target-years", "1e6"]);
    for k in [
        "resolution_time_s",
        "log10_mtbf_s",
        "log10_fit",
        "meets_target",
        "margin_decades",
        "min_stages",
        "max_fclk_hz",
        "max_tau_s",
    ] {
        assert!(v.get(k).is_some(), "missing {k} in {v}");
    }
    assert_eq!(v["meets_target"], serde_json::json!(false));
    assert_eq!(v["min_stages"], serde_json::json!(3));
    assert_eq!(v["convention"], "tw");
    assert_eq!(v["inputs"]["tau"], "20 ps");
    // tr = (2 - 1)(1 ns - 30 ps - 50 ps) = 920 ps.
    crate::tolerance::assert_rel(
        "resolution time",
        v["resolution_time_s"].as_f64().unwrap(),
        920e-12,
        crate::tolerance::ARITH_REL,
    );
    // The largest tau is a number in seconds, below the 20 ps that misses the target.
    let max_tau = v["max_tau_s"].as_f64().unwrap();
    assert!(max_tau > 1e-12 && max_tau < 20e-12, "{max_tau}");
    let plain = json(&[]);
    assert!(plain.get("meets_target").is_none());
}

#[test]
fn extreme_cases_stay_finite_in_json() {
    // tr/tau = 920 and 919080: exp(tr/tau) overflows an f64, the logarithm does not.
    for tau in ["1ps", "1fs"] {
        let v = json(&["--tau", tau, "--stages", "1000", "--target-years", "1e300"]);
        let l = v["log10_mtbf_s"].as_f64().unwrap();
        assert!(l.is_finite() && l > 300.0, "{tau}: {v}");
        assert!(v["log10_fit"].as_f64().unwrap().is_finite());
        assert_eq!(v["meets_target"], serde_json::json!(true));
    }
    let r = sync(&["--tau", "1ps", "--stages", "1000"]);
    assert!(r.stdout.contains("e399"), "{}", r.stdout);
    assert!(
        !r.stdout.contains("inf") && !r.stdout.contains("NaN"),
        "{}",
        r.stdout
    );
}

#[test]
fn from_url_reads_a_bookmark_and_options_override_it() {
    let url = "file:///tmp/dist/index.html?tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&colour=red#x";
    let r = run(&["sync", "--from-url", url, "--json"]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(
        r.stderr
            .contains("ignored unknown parameters in --from-url: 'colour'"),
        "{}",
        r.stderr
    );
    let a: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    // The demo case: log10 MTBF = 13.375486176221621... s (mpmath table, row demo-2ff).
    crate::tolerance::assert_log10(
        "from a bookmark",
        a["log10_mtbf_s"].as_f64().unwrap(),
        13.375_486_176_221_62,
    );
    let r = run(&["sync", "--from-url", url, "--stages", "3", "--json"]);
    let b: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(b["inputs"]["stages"], "3");
    let r = run(&["sync", "--from-url", "?tau=%3Cb%3E", "--json"]);
    assert_eq!(r.code, 2);
    assert!(
        r.stderr.contains("tau: '<b>' is not a number"),
        "{}",
        r.stderr
    );
}

#[test]
fn help_names_every_option_and_the_caution() {
    let r = run(&["sync", "--help"]);
    assert_eq!(r.code, 0);
    for f in latchwise::synchronizer::FIELDS {
        assert!(r.stdout.contains(&format!("--{}", f.name)), "{}", f.name);
    }
    assert!(r.stdout.contains("first-order estimates"));
    assert!(run(&["help"]).stdout.contains("Caution:"));
}

#[test]
fn results_that_do_not_apply_are_null_with_a_reason() {
    // With tr given there is no chain to size: min_stages is null and says why.
    let v = json(&["--tr", "900p", "--target-years", "1e5"]);
    assert!(v["min_stages"].is_null(), "{v}");
    assert!(v["not_applicable"]["min_stages"]
        .as_str()
        .unwrap()
        .contains("tr given"));
    // A target met with no resolution time at all (MTBF 25 s = 7.9e-7 years at tr = 0,
    // against 1e-7 years): any tau meets it.
    let v = json(&["--fdata", "1", "--target-years", "1e-7"]);
    assert!(v["max_tau_s"].is_null(), "{v}");
    assert!(v["not_applicable"]["max_tau_s"]
        .as_str()
        .unwrap()
        .starts_with("any tau"));
}

#[test]
fn both_targets_are_one_clear_message() {
    let r = sync(&["--target-years", "1e5", "--target-fit", "10"]);
    assert_eq!(r.code, 2);
    assert_eq!(
        r.stderr.trim(),
        "latchwise sync: target-years: give either target-years or target-fit, not both"
    );
    assert!(r.stdout.is_empty());
}

#[test]
fn with_tr_given_the_chain_inputs_are_reported_unused() {
    let r = sync(&["--json", "--tr", "900p", "--target-years", "1e5"]);
    let v: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(v["unused"], serde_json::json!(["stages", "tsu", "tcq"]));
    assert!(v["max_fclk_hz"].is_null());
    assert!(v["not_applicable"]["max_fclk_hz"]
        .as_str()
        .unwrap()
        .contains("does not follow the clock"));
    let r = sync(&["--tr", "900p"]);
    assert!(
        r.stdout.contains("Not used by this case: stages, tsu, tcq"),
        "{}",
        r.stdout
    );
}

#[test]
fn models_beyond_one_tau_refuse_bad_values_naming_the_field() {
    for (extra, msg) in [
        (
            &["--ratio", "0/1", "--jitter", "10ps"][..],
            "ratio: '0/1' is not a ratio of two positive whole numbers",
        ),
        (
            &["--ratio", "1.5/2", "--jitter", "10ps"],
            "ratio: '1.5/2' is not a ratio",
        ),
        (
            &["--ratio", "4/5", "--jitter", "-3ps"],
            "jitter: negative time",
        ),
        (&["--ratio", "4/5"], "jitter: a value is required"),
        (&["--jitter", "10ps"], "ratio: a value is required"),
        (
            &["--tau", "14ps,22ps"],
            "tau: 2 values given, 1 wanted: one per hop, stages - 1",
        ),
        (&["--tau", "14ps,fast"], "tau: 'fast' is not a number"),
        (
            &["--tau-master", "20ps", "--tau-slave", "30ps"],
            "tau: give either tau or tau-master, tau-slave, not both",
        ),
        (
            &["--crossing", "bus"],
            "crossing: 'bus' is not one of: data, signal, gray, handshake",
        ),
    ] {
        let r = sync(extra);
        assert_eq!(r.code, 2, "{extra:?}: {}", r.stdout);
        assert!(r.stderr.contains(msg), "{extra:?}: {}", r.stderr);
    }
    // Duty outside (0, 1), with the pair instead of tau.
    for duty in ["0", "1", "1.5", "-0.2"] {
        let r = run(&[
            "sync",
            "--tau-master",
            "20ps",
            "--tau-slave",
            "30ps",
            "--duty",
            duty,
            "--tw",
            "40ps",
            "--fclk",
            "1GHz",
            "--fdata",
            "100MHz",
            "--stages",
            "2",
            "--tsu",
            "30ps",
            "--tcq",
            "50ps",
        ]);
        assert_eq!(r.code, 2, "duty {duty}");
        assert!(r.stderr.contains("duty: "), "duty {duty}: {}", r.stderr);
    }
}

#[test]
fn crossing_kinds_echo_the_fdata_they_imply() {
    // A Gray pointer incrementing 50 million times a second: fdata 50 MHz for the whole
    // pointer; a signal at activity 0.25 on 400 MHz: 100 MHz; a handshake of 10 M
    // transfers a second: 20 MHz on each synchronizer.
    for (extra, want) in [
        (&["--crossing", "gray", "--increments", "50MHz"][..], 50e6),
        (
            &[
                "--crossing",
                "signal",
                "--flaunch",
                "400MHz",
                "--activity",
                "0.25",
            ],
            100e6,
        ),
        (&["--crossing", "handshake", "--transfers", "10MHz"], 20e6),
    ] {
        let mut a = vec!["--json"];
        a.extend_from_slice(extra);
        let r = sync(&a);
        let v: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
        crate::tolerance::assert_rel(
            "fdata",
            v["fdata_hz"].as_f64().unwrap(),
            want,
            crate::tolerance::ARITH_REL,
        );
        assert_eq!(v["unused"], serde_json::json!(["fdata"]), "{v}");
    }
    let r = sync(&["--crossing", "gray", "--increments", "50MHz"]);
    assert!(
        r.stdout.contains("one data edge per increment"),
        "{}",
        r.stdout
    );
}

#[test]
fn related_clocks_report_the_factor_and_sign_off_at_the_worst_phase() {
    let r = sync(&[
        "--json", "--fclk", "500MHz", "--ratio", "4/5", "--jitter", "10ps",
    ]);
    let v: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(v["phase_given"], serde_json::json!(false));
    assert_eq!(v["standard_formula_safe"], serde_json::json!(false));
    assert!(v["clock_factor_best"].is_null() || v["clock_factor_best"].as_f64().unwrap() < 1e-10);
    assert!(
        v["warnings"]
            .to_string()
            .contains("signed off at the worst phase"),
        "{v}"
    );
    // 8/10 is 4/5 in lowest terms.
    let r = sync(&[
        "--json", "--fclk", "500MHz", "--ratio", "8/10", "--jitter", "10ps",
    ]);
    let w: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(w["inputs"]["ratio"], "4/5");
    assert_eq!(w["log10_mtbf_s"], v["log10_mtbf_s"]);
    // Jitter at 0.6 of the lattice spacing: the standard formula holds at every phase.
    let r = sync(&[
        "--json", "--fclk", "500MHz", "--ratio", "4/5", "--jitter", "300ps",
    ]);
    let s: serde_json::Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(s["standard_formula_safe"], serde_json::json!(true));
}
