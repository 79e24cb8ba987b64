//! The store against its promises: migrations from every earlier version, refusal of a newer
//! schema, the seed round trip, one refusal per class of bad seed input with nothing written,
//! and solute lookup. Fixture seeds under tests/fixtures/ are invented.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use satline::catalog::{Catalog, CatalogError};
use satline::model::GasLaw;
use satline::science::units::CompositionUnit;
use satline::store::seed::{SeedProblem, read_seed_dir};
use satline::store::{Contents, MIGRATIONS, SCHEMA_VERSION, Store, StoreError};

fn fixtures() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures")
}

fn good_seed() -> Vec<(String, String)> {
    read_seed_dir(&fixtures().join("seed-good")).unwrap()
}

/// The good seed with the files of `seed-bad/<case>` laid over it (same path replaces).
fn bad_seed(case: &str) -> Vec<(String, String)> {
    let mut files: BTreeMap<String, String> = good_seed().into_iter().collect();
    let overlay = read_seed_dir(&fixtures().join("seed-bad").join(case)).unwrap();
    assert!(!overlay.is_empty(), "no fixture for {case}");
    files.extend(overlay);
    files.into_iter().collect()
}

fn table_names(conn: &rusqlite::Connection) -> Vec<String> {
    let mut stmt = conn
        .prepare("SELECT name FROM sqlite_master WHERE type IN ('table', 'index') AND name NOT LIKE 'sqlite_%' ORDER BY name")
        .unwrap();
    stmt.query_map([], |r| r.get(0))
        .unwrap()
        .collect::<Result<_, _>>()
        .unwrap()
}

// ---------------------------------------------------------------------------- migrations

#[test]
fn migrates_from_empty_to_the_latest_version() {
    let mut store = Store::open_in_memory_empty().unwrap();
    assert_eq!(store.schema_version().unwrap(), 0);
    assert_eq!(store.migrate().unwrap(), SCHEMA_VERSION);
    const { assert!(SCHEMA_VERSION >= 2, "at least two migrations") };
    assert!(store.is_empty().unwrap());
    assert_eq!(store.metadata("seed_fingerprint").unwrap(), None);
}

#[test]
fn migrates_from_each_earlier_version_keeping_the_data() {
    let dir = tempfile::tempdir().unwrap();
    // The reference schema: a database migrated straight to the latest version.
    let reference = dir.path().join("reference.db");
    drop(Store::create(&reference).unwrap());
    let expected = table_names(&rusqlite::Connection::open(&reference).unwrap());

    for start in 1..SCHEMA_VERSION {
        let path = dir.path().join(format!("from-{start}.db"));
        {
            // Build a database as an older satline left it, with a source in it.
            let conn = rusqlite::Connection::open(&path).unwrap();
            for m in &MIGRATIONS[..start as usize] {
                conn.execute_batch(m.sql).unwrap();
            }
            conn.pragma_update(None, "user_version", start).unwrap();
            conn.execute(
                "INSERT INTO sources (key, kind, title, authors) VALUES ('old', 'other', 'Invented', 'nobody')",
                [],
            )
            .unwrap();
        }
        let store = Store::open(&path).unwrap();
        assert_eq!(
            store.schema_version().unwrap(),
            SCHEMA_VERSION,
            "from {start}"
        );
        assert_eq!(store.read_all().unwrap().sources[0].key, "old");
        drop(store);
        assert_eq!(
            table_names(&rusqlite::Connection::open(&path).unwrap()),
            expected,
            "schema after migrating from version {start}"
        );
    }
}

