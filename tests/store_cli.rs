//! The store's commands through the real binary, each in a fresh temporary directory with
//! its own data directory, so the user's default database is never touched.

use std::path::Path;

use assert_cmd::Command;

fn satline(home: &Path) -> Command {
    let mut cmd = Command::cargo_bin("satline").unwrap();
    cmd.env_remove("SATLINE_DB")
        .env("XDG_DATA_HOME", home.join("data"))
        .env("HOME", home)
        .current_dir(home);
    cmd
}

fn stdout(out: &std::process::Output) -> String {
    String::from_utf8_lossy(&out.stdout).into_owned()
}

fn stderr(out: &std::process::Output) -> String {
    String::from_utf8_lossy(&out.stderr).into_owned()
}

fn has_real_seed() -> bool {
    satline::seed_files::SEED_FILES
        .iter()
        .any(|(p, _)| p.starts_with("solutes/"))
}

#[test]
fn init_twice_refuses_the_second_time() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("ref.db");
    let first = satline(dir.path())
        .args(["init", "--db"])
        .arg(&db)
        .output()
        .unwrap();
    assert!(first.status.success(), "{}", stderr(&first));
    assert!(stdout(&first).starts_with("wrote "), "{}", stdout(&first));
    let modified = std::fs::metadata(&db).unwrap().modified().unwrap();

    let second = satline(dir.path())
        .args(["init", "--db"])
        .arg(&db)
        .output()
        .unwrap();
    assert_eq!(second.status.code(), Some(3));
    assert!(
        stderr(&second).contains("already exists; use --force"),
        "{}",
        stderr(&second)
    );
    assert_eq!(
        std::fs::metadata(&db).unwrap().modified().unwrap(),
        modified
    );

    let forced = satline(dir.path())
        .args(["init", "--force", "--db"])
        .arg(&db)
        .output()
        .unwrap();
    assert!(forced.status.success(), "{}", stderr(&forced));
    // No temporary files are left beside it.
    let names: Vec<String> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.contains("building"))
        .collect();
    assert!(names.is_empty(), "{names:?}");
}

#[test]
fn init_without_a_file_is_bad_input() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path()).arg("init").output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains("init needs a file"),
        "{}",
        stderr(&out)
    );
}

#[test]
fn a_missing_database_is_store_trouble() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["solutes", "--db", "missing.db"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(3));
    assert!(
        stderr(&out).contains("no database at missing.db"),
        "{}",
        stderr(&out)
    );
    assert!(!dir.path().join("missing.db").exists());
}

#[test]
fn the_database_can_be_named_in_the_environment() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .env("SATLINE_DB", dir.path().join("nowhere.db"))
        .arg("solutes")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(3));
    assert!(stderr(&out).contains("nowhere.db"), "{}", stderr(&out));
}

#[test]
fn statements_given_as_arguments_are_answered() {
    // The README's first command, on a fresh data directory.
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .arg("which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(text.contains("potassium chloride"), "{text}");
    assert!(text.contains("headroom"), "{text}");
    let out = satline(dir.path())
        .arg("solubility of KNO4 at 20 C")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains("<arguments>:1:15"),
        "{}",
        stderr(&out)
    );
}

#[test]
fn the_default_database_is_built_on_first_use_and_reused() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path()).arg("solutes").output().unwrap();
    assert!(out.status.success(), "{}", stderr(&out));
    let db = dir.path().join("data/satline/default.db");
    assert!(db.is_file());
    let modified = std::fs::metadata(&db).unwrap().modified().unwrap();
    let again = satline(dir.path()).arg("solutes").output().unwrap();
    assert!(again.status.success());
    assert_eq!(stdout(&again), stdout(&out));
    assert_eq!(
        std::fs::metadata(&db).unwrap().modified().unwrap(),
        modified
    );
}

