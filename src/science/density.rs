//! Density of aqueous solutions of one or several solutes by Laliberté's model: each solute
//! has an apparent density that depends on the total solute mass fraction and the
//! temperature, and the specific volumes add. Coefficients are data (the reference's
//! `density_coefficients` table), passed in; this module holds only the equations.

use super::ScienceError;
use super::gas::water_density;

/// One solute's published coefficients c0…c4 and the range they were fitted over.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Coefficients {
    /// c0, c1 (kg/m³ after the combination below), c2, c3 (1/°C), c4 (°C).
    pub c: [f64; 5],
    /// Fitted range of temperature, °C.
    pub t_min_c: f64,
    pub t_max_c: f64,
    /// Largest mass fraction of the solute in the fitted data.
    pub w_max: f64,
}

/// Why no density can be given.
#[derive(Debug, Clone, PartialEq)]
pub enum Refusal {
    /// Component `index` is outside its temperature range, °C.
    Temperature {
        index: usize,
        t_c: f64,
        t_min_c: f64,
        t_max_c: f64,
    },
    /// Component `index` is more concentrated than its fitted data.
    MassFraction { index: usize, w: f64, w_max: f64 },
    /// The mass fractions cannot be those of a solution (negative, or summing to 1 or more).
    Composition { total: f64 },
    /// Pure water's density could not be had at this temperature.
    Water(ScienceError),
}

/// Apparent density of one solute, kg/m³ (Laliberté 2009, eq. 5; Laliberté & Cooper 2004,
/// eq. 12):
///
/// ρ_app = (c0·(1 − w_w) + c1) · exp(10⁻⁶ (t + c4)²) / ((1 − w_w) + c2 + c3·t),
///
/// with w_w the mass fraction of water in the solution (so 1 − w_w is the total solute mass
/// fraction, every solute counted) and t in °C.
pub fn apparent_density(c: &Coefficients, water_fraction: f64, t_c: f64) -> f64 {
    let solutes = 1.0 - water_fraction;
    let [c0, c1, c2, c3, c4] = c.c;
    (c0 * solutes + c1) * (1.0e-6 * (t_c + c4) * (t_c + c4)).exp() / (solutes + c2 + c3 * t_c)
}

/// Density of a solution, kg/m³: 1/ρ = w_w/ρ_w + Σ w_i/ρ_app,i (Laliberté & Cooper 2004,
/// eq. 4: specific volumes are additive), with ρ_w pure water's density at the temperature
/// (Kell 1975, [`water_density`]). `components` are (mass fraction of the solute in the
/// solution, its coefficients). Each solute must lie within its fitted range of
/// temperature and mass fraction, or the density is refused.
pub fn solution_density(t_k: f64, components: &[(f64, &Coefficients)]) -> Result<f64, Refusal> {
    let t_c = t_k - 273.15;
    let total: f64 = components.iter().map(|(w, _)| *w).sum();
    if !total.is_finite() || total >= 1.0 || components.iter().any(|(w, _)| *w < 0.0) {
        return Err(Refusal::Composition { total });
    }
    for (index, (w, c)) in components.iter().enumerate() {
        // A temperature given in °C comes back from kelvin a rounding hair off.
        if !(c.t_min_c - 1e-9..=c.t_max_c + 1e-9).contains(&t_c) {
            return Err(Refusal::Temperature {
                index,
                t_c,
                t_min_c: c.t_min_c,
                t_max_c: c.t_max_c,
            });
        }
        if *w > c.w_max * (1.0 + 1e-12) {
            return Err(Refusal::MassFraction {
                index,
                w: *w,
                w_max: c.w_max,
            });
        }
    }
    within_range_density(t_k, components)
}

/// [`solution_density`] without the check of each solute's fitted range of mass fraction
/// (the temperature's is still checked): for the iterates of a composition solve, which
/// may pass beyond a solute's range on the way to a composition inside it. The composition
/// solved must then be checked with [`solution_density`].
pub fn iterate_density(t_k: f64, components: &[(f64, &Coefficients)]) -> Result<f64, Refusal> {
    let relaxed: Vec<Coefficients> = components
        .iter()
        .map(|(_, c)| Coefficients { w_max: 1.0, ..**c })
        .collect();
    let components: Vec<(f64, &Coefficients)> = components
        .iter()
        .map(|(w, _)| *w)
        .zip(relaxed.iter())
        .collect();
    let rho = solution_density(t_k, &components)?;
    if rho.is_finite() && rho > 0.0 {
        Ok(rho)
    } else {
        let total = components.iter().map(|(w, _)| *w).sum();
        Err(Refusal::Composition { total })
    }
}

