//! Acid–base equilibria of buffers: ionization constants against temperature, activity
//! coefficients by the Davies equation, the species of each acid at a pH, and the pH that
//! balances the charges of a solution.
//!
//! - pK(T) from the van 't Hoff relation with a constant heat-capacity change:
//!   ln K(T) = ln K(T₀) − (ΔrH°/R)(1/T − 1/T₀) + (ΔrCp°/R)(T₀/T − 1 + ln(T/T₀)), T₀ = 298.15 K
//!   (R. N. Goldberg, N. Kishore & R. M. Lennen, J. Phys. Chem. Ref. Data 31 (2002) 231,
//!   eq. 3, the form their evaluated constants are given for).
//! - Davies: log₁₀ γ = −A z² (√I/(1 + √I) − 0.3 I), A = 3A_φ/ln 10 (C. W. Davies, Ion
//!   Association, Butterworths 1962), A_φ(T) from [`a_phi`]. Meant for I up to about 0.5
//!   mol/kg; beyond, the coefficients are taken at 0.5 and the answer says so.
//! - Species: consecutive steps m_{j+1}/m_j = K_{j+1} γ_j / (a_H γ_{j+1}); pH = −log₁₀ a_H.
//! - Charge balance: S + m_H − m_OH + Σ_acids C Σ_j z_j α_j = 0, where S is the charge of
//!   the fully dissociated ions (Na⁺, K⁺, Cl⁻ …) per kg of water; water's ionization from
//!   its own record (a_w taken as 1).

use serde::Deserialize;

use super::activity::debye_huckel::{A_PHI_RANGE_K, a_phi};
use super::error::ScienceError;
use crate::science::bisect::{Until, bisect};

/// The reference temperature of the constants, K.
pub const T0_K: f64 = 298.15;

/// Molar gas constant, J mol⁻¹ K⁻¹ (CODATA 2018, exact).
const R: f64 = 8.314_462_618;

/// The ionic strength up to which the Davies equation is used, mol/kg.
pub const DAVIES_MAX_I: f64 = 0.5;

/// One ionization step: the constant at 25 °C and I = 0, with its enthalpy and
/// heat-capacity changes.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Step {
    /// pK = −log₁₀ K at 298.15 K, I = 0.
    pub pk: f64,
    /// ΔrH°, kJ/mol.
    pub dh_kj_per_mol: f64,
    /// ΔrCp°, J/(mol K).
    pub dcp_j_per_mol_k: f64,
}

impl Step {
    /// pK at `t_k` by the van 't Hoff relation with constant ΔrCp° (module comment).
    pub fn pk_at(&self, t_k: f64) -> f64 {
        let dh = self.dh_kj_per_mol * 1e3;
        let ln_k0 = -self.pk * std::f64::consts::LN_10;
        let ln_k = ln_k0 - dh / R * (1.0 / t_k - 1.0 / T0_K)
            + self.dcp_j_per_mol_k / R * (T0_K / t_k - 1.0 + (t_k / T0_K).ln());
        -ln_k / std::f64::consts::LN_10
    }
}

/// A catalog solute that is one form of a buffer: `disodium hydrogen phosphate` is
/// phosphate with a strong-ion charge of +2 (two Na⁺) per formula unit.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Rung {
    /// The solute's id in the reference.
    pub solute: String,
    /// Charge of its fully dissociated ions per formula unit: +2 for Na₂HPO₄, −1 for Tris·HCl
    /// (its Cl⁻), 0 for the free acid or base.
    pub charge: i32,
    /// Acid units per formula unit: 4 for borax (Na₂B₄O₇ gives four borate units).
    #[serde(default = "one")]
    pub units: f64,
}

fn one() -> f64 {
    1.0
}

impl Rung {
    /// Strong-ion charge per acid unit.
    pub fn charge_per_unit(&self) -> f64 {
        f64::from(self.charge) / self.units
    }
}

