//! The nom parser: script text to typed statements. Splits a script into statements, parses
//! each with nom (`context` names what a rule expects, `cut` commits once a keyword has chosen
//! the branch), resolves `let` names from an environment, and turns every fault into a
//! `ParseError` with a span into the whole script.

use std::collections::BTreeMap;

use nom::{
    Err as NomErr, IResult, Parser,
    branch::alt,
    bytes::complete::{tag_no_case, take_while},
    character::complete::{char, digit0, digit1, one_of as one_char_of, satisfy},
    combinator::{cut, not, opt, recognize},
    error::{ContextError, ErrorKind, ParseError as NomParseError, context},
    sequence::{preceded, terminated},
};

use super::ast::*;
use super::error::{ParseError, ParseErrorKind};
use super::lexicon::{STATEMENT_WORDS, ends_name, is_keyword, nearest, one_of, unit_symbols};
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

/// Values bound by `let`, kept across the statements of one script, or across the lines of
/// a REPL session. Names are compared without regard to case.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Env {
    bindings: BTreeMap<String, Value>,
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
        self.bindings.insert(name.to_lowercase(), value);
    }

    /// The bound names, in alphabetical order (for completion and "did you mean").
    pub fn names(&self) -> impl Iterator<Item = &str> {
        self.bindings.keys().map(String::as_str)
    }

    pub fn is_empty(&self) -> bool {
        self.bindings.is_empty()
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
        if let Ok(Located {
            node: Statement::Let(binding),
            ..
        }) = &result
        {
            env.bind(&binding.name.text, binding.value);
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
    if let Ok(Located {
        node: Statement::Let(binding),
        ..
    }) = &result
    {
        env.bind(&binding.name.text, binding.value);
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

// ---------------------------------------------------------------------------------------
// nom plumbing

/// The nom error: either a finished fault (from a rule that knows exactly what went wrong)
/// or a position with the innermost `context` that failed there.
#[derive(Debug)]
pub(crate) struct PErr {
    rest_len: usize,
    context: Option<(&'static str, usize)>,
    fault: Option<Box<ParseError>>,
}

impl PErr {
    fn at(rest: &str) -> Self {
        PErr {
            rest_len: rest.len(),
            context: None,
            fault: None,
        }
    }

    fn into_parse_error(self, cx: Cx) -> ParseError {
        if let Some(fault) = self.fault {
            return *fault;
        }
        let (expected, rest_len) = match self.context {
            Some((what, len)) => (what.to_string(), len),
            None => ("the rest of the statement".to_string(), self.rest_len),
        };
        let rest = cx.suffix(rest_len);
        let (span, found) = found_at(cx, rest);
        ParseError::new(
            ParseErrorKind::Expected {
                expected,
                found,
                suggestion: None,
            },
            span,
        )
    }
}

impl<'a> NomParseError<&'a str> for PErr {
    fn from_error_kind(input: &'a str, _kind: ErrorKind) -> Self {
        PErr::at(input)
    }

    fn append(_input: &'a str, _kind: ErrorKind, other: Self) -> Self {
        other
    }

    fn or(self, other: Self) -> Self {
        // Keep a finished fault; otherwise the branch that got further.
        match (&self.fault, &other.fault) {
            (Some(_), _) => self,
            (None, Some(_)) => other,
            _ if self.rest_len <= other.rest_len => self,
            _ => other,
        }
    }
}

impl<'a> ContextError<&'a str> for PErr {
    fn add_context(input: &'a str, what: &'static str, mut other: Self) -> Self {
        if other.fault.is_none() && other.context.is_none() {
            other.context = Some((what, input.len()));
        }
        other
    }
}

type R<'a, T> = IResult<&'a str, T, PErr>;

/// What every rule needs: the statement's text, where it starts in the script, and the
/// names bound so far.
#[derive(Clone, Copy)]
struct Cx<'a> {
    piece: &'a str,
    start: usize,
    env: &'a Env,
}

impl<'a> Cx<'a> {
    /// Offset in the whole script of `rest`, a suffix of the statement.
    fn offset(&self, rest: &str) -> usize {
        self.start + self.piece.len().saturating_sub(rest.len())
    }

    fn span(&self, from: &str, to: &str) -> Span {
        Span::new(self.offset(from), self.offset(to))
    }

    fn suffix(&self, len: usize) -> &'a str {
        let at = self.piece.len().saturating_sub(len);
        self.piece.get(at..).unwrap_or("")
    }

    /// Text of a span inside this statement.
    fn text(&self, span: Span) -> String {
        let from = span.start.saturating_sub(self.start);
        let to = span.end.saturating_sub(self.start);
        self.piece.get(from..to).unwrap_or("").to_string()
    }
}

fn failure(kind: ParseErrorKind, span: Span) -> NomErr<PErr> {
    NomErr::Failure(PErr {
        rest_len: 0,
        context: None,
        fault: Some(Box::new(ParseError::new(kind, span))),
    })
}

fn soft(rest: &str) -> NomErr<PErr> {
    NomErr::Error(PErr::at(rest))
}

/// Characters that may be part of a word: anything but blanks and the three marks the
/// language gives a meaning (`;` ends, `#` comments, `=` binds).
fn is_word_char(c: char) -> bool {
    !c.is_whitespace() && !matches!(c, ';' | '#' | '=')
}

fn blanks(i: &str) -> R<'_, &str> {
    take_while(char::is_whitespace).parse(i)
}

fn skip(i: &str) -> &str {
    i.trim_start()
}

/// The next word after blanks, and what follows it.
fn next_word(i: &str) -> (&str, &str) {
    let t = skip(i);
    let n = t.find(|c: char| !is_word_char(c)).unwrap_or(t.len());
    (&t[..n], &t[n..])
}

/// Text shown as "found `...`": cut to 40 characters so a huge input stays readable.
fn shorten(text: &str) -> String {
    let mut chars = text.chars();
    let head: String = chars.by_ref().take(40).collect();
    if chars.next().is_some() {
        format!("{head}…")
    } else {
        head
    }
}

/// A keyword, in any case, standing as a whole word.
fn keyword<'a>(word: &'static str) -> impl Parser<&'a str, Output = &'a str, Error = PErr> {
    preceded(
        blanks,
        terminated(tag_no_case(word), not(satisfy(is_word_char))),
    )
}

