//! How far an answer may reach: the window `extrapolate` may use beyond the data, the
//! liquid range of water, the largest mass fraction a solid phase can give, and the
//! pressure up to which Henry's law is used.
//!
//! These are rules of this reference, stated once here so every statement uses the same
//! ones (and the guide can quote them):
//!
//! - `extrapolate` follows a curve's end tangent at most [`MAX_EXTRAPOLATION_K`] beyond its
//!   data, never above the boiling point of water at one atmosphere (unless the data
//!   themselves go higher) and never below [`LOWEST_LIQUID_K`];
//! - an extrapolated composition must stay a possible one: above zero and below the mass
//!   fraction of anhydrous solute in the solid phase itself (1 for an anhydrous solid; a
//!   hydrate's own composition for a hydrate: a saturated solution cannot hold more solute
//!   per water than the crystal it is in equilibrium with);
//! - water is liquid at most up to its critical point at any pressure, and under a total
//!   pressure P only while its vapour pressure stays below P;
//! - Henry's law is a dilute, low-pressure law: a caveat above
//!   [`HENRY_CAVEAT_PA`] of partial pressure, a refusal above [`HENRY_LIMIT_PA`].

use super::error::ScienceError;
use super::formula::parse_formula;
use super::gas::water_vapour_pressure;

/// The farthest `extrapolate` reaches beyond the data's temperature range: 25 K. A rule of
/// this reference (an end tangent followed further is a guess, not a reading of the data).
pub const MAX_EXTRAPOLATION_K: f64 = 25.0;

/// Boiling point of water at one atmosphere, K (100 °C).
pub const BOILING_POINT_K: f64 = 373.15;

/// Freezing point of pure water at one atmosphere, K (0 °C).
pub const ICE_POINT_K: f64 = 273.15;

/// Lowest temperature any aqueous salt solution of the reference stays liquid at: −55 °C
/// (the same rule the seed data are checked by).
pub const LOWEST_LIQUID_K: f64 = 218.15;

/// Critical temperature of water, K (IAPWS: 647.096 K): above it there is no liquid water
/// at any pressure.
pub const WATER_CRITICAL_K: f64 = 647.096;

/// Above this partial pressure (10 bar) a Henry's-law answer carries a caveat: the gas's
/// fugacity and the pressure's effect on the liquid are no longer negligible, and the
/// linear law overstates the amount (common practice).
pub const HENRY_CAVEAT_PA: f64 = 1.0e6;

/// Above this partial pressure (100 bar) a Henry's-law answer is refused: the dilute,
/// ideal-gas law does not describe the solution there (common practice).
pub const HENRY_LIMIT_PA: f64 = 1.0e7;

/// The temperatures (K) `extrapolate` may reach for data covering `lo_k`..`hi_k`: at most
/// [`MAX_EXTRAPOLATION_K`] beyond either end, not above the boiling point of water at
/// one atmosphere (unless the data go higher) and not below [`LOWEST_LIQUID_K`] (unless
/// the data go lower).
pub fn extrapolation_window(lo_k: f64, hi_k: f64) -> (f64, f64) {
    let low = (lo_k - MAX_EXTRAPOLATION_K).max(LOWEST_LIQUID_K.min(lo_k));
    let high = (hi_k + MAX_EXTRAPOLATION_K).min(BOILING_POINT_K.max(hi_k));
    (low, high)
}

/// Checks that `t_k` lies inside [`extrapolation_window`] of `lo_k`..`hi_k`.
pub fn check_window(t_k: f64, lo_k: f64, hi_k: f64) -> Result<(), ScienceError> {
    let (low_k, high_k) = extrapolation_window(lo_k, hi_k);
    if t_k.is_finite() && t_k >= low_k && t_k <= high_k {
        Ok(())
    } else {
        Err(ScienceError::BeyondExtrapolation { t_k, low_k, high_k })
    }
}

/// The largest mass fraction of anhydrous solute a saturated solution of the solid `phase`
/// can have: the solid's own anhydrous fraction for a hydrate (`Na2SO4·10H2O`: 0.441),
/// 1 for an anhydrous solid or a phase whose formula cannot be read.
pub fn phase_mass_fraction_limit(phase: &str) -> f64 {
    match parse_formula(phase) {
        Ok(f) if f.hydrate_water() > 0.0 && f.molar_mass() > 0.0 => {
            f.anhydrous_molar_mass() / f.molar_mass()
        }
        _ => 1.0,
    }
}

