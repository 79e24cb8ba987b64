//! Batch mode through the built binary, in a fresh temporary directory: exit codes, the
//! messages on the error stream, JSON lines, CSV, determinism, standard input and a closed
//! pipe. Tests marked "needs the engine" check answers that only the real engine gives.

use std::io::Read;
use std::path::Path;
use std::process::{Command as StdCommand, Stdio};

use assert_cmd::Command;

/// `satline` in `dir`, with nothing from the caller's environment that changes its answers.
fn satline(dir: &Path) -> Command {
    let mut command = Command::new(env!("CARGO_BIN_EXE_satline"));
    command
        .current_dir(dir)
        .env_remove("SATLINE_DB")
        .env("SATLINE_HISTORY", dir.join("history"));
    command
}

/// What a run left behind.
struct Ran {
    code: Option<i32>,
    stdout: String,
    stderr: String,
}

fn ran(command: &mut Command) -> Ran {
    let output = command.output().unwrap();
    Ran {
        code: output.status.code(),
        stdout: String::from_utf8(output.stdout).unwrap(),
        stderr: String::from_utf8(output.stderr).unwrap(),
    }
}

fn write(dir: &Path, name: &str, text: &str) {
    std::fs::write(dir.join(name), text).unwrap();
}

/// The acceptance set of DESIGN.md, as one script.
const ACCEPTANCE: &str = "\
solubility of KNO3 at 20 C
solubility of potassium nitrate at 68 F in mol/kg
which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%
which solutes stay dissolved at 1.5 mol/kg at 5 C
saturation of KNO3 at 40 g/100g water
ceiling of KCl from 2 C to 8 C margin 10% in mol/kg
heat of solution of KNO3 at 25 C
dissolved O2 at 25 C under air
dissolved CO2 at 4 C under 2.5 bar in g/L
freezing of NaCl at 10 g/100g water at -10 C
convert 20 g/100g water of KCl to mol/kg
describe NaCl
sources of NaCl
list salts with anion sulfate
let cold = from 2 C to 8 C
require KCl stays dissolved at 20 g/100g water over cold margin 10%
";

// ---- exit 3: the store or a file could not be read ----

#[test]
fn missing_file_exits_3_and_names_it() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path()).args(["run", "no-such-check.sl"]));
    assert_eq!(run.code, Some(3));
    assert!(
        run.stderr
            .starts_with("no-such-check.sl: cannot read the script:"),
        "{}",
        run.stderr
    );
    assert_eq!(run.stdout, "");
}

#[test]
fn missing_file_stops_the_run_before_any_output() {
    let dir = tempfile::tempdir().unwrap();
    write(dir.path(), "first.sl", "describe NaCl\n");
    let run = ran(satline(dir.path()).args(["run", "first.sl", "second.sl"]));
    assert_eq!(run.code, Some(3));
    assert!(
        run.stderr.contains("second.sl: cannot read"),
        "{}",
        run.stderr
    );
    assert_eq!(run.stdout, "");
}

#[test]
fn directory_or_non_text_script_exits_3() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir(dir.path().join("checks")).unwrap();
    let run = ran(satline(dir.path()).args(["run", "checks"]));
    assert_eq!(run.code, Some(3));
    assert!(
        run.stderr.starts_with("checks: cannot read"),
        "{}",
        run.stderr
    );

    // "describe" in UTF-16, as some editors save it.
    std::fs::write(dir.path().join("wide.sl"), b"\xff\xfed\x00e\x00").unwrap();
    let run = ran(satline(dir.path()).args(["run", "wide.sl"]));
    assert_eq!(run.code, Some(3));
    assert!(
        run.stderr.contains("wide.sl: the script is not UTF-8 text"),
        "{}",
        run.stderr
    );
}

#[test]
fn missing_database_exits_3_and_names_it() {
    let dir = tempfile::tempdir().unwrap();
    write(dir.path(), "check.sl", "describe NaCl\n");
    let run = ran(satline(dir.path()).args(["--db", "missing/none.db", "run", "check.sl"]));
    assert_eq!(run.code, Some(3));
    assert!(run.stderr.contains("missing/none.db"), "{}", run.stderr);

    let run = ran(satline(dir.path())
        .env("SATLINE_DB", "also-missing.db")
        .args(["run", "check.sl"]));
    assert_eq!(run.code, Some(3));
    assert!(run.stderr.contains("also-missing.db"), "{}", run.stderr);
}

// ---- the command line ----

#[test]
fn run_without_files_is_a_usage_error() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path()).arg("run"));
    assert_eq!(run.code, Some(2));
    assert!(run.stderr.contains("Usage: satline run"), "{}", run.stderr);
}

