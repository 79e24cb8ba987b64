//! Statements about gases: dissolved amount at a temperature and pressure, and a gas's heat
//! of solution.

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Answer, Basis, Row};
use crate::engine::CAUTION;
use crate::engine::common::{
    basis_caveat, celsius, celsius_text, cite_typed, hazard, resolve, value,
};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::model::{GasConstant, GasFit, GasLaw, Review, Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::{DissolvedGas, GasPressure, HeatOfSolution, Options, Span};
use crate::science::bounds;
use crate::science::gas::{self as science_gas, Dissolved, STANDARD_ATMOSPHERE};
use crate::science::units::CompositionUnit;

/// The Henry's-law records of a gas, best first: multi-term fits before single van 't Hoff
/// constants (a fit follows the curvature of ln H against 1/T), reviewed before unreviewed.
pub(crate) fn laws<'a>(
    snap: &'a Snapshot,
    solute: &Solute,
    options: &Options,
) -> Vec<&'a GasConstant> {
    let mut laws: Vec<&GasConstant> = snap
        .catalog
        .gas_constants_of(&solute.id)
        .into_iter()
        .filter(|g| g.review != Review::Rejected)
        .filter(|g| !options.reviewed_only || g.review == Review::Reviewed)
        .collect();
    laws.sort_by_key(|g| {
        (
            matches!(g.law, GasLaw::VantHoff(_)),
            g.review != Review::Reviewed,
            g.key.clone(),
        )
    });
    laws
}

pub(crate) fn gas_of<'a>(
    snap: &'a Snapshot,
    name: &crate::query::Name,
) -> Result<&'a Solute, EvalError> {
    let solute = resolve(snap, name)?;
    if solute.kind != SoluteKind::Gas {
        return Err(EvalError::NoData {
            message: format!(
                "{} is not a gas; ask `solubility of {} at 20 C`",
                solute.name, solute.formula
            ),
            span: name.span,
        });
    }
    Ok(solute)
}

/// Evaluates the best record that gives a value inside its range, or, with `extrapolate`,
/// the best record outside it.
fn evaluate<'a>(
    laws: &[&'a GasConstant],
    solute: &Solute,
    t_k: f64,
    partial_pa: f64,
    extrapolate: bool,
    span: Span,
) -> Result<(Dissolved, &'a GasConstant), EvalError> {
    let mut outside = None;
    let mut last_error = None;
    for law in laws {
        match science_gas::dissolved(&law.law, solute.molar_mass, t_k, partial_pa) {
            Ok(d) if d.basis != Basis::Extrapolated => return Ok((d, law)),
            Ok(d) => {
                if outside.is_none() {
                    outside = Some((d, *law));
                }
            }
            Err(e) => last_error = Some(e),
        }
    }
    match (outside, extrapolate) {
        (Some((found, law)), true) => {
            if let Some(&GasFit {
                t_min_k, t_max_k, ..
            }) = law.law.fit()
            {
                bounds::check_window(t_k, t_min_k, t_max_k).map_err(|_| {
                    let (low, high) = bounds::extrapolation_window(t_min_k, t_max_k);
                    EvalError::OutOfRange {
                        message: format!(
                            "{} C is beyond what `extrapolate` may reach for the Henry's-law data of {} ({} C to {} C: at most {} K beyond them)",
                            celsius_text(t_k),
                            solute.name,
                            celsius(low),
                            celsius(high),
                            bounds::MAX_EXTRAPOLATION_K
                        ),
                        span,
                    }
                })?;
            }
            Ok((found, law))
        }
        (Some((_, law)), false) => {
            let range = law.law.fit().map_or(String::new(), |fit| {
                format!(
                    " ({} C to {} C)",
                    celsius(fit.t_min_k),
                    celsius(fit.t_max_k)
                )
            });
            Err(EvalError::OutOfRange {
                message: format!(
                    "{} C is outside the range of the Henry's-law data for {}{range}; add `extrapolate` to go beyond it",
                    celsius_text(t_k),
                    solute.name
                ),
                span,
            })
        }
        (None, _) => Err(EvalError::NoData {
            message: match last_error {
                Some(e) => format!("{}: {e}", solute.name),
                None => format!("{} has no Henry's-law data in this reference", solute.name),
            },
            span,
        }),
    }
}

