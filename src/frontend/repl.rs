//! The interactive session: reads lines with rustyline (history kept between sessions,
//! completion, hints), joins continued lines, runs session commands and hands statements to
//! the engine, printing answers through the output printer. A failed statement is shown
//! with a caret and the session goes on; Ctrl-C drops the line, Ctrl-D leaves.
//!
//! `Repl` holds the session and handles one complete input, writing to any `Write`, so it
//! is tested without a terminal; `run` is the terminal loop around it.

use std::io::{self, IsTerminal, Write};
use std::path::{Path, PathBuf};

use rustyline::config::{CompletionType, Config};
use rustyline::error::ReadlineError;
use rustyline::history::DefaultHistory;
use rustyline::{Cmd, Editor, EventHandler, KeyEvent};

use crate::engine::{Engine, Session};
use crate::frontend::cli::LayoutArgs;
use crate::frontend::command::{self, SessionCommand};
use crate::frontend::complete::{SessionHelper, Vocabulary};
use crate::frontend::picture::{Pictures, write_picture};
use crate::frontend::{Outcome, database_name, help, open_engine};
use crate::output::table::{Layout, TableWriter};
use crate::output::{Format, Printer};
use crate::plot::{self, PlotSpec};

/// The prompt of a new statement.
pub const PROMPT: &str = "satline> ";
/// The prompt of a continued line.
pub const CONTINUATION_PROMPT: &str = "     ..> ";
/// The environment variable that chooses the history file.
pub const HISTORY_VARIABLE: &str = "SATLINE_HISTORY";
/// How many entries the history keeps.
const HISTORY_SIZE: usize = 1000;

/// What the session does after an input.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Flow {
    Continue,
    Leave,
}

/// One session over an engine: the `let` names bound so far and the output format.
pub struct Repl<'e> {
    engine: &'e Engine,
    session: Session,
    format: Format,
    /// What the last `plot` drew, for `save FILE`.
    last_plot: Option<PlotSpec>,
    /// How tables are laid out, and the notes shown so far.
    table: TableWriter,
}

impl<'e> Repl<'e> {
    pub fn new(engine: &'e Engine) -> Self {
        Repl {
            engine,
            session: engine.session(),
            format: Format::Table,
            last_plot: None,
            table: TableWriter::default(),
        }
    }

    /// Lays tables out with `layout` from now on (the notes shown so far are remembered).
    pub fn set_layout(&mut self, layout: Layout) {
        if layout != self.table.layout() {
            self.table = self.table.relaid(layout);
        }
    }

    /// The current output format.
    pub fn format(&self) -> Format {
        self.format
    }

    /// Handles one complete input (continued lines already joined): a session command or
    /// statements for the engine.
    pub fn handle(&mut self, input: &str, out: &mut impl Write) -> io::Result<Flow> {
        if input.trim().is_empty() {
            return Ok(Flow::Continue);
        }
        match command::parse(input) {
            Some(Ok(command)) => self.obey(command, out),
            Some(Err(error)) => {
                writeln!(out, "{error}")?;
                Ok(Flow::Continue)
            }
            None => {
                let answers = self.engine.run_text(input, &mut self.session);
                let table = std::mem::take(&mut self.table);
                let mut printer = Printer::new(&mut *out, self.format).with_table(table);
                for answer in &answers {
                    printer.print(answer, input)?;
                    if let Some(spec) = &answer.plot {
                        self.last_plot = Some((**spec).clone());
                    }
                }
                printer.flush()?;
                self.table = printer.table().clone();
                Ok(Flow::Continue)
            }
        }
    }

