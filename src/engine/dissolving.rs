//! `dissolving 300 g CaCl2 in 1 kg water from 20 C`: the temperature a batch reaches while
//! its solid dissolves with no heat exchanged, from the tables' standard heat of solution and
//! the solution's heat capacity; whether the solid dissolves fully at that temperature; and
//! the cautions of a batch that heats sharply or chills.

use serde_json::json;

use crate::answer::{Answer, Basis, Row};
use crate::engine::CAUTION;
use crate::engine::common::{
    celsius, cite_curve, cite_source, curve_error, hazard, resolve, value,
};
use crate::engine::error::EvalError;
use crate::engine::freezing::system_of;
use crate::engine::heat::cite_records;
use crate::engine::snapshot::Snapshot;
use crate::model::thermo::HeatCapacityFit;
use crate::model::{Solute, SoluteKind};
use crate::number::{round_significant, shown};
use crate::query::{Dissolving, WaterAmount};
use crate::science::ScienceError;
use crate::science::activity::relative_enthalpy::apparent_relative_enthalpy;
use crate::science::dissolving::{
    Batch, BatchTemperature, Dissolution, HeatCapacityBasis, stops_at_saturation,
};
use crate::science::enthalpy::standard_heat_of_solution;
use crate::science::freezing::IceBasis;

/// 25 °C, where the tables' standard values and the integral heats apply.
const STANDARD_K: f64 = 298.15;
/// Water boils at 100 °C under one standard atmosphere (a brine a little higher).
const BOILING_C: f64 = 100.0;
/// Common practice: hot water scalds skin within seconds from about this temperature.
const SCALDING_C: f64 = 50.0;
/// A batch this close to boiling can boil over or spit.
const NEAR_BOILING_C: f64 = 90.0;
/// A change this large is worth handling as a hazard (a rise) or a slow dissolve (a drop).
const SHARP_RISE_K: f64 = 10.0;
const MARKED_DROP_K: f64 = 5.0;

fn row(solute: &Solute, quantity: &'static str, v: f64, unit: &'static str) -> Row {
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some(quantity.into()),
        value: Some(v),
        unit: Some(unit.into()),
        basis: Some(Basis::Computed),
        ..Row::default()
    }
}

/// A temperature to 0.1 K: the method is not better than that.
fn tenth(t: f64) -> f64 {
    (t * 10.0).round() / 10.0 + 0.0
}

fn cp_method(basis: HeatCapacityBasis) -> &'static str {
    match basis {
        HeatCapacityBasis::Laliberte => "Laliberté's correlation",
        HeatCapacityBasis::LaliberteOutsideRange => {
            "Laliberté's correlation, outside its published range"
        }
        HeatCapacityBasis::Water => "water's heat capacity",
    }
}

/// The caveat on where the solution's heat capacity came from.
fn cp_caveat(
    snap: &Snapshot,
    solute: &Solute,
    fit: Option<&HeatCapacityFit>,
    b: &BatchTemperature,
    answer: &mut Answer,
) {
    let range = |f: &HeatCapacityFit| {
        let temps = if f.t_min_c == f.t_max_c {
            format!("at {} C only", f.t_min_c)
        } else {
            format!("from {} C to {} C", f.t_min_c, f.t_max_c)
        };
        format!("{temps}, up to {} %w/w", value(f.w_max * 100.0))
    };
    match (b.cp_basis, fit) {
        (HeatCapacityBasis::Laliberte | HeatCapacityBasis::LaliberteOutsideRange, Some(f)) => {
            let inside = b.cp_basis == HeatCapacityBasis::Laliberte;
            cite_source(snap, &f.source, answer);
            answer.caveat(format!(
                "the solution's heat capacity ({} J/(g·K)) from Laliberté's correlation for {}, {} its published range ({}){}",
                shown(b.cp, 3),
                solute.formula,
                if inside { "inside" } else { "used outside" },
                range(f),
                if inside {
                    ""
                } else {
                    ": an extrapolation, treat with care"
                }
            ));
        }
        _ => answer.caveat(format!(
            "the solution's heat capacity taken as water's ({} J/(g·K)){}: for a concentrated solution this overstates it, so the real change in temperature is somewhat larger",
            shown(b.cp, 3),
            if fit.is_some() {
                ", because Laliberté's correlation gives no sensible value here"
            } else {
                " — the reference holds no Laliberté heat-capacity coefficients for this solute"
            }
        )),
    }
}

