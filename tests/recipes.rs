//! Recipes answered end to end: a three-solute recipe over 2–8 °C, the composition in every
//! basis against worked figures, and the refusals (unknown, duplicate, no density).

use satline::answer::Answer;
use satline::engine::Engine;

fn answers(text: &str) -> Vec<Answer> {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    engine.run_text(text, &mut session)
}

fn number(answer: &Answer, row: usize, key: &str) -> f64 {
    answer.rows[row].extra[key].as_f64().unwrap()
}

const CAVEAT: &str = "each solute checked against its own solubility in pure water, a salt sharing an ion with another solute also by the ideal common-ion estimate (the lower decides); other interactions between solutes not accounted for";

#[test]
fn a_three_solute_recipe_is_checked_over_two_to_eight_degrees() {
    let a = answers(
        "let rinse = recipe 0.9 %w/v NaCl, 10 mM KH2PO4, 5 %w/v sucrose\n\
         require rinse stays dissolved from 2 C to 8 C margin 10%",
    );
    let require = &a[1];
    assert!(require.ok, "{:?}", require.error);
    assert_eq!(require.holds, Some(true));
    assert_eq!(require.rows.len(), 3);
    assert!(require.caveats.iter().any(|c| c == CAVEAT));
    // The density's source is named for the per-litre amounts.
    assert!(require.sources.iter().any(|s| s.key == "laliberte-2009"));
    // Every solute's headroom at its limiting temperature is positive here.
    assert!(require.rows.iter().all(|r| r.headroom_pct.unwrap() > 10.0));
}

#[test]
fn a_recipe_that_crystallises_does_not_hold_and_names_the_solute() {
    let a = answers(
        "require recipe 30 g/100g water KNO3, 20 g/100g water KCl stays dissolved from 2 C to 25 C",
    );
    assert_eq!(a[0].holds, Some(false));
    // By hand: KNO3 at 30 g per 100 g of water is above its solubility near 2 C (about
    // 14–15 g/100g water; CRC Handbook, solubility table, as held in the reference), and
    // more so beside KCl's potassium (the common-ion estimate).
    assert_eq!(a[0].rows[0].holds, Some(false));
    assert!(a[0].rows[0].value.unwrap() < 14.0);
    // KCl alone would hold (28.4 g/100g water at 2 C on its own curve); beside 3 mol/kg of
    // KNO3's potassium the estimate puts it a little below its 20.
    assert!(a[0].rows[1].value.unwrap() < 20.0);
    assert_eq!(a[0].rows[1].holds, Some(false));
    assert!((number(&a[0], 0, "loading_g_per_100g_water") - 30.0).abs() < 1e-9);
}

#[test]
fn describe_gives_every_basis_and_matches_the_worked_saline_figures() {
    // Worked example: 0.9 %w/v NaCl is about 154 mmol/L and about 0.155 mol/kg (isotonic
    // saline, common practice figures of pharmacy texts).
    let a = answers("describe recipe 0.9 %w/v NaCl");
    assert!(a[0].ok, "{:?}", a[0].error);
    assert!((number(&a[0], 0, "mmol_per_l") - 154.0).abs() < 0.5);
    assert!((number(&a[0], 0, "mol_per_kg") - 0.155).abs() < 0.002);
    // Ionic strength of a 1-1 salt is its molality.
    let i = number(&a[0], 1, "ionic_strength_mol_per_kg");
    assert!((i - number(&a[0], 0, "mol_per_kg")).abs() < 1e-3);
    // Mass balance: the solutes and the water make up the whole solution.
    let total = number(&a[0], 0, "percent_w_w") + number(&a[0], 1, "water_percent_w_w");
    assert!((total - 100.0).abs() < 0.01);
    // The volume's temperature is said once, also when the recipe is shown at the
    // temperature it was read at; a different temperature is said beside it.
    for (text, said) in [
        ("describe recipe 0.9 %w/v NaCl at 20 C", 1),
        ("describe recipe 0.9 %w/v NaCl at 25 C", 2),
    ] {
        let a = answers(text);
        let volume = a[0]
            .caveats
            .iter()
            .filter(|c| c.starts_with("per-litre amounts are per litre of solution at"))
            .count();
        assert_eq!(volume, said, "{text}: {:?}", a[0].caveats);
    }
}