    fn obey(&mut self, command: SessionCommand, out: &mut impl Write) -> io::Result<Flow> {
        match command {
            SessionCommand::Help(None) => write!(out, "{}", help::overview())?,
            SessionCommand::Help(Some(topic)) => write!(out, "{}", help::render(topic))?,
            SessionCommand::Output(Some(format)) => {
                self.format = format;
                writeln!(out, "output: {}", format.name())?;
            }
            SessionCommand::Output(None) => writeln!(
                out,
                "output: {} (choose with: output {})",
                self.format.name(),
                Format::NAMES.join("|")
            )?,
            SessionCommand::Save(file) => self.save(&file, out)?,
            SessionCommand::Forget => {
                self.session = self.engine.session();
                writeln!(out, "forgot every name bound with let")?;
            }
            SessionCommand::Clear => super::screen::clear(out)?,
            SessionCommand::Leave => return Ok(Flow::Leave),
        }
        Ok(Flow::Continue)
    }
}

impl Repl<'_> {
    /// `save FILE`: writes the last plot as SVG or PNG, by the file's extension.
    fn save(&self, file: &str, out: &mut impl Write) -> io::Result<()> {
        let Some(spec) = &self.last_plot else {
            return writeln!(
                out,
                "no plot to save yet: draw one first, e.g. `plot KNO3 from 0 C to 100 C`"
            );
        };
        let path = Path::new(file);
        let written = Pictures::from_args(Some(path), None).and_then(|pictures| {
            let size = pictures.size;
            let format = pictures.out.map_or(plot::Format::Svg, |(_, f)| f);
            write_picture(spec, path, format, size).map(|()| (format, size))
        });
        match written {
            Ok((format, (width, height))) => writeln!(
                out,
                "wrote {file} ({} picture, {width}×{height})",
                format.name()
            ),
            Err(e) => writeln!(out, "{e}"),
        }
    }
}

/// Collects continued lines: a line ending in `\` continues on the next one. The pieces are
/// joined with a space, since a newline would end the statement.
#[derive(Debug, Default)]
pub struct Continuation {
    pending: String,
    waiting: bool,
}

impl Continuation {
    /// True while a continued line waits for its next piece.
    pub fn is_waiting(&self) -> bool {
        self.waiting
    }

    /// Adds a line; returns the whole input once a line does not continue.
    pub fn push(&mut self, line: &str) -> Option<String> {
        let line = line.trim_end_matches(['\r', '\n']);
        if self.waiting {
            self.pending.push(' ');
        }
        match line.trim_end().strip_suffix('\\') {
            Some(head) => {
                self.pending.push_str(head.trim_end());
                self.waiting = true;
                None
            }
            None => {
                self.pending.push_str(line);
                self.waiting = false;
                Some(std::mem::take(&mut self.pending))
            }
        }
    }

    /// Drops what was collected (Ctrl-C).
    pub fn clear(&mut self) {
        self.pending.clear();
        self.waiting = false;
    }
}

/// The banner shown when the session starts, with the caution, once.
pub fn banner() -> String {
    format!(
        "satline {}: a cited solubility reference for aqueous products.\n\
         Type `help` for statements and examples, Ctrl-D to leave.\n\n{}",
        env!("CARGO_PKG_VERSION"),
        help::wrap(&format!("Caution: {}", crate::engine::CAUTION), help::WIDTH)
    )
}

/// The history file: `SATLINE_HISTORY` when set, else `satline/history` in the user's data
/// directory; `None` when there is neither.
pub fn history_path() -> Option<PathBuf> {
    match std::env::var_os(HISTORY_VARIABLE) {
        Some(path) if !path.is_empty() => Some(PathBuf::from(path)),
        _ => dirs::data_dir().map(|dir| dir.join("satline").join("history")),
    }
}

/// Whether hints may be coloured on this terminal.
fn colour_allowed() -> bool {
    std::env::var_os("NO_COLOR").is_none()
        && std::env::var("TERM").map(|t| t != "dumb").unwrap_or(false)
        && io::stdout().is_terminal()
}

/// Prepares the history: creates its directory and loads it. Returns the path to append
/// to, or `None` (with a warning) when history cannot be kept.
fn open_history(editor: &mut Editor<SessionHelper, DefaultHistory>) -> Option<PathBuf> {
    let path = history_path()?;
    if let Some(dir) = path.parent().filter(|d| !d.as_os_str().is_empty()) {
        if let Err(e) = std::fs::create_dir_all(dir) {
            eprintln!(
                "satline: history is not kept: cannot create {}: {e}",
                dir.display()
            );
            return None;
        }
    }
    if path.exists() {
        if let Err(e) = editor.load_history(&path) {
            eprintln!(
                "satline: history is not kept: cannot read {}: {e}",
                path.display()
            );
            return None;
        }
    }
    Some(path)
}

