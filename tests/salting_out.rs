//! A gas in a recipe's liquid: salted out by the recipe's ions (Sechenov's relation with the
//! parameters of Weisenberger & Schumpe 1996, `seed-data/models/salting-*.toml`, from
//! memory), checked against TEOS-10 (PyPI gsw, `tests/reference/oxygen_seawater_gsw.json`)
//! for oxygen in seawater, and for what it must never do.

use std::path::PathBuf;

use satline::answer::Answer;
use satline::engine::Engine;

fn answers(text: &str) -> Vec<Answer> {
    let engine = Engine::open(None).expect("the embedded default database opens");
    let mut session = engine.session();
    engine.run_text(text, &mut session)
}

fn one(text: &str) -> Answer {
    let mut a = answers(text);
    assert_eq!(a.len(), 1, "{text}");
    a.remove(0)
}

fn ratio(answer: &Answer) -> f64 {
    assert!(answer.ok, "{:?}", answer.error);
    answer.rows[0].extra["ratio_to_pure_water"]
        .as_f64()
        .expect("a ratio to pure water")
}

fn fixture() -> serde_json::Value {
    let path =
        PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/oxygen_seawater_gsw.json");
    let text = std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("cannot read fixture {}: {e}", path.display()));
    serde_json::from_str(&text).expect("the fixture is JSON")
}

/// Source: gsw 3.6.23 (PyPI), `O2sol_SP_pt` at practical salinity 35 and 0 (Garcia & Gordon
/// 1992's fit of measured oxygen solubilities in seawater), per litre with `gsw.rho`; the
/// seawater as five salts from the Reference Composition (fixture's comment). Within 1.5 %
/// from 15 C to 35 C (below 15 C the density coefficients of CaCl2 do not reach).
#[test]
fn oxygen_in_seawater_matches_teos_10() {
    let f = fixture();
    let salts = f["salts_mol_per_kg_water"].as_object().expect("the salts");
    let recipe = salts
        .iter()
        .map(|(salt, m)| format!("{} mol/kg {salt}", m.as_f64().expect("a molality")))
        .collect::<Vec<_>>()
        .join(", ");
    let rows = f["rows"].as_array().expect("the rows");
    assert_eq!(rows.len(), 5);
    for row in rows {
        let t = row["t_c"].as_f64().expect("t_c");
        let expected = row["ratio_per_litre"].as_f64().expect("a ratio");
        let a = one(&format!("dissolved O2 at {t} C in recipe {recipe}"));
        let got = ratio(&a);
        assert!(
            (got / expected - 1.0).abs() < 0.015,
            "at {t} C: satline {got}, gsw {expected}"
        );
        // The row's amount is the pure-water amount times the ratio.
        let pure = a.rows[0].extra["in_pure_water"]
            .as_f64()
            .expect("pure water");
        let value = a.rows[0].value.expect("a value");
        assert!((value / pure - got).abs() < 2e-3, "{value} {pure} {got}");
    }
}

#[test]
fn more_salt_holds_less_gas_and_no_salt_changes_nothing() {
    // Common practice (no source): adding a salt never raises the amount of a sparingly
    // soluble gas a solution holds (every parameter of the seed adds to log10(c0/c)).
    let mut last = 1.0;
    for w in ["0.5", "2", "5", "10", "20"] {
        let r = ratio(&one(&format!(
            "dissolved O2 at 20 C in recipe {w} %w/w NaCl"
        )));
        assert!(r < last, "{w} %w/w: {r} not below {last}");
        last = r;
    }
    let pure = one("dissolved CO2 at 10 C under 1 bar in g/L");
    let dilute = one("dissolved CO2 at 10 C under 1 bar in g/L in recipe 0.000001 %w/w NaCl");
    assert!((pure.rows[0].value.unwrap() - dilute.rows[0].value.unwrap()).abs() < 1e-3);
}

#[test]
fn a_buffer_in_the_cold_reads_its_density_where_its_coefficients_reach() {
    // The phosphates' density coefficients start at 25 C: at 4 C the ions per litre use the
    // recipe's density at 25 C, and the answer says so.
    let a = answers(
        "let pbs = recipe 10 mM sodium phosphate at pH 7.4, 137 mM NaCl, 2.7 mM KCl\n\
         dissolved O2 at 4 C in pbs",
    );
    let gas = &a[1];
    let r = ratio(gas);
    assert!(r > 0.9 && r < 0.97, "{r}");
    assert!(
        gas.caveats
            .iter()
            .any(|c| c.contains("density at 25 C") && c.contains("nearest temperature")),
        "{:?}",
        gas.caveats
    );
    assert!(gas.caveats.iter().any(|c| c.contains("(from-memory)")));
    assert!(
        gas.sources
            .iter()
            .any(|s| s.key == "weisenberger-schumpe-1996")
    );
}

#[test]
fn what_the_relation_cannot_say_is_refused_with_the_reason() {
    for (text, says) in [
        (
            "dissolved O2 at 25 C in recipe 5 %w/w sucrose",
            "sucrose (C12H22O11) is not a salt",
        ),
        (
            "dissolved Ar at 25 C in recipe 1 %w/w NaCl",
            "no salting-out parameters for argon",
        ),
        (
            "dissolved O2 at 25 C in recipe 1 %w/w NaCl in x",
            "not as a mole fraction",
        ),
        (
            "dissolved O2 at 95 C in recipe 1 %w/w NaCl",
            "hold from 0 C to 90 C; add `extrapolate`",
        ),
        (
            "dissolved O2 at 25 C in recipe 1 %w/w boric acid",
            "no density coefficients for boric acid",
        ),
    ] {
        let a = one(text);
        let message = a.error.map(|e| e.message).unwrap_or_default();
        assert!(message.contains(says), "{text}: {message}");
    }
}

#[test]
fn per_kg_units_go_through_the_liquids_density_and_water() {
    // 0.9 %w/v NaCl: per kg of the solution is per litre over the density; per kg of its
    // water, also over the water's share (both given in the answer's caveats and rows).
    let per_litre = one("dissolved O2 at 25 C in recipe 0.9 %w/v NaCl in mg/L");
    let per_kg = one("dissolved O2 at 25 C in recipe 0.9 %w/v NaCl in mg/kg");
    let molal = one("dissolved O2 at 25 C in recipe 0.9 %w/v NaCl in mmol/kg");
    let density = one("describe recipe 0.9 %w/v NaCl at 25 C");
    let rho = density.rows[1].extra["density_kg_per_l"]
        .as_f64()
        .expect("a density");
    let water = density.rows[1].extra["water_percent_w_w"]
        .as_f64()
        .expect("the water")
        / 100.0;
    let mg_l = per_litre.rows[0].value.expect("mg/L");
    let mg_kg = per_kg.rows[0].value.expect("mg/kg");
    let mmol_kg = molal.rows[0].value.expect("mmol/kg");
    assert!(
        (mg_kg - mg_l / rho).abs() < 2e-3 * mg_kg,
        "{mg_kg} {mg_l} {rho}"
    );
    // O2: 31.998 g/mol.
    let expected = mg_l / 31.998 / (rho * water);
    assert!(
        (mmol_kg - expected).abs() < 2e-3 * expected,
        "{mmol_kg} {expected}"
    );
    assert!(
        molal
            .caveats
            .iter()
            .any(|c| c == "mmol/kg is per kg of the recipe's water")
    );
}
