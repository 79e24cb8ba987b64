//! The statement as an answer repeats it: whole up to [`STATEMENT_CHARS`] characters, and
//! beyond that cut, with a marker giving its full length and the byte range of the whole
//! text in the script, so a pasted megabyte is never sent back (in JSON, on the terminal or
//! over HTTP) while the exact text can still be found.

/// The longest statement an answer repeats whole, in characters. A statement of the
/// language is a line or two; anything longer than this is pasted data, not a question.
pub const STATEMENT_CHARS: usize = 1000;

/// `written` (the statement's text, found at bytes `start..end` of its script) as the
/// answer repeats it.
pub fn statement(written: &str, (start, end): (usize, usize)) -> String {
    let Some((cut_at, _)) = written.char_indices().nth(STATEMENT_CHARS) else {
        return written.to_string();
    };
    let count = written.chars().count();
    format!(
        "{}… [cut: {count} characters in all; the whole statement is bytes {start}–{end} of the script]",
        &written[..cut_at]
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_statement_of_ordinary_length_is_repeated_whole() {
        let text = "é".repeat(STATEMENT_CHARS);
        assert_eq!(statement(&text, (0, text.len())), text);
    }

    #[test]
    fn a_long_statement_is_cut_with_its_length_and_place() {
        let text = format!("solubility of {} at 20 C", "x".repeat(1_000_000));
        let echoed = statement(&text, (5, 5 + text.len()));
        assert!(echoed.chars().count() < STATEMENT_CHARS + 120, "{echoed}");
        assert!(echoed.starts_with("solubility of xxx"));
        assert!(
            echoed.ends_with(&format!(
                "… [cut: {} characters in all; the whole statement is bytes 5–{} of the script]",
                text.len(),
                5 + text.len()
            )),
            "{echoed}"
        );
    }
}
