//! Quantities: numbers with units, names bound by `let`, and the one generic rule that reads
//! a temperature, a loading or a pressure; units after `in`; temperature ranges.

use nom::{
    Err as NomErr, Parser,
    branch::alt,
    character::complete::{char, digit0, digit1, one_of as one_char_of},
    combinator::{cut, opt, recognize},
    error::context,
};

use super::super::ast::*;
use super::super::error::ParseErrorKind;
use super::super::lexicon::{is_keyword, nearest, one_of, unit_symbols};
use super::plumbing::*;
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit, ambiguous_symbol};

// ---------------------------------------------------------------------------------------
// numbers and units

pub(super) fn starts_number(t: &str) -> bool {
    let s = t.strip_prefix(['+', '-', '−']).unwrap_or(t);
    let s = s.strip_prefix('.').unwrap_or(s);
    s.starts_with(|c: char| c.is_ascii_digit())
}

pub(super) fn number_text(i: &str) -> R<'_, &str> {
    recognize((
        // U+2212, the minus sign of typeset tables, is accepted for `-`.
        opt(one_char_of("+-−")),
        alt((
            recognize((digit1, opt((char('.'), digit0)))),
            recognize((char('.'), digit1)),
        )),
        opt((one_char_of("eE"), opt(one_char_of("+-")), digit1)),
    ))
    .parse(i)
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) enum AnyUnit {
    Temperature(TemperatureUnit),
    Composition(CompositionUnit),
    Pressure(PressureUnit),
    /// A bare `%`: a margin, never a loading (it does not say per mass or per volume).
    Percent,
}

impl AnyUnit {
    pub(super) fn kind(self) -> ValueKind {
        match self {
            AnyUnit::Temperature(_) => ValueKind::Temperature,
            AnyUnit::Composition(_) => ValueKind::Loading,
            AnyUnit::Pressure(_) => ValueKind::Pressure,
            AnyUnit::Percent => ValueKind::Margin,
        }
    }
}

/// A unit symbol through the shared vocabulary of `science::units`.
pub(super) fn classify(symbol: &str) -> Option<AnyUnit> {
    TemperatureUnit::from_symbol(symbol)
        .map(AnyUnit::Temperature)
        .or_else(|| PressureUnit::from_symbol(symbol).map(AnyUnit::Pressure))
        .or_else(|| CompositionUnit::from_symbol(symbol).map(AnyUnit::Composition))
        .or_else(|| (symbol == "%").then_some(AnyUnit::Percent))
}

pub(super) struct UnitMatch {
    pub(super) unit: AnyUnit,
    /// Bytes of the input the unit took, blanks before it included.
    pub(super) used: usize,
    /// The unit's words joined by one space (`g/100g water`).
    pub(super) written: String,
}

/// The longest run of up to three words at `i` that is a unit symbol.
pub(super) fn unit_at(i: &str) -> Option<UnitMatch> {
    let mut words: Vec<(&str, usize)> = Vec::new();
    let mut rest = i;
    while words.len() < 3 {
        let (word, after) = next_word(rest);
        if word.is_empty() {
            break;
        }
        words.push((word, i.len() - after.len()));
        rest = after;
    }
    (1..=words.len()).rev().find_map(|n| {
        let written = words[..n]
            .iter()
            .map(|(w, _)| *w)
            .collect::<Vec<_>>()
            .join(" ");
        classify(&written).map(|unit| UnitMatch {
            unit,
            used: words[n - 1].1,
            written,
        })
    })
}

/// The closest unit symbol, preferring the kind the statement wants there.
pub(super) fn suggest_unit(word: &str, after_word: &str, expected: ValueKind) -> Option<String> {
    let (second, _) = next_word(after_word);
    let two_words = format!("{word} {second}");
    [Some(expected), None].into_iter().find_map(|kind| {
        let symbols = unit_symbols(kind);
        // Units keep their case (`M` is mol/L, `m` mol/kg): `MOL/KG` is a slip of case.
        let same_letters = symbols
            .iter()
            .find(|s| s.eq_ignore_ascii_case(word))
            .copied();
        same_letters
            .or_else(|| nearest(word, &symbols))
            .or_else(|| {
                (!second.is_empty())
                    .then(|| nearest(&two_words, &symbols))
                    .flatten()
            })
            .map(str::to_string)
    })
}

