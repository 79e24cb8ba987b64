//! The parser never panics: arbitrary text, soups of the language's own words, mutated
//! acceptance statements and very long input all come back as statements or errors, and
//! every error span lies inside the text on character boundaries.

use proptest::prelude::*;
use satline::query::{Env, parse_script, parse_with};

const ACCEPTANCE: &str = include_str!("../grammar/examples/acceptance.satq");

const WORDS: &[&str] = &[
    "solubility",
    "which",
    "saturation",
    "ceiling",
    "heat",
    "dissolved",
    "freezing",
    "convert",
    "describe",
    "sources",
    "list",
    "let",
    "require",
    "plot",
    "loading",
    ",",
    "KCl,",
    "of",
    "at",
    "from",
    "to",
    "in",
    "over",
    "stay",
    "stays",
    "under",
    "margin",
    "extrapolate",
    "reviewed",
    "only",
    "as",
    "with",
    "and",
    "solution",
    "temperature",
    "salts",
    "solutes",
    "gases",
    "molecular",
    "cation",
    "anion",
    "tag",
    "element",
    "source",
    "air",
    "KNO3",
    "Na2SO4·10H2O",
    "(NH4)2SO4",
    "potassium",
    "nitrate",
    "cold",
    "fridge",
    "=",
    ";",
    "#",
    "\n",
    "20",
    "-10",
    "1.5",
    "1e999",
    "-300",
    ".5",
    "5e",
    "C",
    "°C",
    "K",
    "F",
    "°F",
    "g/100g",
    "water",
    "%w/w",
    "%",
    "10%",
    "mol/kg",
    "mmol/kg",
    "x",
    "g/L",
    "mol/L",
    "mg/L",
    "mg/kg",
    "bar",
    "atm",
    "kPa",
    "Pa",
    "psi",
    "mmHg",
    "torr",
    "ü",
    "日本",
    "\t",
    "\r",
    "\u{a0}",
    "",
    "-",
    "+",
    "·",
];

fn check(text: &str) {
    let mut env = Env::new();
    for result in parse_with(text, &mut env) {
        match result {
            Ok(statement) => {
                assert!(statement.span.end <= text.len());
                assert!(text.is_char_boundary(statement.span.start));
                assert!(text.is_char_boundary(statement.span.end));
            }
            Err(error) => {
                let span = error.span;
                assert!(span.start <= span.end && span.end <= text.len(), "{span:?}");
                assert!(text.is_char_boundary(span.start) && text.is_char_boundary(span.end));
                let shown = error.render(text, "prop.satq");
                assert!(shown.starts_with("» "), "{shown}");
                assert!(shown.contains("prop.satq, line "), "{shown}");
                let _ = error.line_column(text);
            }
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    #[test]
    fn arbitrary_text(text in any::<String>()) {
        check(&text);
    }

    #[test]
    fn soups_of_the_languages_words(
        picks in prop::collection::vec((0..WORDS.len(), 0..4usize), 0..40)
    ) {
        let separators = [" ", "", "  ", "\t"];
        let text: String = picks
            .iter()
            .map(|(w, s)| format!("{}{}", WORDS[*w], separators[*s]))
            .collect();
        check(&text);
    }

    #[test]
    fn mutated_acceptance_statements(
        line in 0..17usize,
        cut_at in 0..200usize,
        insert in prop::sample::select(WORDS),
        drop in 0..6usize,
    ) {
        let statement = ACCEPTANCE.lines().nth(line).unwrap_or("");
        let mut at = cut_at.min(statement.len());
        while !statement.is_char_boundary(at) {
            at -= 1;
        }
        let mut end = (at + drop).min(statement.len());
        while !statement.is_char_boundary(end) {
            end += 1;
        }
        let text = format!("{}{}{}", &statement[..at], insert, &statement[end..]);
        check(&text);
    }
}

#[test]
fn very_long_input() {
    let long_name = "potassium ".repeat(100_000);
    check(&format!("solubility of {long_name} at 20 C"));
    check(&format!("solubility of KNO3 at {} C", "9".repeat(100_000)));
    check(&format!(
        "list salts with {}tag x",
        "tag a and ".repeat(50_000)
    ));
    check(&"solubility of KNO3 at 20 C;".repeat(20_000));
    check(&"ü".repeat(200_000));
    check(&format!("describe {}", "x".repeat(1_000_000)));
    check(&"\n".repeat(100_000));
}

#[test]
fn the_acceptance_set_survives_every_truncation() {
    for statement in ACCEPTANCE.lines() {
        for (at, _) in statement.char_indices() {
            check(&statement[..at]);
            check(&statement[at..]);
        }
    }
    assert!(!parse_script(ACCEPTANCE).is_empty());
}
