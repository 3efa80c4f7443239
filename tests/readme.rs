//! The README's worked demo case: its command runs, prints the numbers the README quotes,
//! and those numbers are the model's closed form evaluated by hand here.

use std::process::Command;

use crate::tolerance::{assert_rel, F64_REL};

fn readme() -> String {
    std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md")).unwrap()
}

/// The arguments of the README command that starts with `opening` (after the program
/// name), its lines joined.
fn command_args(text: &str, opening: &str) -> Vec<String> {
    let start = text
        .find(opening)
        .unwrap_or_else(|| panic!("the README shows the command '{opening}'"));
    let end = start + text[start..].find("\n```").unwrap();
    text[start..end]
        .replace("\\\n", " ")
        .split_whitespace()
        .skip(1)
        .map(str::to_string)
        .collect()
}

#[test]
fn comparator_demo_numbers_hold() {
    let text = readme();
    let args = command_args(&text, "target/release/latchwise comparator --tau");
    // The prose as one line, so that a quote may wrap in the file.
    let prose = text.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(args.contains(&"--target-ber".to_string()), "{args:?}");
    // Closed form (domain notes section 3), uniform model: tau 15 ps, 80 ps + 2 x 100 ps,
    // vmin 0.4 V behind gain 4, lsb 1 mV, 5 GS/s, target 1e-10.
    let tau: f64 = 15e-12;
    let treg: f64 = 80e-12 + 2.0 * 100e-12;
    let v0: f64 = 0.4 / 4.0;
    let vcrit = v0 * (-treg / tau).exp();
    let p = 2.0 * vcrit / 1e-3;
    let per_s = 5e9 * p;
    let margin = -10.0 - p.log10();
    // p(t) = (2 v0 / lsb) exp(-t/tau) = 1e-10 gives the regeneration time needed.
    let needed = tau * (2.0 * v0 / 1e-3 / 1e-10).ln();
    let max_tau = treg / (2.0 * v0 / 1e-3 / 1e-10).ln();
    let extra = ((needed - 80e-12) / 100e-12).ceil();
    // What the README says, and that it is the closed form rounded as printed.
    for (quoted, value) in [
        ("vcrit = 7.82e-10 V", format!("vcrit = {vcrit:.2e} V")),
        (
            "error probability of 1.56e-6",
            format!("error probability of {p:.2e}"),
        ),
        (
            "missed by 4.19 decades",
            format!("missed by {:.2} decades", -margin),
        ),
        ("needs 425 ps", format!("needs {:.0} ps", needed * 1e12)),
        (
            "at most 9.9 ps",
            format!("at most {:.1} ps", max_tau * 1e12),
        ),
    ] {
        assert!(prose.contains(quoted), "README no longer says '{quoted}'");
        assert_eq!(value, quoted, "the closed form against the README");
    }
    assert!(prose.contains("about 7,800 sparkle codes a second"));
    assert_eq!((per_s / 100.0).round() * 100.0, 7800.0);
    assert!(prose.contains("four 100 ps latches instead of two"));
    assert_eq!(extra, 4.0);
    // And the command prints them.
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(&args)
        .arg("--json")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1), "the target is missed");
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let num = |k: &str| v[k].as_f64().unwrap_or(f64::NAN);
    assert_rel("vcrit", 10f64.powf(num("log10_vcrit_v")), vcrit, F64_REL);
    assert_rel("p", 10f64.powf(num("log10_p_error")), p, F64_REL);
    assert_rel("margin", num("margin_decades"), margin, F64_REL);
    assert_rel("treg needed", num("treg_needed_s"), needed, F64_REL);
    assert_rel("max tau", num("max_tau_s"), max_tau, F64_REL);
    assert_eq!(v["extra_stages_needed"], serde_json::json!(4));
}

