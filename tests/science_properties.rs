//! Property tests of the science module over generated (invented) data: the interpolant
//! never overshoots, conversions round-trip, fits recover their parameters, and the curve
//! at a computed saturation temperature gives back the loading.

use proptest::prelude::*;
use satline::science::curve::{Branch, Curve, Pchip};
use satline::science::fit::{FitModel, fit_apelblat, fit_polynomial, fit_vant_hoff};
use satline::science::gas::{HenryConvention, from_hcp, to_hcp};
use satline::science::solve::{minimum, saturation_temperatures, stays_dissolved};
use satline::science::units::{CompositionUnit, PressureUnit};
use satline::science::units::{
    Context, anhydrous_to_hydrate, from_mass_fraction, hydrate_to_anhydrous, pressure_from_pa,
    pressure_to_pa, to_mass_fraction,
};

/// Knots with positive spacing and monotone values (non-decreasing, or non-increasing when
/// `falling`), including flat steps. At most 13 steps of at most 0.05 from at most 0.3: the
/// values stay below 0.96, so that a test adding 0.01 still has mass fractions below 1.
fn monotone_data() -> impl Strategy<Value = (Vec<f64>, Vec<f64>)> {
    (
        prop::collection::vec((0.1f64..30.0, prop_oneof![Just(0.0), 0.0f64..0.05]), 2..14),
        0.0f64..0.3,
        any::<bool>(),
    )
        .prop_map(|(steps, y0, falling)| {
            let mut x = vec![273.15];
            let mut y = vec![y0];
            for (dx, dy) in steps {
                x.push(x[x.len() - 1] + dx);
                y.push(y[y.len() - 1] + dy);
            }
            if falling {
                y.reverse();
            }
            (x, y)
        })
}