/// A unit that does not say its basis (`%`, `ppm`), with the units to write instead.
fn ambiguous(expected: ValueKind, found: String, symbol: &str, span: Span) -> NomErr<PErr> {
    failure(
        ParseErrorKind::AmbiguousUnit {
            expected,
            found,
            advice: ambiguous_symbol(symbol).unwrap_or_default(),
        },
        span,
    )
}

/// A unit nobody knows at `i`, or a missing one after `number`.
pub(super) fn unit_fault(
    cx: Cx,
    number_start: &str,
    after_number: &str,
    expected: ValueKind,
) -> NomErr<PErr> {
    let t = skip(after_number);
    let (word, after) = next_word(t);
    let number = number_start[..number_start.len() - after_number.len()].to_string();
    if after_number.starts_with(',') && word.len() > 1 && starts_number(&word[1..]) {
        // `1,5 mol/kg`: a decimal comma.
        return failure(
            ParseErrorKind::Expected {
                expected: "a number with a decimal point, such as `1.5`".into(),
                found: Some(shorten(&format!("{number}{word}"))),
                suggestion: Some(format!("{number}.{}", &word[1..])),
            },
            cx.span(number_start, after),
        );
    }
    if ambiguous_symbol(word).is_some() {
        let found = shorten(&format!("{number} {word}"));
        return ambiguous(expected, found, word, cx.span(number_start, after));
    }
    if word.is_empty() || is_keyword(word) {
        failure(
            ParseErrorKind::MissingUnit { expected, number },
            cx.span(number_start, after_number),
        )
    } else {
        failure(
            ParseErrorKind::UnknownUnit {
                expected,
                found: shorten(word),
                suggestion: suggest_unit(word, after, expected),
            },
            cx.span(t, after),
        )
    }
}

pub(super) struct Quantity {
    pub(super) value: f64,
    pub(super) unit: AnyUnit,
    pub(super) span: Span,
    pub(super) text: String,
}

/// A number and its unit. A soft error when no number stands here.
pub(super) fn quantity<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, Quantity> {
    let t = skip(i);
    if !starts_number(t) {
        return Err(soft(t));
    }
    let (after, number) = number_text(t)?;
    let value = match number.replace('−', "-").parse::<f64>() {
        Ok(v) if v.is_finite() => v,
        _ => {
            return Err(failure(
                ParseErrorKind::InvalidNumber {
                    found: shorten(number),
                },
                cx.span(t, after),
            ));
        }
    };
    let Some(found) = unit_at(after) else {
        return Err(unit_fault(cx, t, after, expected));
    };
    let rest = &after[found.used..];
    let text = shorten(&t[..t.len() - rest.len()]);
    Ok((
        rest,
        Quantity {
            value,
            unit: found.unit,
            span: cx.span(t, rest),
            text,
        },
    ))
}

pub(super) fn is_name_of_own(word: &str) -> bool {
    let mut chars = word.chars();
    chars.next().is_some_and(|c| c.is_alphabetic() || c == '_')
        && chars.all(|c| c.is_alphanumeric() || c == '_' || c == '-')
}

/// A name bound by `let`, resolved. A soft error when no such word stands here.
pub(super) fn resolve<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, (String, Value)> {
    let t = skip(i);
    let (word, after) = next_word(t);
    // Keywords and unit symbols can never be bound, so they are never "unbound names".
    if !is_name_of_own(word) || is_keyword(word) || classify(word).is_some() {
        return Err(soft(t));
    }
    let span = cx.span(t, after);
    match cx.env.get(word) {
        Some(value) => Ok((after, (word.to_string(), value.at(span)))),
        None => {
            let names: Vec<&str> = cx.env.names().collect();
            Err(failure(
                ParseErrorKind::UnboundName {
                    expected,
                    name: shorten(word),
                    suggestion: nearest(word, &names).map(str::to_string),
                },
                span,
            ))
        }
    }
}