/// The model's sum once the ranges are checked.
fn within_range_density(t_k: f64, components: &[(f64, &Coefficients)]) -> Result<f64, Refusal> {
    let t_c = t_k - 273.15;
    let total: f64 = components.iter().map(|(w, _)| *w).sum();
    let water = 1.0 - total;
    let rho_w = water_density(t_k).map_err(Refusal::Water)?;
    let volume = water / rho_w
        + components
            .iter()
            .map(|(w, c)| w / apparent_density(c, water, t_c))
            .sum::<f64>();
    Ok(1.0 / volume)
}

/// How an amount of one solute of a solution is given, on the three bases of the trade.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Amount {
    /// Mass fraction of the solution (from `%w/w`, `w`, `mg/kg`).
    MassFraction(f64),
    /// Grams of solute per gram of water (from `g/100g water`, `mol/kg`, `mmol/kg`, …).
    PerWater(f64),
    /// Grams of solute per millilitre of solution (from `g/L`, `mol/L`, `%w/v`, …): needs
    /// the solution's density.
    PerVolume(f64),
}

impl Amount {
    /// The mass fraction given, or 0.
    fn mass_fraction(&self) -> f64 {
        if let Amount::MassFraction(w) = self {
            *w
        } else {
            0.0
        }
    }

    /// Grams per gram of water given, or 0.
    fn per_water(&self) -> f64 {
        if let Amount::PerWater(r) = self {
            *r
        } else {
            0.0
        }
    }

    /// Grams per millilitre given, or 0.
    fn per_volume(&self) -> f64 {
        if let Amount::PerVolume(g) = self {
            *g
        } else {
            0.0
        }
    }
}

/// Why a composition could not be solved.
#[derive(Debug, Clone, PartialEq)]
pub enum SolveRefusal<E> {
    /// The amounts add up to more solute than a solution can hold (mass fractions ≥ 1).
    Impossible,
    /// The density function refused.
    Density(E),
    /// The iteration did not settle (it always does for real solutions, whose density
    /// changes slowly with composition).
    NoConvergence,
}