proptest! {
    #[test]
    fn pchip_never_overshoots((x, y) in monotone_data()) {
        let p = Pchip::new(x.clone(), y.clone()).unwrap();
        let rising = y[y.len() - 1] >= y[0];
        let mut previous = p.eval(x[0]).0;
        for k in 0..x.len() - 1 {
            let (lo, hi) = (y[k].min(y[k + 1]), y[k].max(y[k + 1]));
            for s in 0..=40 {
                let t = x[k] + (x[k + 1] - x[k]) * f64::from(s) / 40.0;
                let v = p.eval(t).0;
                prop_assert!(v >= lo - 1e-12 && v <= hi + 1e-12, "overshoot at {t}: {v} not in [{lo}, {hi}]");
                if rising {
                    prop_assert!(v >= previous - 1e-12);
                } else {
                    prop_assert!(v <= previous + 1e-12);
                }
                previous = v;
            }
        }
    }

    #[test]
    fn composition_round_trips(w in 1e-6f64..0.9, m in 10.0f64..600.0, rho in 0.9f64..2.0) {
        let ctx = Context { molar_mass: Some(m), density: Some(rho) };
        for unit in CompositionUnit::ALL {
            let v = from_mass_fraction(w, unit, &ctx).unwrap();
            let back = to_mass_fraction(v, unit, &ctx).unwrap();
            prop_assert!((back / w - 1.0).abs() < 1e-9, "{unit:?}: {w} -> {v} -> {back}");
        }
    }

    #[test]
    fn hydrate_basis_round_trips(h in 0.0f64..300.0, m in 50.0f64..400.0, n in 1u32..13) {
        let a = hydrate_to_anhydrous(h, m, f64::from(n)).unwrap();
        let back = anhydrous_to_hydrate(a, m, f64::from(n)).unwrap();
        prop_assert!((back - h).abs() <= 1e-9 * (1.0 + h));
    }

    #[test]
    fn pressure_and_henry_round_trip(v in 1e-3f64..1e6, hcp in 1e-7f64..1e-1, t in 274.0f64..360.0) {
        for unit in PressureUnit::ALL {
            let back = pressure_from_pa(pressure_to_pa(v, unit), unit);
            prop_assert!((back / v - 1.0).abs() < 1e-12);
        }
        for conv in [
            HenryConvention::HcpSi,
            HenryConvention::HcpMolPerLitreAtm,
            HenryConvention::HbpMolPerKgBar,
            HenryConvention::KhAtm,
            HenryConvention::KhBar,
            HenryConvention::Hcc,
            HenryConvention::Bunsen,
        ] {
            let back = to_hcp(from_hcp(hcp, conv, t).unwrap(), conv, t).unwrap();
            prop_assert!((back / hcp - 1.0).abs() < 1e-10);
        }
    }

    #[test]
    fn vant_hoff_fit_recovers(a in -12.0f64..0.0, b in -3000.0f64..3000.0) {
        let pts: Vec<(f64, f64)> = (0..10).map(|i| {
            let t = 273.15 + 9.0 * f64::from(i);
            (t, (a + b / t).exp())
        }).collect();
        let f = fit_vant_hoff(&pts).unwrap();
        let FitModel::VantHoff { a: fa, b: fb } = f.model else { panic!("model") };
        prop_assert!((fa - a).abs() < 1e-6 * (1.0 + a.abs()));
        prop_assert!((fb - b).abs() < 1e-4 * (1.0 + b.abs()));
    }

    #[test]
    fn apelblat_fit_recovers(a in -50.0f64..50.0, b in -4000.0f64..4000.0, c in -8.0f64..8.0) {
        let pts: Vec<(f64, f64)> = (0..12).map(|i| {
            let t = 273.15 + 8.0 * f64::from(i);
            (t, (a + b / t + c * t.ln()).exp())
        }).collect();
        // Keep generated values representable.
        prop_assume!(pts.iter().all(|p| p.1.is_finite() && p.1 > 1e-300 && p.1 < 1e300));
        let f = fit_apelblat(&pts).unwrap();
        let FitModel::Apelblat { a: fa, b: fb, c: fc } = f.model else { panic!("model") };
        prop_assert!((fc - c).abs() < 1e-4 * (1.0 + c.abs()), "c {fc} vs {c}");
        prop_assert!((fb - b).abs() < 1e-3 * (1.0 + b.abs()), "b {fb} vs {b}");
        prop_assert!((fa - a).abs() < 1e-3 * (1.0 + a.abs()), "a {fa} vs {a}");
        for &(t, y) in &pts {
            prop_assert!((f.evaluate(t).value / y - 1.0).abs() < 1e-8);
        }
    }

    #[test]
    fn polynomial_fit_recovers(coefficients in prop::collection::vec(-1.0f64..1.0, 1..5)) {
        let degree = coefficients.len() - 1;
        // y = Σ cᵢ ((T − 323.15)/50)ⁱ, sampled symmetrically so the fit's own scaling matches.
        let pts: Vec<(f64, f64)> = (0..=20).map(|i| {
            let t = 273.15 + 5.0 * f64::from(i);
            let s = (t - 323.15) / 50.0;
            (t, coefficients.iter().enumerate().map(|(k, c)| c * s.powi(k as i32)).sum())
        }).collect();
        let f = fit_polynomial(&pts, degree).unwrap();
        let FitModel::Polynomial { coefficients: got, .. } = &f.model else { panic!("model") };
        for (g, c) in got.iter().zip(&coefficients) {
            prop_assert!((g - c).abs() < 1e-9, "{g} vs {c}");
        }
        prop_assert!(f.max_deviation < 1e-9);
    }

    #[test]
    fn curve_at_saturation_gives_back_the_loading((x, y) in monotone_data(), frac in 0.01f64..0.99) {
        let ys: Vec<f64> = y.iter().map(|v| v + 0.01).collect();
        let (lo, hi) = (ys.iter().cloned().fold(f64::INFINITY, f64::min), ys.iter().cloned().fold(f64::NEG_INFINITY, f64::max));
        prop_assume!(hi - lo > 1e-3);
        let w = lo + frac * (hi - lo);
        let points: Vec<(f64, f64)> = x.iter().cloned().zip(ys.iter().cloned()).collect();
        let curve = Curve::single(Branch::new("demo", &points).unwrap());
        let crossings = saturation_temperatures(&curve, w).unwrap();
        prop_assert!(!crossings.is_empty());
        for c in crossings {
            // The true crossing lies within 0.01 K: the curve minus the loading changes sign
            // (or vanishes) between t − 0.01 K and t + 0.01 K.
            let (t0, t1) = ((c.t_k - 0.01).max(x[0]), (c.t_k + 0.01).min(x[x.len() - 1]));
            let f0 = curve.evaluate(t0, false).unwrap().mass_fraction - w;
            let f1 = curve.evaluate(t1, false).unwrap().mass_fraction - w;
            prop_assert!(f0 * f1 <= 0.0 || f0.abs() < 1e-12 || f1.abs() < 1e-12,
                "no sign change around {} K: {f0}, {f1}", c.t_k);
            let back = curve.evaluate(c.t_k, false).unwrap().mass_fraction;
            prop_assert!((back - w).abs() < 1e-6);
        }
    }

    #[test]
    fn stays_dissolved_agrees_with_a_dense_scan((x, y) in monotone_data(), frac in 0.0f64..1.0, margin in 0.0f64..0.3) {
        let ys: Vec<f64> = y.iter().map(|v| v + 0.01).collect();
        let points: Vec<(f64, f64)> = x.iter().cloned().zip(ys.iter().cloned()).collect();
        let curve = Curve::single(Branch::new("demo", &points).unwrap());
        let (t1, t2) = (x[0], x[x.len() - 1]);
        // `t1 + (t2 - t1)` can land one ulp above t2, outside the data: clamp the scan.
        let min = (0..=2000).map(|i| (t1 + (t2 - t1) * f64::from(i) / 2000.0).min(t2))
            .map(|t| curve.evaluate(t, false).unwrap().mass_fraction)
            .fold(f64::INFINITY, f64::min);
        let w = 0.005 + frac * 0.5;
        let s = stays_dissolved(&curve, w, t1, t2, margin).unwrap();
        let r = |v: f64| v / (1.0 - v);
        prop_assert!(s.limiting_mass_fraction <= min + 1e-12);
        let scan_holds = r(min) >= r(w) * (1.0 + margin);
        // They can differ only when the loading sits on the boundary.
        if (r(min) - r(w) * (1.0 + margin)).abs() > 1e-9 {
            prop_assert_eq!(s.holds, scan_holds);
        }
    }
}

