//! Solubility curves: branches of tabulated points (one solid phase each) evaluated by
//! monotone piecewise cubic interpolation, and curves that follow the stable branch.
//!
//! Units: temperatures in kelvin, compositions as the mass fraction of anhydrous solute.

use super::error::ScienceError;
use crate::science::bisect::{Until, bisect};

/// How a value was obtained from the data (the `basis` of every answer's row).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize, utoipa::ToSchema)]
#[serde(rename_all = "kebab-case")]
pub enum Basis {
    /// A value printed in the source.
    Tabulated,
    /// Between printed values, by monotone cubic interpolation.
    Interpolated,
    /// From a fitted equation inside its valid range.
    Fitted,
    /// Outside the range of the data; asked for explicitly.
    Extrapolated,
    /// Computed from other answers (conversions, inversions).
    Computed,
}

impl Basis {
    /// The word used in answers: `tabulated`, `interpolated`, `fitted`, `extrapolated`,
    /// `computed`.
    pub fn as_str(self) -> &'static str {
        match self {
            Basis::Tabulated => "tabulated",
            Basis::Interpolated => "interpolated",
            Basis::Fitted => "fitted",
            Basis::Extrapolated => "extrapolated",
            Basis::Computed => "computed",
        }
    }
}

/// A monotone piecewise cubic Hermite interpolant (PCHIP) through (x, y) knots.
///
/// Slopes by Fritsch & Carlson, "Monotone piecewise cubic interpolation", SIAM J. Numer.
/// Anal. 17 (1980) 238–246, in the weighted-harmonic-mean form of Fritsch & Butland,
/// SIAM J. Sci. Stat. Comput. 5 (1984) 300–304: at an interior knot the slope is 0 where the
/// neighbouring secants differ in sign (a local extremum stays at the knot) and otherwise
/// (w1+w2)/(w1/δ₋ + w2/δ₊) with w1 = 2h₊+h₋, w2 = h₊+2h₋; end slopes by the shape-preserving
/// three-point formula, clamped to 3δ. On each interval the cubic then stays between its end
/// values: it never overshoots.
#[derive(Debug, Clone, PartialEq)]
pub struct Pchip {
    /// The knots' abscissae, ordinates and slopes, one after the other (n each): one
    /// allocation, so evaluating touches one block of memory.
    knots: Vec<f64>,
    /// Lowest and highest abscissa, kept beside the pointer so that asking whether a
    /// temperature is covered reads no knot.
    range: (f64, f64),
}

impl Pchip {
    /// Builds the interpolant; `x` strictly ascending, at least one knot.
    pub fn new(x: Vec<f64>, y: Vec<f64>) -> Result<Self, ScienceError> {
        Self::named("knots", x, y)
    }

    /// [`Pchip::new`], naming the abscissae in errors (e.g. `temperatures (K)`).
    pub fn named(what: &'static str, x: Vec<f64>, y: Vec<f64>) -> Result<Self, ScienceError> {
        if x.is_empty() || x.len() != y.len() {
            return Err(ScienceError::TooFewPoints {
                what: "an interpolant",
                needed: 1,
                found: x.len().min(y.len()),
            });
        }
        for v in x.iter().chain(&y) {
            if !v.is_finite() {
                return Err(ScienceError::NotFinite {
                    what: "a tabulated value",
                    value: *v,
                });
            }
        }
        for pair in x.windows(2) {
            if pair[1] <= pair[0] {
                return Err(ScienceError::NotAscending {
                    what,
                    previous: pair[0],
                    next: pair[1],
                });
            }
        }
        let d = slopes(&x, &y);
        let range = (x[0], x[x.len() - 1]);
        let mut knots = x;
        knots.extend_from_slice(&y);
        knots.extend_from_slice(&d);
        Ok(Self { knots, range })
    }

    /// The knots as a borrowed view.
    pub fn view(&self) -> Knots<'_> {
        Knots(&self.knots)
    }

    /// The knots' abscissae.
    pub fn knots(&self) -> &[f64] {
        self.view().x()
    }

    /// The knots' ordinates.
    pub fn values(&self) -> &[f64] {
        self.view().y()
    }

    /// (lowest x, highest x).
    pub fn range(&self) -> (f64, f64) {
        self.range
    }

    /// Value and derivative at `x`. Outside the knots the end tangent line is followed
    /// (linear extrapolation; callers flag it).
    pub fn eval(&self, x: f64) -> (f64, f64) {
        self.view().eval(x)
    }
}

/// A [`Pchip`]'s knots borrowed as one slice laid out as the interpolant keeps them: the
/// abscissae, the ordinates, then the slopes (n each). The engine's snapshot keeps the knots
/// of every curve of one branch so, one after another in one flat array, and evaluates them
/// with this same code.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Knots<'a>(&'a [f64]);

impl<'a> Knots<'a> {
    /// The view of `raw` (as [`Knots::raw`] gives it); `None` unless its length is a
    /// positive multiple of three.
    pub fn new(raw: &'a [f64]) -> Option<Self> {
        (!raw.is_empty() && raw.len() % 3 == 0).then_some(Knots(raw))
    }

