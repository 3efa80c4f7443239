//! The list of calculators: adding one is one entry in the `register!` line below.

use crate::calculator::{About, Calculator, Visit};

macro_rules! register {
    ($($calc:ty),+ $(,)?) => {
        /// Every calculator, in navigation order.
        pub const ALL: &[About] = &[$(About::of::<$calc>()),+];

        /// Runs `work` with the calculator called `name`; `None` when there is none.
        pub fn dispatch<V: Visit>(name: &str, work: V) -> Option<V::Out> {
            $(
                if name == <$calc as Calculator>::NAME {
                    return Some(work.visit::<$calc>());
                }
            )+
            None
        }
    };
}

register!(
    crate::synchronizer::SyncCalculator,
    crate::comparator::ComparatorCalculator,
    crate::characterize::FitCalculator,
    crate::budget::BudgetCalculator,
    crate::converter::ConverterCalculator,
    crate::supply::SupplyCalculator
);

/// The calculator called `name`.
pub fn find(name: &str) -> Option<&'static About> {
    ALL.iter().find(|a| a.name == name)
}
