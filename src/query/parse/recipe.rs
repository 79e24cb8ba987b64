//! Recipes: `recipe 0.9 %w/v NaCl, 10 mM KH2PO4 [volume at 25 C]` written in place or bound
//! with `let`, and the statements that ask about one (`require NAME stays dissolved ...`,
//! `which solids form in NAME ...`, `saturation of NAME`, `describe NAME`), plus the
//! `assuming density 1.000 kg/L` clause.

use nom::{Parser, combinator::cut, error::context};

use super::super::ast::*;
use super::super::error::ParseErrorKind;
use super::super::lexicon::ends_name;
use super::super::recipe::{Ingredient, Recipe, RecipeQuestion, RecipeStatement, SetPh};
use super::clause::*;
use super::plumbing::*;
use super::quantity::*;

/// What an ingredient's amount must look like, for "expected ..." messages.
pub(super) const AMOUNT: &str =
    "an amount such as `0.9 %w/v`, `10 mM` or `5 g/100g water`, then a solute";

/// Words that end an ingredient's solute name besides the words that end any name.
const RECIPE_STOP: [&str; 2] = ["volume", "assuming"];

fn ends_ingredient(word: &str) -> bool {
    ends_name(word)
        || ends_as_number(word)
        || RECIPE_STOP.iter().any(|w| w.eq_ignore_ascii_case(word))
}

/// A solute's name inside a recipe: words up to a `,`, a keyword or a number. Returns the
/// name, the rest, and whether a comma ended it.
pub(super) fn ingredient_name<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, (Name, bool)> {
    let begin = skip(i);
    let (words, end, cursor, comma) = listed_name(begin, ends_ingredient, |_, _, _| Ok(()))?;
    if words.is_empty() {
        return Err(expected_here(cx, begin, SOLUTE.into(), &[]));
    }
    let name = Name {
        text: words.join(" "),
        span: cx.span(begin, end),
    };
    Ok((cursor, (name, comma)))
}

/// `at pH 7.4` after a buffer's name; nothing read when `at pH` does not stand there.
pub(super) fn set_ph<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Option<SetPh>> {
    let Some(after_at) = has_keyword(i, "at") else {
        return Ok((i, None));
    };
    let Some(after_ph) = has_keyword(after_at, "ph") else {
        return Ok((i, None));
    };
    let t = skip(after_ph);
    let value = number_text(t).ok().and_then(|(rest, text)| {
        text.replace('−', "-")
            .parse::<f64>()
            .ok()
            .map(|v| (rest, v))
    });
    match value {
        Some((rest, v)) if v.is_finite() && (0.0..=14.0).contains(&v) => Ok((
            rest,
            Some(SetPh {
                value: v,
                span: cx.span(t, rest),
            }),
        )),
        Some((rest, _)) => Err(failure(
            ParseErrorKind::Expected {
                expected: "a pH from 0 to 14".into(),
                found: Some(shorten(&t[..t.len() - rest.len()])),
                suggestion: None,
            },
            cx.span(t, rest),
        )),
        None => Err(expected_here(cx, t, "a pH such as `7.4`".into(), &[])),
    }
}

