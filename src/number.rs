//! Rounding for display, shared by the engine (the numbers an answer carries) and the
//! printers (tables, CSV, pictures): rounded to significant figures so that `31.6` prints as
//! `31.6`, never `31.600000001`. A neutral module: it depends on nothing in the crate.

use std::fmt::Write as _;

/// Significant figures of compositions in answers: the seed tables print three or four.
pub const VALUE_DIGITS: usize = 4;

/// A composition value for an answer, rounded to [`VALUE_DIGITS`].
pub fn value(x: f64) -> f64 {
    round_significant(x, VALUE_DIGITS)
}

/// A temperature in °C as answers show it: to 0.01 (a rounded −0 shown as 0). Beyond 1e12
/// the number is returned as it is: it has no hundredths, and scaling it could overflow.
pub fn hundredths_of_degree(c: f64) -> f64 {
    if c.abs() > 1e12 {
        return c;
    }
    // `+ 0.0` turns a rounded −0 into 0, so nothing prints as `-0 C`.
    (c * 100.0).round() / 100.0 + 0.0
}

/// A headroom in percent as answers show it: to 0.1.
pub fn tenths_of_percent(pct: f64) -> f64 {
    (pct * 10.0).round() / 10.0
}

/// Rounds `x` to `digits` significant figures (1..=15). Non-finite values pass through.
///
/// Rounding goes through the decimal text of the number, so the result is the f64 nearest
/// to the rounded decimal and prints in its shortest form.
pub fn round_significant(x: f64, digits: usize) -> f64 {
    if !x.is_finite() || x == 0.0 {
        return x;
    }
    let digits = digits.clamp(1, 15);
    if let Some(rounded) = by_power_of_ten(x, digits) {
        return rounded;
    }
    by_text(x, digits)
}

/// Exact powers of ten as f64 (10^0 to 10^22 are all exactly representable).
const POWERS_OF_TEN: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// The quick way, for up to 9 figures and the magnitudes answers show: scale `x` by an exact
/// power of ten so that the figures kept are the integer part, round, and scale back. Scaling
/// back divides (or multiplies) two exactly held integers, so the result is the f64 nearest to
/// the rounded decimal, as parsing its text would give. The one product that is not exact,
/// `x` times the power, is off by at most half a unit in its last place (under 1e-7 for
/// figures below 1e9); where that could move the rounding (a fraction within 1e-6 of one
/// half) or the figure count comes out wrong, `None` sends the number the text way.
fn by_power_of_ten(x: f64, digits: usize) -> Option<f64> {
    if digits > 9 {
        return None;
    }
    let exponent = f64::from(decimal_exponent(x.abs())?);
    let shift = digits as f64 - 1.0 - exponent;
    if shift.abs() > 22.0 {
        return None;
    }
    let power = *POWERS_OF_TEN.get(shift.abs() as usize)?;
    let scaled = if shift >= 0.0 { x * power } else { x / power };
    let fraction = scaled.abs().fract();
    if (fraction - 0.5).abs() < 1e-6 || !scaled.is_finite() {
        return None;
    }
    let kept = scaled.round();
    // As many figures as asked: log10 can be off by one next to a power of ten.
    let (low, high) = (POWERS_OF_TEN[digits - 1], POWERS_OF_TEN[digits]);
    if !(low..high).contains(&kept.abs()) {
        return None;
    }
    // Both operands exact: one correctly rounded operation, as parsing the decimal would be.
    Some(if shift >= 0.0 {
        kept / power
    } else {
        kept * power
    })
}

/// ⌊log10 a⌋ for a positive `a` from 1e-22 to below 1e22, by comparing with exact powers
/// of ten (no logarithm); `None` outside. Next to a power of ten below 1 the product may
/// round across it: the figure count check of [`by_power_of_ten`] catches that.
fn decimal_exponent(a: f64) -> Option<i32> {
    if a >= 1.0 {
        let k = POWERS_OF_TEN.partition_point(|&p| p <= a);
        (k < POWERS_OF_TEN.len()).then(|| k as i32 - 1)
    } else {
        let k = POWERS_OF_TEN.iter().position(|&p| a * p >= 1.0)?;
        Some(-(k as i32))
    }
}

