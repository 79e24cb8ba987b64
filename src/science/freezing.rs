//! Freezing of aqueous solutions: the ice line (tabulated, or ideal freezing-point
//! depression), and which solid appears first when a solution is cooled below 0 °C.
//!
//! Units: temperatures in K, compositions as mass fraction of anhydrous solute, molar mass
//! in g/mol.

use super::activity::ParameterSet;
use super::activity::ice::freezing_point;
use super::curve::{Curve, Pchip};
use super::error::ScienceError;
use super::solve::saturation_temperatures;
use super::units::positive;
use crate::model::FreezingData;
use crate::science::bisect::{Until, try_bisect};

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
    /// From the water activity of a published activity model (Pitzer) through the
    /// ice–water equilibrium ([`crate::science::activity::ice`]).
    Model,
    /// Ideal freezing-point depression, used only in the dilute limit ([`DILUTE_IONS`]).
    Ideal,
    /// Richer than the eutectic: the salt crystallises first on cooling, and ice appears
    /// only at the eutectic temperature (a simple eutectic system, common practice).
    Eutectic,
}

impl IceBasis {
    /// `tabulated`, `interpolated`, `model`, `ideal` or `eutectic`.
    pub fn as_str(self) -> &'static str {
        match self {
            IceBasis::Tabulated => "tabulated",
            IceBasis::Interpolated => "interpolated",
            IceBasis::Model => "model",
            IceBasis::Ideal => "ideal",
            IceBasis::Eutectic => "eutectic",
        }
    }
}

/// The ideal formula is used only up to this molality of ions (i·m, mol/kg): there a 1-1
/// salt's osmotic coefficient is within about 7 % of 1, so the ideal depression (at most
/// 0.37 K) is within about 0.03 K (common practice: the dilute limit of van 't Hoff's law).
pub const DILUTE_IONS: f64 = 0.2;

/// Whether `particles` (mol/kg of ions and molecules) is within [`DILUTE_IONS`]. A loading
/// written at the limit comes back from its conversion through mass fractions a few units
/// of the last place above or below it; those count as at the limit.
pub fn within_dilute_limit(particles: f64) -> bool {
    particles <= DILUTE_IONS * (1.0 + 1e-9)
}

/// Molality (mol/kg water) of a mass fraction w: 1000·w / ((1 − w)·M).
pub fn molality(w: f64, molar_mass: f64) -> f64 {
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
#[derive(Debug, Clone, PartialEq)]
pub struct IcePoint {
    pub t_k: f64,
    pub basis: IceBasis,
    /// The key of the activity model's parameter set, for [`IceBasis::Model`].
    pub model: Option<String>,
}

/// What a solution is made of, for the phase-diagram questions.
#[derive(Debug, Clone, Copy)]
pub struct System<'a> {
    /// The salt's solubility curve, where there is one.
    pub curve: Option<&'a Curve>,
    /// Molar mass of the anhydrous solute, g/mol.
    pub molar_mass: f64,
    /// Ions per formula unit (1 for a molecular solute).
    pub ions: u32,
    /// Tabulated freezing points and the eutectic, where a source gives them.
    pub data: Option<&'a FreezingData>,
    /// Activity-model parameter sets for the solute, in order of preference.
    pub models: &'a [&'a ParameterSet],
}

