//! Concurrent writers on one database file: every write takes the write lock before it
//! reads (IMMEDIATE), so writers wait for each other instead of failing with "database is
//! locked", no update is lost, and the audit history is true (each `before` is the state
//! the write replaced). Every solute, source and number here is INVENTED test data.

use std::path::{Path, PathBuf};
use std::thread;

use satline::librarian::{self, Progress};
use satline::store::review::Retirement;
use satline::store::{ImportFile, ImportOptions, Store, init_empty};

const SOURCES: &str = r#"
[[source]]
key = "invented-w"
kind = "other"
title = "Invented table W (test data)"
authors = "nobody"
"#;

const HEADER: &str =
    "solute,name,formula,kind,ions,phase,temperature,temperature_unit,value,unit,source";

fn file(path: &str, text: &str) -> ImportFile {
    ImportFile {
        path: path.to_string(),
        text: text.to_string(),
    }
}

/// Formulas for the invented solutes (each solute needs its own).
const FORMULAS: [&str; 6] = ["RbNO3", "RbCl", "RbBr", "RbI", "CsCl", "CsBr"];

/// An invented solute `id` (formula number `f`) with points at 0, 20 and 40 C rising from
/// `base`.
fn solute_csv(id: &str, f: usize, base: f64) -> ImportFile {
    let formula = FORMULAS[f];
    let mut text = HEADER.to_string();
    for (i, t) in [0, 20, 40].into_iter().enumerate() {
        text.push_str(&format!(
            "\n{id},invented {id},{formula},salt,2,{formula},{t},C,{},g/100g water,invented-w",
            base + 5.0 * i as f64
        ));
    }
    text.push('\n');
    file(&format!("{id}.csv"), &text)
}

fn import(path: &Path, files: &[ImportFile], actor: &str) {
    librarian::import(
        path,
        files,
        &ImportOptions::default(),
        false,
        Some(actor),
        &mut |_: Progress| {},
    )
    .unwrap_or_else(|e| panic!("{actor}: {e}"));
}

fn database(dir: &Path) -> PathBuf {
    let path = dir.join("w.db");
    init_empty(&path, "test", false).unwrap();
    import(&path, &[file("sources.toml", SOURCES)], "setup");
    path
}

#[test]
fn three_writers_of_a_hundred_writes_each_lose_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let path = database(dir.path());
    let ids = ["invented-a", "invented-b", "invented-c"];
    for (i, id) in ids.iter().enumerate() {
        import(&path, &[solute_csv(id, i, 10.0 * (i + 1) as f64)], "setup");
    }
    let audit_before = Store::open(&path).unwrap().audit_len().unwrap();
    let writers: Vec<_> = ids
        .iter()
        .map(|id| {
            let path = path.clone();
            let key = format!("{id}/invented-w");
            thread::spawn(move || {
                for n in 0..100 {
                    let change = if n % 2 == 0 {
                        Retirement::Retire
                    } else {
                        Retirement::Restore
                    };
                    librarian::set_retired(&path, &key, change, None, Some("writer"))
                        .unwrap_or_else(|e| panic!("{key}, write {n}: {e}"));
                }
            })
        })
        .collect();
    for w in writers {
        w.join().expect("a writer panicked");
    }
    let store = Store::open(&path).unwrap();
    assert_eq!(store.audit_len().unwrap(), audit_before + 300);
    for id in ids {
        let (_, history) = store.history(id).unwrap();
        let changes: Vec<_> = history
            .iter()
            .filter(|e| e.action == "retire" || e.action == "restore")
            .collect();
        assert_eq!(changes.len(), 100, "{id}");
        // A true history: retire, restore, retire, ... each after the one before.
        for (n, e) in changes.iter().enumerate() {
            let expected = if n % 2 == 0 { "retire" } else { "restore" };
            assert_eq!(e.action, expected, "{id}, change {n}");
        }
    }
}

