//! The librarian's commands on the command line: picks the database, calls the shared
//! workflow of [`crate::librarian`] (or a store reader), prints its report as text or JSON,
//! and draws the import's progress bar on standard error.

use std::io::{self, Write};
use std::path::{Path, PathBuf};

use crate::Error;
use crate::engine::Engine;
use crate::frontend::cli::{Command, ReviewAction, SourceAction};
use crate::librarian;
use crate::output::Format;
use crate::output::report;
use crate::store::export::ExportFormat;
use crate::store::review::{Decision, Retirement};
use crate::store::{self, ImportFile, ImportOptions, Store};

/// What went wrong in a librarian's command; [`Failure::exit_code`] says the exit status.
pub enum Failure {
    Library(Error),
    Usage(String),
    Io(io::Error),
    /// `check` found problems (exit 1).
    Problems,
}

impl Failure {
    /// The process exit code (0 for a closed output pipe, which ends quietly), after writing
    /// the message, if any, to `err`.
    pub fn report(self, err: &mut dyn Write) -> u8 {
        let (message, code) = match self {
            Failure::Problems => (None, 1),
            Failure::Io(e) if e.kind() == io::ErrorKind::BrokenPipe => (None, 0),
            Failure::Io(e) => (Some(format!("output: {e}")), 3),
            Failure::Usage(message) => (Some(message), 2),
            Failure::Library(e) => {
                let code = match &e {
                    Error::Store(s) if s.is_bad_input() => 2,
                    _ => e.exit_code(),
                };
                (Some(e.to_string()), code)
            }
        };
        if let Some(message) = message {
            let _ = writeln!(err, "satline: {message}");
        }
        code
    }
}

impl From<Error> for Failure {
    fn from(e: Error) -> Self {
        Failure::Library(e)
    }
}

impl From<store::StoreError> for Failure {
    fn from(e: store::StoreError) -> Self {
        Failure::Library(Error::Store(e))
    }
}

impl From<io::Error> for Failure {
    fn from(e: io::Error) -> Self {
        Failure::Io(e)
    }
}

/// The file database a write goes to; the embedded default database is read-only.
fn writable(db: Option<&Path>, what: &str) -> Result<PathBuf, Failure> {
    db.map(Path::to_path_buf).ok_or_else(|| {
        Failure::Usage(format!(
            "{what} writes to a database file: give --db PATH or set SATLINE_DB (the embedded default database is read-only; `satline init --empty --db PATH` creates a file)"
        ))
    })
}

/// Opens the named file for reading only, or the embedded default database.
fn readable(db: Option<&Path>) -> Result<Store, Failure> {
    Ok(match db {
        Some(path) => Store::open_read_only(path)?,
        None => store::open_configured(None)?,
    })
}

/// `--tolerance PERCENT` as a fraction, or a usage fault.
fn tolerance(percent: f64) -> Result<f64, Failure> {
    librarian::tolerance_fraction(percent).map_err(Failure::Usage)
}

