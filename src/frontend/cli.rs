//! The command line's arguments (clap definitions): the statements, `run`, `repl`, `serve`
//! and the librarian's commands, with their flags and documented defaults. `main.rs` parses
//! these and dispatches.

use std::path::PathBuf;

use clap::builder::TypedValueParser as _;
use clap::{Args, Parser, Subcommand};

use crate::model::SourceKind;
use crate::output::Format;
use crate::server;
use crate::store::export::ExportFormat;
use crate::store::sources::SourceFields;

/// A cited, temperature-dependent solubility reference for people who make aqueous products.
///
/// Give statements as arguments (`satline "solubility of KNO3 at 20 C"`), run scripts with
/// `satline run FILE`, or start the interactive session with `satline` alone.
#[derive(Debug, Parser)]
#[command(
    name = "satline",
    version,
    about,
    subcommand_precedence_over_arg = true,
    disable_help_subcommand = true,
    allow_negative_numbers = true,
    after_long_help = LANGUAGE_GUIDE,
    after_help = LANGUAGE_GUIDE
)]
pub struct Cli {
    /// The database file to use [default: the embedded database built from the seed data].
    #[arg(long, global = true, env = "SATLINE_DB", value_name = "PATH")]
    pub db: Option<PathBuf>,

    /// How answers are written: a table for people, JSON lines or CSV for programs.
    #[arg(
        long,
        global = true,
        value_name = "FORMAT",
        default_value = "table",
        value_parser = clap::builder::PossibleValuesParser::new(Format::NAMES)
            .map(|name| Format::from_name(&name).unwrap_or_default())
    )]
    pub format: Format,

    /// Recipe files read before the statements, whose recipes the statements can name
    /// (`recipe NAME` lines, then one ingredient a line: `0.9 %w/v NaCl`; see the grammar
    /// guide). May be given more than once. A fault in one stops the run (exit 2).
    #[arg(long, global = true, value_name = "FILE")]
    pub recipes: Vec<PathBuf>,

    #[command(flatten)]
    pub picture: PictureArgs,

    #[command(flatten)]
    pub layout: LayoutArgs,

    #[command(subcommand)]
    pub command: Option<Command>,

    /// Statements to answer, e.g. "solubility of KNO3 at 20 C" (one per argument, or
    /// several separated by `;`). Words without quotes are joined into one statement:
    /// `satline solubility of KNO3 at 20 C`.
    pub statements: Vec<String>,
}

/// Where `--help` points for the statements themselves.
pub const LANGUAGE_GUIDE: &str = "The statements: `satline help` lists the topics of the query language,\n\
`satline help TOPIC` shows one (`satline help require`); the whole language\n\
guide is grammar/README.md in satline's source.\n";

/// How tables are laid out for people (statements, `run` and the session).
#[derive(Debug, Clone, Default, clap::Args)]
pub struct LayoutArgs {
    /// Fit tables to COLUMNS columns [default: the terminal's width; to a pipe or a file,
    /// as wide as the rows need].
    #[arg(long, global = true, value_name = "COLUMNS")]
    pub width: Option<usize>,

    /// Keep every column, and write every note and the full citations on every answer
    /// (what a pipe or a file gets anyway).
    #[arg(long, global = true)]
    pub full: bool,
}

/// Where the pictures of `plot` statements go (for statements and `run`).
#[derive(Debug, Clone, clap::Args)]
pub struct PictureArgs {
    /// Write the picture of each `plot` statement to FILE (`.svg` or `.png`); a second plot
    /// goes to FILE-2, a third to FILE-3, and so on.
    #[arg(long, value_name = "FILE")]
    pub out: Option<PathBuf>,

