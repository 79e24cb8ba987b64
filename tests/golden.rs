//! Golden tests: every `grammar/examples/*.satq` script is answered by the engine over the
//! embedded default database, and each answer is compared with the JSON line expected for
//! it in the `.expected` file beside the script.
//!
//! Floats are compared with a relative tolerance (`FLOAT_TOLERANCE`) so that a change in the
//! last printed digit of an interpolated value does not hide behind an exact text match,
//! while any real change in an answer fails with the script, the line and the field.
//!
//! To write the expected files anew after a deliberate change: `SATLINE_BLESS=1 cargo test
//! --test golden`, then read the diff before committing it.

use std::fs;
use std::path::{Path, PathBuf};

use satline::engine::Engine;
use serde_json::Value;

/// Relative tolerance for floats in golden answers.
const FLOAT_TOLERANCE: f64 = 1e-9;

fn examples() -> Vec<PathBuf> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("grammar/examples");
    let mut scripts: Vec<PathBuf> = fs::read_dir(&dir)
        .map(|entries| {
            entries
                .filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|p| p.extension().is_some_and(|x| x == "satq"))
                .collect()
        })
        .unwrap_or_default();
    scripts.sort();
    scripts
}

/// Compares two JSON values; returns the path of the first difference.
fn differs(expected: &Value, actual: &Value, path: &str) -> Option<String> {
    match (expected, actual) {
        (Value::Number(a), Value::Number(b)) => {
            let (a, b) = (a.as_f64()?, b.as_f64()?);
            let scale = a.abs().max(b.abs()).max(1e-300);
            ((a - b).abs() / scale > FLOAT_TOLERANCE)
                .then(|| format!("{path}: expected {a}, got {b}"))
        }
        (Value::Object(a), Value::Object(b)) => {
            for key in a.keys().chain(b.keys()) {
                let sub = format!("{path}.{key}");
                match (a.get(key), b.get(key)) {
                    (Some(x), Some(y)) => {
                        if let Some(d) = differs(x, y, &sub) {
                            return Some(d);
                        }
                    }
                    (Some(_), None) => return Some(format!("{sub}: missing")),
                    (None, Some(_)) => return Some(format!("{sub}: not expected")),
                    (None, None) => {}
                }
            }
            None
        }
        (Value::Array(a), Value::Array(b)) => {
            if a.len() != b.len() {
                return Some(format!(
                    "{path}: expected {} items, got {}",
                    a.len(),
                    b.len()
                ));
            }
            a.iter()
                .zip(b)
                .enumerate()
                .find_map(|(i, (x, y))| differs(x, y, &format!("{path}[{i}]")))
        }
        (a, b) => (a != b).then(|| format!("{path}: expected {a}, got {b}")),
    }
}

#[test]
fn example_scripts_give_their_golden_answers() {
    let scripts = examples();
    assert!(
        !scripts.is_empty(),
        "no example scripts in grammar/examples"
    );
    let engine = Engine::open(None).expect("embedded default database opens");
    let bless = std::env::var_os("SATLINE_BLESS").is_some();
    let mut failures = Vec::new();
    for script in &scripts {
        let text = fs::read_to_string(script).expect("script reads");
        let mut session = engine.session();
        let answers = engine.run_text(&text, &mut session);
        let actual: Vec<Value> = answers
            .iter()
            .map(|a| serde_json::to_value(a).expect("answer serialises"))
            .collect();
        let expected_path = script.with_extension("expected");
        if bless {
            let lines: Vec<String> = actual.iter().map(|v| v.to_string()).collect();
            fs::write(&expected_path, lines.join("\n") + "\n").expect("expected file writes");
            continue;
        }
        let expected_text = match fs::read_to_string(&expected_path) {
            Ok(t) => t,
            Err(e) => {
                failures.push(format!("{}: {e}", expected_path.display()));
                continue;
            }
        };
        let expected: Vec<Value> = expected_text
            .lines()
            .filter(|l| !l.trim().is_empty())
            .map(|l| serde_json::from_str(l).expect("expected file holds JSON lines"))
            .collect();
        if expected.len() != actual.len() {
            failures.push(format!(
                "{}: expected {} answers, got {}",
                script.display(),
                expected.len(),
                actual.len()
            ));
            continue;
        }
        for (index, (e, a)) in expected.iter().zip(&actual).enumerate() {
            if let Some(d) = differs(e, a, "answer") {
                failures.push(format!(
                    "{}:{}: `{}`: {d}",
                    script.display(),
                    answers[index].line,
                    answers[index].statement
                ));
            }
        }
    }
    assert!(
        failures.is_empty(),
        "golden mismatches:\n{}",
        failures.join("\n")
    );
}
