//! The SQLite store: migrations, seed loading, imports and audit. The only module that
//! writes SQL; all SQL is parameterised.

/// What went wrong in the store.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum StoreError {
    /// SQLite reported an error.
    #[error("database: {0}")]
    Sqlite(#[from] rusqlite::Error),
}