#[test]
fn unknown_format_is_a_usage_error_listing_the_formats() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path()).args(["run", "--format", "yaml", "-"]));
    assert_eq!(run.code, Some(2));
    for name in ["table", "json", "csv"] {
        assert!(run.stderr.contains(name), "{}", run.stderr);
    }
}

// ---- standard input ----

#[test]
fn empty_script_or_only_comments_exits_0_with_no_output() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path()).args(["run", "-"]).write_stdin(""));
    assert_eq!((run.code, run.stdout.as_str()), (Some(0), ""));
    let run = ran(satline(dir.path())
        .args(["run", "--format", "json", "-"])
        .write_stdin("# a formulation check\n\n   # nothing yet\n"));
    assert_eq!((run.code, run.stdout.as_str()), (Some(0), ""));
    assert_eq!(run.stderr, "");
}

#[test]
fn no_arguments_with_piped_input_runs_it_as_a_script() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path()).write_stdin("# nothing to do\n"));
    assert_eq!(run.code, Some(0));
    assert_eq!(run.stdout, "");

    let run = ran(satline(dir.path()).write_stdin("\nthis is not a statement\n"));
    assert_eq!(run.code, Some(2));
    assert!(run.stderr.starts_with("<stdin>:2:"), "{}", run.stderr);
    assert!(
        run.stdout.contains("» this is not a statement"),
        "{}",
        run.stdout
    );
}

#[test]
fn stdin_and_files_run_in_the_order_given() {
    let dir = tempfile::tempdir().unwrap();
    write(dir.path(), "a.sl", "first nonsense\n");
    write(dir.path(), "b.sl", "third nonsense\n");
    let run = ran(satline(dir.path())
        .args(["run", "--format", "json", "a.sl", "-", "b.sl"])
        .write_stdin("second nonsense\n"));
    let statements: Vec<String> = run
        .stdout
        .lines()
        .map(|line| {
            let value: serde_json::Value = serde_json::from_str(line).unwrap();
            value["statement"].as_str().unwrap().to_string()
        })
        .collect();
    assert_eq!(
        statements,
        ["first nonsense", "second nonsense", "third nonsense"]
    );
    let names: Vec<&str> = run
        .stderr
        .lines()
        .map(|l| l.split(':').next().unwrap())
        .collect();
    assert_eq!(names, ["a.sl", "<stdin>", "b.sl"]);
}

// ---- exit 2: statements that could not be parsed or answered ----

#[test]
fn every_unanswered_statement_is_reported_with_file_line_column() {
    let dir = tempfile::tempdir().unwrap();
    write(
        dir.path(),
        "bad.sl",
        "# cold-room check\nsolubility of KNO3 at\n\nwhich salts dance at noon\n",
    );
    let run = ran(satline(dir.path()).args(["run", "bad.sl"]));
    assert_eq!(run.code, Some(2));
    let lines: Vec<&str> = run.stderr.lines().collect();
    assert_eq!(lines.len(), 2, "{}", run.stderr);
    assert!(lines[0].starts_with("bad.sl:2:"), "{}", run.stderr);
    assert!(lines[1].starts_with("bad.sl:4:"), "{}", run.stderr);
    // `file:line:column: message`
    for line in lines {
        let fields: Vec<&str> = line.splitn(4, ':').collect();
        assert_eq!(fields.len(), 4, "{line}");
        assert!(fields[2].parse::<usize>().is_ok(), "{line}");
        assert!(!fields[3].trim().is_empty(), "{line}");
    }
}

#[test]
fn each_file_counts_its_own_lines() {
    let dir = tempfile::tempdir().unwrap();
    write(dir.path(), "a.sl", "# one\n# two\nnonsense in a\n");
    write(dir.path(), "b.sl", "nonsense in b\n");
    let run = ran(satline(dir.path()).args(["run", "a.sl", "b.sl"]));
    assert_eq!(run.code, Some(2));
    let lines: Vec<&str> = run.stderr.lines().collect();
    assert!(lines[0].starts_with("a.sl:3:"), "{}", run.stderr);
    assert!(lines[1].starts_with("b.sl:1:"), "{}", run.stderr);
}

#[test]
fn table_output_marks_the_fault_under_the_statement() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path())
        .args(["run", "-"])
        .write_stdin("solubility of KNO3 at 5 g/L\n"));
    assert_eq!(run.code, Some(2));
    assert!(
        run.stdout.contains(
            "» solubility of KNO3 at 5 g/L\n                        ‾‾‾‾‾ line 1, column 23\n  \
             not read: expected a temperature"
        ),
        "{}",
        run.stdout
    );
}