    /// The slice itself, for copying into a flat array.
    pub fn raw(self) -> &'a [f64] {
        self.0
    }

    fn n(self) -> usize {
        self.0.len() / 3
    }

    /// The knots' abscissae.
    pub fn x(self) -> &'a [f64] {
        &self.0[..self.n()]
    }

    /// The knots' ordinates.
    pub fn y(self) -> &'a [f64] {
        &self.0[self.n()..2 * self.n()]
    }

    fn d(self) -> &'a [f64] {
        &self.0[2 * self.n()..]
    }

    /// See [`Pchip::eval`].
    pub fn eval(self, x: f64) -> (f64, f64) {
        let piece = self.piece(x);
        (piece.value(), piece.slope())
    }

    /// The value alone of [`Knots::eval`] (the same number, without the derivative's
    /// arithmetic): what a screening of many curves asks for.
    pub fn value(self, x: f64) -> f64 {
        self.piece(x).value()
    }

    /// [`Knots::value`] at `x` known to lie on the interval from knot `k` to knot `k + 1`:
    /// the same number, without searching for the interval when `x` lies strictly inside it.
    pub fn value_on(self, k: usize, x: f64) -> f64 {
        let xs = self.x();
        match (xs.get(k), xs.get(k + 1)) {
            (Some(&x0), Some(&x1)) if x > x0 && x < x1 => self.cubic(k, x).value(),
            _ => self.value(x),
        }
    }

    /// The cubic piece of the interval from knot `k` to knot `k + 1` (both exist), at `x`.
    fn cubic(self, k: usize, x: f64) -> Piece {
        let (xs, ys, ds) = (self.x(), self.y(), self.d());
        let h = xs[k + 1] - xs[k];
        Piece::Cubic {
            t: (x - xs[k]) / h,
            h,
            y: (ys[k], ys[k + 1]),
            d: (ds[k], ds[k + 1]),
        }
    }

    /// Up to how many knots [`Knots::value_and_basis`] counts those below `x` rather than
    /// searching for them.
    const FEW_KNOTS: usize = 16;

    /// [`Knots::value`] and where `x` falls: on a knot (within 1e-9), between knots, or
    /// outside them; one search for both.
    #[inline]
    pub fn value_and_basis(self, x: f64) -> (f64, Basis) {
        let n = self.n();
        let (xs, rest) = self.0.split_at(n);
        let (ys, ds) = rest.split_at(n);
        let (Some(&first), Some(&last)) = (xs.first(), xs.last()) else {
            return (f64::NAN, Basis::Extrapolated);
        };
        let outside = x < first || x > last;
        if n == 1 || x <= first || x >= last {
            // A lone knot, on an end knot, or beyond it on its tangent.
            let value = if n == 1 { ys[0] } else { self.piece(x).value() };
            return (
                value,
                if outside {
                    Basis::Extrapolated
                } else {
                    Basis::Tabulated
                },
            );
        }
        if x.is_nan() {
            return (f64::NAN, Basis::Interpolated);
        }
        // Strictly between the end knots: knot `k` is the first at or above x, in 1..n−1,
        // and only knots k − 1 and k can lie within 1e-9 of x. A few knots are counted
        // (no branch to mispredict), more are searched.
        let k = if n <= Self::FEW_KNOTS {
            xs.iter().map(|&v| usize::from(v < x)).sum()
        } else {
            xs.partition_point(|&v| v < x)
        };
        let around = k.checked_sub(1).map(|before| before..k + 1);
        let (x_pair, y_pair, d_pair) = (
            around.clone().and_then(|r| xs.get(r)),
            around.clone().and_then(|r| ys.get(r)),
            around.and_then(|r| ds.get(r)),
        );
        match (x_pair, y_pair, d_pair) {
            (Some(&[_, x1]), Some(&[_, y1]), _) if x1 == x => (y1, Basis::Tabulated),
            (Some(&[x0, x1]), Some(&[y0, y1]), Some(&[d0, d1])) => {
                let h = x1 - x0;
                let piece = Piece::Cubic {
                    t: (x - x0) / h,
                    h,
                    y: (y0, y1),
                    d: (d0, d1),
                };
                let near = (x0 - x).abs() <= 1e-9 || (x1 - x).abs() <= 1e-9;
                let basis = if near {
                    Basis::Tabulated
                } else {
                    Basis::Interpolated
                };
                (piece.value(), basis)
            }
            _ => (self.value(x), Basis::Interpolated),
        }
    }

    /// The piece of the interpolant that holds `x`.
    fn piece(self, x: f64) -> Piece {
        let (xs, ys, ds) = (self.x(), self.y(), self.d());
        let n = xs.len();
        if n == 1 {
            return Piece::Knot(ys[0], 0.0);
        }
        if x.is_nan() {
            // Not a temperature: no piece holds it (and the search below needs an order).
            return Piece::Knot(f64::NAN, f64::NAN);
        }
        if x <= xs[0] {
            return Piece::Line(ys[0], ds[0], x - xs[0]);
        }
        if x >= xs[n - 1] {
            return Piece::Line(ys[n - 1], ds[n - 1], x - xs[n - 1]);
        }
        match xs.binary_search_by(|v| v.total_cmp(&x)) {
            Ok(k) => Piece::Knot(ys[k], ds[k]),
            Err(k) => self.cubic(k - 1, x),
        }
    }
}

/// Where a point falls on a [`Pchip`]: on an end tangent (value, slope, distance from the
/// end knot), on a knot (value, slope), or inside an interval's cubic (the fraction `t` of
/// the interval of width `h`, the ends' values and slopes).
enum Piece {
    Line(f64, f64, f64),
    Knot(f64, f64),
    Cubic {
        t: f64,
        h: f64,
        y: (f64, f64),
        d: (f64, f64),
    },
}

impl Piece {
    #[inline(always)]
    fn value(&self) -> f64 {
        match *self {
            Piece::Line(y, d, dx) => y + d * dx,
            Piece::Knot(y, _) => y,
            Piece::Cubic { t, h, y, d } => {
                let t2 = t * t;
                let t3 = t2 * t;
                let h00 = 2.0 * t3 - 3.0 * t2 + 1.0;
                let h10 = t3 - 2.0 * t2 + t;
                let h01 = -2.0 * t3 + 3.0 * t2;
                let h11 = t3 - t2;
                h00 * y.0 + h10 * h * d.0 + h01 * y.1 + h11 * h * d.1
            }
        }
    }

