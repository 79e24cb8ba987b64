//! Batch mode: runs scripts of statements in order, writes every answer through the output
//! printer, reports problems on the error stream as `file:line:column: message` and decides
//! the exit status (see `Outcome`). Build tools read the JSON lines and the exit code.
//!
//! All scripts are read before any statement runs, so a missing file stops the run before
//! it has printed anything. One session spans all the scripts of a run, so a first file can
//! bind names with `let` for the files after it; each file's line numbers are its own.

use std::io::{self, IsTerminal, Read, Write};
use std::path::{Path, PathBuf};

use crate::answer::Answer;
use crate::engine::Engine;
use crate::frontend::cli::LayoutArgs;
use crate::frontend::picture::Pictures;
use crate::frontend::{Outcome, database_name, open_engine};
use crate::output::table::{Layout, TableWriter};
use crate::output::{Format, Printer};

/// How standard input is named in messages.
pub const STDIN_NAME: &str = "<stdin>";

/// How statements given as command-line arguments are named in messages.
pub const ARGUMENTS_NAME: &str = "<arguments>";

/// Where a script comes from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum ScriptSource {
    /// Standard input, given as `-`.
    Stdin,
    /// A file.
    File(PathBuf),
    /// Statements given on the command line, one per argument.
    Arguments(Vec<String>),
}

impl ScriptSource {
    /// `-` is standard input; anything else is a file.
    pub fn from_arg(arg: &Path) -> ScriptSource {
        if arg.as_os_str() == "-" {
            ScriptSource::Stdin
        } else {
            ScriptSource::File(arg.to_path_buf())
        }
    }

    /// The name used in messages: the path as given, or `<stdin>`.
    pub fn name(&self) -> String {
        match self {
            ScriptSource::Stdin => STDIN_NAME.to_string(),
            ScriptSource::File(path) => path.display().to_string(),
            ScriptSource::Arguments(_) => ARGUMENTS_NAME.to_string(),
        }
    }
}

/// A script read into memory, with the name its messages use.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Script {
    pub name: String,
    pub text: String,
}

/// What can stop a batch run before or outside the statements themselves (exit 3).
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum BatchError {
    /// A script could not be read: `satline run no-such-file.sl`.
    #[error("{name}: cannot read the script: {source}")]
    ReadScript {
        name: String,
        #[source]
        source: io::Error,
    },
    /// A script is not UTF-8 text: `satline run notes.sl` where notes.sl was saved as UTF-16.
    #[error("{name}: the script is not UTF-8 text (invalid byte at offset {offset})")]
    NotText { name: String, offset: usize },
    /// The database could not be opened: `satline --db no-such.db run check.sl`.
    #[error("cannot open {database}: {source}")]
    OpenStore {
        database: String,
        #[source]
        source: crate::Error,
    },
    /// The output could not be written, for a reason other than a closed pipe:
    /// `satline run check.sl > /dev/full`.
    #[error("cannot write the output: {0}")]
    WriteOutput(#[source] io::Error),
}

/// Reads every script; `stdin` is read for each `-`. Returns the scripts read and the
/// failures, each naming its file.
pub fn read_scripts(
    sources: &[ScriptSource],
    stdin: &mut impl Read,
) -> (Vec<Script>, Vec<BatchError>) {
    let mut scripts = Vec::new();
    let mut failures = Vec::new();
    for source in sources {
        let name = source.name();
        let bytes = match source {
            ScriptSource::Stdin => {
                let mut buf = Vec::new();
                stdin.read_to_end(&mut buf).map(|_| buf)
            }
            ScriptSource::File(path) => std::fs::read(path),
            ScriptSource::Arguments(statements) => Ok(statements.join("\n").into_bytes()),
        };
        match bytes {
            Ok(bytes) => match String::from_utf8(bytes) {
                Ok(text) => scripts.push(Script { name, text }),
                Err(e) => failures.push(BatchError::NotText {
                    name,
                    offset: e.utf8_error().valid_up_to(),
                }),
            },
            Err(source) => failures.push(BatchError::ReadScript { name, source }),
        }
    }
    (scripts, failures)
}

/// What a batch run reads and how it answers: the database (`None`: the default one), the
/// recipe files, the scripts in order, the format of the answers and where pictures go.
#[derive(Debug, Clone, Copy)]
pub struct Batch<'a> {
    pub db: Option<&'a Path>,
    pub recipes: &'a [PathBuf],
    pub sources: &'a [ScriptSource],
    pub format: Format,
    pub pictures: &'a Pictures,
}

