//! Clauses: solute names, classes and `with` filters, and the optional clauses that close a
//! statement (`in`, `margin`, `extrapolate`, `reviewed only`).

use nom::{Err as NomErr, Parser, combinator::cut, error::context};

use super::super::ast::*;
use super::super::error::ParseErrorKind;
use super::super::lexicon::{ends_name, is_keyword, nearest, one_of};
use super::super::recipe::Recipe;
use super::plumbing::*;
use super::quantity::*;
use super::statement::gas_pressure;
use crate::science::units::{CompositionUnit, TemperatureUnit};

// ---------------------------------------------------------------------------------------
// names, classes, filters

pub(super) fn ends_as_number(word: &str) -> bool {
    if !starts_number(word) {
        return false;
    }
    // `2-propanol` and `1,2-ethanediol` are names; `20`, `20C` and the range `2-8` (or
    // `2-8C`) are not.
    match number_text(word) {
        Ok((rest, _)) => match rest.strip_prefix(['-', '\u{2013}', '\u{2014}']) {
            Some(high) if starts_number(high) => number_text(high).is_ok_and(|(unit, _)| {
                unit.is_empty()
                    || classify(unit).is_some_and(|u| u.kind() == ValueKind::Temperature)
            }),
            Some(_) => false,
            None => !rest.starts_with(','),
        },
        Err(_) => true,
    }
}

/// A name of one or more words; it ends where a keyword or a number begins. A word close to
/// one of `followers` and followed by a number or a keyword is taken for a misspelt
/// follower (`KNO3 att 20 C`), not for part of the name.
pub(super) fn name<'a>(cx: Cx<'a>, i: &'a str, followers: &[&'static str]) -> R<'a, Name> {
    let begin = skip(i);
    let mut words: Vec<&str> = Vec::new();
    let mut rest = begin;
    loop {
        let t = skip(rest);
        let (word, after) = next_word(t);
        if word.is_empty() || ends_name(word) || ends_as_number(word) {
            break;
        }
        if !words.is_empty() && word.chars().count() >= 2 {
            if let Some(meant) = nearest(word, followers) {
                let next = skip(after);
                let (next_word_text, _) = next_word(next);
                if starts_number(next) || is_keyword(next_word_text) {
                    return Err(failure(
                        ParseErrorKind::Expected {
                            expected: one_of(followers),
                            found: Some(shorten(word)),
                            suggestion: Some(meant.to_string()),
                        },
                        cx.span(t, after),
                    ));
                }
            }
        }
        words.push(word);
        rest = after;
    }
    if words.is_empty() {
        return Err(soft(begin));
    }
    Ok((
        rest,
        Name {
            text: words.join(" "),
            span: cx.span(begin, rest),
        },
    ))
}

/// A name in a list: words up to a `,` (ending a word or standing alone), or up to a word
/// `ends` says is no part of a name. `check` sees each word after the first (with what
/// follows it) and may refuse it. Returns the name's words, where the last word ends,
/// where reading stopped (after the comma, if any) and whether a comma ended the name.
pub(super) fn listed_name<'a>(
    begin: &'a str,
    ends: impl Fn(&str) -> bool,
    mut check: impl FnMut(&'a str, &'a str, &'a str) -> Result<(), NomErr<PErr>>,
) -> Result<(Vec<&'a str>, &'a str, &'a str, bool), NomErr<PErr>> {
    let mut words: Vec<&str> = Vec::new();
    let mut end = begin;
    let mut cursor = begin;
    loop {
        let t = skip(cursor);
        if let Some(after) = t.strip_prefix(',') {
            return Ok((words, end, after, true));
        }
        let (word, after) = next_word(t);
        if word.is_empty() || ends(word) {
            return Ok((words, end, t, false));
        }
        if !words.is_empty() {
            check(t, word, after)?;
        }
        if let Some(head) = word.strip_suffix(',') {
            if !head.is_empty() {
                words.push(head);
                end = &t[head.len()..];
            }
            return Ok((words, end, after, true));
        }
        words.push(word);
        end = after;
        cursor = after;
    }
}

