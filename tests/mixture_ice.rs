//! The ice line of a recipe of several solutes from their own freezing points (the
//! Zdanovskii–Stokes–Robinson rule, `science::mixture_ice`): against Pitzer's equations for
//! the mixture as PyPI pytzer computes them (`tests/reference/mixture_ice_pytzer.json`,
//! written by `fixtures_mixture_ice.py`), and in the answers of recipes no parameter system
//! holds below 0 °C.

use satline::answer::Answer;
use satline::engine::Engine;
use satline::model::{FreezingData, Provenance, Review};
use satline::science::formula::molar_mass;
use satline::science::freezing::System;
use satline::science::mixture_ice::{Alone, MixtureIce, Part, ice_line};
use serde_json::Value;

fn run(statement: &str) -> Answer {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    engine.run_text(statement, &mut session).remove(0)
}

/// The model's freezing curve of one salt as a freezing table in mass fraction.
fn table(salt: &str, rows: &Value) -> FreezingData {
    let m_salt = molar_mass(salt).unwrap();
    let points = rows
        .as_array()
        .unwrap()
        .iter()
        .map(|r| {
            let (m, t) = (r[0].as_f64().unwrap(), r[1].as_f64().unwrap());
            (m * m_salt / (1000.0 + m * m_salt), t)
        })
        .collect();
    FreezingData {
        key: salt.into(),
        solute: salt.into(),
        source: "pytzer".into(),
        points,
        eutectic: None,
        provenance: Provenance::Derived,
        review: Review::Unreviewed,
    }
}

/// Fed the model's own freezing curves of each salt alone, the rule gives the model's
/// freezing point of the mixture within 0.1 K (largest found: 0.050 K, 1.5 NaCl + 1.0 KCl
/// mol/kg, −8.478 °C by the model, −8.528 °C by the rule); what it leaves out is how the
/// ions of the two salts act on each other (the mixing terms θ, ψ and the unequal ionic
/// strengths), small for these pairs. Source: pytzer 0.6.0 with the parameter functions
/// named in the fixture script.
#[test]
fn the_rule_beside_pitzers_equations_for_chloride_pairs() {
    let text = include_str!("reference/mixture_ice_pytzer.json");
    let data: Value = serde_json::from_str(text).unwrap();
    let mut worst: f64 = 0.0;
    for system in data["systems"].as_array().unwrap() {
        let salts: Vec<&str> = system["salts"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s.as_str().unwrap())
            .collect();
        let tables: Vec<FreezingData> = salts
            .iter()
            .map(|s| table(s, &system["binaries"][*s]))
            .collect();
        for case in system["mixtures"].as_array().unwrap() {
            let parts: Vec<Part> = salts
                .iter()
                .zip(&tables)
                .map(|(salt, d)| Part {
                    alone: Alone::Table(System {
                        curve: None,
                        molar_mass: molar_mass(salt).unwrap(),
                        ions: if *salt == "MgCl2" { 3 } else { 2 },
                        data: Some(d),
                        models: &[],
                    }),
                    molality: case["molalities"][*salt].as_f64().unwrap(),
                })
                .collect();
            let Ok(MixtureIce::At(t_k)) = ice_line(&parts) else {
                panic!("{case}: not answered")
            };
            let model = case["freezing_k"].as_f64().unwrap();
            let diff = (t_k - model).abs();
            assert!(
                diff < 0.1,
                "{}: {case}: {t_k} K by the rule, {model} K by the model",
                system["key"]
            );
            worst = worst.max(diff);
        }
    }
    // The figure the caveat and this test's doc quote.
    assert!(worst > 0.04 && worst < 0.06, "{worst}");
}

/// A de-icing brine of sodium and calcium chloride (no parameter system holds them below
/// 0 °C) had no ice line beyond the dilute limit; now it freezes below each salt's own
/// ice line at its amount alone in the water, and above that of their sum as one salt.
#[test]
fn a_de_icing_brine_of_two_chlorides_has_an_ice_line() {
    let both = run("freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2");
    assert!(both.ok, "{:?}", both.error);
    let t = both.rows[0].value.unwrap();
    // NaCl alone at 15/80 of the water: 18.75 g/100g water; CaCl2 alone 6.25.
    let nacl = run("freezing of NaCl at 18.75 g/100g water");
    let cacl2 = run("freezing of CaCl2 at 6.25 g/100g water");
    let ice = |a: &Answer| {
        a.rows
            .iter()
            .find(|r| r.quantity.as_deref() == Some("ice appears on cooling below"))
            .and_then(|r| r.value)
            .unwrap_or_else(|| panic!("{:?}", a.rows))
    };
    assert!(t < ice(&nacl) && t < ice(&cacl2), "{t}");
    assert!(
        both.caveats
            .iter()
            .any(|c| c.contains("Zdanovskii–Stokes–Robinson"))
    );
    // The same brine asked over a winter: ice decides, at the same temperature.
    let winter =
        run("require recipe 15 %w/w NaCl, 5 %w/w CaCl2 stays dissolved from -25 C to 30 C");
    assert_eq!(winter.holds, Some(false));
    assert_eq!(winter.rows[0].value, Some(t));
    // From above the ice line it holds.
    let mild = run("require recipe 15 %w/w NaCl, 5 %w/w CaCl2 stays dissolved from -10 C to 30 C");
    assert_eq!(mild.holds, Some(true), "{:?}", mild.error);
}

