//! The notes and sources under a table for people: on a terminal each note is shown in full
//! once per run and then referred to by its number, and sources are short references
//! (`Perry et al. 1997 [perry-7-solubility]`) whose full citations `sources of ...`,
//! `--full` and the JSON give. Text is wrapped to the terminal's width.

/// What a run has shown already: the notes, numbered in the order they first appeared,
/// and whether the hint to the full citations was given.
#[derive(Debug, Clone, Default)]
pub struct Memory {
    notes: Vec<String>,
    citations_hinted: bool,
}

impl Memory {
    /// The number of a note (from 1), and whether it is shown for the first time.
    pub fn number(&mut self, note: &str) -> (usize, bool) {
        match self.notes.iter().position(|n| n == note) {
            Some(i) => (i + 1, false),
            None => {
                self.notes.push(note.to_string());
                (self.notes.len(), true)
            }
        }
    }

    /// True the first time it is asked in a run.
    pub fn hint_citations(&mut self) -> bool {
        !std::mem::replace(&mut self.citations_hinted, true)
    }
}

/// A citation cut to its first author and year: "Perry, R. H.; Green, D. W.; Maloney, J. O.
/// (editors). Perry's ... McGraw-Hill, 1997. ..." gives "Perry et al. 1997". The year is
/// the first number from 1800 to 2100 standing alone; without one, the author alone.
pub fn short_citation(citation: &str) -> String {
    let surname = citation.split([',', '.']).next().unwrap_or("").trim();
    let authors = authors_part(citation);
    let count = authors.matches(';').count() + 1;
    let who = match count {
        1 => surname.to_string(),
        2 => {
            let second = authors
                .split(';')
                .nth(1)
                .and_then(|a| a.split(',').next())
                .unwrap_or("")
                .trim();
            format!("{surname} and {second}")
        }
        _ => format!("{surname} et al."),
    };
    match year(citation) {
        Some(y) => format!("{who} {y}"),
        None => who,
    }
}

/// The list of authors at the head of a citation: up to the first full stop that ends a
/// word of more than two letters (initials end in one letter and a stop).
fn authors_part(citation: &str) -> &str {
    let mut word_len = 0;
    for (i, c) in citation.char_indices() {
        if c == '.' && word_len > 2 {
            return &citation[..i];
        }
        if c.is_alphabetic() || c == ')' || c == '-' {
            word_len += 1;
        } else {
            word_len = 0;
        }
    }
    citation
}

fn year(citation: &str) -> Option<u32> {
    citation
        .split(|c: char| !c.is_ascii_digit())
        .filter(|run| run.len() == 4)
        .filter_map(|run| run.parse::<u32>().ok())
        .find(|y| (1800..=2100).contains(y))
}

/// `text` wrapped at `width` columns: the first line after `first`, the others after
/// `indent`. Words longer than a line stay whole.
pub fn wrap(text: &str, width: Option<usize>, first: &str, indent: &str) -> String {
    let Some(width) = width else {
        return format!("{first}{text}");
    };
    let mut lines: Vec<String> = Vec::new();
    let mut line = first.to_string();
    let mut empty = true;
    for word in text.split_whitespace() {
        let fits = line.chars().count() + 1 + word.chars().count() <= width;
        if !empty && !fits {
            lines.push(std::mem::replace(&mut line, indent.to_string()));
            empty = true;
        }
        if !empty {
            line.push(' ');
        }
        line.push_str(word);
        empty = false;
    }
    lines.push(line);
    lines.join("\n")
}

/// Numbers as a reader writes them: "1", "1 and 2", "1, 2 and 4", runs as "1-3".
pub fn numbers(list: &[usize]) -> String {
    let mut parts: Vec<String> = Vec::new();
    let mut i = 0;
    while i < list.len() {
        let mut j = i;
        while j + 1 < list.len() && list[j + 1] == list[j] + 1 {
            j += 1;
        }
        parts.push(if j >= i + 2 {
            format!("{}-{}", list[i], list[j])
        } else if j == i + 1 {
            format!("{}, {}", list[i], list[j])
        } else {
            list[i].to_string()
        });
        i = j + 1;
    }
    match parts.split_last() {
        None => String::new(),
        Some((last, [])) => last.clone(),
        Some((last, rest)) => format!("{} and {last}", rest.join(", ")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn citations_shorten_to_author_and_year() {
        let perry = "Perry, R. H.; Green, D. W.; Maloney, J. O. (editors). Perry's Chemical \
                     Engineers' Handbook, 7th edition. McGraw-Hill, 1997. Section 2.";
        assert_eq!(short_citation(perry), "Perry et al. 1997");
        let crc = "Haynes, W. M. (editor-in-chief). CRC Handbook of Chemistry and Physics, \
                   97th edition. CRC Press, 2016. Section 5.";
        assert_eq!(short_citation(crc), "Haynes 2016");
        let two = "Laliberté, M.; Cooper, W. E. Model for Calculating the Density of Aqueous \
                   Electrolyte Solutions. J. Chem. Eng. Data, 2004.";
        assert_eq!(short_citation(two), "Laliberté and Cooper 2004");
        let pages = "Hudson, C. S. The hydration of milk-sugar in solution. Journal of the \
                     American Chemical Society, vol. 26, pp. 1065-1082, 1904.";
        assert_eq!(short_citation(pages), "Hudson 1904");
    }

    #[test]
    fn notes_are_numbered_once() {
        let mut m = Memory::default();
        assert_eq!(m.number("a"), (1, true));
        assert_eq!(m.number("b"), (2, true));
        assert_eq!(m.number("a"), (1, false));
        assert!(m.hint_citations());
        assert!(!m.hint_citations());
    }

    #[test]
    fn wrapping_keeps_every_line_within_the_width() {
        let text = "potassium nitrate: data typed from memory of the cited table, not yet \
                    checked against it (from-memory)";
        let wrapped = wrap(text, Some(40), "  note 1: ", "    ");
        assert!(
            wrapped.lines().all(|l| l.chars().count() <= 40),
            "{wrapped}"
        );
        assert_eq!(
            wrapped.split_whitespace().collect::<Vec<_>>().join(" "),
            format!("note 1: {text}")
        );
    }

    #[test]
    fn runs_of_numbers_read_as_ranges() {
        assert_eq!(numbers(&[1]), "1");
        assert_eq!(numbers(&[1, 2]), "1, 2");
        assert_eq!(numbers(&[1, 2, 3, 5]), "1-3 and 5");
    }
}
