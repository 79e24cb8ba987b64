//! Engine tests: each statement of the acceptance set answered over the embedded default
//! database, checked against values worked by hand from the seed tables (the seed file and
//! its cited table are named beside each check; the seed values are from memory of those
//! tables, marked from-memory in the seed) or against an outside reference fixture.

use satline::answer::{Answer, Basis};
use satline::engine::Engine;

fn engine() -> Engine {
    Engine::open(None).expect("the embedded default database opens")
}

fn answer(engine: &Engine, text: &str) -> Answer {
    let mut session = engine.session();
    let mut answers = engine.run_text(text, &mut session);
    assert_eq!(answers.len(), 1, "one statement in {text:?}");
    answers.remove(0)
}

fn value(answer: &Answer, row: usize) -> f64 {
    answer.rows[row].value.expect("the row has a value")
}

fn close(actual: f64, expected: f64, tolerance: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= tolerance,
        "{what}: expected {expected} ± {tolerance}, got {actual}"
    );
}

#[test]
fn a_table_over_a_range_is_the_lookups_at_its_temperatures() {
    // Each row is what `solubility of X at T` gives at that temperature, across the
    // decahydrate-to-anhydrous transition of Na2SO4 (32.38 C in its seed file) and in a
    // per-litre unit; the ends are both shown.
    let e = engine();
    // (table, the same solute and unit asked at one temperature, the table's temperatures)
    for (table, one_at, at) in [
        (
            "solubility of Na2SO4 from 0 C to 50 C",
            "solubility of Na2SO4 at {t} C",
            vec![0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50],
        ),
        (
            "solubility of KNO3 from 2 C to 9 C every 3 C in g/L",
            "solubility of KNO3 at {t} C in g/L",
            vec![2, 5, 8, 9],
        ),
    ] {
        let a = answer(&e, table);
        assert!(a.ok, "{table}: {:?}", a.error);
        let temperatures: Vec<f64> = a.rows.iter().filter_map(|r| r.temperature_c).collect();
        let expected: Vec<f64> = at.iter().map(|&t| f64::from(t)).collect();
        assert_eq!(temperatures, expected, "{table}");
        for (row, t) in a.rows.iter().zip(&at) {
            let one = answer(&e, &one_at.replace("{t}", &t.to_string()));
            assert_eq!(row.value, one.rows[0].value, "{table} at {t} C");
            assert_eq!(row.phase, one.rows[0].phase, "{table} at {t} C");
            assert_eq!(row.basis, one.rows[0].basis, "{table} at {t} C");
        }
    }
    let across = answer(&e, "solubility of Na2SO4 from 30 C to 40 C every 5 C");
    let phases: Vec<&str> = across
        .rows
        .iter()
        .filter_map(|r| r.phase.as_deref())
        .collect();
    assert_eq!(phases, ["Na2SO4·10H2O", "Na2SO4", "Na2SO4"]);
    // Outside the data the whole table is refused, naming the temperature.
    let a = answer(&e, "solubility of KNO3 from -10 C to 20 C");
    assert!(!a.ok);
    let message = a.error.map(|e| e.message).unwrap_or_default();
    assert!(message.contains("-10 C is outside the data"), "{message}");
}

#[test]
fn a_heat_of_solution_without_a_temperature_is_at_25_c_and_says_so() {
    let e = engine();
    let bare = answer(&e, "heat of solution of NH4NO3");
    let at = answer(&e, "heat of solution of NH4NO3 at 25 C");
    assert!(bare.ok, "{:?}", bare.error);
    assert_eq!(
        serde_json::to_value(&bare.rows).unwrap(),
        serde_json::to_value(&at.rows).unwrap()
    );
    assert!(
        bare.caveats
            .iter()
            .any(|c| c.starts_with("at 25 C, the tables' standard temperature")),
        "{:?}",
        bare.caveats
    );
    assert!(
        at.caveats
            .iter()
            .all(|c| !c.starts_with("at 25 C, the tables'"))
    );
}

#[test]
fn lookup_at_a_tabulated_temperature_gives_the_printed_value() {
    // seed-data/solutes/potassium-nitrate.toml (Perry's 7th ed., Section 2 table): 31.6 at 20 C.
    let e = engine();
    let a = answer(&e, "solubility of KNO3 at 20 C");
    assert!(a.ok, "{:?}", a.error);
    assert_eq!(value(&a, 0), 31.6);
    assert_eq!(a.rows[0].unit.as_deref(), Some("g/100g water"));
    assert_eq!(a.rows[0].basis, Some(Basis::Tabulated));
    assert!(!a.sources.is_empty(), "a lookup cites its source");
    assert!(a.caveats.iter().any(|c| c.contains("from-memory")));
}