    fn slope(&self) -> f64 {
        match *self {
            Piece::Line(_, d, _) | Piece::Knot(_, d) => d,
            Piece::Cubic { t, h, y, d } => {
                let t2 = t * t;
                ((6.0 * t2 - 6.0 * t) * y.0
                    + (3.0 * t2 - 4.0 * t + 1.0) * h * d.0
                    + (-6.0 * t2 + 6.0 * t) * y.1
                    + (3.0 * t2 - 2.0 * t) * h * d.1)
                    / h
            }
        }
    }
}

impl Pchip {
    /// Appends to `out` every x strictly inside (`lo`, `hi`) where one interval's cubic has a
    /// zero derivative: the roots in (0, 1) of the quadratic h·p'(s) = A s² + B s + C with
    /// A = 6(y₀−y₁) + 3h(d₀+d₁), B = 6(y₁−y₀) − h(4d₀+2d₁), C = h d₀ (the derivative of the
    /// cubic Hermite form in [`Pchip::eval`]). Together with the knots these are the only
    /// places where the interpolant can have an interior extremum. Beyond the knots the
    /// interpolant is a straight line and has none.
    pub fn turning_points(&self, lo: f64, hi: f64, out: &mut Vec<f64>) {
        self.view().turning_points(lo, hi, out);
    }
}

impl Knots<'_> {
    /// See [`Pchip::turning_points`].
    pub fn turning_points(self, lo: f64, hi: f64, out: &mut Vec<f64>) {
        let xs = self.x();
        // The intervals that reach into (lo, hi): from the last knot at or below lo to the
        // first at or above hi.
        let first = xs.partition_point(|&x| x <= lo).saturating_sub(1);
        let last = xs
            .partition_point(|&x| x < hi)
            .min(xs.len().saturating_sub(1));
        for k in first..last {
            let [p, q] = self.turning_in(k, lo, hi);
            out.extend(p);
            out.extend(q);
        }
    }

    /// The turning points of the cubic on the interval from knot `k` to knot `k + 1` that
    /// lie strictly inside both the interval and (lo, hi), in the order the roots are
    /// found (see [`Knots::turning_points`]).
    pub fn turning_in(self, k: usize, lo: f64, hi: f64) -> [Option<f64>; 2] {
        let (xs, ys, ds) = (self.x(), self.y(), self.d());
        let none = [None, None];
        let (Some(&x0), Some(&x1)) = (xs.get(k), xs.get(k + 1)) else {
            return none;
        };
        if x1 <= lo || x0 >= hi {
            return none;
        }
        let h = x1 - x0;
        let (y0, y1, d0, d1) = (ys[k], ys[k + 1], ds[k], ds[k + 1]);
        let a = 6.0 * (y0 - y1) + 3.0 * h * (d0 + d1);
        let b = 6.0 * (y1 - y0) - h * (4.0 * d0 + 2.0 * d1);
        let c = h * d0;
        let inside = |s: f64| {
            let x = x0 + s * h;
            (s > 0.0 && s < 1.0 && x > lo && x < hi).then_some(x)
        };
        let scale = a.abs().max(b.abs()).max(c.abs());
        if scale == 0.0 {
            return none;
        }
        if a.abs() <= 1e-12 * scale {
            return if b != 0.0 {
                [inside(-c / b), None]
            } else {
                none
            };
        }
        let disc = b * b - 4.0 * a * c;
        if disc < 0.0 {
            return none;
        }
        // The numerically stable pair of roots (no cancellation in either).
        let q = -0.5 * (b + b.signum() * disc.sqrt());
        [inside(q / a), if q != 0.0 { inside(c / q) } else { None }]
    }
}

fn slopes(x: &[f64], y: &[f64]) -> Vec<f64> {
    let n = x.len();
    if n == 1 {
        return vec![0.0];
    }
    let h: Vec<f64> = x.windows(2).map(|w| w[1] - w[0]).collect();
    let delta: Vec<f64> = (0..n - 1).map(|k| (y[k + 1] - y[k]) / h[k]).collect();
    if n == 2 {
        return vec![delta[0], delta[0]];
    }
    let mut d = vec![0.0; n];
    for k in 1..n - 1 {
        let (a, b) = (delta[k - 1], delta[k]);
        if a == 0.0 || b == 0.0 || a.signum() != b.signum() {
            d[k] = 0.0;
        } else {
            let w1 = 2.0 * h[k] + h[k - 1];
            let w2 = h[k] + 2.0 * h[k - 1];
            d[k] = (w1 + w2) / (w1 / a + w2 / b);
        }
    }
    d[0] = end_slope(h[0], h[1], delta[0], delta[1]);
    d[n - 1] = end_slope(h[n - 2], h[n - 3], delta[n - 2], delta[n - 3]);
    d
}

/// Shape-preserving three-point end slope (Fritsch & Butland; as in Moler, Numerical
/// Computing with MATLAB, §3.4).
fn end_slope(h0: f64, h1: f64, d0: f64, d1: f64) -> f64 {
    let s = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
    if s.signum() != d0.signum() || d0 == 0.0 {
        0.0
    } else if d0.signum() != d1.signum() && s.abs() > 3.0 * d0.abs() {
        3.0 * d0
    } else {
        s
    }
}

/// One branch of a solubility curve: the solution in equilibrium with one solid phase.
#[derive(Debug, Clone, PartialEq)]
pub struct Branch {
    /// Formula of the solid phase, e.g. `Na2SO4·10H2O`.
    pub phase: String,
    interpolant: Pchip,
    /// Where the solid is the stable phase (K), when the data say so; the branch then
    /// covers that range too, following its end tangents between the last point and the
    /// range's end (basis `Extrapolated`).
    stable: Option<(f64, f64)>,
}

