//! Numbers for people and for JSON: rounded to significant figures so that `31.6` prints as
//! `31.6`, never `31.600000001`.

/// Rounds `x` to `digits` significant figures (1..=15). Non-finite values pass through.
///
/// Rounding goes through the decimal text of the number, so the result is the f64 nearest
/// to the rounded decimal and prints in its shortest form.
pub fn round_significant(x: f64, digits: usize) -> f64 {
    if !x.is_finite() || x == 0.0 {
        return x;
    }
    let digits = digits.clamp(1, 15);
    let text = format!("{:.*e}", digits - 1, x);
    text.parse().unwrap_or(x)
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
    }

    #[test]
    fn displays_shortest_form() {
        assert_eq!(display(31.6), "31.6");
        assert_eq!(display(20.0), "20");
        assert_eq!(display(1.5e-7), "1.5e-7");
    }
}
