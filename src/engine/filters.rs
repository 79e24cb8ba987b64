//! Filter values (`with anion sulfate`, `tagged food`, `with element K`, `source crc-97`)
//! checked against what the catalog holds before anything is selected: a common other
//! spelling is read as the catalog's (`sulphate` → `sulfate`, `fertilizer` →
//! `fertiliser`), and a value the catalog does not know is an error with a "did you mean",
//! never an empty success.

use std::collections::BTreeSet;

use crate::answer::Answer;
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::query::{Filter, Name};
use crate::science::formula::atomic_weight;
use crate::text::{cut, edit_distance};

/// Pairs of spellings of one word (British/American, old/new, with or without a hyphen):
/// a value the catalog does not hold is tried with either side replaced by the other.
const SPELLINGS: &[(&str, &str)] = &[
    ("sulph", "sulf"),
    ("iser", "izer"),
    ("isation", "ization"),
    ("aluminium", "aluminum"),
    ("caesium", "cesium"),
    ("bicarbonate", "hydrogen carbonate"),
    ("de-icing", "deicing"),
    ("amino-acid", "amino acid"),
    ("sugar-alcohol", "sugar alcohol"),
];

/// How many suggestions an unknown value gets at most.
const MAX_SUGGESTIONS: usize = 3;

/// The filters with their values in the catalog's spelling, or the first value the catalog
/// does not know, with the closest it does.
/// A respelled value adds a caveat to `answer` saying how it was read.
pub fn checked(
    snap: &Snapshot,
    filters: &[Filter],
    answer: &mut Answer,
) -> Result<Vec<Filter>, EvalError> {
    let mut out = Vec::with_capacity(filters.len());
    for filter in filters {
        let read = check(snap, filter)?;
        let (asked, used) = (value_of(filter), value_of(&read));
        if !asked.text.trim().eq_ignore_ascii_case(&used.text) {
            answer.caveat(format!(
                "`{}` read as `{}`, the reference's spelling",
                asked.text.trim(),
                used.text
            ));
        }
        out.push(read);
    }
    Ok(out)
}

fn value_of(filter: &Filter) -> &Name {
    match filter {
        Filter::Cation(n)
        | Filter::Anion(n)
        | Filter::Tag(n)
        | Filter::Source(n)
        | Filter::Element(n) => n,
    }
}

fn check(snap: &Snapshot, filter: &Filter) -> Result<Filter, EvalError> {
    let catalog = &snap.catalog;
    let (what, known, rebuild): (&str, BTreeSet<String>, fn(Name) -> Filter) = match filter {
        Filter::Cation(_) => (
            "cation",
            ion_words(catalog.solutes().iter().filter_map(|s| s.cation.as_deref())),
            Filter::Cation,
        ),
        Filter::Anion(_) => (
            "anion",
            ion_words(catalog.solutes().iter().filter_map(|s| s.anion.as_deref())),
            Filter::Anion,
        ),
        Filter::Tag(_) => (
            "tag",
            catalog
                .solutes()
                .iter()
                .flat_map(|s| s.tags.iter().map(|t| t.to_lowercase()))
                .collect(),
            Filter::Tag,
        ),
        Filter::Source(_) => (
            "source",
            catalog
                .sources()
                .iter()
                .map(|s| s.key.to_lowercase())
                .collect(),
            Filter::Source,
        ),
        Filter::Element(n) => {
            // Any element of the periodic table is a fair question; only a symbol that is
            // no element is refused.
            if atomic_weight(n.text.trim()).is_some() {
                return Ok(filter.clone());
            }
            return Err(EvalError::Unanswerable {
                message: format!(
                    "`{}` is not an element symbol (write it as in a formula: K, Na, Cl)",
                    cut(&n.text)
                ),
                span: n.span,
            });
        }
    };
    let name = value_of(filter);
    let wanted = name.text.trim().to_lowercase();
    if known.contains(&wanted) {
        return Ok(filter.clone());
    }
    if let Some(spelled) = respelled(&wanted, &known) {
        return Ok(rebuild(Name {
            text: spelled,
            span: name.span,
        }));
    }
    let suggestions = closest(&wanted, &known);
    let hint = match suggestions.as_slice() {
        [] => format!(
            "; the reference's {what}s are: {}",
            known.iter().cloned().collect::<Vec<_>>().join(", ")
        ),
        [one] => format!("; did you mean {one}?"),
        many => format!("; did you mean one of {}?", many.join(", ")),
    };
    Err(EvalError::Unanswerable {
        message: format!(
            "no solute of the reference has the {what} `{}`{hint}",
            cut(&name.text)
        ),
        span: name.span,
    })
}