#[test]
fn density_coefficients_survive_the_rebuild_that_lets_a_set_reach_the_pure_liquid() {
    // Migration 6 rebuilds `density_coefficients` (its CHECK now allows w_max = 1): a set
    // written at version 5 is there after it, and a set reaching w = 1 is then accepted.
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("five.db");
    {
        let conn = rusqlite::Connection::open(&path).unwrap();
        for m in &MIGRATIONS[..5] {
            conn.execute_batch(m.sql).unwrap();
        }
        conn.pragma_update(None, "user_version", 5).unwrap();
        conn.execute_batch(
            "INSERT INTO sources (key, kind, title, authors) VALUES ('old', 'other', 'Invented', 'nobody');
             INSERT INTO solutes (id, name, formula, kind, molar_mass, ions) VALUES ('salt-x', 'salt x', 'NaCl', 'salt', 58.44, 2);
             INSERT INTO solutes (id, name, formula, kind, molar_mass, ions) VALUES ('liquid-y', 'liquid y', 'C2H4O2', 'molecular', 60.05, 1);
             INSERT INTO density_coefficients (solute, source, c0, c1, c2, c3, c4, t_min_c, t_max_c, w_max, provenance, review, note)
                 VALUES ('salt-x', 'old', 1, 2, 3, 4, 5, 0, 50, 0.25, 'compiled', 'unreviewed', 'kept');",
        )
        .unwrap();
        let refused = conn.execute(
            "INSERT INTO density_coefficients (solute, source, c0, c1, c2, c3, c4, t_min_c, t_max_c, w_max, provenance, review)
                 VALUES ('liquid-y', 'old', 1, 2, 3, 4, 5, 0, 50, 1, 'compiled', 'unreviewed')",
            [],
        );
        assert!(refused.is_err(), "version 5 refuses w_max = 1");
    }
    drop(Store::open(&path).unwrap());
    let conn = rusqlite::Connection::open(&path).unwrap();
    let kept: (f64, f64, String) = conn
        .query_row(
            "SELECT c4, w_max, note FROM density_coefficients WHERE solute = 'salt-x'",
            [],
            |r| Ok((r.get(0)?, r.get(1)?, r.get(2)?)),
        )
        .unwrap();
    assert_eq!(kept, (5.0, 0.25, "kept".to_string()));
    conn.execute(
        "INSERT INTO density_coefficients (solute, source, c0, c1, c2, c3, c4, t_min_c, t_max_c, w_max, provenance, review)
             VALUES ('liquid-y', 'old', 1, 2, 3, 4, 5, 0, 50, 1, 'compiled', 'unreviewed')",
        [],
    )
    .unwrap();
    let above = conn.execute(
        "UPDATE density_coefficients SET w_max = 1.5 WHERE solute = 'liquid-y'",
        [],
    );
    assert!(above.is_err(), "above 1 is still refused");
}

#[test]
fn a_newer_schema_is_refused_naming_both_versions() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("future.db");
    drop(Store::create(&path).unwrap());
    let future = SCHEMA_VERSION + 7;
    rusqlite::Connection::open(&path)
        .unwrap()
        .pragma_update(None, "user_version", future)
        .unwrap();

    for result in [Store::open(&path), Store::open_read_only(&path)] {
        let err = result.unwrap_err();
        assert!(
            matches!(err, StoreError::SchemaTooNew { found, supported, .. } if found == future && supported == SCHEMA_VERSION),
            "{err:?}"
        );
        let message = err.to_string();
        assert!(
            message.contains(&format!("schema version {future}")),
            "{message}"
        );
        assert!(
            message.contains(&format!("up to {SCHEMA_VERSION}")),
            "{message}"
        );
    }
    // Refusing did not touch the file.
    let v: u32 = rusqlite::Connection::open(&path)
        .unwrap()
        .query_row("PRAGMA user_version", [], |r| r.get(0))
        .unwrap();
    assert_eq!(v, future);
}

#[test]
fn file_databases_use_wal_and_foreign_keys() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("x.db");
    drop(Store::create(&path).unwrap());
    let _store = Store::open(&path).unwrap();
    let mode: String = rusqlite::Connection::open(&path)
        .unwrap()
        .query_row("PRAGMA journal_mode", [], |r| r.get(0))
        .unwrap();
    assert_eq!(mode, "wal");
}

// ---------------------------------------------------------------------------- round trip

