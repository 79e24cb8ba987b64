//! The crate's top-level error: one variant per stage, whose message names the stage, and
//! the exit code the command line gives each class.

/// Any error satline's library can return.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum Error {
    /// The store (SQLite, seed files, imports) failed, e.g. `--db missing.db`.
    #[error("store: {0}")]
    Store(#[from] crate::store::StoreError),
    /// A statement could not be parsed: `solubilty of KNO3 at 20 C`.
    #[error("parse: {0}")]
    Parse(#[from] crate::query::ParseError),
    /// A lookup in the catalog found nothing, e.g. `satline describe KNO4`.
    #[error("catalog: {0}")]
    Catalog(#[from] crate::catalog::CatalogError),
}

impl Error {
    /// The documented exit code: 2 for bad input (an unknown solute, a statement that does
    /// not parse), 3 for store or I/O trouble.
    pub fn exit_code(&self) -> u8 {
        match self {
            Error::Store(_) => 3,
            Error::Parse(_) | Error::Catalog(_) => 2,
        }
    }
}
