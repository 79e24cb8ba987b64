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
