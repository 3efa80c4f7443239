//! Fits: the three experiments against an independent mpmath computation, interval
//! coverage on synthetic data from known parameters, the zero-count rows that must be
//! kept, every bad file, and the command line.

use std::process::{Command, Stdio};

use latchwise::calculator::Calculator;
use latchwise::characterize::FitCalculator;
use latchwise::numeric::random::Random;
use latchwise::numeric::special::{chi2_sf, t_quantile};
use latchwise::params::RawInputs;
use serde_json::Value;

use crate::tolerance::{assert_rel, table_rows, FIT_REL, SAMPLE_SIGMAS};

fn file(name: &str) -> String {
    let root = env!("CARGO_MANIFEST_DIR");
    std::fs::read_to_string(format!("{root}/examples/{name}"))
        .or_else(|_| std::fs::read_to_string(format!("{root}/tests/fixtures/{name}")))
        .unwrap()
}

/// The report of a fit of `data` with the settings `pairs`.
fn fit(kind: &str, data: &str, pairs: &[(&str, &str)]) -> Result<Value, String> {
    let mut all = vec![
        ("kind".to_string(), kind.to_string()),
        ("data".into(), data.into()),
    ];
    all.extend(pairs.iter().map(|(k, v)| (k.to_string(), v.to_string())));
    FitCalculator::read(&RawInputs::from_pairs(all))
        .map(|c| serde_json::to_value(FitCalculator::evaluate(&c)).unwrap())
        .map_err(|e| e.to_string())
}

/// A counts fit's estimates and interval ends, as the report names them.
const COUNTS_ESTIMATES: [&str; 6] = [
    "tau_s",
    "tau_s_ci_low",
    "tau_s_ci_high",
    "tw_s",
    "tw_s_ci_low",
    "tw_s_ci_high",
];

fn settings(s: &str) -> Vec<(&str, &str)> {
    s.split('&')
        .filter(|p| !p.is_empty())
        .filter_map(|p| p.split_once('='))
        .collect()
}

#[test]
fn fits_match_mpmath() {
    // tests/fixtures/fits_reference.csv: mpmath at 50 digits (scripts/gen_reference.py),
    // an independent Poisson maximum likelihood with its Hessian, profile-likelihood search,
    // the whole-sweep delay fit by Gauss-Newton with its covariance, and least squares.
    let text = include_str!("fixtures/fits_reference.csv");
    let rows = table_rows(text);
    assert!(rows.len() >= 20);
    for line in rows {
        let c: Vec<&str> = line.split(';').collect();
        let (name, kind, src, set, key, want) =
            (c[0], c[1], c[2], c[3], c[4], c[5].parse::<f64>().unwrap());
        match kind {
            "special" if key == "t_0.975" => {
                let df: f64 = name.trim_start_matches("t-quantile-df").parse().unwrap();
                assert_rel(name, t_quantile(0.975, df), want, FIT_REL);
            }
            "special" => {
                let parts: Vec<&str> = name.trim_start_matches("chi2-sf-").split('-').collect();
                let got = chi2_sf(parts[0].parse().unwrap(), parts[1].parse().unwrap());
                assert_rel(name, got, want, FIT_REL);
            }
            _ if src == "-" => {
                // The zero-count rows dropped: the mistake, computed to show its size.
                let kept: String = file("counts_with_zero_rows.csv")
                    .lines()
                    .filter(|l| !l.contains(",0,"))
                    .map(|l| format!("{l}\n"))
                    .collect();
                let dropped =
                    fit("counts", &kept, &[("fclk", "1GHz"), ("fdata", "100MHz")]).unwrap();
                assert_rel(name, dropped[key].as_f64().unwrap(), want, FIT_REL);
            }
            _ => {
                let v =
                    fit(kind, &file(src), &settings(set)).unwrap_or_else(|e| panic!("{name}: {e}"));
                let got = v[key]
                    .as_f64()
                    .unwrap_or_else(|| panic!("{name}: no {key}"));
                assert_rel(&format!("{name} {key}"), got, want, FIT_REL);
            }
        }
    }
}

#[test]
fn zero_count_rows_are_kept_and_matter() {
    let set = [("fclk", "1GHz"), ("fdata", "100MHz")];
    let all = fit("counts", &file("counts_with_zero_rows.csv"), &set).unwrap();
    let kept: String = file("counts_with_zero_rows.csv")
        .lines()
        .filter(|l| !l.contains(",0,"))
        .map(|l| format!("{l}\n"))
        .collect();
    let dropped = fit("counts", &kept, &set).unwrap();
    let (a, b) = (
        all["tau_s"].as_f64().unwrap(),
        dropped["tau_s"].as_f64().unwrap(),
    );
    assert!(
        b / a > 1.05,
        "dropping the zero rows moves tau from {a:e} to {b:e}"
    );
    // Every row is in the report, the zero ones with their expected counts.
    assert_eq!(all["rows"].as_array().unwrap().len(), 13);
    assert!(
        all["rows"][12]["failures"].as_f64() == Some(0.0)
            && all["rows"][12]["expected"].as_f64().unwrap() > 0.0
    );
}

/// A row with no failures far beyond the others (an hour at 1 us) adds almost nothing
/// (its expected count at the fit is e^-55,000): the fit is the demo's. It once capped
/// 1/tau at 1e4 over the tr span, so that row alone made tau 100 ps (the cap) with an
/// interval that missed its own estimate.
#[test]
fn a_zero_row_far_out_leaves_the_fit_where_it_was() {
    let set = [("fclk", "1GHz"), ("fdata", "50MHz")];
    let demo = file("fit-counts.csv");
    let base = fit("counts", &demo, &set).unwrap();
    let far = fit("counts", &format!("{demo}1us,0,1h\n"), &set).unwrap();
    for key in COUNTS_ESTIMATES
        .into_iter()
        .chain(["sd_ln_tau", "sd_ln_tw"])
    {
        assert_rel(
            key,
            far[key].as_f64().unwrap(),
            base[key].as_f64().unwrap(),
            1e-6,
        );
    }
    // The far row expects e^-55,000 failures: it bounds the rate at 1 us but cannot
    // test the law there, so the data characterise tr up to the demo's 380 ps, and the
    // report says why.
    assert_eq!(far["tr_max_s"], base["tr_max_s"]);
    assert_eq!(base["tr_max_s"].as_f64(), Some(380e-12));
    let w = far["warnings"].to_string();
    assert!(
        w.contains("characterise tr up to 380 ps (tr_max), not 1 µs"),
        "{w}"
    );
    assert!(!base["warnings"].to_string().contains("tr_max"));
}

