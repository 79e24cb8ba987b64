//! The interactive session driven through a pseudo-terminal, as a person would use it:
//! statements, Tab completion, errors that leave the session running, Ctrl-C and Ctrl-D,
//! and history kept between sessions.

use std::path::Path;
use std::process::Command;

use rexpect::process::WaitStatus;
use rexpect::reader::Options;
use rexpect::session::{PtySession, spawn_with_options};

/// How long one expectation may wait. Generous for a loaded 2-core CI machine; a passing
/// test waits only as long as the session takes to answer.
const TIMEOUT_MS: u64 = 30_000;

/// Starts a session (`satline repl`, or `satline` alone when `args` is empty) with its
/// history in `history`, and waits for the first prompt.
fn start(history: &Path, args: &[&str]) -> PtySession {
    let mut command = Command::new(env!("CARGO_BIN_EXE_satline"));
    command
        .args(args)
        .env("SATLINE_HISTORY", history)
        .env("TERM", "xterm")
        .env("NO_COLOR", "1")
        .env_remove("SATLINE_DB");
    // Escape codes are kept: the lines matched are the session's own output, which has
    // none, and the line editor's redraws use private modes the stripper does not know.
    let options = Options::new().timeout_ms(Some(TIMEOUT_MS));
    let mut session = spawn_with_options(command, options).unwrap();
    session
        .exp_string("Caution: Reference data are for screening:")
        .unwrap();
    session.exp_string("satline> ").unwrap();
    session
}

/// Types keys without Enter (`send` alone leaves them in the writer's buffer).
fn type_keys(session: &mut PtySession, keys: &str) {
    session.send(keys).unwrap();
    session.flush().unwrap();
}

/// Leaves with Ctrl-D and checks that the session ended by itself, with status 0.
fn leave(mut session: PtySession) {
    session.send_control('d').unwrap();
    session.exp_eof().unwrap();
    match session.process().wait().unwrap() {
        WaitStatus::Exited(_, code) => assert_eq!(code, 0),
        other => panic!("the session did not exit by itself: {other:?}"),
    }
}

#[test]
fn statement_is_answered_and_the_banner_shows_once() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    session.send_line("solubility of KNO3 at 20 C").unwrap();
    session.exp_string("» solubility of KNO3 at 20 C").unwrap();
    let rest = session.exp_string("satline> ").unwrap();
    assert!(!rest.contains("Caution"), "banner shown again: {rest}");
    leave(session);
}

#[test]
fn statement_shows_its_table() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    session.send_line("solubility of KNO3 at 20 C").unwrap();
    session.exp_string("» solubility of KNO3 at 20 C").unwrap();
    session.exp_string("solute").unwrap();
    session.exp_string("g/100g water").unwrap();
    session.exp_string("satline> ").unwrap();
    leave(session);
}

#[test]
fn no_arguments_on_a_terminal_starts_the_session() {
    let dir = tempfile::tempdir().unwrap();
    let session = start(&dir.path().join("history"), &[]);
    leave(session);
}

#[test]
fn tab_completes_a_partial_solute_name() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    // "potassium nitra" is a prefix of one name only, whatever other potassium salts the
    // catalog holds.
    type_keys(&mut session, "solubility of potassium nitra");
    type_keys(&mut session, "\t");
    type_keys(&mut session, " at 20 C\r");
    // The catalog decides the capitalisation of the name.
    session
        .exp_regex("(?i)» solubility of potassium nitrate at 20 C")
        .unwrap();
    // The answer is printed before the next prompt; leave only at the prompt, or the
    // Ctrl-D can arrive while the terminal is not yet in the line editor's raw mode.
    session.exp_string("satline> ").unwrap();
    leave(session);
}

#[test]
fn an_error_leaves_the_session_running() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    session.send_line("solubility of KNO3 at 5 g/L").unwrap();
    session.exp_string(" line 1, column 23").unwrap();
    session
        .exp_string("not read: expected a temperature")
        .unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("output yaml").unwrap();
    session
        .exp_string("there is no output format `yaml`")
        .unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("help require").unwrap();
    session
        .exp_string("require KCl stays dissolved at 20 g/100g water over cold margin 10%")
        .unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("output json").unwrap();
    session.exp_string("output: json").unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("describe NaCl").unwrap();
    session
        .exp_string("{\"statement\":\"describe NaCl\"")
        .unwrap();
    // The answer is printed before the next prompt; leave only at the prompt, or the
    // Ctrl-D can arrive while the terminal is not yet in the line editor's raw mode.
    session.exp_string("satline> ").unwrap();
    leave(session);
}

#[test]
fn ctrl_c_drops_the_line_and_a_backslash_continues_it() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    type_keys(&mut session, "describe Na");
    session.send_control('c').unwrap();
    // The line editor's redraws while the keys are typed each show the prompt again, with
    // no line break: the fresh prompt is the one after the break Ctrl-C makes. (Typing the
    // next line before it, while the editor is not yet reading again, loses the line.)
    session.exp_string("\r\n").unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("solubility of KNO3 \\").unwrap();
    session.exp_string("..> ").unwrap();
    session.send_line("at 20 C").unwrap();
    let shown = session.exp_string("» solubility of KNO3 at 20 C").unwrap();
    assert!(!shown.contains("» describe Na"), "{shown}");
    session.exp_string("satline> ").unwrap();
    session.send_line("quit").unwrap();
    session.exp_eof().unwrap();
}

