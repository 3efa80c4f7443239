//! Numerical tools the models share: the normal distribution in logarithms and root finding.

pub mod normal;
pub mod random;
pub mod solve;
pub mod special;
