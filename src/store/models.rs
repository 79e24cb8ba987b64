//! Model parameter files: `seed-data/models/*.toml`, the published parameter sets of the
//! activity model (format in `seed-data/README.md`, "Model parameters"). They are compiled
//! into the binary with the seed and read when an engine is built; the database does not
//! hold them.

use std::collections::HashSet;

use serde::Deserialize;

use super::StoreError;
use crate::science::activity::ParameterSet;
use crate::science::formula::parse_formula;

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct ModelFile {
    #[serde(default)]
    set: Vec<ParameterSet>,
}

fn bad(file: &str, record: impl Into<String>, problem: impl Into<String>) -> StoreError {
    StoreError::Import {
        file: format!("seed-data/{file}"),
        record: record.into(),
        problem: problem.into(),
    }
}

/// Every Pitzer parameter set in the `models/` files among `files` ((path relative to
/// `seed-data/`, contents) pairs, as [`crate::seed_files::SEED_FILES`]), validated: each
/// cites a source of `sources.toml`, names an electrolyte by a formula, has a temperature
/// range low to high, a positive molality limit, charges and counts of at least 1, a
/// provenance of `compiled`, `measured` or `from-memory`, and a key used once.
pub fn parameter_sets<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<Vec<ParameterSet>, StoreError> {
    let mut source_keys: HashSet<String> = HashSet::new();
    for (path, text) in files {
        if path.as_ref() == "sources.toml" {
            let value: toml::Value = toml::from_str(text.as_ref())
                .map_err(|e| bad("sources.toml", "whole file", e.to_string()))?;
            for s in value
                .get("source")
                .and_then(|v| v.as_array())
                .into_iter()
                .flatten()
            {
                if let Some(k) = s.get("key").and_then(|k| k.as_str()) {
                    source_keys.insert(k.to_string());
                }
            }
        }
    }
    let mut sets: Vec<ParameterSet> = Vec::new();
    for (path, text) in files {
        let path = path.as_ref();
        if !path.starts_with("models/") {
            continue;
        }
        let file: ModelFile =
            toml::from_str(text.as_ref()).map_err(|e| bad(path, "whole file", e.to_string()))?;
        for set in file.set {
            let record = format!("set \"{}\"", set.key);
            if !source_keys.contains(&set.source) {
                return Err(bad(
                    path,
                    record,
                    format!("source \"{}\" is not in sources.toml", set.source),
                ));
            }
            parse_formula(&set.electrolyte)
                .map_err(|e| bad(path, &record, format!("electrolyte: {e}")))?;
            let range_ok = set.t_min_k.is_finite()
                && set.t_max_k.is_finite()
                && set.t_min_k > 0.0
                && set.t_min_k <= set.t_max_k;
            if !range_ok {
                return Err(bad(
                    path,
                    record,
                    "t_min_k must be positive and at most t_max_k",
                ));
            }
            if !(set.molality_max.is_finite() && set.molality_max > 0.0) {
                return Err(bad(path, record, "molality_max must be positive"));
            }
            if [
                set.cation_charge,
                set.anion_charge,
                set.cation_count,
                set.anion_count,
            ]
            .contains(&0)
            {
                return Err(bad(path, record, "charges and counts must be at least 1"));
            }
            if !["compiled", "measured", "from-memory"].contains(&set.provenance.as_str()) {
                return Err(bad(
                    path,
                    record,
                    "provenance must be compiled, measured or from-memory",
                ));
            }
            if set.review == "reviewed" {
                return Err(bad(
                    path,
                    record,
                    "review \"reviewed\" is given only by a person checking the paper",
                ));
            }
            if sets.iter().any(|s| s.key == set.key) {
                return Err(bad(path, record, "key used twice"));
            }
            sets.push(set);
        }
    }
    Ok(sets)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_seed_models_load() {
        let sets = parameter_sets(crate::seed_files::SEED_FILES).unwrap();
        assert!(
            sets.iter()
                .any(|s| s.key == "spencer-moller-weare-1990-mgcl2")
        );
        assert!(sets.len() >= 10);
    }

    #[test]
    fn an_unknown_source_is_refused() {
        let files = [
            ("sources.toml", "[[source]]\nkey = \"a\"\n"),
            (
                "models/x.toml",
                "[[set]]\nkey = \"k\"\nelectrolyte = \"NaCl\"\nsource = \"b\"\nprovenance = \"compiled\"\nreview = \"unreviewed\"\ncation_charge = 1\nanion_charge = 1\ncation_count = 1\nanion_count = 1\nalpha1 = 2.0\nbeta0 = { form = \"constant\", coefficients = 0.1 }\nbeta1 = { form = \"constant\", coefficients = 0.2 }\nc_phi = { form = \"constant\", coefficients = 0.0 }\nt_min_k = 298.15\nt_max_k = 298.15\nmolality_max = 6.0\n",
            ),
        ];
        let e = parameter_sets(&files).unwrap_err().to_string();
        assert!(e.contains("source \"b\""), "{e}");
        let ok = files[1].1.replace("source = \"b\"", "source = \"a\"");
        let sets = parameter_sets(&[files[0], ("models/x.toml", ok.as_str())]).unwrap();
        assert_eq!(sets.len(), 1);
    }
}
