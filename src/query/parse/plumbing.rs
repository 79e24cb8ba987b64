//! nom plumbing: the parser's error type, the context every rule carries, words, keywords
//! and "expected ..., found ..." faults.

use nom::{
    Err as NomErr, IResult, Parser,
    bytes::complete::{tag_no_case, take_while},
    character::complete::satisfy,
    combinator::not,
    error::{ContextError, ErrorKind, ParseError as NomParseError},
    sequence::{preceded, terminated},
};

use super::super::ast::*;
use super::super::error::{ParseError, ParseErrorKind};
use super::super::lexicon::{nearest, one_of};
use super::Env;
use super::quantity::*;

// ---------------------------------------------------------------------------------------
// nom plumbing

/// The nom error: either a finished fault (from a rule that knows exactly what went wrong)
/// or a position with the innermost `context` that failed there.
#[derive(Debug)]
pub(crate) struct PErr {
    pub(super) rest_len: usize,
    pub(super) context: Option<(&'static str, usize)>,
    pub(super) fault: Option<Box<ParseError>>,
}

impl PErr {
    pub(super) fn at(rest: &str) -> Self {
        PErr {
            rest_len: rest.len(),
            context: None,
            fault: None,
        }
    }

    pub(super) fn into_parse_error(self, cx: Cx) -> ParseError {
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

pub(super) type R<'a, T> = IResult<&'a str, T, PErr>;

/// What every rule needs: the statement's text, where it starts in the script, and the
/// names bound so far.
#[derive(Clone, Copy)]
pub(super) struct Cx<'a> {
    pub(super) piece: &'a str,
    pub(super) start: usize,
    pub(super) env: &'a Env,
}

impl<'a> Cx<'a> {
    /// Offset in the whole script of `rest`, a suffix of the statement.
    pub(super) fn offset(&self, rest: &str) -> usize {
        self.start + self.piece.len().saturating_sub(rest.len())
    }

    pub(super) fn span(&self, from: &str, to: &str) -> Span {
        Span::new(self.offset(from), self.offset(to))
    }

    pub(super) fn suffix(&self, len: usize) -> &'a str {
        let at = self.piece.len().saturating_sub(len);
        self.piece.get(at..).unwrap_or("")
    }

    /// Text of a span inside this statement.
    pub(super) fn text(&self, span: Span) -> String {
        let from = span.start.saturating_sub(self.start);
        let to = span.end.saturating_sub(self.start);
        self.piece.get(from..to).unwrap_or("").to_string()
    }
}

pub(super) fn failure(kind: ParseErrorKind, span: Span) -> NomErr<PErr> {
    NomErr::Failure(PErr {
        rest_len: 0,
        context: None,
        fault: Some(Box::new(ParseError::new(kind, span))),
    })
}

pub(super) fn soft(rest: &str) -> NomErr<PErr> {
    NomErr::Error(PErr::at(rest))
}

/// Characters that may be part of a word: anything but blanks and the three marks the
/// language gives a meaning (`;` ends, `#` comments, `=` binds).
pub(super) fn is_word_char(c: char) -> bool {
    !c.is_whitespace() && !matches!(c, ';' | '#' | '=')
}

pub(super) fn blanks(i: &str) -> R<'_, &str> {
    take_while(char::is_whitespace).parse(i)
}

pub(super) fn skip(i: &str) -> &str {
    i.trim_start()
}

/// The next word after blanks, and what follows it.
pub(super) fn next_word(i: &str) -> (&str, &str) {
    let t = skip(i);
    let n = t.find(|c: char| !is_word_char(c)).unwrap_or(t.len());
    (&t[..n], &t[n..])
}

/// Text shown as "found `...`": cut to 40 characters so a huge input stays readable.
pub(super) fn shorten(text: &str) -> String {
    let mut chars = text.chars();
    let head: String = chars.by_ref().take(40).collect();
    if chars.next().is_some() {
        format!("{head}…")
    } else {
        head
    }
}

/// A keyword, in any case, standing as a whole word.
pub(super) fn keyword<'a>(
    word: &'static str,
) -> impl Parser<&'a str, Output = &'a str, Error = PErr> {
    preceded(
        blanks,
        terminated(tag_no_case(word), not(satisfy(is_word_char))),
    )
}

/// What stands at `i`, for "found ...": a quantity with its unit, a word, or one mark.
pub(super) fn found_at(cx: Cx, i: &str) -> (Span, Option<String>) {
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
pub(super) fn expected_here(
    cx: Cx,
    i: &str,
    expected: String,
    candidates: &[&str],
) -> NomErr<PErr> {
    let (span, found) = found_at(cx, i);
    let suggestion = found
        .as_deref()
        .and_then(|w| nearest(w, candidates))
        .map(str::to_string);
    // A closing clause written too early (`require recipe ... assuming density 1 kg/L
    // stays dissolved ...`): say where it goes.
    let expected = match found.as_deref().filter(|w| !candidates.contains(w)) {
        Some(w @ ("assuming" | "extrapolate" | "reviewed" | "margin")) => {
            format!("{expected} (`{w}` goes at the end of the statement)")
        }
        _ => expected,
    };
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
pub(super) fn expect<'a>(cx: Cx<'a>, i: &'a str, words: &[&'static str]) -> R<'a, &'a str> {
    for word in words {
        if let Ok(done) = keyword(word).parse(i) {
            return Ok(done);
        }
    }
    Err(expected_here(cx, i, one_of(words), words))
}

pub(super) fn has_keyword<'a>(i: &'a str, word: &'static str) -> Option<&'a str> {
    keyword(word).parse(i).ok().map(|(rest, _)| rest)
}
