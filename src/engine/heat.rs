//! `heat of solution of KCl at 25 C`: three views side by side — the apparent value from the
//! slope of the solubility curve, the standard value from thermochemical tables, and the
//! enthalpy cycle (lattice, hydration, their sum) — with what the sign means.

use serde_json::{Value, json};

use crate::answer::{Answer, Basis, Row};
use crate::engine::common::{cite_source, resolve};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::engine::{gas, solid};
use crate::model::thermo::ThermoValue;
use crate::model::{Provenance, Review, Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::HeatOfSolution;
use crate::science::enthalpy::{
    self, LatticeMethod, dissociate, gas_standard_heat_of_solution, split_hydrate,
};
use crate::science::heat::HeatSign;

/// 298.15 K, where the tables' standard values apply.
const STANDARD_C: f64 = 25.0;

fn row(
    solute: &Solute,
    quantity: &'static str,
    kj: f64,
    phase: Option<String>,
    extra: &[(&str, Value)],
) -> Row {
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some(quantity.into()),
        value: Some(round_significant(kj, 3)),
        unit: Some("kJ/mol".into()),
        basis: Some(Basis::Computed),
        phase,
        temperature_c: Some(STANDARD_C),
        extra: extra
            .iter()
            .map(|(k, v)| (k.to_string(), v.clone()))
            .collect(),
        ..Row::default()
    }
}

/// Cites every record's source and says which were typed from memory or are unreviewed.
pub(super) fn cite_records(snap: &Snapshot, used: &[&ThermoValue], answer: &mut Answer) {
    let mut memory: Vec<&str> = Vec::new();
    for v in used {
        cite_source(snap, &v.source, answer);
        if v.provenance == Provenance::FromMemory && !memory.contains(&v.source.as_str()) {
            memory.push(&v.source);
        }
    }
    if !memory.is_empty() {
        answer.caveat(format!(
            "thermochemical figures from {} were typed from memory of the cited tables, not yet checked against them (from-memory)",
            memory.join(", ")
        ));
    }
    if used.iter().any(|v| v.review == Review::Unreviewed) {
        answer.caveat("the thermochemical figures are unreviewed");
    }
}

fn sign_word(kj: f64) -> &'static str {
    HeatSign::of(kj).as_str()
}

/// The crystals whose standard heat of solution to show: the anhydrous solid, then each
/// hydrate among the solute's solid phases.
fn crystals(snap: &Snapshot, solute: &Solute) -> Vec<String> {
    let mut out = vec![solute.formula.clone()];
    for d in snap.catalog.datasets_of(&solute.id) {
        let phase = &d.phase.formula;
        if split_hydrate(phase).1 > 0.0 && !out.contains(phase) {
            out.push(phase.clone());
        }
    }
    out
}

