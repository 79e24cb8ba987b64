//! Pitzer's model for mixed electrolytes checked against the outside: every ion's activity
//! coefficient, the osmotic coefficient and the water activity of NaCl–KCl, NaCl–MgCl2,
//! NaCl–Na2SO4, NaCl–CaCl2 and seawater-like mixtures against PyPI pytzer 0.6.0 with the
//! same published parameter functions, the same A_φ (Clegg, Rard & Pitzer 1994) and the
//! same J(x) (Harvie's method); and below 0 °C the Mg–Cl system of Spencer, Møller & Weare
//! (1990) and the Na–K–Cl system used beyond its range. Fixtures by
//! `tests/reference/fixtures_mixtures.py` and `fixtures_mixtures_subzero.py`; no Python at
//! test time.

use satline::science::activity::System;
use satline::store::models::mixture_systems;

/// The committed fixture, compiled in.
const FIXTURE: &str = include_str!("reference/mixtures_pytzer.json");

fn systems() -> Vec<System> {
    mixture_systems(satline::seed_files::SEED_FILES).unwrap()
}

/// Tolerance: 0.1 % on γ, φ and a_w (the bar; the two codes agree far closer, the
/// printed worst case shows how close).
const TOLERANCE: f64 = 0.001;

/// The committed fixture below 0 °C, compiled in (`fixtures_mixtures_subzero.py`).
const SUBZERO: &str = include_str!("reference/mixtures_subzero_pytzer.json");

/// Every γ, φ and a_w of a fixture against the model: (values checked, worst relative
/// difference, (system, temperature in 0.01 K) seen). Rows marked `extrapolated` are
/// evaluated beyond the system's temperatures, as recipes do with `extrapolate`.
fn check(fixture: &str) -> (usize, f64, std::collections::BTreeSet<(String, i64)>) {
    let f: serde_json::Value = serde_json::from_str(fixture).unwrap();
    let systems = systems();
    let mut checked = 0;
    let mut worst: f64 = 0.0;
    let mut seen = std::collections::BTreeSet::new();
    for row in f["rows"].as_array().unwrap() {
        let key = row["system"].as_str().unwrap();
        let case = row["case"].as_str().unwrap();
        let system = systems
            .iter()
            .find(|s| s.key == key)
            .unwrap_or_else(|| panic!("no system {key}"));
        let t = row["temperature_k"].as_f64().unwrap();
        let mut m = vec![0.0; system.ions.len()];
        for (ion, v) in row["molalities"].as_object().unwrap() {
            let i = system
                .index(ion)
                .unwrap_or_else(|| panic!("{key} has no ion {ion}"));
            m[i] = v.as_f64().unwrap();
        }
        let coefficients = if row["extrapolated"].as_bool() == Some(true) {
            assert!(!system.covers(t), "{key} at {t} K is inside its range");
            system.at_unchecked(t)
        } else {
            system.at(t).unwrap()
        };
        let a = coefficients.activity(&m).unwrap();
        let mut compare = |what: String, ours: f64, theirs: f64| {
            let rel = (ours / theirs - 1.0).abs();
            worst = worst.max(rel);
            assert!(
                rel < TOLERANCE,
                "{key}, {case} at {t} K: {what} {ours} against pytzer {theirs}"
            );
            checked += 1;
        };
        for (ion, ln_g) in row["ln_activity_coefficients"].as_object().unwrap() {
            let i = system.index(ion).unwrap();
            compare(
                format!("γ({ion})"),
                a.ln_gamma[i].exp(),
                ln_g.as_f64().unwrap().exp(),
            );
        }
        compare(
            "φ".into(),
            a.osmotic,
            row["osmotic_coefficient"].as_f64().unwrap(),
        );
        compare(
            "a_w".into(),
            a.water_activity(),
            row["water_activity"].as_f64().unwrap(),
        );
        seen.insert((key.to_string(), (t * 100.0).round() as i64));
    }
    (checked, worst, seen)
}

/// Source: pytzer 0.6.0 (`pytzer.model.log_activity_coefficients`, `osmotic_coefficient`,
/// `activity_water`), a Library of `Aosm_CRP94`, `unsymmetrical.Harvie` and
/// - the `*_HMW84` functions (Harvie, Møller & Weare 1984) at 25 °C, system
///   `harvie-moller-weare-1984`;
/// - `bC_Na_Cl_M88`, `bC_K_Cl_GM89`, `theta_K_Na_GM89`, `psi_K_Na_Cl_GM89` (Møller 1988,
///   Greenberg & Møller 1989) at 0, 25 and 50 °C, system `greenberg-moller-1989-na-k-cl`.
#[test]
fn mixtures_match_pytzer() {
    let (checked, worst, seen) = check(FIXTURE);
    println!("{checked} values, worst relative difference {worst:.2e}");
    assert!(checked > 100, "{checked}");
    for want in [
        ("harvie-moller-weare-1984", 29815),
        ("greenberg-moller-1989-na-k-cl", 27315),
        ("greenberg-moller-1989-na-k-cl", 32315),
    ] {
        assert!(seen.contains(&(want.0.to_string(), want.1)), "{want:?}");
    }
}

/// Source: pytzer 0.6.0 as above, at −10 and −20 °C: `bC_Mg_Cl_SMW90` (Spencer, Møller &
/// Weare 1990), system `spencer-moller-weare-1990-mg-cl`, inside its temperatures; and the
/// Na–K–Cl functions of Møller 1988 / Greenberg & Møller 1989 below their 0 °C bound, as
/// recipes use them with `extrapolate` (the equations checked, not the parameters' validity).
#[test]
fn mixtures_below_zero_match_pytzer() {
    let (checked, worst, seen) = check(SUBZERO);
    println!("{checked} values below 0 C, worst relative difference {worst:.2e}");
    assert!(checked >= 40, "{checked}");
    for want in [
        ("spencer-moller-weare-1990-mg-cl", 26315),
        ("spencer-moller-weare-1990-mg-cl", 25315),
        ("greenberg-moller-1989-na-k-cl", 25315),
    ] {
        assert!(seen.contains(&(want.0.to_string(), want.1)), "{want:?}");
    }
}

/// Outside a system's temperatures the answer is a refusal that says so.
#[test]
fn a_system_refuses_temperatures_outside_its_sets() {
    let systems = systems();
    let hmw = systems
        .iter()
        .find(|s| s.key == "harvie-moller-weare-1984")
        .unwrap();
    let e = hmw.at(273.15).unwrap_err().to_string();
    assert!(e.contains("298.15 K"), "{e}");
}
