//! Speed of the engine: a lookup and screenings over the embedded seed catalog, and
//! screenings over an INVENTED catalog of 100,000 solutes generated here, each beside its
//! yardstick measured in the same run: the bare-loop floors of `support/floors.rs` (the same
//! arithmetic over 100,000 curves in flat arrays, at one temperature and over a range).
//! After the measurements the ratios are printed against their targets: a screening of
//! 100,000 solutes at most 4× its floor (at one temperature and over a range), the seed's
//! range screening under 20 µs. Run with `cargo bench --bench engine`.
//!
//! The invented catalog is demo data made up by a pseudo-random generator: none of its
//! numbers is reference data, and none of them goes into `seed-data/`.

use std::hint::black_box;
use std::time::Duration;

use criterion::{Criterion, criterion_group};
use satline::catalog::Catalog;
use satline::engine::Engine;
use satline::model::{
    Dataset, Phase, Point, Provenance, Review, Solute, SoluteKind, Source, SourceKind,
};
use satline::query::{self, Env};
use satline::store::Contents;

/// How many invented solutes the large screening runs over.
const INVENTED_SOLUTES: usize = 100_000;

const LOOKUP: &str = "solubility of KNO3 at 25 C";
const SCREEN_AT: &str = "which salts stay dissolved at 30 g/100g water at 5 C";
const SCREEN_RANGE: &str =
    "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%";

#[path = "support/floors.rs"]
mod floors;

#[path = "support/estimates.rs"]
mod estimates;
use estimates::mean_ns;

/// SplitMix64 (Steele, Lea & Flood, OOPSLA 2014): a small deterministic generator, so every
/// run of the benchmark sees the same invented catalog.
struct SplitMix64(u64);

impl SplitMix64 {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    /// Uniform in [lo, hi).
    fn between(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }
}

/// An INVENTED catalog of `n` salts, ids `invented-000001` …: each has one dataset of 5 to
/// 11 points from 0 °C to 100 °C whose mass fraction rises inside (0, 0.6). Made-up
/// numbers for timing only; not reference data.
fn invented_catalog(n: usize) -> Catalog {
    let mut random = SplitMix64(0x5A71_11E0);
    let source = Source {
        key: "invented-benchmark".into(),
        kind: SourceKind::Other,
        title: "Invented benchmark data (not reference data)".into(),
        authors: "satline benchmark generator".into(),
        publisher: None,
        edition: None,
        year: None,
        locator: None,
        doi: None,
        isbn: None,
        url: None,
        note: Some("pseudo-random, for timing only".into()),
    };
    let mut solutes = Vec::with_capacity(n);
    let mut datasets = Vec::with_capacity(n);
    for k in 1..=n {
        let id = format!("invented-{k:06}");
        let formula = format!("Iv{k}");
        solutes.push(Solute {
            id: id.clone(),
            name: format!("invented salt {k:06}"),
            formula: formula.clone(),
            kind: SoluteKind::Salt,
            molar_mass: random.between(40.0, 400.0),
            synonyms: vec![],
            tags: vec!["invented".into()],
            cation: Some("invented".into()),
            anion: Some("invented".into()),
            ions: 2,
            hazard: None,
        });
        let count = 5 + (random.next_u64() % 7) as usize;
        let low = random.between(0.005, 0.3);
        let high = random.between(low + 0.01, 0.59);
        // Rising: cumulative positive steps, scaled to end at `high`.
        let steps: Vec<f64> = (1..count).map(|_| random.between(0.2, 1.0)).collect();
        let total: f64 = steps.iter().sum();
        let mut w = low;
        let mut points = Vec::with_capacity(count);
        for i in 0..count {
            if i > 0 {
                w += (high - low) * steps[i - 1] / total;
            }
            let t_c = 100.0 * i as f64 / (count - 1) as f64;
            points.push(Point {
                temperature_reported: t_c,
                temperature_k: t_c + 273.15,
                value_reported: 100.0 * w / (1.0 - w),
                mass_fraction: w,
                uncertainty: None,
            });
        }
        datasets.push(Dataset {
            key: format!("{id}/invented-benchmark"),
            solute: id,
            solvent: "water".into(),
            phase: Phase {
                formula,
                name: "anhydrous".into(),
                water: 0.0,
            },
            source: source.key.clone(),
            unit: "g/100g water".into(),
            temperature_unit: "C".into(),
            provenance: Provenance::Derived,
            review: if k % 3 == 0 {
                Review::Unreviewed
            } else {
                Review::Reviewed
            },
            retired: false,
            note: None,
            points,
            stable_range: None,
            stable_range_k: None,
        });
    }
    let mut contents = Contents {
        sources: vec![source],
        solutes,
        datasets,
        ..Contents::default()
    };
    contents.sort();
    Catalog::from_contents(contents, 0)
}

