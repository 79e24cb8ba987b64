//! Buffers in recipes: `10 mM sodium phosphate at pH 7.4` becomes the buffer's forms in the
//! reference (here sodium dihydrogen and disodium hydrogen phosphate) in the shares that give
//! that pH at 25 °C with the rest of the recipe present; from then on the recipe is those
//! solutes, so every recipe answer (solids, saturation, freezing) sees them. `ph of RECIPE
//! from T1 to T2` answers how the pH moves with temperature with the amounts fixed.
//!
//! The pH of a recipe comes from its solutes' charges ([`solution_of`]): a solute that is a
//! form of a buffer adds its acid and its counter-ions, any other salt its ions (neutral as a
//! whole), both to the ionic strength. Activities by the Davies equation
//! ([`crate::science::acid_base`]), said in every answer.

use serde_json::json;

use crate::answer::{Answer, Basis, Row};
use crate::engine::common::{bounds, celsius};
use crate::engine::error::EvalError;
use crate::engine::mixture::Mixture;
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::number::{round_significant, shown};
use crate::query::{Name, Recipe, Span, TemperatureStep, Temperatures};
use crate::science::acid_base::{
    AcidSystem, BufferForm, DAVIES_MAX_I, Present, Rung, Solution, Speciation, charge_for_ph, solve,
};
use crate::science::enthalpy::dissociate;
use crate::science::units::CompositionUnit;

/// The temperature a buffer's pH is set at, K (25 °C).
pub const SET_T_K: f64 = 298.15;

/// The caveat every answer with a pH carries.
pub const PH_CAVEAT: &str = "pH on the usual activity scale (pH = -log10 a_H+), from the acid-base constants of Goldberg, Kishore & Lennen (2002), typed from memory and unreviewed, with van 't Hoff temperature dependence and Davies activity coefficients (meant for ionic strength up to about 0.5 mol/kg); a measured pH can differ by a few hundredths, more in strong brines";

/// A buffer written in a recipe and what it became.
#[derive(Debug, Clone)]
pub struct BufferUse<'s> {
    pub acid: &'s AcidSystem,
    pub form: &'s BufferForm,
    /// As written: `sodium phosphate`.
    pub written: String,
    pub ph: f64,
    /// The forms and their amounts, in the ingredient's unit.
    pub parts: Vec<(String, f64)>,
    pub unit: CompositionUnit,
    /// Ionic strength at the setting, mol/kg.
    pub ionic_strength: f64,
    /// True when the recipe's per-litre amounts were taken at 25 °C because of the buffer.
    pub volume_set: bool,
}

/// A recipe whose buffers were turned into their forms.
#[derive(Debug, Clone)]
pub struct Expanded<'s> {
    pub recipe: Recipe,
    pub buffers: Vec<BufferUse<'s>>,
}

fn refuse(message: String, span: Span) -> EvalError {
    EvalError::Unanswerable { message, span }
}

/// The buffer form and its rung a solute is, if any (by solute id).
pub(crate) fn rung_of<'s>(
    snap: &'s Snapshot,
    solute_id: &str,
) -> Option<(&'s AcidSystem, &'s Rung)> {
    snap.acids().iter().find_map(|a| {
        a.buffer
            .iter()
            .flat_map(|b| b.rungs.iter())
            .find(|r| r.solute == solute_id)
            .map(|r| (a, r))
    })
}

/// The acids, strong-ion charge and strong-ion ionic strength of the solutes of `m` that
/// `keep` lets through, per kg of the recipe's water.
fn collect<'s>(
    snap: &'s Snapshot,
    m: &Mixture,
    keep: impl Fn(usize) -> bool,
) -> (Vec<Present<'s>>, f64, f64) {
    let mut acids: Vec<Present<'s>> = Vec::new();
    let (mut charge, mut ionic) = (0.0, 0.0);
    for (index, (solute, _)) in m.solutes.iter().enumerate() {
        if !keep(index) {
            continue;
        }
        let mol = m.molality(index);
        if let Some((acid, rung)) = rung_of(snap, &solute.id) {
            match acids.iter_mut().find(|p| p.acid.key == acid.key) {
                Some(p) => p.total += mol * rung.units,
                None => acids.push(Present {
                    acid,
                    total: mol * rung.units,
                }),
            }
            charge += mol * f64::from(rung.charge);
            ionic += 0.5 * mol * f64::from(rung.charge.abs());
        } else if solute.kind == SoluteKind::Salt
            && let Some(ions) = dissociate(&solute.formula)
        {
            ionic += 0.5
                * mol
                * ions
                    .iter()
                    .map(|(ion, n)| f64::from(*n) * f64::from(ion.charge).powi(2))
                    .sum::<f64>();
        }
    }
    (acids, charge, ionic)
}

