//! Why a statement that parsed could not be answered, with the span of the text at fault.

use crate::query::Span;

/// A statement that parsed but could not be answered.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum EvalError {
    /// The solute is not in the reference: `solubility of KNO4 at 20 C`.
    #[error("{message}")]
    UnknownSolute { message: String, span: Span },
    /// The solute has no data for this kind of question: `solubility of urea at 20 C`
    /// (a record without datasets), or `dissolved KCl at 20 C` (not a gas).
    #[error("{message}")]
    NoData { message: String, span: Span },
    /// A temperature outside the data, with no `extrapolate`: `solubility of KNO3 at 150 C`.
    #[error("{message}")]
    OutOfRange { message: String, span: Span },
    /// The question cannot be computed as asked: `solubility of KNO3 at 20 C in g/L`
    /// (no density), `dissolved O2 at 25 C under mars` (unknown mixture).
    #[error("{message}")]
    Unanswerable { message: String, span: Span },
}

impl EvalError {
    /// The byte span of the text at fault.
    pub fn span(&self) -> Span {
        match self {
            EvalError::UnknownSolute { span, .. }
            | EvalError::NoData { span, .. }
            | EvalError::OutOfRange { span, .. }
            | EvalError::Unanswerable { span, .. } => *span,
        }
    }

    /// The class of the error, for front ends to map with a `match`.
    pub fn class(&self) -> crate::answer::ErrorClass {
        match self {
            EvalError::UnknownSolute { .. } => crate::answer::ErrorClass::UnknownSolute,
            _ => crate::answer::ErrorClass::Unanswerable,
        }
    }

    /// A short code for the class of error, for JSON and HTTP consumers.
    pub fn code(&self) -> &'static str {
        match self {
            EvalError::UnknownSolute { .. } => "unknown-solute",
            EvalError::NoData { .. } => "no-data",
            EvalError::OutOfRange { .. } => "out-of-range",
            EvalError::Unanswerable { .. } => "unanswerable",
        }
    }
}