impl System<'_> {
    /// The eutectic (mass fraction, K), where the data give it.
    pub fn eutectic(&self) -> Option<(f64, f64)> {
        self.data.and_then(|d| d.eutectic)
    }

    /// Whether the data give an ice line to read: at least two freezing points, the
    /// eutectic counted as one.
    pub fn has_table(&self) -> bool {
        self.table().is_some()
    }

    /// The tabulated ice line: the freezing points with the eutectic as a last point.
    fn table(&self) -> Option<Vec<(f64, f64)>> {
        let d = self.data?;
        let mut pts = d.points.clone();
        if let Some(e) = d.eutectic
            && pts.last().is_none_or(|p| e.0 > p.0)
        {
            pts.push(e);
        }
        (pts.len() >= 2).then_some(pts)
    }

    /// The ice-line temperature of a solution of mass fraction `w`, from the first that
    /// covers it of: the tabulated freezing points (with the eutectic as a last point), by
    /// monotone interpolation in mass fraction; the activity model's water activity through
    /// the ice–water equilibrium ([`freezing_point`]); in the dilute limit only (ions below
    /// [`DILUTE_IONS`] mol/kg), the ideal T = 273.15 K − i·K_f·m. Otherwise refused, with
    /// the reasons.
    pub fn ice_line(&self, w: f64) -> Result<IcePoint, ScienceError> {
        let w = check_w(w)?;
        let m = positive("molar mass (g/mol)", self.molar_mass)?;
        let mut reasons: Vec<String> = Vec::new();
        if let Some((we, te)) = self.eutectic()
            && w > we
        {
            return Ok(IcePoint {
                t_k: te,
                basis: IceBasis::Eutectic,
                model: None,
            });
        }
        if let Some(pts) = self.table() {
            let (first, last) = (pts[0].0, pts[pts.len() - 1].0);
            if w >= first && w <= last {
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
                    model: None,
                });
            }
            reasons.push(format!(
                "the tabulated freezing points cover {} to {} %w/w",
                crate::number::display((first * 1000.0).round() / 10.0),
                crate::number::display((last * 1000.0).round() / 10.0)
            ));
        } else {
            reasons.push("no tabulated freezing points".into());
        }
        let mol = molality(w, m);
        for set in self.models {
            match freezing_point(set, mol) {
                Ok(t_k) => {
                    return Ok(IcePoint {
                        t_k,
                        basis: IceBasis::Model,
                        model: Some(set.key.clone()),
                    });
                }
                Err(e) => reasons.push(e.to_string()),
            }
        }
        if self.models.is_empty() {
            reasons.push("no activity-model parameters".into());
        }
        let ions = f64::from(self.ions.max(1));
        if within_dilute_limit(ions * mol) {
            return Ok(IcePoint {
                t_k: ICE_POINT - ideal_depression(mol, self.ions),
                basis: IceBasis::Ideal,
                model: None,
            });
        }
        // A molecule that does not ionise (sucrose, urea) counts as one particle, not an ion.
        let particles = if self.ions > 1 {
            "ions"
        } else {
            "dissolved particles"
        };
        reasons.push(format!(
            "the ideal formula holds only in the dilute limit (up to {DILUTE_IONS} mol/kg of {particles}; this solution has {:.2})",
            ions * mol
        ));
        Err(ScienceError::IceLineUnknown(reasons.join("; ")))
    }

    /// The mass fraction of the liquid left in equilibrium with ice at `t_k`: the
    /// composition whose ice line is `t_k` (the ice line inverted by bisection, between
    /// `w_low` and the eutectic or the end of the tabulated points).
    pub fn liquid_on_ice_line(&self, w_low: f64, t_k: f64) -> Result<f64, ScienceError> {
        let top = match (self.eutectic(), self.table()) {
            (Some(e), _) => e.0,
            (None, Some(pts)) => pts[pts.len() - 1].0,
            (None, None) => {
                return Err(ScienceError::IceLineUnknown(
                    "the liquid's composition on the ice line needs tabulated freezing points or a eutectic".into(),
                ));
            }
        };
        let at_top = self.ice_line(top)?.t_k;
        if t_k < at_top - 1e-9 {
            return Err(ScienceError::IceLineUnknown(format!(
                "{:.2} K is below the end of the ice line ({:.2} K)",
                t_k, at_top
            )));
        }
        let bracket = try_bisect(w_low, top, Until::Halvings(80), |w| {
            self.ice_line(w).map(|p| p.t_k > t_k)
        })?;
        Ok(bracket.mid())
    }
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

/// The liquid left when ice has formed: the freeze-concentration path of one salt.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FreezeConcentration {
    /// Mass fraction of solute in the remaining liquid.
    pub liquid_mass_fraction: f64,
    /// Ice as a fraction of the whole mass: 1 − w/w_liquid (lever rule).
    pub ice_fraction: f64,
    /// Ice as a fraction of the water: (1 − w/w_liquid)/(1 − w).
    pub ice_fraction_of_water: f64,
}

