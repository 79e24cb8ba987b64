//! The librarian's store operations against their promises: one refusal or report per
//! validation class, all-or-nothing imports (an error at row N of a large import, or a write
//! that fails part way, leaves the database unchanged), an audit row for every change, the
//! export round trip, a reader during an import seeing the state before or after, a CSV
//! range error named by line and column, and progress lines from a large import.
//!
//! Every solute, source and number here is INVENTED test data, not reference values (the
//! round trip alone uses the real seed, as it is).

use std::path::{Path, PathBuf};

use satline::catalog::Catalog;
use satline::store::export::{to_csv, to_json, to_toml_files};
use satline::store::import::ChangeKind;
use satline::store::review::{Decision, Retirement};
use satline::store::{ImportFile, ImportOptions, Store, StoreError, init_empty, init_file};

const HEADER: &str = "solute,formula,phase,temperature,temperature_unit,value,unit,source";

const SOURCES: &str = r#"
[[source]]
key = "invented-a"
kind = "other"
title = "Invented table A (test data)"
authors = "nobody"

[[source]]
key = "invented-b"
kind = "other"
title = "Invented table B (test data)"
authors = "nobody"
"#;

fn file(path: &str, text: &str) -> ImportFile {
    ImportFile {
        path: path.to_string(),
        text: text.to_string(),
    }
}

/// A file database with the two invented sources, in `dir`.
fn database(dir: &Path) -> (PathBuf, Store) {
    let path = dir.join("lib.db");
    init_empty(&path, "test", false).unwrap();
    let mut store = Store::open(&path).unwrap();
    let plan = store
        .plan_import(&[file("sources.toml", SOURCES)], &ImportOptions::default())
        .unwrap();
    store.apply_import(&plan, "test", &mut || {}).unwrap();
    (path, store)
}

fn csv(rows: &[&str]) -> ImportFile {
    let mut text = HEADER.to_string();
    for r in rows {
        text.push('\n');
        text.push_str(r);
    }
    text.push('\n');
    file("invented.csv", &text)
}

fn refused(store: &Store, files: &[ImportFile]) -> String {
    match store.plan_import(files, &ImportOptions::default()) {
        Ok(plan) => panic!("accepted: {:?}", plan.changes.len()),
        Err(e) => {
            assert!(
                matches!(e, StoreError::Import { .. }),
                "not an import error: {e:?}"
            );
            e.to_string()
        }
    }
}

fn import(store: &mut Store, files: &[ImportFile]) -> satline::store::ImportPlan {
    let plan = store.plan_import(files, &ImportOptions::default()).unwrap();
    store.apply_import(&plan, "test", &mut || {}).unwrap();
    plan
}

// ---- validation classes ---------------------------------------------------------------

#[test]
fn a_dataset_without_a_source_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let (_, store) = database(dir.path());
    let message = refused(&store, &[csv(&["invented-x,KCl,KCl,0,C,10,%w/w,"])]);
    assert!(
        message.contains("line 2: a dataset without a source is refused"),
        "{message}"
    );
    let message = refused(&store, &[csv(&["invented-x,KCl,KCl,0,C,10,%w/w,nowhere"])]);
    assert!(
        message.contains("unknown source key \"nowhere\""),
        "{message}"
    );
    // In TOML too: the seed's own rule.
    let toml = "id = \"invented-x\"\nname = \"invented x\"\nformula = \"KCl\"\nkind = \"molecular\"\n\
                [[dataset]]\nkey = \"a\"\nsource = \"nowhere\"\nphase = \"KCl\"\nphase_name = \"anhydrous\"\n\
                unit = \"%w/w\"\ntemperature_unit = \"C\"\nprovenance = \"derived\"\nreview = \"unreviewed\"\n\
                points = [[0, 10.0]]\n";
    let message = refused(&store, &[file("invented-x.toml", toml)]);
    assert!(
        message.starts_with("invented-x.toml, dataset \"a\": unknown source key \"nowhere\""),
        "{message}"
    );
}

