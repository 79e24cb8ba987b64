//! Statements about recipes: binding one, `require NAME stays dissolved ...`, `which solids
//! form in NAME ...`, `saturation of NAME` and `describe NAME`.
//!
//! Every answer first solves the recipe's composition ([`compose`]: each amount, per-litre
//! ones through the whole recipe's density, becomes a mass fraction of the solution), then
//! asks the mixture's [`SolidModel`](crate::engine::mixture::SolidModel) about solids, and
//! carries that model's caveat.

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Answer, Basis, Row};
use crate::engine::CAUTION;
use crate::engine::buffer;
use crate::engine::common::{bounds, celsius, phase_caveat, resolve, value};
use crate::engine::error::EvalError;
use crate::engine::miscible::miscible_named;
use crate::engine::mixture::{Ask, Limits, Mixture, SolidModel, model_for};
use crate::engine::per_litre::{self, DEFAULT_VOLUME_T_K, Solution, Volume};
use crate::engine::recipe_ice::{above_the_ice, ice_in_range, ice_row};
use crate::engine::snapshot::Snapshot;
use crate::model::{Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::{Loading, Options, Recipe, RecipeQuestion, RecipeStatement, Span};
use crate::science::enthalpy::dissociate;
use crate::science::freezing::ICE_POINT;
use crate::science::solve::{Crossing, Screening};
use crate::science::units::{CompositionUnit, TemperatureUnit};

/// A recipe's solved composition.
struct Composed<'a> {
    mixture: Mixture<'a>,
    volume: Volume,
    /// True when some amount was per litre (so a density was used).
    per_litre: bool,
}

/// The hydrate a solute was named by (`Na2HPO4·12H2O`), when it is one: mass units are
/// refused for it in a recipe (the amount would count the water of crystallisation).
fn refuse_hydrate_mass(
    name: &crate::query::Name,
    solute: &Solute,
    amount: &Loading,
) -> Result<(), EvalError> {
    let Some((hydrate, _)) = crate::engine::basis::named_hydrate(name, solute) else {
        return Ok(());
    };
    let molar = matches!(
        amount.unit,
        CompositionUnit::Molality
            | CompositionUnit::MillimolesPerKilogram
            | CompositionUnit::MicromolesPerKilogram
            | CompositionUnit::MolesPerLitre
            | CompositionUnit::MillimolesPerLitre
            | CompositionUnit::MicromolesPerLitre
    );
    if molar {
        return Ok(());
    }
    Err(EvalError::Unanswerable {
        message: format!(
            "in a recipe a mass of {hydrate} would count its water of crystallisation: give {} by its anhydrous formula {} (see `convert ... of {} as {hydrate} to ...`) or in mol units",
            solute.name, solute.formula, solute.formula
        ),
        span: amount.span,
    })
}

/// Solves the recipe's composition: every solute found (or the nearest names offered),
/// none twice, each amount a mass fraction of the solution; per-litre amounts are per litre
/// at the recipe's volume temperature, through the whole recipe's density.
fn compose<'a>(
    snap: &'a Snapshot,
    recipe: &Recipe,
    options: &Options,
    answer: &mut Answer,
) -> Result<Composed<'a>, EvalError> {
    let title = recipe.title();
    if recipe.ingredients.is_empty() {
        return Err(EvalError::Unanswerable {
            message: format!("{title} has no ingredients"),
            span: recipe.span,
        });
    }
    let mut solutes: Vec<&Solute> = Vec::with_capacity(recipe.ingredients.len());
    for ingredient in &recipe.ingredients {
        let solute = resolve(snap, &ingredient.solute).map_err(|e| match e {
            EvalError::UnknownSolute { message, span } => EvalError::UnknownSolute {
                message: format!("in {title}: {message}"),
                span,
            },
            other => other,
        })?;
        if let Some(earlier) = recipe
            .ingredients
            .iter()
            .zip(&solutes)
            .find(|(_, s)| s.id == solute.id)
        {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "{} is in {title} twice (as `{}` and `{}`): give one amount per solute",
                    solute.name, earlier.0.solute.text, ingredient.solute.text
                ),
                span: ingredient.solute.span,
            });
        }
        if solute.kind == SoluteKind::Gas {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "{} is a gas: its amount in a solution depends on its pressure above it; a recipe holds solids and liquids (ask `dissolved {} at 25 C under air`)",
                    solute.name, solute.formula
                ),
                span: ingredient.solute.span,
            });
        }
        refuse_hydrate_mass(&ingredient.solute, solute, &ingredient.amount)?;
        solutes.push(solute);
    }
    let per_litre = recipe
        .ingredients
        .iter()
        .any(|i| i.amount.unit.needs_density());
    let volume = Volume {
        t_k: recipe.volume_at.map_or(DEFAULT_VOLUME_T_K, |t| t.kelvin()),
        stated: recipe.volume_at.is_some(),
        unit_density: options.assume_unit_density,
        reviewed_only: options.reviewed_only,
    };
    if let (Some(t), false) = (recipe.volume_at, per_litre) {
        answer.caveat(format!(
            "`volume at {} C` changes nothing here: no amount of {title} is per litre",
            celsius(t.kelvin())
        ));
    }
    let parts: Vec<(&Solute, &Loading)> = solutes
        .iter()
        .copied()
        .zip(recipe.ingredients.iter().map(|i| &i.amount))
        .collect();
    let solution = per_litre::solution(snap, &parts, &volume, answer)?;
    Ok(Composed {
        mixture: Mixture {
            solutes: solutes
                .into_iter()
                .zip(recipe.ingredients.iter().map(|i| i.solute.clone()))
                .collect(),
            ws: solution.ws,
        },
        volume,
        per_litre,
    })
}

