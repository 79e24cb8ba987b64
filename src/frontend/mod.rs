//! Front ends over the engine: batch scripts for build tools and the interactive session.
//! Neither computes anything: both hand text to `engine` and answers to `output`.
//!
//! `batch` runs scripts and decides the exit status; `repl` is the interactive session, with
//! its `command`s (help, output format), `complete` (completion and hints) and `help` texts.

pub mod arguments;
pub mod batch;
pub mod cli;
pub mod command;
pub mod complete;
pub mod help;
pub mod help_command;
pub mod history_view;
pub mod import_paths;
pub mod librarian;
pub mod picture;
pub mod progress;
pub mod repl;
pub mod screen;

use std::io::IsTerminal;
use std::path::Path;

use crate::engine::Engine;

/// How a front end ended, as the process's exit status. The order is the order of
/// severity: when several things went wrong, the worst one decides the status.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Outcome {
    /// Every statement was answered and every `require` held (exit 0).
    Success,
    /// A `require` did not hold (exit 1).
    RequirementFailed,
    /// A statement could not be parsed or answered (exit 2).
    Unanswered,
    /// The store or a file could not be read, or the output could not be written (exit 3).
    Trouble,
}

impl Outcome {
    /// The process exit code of this outcome.
    pub fn code(self) -> u8 {
        match self {
            Outcome::Success => 0,
            Outcome::RequirementFailed => 1,
            Outcome::Unanswered => 2,
            Outcome::Trouble => 3,
        }
    }

    /// The more severe of two outcomes.
    pub fn worst(self, other: Outcome) -> Outcome {
        self.max(other)
    }
}

/// `satline` with no subcommand: the interactive session when standard input is a terminal,
/// otherwise a batch run of standard input (as `satline run -`, table output).
pub fn run_default(
    db: Option<&Path>,
    recipes: &[std::path::PathBuf],
    layout: &cli::LayoutArgs,
) -> Outcome {
    if std::io::stdin().is_terminal() {
        repl::run(db, layout)
    } else {
        let run = batch::Batch {
            db,
            recipes,
            sources: &[batch::ScriptSource::Stdin],
            format: crate::output::Format::Table,
            pictures: &picture::Pictures::default(),
        };
        batch::run_std(&run, layout)
    }
}

/// Opens the engine for a front end. The one place the front ends reach the engine's
/// constructor, so a change of the facade touches only this function.
pub(crate) fn open_engine(db: Option<&Path>) -> Result<Engine, crate::Error> {
    Engine::open(db)
}

pub(crate) use crate::store::database_name;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn worst_outcome_wins() {
        assert_eq!(
            Outcome::Success.worst(Outcome::RequirementFailed),
            Outcome::RequirementFailed
        );
        assert_eq!(
            Outcome::Unanswered.worst(Outcome::RequirementFailed),
            Outcome::Unanswered
        );
        assert_eq!(Outcome::Trouble.worst(Outcome::Success), Outcome::Trouble);
        let codes: Vec<u8> = [
            Outcome::Success,
            Outcome::RequirementFailed,
            Outcome::Unanswered,
            Outcome::Trouble,
        ]
        .iter()
        .map(|o| o.code())
        .collect();
        assert_eq!(codes, [0, 1, 2, 3]);
    }

    #[test]
    fn database_named_in_messages() {
        assert_eq!(database_name(None), "the embedded database");
        assert_eq!(database_name(Some(Path::new("a/b.db"))), "a/b.db");
    }
}