impl Branch {
    /// Builds a branch from (temperature K, mass fraction) points, strictly ascending in
    /// temperature; mass fractions in [0, 1). One point is allowed (a single temperature).
    pub fn new(phase: impl Into<String>, points: &[(f64, f64)]) -> Result<Self, ScienceError> {
        if points.is_empty() {
            return Err(ScienceError::TooFewPoints {
                what: "a branch",
                needed: 1,
                found: 0,
            });
        }
        for &(t, w) in points {
            if !(t.is_finite() && t > 0.0) {
                return Err(ScienceError::NotPositive {
                    what: "temperature (K)",
                    value: t,
                });
            }
            if !(w.is_finite() && (0.0..1.0).contains(&w)) {
                return Err(ScienceError::InvalidComposition {
                    value: w,
                    unit: "w",
                    why: "a mass fraction must lie in [0, 1)",
                });
            }
        }
        let interpolant = Pchip::named(
            "temperatures (K)",
            points.iter().map(|p| p.0).collect(),
            points.iter().map(|p| p.1).collect(),
        )?;
        Ok(Self {
            phase: phase.into(),
            interpolant,
            stable: None,
        })
    }

    /// The branch with the temperatures (K) over which its solid is the stable phase
    /// (a dataset's `stable_range`). Where the stable range is known the branch is the
    /// stable one inside it and is not used outside it; a range that does not hold every
    /// point is refused.
    pub fn with_stable_range(mut self, low_k: f64, high_k: f64) -> Result<Self, ScienceError> {
        let (lo, hi) = self.interpolant.range();
        if !(low_k.is_finite() && high_k.is_finite()) || low_k > lo + 1e-9 || high_k < hi - 1e-9 {
            return Err(ScienceError::BadRange {
                t1_k: low_k,
                t2_k: high_k,
            });
        }
        self.stable = Some((low_k, high_k));
        Ok(self)
    }

    /// The stable range (K), when known.
    pub fn stable_range(&self) -> Option<(f64, f64)> {
        self.stable
    }

    /// Builds a branch from a dataset's canonical points (and its stable range).
    pub fn from_dataset(dataset: &crate::model::Dataset) -> Result<Self, ScienceError> {
        Self::from_datasets(dataset, &[])
    }

    /// Builds one solid's branch from its preferred dataset, joined by other datasets of
    /// the same solid only where the preferred one has no points: a point of another
    /// dataset is taken when it lies below the preferred dataset's first or above its last
    /// temperature (for example the eutectic, where ice and the solid crystallise together,
    /// which is a point of the solid's solubility curve, from another source). Stable
    /// ranges are joined likewise (their union).
    pub fn from_datasets(
        preferred: &crate::model::Dataset,
        others: &[&crate::model::Dataset],
    ) -> Result<Self, ScienceError> {
        let canonical = |d: &crate::model::Dataset| -> Vec<(f64, f64)> {
            d.points
                .iter()
                .map(|p| (p.temperature_k, p.mass_fraction))
                .collect()
        };
        let mut points = canonical(preferred);
        let (lo, hi) = points
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| {
                (a.min(p.0), b.max(p.0))
            });
        let mut stable = preferred.stable_range_k;
        for other in others {
            let extra: Vec<(f64, f64)> = canonical(other)
                .into_iter()
                .filter(|p| p.0 < lo - 1e-9 || p.0 > hi + 1e-9)
                .collect();
            if extra.is_empty() {
                continue;
            }
            points.extend(extra);
            if let Some((a, b)) = other.stable_range_k {
                stable = Some(stable.map_or((a, b), |(c, d)| (a.min(c), b.max(d))));
            }
        }
        points.sort_by(|a, b| a.0.total_cmp(&b.0));
        let branch = Self::new(preferred.phase.formula.clone(), &points)?;
        let (first, last) = branch.tabulated_range();
        match stable {
            // A stable range widened to hold the joined points.
            Some((a, b)) => branch.with_stable_range(a.min(first), b.max(last)),
            None => Ok(branch),
        }
    }

    /// Tabulated temperatures, K.
    pub fn knots(&self) -> &[f64] {
        self.interpolant.knots()
    }

    /// True when the branch has a trend to follow beyond its data: two points or more. A
    /// single point has none (its end tangent would be flat, a guess).
    pub fn has_trend(&self) -> bool {
        self.knots().len() >= 2
    }

    /// See [`Pchip::turning_points`]: where the branch's interpolant can turn inside
    /// (`lo`, `hi`), K.
    pub fn turning_points(&self, lo: f64, hi: f64, out: &mut Vec<f64>) {
        self.interpolant.turning_points(lo, hi, out);
    }

    /// Tabulated mass fractions.
    pub fn values(&self) -> &[f64] {
        self.interpolant.values()
    }

    /// (lowest, highest) temperature the branch covers, K: its tabulated range, widened
    /// to its stable range where that is known.
    pub fn range(&self) -> (f64, f64) {
        let (lo, hi) = self.interpolant.range();
        match self.stable {
            Some((a, b)) => (a.min(lo), b.max(hi)),
            None => (lo, hi),
        }
    }

    /// (lowest, highest) tabulated temperature, K.
    pub fn tabulated_range(&self) -> (f64, f64) {
        self.interpolant.range()
    }

    /// True when `t_k` lies within the covered range (see [`Branch::range`]).
    pub fn covers(&self, t_k: f64) -> bool {
        let (lo, hi) = self.range();
        t_k >= lo && t_k <= hi
    }

    /// True when the branch's stable range is known and holds `t_k`.
    fn stable_at(&self, t_k: f64) -> bool {
        self.stable.is_some_and(|(a, b)| t_k >= a && t_k <= b)
    }

    /// Mass fraction and dw/dT (1/K) at `t_k`, with no range check: outside the range the
    /// end tangent is followed and the value is kept in [0, 1).
    pub fn value_unchecked(&self, t_k: f64) -> (f64, f64) {
        let (w, d) = self.interpolant.eval(t_k);
        (w.clamp(0.0, 1.0 - 1e-12), d)
    }

    fn basis_at(&self, t_k: f64) -> Basis {
        self.view().basis_at(t_k)
    }

    /// The branch's knots and covered range, borrowed.
    pub fn view(&self) -> BranchView<'_> {
        BranchView {
            knots: self.interpolant.view(),
            range: self.range(),
            stable: self.stable,
        }
    }

    /// Evaluates the branch alone (see [`Curve::evaluate`] for the rules).
    pub fn evaluate(&self, t_k: f64, extrapolate: bool) -> Result<Evaluation, ScienceError> {
        let (lo, hi) = self.range();
        if !self.covers(t_k) && !extrapolate {
            return Err(ScienceError::OutOfRange {
                t_k,
                t_min_k: lo,
                t_max_k: hi,
            });
        }
        if !self.covers(t_k) {
            if !self.has_trend() {
                return Err(ScienceError::NoTrend {
                    t_k,
                    end_k: if t_k < lo { lo } else { hi },
                    t_min_k: lo,
                    t_max_k: hi,
                });
            }
            super::bounds::check_window(t_k, lo, hi)?;
            super::bounds::check_extrapolated_fraction(
                &self.phase,
                self.interpolant.eval(t_k).0,
                t_k,
            )?;
        }
        let (w, slope) = self.value_unchecked(t_k);
        Ok(Evaluation {
            mass_fraction: w,
            slope_per_k: slope,
            phase: self.phase.clone(),
            branch: 0,
            basis: self.basis_at(t_k),
        })
    }
}