fn num(v: &toml::Value) -> f64 {
    match v {
        toml::Value::Integer(i) => *i as f64,
        toml::Value::Float(f) => *f,
        other => panic!("not a number: {other}"),
    }
}

fn text(table: &toml::Table, key: &str) -> Option<String> {
    table
        .get(key)
        .map(|v| v.as_str().unwrap().to_string())
        .filter(|s| !s.trim().is_empty())
}

fn strings(table: &toml::Table, key: &str) -> Vec<String> {
    table
        .get(key)
        .and_then(|v| v.as_array())
        .map(|a| a.iter().map(|s| s.as_str().unwrap().to_string()).collect())
        .unwrap_or_default()
}

fn pair(v: &toml::Value) -> (f64, f64) {
    let a = v.as_array().unwrap();
    (num(&a[0]), num(&a[1]))
}

/// Compares every value of the seed files, parsed as plain TOML, with what the store
/// returns. Floats are compared exactly.
fn assert_round_trip(files: &[(String, String)], stored: &Contents) {
    let mut datasets_seen = 0;
    for (path, contents) in files {
        if path.starts_with("models/") {
            // Model parameter sets are not stored (store::models reads them).
            continue;
        }
        if path.starts_with("checks/") {
            continue; // corroboration checks: tests/corroboration.rs
        }
        let doc: toml::Table = toml::from_str(contents).unwrap();
        if path == "sources.toml" {
            let list = doc
                .get("source")
                .and_then(|v| v.as_array())
                .cloned()
                .unwrap_or_default();
            assert_eq!(list.len(), stored.sources.len());
            for raw in list {
                let raw = raw.as_table().unwrap();
                let key = text(raw, "key").unwrap();
                let s = stored.sources.iter().find(|s| s.key == key).unwrap();
                assert_eq!(Some(s.title.clone()), text(raw, "title"), "{key}");
                assert_eq!(Some(s.authors.clone()), text(raw, "authors"), "{key}");
                assert_eq!(s.publisher, text(raw, "publisher"), "{key}");
                assert_eq!(s.edition, text(raw, "edition"), "{key}");
                assert_eq!(
                    s.year.map(i64::from),
                    raw.get("year").and_then(|v| v.as_integer())
                );
                assert_eq!(s.locator, text(raw, "locator"), "{key}");
                assert_eq!(s.doi, text(raw, "doi"), "{key}");
                assert_eq!(s.isbn, text(raw, "isbn"), "{key}");
                assert_eq!(s.url, text(raw, "url"), "{key}");
                assert_eq!(s.note, text(raw, "note"), "{key}");
                assert_eq!(
                    serde_json::to_value(s.kind).unwrap().as_str(),
                    raw.get("kind").and_then(|v| v.as_str())
                );
            }
            continue;
        }
        if path == "densities.toml" {
            let list = doc.get("density").and_then(|v| v.as_array()).unwrap();
            assert_eq!(list.len(), stored.densities.len());
            for raw in list {
                let raw = raw.as_table().unwrap();
                let solute = text(raw, "solute").unwrap();
                let d = stored
                    .densities
                    .iter()
                    .find(|d| d.solute == solute)
                    .unwrap();
                for (i, c) in d.c.iter().enumerate() {
                    assert_eq!(*c, num(&raw[&format!("c{i}")]), "{solute} c{i}");
                }
                assert_eq!(d.t_min_c, num(&raw["t_min"]), "{solute}");
                assert_eq!(d.t_max_c, num(&raw["t_max"]), "{solute}");
                assert_eq!(d.w_max, num(&raw["w_max"]), "{solute}");
                assert_eq!(Some(d.source.clone()), text(raw, "source"));
            }
            continue;
        }
        if let Some(stem) = path
            .strip_prefix("thermochemistry/")
            .and_then(|p| p.strip_suffix(".toml"))
        {
            // Every [species, value] pair of every group comes back, value exactly.
            let pairs: Vec<(String, f64)> = doc
                .get("group")
                .and_then(|v| v.as_array())
                .into_iter()
                .flatten()
                .flat_map(|g| {
                    g.get("values")
                        .and_then(|v| v.as_array())
                        .cloned()
                        .unwrap_or_default()
                })
                .map(|pair| {
                    let pair = pair.as_array().unwrap();
                    let value = pair[1]
                        .as_float()
                        .or_else(|| pair[1].as_integer().map(|i| i as f64))
                        .unwrap();
                    (pair[0].as_str().unwrap().to_string(), value)
                })
                .collect();
            let back: Vec<(String, f64)> = stored
                .thermochemistry
                .values
                .iter()
                .filter(|v| v.file == stem)
                .map(|v| (v.species.clone(), v.value))
                .collect();
            assert_eq!(back, pairs, "{path}");
            let fits = doc
                .get("heat_capacity")
                .and_then(|v| v.as_array())
                .map_or(0, |a| a.len());
            let stored_fits = stored
                .thermochemistry
                .heat_capacity
                .iter()
                .filter(|h| h.file == stem);
            assert_eq!(stored_fits.count(), fits, "{path}");
            continue;
        }
        let id = text(&doc, "id").unwrap();
        let s = stored.solutes.iter().find(|s| s.id == id).unwrap();
        assert_eq!(Some(s.name.clone()), text(&doc, "name"));
        assert_eq!(Some(s.formula.clone()), text(&doc, "formula"));
        assert_eq!(
            Some(s.kind.as_str()),
            doc.get("kind").and_then(|v| v.as_str())
        );
        assert_eq!(s.synonyms, strings(&doc, "synonyms"), "{id}");
        assert_eq!(s.tags, strings(&doc, "tags"), "{id}");
        assert_eq!(s.cation, text(&doc, "cation"), "{id}");
        assert_eq!(s.anion, text(&doc, "anion"), "{id}");
        assert_eq!(s.hazard, text(&doc, "hazard"), "{id}");
        if let Some(ions) = doc.get("ions") {
            assert_eq!(i64::from(s.ions), ions.as_integer().unwrap());
        }
        assert!(s.molar_mass > 0.0);

        for raw in doc
            .get("dataset")
            .and_then(|v| v.as_array())
            .cloned()
            .unwrap_or_default()
        {
            datasets_seen += 1;
            let raw = raw.as_table().unwrap();
            let key = format!("{id}/{}", text(raw, "key").unwrap());
            let d = stored.datasets.iter().find(|d| d.key == key).unwrap();
            assert_eq!(d.solute, id);
            assert_eq!(Some(d.source.clone()), text(raw, "source"), "{key}");
            assert_eq!(Some(d.phase.formula.clone()), text(raw, "phase"), "{key}");
            assert_eq!(Some(d.phase.name.clone()), text(raw, "phase_name"), "{key}");
            assert_eq!(
                CompositionUnit::from_symbol(&d.unit),
                CompositionUnit::from_symbol(&text(raw, "unit").unwrap()),
                "{key}"
            );
            assert_eq!(
                Some(d.temperature_unit.clone()),
                text(raw, "temperature_unit")
            );
            assert_eq!(
                Some(d.provenance.as_str().to_string()),
                text(raw, "provenance")
            );
            assert_eq!(Some(d.review.as_str().to_string()), text(raw, "review"));
            assert_eq!(d.note, text(raw, "note"), "{key}");
            assert_eq!(d.stable_range, raw.get("stable_range").map(pair), "{key}");
            assert!(!d.retired);
            let points = raw.get("points").unwrap().as_array().unwrap();
            assert_eq!(points.len(), d.points.len(), "{key}");
            for (rp, p) in points.iter().zip(&d.points) {
                let rp = rp.as_array().unwrap();
                assert_eq!(p.temperature_reported, num(&rp[0]), "{key}");
                assert_eq!(p.value_reported, num(&rp[1]), "{key}");
                assert_eq!(p.uncertainty, rp.get(2).map(num), "{key}");
                assert!((0.0..1.0).contains(&p.mass_fraction), "{key}");
            }
        }

        for raw in doc
            .get("henry")
            .and_then(|v| v.as_array())
            .cloned()
            .unwrap_or_default()
        {
            let raw = raw.as_table().unwrap();
            let key = format!("{id}/{}", text(raw, "key").unwrap());
            let g = stored.gas_constants.iter().find(|g| g.key == key).unwrap();
            assert_eq!(Some(g.source.clone()), text(raw, "source"), "{key}");
            assert_eq!(
                Some(g.provenance.as_str().to_string()),
                text(raw, "provenance")
            );
            assert_eq!(Some(g.review.as_str().to_string()), text(raw, "review"));
            assert_eq!(g.note, text(raw, "note"), "{key}");
            let f = |name: &str| num(raw.get(name).unwrap());
            match (&g.law, raw.get("form").and_then(|v| v.as_str())) {
                (GasLaw::VantHoff(h), Some("vant-hoff")) => {
                    assert_eq!(Some(h.convention.clone()), text(raw, "convention"));
                    assert_eq!(h.value, f("value"));
                    assert_eq!(h.reference_temperature_k, f("reference_temperature_k"));
                    assert_eq!(h.temperature_term_k, f("temperature_term_k"));
                }
                (GasLaw::Fit(fit), Some(form)) if fit.quantity.as_str() == form => {
                    assert_eq!(
                        [
                            fit.a,
                            fit.b,
                            fit.c,
                            fit.d,
                            fit.scale_k,
                            fit.reference_pressure_pa,
                            fit.t_min_k,
                            fit.t_max_k
                        ],
                        [
                            "a",
                            "b",
                            "c",
                            "d",
                            "scale_k",
                            "reference_pressure_pa",
                            "t_min_k",
                            "t_max_k"
                        ]
                        .map(f),
                        "{key}"
                    );
                }
                (law, form) => panic!("{key}: stored {law:?} for form {form:?}"),
            }
        }

        if let Some(raw) = doc.get("freezing").and_then(|v| v.as_table()) {
            let key = format!("{id}/{}", text(raw, "key").unwrap());
            let f = stored.freezing.iter().find(|f| f.data.key == key).unwrap();
            assert_eq!(Some(f.data.source.clone()), text(raw, "source"));
            assert_eq!(
                CompositionUnit::from_symbol(&f.unit),
                CompositionUnit::from_symbol(&text(raw, "unit").unwrap())
            );
            assert_eq!(
                Some(f.temperature_unit.clone()),
                text(raw, "temperature_unit")
            );
            assert_eq!(
                Some(f.data.provenance.as_str().to_string()),
                text(raw, "provenance")
            );
            assert_eq!(
                Some(f.data.review.as_str().to_string()),
                text(raw, "review")
            );
            assert_eq!(f.note, text(raw, "note"));
            let points: Vec<(f64, f64)> = raw
                .get("points")
                .unwrap()
                .as_array()
                .unwrap()
                .iter()
                .map(pair)
                .collect();
            assert_eq!(f.points_reported, points, "{key}");
            assert_eq!(f.data.points.len(), points.len());
            assert_eq!(f.eutectic_reported, raw.get("eutectic").map(pair), "{key}");
        }
    }
    assert_eq!(datasets_seen, stored.datasets.len());
}

