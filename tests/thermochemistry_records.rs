//! The thermochemical records (`thermochemistry/*.toml`) go through export and import like
//! every other record: exported as seed files, imported into an empty database unchanged,
//! and a changed figure imported as one audited change that keeps its place.

use satline::store::export::to_toml_files;
use satline::store::import::ChangeKind;
use satline::store::{ImportFile, ImportOptions, Store, init_empty, init_file};

fn file(path: &str, text: &str) -> ImportFile {
    ImportFile {
        path: path.to_string(),
        text: text.to_string(),
    }
}

fn thermo_files(files: &[(String, String)]) -> Vec<&(String, String)> {
    files
        .iter()
        .filter(|(name, _)| name.starts_with("thermochemistry/"))
        .collect()
}

/// A database file built from the embedded seed, in a directory removed when dropped.
fn seeded_database() -> (tempfile::TempDir, std::path::PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let seeded = dir.path().join("seed.db");
    init_file(&seeded, satline::seed_files::SEED_FILES, false).unwrap();
    (dir, seeded)
}

#[test]
fn thermochemistry_exports_and_imports_into_an_empty_database_unchanged() {
    let (dir, seeded) = seeded_database();
    let original = Store::open(&seeded).unwrap().read_all().unwrap();
    assert!(original.thermochemistry.values.len() > 100);
    assert!(original.thermochemistry.heat_capacity.len() >= 20);
    let exported = to_toml_files(&original);
    let names: Vec<&str> = thermo_files(&exported)
        .iter()
        .map(|(n, _)| n.as_str())
        .collect();
    assert_eq!(
        names,
        [
            "thermochemistry/cycle-from-memory.toml",
            "thermochemistry/formation-crc.toml",
            "thermochemistry/heat-capacity-laliberte.toml",
        ]
    );

    // Into an empty database, by their bare names (known by their tables, not their folder).
    let empty = dir.path().join("empty.db");
    init_empty(&empty, "test", false).unwrap();
    let mut copy = Store::open(&empty).unwrap();
    let files: Vec<ImportFile> = exported
        .iter()
        .map(|(name, text)| file(name.rsplit('/').next().unwrap(), text))
        .collect();
    let keep = ImportOptions {
        keep_state: true,
        ..ImportOptions::default()
    };
    let start = copy.audit_len().unwrap();
    let plan = copy.plan_import(&files, &keep).unwrap();
    let thermo_changes = plan
        .changes
        .iter()
        .filter(|c| c.entity.starts_with("thermo:") || c.entity.starts_with("heat-capacity:"))
        .count();
    assert_eq!(
        thermo_changes,
        original.thermochemistry.values.len() + original.thermochemistry.heat_capacity.len()
    );
    let summary = copy.apply_import(&plan, "test", &mut || {}).unwrap();
    assert_eq!(copy.audit_len().unwrap(), start + summary.audit_rows as u64);
    let again = copy.read_all().unwrap();
    assert_eq!(again.thermochemistry, original.thermochemistry);
    assert_eq!(
        thermo_files(&to_toml_files(&again)),
        thermo_files(&exported)
    );
    let audit = copy.audit().unwrap();
    assert!(audit.iter().any(|a| {
        a.entity == "thermo:formation/cr/-/CaCl2/crc-95-substances"
            && a.action == "add"
            && a.before.is_none()
    }));
    assert!(audit.iter().any(|a| a.entity == "heat-capacity:CaCl2"));
}

#[test]
fn a_changed_figure_is_one_audited_change_that_keeps_its_place() {
    let (_dir, seeded) = seeded_database();
    let mut store = Store::open(&seeded).unwrap();
    let exported = to_toml_files(&store.read_all().unwrap());
    let (_, crc) = exported
        .iter()
        .find(|(n, _)| n == "thermochemistry/formation-crc.toml")
        .unwrap();
    assert!(crc.contains("[\"CaCl2\", -795.4]"), "{crc}");
    let edited = crc.replace("[\"CaCl2\", -795.4]", "[\"CaCl2\", -795.5]");
    let plan = store
        .plan_import(
            &[file("formation-crc.toml", &edited)],
            &ImportOptions::default(),
        )
        .unwrap();
    assert_eq!(
        plan.count(ChangeKind::Changed),
        1,
        "{:?}",
        plan.changes
            .iter()
            .filter(|c| c.kind != ChangeKind::Unchanged)
            .map(|c| &c.entity)
            .collect::<Vec<_>>()
    );
    assert_eq!(plan.count(ChangeKind::Added), 0);
    let changed = plan
        .changes
        .iter()
        .find(|c| c.kind == ChangeKind::Changed)
        .unwrap();
    assert_eq!(
        changed.entity,
        "thermo:formation/cr/-/CaCl2/crc-95-substances"
    );
    let summary = store.apply_import(&plan, "erin", &mut || {}).unwrap();
    assert_eq!(summary.audit_rows, 1);
    let row = store.audit().unwrap().pop().unwrap();
    assert_eq!(row.actor, "erin");
    assert_eq!(row.action, "change");
    assert_eq!(row.before.unwrap()["value"], -795.4);
    assert_eq!(row.after.unwrap()["value"], -795.5);
    // Updated in place: the export is the edited file, byte for byte.
    let after = to_toml_files(&store.read_all().unwrap());
    let (_, crc_after) = after
        .iter()
        .find(|(n, _)| n == "thermochemistry/formation-crc.toml")
        .unwrap();
    assert_eq!(crc_after, &edited);
    // And the engine answers from it: ΔH°sol of CaCl2 moved by 0.1 kJ/mol.
    let catalog = satline::catalog::Catalog::from_store(&store).unwrap();
    let w =
        satline::science::enthalpy::standard_heat_of_solution(catalog.thermochemistry(), "CaCl2")
            .unwrap();
    assert!((w.kj_per_mol - (-81.7)).abs() < 1e-6, "{}", w.kj_per_mol);
}

#[test]
fn the_json_export_writes_the_seed_words_and_reads_back_unchanged() {
    let (_dir, seeded) = seeded_database();
    let contents = Store::open(&seeded).unwrap().read_all().unwrap();
    let json = satline::store::export::to_json(&contents).unwrap();
    // A state of formation is written as in the seed files (`cr`, `aq`, `g`, `l`), as every
    // other word of the reference is, not by the name of its variant in the code.
    assert!(json.contains("\"state\": \"cr\""), "no crystal state");
    assert!(json.contains("\"state\": \"aq\""), "no aqueous state");
    assert!(!json.contains("\"Crystal\""));
    assert!(json.contains("\"provenance\": \"from-memory\""));
    use satline::model::thermo::Thermochemistry;
    let exported: serde_json::Value = serde_json::from_str(&json).unwrap();
    let part = &exported["thermochemistry"];
    let back: Thermochemistry = serde_json::from_value(part.clone()).unwrap();
    assert_eq!(back, contents.thermochemistry);
    // A word that is none of the reference's is refused as serde refuses an unknown variant.
    let bad = serde_json::to_string(part).unwrap().replacen(
        "\"state\":\"cr\"",
        "\"state\":\"crystal\"",
        1,
    );
    let e = serde_json::from_str::<Thermochemistry>(&bad)
        .unwrap_err()
        .to_string();
    assert!(
        e.starts_with("unknown variant `crystal`, expected one of `cr`, `aq`, `g`, `l`"),
        "{e}"
    );
}
