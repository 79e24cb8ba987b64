//! Rounding for display, shared by the engine (the numbers an answer carries) and the
//! printers (tables, CSV, pictures): rounded to significant figures so that `31.6` prints as
//! `31.6`, never `31.600000001`. A neutral module: it depends on nothing in the crate.

use std::fmt::Write as _;

/// Rounds `x` to `digits` significant figures (1..=15). Non-finite values pass through.
///
/// Rounding goes through the decimal text of the number, so the result is the f64 nearest
/// to the rounded decimal and prints in its shortest form.
pub fn round_significant(x: f64, digits: usize) -> f64 {
    if !x.is_finite() || x == 0.0 {
        return x;
    }
    let digits = digits.clamp(1, 15);
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

    #[test]
    fn displays_shortest_form() {
        assert_eq!(display(31.6), "31.6");
        assert_eq!(display(20.0), "20");
        assert_eq!(display(1.5e-7), "1.5e-7");
    }
}
