//! The ice line of a mixture of solutes from each solute's own freezing points, by the
//! Zdanovskii–Stokes–Robinson (ZSR) rule: solutions of equal water activity mix without
//! changing it, so a mixture whose solutes stand at molalities mᵢ has the water activity
//! a_w at which Σ mᵢ / mᵢ°(a_w) = 1, mᵢ°(a_w) being the molality of solute i alone in water
//! at that water activity (A. N. Zdanovskii, Trudy Solyanoi Laboratorii Akad. Nauk SSSR 6
//! (1936); R. H. Stokes & R. A. Robinson, J. Phys. Chem. 70 (1966) 2126–2131).
//!
//! On the ice line the water activity is ice's at the temperature (the ice–water
//! equilibrium, [`ln_water_activity_of_ice`]), whatever the solutes; so a binary solution of
//! solute i freezing at T has exactly that water activity, and the mixture starts to freeze
//! at the T where Σ mᵢ / mᵢ*(T) = 1, mᵢ*(T) being the molality of solute i alone that
//! freezes at T — read from its freezing points, with no activity model. A solute with no
//! freezing points counts as ideal (Raoult: mᵢ*(T) = −ln a_w,ice(T) / (M_w·νᵢ)), which the
//! caller allows only for a solute within the dilute limit.
//!
//! Units: temperatures in K, molalities in mol/kg of water.

use super::activity::ice::ln_water_activity_of_ice;
use super::bisect::{Until, try_bisect};
use super::error::ScienceError;
use super::freezing::{ICE_POINT, System, molality};
use super::units::WATER_MOLAR_MASS;

/// How a solute of the mixture is read alone in water at a temperature.
#[derive(Debug, Clone, Copy)]
pub enum Alone<'a> {
    /// From its freezing points (the table, with the eutectic as a last point).
    Table(System<'a>),
    /// As an ideal solute of `ions` particles per formula unit.
    Ideal { ions: u32 },
}

/// One solute of the mixture: how it is read alone, and its molality in the mixture's
/// water, mol/kg.
#[derive(Debug, Clone, Copy)]
pub struct Part<'a> {
    pub alone: Alone<'a>,
    pub molality: f64,
}

/// The lowest temperature a solute alone can be read at (K): where its freezing points
/// end (the eutectic, or the last point). `None` for an ideal solute (no end).
fn lowest(alone: &Alone) -> Result<Option<f64>, ScienceError> {
    match alone {
        Alone::Ideal { .. } => Ok(None),
        Alone::Table(system) => {
            let top = match (system.eutectic(), system.data) {
                (Some((w, _)), _) => w,
                (None, Some(d)) => d.points.iter().map(|p| p.0).fold(0.0, f64::max),
                (None, None) => {
                    return Err(ScienceError::IceLineUnknown(
                        "a solute read from its freezing points has none".into(),
                    ));
                }
            };
            Ok(Some(system.ice_line(top)?.t_k))
        }
    }
}

/// mᵢ*(T): the molality of the solute alone in water that freezes at `t_k`.
fn alone_at(alone: &Alone, t_k: f64) -> Result<f64, ScienceError> {
    match alone {
        Alone::Ideal { ions } => Ok(-1000.0 * ln_water_activity_of_ice(t_k)
            / (WATER_MOLAR_MASS * f64::from((*ions).max(1)))),
        Alone::Table(system) => Ok(molality(
            system.liquid_on_ice_line(0.0, t_k)?,
            system.molar_mass,
        )),
    }
}

/// Σ mᵢ / mᵢ*(T): above 1 the mixture is still liquid at `t_k` (its water activity lies
/// below ice's), below 1 ice has formed.
pub fn strength(parts: &[Part], t_k: f64) -> Result<f64, ScienceError> {
    parts.iter().try_fold(0.0, |sum, p| {
        Ok(sum
            + if p.molality > 0.0 {
                p.molality / alone_at(&p.alone, t_k)?
            } else {
                0.0
            })
    })
}

