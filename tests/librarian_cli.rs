//! The librarian's commands through the real binary, each in a fresh temporary directory with
//! its own data directory: the README walkthrough exactly as written, the dry run that
//! leaves the file byte-identical, writes refused on the embedded database, exit codes.
//! All data here are invented (tests/fixtures/librarian/README.md).

use std::path::{Path, PathBuf};

use assert_cmd::Command;

fn satline(home: &Path) -> Command {
    let mut cmd = Command::cargo_bin("satline").unwrap();
    cmd.env_remove("SATLINE_DB")
        .env("XDG_DATA_HOME", home.join("data"))
        .env("HOME", home)
        .current_dir(home);
    cmd
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

fn repo() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn fixture_csv() -> PathBuf {
    repo().join("tests/fixtures/librarian/invented-demo-salt.csv")
}

/// Runs `args` and returns (exit code, stdout, stderr).
fn run(home: &Path, args: &[&str]) -> (i32, String, String) {
    let out = satline(home).args(args).output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        text(&out.stdout),
        text(&out.stderr),
    )
}

/// An empty database with the invented demo source, in `home`.
fn empty_with_source(home: &Path) -> PathBuf {
    let db = home.join("lib.db");
    let db_arg = db.to_str().unwrap();
    assert_eq!(run(home, &["init", "--empty", "--db", db_arg]).0, 0);
    let (code, _, err) = run(
        home,
        &[
            "source",
            "add",
            "invented-demo-table",
            "--db",
            db_arg,
            "--kind",
            "other",
            "--title",
            "Invented demo table",
            "--authors",
            "nobody (invented)",
        ],
    );
    assert_eq!(code, 0, "{err}");
    db
}

/// The shell block of the walkthrough: from README.md once the section is merged there,
/// else from the section file.
fn walkthrough() -> Vec<String> {
    let readme = std::fs::read_to_string(repo().join("README.md")).unwrap_or_default();
    let text = if readme.contains("## Keeping the reference") {
        readme
    } else {
        std::fs::read_to_string(repo().join("README-librarian-section.md")).unwrap()
    };
    let section = &text[text.find("## Keeping the reference").unwrap()..];
    let start = section.find("```sh\n").unwrap() + 6;
    let end = start + section[start..].find("```").unwrap();
    section[start..end]
        .lines()
        .map(str::trim)
        .filter(|l| l.starts_with("satline "))
        .map(str::to_string)
        .collect()
}

#[test]
fn the_readme_walkthrough_works_as_written() {
    let dir = tempfile::tempdir().unwrap();
    let home = dir.path();
    // The walkthrough runs from the repository's top directory: give it the fixture there.
    let fixtures = home.join("tests/fixtures/librarian");
    std::fs::create_dir_all(&fixtures).unwrap();
    std::fs::copy(fixture_csv(), fixtures.join("invented-demo-salt.csv")).unwrap();
    let bin = assert_cmd::cargo::cargo_bin("satline");
    let path = format!(
        "{}:{}",
        bin.parent().unwrap().display(),
        std::env::var("PATH").unwrap_or_default()
    );
    let lines = walkthrough();
    assert!(lines.len() >= 12, "{lines:?}");
    let mut outputs = Vec::new();
    for line in &lines {
        let expected: i32 = line
            .split("# exit ")
            .nth(1)
            .and_then(|rest| rest.split(|c: char| !c.is_ascii_digit()).next())
            .and_then(|n| n.parse().ok())
            .unwrap_or(0);
        let out = std::process::Command::new("sh")
            .arg("-c")
            .arg(line)
            .env("PATH", &path)
            .env_remove("SATLINE_DB")
            .env("XDG_DATA_HOME", home.join("data"))
            .env("HOME", home)
            .current_dir(home)
            .output()
            .unwrap();
        assert_eq!(
            out.status.code(),
            Some(expected),
            "{line}\nstdout: {}\nstderr: {}",
            text(&out.stdout),
            text(&out.stderr)
        );
        outputs.push((line.clone(), text(&out.stdout)));
    }
    let find = |prefix: &str, nth: usize| {
        outputs
            .iter()
            .filter(|(l, _)| l.starts_with(prefix))
            .nth(nth)
            .map(|(_, o)| o.clone())
            .unwrap()
    };
    let dry = find("satline import", 0);
    assert!(dry.contains("nothing written"), "{dry}");
    assert!(
        dry.contains("add dataset:invented-demo-salt/invented-demo-table"),
        "{dry}"
    );
    let first_query = find("satline --db lib.db", 0);
    assert!(first_query.contains("53"), "{first_query}");
    assert!(
        first_query.contains("rests on unreviewed data"),
        "{first_query}"
    );
    let history = find("satline history", 0);
    // One row per change: actor, action and record in their columns, numbers rounded.
    for (actor, action) in [("carol", "add"), ("alice", "add"), ("bob", "approve")] {
        assert!(
            history
                .lines()
                .any(|l| l.contains(&format!("│ {actor} ")) && l.contains(&format!("│ {action} "))),
            "{history}"
        );
    }
    assert!(!history.contains("unknown"), "{history}");
    assert!(!history.contains("0.16317991631799164"), "{history}");
    let restored = find("satline --db lib.db", 2);
    assert!(restored.contains("53"), "{restored}");
    assert!(!restored.contains("unreviewed"), "{restored}");
    let check = find("satline check", 0);
    assert!(check.contains("no problems found"), "{check}");
    assert!(
        home.join("lib-export/solutes/invented-demo-salt.toml")
            .is_file()
    );
}

