//! Invented demo records for the unit tests, in the seed format: not reference values. One
//! source (`demo`) that every demo record cites, and a store loaded with it.

use super::Store;

/// The invented source `demo`.
pub(crate) const SOURCES: &str = "[[source]]\nkey = \"demo\"\nkind = \"other\"\ntitle = \"Invented demo data\"\nauthors = \"Nobody, N.\"\nyear = 2026\n";

/// An in-memory store loaded with [`SOURCES`] and `files` (seed paths and texts).
pub(crate) fn store(files: &[(&str, &str)]) -> Store {
    let mut all = vec![("sources.toml", SOURCES)];
    all.extend_from_slice(files);
    // ok: this module is compiled for unit tests only (`#[cfg(test)]` in store/mod.rs); no
    // user input, file or network reaches it, and a failure is a broken test fixture.
    let mut store = Store::open_in_memory().expect("an in-memory store opens");
    store.load_seed(&all).expect("the demo seed loads"); // ok: test-only, as above
    store
}