pub(crate) fn cite_law(snap: &Snapshot, law: &GasConstant, solute: &Solute, answer: &mut Answer) {
    let typed = "Henry's-law data typed from memory of the cited source";
    cite_typed(snap, &law.source, law.provenance, typed, solute, answer);
    if law.review == Review::Unreviewed {
        answer.caveat(format!("{}: rests on unreviewed data", solute.name));
    }
}

/// Refuses a temperature where water is not liquid under the pressure asked: above its
/// critical point at any pressure, below 0 C, or boiling under the total pressure of a
/// mixture (air at 1 atm when none is given). A gas's own partial pressure says nothing of
/// the total, so then only the critical point and the ice point bound it.
fn liquid_water(
    solute: &Solute,
    pressure: Option<&GasPressure>,
    t_k: f64,
    span: Span,
) -> Result<(), EvalError> {
    let total = match pressure {
        None => Some(STANDARD_ATMOSPHERE),
        Some(GasPressure::Mixture { total, .. }) => {
            Some(total.map_or(STANDARD_ATMOSPHERE, |p| p.pascals()))
        }
        Some(GasPressure::Partial(_)) => None,
    };
    bounds::check_liquid_water(t_k, total).map_err(|e| EvalError::OutOfRange {
        message: match e {
            crate::science::ScienceError::NotLiquid { why, .. } => format!(
                "{} in water at {} C: {why}; not answered, with or without `extrapolate`",
                solute.name,
                celsius_text(t_k)
            ),
            other => format!("{}: {other}", solute.name),
        },
        span,
    })
}

/// Refuses a partial pressure beyond [`bounds::HENRY_LIMIT_PA`]; true when it needs the
/// caveat of [`bounds::HENRY_CAVEAT_PA`].
fn henry_pressure(solute: &Solute, partial_pa: f64, span: Span) -> Result<bool, EvalError> {
    bounds::check_henry_pressure(partial_pa).map_err(|_| EvalError::OutOfRange {
        message: format!(
            "{}: a partial pressure of {} bar is beyond the {} bar up to which this reference uses Henry's law (a dilute, low-pressure law); not answered",
            solute.name,
            crate::number::display(round_significant(partial_pa / 1e5, 4)),
            bounds::HENRY_LIMIT_PA / 1e5
        ),
        span,
    })
}

/// The gas's partial pressure (Pa) at `t_k` under `pressure` (none: humid air at 1 atm),
/// and the conditions in words for a caveat. `span`: where a missing clause would stand.
pub(crate) fn partial_pressure(
    solute: &Solute,
    pressure: Option<&GasPressure>,
    t_k: f64,
    span: Span,
) -> Result<(f64, String), EvalError> {
    let air = |total: f64, span: Span| {
        science_gas::partial_pressure_in_air(&solute.formula, total, t_k).map_err(|e| {
            EvalError::Unanswerable {
                message: format!("{} in air: {e}", solute.name),
                span,
            }
        })
    };
    Ok(match pressure {
        None => (
            air(STANDARD_ATMOSPHERE, span)?,
            "water saturated with humid air at 1 atm".to_string(),
        ),
        Some(GasPressure::Partial(p)) => (
            p.pascals(),
            format!(
                "a partial pressure of {} {} of the gas",
                p.value,
                p.unit.symbol()
            ),
        ),
        Some(GasPressure::Mixture { mixture, total }) => {
            if !mixture.text.eq_ignore_ascii_case("air") {
                return Err(EvalError::Unanswerable {
                    message: format!(
                        "unknown gas mixture `{}`; satline knows `air` (or give the gas's own partial pressure, e.g. `under 0.2 bar`)",
                        mixture.text
                    ),
                    span: mixture.span,
                });
            }
            let total_pa = total.map_or(STANDARD_ATMOSPHERE, |p| p.pascals());
            let shown = total.map_or("1 atm".to_string(), |p| {
                format!("{} {}", p.value, p.unit.symbol())
            });
            (
                air(total_pa, mixture.span)?,
                format!("water saturated with humid air at {shown}"),
            )
        }
    })
}

