//! `plot SOLUTE with ice`: the whole phase diagram on a plot — the ice line agrees with the
//! `freezing` statement point by point and ends at the eutectic, which is marked.

use satline::answer::Answer;
use satline::engine::Engine;
use satline::query::parse_script;

fn answer(text: &str) -> Answer {
    let e = Engine::open_embedded().unwrap();
    let mut session = e.session();
    e.run_text(text, &mut session).remove(0)
}

#[test]
fn the_ice_line_runs_from_0_c_to_the_eutectic_and_agrees_with_freezing() {
    let a = answer("plot NaCl with ice");
    assert!(a.ok, "{:?}", a.error);
    let spec = a.plot.as_ref().unwrap();
    let ice = spec
        .series
        .iter()
        .find(|s| s.phase.as_deref() == Some("ice"))
        .expect("an ice line");
    let points: Vec<(f64, f64)> = ice.segments.iter().flat_map(|s| s.points.clone()).collect();
    let lowest = points.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
    let highest = points.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
    assert!((highest - 0.0).abs() < 1e-9, "{highest}");
    // The eutectic of the seed's NaCl record (Linke & Seidell): −21.1 C.
    assert!((lowest + 21.1).abs() < 0.05, "{lowest}");
    assert!((spec.x_range.0 + 21.1).abs() < 0.05, "{:?}", spec.x_range);
    assert!(
        spec.transitions
            .iter()
            .any(|t| t.label.contains("eutectic"))
    );
    // Every tenth point is the freezing point `freezing` gives for that loading.
    for (t, v) in points.iter().step_by(10).filter(|p| p.1 > 0.5) {
        let f = answer(&format!("freezing of NaCl at {v} g/100g water"));
        let freezing = f
            .rows
            .iter()
            .find(|r| r.unit.as_deref() == Some("C"))
            .and_then(|r| r.value)
            .unwrap();
        assert!(
            (freezing - t).abs() < 0.02,
            "{v} g/100g water: {freezing} vs {t}"
        );
    }
    let eutectic = a
        .rows
        .iter()
        .find(|r| r.quantity.as_deref() == Some("eutectic"))
        .unwrap();
    assert_eq!(eutectic.value, Some(-21.1));
}

#[test]
fn an_ice_line_known_only_in_part_says_so() {
    let a = answer("plot KCl with ice");
    assert!(a.ok, "{:?}", a.error);
    assert!(
        a.caveats.iter().any(|c| c.contains("left undrawn")),
        "{:?}",
        a.caveats
    );
    // Without `with ice` nothing of the kind is drawn.
    let plain = answer("plot KCl");
    let spec = plain.plot.as_ref().unwrap();
    assert!(
        spec.series
            .iter()
            .all(|s| s.phase.as_deref() != Some("ice"))
    );
}

#[test]
fn with_ice_is_read_once() {
    let ok = parse_script("plot NaCl from -25 C to 40 C with ice line in mol/kg").remove(0);
    let Ok(satline::query::Located {
        node: satline::query::Statement::Plot(p),
        ..
    }) = ok
    else {
        panic!("not a plot: {ok:?}");
    };
    assert!(p.ice.is_some());
    let e = parse_script("plot NaCl with ice with ice")
        .remove(0)
        .unwrap_err();
    assert!(e.to_string().contains("with ice"), "{e}");
    let e = parse_script("plot NaCl with icee").remove(0).unwrap_err();
    assert!(e.to_string().contains("`ice`"), "{e}");
}
