//! Inversions of a solubility curve: saturation temperatures of a loading, whether a loading
//! stays dissolved over a temperature range with a margin, and the largest loading that does.
//!
//! Loadings are mass fractions of anhydrous solute; temperatures are kelvin. The margin is
//! applied to the solute-to-water mass ratio r = w/(1−w) (g solute per g water): a loading
//! r stays dissolved with margin m when the curve's r is at least r·(1+m) everywhere in the
//! range. Only data-covered temperatures are used (no extrapolation).

use super::curve::{Basis, BranchView, Curve, dense_grid};
use super::error::ScienceError;
pub use super::range_minimum::{
    Lowest, Minimum, Scratch, lowest, lowest_on_lone, lowest_with, minimum,
};

/// Steps per interval between knots of the scanning grid.
const STEPS: usize = 200;

/// One crossing of a loading with the curve.
#[derive(Debug, Clone, PartialEq)]
pub struct Crossing {
    /// Saturation temperature, K (to better than 0.01 K).
    pub t_k: f64,
    /// Stable solid phase there.
    pub phase: String,
    /// True when the curve rises through the loading (cooling below `t_k` crystallises the
    /// solid); false when it falls (heating above `t_k` crystallises, a retrograde curve).
    pub rising: bool,
    /// `Tabulated` or `Interpolated` where the data cover `t_k`; `Extrapolated` in a gap
    /// between branches (only with [`saturation_temperatures_with`]).
    pub basis: Basis,
}

fn ratio(w: f64) -> f64 {
    w / (1.0 - w)
}

fn check_loading(w: f64) -> Result<f64, ScienceError> {
    if w.is_finite() && w > 0.0 && w < 1.0 {
        Ok(w)
    } else {
        Err(ScienceError::InvalidComposition {
            value: w,
            unit: "w",
            why: "a loading must be a mass fraction in (0, 1)",
        })
    }
}

/// [`check_loading`], with zero allowed: a zero loading stays dissolved trivially.
fn check_loading_or_zero(w: f64) -> Result<f64, ScienceError> {
    if w == 0.0 { Ok(w) } else { check_loading(w) }
}

/// Grid of every knot, every transition and `STEPS` subdivisions between neighbours,
/// restricted to [lo, hi] and, unless `uncovered_too`, to temperatures with data.
fn scan_grid(curve: &Curve, lo: f64, hi: f64, uncovered_too: bool) -> Vec<f64> {
    // Every branch's knots, sorted and deduplicated below together with the rest (the
    // same set as `Curve::knots`, without its extra sorted copy).
    let mut knots: Vec<f64> = curve
        .branches
        .iter()
        .flat_map(|b| b.knots().iter().copied())
        .chain(curve.transitions().iter().map(|t| t.t_k))
        .filter(|&t| t > lo && t < hi)
        .collect();
    knots.push(lo);
    knots.push(hi);
    knots.sort_by(f64::total_cmp);
    knots.dedup();
    dense_grid(&knots, STEPS)
        .into_iter()
        .filter(|&t| uncovered_too || curve.covers(t))
        .collect()
}

/// How far inside an interval its end at a transition is read, K (far below the 0.01 K the
/// answers show).
const BESIDE_K: f64 = 1e-7;

fn value(curve: &Curve, t: f64) -> f64 {
    curve.mass_fraction(t, true).unwrap_or(f64::NAN)
}

/// Every temperature inside the data range where the curve equals the loading `w`.
///
/// Method: the curve minus the loading is sampled on a grid of every knot and transition
/// plus 200 steps between neighbours; each sign change is refined by bisection to 1e-7 K
/// (the curve is continuous on each branch). At a transition the stable curve may step,
/// since two branches' data need not meet exactly there: an interval that ends at one is
/// judged by the curve's limit inside it, and a step across the loading is a crossing at
/// the transition. A grid point equal to the loading counts as a crossing. Temperatures between branches with no data are not searched (see
/// [`saturation_temperatures_with`]).
pub fn saturation_temperatures(curve: &Curve, w: f64) -> Result<Vec<Crossing>, ScienceError> {
    saturation_temperatures_with(curve, w, false)
}