/// A whole batch run: reads the recipe files and the scripts, opens the database, binds the
/// recipes, runs every statement. Answers go to `out` in the batch's format; problems go to
/// `err`, one per line (a fault of a recipe file as `FILE:line:column: message`, exit 2).
pub fn run(
    batch: &Batch,
    stdin: &mut impl Read,
    out: &mut impl Write,
    err: &mut impl Write,
) -> Outcome {
    run_showing(batch, (stdin, out, err), Showing::PIPE)
}

/// How a run shows its answers: the tables' layout, and whether a statement's error is
/// shown in place only (on a terminal, where the table shows it with its position).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Showing {
    pub layout: Layout,
    pub errors_in_place: bool,
}

impl Showing {
    /// To a pipe or a file: the full text, and every error also on the error stream.
    pub const PIPE: Showing = Showing {
        layout: Layout::FULL,
        errors_in_place: false,
    };
}

/// [`run`], showing answers as `showing` says; with `errors_in_place`, a statement that
/// could not be parsed or answered is not also reported on the error stream, because the
/// answers (a table on a terminal) show it in place with its position: on a terminal an
/// error appears once.
pub fn run_showing(
    batch: &Batch,
    (stdin, out, err): (&mut impl Read, &mut impl Write, &mut impl Write),
    showing: Showing,
) -> Outcome {
    let Batch {
        db,
        recipes,
        sources,
        format,
        pictures,
    } = *batch;
    let recipe_sources: Vec<ScriptSource> =
        recipes.iter().cloned().map(ScriptSource::File).collect();
    let (recipe_files, mut failures) = read_scripts(&recipe_sources, stdin);
    let (scripts, script_failures) = read_scripts(sources, stdin);
    failures.extend(script_failures);
    if !failures.is_empty() {
        for failure in &failures {
            report(err, &failure.to_string());
        }
        return Outcome::Trouble;
    }
    let engine = match open_engine(db) {
        Ok(engine) => engine,
        Err(source) => {
            let failure = BatchError::OpenStore {
                database: database_name(db),
                source,
            };
            report(err, &failure.to_string());
            return Outcome::Trouble;
        }
    };
    let mut session = engine.session();
    let mut bad_recipes = false;
    for file in &recipe_files {
        if let Err(faults) = engine.load_recipes(&file.text, &mut session) {
            bad_recipes = true;
            for f in faults {
                report(
                    err,
                    &format!("{}:{}:{}: {}", file.name, f.line, f.column, f.message),
                );
            }
        }
    }
    if bad_recipes {
        return Outcome::Unanswered;
    }
    let printer = Printer::new(out, format).with_table(TableWriter::new(showing.layout));
    let errors = if showing.errors_in_place {
        Errors::InPlace
    } else {
        Errors::Reported
    };
    run_in_session(
        (&engine, &mut session),
        &scripts,
        pictures,
        printer,
        (err, errors),
    )
}

/// Whether a statement's error goes to the error stream too, or only where the answers show
/// it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Errors {
    Reported,
    InPlace,
}