#[test]
fn the_invented_seed_reads_back_exactly_as_written() {
    let files = good_seed();
    let mut store = Store::open_in_memory().unwrap();
    let summary = store.load_seed(&files).unwrap();
    assert_eq!(summary.solutes, 4);
    let stored = store.read_all().unwrap();
    assert_round_trip(&files, &stored);
    // What the loader parsed is exactly what the store returns.
    assert_eq!(satline::store::seed::parse_seed(&files).unwrap(), stored);
    assert_eq!(
        store.metadata("seed_fingerprint").unwrap(),
        Some(satline::store::seed::fingerprint(&files))
    );
    assert_eq!(store.audit_len().unwrap(), 1);
}

#[test]
fn canonical_values_follow_the_conversions() {
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&good_seed()).unwrap();
    let c = store.read_all().unwrap();
    let d = |key: &str| c.datasets.iter().find(|d| d.key == key).unwrap();
    // g/100g water: 25 -> 25/125.
    assert_eq!(d("demo-salt/hydrate").points[1].mass_fraction, 25.0 / 125.0);
    assert_eq!(d("demo-salt/hydrate").phase.water, 2.0);
    assert_eq!(
        d("demo-salt/hydrate").stable_range_k,
        Some((261.15, 288.65))
    );
    // %w/w: 24 -> 0.24.
    assert_eq!(d("demo-salt/anhydrous").points[0].mass_fraction, 0.24);
    // mol/kg with M(KCl): b M / (1000 + b M).
    let m = c
        .solutes
        .iter()
        .find(|s| s.id == "demo-salt")
        .unwrap()
        .molar_mass;
    let w = d("demo-salt/hot").points[0].mass_fraction;
    assert!((w - 7.5 * m / (1000.0 + 7.5 * m)).abs() < 1e-15);
    // F: 50 F = 10 C.
    assert!((d("demo-salt/fahrenheit").points[0].temperature_k - 283.15).abs() < 1e-9);
    // x with M(Ar) and M(H2O) = 18.015.
    let ar = c
        .solutes
        .iter()
        .find(|s| s.id == "demo-gas")
        .unwrap()
        .molar_mass;
    let x = 4.0e-5;
    let w = d("demo-gas/mole-fraction").points[0].mass_fraction;
    assert!((w - x * ar / (x * ar + (1.0 - x) * 18.015)).abs() < 1e-15);
}

