//! The nom parser: script text to typed statements. Splits a script into statements, parses
//! each with nom (`context` names what a rule expects, `cut` commits once a keyword has chosen
//! the branch), resolves `let` names from an environment, and turns every fault into a
//! `ParseError` with a span into the whole script.

use std::collections::BTreeMap;

use nom::Err as NomErr;

use super::ast::*;
use super::error::{ParseError, ParseErrorKind};
use super::recipe::{Recipe, RecipeQuestion, RecipeStatement};

mod clause;
mod dissolving;
mod plumbing;
mod quantity;
mod recipe;
mod recipe_file;
mod statement;

pub use recipe_file::parse_recipe_file;

use plumbing::{Cx, shorten};
use statement::statement;

/// Values bound by `let`, kept across the statements of one script, or across the lines of
/// a REPL session. Names are compared without regard to case.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Env {
    bindings: BTreeMap<String, Value>,
    /// Recipes bound by `let NAME = recipe ...` or loaded from a recipe file.
    recipes: BTreeMap<String, Recipe>,
}

impl Env {
    pub fn new() -> Self {
        Env::default()
    }

    pub fn get(&self, name: &str) -> Option<&Value> {
        self.bindings.get(&name.to_lowercase())
    }

    /// Binds `name`, replacing an earlier binding of the same name.
    pub fn bind(&mut self, name: &str, value: Value) {
        self.recipes.remove(&name.to_lowercase());
        self.bindings.insert(name.to_lowercase(), value);
    }

    /// The recipe bound to `name`, if it is one.
    pub fn recipe(&self, name: &str) -> Option<&Recipe> {
        self.recipes.get(&name.to_lowercase())
    }

    /// Binds `name` to a recipe, replacing an earlier binding of the same name.
    pub fn bind_recipe(&mut self, name: &str, recipe: Recipe) {
        self.bindings.remove(&name.to_lowercase());
        self.recipes.insert(name.to_lowercase(), recipe);
    }

    /// The bound names, values and recipes, in alphabetical order (for completion and
    /// "did you mean").
    pub fn names(&self) -> impl Iterator<Item = &str> {
        let mut names: Vec<&str> = self
            .bindings
            .keys()
            .chain(self.recipes.keys())
            .map(String::as_str)
            .collect();
        names.sort_unstable();
        names.into_iter()
    }

    pub fn is_empty(&self) -> bool {
        self.bindings.is_empty() && self.recipes.is_empty()
    }

    /// Applies what a statement that parsed binds: a `let` value or a recipe.
    fn apply(&mut self, statement: &Statement) {
        match statement {
            Statement::Let(binding) => self.bind(&binding.name.text, binding.value),
            Statement::Recipe(RecipeStatement {
                recipe,
                question: RecipeQuestion::Define,
                ..
            }) => {
                if let Some(name) = &recipe.name {
                    self.bind_recipe(&name.text, recipe.clone());
                }
            }
            _ => {}
        }
    }
}

/// Parses a script with a fresh environment: one result per statement, in order. Blank and
/// comment-only lines yield nothing.
pub fn parse_script(text: &str) -> Vec<Result<Located<Statement>, ParseError>> {
    parse_with(text, &mut Env::new())
}

/// Parses a script (or one REPL line) with an environment the caller keeps: each `let` that
/// parses binds its name for the statements after it and for later calls.
pub fn parse_with(text: &str, env: &mut Env) -> Vec<Result<Located<Statement>, ParseError>> {
    let mut results = Vec::new();
    for (start, end) in statement_spans(text) {
        let result = parse_piece(text, start, end, env);
        if let Ok(located) = &result {
            env.apply(&located.node);
        }
        results.push(result);
    }
    results
}

/// Parses text that must hold exactly one statement (a comment may follow it).
pub fn parse_statement(text: &str, env: &mut Env) -> Result<Located<Statement>, ParseError> {
    let spans = statement_spans(text);
    let Some(&(start, end)) = spans.first() else {
        return Err(ParseError::new(
            ParseErrorKind::Expected {
                expected: "a statement".into(),
                found: None,
                suggestion: None,
            },
            Span::new(text.len(), text.len()),
        ));
    };
    if let Some(&(second, second_end)) = spans.get(1) {
        return Err(ParseError::new(
            ParseErrorKind::Expected {
                expected: "one statement only".into(),
                found: Some(shorten(&text[second..second_end])),
                suggestion: None,
            },
            Span::new(second, second_end),
        ));
    }
    let result = parse_piece(text, start, end, env);
    if let Ok(located) = &result {
        env.apply(&located.node);
    }
    result
}

/// Byte ranges of the statements of `text`: split at newlines and `;`, a `#` comments out
/// the rest of its line, blanks trimmed, empty pieces dropped.
fn statement_spans(text: &str) -> Vec<(usize, usize)> {
    let mut spans = Vec::new();
    let mut line_start = 0;
    for line in text.split_inclusive('\n') {
        let code = &line[..line.find('#').unwrap_or(line.len())];
        let mut part_start = line_start;
        for part in code.split(';') {
            let start = part_start + (part.len() - part.trim_start().len());
            let end = part_start + part.trim_end().len();
            if end > start {
                spans.push((start, end));
            }
            part_start += part.len() + 1;
        }
        line_start += line.len();
    }
    spans
}

fn parse_piece(
    text: &str,
    start: usize,
    end: usize,
    env: &Env,
) -> Result<Located<Statement>, ParseError> {
    let piece = &text[start..end];
    if let Some((at, c)) = super::invisible::find(piece) {
        return Err(ParseError::new(
            ParseErrorKind::InvisibleCharacter {
                code: format!("U+{:04X}", u32::from(c)),
                name: super::invisible::name(c).unwrap_or("invisible character"),
            },
            Span::new(start + at, start + at + c.len_utf8()),
        ));
    }
    let cx = Cx { piece, start, env };
    match statement(cx, piece) {
        Ok((_, node)) => Ok(Located {
            node,
            span: Span::new(start, end),
        }),
        Err(NomErr::Error(e) | NomErr::Failure(e)) => Err(e.into_parse_error(cx)),
        Err(NomErr::Incomplete(_)) => Err(ParseError::new(
            ParseErrorKind::Expected {
                expected: "a complete statement".into(),
                found: None,
                suggestion: None,
            },
            Span::new(end, end),
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use clause::ends_as_number;
    use quantity::unit_at;

    #[test]
    fn statements_split_at_newlines_semicolons_and_comments() {
        let text = "describe NaCl ; describe KCl # ; not this\n\n  # only a comment\nsources";
        let spans: Vec<&str> = statement_spans(text)
            .into_iter()
            .map(|(s, e)| &text[s..e])
            .collect();
        assert_eq!(spans, ["describe NaCl", "describe KCl", "sources"]);
    }

    #[test]
    fn units_take_the_longest_symbol() {
        let m = unit_at(" g/100g water from 2 C").map(|m| m.written);
        assert_eq!(m.as_deref(), Some("g/100g water"));
        let m = unit_at("% w/w").map(|m| m.written);
        assert_eq!(m.as_deref(), Some("% w/w"));
    }

    #[test]
    fn numbers_that_begin_names_stay_names() {
        assert!(!ends_as_number("2-propanol"));
        assert!(ends_as_number("20"));
        assert!(ends_as_number("20C"));
    }
}