/// The faults of a recipe read from a file that can be found before it is used: a solute
/// the reference does not know (with the nearest names) or one named twice.
pub fn file_faults(snap: &Snapshot, recipe: &Recipe) -> Vec<EvalError> {
    let mut faults = Vec::new();
    let mut seen: Vec<(&str, &str)> = Vec::new();
    for ingredient in &recipe.ingredients {
        match resolve(snap, &ingredient.solute) {
            Ok(solute) => {
                if let Some((_, first)) = seen.iter().find(|(id, _)| *id == solute.id) {
                    faults.push(EvalError::Unanswerable {
                        message: format!(
                            "{} is in {} twice (as `{first}` and `{}`): give one amount per solute",
                            solute.name,
                            recipe.title(),
                            ingredient.solute.text
                        ),
                        span: ingredient.solute.span,
                    });
                }
                seen.push((&solute.id, &ingredient.solute.text));
            }
            Err(e) => faults.push(e),
        }
    }
    faults
}

/// A buffer set to a pH turned into its forms (`None` when the recipe has none): a first
/// pass sets it alone, a second with the rest of the recipe's ions present (the ionic
/// strength moves the shares a little).
fn expanded<'s>(
    snap: &'s Snapshot,
    recipe: &Recipe,
    options: &Options,
    answer: &Answer,
) -> Result<Option<buffer::Expanded<'s>>, EvalError> {
    match buffer::expand(snap, recipe, None)? {
        None => Ok(None),
        Some(first) => {
            let mut scratch = answer.clone();
            let pass = compose(snap, &first.recipe, options, &mut scratch)?;
            buffer::expand(snap, recipe, Some(&pass.mixture))
        }
    }
}

/// Says what each buffer set to a pH was made of, and cites its constants.
fn buffers_made_of(snap: &Snapshot, expanded: &Option<buffer::Expanded>, answer: &mut Answer) {
    for b in expanded.iter().flat_map(|e| &e.buffers) {
        answer.caveat(buffer::made_of(b));
        buffer::cite_acid(snap, b.acid, answer);
    }
}

/// The recipe's solved composition, a buffer set to a pH turned into its forms: what a
/// statement about something else in the recipe's liquid (a dissolved gas) reads.
pub fn mixture_of<'s>(
    snap: &'s Snapshot,
    recipe: &Recipe,
    options: &Options,
    answer: &mut Answer,
) -> Result<Mixture<'s>, EvalError> {
    let expanded = expanded(snap, recipe, options, answer)?;
    let composed = compose(
        snap,
        expanded.as_ref().map_or(recipe, |e| &e.recipe),
        options,
        answer,
    )?;
    buffers_made_of(snap, &expanded, answer);
    Ok(composed.mixture)
}

