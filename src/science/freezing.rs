//! Freezing of aqueous solutions: the ice line (tabulated, or ideal freezing-point
//! depression), and which solid appears first when a solution is cooled below 0 °C.
//!
//! Units: temperatures in K, compositions as mass fraction of anhydrous solute, molar mass
//! in g/mol.

use super::bounds::LOWEST_LIQUID_K;
use super::curve::{Curve, Pchip};
use super::error::ScienceError;
use super::solve::saturation_temperatures;
use super::units::positive;
use crate::model::FreezingData;

/// Cryoscopic constant of water, K·kg/mol: 1.86 (e.g. P. Atkins & J. de Paula, Physical
/// Chemistry, table of cryoscopic constants). Valid for ideal dilute solutions only.
pub const KF_WATER: f64 = 1.86;

/// Freezing point of pure water at 1 atm, K.
pub const ICE_POINT: f64 = 273.15;

/// Where an ice-line temperature comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum IceBasis {
    /// At a tabulated freezing point.
    Tabulated,
    /// Between tabulated freezing points (PCHIP in mass fraction).
    Interpolated,
    /// Ideal freezing-point depression (no tabulated data cover this composition).
    Ideal,
    /// Richer than the eutectic: the salt crystallises first on cooling, and ice appears
    /// only at the eutectic temperature (a simple eutectic system, common practice).
    Eutectic,
}

impl IceBasis {
    /// `tabulated`, `interpolated` or `ideal`.
    pub fn as_str(self) -> &'static str {
        match self {
            IceBasis::Tabulated => "tabulated",
            IceBasis::Interpolated => "interpolated",
            IceBasis::Ideal => "ideal",
            IceBasis::Eutectic => "eutectic",
        }
    }
}

/// Molality (mol/kg water) of a mass fraction w: 1000·w / ((1 − w)·M).
fn molality(w: f64, molar_mass: f64) -> f64 {
    1000.0 * w / ((1.0 - w) * molar_mass)
}

fn check_w(w: f64) -> Result<f64, ScienceError> {
    if w.is_finite() && (0.0..1.0).contains(&w) {
        Ok(w)
    } else {
        Err(ScienceError::InvalidComposition {
            value: w,
            unit: "w",
            why: "a mass fraction must lie in [0, 1)",
        })
    }
}

/// Ideal freezing-point depression, K: ΔT = i·K_f·m, with i the ions per formula unit
/// (van 't Hoff factor, full dissociation), K_f = 1.86 K·kg/mol and m the molality.
/// Ideal: real solutions depress more or less than this, increasingly so as they get
/// stronger (Raoult/van 't Hoff, dilute-solution limit).
pub fn ideal_depression(molality_mol_per_kg: f64, ions: u32) -> f64 {
    f64::from(ions.max(1)) * KF_WATER * molality_mol_per_kg
}

/// The ice line at a composition: the temperature (K) where ice starts to form on cooling.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct IcePoint {
    pub t_k: f64,
    pub basis: IceBasis,
}

