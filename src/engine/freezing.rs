//! Statements below 0 °C: `freezing` (the ice line, the first solid, the liquid left as
//! ice forms) and the sub-zero part of `require` (ice before salt, from the eutectic up).

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Answer, Basis, ICE_ROW, Row};
use crate::engine::CAUTION;
use crate::engine::common::{
    celsius, cite_curve, cite_source, cite_typed, curve_error, hazard, in_loading_unit, resolve,
    value,
};
use crate::engine::error::EvalError;
use crate::engine::mixture::Ask;
use crate::engine::snapshot::Snapshot;
use crate::model::{Solute, SoluteKind};
use crate::query::Freezing;
use crate::science::activity::ParameterSet;
use crate::science::freezing::{FirstSolid, IceBasis, IcePoint, System, first_solid_on_cooling};
use crate::science::units::TemperatureUnit;

/// The phase-diagram inputs of a solute: curve, freezing data and model sets.
pub fn system_of<'a>(
    snap: &'a Snapshot,
    solute: &'a Solute,
    reviewed_only: bool,
    models: &'a [&'a ParameterSet],
) -> System<'a> {
    System {
        curve: snap.curve(&solute.id, reviewed_only).map(|b| &b.curve),
        molar_mass: solute.molar_mass,
        ions: solute.ions.max(1),
        data: snap.catalog.freezing_of(&solute.id).into_iter().next(),
        models,
    }
}

fn ice_basis(b: IceBasis) -> Basis {
    match b {
        IceBasis::Tabulated | IceBasis::Eutectic => Basis::Tabulated,
        IceBasis::Interpolated => Basis::Interpolated,
        IceBasis::Model | IceBasis::Ideal => Basis::Computed,
    }
}

/// Cites and explains where an ice line came from.
pub fn ice_caveats(
    snap: &Snapshot,
    system: &System<'_>,
    ice: &IcePoint,
    solute: &Solute,
    answer: &mut Answer,
) {
    match ice.basis {
        IceBasis::Ideal => answer.caveat(format!(
            "ice line from the ideal freezing-point depression ΔT = i·Kf·m with i = {} and Kf = 1.86 K·kg/mol, used only in the dilute limit",
            system.ions
        )),
        IceBasis::Model => {
            if let Some(set) = system
                .models
                .iter()
                .find(|s| Some(&s.key) == ice.model.as_ref())
            {
                cite_source(snap, &set.source, answer);
                answer.caveat(format!(
                    "ice line from the water activity of Pitzer's equations (parameter set {}, {:.0} to {:.0} C) and the ice–water equilibrium",
                    set.key,
                    set.t_min_k - 273.15,
                    set.t_max_k - 273.15
                ));
            }
        }
        IceBasis::Tabulated | IceBasis::Interpolated | IceBasis::Eutectic => {
            if ice.basis == IceBasis::Eutectic {
                answer.caveat(
                    "richer than the eutectic: the salt crystallises first on cooling, and ice appears only at the eutectic temperature",
                );
            }
            if let Some(d) = system.data {
                let typed = "freezing data typed from memory of the cited table";
                cite_typed(snap, &d.source, d.provenance, typed, solute, answer);
            }
        }
    }
}

fn row(solute: &Solute, quantity: &'static str) -> Row {
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some(quantity.into()),
        ..Row::default()
    }
}