/// Every ion as written, its family word (`hydrogen phosphate` → `phosphate`) and its name
/// before a charge (`copper(II)` → `copper`), lower-cased: what a filter may name.
fn ion_words<'a>(ions: impl Iterator<Item = &'a str>) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    for ion in ions {
        let ion = ion.to_lowercase();
        if let Some(last) = ion.rsplit(' ').next() {
            out.insert(last.to_string());
        }
        if let Some((before, _)) = ion.split_once('(') {
            out.insert(before.to_string());
        }
        out.insert(ion);
    }
    out
}

/// The value in another common spelling that the catalog holds.
fn respelled(wanted: &str, known: &BTreeSet<String>) -> Option<String> {
    SPELLINGS.iter().find_map(|&(a, b)| {
        [(a, b), (b, a)].into_iter().find_map(|(from, to)| {
            let other = wanted.replace(from, to);
            (other != wanted && known.contains(&other)).then_some(other)
        })
    })
}

/// The known values within a plausible slip of `wanted`, best first.
fn closest(wanted: &str, known: &BTreeSet<String>) -> Vec<String> {
    let length = wanted.chars().count();
    let limit = (length / 3).clamp(1, 4);
    let mut scored: Vec<(usize, &String)> = known
        .iter()
        // A length differing by more than the limit cannot be within it: skipped unmeasured.
        .filter(|k| k.chars().count().abs_diff(length) <= limit)
        .map(|k| (edit_distance(wanted, k), k))
        .filter(|(d, _)| *d <= limit)
        .collect();
    scored.sort();
    scored
        .into_iter()
        .take(MAX_SUGGESTIONS)
        .map(|(_, k)| k.clone())
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn set(words: &[&str]) -> BTreeSet<String> {
        words.iter().map(|w| w.to_string()).collect()
    }

    #[test]
    fn ions_are_known_by_their_family_word_and_before_their_charge() {
        let words = ion_words(["hydrogen phosphate", "copper(II)"].into_iter());
        assert!(words.contains("phosphate") && words.contains("copper"));
        assert!(words.contains("hydrogen phosphate") && words.contains("copper(ii)"));
    }

    #[test]
    fn a_common_other_spelling_is_read_as_the_catalogs() {
        let known = set(&["sulfate", "fertiliser", "de-icing"]);
        assert_eq!(respelled("sulphate", &known).as_deref(), Some("sulfate"));
        assert_eq!(
            respelled("fertilizer", &known).as_deref(),
            Some("fertiliser")
        );
        assert_eq!(respelled("deicing", &known).as_deref(), Some("de-icing"));
        assert_eq!(respelled("nitrate", &known), None);
    }

    #[test]
    fn a_near_miss_is_suggested_and_a_long_value_is_not_measured() {
        let known = set(&["sulfate", "nitrate", "chloride"]);
        assert_eq!(closest("nitrat", &known), vec!["nitrate".to_string()]);
        assert!(closest(&"x".repeat(1_000_000), &known).is_empty());
    }

    #[test]
    fn a_long_text_is_cut_in_messages() {
        let long = "y".repeat(1_000_000);
        let shown = cut(&long);
        assert!(shown.len() < 100, "{shown}");
        assert!(shown.contains("1000000 characters"));
        assert_eq!(cut("KNO3"), "KNO3");
    }
}
