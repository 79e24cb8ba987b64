//! The `plot` statement: builds the `PlotSpec` of a picture from the catalog — for solids
//! the snapshot's curves sampled branch by branch with the tabulated points beside them,
//! for gases the best Henry's-law record at the pressure asked — and an answer whose rows
//! describe what is drawn. Drawing is left to `plot::render` and `plot::sketch`.

use serde_json::json;

use super::phase_plot::lowest_ice_temperature;
use crate::answer::plot_spec::{
    Limiting, LoadingLine, PlotSpec, PointSet, Segment, Series, TransitionMark,
};
use crate::answer::{Answer, Basis, Row};
use crate::engine::CAUTION;
use crate::engine::common::{
    celsius, cite_curve, cite_dataset, context, curve_error, curve_of, hazard,
    loading_mass_fraction, phase_caveat, resolve, value,
};
use crate::engine::error::EvalError;
use crate::engine::gas;
use crate::engine::snapshot::{BuiltCurve, Snapshot};
use crate::model::{Provenance, Review, Solute, SoluteKind};
use crate::number::round_significant;
use crate::query::{GasPressure, Name, Plot, Span};
use crate::science::gas::dissolved as dissolved_gas;
use crate::science::solve::stays_dissolved_with;
use crate::science::units::{self, CompositionUnit};

/// Samples across the range of a picture: smooth at 800 pixels wide.
const SAMPLES: usize = 240;

/// The x axis label of every picture.
const X_LABEL: &str = "temperature (°C)";

fn to_celsius(t_k: f64) -> f64 {
    t_k - 273.15
}

/// A temperature for labels and rows, to 0.1 °C.
fn tenth(t_c: f64) -> f64 {
    (t_c * 10.0).round() / 10.0
}

/// A temperature for curve ends and transitions, to 0.01 °C (as every other answer gives
/// a transition), never `-0`.
fn hundredth(t_c: f64) -> f64 {
    (t_c * 100.0).round() / 100.0 + 0.0
}

/// The sample temperatures over [t0, t1], K: an even grid plus every `extra` inside it.
fn grid(t0: f64, t1: f64, extra: impl IntoIterator<Item = f64>) -> Vec<f64> {
    let mut g: Vec<f64> = (0..=SAMPLES)
        .map(|k| t0 + (t1 - t0) * k as f64 / SAMPLES as f64)
        .collect();
    g.extend(extra.into_iter().filter(|t| *t > t0 && *t < t1));
    g.sort_by(f64::total_cmp);
    g.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
    g
}

fn pressure_span(pressure: &GasPressure) -> Span {
    match pressure {
        GasPressure::Partial(p) => p.span,
        GasPressure::Mixture { mixture, total } => {
            total.map_or(mixture.span, |t| mixture.span.to(t.span))
        }
    }
}

/// Where the range of the statement stands, or the solutes when it gives none.
fn range_span(s: &Plot) -> Span {
    s.range.map_or_else(
        || {
            let first = s.solutes.first().map_or(Span::default(), |n| n.span);
            s.solutes.iter().fold(first, |acc, n| acc.to(n.span))
        },
        |r| r.span,
    )
}

/// Characters a title may hold and still fit 800 pixels at its size.
const TITLE_LENGTH: usize = 70;

/// `Solubility in water: potassium nitrate, potassium chloride`; formulas where the names
/// would not fit, and `and N more` where even those would not.
fn title(prefix: &str, solutes: &[&Solute]) -> String {
    let names: Vec<&str> = solutes.iter().map(|s| s.name.as_str()).collect();
    let by_name = format!("{prefix}: {}", names.join(", "));
    if by_name.chars().count() <= TITLE_LENGTH {
        return by_name;
    }
    let formulas: Vec<&str> = solutes.iter().map(|s| s.formula.as_str()).collect();
    for shown in (1..=formulas.len()).rev() {
        let rest = formulas.len() - shown;
        let mut text = format!("{prefix}: {}", formulas[..shown].join(", "));
        if rest > 0 {
            text.push_str(&format!(" and {rest} more"));
        }
        if text.chars().count() <= TITLE_LENGTH {
            return text;
        }
    }
    prefix.to_string()
}

