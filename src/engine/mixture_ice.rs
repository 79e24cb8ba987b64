//! A recipe of several solutes below 0 °C where no parameter system of Pitzer's equations
//! holds them all: its ice line and its freeze-concentration path from each solute's own
//! freezing points by the Zdanovskii–Stokes–Robinson rule
//! ([`crate::science::mixture_ice`]), each solid from its own curve in pure water.

use crate::answer::{Answer, Basis};
use crate::engine::common::{celsius, cite_curve, cite_typed, curve_error, miscible};
use crate::engine::error::EvalError;
use crate::engine::freeze_rows::PathRows;
use crate::engine::freezing::system_of;
use crate::engine::mixture::{Ask, IceLine, Mixture, particles_per_unit};
use crate::engine::snapshot::Snapshot;
use crate::number::round_significant;
use crate::query::{Options, Span};
use crate::science::activity::ParameterSet;
use crate::science::activity::ice::ln_water_activity_of_ice;
use crate::science::bisect::first_going_down;
use crate::science::formula::parse_formula;
use crate::science::freezing::{ICE_POINT, molality, within_dilute_limit};
use crate::science::mixture_ice::{
    Alone, Frozen, MixtureIce, Part, Solid, freeze_at, ice_line as zsr_ice_line,
};

/// The caveat of an ice line found this way; the figures are those of
/// `tests/mixture_ice.rs::the_rule_beside_pitzers_equations_for_chloride_pairs`.
pub const METHOD: &str = "ice line of the mixture by the Zdanovskii–Stokes–Robinson rule (Stokes & Robinson 1966): it starts to freeze at the temperature T where Σ mᵢ/mᵢ*(T) = 1, mᵢ being each solute's molality in the recipe's water and mᵢ*(T) the molality at which that solute alone in water freezes at T, read from its own freezing points (a solute without them, present only in the dilute limit, counted as ideal); it leaves out how the solutes act on each other: fed the curves of NaCl, KCl and MgCl2 alone from Pitzer's equations (pytzer), it gave the same equations' ice line of their mixtures down to -9 C to within 0.06 K (largest difference 0.050 K); other pairs, and a salt beside a glycol, not checked";

/// The activity-model sets of each solute of `mixture` (the systems borrow them).
fn models_of<'s>(snap: &'s Snapshot, mixture: &Mixture) -> Vec<Vec<&'s ParameterSet>> {
    mixture
        .solutes
        .iter()
        .map(|(s, _)| snap.models_for(&s.formula))
        .collect()
}

/// Each solute read alone in water: from its freezing points, or as ideal within the
/// dilute limit; else the reason.
fn parts_of<'a>(
    snap: &'a Snapshot,
    mixture: &'a Mixture,
    options: &Options,
    models: &'a [Vec<&'a ParameterSet>],
) -> Result<Vec<Part<'a>>, String> {
    let mut parts = Vec::with_capacity(mixture.solutes.len());
    for (i, ((solute, name), sets)) in mixture.solutes.iter().zip(models).enumerate() {
        let molality = mixture.molality(i);
        let ions = particles_per_unit(solute);
        let system = system_of(snap, solute, options.reviewed_only, sets);
        let alone = if system.has_table() {
            Alone::Table(system)
        } else if within_dilute_limit(f64::from(ions) * molality) {
            Alone::Ideal { ions }
        } else {
            let only = if system.eutectic().is_some() {
                " (its eutectic only)"
            } else {
                ""
            };
            return Err(format!(
                "{} has no freezing points in the reference{only} and stands beyond the dilute limit in the recipe ({} mol/kg of dissolved particles), so the ice line of the mixture cannot be read from the solutes' own freezing points",
                name.text,
                round_significant(f64::from(ions) * molality, 3)
            ));
        };
        parts.push(Part { alone, molality });
    }
    Ok(parts)
}

/// Cites the freezing points the parts are read from.
fn cite_tables(snap: &Snapshot, mixture: &Mixture, parts: &[Part], answer: &mut Answer) {
    for ((solute, _), part) in mixture.solutes.iter().zip(parts) {
        if let Alone::Table(system) = part.alone
            && let Some(d) = system.data
        {
            let typed = "freezing data typed from memory of the cited table";
            cite_typed(snap, &d.source, d.provenance, typed, solute, answer);
        }
    }
}

/// Why the ice line lies out of reach, for [`MixtureIce::Below`].
fn below(mixture: &Mixture, t_k: f64, limit: usize) -> String {
    let who = mixture
        .solutes
        .get(limit)
        .map_or_else(String::new, |(_, n)| n.text.clone());
    format!(
        "by the solutes' own freezing points the mixture is still liquid at {} C, where those of {who} end, and its ice line lies lower, where they cannot follow it",
        celsius(t_k)
    )
}