#[test]
fn lookup_in_fahrenheit_and_molality() {
    // 68 F = 20 C; 31.6 g per 100 g water / M(KNO3) 101.1032 g/mol (IUPAC standard atomic
    // weights: 39.098 + 14.007 + 3 × 15.999) = 3.1255 mol/kg.
    let e = engine();
    let a = answer(&e, "solubility of potassium nitrate at 68 F in mol/kg");
    close(value(&a, 0), 316.0 / 101.1032, 0.001, "KNO3 mol/kg at 20 C");
    assert_eq!(a.rows[0].unit.as_deref(), Some("mol/kg"));
}

#[test]
fn lookup_between_points_stays_between_them() {
    // seed KCl (CRC 97th ed., aqueous solubility table, %w/w): 21.74 at 0 C, 23.61 at 10 C.
    let e = engine();
    let a = answer(&e, "solubility of KCl at 5 C in %w/w");
    let v = value(&a, 0);
    assert!(v > 21.74 && v < 23.61, "{v}");
    assert_eq!(a.rows[0].basis, Some(Basis::Interpolated));
}

#[test]
fn outside_the_data_is_an_error_unless_extrapolation_is_asked() {
    let e = engine();
    let a = answer(&e, "solubility of KNO3 at 150 C");
    assert!(!a.ok);
    let error = a.error.expect("an error");
    assert_eq!(error.code, "out-of-range");
    assert!(error.message.contains("extrapolate"), "{}", error.message);
    let a = answer(&e, "solubility of CuSO4 at 90 C extrapolate");
    assert!(a.ok, "{:?}", a.error);
    assert_eq!(a.rows[0].basis, Some(Basis::Extrapolated));
    assert!(a.caveats.iter().any(|c| c.contains("extrapolated")));
}

#[test]
fn data_of_one_temperature_are_not_extrapolated() {
    // trisodium-citrate.toml holds one point (20 C, 54.1 g/100g water): below it the
    // solubility is not known, and a flat extrapolation would overstate it in a cold room.
    let e = engine();
    for asked in [
        "solubility of trisodium citrate at 4 C",
        "solubility of trisodium citrate at 4 C extrapolate",
        "ceiling of trisodium citrate from 2 C to 8 C extrapolate",
        "plot trisodium citrate from 0 C to 40 C extrapolate",
    ] {
        let a = answer(&e, asked);
        assert!(!a.ok, "{asked}: {:?}", a.rows);
        let error = a.error.expect("an error");
        assert_eq!(error.code, "out-of-range", "{asked}");
        assert!(
            error.message.contains("one temperature only (20 C)")
                && !error.message.contains("add `extrapolate`"),
            "{asked}: {}",
            error.message
        );
    }
    let at = answer(&e, "solubility of trisodium citrate at 20 C extrapolate");
    assert_eq!(at.rows[0].value, Some(54.1));
    let screened = answer(
        &e,
        "which salts stay dissolved at 3 %w/w from 2 C to 8 C extrapolate",
    );
    let citrate = screened
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("trisodium citrate"))
        .expect("trisodium citrate is listed");
    assert_eq!(citrate.value, None);
    let reason = citrate.extra.get("reason").and_then(|r| r.as_str());
    assert_eq!(
        reason,
        Some("data hold one temperature only (20 C), too little to extrapolate from")
    );
}

#[test]
fn unknown_solute_suggests_the_closest_names() {
    let e = engine();
    let a = answer(&e, "solubility of KNO4 at 20 C");
    let error = a.error.expect("an error");
    assert_eq!(error.code, "unknown-solute");
    assert!(error.message.contains("KNO3"), "{}", error.message);
    assert_eq!((error.line, error.column), (1, 15));
}