#[test]
fn the_real_seed_reads_back_exactly_as_written() {
    let files: Vec<(String, String)> = satline::seed_files::SEED_FILES
        .iter()
        .map(|(p, c)| (p.to_string(), c.to_string()))
        .collect();
    if !files.iter().any(|(p, _)| p.starts_with("solutes/")) {
        eprintln!("skipped: seed-data/solutes is empty in this checkout");
        return;
    }
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&files).unwrap();
    assert_round_trip(&files, &store.read_all().unwrap());
}

// ---------------------------------------------------------------------------- bad input

/// Loads `seed-bad/<case>` into a fresh file database and checks the error names the file,
/// the record and the reason, and that nothing was written.
fn refused(case: &str) -> (StoreError, String) {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("store.db");
    drop(Store::create(&path).unwrap());
    let mut store = Store::open(&path).unwrap();
    let before = store.read_all().unwrap();
    let err = store.load_seed(&bad_seed(case)).unwrap_err();
    assert_eq!(
        store.read_all().unwrap(),
        before,
        "{case}: database changed"
    );
    assert!(store.is_empty().unwrap(), "{case}");
    assert_eq!(store.audit_len().unwrap(), 0, "{case}");
    assert_eq!(store.metadata("seed_fingerprint").unwrap(), None, "{case}");
    let message = err.to_string();
    assert!(message.starts_with("seed file "), "{case}: {message}");
    (err, message)
}