/// Knots with positive spacing and any values in (0.01, 0.61): peaks and dips included.
fn wavy_data(start: f64) -> impl Strategy<Value = Vec<(f64, f64)>> {
    prop::collection::vec((0.5f64..25.0, 0.01f64..0.61), 1..10).prop_map(move |steps| {
        let mut t = start;
        steps
            .into_iter()
            .map(|(dt, w)| {
                t += dt;
                (t, w)
            })
            .collect()
    })
}

proptest! {
    /// The exact range minimum (issue: screening at the speed of the arithmetic) is never
    /// above any point of a dense scan of the same stable curve, on curves of one to three
    /// overlapping branches with peaks and dips, some with declared stable ranges, and its
    /// value is the curve's value where it says the minimum is.
    #[test]
    fn range_minimum_is_never_above_a_dense_scan(
        a in wavy_data(270.0),
        b in wavy_data(280.0),
        c in wavy_data(300.0),
        branches in 1usize..4,
        declared in any::<bool>(),
        f1 in 0.0f64..1.0,
        f2 in 0.0f64..1.0,
    ) {
        let mut list = vec![Branch::new("A", &a).unwrap()];
        if branches > 1 {
            let mut hydrate = Branch::new("A·2H2O", &b).unwrap();
            if declared {
                let (lo, hi) = hydrate.tabulated_range();
                hydrate = hydrate.with_stable_range(lo - 1.0, hi).unwrap();
            }
            list.push(hydrate);
        }
        if branches > 2 {
            list.push(Branch::new("A·H2O", &c).unwrap());
        }
        let curve = Curve::new(list).unwrap();
        let (lo, hi) = curve.temperature_range();
        let (t1, t2) = (lo + (hi - lo) * f1.min(f2), lo + (hi - lo) * f1.max(f2));
        let m = minimum(&curve, t1, t2, true);
        // A gap without data inside the range may put the tangents beyond what bounds allow.
        prop_assume!(m.is_ok());
        let m = m.unwrap();
        prop_assert!(m.t_k >= t1 && m.t_k <= t2);
        let at = curve.mass_fraction(m.t_k, true).unwrap();
        prop_assert!((at - m.mass_fraction).abs() < 1e-15);
        for i in 0..=4000 {
            let t = (t1 + (t2 - t1) * f64::from(i) / 4000.0).min(t2);
            if let Ok(w) = curve.mass_fraction(t, true) {
                prop_assert!(m.mass_fraction <= w + 1e-12,
                    "scan finds {w} at {t} K below the minimum {} at {} K", m.mass_fraction, m.t_k);
            }
        }
    }
}

proptest! {
    /// The formula parser never panics, and an error's position lies inside the text.
    #[test]
    fn formula_parser_never_panics(text in "[A-Za-z0-9()\\[\\]·*. ]{0,24}|\\PC{0,16}") {
        match satline::science::formula::parse_formula(&text) {
            Ok(f) => prop_assert!(f.molar_mass().is_finite()),
            Err(e) => {
                use satline::science::formula::FormulaError as E;
                let position = match e {
                    E::UnknownElement { position, .. }
                    | E::UnexpectedChar { position, .. }
                    | E::UnexpectedEnd { position, .. }
                    | E::MismatchedBracket { position, .. }
                    | E::ZeroCount { position }
                    | E::TooDeep { position } => position,
                    _ => 0,
                };
                prop_assert!(position <= text.len());
            }
        }
    }
}
