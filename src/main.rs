//! The satline command line: reads arguments and dispatches to the library.
//!
//! Exit codes: 0 done (every statement answered, every `require` held); 1 a `require` did
//! not hold, or `check` found a problem; 2 a statement could not be parsed or answered, an
//! unknown solute, bad arguments, or a librarian's input refused (a bad import file, an
//! unknown dataset or source, a change that changes nothing, a write without `--db`); 3 the
//! store or a file could not be read or written. A closed pipe (`satline solutes | head`)
//! ends quietly.
use std::io::{self, Write};
use std::path::PathBuf;
use std::process::ExitCode;

use clap::builder::TypedValueParser as _;
use clap::{Args, Parser, Subcommand};
use satline::catalog::Catalog;
use satline::frontend::picture::Pictures;
use satline::frontend::{self, Outcome, batch};
use satline::model::SourceKind;
use satline::output::Format;
use satline::store::export::ExportFormat;
use satline::store::review::{Decision, Retirement};
use satline::store::sources::SourceFields;
use satline::store::{ImportFile, ImportOptions, Store};
use satline::{Error, report, server, store};

/// A cited, temperature-dependent solubility reference for people who make aqueous products.
///
/// Give statements as arguments (`satline "solubility of KNO3 at 20 C"`), run scripts with
/// `satline run FILE`, or start the interactive session with `satline` alone.
#[derive(Debug, Parser)]
#[command(
    name = "satline",
    version,
    about,
    subcommand_precedence_over_arg = true
)]
struct Cli {
    /// The database file to use [default: the embedded database built from the seed data].
    #[arg(long, global = true, env = "SATLINE_DB", value_name = "PATH")]
    db: Option<PathBuf>,

    /// How answers are written: a table for people, JSON lines or CSV for programs.
    #[arg(
        long,
        global = true,
        value_name = "FORMAT",
        default_value = "table",
        value_parser = clap::builder::PossibleValuesParser::new(Format::NAMES)
            .map(|name| Format::from_name(&name).unwrap_or_default())
    )]
    format: Format,

    #[command(flatten)]
    picture: PictureArgs,

    #[command(subcommand)]
    command: Option<Command>,

    /// Statements to answer, e.g. "solubility of KNO3 at 20 C" (one per argument, or
    /// several separated by `;`).
    statements: Vec<String>,
}

/// Where the pictures of `plot` statements go (for statements and `run`).
#[derive(Debug, Clone, clap::Args)]
struct PictureArgs {
    /// Write the picture of each `plot` statement to FILE (`.svg` or `.png`); a second plot
    /// goes to FILE-2, a third to FILE-3, and so on.
    #[arg(long, value_name = "FILE")]
    out: Option<PathBuf>,

