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
use satline::frontend::{self, Outcome, batch};
use satline::output::Format;
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
    match cli.command {
        Some(Command::Run { files }) => {
            let sources: Vec<batch::ScriptSource> = files
                .iter()
                .map(|f| batch::ScriptSource::from_arg(f))
                .collect();
            exit(batch::run_std(db, &sources, cli.format))
        }
        Some(Command::Repl) => exit(frontend::repl::run(db)),
        Some(Command::Serve(args)) => serve(db, args),
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
        None if !cli.statements.is_empty() => {
            exit(batch::run_arguments(db, &cli.statements, cli.format))
        }
        None => exit(frontend::run_default(db)),
    }
}