/// Checks an extrapolated mass fraction `w` of the solid `phase` at `t_k`: above zero and
/// below [`phase_mass_fraction_limit`].
pub fn check_extrapolated_fraction(phase: &str, w: f64, t_k: f64) -> Result<f64, ScienceError> {
    let limit = phase_mass_fraction_limit(phase);
    if !(w.is_finite() && w > 0.0) {
        return Err(ScienceError::ImpossibleExtrapolation {
            t_k,
            w,
            why: "no solubility at all: the end tangent has left the data's trend",
        });
    }
    if w >= limit {
        return Err(ScienceError::ImpossibleExtrapolation {
            t_k,
            w,
            why: if limit < 1.0 {
                "is more solute than the hydrate in equilibrium with the solution holds itself"
            } else {
                "leaves no water: not a solution"
            },
        });
    }
    Ok(w)
}

/// Checks that water can be liquid at `t_k` under a total pressure `total_pa` (when
/// known): not above the critical point, not below the ice point of pure water, and its
/// vapour pressure below the total pressure.
pub fn check_liquid_water(t_k: f64, total_pa: Option<f64>) -> Result<(), ScienceError> {
    if !t_k.is_finite() || t_k > WATER_CRITICAL_K {
        return Err(ScienceError::NotLiquid {
            t_k,
            why: "above the critical point of water (373.95 C) there is no liquid water at any pressure".into(),
        });
    }
    if t_k < ICE_POINT_K {
        return Err(ScienceError::NotLiquid {
            t_k,
            why: "pure water freezes below 0 C".into(),
        });
    }
    if let Some(total) = total_pa {
        let vapour = water_vapour_pressure(t_k)?;
        if vapour >= total {
            return Err(ScienceError::NotLiquid {
                t_k,
                why: format!(
                    "water boils there under {} kPa (its vapour pressure is {} kPa)",
                    (total / 10.0).round() / 100.0,
                    (vapour / 10.0).round() / 100.0
                ),
            });
        }
    }
    Ok(())
}

/// Checks a gas's partial pressure against [`HENRY_LIMIT_PA`]; `Ok(true)` when it is above
/// [`HENRY_CAVEAT_PA`] (the answer needs the caveat).
pub fn check_henry_pressure(partial_pa: f64) -> Result<bool, ScienceError> {
    if partial_pa > HENRY_LIMIT_PA || !partial_pa.is_finite() {
        return Err(ScienceError::BeyondHenry {
            partial_pa,
            limit_pa: HENRY_LIMIT_PA,
        });
    }
    Ok(partial_pa > HENRY_CAVEAT_PA)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_window_stops_at_boiling_unless_the_data_go_higher() {
        let close =
            |a: (f64, f64), b: (f64, f64)| (a.0 - b.0).abs() < 1e-9 && (a.1 - b.1).abs() < 1e-9;
        assert!(close(
            extrapolation_window(273.15, 373.15),
            (248.15, 373.15)
        ));
        assert!(close(
            extrapolation_window(293.15, 333.15),
            (268.15, 358.15)
        ));
        assert_eq!(extrapolation_window(273.15, 423.15).1, 423.15);
        assert_eq!(extrapolation_window(230.0, 300.0).0, LOWEST_LIQUID_K);
        assert_eq!(extrapolation_window(210.0, 300.0).0, 210.0);
    }

    #[test]
    fn a_temperature_beyond_the_window_or_not_finite_is_refused() {
        assert!(check_window(380.0, 273.15, 373.15).is_err());
        assert!(check_window(f64::INFINITY, 273.15, 373.15).is_err());
        assert!(check_window(f64::NAN, 273.15, 373.15).is_err());
        assert!(check_window(260.0, 273.15, 373.15).is_ok());
    }

    #[test]
    fn a_hydrate_bounds_its_saturated_solution_by_its_own_composition() {
        // Na2SO4 142.04 g/mol, Na2SO4·10H2O 322.20 g/mol: 0.4408.
        let w = phase_mass_fraction_limit("Na2SO4·10H2O");
        assert!((w - 0.4408).abs() < 1e-3, "{w}");
        assert_eq!(phase_mass_fraction_limit("NaCl"), 1.0);
        assert!(check_extrapolated_fraction("Na2SO4·10H2O", 0.45, 300.0).is_err());
        assert!(check_extrapolated_fraction("NaCl", 1.0, 300.0).is_err());
        assert!(check_extrapolated_fraction("NaCl", -0.1, 300.0).is_err());
        assert!(check_extrapolated_fraction("NaCl", 0.3, 300.0).is_ok());
    }

    #[test]
    fn water_is_not_liquid_above_its_critical_point_nor_boiling() {
        assert!(check_liquid_water(773.15, None).is_err());
        assert!(check_liquid_water(298.15, Some(101_325.0)).is_ok());
        assert!(check_liquid_water(383.15, Some(101_325.0)).is_err());
        assert!(check_liquid_water(383.15, None).is_ok());
    }

    #[test]
    fn henry_pressure_warns_then_refuses() {
        assert_eq!(check_henry_pressure(2.0e5), Ok(false));
        assert_eq!(check_henry_pressure(2.0e6), Ok(true));
        assert!(check_henry_pressure(1.0e10).is_err());
    }
}
