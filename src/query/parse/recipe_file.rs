//! Recipe files: a plain table of recipes, one block per recipe.
//!
//! ```text
//! # comments start with '#', blank lines are ignored
//! recipe rinse                # a block starts with `recipe NAME`
//!   0.9   %w/v          NaCl  # then one ingredient a line: amount, unit, solute
//!   10    mM            KH2PO4
//!   5     g/100g water  sucrose
//!   volume at 25 C            # optional, last: per-litre amounts meant at 25 C
//! ```
//!
//! A block ends where the next `recipe` line begins or at the end of the file. The lines
//! are read by the rules of the query language (the same units and names), so a file's
//! recipe is the very `Recipe` a `let` would bind; faults carry spans into the file.

use super::super::ast::*;
use super::super::error::{ParseError, ParseErrorKind};
use super::super::lexicon::{is_keyword, nearest};
use super::super::recipe::{Ingredient, Recipe};
use super::Env;
use super::plumbing::*;
use super::quantity::*;
use super::recipe::{AMOUNT, ingredient_name};

/// The lines of `text` with their byte offsets, comments cut and blanks trimmed; empty
/// lines dropped.
fn lines(text: &str) -> Vec<(usize, &str)> {
    let mut found = Vec::new();
    let mut offset = 0;
    for line in text.split_inclusive('\n') {
        let code = &line[..line.find('#').unwrap_or(line.len())];
        let trimmed = code.trim();
        if !trimmed.is_empty() {
            let lead = code.len() - code.trim_start().len();
            found.push((offset + lead, trimmed));
        }
        offset += line.len();
    }
    found
}

fn fault(kind: ParseErrorKind, span: Span) -> ParseError {
    ParseError::new(kind, span)
}

fn expected(expected: &str, found: &str, span: Span) -> ParseError {
    fault(
        ParseErrorKind::Expected {
            expected: expected.to_string(),
            found: (!found.is_empty()).then(|| shorten(found)),
            suggestion: None,
        },
        span,
    )
}

/// Turns a nom fault into the file's error.
fn finished(e: nom::Err<PErr>, cx: Cx) -> ParseError {
    match e {
        nom::Err::Error(e) | nom::Err::Failure(e) => e.into_parse_error(cx),
        nom::Err::Incomplete(_) => expected("a complete line", "", Span::new(cx.start, cx.start)),
    }
}

/// `recipe NAME` at the start of a block: the name, or `None` when the line is not one.
fn header(cx: Cx, line: &str) -> Option<Result<Name, ParseError>> {
    let (word, after) = next_word(line);
    if !word.eq_ignore_ascii_case("recipe") {
        return None;
    }
    let (name, rest) = next_word(after);
    let span = cx.span(skip(after), rest);
    if name.is_empty() || !is_name_of_own(name) {
        return Some(Err(expected(
            "a recipe's name such as `rinse` (a letter, then letters, digits, `_` or `-`)",
            name,
            span,
        )));
    }
    if is_keyword(name) || classify(name).is_some() {
        return Some(Err(expected(
            "a recipe's name that is not a word of the language or a unit symbol",
            name,
            span,
        )));
    }
    let extra = skip(rest);
    if !extra.is_empty() {
        return Some(Err(expected(
            "the end of the line after the recipe's name (one ingredient a line below it)",
            extra,
            cx.span(extra, ""),
        )));
    }
    Some(Ok(Name {
        text: name.to_string(),
        span,
    }))
}

/// One ingredient line (`0.9 %w/v NaCl`), or `volume at T`.
enum Line {
    Ingredient(Ingredient),
    Volume(Temperature),
}

fn body_line<'a>(cx: Cx<'a>, line: &'a str) -> Result<Line, ParseError> {
    if let Some(after) = has_keyword(line, "volume") {
        let at = expect(cx, after, &["at"]).map_err(|e| finished(e, cx))?.0;
        let (rest, t) = committed_temperature(cx, at).map_err(|e| finished(e, cx))?;
        let rest = skip(rest);
        if !rest.is_empty() {
            return Err(expected("the end of the line", rest, cx.span(rest, "")));
        }
        return Ok(Line::Volume(t));
    }
    if !starts_number(line) {
        return Err(expected(
            AMOUNT,
            next_word(line).0,
            cx.span(line, next_word(line).1),
        ));
    }
    let (after, amount) = loading(cx, line).map_err(|e| finished(e, cx))?;
    let (rest, (solute, comma)) = ingredient_name(cx, after).map_err(|e| finished(e, cx))?;
    let (rest, ph) = super::recipe::set_ph(cx, rest).map_err(|e| finished(e, cx))?;
    let rest = skip(rest);
    if comma || !rest.is_empty() {
        let found = if rest.is_empty() { "," } else { rest };
        return Err(expected(
            "the end of the line: one ingredient a line in a recipe file, no `,`",
            found,
            cx.span(rest, ""),
        ));
    }
    Ok(Line::Ingredient(Ingredient {
        span: amount.span.to(ph.map_or(solute.span, |p| p.span)),
        amount,
        solute,
        ph,
    }))
}

