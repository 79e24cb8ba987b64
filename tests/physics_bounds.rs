//! Regression tests for the bounds on the physics (each named after what it guards): every
//! statement here was once answered `ok: true` with an impossible number, or with a
//! message that contradicted the statement. Through the engine over the embedded database,
//! and one through the binary.

use std::sync::OnceLock;
use std::time::Instant;

use assert_cmd::Command;
use satline::answer::Answer;
use satline::engine::Engine;

/// One engine for every test of the file (the snapshot is immutable).
fn engine() -> &'static Engine {
    static ENGINE: OnceLock<Engine> = OnceLock::new();
    ENGINE.get_or_init(|| Engine::open_embedded().expect("the embedded database opens"))
}

/// The one answer to `text`, a single statement.
fn answer(engine: &Engine, text: &str) -> Answer {
    match engine.run_text(text, &mut engine.session()).as_slice() {
        [one] => one.clone(),
        many => panic!("{} answers to {text:?}", many.len()),
    }
}

/// The error message of a statement that must be refused.
fn refused(engine: &Engine, text: &str) -> String {
    let a = answer(engine, text);
    match a.error {
        Some(error) if !a.ok => error.message,
        _ => panic!("{text} answered: {:?}", a.rows),
    }
}

#[test]
fn extrapolation_stops_at_its_stated_reach() {
    let e = engine();
    for text in [
        "solubility of NaCl at 5000 C extrapolate",
        "solubility of NaCl at 1e308 C extrapolate",
        "heat of solution of KNO3 at 5000 C extrapolate",
        "solubility of KNO3 at 105 C extrapolate",
        "require KCl stays dissolved at 10 g/100g water from 20 C to 300 C extrapolate",
    ] {
        let message = refused(e, text);
        assert!(message.contains("may reach"), "{text}: {message}");
        assert!(!message.contains("inf"), "{text}: {message}");
        assert!(message.len() < 400, "{text}: {message}");
    }
    // `extrapolate` on a range is honoured, never answered with "add `extrapolate`".
    let a = answer(
        e,
        "require KCl stays dissolved at 10 g/100g water from -5 C to 20 C extrapolate",
    );
    assert!(a.ok, "{:?}", a.error);
    // Within reach it still answers, and says it extrapolated (CuSO4 data end at 80 C).
    let a = answer(e, "solubility of CuSO4 at 90 C extrapolate");
    assert!(a.ok, "{:?}", a.error);
    assert!(a.caveats.iter().any(|c| c.contains("extrapolated")));
}

#[test]
fn an_out_of_range_message_never_shows_an_infinite_temperature() {
    let message = refused(engine(), "solubility of NaCl at 1e308 C");
    assert!(!message.contains("inf C"), "{message}");
}

/// A huge number the user typed comes back in exponent form, not as hundreds of digits.
#[test]
fn a_refused_huge_number_is_shown_short() {
    let e = engine();
    for (text, shown) in [
        (
            "convert 1e300 mol/kg of NaCl to %w/w",
            "1e300 mol/kg is not a possible",
        ),
        (
            "dissolved O2 at 25 C under 1e12 bar",
            "partial pressure of 1e12 bar",
        ),
    ] {
        let message = refused(e, text);
        assert!(message.contains(shown), "{text}: {message}");
        assert!(message.len() < 300, "{text}: {message}");
    }
}

