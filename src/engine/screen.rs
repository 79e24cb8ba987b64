//! `which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%`: every solute
//! of a class against one loading. A screening may run over 100,000 solutes, so each
//! solute's result is a compact row that refers to the catalog's names
//! ([`ScreenedRow`]); the printers make the rows whole as they write them.

use serde_json::json;

use crate::answer::screened::{Finding, ScreenTable, ScreenedRow};
use crate::answer::{Answer, Row};
use crate::engine::CAUTION;
use crate::engine::common::{bounds, celsius, cite_source, in_unit, loading_mass_fraction};
use crate::engine::error::EvalError;
use crate::engine::records::selects;
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::number::round_significant;
use crate::query::Screen;
use crate::science::ScienceError;
use crate::science::freezing::ICE_POINT;
use crate::science::solve::{Scratch, verdict};

use super::solid::{finite_headroom, zero_loading_caveat};

/// How many screened solutes fell into each group the caveats count.
#[derive(Default)]
struct Counts {
    from_memory: usize,
    unreviewed: usize,
    frozen: usize,
}

pub fn screen(snap: &Snapshot, s: &Screen, answer: &mut Answer) -> Result<(), EvalError> {
    let (t1, t2) = bounds(&s.temperatures);
    let margin = s.margin.map_or(0.0, |m| m.percent / 100.0);
    let filters = crate::engine::filters::checked(snap, &s.filters, answer)?;
    let solutes = snap.catalog.solutes();
    let datasets = snap.catalog.datasets();
    let reviewed_only = s.options.reviewed_only;
    let mut rows: Vec<ScreenedRow> = Vec::with_capacity(solutes.len());
    // The ranking key of each row: its headroom (a solute that freezes in the range below
    // every other), with the row's position.
    let mut ranks: Vec<(f64, u32)> = Vec::with_capacity(solutes.len());
    let mut no_data: Vec<Row> = Vec::new();
    let mut counts = Counts::default();
    let mut scratch = Scratch::default();
    // The source last cited: a screening's solutes mostly share a few sources.
    let mut last_cited: Option<usize> = None;
    for (index, solute) in solutes.iter().enumerate() {
        if !selects(snap, solute, s.class, &filters) {
            continue;
        }
        let missing = |reason: String| Row {
            solute: Some(solute.name.clone()),
            extra: [
                ("status".to_string(), json!("no data")),
                ("reason".to_string(), json!(reason)),
            ]
            .into_iter()
            .collect(),
            ..Row::default()
        };
        if solute.kind == SoluteKind::Gas {
            no_data.push(missing(
                "a gas: its solubility depends on its pressure (ask `dissolved`)".into(),
            ));
            continue;
        }
        let Some(built) = snap.curve_at(index, reviewed_only) else {
            no_data.push(missing(if reviewed_only {
                "no reviewed solubility data".into()
            } else {
                "no solubility data yet".into()
            }));
            continue;
        };
        // A per-litre loading needs each solution's density: a solute without one is
        // listed apart with the reason, never as passing.
        let w = match loading_mass_fraction(snap, &s.loading, solute, &s.options, answer) {
            Ok(w) => w,
            Err(e) if s.loading.unit.needs_density() => {
                no_data.push(missing(e.to_string()));
                continue;
            }
            Err(e) => return Err(e),
        };
        // Below 0 °C the loading's ice line comes first, as in `require`: where ice forms in
        // the range the solute does not pass, and its curve is checked from the ice line up.
        // (A solute whose curve does not reach the range is listed for that reason first;
        // one whose ice line is not known, for that one.)
        let (mut from, mut ice, mut ice_unknown) = (t1, None, None);
        if t1 < ICE_POINT {
            match crate::engine::freezing::ice_onset(snap, solute, w, reviewed_only) {
                Ok(Some((t_ice, basis))) if t_ice > t1 => {
                    from = t_ice.min(t2);
                    ice = Some((t_ice, basis));
                }
                Ok(_) => {}
                Err(reason) => ice_unknown = Some(reason),
            }
        }
        let found = verdict(
            &built.curve,
            w,
            from,
            t2,
            margin,
            s.options.extrapolate,
            &mut scratch,
        );
        let found = match found {
            Ok(found) => found,
            Err(ScienceError::OutOfRange { .. } | ScienceError::InGap { .. }) => {
                let (lo, hi) = built.curve.temperature_range();
                no_data.push(missing(format!(
                    "data do not cover the whole range (they cover {} C to {} C)",
                    celsius(lo),
                    celsius(hi)
                )));
                continue;
            }
            Err(other) => {
                no_data.push(missing(other.to_string()));
                continue;
            }
        };
        if let Some(reason) = ice_unknown {
            no_data.push(missing(format!(
                "whether ice forms in the range is not known: {reason}"
            )));
            continue;
        }
        counts.from_memory += usize::from(built.from_memory);
        counts.unreviewed += usize::from(built.unreviewed);
        match built.one_source {
            // Most solutes cite one source, most screenings a few: cite each once.
            Some(source) if last_cited == Some(source) => {}
            Some(source) => {
                last_cited = Some(source);
                if let Some(s) = snap.catalog.sources().get(source) {
                    cite_source(snap, &s.key, answer);
                }
            }
            None => {
                for &i in &built.datasets {
                    cite_source(snap, &datasets[i].source, answer);
                }
            }
        }
        let position = u32::try_from(rows.len()).unwrap_or(u32::MAX);
        let solute_at = u32::try_from(index).unwrap_or(u32::MAX);
        let row = match ice {
            Some((t_ice, basis)) => {
                counts.frozen += 1;
                ranks.push((f64::NEG_INFINITY, position));
                ScreenedRow {
                    solute: solute_at,
                    finding: Finding::Ice,
                    basis,
                    holds: false,
                    temperature_c: celsius(t_ice),
                    headroom_pct: None,
                }
            }
            None => {
                let value = in_unit(
                    snap,
                    found.limiting_mass_fraction,
                    s.loading.unit,
                    solute,
                    s.loading.span,
                    &s.options,
                    answer,
                )
                .ok();
                ranks.push((found.headroom_pct, position));
                ScreenedRow {
                    solute: solute_at,
                    finding: Finding::Solubility {
                        branch: u16::try_from(found.branch).unwrap_or(u16::MAX),
                        value,
                    },
                    basis: found.basis,
                    holds: found.holds,
                    temperature_c: celsius(found.limiting_t_k),
                    headroom_pct: finite_headroom(found.headroom_pct),
                }
            }
        };
        rows.push(row);
    }
    let held = rows.iter().filter(|r| r.holds).count();
    let with_data = rows.len();
    let no_data_count = no_data.len();
    let ordered = rank(snap, &rows, ranks);
    answer.rows.set_table(ScreenTable::new(
        snap.screen_names().clone(),
        reviewed_only,
        s.loading.unit.symbol(),
        ordered,
    ));
    answer.rows.extend(no_data);
    if s.loading.value == 0.0 {
        zero_loading_caveat(0.0, answer);
    }
    caveats(answer, held, with_data, no_data_count, margin, &counts);
    Ok(())
}

