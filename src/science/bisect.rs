//! Bisection: the one way satline narrows a bracketed root or threshold (a saturation
//! molality, a freezing point, a phase change, a pH).

use std::cmp::Ordering;
use std::convert::Infallible;

/// At most this many halvings when halving until a width: a width below what the numbers
/// can resolve still ends.
const MOST_HALVINGS: u32 = 200;

/// When to stop halving a bracket.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Until {
    /// After this many halvings.
    Halvings(u32),
    /// Once the bracket is no wider than this.
    Width(f64),
}

/// The bracket left after halving: the point sought lies between `lo` and `hi`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bracket {
    pub lo: f64,
    pub hi: f64,
}

impl Bracket {
    /// The middle of the bracket, the usual answer.
    pub fn mid(self) -> f64 {
        0.5 * (self.lo + self.hi)
    }
}

/// The first place, going down from `top` to `bottom`, where `is_out` turns true: `top`
/// itself when it holds there; else a scan in steps of at most `step`, and the first step
/// where it holds bisected against the one above it to `width`. `None` when it holds
/// nowhere on the way (where something first comes out of a cooling liquid).
pub fn first_going_down<E>(
    top: f64,
    bottom: f64,
    step: f64,
    width: f64,
    mut is_out: impl FnMut(f64) -> Result<bool, E>,
) -> Result<Option<f64>, E> {
    if is_out(top)? {
        return Ok(Some(top));
    }
    let n = (((top - bottom) / step).ceil() as usize).max(1);
    let mut above = top;
    for k in 1..=n {
        let t = top - (top - bottom) * k as f64 / n as f64;
        if is_out(t)? {
            return Ok(Some(
                try_bisect(t, above, Until::Width(width), is_out)?.mid(),
            ));
        }
        above = t;
    }
    Ok(None)
}

/// Narrows `[lo, hi]` by halving it: where `is_low(mid)` holds, the point sought lies
/// above `mid` and the lower end moves up to it; otherwise the upper end moves down.
/// An error from `is_low` ends the search.
pub fn try_bisect<E>(
    lo: f64,
    hi: f64,
    until: Until,
    mut is_low: impl FnMut(f64) -> Result<bool, E>,
) -> Result<Bracket, E> {
    let (mut lo, mut hi) = (lo, hi);
    let (halvings, width) = match until {
        Until::Halvings(n) => (n, None),
        Until::Width(w) => (MOST_HALVINGS, Some(w)),
    };
    for _ in 0..halvings {
        // Narrow enough, or a width that cannot be compared (NaN): stop.
        if width.is_some_and(|w| (hi - lo).partial_cmp(&w) != Some(Ordering::Greater)) {
            break;
        }
        let mid = 0.5 * (lo + hi);
        if is_low(mid)? {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(Bracket { lo, hi })
}

/// [`try_bisect`] for a test that cannot fail.
pub fn bisect(lo: f64, hi: f64, until: Until, mut is_low: impl FnMut(f64) -> bool) -> Bracket {
    match try_bisect(lo, hi, until, |x| Ok::<_, Infallible>(is_low(x))) {
        Ok(bracket) => bracket,
        Err(never) => match never {},
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_first_place_going_down_is_found_between_scan_steps() {
        let below = |edge: f64| move |t: f64| Ok::<bool, ()>(t < edge);
        // Out below 7.3 on the way from 10 down to 0: found to the width asked.
        let t = first_going_down(10.0, 0.0, 1.0, 1e-6, below(7.3));
        assert!(t.is_ok_and(|t| t.is_some_and(|t| (t - 7.3).abs() < 1e-6)));
        // Out at the top already, and nowhere on the way.
        assert_eq!(
            first_going_down(10.0, 0.0, 1.0, 1e-6, below(11.0)),
            Ok(Some(10.0))
        );
        assert_eq!(
            first_going_down(10.0, 0.0, 1.0, 1e-6, below(-1.0)),
            Ok(None)
        );
        // An error from the test ends the search.
        let failing = first_going_down(10.0, 0.0, 1.0, 1e-6, |_| Err::<bool, &str>("no"));
        assert_eq!(failing, Err("no"));
    }

    #[test]
    fn finds_a_square_root_to_the_width_asked() {
        let b = bisect(0.0, 2.0, Until::Width(1e-9), |x| x * x < 2.0);
        assert!(b.hi - b.lo <= 1e-9);
        assert!((b.mid() - 2f64.sqrt()).abs() < 1e-9);
    }

    #[test]
    fn halves_as_often_as_asked() {
        let b = bisect(0.0, 1.0, Until::Halvings(3), |_| true);
        assert_eq!(b, Bracket { lo: 0.875, hi: 1.0 });
    }

    #[test]
    fn ends_when_the_width_cannot_be_reached() {
        let b = bisect(1e10, 1e10 + 1.0, Until::Width(1e-30), |x| x < 1e10 + 0.5);
        assert!(b.lo <= 1e10 + 0.5 && 1e10 + 0.5 <= b.hi);
    }

    #[test]
    fn an_error_ends_the_search() {
        let r = try_bisect(0.0, 1.0, Until::Halvings(10), |x| {
            if x < 0.3 { Err("below 0.3") } else { Ok(false) }
        });
        assert_eq!(r, Err("below 0.3"));
    }
}
