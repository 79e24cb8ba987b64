//! The audit history: one row per change (time, actor, action, entity, the record before and
//! after as JSON), written in the same transaction as the change itself, and read back as a
//! solute's history.
//!
//! Entities are named `<kind>:<key>`: `source:crc-97-aqsol`, `solute:potassium-nitrate`,
//! `dataset:potassium-nitrate/crc-97`, `henry:oxygen/fit`, `freezing:sodium-chloride/crc`,
//! and `database` for the creation of an empty database.

use rusqlite::{Connection, Row, params};
use serde::Serialize;

use super::read::{corrupt, records};
use super::{StoreError, now_utc};

/// The actor of a change: the `--actor` flag when given, else the user name from `$USER` or
/// `$LOGNAME`, else `unknown`.
pub fn actor(flag: Option<&str>) -> String {
    let given = |s: Option<String>| s.map(|s| s.trim().to_string()).filter(|s| !s.is_empty());
    given(flag.map(str::to_string))
        .or_else(|| given(std::env::var("USER").ok()))
        .or_else(|| given(std::env::var("LOGNAME").ok()))
        .unwrap_or_else(|| "unknown".to_string())
}

/// One row of the audit history.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AuditEntry {
    pub id: i64,
    /// UTC, `YYYY-MM-DDTHH:MM:SSZ`.
    pub time: String,
    pub actor: String,
    /// `create-empty`, `load-seed`, `add`, `change`, `approve`, `reject`, `retire`, `restore`.
    pub action: String,
    pub entity: String,
    pub before: Option<serde_json::Value>,
    pub after: Option<serde_json::Value>,
}

/// Writes one audit row. Called inside the transaction that makes the change.
pub(crate) fn record(
    conn: &Connection,
    actor: &str,
    action: &str,
    entity: &str,
    before: Option<&serde_json::Value>,
    after: Option<&serde_json::Value>,
) -> Result<(), StoreError> {
    conn.prepare_cached(
        "INSERT INTO audit (time, actor, action, entity, before, after) VALUES (?1, ?2, ?3, ?4, ?5, ?6)",
    )?
    .execute(params![
        now_utc(),
        actor,
        action,
        entity,
        before.map(|v| v.to_string()),
        after.map(|v| v.to_string())
    ])?;
    Ok(())
}

/// Every audit row about the solute `id` (the solute itself, its datasets, Henry's-law
/// records, freezing data and density coefficients, and the sources they cite), oldest
/// first.
pub(crate) fn history(conn: &Connection, id: &str) -> Result<Vec<AuditEntry>, StoreError> {
    records(
        conn,
        "SELECT id, time, actor, action, entity, before, after FROM audit
         WHERE entity = 'solute:' || ?1
            OR entity = 'density:' || ?1
            OR substr(entity, 1, length(?1) + 9) = 'dataset:' || ?1 || '/'
            OR substr(entity, 1, length(?1) + 7) = 'henry:' || ?1 || '/'
            OR substr(entity, 1, length(?1) + 10) = 'freezing:' || ?1 || '/'
            OR substr(entity, 1, length(?1) + 7) = 'check:' || ?1 || '/'
            OR entity IN (SELECT 'source:' || source FROM datasets WHERE solute = ?1
                          UNION SELECT 'source:' || source FROM gas_constants WHERE solute = ?1
                          UNION SELECT 'source:' || source FROM freezing WHERE solute = ?1)
         ORDER BY id",
        [id],
        entry,
    )
}

/// Every audit row, oldest first.
pub(crate) fn all_entries(conn: &Connection) -> Result<Vec<AuditEntry>, StoreError> {
    records(
        conn,
        "SELECT id, time, actor, action, entity, before, after FROM audit ORDER BY id",
        [],
        entry,
    )
}

/// One audit row of `id, time, actor, action, entity, before, after`.
fn entry(r: &Row<'_>) -> Result<AuditEntry, StoreError> {
    let json = |i: usize| -> Result<Option<serde_json::Value>, StoreError> {
        r.get::<_, Option<String>>(i)?
            .map(|t| serde_json::from_str(&t).map_err(|e| corrupt(format!("audit JSON: {e}"))))
            .transpose()
    };
    Ok(AuditEntry {
        id: r.get(0)?,
        time: r.get(1)?,
        actor: r.get(2)?,
        action: r.get(3)?,
        entity: r.get(4)?,
        before: json(5)?,
        after: json(6)?,
    })
}

/// Writes a history for people (one block per change: time, actor, action, entity, then
/// the record before and after as JSON), or as JSON lines (one [`AuditEntry`] a line).
pub fn write_history(
    id: &str,
    entries: &[AuditEntry],
    json_lines: bool,
    out: &mut dyn std::io::Write,
) -> std::io::Result<()> {
    if json_lines {
        for e in entries {
            writeln!(out, "{}", serde_json::to_string(e).unwrap_or_default())?;
        }
        return Ok(());
    }
    writeln!(out, "history of {id}: {} change(s)", entries.len())?;
    let show = |v: &Option<serde_json::Value>| {
        v.as_ref()
            .map_or_else(|| "-".to_string(), |v| v.to_string())
    };
    for e in entries {
        writeln!(out, "{}  {}  {}  {}", e.time, e.actor, e.action, e.entity)?;
        writeln!(out, "  before: {}", show(&e.before))?;
        writeln!(out, "  after:  {}", show(&e.after))?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_given_actor_wins_and_blank_is_not_a_name() {
        assert_eq!(actor(Some("alice")), "alice");
        assert_ne!(actor(Some("  ")), "  ");
    }

    #[test]
    fn history_matches_the_solute_and_its_records_only() {
        let store = crate::store::Store::open_in_memory().unwrap();
        for entity in [
            "solute:demo",
            "dataset:demo/a",
            "dataset:demo-two/a",
            "henry:demo/h",
            "freezing:demo/f",
            "source:demo",
        ] {
            record(&store.conn, "t", "add", entity, None, None).unwrap();
        }
        let found: Vec<String> = history(&store.conn, "demo")
            .unwrap()
            .into_iter()
            .map(|e| e.entity)
            .collect();
        assert_eq!(
            found,
            [
                "solute:demo",
                "dataset:demo/a",
                "henry:demo/h",
                "freezing:demo/f"
            ]
        );
    }
}