/// The ingredients after the word `recipe`, and an optional `volume at T`.
pub(super) fn recipe_body<'a>(
    cx: Cx<'a>,
    begin: &'a str,
    i: &'a str,
    name: Option<Name>,
) -> R<'a, Recipe> {
    let mut ingredients = Vec::new();
    let mut rest = i;
    loop {
        let t = skip(rest);
        if !starts_number(t) {
            return Err(expected_here(cx, t, AMOUNT.into(), &[]));
        }
        let (after, amount) = cut(context(AMOUNT, |x| loading(cx, x))).parse(t)?;
        let (after, (solute, comma)) = ingredient_name(cx, after)?;
        let (after, ph, comma) = match set_ph(cx, after)? {
            (rest, Some(ph)) => {
                let comma = skip(rest).starts_with(',');
                let rest = if comma { &skip(rest)[1..] } else { rest };
                (rest, Some(ph), comma)
            }
            (rest, None) => (rest, None, comma),
        };
        ingredients.push(Ingredient {
            amount,
            solute,
            span: cx.span(t, after),
            ph,
        });
        if comma {
            rest = after;
            continue;
        }
        if let Some(next) = has_keyword(after, "and") {
            rest = next;
            continue;
        }
        let next = skip(after);
        if starts_number(next) {
            return Err(expected_here(
                cx,
                next,
                "`,` between the ingredients of a recipe".into(),
                &[],
            ));
        }
        rest = after;
        break;
    }
    let (rest, volume_at) = match has_keyword(rest, "volume") {
        Some(after) => {
            let (r, _) = expect(cx, after, &["at"])?;
            let (r, t) = committed_temperature(cx, r)?;
            (r, Some(t))
        }
        None => (rest, None),
    };
    Ok((
        rest,
        Recipe {
            name,
            ingredients,
            volume_at,
            span: cx.span(begin, rest),
        },
    ))
}

/// A recipe as the subject of a statement: `recipe ...` written in place, or a name bound
/// to one. `None` (nothing read) when neither stands at `i`.
pub(super) fn subject<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Option<Recipe>> {
    let t = skip(i);
    if let Some(after) = has_keyword(t, "recipe") {
        let (rest, recipe) = recipe_body(cx, t, after, None)?;
        return Ok((rest, Some(recipe)));
    }
    let (word, after) = next_word(t);
    match cx.env.recipe(word) {
        // `require eyewash and ...` is still a name of a solute list, not this recipe.
        Some(recipe) if !word.is_empty() => Ok((after, Some(recipe.at(cx.span(t, after))))),
        _ => Ok((i, None)),
    }
}

/// A recipe where a statement must have one (`which solids form in ...`).
fn required_subject<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Recipe> {
    match subject(cx, i)? {
        (rest, Some(recipe)) => Ok((rest, recipe)),
        (_, None) => {
            let names: Vec<&str> = cx
                .env
                .names()
                .filter(|n| cx.env.recipe(n).is_some())
                .collect();
            Err(expected_here(
                cx,
                i,
                "a recipe: a name bound with `let NAME = recipe ...`, or `recipe` and its ingredients".into(),
                &names,
            ))
        }
    }
}

/// The statement asking `question` of `recipe`.
fn asked(recipe: Recipe, question: RecipeQuestion, options: Options) -> Statement {
    Statement::Recipe(RecipeStatement {
        recipe,
        question,
        options,
    })
}

/// `let NAME = recipe ...`, after the `=`.
pub(super) fn define<'a>(cx: Cx<'a>, name: Name, begin: &'a str, i: &'a str) -> R<'a, Statement> {
    let (rest, recipe) = recipe_body(cx, begin, i, Some(name))?;
    let (rest, tail) = tail(cx, rest, &[Clause::ReviewedOnly], &[])?;
    Ok((rest, asked(recipe, RecipeQuestion::Define, tail.options)))
}

/// `require RECIPE stays dissolved from 2 C to 8 C [margin 10%]`, after the recipe.
pub(super) fn require<'a>(cx: Cx<'a>, recipe: Recipe, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["stays", "stay"])?;
    let (i, _) = expect(cx, i, &["dissolved"])?;
    let (i, temperatures) = temperatures(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::Margin, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        asked(
            recipe,
            RecipeQuestion::Require {
                temperatures,
                margin: tail.margin,
            },
            tail.options,
        ),
    ))
}

/// `ph of RECIPE from 2 C to 25 C [extrapolate]`, after `ph`.
pub(super) fn ph<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, recipe) = required_subject(cx, i)?;
    let (i, temperatures) = temperatures(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::Every, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        asked(
            recipe,
            RecipeQuestion::Ph {
                temperatures,
                every: tail.every,
            },
            tail.options,
        ),
    ))
}