/// A buffer as a recipe names it (`sodium phosphate`), made of the catalog solutes of its
/// rungs, least strong charge per acid unit first.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BufferForm {
    pub names: Vec<String>,
    pub rungs: Vec<Rung>,
}

/// An acid (or base) with its species, most protonated first, and its ionization steps.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AcidSystem {
    pub key: String,
    pub name: String,
    /// Species from the most protonated: `["H3PO4", "H2PO4-", "HPO4-2", "PO4-3"]`.
    pub species: Vec<String>,
    /// Their charges, in the same order.
    pub charges: Vec<i32>,
    /// One step between each pair of neighbouring species.
    pub step: Vec<Step>,
    pub source: String,
    /// Where in the source (table, entry).
    pub locator: String,
    pub provenance: String,
    #[serde(default)]
    pub review: String,
    /// Temperatures the constants are evaluated for, K.
    pub t_min_k: f64,
    pub t_max_k: f64,
    #[serde(default)]
    pub buffer: Vec<BufferForm>,
    #[serde(default)]
    pub note: String,
}

impl AcidSystem {
    /// Whether the record is whole: a step between each pair of species, a charge for
    /// each, charges falling by one a step, finite constants. `Err` says what is wrong.
    pub fn check(&self) -> Result<(), String> {
        if self.species.len() < 2 || self.charges.len() != self.species.len() {
            return Err("needs two species or more, with a charge for each".into());
        }
        if self.step.len() + 1 != self.species.len() {
            return Err(format!(
                "{} species need {} steps, found {}",
                self.species.len(),
                self.species.len() - 1,
                self.step.len()
            ));
        }
        if self.charges.windows(2).any(|w| w[1] != w[0] - 1) {
            return Err("each species' charge must be one less than the one before".into());
        }
        let finite = self.step.iter().all(|s| {
            s.pk.is_finite() && s.dh_kj_per_mol.is_finite() && s.dcp_j_per_mol_k.is_finite()
        });
        if !finite {
            return Err(
                "every pk, dh_kj_per_mol and dcp_j_per_mol_k must be a finite number".into(),
            );
        }
        for form in &self.buffer {
            if form.names.is_empty() || form.rungs.is_empty() {
                return Err("a buffer needs names and rungs".into());
            }
            let ascending = form
                .rungs
                .windows(2)
                .all(|w| w[0].charge_per_unit() < w[1].charge_per_unit());
            if !ascending
                || form
                    .rungs
                    .iter()
                    .any(|r| r.units.is_nan() || r.units <= 0.0)
            {
                return Err(format!(
                    "buffer {}: rungs must have positive units and rise in charge per unit",
                    form.names[0]
                ));
            }
        }
        Ok(())
    }

    /// The system's buffer named `name` (any case), if any.
    pub fn buffer_named(&self, name: &str) -> Option<&BufferForm> {
        self.buffer
            .iter()
            .find(|b| b.names.iter().any(|n| n.eq_ignore_ascii_case(name)))
    }
}

/// log₁₀ γ of an ion of charge `z` by the Davies equation at ionic strength `ionic` (taken
/// at most [`DAVIES_MAX_I`]) and `t_k` (A_φ held at its fit's ends outside them).
pub fn davies_log10_gamma(z: i32, ionic: f64, t_k: f64) -> f64 {
    if z == 0 {
        return 0.0;
    }
    let i = ionic.clamp(0.0, DAVIES_MAX_I);
    let t = t_k.clamp(A_PHI_RANGE_K.0, A_PHI_RANGE_K.1);
    let a = 3.0 * a_phi(t) / std::f64::consts::LN_10;
    let s = i.sqrt();
    -a * f64::from(z * z) * (s / (1.0 + s) - 0.3 * i)
}