    /// The size of pictures written with --out, in pixels [default: 800x500].
    #[arg(long, value_name = "WIDTHxHEIGHT")]
    pub size: Option<String>,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Run scripts of statements, in order; `-` reads standard input.
    ///
    /// Exit codes: 0 every statement answered and every require held; 1 a require did not
    /// hold; 2 a statement could not be parsed or answered (or the command line was wrong);
    /// 3 the database or a file could not be read.
    #[command(after_help = "Example: satline run checks.satq --format json")]
    Run {
        /// Script files, run in order; `-` for standard input.
        #[arg(required = true, value_name = "FILE")]
        files: Vec<PathBuf>,
        #[command(flatten)]
        picture: PictureArgs,
    },
    /// Start the interactive session (also what `satline` alone does on a terminal).
    #[command(after_help = "Example: satline repl")]
    Repl,
    /// Write a fresh database file from the embedded seed data, or an empty one with
    /// --empty (needs --db PATH).
    #[command(after_help = "Example: satline init --empty --db lib.db")]
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
    #[command(
        after_help = "Example: satline import data.csv --dry-run --db lib.db; satline import lib-export --keep-state --db lib.db"
    )]
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
    /// List what awaits review, or approve or reject a dataset (or Henry's-law record,
    /// freezing table or `SOLUTE/density` coefficients) with a note.
    #[command(
        after_help = "Example: satline review approve SOLUTE/SOURCE --note \"checked against the table\" --actor bob --db lib.db"
    )]
    Review {
        #[command(subcommand)]
        action: Option<ReviewAction>,
    },
    /// Every change to a solute, its datasets and their sources: time, actor, action,
    /// before and after.
    #[command(after_help = "Example: satline history \"potassium nitrate\" --db lib.db")]
    History {
        /// Id, name, formula or synonym, e.g. KNO3.
        solute: String,
    },
    /// Hide a dataset from queries; it is kept and shown in history (needs --db PATH).
    #[command(
        after_help = "Example: satline retire SOLUTE/SOURCE --note \"superseded\" --actor bob --db lib.db"
    )]
    Retire {
        /// Dataset key, <solute id>/<dataset key>.
        dataset: String,
        #[arg(long, value_name = "TEXT")]
        note: Option<String>,
        #[command(flatten)]
        who: Who,
    },
    /// Bring a retired dataset back (needs --db PATH).
    #[command(after_help = "Example: satline restore SOLUTE/SOURCE --actor bob --db lib.db")]
    Restore {
        dataset: String,
        #[arg(long, value_name = "TEXT")]
        note: Option<String>,
        #[command(flatten)]
        who: Who,
    },
    /// Write the whole reference as TOML (seed format, a directory), CSV or JSON.
    #[command(after_help = "Example: satline export --to toml --out lib-export --db lib.db")]
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
    #[command(after_help = "Example: satline check --db lib.db")]
    Check {
        /// Report a conflict between sources beyond this many percent.
        #[arg(long, value_name = "PERCENT", default_value_t = 5.0)]
        tolerance: f64,
    },
    /// Add or edit bibliographic records (needs --db PATH).
    #[command(
        after_help = "Example: satline source add my-table --kind other --title \"...\" --authors \"...\" --year 2026 --actor carol --db lib.db"
    )]
    Source {
        #[command(subcommand)]
        action: Box<SourceAction>,
    },
    /// Show a solute's record, datasets, points and the full citations of their sources.
    #[command(after_help = "Example: satline describe KNO3")]
    Describe {
        /// Slug, name, formula or synonym, e.g. KNO3.
        solute: String,
    },
    /// List the solutes.
    #[command(after_help = "Example: satline solutes")]
    Solutes,
    /// Help on a statement of the query language or on a command: `satline help` lists
    /// both, `satline help require` or `satline help import` shows one.
    #[command(after_help = "Example: satline help require")]
    Help {
        /// A topic of the language (`solubility`, `require`, `units` …) or a command name.
        #[arg(value_name = "TOPIC")]
        topic: Vec<String>,
    },
    /// Serve the query language and the catalog as HTTP JSON under /v1 (loopback by
    /// default; read-only unless a token file is given). Stops on Ctrl-C or SIGTERM.
    #[command(after_help = "Example: satline serve --addr 127.0.0.1:8080")]
    Serve(ServeArgs),
}