/// True when `which` is followed by `solids`: the recipe form of `which`.
pub(super) fn asks_solids(after_which: &str) -> bool {
    has_keyword(after_which, "solids").is_some()
}

/// `which solids form in RECIPE from -5 C to 25 C`, after `which`.
pub(super) fn solids_form<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["solids"])?;
    let (i, _) = expect(cx, i, &["form"])?;
    let (i, _) = expect(cx, i, &["in"])?;
    let (i, recipe) = required_subject(cx, i)?;
    let (i, temperatures) = temperatures(cx, i)?;
    let (i, tail) = tail(cx, i, &DATA, &[])?;
    Ok((
        i,
        asked(
            recipe,
            RecipeQuestion::SolidsForm { temperatures },
            tail.options,
        ),
    ))
}

/// `saturation of RECIPE [in F]`, after the recipe.
pub(super) fn saturation<'a>(cx: Cx<'a>, recipe: Recipe, i: &'a str) -> R<'a, Statement> {
    let (i, tail) = tail(cx, i, &[Clause::InTemperature, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        asked(
            recipe,
            RecipeQuestion::Saturation {
                unit: tail.temperature,
            },
            tail.options,
        ),
    ))
}

/// `freezing of RECIPE [at -20 C] [extrapolate]`, after the recipe.
pub(super) fn freezing<'a>(cx: Cx<'a>, recipe: Recipe, i: &'a str) -> R<'a, Statement> {
    let (i, at) = optional_at(cx, i)?;
    let earlier: &[&'static str] = if at.is_none() { &["at"] } else { &[] };
    let (i, tail) = tail(cx, i, &DATA, earlier)?;
    Ok((
        i,
        asked(recipe, RecipeQuestion::Freezing { at }, tail.options),
    ))
}

/// An optional `at T`: the temperature, or nothing read.
fn optional_at<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Option<Temperature>> {
    let Some(after) = has_keyword(i, "at") else {
        return Ok((i, None));
    };
    let (rest, t) = committed_temperature(cx, after)?;
    Ok((rest, Some(t)))
}

/// `describe RECIPE [at 25 C]`, after the recipe.
pub(super) fn describe<'a>(cx: Cx<'a>, recipe: Recipe, i: &'a str) -> R<'a, Statement> {
    let (i, at) = optional_at(cx, i)?;
    let earlier: &[&'static str] = if at.is_none() { &["at"] } else { &[] };
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], earlier)?;
    Ok((
        i,
        asked(recipe, RecipeQuestion::Describe { at }, tail.options),
    ))
}

/// After `assuming`: `density 1.000 kg/L` (or `1 g/mL`). Only water's round density can be
/// assumed; any other figure would be a density the reference does not hold.
pub(super) fn assuming_density<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, ()> {
    const WHAT: &str = "`density 1.000 kg/L`";
    let (i, _) = expect(cx, i, &["density"])?;
    let t = skip(i);
    let Ok((after, number)) = number_text(t) else {
        return Err(expected_here(cx, t, WHAT.into(), &[]));
    };
    let (unit, rest) = next_word(after);
    let one = number.parse::<f64>().is_ok_and(|v| v == 1.0);
    let per_litre = ["kg/L", "g/mL", "g/cm3"]
        .iter()
        .any(|u| u.eq_ignore_ascii_case(unit));
    if !(one && per_litre) {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: "`1.000 kg/L`: only the density of water can be assumed (otherwise the solution's density comes from the reference)".into(),
                found: Some(shorten(&t[..t.len() - rest.len()])),
                suggestion: None,
            },
            cx.span(t, rest),
        ));
    }
    Ok((rest, ()))
}

#[cfg(test)]
mod tests {
    use crate::query::{
        Env, ParseErrorKind, RecipeQuestion, Statement, ValueKind, parse_script, parse_with,
    };