/// The mass fractions of a solution whose solutes are given on mixed bases.
///
/// With ρ the solution's density (g/mL) and w_w the water's mass fraction: a per-volume
/// amount γ gives w = γ/ρ, a per-water amount r gives w = r·w_w, and the water is what is
/// left: w_w = (1 − Σ fixed w − Σ γ/ρ) / (1 + Σ r) (mass balance). ρ depends on the
/// composition, so the two are solved together by fixed-point iteration starting from
/// `density` of pure water's composition; `density(ws)` returns g/mL. Without per-volume
/// amounts `density` is never called.
pub fn mass_fractions<E>(
    amounts: &[Amount],
    mut density: impl FnMut(&[f64]) -> Result<f64, E>,
) -> Result<Vec<f64>, SolveRefusal<E>> {
    let per_volume = amounts.iter().any(|a| matches!(a, Amount::PerVolume(_)));
    let fractions = |rho: f64| -> Result<Vec<f64>, SolveRefusal<E>> {
        let fixed: f64 = amounts
            .iter()
            .map(|a| a.mass_fraction() + a.per_volume() / rho)
            .sum();
        let ratio: f64 = amounts.iter().map(Amount::per_water).sum();
        let water = (1.0 - fixed) / (1.0 + ratio);
        if !(water.is_finite() && water > 0.0) {
            return Err(SolveRefusal::Impossible);
        }
        Ok(amounts
            .iter()
            .map(|a| match a {
                Amount::MassFraction(w) => *w,
                Amount::PerVolume(g) => g / rho,
                Amount::PerWater(r) => r * water,
            })
            .collect())
    };
    if !per_volume {
        return fractions(1.0);
    }
    // Some water is left only while Σγ/ρ < 1 − Σw (mass fractions given): ρ must exceed
    // `floor`. A dense solution's iterates start above it, not at pure water's density
    // (where a concentrated per-litre amount would leave no water at all).
    let fixed: f64 = amounts.iter().map(Amount::mass_fraction).sum();
    let per_volume: f64 = amounts.iter().map(Amount::per_volume).sum();
    if !fixed.is_finite() || fixed >= 1.0 {
        return Err(SolveRefusal::Impossible);
    }
    let floor = per_volume / (1.0 - fixed) * (1.0 + 1.0e-9);
    let zeros = vec![0.0; amounts.len()];
    let mut rho = density(&zeros).map_err(SolveRefusal::Density)?.max(floor);
    for _ in 0..200 {
        let ws = fractions(rho)?;
        let next = density(&ws).map_err(SolveRefusal::Density)?;
        if next <= floor {
            // Denser than the amounts allow is what it would have to be, and is not.
            if rho <= floor {
                return Err(SolveRefusal::Impossible);
            }
            rho = floor;
            continue;
        }
        if (next - rho).abs() <= 1.0e-13 * rho {
            return fractions(next);
        }
        rho = next;
    }
    Err(SolveRefusal::NoConvergence)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Sodium chloride's coefficients as printed by Laliberté 2009 (transcribed in
    /// seed-data/densities.toml).
    const NACL: Coefficients = Coefficients {
        c: [
            -0.00324112223655149,
            0.0636354335906616,
            1.01371399467365,
            0.0145951015210159,
            3317.34854426537,
        ],
        t_min_c: 0.0,
        t_max_c: 140.0,
        w_max: 0.26589930421877,
    };

    #[test]
    fn pure_water_is_kell() {
        let rho = solution_density(293.15, &[(0.0, &NACL)]).unwrap();
        assert!((rho - water_density(293.15).unwrap()).abs() < 1e-9);
    }

    #[test]
    fn saline_density_is_about_one_point_oh_four() {
        // 1 mol/L NaCl at 20 °C is about 1.037–1.040 kg/L (CRC Handbook, 97th ed., §5
        // "Concentrative Properties of Aqueous Solutions", about 1.038 g/mL near 5.6 %w/w;
        // recalled from memory of the table, not checked against it).
        let ws = mass_fractions::<Refusal>(&[Amount::PerVolume(58.44 / 1000.0)], |ws| {
            solution_density(293.15, &[(ws[0], &NACL)]).map(|r| r / 1000.0)
        })
        .unwrap();
        let rho = solution_density(293.15, &[(ws[0], &NACL)]).unwrap();
        assert!((1037.0..=1040.0).contains(&rho), "{rho}");
    }

    #[test]
    fn outside_the_fit_is_refused() {
        assert!(matches!(
            solution_density(293.15, &[(0.3, &NACL)]),
            Err(Refusal::MassFraction { .. })
        ));
        assert!(matches!(
            solution_density(423.15, &[(0.1, &NACL)]),
            Err(Refusal::Temperature { .. })
        ));
        assert!(matches!(
            solution_density(293.15, &[(1.2, &NACL)]),
            Err(Refusal::Composition { .. })
        ));
    }

    #[test]
    fn a_dense_solution_is_solved_from_above_the_density_its_amounts_need() {
        // ρ = 1 + 0.9·w (g/mL), 1.2 g/mL of solute: ρ² − ρ − 1.08 = 0, ρ = 1.6533,
        // w = 1.2/ρ = 0.7258. From pure water's 1.0 the first iterate would hold no water.
        let ws =
            mass_fractions::<()>(&[Amount::PerVolume(1.2)], |ws| Ok(1.0 + 0.9 * ws[0])).unwrap();
        let rho = (1.0 + (1.0f64 + 4.32).sqrt()) / 2.0;
        assert!((ws[0] - 1.2 / rho).abs() < 1e-9, "{ws:?}");
        // A solution that would have to be denser than it is: refused as impossible.
        assert_eq!(
            mass_fractions::<()>(&[Amount::PerVolume(1.5)], |_| Ok(1.0)),
            Err(SolveRefusal::Impossible)
        );
    }

    #[test]
    fn mixed_bases_balance_the_water() {
        // By hand: 10 g/100g water of A and 0.2 w of B: w_w = 0.8/1.1, w_A = 0.1·w_w.
        let ws = mass_fractions::<()>(&[Amount::PerWater(0.1), Amount::MassFraction(0.2)], |_| {
            Err(())
        })
        .unwrap();
        assert!((ws[0] - 0.1 * 0.8 / 1.1).abs() < 1e-15);
        assert!((ws[1] - 0.2).abs() < 1e-15);
        assert_eq!(
            mass_fractions::<()>(
                &[Amount::MassFraction(0.7), Amount::MassFraction(0.4)],
                |_| Err(())
            ),
            Err(SolveRefusal::Impossible)
        );
    }
}