/// Where the mixture's ice line lies.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum MixtureIce {
    /// Ice appears on cooling below this temperature, K.
    At(f64),
    /// Still liquid where the freezing points of the solute at `limit` (its index) end,
    /// at `t_k`: the ice line lies lower, where the data cannot follow it.
    Below { t_k: f64, limit: usize },
}

/// The lowest temperature (K) the rule can be read at, and the solute (its index) whose
/// freezing points end there: the highest of the solutes' lowest temperatures. An
/// ideal-only mixture has none: then 100 K below 0 °C, past any ice line the caller
/// allows (the ideal sum of a dilute mixture reaches 1 within a few kelvin).
pub fn floor(parts: &[Part]) -> Result<(f64, usize), ScienceError> {
    let mut floor: Option<(f64, usize)> = None;
    for (i, p) in parts.iter().enumerate() {
        if p.molality == 0.0 {
            continue;
        }
        if let Some(t) = lowest(&p.alone)?
            && floor.is_none_or(|(f, _)| t > f)
        {
            floor = Some((t, i));
        }
    }
    Ok(floor.unwrap_or((ICE_POINT - 100.0, usize::MAX)))
}

/// The ice line of the mixture by the ZSR rule (module doc), bisected to 1e-5 K between
/// 0 °C and the [`floor`].
pub fn ice_line(parts: &[Part]) -> Result<MixtureIce, ScienceError> {
    if parts
        .iter()
        .any(|p| !(p.molality.is_finite() && p.molality >= 0.0))
    {
        return Err(ScienceError::InvalidComposition {
            value: f64::NAN,
            unit: "mol/kg",
            why: "a molality must be zero or positive",
        });
    }
    if parts.iter().all(|p| p.molality == 0.0) {
        return Ok(MixtureIce::At(ICE_POINT));
    }
    let (t_low, limit) = floor(parts)?;
    if strength(parts, t_low)? > 1.0 {
        return Ok(MixtureIce::Below { t_k: t_low, limit });
    }
    let top = ICE_POINT - 1e-9;
    let bracket = try_bisect(t_low, top, Until::Width(1e-5), |t| {
        strength(parts, t).map(|s| s <= 1.0)
    })?;
    Ok(MixtureIce::At(bracket.mid()))
}

/// A solid a solute of the mixture may form at a temperature: its solubility there (mol/kg
/// of water, read alone in water) and the water it takes per formula unit (a hydrate's).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Solid {
    pub solubility: f64,
    pub hydrate_water: f64,
}

/// The mixture at a temperature, per kg of the recipe's water: ice, the water left liquid,
/// each solute crystallised (mol) and its molality in the liquid.
#[derive(Debug, Clone, PartialEq)]
pub struct Frozen {
    pub ice_kg: f64,
    pub water_kg: f64,
    pub crystallised: Vec<f64>,
    pub liquid: Vec<f64>,
}

