//! The WebAssembly binding: query text in, readouts and field states out, charts drawn
//! into the page's canvases. No model logic lives here.

use plotters::prelude::IntoDrawingArea;
use plotters_canvas::CanvasBackend;
use serde::Serialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::HtmlCanvasElement;

use crate::chart::{draw, ChartSpec};
use crate::comparator::{self, unused_fields, CompCase};
use crate::error::ParamErrors;
use crate::params::{echo_fields, FieldEcho, FieldSpec, RawInputs};
use crate::readout::Readout;
use crate::sweep::comparator::{growth, p_vs_spread, p_vs_tau, p_vs_treg};
use crate::sweep::{mtbf_vs_fclk, mtbf_vs_stages, mtbf_vs_tau, Series};
use crate::synchronizer::{evaluate, SyncCase, CAUTION, FIELDS, YEAR_S};

/// Installs a panic hook that reports to the console, so that a bug shows up as a
/// message instead of a silent stop.
#[wasm_bindgen(start)]
pub fn start() {
    std::panic::set_hook(Box::new(|info| {
        web_sys::console::error_1(&format!("latchwise internal error: {info}").into());
    }));
}

#[derive(Serialize)]
struct FieldState {
    #[serde(flatten)]
    echo: FieldEcho,
    error: Option<String>,
}

#[derive(Serialize)]
struct PageState {
    ok: bool,
    fields: Vec<FieldState>,
    readouts: Vec<Readout>,
    warnings: Vec<String>,
    ignored: Vec<String>,
    unused: Vec<&'static str>,
    caution: &'static str,
}

fn field_states(
    raw: &RawInputs,
    fields: &[FieldSpec],
    errors: &[crate::error::ParamError],
) -> Vec<FieldState> {
    echo_fields(raw, fields)
        .into_iter()
        .map(|echo| FieldState {
            error: errors
                .iter()
                .find(|e| e.field == echo.name)
                .map(|e| e.to_string()),
            echo,
        })
        .collect()
}

fn to_js<T: Serialize>(v: &T) -> Result<JsValue, JsError> {
    v.serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(|e| JsError::new(&e.to_string()))
}

/// The sweeps the synchronizer page plots, keyed by the id of their canvas.
fn sync_series(case: &SyncCase) -> Vec<(&'static str, &'static str, Series)> {
    let s = &case.sync;
    vec![
        (
            "plot-stages",
            "MTBF against synchronizer depth",
            mtbf_vs_stages(s, (s.stages + 4).max(6)),
        ),
        (
            "plot-fclk",
            "MTBF against clock frequency",
            mtbf_vs_fclk(s, 200),
        ),
        ("plot-tau", "MTBF against tau", mtbf_vs_tau(s, 200)),
    ]
}

fn target_years(case: &SyncCase) -> Option<f64> {
    case.target.map(|t| -t.log10_max_rate() - YEAR_S.log10())
}

/// What a successful evaluation shows: readouts, warnings and the fields it did not use.
type Shown = (Vec<Readout>, Vec<String>, Vec<&'static str>);

/// The page state for any calculator: field states from `fields`, and readouts and
/// warnings from a successful evaluation.
fn page_state(
    raw: &RawInputs,
    fields: &[FieldSpec],
    result: Result<Shown, ParamErrors>,
) -> PageState {
    let errors = result
        .as_ref()
        .err()
        .map(|e| e.0.clone())
        .unwrap_or_default();
    let mut state = PageState {
        ok: result.is_ok(),
        fields: field_states(raw, fields, &errors),
        readouts: Vec::new(),
        warnings: Vec::new(),
        ignored: raw.unknown_keys(fields),
        unused: Vec::new(),
        caution: CAUTION,
    };
    if let Ok((readouts, warnings, unused)) = result {
        state.readouts = readouts;
        state.warnings = warnings;
        state.unused = unused;
    }
    state
}

/// Evaluates the synchronizer page's query: field states (text, echo, error), readouts,
/// warnings, unknown keys. Plots are drawn separately by [`sync_draw`], so that the
/// numbers can show before the first charts are laid out.
///
/// # Errors
/// Only if the answer cannot be converted to a JS value.
#[wasm_bindgen]
pub fn sync_page(query: &str) -> Result<JsValue, JsError> {
    let raw = RawInputs::from_query(query);
    let result = SyncCase::from_inputs(&raw).map(|case| {
        let report = evaluate(&case);
        (report.readouts(), report.warnings, Vec::new())
    });
    to_js(&page_state(&raw, FIELDS, result))
}

/// Draws the synchronizer page's plots into the canvases of the same ids, at `scale`
/// device pixels per CSS pixel. Returns the ids drawn (none when the inputs are invalid).
///
/// # Errors
/// If a chart fails to draw.
#[wasm_bindgen]
pub fn sync_draw(query: &str, scale: f64) -> Result<Vec<String>, JsError> {
    let Ok(case) = SyncCase::from_inputs(&RawInputs::from_query(query)) else {
        return Ok(Vec::new());
    };
    let target = target_years(&case);
    let mut drawn = Vec::new();
    for (id, title, series) in sync_series(&case) {
        let spec = ChartSpec::from_series(&series, title, target, scale);
        if draw_into(id, &spec, scale)? {
            drawn.push(id.to_string());
        }
    }
    Ok(drawn)
}

/// The CSV of one of the synchronizer page's plots (`plot-stages`, `plot-fclk`, `plot-tau`),
/// or an empty string when the inputs are not valid.
#[wasm_bindgen]
pub fn sync_csv(query: &str, plot: &str) -> String {
    match SyncCase::from_inputs(&RawInputs::from_query(query)) {
        Ok(case) => sync_series(&case)
            .into_iter()
            .find(|(id, _, _)| *id == plot)
            .map(|(_, _, s)| s.to_csv())
            .unwrap_or_default(),
        Err(_) => String::new(),
    }
}

/// Draws into the canvas `id` sized to its CSS box times `scale`; false if there is none.
fn draw_into(id: &str, spec: &ChartSpec, scale: f64) -> Result<bool, JsError> {
    let Some(canvas) = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id(id))
        .and_then(|e| e.dyn_into::<HtmlCanvasElement>().ok())
    else {
        return Ok(false);
    };
    let (w, h) = (
        canvas.client_width().max(200),
        canvas.client_height().max(150),
    );
    let (pw, ph) = (
        (f64::from(w) * scale).round() as u32,
        (f64::from(h) * scale).round() as u32,
    );
    if canvas.width() != pw || canvas.height() != ph {
        canvas.set_width(pw);
        canvas.set_height(ph);
    }
    let Some(backend) = CanvasBackend::with_canvas_object(canvas) else {
        return Ok(false);
    };
    draw(&backend.into_drawing_area(), spec).map_err(|e| JsError::new(&e))?;
    Ok(true)
}

