//! The temperatures of a solubility table over a range (`solubility of KNO3 from 0 C to
//! 40 C every 5 C`): both ends, and the steps between.

use crate::engine::error::EvalError;
use crate::number::shown;
use crate::query::{TemperatureRange, TemperatureStep};

/// The most rows one table gives; a finer step is refused, with the reason.
pub const MOST_ROWS: usize = 1001;

/// The temperatures (K) of a table from the range's low end to its high end: the low end,
/// each step above it, and the high end itself where the last step does not land on it.
/// Without `every` the step is the smallest of 1, 2 or 5 times a power of ten that gives at
/// most ten steps (0–40 C: every 5 K; 2–8 C: every 1 K).
pub fn temperatures(
    range: &TemperatureRange,
    every: Option<TemperatureStep>,
) -> Result<Vec<f64>, EvalError> {
    let (low, high) = (range.low.kelvin(), range.high.kelvin());
    let width = high - low;
    let step = every.map_or_else(|| round_step(width), |s| s.kelvin);
    // Whole steps that fit, a step a few ulps short of the end counting as landing on it.
    let steps = (width / step * (1.0 + 1e-12)).floor();
    let too_many = |rows: f64| EvalError::Unanswerable {
        message: format!(
            "a table every {} K over {} K has {} rows; at most {MOST_ROWS}: give a larger step",
            shown(step, 4),
            shown(width, 4),
            shown(rows, 6)
        ),
        span: every.map_or(range.span, |s| s.span),
    };
    if !steps.is_finite() || steps + 1.0 > MOST_ROWS as f64 {
        return Err(too_many(steps + 1.0));
    }
    let n = steps as usize;
    let mut out: Vec<f64> = (0..=n).map(|k| low + k as f64 * step).collect();
    if high - low - n as f64 * step > 1e-9 * step {
        out.push(high);
    }
    if out.len() > MOST_ROWS {
        return Err(too_many(out.len() as f64));
    }
    Ok(out)
}

/// `every` given with one temperature: refused, pointing at the step.
pub fn step_without_a_range(step: TemperatureStep) -> EvalError {
    EvalError::Unanswerable {
        message: "`every` gives the step over a range: give a range (`from 0 C to 40 C`), or leave `every` out".into(),
        span: step.span,
    }
}

/// The smallest of 1, 2 or 5 × 10^k kelvin that splits `width` into at most ten steps.
fn round_step(width: f64) -> f64 {
    if width.is_nan() || width <= 0.0 || width.is_infinite() {
        return 1.0;
    }
    let decade = 10f64.powf((width / 10.0).log10().floor());
    [1.0, 2.0, 5.0]
        .into_iter()
        .map(|m| m * decade)
        .find(|step| width / step <= 10.0 * (1.0 + 1e-12))
        .unwrap_or(10.0 * decade)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::query::{Span, Temperature};
    use crate::science::units::TemperatureUnit;

    fn range(low_c: f64, high_c: f64) -> TemperatureRange {
        let at = |value| Temperature {
            value,
            unit: TemperatureUnit::Celsius,
            span: Span::default(),
        };
        TemperatureRange {
            low: at(low_c),
            high: at(high_c),
            span: Span::default(),
        }
    }

    fn step(kelvin: f64) -> TemperatureStep {
        TemperatureStep {
            kelvin,
            span: Span::default(),
        }
    }

    fn celsius(list: &[f64]) -> Vec<f64> {
        list.iter()
            .map(|t| ((t - 273.15) * 100.0).round() / 100.0)
            .collect()
    }

    #[test]
    fn a_round_step_gives_about_ten_rows() {
        let t = temperatures(&range(0.0, 40.0), None).unwrap();
        assert_eq!(
            celsius(&t),
            [0.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 35.0, 40.0]
        );
        let t = temperatures(&range(2.0, 8.0), None).unwrap();
        assert_eq!(celsius(&t), [2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0]);
        assert_eq!(temperatures(&range(0.0, 100.0), None).unwrap().len(), 11);
        // One temperature, written as a range: one row.
        assert_eq!(temperatures(&range(5.0, 5.0), None).unwrap().len(), 1);
    }

    #[test]
    fn a_step_that_misses_the_end_still_gives_the_end() {
        let t = temperatures(&range(0.0, 20.0), Some(step(7.0))).unwrap();
        assert_eq!(celsius(&t), [0.0, 7.0, 14.0, 20.0]);
    }

    #[test]
    fn too_many_rows_are_refused_with_the_reason() {
        let e = temperatures(&range(0.0, 100.0), Some(step(0.01))).unwrap_err();
        assert!(e.to_string().contains("10001 rows; at most 1001"), "{e}");
        assert_eq!(
            temperatures(&range(0.0, 100.0), Some(step(0.1)))
                .unwrap()
                .len(),
            1001
        );
    }
}