/// Whether a recipe holding acid-base forms still freezes as salts do, by its solutes' own
/// freezing points: every form in it is the salt of its acid (not the acid or base
/// itself), has a freezing table of its own, and stands alone among its acid's forms (a
/// de-icing brine of potassium acetate or potassium carbonate, whose measured freezing
/// curves answer better than the buffer path's ideal water activity). Its pH on freezing
/// is then not followed.
pub fn freezes_as_salts(snap: &Snapshot, mixture: &Mixture) -> bool {
    let mut acids: Vec<&str> = Vec::new();
    for (solute, _) in &mixture.solutes {
        let Some((acid, rung)) = rung_of(snap, &solute.id) else {
            continue;
        };
        if rung.charge == 0
            || snap.catalog.freezing_of(&solute.id).is_empty()
            || acids.contains(&acid.key.as_str())
        {
            return false;
        }
        acids.push(&acid.key);
    }
    !acids.is_empty()
}

/// The caveat of a recipe that [`freezes_as_salts`].
pub const FROZEN_AS_SALTS: &str = "the recipe's acid-base salts freeze here by their own freezing points, like any salt: the pH of the liquid left as ice forms is not followed (`ph of NAME` gives the recipe's pH as made)";

/// What sets the pH of a mixture: its acids (from the solutes that are forms of a buffer)
/// and its fully dissociated ions. `None` when it holds no acid or water's record is missing.
pub fn solution_of<'s>(snap: &'s Snapshot, mixture: &Mixture) -> Option<Solution<'s>> {
    let water = snap.water()?;
    let (acids, strong_charge, strong_ionic) = collect(snap, mixture, |_| true);
    if acids.is_empty() {
        return None;
    }
    Some(Solution {
        acids,
        strong_charge,
        strong_ionic,
        water,
    })
}

/// The amounts of a buffer's forms that give `n` counter-ion charges per acid unit: the two
/// neighbouring rungs (one when `n` is a rung's own), each in formula units per acid unit.
fn shares(form: &BufferForm, n: f64) -> Option<Vec<(&Rung, f64)>> {
    let rungs = &form.rungs;
    if let Some(r) = rungs
        .iter()
        .find(|r| (r.charge_per_unit() - n).abs() < 1e-9)
    {
        return Some(vec![(r, 1.0 / r.units)]);
    }
    let k = rungs
        .windows(2)
        .position(|w| w[0].charge_per_unit() < n && n < w[1].charge_per_unit())?;
    let (lo, hi) = (&rungs[k], &rungs[k + 1]);
    let x_hi = (n - lo.charge_per_unit()) / (hi.charge_per_unit() - lo.charge_per_unit());
    Some(vec![(lo, (1.0 - x_hi) / lo.units), (hi, x_hi / hi.units)])
}