/// The ice-line temperature of a solution of mass fraction `w`.
///
/// From `data` where its points (with the eutectic as a last point, when it lies beyond
/// them) cover `w`, by monotone interpolation in mass fraction; otherwise ideal:
/// T = 273.15 K − i·K_f·m (see [`ideal_depression`]). Never below the eutectic: a loading
/// richer than the data's eutectic gives the eutectic temperature ([`IceBasis::Eutectic`]);
/// an ideal line that would fall below [`LOWEST_LIQUID_K`] is refused.
pub fn ice_line(
    w: f64,
    molar_mass: f64,
    ions: u32,
    data: Option<&FreezingData>,
) -> Result<IcePoint, ScienceError> {
    let w = check_w(w)?;
    let m = positive("molar mass (g/mol)", molar_mass)?;
    if let Some(d) = data {
        if let Some((we, te)) = d.eutectic
            && w > we
        {
            return Ok(IcePoint {
                t_k: te,
                basis: IceBasis::Eutectic,
            });
        }
        let mut pts = d.points.clone();
        if let Some(e) = d.eutectic
            && pts.last().is_none_or(|p| e.0 > p.0)
        {
            pts.push(e);
        }
        if let (Some(first), Some(last)) = (pts.first(), pts.last())
            && w >= first.0
            && w <= last.0
        {
            let tabulated = pts.iter().any(|p| (p.0 - w).abs() <= 1e-12);
            let interp = Pchip::named(
                "mass fractions of the freezing data",
                pts.iter().map(|p| p.0).collect(),
                pts.iter().map(|p| p.1).collect(),
            )?;
            return Ok(IcePoint {
                t_k: interp.eval(w).0,
                basis: if tabulated {
                    IceBasis::Tabulated
                } else {
                    IceBasis::Interpolated
                },
            });
        }
    }
    let t_k = ICE_POINT - ideal_depression(molality(w, m), ions);
    if t_k.is_nan() || t_k < LOWEST_LIQUID_K {
        return Err(ScienceError::Freezing(
            "the ideal freezing-point depression would put the ice line below -55 C, where no aqueous salt solution stays liquid: the dilute law does not reach this loading, and the data hold no eutectic to bound it",
        ));
    }
    Ok(IcePoint {
        t_k,
        basis: IceBasis::Ideal,
    })
}

/// Which solid appears first when the solution is cooled.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum FirstSolid {
    Ice,
    Salt,
    /// At the eutectic composition both appear together.
    Both,
}

impl FirstSolid {
    /// `ice`, `salt` or `both`.
    pub fn as_str(self) -> &'static str {
        match self {
            FirstSolid::Ice => "ice",
            FirstSolid::Salt => "salt",
            FirstSolid::Both => "both",
        }
    }
}

/// The answer to "what happens to this solution at this temperature below 0 °C".
#[derive(Debug, Clone, PartialEq)]
pub struct FreezingCheck {
    /// Ice-line temperature of the loading, K.
    pub ice_t_k: f64,
    pub ice_basis: IceBasis,
    /// Highest saturation temperature of the loading where the salt curve rises through
    /// it (crystals on cooling below it), K; `None` when the curve data do not reach it.
    pub saturation_t_k: Option<f64>,
    /// Which solid appears first on cooling; `None` when the data cannot tell.
    pub first: Option<FirstSolid>,
    /// Temperature where the first solid appears, K, where known.
    pub first_t_k: Option<f64>,
    /// True when some solid has appeared on cooling to the asked temperature.
    pub solid_at_t: bool,
    /// (mass fraction, K) of the eutectic, where the data give it.
    pub eutectic: Option<(f64, f64)>,
    /// True when the asked temperature is below the eutectic temperature (the whole
    /// solution is solid there, at equilibrium).
    pub below_eutectic: bool,
}

