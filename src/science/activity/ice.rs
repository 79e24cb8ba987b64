//! The ice–water equilibrium: the water activity of a solution in equilibrium with ice at a
//! temperature, and from it the freezing point of a solution whose water activity a Pitzer
//! parameter set gives.

use super::pitzer::{ParameterSet, ln_water_activity_unchecked};
use crate::science::bisect::{Until, bisect};
use crate::science::error::ScienceError;

/// Molar gas constant, J/(mol·K) (CODATA 2018, exact).
pub const R: f64 = 8.314_462_618;

/// Melting point of ice at 1 atm, K.
pub const T0: f64 = 273.15;

/// Enthalpy of fusion of ice at 273.15 K, J/mol: 6.01 kJ/mol (CRC Handbook of Chemistry and
/// Physics, 97th ed., table of enthalpies of fusion; value as commonly printed, from memory).
pub const FUSION_J_PER_MOL: f64 = 6010.0;

/// Heat capacity of liquid water minus that of ice at 273.15 K, J/(mol·K): 75.98 − 38.09
/// (CRC Handbook, 97th ed., heat capacities of water and of ice at 0 °C; values as commonly
/// printed, from memory), taken constant below 0 °C.
pub const DELTA_CP_J_PER_MOL_K: f64 = 37.89;

/// ln a_w of water in equilibrium with ice at `t_k`:
/// ln a_w = [ΔH (1/T0 − 1/T) + ΔCp (ln(T/T0) + T0/T − 1)] / R, from μ_ice = μ_w° + RT ln a_w
/// with ΔH(T) = ΔH0 + ΔCp (T − T0) (Gibbs–Helmholtz integrated; e.g. Atkins & de Paula,
/// Physical Chemistry, colligative properties). Negative below T0.
pub fn ln_water_activity_of_ice(t_k: f64) -> f64 {
    (FUSION_J_PER_MOL * (1.0 / T0 - 1.0 / t_k)
        + DELTA_CP_J_PER_MOL_K * ((t_k / T0).ln() + T0 / t_k - 1.0))
        / R
}

/// The freezing point (K) of a solution of `molality` (mol/kg) of the set's electrolyte:
/// the temperature where the set's water activity equals that of water over ice
/// ([`ln_water_activity_of_ice`]), found by bisection to 1e-6 K. Refused when the molality
/// is beyond the set, or the freezing point falls outside its temperatures.
pub fn freezing_point(set: &ParameterSet, molality: f64) -> Result<f64, ScienceError> {
    if !(molality.is_finite() && molality >= 0.0) {
        return Err(ScienceError::InvalidComposition {
            value: molality,
            unit: "mol/kg",
            why: "a molality must be zero or positive",
        });
    }
    if molality == 0.0 {
        return Ok(T0);
    }
    if molality > set.molality_max {
        return Err(ScienceError::OutsideModel(format!(
            "{molality:.3} mol/kg is beyond the Pitzer set {} (up to {} mol/kg)",
            set.key, set.molality_max
        )));
    }
    let f = |t: f64| ln_water_activity_unchecked(set, molality, t) - ln_water_activity_of_ice(t);
    let hi = T0.min(set.t_max_k);
    let lo = set.t_min_k.max(super::debye_huckel::A_PHI_RANGE_K.0);
    if hi <= lo || f(hi) > 0.0 {
        return Err(ScienceError::OutsideModel(format!(
            "the Pitzer set {} holds for {:.2} K to {:.2} K, above this solution's freezing point",
            set.key, set.t_min_k, set.t_max_k
        )));
    }
    if f(lo) < 0.0 {
        return Err(ScienceError::OutsideModel(format!(
            "the freezing point of {molality:.3} mol/kg lies below {:.2} K, the lowest temperature of the Pitzer set {}",
            set.t_min_k, set.key
        )));
    }
    Ok(bisect(lo, hi, Until::Width(1e-6), |t| f(t) > 0.0).mid())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dilute_limit_is_the_cryoscopic_constant() {
        // ln a_w ≈ −ΔH ΔT/(R T0²) for small ΔT: K_f = R T0² M_w/ΔH = 1.86 K·kg/mol.
        let dt = 0.01;
        let ln_aw = ln_water_activity_of_ice(T0 - dt);
        // −ln a_w / M_w is the osmolality; ΔT / osmolality = K_f.
        let kf = dt / (-ln_aw / 0.018_015_268);
        assert!((kf - 1.86).abs() < 0.01, "{kf}");
        assert_eq!(ln_water_activity_of_ice(T0), 0.0);
    }
}