/// `freezing of NaCl at 10 g/100g water [at -10 C] [in F]`.
pub fn freezing(snap: &Snapshot, s: &Freezing, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    if solute.kind == SoluteKind::Gas {
        return Err(EvalError::NoData {
            message: format!("{} is a gas: ask `dissolved` for it", solute.name),
            span: s.solute.span,
        });
    }
    let w = crate::engine::basis::loading_on_named_basis(
        snap, &s.solute, &s.loading, solute, &s.options, answer,
    )?;
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, s.options.reviewed_only, &models);
    let unit = s.unit.map_or(TemperatureUnit::Celsius, |u| u.unit);
    let shown = |t_k: f64| (unit.from_kelvin(t_k) * 100.0).round() / 100.0 + 0.0;
    let t_row = |solute: &Solute, quantity: &'static str, t_k: f64, basis: Basis| Row {
        value: Some(shown(t_k)),
        unit: Some(unit.symbol().into()),
        basis: Some(basis),
        ..row(solute, quantity)
    };
    if let Some(d) = system.data
        && system.eutectic().is_some()
    {
        cite_source(snap, &d.source, answer);
    }
    match s.temperature {
        None => {
            if let Some((we, te)) = system.eutectic().filter(|e| w > e.0 + 1e-9) {
                answer
                    .rows
                    .push(t_row(solute, "eutectic", te, Basis::Tabulated));
                answer.caveat(format!(
                    "richer than the eutectic ({} %w/w): the salt crystallises first on cooling, and no ice forms above the eutectic temperature ({} C)",
                    value(we * 100.0),
                    celsius(te)
                ));
            } else {
                let ice = system
                    .ice_line(w)
                    .map_err(|e| curve_error(e, solute, s.loading.span))?;
                answer
                    .rows
                    .push(t_row(solute, ICE_ROW, ice.t_k, ice_basis(ice.basis)));
                ice_caveats(snap, &system, &ice, solute, answer);
            }
        }
        Some(t) => {
            let check = first_solid_on_cooling(&system, w, t.kelvin()).map_err(|e| {
                EvalError::Unanswerable {
                    message: e.to_string(),
                    span: t.span,
                }
            })?;
            if let Some(ice) = &check.ice {
                answer
                    .rows
                    .push(t_row(solute, ICE_ROW, ice.t_k, ice_basis(ice.basis)));
                ice_caveats(snap, &system, ice, solute, answer);
            }
            if let Some(reason) = &check.ice_unknown {
                answer.caveat(format!("{}: {reason}", solute.name));
            }
            if let Some(ts) = check.saturation_t_k {
                answer.rows.push(t_row(
                    solute,
                    "salt crystallises on cooling below",
                    ts,
                    Basis::Computed,
                ));
            }
            if let Some((we, te)) = check.eutectic {
                answer.rows.push(Row {
                    extra: [(
                        "eutectic_g_per_100g_water".to_string(),
                        json!(value(we / (1.0 - we) * 100.0)),
                    )]
                    .into_iter()
                    .collect(),
                    ..t_row(solute, "eutectic", te, Basis::Tabulated)
                });
            }
            let first = match check.first {
                Some(FirstSolid::Ice) => "ice",
                Some(FirstSolid::Salt) => "salt",
                Some(FirstSolid::Both) => "ice and salt together (eutectic)",
                None => "unknown: the data cannot tell",
            };
            answer.rows.push(Row {
                temperature_c: check.first_t_k.map(celsius),
                extra: [
                    ("first".to_string(), json!(first)),
                    ("solid_at_temperature".to_string(), json!(check.solid_at_t)),
                    (
                        "temperature_asked_c".to_string(),
                        json!(celsius(t.kelvin())),
                    ),
                ]
                .into_iter()
                .collect(),
                ..row(solute, "first solid on cooling")
            });
            if let Some(f) = check.freeze_concentration {
                answer.rows.push(Row {
                    value: Some(value(f.ice_fraction_of_water * 100.0)),
                    unit: Some("% of the water".into()),
                    basis: Some(Basis::Computed),
                    temperature_c: Some(celsius(t.kelvin())),
                    extra: [(
                        "ice_pct_of_total_mass".to_string(),
                        json!(value(f.ice_fraction * 100.0)),
                    )]
                    .into_iter()
                    .collect(),
                    ..row(solute, "ice")
                });
                let liquid = in_loading_unit(
                    snap,
                    f.liquid_mass_fraction,
                    &s.loading,
                    solute,
                    &s.options,
                    answer,
                )?;
                answer.rows.push(Row {
                    value: Some(liquid),
                    unit: Some(s.loading.unit.symbol().into()),
                    basis: Some(Basis::Computed),
                    temperature_c: Some(celsius(t.kelvin())),
                    ..row(solute, "liquid left")
                });
                answer.caveat(
                    "freeze concentration: the liquid left lies on the ice line at the asked temperature; the ice share follows from the salt balance (lever rule), at equilibrium",
                );
            }
            if let (Some((_, te)), Some(FirstSolid::Ice)) = (check.eutectic, check.first)
                && !check.below_eutectic
            {
                answer.caveat(format!(
                    "ice forms below {} C; no salt crystallises above the eutectic at {} C",
                    check.first_t_k.map_or(f64::NAN, celsius),
                    celsius(te)
                ));
            }
            if check.below_eutectic {
                answer.caveat(format!(
                    "{} C is below the eutectic: at equilibrium the whole solution is solid",
                    celsius(t.kelvin())
                ));
            }
            if let Some(built) = snap.curve(&solute.id, s.options.reviewed_only) {
                cite_curve(snap, built, solute, answer);
            }
        }
    }
    hazard(solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}