pub(super) const SOLUTE: &str =
    "a solute such as `KNO3`, `potassium-nitrate` or `potassium nitrate`";

pub(super) fn solute<'a>(cx: Cx<'a>, i: &'a str, followers: &[&'static str]) -> R<'a, Name> {
    not_a_recipe(cx, i)?;
    cut(context(SOLUTE, |x| name(cx, x, followers))).parse(i)
}

/// Where a statement is asked of one solute, a recipe (`recipe ...`, or a name bound to
/// one) is refused with the statements that take one. (Those statements read their recipe
/// before they ever ask for a solute.)
pub(super) fn not_a_recipe<'a>(cx: Cx<'a>, i: &'a str) -> Result<(), NomErr<PErr>> {
    let t = skip(i);
    let (word, after) = next_word(t);
    let is_recipe =
        word.eq_ignore_ascii_case("recipe") || (!word.is_empty() && cx.env.recipe(word).is_some());
    if !is_recipe {
        return Ok(());
    }
    Err(failure(
        ParseErrorKind::Expected {
            expected: "a solute: this statement is asked of solutes, not of a recipe; a recipe is asked with `require`, `which solids form in`, `saturation of`, `freezing of`, `describe` or `ph of`".into(),
            found: Some(shorten(word)),
            suggestion: None,
        },
        cx.span(t, after),
    ))
}

pub(super) fn class<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, SoluteClass> {
    let t = skip(i);
    let (word, after) = next_word(t);
    match word.to_lowercase().as_str() {
        "salts" | "salt" => Ok((after, SoluteClass::Salts)),
        "solutes" | "solute" => Ok((after, SoluteClass::Solutes)),
        "gases" | "gas" => Ok((after, SoluteClass::Gases)),
        "molecular" => {
            let (rest, _) = expect(cx, after, &["solutes", "solute"])?;
            Ok((rest, SoluteClass::MolecularSolutes))
        }
        _ => Err(expected_here(
            cx,
            t,
            "`salts`, `solutes`, `gases` or `molecular solutes`".into(),
            &["salts", "solutes", "gases", "molecular"],
        )),
    }
}

/// `with cation potassium and anion nitrate ...`; nothing when no `with` follows.
pub(super) fn filters<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Vec<Filter>> {
    let Some(mut rest) = has_keyword(i, "with") else {
        return Ok((i, Vec::new()));
    };
    let mut found = Vec::new();
    loop {
        let (after, which) = expect(cx, rest, &["cation", "anion", "tag", "element", "source"])?;
        let (after, value) = cut(context("a value such as `sulfate`", |x| {
            name(cx, x, &["and"])
        }))
        .parse(after)?;
        found.push(match which.to_lowercase().as_str() {
            "cation" => Filter::Cation(value),
            "anion" => Filter::Anion(value),
            "tag" => Filter::Tag(value),
            "element" => Filter::Element(value),
            _ => Filter::Source(value),
        });
        match has_keyword(after, "and") {
            Some(next) => rest = next,
            None => return Ok((after, found)),
        }
    }
}

// ---------------------------------------------------------------------------------------
// the clauses that close a statement

#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) enum Clause {
    /// `under` and a gas pressure (dissolved gases).
    Under,
    InComposition,
    InTemperature,
    Margin,
    Extrapolate,
    ReviewedOnly,
    /// `every` and a step of temperature (a solubility table over a range).
    Every,
}

