//! The embedded default database: built from the seed compiled into the binary on first use,
//! kept in the user's data directory (`<data dir>/satline/default.db`), rebuilt whenever the
//! binary's seed differs, and held in memory where the data directory cannot be written.
//!
//! Two processes starting at once are safe: each builds into its own temporary file in the
//! same directory and renames it into place; a rename is atomic, both builds are identical,
//! and a reader that opened the old file keeps reading it. The default database is built in
//! rollback-journal mode and only ever opened read-only, so no `-wal` file is left beside it
//! to be confused with a replaced file.

use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU32, Ordering};

use super::{SCHEMA_VERSION, Store, StoreError, build_file, seed};
use crate::seed_files::SEED_FILES;

/// Where the default database lives, or `None` when the platform has no data directory.
pub fn default_path() -> Option<PathBuf> {
    dirs::data_dir().map(|d| d.join("satline").join("default.db"))
}

/// The fingerprint of the seed compiled into this binary.
pub fn embedded_fingerprint() -> String {
    seed::fingerprint(SEED_FILES)
}

/// Opens the default database, building or rebuilding it first when needed; falls back to an
/// in-memory database built from the embedded seed when the data directory is unusable.
pub fn open_default() -> Result<Store, StoreError> {
    match default_path() {
        Some(path) => match open_or_build(&path, SEED_FILES) {
            Ok(store) => Ok(store),
            // A bad seed is a bug in the binary, not a place problem: report it.
            Err(e @ StoreError::Seed { .. }) => Err(e),
            Err(_) => in_memory(SEED_FILES),
        },
        None => in_memory(SEED_FILES),
    }
}

/// An in-memory database loaded from `files`.
pub fn in_memory<P: AsRef<str>, C: AsRef<str>>(files: &[(P, C)]) -> Result<Store, StoreError> {
    let mut store = Store::open_in_memory()?;
    store.load_seed(files)?;
    Ok(store)
}

/// Opens the database at `path` when it was built from exactly `files` at this binary's
/// schema version; otherwise builds a new one beside it and renames it into place.
pub fn open_or_build<P: AsRef<str>, C: AsRef<str>>(
    path: &Path,
    files: &[(P, C)],
) -> Result<Store, StoreError> {
    let wanted = seed::fingerprint(files);
    if let Ok(store) = Store::open_read_only(path)
        && is_current(&store, &wanted)
    {
        return Ok(store);
    }
    let dir = path.parent().unwrap_or(Path::new("."));
    std::fs::create_dir_all(dir).map_err(|source| StoreError::Io {
        path: dir.to_path_buf(),
        source,
    })?;
    let temp = temp_path_beside(path)?;
    if let Err(e) = build_file(&temp, files) {
        let _ = std::fs::remove_file(&temp);
        return Err(e);
    }
    if let Err(source) = std::fs::rename(&temp, path) {
        let _ = std::fs::remove_file(&temp);
        return Err(StoreError::Io {
            path: path.to_path_buf(),
            source,
        });
    }
    Store::open_read_only(path)
}

fn is_current(store: &Store, wanted: &str) -> bool {
    store.schema_version().ok() == Some(SCHEMA_VERSION)
        && store.metadata("seed_fingerprint").ok().flatten().as_deref() == Some(wanted)
}

/// A name for a temporary file in the same directory as `path` (so a rename stays on one
/// file system), unique to this process and call.
pub(crate) fn temp_path_beside(path: &Path) -> Result<PathBuf, StoreError> {
    static COUNTER: AtomicU32 = AtomicU32::new(0);
    let name = path
        .file_name()
        .ok_or_else(|| StoreError::Io {
            path: path.to_path_buf(),
            source: std::io::Error::new(std::io::ErrorKind::InvalidInput, "not a file name"),
        })?
        .to_string_lossy()
        .into_owned();
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.subsec_nanos())
        .unwrap_or(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    Ok(path.with_file_name(format!(
        ".{name}.building-{}-{nanos}-{n}",
        std::process::id()
    )))
}

#[cfg(test)]
mod tests {
    use super::*;

    use crate::store::demo::SOURCES;

    #[test]
    fn builds_once_and_rebuilds_when_the_seed_changes() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("sub").join("default.db");
        let first = [("sources.toml", SOURCES)];
        let store = open_or_build(&path, &first).unwrap();
        let fp = store.metadata("seed_fingerprint").unwrap().unwrap();
        assert_eq!(fp, seed::fingerprint(&first));
        let built_at = store.metadata("built_at").unwrap();
        drop(store);

        // Same seed: the file is reused as it is.
        let again = open_or_build(&path, &first).unwrap();
        assert_eq!(again.metadata("built_at").unwrap(), built_at);
        drop(again);

        let changed = SOURCES.replace("Invented", "Invented, second edition");
        let second = [("sources.toml", changed.as_str())];
        let rebuilt = open_or_build(&path, &second).unwrap();
        assert_eq!(
            rebuilt.metadata("seed_fingerprint").unwrap().unwrap(),
            seed::fingerprint(&second)
        );
        let leftovers: Vec<_> = std::fs::read_dir(path.parent().unwrap())
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .filter(|n| n.contains("building"))
            .collect();
        assert!(leftovers.is_empty(), "{leftovers:?}");
    }

    #[test]
    fn two_builders_at_once_both_succeed() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("default.db");
        let files = [("sources.toml", SOURCES)];
        let handles: Vec<_> = (0..4)
            .map(|_| {
                let path = path.clone();
                std::thread::spawn(move || {
                    let store = open_or_build(&path, &files).unwrap();
                    store.read_all().unwrap().sources.len()
                })
            })
            .collect();
        for h in handles {
            assert_eq!(h.join().unwrap(), 1);
        }
    }
}
