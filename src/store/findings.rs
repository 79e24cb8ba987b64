//! Checks that report rather than refuse: a point far off the curve through its neighbours
//! (an outlier), and two sources that disagree about the same solute and phase (a conflict).
//! Imports print them before writing; `satline check` reports them for the whole database.

use serde::Serialize;

use crate::model::{Dataset, Solute};
use crate::science::formula::water_molar_mass;
use crate::science::units::CompositionUnit;

/// How far (relative, in mass fraction) a point may lie from the curve through its two
/// neighbours before it is reported as an outlier. The curve is a straight line in
/// ln(mass fraction) against 1/T, the van 't Hoff form a solubility follows when its heat
/// of solution changes slowly (a fact of the trade); steep hydrate branches and gentle
/// retrograde ones both sit close to it over the 10–20 K steps of printed tables, so 20 %
/// is a generous screen for a typing mistake, not a statistical test.
pub const OUTLIER_TOLERANCE: f64 = 0.20;

/// The default tolerance for a conflict between two sources: 5 % of the other source's
/// value, compared as mass fractions at the same temperature.
pub const CONFLICT_TOLERANCE: f64 = 0.05;

/// Something worth a librarian's look.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Finding {
    /// `outlier`, `conflict` or `duplicate`.
    pub kind: &'static str,
    /// The dataset it is about.
    pub dataset: String,
    /// A sentence with the numbers, e.g. `dataset x/y, point 3 at 20 C: 31.6 g/100g water
    /// lies 42% off the curve through its neighbours (expected about 22.2)`.
    pub message: String,
}

/// The inverse of [`super::seed::to_mass_fraction`]: a mass fraction of the anhydrous
/// solute written in `unit`. Follows from the unit definitions (common practice).
pub fn from_mass_fraction(unit: CompositionUnit, w: f64, molar_mass: f64) -> Option<f64> {
    match unit {
        CompositionUnit::GramsPer100gWater => Some(100.0 * w / (1.0 - w)),
        CompositionUnit::MassPercent => Some(100.0 * w),
        CompositionUnit::MassFraction => Some(w),
        CompositionUnit::Molality => Some(1000.0 * w / (molar_mass * (1.0 - w))),
        CompositionUnit::MoleFraction => {
            let n = w / molar_mass;
            Some(n / (n + (1.0 - w) / water_molar_mass()))
        }
        _ => None,
    }
}