#[test]
fn two_overlapping_imports_of_one_solute_show_a_true_history() {
    let dir = tempfile::tempdir().unwrap();
    let path = database(dir.path());
    for round in 0..5 {
        let id = format!("invented-overlap-{round}");
        let (first, second) = (solute_csv(&id, round, 10.0), solute_csv(&id, round, 30.0));
        let a = {
            let path = path.clone();
            thread::spawn(move || import(&path, &[first], "alice"))
        };
        let b = {
            let path = path.clone();
            thread::spawn(move || import(&path, &[second], "bob"))
        };
        a.join().expect("alice's import");
        b.join().expect("bob's import");
        let store = Store::open(&path).unwrap();
        let (_, history) = store.history(&id).unwrap();
        let solute_rows: Vec<_> = history
            .iter()
            .filter(|e| e.entity == format!("solute:{id}"))
            .collect();
        // One import added the solute (before = nothing); the other found it there.
        let added: Vec<_> = solute_rows.iter().filter(|e| e.action == "add").collect();
        assert_eq!(added.len(), 1, "round {round}: {solute_rows:?}");
        assert!(added[0].before.is_none());
        let dataset_rows: Vec<_> = history
            .iter()
            .filter(|e| e.entity.starts_with("dataset:"))
            .collect();
        assert_eq!(dataset_rows.len(), 2, "round {round}: {dataset_rows:?}");
        assert_eq!(dataset_rows[0].action, "add");
        assert!(dataset_rows[0].before.is_none());
        // The second write's `before` is exactly what the first wrote.
        assert_eq!(dataset_rows[1].action, "change", "round {round}");
        assert_eq!(
            dataset_rows[1].before, dataset_rows[0].after,
            "round {round}"
        );
        // And the stored dataset is the last writer's.
        let contents = store.read_all().unwrap();
        let stored = contents
            .datasets
            .iter()
            .find(|d| d.solute == id)
            .expect("the dataset");
        let reported = |points: &serde_json::Value| -> Vec<serde_json::Value> {
            points
                .as_array()
                .map(|a| a.iter().map(|p| p["value_reported"].clone()).collect())
                .unwrap_or_default()
        };
        assert_eq!(
            reported(&serde_json::to_value(stored).unwrap()["points"]),
            reported(&dataset_rows[1].after.as_ref().unwrap()["points"]),
            "round {round}"
        );
    }
}

#[test]
fn a_plan_made_before_another_write_is_not_applied() {
    let dir = tempfile::tempdir().unwrap();
    let path = database(dir.path());
    let mut store = Store::open(&path).unwrap();
    let plan = store
        .plan_import(
            &[solute_csv("invented-stale", 0, 10.0)],
            &ImportOptions::default(),
        )
        .unwrap();
    import(&path, &[solute_csv("invented-stale", 0, 30.0)], "bob");
    let before = store.audit_len().unwrap();
    let error = store.apply_import(&plan, "alice", &mut || {}).unwrap_err();
    assert!(error.to_string().contains("changed after"), "{error}");
    assert!(error.to_string().contains("w.db"), "{error}");
    assert_eq!(store.audit_len().unwrap(), before);
}

/// Three command lines retiring and restoring different datasets of one file at once,
/// through the binary: every command succeeds (none says "database is locked") and every
/// change is in the history.
#[test]
fn parallel_retire_and_restore_commands_never_say_locked() {
    let dir = tempfile::tempdir().unwrap();
    let path = database(dir.path());
    let ids = ["invented-p", "invented-q", "invented-r"];
    for (i, id) in ids.iter().enumerate() {
        import(&path, &[solute_csv(id, i + 3, 10.0)], "setup");
    }
    let audit_before = Store::open(&path).unwrap().audit_len().unwrap();
    let loops: Vec<_> = ids
        .iter()
        .map(|id| {
            let path = path.clone();
            let key = format!("{id}/invented-w");
            thread::spawn(move || {
                for n in 0..20 {
                    let verb = if n % 2 == 0 { "retire" } else { "restore" };
                    let output = std::process::Command::new(env!("CARGO_BIN_EXE_satline"))
                        .env_remove("SATLINE_DB")
                        .args([verb, &key, "--actor", "loop", "--db"])
                        .arg(&path)
                        .output()
                        .unwrap();
                    let stderr = String::from_utf8_lossy(&output.stderr);
                    assert!(output.status.success(), "{key} {verb} {n}: {stderr}");
                    assert!(!stderr.contains("locked"), "{stderr}");
                }
            })
        })
        .collect();
    for l in loops {
        l.join().expect("a command loop failed");
    }
    assert_eq!(
        Store::open(&path).unwrap().audit_len().unwrap(),
        audit_before + 60
    );
}
