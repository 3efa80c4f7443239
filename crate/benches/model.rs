//! Criterion benchmarks of the models: one evaluation, 1e6-point sweeps, and a
//! 10,000-row design budget.
#![allow(missing_docs, clippy::unwrap_used)]

use criterion::{criterion_group, criterion_main, Criterion};
use latchwise::budget::BudgetCalculator;
use latchwise::calculator::Calculator;
use latchwise::comparator::sweep::p_vs_tau;
use latchwise::comparator::{self, CompCase};
use latchwise::numeric::normal::ln_q;
use latchwise::params::RawInputs;
use latchwise::synchronizer::sweep::sweep_tau;
use latchwise::synchronizer::{evaluate, SyncCase};
use std::hint::black_box;

const DEMO: &str = "tau=20p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p&target-years=1e6";

fn bench(c: &mut Criterion) {
    let case = SyncCase::from_inputs(&RawInputs::from_query(DEMO)).unwrap();
    c.bench_function("sync/log10_rate", |b| {
        b.iter(|| black_box(&case.sync).log10_rate())
    });
    c.bench_function("sync/evaluate_with_solvers", |b| {
        b.iter(|| evaluate(black_box(&case)))
    });
    c.bench_function("sync/parse_and_validate", |b| {
        b.iter(|| SyncCase::from_inputs(&RawInputs::from_query(black_box(DEMO))).unwrap())
    });
    let mut g = c.benchmark_group("sweep");
    g.sample_size(10);
    g.bench_function("tau_1e6_points", |b| {
        b.iter(|| sweep_tau(black_box(&case.sync), 1e-12, 1e-9, 1_000_000))
    });
    g.finish();

    let comp = |q: &str| CompCase::from_inputs(&RawInputs::from_query(q)).unwrap();
    let base = "tau=15p&treg=80p&vmin=0.4&gain=4&fs=5G&target-ber=1e-12";
    for (name, model) in [
        ("uniform", "input=uniform&lsb=1m"),
        ("nrz", "input=nrz&amp=40m&sigma=4m"),
        ("pam4", "input=pam4&amp=150m&sigma=8m"),
        ("sine_8bit", "input=sine&amp=0.5&lsb=3.90625m"),
    ] {
        let case = comp(&format!("{base}&{model}"));
        c.bench_function(&format!("comparator/ln_p_error/{name}"), |b| {
            b.iter(|| black_box(&case.comp).ln_p_error())
        });
        c.bench_function(&format!("comparator/evaluate_with_solvers/{name}"), |b| {
            b.iter(|| comparator::evaluate(black_box(&case)))
        });
    }
    let nrz = comp(&format!("{base}&input=nrz&amp=40m&sigma=4m"));
    let mut g = c.benchmark_group("comparator_sweep");
    g.sample_size(10);
    g.bench_function("nrz_tau_1e6_points", |b| {
        b.iter(|| p_vs_tau(black_box(&nrz.comp), 1_000_000))
    });
    g.finish();

    // The normal tail far out, where the budget's uncertainty integral lands for
    // extreme designs: 1000 arguments spread over 10 to 1e200.
    let xs: Vec<f64> = (0..1000)
        .map(|i| 10f64.powf(1.0 + 0.199 * f64::from(i)))
        .collect();
    // A 16-bit asynchronous SAR converter: 65,535 thresholds, each with its landings.
    c.bench_function("converter/async_16_bits", |b| {
        b.iter(|| {
            black_box(latchwise::converter::model::async_timeouts(
                16,
                black_box(120.0),
                65536.0,
                latchwise::converter::model::Fill::Reset,
            ))
        })
    });
    c.bench_function("normal/ln_q_1000_large_arguments", |b| {
        b.iter(|| black_box(&xs).iter().map(|&x| ln_q(x)).sum::<f64>())
    });

    // A 10,000-row design at the demo's three corners, with the demo's budget and
    // uncertainty: what the budget page does on every edit, reading and evaluating apart.
    let clocks = ["1.2GHz", "400MHz", "125MHz"];
    let rates = ["1kHz", "1MHz", "20MHz", "100MHz"];
    let mut design = String::from("name,fclk,fdata,stages,count\n");
    for i in 0..10_000 {
        design.push_str(&format!(
            "x{i},{},{},{},{}\n",
            clocks[i % 3],
            rates[i % 4],
            [2, 2, 2, 3][i % 4],
            [1, 1, 8, 32][i % 4]
        ));
    }
    let raw = RawInputs::from_pairs([
        ("design", design),
        (
            "corners",
            include_str!("../../examples/budget-corners.csv").to_string(),
        ),
        ("budget-fit", "10".into()),
        ("tau-sigma", "0.05".into()),
        ("tw-sigma", "0.3".into()),
    ]);
    let mut g = c.benchmark_group("budget_10k_rows");
    g.sample_size(20);
    g.bench_function("read", |b| {
        b.iter(|| BudgetCalculator::read(black_box(&raw)).unwrap())
    });
    // As the page reads it: lines remembered, one cell changed between reads.
    let edited: Vec<RawInputs> = (0..2)
        .map(|k| {
            let pairs: Vec<(String, String)> = raw
                .pairs()
                .iter()
                .map(|(n, v)| {
                    let v = if n == "design" {
                        v.replacen("x5,", &format!("x5-{k},"), 1)
                    } else {
                        v.clone()
                    };
                    (n.clone(), v)
                })
                .collect();
            RawInputs::from_pairs(pairs)
        })
        .collect();
    latchwise::table::remember_rows(true);
    let mut k = 0;
    g.bench_function("read_again_after_one_edit", |b| {
        b.iter(|| {
            k = 1 - k;
            BudgetCalculator::read(black_box(&edited[k])).unwrap()
        })
    });
    latchwise::table::remember_rows(false);
    let case = BudgetCalculator::read(&raw).unwrap();
    g.bench_function("evaluate", |b| {
        b.iter(|| BudgetCalculator::evaluate(black_box(&case)))
    });
    g.bench_function("fix_plan", |b| b.iter(|| black_box(&case).rollup.fix(1.0)));
    let report = BudgetCalculator::evaluate(&case);
    // A budget's rows as JSON into a buffer: by their own code (as the command writes
    // them), and through serde_json, side by side.
    g.bench_function("json_rows_by_hand", |b| {
        b.iter(|| {
            let mut v = Vec::with_capacity(4 << 20);
            for r in &black_box(&report).rows {
                latchwise::json_line::JsonLine::json_line(
                    r,
                    &mut latchwise::json_line::Line(&mut v),
                );
            }
            v
        })
    });
    g.bench_function("json_rows_serde", |b| {
        b.iter(|| {
            let mut v = Vec::with_capacity(4 << 20);
            for r in &black_box(&report).rows {
                serde_json::to_writer(&mut v, r).unwrap();
            }
            v
        })
    });
    g.bench_function("percentiles", |b| {
        b.iter(|| black_box(&case).rollup.percentiles(0.05, 0.3, &[0.5, 0.95]))
    });
    g.finish();
    // Failure-count fits of 1e3, 1e4 and 1e5 rows: a tester sweeping 20 resolution times
    // (rows grouped by tr), and every tr distinct (the worst case for grouping).
    let mut g = c.benchmark_group("fit_counts");
    g.sample_size(10);
    for n in [1_000usize, 10_000, 100_000] {
        for (label, distinct) in [("20_tr", false), ("distinct_tr", true)] {
            let mut r = latchwise::numeric::random::Random::new(7);
            let (tau, tw, fclk, fdata) = (18e-12, 22e-12, 1e9, 50e6);
            let mut d = latchwise::characterize::counts::Counts {
                tr: Vec::with_capacity(n),
                failures: Vec::with_capacity(n),
                duration: Vec::with_capacity(n),
            };
            for i in 0..n {
                let tr = if distinct {
                    (100.0 + 400.0 * i as f64 / n as f64) * 1e-12
                } else {
                    (100.0 + 20.0 * (i % 20) as f64) * 1e-12
                };
                let mu = 1e-3 * fclk * fdata * tw * (-tr / tau).exp();
                d.tr.push(tr);
                d.failures.push(r.poisson(mu) as f64);
                d.duration.push(1e-3);
            }
            g.bench_function(format!("{label}/{n}"), |b| {
                b.iter(|| latchwise::characterize::counts::fit(black_box(&d), fclk, fdata).unwrap())
            });
            if n == 100_000 {
                // The same rows as a CSV file's text, read and fitted as the command does.
                let mut text = String::from("tr,failures,duration\n");
                for i in 0..n {
                    text.push_str(&format!(
                        "{:.6e},{},{}\n",
                        d.tr[i], d.failures[i], d.duration[i]
                    ));
                }
                let raw = latchwise::params::RawInputs::from_pairs([
                    ("kind", "counts"),
                    ("data", text.as_str()),
                    ("fclk", "1GHz"),
                    ("fdata", "50MHz"),
                ]);
                g.bench_function(format!("{label}/{n}/read_and_fit"), |b| {
                    b.iter(|| {
                        <latchwise::characterize::FitCalculator as Calculator>::read(black_box(
                            &raw,
                        ))
                        .unwrap()
                    })
                });
            }
        }
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