fn problem(err: &StoreError) -> &SeedProblem {
    match err {
        StoreError::Seed { problem, .. } => problem,
        other => panic!("not a seed error: {other:?}"),
    }
}

#[test]
fn unknown_source_key_is_refused() {
    let (err, message) = refused("unknown-source");
    assert!(matches!(problem(&err), SeedProblem::UnknownSource { key } if key == "no-such-source"));
    assert_eq!(
        message,
        "seed file solutes/demo-bad.toml, dataset \"one\": unknown source key \"no-such-source\" (not in sources.toml)"
    );
}

#[test]
fn unknown_units_are_refused() {
    let (err, message) = refused("unknown-unit");
    assert!(matches!(problem(&err), SeedProblem::UnknownUnit { unit, .. } if unit == "furlongs"));
    assert!(message.contains("dataset \"one\": unknown unit \"furlongs\"; expected one of g/100g water, %w/w, w, mol/kg, x"), "{message}");

    let (err, message) = refused("unknown-temperature-unit");
    assert!(matches!(problem(&err), SeedProblem::UnknownUnit { unit, .. } if unit == "R"));
    assert!(message.contains("expected one of C, K, F"), "{message}");

    let (err, message) = refused("volume-unit");
    assert!(matches!(problem(&err), SeedProblem::VolumeUnit { .. }));
    assert!(message.contains("needs a density"), "{message}");
}

