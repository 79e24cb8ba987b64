//! `freezing of RECIPE at T` for a recipe that holds a buffer: the freeze-concentration path
//! from 0 °C down to T, with the pH of the liquid left and the salts that crystallise from it.
//!
//! A simple, stated model: water activity ideal (Raoult, every ion and acid unit one
//! particle), so ice takes the water that brings the liquid to ice's own activity at each
//! temperature; each salt is checked on its own, as recipe answers do where no Pitzer system
//! covers the ions: a buffer form crystallises when its own species (as much of the acid as
//! the pH puts in that form) passes the form's solubility at that temperature, another salt
//! when the scarcer of its ions does; what crystallises leaves the liquid (a buffer form
//! taking its species out moves the pH: the acid left is re-balanced), and the pH of the
//! liquid comes from charge balance ([`crate::science::acid_base`]). No common-ion effect;
//! water of crystallisation is not taken from the liquid. The path is walked in steps of
//! 0.1 K.

use serde_json::json;

use crate::answer::{Answer, Basis, ICE_ROW, Row};
use crate::engine::CAUTION;
use crate::engine::buffer::{PH_CAVEAT, cite_acid};
use crate::engine::common::celsius;
use crate::engine::error::EvalError;
use crate::engine::mixture::Mixture;
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::number::round_significant;
use crate::query::Span;
use crate::science::acid_base::{AcidSystem, Present, Solution, solve};
use crate::science::activity::ice::ln_water_activity_of_ice;
use crate::science::bisect::{Until, bisect};
use crate::science::enthalpy::dissociate;
use crate::science::freezing::{ICE_POINT, molality};

/// Molar mass of water, kg/mol.
const M_WATER: f64 = 0.018_015_28;

/// The step of the path, K.
const STEP_K: f64 = 0.1;

/// A pH shift before the liquid is gone that the answer warns of.
const WARN_SHIFT: f64 = 0.5;

/// One ion of the liquid: its name, charge and amount per kg of the recipe's water.
#[derive(Debug, Clone)]
struct Ion {
    name: String,
    charge: i32,
    mol: f64,
}

/// A salt of the recipe that can crystallise: which ions (or acid form) it takes out.
#[derive(Debug, Clone)]
struct Salt<'s> {
    name: String,
    phase: String,
    /// Solute index in the catalog (for its curve).
    catalog_index: usize,
    /// Strong ions per formula unit: (ion name, charge, count).
    ions: Vec<(String, i32, f64)>,
    /// The acid and the species (index) a formula unit carries, if a buffer form.
    acid: Option<(&'s AcidSystem, usize)>,
    molar_mass: f64,
    /// Where it first crystallised, K.
    first: Option<f64>,
    /// Amount crystallised, mol per kg of the recipe's water.
    out: f64,
    unknown: bool,
}

/// The liquid: ions, acids and neutral solutes per kg of the recipe's (first) water.
#[derive(Debug, Clone)]
struct Liquid<'s> {
    ions: Vec<Ion>,
    acids: Vec<Present<'s>>,
    neutral: f64,
}

impl<'s> Liquid<'s> {
    fn add_ion(&mut self, name: &str, charge: i32, mol: f64) {
        match self.ions.iter_mut().find(|i| i.name == name) {
            Some(i) => i.mol += mol,
            None => self.ions.push(Ion {
                name: name.to_string(),
                charge,
                mol,
            }),
        }
    }

    fn particles(&self) -> f64 {
        self.ions.iter().map(|i| i.mol).sum::<f64>()
            + self.acids.iter().map(|p| p.total).sum::<f64>()
            + self.neutral
    }

