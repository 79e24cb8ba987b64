//! `freezing of RECIPE at -20 C`: the freeze-concentration path of a recipe of salts. Ice
//! takes water out of the liquid until the liquid's water activity matches ice's; a salt
//! crystallises when its saturation index reaches 0 (Pitzer's equations for the liquid,
//! each salt's solubility product from its own pure-water curve). The answer gives the ice
//! line, the ice and salts out at the temperature, the liquid left and its ions, and the
//! first salt to crystallise from the concentrating liquid. A recipe of one solute that no
//! parameter system covers at the temperature is answered from that solute's own freezing
//! data instead ([`as_its_solute`]); a recipe of several from each solute's own freezing
//! points and curve ([`crate::engine::mixture_ice::freezing_at`]).

use crate::answer::{Answer, Basis, ICE_ROW, Row};
use crate::engine::common::{celsius, value};
use crate::engine::error::EvalError;
use crate::engine::freeze_rows::PathRows;
use crate::engine::mixture::{Ask, EachOnItsOwn, IceLine, Mixture, SolidModel};
use crate::engine::pitzer_solids::{PitzerSolids, choose, ice_line_of};
use crate::engine::snapshot::Snapshot;
use crate::query::{Freezing, Loading, Options, Recipe, Span, Temperature};
use crate::science::activity::freeze::{Candidate, Frozen, freeze};
use crate::science::activity::ice::ln_water_activity_of_ice;
use crate::science::bisect::first_going_down;
use crate::science::formula::molar_mass;
use crate::science::freezing::ICE_POINT;
use crate::science::units::CompositionUnit;

/// What was asked: of which recipe, at which temperature (K), written where.
pub struct Asked<'r> {
    pub recipe: &'r Recipe,
    pub at: f64,
    pub span: Span,
}

fn refuse(message: String, span: Span) -> EvalError {
    EvalError::Unanswerable { message, span }
}

/// `freezing of SOLUTE at LOADING [at T]` for the one solute of a recipe, `why` said first
/// in a note: the solute's own freezing answer (its ice line and eutectic), the loading
/// being the recipe's in g/100g water. The answer carries the solute's cautions.
fn as_its_solute(
    snap: &Snapshot,
    (mixture, title): (&Mixture, &str),
    at: Option<f64>,
    why: &str,
    options: &Options,
    span: Span,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let Some((solute, name)) = mixture.solutes.first() else {
        return Err(refuse(format!("{title} holds no solute"), span));
    };
    let loading = 100.0 * mixture.per_water(0);
    answer.caveat(format!(
        "{title} holds one solute, {} ({} g/100g water){why}: answered from its own freezing data",
        name.text,
        value(loading)
    ));
    let statement = alone_at(solute, loading, at, options, span);
    crate::engine::freezing::freezing(snap, &statement, answer)
}

/// `freezing of RECIPE` without a temperature: where the recipe as made starts to freeze.
/// A recipe of one solute is answered as `freezing of SOLUTE at LOADING`; a mixture by the
/// water activity of Pitzer's equations where a parameter system holds all its salts below
/// 0 °C, else by the ideal dilute formula while it is dilute, else refused with the reason;
/// a recipe with an acid or base is sent to `freezing of NAME at T` (its own path).
pub fn onset(
    snap: &Snapshot,
    mixture: &Mixture,
    recipe: &Recipe,
    options: &Options,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let span = recipe.span;
    let title = recipe.title();
    if crate::engine::buffer::solution_of(snap, mixture).is_some() {
        if !crate::engine::buffer::freezes_as_salts(snap, mixture) {
            return Err(refuse(
                format!(
                    "{title} holds an acid or base: give the freezer's temperature, `freezing of NAME at -20 C`, which follows the liquid and its pH as ice forms and says where ice appears"
                ),
                span,
            ));
        }
        answer.caveat(crate::engine::buffer::FROZEN_AS_SALTS);
    }
    if mixture.solutes.len() == 1 {
        return as_its_solute(snap, (mixture, &title), None, "", options, span, answer);
    }
    let mut ask = Ask {
        snap,
        mixture,
        options,
        answer,
    };
    // Pitzer's ice line where a system holds the salts below 0 °C, else the ideal one.
    let by_pitzer = choose(snap, mixture, None, options.extrapolate)
        .ok()
        .and_then(|model| match model.ice_line(&mut ask) {
            IceLine::At { t_k, how, .. } => Some((t_k, how, model)),
            IceLine::NotEvaluated(_) => None,
        });
    let t_k = match by_pitzer {
        Some((t_k, how, model)) => {
            for index in 0..mixture.solutes.len() {
                model.cite(&mut ask, index)?;
            }
            ask.answer.caveat(how);
            ask.answer.caveat(model.caveat());
            t_k
        }
        None => match EachOnItsOwn.ice_line(&mut ask) {
            IceLine::At { t_k, how, .. } => {
                ask.answer.caveat(how);
                t_k
            }
            IceLine::NotEvaluated(why) => {
                return Err(refuse(
                    format!("where {title} starts to freeze is not known: {why}"),
                    span,
                ));
            }
        },
    };
    let answer = ask.answer;
    answer.rows.push(Row {
        solute: Some(title),
        quantity: Some(ICE_ROW.into()),
        value: Some(celsius(t_k)),
        unit: Some("C".into()),
        basis: Some(Basis::Computed),
        ..Row::default()
    });
    answer.caveat("ask `freezing of NAME at T` for the ice, the salts and the liquid left at a freezer's temperature");
    answer.caveat(crate::engine::CAUTION);
    Ok(())
}

