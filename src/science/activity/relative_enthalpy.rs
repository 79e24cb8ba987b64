//! The relative apparent molar enthalpy L_φ of a single electrolyte, from the temperature
//! dependence of its Pitzer parameters: how much the heat of solution at molality m differs
//! from the heat at infinite dilution (the integral heat of solution is ΔH°sol + L_φ(m)).
//!
//! Pitzer's excess Gibbs energy per kilogram of water, f(I) + Σ_c Σ_a m_c·m_a·(2B + Z·C)
//! with Z = Σ m_i|z_i| (C. E. Harvie, N. Møller & J. H. Weare, Geochim. Cosmochim. Acta 48
//! (1984) 723, eq. A1; K. S. Pitzer, J. Phys. Chem. 77 (1973) 268), for a single
//! electrolyte MνX ν:
//!
//! G_ex/(w_w·R·T) = −A_φ·(4I/b)·ln(1 + b√I) + 2ν_Mν_X·m²·B + 2ν_M²ν_X·z_M·m³·C,
//! B = β0 + β1·g(α1√I) + β2·g(α2√I), g(x) = 2(1 − (1 + x)e^−x)/x², C = Cφ/(2√(z_M z_X)),
//!
//! and L_φ = −R·T²·∂(G_ex/(w_w·R·T))/∂T / m (Gibbs–Helmholtz), the derivative taken
//! numerically from the parameters' published temperature functions and A_φ(T).

use super::debye_huckel::a_phi;
use super::pitzer::{B, ParameterSet, TemperatureForm};
use crate::science::error::ScienceError;

/// The molar gas constant, J/(mol·K) (CODATA 2018, exact).
const R: f64 = 8.314_462_618;

fn g(x: f64) -> f64 {
    2.0 * (1.0 - (1.0 + x) * (-x).exp()) / (x * x)
}

/// G_ex/(w_w·R·T) per kilogram of water (see the module's doc).
fn gibbs_excess(set: &ParameterSet, m: f64, t_k: f64) -> f64 {
    let (zm, zx) = (f64::from(set.cation_charge), f64::from(set.anion_charge));
    let (nm, nx) = (f64::from(set.cation_count), f64::from(set.anion_count));
    let ionic = 0.5 * m * (nm * zm * zm + nx * zx * zx);
    let root = ionic.sqrt();
    let mut b = set.beta0.at(t_k) + set.beta1.at(t_k) * g(set.alpha1 * root);
    if set.alpha2 > 0.0 {
        b += set.beta2.at(t_k) * g(set.alpha2 * root);
    }
    let c = set.c_phi.at(t_k) / (2.0 * (zm * zx).sqrt());
    -a_phi(t_k) * 4.0 * ionic / B * (1.0 + B * root).ln()
        + 2.0 * nm * nx * m * m * b
        + 2.0 * nm * nm * nx * zm * m * m * m * c
}

/// True when the set says how its parameters change with temperature (a set fitted at one
/// temperature gives no enthalpy).
pub fn has_temperature_dependence(set: &ParameterSet) -> bool {
    [&set.beta0, &set.beta1, &set.c_phi]
        .iter()
        .any(|f| !matches!(f, TemperatureForm::Constant(_)))
}

/// L_φ, J/mol of electrolyte, at `molality` (mol/kg) and `t_k`. Refused outside the set's
/// published range, and for a set with no temperature dependence.
pub fn apparent_relative_enthalpy(
    set: &ParameterSet,
    molality: f64,
    t_k: f64,
) -> Result<f64, ScienceError> {
    if !has_temperature_dependence(set) {
        return Err(ScienceError::OutsideModel(format!(
            "the Pitzer set {} was fitted at one temperature and gives no enthalpy",
            set.key
        )));
    }
    if !(molality > 0.0 && set.covers(t_k, molality)) {
        return Err(ScienceError::OutsideModel(format!(
            "the Pitzer set {} holds for {:.2} K to {:.2} K and up to {} mol/kg; asked {:.2} K at {:.3} mol/kg",
            set.key, set.t_min_k, set.t_max_k, set.molality_max, t_k, molality
        )));
    }
    const H: f64 = 0.01;
    let slope =
        (gibbs_excess(set, molality, t_k + H) - gibbs_excess(set, molality, t_k - H)) / (2.0 * H);
    Ok(-R * t_k * t_k * slope / molality)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::activity::pitzer::test_set;

    #[test]
    fn the_dilute_limit_is_debye_huckel() {
        // With every β and Cφ constant but one a function of T that is flat, L_φ of a 1:1
        // salt tends to A_H·ln(1 + b√m)/b, A_H = 4RT²·dA_φ/dT.
        let flat = TemperatureForm::Spencer90([0.0; 6]);
        let set = ParameterSet {
            beta0: flat.clone(),
            beta1: flat.clone(),
            c_phi: flat,
            t_min_k: 273.15,
            t_max_k: 323.15,
            ..test_set("flat", "NaCl", 1, 1, 1, 1, [0.0; 3])
        };
        let t = 298.15;
        let da = (a_phi(t + 0.01) - a_phi(t - 0.01)) / 0.02;
        let a_h = 4.0 * R * t * t * da;
        for m in [0.001_f64, 0.1, 1.0] {
            let want = a_h * (1.0 + B * m.sqrt()).ln() / B;
            let got = apparent_relative_enthalpy(&set, m, t).unwrap();
            assert!(
                (got - want).abs() < 1e-6 * want.abs().max(1.0),
                "{m}: {got} vs {want}"
            );
        }
        // A set at one temperature gives none.
        let one = ParameterSet {
            beta0: TemperatureForm::Constant(0.0765),
            beta1: TemperatureForm::Constant(0.2664),
            c_phi: TemperatureForm::Constant(0.00127),
            ..set
        };
        assert!(apparent_relative_enthalpy(&one, 1.0, t).is_err());
    }
}
