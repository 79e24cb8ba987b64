//! `dissolving 300 g CaCl2 in 1 kg water from 20 C`: masses of a batch (a number and a mass
//! unit) and the statement that asks how warm or cold the batch gets while it dissolves.

use nom::Parser;
use nom::combinator::cut;
use nom::error::context;

use super::super::ast::*;
use super::super::error::ParseErrorKind;
use super::super::lexicon::nearest;
use super::clause::{Clause, solute, tail};
use super::plumbing::*;
use super::quantity::{committed_temperature, number_text, starts_number};

const SOLID: &str = "the mass of solid, such as `300 g`";
const WATER: &str = "the water, such as `1 kg` or `1 L`";
const MASS_UNITS: &str = "a mass unit (`g`, `kg`, `mg` or `lb`)";
const WATER_UNITS: &str = "a mass or volume unit (`g`, `kg`, `mg`, `lb`, `L` or `mL`)";

/// The mass unit written `word` (any case: `Kg` is a kilogram).
fn mass_unit(word: &str) -> Option<MassUnit> {
    MassUnit::ALL
        .into_iter()
        .find(|u| u.symbol().eq_ignore_ascii_case(word))
}

/// The unit to suggest for a word that is not a mass unit: a volume of water becomes the
/// mass it nearly is; otherwise the closest symbol.
fn suggest_mass_unit(word: &str) -> Option<String> {
    let by_volume = match word {
        "L" | "l" => Some("kg"),
        "mL" | "ml" => Some("g"),
        _ => None,
    };
    let symbols: Vec<&str> = MassUnit::ALL.iter().map(|u| u.symbol()).collect();
    by_volume
        .or_else(|| nearest(word, &symbols))
        .map(str::to_string)
}

/// A mass: a number above zero and a mass unit. `what` names the mass in messages.
pub(super) fn mass<'a>(cx: Cx<'a>, i: &'a str, what: &'static str) -> R<'a, Mass> {
    let (rest, (value, unit, span)) = amount(cx, i, what, MASS_UNITS, mass_unit)?;
    Ok((rest, Mass { value, unit, span }))
}

/// How a batch's water may be given: a mass unit, or litres (`L`) and millilitres (`mL`).
#[derive(Clone, Copy)]
enum WaterUnit {
    Mass(MassUnit),
    /// Litres per unit written.
    Volume(f64),
}

/// The water of a batch: a mass, or a volume of water.
fn water_amount<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, WaterAmount> {
    let unit = |word: &str| match word {
        "L" | "l" => Some(WaterUnit::Volume(1.0)),
        "mL" | "ml" => Some(WaterUnit::Volume(1e-3)),
        _ => mass_unit(word).map(WaterUnit::Mass),
    };
    let (rest, (value, unit, span)) = amount(cx, i, WATER, WATER_UNITS, unit)?;
    Ok((
        rest,
        match unit {
            WaterUnit::Mass(unit) => WaterAmount::Mass(Mass { value, unit, span }),
            WaterUnit::Volume(litres) => WaterAmount::Litres {
                value: value * litres,
                span,
            },
        },
    ))
}

/// A number above zero and a unit that `unit_of` reads. `what` names the amount in
/// messages, `units` the units it takes.
fn amount<'a, U>(
    cx: Cx<'a>,
    i: &'a str,
    what: &'static str,
    units: &'static str,
    unit_of: impl Fn(&str) -> Option<U>,
) -> R<'a, (f64, U, Span)> {
    let t = skip(i);
    if !starts_number(t) {
        return Err(expected_here(cx, t, what.into(), &[]));
    }
    let (after, number) = cut(context(what, number_text)).parse(t)?;
    let (word, rest) = next_word(after);
    let Some(unit) = unit_of(word) else {
        let (span, found) = if word.is_empty() {
            found_at(cx, t)
        } else {
            (cx.span(t, rest), Some(shorten(&t[..t.len() - rest.len()])))
        };
        return Err(failure(
            ParseErrorKind::Expected {
                expected: format!("{what}: {units} after `{number}`"),
                found,
                suggestion: suggest_mass_unit(word),
            },
            span,
        ));
    };
    let span = cx.span(t, rest);
    let found = shorten(&t[..t.len() - rest.len()]);
    let invalid = || {
        let found = shorten(number);
        failure(ParseErrorKind::InvalidNumber { found }, span)
    };
    let value: f64 = number.replace('−', "-").parse().map_err(|_| invalid())?;
    if !value.is_finite() {
        return Err(invalid());
    }
    if value < 0.0 {
        return Err(failure(ParseErrorKind::NegativeAmount { found }, span));
    }
    if value == 0.0 {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: format!("{what}, above zero"),
                found: Some(found),
                suggestion: None,
            },
            span,
        ));
    }
    Ok((rest, (value, unit, span)))
}