pub(super) fn mismatch(
    expected: ValueKind,
    name: String,
    bound: ValueKind,
    span: Span,
) -> NomErr<PErr> {
    failure(
        ParseErrorKind::NameKindMismatch {
            expected,
            name,
            bound,
        },
        span,
    )
}

pub(super) fn wrong_quantity(expected: ValueKind, q: &Quantity) -> NomErr<PErr> {
    if q.unit == AnyUnit::Percent {
        return ambiguous(expected, q.text.clone(), "%", q.span);
    }
    failure(
        ParseErrorKind::WrongQuantity {
            expected,
            found: q.text.clone(),
            found_kind: q.unit.kind(),
        },
        q.span,
    )
}

pub(super) fn checked_temperature(
    q: &Quantity,
    unit: TemperatureUnit,
) -> Result<Temperature, NomErr<PErr>> {
    let t = Temperature {
        value: q.value,
        unit,
        span: q.span,
    };
    if t.kelvin() < 0.0 {
        Err(failure(
            ParseErrorKind::BelowAbsoluteZero {
                found: q.text.clone(),
            },
            q.span,
        ))
    } else {
        Ok(t)
    }
}

pub(super) fn negative(q: &Quantity) -> NomErr<PErr> {
    failure(
        ParseErrorKind::NegativeAmount {
            found: q.text.clone(),
        },
        q.span,
    )
}

/// What the generic quantity rule needs to know of a temperature, a loading or a pressure:
/// its kind, how a written quantity becomes one (or why it cannot), and how a bound value is
/// taken back out of a `let`.
pub(super) trait Measured: Sized {
    const KIND: ValueKind;
    fn from_quantity(q: &Quantity) -> Result<Self, NomErr<PErr>>;
    fn from_value(value: Value) -> Option<Self>;
}

/// `Measured::from_value` for a kind whose `Value` variant is named like its type.
macro_rules! from_value {
    ($kind:ident) => {
        fn from_value(value: Value) -> Option<Self> {
            match value {
                Value::$kind(v) => Some(v),
                _ => None,
            }
        }
    };
}

impl Measured for Temperature {
    const KIND: ValueKind = ValueKind::Temperature;
    fn from_quantity(q: &Quantity) -> Result<Self, NomErr<PErr>> {
        match q.unit {
            AnyUnit::Temperature(unit) => checked_temperature(q, unit),
            _ => Err(wrong_quantity(Self::KIND, q)),
        }
    }
    from_value!(Temperature);
}

/// `Measured` for an amount that cannot be negative: a `{ value, unit, span }` record whose
/// unit is the `AnyUnit` variant named.
macro_rules! non_negative_amount {
    ($kind:ident, $unit:ident) => {
        impl Measured for $kind {
            const KIND: ValueKind = ValueKind::$kind;
            fn from_quantity(q: &Quantity) -> Result<Self, NomErr<PErr>> {
                match q.unit {
                    AnyUnit::$unit(_) if q.value < 0.0 => Err(negative(q)),
                    AnyUnit::$unit(unit) => Ok($kind {
                        value: q.value,
                        unit,
                        span: q.span,
                    }),
                    _ => Err(wrong_quantity(Self::KIND, q)),
                }
            }
            from_value!($kind);
        }
    };
}

non_negative_amount!(Loading, Composition);
non_negative_amount!(Pressure, Pressure);

/// The one quantity rule: a number with a unit of the kind `T` wants, or a name bound by
/// `let` to a value of that kind.
pub(super) fn measured<'a, T: Measured>(cx: Cx<'a>, i: &'a str) -> R<'a, T> {
    let t = skip(i);
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, T::KIND)?;
        return Ok((rest, T::from_quantity(&q)?));
    }
    let (rest, (name, value)) = resolve(cx, t, T::KIND)?;
    let bound = value.kind();
    match T::from_value(value) {
        Some(v) => Ok((rest, v)),
        None => Err(mismatch(T::KIND, name, bound, cx.span(t, rest))),
    }
}

