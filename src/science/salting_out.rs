//! Salting out of a dissolved gas by the ions of a salt solution: Sechenov's relation with
//! ion- and gas-specific parameters (A. Schumpe, Chem. Eng. Sci. 48 (1993) 153; with the
//! temperature term of S. Weisenberger and A. Schumpe, AIChE J. 42 (1996) 298):
//!
//! log10(c_G,0 / c_G) = Σᵢ (hᵢ + h_G) cᵢ,  h_G = h_G,0 + h_T (T − 298.15 K),
//!
//! where c_G,0 and c_G are the gas's concentrations (per volume) in pure water and in the
//! salt solution at the same partial pressure, cᵢ the concentration of ion i (mol/L), hᵢ its
//! parameter and h_G,0, h_T the gas's (L/mol, L/(mol·K)). The parameters are data in
//! `seed-data/models/` ([`Sechenov`]).

use serde::Deserialize;

/// The temperature the gas parameter's temperature term is counted from, K.
pub const REFERENCE_K: f64 = 298.15;

/// A Sechenov parameter of an ion (`[[salting_ion]]`, keyed by the ion's symbol as
/// [`crate::science::activity::ions::IONS`] writes it: `Na`, `SO4`, `H2PO4`) or of a gas
/// (`[[salting_gas]]`, keyed by the gas's solute id: `oxygen`).
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Sechenov {
    pub key: String,
    /// An ion's hᵢ, or a gas's h_G,0: L/mol.
    pub h: f64,
    /// A gas's h_T, L/(mol·K); an ion's parameter has no temperature term (0).
    #[serde(default)]
    pub ht: f64,
    pub source: String,
    /// Where in the source (table, entry).
    pub locator: String,
    pub provenance: String,
    #[serde(default)]
    pub review: String,
    /// Temperatures the parameters were fitted over, K.
    pub t_min_k: f64,
    pub t_max_k: f64,
}

impl Sechenov {
    /// The parameter at `t_k`: h + h_T (T − 298.15 K), L/mol.
    pub fn h_at(&self, t_k: f64) -> f64 {
        self.h + self.ht * (t_k - REFERENCE_K)
    }

    /// True when `t_k` lies within the temperatures the parameters were fitted over.
    pub fn covers(&self, t_k: f64) -> bool {
        t_k >= self.t_min_k && t_k <= self.t_max_k
    }
}

/// The gas's concentration in the salt solution over its concentration in pure water at the
/// same partial pressure and temperature: 10^(−Σᵢ (hᵢ + h_G) cᵢ), with `ions` as (hᵢ in L/mol,
/// cᵢ in mol/L). 1 with no ions.
pub fn ratio_to_pure_water(gas: &Sechenov, ions: &[(f64, f64)], t_k: f64) -> f64 {
    let h_gas = gas.h_at(t_k);
    let exponent: f64 = ions.iter().map(|(h, c)| (h + h_gas) * c).sum();
    10f64.powf(-exponent)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn gas(h: f64, ht: f64) -> Sechenov {
        Sechenov {
            key: "g".into(),
            h,
            ht,
            source: String::new(),
            locator: String::new(),
            provenance: String::new(),
            review: String::new(),
            t_min_k: 273.15,
            t_max_k: 363.15,
        }
    }

    #[test]
    fn the_ratio_follows_sechenovs_relation() {
        // Worked by hand: 1 mol/L of a 1-1 salt with hᵢ 0.1 and 0.03 L/mol, a gas with
        // h_G,0 = 0.01 L/mol at 298.15 K: log10 ratio = −(0.11 + 0.04) = −0.15.
        let g = gas(0.01, -0.0005);
        let r = ratio_to_pure_water(&g, &[(0.1, 1.0), (0.03, 1.0)], 298.15);
        assert!((r - 10f64.powf(-0.15)).abs() < 1e-12);
        // 20 K colder, h_G = 0.01 + 0.0005·20 = 0.02: −(0.12 + 0.05) = −0.17.
        let cold = ratio_to_pure_water(&g, &[(0.1, 1.0), (0.03, 1.0)], 278.15);
        assert!((cold - 10f64.powf(-0.17)).abs() < 1e-12);
        // No ions: pure water.
        assert_eq!(ratio_to_pure_water(&g, &[], 298.15), 1.0);
        assert!(g.covers(300.0) && !g.covers(370.0));
    }
}