/// A batch run over the process's standard streams.
pub fn run_std(batch: &Batch, layout: &LayoutArgs) -> Outcome {
    let stdin = io::stdin();
    let stdout = io::stdout();
    let stderr = io::stderr();
    let mut stdin = stdin.lock();
    let mut stderr = stderr.lock();
    let terminal = stdout.is_terminal();
    // On a terminal a table shows a statement's error in place, with its position: it is
    // not repeated on stderr.
    let showing = Showing {
        layout: super::screen::layout(layout.width, layout.full),
        errors_in_place: terminal && batch.format == Format::Table,
    };
    if terminal {
        // A person is reading: each answer appears as it is ready, in step with the
        // messages on the error stream (standard output is line-buffered).
        run_showing(
            batch,
            (&mut stdin, &mut stdout.lock(), &mut stderr),
            showing,
        )
    } else {
        // A program is reading: answers are many small writes, and a buffer keeps a long
        // script from costing a system call per line (64 KiB: a screening's answer is tens
        // of kilobytes). It is flushed before returning. Written through its own type, not
        // a boxed writer: serde writes a screening's rows in many small pieces.
        let mut out = io::BufWriter::with_capacity(1 << 16, stdout.lock());
        run_showing(batch, (&mut stdin, &mut out, &mut stderr), showing)
    }
}

/// Answers statements given as command-line arguments (`satline "<statements>"`), with
/// the exit codes and messages of a batch run.
pub fn run_arguments(
    db: Option<&Path>,
    recipes: &[PathBuf],
    statements: &[String],
    format: Format,
    pictures: &Pictures,
    layout: &LayoutArgs,
) -> Outcome {
    let grouped = super::arguments::group(statements);
    let batch = Batch {
        db,
        recipes,
        sources: &[ScriptSource::Arguments(grouped.statements)],
        format,
        pictures,
    };
    let outcome = run_std(&batch, layout);
    if let (Some(hint), true) = (grouped.hint, outcome == Outcome::Unanswered) {
        report(&mut io::stderr(), &format!("satline: {hint}"));
    }
    outcome
}

/// Runs scripts that are already read, in order, in one session. With `pictures.out`,
/// each answered `plot` is written to its file (see `Pictures::path_for`) and the answer
/// names the file; a run with `--out` and no plot answered ends with exit 2.
pub fn run_scripts(
    engine: &Engine,
    scripts: &[Script],
    format: Format,
    pictures: &Pictures,
    out: &mut impl Write,
    err: &mut impl Write,
) -> Outcome {
    let mut session = engine.session();
    let printer = Printer::new(out, format);
    run_in_session(
        (engine, &mut session),
        scripts,
        pictures,
        printer,
        (err, Errors::Reported),
    )
}

/// [`run_scripts`] in a session already holding names (the recipes of recipe files),
/// printing with `printer`.
fn run_in_session<W: Write>(
    (engine, session): (&Engine, &mut crate::engine::Session),
    scripts: &[Script],
    pictures: &Pictures,
    mut printer: Printer<W>,
    (err, errors): (&mut impl Write, Errors),
) -> Outcome {
    let mut outcome = Outcome::Success;
    let mut plots = 0;
    for script in scripts {
        // Each statement is parsed when its turn comes, answered, printed and dropped:
        // memory does not grow with the number of statements.
        let mut answering = engine.answer_each(&script.text, session);
        while let Some(mut answer) = answering.next() {
            if let Some(spec) = answer.plot.as_deref() {
                plots += 1;
                match pictures.write(spec, plots) {
                    Ok(written) => answer.picture = written.map(|p| p.display().to_string()),
                    Err(e) => {
                        report(err, &e.to_string());
                        outcome = outcome.worst(Outcome::Trouble);
                    }
                }
            }
            let answer = &answer;
            let position = Some(answering.line_column(answer.span.0));
            if let Some(problem) = judge(&script.name, position, answer) {
                if answer.ok || errors == Errors::Reported {
                    report(err, &problem.message);
                }
                outcome = outcome.worst(problem.outcome);
            }
            match printer.print(answer, &script.text) {
                Ok(()) => {}
                // The reader has gone (`| head`): nobody wants the rest.
                Err(e) if e.kind() == io::ErrorKind::BrokenPipe => return outcome,
                Err(e) => {
                    report(err, &BatchError::WriteOutput(e).to_string());
                    return Outcome::Trouble;
                }
            }
        }
    }
    if let (Some((path, _)), 0) = (&pictures.out, plots) {
        report(
            err,
            &format!(
                "--out {}: no plot statement was answered, so no picture was written",
                path.display()
            ),
        );
        outcome = outcome.worst(Outcome::Unanswered);
    }
    match printer.flush() {
        Ok(()) => outcome,
        Err(e) if e.kind() == io::ErrorKind::BrokenPipe => outcome,
        Err(e) => {
            report(err, &BatchError::WriteOutput(e).to_string());
            Outcome::Trouble
        }
    }
}

