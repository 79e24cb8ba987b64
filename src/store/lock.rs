//! Write transactions. Every write begins IMMEDIATE: it takes the database's write lock
//! before it reads anything, so two writers are serialised by SQLite (the second waits up
//! to the busy timeout) and none can read a state that another changes before it writes
//! (a DEFERRED transaction that reads and then writes fails at once with "database is
//! locked" when another writer got there first, and one that planned outside its
//! transaction could overwrite what it never saw). A writer that still cannot get the lock,
//! or a file that cannot be written, is told with the file's name and what to do.

use rusqlite::{Connection, ErrorCode, Transaction, TransactionBehavior};

use super::StoreError;

/// Begins an IMMEDIATE transaction on `conn` (the database at `location`), waiting up to
/// the busy timeout for another writer to finish.
pub(crate) fn begin_write<'c>(
    conn: &'c Connection,
    location: &str,
) -> Result<Transaction<'c>, StoreError> {
    Transaction::new_unchecked(conn, TransactionBehavior::Immediate)
        .map_err(|e| name_file(e.into(), location))
}

/// Commits `tx`, naming the file when the commit cannot get its lock.
pub(crate) fn commit(tx: Transaction<'_>, location: &str) -> Result<(), StoreError> {
    tx.commit().map_err(|e| name_file(e.into(), location))
}

/// A lock or read-only error said with the file's name and a hint; any other error as it is.
pub(crate) fn name_file(error: StoreError, location: &str) -> StoreError {
    let code = match &error {
        StoreError::Sqlite(e) => e.sqlite_error_code(),
        _ => None,
    };
    match code {
        Some(ErrorCode::DatabaseBusy | ErrorCode::DatabaseLocked) => StoreError::Locked {
            location: location.to_string(),
            waited_s: super::BUSY_TIMEOUT.as_secs(),
        },
        Some(ErrorCode::ReadOnly) => StoreError::ReadOnly {
            location: location.to_string(),
        },
        _ => error,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::time::Duration;

    #[test]
    fn a_second_writer_that_cannot_get_the_lock_is_told_the_file() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("w.db");
        let first = Connection::open(&path).unwrap();
        first
            .execute_batch("PRAGMA journal_mode = WAL; CREATE TABLE t (x)")
            .unwrap();
        let second = Connection::open(&path).unwrap();
        second.busy_timeout(Duration::from_millis(50)).unwrap();
        let held = begin_write(&first, "w.db").unwrap();
        let error = begin_write(&second, "w.db").map(|_| ()).unwrap_err();
        assert!(matches!(error, StoreError::Locked { .. }), "{error}");
        assert!(error.to_string().contains("w.db"), "{error}");
        commit(held, "w.db").unwrap();
        assert!(begin_write(&second, "w.db").is_ok());
    }
}