/// Turns the buffers of `recipe` (ingredients with `at pH`) into their forms. `mixture`,
/// when given, is the recipe as composed by an earlier pass (its molalities and its other
/// solutes' ions set the ionic strength at which the pH is met); without it the buffer is
/// set alone, ideal. `None` when the recipe holds no buffer.
pub fn expand<'s>(
    snap: &'s Snapshot,
    recipe: &Recipe,
    mixture: Option<&Mixture>,
) -> Result<Option<Expanded<'s>>, EvalError> {
    let buffered: Vec<usize> = (0..recipe.ingredients.len())
        .filter(|&i| recipe.ingredients[i].ph.is_some())
        .collect();
    if buffered.is_empty() {
        return Ok(None);
    }
    if let [_, second, ..] = buffered[..] {
        return Err(refuse(
            format!(
                "{} sets two buffers to a pH: a solution has one pH; give one buffer `at pH` and the other by its forms",
                recipe.title()
            ),
            recipe.ingredients[second].span,
        ));
    }
    let index = buffered[0];
    let ingredient = &recipe.ingredients[index];
    let Some(ph) = ingredient.ph else {
        return Ok(None);
    };
    let written = ingredient.solute.text.as_str();
    let Some((acid, form)) = snap.buffer_named(written) else {
        let names = snap.buffer_names();
        let near = names
            .iter()
            .map(|n| {
                (
                    crate::text::edit_distance(&n.to_lowercase(), &written.to_lowercase()),
                    *n,
                )
            })
            .filter(|(d, _)| *d <= 3)
            .min()
            .map(|(_, n)| n);
        return Err(refuse(
            format!(
                "`{written}` is not a buffer the reference knows{}: buffers set by pH are {}",
                near.map_or(String::new(), |n| format!(" (did you mean `{n}`?)")),
                names.join(", ")
            ),
            ingredient.solute.span,
        ));
    };
    let unit = ingredient.amount.unit;
    let molar = unit.is_molar();
    if !molar {
        return Err(refuse(
            format!(
                "give a buffer's amount in mol units (mM, mol/L, mmol/kg ...): a mass of `{written}` would not say of which of its forms"
            ),
            ingredient.amount.span,
        ));
    }
    if ingredient.amount.value <= 0.0 {
        return Err(refuse(
            format!("a buffer of no `{written}` sets no pH: give its amount"),
            ingredient.amount.span,
        ));
    }
    let Some(water) = snap.water() else {
        return Err(refuse(
            "the reference holds no record of water's ionization: no pH can be worked out".into(),
            ph.span,
        ));
    };
    // The buffer's acid per kg of water and everything else in the recipe, from the earlier
    // pass; a first pass takes the amount as if per kg of water, alone.
    let from_buffer = |m: &Mixture, i: usize| {
        let (solute, name) = &m.solutes[i];
        name.span == ingredient.solute.span && form.rungs.iter().any(|r| r.solute == solute.id)
    };
    let solution = match mixture {
        Some(m) => {
            let (mut acids, strong_charge, strong_ionic) = collect(snap, m, |i| !from_buffer(m, i));
            let total: f64 = (0..m.solutes.len())
                .filter(|&i| from_buffer(m, i))
                .map(|i| {
                    let units = form
                        .rungs
                        .iter()
                        .find(|r| r.solute == m.solutes[i].0.id)
                        .map_or(1.0, |r| r.units);
                    m.molality(i) * units
                })
                .sum();
            match acids.iter_mut().find(|p| p.acid.key == acid.key) {
                Some(p) => p.total += total,
                None => acids.insert(0, Present { acid, total }),
            }
            Solution {
                acids,
                strong_charge,
                strong_ionic,
                water,
            }
        }
        None => Solution {
            acids: vec![Present {
                acid,
                total: ingredient.amount.value * molar_scale(unit),
            }],
            strong_charge: 0.0,
            strong_ionic: 0.0,
            water,
        },
    };
    let total = solution
        .acids
        .iter()
        .find(|p| p.acid.key == acid.key)
        .map_or(0.0, |p| p.total);
    let (extra, set) = charge_for_ph(&solution, ph.value, SET_T_K)
        .map_err(|e| refuse(format!("{written} at pH {}: {e}", ph.value), ph.span))?;
    let n = if total > 0.0 { extra / total } else { 0.0 };
    let Some(parts) = shares(form, n) else {
        let name = |r: Option<&Rung>| {
            r.and_then(|r| snap.catalog.solute(&r.solute))
                .map_or_else(String::new, |s| s.name.clone())
        };
        return Err(refuse(
            format!(
                "pH {} is beyond what {written} can give: its forms in the reference run from {} to {}",
                ph.value,
                name(form.rungs.first()),
                name(form.rungs.last())
            ),
            ph.span,
        ));
    };
    let mut expanded = recipe.clone();
    let mut made = Vec::new();
    let mut replacement = Vec::new();
    for (rung, per_unit) in parts {
        let name = snap
            .catalog
            .solute(&rung.solute)
            .map_or(rung.solute.clone(), |s| s.name.clone());
        let amount = ingredient.amount.value * per_unit;
        made.push((name.clone(), amount));
        replacement.push(crate::query::Ingredient {
            amount: crate::query::Loading {
                value: amount,
                ..ingredient.amount
            },
            solute: Name {
                text: name,
                span: ingredient.solute.span,
            },
            span: ingredient.span,
            ph: None,
        });
    }
    expanded.ingredients.splice(index..=index, replacement);
    // A buffer is made up where its pH is set: per-litre amounts are per litre at 25 °C
    // unless the recipe says otherwise.
    let volume_set = expanded.volume_at.is_none()
        && expanded
            .ingredients
            .iter()
            .any(|i| i.amount.unit.needs_density());
    if volume_set {
        expanded.volume_at = Some(crate::query::Temperature {
            value: 25.0,
            unit: crate::science::units::TemperatureUnit::Celsius,
            span: ph.span,
        });
    }
    Ok(Some(Expanded {
        recipe: expanded,
        buffers: vec![BufferUse {
            acid,
            form,
            written: written.to_string(),
            ph: ph.value,
            parts: made,
            unit,
            ionic_strength: set.ionic_strength,
            volume_set,
        }],
    }))
}