#[test]
fn a_huge_batch_is_shown_short_in_the_notes() {
    // 1e30 g of KNO3 in 1 kg of water: 9.89e27 mol/kg, which the notes once wrote out in
    // twenty-eight digits.
    let a = answer(engine(), "dissolving 1e30 g of KNO3 in 1 kg water at 20 C");
    assert!(a.ok, "{:?}", a.error);
    let notes = a.caveats.join("\n");
    assert!(notes.contains("at this batch's 9.89e27 mol/kg"), "{notes}");
    assert!(notes.contains("of the 1e30 g have dissolved"), "{notes}");
    assert!(!notes.contains("0000000000"), "{notes}");
    // And it stops where any batch beyond what the water takes stops: the water takes what
    // it takes of a 500 g batch (the path was once lost below 0 C by its first step).
    let modest = answer(engine(), "dissolving 500 g of KNO3 in 1 kg water at 20 C");
    assert!(modest.ok, "{:?}", modest.error);
    let final_row = |a: &satline::answer::Answer| {
        let r = a.rows[0].clone();
        assert_eq!(r.quantity.as_deref(), Some("final temperature"));
        assert_eq!(
            r.extra.get("dissolves_fully"),
            Some(&serde_json::json!(false))
        );
        r.value.expect("a final temperature")
    };
    assert_eq!(final_row(&a), final_row(&modest));
}

#[test]
fn a_plot_with_extrapolate_stops_at_the_reach_and_says_so() {
    let a = answer(engine(), "plot KCl from -5 C to 110 C extrapolate");
    assert!(a.ok, "{:?}", a.error);
    assert_eq!(a.rows[0].extra.get("to_c"), Some(&serde_json::json!(100.0)));
    assert!(
        a.caveats
            .iter()
            .any(|c| c.contains("extrapolation reaches only")),
        "{:?}",
        a.caveats
    );
}

#[test]
fn an_ice_line_never_goes_below_the_eutectic() {
    let e = engine();
    // NaCl: eutectic -21.1 C in its seed file (sodium-chloride.toml, freezing table).
    let a = answer(e, "freezing of NaCl at 1e6 g/100g water");
    assert!(a.ok, "{:?}", a.error);
    let t = a.rows[0].value.expect("a temperature");
    assert!((t - -21.1).abs() < 1e-9, "{t}");
    assert!(
        a.caveats
            .iter()
            .any(|c| c.contains("richer than the eutectic"))
    );
    // No freezing data, no activity model below 0 C: the ideal line is used only in the
    // dilute limit (issue 12), so a strong solution is refused with the reason.
    let message = refused(e, "freezing of KNO3 at 1e6 g/100g water");
    assert!(message.contains("dilute limit"), "{message}");
    // Dilute solutions keep their ideal answer.
    assert!(answer(e, "freezing of KCl at 0.5 g/100g water").ok);
}

#[test]
fn henrys_law_is_refused_at_extreme_pressure_and_flagged_at_high() {
    let e = engine();
    let message = refused(e, "dissolved O2 at 25 C under 100000 bar");
    assert!(message.contains("100 bar"), "{message}");
    let a = answer(e, "dissolved O2 at 25 C under 20 bar");
    assert!(a.ok, "{:?}", a.error);
    assert!(
        a.caveats.iter().any(|c| c.contains("overstates")),
        "{:?}",
        a.caveats
    );
    let a = answer(e, "dissolved O2 at 25 C under air");
    assert!(!a.caveats.iter().any(|c| c.contains("overstates")));
}

#[test]
fn a_gas_beyond_liquid_water_is_refused_without_contradicting_extrapolate() {
    let e = engine();
    let message = refused(e, "dissolved O2 at 500 C under air extrapolate");
    assert!(!message.contains("not requested"), "{message}");
    assert!(message.contains("critical point"), "{message}");
    let message = refused(e, "dissolved O2 at 120 C under air extrapolate");
    assert!(message.contains("boils"), "{message}");
}

#[test]
fn a_zero_loading_holds_trivially() {
    let e = engine();
    let a = answer(e, "which salts stay dissolved at 0 g/100g water at 5 C");
    assert!(a.ok, "{:?}", a.error);
    // Every salt with data at 5 C holds; none whose data cover 5 C is "no data".
    assert!(
        !a.rows.iter().any(|r| r
            .extra
            .get("reason")
            .is_some_and(|v| v.to_string().contains("cover 0 C to"))),
        "{:?}",
        a.rows
    );
    assert!(a.caveats.iter().any(|c| c.contains("holds trivially")));
    assert!(a.rows.iter().filter(|r| r.holds == Some(true)).count() > 20);
    let a = answer(e, "require KCl stays dissolved at 0 g/100g water at 5 C");
    assert_eq!(a.holds, Some(true));
}