/// The answer to "what happens to this solution at this temperature below 0 °C".
#[derive(Debug, Clone, PartialEq)]
pub struct FreezingCheck {
    /// The ice line of the loading, where known (beyond the eutectic composition: the
    /// eutectic temperature, basis `Eutectic`).
    pub ice: Option<IcePoint>,
    /// Why the ice line is not given, when it is not.
    pub ice_unknown: Option<String>,
    /// Highest saturation temperature of the loading where the salt curve rises through
    /// it (crystals on cooling below it), K; `None` when the curve data do not reach it.
    pub saturation_t_k: Option<f64>,
    /// Which solid appears first on cooling; `None` when the data cannot tell.
    pub first: Option<FirstSolid>,
    /// Temperature where the first solid appears, K, where known.
    pub first_t_k: Option<f64>,
    /// True when some solid has appeared on cooling to the asked temperature (always
    /// consistent with `first_t_k`: true exactly when the asked temperature is at or
    /// below it, or below the eutectic).
    pub solid_at_t: bool,
    /// (mass fraction, K) of the eutectic, where the data give it.
    pub eutectic: Option<(f64, f64)>,
    /// True when the asked temperature is below the eutectic temperature (the whole
    /// solution is solid there, at equilibrium).
    pub below_eutectic: bool,
    /// Between the ice line and the eutectic, with ice formed first: the liquid left.
    pub freeze_concentration: Option<FreezeConcentration>,
}