/// mol/kg (or mol/L, taken per kg in a first pass) in a molar unit.
fn molar_scale(unit: CompositionUnit) -> f64 {
    match unit {
        CompositionUnit::MillimolesPerKilogram | CompositionUnit::MillimolesPerLitre => 1e-3,
        CompositionUnit::MicromolesPerKilogram | CompositionUnit::MicromolesPerLitre => 1e-6,
        _ => 1.0,
    }
}

/// The caveat saying what a buffer became.
pub fn made_of(b: &BufferUse) -> String {
    let parts: Vec<String> = b
        .parts
        .iter()
        .map(|(name, amount)| format!("{} {} {name}", shown(*amount, 4), b.unit.symbol()))
        .collect();
    format!(
        "{} at pH {} is made of {}: the shares that give that pH at 25 C with the rest of the recipe present (ionic strength {} mol/kg); from here on the recipe holds those solutes",
        b.written,
        b.ph,
        parts.join(" and "),
        shown(b.ionic_strength, 3)
    ) + if b.volume_set {
        "; the recipe's per-litre amounts are per litre at 25 C, where the buffer is set (write `volume at T` to choose)"
    } else {
        ""
    }
}

/// The species of each acid of a speciation, as `H2PO4- 21.2%, HPO4-2 78.8%` (those at
/// 0.1 % or more).
fn species_text(solution: &Solution, speciation: &Speciation) -> String {
    let mut all = Vec::new();
    for (p, fractions) in solution.acids.iter().zip(&speciation.fractions) {
        for (species, f) in p.acid.species.iter().zip(fractions) {
            let pct = round_significant(f * 100.0, 3);
            if pct >= 0.1 {
                all.push(format!("{species} {pct}%"));
            }
        }
    }
    all.join(", ")
}

/// One row: the pH of `solution` at `t_k`, its ionic strength and species.
pub fn ph_row(
    solution: &Solution,
    t_k: f64,
    quantity: &'static str,
) -> Result<(Row, Speciation), String> {
    let s = solve(solution, t_k).map_err(|e| e.to_string())?;
    let row = Row {
        quantity: Some(quantity.into()),
        value: Some(round_significant(s.ph, 4)),
        unit: Some("pH".into()),
        basis: Some(Basis::Computed),
        temperature_c: Some(celsius(t_k)),
        extra: [
            (
                "ionic_strength_mol_per_kg".to_string(),
                json!(round_significant(s.ionic_strength, 3)),
            ),
            ("species".to_string(), json!(species_text(solution, &s))),
        ]
        .into_iter()
        .collect(),
        ..Row::default()
    };
    Ok((row, s))
}

