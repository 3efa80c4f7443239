//! A design row is a synchronizer case: every row of every kind, at every corner, against
//! `latchwise sync` given the same inputs (a property test), and against the mpmath table
//! of `scripts/gen_reference.py` (`tests/fixtures/budget_rows_reference.csv`).

use latchwise::budget::BudgetCalculator;
use latchwise::calculator::Calculator;
use latchwise::params::RawInputs;
use latchwise::synchronizer::SyncCalculator;
use proptest::prelude::*;
use serde_json::Value;

use crate::tolerance::{assert_log10, table_rows};

fn budget(design: &str, corners: &str) -> Result<Value, String> {
    let raw = RawInputs::from_pairs([("design", design), ("corners", corners)]);
    BudgetCalculator::read(&raw)
        .map(|c| serde_json::to_value(BudgetCalculator::evaluate(&c)).unwrap())
        .map_err(|e| e.to_string())
}

/// Each row's log10 FIT at each corner, by row name and corner name.
fn row_fits(v: &Value) -> Vec<(String, String, f64)> {
    v["rows"]
        .as_array()
        .unwrap()
        .iter()
        .flat_map(|r| {
            r["corners"].as_array().unwrap().iter().map(move |c| {
                (
                    r["name"].as_str().unwrap().to_string(),
                    c["name"].as_str().unwrap().to_string(),
                    c["log10_fit"].as_f64().unwrap(),
                )
            })
        })
        .collect()
}

#[test]
fn every_row_at_every_corner_matches_mpmath() {
    // tests/fixtures/budget_rows_reference.csv: mpmath at 50 digits, from the models
    // written out in scripts/gen_reference.py (kinds, classes, domains, unequal hops, the
    // master-slave bound, related clocks).
    let root = env!("CARGO_MANIFEST_DIR");
    let files = [
        (
            "budget-design.csv",
            "examples/budget-design.csv",
            "examples/budget-corners.csv",
        ),
        (
            "budget_models_design.csv",
            "tests/fixtures/budget_models_design.csv",
            "tests/fixtures/budget_models_corners.csv",
        ),
    ];
    let table = table_rows(include_str!("fixtures/budget_rows_reference.csv"));
    let mut checked = 0;
    for (key, design, corners) in files {
        let read = |p: &str| std::fs::read_to_string(format!("{root}/{p}")).unwrap();
        let v = budget(&read(design), &read(corners)).unwrap();
        let got = row_fits(&v);
        for line in table.iter().filter(|l| l.starts_with(&format!("{key},"))) {
            let f: Vec<&str> = line.split(',').collect();
            let (row, corner, want) = (f[1], f[2], f[3].parse::<f64>().unwrap());
            let (_, _, g) = got
                .iter()
                .find(|(r, c, _)| r == row && c == corner)
                .unwrap_or_else(|| panic!("{row} at {corner} not in the report"));
            assert_log10(&format!("{key} {row} at {corner}"), *g, want);
            checked += 1;
        }
        assert_eq!(
            got.len(),
            table
                .iter()
                .filter(|l| l.starts_with(&format!("{key},")))
                .count(),
            "{key}: every row at every corner is in the table"
        );
    }
    assert_eq!(checked, 24 * 3 + 12 * 2);
}

/// The corners of the property test: plain values, a class `fast`, domains `a`, `b`
/// (sampling clocks) and `io` (a launch clock).
const CORNERS: [[&str; 10]; 2] = [
    [
        "typ", "12ps", "20ps", "25ps", "40ps", "9ps", "15ps", "1.2GHz", "400MHz", "50MHz",
    ],
    [
        "slow", "20ps", "28ps", "35ps", "60ps", "14ps", "22ps", "1GHz", "350MHz", "40MHz",
    ],
];
const CORNER_HEAD: &str = "corner,tau,tw,tsu,tcq,tau@fast,tw@fast,fclk@a,fclk@b,flaunch@io";

