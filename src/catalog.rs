//! The catalog: an immutable in-memory snapshot of the reference, built from the store in
//! one read. Statements are answered from it without touching SQLite; a writer builds a new
//! catalog and swaps it in while readers finish with the old one.
//!
//! It also owns finding a solute by what a person types: its slug, name, formula or a
//! synonym, case-insensitively and whatever hydrate dot is used (`·`, `.`, `*`), with the
//! closest names suggested when nothing matches.

use crate::model::thermo::Thermochemistry;
use std::collections::HashMap;
use std::path::Path;
use std::sync::OnceLock;

use sha2::{Digest, Sha256};

use crate::model::{
    Check, Dataset, DensityCoefficients, FreezingData, GasConstant, Solute, Source,
};
use crate::store::{Contents, Store, StoreError};
use crate::text::edit_distance;

/// How many "did you mean" names an unknown solute gets at most.
const MAX_SUGGESTIONS: usize = 3;

/// A lookup that found nothing.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum CatalogError {
    /// No solute has this slug, name, formula or synonym, e.g. `describe KNO4`
    /// (suggests `KNO3`).
    #[error("unknown solute \"{name}\"{}", did_you_mean(.suggestions))]
    UnknownSolute {
        name: String,
        /// The closest names, best first; may be empty.
        suggestions: Vec<String>,
    },
}

fn did_you_mean(suggestions: &[String]) -> String {
    match suggestions {
        [] => String::new(),
        [one] => format!("; did you mean {one}?"),
        many => format!("; did you mean one of {}?", many.join(", ")),
    }
}

/// Everything the catalog knows about one solute, for `describe`.
#[derive(Debug, Clone, PartialEq)]
pub struct Description<'a> {
    pub solute: &'a Solute,
    pub datasets: Vec<&'a Dataset>,
    pub gas_constants: Vec<&'a GasConstant>,
    pub freezing: Vec<&'a FreezingData>,
    /// Every source the datasets, gas constants and freezing data cite, in order of first
    /// citation, each once.
    pub sources: Vec<&'a Source>,
    /// The corroboration checks of the solute's records, by key.
    pub checks: Vec<&'a Check>,
}

/// An immutable snapshot of the reference data.
#[derive(Debug, Clone)]
pub struct Catalog {
    sources: Vec<Source>,
    solutes: Vec<Solute>,
    /// Datasets that are not retired.
    datasets: Vec<Dataset>,
    gas_constants: Vec<GasConstant>,
    freezing: Vec<FreezingData>,
    /// Solution-density coefficients, by solute id.
    densities: Vec<DensityCoefficients>,
    /// Corroboration checks, by key.
    checks: Vec<Check>,
    thermochemistry: Thermochemistry,
    source_index: HashMap<String, usize>,
    solute_index: HashMap<String, usize>,
    /// Normalised lookup name (case kept) → solute index; tried first so `Co` and `CO`
    /// stay apart when both exist.
    exact_names: HashMap<String, usize>,
    /// Normalised and lower-cased lookup name → solute index.
    folded_names: HashMap<String, usize>,
    /// Every lookup name as written, with its solute, for suggestions.
    all_names: Vec<(String, usize)>,
    /// Worked out when first asked for (hashing the whole reference costs more than a
    /// batch run's other start-up work, and most runs never show it).
    fingerprint: OnceLock<String>,
    schema_version: u32,
}

/// Makes names comparable: trimmed, runs of white space made one space, and every hydrate
/// dot (`·`, `•`, `⋅`, `*`, `.`) written as `·`.
fn normalise(name: &str) -> String {
    name.split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
        .chars()
        .map(|c| match c {
            '•' | '⋅' | '*' | '.' => '·',
            other => other,
        })
        .collect()
}

fn fold(name: &str) -> String {
    normalise(name).to_lowercase()
}

impl Catalog {
    /// Reads the whole store once and builds the snapshot.
    pub fn from_store(store: &Store) -> Result<Catalog, StoreError> {
        let contents = store.read_all()?;
        Ok(Catalog::from_contents(contents, store.schema_version()?))
    }

    /// Opens the database the command line names (`--db`, `SATLINE_DB`) or else the
    /// embedded default, and builds the snapshot.
    pub fn open(db: Option<&Path>) -> Result<Catalog, StoreError> {
        let store = crate::store::open_configured(db)?;
        Catalog::from_store(&store)
    }