/// `plot KNO3, KCl from 0 C to 100 C`, `plot O2, N2 from 0 C to 40 C under air`.
pub fn plot(snap: &Snapshot, s: &Plot, answer: &mut Answer) -> Result<(), EvalError> {
    let mut solutes: Vec<(&Solute, &Name)> = Vec::new();
    for name in &s.solutes {
        let solute = resolve(snap, name)?;
        // The same solute named twice (`KNO3, saltpetre`) is drawn once.
        if !solutes.iter().any(|(known, _)| known.id == solute.id) {
            solutes.push((solute, name));
        }
    }
    let is_gas = |solute: &Solute| solute.kind == SoluteKind::Gas;
    let first_is_gas = solutes.first().is_some_and(|(solute, _)| is_gas(solute));
    if let Some((other, name)) = solutes.iter().find(|(x, _)| is_gas(x) != first_is_gas) {
        return Err(EvalError::Unanswerable {
            message: format!(
                "{} cannot share a picture with {}: a gas's dissolved amount depends on its pressure, a solid's solubility does not; plot them apart",
                other.name, solutes[0].0.name
            ),
            span: name.span,
        });
    }
    let spec = if first_is_gas {
        gases(snap, s, &solutes, answer)?
    } else {
        solids(snap, s, &solutes, answer)?
    };
    answer.caveat(CAUTION);
    answer.plot = Some(Box::new(spec));
    Ok(())
}

/// A mass fraction in the plot's unit, unrounded (for drawing).
fn plotted(w: f64, unit: CompositionUnit, solute: &Solute, span: Span) -> Result<f64, EvalError> {
    units::from_mass_fraction(w, unit, &context(solute)).map_err(|_| EvalError::Unanswerable {
        message: format!(
            "{} is per litre of solution and needs the solution's density, which the reference does not hold; plot in g/100g water, %w/w, mol/kg or x",
            unit.symbol()
        ),
        span,
    })
}

/// A stretch being sampled: its branch, whether it is extrapolated, its points.
struct Run {
    branch: usize,
    extrapolated: bool,
    points: Vec<(f64, f64)>,
}