/// A dissolved amount in the unit asked for, or why that unit cannot hold it.
pub(crate) fn amount_in(
    unit: CompositionUnit,
    amount: &Dissolved,
    span: Span,
) -> Result<f64, EvalError> {
    Ok(match unit {
        CompositionUnit::MilligramsPerLitre => amount.mg_per_l,
        CompositionUnit::GramsPerLitre => amount.mg_per_l / 1000.0,
        CompositionUnit::MolesPerLitre => amount.mol_per_m3 / 1000.0,
        CompositionUnit::MilligramsPerKilogram => amount.mg_per_kg,
        CompositionUnit::MillimolesPerKilogram => amount.mmol_per_kg,
        CompositionUnit::MicromolesPerKilogram => amount.umol_per_kg,
        CompositionUnit::Molality => amount.mmol_per_kg / 1000.0,
        CompositionUnit::MoleFraction => amount.mole_fraction,
        other => {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "dissolved gas is given in mg/L, g/L, mol/L, mg/kg, mmol/kg, umol/kg, mol/kg or x, not {}",
                    other.symbol()
                ),
                span,
            });
        }
    })
}

/// `dissolved O2 at 25 C under air`, `dissolved CO2 at 4 C under 2.5 bar in g/L`.
pub fn dissolved(snap: &Snapshot, s: &DissolvedGas, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = gas_of(snap, &s.gas)?;
    let t_k = s.temperature.kelvin();
    liquid_water(solute, s.pressure.as_ref(), t_k, s.temperature.span)?;
    let (partial_pa, described) = partial_pressure(solute, s.pressure.as_ref(), t_k, s.gas.span)?;
    let high_pressure = henry_pressure(solute, partial_pa, s.gas.span)?;
    let laws = laws(snap, solute, &s.options);
    let (amount, law) = evaluate(
        &laws,
        solute,
        t_k,
        partial_pa,
        s.options.extrapolate,
        s.temperature.span,
    )?;
    let unit = s
        .unit
        .map_or(CompositionUnit::MilligramsPerLitre, |u| u.unit);
    let span = s.unit.map_or(s.temperature.span, |u| u.span);
    let number = amount_in(unit, &amount, span)?;
    let basis = amount.basis;
    let mut extra: BTreeMap<String, serde_json::Value> = [
        (
            "partial_pressure_kpa".to_string(),
            json!(round_significant(partial_pa / 1000.0, 4)),
        ),
        (
            "ml_stp_per_l".to_string(),
            json!(value(amount.ml_stp_per_l)),
        ),
        ("henry_record".to_string(), json!(law.key)),
    ]
    .into_iter()
    .collect();
    let number = match &s.liquid {
        None => {
            answer.caveat(format!(
                "Henry's law for {described} in pure water; dilute solution taken as dense as pure water"
            ));
            number
        }
        Some(recipe) => {
            if unit == CompositionUnit::MoleFraction {
                return Err(EvalError::Unanswerable {
                    message: "in a recipe's liquid a dissolved gas is given per litre of the solution (mg/L, g/L, mol/L), per kg of the solution (mg/kg) or per kg of its water (mmol/kg, umol/kg, mol/kg), not as a mole fraction".into(),
                    span,
                });
            }
            // Over a salt solution the water's vapour pressure is a little lower, so the
            // gas's share of a mixture's pressure a little higher (under 1 % below a few
            // mol/kg): said, not corrected.
            let vapour = if s
                .pressure
                .as_ref()
                .is_some_and(|p| matches!(p, GasPressure::Partial(_)))
            {
                ""
            } else {
                " (the water vapour taken as over pure water)"
            };
            answer.caveat(format!(
                "Henry's law for {described}{vapour}, then salted out by the recipe's ions"
            ));
            let liquid = crate::engine::salting::ratio_in(
                snap,
                recipe,
                solute,
                (t_k, s.temperature.span),
                &s.options,
                answer,
            )?;
            let ratio = liquid.ratio;
            extra.insert("in_pure_water".to_string(), json!(value(number)));
            extra.insert(
                "ratio_to_pure_water".to_string(),
                json!(round_significant(ratio, 4)),
            );
            extra.insert(
                "ml_stp_per_l".to_string(),
                json!(value(amount.ml_stp_per_l * ratio)),
            );
            // The salted-out amount is per litre of the liquid; per kg of the liquid (mg/kg)
            // or of its water (mmol/kg, umol/kg, mol/kg) through its density and water share.
            let per_litre = |x: f64| x * ratio;
            match unit {
                CompositionUnit::MilligramsPerKilogram => {
                    answer.caveat("mg/kg is per kg of the recipe's solution");
                    per_litre(amount.mg_per_l) / liquid.density
                }
                CompositionUnit::MillimolesPerKilogram
                | CompositionUnit::MicromolesPerKilogram
                | CompositionUnit::Molality => {
                    answer.caveat(format!("{} is per kg of the recipe's water", unit.symbol()));
                    let mol_per_kg_water =
                        per_litre(amount.mol_per_m3 / 1000.0) / (liquid.density * liquid.water);
                    mol_per_kg_water
                        * match unit {
                            CompositionUnit::MillimolesPerKilogram => 1e3,
                            CompositionUnit::MicromolesPerKilogram => 1e6,
                            _ => 1.0,
                        }
                }
                _ => number * ratio,
            }
        }
    };
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("dissolved at saturation".into()),
        value: Some(value(number)),
        unit: Some(unit.symbol().into()),
        basis: Some(basis),
        temperature_c: Some(celsius(t_k)),
        extra,
        ..Row::default()
    });
    if high_pressure {
        answer.caveat(format!(
            "above {} bar of partial pressure Henry's law overstates the amount dissolved (the gas is no longer ideal and the pressure acts on the liquid): treat the value as an upper estimate",
            bounds::HENRY_CAVEAT_PA / 1e5
        ));
    }
    if unit.needs_density() && s.liquid.is_none() {
        answer.caveat("per-litre amounts use the density of pure water at this temperature");
    }
    basis_caveat(basis, answer);
    cite_law(snap, law, solute, answer);
    hazard(solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}