/// The rows in the order shown: best headroom first, then by solute name, then in catalog
/// order. Only (key, position) pairs move while sorting.
fn rank(snap: &Snapshot, rows: &[ScreenedRow], mut ranks: Vec<(f64, u32)>) -> Vec<ScreenedRow> {
    let solutes = snap.catalog.solutes();
    let name = |position: u32| {
        rows.get(position as usize)
            .and_then(|r| solutes.get(r.solute as usize))
            .map_or("", |s| s.name.as_str())
    };
    // Descending headroom; equal headrooms (rare but for solutes that freeze) by name and
    // then position, as a stable sort by (headroom, name) would leave them.
    ranks.sort_unstable_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(&b.1)));
    let mut start = 0;
    while start < ranks.len() {
        let key = ranks[start].0;
        let end = start
            + ranks[start..]
                .iter()
                .take_while(|r| r.0.total_cmp(&key).is_eq())
                .count();
        if end - start > 1 {
            ranks[start..end].sort_by(|a, b| name(a.1).cmp(name(b.1)).then(a.1.cmp(&b.1)));
        }
        start = end;
    }
    ranks
        .iter()
        .filter_map(|&(_, position)| rows.get(position as usize).copied())
        .collect()
}

/// What a screening says beside its rows: how many passed, the margin, the solutes that
/// freeze, the state of their data, and the caution.
fn caveats(
    answer: &mut Answer,
    held: usize,
    with_data: usize,
    no_data_count: usize,
    margin: f64,
    counts: &Counts,
) {
    answer.caveat(format!(
        "{held} of {with_data} solutes with data stay dissolved; {no_data_count} without data over the range are listed apart as \"no data\", never as passing"
    ));
    if margin > 0.0 {
        answer.caveat(format!(
            "margin {}%: the solubility must exceed the loading by that share of its solute-to-water ratio",
            round_significant(margin * 100.0, 4)
        ));
    }
    if counts.frozen > 0 {
        answer.caveat(format!(
            "{} of the solutes screened freeze in the range: ice forms on cooling below the temperature given, before any salt crystallises; such a product does not stay liquid",
            counts.frozen
        ));
    }
    if counts.from_memory > 0 {
        answer.caveat(format!(
            "{} of the solutes screened rest on data typed from memory of the cited tables, not yet checked against them (from-memory)",
            counts.from_memory
        ));
    }
    if counts.unreviewed > 0 {
        answer.caveat(format!(
            "{} of the solutes screened rest on unreviewed data",
            counts.unreviewed
        ));
    }
    answer.caveat(CAUTION);
}