/// `freezing of SOLUTE at LOADING [at T]` for the one solute of a recipe, its loading in
/// g/100g water; every span points at `span` (the recipe may be written elsewhere).
fn alone_at(
    solute: &crate::model::Solute,
    loading: f64,
    at: Option<f64>,
    options: &Options,
    span: Span,
) -> Freezing {
    Freezing {
        solute: crate::query::Name {
            text: solute.id.clone(),
            span,
        },
        loading: Loading {
            value: loading,
            unit: CompositionUnit::GramsPer100gWater,
            span,
        },
        temperature: at.map(|t_k| Temperature {
            value: t_k,
            unit: crate::science::units::TemperatureUnit::Kelvin,
            span,
        }),
        unit: None,
        options: *options,
    }
}

/// A salt that may crystallise at a temperature: its solute's index, its solubility
/// product and the phase its curve names there.
struct Salt {
    index: usize,
    candidate: Candidate,
    phase: String,
}

/// Solutes whose solid cannot be said at a temperature, by index, with the reason.
type Skipped = Vec<(usize, String)>;

/// The salts that may crystallise at `t_k`, and the solutes that cannot be said there.
fn candidates(
    model: &PitzerSolids,
    ask: &Ask,
    t_k: f64,
) -> Result<(Vec<Salt>, Skipped), EvalError> {
    let c = model
        .coefficients(t_k)
        .map_err(|m| refuse(m, Span::default()))?;
    let mut salts = Vec::new();
    let mut skipped = Vec::new();
    for index in 0..ask.mixture.solutes.len() {
        match model.product(ask, index, t_k, &c) {
            Ok(p) => salts.push(Salt {
                index,
                candidate: Candidate {
                    solid: p.solid,
                    ln_k: p.ln_k,
                },
                phase: p.phase,
            }),
            Err(e) => skipped.push((index, e.to_string())),
        }
    }
    Ok((salts, skipped))
}

/// The freeze-concentration equilibrium at `t_k` with the salts that may crystallise there
/// (`None` when it cannot be settled, e.g. below the eutectic).
fn state_at(
    model: &PitzerSolids,
    ask: &Ask,
    t_k: f64,
) -> Result<Option<(Frozen, Vec<Salt>)>, EvalError> {
    let c = model
        .coefficients(t_k)
        .map_err(|m| refuse(m, Span::default()))?;
    let (salts, _) = candidates(model, ask, t_k)?;
    let cands: Vec<Candidate> = salts.iter().map(|s| s.candidate).collect();
    Ok(
        freeze(&c, &model.ions, ln_water_activity_of_ice(t_k), &cands)
            .ok()
            .map(|f| (f, salts)),
    )
}

/// The salt crystallised most in `state`, as its solute's index and phase.
fn most(state: &(Frozen, Vec<Salt>)) -> Option<(usize, String)> {
    let (f, salts) = state;
    f.crystallised
        .iter()
        .zip(salts)
        .filter(|(p, _)| **p > 0.0)
        .max_by(|a, b| a.0.total_cmp(b.0))
        .map(|(_, s)| (s.index, s.phase.clone()))
}

/// Where something first comes out on cooling from 0 °C to `bottom` (K), along the
/// freeze-concentration path: ice (`true`) or a salt (`false`).
fn first_out(
    model: &PitzerSolids,
    ask: &Ask,
    bottom: f64,
    ice: bool,
) -> Result<Option<f64>, EvalError> {
    let out = |t: f64| -> Result<bool, EvalError> {
        Ok(state_at(model, ask, t)?.is_some_and(|s| {
            if ice {
                s.0.ice_kg > 0.0
            } else {
                most(&s).is_some()
            }
        }))
    };
    first_going_down(ICE_POINT, bottom, 0.5, 1e-3, out)
}

