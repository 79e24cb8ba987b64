//! Pitzer's equations for a single electrolyte in water: the osmotic coefficient φ and the
//! water activity a_w, with parameter sets (β0, β1, β2, Cφ and their temperature
//! dependence) taken as data.
//!
//! Equations: K. S. Pitzer & G. Mayorga, J. Phys. Chem. 77 (1973) 2300–2308, eqs. for a
//! single electrolyte MνX ν:
//!
//! φ − 1 = −|z_M z_X| A_φ √I / (1 + b√I) + m (2ν_Mν_X/ν) Bφ + m² (2(ν_Mν_X)^{3/2}/ν) Cφ,
//! Bφ = β0 + β1 exp(−α1√I) + β2 exp(−α2√I), b = 1.2 kg^½ mol^−½,
//! I = ½ m (ν_M z_M² + ν_X z_X²), ν = ν_M + ν_X;
//!
//! and ln a_w = −φ ν m M_w with M_w = 0.018015268 kg/mol (the osmotic coefficient's
//! definition).

use serde::Deserialize;

use super::debye_huckel::a_phi;
use crate::science::error::ScienceError;

/// Molar mass of water, kg/mol (IAPWS-95's value, 18.015268 g/mol).
pub const WATER_KG_PER_MOL: f64 = 0.018_015_268;

/// Pitzer's b, kg^½ mol^−½ (Pitzer & Mayorga 1973).
pub const B: f64 = 1.2;

/// How a parameter depends on temperature.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(tag = "form", content = "coefficients", rename_all = "kebab-case")]
pub enum TemperatureForm {
    /// One value at every temperature of the set's range (a set at one temperature).
    Constant(f64),
    /// Møller (1988) eq. 13, also Greenberg & Møller (1989) eq. 3:
    /// a1 + a2·T + a3/T + a4·ln T + a5/(T − 263) + a6·T² + a7/(680 − T) + a8/(T − 227).
    #[serde(rename = "moller-1988")]
    Moller88([f64; 8]),
    /// Spencer, Møller & Weare (1990) eq. 2: a1 + a2·T + a6·T² + a9·T³ + a3/T + a4·ln T,
    /// coefficients in the order [a1, a2, a6, a9, a3, a4].
    #[serde(rename = "spencer-1990")]
    Spencer90([f64; 6]),
}

impl TemperatureForm {
    /// The parameter at `t_k`.
    pub fn at(&self, t_k: f64) -> f64 {
        match self {
            TemperatureForm::Constant(v) => *v,
            TemperatureForm::Moller88(a) => {
                a[0] + a[1] * t_k
                    + a[2] / t_k
                    + a[3] * t_k.ln()
                    + a[4] / (t_k - 263.0)
                    + a[5] * t_k * t_k
                    + a[6] / (680.0 - t_k)
                    + a[7] / (t_k - 227.0)
            }
            TemperatureForm::Spencer90(a) => {
                a[0] + a[1] * t_k
                    + a[2] * t_k * t_k
                    + a[3] * t_k * t_k * t_k
                    + a[4] / t_k
                    + a[5] * t_k.ln()
            }
        }
    }
}

/// A published Pitzer parameter set for one electrolyte, with where it holds.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ParameterSet {
    /// Stable key, e.g. `spencer-1990-mgcl2`.
    pub key: String,
    /// Formula of the electrolyte, as the solute's formula: `MgCl2`.
    pub electrolyte: String,
    /// Key of the publication in `sources.toml`.
    pub source: String,
    /// `compiled` (figures carried over from the paper) or `from-memory`.
    pub provenance: String,
    pub review: String,
    #[serde(default)]
    pub note: Option<String>,
    pub cation_charge: u32,
    pub anion_charge: u32,
    pub cation_count: u32,
    pub anion_count: u32,
    pub beta0: TemperatureForm,
    pub beta1: TemperatureForm,
    #[serde(default = "zero")]
    pub beta2: TemperatureForm,
    pub c_phi: TemperatureForm,
    pub alpha1: f64,
    #[serde(default)]
    pub alpha2: f64,
    /// Temperatures the set was fitted over, K.
    pub t_min_k: f64,
    pub t_max_k: f64,
    /// Highest molality the set was fitted to, mol/kg.
    pub molality_max: f64,
}

/// A set for tests: the electrolyte with ions of charges `zc`, `za` and counts `nc`, `na`,
/// constant β0, β1 and Cφ (`b`), no β2, α1 = 2, at 25 °C up to 6 mol/kg.
#[cfg(test)]
pub(crate) fn test_set(
    key: &str,
    formula: &str,
    zc: u32,
    za: u32,
    nc: u32,
    na: u32,
    b: [f64; 3],
) -> ParameterSet {
    let constant = TemperatureForm::Constant;
    ParameterSet {
        key: key.into(),
        electrolyte: formula.into(),
        source: "s".into(),
        provenance: "compiled".into(),
        review: "unreviewed".into(),
        note: None,
        cation_charge: zc,
        anion_charge: za,
        cation_count: nc,
        anion_count: na,
        beta0: constant(b[0]),
        beta1: constant(b[1]),
        beta2: constant(0.0),
        c_phi: constant(b[2]),
        alpha1: 2.0,
        alpha2: 0.0,
        t_min_k: 298.15,
        t_max_k: 298.15,
        molality_max: 6.0,
    }
}

fn zero() -> TemperatureForm {
    TemperatureForm::Constant(0.0)
}