#[test]
fn syntax_error_points_at_the_fault() {
    let dir = tempfile::tempdir().unwrap();
    write(
        dir.path(),
        "units.sl",
        "solubility of KNO3 at 20 C\nsolubility of KNO3 at 20 g/L\n",
    );
    let run = ran(satline(dir.path()).args(["run", "units.sl"]));
    assert_eq!(run.code, Some(2));
    let lines: Vec<&str> = run.stderr.lines().collect();
    assert_eq!(lines.len(), 1, "{}", run.stderr);
    // The fault is the loading where a temperature belongs, at column 23.
    assert!(lines[0].starts_with("units.sl:2:23: "), "{}", run.stderr);
}

// ---- JSON lines and CSV ----

#[test]
fn json_output_is_one_parsable_object_per_statement() {
    let dir = tempfile::tempdir().unwrap();
    let script = "describe NaCl\nsolubility of KNO3 at\n# comment\nsources of NaCl; describe KCl\n";
    let run = ran(satline(dir.path())
        .args(["run", "--format", "json", "-"])
        .write_stdin(script));
    let objects: Vec<serde_json::Value> = run
        .stdout
        .lines()
        .map(|line| serde_json::from_str(line).unwrap())
        .collect();
    assert!(objects.len() >= 3, "{}", run.stdout);
    for object in &objects {
        for key in ["statement", "kind", "ok", "rows", "caveats", "sources"] {
            assert!(object.get(key).is_some(), "no `{key}` in {object}");
        }
        if object["ok"] == false {
            let error = &object["error"];
            assert!(error["message"].is_string(), "{object}");
            assert!(error["line"].as_u64().unwrap() >= 1, "{object}");
            assert!(error["column"].as_u64().unwrap() >= 1, "{object}");
        }
    }
    // The statement with the fault is line 2 of the script.
    assert!(
        objects
            .iter()
            .any(|o| o["ok"] == false && o["error"]["line"] == 2),
        "{}",
        run.stdout
    );
}

#[test]
fn csv_output_has_one_header_and_a_line_per_statement() {
    let dir = tempfile::tempdir().unwrap();
    let run = ran(satline(dir.path())
        .args(["run", "--format", "csv", "-"])
        .write_stdin("nonsense one\nnonsense two\n"));
    let lines: Vec<&str> = run.stdout.lines().collect();
    assert!(lines[0].starts_with("statement,kind,ok,"), "{}", run.stdout);
    assert_eq!(lines.len(), 3, "{}", run.stdout);
}

#[test]
fn output_is_byte_identical_across_runs() {
    let dir = tempfile::tempdir().unwrap();
    write(dir.path(), "acceptance.sl", ACCEPTANCE);
    for format in ["table", "json", "csv"] {
        let first = satline(dir.path())
            .args(["run", "--format", format, "acceptance.sl"])
            .output()
            .unwrap();
        let second = satline(dir.path())
            .args(["run", "--format", format, "acceptance.sl"])
            .output()
            .unwrap();
        assert!(!first.stdout.is_empty());
        assert_eq!(first.stdout, second.stdout, "{format} output differs");
        assert_eq!(first.stderr, second.stderr, "{format} messages differ");
        assert_eq!(first.status.code(), second.status.code());
    }
}

// ---- a closed pipe ----

#[test]
fn closed_pipe_is_a_clean_exit() {
    let dir = tempfile::tempdir().unwrap();
    // Far more output than a pipe holds, so the writer meets the closed end.
    let script = "describe NaCl\n".repeat(5000);
    write(dir.path(), "long.sl", &script);
    let stderr = std::fs::File::create(dir.path().join("stderr")).unwrap();
    let mut child = StdCommand::new(env!("CARGO_BIN_EXE_satline"))
        .current_dir(dir.path())
        .env_remove("SATLINE_DB")
        .args(["run", "long.sl"])
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(stderr)
        .spawn()
        .unwrap();
    // Read a little, as `head` would, then close the pipe.
    let mut stdout = child.stdout.take().unwrap();
    let mut first = [0u8; 64];
    stdout.read_exact(&mut first).unwrap();
    drop(stdout);
    let status = child.wait().unwrap();
    let messages = std::fs::read_to_string(dir.path().join("stderr")).unwrap();
    assert!(!messages.contains("panicked"), "{messages}");
    assert!(!messages.contains("cannot write"), "{messages}");
    assert!(
        matches!(status.code(), Some(0..=2)),
        "exit status {status:?}: {messages}"
    );
}

// ---- with the engine: exit 0 and exit 1 ----