    /// Builds the snapshot from records already read; retired datasets are left out.
    pub fn from_contents(contents: Contents, schema_version: u32) -> Catalog {
        let Contents {
            sources,
            solutes,
            datasets,
            gas_constants,
            freezing,
            densities,
            checks,
            thermochemistry,
        } = contents;
        let datasets: Vec<Dataset> = datasets.into_iter().filter(|d| !d.retired).collect();
        let freezing: Vec<FreezingData> = freezing.into_iter().map(|f| f.data).collect();
        let source_index = sources
            .iter()
            .enumerate()
            .map(|(i, s)| (s.key.clone(), i))
            .collect();
        let solute_index = solutes
            .iter()
            .enumerate()
            .map(|(i, s)| (s.id.clone(), i))
            .collect();
        // Earlier kinds of name win: an id over a name over a formula over a synonym over
        // the formula of a solid phase (so `Na2SO4·10H2O` finds sodium sulfate).
        let mut all_names = Vec::new();
        for pass in 0..4 {
            for (i, s) in solutes.iter().enumerate() {
                match pass {
                    0 => all_names.push((s.id.clone(), i)),
                    1 => all_names.push((s.name.clone(), i)),
                    2 => all_names.push((s.formula.clone(), i)),
                    _ => all_names.extend(s.synonyms.iter().map(|n| (n.clone(), i))),
                }
            }
        }
        let by_id: HashMap<&str, usize> = solutes
            .iter()
            .enumerate()
            .map(|(i, s)| (s.id.as_str(), i))
            .collect();
        for d in &datasets {
            if let Some(&i) = by_id.get(d.solute.as_str()) {
                all_names.push((d.phase.formula.clone(), i));
            }
        }
        let mut exact_names = HashMap::new();
        let mut folded_names = HashMap::new();
        for (name, i) in &all_names {
            exact_names.entry(normalise(name)).or_insert(*i);
            folded_names.entry(fold(name)).or_insert(*i);
        }
        Catalog {
            sources,
            solutes,
            datasets,
            gas_constants,
            freezing,
            densities,
            checks,
            thermochemistry,
            source_index,
            solute_index,
            exact_names,
            folded_names,
            all_names,
            fingerprint: OnceLock::new(),
            schema_version,
        }
    }

    /// The solution-density coefficients of a solute, if the reference holds them.
    pub fn density_of(&self, solute_id: &str) -> Option<&DensityCoefficients> {
        self.densities
            .binary_search_by(|d| d.solute.as_str().cmp(solute_id))
            .ok()
            .map(|i| &self.densities[i])
    }

    /// Every set of solution-density coefficients, by solute id.
    pub fn densities(&self) -> &[DensityCoefficients] {
        &self.densities
    }

    /// Every source, by key.
    pub fn sources(&self) -> &[Source] {
        &self.sources
    }

    /// The source with this key.
    pub fn source(&self, key: &str) -> Option<&Source> {
        self.source_index.get(key).map(|&i| &self.sources[i])
    }

    /// The position of the source with this key in [`Catalog::sources`].
    pub fn source_position(&self, key: &str) -> Option<usize> {
        self.source_index.get(key).copied()
    }

    /// Every solute, by id.
    pub fn solutes(&self) -> &[Solute] {
        &self.solutes
    }

    /// The solute with exactly this id (slug).
    pub fn solute(&self, id: &str) -> Option<&Solute> {
        self.solute_index.get(id).map(|&i| &self.solutes[i])
    }