/// The sweeps the comparator page plots, keyed by the id of their canvas.
fn comparator_series(case: &CompCase) -> Vec<(&'static str, &'static str, Series)> {
    let c = &case.comp;
    let spread = match c.input {
        comparator::InputModel::Gaussian { .. }
        | comparator::InputModel::Nrz { .. }
        | comparator::InputModel::Pam4 { .. } => "Error probability against input noise",
        _ => "Error probability against threshold spacing",
    };
    vec![
        (
            "plot-treg",
            "Error probability against regeneration time",
            p_vs_treg(c, 200),
        ),
        (
            "plot-ctau",
            "Error probability against tau",
            p_vs_tau(c, 200),
        ),
        ("plot-spread", spread, p_vs_spread(c, 60)),
    ]
}

/// Evaluates the comparator page's query (see [`sync_page`]).
///
/// # Errors
/// Only if the answer cannot be converted to a JS value.
#[wasm_bindgen]
pub fn comparator_page(query: &str) -> Result<JsValue, JsError> {
    let raw = RawInputs::from_query(query);
    let result = CompCase::from_inputs(&raw).map(|case| {
        let report = comparator::evaluate(&case, unused_fields(&raw, case.comp.input.name()));
        (report.readouts(), report.warnings, report.unused)
    });
    to_js(&page_state(&raw, comparator::FIELDS, result))
}

/// Draws the comparator page's plots (three sweeps and the growth curves).
///
/// # Errors
/// If a chart fails to draw.
#[wasm_bindgen]
pub fn comparator_draw(query: &str, scale: f64) -> Result<Vec<String>, JsError> {
    let Ok(case) = CompCase::from_inputs(&RawInputs::from_query(query)) else {
        return Ok(Vec::new());
    };
    let target = case.target_ber.map(f64::log10);
    let mut drawn = Vec::new();
    for (id, title, series) in comparator_series(&case) {
        let spec = ChartSpec::from_series(&series, title, target, scale);
        if draw_into(id, &spec, scale)? {
            drawn.push(id.to_string());
        }
    }
    let curves = growth(&case.comp, 240);
    let spec = ChartSpec {
        title: "Latch output growth, dv = gain vin exp(t/tau)".into(),
        x_label: "t (s)".into(),
        x_unit: "s",
        x_spacing: crate::sweep::Spacing::Linear,
        y_label: "output difference dv (V)".into(),
        curves: curves
            .iter()
            .map(|(label, pts)| crate::chart::Curve {
                label: label.clone(),
                points: pts,
            })
            .collect(),
        hline: Some((case.comp.vmin.get().log10(), "vmin".into())),
        vline: Some((case.comp.treg_total(), "treg".into())),
        marker: None,
        scale,
    };
    if draw_into("plot-growth", &spec, scale)? {
        drawn.push("plot-growth".to_string());
    }
    Ok(drawn)
}

/// The CSV of one of the comparator page's sweeps, or "" when the inputs are not valid.
#[wasm_bindgen]
pub fn comparator_csv(query: &str, plot: &str) -> String {
    let Ok(case) = CompCase::from_inputs(&RawInputs::from_query(query)) else {
        return String::new();
    };
    if plot == "plot-growth" {
        let mut out = String::from("curve,t_s,log10_dv_v\n");
        for (label, pts) in growth(&case.comp, 240) {
            for (t, l) in pts {
                out.push_str(&format!("\"{label}\",{t:e},{l}\n"));
            }
        }
        return out;
    }
    comparator_series(&case)
        .into_iter()
        .find(|(id, _, _)| *id == plot)
        .map(|(_, _, s)| s.to_csv())
        .unwrap_or_default()
}
