//! The lowest point of a solubility curve over a temperature range, found exactly from the
//! curve's own pieces rather than by scanning.
//!
//! Why a finite list of candidates is enough: between two neighbouring *breakpoints* (every
//! branch's knots, the ends of every branch's covered and stable ranges, every transition,
//! and the range's ends) the set of branches the stable curve may choose from does not
//! change, and the stable curve is the lowest of them there (see [`Curve::evaluate`]). The
//! minimum over such a piece of a minimum of branches is the minimum over the branches of
//! each branch's minimum over the piece, and a branch's cubic piece (or its straight end
//! tangent) has its minimum at an end of the piece or where its derivative vanishes. So the
//! candidates are: every breakpoint, a point just inside each side of every breakpoint where
//! the set of branches changes in a step (a branch's ends, its stable range's ends, the
//! transitions: the limit on that side), and every turning point of every branch's cubic
//! inside the range ([`Branch::turning_points`]). At a knot or an end of the range the
//! stable curve is continuous, so its value there stands for both sides. The stable curve is
//! evaluated at each candidate and the lowest value wins; a breakpoint itself is preferred
//! to a point beside it that is no lower by more than rounding.

use super::curve::{Basis, BranchView, Curve, Transition};
use super::error::ScienceError;

/// How far inside a piece the one-sided limit at a breakpoint is taken, K: far below any
/// temperature the answers show, far above the spacing of f64 near 300 K (about 6e-14 K).
const BESIDE_K: f64 = 1e-7;

/// Values closer than this (in mass fraction) count as equal when choosing between a
/// breakpoint and a point beside it.
const TIE: f64 = 1e-12;

/// The lowest point of the curve over a range.
#[derive(Debug, Clone, PartialEq)]
pub struct Minimum {
    /// Where the curve is lowest, K.
    pub t_k: f64,
    /// The curve's mass fraction there.
    pub mass_fraction: f64,
    /// Stable phase there.
    pub phase: String,
    pub basis: Basis,
}

/// [`Minimum`] with the stable phase as its branch's index in [`Curve::branches`]: what a
/// screening keeps per solute (no allocation).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Lowest {
    pub t_k: f64,
    pub mass_fraction: f64,
    /// Index of the stable branch there in [`Curve::branches`].
    pub branch: usize,
    pub basis: Basis,
}

/// Buffers [`lowest`] reuses from one curve to the next, so that a screening of many
/// solutes lists their candidates without allocating for each.
#[derive(Debug, Default)]
pub struct Scratch {
    breaks: Vec<f64>,
    turning: Vec<f64>,
    candidates: Vec<(f64, bool)>,
}

/// The minimum of the curve over [t1_k, t2_k] (every temperature, not only the ends), exact
/// up to the rounding of the candidates listed in the module's comment.
///
/// Without `extrapolate` every temperature of the range must have data (else
/// [`ScienceError::OutOfRange`] or [`ScienceError::InGap`]); with it, missing parts are
/// extrapolated on the branches' end tangents and the basis is `Extrapolated`. A single
/// temperature (t1_k = t2_k) is one evaluation there.
pub fn minimum(
    curve: &Curve,
    t1_k: f64,
    t2_k: f64,
    extrapolate: bool,
) -> Result<Minimum, ScienceError> {
    let low = lowest(curve, t1_k, t2_k, extrapolate, &mut Scratch::default())?;
    Ok(Minimum {
        t_k: low.t_k,
        mass_fraction: low.mass_fraction,
        phase: curve.branches[low.branch].phase.clone(),
        basis: low.basis,
    })
}

/// [`minimum`] with the stable phase as a branch index, reusing `scratch`.
pub fn lowest(
    curve: &Curve,
    t1_k: f64,
    t2_k: f64,
    extrapolate: bool,
    scratch: &mut Scratch,
) -> Result<Lowest, ScienceError> {
    lowest_with(curve, curve.lone(), t1_k, t2_k, extrapolate, scratch)
}