#[test]
fn a_mixture_is_denser_than_either_solute_alone_at_the_same_amounts() {
    let a = answers(
        "describe recipe 50 g/100g water sucrose\n\
         describe recipe 10 g/100g water NaCl\n\
         describe recipe 50 g/100g water sucrose, 10 g/100g water NaCl",
    );
    let rho = |i: usize| number(&a[i], a[i].rows.len() - 1, "density_kg_per_l");
    assert!(rho(2) > rho(0) && rho(2) > rho(1));
}

#[test]
fn faults_of_a_recipe_are_refused_with_place_and_reason() {
    let text = "describe recipe 1 g/L NaCl, 2 g/L sodium chloride\n\
                describe recipe 1 g/L NaCll\n\
                describe recipe 25 g/L urea\n\
                describe recipe 25 g/L urea assuming density 1.000 kg/L\n\
                describe recipe 70 %w/w NaCl, 40 %w/w KCl";
    let a = answers(text);
    let error = |i: usize| a[i].error.as_ref().unwrap();
    assert_eq!(error(0).code, "unanswerable");
    assert!(error(0).message.contains("twice"));
    assert_eq!(&text[error(0).span.0..error(0).span.1], "sodium chloride");
    assert_eq!(error(1).code, "unknown-solute");
    assert!(error(1).message.contains("did you mean"));
    assert!(
        error(2)
            .message
            .contains("no density coefficients for urea")
    );
    assert!(a[3].ok);
    assert!(
        a[3].caveats
            .iter()
            .any(|c| c.contains("assuming density 1.000 kg/L"))
    );
    assert!(
        error(4)
            .message
            .contains("more solute than a solution can hold")
    );
}

#[test]
fn below_zero_a_strong_mixture_is_refused_and_a_dilute_one_gets_its_ice_line() {
    let a = answers(
        "require recipe 1 mol/kg NaCl, 1 mol/kg KCl stays dissolved from -5 C to 8 C\n\
         which solids form in recipe 0.01 mol/kg NaCl from -5 C to 25 C",
    );
    assert!(a[0].error.as_ref().unwrap().message.contains("ice"));
    let ice = &a[1].rows[0];
    assert_eq!(ice.solute.as_deref(), Some("ice"));
    // Ideal: ΔT = 1.86 K·kg/mol × 2 × 0.01 mol/kg = 0.037 K.
    assert!((ice.temperature_c.unwrap() + 0.04).abs() < 0.006);
    // A recipe of one solute with no freezing data of its own is refused for that solute's
    // reason, not for a mixture's (citric-acid.toml has no freezing points; 10 %w/w is
    // 0.58 mol/kg, beyond the ideal limit).
    let one = answers("require recipe 10 %w/w citric acid stays dissolved from -5 C to 25 C");
    let message = &one[0].error.as_ref().expect("refused").message;
    assert!(
        message.contains("citric acid is the only solute: the ice line is not known here")
            && !message.contains("mixture"),
        "{message}"
    );
}

/// The binary with a recipe file, in a fresh temporary directory.
fn satline(args: &[&str]) -> std::process::Output {
    std::process::Command::new(env!("CARGO_BIN_EXE_satline"))
        .args(args)
        .output()
        .unwrap()
}

#[test]
fn a_recipe_file_named_on_the_command_line_binds_its_recipes() {
    let file = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/grammar/examples/workshop.recipes"
    );
    let out = satline(&[
        "--recipes",
        file,
        "--format",
        "json",
        "require rinse stays dissolved from 2 C to 8 C; describe coolant",
    ]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    let answers: Vec<serde_json::Value> = text
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(answers[0]["holds"], true);
    assert!(answers[0]["caveats"].to_string().contains(CAVEAT));
    // coolant's per-litre amount is per litre at 25 C, as its file says.
    assert!(
        answers[1]["caveats"]
            .to_string()
            .contains("per litre of solution at 25 C")
    );
}

