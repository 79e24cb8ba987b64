//! The common-ion effect in the ideal limit: a salt whose ions other solutes of the same
//! liquid also supply dissolves less than in pure water.
//!
//! The salt's solubility product is read from its own solubility in pure water at the same
//! temperature, K = Π (νᵢ·s₀)^νᵢ · a_w(s₀)ⁿ, and its solubility in a liquid that already
//! holds cᵢ mol/kg of its ions is the molality s with Π (νᵢ·s + cᵢ)^νᵢ · a_wⁿ = K (the law
//! of mass action with activity coefficients taken as 1: the textbook common-ion effect,
//! common practice). n is the hydrate water of the solid; the water activity is Raoult's,
//! a_w = 1 / (1 + M_w·Σ particles), so a hydrate's product carries the water the other
//! solutes take. The activity coefficients are left out, and they differ between the salt's
//! own saturated solution and the mixture: the estimate is rough, its error can go either
//! way, and in strong brines it is large (`tests/common_ion.rs` sets it beside pytzer's
//! Pitzer solubilities of NaCl in MgCl2 and CaCl2 brines).

use super::bisect::{Until, bisect};
use super::error::ScienceError;
use super::units::WATER_MOLAR_MASS;

/// A salt as its ions see it: how many of each its formula gives, and its solid's water.
#[derive(Debug, Clone, PartialEq)]
pub struct IdealSalt {
    /// νᵢ, the count of each of the salt's ions per formula unit.
    pub counts: Vec<f64>,
    /// n, the molecules of water of crystallisation of the solid phase.
    pub hydrate_water: f64,
}

/// What the rest of the liquid holds, per kg of its water.
#[derive(Debug, Clone, PartialEq)]
pub struct Background {
    /// cᵢ, mol/kg of each of the salt's ions supplied by the other solutes (in the order of
    /// [`IdealSalt::counts`]).
    pub common: Vec<f64>,
    /// mol/kg of every dissolved particle of the other solutes (ions and molecules).
    pub particles: f64,
}

impl IdealSalt {
    fn particles(&self) -> f64 {
        self.counts.iter().sum()
    }

    /// ln a_w of Raoult's law with `particles` mol/kg dissolved.
    fn ln_water_activity(particles: f64) -> f64 {
        -(WATER_MOLAR_MASS / 1000.0 * particles).ln_1p()
    }

    /// ln of the ion product at molality `m` of the salt in `background`.
    fn ln_product(&self, m: f64, background: &Background) -> f64 {
        let ions: f64 = self
            .counts
            .iter()
            .zip(&background.common)
            .map(|(nu, c)| nu * (nu * m + c).ln())
            .sum();
        let particles = background.particles + self.particles() * m;
        ions + self.hydrate_water * Self::ln_water_activity(particles)
    }

    /// ln K from the solubility in pure water, `s0` mol/kg.
    pub fn ln_k(&self, s0: f64) -> f64 {
        let alone = Background {
            common: vec![0.0; self.counts.len()],
            particles: 0.0,
        };
        self.ln_product(s0, &alone)
    }