#[test]
fn seed_rules_apply_with_the_csv_line() {
    let dir = tempfile::tempdir().unwrap();
    let (_, store) = database(dir.path());
    let cases = [
        (
            "invented-x,KCl,KCl,0,C,10,furlongs,invented-a",
            "unknown unit \"furlongs\"",
        ),
        (
            "invented-x,KN(O3,KCl,0,C,10,%w/w,invented-a",
            "malformed formula \"KN(O3\"",
        ),
        (
            "invented-x,KCl,KCl,120,C,10,%w/w,invented-a",
            "line 2 (dataset \"invented-a\", point 1): temperature 120 C is outside the liquid range",
        ),
        (
            "invented-x,KCl,KCl,-60,C,10,%w/w,invented-a",
            "outside the liquid range",
        ),
        (
            "invented-x,KCl,KCl,0,C,10,g/L,invented-a",
            "is per volume of solution",
        ),
    ];
    // A misspelt kind is reported at the solute's first line, not inside made-up TOML.
    let text = format!("{HEADER},kind\ninvented-x,KCl,KCl,0,C,10,%w/w,invented-a,salty\n");
    let message = refused(&store, &[file("invented.csv", &text)]);
    assert!(
        message
            .starts_with("invented.csv, line 2 (solute \"invented-x\"): unknown variant `salty`"),
        "{message}"
    );
    for (row, expected) in cases {
        let message = refused(&store, &[csv(&[row])]);
        assert!(message.contains(expected), "{row}: {message}");
    }
}

/// Two spellings of one unit on the rows of one dataset agree; a misspelt unit is named as
/// unknown, not as a disagreement with an earlier row; every faulty row of a file is
/// reported, not only the first.
#[test]
fn csv_units_are_compared_by_meaning_and_every_fault_is_reported() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    let plan = import(
        &mut store,
        &[csv(&[
            "invented-x,KCl,KCl,0,C,10,g/100g water,invented-a",
            "invented-x,KCl,KCl,10,C,12,g/100 g water,invented-a",
        ])],
    );
    assert!(!plan.changes.is_empty());
    let message = refused(
        &store,
        &[csv(&[
            "invented-y,KCl,KCl,0,C,10,g/100g water,invented-a",
            "invented-y,KCl,KCl,10,C,12,g/100 g watr,invented-a",
        ])],
    );
    assert!(
        message.contains("line 3: unknown unit \"g/100 g watr\""),
        "{message}"
    );
    assert!(!message.contains("differs from"), "{message}");
    let message = refused(
        &store,
        &[csv(&[
            "invented-z,KCl,KCl,0,C,ten,%w/w,invented-a",
            "invented-z,KCl,KCl,10,C,12,%w/w,invented-a",
            "invented-z,KCl,KCl,20,C,14,%w/w,nowhere",
        ])],
    );
    assert!(
        message.starts_with("invented.csv, line 2: value is not a number"),
        "{message}"
    );
    assert!(
        message.contains("and 1 more fault in this file"),
        "{message}"
    );
    assert!(
        message.contains("line 4: unknown source key \"nowhere\""),
        "{message}"
    );
}

#[test]
fn a_value_outside_the_sane_range_of_its_unit_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let (_, store) = database(dir.path());
    for (row, expected) in [
        (
            "invented-x,KCl,KCl,0,C,6000,g/100g water,invented-a",
            "6000 g/100g water is outside the sane range",
        ),
        (
            "invented-x,KCl,KCl,0,C,150,mol/kg,invented-a",
            "150 mol/kg is outside the sane range",
        ),
        (
            "invented-x,KCl,KCl,0,C,0,%w/w,invented-a",
            "0 %w/w is outside the sane range",
        ),
    ] {
        let message = refused(&store, &[csv(&[row])]);
        assert!(message.contains(expected), "{row}: {message}");
    }
}