/// The same over many data sets: a zero row at 3 ns to 300 us, counted for 1 s to a day
/// (expected count at the fit below e^-100), moves no estimate or interval end by more
/// than 1e-6 of itself.
#[test]
fn zero_rows_far_out_never_move_the_fit() {
    let set = [("fclk", "1GHz"), ("fdata", "50MHz")];
    let mut r = Random::new(20261204);
    for _ in 0..200 {
        let tau = 10f64.powf(-11.3 + 0.6 * r.uniform());
        let tw = 10f64.powf(-11.5 + 1.0 * r.uniform());
        let data = synthetic_counts(&mut r, tau, tw);
        let Ok(base) = fit("counts", &data, &set) else {
            continue;
        };
        let tr = 3e-9 * 10f64.powf(5.0 * r.uniform());
        let duration = 10f64.powf(4.9 * r.uniform());
        let far = fit("counts", &format!("{data}{tr:e},0,{duration:e}\n"), &set).unwrap();
        for key in COUNTS_ESTIMATES {
            if let (Some(a), Some(b)) = (far[key].as_f64(), base[key].as_f64()) {
                assert_rel(&format!("{key} with a zero row at {tr:e} s"), a, b, 1e-6);
            } else {
                assert_eq!(
                    far[key], base[key],
                    "{key} with a zero row at {tr:e} s for {duration:e} s\n{data}"
                );
            }
        }
    }
}

/// Counts far apart in tr whose peak lies beyond the old cap: the estimate is inside its
/// intervals, and a row with more failures than data edges (7e13 in 1 ns at 50 MHz) is
/// said to be impossible. (A case found by `scripts/explore`.)
#[test]
fn counts_beyond_the_old_cap_fit_inside_their_intervals() {
    let data = "tr,failures,duration\n1e0,1,1e-9\n7.757196048108886e-6,1,1e10\n1e-21,71925035978605,1e-9\n";
    let r = fit("counts", data, &[("fclk", "1GHz"), ("fdata", "50MHz")]).unwrap();
    for k in ["tau_s", "tw_s"] {
        let (x, lo, hi) = (
            r[k].as_f64().unwrap(),
            r[format!("{k}_ci_low")].as_f64().unwrap(),
            r[format!("{k}_ci_high")].as_f64().unwrap(),
        );
        assert!(lo <= x && x <= hi, "{k}: {lo:e} <= {x:e} <= {hi:e}");
    }
    // At the peak the expected counts sum to the failures (the score in ln w is zero).
    let rows = r["rows"].as_array().unwrap();
    let (k, mu): (f64, f64) = rows.iter().fold((0.0, 0.0), |(k, m), row| {
        (
            k + row["failures"].as_f64().unwrap(),
            m + row["expected"].as_f64().unwrap(),
        )
    });
    assert_rel("expected counts against the failures", mu, k, 1e-9);
    let warnings = r["warnings"].to_string();
    assert!(
        warnings.contains("more failures than data edges") && warnings.contains("line 4"),
        "{warnings}"
    );
    assert!(r["sd_ln_tau"].as_f64().is_some_and(f64::is_finite));
}

/// Synthetic counts from tau, tw at the demo's resolution times and durations.
fn synthetic_counts(r: &mut Random, tau: f64, tw: f64) -> String {
    let mut s = String::from("tr,failures,duration\n");
    for (tr, d) in [
        (100e-12, 1.0),
        (140e-12, 1.0),
        (180e-12, 2.0),
        (220e-12, 10.0),
        (260e-12, 30.0),
        (300e-12, 100.0),
    ] {
        let mu = d * 1e9 * 50e6 * tw * (-tr / tau).exp();
        s.push_str(&format!("{tr:e},{},{d}\n", r.poisson(mu)));
    }
    s
}

/// Asserts that `hits` of `n` 95 % intervals is a plausible coverage.
fn check_coverage(what: &str, hits: usize, n: usize) {
    let p = hits as f64 / n as f64;
    let se = (0.95 * 0.05 / n as f64).sqrt();
    assert!(
        (p - 0.95).abs() < SAMPLE_SIGMAS * se,
        "{what}: {hits} of {n} intervals cover the truth"
    );
}

#[test]
fn counts_intervals_cover_the_truth_at_the_nominal_rate() {
    let (tau, tw, n) = (18e-12, 22e-12, 400);
    let mut r = Random::new(20261202);
    let (mut tau_hits, mut tw_hits) = (0, 0);
    for _ in 0..n {
        let v = fit(
            "counts",
            &synthetic_counts(&mut r, tau, tw),
            &[("fclk", "1GHz"), ("fdata", "50MHz")],
        )
        .unwrap();
        let within = |k: &str, truth: f64| {
            let (lo, hi) = (
                v[format!("{k}_ci_low")].as_f64(),
                v[format!("{k}_ci_high")].as_f64(),
            );
            lo.is_none_or(|l| l <= truth) && hi.is_none_or(|h| truth <= h)
        };
        tau_hits += usize::from(within("tau_s", tau));
        tw_hits += usize::from(within("tw_s", tw));
    }
    check_coverage("tau", tau_hits, n);
    check_coverage("tw", tw_hits, n);
}

#[test]
fn counts_fit_does_not_depend_on_the_order_of_the_rows() {
    // Rows in ascending tr are taken as they are, others are sorted first: the same rows in
    // ascending, descending and shuffled order (with repeated tr among them) give one fit.
    let mut r = Random::new(5);
    let rows: Vec<String> = (0..3_000)
        .map(|i| {
            let tr = (100.0 + (i % 1_500) as f64 * 0.25) * 1e-12;
            let mu = 1e-3 * 1e9 * 50e6 * 22e-12 * (-tr / 18e-12).exp();
            format!("{tr:e},{},1e-3", r.poisson(mu))
        })
        .collect();
    let mut sorted = rows.clone();
    sorted.sort_by(|a, b| {
        let t = |s: &String| s.split(',').next().unwrap().parse::<f64>().unwrap();
        t(a).total_cmp(&t(b))
    });
    let mut shuffled = rows.clone();
    for i in (1..shuffled.len()).rev() {
        shuffled.swap(i, (r.uniform() * (i + 1) as f64) as usize);
    }
    let mut descending = sorted.clone();
    descending.reverse();
    let set = [("fclk", "1GHz"), ("fdata", "50MHz")];
    let run = |rows: &[String]| {
        let v = fit(
            "counts",
            &format!("tr,failures,duration\n{}\n", rows.join("\n")),
            &set,
        )
        .unwrap();
        (v["tau_s"].as_f64().unwrap(), v["tw_s"].as_f64().unwrap())
    };
    let want = run(&sorted);
    for (name, rows) in [("shuffled", &shuffled), ("descending", &descending)] {
        let got = run(rows);
        assert_rel(&format!("{name} tau"), got.0, want.0, 1e-12);
        assert_rel(&format!("{name} tw"), got.1, want.1, 1e-12);
    }
}