pub(super) fn temperature<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperature> {
    measured(cx, i)
}

pub(super) fn loading<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Loading> {
    measured(cx, i)
}

pub(super) fn pressure<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Pressure> {
    measured(cx, i)
}

pub(super) fn margin<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Margin> {
    let t = skip(i);
    if !starts_number(t) {
        return Err(soft(t));
    }
    let (rest, q) = quantity(cx, t, ValueKind::Margin)?;
    let written_percent = unit_at(&t[number_text(t).map_or(0, |(r, _)| t.len() - r.len())..])
        .is_some_and(|m| m.written == "%");
    if !written_percent {
        return Err(wrong_quantity(ValueKind::Margin, &q));
    }
    if !(0.0..100.0).contains(&q.value) {
        return Err(failure(
            ParseErrorKind::MarginOutOfRange { found: q.text },
            q.span,
        ));
    }
    Ok((
        rest,
        Margin {
            percent: q.value,
            span: q.span,
        },
    ))
}

/// A unit after `in` or `to`.
pub(super) fn unit_choice<'a>(
    cx: Cx<'a>,
    i: &'a str,
    expected: ValueKind,
) -> R<'a, (AnyUnit, Span, String)> {
    let t = skip(i);
    if let Some(m) = unit_at(t) {
        let rest = &t[m.used..];
        return Ok((rest, (m.unit, cx.span(t, rest), m.written)));
    }
    let (word, after) = next_word(t);
    if word.is_empty() || is_keyword(word) {
        return Err(soft(t));
    }
    Err(failure(
        ParseErrorKind::UnknownUnit {
            expected,
            found: shorten(word),
            suggestion: suggest_unit(word, after, expected),
        },
        cx.span(t, after),
    ))
}

/// A unit after `in` that must be of the kind `kind`; `pick` takes it out of `AnyUnit`.
fn unit_of_kind<'a, U>(
    cx: Cx<'a>,
    i: &'a str,
    kind: ValueKind,
    pick: fn(AnyUnit) -> Option<U>,
) -> R<'a, UnitChoice<U>> {
    let (rest, (unit, span, written)) =
        cut(context(kind.unit_example(), |x| unit_choice(cx, x, kind))).parse(i)?;
    match pick(unit) {
        Some(unit) => Ok((rest, UnitChoice { unit, span })),
        None if unit == AnyUnit::Percent && kind == ValueKind::Loading => {
            Err(ambiguous(kind, written, "%", span))
        }
        None => Err(failure(
            ParseErrorKind::WrongUnit {
                expected: kind,
                found: written,
                found_kind: unit.kind(),
            },
            span,
        )),
    }
}

/// A composition unit after `in` or `to`. A bare `ppm` asked of an answer is read as parts
/// per million by mass (`ppm w/w`, mg per kg of solution): the answer names its unit, so
/// nothing is left to guess (an amount written in bare `ppm` is still refused).
pub(super) fn composition_unit<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, UnitChoice<CompositionUnit>> {
    let t = skip(i);
    let (word, after) = next_word(t);
    if word.eq_ignore_ascii_case("ppm") && unit_at(t).is_none() {
        let unit = CompositionUnit::MilligramsPerKilogram;
        return Ok((
            after,
            UnitChoice {
                unit,
                span: cx.span(t, after),
            },
        ));
    }
    unit_of_kind(cx, i, ValueKind::Loading, |u| match u {
        AnyUnit::Composition(unit) => Some(unit),
        _ => None,
    })
}

pub(super) fn temperature_unit<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, UnitChoice<TemperatureUnit>> {
    unit_of_kind(cx, i, ValueKind::Temperature, |u| match u {
        AnyUnit::Temperature(unit) => Some(unit),
        _ => None,
    })
}

// ---------------------------------------------------------------------------------------
// temperatures

/// `from T1 to T2` or `between T1 and T2`, the opening word included. The unit may be
/// written once, after the second number (`from 2 to 8 C`).
pub(super) fn range_from<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, TemperatureRange> {
    let begin = skip(i);
    let (rest, opener) = expect(cx, begin, &["from", "between"])?;
    let joiners: &[&'static str] = if opener.eq_ignore_ascii_case("between") {
        &["and"]
    } else {
        &["to"]
    };
    range_body(cx, begin, rest, joiners)
}