#[test]
fn a_filter_value_is_checked_against_the_catalog() {
    let e = engine();
    let sulphate = answer(e, "list salts with anion sulphate");
    let sulfate = answer(e, "list salts with anion sulfate");
    assert!(sulphate.ok && !sulphate.rows.is_empty());
    assert_eq!(sulphate.rows.len(), sulfate.rows.len());
    assert!(
        sulphate
            .caveats
            .iter()
            .any(|c| c.contains("read as `sulfate`"))
    );
    let message = refused(e, "list salts with anion sulfat");
    assert!(
        message.contains("did you mean") && message.contains("sulfate"),
        "{message}"
    );
    let message = refused(
        e,
        "which salts with tag bananas stay dissolved at 10 g/100g water at 5 C",
    );
    assert!(message.contains("tag"), "{message}");
    assert!(answer(e, "list salts with tag fertilizer").ok);
}

#[test]
fn an_invisible_character_is_an_error_at_its_position() {
    let e = engine();
    let text = "solubility of KNO3 at\u{2060} 20 C";
    let a = answer(e, text);
    let error = a.error.expect("an error");
    assert_eq!(error.code, "invisible-character");
    assert_eq!((error.line, error.column), (1, 22));
    assert!(error.message.contains("U+2060"), "{}", error.message);
    let a = answer(e, "solubility of KNO3\u{200B} at 20 C");
    assert_eq!(a.error.expect("an error").column, 19);
}

#[test]
fn a_long_unknown_name_is_cut_in_its_message() {
    let e = engine();
    let text = format!("solubility of {} at 20 C", "X".repeat(1_000_000));
    let started = Instant::now();
    let message = refused(e, &text);
    // Not a speed target (those are benchmarks): a guard against a distance to every name
    // over the whole megabyte, which took seconds.
    assert!(started.elapsed().as_secs() < 30);
    assert!(message.len() < 300, "{} bytes", message.len());
    assert!(message.contains("1000000 characters"), "{message}");
}

#[test]
fn the_binary_refuses_an_unbounded_extrapolation_with_exit_1() {
    let output = Command::cargo_bin("satline")
        .expect("the binary")
        .args([
            "--format",
            "json",
            "solubility of NaCl at 5000 C extrapolate",
        ])
        .output()
        .expect("runs");
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(stdout.contains("\"ok\":false"), "{stdout}");
    assert_ne!(output.status.code(), Some(0), "{stdout}");
}

#[test]
fn a_screening_says_why_a_per_litre_figure_is_missing() {
    // ZnCl2's saturated solution (about 78 %w/w at 5 C) lies beyond the mass fractions its
    // density coefficients cover: its row keeps its verdict, without a figure in mol/L, and
    // the answer says why.
    let a = answer(
        engine(),
        "which salts with anion chloride stay dissolved at 2 mol/L from 5 C to 25 C",
    );
    assert!(a.ok, "{:?}", a.error);
    let json = serde_json::to_value(&a).unwrap();
    let rows = json["rows"].as_array().unwrap();
    let zinc = rows
        .iter()
        .find(|r| r["solute"] == "zinc chloride")
        .expect("a row for zinc chloride");
    assert_eq!(zinc["holds"], true);
    assert!(zinc.get("value").is_none(), "{zinc}");
    let note = a
        .caveats
        .iter()
        .find(|c| c.starts_with("no solubility in mol/L for "))
        .expect("the reason");
    assert!(note.contains("zinc chloride"), "{note}");
    assert!(
        note.contains("beyond the mass fractions their density coefficients cover"),
        "{note}"
    );
}
