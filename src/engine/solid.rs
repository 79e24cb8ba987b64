//! Statements about solid solutes: lookup, screening, require, saturation, ceiling, heat of
//! solution, freezing and conversion.

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Answer, Basis, ICE_ROW, Row};
use crate::engine::CAUTION;
use crate::engine::common;
use crate::engine::common::{
    amount_row, basis_caveat, bounds, celsius, cite_curve, curve_error, curve_of, in_loading_unit,
    phase_caveat, resolve, value,
};
use crate::engine::error::EvalError;
use crate::engine::per_litre::{self, DEFAULT_VOLUME_T_K, Volume};
use crate::engine::snapshot::Snapshot;
use crate::model::Solute;
use crate::number::{display, round_significant, shown};
use crate::query::{
    Ceiling, Convert, HeatOfSolution, Require, Saturation, Solubility, Temperatures,
};
use crate::science::formula::parse_formula;
use crate::science::freezing::ICE_POINT;
use crate::science::heat::heat_of_solution;
use crate::science::solve;
use crate::science::units::{
    self, CompositionUnit, TemperatureUnit, anhydrous_to_hydrate, hydrate_to_anhydrous,
};

/// `solubility of KNO3 at 20 C [in mol/kg]`, or a table of rows over a range
/// (`solubility of KNO3 from 0 C to 40 C every 5 C`, temperatures from [`super::table`]).
pub fn lookup(snap: &Snapshot, s: &Solubility, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let built = curve_of(snap, solute, &s.solute, &s.options)?;
    let (temperatures, span) = match &s.temperatures {
        Temperatures::At(t) => {
            if let Some(step) = s.every {
                return Err(super::table::step_without_a_range(step));
            }
            (vec![t.kelvin()], t.span)
        }
        Temperatures::Range(r) => (super::table::temperatures(r, s.every)?, r.span),
    };
    for t_k in temperatures {
        let evaluation = built
            .curve
            .evaluate(t_k, s.options.extrapolate)
            .map_err(|e| curve_error(e, solute, span))?;
        let basis = evaluation.basis;
        let row = amount_row(
            snap,
            evaluation.mass_fraction,
            s.unit,
            span,
            solute,
            &s.options,
            answer,
        )?;
        answer.rows.push(Row {
            quantity: Some("solubility".into()),
            basis: Some(basis),
            phase: Some(evaluation.phase.clone()),
            temperature_c: Some(celsius(t_k)),
            ..row
        });
        if basis == Basis::Extrapolated && !s.options.extrapolate {
            stable_range_caveat(answer);
        } else {
            basis_caveat(basis, answer);
        }
        phase_caveat(&evaluation.phase, answer);
    }
    cite_curve(snap, built, solute, answer);
    Ok(())
}

/// The caveat for a value between a solid's last tabulated point and the end of its
/// stable range (its transition), where the branch follows its end tangent.
fn stable_range_caveat(answer: &mut Answer) {
    answer.caveat(
        "between the last tabulated point and the end of the solid's stable range (its transition) the branch follows its end tangent: treat with care",
    );
}

/// Headroom in percent, to 0.1 %.
fn headroom(pct: f64) -> f64 {
    crate::number::tenths_of_percent(pct)
}

/// Headroom for a row: none for a zero loading (it holds trivially, without limit).
pub(super) fn finite_headroom(pct: f64) -> Option<f64> {
    pct.is_finite().then(|| headroom(pct))
}

/// The caveat of a zero loading.
pub(super) fn zero_loading_caveat(w: f64, answer: &mut Answer) {
    if w == 0.0 {
        answer.caveat(
            "a zero loading holds trivially: nothing is dissolved, so nothing can crystallise",
        );
    }
}