/// [`lowest`] with the curve's lone branch (when it has only one) given as a view, such as
/// the engine's flat copy of its knots, read without reaching into the curve; `None` for a
/// curve of several branches.
pub fn lowest_with(
    curve: &Curve,
    lone: Option<BranchView<'_>>,
    t1_k: f64,
    t2_k: f64,
    extrapolate: bool,
    scratch: &mut Scratch,
) -> Result<Lowest, ScienceError> {
    if !(t1_k.is_finite() && t2_k.is_finite()) || t2_k < t1_k {
        return Err(ScienceError::BadRange { t1_k, t2_k });
    }
    // Where the lone branch covers the whole range the stable curve is that branch itself,
    // with no gap, transition or other branch to look for (and the range is within any
    // extrapolation window).
    if let Some(m) = lone.and_then(|b| lowest_on_lone(b, t1_k, t2_k, scratch)) {
        return Ok(m);
    }
    // So too where one branch is the only one stable anywhere in the range, and stable and
    // covered beyond both its ends: there the stable curve is that branch (see
    // [`Curve::evaluate`]).
    if let Some((i, b)) = sole_stable_branch(curve, t1_k, t2_k) {
        return Ok(Lowest {
            branch: i,
            ..lowest_on(b, t1_k, t2_k, scratch)
        });
    }
    lowest_of_all(curve, (t1_k, t2_k), extrapolate, scratch)
}

/// The branch (its index and view) whose known stable range reaches beyond both ends of
/// [t1_k, t2_k] (and so does the range it covers, which holds its stable range) while no
/// other branch's known stable range reaches into it: the one branch the stable curve can
/// be there.
fn sole_stable_branch(curve: &Curve, t1_k: f64, t2_k: f64) -> Option<(usize, BranchView<'_>)> {
    let strictly_within = |(lo, hi): (f64, f64)| lo < t1_k && t2_k < hi;
    let mut sole = None;
    for (i, branch) in curve.branches.iter().enumerate() {
        let b = branch.view();
        match b.stable {
            Some(stable) if strictly_within(stable) => {
                if sole.is_some() {
                    return None;
                }
                sole = Some((i, b));
            }
            Some((lo, hi)) if lo <= t2_k && hi >= t1_k => return None,
            _ => {}
        }
    }
    sole
}

/// [`lowest_with`] from every branch's candidates (the module's comment), each evaluated
/// on the stable curve.
fn lowest_of_all(
    curve: &Curve,
    (t1_k, t2_k): (f64, f64),
    extrapolate: bool,
    scratch: &mut Scratch,
) -> Result<Lowest, ScienceError> {
    if extrapolate {
        // Both ends within reach: the window is an interval around the data, so the
        // whole range is.
        curve.check_reach(t1_k)?;
        curve.check_reach(t2_k)?;
    }
    if t1_k == t2_k {
        let uncovered = !curve.covers(t1_k);
        if uncovered && !extrapolate {
            curve.evaluate_branch(t1_k, false)?;
        }
        let (branch, mass_fraction, basis) = curve.evaluate_branch(t1_k, true)?;
        return Ok(Lowest {
            t_k: t1_k,
            mass_fraction,
            branch,
            basis: if uncovered {
                Basis::Extrapolated
            } else {
                basis
            },
        });
    }
    // Every end of a branch inside the range: a side of it without data is a gap.
    // The first temperature without data is the one an error names: an end of the range
    // before a gap inside it.
    let mut uncovered = [t1_k, t2_k].into_iter().find(|&t| !curve.covers(t));
    for b in &curve.branches {
        let (lo, hi) = b.range();
        for t in [lo - 1e-9, hi + 1e-9] {
            if uncovered.is_none() && t > t1_k && t < t2_k && !curve.covers(t) {
                uncovered = Some(t);
            }
        }
    }
    if let Some(t) = uncovered
        && !extrapolate
    {
        curve.evaluate_branch(t, false)?;
    }
    candidates(curve, t1_k, t2_k, scratch);
    // (t, w, at a breakpoint, stable branch, basis) of the lowest candidate so far.
    let mut best: Option<(f64, f64, bool, usize, Basis)> = None;
    for &(t, at_breakpoint) in &scratch.candidates {
        let Ok((branch, w, basis)) = curve.evaluate_branch(t, true) else {
            continue;
        };
        if best.is_none_or(|(_, bw, b_at, _, _)| better(w, at_breakpoint, bw, b_at)) {
            best = Some((t, w, at_breakpoint, branch, basis));
        }
    }
    let (t_k, mass_fraction, branch, basis) = match best {
        Some((t, w, _, branch, basis)) => (t, w, branch, basis),
        None => {
            let (branch, w, basis) = curve.evaluate_branch(t1_k, true)?;
            (t1_k, w, branch, basis)
        }
    };
    Ok(Lowest {
        t_k,
        mass_fraction,
        branch,
        basis: if uncovered.is_some() {
            Basis::Extrapolated
        } else {
            basis
        },
    })
}