/// Answers a statement about a recipe: solves its composition once, then asks the
/// mixture's model.
pub fn recipe(snap: &Snapshot, s: &RecipeStatement, answer: &mut Answer) -> Result<(), EvalError> {
    let expanded = expanded(snap, &s.recipe, &s.options, answer)?;
    let recipe = expanded.as_ref().map_or(&s.recipe, |e| &e.recipe);
    let composed = compose(snap, recipe, &s.options, answer)?;
    buffers_made_of(snap, &expanded, answer);
    if let RecipeQuestion::Ph {
        temperatures,
        every,
    } = &s.question
    {
        buffer::ph_over(
            snap,
            &composed.mixture,
            (temperatures, *every),
            s.options.extrapolate,
            answer,
        )?;
        answer.caveat(CAUTION);
        return Ok(());
    }
    if let RecipeQuestion::Freezing { at } = &s.question {
        let Some(at) = at else {
            // Where the recipe as made starts to freeze.
            return crate::engine::freeze_recipe::onset(
                snap,
                &composed.mixture,
                recipe,
                &s.options,
                answer,
            );
        };
        // A recipe with an acid or base: its own path, with the pH of the liquid left.
        if buffer::solution_of(snap, &composed.mixture).is_some() {
            if !buffer::freezes_as_salts(snap, &composed.mixture) {
                return crate::engine::buffer_freeze::freezing(
                    snap,
                    &composed.mixture,
                    at.kelvin(),
                    at.span,
                    answer,
                );
            }
            answer.caveat(buffer::FROZEN_AS_SALTS);
        }
        let asked = crate::engine::freeze_recipe::Asked {
            recipe,
            at: at.kelvin(),
            span: at.span,
        };
        return crate::engine::freeze_recipe::freezing(
            snap,
            &composed.mixture,
            &s.options,
            asked,
            answer,
        );
    }
    if expanded.is_some() {
        answer.caveat(buffer::PH_CAVEAT);
    }
    let range = match &s.question {
        RecipeQuestion::Require { temperatures, .. }
        | RecipeQuestion::SolidsForm { temperatures } => Some(bounds(temperatures)),
        _ => None,
    };
    let chosen = model_for(snap, &composed.mixture, range, s.options.extrapolate);
    let model = chosen.model.as_ref();
    let mut ask = Ask {
        snap,
        mixture: &composed.mixture,
        options: &s.options,
        answer,
    };
    let limits = |temperatures: &crate::query::Temperatures, margin: f64| {
        let (t1, t2) = bounds(temperatures);
        Limits { t1, t2, margin }
    };
    match &s.question {
        RecipeQuestion::Define => return define(&mut ask, recipe),
        RecipeQuestion::Describe { at } => {
            return describe(&mut ask, recipe, &composed, at.map(|t| t.kelvin()));
        }
        RecipeQuestion::Require {
            temperatures,
            margin,
        } => {
            let margin = margin.map_or(0.0, |m| m.percent / 100.0);
            let at = limits(temperatures, margin);
            require(&mut ask, model, recipe, at, temperatures.span())?;
        }
        RecipeQuestion::SolidsForm { temperatures } => {
            solids_form(&mut ask, model, limits(temperatures, 0.0))?;
        }
        // Answered above, before a model is chosen.
        RecipeQuestion::Freezing { .. } | RecipeQuestion::Ph { .. } => {}
        RecipeQuestion::Saturation { unit } => {
            let unit = unit.map_or(TemperatureUnit::Celsius, |u| u.unit);
            saturation(&mut ask, model, unit)?;
        }
    }
    if let Some(note) = chosen.note {
        answer.caveat(note);
    }
    answer.caveat(model.caveat());
    answer.caveat(CAUTION);
    Ok(())
}

pub(super) fn solute_row(solute: &Solute, quantity: &'static str) -> Row {
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some(quantity.into()),
        ..Row::default()
    }
}

/// Headroom for a row, to 0.1 %; none for a zero amount (it holds without limit).
fn headroom(screening: &Screening) -> Option<f64> {
    let pct = screening.headroom_pct;
    pct.is_finite().then(|| (pct * 10.0).round() / 10.0)
}

/// Grams of solute `index` per 100 g of the mixture's water, for rows.
fn per_100g_water(mixture: &Mixture, index: usize) -> serde_json::Value {
    json!(value(mixture.per_water(index) * 100.0))
}