/// [`saturation_temperatures`]; with `extrapolate`, gaps between branches are searched too,
/// on the branches' end tangents (the same values [`Curve::evaluate`] gives there when
/// extrapolating), and crossings there are flagged `Extrapolated`. Beyond the ends of the
/// data nothing is searched.
pub fn saturation_temperatures_with(
    curve: &Curve,
    w: f64,
    extrapolate: bool,
) -> Result<Vec<Crossing>, ScienceError> {
    let w = check_loading(w)?;
    let (lo, hi) = curve.temperature_range();
    let grid = scan_grid(curve, lo, hi, extrapolate);
    let mut out: Vec<Crossing> = Vec::new();
    let mut push = |t: f64, rising: bool| {
        if out.last().is_none_or(|c| (c.t_k - t).abs() > 0.005) {
            // The solid that crystallises: the stable one on the side where the loading
            // is above the curve (the same on both sides, except at a transition the
            // loading crosses in the curve's step there).
            let side = if rising { t - 1e-6 } else { t + 1e-6 };
            let phase = curve
                .evaluate(side, true)
                .or_else(|_| curve.evaluate(t, true))
                .map(|e| e.phase)
                .unwrap_or_default();
            let basis = curve
                .evaluate(t, true)
                .map(|e| e.basis)
                .unwrap_or(Basis::Extrapolated);
            out.push(Crossing {
                t_k: t,
                phase,
                rising,
                basis,
            });
        }
    };
    // At a transition the stable curve may step (the branches' data need not meet exactly
    // there): an interval is judged by the curve's limits inside it, and a step across the
    // loading is a crossing at the transition itself.
    let transition = |t: f64| curve.transitions().iter().any(|tr| tr.t_k == t);
    let inside = |t: f64, toward: f64| {
        if transition(t) {
            value(curve, t + (toward - t).signum() * BESIDE_K) - w
        } else {
            value(curve, t) - w
        }
    };
    for pair in grid.windows(2) {
        let (a, b) = (pair[0], pair[1]);
        if transition(a) {
            let (below, above) = (inside(a, a - 1.0), inside(a, a + 1.0));
            if below * above < 0.0 {
                push(a, above > below);
            }
        }
        let (fa, fb) = (inside(a, b), inside(b, a));
        if fa == 0.0 {
            push(a, fb > 0.0);
            continue;
        }
        if fa.signum() == fb.signum() || fb == 0.0 {
            continue;
        }
        // A sign change across a data gap is not a crossing the data support.
        if !extrapolate && !curve.covers(0.5 * (a + b)) {
            continue;
        }
        let (mut x0, mut x1) = (a, b);
        while x1 - x0 > 1e-7 {
            let mid = 0.5 * (x0 + x1);
            if (value(curve, mid) - w).signum() == fa.signum() {
                x0 = mid;
            } else {
                x1 = mid;
            }
        }
        push(0.5 * (x0 + x1), fb > fa);
    }
    if let Some(&last) = grid.last()
        && value(curve, last) - w == 0.0
    {
        let before = grid.len().checked_sub(2).map(|i| value(curve, grid[i]) - w);
        push(last, before.is_some_and(|v| v < 0.0));
    }
    Ok(out)
}

/// The answer to "does this loading stay dissolved over this range with this margin".
#[derive(Debug, Clone, PartialEq)]
pub struct Screening {
    /// True exactly when r_min ≥ r_load·(1 + margin).
    pub holds: bool,
    /// Temperature where the curve is lowest in the range, K.
    pub limiting_t_k: f64,
    /// Stable phase at the limiting temperature.
    pub phase: String,
    /// The curve's mass fraction at the limiting temperature.
    pub limiting_mass_fraction: f64,
    /// Headroom in percent: (r_min / r_load − 1)·100 (negative when the loading exceeds the
    /// solubility somewhere in the range).
    pub headroom_pct: f64,
    pub basis: Basis,
}

fn check_margin(margin: f64) -> Result<f64, ScienceError> {
    if margin.is_finite() && margin >= 0.0 {
        Ok(margin)
    } else {
        Err(ScienceError::BadMargin(margin))
    }
}