/// The fraction of each species of `acid` at activity of hydrogen ion 10^−`ph`, `t_k` and
/// ionic strength `ionic`, most protonated first; they sum to 1.
pub fn fractions(acid: &AcidSystem, ph: f64, t_k: f64, ionic: f64) -> Vec<f64> {
    let lg: Vec<f64> = acid
        .charges
        .iter()
        .map(|&z| davies_log10_gamma(z, ionic, t_k))
        .collect();
    let mut logs = Vec::with_capacity(acid.species.len());
    let mut r = 0.0;
    logs.push(r);
    for (j, step) in acid.step.iter().enumerate() {
        r += -step.pk_at(t_k) + lg[j] - lg[j + 1] + ph;
        logs.push(r);
    }
    let top = logs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let weights: Vec<f64> = logs.iter().map(|l| 10f64.powf(l - top)).collect();
    let sum: f64 = weights.iter().sum();
    weights.iter().map(|w| w / sum).collect()
}

/// An acid in a solution: its record and its total, mol/kg of water.
#[derive(Debug, Clone, Copy)]
pub struct Present<'a> {
    pub acid: &'a AcidSystem,
    pub total: f64,
}

/// What decides a solution's pH: its acids, the charge of its fully dissociated ions and
/// their share of the ionic strength (both per kg of water), and water's own record.
#[derive(Debug, Clone)]
pub struct Solution<'a> {
    pub acids: Vec<Present<'a>>,
    /// Σ z m of the fully dissociated ions, mol/kg.
    pub strong_charge: f64,
    /// ½ Σ z² m of the fully dissociated ions, mol/kg.
    pub strong_ionic: f64,
    /// Water's ionization (species H2O, OH-; one step, pKw).
    pub water: &'a AcidSystem,
}

/// A solution's pH and the species it holds.
#[derive(Debug, Clone, PartialEq)]
pub struct Speciation {
    pub ph: f64,
    /// mol/kg, all ions counted.
    pub ionic_strength: f64,
    /// Each acid's species fractions, in the order of [`Solution::acids`].
    pub fractions: Vec<Vec<f64>>,
    /// True when the ionic strength is above [`DAVIES_MAX_I`] (coefficients taken there).
    pub beyond_davies: bool,
}

/// m_H⁺ and m_OH⁻ at `ph`.
fn water_ions(water: &AcidSystem, ph: f64, t_k: f64, ionic: f64) -> (f64, f64) {
    let lg1 = davies_log10_gamma(1, ionic, t_k);
    let pkw = water.step.first().map_or(14.0, |s| s.pk_at(t_k));
    let m_h = 10f64.powf(-ph - lg1);
    let m_oh = 10f64.powf(ph - pkw - lg1);
    (m_h, m_oh)
}

/// The acids' charge per kg of water and their share of the ionic strength, at `ph`.
fn acid_charge(acids: &[Present], ph: f64, t_k: f64, ionic: f64) -> (f64, f64, Vec<Vec<f64>>) {
    let (mut charge, mut half_z2) = (0.0, 0.0);
    let mut all = Vec::with_capacity(acids.len());
    for p in acids {
        let f = fractions(p.acid, ph, t_k, ionic);
        for (&z, a) in p.acid.charges.iter().zip(&f) {
            charge += p.total * f64::from(z) * a;
            half_z2 += 0.5 * p.total * f64::from(z * z) * a;
        }
        all.push(f);
    }
    (charge, half_z2, all)
}

/// Bisection for the pH where `g` (falling with pH) changes sign, on [−2, 16].
fn falling_root(g: impl Fn(f64) -> f64) -> Option<f64> {
    let (lo, hi) = (-2.0_f64, 16.0_f64);
    let (g_lo, g_hi) = (g(lo), g(hi));
    if !(g_lo >= 0.0 && g_hi <= 0.0) {
        return None;
    }
    Some(bisect(lo, hi, Until::Width(1e-10), |ph| g(ph) > 0.0).mid())
}

fn check_temperature(t_k: f64) -> Result<(), ScienceError> {
    if !(t_k.is_finite() && t_k > 0.0) {
        return Err(ScienceError::NotPositive {
            what: "temperature",
            value: t_k,
        });
    }
    Ok(())
}

