//! The WebAssembly binding: one set of exports for every calculator, chosen by name.
//! Query text in; field states, readouts and notes out; charts drawn into the page's
//! canvases. No model logic lives here.

use plotters::prelude::IntoDrawingArea;
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingBackend, DrawingErrorKind,
};
use plotters_canvas::CanvasBackend;

/// The canvas backend's error type (not exported by name).
type CanvasError = <CanvasBackend as DrawingBackend>::ErrorType;
use serde::Serialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::CanvasRenderingContext2d;
use web_sys::HtmlCanvasElement;

use std::any::Any;
use std::cell::{Cell, RefCell};
use std::rc::Rc;

use crate::calculator::{
    compact_query as compact, plot_csv, query_inputs, Calculator, RowFigures, Visit,
};
use crate::chart::{draw as draw_chart, Plot};
use crate::error::ParamErrors;
use crate::params::{echo_fields, FieldEcho, RawInputs};
use crate::readout::Readout;
use crate::registry::dispatch;
use crate::reliability::CAUTION;

/// Installs a panic hook that reports to the console, so that a bug shows up as a
/// message instead of a silent stop.
#[wasm_bindgen(start)]
pub fn start() {
    // A page reads its tables again on every edit: only changed lines need reading.
    crate::table::remember_rows(true);
    std::panic::set_hook(Box::new(|info| {
        web_sys::console::error_1(&format!("latchwise internal error: {info}").into());
    }));
}

#[derive(Serialize)]
struct FieldState {
    #[serde(flatten)]
    echo: FieldEcho,
    error: Option<String>,
    /// A table's problems as data (line, columns, message): the page marks cells from
    /// these, never by reading the message's text.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    problems: Vec<crate::error::TableProblem>,
}

#[derive(Serialize)]
struct PageState {
    ok: bool,
    fields: Vec<FieldState>,
    readouts: Vec<Readout>,
    facts: Vec<String>,
    links: Vec<(String, String)>,
    warnings: Vec<String>,
    ignored: Vec<String>,
    ignored_total: usize,
    unused: Vec<&'static str>,
    caution: &'static str,
    /// Each column's values are set by [`page_to_js`], as one `Float64Array`.
    figures: Vec<RowFigures>,
    /// The calculator's short table of results, on pages that show one.
    table: Option<crate::calculator::TextTable>,
    /// The evaluation it comes from, by number, for [`draw_evaluation`].
    evaluation: u32,
}

/// The most unknown link parameters the page names; the rest are counted.
const MOST_IGNORED_NAMED: usize = 10;

/// A value as the page reads it: written as JSON by the core and parsed by the browser's
/// own `JSON.parse`, which builds the objects natively instead of setting each property
/// across the boundary.
fn to_js<T: Serialize>(v: &T) -> Result<JsValue, JsError> {
    let text = serde_json::to_string(v).map_err(|e| JsError::new(&e.to_string()))?;
    js_sys::JSON::parse(&text).map_err(|_| JsError::new("the core wrote JSON the page cannot read"))
}

/// A page state as a JS value. The table figures (one value per data row, tens of
/// thousands on a large design) go across as one `Float64Array` per column, NaN where a
/// figure does not apply: element by element through serde they took about a tenth of an
/// edit's time on a 10,000-row design.
fn page_to_js(mut state: PageState) -> Result<JsValue, JsError> {
    let values: Vec<Vec<Vec<f64>>> = state
        .figures
        .iter_mut()
        .map(|f| {
            f.columns
                .iter_mut()
                .map(|c| {
                    let v = std::mem::take(&mut c.values);
                    v.into_iter().map(|x| x.unwrap_or(f64::NAN)).collect()
                })
                .collect()
        })
        .collect();
    let js = to_js(&state)?;
    let figures = js_sys::Array::from(&get(&js, "figures")?);
    for (i, columns) in values.iter().enumerate() {
        let heads = js_sys::Array::from(&get(&figures.get(i as u32), "columns")?);
        for (j, v) in columns.iter().enumerate() {
            set(
                &heads.get(j as u32),
                "values",
                &js_sys::Float64Array::from(&v[..]),
            )?;
        }
    }
    Ok(js)
}

fn get(target: &JsValue, key: &str) -> Result<JsValue, JsError> {
    js_sys::Reflect::get(target, &JsValue::from_str(key))
        .map_err(|_| JsError::new("could not read a property of the page state"))
}

