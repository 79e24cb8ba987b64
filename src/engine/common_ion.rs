//! A salt of a recipe that shares an ion with another of its solutes, when no parameter
//! system holds them together: [`EachOnItsOwn`](crate::engine::mixture::EachOnItsOwn)
//! reads it by the ideal common-ion estimate ([`crate::science::common_ion`]) as well as by
//! its own pure-water curve, and the lower decides.

use crate::answer::Basis;
use crate::engine::common::celsius;
use crate::engine::mixture::Mixture;
use crate::model::SoluteKind;
use crate::science::ScienceError;
use crate::science::common_ion::{Background, IdealSalt};
use crate::science::curve::{Curve, Evaluation};
use crate::science::enthalpy::{dissociate, split_hydrate};
use crate::science::freezing::molality;

/// How the common-ion estimate is made, said once in an answer that uses it.
pub const METHOD: &str = "common-ion estimate: a salt's solubility product from its own solubility in pure water at the same temperature, read in the recipe's liquid with activity coefficients taken as 1 (and Raoult's water activity for a hydrate's water); rough: the activity coefficients it leaves out differ between the two liquids, so the error can go either way, and in strong brines it is large (NaCl in 4 mol/kg MgCl2 at 25 C: 3.34 mol/kg by this estimate, 0.58 by Pitzer's equations with Harvie, Moller & Weare's parameters, 6.15 alone in pure water)";

/// Solute `index`'s ions that other solutes of the mixture also supply, and how much of
/// them (mol/kg of the mixture's water).
#[derive(Debug, Clone, PartialEq)]
pub struct Shared {
    /// The salt's ion counts (its solid's water is set per phase).
    counts: Vec<f64>,
    background: Background,
    /// The shared ions, as the tables write them (`Na+`).
    pub ions: Vec<&'static str>,
    /// The salt's molar mass, g/mol.
    molar_mass: f64,
}

/// Dissolved particles of one solute per formula unit: a salt's ions, else one.
fn particles_of(solute: &crate::model::Solute) -> f64 {
    match solute.kind {
        SoluteKind::Salt => dissociate(&solute.formula)
            .map_or(f64::from(solute.ions.max(1)), |ions| {
                ions.iter().map(|(_, n)| f64::from(*n)).sum()
            }),
        _ => 1.0,
    }
}

/// What solute `index` shares with the rest of `mixture`; `None` when it is not a salt of
/// known ions, or shares none of them.
pub fn shared(mixture: &Mixture, index: usize) -> Option<Shared> {
    let (solute, _) = mixture.solutes.get(index)?;
    if solute.kind != SoluteKind::Salt || mixture.molality(index) <= 0.0 {
        return None;
    }
    let own = dissociate(&solute.formula)?;
    let mut common = vec![0.0; own.len()];
    let mut particles = 0.0;
    for (j, (other, _)) in mixture.solutes.iter().enumerate() {
        if j == index {
            continue;
        }
        let m = mixture.molality(j);
        particles += particles_of(other) * m;
        if other.kind != SoluteKind::Salt {
            continue;
        }
        for (ion, n) in dissociate(&other.formula).unwrap_or_default() {
            if let Some(k) = own.iter().position(|(o, _)| o.species == ion.species) {
                common[k] += f64::from(n) * m;
            }
        }
    }
    let ions: Vec<&'static str> = own
        .iter()
        .zip(&common)
        .filter(|(_, c)| **c > 0.0)
        .map(|((ion, _), _)| ion.species)
        .collect();
    if ions.is_empty() {
        return None;
    }
    Some(Shared {
        counts: own.iter().map(|(_, n)| f64::from(*n)).collect(),
        background: Background { common, particles },
        ions,
        molar_mass: solute.molar_mass,
    })
}

/// A salt's solubility at one temperature read both ways.
#[derive(Debug, Clone, PartialEq)]
pub struct Reading {
    /// Alone in pure water (its own curve), mol/kg.
    pub alone: f64,
    /// The lower of that and the common-ion estimate, mol/kg.
    pub here: f64,
    /// True when the common-ion estimate is the lower.
    pub estimated: bool,
    pub phase: String,
    pub basis: Basis,
}

impl Shared {
    /// The salt's solubility at `t_k` from its curve's value there.
    pub fn read(&self, ev: &Evaluation) -> Result<Reading, ScienceError> {
        let alone = molality(ev.mass_fraction, self.molar_mass);
        let salt = IdealSalt {
            counts: self.counts.clone(),
            hydrate_water: split_hydrate(&ev.phase).1,
        };
        let estimate = salt.solubility_in(alone, &self.background)?;
        let estimated = estimate < alone;
        Ok(Reading {
            alone,
            here: estimate.min(alone),
            estimated,
            phase: ev.phase.clone(),
            basis: if estimated { Basis::Computed } else { ev.basis },
        })
    }

    /// The salt's solubility at `t_k` on `curve`.
    pub fn at(&self, curve: &Curve, t_k: f64, extrapolate: bool) -> Result<Reading, ScienceError> {
        self.read(&curve.evaluate(t_k, extrapolate)?)
    }

    /// g per 100 g of water of a molality of the salt.
    pub fn per_100g(&self, m: f64) -> f64 {
        m * self.molar_mass / 10.0
    }

    /// The caveat of an answer the estimate decided, at `t_k` (beside [`METHOD`]).
    pub fn caveat(&self, name: &str, t_k: f64, reading: &Reading) -> String {
        format!(
            "{name} shares {} with other solutes of the recipe: by the common-ion estimate its solubility here is {} g/100g water at {} C, where alone in the water it would be {}",
            self.ions.join(" and "),
            crate::number::shown(self.per_100g(reading.here), 4),
            celsius(t_k),
            crate::number::shown(self.per_100g(reading.alone), 4),
        )
    }
}