/// What stands at `i`, for "found ...": a quantity with its unit, a word, or one mark.
fn found_at(cx: Cx, i: &str) -> (Span, Option<String>) {
    let t = skip(i);
    if t.is_empty() {
        let at = cx.offset(t);
        return (Span::new(at, at), None);
    }
    let mut end = None;
    if starts_number(t) {
        if let Ok((after, _)) = number_text(t) {
            end = Some(match unit_at(after) {
                Some(m) => &after[m.used..],
                None => after,
            });
        }
    }
    let end = end.unwrap_or_else(|| {
        let (word, after) = next_word(t);
        if word.is_empty() {
            let width = t.chars().next().map_or(0, char::len_utf8);
            &t[width..]
        } else {
            after
        }
    });
    let text = &t[..t.len() - end.len()];
    (cx.span(t, end), Some(shorten(text)))
}

/// Fails with "expected {expected}, found ..." and a suggestion among `candidates`.
fn expected_here(cx: Cx, i: &str, expected: String, candidates: &[&str]) -> NomErr<PErr> {
    let (span, found) = found_at(cx, i);
    let suggestion = found
        .as_deref()
        .and_then(|w| nearest(w, candidates))
        .map(str::to_string);
    failure(
        ParseErrorKind::Expected {
            expected,
            found,
            suggestion,
        },
        span,
    )
}

/// One of `words`, or a committed fault that names them (and the closest, if misspelt).
fn expect<'a>(cx: Cx<'a>, i: &'a str, words: &[&'static str]) -> R<'a, &'a str> {
    for word in words {
        if let Ok(done) = keyword(word).parse(i) {
            return Ok(done);
        }
    }
    Err(expected_here(cx, i, one_of(words), words))
}

fn has_keyword<'a>(i: &'a str, word: &'static str) -> Option<&'a str> {
    keyword(word).parse(i).ok().map(|(rest, _)| rest)
}

// ---------------------------------------------------------------------------------------
// numbers and units

fn starts_number(t: &str) -> bool {
    let s = t.strip_prefix(['+', '-', '−']).unwrap_or(t);
    let s = s.strip_prefix('.').unwrap_or(s);
    s.starts_with(|c: char| c.is_ascii_digit())
}

fn number_text(i: &str) -> R<'_, &str> {
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
enum AnyUnit {
    Temperature(TemperatureUnit),
    Composition(CompositionUnit),
    Pressure(PressureUnit),
}

impl AnyUnit {
    fn kind(self) -> ValueKind {
        match self {
            AnyUnit::Temperature(_) => ValueKind::Temperature,
            AnyUnit::Composition(_) => ValueKind::Loading,
            AnyUnit::Pressure(_) => ValueKind::Pressure,
        }
    }
}

/// A unit symbol through the shared vocabulary of `science::units`.
fn classify(symbol: &str) -> Option<AnyUnit> {
    TemperatureUnit::from_symbol(symbol)
        .map(AnyUnit::Temperature)
        .or_else(|| PressureUnit::from_symbol(symbol).map(AnyUnit::Pressure))
        .or_else(|| CompositionUnit::from_symbol(symbol).map(AnyUnit::Composition))
}

struct UnitMatch {
    unit: AnyUnit,
    /// Bytes of the input the unit took, blanks before it included.
    used: usize,
    /// The unit's words joined by one space (`g/100g water`).
    written: String,
}