/// The words (and `-`) that may join the two ends of a range with no opening word.
const BARE_JOINERS: [&str; 2] = ["to", "-"];

/// A range with no opening word, where a number begins: `2-8 C`, `2–8 °C`, `2 to 8 C`,
/// `2 C to 8 C`. `None` when no such range stands at `i` (a lone temperature, say).
pub(super) fn bare_range<'a>(cx: Cx<'a>, i: &'a str) -> Option<R<'a, TemperatureRange>> {
    let t = skip(i);
    if !starts_number(t) {
        return None;
    }
    let (after, _) = number_text(t).ok()?;
    let after_low = match unit_at(after) {
        None => after,
        Some(m) if matches!(m.unit, AnyUnit::Temperature(_)) => &after[m.used..],
        Some(_) => return None,
    };
    joined(after_low, &BARE_JOINERS)?;
    Some(range_body(cx, t, t, &BARE_JOINERS))
}

/// True when `t` opens a range with `from` or `between`.
pub(super) fn opens_range(t: &str) -> bool {
    has_keyword(t, "from").is_some() || has_keyword(t, "between").is_some()
}

/// A range standing at `t`, with no opening word (`2-8 C`) or opened by `from` or
/// `between`; `None` when none does.
pub(super) fn range_here<'a>(cx: Cx<'a>, t: &'a str) -> Option<R<'a, TemperatureRange>> {
    if opens_range(t) {
        return Some(range_from(cx, t));
    }
    bare_range(cx, t)
}

/// After the first end of a range: what follows the joining word (`to`, `and`) or dash, if
/// one stands here. A dash joins when it touches the number before it (`2-8`) or stands
/// alone between blanks (`2 - 8`), so `2 -8` is not read as a range.
fn joined<'a>(i: &'a str, joiners: &[&'static str]) -> Option<&'a str> {
    for word in joiners {
        if *word == "-" {
            let t = skip(i);
            let touching = t.len() == i.len();
            if let Some(rest) = t.strip_prefix(['-', '\u{2013}', '\u{2014}']) {
                let spaced = rest.starts_with(char::is_whitespace);
                if (touching || spaced) && starts_number(skip(rest)) {
                    return Some(rest);
                }
            }
        } else if let Some(rest) = has_keyword(i, word) {
            return Some(rest);
        }
    }
    None
}

/// The ends of a range after its opening word (if any): `T1 joiner T2`, where `T1` may be a
/// bare number that takes the unit of `T2`.
fn range_body<'a>(
    cx: Cx<'a>,
    begin: &'a str,
    i: &'a str,
    joiners: &[&'static str],
) -> R<'a, TemperatureRange> {
    let t = skip(i);
    let bare_low = starts_number(t)
        .then(|| number_text(t).ok())
        .flatten()
        .filter(|(after, _)| unit_at(after).is_none() && joined(after, joiners).is_some());
    // The first end: a temperature, or a bare number waiting for the second end's unit.
    let (rest, low) = match bare_low {
        Some((after, number)) => (after, Err((number, cx.span(t, after)))),
        None => {
            let (r, low) = committed_temperature(cx, t)?;
            (r, Ok(low))
        }
    };
    let Some(rest) = joined(rest, joiners) else {
        return Err(expected_here(cx, rest, one_of(joiners), joiners));
    };
    let (rest, high) = committed_temperature(cx, rest)?;
    let low = match low {
        Ok(low) => low,
        Err((number, span)) => {
            let Some(value) = number
                .replace('\u{2212}', "-")
                .parse::<f64>()
                .ok()
                .filter(|v| v.is_finite())
            else {
                return Err(failure(
                    ParseErrorKind::InvalidNumber {
                        found: shorten(number),
                    },
                    span,
                ));
            };
            let q = Quantity {
                value,
                unit: AnyUnit::Temperature(high.unit),
                span,
                text: shorten(&format!("{number} {}", high.unit.symbol())),
            };
            checked_temperature(&q, high.unit)?
        }
    };
    Ok((rest, ordered_range(cx, low, high, cx.span(begin, rest))?))
}

