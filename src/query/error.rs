//! Parse errors as values: what was expected, what was found, where (a byte span), and a
//! renderer that turns the span into line and column and draws a caret under the fault.

use super::ast::{Span, ValueKind};

/// A statement that could not be parsed: the fault and the byte span it covers in the
/// script text.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{kind}")]
pub struct ParseError {
    pub kind: ParseErrorKind,
    pub span: Span,
}

fn show_found(text: &Option<String>) -> String {
    match text {
        Some(t) => format!("`{t}`"),
        None => "the end of the statement".to_string(),
    }
}

fn did_you_mean(suggestion: &Option<String>) -> String {
    match suggestion {
        Some(s) => format!("; did you mean `{s}`?"),
        None => String::new(),
    }
}

/// The classes of parse fault. Each doc comment shows a script that triggers it.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ParseErrorKind {
    /// A statement begins with a word that begins no statement:
    /// `solubilty of KNO3 at 20 C`.
    #[error(
        "expected a statement such as `solubility of KNO3 at 20 C`, found `{found}`{}",
        did_you_mean(suggestion)
    )]
    UnknownStatement {
        found: String,
        suggestion: Option<String>,
    },

    /// A keyword, a name or a clause was expected and something else came (here `of`):
    /// `solubility KNO3 at 20 C`.
    #[error(
        "expected {expected}, found {}{}",
        show_found(found),
        did_you_mean(suggestion)
    )]
    Expected {
        expected: String,
        /// `None` when the statement ended.
        found: Option<String>,
        suggestion: Option<String>,
    },

    /// A quantity of the wrong kind: `solubility of KNO3 at 5 g/L`.
    #[error("expected {}, found `{found}`, which is {}", expected.example(), found_kind.noun())]
    WrongQuantity {
        expected: ValueKind,
        found: String,
        found_kind: ValueKind,
    },

    /// A unit of the wrong kind after `in` or `to`: `solubility of KNO3 at 20 C in F`.
    #[error(
        "expected {}, found `{found}`, which is a unit of {}",
        expected.unit_example(),
        found_kind.noun().trim_start_matches("a ")
    )]
    WrongUnit {
        expected: ValueKind,
        found: String,
        found_kind: ValueKind,
    },

    /// A unit nobody knows: `convert 20 g/100g water of KCl to mol/kgg`. A suggestion that
    /// differs from what was typed by a factor of 1000 or more says so
    /// (`nmol/L` → `umol/L`).
    #[error(
        "expected {}, found `{found}`, which is not a unit satline knows{}{}",
        expected.unit_example(),
        did_you_mean(suggestion),
        super::lexicon::scale_warning(found, suggestion.as_deref())
    )]
    UnknownUnit {
        expected: ValueKind,
        found: String,
        suggestion: Option<String>,
    },

    /// A unit that does not say its basis: `saturation of KNO3 at 20 %` (per mass or per
    /// volume?), `convert 10 ppm of KCl to mg/L`.
    #[error("expected {}, found `{found}`: {advice}", expected.unit_example())]
    AmbiguousUnit {
        expected: ValueKind,
        found: String,
        advice: &'static str,
    },

    /// A number with no unit: `solubility of KNO3 at 20`.
    #[error("expected {}, found `{number}` with no unit", expected.example())]
    MissingUnit { expected: ValueKind, number: String },

    /// A number too large to use: `solubility of KNO3 at 1e999 C`.
    #[error("expected a finite number, found `{found}`")]
    InvalidNumber { found: String },

    /// A temperature below 0 K: `solubility of KNO3 at -300 C`.
    #[error("expected a temperature above absolute zero, found `{found}`")]
    BelowAbsoluteZero { found: String },

    /// A range whose first temperature is above its second:
    /// `ceiling of KCl from 8 C to 2 C`.
    #[error("expected the lower temperature first, found `from {low} to {high}`")]
    ReversedRange { low: String, high: String },

    /// A margin outside 0% to under 100%: `ceiling of KCl from 2 C to 8 C margin 120%`.
    #[error("expected a margin from 0% to under 100%, found `{found}`")]
    MarginOutOfRange { found: String },

    /// A negative loading or pressure: `saturation of KNO3 at -5 g/100g water`.
    #[error("expected an amount of zero or more, found `{found}`")]
    NegativeAmount { found: String },

    /// A name that no `let` has bound: `solubility of KNO3 at fridge`.
    #[error(
        "expected {}, found `{name}`, which no `let` has bound{}",
        expected.example(),
        did_you_mean(suggestion)
    )]
    UnboundName {
        expected: ValueKind,
        name: String,
        suggestion: Option<String>,
    },

    /// A name bound to another kind of value:
    /// `let dose = 20 g/100g water` then `solubility of KNO3 at dose`.
    #[error(
        "expected {}, found `{name}`, which `let` bound to {}",
        expected.example(),
        bound.noun()
    )]
    NameKindMismatch {
        expected: ValueKind,
        name: String,
        bound: ValueKind,
    },

    /// `let` given a word of the language or a unit symbol: `let at = 5 C`.
    #[error(
        "expected a name of your own after `let`, found `{name}`, which is a word of the language"
    )]
    ReservedName { name: String },

    /// The same clause twice: `ceiling of KCl from 2 C to 8 C margin 10% margin 5%`.
    #[error("`{clause}` is given twice in one statement")]
    DuplicateClause { clause: String },

    /// A character that cannot be seen (here a zero-width space after the formula; a
    /// direction mark, a control character) inside a statement: `solubility of KNO3​ at 20 C`.
    #[error(
        "an invisible character ({code}, {name}) stands here; delete it (it is neither a space nor a letter)"
    )]
    InvisibleCharacter { code: String, name: &'static str },

    /// `in water` where a unit or a recipe belongs (pure water is what the statement
    /// answers without it): `dissolved O2 at 25 C in water`.
    #[error("`in {found}` names a liquid, not a unit: {why}")]
    LiquidNotUnit { found: String, why: &'static str },
}

impl ParseErrorKind {
    /// A stable name for the class of fault, for tests and machine readers.
    pub fn code(&self) -> &'static str {
        match self {
            ParseErrorKind::UnknownStatement { .. } => "unknown-statement",
            ParseErrorKind::Expected { .. } => "expected",
            ParseErrorKind::WrongQuantity { .. } => "wrong-quantity",
            ParseErrorKind::WrongUnit { .. } => "wrong-unit",
            ParseErrorKind::UnknownUnit { .. } => "unknown-unit",
            ParseErrorKind::AmbiguousUnit { .. } => "ambiguous-unit",
            ParseErrorKind::MissingUnit { .. } => "missing-unit",
            ParseErrorKind::InvalidNumber { .. } => "invalid-number",
            ParseErrorKind::BelowAbsoluteZero { .. } => "below-absolute-zero",
            ParseErrorKind::ReversedRange { .. } => "reversed-range",
            ParseErrorKind::MarginOutOfRange { .. } => "margin-out-of-range",
            ParseErrorKind::NegativeAmount { .. } => "negative-amount",
            ParseErrorKind::UnboundName { .. } => "unbound-name",
            ParseErrorKind::NameKindMismatch { .. } => "name-kind-mismatch",
            ParseErrorKind::ReservedName { .. } => "reserved-name",
            ParseErrorKind::DuplicateClause { .. } => "duplicate-clause",
            ParseErrorKind::InvisibleCharacter { .. } => "invisible-character",
            ParseErrorKind::LiquidNotUnit { .. } => "liquid-not-unit",
        }
    }
}

