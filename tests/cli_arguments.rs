//! Statements as command-line arguments on the real binary: words typed without quotes
//! form one statement; several statements typed one after another are told apart; words
//! that form no statement give one error and a hint to quote.

use std::process::Command;

fn satline(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_satline"))
        .args(args)
        .args(["--format", "json"])
        .output()
        .expect("satline runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn unquoted_words_are_one_statement() {
    let (code, out, err) = satline(&["solubility", "of", "KNO3", "at", "20", "C"]);
    assert_eq!(code, 0, "{err}");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines.len(), 1, "{out}");
    assert!(lines[0].contains(r#""statement":"solubility of KNO3 at 20 C""#));
    assert!(lines[0].contains(r#""value":31.6"#), "{out}");
}

#[test]
fn a_negative_temperature_is_a_number_not_a_flag() {
    let words = "freezing of NaCl at 10 g/100g water at -10 C";
    let args: Vec<&str> = words.split(' ').collect();
    let (code, out, err) = satline(&args);
    assert_eq!(code, 0, "{err}");
    assert_eq!(out.lines().count(), 1, "{out}");
}

#[test]
fn statements_typed_one_after_another_are_split() {
    let args: Vec<&str> = "describe NaCl solubility of KNO3 at 20 C"
        .split(' ')
        .collect();
    // `describe` first would be the `describe` command: begin with another statement.
    let (code, out, err) = satline(&args[2..]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(out.lines().count(), 1);
    let args: Vec<&str> = "sources of NaCl solubility of KNO3 at 20 C"
        .split(' ')
        .collect();
    let (code, out, err) = satline(&args);
    assert_eq!(code, 0, "{err}");
    assert_eq!(out.lines().count(), 2, "{out}");
}

#[test]
fn words_that_form_no_statement_give_one_error_and_a_hint() {
    let args: Vec<&str> = "solubility of KNO3 at 20 g/L".split(' ').collect();
    let (code, out, err) = satline(&args);
    assert_eq!(code, 2);
    assert_eq!(
        out.lines().count(),
        1,
        "one answer, not one per word: {out}"
    );
    assert_eq!(err.matches("parse error").count(), 1, "{err}");
    assert!(err.contains("quote each one"), "{err}");
}