#[test]
fn duplicates_are_refused_or_reported() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    // The same point twice.
    let message = refused(
        &store,
        &[csv(&[
            "invented-x,KCl,KCl,10,C,10,%w/w,invented-a",
            "invented-x,KCl,KCl,10,C,11,%w/w,invented-a",
        ])],
    );
    assert!(
        message.contains("line 3: duplicate point at 10") && message.contains("also on line 2"),
        "{message}"
    );
    // A name another stored solute uses.
    import(
        &mut store,
        &[csv(&["invented-x,KCl,KCl,10,C,10,%w/w,invented-a"])],
    );
    let text = format!("{HEADER},name\ninvented-y,KCl,KCl,10,C,10,%w/w,invented-a,invented-x\n");
    let message = refused(&store, &[file("invented.csv", &text)]);
    assert!(
        message.contains("duplicate name \"invented-x\": the stored solute \"invented-x\" uses it"),
        "{message}"
    );
    // The same numbers under another dataset key: reported, not refused.
    let text = format!("{HEADER},dataset\ninvented-x,KCl,KCl,10,C,10,%w/w,invented-a,again\n");
    let plan = store
        .plan_import(&[file("invented.csv", &text)], &ImportOptions::default())
        .unwrap();
    assert!(
        plan.findings.iter().any(|f| f.kind == "duplicate"
            && f.message
                .contains("repeats the stored dataset invented-x/invented-a")),
        "{:?}",
        plan.findings
    );
    // Importing the same file again changes nothing.
    let plan = store
        .plan_import(
            &[csv(&["invented-x,KCl,KCl,10,C,10,%w/w,invented-a"])],
            &ImportOptions::default(),
        )
        .unwrap();
    assert_eq!(plan.count(ChangeKind::Unchanged), 2);
    assert_eq!(plan.count(ChangeKind::Added), 0);
}

#[test]
fn an_outlier_is_reported_and_the_import_goes_on() {
    let dir = tempfile::tempdir().unwrap();
    let (_, store) = database(dir.path());
    let plan = store
        .plan_import(
            &[csv(&[
                "invented-x,KCl,KCl,0,C,10,%w/w,invented-a",
                "invented-x,KCl,KCl,20,C,30,%w/w,invented-a",
                "invented-x,KCl,KCl,40,C,14,%w/w,invented-a",
            ])],
            &ImportOptions::default(),
        )
        .unwrap();
    let outliers: Vec<_> = plan
        .findings
        .iter()
        .filter(|f| f.kind == "outlier")
        .collect();
    assert_eq!(outliers.len(), 1, "{:?}", plan.findings);
    assert!(
        outliers[0]
            .message
            .contains("point 2 at 20 C: 30 %w/w lies"),
        "{}",
        outliers[0].message
    );
    assert_eq!(plan.count(ChangeKind::Added), 2);
}

#[test]
fn a_conflict_with_another_source_is_reported_with_both_values() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    import(
        &mut store,
        &[csv(&[
            "invented-x,KCl,KCl,0,C,10,%w/w,invented-a",
            "invented-x,KCl,KCl,20,C,20,%w/w,invented-a",
        ])],
    );
    let other = csv(&["invented-x,KCl,KCl,10,C,16.5,%w/w,invented-b"]);
    let plan = store
        .plan_import(std::slice::from_ref(&other), &ImportOptions::default())
        .unwrap();
    let conflict = plan
        .findings
        .iter()
        .find(|f| f.kind == "conflict")
        .expect("a conflict");
    assert!(
        conflict
            .message
            .contains("at 10 C: 16.5 %w/w against 15 %w/w, 10.0% apart (tolerance 5%)"),
        "{}",
        conflict.message
    );
    // Within a wider tolerance it is no conflict.
    let wide = ImportOptions {
        tolerance: 0.15,
        ..ImportOptions::default()
    };
    let plan = store.plan_import(&[other], &wide).unwrap();
    assert!(plan.findings.is_empty(), "{:?}", plan.findings);
}

#[test]
fn imported_datasets_are_unreviewed() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    let text = format!("{HEADER},review\ninvented-x,KCl,KCl,10,C,10,%w/w,invented-a,reviewed\n");
    import(&mut store, &[file("invented.csv", &text)]);
    let contents = store.read_all().unwrap();
    assert_eq!(
        contents.datasets[0].review,
        satline::model::Review::Unreviewed
    );
    assert_eq!(store.unreviewed().unwrap().len(), 1);
}

// ---- all or nothing -------------------------------------------------------------------

/// An invented CSV of `solutes` solutes with 100 smooth points each (0 to 99 C).
fn large_csv(solutes: usize, bad_row: Option<usize>) -> ImportFile {
    let mut text = String::from(HEADER);
    let mut row = 0;
    for s in 0..solutes {
        for t in 0..100 {
            row += 1;
            let value = if Some(row) == bad_row {
                "abc".to_string()
            } else {
                format!("{}", 10.0 + 0.1 * t as f64 + s as f64 * 0.01)
            };
            text.push_str(&format!(
                "\ninvented-bulk-{s},KCl,KCl,{t},C,{value},%w/w,invented-a"
            ));
        }
    }
    text.push('\n');
    file("bulk.csv", &text)
}