/// The longest run of up to three words at `i` that is a unit symbol.
fn unit_at(i: &str) -> Option<UnitMatch> {
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
fn suggest_unit(word: &str, after_word: &str, expected: ValueKind) -> Option<String> {
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

/// A unit nobody knows at `i`, or a missing one after `number`.
fn unit_fault(cx: Cx, number_start: &str, after_number: &str, expected: ValueKind) -> NomErr<PErr> {
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

struct Quantity {
    value: f64,
    unit: AnyUnit,
    span: Span,
    text: String,
}

/// A number and its unit. A soft error when no number stands here.
fn quantity<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, Quantity> {
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

fn is_name_of_own(word: &str) -> bool {
    let mut chars = word.chars();
    chars.next().is_some_and(|c| c.is_alphabetic() || c == '_')
        && chars.all(|c| c.is_alphanumeric() || c == '_' || c == '-')
}

/// A name bound by `let`, resolved. A soft error when no such word stands here.
fn resolve<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, (String, Value)> {
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

fn mismatch(expected: ValueKind, name: String, bound: ValueKind, span: Span) -> NomErr<PErr> {
    failure(
        ParseErrorKind::NameKindMismatch {
            expected,
            name,
            bound,
        },
        span,
    )
}

fn wrong_quantity(expected: ValueKind, q: &Quantity) -> NomErr<PErr> {
    failure(
        ParseErrorKind::WrongQuantity {
            expected,
            found: q.text.clone(),
            found_kind: q.unit.kind(),
        },
        q.span,
    )
}

fn checked_temperature(q: &Quantity, unit: TemperatureUnit) -> Result<Temperature, NomErr<PErr>> {
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

fn negative(q: &Quantity) -> NomErr<PErr> {
    failure(
        ParseErrorKind::NegativeAmount {
            found: q.text.clone(),
        },
        q.span,
    )
}

fn temperature<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperature> {
    let kind = ValueKind::Temperature;
    let t = skip(i);
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, kind)?;
        return match q.unit {
            AnyUnit::Temperature(unit) => Ok((rest, checked_temperature(&q, unit)?)),
            _ => Err(wrong_quantity(kind, &q)),
        };
    }
    match resolve(cx, t, kind)? {
        (rest, (_, Value::Temperature(v))) => Ok((rest, v)),
        (rest, (name, other)) => Err(mismatch(kind, name, other.kind(), cx.span(t, rest))),
    }
}

fn loading<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Loading> {
    let kind = ValueKind::Loading;
    let t = skip(i);
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, kind)?;
        return match q.unit {
            AnyUnit::Composition(_) if q.value < 0.0 => Err(negative(&q)),
            AnyUnit::Composition(unit) => Ok((
                rest,
                Loading {
                    value: q.value,
                    unit,
                    span: q.span,
                },
            )),
            _ => Err(wrong_quantity(kind, &q)),
        };
    }
    match resolve(cx, t, kind)? {
        (rest, (_, Value::Loading(v))) => Ok((rest, v)),
        (rest, (name, other)) => Err(mismatch(kind, name, other.kind(), cx.span(t, rest))),
    }
}

fn pressure<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Pressure> {
    let kind = ValueKind::Pressure;
    let t = skip(i);
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, kind)?;
        return match q.unit {
            AnyUnit::Pressure(_) if q.value < 0.0 => Err(negative(&q)),
            AnyUnit::Pressure(unit) => Ok((
                rest,
                Pressure {
                    value: q.value,
                    unit,
                    span: q.span,
                },
            )),
            _ => Err(wrong_quantity(kind, &q)),
        };
    }
    match resolve(cx, t, kind)? {
        (rest, (_, Value::Pressure(v))) => Ok((rest, v)),
        (rest, (name, other)) => Err(mismatch(kind, name, other.kind(), cx.span(t, rest))),
    }
}

