//! Fuzz target: a link's query, through a whole calculator. The first byte picks the
//! calculator, the rest is the query. Reading, evaluating, the readouts, the JSON
//! report, every plot (drawn to SVG) and its CSV must never panic, hang or show NaN,
//! inf or a null without a reason.
#![no_main]

use latchwise::calculator::{query_inputs, Calculator, Visit};
use latchwise::registry::{dispatch, ALL};
use libfuzzer_sys::fuzz_target;

mod whole;

/// The query read as calculator `C` reads a link, then checked whole.
struct Query<'a>(&'a str);

impl Visit for Query<'_> {
    type Out = ();

    fn visit<C: Calculator>(self) {
        whole::Whole(query_inputs::<C>(self.0)).visit::<C>();
    }
}

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let query = String::from_utf8_lossy(rest);
    let name = ALL[usize::from(pick) % ALL.len()].name;
    dispatch(name, Query(&query));
});
