//! The design budget: totals against mpmath, the exact lognormal case of the uncertainty,
//! properties of the roll-up and the fix plan, every bad file, and the command line.

use std::process::Command;

use latchwise::budget::BudgetCalculator;
use latchwise::calculator::Calculator;
use latchwise::params::RawInputs;
use proptest::prelude::*;
use serde_json::Value;

use crate::tolerance::{assert_log10, table_rows, F64_REL};

fn example(name: &str) -> String {
    std::fs::read_to_string(format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

fn budget(design: &str, corners: Option<&str>, pairs: &[(&str, &str)]) -> Result<Value, String> {
    let mut all = vec![("design".to_string(), design.to_string())];
    if let Some(c) = corners {
        all.push(("corners".into(), c.into()));
    }
    all.extend(pairs.iter().map(|(k, v)| (k.to_string(), v.to_string())));
    BudgetCalculator::read(&RawInputs::from_pairs(all))
        .map(|c| serde_json::to_value(BudgetCalculator::evaluate(&c)).unwrap())
        .map_err(|e| e.to_string())
}

fn demo(pairs: &[(&str, &str)]) -> Value {
    budget(
        &example("budget-design.csv"),
        Some(&example("budget-corners.csv")),
        pairs,
    )
    .unwrap()
}

#[test]
fn totals_match_mpmath() {
    // tests/fixtures/budget_reference.csv: the demo chip's totals, mpmath at 50 digits.
    let v = demo(&[]);
    let rows = table_rows(include_str!("fixtures/budget_reference.csv"));
    assert_eq!(rows.len(), 3);
    for line in rows {
        let (corner, want) = line.split_once(',').unwrap();
        let got = v["corners"]
            .as_array()
            .unwrap()
            .iter()
            .find(|c| c["name"] == corner)
            .unwrap()["log10_total_fit"]
            .as_f64()
            .unwrap();
        assert_log10(corner, got, want.parse().unwrap());
    }
    assert_eq!(v["worst_corner"], "low_v_cold");
    // Shares at the worst corner add to one.
    let shares: f64 = v["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["share"].as_f64().unwrap())
        .sum();
    assert!((shares - 1.0).abs() < F64_REL, "{shares}");
}

#[test]
fn tw_uncertainty_alone_gives_the_lognormal_percentiles() {
    // With only ln tw uncertain the total is exactly lognormal (domain notes section 7):
    // median = the nominal total, 95th percentile = total * exp(1.6448536 sigma)
    // (1.6448536269514722 is the normal 95 % point, mpmath).
    let sigma = 0.3;
    let v = demo(&[("tw-sigma", "0.3")]);
    let total = v["log10_total_fit"].as_f64().unwrap();
    assert_log10("p50", v["log10_total_fit_p50"].as_f64().unwrap(), total);
    let p95 = total + 1.644_853_626_951_472_2 * sigma / std::f64::consts::LN_10;
    assert_log10("p95", v["log10_total_fit_p95"].as_f64().unwrap(), p95);
    // tau uncertainty alone: the 95th percentile is the total at tau scaled by exp(1.645 s).
    let t = demo(&[("tau-sigma", "0.05")]);
    let scaled = demo(&[]);
    assert!(
        t["log10_total_fit_p95"].as_f64().unwrap() > scaled["log10_total_fit"].as_f64().unwrap()
    );
}

#[test]
fn the_spread_curve_passes_through_the_reported_percentiles() {
    // Both uncertainties at once: the plotted distribution (a grid of totals) and the
    // reported p50 / p95 (bisection) come from the same integral, so reading the curve
    // at 0.5 and 0.95 gives the reported totals to within the grid spacing.
    let pairs = [("tau-sigma", "0.05"), ("tw-sigma", "0.4")];
    let v = demo(&pairs);
    let mut all = vec![
        ("design".to_string(), example("budget-design.csv")),
        ("corners".to_string(), example("budget-corners.csv")),
    ];
    all.extend(pairs.iter().map(|(k, v)| (k.to_string(), v.to_string())));
    let case = BudgetCalculator::read(&RawInputs::from_pairs(all)).unwrap();
    let plots = BudgetCalculator::plots(&case, &BudgetCalculator::evaluate(&case));
    let spread = plots.iter().find(|p| p.id == "plot-spread").unwrap();
    let pts: Vec<(f64, f64)> = spread.curves[0]
        .points
        .iter()
        .map(|(x, p)| (x.log10(), *p))
        .collect();
    let step = pts[1].0 - pts[0].0;
    for (p, key) in [(0.5, "log10_total_fit_p50"), (0.95, "log10_total_fit_p95")] {
        let i = pts.iter().position(|q| q.1 >= p).unwrap();
        let (a, b) = (pts[i - 1], pts[i]);
        let x = a.0 + (b.0 - a.0) * (p - a.1) / (b.1 - a.1);
        let want = v[key].as_f64().unwrap();
        assert!((x - want).abs() < step, "{key}: curve {x}, reported {want}");
    }
    assert!(pts.windows(2).all(|w| w[1].1 >= w[0].1 - 1e-12));
}

#[test]
fn shares_hold_at_totals_of_1e27_decades() {
    // Found by fuzzing: at a total of 10^(-4.3e27) FIT one rounding step of the log is
    // 5e11 decades, and a share taken as 10^(row - total) came out infinite. (Within the
    // field limits: the smallest tau, 1e-21 s, and the slowest clock reach it.)
    let corners = "corner,tau,tw,tsu,tcq\nc,1e-21,1e6,0,0\n";
    let one = budget(
        "name,fclk,fdata,stages\nx,1e-4,1e18,1000\n",
        Some(corners),
        &[],
    )
    .unwrap();
    assert!(one["log10_total_fit"].as_f64().unwrap() < -1e27);
    assert_eq!(one["rows"][0]["share"].as_f64(), Some(1.0));
    assert_eq!(one["worst_offenders"], "x (100 %)");
    let two = budget(
        "name,fclk,fdata,stages\nx,1e-4,1e18,1000\ny,1e-4,1e18,1000\n",
        Some(corners),
        &[("tau-sigma", "2"), ("tw-sigma", "5")],
    )
    .unwrap();
    for row in two["rows"].as_array().unwrap() {
        assert_eq!(row["share"].as_f64(), Some(0.5));
    }
}

#[test]
fn the_fix_plan_meets_the_budget_at_every_corner() {
    let v = demo(&[("budget-fit", "10")]);
    assert_eq!(v["meets_budget"], Value::Bool(false));
    assert!(v["log10_total_fit_after_fix"].as_f64().unwrap() <= 1.0);
    let fix = v["fix"].as_array().unwrap();
    assert!(!fix.is_empty());
    // Apply the plan to the design and evaluate again: every corner within the budget.
    let mut design = example("budget-design.csv");
    let header: Vec<String> = design
        .lines()
        .find(|l| l.starts_with("name,"))
        .unwrap()
        .split(',')
        .map(str::to_string)
        .collect();
    let at = header.iter().position(|c| c == "stages").unwrap();
    for f in fix {
        let name = f["name"].as_str().unwrap();
        let stages = f["stages"].as_u64().unwrap();
        design = design
            .lines()
            .map(|l| {
                let mut cells: Vec<String> = l.split(',').map(str::to_string).collect();
                if cells[0] == name {
                    cells[at] = stages.to_string();
                }
                cells.join(",") + "\n"
            })
            .collect();
    }
    let after = budget(
        &design,
        Some(&example("budget-corners.csv")),
        &[("budget-fit", "10")],
    )
    .unwrap();
    assert_eq!(
        after["meets_budget"],
        Value::Bool(true),
        "{}",
        after["corners"]
    );
    // A row given by tr that alone exceeds the budget: no plan, and the reason.
    let stuck = budget(
        "name,fclk,fdata,tr\nhot,1GHz,100MHz,0\n",
        None,
        &[("tau", "20ps"), ("tw", "40ps"), ("budget-fit", "1")],
    )
    .unwrap();
    assert!(
        stuck["fix"].is_null() && stuck["not_applicable"]["fix"].is_string(),
        "{stuck}"
    );
}

fn design_of(rows: &[(f64, f64, u32, u32)]) -> String {
    let mut s = String::from("name,fclk,fdata,stages,count\n");
    for (i, (fclk, fdata, stages, count)) in rows.iter().enumerate() {
        s.push_str(&format!("r{i},{fclk:e},{fdata:e},{stages},{count}\n"));
    }
    s
}

proptest! {
    #![proptest_config(crate::seeded::config(60))]

    #[test]
    fn totals_and_fixes_behave(
        rows in proptest::collection::vec((1e8..2e9f64, 1e3..1e8f64, 1u32..4, 1u32..40), 1..12),
        extra in (1e8..2e9f64, 1e3..1e8f64, 1u32..4, 1u32..40),
        log_budget in -6.0..3.0f64,
    ) {
        let corner = [("tau", "20ps"), ("tw", "30ps"), ("tsu", "30ps"), ("tcq", "40ps")];
        let base = budget(&design_of(&rows), None, &corner).unwrap();
        let total = base["log10_total_fit"].as_f64().unwrap();
        // Adding a crossing never lowers the total.
        let mut more = rows.clone();
        more.push(extra);
        let bigger = budget(&design_of(&more), None, &corner).unwrap();
        prop_assert!(bigger["log10_total_fit"].as_f64().unwrap() >= total - crate::tolerance::ROUNDING_LOG10_ABS);
        // One more stage never raises a row's FIT.
        let mut deeper = rows.clone();
        deeper[0].2 += 1;
        let d = budget(&design_of(&deeper), None, &corner).unwrap();
        prop_assert!(d["rows"][0]["log10_fit"].as_f64().unwrap() <= base["rows"][0]["log10_fit"].as_f64().unwrap());
        // The fix plan always meets the budget.
        let b = format!("{:e}", 10f64.powf(log_budget));
        let mut with_budget = corner.to_vec();
        with_budget.push(("budget-fit", &b));
        let f = budget(&design_of(&rows), None, &with_budget).unwrap();
        prop_assert!(f["log10_total_fit_after_fix"].as_f64().unwrap() <= log_budget + crate::tolerance::ROUNDING_LOG10_ABS);
    }
}

#[test]
fn the_fix_plan_meets_a_budget_26_decades_down() {
    // Found by the property test below: the plan's running totals, reduced step by step
    // from 1e21 FIT, kept 1e5 FIT of rounding and stopped at 10^-5.10 against 10^-5.13.
    let rows = [
        (1_373_654_145.642_575_7, 1000.0, 1, 14),
        (1_000_054_635.421_173_5, 95_776_855.839_486_12, 1, 5),
        (1_575_673_686.348_993_3, 6_747_994.305_775_905, 1, 23),
        (1_313_723_693.863_472, 61_271_728.688_700_646, 1, 13),
        (1_603_190_315.997_861_9, 91_958_360.065_256_37, 1, 27),
        (1_916_746_105.488_429_3, 1000.0, 3, 5),
        (1_084_294_369.424_622_5, 1000.0, 1, 10),
        (1_967_226_652.986_329_3, 65_477_787.726_006_67, 1, 4),
        (1_152_497_403.946_340_8, 53_519_945.356_415_16, 1, 19),
    ];
    let budget_fit = -5.128_096_203_749_367;
    let b = format!("{:e}", 10f64.powf(budget_fit));
    let corner = [
        ("tau", "20ps"),
        ("tw", "30ps"),
        ("tsu", "30ps"),
        ("tcq", "40ps"),
    ];
    let mut pairs = corner.to_vec();
    pairs.push(("budget-fit", &b));
    let f = budget(&design_of(&rows), None, &pairs).unwrap();
    assert!(f["log10_total_fit"].as_f64().unwrap() > 20.0);
    let after = f["log10_total_fit_after_fix"].as_f64().unwrap();
    assert!(after <= budget_fit, "{after}");
}

#[test]
fn every_bad_file_gets_its_message() {
    let corner = [
        ("tau", "20ps"),
        ("tw", "30ps"),
        ("tsu", "30ps"),
        ("tcq", "40ps"),
    ];
    for (design, msg) in [
        ("", "design: a value is required"),
        ("# nothing\n", "design, line 1: the table is empty"),
        (
            "name,fclk,stages\na,1GHz,2\n",
            "design, line 2, column fdata: a value is required",
        ),
        (
            "name,fclk,fdata,stages,colour\na,1GHz,1MHz,2,red\n",
            "design, line 1, column colour: unknown column",
        ),
        (
            "name,fclk,fdata,stages\na,1GHz,fast,2\n",
            "design, line 2, column fdata: 'fast' is not a number",
        ),
        (
            "name,fclk,fdata,stages,count\na,1GHz,1MHz,2,-4\n",
            "design, line 2, column count: '-4' is negative",
        ),
        (
            "name,fclk,fdata\na,1GHz,1MHz\n",
            "design, line 2, column stages: a value is required",
        ),
        (
            "name,fclk,fdata,stages\na,20GHz,1MHz,2\n",
            "design, line 2, column fclk: clock period 50 ps is not longer than tsu + tcq = 70 ps",
        ),
    ] {
        let e = budget(design, None, &corner).expect_err(design);
        assert!(e.contains(msg), "{design:?}: {e}");
    }
    let design = "name,fclk,fdata,stages\na,1GHz,1MHz,2\n";
    for (corners, msg) in [
        (
            "corner,tau,tw,tsu,tcq\nslow,20ps,30ps,30ps,40ps\nslow,25ps,30ps,30ps,40ps\n",
            "corners, line 3, column corner: 'slow' is named twice",
        ),
        (
            "corner,tau,tsu\nslow,20ps,30ps\n",
            "corners, line 2: the corner needs tw or t0",
        ),
        (
            "",
            "column tau: a value is required, in the row or the corner",
        ),
    ] {
        match budget(design, Some(corners), &[]) {
            Err(e) => assert!(e.contains(msg), "{corners:?}: {e}"),
            Ok(v) => panic!("{corners:?} accepted: {v}"),
        }
    }
}

#[test]
fn the_command_reads_the_design_and_corners_files() {
    let root = env!("CARGO_MANIFEST_DIR");
    let run = |extra: &[&str]| {
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args([
                "budget",
                &format!("{root}/examples/budget-design.csv"),
                "--corners",
                &format!("{root}/examples/budget-corners.csv"),
            ])
            .args(extra)
            .output()
            .unwrap();
        (
            out.status.code().unwrap_or(-1),
            String::from_utf8_lossy(&out.stdout).into_owned(),
            String::from_utf8_lossy(&out.stderr).into_owned(),
        )
    };
    let (code, out, err) = run(&[
        "--json",
        "--budget-fit",
        "10",
        "--tau-sigma",
        "0.05",
        "--devices",
        "1e6",
        "--service-years",
        "10",
    ]);
    assert_eq!(code, 1, "{err}");
    let v: Value = serde_json::from_str(&out).unwrap();
    for k in [
        "log10_total_fit",
        "worst_corner",
        "corners",
        "rows",
        "budget_fit",
        "meets_budget",
        "margin_decades",
        "fix",
        "log10_total_fit_after_fix",
        "log10_total_fit_p50",
        "log10_total_fit_p95",
        "log10_expected_failures",
        "log10_p_any_failure",
    ] {
        assert!(v.get(k).is_some(), "{k}");
    }
    let (code, out, _) = run(&["--budget-fit", "1e9"]);
    assert_eq!(code, 0);
    let first = out
        .lines()
        .skip_while(|l| *l != "Results")
        .nth(1)
        .unwrap_or("");
    assert!(
        first.trim_start().starts_with("budget"),
        "the verdict comes first among the results:\n{out}"
    );
    let (code, _, err) = run(&["--budget-fit", "-1"]);
    assert_eq!(code, 2);
    assert!(err.contains("budget-fit"), "{err}");
}

proptest! {
    #![proptest_config(crate::seeded::config(60))]

    /// The spread sums rows merged by exponent: at any tau scale it must equal the sum
    /// over every row taken one by one. Clocks and depths drawn from a few values, as in
    /// a design, so that many rows merge.
    #[test]
    fn merged_terms_sum_as_the_rows_do(
        rows in proptest::collection::vec((0usize..3, 1e3..1e8f64, 1u32..4, 1u32..40), 1..40),
        scale in 0.3..3.0f64,
    ) {
        let clocks = [1.2e9, 4e8, 1.25e8];
        let rows: Vec<(f64, f64, u32, u32)> =
            rows.iter().map(|&(c, fd, s, n)| (clocks[c], fd, s, n)).collect();
        let raw = RawInputs::from_pairs([
            ("design", design_of(&rows)),
            ("corners", example("budget-corners.csv")),
        ]);
        let case = BudgetCalculator::read(&raw).unwrap();
        let r = &case.rollup;
        let one_by_one = latchwise::budget::rollup::Rollup::worst(&r.totals(&r.stages, scale)).1;
        let merged = r.log10_worst_at(scale);
        prop_assert!((merged - one_by_one).abs() <= 1e-12 * one_by_one.abs().max(1.0),
            "merged {merged} one by one {one_by_one}");
    }
}

proptest! {
    #![proptest_config(crate::seeded::config(200))]

    /// The page's table editor writes a row with `table::join` and reads it with
    /// `table::split`: every row of cells comes back cell for cell, and stays one data
    /// row of the table (never a comment or a blank line), at every delimiter. The cells
    /// are drawn to hold what once broke this: `#` after a blank first cell (a tab and
    /// `#` read as a comment), quotes, delimiters, a byte-order mark, control characters.
    #[test]
    fn a_row_written_by_the_table_editor_reads_back(
        cells in proptest::collection::vec(
            "([ -~]|#|\"|,|;|\t|\u{feff}|\u{1}|\u{7f}|µ){0,10}", 1..6),
        d in 0usize..3,
    ) {
        use latchwise::table::{join, layout, split};
        let delim = [',', ';', '\t'][d];
        let cells: Vec<String> = cells.iter().map(|c| c.trim().to_string()).collect();
        let line = join(&cells, delim);
        prop_assert_eq!(split(&line, delim), cells.clone());
        let header = vec!["h".to_string(); cells.len()];
        let text = format!("{}\n{line}\n{line}\n", join(&header, delim));
        let l = layout(&text);
        prop_assert_eq!(l.rows, vec![1, 2]);
        prop_assert_eq!(l.delimiter, if cells.len() > 1 { delim } else { ',' });
    }
}

/// The row that once vanished: a blank first cell and `#N/A` in the second, tab-separated
/// (a spreadsheet's paste), is a row, not a comment; so is one indented before `#`. A
/// comment is a line whose first character is `#`.
#[test]
fn a_hash_after_the_first_character_is_a_row() {
    use latchwise::table::{join, layout, split};
    let row = vec![String::new(), "#N/A".to_string(), "16".to_string()];
    let line = join(&row, '\t');
    assert_eq!(line, "\t#N/A\t16");
    let text = format!("name\tfclk\tcount\n# a comment\n{line}\n  # indented\n");
    let l = layout(&text);
    assert_eq!(l.rows, vec![2, 3]);
    assert_eq!(split(&line, '\t'), row);
    // In a design it is refused at its line, as the same file with commas is.
    for d in ['\t', ','] {
        let design = format!("name{d}fclk{d}fdata{d}stages{d}count\n{d}#N/A{d}10MHz{d}2{d}16\n");
        let raw = RawInputs::from_pairs([
            ("design", design),
            ("corners", example("budget-corners.csv")),
        ]);
        let e = BudgetCalculator::read(&raw).unwrap_err();
        assert!(
            e.to_string()
                .contains("design, line 2, column fclk: '#N/A' is not a number"),
            "{d:?}: {e}"
        );
    }
}

/// The figures beside the page's table rows are the report's: each row's FIT and share
/// at the worst corner in file order, the fix plan's new depth on the rows it changes,
/// and each corner's total.
#[test]
fn the_table_figures_are_the_reports() {
    let raw = RawInputs::from_pairs([
        ("design", example("budget-design.csv")),
        ("corners", example("budget-corners.csv")),
        ("budget-fit", "10".to_string()),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    let figures = BudgetCalculator::figures(&case, &report);
    let design = &figures[0];
    assert_eq!(design.field, "design");
    let col = |k: &str| design.columns.iter().find(|c| c.key == k).unwrap();
    let shares: f64 = col("share").values.iter().map(|v| v.unwrap()).sum();
    assert!((shares - 1.0).abs() < 1e-12);
    for (row, v) in report.rows.iter().zip(&col("log10_fit").values) {
        assert_eq!(Some(row.log10_fit), *v);
    }
    let fix = report.fix.clone().flatten().unwrap();
    assert!(!fix.is_empty());
    let changed: Vec<(String, u32)> = report
        .rows
        .iter()
        .zip(&col("fix").values)
        .filter_map(|(r, v)| v.map(|s| (r.name.clone(), s as u32)))
        .collect();
    let planned: Vec<(String, u32)> = fix.iter().map(|f| (f.name.clone(), f.stages)).collect();
    assert_eq!(changed, planned);
    let corners = &figures[1];
    assert_eq!(corners.field, "corners");
    let totals: Vec<Option<f64>> = report
        .corners
        .iter()
        .map(|c| Some(c.log10_total_fit))
        .collect();
    assert_eq!(corners.columns[0].values, totals);
}

proptest! {
    #![proptest_config(crate::seeded::config(100))]

    /// The page reads its design again on every edit, remembering the lines it read:
    /// every read of a sequence of edits (a changed cell, a new row, a deleted row, a
    /// bad cell, a row of the wrong width, a changed header) gives what a fresh read gives.
    #[test]
    fn remembered_rows_read_as_fresh_ones(
        edits in proptest::collection::vec((0usize..6, 0usize..12, "[0-9]{1,3}(kHz|MHz|GHz|)"), 1..12),
    ) {
        use latchwise::table::{read, remember_rows, Column};
        use latchwise::units::Dim;
        let cols = [
            Column::any("name", Dim::Text),
            Column::any("fclk", Dim::Frequency).positive(),
            Column::any("count", Dim::Count).positive().optional(),
        ];
        let mut lines: Vec<String> = vec!["name,fclk,count".into()];
        for i in 0..10 {
            lines.push(format!("r{i},1GHz,{}", i + 1));
        }
        for (kind, at, value) in edits {
            let at = 1 + at % (lines.len() - 1).max(1);
            match kind {
                0 => lines[at] = format!("r{at},{value},2"),
                1 => lines.insert(at, format!("new,{value},")),
                2 if lines.len() > 2 => {
                    lines.remove(at);
                }
                3 => lines[at] = format!("bad,{value}x,1"),
                4 => lines[at] = "short,1GHz".into(),
                _ => lines[0] = if lines[0].contains("count") { "name,fclk".into() } else { "name,fclk,count".into() },
            }
            let text = lines.join("\n");
            remember_rows(true);
            let remembered = read(&text, &cols);
            remember_rows(false);
            let fresh = read(&text, &cols);
            prop_assert_eq!(remembered, fresh);
        }
    }
}

/// The verdict at the 95th percentile: the demo's worst total is 7.07e6 FIT nominally and
/// 8.04e7 at the 95th percentile. With sigmas the 95th percentile decides (signoff p95, the
/// default): a budget of 1e7 is missed, though the nominal total meets it; signoff=nominal
/// decides by the nominal total instead; 1e8 is met by both.
#[test]
fn the_verdict_at_the_95th_percentile() {
    let sig = [("tau-sigma", "0.05"), ("tw-sigma", "0.3")];
    for (budget, signoff, met, nominal, p95) in [
        ("1e7", None, false, true, false),
        ("1e7", Some("nominal"), true, true, false),
        ("1e7", Some("p95"), false, true, false),
        ("1e8", None, true, true, true),
    ] {
        let mut pairs = vec![("budget-fit", budget)];
        pairs.extend(sig);
        pairs.extend(signoff.map(|s| ("signoff", s)));
        let v = demo(&pairs);
        let what = format!("{budget} {signoff:?}");
        assert_eq!(v["signoff"], signoff.unwrap_or("p95"), "{what}");
        assert_eq!(v["meets_budget"], met, "{what}");
        assert_eq!(v["meets_budget_nominal"], nominal, "{what}");
        assert_eq!(v["meets_budget_p95"], p95, "{what}");
        let b: f64 = budget.parse::<f64>().unwrap().log10();
        let decided = if signoff == Some("nominal") {
            v["log10_total_fit"].as_f64().unwrap()
        } else {
            v["log10_total_fit_p95"].as_f64().unwrap()
        };
        assert_eq!(v["margin_decades"].as_f64().unwrap(), b - decided, "{what}");
        let warnings = v["warnings"].to_string();
        assert_eq!(
            warnings.contains("95th percentile"),
            nominal && !p95,
            "{what}: {warnings}"
        );
    }
    // Without sigmas the nominal total decides, and p95 cannot be asked for.
    let v = demo(&[("budget-fit", "1e7")]);
    assert_eq!(v["signoff"], "nominal");
    assert!(v.get("meets_budget_p95").is_none());
    let e = budget(
        &example("budget-design.csv"),
        Some(&example("budget-corners.csv")),
        &[("budget-fit", "1e7"), ("signoff", "p95")],
    )
    .unwrap_err();
    assert!(
        e.contains("signoff: p95 needs the uncertainty: give tau-sigma or tw-sigma"),
        "{e}"
    );
    let e = budget(
        &example("budget-design.csv"),
        Some(&example("budget-corners.csv")),
        &[("signoff", "p99")],
    )
    .unwrap_err();
    assert!(
        e.contains("signoff: 'p99' is not one of: p95, nominal"),
        "{e}"
    );
}

/// A CI gate on the exit status follows the signed-off statistic: met nominally but
/// missed at the 95th percentile exits 1 and says so; `--signoff nominal` exits 0.
#[test]
fn the_exit_status_follows_the_signoff() {
    let root = env!("CARGO_MANIFEST_DIR");
    let run = |extra: &[&str]| {
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args([
                "budget",
                &format!("{root}/examples/budget-design.csv"),
                "--corners",
                &format!("{root}/examples/budget-corners.csv"),
                "--budget-fit",
                "1e7",
                "--tau-sigma",
                "0.05",
                "--tw-sigma",
                "0.3",
            ])
            .args(extra)
            .output()
            .unwrap();
        (
            out.status.code(),
            String::from_utf8_lossy(&out.stdout).to_string(),
        )
    };
    let (code, text) = run(&[]);
    assert_eq!(code, Some(1), "{text}");
    assert!(text.contains("missed at the 95th percentile by"), "{text}");
    assert!(
        text.contains("the 95th percentile, which decides, is not"),
        "{text}"
    );
    let (code, text) = run(&["--signoff", "nominal"]);
    assert_eq!(code, Some(0), "{text}");
    assert!(text.contains("budget") && text.contains("met by"), "{text}");
}

/// The fix plan meets the budget at the 95th percentile, checked by an independent
/// quadrature: ln total = ln T(tau scaled by e^(s_tau z)) + s_tw w for standard normal z
/// and w, so P(log10 total <= x) = integral of phi(z) Phi((x - log10 T(z)) ln 10 / s_tw) dz,
/// with T(z) the nominal worst total (itself checked against mpmath) of corners whose tau
/// is scaled; Simpson's rule on z from -8 to 8 (800 steps: 1600 change it by 2e-11
/// decades), the 95 % point by bisection; agreement to 1e-9 relative in FIT.
#[test]
fn the_fix_plan_meets_the_budget_at_the_95th_percentile() {
    let design = "name,fclk,fdata,stages,count\na,1GHz,100MHz,2,8\nb,400MHz,20MHz,2,32\nc,1GHz,300MHz,2,1\nd,125MHz,1MHz,2,16\n";
    let corners = |scale: f64| {
        format!(
            "corner,tau,tw,tsu,tcq\nslow,{:e},30ps,40ps,70ps\nfast,{:e},20ps,25ps,40ps\n",
            24e-12 * scale,
            12e-12 * scale
        )
    };
    let (ts, ws) = (0.08, 0.4);
    let v = budget(
        design,
        Some(&corners(1.0)),
        &[
            ("budget-fit", "1e-3"),
            ("tau-sigma", "0.08"),
            ("tw-sigma", "0.4"),
        ],
    )
    .unwrap();
    let fix = v["fix"].as_array().unwrap();
    assert!(!fix.is_empty());
    // The design with the plan's stages, at nominal, then its 95th percentile by hand.
    let mut fixed = String::from("name,fclk,fdata,stages,count\n");
    for line in design.lines().skip(1) {
        let c: Vec<&str> = line.split(',').collect();
        let st = fix
            .iter()
            .find(|f| f["name"] == c[0])
            .map_or(c[3].to_string(), |f| f["stages"].to_string());
        fixed.push_str(&format!("{},{},{},{st},{}\n", c[0], c[1], c[2], c[4]));
    }
    let log10_t = |z: f64| {
        budget(&fixed, Some(&corners((ts * z).exp())), &[]).unwrap()["log10_total_fit"]
            .as_f64()
            .unwrap()
    };
    let n = 800;
    let h = 16.0 / n as f64;
    let zs: Vec<f64> = (0..=n).map(|i| -8.0 + h * i as f64).collect();
    let ts_at: Vec<f64> = zs.iter().map(|&z| log10_t(z)).collect();
    let phi = |z: f64| (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
    let big_phi = |x: f64| 0.5 * erfc(-x / std::f64::consts::SQRT_2);
    let cdf = |x: f64| {
        (0..=n)
            .map(|i| {
                let w = if i == 0 || i == n {
                    1.0
                } else if i % 2 == 1 {
                    4.0
                } else {
                    2.0
                };
                w * phi(zs[i]) * big_phi((x - ts_at[i]) * std::f64::consts::LN_10 / ws)
            })
            .sum::<f64>()
            * h
            / 3.0
    };
    let (mut lo, mut hi) = (-30.0, 30.0);
    for _ in 0..100 {
        let mid = 0.5 * (lo + hi);
        if cdf(mid) < 0.95 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    let p95 = v["log10_total_fit_p95_after_fix"].as_f64().unwrap();
    // 1e-9 relative in FIT: 1e-9 / ln 10 decades.
    assert!(
        (p95 - lo).abs() < 1e-9 / std::f64::consts::LN_10,
        "reported {p95}, quadrature {lo}"
    );
    assert!(
        lo <= -3.0 + 1e-9,
        "the plan's 95th percentile {lo} is above the budget"
    );
    // A plan to the nominal total never adds more (stages come whole, so the two plans
    // may coincide when one stage more buys decades).
    let nominal = budget(
        design,
        Some(&corners(1.0)),
        &[
            ("budget-fit", "1e-3"),
            ("tau-sigma", "0.08"),
            ("tw-sigma", "0.4"),
            ("signoff", "nominal"),
        ],
    )
    .unwrap();
    assert!(nominal["added_flip_flops"].as_f64() <= v["added_flip_flops"].as_f64());
}

/// erfc by its continued fraction and series (A&S 7.1.6 and 7.1.14), for the test's own
/// quadrature: independent of the library's.
fn erfc(x: f64) -> f64 {
    if x < 0.0 {
        return 2.0 - erfc(-x);
    }
    if x < 2.0 {
        let (mut term, mut sum, mut n) = (x, x, 0.0);
        while term.abs() > 1e-17 * sum.abs() {
            n += 1.0;
            term *= 2.0 * x * x / (2.0 * n + 1.0);
            sum += term;
        }
        return 1.0 - 2.0 / std::f64::consts::PI.sqrt() * (-x * x).exp() * sum;
    }
    let mut f = x;
    for k in (1..200).rev() {
        f = x + (k as f64 / 2.0) / f;
    }
    (-x * x).exp() / (std::f64::consts::PI.sqrt() * f)
}

/// Each change of the fix plan says what it adds: its count times the stages added, as
/// the rows' own counts and stages give it; together they are the plan's total.
#[test]
fn each_change_of_the_fix_plan_counts_its_flip_flops() {
    let v = demo(&[("budget-fit", "10")]);
    let rows = v["rows"].as_array().unwrap();
    let mut sum = 0.0;
    for f in v["fix"].as_array().unwrap() {
        let row = rows.iter().find(|r| r["name"] == f["name"]).unwrap();
        let want = row["count"].as_f64().unwrap()
            * row["width"].as_f64().unwrap()
            * (f["stages"].as_f64().unwrap() - row["stages"].as_f64().unwrap());
        assert_eq!(f["added_flip_flops"].as_f64().unwrap(), want, "{f}");
        sum += want;
    }
    assert_eq!(v["added_flip_flops"].as_f64().unwrap(), sum);
    assert_eq!(sum, 72.0); // the README's demo figure (the Gray write pointer is 5 wide)
}

/// The command reads a design in every encoding the page reads: UTF-8 with a byte-order
/// mark, UTF-16 of both byte orders (a spreadsheet's "Unicode text"), and CR, CR LF or
/// LF line ends, each giving the same JSON as the plain file; bytes that are not text
/// are refused with where they are.
#[test]
fn the_command_reads_every_encoding_the_page_reads() {
    let dir = std::env::temp_dir().join(format!("latchwise-enc-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let corners = format!("{}/examples/budget-corners.csv", env!("CARGO_MANIFEST_DIR"));
    let plain = example("budget-design.csv");
    let run = |bytes: &[u8]| {
        let file = dir.join("design.csv");
        std::fs::write(&file, bytes).unwrap();
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args([
                "budget",
                file.to_str().unwrap(),
                "--corners",
                &corners,
                "--json",
            ])
            .output()
            .unwrap();
        (
            out.status.code(),
            String::from_utf8_lossy(&out.stdout).to_string(),
            String::from_utf8_lossy(&out.stderr).to_string(),
        )
    };
    let want = run(plain.as_bytes());
    assert_eq!(want.0, Some(0), "{}", want.2);
    let utf16 = |big: bool| {
        let mut b: Vec<u8> = if big {
            vec![0xfe, 0xff]
        } else {
            vec![0xff, 0xfe]
        };
        for u in plain.encode_utf16() {
            b.extend(if big {
                u.to_be_bytes()
            } else {
                u.to_le_bytes()
            });
        }
        b
    };
    let cases: Vec<(&str, Vec<u8>)> = vec![
        (
            "BOM",
            [b"\xef\xbb\xbf".as_slice(), plain.as_bytes()].concat(),
        ),
        ("CR LF", plain.replace('\n', "\r\n").into_bytes()),
        ("CR", plain.replace('\n', "\r").into_bytes()),
        ("UTF-16LE", utf16(false)),
        ("UTF-16BE", utf16(true)),
    ];
    for (what, bytes) in cases {
        let got = run(&bytes);
        assert_eq!(got.0, Some(0), "{what}: {}", got.2);
        let strip = |s: &str| {
            let mut v: Value = serde_json::from_str(s).unwrap();
            v.as_object_mut().unwrap().remove("inputs");
            // The digest of the bytes differs with the encoding, as it should.
            v.as_object_mut().unwrap().remove("input_sha256");
            v
        };
        assert_eq!(strip(&got.1), strip(&want.1), "{what}");
    }
    let bad = run(b"name,fclk\n\xff\xfe\xfd");
    assert_eq!(bad.0, Some(2));
    assert!(
        bad.2.contains("not UTF-8 or UTF-16 text (byte 11)"),
        "{}",
        bad.2
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// Design and corner cells are held to the synchronizer's field limits, named by line
/// and column: `hot,1e300,1e300,1` once printed "missed by inf decades". A value pasted by
/// mistake is echoed cut short, and a table of 100,000 bad rows lists 60 problems and
/// counts the rest.
#[test]
fn table_cells_are_held_to_the_field_limits() {
    let corners = example("budget-corners.csv");
    let e = budget(
        "name,fclk,fdata,stages,count\nhot,1e300,1e300,1,1\n",
        Some(&corners),
        &[],
    )
    .unwrap_err();
    assert!(e.contains("design, line 2, column fclk: '1e300' is too large: the largest the model can use is 1e18 Hz"), "{e}");
    assert!(
        e.contains("line 2, column fdata: '1e300' is too large"),
        "{e}"
    );
    let e = budget(
        "name,fclk,fdata,stages,count\nx,1GHz,1MHz,2,1e12\n",
        Some(&corners),
        &[],
    )
    .unwrap_err();
    assert!(e.contains("column count: '1e12' is too large"), "{e}");
    let e = budget(
        "name,fclk,fdata,stages\nx,1GHz,1MHz,2\n",
        Some("corner,tau,tw,tsu,tcq\nhot,20ps,1e300,30ps,40ps\n"),
        &[],
    )
    .unwrap_err();
    assert!(
        e.contains("corners, line 2, column tw: '1e300' is too large"),
        "{e}"
    );
    let long = "9".repeat(100_000);
    let e = budget(
        &format!("name,fclk,fdata,stages\nx,{long}x,1MHz,2\n"),
        Some(&corners),
        &[],
    )
    .unwrap_err();
    assert!(e.len() < 400, "{} characters", e.len());
    assert!(e.contains("… (100001 characters)"), "{e}");
    let mut many = String::from("name,fclk,fdata,stages\n");
    for i in 0..100_000 {
        many.push_str(&format!("r{i},1GHz,1MHz,2.5\n"));
    }
    let e = budget(&many, Some(&corners), &[]).unwrap_err();
    assert_eq!(e.lines().count(), 61, "{}", &e[..500]);
    assert!(
        e.ends_with("and 99940 more problems (the first 60 are listed)"),
        "{}",
        &e[e.len() - 200..]
    );
}

/// Every crossing has a name of its own: a repeated name is refused with both lines (the
/// fix plan once printed "a to 3 stages, a to 3 stages").
#[test]
fn a_repeated_crossing_name_is_refused_with_both_lines() {
    let e = budget(
        "name,fclk,fdata,stages\na,1GHz,1MHz,2\nb,1GHz,1MHz,2\n# note\na,1GHz,1MHz,3\n",
        Some(&example("budget-corners.csv")),
        &[],
    )
    .unwrap_err();
    assert!(
        e.contains("design, line 5, column name: 'a' names line 2 already"),
        "{e}"
    );
}

/// The audit stamp of the command's JSON: the version, and a SHA-256 of the inputs as
/// written (each file's bytes in place of its path): equal for the same inputs, from
/// another path too, and different when one byte of a file or one option changes.
#[test]
fn the_json_carries_the_version_and_the_inputs_digest() {
    let dir = std::env::temp_dir().join(format!("latchwise-stamp-{}", std::process::id()));
    std::fs::create_dir_all(dir.join("copy")).unwrap();
    let design = example("budget-design.csv");
    let corners = format!("{}/examples/budget-corners.csv", env!("CARGO_MANIFEST_DIR"));
    let stamp = |file: &std::path::Path, text: &str, extra: &[&str]| {
        std::fs::write(file, text).unwrap();
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args([
                "budget",
                file.to_str().unwrap(),
                "--corners",
                &corners,
                "--budget-fit",
                "10",
                "--json",
            ])
            .args(extra)
            .output()
            .unwrap();
        let v: Value = serde_json::from_slice(&out.stdout).unwrap();
        assert_eq!(v["version"], env!("CARGO_PKG_VERSION"));
        v["input_sha256"].as_str().unwrap().to_string()
    };
    let a = stamp(&dir.join("d.csv"), &design, &[]);
    assert_eq!(a.len(), 64);
    assert!(a.bytes().all(|b| b.is_ascii_hexdigit()));
    assert_eq!(stamp(&dir.join("d.csv"), &design, &[]), a, "a second run");
    assert_eq!(
        stamp(&dir.join("copy/other.csv"), &design, &[]),
        a,
        "the same bytes elsewhere"
    );
    let one_byte = design.replacen("2MHz", "3MHz", 1);
    assert_ne!(
        stamp(&dir.join("d.csv"), &one_byte, &[]),
        a,
        "one byte changed"
    );
    assert_ne!(
        stamp(&dir.join("d.csv"), &design, &["--tau-sigma", "0.05"]),
        a,
        "an option added"
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// `--results` writes every crossing at every corner: against the JSON (the worst
/// corner's rows, the fix plan's stages and flip-flops), and each corner's rows summed
/// against the mpmath totals of `tests/fixtures/budget_reference.csv`.
#[test]
fn the_results_csv_has_every_crossing_at_every_corner() {
    let root = env!("CARGO_MANIFEST_DIR");
    let file = std::env::temp_dir().join(format!("latchwise-results-{}.csv", std::process::id()));
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args([
            "budget",
            &format!("{root}/examples/budget-design.csv"),
            "--corners",
            &format!("{root}/examples/budget-corners.csv"),
            "--budget-fit",
            "10",
            "--json",
            "--results",
        ])
        .arg(&file)
        .output()
        .unwrap();
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    let csv = std::fs::read_to_string(&file).unwrap();
    std::fs::remove_file(&file).ok();
    let mut lines = csv.lines();
    assert_eq!(
        lines.next(),
        Some("name,\"note\",corner,log10_fit,fit,share,stages,stages_after_fix,flip_flops_added")
    );
    // The demo's note column (second) aside, the columns as the header names them.
    let rows: Vec<Vec<String>> = lines
        .map(|l| {
            let mut r = latchwise::table::split(l, ',');
            r.remove(1);
            r
        })
        .collect();
    let json_rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 3 * json_rows.len());
    let worst = v["worst_corner"].as_str().unwrap();
    let fix = v["fix"].as_array().unwrap();
    for row in rows.iter().filter(|r| r[1] == worst) {
        let j = json_rows.iter().find(|j| j["name"] == row[0]).unwrap();
        // The same f64, though serde_json's default float reading may land one unit in
        // the last place off.
        let (a, b) = (
            row[2].parse::<f64>().unwrap(),
            j["log10_fit"].as_f64().unwrap(),
        );
        assert!(
            (a - b).abs() <= F64_REL * b.abs().max(1.0),
            "{row:?}: {a} against {b}"
        );
        // The CSV's share is 10^(row - corner total), the JSON's the row over the sum of
        // rows relative to the largest: two f64 forms of one quantity.
        let (a, b) = (row[4].parse::<f64>().unwrap(), j["share"].as_f64().unwrap());
        assert!(
            (a - b).abs() <= F64_REL * b.max(1e-300),
            "{row:?}: {a} against {b}"
        );
        let planned = fix.iter().find(|f| f["name"] == row[0]);
        let after: u32 = row[6].parse().unwrap();
        assert_eq!(
            after,
            planned.map_or(
                j["stages"].as_u64().unwrap() as u32,
                |f| f["stages"].as_u64().unwrap() as u32
            )
        );
        let added: f64 = row[7].parse().unwrap();
        assert_eq!(
            added,
            planned.map_or(0.0, |f| f["added_flip_flops"].as_f64().unwrap())
        );
        // fit is 10^log10_fit to ten digits.
        let (fit, log) = (
            row[3].parse::<f64>().unwrap(),
            row[2].parse::<f64>().unwrap(),
        );
        assert!((fit.log10() - log).abs() < 1e-9, "{row:?}");
    }
    for line in table_rows(include_str!("fixtures/budget_reference.csv")) {
        let (corner, want) = line.split_once(',').unwrap();
        let logs: Vec<f64> = rows
            .iter()
            .filter(|r| r[1] == corner)
            .map(|r| r[2].parse().unwrap())
            .collect();
        let top = logs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let sum = top
            + logs
                .iter()
                .map(|l| 10f64.powf(l - top))
                .sum::<f64>()
                .log10();
        assert_log10(corner, sum, want.parse().unwrap());
        let shares: f64 = rows
            .iter()
            .filter(|r| r[1] == corner)
            .map(|r| r[4].parse::<f64>().unwrap())
            .sum();
        assert!(
            (shares - 1.0).abs() < 1e-12,
            "{corner}: shares add to {shares}"
        );
    }
}

/// A mission profile: corners with `hours` (shares of service time summing to 1) weight
/// the fleet figures, against a hand computation; every hour at the worst corner stands
/// beside them; shares that do not sum to 1 are refused with their sum.
#[test]
fn the_fleet_follows_the_mission_profile() {
    let design = example("budget-design.csv");
    let corners = "corner,tau,tw,tsu,tcq,tau@fastsync,hours\ntypical,12ps,20ps,25ps,40ps,11ps,0.7\nslow_hot,18ps,26ps,35ps,60ps,16ps,0.29\nlow_v_cold,24ps,30ps,40ps,70ps,21ps,0.01\n";
    let v = budget(
        &design,
        Some(corners),
        &[("devices", "1e6"), ("service-years", "10")],
    )
    .unwrap();
    // By hand: rate = sum of hours times each corner's FIT / 3.6e12 per second.
    let totals: Vec<f64> = v["corners"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["log10_total_fit"].as_f64().unwrap())
        .collect();
    let fit: f64 = [0.7, 0.29, 0.01]
        .iter()
        .zip(&totals)
        .map(|(h, t)| h * 10f64.powf(*t))
        .sum();
    let seconds = 1e6 * 10.0 * 365.25 * 86400.0;
    let expected = fit / 3.6e12 * seconds;
    assert_log10(
        "weighted",
        v["log10_expected_failures"].as_f64().unwrap(),
        expected.log10(),
    );
    let p_any = -(-expected).exp_m1();
    assert!((10f64.powf(v["log10_p_any_failure"].as_f64().unwrap()) - p_any).abs() < 1e-12);
    let worst = 10f64.powf(totals[2]) / 3.6e12 * seconds;
    assert_log10(
        "worst",
        v["log10_expected_failures_worst"].as_f64().unwrap(),
        worst.log10(),
    );
    // The same corners without hours: every hour at the worst corner, nothing beside it.
    let plain = budget(
        &design,
        Some(&example("budget-corners.csv")),
        &[("devices", "1e6"), ("service-years", "10")],
    )
    .unwrap();
    assert_eq!(
        plain["log10_expected_failures"],
        v["log10_expected_failures_worst"]
    );
    assert!(plain.get("log10_expected_failures_worst").is_none());
    // Shares that do not sum to 1, and a corner without its share.
    let e = budget(&design, Some(&corners.replace("0.01", "0.02")), &[]).unwrap_err();
    assert!(
        e.contains("corners, column hours: the shares of service time sum to 1.01, not 1"),
        "{e}"
    );
    let e = budget(&design, Some(&corners.replace(",0.29\n", ",\n")), &[]).unwrap_err();
    assert!(
        e.contains("line 3, column hours: give every corner its share"),
        "{e}"
    );
    // With sigmas the fleet at the 95th percentile of the worst total is given too.
    let s = budget(
        &design,
        Some(corners),
        &[
            ("devices", "1e6"),
            ("service-years", "10"),
            ("tau-sigma", "0.05"),
            ("tw-sigma", "0.3"),
        ],
    )
    .unwrap();
    let p95 = 10f64.powf(s["log10_total_fit_p95"].as_f64().unwrap()) / 3.6e12 * seconds;
    assert_log10(
        "p95",
        s["log10_expected_failures_p95"].as_f64().unwrap(),
        p95.log10(),
    );
}

/// The text report lists the largest 20 crossings at the worst corner with their FIT,
/// share and stages now and after the fix, and counts the rest; `--all-rows` lists all.
#[test]
fn the_text_report_lists_the_largest_crossings() {
    let root = env!("CARGO_MANIFEST_DIR");
    let run = |extra: &[&str]| {
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args([
                "budget",
                &format!("{root}/examples/budget-design.csv"),
                "--corners",
                &format!("{root}/examples/budget-corners.csv"),
                "--budget-fit",
                "10",
            ])
            .args(extra)
            .output()
            .unwrap();
        String::from_utf8_lossy(&out.stdout).to_string()
    };
    let text = run(&[]);
    let table: Vec<&str> = text
        .lines()
        .skip_while(|l| *l != "Largest crossings at low_v_cold")
        .skip(1)
        .take_while(|l| !l.is_empty())
        .collect();
    assert!(
        table[0]
            .split_whitespace()
            .eq(["crossing", "FIT", "share", "stages", "after", "the", "fix", "notes"]),
        "{text}"
    );
    assert!(
        table[1].split_whitespace().take(6).eq([
            "fabric_dma_ack",
            "4.222e6",
            "59.7",
            "%",
            "2",
            "3"
        ]),
        "{text}"
    );
    assert_eq!(table.len(), 1 + 20 + 1, "{text}");
    assert!(
        table[21].contains("and 4 more (--all-rows lists every one"),
        "{text}"
    );
    let all = run(&["--all-rows"]);
    let rows = all
        .lines()
        .skip_while(|l| *l != "Largest crossings at low_v_cold")
        .skip(2)
        .take_while(|l| !l.is_empty())
        .count();
    assert_eq!(rows, 24, "{all}");
    assert!(!all.contains("more (--all-rows"));
}

/// Notes travel: a design's `note` and `note:WORD` columns are kept per row and written
/// back in the JSON (`rows[].notes`), the results CSV and the text report; any other
/// column of the user's own is still refused, with the known names and how to carry it.
#[test]
fn notes_travel_with_their_rows() {
    let corners = example("budget-corners.csv");
    let design = "name,fclk,fdata,stages,note:owner,note\nirq,1.2GHz,2MHz,2,ana,\"waived, see CDC-12\"\ndbg,1.2GHz,100kHz,2,,\n";
    let v = budget(design, Some(&corners), &[]).unwrap();
    assert_eq!(
        v["rows"][0]["notes"],
        serde_json::json!({"note:owner": "ana", "note": "waived, see CDC-12"})
    );
    assert!(
        v["rows"][1].get("notes").is_none(),
        "blank notes are left out: {}",
        v["rows"][1]
    );
    let raw = RawInputs::from_pairs([("design", design.to_string()), ("corners", corners.clone())]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    let csv = BudgetCalculator::results_csv(&case, &report).unwrap();
    let mut lines = csv.lines();
    assert_eq!(lines.next(), Some("name,\"note:owner\",\"note\",corner,log10_fit,fit,share,stages,stages_after_fix,flip_flops_added"));
    assert!(
        lines
            .next()
            .unwrap()
            .starts_with("\"irq\",\"ana\",\"waived, see CDC-12\",\"typical\","),
        "{csv}"
    );
    let table = BudgetCalculator::text_table(&report, None).unwrap();
    assert_eq!(table.header.last().map(String::as_str), Some("notes"));
    assert!(
        table
            .rows
            .iter()
            .any(|r| r[5] == "note: waived, see CDC-12; note:owner: ana"),
        "{:?}",
        table.rows
    );
    let e = budget(
        "name,fclk,fdata,stages,owner\nirq,1.2GHz,2MHz,2,ana\n",
        Some(&corners),
        &[],
    )
    .unwrap_err();
    assert!(
        e.contains("column owner: unknown column (known: name, count, width"),
        "{e}"
    );
    assert!(e.contains("name it note or note:WORD"), "{e}");
}

/// Count and width: `count` instances of `width` flip-flops per stage. A stage on a 5-bit
/// Gray pointer costs 5 flip-flops, so where a pointer and a 1-bit crossing fail alike
/// the plan deepens the bit first, and counts the pointer's flip-flops by its width;
/// `max_stages` caps a row, and a plan that only capped rows could finish says which.
#[test]
fn the_fix_plan_counts_width_and_respects_max_stages() {
    let corners = "corner,tau,tw,tsu,tcq\nslow,24ps,30ps,40ps,70ps\n";
    // Two crossings of equal FIT; the budget needs one of them fixed.
    let design =
        "name,fclk,fdata,stages,count,width\nptr,1.2GHz,50MHz,2,1,5\nbit,1.2GHz,50MHz,2,1,\n";
    let v = budget(design, Some(corners), &[("budget-fit", "8e5")]).unwrap();
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows[0]["width"], 5.0);
    assert_eq!(rows[0]["flip_flops"], 10.0);
    assert_eq!(rows[1]["flip_flops"], 2.0);
    let fix = v["fix"].as_array().unwrap();
    assert_eq!(fix.len(), 1, "{fix:?}");
    assert_eq!(fix[0]["name"], "bit");
    assert_eq!(v["added_flip_flops"], 1.0);
    // A budget that needs both: the pointer's stage counts five flip-flops.
    let v = budget(design, Some(corners), &[("budget-fit", "1")]).unwrap();
    assert_eq!(v["added_flip_flops"], 6.0, "{}", v["fix"]);
    // The pointer capped at 2 stages: no plan, and the reason names it.
    let capped = design
        .replace("count,width\n", "count,width,max_stages\n")
        .replace(",1,5\n", ",1,5,2\n")
        .replace(",1,\n", ",1,,\n");
    let v = budget(&capped, Some(corners), &[("budget-fit", "1")]).unwrap();
    assert!(v["fix"].is_null());
    assert!(
        v["not_applicable"]["fix"]
            .as_str()
            .unwrap()
            .contains("or at their max_stages (ptr)"),
        "{}",
        v["not_applicable"]
    );
    let e = budget(&capped.replace(",1,5,2\n", ",1,5,1\n"), Some(corners), &[]).unwrap_err();
    assert!(
        e.contains("column max_stages: 1 is below the row's stages, 2"),
        "{e}"
    );
}

/// The command names each problem by the file as the user gave it (a table from a link by
/// its field, "design table"), with the line and the column.
#[test]
fn problems_are_named_by_the_file_given() {
    let dir = std::env::temp_dir().join(format!("latchwise-named-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("chip.csv");
    std::fs::write(&file, "name,fclk,fdata,stages\nhot,1e300,1MHz,2\n").unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args([
            "budget",
            file.to_str().unwrap(),
            "--tau",
            "20ps",
            "--tw",
            "40ps",
            "--tsu",
            "30ps",
            "--tcq",
            "50ps",
        ])
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(
        err.contains(&format!(
            "latchwise budget: {}, line 2, column fclk: '1e300' is too large",
            file.display()
        )),
        "{err}"
    );
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args([
            "budget",
            "--from-url",
            "?design=name,fclk,fdata,stages%0Ahot,1e300,1MHz,2&tau=20ps&tw=40ps&tsu=30ps&tcq=50ps",
        ])
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("latchwise budget: design table, line 2, column fclk"),
        "{err}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// The demo's 95th percentiles against mpmath (tests/fixtures/budget_spread_reference.csv,
/// scripts/gen_reference.py): as designed, and with the README's fix plan for 10 FIT,
/// which the report's plan is; both to 1e-9 relative in FIT, the plan within the budget.
#[test]
fn the_demo_percentiles_and_plan_match_mpmath() {
    let v = demo(&[
        ("budget-fit", "10"),
        ("tau-sigma", "0.05"),
        ("tw-sigma", "0.3"),
    ]);
    let want: std::collections::HashMap<String, f64> =
        table_rows(include_str!("fixtures/budget_spread_reference.csv"))
            .iter()
            .map(|l| {
                let (k, x) = l.split_once(',').unwrap();
                (k.to_string(), x.parse().unwrap())
            })
            .collect();
    let tol = 1e-9 / std::f64::consts::LN_10;
    let p95 = v["log10_total_fit_p95"].as_f64().unwrap();
    assert!(
        (p95 - want["as_designed"]).abs() < tol,
        "{p95} against {}",
        want["as_designed"]
    );
    let mut planned: Vec<&str> = v["fix"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f["name"].as_str().unwrap())
        .collect();
    planned.sort_unstable();
    let mut readme = vec![
        "core_irq_sync",
        "core_dbg_req",
        "core_fifo_wptr",
        "core_cfg_bus",
        "core_pwr_ack",
        "fabric_dma_ack",
        "periph_timer_evt",
    ];
    readme.sort_unstable();
    assert_eq!(planned, readme);
    let after = v["log10_total_fit_p95_after_fix"].as_f64().unwrap();
    assert!(
        (after - want["fix_plan_10_fit"]).abs() < tol,
        "{after} against {}",
        want["fix_plan_10_fit"]
    );
    assert!(after < 1.0);
}
