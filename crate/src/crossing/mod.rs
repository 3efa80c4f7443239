//! One clock-domain crossing below the calculators: its inputs (`fields`), how they are
//! read into a case (`input`), the rate law and the chain's physics (`model`), and
//! related clocks (`clocks`). The synchronizer calculator reports on one crossing; the
//! design budget reads every row of a design as one; neither imports the other.

pub mod clocks;
pub mod fields;
pub mod input;
pub mod model;

pub use input::{warnings, Crossing, SyncCase};
pub use model::{log10_rate, ClockLimit, StagesNeeded, SyncParts, Synchronizer, TauLimit, Window};