#[test]
fn related_clock_example_numbers_hold() {
    let text = readme();
    let prose = text.split_whitespace().collect::<Vec<_>>().join(" ");
    let args = command_args(&text, "target/release/latchwise sync --tau 50ps");
    // By hand: tr = 2 ns - 25 ps - 40 ps = 1.935 ns; MTBF = exp(tr/tau) / (fdata fclk tw);
    // K at the worst phase = g / (sigma sqrt(2 pi)) with g = 1/(4 * 500 MHz) = 0.5 ns.
    let year = latchwise::reliability::YEAR_S;
    let standard_years = (1.935e-9f64 / 50e-12).exp() / (50e6 * 500e6 * 35e-12) / year;
    let k = 0.5e-9 / (8e-12 * (2.0 * std::f64::consts::PI).sqrt());
    for (quoted, value) in [
        ("gives 2,320 years", {
            // The report prints three significant digits: 2320.
            let three = (standard_years / 10.0).round() as u32 * 10;
            format!("gives {},{:03} years", three / 1000, three % 1000)
        }),
        (
            "met by 0.37 decades",
            format!("met by {:.2} decades", (standard_years / 1e3).log10()),
        ),
        ("K = 24.9", format!("K = {k:.1}")),
        (
            "the MTBF is 93 years",
            format!("the MTBF is {:.0} years", standard_years / k),
        ),
        (
            "missed by 1.03 decades",
            format!(
                "missed by {:.2} decades",
                -(standard_years / k / 1e3).log10()
            ),
        ),
    ] {
        assert!(prose.contains(quoted), "README no longer says '{quoted}'");
        assert_eq!(value, quoted, "by hand against the README");
    }
    assert!(prose.contains("three flip-flops are needed"));
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(&args)
        .arg("--json")
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_rel(
        "K",
        v["clock_factor"].as_f64().unwrap(),
        k,
        crate::tolerance::F64_REL,
    );
    assert_rel(
        "MTBF",
        10f64.powf(v["log10_mtbf_years"].as_f64().unwrap()),
        standard_years / k,
        crate::tolerance::F64_REL,
    );
    assert_eq!(v["min_stages"], serde_json::json!(3));
}