#[derive(Default)]
pub(super) struct Tail {
    pub(super) composition: Option<UnitChoice<CompositionUnit>>,
    pub(super) temperature: Option<UnitChoice<TemperatureUnit>>,
    pub(super) margin: Option<Margin>,
    pub(super) pressure: Option<GasPressure>,
    pub(super) every: Option<TemperatureStep>,
    /// `in recipe ...` or `in NAME` (a bound recipe) after a dissolved gas: the liquid.
    pub(super) liquid: Option<Recipe>,
    pub(super) options: Options,
}

/// After `in` in a dissolved-gas statement (the one that takes `under`): `in water` names a
/// liquid, not a unit; said plainly, as pure water is what the statement answers without
/// `in` (a recipe's liquid, `in recipe ...` or `in NAME`, is read before this).
fn not_a_liquid_for_a_gas<'a>(cx: Cx<'a>, after: &'a str) -> Result<(), NomErr<PErr>> {
    let t = skip(after);
    let (word, rest) = next_word(t);
    if !word.eq_ignore_ascii_case("water") {
        return Ok(());
    }
    Err(failure(
        ParseErrorKind::LiquidNotUnit {
            found: word.to_string(),
            why: "a dissolved gas is answered for pure water without `in`; after `in` give a unit such as `mg/L`, or a recipe (`in recipe 0.9 %w/v NaCl`, or a name bound to one)",
        },
        cx.span(t, rest),
    ))
}

pub(super) fn duplicate(cx: Cx, t: &str, after: &str, clause: &str) -> NomErr<PErr> {
    failure(
        ParseErrorKind::DuplicateClause {
            clause: clause.to_string(),
        },
        cx.span(t, after),
    )
}

/// Reads the value of a clause (its word at `t`, its value at `after`) into `slot`, which
/// must still be empty: a clause given twice is a duplicate.
fn once<'a, T>(
    cx: Cx<'a>,
    (t, after): (&'a str, &'a str),
    clause: &str,
    slot: &mut Option<T>,
    value: impl FnOnce(Cx<'a>, &'a str) -> R<'a, T>,
) -> Result<&'a str, NomErr<PErr>> {
    if slot.is_some() {
        return Err(duplicate(cx, t, after, clause));
    }
    let (rest, found) = value(cx, after)?;
    *slot = Some(found);
    Ok(rest)
}

/// The optional clauses, in any order, then the end of the statement. `earlier` names
/// optional words that could have stood before (for the message and the suggestion only).
pub(super) fn tail<'a>(
    cx: Cx<'a>,
    i: &'a str,
    allowed: &[Clause],
    earlier: &[&'static str],
) -> R<'a, Tail> {
    clauses(cx, i, allowed, earlier, Tail::default(), true)
}

/// Optional clauses standing before a statement's required part (`dissolved O2 in mg/L
/// at 4 C`): read while the next word opens one of `allowed`; reading stops, without a
/// fault, at any other word.
pub(super) fn lead<'a>(cx: Cx<'a>, i: &'a str, allowed: &[Clause]) -> R<'a, Tail> {
    clauses(cx, i, allowed, &[], Tail::default(), false)
}

/// The closing clauses after a [`lead`]: a clause given in both places is a duplicate.
pub(super) fn tail_after<'a>(
    cx: Cx<'a>,
    i: &'a str,
    allowed: &[Clause],
    earlier: &[&'static str],
    lead: Tail,
) -> R<'a, Tail> {
    clauses(cx, i, allowed, earlier, lead, true)
}

/// A statement's required part, read by `part`, with the closing clauses `allowed` before
/// or after it (`dissolved O2 in mg/L at 4 C` and `dissolved O2 at 4 C in mg/L`).
pub(super) fn with_clauses<'a, T>(
    cx: Cx<'a>,
    i: &'a str,
    allowed: &[Clause],
    part: impl FnOnce(Cx<'a>, &'a str) -> R<'a, T>,
) -> R<'a, (T, Tail)> {
    let (i, lead) = lead(cx, i, allowed)?;
    let (i, found) = part(cx, i)?;
    let (i, tail) = tail_after(cx, i, allowed, &[], lead)?;
    Ok((i, (found, tail)))
}

