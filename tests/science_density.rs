//! Solution densities checked against the outside: `tests/reference/densities_laliberte.json`,
//! written by `tests/reference/fixtures_density.py` from PyPI `thermo` (its
//! `thermo.electrochem.Laliberte_density`, Laliberté 2009 with the published coefficients),
//! compared with `science::density` fed the coefficients of `seed-data/densities.toml`.

use std::path::PathBuf;

use satline::model::DensityCoefficients;
use satline::science::density::{Coefficients, solution_density};
use satline::store::seed::{parse_seed, read_seed_dir};

fn seed_densities() -> Vec<DensityCoefficients> {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("seed-data");
    parse_seed(&read_seed_dir(&root).unwrap())
        .unwrap()
        .densities
}

fn coefficients(d: &DensityCoefficients) -> Coefficients {
    Coefficients {
        c: d.c,
        t_min_c: d.t_min_c,
        t_max_c: d.t_max_c,
        w_max: d.w_max,
    }
}

/// Source: thermo 0.6.1 (PyPI), `Laliberte_density`: every solute with coefficients, at 0,
/// 20 and 40 °C within its range and at the ends of its range, nine mass fractions from 0 to its w_max, and three
/// mixtures. Within 0.05 %.
#[test]
fn densities_match_thermo_laliberte() {
    let path =
        PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/densities_laliberte.json");
    let fixture: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
    let sets = seed_densities();
    let mut checked = std::collections::BTreeSet::new();
    let rows = fixture["rows"].as_array().unwrap();
    assert!(rows.len() > 300, "{} rows", rows.len());
    for row in rows {
        let ids: Vec<&str> = row["solutes"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s.as_str().unwrap())
            .collect();
        let ws: Vec<f64> = row["w"]
            .as_array()
            .unwrap()
            .iter()
            .map(|w| w.as_f64().unwrap())
            .collect();
        let t_c = row["t_c"].as_f64().unwrap();
        let theirs = row["kg_per_m3"].as_f64().unwrap();
        let cs: Vec<Coefficients> = ids
            .iter()
            .map(|id| coefficients(sets.iter().find(|d| d.solute == *id).unwrap()))
            .collect();
        let components: Vec<(f64, &Coefficients)> = ws.iter().copied().zip(cs.iter()).collect();
        let ours = solution_density(t_c + 273.15, &components).unwrap();
        let rel = (ours - theirs).abs() / theirs;
        assert!(
            rel < 5e-4,
            "{ids:?} w={ws:?} at {t_c} C: ours {ours}, thermo {theirs}"
        );
        checked.extend(ids.iter().map(|s| s.to_string()));
    }
    // Every solute the reference holds coefficients for was checked.
    for d in &sets {
        assert!(
            checked.contains(&d.solute),
            "{} not in the fixture",
            d.solute
        );
    }
}

/// Every set cites the 2009 paper, is marked compiled and unreviewed (transcribed, nobody
/// has compared the printed table), and covers 20 °C or says where it does not.
#[test]
fn every_set_is_cited_and_honest() {
    let sets = seed_densities();
    assert!(sets.len() >= 30);
    for d in &sets {
        assert_eq!(d.source, "laliberte-2009", "{}", d.solute);
        assert_eq!(d.provenance.as_str(), "compiled", "{}", d.solute);
        assert_eq!(d.review.as_str(), "unreviewed", "{}", d.solute);
    }
}