#[test]
fn budget_demo_numbers_hold() {
    let prose = readme().split_whitespace().collect::<Vec<_>>().join(" ");
    let root = env!("CARGO_MANIFEST_DIR");
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args([
            "budget",
            &format!("{root}/examples/budget-design.csv"),
            "--corners",
        ])
        .arg(format!("{root}/examples/budget-corners.csv"))
        .args([
            "--budget-fit",
            "10",
            "--tau-sigma",
            "0.05",
            "--tw-sigma",
            "0.3",
            "--json",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let total = v["log10_total_fit"].as_f64().unwrap();
    assert_eq!(v["signoff"], "p95");
    let top = v["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["share"].as_f64().unwrap())
        .fold(0.0, f64::max);
    for (quoted, value) in [
        (
            "worst at 7.07e6 FIT",
            format!("worst at {} FIT", latchwise::units::format_log10(total, 3)),
        ),
        (
            "8.04e7 FIT at the 95th percentile",
            format!(
                "{} FIT at the 95th percentile",
                latchwise::units::format_log10(v["log10_total_fit_p95"].as_f64().unwrap(), 3)
            ),
        ),
        (
            "missing 10 FIT there by 6.91 decades (5.85 decades nominally)",
            format!(
                "missing 10 FIT there by {:.2} decades ({:.2} decades nominally)",
                -v["margin_decades"].as_f64().unwrap(),
                -v["margin_decades_nominal"].as_f64().unwrap()
            ),
        ),
        (
            "bring the 95th percentile to 6.9e-5 FIT",
            format!(
                "bring the 95th percentile to {} FIT",
                latchwise::units::format_log10(
                    v["log10_total_fit_p95_after_fix"].as_f64().unwrap(),
                    2
                )
            ),
        ),
        ("60 % of it", format!("{:.0} % of it", 100.0 * top)),
        (
            "here 72 flip-flops on seven crossings",
            format!(
                "here {:.0} flip-flops on seven crossings",
                v["added_flip_flops"].as_f64().unwrap()
            ),
        ),
    ] {
        assert!(prose.contains(quoted), "README no longer says '{quoted}'");
        assert_eq!(value, quoted, "the command against the README");
    }
    assert_eq!(v["worst_corner"], "low_v_cold");
    assert_eq!(v["fix"].as_array().unwrap().len(), 7);
}

#[test]
fn converter_example_numbers_hold() {
    let text = readme();
    let prose = text.split_whitespace().collect::<Vec<_>>().join(" ");
    let args = command_args(&text, "target/release/latchwise converter --bits 12");
    // By hand (domain notes section 11): Vx = 0.2 / 4 = 50 mV, p = 2 Vx exp(-700/20) / 1 V;
    // P_meta = 4095 p; under hard consumption |e| >= 64 = 2^6 takes steps 1..5 wholly and
    // half of step 6: (31 + 16) p = 47 p. The target: 1 FIT at 50 MS/s per conversion.
    let p = 2.0 * 0.05 * (-35f64).exp();
    let meta = 4095.0 * p;
    let big = 47.0 * p;
    let target = 1.0 / (3.6e12 * 50e6);
    let needed = 700e-12 + 20e-12 * (big / target).ln();
    let hours = 1.0 / (meta * 50e6) / 3600.0;
    for (quoted, value) in [
        (
            "gives 2.582e-13 late decisions per conversion",
            format!("gives {meta:.3e} late decisions per conversion"),
        ),
        ("(one every 21.5 h)", format!("(one every {hours:.1} h)")),
        (
            "2.963e-15 errors of 64 LSB or more",
            format!("{big:.3e} errors of 64 LSB or more"),
        ),
        (
            "missed by 5.73 decades",
            format!("missed by {:.2} decades", (big / target).log10()),
        ),
        (
            "963.7 ps per bit needed",
            format!("{:.1} ps per bit needed", needed * 1e12),
        ),
    ] {
        assert!(prose.contains(quoted), "README no longer says '{quoted}'");
        assert_eq!(value, quoted, "by hand against the README");
    }
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(&args)
        .arg("--json")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1), "the target is missed");
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let num = |k: &str| v[k].as_f64().unwrap_or(f64::NAN);
    assert_rel("P_meta", 10f64.powf(num("log10_p_meta")), meta, F64_REL);
    assert_rel(
        "P(|e| >= 64)",
        10f64.powf(num("log10_ber_meta")),
        big,
        F64_REL,
    );
    assert_rel("tbit needed", num("tbit_needed_s"), needed, F64_REL);
}

#[test]
fn supply_demo_numbers_hold() {
    let text = readme();
    let prose = text.split_whitespace().collect::<Vec<_>>().join(" ");
    let root = env!("CARGO_MANIFEST_DIR");
    let args: Vec<String> = command_args(&text, "target/release/latchwise supply examples")
        .into_iter()
        .map(|a| a.replace("examples/", &format!("{root}/examples/")))
        .collect();
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(&args)
        .arg("--json")
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let fmt = |k: &str| latchwise::units::format_log10(v[k].as_f64().unwrap(), 3);
    let worst_at_125 = v["points"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| p["corner"] == "eco_125C")
        .unwrap()["min_stages"]
        .clone();
    // By hand: 10^(20 / 62.5) = 2.0893.
    assert_rel(
        "ageing",
        v["ageing_factor"].as_f64().unwrap(),
        10f64.powf(0.32),
        F64_REL,
    );
    for (quoted, value) in [
        (
            "The worst point is `eco_m40C`",
            format!(
                "The worst point is `{}`",
                v["worst_point"].as_str().unwrap()
            ),
        ),
        (
            "at 2.14e14 FIT",
            format!("at {} FIT", fmt("log10_fit_worst")),
        ),
        (
            "residency-weighted rate 6.66e13 FIT",
            format!("residency-weighted rate {} FIT", fmt("log10_fit_weighted")),
        ),
        (
            "multiplies tau by 2.089",
            format!("multiplies tau by {:.3}", 10f64.powf(0.32)),
        ),
        (
            "needs 6 flip-flops at every point",
            format!("needs {} flip-flops at every point", v["stages_needed"]),
        ),
        (
            "at 125 °C two suffice",
            format!(
                "at 125 °C {} suffice",
                if worst_at_125 == 2 { "two" } else { "?" }
            ),
        ),
    ] {
        assert!(prose.contains(quoted), "README no longer says '{quoted}'");
        assert_eq!(value, quoted, "the command against the README");
    }
}
