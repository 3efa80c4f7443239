//! Fuzz target: the data tables a user pastes or drops, through a whole calculator. The
//! first byte picks the table (a budget's design or corners, a fit's counts, delay sweep
//! or comparator sweep), the rest is its text; the other inputs are the demo's. Every
//! check of the query target applies (see `whole.rs`).
#![no_main]

use latchwise::budget::BudgetCalculator;
use latchwise::calculator::Visit;
use latchwise::characterize::FitCalculator;
use latchwise::params::RawInputs;
use libfuzzer_sys::fuzz_target;

mod whole;

const DESIGN: &str = include_str!("../../examples/budget-design.csv");
const CORNERS: &str = include_str!("../../examples/budget-corners.csv");

fn pairs(list: &[(&str, &str)]) -> RawInputs {
    RawInputs::from_pairs(list.iter().map(|(k, v)| (k.to_string(), v.to_string())))
}

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let text = String::from_utf8_lossy(rest);
    let t = text.as_ref();
    let sigmas = [("tau-sigma", "0.05"), ("tw-sigma", "0.3"), ("budget-fit", "10")];
    match pick % 5 {
        0 => whole::Whole(pairs(&[&[("design", t), ("corners", CORNERS)][..], &sigmas].concat()))
            .visit::<BudgetCalculator>(),
        1 => whole::Whole(pairs(&[&[("design", DESIGN), ("corners", t)][..], &sigmas].concat()))
            .visit::<BudgetCalculator>(),
        k => {
            let kind = ["counts", "delay", "comparator"][usize::from(k) - 2];
            whole::Whole(pairs(&[("kind", kind), ("data", t), ("fclk", "1GHz"), ("fdata", "50MHz")]))
                .visit::<FitCalculator>()
        }
    }
});
