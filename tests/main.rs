//! Integration tests: one binary with a module per area.
#![allow(clippy::unwrap_used, clippy::print_stdout)]

mod budget;
mod budget_rows;
mod cli;
mod comparator;
mod converter;
mod fits;
mod invariants;
mod lab;
mod links;
mod plot;
mod properties;
mod readme;
mod reference;
mod seeded;
mod supply;
mod tidy;
mod tolerance;