/// The flags of `satline serve`; each limit has its documented default.
#[derive(Debug, clap::Args)]
pub struct ServeArgs {
    /// Address to listen on; anything beyond loopback only when given here.
    #[arg(long, value_name = "IP:PORT", default_value_t = server::DEFAULT_ADDR)]
    pub addr: std::net::SocketAddr,
    /// File holding the bearer token that write operations need (without it: read-only).
    #[arg(long, value_name = "FILE")]
    pub token_file: Option<PathBuf>,
    /// Largest request body in bytes (413 past it).
    #[arg(long, value_name = "BYTES", default_value_t = server::DEFAULT_BODY_BYTES,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    pub max_body_bytes: usize,
    /// Most statements in one query (413 past it).
    #[arg(long, value_name = "N", default_value_t = server::DEFAULT_STATEMENTS,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    pub max_statements: usize,
    /// Time for a query to arrive and be answered, in milliseconds (408 past it).
    #[arg(long, value_name = "MS", default_value_t = server::DEFAULT_TIME.as_millis() as u64,
          value_parser = clap::value_parser!(u64).range(1..))]
    pub time_limit_ms: u64,
    /// Most requests in progress at once (503 past it).
    #[arg(long, value_name = "N", default_value_t = server::DEFAULT_CONCURRENT,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    pub max_concurrent: usize,
    /// Time for a request's head to arrive whole once the connection is ready for it (opened,
    /// or its last answer sent), in milliseconds; a silent, half-sent or idle kept-alive
    /// connection is closed past it.
    #[arg(long, value_name = "MS", default_value_t = server::DEFAULT_HEADER_TIME.as_millis() as u64,
          value_parser = clap::value_parser!(u64).range(1..))]
    pub header_timeout_ms: u64,
    /// Time a connection may pass with no byte moving either way, in milliseconds (at least
    /// the time limit and a second); closed past it.
    #[arg(long, value_name = "MS", default_value_t = server::DEFAULT_IDLE_TIME.as_millis() as u64,
          value_parser = clap::value_parser!(u64).range(1..))]
    pub idle_timeout_ms: u64,
    /// Most connections open at once; one more closes the quietest idle one.
    #[arg(long, value_name = "N", default_value_t = server::DEFAULT_CONNECTIONS,
          value_parser = clap::value_parser!(u64).range(1..).map(|n| n as usize))]
    pub max_connections: usize,
    /// Write no request log lines on the error stream.
    #[arg(long)]
    pub quiet: bool,
    /// Answer every query on the blocking pool, even a single lookup (by default a short
    /// query of light statements is answered on the async worker).
    #[arg(long)]
    pub offload_all: bool,
}

/// Who makes a change, for the audit history.
#[derive(Debug, Args)]
pub struct Who {
    /// Recorded as the actor [default: $USER, else $LOGNAME, else "unknown"].
    #[arg(long, value_name = "NAME")]
    pub actor: Option<String>,
}

#[derive(Debug, Subcommand)]
pub enum ReviewAction {
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
pub struct SourceArgs {
    /// handbook, compilation, paper, standard, book or other.
    #[arg(long, value_parser = clap::builder::PossibleValuesParser::new(SourceKind::NAMES.iter().copied()))]
    pub kind: Option<String>,
    #[arg(long)]
    pub title: Option<String>,
    #[arg(long)]
    pub authors: Option<String>,
    #[arg(long)]
    pub publisher: Option<String>,
    #[arg(long)]
    pub edition: Option<String>,
    #[arg(long)]
    pub year: Option<i32>,
    /// Table, page or section.
    #[arg(long)]
    pub locator: Option<String>,
    #[arg(long)]
    pub doi: Option<String>,
    #[arg(long)]
    pub isbn: Option<String>,
    #[arg(long)]
    pub url: Option<String>,
    #[arg(long)]
    pub note: Option<String>,
}

impl SourceArgs {
    pub fn fields(self) -> SourceFields {
        let kind = self.kind.as_deref().and_then(SourceKind::from_name);
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
pub enum SourceAction {
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