/// `ph of RECIPE from T1 to T2 [every STEP]`: the pH at each end and at every multiple of
/// 5 °C between (or every STEP, as a solubility table's), the amounts fixed, and the change
/// over the range.
pub fn ph_over(
    snap: &Snapshot,
    mixture: &Mixture,
    (temperatures, every): (&Temperatures, Option<TemperatureStep>),
    extrapolate: bool,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let span = temperatures.span();
    let Some(solution) = solution_of(snap, mixture) else {
        return Err(refuse(
            "this recipe holds no acid or base the reference has constants for: no pH is worked out (a buffer is written `10 mM sodium phosphate at pH 7.4`)".into(),
            span,
        ));
    };
    let (t1, t2) = bounds(temperatures);
    let (lo, hi) = solution.acids.iter().fold(
        (solution.water.t_min_k, solution.water.t_max_k),
        |(lo, hi), p| (lo.max(p.acid.t_min_k), hi.min(p.acid.t_max_k)),
    );
    let outside = t1 < lo - 1e-9 || t2 > hi + 1e-9;
    if outside && !extrapolate {
        return Err(refuse(
            format!(
                "the acid-base constants are evaluated from {} C to {} C: ask within it, or add `extrapolate`",
                celsius(lo),
                celsius(hi)
            ),
            span,
        ));
    }
    if t1 < crate::science::freezing::ICE_POINT - 1e-9 {
        return Err(refuse(
            "below 0 C the recipe may freeze: ask `freezing of NAME at T` for the pH of the liquid left".into(),
            span,
        ));
    }
    let temps = match (temperatures, every) {
        (Temperatures::Range(r), Some(step)) => crate::engine::table::temperatures(r, Some(step))?,
        (Temperatures::At(_), Some(step)) => {
            return Err(crate::engine::table::step_without_a_range(step));
        }
        (_, None) => {
            let mut temps = vec![t1];
            let mut step = ((celsius(t1) / 5.0).floor() + 1.0) * 5.0;
            while step + 273.15 < t2 - 1e-9 {
                temps.push(step + 273.15);
                step += 5.0;
            }
            if t2 > t1 {
                temps.push(t2);
            }
            temps
        }
    };
    let mut first = None;
    let mut last = None;
    let mut beyond = false;
    for &t in &temps {
        let (row, s) = ph_row(&solution, t, "pH").map_err(|e| refuse(e, span))?;
        beyond |= s.beyond_davies;
        first.get_or_insert(s.ph);
        last = Some(s.ph);
        answer.rows.push(row);
    }
    if let (Some(a), Some(b)) = (first, last)
        && temps.len() > 1
    {
        answer.rows.push(Row {
            quantity: Some(format!("pH change from {} C to {} C", celsius(t1), celsius(t2)).into()),
            value: Some(round_significant(b - a, 3)),
            unit: Some("pH".into()),
            basis: Some(Basis::Computed),
            ..Row::default()
        });
    }
    if outside {
        answer.caveat(format!(
            "extrapolated: the acid-base constants are evaluated from {} C to {} C",
            celsius(lo),
            celsius(hi)
        ));
    }
    if beyond {
        answer.caveat(format!(
            "ionic strength above {DAVIES_MAX_I} mol/kg: the Davies coefficients are taken at {DAVIES_MAX_I}, so the pH is rougher there"
        ));
    }
    answer.caveat("the amounts are fixed as the recipe was made (a sealed container): the pH moves only by the temperature dependence of the constants and activities");
    answer.caveat(PH_CAVEAT);
    for p in &solution.acids {
        cite_acid(snap, p.acid, answer);
    }
    cite_acid(snap, solution.water, answer);
    Ok(())
}

/// Cites an acid-base record's source.
pub fn cite_acid(snap: &Snapshot, acid: &AcidSystem, answer: &mut Answer) {
    crate::engine::common::cite_source(snap, &acid.source, answer);
}
