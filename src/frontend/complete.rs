//! Completion and hints for the interactive session: keywords of the language, unit
//! symbols, solute names and synonyms from the catalog, session commands and help topics.
//! `Vocabulary` does the matching and knows nothing of the terminal; `SessionHelper` hands
//! it to rustyline.

use std::borrow::Cow;

use rustyline::completion::{Completer, Pair};
use rustyline::highlight::{CmdKind, Highlighter};
use rustyline::hint::{Hinter, HistoryHinter};
use rustyline::validate::Validator;
use rustyline::{Context, Helper};

use crate::frontend::{command, help};
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

/// How many words back a completion may start: enough for the longest multi-word name
/// (`g/100g water`, `heat of solution`, `sodium dihydrogen phosphate`).
const WORDS_BACK: usize = 4;

/// The words and phrases the session can complete, sorted and without repeats.
#[derive(Debug, Clone)]
pub struct Vocabulary {
    entries: Vec<String>,
}

impl Vocabulary {
    /// The language's keywords, units, session commands, help topics and the given solute
    /// names (formulas, names and synonyms).
    pub fn new(solute_names: &[String]) -> Self {
        let mut entries: Vec<String> = Vec::new();
        entries.extend(crate::engine::keywords().iter().map(|k| k.to_string()));
        entries.extend(command::COMMAND_WORDS.iter().map(|w| w.to_string()));
        entries.extend(help::topic_names().iter().map(|w| w.to_string()));
        entries.extend(TemperatureUnit::ALL.iter().map(|u| u.symbol().to_string()));
        entries.extend(CompositionUnit::ALL.iter().map(|u| u.symbol().to_string()));
        entries.extend(PressureUnit::ALL.iter().map(|u| u.symbol().to_string()));
        entries.extend(solute_names.iter().cloned());
        Self::from_entries(entries)
    }

    /// A vocabulary of exactly these entries.
    pub fn from_entries(mut entries: Vec<String>) -> Self {
        entries.retain(|e| !e.trim().is_empty());
        entries.sort();
        entries.dedup();
        Vocabulary { entries }
    }

    /// Completions for the text before `pos`: the byte offset where the replaced text
    /// starts, and the entries that can replace it. A completion may span several words
    /// (`potassium ni` completes to `potassium nitrate`); the longest fragment that matches
    /// anything wins. Matching ignores ASCII case. Nothing is offered after a space.
    pub fn complete(&self, line: &str, pos: usize) -> (usize, Vec<String>) {
        let Some(before) = line.get(..pos) else {
            return (pos, Vec::new());
        };
        for start in word_starts(before) {
            let fragment = &before[start..];
            let matches: Vec<String> = self
                .entries
                .iter()
                .filter(|e| starts_with_ignoring_case(e, fragment))
                .cloned()
                .collect();
            if !matches.is_empty() {
                return (start, matches);
            }
        }
        (pos, Vec::new())
    }

    /// A hint: the rest of the one entry that the text before `pos` can complete to, when
    /// there is exactly one and it continues the text as typed.
    pub fn hint(&self, line: &str, pos: usize) -> Option<String> {
        if pos < line.len() {
            return None;
        }
        let (start, matches) = self.complete(line, pos);
        let fragment = line.get(start..pos)?;
        match matches.as_slice() {
            [only] if fragment.chars().count() >= 2 && only.starts_with(fragment) => {
                let rest = &only[fragment.len()..];
                (!rest.is_empty()).then(|| rest.to_string())
            }
            _ => None,
        }
    }
}

/// Byte offsets where a completion may start in `before`, earliest first: the starts of the
/// last few words, when the text does not end in a space.
fn word_starts(before: &str) -> Vec<usize> {
    if before.is_empty() || before.ends_with(char::is_whitespace) {
        return Vec::new();
    }
    let is_break = |c: char| c.is_whitespace() || c == ';' || c == '=';
    let mut starts = Vec::new();
    let mut previous_break = true;
    for (index, c) in before.char_indices() {
        if previous_break && !is_break(c) {
            starts.push(index);
        }
        previous_break = is_break(c);
    }
    // Only the last word may start after a `;` or `=`: a statement separator ends any
    // phrase, so drop starts before the last break of that kind.
    if let Some(separator) = before.rfind([';', '=']) {
        starts.retain(|&s| s > separator);
    }
    let keep = starts.len().saturating_sub(WORDS_BACK);
    starts.split_off(keep)
}

fn starts_with_ignoring_case(entry: &str, fragment: &str) -> bool {
    entry
        .get(..fragment.len())
        .is_some_and(|head| head.eq_ignore_ascii_case(fragment))
}

/// The rustyline helper of the session: completion from the vocabulary, hints from the
/// history first and the vocabulary second, hints drawn dim.
pub struct SessionHelper {
    vocabulary: Vocabulary,
    history: HistoryHinter,
    /// Whether to colour hints (off when the terminal is dumb or NO_COLOR is set).
    colour: bool,
}