/// Whether a loading `w` (mass fraction) stays dissolved over [t1_k, t2_k] with a margin
/// (a fraction: 0.1 for 10 %).
///
/// Holds exactly when r_min ≥ r·(1 + margin), with r = w/(1−w) the loading's
/// solute-to-water mass ratio and r_min the curve's ratio at its minimum over the whole
/// range (see [`minimum`]). A single temperature is t1_k = t2_k.
///
/// ```
/// use satline::science::curve::{Branch, Curve};
/// use satline::science::solve::stays_dissolved;
/// // Invented demo data: (K, mass fraction).
/// let curve = Curve::single(Branch::new("KX", &[(273.15, 0.10), (293.15, 0.20)]).unwrap());
/// let s = stays_dissolved(&curve, 0.08, 275.15, 281.15, 0.10).unwrap();
/// assert!(s.holds);
/// assert_eq!(s.limiting_t_k, 275.15);
/// ```
pub fn stays_dissolved(
    curve: &Curve,
    w: f64,
    t1_k: f64,
    t2_k: f64,
    margin: f64,
) -> Result<Screening, ScienceError> {
    stays_dissolved_with(curve, w, t1_k, t2_k, margin, false)
}

/// [`stays_dissolved`], extrapolating where the range has no data when `extrapolate` is
/// true (the result's basis is then `Extrapolated`).
pub fn stays_dissolved_with(
    curve: &Curve,
    w: f64,
    t1_k: f64,
    t2_k: f64,
    margin: f64,
    extrapolate: bool,
) -> Result<Screening, ScienceError> {
    let question = Question {
        target: Target::checked(w, margin)?,
        t1_k,
        t2_k,
        extrapolate,
    };
    let v = verdict(curve, curve.lone(), &question, &mut Scratch::default())?;
    Ok(Screening {
        holds: v.holds,
        limiting_t_k: v.limiting_t_k,
        phase: curve.branches[v.branch].phase.clone(),
        limiting_mass_fraction: v.limiting_mass_fraction,
        headroom_pct: v.headroom_pct,
        basis: v.basis,
    })
}

/// [`Screening`] with the stable phase as its branch's index in [`Curve::branches`]: what a
/// screening of many solutes keeps per solute (no allocation).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Verdict {
    pub holds: bool,
    pub limiting_t_k: f64,
    /// Index of the stable branch at the limiting temperature.
    pub branch: usize,
    pub limiting_mass_fraction: f64,
    /// The limiting mass fraction as a ratio of solute to water, w/(1 − w).
    pub limiting_ratio: f64,
    pub headroom_pct: f64,
    pub basis: Basis,
}

/// [`stays_dissolved_with`] without the phase's name, reusing `scratch` from one curve to
/// the next; `lone` is the curve's branch when it has only one ([`Curve::lone`], or a flat
/// copy of it).
pub fn verdict(
    curve: &Curve,
    lone: Option<BranchView<'_>>,
    question: &Question,
    scratch: &mut Scratch,
) -> Result<Verdict, ScienceError> {
    let m = lowest_with(
        curve,
        lone,
        question.t1_k,
        question.t2_k,
        question.extrapolate,
        scratch,
    )?;
    Ok(question.target.judge(&m))
}

/// [`verdict`] from a curve's lone branch alone (a flat copy of it), where the branch
/// covers the whole range; `None` when it does not and the whole curve must be asked.
#[inline]
pub fn verdict_on_lone(
    lone: BranchView<'_>,
    question: &Question,
    scratch: &mut Scratch,
) -> Option<Verdict> {
    lowest_on_lone(lone, question.t1_k, question.t2_k, scratch).map(|m| question.target.judge(&m))
}

/// A loading (mass fraction) and a margin (a fraction), both checked, with the ratio of
/// solute to water a curve's lowest point must reach: what every curve of a screening is
/// judged against.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Target {
    r_load: f64,
    r_needed: f64,
}

impl Target {
    /// The target of a loading `w` (mass fraction, 0 allowed) with `margin`; the same
    /// errors, in the same order, as the loading and the margin checked one by one.
    pub fn checked(w: f64, margin: f64) -> Result<Self, ScienceError> {
        let w = check_loading_or_zero(w)?;
        let margin = check_margin(margin)?;
        let r_load = ratio(w);
        Ok(Self {
            r_load,
            r_needed: r_load * (1.0 + margin),
        })
    }