/// The lowest point of a curve's lone branch over [t1_k, t2_k] where the branch covers
/// the whole range, read from the branch alone (see [`lowest_with`]); `None` when it does
/// not cover it, or the range is not one, and the whole curve must be asked.
#[inline]
pub fn lowest_on_lone(
    lone: BranchView<'_>,
    t1_k: f64,
    t2_k: f64,
    scratch: &mut Scratch,
) -> Option<Lowest> {
    let range = t1_k.is_finite() && t2_k.is_finite() && t2_k >= t1_k;
    if !(range && lone.covers(t1_k) && lone.covers(t2_k)) {
        return None;
    }
    // One temperature, the most common question of a large screening, without a call.
    Some(if t1_k == t2_k {
        point(lone, t1_k)
    } else {
        lowest_on(lone, t1_k, t2_k, scratch)
    })
}

/// [`lowest`] on a lone branch that covers the range: the same candidates, each evaluated
/// on the branch directly (what [`Curve::evaluate_branch`] gives there, without its checks).
fn lowest_on(b: BranchView<'_>, t1_k: f64, t2_k: f64, scratch: &mut Scratch) -> Lowest {
    if t1_k == t2_k {
        return point(b, t1_k);
    }
    // Where neither the branch's ends nor its stable range's ends fall inside the range,
    // the candidates are the range's ends, the knots and the turning points.
    let strictly_within = |(lo, hi): (f64, f64)| lo < t1_k && t2_k < hi;
    if t1_k < t2_k && strictly_within(b.range) && b.stable.is_none_or(strictly_within) {
        return walked(b, t1_k, t2_k);
    }
    listed(b, t1_k, t2_k, scratch)
}

/// The branch's point at `t_k`, as a [`Lowest`].
fn point(b: BranchView<'_>, t_k: f64) -> Lowest {
    let (mass_fraction, basis) = b.mass_fraction_and_basis(t_k);
    Lowest {
        t_k,
        mass_fraction,
        branch: 0,
        basis,
    }
}

/// [`lowest_on`] from the listed candidates of the module's comment.
fn listed(b: BranchView<'_>, t1_k: f64, t2_k: f64, scratch: &mut Scratch) -> Lowest {
    let at = |t_k: f64| point(b, t_k);
    candidates_of([b], &[], t1_k, t2_k, scratch);
    let mut best: Option<(Lowest, bool)> = None;
    for &(t, at_breakpoint) in &scratch.candidates {
        let here = at(t);
        if best.is_none_or(|(b, b_at)| {
            better(here.mass_fraction, at_breakpoint, b.mass_fraction, b_at)
        }) {
            best = Some((here, at_breakpoint));
        }
    }
    best.map_or_else(|| at(t1_k), |(low, _)| low)
}

