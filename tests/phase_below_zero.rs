//! Answers below 0 °C, worked from the seed: the ice line and the first solid, the
//! freeze-concentration path, ranges reaching below 0 °C, refusals with a reason, and the
//! hydrate basis of a loading.

use satline::answer::Answer;
use satline::engine::Engine;

fn run(statement: &str) -> Answer {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    engine.run_text(statement, &mut session).remove(0)
}

fn row_value(a: &Answer, quantity: &str) -> Option<f64> {
    a.rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some(quantity))
        .and_then(|r| r.value)
}

fn first_solid(a: &Answer) -> (String, bool, Option<f64>) {
    let r = a
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("first solid on cooling"))
        .unwrap();
    (
        r.extra["first"].as_str().unwrap().to_string(),
        r.extra["solid_at_temperature"].as_bool().unwrap(),
        r.temperature_c,
    )
}

#[test]
fn strong_calcium_chloride_brine_stays_liquid_to_near_its_eutectic() {
    // Seed: Melinder 2010 freezing points to 29 %w/w; eutectic 29.8 %w/w at −49.8 C.
    let a = run("freezing of CaCl2 at 30 %w/w at -25 C");
    assert!(a.ok, "{:?}", a.error);
    // 30 %w/w is beyond the eutectic composition: no ice line above −45 C (none at all).
    assert!(row_value(&a, "ice appears on cooling below").is_none_or(|t| t < -45.0));
    let (first, solid, at) = first_solid(&a);
    assert_eq!(first, "salt");
    assert!(!solid);
    assert!(at.unwrap() < -45.0 && at.unwrap() > -49.8, "{at:?}");
}

#[test]
fn ice_line_and_solid_at_temperature_agree() {
    // 20 %w/w: Melinder's freezing point −18.26 C (tabulated).
    let a = run("freezing of CaCl2 at 20 %w/w at -25 C");
    let ice = row_value(&a, "ice appears on cooling below").unwrap();
    assert!((ice + 18.26).abs() < 0.01, "{ice}");
    let (first, solid, at) = first_solid(&a);
    assert_eq!(first, "ice");
    assert!(solid);
    assert_eq!(at, Some(ice));
    let a = run("freezing of CaCl2 at 20 %w/w at -10 C");
    assert!(!first_solid(&a).1);
}

#[test]
fn freeze_concentration_of_sodium_chloride() {
    // 10 g/100g water = 9.09 %w/w; CRC ice line: 9 % −5.81 C, 10 % −6.56 C. At −15 C the
    // liquid is where the ice line is −15 C: between 18 % (−14.04) and 20 % (−16.46).
    let a = run("freezing of NaCl at 10 g/100g water at -15 C");
    assert!(a.ok, "{:?}", a.error);
    let ice = row_value(&a, "ice appears on cooling below").unwrap();
    assert!(ice < -5.81 && ice > -6.56, "{ice}");
    let liquid = row_value(&a, "liquid left").unwrap(); // g/100g water
    let w_liquid = liquid / (100.0 + liquid);
    assert!(w_liquid > 0.18 && w_liquid < 0.20, "{w_liquid}");
    // Lever rule, by hand: ice share of the water = 1 − r/r_liquid with r = 10 g/100g.
    let ice_share = row_value(&a, "ice").unwrap();
    let want = (1.0 - 10.0 / liquid) * 100.0;
    assert!(
        (ice_share - want).abs() < 0.05,
        "{ice_share} against {want}"
    );
    assert!(
        a.caveats
            .iter()
            .any(|c| c.contains("no salt crystallises above the eutectic at -21.1 C"))
    );
    // Below the eutectic everything is solid.
    let a = run("freezing of NaCl at 10 g/100g water at -25 C");
    assert!(first_solid(&a).1);
    assert!(row_value(&a, "liquid left").is_none());
}

#[test]
fn a_range_below_zero_is_answered_from_the_eutectic_up() {
    let a = run("require NH4NO3 stays dissolved at 25 %w/w from -5 C to 30 C");
    assert!(a.ok, "{:?}", a.error);
    assert_eq!(a.holds, Some(true));
    assert!(a.caveats.iter().any(|c| c.contains("whether ice forms")));
    let a = run("require NaCl stays dissolved at 10 %w/w from -10 C to 30 C");
    assert!(a.ok);
    assert_eq!(a.holds, Some(false));
    assert!(a.caveats.iter().any(|c| c.contains(
        "does not hold: ice forms below -6.56 C; no salt crystallises above the eutectic at -21.1 C"
    )));
    // No ice in the range: the salt decides.
    let a = run("require NaCl stays dissolved at 10 %w/w from -5 C to 30 C");
    assert_eq!(a.holds, Some(true));
    // KCl reaches its eutectic (−10.7 C) through its eutectic point.
    let a = run("solubility of KCl at -5 C");
    assert!(a.ok, "{:?}", a.error);
}

