//! The satline command line: reads arguments and dispatches to the library.
//!
//! Exit codes: 0 done (every statement answered, every `require` held); 1 a `require` did
//! not hold; 2 a statement could not be parsed or answered, an unknown solute, or bad
//! arguments; 3 the store or a file could not be read. A closed pipe (`satline solutes |
//! head`) ends quietly.
use std::io::{self, Write};
use std::path::PathBuf;
use std::process::ExitCode;

use clap::builder::TypedValueParser as _;
use clap::{Parser, Subcommand};
use satline::catalog::Catalog;
use satline::frontend::picture::Pictures;
use satline::frontend::{self, Outcome, batch};
use satline::output::Format;
use satline::{Error, report, store};

/// A cited, temperature-dependent solubility reference for people who make aqueous products.
///
/// Give statements as arguments (`satline "solubility of KNO3 at 20 C"`), run scripts with
/// `satline run FILE`, or start the interactive session with `satline` alone.
#[derive(Debug, Parser)]
#[command(
    name = "satline",
    version,
    about,
    args_conflicts_with_subcommands = true
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

    /// Write the picture of each `plot` statement to FILE (`.svg` or `.png`); a second plot
    /// goes to FILE-2, a third to FILE-3, and so on.
    #[arg(long, global = true, value_name = "FILE")]
    out: Option<PathBuf>,

    /// The size of pictures written with --out, in pixels [default: 800x500].
    #[arg(long, global = true, value_name = "WIDTHxHEIGHT")]
    size: Option<String>,

    #[command(subcommand)]
    command: Option<Command>,

    /// Statements to answer, e.g. "solubility of KNO3 at 20 C" (one per argument, or
    /// several separated by `;`).
    statements: Vec<String>,
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
    },
    /// Start the interactive session (also what `satline` alone does on a terminal).
    Repl,
    /// Write a fresh database file from the embedded seed data (needs --db PATH).
    Init {
        /// Replace the file if it exists.
        #[arg(long)]
        force: bool,
    },
    /// Show a solute's record, datasets, points and the full citations of their sources.
    Describe {
        /// Slug, name, formula or synonym, e.g. KNO3.
        solute: String,
    },
    /// List the solutes.
    Solutes,
}

/// What went wrong in a librarian's command, with its exit code.
enum Failure {
    Library(Error),
    Usage(String),
    Io(io::Error),
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
    command: Command,
    out: &mut dyn Write,
) -> Result<(), Failure> {
    match command {
        Command::Init { force } => {
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
        Command::Run { .. } | Command::Repl => {}
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
    let pictures = match Pictures::from_args(cli.out.as_deref(), cli.size.as_deref()) {
        Ok(pictures) => pictures,
        Err(e) => {
            eprintln!("satline: {e}");
            return ExitCode::from(2);
        }
    };
    match cli.command {
        Some(Command::Run { files }) => {
            let sources: Vec<batch::ScriptSource> = files
                .iter()
                .map(|f| batch::ScriptSource::from_arg(f))
                .collect();
            exit(batch::run_std(db, &sources, cli.format, &pictures))
        }
        Some(Command::Repl) => exit(frontend::repl::run(db)),
        Some(command) => {
            let stdout = io::stdout();
            let mut out = stdout.lock();
            match librarian(db, command, &mut out) {
                Ok(()) => ExitCode::SUCCESS,
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
                    ExitCode::from(e.exit_code())
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
