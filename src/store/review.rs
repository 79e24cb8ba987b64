//! The librarian's judgements on stored datasets: approve or reject (review), retire and
//! restore. Each is one transaction: the change and its audit row (with the actor and the
//! note) commit together. Nothing is deleted: a retired dataset is hidden from queries (the
//! catalog leaves it out) but kept, shown in history, and can be restored.

use rusqlite::{OptionalExtension, params};
use serde::Serialize;

use super::{Store, StoreError, audit, lock};
use crate::model::Review;

/// A record waiting for review: a dataset, a Henry's-law record, freezing data or a set of
/// density coefficients (keyed `<solute>/density`).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Unreviewed {
    /// `dataset`, `henry`, `freezing` or `density`.
    pub kind: &'static str,
    pub key: String,
    pub solute: String,
    pub source: String,
    pub phase: String,
    pub provenance: String,
    pub points: u64,
}

/// Writes the datasets waiting for review, one a line.
pub fn write_unreviewed(list: &[Unreviewed], out: &mut dyn std::io::Write) -> std::io::Result<()> {
    if list.is_empty() {
        return writeln!(out, "nothing is waiting for review");
    }
    writeln!(out, "{} unreviewed record(s):", list.len())?;
    for u in list {
        match u.kind {
            "dataset" => writeln!(
                out,
                "  {}  phase {}, source {}, {}, {} points",
                u.key, u.phase, u.source, u.provenance, u.points
            )?,
            "henry" => writeln!(
                out,
                "  {}  Henry's-law record, source {}, {}",
                u.key, u.source, u.provenance
            )?,
            "density" => writeln!(
                out,
                "  {}  density coefficients, source {}, {}",
                u.key, u.source, u.provenance
            )?,
            _ => writeln!(
                out,
                "  {}  freezing table, source {}, {}, {} points",
                u.key, u.source, u.provenance, u.points
            )?,
        }
    }
    Ok(())
}

/// The review decisions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Decision {
    Approve,
    Reject,
}

/// Retire or restore.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Retirement {
    Retire,
    Restore,
}

