//! The schema migrations under `schema/`, embedded in the binary, and the code that applies
//! them in order. The applied version is kept in `PRAGMA user_version`.

use rusqlite::Connection;

use super::StoreError;

/// One numbered migration: the SQL of `schema/NNNN_name.sql`.
#[derive(Debug, Clone, Copy)]
pub struct Migration {
    /// The schema version the database is at after this migration.
    pub version: u32,
    /// The file name without `.sql`, e.g. `0001_reference_tables`.
    pub name: &'static str,
    pub sql: &'static str,
}

/// A migration by its version and file name: the SQL of `schema/<name>.sql`.
macro_rules! migration {
    ($version:literal, $name:literal) => {
        Migration {
            version: $version,
            name: $name,
            sql: include_str!(concat!("../../schema/", $name, ".sql")),
        }
    };
}

/// Every migration, in order. To add one: write `schema/NNNN_what.sql` and add
/// `migration!(N, "NNNN_what")` here; never edit a migration that has been released.
pub const MIGRATIONS: &[Migration] = &[
    migration!(1, "0001_reference_tables"),
    migration!(2, "0002_metadata_and_indexes"),
    migration!(3, "0003_density_coefficients"),
    migration!(4, "0004_corroboration_checks"),
    migration!(5, "0005_thermochemistry"),
    migration!(6, "0006_density_up_to_the_pure_liquid"),
];

/// The schema version this binary writes and reads.
pub const SCHEMA_VERSION: u32 = MIGRATIONS.len() as u32;

/// The version recorded in the database (0 when nothing has been applied).
pub fn version(conn: &Connection) -> Result<u32, StoreError> {
    let v: i64 = conn.query_row("PRAGMA user_version", [], |r| r.get(0))?;
    // user_version is a signed 32-bit header field; a negative one is not ours.
    Ok(u32::try_from(v).unwrap_or(u32::MAX))
}

/// Applies the migrations after the database's version up to `target`, each in its own
/// transaction together with the new `user_version`, so a failed migration leaves the
/// database at the previous version.
pub fn migrate(conn: &mut Connection, target: u32) -> Result<u32, StoreError> {
    let mut current = version(conn)?;
    for migration in MIGRATIONS {
        if migration.version <= current || migration.version > target {
            continue;
        }
        let tx = conn.transaction_with_behavior(rusqlite::TransactionBehavior::Immediate)?;
        tx.execute_batch(migration.sql)?;
        tx.pragma_update(None, "user_version", migration.version)?;
        tx.commit()?;
        current = migration.version;
    }
    Ok(current)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn versions_are_numbered_from_one_without_gaps() {
        for (i, m) in MIGRATIONS.iter().enumerate() {
            assert_eq!(m.version as usize, i + 1);
            assert!(m.name.starts_with(&format!("{:04}_", i + 1)));
        }
    }

    #[test]
    fn migrating_step_by_step_reaches_the_latest_version() {
        let mut conn = Connection::open_in_memory().unwrap();
        for target in 1..=SCHEMA_VERSION {
            assert_eq!(migrate(&mut conn, target).unwrap(), target);
            assert_eq!(version(&conn).unwrap(), target);
        }
        // Running again does nothing.
        assert_eq!(migrate(&mut conn, SCHEMA_VERSION).unwrap(), SCHEMA_VERSION);
    }
}
