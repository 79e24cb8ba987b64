//! Tables for people on the real binary: at 80 columns every line of every example
//! script's answers fits; a quantity every row shares is a heading, not a column; units in
//! headings are spelled as the trade writes them; notes are shown once and then referred
//! to; sources are short references with the full citations a flag away; and written to a
//! pipe, the full text.

use std::path::Path;
use std::process::Command;

fn satline(args: &[&str]) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_satline"))
        .args(args)
        .output()
        .expect("satline runs");
    String::from_utf8(out.stdout).expect("UTF-8 output")
}

fn example_scripts() -> Vec<String> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("grammar/examples");
    let mut scripts: Vec<String> = std::fs::read_dir(dir)
        .expect("examples directory")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "satq"))
        .map(|p| p.display().to_string())
        .collect();
    scripts.sort();
    scripts
}

#[test]
fn every_example_answer_fits_80_columns() {
    let mut too_wide = Vec::new();
    let mut lines = 0;
    for script in example_scripts() {
        let out = satline(&["--width", "80", "run", &script]);
        for line in out.lines() {
            lines += 1;
            let width = line.chars().count();
            if width > 80 {
                too_wide.push(format!("{script}: {width}: {line}"));
            }
        }
    }
    assert!(lines > 1000, "the examples gave only {lines} lines");
    assert!(
        too_wide.is_empty(),
        "{} lines wider than 80 columns:\n{}",
        too_wide.len(),
        too_wide.join("\n")
    );
}

#[test]
fn the_widest_answers_of_a_first_try_fit_80_columns() {
    let statements = [
        "solubility of KNO3 at 20 C",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
        "require KCl stays dissolved at 20 g/100g water from 2 C to 8 C margin 10%",
        "dissolved oxygen at 4 C in mg/L under air",
        "heat of solution of KNO3 at 25 C",
        "describe NaCl",
        "sources of KCl",
        "solubility of KNO3 at 5 g/L",
    ];
    let mut args = vec!["--width", "80"];
    args.extend(statements);
    let out = satline(&args);
    let widest = out.lines().map(|l| l.chars().count()).max().unwrap_or(0);
    assert!(widest <= 80, "widest line {widest}:\n{out}");
    // The same at 160 columns may use more, never more than 160.
    let mut args = vec!["--width", "160"];
    args.extend(statements);
    let out = satline(&args);
    let widest = out.lines().map(|l| l.chars().count()).max().unwrap_or(0);
    assert!(widest <= 160 && widest > 80, "widest line at 160: {widest}");
}

#[test]
fn a_shared_quantity_is_a_heading_and_units_are_spelled_right() {
    let out = satline(&[
        "--width",
        "80",
        "which salts with anion sulfate stay dissolved at 30 g/100g water from 2 C to 8 C",
        "dissolved O2 at 25 C under air",
    ]);
    let table_lines: Vec<&str> = out.lines().filter(|l| l.starts_with('│')).collect();
    // The quantity is said once, above the table, not in every row.
    assert_eq!(
        out.matches("solubility at the limiting temperature")
            .count(),
        1,
        "{out}"
    );
    assert!(
        table_lines
            .iter()
            .all(|l| !l.contains("solubility at the limiting")),
        "{out}"
    );
    for heading in [
        "°C",
        "headroom %",
        "g/100g water",
        "mL(STP)/L",
        "partial pressure kPa",
    ] {
        assert!(out.contains(heading), "no `{heading}` in:\n{out}");
    }
    for old in [
        "at C",
        "ml stp per l",
        "partial pressure kpa",
        "headroom pct",
    ] {
        assert!(!out.contains(old), "`{old}` still in:\n{out}");
    }
}

#[test]
fn notes_are_shown_once_and_sources_are_short() {
    let out = satline(&[
        "--width",
        "80",
        "solubility of KNO3 at 20 C",
        "solubility of KNO3 at 40 C",
    ]);
    assert_eq!(out.matches("typed from memory").count(), 1, "{out}");
    assert!(out.contains("notes 1-4 as above"), "{out}");
    assert!(
        out.contains("Perry et al. 1997 [perry-7-solubility]"),
        "{out}"
    );
    assert!(
        !out.contains("McGraw-Hill"),
        "a full citation on a terminal:\n{out}"
    );
    // --full gives the full text on every answer.
    let full = satline(&[
        "--width",
        "80",
        "--full",
        "solubility of KNO3 at 20 C",
        "solubility of KNO3 at 40 C",
    ]);
    assert_eq!(full.matches("typed from memory").count(), 2, "{full}");
    assert_eq!(full.matches("McGraw-Hill").count(), 2, "{full}");
}

#[test]
fn a_pipe_gets_the_full_text() {
    let out = satline(&["solubility of KNO3 at 20 C", "solubility of KNO3 at 40 C"]);
    assert_eq!(out.matches("typed from memory").count(), 2, "{out}");
    assert_eq!(out.matches("McGraw-Hill").count(), 2, "{out}");
    assert!(!out.contains("left out"), "{out}");
    // And the numbers are the same as in JSON.
    assert!(out.contains("31.6") && out.contains("63.9"), "{out}");
}
