//! Charts render natively to SVG; the structure (axes, labels, series, markers) is checked.

use latchwise::calculator::Calculator;
use latchwise::chart::{draw, Plot};
use latchwise::comparator::ComparatorCalculator;
use latchwise::params::RawInputs;
use latchwise::synchronizer::sweep::{mtbf_vs_fclk, mtbf_vs_stages, mtbf_vs_tau, mtbf_vs_tr};
use latchwise::synchronizer::{SyncCalculator, SyncCase, Synchronizer};
use plotters::prelude::*;

fn sync(q: &str) -> Synchronizer {
    SyncCase::from_inputs(&RawInputs::from_query(q))
        .unwrap()
        .sync
}

const DEMO: &str = "tau=20p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p";

fn svg(series: &Plot, target: Option<f64>) -> (String, latchwise::chart::Drawn) {
    let mut plot = series.clone();
    plot.hline = target.map(|t| (t, "target".to_string()));
    let mut out = String::new();
    let drawn = {
        let root = SVGBackend::with_string(&mut out, (640, 360)).into_drawing_area();
        draw(&root, &plot, 1.0).unwrap()
    };
    (out, drawn)
}

/// The text labels of an SVG, trimmed.
fn texts(svg: &str) -> Vec<String> {
    svg.split("<text")
        .skip(1)
        .filter_map(|t| {
            t.split_once('>')
                .and_then(|(_, rest)| rest.split_once("</text>"))
        })
        .map(|(body, _)| body.trim().to_string())
        .collect()
}

#[test]
fn stage_chart_has_axes_decade_labels_series_target_and_marker() {
    let s = mtbf_vs_stages(&sync(DEMO), 8);
    let (out, drawn) = svg(&s, Some(6.0));
    let labels = texts(&out);
    let has = |t: &str| labels.iter().any(|l| l == t);
    assert!(has("MTBF (years)"), "y axis title in {labels:?}");
    assert!(has("stages"), "x axis title");
    assert!(has("this case") && has("target"), "legend");
    assert!(
        (1..=8).all(|n| has(&n.to_string())),
        "stage ticks in {labels:?}"
    );
    assert!(out.contains("<polyline"), "series line");
    assert!(out.matches("<circle").count() >= 9, "stage dots and marker");
    assert_eq!(drawn.points, 8);
    // Eight stages of the demo case reach about 1e126 years: decade labels, no overflow.
    assert!(
        drawn.y_range.1 > 126.0 && drawn.y_range.1 < 140.0,
        "{:?}",
        drawn.y_range
    );
    for t in &drawn.y_ticks {
        assert!(has(&latchwise::chart::decade_label(*t)), "tick {t}");
    }
}

#[test]
fn axis_stays_readable_beyond_f64_range() {
    let s = mtbf_vs_stages(
        &sync("tau=1p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p"),
        10,
    );
    let (out, drawn) = svg(&s, None);
    assert!(drawn.y_range.1 > 3000.0);
    assert!(drawn.y_ticks.len() <= 9);
    let labels = texts(&out);
    let top = latchwise::chart::decade_label(*drawn.y_ticks.last().unwrap());
    assert!(top.starts_with("1e") && top.len() >= 6, "{top}");
    assert!(labels.contains(&top), "{labels:?}");
}

#[test]
fn every_sweep_draws_finite_points() {
    let s = sync(DEMO);
    for series in [
        mtbf_vs_fclk(&s, 120),
        mtbf_vs_tau(&s, 120),
        mtbf_vs_tr(&s, 120),
    ] {
        let (out, drawn) = svg(&series, Some(6.0));
        assert_eq!(drawn.points, 120, "{}", series.id);
        assert!(out.contains("<polyline"), "{}", series.id);
        assert!(series
            .points()
            .iter()
            .all(|p| p.0.is_finite() && p.1.is_finite()));
        let csv = series.to_csv(&[]);
        assert_eq!(csv.lines().count(), 121, "{}", series.id);
    }
}

#[test]
fn fclk_sweep_stops_before_the_period_runs_out() {
    let s = sync(DEMO);
    let series = mtbf_vs_fclk(&s, 50);
    let last = series.points().last().unwrap().0;
    assert!(1.0 / last > 80e-12, "{last}");
}