#[test]
fn duplicate_ids_are_refused() {
    let (err, message) = refused("duplicate-dataset-key");
    assert!(matches!(problem(&err), SeedProblem::Duplicate { id, .. } if id == "one"));
    assert!(
        message.contains("solutes/demo-bad.toml, dataset \"one\": duplicate dataset key \"one\""),
        "{message}"
    );

    let (_, message) = refused("duplicate-source-key");
    assert!(
        message.contains(
            "seed file sources.toml, source \"demo-paper\": duplicate source key \"demo-paper\""
        ),
        "{message}"
    );

    let (_, message) = refused("duplicate-solute-name");
    assert!(
        // Files are read in path order, so the later file is the one named.
        message.contains("seed file solutes/demo-sugar.toml, solute \"demo-sugar\": duplicate name (also used by solute \"demo-bad\") \"demo sugar\""),
        "{message}"
    );
}

#[test]
fn duplicate_solute_ids_are_refused() {
    let mut files = good_seed();
    let again = files
        .iter()
        .find(|(p, _)| p == "solutes/demo-sugar.toml")
        .unwrap()
        .clone();
    files.push(again);
    let mut store = Store::open_in_memory().unwrap();
    let message = store.load_seed(&files).unwrap_err().to_string();
    assert!(
        message.contains("duplicate solute id \"demo-sugar\""),
        "{message}"
    );
    assert!(store.is_empty().unwrap());
}

#[test]
fn a_malformed_formula_is_refused_with_its_position() {
    let (err, message) = refused("malformed-formula");
    assert!(
        matches!(problem(&err), SeedProblem::MalformedFormula { formula, .. } if formula == "NaB(r")
    );
    assert!(
        message.contains("solute \"demo-bad\": malformed formula \"NaB(r\""),
        "{message}"
    );
    assert!(message.contains("byte"), "position missing: {message}");
}

#[test]
fn temperatures_outside_the_liquid_range_are_refused() {
    let (err, message) = refused("too-cold");
    assert!(
        matches!(problem(&err), SeedProblem::TemperatureOutOfRange { temperature, .. } if *temperature == -60.0)
    );
    assert!(
        message.contains("dataset \"one\", point 1: temperature -60 C is outside the liquid range"),
        "{message}"
    );

    let (_, message) = refused("too-hot");
    assert!(message.contains("point 2: temperature 120 C"), "{message}");
    assert!(message.contains("water boils"), "{message}");

    let (_, message) = refused("below-eutectic");
    assert!(message.contains("point 1: temperature -20 C"), "{message}");
    assert!(
        message.contains("below the eutectic (-12.00 C)"),
        "{message}"
    );

    let (_, message) = refused("below-ice-line");
    assert!(message.contains("point 1: temperature -8 C"), "{message}");
    assert!(message.contains("freezes at"), "{message}");

    let (_, message) = refused("outside-stable-range");
    assert!(message.contains("point 2: temperature 20 C"), "{message}");
    assert!(message.contains("stable_range"), "{message}");
}

#[test]
fn a_non_numeric_value_is_refused() {
    let (err, message) = refused("not-numeric");
    assert!(matches!(problem(&err), SeedProblem::NotNumeric { .. }));
    assert!(
        message.contains("dataset \"one\", point 2: value is not a number: found \"high\""),
        "{message}"
    );
}

