//! `which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%`: every solute
//! of a class against one loading. A screening may run over 100,000 solutes, so each
//! solute's result is a compact row that refers to the catalog's names
//! ([`ScreenedRow`]); the printers make the rows whole as they write them.

use crate::answer::Answer;
use crate::answer::screened::{Finding, Missing, ScreenTable, ScreenedRow};
use crate::engine::CAUTION;
use crate::engine::common::{
    bounds, celsius, cite_source, cite_source_at, in_loading_unit, loading_mass_fraction,
    loading_mass_fraction_by_mass,
};
use crate::engine::error::EvalError;
use crate::engine::flat_curves::ScreenedSolute;
use crate::engine::ranking::{descending, ranked};
use crate::engine::records::{in_class, selects};
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::number::round_significant;
use crate::query::Screen;
use crate::science::ScienceError;
use crate::science::freezing::ICE_POINT;
use crate::science::solve::{Question, Scratch, Target, Verdict, verdict, verdict_on_lone};
use crate::science::units::{self, Context};

use super::solid::zero_loading_caveat;

/// How many screened solutes fell into each group the caveats count, and the source cited
/// last (a screening's solutes mostly share a few sources).
#[derive(Default)]
struct Counts {
    from_memory: usize,
    unreviewed: usize,
    frozen: usize,
    last_cited: Option<u32>,
}

