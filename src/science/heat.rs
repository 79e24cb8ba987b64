//! Apparent enthalpy of solution from the temperature dependence of solubility (the
//! van 't Hoff slope), and whether dissolving takes up or gives off heat.

use super::curve::{Basis, Curve};
use super::error::ScienceError;
use super::units::{WATER_MOLAR_MASS, positive};

/// Molar gas constant, J/(mol·K): CODATA 2018 (exact since the 2019 SI).
pub const GAS_CONSTANT: f64 = 8.314_462_618;

/// Whether dissolving takes up heat or gives it off.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum HeatSign {
    /// ΔH > 0: solubility rises with temperature.
    Endothermic,
    /// ΔH < 0: solubility falls with temperature.
    Exothermic,
    /// ΔH = 0 (a flat point of the curve).
    Neither,
}

impl HeatSign {
    /// `endothermic`, `exothermic` or `neither`.
    pub fn as_str(self) -> &'static str {
        match self {
            HeatSign::Endothermic => "endothermic",
            HeatSign::Exothermic => "exothermic",
            HeatSign::Neither => "neither",
        }
    }

    /// The sign word of an enthalpy in any unit.
    pub fn of(delta_h: f64) -> Self {
        if delta_h > 0.0 {
            HeatSign::Endothermic
        } else if delta_h < 0.0 {
            HeatSign::Exothermic
        } else {
            HeatSign::Neither
        }
    }
}

/// An apparent enthalpy of solution at one temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct HeatOfSolution {
    /// ΔH, kJ/mol of solute formula units.
    pub kj_per_mol: f64,
    pub sign: HeatSign,
    /// d ln x / d(1/T), K (negative for a rising curve).
    pub slope_k: f64,
    /// Temperature, K.
    pub t_k: f64,
    /// Stable phase whose branch gave the slope.
    pub phase: String,
    pub basis: Basis,
}

/// Mole fraction of undissociated solute formula units from the mass fraction:
/// x = (w/M) / (w/M + (1−w)/M_w), M_w = 18.015 g/mol.
pub fn mole_fraction(w: f64, molar_mass: f64) -> f64 {
    let a = w / molar_mass;
    a / (a + (1.0 - w) / WATER_MOLAR_MASS)
}

/// Apparent enthalpy of solution from the van 't Hoff slope of the curve at `t_k`:
///
/// ΔH = −R · d ln x / d(1/T) = R·T²·(d ln x/dT), with x the mole fraction of undissociated
/// solute formula units (see [`mole_fraction`]), R = 8.314462618 J/(mol·K) (CODATA 2018),
/// and d ln x/dT = (dx/dw)(dw/dT)/x, dw/dT from the stable branch's interpolant
/// (van 't Hoff equation; e.g. Atkins' Physical Chemistry, the temperature dependence of
/// solubility). It is an *apparent* value: activity coefficients and ionisation are
/// ignored. The sign of ΔH is the sign of the curve's slope dw/dT.
pub fn heat_of_solution(
    curve: &Curve,
    molar_mass: f64,
    t_k: f64,
    extrapolate: bool,
) -> Result<HeatOfSolution, ScienceError> {
    let m = positive("molar mass (g/mol)", molar_mass)?;
    let e = curve.evaluate(t_k, extrapolate)?;
    let w = e.mass_fraction;
    if w <= 0.0 {
        return Err(ScienceError::InvalidComposition {
            value: w,
            unit: "w",
            why: "the solubility is zero here, so ln x is undefined",
        });
    }
    let a = w / m;
    let b = (1.0 - w) / WATER_MOLAR_MASS;
    let x = a / (a + b);
    let dx_dw = (b / m + a / WATER_MOLAR_MASS) / ((a + b) * (a + b));
    let dlnx_dt = dx_dw * e.slope_per_k / x;
    let slope_k = -t_k * t_k * dlnx_dt;
    let kj_per_mol = -GAS_CONSTANT * slope_k / 1000.0;
    Ok(HeatOfSolution {
        kj_per_mol,
        sign: HeatSign::of(kj_per_mol),
        slope_k,
        t_k,
        phase: e.phase,
        basis: e.basis,
    })
}

/// ΔH from a known slope d ln x / d(1/T) in K (e.g. a fit's [`super::fit::Fit::d_ln_y_d_inverse_t`]
/// or a gas's van 't Hoff term taken with the opposite sign for Hcp): ΔH = −R·slope, kJ/mol.
pub fn heat_from_slope(slope_k: f64) -> f64 {
    -GAS_CONSTANT * slope_k / 1000.0
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::curve::Branch;

    #[test]
    fn sign_follows_slope() {
        // Invented demo data.
        let up =
            Curve::single(Branch::new("A", &[(280.0, 0.1), (300.0, 0.2), (320.0, 0.3)]).unwrap());
        let h = heat_of_solution(&up, 100.0, 300.0, false).unwrap();
        assert_eq!(h.sign, HeatSign::Endothermic);
        assert!(h.kj_per_mol > 0.0 && h.slope_k < 0.0);
        let down =
            Curve::single(Branch::new("B", &[(280.0, 0.3), (300.0, 0.2), (320.0, 0.1)]).unwrap());
        assert_eq!(
            heat_of_solution(&down, 100.0, 300.0, false).unwrap().sign,
            HeatSign::Exothermic
        );
    }

    #[test]
    fn matches_vant_hoff_for_exact_data() {
        // Mole fractions generated from ln x = 1 − 2000/T (invented): ΔH = R·2000 J/mol.
        let m = 100.0;
        let pts: Vec<(f64, f64)> = (0..41)
            .map(|i| {
                let t = 280.0 + i as f64;
                let x: f64 = (1.0 - 2000.0 / t).exp();
                // w from x: w = xM / (xM + (1−x)M_w)
                (t, x * m / (x * m + (1.0 - x) * WATER_MOLAR_MASS))
            })
            .collect();
        let c = Curve::single(Branch::new("A", &pts).unwrap());
        let h = heat_of_solution(&c, m, 300.5, false).unwrap();
        let want = GAS_CONSTANT * 2000.0 / 1000.0;
        assert!(
            (h.kj_per_mol - want).abs() / want < 1e-3,
            "{} vs {want}",
            h.kj_per_mol
        );
        assert!((heat_from_slope(-2000.0) - want).abs() < 1e-12);
    }
}