fn solids(
    snap: &Snapshot,
    s: &Plot,
    solutes: &[(&Solute, &Name)],
    answer: &mut Answer,
) -> Result<PlotSpec, EvalError> {
    if let Some(pressure) = &s.pressure {
        return Err(EvalError::Unanswerable {
            message: "`under` gives a gas's pressure; a solid's solubility does not depend on it"
                .into(),
            span: pressure_span(pressure),
        });
    }
    let mut curves: Vec<&BuiltCurve> = Vec::new();
    for (solute, name) in solutes {
        curves.push(curve_of(snap, solute, name, &s.options)?);
    }
    // The loading's unit is the picture's unit unless another is asked for.
    let unit = s
        .unit
        .map(|u| u.unit)
        .or_else(|| {
            s.loading
                .as_ref()
                .map(|l| l.loading.unit)
                .filter(|u| !u.needs_density())
        })
        .unwrap_or(CompositionUnit::GramsPer100gWater);
    let unit_span = s.unit.map_or(range_span(s), |u| u.span);

    let storage = s.loading.as_ref().map(|l| match &l.temperatures {
        Some(t) => crate::engine::common::bounds(t),
        None => (f64::NAN, f64::NAN),
    });
    let (mut t0, mut t1) = match s.range {
        Some(r) => (r.low.kelvin(), r.high.kelvin()),
        None => curves
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), c| {
                let (a, b) = c.curve.temperature_range();
                (lo.min(a), hi.max(b))
            }),
    };
    if let (None, Some(_)) = (s.range, s.ice) {
        // The whole diagram: down to the lowest ice line (the eutectic), up through 0 C.
        for (solute, _) in solutes {
            if let Some(t) = lowest_ice_temperature(snap, solute, s.options.reviewed_only) {
                t0 = t0.min(t);
                t1 = t1.max(273.15);
            }
        }
    }
    if let (None, Some((a, b))) = (s.range, storage) {
        if a.is_finite() {
            t0 = t0.min(a);
            t1 = t1.max(b);
        }
    }
    if t1.partial_cmp(&t0) != Some(std::cmp::Ordering::Greater) {
        return Err(EvalError::Unanswerable {
            message: "a plot needs a range of temperatures, such as `from 0 C to 100 C`".into(),
            span: range_span(s),
        });
    }
    let storage = storage.map(|(a, b)| if a.is_finite() { (a, b) } else { (t0, t1) });
    if let (Some((a, b)), Some(loading)) = (storage, &s.loading) {
        if a < t0 - 1e-9 || b > t1 + 1e-9 {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "the storage range ({} C to {} C) reaches beyond the plot's range ({} C to {} C)",
                    celsius(a),
                    celsius(b),
                    celsius(t0),
                    celsius(t1)
                ),
                span: loading.temperatures.map_or(loading.span, |t| t.span()),
            });
        }
    }

    let mut series: Vec<Series> = Vec::new();
    let mut point_sets: Vec<PointSet> = Vec::new();
    let mut transitions: Vec<TransitionMark> = Vec::new();
    let mut sources: Vec<String> = Vec::new();
    // Solutes whose marked points were typed from memory, or are not yet reviewed.
    let mut data_state = DataState::default();
    let mut rows: Vec<Row> = Vec::new();
    let mut any_dashed = false;
    let mut colours_of: Vec<Vec<(String, usize)>> = Vec::new();

    for ((solute, name), built) in solutes.iter().zip(&curves) {
        let curve = &built.curve;
        let (lo, hi) = curve.temperature_range();
        let extra = curve
            .knots()
            .into_iter()
            .chain(curve.transitions().iter().map(|t| t.t_k))
            .chain([lo, hi]);
        let mut by_branch: Vec<Vec<Segment>> = vec![Vec::new(); curve.branches.len()];
        let mut run: Option<Run> = None;
        let mut previous_t: Option<f64> = None;
        let finish = |run: Option<Run>, by_branch: &mut Vec<Vec<Segment>>| {
            if let Some(r) = run.filter(|r| r.points.len() > 1) {
                by_branch[r.branch].push(Segment {
                    points: r.points,
                    extrapolated: r.extrapolated,
                });
            }
        };
        let (reach_lo, reach_hi) = curve.extrapolation_window();
        for t in grid(t0, t1, extra) {
            let outside = t < lo - 1e-9 || t > hi + 1e-9;
            let beyond_reach = t < reach_lo - 1e-9 || t > reach_hi + 1e-9;
            if outside && (!s.options.extrapolate || beyond_reach) {
                finish(run.take(), &mut by_branch);
                previous_t = None;
                continue;
            }
            let evaluation = match curve.evaluate(t, true) {
                Ok(evaluation) => evaluation,
                // An extrapolation the bounds refuse is not drawn, like one not asked for.
                Err(_) if outside => {
                    finish(run.take(), &mut by_branch);
                    previous_t = None;
                    continue;
                }
                Err(e) => return Err(curve_error(e, solute, name.span)),
            };
            let extrapolated = evaluation.basis == Basis::Extrapolated;
            let point = (
                to_celsius(t),
                plotted(evaluation.mass_fraction, unit, solute, unit_span)?,
            );
            match &mut run {
                Some(r) if r.branch == evaluation.branch && r.extrapolated == extrapolated => {
                    r.points.push(point);
                }
                _ => {
                    let mut points = Vec::new();
                    // Start where the last stretch ended, so the line stays joined: on the
                    // same branch at the last point, on a new branch at its own value there.
                    if let (Some(last), Some(t_before)) = (run.as_ref(), previous_t) {
                        if last.branch == evaluation.branch {
                            if let Some(p) = last.points.last() {
                                points.push(*p);
                            }
                        } else {
                            let (w, _) =
                                curve.branches[evaluation.branch].value_unchecked(t_before);
                            points
                                .push((to_celsius(t_before), plotted(w, unit, solute, unit_span)?));
                        }
                    }
                    points.push(point);
                    finish(run.take(), &mut by_branch);
                    run = Some(Run {
                        branch: evaluation.branch,
                        extrapolated,
                        points,
                    });
                }
            }
            previous_t = Some(t);
        }
        finish(run.take(), &mut by_branch);
        if by_branch.iter().all(Vec::is_empty) && lo == hi {
            return Err(EvalError::OutOfRange {
                message: format!(
                    "{}'s data hold one temperature only ({} C): one point draws no curve and gives no trend to extrapolate from",
                    solute.name,
                    celsius(lo)
                ),
                span: range_span(s),
            });
        }
        if by_branch.iter().all(Vec::is_empty) {
            return Err(EvalError::OutOfRange {
                message: format!(
                    "no data for {} between {} C and {} C (its data cover {} C to {} C); add `extrapolate` to draw it dashed",
                    solute.name,
                    celsius(t0),
                    celsius(t1),
                    celsius(lo),
                    celsius(hi)
                ),
                span: range_span(s),
            });
        }
        let trendless = !curve.has_trend_at(lo) || !curve.has_trend_at(hi);
        if s.options.extrapolate && trendless && (t0 < lo - 1e-9 || t1 > hi + 1e-9) {
            answer.caveat(format!(
                "{}: its data cover {} C to {} C and an end of them is a single point, which gives no trend to extrapolate from; the rest of the range is not drawn",
                solute.name,
                celsius(lo),
                celsius(hi)
            ));
        } else if s.options.extrapolate && (t0 < reach_lo - 1e-9 || t1 > reach_hi + 1e-9) {
            answer.caveat(format!(
                "{}: extrapolation reaches only {} C to {} C (at most {} K beyond the data, never past the boiling point of water at one atmosphere); the rest of the range is not drawn",
                solute.name,
                celsius(reach_lo),
                celsius(reach_hi),
                crate::science::bounds::MAX_EXTRAPOLATION_K
            ));
        }
        if !s.options.extrapolate && (t0 < lo - 1e-9 || t1 > hi + 1e-9) {
            answer.caveat(format!(
                "{}: its data cover {} C to {} C; the rest of the range is not drawn (add `extrapolate` to draw it dashed)",
                solute.name,
                celsius(lo),
                celsius(hi)
            ));
        }
        let mut colours: Vec<(String, usize)> = Vec::new();
        // Branches in the order they appear from cold to hot.
        let mut drawn: Vec<(usize, Vec<Segment>)> = by_branch
            .into_iter()
            .enumerate()
            .filter(|(_, segments)| !segments.is_empty())
            .collect();
        drawn.sort_by(|a, b| a.1[0].points[0].0.total_cmp(&b.1[0].points[0].0));
        for (index, segments) in drawn {
            let phase = curve.branches[index].phase.clone();
            let colour = series.len();
            let dashed = segments.iter().any(|g| g.extrapolated);
            any_dashed |= dashed;
            let from = segments
                .iter()
                .flat_map(|g| g.points.first())
                .map(|p| p.0)
                .fold(f64::INFINITY, f64::min);
            let to = segments
                .iter()
                .flat_map(|g| g.points.last())
                .map(|p| p.0)
                .fold(f64::NEG_INFINITY, f64::max);
            let branch = &curve.branches[index];
            let tabulated = branch
                .knots()
                .iter()
                .filter(|k| **k >= t0 - 1e-9 && **k <= t1 + 1e-9)
                .count();
            rows.push(Row {
                solute: Some(solute.name.clone()),
                quantity: Some("curve".into()),
                unit: Some(unit.symbol().into()),
                basis: Some(if segments.iter().all(|g| g.extrapolated) {
                    Basis::Extrapolated
                } else {
                    Basis::Interpolated
                }),
                phase: Some(phase.clone()),
                extra: [
                    ("from_c".to_string(), json!(hundredth(from))),
                    ("to_c".to_string(), json!(hundredth(to))),
                    ("points".to_string(), json!(tabulated)),
                    ("dashed".to_string(), json!(dashed)),
                ]
                .into_iter()
                .collect(),
                ..Row::default()
            });
            phase_caveat(&phase, answer);
            series.push(Series {
                label: format!("{}: solid {phase}", solute.name),
                solute: solute.name.clone(),
                phase: Some(phase.clone()),
                colour,
                segments,
            });
            colours.push((phase, colour));
        }
        for transition in curve.transitions() {
            if transition.t_k <= t0 || transition.t_k >= t1 {
                continue;
            }
            let t_c = to_celsius(transition.t_k);
            let colour = colours
                .iter()
                .find(|(p, _)| *p == transition.above)
                .map_or_else(|| colours.first().map_or(0, |c| c.1), |c| c.1);
            transitions.push(TransitionMark {
                temperature_c: t_c,
                label: format!(
                    "{} → {} at {} °C",
                    transition.below,
                    transition.above,
                    crate::number::display(hundredth(t_c))
                ),
                colour,
            });
            rows.push(Row {
                solute: Some(solute.name.clone()),
                quantity: Some("transition".into()),
                value: Some(hundredth(t_c)),
                unit: Some("C".into()),
                basis: Some(Basis::Computed),
                phase: Some(format!("{} → {}", transition.below, transition.above)),
                ..Row::default()
            });
        }
        // Every usable dataset's points, marked by source, whether or not the curve uses it.
        let datasets = snap.catalog.datasets_of(&solute.id);
        for dataset in datasets {
            if dataset.retired
                || dataset.review == Review::Rejected
                || (s.options.reviewed_only && dataset.review != Review::Reviewed)
            {
                continue;
            }
            let mut points = Vec::new();
            for p in &dataset.points {
                if p.temperature_k >= t0 - 1e-9 && p.temperature_k <= t1 + 1e-9 {
                    points.push((
                        to_celsius(p.temperature_k),
                        plotted(p.mass_fraction, unit, solute, unit_span)?,
                    ));
                }
            }
            if points.is_empty() {
                continue;
            }
            let shape = match sources.iter().position(|k| *k == dataset.source) {
                Some(i) => i,
                None => {
                    sources.push(dataset.source.clone());
                    sources.len() - 1
                }
            };
            let colour = colours
                .iter()
                .find(|(p, _)| *p == dataset.phase.formula)
                .map_or_else(|| colours.first().map_or(0, |c| c.1), |c| c.1);
            cite_dataset(snap, dataset, solute, answer);
            data_state.note(&solute.name, dataset.provenance, dataset.review);
            let short = snap.catalog.source(&dataset.source).map_or_else(
                || dataset.source.clone(),
                |src| crate::citation::short_citation(&crate::catalog::citation(src)),
            );
            point_sets.push(PointSet {
                source: format!("data: {short}"),
                colour,
                shape,
                points,
            });
        }
        if s.ice.is_some() {
            let colour = series.len();
            let in_unit = |w: f64| plotted(w, unit, solute, unit_span);
            let (line, mark, ice_rows) = super::phase_plot::ice_line(
                snap,
                solute,
                s.options.reviewed_only,
                (t0, t1),
                colour,
                unit,
                &in_unit,
                answer,
            )?;
            series.extend(line);
            transitions.extend(mark);
            rows.extend(ice_rows);
        }
        cite_curve(snap, built, solute, answer);
        colours_of.push(colours);
    }

    let loading = match (&s.loading, storage) {
        (Some(l), Some((a, b))) => {
            let margin = s.margin.map_or(0.0, |m| m.percent / 100.0);
            let mut level: Option<(f64, Option<f64>)> = None;
            let mut limiting = Vec::new();
            for (((solute, _), built), colours) in solutes.iter().zip(&curves).zip(&colours_of) {
                let w = loading_mass_fraction(snap, &l.loading, solute, &s.options, answer)?;
                let span = l.temperatures.map_or(l.span, |t| t.span());
                let screening =
                    stays_dissolved_with(&built.curve, w, a, b, margin, s.options.extrapolate)
                        .map_err(|e| curve_error(e, solute, span))?;
                let y = plotted(w, unit, solute, l.loading.span)?;
                let with_margin = if margin > 0.0 {
                    let r = w / (1.0 - w) * (1.0 + margin);
                    Some(plotted(r / (1.0 + r), unit, solute, l.loading.span)?)
                } else {
                    None
                };
                match level {
                    None => level = Some((y, with_margin)),
                    Some((known, _)) if (known - y).abs() > 1e-9 * known.abs().max(1.0) => {
                        return Err(EvalError::Unanswerable {
                            message: format!(
                                "{} {} is a different amount for each of these solutes in {}; give the loading in the plot's unit",
                                l.loading.value,
                                l.loading.unit.symbol(),
                                unit.symbol()
                            ),
                            span: l.loading.span,
                        });
                    }
                    Some(_) => {}
                }
                let limit_y = plotted(screening.limiting_mass_fraction, unit, solute, unit_span)?;
                let headroom = (screening.headroom_pct * 10.0).round() / 10.0;
                let t_c = tenth(to_celsius(screening.limiting_t_k));
                let colour = colours
                    .iter()
                    .find(|(p, _)| *p == screening.phase)
                    .map_or_else(|| colours.first().map_or(0, |c| c.1), |c| c.1);
                limiting.push(Limiting {
                    temperature_c: to_celsius(screening.limiting_t_k),
                    value: limit_y,
                    colour,
                    label: format!(
                        "{}: {} (headroom {}% at {} °C)",
                        solute.formula,
                        if screening.holds {
                            "stays dissolved"
                        } else {
                            "crystallises"
                        },
                        crate::number::display(headroom),
                        crate::number::display(t_c)
                    ),
                    holds: screening.holds,
                });
                rows.push(Row {
                    solute: Some(solute.name.clone()),
                    quantity: Some("solubility at the limiting temperature".into()),
                    value: Some(value(limit_y)),
                    unit: Some(unit.symbol().into()),
                    basis: Some(screening.basis),
                    phase: Some(screening.phase.clone()),
                    temperature_c: Some(celsius(screening.limiting_t_k)),
                    holds: Some(screening.holds),
                    headroom_pct: Some(headroom),
                    extra: [
                        ("loading".to_string(), json!(value(y))),
                        (
                            "margin_pct".to_string(),
                            json!(round_significant(margin * 100.0, 4)),
                        ),
                    ]
                    .into_iter()
                    .collect(),
                });
            }
            let (y, with_margin) = level.unwrap_or((0.0, None));
            let margin_label = with_margin.zip(s.margin).map(|(level, m)| {
                format!(
                    "loading raised by the {}% margin: {} {}",
                    crate::number::display(m.percent),
                    crate::number::display(round_significant(level, 4)),
                    unit.symbol()
                )
            });
            Some(LoadingLine {
                margin_label,
                label: format!(
                    "loading {} {}",
                    crate::number::display(l.loading.value),
                    l.loading.unit.symbol()
                ),
                value: y,
                with_margin,
                storage: (to_celsius(a), to_celsius(b)),
                limiting,
            })
        }
        _ => None,
    };
    if any_dashed {
        answer.caveat(
            "dashed lines are extrapolated beyond the data or across a gap between two solid phases: treat them with care",
        );
    }
    answer.rows = rows.into();
    let named: Vec<&Solute> = solutes.iter().map(|(x, _)| *x).collect();
    Ok(PlotSpec {
        title: title("Solubility in water", &named),
        x_label: X_LABEL.into(),
        y_label: if s.ice.is_some() {
            format!(
                "liquid in equilibrium ({}, anhydrous solute)",
                unit.symbol()
            )
        } else {
            format!("solubility ({}, anhydrous solute)", unit.symbol())
        },
        x_range: (to_celsius(t0), to_celsius(t1)),
        series,
        points: point_sets,
        transitions,
        loading,
        footnote: footnote(
            "Lines: the stable solid's curve, interpolated between tabulated points (markers); \
             dashed: extrapolated. For screening only.",
            answer,
            &data_state,
        ),
    })
}