pub fn screen(snap: &Snapshot, s: &Screen, answer: &mut Answer) -> Result<(), EvalError> {
    let (t1, t2) = bounds(&s.temperatures);
    let margin = s.margin.map_or(0.0, |m| m.percent / 100.0);
    let filters = crate::engine::filters::checked(snap, &s.filters, answer)?;
    let solutes = snap.catalog.solutes();
    let reviewed_only = s.options.reviewed_only;
    let mut rows: Vec<ScreenedRow> = Vec::with_capacity(solutes.len());
    // The ranking key of each row, by position: its headroom as a key that sorts
    // descending (a solute that freezes in the range below every other).
    let mut keys: Vec<u64> = Vec::with_capacity(solutes.len());
    let mut no_data: Vec<(u32, Missing)> = Vec::new();
    let mut counts = Counts::default();
    let mut held = 0;
    // Solutes whose solubility could not be given in the loading's per-litre unit.
    let mut no_figure: Vec<&str> = Vec::new();
    let mut scratch = Scratch::default();
    // A loading in a unit neither per litre nor molar is the same mass fraction for every
    // solute: worked out once (an error in it is still raised where the first solute
    // reaches it, as for the others).
    let unit = s.loading.unit;
    let same_for_all = (!unit.needs_density() && !unit.is_molar())
        .then(|| loading_mass_fraction_by_mass(&s.loading, f64::NAN));
    let mut last_target: Option<(u64, Result<Target, ScienceError>)> = None;
    // The common screening (no filters, at or above the ice point, one loading and target
    // for every solute) asks each solute with a flat copy of its curve only that copy,
    // without the bookkeeping below; the answer is the same as the whole path gives.
    let common = match (&same_for_all, filters.is_empty() && t1 >= ICE_POINT) {
        (Some(Ok(w)), true) => Target::checked(*w, margin).ok().map(|target| Question {
            target,
            t1_k: t1,
            t2_k: t2,
            extrapolate: s.options.extrapolate,
        }),
        _ => None,
    };
    for (index, solute) in solutes.iter().enumerate() {
        // What a screening reads of each solute lies in one flat record; the solute itself
        // is read only for filters, per-litre loadings and ice.
        let Some(flat) = snap.screened_at(index, reviewed_only) else {
            continue;
        };
        let solute_at = u32::try_from(index).unwrap_or(u32::MAX);
        if let Some(question) = &common
            && flat.facts.present
            && flat.kind != SoluteKind::Gas
            && in_class(s.class, flat.kind)
            && let Some(found) = flat
                .lone
                .and_then(|lone| verdict_on_lone(lone, question, &mut scratch))
        {
            counts.tally(snap, (&flat, index), reviewed_only, answer);
            let value = units::from_mass_fraction_and_ratio(
                found.limiting_mass_fraction,
                found.limiting_ratio,
                s.loading.unit,
                &Context::with_molar_mass(flat.molar_mass),
            )
            .ok();
            keys.push(descending(found.headroom_pct));
            held += usize::from(found.holds);
            rows.push(solubility_row(solute_at, &found, value));
            continue;
        }
        let chosen = if filters.is_empty() {
            in_class(s.class, flat.kind)
        } else {
            selects(snap, solute, s.class, &filters)
        };
        if !chosen {
            continue;
        }
        let apart = |reason: Missing| (solute_at, reason);
        if flat.kind == SoluteKind::Gas {
            no_data.push(apart(
                "a gas: its solubility depends on its pressure (ask `dissolved`)".into(),
            ));
            continue;
        }
        let built = || snap.curve_at(index, reviewed_only);
        if !flat.facts.present {
            no_data.push(apart(if crate::engine::common::miscible(snap, solute) {
                // Not a gap in the data: there is no limit to tabulate.
                "mixes with water in all proportions: no saturation limit to screen (a recipe of it gives its ice line)".into()
            } else if reviewed_only {
                "no reviewed solubility data".into()
            } else {
                "no solubility data yet".into()
            }));
            continue;
        }
        // A per-litre loading needs each solution's density: a solute without one is
        // listed apart with the reason, never as passing.
        let w = if s.loading.unit.needs_density() {
            match loading_mass_fraction(snap, &s.loading, solute, &s.options, answer) {
                Ok(w) => w,
                Err(e) => {
                    no_data.push(apart(e.to_string().into()));
                    continue;
                }
            }
        } else {
            match &same_for_all {
                Some(Ok(w)) => *w,
                Some(Err(e)) => return Err(e.clone()),
                None => loading_mass_fraction_by_mass(&s.loading, flat.molar_mass)?,
            }
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
        // Most screenings judge every solute against one loading: its target is worked out
        // once (an error in it is raised for each solute, as before).
        let (_, target) = match &mut last_target {
            Some(last) if last.0 == w.to_bits() => last,
            slot => slot.insert((w.to_bits(), Target::checked(w, margin))),
        };
        // The flat copy where it covers the range; else the whole curve (a curve of one
        // branch with a stable range of its own has no flat copy and is read as it is).
        let found = match target {
            Err(e) => Err(e.clone()),
            Ok(target) => {
                let question = Question {
                    target: *target,
                    t1_k: from,
                    t2_k: t2,
                    extrapolate: s.options.extrapolate,
                };
                match flat
                    .lone
                    .and_then(|lone| verdict_on_lone(lone, &question, &mut scratch))
                {
                    Some(found) => Ok(found),
                    None => match built() {
                        Some(b) => verdict(&b.curve, b.curve.lone(), &question, &mut scratch),
                        None => continue,
                    },
                }
            }
        };
        let found = match found {
            Ok(found) => found,
            Err(
                ScienceError::OutOfRange { .. }
                | ScienceError::InGap { .. }
                | ScienceError::NoTrend { .. },
            ) => {
                let (lo, hi) =
                    built().map_or((f64::NAN, f64::NAN), |b| b.curve.temperature_range());
                no_data.push(apart(Missing::Uncovered {
                    from_c: celsius(lo),
                    to_c: celsius(hi),
                }));
                continue;
            }
            Err(other) => {
                no_data.push(apart(other.to_string().into()));
                continue;
            }
        };
        if let Some(reason) = ice_unknown {
            no_data.push(apart(
                format!("whether ice forms in the range is not known: {reason}").into(),
            ));
            continue;
        }
        counts.tally(snap, (&flat, index), reviewed_only, answer);
        let row = match ice {
            Some((t_ice, basis)) => {
                counts.frozen += 1;
                keys.push(descending(f64::NEG_INFINITY));
                ScreenedRow::new(
                    solute_at,
                    Finding::Ice,
                    basis,
                    false,
                    t_ice - ICE_POINT,
                    f64::NEG_INFINITY,
                )
            }
            None => {
                // Rounded when printed (`Finding::Solubility`); a per-litre value comes
                // rounded already, and rounding it again leaves it as it is.
                let value = if s.loading.unit.needs_density() {
                    let figure = in_loading_unit(
                        snap,
                        found.limiting_mass_fraction,
                        &s.loading,
                        solute,
                        &s.options,
                        answer,
                    )
                    .ok();
                    if figure.is_none() {
                        no_figure.push(&solute.name);
                    }
                    figure
                } else {
                    units::from_mass_fraction_and_ratio(
                        found.limiting_mass_fraction,
                        found.limiting_ratio,
                        s.loading.unit,
                        &Context::with_molar_mass(flat.molar_mass),
                    )
                    .ok()
                };
                keys.push(descending(found.headroom_pct));
                held += usize::from(found.holds);
                solubility_row(solute_at, &found, value)
            }
        };
        rows.push(row);
    }
    let with_data = rows.len();
    let no_data_count = no_data.len();
    let ordered = ranked(&keys, |position| {
        rows.get(position as usize)
            .and_then(|r| solutes.get(r.solute() as usize))
            .map_or("", |s| s.name.as_str())
    });
    answer.rows.set_table(ScreenTable::new(
        snap.screen_names().clone(),
        reviewed_only,
        s.loading.unit.symbol(),
        (rows, ordered),
        no_data,
    ));
    if s.loading.value == 0.0 {
        zero_loading_caveat(0.0, answer);
    }
    if !no_figure.is_empty() {
        answer.caveat(no_figure_caveat(&no_figure, s.loading.unit.symbol()));
    }
    caveats(answer, held, with_data, no_data_count, margin, &counts);
    Ok(())
}

/// Why some rows show no solubility in a per-litre unit: the density of their saturated
/// solutions is not known. Their verdicts stand (they are worked per kg of water).
fn no_figure_caveat(names: &[&str], unit: &str) -> String {
    const SHOWN: usize = 5;
    let mut listed = names
        .iter()
        .take(SHOWN)
        .copied()
        .collect::<Vec<_>>()
        .join(", ");
    if names.len() > SHOWN {
        listed.push_str(&format!(" and {} more", names.len() - SHOWN));
    }
    format!(
        "no solubility in {unit} for {} of the solutes ({listed}): the saturated solution lies beyond the mass fractions their density coefficients cover; their verdicts and headrooms stand (worked per kg of water)",
        names.len()
    )
}

/// The row of a solute whose curve was judged: its solubility in the loading's unit
/// (`value`), where it is lowest over the range, and the headroom.
#[inline]
fn solubility_row(solute_at: u32, found: &Verdict, value: Option<f64>) -> ScreenedRow {
    ScreenedRow::new(
        solute_at,
        Finding::Solubility {
            branch: u16::try_from(found.branch).unwrap_or(u16::MAX),
            value,
        },
        found.basis,
        found.holds,
        found.limiting_t_k - ICE_POINT,
        found.headroom_pct,
    )
}

impl Counts {
    /// Counts what a screened solute's curve rests on and cites its sources: a source
    /// shared with the solute before it is not cited again.
    #[inline]
    fn tally(
        &mut self,
        snap: &Snapshot,
        (flat, index): (&ScreenedSolute<'_>, usize),
        reviewed_only: bool,
        answer: &mut Answer,
    ) {
        self.from_memory += usize::from(flat.facts.from_memory);
        self.unreviewed += usize::from(flat.facts.unreviewed);
        match flat.facts.one_source {
            // Most solutes cite one source, most screenings a few: cite each once.
            Some(source) if self.last_cited == Some(source) => {}
            Some(source) => {
                self.last_cited = Some(source);
                cite_source_at(snap, source as usize, answer);
            }
            None => {
                let datasets = snap.catalog.datasets();
                let built = snap.curve_at(index, reviewed_only);
                for &i in built.map_or(&[][..], |b| &b.datasets) {
                    if let Some(d) = datasets.get(i) {
                        cite_source(snap, &d.source, answer);
                    }
                }
            }
        }
    }
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