/// The sure way: the number's decimal text rounded by the formatter, read back.
fn by_text(x: f64, digits: usize) -> f64 {
    // The text is written on the stack: answers round many numbers (one per row of a large
    // screening), and a heap string each time would cost more than the rounding.
    let mut buffer = StackText::default();
    if write!(buffer, "{:.*e}", digits - 1, x).is_err() {
        return format!("{:.*e}", digits - 1, x).parse().unwrap_or(x);
    }
    buffer.as_str().parse().unwrap_or(x)
}

/// A short text written on the stack; writing more than it holds is an error.
struct StackText {
    bytes: [u8; 40],
    len: usize,
}

impl Default for StackText {
    fn default() -> Self {
        StackText {
            bytes: [0; 40],
            len: 0,
        }
    }
}

impl StackText {
    fn as_str(&self) -> &str {
        std::str::from_utf8(&self.bytes[..self.len]).unwrap_or("")
    }
}

impl std::fmt::Write for StackText {
    fn write_str(&mut self, s: &str) -> std::fmt::Result {
        let end = self.len + s.len();
        let slot = self.bytes.get_mut(self.len..end).ok_or(std::fmt::Error)?;
        slot.copy_from_slice(s.as_bytes());
        self.len = end;
        Ok(())
    }
}

/// `x` to `digits` significant figures as text for a sentence: [`round_significant`], then
/// [`display`] (so a batch of 1e30 g reads `1e30`, not thirty-one digits).
pub fn shown(x: f64, digits: usize) -> String {
    display(round_significant(x, digits))
}

/// Formats a number already rounded for display: shortest decimal form, no exponent for
/// ordinary magnitudes, exponent form for very small or very large ones.
pub fn display(x: f64) -> String {
    if !x.is_finite() {
        return x.to_string();
    }
    let magnitude = x.abs();
    if magnitude != 0.0 && !(1e-4..1e9).contains(&magnitude) {
        format!("{x:e}")
    } else {
        format!("{x}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rounds_to_significant_figures() {
        assert_eq!(round_significant(31.600000001, 4), 31.6);
        assert_eq!(round_significant(0.000123456, 3), 0.000123);
        assert_eq!(round_significant(-2.345, 2), -2.3);
        assert_eq!(round_significant(123456.0, 3), 123000.0);
        assert_eq!(round_significant(0.0, 3), 0.0);
        // The longest text: 15 digits, a sign and a three-digit exponent.
        assert_eq!(
            round_significant(-1.234_567_890_123_456e-300, 15),
            -1.234_567_890_123_46e-300
        );
    }

    proptest::proptest! {
        /// The quick way gives the very f64 the text way gives, across magnitudes and
        /// figures, near-halves included (values with few digits land on ties often).
        #[test]
        fn quick_rounding_agrees_with_the_text(
            mantissa in -1.0e6f64..1.0e6,
            exponent in -30i32..30,
            digits in 1usize..=15,
            short in proptest::bool::ANY,
        ) {
            let x = if short {
                // Few decimal digits: 2.345, 0.125, 31.65 ... the cases where a tie is near.
                (mantissa.round() / 1000.0) * 10f64.powi(exponent / 3)
            } else {
                mantissa * 10f64.powi(exponent)
            };
            if x.is_finite() && x != 0.0 {
                proptest::prop_assert_eq!(round_significant(x, digits), by_text(x, digits));
            }
        }
    }

    #[test]
    fn the_decimal_exponent_is_the_floor_of_the_logarithm() {
        for a in [
            1.0, 9.999, 10.0, 31.6, 99.99, 100.0, 0.5, 0.1, 0.099, 1e-5, 1e21, 5e21,
        ] {
            assert_eq!(
                decimal_exponent(a).map(f64::from),
                Some(a.log10().floor()),
                "{a}"
            );
        }
        assert_eq!(decimal_exponent(1e22), None);
        assert_eq!(decimal_exponent(1e-23), None);
    }

    #[test]
    fn displays_shortest_form() {
        assert_eq!(display(31.6), "31.6");
        assert_eq!(display(20.0), "20");
        assert_eq!(display(1.5e-7), "1.5e-7");
    }
}
