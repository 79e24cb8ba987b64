//! The SQLite store: migrations, seed loading, imports and audit. The only module that
//! writes SQL; all SQL is parameterised.
//!
//! A [`Store`] is one open database whose schema is at [`SCHEMA_VERSION`]. Writes go
//! through transactions that roll back on drop, so a failed load leaves nothing behind.

pub mod audit;
pub mod check;
pub mod corroboration;
pub mod default_db;
#[cfg(test)]
pub(crate) mod demo;
pub mod density;
mod error;
pub mod export;
pub mod findings;
pub mod import;
mod lock;
pub mod models;
mod read;
pub mod review;
pub mod schema;
pub mod seed;
pub mod sources;
mod thermo_import;
mod thermo_rows;
pub mod thermo_seed;
mod write;

use std::path::Path;
use std::time::Duration;

use rusqlite::{Connection, OpenFlags, OptionalExtension, params};

pub use error::StoreError;
pub(crate) use lock::name_file;
pub use read::{Contents, FreezingRecord};
pub use schema::{MIGRATIONS, Migration, SCHEMA_VERSION};
pub use seed::{SeedProblem, SeedSummary};

pub use audit::AuditEntry;
pub use check::CheckReport;
pub use import::{ImportFile, ImportOptions, ImportPlan, ImportSummary};

/// How long a connection waits for another process's lock before giving up.
pub(crate) const BUSY_TIMEOUT: Duration = Duration::from_secs(5);

/// Opens the database file at `path`, which must exist, with `mode` (read-write or
/// read-only).
fn open_existing(path: &Path, mode: OpenFlags) -> Result<Connection, StoreError> {
    if !path.is_file() {
        return Err(StoreError::NotFound {
            path: path.to_path_buf(),
        });
    }
    Ok(Connection::open_with_flags(
        path,
        mode | OpenFlags::SQLITE_OPEN_NO_MUTEX,
    )?)
}

/// One open satline database.
#[derive(Debug)]
pub struct Store {
    conn: Connection,
    /// Where the database lives, for messages: a path or `in-memory`.
    location: String,
}

impl Store {
    /// Opens an existing database file and migrates it to [`SCHEMA_VERSION`].
    ///
    /// The file must exist (`satline init --db PATH` creates one); a database written by a
    /// newer satline is refused with [`StoreError::SchemaTooNew`].
    pub fn open(path: &Path) -> Result<Store, StoreError> {
        let conn = open_existing(path, OpenFlags::SQLITE_OPEN_READ_WRITE)?;
        let mut store = Store::configure(conn, path.display().to_string(), true)?;
        store.migrate()?;
        Ok(store)
    }

    /// Opens an existing database file for reading only, without migrating it.
    ///
    /// Used for the embedded default database, which is replaced (never edited) when it is
    /// stale; its schema version is checked by the caller.
    pub fn open_read_only(path: &Path) -> Result<Store, StoreError> {
        let conn = open_existing(path, OpenFlags::SQLITE_OPEN_READ_ONLY)?;
        let store = Store::configure(conn, path.display().to_string(), false)?;
        store.refuse_newer()?;
        Ok(store)
    }

    /// Creates a new database file (which must not exist yet) at [`SCHEMA_VERSION`].
    ///
    /// The file is created in rollback-journal mode; [`Store::open`] switches it to WAL when
    /// it is later opened for use. Callers that publish a file by renaming it (the default
    /// database, `init`) rely on there being no `-wal` file beside it.
    pub fn create(path: &Path) -> Result<Store, StoreError> {
        if path.exists() {
            return Err(StoreError::AlreadyExists {
                path: path.to_path_buf(),
            });
        }
        let conn = Connection::open_with_flags(
            path,
            OpenFlags::SQLITE_OPEN_READ_WRITE
                | OpenFlags::SQLITE_OPEN_CREATE
                | OpenFlags::SQLITE_OPEN_NO_MUTEX,
        )?;
        let mut store = Store::configure(conn, path.display().to_string(), false)?;
        store.migrate()?;
        Ok(store)
    }

    /// Opens a fresh in-memory database at [`SCHEMA_VERSION`].
    pub fn open_in_memory() -> Result<Store, StoreError> {
        let mut store = Store::open_in_memory_empty()?;
        store.migrate()?;
        Ok(store)
    }