/// `dissolving MASS [of] SOLUTE in MASS [of] water from|at TEMPERATURE [extrapolate]`.
pub(super) fn dissolving<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solid) = mass(cx, i, SOLID)?;
    let i = has_keyword(i, "of").unwrap_or(i);
    let (i, solute) = solute(cx, i, &["in"])?;
    let (i, _) = expect(cx, i, &["in"])?;
    let (i, water) = water_amount(cx, i)?;
    let i = has_keyword(i, "of").unwrap_or(i);
    let (i, _) = expect(cx, i, &["water"])?;
    let (i, _) = expect(cx, i, &["from", "at"])?;
    let (i, start) = committed_temperature(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::Extrapolate], &[])?;
    Ok((
        i,
        Statement::Dissolving(Dissolving {
            solid,
            solute,
            water,
            start,
            options: tail.options,
        }),
    ))
}

#[cfg(test)]
mod tests {
    use crate::query::{ParseErrorKind, Statement, WaterAmount, parse_script};

    fn one(text: &str) -> Result<Statement, crate::query::ParseError> {
        parse_script(text).remove(0).map(|l| l.node)
    }

    #[test]
    fn reads_the_batch() {
        let Ok(Statement::Dissolving(d)) = one("dissolving 300 g CaCl2 in 1 kg water from 20 C")
        else {
            panic!("not parsed");
        };
        assert_eq!(d.solid.grams(), 300.0);
        assert_eq!(d.solute.text, "CaCl2");
        assert!(matches!(d.water, WaterAmount::Mass(m) if m.grams() == 1000.0));
        assert_eq!(d.start.celsius(), 20.0);
        assert!(!d.options.extrapolate);
        let Ok(Statement::Dissolving(d)) =
            one("DISSOLVING 2 lb of ammonium nitrate in 500g of water at 68 F extrapolate")
        else {
            panic!("not parsed");
        };
        assert!((d.solid.grams() - 907.184_74).abs() < 1e-9);
        assert_eq!(d.solute.text, "ammonium nitrate");
        assert!(matches!(d.water, WaterAmount::Mass(m) if m.grams() == 500.0));
        assert!((d.start.celsius() - 20.0).abs() < 1e-9);
        assert!(d.options.extrapolate);
        // Water by volume: litres, `mL` a thousandth.
        for (text, litres) in [
            ("dissolving 50 g NaCl in 1 L water from 20 C", 1.0),
            ("dissolving 50 g NaCl in 250 mL of water at 4 C", 0.25),
        ] {
            let Ok(Statement::Dissolving(d)) = one(text) else {
                panic!("not parsed: {text}");
            };
            assert!(
                matches!(d.water, WaterAmount::Litres { value, .. } if value == litres),
                "{text}"
            );
        }
    }

    fn fault(text: &str) -> (String, (usize, usize), ParseErrorKind) {
        let e = one(text).expect_err("must not parse");
        (e.to_string(), (e.span.start, e.span.end), e.kind)
    }

    #[test]
    fn says_what_is_wrong_and_where() {
        const GALLON: &str = "dissolving 300 g CaCl2 in 1 gal water from 20 C";
        const MISSPELT: &str = "dissolving 300 g CaCl2 in 1 kg watr from 20 C";
        let says = [
            // A unit the water does not take: the units it does.
            (GALLON, "the water, such as `1 kg` or `1 L`"),
            (GALLON, "`L` or `mL`"),
            // The solid by volume: a mass, with the mass it nearly is.
            (
                "dissolving 300 mL CaCl2 in 1 kg water from 20 C",
                "did you mean `g`",
            ),
            // A loading where a mass belongs.
            (
                "dissolving 30 g/100g water CaCl2 in 1 kg water from 20 C",
                "the mass of solid",
            ),
            // Misspelt keyword: did you mean.
            (MISSPELT, "`water`"),
            // A zero mass.
            ("dissolving 0 g NaOH in 1 kg water from 20 C", "above zero"),
            // No start temperature.
            ("dissolving 3 g NaOH in 1 kg water", "`from` or `at`"),
            // A misspelt mass unit.
            (
                "dissolving 3 kgg NaOH in 1 kg water from 20 C",
                "did you mean `kg`",
            ),
            // A range is not a start.
            (
                "dissolving 3 g NaOH in 1 kg water from 20 C to 30 C",
                "end of the statement",
            ),
        ];
        for (text, said) in says {
            let (msg, _, _) = fault(text);
            assert!(msg.contains(said), "{text}: {msg}");
        }
        assert_eq!(fault(GALLON).1, (26, 31));
        assert_eq!(fault(MISSPELT).1, (31, 35));
        // A negative mass, and a start below absolute zero.
        let (_, _, kind) = fault("dissolving -3 g NaOH in 1 kg water from 20 C");
        assert!(matches!(kind, ParseErrorKind::NegativeAmount { .. }));
        let (_, _, kind) = fault("dissolving 3 g NaOH in 1 kg water from -300 C");
        assert!(matches!(kind, ParseErrorKind::BelowAbsoluteZero { .. }));
    }
}
