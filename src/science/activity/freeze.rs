//! Freeze concentration of a mixture at one temperature: how much ice and which salts have
//! come out when the liquid is in equilibrium with them.
//!
//! One kg of water holds `total` mol of every ion. Ice takes water out of the liquid, and a
//! solid M_νM X_νX · n H2O takes ions and n waters; the liquid is what is left. At
//! equilibrium every phase present satisfies its condition and every phase absent is
//! undersaturated:
//!
//! - ice: ln a_w(liquid) = ln a_w of water over ice at T ([`super::ice`]); ice forms when
//!   the liquid's ln a_w is above it;
//! - a salt: ln Ω = ln IAP(liquid) − ln K = 0; it forms when ln Ω > 0.
//!
//! The amounts of the phases present are solved by Newton's method on those conditions
//! (Jacobian by finite differences, steps halved to keep every amount in the liquid
//! positive); phases are added while one is supersaturated and dropped when its amount
//! turns negative (an active-set loop). When no liquid is left the mixture is below its
//! eutectic and the solve is refused with that reason.

use super::mixture::Coefficients;
use super::pitzer::WATER_KG_PER_MOL;
use super::saturation::Solid;
use crate::science::error::ScienceError;

/// A solid that may crystallise, with its ln K at the temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Candidate {
    pub solid: Solid,
    pub ln_k: f64,
}

/// The phases at equilibrium, per kg of the mixture's water at the start.
#[derive(Debug, Clone, PartialEq)]
pub struct Frozen {
    /// Ice, kg.
    pub ice_kg: f64,
    /// Moles of each candidate crystallised (0 for those that did not form).
    pub crystallised: Vec<f64>,
    /// Water left in the liquid, kg.
    pub water_kg: f64,
    /// Molality of every ion in the liquid.
    pub liquid: Vec<f64>,
    /// ln a_w of the liquid.
    pub ln_water: f64,
}

/// Tolerance on every condition (ln units).
const TOL: f64 = 1e-10;

struct Setup<'a> {
    c: &'a Coefficients,
    total: &'a [f64],
    ln_water_ice: f64,
    candidates: &'a [Candidate],
}

impl Setup<'_> {
    /// The liquid for amounts `x` = (ice kg, then moles of each active candidate): water
    /// (kg) and ion molalities; `None` when an amount would leave no water or a negative
    /// ion.
    fn liquid(&self, active: &[usize], ice: bool, x: &[f64]) -> Option<(f64, Vec<f64>)> {
        let mut water = 1.0;
        let mut moles = self.total.to_vec();
        let (ice_kg, salts) = if ice { (x[0], &x[1..]) } else { (0.0, x) };
        water -= ice_kg;
        for (&k, &p) in active.iter().zip(salts) {
            let s = self.candidates[k].solid;
            water -= p * s.waters * WATER_KG_PER_MOL;
            s.add(&mut moles, -p);
        }
        if water <= 1e-9 || moles.iter().any(|m| *m < -1e-12) {
            return None;
        }
        let liquid = moles.iter().map(|m| m.max(0.0) / water).collect();
        Some((water, liquid))
    }

    fn residuals(&self, active: &[usize], ice: bool, x: &[f64]) -> Option<Vec<f64>> {
        let (_, m) = self.liquid(active, ice, x)?;
        let a = self.c.activity_unchecked(&m);
        let mut r = Vec::with_capacity(x.len());
        if ice {
            r.push(a.ln_water - self.ln_water_ice);
        }
        for &k in active {
            let cand = self.candidates[k];
            r.push(cand.solid.ln_ion_activity_product(&m, &a) - cand.ln_k);
        }
        Some(r)
    }

    /// Newton's method on the active phases from `x`.
    fn solve(&self, active: &[usize], ice: bool, mut x: Vec<f64>) -> Result<Vec<f64>, String> {
        let n = x.len();
        if n == 0 {
            return Ok(x);
        }
        let no_liquid = || "no liquid is left: the mixture is below its eutectic".to_string();
        let mut r = self.residuals(active, ice, &x).ok_or_else(no_liquid)?;
        for _ in 0..200 {
            let norm = r.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
            if norm < TOL {
                return Ok(x);
            }
            // Jacobian by forward differences.
            let mut jac = vec![0.0; n * n];
            for j in 0..n {
                let h = 1e-7 * x[j].abs().max(1e-4);
                let mut xh = x.clone();
                xh[j] += h;
                // Forward where the step keeps a liquid, else backward.
                let (rh, sign) = match self.residuals(active, ice, &xh) {
                    Some(rh) => (rh, 1.0),
                    None => {
                        xh[j] = x[j] - h;
                        (
                            self.residuals(active, ice, &xh).ok_or_else(no_liquid)?,
                            -1.0,
                        )
                    }
                };
                for i in 0..n {
                    jac[i * n + j] = sign * (rh[i] - r[i]) / h;
                }
            }
            let step = gauss(&jac, &r, n).ok_or("the equilibrium conditions are singular")?;
            let mut lambda = 1.0;
            loop {
                let trial: Vec<f64> = x.iter().zip(&step).map(|(v, d)| v - lambda * d).collect();
                if let Some(rt) = self.residuals(active, ice, &trial) {
                    let nt = rt.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
                    if nt < norm || lambda < 1e-6 {
                        x = trial;
                        r = rt;
                        break;
                    }
                }
                lambda *= 0.5;
                if lambda < 1e-12 {
                    return Err(no_liquid());
                }
            }
        }
        Err("the freeze-concentration solve did not converge".into())
    }
}