/// The pH that balances the charges of `solution` at `t_k`, with the ionic strength found
/// together with it (fixed-point iteration; the species set the ionic strength, which sets
/// their activity coefficients).
pub fn solve(solution: &Solution, t_k: f64) -> Result<Speciation, ScienceError> {
    check_temperature(t_k)?;
    let mut ionic = solution.strong_ionic.max(0.0);
    let mut ph = 7.0;
    for _ in 0..200 {
        let g = |ph: f64| {
            let (m_h, m_oh) = water_ions(solution.water, ph, t_k, ionic);
            let (charge, _, _) = acid_charge(&solution.acids, ph, t_k, ionic);
            solution.strong_charge + m_h - m_oh + charge
        };
        ph = falling_root(g).ok_or_else(|| {
            ScienceError::OutsideModel(
                "no pH between -2 and 16 balances the charges of this solution".into(),
            )
        })?;
        let (m_h, m_oh) = water_ions(solution.water, ph, t_k, ionic);
        let (_, acid_half_z2, _) = acid_charge(&solution.acids, ph, t_k, ionic);
        let next = solution.strong_ionic + 0.5 * (m_h + m_oh) + acid_half_z2;
        let done = (next - ionic).abs() <= 1e-12 * next.max(1e-6);
        ionic = next;
        if done {
            break;
        }
    }
    let (_, _, fractions) = acid_charge(&solution.acids, ph, t_k, ionic);
    Ok(Speciation {
        ph,
        ionic_strength: ionic,
        fractions,
        beyond_davies: ionic > DAVIES_MAX_I,
    })
}

