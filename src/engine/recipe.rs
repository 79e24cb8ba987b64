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
use crate::engine::common::{bounds, celsius, phase_caveat, resolve, value};
use crate::engine::error::EvalError;
use crate::engine::mixture::{IceLine, Mixture, SolidModel, model_for};
use crate::engine::per_litre::{self, DEFAULT_VOLUME_T_K, Solution, Volume};
use crate::engine::snapshot::Snapshot;
use crate::model::{Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::{Loading, Options, Recipe, RecipeQuestion, RecipeStatement, Span};
use crate::science::enthalpy::dissociate;
use crate::science::freezing::ICE_POINT;
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

/// Answers a statement about a recipe.
pub fn recipe(snap: &Snapshot, s: &RecipeStatement, answer: &mut Answer) -> Result<(), EvalError> {
    match &s.question {
        RecipeQuestion::Define => define(snap, s, answer),
        RecipeQuestion::Require {
            temperatures,
            margin,
        } => {
            let (t1, t2) = bounds(temperatures);
            let margin = margin.map_or(0.0, |m| m.percent / 100.0);
            require(snap, s, t1, t2, margin, temperatures.span(), answer)
        }
        RecipeQuestion::SolidsForm { temperatures } => {
            let (t1, t2) = bounds(temperatures);
            solids_form(snap, s, t1, t2, answer)
        }
        RecipeQuestion::Saturation { unit } => saturation(
            snap,
            s,
            unit.map_or(TemperatureUnit::Celsius, |u| u.unit),
            answer,
        ),
        RecipeQuestion::Describe { at } => describe(snap, s, at.map(|t| t.kelvin()), answer),
    }
}

fn closing_caveats(model: &dyn SolidModel, answer: &mut Answer) {
    answer.caveat(model.caveat());
    answer.caveat(CAUTION);
}

fn solute_row(solute: &Solute, quantity: &'static str) -> Row {
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some(quantity.into()),
        ..Row::default()
    }
}

/// `let eyewash = recipe ...`: the ingredients as read, each per kg of the recipe's water.
fn define(snap: &Snapshot, s: &RecipeStatement, answer: &mut Answer) -> Result<(), EvalError> {
    let composed = compose(snap, &s.recipe, &s.options, answer)?;
    let mixture = &composed.mixture;
    for (index, ((solute, _), ingredient)) in mixture
        .solutes
        .iter()
        .zip(&s.recipe.ingredients)
        .enumerate()
    {
        let mut row = solute_row(solute, "ingredient");
        row.value = Some(value(ingredient.amount.value));
        row.unit = Some(ingredient.amount.unit.symbol().into());
        row.basis = Some(Basis::Computed);
        row.extra = BTreeMap::from([
            (
                "g_per_100g_water".to_string(),
                json!(value(mixture.per_water(index) * 100.0)),
            ),
            (
                "recipe".to_string(),
                json!(s.recipe.name.as_ref().map(|n| n.text.clone())),
            ),
        ]);
        answer.rows.push(row);
    }
    answer.caveat("ask `describe NAME` for the composition in every basis, `require NAME stays dissolved from T1 to T2` to check it");
    Ok(())
}

/// The loading of solute `index` per 100 g of the mixture's water, for rows.
fn loading_row_extra(
    mixture: &Mixture,
    index: usize,
    margin: f64,
) -> BTreeMap<String, serde_json::Value> {
    BTreeMap::from([
        (
            "loading_g_per_100g_water".to_string(),
            json!(value(mixture.per_water(index) * 100.0)),
        ),
        (
            "margin_pct".to_string(),
            json!(round_significant(margin * 100.0, 4)),
        ),
    ])
}

/// The ice line's part of a range reaching below 0 °C: whether ice forms in it (a row and a
/// caveat), or a refusal when it cannot be said.
fn ice_in_range(
    model: &dyn SolidModel,
    mixture: &Mixture,
    t1: f64,
    span: Span,
    answer: &mut Answer,
) -> Result<bool, EvalError> {
    if t1 >= ICE_POINT {
        return Ok(false);
    }
    match model.ice_line(mixture) {
        IceLine::At { t_k, how } => {
            answer.caveat(how);
            let forms = t_k > t1;
            answer.rows.push(Row {
                solute: Some("ice".into()),
                quantity: Some("ice appears on cooling below".into()),
                value: Some(celsius(t_k)),
                unit: Some("C".into()),
                basis: Some(Basis::Computed),
                holds: Some(!forms),
                ..Row::default()
            });
            Ok(forms)
        }
        IceLine::NotEvaluated(why) => Err(EvalError::Unanswerable {
            message: format!(
                "the range reaches below 0 C, where ice may form, and {why}; ask from 0 C up"
            ),
            span,
        }),
    }
}