    /// Opens an in-memory database with no schema at all (version 0), for migration tests
    /// and callers that want to migrate step by step with [`Store::migrate_to`].
    pub fn open_in_memory_empty() -> Result<Store, StoreError> {
        let conn = Connection::open_in_memory()?;
        Store::configure(conn, "in-memory database".to_string(), false)
    }

    fn configure(conn: Connection, location: String, wal: bool) -> Result<Store, StoreError> {
        conn.busy_timeout(BUSY_TIMEOUT)?;
        conn.pragma_update(None, "foreign_keys", true)?;
        if wal {
            // WAL lets readers go on while a librarian writes. Only for file databases
            // opened read-write; `journal_mode` answers with a row, so query it.
            let _mode: String = conn.query_row("PRAGMA journal_mode = WAL", [], |r| r.get(0))?;
        }
        Ok(Store { conn, location })
    }

    /// Where this database lives: its path, or `in-memory database`.
    pub fn location(&self) -> &str {
        &self.location
    }

    /// The schema version recorded in the database (0 for an empty one).
    pub fn schema_version(&self) -> Result<u32, StoreError> {
        schema::version(&self.conn)
    }

    fn refuse_newer(&self) -> Result<(), StoreError> {
        let found = self.schema_version()?;
        if found > SCHEMA_VERSION {
            return Err(StoreError::SchemaTooNew {
                location: self.location.clone(),
                found,
                supported: SCHEMA_VERSION,
            });
        }
        Ok(())
    }

    /// Applies every migration the database lacks, in order, each in its own transaction.
    /// Returns the version reached.
    pub fn migrate(&mut self) -> Result<u32, StoreError> {
        self.migrate_to(SCHEMA_VERSION)
    }

    /// Applies migrations up to `target` (at most [`SCHEMA_VERSION`]). Never goes back.
    pub fn migrate_to(&mut self, target: u32) -> Result<u32, StoreError> {
        self.refuse_newer()?;
        schema::migrate(&mut self.conn, target.min(SCHEMA_VERSION))
    }

    /// A value from the metadata table, e.g. `seed_fingerprint`.
    pub fn metadata(&self, key: &str) -> Result<Option<String>, StoreError> {
        let value = self
            .conn
            .query_row(
                "SELECT value FROM metadata WHERE key = ?1",
                params![key],
                |r| r.get(0),
            )
            .optional()?;
        Ok(value)
    }

    /// True when the database holds no solutes and no sources.
    pub fn is_empty(&self) -> Result<bool, StoreError> {
        let count: i64 = self.conn.query_row(
            "SELECT (SELECT COUNT(*) FROM sources) + (SELECT COUNT(*) FROM solutes)",
            [],
            |r| r.get(0),
        )?;
        Ok(count == 0)
    }

    /// Validates the seed files and writes them in one transaction; see [`seed`].
    ///
    /// `files` are (path relative to `seed-data/`, contents) pairs, such as
    /// [`crate::seed_files::SEED_FILES`]. Nothing is written when any record is bad.
    pub fn load_seed<P: AsRef<str>, C: AsRef<str>>(
        &mut self,
        files: &[(P, C)],
    ) -> Result<SeedSummary, StoreError> {
        let contents = seed::parse_seed(files)?;
        let fingerprint = seed::fingerprint(files);
        if !self.is_empty()? {
            return Err(StoreError::NotEmpty {
                location: self.location.clone(),
            });
        }
        seed::write(&mut self.conn, &contents, &fingerprint, files.len())
    }

    /// Reads every record back into the model types, in one read transaction.
    pub fn read_all(&self) -> Result<Contents, StoreError> {
        read::read_all(&self.conn)
    }

    /// Number of rows in the audit table (for tests and `history`).
    pub fn audit_len(&self) -> Result<u64, StoreError> {
        let n: i64 = self
            .conn
            .query_row("SELECT COUNT(*) FROM audit", [], |r| r.get(0))?;
        Ok(u64::try_from(n).unwrap_or(0))
    }

    /// Every audit row, oldest first.
    pub fn audit(&self) -> Result<Vec<AuditEntry>, StoreError> {
        audit::all_entries(&self.conn)
    }