fn snapshot(store: &Store) -> (satline::store::Contents, u64) {
    (store.read_all().unwrap(), store.audit_len().unwrap())
}

#[test]
fn an_error_at_row_n_of_a_large_import_leaves_the_database_unchanged() {
    let dir = tempfile::tempdir().unwrap();
    let (path, store) = database(dir.path());
    let before = snapshot(&store);
    let message = refused(&store, &[large_csv(30, Some(2500))]);
    // Row 2500 is on line 2501 (after the header).
    assert!(
        message.contains("bulk.csv, line 2501: value is not a number"),
        "{message}"
    );
    assert_eq!(snapshot(&store), before);
    drop(store);
    let store = Store::open(&path).unwrap();
    assert_eq!(snapshot(&store), before);
}

#[test]
fn a_write_that_fails_part_way_rolls_the_whole_import_back() {
    let dir = tempfile::tempdir().unwrap();
    let (path, mut store) = database(dir.path());
    // Make the database itself refuse one point in the middle of the write: the 51st point
    // of invented-bulk-20, the 14th dataset in key order (0, 1, 10..19, 2, 20), so 1,350
    // points have been written in the transaction when it fails.
    let conn = rusqlite::Connection::open(&path).unwrap();
    conn.execute_batch(
        "CREATE TRIGGER injected BEFORE INSERT ON points
         WHEN NEW.dataset = 'invented-bulk-20/invented-a' AND NEW.position = 50
         BEGIN SELECT RAISE(ABORT, 'injected failure'); END;",
    )
    .unwrap();
    drop(conn);
    let before = snapshot(&store);
    let plan = store
        .plan_import(&[large_csv(30, None)], &ImportOptions::default())
        .unwrap();
    assert_eq!(plan.points_to_write(), 3000);
    let mut written = 0;
    let err = store
        .apply_import(&plan, "test", &mut || written += 1)
        .unwrap_err();
    assert!(err.to_string().contains("injected failure"), "{err}");
    assert_eq!(written, 1350);
    assert_eq!(snapshot(&store), before);
    let fresh = Store::open(&path).unwrap();
    assert_eq!(snapshot(&fresh), before);
}

// ---- audit ----------------------------------------------------------------------------

#[test]
fn every_change_has_an_audit_row_with_actor_and_before_after() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    let start = store.audit_len().unwrap();
    let plan = store
        .plan_import(
            &[csv(&[
                "invented-x,KCl,KCl,0,C,10,%w/w,invented-a",
                "invented-x,KCl,KCl,20,C,12,%w/w,invented-a",
                "invented-y,NaCl,NaCl,20,C,12,%w/w,invented-a",
            ])],
            &ImportOptions::default(),
        )
        .unwrap();
    let summary = store.apply_import(&plan, "carol", &mut || {}).unwrap();
    assert_eq!(summary.added, 4);
    assert_eq!(summary.audit_rows, 4);
    assert_eq!(store.audit_len().unwrap(), start + 4);

    // A changed dataset keeps its old version in the audit row.
    let plan = store
        .plan_import(
            &[csv(&[
                "invented-x,KCl,KCl,0,C,10,%w/w,invented-a",
                "invented-x,KCl,KCl,20,C,12.5,%w/w,invented-a",
            ])],
            &ImportOptions::default(),
        )
        .unwrap();
    assert_eq!(plan.count(ChangeKind::Changed), 1);
    store.apply_import(&plan, "carol", &mut || {}).unwrap();

    store
        .review(
            "invented-x/invented-a",
            Decision::Approve,
            "looked at it",
            "dave",
        )
        .unwrap();
    store
        .set_retired(
            "invented-x/invented-a",
            Retirement::Retire,
            Some("old"),
            "dave",
        )
        .unwrap();
    store
        .set_retired("invented-x/invented-a", Retirement::Restore, None, "dave")
        .unwrap();
    store
        .review(
            "invented-y/invented-a",
            Decision::Reject,
            "wrong table",
            "dave",
        )
        .unwrap();
    assert_eq!(store.audit_len().unwrap(), start + 9);

    let (id, history) = store.history("invented x").unwrap();
    assert_eq!(id, "invented-x");
    let actions: Vec<(&str, &str)> = history
        .iter()
        .map(|e| (e.actor.as_str(), e.action.as_str()))
        .collect();
    assert_eq!(
        actions,
        [
            ("test", "add"),
            ("carol", "add"),
            ("carol", "add"),
            ("carol", "change"),
            ("dave", "approve"),
            ("dave", "retire"),
            ("dave", "restore"),
        ]
    );
    assert_eq!(history[0].entity, "source:invented-a");
    let change = &history[3];
    let old = &change.before.as_ref().unwrap()["points"][1]["value_reported"];
    let new = &change.after.as_ref().unwrap()["points"][1]["value_reported"];
    assert_eq!((old.as_f64(), new.as_f64()), (Some(12.0), Some(12.5)));
    assert_eq!(history[4].after.as_ref().unwrap()["note"], "looked at it");
    for e in &history {
        assert_eq!(e.time.len(), 20, "{e:?}");
    }
    // A retired dataset is kept and hidden from the catalog; restore brings it back.
    store
        .set_retired("invented-x/invented-a", Retirement::Retire, None, "dave")
        .unwrap();
    let catalog = Catalog::from_store(&store).unwrap();
    assert!(catalog.datasets_of("invented-x").is_empty());
    assert_eq!(store.read_all().unwrap().datasets.len(), 2);
}

