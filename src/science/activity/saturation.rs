//! Saturation of a salt in a mixture by Pitzer's model: the salt's solubility product from
//! its own solubility in pure water, its ion activity product in the mixture, and the
//! molality of it a given brine takes up before it saturates (so common-ion and salting
//! effects appear).
//!
//! For a solid M_νM X_νX · n H2O in equilibrium with the solution,
//! ln K = ν_M ln(m_M γ_M) + ν_X ln(m_X γ_X) + n ln a_w (the law of mass action with the
//! activity of the solid 1 and of water a_w); K is taken where the salt alone saturates pure
//! water, at molality m_sat: m_M = ν_M m_sat, m_X = ν_X m_sat. The saturation ratio of the
//! mixture is Ω = IAP/K with IAP the same product at the mixture's composition: Ω < 1 the
//! salt stays dissolved, Ω > 1 it can crystallise.

use super::ions::electrolyte;
use super::mixture::{Activity, Coefficients, System};
use crate::science::bisect::{Until, try_bisect};
use crate::science::error::ScienceError;

/// A solid phase in terms of a system's ions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Solid {
    pub cation: usize,
    pub cation_count: f64,
    pub anion: usize,
    pub anion_count: f64,
    /// Waters of crystallisation, n.
    pub waters: f64,
}

impl Solid {
    /// The solid of anhydrous formula `formula` with `waters` waters of crystallisation,
    /// when the system holds both its ions.
    pub fn of(system: &System, formula: &str, waters: u32) -> Option<Solid> {
        let e = electrolyte(formula)?;
        Some(Solid {
            cation: system.index(e.cation)?,
            cation_count: f64::from(e.cation_count),
            anion: system.index(e.anion)?,
            anion_count: f64::from(e.anion_count),
            waters: f64::from(waters),
        })
    }

    /// The molalities of the salt alone in water at molality `m` of the salt.
    pub fn alone(&self, n_ions: usize, m: f64) -> Vec<f64> {
        let mut out = vec![0.0; n_ions];
        self.add(&mut out, m);
        out
    }

    /// Adds molality `m` of the salt to `molalities`.
    pub fn add(&self, molalities: &mut [f64], m: f64) {
        if let Some(c) = molalities.get_mut(self.cation) {
            *c += self.cation_count * m;
        }
        if let Some(a) = molalities.get_mut(self.anion) {
            *a += self.anion_count * m;
        }
    }

    /// ln IAP = ν_M ln(m_M γ_M) + ν_X ln(m_X γ_X) + n ln a_w; −∞ when an ion is absent.
    pub fn ln_ion_activity_product(&self, molalities: &[f64], activity: &Activity) -> f64 {
        let term = |i: usize, nu: f64| {
            let m = molalities.get(i).copied().unwrap_or(0.0);
            let lg = activity.ln_gamma.get(i).copied().unwrap_or(0.0);
            if m > 0.0 {
                nu * (m.ln() + lg)
            } else {
                f64::NEG_INFINITY
            }
        };
        term(self.cation, self.cation_count)
            + term(self.anion, self.anion_count)
            + self.waters * activity.ln_water
    }

    /// ln K from the salt's solubility in pure water, `m_sat` mol/kg of the anhydrous salt.
    pub fn ln_k_from_solubility(
        &self,
        coefficients: &Coefficients,
        m_sat: f64,
    ) -> Result<f64, ScienceError> {
        if !(m_sat.is_finite() && m_sat > 0.0) {
            return Err(ScienceError::NotPositive {
                what: "solubility (mol/kg)",
                value: m_sat,
            });
        }
        let m = self.alone(coefficients.len(), m_sat);
        let a = coefficients.activity(&m)?;
        Ok(self.ln_ion_activity_product(&m, &a))
    }

    /// ln Ω = ln IAP − ln K of the solid in a solution of `molalities`.
    pub fn ln_saturation_ratio(
        &self,
        coefficients: &Coefficients,
        molalities: &[f64],
        ln_k: f64,
    ) -> Result<f64, ScienceError> {
        let a = coefficients.activity(molalities)?;
        Ok(self.ln_ion_activity_product(molalities, &a) - ln_k)
    }