fn round(v: f64) -> String {
    // Four significant figures are enough to see a disagreement.
    if v == 0.0 {
        return "0".to_string();
    }
    let digits = (4 - 1 - v.abs().log10().floor() as i32).max(0) as usize;
    let text = format!("{v:.digits$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// Interior points more than [`OUTLIER_TOLERANCE`] off the line through their neighbours.
pub fn outliers(d: &Dataset, molar_mass: f64) -> Vec<Finding> {
    let unit = CompositionUnit::from_symbol(&d.unit);
    let mut out = Vec::new();
    for (i, w) in d.points.windows(3).enumerate() {
        let (a, p, b) = (w[0], w[1], w[2]);
        let span = 1.0 / b.temperature_k - 1.0 / a.temperature_k;
        if span == 0.0 || a.mass_fraction <= 0.0 || b.mass_fraction <= 0.0 {
            continue;
        }
        let (la, lb) = (a.mass_fraction.ln(), b.mass_fraction.ln());
        let expected =
            (la + (lb - la) * (1.0 / p.temperature_k - 1.0 / a.temperature_k) / span).exp();
        let off = (p.mass_fraction - expected).abs() / expected;
        if off > OUTLIER_TOLERANCE {
            let expected_reported = unit
                .and_then(|u| from_mass_fraction(u, expected, molar_mass))
                .map(round)
                .unwrap_or_else(|| "?".to_string());
            out.push(Finding {
                kind: "outlier",
                dataset: d.key.clone(),
                message: format!(
                    "dataset {}, point {} at {} {}: {} {} lies {:.0}% off the curve through its neighbours (expected about {})",
                    d.key,
                    i + 2,
                    round(p.temperature_reported),
                    d.temperature_unit,
                    round(p.value_reported),
                    d.unit,
                    off * 100.0,
                    expected_reported
                ),
            });
        }
    }
    out
}

/// The other dataset's mass fraction at `t_k`, by straight lines between its points; `None`
/// outside its first to last point.
fn mass_fraction_at(d: &Dataset, t_k: f64) -> Option<f64> {
    if let [only] = d.points.as_slice() {
        return ((only.temperature_k - t_k).abs() < 1e-9).then_some(only.mass_fraction);
    }
    // The points are sorted by temperature: the first window that can hold `t_k` is found
    // by bisection (comparing two long datasets stays O(n log n), not O(n²)).
    let first_at_or_above = d.points.partition_point(|p| p.temperature_k < t_k);
    let from = first_at_or_above.saturating_sub(1);
    d.points[from..].windows(2).find_map(|w| {
        let (a, b) = (w[0], w[1]);
        (a.temperature_k <= t_k && t_k <= b.temperature_k && b.temperature_k > a.temperature_k)
            .then(|| {
                a.mass_fraction
                    + (b.mass_fraction - a.mass_fraction) * (t_k - a.temperature_k)
                        / (b.temperature_k - a.temperature_k)
            })
    })
}

/// The worst disagreement of `d` with `other` (same solute and phase, another source),
/// when it is beyond `tolerance` (a fraction, 0.05 for 5 %). Both values are given in `d`'s
/// unit at `d`'s temperature.
pub fn conflict(d: &Dataset, other: &Dataset, solute: &Solute, tolerance: f64) -> Option<Finding> {
    if d.solute != other.solute
        || d.phase.formula != other.phase.formula
        || d.source == other.source
        || d.key == other.key
    {
        return None;
    }
    let mut worst: Option<(f64, usize, f64)> = None;
    for (i, p) in d.points.iter().enumerate() {
        let Some(w_other) = mass_fraction_at(other, p.temperature_k) else {
            continue;
        };
        if w_other <= 0.0 {
            continue;
        }
        let off = (p.mass_fraction - w_other).abs() / w_other;
        if off > tolerance && worst.is_none_or(|(o, _, _)| off > o) {
            worst = Some((off, i, w_other));
        }
    }
    let (off, i, w_other) = worst?;
    let p = d.points[i];
    let other_value = CompositionUnit::from_symbol(&d.unit)
        .and_then(|u| from_mass_fraction(u, w_other, solute.molar_mass))
        .map(round)
        .unwrap_or_else(|| "?".to_string());
    Some(Finding {
        kind: "conflict",
        dataset: d.key.clone(),
        message: format!(
            "dataset {} (source {}) and dataset {} (source {}) disagree at {} {}: {} {} against {} {}, {:.1}% apart (tolerance {}%)",
            d.key,
            d.source,
            other.key,
            other.source,
            round(p.temperature_reported),
            d.temperature_unit,
            round(p.value_reported),
            d.unit,
            other_value,
            d.unit,
            off * 100.0,
            round(tolerance * 100.0)
        ),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Phase, Point, Provenance, Review};

    // Invented demo numbers.
    fn dataset(key: &str, source: &str, points: &[(f64, f64)]) -> Dataset {
        Dataset {
            key: key.to_string(),
            solute: "demo".to_string(),
            solvent: "water".to_string(),
            phase: Phase {
                formula: "KCl".to_string(),
                name: "anhydrous".to_string(),
                water: 0.0,
            },
            source: source.to_string(),
            unit: "%w/w".to_string(),
            temperature_unit: "C".to_string(),
            provenance: Provenance::Derived,
            review: Review::Unreviewed,
            retired: false,
            note: None,
            points: points
                .iter()
                .map(|&(t, v)| Point {
                    temperature_reported: t,
                    temperature_k: t + 273.15,
                    value_reported: v,
                    mass_fraction: v / 100.0,
                    uncertainty: None,
                })
                .collect(),
            stable_range: None,
            stable_range_k: None,
        }
    }

    fn solute() -> Solute {
        Solute {
            id: "demo".to_string(),
            name: "demo".to_string(),
            ..Solute::salt_for_tests("KCl", 74.55, 2)
        }
    }

    #[test]
    fn a_point_off_the_line_is_an_outlier() {
        let d = dataset("demo/a", "s1", &[(0.0, 10.0), (20.0, 30.0), (40.0, 14.0)]);
        let found = outliers(&d, 74.55);
        assert_eq!(found.len(), 1);
        assert!(found[0].message.contains("point 2 at 20 C"), "{found:?}");
        let smooth = dataset("demo/a", "s1", &[(0.0, 10.0), (20.0, 12.5), (40.0, 14.0)]);
        assert!(outliers(&smooth, 74.55).is_empty());
    }

    #[test]
    fn two_sources_apart_beyond_the_tolerance_conflict() {
        let a = dataset("demo/a", "s1", &[(0.0, 10.0), (20.0, 20.0)]);
        let b = dataset("demo/b", "s2", &[(0.0, 10.0), (20.0, 22.0)]);
        let found = conflict(&b, &a, &solute(), 0.05).unwrap();
        assert!(
            found.message.contains("at 20 C: 22 %w/w against 20 %w/w"),
            "{}",
            found.message
        );
        assert!(conflict(&b, &a, &solute(), 0.15).is_none());
        // The same source is never a conflict with itself.
        let c = dataset("demo/c", "s1", &[(20.0, 30.0)]);
        assert!(conflict(&c, &a, &solute(), 0.05).is_none());
    }

    #[test]
    fn the_unit_inverse_undoes_the_conversion() {
        for unit in [
            CompositionUnit::GramsPer100gWater,
            CompositionUnit::MassPercent,
            CompositionUnit::Molality,
            CompositionUnit::MoleFraction,
        ] {
            let w = crate::store::seed::to_mass_fraction(unit, 0.3, 74.55).unwrap();
            let back = from_mass_fraction(unit, w, 74.55).unwrap();
            assert!((back - 0.3).abs() < 1e-12, "{unit:?}");
        }
    }
}
