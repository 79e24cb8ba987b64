//! Text of pictures: formulas with subscript digits (`Na2SO4·10H2O` as `Na₂SO₄·10H₂O`), the
//! scale of text to the picture's size, and lines wrapped to a width in pixels.

/// Writes the digits of formulas as subscripts: a digit run that follows a letter or a `)`
/// in a word holding a capital letter (`KNO3`, `(NH4)2SO4`, `CO2`). A run after `·` or at a
/// word's start is a count of units and stays (`·10H2O`), and words without a capital
/// (`g/100g`, `crc-97-aqsol`, `2.5`) are left alone.
pub fn subscripts(text: &str) -> String {
    const SUB: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];
    let mut out = String::with_capacity(text.len() + 8);
    for (i, word) in text.split(' ').enumerate() {
        if i > 0 {
            out.push(' ');
        }
        let formula_like = word.chars().any(|c| c.is_ascii_uppercase())
            && !word.contains("://")
            && !word
                .chars()
                .any(|c| c.is_ascii_lowercase() && word.contains('-'));
        let mut previous: Option<char> = None;
        let mut in_subscript = false;
        for c in word.chars() {
            let digit = c.to_digit(10);
            let after_element =
                previous.is_some_and(|p| p.is_ascii_alphabetic() || p == ')') || in_subscript;
            match digit {
                Some(d) if formula_like && after_element => {
                    out.push(SUB[d as usize]);
                    in_subscript = true;
                }
                _ => {
                    out.push(c);
                    in_subscript = false;
                }
            }
            previous = Some(c);
        }
    }
    out
}

/// How much larger than at 800 × 500 pixels the text of a picture is drawn: text grows with
/// the picture (by the smaller of the two ratios), so a large picture does not have tiny
/// text; never below 0.7 of the base size.
pub fn scale(width: u32, height: u32) -> f64 {
    let by_width = f64::from(width) / 800.0;
    let by_height = f64::from(height) / 500.0;
    by_width.min(by_height).max(0.7)
}

/// `text` broken into lines whose estimated width (`per_char` pixels a character) is at
/// most `width` pixels, at blanks.
pub fn wrap(text: &str, width: f64, per_char: f64) -> Vec<String> {
    let most = ((width / per_char.max(0.1)).floor() as usize).max(10);
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in text.split(' ') {
        if !line.is_empty() && line.chars().count() + 1 + word.chars().count() > most {
            lines.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formula_digits_become_subscripts() {
        for (text, written) in [
            ("KNO3", "KNO₃"),
            ("Na2SO4·10H2O → Na2SO4", "Na₂SO₄·10H₂O → Na₂SO₄"),
            ("(NH4)2SO4", "(NH₄)₂SO₄"),
            ("oxygen (O2)", "oxygen (O₂)"),
            (
                "potassium nitrate: solid KNO3",
                "potassium nitrate: solid KNO₃",
            ),
        ] {
            assert_eq!(subscripts(text), written);
        }
    }

    #[test]
    fn numbers_and_units_are_left_alone() {
        for text in [
            "loading 30 g/100g water",
            "storage range 2 °C to 8 °C",
            "Perry et al. 1997 (perry-7-solubility)",
            "at 32.4 °C",
        ] {
            assert_eq!(subscripts(text), text);
        }
    }

    #[test]
    fn text_grows_with_the_picture() {
        assert_eq!(scale(800, 500), 1.0);
        assert_eq!(scale(1600, 1000), 2.0);
        assert_eq!(scale(1600, 500), 1.0);
        assert!(scale(200, 200) >= 0.7);
    }

    #[test]
    fn wrapped_lines_fit() {
        let lines = wrap(
            "one two three four five six seven eight nine ten",
            100.0,
            7.0,
        );
        assert!(lines.iter().all(|l| l.chars().count() <= 14), "{lines:?}");
        assert_eq!(
            lines.join(" "),
            "one two three four five six seven eight nine ten"
        );
    }
}
