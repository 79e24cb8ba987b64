//! The store's error type: what went wrong opening, migrating, loading or reading a database,
//! with the file, record and reason where there is one.

use std::path::PathBuf;

use super::seed::SeedProblem;

/// What went wrong in the store.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum StoreError {
    /// SQLite reported an error, e.g. `satline describe NaCl --db notes.txt` where
    /// `notes.txt` is not a database ("file is not a database").
    #[error("database: {0}")]
    Sqlite(#[from] rusqlite::Error),

    /// Reading or writing a file failed, e.g. `satline init --db /proc/satline.db`.
    #[error("{path}: {source}")]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },

    /// The named database file does not exist, e.g. `satline solutes --db missing.db`.
    #[error("no database at {path} (create one with `satline init --db {path}`)", path = path.display())]
    NotFound { path: PathBuf },

    /// The file to create exists already, e.g. `satline init --db old.db` without `--force`.
    #[error("{path} already exists; use --force to replace it", path = path.display())]
    AlreadyExists { path: PathBuf },

    /// The database was written by a newer satline, e.g. a file whose
    /// `PRAGMA user_version` is 99 when this binary knows schema version 2.
    #[error(
        "{location} has schema version {found}, but this satline supports schema versions up to {supported}; use a newer satline"
    )]
    SchemaTooNew {
        location: String,
        found: u32,
        supported: u32,
    },

    /// Seed data may only be loaded into an empty database, e.g. loading the seed twice into
    /// the same store.
    #[error("{location} already holds reference data; seed data loads only into an empty database")]
    NotEmpty { location: String },

    /// A seed file is wrong, e.g. a dataset with `source = "crc-98"` when `sources.toml` has
    /// no such key. Nothing was written.
    #[error("seed file {file}, {record}: {problem}")]
    Seed {
        /// Path relative to `seed-data/`, e.g. `solutes/potassium-nitrate.toml`.
        file: String,
        /// The record, e.g. `dataset "crc-97", point 3` or `line 12`.
        record: String,
        problem: SeedProblem,
    },

    /// A stored value cannot be read back, e.g. a `datasets.review` of `maybe` written by
    /// another program.
    #[error("{location} holds an unreadable value: {what}")]
    Corrupt { location: String, what: String },
}
