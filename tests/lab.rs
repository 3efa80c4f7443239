//! From the lab into the sign-off: the fit as a budget corner (CLI and link), the range
//! the data cover carried to the synchronizer and the budget, and the joint region's
//! worst point against a search of the region's boundary.

use std::process::Command;

use latchwise::calculator::Calculator;
use latchwise::characterize::FitCalculator;
use latchwise::params::RawInputs;
use serde_json::Value;

fn root() -> &'static str {
    env!("CARGO_MANIFEST_DIR")
}

fn run(args: &[&str]) -> (String, String, i32) {
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(args)
        .output()
        .unwrap();
    (
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
        out.status.code().unwrap_or(-1),
    )
}

fn demo_fit() -> Value {
    let data = std::fs::read_to_string(format!("{}/examples/fit-counts.csv", root())).unwrap();
    let raw = RawInputs::from_pairs([
        ("kind", "counts"),
        ("data", data.as_str()),
        ("fclk", "1GHz"),
        ("fdata", "50MHz"),
    ]);
    serde_json::to_value(FitCalculator::evaluate(&FitCalculator::read(&raw).unwrap())).unwrap()
}

/// `--corner NAME` prints the fit as a corners CSV (a header and a row) that a corners file
/// takes as it is; a name a table cannot hold is refused.
#[test]
fn a_fit_prints_itself_as_a_budget_corner() {
    let data = format!("{}/examples/fit-counts.csv", root());
    let (out, _, code) = run(&[
        "fit", "counts", &data, "--fclk", "1GHz", "--fdata", "50MHz", "--corner", "lab_25c",
    ]);
    assert_eq!(code, 0);
    let fit = demo_fit();
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines[0], "corner,tau,tw,tr_max");
    let cells: Vec<&str> = lines[1].split(',').collect();
    assert_eq!(cells[0], "lab_25c");
    let tau: f64 = cells[1].parse().unwrap();
    assert!((tau / fit["tau_s"].as_f64().unwrap() - 1.0).abs() < 1e-4);
    assert_eq!(cells[3].parse::<f64>().unwrap(), 380e-12);
    // Appended to the demo's corners (their columns by name), the budget reads it; the
    // corner then needs tsu and tcq, which the rows do not give: said at its line.
    let corners = format!(
        "corner,tau,tw,tr_max,tsu,tcq\ntypical,12ps,20ps,,25ps,40ps\n{},{},{},{},35ps,60ps\n",
        cells[0], cells[1], cells[2], cells[3]
    );
    let dir = std::env::temp_dir().join(format!("latchwise-lab-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("corners.csv");
    std::fs::write(&file, &corners).unwrap();
    let design = format!("{}/examples/budget-design.csv", root());
    let (out, err, code) = run(&[
        "budget",
        &design,
        "--corners",
        file.to_str().unwrap(),
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let v: Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["corners"][1]["name"], "lab_25c");
    // The design's 1.2 GHz rows resolve for 833.3 - 35 - 60 = 738.3 ps at that corner,
    // beyond the lab's 380 ps.
    let warned = v["warnings"].as_array().unwrap().iter().any(|w| {
        w.as_str().unwrap().contains(
            "At corner lab_25c: The resolution time 738.3 ps extrapolates the exponential 1.9 times",
        )
    });
    assert!(warned, "{}", v["warnings"]);
    std::fs::write(&file, corners.replace(",35ps,60ps", ",,")).unwrap();
    let (_, err, code) = run(&["budget", &design, "--corners", file.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(
        err.contains(
            "line 3, column tsu: corner lab_25c gives no tsu, which 24 of the design's rows need"
        ),
        "{err}"
    );
    let (_, err, code) = run(&[
        "fit", "counts", &data, "--fclk", "1GHz", "--fdata", "50MHz", "--corner", "a,b",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("corner: 'a,b' cannot name a corner"), "{err}");
    std::fs::remove_dir_all(&dir).ok();
}

/// The synchronizer warns when its resolution time is beyond the range the data covered.
#[test]
fn the_synchronizer_says_when_it_extrapolates() {
    let (out, _, _) = run(&[
        "sync", "--tau", "20ps", "--tw", "30ps", "--fclk", "1GHz", "--fdata", "10MHz", "--stages",
        "3", "--tsu", "30ps", "--tcq", "40ps", "--tr-max", "500ps", "--json",
    ]);
    let v: Value = serde_json::from_str(&out).unwrap();
    let w = v["warnings"].to_string();
    // 2 x (1 ns - 70 ps) = 1.86 ns against 500 ps: 3.72 times.
    assert!(
        w.contains("The resolution time 1.86 ns extrapolates the exponential 3.7 times"),
        "{w}"
    );
    let (out, _, _) = run(&[
        "sync", "--tau", "20ps", "--tw", "30ps", "--fclk", "1GHz", "--fdata", "10MHz", "--stages",
        "3", "--tsu", "30ps", "--tcq", "40ps", "--tr-max", "2ns", "--json",
    ]);
    assert!(!out.contains("extrapolates"));
}

/// The joint region's worst point: the largest ln rate at tr over the Wald ellipse of (ln
/// w, 1/tau), against a search of the ellipse's boundary in 100,000 steps of angle.
#[test]
fn the_worst_point_is_the_ellipse_maximum() {
    let fit = demo_fit();
    let b = 1.0 / fit["tau_s"].as_f64().unwrap();
    let a = fit["tw_s"].as_f64().unwrap().ln();
    let sd_a = fit["sd_ln_tw"].as_f64().unwrap();
    let sd_b = b * fit["sd_ln_tau"].as_f64().unwrap();
    let r = -fit["corr_ln_tau_ln_tw"].as_f64().unwrap();
    let data = std::fs::read_to_string(format!("{}/examples/fit-counts.csv", root())).unwrap();
    // At the longest tr in the data, and at a design's (880 ps, given as worst-at).
    for at in [None, Some("880ps")] {
        let tr = at.map_or(fit["tr_max_s"].as_f64().unwrap(), |_| 880e-12);
        let c = (-2.0 * 0.05f64.ln()).sqrt();
        let (l11, l21, l22) = (sd_a, r * sd_b, sd_b * (1.0 - r * r).sqrt());
        let mut best = (f64::NEG_INFINITY, 0.0, 0.0);
        for i in 0..100_000 {
            let t = 2.0 * std::f64::consts::PI * f64::from(i) / 100_000.0;
            let (u, v) = (c * t.cos(), c * t.sin());
            let (aa, bb) = (a + l11 * u, b + l21 * u + l22 * v);
            let rate = aa - bb * tr;
            if rate > best.0 {
                best = (rate, aa, bb);
            }
        }
        let mut pairs = vec![
            ("kind", "counts".to_string()),
            ("data", data.clone()),
            ("fclk", "1GHz".to_string()),
            ("fdata", "50MHz".to_string()),
        ];
        if let Some(t) = at {
            pairs.push(("worst-at", t.to_string()));
        }
        let report =
            FitCalculator::evaluate(&FitCalculator::read(&RawInputs::from_pairs(pairs)).unwrap());
        let (tau, w, got_tr) = report.worst_point().unwrap();
        assert_eq!(got_tr, tr);
        assert!(
            (1.0 / tau / best.2 - 1.0).abs() < 1e-6,
            "{} against {}",
            1.0 / tau,
            best.2
        );
        assert!(
            (w.ln() - best.1).abs() < 1e-6,
            "{} against {}",
            w.ln(),
            best.1
        );
    }
    let c = (-2.0 * 0.05f64.ln()).sqrt();
    let (l11, l21, l22) = (sd_a, r * sd_b, sd_b * (1.0 - r * r).sqrt());
    // Outside the region: the two marginal upper ends together.
    let (hi_tau, hi_w) = (
        fit["tau_s_ci_high"].as_f64().unwrap(),
        fit["tw_s_ci_high"].as_f64().unwrap(),
    );
    let d = [hi_w.ln() - a, 1.0 / hi_tau - b];
    let u = d[0] / l11;
    let v = (d[1] - l21 * u) / l22;
    assert!(
        u * u + v * v > c * c,
        "the marginal ends lie outside the joint region"
    );
}

/// What the fit shows is what the engineer types on: its tau and window, re-typed from
/// the report into the synchronizer, move no result by more than 1e-4 relative for
/// resolution times up to 100 tau; and the links and the corner carry at least the
/// digits shown (nine significant), so following them moves nothing visible at all.
#[test]
fn shown_digits_carry_the_fit_into_a_calculator() {
    use latchwise::synchronizer::SyncCalculator;
    let mtbf = |tau: &str, tw: &str, fclk: &str| -> f64 {
        let raw = RawInputs::from_pairs([
            ("tau", tau),
            ("tw", tw),
            ("fclk", fclk),
            ("fdata", "100MHz"),
            ("stages", "2"),
            ("tsu", "0ps"),
            ("tcq", "0ps"),
        ]);
        let case = SyncCalculator::read(&raw).unwrap_or_else(|e| panic!("{tau} {tw}: {e}"));
        let v = serde_json::to_value(SyncCalculator::evaluate(&case)).unwrap();
        v["log10_mtbf_s"].as_f64().unwrap()
    };
    for (kind, file, set) in [
        (
            "counts",
            "fit-counts.csv",
            vec![("fclk", "1GHz"), ("fdata", "50MHz")],
        ),
        ("delay", "fit-delay.csv", vec![]),
        ("comparator", "fit-comparator.csv", vec![]),
    ] {
        let data = std::fs::read_to_string(format!("{}/examples/{file}", root())).unwrap();
        let mut pairs = vec![("kind", kind), ("data", data.as_str())];
        pairs.extend(set);
        let report =
            FitCalculator::evaluate(&FitCalculator::read(&RawInputs::from_pairs(pairs)).unwrap());
        let shown = |name: &str| {
            report
                .readouts()
                .into_iter()
                .find(|r| r.name == name)
                .map(|r| (r.text, r.value.unwrap()))
        };
        let (tau_text, tau) = shown("tau_s").unwrap();
        // The window: tw where the fit gives it; the comparator's v0 enters linearly, as
        // tw does, so its six digits are held to the same rounding.
        let (tw_text, tw) = shown("tw_s").unwrap_or((format!("{:.6e}s", 30e-12), 30e-12));
        if let Some((text, v0)) = shown("v0_v") {
            let typed = text.trim_end_matches('V').trim();
            let (num, prefix) = typed.split_at(typed.find(' ').unwrap_or(typed.len()));
            let scale = match prefix.trim() {
                "mV" | "m" => 1e-3,
                "µV" | "µ" | "u" => 1e-6,
                "" => 1.0,
                p => panic!("{kind}: prefix {p}"),
            };
            let back: f64 = num.parse::<f64>().unwrap() * scale;
            assert!(
                (back / v0 - 1.0).abs() <= 1e-5,
                "{kind}: v0 {text} against {v0}"
            );
        }
        // Resolution times 2 / fclk, up to 100 tau.
        for periods in [5.0, 20.0, 50.0] {
            let fclk = format!("{:.9e}Hz", 1.0 / (periods * tau));
            let exact = mtbf(&format!("{tau:e}s"), &format!("{tw:e}s"), &fclk);
            let typed = mtbf(&tau_text, &tw_text, &fclk);
            let rel = (10f64.powf(typed - exact) - 1.0).abs();
            assert!(
                rel <= 1e-4,
                "{kind}: tr {} tau: {tau_text}, {tw_text}: {rel:e}",
                2.0 * periods
            );
        }
        for (_, link) in report.outcome().links {
            // The link names its point (the estimate or the region's worst point); the
            // estimate's link holds the estimate to nine digits.
            let query = link.split_once('?').map_or("", |(_, q)| q);
            if let Some((_, text)) = query
                .split('&')
                .filter_map(|p| p.split_once('='))
                .find(|(k, _)| *k == "tau")
            {
                let carried: f64 = text.parse().unwrap();
                if (carried / tau - 1.0).abs() < 1e-3 {
                    assert!((carried / tau - 1.0).abs() <= 5e-9, "{kind}: {link}");
                }
            }
        }
    }
}