/// Where a solute has no freezing points and is not dilute, or the line falls below where
/// a solute's points end, the reason is said and nothing is guessed.
#[test]
fn the_rule_says_what_it_lacks() {
    let urea = run("freezing of recipe 35 %w/w urea, 45 %w/w ammonium nitrate");
    assert!(!urea.ok);
    let message = urea.error.map(|e| e.message).unwrap_or_default();
    assert!(message.contains("urea has no freezing points"), "{message}");
    let strong = run("freezing of recipe 20 %w/w NaCl, 10 %w/w CaCl2");
    assert!(!strong.ok);
    let message = strong.error.map(|e| e.message).unwrap_or_default();
    assert!(message.contains("still liquid at -21.1 C"), "{message}");
    // Ice forms at -16.85 C, but below -21.1 C NaCl's freezing points cannot follow it.
    let deep = run("freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2 at -25 C");
    let message = deep.error.map(|e| e.message).unwrap_or_default();
    assert!(
        message.contains("followed only down to -21.1 C, where the freezing points of NaCl end"),
        "{message}"
    );
}

fn row<'a>(a: &'a Answer, solute: &str, quantity: &str) -> &'a satline::answer::Row {
    a.rows
        .iter()
        .find(|r| r.solute.as_deref() == Some(solute) && r.quantity.as_deref() == Some(quantity))
        .unwrap_or_else(|| panic!("no {quantity} row for {solute}: {:?}", a.rows))
}

fn extra(r: &satline::answer::Row, key: &str) -> f64 {
    r.extra
        .get(key)
        .and_then(Value::as_f64)
        .unwrap_or_else(|| panic!("no {key}: {r:?}"))
}

/// Into the freezer with no parameter system: the ice takes the water the rule says, the
/// liquid keeps every solute (mass balance), and a trace of a second solute leaves the
/// answer of the main one alone (`freezing of NaCl at 15 %w/w at -20 C`: 39.45 % of the
/// water frozen, from NaCl's own freezing points).
#[test]
fn a_brine_in_the_freezer_follows_its_solutes_freezing_points() {
    let brine = run("freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2 at -20 C");
    assert!(brine.ok, "{:?}", brine.error);
    let onset = run("freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2");
    let ice = row(&brine, "ice", "ice");
    assert_eq!(Some(extra(ice, "ice_line_c")), onset.rows[0].value);
    let frozen = extra(ice, "water_frozen_pct") / 100.0;
    assert!(frozen > 0.05 && frozen < 0.5, "{frozen}");
    // NaCl: 15 g in 80 g of water is 3.2083 mol/kg; in the water left, 3.2083/(1 − frozen).
    let nacl = row(&brine, "sodium chloride", "in the liquid")
        .value
        .unwrap();
    let by_hand = 15.0 / 80.0 * 1000.0 / 58.443 / (1.0 - frozen);
    assert!((nacl - by_hand).abs() / by_hand < 2e-3, "{nacl} {by_hand}");
    assert_eq!(
        row(&brine, "sodium chloride", "crystallised").value,
        Some(0.0)
    );

    let trace = run("freezing of recipe 15 %w/w NaCl, 0.01 %w/w KCl at -20 C");
    let alone = run("freezing of NaCl at 15 %w/w at -20 C");
    let trace_frozen = extra(row(&trace, "ice", "ice"), "water_frozen_pct");
    // The single solute's answer gives ice as % of the water.
    let alone_frozen = row(&alone, "sodium chloride", "ice").value.unwrap();
    assert!(
        (trace_frozen - alone_frozen).abs() < 0.1,
        "{trace_frozen} {alone_frozen}"
    );
}

/// A brine richer in NaCl than its eutectic: its dihydrate comes out on cooling, where
/// NaCl's own curve reaches the recipe's amount (24 g in 74 g of water, 32.43 g/100g
/// water), before any ice.
#[test]
fn a_salt_comes_out_of_a_rich_brine_before_ice() {
    let rich = run("freezing of recipe 24 %w/w NaCl, 2 %w/w CaCl2 at -15 C");
    assert!(rich.ok, "{:?}", rich.error);
    let first = row(&rich, "sodium chloride", "first salt on cooling");
    assert_eq!(first.phase.as_deref(), Some("NaCl·2H2O"));
    let t = first.temperature_c.unwrap();
    let there = run(&format!("solubility of NaCl at {t} C"));
    let s = there.rows[0].value.unwrap();
    assert!((s - 2400.0 / 74.0).abs() < 0.05, "{s} at {t} C");
    assert!(row(&rich, "sodium chloride", "crystallised").value.unwrap() > 0.0);
    assert_eq!(row(&rich, "ice", "ice").value, Some(0.0));
}
