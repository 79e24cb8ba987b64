//! The batch target of issue 20 on the real command: `satline --format json run FILE` (the
//! release binary, start-up included, standard output to /dev/null as a program reading it
//! would not be a terminal either) on a script of 4,000 lookups and on one of 40,000.
//! Target: 40,000 under 10 times 4,000.
//!
//! Rounds interleave the sizes (five runs of 4,000, then one of 40,000, then one of a single
//! lookup), so a load that changes while the driver runs (2 shared cores) falls on all alike.
//! Prints each round, then the medians of the wall times and the median of the rounds'
//! ratios; the single lookup shows the start-up every run pays (opening the reference,
//! building the snapshot), which is why the command's ratio is well under 10 while the
//! in-process figure of `benches/linear.rs` (no start-up) is 10 for any linear program.
//! Before timing, one run of each size is checked: exit 0 and one JSON line per statement,
//! every one answered.
//!
//! Run with `cargo bench --bench batch_command` (about a minute), or with a number of rounds:
//! `cargo bench --bench batch_command -- 21`.
//!
//! The statements are generated here by a fixed rule (the same as `benches/linear.rs`);
//! they are questions, not data.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::Instant;

/// Runs of 4,000 per round, averaged, beside one run of 40,000.
const SMALL_PER_ROUND: usize = 5;

/// `n` lookups, one a line, at temperatures that cycle through the data's range (as the
/// `batch_statements` group of `benches/linear.rs`).
fn lookups(n: usize) -> String {
    (0..n)
        .map(|i| format!("solubility of KNO3 at {} C\n", i % 90 + 5))
        .collect()
}

fn command(satline: &Path, script: &Path) -> Command {
    let mut c = Command::new(satline);
    c.args(["--format", "json", "run"]).arg(script);
    c
}

/// Wall time of one run, ms, output discarded; `None` when it failed.
fn once(satline: &Path, script: &Path) -> Option<f64> {
    let started = Instant::now();
    let status = command(satline, script)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .status()
        .ok()?;
    let ms = started.elapsed().as_secs_f64() * 1e3;
    status.success().then_some(ms)
}

/// Whether a run answers every one of `n` statements: exit 0, `n` JSON lines, all `ok`.
fn answers_all(satline: &Path, script: &Path, n: usize) -> bool {
    let Ok(out) = command(satline, script).stderr(Stdio::null()).output() else {
        return false;
    };
    let text = String::from_utf8_lossy(&out.stdout);
    out.status.success()
        && text.lines().count() == n
        && text.lines().all(|l| l.contains("\"ok\":true"))
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn main() {
    // `cargo bench` passes `--bench`; a bare number is the count of rounds.
    let rounds = std::env::args()
        .skip(1)
        .find_map(|a| a.parse::<usize>().ok())
        .unwrap_or(11)
        .max(1);
    let satline = PathBuf::from(env!("CARGO_BIN_EXE_satline"));
    let dir = tempfile::tempdir().expect("a temporary directory");
    let (one, small, large) = (
        dir.path().join("1.sl"),
        dir.path().join("4000.sl"),
        dir.path().join("40000.sl"),
    );
    std::fs::write(&one, lookups(1)).expect("the script of one is written");
    std::fs::write(&small, lookups(4_000)).expect("the script of 4,000 is written");
    std::fs::write(&large, lookups(40_000)).expect("the script of 40,000 is written");
    for (script, n) in [(&one, 1), (&small, 4_000), (&large, 40_000)] {
        if !answers_all(&satline, script, n) {
            eprintln!(
                "{} did not answer all {n} statements of {}: nothing timed",
                satline.display(),
                script.display()
            );
            std::process::exit(1);
        }
    }
    println!(
        "satline --format json run FILE > /dev/null: {rounds} rounds of {SMALL_PER_ROUND} runs of 4,000 lookups, one of 40,000, one of a single lookup"
    );
    let (mut smalls, mut larges, mut ratios, mut ones) =
        (Vec::new(), Vec::new(), Vec::new(), Vec::new());
    for round in 1..=rounds {
        let mut sum = 0.0;
        for _ in 0..SMALL_PER_ROUND {
            sum += once(&satline, &small).expect("a run of 4,000");
        }
        let s = sum / SMALL_PER_ROUND as f64;
        let l = once(&satline, &large).expect("a run of 40,000");
        let o = once(&satline, &one).expect("a run of one");
        println!(
            "  round {round:2}: 4,000 {s:7.1} ms   40,000 {l:7.1} ms   {:.2}x   one lookup {o:5.1} ms",
            l / s
        );
        ones.push(o);
        smalls.push(s);
        larges.push(l);
        ratios.push(l / s);
    }
    let ratio = median(ratios);
    println!(
        "medians: 4,000 {:.1} ms, 40,000 {:.1} ms, one lookup (start-up) {:.1} ms; median ratio {ratio:.2}x (target under 10x): {}",
        median(smalls),
        median(larges),
        median(ones),
        if ratio < 10.0 { "met" } else { "NOT met" }
    );
}