fn clauses<'a>(
    cx: Cx<'a>,
    i: &'a str,
    allowed: &[Clause],
    earlier: &[&'static str],
    mut out: Tail,
    to_the_end: bool,
) -> R<'a, Tail> {
    let mut rest = i;
    loop {
        let t = skip(rest);
        if t.is_empty() {
            return Ok((t, out));
        }
        let (word, after) = next_word(t);
        let word = word.to_lowercase();
        let allows = |c: Clause| allowed.contains(&c);
        let at = (t, after);
        if word == "under" && allows(Clause::Under) {
            rest = once(cx, at, "under", &mut out.pressure, gas_pressure)?;
        } else if word == "in" && allows(Clause::InComposition) {
            if allows(Clause::Under) {
                // A gas in a recipe's liquid: `in recipe ...` or `in NAME`.
                if let (r, Some(recipe)) = super::recipe::subject(cx, after)? {
                    if out.liquid.is_some() {
                        return Err(duplicate(cx, t, r, "in RECIPE"));
                    }
                    out.liquid = Some(recipe);
                    rest = r;
                    continue;
                }
                not_a_liquid_for_a_gas(cx, after)?;
            }
            rest = once(cx, at, "in", &mut out.composition, composition_unit)?;
        } else if word == "in" && allows(Clause::InTemperature) {
            rest = once(cx, at, "in", &mut out.temperature, temperature_unit)?;
        } else if word == "margin" && allows(Clause::Margin) {
            rest = once(cx, at, "margin", &mut out.margin, |cx, x| {
                cut(context(ValueKind::Margin.example(), |x| margin(cx, x))).parse(x)
            })?;
        } else if word == "every" && allows(Clause::Every) {
            rest = once(cx, at, "every", &mut out.every, temperature_step)?;
        } else if word == "extrapolate" && allows(Clause::Extrapolate) {
            if out.options.extrapolate {
                return Err(duplicate(cx, t, after, "extrapolate"));
            }
            out.options.extrapolate = true;
            rest = after;
        } else if word == "assuming" && allows(Clause::ReviewedOnly) {
            if out.options.assume_unit_density {
                return Err(duplicate(cx, t, after, "assuming density"));
            }
            rest = super::recipe::assuming_density(cx, after)?.0;
            out.options.assume_unit_density = true;
        } else if word == "reviewed" && allows(Clause::ReviewedOnly) {
            let (r, _) = expect(cx, after, &["only"])?;
            if out.options.reviewed_only {
                return Err(duplicate(cx, t, r, "reviewed only"));
            }
            out.options.reviewed_only = true;
            rest = r;
        } else if !to_the_end {
            return Ok((rest, out));
        } else {
            let mut words: Vec<&'static str> = earlier.to_vec();
            for clause in allowed {
                words.push(match clause {
                    Clause::Under => "under",
                    Clause::InComposition | Clause::InTemperature => "in",
                    Clause::Margin => "margin",
                    Clause::Extrapolate => "extrapolate",
                    Clause::ReviewedOnly => "reviewed",
                    Clause::Every => "every",
                });
            }
            words.dedup();
            let shown = as_shown(&words);
            let expected = if shown.is_empty() {
                "the end of the statement".to_string()
            } else {
                format!(
                    "{} or the end of the statement",
                    one_of(&shown).replace(" or ", ", ")
                )
            };
            return Err(expected_here(cx, t, expected, &words));
        }
    }
}

pub(super) const DATA: [Clause; 2] = [Clause::Extrapolate, Clause::ReviewedOnly];

/// Closing words as a message lists them: `reviewed` as `reviewed only`.
pub(super) fn as_shown(words: &[&'static str]) -> Vec<&'static str> {
    words
        .iter()
        .map(|&w| if w == "reviewed" { "reviewed only" } else { w })
        .collect()
}
