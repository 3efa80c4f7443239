//! The list of calculators: adding one is one entry in the `register!` line below.

use crate::calculator::{About, Calculator, Visit};

macro_rules! register {
    ($($feature:literal => $calc:ty),+ $(,)?) => {
        /// Every calculator built in (each is a cargo feature), in navigation order.
        pub const ALL: &[About] = &[$(#[cfg(feature = $feature)] About::of::<$calc>()),+];

        /// Runs `work` with the calculator called `name`; `None` when there is none.
        pub fn dispatch<V: Visit>(name: &str, work: V) -> Option<V::Out> {
            $(
                #[cfg(feature = $feature)]
                if name == <$calc as Calculator>::NAME {
                    return Some(work.visit::<$calc>());
                }
            )+
            None
        }
    };
}

register!(
    "sync" => crate::synchronizer::SyncCalculator,
    "comparator" => crate::comparator::ComparatorCalculator,
    "fit" => crate::characterize::FitCalculator,
    "budget" => crate::budget::BudgetCalculator,
    "converter" => crate::converter::ConverterCalculator,
    "supply" => crate::supply::SupplyCalculator
);

/// The calculator called `name`.
pub fn find(name: &str) -> Option<&'static About> {
    ALL.iter().find(|a| a.name == name)
}