/// `let eyewash = recipe ...`: the ingredients as read, each per 100 g of the recipe's
/// water.
fn define(ask: &mut Ask, recipe: &Recipe) -> Result<(), EvalError> {
    let mixture = ask.mixture;
    for (index, ((solute, _), ingredient)) in
        mixture.solutes.iter().zip(&recipe.ingredients).enumerate()
    {
        let mut row = solute_row(solute, "ingredient");
        row.value = Some(value(ingredient.amount.value));
        row.unit = Some(ingredient.amount.unit.symbol().into());
        row.basis = Some(Basis::Computed);
        row.extra = BTreeMap::from([
            (
                "g_per_100g_water".to_string(),
                per_100g_water(mixture, index),
            ),
            (
                "recipe".to_string(),
                json!(recipe.name.as_ref().map(|n| n.text.clone())),
            ),
        ]);
        ask.answer.rows.push(row);
    }
    ask.answer.caveat("ask `describe NAME` for the composition in every basis, `require NAME stays dissolved from T1 to T2` to check it");
    Ok(())
}

/// `require eyewash stays dissolved from 2 C to 8 C margin 10%`.
fn require(
    ask: &mut Ask,
    model: &dyn SolidModel,
    recipe: &Recipe,
    at: Limits,
    span: Span,
) -> Result<(), EvalError> {
    let ice = ice_in_range(ask, model, at.t1, span)?;
    let mut all_hold = ice.is_none();
    let above_ice = above_the_ice(ask.answer, at, ice);
    for index in 0..ask.mixture.solutes.len() {
        let solute = ask.mixture.solutes[index].0;
        if miscible_named(
            ask,
            solute,
            "solubility at the limiting temperature",
            "forms",
        ) {
            continue;
        }
        let screening = match model.check(ask, index, above_ice) {
            Ok(screening) => screening,
            // Ice forms in the range: the requirement fails whatever this solute does, so a
            // solute that cannot be checked down to the ice line is named, not a refusal.
            Err(e) if ice.is_some() => {
                crate::engine::freezing::unchecked_above_ice(solute, &e, ask.answer);
                continue;
            }
            Err(e) => return Err(e),
        };
        all_hold &= screening.holds;
        let r = screening.limiting_mass_fraction / (1.0 - screening.limiting_mass_fraction);
        phase_caveat(&screening.phase, ask.answer);
        ask.answer.rows.push(Row {
            value: Some(value(r * 100.0)),
            unit: Some(CompositionUnit::GramsPer100gWater.symbol().into()),
            basis: Some(screening.basis),
            temperature_c: Some(celsius(screening.limiting_t_k)),
            holds: Some(screening.holds),
            headroom_pct: headroom(&screening),
            extra: BTreeMap::from([
                (
                    "loading_g_per_100g_water".to_string(),
                    per_100g_water(ask.mixture, index),
                ),
                (
                    "margin_pct".to_string(),
                    json!(round_significant(at.margin * 100.0, 4)),
                ),
            ]),
            phase: Some(screening.phase),
            ..solute_row(solute, "solubility at the limiting temperature")
        });
    }
    ask.answer.holds = Some(all_hold);
    ask.answer.caveat(format!(
        "amounts and solubilities per 100 g of the water of {} (the solutes' own water share of the solution)",
        recipe.title()
    ));
    if at.margin > 0.0 {
        ask.answer.caveat(format!(
            "margin {}%: each solubility must exceed its solute's amount by that share of its solute-to-water ratio",
            round_significant(at.margin * 100.0, 4)
        ));
    }
    if !all_hold {
        ask.answer.shortfall = crate::engine::solid::shortfall(&ask.answer.rows);
    }
    Ok(())
}

/// Where a solute's solid appears within the limits, in words: `no`, `over the whole
/// range`, or `below 12.5 C` (`above ...` for a retrograde curve).
fn forms_in(screening: &Screening, crossings: &[Crossing], at: Limits) -> String {
    if screening.holds {
        return "no".to_string();
    }
    let inside: Vec<String> = crossings
        .iter()
        .filter(|c| c.t_k >= at.t1 && c.t_k <= at.t2)
        .map(|c| {
            let side = if c.rising { "below" } else { "above" };
            format!("{side} {} C", celsius(c.t_k))
        })
        .collect();
    if inside.is_empty() {
        "over the whole range".to_string()
    } else {
        inside.join(" and ")
    }
}