    /// The salt's solubility (mol/kg water) in `background`, from its solubility `s0` in
    /// pure water: the molality whose ion product equals ln K. Zero when the background
    /// alone already reaches the product (every ion of the salt supplied in excess).
    pub fn solubility_in(&self, s0: f64, background: &Background) -> Result<f64, ScienceError> {
        if !(s0.is_finite() && s0 > 0.0)
            || background.common.len() != self.counts.len()
            || background
                .common
                .iter()
                .any(|c| !(c.is_finite() && *c >= 0.0))
        {
            return Err(ScienceError::OutsideModel(
                "the common-ion estimate needs a positive solubility and non-negative amounts of the ions".into(),
            ));
        }
        let ln_k = self.ln_k(s0);
        let above = |m: f64| self.ln_product(m, background) > ln_k;
        if background.common.iter().all(|c| *c > 0.0) && above(0.0) {
            return Ok(0.0);
        }
        // The product rises with m (each ion's term grows faster than the water's falls in
        // any liquid a salt dissolves in); double until it is passed.
        let mut hi = 2.0 * s0;
        let mut doublings = 0;
        while !above(hi) {
            hi *= 2.0;
            doublings += 1;
            if doublings > 60 {
                return Err(ScienceError::OutsideModel(
                    "the common-ion estimate found no solubility (the ion product does not reach the salt's)".into(),
                ));
            }
        }
        Ok(bisect(0.0, hi, Until::Width(s0 * 1e-10), |m| !above(m)).mid())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn salt(counts: &[f64], n: f64) -> IdealSalt {
        IdealSalt {
            counts: counts.to_vec(),
            hydrate_water: n,
        }
    }

    fn background(common: &[f64], particles: f64) -> Background {
        Background {
            common: common.to_vec(),
            particles,
        }
    }

    #[test]
    fn in_pure_water_the_solubility_is_its_own() {
        let s = salt(&[2.0, 1.0], 12.0);
        let m = s
            .solubility_in(0.13, &background(&[0.0, 0.0], 0.0))
            .unwrap();
        assert!((m - 0.13).abs() < 1e-9, "{m}");
    }

    #[test]
    fn a_one_one_salt_follows_the_textbook_quadratic() {
        // s·(s + c) = s0² (activities taken as 1, no hydrate water): s = (−c + √(c² + 4s0²))/2.
        let s = salt(&[1.0, 1.0], 0.0);
        for (s0, c) in [(0.1, 0.05), (4.8, 3.42), (1e-3, 0.1)] {
            let m = s.solubility_in(s0, &background(&[0.0, c], c)).unwrap();
            let expected = (-c + (c * c + 4.0 * s0 * s0).sqrt()) / 2.0;
            assert!(
                (m - expected).abs() < 1e-6 * expected,
                "{s0} {c}: {m} vs {expected}"
            );
        }
    }

    #[test]
    fn more_of_a_common_ion_never_raises_the_solubility() {
        let s = salt(&[2.0, 1.0], 0.0);
        let mut last = f64::INFINITY;
        for c in [0.0, 0.01, 0.1, 1.0, 3.0] {
            let m = s.solubility_in(0.5, &background(&[c, 0.0], c)).unwrap();
            assert!(m < last || c == 0.0, "{c}: {m} after {last}");
            last = m;
        }
    }

    #[test]
    fn a_hydrate_gains_where_other_solutes_take_its_water() {
        // The same common ion with more other particles: a_wⁿ falls, so the hydrate
        // dissolves more; the anhydrous salt does not care.
        let hydrate = salt(&[2.0, 1.0], 10.0);
        let dry = salt(&[2.0, 1.0], 0.0);
        let few = background(&[0.1, 0.0], 0.1);
        let many = background(&[0.1, 0.0], 3.0);
        assert!(
            hydrate.solubility_in(0.3, &many).unwrap() > hydrate.solubility_in(0.3, &few).unwrap()
        );
        let (a, b) = (
            dry.solubility_in(0.3, &many).unwrap(),
            dry.solubility_in(0.3, &few).unwrap(),
        );
        assert!((a - b).abs() < 1e-9 * a);
    }

    #[test]
    fn every_ion_in_excess_leaves_no_room() {
        let s = salt(&[1.0, 1.0], 0.0);
        assert_eq!(
            s.solubility_in(0.1, &background(&[1.0, 1.0], 2.0)).unwrap(),
            0.0
        );
    }

    #[test]
    fn nonsense_is_refused() {
        let s = salt(&[1.0, 1.0], 0.0);
        assert!(s.solubility_in(0.0, &background(&[0.0, 0.0], 0.0)).is_err());
        assert!(
            s.solubility_in(0.1, &background(&[-1.0, 0.0], 0.0))
                .is_err()
        );
        assert!(s.solubility_in(0.1, &background(&[0.0], 0.0)).is_err());
    }
}