#[test]
fn beyond_every_source_the_ice_line_is_refused_with_a_reason() {
    // KCl: only the eutectic is tabulated; its Pitzer sets start at 0 C; 15 %w/w is far
    // from dilute.
    let a = run("freezing of KCl at 15 %w/w");
    assert!(!a.ok);
    let message = a.error.unwrap().message;
    assert!(message.contains("dilute limit"), "{message}");
    // Dilute: the ideal formula, said so.
    let a = run("freezing of KCl at 0.1 %w/w");
    assert!(a.ok);
    assert!(a.caveats.iter().any(|c| c.contains("ideal")));
}

#[test]
fn a_hydrate_named_loading_is_read_on_its_basis() {
    let a = run("require Na2HPO4·12H2O stays dissolved at 1.8 g/100g water from 5 C to 25 C");
    assert!(a.ok);
    assert!(
        a.caveats
            .iter()
            .any(|c| c.contains("read on the basis of Na2HPO4·12H2O")),
        "{:?}",
        a.caveats
    );
    let hydrate = a.rows[0].headroom_pct.unwrap();
    let a = run("require Na2HPO4 stays dissolved at 1.8 g/100g water from 5 C to 25 C");
    assert!(a.rows[0].headroom_pct.unwrap() < hydrate);
}

#[test]
fn a_screening_from_below_zero_fails_a_solute_whose_loading_freezes_in_the_range() {
    // The same ice line as `require` gives (seed: CRC freezing points of NaCl solutions).
    let screening = run("which salts stay dissolved at 20 g/100g water from -15 C to 8 C");
    assert!(screening.ok, "{:?}", screening.error);
    let nacl = screening
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("sodium chloride"))
        .unwrap();
    assert_eq!(nacl.holds, Some(false));
    assert_eq!(nacl.phase.as_deref(), Some("ice"));
    let required = run("require NaCl stays dissolved at 20 g/100g water from -15 C to 8 C");
    assert_eq!(required.holds, Some(false));
    let ice = row_value(&required, "ice appears on cooling below").unwrap();
    assert_eq!(nacl.temperature_c, Some(ice));
    // About −12.6 C for 16.7 %w/w NaCl (CRC table of freezing-point depression).
    assert!((ice + 12.6).abs() < 0.3, "{ice}");
    assert!(
        screening
            .caveats
            .iter()
            .any(|c| c.contains("freeze in the range"))
    );
    // Above the ice line (−5 C for 10 g/100g water, ice at about −5.9 C) it passes.
    let mild = run("which salts stay dissolved at 10 g/100g water from -5 C to 8 C");
    let nacl = mild
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("sodium chloride"))
        .unwrap();
    assert_eq!(nacl.holds, Some(true));
    // A solute whose ice line at the loading is not known is listed apart, never passing.
    let kcl = mild
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("potassium chloride"))
        .unwrap();
    assert_eq!(kcl.holds, None);
    assert!(kcl.extra["reason"].as_str().unwrap().contains("ice"));
}

#[test]
fn ice_in_the_range_decides_though_the_data_stop_above_the_range() {
    // A de-icing brine asked about down to −30 C: 20 %w/w NaCl freezes near −16.5 C (the
    // seed's CRC freezing table), above the end of NaCl's data (−21.1 C, its eutectic). The
    // requirement fails at the ice line; the salt is checked from there up, where the
    // liquid is the recipe as made. The old answer refused: −30 C outside the data.
    let a = run("require recipe 20 %w/w NaCl stays dissolved from -30 C to 30 C");
    assert!(a.ok, "{:?}", a.error);
    assert_eq!(a.holds, Some(false));
    let ice = row_value(&a, "ice appears on cooling below").unwrap();
    assert!(ice > -17.0 && ice < -16.0, "{ice}");
    let salt = a
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("sodium chloride"))
        .unwrap();
    assert_eq!(salt.holds, Some(true));
    assert_eq!(salt.temperature_c, Some(ice));
    assert_eq!(
        a.shortfall.as_deref(),
        Some(format!("ice appears below {ice} C").as_str())
    );

    // 10 %w/w MgCl2 freezes at −8.28 C (Melinder's table), and MgCl2's solubility data
    // start at 0 C: the salt cannot be checked down to the ice line, but ice forms in the
    // range, so the requirement fails whatever the salt does. Alike for a loading asked
    // of the solute itself.
    for statement in [
        "require recipe 10 %w/w MgCl2 stays dissolved from -20 C to 30 C",
        "require MgCl2 stays dissolved at 10 %w/w from -20 C to 30 C",
    ] {
        let a = run(statement);
        assert!(a.ok, "{statement}: {:?}", a.error);
        assert_eq!(a.holds, Some(false), "{statement}");
        let salt = a
            .rows
            .iter()
            .find(|r| {
                r.solute.as_deref() == Some("magnesium chloride") && r.extra.contains_key("reason")
            })
            .unwrap();
        assert_eq!(salt.extra["forms"], "not evaluated", "{statement}");
        assert!(
            salt.extra["reason"]
                .as_str()
                .unwrap()
                .contains("outside the data")
        );
    }

    // Where no ice forms in the range, a range beyond the data is refused as before.
    let a = run("require recipe 10 %w/w MgCl2 stays dissolved from -5 C to 30 C");
    assert!(!a.ok);
    assert!(a.error.unwrap().message.contains("outside the data"));
}