    /// Finds a solute by slug, name, formula or synonym, ignoring case, extra white space
    /// and the kind of hydrate dot. An exact-case match wins over a case-folded one.
    ///
    /// ```
    /// use satline::catalog::Catalog;
    /// use satline::store::Store;
    ///
    /// // Invented demo seed, not reference data.
    /// let sources = "[[source]]\nkey = \"demo\"\nkind = \"other\"\ntitle = \"Invented\"\nauthors = \"nobody\"\n";
    /// let solute = "id = \"demo-salt\"\nname = \"demo salt\"\nformula = \"KNO3\"\nkind = \"salt\"\nions = 2\nsynonyms = [\"saltpetre\"]\n";
    /// let mut store = Store::open_in_memory()?;
    /// store.load_seed(&[("sources.toml", sources), ("solutes/demo-salt.toml", solute)])?;
    /// let catalog = Catalog::from_store(&store)?;
    /// assert_eq!(catalog.find_solute("kno3").unwrap().id, "demo-salt");
    /// assert_eq!(catalog.find_solute("Saltpetre").unwrap().id, "demo-salt");
    /// assert!(catalog.find_solute("KNO4").unwrap_err().to_string().contains("did you mean KNO3?"));
    /// # Ok::<(), satline::store::StoreError>(())
    /// ```
    pub fn find_solute(&self, name: &str) -> Result<&Solute, CatalogError> {
        self.exact_names
            .get(&normalise(name))
            .or_else(|| self.folded_names.get(&fold(name)))
            .map(|&i| &self.solutes[i])
            .ok_or_else(|| CatalogError::UnknownSolute {
                // A pasted megabyte is not echoed back.
                name: crate::text::cut(name.trim()),
                suggestions: self.suggestions(name),
            })
    }

    /// The names closest to `name` by edit distance (case-folded), one per solute, best
    /// first; only names close enough to be a plausible slip are offered. When none is that
    /// close, names that begin with what was typed are offered instead.
    pub fn suggestions(&self, name: &str) -> Vec<String> {
        let wanted = fold(name);
        let limit = (wanted.chars().count() / 3).clamp(1, 4);
        let length = wanted.chars().count();
        let mut scored: Vec<(usize, usize, &str, usize)> = self
            .all_names
            .iter()
            // A length differing by more than the limit cannot be within it: not measured
            // (so a very long name costs one pass, not a distance to every name).
            .filter(|(n, _)| n.chars().count().abs_diff(length) <= limit)
            .map(|(n, i)| {
                let folded = fold(n);
                let distance = edit_distance(&wanted, &folded);
                // Among equally distant names, one of the same length (a mistyped
                // character rather than a missing one) is the likelier intent.
                (
                    distance,
                    folded.chars().count().abs_diff(length),
                    n.as_str(),
                    *i,
                )
            })
            .filter(|(d, _, _, _)| *d <= limit)
            .collect();
        scored.sort_by(|a, b| (a.0, a.1, a.2).cmp(&(b.0, b.1, b.2)));
        let mut seen = Vec::new();
        let mut out = Vec::new();
        for (_, _, n, i) in scored {
            if !seen.contains(&i) {
                seen.push(i);
                out.push(n.to_string());
            }
            if out.len() == MAX_SUGGESTIONS {
                break;
            }
        }
        if out.is_empty() && length >= 3 {
            // A word the person typed may begin longer names ("potassium"): offer those.
            let mut starting: Vec<&(String, usize)> = self
                .all_names
                .iter()
                .filter(|(n, _)| fold(n).starts_with(&wanted))
                .collect();
            starting.sort_by(|a, b| (a.0.len(), &a.0).cmp(&(b.0.len(), &b.0)));
            for (n, i) in starting {
                if !seen.contains(i) {
                    seen.push(*i);
                    out.push(n.clone());
                }
                if out.len() == MAX_SUGGESTIONS {
                    break;
                }
            }
        }
        out
    }

    /// Every dataset that is not retired, by key.
    pub fn datasets(&self) -> &[Dataset] {
        &self.datasets
    }

    /// The datasets of one solute (by id), by key.
    pub fn datasets_of(&self, solute_id: &str) -> Vec<&Dataset> {
        self.datasets
            .iter()
            .filter(|d| d.solute == solute_id)
            .collect()
    }

    /// Every corroboration check, by key.
    pub fn checks(&self) -> &[Check] {
        &self.checks
    }

    /// The checks of one record (a dataset, freezing table or Henry's-law record), by its
    /// full key.
    pub fn checks_of(&self, subject: &str) -> Vec<&Check> {
        self.checks
            .iter()
            .filter(|c| c.subject == subject)
            .collect()
    }

    /// Every Henry's-law record, by key.
    pub fn gas_constants(&self) -> &[GasConstant] {
        &self.gas_constants
    }

    /// The Henry's-law records of one gas (by id).
    pub fn gas_constants_of(&self, solute_id: &str) -> Vec<&GasConstant> {
        self.gas_constants
            .iter()
            .filter(|g| g.solute == solute_id)
            .collect()
    }

