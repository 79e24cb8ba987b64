//! The corroboration checks committed in `seed-data/checks/` (written by
//! `tests/reference/make_fixtures.py`, module `fixtures_corroboration.py`), re-checked:
//! satline's side of each comparison is recomputed from the reference as loaded, and set
//! against the committed outside figure; the verdict must come out the same.
//!
//! Outside figures:
//! - heat-sign: the standard enthalpy of solution at 25 °C from the CRC Handbook of
//!   Chemistry and Physics, 95th ed. (2014), enthalpies of formation of the crystal and of
//!   the aqueous ions, as tabulated in PyPI `chemicals` 1.5.2;
//! - continuity: the neighbouring branch of the same solute at the stated transition;
//! - second-source: the other source's dataset, interpolated by straight lines.

use satline::catalog::Catalog;
use satline::model::{Check, CheckSubject, Dataset, Verdict};
use satline::science::curve::{Branch, Curve};
use satline::science::heat::heat_of_solution;
use satline::store::Store;

fn seed() -> Vec<(String, String)> {
    satline::seed_files::SEED_FILES
        .iter()
        .map(|(p, c)| (p.to_string(), c.to_string()))
        .collect()
}

fn catalog() -> Catalog {
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&seed()).unwrap();
    Catalog::from_store(&store).unwrap()
}

fn dataset<'a>(catalog: &'a Catalog, key: &str) -> &'a Dataset {
    catalog
        .datasets()
        .iter()
        .find(|d| d.key == key)
        .unwrap_or_else(|| panic!("dataset {key} of a check is not loaded"))
}

fn of_kind<'a>(catalog: &'a Catalog, kind: &str) -> Vec<&'a Check> {
    catalog.checks().iter().filter(|c| c.kind == kind).collect()
}

/// Close enough to the committed figure (written with six decimals).
fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-5 + 1e-4 * b.abs()
}

#[test]
fn the_seed_carries_checks_of_each_kind_the_fixtures_write() {
    let catalog = catalog();
    assert!(of_kind(&catalog, "heat-sign").len() >= 40);
    assert!(of_kind(&catalog, "continuity").len() >= 4);
    // Passing checks exist: the machinery is not only ever saying "not applicable".
    assert!(
        catalog
            .checks()
            .iter()
            .filter(|c| c.verdict == Verdict::Pass)
            .count()
            >= 5
    );
}

#[test]
fn heat_sign_checks_hold_when_recomputed() {
    let catalog = catalog();
    let mut decided = 0;
    for check in of_kind(&catalog, "heat-sign") {
        assert_eq!(check.subject_kind, CheckSubject::Dataset);
        let d = dataset(&catalog, &check.subject);
        let solute = catalog.solute(&d.solute).unwrap();
        let t_k = check.temperature_k.unwrap();
        let Ok(branch) = Branch::from_dataset(d) else {
            continue;
        };
        let curve = Curve::single(branch);
        let Ok(heat) = heat_of_solution(&curve, solute.molar_mass, t_k, true) else {
            assert_eq!(check.verdict, Verdict::NotApplicable, "{}", check.key);
            continue;
        };
        if let Some(committed) = check.satline_figure {
            assert!(
                close(heat.kj_per_mol, committed),
                "{}: satline now gives {} kJ/mol, the check was run on {committed} (data changed? rerun tests/reference/make_fixtures.py)",
                check.key,
                heat.kj_per_mol
            );
        }
        match check.verdict {
            Verdict::Pass | Verdict::Fail => {
                decided += 1;
                // Meaningful only for an anhydrous solid in a dilute saturated solution.
                assert_eq!(d.phase.water, 0.0, "{}", check.key);
                let w = curve.mass_fraction(t_k, true).unwrap();
                let molality = 1000.0 * w / (solute.molar_mass * (1.0 - w));
                assert!(molality <= 1.0, "{}: {molality} mol/kg", check.key);
                let reference = check.figure.unwrap();
                assert!(reference.abs() >= check.tolerance.unwrap(), "{}", check.key);
                let agree = (reference > 0.0) == (heat.kj_per_mol > 0.0);
                assert_eq!(
                    check.verdict,
                    if agree { Verdict::Pass } else { Verdict::Fail },
                    "{}: CRC {reference} kJ/mol, satline {} kJ/mol",
                    check.key,
                    heat.kj_per_mol
                );
            }
            Verdict::NotApplicable => {
                assert!(check.explanation.is_some(), "{}", check.key);
            }
        }
    }
    assert!(decided >= 5, "only {decided} heat-sign checks decided");
}

