//! Least-squares fits of solubility against temperature: van 't Hoff, modified Apelblat and
//! polynomials, each with its deviations and its valid range.
//!
//! Data are (T in K, y) pairs; y is whatever the caller fits (usually the mole fraction x for
//! the logarithmic forms, the mass fraction for a polynomial). Solved by SVD with nalgebra
//! after scaling each column to unit norm, which keeps the nearly collinear Apelblat columns
//! (1, 1/T, ln T) well conditioned.

use nalgebra::{DMatrix, DVector};

use super::curve::Basis;
use super::error::ScienceError;

/// Which model, with its fitted parameters.
#[derive(Debug, Clone, PartialEq)]
pub enum FitModel {
    /// van 't Hoff: ln y = a + b/T (T in K; b in K).
    VantHoff { a: f64, b: f64 },
    /// Modified Apelblat: ln y = a + b/T + c ln T (Apelblat & Manzurola, J. Chem. Thermodyn.
    /// 31 (1999) 85–91).
    Apelblat { a: f64, b: f64, c: f64 },
    /// Polynomial y = Σ cᵢ·sⁱ in the scaled temperature s = (T − center_k)/scale_k
    /// (scaling keeps high degrees well conditioned).
    Polynomial {
        coefficients: Vec<f64>,
        center_k: f64,
        scale_k: f64,
    },
}

/// A fitted model with its quality and range.
#[derive(Debug, Clone, PartialEq)]
pub struct Fit {
    pub model: FitModel,
    /// Root-mean-square deviation of the fitted y from the data, in the units of y.
    pub rms: f64,
    /// Largest absolute deviation of the fitted y from the data, in the units of y.
    pub max_deviation: f64,
    /// Lowest data temperature, K.
    pub t_min_k: f64,
    /// Highest data temperature, K.
    pub t_max_k: f64,
    /// Number of points fitted.
    pub points: usize,
}

/// A fitted value, flagged when outside the data range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FitValue {
    pub value: f64,
    /// `Fitted` inside [t_min_k, t_max_k], `Extrapolated` outside.
    pub basis: Basis,
}

fn check(
    points: &[(f64, f64)],
    needed: usize,
    what: &'static str,
    log: bool,
) -> Result<(), ScienceError> {
    if points.len() < needed {
        return Err(ScienceError::TooFewPoints {
            what,
            needed,
            found: points.len(),
        });
    }
    for &(t, y) in points {
        if !(t.is_finite() && t > 0.0) {
            return Err(ScienceError::NotPositive {
                what: "temperature (K)",
                value: t,
            });
        }
        if !y.is_finite() || (log && y <= 0.0) {
            return Err(ScienceError::FitFailed(
                "a value is not finite, or not positive where its logarithm is fitted",
            ));
        }
    }
    let t0 = points[0].0;
    if points.iter().all(|p| p.0 == t0) {
        return Err(ScienceError::FitFailed(
            "all points have the same temperature",
        ));
    }
    Ok(())
}

/// Solves min ‖A p − b‖ by SVD after scaling A's columns to unit norm.
fn least_squares(columns: Vec<Vec<f64>>, b: &[f64]) -> Result<Vec<f64>, ScienceError> {
    let n = b.len();
    let m = columns.len();
    let norms: Vec<f64> = columns
        .iter()
        .map(|c| c.iter().map(|v| v * v).sum::<f64>().sqrt())
        .collect();
    if norms.iter().any(|&v| v == 0.0 || !v.is_finite()) {
        return Err(ScienceError::FitFailed(
            "a column of the design matrix is zero",
        ));
    }
    let a = DMatrix::from_fn(n, m, |i, j| columns[j][i] / norms[j]);
    let rhs = DVector::from_column_slice(b);
    let svd = a.svd(true, true);
    let smax = svd.singular_values.max();
    let smin = svd.singular_values.min();
    if smin.is_nan() || smin <= smax * 1e-13 {
        return Err(ScienceError::FitFailed(
            "the points do not determine the model",
        ));
    }
    let p = svd
        .solve(&rhs, smax * 1e-15)
        .map_err(|_| ScienceError::FitFailed("singular value decomposition failed"))?;
    Ok(p.iter().zip(&norms).map(|(v, s)| v / s).collect())
}

impl Fit {
    fn finish(model: FitModel, points: &[(f64, f64)]) -> Self {
        let mut sum = 0.0;
        let mut max: f64 = 0.0;
        for &(t, y) in points {
            let dev = (model_value(&model, t) - y).abs();
            sum += dev * dev;
            max = max.max(dev);
        }
        let t_min_k = points.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
        let t_max_k = points.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
        Self {
            model,
            rms: (sum / points.len() as f64).sqrt(),
            max_deviation: max,
            t_min_k,
            t_max_k,
            points: points.len(),
        }
    }

    /// Value of the model at `t_k`, flagged `Extrapolated` outside the data range.
    pub fn evaluate(&self, t_k: f64) -> FitValue {
        let inside = t_k >= self.t_min_k && t_k <= self.t_max_k;
        FitValue {
            value: model_value(&self.model, t_k),
            basis: if inside {
                Basis::Fitted
            } else {
                Basis::Extrapolated
            },
        }
    }