/// The equilibrium at `t_k` of the mixture `parts` with ice and with the solids `solids`
/// (by index; `None`: the solute is taken to stay dissolved). The liquid water W follows
/// from the rule: with ice, Σ (mⱼ/W)/mⱼ*(T) over the dissolved solutes plus Σ sᵢ/mᵢ*(T)
/// over the saturated ones is 1; without ice, the water left is what the hydrates do not
/// take. A solute is saturated where mⱼ/W would exceed its solubility, and crystallises
/// mⱼ − sⱼ·W. The saturated set is found by trying, at most a few rounds per solute.
/// Refused where the saturated solids alone hold the water below ice's activity (below
/// the mixture's eutectic).
pub fn freeze_at(
    parts: &[Part],
    solids: &[Option<Solid>],
    t_k: f64,
) -> Result<Frozen, ScienceError> {
    let n = parts.len();
    let alone: Vec<f64> = if t_k < ICE_POINT {
        parts
            .iter()
            .map(|p| alone_at(&p.alone, t_k))
            .collect::<Result<_, _>>()?
    } else {
        vec![f64::INFINITY; n]
    };
    let kg = WATER_MOLAR_MASS / 1000.0;
    let mut saturated = vec![false; n];
    for _ in 0..=4 * n {
        let (mut a, mut b, mut hyd_m, mut hyd_s) = (0.0, 0.0, 0.0, 0.0);
        for (i, p) in parts.iter().enumerate() {
            match (saturated[i], solids.get(i).copied().flatten()) {
                (true, Some(s)) => {
                    b += s.solubility / alone[i];
                    hyd_m += s.hydrate_water * p.molality * kg;
                    hyd_s += s.hydrate_water * s.solubility * kg;
                }
                _ => a += p.molality / alone[i],
            }
        }
        // Without ice: W = 1 − Σ nᵢ·(mᵢ − sᵢ·W)·M_w. With ice: the rule's W, where the
        // saturated solutes alone leave room for it (b < 1: their liquid's water activity
        // is still above ice's); else ice cannot stand beside them.
        let without_ice = (1.0 - hyd_m) / (1.0 - hyd_s);
        let water = if t_k >= ICE_POINT || b >= 1.0 {
            without_ice
        } else {
            (a / (1.0 - b)).min(without_ice)
        };
        if water <= 1e-9 {
            return Err(ScienceError::IceLineUnknown(format!(
                "at {t_k:.2} K no liquid is left: every solute is saturated beside ice (below the mixture's eutectic)"
            )));
        }
        let mut changed = false;
        for (i, p) in parts.iter().enumerate() {
            let Some(s) = solids.get(i).copied().flatten() else {
                continue;
            };
            let over = p.molality > s.solubility * water * (1.0 + 1e-12);
            if over != saturated[i] {
                saturated[i] = over;
                changed = true;
                break;
            }
        }
        if !changed {
            let mut crystallised = vec![0.0; n];
            let mut liquid = vec![0.0; n];
            let mut hydrate = 0.0;
            for (i, p) in parts.iter().enumerate() {
                match (saturated[i], solids.get(i).copied().flatten()) {
                    (true, Some(s)) => {
                        crystallised[i] = p.molality - s.solubility * water;
                        liquid[i] = s.solubility;
                        hydrate += s.hydrate_water * crystallised[i] * kg;
                    }
                    _ => liquid[i] = p.molality / water,
                }
            }
            return Ok(Frozen {
                // Rounding leaves a few 1e-16 kg where no ice forms.
                ice_kg: Some(1.0 - water - hydrate)
                    .filter(|ice| *ice > 1e-12)
                    .unwrap_or(0.0),
                water_kg: water,
                crystallised,
                liquid,
            });
        }
    }
    Err(ScienceError::IceLineUnknown(format!(
        "at {t_k:.2} K no settled set of crystallising solids was found"
    )))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{FreezingData, Provenance, Review};

    fn data(points: Vec<(f64, f64)>, eutectic: Option<(f64, f64)>) -> FreezingData {
        FreezingData {
            key: "t".into(),
            solute: "s".into(),
            source: "s".into(),
            points,
            eutectic,
            provenance: Provenance::Compiled,
            review: Review::Unreviewed,
        }
    }

    fn system(d: &FreezingData, molar_mass: f64) -> System<'_> {
        System {
            curve: None,
            molar_mass,
            ions: 2,
            data: Some(d),
            models: &[],
        }
    }

    /// A table of an ideal 1-1 salt of molar mass 100 g/mol: ΔT = 2·1.86·m.
    fn ideal_table() -> FreezingData {
        let points = (0..=10)
            .map(|k| {
                let m = 0.2 * f64::from(k);
                let w = m * 0.1 / (1.0 + m * 0.1);
                (w, ICE_POINT - 2.0 * 1.86 * m)
            })
            .collect();
        data(points, None)
    }

    fn table_part(s: System<'_>, molality: f64) -> Part<'_> {
        Part {
            alone: Alone::Table(s),
            molality,
        }
    }

    fn ideal_part(ions: u32, molality: f64) -> Part<'static> {
        Part {
            alone: Alone::Ideal { ions },
            molality,
        }
    }

    /// The ice line, K, of a mixture that has one.
    fn at(parts: &[Part]) -> f64 {
        match ice_line(parts) {
            Ok(MixtureIce::At(t)) => t,
            other => panic!("no ice line: {other:?}"),
        }
    }

    #[test]
    fn one_solute_gives_back_its_own_ice_line() {
        let d = ideal_table();
        let s = system(&d, 100.0);
        let w = 0.1; // 1.111 mol/kg
        let own = s.ice_line(w).map(|p| p.t_k).unwrap_or(0.0);
        let t = at(&[table_part(s, molality(w, 100.0))]);
        assert!((t - own).abs() < 1e-4, "{t}");
    }

    #[test]
    fn a_solute_split_in_two_freezes_where_it_did_whole() {
        // ZSR holds exactly for a solute mixed with itself: half and half of 1.2 mol/kg
        // freezes where 1.2 mol/kg does.
        let d = ideal_table();
        let s = system(&d, 100.0);
        let a = at(&[table_part(s, 0.6), table_part(s, 0.6)]);
        let b = at(&[table_part(s, 1.2)]);
        assert!((a - b).abs() < 1e-4, "{a} {b}");
        // By hand from the table: 273.15 − 2·1.86·1.2 = 268.686 K.
        assert!((b - 268.686).abs() < 0.01, "{b}");
    }

    #[test]
    fn more_solute_lowers_the_ice_line_and_the_table_end_is_said() {
        let d = ideal_table();
        let s = system(&d, 100.0);
        let t1 = at(&[table_part(s, 0.5)]);
        let t2 = at(&[table_part(s, 0.5), ideal_part(1, 0.1)]);
        assert!(t2 < t1, "{t1} {t2}");
        // Beyond the table (it ends at 2 mol/kg, 265.71 K): the line lies below its end.
        assert!(matches!(
            ice_line(&[table_part(s, 1.9), ideal_part(1, 0.5)]),
            Ok(MixtureIce::Below { limit: 0, .. })
        ));
        assert!(ice_line(&[ideal_part(1, -1.0)]).is_err());
    }

    #[test]
    fn below_the_ice_line_ice_takes_the_water_the_rule_says() {
        let d = ideal_table();
        let s = system(&d, 100.0);
        let parts = [table_part(s, 0.5), ideal_part(2, 0.1)];
        // Ideal throughout: 1.2 mol/kg of particles, ice line near −2.23 C. At −4.464 C
        // (2.4 mol/kg by the table's ideal law, nearly) about half the water is ice.
        let t = ICE_POINT - 2.0 * 1.86 * 1.2;
        let f = freeze_at(&parts, &[None, None], t).map_err(|e| e.to_string());
        let Ok(f) = f else { panic!("{f:?}") };
        assert!((f.water_kg - 0.5).abs() < 0.01, "{f:?}");
        assert!((f.ice_kg + f.water_kg - 1.0).abs() < 1e-12);
        assert!((f.liquid[0] - 1.0).abs() < 0.02, "{f:?}");
        // Above the ice line no ice.
        let warm = freeze_at(&parts, &[None, None], ICE_POINT - 1.0).map_err(|e| e.to_string());
        assert_eq!(warm.map(|f| f.ice_kg), Ok(0.0));
        // A solid of solubility 0.6 mol/kg comes out as the liquid concentrates: at most
        // 0.6 stays dissolved per kg of liquid water, the rest crystallises, with its
        // hydrate's water.
        let solid = Solid {
            solubility: 0.6,
            hydrate_water: 2.0,
        };
        let f = freeze_at(&parts, &[Some(solid), None], t).map_err(|e| e.to_string());
        let Ok(f) = f else { panic!("{f:?}") };
        assert!((f.liquid[0] - 0.6).abs() < 1e-12, "{f:?}");
        assert!(f.crystallised[0] > 0.0);
        let hydrate = 2.0 * f.crystallised[0] * WATER_MOLAR_MASS / 1000.0;
        assert!(
            (f.ice_kg + f.water_kg + hydrate - 1.0).abs() < 1e-12,
            "{f:?}"
        );
        assert!((f.crystallised[0] + 0.6 * f.water_kg - 0.5).abs() < 1e-12);
    }
}
