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

pub use crate::citation::short_citation;

/// `text` wrapped at `width` columns: the first line after `first`, the others after
/// `indent`. Words longer than a line stay whole.
pub fn wrap(text: &str, width: Option<usize>, first: &str, indent: &str) -> String {
    match width {
        None => format!("{first}{text}"),
        Some(_) => crate::text::fill(text.split_whitespace(), width, first, indent),
    }
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
    crate::text::series(&parts, "and")
}

#[cfg(test)]
mod tests {
    use super::*;

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