#[test]
fn comparator_intervals_cover_the_truth_and_recover_it() {
    let (tau, v0, n) = (14e-12, 0.1, 400);
    let mut r = Random::new(99);
    let (mut hits, mut sum) = (0, 0.0);
    for _ in 0..n {
        let mut data = String::from("vin,time\n");
        for e in -6..-1 {
            for m in [1.0, 3.0] {
                let vin = m * 10f64.powi(e);
                let t = tau * (v0 / vin).ln() + 0.4e-12 * r.normal();
                data.push_str(&format!("{vin:e},{t:e}\n"));
            }
        }
        let v = fit("comparator", &data, &[]).unwrap();
        let (lo, hi) = (
            v["tau_s_ci_low"].as_f64().unwrap(),
            v["tau_s_ci_high"].as_f64().unwrap(),
        );
        hits += usize::from(lo <= tau && tau <= hi);
        sum += v["tau_s"].as_f64().unwrap();
    }
    check_coverage("comparator tau", hits, n);
    // Unbiased: the mean estimate is the truth within its standard error.
    assert!(
        (sum / n as f64 / tau - 1.0).abs() < 1e-3,
        "{}",
        sum / n as f64
    );
}

/// A comparator sweep's outliers are named by line, one at the end of the sweep too (it
/// pulls the least-squares line towards itself, so its own residual looks small), and an
/// input above the fitted v0 (a saturated decision) is said to be outside the law; clean
/// sweeps (Gaussian timing noise) are flagged about once in a hundred, as the rule says.
#[test]
fn comparator_outliers_are_named_and_clean_sweeps_pass() {
    let demo = file("fit-comparator.csv");
    let warned = |data: &str| fit("comparator", data, &[]).unwrap()["warnings"].to_string();
    assert_eq!(warned(&demo), "[]");
    // The demo's line 8 (0.1 mV) 30 ps late; a point at 1 pV, 105 ps early; 1 V at 20 ps.
    let late = demo.replace("0.0001V,96.177ps", "0.0001V,126.177ps");
    assert!(
        warned(&late).contains("Line 8 stands far out"),
        "{}",
        warned(&late)
    );
    let lines = demo.lines().count();
    let early_end = format!("{demo}1e-12V,250ps\n");
    let w = warned(&early_end);
    assert!(
        w.contains(&format!("Line {} stands far out", lines + 1)),
        "{w}"
    );
    let saturated = format!("{demo}1V,20ps\n");
    let w = warned(&saturated);
    assert!(
        w.contains(&format!("Line {} stands far out", lines + 1)),
        "{w}"
    );
    assert!(
        w.contains("above the fitted v0") && w.contains("vin = 1 V"),
        "{w}"
    );
    // False alarms: sweeps of 10 points with 0.4 ps of noise, as the demo's.
    let mut r = Random::new(20261204);
    let n = 2000;
    let flagged = (0..n)
        .filter(|_| {
            let mut data = String::from("vin,time\n");
            for e in -6..-1 {
                for m in [1.0, 3.0] {
                    let vin = m * 10f64.powi(e);
                    let t = 14e-12 * (0.1 / vin).ln() + 0.4e-12 * r.normal();
                    data.push_str(&format!("{vin:e},{t:e}\n"));
                }
            }
            warned(&data).contains("far out")
        })
        .count();
    // 1 % by construction; 3 standard errors of 2000 draws either side.
    let p = flagged as f64 / n as f64;
    assert!(
        (p - 0.01).abs() < 3.0 * (0.01f64 * 0.99 / n as f64).sqrt(),
        "{flagged} of {n}"
    );
}

#[test]
fn delay_sweep_recovers_its_parameters() {
    // The demo sweep was drawn from tau 16 ps, tw 30 ps, balance offset 3.2 ps
    // (scripts/gen_examples.py) with 0.15 ps of noise: the intervals hold the truth.
    let v = fit("delay", &file("fit-delay.csv"), &[]).unwrap();
    for (k, truth) in [("tau_s", 16e-12), ("tw_s", 30e-12)] {
        let (lo, hi) = (
            v[format!("{k}_ci_low")].as_f64().unwrap(),
            v[format!("{k}_ci_high")].as_f64().unwrap(),
        );
        assert!(lo <= truth && truth <= hi, "{k}: {lo:e} .. {hi:e}");
    }
    assert!(
        (v["offset_m_s"].as_f64().unwrap() - 3.2e-12).abs() < 0.05e-12,
        "{v}"
    );
    let points = v["points"].as_array().unwrap();
    assert!(points
        .iter()
        .any(|p| p["reason"].as_str().unwrap().contains("plateau")));
    // The whole sweep: every point off the plateau is used, tcq fitted with it.
    assert!(!points
        .iter()
        .any(|p| p["reason"].as_str().unwrap().contains("nominal delay")));
    assert_eq!(v["tcq_source"], "fitted with the whole sweep");
    assert_eq!(v["method"], "coth");
    // The log law over the regenerative region leaves the nominal points out.
    let l = fit("delay", &file("fit-delay.csv"), &[("method", "log")]).unwrap();
    assert!(l["points"]
        .as_array()
        .unwrap()
        .iter()
        .any(|p| p["reason"].as_str().unwrap().contains("nominal delay")));
    assert_eq!(l["tcq_source"], "the delay far from the balance point");
    assert!(l["slope_drift"].as_f64().is_some());
}