#[test]
fn deep_chains_get_round_ticks_and_wide_labels_fit() {
    let s = mtbf_vs_stages(
        &sync("tau=1p&tw=40p&fclk=1G&fdata=100M&stages=2&tsu=30p&tcq=50p"),
        1000,
    );
    let (out, drawn) = svg(&s, None);
    let labels = texts(&out);
    for t in ["1", "200", "400", "1000"] {
        assert!(labels.iter().any(|l| l == t), "tick {t} in {labels:?}");
    }
    assert!(!labels.iter().any(|l| l == "102"), "{labels:?}");
    // A thousand points make a line; only the operating point is a dot.
    assert_eq!(
        out.matches("<circle").count(),
        2,
        "marker and its legend entry"
    );
    assert!(drawn.y_ticks.len() <= 9);
}

#[test]
fn comparator_charts_render_natively_with_their_lines() {
    // Every comparator plot, the growth chart included, through the calculator trait.
    let raw = RawInputs::from_query(
        "tau=15p&treg=80p&vmin=0.4&gain=4&input=nrz&amp=40m&sigma=4m&fs=5G&target-ber=1e-12",
    );
    let case = ComparatorCalculator::read(&raw).unwrap();
    let plots = ComparatorCalculator::plots(&case, &ComparatorCalculator::evaluate(&case));
    let ids: Vec<&str> = plots.iter().map(|p| p.id).collect();
    assert_eq!(
        ids,
        ["plot-treg", "plot-ctau", "plot-spread", "plot-growth"]
    );
    for p in &plots {
        let (out, drawn) = svg(p, p.hline.as_ref().map(|h| h.0));
        assert!(drawn.points > 0 && out.contains("<polyline"), "{}", p.id);
        let labels = texts(&out);
        assert!(
            labels.iter().any(|l| l == p.y_label),
            "{}: {labels:?}",
            p.id
        );
    }
    let growth = plots.last().unwrap();
    assert!(growth.curves.len() >= 2, "several inputs");
    let (out, _) = svg(growth, Some(0.4f64.log10()));
    let labels = texts(&out);
    assert!(labels.iter().any(|l| l == "treg"), "{labels:?}");
    let csv = growth.to_csv(&[]);
    assert!(csv.starts_with("curve,t_s,log10_dv_v\n"), "{csv}");
}

/// Every plot of a case, drawn to SVG: what the page would draw.
fn draw_all<C: Calculator>(q: &str) -> Vec<(Plot, latchwise::chart::Drawn)> {
    let case = C::read(&RawInputs::from_query(q)).unwrap_or_else(|e| panic!("{q}: {e}"));
    C::plots(&case, &C::evaluate(&case))
        .into_iter()
        .map(|p| {
            let mut out = String::new();
            let drawn = {
                let root = SVGBackend::with_string(&mut out, (640, 360)).into_drawing_area();
                draw(&root, &p, 2.0).unwrap()
            };
            (p, drawn)
        })
        .collect()
}

#[test]
fn flat_curves_at_huge_values_draw_with_few_ticks() {
    // tr/tau = 1e18: every curve sits near 4.3e17 decades and is flat to f64 precision.
    // Tick generation once looped forever here; it must end with a handful of ticks.
    for (p, drawn) in draw_all::<SyncCalculator>("tau=1as&tw=40ps&fclk=1GHz&fdata=100MHz&tr=1") {
        assert!(drawn.y_ticks.len() <= 9, "{}: {:?}", p.id, drawn.y_ticks);
        assert!(drawn.y_range.0 < drawn.y_range.1, "{}", p.id);
    }
}