/// The ZSR ice line of `ask`'s recipe, with its freezing points cited; not evaluated, with
/// the reason, where a solute has no freezing points beyond the dilute limit or the line
/// lies below where a solute's points end.
pub fn ice_line(ask: &mut Ask) -> IceLine {
    let (snap, mixture) = (ask.snap, ask.mixture);
    let models = models_of(snap, mixture);
    let parts = match parts_of(snap, mixture, ask.options, &models) {
        Ok(parts) => parts,
        Err(why) => return IceLine::NotEvaluated(why),
    };
    match zsr_ice_line(&parts) {
        Ok(MixtureIce::At(t_k)) => {
            cite_tables(snap, mixture, &parts, ask.answer);
            IceLine::At {
                t_k,
                basis: Basis::Computed,
                how: METHOD.into(),
            }
        }
        Ok(MixtureIce::Below { t_k, limit }) => IceLine::NotEvaluated(below(mixture, t_k, limit)),
        Err(e) => IceLine::NotEvaluated(format!(
            "the ice line of the mixture from the solutes' own freezing points: {e}"
        )),
    }
}

/// The caveat of the freeze path.
pub const PATH: &str = "below the ice line ice takes water out of the liquid until, by the same rule, the liquid's water activity is ice's; a solute crystallises where its amount in the water left passes its own solubility in pure water at that temperature (with its hydrate's water; the common-ion effect and other interactions between solutes not accounted for)";

/// Each solute's solid at `t_k` from its own curve (`None`: a miscible liquid, or no
/// reading there, with the reason in `why`).
fn solids_at(
    ask: &Ask,
    t_k: f64,
    mut why: Option<&mut Vec<Option<String>>>,
) -> Vec<Option<(Solid, String)>> {
    let (snap, mixture, options) = (ask.snap, ask.mixture, ask.options);
    let mut out = Vec::with_capacity(mixture.solutes.len());
    for (solute, name) in &mixture.solutes {
        let reading = if miscible(snap, solute) {
            Err("mixes with water in all proportions (miscible): no solid".to_string())
        } else {
            crate::engine::common::curve_of(snap, solute, name, options)
                .map_err(|e| e.to_string())
                .and_then(|built| {
                    built
                        .curve
                        .evaluate(t_k, options.extrapolate)
                        .map_err(|e| curve_error(e, solute, name.span).to_string())
                })
                .map(|ev| {
                    let hydrate_water = parse_formula(&ev.phase)
                        .map(|f| f.hydrate_water())
                        .unwrap_or(0.0);
                    let solubility = molality(ev.mass_fraction, solute.molar_mass);
                    (
                        Solid {
                            solubility,
                            hydrate_water,
                        },
                        ev.phase,
                    )
                })
        };
        if let Some(why) = why.as_deref_mut() {
            why.push(reading.as_ref().err().cloned());
        }
        out.push(reading.ok());
    }
    out
}

/// The state at `t_k` with the solids read there.
fn state_at(ask: &Ask, parts: &[Part], t_k: f64) -> Result<Frozen, String> {
    let solids: Vec<Option<Solid>> = solids_at(ask, t_k, None)
        .into_iter()
        .map(|s| s.map(|(solid, _)| solid))
        .collect();
    freeze_at(parts, &solids, t_k).map_err(|e| e.to_string())
}

/// Where something first comes out on cooling from 0 °C to `bottom` (K): ice
/// (`ice = true`) or any solute's solid; scanned 0.25 K apart, then bisected to 1e-3 K.
fn first_out(ask: &Ask, parts: &[Part], bottom: f64, ice: bool) -> Result<Option<f64>, String> {
    first_going_down(ICE_POINT, bottom, 0.25, 1e-3, |t| {
        let f = state_at(ask, parts, t)?;
        Ok(if ice {
            f.ice_kg > 0.0
        } else {
            f.crystallised.iter().any(|x| *x > 0.0)
        })
    })
}