#[test]
fn screening_ranks_by_headroom_and_lists_missing_data_apart() {
    // 30 g/100g water from 2 C to 8 C, margin 10%: KCl (seed CRC table: 21.74 %w/w at 0 C
    // = 27.8 g/100g water, 23.61 %w/w at 10 C = 30.9 g/100g water) cannot hold 30 × 1.1 = 33
    // at 2 C; NaCl (26.28 %w/w at 0 C = 35.7 g/100g water, nearly flat) holds with ~19 %.
    let e = engine();
    let a = answer(
        &e,
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
    );
    assert!(a.ok, "{:?}", a.error);
    let row = |name: &str| {
        a.rows
            .iter()
            .find(|r| r.solute.as_deref() == Some(name))
            .unwrap_or_else(|| panic!("{name} is screened"))
    };
    assert_eq!(row("potassium chloride").holds, Some(false));
    assert_eq!(row("sodium chloride").holds, Some(true));
    let nacl = row("sodium chloride").headroom_pct.unwrap();
    close(nacl, (35.66 / 30.0 - 1.0) * 100.0, 1.0, "NaCl headroom");
    // Ranked by headroom, the rows with data first, "no data" rows last and never passing.
    let with_data: Vec<f64> = a.rows.iter().filter_map(|r| r.headroom_pct).collect();
    assert!(with_data.windows(2).all(|w| w[0] >= w[1]));
    let first_missing = a
        .rows
        .iter()
        .position(|r| r.extra.get("status").and_then(|s| s.as_str()) == Some("no data"))
        .expect("some salts have no data over the range");
    assert!(
        a.rows[first_missing..]
            .iter()
            .all(|r| r.holds != Some(true))
    );
    assert!(a.rows[..first_missing].iter().all(|r| r.holds.is_some()));
    // Only salts: no gas and no molecular solute.
    assert!(
        a.rows
            .iter()
            .all(|r| r.solute.as_deref() != Some("sucrose"))
    );
}

#[test]
fn screening_a_molality_over_all_solutes() {
    // 1.5 mol/kg at 5 C: KNO3 (seed Perry's table 13.3 at 0 C, 20.9 at 10 C → about 17 g per
    // 100 g water = 1.68 mol/kg) holds narrowly; KH2PO4 does not.
    let e = engine();
    let a = answer(&e, "which solutes stay dissolved at 1.5 mol/kg at 5 C");
    let kno3 = a
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("potassium nitrate"))
        .expect("KNO3 screened");
    assert_eq!(kno3.holds, Some(true));
    assert!(kno3.headroom_pct.unwrap() < 20.0);
    assert!(
        a.rows
            .iter()
            .any(|r| r.solute.as_deref() == Some("sucrose"))
    );
}

#[test]
fn saturation_temperature_gives_back_the_loading() {
    // 40 g/100g water lies between the seed's 31.6 (20 C) and 45.8 (30 C) for KNO3.
    let e = engine();
    let a = answer(&e, "saturation of KNO3 at 40 g/100g water");
    assert_eq!(a.rows.len(), 1);
    let t = value(&a, 0);
    assert!(t > 20.0 && t < 30.0, "{t}");
    let back = answer(&e, &format!("solubility of KNO3 at {t} C"));
    close(
        value(&back, 0),
        40.0,
        0.01,
        "curve at the saturation temperature",
    );
}

#[test]
fn ceiling_is_the_lowest_solubility_less_the_margin() {
    // KCl rises with temperature, so over 2–8 C its lowest solubility is at 2 C.
    let e = engine();
    let at_2 = answer(&e, "solubility of KCl at 2 C in mol/kg");
    let a = answer(&e, "ceiling of KCl from 2 C to 8 C margin 10% in mol/kg");
    assert_eq!(a.rows[0].temperature_c, Some(2.0));
    close(value(&a, 0), value(&at_2, 0) / 1.1, 0.002, "ceiling");
}

#[test]
fn heat_of_solution_sign_follows_the_curve() {
    let e = engine();
    let kno3 = answer(&e, "heat of solution of KNO3 at 25 C");
    assert!(value(&kno3, 0) > 0.0);
    assert_eq!(kno3.rows[0].extra["sign"], "endothermic");
    // Ca(OH)2 is retrograde (seed CRC/Perry's tables fall from 0 to 100 C).
    let lime = answer(&e, "heat of solution of Ca(OH)2 at 25 C");
    assert!(value(&lime, 0) < 0.0);
    assert_eq!(lime.rows[0].extra["sign"], "exothermic");
}