/// Reads a recipe file: every recipe, in order, or every fault found (each with its span in
/// `text`; render with [`ParseError::render`]). Names are compared without regard to case
/// and may not repeat.
pub fn parse_recipe_file(text: &str) -> Result<Vec<Recipe>, Vec<ParseError>> {
    let env = Env::new();
    let mut recipes: Vec<Recipe> = Vec::new();
    let mut faults = Vec::new();
    let mut current: Option<Recipe> = None;
    // Lines read in the current block, good or not: a block whose lines were all faulty is
    // not reported empty as well.
    let mut body_lines = 0usize;
    let close =
        |recipe: Recipe, recipes: &mut Vec<Recipe>, faults: &mut Vec<ParseError>, lines: usize| {
            if lines == 0 {
                let name = recipe
                    .name
                    .as_ref()
                    .map_or(String::new(), |n| n.text.clone());
                faults.push(expected(
                    "at least one ingredient line such as `0.9 %w/v NaCl`",
                    &format!("recipe {name} with none"),
                    recipe.span,
                ));
            }
            recipes.push(recipe);
        };
    for (start, line) in lines(text) {
        let cx = Cx {
            piece: line,
            start,
            env: &env,
        };
        if let Some(name) = header(cx, line) {
            if let Some(done) = current.take() {
                close(done, &mut recipes, &mut faults, body_lines);
            }
            body_lines = 0;

            match name {
                Ok(name) => {
                    let known: Vec<&str> = recipes
                        .iter()
                        .filter_map(|r| r.name.as_ref().map(|n| n.text.as_str()))
                        .collect();
                    if known.iter().any(|k| k.eq_ignore_ascii_case(&name.text)) {
                        faults.push(expected(
                            "a name not used by an earlier recipe of the file",
                            &name.text,
                            name.span,
                        ));
                    }
                    current = Some(Recipe {
                        span: Span::new(start, start + line.len()),
                        name: Some(name),
                        ingredients: Vec::new(),
                        volume_at: None,
                    });
                }
                Err(e) => {
                    faults.push(e);
                    // Its lines belong to no recipe; they are not faults of their own.
                    body_lines = usize::MAX;
                }
            }
            continue;
        }
        let Some(recipe) = current.as_mut() else {
            if body_lines == usize::MAX {
                continue;
            }
            let (word, after) = next_word(line);
            faults.push(fault(
                ParseErrorKind::Expected {
                    expected: "`recipe NAME` to begin a recipe".into(),
                    found: Some(shorten(word)),
                    suggestion: nearest(word, &["recipe"]).map(str::to_string),
                },
                cx.span(line, after),
            ));
            continue;
        };
        recipe.span = recipe.span.to(Span::new(start, start + line.len()));
        body_lines += 1;
        match body_line(cx, line) {
            Ok(Line::Ingredient(i)) if recipe.volume_at.is_none() => recipe.ingredients.push(i),
            Ok(Line::Ingredient(i)) => faults.push(expected(
                "`volume at T` as the last line of its recipe",
                "an ingredient after it",
                i.span,
            )),
            Ok(Line::Volume(t)) if recipe.volume_at.is_some() => {
                faults.push(fault(
                    ParseErrorKind::DuplicateClause {
                        clause: "volume at".into(),
                    },
                    t.span,
                ));
            }
            Ok(Line::Volume(t)) => recipe.volume_at = Some(t),
            Err(e) => faults.push(e),
        }
    }
    if let Some(done) = current.take() {
        close(done, &mut recipes, &mut faults, body_lines);
    }
    if faults.is_empty() {
        Ok(recipes)
    } else {
        Err(faults)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const FILE: &str = "# invented demo recipes\n\
                        recipe rinse\n  \
                          0.9 %w/v NaCl   # saline\n  \
                          10 mM KH2PO4\n  \
                          5 g/100g water sucrose\n  \
                          volume at 25 C\n\
                        \n\
                        RECIPE brine\n  \
                          1.5 mol/kg sodium chloride\n";

    #[test]
    fn blocks_become_recipes_with_spans_into_the_file() {
        let recipes = parse_recipe_file(FILE).unwrap();
        assert_eq!(recipes.len(), 2);
        let rinse = &recipes[0];
        assert_eq!(rinse.name.as_ref().unwrap().text, "rinse");
        assert_eq!(rinse.ingredients.len(), 3);
        assert_eq!(&FILE[rinse.ingredients[1].span.range()], "10 mM KH2PO4");
        assert_eq!(rinse.volume_at.map(|t| t.celsius()), Some(25.0));
        assert_eq!(recipes[1].ingredients[0].solute.text, "sodium chloride");
    }

    #[test]
    fn faults_name_their_line_and_column() {
        let text = "receipe x\nrecipe rinse\n  0.9 %w/v NaCl\n  5 C sucrose\nrecipe rinse\n  1 g/L KCl, 2 g/L NaCl\nrecipe at\n  1 g/L KCl\nrecipe empty\n";
        let faults = parse_recipe_file(text).unwrap_err();
        let places: Vec<(usize, usize)> = faults.iter().map(|f| f.line_column(text)).collect();
        // A misspelt header; a temperature for an amount; the name again; two ingredients
        // on one line; a keyword for a name (its lines are skipped); a recipe without
        // ingredients.
        assert_eq!(places, [(1, 1), (4, 3), (5, 8), (6, 14), (7, 8), (9, 1)]);
        assert!(matches!(
            faults[1].kind,
            ParseErrorKind::WrongQuantity { .. }
        ));
        assert!(matches!(
            &faults[0].kind,
            ParseErrorKind::Expected { suggestion: Some(s), .. } if s == "recipe"
        ));
    }
}