/// `heat of solution of KCl at 25 C`.
pub fn heat(snap: &Snapshot, s: &HeatOfSolution, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    let thermo = snap.catalog.thermochemistry();
    let is_gas = solute.kind == SoluteKind::Gas;
    if !s.stated {
        answer.caveat(
            "at 25 C, the tables' standard temperature, as no temperature was given (`at T` asks for another)",
        );
    }

    // View 1: the apparent value from the curve (or the Henry's-law record of a gas).
    let apparent = if is_gas {
        gas::heat(snap, solute, s, answer)
    } else {
        solid::apparent_heat(snap, solute, s, answer)
    };
    let (apparent, apparent_error) = match apparent {
        Ok(kj) => (Some(kj), None),
        // Beyond liquid water at 1 atm the question itself is out of reach: the tables'
        // 25 °C values would not answer it.
        Err(e @ EvalError::OutOfRange { .. })
            if !(0.0..=100.0).contains(&s.temperature.celsius()) =>
        {
            return Err(e);
        }
        Err(e) => (None, Some(e)),
    };
    let apparent_phase = apparent
        .and_then(|_| answer.rows.last())
        .and_then(|r| r.phase.clone());

    // View 2: the standard value from the tables.
    let mut standard: Option<(String, f64)> = None;
    if is_gas {
        if let Some(w) = gas_standard_heat_of_solution(thermo, &solute.formula) {
            answer.rows.push(row(
                solute,
                "standard heat of solution",
                w.kj_per_mol,
                None,
                &[
                    ("sign", json!(sign_word(w.kj_per_mol))),
                    ("view", json!("tables")),
                ],
            ));
            cite_records(snap, &w.used, answer);
            standard = Some((solute.formula.clone(), w.kj_per_mol));
        }
    } else {
        for crystal in crystals(snap, solute) {
            let Some(w) = enthalpy::standard_heat_of_solution(thermo, &crystal) else {
                continue;
            };
            answer.rows.push(row(
                solute,
                "standard heat of solution",
                w.kj_per_mol,
                Some(crystal.clone()),
                &[
                    ("sign", json!(sign_word(w.kj_per_mol))),
                    ("view", json!("tables")),
                ],
            ));
            cite_records(snap, &w.used, answer);
            // Compare the curve with the crystal it was measured over, where tabulated.
            if standard.is_none() || apparent_phase.as_deref() == Some(crystal.as_str()) {
                standard = Some((crystal, w.kj_per_mol));
            }
        }
    }
    if standard.is_some() {
        answer.caveat(
            "standard value from the tables: ΔH°sol = Σ ν·ΔfH°(aq) − ΔfH°(crystal) (a hydrate's water counted as liquid water), at 25 °C and infinite dilution",
        );
    }

    // View 3: the enthalpy cycle.
    let mut cycle_sum: Option<f64> = None;
    if is_gas {
        let whole = standard.as_ref().map(|(_, kj)| *kj).or(apparent);
        if let Some(kj) = whole {
            let step = |q: &'static str, v: f64, n: u8, how: &str| {
                row(
                    solute,
                    q,
                    v,
                    None,
                    &[
                        ("view", json!("cycle")),
                        ("step", json!(n)),
                        ("method", json!(how)),
                    ],
                )
            };
            answer.rows.push(step(
                "lattice enthalpy",
                0.0,
                1,
                "nil: a gas is already expanded",
            ));
            answer.rows.push(step(
                "hydration enthalpy",
                kj,
                2,
                "the whole heat of solution",
            ));
            answer.rows.push(row(
                solute,
                "heat of solution from the cycle",
                kj,
                None,
                &[("sign", json!(sign_word(kj))), ("view", json!("cycle"))],
            ));
            answer.caveat(format!(
                "{} is a gas: the cycle's first step is nil (there is no crystal to pull apart, the molecules are already apart), so the heat of solution is the hydration step alone and dissolving is exothermic; its solubility falls as the water warms",
                solute.name
            ));
            cycle_sum = Some(kj);
        }
    } else if dissociate(&solute.formula).is_none() {
        answer.caveat(format!(
            "the ionic enthalpy cycle does not apply: {} does not dissolve as ions satline knows",
            solute.name
        ));
    } else if let Some(c) = enthalpy::cycle(thermo, &solute.formula) {
        let method = c.method.as_str();
        answer.rows.push(row(
            solute,
            "lattice enthalpy",
            c.lattice.kj_per_mol,
            Some(solute.formula.clone()),
            &[
                ("view", json!("cycle")),
                ("step", json!(1)),
                ("method", json!(method)),
            ],
        ));
        answer.rows.push(row(
            solute,
            "hydration enthalpy",
            c.hydration.kj_per_mol,
            None,
            &[
                ("view", json!("cycle")),
                ("step", json!(2)),
                ("method", json!("single-ion hydration enthalpies")),
            ],
        ));
        answer.rows.push(row(
            solute,
            "heat of solution from the cycle",
            c.kj_per_mol,
            Some(solute.formula.clone()),
            &[
                ("sign", json!(sign_word(c.kj_per_mol))),
                ("view", json!("cycle")),
                ("estimate", json!(true)),
                (
                    "expected_error_kj_per_mol",
                    json!(round_significant(c.expected_error, 2)),
                ),
            ],
        ));
        answer.caveat(format!(
            "the cycle: step 1 pulls the crystal apart into gaseous ions (lattice enthalpy, by {}), step 2 hydrates them (single-ion hydration enthalpies on an absolute scale, H+ = −1103 kJ/mol); their sum is an estimate, a small difference of two large numbers, good to about ±{} kJ/mol",
            if c.method == LatticeMethod::BornHaber {
                "a Born–Haber cycle from the tables"
            } else {
                "the Kapustinskii equation from ionic radii, itself an estimate"
            },
            round_significant(c.expected_error, 2)
        ));
        if c.expected_error > c.kj_per_mol.abs() {
            answer.caveat(
                "the cycle's expected error is larger than its sum, so it cannot tell the sign here: trust the tables or the curve",
            );
        }
        let used: Vec<&ThermoValue> = c
            .lattice
            .used
            .iter()
            .chain(&c.hydration.used)
            .copied()
            .collect();
        cite_records(snap, &used, answer);
        cycle_sum = Some(c.kj_per_mol);
    } else {
        answer.caveat(format!(
            "no enthalpy cycle for {}: the tables lack a radius or hydration enthalpy of one of its ions",
            solute.name
        ));
    }

    if apparent.is_none() && standard.is_none() && cycle_sum.is_none() {
        return Err(apparent_error.unwrap_or_else(|| EvalError::NoData {
            message: format!(
                "no solubility curve and no thermochemical data for {}",
                solute.name
            ),
            span: s.solute.span,
        }));
    }
    if let (None, Some(e)) = (apparent, &apparent_error) {
        answer.caveat(format!("no apparent value from the curve: {e}"));
    }
    explain_signs(
        solute,
        apparent,
        standard.as_ref(),
        cycle_sum,
        is_gas,
        answer,
    );
    Ok(())
}

/// What the sign means, and why the views disagree when they do.
fn explain_signs(
    solute: &Solute,
    apparent: Option<f64>,
    standard: Option<&(String, f64)>,
    cycle: Option<f64>,
    is_gas: bool,
    answer: &mut Answer,
) {
    let main = standard.map(|(_, kj)| *kj).or(apparent).or(cycle);
    if let Some(kj) = main {
        let text = match HeatSign::of(kj) {
            HeatSign::Endothermic => format!(
                "{} dissolves endothermically: dissolving takes up heat, so a batch cools as it dissolves, and solubility rises as the solution warms",
                solute.name
            ),
            HeatSign::Exothermic => format!(
                "{} dissolves exothermically: dissolving gives off heat, so a batch warms as it dissolves, and solubility falls as the solution warms{}",
                solute.name,
                if is_gas {
                    ""
                } else {
                    " unless the curve's own (apparent) value says otherwise"
                }
            ),
            HeatSign::Neither => format!("{}: no heat taken up or given off", solute.name),
        };
        answer.caveat(text);
    }
    if let (Some(app), Some((crystal, std))) = (apparent, standard)
        && HeatSign::of(app) != HeatSign::of(*std)
    {
        answer.caveat(format!(
            "the views disagree in sign: the standard value ({crystal}, {}) is for a little solid dissolving into pure water (infinite dilution), the apparent value ({}) for the last solid dissolving into an almost saturated solution; in concentrated solutions the ions' interactions, and for a hydrate its water of crystallisation, change the heat, and the curve's slope follows the apparent value",
            sign_word(*std),
            sign_word(app)
        ));
    }
}