/// The range from `low` to `high` over `span`, refused when it runs backwards (`8 C to 2 C`).
pub(super) fn ordered_range(
    cx: Cx<'_>,
    low: Temperature,
    high: Temperature,
    span: Span,
) -> Result<TemperatureRange, NomErr<PErr>> {
    if low.kelvin() > high.kelvin() {
        return Err(failure(
            ParseErrorKind::ReversedRange {
                low: cx.text(low.span),
                high: cx.text(high.span),
            },
            span,
        ));
    }
    Ok(TemperatureRange { low, high, span })
}

/// After `every`: a step of temperature above zero (`5 C`, `5 K`; `9 F` is 5 K).
pub(super) fn temperature_step<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, TemperatureStep> {
    const WHAT: &str = "a step of temperature above zero, such as `5 C`";
    let t = skip(i);
    let (rest, q) = cut(context(WHAT, |x| quantity(cx, x, ValueKind::Temperature))).parse(t)?;
    let AnyUnit::Temperature(unit) = q.unit else {
        return Err(wrong_quantity(ValueKind::Temperature, &q));
    };
    let kelvin = match unit {
        TemperatureUnit::Fahrenheit => q.value * 5.0 / 9.0,
        TemperatureUnit::Celsius | TemperatureUnit::Kelvin => q.value,
    };
    if kelvin <= 0.0 {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: WHAT.into(),
                found: Some(q.text),
                suggestion: None,
            },
            q.span,
        ));
    }
    Ok((
        rest,
        TemperatureStep {
            kelvin,
            span: q.span,
        },
    ))
}

pub(super) fn committed_temperature<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperature> {
    cut(context(ValueKind::Temperature.example(), |x| {
        temperature(cx, x)
    }))
    .parse(i)
}

/// After `at` or `over`: a temperature, or a name bound to a temperature or a range.
pub(super) fn point_or_range<'a>(
    cx: Cx<'a>,
    i: &'a str,
    expected: ValueKind,
) -> R<'a, Temperatures> {
    let t = skip(i);
    if let Some(range) = bare_range(cx, t) {
        let (rest, range) = range?;
        return Ok((rest, Temperatures::Range(range)));
    }
    if starts_number(t) {
        let (rest, temperature) = temperature(cx, t)?;
        return Ok((rest, Temperatures::At(temperature)));
    }
    match resolve(cx, t, expected)? {
        (rest, (_, Value::Temperature(v))) => Ok((rest, Temperatures::At(v))),
        (rest, (_, Value::Range(r))) => Ok((rest, Temperatures::Range(r))),
        (rest, (name, other)) => Err(mismatch(expected, name, other.kind(), cx.span(t, rest))),
    }
}

/// `at T`, `from T1 to T2`, `between T1 and T2`, `over NAME` (or `over from T1 to T2`), or
/// a range with no opening word (`2-8 C`).
pub(super) fn temperatures<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperatures> {
    const WHAT: &str = "a temperature or a range, as in `at 5 C`, `from 2 C to 8 C` or `over cold`";
    let t = skip(i);
    if let Some(range) = range_here(cx, t) {
        let (rest, range) = range?;
        return Ok((rest, Temperatures::Range(range)));
    }
    if let Some(rest) = has_keyword(t, "at") {
        return cut(context(WHAT, |x| {
            point_or_range(cx, x, ValueKind::Temperature)
        }))
        .parse(rest);
    }
    if let Some(rest) = has_keyword(t, "over") {
        if opens_range(rest) {
            let (rest, range) = range_from(cx, rest)?;
            return Ok((rest, Temperatures::Range(range)));
        }
        return cut(context(WHAT, |x| {
            point_or_range(cx, x, ValueKind::TemperatureRange)
        }))
        .parse(rest);
    }
    Err(expected_here(
        cx,
        t,
        "`at`, `from` or `over` and a temperature".into(),
        &["at", "from", "over"],
    ))
}