/// The first solid to appear on cooling from the top of the range: the highest of the
/// temperatures below which a solid forms (ice included), or the top itself when a solid
/// is there already. `None` when nothing forms in the range.
fn first_on_cooling(rows: &[Row], top_c: f64) -> Option<Row> {
    let mut first: Option<(f64, &Row)> = None;
    for row in rows {
        let Some(forms) = row.extra.get("forms").and_then(|f| f.as_str()) else {
            continue;
        };
        let t = if forms == "over the whole range" {
            Some(top_c)
        } else {
            forms
                .split(" and ")
                .filter_map(|part| part.strip_prefix("below ")?.strip_suffix(" C"))
                .filter_map(|t| t.parse::<f64>().ok())
                .reduce(f64::max)
        };
        if let Some(t) = t {
            if first.is_none_or(|(best, _)| t > best) {
                first = Some((t, row));
            }
        }
    }
    first.map(|(t, row)| Row {
        solute: row.solute.clone(),
        quantity: Some("first solid on cooling".into()),
        phase: row.phase.clone(),
        temperature_c: Some(t),
        ..Row::default()
    })
}

/// `which solids form in eyewash from -5 C to 25 C`: for each solute whether its solid
/// appears in the range and below (or above) which temperature; ice below 0 °C; and the
/// first solid to appear on cooling.
fn solids_form(ask: &mut Ask, model: &dyn SolidModel, at: Limits) -> Result<(), EvalError> {
    let first_row = ask.answer.rows.len();
    let mut checked = at;
    if at.t1 < ICE_POINT {
        let (row, ice) = ice_row(model, ask, at.t1);
        ask.answer.rows.push(row);
        checked = above_the_ice(ask.answer, at, ice);
    }
    for index in 0..ask.mixture.solutes.len() {
        let solute = ask.mixture.solutes[index].0;
        if miscible_named(ask, solute, "solid", "forms") {
            continue;
        }
        let screening = match model.check(ask, index, checked) {
            Ok(screening) => screening,
            Err(e) => {
                ask.answer.rows.push(Row {
                    extra: BTreeMap::from([
                        ("forms".to_string(), json!("not evaluated")),
                        ("reason".to_string(), json!(e.to_string())),
                    ]),
                    ..solute_row(solute, "solid")
                });
                continue;
            }
        };
        let crossings = if screening.holds {
            Vec::new()
        } else {
            model.saturation(ask, index)?
        };
        phase_caveat(&screening.phase, ask.answer);
        ask.answer.rows.push(Row {
            temperature_c: Some(celsius(screening.limiting_t_k)),
            basis: Some(screening.basis),
            holds: Some(screening.holds),
            headroom_pct: headroom(&screening),
            extra: BTreeMap::from([
                (
                    "forms".to_string(),
                    json!(forms_in(&screening, &crossings, checked)),
                ),
                (
                    "loading_g_per_100g_water".to_string(),
                    per_100g_water(ask.mixture, index),
                ),
            ]),
            phase: Some(screening.phase),
            ..solute_row(solute, "solid")
        });
    }
    ask.answer.caveat(
        "`holds` says the solid does not form; `temperature_c` is where each solute comes closest to saturation in the range",
    );
    if let Some(row) = first_on_cooling(&ask.answer.rows[first_row..], celsius(at.t2)) {
        ask.answer.rows.push(row);
        ask.answer.caveat(
            "once the first solid forms the liquid changes; `freezing of NAME at T` follows it below 0 C",
        );
    }
    Ok(())
}

/// `saturation of eyewash`: each solute's saturation temperatures at its amount per kg of
/// the recipe's water.
fn saturation(
    ask: &mut Ask,
    model: &dyn SolidModel,
    unit: TemperatureUnit,
) -> Result<(), EvalError> {
    for index in 0..ask.mixture.solutes.len() {
        let solute = ask.mixture.solutes[index].0;
        if miscible_named(ask, solute, "saturation temperature", "crystals") {
            continue;
        }
        let crossings = model.saturation(ask, index)?;
        if crossings.is_empty() {
            ask.answer.rows.push(Row {
                extra: BTreeMap::from([(
                    "crystals".to_string(),
                    json!("no saturation temperature within the data"),
                )]),
                ..solute_row(solute, "saturation temperature")
            });
        }
        for crossing in crossings {
            let t = unit.from_kelvin(crossing.t_k);
            phase_caveat(&crossing.phase, ask.answer);
            let side = if crossing.rising { "below" } else { "above" };
            ask.answer.rows.push(Row {
                value: Some((t * 100.0).round() / 100.0 + 0.0),
                unit: Some(unit.symbol().into()),
                basis: Some(Basis::Computed),
                phase: Some(crossing.phase),
                extra: BTreeMap::from([(
                    "crystals".to_string(),
                    json!(format!("{side} this temperature")),
                )]),
                ..solute_row(solute, "saturation temperature")
            });
        }
    }
    Ok(())
}

