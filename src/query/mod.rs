//! The query language: text to a typed syntax tree, with errors that point into the text.
//! Knows nothing of the store or the catalog; solute names stay names for the engine.
//!
//! ```
//! use satline::query::{Statement, Temperatures, parse_script};
//!
//! let script = "let cold = from 2 C to 8 C\n\
//!               require KCl stays dissolved at 20 g/100g water over cold margin 10%";
//! let statements = parse_script(script);
//! let Ok(require) = &statements[1] else { panic!("does not parse") };
//! let Statement::Require(r) = &require.node else { panic!("not a require") };
//! assert_eq!(r.solute.text, "KCl");
//! assert!(matches!(r.temperatures, Temperatures::Range(range) if range.high.celsius() == 8.0));
//!
//! let error = parse_script("solubility of KNO3 at 5 g/L").remove(0).unwrap_err();
//! assert_eq!(error.line_column("solubility of KNO3 at 5 g/L"), (1, 23));
//! ```

pub mod ast;
pub mod error;
pub mod fault;
pub mod invisible;
pub mod lexicon;
pub mod lines;
pub mod parse;
pub mod recipe;

pub use ast::*;
pub use error::{ParseError, ParseErrorKind, line_column};
pub use lines::LineIndex;
pub use parse::{
    Env, Statements, parse_recipe_file, parse_script, parse_statement, parse_with, statements,
};
pub use recipe::{Ingredient, Recipe, RecipeQuestion, RecipeStatement};

/// Every word of the language, sorted and each once (for completion and help).
pub fn keywords() -> Vec<&'static str> {
    let mut words: Vec<&'static str> = lexicon::keywords().collect();
    words.sort_unstable();
    words.dedup();
    words
}