impl ParseError {
    pub fn new(kind: ParseErrorKind, span: Span) -> Self {
        ParseError { kind, span }
    }

    /// The error as data, with line and column taken from `source`.
    pub fn report(&self, source: &str) -> crate::answer::ErrorReport {
        self.report_at(self.line_column(source))
    }

    /// The error as data, at a (line, column) already found (e.g. by a
    /// [`super::LineIndex`] kept for a whole script).
    pub fn report_at(&self, (line, column): (usize, usize)) -> crate::answer::ErrorReport {
        crate::answer::ErrorReport {
            class: crate::answer::ErrorClass::Parse,
            stage: "parse",
            code: self.kind.code(),
            message: self.kind.to_string(),
            line,
            column,
            span: (self.span.start, self.span.end),
        }
    }

    /// Line and column (both from 1) of the start of the fault in `source`.
    pub fn line_column(&self, source: &str) -> (usize, usize) {
        line_column(source, self.span.start)
    }

    /// The fault drawn for people (`super::fault`): the line, marks under the faulty text
    /// with `file, line L, column C` beside them, and the message.
    pub fn render(&self, source: &str, file_name: &str) -> String {
        let start = floor_boundary(source, self.span.start);
        let (line, column) = line_column(source, start);
        let line_start = source[..start].rfind('\n').map_or(0, |i| i + 1);
        let line_end = source[start..]
            .find('\n')
            .map_or(source.len(), |i| start + i);
        let line_text = source[line_start..line_end].trim_end_matches('\r');
        let end = floor_boundary(source, self.span.end.clamp(start, line_end));
        let place = format!("{file_name}, line {line}, column {column}");
        let message = self.kind.to_string();
        super::fault::draw(
            &super::fault::Fault {
                statement: line_text,
                at: (
                    (start - line_start).min(line_text.len()),
                    (end - line_start).min(line_text.len()),
                ),
                place: &place,
                stage: "parse",
                message: &message,
            },
            None,
        )
    }
}