/// For a loading `w` cooled to `t_k` (≤ 273.15 K): which appears first, ice or the salt,
/// and, when ice has formed, the liquid left.
///
/// Where the data give a eutectic (w_e, T_e) the phase diagram decides (common practice
/// for a simple eutectic system): below w_e ice comes first at the ice line
/// ([`System::ice_line`]) and the liquid then follows the ice line, richer in salt, down to
/// T_e, where salt and ice crystallise together; above w_e the salt comes first, at the
/// highest temperature where its curve rises through the loading, and no ice forms above
/// T_e; at w_e both at T_e. Without a eutectic the higher of the ice line and the salt's
/// saturation temperature comes first. The liquid left with ice (lever rule): w_l from the
/// ice line at `t_k`, ice fraction 1 − w/w_l.
pub fn first_solid_on_cooling(
    system: &System<'_>,
    w: f64,
    t_k: f64,
) -> Result<FreezingCheck, ScienceError> {
    let t_k = positive("temperature (K)", t_k)?;
    if t_k > ICE_POINT {
        return Err(ScienceError::Freezing(
            "a freezing check needs a temperature at or below 0 °C",
        ));
    }
    let w = check_w(w)?;
    let eutectic = system.eutectic();
    let (ice, ice_unknown) = match system.ice_line(w) {
        Ok(p) => (Some(p), None),
        Err(e) => (None, Some(e.to_string())),
    };
    let saturation_t_k = match system.curve {
        Some(c) if w > 0.0 => saturation_temperatures(c, w)?
            .into_iter()
            .filter(|x| x.rising)
            .map(|x| x.t_k)
            .fold(None, |acc: Option<f64>, t| {
                Some(acc.map_or(t, |a| a.max(t)))
            }),
        _ => None,
    };
    let ice_t = ice.as_ref().map(|p| p.t_k);
    let first = match (eutectic, ice_t, saturation_t_k) {
        (Some((we, _)), _, _) if (w - we).abs() <= 1e-9 => Some(FirstSolid::Both),
        (Some((we, _)), _, _) if w > we => Some(FirstSolid::Salt),
        (Some(_), Some(_), _) => Some(FirstSolid::Ice),
        (Some(_), None, _) => None,
        (None, Some(ti), Some(ts)) => Some(if ts > ti {
            FirstSolid::Salt
        } else {
            FirstSolid::Ice
        }),
        // No crossing: ice comes first only if the salt curve has data down to the ice
        // line and stays above the loading there.
        (None, Some(ti), None) => match system.curve {
            Some(c) if c.temperature_range().0 <= ti => Some(FirstSolid::Ice),
            None if w == 0.0 => Some(FirstSolid::Ice),
            _ => None,
        },
        (None, None, _) => None,
    };
    let first_t_k = match first {
        Some(FirstSolid::Ice) => ice_t,
        Some(FirstSolid::Salt) => saturation_t_k,
        Some(FirstSolid::Both) => eutectic.map(|e| e.1),
        None => None,
    };
    let below_eutectic = eutectic.is_some_and(|e| t_k < e.1);
    let solid_at_t = below_eutectic || first_t_k.is_some_and(|tf| tf >= t_k);
    let freeze_concentration = match (first, ice_t) {
        (Some(FirstSolid::Ice), Some(ti)) if t_k < ti && !below_eutectic => {
            let wl = system.liquid_on_ice_line(w, t_k)?;
            let ice_fraction = (1.0 - w / wl).max(0.0);
            Some(FreezeConcentration {
                liquid_mass_fraction: wl,
                ice_fraction,
                ice_fraction_of_water: ice_fraction / (1.0 - w),
            })
        }
        _ => None,
    };
    Ok(FreezingCheck {
        ice,
        ice_unknown,
        saturation_t_k,
        first,
        first_t_k,
        solid_at_t,
        eutectic,
        below_eutectic,
        freeze_concentration,
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

    fn system(data: Option<&FreezingData>) -> System<'_> {
        System {
            curve: None,
            molar_mass: 58.44,
            ions: 2,
            data,
            models: &[],
        }
    }

    #[test]
    fn ideal_only_in_the_dilute_limit() {
        // By hand: 0.05 mol/kg of a 2-ion salt, ideal: 2 × 1.86 × 0.05 = 0.186 K.
        assert!((ideal_depression(1.0, 2) - 3.72).abs() < 1e-12);
        let w = 0.05 * 58.44 / (1000.0 + 0.05 * 58.44);
        let p = system(None).ice_line(w).unwrap();
        assert_eq!(p.basis, IceBasis::Ideal);
        assert!((p.t_k - (273.15 - 0.186)).abs() < 1e-9);
        // 1 mol/kg is no longer dilute: refused, with the reasons.
        let e = system(None).ice_line(0.05844 / 1.05844).unwrap_err();
        assert!(e.to_string().contains("dilute limit"), "{e}");
        assert!(e.to_string().contains("mol/kg of ions"), "{e}");
        // A molecule that does not ionise (0.32 mol/kg, as 10 %w/w sucrose) is not "ions".
        let molecule = System {
            molar_mass: 342.3,
            ions: 1,
            ..system(None)
        };
        let e = molecule.ice_line(0.10).unwrap_err().to_string();
        assert!(
            e.contains("0.2 mol/kg of dissolved particles; this solution has 0.32"),
            "{e}"
        );
    }

    #[test]
    fn tabulated_ice_line_and_eutectic() {
        let d = demo();
        let s = system(Some(&d));
        let p = s.ice_line(0.10).unwrap();
        assert_eq!(p.basis, IceBasis::Tabulated);
        assert!((p.t_k - 266.0).abs() < 1e-12);
        let p = s.ice_line(0.22).unwrap();
        assert_eq!(p.basis, IceBasis::Interpolated);
        assert!(p.t_k < 256.0 && p.t_k > 252.0);
        let c = first_solid_on_cooling(&s, 0.10, 263.15).unwrap();
        assert_eq!(c.first, Some(FirstSolid::Ice));
        assert!(c.solid_at_t);
        let c = first_solid_on_cooling(&s, 0.10, 268.15).unwrap();
        assert!(!c.solid_at_t);
        assert!(c.freeze_concentration.is_none());
        // Beyond the eutectic composition no ice forms above the eutectic.
        let c = first_solid_on_cooling(&s, 0.25, 263.15).unwrap();
        assert_eq!(c.first, Some(FirstSolid::Salt));
        assert_eq!(c.ice.as_ref().unwrap().basis, IceBasis::Eutectic);
        assert_eq!(c.ice.unwrap().t_k, 252.0);
        let c = first_solid_on_cooling(&s, 0.10, 250.0).unwrap();
        assert!(c.below_eutectic && c.solid_at_t);
        assert!(first_solid_on_cooling(&s, 0.10, 280.0).is_err());
    }

    #[test]
    fn freeze_concentration_by_the_lever_rule() {
        // At 256 K the demo ice line is at w = 0.20 (tabulated): a 0.10 solution has left
        // half its mass as ice (1 − 0.10/0.20), 0.5/0.9 of its water.
        let d = demo();
        let c = first_solid_on_cooling(&system(Some(&d)), 0.10, 256.0).unwrap();
        let f = c.freeze_concentration.unwrap();
        assert!((f.liquid_mass_fraction - 0.20).abs() < 1e-9);
        assert!((f.ice_fraction - 0.5).abs() < 1e-9);
        assert!((f.ice_fraction_of_water - 0.5 / 0.9).abs() < 1e-9);
    }
}
