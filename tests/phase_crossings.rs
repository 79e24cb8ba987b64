//! Every crossing is reported: for random loadings and the seed's salts, each sign change of
//! (solubility − loading) on the stable curve, found by a dense scan, is one of the
//! saturation temperatures the `saturation` statement gives; and the sodium sulfate pair of
//! the phase diagram (both crossings around its transition at 32.38 °C).

use proptest::prelude::*;
use satline::engine::Engine;
use satline::model::{Review, SoluteKind};
use satline::science::curve::Curve;

/// The seed's solid solutes with a curve: (formula, curve built as the engine builds it).
fn seed_curves(engine: &Engine) -> Vec<(String, Curve)> {
    let catalog = engine.catalog();
    catalog
        .solutes()
        .iter()
        .filter(|s| s.kind != SoluteKind::Gas)
        .filter_map(|s| {
            let datasets: Vec<_> = catalog
                .datasets_of(&s.id)
                .into_iter()
                .filter(|d| !d.retired && d.review != Review::Rejected)
                .collect();
            let curve = Curve::from_datasets(datasets).ok()?;
            Some((s.id.clone(), curve))
        })
        .collect()
}

/// Sign changes of (curve − w) on a 0.01 K scan over the covered temperatures.
fn scanned_crossings(curve: &Curve, w: f64) -> Vec<f64> {
    let (lo, hi) = curve.temperature_range();
    let n = ((hi - lo) / 0.01).ceil() as usize;
    let mut out = Vec::new();
    let mut previous: Option<(f64, f64)> = None;
    for i in 0..=n {
        let t = (lo + (hi - lo) * i as f64 / n as f64).min(hi);
        let Ok(v) = curve.mass_fraction(t, false) else {
            previous = None;
            continue;
        };
        let f = v - w;
        if let Some((tp, fp)) = previous
            && fp != 0.0
            && f != 0.0
            && fp.signum() != f.signum()
        {
            out.push(0.5 * (tp + t));
        }
        previous = Some((t, f));
    }
    out
}

fn saturation_temperatures(engine: &Engine, id: &str, w: f64) -> Vec<f64> {
    let statement = format!("saturation of {id} at {} w", w);
    let answers = engine.run_text(&statement, &mut engine.session());
    let answer = &answers[0];
    assert!(answer.ok, "{statement}: {:?}", answer.error);
    answer
        .rows
        .iter()
        .filter(|r| r.quantity.as_deref() == Some("saturation temperature"))
        .filter_map(|r| r.value)
        .map(|c| c + 273.15)
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]
    #[test]
    fn every_scanned_crossing_is_reported(pick in 0usize..1000, fraction in 0.01f64..0.95) {
        let engine = Engine::open_embedded().unwrap();
        let curves = seed_curves(&engine);
        let (id, curve) = &curves[pick % curves.len()];
        // A loading inside the curve's own span of values, where crossings can happen.
        let (lo, hi) = curve.temperature_range();
        let values: Vec<f64> = (0..=200)
            .filter_map(|i| curve.mass_fraction(lo + (hi - lo) * f64::from(i) / 200.0, false).ok())
            .collect();
        let (wmin, wmax) = values.iter().fold((1.0f64, 0.0f64), |(a, b), &v| (a.min(v), b.max(v)));
        let w = wmin + (wmax - wmin) * fraction;
        prop_assume!(w > 1e-4 && w < 0.99);
        // The statement's loading is printed and read back: use the value it reads.
        let w: f64 = format!("{}", w).parse().unwrap();
        if let Err(missed) = every_crossing_reported(&engine, id, curve, w) {
            prop_assert!(false, "{}", missed);
        }
    }
}