fn set(target: &JsValue, key: &str, value: &JsValue) -> Result<(), JsError> {
    js_sys::Reflect::set(target, &JsValue::from_str(key), value)
        .map(|_| ())
        .map_err(|_| JsError::new("could not set a property of the page state"))
}

fn unknown(name: &str) -> JsError {
    JsError::new(&format!(
        "no calculator is called '{name}' in this page's core"
    ))
}

/// A query as calculator `C` reads and evaluates it.
struct Evaluation<C: Calculator> {
    /// Its number: each new evaluation has the next.
    id: u32,
    raw: RawInputs,
    result: Result<(C::Case, C::Report), ParamErrors>,
}

impl<C: Calculator> Evaluation<C> {
    /// Its plots (none when its inputs are not valid).
    fn plots(&self) -> Vec<Plot> {
        match &self.result {
            Ok((case, report)) => C::plots(case, report),
            Err(_) => Vec::new(),
        }
    }
}

/// A page's inputs: a query, and data tables passed beside it as (names, texts), so that
/// a large design need not be encoded into the query and decoded again on every edit.
#[derive(Clone, Copy)]
struct Given<'a> {
    query: &'a str,
    names: &'a [String],
    texts: &'a [String],
}

impl<'a> Given<'a> {
    fn query(query: &'a str) -> Self {
        Given {
            query,
            names: &[],
            texts: &[],
        }
    }
}

/// A remembered evaluation: the calculator, its inputs (query, table names and texts),
/// and its [`Evaluation`].
type Remembered = Option<(
    &'static str,
    (String, Vec<String>, Vec<String>),
    Rc<dyn Any>,
)>;

thread_local! {
    /// The last evaluation, by calculator and query: a page computes its numbers, then
    /// draws its plots from the same query in the next frame, and a large design is read
    /// and evaluated once for both.
    static LAST: RefCell<Remembered> = const { RefCell::new(None) };
    /// The number of the next new evaluation.
    static NEXT_EVALUATION: Cell<u32> = const { Cell::new(1) };
}

/// Calculator `C`'s evaluation of `given`, from the last one when it is the same.
fn evaluation<C: Calculator>(given: Given) -> Rc<Evaluation<C>> {
    LAST.with(|last| {
        if let Some((name, (q, n, t), value)) = &*last.borrow() {
            if *name == C::NAME && q == given.query && n == given.names && t == given.texts {
                if let Ok(e) = Rc::clone(value).downcast::<Evaluation<C>>() {
                    return e;
                }
            }
        }
        let mut pairs = query_inputs::<C>(given.query).pairs().to_vec();
        pairs.extend(given.names.iter().cloned().zip(given.texts.iter().cloned()));
        let raw = RawInputs::from_pairs(pairs).renamed(C::ALIASES);
        let result = C::read(&raw).map(|case| {
            let report = C::evaluate(&case);
            (case, report)
        });
        let id = NEXT_EVALUATION.with(|n| {
            let id = n.get();
            n.set(id.wrapping_add(1));
            id
        });
        let e = Rc::new(Evaluation::<C> { id, raw, result });
        let value: Rc<dyn Any> = e.clone();
        let key = (
            given.query.to_string(),
            given.names.to_vec(),
            given.texts.to_vec(),
        );
        *last.borrow_mut() = Some((C::NAME, key, value));
        e
    })
}

struct Page<'a>(Given<'a>);

impl Visit for Page<'_> {
    type Out = PageState;

    fn visit<C: Calculator>(self) -> PageState {
        let e = evaluation::<C>(self.0);
        let raw = &e.raw;
        let result = e
            .result
            .as_ref()
            .map(|(case, report)| (C::conflicts(case), C::outcome(report)));
        let errors = match &result {
            Ok((conflicts, _)) => conflicts.clone(),
            Err(e) => e.0.clone(),
        };
        let fields = echo_fields(raw, C::FIELDS)
            .into_iter()
            .map(|echo| {
                let mine = errors.iter().find(|e| e.field == echo.name);
                FieldState {
                    error: mine.map(ToString::to_string),
                    problems: match mine.map(|e| &e.kind) {
                        Some(crate::error::ParamErrorKind::Table(p)) => p.clone(),
                        _ => Vec::new(),
                    },
                    echo,
                }
            })
            .collect();
        let (ignored, ignored_total) = raw.unknown_keys(C::FIELDS, MOST_IGNORED_NAMED);
        let mut state = PageState {
            ok: result.is_ok(),
            fields,
            readouts: Vec::new(),
            facts: Vec::new(),
            links: Vec::new(),
            warnings: Vec::new(),
            ignored,
            ignored_total,
            unused: Vec::new(),
            caution: CAUTION,
            figures: Vec::new(),
            table: None,
            evaluation: e.id,
        };
        if let Ok((case, report)) = &e.result {
            state.figures = C::figures(case, report);
            if C::PAGE_TABLE {
                state.table = C::text_table(report, None);
            }
        }
        if let Ok((_, o)) = result {
            state.readouts = o.readouts;
            state.facts = o.facts;
            state.links = o.links;
            state.warnings = o.warnings;
            state.unused = o.unused;
        }
        state
    }
}