/// `require KCl stays dissolved at 20 g/100g water over cold margin 10%`.
pub fn require(snap: &Snapshot, s: &Require, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let built = curve_of(snap, solute, &s.solute, &s.options)?;
    let w = crate::engine::basis::loading_on_named_basis(
        snap, &s.solute, &s.loading, solute, &s.options, answer,
    )?;
    let (t1, t2) = bounds(&s.temperatures);
    let margin = s.margin.map_or(0.0, |m| m.percent / 100.0);
    // Below 0 °C the loading's ice line comes first: the salt's curve decides from there
    // up (below it the liquid follows the ice line, down to the eutectic).
    let (from, ice_forms) = if t1 < ICE_POINT {
        let (from, ice) = crate::engine::freezing::require_below_zero(
            snap,
            solute,
            w,
            t1,
            s.options.reviewed_only,
            answer,
        )?;
        (from.min(t2), ice)
    } else {
        (t1, false)
    };
    let screening =
        match solve::stays_dissolved_with(&built.curve, w, from, t2, margin, s.options.extrapolate)
            .map_err(|e| curve_error(e, solute, s.temperatures.span()))
        {
            Ok(screening) => screening,
            // Ice forms in the range: the requirement fails whatever the salt does.
            Err(e) if ice_forms => {
                crate::engine::freezing::unchecked_above_ice(solute, &e, answer);
                answer.holds = Some(false);
                answer.shortfall = shortfall(&answer.rows);
                cite_curve(snap, built, solute, answer);
                answer.caveat(CAUTION);
                return Ok(());
            }
            Err(e) => return Err(e),
        };
    let saturated = in_loading_unit(
        snap,
        screening.limiting_mass_fraction,
        &s.loading,
        solute,
        &s.options,
        answer,
    )?;
    answer.holds = Some(screening.holds && !ice_forms);
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("solubility at the limiting temperature".into()),
        value: Some(saturated),
        unit: Some(s.loading.unit.symbol().into()),
        basis: Some(screening.basis),
        phase: Some(screening.phase.clone()),
        temperature_c: Some(celsius(screening.limiting_t_k)),
        holds: Some(screening.holds),
        headroom_pct: finite_headroom(screening.headroom_pct),
        extra: [(
            "margin_pct".to_string(),
            json!(round_significant(margin * 100.0, 4)),
        )]
        .into_iter()
        .collect(),
    });
    zero_loading_caveat(w, answer);
    if !screening.holds {
        let needed = (1.0 + margin) * 100.0;
        answer.caveat(format!(
            "does not hold: at {} C the solubility is {} {}, {} % of the loading where {} % is required",
            celsius(screening.limiting_t_k),
            saturated,
            s.loading.unit.symbol(),
            headroom(100.0 + screening.headroom_pct),
            shown(needed, 4)
        ));
    }
    if !answer.holds.unwrap_or(true) {
        answer.shortfall = shortfall(&answer.rows);
    }
    phase_caveat(&screening.phase, answer);
    cite_curve(snap, built, solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}

/// A number for a message: four significant figures, shortest form.
fn figure(x: f64) -> String {
    display(round_significant(x, 4))
}

/// The limiting row of a failed requirement (the failing row with the least headroom) said
/// in words: its solute, limiting temperature, headroom and shortfall.
///
/// The shortfall is how much headroom is missing: the margin asked for minus the headroom
/// found. The margin is read from the row's `margin_pct` field; without it the shortfall is
/// measured from zero headroom (saturation itself).
pub(crate) fn shortfall(rows: &[Row]) -> Option<String> {
    let failing = rows.iter().filter(|r| r.holds == Some(false));
    let limiting = failing
        .min_by(|a, b| {
            let a = a.headroom_pct.unwrap_or(f64::INFINITY);
            let b = b.headroom_pct.unwrap_or(f64::INFINITY);
            a.total_cmp(&b)
        })
        .or_else(|| rows.first())?;
    if limiting.quantity.as_deref() == Some(ICE_ROW) {
        return limiting
            .value
            .map(|t| format!("ice appears below {} C", figure(t)));
    }
    let mut parts = Vec::new();
    if let Some(solute) = &limiting.solute {
        parts.push(solute.clone());
    }
    if let Some(t) = limiting.temperature_c {
        parts.push(format!("limiting temperature {} C", figure(t)));
    }
    if let Some(headroom) = limiting.headroom_pct {
        let margin = limiting
            .extra
            .get("margin_pct")
            .and_then(|v| v.as_f64())
            .unwrap_or(0.0);
        let missing = margin - headroom;
        let mut text = format!("headroom {}%", figure(headroom));
        if margin != 0.0 {
            text.push_str(&format!(" against a margin of {}%", figure(margin)));
        }
        if missing > 0.0 {
            text.push_str(&format!(", short by {} percentage points", figure(missing)));
        }
        parts.push(text);
    }
    if parts.is_empty() {
        None
    } else {
        Some(parts.join(", "))
    }
}