/// Which solutes' drawn data were typed from memory of their tables, or are unreviewed.
#[derive(Debug, Default)]
struct DataState {
    from_memory: Vec<String>,
    unreviewed: Vec<String>,
}

impl DataState {
    fn note(&mut self, solute: &str, provenance: Provenance, review: Review) {
        let add = |list: &mut Vec<String>| {
            if !list.iter().any(|s| s == solute) {
                list.push(solute.to_string());
            }
        };
        if provenance == Provenance::FromMemory {
            add(&mut self.from_memory);
        }
        if review != Review::Reviewed {
            add(&mut self.unreviewed);
        }
    }
}

/// The lines under a picture: what its lines mean, the sources as short citations with
/// their keys (the full citations are in the answer), and the state of the data.
fn footnote(meaning: &str, answer: &Answer, state: &DataState) -> String {
    let mut lines = vec![meaning.to_string()];
    if !answer.sources.is_empty() {
        let cited: Vec<String> = answer
            .sources
            .iter()
            .map(|s| {
                format!(
                    "{} ({})",
                    crate::citation::short_citation(&s.citation),
                    s.key
                )
            })
            .collect();
        lines.push(format!(
            "Sources: {}; full citations in the answer.",
            cited.join(", ")
        ));
    }
    if !state.from_memory.is_empty() {
        lines.push(format!(
            "Typed from memory of the cited tables, not yet checked against them: {}.",
            state.from_memory.join(", ")
        ));
    }
    if !state.unreviewed.is_empty() {
        lines.push(format!("Unreviewed data: {}.", state.unreviewed.join(", ")));
    }
    lines.join("\n")
}