    /// The verdict on the target from the curve's lowest point over the range.
    fn judge(&self, m: &Lowest) -> Verdict {
        let r_min = ratio(m.mass_fraction);
        Verdict {
            // A zero loading holds trivially (nothing is dissolved); its headroom is
            // infinite.
            holds: r_min >= self.r_needed,
            limiting_t_k: m.t_k,
            branch: m.branch,
            limiting_mass_fraction: m.mass_fraction,
            limiting_ratio: r_min,
            headroom_pct: (r_min / self.r_load - 1.0) * 100.0,
            basis: m.basis,
        }
    }
}

/// What [`verdict`] asks of a curve: whether a loading stays dissolved over [t1_k, t2_k]
/// with a margin (`target`), extrapolating where the range has no data when `extrapolate`
/// is true.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Question {
    pub target: Target,
    pub t1_k: f64,
    pub t2_k: f64,
    pub extrapolate: bool,
}

/// The largest loading that stays dissolved over a range with a margin.
#[derive(Debug, Clone, PartialEq)]
pub struct Ceiling {
    /// Largest loading, mass fraction: w = r/(1+r) with r = r_min/(1 + margin).
    pub mass_fraction: f64,
    /// Where the curve is lowest in the range, K.
    pub limiting_t_k: f64,
    pub phase: String,
    pub basis: Basis,
}

/// The largest loading that [`stays_dissolved`] over [t1_k, t2_k] with `margin`.
pub fn ceiling(curve: &Curve, t1_k: f64, t2_k: f64, margin: f64) -> Result<Ceiling, ScienceError> {
    ceiling_with(curve, t1_k, t2_k, margin, false)
}