/// The charge of fully dissociated counter-ions (mol/kg of water), beyond the solution's own
/// `strong_charge`, that brings `solution` to `ph` at `t_k`: how much base (or acid) a
/// buffer was titrated with. The counter-ions are taken as singly charged, adding ½|S| to
/// the ionic strength. Returns that charge and the speciation there.
pub fn charge_for_ph(
    solution: &Solution,
    ph: f64,
    t_k: f64,
) -> Result<(f64, Speciation), ScienceError> {
    check_temperature(t_k)?;
    if !(ph.is_finite() && (-2.0..=16.0).contains(&ph)) {
        return Err(ScienceError::OutsideModel(format!(
            "pH {ph} is outside -2 to 16"
        )));
    }
    let mut ionic = solution.strong_ionic.max(0.0);
    let mut strong = 0.0;
    for _ in 0..200 {
        let (m_h, m_oh) = water_ions(solution.water, ph, t_k, ionic);
        let (charge, acid_half_z2, _) = acid_charge(&solution.acids, ph, t_k, ionic);
        strong = -(solution.strong_charge + m_h - m_oh + charge);
        let next = solution.strong_ionic + 0.5 * strong.abs() + 0.5 * (m_h + m_oh) + acid_half_z2;
        let done = (next - ionic).abs() <= 1e-12 * next.max(1e-6);
        ionic = next;
        if done {
            break;
        }
    }
    let (_, _, fractions) = acid_charge(&solution.acids, ph, t_k, ionic);
    Ok((
        strong,
        Speciation {
            ph,
            ionic_strength: ionic,
            fractions,
            beyond_davies: ionic > DAVIES_MAX_I,
        },
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn phosphate() -> AcidSystem {
        AcidSystem {
            key: "p".into(),
            name: "phosphoric acid".into(),
            species: ["H3PO4", "H2PO4-", "HPO4-2", "PO4-3"]
                .map(String::from)
                .to_vec(),
            charges: vec![0, -1, -2, -3],
            step: vec![
                Step {
                    pk: 2.148,
                    dh_kj_per_mol: -8.0,
                    dcp_j_per_mol_k: -141.0,
                },
                Step {
                    pk: 7.198,
                    dh_kj_per_mol: 3.6,
                    dcp_j_per_mol_k: -230.0,
                },
                Step {
                    pk: 12.35,
                    dh_kj_per_mol: 16.0,
                    dcp_j_per_mol_k: -242.0,
                },
            ],
            source: "s".into(),
            locator: String::new(),
            provenance: "from-memory".into(),
            review: String::new(),
            t_min_k: 273.15,
            t_max_k: 323.15,
            buffer: Vec::new(),
            note: String::new(),
        }
    }

    fn water() -> AcidSystem {
        AcidSystem {
            key: "w".into(),
            name: "water".into(),
            species: ["H2O", "OH-"].map(String::from).to_vec(),
            charges: vec![0, -1],
            step: vec![Step {
                pk: 13.995,
                dh_kj_per_mol: 55.81,
                dcp_j_per_mol_k: -224.0,
            }],
            ..phosphate()
        }
    }

    #[test]
    fn pk_at_the_reference_temperature_is_the_constant_and_falls_with_a_positive_enthalpy() {
        let s = Step {
            pk: 8.072,
            dh_kj_per_mol: 47.45,
            dcp_j_per_mol_k: -59.0,
        };
        assert!((s.pk_at(T0_K) - 8.072).abs() < 1e-12);
        // d pK / dT = −ΔH/(R ln10 T²) at T₀: −0.0279 per K for ΔH = 47.45 kJ/mol.
        let slope = (s.pk_at(T0_K + 0.01) - s.pk_at(T0_K - 0.01)) / 0.02;
        assert!((slope + 47450.0 / (R * std::f64::consts::LN_10 * T0_K * T0_K)).abs() < 1e-6);
    }

    #[test]
    fn davies_at_25_c() {
        // A ≈ 0.510 at 25 °C: log γ(z=1, I=0.1) = −0.510 (0.2403 − 0.03) ≈ −0.107.
        let lg = davies_log10_gamma(1, 0.1, T0_K);
        assert!((lg + 0.1073).abs() < 0.002, "{lg}");
        assert_eq!(davies_log10_gamma(0, 0.3, T0_K), 0.0);
        assert_eq!(
            davies_log10_gamma(2, 0.9, T0_K),
            davies_log10_gamma(2, 0.5, T0_K)
        );
    }

    #[test]
    fn fractions_sum_to_one_and_meet_at_the_pk_when_ideal() {
        let p = phosphate();
        let f = fractions(&p, 7.198, T0_K, 0.0);
        assert!((f.iter().sum::<f64>() - 1.0).abs() < 1e-12);
        assert!((f[1] - f[2]).abs() < 1e-3, "{f:?}");
    }

    #[test]
    fn a_titrated_buffer_comes_back_to_its_ph() {
        let (p, w) = (phosphate(), water());
        let base = Solution {
            acids: vec![Present {
                acid: &p,
                total: 0.05,
            }],
            strong_charge: 0.0,
            strong_ionic: 0.0,
            water: &w,
        };
        let (strong, set) = charge_for_ph(&base, 7.4, T0_K).unwrap();
        // Between one and two Na⁺ per phosphate.
        assert!(strong > 0.05 && strong < 0.1, "{strong}");
        let again = solve(
            &Solution {
                strong_charge: strong,
                strong_ionic: 0.5 * strong,
                ..base.clone()
            },
            T0_K,
        )
        .unwrap();
        assert!((again.ph - 7.4).abs() < 1e-9, "{}", again.ph);
        assert!((again.ionic_strength - set.ionic_strength).abs() < 1e-9);
    }

    #[test]
    fn pure_water_is_neutral() {
        let w = water();
        let s = solve(
            &Solution {
                acids: vec![],
                strong_charge: 0.0,
                strong_ionic: 0.0,
                water: &w,
            },
            T0_K,
        )
        .unwrap();
        assert!((s.ph - 6.9975).abs() < 0.001, "{}", s.ph);
    }
}
