//! The words of the language (statement words, keywords, the words that end a name) and the
//! edit distance behind every "did you mean".

use super::ast::ValueKind;
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};
use crate::text::{edit_distance, series};

/// Words that begin a statement.
pub const STATEMENT_WORDS: [&str; 18] = [
    "solubility",
    "which",
    "saturation",
    "ceiling",
    "max",
    "maximum",
    "heat",
    "dissolving",
    "dissolved",
    "freezing",
    "convert",
    "describe",
    "sources",
    "list",
    "let",
    "require",
    "plot",
    "ph",
];

/// Words that end a multi-word name: the name stops where one of these begins.
pub const NAME_STOP: [&str; 16] = [
    "at",
    "between",
    "from",
    "to",
    "in",
    "over",
    "stay",
    "stays",
    "under",
    "margin",
    "extrapolate",
    "reviewed",
    "as",
    "of",
    "with",
    "and",
];

/// Other keywords; none of them may be bound by `let`.
const OTHER_KEYWORDS: [&str; 25] = [
    "dissolved",
    "solution",
    "temperature",
    "salts",
    "solutes",
    "gases",
    "molecular",
    "cation",
    "anion",
    "tag",
    "element",
    "source",
    "only",
    "salt",
    "solute",
    "gas",
    "air",
    "loading",
    "recipe",
    "solids",
    "form",
    "volume",
    "assuming",
    "density",
    "every",
];

/// Every keyword of the language, for completion in the REPL.
pub fn keywords() -> impl Iterator<Item = &'static str> {
    STATEMENT_WORDS
        .iter()
        .chain(NAME_STOP.iter())
        .chain(OTHER_KEYWORDS.iter())
        .copied()
}

/// True when `word` (any case) is a word of the language.
pub fn is_keyword(word: &str) -> bool {
    let lower = word.to_lowercase();
    STATEMENT_WORDS
        .iter()
        .chain(NAME_STOP.iter())
        .chain(OTHER_KEYWORDS.iter())
        .any(|k| *k == lower)
}

/// True when `word` (any case) ends a multi-word name.
pub fn ends_name(word: &str) -> bool {
    let lower = word.to_lowercase();
    NAME_STOP.iter().any(|k| *k == lower)
}

/// The unit symbols of one kind of quantity, or of every kind (`None`), for suggestions.
pub fn unit_symbols(kind: Option<ValueKind>) -> Vec<&'static str> {
    let mut all = Vec::new();
    let wants = |k: ValueKind| kind.is_none_or(|want| want == k);
    if wants(ValueKind::Temperature) || kind == Some(ValueKind::TemperatureRange) {
        all.extend(TemperatureUnit::ALL.iter().map(|u| u.symbol()));
        all.extend(["°C", "°F"]);
    }
    if wants(ValueKind::Loading) {
        all.extend(CompositionUnit::ALL.iter().map(|u| u.symbol()));
        all.extend(["mM", "uM", "M", "%w/w", "%w/v"]);
    }
    if wants(ValueKind::Pressure) {
        all.extend(PressureUnit::ALL.iter().map(|u| u.symbol()));
    }
    all
}

/// Splits a piece of a unit (`mmol`, `kg`, `uL`) into its SI prefix's power of ten and its
/// base (`mol`, `g`, `L`).
fn prefixed(piece: &str) -> Option<(i32, &str)> {
    const BASES: [&str; 4] = ["mol", "g", "L", "l"];
    if BASES.contains(&piece) {
        return Some((0, piece));
    }
    let mut chars = piece.chars();
    let power = match chars.next()? {
        'k' => 3,
        'm' => -3,
        'u' | 'µ' => -6,
        'n' => -9,
        'p' => -12,
        _ => return None,
    };
    let base = chars.as_str();
    BASES.contains(&base).then_some((power, base))
}

/// The power of ten and the bases of a unit written `a/b` or as a molarity (`mM`, `uM`).
fn scale(unit: &str) -> Option<(i32, &str, &str)> {
    if let Some(prefix) = unit.strip_suffix('M') {
        let (p, _) = prefixed(&format!("{prefix}L"))?;
        return Some((p, "mol", "L"));
    }
    let (top, bottom) = unit.split_once('/')?;
    let ((pt, bt), (pb, bb)) = (prefixed(top)?, prefixed(bottom)?);
    Some((pt - pb, bt, bb.trim_end_matches('l')))
}

/// A warning for a suggested unit that is a factor of 1000 or more away from the unit
/// typed (`nmol/L` → `umol/L`): the did-you-mean must never pass one off silently.
pub fn scale_warning(typed: &str, suggestion: Option<&str>) -> String {
    let Some(suggestion) = suggestion else {
        return String::new();
    };
    match (scale(typed), scale(suggestion)) {
        (Some((a, top_a, bottom_a)), Some((b, top_b, bottom_b)))
            if a != b && top_a == top_b && bottom_a.to_lowercase() == bottom_b.to_lowercase() =>
        {
            let factor = 10f64.powi((a - b).abs());
            let (big, small) = if b > a {
                (suggestion, typed)
            } else {
                (typed, suggestion)
            };
            format!(" (careful: `{big}` is {factor} times `{small}`)")
        }
        _ => String::new(),
    }
}

/// The candidate closest to `word`, if it is close enough to be a slip of the keyboard:
/// one edit for words of up to four characters, two for longer ones.
pub fn nearest<'c>(word: &str, candidates: &[&'c str]) -> Option<&'c str> {
    let length = word.chars().count();
    if length == 0 || length > 64 {
        return None;
    }
    let allowed = if length <= 4 { 1 } else { 2 };
    candidates
        .iter()
        .map(|c| (edit_distance(word, c), *c))
        .filter(|(d, _)| *d > 0 && *d <= allowed && *d < length)
        .min_by_key(|(d, _)| *d)
        .map(|(_, c)| c)
}

/// "`at` or `from`", "`at`, `from` or `over`".
pub fn one_of(words: &[&str]) -> String {
    let quoted: Vec<String> = words.iter().map(|w| format!("`{w}`")).collect();
    series(&quoted, "or")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nearest_needs_a_close_word() {
        assert_eq!(nearest("disolved", &["dissolved", "at"]), Some("dissolved"));
        assert_eq!(nearest("banana", &["at", "from"]), None);
        assert_eq!(nearest("a", &["at"]), None);
    }

    #[test]
    fn a_suggestion_a_thousand_times_off_says_so() {
        let cases = [
            (
                "nmol/L",
                Some("umol/L"),
                " (careful: `umol/L` is 1000 times `nmol/L`)",
            ),
            (
                "ug/L",
                Some("mg/L"),
                " (careful: `mg/L` is 1000 times `ug/L`)",
            ),
            (
                "kmol/L",
                Some("mmol/L"),
                " (careful: `kmol/L` is 1000000 times `mmol/L`)",
            ),
            (
                "g/kg",
                Some("mg/kg"),
                " (careful: `g/kg` is 1000 times `mg/kg`)",
            ),
            ("mol/kgg", Some("mol/kg"), ""),
            ("mol/l", Some("mol/L"), ""),
            ("nM", Some("uM"), " (careful: `uM` is 1000 times `nM`)"),
            ("x", None, ""),
        ];
        for (given, suggested, warning) in cases {
            assert_eq!(scale_warning(given, suggested), warning, "{given}");
        }
    }

    #[test]
    fn lists_read_as_prose() {
        assert_eq!(one_of(&["at"]), "`at`");
        assert_eq!(one_of(&["at", "from", "over"]), "`at`, `from` or `over`");
    }
}