#[test]
fn plots_reach_the_answer_and_clip_to_a_readable_span() {
    // The demo chain needs 3 stages for 1e6 years; a target of 1e100 years needs more
    // than the default six-stage plot shows.
    let case = SyncCalculator::read(&RawInputs::from_query(&format!(
        "{DEMO}&target-years=1e100"
    )))
    .unwrap();
    let need = match case
        .sync
        .min_stages(-100.0 - latchwise::reliability::YEAR_S.log10())
    {
        latchwise::synchronizer::StagesNeeded::Stages(n) => n as f64,
        other => panic!("{other:?}"),
    };
    let stages = &SyncCalculator::plots(&case, &SyncCalculator::evaluate(&case))[0];
    assert!(
        stages.points().last().unwrap().0 > need,
        "plot ends before {need} stages"
    );
    // The comparator's regeneration-time plot reaches past the regeneration time needed.
    let q = "tau=15ps&treg=80ps&vmin=0.4&gain=4&input=uniform&lsb=1mV&fs=5GHz&target-ber=1e-15";
    let report = ComparatorCalculator::evaluate(
        &ComparatorCalculator::read(&RawInputs::from_query(q)).unwrap(),
    );
    let needed = report.treg_needed_s.unwrap().unwrap();
    let plots = draw_all::<ComparatorCalculator>(q);
    let (treg, _) = &plots[0];
    assert!(
        treg.points().last().unwrap().0 > needed,
        "treg plot ends before {needed:e}"
    );
    // A latch with 4.4 ns: p = 1e-125 at this tau, 1e-500 at a quarter of it. The tau
    // plot keeps the case and the target in view instead of spanning 500 decades.
    let q = "tau=15ps&treg=4.4ns&vmin=0.4&gain=4&input=uniform&lsb=1mV&fs=5GHz&target-ber=1e-10";
    let plots = draw_all::<ComparatorCalculator>(q);
    let (tau, drawn) = &plots[1];
    assert_eq!(tau.id, "plot-ctau");
    assert!(tau.points().iter().any(|p| p.1 < -450.0));
    assert!(
        drawn.y_range.1 - drawn.y_range.0 < 200.0,
        "{:?}",
        drawn.y_range
    );
    let marker = tau.marker.unwrap().1;
    assert!(
        drawn.y_range.0 < marker && drawn.y_range.1 > -10.0,
        "{:?}",
        drawn.y_range
    );
}

#[test]
fn csv_opens_with_the_case_and_writes_plain_numbers() {
    let raw = RawInputs::from_query(&format!("{DEMO}&target-years=1e5"));
    let csv = latchwise::calculator::plot_csv::<SyncCalculator>(
        &raw,
        "plot-stages",
        "file:///x/index.html?q",
    )
    .unwrap();
    let lines: Vec<&str> = csv.lines().collect();
    assert_eq!(
        lines[0],
        "# latchwise sync: MTBF against synchronizer depth"
    );
    assert!(
        lines.contains(&"# tau = 20 ps") && lines.contains(&"# fclk = 1 GHz"),
        "{csv}"
    );
    assert!(lines.contains(&"# link: file:///x/index.html?q"), "{csv}");
    let header = lines.iter().position(|l| !l.starts_with('#')).unwrap();
    assert_eq!(lines[header], "stages,log10_mtbf_years");
    // Stage counts as integers, values in scientific notation that parse back exactly.
    let (x, y) = lines[header + 1].split_once(',').unwrap();
    assert_eq!(x, "1");
    assert!(y.contains('e') && y.parse::<f64>().is_ok(), "{y}");
    assert!(
        !csv.contains("0.0000"),
        "no long fixed-point fractions: {csv}"
    );
    assert!(latchwise::calculator::plot_csv::<SyncCalculator>(&raw, "plot-nothing", "").is_none());
}