fn margin<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Margin> {
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
fn unit_choice<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, (AnyUnit, Span, String)> {
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

fn composition_unit<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, UnitChoice<CompositionUnit>> {
    let kind = ValueKind::Loading;
    let (rest, (unit, span, written)) =
        cut(context(kind.unit_example(), |x| unit_choice(cx, x, kind))).parse(i)?;
    match unit {
        AnyUnit::Composition(unit) => Ok((rest, UnitChoice { unit, span })),
        other => Err(failure(
            ParseErrorKind::WrongUnit {
                expected: kind,
                found: written,
                found_kind: other.kind(),
            },
            span,
        )),
    }
}

fn temperature_unit<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, UnitChoice<TemperatureUnit>> {
    let kind = ValueKind::Temperature;
    let (rest, (unit, span, written)) =
        cut(context(kind.unit_example(), |x| unit_choice(cx, x, kind))).parse(i)?;
    match unit {
        AnyUnit::Temperature(unit) => Ok((rest, UnitChoice { unit, span })),
        other => Err(failure(
            ParseErrorKind::WrongUnit {
                expected: kind,
                found: written,
                found_kind: other.kind(),
            },
            span,
        )),
    }
}

// ---------------------------------------------------------------------------------------
// temperatures

/// `from T1 to T2`, `from` included.
fn range_from<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, TemperatureRange> {
    let begin = skip(i);
    let (rest, _) = expect(cx, begin, &["from"])?;
    let (rest, low) = committed_temperature(cx, rest)?;
    let (rest, _) = expect(cx, rest, &["to"])?;
    let (rest, high) = committed_temperature(cx, rest)?;
    let span = cx.span(begin, rest);
    if low.kelvin() > high.kelvin() {
        return Err(failure(
            ParseErrorKind::ReversedRange {
                low: cx.text(low.span),
                high: cx.text(high.span),
            },
            span,
        ));
    }
    Ok((rest, TemperatureRange { low, high, span }))
}

fn committed_temperature<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperature> {
    cut(context(ValueKind::Temperature.example(), |x| {
        temperature(cx, x)
    }))
    .parse(i)
}

/// After `at` or `over`: a temperature, or a name bound to a temperature or a range.
fn point_or_range<'a>(cx: Cx<'a>, i: &'a str, expected: ValueKind) -> R<'a, Temperatures> {
    let t = skip(i);
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

/// `at T`, `from T1 to T2`, `over NAME` (or `over from T1 to T2`).
fn temperatures<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperatures> {
    const WHAT: &str = "a temperature or a range, as in `at 5 C`, `from 2 C to 8 C` or `over cold`";
    let t = skip(i);
    if has_keyword(t, "from").is_some() {
        let (rest, range) = range_from(cx, t)?;
        return Ok((rest, Temperatures::Range(range)));
    }
    if let Some(rest) = has_keyword(t, "at") {
        return cut(context(WHAT, |x| {
            point_or_range(cx, x, ValueKind::Temperature)
        }))
        .parse(rest);
    }
    if let Some(rest) = has_keyword(t, "over") {
        if has_keyword(rest, "from").is_some() {
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

// ---------------------------------------------------------------------------------------
// names, classes, filters

fn ends_as_number(word: &str) -> bool {
    if !starts_number(word) {
        return false;
    }
    // `2-propanol` and `1,2-ethanediol` are names; `20`, `20C` are not.
    match number_text(word) {
        Ok((rest, _)) => !(rest.starts_with('-') || rest.starts_with(',')),
        Err(_) => true,
    }
}

/// A name of one or more words; it ends where a keyword or a number begins. A word close to
/// one of `followers` and followed by a number or a keyword is taken for a misspelt
/// follower (`KNO3 att 20 C`), not for part of the name.
fn name<'a>(cx: Cx<'a>, i: &'a str, followers: &[&'static str]) -> R<'a, Name> {
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

const SOLUTE: &str = "a solute such as `KNO3`, `potassium-nitrate` or `potassium nitrate`";

fn solute<'a>(cx: Cx<'a>, i: &'a str, followers: &[&'static str]) -> R<'a, Name> {
    cut(context(SOLUTE, |x| name(cx, x, followers))).parse(i)
}

fn class<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, SoluteClass> {
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
fn filters<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Vec<Filter>> {
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
enum Clause {
    InComposition,
    InTemperature,
    Margin,
    Extrapolate,
    ReviewedOnly,
}

#[derive(Default)]
struct Tail {
    composition: Option<UnitChoice<CompositionUnit>>,
    temperature: Option<UnitChoice<TemperatureUnit>>,
    margin: Option<Margin>,
    options: Options,
}

fn duplicate(cx: Cx, t: &str, after: &str, clause: &str) -> NomErr<PErr> {
    failure(
        ParseErrorKind::DuplicateClause {
            clause: clause.to_string(),
        },
        cx.span(t, after),
    )
}

/// The optional clauses, in any order, then the end of the statement. `earlier` names
/// optional words that could have stood before (for the message and the suggestion only).
fn tail<'a>(cx: Cx<'a>, i: &'a str, allowed: &[Clause], earlier: &[&'static str]) -> R<'a, Tail> {
    let mut out = Tail::default();
    let mut rest = i;
    loop {
        let t = skip(rest);
        if t.is_empty() {
            return Ok((t, out));
        }
        let (word, after) = next_word(t);
        let word = word.to_lowercase();
        let allows = |c: Clause| allowed.contains(&c);
        if word == "in" && allows(Clause::InComposition) {
            if out.composition.is_some() {
                return Err(duplicate(cx, t, after, "in"));
            }
            let (r, unit) = composition_unit(cx, after)?;
            out.composition = Some(unit);
            rest = r;
        } else if word == "in" && allows(Clause::InTemperature) {
            if out.temperature.is_some() {
                return Err(duplicate(cx, t, after, "in"));
            }
            let (r, unit) = temperature_unit(cx, after)?;
            out.temperature = Some(unit);
            rest = r;
        } else if word == "margin" && allows(Clause::Margin) {
            if out.margin.is_some() {
                return Err(duplicate(cx, t, after, "margin"));
            }
            let (r, m) =
                cut(context(ValueKind::Margin.example(), |x| margin(cx, x))).parse(after)?;
            out.margin = Some(m);
            rest = r;
        } else if word == "extrapolate" && allows(Clause::Extrapolate) {
            if out.options.extrapolate {
                return Err(duplicate(cx, t, after, "extrapolate"));
            }
            out.options.extrapolate = true;
            rest = after;
        } else if word == "reviewed" && allows(Clause::ReviewedOnly) {
            let (r, _) = expect(cx, after, &["only"])?;
            if out.options.reviewed_only {
                return Err(duplicate(cx, t, r, "reviewed only"));
            }
            out.options.reviewed_only = true;
            rest = r;
        } else {
            let mut words: Vec<&'static str> = earlier.to_vec();
            for clause in allowed {
                words.push(match clause {
                    Clause::InComposition | Clause::InTemperature => "in",
                    Clause::Margin => "margin",
                    Clause::Extrapolate => "extrapolate",
                    Clause::ReviewedOnly => "reviewed",
                });
            }
            words.dedup();
            let shown: Vec<&str> = words
                .iter()
                .map(|w| {
                    if *w == "reviewed" {
                        "reviewed only"
                    } else {
                        *w
                    }
                })
                .collect();
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

const DATA: [Clause; 2] = [Clause::Extrapolate, Clause::ReviewedOnly];

// ---------------------------------------------------------------------------------------
// statements

fn statement<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let t = skip(i);
    let (word, after) = next_word(t);
    match word.to_lowercase().as_str() {
        "solubility" => solubility(cx, after),
        "which" => screen(cx, after),
        "saturation" => saturation(cx, after),
        "ceiling" => ceiling(cx, after),
        "heat" => heat_of_solution(cx, after),
        "dissolved" => dissolved(cx, after),
        "freezing" => freezing(cx, after),
        "convert" => convert(cx, after),
        "describe" => describe(cx, after),
        "sources" => sources(cx, after),
        "list" => list(cx, after),
        "let" => binding(cx, after),
        "require" => require(cx, after),
        "plot" => plot(cx, after),
        _ => {
            let (span, found) = found_at(cx, t);
            let found = found.unwrap_or_default();
            Err(failure(
                ParseErrorKind::UnknownStatement {
                    suggestion: nearest(&found, &STATEMENT_WORDS).map(str::to_string),
                    found,
                },
                span,
            ))
        }
    }
}

fn solubility<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, temperature) = committed_temperature(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::InComposition, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        Statement::Solubility(Solubility {
            solute,
            temperature,
            unit: tail.composition,
            options: tail.options,
        }),
    ))
}