/// The Henry's-law view of `heat of solution of O2 at 25 C`: from the temperature
/// dependence of the Henry's-law record; pushes its row and returns ΔH in kJ/mol.
pub fn heat(
    snap: &Snapshot,
    solute: &Solute,
    s: &HeatOfSolution,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    let t_k = s.temperature.kelvin();
    liquid_water(solute, None, t_k, s.temperature.span)?;
    let laws = laws(snap, solute, &s.options);
    let (_, law) = evaluate(
        &laws,
        solute,
        t_k,
        STANDARD_ATMOSPHERE,
        s.options.extrapolate,
        s.temperature.span,
    )?;
    let (kj, sign) =
        science_gas::gas_heat_of_solution(&law.law, t_k).map_err(|e| EvalError::Unanswerable {
            message: e.to_string(),
            span: s.temperature.span,
        })?;
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("apparent heat of solution".into()),
        value: Some(round_significant(kj, 3)),
        unit: Some("kJ/mol".into()),
        basis: Some(Basis::Fitted),
        temperature_c: Some(celsius(t_k)),
        extra: [
            ("sign".to_string(), json!(sign.as_str())),
            ("henry_record".to_string(), json!(law.key)),
            ("view".to_string(), json!("curve")),
        ]
        .into_iter()
        .collect(),
        ..Row::default()
    });
    answer.caveat("from the temperature dependence of the Henry's-law constant (van 't Hoff)");
    cite_law(snap, law, solute, answer);
    Ok(kj)
}
