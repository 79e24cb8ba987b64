//! How a fault is drawn for people, the same in the session, in batch tables and in the
//! grammar guide: the statement after `» `, a row of marks (`‾`) right under the faulty
//! text with the place beside it (`script.satq, line 3, column 23`), then what went wrong,
//! after `not read:` (the statement could not be parsed) or `not answered:` (it was read
//! but could not be answered). A statement wider than the screen is wrapped at word
//! boundaries and the marks go under the part that holds the fault.

/// The mark drawn under each character of the faulty text.
pub const MARK: char = '‾';

/// A fault to draw.
#[derive(Debug, Clone, Copy)]
pub struct Fault<'a> {
    /// The statement as written (one line).
    pub statement: &'a str,
    /// Byte range of the faulty text inside `statement`; an empty range marks one place.
    pub at: (usize, usize),
    /// Where the statement is: `line 3, column 23` or `script.satq, line 3, column 23`.
    pub place: &'a str,
    /// `parse` or `evaluate`.
    pub stage: &'a str,
    pub message: &'a str,
}

/// The word before a fault's message for its stage.
pub fn stage_word(stage: &str) -> &'static str {
    if stage == "parse" {
        "not read"
    } else {
        "not answered"
    }
}

/// Draws `fault` for a screen `width` columns wide (`None`: no wrapping). Every line ends
/// with a newline.
pub fn draw(fault: &Fault, width: Option<usize>) -> String {
    let text = fault.statement;
    let start = floor(text, fault.at.0);
    let end = floor(text, fault.at.1.clamp(start, text.len()));
    let mut out = String::new();
    let mut marked = false;
    for (line_start, line_end) in pieces(text, width.map(|w| w.saturating_sub(2).max(20))) {
        let lead = if line_start == 0 { "» " } else { "  " };
        out.push_str(lead);
        out.push_str(&text[line_start..line_end]);
        out.push('\n');
        let holds = start < line_end || (start == line_end && line_end == text.len());
        if !marked && holds {
            marked = true;
            let pad = text[line_start..start]
                .chars()
                .map(|c| if c == '\t' { '\t' } else { ' ' })
                .collect::<String>();
            let count = text[start..end.min(line_end).max(start)]
                .chars()
                .count()
                .max(1);
            let marks: String = std::iter::repeat_n(MARK, count).collect();
            let row = format!("  {pad}{marks}");
            let beside = row.chars().count() + 1 + fault.place.chars().count();
            if width.is_none_or(|w| beside <= w) {
                out.push_str(&format!("{row} {}\n", fault.place));
            } else {
                out.push_str(&format!("{row}\n  {}\n", fault.place));
            }
        }
    }
    let message = format!("{}: {}", stage_word(fault.stage), fault.message);
    out.push_str(&wrapped(&message, width, "  ", "    "));
    out.push('\n');
    out
}

/// Byte ranges of the lines `text` is wrapped into, breaking at blanks (a word longer than
/// a line stays whole).
fn pieces(text: &str, width: Option<usize>) -> Vec<(usize, usize)> {
    let Some(width) = width else {
        return vec![(0, text.len())];
    };
    let mut lines = Vec::new();
    let mut line_start = 0;
    let mut last_break = None;
    let mut count = 0;
    for (i, c) in text.char_indices() {
        if c == ' ' {
            last_break = Some(i);
        }
        count += 1;
        if count > width {
            if let Some(b) = last_break.filter(|b| *b > line_start) {
                lines.push((line_start, b));
                line_start = b + 1;
                count = text[line_start..=i].chars().count();
                last_break = None;
            }
        }
    }
    lines.push((line_start, text.len()));
    lines
}

fn wrapped(text: &str, width: Option<usize>, first: &str, indent: &str) -> String {
    match width {
        None => format!("{first}{text}"),
        // Split on single spaces: a message's runs of spaces are kept.
        Some(_) => crate::text::fill(text.split(' '), width, first, indent),
    }
}

/// The largest char boundary at or below `offset`, within `text`.
fn floor(text: &str, offset: usize) -> usize {
    let mut at = offset.min(text.len());
    while !text.is_char_boundary(at) {
        at -= 1;
    }
    at
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fault<'a>(statement: &'a str, at: (usize, usize), message: &'a str) -> Fault<'a> {
        Fault {
            statement,
            at,
            place: "line 3, column 23",
            stage: "parse",
            message,
        }
    }

    #[test]
    fn marks_stand_under_the_faulty_text() {
        let f = fault(
            "solubility of KNO3 at 5 g/L",
            (22, 27),
            "expected a temperature",
        );
        let drawn = draw(&f, None);
        let lines: Vec<&str> = drawn.lines().collect();
        assert_eq!(lines[0], "» solubility of KNO3 at 5 g/L");
        assert_eq!(lines[1], "                        ‾‾‾‾‾ line 3, column 23");
        assert_eq!(lines[2], "  not read: expected a temperature");
    }

    #[test]
    fn a_long_statement_wraps_and_keeps_its_marks_under_the_fault() {
        let statement = "which salts with anion sulfate stay dissolved at 30 g/100g water \
                         from 2 C to 8 C margin 10 %w/w";
        let at = statement.find("10 %w/w").unwrap();
        let f = fault(statement, (at, at + 7), "a margin is a bare %");
        let drawn = draw(&f, Some(50));
        assert!(drawn.lines().all(|l| l.chars().count() <= 50), "{drawn}");
        let lines: Vec<&str> = drawn.lines().collect();
        let marks = lines.iter().position(|l| l.contains(MARK)).unwrap();
        let above = lines[marks - 1];
        let column = lines[marks].chars().position(|c| c == MARK).unwrap();
        let under: String = above.chars().skip(column).take(7).collect();
        assert_eq!(under, "10 %w/w", "{drawn}");
    }

    #[test]
    fn a_fault_at_the_end_marks_the_end() {
        let f = fault("solubility of KNO3 at", (21, 21), "expected a temperature");
        let drawn = draw(&f, Some(80));
        assert!(
            drawn
                .lines()
                .nth(1)
                .unwrap()
                .starts_with(&format!("{}{MARK}", " ".repeat(23)))
        );
    }
}
