//! One design row at one corner is one synchronizer case: the row's own cells, with the
//! corner's values (the row's cell class's, the row's clock domain's) where the row gives
//! none, read by the synchronizer's own field reader into its own model.

use std::sync::Arc;

use crate::crossing::fields as sync;
use crate::crossing::{SyncCase, Synchronizer};
use crate::error::{ParamError, ParamErrors};
use crate::params::{FieldSpec, RawInputs};
use crate::table::TextMap;

/// The synchronizer's inputs a design row may give: every input of `latchwise sync` but
/// the target and the fleet, which belong to the whole design.
pub const ROW_FIELDS: [FieldSpec; 21] = [
    sync::TAU,
    sync::TW,
    sync::T0,
    sync::TSU,
    sync::TCQ,
    sync::FCLK,
    sync::FDATA,
    sync::STAGES,
    sync::TR,
    sync::CROSSING,
    sync::FLAUNCH,
    sync::ACTIVITY,
    sync::INCREMENTS,
    sync::TRANSFERS,
    sync::RATIO,
    sync::JITTER,
    sync::PHASE,
    sync::TAU_MASTER,
    sync::TAU_SLAVE,
    sync::DUTY,
    sync::TW2,
];

/// The values a corner lends a row that gives none of its own, each by its field name
/// (`tau`, `tw`, `t0`, `tsu`, `tcq`, `fclk`, `flaunch`), in seconds or hertz.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Lent {
    /// tau.
    pub tau: Option<f64>,
    /// The window: its value and whether it is t0.
    pub window: Option<(f64, bool)>,
    /// Setup time.
    pub tsu: Option<f64>,
    /// Clock-to-output delay.
    pub tcq: Option<f64>,
    /// The sampling clock (from the row's domain).
    pub fclk: Option<f64>,
    /// The launching clock (from the row's launch domain).
    pub flaunch: Option<f64>,
}

/// A row read at one corner: its synchronizer and what the synchronizer's reader said.
#[derive(Debug, Clone, PartialEq)]
pub struct RowCase {
    /// The synchronizer (shared by equal rows at the same corner).
    pub sync: Arc<Synchronizer>,
    /// The warnings `latchwise sync` gives for the same inputs, less those about values
    /// the corner lent (which the corners table answers for), and the row's own inputs
    /// that this case does not use.
    pub warnings: Vec<String>,
    /// The rate law's two terms at the case's own stages (see
    /// [`Synchronizer::log10_rate_terms`]), once per distinct case.
    pub terms: (f64, f64),
}

/// A number as text that reads back as the same number (Rust prints the shortest such).
fn exact(v: f64) -> String {
    format!("{v:e}")
}

