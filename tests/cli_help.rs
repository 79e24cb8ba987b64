//! `satline help [TOPIC]` on the real binary: the session's topics at the command line, the
//! commands' own help, and `--help` pointing at the language guide.

use assert_cmd::Command;

fn satline() -> Command {
    Command::cargo_bin("satline").unwrap()
}

#[test]
fn help_on_a_statement_works_at_the_command_line() {
    let out = satline().args(["help", "solubility"]).assert().success();
    let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    assert!(text.contains("solubility of"), "{text}");
}

#[test]
fn help_on_a_command_and_an_unknown_topic() {
    let out = satline().args(["help", "export"]).assert().success();
    let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    assert!(text.contains("--to"), "{text}");
    let out = satline().args(["help", "solubilty"]).assert().code(2);
    let err = String::from_utf8(out.get_output().stderr.clone()).unwrap();
    assert!(err.contains("did you mean `solubility`?"), "{err}");
}

#[test]
fn help_flag_names_the_language_guide() {
    for flag in ["-h", "--help"] {
        let out = satline().arg(flag).assert().success();
        let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
        assert!(text.contains("satline help TOPIC"), "{text}");
        assert!(text.contains("grammar/README.md"), "{text}");
    }
}

#[test]
fn every_command_has_a_description_and_an_example() {
    let commands = [
        "run", "repl", "init", "import", "review", "history", "retire", "restore", "export",
        "check", "source", "describe", "solutes", "help", "serve",
    ];
    for command in commands {
        let out = satline().args([command, "--help"]).assert().success();
        let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
        let first = text.lines().next().unwrap_or("");
        assert!(
            first.len() > 10,
            "`{command} --help` has no description: {text}"
        );
        assert!(
            text.contains(&format!("Example: satline {command}")),
            "`{command} --help` has no example: {text}"
        );
    }
}