#[test]
fn an_id_unlike_the_file_name_is_refused() {
    let (err, message) = refused("id-mismatch");
    assert!(matches!(problem(&err), SeedProblem::IdMismatch { .. }));
    assert!(
        message.contains("id \"demo-wrong\" does not match the file name (expected \"demo-bad\")"),
        "{message}"
    );
}

#[test]
fn temperatures_out_of_order_are_refused() {
    let (err, message) = refused("not-ascending");
    assert!(matches!(problem(&err), SeedProblem::NotAscending { .. }));
    assert!(
        message.contains("point 3: temperatures must ascend: 10 follows 20"),
        "{message}"
    );
}

#[test]
fn a_misspelt_field_is_refused_with_its_line() {
    let (err, message) = refused("misspelt-field");
    assert!(matches!(problem(&err), SeedProblem::Syntax { .. }));
    assert!(
        message.contains("solutes/demo-bad.toml, line "),
        "{message}"
    );
    assert!(message.contains("unti"), "{message}");
}

#[test]
fn a_failure_while_writing_leaves_nothing_behind() {
    // Make the database itself refuse the last point, so the failure comes in the middle
    // of the write transaction rather than in validation.
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("store.db");
    drop(Store::create(&path).unwrap());
    rusqlite::Connection::open(&path)
        .unwrap()
        .execute_batch(
            "CREATE TRIGGER refuse BEFORE INSERT ON points WHEN NEW.dataset = 'demo-sugar/one' AND NEW.position = 1
             BEGIN SELECT RAISE(ABORT, 'refused by test'); END;",
        )
        .unwrap();
    let mut store = Store::open(&path).unwrap();
    let err = store.load_seed(&good_seed()).unwrap_err();
    assert!(err.to_string().contains("refused by test"), "{err}");
    assert!(store.is_empty().unwrap());
    assert_eq!(store.read_all().unwrap(), Contents::default());
    assert_eq!(store.audit_len().unwrap(), 0);
}

#[test]
fn loading_twice_is_refused() {
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&good_seed()).unwrap();
    let before = store.read_all().unwrap();
    let err = store.load_seed(&good_seed()).unwrap_err();
    assert!(matches!(err, StoreError::NotEmpty { .. }), "{err:?}");
    assert_eq!(store.read_all().unwrap(), before);
}

// ---------------------------------------------------------------------------- lookup

fn catalog() -> Catalog {
    let mut store = Store::open_in_memory().unwrap();
    store.load_seed(&good_seed()).unwrap();
    Catalog::from_store(&store).unwrap()
}

#[test]
fn solutes_are_found_by_slug_name_formula_and_synonym() {
    let c = catalog();
    for name in [
        "demo-salt",
        "Demo Salt",
        "KCl",
        "kcl",
        "testium chloride",
        "KCl.2H2O",
    ] {
        assert_eq!(c.find_solute(name).unwrap().id, "demo-salt", "{name}");
    }
    assert_eq!(c.find_solute("TESTGAS").unwrap().id, "demo-gas");
    assert_eq!(c.find_solute("C12H22O11").unwrap().id, "demo-sugar");
}

#[test]
fn an_unknown_solute_gets_suggestions() {
    let err = catalog().find_solute("demo salts").unwrap_err();
    let CatalogError::UnknownSolute { suggestions, .. } = &err else {
        panic!("{err:?}")
    };
    assert_eq!(suggestions.first().map(String::as_str), Some("demo salt"));
    assert!(err.to_string().contains("did you mean"), "{err}");
}

#[test]
fn the_catalog_keeps_everything_but_retired_datasets() {
    let c = catalog();
    assert_eq!(c.schema_version(), SCHEMA_VERSION);
    assert_eq!(c.datasets_of("demo-salt").len(), 4);
    assert_eq!(c.gas_constants_of("demo-gas").len(), 3);
    assert_eq!(c.freezing_of("demo-salt").len(), 1);
    assert_eq!(c.sources().len(), 2);
    let d = c.describe("demo gas").unwrap();
    assert_eq!(d.sources.len(), 2);
    assert_eq!(catalog().fingerprint(), c.fingerprint());
}