#[test]
fn a_faulty_recipe_file_stops_the_run_with_file_line_and_column() {
    let dir = std::env::temp_dir().join(format!("satline-recipes-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("bad.recipes");
    std::fs::write(&path, "recipe ward\n  1 g/L NaCl\n  2 g/L KCll\n").unwrap();
    let path = path.to_string_lossy().to_string();
    let out = satline(&["--recipes", &path, "describe ward"]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(
        err.contains(&format!("{path}:3:9: unknown solute")),
        "{err}"
    );
    assert!(out.stdout.is_empty());
    std::fs::remove_dir_all(&dir).unwrap();
}

#[test]
fn the_guides_and_the_examples_recipe_files_parse() {
    let guide = include_str!("../grammar/README.md");
    let blocks: Vec<&str> = guide
        .split("```recipes\n")
        .skip(1)
        .filter_map(|rest| rest.split("```").next())
        .collect();
    assert!(!blocks.is_empty());
    let example = include_str!("../grammar/examples/workshop.recipes");
    for text in blocks.into_iter().chain([example]) {
        let recipes = satline::query::parse_recipe_file(text)
            .unwrap_or_else(|faults| panic!("{}", faults[0].render(text, "recipes")));
        assert_eq!(recipes.len(), 2);
    }
}

/// A de-icing brine of one salt, asked below 0 °C where no parameter system of Pitzer's
/// equations reaches, gets the salt's own freezing answer at the recipe's loading (23 %w/w
/// NaCl is 29.87 g per 100 g of water), saying so; a recipe of two salts is still refused.
#[test]
fn a_recipe_of_one_salt_freezes_as_that_salt_and_two_salts_are_still_refused() {
    let a = answers(
        "let brine = recipe 23 %w/w NaCl\n\
         freezing of brine at -10 C\n\
         freezing of NaCl at 29.8701 g/100g water at -10 C\n\
         freezing of recipe 10 %w/w NaCl, 5 %w/w KCl at -10 C",
    );
    let (recipe, alone) = (&a[1], &a[2]);
    assert!(recipe.ok, "{:?}", recipe.error);
    assert!(alone.ok, "{:?}", alone.error);
    let rows = |x: &Answer| serde_json::to_string(&x.rows).unwrap();
    assert_eq!(rows(recipe), rows(alone));
    assert!(!recipe.rows.is_empty());
    assert!(
        recipe
            .caveats
            .iter()
            .any(|c| c.contains("holds one solute, NaCl (29.87 g/100g water)")),
        "{:?}",
        recipe.caveats
    );
    let mixed = &a[3];
    assert!(!mixed.ok);
    let message = &mixed.error.as_ref().unwrap().message;
    assert!(message.contains("Pitzer's equations"), "{message}");
}

/// A strong recipe of one salt below 0 °C takes the salt's own ice line (its tabulated
/// freezing points), the figure `freezing of NaCl at ...` gives: 23 %w/w NaCl (29.87 g per
/// 100 g of water) holds from -10 C and meets ice below its ice line near -20.6 C; beyond
/// the eutectic composition (30 %w/w CaCl2) ice appears only at the eutectic.
#[test]
fn below_zero_a_strong_recipe_of_one_salt_takes_that_salts_ice_line() {
    let a = answers(
        "let brine = recipe 23 %w/w NaCl\n\
         require brine stays dissolved from -10 C to 5 C\n\
         require brine stays dissolved from -21 C to 5 C\n\
         freezing of NaCl at 29.8701 g/100g water\n\
         which solids form in recipe 30 %w/w CaCl2 from -30 C to 5 C\n\
         freezing of CaCl2 at 30 %w/w",
    );
    let (warm, cold, alone) = (&a[1], &a[2], &a[3]);
    assert!(warm.ok, "{:?}", warm.error);
    assert_eq!(warm.holds, Some(true));
    let ice = &warm.rows[0];
    assert_eq!(ice.solute.as_deref(), Some("ice"));
    assert_eq!(ice.value, alone.rows[0].value);
    assert!(
        ice.value.unwrap() < -20.0 && ice.value.unwrap() > -21.1,
        "{ice:?}"
    );
    assert!(
        warm.caveats
            .iter()
            .any(|c| c.contains("ice line from its own freezing data")),
        "{:?}",
        warm.caveats
    );
    assert!(cold.ok, "{:?}", cold.error);
    assert_eq!(cold.holds, Some(false));
    assert_eq!(cold.rows[0].holds, Some(false));
    let (solids, eutectic) = (&a[4], &a[5]);
    assert!(solids.ok, "{:?}", solids.error);
    let ice = &solids.rows[0];
    assert_eq!(ice.solute.as_deref(), Some("ice"));
    let te = eutectic
        .rows
        .iter()
        .find_map(|r| r.temperature_c.or(r.value))
        .unwrap();
    assert_eq!(ice.temperature_c, Some(te), "{:?}", eutectic.rows);
}

/// `freezing of RECIPE` without a temperature says where the recipe as made starts to
/// freeze: a recipe of one salt as that salt at its loading; a dilute mixture by the ideal
/// formula (ΔT = K_f·Σ i·m, K_f = 1.86 K·kg/mol: 0.02 mol/kg each of NaCl and KCl is 0.08
/// mol/kg of ions, 0.149 K; common practice), also at the limit itself; a strong mixture
/// refused with the reason; a buffered recipe sent to the statement with a temperature.
#[test]
fn freezing_of_a_recipe_without_a_temperature_gives_where_it_starts_to_freeze() {
    let a = answers(
        "let brine = recipe 23 %w/w NaCl\n\
         freezing of brine\n\
         freezing of NaCl at 29.8701 g/100g water\n\
         freezing point of recipe 0.02 mol/kg NaCl, 0.02 mol/kg KCl\n\
         freezing of recipe 20 g/100g water NaCl, 15 g/100g water KCl\n\
         freezing of recipe 10 mM sodium phosphate at pH 7.4, 137 mM NaCl\n\
         freezing of recipe 0.05 mol/kg NaCl, 0.05 mol/kg KCl",
    );
    let (recipe, alone) = (&a[1], &a[2]);
    assert!(recipe.ok, "{:?}", recipe.error);
    let rows = |x: &Answer| serde_json::to_string(&x.rows).unwrap();
    assert_eq!(rows(recipe), rows(alone));
    let dilute = &a[3];
    assert!(dilute.ok, "{:?}", dilute.error);
    let t = dilute.rows[0].value.unwrap();
    assert!((t + 0.149).abs() < 0.002, "{t}");
    let strong = &a[4];
    let message = &strong.error.as_ref().unwrap().message;
    assert!(
        message.contains("starts to freeze is not known"),
        "{message}"
    );
    let buffered = &a[5];
    let message = &buffered.error.as_ref().unwrap().message;
    assert!(message.contains("at -20 C"), "{message}");
    // At the dilute limit itself (0.2 mol/kg of ions), still within it: 0.372 K.
    let at_limit = &a[6];
    assert!(at_limit.ok, "{:?}", at_limit.error);
    assert_eq!(at_limit.rows[0].value, Some(-0.37));
}

#[test]
fn a_saturation_is_not_searched_in_a_mixture_model_of_one_temperature() {
    // KCl and CaCl2 are held together only by a parameter system of 25 C (Harvie, Møller &
    // Weare 1984), where no saturation temperature can be searched: the recipe was once
    // answered "no saturation temperature" for 30 g/100g water of KCl, which alone saturates
    // at 7.11 C. Each solute is now checked on its own curve (KCl with the common-ion
    // estimate beside CaCl2's chloride, so it saturates higher), and the answer says why.
    let a = answers(
        "saturation of recipe 30 g/100g water KCl, 10 g/100g water CaCl2\n\
         saturation of KCl at 30 g/100g water",
    );
    let (mixture, alone) = (&a[0], &a[1]);
    assert!(mixture.ok, "{:?}", mixture.error);
    assert_eq!(
        mixture.rows[0].solute.as_deref(),
        Some("potassium chloride")
    );
    assert!(mixture.rows[0].value.unwrap() > alone.rows[0].value.unwrap() + 5.0);
    assert!(
        mixture
            .caveats
            .iter()
            .any(|c| c.starts_with("common-ion estimate:"))
    );
    assert!(
        mixture
            .caveats
            .iter()
            .any(|c| c
                .contains("holds at 25 C only, where no saturation temperature can be searched")),
        "{:?}",
        mixture.caveats
    );
    // A system with a range of temperatures is still used, and says where it searched.
    let a = answers("saturation of recipe 20 g/100g water NaCl, 15 g/100g water KCl");
    let notes = a[0].caveats.join("\n");
    assert!(
        notes.contains("potassium chloride: saturation searched only from 0 C to 100 C"),
        "{notes}"
    );
    assert!(
        notes.contains("salts checked together by Pitzer's equations"),
        "{notes}"
    );
    // Beyond its range, as asked, the search stops where the model can no longer be had
    // (CaCl2's saturated solution above 25 C is beyond the ionic strength the 25 C system is
    // answered to), and says so, instead of refusing the whole answer.
    let a = answers("saturation of recipe 20 %w/w CaCl2, 5 %w/w NaCl extrapolate");
    assert!(a[0].ok, "{:?}", a[0].error);
    let notes = a[0].caveats.join("\n");
    assert!(
        notes.contains(
            "calcium chloride: saturation searched only up to 25 C; beyond, no solubility product at 26 C"
        ),
        "{notes}"
    );
}

#[test]
fn a_fault_found_inside_a_model_is_placed_at_its_statement() {
    // The mixture model's refusal carries no place of its own; it was once reported at the
    // script's first character (line 1, column 1) whatever line the statement stood on.
    let a = answers(
        "solubility of KNO3 at 20 C\n\n  require recipe 20 %w/w CaCl2, 5 %w/w NaCl stays dissolved from 0 C to 30 C extrapolate",
    );
    let error = a[1].error.as_ref().expect("refused");
    assert!(
        error.message.contains("no solubility product"),
        "{}",
        error.message
    );
    assert_eq!((error.line, error.column), (3, 3));
    assert_eq!(error.span, a[1].span);
}

#[test]
fn a_density_read_a_few_kelvin_from_the_volume_is_said_and_farther_is_refused() {
    // densities.toml: Na2HPO4's coefficients cover 25 C to 45 C. A phosphate-buffered saline
    // in mM with its volume at 20 C (the default) reads the density at 25 C and says so, with
    // pure water's change between them (Kell 1975: 998.21 and 997.05 g/L, 0.12 %); at 5 C,
    // 20 K away, the per-litre amounts are refused as before.
    let pbs = "recipe 137 mM NaCl, 2.7 mM KCl, 10 mM Na2HPO4, 1.8 mM KH2PO4";
    let a = answers(&format!("require {pbs} stays dissolved from 2 C to 8 C"));
    assert!(a[0].ok, "{:?}", a[0].error);
    assert!(
        a[0].caveats.iter().any(|c| c.starts_with(
            "disodium hydrogen phosphate: density coefficients do not reach 20 C; the solution's density at 25 C"
        ) && c.contains("differs by 0.12 %")),
        "{:?}",
        a[0].caveats
    );
    let far = answers(&format!(
        "require {pbs} volume at 5 C stays dissolved from 2 C to 8 C"
    ));
    let message = &far[0].error.as_ref().expect("refused").message;
    assert!(message.contains("cover 25 C to 45 C, not 5 C"), "{message}");
}

#[test]
fn a_liquid_that_mixes_with_water_has_no_limit_and_its_ice_line_decides() {
    // 30 %w/w propylene glycol, a heat-transfer fluid: it was refused ("no saturation limit
    // to give"). Its freezing point, −12.79 C, is Melinder's fitted curve (the seed's table,
    // entered from CoolProp's copy of it).
    let a = answers(
        "require recipe 30 %w/w propylene glycol stays dissolved from -20 C to 20 C\n\
         require recipe 30 %w/w propylene glycol stays dissolved from -10 C to 20 C\n\
         saturation of recipe 2.5 %w/w glycerol, 0.5 %w/w boric acid\n\
         which solids form in recipe 40 %w/w ethylene glycol from -30 C to 20 C",
    );
    for answer in &a {
        assert!(answer.ok, "{}: {:?}", answer.statement, answer.error);
    }
    assert_eq!(a[0].holds, Some(false));
    assert_eq!(
        a[0].shortfall.as_deref(),
        Some("ice appears below -12.79 C")
    );
    assert_eq!(a[1].holds, Some(true));
    let glycol = a[1]
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("propylene glycol"))
        .unwrap();
    assert_eq!(glycol.holds, Some(true));
    assert!(glycol.extra["forms"].as_str().unwrap().contains("miscible"));
    assert!(a[1].sources.iter().any(|s| s.key == "melinder-2010"));
    // Beside another solute, the answer says that a co-solvent is not accounted for.
    assert!(
        a[2].caveats
            .iter()
            .any(|c| c.starts_with("glycerol mixes with water in all proportions")),
        "{:?}",
        a[2].caveats
    );
    let first = a[3]
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("first solid on cooling"))
        .unwrap();
    assert_eq!(first.solute.as_deref(), Some("ice"));
    assert_eq!(first.temperature_c, Some(-23.81));
}