/// Benchmarks parse + answer (`run_text`, what a user pays) and, where useful, the answer
/// alone (`run` on a statement parsed beforehand).
fn both(c: &mut Criterion, group: &str, engine: &Engine, text: &str) {
    let mut g = c.benchmark_group(group);
    if engine.catalog().solutes().len() > 1000 {
        g.sample_size(20).measurement_time(Duration::from_secs(8));
    }
    g.bench_function("run_text", |b| {
        b.iter(|| {
            let mut session = engine.session();
            black_box(engine.run_text(black_box(text), &mut session))
        })
    });
    let parsed = query::parse_with(text, &mut Env::default());
    if let Some(Ok(statement)) = parsed.first() {
        g.bench_function("run", |b| b.iter(|| black_box(engine.run(statement, text))));
        // The same, with the answer freed outside the timing: shows how much of a large
        // answer's cost is giving its rows' memory back.
        g.bench_function("run_without_drop", |b| {
            b.iter_with_large_drop(|| engine.run(statement, text))
        });
    }
    g.finish();
}

fn seed(c: &mut Criterion) {
    let Ok(engine) = Engine::open(None) else {
        eprintln!("the embedded catalog did not open; seed benchmarks skipped");
        return;
    };
    both(c, "lookup_seed", &engine, LOOKUP);
    both(c, "screen_seed_at", &engine, SCREEN_AT);
    both(c, "screen_seed_range", &engine, SCREEN_RANGE);
}

fn invented(c: &mut Criterion) {
    let engine = Engine::from_catalog(invented_catalog(INVENTED_SOLUTES));
    for text in [SCREEN_AT, SCREEN_RANGE] {
        let answers = engine.run_text(text, &mut engine.session());
        assert!(answers[0].ok, "{:?}", answers[0].error);
        assert_eq!(answers[0].rows.len(), INVENTED_SOLUTES);
    }
    both(c, "screen_invented_100k_at", &engine, SCREEN_AT);
    both(c, "screen_invented_100k_range", &engine, SCREEN_RANGE);
}

/// The floors: the same loading (30 g/100g water, w = 30/130) at 5 °C and over 2–8 °C.
fn floors(c: &mut Criterion) {
    let mut random = SplitMix64(0xF100_0125);
    let flat = floors::FlatCurves::invented(INVENTED_SOLUTES, || random.unit());
    let w = 30.0 / 130.0;
    let mut g = c.benchmark_group("floor_100k");
    g.bench_function("at", |b| {
        b.iter(|| black_box(flat.holds_at(black_box(w), black_box(278.15))))
    });
    g.bench_function("range", |b| {
        b.iter(|| black_box(flat.holds_over(black_box(w), black_box(275.15), black_box(281.15))))
    });
    g.finish();
}

criterion_group!(benches, floors, seed, invented);

/// Prints each target with the ratio or figure this run measured.
fn report() {
    println!("\ntargets (this run):");
    for (what, engine, floor, most) in [
        (
            "100,000 solutes at one temperature",
            "screen_invented_100k_at/run",
            "floor_100k/at",
            4.0,
        ),
        (
            "100,000 solutes over a range",
            "screen_invented_100k_range/run",
            "floor_100k/range",
            4.0,
        ),
    ] {
        match (mean_ns(engine), mean_ns(floor)) {
            (Some(e), Some(f)) => println!(
                "  {what}: {:.2} ms / floor {:.2} ms = {:.1}x (target at most {most}x): {}",
                e / 1e6,
                f / 1e6,
                e / f,
                if e / f <= most { "met" } else { "NOT met" }
            ),
            _ => println!("  {what}: not measured in this run"),
        }
    }
    match mean_ns("screen_seed_range/run") {
        Some(e) => println!(
            "  the seed's range screening: {:.1} us (target under 20 us): {}",
            e / 1e3,
            if e < 20_000.0 { "met" } else { "NOT met" }
        ),
        None => println!("  the seed's range screening: not measured in this run"),
    }
}

fn main() {
    benches();
    Criterion::default().configure_from_args().final_summary();
    report();
}