/// `saturation of KNO3 at 40 g/100g water [in F]`.
pub fn saturation(snap: &Snapshot, s: &Saturation, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let built = curve_of(snap, solute, &s.solute, &s.options)?;
    let w = crate::engine::basis::loading_on_named_basis(
        snap, &s.solute, &s.loading, solute, &s.options, answer,
    )?;
    let crossings = solve::saturation_temperatures_with(&built.curve, w, s.options.extrapolate)
        .map_err(|e| curve_error(e, solute, s.loading.span))?;
    let unit = s.unit.map_or(TemperatureUnit::Celsius, |u| u.unit);
    for crossing in &crossings {
        let t = unit.from_kelvin(crossing.t_k);
        answer.rows.push(Row {
            solute: Some(solute.name.clone()),
            quantity: Some("saturation temperature".into()),
            value: Some((t * 100.0).round() / 100.0 + 0.0),
            unit: Some(unit.symbol().into()),
            basis: Some(Basis::Computed),
            phase: Some(crossing.phase.clone()),
            extra: [(
                "crystals".to_string(),
                json!(if crossing.rising {
                    "below this temperature"
                } else {
                    "above this temperature"
                }),
            )]
            .into_iter()
            .collect(),
            ..Row::default()
        });
        phase_caveat(&crossing.phase, answer);
        if crossing.basis == Basis::Extrapolated {
            if s.options.extrapolate {
                basis_caveat(Basis::Extrapolated, answer);
            } else {
                stable_range_caveat(answer);
            }
        }
    }
    if crossings.is_empty() {
        let (lo, hi) = built.curve.temperature_range();
        let at_low = built.curve.evaluate(lo, false).map(|e| e.mass_fraction);
        let text = match at_low {
            Ok(w_low) if lo == hi => format!(
                "the data hold one temperature only ({} C), where the loading is {} the solubility: one point gives no saturation temperature",
                celsius(lo),
                if w_low > w { "below" } else { "above" }
            ),
            Ok(w_low) if w_low > w => format!(
                "the loading stays below the solubility over the whole data range ({} C to {} C): no saturation temperature there",
                celsius(lo),
                celsius(hi)
            ),
            _ => format!(
                "the loading is above the solubility over the whole data range ({} C to {} C): no saturation temperature there",
                celsius(lo),
                celsius(hi)
            ),
        };
        answer.caveat(text);
    }
    cite_curve(snap, built, solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}

/// `ceiling of KCl from 2 C to 8 C margin 10% [in mol/kg]`.
pub fn ceiling(snap: &Snapshot, s: &Ceiling, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let built = curve_of(snap, solute, &s.solute, &s.options)?;
    let (t1, t2) = bounds(&s.temperatures);
    let margin = s.margin.map_or(0.0, |m| m.percent / 100.0);
    let ceiling = solve::ceiling_with(&built.curve, t1, t2, margin, s.options.extrapolate)
        .map_err(|e| curve_error(e, solute, s.temperatures.span()))?;
    let row = amount_row(
        snap,
        ceiling.mass_fraction,
        s.unit,
        s.temperatures.span(),
        solute,
        &s.options,
        answer,
    )?;
    answer.rows.push(Row {
        quantity: Some("largest safe loading".into()),
        basis: Some(Basis::Computed),
        phase: Some(ceiling.phase.clone()),
        temperature_c: Some(celsius(ceiling.limiting_t_k)),
        ..row
    });
    if margin > 0.0 {
        answer.caveat(format!(
            "margin {}% below the lowest solubility over the range (on the solute-to-water ratio)",
            round_significant(margin * 100.0, 4)
        ));
    }
    phase_caveat(&ceiling.phase, answer);
    cite_curve(snap, built, solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}

/// The curve's view of `heat of solution of KNO3 at 25 C` (the apparent value at
/// saturation): pushes its row, caveats and citations, and returns ΔH in kJ/mol.
pub fn apparent_heat(
    snap: &Snapshot,
    solute: &Solute,
    s: &HeatOfSolution,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    let built = curve_of(snap, solute, &s.solute, &s.options)?;
    let heat = heat_of_solution(
        &built.curve,
        solute.molar_mass,
        s.temperature.kelvin(),
        s.options.extrapolate,
    )
    .map_err(|e| curve_error(e, solute, s.temperature.span))?;
    let basis = heat.basis;
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("apparent heat of solution".into()),
        value: Some(round_significant(heat.kj_per_mol, 3)),
        unit: Some("kJ/mol".into()),
        basis: Some(basis),
        phase: Some(heat.phase.clone()),
        temperature_c: Some(celsius(s.temperature.kelvin())),
        extra: [
            ("sign".to_string(), json!(heat.sign.as_str())),
            ("view".to_string(), json!("curve")),
        ]
        .into_iter()
        .collect(),
        ..Row::default()
    });
    answer.caveat(
        "apparent value from the slope of the solubility curve (van 't Hoff, ΔH = −R·d ln x/d(1/T)); activity coefficients are ignored",
    );
    basis_caveat(basis, answer);
    phase_caveat(&heat.phase, answer);
    cite_curve(snap, built, solute, answer);
    Ok(heat.kj_per_mol)
}