/// The largest char boundary at or below `offset`, within `source`.
fn floor_boundary(source: &str, offset: usize) -> usize {
    let mut at = offset.min(source.len());
    while !source.is_char_boundary(at) {
        at -= 1;
    }
    at
}

/// Line and column (both counted from 1, the column in characters) of byte `offset`.
/// Offsets past the end or inside a character are moved back to the nearest boundary.
pub fn line_column(source: &str, offset: usize) -> (usize, usize) {
    let at = floor_boundary(source, offset);
    let before = &source[..at];
    let line = before.matches('\n').count() + 1;
    let line_start = before.rfind('\n').map_or(0, |i| i + 1);
    let column = source[line_start..at].chars().count() + 1;
    (line, column)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn columns_count_characters() {
        let text = "a\nb°c x";
        assert_eq!(line_column(text, 0), (1, 1));
        assert_eq!(line_column(text, 2), (2, 1));
        // `x` is at byte 7 (° is two bytes) but column 5.
        assert_eq!(line_column(text, 7), (2, 5));
        assert_eq!(line_column(text, 999), (2, 6));
    }

    #[test]
    fn report_gives_line_column_and_code() {
        let error = ParseError::new(
            ParseErrorKind::ReservedName { name: "at".into() },
            Span::new(13, 15),
        );
        let report = error.report("describe\nlet at = 5 C");
        assert_eq!(
            (report.line, report.column, report.code),
            (2, 5, "reserved-name")
        );
        assert!(report.message.starts_with("expected a name of your own"));
    }

    #[test]
    fn render_draws_marks_under_the_span() {
        let error = ParseError::new(
            ParseErrorKind::InvalidNumber {
                found: "1e999".into(),
            },
            Span::new(3, 8),
        );
        let shown = error.render("at 1e999 C", "x.satq");
        assert!(shown.contains("x.satq, line 1, column 4"), "{shown}");
        assert!(
            shown.contains("» at 1e999 C\n     ‾‾‾‾‾ x.satq, line 1, column 4\n"),
            "{shown}"
        );
    }
}