impl SessionHelper {
    pub fn new(vocabulary: Vocabulary, colour: bool) -> Self {
        SessionHelper {
            vocabulary,
            history: HistoryHinter::new(),
            colour,
        }
    }
}

impl Completer for SessionHelper {
    type Candidate = Pair;

    fn complete(
        &self,
        line: &str,
        pos: usize,
        _ctx: &Context<'_>,
    ) -> rustyline::Result<(usize, Vec<Pair>)> {
        let (start, matches) = self.vocabulary.complete(line, pos);
        let pairs = matches
            .into_iter()
            .map(|m| Pair {
                display: m.clone(),
                replacement: m,
            })
            .collect();
        Ok((start, pairs))
    }
}

impl Hinter for SessionHelper {
    type Hint = String;

    fn hint(&self, line: &str, pos: usize, ctx: &Context<'_>) -> Option<String> {
        self.history
            .hint(line, pos, ctx)
            .or_else(|| self.vocabulary.hint(line, pos))
    }
}

impl Highlighter for SessionHelper {
    fn highlight_hint<'h>(&self, hint: &'h str) -> Cow<'h, str> {
        if self.colour {
            Cow::Owned(format!("\x1b[2m{hint}\x1b[0m"))
        } else {
            Cow::Borrowed(hint)
        }
    }

    fn highlight_char(&self, _line: &str, _pos: usize, _kind: CmdKind) -> bool {
        false
    }
}

/// Continued lines are joined by the session loop, not by the editor.
impl Validator for SessionHelper {}

impl Helper for SessionHelper {}

#[cfg(test)]
mod tests {
    use super::*;

    fn vocabulary() -> Vocabulary {
        Vocabulary::new(&[
            "potassium nitrate".to_string(),
            "KNO3".to_string(),
            "potassium chloride".to_string(),
            "KCl".to_string(),
        ])
    }

    /// The word completed at the end of `line`, and its completions.
    fn at_end(line: &str) -> (&str, Vec<String>) {
        let (start, matches) = vocabulary().complete(line, line.len());
        (&line[start..], matches)
    }

    /// Completing at the end of `line` replaces `word` with one of `matches`.
    fn completes(line: &str, word: &str, matches: &[&str]) {
        let (completed, found) = at_end(line);
        assert_eq!(completed, word, "{line}");
        assert_eq!(found, matches, "{line}");
    }

    #[test]
    fn completes_a_solute_name_over_two_words() {
        completes(
            "solubility of potassium ni",
            "potassium ni",
            &["potassium nitrate"],
        );
    }

    #[test]
    fn completes_formulas_ignoring_case() {
        completes("describe kn", "kn", &["KNO3"]);
    }

    #[test]
    fn completes_keywords_units_and_commands() {
        assert_eq!(
            at_end("solu").1,
            ["solubility", "solute", "solutes", "solution"]
        );
        assert_eq!(at_end("convert 20 g/1").1, ["g/100g water"]);
        assert_eq!(at_end("outp").1, ["output"]);
        assert_eq!(at_end("help req").1, ["require"]);
    }

    #[test]
    fn nothing_after_a_space_or_for_unknown_text() {
        for line in ["solubility of ", "zzz", ""] {
            assert_eq!(at_end(line).1, Vec::<String>::new(), "{line}");
        }
    }

    #[test]
    fn completion_after_a_let_sign_starts_after_it() {
        completes("let cold =fro", "fro", &["from"]);
    }

    #[test]
    fn hints_the_rest_of_a_unique_completion() {
        let v = vocabulary();
        assert_eq!(
            v.hint("solubility of potassium ni", 26).as_deref(),
            Some("trate")
        );
        assert_eq!(v.hint("satu", 4).as_deref(), Some("ration"));
        // Two candidates, or the case differs from the entry: no hint.
        assert_eq!(v.hint("potassium", 9), None);
        assert_eq!(v.hint("kn", 2), None);
        // Cursor not at the end: no hint.
        assert_eq!(v.hint("satu x", 4), None);
    }

    proptest::proptest! {
        #[test]
        fn never_panics_and_offers_only_entries(line in "\\PC{0,40}", cut in 0usize..48) {
            let v = vocabulary();
            let pos = cut.min(line.len());
            let (start, matches) = v.complete(&line, pos);
            proptest::prop_assert!(start <= pos);
            for m in &matches {
                proptest::prop_assert!(v.entries.contains(m));
            }
            let _ = v.hint(&line, pos);
        }
    }

    #[test]
    fn vocabulary_has_no_repeats() {
        let v = Vocabulary::from_entries(vec!["b".into(), "a".into(), "b".into(), " ".into()]);
        assert_eq!(v.entries, ["a", "b"]);
    }
}
