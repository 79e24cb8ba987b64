//! The query language: text to a typed syntax tree, with errors that point into the text.
//! Knows nothing of the store or the catalog; solute names stay names for the engine.

pub mod ast;
pub mod error;
pub mod lexicon;
pub mod parse;

pub use ast::*;
pub use error::{ParseError, ParseErrorKind, line_column};
pub use parse::{Env, parse_script, parse_statement, parse_with};
