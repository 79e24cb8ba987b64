//! Speed of Pitzer's model for mixtures: the activity coefficients of a 6-ion mixture (twice
//! seawater's major ions, Harvie, Møller & Weare 1984), and the saturation indices of all 8
//! solids of those ions (halite, sylvite, bischofite, antarcticite, mirabilite,
//! arcanite, epsomite, gypsum) at 100 temperatures (the coefficients evaluated again at
//! each, into buffers reused from one temperature to the next, as a range scan does). The
//! targets: under 2 µs and under 1 ms. When `SATLINE_PEER_PYTHON` names a Python with
//! pytzer, the same work is timed with `benches/peer/mixture_activity.py` in the same run and
//! the ratios printed (target: satline at least 20× faster). Run with
//! `cargo bench --bench mixture`.

use std::hint::black_box;
use std::process::Command;
use std::time::Instant;

use criterion::{Criterion, criterion_group};
use satline::science::activity::saturation::Solid;
use satline::science::activity::{Activity, Coefficients, System};
use satline::store::models::mixture_systems;

/// Twice the major ions of standard seawater at salinity 35, mol/kg (the fixture's
/// seawater-like case ×2, `tests/reference/fixtures_mixtures.py`).
const MIX: [(&str, f64); 6] = [
    ("Na", 0.972),
    ("K", 0.0212),
    ("Mg", 0.1094),
    ("Ca", 0.0214),
    ("Cl", 1.1376),
    ("SO4", 0.0586),
];

/// The solids of those ions: anhydrous formula and waters.
const SOLIDS: [(&str, u32); 8] = [
    ("NaCl", 0),
    ("KCl", 0),
    ("MgCl2", 6),
    ("CaCl2", 6),
    ("Na2SO4", 10),
    ("K2SO4", 0),
    ("MgSO4", 7),
    ("CaSO4", 2),
];

fn setup() -> (System, Vec<f64>, Vec<Solid>) {
    let system = mixture_systems(satline::seed_files::SEED_FILES)
        .expect("the seed's model files load")
        .into_iter()
        .find(|s| s.key == "harvie-moller-weare-1984")
        .expect("the HMW84 system");
    let mut m = vec![0.0; system.ions.len()];
    for (ion, v) in MIX {
        m[system.index(ion).expect("ion of the system")] = v;
    }
    let solids = SOLIDS
        .iter()
        .map(|(f, n)| Solid::of(&system, f, *n).expect("a solid of the system"))
        .collect();
    (system, m, solids)
}

/// Saturation indices (ln IAP; ln K is a constant offset) of every solid at 100
/// temperatures, into the buffers `c` and `a`.
fn saturation_indices(
    system: &System,
    m: &[f64],
    solids: &[Solid],
    c: &mut Coefficients,
    a: &mut Activity,
) -> f64 {
    let mut sum = 0.0;
    for _ in 0..100 {
        // HMW84 holds at 25 °C only: the same temperature 100 times, every parameter's
        // temperature function evaluated again each time, as a range scan does.
        system.evaluate_into(black_box(298.15), c);
        c.activity_into(m, a);
        for s in solids {
            sum += s.ln_ion_activity_product(m, a);
        }
    }
    sum
}

fn benches(c: &mut Criterion) {
    let (system, m, solids) = setup();
    let coefficients = system.at_unchecked(298.15);
    let mut activity = Activity::new(m.len());
    c.bench_function("activity of a 6-ion mixture", |b| {
        b.iter(|| {
            coefficients.activity_into(black_box(&m), &mut activity);
            black_box(activity.osmotic)
        })
    });
    let mut scratch = Coefficients::default();
    c.bench_function("saturation indices of 8 solids at 100 temperatures", |b| {
        b.iter(|| {
            black_box(saturation_indices(
                &system,
                black_box(&m),
                &solids,
                &mut scratch,
                &mut activity,
            ))
        })
    });
}

criterion_group!(group, benches);

/// Mean time of `f` over `n` calls, µs.
fn time_us(n: u32, mut f: impl FnMut()) -> f64 {
    let start = Instant::now();
    for _ in 0..n {
        f();
    }
    start.elapsed().as_secs_f64() * 1e6 / f64::from(n)
}

fn main() {
    group();
    Criterion::default().configure_from_args().final_summary();
    let (system, m, solids) = setup();
    let coefficients = system.at_unchecked(298.15);
    let mut out = Activity::new(m.len());
    let activity = time_us(100_000, || {
        coefficients.activity_into(black_box(&m), &mut out);
        black_box(out.osmotic);
    });
    let mut scratch = Coefficients::default();
    let saturation = time_us(1_000, || {
        black_box(saturation_indices(
            &system,
            black_box(&m),
            &solids,
            &mut scratch,
            &mut out,
        ));
    });
    println!(
        "satline: activity {activity:.3} µs (target < 2), saturation indices {saturation:.1} µs (target < 1000)"
    );
    let Ok(python) = std::env::var("SATLINE_PEER_PYTHON") else {
        println!("peer skipped: set SATLINE_PEER_PYTHON to a Python with pytzer");
        return;
    };
    let script = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/benches/peer/mixture_activity.py"
    );
    let out = match Command::new(python).arg(script).output() {
        Ok(out) => String::from_utf8_lossy(&out.stdout).into_owned(),
        Err(e) => {
            println!("peer not run: {e}");
            return;
        }
    };
    let field = |name: &str| -> Option<f64> {
        out.split_whitespace()
            .find_map(|w| w.strip_prefix(name)?.parse().ok())
    };
    match (field("activity_us="), field("saturation_us=")) {
        (Some(pa), Some(ps)) => println!(
            "pytzer: activity {pa:.1} µs, saturation indices {ps:.0} µs; satline faster by {:.0}× and {:.0}× (target ≥ 20×)",
            pa / activity,
            ps / saturation
        ),
        _ => println!("peer output not understood: {out}"),
    }
}