#[test]
fn a_dry_run_leaves_the_database_file_byte_identical() {
    let dir = tempfile::tempdir().unwrap();
    let db = empty_with_source(dir.path());
    let before = std::fs::read(&db).unwrap();
    let (code, out, err) = run(
        dir.path(),
        &[
            "import",
            fixture_csv().to_str().unwrap(),
            "--dry-run",
            "--db",
            db.to_str().unwrap(),
        ],
    );
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("2 added, 0 changed, 0 retired, 0 unchanged"),
        "{out}"
    );
    assert_eq!(std::fs::read(&db).unwrap(), before);
    // And nothing reached the write-ahead log either: a fresh reader sees no solute.
    let store = satline::store::Store::open_read_only(&db).unwrap();
    assert!(store.read_all().unwrap().solutes.is_empty());
}

#[test]
fn writes_to_the_embedded_database_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    for args in [
        vec!["import", fixture_csv().to_str().unwrap()],
        vec!["review", "approve", "x/y", "--note", "n"],
        vec!["retire", "x/y"],
        vec!["restore", "x/y"],
        vec!["source", "add", "k", "--kind", "other"],
        vec!["init", "--empty"],
    ] {
        let (code, _, err) = run(dir.path(), &args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(err.contains("--db PATH"), "{args:?}: {err}");
    }
}

#[test]
fn a_refused_import_is_bad_input_and_names_the_line() {
    let dir = tempfile::tempdir().unwrap();
    let db = empty_with_source(dir.path());
    let csv = dir.path().join("bad.csv");
    std::fs::write(
        &csv,
        "solute,formula,phase,temperature,temperature_unit,value,unit,source\n\
         invented-x,KCl,KCl,0,C,10,%w/w,invented-demo-table\n\
         invented-x,KCl,KCl,20,C,ten,%w/w,invented-demo-table\n",
    )
    .unwrap();
    let (code, _, err) = run(
        dir.path(),
        &[
            "import",
            csv.to_str().unwrap(),
            "--db",
            db.to_str().unwrap(),
        ],
    );
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("bad.csv, line 3: value is not a number: found \"ten\""),
        "{err}"
    );
}

#[test]
fn check_exits_1_on_a_conflict_and_3_on_a_file_that_is_not_a_database() {
    let dir = tempfile::tempdir().unwrap();
    let db = empty_with_source(dir.path());
    let db_arg = db.to_str().unwrap();
    let (code, _, err) = run(
        dir.path(),
        &[
            "source",
            "add",
            "invented-second-table",
            "--db",
            db_arg,
            "--kind",
            "other",
            "--title",
            "A second invented table",
            "--authors",
            "nobody (invented)",
        ],
    );
    assert_eq!(code, 0, "{err}");
    assert_eq!(
        run(
            dir.path(),
            &["import", fixture_csv().to_str().unwrap(), "--db", db_arg]
        )
        .0,
        0
    );
    let csv = dir.path().join("second.csv");
    std::fs::write(
        &csv,
        "solute,formula,phase,temperature,temperature_unit,value,unit,source\n\
         invented-demo-salt,RbNO3,RbNO3,20,C,60,g/100g water,invented-second-table\n",
    )
    .unwrap();
    let (code, out, err) = run(
        dir.path(),
        &["import", csv.to_str().unwrap(), "--dry-run", "--db", db_arg],
    );
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("at 20 C: 60 g/100g water against 53 g/100g water"),
        "{out}"
    );
    assert_eq!(
        run(
            dir.path(),
            &["import", csv.to_str().unwrap(), "--db", db_arg]
        )
        .0,
        0
    );
    let (code, out, _) = run(dir.path(), &["check", "--db", db_arg]);
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("conflicts: 1"), "{out}");
    // A wider tolerance accepts it.
    assert_eq!(
        run(dir.path(), &["check", "--tolerance", "20", "--db", db_arg]).0,
        0
    );

    let notes = dir.path().join("notes.db");
    std::fs::write(
        &notes,
        "not a database, but long enough to have a header of sorts",
    )
    .unwrap();
    let (code, _, err) = run(dir.path(), &["check", "--db", notes.to_str().unwrap()]);
    assert_eq!(code, 3, "{err}");
}

#[test]
fn history_as_json_lines_and_init_empty_force() {
    let dir = tempfile::tempdir().unwrap();
    let db = empty_with_source(dir.path());
    let db_arg = db.to_str().unwrap();
    assert_eq!(
        run(
            dir.path(),
            &["import", fixture_csv().to_str().unwrap(), "--db", db_arg]
        )
        .0,
        0
    );
    let (code, out, err) = run(
        dir.path(),
        &["history", "RbNO3", "--format", "json", "--db", db_arg],
    );
    assert_eq!(code, 0, "{err}");
    let lines: Vec<serde_json::Value> = out
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    // The source it cites, the solute, the dataset.
    assert_eq!(lines.len(), 3);
    assert_eq!(lines[0]["entity"], "source:invented-demo-table");
    assert_eq!(
        lines[2]["entity"],
        "dataset:invented-demo-salt/invented-demo-table"
    );
    assert_eq!(lines[2]["after"]["review"], "unreviewed");
    // An unknown solute is bad input.
    assert_eq!(run(dir.path(), &["history", "KNO4", "--db", db_arg]).0, 2);
    // init --empty refuses an existing file without --force, replaces it with --force.
    let (code, _, err) = run(dir.path(), &["init", "--empty", "--db", db_arg]);
    assert_eq!(code, 3, "{err}");
    assert!(err.contains("already exists"), "{err}");
    let (code, _, err) = run(dir.path(), &["init", "--empty", "--force", "--db", db_arg]);
    assert_eq!(code, 0, "{err}");
    let (code, out, _) = run(dir.path(), &["review", "--db", db_arg]);
    assert_eq!(code, 0);
    assert!(out.contains("nothing is waiting for review"), "{out}");
}
