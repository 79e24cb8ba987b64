//! The answer to one statement: what was asked, whether it could be answered, rows, the basis
//! of each number, caveats and citations. Every front end renders this one type; its JSON
//! form is a documented contract (grammar/README.md, "The answer").

use std::borrow::Cow;
use std::collections::BTreeMap;

use serde::Serialize;

pub mod plot_spec;
mod rows;
pub mod screened;

pub use rows::Rows;

/// What kind of statement an answer belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, utoipa::ToSchema)]
#[serde(rename_all = "kebab-case")]
pub enum AnswerKind {
    Lookup,
    Screening,
    Saturation,
    Ceiling,
    #[serde(rename = "heat-of-solution")]
    Heat,
    /// `dissolving`: a batch's temperature as its solid dissolves.
    Dissolving,
    #[serde(rename = "dissolved-gas")]
    Gas,
    Freezing,
    Convert,
    Describe,
    Sources,
    List,
    Let,
    Require,
    Plot,
    /// `which solids form in RECIPE ...`.
    Solids,
    /// `ph of RECIPE from T1 to T2`.
    Ph,
    /// A statement that could not be parsed.
    Invalid,
}

impl AnswerKind {
    pub fn as_str(self) -> &'static str {
        match self {
            AnswerKind::Lookup => "lookup",
            AnswerKind::Screening => "screening",
            AnswerKind::Saturation => "saturation",
            AnswerKind::Ceiling => "ceiling",
            AnswerKind::Heat => "heat-of-solution",
            AnswerKind::Dissolving => "dissolving",
            AnswerKind::Gas => "dissolved-gas",
            AnswerKind::Freezing => "freezing",
            AnswerKind::Convert => "convert",
            AnswerKind::Describe => "describe",
            AnswerKind::Sources => "sources",
            AnswerKind::List => "list",
            AnswerKind::Let => "let",
            AnswerKind::Require => "require",
            AnswerKind::Plot => "plot",
            AnswerKind::Solids => "solids",
            AnswerKind::Ph => "ph",
            AnswerKind::Invalid => "invalid",
        }
    }
}

pub use crate::science::curve::Basis;

/// The quantity of a row that gives the temperature below which ice appears (its figure, in
/// °C).
pub const ICE_ROW: &str = "ice appears on cooling below";

/// One row of an answer. Fields that do not apply to a kind of answer are absent from JSON.
#[derive(Debug, Clone, Default, PartialEq, Serialize, utoipa::ToSchema)]
pub struct Row {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub solute: Option<String>,
    /// What the value is: `solubility`, `saturation temperature`, `ceiling`, ... (a fixed
    /// text mostly, so it is borrowed rather than allocated per row).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub quantity: Option<Cow<'static, str>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub unit: Option<Cow<'static, str>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub basis: Option<Basis>,
    /// The solid phase in equilibrium where the value applies.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub phase: Option<String>,
    /// The temperature the row is about, in °C (the limiting temperature of a screening row).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub temperature_c: Option<f64>,
    /// Screening and require: whether the loading stays dissolved.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub holds: Option<bool>,
    /// Screening and require: how far the saturation loading is above the loading, in percent.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub headroom_pct: Option<f64>,
    /// Other fields of a kind of answer (describe, sources, list), in a stable order.
    #[serde(flatten)]
    pub extra: BTreeMap<String, serde_json::Value>,
}

/// A source an answer rests on.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, utoipa::ToSchema)]
pub struct SourceRef {
    pub key: String,
    pub citation: String,
}

/// The class of a fault, for front ends that map it to their own terms (an HTTP status, an
/// exit code) with a `match`, never by comparing codes.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ErrorClass {
    /// The statement could not be parsed.
    #[default]
    Parse,
    /// A solute named in the statement is not in the catalog.
    UnknownSolute,
    /// The statement parsed but the data or the method cannot answer it.
    Unanswerable,
}

/// Where a statement went wrong, ready for any renderer.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, utoipa::ToSchema)]
pub struct ErrorReport {
    /// The class of the fault (not part of the JSON: `stage` and `code` say it there).
    #[serde(skip)]
    pub class: ErrorClass,
    /// Which stage failed: `parse` or `evaluate`.
    pub stage: &'static str,
    /// A stable name for the class of fault, e.g. `unknown-solute`, `wrong-quantity`.
    pub code: &'static str,
    pub message: String,
    /// 1-based line of the fault in the script.
    pub line: usize,
    /// 1-based column (in characters) of the fault.
    pub column: usize,
    /// Byte range of the fault in the script, for renderers that draw carets.
    #[serde(skip)]
    pub span: (usize, usize),
}

/// The answer to one statement.
#[derive(Debug, Clone, PartialEq, Serialize, utoipa::ToSchema)]
pub struct Answer {
    /// The statement as written.
    pub statement: String,
    /// 1-based line of the script where the statement starts.
    pub line: usize,
    pub kind: AnswerKind,
    /// False when the statement could not be parsed or answered.
    pub ok: bool,
    /// For `require`: whether the assertion held.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub holds: Option<bool>,
    /// For a `require` that did not hold: what it lacks, in words (the limiting row's
    /// solute, temperature, headroom and shortfall), as the engine states it.
    #[serde(skip)]
    pub shortfall: Option<String>,
    /// Byte range of the statement in its script (not part of the JSON), for front ends
    /// that point at it.
    #[serde(skip)]
    pub span: (usize, usize),
    #[schema(value_type = Vec<Row>)]
    pub rows: Rows,
    pub caveats: Vec<String>,
    pub sources: Vec<SourceRef>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub error: Option<ErrorReport>,
    /// For `plot`: the file a front end wrote the picture to, when it wrote one.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub picture: Option<String>,
    /// For `plot`: what the picture shows, for the renderers (not part of the JSON).
    #[serde(skip)]
    pub plot: Option<Box<plot_spec::PlotSpec>>,
}

impl Answer {
    /// An answer with no rows yet.
    pub fn new(statement: impl Into<String>, kind: AnswerKind) -> Self {
        Answer {
            statement: statement.into(),
            line: 0,
            kind,
            ok: true,
            holds: None,
            shortfall: None,
            span: (0, 0),
            rows: Rows::new(),
            caveats: Vec::new(),
            sources: Vec::new(),
            error: None,
            picture: None,
            plot: None,
        }
    }

    /// An answer for a statement that failed.
    pub fn failed(statement: impl Into<String>, kind: AnswerKind, error: ErrorReport) -> Self {
        Answer {
            ok: false,
            error: Some(error),
            ..Answer::new(statement, kind)
        }
    }

    /// Adds a caveat once.
    pub fn caveat(&mut self, text: impl Into<String>) {
        let text = text.into();
        if !self.caveats.contains(&text) {
            self.caveats.push(text);
        }
    }

    /// Adds a source once.
    pub fn cite(&mut self, key: &str, citation: impl Into<String>) {
        if !self.sources.iter().any(|s| s.key == key) {
            self.sources.push(SourceRef {
                key: key.to_string(),
                citation: citation.into(),
            });
        }
    }
}
