//! satline: a cited, temperature-dependent solubility reference for people who make aqueous
//! products, with a query language of its own.
//!
//! Stages, each in its own module: `query` turns text into statements, `engine` answers them
//! from the in-memory `catalog`, which is built from the SQLite `store`; `science` holds the
//! pure computations; `output` renders answers.
#![forbid(unsafe_code)]

pub mod answer;
pub mod catalog;
pub mod citation;
pub mod engine;
pub mod error;
pub mod frontend;
pub mod librarian;
pub mod model;
pub mod number;
pub mod output;
pub mod plot;
pub mod query;
pub mod science;
pub mod server;
pub mod store;
pub mod text;

pub use error::Error;

/// Seed files compiled into the binary.
pub mod seed_files {
    include!(concat!(env!("OUT_DIR"), "/seed_files.rs"));
}