/// Where ice first forms on cooling a solution of `w` (mass fraction) of one solute, for a
/// screening whose range starts below 0 °C: `Ok(Some((t_k, basis)))` when ice forms at `t_k` (the
/// loading's ice line, above the eutectic), `Ok(None)` when no ice forms before the salt
/// (a loading beyond the eutectic's), `Err(reason)` when the ice line is not known.
pub fn ice_onset(
    snap: &Snapshot,
    solute: &Solute,
    w: f64,
    reviewed_only: bool,
) -> Result<Option<(f64, Basis)>, String> {
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, reviewed_only, &models);
    if system.eutectic().is_some_and(|(we, _)| w > we + 1e-9) {
        return Ok(None);
    }
    system
        .ice_line(w)
        .map(|ice| Some((ice.t_k, ice_basis(ice.basis))))
        .map_err(|e| e.to_string())
}

/// Where ice first appears on cooling solute `index` of a mixture alone in the mixture's
/// water, from its freezing data (tabulated ice line, an activity model, or the ideal
/// dilute formula), with the basis of the figure; its sources cited and its method said in
/// the answer. The loading's ice line, or the eutectic for a loading richer than the
/// eutectic's (the salt comes out first); `Err` with the reason when neither is known.
pub fn ice_line_alone(ask: &mut Ask, index: usize) -> Result<(f64, Basis), String> {
    let (snap, mixture) = (ask.snap, ask.mixture);
    let Some((solute, _)) = mixture.solutes.get(index) else {
        return Err("no such solute in the mixture".into());
    };
    let w = mixture.alone(index);
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, ask.options.reviewed_only, &models);
    // `System::ice_line` gives the eutectic itself for a loading richer than the eutectic's.
    let ice = system.ice_line(w).map_err(|e| e.to_string())?;
    ice_caveats(snap, &system, &ice, solute, ask.answer);
    Ok((ice.t_k, ice_basis(ice.basis)))
}

/// A solute whose solid cannot be checked down to the ice line of a requirement where ice
/// forms in the range: the requirement fails whatever the solute does, so it is named with
/// the reason (a row and a caveat) rather than refused.
pub fn unchecked_above_ice(solute: &Solute, why: &EvalError, answer: &mut Answer) {
    answer.rows.push(Row {
        extra: BTreeMap::from([
            ("forms".to_string(), json!("not evaluated")),
            ("reason".to_string(), json!(why.to_string())),
        ]),
        ..row(solute, "solubility at the limiting temperature")
    });
    answer.caveat(format!(
        "{}: its own curve could not be checked down to the ice line (its row gives the reason); ice forms in the range, so the requirement does not hold whatever it does",
        solute.name
    ));
}

/// The sub-zero part of `require`: for a range reaching below 0 °C, the ice line of the
/// loading decides where the liquid stops being the loading's. Returns the temperature
/// from which the salt's own curve must be checked (the ice line, or the range's low end
/// when no ice forms in it) and whether ice forms in the range; adds the rows and caveats.
pub fn require_below_zero(
    snap: &Snapshot,
    solute: &Solute,
    w: f64,
    t1: f64,
    reviewed_only: bool,
    answer: &mut Answer,
) -> Result<(f64, bool), EvalError> {
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, reviewed_only, &models);
    let eutectic = system.eutectic();
    if eutectic.is_some_and(|(we, _)| w > we + 1e-9) {
        // Salt first: the salt's curve decides over the whole range.
        return Ok((t1, false));
    }
    match system.ice_line(w) {
        Ok(ice) => {
            ice_caveats(snap, &system, &ice, solute, answer);
            if ice.t_k <= t1 {
                answer.caveat(format!(
                    "no ice forms in the range: the loading's ice line is at {} C",
                    celsius(ice.t_k)
                ));
                return Ok((t1, false));
            }
            answer.rows.push(Row {
                value: Some(celsius(ice.t_k)),
                unit: Some("C".into()),
                basis: Some(ice_basis(ice.basis)),
                ..row(solute, ICE_ROW)
            });
            match eutectic {
                Some((_, te)) => answer.caveat(format!(
                    "does not hold: ice forms below {} C; no salt crystallises above the eutectic at {} C",
                    celsius(ice.t_k),
                    celsius(te)
                )),
                None => answer.caveat(format!(
                    "does not hold: ice forms below {} C",
                    celsius(ice.t_k)
                )),
            }
            Ok((ice.t_k, true))
        }
        Err(e) => {
            if t1 < 273.15 {
                answer.caveat(format!("whether ice forms in the range is not known: {e}"));
            }
            Ok((t1, false))
        }
    }
}