/// The cautions of a batch that heats up sharply or chills.
fn cautions(solute: &Solute, start_c: f64, end_c: f64, boils: bool, answer: &mut Answer) {
    let change = end_c - start_c;
    if boils {
        answer.caveat(format!(
            "boil-over hazard: dissolving all of it at once would bring the batch to the boil (100 C at one atmosphere, a little higher for a strong brine); the heat left over boils water off and the batch can erupt from its vessel. Add {} in small portions to cold water with stirring and cooling",
            solute.name
        ));
    } else if end_c >= NEAR_BOILING_C {
        answer.caveat(
            "the batch comes close to boiling: it can boil over or spit; add the solid in small portions with stirring and cooling",
        );
    }
    if change >= SHARP_RISE_K {
        answer.caveat(format!(
            "common practice for strongly exothermic solids such as {}: add the solid slowly to the water (never the water onto the solid), stir, cool the vessel, and wear eye and face protection and gloves{}",
            solute.name,
            if end_c >= SCALDING_C {
                "; the solution gets hot enough to scald"
            } else {
                ""
            }
        ));
    }
    if change <= -MARKED_DROP_K {
        answer.caveat(format!(
            "the batch chills as {} dissolves: dissolving slows as it cools, and in a cold room a batch may not dissolve fully until it warms; start with warmer water or add the solid in portions",
            solute.name
        ));
    }
}

