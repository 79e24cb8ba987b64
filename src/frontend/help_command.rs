//! `satline help [TOPIC]` at the command line: the same topics as the session's `help`, and
//! the commands' own help, so that a person never has to start the session to read about a
//! statement.

use std::io::Write;

use clap::CommandFactory;

use crate::frontend::Outcome;
use crate::frontend::cli::Cli;
use crate::frontend::help;

/// Writes the help asked for to `out`; an unknown topic is a message on `err` (exit 2) with
/// the nearest topic or command, when one is near.
pub fn run(topic: &[String], out: &mut impl Write, err: &mut impl Write) -> Outcome {
    let mut cli = Cli::command();
    let wanted = topic.join(" ");
    let written = if wanted.trim().is_empty() {
        write!(
            out,
            "{}\n{}\nCommands (satline help COMMAND, or satline COMMAND --help):\n{}",
            cli.render_help(),
            help::overview(),
            command_list(&cli)
        )
    } else if let Some(found) = help::find(&wanted) {
        write!(out, "{}", help::render(found))
    } else if let Some(sub) = cli.find_subcommand_mut(wanted.trim()) {
        write!(out, "{}", sub.render_long_help())
    } else {
        let mut names = help::topic_names();
        let commands: Vec<String> = cli
            .get_subcommands()
            .map(|c| c.get_name().to_string())
            .collect();
        names.extend(commands.iter().map(String::as_str));
        let hint = crate::query::lexicon::nearest(wanted.trim(), &names)
            .map(|n| format!(" (did you mean `{n}`?)"))
            .unwrap_or_default();
        let _ = writeln!(
            err,
            "satline: no help topic or command `{}`{hint}; `satline help` lists them",
            wanted.trim()
        );
        return Outcome::Unanswered;
    };
    match written {
        Ok(()) => Outcome::Success,
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Outcome::Success,
        Err(e) => {
            let _ = writeln!(err, "satline: cannot write the help: {e}");
            Outcome::Trouble
        }
    }
}

/// Each command with its description, wrapped to [`help::WIDTH`] under a hanging indent.
fn command_list(cli: &clap::Command) -> String {
    let width = cli
        .get_subcommands()
        .map(|c| c.get_name().len())
        .max()
        .unwrap_or(0);
    let indent = width + 4;
    let room = help::WIDTH.saturating_sub(indent).max(20);
    let mut text = String::new();
    for c in cli.get_subcommands() {
        let about = c.get_about().map(|a| a.to_string()).unwrap_or_default();
        let mut line = format!("  {:width$}  ", c.get_name());
        let mut used = 0;
        for word in about.split_whitespace() {
            let len = word.chars().count();
            if used > 0 && used + 1 + len > room {
                text.push_str(line.trim_end());
                text.push('\n');
                line = " ".repeat(indent);
                used = 0;
            }
            if used > 0 {
                line.push(' ');
                used += 1;
            }
            line.push_str(word);
            used += len;
        }
        text.push_str(line.trim_end());
        text.push('\n');
    }
    text
}

#[cfg(test)]
mod tests {
    use super::*;

    fn help(topic: &[&str]) -> (Outcome, String, String) {
        let topic: Vec<String> = topic.iter().map(|s| s.to_string()).collect();
        let (mut out, mut err) = (Vec::new(), Vec::new());
        let outcome = run(&topic, &mut out, &mut err);
        (
            outcome,
            String::from_utf8(out).unwrap(),
            String::from_utf8(err).unwrap(),
        )
    }

    #[test]
    fn a_language_topic_is_the_sessions_text() {
        let (outcome, out, _) = help(&["require"]);
        assert_eq!(outcome, Outcome::Success);
        assert_eq!(out, help::render(help::find("require").unwrap()));
    }

    #[test]
    fn a_command_gets_its_own_help_and_no_topic_lists_both() {
        let (_, out, _) = help(&["import"]);
        assert!(out.contains("--dry-run"), "{out}");
        let (_, out, _) = help(&[]);
        assert!(out.contains("Topics (help TOPIC)"));
        assert!(out.contains("serve"));
        assert!(out.contains("grammar/README.md"));
        // The list of commands fits an 80-column terminal.
        let list = out.split("Commands (").nth(1).unwrap();
        assert!(
            list.lines().all(|l| l.chars().count() <= help::WIDTH),
            "{list}"
        );
    }

    #[test]
    fn an_unknown_topic_is_refused_with_the_nearest() {
        let (outcome, out, err) = help(&["requre"]);
        assert_eq!(outcome, Outcome::Unanswered);
        assert!(out.is_empty());
        assert!(err.contains("did you mean `require`?"), "{err}");
    }
}