/// [`ceiling`], extrapolating where the range has no data when `extrapolate` is true.
pub fn ceiling_with(
    curve: &Curve,
    t1_k: f64,
    t2_k: f64,
    margin: f64,
    extrapolate: bool,
) -> Result<Ceiling, ScienceError> {
    let margin = check_margin(margin)?;
    let m = minimum(curve, t1_k, t2_k, extrapolate)?;
    let r = ratio(m.mass_fraction) / (1.0 + margin);
    Ok(Ceiling {
        mass_fraction: r / (1.0 + r),
        limiting_t_k: m.t_k,
        phase: m.phase,
        basis: m.basis,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::curve::Branch;

    // Invented demo data: a curve with a maximum at 313.15 K.
    fn peaked() -> Curve {
        Curve::single(
            Branch::new(
                "A",
                &[
                    (273.15, 0.10),
                    (293.15, 0.20),
                    (313.15, 0.30),
                    (333.15, 0.20),
                    (353.15, 0.15),
                ],
            )
            .unwrap(),
        )
    }

    #[test]
    fn two_crossings_on_a_peaked_curve() {
        let c = peaked();
        let x = saturation_temperatures(&c, 0.25).unwrap();
        assert_eq!(x.len(), 2);
        assert!(x[0].rising && !x[1].rising);
        for cr in &x {
            let w = c.evaluate(cr.t_k, false).unwrap().mass_fraction;
            assert!((w - 0.25).abs() < 1e-6);
        }
        assert!(saturation_temperatures(&c, 0.5).unwrap().is_empty());
        // At a knot value exactly.
        let x = saturation_temperatures(&c, 0.20).unwrap();
        assert_eq!(x.len(), 2);
    }

    #[test]
    fn minimum_inside_the_range_not_at_the_ends() {
        // Invented: dips at 300 K.
        let c = Curve::single(
            Branch::new("A", &[(280.0, 0.30), (300.0, 0.10), (320.0, 0.30)]).unwrap(),
        );
        let s = stays_dissolved(&c, 0.2, 280.0, 320.0, 0.0).unwrap();
        assert!(!s.holds);
        assert!((s.limiting_t_k - 300.0).abs() < 1e-3);
        let s = stays_dissolved(&c, 0.05, 280.0, 320.0, 0.1).unwrap();
        assert!(s.holds);
        // r_min = 0.1/0.9, r_load = 0.05/0.95.
        let want = ((0.1 / 0.9) / (0.05 / 0.95) - 1.0) * 100.0;
        assert!((s.headroom_pct - want).abs() < 1e-6);
        let ce = ceiling(&c, 280.0, 320.0, 0.1).unwrap();
        let r = (0.1 / 0.9) / 1.1;
        assert!((ce.mass_fraction - r / (1.0 + r)).abs() < 1e-9);
        let s = stays_dissolved(&c, ce.mass_fraction, 280.0, 320.0, 0.1).unwrap();
        assert!(s.holds || s.headroom_pct > 9.999_999);
    }

    #[test]
    fn a_range_over_a_gap_needs_extrapolation() {
        // Invented: two branches with no data between 303.15 and 313.15 K.
        let a = Branch::new("A·H2O", &[(283.15, 0.1), (303.15, 0.25)]).unwrap();
        let b = Branch::new("A", &[(313.15, 0.33), (333.15, 0.31)]).unwrap();
        let c = Curve::new(vec![a, b]).unwrap();
        assert!(matches!(
            stays_dissolved(&c, 0.05, 290.0, 320.0, 0.1),
            Err(ScienceError::InGap { .. })
        ));
        let s = stays_dissolved_with(&c, 0.05, 290.0, 320.0, 0.1, true).unwrap();
        assert!(s.holds);
        assert_eq!(s.basis, Basis::Extrapolated);
        assert!(stays_dissolved(&c, 0.05, 315.0, 320.0, 0.1).unwrap().holds);
        // 0.28 is reached only in the gap, on the hydrate's tangent line.
        assert!(saturation_temperatures(&c, 0.28).unwrap().is_empty());
        let x = saturation_temperatures_with(&c, 0.28, true).unwrap();
        assert_eq!(x.len(), 1);
        assert_eq!(x[0].basis, Basis::Extrapolated);
        assert!(x[0].t_k > 303.15 && x[0].t_k < 313.15);
    }

    #[test]
    fn a_single_temperature_is_the_curve_there() {
        // Invented: two branches with a gap between 303.15 and 313.15 K.
        let a = Branch::new("A·H2O", &[(283.15, 0.1), (303.15, 0.25)]).unwrap();
        let b = Branch::new("A", &[(313.15, 0.33), (333.15, 0.31)]).unwrap();
        let c = Curve::new(vec![a, b]).unwrap();
        for t in [283.15, 290.0, 303.15, 320.0] {
            let m = minimum(&c, t, t, false).unwrap();
            let e = c.evaluate(t, false).unwrap();
            assert_eq!(m.t_k, t);
            assert_eq!(m.mass_fraction, e.mass_fraction);
            assert_eq!(m.phase, e.phase);
            assert_eq!(m.basis, e.basis);
            assert_eq!(c.mass_fraction(t, false).unwrap(), e.mass_fraction);
        }
        assert!(matches!(
            minimum(&c, 308.0, 308.0, false),
            Err(ScienceError::InGap { .. })
        ));
        let m = minimum(&c, 308.0, 308.0, true).unwrap();
        assert_eq!(m.basis, Basis::Extrapolated);
        assert_eq!(
            m.mass_fraction,
            c.evaluate(308.0, true).unwrap().mass_fraction
        );
        assert!(matches!(
            minimum(&c, 270.0, 270.0, false),
            Err(ScienceError::OutOfRange { .. })
        ));
    }

    #[test]
    fn a_zero_loading_stays_dissolved_trivially() {
        let s = stays_dissolved(&peaked(), 0.0, 283.15, 293.15, 0.1).unwrap();
        assert!(s.holds);
        assert!(s.headroom_pct.is_infinite());
    }

    #[test]
    fn bad_inputs() {
        let c = peaked();
        assert!(matches!(
            stays_dissolved(&c, 0.1, 300.0, 290.0, 0.1),
            Err(ScienceError::BadRange { .. })
        ));
        assert!(matches!(
            stays_dissolved(&c, 0.1, 260.0, 290.0, 0.1),
            Err(ScienceError::OutOfRange { .. })
        ));
        assert!(matches!(
            stays_dissolved(&c, 0.1, 280.0, 290.0, -0.1),
            Err(ScienceError::BadMargin(_))
        ));
        assert!(saturation_temperatures(&c, 0.0).is_err());
    }
}