impl ParameterSet {
    /// ν = ν_M + ν_X, the ions per formula unit.
    pub fn ions(&self) -> f64 {
        f64::from(self.cation_count + self.anion_count)
    }

    /// True when (T, m) lies inside the set's published range (0.01 K leeway at the ends,
    /// for sets given at one temperature) and that of A_φ.
    pub fn covers(&self, t_k: f64, molality: f64) -> bool {
        let (lo, hi) = super::debye_huckel::A_PHI_RANGE_K;
        t_k >= lo
            && t_k <= hi
            && t_k >= self.t_min_k - 0.01
            && t_k <= self.t_max_k + 0.01
            && molality >= 0.0
            && molality <= self.molality_max
    }

    /// The refusal for (T, m) outside the set's range.
    fn check(&self, t_k: f64, molality: f64) -> Result<(), ScienceError> {
        if !(t_k.is_finite() && t_k > 0.0) {
            return Err(ScienceError::NotPositive {
                what: "temperature (K)",
                value: t_k,
            });
        }
        if !(molality.is_finite() && molality >= 0.0) {
            return Err(ScienceError::InvalidComposition {
                value: molality,
                unit: "mol/kg",
                why: "a molality must be zero or positive",
            });
        }
        if self.covers(t_k, molality) {
            Ok(())
        } else {
            Err(ScienceError::OutsideModel(format!(
                "the Pitzer set {} holds for {:.2} K to {:.2} K and up to {} mol/kg; asked {:.2} K at {:.3} mol/kg",
                self.key, self.t_min_k, self.t_max_k, self.molality_max, t_k, molality
            )))
        }
    }
}

/// The osmotic coefficient φ of the electrolyte at molality `molality` (mol/kg) and `t_k`
/// (Pitzer & Mayorga 1973, see the module's doc; A_φ from [`a_phi`], Clegg, Rard & Pitzer 1994). Refused outside the
/// set's temperature and molality range.
pub fn osmotic_coefficient(
    set: &ParameterSet,
    molality: f64,
    t_k: f64,
) -> Result<f64, ScienceError> {
    set.check(t_k, molality)?;
    Ok(phi_unchecked(set, molality, t_k))
}

/// φ with no range check (for root finding inside a checked bracket).
pub(crate) fn phi_unchecked(set: &ParameterSet, m: f64, t_k: f64) -> f64 {
    let (zm, zx) = (f64::from(set.cation_charge), f64::from(set.anion_charge));
    let (nm, nx) = (f64::from(set.cation_count), f64::from(set.anion_count));
    let nu = nm + nx;
    let ionic = 0.5 * m * (nm * zm * zm + nx * zx * zx);
    let root = ionic.sqrt();
    let b_phi = set.beta0.at(t_k)
        + set.beta1.at(t_k) * (-set.alpha1 * root).exp()
        + set.beta2.at(t_k) * (-set.alpha2 * root).exp();
    1.0 - zm * zx * a_phi(t_k) * root / (1.0 + B * root)
        + m * (2.0 * nm * nx / nu) * b_phi
        + m * m * (2.0 * (nm * nx).powf(1.5) / nu) * set.c_phi.at(t_k)
}

/// The water activity: ln a_w = −φ ν m M_w (see [`osmotic_coefficient`]).
pub fn water_activity(set: &ParameterSet, molality: f64, t_k: f64) -> Result<f64, ScienceError> {
    let phi = osmotic_coefficient(set, molality, t_k)?;
    Ok((-phi * set.ions() * molality * WATER_KG_PER_MOL).exp())
}

/// ln a_w with no range check.
pub(crate) fn ln_water_activity_unchecked(set: &ParameterSet, m: f64, t_k: f64) -> f64 {
    -phi_unchecked(set, m, t_k) * set.ions() * m * WATER_KG_PER_MOL
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Pitzer & Mayorga (1973) Table I, NaCl at 25 °C: β0 0.0765, β1 0.2664, Cφ 0.00127.
    fn nacl_25() -> ParameterSet {
        ParameterSet {
            source: "pitzer-mayorga-1973".into(),
            ..test_set("pm73-nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2664, 0.00127])
        }
    }

    #[test]
    fn nacl_one_molal_at_25_c() {
        // Robinson & Stokes (Electrolyte Solutions, 2nd ed., appendix 8.10) print
        // φ = 0.936 for 1 mol/kg NaCl at 25 °C.
        let phi = osmotic_coefficient(&nacl_25(), 1.0, 298.15).unwrap();
        assert!((phi - 0.936).abs() < 0.002, "{phi}");
        let aw = water_activity(&nacl_25(), 1.0, 298.15).unwrap();
        assert!((aw - (-phi * 2.0 * WATER_KG_PER_MOL).exp()).abs() < 1e-12);
    }

    #[test]
    fn outside_the_set_is_refused() {
        assert!(matches!(
            osmotic_coefficient(&nacl_25(), 1.0, 273.15),
            Err(ScienceError::OutsideModel(_))
        ));
        assert!(osmotic_coefficient(&nacl_25(), 7.0, 298.15).is_err());
        assert!(osmotic_coefficient(&nacl_25(), -1.0, 298.15).is_err());
    }

    #[test]
    fn limiting_law_at_infinite_dilution() {
        let phi = osmotic_coefficient(&nacl_25(), 1e-8, 298.15).unwrap();
        assert!((phi - 1.0).abs() < 1e-4);
    }
}
