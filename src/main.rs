//! The satline command line: reads arguments and dispatches to the library.
//!
//! Exit codes: 0 done (every statement answered, every `require` held); 1 a `require` did
//! not hold, or `check` found a problem; 2 a statement could not be parsed or answered, an
//! unknown solute, bad arguments, or a librarian's input refused (a bad import file, an
//! unknown dataset or source, a change that changes nothing, a write without `--db`); 3 the
//! store or a file could not be read or written. A closed pipe (`satline solutes | head`)
//! ends quietly.
use std::io;
use std::path::PathBuf;
use std::process::ExitCode;

use clap::Parser;
use satline::frontend::cli::{Cli, Command, ServeArgs};
use satline::frontend::picture::Pictures;
use satline::frontend::{self, Outcome, batch, librarian};
use satline::server;

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
            header_time: std::time::Duration::from_millis(args.header_timeout_ms),
            idle_time: std::time::Duration::from_millis(args.idle_timeout_ms),
            connections: args.max_connections,
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
            let run = batch::Batch {
                db,
                recipes: &cli.recipes,
                sources: &sources,
                format: cli.format,
                pictures: &pictures,
            };
            exit(batch::run_std(&run, &cli.layout))
        }
        Some(Command::Repl) => exit(frontend::repl::run(db, &cli.layout)),
        Some(Command::Help { topic }) => exit(frontend::help_command::run(
            &topic,
            &mut io::stdout().lock(),
            &mut io::stderr(),
        )),
        Some(Command::Serve(args)) => serve(db, args),
        Some(command) => {
            let mut out = io::stdout().lock();
            match librarian::run(db, cli.format, command, &mut out) {
                Ok(()) => ExitCode::SUCCESS,
                Err(failure) => ExitCode::from(failure.report(&mut io::stderr())),
            }
        }
        None if !cli.statements.is_empty() => exit(batch::run_arguments(
            db,
            &cli.recipes,
            &cli.statements,
            cli.format,
            &pictures,
            &cli.layout,
        )),
        None => exit(frontend::run_default(db, &cli.recipes, &cli.layout)),
    }
}