/// A random design row: (its cells by column name).
fn a_row() -> impl Strategy<Value = Vec<(&'static str, String)>> {
    (
        0..4usize,                                               // kind
        prop::option::of((1u32..6, 1u32..6, 1u32..40, 0u32..9)), // related: P, Q, jitter ps, phase tenths
        0..5usize,                   // latch: corner, own tau, per hop, master-slave, bound
        prop::option::of(0..3usize), // class / domain choices
        1u32..5,                     // stages
        prop::bool::weighted(0.15),  // tr given
        1u32..64,                    // count
        prop::bool::ANY,             // own t0 window
    )
        .prop_map(|(kind, related, latch, place, stages, tr, count, t0)| {
            let mut c: Vec<(&'static str, String)> = Vec::new();
            match place {
                Some(0) => c.push(("domain", "a".into())),
                Some(1) => {
                    c.push(("domain", "b".into()));
                    c.push(("cell", "fast".into()));
                }
                _ => c.push(("fclk", "800MHz".into())),
            }
            match kind {
                0 => c.push(("fdata", "20MHz".into())),
                1 => {
                    c.push(("crossing", "signal".into()));
                    c.push(("activity", "0.3".into()));
                    c.push((
                        "launch_domain",
                        if count % 2 == 0 { "io" } else { "b" }.into(),
                    ));
                }
                2 => {
                    c.push(("crossing", "gray".into()));
                    c.push(("increments", "150MHz".into()));
                    c.push(("width", "5".into()));
                }
                _ => {
                    c.push(("crossing", "handshake".into()));
                    c.push(("transfers", "3MHz".into()));
                }
            }
            if let Some((p, q, jitter, phase)) = related {
                c.push(("ratio", format!("{p}/{q}")));
                c.push(("jitter", format!("{jitter}ps")));
                if phase > 0 {
                    // A tenth of a picosecond at most nine tenths: within any spacing here.
                    c.push(("phase", format!("{}ps", f64::from(phase) / 10.0)));
                }
            }
            let stages = if latch >= 2 { stages.max(2) } else { stages };
            match latch {
                1 => c.push(("tau", "17ps".into())),
                2 => c.push((
                    "tau",
                    (0..stages - 1)
                        .map(|k| format!("{}ps", 10 + 3 * k))
                        .collect::<Vec<_>>()
                        .join(","),
                )),
                3 | 4 => {
                    c.push(("tau-master", "20ps".into()));
                    c.push(("tau-slave", "30ps".into()));
                    c.push(("duty", "0.4".into()));
                    if latch == 4 {
                        c.push(("tw2", "35ps".into()));
                    }
                }
                _ => {}
            }
            if t0 && latch != 4 {
                c.push(("t0", "150ps".into()));
            }
            if tr && latch != 2 {
                c.push(("tr", "700ps".into()));
            } else {
                c.push(("stages", stages.to_string()));
            }
            c.push(("count", count.to_string()));
            c
        })
}

/// The synchronizer's inputs for `row` at corner `k`, as the budget's rule states them:
/// the row's own cells; what it lacks from its class's corner columns, then the corner's
/// plain ones; its clock from its domain's column; a signal's launch clock from its
/// launch domain's.
fn sync_inputs(row: &[(&'static str, String)], k: usize) -> Vec<(String, String)> {
    let corner = &CORNERS[k];
    let get = |n: &str| row.iter().find(|(c, _)| *c == n).map(|(_, v)| v.clone());
    let design_only = ["count", "width", "cell", "domain", "launch_domain"];
    let mut v: Vec<(String, String)> = row
        .iter()
        .filter(|(c, _)| !design_only.contains(c))
        .map(|(c, t)| (c.to_string(), t.clone()))
        .collect();
    let fast = get("cell").is_some();
    if get("tau").is_none() && get("tau-master").is_none() {
        v.push((
            "tau".into(),
            (if fast { corner[5] } else { corner[1] }).into(),
        ));
    }
    let t0 = get("t0").is_some();
    if !t0 {
        v.push((
            "tw".into(),
            (if fast { corner[6] } else { corner[2] }).into(),
        ));
    }
    let chain = get("tr").is_none() && get("tw2").is_none();
    if chain {
        v.push(("tsu".into(), corner[3].into()));
        if !t0 {
            v.push(("tcq".into(), corner[4].into()));
        }
    }
    match get("domain").as_deref() {
        Some("a") => v.push(("fclk".into(), corner[7].into())),
        Some("b") => v.push(("fclk".into(), corner[8].into())),
        _ => {}
    }
    match get("launch_domain").as_deref() {
        Some("io") => v.push(("flaunch".into(), corner[9].into())),
        Some("b") => v.push(("flaunch".into(), corner[8].into())),
        _ => {}
    }
    v
}

fn csv_of(rows: &[Vec<(&'static str, String)>]) -> String {
    let mut cols: Vec<&str> = vec!["name"];
    for r in rows {
        for (c, _) in r {
            if !cols.contains(c) {
                cols.push(c);
            }
        }
    }
    let mut out = cols.join(",") + "\n";
    for (i, r) in rows.iter().enumerate() {
        let cells: Vec<String> = cols
            .iter()
            .map(|c| match *c {
                "name" => format!("r{i}"),
                c => r
                    .iter()
                    .find(|(k, _)| *k == c)
                    .map_or(String::new(), |(_, v)| format!("\"{v}\"")),
            })
            .collect();
        out += &(cells.join(",") + "\n");
    }
    out
}

proptest! {
    #![proptest_config(crate::seeded::config(48))]

    /// Each row at each corner equals `latchwise sync` for the same inputs, times its
    /// count, to 1e-12 relative in FIT.
    #[test]
    fn a_row_at_a_corner_is_what_sync_gives(rows in prop::collection::vec(a_row(), 1..8)) {
        let corners = format!(
            "{CORNER_HEAD}\n{}\n{}\n",
            CORNERS[0].join(","),
            CORNERS[1].join(",")
        );
        let design = csv_of(&rows);
        let v = budget(&design, &corners).map_err(|e| TestCaseError::fail(format!("{design}\n{e}")))?;
        let got = row_fits(&v);
        for (i, row) in rows.iter().enumerate() {
            for (k, corner) in CORNERS.iter().enumerate() {
                let raw = RawInputs::from_pairs(sync_inputs(row, k));
                let case = SyncCalculator::read(&raw)
                    .map_err(|e| TestCaseError::fail(format!("{raw:?}: {e}")))?;
                let sync = serde_json::to_value(SyncCalculator::evaluate(&case)).unwrap();
                let count: f64 = row.iter().find(|(c, _)| *c == "count").unwrap().1.parse().unwrap();
                let want = sync["log10_fit"].as_f64().unwrap() + count.log10();
                let (_, _, g) = got
                    .iter()
                    .find(|(r, c, _)| *r == format!("r{i}") && c == corner[0])
                    .unwrap();
                // 1e-12 relative in FIT is 4.3e-13 in log10, at any magnitude.
                prop_assert!(
                    (g - want).abs() <= 4.3e-13,
                    "r{} at {}: budget {} sync {} ({:?})\n{}",
                    i, corner[0], g, want, raw, design
                );
            }
        }
    }
}

/// A greedy fix plan written out plainly: at the worst corner, one stage on the row that
/// removes the most FIT per added flip-flop (count x width), rows at their max_stages left
/// alone, until every corner is within the budget. Rows are plain (fclk, fdata at the
/// corners' tau, tw, tsu, tcq).
fn greedy(
    rows: &[(f64, f64, u32, f64, f64, u32)],
    corners: &[(f64, f64, f64, f64)],
    budget: f64,
) -> Option<Vec<u32>> {
    let fit = |r: &(f64, f64, u32, f64, f64, u32), c: &(f64, f64, f64, f64), s: u32| {
        let (fclk, fdata, _, count, _, _) = *r;
        let (tau, tw, tsu, tcq) = *c;
        let hop = 1.0 / fclk - tsu - tcq;
        count * fdata * fclk * tw * (-(f64::from(s) - 1.0) * hop / tau).exp() * 3.6e12
    };
    // What one added stage costs: count x width flip-flops.
    let cost = |r: &(f64, f64, u32, f64, f64, u32)| r.3 * r.4;
    let mut stages: Vec<u32> = rows.iter().map(|r| r.2).collect();
    for _ in 0..10_000 {
        let totals: Vec<f64> = corners
            .iter()
            .map(|c| rows.iter().zip(&stages).map(|(r, s)| fit(r, c, *s)).sum())
            .collect();
        let (k, worst) = totals
            .iter()
            .copied()
            .enumerate()
            .fold((0, f64::MIN), |b, (k, t)| if t > b.1 { (k, t) } else { b });
        if worst <= budget * (1.0 + 1e-12) {
            return Some(stages);
        }
        let best = (0..rows.len())
            .filter(|&i| stages[i] < rows[i].5)
            .map(|i| {
                let c = &corners[k];
                let gain = (fit(&rows[i], c, stages[i]) - fit(&rows[i], c, stages[i] + 1))
                    / cost(&rows[i]);
                (i, gain)
            })
            .fold(None, |b: Option<(usize, f64)>, x| match b {
                Some(b) if b.1 >= x.1 => Some(b),
                _ => Some(x),
            })?;
        stages[best.0] += 1;
    }
    None
}

proptest! {
    #![proptest_config(crate::seeded::config(48))]

    /// The budget's fix plan is the plain greedy plan: the same stages, the same
    /// flip-flops counted by width, and no row past its max_stages.
    #[test]
    fn the_fix_plan_is_the_greedy_plan_counting_width(
        rows in prop::collection::vec(
            (
                // Fast clocks: a stage removes one to three decades, so which row
                // is deepened first (the cheapest per flip-flop) matters.
                prop::sample::select(vec![6e9, 5e9, 4e9, 3e9]),
                10f64..200.0,  // fdata, MHz
                2u32..4,       // stages
                1u32..40,      // count
                1u32..9,       // width
                0u32..7,       // room above the stages
            ),
            1..6,
        ),
        down in 0.3f64..5.0,
    ) {
        let rows: Vec<(f64, f64, u32, f64, f64, u32)> = rows
            .iter()
            .map(|&(fclk, fdata, s, n, w, room)| (fclk, fdata * 1e6, s, f64::from(n), f64::from(w), s + room))
            .collect();
        let corners = [(12e-12, 20e-12, 25e-12, 40e-12), (24e-12, 30e-12, 40e-12, 70e-12)];
        let corners_csv = "corner,tau,tw,tsu,tcq\ntyp,12ps,20ps,25ps,40ps\nslow,24ps,30ps,40ps,70ps\n";
        let mut design = String::from("name,fclk,fdata,stages,count,width,max_stages\n");
        for (i, r) in rows.iter().enumerate() {
            design += &format!("r{i},{:e},{:e},{},{},{},{}\n", r.0, r.1, r.2, r.3, r.4, r.5);
        }
        let v = budget(&design, corners_csv).unwrap();
        let total = 10f64.powf(v["log10_total_fit"].as_f64().unwrap());
        let fit_budget = total * 10f64.powf(-down);
        let raw = RawInputs::from_pairs([
            ("design", design.clone()),
            ("corners", corners_csv.to_string()),
            ("budget-fit", format!("{fit_budget:e}")),
        ]);
        let case = BudgetCalculator::read(&raw).unwrap();
        let v = serde_json::to_value(BudgetCalculator::evaluate(&case)).unwrap();
        let want = greedy(&rows, &corners, fit_budget);
        match (&want, v["fix"].as_array()) {
            (None, None) => {}
            (Some(stages), Some(fix)) => {
                let mut got: Vec<u32> = rows.iter().map(|r| r.2).collect();
                for f in fix {
                    let i: usize = f["name"].as_str().unwrap()[1..].parse().unwrap();
                    got[i] = f["stages"].as_u64().unwrap() as u32;
                }
                prop_assert_eq!(&got, stages, "{}", design);
                let added: f64 = rows
                    .iter()
                    .zip(stages)
                    .map(|(r, s)| r.3 * r.4 * f64::from(s - r.2))
                    .sum();
                prop_assert_eq!(v["added_flip_flops"].as_f64().unwrap(), added);
                for (r, s) in rows.iter().zip(stages) {
                    prop_assert!(*s <= r.5);
                }
            }
            _ => prop_assert!(false, "plan {:?} against greedy {:?}\n{}", v["fix"], want, design),
        }
    }
}

/// Classes and domains: bad corner columns and rows whose clock nothing gives are refused
/// naming the table, line and column; a class without columns of its own and a corner
/// column that no row uses are said once; a row's own inputs its case does not use are
/// named per row.
#[test]
fn classes_and_domains_refuse_what_they_cannot_resolve() {
    let corners = "corner,tau,tw,tsu,tcq,tau@fast,fclk@core,t0@fast,tw@fast\n\
                   typ,12ps,20ps,25ps,40ps,fast,1e300,10ps,12ps\n";
    let design = "name,fclk,fdata,stages\na,1GHz,1MHz,2\n";
    let e = budget(design, corners).unwrap_err();
    for want in [
        "corners, line 2, column tau@fast: 'fast' is not a number",
        "corners, line 2, column fclk@core: '1e300' is too large",
        "corners, line 2, columns tw@fast, t0@fast: give tw or t0, not both",
    ] {
        assert!(e.contains(want), "{want}: {e}");
    }
    let e = budget(
        design,
        "corner,tau,tw,tsu,tcq,tau#fast\ntyp,12ps,20ps,25ps,40ps,3ps\n",
    )
    .unwrap_err();
    assert!(e.contains("column tau#fast: unknown column"), "{e}");
    assert!(e.contains("per clock domain fclk@DOMAIN"), "{e}");
    let corners = "corner,tau,tw,tsu,tcq,tau@fast,fclk@core\n\
                   typ,12ps,20ps,25ps,40ps,8ps,1.1GHz\n\
                   slow,20ps,30ps,35ps,60ps,14ps,\n";
    let design = "name,fclk,fdata,stages,domain,crossing,activity,launch_domain\n\
                  a,,1MHz,2,nowhere,,,\n\
                  b,,1MHz,2,core,,,\n\
                  c,1GHz,,2,,signal,0.2,ghost\n\
                  d,1GHz,,2,,signal,0.2,\n";
    let e = budget(design, corners).unwrap_err();
    for want in [
        "design, line 2, column domain: no corner gives fclk@nowhere, and the row gives no fclk",
        "design, line 3, column domain: corner slow leaves fclk@core blank, and the row gives no fclk",
        "design, line 4, column launch_domain: no corner gives flaunch@ghost or fclk@ghost",
        "design, line 5, column flaunch: a value is required",
    ] {
        assert!(e.contains(want), "{want}: {e}");
    }
    let v = budget(
        "name,fclk,fdata,stages,cell,crossing,transfers\nh,1GHz,5MHz,2,slowcell,handshake,1MHz\n",
        "corner,tau,tw,tsu,tcq,tau@fast\ntyp,12ps,20ps,25ps,40ps,8ps\n",
    )
    .unwrap();
    let warnings: Vec<&str> = v["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|w| w.as_str().unwrap())
        .collect();
    assert!(
        warnings.iter().any(|w| w.starts_with(
            "Cell class slowcell: no corner column of its own for tau, tsu, tcq, tw or t0"
        )),
        "{warnings:?}"
    );
    assert!(
        warnings
            .iter()
            .any(|w| w.contains("no row's cell or domain names") && w.contains("tau@fast")),
        "{warnings:?}"
    );
    assert_eq!(
        v["rows"][0]["warnings"][0],
        "fdata is not used by this row's case."
    );
    assert_eq!(v["rows"][0]["fdata_hz"], 2e6);
}

/// Rows with the same inputs are read at the corners once and share what was read: each
/// row still gets its own count, cell class, domain and line. Every row's FIT at every
/// corner equals that of the same row read alone, and a bad row repeated is refused at
/// each of its lines.
#[test]
fn rows_read_once_keep_their_own_count_class_domain_and_line() {
    let corners = "corner,tau,tw,tsu,tcq,tau@fast,fclk@core\n\
                   typ,12ps,20ps,25ps,40ps,8ps,2GHz\n\
                   slow,20ps,30ps,35ps,60ps,14ps,2GHz\n";
    let header = "name,fclk,fdata,stages,count,cell,domain\n";
    let rows = [
        "a,1GHz,1MHz,2,1,,",
        "b,1GHz,1MHz,2,8,,",
        "c,1GHz,1MHz,2,1,fast,",
        "d,,1MHz,2,1,,core",
        "e,1GHz,1MHz,2,8,,",
        "f,1GHz,1MHz,2,1,fast,",
    ];
    let all = budget(&format!("{header}{}\n", rows.join("\n")), corners).unwrap();
    let together = row_fits(&all);
    for row in rows {
        let alone = row_fits(&budget(&format!("{header}{row}\n"), corners).unwrap());
        for (name, corner, fit) in alone {
            let (_, _, got) = together
                .iter()
                .find(|(n, c, _)| *n == name && *c == corner)
                .unwrap();
            // The same computation whichever way the row is reached: equal to the bit.
            assert_eq!(got.to_bits(), fit.to_bits(), "{name} at {corner}");
        }
    }
    let fit = |name: &str| {
        together
            .iter()
            .find(|(n, c, _)| n == name && c == "slow")
            .unwrap()
            .2
    };
    assert_log10("count 8", fit("b"), fit("a") + 8f64.log10());
    assert!(fit("c") < fit("a") - 1.0, "{} {}", fit("c"), fit("a"));
    assert!(fit("d") != fit("a"));
    let e = budget(
        &format!("{header}a,1GHz,1MHz,2,1,,\nx,1GHz,zz,2,1,,\ny,1GHz,zz,2,1,,\n"),
        corners,
    )
    .unwrap_err();
    for line in [3, 4] {
        assert!(
            e.contains(&format!(
                "design, line {line}, column fdata: 'zz' is not a number"
            )),
            "{e}"
        );
    }
}

/// The 95th percentile with ln tau and ln tw correlated, against an mpmath quadrature
/// (to 1e-9 in FIT) and a seeded Monte Carlo of 1e6 draws (within its sampling error:
/// the 95 % point's standard error is about 0.0005 decades here, so 0.003 is six of
/// them), both in tests/fixtures/budget_corr_reference.csv; a correlation of 0 is the
/// independent case, and the sign matters in the direction it should.
#[test]
fn correlated_uncertainty_matches_quadrature_and_monte_carlo() {
    let root = env!("CARGO_MANIFEST_DIR");
    let read = |p: &str| std::fs::read_to_string(format!("{root}/tests/fixtures/{p}")).unwrap();
    let (design, corners) = (
        read("budget_corr_design.csv"),
        read("budget_corr_corners.csv"),
    );
    let mut p95 = Vec::new();
    for line in table_rows(include_str!("fixtures/budget_corr_reference.csv")) {
        let c: Vec<&str> = line.split(',').collect();
        let (rho, ts, ws) = (c[0], c[1], c[2]);
        let (quad, mc): (f64, f64) = (c[3].parse().unwrap(), c[4].parse().unwrap());
        let raw = RawInputs::from_pairs([
            ("design", design.as_str()),
            ("corners", corners.as_str()),
            ("tau-sigma", ts),
            ("tw-sigma", ws),
            ("tau-tw-corr", rho),
        ]);
        let v = serde_json::to_value(BudgetCalculator::evaluate(
            &BudgetCalculator::read(&raw).unwrap(),
        ))
        .unwrap();
        let got = v["log10_total_fit_p95"].as_f64().unwrap();
        assert!(
            (got - quad).abs() <= 4.3e-10,
            "rho {rho}: {got} against the quadrature {quad}"
        );
        assert!(
            (got - mc).abs() <= 0.003,
            "rho {rho}: {got} against the Monte Carlo {mc}"
        );
        if rho == "0" {
            let plain = RawInputs::from_pairs([
                ("design", design.as_str()),
                ("corners", corners.as_str()),
                ("tau-sigma", ts),
                ("tw-sigma", ws),
            ]);
            let w = serde_json::to_value(BudgetCalculator::evaluate(
                &BudgetCalculator::read(&plain).unwrap(),
            ))
            .unwrap();
            assert_eq!(w["log10_total_fit_p95"], v["log10_total_fit_p95"]);
        }
        p95.push(got);
    }
    // A longer tau with a wider window (positive correlation) widens the spread.
    assert!(p95[0] < p95[1] && p95[1] < p95[2], "{p95:?}");
    // Refused: a correlation of 1, and one without both uncertainties.
    let one = RawInputs::from_pairs([
        ("design", design.as_str()),
        ("corners", corners.as_str()),
        ("tau-sigma", "0.1"),
        ("tw-sigma", "0.4"),
        ("tau-tw-corr", "1"),
    ]);
    let e = BudgetCalculator::read(&one).unwrap_err().to_string();
    assert!(
        e.contains("tau-tw-corr: 1 is out of range (allowed: above -1 and below 1)"),
        "{e}"
    );
    let alone = RawInputs::from_pairs([
        ("design", design.as_str()),
        ("corners", corners.as_str()),
        ("tau-sigma", "0.1"),
        ("tau-tw-corr", "0.5"),
    ]);
    let e = BudgetCalculator::read(&alone).unwrap_err().to_string();
    assert!(e.contains("give tau-sigma and tw-sigma"), "{e}");
}