/// Ionic strength, mol/kg, with full dissociation: I = ½ Σ m·Σ ν z². Salts whose ions
/// satline cannot read from the formula are named in a caveat and left out.
fn ionic_strength(mixture: &Mixture, answer: &mut Answer) -> f64 {
    let mut total = 0.0;
    for (index, (solute, _)) in mixture.solutes.iter().enumerate() {
        if solute.kind != SoluteKind::Salt {
            continue;
        }
        match dissociate(&solute.formula) {
            Some(ions) => {
                let z2: f64 = ions
                    .iter()
                    .map(|(ion, n)| f64::from(*n) * f64::from(ion.charge).powi(2))
                    .sum();
                total += 0.5 * mixture.molality(index) * z2;
            }
            None => answer.caveat(format!(
                "ionic strength leaves out {}: its ions are not read from its formula {}",
                solute.name, solute.formula
            )),
        }
    }
    total
}

/// `describe eyewash [at 25 C]`: every solute per kg of water, by mass fraction and per
/// litre at a stated temperature; the solution's density, water share and ionic strength.
fn describe(
    ask: &mut Ask,
    recipe: &Recipe,
    composed: &Composed,
    at_k: Option<f64>,
) -> Result<(), EvalError> {
    let (snap, mixture) = (ask.snap, ask.mixture);
    let mut volume = composed.volume;
    if let Some(t) = at_k {
        volume.t_k = t;
        volume.stated = true;
    }
    let solution = Solution {
        solutes: mixture.solutes.iter().map(|(s, _)| *s).collect(),
        ws: mixture.ws.clone(),
        volume,
    };
    // Per litre only where a density can be had; the reason otherwise, never a guess.
    let span = recipe.span;
    let density = match solution.density(snap, CompositionUnit::GramsPerLitre, span) {
        Ok(rho) => Some(rho),
        Err(e) => {
            ask.answer.caveat(format!("no per-litre amounts: {e}"));
            None
        }
    };
    for index in 0..mixture.solutes.len() {
        let solute = mixture.solutes[index].0;
        let mut extra = BTreeMap::from([
            (
                "g_per_100g_water".to_string(),
                per_100g_water(mixture, index),
            ),
            (
                "mol_per_kg".to_string(),
                json!(value(mixture.molality(index))),
            ),
            (
                "percent_w_w".to_string(),
                json!(value(mixture.ws[index] * 100.0)),
            ),
        ]);
        if density.is_some() {
            for (key, unit) in [
                ("g_per_l", CompositionUnit::GramsPerLitre),
                ("mmol_per_l", CompositionUnit::MillimolesPerLitre),
            ] {
                let amount = solution.amount(snap, index, unit, span, ask.answer)?;
                extra.insert(key.to_string(), json!(amount));
            }
        }
        ask.answer.rows.push(Row {
            basis: Some(Basis::Computed),
            extra,
            ..solute_row(solute, "composition")
        });
    }
    let ionic = ionic_strength(mixture, ask.answer);
    let mut extra = BTreeMap::from([
        (
            "water_percent_w_w".to_string(),
            json!(value(mixture.water() * 100.0)),
        ),
        ("ionic_strength_mol_per_kg".to_string(), json!(value(ionic))),
    ]);
    if let Some(rho) = density {
        extra.insert("density_kg_per_l".into(), json!(round_significant(rho, 5)));
        extra.insert("volume_temperature_c".into(), json!(celsius(volume.t_k)));
    }
    ask.answer.rows.push(Row {
        solute: Some(recipe.title()),
        quantity: Some("solution".into()),
        basis: Some(Basis::Computed),
        extra,
        ..Row::default()
    });
    ask.answer.caveat(
        "ionic strength with every salt fully dissociated (ideal): ion pairs and partly dissociated ions such as H2PO4- are not accounted for",
    );
    if !composed.per_litre && density.is_some() {
        ask.answer.caveat("per-litre amounts use the solution's density at the temperature named; the recipe itself is given by mass");
    }
    Ok(())
}