/// Solves `a x = b` (n × n, row-major) by Gaussian elimination with partial pivoting.
fn gauss(a: &[f64], b: &[f64], n: usize) -> Option<Vec<f64>> {
    let mut m = a.to_vec();
    let mut v = b.to_vec();
    for col in 0..n {
        let pivot =
            (col..n).max_by(|&i, &j| m[i * n + col].abs().total_cmp(&m[j * n + col].abs()))?;
        if m[pivot * n + col].abs() < 1e-300 {
            return None;
        }
        for k in 0..n {
            m.swap(col * n + k, pivot * n + k);
        }
        v.swap(col, pivot);
        for row in col + 1..n {
            let f = m[row * n + col] / m[col * n + col];
            for k in col..n {
                m[row * n + k] -= f * m[col * n + k];
            }
            v[row] -= f * v[col];
        }
    }
    let mut x = vec![0.0; n];
    for row in (0..n).rev() {
        let s: f64 = (row + 1..n).map(|k| m[row * n + k] * x[k]).sum();
        x[row] = (v[row] - s) / m[row * n + row];
    }
    x.iter().all(|x| x.is_finite()).then_some(x)
}

/// The equilibrium of a mixture of `total` mol of each ion per kg of water with ice (whose
/// water activity at the temperature is `ln_water_ice`) and the `candidates`, at the
/// temperature of `c`. Refused when no liquid is left (below the eutectic), when the solve
/// fails, or when the liquid's ionic strength is beyond the system's.
pub fn freeze(
    c: &Coefficients,
    total: &[f64],
    ln_water_ice: f64,
    candidates: &[Candidate],
) -> Result<Frozen, ScienceError> {
    let setup = Setup {
        c,
        total,
        ln_water_ice,
        candidates,
    };
    let outside = ScienceError::OutsideModel;
    let mut ice = false;
    let mut active: Vec<usize> = Vec::new();
    let mut x: Vec<f64> = Vec::new();
    for _ in 0..2 * (candidates.len() + 2) {
        x = setup.solve(&active, ice, x).map_err(outside)?;
        // Drop a phase whose amount went negative.
        let offset = usize::from(ice);
        if ice && x[0] < 0.0 {
            ice = false;
            x.remove(0);
            continue;
        }
        if let Some(pos) = (0..active.len()).find(|&i| x[offset + i] < 0.0) {
            active.remove(pos);
            x.remove(offset + pos);
            continue;
        }
        // Add the most supersaturated phase absent.
        let (_, m) = setup
            .liquid(&active, ice, &x)
            .ok_or_else(|| outside("no liquid is left".into()))?;
        let a = c.activity_unchecked(&m);
        let mut best: Option<(f64, Option<usize>)> = None;
        if !ice && a.ln_water - ln_water_ice > TOL {
            best = Some((a.ln_water - ln_water_ice, None));
        }
        for (k, cand) in candidates.iter().enumerate() {
            if active.contains(&k) {
                continue;
            }
            let omega = cand.solid.ln_ion_activity_product(&m, &a) - cand.ln_k;
            if omega > TOL && best.is_none_or(|(b, _)| omega > b) {
                best = Some((omega, Some(k)));
            }
        }
        match best {
            None => {
                let (water_kg, liquid) = setup
                    .liquid(&active, ice, &x)
                    .ok_or_else(|| outside("no liquid is left".into()))?;
                let checked = c.activity(&liquid)?;
                let mut crystallised = vec![0.0; candidates.len()];
                for (i, &k) in active.iter().enumerate() {
                    crystallised[k] = x[offset + i];
                }
                return Ok(Frozen {
                    ice_kg: if ice { x[0] } else { 0.0 },
                    crystallised,
                    water_kg,
                    liquid,
                    ln_water: checked.ln_water,
                });
            }
            Some((_, None)) => {
                ice = true;
                x.insert(0, 0.0);
            }
            Some((_, Some(k))) => {
                active.push(k);
                x.push(0.0);
            }
        }
    }
    Err(outside(
        "the phases present could not be settled (the active-set loop did not end)".into(),
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::activity::System;
    use crate::science::activity::ice::ln_water_activity_of_ice;
    use crate::science::activity::seed_system;

    fn gm89() -> System {
        seed_system("greenberg-moller-1989-na-k-cl")
    }

    #[test]
    fn ice_leaves_the_liquid_at_the_ice_water_activity() {
        let s = gm89();
        let t = 273.15;
        let c = s.at(t).unwrap();
        let nacl = Solid::of(&s, "NaCl", 0).unwrap();
        // At 0 °C ice's water activity is 1: a salt solution makes no ice.
        let total = nacl.alone(c.len(), 1.0);
        let f = freeze(&c, &total, ln_water_activity_of_ice(t), &[]).unwrap();
        assert_eq!(f.ice_kg, 0.0);
        // Below its freezing point (used beyond the set's range here only to have a
        // sub-zero temperature; the check is of the mass balance and the condition).
        let t = 268.15;
        let c = s.at_unchecked(t);
        let ln_ice = ln_water_activity_of_ice(t);
        let f = freeze(&c, &total, ln_ice, &[]).unwrap();
        assert!(f.ice_kg > 0.0 && f.ice_kg < 1.0);
        assert!((f.water_kg + f.ice_kg - 1.0).abs() < 1e-12);
        assert!((f.ln_water - ln_ice).abs() < 1e-8);
        // Mass balance of the ions: liquid molality × water left = the total.
        let na = s.index("Na").unwrap();
        assert!((f.liquid[na] * f.water_kg - 1.0).abs() < 1e-12);
    }

    #[test]
    fn a_supersaturated_salt_crystallises_to_saturation() {
        let s = gm89();
        let c = s.at(298.15).unwrap();
        let kcl = Solid::of(&s, "KCl", 0).unwrap();
        let ln_k = kcl.ln_k_from_solubility(&c, 4.8).unwrap();
        let total = kcl.alone(c.len(), 6.0);
        let cand = [Candidate { solid: kcl, ln_k }];
        // Above 0 °C no ice: the ice condition is never met (ln a_w of ice is positive).
        let f = freeze(&c, &total, ln_water_activity_of_ice(298.15), &cand).unwrap();
        assert_eq!(f.ice_kg, 0.0);
        assert!(
            (f.crystallised[0] - 1.2).abs() < 1e-8,
            "{:?}",
            f.crystallised
        );
    }
}