fn stays_dissolved_at<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, (Loading, Temperatures)> {
    let (i, _) = expect(cx, i, &["stay", "stays"])?;
    let (i, _) = expect(cx, i, &["dissolved"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, loading) = committed_loading(cx, i)?;
    let (i, temperatures) = temperatures(cx, i)?;
    Ok((i, (loading, temperatures)))
}

fn committed_loading<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Loading> {
    cut(context(ValueKind::Loading.example(), |x| loading(cx, x))).parse(i)
}

fn screen<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, class) = class(cx, i)?;
    let (i, filters) = filters(cx, i)?;
    let (i, (loading, temperatures)) = stays_dissolved_at(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::Margin, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        Statement::Screen(Screen {
            class,
            filters,
            loading,
            temperatures,
            margin: tail.margin,
            options: tail.options,
        }),
    ))
}

fn require<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solute) = solute(cx, i, &["stays", "stay"])?;
    let (i, (loading, temperatures)) = stays_dissolved_at(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::Margin, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        Statement::Require(Require {
            solute,
            loading,
            temperatures,
            margin: tail.margin,
            options: tail.options,
        }),
    ))
}

fn saturation<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let i = has_keyword(i, "temperature").unwrap_or(i);
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, loading) = committed_loading(cx, i)?;
    let (i, tail) = tail(cx, i, &[Clause::InTemperature, DATA[0], DATA[1]], &[])?;
    Ok((
        i,
        Statement::Saturation(Saturation {
            solute,
            loading,
            unit: tail.temperature,
            options: tail.options,
        }),
    ))
}

fn ceiling<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at", "from", "over"])?;
    let (i, temperatures) = temperatures(cx, i)?;
    let (i, tail) = tail(
        cx,
        i,
        &[Clause::Margin, Clause::InComposition, DATA[0], DATA[1]],
        &[],
    )?;
    Ok((
        i,
        Statement::Ceiling(Ceiling {
            solute,
            temperatures,
            margin: tail.margin,
            unit: tail.composition,
            options: tail.options,
        }),
    ))
}