    /// The solution at a water share `f` (kg of liquid water per kg of the recipe's water).
    fn solution(&self, water: &'s AcidSystem, f: f64) -> Solution<'s> {
        Solution {
            acids: self
                .acids
                .iter()
                .map(|p| Present {
                    acid: p.acid,
                    total: p.total / f,
                })
                .collect(),
            strong_charge: self
                .ions
                .iter()
                .map(|i| f64::from(i.charge) * i.mol)
                .sum::<f64>()
                / f,
            strong_ionic: 0.5
                * self
                    .ions
                    .iter()
                    .map(|i| f64::from(i.charge * i.charge) * i.mol)
                    .sum::<f64>()
                / f,
            water,
        }
    }
}

/// The share of the water left liquid at `t_k` for `particles` per kg (ideal), at most 1.
fn water_left(particles: f64, t_k: f64) -> f64 {
    let ln_aw = ln_water_activity_of_ice(t_k);
    if ln_aw >= 0.0 {
        return 1.0;
    }
    // ln x_w = −ln(1 + M n / f) = ln a_w(ice)
    (M_WATER * particles / ((-ln_aw).exp() - 1.0)).min(1.0)
}

/// How much of `salt` the liquid holds, mol per kg of liquid water at water share `f`: for
/// a buffer form, its own species (the pH decides how much of the acid is in that form);
/// for another salt, the scarcer of its ions.
fn held(salt: &Salt, liquid: &Liquid, f: f64, t_k: f64, water: &AcidSystem) -> Option<f64> {
    let mut amount = f64::INFINITY;
    for (name, _, n) in &salt.ions {
        let mol = liquid.ions.iter().find(|i| &i.name == name)?.mol / f;
        amount = amount.min(mol / n);
    }
    if let Some((acid, j)) = salt.acid {
        let s = solve(&liquid.solution(water, f), t_k).ok()?;
        let k = liquid.acids.iter().position(|p| p.acid.key == acid.key)?;
        let total = liquid.acids[k].total / f;
        let a = s.fractions.get(k)?.get(j).copied()?;
        amount = amount.min(total * a);
    }
    amount.is_finite().then_some(amount)
}

/// The salt's solubility at `t_k`, mol per kg of water (its curve, extrapolated on its end
/// below the data).
fn saturated(snap: &Snapshot, salt: &Salt, t_k: f64) -> Option<f64> {
    let curve = snap.curve_at(salt.catalog_index, false)?;
    let e = curve.curve.evaluate(t_k, true).ok()?;
    Some(molality(e.mass_fraction, salt.molar_mass))
}

/// Takes `x` mol of `salt` out of the liquid.
fn take_out(liquid: &mut Liquid, salt: &Salt, x: f64) {
    for (name, _, n) in &salt.ions {
        if let Some(i) = liquid.ions.iter_mut().find(|i| &i.name == name) {
            i.mol = (i.mol - n * x).max(0.0);
        }
    }
    if let Some((acid, _)) = salt.acid
        && let Some(p) = liquid.acids.iter_mut().find(|p| p.acid.key == acid.key)
    {
        p.total = (p.total - x).max(0.0);
    }
}

/// How much of `salt` (mol per kg of recipe water) leaves the liquid so that what the
/// liquid holds comes back to its solubility (bisection), at most what the liquid holds.
fn amount_out(
    salt: &Salt,
    liquid: &Liquid,
    f: f64,
    t_k: f64,
    water: &AcidSystem,
    solubility: f64,
) -> f64 {
    let mut most = f64::INFINITY;
    for (name, _, n) in &salt.ions {
        let have = liquid
            .ions
            .iter()
            .find(|i| &i.name == name)
            .map_or(0.0, |i| i.mol);
        most = most.min(have / n);
    }
    if let Some((acid, _)) = salt.acid {
        let have = liquid
            .acids
            .iter()
            .find(|p| p.acid.key == acid.key)
            .map_or(0.0, |p| p.total);
        most = most.min(have);
    }
    if !most.is_finite() || most <= 0.0 {
        return 0.0;
    }
    // 40 halvings: 1e-12 of what the liquid holds.
    let bracket = bisect(0.0, most * (1.0 - 1e-9), Until::Halvings(40), |mid| {
        let mut trial = liquid.clone();
        take_out(&mut trial, salt, mid);
        held(salt, &trial, f, t_k, water).is_some_and(|h| h > solubility)
    });
    bracket.hi
}

/// The salts of the recipe that could crystallise, and the liquid they make.
fn salts_and_liquid<'s>(snap: &'s Snapshot, mixture: &Mixture) -> (Vec<Salt<'s>>, Liquid<'s>) {
    let mut salts = Vec::new();
    let mut liquid = Liquid {
        ions: Vec::new(),
        acids: Vec::new(),
        neutral: 0.0,
    };
    for (index, (solute, _)) in mixture.solutes.iter().enumerate() {
        let mol = mixture.molality(index);
        let catalog_index = snap
            .catalog
            .solutes()
            .iter()
            .position(|s| s.id == solute.id)
            .unwrap_or(usize::MAX);
        let rung = crate::engine::buffer::rung_of(snap, &solute.id);
        let mut salt = Salt {
            name: solute.name.clone(),
            phase: String::new(),
            catalog_index,
            ions: Vec::new(),
            acid: None,
            molar_mass: solute.molar_mass,
            first: None,
            out: 0.0,
            unknown: false,
        };
        if let Some((acid, rung)) = rung {
            match liquid.acids.iter_mut().find(|p| p.acid.key == acid.key) {
                Some(p) => p.total += mol * rung.units,
                None => liquid.acids.push(Present {
                    acid,
                    total: mol * rung.units,
                }),
            }
            // The counter-ion: the formula's alkali metal for a cation (Na, K, wherever the
            // formula writes it: `NaC2H3O2`, `CH3COOK`), chloride for a hydrochloride.
            let counter = if rung.charge > 0 {
                alkali_of(&solute.formula)
            } else {
                "Cl".to_string()
            };
            let sign = rung.charge.signum();
            if rung.charge != 0 {
                liquid.add_ion(&counter, sign, mol * f64::from(rung.charge.abs()));
                salt.ions
                    .push((counter, sign, f64::from(rung.charge.abs())));
            }
            // The species a formula unit carries: charge −(counter charge) per acid unit.
            let species = acid.charges.iter().position(|&z| z == -rung.charge);
            if rung.units == 1.0
                && let Some(j) = species
            {
                salt.acid = Some((acid, j));
                salts.push(salt);
            }
        } else if solute.kind == SoluteKind::Salt
            && let Some(ions) = dissociate(&solute.formula)
        {
            for (ion, n) in &ions {
                liquid.add_ion(ion.body, i32::from(ion.charge), mol * f64::from(*n));
                salt.ions
                    .push((ion.body.to_string(), i32::from(ion.charge), f64::from(*n)));
            }
            salts.push(salt);
        } else {
            liquid.neutral += mol;
        }
    }
    (salts, liquid)
}

