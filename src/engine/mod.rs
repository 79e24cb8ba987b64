//! The engine: answers statements from the in-memory catalog. The REPL, batch mode and the
//! server call only this facade.
//!
//! PLACEHOLDER FACADE: the signatures below are the contract the front ends are written
//! against; the bodies are being written on another branch and replace these before any
//! release. `run_text` here answers every statement with "not answered yet".

use std::path::Path;

use crate::answer::{Answer, AnswerKind, ErrorReport};

/// State kept between calls of one session: names bound with `let`.
#[derive(Debug, Default, Clone)]
pub struct Session {
    _private: (),
}

/// The engine over one catalog snapshot.
#[derive(Debug)]
pub struct Engine {
    names: Vec<String>,
}

impl Engine {
    /// Opens the database at `db`, or the embedded default database when `None`.
    pub fn open(_db: Option<&Path>) -> Result<Engine, crate::Error> {
        Ok(Engine {
            names: vec!["potassium nitrate".into(), "KNO3".into()],
        })
    }

    /// A fresh session (no `let` names bound).
    pub fn session(&self) -> Session {
        Session::default()
    }

    /// Parses and answers every statement of `text`, in order: one answer per statement,
    /// failed ones included (`ok: false`, with line and column relative to `text`).
    pub fn run_text(&self, text: &str, _session: &mut Session) -> Vec<Answer> {
        let mut offset = 0;
        let mut answers = Vec::new();
        for (index, line) in text.split_inclusive('\n').enumerate() {
            let statement = line.trim();
            if !statement.is_empty() && !statement.starts_with('#') {
                answers.push(Answer::failed(
                    statement,
                    AnswerKind::Invalid,
                    ErrorReport {
                        stage: "evaluate",
                        message: "not answered yet".into(),
                        line: index + 1,
                        column: 1,
                        span: (offset, offset + line.trim_end().len()),
                    },
                ));
            }
            offset += line.len();
        }
        answers
    }

    /// Solute names, formulas and synonyms, for completion in the REPL.
    pub fn solute_names(&self) -> &[String] {
        &self.names
    }
}

/// Keywords of the query language, for completion and help.
pub fn keywords() -> &'static [&'static str] {
    &[
        "solubility",
        "of",
        "at",
        "from",
        "to",
        "in",
        "which",
        "salts",
        "solutes",
        "gases",
        "stay",
        "dissolved",
        "margin",
        "saturation",
        "ceiling",
        "heat",
        "solution",
        "under",
        "air",
        "freezing",
        "convert",
        "describe",
        "sources",
        "list",
        "with",
        "let",
        "require",
        "stays",
        "over",
    ]
}