fn heat_of_solution<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, _) = expect(cx, i, &["solution"])?;
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, temperature) = committed_temperature(cx, i)?;
    let (i, tail) = tail(cx, i, &DATA, &[])?;
    Ok((
        i,
        Statement::HeatOfSolution(HeatOfSolution {
            solute,
            temperature,
            options: tail.options,
        }),
    ))
}

const MIXTURE: &str = "a pressure such as `0.21 bar` or a gas mixture such as `air`";

/// After `under`: `0.21 bar`, `2 bar of air`, `air`, `air at 2 bar`.
fn gas_pressure<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, GasPressure> {
    let t = skip(i);
    let (word, _) = next_word(t);
    let bound_pressure = matches!(cx.env.get(word), Some(Value::Pressure(_)));
    if starts_number(t) || bound_pressure {
        let (rest, p) = pressure(cx, t)?;
        if let Some(after) = has_keyword(rest, "of") {
            let (rest, mixture) =
                cut(context("a gas mixture such as `air`", |x| name(cx, x, &[]))).parse(after)?;
            return Ok((
                rest,
                GasPressure::Mixture {
                    mixture,
                    total: Some(p),
                },
            ));
        }
        return Ok((rest, GasPressure::Partial(p)));
    }
    let (rest, mixture) = cut(context(MIXTURE, |x| name(cx, x, &["at"]))).parse(t)?;
    let (rest, total) = match has_keyword(rest, "at") {
        Some(after) => {
            let (r, p) =
                cut(context(ValueKind::Pressure.example(), |x| pressure(cx, x))).parse(after)?;
            (r, Some(p))
        }
        None => (rest, None),
    };
    Ok((rest, GasPressure::Mixture { mixture, total }))
}

fn dissolved<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, gas) = cut(context("a gas such as `O2`", |x| name(cx, x, &["at"]))).parse(i)?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, temperature) = committed_temperature(cx, i)?;
    let (i, pressure) = match has_keyword(i, "under") {
        Some(after) => {
            let (r, p) = gas_pressure(cx, after)?;
            (r, Some(p))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if pressure.is_none() { &["under"] } else { &[] };
    let (i, tail) = tail(cx, i, &[Clause::InComposition, DATA[0], DATA[1]], earlier)?;
    Ok((
        i,
        Statement::DissolvedGas(DissolvedGas {
            gas,
            temperature,
            pressure,
            unit: tail.composition,
            options: tail.options,
        }),
    ))
}

fn freezing<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, loading) = committed_loading(cx, i)?;
    let (i, temperature) = match has_keyword(i, "at") {
        Some(after) => {
            let (r, t) = committed_temperature(cx, after)?;
            (r, Some(t))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if temperature.is_none() { &["at"] } else { &[] };
    let (i, tail) = tail(cx, i, &[Clause::InTemperature, DATA[0], DATA[1]], earlier)?;
    Ok((
        i,
        Statement::Freezing(Freezing {
            solute,
            loading,
            temperature,
            unit: tail.temperature,
            options: tail.options,
        }),
    ))
}

const HYDRATE: &str = "a solid such as `Na2SO4·10H2O`";

fn convert<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, loading) = committed_loading(cx, i)?;
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["to", "as"])?;
    let (i, from_basis) = match has_keyword(i, "as") {
        Some(after) => {
            let (r, n) = cut(context(HYDRATE, |x| name(cx, x, &["to"]))).parse(after)?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let (i, _) = expect(cx, i, &["to"])?;
    let (i, to) = composition_unit(cx, i)?;
    let (i, to_basis) = match has_keyword(i, "as") {
        Some(after) => {
            let (r, n) = cut(context(HYDRATE, |x| name(cx, x, &["at"]))).parse(after)?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let (i, temperature) = match has_keyword(i, "at") {
        Some(after) => {
            let (r, t) = committed_temperature(cx, after)?;
            (r, Some(t))
        }
        None => (i, None),
    };
    let mut earlier: Vec<&'static str> = Vec::new();
    if to_basis.is_none() {
        earlier.push("as");
    }
    if temperature.is_none() {
        earlier.push("at");
    }
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], &earlier)?;
    Ok((
        i,
        Statement::Convert(Convert {
            loading,
            solute,
            from_basis,
            to,
            to_basis,
            temperature,
            options: tail.options,
        }),
    ))
}

fn describe<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solute) = solute(cx, i, &[])?;
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], &[])?;
    Ok((
        i,
        Statement::Describe(Describe {
            solute,
            options: tail.options,
        }),
    ))
}

fn sources<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solute) = match has_keyword(i, "of") {
        Some(after) => {
            let (r, n) = solute(cx, after, &[])?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if solute.is_none() { &["of"] } else { &[] };
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], earlier)?;
    Ok((
        i,
        Statement::Sources(Sources {
            solute,
            options: tail.options,
        }),
    ))
}