/// A sweep of 24 offsets either side of `m` (geometric, from 0.1 ps to 1 ns away), its
/// extra delay by `shape`, clipped at 100 ps (the simulation window), with noise.
fn sweep(r: &mut Random, tau: f64, tw: f64, shape: impl Fn(f64) -> f64, noise: f64) -> String {
    let (tcq, m) = (45e-12, 3.2e-12);
    let mut out = String::from("offset,delay\n");
    for k in 0..24 {
        let d = 1e-13 * 10f64.powf(4.0 * f64::from(k % 12) / 11.0);
        let off = if k < 12 { m - 0.7 * d } else { m + d };
        let extra = (tau * shape((off - m).abs() / (tw / 2.0))).min(100e-12);
        out += &format!("{:e},{:e}\n", off, tcq + extra + noise * r.normal());
    }
    out
}

/// The whole-sweep fit on synthetic sweeps of two shapes, with tcq given and not: the ln
/// coth shape itself, and a saturation that also reaches tcq smoothly, tcq + tau ln(1 +
/// tw / (2 |offset - m|)) (near m the log law, far away tau tw / (2 |offset - m|)): tau
/// within 2 %, tw within 10 %.
#[test]
fn the_whole_sweep_fit_follows_both_shapes() {
    use latchwise::characterize::delay::ln_coth;
    let mut r = Random::new(20261203);
    let (tau, tw) = (16e-12, 30e-12);
    /// The extra delay over tau at x = |offset - m| / (tw/2).
    type Shape = fn(f64) -> f64;
    let shapes: [(&str, Shape); 2] = [("coth", ln_coth), ("saturation", |x| (1.0 / x).ln_1p())];
    for (name, shape) in shapes {
        for given in [None, Some("45ps")] {
            let data = sweep(&mut r, tau, tw, shape, 0.1e-12);
            let set: Vec<(&str, &str)> = given.iter().map(|t| ("tcq", *t)).collect();
            let v = fit("delay", &data, &set).unwrap_or_else(|e| panic!("{name}: {e}"));
            let (t, w) = (v["tau_s"].as_f64().unwrap(), v["tw_s"].as_f64().unwrap());
            assert!((t / tau - 1.0).abs() < 0.02, "{name} {given:?}: tau {t:e}");
            assert!((w / tw - 1.0).abs() < 0.10, "{name} {given:?}: tw {w:e}");
        }
    }
}

/// On the coth shape, the 95 % intervals of tau and tw cover the truth in about 95 % of
/// 200 seeded sweeps.
#[test]
fn the_whole_sweep_intervals_cover_the_truth() {
    use latchwise::characterize::delay::ln_coth;
    let mut r = Random::new(7_2026);
    let (tau, tw, n) = (16e-12, 30e-12, 200);
    let (mut hit_tau, mut hit_tw) = (0, 0);
    // The estimates' logs, and the sds and correlation each fit reports.
    let (mut lt, mut lw, mut reported) = (Vec::new(), Vec::new(), (0.0, 0.0, 0.0));
    for _ in 0..n {
        let data = sweep(&mut r, tau, tw, ln_coth, 0.15e-12);
        let v = fit("delay", &data, &[]).unwrap();
        let within = |k: &str, truth: f64| {
            v[format!("{k}_ci_low")].as_f64().unwrap() <= truth
                && truth <= v[format!("{k}_ci_high")].as_f64().unwrap()
        };
        hit_tau += usize::from(within("tau_s", tau));
        hit_tw += usize::from(within("tw_s", tw));
        lt.push(v["tau_s"].as_f64().unwrap().ln());
        lw.push(v["tw_s"].as_f64().unwrap().ln());
        reported.0 += v["sd_ln_tau"].as_f64().unwrap() / n as f64;
        reported.1 += v["sd_ln_tw"].as_f64().unwrap() / n as f64;
        reported.2 += v["corr_ln_tau_ln_tw"].as_f64().unwrap() / n as f64;
    }
    check_coverage("delay tau", hit_tau, n);
    check_coverage("delay tw", hit_tw, n);
    // The joint uncertainty the fits report is the spread the estimates show across the
    // sweeps: sds within 20 % and the correlation within 0.1 (200 samples: the sample
    // sd's own error is 5 %, the correlation's about 0.05 near -0.9).
    let mean = |v: &[f64]| v.iter().sum::<f64>() / v.len() as f64;
    let (mt, mw) = (mean(&lt), mean(&lw));
    let sd = |v: &[f64], m: f64| {
        (v.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (v.len() - 1) as f64).sqrt()
    };
    let (st, sw) = (sd(&lt, mt), sd(&lw, mw));
    let cov = lt
        .iter()
        .zip(&lw)
        .map(|(a, b)| (a - mt) * (b - mw))
        .sum::<f64>()
        / (n - 1) as f64;
    let corr = cov / (st * sw);
    assert!(
        (st / reported.0 - 1.0).abs() < 0.2,
        "sd ln tau {st} against {}",
        reported.0
    );
    assert!(
        (sw / reported.1 - 1.0).abs() < 0.2,
        "sd ln tw {sw} against {}",
        reported.1
    );
    assert!(
        (corr - reported.2).abs() < 0.1,
        "corr {corr} against {}",
        reported.2
    );
}

