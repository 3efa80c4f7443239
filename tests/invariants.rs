//! One invariant over every calculator and every reader: whatever values the fields, the
//! table cells and the lab data hold (drawn across each field's whole range, extremes
//! included), a report never carries NaN or an infinity (a JSON null stands for either
//! and must have its reason in `not_applicable`), never a plain number above 1e300
//! presented as an estimate (such quantities are carried by their log10), and its text
//! never prints "inf", "NaN" or "-0". Refused inputs get messages, never a panic.

use latchwise::calculator::{Calculator, Visit};
use latchwise::params::RawInputs;
use latchwise::registry::{dispatch, ALL};
use latchwise::units::Dim;
use proptest::prelude::*;
use serde_json::Value;

/// What a report may not hold, as a list of problems (empty: none).
fn problems_of(json: &Value, text: &str) -> Vec<String> {
    let mut out = Vec::new();
    let reasons = json.get("not_applicable").cloned().unwrap_or(Value::Null);
    fn walk(v: &Value, path: &str, top: bool, reasons: &Value, out: &mut Vec<String>) {
        match v {
            Value::Null => {
                let key = path.rsplit('.').next().unwrap_or(path);
                // A null at the top needs its reason; inside arrays and objects (interval
                // ends, optional cells) the key's reason or a sibling `_reason` does.
                let explained = reasons.get(key).is_some_and(Value::is_string) || !top;
                if !explained {
                    out.push(format!("{path} is null without a reason"));
                }
            }
            Value::Number(n) => {
                let x = n.as_f64().unwrap_or(f64::NAN);
                if !x.is_finite() || x.abs() > 1e300 {
                    out.push(format!("{path} = {x}"));
                }
            }
            Value::Array(a) => a
                .iter()
                .enumerate()
                .for_each(|(i, x)| walk(x, &format!("{path}[{i}]"), false, reasons, out)),
            Value::Object(o) => o.iter().for_each(|(k, x)| {
                let p = if path.is_empty() {
                    k.clone()
                } else {
                    format!("{path}.{k}")
                };
                walk(x, &p, top && path.is_empty(), reasons, out)
            }),
            _ => {}
        }
    }
    if let Value::Object(o) = json {
        for (k, v) in o {
            if k != "not_applicable" && k != "inputs" {
                walk(v, k, true, &reasons, &mut out);
            }
        }
    }
    for bad in ["inf ", "inf)", "NaN", "infinity"] {
        for line in text.lines().filter(|l| l.contains(bad)) {
            out.push(format!("text shows '{bad}': {line}"));
        }
    }
    // A negative zero: "-0", "-0.0", "-0.00" not followed by another digit.
    for line in text.lines() {
        let b = line.as_bytes();
        for (i, _) in line.match_indices("-0") {
            let mut j = i + 2;
            if b.get(j) == Some(&b'.') {
                j += 1;
                while b.get(j) == Some(&b'0') {
                    j += 1;
                }
            }
            let before_ok = i == 0 || !b[i - 1].is_ascii_alphanumeric();
            if before_ok && !b.get(j).is_some_and(|c| c.is_ascii_digit()) {
                out.push(format!("text shows a negative zero: {line}"));
            }
        }
    }
    // An estimate lies inside its own interval (`K_ci_low` to `K_ci_high`), where both
    // are numbers.
    if let Value::Object(o) = json {
        for (k, v) in o {
            let Some(x) = v.as_f64() else { continue };
            let end = |side: &str| o.get(&format!("{k}_ci_{side}")).and_then(Value::as_f64);
            let slack = 1e-9 * x.abs();
            if end("low").is_some_and(|lo| lo > x + slack)
                || end("high").is_some_and(|hi| hi < x - slack)
            {
                out.push(format!(
                    "{k} = {x} outside its interval {:?} to {:?}",
                    end("low"),
                    end("high")
                ));
            }
        }
    }
    out
}