/// `require eyewash stays dissolved from 2 C to 8 C margin 10%`.
fn require(
    snap: &Snapshot,
    s: &RecipeStatement,
    t1: f64,
    t2: f64,
    margin: f64,
    span: Span,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let composed = compose(snap, &s.recipe, &s.options, answer)?;
    let mixture = &composed.mixture;
    let model = model_for(snap, mixture);
    let ice = ice_in_range(model, mixture, t1, span, answer)?;
    let mut all_hold = !ice;
    for index in 0..mixture.solutes.len() {
        let solute = mixture.solutes[index].0;
        let screening =
            model.stays_dissolved(snap, mixture, index, t1, t2, margin, &s.options, answer)?;
        all_hold &= screening.holds;
        let r = screening.limiting_mass_fraction / (1.0 - screening.limiting_mass_fraction);
        answer.rows.push(Row {
            value: Some(value(r * 100.0)),
            unit: Some(CompositionUnit::GramsPer100gWater.symbol().into()),
            basis: Some(Basis::from(screening.basis)),
            phase: Some(screening.phase.clone()),
            temperature_c: Some(celsius(screening.limiting_t_k)),
            holds: Some(screening.holds),
            headroom_pct: screening
                .headroom_pct
                .is_finite()
                .then(|| (screening.headroom_pct * 10.0).round() / 10.0),
            extra: loading_row_extra(mixture, index, margin),
            ..solute_row(solute, "solubility at the limiting temperature")
        });
        phase_caveat(&screening.phase, answer);
    }
    answer.holds = Some(all_hold);
    answer.caveat(format!(
        "amounts and solubilities per 100 g of the water of {} (the solutes' own water share of the solution)",
        s.recipe.title()
    ));
    if margin > 0.0 {
        answer.caveat(format!(
            "margin {}%: each solubility must exceed its solute's amount by that share of its solute-to-water ratio",
            round_significant(margin * 100.0, 4)
        ));
    }
    if !all_hold {
        answer.shortfall = crate::engine::solid::shortfall(&answer.rows);
    }
    closing_caveats(model, answer);
    Ok(())
}