fn list<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, class) = class(cx, i)?;
    let (i, filters) = filters(cx, i)?;
    let earlier: &[&'static str] = if filters.is_empty() {
        &["with"]
    } else {
        &["and"]
    };
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], earlier)?;
    Ok((
        i,
        Statement::List(List {
            class,
            filters,
            options: tail.options,
        }),
    ))
}

const LET_VALUE: &str = "a temperature, a range such as `from 2 C to 8 C`, a loading or a pressure";

fn binding<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let t = skip(i);
    let (word, after) = next_word(t);
    if !is_name_of_own(word) {
        return Err(expected_here(
            cx,
            t,
            "a name such as `cold` (a letter, then letters, digits, `_` or `-`)".into(),
            &[],
        ));
    }
    let span = cx.span(t, after);
    if is_keyword(word) || classify(word).is_some() {
        return Err(failure(
            ParseErrorKind::ReservedName {
                name: shorten(word),
            },
            span,
        ));
    }
    let name = Name {
        text: word.to_string(),
        span,
    };
    let rest = match preceded(blanks, char::<&str, PErr>('=')).parse(after) {
        Ok((rest, _)) => rest,
        Err(_) => return Err(expected_here(cx, after, "`=`".into(), &[])),
    };
    let (rest, value) = cut(context(LET_VALUE, |x| let_value(cx, x))).parse(rest)?;
    let (rest, _) = tail(cx, rest, &[], &[])?;
    Ok((rest, Statement::Let(Let { name, value })))
}

fn let_value<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Value> {
    let t = skip(i);
    if has_keyword(t, "from").is_some() {
        let (rest, range) = range_from(cx, t)?;
        return Ok((rest, Value::Range(range)));
    }
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, ValueKind::Temperature)?;
        return match q.unit {
            AnyUnit::Temperature(unit) => {
                let low = checked_temperature(&q, unit)?;
                // `let cold = 2 C to 8 C` reads as a range too.
                let Some(after) = has_keyword(rest, "to") else {
                    return Ok((rest, Value::Temperature(low)));
                };
                let (rest, high) = committed_temperature(cx, after)?;
                let span = cx.span(t, rest);
                if low.kelvin() > high.kelvin() {
                    return Err(failure(
                        ParseErrorKind::ReversedRange {
                            low: cx.text(low.span),
                            high: cx.text(high.span),
                        },
                        span,
                    ));
                }
                Ok((rest, Value::Range(TemperatureRange { low, high, span })))
            }
            AnyUnit::Composition(_) | AnyUnit::Pressure(_) if q.value < 0.0 => Err(negative(&q)),
            AnyUnit::Composition(unit) => Ok((
                rest,
                Value::Loading(Loading {
                    value: q.value,
                    unit,
                    span: q.span,
                }),
            )),
            AnyUnit::Pressure(unit) => Ok((
                rest,
                Value::Pressure(Pressure {
                    value: q.value,
                    unit,
                    span: q.span,
                }),
            )),
        };
    }
    // Another name: the new one gets a copy of its value.
    let (rest, (_, value)) = resolve(cx, t, ValueKind::Temperature)?;
    Ok((rest, value))
}

/// After `plot`: solute names separated by `,` (a comma ending a word, or standing alone)
/// or `and`. A comma inside a word belongs to the name (`1,2-ethanediol`).
fn solute_list<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Vec<Name>> {
    const FOLLOWERS: [&str; 4] = ["from", "over", "with", "under"];
    let mut names = Vec::new();
    let mut rest = i;
    loop {
        let begin = skip(rest);
        let mut words: Vec<&str> = Vec::new();
        let mut end = begin;
        let mut cursor = begin;
        let mut comma = false;
        loop {
            let t = skip(cursor);
            if let Some(after) = t.strip_prefix(',') {
                comma = true;
                cursor = after;
                break;
            }
            let (word, after) = next_word(t);
            if word.is_empty() || ends_name(word) || ends_as_number(word) {
                cursor = t;
                break;
            }
            if !words.is_empty() && word.chars().count() >= 2 {
                if let Some(meant) = nearest(word, &FOLLOWERS) {
                    let next = skip(after);
                    let (following, _) = next_word(next);
                    if starts_number(next) || is_keyword(following) {
                        return Err(failure(
                            ParseErrorKind::Expected {
                                expected: one_of(&FOLLOWERS),
                                found: Some(shorten(word)),
                                suggestion: Some(meant.to_string()),
                            },
                            cx.span(t, after),
                        ));
                    }
                }
            }
            if let Some(head) = word.strip_suffix(',') {
                if !head.is_empty() {
                    words.push(head);
                    end = &t[head.len()..];
                }
                comma = true;
                cursor = after;
                break;
            }
            words.push(word);
            end = after;
            cursor = after;
        }
        if words.is_empty() {
            return Err(expected_here(cx, begin, SOLUTE.into(), &[]));
        }
        names.push(Name {
            text: words.join(" "),
            span: cx.span(begin, end),
        });
        if comma {
            rest = cursor;
        } else if let Some(after) = has_keyword(cursor, "and") {
            rest = after;
        } else {
            return Ok((cursor, names));
        }
    }
}