    /// Every set of freezing data, by key.
    pub fn freezing(&self) -> &[FreezingData] {
        &self.freezing
    }

    /// The thermochemical records: enthalpies of formation and hydration, radii,
    /// ionisation energies, heat-capacity coefficients.
    pub fn thermochemistry(&self) -> &Thermochemistry {
        &self.thermochemistry
    }

    /// The freezing data of one solute (by id).
    pub fn freezing_of(&self, solute_id: &str) -> Vec<&FreezingData> {
        self.freezing
            .iter()
            .filter(|f| f.solute == solute_id)
            .collect()
    }

    /// The solute found by `name` (see [`Catalog::find_solute`]) with its datasets, gas
    /// constants, freezing data and the sources they cite.
    pub fn describe(&self, name: &str) -> Result<Description<'_>, CatalogError> {
        let solute = self.find_solute(name)?;
        let datasets = self.datasets_of(&solute.id);
        let gas_constants = self.gas_constants_of(&solute.id);
        let freezing = self.freezing_of(&solute.id);
        let mut sources: Vec<&Source> = Vec::new();
        let cited = datasets
            .iter()
            .map(|d| d.source.as_str())
            .chain(gas_constants.iter().map(|g| g.source.as_str()))
            .chain(freezing.iter().map(|f| f.source.as_str()));
        for key in cited {
            if let Some(source) = self.source(key)
                && !sources.iter().any(|s| s.key == key)
            {
                sources.push(source);
            }
        }
        let checks = self
            .checks
            .iter()
            .filter(|c| c.solute == solute.id)
            .collect();
        Ok(Description {
            solute,
            datasets,
            gas_constants,
            freezing,
            sources,
            checks,
        })
    }

    /// A SHA-256 (hex) of the data in this snapshot: equal catalogs have equal fingerprints,
    /// and a change to any record that can change an answer (checks change caveats, the
    /// thermochemical tables change heats of solution) changes it.
    pub fn fingerprint(&self) -> &str {
        self.fingerprint.get_or_init(|| {
            let mut hasher = Sha256::new();
            // serde_json writes floats in their shortest exact form, so equal data hash equally.
            let parts = [
                serde_json::to_vec(&self.sources),
                serde_json::to_vec(&self.solutes),
                serde_json::to_vec(&self.datasets),
                serde_json::to_vec(&self.gas_constants),
                serde_json::to_vec(&self.freezing),
                serde_json::to_vec(&self.densities),
                serde_json::to_vec(&self.checks),
                serde_json::to_vec(&self.thermochemistry),
            ];
            for part in parts {
                let bytes = part.unwrap_or_default();
                hasher.update((bytes.len() as u64).to_le_bytes());
                hasher.update(&bytes);
            }
            crate::store::seed::hex(&hasher.finalize())
        })
    }

    /// The schema version of the store this snapshot was read from.
    pub fn schema_version(&self) -> u32 {
        self.schema_version
    }
}