#[test]
fn continuity_checks_hold_when_recomputed() {
    let catalog = catalog();
    let mut measured = 0;
    for check in of_kind(&catalog, "continuity") {
        let low = dataset(&catalog, &check.subject);
        let high = dataset(&catalog, check.other.as_deref().unwrap());
        assert_eq!(low.solute, high.solute, "{}", check.key);
        let Some(t_k) = check.temperature_k else {
            assert_eq!(check.verdict, Verdict::NotApplicable, "{}", check.key);
            continue;
        };
        measured += 1;
        let (w_low, _) = Branch::from_dataset(low).unwrap().value_unchecked(t_k);
        let (w_high, _) = Branch::from_dataset(high).unwrap().value_unchecked(t_k);
        assert!(
            close(w_low, check.satline_figure.unwrap()),
            "{}: {w_low}",
            check.key
        );
        assert!(
            close(w_high, check.figure.unwrap()),
            "{}: {w_high}",
            check.key
        );
        let gap_pct = (w_low - w_high).abs() / ((w_low + w_high) / 2.0) * 100.0;
        let expected = if gap_pct <= check.tolerance.unwrap() {
            Verdict::Pass
        } else {
            Verdict::Fail
        };
        assert_eq!(check.verdict, expected, "{}: gap {gap_pct}%", check.key);
    }
    assert!(measured >= 4);
}

/// The other dataset's mass fraction at `t_k` by straight lines, inside its range.
fn linear(d: &Dataset, t_k: f64) -> Option<f64> {
    d.points.windows(2).find_map(|w| {
        (w[0].temperature_k <= t_k && t_k <= w[1].temperature_k).then(|| {
            w[0].mass_fraction
                + (w[1].mass_fraction - w[0].mass_fraction) * (t_k - w[0].temperature_k)
                    / (w[1].temperature_k - w[0].temperature_k)
        })
    })
}

#[test]
fn second_source_checks_hold_when_recomputed() {
    let catalog = catalog();
    for check in of_kind(&catalog, "second-source") {
        let a = dataset(&catalog, &check.subject);
        let b = dataset(&catalog, check.other.as_deref().unwrap());
        assert_eq!(a.phase.formula, b.phase.formula, "{}", check.key);
        assert_ne!(a.source, b.source, "{}", check.key);
        let worst = a
            .points
            .iter()
            .filter_map(|p| linear(b, p.temperature_k).map(|o| (p.mass_fraction - o).abs() / o))
            .fold(None, |m: Option<f64>, v| Some(m.map_or(v, |m| m.max(v))));
        match worst {
            None => assert_eq!(check.verdict, Verdict::NotApplicable, "{}", check.key),
            Some(worst) => {
                let pct = worst * 100.0;
                assert!(close(pct, check.satline_figure.unwrap()), "{}", check.key);
                let expected = if pct <= check.tolerance.unwrap() {
                    Verdict::Pass
                } else {
                    Verdict::Fail
                };
                assert_eq!(check.verdict, expected, "{}", check.key);
            }
        }
    }
}

#[test]
fn a_check_never_makes_data_reviewed() {
    let all = seed();
    let without: Vec<(String, String)> = all
        .iter()
        .filter(|(p, _)| !p.starts_with("checks/"))
        .cloned()
        .collect();
    let with = satline::store::seed::parse_seed(&all).unwrap();
    let bare = satline::store::seed::parse_seed(&without).unwrap();
    assert!(!with.checks.is_empty());
    assert_eq!(with.datasets, bare.datasets);
    assert_eq!(with.freezing, bare.freezing);
    assert_eq!(with.gas_constants, bare.gas_constants);
}