struct Plots<'a>(Given<'a>);

impl Visit for Plots<'_> {
    type Out = Vec<Plot>;

    fn visit<C: Calculator>(self) -> Vec<Plot> {
        evaluation::<C>(self.0).plots()
    }
}

struct Read<'a>(&'a str);

impl Visit for Read<'_> {
    type Out = Vec<(String, String)>;

    fn visit<C: Calculator>(self) -> Vec<(String, String)> {
        query_inputs::<C>(self.0).pairs().to_vec()
    }
}

/// The name/value pairs of a link's query as calculator `name` reads them (the same
/// reader as the command line's `--from-url`, old names read as their new ones), so that
/// the page fills its fields exactly as the core will read them.
///
/// # Errors
/// An unknown calculator, or an answer that cannot be converted to a JS value.
#[wasm_bindgen]
pub fn read_query(name: &str, query: &str) -> Result<JsValue, JsError> {
    to_js(&dispatch(name, Read(query)).ok_or_else(|| unknown(name))?)
}

struct Report<'a>(Given<'a>);

impl Visit for Report<'_> {
    type Out = Result<JsValue, JsError>;

    fn visit<C: Calculator>(self) -> Result<JsValue, JsError> {
        match &evaluation::<C>(self.0).result {
            Ok((_, report)) => to_js(report),
            Err(_) => Ok(JsValue::NULL),
        }
    }
}

/// The full report of calculator `name` for a query, as the command line's `--json`
/// prints it (the page's JSON export); `null` when the inputs cannot be read.
///
/// # Errors
/// An unknown calculator, or a report that cannot be converted to a JS value.
#[wasm_bindgen]
pub fn report(name: &str, query: &str) -> Result<JsValue, JsError> {
    dispatch(name, Report(Given::query(query))).ok_or_else(|| unknown(name))?
}

/// Evaluates the query of calculator `name`'s page: field states (text, echo, error),
/// readouts, facts, warnings and unknown keys. Plots are drawn separately by [`draw`],
/// so that the numbers can show before the first chart is laid out.
///
/// # Errors
/// An unknown calculator, or an answer that cannot be converted to a JS value.
#[wasm_bindgen]
pub fn page(name: &str, query: &str) -> Result<JsValue, JsError> {
    page_to_js(dispatch(name, Page(Given::query(query))).ok_or_else(|| unknown(name))?)
}

/// [`page`] with the data tables beside the query: `names[i]` holds `texts[i]`.
///
/// # Errors
/// As [`page`].
#[wasm_bindgen]
pub fn page_with(
    name: &str,
    query: &str,
    names: Vec<String>,
    texts: Vec<String>,
) -> Result<JsValue, JsError> {
    let given = Given {
        query,
        names: &names,
        texts: &texts,
    };
    page_to_js(dispatch(name, Page(given)).ok_or_else(|| unknown(name))?)
}

/// Draws calculator `name`'s plots into the canvases of the same ids, at `scale` device
/// pixels per CSS pixel. Returns the ids drawn (none when the inputs are invalid).
///
/// # Errors
/// An unknown calculator, or a chart that fails to draw.
#[wasm_bindgen]
pub fn draw(name: &str, query: &str, scale: f64) -> Result<Vec<String>, JsError> {
    draw_given(name, Given::query(query), scale)
}

/// [`draw`] with the data tables beside the query, as [`page_with`] takes them.
///
/// # Errors
/// As [`draw`].
#[wasm_bindgen]
pub fn draw_with(
    name: &str,
    query: &str,
    names: Vec<String>,
    texts: Vec<String>,
    scale: f64,
) -> Result<Vec<String>, JsError> {
    let given = Given {
        query,
        names: &names,
        texts: &texts,
    };
    draw_given(name, given, scale)
}