#[test]
fn every_bad_file_gets_its_message() {
    let set = [("fclk", "1GHz"), ("fdata", "100MHz")];
    for (data, msg) in [
        ("", "data: a value is required"),
        ("# only a comment\n", "line 1: the table is empty"),
        (
            "tr,failures\n1ns,3\n",
            "line 1, column duration: the column is missing",
        ),
        (
            "tr,failures,duration,colour\n1ns,3,1s,red\n",
            "line 1, column colour: unknown column",
        ),
        (
            "tr,failures,duration\n1ns,-3,1s\n2ns,1,1s\n",
            "line 2, column failures: '-3' is negative",
        ),
        (
            "tr,failures,duration\n1ns,many,1s\n",
            "line 2, column failures: 'many' is not a number",
        ),
        (
            "tr,failures,duration\n1ns,2.5,1s\n",
            "line 2, column failures: '2.5' is not a whole number",
        ),
        (
            "tr,failures,duration\n1ns,3,1s,9\n",
            "line 2: 4 cells, the header has 3",
        ),
        (
            "tr,failures,duration\n1ns,3,1s\n",
            "every row has tr = 1 ns",
        ),
        (
            "tr,failures,duration\n1ns,3,1s\n1ns,5,2s\n",
            "every row has tr = 1 ns",
        ),
        (
            "tr,failures,duration\n1ns,0,1s\n2ns,0,1s\n",
            "no failures were counted",
        ),
        (
            "tr,failures,duration\n1ns,3,0s\n2ns,1,1s\n",
            "line 2, column duration: must be above zero",
        ),
        (
            "tr;failures;duration\n1ns;3;1s\n2ns;x;1s\n",
            "line 3, column failures: 'x' is not a number",
        ),
    ] {
        let e = fit("counts", data, &set).expect_err(data);
        assert!(e.contains(msg), "{data:?}: {e}");
    }
    // Every problem at once, each with its line.
    let e = fit(
        "counts",
        "tr,failures,duration\nfast,1,1s\n2ns,x,1s\n3ns,2,-1s\n",
        &set,
    )
    .unwrap_err();
    assert!(
        e.contains("line 2, column tr")
            && e.contains("line 3, column failures")
            && e.contains("line 4, column duration"),
        "{e}"
    );
    assert!(fit("comparator", "vin,time\n1mV,10ps\n2mV,8ps\n", &[])
        .unwrap_err()
        .contains("at least three"));
    assert!(fit("delay", "offset,delay\n1ps,50ps\n", &[])
        .unwrap_err()
        .contains("at least five"));
    assert!(fit("weather", "x\n1\n", &[])
        .unwrap_err()
        .contains("kind: 'weather' is not one of: counts, delay, comparator"));
}

fn cli(args: &[&str], stdin: Option<&str>) -> (i32, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    if let Some(text) = stdin {
        use std::io::Write;
        child
            .stdin
            .take()
            .unwrap()
            .write_all(text.as_bytes())
            .unwrap();
    }
    drop(child.stdin.take());
    let out = child.wait_with_output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

#[test]
fn the_command_reads_files_and_standard_input() {
    let path = format!("{}/examples/fit-counts.csv", env!("CARGO_MANIFEST_DIR"));
    let (code, out, err) = cli(
        &[
            "fit", "counts", &path, "--fclk", "1GHz", "--fdata", "50MHz", "--json",
        ],
        None,
    );
    assert_eq!(code, 0, "{err}");
    let v: Value = serde_json::from_str(&out).unwrap();
    for k in COUNTS_ESTIMATES
        .into_iter()
        .chain(["deviance", "deviance_df", "p_value", "rows"])
    {
        assert!(v.get(k).is_some(), "{k}");
    }
    let (code, out, _) = cli(
        &[
            "fit", "counts", &path, "--fclk", "1GHz", "--fdata", "50MHz", "--window", "t0",
            "--json",
        ],
        None,
    );
    assert_eq!(code, 0);
    let t: Value = serde_json::from_str(&out).unwrap();
    assert!(t.get("t0_s").is_some() && t.get("tw_s").is_none());
    let (code, out, err) = cli(
        &["fit", "comparator", "-"],
        Some(&file("fit-comparator.csv")),
    );
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("v0 = vmin / gain") && out.contains("comparator.html?tau="),
        "{out}"
    );
    let (code, _, err) = cli(
        &[
            "fit",
            "counts",
            "/nonexistent/x.csv",
            "--fclk",
            "1G",
            "--fdata",
            "1M",
        ],
        None,
    );
    assert_eq!(code, 2);
    assert!(err.contains("cannot read '/nonexistent/x.csv'"), "{err}");
    let (code, _, err) = cli(
        &["fit", "counts", "-", "--fclk", "1G", "--fdata", "1M"],
        Some("tr,failures,duration\n1ns,x,1s\n2ns,1,0s\n"),
    );
    assert_eq!(code, 2);
    assert!(
        err.contains("latchwise fit: standard input, line 2, column failures")
            && err.contains("latchwise fit: standard input, line 3, column duration"),
        "{err}"
    );
    let (code, out, _) = cli(&["help", "fit"], None);
    assert_eq!(code, 0);
    assert!(out.contains("latchwise fit counts FILE") && out.contains("first-order estimates"));
}

#[test]
fn scattered_sweeps_leave_open_ends_open_instead_of_printing_inf() {
    // Found by fuzzing: three scattered rows once gave a v0 interval from 0 V to inf V and
    // a negative lower end of tau.
    let v = fit(
        "comparator",
        "vin,time\n1uV,100ps\n10uV,820ps\n100uV,65ps\n",
        &[],
    )
    .unwrap();
    assert!(
        v["tau_s_ci_low"].is_null() && v["not_applicable"]["tau_s_ci_low"].is_string(),
        "{v}"
    );
    for k in ["v0_v_ci_low", "v0_v_ci_high"] {
        assert!(
            v.get(k).is_none() && v["not_applicable"][k].is_string(),
            "{k}: {v}"
        );
    }
    let text = serde_json::to_string(&v).unwrap();
    assert!(!text.contains("inf") && !text.contains("NaN"), "{text}");
}

/// A lab table's cells are held to limits as form fields are: durations beyond 1e10 s,
/// counts beyond 1e15, inputs beyond 1 kV and times beyond a second are refused at their
/// line and column, never turned into an infinite tau or a 1e300 "estimate".
#[test]
fn lab_cells_beyond_the_limits_are_refused_at_their_cell() {
    let set = [("fclk", "1GHz"), ("fdata", "100MHz")];
    for (kind, data, msg) in [
        (
            "counts",
            "tr,failures,duration\n100ps,3,1e300\n200ps,1,1s\n",
            "line 2, column duration: '1e300' is too large",
        ),
        (
            "counts",
            "tr,failures,duration\n100ps,1e300,1s\n200ps,1,1s\n",
            "line 2, column failures: '1e300' is too large",
        ),
        (
            "comparator",
            "vin,time\n1e-300,1ns\n1e300,2ns\n1mV,3ns\n",
            "line 2, column vin: '1e-300' is too small",
        ),
        (
            "comparator",
            "vin,time\n1mV,1e200\n2mV,2ns\n3mV,3ns\n",
            "line 2, column time: '1e200' is too large",
        ),
        (
            "delay",
            "offset,delay\n1e30,1ns\n",
            "line 2, column offset: '1e30' is too large",
        ),
    ] {
        let err = fit(kind, data, &set).unwrap_err();
        assert!(err.contains(msg), "{kind}: {err}");
    }
}