// ---- export round trip ----------------------------------------------------------------

#[test]
fn export_then_import_into_an_empty_database_then_export_gives_the_same_bytes() {
    let dir = tempfile::tempdir().unwrap();
    let seeded = dir.path().join("seed.db");
    init_file(&seeded, satline::seed_files::SEED_FILES, false).unwrap();
    let mut original = Store::open(&seeded).unwrap();
    // Some state worth keeping: a review, a retirement.
    let key = original.read_all().unwrap().datasets[0].key.clone();
    original
        .review(&key, Decision::Approve, "round trip", "test")
        .unwrap();
    let second = original.read_all().unwrap().datasets[1].key.clone();
    original
        .set_retired(&second, Retirement::Retire, None, "test")
        .unwrap();
    let contents = original.read_all().unwrap();
    let toml = to_toml_files(&contents);
    let csv_text = to_csv(&contents).unwrap();
    let json = to_json(&contents).unwrap();

    let empty = dir.path().join("empty.db");
    init_empty(&empty, "test", false).unwrap();
    let mut copy = Store::open(&empty).unwrap();
    let files: Vec<ImportFile> = toml
        .iter()
        .map(|(name, text)| file(name.rsplit('/').next().unwrap(), text))
        .collect();
    let keep = ImportOptions {
        keep_state: true,
        ..ImportOptions::default()
    };
    let plan = copy.plan_import(&files, &keep).unwrap();
    copy.apply_import(&plan, "test", &mut || {}).unwrap();
    let again = copy.read_all().unwrap();
    assert_eq!(to_toml_files(&again), toml);
    assert_eq!(to_csv(&again).unwrap(), csv_text);
    assert_eq!(to_json(&again).unwrap(), json);

    // The CSV export imports back too (with the sources), into yet another empty database.
    let third = dir.path().join("third.db");
    init_empty(&third, "test", false).unwrap();
    let mut from_csv = Store::open(&third).unwrap();
    let sources = toml.iter().find(|(n, _)| n == "sources.toml").unwrap();
    let plan = from_csv
        .plan_import(
            &[file("sources.toml", &sources.1), file("all.csv", &csv_text)],
            &keep,
        )
        .unwrap();
    from_csv.apply_import(&plan, "test", &mut || {}).unwrap();
    assert_eq!(to_csv(&from_csv.read_all().unwrap()).unwrap(), csv_text);
}

// ---- readers during a write -----------------------------------------------------------

