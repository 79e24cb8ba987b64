//! The satline command line: reads arguments and dispatches to the library.
use std::path::PathBuf;
use std::process::ExitCode;

use clap::builder::TypedValueParser as _;
use clap::{Parser, Subcommand};

/// A cited, temperature-dependent solubility reference for people who make aqueous products.
#[derive(Debug, Parser)]
#[command(name = "satline", version, about)]
struct Cli {
    /// The database to read [default: the embedded database built from the seed data].
    #[arg(long, global = true, env = "SATLINE_DB", value_name = "PATH")]
    db: Option<PathBuf>,

    #[command(subcommand)]
    command: Option<Command>,
}

#[derive(Debug, Subcommand)]
enum Command {
    // ---- batch and interactive session (frontend) ----
    /// Run scripts of statements, in order; `-` reads standard input.
    ///
    /// Exit codes: 0 every statement answered and every require held; 1 a require did not
    /// hold; 2 a statement could not be parsed or answered (or the command line was wrong);
    /// 3 the database or a file could not be read.
    Run(RunArgs),
    /// Start the interactive session (also what `satline` alone does on a terminal).
    Repl,
    // ---- end batch and interactive session ----
}

// ---- batch and interactive session (frontend) ----
#[derive(Debug, clap::Args)]
struct RunArgs {
    /// Script files, run in order; `-` for standard input.
    #[arg(required = true, value_name = "FILE")]
    files: Vec<PathBuf>,

    /// How answers are written: a table for people, JSON lines or CSV for programs.
    #[arg(
        long,
        value_name = "FORMAT",
        default_value = "table",
        value_parser = clap::builder::PossibleValuesParser::new(satline::output::Format::NAMES)
            .map(|name| satline::output::Format::from_name(&name).unwrap_or_default())
    )]
    format: satline::output::Format,
}

fn run_frontend(db: Option<PathBuf>, command: Option<Command>) -> satline::frontend::Outcome {
    use satline::frontend::{self, batch};
    let db = db.as_deref();
    match command {
        Some(Command::Run(args)) => {
            let sources: Vec<batch::ScriptSource> = args
                .files
                .iter()
                .map(|f| batch::ScriptSource::from_arg(f))
                .collect();
            batch::run_std(db, &sources, args.format)
        }
        Some(Command::Repl) => frontend::repl::run(db),
        None => frontend::run_default(db),
    }
}
// ---- end batch and interactive session ----

fn main() -> ExitCode {
    let cli = Cli::parse();
    ExitCode::from(run_frontend(cli.db, cli.command).code())
}