/// `freezing of RECIPE at T` for a recipe of several solutes no parameter system holds
/// there: the ice line and the path by the ZSR rule, each solid from its own curve.
pub fn freezing_at(ask: &mut Ask, title: &str, t_k: f64, span: Span) -> Result<(), EvalError> {
    let (snap, mixture) = (ask.snap, ask.mixture);
    let refuse = |message: String| EvalError::Unanswerable { message, span };
    let models = models_of(snap, mixture);
    let parts = parts_of(snap, mixture, ask.options, &models)
        .map_err(|why| refuse(format!("the freezing of {title} is not known here: {why}")))?;
    let ice_line = match zsr_ice_line(&parts) {
        Ok(MixtureIce::At(t)) => Some(t),
        // Still liquid at the temperature asked: no ice there; the line itself lies lower.
        Ok(MixtureIce::Below { t_k: floor, limit }) if floor <= t_k => {
            ask.answer.caveat(below(mixture, floor, limit));
            None
        }
        Ok(MixtureIce::Below { t_k: floor, limit }) => {
            return Err(refuse(format!(
                "the freezing of {title} at {} C is not known here: {}",
                celsius(t_k),
                below(mixture, floor, limit)
            )));
        }
        Err(e) => {
            return Err(refuse(format!(
                "the freezing of {title} is not known here: {e}"
            )));
        }
    };
    // Below where a solute's freezing points end the rule cannot be read, once ice is there.
    let (floor_k, limit) = crate::science::mixture_ice::floor(&parts)
        .map_err(|e| refuse(format!("the freezing of {title} is not known here: {e}")))?;
    if t_k < floor_k && ice_line.is_some() {
        let who = mixture
            .solutes
            .get(limit)
            .map_or_else(String::new, |(_, n)| n.text.clone());
        return Err(refuse(format!(
            "the freezing of {title} at {} C is not known here: ice forms below {} C, and the liquid left can be followed only down to {} C, where the freezing points of {who} end",
            celsius(t_k),
            ice_line.map_or_else(String::new, |t| celsius(t).to_string()),
            celsius(floor_k)
        )));
    }
    let mut why = Vec::new();
    let solids = solids_at(ask, t_k, Some(&mut why));
    let plain: Vec<Option<Solid>> = solids.iter().map(|s| s.as_ref().map(|(x, _)| *x)).collect();
    let frozen = freeze_at(&parts, &plain, t_k)
        .map_err(|e| refuse(format!("{title} at {} C: {e}", celsius(t_k))))?;
    let ice_from = first_out(ask, &parts, t_k, true).map_err(refuse)?;
    let first = first_out(ask, &parts, t_k, false).map_err(refuse)?;
    let first_which = match first {
        Some(t_first) => state_at(ask, &parts, (t_first - 1e-3).max(t_k))
            .ok()
            .and_then(|f| {
                f.crystallised
                    .iter()
                    .enumerate()
                    .filter(|(_, x)| **x > 0.0)
                    .max_by(|a, b| a.1.total_cmp(b.1))
                    .map(|(i, _)| i)
            }),
        None => None,
    };
    cite_tables(snap, mixture, &parts, ask.answer);
    for (i, (solute, name)) in mixture.solutes.iter().enumerate() {
        if plain.get(i).copied().flatten().is_some()
            && let Ok(built) = crate::engine::common::curve_of(snap, solute, name, ask.options)
        {
            cite_curve(snap, built, solute, ask.answer);
        }
    }
    let rows = PathRows {
        recipe_kg: 1.0 / mixture.water(),
        t_k,
    };
    let answer = &mut *ask.answer;
    answer
        .rows
        .push(rows.ice(frozen.ice_kg, ice_line, ice_from));
    let mut liquid_kg = frozen.water_kg;
    for (i, (solute, _)) in mixture.solutes.iter().enumerate() {
        answer
            .rows
            .push(match solids.get(i).and_then(|s| s.as_ref()) {
                Some((_, phase)) => {
                    let mol = frozen.crystallised.get(i).copied().unwrap_or(0.0);
                    rows.crystallised(&solute.name, mol, solute.molar_mass, phase)
                }
                None => PathRows::not_said(
                    &solute.name,
                    why.get(i).cloned().flatten().as_deref().unwrap_or_default(),
                ),
            });
        let m = frozen.liquid.get(i).copied().unwrap_or(0.0);
        liquid_kg += m * frozen.water_kg * solute.molar_mass / 1000.0;
        answer.rows.push(rows.in_liquid(solute.name.clone(), m));
    }
    let water_activity = (frozen.ice_kg > 0.0).then(|| ln_water_activity_of_ice(t_k).exp());
    answer
        .rows
        .push(rows.liquid(title, liquid_kg, water_activity));
    match (first, first_which) {
        (Some(t_first), Some(index)) => answer.rows.push(PathRows::first(
            mixture.solutes.get(index).map(|(s, _)| s.name.clone()),
            state_phase(&solids, index),
            t_first,
        )),
        _ => answer.caveat(format!(
            "no solid but ice comes out of the recipe between 0 C and {} C{}",
            celsius(t_k),
            if why.iter().any(Option::is_some) {
                " among the solutes whose solubility could be read there (the others, their rows say why, are taken to stay dissolved)"
            } else {
                ""
            }
        )),
    }
    if let Some(line) = ice_line {
        answer.caveat(format!(
            "`ice_line_c`: where the recipe as made starts to freeze ({} C); `ice_from_c`: where ice appears on the path, after any solid that comes out first",
            celsius(line)
        ));
    }
    answer.caveat(METHOD);
    answer.caveat(PATH);
    answer.caveat("amounts per anhydrous solute; equilibrium assumed (a real freezer can supercool, or trap brine in the ice)");
    answer.caveat(crate::engine::CAUTION);
    Ok(())
}

/// The phase of solute `index` as read at the asked temperature.
fn state_phase(solids: &[Option<(Solid, String)>], index: usize) -> Option<String> {
    solids
        .get(index)
        .and_then(|s| s.as_ref())
        .map(|(_, p)| p.clone())
}