/// The full citation of a source as one line: authors, title, edition, publisher, year,
/// locator and identifiers, in that order, leaving out what is not given.
pub fn citation(source: &Source) -> String {
    let mut parts = vec![format!("{}.", source.authors.trim_end_matches('.'))];
    let mut title = source.title.clone();
    if let Some(edition) = &source.edition {
        title.push_str(&format!(", {edition} edition"));
    }
    parts.push(format!("{title}."));
    match (&source.publisher, source.year) {
        (Some(p), Some(y)) => parts.push(format!("{p}, {y}.")),
        (Some(p), None) => parts.push(format!("{p}.")),
        (None, Some(y)) => parts.push(format!("{y}.")),
        (None, None) => {}
    }
    if let Some(locator) = &source.locator {
        parts.push(format!("{}.", locator.trim_end_matches('.')));
    }
    if let Some(doi) = &source.doi {
        parts.push(format!("doi:{doi}"));
    }
    if let Some(isbn) = &source.isbn {
        parts.push(format!("ISBN {isbn}"));
    }
    if let Some(url) = &source.url {
        parts.push(url.clone());
    }
    parts.join(" ")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::SourceKind;

    // Invented demo records: names and formulas only, no reference values.
    fn solute(id: &str, name: &str, formula: &str, synonyms: &[&str]) -> Solute {
        Solute {
            id: id.to_string(),
            name: name.to_string(),
            synonyms: synonyms.iter().map(|s| s.to_string()).collect(),
            ..Solute::salt_for_tests(formula, 1.0, 2)
        }
    }

    fn catalog() -> Catalog {
        let contents = Contents {
            solutes: vec![
                solute(
                    "potassium-nitrate",
                    "potassium nitrate",
                    "KNO3",
                    &["saltpetre"],
                ),
                solute(
                    "sodium-sulfate",
                    "sodium sulfate",
                    "Na2SO4",
                    &["Na2SO4·10H2O"],
                ),
                solute("carbon-monoxide", "carbon monoxide", "CO", &[]),
                solute("cobalt-chloride", "cobalt chloride", "CoCl2", &["Co"]),
            ],
            ..Contents::default()
        };
        Catalog::from_contents(contents, 2)
    }

    #[test]
    fn finds_by_slug_name_formula_and_synonym_ignoring_case() {
        let c = catalog();
        for name in [
            "potassium-nitrate",
            "Potassium  Nitrate",
            "kno3",
            "SALTPETRE",
        ] {
            assert_eq!(
                c.find_solute(name).unwrap().id,
                "potassium-nitrate",
                "{name}"
            );
        }
    }

    #[test]
    fn hydrate_dots_are_interchangeable() {
        let c = catalog();
        for name in ["Na2SO4.10H2O", "na2so4*10h2o", "Na2SO4·10H2O"] {
            assert_eq!(c.find_solute(name).unwrap().id, "sodium-sulfate", "{name}");
        }
    }

    #[test]
    fn exact_case_wins_over_folded_case() {
        let c = catalog();
        assert_eq!(c.find_solute("CO").unwrap().id, "carbon-monoxide");
        assert_eq!(c.find_solute("Co").unwrap().id, "cobalt-chloride");
    }

    #[test]
    fn an_unknown_name_gets_the_closest_suggested() {
        let err = catalog().find_solute("KNO4").unwrap_err();
        assert_eq!(
            err.to_string(),
            "unknown solute \"KNO4\"; did you mean KNO3?"
        );
        let err = catalog().find_solute("zzzzzzzzzz").unwrap_err();
        assert_eq!(err.to_string(), "unknown solute \"zzzzzzzzzz\"");
    }

    #[test]
    fn fingerprint_changes_with_the_data() {
        let a = catalog();
        let mut contents = Contents {
            solutes: a.solutes().to_vec(),
            ..Contents::default()
        };
        assert_eq!(
            Catalog::from_contents(contents.clone(), 2).fingerprint(),
            a.fingerprint()
        );
        // A thermochemical figure changes heats of solution, so it changes the fingerprint.
        let mut with_heat = contents.clone();
        with_heat
            .thermochemistry
            .values
            .push(crate::model::thermo::ThermoValue {
                file: "invented".into(),
                quantity: crate::model::thermo::ThermoQuantity::Formation,
                state: Some(crate::model::thermo::ThermoState::Crystal),
                stage: None,
                species: "KNO3".into(),
                value: -1.0,
                source: "invented".into(),
                provenance: crate::model::Provenance::Derived,
                review: crate::model::Review::Unreviewed,
                note: None,
            });
        let heat = Catalog::from_contents(with_heat.clone(), 2);
        assert_ne!(heat.fingerprint(), a.fingerprint());
        with_heat.thermochemistry.values[0].value = -2.0;
        assert_ne!(
            Catalog::from_contents(with_heat, 2).fingerprint(),
            heat.fingerprint()
        );
        contents.solutes[0].name.push('x');
        assert_ne!(
            Catalog::from_contents(contents, 2).fingerprint(),
            a.fingerprint()
        );
    }

    #[test]
    fn citation_leaves_out_what_is_not_given() {
        let s = Source {
            key: "k".into(),
            kind: SourceKind::Handbook,
            title: "A Handbook".into(),
            authors: "Someone, A.".into(),
            publisher: Some("A Press".into()),
            edition: Some("3rd".into()),
            year: Some(2001),
            locator: Some("Table 4".into()),
            doi: None,
            isbn: Some("978-0".into()),
            url: None,
            note: None,
        };
        assert_eq!(
            citation(&s),
            "Someone, A. A Handbook, 3rd edition. A Press, 2001. Table 4. ISBN 978-0"
        );
    }
}