/// The fit merges rows of equal tr (so 100,000 rows cost what their distinct tr cost):
/// the demo's rows each split into two (half the duration, the failures shared) and
/// shuffled give the same estimates and intervals, and each row keeps its own expected
/// count; the deviance is the rows' own, so only it and the degrees of freedom change.
#[test]
fn rows_of_equal_tr_fit_as_one() {
    let set = [("fclk", "1GHz"), ("fdata", "50MHz")];
    let whole = fit("counts", &file("fit-counts.csv"), &set).unwrap();
    let mut lines: Vec<String> = Vec::new();
    for l in file("fit-counts.csv")
        .lines()
        .filter(|l| !l.starts_with('#'))
        .skip(1)
    {
        let c: Vec<&str> = l.split(',').collect();
        let k: u64 = c[1].parse().unwrap();
        let d = latchwise::quantity::parse("duration", c[2], latchwise::units::Dim::Time).unwrap();
        lines.push(format!("{},{},{:e}", c[0], k / 2, d / 2.0));
        lines.push(format!("{},{},{:e}", c[0], k - k / 2, d / 2.0));
    }
    lines.reverse();
    lines.swap(1, 4);
    let split = fit(
        "counts",
        &format!("tr,failures,duration\n{}\n", lines.join("\n")),
        &set,
    )
    .unwrap();
    for key in COUNTS_ESTIMATES {
        let (a, b) = (whole[key].as_f64().unwrap(), split[key].as_f64().unwrap());
        assert_rel(key, b, a, FIT_REL);
    }
    assert_eq!(
        split["rows"].as_array().unwrap().len(),
        2 * whole["rows"].as_array().unwrap().len()
    );
}