/// A branch's knots and the range it covers ([`Branch::range`]), borrowed: what the range
/// minimum of a curve of one branch works on, whether the knots are the branch's own or the
/// engine's flat copy of them.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BranchView<'a> {
    pub knots: Knots<'a>,
    pub range: (f64, f64),
    /// The stable range, where known ([`Branch::stable_range`]).
    pub stable: Option<(f64, f64)>,
}

impl BranchView<'_> {
    /// True when `t_k` lies within the covered range.
    pub fn covers(self, t_k: f64) -> bool {
        t_k >= self.range.0 && t_k <= self.range.1
    }

    /// The mass fraction of [`Branch::value_unchecked`] (without the slope's arithmetic)
    /// and its basis: what a screening asks of a curve's one branch where it covers `t_k`.
    pub fn mass_fraction_and_basis(self, t_k: f64) -> (f64, Basis) {
        let (w, basis) = self.knots.value_and_basis(t_k);
        (w.clamp(0.0, 1.0 - 1e-12), basis)
    }

    /// The mass fraction alone of [`BranchView::mass_fraction_and_basis`].
    pub fn mass_fraction(self, t_k: f64) -> f64 {
        self.knots.value(t_k).clamp(0.0, 1.0 - 1e-12)
    }

    fn basis_at(self, t_k: f64) -> Basis {
        let x = self.knots.x();
        let (Some(&lo), Some(&hi)) = (x.first(), x.last()) else {
            return Basis::Extrapolated;
        };
        if t_k < lo || t_k > hi {
            Basis::Extrapolated
        } else if x.iter().any(|k| (k - t_k).abs() <= 1e-9) {
            Basis::Tabulated
        } else {
            Basis::Interpolated
        }
    }
}

/// A value of a curve at one temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Evaluation {
    /// Mass fraction of anhydrous solute in the saturated solution.
    pub mass_fraction: f64,
    /// dw/dT of the stable branch, 1/K.
    pub slope_per_k: f64,
    /// Formula of the stable solid phase there.
    pub phase: String,
    /// Index of the stable branch in [`Curve::branches`].
    pub branch: usize,
    pub basis: Basis,
}

/// A temperature where the stable solid phase changes (e.g. a hydrate transition).
#[derive(Debug, Clone, PartialEq)]
pub struct Transition {
    /// Temperature, K (to about 0.001 K where the branches overlap or meet).
    pub t_k: f64,
    /// Stable phase just below.
    pub below: String,
    /// Stable phase just above.
    pub above: String,
}

/// A solubility curve: one or more branches. Where branches overlap, the stable one is the
/// one with the lower solubility (the solid whose saturated solution holds less solute is
/// the stable solid; the other is metastable there — phase-rule reasoning, common practice).
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    pub branches: Vec<Branch>,
    transitions: Vec<Transition>,
}

impl Curve {
    /// Builds a curve; branches are kept in the order given and need not be sorted.
    pub fn new(branches: Vec<Branch>) -> Result<Self, ScienceError> {
        if branches.is_empty() {
            return Err(ScienceError::NoBranches);
        }
        let mut curve = Self {
            branches,
            transitions: Vec::new(),
        };
        curve.transitions = curve.find_transitions();
        Ok(curve)
    }