#[test]
fn every_failing_check_is_explained_and_satline_check_counts_coverage() {
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&seed()).unwrap();
    let report = store.check(0.05).unwrap();
    let cov = &report.corroboration;
    assert!(cov.unexplained.is_empty(), "{:?}", cov.unexplained);
    assert!(cov.orphans.is_empty(), "{:?}", cov.orphans);
    assert_eq!(cov.corroborated + cov.uncorroborated, cov.datasets);
    assert!(cov.corroborated >= 5);
    assert_eq!(cov.checks, cov.passing + cov.failing + cov.not_applicable);
    let mut text = Vec::new();
    report.write(&mut text).unwrap();
    let text = String::from_utf8(text).unwrap();
    assert!(text.contains("have a passing check"), "{text}");
    assert!(text.contains("over 0–40 °C"), "{text}");
}

#[test]
fn answers_say_whether_their_data_were_corroborated() {
    let engine = satline::engine::Engine::from_catalog(catalog());
    let mut session = engine.session();
    // Potassium sulfate's curve passes the heat-sign check; ammonium dihydrogen phosphate's
    // has no passing check (too concentrated for heat-sign, no density fit), so it is not
    // corroborated.
    let answers = engine.run_text(
        "solubility of K2SO4 at 20 C; solubility of NH4H2PO4 at 20 C",
        &mut session,
    );
    let k2so4 = answers[0].caveats.join("\n");
    assert!(
        k2so4.contains("corroborated by") && k2so4.contains("the heat-sign check against CRC"),
        "{k2so4}"
    );
    let map = answers[1].caveats.join("\n");
    assert!(map.contains("not corroborated"), "{map}");
}

fn fixture(name: &str) -> serde_json::Value {
    let path = std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference")
        .join(name);
    let text = std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("cannot read fixture {}: {e}", path.display()));
    serde_json::from_str(&text).unwrap()
}

/// The freezing table a check is about, and the tabulated point (mass fraction, K) at the
/// check's temperature: the point where the comparison found its largest difference.
fn freezing_point_of<'a>(
    catalog: &'a Catalog,
    check: &Check,
) -> (&'a satline::model::FreezingData, f64, f64) {
    assert_eq!(check.subject_kind, CheckSubject::Freezing, "{}", check.key);
    let (solute, key) = check.subject.split_once('/').unwrap();
    let table = catalog
        .freezing_of(solute)
        .into_iter()
        .find(|f| f.key == key || f.key == check.subject)
        .unwrap_or_else(|| panic!("freezing table {} is not loaded", check.subject));
    let t_k = check.temperature_k.unwrap();
    let (w, t) = table
        .points
        .iter()
        .copied()
        .chain(table.eutectic)
        .find(|p| (p.1 - t_k).abs() < 1e-3)
        .unwrap_or_else(|| panic!("{}: no tabulated point at {t_k} K", check.key));
    (table, w, t)
}

/// The verdict a figure pair gives against the check's tolerance (in the figures' unit).
fn verdict_by_difference(check: &Check) -> Verdict {
    let gap = (check.figure.unwrap() - check.satline_figure.unwrap()).abs();
    if gap <= check.tolerance.unwrap() {
        Verdict::Pass
    } else {
        Verdict::Fail
    }
}

/// Source of the outside figure: CoolProp 8.0.0, `INCOMP::MNA … MKF` (Melinder 2010), as in
/// `tests/reference/ice_lines_coolprop.json`. Sodium chloride's table (CRC) is an independent
/// comparison and must pass; the tables entered from Melinder's curves are not-applicable.
#[test]
fn ice_line_checks_hold_when_recomputed() {
    let catalog = catalog();
    let coolprop = fixture("ice_lines_coolprop.json");
    let checks = of_kind(&catalog, "ice-line");
    assert!(checks.len() >= 7, "{}", checks.len());
    let mut passing = 0;
    for check in checks {
        let (table, w, t) = freezing_point_of(&catalog, check);
        assert!(close(t, check.satline_figure.unwrap()), "{}", check.key);
        // The outside figure where the fixture has the same brine at the same composition.
        let formula = &catalog.solute(&table.solute).unwrap().formula;
        if let Some(row) = coolprop["rows"].as_array().unwrap().iter().find(|r| {
            r["solute"].as_str() == Some(formula.as_str())
                && (r["mass_fraction"].as_f64().unwrap() - w).abs() < 1e-6
        }) {
            let want = row["freezing_k"].as_f64().unwrap();
            assert!(
                (want - check.figure.unwrap()).abs() < 1e-3,
                "{}: {want}",
                check.key
            );
        }
        if table.source == "melinder-2010" {
            assert_eq!(check.verdict, Verdict::NotApplicable, "{}", check.key);
            assert!(check.explanation.is_some(), "{}", check.key);
        } else {
            assert_eq!(check.verdict, verdict_by_difference(check), "{}", check.key);
            passing += usize::from(check.verdict == Verdict::Pass);
        }
    }
    assert!(passing >= 1);
}

