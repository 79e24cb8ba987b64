//! The librarian's workflow, written once for the command line and the server's admin routes:
//! import (with a dry run that opens the file read-only), review, retire and restore, and
//! source edits. Each step returns a typed report; the front ends print it (text, JSON,
//! progress) or send it.

use std::path::Path;

use serde_json::{Value, json};

use crate::model::Source;
use crate::store::import::{ImportFile, ImportOptions, ImportPlan, ImportSummary};
use crate::store::review::{Decision, Retirement};
use crate::store::sources::SourceFields;
use crate::store::{Store, StoreError, audit};

/// A conflict tolerance given in percent, as the fraction the store works with; a negative
/// or non-finite percentage is refused with a message naming the flag.
pub fn tolerance_fraction(percent: f64) -> Result<f64, String> {
    if percent >= 0.0 && percent.is_finite() {
        Ok(percent / 100.0)
    } else {
        Err(format!(
            "--tolerance {percent}: expected a percentage of 0 or more"
        ))
    }
}

/// What an import is doing, for a progress display.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Progress {
    /// Planned: this many points are to be written.
    Planned(usize),
    /// One more point written.
    Point,
    /// Everything written and committed.
    Done,
}

/// What an import did, or (in a dry run) would do.
#[derive(Debug)]
pub struct ImportReport {
    pub plan: ImportPlan,
    pub dry_run: bool,
    /// Who wrote it (absent in a dry run).
    pub actor: Option<String>,
    /// What was written (absent in a dry run).
    pub summary: Option<ImportSummary>,
}

impl ImportReport {
    /// The plan's JSON with `dry_run`, and for a real import `actor` and `audit_rows`.
    pub fn to_json(&self) -> Value {
        let mut body = self.plan.to_json();
        body["dry_run"] = self.dry_run.into();
        if let Some(actor) = &self.actor {
            body["actor"] = actor.clone().into();
        }
        if let Some(summary) = &self.summary {
            body["audit_rows"] = summary.audit_rows.into();
        }
        body
    }

    /// True when a real import added or changed a dataset (these wait for review).
    pub fn wrote_datasets(&self) -> bool {
        self.summary
            .as_ref()
            .is_some_and(|s| s.added + s.changed > 0)
    }
}

/// Imports `files` into the database at `path`: plans, and unless `dry_run` writes the plan
/// in one transaction. A dry run opens the file read-only, so it stays byte-identical.
pub fn import(
    path: &Path,
    files: &[ImportFile],
    options: &ImportOptions,
    dry_run: bool,
    actor: Option<&str>,
    progress: &mut dyn FnMut(Progress),
) -> Result<ImportReport, StoreError> {
    if dry_run {
        let plan = Store::open_read_only(path)?.plan_import(files, options)?;
        return Ok(ImportReport {
            plan,
            dry_run,
            actor: None,
            summary: None,
        });
    }
    let mut store = named(path, Store::open(path))?;
    let actor = audit::actor(actor);
    // Planned and written under one write lock: a concurrent import or review waits, and
    // nothing it writes is overwritten unseen.
    let progress = std::cell::RefCell::new(progress);
    let result = store.import(
        files,
        options,
        &actor,
        &mut |plan| (progress.borrow_mut())(Progress::Planned(plan.points_to_write())),
        &mut || (progress.borrow_mut())(Progress::Point),
    );
    let (plan, summary) = named(path, result)?;
    (progress.borrow_mut())(Progress::Done);
    Ok(ImportReport {
        plan,
        dry_run,
        actor: Some(actor),
        summary: Some(summary),
    })
}

/// A change made to one dataset, and by whom.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Change {
    pub dataset: String,
    pub actor: String,
}

impl Change {
    /// `{"dataset", "actor"}` and the fields of `more`.
    pub fn to_json(&self, more: Value) -> Value {
        let mut body = json!({"dataset": self.dataset, "actor": self.actor});
        if let (Value::Object(body), Value::Object(more)) = (&mut body, more) {
            body.extend(more);
        }
        body
    }
}

/// Approves or rejects a dataset with a note (one transaction, one audit row).
pub fn review(
    path: &Path,
    dataset: &str,
    decision: Decision,
    note: &str,
    actor: Option<&str>,
) -> Result<Change, StoreError> {
    change_dataset(path, dataset, actor, |store, actor| {
        store.review(dataset, decision, note, actor)
    })
}

/// Retires or restores a dataset (one transaction, one audit row).
pub fn set_retired(
    path: &Path,
    dataset: &str,
    change: Retirement,
    note: Option<&str>,
    actor: Option<&str>,
) -> Result<Change, StoreError> {
    change_dataset(path, dataset, actor, |store, actor| {
        store.set_retired(dataset, change, note, actor)
    })
}

/// Opens the database at `path` and makes one change to `dataset` as `actor` (the user's
/// name when not given, as for every audit row).
fn change_dataset<T>(
    path: &Path,
    dataset: &str,
    actor: Option<&str>,
    write: impl FnOnce(&mut Store, &str) -> Result<T, StoreError>,
) -> Result<Change, StoreError> {
    let actor = audit::actor(actor);
    named(
        path,
        Store::open(path).and_then(|mut store| write(&mut store, &actor)),
    )?;
    Ok(Change {
        dataset: dataset.to_string(),
        actor,
    })
}

/// Adds a source (`adding`) or changes the given fields of one; returns the stored record.
pub fn save_source(
    path: &Path,
    key: &str,
    fields: &SourceFields,
    adding: bool,
    actor: Option<&str>,
) -> Result<Source, StoreError> {
    let actor = audit::actor(actor);
    named(
        path,
        Store::open(path).and_then(|mut store| store.save_source(key, fields, adding, &actor)),
    )
}

/// A write's result with a lock or read-only error said with the file's name and a hint.
fn named<T>(path: &Path, result: Result<T, StoreError>) -> Result<T, StoreError> {
    result.map_err(|e| crate::store::name_file(e, &path.display().to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tolerance_is_a_fraction_of_a_non_negative_percentage() {
        assert_eq!(tolerance_fraction(5.0), Ok(0.05));
        assert_eq!(tolerance_fraction(0.0), Ok(0.0));
        assert!(
            tolerance_fraction(-1.0)
                .unwrap_err()
                .contains("--tolerance -1")
        );
        assert!(tolerance_fraction(f64::NAN).is_err());
    }

    #[test]
    fn a_change_merges_its_extra_fields() {
        let change = Change {
            dataset: "demo/a".into(),
            actor: "alice".into(),
        };
        let v = change.to_json(json!({"retired": true}));
        assert_eq!(
            v,
            json!({"dataset": "demo/a", "actor": "alice", "retired": true})
        );
    }
}
