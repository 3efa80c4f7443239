//! A comparator's decision-time sweep: tau and the input that needs no regeneration,
//! `v0 = vmin / gain`, from decision times measured at several inputs.
//!
//! Model (domain notes section 4): `t = tau ln(v0 / vin)`, a straight line in `ln vin`
//! of slope `-tau`.

use super::line::{self, Line};

/// The comparator-sweep fit.
#[derive(Debug, Clone, PartialEq)]
pub struct DecisionFit {
    /// tau, s.
    pub tau: f64,
    /// Its 95 % interval (Student t); an end is `None` where the data do not bound it.
    pub tau_ci: (Option<f64>, Option<f64>),
    /// v0 = vmin / gain, V.
    pub v0: f64,
    /// Its 95 % interval (from the interval of ln v0 by the delta method); an end is
    /// `None` where it is beyond any voltage an f64 holds.
    pub v0_ci: (Option<f64>, Option<f64>),
    /// Residual spread of the decision times, s.
    pub spread: f64,
    /// The line in ln vin.
    pub line: Line,
}

/// Why a sweep cannot be fitted.
pub fn problem(rows: usize) -> Option<String> {
    (rows < 3).then(|| {
        format!("{rows} rows: a line with an interval needs at least three (vin, time) rows")
    })
}

/// Fits tau and v0 to (vin, time) rows.
///
/// # Errors
/// The reason in words: too few rows, one input only, or times that do not fall as the
/// input grows.
pub fn fit(vin: &[f64], time: &[f64]) -> Result<DecisionFit, String> {
    if let Some(p) = problem(vin.len()) {
        return Err(p);
    }
    let x: Vec<f64> = vin.iter().map(|v| v.ln()).collect();
    let l = line::fit(&x, time)
        .ok_or("every row has the same vin: the sweep needs two or more inputs")?;
    if l.slope >= 0.0 {
        return Err("the decision time does not fall as vin grows: check the columns".into());
    }
    let tau = -l.slope;
    let t = l.t95();
    let se_tau = l.var_slope.sqrt();
    // ln v0 = intercept / tau = -intercept / slope; its variance by the delta method.
    let ln_v0 = -l.intercept / l.slope;
    let (da, db) = (-1.0 / l.slope, l.intercept / (l.slope * l.slope));
    let var = da * da * l.var_intercept + db * db * l.var_slope + 2.0 * da * db * l.cov;
    let se_ln_v0 = var.max(0.0).sqrt();
    let v0 = ln_v0.exp();
    if !v0.is_normal() || v0 > 1e300 {
        return Err(
            "the fitted v0 = vmin/gain is beyond any voltage: the decision times do \
                    not follow tau ln(v0/vin); check the data"
                .into(),
        );
    }
    Ok(DecisionFit {
        tau,
        tau_ci: (line::bound(tau - t * se_tau), line::bound(tau + t * se_tau)),
        v0,
        v0_ci: (
            line::bound((ln_v0 - t * se_ln_v0).exp()),
            line::bound((ln_v0 + t * se_ln_v0).exp()),
        ),
        spread: l.spread,
        line: l,
    })
}