/// Source of the outside figure: pytzer 0.6.0 with `spencer1990.bC_Mg_Cl_SMW90` (Spencer,
/// Møller & Weare 1990) and the ice–water equilibrium. satline's own Pitzer code with the
/// same set (seed-data/models) must imply the same freezing point: two implementations of
/// one published model.
#[test]
fn water_activity_checks_hold_when_recomputed() {
    let catalog = catalog();
    let sets = satline::store::models::parameter_sets(satline::seed_files::SEED_FILES).unwrap();
    let mut measured = 0;
    for check in of_kind(&catalog, "water-activity") {
        if check.verdict == Verdict::NotApplicable {
            assert!(check.explanation.is_some(), "{}", check.key);
            continue;
        }
        let (table, w, t) = freezing_point_of(&catalog, check);
        assert!(close(t, check.satline_figure.unwrap()), "{}", check.key);
        assert_eq!(check.verdict, verdict_by_difference(check), "{}", check.key);
        let solute = catalog.solute(&table.solute).unwrap();
        let set = sets
            .iter()
            .find(|s| {
                s.key.starts_with("spencer-moller-weare-1990")
                    && s.key.ends_with(&solute.formula.to_lowercase())
            })
            .unwrap_or_else(|| panic!("{}: no SMW 1990 set in the reference", check.key));
        let molality = 1000.0 * w / (solute.molar_mass * (1.0 - w));
        let ours = satline::science::activity::ice::freezing_point(set, molality).unwrap();
        assert!(
            (ours - check.figure.unwrap()).abs() < 0.05,
            "{}: satline's model {ours} K, pytzer {} K",
            check.key,
            check.figure.unwrap()
        );
        measured += 1;
    }
    assert!(measured >= 1);
}

/// Source of the outside figure: the highest mass fraction of Laliberté's density fit
/// (J. Chem. Eng. Data 54 (2009) 1725) as stored in seed-data/densities.toml; satline's side
/// is the subject branch's solubility at the check's temperature.
#[test]
fn density_range_checks_hold_when_recomputed() {
    let catalog = catalog();
    let checks = of_kind(&catalog, "density-range");
    assert!(checks.len() >= 50, "{}", checks.len());
    for check in checks {
        let d = dataset(&catalog, &check.subject);
        let density = catalog.density_of(&d.solute).unwrap();
        assert!(close(density.w_max, check.figure.unwrap()), "{}", check.key);
        let t_k = check.temperature_k.unwrap();
        assert!(
            t_k >= density.t_min_c + 273.15 - 1e-6 && t_k <= density.t_max_c + 273.15 + 1e-6,
            "{}: {t_k} K outside the fit's range",
            check.key
        );
        let (w, _) = Branch::from_dataset(d).unwrap().value_unchecked(t_k);
        assert!(
            close(w, check.satline_figure.unwrap()),
            "{}: {w}",
            check.key
        );
        let over_pct = (density.w_max - w) / w * 100.0;
        match check.verdict {
            Verdict::Pass => assert!(over_pct <= check.tolerance.unwrap(), "{}", check.key),
            Verdict::Fail | Verdict::NotApplicable => {
                assert!(over_pct > check.tolerance.unwrap(), "{}", check.key);
                assert!(check.explanation.is_some(), "{}", check.key);
            }
        }
    }
}