/// The published shape of a delay sweep, from the model: the local slope of the ln coth
/// law against ln |offset - m| is 2x / sinh(2x) of tau, 0.6 of it at x = 0.91930, where
/// the extra delay is 0.3208 tau (mpmath, tests/fixtures/delay_shape_reference.csv): the
/// log law fitted there sees 60 % of tau.
#[test]
fn the_coth_shape_matches_its_published_figures() {
    use latchwise::characterize::delay::{ln_coth, tail_law};
    let line = &table_rows(include_str!("fixtures/delay_shape_reference.csv"))[0];
    let c: Vec<f64> = line.split(',').map(|v| v.parse().unwrap()).collect();
    let (share, x_want, extra_want) = (c[0], c[1], c[2]);
    // The root of 2x/sinh(2x) = share by bisection (the ratio falls with x).
    let (mut lo, mut hi) = (0.1f64, 3.0f64);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if 2.0 * mid / (2.0 * mid).sinh() > share {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    assert_rel("x", 0.5 * (lo + hi), x_want, 1e-12);
    assert_rel("ln coth x", ln_coth(x_want), extra_want, 1e-13);
    // The model's k = 2 member is ln coth; near 0 it is the log law.
    assert_rel("k = 2", tail_law(x_want, 2.0), extra_want, 1e-12);
    assert_rel("log law", tail_law(1e-6, 2.0), -(1e-6f64.ln()), 1e-5);
}

/// One point far out of a sweep is named by its line, and the whole-sweep fit reports the
/// joint uncertainty of ln tau and ln tw from its curvature.
#[test]
fn an_outlier_in_a_sweep_is_named() {
    let demo = file("fit-delay.csv");
    let v = fit("delay", &demo, &[]).unwrap();
    assert!(v["sd_ln_tau"].as_f64().unwrap() > 0.0);
    let c = v["corr_ln_tau_ln_tw"].as_f64().unwrap();
    assert!(c > -1.0 && c < 1.0, "{c}");
    assert!(!v["warnings"].to_string().contains("far out of the fit"));
    // The 15th data line (a far point) 30 ps late.
    let mut lines: Vec<String> = demo.lines().map(str::to_string).collect();
    let at = lines.iter().position(|l| l.starts_with("offset")).unwrap() + 15;
    let cells: Vec<&str> = lines[at].split(',').collect();
    let late = format!(
        "{},{}ps",
        cells[0],
        cells[1].trim_end_matches("ps").parse::<f64>().unwrap() + 30.0
    );
    lines[at] = late;
    let v = fit("delay", &(lines.join("\n") + "\n"), &[]).unwrap();
    let w = v["warnings"].to_string();
    assert!(
        w.contains(&format!("Line {} stands far out of the fit", at + 1)),
        "{w}"
    );
    // A point on the plateau 16 ps late pulls tcq, and with it every other plateau
    // point's residual beyond 5 robust deviations of the first fit: it alone is named,
    // as is a point near the balance 20 ps late, and one in the transition 10 ps late.
    for (line, from, to) in [
        (18, "1067.640168ps,44.750ps", "1067.640168ps,60.750ps"),
        (9, "3.021750ps,115.875ps", "3.021750ps,135.875ps"),
        (14, "-28.497864ps,45.623ps", "-28.497864ps,55.623ps"),
    ] {
        assert!(demo.contains(from));
        let v = fit("delay", &demo.replace(from, to), &[]).unwrap();
        let far: Vec<String> = v["warnings"]
            .as_array()
            .unwrap()
            .iter()
            .filter_map(|w| {
                w.as_str()
                    .filter(|w| w.contains("far out"))
                    .map(str::to_string)
            })
            .collect();
        assert_eq!(far.len(), 1, "{far:?}");
        assert!(
            far[0].starts_with(&format!("Line {line} stands far out")),
            "{far:?}"
        );
    }
}

/// Counts that fall too little to tell from flat are refused with what they do say (tau
/// bounded only from below), not turned into an estimate of nanoseconds.
#[test]
fn counts_that_barely_fall_are_refused_with_their_bound() {
    let data = "tr,failures,duration\n100ps,50,1s\n200ps,49,1s\n300ps,48,1s\n400ps,47,1s\n";
    let e = fit("counts", data, &[("fclk", "1GHz"), ("fdata", "50MHz")]).unwrap_err();
    assert!(
        e.contains("the counts do not fall significantly as tr grows")
            && e.contains("(tau above 681.5 ps)"),
        "{e}"
    );
}

/// The delay plots draw the fit that was made: the residuals plotted are the whole-sweep
/// fit's own, and the fitted curve passes through the used points within the noise.
#[test]
fn the_delay_plots_show_the_whole_sweep_fit() {
    let raw = RawInputs::from_pairs([
        ("kind", "delay".to_string()),
        ("data", file("fit-delay.csv")),
    ]);
    let case = FitCalculator::read(&raw).unwrap();
    let report = FitCalculator::evaluate(&case);
    let json = serde_json::to_value(&report).unwrap();
    let mut want: Vec<f64> = json["points"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|p| p["used"] == true)
        .map(|p| p["residual_s"].as_f64().unwrap())
        .collect();
    let plots = FitCalculator::plots(&case, &report);
    let res = plots.iter().find(|p| p.id == "plot-residuals").unwrap();
    let mut got: Vec<f64> = res.curves[0].points.iter().map(|p| p.1).collect();
    want.sort_by(f64::total_cmp);
    got.sort_by(f64::total_cmp);
    assert_eq!(got.len(), want.len());
    for (g, w) in got.iter().zip(&want) {
        assert!((g - w).abs() <= 1e-18, "{g:e} against {w:e}");
    }
    // Within a few noise widths (0.15 ps in the demo) everywhere.
    assert!(got.iter().all(|r| r.abs() < 1e-12), "{got:?}");
}

/// Changes of the data whose effect on the fit follows from the law alone: the comparator's
/// inputs ten times larger give v0 ten times larger and the same tau (time = tau ln(v0 /
/// vin)); counts at twice the clock give half the window and the same tau (mu = d fclk
/// fdata w e^(-tr/tau)); a delay sweep's offsets shifted by 50 ps give the same tau, tw and
/// tcq, and its delays 10 ps longer give tcq 10 ps longer and the same tau and tw.
#[test]
fn fits_follow_changes_the_law_predicts() {
    let rows = |name: &str| -> Vec<Vec<String>> {
        file(name)
            .lines()
            .filter(|l| !l.starts_with('#') && !l.is_empty())
            .skip(1)
            .map(|l| l.split(',').map(str::to_string).collect())
            .collect()
    };
    fn si(field: &'static str, s: &str, dim: latchwise::units::Dim) -> f64 {
        latchwise::quantity::parse(field, s, dim).unwrap()
    }
    use latchwise::units::Dim;
    let n = |v: &Value, k: &str| v[k].as_f64().unwrap();

    let base = fit("comparator", &file("fit-comparator.csv"), &[]).unwrap();
    let scaled: String = rows("fit-comparator.csv")
        .iter()
        .fold("vin,time\n".into(), |mut t, r| {
            t.push_str(&format!(
                "{:e},{}\n",
                10.0 * si("vin", &r[0], Dim::Voltage),
                r[1]
            ));
            t
        });
    let v = fit("comparator", &scaled, &[]).unwrap();
    assert_rel("tau, vin x10", n(&v, "tau_s"), n(&base, "tau_s"), 1e-9);
    assert_rel("v0, vin x10", n(&v, "v0_v"), 10.0 * n(&base, "v0_v"), 1e-9);

    let at = |fclk: &str| {
        fit(
            "counts",
            &file("fit-counts.csv"),
            &[("fclk", fclk), ("fdata", "50MHz")],
        )
        .unwrap()
    };
    let (one, two) = (at("1GHz"), at("2GHz"));
    assert_rel("tau, fclk x2", n(&two, "tau_s"), n(&one, "tau_s"), 1e-9);
    for k in ["tw_s", "tw_s_ci_low", "tw_s_ci_high"] {
        assert_rel(k, n(&two, k), 0.5 * n(&one, k), 1e-9);
    }

    let base = fit("delay", &file("fit-delay.csv"), &[]).unwrap();
    let moved = |d_off: f64, d_delay: f64| -> Value {
        let t = rows("fit-delay.csv")
            .iter()
            .fold("offset,delay\n".to_string(), |mut t, r| {
                let o = si("offset", &r[0], Dim::Time) + d_off;
                let d = si("delay", &r[1], Dim::Time) + d_delay;
                t.push_str(&format!("{o:e},{d:e}\n"));
                t
            });
        fit("delay", &t, &[]).unwrap()
    };
    let shifted = moved(50e-12, 0.0);
    for k in ["tau_s", "tw_s", "tcq_s"] {
        assert_rel(
            &format!("{k}, offsets +50 ps"),
            n(&shifted, k),
            n(&base, k),
            1e-6,
        );
    }
    let later = moved(0.0, 10e-12);
    for k in ["tau_s", "tw_s"] {
        assert_rel(
            &format!("{k}, delays +10 ps"),
            n(&later, k),
            n(&base, k),
            1e-6,
        );
    }
    assert_rel(
        "tcq, delays +10 ps",
        n(&later, "tcq_s"),
        n(&base, "tcq_s") + 10e-12,
        1e-6,
    );
}

/// Counts whose fit would need a window beyond any number (10^782 s: 4.8e14 failures in
/// 1 ns at 423 ns, one in 11 days at 434 ns, 741,906 in 1 ns at 39 us) are refused with
/// why, not printed as an infinite tw. (A case found by `scripts/explore`.)
#[test]
fn counts_needing_a_window_beyond_any_number_are_refused() {
    let data = "tr,failures,duration\n3.859344222855318e-5,741906,1e-9\n4.3405204170618586e-7,1,9.536633765894008e5\n4.2299029578442304e-7,482832146502469,1e-9\n";
    let e = fit("counts", data, &[("fclk", "1GHz"), ("fdata", "50MHz")]).unwrap_err();
    assert!(e.contains("a window of 10^782 s, beyond any time"), "{e}");
}

/// A given tcq above the delay the sweep returns to far from the balance point (the
/// demo's plateau is 45 ps) breaks the law (the delay never falls below tcq) and is said
/// to; the demo's own 45 ps is not, nor one 1 ps below it.
#[test]
fn a_given_tcq_above_the_far_delays_is_said_to_be_wrong() {
    let demo = file("fit-delay.csv");
    let said = |tcq: &str| {
        fit("delay", &demo, &[("tcq", tcq)]).unwrap()["warnings"]
            .to_string()
            .contains("is above the delay of the points farthest")
    };
    assert!(said("60ps"));
    assert!(said("47ps"));
    assert!(!said("45ps"));
    assert!(!said("44ps"));
    // Every residual is off with a wrong tcq: the good plateau points are not named.
    let wrong = fit("delay", &demo, &[("tcq", "60ps")]).unwrap()["warnings"].to_string();
    assert!(!wrong.contains("far out of the fit (a residual"), "{wrong}");
    // A bad point with the right tcq is still named.
    let bad = format!("{demo}0.5ns,90ps\n");
    let named = fit("delay", &bad, &[("tcq", "45ps")]).unwrap()["warnings"].to_string();
    assert!(named.contains("far out of the fit (a residual"), "{named}");
}

/// A mistyped count pulls the counts fit, and with it its neighbours' residuals: it alone
/// is named, with what the fit without it expects there (the demo's row at 220 ps counts
/// 50). Clean synthetic counts have a row named 3 times in 400 (at most 20 allowed); a count
/// typed ten times over is named every time.
#[test]
fn a_count_far_out_of_the_fit_is_named_alone() {
    let demo = file("fit-counts.csv");
    let bad = demo.replace("\n220ps,50,10s\n", "\n220ps,500,10s\n");
    assert_ne!(bad, demo);
    let rates = [("fclk", "1GHz"), ("fdata", "50MHz")];
    let w = fit("counts", &bad, &rates).unwrap()["warnings"].to_string();
    assert!(
        w.contains("Line 7 (500 failures, where the fit without it expects 50.9) stands far"),
        "{w}"
    );
    let said = |data: &str| {
        fit("counts", data, &rates).unwrap()["warnings"]
            .to_string()
            .contains("far out of the fit")
    };
    assert!(!said(&demo));
    let mut r = Random::new(20_261_205);
    let (mut flagged, mut caught, n) = (0, 0, 400);
    for k in 0..n {
        let clean = synthetic_counts(&mut r, 18e-12, 22e-12);
        flagged += usize::from(said(&clean));
        // One of the four rows expecting 50 failures or more, ten times over.
        let mut lines: Vec<String> = clean.lines().map(str::to_string).collect();
        let at = 1 + k % 4;
        let cells: Vec<String> = lines[at].split(',').map(str::to_string).collect();
        let tenfold = cells[1].parse::<f64>().unwrap() * 10.0;
        lines[at] = format!("{},{tenfold},{}", cells[0], cells[2]);
        caught += usize::from(said(&(lines.join("\n") + "\n")));
    }
    assert!(flagged <= n / 20, "{flagged} of {n} clean tables flagged");
    assert_eq!(caught, n, "{caught} of {n} tenfold counts named");
}

/// A bad point can pull the whole-sweep fit so far that it hides in the spread it
/// causes: 90 ps at 0.5 ns, where the demo's sweep is back at 45 ps, halves tau and leaves
/// every residual near 15 ps, its own (43 ps) within 5 robust deviations. It is named by
/// its distance from the sweep fitted without it, with tcq given and fitted. Clean
/// synthetic sweeps have a point named by either test 4 times in 200 (at most 10 allowed
/// here); a point 6 ps (40 sigma) off in the tail is named every time.
#[test]
fn a_bad_point_hiding_in_the_spread_it_causes_is_named() {
    use latchwise::characterize::delay::ln_coth;
    let bad = format!("{}0.5ns,90ps\n", file("fit-delay.csv"));
    for given in [&[][..], &[("tcq", "45ps")][..]] {
        let w = fit("delay", &bad, given).unwrap()["warnings"].to_string();
        assert!(
            w.contains("Line 30 stands far out of the fit"),
            "{given:?}: {w}"
        );
    }
    // The fit's own prediction gives back each point's delay from its residual.
    let time =
        |c: &str| latchwise::quantity::parse("delay", c, latchwise::units::Dim::Time).unwrap();
    let (o, d): (Vec<f64>, Vec<f64>) = table_rows(&bad)
        .iter()
        .map(|l| l.split_once(',').unwrap())
        .map(|(a, b)| (time(a), time(b)))
        .unzip();
    let whole = latchwise::characterize::delay::fit_coth(&o, &d, None).unwrap();
    for (i, r) in whole.residuals.as_ref().unwrap().iter().enumerate() {
        let back = whole.predict(o[i]).unwrap() + r;
        assert!(
            (back - d[i]).abs() <= 1e-24 + 1e-15 * d[i],
            "{i}: {back:e} {:e}",
            d[i]
        );
    }
    let mut r = Random::new(20_261_204);
    let (mut flagged, mut caught, n) = (0, 0, 200);
    for k in 0..n {
        let given: &[(&str, &str)] = if k % 2 == 0 { &[] } else { &[("tcq", "45ps")] };
        let clean = sweep(&mut r, 16e-12, 30e-12, ln_coth, 0.15e-12);
        let said = |data: &str| {
            fit("delay", data, given).unwrap()["warnings"]
                .to_string()
                .contains("far out of the fit")
        };
        flagged += usize::from(said(&clean));
        // One of the 12 points 15 ps to 1 ns from the balance point, 6 ps late.
        let mut lines: Vec<String> = clean.lines().map(str::to_string).collect();
        let at = 1 + 6 + (k % 6) + if k % 4 < 2 { 0 } else { 12 };
        let cells: Vec<f64> = lines[at].split(',').map(|c| c.parse().unwrap()).collect();
        lines[at] = format!("{:e},{:e}", cells[0], cells[1] + 6e-12);
        caught += usize::from(said(&(lines.join("\n") + "\n")));
    }
    assert!(flagged <= n / 20, "{flagged} of {n} clean sweeps flagged");
    assert_eq!(caught, n, "{caught} of {n} planted points named");
}

/// The warning about a given tcq quotes the same far-out median as the log-law fit takes
/// tcq from: with an even number of far-out points, the mean of the middle two.
#[test]
fn the_wrong_tcq_warning_quotes_the_median_the_fit_takes_tcq_from() {
    // The demo's 24 points and eight farther out, four at 44 ps and four at 47 ps: the
    // far quarter is those eight, and their median 45.5 ps.
    let mut data = file("fit-delay.csv");
    for k in 2..6 {
        data.push_str(&format!("-{k}ns,44ps\n{k}ns,47ps\n"));
    }
    let log = fit("delay", &data, &[("method", "log")]).unwrap();
    let far = log["tcq_s"].as_f64().unwrap();
    assert!((far - 45.5e-12).abs() < 1e-18, "{far:e}");
    let warned = fit("delay", &data, &[("tcq", "60ps")]).unwrap()["warnings"].to_string();
    let quoted = format!("their median {}", latchwise::units::format_si(far, "s"));
    assert!(warned.contains(&quoted), "{quoted} not in {warned}");
}
