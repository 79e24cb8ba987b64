//! The crate's top-level error: one variant per stage, whose message names the stage.

/// Any error satline's library can return.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum Error {
    /// The store (SQLite, seed files, imports) failed.
    #[error("store: {0}")]
    Store(#[from] crate::store::StoreError),
    /// A statement could not be parsed: `solubilty of KNO3 at 20 C`.
    #[error("parse: {0}")]
    Parse(#[from] crate::query::ParseError),
}
