//! The computations behind every answer: pure functions over plain data. No I/O, no SQLite.
//! Every public function's doc comment gives its formula and its source.

pub mod acid_base;
pub mod activity;
pub mod bisect;
pub mod bounds;
pub mod common_ion;
pub mod curve;
pub mod density;
pub mod dissolving;
pub mod enthalpy;
pub mod error;
pub mod fit;
pub mod formula;
pub mod freezing;
pub mod gas;
pub mod heat;
pub mod mixture_ice;
pub mod range_minimum;
pub mod salting_out;
pub mod solve;
pub mod units;

pub use error::ScienceError;
