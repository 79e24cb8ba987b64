//! The engine: answers statements from an in-memory snapshot of the catalog. The REPL,
//! batch mode and the server call only this facade; none of them computes anything.
//!
//! ```
//! use satline::engine::Engine;
//! let engine = Engine::open_embedded().unwrap();
//! let mut session = engine.session();
//! let answers = engine.run_text("solubility of KNO3 at 20 C", &mut session);
//! assert!(answers[0].ok);
//! assert_eq!(answers[0].rows[0].unit.as_deref(), Some("g/100g water"));
//! ```

mod common;
mod error;
mod gas;
mod plot;
mod records;
mod snapshot;
mod solid;

use std::path::Path;
use std::sync::Arc;

pub use error::EvalError;
pub use snapshot::Snapshot;

use crate::answer::{Answer, AnswerKind, ErrorReport};
use crate::catalog::Catalog;
use crate::query::{self, Env, Located, Statement};

/// The caution shown once per answer where the work can hurt someone.
pub const CAUTION: &str = "Reference data are for screening: a real formulation (other solutes, pH, \
supersaturation, seeding, container) can behave differently; confirm with stability testing of \
the actual product, and follow the safety data sheet, local regulations and licensed practice.";

/// State kept between calls of one session: names bound with `let`.
#[derive(Debug, Default, Clone)]
pub struct Session {
    env: Env,
}

impl Session {
    /// The names bound with `let` so far.
    pub fn names(&self) -> impl Iterator<Item = &str> {
        self.env.names()
    }
}

/// The engine over one catalog snapshot. Cloning is cheap (the snapshot is shared).
#[derive(Debug, Clone)]
pub struct Engine {
    snapshot: Arc<Snapshot>,
}

impl Engine {
    /// Opens the database at `db`, or the embedded default database when `None`.
    pub fn open(db: Option<&Path>) -> Result<Engine, crate::Error> {
        Ok(Engine::from_catalog(Catalog::open(db)?))
    }

    /// Opens the embedded default database.
    pub fn open_embedded() -> Result<Engine, crate::Error> {
        Engine::open(None)
    }

    /// An engine over a catalog already built.
    pub fn from_catalog(catalog: Catalog) -> Engine {
        Engine {
            snapshot: Arc::new(Snapshot::new(catalog)),
        }
    }

    /// The catalog the engine answers from.
    pub fn catalog(&self) -> &Catalog {
        &self.snapshot.catalog
    }

    /// A fresh session (no `let` names bound).
    pub fn session(&self) -> Session {
        Session::default()
    }

    /// Parses and answers every statement of `text`, in order: one answer per statement,
    /// failed ones included (`ok: false`, with line and column relative to `text`).
    pub fn run_text(&self, text: &str, session: &mut Session) -> Vec<Answer> {
        query::parse_with(text, &mut session.env)
            .into_iter()
            .map(|parsed| match parsed {
                Ok(statement) => self.run(&statement, text),
                Err(error) => {
                    let report = error.report(text);
                    let line = report.line;
                    let statement = statement_text(text, error.span.start);
                    let mut answer = Answer::failed(statement, AnswerKind::Invalid, report);
                    answer.line = line;
                    answer
                }
            })
            .collect()
    }

    /// Answers one parsed statement; `text` is the script its spans point into.
    pub fn run(&self, statement: &Located<Statement>, text: &str) -> Answer {
        let written = statement.span.text(text).trim().to_string();
        let kind = kind_of(&statement.node);
        let mut answer = Answer::new(written.clone(), kind);
        answer.line = query::line_column(text, statement.span.start).0;
        let result = match &statement.node {
            Statement::Solubility(s) => solid::lookup(&self.snapshot, s, &mut answer),
            Statement::Screen(s) => solid::screen(&self.snapshot, s, &mut answer),
            Statement::Saturation(s) => solid::saturation(&self.snapshot, s, &mut answer),
            Statement::Ceiling(s) => solid::ceiling(&self.snapshot, s, &mut answer),
            Statement::HeatOfSolution(s) => solid::heat(&self.snapshot, s, &mut answer),
            Statement::DissolvedGas(s) => gas::dissolved(&self.snapshot, s, &mut answer),
            Statement::Freezing(s) => solid::freezing(&self.snapshot, s, &mut answer),
            Statement::Convert(s) => solid::convert(&self.snapshot, s, &mut answer),
            Statement::Require(s) => solid::require(&self.snapshot, s, &mut answer),
            Statement::Describe(s) => records::describe(&self.snapshot, s, &mut answer),
            Statement::Sources(s) => records::sources(&self.snapshot, s, &mut answer),
            Statement::List(s) => records::list(&self.snapshot, s, &mut answer),
            Statement::Let(s) => records::binding(s, text, &mut answer),
            Statement::Plot(s) => plot::plot(&self.snapshot, s, &mut answer),
        };
        match result {
            Ok(()) => answer,
            Err(error) => {
                let span = error.span();
                let (line, column) = query::line_column(text, span.start);
                let mut failed = Answer::failed(
                    written,
                    kind,
                    ErrorReport {
                        stage: "evaluate",
                        code: error.code(),
                        message: error.to_string(),
                        line,
                        column,
                        span: (span.start, span.end),
                    },
                );
                failed.line = answer.line;
                failed
            }
        }
    }

    /// Solute names, ids, formulas and synonyms, sorted, for completion in the REPL.
    pub fn solute_names(&self) -> &[String] {
        self.snapshot.names()
    }
}

/// The line of `text` holding byte `offset`, trimmed: what a failed statement "said".
fn statement_text(text: &str, offset: usize) -> String {
    let offset = offset.min(text.len());
    let start = text[..offset].rfind(['\n', ';']).map_or(0, |i| i + 1);
    let end = text[offset..]
        .find(['\n', ';'])
        .map_or(text.len(), |i| offset + i);
    text.get(start..end).unwrap_or("").trim().to_string()
}

fn kind_of(statement: &Statement) -> AnswerKind {
    match statement {
        Statement::Solubility(_) => AnswerKind::Lookup,
        Statement::Screen(_) => AnswerKind::Screening,
        Statement::Saturation(_) => AnswerKind::Saturation,
        Statement::Ceiling(_) => AnswerKind::Ceiling,
        Statement::HeatOfSolution(_) => AnswerKind::Heat,
        Statement::DissolvedGas(_) => AnswerKind::Gas,
        Statement::Freezing(_) => AnswerKind::Freezing,
        Statement::Convert(_) => AnswerKind::Convert,
        Statement::Describe(_) => AnswerKind::Describe,
        Statement::Sources(_) => AnswerKind::Sources,
        Statement::List(_) => AnswerKind::List,
        Statement::Let(_) => AnswerKind::Let,
        Statement::Require(_) => AnswerKind::Require,
        Statement::Plot(_) => AnswerKind::Plot,
    }
}

/// Keywords of the query language, for completion and help.
pub fn keywords() -> Vec<&'static str> {
    query::keywords()
}