    /// The size of pictures written with --out, in pixels [default: 800x500].
    #[arg(long, value_name = "WIDTHxHEIGHT")]
    size: Option<String>,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Run scripts of statements, in order; `-` reads standard input.
    ///
    /// Exit codes: 0 every statement answered and every require held; 1 a require did not
    /// hold; 2 a statement could not be parsed or answered (or the command line was wrong);
    /// 3 the database or a file could not be read.
    Run {
        /// Script files, run in order; `-` for standard input.
        #[arg(required = true, value_name = "FILE")]
        files: Vec<PathBuf>,
        #[command(flatten)]
        picture: PictureArgs,
    },
    /// Start the interactive session (also what `satline` alone does on a terminal).
    Repl,
    /// Write a fresh database file from the embedded seed data, or an empty one with
    /// --empty (needs --db PATH).
    Init {
        /// Replace the file if it exists.
        #[arg(long)]
        force: bool,
        /// The schema and no data, for a reference built from scratch.
        #[arg(long)]
        empty: bool,
        #[command(flatten)]
        who: Who,
    },
    /// Import TOML files in the seed format and CSV files of points (needs --db PATH).
    ///
    /// CSV columns: solute, formula, phase, temperature, temperature_unit, value, unit,
    /// source, and optionally uncertainty, name, kind, ions, phase_name, dataset,
    /// provenance, review, retired, note. Imported datasets are unreviewed.
    Import {
        /// Files to import: sources.toml, <solute-id>.toml, *.csv.
        #[arg(required = true, value_name = "FILE")]
        files: Vec<PathBuf>,
        /// Show what would change and write nothing.
        #[arg(long)]
        dry_run: bool,
        /// Report a conflict with another source beyond this many percent.
        #[arg(long, value_name = "PERCENT", default_value_t = 5.0)]
        tolerance: f64,
        /// Keep the review and retired states written in the files (to restore an export).
        #[arg(long)]
        keep_state: bool,
        #[command(flatten)]
        who: Who,
    },
    /// List what awaits review, or approve or reject a dataset (or Henry's-law record or
    /// freezing table) with a note.
    Review {
        #[command(subcommand)]
        action: Option<ReviewAction>,
    },
    /// Every change to a solute, its datasets and their sources: time, actor, action,
    /// before and after.
    History {
        /// Id, name, formula or synonym, e.g. KNO3.
        solute: String,
    },
    /// Hide a dataset from queries; it is kept and shown in history (needs --db PATH).
    Retire {
        /// Dataset key, <solute id>/<dataset key>.
        dataset: String,
        #[arg(long, value_name = "TEXT")]
        note: Option<String>,
        #[command(flatten)]
        who: Who,
    },
    /// Bring a retired dataset back (needs --db PATH).
    Restore {
        dataset: String,
        #[arg(long, value_name = "TEXT")]
        note: Option<String>,
        #[command(flatten)]
        who: Who,
    },
    /// Write the whole reference as TOML (seed format, a directory), CSV or JSON.
    Export {
        #[arg(long, value_name = "FORMAT", value_parser = clap::builder::PossibleValuesParser::new(ExportFormat::NAMES))]
        to: String,
        /// A directory for TOML, a file for CSV and JSON.
        #[arg(long, value_name = "PATH")]
        out: PathBuf,
        /// Write into a non-empty directory or over an existing file.
        #[arg(long)]
        force: bool,
    },
    /// An integrity report; exit 1 when a problem is found, 3 when the database cannot be read.
    Check {
        /// Report a conflict between sources beyond this many percent.
        #[arg(long, value_name = "PERCENT", default_value_t = 5.0)]
        tolerance: f64,
    },
    /// Add or edit bibliographic records (needs --db PATH).
    Source {
        #[command(subcommand)]
        action: Box<SourceAction>,
    },
    /// Show a solute's record, datasets, points and the full citations of their sources.
    Describe {
        /// Slug, name, formula or synonym, e.g. KNO3.
        solute: String,
    },
    /// List the solutes.
    Solutes,
    /// Serve the query language and the catalog as HTTP JSON under /v1 (loopback by
    /// default; read-only unless a token file is given). Stops on Ctrl-C or SIGTERM.
    Serve(ServeArgs),
}

/// The flags of `satline serve`; each limit has its documented default.
#[derive(Debug, clap::Args)]
struct ServeArgs {
    /// Address to listen on; anything beyond loopback only when given here.
    #[arg(long, value_name = "IP:PORT", default_value_t = server::DEFAULT_ADDR)]
    addr: std::net::SocketAddr,
    /// File holding the bearer token that write operations need (without it: read-only).
    #[arg(long, value_name = "FILE")]
    token_file: Option<PathBuf>,
    /// Largest request body in bytes (413 past it).
    #[arg(long, value_name = "BYTES", default_value_t = server::DEFAULT_BODY_BYTES,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    max_body_bytes: usize,
    /// Most statements in one query (413 past it).
    #[arg(long, value_name = "N", default_value_t = server::DEFAULT_STATEMENTS,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    max_statements: usize,
    /// Time for a query to arrive and be answered, in milliseconds (408 past it).
    #[arg(long, value_name = "MS", default_value_t = server::DEFAULT_TIME.as_millis() as u64,
          value_parser = clap::value_parser!(u64).range(1..))]
    time_limit_ms: u64,
    /// Most requests in progress at once (503 past it).
    #[arg(long, value_name = "N", default_value_t = server::DEFAULT_CONCURRENT,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    max_concurrent: usize,
    /// Write no request log lines on the error stream.
    #[arg(long)]
    quiet: bool,
    /// Answer every query on the blocking pool, even a single lookup (by default a short
    /// query of light statements is answered on the async worker).
    #[arg(long)]
    offload_all: bool,
}