/// The alkali metal of a buffer salt's formula (its counter-ion), else the formula's first
/// element.
fn alkali_of(formula: &str) -> String {
    let symbols: Vec<&str> = formula
        .char_indices()
        .filter(|(_, c)| c.is_ascii_uppercase())
        .map(|(i, _)| {
            let rest = &formula[i + 1..];
            let len = rest
                .char_indices()
                .find(|(_, c)| !c.is_ascii_lowercase())
                .map_or(rest.len(), |(j, _)| j);
            &formula[i..=i + len]
        })
        .collect();
    ["Na", "K", "Li", "Rb", "Cs"]
        .iter()
        .find(|a| symbols.contains(a))
        .or(symbols.first())
        .map_or_else(String::new, |s| (*s).to_string())
}

/// `freezing of RECIPE at T` for a buffered recipe (see the module's comment).
pub fn freezing(
    snap: &Snapshot,
    mixture: &Mixture,
    target_k: f64,
    span: Span,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let refuse = |message: String| EvalError::Unanswerable { message, span };
    let Some(water) = snap.water() else {
        return Err(refuse(
            "the reference holds no record of water's ionization".into(),
        ));
    };
    if target_k >= ICE_POINT {
        return Err(refuse(format!(
            "{} C is not below 0 C: nothing freezes there (ask `ph of NAME from T1 to T2`)",
            celsius(target_k)
        )));
    }
    let lowest = water.t_min_k - 40.0;
    if target_k < lowest {
        return Err(refuse(format!(
            "the buffer's freezing path is worked out down to {} C",
            celsius(lowest)
        )));
    }
    let (mut salts, mut liquid) = salts_and_liquid(snap, mixture);
    let start =
        solve(&liquid.solution(water, 1.0), ICE_POINT).map_err(|e| refuse(e.to_string()))?;
    let mut onset = None;
    let mut t = ICE_POINT;
    let mut ph = start.ph;
    let mut beyond = start.beyond_davies;
    let mut path: Vec<(f64, f64)> = vec![(ICE_POINT, start.ph)];
    let mut f = 1.0;
    let mut eutectic: Option<(f64, String)> = None;
    while t > target_k + 1e-9 {
        t = (t - STEP_K).max(target_k);
        let f_before = f;
        let ph_before = ph;
        f = water_left(liquid.particles(), t);
        if f < 1.0 && onset.is_none() {
            onset = Some(t);
        }
        let mut out_here: Option<usize> = None;
        for _ in 0..3 {
            let mut moved = false;
            for (k, salt) in salts.iter_mut().enumerate() {
                let Some(solubility) = saturated(snap, salt, t) else {
                    salt.unknown = true;
                    continue;
                };
                let Some(h) = held(salt, &liquid, f, t, water) else {
                    continue;
                };
                if h > solubility * (1.0 + 1e-9) {
                    let x = amount_out(salt, &liquid, f, t, water, solubility);
                    if x > 0.0 {
                        take_out(&mut liquid, salt, x);
                        salt.out += x;
                        out_here = Some(k);
                        if salt.first.is_none() {
                            salt.first = Some(t);
                            if let Some(curve) = snap.curve_at(salt.catalog_index, false)
                                && let Ok(e) = curve.curve.evaluate(t, true)
                            {
                                salt.phase = e.phase;
                            }
                        }
                        moved = true;
                    }
                }
            }
            f = water_left(liquid.particles(), t);
            if !moved {
                break;
            }
        }
        // The liquid has reached a eutectic, below which what is left solidifies, when with
        // ice present: a salt that is no buffer form starts to crystallise (the brine's own
        // eutectic), a second buffer form does (ice and two forms), or the liquid collapses
        // (half its water frozen in one step, or almost none left). The pH reported is the
        // liquid's there, before it collapses.
        let crystallising = salts.iter().filter(|s| s.first.is_some()).count();
        let at_eutectic = out_here.and_then(|k| {
            let salt = &salts[k];
            let new = salt.first == Some(t);
            let brine = new && salt.acid.is_none();
            let second_form = new && salt.acid.is_some() && crystallising >= 2;
            let collapse = f < 0.5 * f_before || f < 1e-3;
            (onset.is_some() && (brine || second_form || collapse)).then(|| salt.name.clone())
        });
        if let Some(name) = at_eutectic {
            if f < 0.5 * f_before || f < 1e-3 {
                // Report the liquid as it was on reaching the point.
                f = f_before;
                ph = ph_before;
            } else {
                let s = solve(&liquid.solution(water, f), t).map_err(|e| refuse(e.to_string()))?;
                beyond |= s.beyond_davies;
                ph = s.ph;
            }
            path.push((t, ph));
            eutectic = Some((t, name));
            break;
        }
        let s = solve(&liquid.solution(water, f), t).map_err(|e| refuse(e.to_string()))?;
        beyond |= s.beyond_davies;
        ph = s.ph;
        path.push((t, s.ph));
    }
    let ph_row = |t_k: f64, ph: f64, quantity: &'static str| Row {
        quantity: Some(quantity.into()),
        value: Some(round_significant(ph, 3)),
        unit: Some("pH".into()),
        basis: Some(Basis::Computed),
        temperature_c: Some(round_significant(celsius(t_k), 3)),
        ..Row::default()
    };
    answer.rows.push(ph_row(
        ICE_POINT,
        start.ph,
        "pH of the liquid before ice forms",
    ));
    match onset {
        Some(t_ice) => answer.rows.push(Row {
            quantity: Some(ICE_ROW.into()),
            value: Some(round_significant(celsius(t_ice), 3)),
            unit: Some("C".into()),
            basis: Some(Basis::Computed),
            phase: Some("ice".into()),
            ..Row::default()
        }),
        None => answer.caveat(format!(
            "no ice down to {} C in this ideal model",
            celsius(target_k)
        )),
    }
    let mut firsts: Vec<&Salt> = salts.iter().filter(|s| s.first.is_some()).collect();
    firsts.sort_by(|a, b| b.first.unwrap_or(0.0).total_cmp(&a.first.unwrap_or(0.0)));
    for salt in &firsts {
        let t_first = salt.first.unwrap_or(target_k);
        let at = path
            .iter()
            .find(|(tp, _)| *tp <= t_first + 1e-9)
            .map_or(ph, |(_, p)| *p);
        answer.rows.push(Row {
            solute: Some(salt.name.clone()),
            quantity: Some("crystallises from the liquid below".into()),
            value: Some(round_significant(celsius(t_first), 3)),
            unit: Some("C".into()),
            basis: Some(Basis::Computed),
            phase: (!salt.phase.is_empty()).then(|| salt.phase.clone()),
            extra: [
                ("ph_there".to_string(), json!(round_significant(at, 3))),
                (
                    "crystallised_mol_per_kg_water".to_string(),
                    json!(round_significant(salt.out, 3)),
                ),
            ]
            .into_iter()
            .collect(),
            ..Row::default()
        });
    }
    let last_t = path.last().map_or(target_k, |(t, _)| *t);
    if let Some((t_eu, salt)) = &eutectic {
        answer.rows.push(Row {
            solute: Some(salt.clone()),
            quantity: Some("the liquid left reaches a eutectic with it at".into()),
            value: Some(round_significant(celsius(*t_eu), 3)),
            unit: Some("C".into()),
            basis: Some(Basis::Computed),
            ..Row::default()
        });
        answer
            .rows
            .push(ph_row(*t_eu, ph, "pH of the liquid at the eutectic"));
        if target_k < *t_eu - 1e-9 {
            answer.caveat(format!(
                "below {} C no liquid is left in this model: at {} C the recipe is solid, and the pH shift is the one its last liquid saw; the eutectic comes out a few kelvin warmer here than for the salt alone in the data (ideal water activity)",
                round_significant(celsius(*t_eu), 3),
                celsius(target_k)
            ));
        }
    } else {
        answer
            .rows
            .push(ph_row(target_k, ph, "pH of the liquid left"));
    }
    let shift = ph - start.ph;
    answer.rows.push(Row {
        quantity: Some(
            format!(
                "pH shift of the liquid from 0 C to {} C",
                round_significant(celsius(last_t), 3)
            )
            .into(),
        ),
        value: Some(round_significant(shift, 3)),
        unit: Some("pH".into()),
        basis: Some(Basis::Computed),
        ..Row::default()
    });
    answer.rows.push(Row {
        quantity: Some("water left liquid".into()),
        value: Some(round_significant(f * 100.0, 3)),
        unit: Some("% of the recipe's water".into()),
        basis: Some(Basis::Computed),
        temperature_c: Some(round_significant(celsius(last_t), 3)),
        ..Row::default()
    });
    if shift.abs() > WARN_SHIFT {
        answer.caveat(format!(
            "warning: the pH of the liquid left shifts by {} on freezing, before the product is solid (down to {} C: {} to {}), as {}: a protein or drug in it meets that pH; freeze fast, or choose a buffer whose forms stay dissolved (a potassium phosphate buffer shifts far less)",
            round_significant(shift, 2),
            round_significant(celsius(last_t), 3),
            round_significant(start.ph, 3),
            round_significant(ph, 3),
            firsts.iter().find(|s| s.acid.is_some()).map_or(
                "the liquid cools and concentrates (no buffer form crystallises)".to_string(),
                |s| format!("{} crystallises", s.name)
            )
        ));
    }
    let unknown: Vec<&str> = salts
        .iter()
        .filter(|s| s.unknown)
        .map(|s| s.name.as_str())
        .collect();
    if !unknown.is_empty() {
        answer.caveat(format!(
            "not known whether {} can crystallise on the way: no solubility there, even extrapolated",
            unknown.join(", ")
        ));
    }
    answer.caveat("freeze-concentration path in a simple model: water activity ideal (Raoult), each salt checked against its own solubility (a buffer form by its own species; no common-ion effect), solubilities below the data extrapolated on the curve's end, water of crystallisation not taken from the liquid; the temperatures and pH are estimates to compare buffers, not a prediction of a real freezer");
    let lowest_constants = liquid
        .acids
        .iter()
        .map(|p| p.acid.t_min_k)
        .fold(water.t_min_k, f64::max);
    if last_t < lowest_constants - 1e-9 {
        answer.caveat(format!(
            "the acid-base constants are evaluated from {} C: below it their temperature dependence is extrapolated",
            celsius(lowest_constants)
        ));
    }
    if beyond {
        answer.caveat("the liquid's ionic strength passes 0.5 mol/kg on the way: the Davies coefficients are taken at 0.5 there, so the pH is rougher");
    }
    answer.caveat(PH_CAVEAT);
    for p in &liquid.acids {
        cite_acid(snap, p.acid, answer);
    }
    cite_acid(snap, water, answer);
    answer.caveat(CAUTION);
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_counter_ion_is_the_alkali_metal_wherever_the_formula_writes_it() {
        // A formula with no alkali metal falls back on its first element.
        for (formula, counter) in [
            ("NaC2H3O2", "Na"),
            ("CH3COOK", "K"),
            ("K3C6H5O7", "K"),
            ("NaHCO3", "Na"),
            ("C4H11NO3", "C"),
        ] {
            assert_eq!(alkali_of(formula), counter, "{formula}");
        }
    }
}