/// `plot KNO3, KCl from 0 C to 100 C ...`: the solutes, an optional range, then the
/// clauses in any order.
fn plot<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solutes) = solute_list(cx, i)?;
    let t = skip(i);
    let (mut rest, range) = if has_keyword(t, "from").is_some() {
        let (r, range) = range_from(cx, t)?;
        (r, Some(range))
    } else if let Some(after) = has_keyword(t, "over") {
        if has_keyword(after, "from").is_some() {
            let (r, range) = range_from(cx, after)?;
            (r, Some(range))
        } else {
            let want = ValueKind::TemperatureRange;
            match cut(context(want.example(), |x| point_or_range(cx, x, want))).parse(after)? {
                (r, Temperatures::Range(range)) => (r, Some(range)),
                (r, Temperatures::At(_)) => {
                    let at = skip(after);
                    return Err(failure(
                        ParseErrorKind::Expected {
                            expected: want.example().into(),
                            found: Some(cx.text(cx.span(at, r))),
                            suggestion: None,
                        },
                        cx.span(at, r),
                    ));
                }
            }
        }
    } else {
        (t, None)
    };
    let mut unit = None;
    let mut loading: Option<PlotLoading> = None;
    let mut margin_clause = None;
    let mut pressure = None;
    let mut options = Options::default();
    loop {
        let t = skip(rest);
        if t.is_empty() {
            break;
        }
        let (word, after) = next_word(t);
        match word.to_lowercase().as_str() {
            "in" => {
                if unit.is_some() {
                    return Err(duplicate(cx, t, after, "in"));
                }
                let (r, u) = composition_unit(cx, after)?;
                unit = Some(u);
                rest = r;
            }
            "with" => {
                if loading.is_some() {
                    return Err(duplicate(cx, t, after, "with loading"));
                }
                let (r, _) = expect(cx, after, &["loading"])?;
                let (r, amount) = committed_loading(cx, r)?;
                let at = skip(r);
                let (r, temperatures) = if ["at", "from", "over"]
                    .iter()
                    .any(|w| has_keyword(at, w).is_some())
                {
                    let (r, temps) = temperatures(cx, at)?;
                    (r, Some(temps))
                } else {
                    (r, None)
                };
                loading = Some(PlotLoading {
                    loading: amount,
                    temperatures,
                    span: cx.span(t, r),
                });
                rest = r;
            }
            "margin" => {
                if margin_clause.is_some() {
                    return Err(duplicate(cx, t, after, "margin"));
                }
                let (r, m) =
                    cut(context(ValueKind::Margin.example(), |x| margin(cx, x))).parse(after)?;
                margin_clause = Some(m);
                rest = r;
            }
            "under" => {
                if pressure.is_some() {
                    return Err(duplicate(cx, t, after, "under"));
                }
                let (r, p) = gas_pressure(cx, after)?;
                pressure = Some(p);
                rest = r;
            }
            "extrapolate" => {
                if options.extrapolate {
                    return Err(duplicate(cx, t, after, "extrapolate"));
                }
                options.extrapolate = true;
                rest = after;
            }
            "reviewed" => {
                let (r, _) = expect(cx, after, &["only"])?;
                if options.reviewed_only {
                    return Err(duplicate(cx, t, r, "reviewed only"));
                }
                options.reviewed_only = true;
                rest = r;
            }
            _ => {
                let mut words: Vec<&'static str> = Vec::new();
                if range.is_none() {
                    words.extend(["from", "over"]);
                }
                words.extend(["in", "with", "margin", "under", "extrapolate", "reviewed"]);
                let shown: Vec<&str> = words
                    .iter()
                    .map(|w| {
                        if *w == "reviewed" {
                            "reviewed only"
                        } else {
                            *w
                        }
                    })
                    .collect();
                let expected = format!(
                    "{} or the end of the statement",
                    one_of(&shown).replace(" or ", ", ")
                );
                return Err(expected_here(cx, t, expected, &words));
            }
        }
    }
    if let (Some(m), None) = (&margin_clause, &loading) {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: "`with loading ...` for the margin to apply to".into(),
                found: Some(cx.text(m.span)),
                suggestion: None,
            },
            m.span,
        ));
    }
    Ok((
        rest,
        Statement::Plot(Plot {
            solutes,
            range,
            unit,
            loading,
            margin: margin_clause,
            pressure,
            options,
        }),
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

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
