//! Session commands of the interactive session: lines that talk to the session rather than
//! ask the reference (`help`, `output json`, `save curve.svg`, `forget`, `clear`, `quit`). They are parsed here into an
//! enum with its own error type; every other line is a statement for the engine.

use crate::frontend::help::{self, Topic};
use crate::output::Format;

/// The words that start a session command. None of them starts a statement.
pub const COMMAND_WORDS: [&str; 7] = ["help", "output", "save", "forget", "clear", "quit", "exit"];

/// A session command.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SessionCommand {
    /// `help` (the overview) or `help TOPIC`.
    Help(Option<&'static Topic>),
    /// `output FORMAT` sets the output format; `output` alone tells the current one.
    Output(Option<Format>),
    /// `save FILE`: writes the last plot to FILE, as SVG or PNG by its extension.
    Save(String),
    /// `forget`: unbinds every name bound with `let`.
    Forget,
    /// `clear`: clears the screen (as Ctrl-L does).
    Clear,
    /// `quit` or `exit`: leaves the session.
    Leave,
}

/// A line that starts like a session command but is not a valid one.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum CommandError {
    /// An output format we do not have: `output yaml`.
    #[error("there is no output format `{given}`: choose one of {}", Format::NAMES.join(", "))]
    UnknownFormat { given: String },
    /// A help topic we do not have: `help frobnicate`.
    #[error("there is no help on `{given}`; the topics are: {}", help::topic_names().join(", "))]
    UnknownTopic { given: String },
    /// `save` without a file: `save`.
    #[error(
        "`save` wants a file to write the last plot to, such as `save curve.svg` or `save curve.png`"
    )]
    MissingFile,
    /// Words after a command that takes none: `forget everything`.
    #[error("`{command}` takes nothing after it (found `{extra}`)")]
    UnexpectedWords {
        command: &'static str,
        extra: String,
    },
}

/// Parses a line as a session command. `None` when the line is not one (it is then a
/// statement); `Some(Err(..))` when it starts with a command word but is malformed.
pub fn parse(line: &str) -> Option<Result<SessionCommand, CommandError>> {
    let line = line.trim();
    let (first, rest) = match line.split_once(char::is_whitespace) {
        Some((first, rest)) => (first, rest.trim()),
        None => (line, ""),
    };
    let first = first.to_ascii_lowercase();
    let no_more = |command: &'static str, value: SessionCommand| {
        if rest.is_empty() {
            Ok(value)
        } else {
            Err(CommandError::UnexpectedWords {
                command,
                extra: rest.to_string(),
            })
        }
    };
    let parsed = match first.as_str() {
        "help" | "?" => optional(rest, help::find)
            .map(SessionCommand::Help)
            .map_err(|given| CommandError::UnknownTopic { given }),
        "output" => optional(rest, Format::from_name)
            .map(SessionCommand::Output)
            .map_err(|given| CommandError::UnknownFormat { given }),
        "save" => {
            if rest.is_empty() {
                Err(CommandError::MissingFile)
            } else {
                Ok(SessionCommand::Save(rest.to_string()))
            }
        }
        "forget" => no_more("forget", SessionCommand::Forget),
        "clear" => no_more("clear", SessionCommand::Clear),
        "quit" => no_more("quit", SessionCommand::Leave),
        "exit" => no_more("exit", SessionCommand::Leave),
        _ => return None,
    };
    Some(parsed)
}

/// The word after a command that takes one at most (`help [TOPIC]`, `output [FORMAT]`):
/// none, or one that `find` knows; `Err` holds a word it does not know.
fn optional<T>(rest: &str, find: impl FnOnce(&str) -> Option<T>) -> Result<Option<T>, String> {
    if rest.is_empty() {
        return Ok(None);
    }
    find(rest).map(Some).ok_or_else(|| rest.to_string())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clear_is_a_command_of_its_own() {
        assert_eq!(parse("clear"), Some(Ok(SessionCommand::Clear)));
        assert_eq!(parse(" CLEAR "), Some(Ok(SessionCommand::Clear)));
        assert!(matches!(parse("clear all"), Some(Err(_))));
    }

    #[test]
    fn statements_are_not_commands() {
        assert_eq!(parse("solubility of KNO3 at 20 C"), None);
        assert_eq!(parse("describe NaCl"), None);
        assert_eq!(parse(""), None);
        assert_eq!(parse("outputs"), None);
    }

    #[test]
    fn help_and_topics() {
        assert_eq!(parse("help"), Some(Ok(SessionCommand::Help(None))));
        assert_eq!(parse("  HELP  "), Some(Ok(SessionCommand::Help(None))));
        let Some(Ok(SessionCommand::Help(Some(topic)))) = parse("help require") else {
            panic!("help require is a topic");
        };
        assert_eq!(topic.name, "require");
        let Some(Ok(SessionCommand::Help(Some(topic)))) = parse("help heat of solution") else {
            panic!("help heat of solution is a topic");
        };
        assert_eq!(topic.name, "heat");
    }

    #[test]
    fn unknown_topic_says_which_exist() {
        let Some(Err(error)) = parse("help frobnicate") else {
            panic!("expected an error");
        };
        assert_eq!(
            error,
            CommandError::UnknownTopic {
                given: "frobnicate".into()
            }
        );
        let text = error.to_string();
        assert!(text.contains("`frobnicate`"), "{text}");
        assert!(text.contains("require"), "{text}");
    }

    #[test]
    fn output_formats() {
        assert_eq!(
            parse("output json"),
            Some(Ok(SessionCommand::Output(Some(Format::Json))))
        );
        assert_eq!(
            parse("Output CSV"),
            Some(Ok(SessionCommand::Output(Some(Format::Csv))))
        );
        assert_eq!(parse("output"), Some(Ok(SessionCommand::Output(None))));
        let Some(Err(error)) = parse("output yaml") else {
            panic!("expected an error");
        };
        assert_eq!(
            error.to_string(),
            "there is no output format `yaml`: choose one of table, json, csv"
        );
    }

    proptest::proptest! {
        #[test]
        fn any_line_parses_without_panic(line in "\\PC{0,40}") {
            let _ = parse(&line);
        }
    }

    #[test]
    fn save_wants_a_file() {
        assert_eq!(
            parse("save out/curve.svg"),
            Some(Ok(SessionCommand::Save("out/curve.svg".into())))
        );
        assert_eq!(parse("save"), Some(Err(CommandError::MissingFile)));
    }

    #[test]
    fn commands_without_arguments() {
        assert_eq!(parse("forget"), Some(Ok(SessionCommand::Forget)));
        assert_eq!(parse("quit"), Some(Ok(SessionCommand::Leave)));
        assert_eq!(parse("exit"), Some(Ok(SessionCommand::Leave)));
        assert_eq!(
            parse("forget everything"),
            Some(Err(CommandError::UnexpectedWords {
                command: "forget",
                extra: "everything".into()
            }))
        );
    }
}
