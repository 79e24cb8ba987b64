//! Linear costs (issue 20), each measured beside its yardstick in the same run:
//!
//! - `import_rows/1000000`: a CSV file of 1,000,000 INVENTED rows (10,000 solutes of 100
//!   points, about 70 MB) planned and written into a fresh file database by
//!   `librarian::import`, what `satline import` does. Target on this 2-core machine: under
//!   2 minutes. Yardstick `import_floor/1000000`: the same file read by the `csv` crate and its
//!   rows inserted bare into one SQLite table in one transaction (what any import must do).
//!   `import_rows/100000` shows the growth: linear planning takes about a tenth.
//! - `batch_statements/4000` and `/40000`: that many lookups run as one script by
//!   `batch::run_scripts` (what `satline run FILE --format json` does, output discarded).
//!   Target: 40,000 under 10 times 4,000. Yardstick `batch_floor`: the same scripts parsed
//!   only, one statement at a time as batch mode does.
//!
//!   `batch_statements/40000_as_ten_scripts` runs the same 40,000 as ten scripts of 4,000,
//!   linear by construction: one long script should cost no more. The ratios are printed
//!   after the run, and again from 15 rounds that interleave the two sizes (ten runs of
//!   4,000, then one of 40,000), so a load that changes while the benchmark runs (2 shared
//!   cores) falls on both sizes alike.
//!
//! Run with `cargo bench --bench linear` (a few minutes: the 1,000,000-row import runs 10
//! times), or one group, e.g. `cargo bench --bench linear -- import_rows/1000000`.
//!
//! Every row and number here is invented for timing: none is reference data.

use std::hint::black_box;
use std::path::Path;
use std::time::Duration;

use criterion::{BatchSize, BenchmarkId, Criterion, SamplingMode, criterion_group};
use satline::engine::Engine;
use satline::frontend::batch::{Script, run_scripts};
use satline::frontend::picture::Pictures;
use satline::librarian;
use satline::output::Format;
use satline::store::{ImportFile, ImportOptions, init_empty};

const HEADER: &str = "solute,formula,phase,temperature,temperature_unit,value,unit,source";

const SOURCES: &str = r#"
[[source]]
key = "invented-bench"
kind = "other"
title = "Invented benchmark rows (not reference data)"
authors = "satline benchmark generator"
"#;

/// `rows` INVENTED rows: solutes `invented-00000` … of 100 points each from 0.5 °C to
/// 98.5 °C, values rising smoothly (no outliers, no conflicts).
fn invented_csv(rows: usize) -> String {
    let mut text = String::with_capacity(rows * 72 + HEADER.len());
    text.push_str(HEADER);
    text.push('\n');
    for i in 0..rows {
        let (solute, point) = (i / 100, i % 100);
        let t = 0.5 + point as f64 * 0.98;
        let value = 10.0 + 0.3 * t + (solute % 7) as f64 * 0.1;
        text.push_str(&format!(
            "invented-{solute:05},KCl,KCl,{t:.2},C,{value:.3},g/100g water,invented-bench\n"
        ));
    }
    text
}

/// A fresh file database holding only the invented source.
fn fresh_database(dir: &Path, n: usize) -> std::path::PathBuf {
    let path = dir.join(format!("bench-{n}.db"));
    let _ = std::fs::remove_file(&path);
    init_empty(&path, "bench", true).expect("an empty database");
    let sources = ImportFile {
        path: "sources.toml".into(),
        text: SOURCES.into(),
    };
    librarian::import(
        &path,
        &[sources],
        &ImportOptions::default(),
        false,
        Some("bench"),
        &mut |_| {},
    )
    .expect("the invented source imports");
    path
}

/// The floor: parse the CSV and insert every row bare, in one transaction.
fn import_floor(path: &Path, text: &str) -> usize {
    let _ = std::fs::remove_file(path);
    let mut conn = rusqlite::Connection::open(path).expect("a database");
    conn.execute_batch(
        "PRAGMA journal_mode = WAL; CREATE TABLE points (solute TEXT, t REAL, value REAL)",
    )
    .expect("a table");
    let tx = conn.transaction().expect("a transaction");
    let mut rows = 0;
    {
        let mut insert = tx
            .prepare("INSERT INTO points VALUES (?1, ?2, ?3)")
            .expect("an insert");
        let mut reader = csv::Reader::from_reader(text.as_bytes());
        for record in reader.records() {
            let record = record.expect("a row");
            let t: f64 = record[3].parse().expect("a temperature");
            let v: f64 = record[5].parse().expect("a value");
            insert
                .execute(rusqlite::params![&record[0], t, v])
                .expect("inserted");
            rows += 1;
        }
    }
    tx.commit().expect("committed");
    rows
}

fn import(c: &mut Criterion) {
    let dir = tempfile::tempdir().expect("a temporary directory");
    for rows in [100_000, 1_000_000] {
        let file = ImportFile {
            path: "invented.csv".into(),
            text: invented_csv(rows),
        };
        let mut g = c.benchmark_group("import_rows");
        g.sampling_mode(SamplingMode::Flat)
            .sample_size(10)
            .warm_up_time(Duration::from_millis(1))
            .measurement_time(Duration::from_secs(if rows > 100_000 { 120 } else { 20 }));
        g.bench_with_input(BenchmarkId::from_parameter(rows), &file, |b, file| {
            b.iter_batched(
                || fresh_database(dir.path(), rows),
                |path| {
                    let report = librarian::import(
                        &path,
                        std::slice::from_ref(file),
                        &ImportOptions::default(),
                        false,
                        Some("bench"),
                        &mut |_| {},
                    )
                    .expect("the invented rows import");
                    assert_eq!(report.plan.points_to_write(), rows);
                    report
                },
                BatchSize::PerIteration,
            )
        });
        g.finish();
        let mut g = c.benchmark_group("import_floor");
        g.sampling_mode(SamplingMode::Flat)
            .sample_size(10)
            .warm_up_time(Duration::from_millis(1));
        let floor = dir.path().join("floor.db");
        g.bench_with_input(BenchmarkId::from_parameter(rows), &file, |b, file| {
            b.iter(|| assert_eq!(import_floor(&floor, black_box(&file.text)), rows))
        });
        g.finish();
    }
}

