//! `plot NaCl with ice`: the rest of a salt's phase diagram on its plot — the ice line
//! (from the tables, the activity model or the dilute limit, as `freezing` finds it) down to
//! the eutectic, and the eutectic itself.

use serde_json::json;

use crate::answer::plot_spec::{Segment, Series, TransitionMark};
use crate::answer::{Answer, Basis, Row};
use crate::engine::common::{celsius, value};
use crate::engine::error::EvalError;
use crate::engine::freezing::{ice_caveats, system_of};
use crate::engine::snapshot::Snapshot;
use crate::model::Solute;
use crate::science::freezing::IceBasis;
use crate::science::units::CompositionUnit;

/// Mass fractions sampled along an ice line.
const STEPS: usize = 120;
/// How far to look for an ice line with no eutectic to end it.
const W_SEARCH: f64 = 0.5;

/// (mass fraction, K) along the solute's ice line, from pure water to the eutectic,
/// ascending in mass fraction; `None` where no method knows it (a gap in the line).
fn ice_samples(
    snap: &Snapshot,
    solute: &Solute,
    reviewed_only: bool,
) -> Vec<Option<(f64, f64, IceBasis)>> {
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, reviewed_only, &models);
    let end = system.eutectic().map_or(W_SEARCH, |(w, _)| w);
    let mut out = vec![Some((0.0, 273.15, IceBasis::Ideal))];
    for k in 1..=STEPS {
        let w = end * k as f64 / STEPS as f64;
        out.push(system.ice_line(w).ok().map(|ice| (w, ice.t_k, ice.basis)));
    }
    out
}

/// The known points of [`ice_samples`].
fn ice_points(snap: &Snapshot, solute: &Solute, reviewed_only: bool) -> Vec<(f64, f64, IceBasis)> {
    ice_samples(snap, solute, reviewed_only)
        .into_iter()
        .flatten()
        .collect()
}

/// What `with ice` adds for one solute: the ice line (when any of it is known), the
/// eutectic's mark (when inside the picture) and their rows.
pub(super) type IceDrawing = (Option<Series>, Option<TransitionMark>, Vec<Row>);

/// The lowest temperature of the solute's ice line (its eutectic where known), K.
pub(super) fn lowest_ice_temperature(
    snap: &Snapshot,
    solute: &Solute,
    reviewed_only: bool,
) -> Option<f64> {
    let points = ice_points(snap, solute, reviewed_only);
    (points.len() > 1).then(|| points.iter().map(|p| p.1).fold(f64::INFINITY, f64::min))
}

/// The ice line of one solute as a series over (t0, t1) K, its eutectic as a mark, and
/// their rows; `plotted` turns a mass fraction into the plot's unit.
#[allow(clippy::too_many_arguments)]
pub(super) fn ice_line(
    snap: &Snapshot,
    solute: &Solute,
    reviewed_only: bool,
    (t0, t1): (f64, f64),
    colour: usize,
    unit: CompositionUnit,
    plotted: &dyn Fn(f64) -> Result<f64, EvalError>,
    answer: &mut Answer,
) -> Result<IceDrawing, EvalError> {
    let points = ice_points(snap, solute, reviewed_only);
    if points.len() < 2 {
        answer.caveat(format!(
            "{}: no ice line is known (no freezing data, no activity model covering it), so none is drawn",
            solute.name
        ));
        return Ok((None, None, Vec::new()));
    }
    let models = snap.models_for(&solute.formula);
    let system = system_of(snap, solute, reviewed_only, &models);
    for basis in [IceBasis::Tabulated, IceBasis::Model, IceBasis::Ideal] {
        if let Some(p) = points.iter().skip(1).find(|p| p.2 == basis)
            && let Ok(ice) = system.ice_line(p.0)
        {
            ice_caveats(snap, &system, &ice, solute, answer);
        }
    }
    // One segment per run of known points, ascending in temperature (the line falls as
    // the brine strengthens); a gap where no method knows the line is left undrawn.
    let mut segments: Vec<Segment> = Vec::new();
    let mut run: Vec<(f64, f64)> = Vec::new();
    let mut gaps = false;
    for sample in ice_samples(snap, solute, reviewed_only).iter().rev() {
        match sample {
            Some((w, t_k, _)) if *t_k >= t0 - 1e-9 && *t_k <= t1 + 1e-9 => {
                if run
                    .last()
                    .is_none_or(|p| (p.0 - (t_k - 273.15)).abs() > 1e-9)
                {
                    run.push((t_k - 273.15, plotted(*w)?));
                }
            }
            Some(_) => {}
            None => {
                gaps = true;
                if run.len() > 1 {
                    segments.push(Segment {
                        points: std::mem::take(&mut run),
                        extrapolated: false,
                    });
                }
                run.clear();
            }
        }
    }
    if run.len() > 1 {
        segments.push(Segment {
            points: run,
            extrapolated: false,
        });
    }
    if gaps {
        answer.caveat(format!(
            "{}: part of the ice line is not known (beyond the dilute limit, the freezing tables and the activity model's range) and is left undrawn",
            solute.name
        ));
    }
    let drawn: usize = segments.iter().map(|g| g.points.len()).sum();
    let lowest = points.last().map(|p| p.1).unwrap_or(273.15);
    let mut rows = vec![Row {
        solute: Some(solute.name.clone()),
        quantity: Some("ice line".into()),
        basis: Some(Basis::Computed),
        extra: [
            ("points".to_string(), json!(drawn)),
            ("down_to_c".to_string(), json!(celsius(lowest))),
        ]
        .into_iter()
        .collect(),
        ..Row::default()
    }];
    let mut mark = None;
    if let Some((we, te)) = system.eutectic() {
        let t_c = celsius(te);
        rows.push(Row {
            solute: Some(solute.name.clone()),
            quantity: Some("eutectic".into()),
            value: Some(t_c),
            unit: Some("C".into()),
            basis: Some(Basis::Tabulated),
            extra: [
                ("loading".to_string(), json!(value(plotted(we)?))),
                ("loading_unit".to_string(), json!(unit.symbol())),
            ]
            .into_iter()
            .collect(),
            ..Row::default()
        });
        if te > t0 - 1e-9 && te < t1 + 1e-9 {
            mark = Some(TransitionMark {
                temperature_c: t_c,
                label: format!("{}: eutectic (ice + salt) at {} °C", solute.name, t_c),
                colour,
            });
        }
    } else {
        answer.caveat(format!(
            "{}: the reference holds no eutectic; the ice line is drawn as far as it is known ({} C)",
            solute.name,
            celsius(lowest)
        ));
    }
    let series = (!segments.is_empty()).then(|| Series {
        label: format!("{}: ice line", solute.name),
        solute: solute.name.clone(),
        phase: Some("ice".into()),
        colour,
        segments,
    });
    Ok((series, mark, rows))
}