/// [`lowest_on`] of a branch whose data and stable range (if it has one) reach beyond both
/// ends of the range: the same candidates (the range's ends, the knots inside, the turning
/// points of each cubic), walked in ascending order from the knots without listing or
/// sorting them; the basis is worked out for the lowest alone.
fn walked(b: BranchView<'_>, t1_k: f64, t2_k: f64) -> Lowest {
    let (xs, ys) = (b.knots.x(), b.knots.y());
    // The mass fraction as `BranchView::mass_fraction` gives it, from a value of the knots.
    let clamped = |v: f64| v.clamp(0.0, 1.0 - 1e-12);
    // The range's ends come with their basis; any other lowest point gets its own below.
    let (w1, basis1) = b.mass_fraction_and_basis(t1_k);
    let mut best = (t1_k, w1, true, Some(basis1));
    let mut consider_with = |t: f64, w: f64, at_breakpoint: bool, basis: Option<Basis>| {
        if better(w, at_breakpoint, best.1, best.2) {
            best = (t, w, at_breakpoint, basis);
        }
    };
    let strictly_inside = |t: f64| t > t1_k && t < t2_k;
    let first = xs.partition_point(|&x| x <= t1_k).saturating_sub(1);
    let last = xs
        .partition_point(|&x| x < t2_k)
        .min(xs.len().saturating_sub(1));
    for (k, &x) in xs.iter().enumerate().take(last).skip(first) {
        if strictly_inside(x) {
            // At a knot the interpolant's value is the knot's own.
            consider_with(x, clamped(ys[k]), true, None);
        }
        let turning = match b.knots.turning_in(k, t1_k, t2_k) {
            [Some(p), Some(q)] if q < p => [Some(q), Some(p)],
            pair => pair,
        };
        for t in turning.into_iter().flatten() {
            consider_with(t, clamped(b.knots.value_on(k, t)), false, None);
        }
    }
    if let Some(&x) = xs.get(last)
        && strictly_inside(x)
    {
        consider_with(x, b.mass_fraction(x), true, None);
    }
    let (w2, basis2) = b.mass_fraction_and_basis(t2_k);
    consider_with(t2_k, w2, true, Some(basis2));
    let (t_k, mass_fraction, _, basis) = best;
    let basis = basis.unwrap_or_else(|| b.mass_fraction_and_basis(t_k).1);
    Lowest {
        t_k,
        mass_fraction,
        branch: 0,
        basis,
    }
}

/// Whether a candidate of value `w` beats the best so far (`bw`): lower by more than
/// rounding, or as low and at a breakpoint where the best is not.
fn better(w: f64, at_breakpoint: bool, bw: f64, best_at_breakpoint: bool) -> bool {
    w < bw - TIE || (w < bw + TIE && at_breakpoint && !best_at_breakpoint)
}

/// The candidates of the module's comment inside [t1_k, t2_k] into `scratch.candidates`,
/// ascending, each with whether it is a breakpoint (rather than a point beside one or a
/// turning point).
fn candidates(curve: &Curve, t1_k: f64, t2_k: f64, scratch: &mut Scratch) {
    let views = curve.branches.iter().map(|b| b.view());
    candidates_of(views, curve.transitions(), t1_k, t2_k, scratch);
}

