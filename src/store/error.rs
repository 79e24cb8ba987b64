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

    /// An import file is wrong, e.g. a CSV row with `value` = `abc`, a point of
    /// `6000 g/100g water`, or a row with an empty `source`. Nothing was written.
    #[error("{file}, {record}: {problem}")]
    Import {
        /// The file as given on the command line.
        file: String,
        /// The record, e.g. `line 4` or `dataset "demo", point 2`.
        record: String,
        problem: String,
    },

    /// No dataset has this key, e.g. `satline review approve kno3/crc-97` (the key is
    /// `potassium-nitrate/crc-97`).
    #[error(
        "no dataset \"{key}\" (keys are <solute id>/<dataset key>; `satline review list` shows the unreviewed ones)"
    )]
    UnknownDataset { key: String },

    /// No solute has this id, name, formula or synonym, e.g. `satline history KNO4`.
    #[error("no solute \"{name}\"")]
    UnknownSolute { name: String },

    /// No source has this key, e.g. `satline source edit crc-98 --year 2017`.
    #[error("no source \"{key}\" (add it with `satline source add {key} ...`)")]
    UnknownSourceKey { key: String },

    /// The command would change nothing, e.g. approving a dataset that is already reviewed,
    /// or adding a source whose key is taken.
    #[error("{what}")]
    NoChange { what: String },

    /// Another writer held the database's write lock for longer than the busy timeout,
    /// e.g. a review while a large import is being written. Nothing was written.
    #[error(
        "{location} is locked by another writer (an import, review or edit still running) and stayed locked for {waited_s} s; nothing was written: run the command again when that one has finished"
    )]
    Locked { location: String, waited_s: u64 },

    /// The database file cannot be written, e.g. `satline retire ... --db /read-only/x.db`
    /// (file permissions or a read-only mount). Nothing was written.
    #[error(
        "{location} cannot be written (read-only file or directory, or a read-only mount); nothing was written: check its permissions, or copy it somewhere writable"
    )]
    ReadOnly { location: String },

    /// An import planned against a state that another writer has since changed, applied
    /// with [`super::Store::apply_import`]. Nothing was written: plan it again.
    #[error(
        "{location} changed after this import was planned (another writer got there first); nothing was written: plan the import again"
    )]
    Stale { location: String },

    /// An export into a directory that already holds files, e.g.
    /// `satline export --to toml --out seed-data` without `--force`.
    #[error("{path} is not empty; use --force to write into it", path = path.display())]
    NotEmptyDirectory { path: PathBuf },
}

impl StoreError {
    /// True for errors in what the user gave (a bad import file, an unknown key, a change
    /// that changes nothing): the command line exits with 2 for these, 3 for the others.
    pub fn is_bad_input(&self) -> bool {
        matches!(
            self,
            StoreError::Import { .. }
                | StoreError::UnknownDataset { .. }
                | StoreError::UnknownSolute { .. }
                | StoreError::UnknownSourceKey { .. }
                | StoreError::NoChange { .. }
                | StoreError::NotEmptyDirectory { .. }
        )
    }
}
