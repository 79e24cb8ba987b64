//! The crate's top-level error: one variant per stage, whose message names the stage, and
//! the exit code the command line gives each class.

/// Any error satline's library can return.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum Error {
    /// The store (SQLite, seed files, imports) failed, e.g. `--db missing.db`.
    #[error("store: {0}")]
    Store(#[from] crate::store::StoreError),

    /// A lookup in the catalog found nothing, e.g. `satline describe KNO4`.
    #[error("catalog: {0}")]
    Catalog(#[from] crate::catalog::CatalogError),
}

impl Error {
    /// The documented exit code: 2 for bad input (an unknown solute), 3 for store or I/O
    /// trouble.
    pub fn exit_code(&self) -> u8 {
        match self {
            Error::Store(_) => 3,
            Error::Catalog(_) => 2,
        }
    }
}