    /// Builds a curve from a solute's datasets, one branch per dataset that is not retired
    /// and not rejected (phases as in each dataset).
    ///
    /// Datasets of the same solid make one branch: the first of them given, joined by the
    /// others where it has no points (see [`Branch::from_datasets`]).
    pub fn from_datasets<'a>(
        datasets: impl IntoIterator<Item = &'a crate::model::Dataset>,
    ) -> Result<Self, ScienceError> {
        let mut by_phase: Vec<Vec<&crate::model::Dataset>> = Vec::new();
        for d in datasets
            .into_iter()
            .filter(|d| !d.retired && d.review != crate::model::Review::Rejected)
        {
            match by_phase
                .iter_mut()
                .find(|g| g[0].phase.formula == d.phase.formula)
            {
                Some(group) => group.push(d),
                None => by_phase.push(vec![d]),
            }
        }
        let branches = by_phase
            .iter()
            .map(|g| Branch::from_datasets(g[0], &g[1..]))
            .collect::<Result<Vec<_>, _>>()?;
        Self::new(branches)
    }

    /// A curve of one branch.
    pub fn single(branch: Branch) -> Self {
        Self {
            branches: vec![branch],
            transitions: Vec::new(),
        }
    }

    /// The curve's branch as a view, when it has only one.
    pub fn lone(&self) -> Option<BranchView<'_>> {
        match self.branches.as_slice() {
            [b] => Some(b.view()),
            _ => None,
        }
    }

    /// (lowest, highest) temperature with data on any branch, K.
    pub fn temperature_range(&self) -> (f64, f64) {
        let lo = self
            .branches
            .iter()
            .map(|b| b.range().0)
            .fold(f64::INFINITY, f64::min);
        let hi = self
            .branches
            .iter()
            .map(|b| b.range().1)
            .fold(f64::NEG_INFINITY, f64::max);
        (lo, hi)
    }

    /// Temperatures where the stable phase changes, ascending.
    pub fn transitions(&self) -> &[Transition] {
        &self.transitions
    }

    /// Every tabulated temperature of every branch, ascending, deduplicated, K.
    pub fn knots(&self) -> Vec<f64> {
        let mut k: Vec<f64> = self
            .branches
            .iter()
            .flat_map(|b| b.knots().iter().copied())
            .collect();
        k.sort_by(f64::total_cmp);
        k.dedup();
        k
    }

    /// True when some branch has data at `t_k`.
    pub fn covers(&self, t_k: f64) -> bool {
        self.branches.iter().any(|b| b.covers(t_k))
    }

    /// The stable branch at `t_k`: a branch whose known stable range holds `t_k` (the
    /// lower of two where ranges meet at a transition); else the lowest among the branches
    /// covering it; or — where none does — the lowest among all branches, by their
    /// end-tangent extrapolation. A branch whose stable range is known is never chosen
    /// outside it while another branch covers `t_k`.
    fn stable(&self, t_k: f64) -> (usize, f64, f64) {
        let covering = self.covers(t_k);
        let declared = self.branches.iter().any(|b| b.stable_at(t_k));
        // Where no branch has data, a branch of one point has no trend to follow: it is
        // passed over while another has one.
        let trending = !covering && self.branches.iter().any(Branch::has_trend);
        let mut best: Option<(usize, f64, f64)> = None;
        for (i, b) in self.branches.iter().enumerate() {
            if covering && !b.covers(t_k) {
                continue;
            }
            if declared && !b.stable_at(t_k) {
                continue;
            }
            if trending && !b.has_trend() {
                continue;
            }
            let (w, d) = b.value_unchecked(t_k);
            if best.is_none_or(|(_, bw, _)| w < bw) {
                best = Some((i, w, d));
            }
        }
        best.unwrap_or((0, 0.0, 0.0))
    }

    /// The saturated mass fraction at `t_k` (K), on the stable branch.
    ///
    /// The stable branch is the one with the lowest solubility among those with data at
    /// `t_k`. Basis: `Tabulated` at a data point, `Interpolated` between (PCHIP, see
    /// [`Pchip`]). Outside every branch's data the answer is an error
    /// ([`ScienceError::OutOfRange`] beyond the ends, [`ScienceError::InGap`] between
    /// branches) unless `extrapolate` is true; then the ends' tangent lines are followed and
    /// the basis is `Extrapolated`.
    pub fn evaluate(&self, t_k: f64, extrapolate: bool) -> Result<Evaluation, ScienceError> {
        let (i, w, d) = self.stable_checked(t_k, extrapolate)?;
        let branch = &self.branches[i];
        Ok(Evaluation {
            mass_fraction: w,
            slope_per_k: d,
            phase: branch.phase.clone(),
            branch: i,
            basis: branch.basis_at(t_k),
        })
    }

    /// [`Curve::evaluate`] without the phase's name (no allocation): the stable branch's
    /// index in [`Curve::branches`], the mass fraction and its basis, with the same errors.
    pub fn evaluate_branch(
        &self,
        t_k: f64,
        extrapolate: bool,
    ) -> Result<(usize, f64, Basis), ScienceError> {
        let (i, w, _) = self.stable_checked(t_k, extrapolate)?;
        Ok((i, w, self.branches[i].basis_at(t_k)))
    }

    /// The mass fraction [`Curve::evaluate`] gives, with the same errors, without building
    /// an [`Evaluation`] (no allocation): for inversions that sample the curve many times.
    pub fn mass_fraction(&self, t_k: f64, extrapolate: bool) -> Result<f64, ScienceError> {
        self.stable_checked(t_k, extrapolate).map(|(_, w, _)| w)
    }

    /// The checks of [`Curve::evaluate`], then the stable branch: (index, w, dw/dT).
    fn stable_checked(
        &self,
        t_k: f64,
        extrapolate: bool,
    ) -> Result<(usize, f64, f64), ScienceError> {
        if !t_k.is_finite() || t_k <= 0.0 {
            return Err(ScienceError::NotPositive {
                what: "temperature (K)",
                value: t_k,
            });
        }
        if !self.covers(t_k) && !extrapolate {
            let (lo, hi) = self.temperature_range();
            if t_k < lo || t_k > hi {
                return Err(ScienceError::OutOfRange {
                    t_k,
                    t_min_k: lo,
                    t_max_k: hi,
                });
            }
            let below_k = self
                .branches
                .iter()
                .map(|b| b.range().1)
                .filter(|&h| h < t_k)
                .fold(lo, f64::max);
            let above_k = self
                .branches
                .iter()
                .map(|b| b.range().0)
                .filter(|&l| l > t_k)
                .fold(hi, f64::min);
            return Err(ScienceError::InGap {
                t_k,
                below_k,
                above_k,
            });
        }
        let (lo, hi) = self.temperature_range();
        if t_k < lo || t_k > hi {
            // Extrapolated beyond every branch: within reach, and a possible composition.
            self.check_reach(t_k)?;
            let (i, w, d) = self.stable(t_k);
            let branch = &self.branches[i];
            super::bounds::check_extrapolated_fraction(
                &branch.phase,
                branch.interpolant.eval(t_k).0,
                t_k,
            )?;
            return Ok((i, w, d));
        }
        Ok(self.stable(t_k))
    }

    /// The temperatures (K) `extrapolate` may reach: see [`super::bounds::extrapolation_window`],
    /// but not beyond an end of the data where every branch reaching it holds a single
    /// point ([`Curve::has_trend_at`]).
    pub fn extrapolation_window(&self) -> (f64, f64) {
        let (lo, hi) = self.temperature_range();
        let (low, high) = super::bounds::extrapolation_window(lo, hi);
        (
            if self.has_trend_at(lo) { low } else { lo },
            if self.has_trend_at(hi) { high } else { hi },
        )
    }

    /// True when some branch whose data reach the end `end_k` of the curve's data (its
    /// lowest or highest temperature) has a trend to follow beyond it ([`Branch::has_trend`]).
    pub fn has_trend_at(&self, end_k: f64) -> bool {
        self.branches.iter().any(|b| {
            let (lo, hi) = b.range();
            (lo == end_k || hi == end_k) && b.has_trend()
        })
    }

    /// Checks that `extrapolate` may reach `t_k`: inside the data, or within
    /// [`super::bounds::check_window`] beyond an end that has a trend to follow
    /// ([`ScienceError::NoTrend`] where that end is a single point).
    pub fn check_reach(&self, t_k: f64) -> Result<(), ScienceError> {
        let (lo, hi) = self.temperature_range();
        if t_k >= lo && t_k <= hi {
            return Ok(());
        }
        let end_k = if t_k < lo { lo } else { hi };
        if !self.has_trend_at(end_k) {
            return Err(ScienceError::NoTrend {
                t_k,
                end_k,
                t_min_k: lo,
                t_max_k: hi,
            });
        }
        super::bounds::check_window(t_k, lo, hi)
    }

    /// Where the stable branch changes: found on a grid of every knot plus 50 steps per
    /// interval over the whole range, then refined by bisection to 1e-4 K.
    fn find_transitions(&self) -> Vec<Transition> {
        if self.branches.len() < 2 {
            return Vec::new();
        }
        let grid = dense_grid(&self.knots(), 50);
        let mut out = Vec::new();
        for pair in grid.windows(2) {
            let (a, b) = (pair[0], pair[1]);
            let (ia, _, _) = self.stable(a);
            let (ib, _, _) = self.stable(b);
            if ia == ib {
                continue;
            }
            let bracket = bisect(a, b, Until::Width(1e-4), |t| self.stable(t).0 == ia);
            let above = self.stable(bracket.hi).0;
            let mut t_k = bracket.mid();
            // Where a stable range says where the phase changes, that is the temperature.
            for b in [&self.branches[ia], &self.branches[above]] {
                if let Some((a, z)) = b.stable {
                    for end in [a, z] {
                        if (end - t_k).abs() < 1e-3 {
                            t_k = end;
                        }
                    }
                }
            }
            out.push(Transition {
                t_k,
                below: self.branches[ia].phase.clone(),
                above: self.branches[above].phase.clone(),
            });
        }
        out
    }
}

