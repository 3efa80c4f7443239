//! SAR converters (domain notes section 11): the model of which conversions run out of
//! time and how large their code errors are. The calculator around it (its fields, page
//! and command) comes next; the model is checked against the published-model values now.

pub mod model;