/// Runs one librarian's command (or `describe`/`solutes`), writing its report to `out`.
pub fn run(
    db: Option<&Path>,
    format: Format,
    command: Command,
    out: &mut dyn Write,
) -> Result<(), Failure> {
    let json = format == Format::Json;
    match command {
        Command::Init {
            force,
            empty: true,
            who,
        } => {
            let path = writable(db, "init")?;
            store::init_empty(&path, &store::audit::actor(who.actor.as_deref()), force)?;
            writeln!(
                out,
                "wrote {}: an empty reference (schema version {})",
                path.display(),
                store::SCHEMA_VERSION
            )?;
        }
        Command::Init { force, .. } => {
            let path = db.ok_or_else(|| {
                Failure::Usage("init needs a file: satline init --db PATH".to_string())
            })?;
            let summary = store::init_file(path, crate::seed_files::SEED_FILES, force)?;
            writeln!(
                out,
                "wrote {}: {} solutes, {} datasets, {} points, {} sources",
                path.display(),
                summary.solutes,
                summary.datasets,
                summary.points,
                summary.sources
            )?;
        }
        Command::Describe { solute } => {
            let engine = Engine::open(db)?;
            let description = engine.describe_solute(&solute).map_err(Error::from)?;
            report::write_description(&description, out)?;
        }
        Command::Solutes => {
            let engine = Engine::open(db)?;
            report::write_solutes(engine.catalog(), out)?;
        }
        Command::Import {
            files,
            dry_run,
            tolerance: percent,
            keep_state,
            who,
        } => {
            let path = writable(db, "import")?;
            let options = ImportOptions {
                tolerance: tolerance(percent)?,
                keep_state,
            };
            // A directory (what `export --to toml` writes) stands for its data files.
            let files = super::import_paths::expand(&files)?;
            let files = files
                .iter()
                .map(|f| ImportFile::read(f))
                .collect::<Result<Vec<_>, _>>()?;
            let actor = who.actor.as_deref();
            let mut progress = super::progress::ImportProgress::start(&files);
            let done = librarian::import(&path, &files, &options, dry_run, actor, &mut |step| {
                progress.step(step)
            });
            progress.finish();
            let done = done?;
            if json {
                writeln!(out, "{}", done.to_json())?;
            } else if dry_run {
                writeln!(out, "dry run for {}: nothing written", path.display())?;
                done.plan.write_report(out)?;
            } else {
                let by = done.actor.as_deref().unwrap_or_default();
                writeln!(out, "imported into {} by {by}:", path.display())?;
                done.plan.write_report(out)?;
                if done.wrote_datasets() && !keep_state {
                    writeln!(
                        out,
                        "imported datasets are unreviewed until approved (satline review list)"
                    )?;
                }
            }
        }
        Command::Review { action } => {
            let (dataset, note, who, decision) = match action {
                None | Some(ReviewAction::List) => {
                    let waiting = readable(db)?.unreviewed()?;
                    if json {
                        for u in &waiting {
                            writeln!(out, "{}", serde_json::to_string(u).unwrap_or_default())?;
                        }
                    } else {
                        store::review::write_unreviewed(&waiting, out)?;
                    }
                    return Ok(out.flush()?);
                }
                Some(ReviewAction::Approve { dataset, note, who }) => {
                    (dataset, note, who, Decision::Approve)
                }
                Some(ReviewAction::Reject { dataset, note, who }) => {
                    (dataset, note, who, Decision::Reject)
                }
            };
            let path = writable(db, "review")?;
            let done = librarian::review(&path, &dataset, decision, &note, who.actor.as_deref())?;
            let verb = match decision {
                Decision::Approve => "approved",
                Decision::Reject => "rejected",
            };
            writeln!(out, "{verb} {} (by {})", done.dataset, done.actor)?;
        }
        Command::History { solute } => {
            let (id, entries) = readable(db)?.history(&solute)?;
            if json {
                store::audit::write_history(&id, &entries, json, out)?;
            } else {
                let width = super::screen::layout(None, false).width;
                super::history_view::write(&id, &entries, width, out)?;
            }
        }
        Command::Retire { dataset, note, who } => {
            let path = writable(db, "retire")?;
            let (note, actor) = (note.as_deref(), who.actor.as_deref());
            let done = librarian::set_retired(&path, &dataset, Retirement::Retire, note, actor)?;
            writeln!(
                out,
                "retired {dataset} (by {}); queries no longer use it, `satline restore {dataset}` brings it back",
                done.actor
            )?;
        }
        Command::Restore { dataset, note, who } => {
            let path = writable(db, "restore")?;
            let (note, actor) = (note.as_deref(), who.actor.as_deref());
            let done = librarian::set_retired(&path, &dataset, Retirement::Restore, note, actor)?;
            writeln!(out, "restored {dataset} (by {})", done.actor)?;
        }
        Command::Export {
            to,
            out: target,
            force,
        } => {
            let format = ExportFormat::from_name(&to)
                .ok_or_else(|| Failure::Usage(format!("--to {to}: expected toml, csv or json")))?;
            let store = readable(db)?;
            let written = store::export::export(&store.read_all()?, format, &target, force)?;
            writeln!(
                out,
                "wrote {} file(s) to {}",
                written.len(),
                target.display()
            )?;
        }
        Command::Check { tolerance: percent } => {
            let report = readable(db)?.check(tolerance(percent)?)?;
            if json {
                writeln!(
                    out,
                    "{}",
                    serde_json::to_string(&report).unwrap_or_default()
                )?;
            } else {
                report.write(out)?;
            }
            if report.problems() > 0 {
                out.flush()?;
                return Err(Failure::Problems);
            }
        }
        Command::Source { action } => {
            let (key, fields, who, adding) = match *action {
                SourceAction::Add { key, fields, who } => (key, fields, who, true),
                SourceAction::Edit { key, fields, who } => (key, fields, who, false),
            };
            let path = writable(db, "source")?;
            let fields = fields.fields();
            let source =
                librarian::save_source(&path, &key, &fields, adding, who.actor.as_deref())?;
            writeln!(
                out,
                "{} source {}: {}",
                if adding { "added" } else { "changed" },
                source.key,
                crate::catalog::citation(&source)
            )?;
        }
        Command::Run { .. } | Command::Repl | Command::Serve(_) | Command::Help { .. } => {}
    }
    out.flush()?;
    Ok(())
}
