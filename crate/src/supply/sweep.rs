//! The supply calculator's plots: tau against VDD with the characterised points, the
//! interpolation and the bound drawn apart; MTBF against VDD at the operating points;
//! the stages each point needs.

use crate::chart::series::{Curve, Plot, Spacing};
use crate::crossing::StagesNeeded;
use crate::reliability::YEAR_S;
use crate::units::format_number;

use super::input::SupplyCase;
use super::model::{ln_linear, tau_bound_below};
use super::report::SupplyReport;

fn label(what: &str, temp: Option<f64>) -> String {
    match temp {
        Some(t) => format!("{what}, {} °C", format_number(t)),
        None => what.to_string(),
    }
}

fn curve(label: String, points: Vec<(f64, f64)>, points_only: bool) -> Curve {
    Curve {
        label,
        points,
        points_only,
    }
}

/// log10 tau against VDD: per temperature the characterised points, the ln-linear
/// interpolation between them and the bound below the lowest (with ss); and the
/// operating points as evaluated.
pub fn tau_vs_vdd(case: &SupplyCase, report: &SupplyReport) -> Plot {
    let low = report
        .points
        .iter()
        .map(|p| p.vdd)
        .fold(f64::INFINITY, f64::min);
    let mut curves = Vec::new();
    for s in &case.sets {
        let (v1, tau1) = s.tau[0];
        let vn = s.tau[s.tau.len() - 1].0;
        curves.push(curve(
            label("characterised", s.temp),
            s.tau.iter().map(|(v, t)| (*v, t.log10())).collect(),
            true,
        ));
        if s.tau.len() > 1 {
            let n = 60;
            curves.push(curve(
                label("interpolated", s.temp),
                (0..=n)
                    .map(|i| {
                        let v = v1 + (vn - v1) * f64::from(i) / f64::from(n);
                        (v, ln_linear(&s.tau, v).0.log10())
                    })
                    .collect(),
                false,
            ));
        }
        if let (Some(ss), true) = (case.ss, low < v1) {
            let n = 40;
            curves.push(curve(
                label("bound below", s.temp),
                (0..=n)
                    .map(|i| {
                        let v = low + (v1 - low) * f64::from(i) / f64::from(n);
                        (v, tau_bound_below(v1, tau1, ss, v).log10())
                    })
                    .collect(),
                false,
            ));
        }
    }
    curves.push(curve(
        "operating points".into(),
        report
            .points
            .iter()
            .map(|p| (p.vdd, p.tau_s.log10()))
            .collect(),
        true,
    ));
    let mut p = Plot::new(
        "plot-tau",
        "tau against supply voltage",
        ("VDD (V)", "V", Spacing::Linear),
    )
    .y("log10_tau_s", "tau (s)");
    p.curves = curves;
    p
}

/// log10 MTBF (years) at each operating point against its VDD, one line per
/// temperature, with the target.
pub fn mtbf_vs_vdd(case: &SupplyCase, report: &SupplyReport) -> Plot {
    let mut temps: Vec<Option<f64>> = report.points.iter().map(|p| p.temp).collect();
    temps.dedup();
    temps.sort_by(|a, b| a.unwrap_or(0.0).total_cmp(&b.unwrap_or(0.0)));
    temps.dedup();
    let curves = temps
        .iter()
        .map(|t| {
            let mut pts: Vec<(f64, f64)> = report
                .points
                .iter()
                .filter(|p| p.temp == *t)
                .map(|p| (p.vdd, p.log10_mtbf_s - YEAR_S.log10()))
                .collect();
            pts.sort_by(|a, b| a.0.total_cmp(&b.0));
            curve(label("MTBF", *t), pts, false)
        })
        .collect();
    let mut p = Plot::new(
        "plot-mtbf",
        "MTBF at each operating point",
        ("VDD (V)", "V", Spacing::Linear),
    )
    .y("log10_mtbf_years", "MTBF (years)");
    p.curves = curves;
    p.hline = case.cases[0]
        .case
        .target
        .map(|t| (t.log10_mtbf_years(), "target".to_string()));
    p
}

/// The stages each operating point needs for the target (with a target).
pub fn stages(report: &SupplyReport) -> Option<Plot> {
    let pts: Vec<(f64, f64)> = report
        .points
        .iter()
        .enumerate()
        .filter_map(|(i, p)| match p.min_stages? {
            StagesNeeded::Stages(n) => Some(((i + 1) as f64, n as f64)),
            _ => None,
        })
        .collect();
    if report.points.iter().all(|p| p.min_stages.is_none()) {
        return None;
    }
    let mut p = Plot::new(
        "plot-stages",
        "Stages needed at each operating point",
        ("operating point", "", Spacing::Integer),
    )
    .y("stages", "flip-flops")
    .linear_y("");
    p.curves = vec![curve(String::new(), pts, true)];
    p.x_names = report.points.iter().map(|p| p.corner.clone()).collect();
    Some(p)
}