    /// d ln y / d(1/T) at `t_k`, K: b for van 't Hoff, b − c·T for Apelblat, and
    /// −T²·(dy/dT)/y for a polynomial.
    pub fn d_ln_y_d_inverse_t(&self, t_k: f64) -> f64 {
        match &self.model {
            FitModel::VantHoff { b, .. } => *b,
            FitModel::Apelblat { b, c, .. } => b - c * t_k,
            FitModel::Polynomial {
                coefficients,
                center_k,
                scale_k,
            } => {
                let s = (t_k - center_k) / scale_k;
                let y = horner(coefficients, s);
                let dy: f64 = coefficients
                    .iter()
                    .enumerate()
                    .skip(1)
                    .map(|(i, c)| i as f64 * c * s.powi(i as i32 - 1))
                    .sum::<f64>()
                    / scale_k;
                -t_k * t_k * dy / y
            }
        }
    }
}

fn horner(c: &[f64], s: f64) -> f64 {
    c.iter().rev().fold(0.0, |acc, v| acc * s + v)
}

fn model_value(model: &FitModel, t: f64) -> f64 {
    match model {
        FitModel::VantHoff { a, b } => (a + b / t).exp(),
        FitModel::Apelblat { a, b, c } => (a + b / t + c * t.ln()).exp(),
        FitModel::Polynomial {
            coefficients,
            center_k,
            scale_k,
        } => horner(coefficients, (t - center_k) / scale_k),
    }
}

/// Fits ln y = a + b/T by linear least squares in ln y (at least 2 points, y > 0).
pub fn fit_vant_hoff(points: &[(f64, f64)]) -> Result<Fit, ScienceError> {
    check(points, 2, "a van 't Hoff fit", true)?;
    let ones = vec![1.0; points.len()];
    let inv: Vec<f64> = points.iter().map(|p| 1.0 / p.0).collect();
    let b: Vec<f64> = points.iter().map(|p| p.1.ln()).collect();
    let p = least_squares(vec![ones, inv], &b)?;
    Ok(Fit::finish(FitModel::VantHoff { a: p[0], b: p[1] }, points))
}

/// Fits ln y = a + b/T + c ln T by linear least squares in ln y (at least 3 points, y > 0).
pub fn fit_apelblat(points: &[(f64, f64)]) -> Result<Fit, ScienceError> {
    check(points, 3, "an Apelblat fit", true)?;
    let ones = vec![1.0; points.len()];
    let inv: Vec<f64> = points.iter().map(|p| 1.0 / p.0).collect();
    let ln: Vec<f64> = points.iter().map(|p| p.0.ln()).collect();
    let b: Vec<f64> = points.iter().map(|p| p.1.ln()).collect();
    let p = least_squares(vec![ones, inv, ln], &b)?;
    Ok(Fit::finish(
        FitModel::Apelblat {
            a: p[0],
            b: p[1],
            c: p[2],
        },
        points,
    ))
}

/// Fits y = Σ cᵢ sⁱ, i = 0..=degree, s = (T − center)/scale with center the mid-range and
/// scale the half-range of the data (at least degree + 1 points).
pub fn fit_polynomial(points: &[(f64, f64)], degree: usize) -> Result<Fit, ScienceError> {
    check(points, degree + 1, "a polynomial fit", false)?;
    let t_min = points.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
    let t_max = points.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
    let center_k = 0.5 * (t_min + t_max);
    let scale_k = 0.5 * (t_max - t_min);
    let columns: Vec<Vec<f64>> = (0..=degree)
        .map(|i| {
            points
                .iter()
                .map(|p| ((p.0 - center_k) / scale_k).powi(i as i32))
                .collect()
        })
        .collect();
    let b: Vec<f64> = points.iter().map(|p| p.1).collect();
    let coefficients = least_squares(columns, &b)?;
    Ok(Fit::finish(
        FitModel::Polynomial {
            coefficients,
            center_k,
            scale_k,
        },
        points,
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_data_is_recovered() {
        // Generated from ln y = -2 - 800/T (invented parameters).
        let pts: Vec<(f64, f64)> = (0..8)
            .map(|i| {
                let t = 275.0 + 10.0 * i as f64;
                (t, (-2.0 - 800.0 / t).exp())
            })
            .collect();
        let f = fit_vant_hoff(&pts).unwrap();
        let FitModel::VantHoff { a, b } = f.model else {
            panic!()
        };
        assert!((a + 2.0).abs() < 1e-9 && (b + 800.0).abs() < 1e-6);
        assert!(f.rms < 1e-12);
        assert_eq!(f.evaluate(300.0).basis, Basis::Fitted);
        assert_eq!(f.evaluate(400.0).basis, Basis::Extrapolated);
        assert!((f.d_ln_y_d_inverse_t(300.0) + 800.0).abs() < 1e-6);
    }

    #[test]
    fn polynomial_and_errors() {
        let pts: Vec<(f64, f64)> = (0..6)
            .map(|i| {
                let t = 273.15 + 20.0 * i as f64;
                (t, 0.1 + 0.002 * (t - 273.15) + 1e-5 * (t - 273.15).powi(2))
            })
            .collect();
        let f = fit_polynomial(&pts, 2).unwrap();
        assert!(f.max_deviation < 1e-12);
        assert!(fit_polynomial(&pts, 6).is_err());
        assert!(fit_apelblat(&pts[..2]).is_err());
        assert!(fit_vant_hoff(&[(300.0, 0.1), (300.0, 0.2)]).is_err());
        assert!(fit_vant_hoff(&[(300.0, 0.0), (310.0, 0.2)]).is_err());
    }
}