/// Points `knots` with `steps` equal subdivisions between each neighbouring pair.
pub(crate) fn dense_grid(knots: &[f64], steps: usize) -> Vec<f64> {
    let mut g = Vec::with_capacity(knots.len() * steps + 1);
    for pair in knots.windows(2) {
        for s in 0..steps {
            g.push(pair[0] + (pair[1] - pair[0]) * s as f64 / steps as f64);
        }
    }
    if let Some(&last) = knots.last() {
        g.push(last);
    }
    g
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn value_and_basis_agree_with_the_value_and_a_scan_of_the_knots() {
        // Invented demo knots; points on, near, between and beyond them.
        let branch = Branch::new(
            "A",
            &[
                (273.15, 0.10),
                (283.15, 0.15),
                (293.15, 0.25),
                (313.15, 0.30),
            ],
        )
        .unwrap();
        // And one of more knots than are counted (they are searched).
        let knots: Vec<(f64, f64)> = (0..=Knots::FEW_KNOTS + 3)
            .map(|i| {
                (
                    273.15 + 5.0 * i as f64,
                    0.1 + 0.01 * i as f64 + 0.002 * (i % 3) as f64,
                )
            })
            .collect();
        let many = Branch::new("M", &knots).unwrap();
        for view in [branch.view(), many.view()] {
            let mut points = vec![260.0, 273.15, 400.0, f64::NAN, -f64::NAN];
            for &x in view.knots.x() {
                points.extend([x, x - 5e-10, x + 5e-10, x - 2e-9, x + 2e-9, x + 3.3]);
            }
            for x in points {
                let (w, basis) = view.knots.value_and_basis(x);
                let value = view.knots.value(x);
                assert!(w == value || (w.is_nan() && value.is_nan()), "{x}");
                if !x.is_nan() {
                    assert_eq!(basis, view.basis_at(x), "{x}");
                }
            }
        }
        let one = Branch::new("B", &[(280.0, 0.2)]).unwrap();
        for x in [279.0, 280.0, 281.0] {
            assert_eq!(
                one.view().knots.value_and_basis(x).1,
                one.view().basis_at(x)
            );
        }
    }

    // Invented demo data (not reference values): a rising curve in mass fraction.
    fn rising() -> Branch {
        Branch::new(
            "KX",
            &[
                (273.15, 0.10),
                (293.15, 0.20),
                (313.15, 0.35),
                (333.15, 0.45),
            ],
        )
        .unwrap()
    }

    #[test]
    fn tabulated_interpolated_and_range() {
        let c = Curve::single(rising());
        let e = c.evaluate(293.15, false).unwrap();
        assert_eq!(e.basis, Basis::Tabulated);
        assert!((e.mass_fraction - 0.20).abs() < 1e-12);
        let e = c.evaluate(300.0, false).unwrap();
        assert_eq!(e.basis, Basis::Interpolated);
        assert!(e.mass_fraction > 0.20 && e.mass_fraction < 0.35);
        assert!(matches!(
            c.evaluate(260.0, false),
            Err(ScienceError::OutOfRange { .. })
        ));
        assert_eq!(c.evaluate(260.0, true).unwrap().basis, Basis::Extrapolated);
    }

    #[test]
    fn a_single_point_gives_no_trend_to_extrapolate() {
        // Invented: one point at 293.15 K. Asked beyond it, with or without `extrapolate`,
        // there is no value: its flat end tangent would be a guess.
        let c = Curve::single(Branch::new("A", &[(293.15, 0.35)]).unwrap());
        assert!(matches!(
            c.evaluate(277.15, false),
            Err(ScienceError::OutOfRange { .. })
        ));
        assert!(matches!(
            c.evaluate(277.15, true),
            Err(ScienceError::NoTrend { end_k, .. }) if end_k == 293.15
        ));
        assert!(matches!(
            c.branches[0].evaluate(300.0, true),
            Err(ScienceError::NoTrend { .. })
        ));
        assert_eq!(c.extrapolation_window(), (293.15, 293.15));
        assert_eq!(c.evaluate(293.15, true).unwrap().basis, Basis::Tabulated);
        assert!(matches!(
            crate::science::range_minimum::minimum(&c, 275.15, 281.15, true),
            Err(ScienceError::NoTrend { .. })
        ));
    }

    #[test]
    fn a_branch_of_one_point_is_not_followed_beyond_the_data() {
        // Invented: a rising branch to 320 K, then a one-point branch inside the range with
        // a lower value than the first branch's extrapolation above 330 K would be flat.
        // Beyond the data only the branch with a trend is followed.
        let rising = Branch::new("A·H2O", &[(273.15, 0.10), (300.0, 0.30), (330.0, 0.50)]).unwrap();
        let lone = Branch::new("A", &[(310.0, 0.40)]).unwrap();
        let c = Curve::new(vec![rising, lone]).unwrap();
        let e = c.evaluate(335.0, true).unwrap();
        assert_eq!(e.phase, "A·H2O");
        assert!(e.mass_fraction > 0.50);
        // An end reached only by a one-point branch is not extrapolated.
        let ending = Curve::new(vec![
            Branch::new("A·H2O", &[(273.15, 0.10), (300.0, 0.30)]).unwrap(),
            Branch::new("A", &[(320.0, 0.40)]).unwrap(),
        ])
        .unwrap();
        assert!(matches!(
            ending.evaluate(325.0, true),
            Err(ScienceError::NoTrend { end_k, .. }) if end_k == 320.0
        ));
        assert_eq!(ending.extrapolation_window().1, 320.0);
        assert!(ending.extrapolation_window().0 < 273.15);
    }

    #[test]
    fn stable_branch_is_lower_and_transition_found() {
        // Invented: a hydrate branch rising steeply, an anhydrous branch falling slowly;
        // they cross between 300 and 310 K.
        let hydrate =
            Branch::new("A·10H2O", &[(273.15, 0.05), (300.0, 0.30), (310.0, 0.45)]).unwrap();
        let anhydrous = Branch::new("A", &[(295.0, 0.36), (310.0, 0.33), (373.15, 0.30)]).unwrap();
        let c = Curve::new(vec![hydrate, anhydrous]).unwrap();
        let tr = c.transitions();
        assert_eq!(tr.len(), 1);
        assert_eq!(tr[0].below, "A·10H2O");
        assert_eq!(tr[0].above, "A");
        assert!(tr[0].t_k > 300.0 && tr[0].t_k < 310.0);
        assert_eq!(c.evaluate(280.0, false).unwrap().phase, "A·10H2O");
        assert_eq!(c.evaluate(350.0, false).unwrap().phase, "A");
    }

    #[test]
    fn gap_between_branches_is_an_error() {
        let a = Branch::new("A·H2O", &[(273.15, 0.1), (298.15, 0.2)]).unwrap();
        let b = Branch::new("A", &[(310.0, 0.25), (350.0, 0.3)]).unwrap();
        let c = Curve::new(vec![a, b]).unwrap();
        assert!(matches!(
            c.evaluate(305.0, false),
            Err(ScienceError::InGap { .. })
        ));
        assert_eq!(c.evaluate(305.0, true).unwrap().basis, Basis::Extrapolated);
    }

    #[test]
    fn branches_with_a_gap_meet_where_their_extrapolations_cross() {
        // Invented: hydrate rising to 303 K, anhydrous falling from 313 K; the tangent lines
        // cross inside the gap, where the transition is reported.
        let a = Branch::new("A·10H2O", &[(283.15, 0.1), (293.15, 0.15), (303.15, 0.25)]).unwrap();
        let b = Branch::new("A", &[(313.15, 0.33), (333.15, 0.31)]).unwrap();
        let c = Curve::new(vec![a, b]).unwrap();
        assert_eq!(c.transitions().len(), 1);
        let t = c.transitions()[0].t_k;
        assert!(t > 303.15 && t < 313.15, "{t}");
    }

    #[test]
    fn bad_branches() {
        assert!(Branch::new("A", &[]).is_err());
        assert!(Branch::new("A", &[(300.0, 0.1), (290.0, 0.2)]).is_err());
        assert!(Branch::new("A", &[(300.0, 1.5)]).is_err());
        assert!(Curve::new(vec![]).is_err());
    }
}
