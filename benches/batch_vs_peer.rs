//! satline's batch against a peer script, start-up included: 3,000 range screenings over the
//! embedded reference answered by `satline --format json run FILE` (the release binary) and
//! by `benches/peer/screen.py` (pandas + SciPy over `satline export --to csv`: PCHIP per
//! phase, a 121-point grid per statement, the same pass rule). Prints both wall times, the
//! ratio (target: satline at least 20× faster), satline's peak memory for 3,000 statements
//! against one statement (target: within 2 MB), and on how many statements the two agree on
//! the solutes that hold.
//!
//! Run with `cargo bench --bench batch_vs_peer`. The peer needs Python 3 with pandas and
//! SciPy: `SATLINE_PEER_PYTHON=/path/to/python` (default `python3`); without them only
//! satline's figures are printed. Peak memory needs `/usr/bin/time` (GNU time).
//!
//! The statements are generated here by a fixed rule (loading, range and margin stepped
//! through); they are questions, not data.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const STATEMENTS: usize = 3000;

fn statements(n: usize) -> String {
    let mut text = String::with_capacity(n * 80);
    for i in 0..n {
        let load = 1 + (i * 7) % 80;
        let t1 = (i * 3) % 30;
        let t2 = t1 + 1 + (i * 5) % 10;
        let margin = (i * 11) % 21;
        text.push_str(&format!(
            "which salts stay dissolved at {load} g/100g water from {t1} C to {t2} C margin {margin}%\n"
        ));
    }
    text
}

/// Runs a command `times` times; the best wall time and the last standard output.
fn best_of(times: usize, mut make: impl FnMut() -> Command) -> Option<(Duration, Vec<u8>)> {
    let mut best: Option<(Duration, Vec<u8>)> = None;
    for _ in 0..times {
        let start = Instant::now();
        let out = make().stderr(Stdio::null()).output().ok()?;
        let took = start.elapsed();
        if !out.status.success() && out.stdout.is_empty() {
            return None;
        }
        if best.as_ref().is_none_or(|(b, _)| took < *b) {
            best = Some((took, out.stdout));
        }
    }
    best
}

/// Peak resident memory of a run, kB, by GNU time.
fn peak_kb(satline: &Path, script: &Path) -> Option<u64> {
    let out = Command::new("/usr/bin/time")
        .args(["-f", "%M"])
        .arg(satline)
        .args(["--format", "json", "run"])
        .arg(script)
        .stdout(Stdio::null())
        .output()
        .ok()?;
    String::from_utf8_lossy(&out.stderr)
        .lines()
        .last()?
        .trim()
        .parse()
        .ok()
}

/// The solutes that hold, per statement, from satline's JSON lines.
fn satline_passing(stdout: &[u8]) -> Vec<Vec<String>> {
    String::from_utf8_lossy(stdout)
        .lines()
        .filter_map(|line| serde_json::from_str::<serde_json::Value>(line).ok())
        .map(|answer| {
            let mut names: Vec<String> = answer["rows"]
                .as_array()
                .into_iter()
                .flatten()
                .filter(|row| row["holds"] == serde_json::Value::Bool(true))
                .filter_map(|row| row["solute"].as_str().map(str::to_string))
                .collect();
            names.sort();
            names
        })
        .collect()
}

fn main() {
    // `cargo bench` passes `--bench`; `cargo test --benches` runs this too: then only a
    // smoke run of a few statements.
    let quick = !std::env::args().any(|a| a == "--bench");
    let n = if quick { 20 } else { STATEMENTS };
    let satline = PathBuf::from(env!("CARGO_BIN_EXE_satline"));
    let dir = std::env::temp_dir().join(format!("satline-batch-vs-peer-{}", std::process::id()));
    if let Err(e) = std::fs::create_dir_all(&dir) {
        eprintln!("cannot make {}: {e}", dir.display());
        return;
    }
    let script = dir.join("screenings.satq");
    let one = dir.join("one.satq");
    let reference = dir.join("reference.csv");
    let text = statements(n);
    let written = std::fs::write(&script, &text).and_then(|()| std::fs::write(&one, statements(1)));
    if let Err(e) = written {
        eprintln!("cannot write the statements: {e}");
        return;
    }
    let exported = Command::new(&satline)
        .args(["export", "--to", "csv", "--force", "--out"])
        .arg(&reference)
        .stdout(Stdio::null())
        .status();
    if !exported.is_ok_and(|s| s.success()) {
        eprintln!("satline export failed");
        return;
    }
    let Some((ours, our_out)) = best_of(3, || {
        let mut c = Command::new(&satline);
        c.args(["--format", "json", "run"]).arg(&script);
        c
    }) else {
        eprintln!("satline run failed");
        return;
    };
    println!("{n} range screenings, start-up included:");
    println!("  satline run: {:.1} ms", ours.as_secs_f64() * 1e3);
    match (peak_kb(&satline, &script), peak_kb(&satline, &one)) {
        (Some(many), Some(single)) => println!(
            "  satline peak memory: {many} kB for {n} statements, {single} kB for one: {:+} kB (target within 2048 kB): {}",
            many as i64 - single as i64,
            if many <= single + 2048 {
                "met"
            } else {
                "NOT met"
            }
        ),
        _ => println!("  satline peak memory: not measured (no GNU time at /usr/bin/time)"),
    }
    let python = std::env::var("SATLINE_PEER_PYTHON").unwrap_or_else(|_| "python3".into());
    let peer_script = Path::new(env!("CARGO_MANIFEST_DIR")).join("benches/peer/screen.py");
    let peer = best_of(if quick { 1 } else { 2 }, || {
        let mut c = Command::new(&python);
        c.arg(&peer_script).arg(&reference).arg(&script);
        c
    });
    match peer {
        Some((theirs, their_out)) => {
            let ratio = theirs.as_secs_f64() / ours.as_secs_f64();
            println!("  peer script: {:.1} ms", theirs.as_secs_f64() * 1e3);
            println!(
                "  satline is {ratio:.1}x faster (target at least 20x): {}",
                if ratio >= 20.0 { "met" } else { "NOT met" }
            );
            let mine = satline_passing(&our_out);
            let peers: Vec<Vec<String>> = String::from_utf8_lossy(&their_out)
                .lines()
                .filter_map(|l| serde_json::from_str(l).ok())
                .collect();
            let same = mine.iter().zip(&peers).filter(|(a, b)| a == b).count();
            println!(
                "  agreement on the solutes that hold: {same} of {} statements",
                mine.len().min(peers.len())
            );
        }
        None => println!(
            "  peer script: not run ({python} with pandas, SciPy and periodictable is needed)"
        ),
    }
    let _ = std::fs::remove_dir_all(&dir);
}