/// `dissolving 300 g CaCl2 in 1 kg water from 20 C`.
pub fn dissolving(snap: &Snapshot, s: &Dissolving, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    if solute.kind == SoluteKind::Gas {
        return Err(EvalError::NoData {
            message: format!(
                "{} is a gas: how much dissolves depends on its pressure (ask `dissolved {} at 25 C under air`); its heat of solution is `heat of solution of {} at 25 C`",
                solute.name, solute.formula, solute.formula
            ),
            span: s.solute.span,
        });
    }
    let start_c = s.start.celsius();
    if !(0.0..BOILING_C).contains(&start_c) {
        return Err(EvalError::OutOfRange {
            message: format!(
                "the batch starts at {} C, where water is not a liquid at one atmosphere (0 C to 100 C)",
                round_significant(start_c, 4)
            ),
            span: s.start.span,
        });
    }
    let thermo = snap.catalog.thermochemistry();
    let Some(standard) = standard_heat_of_solution(thermo, &solute.formula) else {
        return Err(EvalError::NoData {
            message: format!(
                "the tables hold no standard heat of solution of {} ({}); the enthalpy cycle's estimate (`heat of solution of {} at 25 C`) is too uncertain to give a batch's temperature",
                solute.name, solute.formula, solute.formula
            ),
            span: s.solute.span,
        });
    };
    let fit = thermo.heat_capacity_of(&solute.formula);
    let water_g = match s.water {
        WaterAmount::Mass(m) => m.grams(),
        WaterAmount::Litres { value, span } => {
            // Kell's density of pure water, g/L, at the batch's start.
            let g_per_l = crate::science::gas::water_density(s.start.kelvin()).map_err(|e| {
                EvalError::OutOfRange {
                    message: format!("the water's density at the start: {e}"),
                    span,
                }
            })?;
            answer.caveat(format!(
                "{} L of water at {} C taken as {} g (pure water's density there, Kell 1975)",
                shown(value, 4),
                round_significant(start_c, 4),
                shown(value * g_per_l, 5)
            ));
            value * g_per_l
        }
    };
    let solid_g = s.solid.grams();
    let molality = solid_g / solute.molar_mass / (water_g / 1000.0);
    // The integral heat at the batch's molality where a Pitzer set gives L_φ at 25 C.
    let models = snap.models_for(&solute.formula);
    let integral = models.iter().find_map(|set| {
        apparent_relative_enthalpy(set, molality, STANDARD_K)
            .ok()
            .map(|l| (*set, l / 1000.0))
    });
    let delta_h = standard.kj_per_mol + integral.map_or(0.0, |(_, l)| l);
    let to_dissolve = Batch {
        solute_g: solid_g,
        water_g,
        molar_mass: solute.molar_mass,
        delta_h,
        start_c,
        fit,
    };
    let unanswerable = |e: ScienceError| EvalError::Unanswerable {
        message: format!("{}: {e}", solute.name),
        span: s.solid.span,
    };
    let whole = to_dissolve.temperature().map_err(unanswerable)?;

    // Does it all dissolve? Follow the batch as it dissolves, against the solubility curve.
    let built = snap.curve(&solute.id, false);
    let saturation = |t_c: f64| -> Option<f64> {
        let b = built?;
        b.curve
            .evaluate(t_c.min(BOILING_C) + 273.15, s.options.extrapolate)
            .ok()
            .map(|e| e.mass_fraction)
    };
    let dissolution = match built {
        Some(_) => stops_at_saturation(&to_dissolve, saturation).map_err(unanswerable)?,
        None => Dissolution::Unknown { t_c: whole.end_c },
    };
    let (batch, dissolved_g) = match &dissolution {
        Dissolution::Stops { dissolved_g, batch } => (batch.clone(), *dissolved_g),
        _ => (whole.clone(), solid_g),
    };
    let boils = batch.end_c >= BOILING_C;
    let end_c = batch.end_c.min(BOILING_C);
    // Below 0 C ice may form (it gives off heat as it freezes, and the batch stops
    // there), or the solubility is unknown on the way: then the figure is not reached.
    let ice_c = if end_c < 0.0 {
        let models = snap.models_for(&solute.formula);
        let system = system_of(snap, solute, false, &models);
        system
            .ice_line(batch.w_solute)
            .ok()
            .map(|ice| (celsius(ice.t_k), ice.basis == IceBasis::Eutectic))
    } else {
        None
    };
    let freezes = ice_c.filter(|(t, _)| *t > end_c);
    let lost_below_zero = matches!(dissolution, Dissolution::Unknown { t_c } if t_c < 0.0);
    let reached = freezes.is_none() && !lost_below_zero;

    let mut final_row = row(solute, "final temperature", tenth(end_c), "C");
    if !reached {
        final_row.value = None;
        final_row
            .extra
            .insert("not_reached_c".into(), json!(tenth(end_c)));
    }
    final_row
        .extra
        .insert("start_c".into(), json!(tenth(start_c)));
    final_row.extra.insert(
        "dissolves_fully".into(),
        match dissolution {
            Dissolution::Whole => json!(true),
            Dissolution::Stops { .. } => json!(false),
            Dissolution::Unknown { .. } => json!(null),
        },
    );
    if boils {
        final_row.extra.insert("boils".into(), json!(true));
    }
    answer.rows.push(final_row);
    let mut change = row(solute, "temperature change", tenth(end_c - start_c), "K");
    if !reached {
        change.value = None;
    }
    answer.rows.push(change);
    let heat = batch.heat_released_kj;
    answer.rows.push(row(
        solute,
        if heat >= 0.0 {
            "heat given off"
        } else {
            "heat taken up"
        },
        round_significant(heat.abs(), 3),
        "kJ",
    ));
    let mut h_row = row(
        solute,
        "standard heat of solution",
        round_significant(delta_h, 3),
        "kJ/mol",
    );
    h_row.phase = Some(solute.formula.clone());
    h_row.value = Some(round_significant(standard.kj_per_mol, 3));
    answer.rows.push(h_row);
    if let Some((set, l)) = integral {
        let mut r = row(
            solute,
            "integral heat of solution",
            round_significant(delta_h, 3),
            "kJ/mol",
        );
        r.extra
            .insert("molality".into(), json!(round_significant(molality, 3)));
        r.extra.insert(
            "relative_enthalpy_kj_per_mol".into(),
            json!(round_significant(l, 3)),
        );
        r.extra.insert("model".into(), json!(set.key));
        answer.rows.push(r);
    }
    let mut cp_row = row(
        solute,
        "solution heat capacity",
        round_significant(batch.cp, 3),
        "J/(g·K)",
    );
    cp_row
        .extra
        .insert("method".into(), json!(cp_method(batch.cp_basis)));
    answer.rows.push(cp_row);
    answer.rows.push(row(
        solute,
        "loading",
        value(solid_g / water_g * 100.0),
        "g/100g water",
    ));

    // The assumptions, then what the batch does.
    answer.caveat(
        "no heat exchanged with the surroundings (adiabatic): the vessel, the air and the stirrer take up or give off nothing, and the solid dissolves faster than heat leaks away; a real batch changes less and drifts back toward room temperature",
    );
    match integral {
        Some((set, l)) => {
            cite_source(snap, &set.source, answer);
            answer.caveat(format!(
                "the heat of solution at this batch's {} mol/kg is the integral heat ΔH°sol + L_φ = {} + {} = {} kJ/mol at 25 C, L_φ (the relative apparent molar enthalpy) from the temperature dependence of the Pitzer parameter set {}; taken as constant over the change in temperature",
                shown(molality, 3),
                shown(standard.kj_per_mol, 3),
                shown(l, 3),
                shown(delta_h, 3),
                set.key
            ));
        }
        None => answer.caveat(format!(
            "the heat of solution is the tables' standard value ({} kJ/mol, at 25 C and infinite dilution) taken as constant; the reference holds no integral heat of solution for {} at this batch's {} mol/kg (no Pitzer set with its temperature dependence covers it), and the real heat per mole differs, in concentrated solutions noticeably: the temperature is an estimate",
            shown(delta_h, 3),
            solute.formula,
            shown(molality, 3)
        )),
    }
    cite_records(snap, &standard.used, answer);
    cp_caveat(snap, solute, fit, &batch, answer);
    if boils {
        let spare = batch.heat_released_kj
            - (dissolved_g + water_g) * batch.cp * (BOILING_C - start_c) / 1000.0;
        answer.caveat(format!(
            "with no heat lost the batch would pass 100 C: it reaches the boil, and about {} kJ are left over to boil water off",
            shown(spare.max(0.0), 2)
        ));
    }
    match &dissolution {
        Dissolution::Whole => {
            if let Some(b) = built {
                cite_curve(snap, b, solute, answer);
            }
            answer.caveat(format!(
                "{} dissolves fully: the batch ({} g/100g water) stays below saturation all the way to {} C",
                solute.name,
                value(solid_g / water_g * 100.0),
                tenth(end_c)
            ));
        }
        Dissolution::Stops { dissolved_g, .. } => {
            if let Some(b) = built {
                cite_curve(snap, b, solute, answer);
            }
            let mut r = row(solute, "dissolved", round_significant(*dissolved_g, 3), "g");
            r.extra.insert(
                "undissolved_g".into(),
                json!(round_significant(solid_g - dissolved_g, 3)),
            );
            answer.rows.push(r);
            answer.caveat(format!(
                "{} does not dissolve fully: the solution saturates at {} C after about {} g of the {} g have dissolved, and the rest stays solid until the batch is warmed{}",
                solute.name,
                tenth(end_c),
                shown(*dissolved_g, 3),
                shown(solid_g, 4),
                if heat < 0.0 {
                    " (dissolving cooled it)"
                } else {
                    " (or diluted)"
                }
            ));
        }
        Dissolution::Unknown { t_c } => {
            let why = match built {
                None => format!("the reference has no solubility curve for {}", solute.name),
                Some(b) => match b
                    .curve
                    .evaluate(t_c.min(BOILING_C) + 273.15, s.options.extrapolate)
                {
                    Err(e) => curve_error(e, solute, s.solid.span).to_string(),
                    Ok(_) => format!("its solubility is not known at {} C", tenth(*t_c)),
                },
            };
            answer.caveat(format!(
                "whether {} dissolves fully is not known: {why}",
                solute.name
            ));
        }
    }
    if let Some((t, eutectic)) = freezes {
        answer.caveat(format!(
            "not reached: {} C is below {} ({} C), where {}, giving off heat, and the batch stops near {} C",
            tenth(end_c),
            if eutectic {
                "the eutectic of this strong solution"
            } else {
                "the solution's freezing point at this loading"
            },
            tenth(t),
            if eutectic {
                "salt and ice crystallise"
            } else {
                "ice forms"
            },
            tenth(t)
        ));
    } else if let Some((t, _)) = ice_c {
        answer.caveat(format!(
            "the batch stays above its freezing point ({} C at this loading): no ice forms",
            tenth(t)
        ));
    } else if lost_below_zero {
        answer.caveat(format!(
            "not reached: dissolving would chill the batch below 0 C (to {} C with nothing freezing) before all of it has dissolved; there ice or the solid crystallises and the reference cannot follow the batch. Start with warmer water or dissolve less at a time",
            tenth(end_c)
        ));
    } else if end_c < 0.0 {
        answer.caveat(format!(
            "below 0 C: ask `freezing of {} at {} g/100g water` whether ice forms",
            solute.formula,
            value(batch.w_solute / (1.0 - batch.w_solute) * 100.0)
        ));
    }
    if (start_c - 25.0).abs() > 15.0 {
        answer.caveat(
            "the standard heat of solution is for 25 C; its change with temperature is left out",
        );
    }
    cautions(solute, start_c, end_c, boils, answer);
    hazard(solute, answer);
    answer.caveat(CAUTION);
    Ok(())
}