#[test]
fn dissolved_oxygen_under_air_matches_teos10() {
    // tests/reference/oxygen_gsw.json: gsw.O2sol_SP_pt(0, 25) = 258.97 umol/kg (TEOS-10).
    let e = engine();
    let a = answer(&e, "dissolved O2 at 25 C under air in umol/kg");
    close(value(&a, 0), 258.97, 258.97 * 0.02, "O2 at 25 C");
    let mg = answer(&e, "dissolved O2 at 25 C under air");
    assert_eq!(mg.rows[0].unit.as_deref(), Some("mg/L"));
    // 258.97 umol/kg × 31.998 g/mol × 0.997 kg/L ≈ 8.26 mg/L.
    close(value(&mg, 0), 8.26, 0.17, "O2 mg/L at 25 C");
}

#[test]
fn dissolved_carbon_dioxide_scales_with_pressure() {
    let e = engine();
    let one = answer(&e, "dissolved CO2 at 4 C under 1 bar in g/L");
    let a = answer(&e, "dissolved CO2 at 4 C under 2.5 bar in g/L");
    assert!(a.ok, "{:?}", a.error);
    close(
        value(&a, 0) / value(&one, 0),
        2.5,
        0.01,
        "Henry's law is linear",
    );
}

#[test]
fn freezing_brine_gives_ice_first_below_the_eutectic_composition() {
    // 10 g/100g water NaCl = 9.09 %w/w: the seed ice line (CRC concentrative properties)
    // gives -5.81 C at 9 % and -6.56 C at 10 %; the eutectic is at 23.3 % so ice comes first.
    let e = engine();
    let a = answer(&e, "freezing of NaCl at 10 g/100g water at -10 C");
    assert!(a.ok, "{:?}", a.error);
    let ice = a.rows[0].value.unwrap();
    assert!(ice < -5.81 && ice > -6.56, "{ice}");
    let first = a
        .rows
        .iter()
        .find_map(|r| r.extra.get("first"))
        .expect("a first solid");
    assert_eq!(first, "ice");
}

#[test]
fn convert_uses_the_molar_mass_and_the_hydrate_basis() {
    // 20 g KCl per 100 g water = 200 g/kg / 74.551 g/mol = 2.6827 mol/kg.
    let e = engine();
    let a = answer(&e, "convert 20 g/100g water of KCl to mol/kg");
    close(value(&a, 0), 200.0 / 74.551, 0.001, "KCl mol/kg");
    // 30 g Na2SO4·10H2O in 100 g water: anhydrous share f = 142.04/322.19 = 0.4409, so
    // 30 × 0.4409 g salt in 100 + 30 × 0.5591 g water = 11.33 g per 100 g water.
    let a = answer(
        &e,
        "convert 30 g/100g water of Na2SO4 as Na2SO4·10H2O to g/100g water",
    );
    assert!(a.ok, "{:?}", a.error);
    close(value(&a, 0), 11.33, 0.01, "hydrate basis");
}

#[test]
fn describe_sources_and_list() {
    let e = engine();
    let a = answer(&e, "describe NaCl");
    assert!(a.rows.len() > 5, "the record and its points");
    assert!(a.sources.iter().any(|s| s.key == "crc-97-aqsol"));
    let a = answer(&e, "sources of NaCl");
    assert!(a.rows.iter().any(|r| r.extra["key"] == "crc-97-aqsol"));
    let a = answer(&e, "list salts with anion sulfate");
    let names: Vec<&str> = a.rows.iter().filter_map(|r| r.solute.as_deref()).collect();
    assert!(names.contains(&"sodium sulfate"));
    assert!(!names.contains(&"sodium chloride"));
}

#[test]
fn let_and_require() {
    let e = engine();
    let mut session = e.session();
    let answers = e.run_text(
        "let cold = from 2 C to 8 C\n\
         require KCl stays dissolved at 20 g/100g water over cold margin 10%\n\
         require KCl stays dissolved at 30 g/100g water over cold margin 10%",
        &mut session,
    );
    assert_eq!(answers.len(), 3);
    assert!(answers.iter().all(|a| a.ok));
    // KCl at 2 C is about 28.4 g/100g water (seed CRC table): 20 × 1.1 holds, 30 × 1.1 not.
    assert_eq!(answers[1].holds, Some(true));
    assert_eq!(answers[2].holds, Some(false));
    assert_eq!(answers[2].line, 3);
    assert!(
        answers[2]
            .caveats
            .iter()
            .any(|c| c.contains("does not hold"))
    );
}