/// The interactive session on the process's terminal.
pub fn run(db: Option<&Path>, layout: &LayoutArgs) -> Outcome {
    let engine = match open_engine(db) {
        Ok(engine) => engine,
        Err(e) => {
            eprintln!("satline: cannot open {}: {e}", database_name(db));
            return Outcome::Trouble;
        }
    };
    let config = Config::builder()
        .completion_type(CompletionType::List)
        .history_ignore_space(true)
        .auto_add_history(false);
    let config = match config
        .max_history_size(HISTORY_SIZE)
        .and_then(|c| c.history_ignore_dups(true))
    {
        Ok(config) => config.build(),
        Err(e) => {
            eprintln!("satline: cannot set up the line editor: {e}");
            return Outcome::Trouble;
        }
    };
    let mut editor: Editor<SessionHelper, DefaultHistory> = match Editor::with_config(config) {
        Ok(editor) => editor,
        Err(e) => {
            eprintln!("satline: cannot set up the line editor: {e}");
            return Outcome::Trouble;
        }
    };
    let vocabulary = Vocabulary::new(engine.solute_names());
    editor.set_helper(Some(SessionHelper::new(vocabulary, colour_allowed())));
    // Ctrl-L clears the screen and redraws the line being typed (bound here, whatever the
    // editor's defaults and mode are).
    editor.bind_sequence(KeyEvent::ctrl('L'), EventHandler::Simple(Cmd::ClearScreen));
    let history = open_history(&mut editor);

    let stdout = io::stdout();
    let mut out = stdout.lock();
    if writeln!(out, "{}", banner()).is_err() {
        return Outcome::Success;
    }
    let mut repl = Repl::new(&engine);
    let mut continuation = Continuation::default();
    loop {
        let prompt = if continuation.is_waiting() {
            CONTINUATION_PROMPT
        } else {
            PROMPT
        };
        let line = match editor.readline(prompt) {
            Ok(line) => line,
            Err(ReadlineError::Interrupted) => {
                continuation.clear();
                continue;
            }
            Err(ReadlineError::Eof) => break,
            Err(e) => {
                eprintln!("satline: cannot read the terminal: {e}");
                return Outcome::Trouble;
            }
        };
        let Some(input) = continuation.push(&line) else {
            continue;
        };
        remember(&mut editor, history.as_deref(), &input);
        // The terminal may have been resized since the last answer.
        repl.set_layout(super::screen::layout(layout.width, layout.full));
        match repl.handle(&input, &mut out) {
            Ok(Flow::Continue) => {}
            Ok(Flow::Leave) => break,
            // Output has nowhere to go: the session cannot go on.
            Err(_) => break,
        }
    }
    Outcome::Success
}