/// Answers `freezing of RECIPE at T`, with the cautions.
pub fn freezing(
    snap: &Snapshot,
    mixture: &Mixture,
    options: &Options,
    asked: Asked,
    answer: &mut Answer,
) -> Result<(), EvalError> {
    let (t, span, title) = (asked.at, asked.span, asked.recipe.title());
    if t >= ICE_POINT {
        return Err(refuse(
            format!(
                "no ice forms at or above 0 C; ask `which solids form in NAME from T1 to T2` for {title} above freezing"
            ),
            span,
        ));
    }
    let model = match choose(snap, mixture, Some((t, ICE_POINT)), options.extrapolate) {
        Ok(model) => model,
        Err(_) if mixture.solutes.len() == 1 => {
            let why =
                ", and no parameter system of Pitzer's equations covers it at this temperature";
            return as_its_solute(snap, (mixture, &title), Some(t), why, options, span, answer);
        }
        Err(note) => {
            let mut ask = Ask {
                snap,
                mixture,
                options,
                answer,
            };
            if let Some(note) = &note {
                ask.answer.caveat(note.clone());
            }
            // Refused: why Pitzer's equations could not be used is said too (it may name
            // `extrapolate`).
            return crate::engine::mixture_ice::freezing_at(&mut ask, &title, t, span).map_err(
                |e| match (e, note) {
                    (EvalError::Unanswerable { message, span }, Some(note)) => {
                        refuse(format!("{message}; {note}"), span)
                    }
                    (e, _) => e,
                },
            );
        }
    };
    let mut ask = Ask {
        snap,
        mixture,
        options,
        answer,
    };
    // The ice line of the recipe as made (before any salt comes out), and where ice and the
    // first salt appear along the path.
    let ice_line = ice_line_of(&model, &model.ions).map_err(|m| refuse(m, span))?;
    let ice_from = first_out(&model, &ask, t, true)?;
    let c = model.coefficients(t).map_err(|m| refuse(m, span))?;
    let (salts, skipped) = candidates(&model, &ask, t)?;
    let cands: Vec<Candidate> = salts.iter().map(|s| s.candidate).collect();
    let frozen = freeze(&c, &model.ions, ln_water_activity_of_ice(t), &cands)
        .map_err(|e| refuse(format!("{title} at {} C: {e}", celsius(t)), span))?;
    let first = first_out(&model, &ask, t, false)?;
    let first_which = match first {
        Some(t_first) => state_at(&model, &ask, (t_first - 1e-3).max(t))?
            .as_ref()
            .and_then(most),
        None => None,
    };
    for index in 0..mixture.solutes.len() {
        model.cite(&mut ask, index)?;
    }
    // Per kg of the recipe's water at the start the recipe weighs 1/water kg.
    let rows = PathRows {
        recipe_kg: 1.0 / mixture.water(),
        t_k: t,
    };
    let answer = &mut *ask.answer;
    answer
        .rows
        .push(rows.ice(frozen.ice_kg, Some(ice_line), ice_from));
    for (index, (solute, _)) in mixture.solutes.iter().enumerate() {
        if let Some((_, why)) = skipped.iter().find(|(i, _)| *i == index) {
            answer.rows.push(PathRows::not_said(&solute.name, why));
        } else if let Some((k, salt)) = salts.iter().enumerate().find(|(_, s)| s.index == index) {
            let mol = frozen.crystallised.get(k).copied().unwrap_or(0.0);
            answer
                .rows
                .push(rows.crystallised(&solute.name, mol, solute.molar_mass, &salt.phase));
        } else {
            answer.rows.push(Row {
                solute: Some(solute.name.clone()),
                quantity: Some("crystallised".into()),
                ..Row::default()
            });
        }
    }
    let mut liquid_kg = frozen.water_kg;
    for (i, (symbol, z)) in model.system.ions.iter().enumerate() {
        if model.ions.get(i).copied().unwrap_or(0.0) == 0.0 {
            continue;
        }
        let m = frozen.liquid.get(i).copied().unwrap_or(0.0);
        liquid_kg += m * frozen.water_kg * molar_mass(symbol).unwrap_or(0.0) / 1000.0;
        let sign = if *z > 0 { "+" } else { "-" };
        let charge = if z.abs() > 1 {
            format!("{}{sign}", z.abs())
        } else {
            sign.to_string()
        };
        answer
            .rows
            .push(rows.in_liquid(format!("{symbol}{charge}"), m));
    }
    answer
        .rows
        .push(rows.liquid(&title, liquid_kg, Some(frozen.ln_water.exp())));
    match (first, first_which) {
        (Some(t_first), Some((index, phase))) => answer.rows.push(PathRows::first(
            mixture.solutes.get(index).map(|(s, _)| s.name.clone()),
            Some(phase),
            t_first,
        )),
        _ => answer.caveat(format!(
            "no salt {}crystallises from the recipe between 0 C and {} C",
            if skipped.is_empty() {
                ""
            } else {
                "of those evaluated "
            },
            celsius(t)
        )),
    }
    answer.caveat(format!(
        "`ice_line_c`: where the recipe as made starts to freeze ({} C); `ice_from_c`: where ice appears on the path, after any salt that comes out first. Below it ice takes water out of the liquid until the liquid's water activity matches ice's; a salt crystallises when its saturation index reaches 0",
        celsius(ice_line)
    ));
    answer.caveat(model.caveat());
    answer.caveat("amounts per anhydrous salt; equilibrium assumed (a real freezer can supercool, or trap brine in the ice)");
    answer.caveat(crate::engine::CAUTION);
    Ok(())
}
