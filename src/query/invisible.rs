//! Characters that cannot be seen but change what a statement means: zero-width spaces and
//! joiners, direction marks, the byte-order mark, soft hyphens, line and paragraph
//! separators and control characters. A statement holding one is refused with the
//! character's position and code point, never read as a space or a letter.

/// The first invisible character of `text`: its byte offset and the character.
pub fn find(text: &str) -> Option<(usize, char)> {
    text.char_indices().find(|&(_, c)| name(c).is_some())
}

/// What an invisible character is called, or `None` for any other character (tabs, line
/// ends and the ordinary and no-break spaces are fine).
pub fn name(c: char) -> Option<&'static str> {
    Some(match c {
        '\t' | '\n' | '\r' => return None,
        '\u{00AD}' => "soft hyphen",
        '\u{034F}' => "combining grapheme joiner",
        '\u{061C}' => "Arabic letter mark",
        '\u{115F}' | '\u{1160}' | '\u{3164}' | '\u{FFA0}' => "Hangul filler",
        '\u{17B4}' | '\u{17B5}' => "Khmer inherent vowel",
        '\u{180B}'..='\u{180F}' => "Mongolian variation selector or vowel separator",
        '\u{200B}' => "zero-width space",
        '\u{200C}' => "zero-width non-joiner",
        '\u{200D}' => "zero-width joiner",
        '\u{200E}' | '\u{200F}' => "direction mark",
        '\u{2028}' => "line separator",
        '\u{2029}' => "paragraph separator",
        '\u{202A}'..='\u{202E}' | '\u{2066}'..='\u{2069}' => "direction embedding or isolate",
        '\u{2060}' => "word joiner",
        '\u{2061}'..='\u{2064}' => "invisible mathematical operator",
        '\u{206A}'..='\u{206F}' => "deprecated format character",
        '\u{FE00}'..='\u{FE0F}' => "variation selector",
        '\u{FEFF}' => "zero-width no-break space (byte-order mark)",
        '\u{FFF9}'..='\u{FFFB}' => "interlinear annotation mark",
        '\u{E0000}'..='\u{E007F}' => "tag character",
        c if c.is_control() => "control character",
        _ => return None,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zero_width_and_control_characters_are_found_where_they_are() {
        assert_eq!(find("KNO3\u{200B} at"), Some((4, '\u{200B}')));
        assert_eq!(find("a\u{0007}b"), Some((1, '\u{0007}')));
        assert_eq!(find("at\u{2060} 20 C"), Some((2, '\u{2060}')));
    }

    #[test]
    fn ordinary_text_spaces_and_line_ends_pass() {
        assert_eq!(find("solubility of KNO3 at 20 °C\tin mol/kg\r\n"), None);
        assert_eq!(find("Na2SO4·10H2O\u{00A0}x"), None);
    }
}
