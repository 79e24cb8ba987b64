//! The phrasings people type on a first try: each must give exactly the answer of the
//! statement written the canonical way (rows, caveats and sources; only the statement's
//! own text differs), and the few that stay ambiguous are refused with a hint.

use satline::engine::Engine;
use serde_json::Value;

/// The answer's JSON without the fields that echo the statement as written.
fn answer_of(engine: &Engine, text: &str) -> Value {
    let mut session = engine.session();
    let answers = engine.run_text(text, &mut session);
    let last = answers.last().expect("one answer at least");
    let mut value = serde_json::to_value(last).expect("answer serialises");
    let object = value.as_object_mut().expect("an answer is an object");
    object.remove("statement");
    object.remove("line");
    value
}

const SAME: &[(&str, &str)] = &[
    (
        "freezing point of NaCl at 10 g/100g water",
        "freezing of NaCl at 10 g/100g water",
    ),
    (
        "which salts stay dissolved at 30 g/100g water between 2 C and 8 C",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C",
    ),
    (
        "which salts stay dissolved at 30 g/100g water 2-8 C",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C",
    ),
    ("ceiling of KCl 2–8 °C", "ceiling of KCl from 2 C to 8 C"),
    (
        "ceiling of KCl from 2 to 8 C",
        "ceiling of KCl from 2 C to 8 C",
    ),
    (
        "ceiling of KCl between 2 and 8 C margin 10%",
        "ceiling of KCl from 2 C to 8 C margin 10%",
    ),
    (
        "require KCl stays dissolved at 20 g/100g water at 2 to 8 C",
        "require KCl stays dissolved at 20 g/100g water from 2 C to 8 C",
    ),
    (
        "require KCl stays dissolved at 20 g/100g water margin 10% from 2 C to 8 C",
        "require KCl stays dissolved at 20 g/100g water from 2 C to 8 C margin 10%",
    ),
    ("solubility of KNO3 at 5 °C", "solubility of KNO3 at 5 C"),
    ("solubility of KNO3 at 5 ° C", "solubility of KNO3 at 5 C"),
    ("solubility of KNO3 at 5 ℃", "solubility of KNO3 at 5 C"),
    ("solubility of KNO3 at 5 ºC", "solubility of KNO3 at 5 C"),
    (
        "solubility of KNO3 at 41 deg F",
        "solubility of KNO3 at 41 F",
    ),
    (
        "solubility of KNO3 in mol/kg at 20 C",
        "solubility of KNO3 at 20 C in mol/kg",
    ),
    (
        "dissolved O2 at 25 C under air in ppm",
        "dissolved O2 at 25 C under air in ppm w/w",
    ),
    (
        "convert 10 %w/w of NaCl to ppm",
        "convert 10 %w/w of NaCl to mg/kg",
    ),
    (
        "max of KCl from 2 C to 8 C",
        "ceiling of KCl from 2 C to 8 C",
    ),
    (
        "maximum loading of KCl from 2 C to 8 C in mol/kg",
        "ceiling of KCl from 2 C to 8 C in mol/kg",
    ),
    (
        "max safe loading of KCl 2-8 C margin 10%",
        "ceiling of KCl from 2 C to 8 C margin 10%",
    ),
    (
        "dissolved oxygen at 4 C in mg/L under air",
        "dissolved oxygen at 4 C under air in mg/L",
    ),
    (
        "dissolved oxygen under air at 4 C",
        "dissolved oxygen at 4 C under air",
    ),
    (
        "dissolved O2 under air at 2 bar in mg/L at 4 C",
        "dissolved O2 at 4 C under air at 2 bar",
    ),
    (
        "saturation of KNO3 in F at 40 g/100g water",
        "saturation of KNO3 at 40 g/100g water in F",
    ),
    (
        "let cold = 2-8 C\nceiling of KCl over cold",
        "ceiling of KCl from 2 C to 8 C",
    ),
    (
        "let cold = between 2 and 8 C\nceiling of KCl over cold",
        "ceiling of KCl from 2 C to 8 C",
    ),
    ("plot KCl 0-40 C", "plot KCl from 0 C to 40 C"),
    (
        "which salts stay dissolved at 20 g/100g water from -5 to 8 C",
        "which salts stay dissolved at 20 g/100g water from -5 C to 8 C",
    ),
];

#[test]
fn each_phrasing_gives_the_canonical_answer() {
    let engine = Engine::open(None).expect("embedded database opens");
    let mut failures = Vec::new();
    for (phrasing, canonical) in SAME {
        let got = answer_of(&engine, phrasing);
        let want = answer_of(&engine, canonical);
        if got["ok"] != Value::Bool(true) {
            failures.push(format!("`{phrasing}` was not answered: {}", got["error"]));
        } else if got != want {
            failures.push(format!("`{phrasing}` differs from `{canonical}`"));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn ambiguous_or_wrong_phrasings_are_refused_with_their_reason() {
    let engine = Engine::open(None).expect("embedded database opens");
    let cases = [
        // Over a range the largest solubility is not the largest safe loading.
        ("max solubility of KCl at 5 C", "loading"),
        // A range written backwards, however it is written.
        ("ceiling of KCl 8-2 C", "lower temperature first"),
        (
            "ceiling of KCl between 8 and 2 C",
            "lower temperature first",
        ),
        // The unit written once must be a temperature's.
        ("ceiling of KCl from 2 to 8", "no unit"),
        ("ceiling of KCl from 2 to 8 bar", "pressure"),
        // An amount in bare ppm still does not say its basis.
        ("which salts stay dissolved at 10 ppm at 5 C", "ppm w/w"),
        // `2 -8 C` is not a range (the dash touches only the second number).
        ("ceiling of KCl 2 -8 C", "expected"),
    ];
    for (text, needle) in cases {
        let got = answer_of(&engine, text);
        assert_eq!(got["ok"], Value::Bool(false), "`{text}` should be refused");
        let message = got["error"]["message"].as_str().unwrap_or_default();
        assert!(
            message.contains(needle),
            "`{text}`: message `{message}` lacks `{needle}`"
        );
    }
}

#[test]
fn a_name_with_a_number_and_a_dash_stays_a_name() {
    use satline::query::{Statement, parse_script};
    // `2-propanol` is a name, never the range `2` to `-propanol`; `2-8` is a range.
    let parsed = parse_script("describe 2-propanol");
    match &parsed[0] {
        Ok(located) => match &located.node {
            Statement::Describe(d) => assert_eq!(d.solute.text, "2-propanol"),
            other => panic!("not a describe: {other:?}"),
        },
        Err(e) => panic!("{e:?}"),
    }
    let parsed = parse_script("ceiling of KCl 2-8 C");
    match &parsed[0] {
        Ok(located) => match &located.node {
            Statement::Ceiling(c) => assert_eq!(c.solute.text, "KCl"),
            other => panic!("not a ceiling: {other:?}"),
        },
        Err(e) => panic!("{e:?}"),
    }
}