/// Adds an input to the history and appends it to the history file.
fn remember(editor: &mut Editor<SessionHelper, DefaultHistory>, path: Option<&Path>, input: &str) {
    if input.trim().is_empty() {
        return;
    }
    match editor.add_history_entry(input) {
        Ok(true) => {}
        _ => return,
    }
    if let Some(path) = path {
        if let Err(e) = editor.append_history(path) {
            eprintln!(
                "satline: cannot save the history to {}: {e}",
                path.display()
            );
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn handle(repl: &mut Repl, input: &str) -> (Flow, String) {
        let mut out = Vec::new();
        let flow = repl.handle(input, &mut out).unwrap();
        (flow, String::from_utf8(out).unwrap())
    }

    #[test]
    fn continued_lines_join_with_a_space() {
        let mut c = Continuation::default();
        assert_eq!(c.push("solubility of KNO3 \\"), None);
        assert!(c.is_waiting());
        assert_eq!(c.push("  at 20 C\\  "), None);
        assert_eq!(
            c.push("in mol/kg").as_deref(),
            Some("solubility of KNO3   at 20 C in mol/kg")
        );
        assert!(!c.is_waiting());
        assert_eq!(c.push("describe NaCl").as_deref(), Some("describe NaCl"));
    }

    #[test]
    fn ctrl_c_drops_the_continued_statement() {
        let mut c = Continuation::default();
        assert_eq!(c.push("solubility of \\"), None);
        c.clear();
        assert_eq!(c.push("describe NaCl").as_deref(), Some("describe NaCl"));
    }

    #[test]
    fn session_commands_change_the_format_and_go_on() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        assert_eq!(
            handle(&mut repl, "output json"),
            (Flow::Continue, "output: json\n".into())
        );
        assert_eq!(repl.format(), Format::Json);
        let (flow, text) = handle(&mut repl, "output yaml");
        assert_eq!(flow, Flow::Continue);
        assert!(text.contains("no output format `yaml`"));
        assert_eq!(repl.format(), Format::Json);
        let (_, text) = handle(&mut repl, "output");
        assert!(text.starts_with("output: json"));
        assert_eq!(handle(&mut repl, "quit").0, Flow::Leave);
    }

    #[test]
    fn statements_are_answered_in_the_chosen_format() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        let (_, table) = handle(&mut repl, "solubility of KNO3 at 20 C");
        assert!(
            table.starts_with("» solubility of KNO3 at 20 C\n"),
            "{table}"
        );
        handle(&mut repl, "output json");
        let (flow, json) = handle(&mut repl, "solubility of KNO3 at 20 C");
        assert_eq!(flow, Flow::Continue);
        let value: serde_json::Value = serde_json::from_str(json.trim()).unwrap();
        assert_eq!(value["statement"], "solubility of KNO3 at 20 C");
    }

    #[test]
    fn help_is_shown() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        let (_, text) = handle(&mut repl, "help");
        assert!(text.contains("Topics"));
        let (_, text) = handle(&mut repl, "help ceiling");
        assert!(text.contains("ceiling of KCl from 2 C to 8 C margin 10% in mol/kg"));
    }

    #[test]
    fn banner_carries_the_caution() {
        let banner = banner();
        // The engine's one caution text, as every answer carries it.
        assert!(banner.contains("Caution: Reference data are for screening:"));
        assert!(banner.contains("licensed practice."));
    }

    #[test]
    fn let_names_last_until_forgotten() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        handle(&mut repl, "let cold = from 2 C to 8 C");
        let require = "require KCl stays dissolved at 5 g/100g water over cold margin 10%";
        let (_, text) = handle(&mut repl, require);
        assert!(text.contains("requirement holds"), "{text}");
        handle(&mut repl, "forget");
        let (flow, text) = handle(&mut repl, require);
        assert_eq!(flow, Flow::Continue);
        assert!(text.contains("line 1, column 52"), "{text}");
        assert!(text.contains("not read: "), "{text}");
    }

    #[test]
    fn a_plot_is_sketched_and_saved() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        let (_, text) = handle(&mut repl, "save nothing.svg");
        assert!(text.starts_with("no plot to save yet"), "{text}");
        let (_, text) = handle(&mut repl, "plot KNO3 from 0 C to 100 C");
        assert!(text.contains("* potassium nitrate: solid KNO3"), "{text}");
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("curve.svg");
        let (_, text) = handle(&mut repl, &format!("save {}", file.display()));
        assert!(text.starts_with("wrote "), "{text}");
        assert!(std::fs::read_to_string(&file).unwrap().starts_with("<svg"));
        let (_, text) = handle(&mut repl, "save curve.gif");
        assert!(text.contains("not `.gif`"), "{text}");
    }

    #[test]
    fn blank_input_does_nothing() {
        let engine = open_engine(None).unwrap();
        let mut repl = Repl::new(&engine);
        assert_eq!(handle(&mut repl, "   "), (Flow::Continue, String::new()));
    }
}