/// Whether every sign change the scan finds is a saturation temperature of the statement
/// (within 0.02 K); else what was missed.
fn every_crossing_reported(engine: &Engine, id: &str, curve: &Curve, w: f64) -> Result<(), String> {
    let reported = saturation_temperatures(engine, id, w);
    for t in scanned_crossings(curve, w) {
        if !reported.iter().any(|r| (r - t).abs() < 0.02) {
            return Err(format!(
                "{id} at w = {w}: the scan crosses at {:.3} C, saturation reports {:?}",
                t - 273.15,
                reported.iter().map(|r| r - 273.15).collect::<Vec<_>>()
            ));
        }
    }
    Ok(())
}

#[test]
fn a_loading_inside_the_step_at_a_transition_is_crossed_below_at_and_above_it() {
    // Found by the property above: the seed's magnesium sulfate curves (hepta- and
    // hexahydrate) differ by about 1e-4 in mass fraction at their transition near 48.1 C,
    // and this loading lies in that step. The heptahydrate crosses it just below the
    // transition, the curve steps below it at the transition, the hexahydrate crosses it
    // again just above.
    let engine = Engine::open_embedded().unwrap();
    let curves = seed_curves(&engine);
    let (id, curve) = curves
        .iter()
        .find(|(id, _)| id == "magnesium-sulfate")
        .unwrap();
    let w = 0.33046062480318145;
    every_crossing_reported(&engine, id, curve, w).unwrap();
    let reported = saturation_temperatures(&engine, id, w);
    assert_eq!(reported.len(), 3, "{reported:?}");
}

#[test]
fn sodium_sulfate_both_crossings_and_the_transition_at_32_38() {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    // Seed (Perry 7th, from memory): decahydrate to 30 C (40.8 g/100g), anhydrous from
    // 40 C (48.8) falling to 42.5 at 100 C; stable ranges meet at 32.38 C.
    let a = &engine.run_text("saturation of Na2SO4 at 45 g/100g water", &mut session)[0];
    let t: Vec<(f64, &str)> = a
        .rows
        .iter()
        .map(|r| (r.value.unwrap(), r.phase.as_deref().unwrap()))
        .collect();
    assert_eq!(t.len(), 2, "{t:?}");
    assert!(
        t[0].0 > 30.0 && t[0].0 < 32.38 && t[0].1 == "Na2SO4·10H2O",
        "{t:?}"
    );
    assert!(
        t[1].0 > 60.0 && t[1].0 < 66.0 && t[1].1 == "Na2SO4",
        "{t:?}"
    );
    let a = &engine.run_text("saturation of Na2SO4 at 41 g/100g water", &mut session)[0];
    assert_eq!(a.rows.len(), 1);
    let v = a.rows[0].value.unwrap();
    assert!(v > 30.0 && v < 31.0, "{v}");
    assert!(!a.caveats.iter().any(|c| c.contains("whole data range")));
    // A loading above every value is said so; one below every value too.
    let a = &engine.run_text("saturation of Na2SO4 at 2 g/100g water", &mut session)[0];
    assert!(a.rows.is_empty());
    assert!(
        a.caveats
            .iter()
            .any(|c| c.contains("stays below the solubility"))
    );
    // The transition, from the stable ranges: in the plot's rows and its curve ends.
    let a = &engine.run_text("plot Na2SO4", &mut session)[0];
    let transition = a
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("transition"))
        .unwrap();
    assert_eq!(transition.value, Some(32.38));
    let ends: Vec<_> = a
        .rows
        .iter()
        .filter_map(|r| r.extra.get("to_c").and_then(|v| v.as_f64()))
        .collect();
    assert!(ends.contains(&32.38), "{ends:?}");
}

#[test]
fn temperatures_never_print_as_minus_zero() {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    for s in [
        "require NH4NO3 stays dissolved at 25 %w/w from -5 C to 30 C",
        "require KCl stays dissolved at 20 g/100g water from -3 C to 30 C",
        "solubility of KNO3 at -10 C",
    ] {
        let a = &engine.run_text(s, &mut session)[0];
        let text = serde_json::to_string(a).unwrap();
        assert!(
            !text.contains("-0 C") && !text.contains("-0.0 C"),
            "{s}: {text}"
        );
    }
}