/// Evaluates a case of calculator `name` and returns the invariant's problems (a refusal
/// is fine; its message is checked too).
struct Check(RawInputs);

impl Visit for Check {
    type Out = Vec<String>;

    fn visit<C: Calculator>(self) -> Vec<String> {
        match C::read(&self.0) {
            Err(e) => problems_of(&Value::Null, &e.to_string()),
            Ok(case) => {
                let report = C::evaluate(&case);
                let json = serde_json::to_value(&report).unwrap();
                let outcome = C::outcome(&report);
                let text: String = outcome
                    .readouts
                    .iter()
                    .map(|r| format!("{} {}\n", r.label, r.text))
                    .chain(outcome.warnings.iter().map(|w| format!("{w}\n")))
                    .collect();
                let mut p = problems_of(&json, &text);
                for plot in C::plots(&case, &report) {
                    for (x, y) in plot.points() {
                        if !x.is_finite() || !y.is_finite() {
                            p.push(format!("{}: point ({x}, {y})", plot.id));
                        }
                    }
                }
                p
            }
        }
    }
}

fn example(name: &str) -> String {
    std::fs::read_to_string(format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

/// A base case of each calculator, on which the drawn values are laid.
fn base(name: &str) -> Vec<(String, String)> {
    let q: Vec<(&str, String)> = match name {
        "sync" => vec![
            ("tau", "20ps".into()),
            ("tw", "40ps".into()),
            ("fclk", "1GHz".into()),
            ("fdata", "100MHz".into()),
            ("stages", "2".into()),
            ("tsu", "30ps".into()),
            ("tcq", "50ps".into()),
            ("target-years", "1e5".into()),
            ("devices", "1e6".into()),
            ("service-years", "10".into()),
        ],
        "comparator" => vec![
            ("tau", "15ps".into()),
            ("treg", "80ps".into()),
            ("vmin", "0.4".into()),
            ("gain", "4".into()),
            ("input", "gaussian".into()),
            ("sigma", "1mV".into()),
            ("mean", "0".into()),
            ("fs", "5GHz".into()),
            ("target-ber", "1e-10".into()),
        ],
        "fit" => vec![
            ("kind", "counts".into()),
            ("data", example("fit-counts.csv")),
            ("fclk", "1GHz".into()),
            ("fdata", "50MHz".into()),
        ],
        "budget" => vec![
            ("design", example("budget-design.csv")),
            ("corners", example("budget-corners.csv")),
            ("budget-fit", "10".into()),
            ("tau-sigma", "0.05".into()),
            ("tw-sigma", "0.3".into()),
            ("devices", "1e6".into()),
            ("service-years", "10".into()),
        ],
        "converter" => vec![
            ("bits", "10".into()),
            ("timing", "async".into()),
            ("tau", "10ps".into()),
            ("vmin", "1".into()),
            ("gain", "1".into()),
            ("vfs", "1".into()),
            ("fs", "100MHz".into()),
            ("tconv", "1ns".into()),
            ("tfix", "30ps".into()),
            ("fill", "midpoint".into()),
            ("sigma-n", "0.5mV".into()),
            ("static", "341".into()),
            ("margin-lsb", "2".into()),
            ("target-ber", "1e-12".into()),
        ],
        "supply" => vec![
            ("char", example("supply-char.csv")),
            ("points", example("supply-points.csv")),
            ("ss", "62.5mV".into()),
            ("dvt", "20mV".into()),
            ("fdata", "20MHz".into()),
            ("stages", "2".into()),
            ("target-years", "1e4".into()),
        ],
        other => panic!("no base case for {other}"),
    };
    q.into_iter().map(|(k, v)| (k.to_string(), v)).collect()
}

/// A value across `lo..=hi` (log-uniform, its ends drawn often), in plain SI.
fn across(lo: f64, hi: f64, u: f64, pick: u8) -> f64 {
    match pick % 8 {
        0 => lo,
        1 => hi,
        _ => 10f64.powf(lo.log10() + (hi.log10() - lo.log10()) * u),
    }
}

proptest! {
    #![proptest_config(crate::seeded::config(300))]

    /// Form fields across their whole range, several at once, in every calculator.
    #[test]
    fn no_field_value_reaches_a_report_as_inf_nan_or_a_bare_null(
        calc in 0usize..ALL.len(),
        draws in proptest::collection::vec((0usize..64, 0.0..1.0f64, any::<u8>()), 1..5),
    ) {
        let about = &ALL[calc];
        let mut pairs = base(about.name);
        for (i, u, pick) in draws {
            let numeric: Vec<_> = about.fields.iter()
                .filter(|f| !matches!(f.dim, Dim::Choice | Dim::Text) && f.limits.1 > 0.0)
                .collect();
            let f = numeric[i % numeric.len()];
            let lo = f.limits.0.max(1e-300);
            let mut v = across(lo, f.limits.1, u, pick);
            if f.dim == Dim::Count {
                v = v.round().max(1.0);
            }
            pairs.retain(|(k, _)| k != f.name);
            pairs.push((f.name.to_string(), format!("{v:e}")));
        }
        let p = dispatch(about.name, Check(RawInputs::from_pairs(pairs.clone()))).unwrap();
        prop_assert!(p.is_empty(), "{}: {:?}\n{:?}", about.name, p, pairs);
    }

    /// Design and corner cells across the synchronizer's limits.
    #[test]
    fn no_table_cell_reaches_the_budget_as_inf_nan_or_a_bare_null(
        rows in proptest::collection::vec((0.0..1.0f64, 0.0..1.0f64, 1u32..1000, any::<u8>(), 0.0..1.0f64), 1..6),
        corner in (0.0..1.0f64, 0.0..1.0f64, 0.0..1.0f64, 0.0..1.0f64, any::<u8>()),
    ) {
        let mut design = String::from("name,fclk,fdata,stages,count\n");
        for (i, (fc, fd, st, pick, n)) in rows.iter().enumerate() {
            let fclk = across(1e-9, 1e18, *fc, *pick);
            let fdata = across(1e-9, 1e18, *fd, pick.wrapping_add(3));
            let count = across(1.0, 1e9, *n, pick.wrapping_add(5)).round();
            design.push_str(&format!("r{i},{fclk:e},{fdata:e},{st},{count:e}\n"));
        }
        let (t, w, s, q, pick) = corner;
        let corners = format!(
            "corner,tau,tw,tsu,tcq\nc,{:e},{:e},{:e},{:e}\n",
            across(1e-21, 1e6, t, pick),
            across(1e-21, 1e6, w, pick.wrapping_add(1)),
            across(1e-21, 1e6, s, pick.wrapping_add(2)),
            across(1e-21, 1e6, q, pick.wrapping_add(4)),
        );
        let pairs = vec![
            ("design".to_string(), design),
            ("corners".to_string(), corners),
            ("budget-fit".to_string(), "1".to_string()),
            ("tau-sigma".to_string(), "0.1".to_string()),
            ("tw-sigma".to_string(), "0.5".to_string()),
        ];
        let p = dispatch("budget", Check(RawInputs::from_pairs(pairs.clone()))).unwrap();
        prop_assert!(p.is_empty(), "{:?}\n{:?}", p, pairs);
    }

    /// Rows of every crossing kind, related clocks and master-slave chains, their cells
    /// across the synchronizer's limits.
    #[test]
    fn no_crossing_kind_reaches_the_budget_as_inf_nan_or_a_bare_null(
        rows in proptest::collection::vec(
            (0usize..6, proptest::collection::vec((0.0..1.0f64, any::<u8>()), 8), 1u32..6),
            1..6,
        ),
    ) {
        let mut design = String::from(
            "name,fclk,crossing,fdata,increments,transfers,flaunch,activity,ratio,jitter,tau-master,tau-slave,tw2,stages,count,width\n",
        );
        for (i, (kind, u, st)) in rows.iter().enumerate() {
            let at = |k: usize, lo: f64, hi: f64| across(lo, hi, u[k].0, u[k].1);
            let fclk = at(0, 1e-9, 1e18);
            let rate = at(1, 1e-9, 1e18);
            let (crossing, fdata, inc, tr, fl, act) = match kind {
                0 => ("", format!("{rate:e}"), String::new(), String::new(), String::new(), String::new()),
                1 => ("gray", String::new(), format!("{rate:e}"), String::new(), String::new(), String::new()),
                2 => ("handshake", String::new(), String::new(), format!("{rate:e}"), String::new(), String::new()),
                _ => ("signal", String::new(), String::new(), String::new(), format!("{rate:e}"), format!("{:e}", at(2, 1e-12, 1e6))),
            };
            let related = if *kind == 4 {
                format!("{}/{},{:e}", 1 + u[3].1 % 9, 1 + u[4].1 % 7, at(3, 1e-21, 1e6))
            } else {
                ",".to_string()
            };
            let ms = if *kind == 5 {
                format!("{:e},{:e},{:e}", at(5, 1e-21, 1e6), at(6, 1e-21, 1e6), at(7, 1e-21, 1e6))
            } else {
                ",,".to_string()
            };
            design.push_str(&format!(
                "r{i},{fclk:e},{crossing},{fdata},{inc},{tr},{fl},{act},{related},{ms},{st},{},{}\n",
                1 + u[4].1 % 40,
                1 + u[5].1 % 9
            ));
        }
        let pairs = vec![
            ("design".to_string(), design),
            ("corners".to_string(), example("budget-corners.csv")),
            ("budget-fit".to_string(), "1".to_string()),
            ("tau-sigma".to_string(), "0.1".to_string()),
            ("tw-sigma".to_string(), "0.5".to_string()),
        ];
        let p = dispatch("budget", Check(RawInputs::from_pairs(pairs.clone()))).unwrap();
        prop_assert!(p.is_empty(), "{:?}\n{:?}", p, pairs);
    }

    /// Lab data across the readers' limits, for each kind of fit.
    #[test]
    fn no_lab_value_reaches_a_fit_as_inf_nan_or_a_bare_null(
        kind in 0usize..3,
        rows in proptest::collection::vec((0.0..1.0f64, 0.0..1.0f64, 0.0..1.0f64, any::<u8>()), 3..12),
    ) {
        let (name, data) = match kind {
            0 => ("counts", rows.iter().fold(String::from("tr,failures,duration\n"), |mut d, (a, b, c, p)| {
                d.push_str(&format!("{:e},{},{:e}\n", across(1e-21, 1.0, *a, *p), across(1.0, 1e15, *b, p.wrapping_add(1)).round(), across(1e-9, 1e10, *c, p.wrapping_add(2))));
                d
            })),
            1 => ("delay", rows.iter().fold(String::from("offset,delay\n"), |mut d, (a, b, _, p)| {
                let sign = if p % 2 == 0 { "" } else { "-" };
                d.push_str(&format!("{sign}{:e},{:e}\n", across(1e-21, 1.0, *a, *p), across(1e-21, 1.0, *b, p.wrapping_add(1))));
                d
            })),
            _ => ("comparator", rows.iter().fold(String::from("vin,time\n"), |mut d, (a, b, _, p)| {
                d.push_str(&format!("{:e},{:e}\n", across(1e-30, 1e3, *a, *p), across(1e-21, 1.0, *b, p.wrapping_add(1))));
                d
            })),
        };
        let pairs = vec![
            ("kind".to_string(), name.to_string()),
            ("data".to_string(), data),
            ("fclk".to_string(), "1GHz".to_string()),
            ("fdata".to_string(), "50MHz".to_string()),
        ];
        let p = dispatch("fit", Check(RawInputs::from_pairs(pairs.clone()))).unwrap();
        prop_assert!(p.is_empty(), "{:?}\n{:?}", p, pairs);
    }
}