#[test]
fn a_reader_during_an_import_sees_before_or_after() {
    use std::sync::Arc;
    use std::sync::atomic::{AtomicBool, Ordering};

    let dir = tempfile::tempdir().unwrap();
    let (path, mut store) = database(dir.path());
    let plan = store
        .plan_import(&[large_csv(40, None)], &ImportOptions::default())
        .unwrap();
    let started = Arc::new(AtomicBool::new(false));
    let done = Arc::new(AtomicBool::new(false));
    let (reader_started, reader_done, reader_path) = (started.clone(), done.clone(), path.clone());
    // A second connection, as a server answering queries would hold.
    let reader = std::thread::spawn(move || {
        let reader = Store::open(&reader_path).unwrap();
        let mut seen = Vec::new();
        loop {
            let finished = reader_done.load(Ordering::SeqCst);
            let during = reader_started.load(Ordering::SeqCst) && !finished;
            let catalog = Catalog::from_store(&reader).unwrap();
            let points: usize = catalog.datasets().iter().map(|d| d.points.len()).sum();
            seen.push((
                during,
                (catalog.solutes().len(), catalog.datasets().len(), points),
            ));
            if finished {
                break;
            }
        }
        seen
    });
    std::thread::sleep(std::time::Duration::from_millis(20));
    let mut written = 0;
    store
        .apply_import(&plan, "test", &mut || {
            started.store(true, Ordering::SeqCst);
            written += 1;
            // Slow the write down so the reader reads while it is under way.
            if written % 50 == 0 {
                std::thread::sleep(std::time::Duration::from_millis(2));
            }
        })
        .unwrap();
    done.store(true, Ordering::SeqCst);
    let seen = reader.join().unwrap();
    let (before, after) = ((0, 0, 0), (40, 40, 4000));
    for (_, state) in &seen {
        assert!(
            *state == before || *state == after,
            "half a write: {state:?}"
        );
    }
    assert!(
        seen.iter()
            .any(|(during, state)| *during && *state == before),
        "the reader never read while the import was under way"
    );
    assert_eq!(seen.last().map(|s| s.1), Some(after));
}

// ---- the documented inputs of the librarian's error variants --------------------------

#[test]
fn each_librarian_error_is_triggered_by_its_documented_input() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    // UnknownSolute: `satline history KNO4`.
    assert!(matches!(
        store.history("KNO4"),
        Err(StoreError::UnknownSolute { .. })
    ));
    // UnknownDataset: `satline review approve kno3/crc-97`.
    let err = store
        .review("kno3/crc-97", Decision::Approve, "n", "t")
        .unwrap_err();
    assert!(matches!(err, StoreError::UnknownDataset { .. }), "{err}");
    assert!(err.is_bad_input());
    // UnknownSourceKey: `satline source edit crc-98 --year 2017`.
    let err = store
        .save_source(
            "crc-98",
            &satline::store::sources::SourceFields {
                year: Some(2017),
                ..Default::default()
            },
            false,
            "t",
        )
        .unwrap_err();
    assert!(matches!(err, StoreError::UnknownSourceKey { .. }), "{err}");
    // NotEmptyDirectory: `satline export --to toml --out DIR` into a directory with files.
    let out = dir.path().join("out");
    std::fs::create_dir_all(&out).unwrap();
    std::fs::write(out.join("keep.txt"), "x").unwrap();
    let err = satline::store::export::export(
        &store.read_all().unwrap(),
        satline::store::export::ExportFormat::Toml,
        &out,
        false,
    )
    .unwrap_err();
    assert!(matches!(err, StoreError::NotEmptyDirectory { .. }), "{err}");
    // Import: a CSV row with `value` = `abc` (see the large import test) and an unknown
    // column.
    let message = refused(
        &store,
        &[file(
            "x.csv",
            &format!("{HEADER},colour\ninvented-x,KCl,KCl,0,C,1,%w/w,invented-a,red\n"),
        )],
    );
    assert!(
        message.contains("line 1: unknown column \"colour\""),
        "{message}"
    );
    // A file that is neither TOML nor CSV.
    let message = refused(&store, &[file("notes.txt", "hello")]);
    assert!(message.contains("not an import file"), "{message}");
}

#[test]
fn henry_records_are_reviewed_like_datasets() {
    let dir = tempfile::tempdir().unwrap();
    let (_, mut store) = database(dir.path());
    let gas = "id = \"invented-gas\"\nname = \"invented gas\"\nformula = \"O2\"\nkind = \"gas\"\n\
               [[henry]]\nkey = \"h\"\nsource = \"invented-a\"\nprovenance = \"derived\"\n\
               review = \"reviewed\"\nform = \"vant-hoff\"\nconvention = \"Hcc\"\nvalue = 0.03\n\
               reference_temperature_k = 298.15\ntemperature_term_k = 1500\n";
    import(&mut store, &[file("invented-gas.toml", gas)]);
    let waiting = store.unreviewed().unwrap();
    assert_eq!(waiting.len(), 1);
    assert_eq!(
        (waiting[0].kind, waiting[0].key.as_str()),
        ("henry", "invented-gas/h")
    );
    store
        .review("invented-gas/h", Decision::Approve, "checked", "t")
        .unwrap();
    assert!(store.unreviewed().unwrap().is_empty());
    let (_, history) = store.history("invented-gas").unwrap();
    assert_eq!(history.last().unwrap().entity, "henry:invented-gas/h");
}