#[test]
fn script_of_answered_statements_and_held_requirements_exits_0() {
    let dir = tempfile::tempdir().unwrap();
    write(
        dir.path(),
        "ok.sl",
        "let cold = from 2 C to 8 C\n\
         describe KCl\n\
         require KCl stays dissolved at 5 g/100g water over cold margin 10%\n",
    );
    let run = ran(satline(dir.path()).args(["run", "ok.sl"]));
    assert_eq!(run.code, Some(0), "{}", run.stderr);
    assert_eq!(run.stderr, "");
}

#[test]
fn failing_requirement_exits_1_and_names_the_failing_one() {
    let dir = tempfile::tempdir().unwrap();
    // Potassium nitrate is far less soluble near 2 C than 60 g/100g water (its solubility
    // rises steeply with temperature); potassium chloride dissolves 5 g/100g water easily.
    write(
        dir.path(),
        "cold-room.sl",
        "let cold = from 2 C to 8 C\n\
         require KCl stays dissolved at 5 g/100g water over cold margin 10%\n\
         require KNO3 stays dissolved at 60 g/100g water over cold margin 10%\n",
    );
    let run = ran(satline(dir.path()).args(["run", "cold-room.sl"]));
    assert_eq!(run.code, Some(1), "{}", run.stderr);
    let lines: Vec<&str> = run.stderr.lines().collect();
    assert_eq!(lines.len(), 1, "{}", run.stderr);
    assert!(
        lines[0].starts_with(
            "cold-room.sl:3:1: requirement did not hold: \
             require KNO3 stays dissolved at 60 g/100g water over cold margin 10%"
        ),
        "{}",
        run.stderr
    );
    assert!(
        lines[0].contains("limiting temperature 2 C"),
        "{}",
        run.stderr
    );
    assert!(lines[0].contains("short by"), "{}", run.stderr);

    let run = ran(satline(dir.path()).args(["run", "--format", "json", "cold-room.sl"]));
    assert_eq!(run.code, Some(1));
    let last: serde_json::Value = serde_json::from_str(run.stdout.lines().last().unwrap()).unwrap();
    assert_eq!(last["kind"], "require");
    assert_eq!(last["holds"], false);
}

#[test]
fn unanswered_statement_outranks_a_failed_requirement() {
    let dir = tempfile::tempdir().unwrap();
    write(
        dir.path(),
        "mixed.sl",
        "require KNO3 stays dissolved at 60 g/100g water from 2 C to 8 C\n\
         solubility of KNO3 at\n",
    );
    let run = ran(satline(dir.path()).args(["run", "mixed.sl"]));
    assert_eq!(run.code, Some(2));
    assert!(
        run.stderr
            .contains("mixed.sl:1:1: requirement did not hold")
    );
    assert!(run.stderr.contains("mixed.sl:2:"));
}

#[test]
fn every_help_example_is_answered() {
    let dir = tempfile::tempdir().unwrap();
    let script: String = satline::frontend::help::examples()
        .map(|e| format!("{e}\n"))
        .collect();
    write(dir.path(), "examples.sl", &script);
    let run = ran(satline(dir.path()).args(["run", "examples.sl"]));
    assert_eq!(run.code, Some(0), "{}", run.stderr);
}

/// A pasted megabyte as a solute name: the JSON answer and the message on the error stream
/// repeat neither the megabyte nor more than the cut statement, and the answer still says
/// where the whole statement is.
#[test]
fn a_megabyte_statement_is_not_echoed_back() {
    let dir = tempfile::tempdir().unwrap();
    let name = "x".repeat(1_000_000);
    let script = format!("solubility of KNO3 at 20 C\nsolubility of {name} at 20 C\n");
    write(dir.path(), "big.sl", &script);
    let run = ran(satline(dir.path()).args(["run", "big.sl", "--format", "json"]));
    assert_eq!(run.code, Some(2));
    assert!(run.stdout.len() < 10_000, "{} bytes", run.stdout.len());
    assert!(run.stderr.len() < 10_000, "{} bytes", run.stderr.len());
    let second: serde_json::Value =
        serde_json::from_str(run.stdout.lines().nth(1).unwrap()).unwrap();
    assert_eq!(second["line"], 2);
    let statement = second["statement"].as_str().unwrap();
    assert!(statement.starts_with("solubility of xxxx"), "{statement}");
    let whole = format!("solubility of {name} at 20 C");
    assert!(
        statement.ends_with(&format!(
            "[cut: {} characters in all; the whole statement is bytes 27–{} of the script]",
            whole.len(),
            27 + whole.len()
        )),
        "{}",
        &statement[statement.len() - 200..]
    );
    assert_eq!(&script[27..27 + whole.len()], whole);
}