fn gases(
    snap: &Snapshot,
    s: &Plot,
    solutes: &[(&Solute, &Name)],
    answer: &mut Answer,
) -> Result<PlotSpec, EvalError> {
    if let Some(loading) = &s.loading {
        return Err(EvalError::Unanswerable {
            message: "`with loading` draws a solid's loading; for a gas ask `dissolved ... at ...`"
                .into(),
            span: loading.span,
        });
    }
    let unit = s
        .unit
        .map_or(CompositionUnit::MilligramsPerLitre, |u| u.unit);
    let unit_span = s.unit.map_or(range_span(s), |u| u.span);
    let mut chosen = Vec::new();
    for (solute, name) in solutes {
        let laws = gas::laws(snap, solute, &s.options);
        let Some(law) = laws.first().copied() else {
            return Err(EvalError::NoData {
                message: format!("{} has no Henry's-law data in this reference", solute.name),
                span: name.span,
            });
        };
        chosen.push((solute, *name, law));
    }
    let (t0, t1) = match s.range {
        Some(r) => (r.low.kelvin(), r.high.kelvin()),
        None => {
            let mut range = (f64::INFINITY, f64::NEG_INFINITY);
            for (solute, name, law) in &chosen {
                match law.law.fit() {
                    Some(fit) => range = (range.0.min(fit.t_min_k), range.1.max(fit.t_max_k)),
                    None => {
                        return Err(EvalError::Unanswerable {
                            message: format!(
                                "the Henry's-law record of {} states no temperature range: give one, such as `from 0 C to 40 C`",
                                solute.name
                            ),
                            span: name.span,
                        });
                    }
                }
            }
            range
        }
    };
    if t1.partial_cmp(&t0) != Some(std::cmp::Ordering::Greater) {
        return Err(EvalError::Unanswerable {
            message: "a plot needs a range of temperatures, such as `from 0 C to 40 C`".into(),
            span: range_span(s),
        });
    }
    let mut series = Vec::new();
    let mut conditions = String::new();
    let mut any_dashed = false;
    for (solute, name, law) in &chosen {
        let mut segments: Vec<Segment> = Vec::new();
        let mut current: Option<Segment> = None;
        let mut skipped = false;
        for t in grid(t0, t1, []) {
            let (partial, described) = match gas::partial_pressure(
                solute,
                s.pressure.as_ref(),
                t,
                name.span,
            ) {
                Ok(found) => found,
                // Unknown mixtures are the statement's fault; a temperature where air
                // cannot be humid at that pressure is only left undrawn.
                Err(e @ EvalError::Unanswerable { .. }) if matches!(&s.pressure, Some(GasPressure::Mixture { mixture, .. }) if !mixture.text.eq_ignore_ascii_case("air")) =>
                {
                    return Err(e);
                }
                Err(_) => {
                    skipped = true;
                    if let Some(g) = current.take().filter(|g| g.points.len() > 1) {
                        segments.push(g);
                    }
                    continue;
                }
            };
            conditions = described;
            let Ok(amount) = dissolved_gas(&law.law, solute.molar_mass, t, partial) else {
                skipped = true;
                if let Some(g) = current.take().filter(|g| g.points.len() > 1) {
                    segments.push(g);
                }
                continue;
            };
            let extrapolated = amount.basis == Basis::Extrapolated;
            if extrapolated && !s.options.extrapolate {
                if let Some(g) = current.take().filter(|g| g.points.len() > 1) {
                    segments.push(g);
                }
                skipped = true;
                continue;
            }
            let point = (to_celsius(t), gas::amount_in(unit, &amount, unit_span)?);
            match &mut current {
                Some(g) if g.extrapolated == extrapolated => g.points.push(point),
                _ => {
                    let mut points = Vec::new();
                    if let Some(last) = current.take() {
                        if let Some(p) = last.points.last() {
                            points.push(*p);
                        }
                        if last.points.len() > 1 {
                            segments.push(last);
                        }
                    }
                    points.push(point);
                    current = Some(Segment {
                        points,
                        extrapolated,
                    });
                }
            }
        }
        if let Some(g) = current.take().filter(|g| g.points.len() > 1) {
            segments.push(g);
        }
        if segments.is_empty() {
            return Err(EvalError::OutOfRange {
                message: format!(
                    "the Henry's-law data for {} do not reach {} C to {} C; add `extrapolate` to draw it dashed",
                    solute.name,
                    celsius(t0),
                    celsius(t1)
                ),
                span: range_span(s),
            });
        }
        if skipped {
            answer.caveat(format!(
                "{}: part of the range lies outside its Henry's-law data and is not drawn (add `extrapolate` to draw it dashed)",
                solute.name
            ));
        }
        let dashed = segments.iter().any(|g| g.extrapolated);
        any_dashed |= dashed;
        let from = segments[0].points[0].0;
        let to = segments
            .last()
            .and_then(|g| g.points.last())
            .map_or(from, |p| p.0);
        answer.rows.push(Row {
            solute: Some(solute.name.clone()),
            quantity: Some("curve".into()),
            unit: Some(unit.symbol().into()),
            basis: Some(Basis::Fitted),
            extra: [
                ("from_c".to_string(), json!(tenth(from))),
                ("to_c".to_string(), json!(tenth(to))),
                ("henry_record".to_string(), json!(law.key)),
                ("dashed".to_string(), json!(dashed)),
            ]
            .into_iter()
            .collect(),
            ..Row::default()
        });
        series.push(Series {
            label: format!("{} ({})", solute.name, solute.formula),
            solute: solute.name.clone(),
            phase: None,
            colour: series.len(),
            segments,
        });
        gas::cite_law(snap, law, solute, answer);
        hazard(solute, answer);
    }
    answer.caveat(format!(
        "Henry's law for {conditions} in pure water; dilute solution taken as dense as pure water"
    ));
    if any_dashed {
        answer.caveat(
            "dashed lines are extrapolated beyond the Henry's-law data: treat them with care",
        );
    }
    let named: Vec<&Solute> = chosen.iter().map(|(x, _, _)| **x).collect();
    let under = match &s.pressure {
        None => "under humid air at 1 atm".to_string(),
        Some(GasPressure::Partial(p)) => {
            format!("at {} {} partial pressure", p.value, p.unit.symbol())
        }
        Some(GasPressure::Mixture { mixture, total }) => format!(
            "under humid {} at {}",
            mixture.text,
            total.map_or("1 atm".to_string(), |p| format!(
                "{} {}",
                p.value,
                p.unit.symbol()
            ))
        ),
    };
    Ok(PlotSpec {
        title: title(&format!("Dissolved gas in water {under}"), &named),
        x_label: X_LABEL.into(),
        y_label: format!("dissolved gas ({})", unit.symbol()),
        x_range: (to_celsius(t0), to_celsius(t1)),
        series,
        points: Vec::new(),
        transitions: Vec::new(),
        loading: None,
        footnote: footnote(
            "Henry's law in pure water; dashed: outside the record's temperature range. For \
             screening only.",
            answer,
            &DataState::default(),
        ),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_grid_holds_the_extra_temperatures_inside_the_range_once() {
        let g = grid(273.15, 373.15, [300.0, 300.0, 400.0, 273.15]);
        assert_eq!(g.len(), SAMPLES + 2);
        assert!(g.contains(&300.0));
        assert!(!g.contains(&400.0));
        assert!(g.windows(2).all(|w| w[0] < w[1]));
    }

    #[test]
    fn labels_round_to_a_tenth() {
        assert_eq!(tenth(32.38), 32.4);
        assert_eq!(tenth(to_celsius(273.15)), 0.0);
    }
}