fn draw_given(name: &str, given: Given, scale: f64) -> Result<Vec<String>, JsError> {
    let plots = dispatch(name, Plots(given)).ok_or_else(|| unknown(name))?;
    draw_plots(&plots, scale)
}

/// Draws `plots` into the canvases of their ids; the ids drawn.
fn draw_plots(plots: &[Plot], scale: f64) -> Result<Vec<String>, JsError> {
    let mut drawn = Vec::new();
    for plot in plots {
        if draw_into(plot, plot.id, scale)? {
            drawn.push(plot.id.to_string());
        }
    }
    Ok(drawn)
}

/// The plots of calculator `C`'s evaluation number `id`, when it is still the last one.
struct LastPlots(u32);

impl Visit for LastPlots {
    type Out = Option<Vec<Plot>>;

    fn visit<C: Calculator>(self) -> Option<Vec<Plot>> {
        let e = LAST.with(|last| match &*last.borrow() {
            Some((name, _, value)) if *name == C::NAME => {
                Rc::clone(value).downcast::<Evaluation<C>>().ok()
            }
            _ => None,
        })?;
        if e.id != self.0 {
            return None;
        }
        Some(e.plots())
    }
}

/// [`draw`] for the evaluation a page state just came from (its `evaluation` number), so
/// that a large design is not handed to the core again to draw its plots: `None` when
/// that evaluation is no longer the last one (the page then draws with [`draw_with`]).
///
/// # Errors
/// As [`draw`].
#[wasm_bindgen]
pub fn draw_evaluation(name: &str, id: u32, scale: f64) -> Result<Option<Vec<String>>, JsError> {
    let Some(plots) = dispatch(name, LastPlots(id)).ok_or_else(|| unknown(name))? else {
        return Ok(None);
    };
    draw_plots(&plots, scale).map(Some)
}

struct Csv<'a> {
    query: &'a str,
    plot: &'a str,
    link: &'a str,
}

impl Visit for Csv<'_> {
    type Out = Option<String>;

    fn visit<C: Calculator>(self) -> Option<String> {
        plot_csv::<C>(&query_inputs::<C>(self.query), self.plot, self.link)
    }
}

/// The CSV of calculator `name`'s plot `plot` (a canvas id), opening with the case and
/// `link`; "" when the inputs are not valid or there is no such plot.
///
/// # Errors
/// An unknown calculator.
#[wasm_bindgen]
pub fn csv(name: &str, query: &str, plot: &str, link: &str) -> Result<String, JsError> {
    Ok(dispatch(name, Csv { query, plot, link })
        .ok_or_else(|| unknown(name))?
        .unwrap_or_default())
}

struct Results<'a>(&'a str);

impl Visit for Results<'_> {
    type Out = Option<String>;

    fn visit<C: Calculator>(self) -> Option<String> {
        let case = C::read(&query_inputs::<C>(self.0)).ok()?;
        let report = C::evaluate(&case);
        C::results_csv(&case, &report)
    }
}

/// The SHA-256 of `text` in hexadecimal: what identifies a printed case whose link is too
/// long to print.
#[wasm_bindgen]
pub fn sha256_hex(text: &str) -> String {
    crate::digest::sha256_hex(text.as_bytes())
}

/// Calculator `name`'s results row by row as CSV (the command's `--results`); "" when
/// the inputs are not valid or the calculator has no rows.
///
/// # Errors
/// An unknown calculator.
#[wasm_bindgen]
pub fn results_csv(name: &str, query: &str) -> Result<String, JsError> {
    Ok(dispatch(name, Results(query))
        .ok_or_else(|| unknown(name))?
        .unwrap_or_default())
}

/// Draws calculator `name`'s plot `plot` into the canvas `canvas` (an export's
/// off-screen canvas), at `scale` device pixels per CSS pixel. Returns whether it drew.
///
/// # Errors
/// An unknown calculator, or a chart that fails to draw.
#[wasm_bindgen]
pub fn draw_plot(
    name: &str,
    query: &str,
    plot: &str,
    canvas: &str,
    scale: f64,
) -> Result<bool, JsError> {
    let plots = dispatch(name, Plots(Given::query(query))).ok_or_else(|| unknown(name))?;
    match plots.iter().find(|p| p.id == plot) {
        Some(p) => draw_into(p, canvas, scale),
        None => Ok(false),
    }
}