/// `n` lookups, one a line, at temperatures that cycle through the data's range.
fn lookups(n: usize) -> Script {
    let text: String = (0..n)
        .map(|i| format!("solubility of KNO3 at {} C\n", i % 90 + 5))
        .collect();
    Script {
        name: format!("{n}.sl"),
        text,
    }
}

fn batch(c: &mut Criterion) {
    let Ok(engine) = Engine::open(None) else {
        eprintln!("the embedded catalog did not open; batch benchmarks skipped");
        return;
    };
    let mut g = c.benchmark_group("batch_statements");
    g.sample_size(10);
    // Ten scripts of 4,000 in one run: the same 40,000 statements, linear in 4,000 by
    // construction, so one long script can be compared with the ideal in the same run.
    let ten: Vec<Script> = (0..10).map(|_| lookups(4_000)).collect();
    let runs = [
        ("4000", vec![lookups(4_000)]),
        ("40000", vec![lookups(40_000)]),
        ("40000_as_ten_scripts", ten),
    ];
    for (id, script) in &runs {
        g.bench_with_input(BenchmarkId::from_parameter(id), script, |b, script| {
            b.iter(|| {
                let (mut out, mut err) = (std::io::sink(), std::io::sink());
                run_scripts(
                    &engine,
                    script,
                    Format::Json,
                    &Pictures::default(),
                    &mut out,
                    &mut err,
                )
            })
        });
    }
    g.finish();
    let mut floor = c.benchmark_group("batch_floor");
    floor.sample_size(10);
    for n in [4_000, 40_000] {
        let script = lookups(n);
        floor.bench_with_input(BenchmarkId::from_parameter(n), &script, |b, script| {
            b.iter(|| {
                let mut env = satline::query::Env::default();
                black_box(satline::query::statements(&script.text, &mut env).count())
            })
        });
    }
    floor.finish();
}

criterion_group!(benches, batch, import);

#[path = "support/estimates.rs"]
mod estimates;

/// Prints the batch target with the ratios this run measured.
fn report() {
    let ms = |id: &str| estimates::mean_ns(id).map(|ns| ns / 1e6);
    let (Some(small), Some(large)) = (ms("batch_statements/4000"), ms("batch_statements/40000"))
    else {
        return;
    };
    println!("\ntargets (this run):");
    println!(
        "  40,000 statements in batch: {large:.1} ms / 4,000: {small:.1} ms = {:.2}x (target under 10x): {}",
        large / small,
        if large / small < 10.0 {
            "met"
        } else {
            "NOT met"
        }
    );
    if let Some(ten) = ms("batch_statements/40000_as_ten_scripts") {
        println!(
            "  the same 40,000 as ten scripts of 4,000: {ten:.1} ms = {:.2}x of 4,000 (linear by construction)",
            ten / small
        );
    }
    if let (Some(f1), Some(f2)) = (ms("batch_floor/4000"), ms("batch_floor/40000")) {
        println!("  parsing only: {f2:.1} ms / {f1:.1} ms = {:.2}x", f2 / f1);
    }
}

/// Whether this run's filter (the first argument that is not a flag) selects the batch
/// benchmarks.
fn batch_selected() -> bool {
    let filters: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with("--"))
        .collect();
    filters.is_empty() || filters.iter().any(|f| f.contains("batch"))
}

/// The 4,000 and 40,000 runs interleaved (ten of 4,000, then one of 40,000, per round), so
/// a load that changes during the run falls on both alike: medians over the rounds, ms, and
/// the median of each round's ratio.
fn interleaved(rounds: usize) -> Option<(f64, f64, f64)> {
    let engine = Engine::open(None).ok()?;
    let (small, large) = ([lookups(4_000)], [lookups(40_000)]);
    let once = |script: &[Script]| {
        let started = std::time::Instant::now();
        let (mut out, mut err) = (std::io::sink(), std::io::sink());
        black_box(run_scripts(
            &engine,
            script,
            Format::Json,
            &Pictures::default(),
            &mut out,
            &mut err,
        ));
        started.elapsed().as_secs_f64() * 1e3
    };
    let (mut smalls, mut larges, mut ratios) = (Vec::new(), Vec::new(), Vec::new());
    for _ in 0..rounds {
        let s = (0..10).map(|_| once(&small)).sum::<f64>() / 10.0;
        let l = once(&large);
        smalls.push(s);
        larges.push(l);
        ratios.push(l / s);
    }
    let median = |mut v: Vec<f64>| {
        v.sort_by(f64::total_cmp);
        v[v.len() / 2]
    };
    Some((median(smalls), median(larges), median(ratios)))
}

fn main() {
    benches();
    Criterion::default().configure_from_args().final_summary();
    report();
    if batch_selected()
        && let Some((small, large, ratio)) = interleaved(15)
    {
        println!(
            "  interleaved (15 rounds of ten 4,000 then one 40,000): medians {small:.1} ms and {large:.1} ms, median ratio {ratio:.2}x (target under 10x): {}",
            if ratio < 10.0 { "met" } else { "NOT met" }
        );
    }
}