    /// The molality of the salt that `background` (a neutral brine of the system's ions)
    /// takes up before the solid saturates, by bisection on ln Ω (60 halvings, from zero to
    /// the system's ionic strength limit); refused when even the limit stays below
    /// saturation (the model cannot say) or the background is already saturated (0 is
    /// returned then).
    pub fn solubility_in(
        &self,
        coefficients: &Coefficients,
        background: &[f64],
        ln_k: f64,
        m_max: f64,
    ) -> Result<f64, ScienceError> {
        let ratio = |m: f64| {
            let mut mix = background.to_vec();
            self.add(&mut mix, m);
            self.ln_saturation_ratio(coefficients, &mix, ln_k)
        };
        if ratio(0.0)? >= 0.0 {
            return Ok(0.0);
        }
        if ratio(m_max)? < 0.0 {
            return Err(ScienceError::OutsideModel(format!(
                "the salt does not saturate below {m_max} mol/kg, the model's limit here"
            )));
        }
        let bracket = try_bisect(0.0, m_max, Until::Halvings(60), |m| {
            ratio(m).map(|r| r < 0.0)
        })?;
        Ok(bracket.mid())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::activity::seed_system;

    fn hmw84() -> System {
        seed_system("harvie-moller-weare-1984")
    }

    /// A solubility taken as the model's input (any value inside the sets' range serves:
    /// the checks below are of the method, not of a number).
    const KCL_SAT: f64 = 4.8;

    #[test]
    fn the_salt_alone_is_saturated_at_its_own_solubility() {
        let s = hmw84();
        let c = s.at(298.15).unwrap();
        let kcl = Solid::of(&s, "KCl", 0).unwrap();
        let ln_k = kcl.ln_k_from_solubility(&c, KCL_SAT).unwrap();
        let back = vec![0.0; c.len()];
        let m = kcl.solubility_in(&c, &back, ln_k, 6.0).unwrap();
        assert!((m - KCL_SAT).abs() < 1e-9, "{m}");
        let below = kcl.alone(c.len(), 0.5 * KCL_SAT);
        assert!(kcl.ln_saturation_ratio(&c, &below, ln_k).unwrap() < 0.0);
    }

    /// Common practice, no source: adding a common ion never raises a salt's solubility.
    /// KCl in NaCl brines (common Cl⁻): less soluble the more NaCl.
    #[test]
    fn a_common_ion_lowers_the_solubility() {
        let s = hmw84();
        let c = s.at(298.15).unwrap();
        let kcl = Solid::of(&s, "KCl", 0).unwrap();
        let nacl = Solid::of(&s, "NaCl", 0).unwrap();
        let ln_k = kcl.ln_k_from_solubility(&c, KCL_SAT).unwrap();
        let mut last = KCL_SAT;
        for m_nacl in [0.5, 1.0, 2.0, 3.0, 4.0] {
            let back = nacl.alone(c.len(), m_nacl);
            let m = kcl.solubility_in(&c, &back, ln_k, 10.0).unwrap();
            assert!(m < last, "{m_nacl} mol/kg NaCl: KCl {m} not below {last}");
            last = m;
        }
    }

    #[test]
    fn a_hydrate_counts_its_water_and_absent_ions_leave_it_unsaturated() {
        let s = hmw84();
        let c = s.at(298.15).unwrap();
        let gypsum = Solid::of(&s, "CaSO4", 2).unwrap();
        let m = gypsum.alone(c.len(), 0.015);
        let a = c.activity(&m).unwrap();
        let with = gypsum.ln_ion_activity_product(&m, &a);
        let without = Solid {
            waters: 0.0,
            ..gypsum
        }
        .ln_ion_activity_product(&m, &a);
        assert!((with - without - 2.0 * a.ln_water).abs() < 1e-12);
        let no_sulfate = Solid::of(&s, "CaCl2", 0).unwrap().alone(c.len(), 1.0);
        let a = c.activity(&no_sulfate).unwrap();
        assert_eq!(
            gypsum.ln_ion_activity_product(&no_sulfate, &a),
            f64::NEG_INFINITY
        );
        assert!(
            Solid::of(&s, "KNO3", 0).is_none(),
            "no nitrate in the system"
        );
    }
}