struct Compact<'a>(&'a str);

impl Visit for Compact<'_> {
    type Out = String;

    fn visit<C: Calculator>(self) -> String {
        compact::<C>(self.0)
    }
}

/// The query of calculator `name`'s page as its links and storage hold it: data tables
/// packed where that makes them shorter.
///
/// # Errors
/// An unknown calculator.
#[wasm_bindgen]
pub fn compact_query(name: &str, query: &str) -> Result<String, JsError> {
    dispatch(name, Compact(query)).ok_or_else(|| unknown(name))
}

/// Where the header and data rows of a table's text are (0-based lines): what the page's
/// table editor changes one row by.
///
/// # Errors
/// A layout that cannot be converted to a JS value.
#[cfg(feature = "tables")]
#[wasm_bindgen]
pub fn table_layout(text: &str) -> Result<JsValue, JsError> {
    to_js(&crate::table::layout(text))
}

/// One line's cells, as the core reads them.
#[cfg(feature = "tables")]
#[wasm_bindgen]
pub fn table_split(line: &str, delimiter: char) -> Vec<String> {
    crate::table::split(line, delimiter)
}

/// One row's cells as a line, quoted where a cell needs it.
#[cfg(feature = "tables")]
#[wasm_bindgen]
pub fn table_join(cells: Vec<String>, delimiter: char) -> String {
    crate::table::join(&cells, delimiter)
}

/// Whether tables are read again only where their lines changed (on from the start; the
/// page benchmark turns it off to time the same edits without it, in the same run).
#[cfg(feature = "tables")]
#[wasm_bindgen]
pub fn remember_table_rows(on: bool) {
    crate::table::remember_rows(on);
}

/// A figure of a table's row as the page shows it.
#[cfg(feature = "tables")]
#[wasm_bindgen]
pub fn format_figure(kind: &str, value: f64) -> String {
    crate::calculator::format_figure(kind, value)
}

/// The version of the core, for printed reports.
#[wasm_bindgen]
pub fn version() -> String {
    env!("CARGO_PKG_VERSION").to_string()
}

/// Draws `plot` into the canvas with id `canvas`, sized to its CSS box times `scale`;
/// false if the page has no such canvas.
fn draw_into(plot: &Plot, canvas: &str, scale: f64) -> Result<bool, JsError> {
    let Some(canvas) = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id(canvas))
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
    let Some(context) = canvas
        .get_context("2d")
        .ok()
        .flatten()
        .and_then(|c| c.dyn_into::<CanvasRenderingContext2d>().ok())
    else {
        return Ok(false);
    };
    let Some(inner) = CanvasBackend::with_canvas_object(canvas) else {
        return Ok(false);
    };
    let backend = Measured { inner, context };
    draw_chart(&backend.into_drawing_area(), plot, scale)
        .map_err(|e| JsError::new(&e.to_string()))?;
    Ok(true)
}

/// The canvas backend with cheap text measurement: plotters measures text by adding a
/// styled `<span>` to the page and reading its size, a forced layout for every label;
/// the canvas's own `measureText` gives the width without touching the page.
struct Measured {
    inner: CanvasBackend,
    context: CanvasRenderingContext2d,
}

impl DrawingBackend for Measured {
    type ErrorType = CanvasError;

    fn get_size(&self) -> (u32, u32) {
        self.inner.get_size()
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.ensure_prepared()
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.present()
    }

    fn draw_pixel(
        &mut self,
        point: BackendCoord,
        color: BackendColor,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_pixel(point, color)
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_line(from, to, style)
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_rect(upper_left, bottom_right, style, fill)
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_path(path, style)
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_circle(center, radius, style, fill)
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.fill_polygon(vert, style)
    }

    fn draw_text<S: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &S,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.inner.draw_text(text, style, pos)
    }

    fn estimate_text_size<S: BackendTextStyle>(
        &self,
        text: &str,
        style: &S,
    ) -> Result<(u32, u32), DrawingErrorKind<CanvasError>> {
        let size = style.size();
        self.context.set_font(&format!(
            "{} {}px {}",
            style.style().as_str(),
            size,
            style.family().as_str()
        ));
        let width = self
            .context
            .measure_text(text)
            .map(|m| m.width())
            .unwrap_or(size * 0.6 * text.chars().count() as f64);
        // The line box a browser gives the same text, as the span measurement did.
        Ok((width.ceil() as u32, (size * 1.15).ceil() as u32))
    }
}