    /// The solute's id for an id, name, formula or synonym (case does not matter for names).
    pub fn solute_id(&self, name: &str) -> Result<String, StoreError> {
        let found: Option<String> = self
            .conn
            .query_row(
                "SELECT id FROM solutes WHERE id = ?1 OR lower(name) = lower(?1) OR formula = ?1
                 UNION ALL
                 SELECT solute FROM solute_synonyms WHERE lower(synonym) = lower(?1)
                 LIMIT 1",
                params![name.trim()],
                |r| r.get(0),
            )
            .optional()?;
        found.ok_or_else(|| StoreError::UnknownSolute {
            name: name.to_string(),
        })
    }

    /// Every change to a solute and its records (datasets, Henry's-law records, freezing
    /// data), oldest first. `name` may be the id, name, formula or a synonym.
    pub fn history(&self, name: &str) -> Result<(String, Vec<AuditEntry>), StoreError> {
        let id = self.solute_id(name)?;
        let entries = audit::history(&self.conn, &id)?;
        Ok((id, entries))
    }

    /// Plans an import of `files` against this database; writes nothing (`--dry-run`).
    pub fn plan_import(
        &self,
        files: &[ImportFile],
        options: &ImportOptions,
    ) -> Result<ImportPlan, StoreError> {
        import::plan(self, files, options)
    }

    /// Writes a planned import in one transaction; see [`import::apply`].
    pub fn apply_import(
        &mut self,
        plan: &ImportPlan,
        actor: &str,
        tick: &mut dyn FnMut(),
    ) -> Result<ImportSummary, StoreError> {
        import::apply(self, plan, actor, tick)
    }
}

/// Creates an empty database file at `path`: the schema and no data, with one audit row
/// (`create-empty`) naming the actor. Published like [`init_file`]: built beside `path` and
/// moved into place, an existing file refused unless `force`.
pub fn init_empty(path: &Path, actor: &str, force: bool) -> Result<(), StoreError> {
    if path.exists() && !force {
        return Err(StoreError::AlreadyExists {
            path: path.to_path_buf(),
        });
    }
    let temp = default_db::temp_path_beside(path)?;
    let built = (|| {
        let mut store = Store::create(&temp)?;
        let tx = store.conn.transaction()?;
        audit::record(
            &tx,
            actor,
            "create-empty",
            "database",
            None,
            Some(&serde_json::json!({ "schema_version": SCHEMA_VERSION })),
        )?;
        tx.commit()?;
        store.conn.close().map_err(|(_, e)| StoreError::Sqlite(e))
    })();
    if let Err(e) = built {
        let _ = std::fs::remove_file(&temp);
        return Err(e);
    }
    if force {
        // The old file's write-ahead log and index belong to the database being replaced;
        // left beside the new file, SQLite could read them as the new file's.
        for suffix in ["-wal", "-shm"] {
            let mut side = path.as_os_str().to_owned();
            side.push(suffix);
            let _ = std::fs::remove_file(Path::new(&side));
        }
    }
    publish(&temp, path, force)
}

/// How the database is named in messages.
pub fn database_name(db: Option<&Path>) -> String {
    match db {
        Some(path) => path.display().to_string(),
        None => "the embedded database".to_string(),
    }
}

/// Opens the database the command line asked for: the file named by `--db` / `SATLINE_DB`
/// (never rebuilt), or else the embedded default database (see [`default_db`]).
pub fn open_configured(db: Option<&Path>) -> Result<Store, StoreError> {
    match db {
        Some(path) => Store::open(path),
        None => default_db::open_default(),
    }
}

/// Writes a fresh database file at `path` from the seed `files`.
///
/// The database is built in a temporary file beside `path` and then moved into place, so a
/// reader never sees half a database. An existing `path` is refused unless `force`, in
/// which case it is replaced in one rename.
pub fn init_file<P: AsRef<str>, C: AsRef<str>>(
    path: &Path,
    files: &[(P, C)],
    force: bool,
) -> Result<SeedSummary, StoreError> {
    if path.exists() && !force {
        return Err(StoreError::AlreadyExists {
            path: path.to_path_buf(),
        });
    }
    let temp = default_db::temp_path_beside(path)?;
    let summary = match build_file(&temp, files) {
        Ok(summary) => summary,
        Err(e) => {
            let _ = std::fs::remove_file(&temp);
            return Err(e);
        }
    };
    publish(&temp, path, force)?;
    Ok(summary)
}