#[test]
fn every_gas_loses_solubility_on_warming_and_dissolves_exothermically() {
    // Fact of the trade (common practice, no source): gases dissolve exothermically, so
    // their solubility falls as the water warms from 0 to 40 C.
    let e = engine();
    let gases: Vec<String> = e
        .catalog()
        .solutes()
        .iter()
        .filter(|s| s.kind == satline::model::SoluteKind::Gas)
        .map(|s| s.formula.clone())
        .collect();
    assert!(gases.len() >= 6);
    for gas in gases {
        let cold = answer(&e, &format!("dissolved {gas} at 0 C under 1 atm"));
        let warm = answer(&e, &format!("dissolved {gas} at 40 C under 1 atm"));
        assert!(
            cold.ok && warm.ok,
            "{gas}: {:?} {:?}",
            cold.error,
            warm.error
        );
        assert!(
            value(&cold, 0) > value(&warm, 0),
            "{gas} falls from 0 to 40 C"
        );
        let heat = answer(&e, &format!("heat of solution of {gas} at 25 C"));
        assert!(value(&heat, 0) < 0.0, "{gas}: negative heat of solution");
    }
}

#[test]
fn salts_whose_curve_rises_have_a_positive_heat_of_solution() {
    // Fact of the trade (common practice, no source): where the solubility rises with
    // temperature the apparent heat of solution is positive (endothermic), and where it falls,
    // negative.
    let e = engine();
    let mut checked = 0;
    for solute in e.catalog().solutes() {
        if solute.kind == satline::model::SoluteKind::Gas {
            continue;
        }
        let at = |t: f64| answer(&e, &format!("solubility of {} at {t} C", solute.id));
        let (below, above) = (at(24.0), at(26.0));
        if !(below.ok && above.ok) || below.rows[0].phase != above.rows[0].phase {
            continue;
        }
        let heat = answer(&e, &format!("heat of solution of {} at 25 C", solute.id));
        if !heat.ok {
            continue;
        }
        let rising = value(&above, 0) > value(&below, 0);
        let dh = value(&heat, 0);
        assert_eq!(dh > 0.0, rising, "{}: ΔH {dh}", solute.id);
        checked += 1;
    }
    assert!(checked >= 25, "only {checked} salts checked");
}

#[test]
fn an_ion_filter_names_the_family() {
    // Seed anions "hydrogen phosphate" and "dihydrogen phosphate" are phosphates; the seed
    // cation "copper(II)" is copper.
    let e = engine();
    let a = answer(&e, "list salts with anion phosphate");
    let names: Vec<&str> = a.rows.iter().filter_map(|r| r.solute.as_deref()).collect();
    assert!(names.contains(&"disodium hydrogen phosphate"), "{names:?}");
    assert!(
        names.contains(&"potassium dihydrogen phosphate"),
        "{names:?}"
    );
    assert!(!names.contains(&"sodium sulfate"));
    let a = answer(&e, "list salts with cation copper");
    let names: Vec<&str> = a.rows.iter().filter_map(|r| r.solute.as_deref()).collect();
    assert!(names.contains(&"copper(II) sulfate"), "{names:?}");
    assert!(names.iter().all(|n| n.starts_with("copper")), "{names:?}");
    // The sulfate family holds "hydrogen sulfate" too (sodium bisulfate).
    let a = answer(&e, "list salts with cation sodium and anion sulfate");
    let names: Vec<&str> = a.rows.iter().filter_map(|r| r.solute.as_deref()).collect();
    assert!(names.contains(&"sodium sulfate"), "{names:?}");
    assert!(names.iter().all(|n| n.starts_with("sodium")), "{names:?}");
}