#[test]
fn history_persists_across_sessions() {
    let dir = tempfile::tempdir().unwrap();
    // A directory that does not exist yet: the session makes it.
    let history = dir.path().join("data").join("history");
    let mut first = start(&history, &["repl"]);
    first.send_line("describe NaCl").unwrap();
    first.exp_string("» describe NaCl").unwrap();
    first.exp_string("satline> ").unwrap();
    leave(first);
    let saved = std::fs::read_to_string(&history).unwrap();
    assert!(saved.contains("describe NaCl"), "{saved}");

    let mut second = start(&history, &["repl"]);
    // Up arrow brings back the statement of the first session.
    type_keys(&mut second, "\x1b[A");
    type_keys(&mut second, "\r");
    second.exp_string("» describe NaCl").unwrap();
    // The answer is printed before the next prompt; leave only at the prompt, or the
    // Ctrl-D can arrive while the terminal is not yet in the line editor's raw mode.
    second.exp_string("satline> ").unwrap();
    leave(second);
}

/// Statements as arguments on a terminal: an error appears once, as the block with its
/// position, not also as a `file:line:column` line on the error stream.
#[test]
fn an_error_on_a_terminal_appears_once() {
    let mut command = Command::new(env!("CARGO_BIN_EXE_satline"));
    command
        .args([
            "solubility of KNO3 at 20 C",
            "solubility of Kryptonite at 20 C",
        ])
        .env("TERM", "xterm")
        .env("NO_COLOR", "1")
        .env_remove("SATLINE_DB");
    let options = Options::new().timeout_ms(Some(TIMEOUT_MS));
    let mut session = spawn_with_options(command, options).unwrap();
    let seen = session.exp_eof().unwrap();
    assert!(seen.contains("line 2, column"), "{seen}");
    assert!(!seen.contains("<arguments>:2:"), "{seen}");
}

/// Statements as arguments on an 80-column terminal: every line of the answers fits, and
/// notes shown once are referred to by number.
#[test]
fn answers_on_an_80_column_terminal_fit_it() {
    let mut command = Command::new(env!("CARGO_BIN_EXE_satline"));
    command
        .args([
            "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
            "solubility of KNO3 at 20 C",
            "solubility of KNO3 at 40 C",
            "heat of solution of KNO3 at 25 C",
        ])
        // The pseudo-terminal does not say its size: the width comes from COLUMNS.
        .env("COLUMNS", "80")
        .env("TERM", "xterm")
        .env("NO_COLOR", "1")
        .env_remove("SATLINE_DB");
    let options = Options::new().timeout_ms(Some(TIMEOUT_MS));
    let mut session = spawn_with_options(command, options).unwrap();
    let seen = session.exp_eof().unwrap();
    // The session's reader hands over bytes as Latin-1 characters: decode them as UTF-8.
    let bytes: Vec<u8> = seen
        .chars()
        .map(|c| u8::try_from(u32::from(c)).unwrap_or(b'?'))
        .collect();
    let seen = String::from_utf8_lossy(&bytes).into_owned();
    let widest = seen
        .lines()
        .map(|l| l.trim_end_matches('\r').chars().count())
        .max()
        .unwrap_or(0);
    assert!(widest <= 80, "a line of {widest} columns:\n{seen}");
    assert!(
        seen.contains("notes 1-4 as above") || seen.contains("as above"),
        "{seen}"
    );
    assert!(seen.contains("potassium nitrate"), "{seen}");
}

/// Ctrl-L and `clear` clear the screen: the session writes the terminal's "cursor home"
/// and "erase display" sequences (ECMA-48 CUP and ED), and goes on.
#[test]
fn ctrl_l_and_clear_clear_the_screen() {
    let dir = tempfile::tempdir().unwrap();
    let mut session = start(&dir.path().join("history"), &["repl"]);
    session.send_line("describe NaCl").unwrap();
    session.exp_string("satline> ").unwrap();
    type_keys(&mut session, "sources");
    session.send_control('l').unwrap();
    // Home, then erase to the end of the screen (all of it, from home).
    session.exp_string("\x1b[H").unwrap();
    session.exp_regex("\x1b\\[[02]?J").unwrap();
    // The line being typed is drawn again and can be finished.
    session.exp_string("sources").unwrap();
    type_keys(&mut session, " of KCl\r");
    session.exp_string("» sources of KCl").unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("clear").unwrap();
    session.exp_string("\x1b[H\x1b[2J").unwrap();
    session.exp_string("satline> ").unwrap();
    session.send_line("solubility of KNO3 at 20 C").unwrap();
    session.exp_string("» solubility of KNO3 at 20 C").unwrap();
    session.exp_string("satline> ").unwrap();
    leave(session);
}