/// Moves a finished database from `temp` to `path`: replacing it in one rename when
/// `force`, else by a hard link that fails when `path` appeared meanwhile.
fn publish(temp: &Path, path: &Path, force: bool) -> Result<(), StoreError> {
    let published = if force {
        std::fs::rename(temp, path)
    } else {
        // A hard link fails when `path` appeared meanwhile: never overwrite without force.
        std::fs::hard_link(temp, path).and_then(|()| std::fs::remove_file(temp))
    };
    if let Err(source) = published {
        let _ = std::fs::remove_file(temp);
        if source.kind() == std::io::ErrorKind::AlreadyExists {
            return Err(StoreError::AlreadyExists {
                path: path.to_path_buf(),
            });
        }
        return Err(StoreError::Io {
            path: path.to_path_buf(),
            source,
        });
    }
    Ok(())
}

/// Builds a complete database at `path` (which must not exist) and closes it.
pub(crate) fn build_file<P: AsRef<str>, C: AsRef<str>>(
    path: &Path,
    files: &[(P, C)],
) -> Result<SeedSummary, StoreError> {
    let mut store = Store::create(path)?;
    let summary = store.load_seed(files)?;
    store.conn.close().map_err(|(_, e)| StoreError::Sqlite(e))?;
    Ok(summary)
}

/// The current time in UTC as `YYYY-MM-DDTHH:MM:SSZ`, for the audit history.
pub(crate) fn now_utc() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    let (days, rem) = (secs.div_euclid(86_400), secs.rem_euclid(86_400));
    // Civil date from days since 1970-01-01 (H. Hinnant's days_from_civil inverse).
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let day = doy - (153 * mp + 2) / 5 + 1;
    let month = if mp < 10 { mp + 3 } else { mp - 9 };
    let year = yoe + era * 400 + i64::from(month <= 2);
    format!(
        "{year:04}-{month:02}-{day:02}T{:02}:{:02}:{:02}Z",
        rem / 3600,
        rem % 3600 / 60,
        rem % 60
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn now_is_an_iso_timestamp() {
        let now = now_utc();
        assert_eq!(now.len(), 20, "{now}");
        assert!(now.starts_with("20") && now.ends_with('Z'), "{now}");
    }

    #[test]
    fn in_memory_store_is_at_latest_version() {
        let store = Store::open_in_memory().unwrap();
        assert_eq!(store.schema_version().unwrap(), SCHEMA_VERSION);
        assert!(store.is_empty().unwrap());
    }

    #[test]
    fn foreign_keys_are_on() {
        let store = Store::open_in_memory().unwrap();
        let on: i64 = store
            .conn
            .query_row("PRAGMA foreign_keys", [], |r| r.get(0))
            .unwrap();
        assert_eq!(on, 1);
    }

    #[test]
    fn a_dataset_without_a_source_cannot_exist() {
        let store = Store::open_in_memory().unwrap();
        let r = store.conn.execute(
            "INSERT INTO datasets (key, solute, phase, source, unit, temperature_unit, provenance, review)
             VALUES ('x/y', 'x', 1, 'nowhere', 'w', 'C', 'measured', 'reviewed')",
            [],
        );
        assert!(r.is_err());
    }

    #[test]
    fn a_file_that_is_not_a_database_is_a_database_error() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("notes.txt");
        std::fs::write(
            &path,
            "these are notes, not a database, and long enough to have a header",
        )
        .unwrap();
        let err = Store::open(&path).unwrap_err();
        assert!(matches!(err, StoreError::Sqlite(_)), "{err:?}");
        assert!(err.to_string().contains("not a database"), "{err}");
    }

    #[test]
    fn an_unreadable_stored_value_is_reported() {
        let store = Store::open_in_memory().unwrap();
        store
            .conn
            .execute_batch(
                "PRAGMA ignore_check_constraints = ON;
                 INSERT INTO sources (key, kind, title, authors) VALUES ('s', 'rumour', 't', 'a');",
            )
            .unwrap();
        let err = store.read_all().unwrap_err();
        assert!(matches!(err, StoreError::Corrupt { .. }), "{err:?}");
        assert!(err.to_string().contains("source kind \"rumour\""), "{err}");
    }

    #[test]
    fn opening_a_missing_file_says_so() {
        let err = Store::open(Path::new("/nonexistent/satline.db")).unwrap_err();
        assert!(
            err.to_string()
                .contains("no database at /nonexistent/satline.db")
        );
    }
}