/// `which solids form in eyewash from -5 C to 25 C`: for each solute whether its solid
/// appears in the range and below (or above) which temperature; ice below 0 °C.
fn solids_form(
    snap: &Snapshot,
    s: &RecipeStatement,
    t1: f64,
    t2: f64,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let composed = compose(snap, &s.recipe, &s.options, answer)?;
    let mixture = &composed.mixture;
    let model = model_for(snap, mixture);
    if t1 < ICE_POINT {
        match model.ice_line(mixture) {
            IceLine::At { t_k, how } => {
                answer.caveat(how);
                answer.rows.push(Row {
                    solute: Some("ice".into()),
                    quantity: Some("solid".into()),
                    phase: Some("ice".into()),
                    temperature_c: Some(celsius(t_k)),
                    holds: Some(t_k <= t1),
                    extra: BTreeMap::from([(
                        "forms".to_string(),
                        json!(if t_k > t1 {
                            format!("below {} C", celsius(t_k))
                        } else {
                            "no".to_string()
                        }),
                    )]),
                    ..Row::default()
                });
            }
            IceLine::NotEvaluated(why) => answer.rows.push(Row {
                solute: Some("ice".into()),
                quantity: Some("solid".into()),
                phase: Some("ice".into()),
                extra: BTreeMap::from([
                    ("forms".to_string(), json!("not evaluated")),
                    ("reason".to_string(), json!(why)),
                ]),
                ..Row::default()
            }),
        }
    }
    for index in 0..mixture.solutes.len() {
        let solute = mixture.solutes[index].0;
        let screening =
            match model.stays_dissolved(snap, mixture, index, t1, t2, 0.0, &s.options, answer) {
                Ok(screening) => screening,
                Err(e) => {
                    answer.rows.push(Row {
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
            model.saturation(snap, mixture, index, &s.options, answer)?
        };
        let inside: Vec<_> = crossings
            .iter()
            .filter(|c| c.t_k >= t1 && c.t_k <= t2)
            .collect();
        let forms = if screening.holds {
            "no".to_string()
        } else if inside.is_empty() {
            "over the whole range".to_string()
        } else {
            inside
                .iter()
                .map(|c| {
                    format!(
                        "{} {} C",
                        if c.rising { "below" } else { "above" },
                        celsius(c.t_k)
                    )
                })
                .collect::<Vec<_>>()
                .join(" and ")
        };
        answer.rows.push(Row {
            phase: Some(screening.phase.clone()),
            temperature_c: Some(celsius(screening.limiting_t_k)),
            basis: Some(Basis::from(screening.basis)),
            holds: Some(screening.holds),
            headroom_pct: screening
                .headroom_pct
                .is_finite()
                .then(|| (screening.headroom_pct * 10.0).round() / 10.0),
            extra: BTreeMap::from([
                ("forms".to_string(), json!(forms)),
                (
                    "loading_g_per_100g_water".to_string(),
                    json!(value(mixture.per_water(index) * 100.0)),
                ),
            ]),
            ..solute_row(solute, "solid")
        });
        phase_caveat(&screening.phase, answer);
    }
    answer.caveat(
        "`holds` says the solid does not form; `temperature_c` is where each solute comes closest to saturation in the range",
    );
    closing_caveats(model, answer);
    Ok(())
}

/// `saturation of eyewash`: each solute's saturation temperatures at its amount per kg of
/// the recipe's water.
fn saturation(
    snap: &Snapshot,
    s: &RecipeStatement,
    unit: TemperatureUnit,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let composed = compose(snap, &s.recipe, &s.options, answer)?;
    let mixture = &composed.mixture;
    let model = model_for(snap, mixture);
    for index in 0..mixture.solutes.len() {
        let solute = mixture.solutes[index].0;
        let crossings = model.saturation(snap, mixture, index, &s.options, answer)?;
        if crossings.is_empty() {
            answer.rows.push(Row {
                extra: BTreeMap::from([(
                    "crystals".to_string(),
                    json!("no saturation temperature within the data"),
                )]),
                ..solute_row(solute, "saturation temperature")
            });
        }
        for crossing in crossings {
            let t = unit.from_kelvin(crossing.t_k);
            phase_caveat(&crossing.phase, answer);
            answer.rows.push(Row {
                value: Some((t * 100.0).round() / 100.0 + 0.0),
                unit: Some(unit.symbol().into()),
                basis: Some(Basis::Computed),
                phase: Some(crossing.phase),
                extra: BTreeMap::from([(
                    "crystals".to_string(),
                    json!(if crossing.rising {
                        "below this temperature"
                    } else {
                        "above this temperature"
                    }),
                )]),
                ..solute_row(solute, "saturation temperature")
            });
        }
    }
    closing_caveats(model, answer);
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
    snap: &Snapshot,
    s: &RecipeStatement,
    at_k: Option<f64>,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let composed = compose(snap, &s.recipe, &s.options, answer)?;
    let mixture = &composed.mixture;
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
    let span = s.recipe.span;
    let density = match solution.density(snap, CompositionUnit::GramsPerLitre, span) {
        Ok(rho) => Some(rho),
        Err(e) => {
            answer.caveat(format!("no per-litre amounts: {e}"));
            None
        }
    };
    for index in 0..mixture.solutes.len() {
        let solute = mixture.solutes[index].0;
        let mut extra = BTreeMap::from([
            (
                "g_per_100g_water".to_string(),
                json!(value(mixture.per_water(index) * 100.0)),
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
                let amount = solution.amount(snap, index, unit, span, answer)?;
                extra.insert(key.to_string(), json!(amount));
            }
        }
        answer.rows.push(Row {
            basis: Some(Basis::Computed),
            extra,
            ..solute_row(solute, "composition")
        });
    }
    let ionic = ionic_strength(mixture, answer);
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
    answer.rows.push(Row {
        solute: Some(s.recipe.title()),
        quantity: Some("solution".into()),
        basis: Some(Basis::Computed),
        extra,
        ..Row::default()
    });
    answer.caveat(
        "ionic strength with every salt fully dissociated (ideal): ion pairs and partly dissociated ions such as H2PO4- are not accounted for",
    );
    if !composed.per_litre && density.is_some() {
        answer.caveat("per-litre amounts use the solution's density at the temperature named; the recipe itself is given by mass");
    }
    Ok(())
}