/// For a loading `w` cooled to `t_k` (≤ 273.15 K): which appears first, ice or the salt.
///
/// Ice appears at the ice-line temperature ([`ice_line`]); salt at the highest
/// temperature where the salt curve rises through the loading
/// ([`saturation_temperatures`]); whichever is higher comes first. Where the data give a
/// eutectic (w_e, T_e), the phase diagram decides directly: below w_e ice comes first,
/// above it salt, at w_e both (common practice for a simple eutectic system).
pub fn first_solid_on_cooling(
    curve: Option<&Curve>,
    w: f64,
    molar_mass: f64,
    ions: u32,
    data: Option<&FreezingData>,
    t_k: f64,
) -> Result<FreezingCheck, ScienceError> {
    let t_k = positive("temperature (K)", t_k)?;
    if t_k > ICE_POINT {
        return Err(ScienceError::Freezing(
            "a freezing check needs a temperature at or below 0 °C",
        ));
    }
    let ice = ice_line(w, molar_mass, ions, data)?;
    let saturation_t_k = match curve {
        Some(c) if w > 0.0 => saturation_temperatures(c, w)?
            .into_iter()
            .filter(|x| x.rising)
            .map(|x| x.t_k)
            .fold(None, |acc: Option<f64>, t| {
                Some(acc.map_or(t, |a| a.max(t)))
            }),
        _ => None,
    };
    let eutectic = data.and_then(|d| d.eutectic);
    let first = match (eutectic, saturation_t_k) {
        (Some((we, _)), _) if (w - we).abs() <= 1e-9 => Some(FirstSolid::Both),
        (Some((we, _)), _) => Some(if w < we {
            FirstSolid::Ice
        } else {
            FirstSolid::Salt
        }),
        (None, Some(ts)) => Some(if ts > ice.t_k {
            FirstSolid::Salt
        } else {
            FirstSolid::Ice
        }),
        (None, None) => {
            // No crossing: ice comes first only if the salt curve has data from the ice
            // line upward and stays above the loading there (no crossing was found).
            match curve {
                Some(c)
                    if c.evaluate(c.temperature_range().1, false)
                        .is_ok_and(|e| e.mass_fraction < w) =>
                {
                    // Above the loading nowhere: the salt is out of solution throughout.
                    Some(FirstSolid::Salt)
                }
                Some(c) if c.temperature_range().0 <= ice.t_k => Some(FirstSolid::Ice),
                None if w == 0.0 => Some(FirstSolid::Ice),
                _ => None,
            }
        }
    };
    let first_t_k = match first {
        Some(FirstSolid::Ice) => Some(ice.t_k),
        Some(FirstSolid::Salt) => saturation_t_k,
        Some(FirstSolid::Both) => eutectic.map(|e| e.1),
        None => None,
    };
    let below_eutectic = eutectic.is_some_and(|e| t_k < e.1);
    let solid_at_t = below_eutectic || first_t_k.is_some_and(|tf| tf >= t_k);
    Ok(FreezingCheck {
        ice_t_k: ice.t_k,
        ice_basis: ice.basis,
        saturation_t_k,
        first,
        first_t_k,
        solid_at_t,
        eutectic,
        below_eutectic,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Provenance, Review};

    // Invented demo freezing data (not reference values).
    fn demo() -> FreezingData {
        FreezingData {
            key: "demo".into(),
            solute: "demo".into(),
            source: "invented".into(),
            points: vec![(0.0, 273.15), (0.05, 270.0), (0.10, 266.0), (0.20, 256.0)],
            eutectic: Some((0.23, 252.0)),
            provenance: Provenance::Derived,
            review: Review::Unreviewed,
        }
    }

    #[test]
    fn ideal_depression_worked_example() {
        // By hand: 1 mol/kg of a 2-ion salt, ideal: 2 × 1.86 × 1 = 3.72 K.
        assert!((ideal_depression(1.0, 2) - 3.72).abs() < 1e-12);
        let p = ice_line(0.05844 / 1.05844, 58.44, 2, None).unwrap();
        assert_eq!(p.basis, IceBasis::Ideal);
        assert!((p.t_k - (273.15 - 3.72)).abs() < 1e-9);
    }

    #[test]
    fn tabulated_ice_line_and_eutectic() {
        let d = demo();
        let p = ice_line(0.10, 58.44, 2, Some(&d)).unwrap();
        assert_eq!(p.basis, IceBasis::Tabulated);
        assert!((p.t_k - 266.0).abs() < 1e-12);
        let p = ice_line(0.22, 58.44, 2, Some(&d)).unwrap();
        assert_eq!(p.basis, IceBasis::Interpolated);
        assert!(p.t_k < 256.0 && p.t_k > 252.0);
        let c = first_solid_on_cooling(None, 0.10, 58.44, 2, Some(&d), 263.15).unwrap();
        assert_eq!(c.first, Some(FirstSolid::Ice));
        assert!(c.solid_at_t);
        let c = first_solid_on_cooling(None, 0.10, 58.44, 2, Some(&d), 268.15).unwrap();
        assert!(!c.solid_at_t);
        let c = first_solid_on_cooling(None, 0.25, 58.44, 2, Some(&d), 263.15).unwrap();
        assert_eq!(c.first, Some(FirstSolid::Salt));
        let c = first_solid_on_cooling(None, 0.10, 58.44, 2, Some(&d), 250.0).unwrap();
        assert!(c.below_eutectic && c.solid_at_t);
        assert!(first_solid_on_cooling(None, 0.10, 58.44, 2, Some(&d), 280.0).is_err());
    }
}