/// `satline serve`: the configuration from the flags, then the library serves.
fn serve(db: Option<&std::path::Path>, args: ServeArgs) -> ExitCode {
    let token = match args.token_file.as_deref().map(server::Token::from_file) {
        Some(Err(e)) => {
            eprintln!("satline: {e}");
            return ExitCode::from(e.exit_code());
        }
        Some(Ok(token)) => Some(token),
        None => None,
    };
    let config = server::Config {
        addr: args.addr,
        db: db.map(PathBuf::from),
        token,
        limits: server::Limits {
            body_bytes: args.max_body_bytes,
            statements: args.max_statements,
            time: std::time::Duration::from_millis(args.time_limit_ms),
            concurrent: args.max_concurrent,
        },
        log_requests: !args.quiet,
        inline_light: !args.offload_all,
        stop_on_signals: true,
    };
    match server::serve(config) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("satline: {e}");
            ExitCode::from(e.exit_code())
        }
    }
}

/// Who makes a change, for the audit history.
#[derive(Debug, Args)]
struct Who {
    /// Recorded as the actor [default: $USER, else $LOGNAME, else "unknown"].
    #[arg(long, value_name = "NAME")]
    actor: Option<String>,
}

#[derive(Debug, Subcommand)]
enum ReviewAction {
    /// Datasets that are unreviewed and not retired (also what `review` alone shows).
    List,
    /// Mark a dataset reviewed.
    Approve {
        dataset: String,
        #[arg(long, value_name = "TEXT", required = true)]
        note: String,
        #[command(flatten)]
        who: Who,
    },
    /// Mark a dataset rejected (answers no longer use it).
    Reject {
        dataset: String,
        #[arg(long, value_name = "TEXT", required = true)]
        note: String,
        #[command(flatten)]
        who: Who,
    },
}

#[derive(Debug, Args)]
struct SourceArgs {
    /// handbook, compilation, paper, standard, book or other.
    #[arg(long, value_parser = clap::builder::PossibleValuesParser::new(["handbook", "compilation", "paper", "standard", "book", "other"]))]
    kind: Option<String>,
    #[arg(long)]
    title: Option<String>,
    #[arg(long)]
    authors: Option<String>,
    #[arg(long)]
    publisher: Option<String>,
    #[arg(long)]
    edition: Option<String>,
    #[arg(long)]
    year: Option<i32>,
    /// Table, page or section.
    #[arg(long)]
    locator: Option<String>,
    #[arg(long)]
    doi: Option<String>,
    #[arg(long)]
    isbn: Option<String>,
    #[arg(long)]
    url: Option<String>,
    #[arg(long)]
    note: Option<String>,
}

impl SourceArgs {
    fn fields(self) -> SourceFields {
        let kind = self.kind.as_deref().and_then(|k| match k {
            "handbook" => Some(SourceKind::Handbook),
            "compilation" => Some(SourceKind::Compilation),
            "paper" => Some(SourceKind::Paper),
            "standard" => Some(SourceKind::Standard),
            "book" => Some(SourceKind::Book),
            "other" => Some(SourceKind::Other),
            _ => None,
        });
        SourceFields {
            kind,
            title: self.title,
            authors: self.authors,
            publisher: self.publisher,
            edition: self.edition,
            year: self.year,
            locator: self.locator,
            doi: self.doi,
            isbn: self.isbn,
            url: self.url,
            note: self.note,
        }
    }
}

#[derive(Debug, Subcommand)]
enum SourceAction {
    /// Add a source: --kind, --title and --authors are needed.
    Add {
        /// Stable key: lower-case letters, digits and '-'.
        key: String,
        #[command(flatten)]
        fields: SourceArgs,
        #[command(flatten)]
        who: Who,
    },
    /// Change the given fields of a source (an empty text clears an optional field).
    Edit {
        key: String,
        #[command(flatten)]
        fields: SourceArgs,
        #[command(flatten)]
        who: Who,
    },
}

/// What went wrong in a librarian's command, with its exit code.
enum Failure {
    Library(Error),
    Usage(String),
    Io(io::Error),
    /// `check` found problems (exit 1).
    Problems,
}