#[test]
fn each_solute_gets_the_same_row_with_and_without_a_filter() {
    // A screening without filters judges most solutes on a shorter path than a filtered one
    // (src/engine/screen.rs); filtering by each cation in turn must give every solute the
    // row the unfiltered screening gives it (and together, every row of it; a double salt's
    // first cation names it).
    let e = engine();
    let mut cations: Vec<String> = e
        .catalog()
        .solutes()
        .iter()
        .filter_map(|s| s.cation.as_deref())
        .filter_map(|c| c.split_whitespace().next())
        .map(str::to_string)
        .collect();
    cations.sort();
    cations.dedup();
    assert!(cations.len() > 5, "{cations:?}");
    for loading in [
        "30 g/100g water at 5 C",
        "20 %w/w from 2 C to 8 C margin 10%",
        "25 g/100g water at 60 C",
    ] {
        let whole = answer(&e, &format!("which salts stay dissolved at {loading}"));
        assert!(whole.ok, "{:?}", whole.error);
        let row_of = |a: &Answer, name: &str| {
            a.rows
                .iter()
                .find(|r| r.solute.as_deref() == Some(name))
                .map(|r| serde_json::to_string(r).expect("a row serialises"))
        };
        let mut seen = std::collections::BTreeSet::new();
        for cation in &cations {
            let part = answer(
                &e,
                &format!("which salts with cation {cation} stay dissolved at {loading}"),
            );
            assert!(part.ok, "{cation}: {:?}", part.error);
            for row in &part.rows {
                let name = row
                    .solute
                    .as_deref()
                    .expect("a screened row names its solute");
                assert_eq!(
                    row_of(&part, name),
                    row_of(&whole, name),
                    "{name} at {loading}"
                );
                seen.insert(name.to_string());
            }
        }
        assert_eq!(
            seen.len(),
            whole.rows.len(),
            "every salt has a cation ({loading})"
        );
    }
}

#[test]
fn water_by_volume_is_its_mass_at_the_start_temperature() {
    // Kell (1975): pure water at 20 C is 998.2 g/L (998.21), at 4 C 1000.0 g/L (999.97).
    let e = engine();
    for (volume, mass, t) in [("1 L", "998.21 g", 20), ("250 mL", "249.99 g", 4)] {
        let by_volume = answer(
            &e,
            &format!("dissolving 50 g NaCl in {volume} water from {t} C"),
        );
        let by_mass = answer(
            &e,
            &format!("dissolving 50 g NaCl in {mass} water from {t} C"),
        );
        assert!(by_volume.ok, "{:?}", by_volume.error);
        for (a, b) in by_volume.rows.iter().zip(&by_mass.rows) {
            assert_eq!(a.value, b.value, "{volume} at {t} C: {:?}", a.quantity);
        }
        assert!(
            by_volume
                .caveats
                .iter()
                .any(|c| c.contains("of water at") && c.contains("pure water's density")),
            "{:?}",
            by_volume.caveats
        );
    }
}

#[test]
fn a_table_of_freezing_points_is_shown_and_counted_as_data() {
    // Propylene glycol holds no solubility data (it is miscible) but a table of freezing
    // points (Melinder 2010, 0 to 60 %w/w): `describe` shows it, `list` names it, and the
    // solute is no longer said to have no data.
    let e = engine();
    let a = answer(&e, "describe propylene glycol");
    assert!(a.ok, "{:?}", a.error);
    let row = a
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("freezing points"))
        .unwrap();
    assert_eq!(row.extra["compositions"], "0 to 60 %w/w");
    assert_eq!(row.extra["down_to_c"], -50.0);
    assert_eq!(row.extra["source"], "melinder-2010");
    assert!(a.caveats.iter().all(|c| !c.contains("has no data")));
    let a = answer(&e, "list solutes with tag miscible");
    let glycol = a
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("propylene glycol"))
        .unwrap();
    assert_eq!(glycol.extra["data"], "freezing points only");
    // A salt's table gives its eutectic too.
    let a = answer(&e, "describe NaCl");
    let row = a
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("freezing points"))
        .unwrap();
    assert_eq!(row.extra["eutectic"], "23.3 %w/w at -21.1 C");
}

#[test]
fn a_screening_says_a_miscible_liquid_has_no_limit_rather_than_no_data() {
    let e = engine();
    let a = answer(
        &e,
        "which solutes stay dissolved at 30 %w/w from -10 C to 20 C",
    );
    assert!(a.ok, "{:?}", a.error);
    let glycol = a
        .rows
        .iter()
        .find(|r| r.solute.as_deref() == Some("propylene glycol"))
        .unwrap();
    let reason = glycol.extra["reason"].as_str().unwrap();
    assert!(
        reason.starts_with("mixes with water in all proportions"),
        "{reason}"
    );
    // A solute that simply has no data yet is still said so.
    let without_data = a
        .rows
        .iter()
        .filter(|r| {
            r.extra.get("reason").and_then(|v| v.as_str()) == Some("no solubility data yet")
        })
        .count();
    assert!(without_data > 0);
}