// Large and faulty CSV imports (issue 20). The speed target itself is the `linear`
// criterion benchmark, never a timed test.

#[test]
fn an_out_of_range_value_in_a_csv_row_names_its_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let (_, store) = database(dir.path());
    // Line 1 is the header; the bad value is on line 5, in the 6th column.
    let text = format!(
        "{HEADER}\n\
         invented-x,KCl,KCl,10,C,20,g/100g water,invented-a\n\
         invented-x,KCl,KCl,20,C,21,g/100g water,invented-a\n\
         invented-y,KCl,KCl,20,C,21,g/100g water,invented-a\n\
         invented-x,KCl,KCl,30,C,6000,g/100g water,invented-a\n"
    );
    let error = store
        .plan_import(&[file("rows.csv", &text)], &ImportOptions::default())
        .unwrap_err();
    assert!(matches!(error, StoreError::Import { .. }), "{error:?}");
    let message = error.to_string();
    assert!(
        message.starts_with("rows.csv, line 5, column 6 (value; dataset \"invented-a\", point 3): 6000 g/100g water is outside the sane range"),
        "{message}"
    );
    // The value column elsewhere in the header: the column follows it.
    let text = "value,solute,formula,phase,temperature,temperature_unit,unit,source\n\
                20,invented-x,KCl,KCl,10,C,g/100g water,invented-a\n\
                0,invented-x,KCl,KCl,20,C,g/100g water,invented-a\n";
    let message = store
        .plan_import(&[file("rows.csv", text)], &ImportOptions::default())
        .unwrap_err()
        .to_string();
    assert!(
        message.starts_with("rows.csv, line 3, column 1 (value; dataset \"invented-a\", point 2)"),
        "{message}"
    );
}

/// `rows` invented rows over solutes of 100 points each.
fn many_rows(rows: usize) -> String {
    let mut text = format!("{HEADER}\n");
    for i in 0..rows {
        let (solute, point) = (i / 100, i % 100);
        let t = 0.5 + point as f64 * 0.99;
        let value = 10.0 + 0.3 * t;
        text.push_str(&format!(
            "invented-{solute:05},KCl,KCl,{t:.2},C,{value:.3},g/100g water,invented-a\n"
        ));
    }
    text
}

#[test]
fn a_large_import_writes_progress_lines_when_stderr_is_not_a_terminal() {
    let dir = tempfile::tempdir().unwrap();
    let (path, store) = database(dir.path());
    drop(store);
    std::fs::write(dir.path().join("many.csv"), many_rows(20_000)).unwrap();
    let output = assert_cmd::Command::new(env!("CARGO_BIN_EXE_satline"))
        .current_dir(dir.path())
        .env_remove("SATLINE_DB")
        .env("SATLINE_PROGRESS_EVERY_MS", "5")
        .args(["import", "--db"])
        .arg(&path)
        .arg("many.csv")
        .output()
        .unwrap();
    let stderr = String::from_utf8(output.stderr).unwrap();
    assert!(output.status.success(), "{stderr}");
    let lines: Vec<&str> = stderr.lines().collect();
    assert!(
        lines.iter().any(
            |l| l.starts_with("satline: import: planning 1 file (20000 CSV rows), ")
                || l.starts_with("satline: import: writing, ")
        ),
        "{stderr}"
    );
    assert!(
        lines
            .last()
            .is_some_and(|l| l.starts_with("satline: import: 20000 points written in ")),
        "{stderr}"
    );
    // Every row was stored.
    let stored = Store::open(&path).unwrap().read_all().unwrap();
    let points: usize = stored.datasets.iter().map(|d| d.points.len()).sum();
    assert_eq!(points, 20_000);
    assert_eq!(stored.solutes.len(), 200);
}
