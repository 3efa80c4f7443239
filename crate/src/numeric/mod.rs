//! Numerical tools the models share: the normal distribution in logarithms and root finding.

pub mod normal;
pub mod solve;
pub mod special;
pub mod random;
