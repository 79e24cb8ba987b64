//! Statements about the records themselves: describe, sources, list, and `let`.

use serde_json::{Value as Json, json};

use crate::answer::{Answer, Basis, Row};
use crate::catalog::citation;
use crate::engine::common::{celsius, cite_source, hazard, resolve};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::model::{FitQuantity, GasFit, GasLaw, Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::{Describe, Filter, Let, List, SoluteClass, Sources, Value};
use crate::science::formula::parse_formula;

/// Whether a solute of `kind` is of `class`.
pub fn in_class(class: SoluteClass, kind: SoluteKind) -> bool {
    match class {
        SoluteClass::Solutes => true,
        SoluteClass::Salts => kind == SoluteKind::Salt,
        SoluteClass::Gases => kind == SoluteKind::Gas,
        SoluteClass::MolecularSolutes => kind == SoluteKind::Molecular,
    }
}

/// True when a solute belongs to the class and passes every filter.
pub fn selects(snap: &Snapshot, solute: &Solute, class: SoluteClass, filters: &[Filter]) -> bool {
    let in_class = in_class(class, solute.kind);
    // `anion phosphate` matches "hydrogen phosphate" too, and `cation copper` "copper(II)":
    // a filter names the ion's family word.
    let same = |a: &Option<String>, b: &str| {
        a.as_deref().is_some_and(|a| {
            let (a, b) = (a.to_lowercase(), b.to_lowercase());
            a == b || a.ends_with(&format!(" {b}")) || a.starts_with(&format!("{b}("))
        })
    };
    in_class
        && filters.iter().all(|filter| match filter {
            Filter::Cation(n) => same(&solute.cation, &n.text),
            Filter::Anion(n) => same(&solute.anion, &n.text),
            Filter::Tag(n) => solute.tags.iter().any(|t| t.eq_ignore_ascii_case(&n.text)),
            Filter::Element(n) => parse_formula(&solute.formula)
                .is_ok_and(|f| f.elements().keys().any(|e| e.eq_ignore_ascii_case(&n.text))),
            Filter::Source(n) => {
                snap.catalog
                    .datasets_of(&solute.id)
                    .iter()
                    .any(|d| d.source.eq_ignore_ascii_case(&n.text))
                    || snap
                        .catalog
                        .gas_constants_of(&solute.id)
                        .iter()
                        .any(|g| g.source.eq_ignore_ascii_case(&n.text))
            }
        })
}

fn extra(pairs: Vec<(&str, Json)>) -> std::collections::BTreeMap<String, Json> {
    pairs
        .into_iter()
        .filter(|(_, v)| !v.is_null())
        .map(|(k, v)| (k.to_string(), v))
        .collect()
}

/// `describe NaCl`: the record, then one row per tabulated point and per Henry's-law record.
pub fn describe(snap: &Snapshot, s: &Describe, answer: &mut Answer) -> Result<(), EvalError> {
    let solute = resolve(snap, &s.solute)?;
    answer.rows.push(Row {
        solute: Some(solute.name.clone()),
        quantity: Some("record".into()),
        extra: extra(vec![
            ("id", json!(solute.id)),
            ("formula", json!(solute.formula)),
            ("kind", json!(solute.kind.as_str())),
            (
                "molar_mass_g_per_mol",
                json!(round_significant(solute.molar_mass, 6)),
            ),
            ("synonyms", json!(solute.synonyms)),
            ("tags", json!(solute.tags)),
            ("cation", json!(solute.cation)),
            ("anion", json!(solute.anion)),
        ]),
        ..Row::default()
    });
    for dataset in snap.catalog.datasets_of(&solute.id) {
        if s.options.reviewed_only && dataset.review != crate::model::Review::Reviewed {
            continue;
        }
        cite_source(snap, &dataset.source, answer);
        for point in &dataset.points {
            answer.rows.push(Row {
                solute: Some(solute.name.clone()),
                quantity: Some("solubility".into()),
                value: Some(point.value_reported),
                unit: Some(dataset.unit.clone().into()),
                basis: Some(Basis::Tabulated),
                phase: Some(dataset.phase.formula.clone()),
                temperature_c: Some(celsius(point.temperature_k)),
                extra: extra(vec![
                    ("dataset", json!(dataset.key)),
                    ("provenance", json!(dataset.provenance.as_str())),
                    ("review", json!(dataset.review.as_str())),
                    ("source", json!(dataset.source)),
                ]),
                ..Row::default()
            });
        }
    }
    for law in snap.catalog.gas_constants_of(&solute.id) {
        cite_source(snap, &law.source, answer);
        let form = match &law.law {
            GasLaw::VantHoff(h) => format!(
                "{} = {} at {} K, d ln H/d(1/T) = {} K",
                h.convention, h.value, h.reference_temperature_k, h.temperature_term_k
            ),
            GasLaw::Fit(fit) => {
                let q = match fit.quantity {
                    FitQuantity::MoleFraction => "x",
                    FitQuantity::Molality => "m",
                };
                let GasFit { a, b, c, d, .. } = fit;
                format!(
                    "ln {q} = {a} + {b}/τ + {c} ln τ + {d} τ, τ = T/{} K",
                    fit.scale_k
                )
            }
        };
        answer.rows.push(Row {
            solute: Some(solute.name.clone()),
            quantity: Some("Henry's law".into()),
            extra: extra(vec![
                ("record", json!(law.key)),
                ("equation", json!(form)),
                ("provenance", json!(law.provenance.as_str())),
                ("review", json!(law.review.as_str())),
                ("source", json!(law.source)),
            ]),
            ..Row::default()
        });
    }
    for data in snap.catalog.freezing_of(&solute.id) {
        cite_source(snap, &data.source, answer);
        answer.rows.push(freezing_row(solute, data));
    }
    let has_data = answer.rows.len() > 1;
    let shown: Vec<&crate::model::Dataset> = snap
        .catalog
        .datasets_of(&solute.id)
        .into_iter()
        .filter(|d| !s.options.reviewed_only || d.review == crate::model::Review::Reviewed)
        .collect();
    super::corroboration::caveat_for(snap, &shown, solute, answer);
    for check in snap
        .catalog
        .checks()
        .iter()
        .filter(|c| c.solute == solute.id)
    {
        answer.rows.push(Row {
            solute: Some(solute.name.clone()),
            quantity: Some("check".into()),
            extra: extra(vec![
                ("check", json!(check.key)),
                ("record", json!(check.subject)),
                ("kind", json!(check.kind)),
                ("reference", json!(check.reference)),
                ("other", json!(check.other)),
                ("method", json!(check.method)),
                ("temperature_c", json!(check.temperature_k.map(celsius))),
                ("figure", json!(check.figure)),
                ("satline_figure", json!(check.satline_figure)),
                ("figure_unit", json!(check.unit)),
                ("tolerance", json!(check.tolerance)),
                ("tolerance_unit", json!(check.tolerance_unit)),
                ("verdict", json!(check.verdict.as_str())),
                ("explanation", json!(check.explanation)),
            ]),
            ..Row::default()
        });
    }
    if !has_data {
        answer.caveat(format!("{} has no data in this reference yet", solute.name));
    }
    hazard(solute, answer);
    Ok(())
}

/// A row for a table of freezing points (the ice line): its compositions and temperatures,
/// and its eutectic where the source gives one.
fn freezing_row(solute: &crate::model::Solute, data: &crate::model::FreezingData) -> Row {
    let percent = |w: f64| crate::number::shown(w * 100.0, 4);
    let compositions = match (data.points.first(), data.points.last()) {
        (Some(first), Some(last)) => format!("{} to {} %w/w", percent(first.0), percent(last.0)),
        _ => "none".to_string(),
    };
    let lowest = data.points.iter().map(|p| p.1).reduce(f64::min);
    Row {
        solute: Some(solute.name.clone()),
        quantity: Some("freezing points".into()),
        extra: extra(vec![
            ("record", json!(data.key)),
            ("compositions", json!(compositions)),
            ("points", json!(data.points.len())),
            ("down_to_c", json!(lowest.map(celsius))),
            (
                "eutectic",
                json!(data.eutectic.map(|(w, t)| format!(
                    "{} %w/w at {} C",
                    percent(w),
                    celsius(t)
                ))),
            ),
            ("provenance", json!(data.provenance.as_str())),
            ("review", json!(data.review.as_str())),
            ("source", json!(data.source)),
        ]),
        ..Row::default()
    }
}

/// `sources of NaCl`, or `sources` for every source in the reference.
pub fn sources(snap: &Snapshot, s: &Sources, answer: &mut Answer) -> Result<(), EvalError> {
    let keys: Vec<String> = match &s.solute {
        Some(name) => {
            let solute = resolve(snap, name)?;
            let mut keys: Vec<String> = Vec::new();
            let cited = snap
                .catalog
                .datasets_of(&solute.id)
                .into_iter()
                .map(|d| d.source.clone())
                .chain(
                    snap.catalog
                        .gas_constants_of(&solute.id)
                        .into_iter()
                        .map(|g| g.source.clone()),
                )
                .chain(
                    snap.catalog
                        .freezing_of(&solute.id)
                        .into_iter()
                        .map(|f| f.source.clone()),
                );
            for key in cited {
                if !keys.contains(&key) {
                    keys.push(key);
                }
            }
            keys
        }
        None => snap
            .catalog
            .sources()
            .iter()
            .map(|s| s.key.clone())
            .collect(),
    };
    for key in keys {
        if let Some(source) = snap.catalog.source(&key) {
            answer.rows.push(Row {
                extra: extra(vec![
                    ("key", json!(source.key)),
                    ("citation", json!(citation(source))),
                ]),
                ..Row::default()
            });
            answer.cite(&key, citation(source));
        }
    }
    Ok(())
}

/// `list salts with anion sulfate`.
pub fn list(snap: &Snapshot, s: &List, answer: &mut Answer) -> Result<(), EvalError> {
    let filters = crate::engine::filters::checked(snap, &s.filters, answer)?;
    for solute in snap.catalog.solutes() {
        if !selects(snap, solute, s.class, &filters) {
            continue;
        }
        let range = snap.curve(&solute.id, s.options.reviewed_only).map(|b| {
            let (lo, hi) = b.curve.temperature_range();
            if lo == hi {
                format!("{} C only", celsius(lo))
            } else {
                format!("{} C to {} C", celsius(lo), celsius(hi))
            }
        });
        let henry = snap.catalog.gas_constants_of(&solute.id).len();
        let freezing = !snap.catalog.freezing_of(&solute.id).is_empty();
        answer.rows.push(Row {
            solute: Some(solute.name.clone()),
            extra: extra(vec![
                ("id", json!(solute.id)),
                ("formula", json!(solute.formula)),
                ("kind", json!(solute.kind.as_str())),
                (
                    "data",
                    json!(
                        range
                            .or_else(|| (henry > 0).then(|| match henry {
                                1 => "1 Henry's-law record".to_string(),
                                n => format!("{n} Henry's-law records"),
                            }))
                            .or_else(|| freezing.then(|| "freezing points only".to_string()))
                            .unwrap_or_else(|| "none yet".into())
                    ),
                ),
            ]),
            ..Row::default()
        });
    }
    if answer.rows.is_empty() {
        answer.caveat("no solute matches");
    }
    Ok(())
}

/// `let cold = from 2 C to 8 C`: already bound by the parser; the answer says what it holds.
pub fn binding(s: &Let, text: &str, answer: &mut Answer) -> Result<(), EvalError> {
    let span = match s.value {
        Value::Temperature(t) => t.span,
        Value::Range(r) => r.span,
        Value::Loading(l) => l.span,
        Value::Pressure(p) => p.span,
    };
    answer.rows.push(Row {
        extra: extra(vec![
            ("name", json!(s.name.text)),
            ("value", json!(span.text(text).trim())),
            ("kind", json!(s.value.kind().noun())),
        ]),
        ..Row::default()
    });
    Ok(())
}