/// Writes one problem line. A failure to write to the error stream cannot be reported
/// anywhere, so it is ignored; the exit status still tells.
fn report(err: &mut impl Write, message: &str) {
    let _ = writeln!(err, "{message}");
}

/// Something wrong with one answer: the line for the error stream and its outcome.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    pub message: String,
    pub outcome: Outcome,
}

/// Decides whether an answer is a problem: a statement that could not be answered
/// (exit 2) or a `require` that did not hold (exit 1). `position` is the statement's line
/// and column in the script, where known.
pub fn judge(name: &str, position: Option<(usize, usize)>, answer: &Answer) -> Option<Problem> {
    if !answer.ok {
        let message = match &answer.error {
            Some(error) => format!(
                "{name}:{}:{}: {} error: {}",
                error.line, error.column, error.stage, error.message
            ),
            None => format!(
                "{}: could not answer `{}`",
                located(name, position),
                answer.statement
            ),
        };
        return Some(Problem {
            message,
            outcome: Outcome::Unanswered,
        });
    }
    if answer.holds == Some(false) {
        let mut message = format!(
            "{}: requirement did not hold: {}",
            located(name, position),
            answer.statement
        );
        if let Some(detail) = &answer.shortfall {
            message.push_str(": ");
            message.push_str(detail);
        }
        return Some(Problem {
            message,
            outcome: Outcome::RequirementFailed,
        });
    }
    None
}