/// `convert 20 g/100g water of KCl to mol/kg`, with `as <hydrate>` on either side.
pub fn convert(snap: &Snapshot, s: &Convert, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let hydrate_water = |basis: &crate::query::Name| -> Result<f64, EvalError> {
        let formula = parse_formula(&basis.text).map_err(|e| EvalError::Unanswerable {
            message: format!("`{}` is not a formula: {e}", basis.text),
            span: basis.span,
        })?;
        let anhydrous = formula.anhydrous_molar_mass();
        if (anhydrous - solute.molar_mass).abs() > 1e-6 * solute.molar_mass.max(1.0) {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "`{}` is not a hydrate of {} ({})",
                    basis.text, solute.name, solute.formula
                ),
                span: basis.span,
            });
        }
        Ok(formula.hydrate_water())
    };
    let needs_grams = |unit: CompositionUnit, span| {
        if unit == CompositionUnit::GramsPer100gWater {
            Ok(())
        } else {
            Err(EvalError::Unanswerable {
                message: "a hydrate basis is given in g/100g water (grams of hydrate per 100 g of added water)".into(),
                span,
            })
        }
    };
    let mut loading = s.loading;
    if let Some(basis) = &s.from_basis {
        needs_grams(loading.unit, loading.span)?;
        let water = hydrate_water(basis)?;
        loading.value =
            hydrate_to_anhydrous(loading.value, solute.molar_mass, water).map_err(|e| {
                EvalError::Unanswerable {
                    message: e.to_string(),
                    span: loading.span,
                }
            })?;
        answer.caveat(format!(
            "the loading counts grams of {} per 100 g of added water; converted to anhydrous {} per 100 g of total water",
            basis.text, solute.formula
        ));
    }
    // A per-litre amount on either side is per litre at the statement's `at` temperature.
    let volume = Volume {
        t_k: s.temperature.map_or(DEFAULT_VOLUME_T_K, |t| t.kelvin()),
        stated: s.temperature.is_some(),
        ..common::volume(&s.options)
    };
    let solution = per_litre::solution(snap, &[(solute, &loading)], &volume, answer)?;
    let w = solution.ws.first().copied().unwrap_or_default();
    let mut result = solution.amount(snap, 0, s.to.unit, s.to.span, answer)?;
    let mut extra: BTreeMap<String, serde_json::Value> = [(
        "molar_mass_g_per_mol".to_string(),
        json!(round_significant(solute.molar_mass, 6)),
    )]
    .into_iter()
    .collect();
    if loading.unit.needs_density() || s.to.unit.needs_density() {
        let rho = solution.density(snap, s.to.unit, s.to.span)?;
        extra.insert("density_kg_per_l".into(), json!(round_significant(rho, 5)));
        extra.insert("volume_temperature_c".into(), json!(celsius(volume.t_k)));
    }
    if let Some(basis) = &s.to_basis {
        needs_grams(s.to.unit, s.to.span)?;
        let water = hydrate_water(basis)?;
        let anhydrous =
            units::from_mass_fraction(w, CompositionUnit::GramsPer100gWater, &Default::default())
                .map_err(|e| EvalError::Unanswerable {
                message: e.to_string(),
                span: s.to.span,
            })?;
        result = value(
            anhydrous_to_hydrate(anhydrous, solute.molar_mass, water).map_err(|e| {
                EvalError::Unanswerable {
                    message: e.to_string(),
                    span: basis.span,
                }
            })?,
        );
        answer.caveat(format!(
            "the answer counts grams of {} per 100 g of added water",
            basis.text
        ));
    }
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("loading".into()),
        value: Some(result),
        unit: Some(s.to.unit.symbol().into()),
        basis: Some(Basis::Computed),
        extra,
        ..Row::default()
    });
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row(holds: bool, headroom: f64, t: f64) -> Row {
        Row {
            solute: Some("potassium chloride".into()),
            holds: Some(holds),
            headroom_pct: Some(headroom),
            temperature_c: Some(t),
            ..Row::default()
        }
    }

    #[test]
    fn shortfall_is_measured_against_the_margin_or_saturation() {
        let mut limiting = row(false, 4.0, 2.0);
        limiting.extra.insert("margin_pct".into(), json!(10.0));
        let rows = vec![row(true, 30.0, 8.0), limiting];
        assert_eq!(
            shortfall(&rows).unwrap(),
            "potassium chloride, limiting temperature 2 C, headroom 4% against a margin of 10%, \
             short by 6 percentage points"
        );
        assert_eq!(
            shortfall(&[row(false, -12.5, 2.0)]).unwrap(),
            "potassium chloride, limiting temperature 2 C, headroom -12.5%, short by 12.5 \
             percentage points"
        );
    }
}