impl Store {
    /// Records that are unreviewed (datasets not retired), datasets first, each by key.
    pub fn unreviewed(&self) -> Result<Vec<Unreviewed>, StoreError> {
        let mut stmt = self.conn.prepare_cached(
            "SELECT 0, d.key, d.solute, d.source, p.formula, d.provenance,
                    (SELECT COUNT(*) FROM points WHERE dataset = d.key)
             FROM datasets d JOIN phases p ON p.id = d.phase
             WHERE d.review = 'unreviewed' AND d.retired = 0
             UNION ALL
             SELECT 1, key, solute, source, '-', provenance, 0 FROM gas_constants
             WHERE review = 'unreviewed'
             UNION ALL
             SELECT 2, f.key, f.solute, f.source, '-', f.provenance,
                    (SELECT COUNT(*) FROM freezing_points WHERE freezing = f.key)
             FROM freezing f WHERE f.review = 'unreviewed'
             UNION ALL
             SELECT 3, solute || '/density', solute, source, '-', provenance,
                    COALESCE(points, 0)
             FROM density_coefficients WHERE review = 'unreviewed'
             ORDER BY 1, 2",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok(Unreviewed {
                kind: match r.get::<_, i64>(0)? {
                    0 => "dataset",
                    1 => "henry",
                    2 => "freezing",
                    _ => "density",
                },
                key: r.get(1)?,
                solute: r.get(2)?,
                source: r.get(3)?,
                phase: r.get(4)?,
                provenance: r.get(5)?,
                points: r.get::<_, i64>(6)?.try_into().unwrap_or(0),
            })
        })?;
        Ok(rows.collect::<Result<_, _>>()?)
    }

    /// Approves (reviewed) or rejects a dataset, Henry's-law record, freezing table or set of
    /// density coefficients (`<solute>/density`), looked up by key in that order, with the
    /// reviewer's note.
    pub fn review(
        &mut self,
        key: &str,
        decision: Decision,
        note: &str,
        actor: &str,
    ) -> Result<(), StoreError> {
        let tx = lock::begin_write(&self.conn, &self.location)?;
        // Fixed table names, never text from the user.
        let mut found = None;
        for (table, key_of, kind) in [
            ("datasets", "key", "dataset"),
            ("gas_constants", "key", "henry"),
            ("freezing", "key", "freezing"),
            ("density_coefficients", "solute || '/density'", "density"),
        ] {
            let state: Option<String> = tx
                .query_row(
                    &format!("SELECT review FROM {table} WHERE {key_of} = ?1"),
                    params![key],
                    |r| r.get(0),
                )
                .optional()?;
            if let Some(state) = state {
                found = Some((table, key_of, kind, state));
                break;
            }
        }
        let (table, key_of, kind, before) = found.ok_or_else(|| StoreError::UnknownDataset {
            key: key.to_string(),
        })?;
        let (after, action) = match decision {
            Decision::Approve => (Review::Reviewed, "approve"),
            Decision::Reject => (Review::Rejected, "reject"),
        };
        if before == after.as_str() {
            return Err(StoreError::NoChange {
                what: format!("{kind} {key} is already {before}"),
            });
        }
        tx.execute(
            &format!("UPDATE {table} SET review = ?1 WHERE {key_of} = ?2"),
            params![after.as_str(), key],
        )?;
        audit::record(
            &tx,
            actor,
            action,
            // Density coefficients are one set per solute, audited as `density:<solute>`.
            &match key.strip_suffix("/density") {
                Some(solute) if kind == "density" => format!("density:{solute}"),
                _ => format!("{kind}:{key}"),
            },
            Some(&serde_json::json!({ "review": before })),
            Some(&serde_json::json!({ "review": after.as_str(), "note": note })),
        )?;
        lock::commit(tx, &self.location)?;
        Ok(())
    }

    /// Retires a dataset (hidden from queries, kept) or restores a retired one.
    pub fn set_retired(
        &mut self,
        key: &str,
        change: Retirement,
        note: Option<&str>,
        actor: &str,
    ) -> Result<(), StoreError> {
        let tx = lock::begin_write(&self.conn, &self.location)?;
        let state: Option<bool> = tx
            .query_row(
                "SELECT retired FROM datasets WHERE key = ?1",
                params![key],
                |r| r.get(0),
            )
            .optional()?;
        let before = state.ok_or_else(|| StoreError::UnknownDataset {
            key: key.to_string(),
        })?;
        let (after, action) = match change {
            Retirement::Retire => (true, "retire"),
            Retirement::Restore => (false, "restore"),
        };
        if before == after {
            return Err(StoreError::NoChange {
                what: format!(
                    "dataset {key} is {}",
                    if before {
                        "already retired"
                    } else {
                        "not retired"
                    }
                ),
            });
        }
        tx.execute(
            "UPDATE datasets SET retired = ?1 WHERE key = ?2",
            params![after, key],
        )?;
        let mut after_json = serde_json::json!({ "retired": after });
        if let Some(note) = note {
            after_json["note"] = note.into();
        }
        audit::record(
            &tx,
            actor,
            action,
            &format!("dataset:{key}"),
            Some(&serde_json::json!({ "retired": before })),
            Some(&after_json),
        )?;
        lock::commit(tx, &self.location)?;
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    use crate::store::demo::{self, SOURCES};

    // Invented demo data, not reference values.
    const SOLUTE: &str = "id = \"demo-salt\"\nname = \"demo salt\"\nformula = \"KCl\"\nkind = \"salt\"\nions = 2\n[[dataset]]\nkey = \"d\"\nsource = \"demo\"\nphase = \"KCl\"\nphase_name = \"anhydrous\"\nunit = \"%w/w\"\ntemperature_unit = \"C\"\nprovenance = \"derived\"\nreview = \"unreviewed\"\npoints = [[0, 10.0], [20, 12.0]]\n";

    fn store() -> Store {
        demo::store(&[("solutes/demo-salt.toml", SOLUTE)])
    }

    // Invented demo coefficients, not reference values.
    const DENSITY: &str = "[[density]]\nsolute = \"demo-salt\"\nsource = \"demo\"\nc0 = 1.0\nc1 = 2.0\nc2 = 3.0\nc3 = 0.1\nc4 = 100.0\nt_min = 0\nt_max = 80\nw_max = 0.3\nprovenance = \"derived\"\nreview = \"unreviewed\"\n";

    #[test]
    fn density_coefficients_are_reviewed_like_data() {
        let mut s = Store::open_in_memory().unwrap();
        s.load_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", SOLUTE),
            ("densities.toml", DENSITY),
        ])
        .unwrap();
        let waiting = s.unreviewed().unwrap();
        let keys: Vec<(&str, &str)> = waiting.iter().map(|u| (u.kind, u.key.as_str())).collect();
        assert_eq!(
            keys,
            [("dataset", "demo-salt/d"), ("density", "demo-salt/density")]
        );
        s.review(
            "demo-salt/density",
            Decision::Reject,
            "not the printed figures",
            "t",
        )
        .unwrap();
        assert_eq!(s.unreviewed().unwrap().len(), 1);
        let again = s
            .review("demo-salt/density", Decision::Reject, "n", "t")
            .unwrap_err();
        assert!(matches!(again, StoreError::NoChange { .. }), "{again}");
        let (_, history) = s.history("demo-salt").unwrap();
        assert!(
            history
                .iter()
                .any(|e| e.entity == "density:demo-salt" && e.action == "reject")
        );
        let mut listed = Vec::new();
        write_unreviewed(&waiting, &mut listed).unwrap();
        let listed = String::from_utf8(listed).unwrap();
        assert!(listed.contains("demo-salt/density  density coefficients, source demo, derived"));
    }

    #[test]
    fn approve_then_approve_again_changes_nothing() {
        let mut s = store();
        assert_eq!(s.unreviewed().unwrap().len(), 1);
        s.review("demo-salt/d", Decision::Approve, "checked", "t")
            .unwrap();
        assert!(s.unreviewed().unwrap().is_empty());
        let again = s
            .review("demo-salt/d", Decision::Approve, "checked", "t")
            .unwrap_err();
        assert!(matches!(again, StoreError::NoChange { .. }), "{again}");
        let unknown = s
            .review("demo-salt/x", Decision::Reject, "n", "t")
            .unwrap_err();
        assert!(matches!(unknown, StoreError::UnknownDataset { .. }));
    }

    #[test]
    fn retire_and_restore_are_recorded() {
        let mut s = store();
        let before = s.audit_len().unwrap();
        s.set_retired("demo-salt/d", Retirement::Retire, Some("superseded"), "t")
            .unwrap();
        assert!(s.unreviewed().unwrap().is_empty());
        s.set_retired("demo-salt/d", Retirement::Restore, None, "t")
            .unwrap();
        assert_eq!(s.audit_len().unwrap(), before + 2);
    }
}
