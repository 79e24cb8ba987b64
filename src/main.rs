//! The satline command line: reads arguments and dispatches to the library.
//!
//! Exit codes: 0 done, 2 bad input (an unknown solute, bad arguments), 3 store or I/O
//! trouble. A closed pipe (`satline solutes | head`) ends quietly with 0.
use std::io::{self, Write};
use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Parser, Subcommand};
use satline::catalog::Catalog;
use satline::{Error, report, store};

/// A cited, temperature-dependent solubility reference for people who make aqueous products.
#[derive(Debug, Parser)]
#[command(
    name = "satline",
    version,
    about,
    args_conflicts_with_subcommands = true
)]
struct Cli {
    /// The database file to use; without it, the embedded default database.
    #[arg(long, global = true, env = "SATLINE_DB", value_name = "PATH")]
    db: Option<PathBuf>,

    #[command(subcommand)]
    command: Option<Command>,

    /// Statements to answer, e.g. "solubility of KNO3 at 20 C".
    statements: Vec<String>,
}

#[derive(Debug, Subcommand)]
enum Command {
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

/// What went wrong at the command line's edge, with its exit code.
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

fn run(cli: Cli, out: &mut dyn Write) -> Result<(), Failure> {
    let db = cli.db.as_deref();
    match cli.command {
        Some(Command::Init { force }) => {
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
        Some(Command::Describe { solute }) => {
            let catalog = Catalog::open(db)?;
            let description = catalog.describe(&solute).map_err(Error::from)?;
            report::write_description(&description, out)?;
        }
        Some(Command::Solutes) => {
            let catalog = Catalog::open(db)?;
            report::write_solutes(&catalog, out)?;
        }
        None if !cli.statements.is_empty() => {
            let engine = satline::engine::Engine::open(db)?;
            let text = cli.statements.join("\n");
            let mut session = engine.session();
            let mut printer = satline::output::Printer::new(out, satline::output::Format::Table);
            for answer in engine.run_text(&text, &mut session) {
                printer.print(&answer, &text)?;
            }
            printer.flush()?;
            return Ok(());
        }
        None => {
            return Err(Failure::Usage(
                "nothing to do; try `satline --help`".to_string(),
            ));
        }
    }
    out.flush()?;
    Ok(())
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let stdout = io::stdout();
    let mut out = stdout.lock();
    match run(cli, &mut out) {
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