#[test]
fn the_budget_line_stays_in_view_of_the_spread() {
    // The demo chip's total spreads over 1e4..1e9 FIT against a 10 FIT budget: the x axis
    // reaches down to the budget, so the line is drawn rather than clipped away (the
    // axis once began at 1e4, its ticks now reach 100 or below).
    use latchwise::budget::BudgetCalculator;
    let read = |name: &str| {
        std::fs::read_to_string(format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))).unwrap()
    };
    let raw = RawInputs::from_pairs(vec![
        ("design".to_string(), read("budget-design.csv")),
        ("corners".to_string(), read("budget-corners.csv")),
        ("budget-fit".to_string(), "10".to_string()),
        ("tau-sigma".to_string(), "0.05".to_string()),
        ("tw-sigma".to_string(), "0.3".to_string()),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let spread = BudgetCalculator::plots(&case, &BudgetCalculator::evaluate(&case))
        .into_iter()
        .find(|p| p.id == "plot-spread")
        .unwrap();
    let (out, _) = svg(&spread, None);
    let labels = texts(&out);
    let smallest = labels
        .iter()
        .filter_map(|t| t.parse::<f64>().ok())
        .filter(|v| *v > 1.0)
        .fold(f64::INFINITY, f64::min);
    assert!(smallest <= 100.0, "{labels:?}");
}

#[test]
fn a_spread_beyond_the_f64_range_is_plotted_by_its_log10() {
    // A fuzz input (fuzz/corpus/query/case-budget-tiny-tau): tau of 1e-42 s put the
    // total near 10^(-1e30) FIT; within the field limits, the smallest tau and the
    // slowest clock put it near 10^(-4e27). The spread plot once wrote 0 for every FIT and drew no
    // curve; its x is now log10 of the total, on a plain axis.
    use latchwise::budget::BudgetCalculator;
    let raw = RawInputs::from_query(
        "design=name;fclk;fdata;stages%0Ax;1e-4;1e18;1000&corners=corner,tau,tw,tsu,tcq%0Ac,1e-21,1e6,0,0&tau-sigma=2&tw-sigma=5",
    );
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    let spread = BudgetCalculator::plots(&case, &report)
        .into_iter()
        .find(|p| p.id == "plot-spread")
        .unwrap();
    let xs: Vec<f64> = spread.points().iter().map(|p| p.0).collect();
    assert!(xs.iter().all(|x| x.is_finite() && *x < -300.0), "{xs:?}");
    assert!(xs.windows(2).all(|w| w[0] < w[1]));
    let csv = latchwise::calculator::plot_csv::<BudgetCalculator>(&raw, "plot-spread", "").unwrap();
    assert!(csv.contains("\nlog10_FIT,probability\n"), "{csv}");
    let (out, _) = svg(&spread, None);
    assert!(
        out.contains("<polyline") || out.contains("<path"),
        "no curve drawn"
    );
}

/// Cells of one CSV line as a spreadsheet reads them (RFC 4180: quotes only at a cell's
/// start; nothing trimmed).
fn spreadsheet_cells(line: &str) -> Vec<String> {
    let (mut out, mut cur, mut quoted, mut start) = (Vec::new(), String::new(), false, true);
    let mut chars = line.chars().peekable();
    while let Some(c) = chars.next() {
        match c {
            '"' if start => quoted = true,
            '"' if quoted && chars.peek() == Some(&'"') => {
                cur.push('"');
                chars.next();
            }
            '"' if quoted => quoted = false,
            ',' if !quoted => {
                out.push(std::mem::take(&mut cur));
                start = true;
                continue;
            }
            c => cur.push(c),
        }
        start = false;
    }
    out.push(cur);
    out
}

/// Exported CSVs a spreadsheet cannot turn against the user (CSV injection): crossing and
/// corner names such as `=2+2`, `@SUM(A1)`, `-cmd` or one holding a comma reach no cell
/// that begins with `=`, `+`, `@`, a tab, a CR or a non-numeric `-`; such a cell is led
/// by an apostrophe (OWASP's advice, common practice).
#[test]
fn exported_csv_cells_never_start_a_formula() {
    use latchwise::budget::BudgetCalculator;
    let design = "name,fclk,fdata,stages,count\n=2+2,1GHz,10MHz,2,1\n@SUM(A1),1GHz,10MHz,2,1\n-cmd,1GHz,10MHz,2,1\n\"+x, =y\",1GHz,10MHz,2,1\n";
    let corners = "corner,tau,tw,tsu,tcq\n\"=HYPERLINK(\"\"x\"\"),a\",25ps,40ps,30ps,50ps\n@slow,20ps,40ps,30ps,50ps\n";
    let raw = RawInputs::from_pairs([
        ("design", design.to_string()),
        ("corners", corners.to_string()),
        ("budget-fit", "1".to_string()),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    let plots = BudgetCalculator::plots(&case, &report);
    assert!(plots.len() >= 2);
    let risky = |cell: &str| match cell.chars().next() {
        Some('=' | '+' | '@' | '\t' | '\r') => true,
        Some('-') => cell.parse::<f64>().is_err(),
        _ => false,
    };
    let mut seen_apostrophe = false;
    for p in plots {
        let csv = latchwise::calculator::plot_csv::<BudgetCalculator>(
            &raw,
            p.id,
            "file:///x/budget.html?design=%3D2%2B2",
        )
        .unwrap();
        for line in csv.lines() {
            for cell in spreadsheet_cells(line) {
                assert!(!risky(&cell), "{}: {cell:?} in {line:?}", p.id);
                seen_apostrophe |= cell.starts_with("'=") || cell.starts_with("# ");
            }
        }
    }
    assert!(seen_apostrophe);
    assert_eq!(
        spreadsheet_cells(&latchwise::chart::series::text_cell("=2+2")),
        ["'=2+2"]
    );
    assert_eq!(
        spreadsheet_cells(&latchwise::chart::series::comment_line("design = a,=b")),
        ["# design = a,=b"]
    );
}

/// The budget's plots show the answer: one 32.768 kHz crossing far below the rest (near
/// 10^-389803 FIT) no longer stretches the FIT-per-crossing axis; the budget line and the
/// other rows stay in a span of about a dozen decades, the far row is counted in the
/// title, and the corners are named on their axis and in their CSV.
#[test]
fn one_extreme_row_cannot_flatten_the_budget_plots() {
    use latchwise::budget::BudgetCalculator;
    let mut design = String::from("name,fclk,fdata,stages,count\nrtc_tick,32.768kHz,1Hz,3,1\n");
    for i in 0..25 {
        design.push_str(&format!("x{i},1GHz,{}MHz,2,{}\n", 1 + i, 1 + i % 4));
    }
    let raw = RawInputs::from_pairs([
        ("design", design),
        (
            "corners",
            "corner,tau,tw,tsu,tcq\ncold,20ps,30ps,30ps,50ps\nhot,15ps,25ps,30ps,50ps\n"
                .to_string(),
        ),
        ("budget-fit", "1e-3".to_string()),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    assert!(
        report.rows[0].log10_fit < -1e5,
        "{}",
        report.rows[0].log10_fit
    );
    let plots = BudgetCalculator::plots(&case, &report);
    let rows = plots.iter().find(|p| p.id == "plot-rows").unwrap();
    assert!(
        rows.title.contains("the largest 25 of 26") && rows.title.contains("1 below"),
        "{}",
        rows.title
    );
    let (_, drawn) = svg(rows, Some(-3.0));
    let (lo, hi) = drawn.y_range;
    assert!(hi - lo < 16.0, "{lo}..{hi}");
    assert!(
        lo < -3.0 && hi > -3.0,
        "the budget line in view: {lo}..{hi}"
    );
    let top = report
        .rows
        .iter()
        .map(|r| r.log10_fit)
        .fold(f64::NEG_INFINITY, f64::max);
    assert!(hi >= top, "the largest row in view: {top} in {lo}..{hi}");
    assert_eq!(drawn.points, 25);
    // Named: the rows plot's CSV names each point; the corners plot names its axis.
    let csv = latchwise::calculator::plot_csv::<BudgetCalculator>(&raw, "plot-rows", "").unwrap();
    assert!(csv.contains("\nname,rank,log10_fit\n\"x"), "{csv}");
    let corners = plots.iter().find(|p| p.id == "plot-corners").unwrap();
    let (out, _) = svg(corners, None);
    let labels = texts(&out);
    assert!(
        labels.iter().any(|t| t == "cold") && labels.iter().any(|t| t == "hot"),
        "{labels:?}"
    );
    let csv =
        latchwise::calculator::plot_csv::<BudgetCalculator>(&raw, "plot-corners", "").unwrap();
    assert!(
        csv.contains("\nname,corner,log10_total_fit\n\"cold\",1,"),
        "{csv}"
    );
}

/// CSV prefaces say what a column holds: "log10 of" only where the axis is a log (the
/// budget's distribution is a plain probability); and a narrow (printed) plot gets fewer
/// x labels, so that they never run together.
#[test]
fn csv_labels_say_what_they_hold_and_narrow_plots_thin_their_labels() {
    use latchwise::budget::BudgetCalculator;
    let root = env!("CARGO_MANIFEST_DIR");
    let read = |f: &str| std::fs::read_to_string(format!("{root}/examples/{f}")).unwrap();
    let raw = RawInputs::from_pairs([
        ("design", read("budget-design.csv")),
        ("corners", read("budget-corners.csv")),
        ("tau-sigma", "0.05".to_string()),
        ("tw-sigma", "0.3".to_string()),
    ]);
    let csv = latchwise::calculator::plot_csv::<BudgetCalculator>(&raw, "plot-spread", "").unwrap();
    assert!(
        csv.contains("# probability is probability of a total at most this"),
        "{csv}"
    );
    assert!(!csv.contains("probability is log10"), "{csv}");
    let csv = latchwise::calculator::plot_csv::<BudgetCalculator>(&raw, "plot-rows", "").unwrap();
    assert!(
        csv.contains("# log10_fit is log10 of FIT at the worst corner"),
        "{csv}"
    );
    // The comparator's regeneration-time plot at 640 and at 220 pixels.
    let raw = RawInputs::from_query("tau=15ps&treg=80ps&extra-stages=2&stage-time=100ps&vmin=0.4&gain=4&input=uniform&lsb=1mV&fs=5GHz&target-ber=1e-10");
    let case = ComparatorCalculator::read(&raw).unwrap();
    let report = ComparatorCalculator::evaluate(&case);
    let plot = ComparatorCalculator::plots(&case, &report)
        .into_iter()
        .find(|p| p.id == "plot-treg")
        .unwrap();
    let labels_at = |w: u32| {
        let mut out = String::new();
        {
            let root = SVGBackend::with_string(&mut out, (w, 200)).into_drawing_area();
            draw(&root, &plot, 1.0).unwrap();
        }
        texts(&out)
            .iter()
            .filter(|t| t.ends_with(" ps") || *t == "0 s")
            .count()
    };
    let (wide, narrow) = (labels_at(640), labels_at(220));
    assert!(
        narrow < wide && narrow <= 4,
        "{narrow} labels at 220 px, {wide} at 640 px"
    );
}

/// The FIT-per-crossing plot names its crossings on the axis: the largest 30, standing
/// on end when they do not fit side by side, and the title counts the rest.
#[test]
fn the_largest_thirty_crossings_are_named_on_the_axis() {
    use latchwise::budget::BudgetCalculator;
    let mut design = String::from("name,fclk,fdata,stages\n");
    for i in 0..40 {
        design.push_str(&format!("crossing_{i:02},1GHz,{}MHz,2\n", 1 + i));
    }
    let raw = RawInputs::from_pairs([
        ("design", design),
        (
            "corners",
            "corner,tau,tw,tsu,tcq\nslow,20ps,30ps,30ps,50ps\n".to_string(),
        ),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    let rows = BudgetCalculator::plots(&case, &report)
        .into_iter()
        .find(|p| p.id == "plot-rows")
        .unwrap();
    assert!(
        rows.title.contains("the largest 30 of 40"),
        "{}",
        rows.title
    );
    let (out, drawn) = svg(&rows, None);
    assert_eq!(drawn.points, 30);
    let labels = texts(&out);
    // The largest is the fastest data (crossing_39), the 30th crossing_10.
    for name in ["crossing_39", "crossing_25", "crossing_10"] {
        assert!(
            labels.iter().any(|t| t == name),
            "{name} not on the axis: {labels:?}"
        );
    }
    assert!(
        !labels.iter().any(|t| t == "crossing_09"),
        "only the largest 30"
    );
    // Standing on end: rotated text in the SVG.
    assert!(out.contains("rotate(90"), "names stand on end");
}

/// The corners plot keeps the worst corner and the budget in view: a corner of tau 1 fs
/// (10^-1e6 FIT) leaves the plot instead of stretching its axis over a million decades.
#[test]
fn one_extreme_corner_cannot_flatten_the_corners_plot() {
    use latchwise::budget::BudgetCalculator;
    let raw = RawInputs::from_pairs([
        ("design", "name,fclk,fdata,stages\na,1GHz,100MHz,2\n".to_string()),
        ("corners", "corner,tau,tw,tsu,tcq\nslow,24ps,30ps,30ps,50ps\nmid,18ps,30ps,30ps,50ps\nodd,1fs,30ps,30ps,50ps\n".to_string()),
        ("budget-fit", "1e-9".to_string()),
    ]);
    let case = BudgetCalculator::read(&raw).unwrap();
    let report = BudgetCalculator::evaluate(&case);
    assert!(report.corners[2].log10_total_fit < -1e5);
    let corners = BudgetCalculator::plots(&case, &report)
        .into_iter()
        .find(|p| p.id == "plot-corners")
        .unwrap();
    let (_, drawn) = svg(&corners, Some(-9.0));
    let (lo, hi) = drawn.y_range;
    let worst = report.log10_total_fit;
    assert!(hi - lo < 20.0, "{lo}..{hi}");
    assert!(
        lo < -9.0 && hi > worst && lo < report.corners[1].log10_total_fit,
        "{lo}..{hi}, worst {worst}"
    );
}