#[test]
fn processes_starting_at_once_share_one_default_database() {
    let dir = tempfile::tempdir().unwrap();
    let children: Vec<_> = (0..4)
        .map(|_| {
            let mut cmd = std::process::Command::new(assert_cmd::cargo::cargo_bin("satline"));
            cmd.env_remove("SATLINE_DB")
                .env("XDG_DATA_HOME", dir.path().join("data"))
                .arg("solutes")
                .stdout(std::process::Stdio::piped())
                .stderr(std::process::Stdio::piped());
            cmd.spawn().unwrap()
        })
        .collect();
    let outputs: Vec<_> = children
        .into_iter()
        .map(|c| c.wait_with_output().unwrap())
        .collect();
    for out in &outputs {
        assert!(out.status.success(), "{}", stderr(out));
        assert_eq!(stdout(out), stdout(&outputs[0]));
    }
    let names: Vec<String> = std::fs::read_dir(dir.path().join("data/satline"))
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    assert_eq!(names, ["default.db"], "temporary files left behind");
}

#[test]
fn a_stale_default_database_is_rebuilt_but_a_named_one_is_not() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("data/satline/default.db");
    std::fs::create_dir_all(db.parent().unwrap()).unwrap();
    // A default database from some other seed.
    satline(dir.path())
        .args(["init", "--db"])
        .arg(&db)
        .assert()
        .success();
    rusqlite::Connection::open(&db)
        .unwrap()
        .execute(
            "UPDATE metadata SET value = 'another seed' WHERE key = 'seed_fingerprint'",
            [],
        )
        .unwrap();
    // Named with --db: used as it is.
    satline(dir.path())
        .arg("solutes")
        .arg("--db")
        .arg(&db)
        .assert()
        .success();
    let fingerprint = |db: &Path| -> String {
        rusqlite::Connection::open(db)
            .unwrap()
            .query_row(
                "SELECT value FROM metadata WHERE key = 'seed_fingerprint'",
                [],
                |r| r.get(0),
            )
            .unwrap()
    };
    assert_eq!(fingerprint(&db), "another seed");
    // As the default: rebuilt from the binary's seed.
    satline(dir.path()).arg("solutes").assert().success();
    assert_eq!(
        fingerprint(&db),
        satline::store::seed::fingerprint(satline::seed_files::SEED_FILES)
    );
}

#[test]
fn an_unwritable_data_directory_falls_back_to_memory() {
    let dir = tempfile::tempdir().unwrap();
    // The data directory is a file, so nothing can be created under it.
    std::fs::write(dir.path().join("data"), "not a directory").unwrap();
    let out = satline(dir.path()).arg("solutes").output().unwrap();
    assert!(out.status.success(), "{}", stderr(&out));
    assert!(stdout(&out).contains("solutes"));
}

#[test]
fn describe_an_unknown_solute_is_bad_input_with_suggestions() {
    if !has_real_seed() {
        eprintln!("skipped: seed-data/solutes is empty in this checkout");
        return;
    }
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["describe", "KNO4"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains("unknown solute \"KNO4\"; did you mean"),
        "{}",
        stderr(&out)
    );
    assert!(stderr(&out).contains("KNO3"), "{}", stderr(&out));
}

#[test]
fn describe_kno3_shows_points_and_a_citation() {
    if !has_real_seed() {
        eprintln!("skipped: seed-data/solutes is empty in this checkout");
        return;
    }
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["describe", "KNO3"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(
        text.starts_with("potassium nitrate (potassium-nitrate)"),
        "{text}"
    );
    assert!(text.contains("molar mass"), "{text}");
    assert!(text.contains("dataset potassium-nitrate/"), "{text}");
    assert!(text.contains("T (C)"), "{text}");
    assert!(text.contains("\nsources\n  ["), "{text}");
    // Every dataset's source is cited in full, with its title.
    let catalog = satline::catalog::Catalog::from_store(
        &satline::store::default_db::in_memory(satline::seed_files::SEED_FILES).unwrap(),
    )
    .unwrap();
    for d in catalog.datasets_of("potassium-nitrate") {
        let source = catalog.source(&d.source).unwrap();
        assert!(text.contains(&satline::catalog::citation(source)), "{text}");
        for p in &d.points {
            assert!(text.contains(&p.value_reported.to_string()), "{text}");
        }
    }
}

#[test]
fn solutes_lists_every_solute() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path()).arg("solutes").output().unwrap();
    assert!(out.status.success(), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(text.starts_with("id "), "{text}");
    let count = satline::seed_files::SEED_FILES
        .iter()
        .filter(|(p, _)| p.starts_with("solutes/"))
        .count();
    assert!(text.ends_with(&format!("{count} solutes\n")), "{text}");
}