/// [`candidates`] of these branches with these transitions between them.
fn candidates_of<'a>(
    branches: impl IntoIterator<Item = BranchView<'a>, IntoIter: Clone>,
    transitions: &[Transition],
    t1_k: f64,
    t2_k: f64,
    scratch: &mut Scratch,
) {
    let Scratch {
        breaks,
        turning,
        candidates: out,
    } = scratch;
    breaks.clear();
    turning.clear();
    out.clear();
    let inside = |t: &f64| *t >= t1_k && *t <= t2_k;
    let branches = branches.into_iter();
    // First the breakpoints where the set of branches changes in a step (a branch's ends,
    // its stable range's ends, the transitions): each with the points just inside its sides.
    for b in branches.clone() {
        let (lo, hi) = b.range;
        breaks.extend([lo, hi].into_iter().filter(inside));
        if let Some((lo, hi)) = b.stable {
            breaks.extend([lo, hi].into_iter().filter(inside));
        }
    }
    breaks.extend(transitions.iter().map(|t| t.t_k).filter(inside));
    for &t in breaks.iter() {
        out.push((t, true));
        for beside in [t - BESIDE_K, t + BESIDE_K] {
            if beside > t1_k && beside < t2_k {
                out.push((beside, false));
            }
        }
    }
    // Then the range's ends and the knots inside it: there the stable curve is continuous
    // (the same branches on both sides, each continuous), so its limits beside them are its
    // values there and need no points of their own.
    out.extend([(t1_k, true), (t2_k, true)]);
    for b in branches.clone() {
        // Knots ascend: only those inside the range.
        let knots = b.knots.x();
        let first = knots.partition_point(|&t| t < t1_k);
        let last = knots.partition_point(|&t| t <= t2_k).max(first);
        out.extend(knots[first..last].iter().map(|&t| (t, true)));
    }
    for b in branches {
        b.knots.turning_points(t1_k, t2_k, turning);
    }
    out.extend(turning.iter().map(|&t| (t, false)));
    // Ascending, a breakpoint before anything else at the same temperature; duplicates go.
    out.sort_unstable_by(|a, b| a.0.total_cmp(&b.0).then(b.1.cmp(&a.1)));
    out.dedup_by(|later, earlier| later.0 == earlier.0);
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::curve::{Branch, Knots};

    #[test]
    fn a_dip_between_knots_is_found_at_its_knot() {
        // Invented demo data: falls to 300 K, then rises.
        let c = Curve::single(
            Branch::new("A", &[(280.0, 0.30), (300.0, 0.10), (320.0, 0.30)]).unwrap(),
        );
        let m = minimum(&c, 281.0, 319.0, false).unwrap();
        assert_eq!(m.t_k, 300.0);
        assert_eq!(m.basis, Basis::Tabulated);
        assert!((m.mass_fraction - 0.10).abs() < 1e-15);
    }

    #[test]
    fn the_walk_finds_what_the_listed_candidates_find() {
        // Invented demo curves: pseudo-random knots (SplitMix64), rising, falling and wavy,
        // with ranges inside them.
        let mut state = 0x5EED_u64;
        let mut unit = || {
            state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
            let mut z = state;
            z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
            z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
            ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
        };
        let mut scratch = Scratch::default();
        let mut compared = 0;
        for _ in 0..2_000 {
            let n = 2 + (unit() * 10.0) as usize;
            let points: Vec<(f64, f64)> = (0..n)
                .map(|i| (273.15 + 10.0 * i as f64, 0.05 + 0.5 * unit()))
                .collect();
            let branch = Branch::new("A", &points).unwrap();
            let b = branch.view();
            let (lo, hi) = b.range;
            let t1 = lo + (hi - lo) * unit();
            let t2 = t1 + (hi - t1) * unit();
            // Ends on knots too.
            let on_knot = |t: f64| points[((t - 273.15) / 10.0).round() as usize].0;
            let (t1, t2) = if unit() < 0.3 {
                (on_knot(t1), on_knot(t2))
            } else {
                (t1, t2)
            };
            if !(lo < t1 && t1 < t2 && t2 < hi) {
                continue;
            }
            assert_eq!(
                walked(b, t1, t2),
                listed(b, t1, t2, &mut scratch),
                "{points:?} {t1} {t2}"
            );
            compared += 1;
        }
        assert!(compared > 1_000, "{compared}");
        // Knots with slopes of any sign (not a monotone interpolant's), so that cubics turn
        // inside their intervals.
        let mut turned = 0;
        for _ in 0..2_000 {
            let n = 2 + (unit() * 6.0) as usize;
            let mut raw: Vec<f64> = (0..n).map(|i| 273.15 + 10.0 * i as f64).collect();
            raw.extend((0..n).map(|_| 0.1 + 0.4 * unit()));
            raw.extend((0..n).map(|_| 0.1 * (unit() - 0.5)));
            let knots = Knots::new(&raw).unwrap();
            let (lo, hi) = (raw[0], raw[n - 1]);
            // Sometimes a stable range of its own, around or across the range.
            let stable = (unit() < 0.5).then(|| {
                let a = lo + (hi - lo) * unit();
                (a, a + (hi - a) * unit())
            });
            let b = BranchView {
                knots,
                range: (lo, hi),
                stable,
            };
            let t1 = lo + (hi - lo) * unit();
            let t2 = t1 + (hi - t1) * unit();
            if !(lo < t1 && t1 < t2 && t2 < hi) {
                continue;
            }
            let walk = lowest_on(b, t1, t2, &mut scratch);
            assert_eq!(walk, listed(b, t1, t2, &mut scratch), "{raw:?} {t1} {t2}");
            turned +=
                usize::from(!knots.x().contains(&walk.t_k) && walk.t_k != t1 && walk.t_k != t2);
        }
        assert!(turned > 100, "{turned}");
    }

    #[test]
    fn a_branch_stable_alone_over_the_range_gives_what_every_candidate_gives() {
        // Invented demo curves of two or three branches meeting at transitions (a hydrate
        // below, another above), stable ranges declared, pseudo-random knots; ranges across
        // and beside the transitions.
        let mut state = 0x00C0_FFEE_u64;
        let mut unit = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state >> 11) as f64 / (1u64 << 53) as f64
        };
        let mut scratch = Scratch::default();
        let (mut alone, mut compared) = (0, 0);
        for _ in 0..1_000 {
            let parts = 2 + usize::from(unit() < 0.4);
            let mut branches = Vec::new();
            let width = 90.0 / parts as f64;
            for p in 0..parts {
                let (from, to) = (273.15 + width * p as f64, 273.15 + width * (p + 1) as f64);
                let n = 3 + (unit() * 5.0) as usize;
                // Data inside the stable range, sometimes reaching its ends.
                let (lo, hi) = (from + 3.0 * unit(), to - 3.0 * unit());
                let points: Vec<(f64, f64)> = (0..n)
                    .map(|i| {
                        let t = lo + (hi - lo) * i as f64 / (n - 1) as f64;
                        (t, 0.1 + 0.3 * unit() + 0.002 * (t - 273.15))
                    })
                    .collect();
                // Sometimes declared stable a little into its neighbours' ranges too.
                let overlap = if unit() < 0.3 { 4.0 * unit() } else { 0.0 };
                let branch = Branch::new(format!("P{p}"), &points)
                    .and_then(|b| b.with_stable_range(from - overlap, to + overlap))
                    .unwrap();
                branches.push(branch);
            }
            let Ok(curve) = Curve::new(branches) else {
                continue;
            };
            let (lo, hi) = curve.temperature_range();
            let t1 = lo + (hi - lo) * unit();
            let t2 = if unit() < 0.1 {
                t1
            } else {
                t1 + (hi - t1) * unit() * 0.3
            };
            alone += usize::from(sole_stable_branch(&curve, t1, t2).is_some());
            let listed = lowest_of_all(&curve, (t1, t2), false, &mut scratch);
            let with = lowest_with(&curve, None, t1, t2, false, &mut scratch);
            assert_eq!(with, listed, "{t1} {t2}");
            compared += 1;
        }
        assert!(compared > 900 && alone > 300, "{compared} {alone}");
    }

    #[test]
    fn a_rising_curve_is_lowest_at_the_start() {
        // Invented demo data.
        let c = Curve::single(
            Branch::new("A", &[(273.15, 0.10), (283.15, 0.15), (293.15, 0.25)]).unwrap(),
        );
        let m = minimum(&c, 275.15, 281.15, false).unwrap();
        assert_eq!(m.t_k, 275.15);
        assert_eq!(m.basis, Basis::Interpolated);
    }
}
