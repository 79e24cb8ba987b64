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
use crate::engine::records::{in_class, selects};
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::number::round_significant;
use crate::query::Screen;
use crate::science::ScienceError;
use crate::science::freezing::ICE_POINT;
use crate::science::solve::{Question, Scratch, verdict, verdict_on_lone};
use crate::science::units::{self, Context};

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
    // The ranking key of each row: its headroom as a key that sorts descending (a solute
    // that freezes in the range below every other), with the row's position.
    let mut keys: Vec<(u64, u32)> = Vec::with_capacity(solutes.len());
    let mut no_data: Vec<(u32, Missing)> = Vec::new();
    let mut counts = Counts::default();
    let mut scratch = Scratch::default();
    // A loading in a unit neither per litre nor molar is the same mass fraction for every
    // solute: worked out once (an error in it is still raised where the first solute
    // reaches it, as for the others).
    let unit = s.loading.unit;
    let same_for_all = (!unit.needs_density() && !unit.is_molar())
        .then(|| loading_mass_fraction_by_mass(&s.loading, f64::NAN));
    // The source last cited: a screening's solutes mostly share a few sources.
    let mut last_cited: Option<u32> = None;
    for (index, solute) in solutes.iter().enumerate() {
        // What a screening reads of each solute lies in one flat record; the solute itself
        // is read only for filters, per-litre loadings and ice.
        let Some(flat) = snap.screened_at(index, reviewed_only) else {
            continue;
        };
        let chosen = if filters.is_empty() {
            in_class(s.class, flat.kind)
        } else {
            selects(snap, solute, s.class, &filters)
        };
        if !chosen {
            continue;
        }
        let solute_at = u32::try_from(index).unwrap_or(u32::MAX);
        let apart = |reason: Missing| (solute_at, reason);
        if flat.kind == SoluteKind::Gas {
            no_data.push(apart(
                "a gas: its solubility depends on its pressure (ask `dissolved`)".into(),
            ));
            continue;
        }
        let built = || snap.curve_at(index, reviewed_only);
        if !flat.facts.present {
            no_data.push(apart(if reviewed_only {
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
                Some(w) => w.clone()?,
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
        let question = Question {
            w,
            t1_k: from,
            t2_k: t2,
            margin,
            extrapolate: s.options.extrapolate,
        };
        // The flat copy where it covers the range; else the whole curve (a curve of one
        // branch with a stable range of its own has no flat copy and is read as it is).
        let found = match flat
            .lone
            .and_then(|lone| verdict_on_lone(lone, &question, &mut scratch))
        {
            Some(found) => found,
            None => match built() {
                Some(b) => verdict(&b.curve, b.curve.lone(), &question, &mut scratch),
                None => continue,
            },
        };
        let found = match found {
            Ok(found) => found,
            Err(ScienceError::OutOfRange { .. } | ScienceError::InGap { .. }) => {
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
        counts.from_memory += usize::from(flat.facts.from_memory);
        counts.unreviewed += usize::from(flat.facts.unreviewed);
        match flat.facts.one_source {
            // Most solutes cite one source, most screenings a few: cite each once.
            Some(source) if last_cited == Some(source) => {}
            Some(source) => {
                last_cited = Some(source);
                cite_source_at(snap, source as usize, answer);
            }
            None => {
                for &i in built().map_or(&[][..], |b| &b.datasets) {
                    cite_source(snap, &datasets[i].source, answer);
                }
            }
        }
        let position = u32::try_from(rows.len()).unwrap_or(u32::MAX);
        let row = match ice {
            Some((t_ice, basis)) => {
                counts.frozen += 1;
                keys.push((descending(f64::NEG_INFINITY), position));
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
                // Rounded when printed (`Finding::Solubility`); a per-litre value comes
                // rounded already, and rounding it again leaves it as it is.
                let value = if s.loading.unit.needs_density() {
                    in_loading_unit(
                        snap,
                        found.limiting_mass_fraction,
                        &s.loading,
                        solute,
                        &s.options,
                        answer,
                    )
                    .ok()
                } else {
                    units::from_mass_fraction(
                        found.limiting_mass_fraction,
                        s.loading.unit,
                        &Context::with_molar_mass(flat.molar_mass),
                    )
                    .ok()
                };
                keys.push((descending(found.headroom_pct), position));
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
    let ordered = rank(snap, &rows, keys);
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
    caveats(answer, held, with_data, no_data_count, margin, &counts);
    Ok(())
}

/// The positions of the rows in the order shown: best headroom first, then by solute name, then in catalog
/// order. `keys` holds each row's headroom (minus infinity for a solute that freezes) as
/// [`descending`] makes it, and position in `rows`.
fn rank(snap: &Snapshot, rows: &[ScreenedRow], mut keys: Vec<(u64, u32)>) -> Vec<u32> {
    let solutes = snap.catalog.solutes();
    let name = |position: u32| {
        rows.get(position as usize)
            .and_then(|r| solutes.get(r.solute as usize))
            .map_or("", |s| s.name.as_str())
    };
    // The sort moves plain integers: each headroom's key with the row's position. Both sorts
    // below order equal keys by position, the order the rows came in.
    if keys.len() < RADIX_FROM {
        by_comparison(&mut keys);
    } else {
        radix_sort(&mut keys);
    }
    // Equal headrooms (rare, but every solute that freezes) by name, then position, as a
    // stable sort by (headroom, name) would leave them.
    let mut start = 0;
    while start < keys.len() {
        let headroom = keys[start].0;
        let run = keys[start..].iter().take_while(|k| k.0 == headroom).count();
        if run > 1 {
            keys[start..start + run]
                .sort_by(|&(_, a), &(_, b)| name(a).cmp(name(b)).then(a.cmp(&b)));
        }
        start += run;
    }
    keys.iter().map(|&(_, position)| position).collect()
}

/// From how many rows a screening ranks them by radix sort rather than by comparison.
const RADIX_FROM: usize = 2048;

/// Sorts `keys` by their first field, then their second, by comparison.
fn by_comparison(keys: &mut [(u64, u32)]) {
    keys.sort_unstable();
}

/// Up to how many keys [`radix_sort`] sorts by comparison.
const SMALL: usize = 48;

/// Sorts `keys` by their first field and, among equal ones, by their second, given that the
/// keys come ordered by their second field among equal first ones (rows come in position
/// order). A most-significant-digit radix sort: the keys are spread over buckets by their
/// leading bits below the bits all of them share (about one bucket per key: one counting
/// pass, one pass that moves them), and each bucket is sorted the same way where it lies,
/// by comparison once it is small.
fn radix_sort(keys: &mut [(u64, u32)]) {
    let mut moved = vec![(0u64, 0u32); keys.len()];
    spread(keys, &mut moved);
}

/// [`radix_sort`] of `keys` with `moved` (as long as `keys`) to move them through.
fn spread(keys: &mut [(u64, u32)], moved: &mut [(u64, u32)]) {
    if keys.len() <= SMALL || moved.len() != keys.len() {
        by_comparison(keys);
        return;
    }
    let (Some(lo), Some(hi)) = (
        keys.iter().map(|k| k.0).min(),
        keys.iter().map(|k| k.0).max(),
    ) else {
        return;
    };
    if lo == hi {
        // Equal keys, already in position order.
        return;
    }
    let bits = (usize::BITS - keys.len().leading_zeros()).clamp(4, 16);
    // The span's highest bit falls in the top bucket's half: at least two buckets are used.
    let shift = (u64::BITS - (hi - lo).leading_zeros()).saturating_sub(bits);
    let bucket = |key: u64| ((key - lo) >> shift) as usize;
    let mut starts = vec![0usize; bucket(hi) + 2];
    for &(key, _) in keys.iter() {
        starts[bucket(key) + 1] += 1;
    }
    for i in 1..starts.len() {
        starts[i] += starts[i - 1];
    }
    let mut next = starts.clone();
    for &item in keys.iter() {
        let b = bucket(item.0);
        if let Some(slot) = moved.get_mut(next[b]) {
            *slot = item;
        }
        next[b] += 1;
    }
    keys.copy_from_slice(moved);
    for pair in starts.windows(2) {
        if pair[1] - pair[0] > 1 {
            let bucket = pair[0]..pair[1];
            spread(&mut keys[bucket.clone()], &mut moved[bucket]);
        }
    }
}

/// The headroom's bits turned so that the integers order as `f64::total_cmp` orders the
/// numbers, reversed (best first).
fn descending(x: f64) -> u64 {
    let bits = x.to_bits();
    let ascending = if bits >> 63 == 1 {
        !bits
    } else {
        bits | (1 << 63)
    };
    !ascending
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

#[cfg(test)]
mod tests {
    use super::{descending, radix_sort};

    #[test]
    fn the_radix_sort_orders_as_a_stable_sort_by_key() {
        // Invented keys with many repeats, sharing their high bytes.
        let mut state = 0x2545_F491_4F6C_DD1Du64;
        let keys: Vec<(u64, u32)> = (0..10_000u32)
            .map(|position| {
                state ^= state << 13;
                state ^= state >> 7;
                state ^= state << 17;
                (0x3FF0_0000_0000_0000 | (state % 5_000) << 20, position)
            })
            .collect();
        let mut by_radix = keys.clone();
        radix_sort(&mut by_radix);
        let mut stable = keys;
        stable.sort_by_key(|k| k.0);
        assert_eq!(by_radix, stable);
        // One key far from the rest (a solute that freezes) and keys all equal.
        let mut far: Vec<(u64, u32)> = vec![(7, 0), (u64::MAX, 1), (5, 2), (7, 3), (6, 4)];
        radix_sort(&mut far);
        assert_eq!(far, [(5, 2), (6, 4), (7, 0), (7, 3), (u64::MAX, 1)]);
        let mut same = vec![(9u64, 2u32), (9, 0), (9, 1)];
        radix_sort(&mut same);
        assert_eq!(same, [(9, 0), (9, 1), (9, 2)]);
    }

    #[test]
    fn the_integer_keys_order_as_the_headrooms_reversed() {
        let values = [
            f64::NEG_INFINITY,
            -1e300,
            -12.5,
            -0.0,
            0.0,
            1e-300,
            3.0,
            12.5,
            f64::INFINITY,
        ];
        for a in values {
            for b in values {
                assert_eq!(
                    descending(a).cmp(&descending(b)),
                    b.total_cmp(&a),
                    "{a} {b}"
                );
            }
        }
    }
}