fn located(name: &str, position: Option<(usize, usize)>) -> String {
    match position {
        Some((line, column)) => format!("{name}:{line}:{column}"),
        None => name.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::answer::{AnswerKind, ErrorClass, ErrorReport, Row};

    fn require_answer(statement: &str, rows: Vec<Row>) -> Answer {
        let mut answer = Answer::new(statement, AnswerKind::Require);
        answer.holds = Some(rows.iter().all(|r| r.holds == Some(true)));
        answer.rows = rows.into();
        // What the engine states for such a row.
        answer.shortfall = Some(
            "potassium chloride, limiting temperature 2 C, headroom -12.5%, short by 12.5 \
             percentage points"
                .into(),
        );
        answer
    }

    fn row(solute: &str, holds: bool, headroom: f64, t: f64) -> Row {
        Row {
            solute: Some(solute.into()),
            holds: Some(holds),
            headroom_pct: Some(headroom),
            temperature_c: Some(t),
            ..Row::default()
        }
    }

    #[test]
    fn failed_requirement_names_statement_temperature_and_shortfall() {
        let answer = require_answer(
            "require KCl stays dissolved at 40 g/100g water over cold",
            vec![row("potassium chloride", false, -12.5, 2.0)],
        );
        let problem = judge("check.sl", Some((3, 1)), &answer).unwrap();
        assert_eq!(problem.outcome, Outcome::RequirementFailed);
        assert_eq!(
            problem.message,
            "check.sl:3:1: requirement did not hold: require KCl stays dissolved at 40 g/100g \
             water over cold: potassium chloride, limiting temperature 2 C, headroom -12.5%, \
             short by 12.5 percentage points"
        );
    }

    #[test]
    fn held_requirement_and_plain_answers_are_no_problem() {
        let answer = require_answer("require x", vec![row("x", true, 20.0, 2.0)]);
        assert!(judge("a", None, &answer).is_none());
        assert!(
            judge(
                "a",
                None,
                &Answer::new("describe NaCl", AnswerKind::Describe)
            )
            .is_none()
        );
    }

    #[test]
    fn unanswered_statement_reported_with_file_line_column() {
        let error = ErrorReport {
            class: ErrorClass::Parse,
            stage: "parse",
            code: "test",
            message: "expected a temperature, found `g/L`".into(),
            line: 2,
            column: 23,
            span: (36, 39),
        };
        let answer = Answer::failed("solubility of KNO3 at 5 g/L", AnswerKind::Invalid, error);
        let problem = judge(STDIN_NAME, None, &answer).unwrap();
        assert_eq!(problem.outcome, Outcome::Unanswered);
        assert_eq!(
            problem.message,
            "<stdin>:2:23: parse error: expected a temperature, found `g/L`"
        );
    }

    #[test]
    fn sources_from_arguments() {
        assert_eq!(ScriptSource::from_arg(Path::new("-")), ScriptSource::Stdin);
        assert_eq!(ScriptSource::Stdin.name(), "<stdin>");
        let file = ScriptSource::from_arg(Path::new("checks/cold.sl"));
        assert_eq!(file.name(), "checks/cold.sl");
    }

    #[test]
    fn unreadable_and_non_text_scripts_are_named() {
        let missing = ScriptSource::File(PathBuf::from("/no/such/dir/check.sl"));
        let mut stdin: &[u8] = &[0x66, 0xff, 0x0a];
        let (scripts, failures) = read_scripts(&[missing, ScriptSource::Stdin], &mut stdin);
        assert!(scripts.is_empty());
        assert_eq!(failures.len(), 2);
        assert!(
            failures[0]
                .to_string()
                .starts_with("/no/such/dir/check.sl: ")
        );
        assert_eq!(
            failures[1].to_string(),
            "<stdin>: the script is not UTF-8 text (invalid byte at offset 1)"
        );
    }

    /// Runs `scripts` on the embedded catalog, answers to `out`; the outcome and what was
    /// written to the error stream.
    fn run_into(scripts: &[Script], format: Format, out: &mut impl Write) -> (Outcome, String) {
        let engine = open_engine(None).unwrap();
        let mut err = Vec::new();
        let outcome = run_scripts(
            &engine,
            scripts,
            format,
            &Pictures::default(),
            out,
            &mut err,
        );
        (outcome, String::from_utf8(err).unwrap())
    }

    #[test]
    fn run_reports_every_unanswered_statement_and_writes_all_answers() {
        let scripts = vec![
            Script {
                name: "a.sl".into(),
                text: "\n".into(),
            },
            Script {
                name: "b.sl".into(),
                text: "nonsense here\n# comment\nmore nonsense\n".into(),
            },
        ];
        let mut out = Vec::new();
        let (outcome, err) = run_into(&scripts, Format::Json, &mut out);
        // With any engine these two lines are not statements of the language.
        assert_eq!(outcome, Outcome::Unanswered);
        let lines: Vec<&str> = err.lines().collect();
        assert_eq!(lines.len(), 2, "{err}");
        assert!(lines[0].starts_with("b.sl:1:"), "{err}");
        assert!(lines[1].starts_with("b.sl:3:"), "{err}");
        assert_eq!(String::from_utf8(out).unwrap().lines().count(), 2);
    }

    /// A writer whose reader has gone, like a pipe into `head` that has closed.
    struct ClosedPipe;

    impl Write for ClosedPipe {
        fn write(&mut self, _: &[u8]) -> io::Result<usize> {
            Err(io::Error::from(io::ErrorKind::BrokenPipe))
        }
        fn flush(&mut self) -> io::Result<()> {
            Err(io::Error::from(io::ErrorKind::BrokenPipe))
        }
    }

    #[test]
    fn closed_pipe_ends_quietly() {
        let scripts = vec![Script {
            name: "a.sl".into(),
            text: "describe NaCl\ndescribe KCl\n".into(),
        }];
        let (outcome, err) = run_into(&scripts, Format::Table, &mut ClosedPipe);
        assert_ne!(outcome, Outcome::Trouble);
        assert!(!err.contains("cannot write"));
    }

    #[test]
    fn line_and_column_count_characters() {
        let text = "ab\ncé x";
        let index = crate::query::LineIndex::new(text);
        assert_eq!(index.line_column(text, 7), (2, 4));
        let other = "abc";
        assert_eq!(
            crate::query::LineIndex::new(other).line_column(other, 0),
            (1, 1)
        );
    }
}