/// The file database a write goes to; the embedded default database is read-only.
fn writable(db: Option<&std::path::Path>, what: &str) -> Result<PathBuf, Failure> {
    db.map(std::path::Path::to_path_buf).ok_or_else(|| {
        Failure::Usage(format!(
            "{what} writes to a database file: give --db PATH or set SATLINE_DB (the embedded default database is read-only; `satline init --empty --db PATH` creates a file)"
        ))
    })
}

/// Opens the named file for reading only, or the embedded default database.
fn readable(db: Option<&std::path::Path>) -> Result<Store, Failure> {
    Ok(match db {
        Some(path) => Store::open_read_only(path)?,
        None => store::open_configured(None)?,
    })
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

fn librarian(
    db: Option<&std::path::Path>,
    format: Format,
    command: Command,
    out: &mut dyn Write,
) -> Result<(), Failure> {
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
            let summary = store::init_file(path, satline::seed_files::SEED_FILES, force)?;
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
            let catalog = Catalog::open(db)?;
            let description = catalog.describe(&solute).map_err(Error::from)?;
            report::write_description(&description, out)?;
        }
        Command::Solutes => {
            let catalog = Catalog::open(db)?;
            report::write_solutes(&catalog, out)?;
        }
        Command::Import {
            files,
            dry_run,
            tolerance,
            keep_state,
            who,
        } => {
            let path = writable(db, "import")?;
            if !(tolerance >= 0.0 && tolerance.is_finite()) {
                return Err(Failure::Usage(format!(
                    "--tolerance {tolerance}: expected a percentage of 0 or more"
                )));
            }
            let files = files
                .iter()
                .map(|f| ImportFile::read(f))
                .collect::<Result<Vec<_>, _>>()?;
            let options = ImportOptions {
                tolerance: tolerance / 100.0,
                keep_state,
            };
            if dry_run {
                // Read-only: the database file stays byte-identical.
                let store = Store::open_read_only(&path)?;
                let plan = store.plan_import(&files, &options)?;
                if format == Format::Json {
                    let mut json = plan.to_json();
                    json["dry_run"] = true.into();
                    writeln!(out, "{json}")?;
                } else {
                    writeln!(out, "dry run for {}: nothing written", path.display())?;
                    plan.write_report(out)?;
                }
            } else {
                let mut store = Store::open(&path)?;
                let plan = store.plan_import(&files, &options)?;
                let actor = store::audit::actor(who.actor.as_deref());
                let bar = store::import::progress_bar(plan.points_to_write());
                let summary = store.apply_import(&plan, &actor, &mut || {
                    if let Some(b) = &bar {
                        b.inc(1);
                    }
                })?;
                if let Some(b) = bar {
                    b.finish_and_clear();
                }
                if format == Format::Json {
                    let mut json = plan.to_json();
                    json["dry_run"] = false.into();
                    json["actor"] = actor.clone().into();
                    writeln!(out, "{json}")?;
                    return Ok(());
                }
                writeln!(out, "imported into {} by {actor}:", path.display())?;
                plan.write_report(out)?;
                if summary.added + summary.changed > 0 && !keep_state {
                    writeln!(
                        out,
                        "imported datasets are unreviewed until approved (satline review list)"
                    )?;
                }
            }
        }
        Command::Review { action } => match action {
            None | Some(ReviewAction::List) => {
                let store = readable(db)?;
                let waiting = store.unreviewed()?;
                if format == Format::Json {
                    for u in &waiting {
                        writeln!(out, "{}", serde_json::to_string(u).unwrap_or_default())?;
                    }
                } else {
                    store::review::write_unreviewed(&waiting, out)?;
                }
            }
            Some(ReviewAction::Approve { dataset, note, who }) => {
                let path = writable(db, "review")?;
                let actor = store::audit::actor(who.actor.as_deref());
                Store::open(&path)?.review(&dataset, Decision::Approve, &note, &actor)?;
                writeln!(out, "approved {dataset} (by {actor})")?;
            }
            Some(ReviewAction::Reject { dataset, note, who }) => {
                let path = writable(db, "review")?;
                let actor = store::audit::actor(who.actor.as_deref());
                Store::open(&path)?.review(&dataset, Decision::Reject, &note, &actor)?;
                writeln!(out, "rejected {dataset} (by {actor})")?;
            }
        },
        Command::History { solute } => {
            let store = readable(db)?;
            let (id, entries) = store.history(&solute)?;
            store::audit::write_history(&id, &entries, format == Format::Json, out)?;
        }
        Command::Retire { dataset, note, who } => {
            let path = writable(db, "retire")?;
            let actor = store::audit::actor(who.actor.as_deref());
            Store::open(&path)?.set_retired(
                &dataset,
                Retirement::Retire,
                note.as_deref(),
                &actor,
            )?;
            writeln!(
                out,
                "retired {dataset} (by {actor}); queries no longer use it, `satline restore {dataset}` brings it back"
            )?;
        }
        Command::Restore { dataset, note, who } => {
            let path = writable(db, "restore")?;
            let actor = store::audit::actor(who.actor.as_deref());
            Store::open(&path)?.set_retired(
                &dataset,
                Retirement::Restore,
                note.as_deref(),
                &actor,
            )?;
            writeln!(out, "restored {dataset} (by {actor})")?;
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
        Command::Check { tolerance } => {
            if !(tolerance >= 0.0 && tolerance.is_finite()) {
                return Err(Failure::Usage(format!(
                    "--tolerance {tolerance}: expected a percentage of 0 or more"
                )));
            }
            let store = readable(db)?;
            let report = store.check(tolerance / 100.0)?;
            if format == Format::Json {
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
            let actor = store::audit::actor(who.actor.as_deref());
            let mut store = Store::open(&path)?;
            let fields = fields.fields();
            let source = if adding {
                store.add_source(&key, &fields, &actor)?
            } else {
                store.edit_source(&key, &fields, &actor)?
            };
            writeln!(
                out,
                "{} source {}: {}",
                if adding { "added" } else { "changed" },
                source.key,
                satline::catalog::citation(&source)
            )?;
        }
        Command::Run { .. } | Command::Repl | Command::Serve(_) => {}
    }
    out.flush()?;
    Ok(())
}

fn exit(outcome: Outcome) -> ExitCode {
    ExitCode::from(outcome.code())
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let db = cli.db.as_deref();
    let picture = match &cli.command {
        Some(Command::Run { picture, .. }) => picture.clone(),
        _ => cli.picture.clone(),
    };
    let pictures = match Pictures::from_args(picture.out.as_deref(), picture.size.as_deref()) {
        Ok(pictures) => pictures,
        Err(e) => {
            eprintln!("satline: {e}");
            return ExitCode::from(2);
        }
    };
    match cli.command {
        Some(Command::Run { files, .. }) => {
            let sources: Vec<batch::ScriptSource> = files
                .iter()
                .map(|f| batch::ScriptSource::from_arg(f))
                .collect();
            exit(batch::run_std(db, &sources, cli.format, &pictures))
        }
        Some(Command::Repl) => exit(frontend::repl::run(db)),
        Some(Command::Serve(args)) => serve(db, args),
        Some(command) => {
            let stdout = io::stdout();
            let mut out = stdout.lock();
            match librarian(db, cli.format, command, &mut out) {
                Ok(()) => ExitCode::SUCCESS,
                Err(Failure::Problems) => ExitCode::from(1),
                Err(Failure::Io(e)) if e.kind() == io::ErrorKind::BrokenPipe => ExitCode::SUCCESS,
                Err(Failure::Io(e)) => {
                    eprintln!("satline: output: {e}");
                    ExitCode::from(3)
                }
                Err(Failure::Usage(message)) => {
                    eprintln!("satline: {message}");
                    ExitCode::from(2)
                }
                Err(Failure::Library(e)) => {
                    eprintln!("satline: {e}");
                    match &e {
                        Error::Store(s) if s.is_bad_input() => ExitCode::from(2),
                        _ => ExitCode::from(e.exit_code()),
                    }
                }
            }
        }
        None if !cli.statements.is_empty() => exit(batch::run_arguments(
            db,
            &cli.statements,
            cli.format,
            &pictures,
        )),
        None => exit(frontend::run_default(db)),
    }
}