/// The inputs of one row at one corner: the row's own cells, then what the corner lends
/// where the row gives nothing. Only values the case uses are lent, so that the "not
/// used" list names the row's own cells only.
pub fn inputs(own: &[(&'static str, &str)], lent: &Lent) -> Vec<(&'static str, String)> {
    let has = |n: &str| own.iter().any(|(k, _)| *k == n);
    let mut v: Vec<(&'static str, String)> =
        own.iter().map(|(k, t)| (*k, (*t).to_string())).collect();
    let latch_given =
        has(sync::TAU.name) || has(sync::TAU_MASTER.name) || has(sync::TAU_SLAVE.name);
    if !latch_given {
        if let Some(t) = lent.tau {
            v.push((sync::TAU.name, exact(t)));
        }
    }
    let t0 = if has(sync::TW.name) || has(sync::T0.name) {
        has(sync::T0.name) && !has(sync::TW.name)
    } else {
        match lent.window {
            Some((w, true)) => {
                v.push((sync::T0.name, exact(w)));
                true
            }
            Some((w, false)) => {
                v.push((sync::TW.name, exact(w)));
                false
            }
            None => false,
        }
    };
    // The chain's times apply without tr; tcq only with tw; neither under the
    // master-slave bound (tw2), which counts whole periods.
    let chain = !has(sync::TR.name) && !has(sync::TW2.name);
    // Nothing is assumed: a chain that neither the row nor the corner times is refused
    // by the synchronizer's reader, naming the value.
    if let (true, false, Some(t)) = (chain, has(sync::TSU.name), lent.tsu) {
        v.push((sync::TSU.name, exact(t)));
    }
    if let (true, false, false, Some(t)) = (chain, t0, has(sync::TCQ.name), lent.tcq) {
        v.push((sync::TCQ.name, exact(t)));
    }
    if let Some(f) = lent.fclk {
        v.retain(|(k, _)| *k != sync::FCLK.name);
        v.push((sync::FCLK.name, exact(f)));
    }
    let signal = own
        .iter()
        .any(|(k, t)| *k == sync::CROSSING.name && t.trim().eq_ignore_ascii_case("signal"));
    if let (Some(f), true) = (lent.flaunch, signal) {
        v.retain(|(k, _)| *k != sync::FLAUNCH.name);
        v.push((sync::FLAUNCH.name, exact(f)));
    }
    v
}

/// Reads rows into synchronizer cases, once per distinct set of inputs (a design's rows
/// mostly repeat a few clocks, rates and depths). When reads are remembered (a page reading
/// its design again on every edit, see [`crate::table::remember_rows`]), the cases of the
/// last read are kept for the next, so that an edit reads only the rows it changed.
#[derive(Debug, Default)]
pub struct RowReader {
    seen: Cases,
    /// The last read's cases, when remembered: moved into `seen` as they are used again.
    last: Cases,
    key: Vec<u8>,
}

type Cases = TextMap<Vec<u8>, Result<Arc<RowCase>, ParamErrors>>;

thread_local! {
    /// The cases of the last design read while reads are remembered.
    static LAST: std::cell::RefCell<Cases> = std::cell::RefCell::new(Cases::default());
}

impl RowReader {
    /// A reader that starts from the last read's cases when reads are remembered.
    pub fn new() -> RowReader {
        let last = if crate::table::remembering() {
            LAST.with(|l| std::mem::take(&mut *l.borrow_mut()))
        } else {
            Cases::default()
        };
        RowReader {
            last,
            ..RowReader::default()
        }
    }

    /// Done reading: when reads are remembered, this read's cases are kept for the next
    /// (and the last read's unused ones dropped).
    pub fn finish(self) {
        if crate::table::remembering() {
            LAST.with(|l| *l.borrow_mut() = self.seen);
        }
    }

    /// The case of one row at one corner, by the synchronizer's reader and model.
    ///
    /// # Errors
    /// The synchronizer's errors for these inputs, each naming its field.
    pub fn read(
        &mut self,
        own: &[(&'static str, &str)],
        lent: &Lent,
    ) -> Result<Arc<RowCase>, ParamErrors> {
        let key = &mut self.key;
        key.clear();
        push_pieces(key, own.iter().flat_map(|(k, t)| [*k, *t]));
        let (w, t0) = lent.window.map_or((None, false), |(w, t0)| (Some(w), t0));
        for v in [lent.tau, w, lent.tsu, lent.tcq, lent.fclk, lent.flaunch] {
            key.extend_from_slice(&v.map_or(u64::MAX, f64::to_bits).to_le_bytes());
        }
        key.push(u8::from(t0));
        if let Some(done) = self.seen.get(key.as_slice()) {
            return done.clone();
        }
        let out = match self.last.remove(key.as_slice()) {
            Some(done) => done,
            None => read_afresh(own, lent),
        };
        self.seen.insert(self.key.clone(), out.clone());
        out
    }
}

/// The case of one row at one corner, read afresh.
fn read_afresh(own: &[(&'static str, &str)], lent: &Lent) -> Result<Arc<RowCase>, ParamErrors> {
    let pairs = inputs(own, lent);
    let raw = RawInputs::from_pairs(pairs.iter().map(|(k, t)| (*k, t.as_str())));
    let given = |n: &str| own.iter().any(|(k, _)| *k == n);
    SyncCase::from_inputs(&raw).map(|case| {
        let lent_names: Vec<&str> = pairs
            .iter()
            .map(|(k, _)| *k)
            .filter(|k| !given(k))
            .chain(lent.fclk.map(|_| sync::FCLK.name))
            .chain(lent.flaunch.map(|_| sync::FLAUNCH.name))
            .collect();
        let warnings = crate::crossing::warnings(&case, case.sync.log10_p_fail())
            .into_iter()
            .filter(|w| !lent_names.iter().any(|n| w.starts_with(&format!("{n} = "))))
            // Said once for the design, not per row.
            .filter(|w| !w.starts_with("Window counted from the clock edge"))
            .chain(
                case.unused
                    .iter()
                    .map(|u| format!("{u} is not used by this row's case.")),
            )
            .collect();
        let terms = case.sync.log10_rate_terms(case.sync.stages());
        Arc::new(RowCase {
            sync: Arc::new(case.sync),
            warnings,
            terms,
        })
    })
}

/// Whether an error of the synchronizer's reader concerns a value the corner lent (its
/// own, its class's or its domain's), rather than one of the row's cells or a value no
/// one gave.
pub fn lent_error(e: &ParamError, own: &[(&'static str, &str)], lent: &Lent) -> bool {
    match e.field {
        f if f == sync::FCLK.name => lent.fclk.is_some(),
        f if f == sync::FLAUNCH.name => lent.flaunch.is_some(),
        f => inputs(own, lent)
            .iter()
            .any(|(k, _)| *k == f && !own.iter().any(|(o, _)| *o == f)),
    }
}

/// Appends texts to a key, each with its length first, so that no two different lists of
/// texts run together into the same key whatever the texts hold.
pub(super) fn push_pieces<'a>(key: &mut Vec<u8>, pieces: impl IntoIterator<Item = &'a str>) {
    for piece in pieces {
        key.extend_from_slice(&(piece.len() as u64).to_le_bytes());
        key.extend_from_slice(piece.as_bytes());
    }
}
