//! Each `ParseErrorKind` variant's doc comment shows an input that triggers it: this test
//! reads those inputs from the source and checks that each fails with that very variant.

use satline::query::parse_script;

/// (variant name, script) pairs from the doc comments of `ParseErrorKind`. A doc that says
/// "`a` then `b`" is the two-line script `a` / `b`.
fn documented_inputs() -> Vec<(String, String)> {
    let source = include_str!("../src/query/error.rs");
    let body = &source[source.find("pub enum ParseErrorKind").expect("the enum")..];
    let mut found = Vec::new();
    let mut doc = String::new();
    for line in body.lines().map(str::trim) {
        if let Some(text) = line.strip_prefix("///") {
            doc.push_str(text);
            doc.push(' ');
        } else if line.starts_with("#[") || line.is_empty() {
            continue;
        } else if let Some(name) = line
            .split([' ', '{', ','])
            .next()
            .filter(|n| n.chars().next().is_some_and(char::is_uppercase))
        {
            if !doc.is_empty() {
                let script: Vec<&str> = doc
                    .split(" then ")
                    .filter_map(|part| part.rsplit(':').next())
                    .filter_map(|part| part.split('`').nth(1))
                    .collect();
                found.push((name.to_string(), script.join("\n")));
            }
            doc.clear();
        } else if line == "}" {
            break;
        }
    }
    found
}

#[test]
fn every_variant_is_triggered_by_its_documented_input() {
    let inputs = documented_inputs();
    assert!(inputs.len() >= 15, "found only {inputs:?}");
    for (variant, script) in inputs {
        let last = parse_script(&script).pop();
        let Some(Err(error)) = last else {
            panic!("{variant}: `{script}` did not fail");
        };
        let shown = format!("{:?}", error.kind);
        assert!(
            shown.starts_with(&variant),
            "{variant}: `{script}` failed with {shown}"
        );
    }
}

#[test]
fn the_crate_error_names_the_parse_stage() {
    let Some(Err(error)) = parse_script("solubilty of KNO3 at 20 C").pop() else {
        panic!()
    };
    let top = satline::Error::from(error);
    assert!(
        top.to_string().starts_with("parse: expected a statement"),
        "{top}"
    );
}