    fn recipe_of(text: &str) -> crate::query::RecipeStatement {
        match parse_script(text).remove(0) {
            Ok(located) => match located.node {
                Statement::Recipe(r) => r,
                other => panic!("not a recipe statement: {other:?}"),
            },
            Err(e) => panic!("{}", e.render(text, "test")),
        }
    }

    #[test]
    fn a_recipe_reads_amounts_names_and_its_volume_temperature() {
        let r = recipe_of(
            "let rinse = recipe 0.9 %w/v sodium chloride, 10 mM KH2PO4 and 5 g/100g water sucrose volume at 25 C",
        );
        assert_eq!(r.question, RecipeQuestion::Define);
        let names: Vec<&str> = r
            .recipe
            .ingredients
            .iter()
            .map(|i| i.solute.text.as_str())
            .collect();
        assert_eq!(names, ["sodium chloride", "KH2PO4", "sucrose"]);
        assert_eq!(r.recipe.ingredients[1].amount.value, 10.0);
        assert_eq!(r.recipe.volume_at.map(|t| t.celsius()), Some(25.0));
        assert_eq!(r.recipe.name.map(|n| n.text), Some("rinse".to_string()));
    }

    #[test]
    fn an_amount_is_never_a_temperature_and_ingredients_need_commas() {
        let e = parse_script("let bad = recipe 5 C NaCl")
            .remove(0)
            .unwrap_err();
        assert!(matches!(
            e.kind,
            ParseErrorKind::WrongQuantity {
                expected: ValueKind::Loading,
                ..
            }
        ));
        let text = "let bad = recipe 1 g/L NaCl 2 g/L KCl";
        let e = parse_script(text).remove(0).unwrap_err();
        assert_eq!(&text[e.span.range()], "2 g/L");
        let e = parse_script("let bad = recipe NaCl").remove(0).unwrap_err();
        assert_eq!(e.kind.code(), "expected");
    }

    #[test]
    fn a_bound_recipe_is_the_subject_of_require_which_saturation_and_describe() {
        let mut env = Env::new();
        let text = "let rinse = recipe 1 g/L NaCl, 2 g/L KCl\n\
                    require rinse stays dissolved from 2 C to 8 C margin 10%\n\
                    which solids form in rinse from -5 C to 25 C\n\
                    saturation of rinse in F\n\
                    describe rinse at 25 C assuming density 1.000 kg/L\n\
                    require recipe 1 mol/kg NaCl stays dissolved at 5 C\n\
                    require KCl stays dissolved at 20 g/100g water at 5 C";
        let parsed: Vec<Statement> = parse_with(text, &mut env)
            .into_iter()
            .map(|r| {
                r.map(|l| l.node)
                    .unwrap_or_else(|e| panic!("{}", e.render(text, "t")))
            })
            .collect();
        assert!(env.recipe("RINSE").is_some());
        let kinds: Vec<&str> = parsed.iter().map(Statement::kind).collect();
        assert_eq!(
            kinds,
            [
                "let",
                "require",
                "solids",
                "saturation",
                "describe",
                "require",
                "require"
            ]
        );
        let Statement::Recipe(describe) = &parsed[4] else {
            panic!("describe of a recipe")
        };
        assert!(describe.options.assume_unit_density);
        // The use points at the name as used, not at the `let`.
        assert_eq!(&text[describe.recipe.ingredients[0].span.range()], "rinse");
        assert!(matches!(parsed[6], Statement::Require(_)));
    }

    #[test]
    fn only_waters_density_can_be_assumed() {
        let text = "convert 1 g/L of NaCl to mol/kg assuming density 1.05 kg/L";
        let e = parse_script(text).remove(0).unwrap_err();
        assert_eq!(&text[e.span.range()], "1.05 kg/L");
        let ok = parse_script("convert 1 g/L of NaCl to mol/kg assuming density 1 g/mL");
        assert!(ok[0].is_ok());
        let e = parse_script("which solids form in brine from 2 C to 8 C")
            .remove(0)
            .unwrap_err();
        assert_eq!(e.kind.code(), "expected");
    }
}
