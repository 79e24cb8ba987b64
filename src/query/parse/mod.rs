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
    statements(text, env).collect()
}

/// [`parse_with`] one statement at a time: each is parsed when the iterator is advanced (a
/// `let` binds its name in `env` then), so a caller answering a long script holds one
/// parsed statement at a time, never the whole script's.
pub fn statements<'t, 'e>(text: &'t str, env: &'e mut Env) -> Statements<'t, 'e> {
    Statements {
        text,
        spans: Spans::new(text),
        env,
    }
}

/// The statements of one script, parsed as they are drawn (see [`statements`]).
#[derive(Debug)]
pub struct Statements<'t, 'e> {
    text: &'t str,
    spans: Spans<'t>,
    env: &'e mut Env,
}

impl Iterator for Statements<'_, '_> {
    type Item = Result<Located<Statement>, ParseError>;

    fn next(&mut self) -> Option<Self::Item> {
        let (start, end) = self.spans.next()?;
        let result = parse_piece(self.text, start, end, self.env);
        if let Ok(located) = &result {
            self.env.apply(&located.node);
        }
        Some(result)
    }
}

/// Parses text that must hold exactly one statement (a comment may follow it).
pub fn parse_statement(text: &str, env: &mut Env) -> Result<Located<Statement>, ParseError> {
    let mut spans = Spans::new(text);
    let Some((start, end)) = spans.next() else {
        return Err(ParseError::new(
            ParseErrorKind::Expected {
                expected: "a statement".into(),
                found: None,
                suggestion: None,
            },
            Span::new(text.len(), text.len()),
        ));
    };
    if let Some((second, second_end)) = spans.next() {
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

/// Byte ranges of the statements of `text`, found as they are drawn: split at newlines and
/// `;`, a `#` comments out the rest of its line, blanks trimmed, empty pieces dropped.
#[derive(Debug)]
struct Spans<'t> {
    lines: std::str::SplitInclusive<'t, char>,
    /// Where the next line starts.
    line_start: usize,
    /// The pieces of the current line not yet drawn, and where the next one starts.
    parts: Option<(std::str::Split<'t, char>, usize)>,
}

impl<'t> Spans<'t> {
    fn new(text: &'t str) -> Self {
        Spans {
            lines: text.split_inclusive('\n'),
            line_start: 0,
            parts: None,
        }
    }
}

impl Iterator for Spans<'_> {
    type Item = (usize, usize);

    fn next(&mut self) -> Option<(usize, usize)> {
        loop {
            if let Some((parts, part_start)) = &mut self.parts {
                if let Some(part) = parts.next() {
                    let start = *part_start + (part.len() - part.trim_start().len());
                    let end = *part_start + part.trim_end().len();
                    *part_start += part.len() + 1;
                    if end > start {
                        return Some((start, end));
                    }
                    continue;
                }
            }
            let line = self.lines.next()?;
            let code = &line[..line.find('#').unwrap_or(line.len())];
            self.parts = Some((code.split(';'), self.line_start));
            self.line_start += line.len();
        }
    }
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
        let spans: Vec<&str> = Spans::new(text).map(|(s, e)| &text[s..e]).collect();
        assert_eq!(spans, ["describe NaCl", "describe KCl", "sources"]);
    }

    #[test]
    fn statements_are_parsed_and_bound_one_at_a_time_as_they_are_drawn() {
        let text =
            "let t = 20 C\r\nsolubility of KNO3 at t ; solubilty of KCl\n# note\nlet t = 30 C";
        let mut env = Env::new();
        let mut drawn = statements(text, &mut env);
        assert!(drawn.next().is_some_and(|s| s.is_ok()));
        // The first `let` is bound; the last one (30 C) is not parsed yet.
        let bound = |env: &Env| match env.get("t") {
            Some(Value::Temperature(t)) => Some(t.celsius()),
            _ => None,
        };
        assert_eq!(bound(drawn.env), Some(20.0));
        let second = drawn.next();
        assert!(matches!(&second, Some(Ok(s)) if matches!(s.node, Statement::Solubility(_))));
        assert!(drawn.next().is_some_and(|s| s.is_err()));
        assert!(drawn.next().is_some_and(|s| s.is_ok()));
        assert!(drawn.next().is_none());
        assert_eq!(bound(&env), Some(30.0));
        // The same statements, spans and faults as parsing the whole script at once.
        let mut fresh = Env::new();
        assert_eq!(
            statements(text, &mut fresh).collect::<Vec<_>>(),
            parse_script(text)
        );
        assert_eq!(fresh, env);
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
