//! The grammar guide's examples and the example scripts run as tests: every `satq` block of
//! grammar/README.md and every script of grammar/examples/ parses, except the error
//! examples, each of which must fail.

use std::fs;
use std::path::Path;

use satline::query::{Statement, parse_script};

/// The bodies of the fenced blocks of `markdown` whose info string is exactly `info`.
fn blocks(markdown: &str, info: &str) -> Vec<String> {
    let mut found = Vec::new();
    let mut current: Option<String> = None;
    for line in markdown.lines() {
        match &mut current {
            None if line.trim() == format!("```{info}") => current = Some(String::new()),
            Some(body) if line.trim() == "```" => {
                found.push(std::mem::take(body));
                current = None;
            }
            Some(body) => {
                body.push_str(line);
                body.push('\n');
            }
            None => {}
        }
    }
    found
}

#[test]
fn every_guide_example_parses() {
    let guide = include_str!("../grammar/README.md");
    let examples = blocks(guide, "satq");
    assert!(examples.len() >= 14, "found {} blocks", examples.len());
    for block in &examples {
        for result in parse_script(block) {
            if let Err(e) = result {
                panic!("{}", e.render(block, "grammar/README.md"));
            }
        }
    }
}

#[test]
fn every_guide_error_example_fails() {
    let guide = include_str!("../grammar/README.md");
    let examples = blocks(guide, "satq-error");
    assert!(!examples.is_empty());
    for line in examples.iter().flat_map(|block| block.lines()) {
        let results = parse_script(line);
        assert_eq!(results.len(), 1, "{line}");
        assert!(results[0].is_err(), "{line} parsed");
    }
}

#[test]
fn example_scripts_parse_and_the_error_script_fails_throughout() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("grammar/examples");
    let mut seen = 0;
    let mut entries: Vec<_> = fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .collect();
    entries.sort();
    for path in entries {
        if path.extension().and_then(|e| e.to_str()) != Some("satq") {
            continue;
        }
        seen += 1;
        let text = fs::read_to_string(&path).unwrap();
        let name = path.file_name().unwrap().to_string_lossy().to_string();
        let results = parse_script(&text);
        assert!(!results.is_empty(), "{name} is empty");
        // The error script also holds statements that parse but cannot be answered (an
        // unknown solute, a temperature beyond the data): those must fail when answered.
        let engine = satline::engine::Engine::open_embedded().unwrap();
        for result in results {
            match (name.as_str(), result) {
                ("errors.satq", Ok(s)) => {
                    let fails_when_answered = !engine.run(&s, &text).ok;
                    assert!(
                        matches!(s.node, Statement::Let(_)) || fails_when_answered,
                        "{name}: {:?} parsed and was answered",
                        s.node
                    )
                }
                ("errors.satq", Err(_)) => {}
                (_, Ok(_)) => {}
                (_, Err(e)) => panic!("{}", e.render(&text, &name)),
            }
        }
    }
    assert!(seen >= 7, "only {seen} example scripts");
}

#[test]
fn the_error_script_reports_each_line() {
    let text = include_str!("../grammar/examples/errors.satq");
    let lines: Vec<usize> = parse_script(text)
        .into_iter()
        .filter_map(|r| r.err().map(|e| e.line_column(text).0))
        .collect();
    assert_eq!(lines, [2, 3, 4, 5, 6, 7, 8, 9]);
}

#[test]
fn the_guide_shows_what_the_renderer_draws() {
    let guide = include_str!("../grammar/README.md");
    let text = "describe NaCl\ndescribe KCl\nsolubility of KNO3 at 5 g/L\n";
    let error = parse_script(text)
        .pop()
        .and_then(Result::err)
        .expect("the third statement fails");
    let drawn = error.render(text, "script.satq");
    let shown = &blocks(guide, "text")[0];
    assert_eq!(&drawn, shown);
}
