//! Large and faulty CSV imports: a value outside the sane range of its unit is named by its
//! CSV line and column; a large import run with standard error not a terminal writes plain
//! progress lines; a large import plans and writes every row (the speed target itself is the
//! `import` criterion benchmark, never a timed test here).
//!
//! Every solute, source and number here is INVENTED test data, not reference values.

use std::path::{Path, PathBuf};

use satline::store::{ImportFile, ImportOptions, Store, StoreError, init_empty};

const HEADER: &str = "solute,formula,phase,temperature,temperature_unit,value,unit,source";

const SOURCES: &str = r#"
[[source]]
key = "invented-a"
kind = "other"
title = "Invented table A (test data)"
authors = "nobody"
"#;

fn file(path: &str, text: &str) -> ImportFile {
    ImportFile {
        path: path.to_string(),
        text: text.to_string(),
    }
}

/// A file database with the invented source, in `dir`.
fn database(dir: &Path) -> (PathBuf, Store) {
    let path = dir.join("rows.db");
    init_empty(&path, "test", false).unwrap();
    let mut store = Store::open(&path).unwrap();
    let plan = store
        .plan_import(&[file("sources.toml", SOURCES)], &ImportOptions::default())
        .unwrap();
    store.apply_import(&plan, "test", &mut || {}).unwrap();
    (path, store)
}

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
