//! Model parameter files: `seed-data/models/*.toml`, the published parameter sets of the
//! activity model (single electrolytes, mixing θ and ψ, and the systems joining them) (format in `seed-data/README.md`, "Model parameters"). They are compiled
//! into the binary with the seed and read when an engine is built; the database does not
//! hold them.

use std::collections::HashSet;

use serde::Deserialize;

use super::StoreError;
use crate::science::acid_base::AcidSystem;
use crate::science::activity::{MixingSet, ParameterSet, System, SystemSpec};
use crate::science::formula::parse_formula;
use crate::science::salting_out::Sechenov;

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct ModelFile {
    #[serde(default)]
    set: Vec<ParameterSet>,
    #[serde(default)]
    mixing: Vec<MixingSet>,
    #[serde(default)]
    system: Vec<SystemSpec>,
    #[serde(default)]
    acid: Vec<AcidSystem>,
    #[serde(default)]
    salting_ion: Vec<Sechenov>,
    #[serde(default)]
    salting_gas: Vec<Sechenov>,
}

fn bad(file: &str, record: impl Into<String>, problem: impl Into<String>) -> StoreError {
    StoreError::Import {
        file: format!("seed-data/{file}"),
        record: record.into(),
        problem: problem.into(),
    }
}

/// The keys of `sources.toml` among `files`.
fn source_keys<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<HashSet<String>, StoreError> {
    let mut keys: HashSet<String> = HashSet::new();
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
                    keys.insert(k.to_string());
                }
            }
        }
    }
    Ok(keys)
}

/// Every model file among `files`, parsed, with its path.
fn model_files<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<Vec<(&str, ModelFile)>, StoreError> {
    let mut out = Vec::new();
    for (path, text) in files {
        let path = path.as_ref();
        if !path.starts_with("models/") {
            continue;
        }
        let file: ModelFile =
            toml::from_str(text.as_ref()).map_err(|e| bad(path, "whole file", e.to_string()))?;
        out.push((path, file));
    }
    Ok(out)
}

/// A record of a model file that cites a source and holds over a temperature range: a
/// single-electrolyte parameter set, a mixing parameter or an acid-base record.
trait ModelRecord: Clone {
    /// How an error names the record, e.g. `set "nacl"`.
    const WORD: &'static str;
    fn key(&self) -> &str;
    /// Source key, provenance and review state.
    fn cited(&self) -> (&str, &str, &str);
    /// `(t_min_k, t_max_k)`.
    fn range(&self) -> (f64, f64);
}

macro_rules! model_record {
    ($($record:ty = $word:literal),+) => {$(
        impl ModelRecord for $record {
            const WORD: &'static str = $word;
            fn key(&self) -> &str {
                &self.key
            }
            fn cited(&self) -> (&str, &str, &str) {
                (&self.source, &self.provenance, &self.review)
            }
            fn range(&self) -> (f64, f64) {
                (self.t_min_k, self.t_max_k)
            }
        }
    )+};
}

model_record!(
    ParameterSet = "set",
    MixingSet = "mixing",
    AcidSystem = "acid",
    Sechenov = "salting-out parameter"
);

/// The checks every record of a model file passes: a known source, a provenance of
/// `compiled`, `measured` or `from-memory`, no `reviewed`, a temperature range low to high.
fn check_record(
    sources: &HashSet<String>,
    path: &str,
    record: &str,
    r: &impl ModelRecord,
) -> Result<(), StoreError> {
    let (source, provenance, review) = r.cited();
    let (t_min_k, t_max_k) = r.range();
    if !sources.contains(source) {
        return Err(bad(
            path,
            record,
            format!("source \"{source}\" is not in sources.toml"),
        ));
    }
    if !["compiled", "measured", "from-memory"].contains(&provenance) {
        return Err(bad(
            path,
            record,
            "provenance must be compiled, measured or from-memory",
        ));
    }
    if review == "reviewed" {
        return Err(bad(
            path,
            record,
            "review \"reviewed\" is given only by a person checking the paper",
        ));
    }
    let range_ok =
        t_min_k.is_finite() && t_max_k.is_finite() && t_min_k > 0.0 && t_min_k <= t_max_k;
    if !range_ok {
        return Err(bad(
            path,
            record,
            "t_min_k must be positive and at most t_max_k",
        ));
    }
    Ok(())
}

/// The records of one kind (`pick`) in every model file of `files`, each passing
/// [`check_record`] and `own` (its kind's own checks, a refusal giving the reason), with a
/// key used once among them.
fn model_records<T: ModelRecord>(
    sources: &HashSet<String>,
    files: &[(&str, ModelFile)],
    pick: fn(&ModelFile) -> &[T],
    own: impl Fn(&T) -> Result<(), String>,
) -> Result<Vec<T>, StoreError> {
    let mut out: Vec<T> = Vec::new();
    for (path, file) in files {
        for r in pick(file) {
            let record = format!("{} \"{}\"", T::WORD, r.key());
            check_record(sources, path, &record, r)?;
            own(r).map_err(|why| bad(path, &record, why))?;
            if out.iter().any(|o| o.key() == r.key()) {
                return Err(bad(path, record, "key used twice"));
            }
            out.push(r.clone());
        }
    }
    Ok(out)
}

/// Every mixture system of the `models/` files among `files`, resolved against the
/// single-electrolyte sets and mixing parameters of all model files: each mixing parameter
/// passes the checks of [`parameter_sets`] (a source, a provenance, a range, a key used once),
/// and each system cites a source and joins sets that fit (see
/// [`System::build`](crate::science::activity::System::build)).
pub fn mixture_systems<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<Vec<System>, StoreError> {
    let sets = parameter_sets(files)?;
    let sources = source_keys(files)?;
    let parsed = model_files(files)?;
    let mixing = model_records(
        &sources,
        &parsed,
        |f| &f.mixing,
        |m| {
            if sets.iter().any(|s| s.key == m.key) {
                Err("key used twice".to_string())
            } else {
                Ok(())
            }
        },
    )?;
    let mut systems: Vec<System> = Vec::new();
    for (path, file) in &parsed {
        for spec in &file.system {
            let record = format!("system \"{}\"", spec.key);
            if !sources.contains(&spec.source) {
                return Err(bad(
                    path,
                    record,
                    format!("source \"{}\" is not in sources.toml", spec.source),
                ));
            }
            if systems.iter().any(|s| s.key == spec.key) {
                return Err(bad(path, record, "key used twice"));
            }
            let system = System::build(spec, &sets, &mixing).map_err(|e| bad(path, &record, e))?;
            systems.push(system);
        }
    }
    Ok(systems)
}

/// Every Pitzer parameter set in the `models/` files among `files` ((path relative to
/// `seed-data/`, contents) pairs, as [`crate::seed_files::SEED_FILES`]), validated: each
/// cites a source of `sources.toml`, names an electrolyte by a formula, has a temperature
/// range low to high, a positive molality limit, charges and counts of at least 1, a
/// provenance of `compiled`, `measured` or `from-memory`, and a key used once.
pub fn parameter_sets<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<Vec<ParameterSet>, StoreError> {
    model_records(
        &source_keys(files)?,
        &model_files(files)?,
        |f| &f.set,
        |set| {
            parse_formula(&set.electrolyte).map_err(|e| format!("electrolyte: {e}"))?;
            if !(set.molality_max.is_finite() && set.molality_max > 0.0) {
                return Err("molality_max must be positive".to_string());
            }
            if [
                set.cation_charge,
                set.anion_charge,
                set.cation_count,
                set.anion_count,
            ]
            .contains(&0)
            {
                return Err("charges and counts must be at least 1".to_string());
            }
            Ok(())
        },
    )
}

/// Every acid-base record (`[[acid]]`) of the `models/` files among `files`: each cites a
/// source of `sources.toml`, has a provenance, a temperature range, a key used once, and is
/// whole ([`AcidSystem::check`]); one of them is water (key `water`).
pub fn acid_systems<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<Vec<AcidSystem>, StoreError> {
    let acids = model_records(
        &source_keys(files)?,
        &model_files(files)?,
        |f| &f.acid,
        AcidSystem::check,
    )?;
    if !acids.is_empty() && !acids.iter().any(|a| a.key == "water") {
        return Err(bad(
            "models/",
            "acid \"water\"",
            "acid-base records need water's own ionization (key \"water\")",
        ));
    }
    Ok(acids)
}

/// The Sechenov parameters of the `models/` files among `files` (`[[salting_ion]]` and
/// `[[salting_gas]]`): each cites a source of `sources.toml`, has a provenance, a temperature
/// range and a key used once; an ion's key is an ion symbol the mixture model knows
/// ([`crate::science::activity::ions::IONS`]), every parameter a finite number.
pub fn salting_out<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
) -> Result<(Vec<Sechenov>, Vec<Sechenov>), StoreError> {
    let sources = source_keys(files)?;
    let parsed = model_files(files)?;
    let ions = model_records(
        &sources,
        &parsed,
        |f| &f.salting_ion,
        |ion| {
            if crate::science::activity::ions::charge(&ion.key).is_none() {
                return Err(format!(
                    "\"{}\" is not an ion symbol the model knows (such as Na, Cl, SO4)",
                    ion.key
                ));
            }
            if ion.ht != 0.0 {
                return Err("an ion's parameter has no temperature term (ht)".to_string());
            }
            finite(&[ion.h])
        },
    )?;
    let gases = model_records(
        &sources,
        &parsed,
        |f| &f.salting_gas,
        |gas| finite(&[gas.h, gas.ht]),
    )?;
    Ok((ions, gases))
}

fn finite(values: &[f64]) -> Result<(), String> {
    if values.iter().all(|v| v.is_finite()) {
        Ok(())
    } else {
        Err("every parameter must be a finite number".to_string())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `sources.toml` with the one source `a`, and the model file `path`.
    fn with_source_a<'a>(path: &'a str, text: &'a str) -> [(&'a str, &'a str); 2] {
        [("sources.toml", "[[source]]\nkey = \"a\"\n"), (path, text)]
    }

    #[test]
    fn the_seed_models_load() {
        let sets = parameter_sets(crate::seed_files::SEED_FILES).unwrap();
        assert!(
            sets.iter()
                .any(|s| s.key == "spencer-moller-weare-1990-mgcl2")
        );
        assert!(sets.len() >= 10);
        let systems = mixture_systems(crate::seed_files::SEED_FILES).unwrap();
        let hmw = systems
            .iter()
            .find(|s| s.key == "harvie-moller-weare-1984")
            .unwrap();
        assert_eq!(hmw.ions.len(), 6);
        assert!(hmw.covers(298.15) && !hmw.covers(273.15));
        let gm = systems
            .iter()
            .find(|s| s.key == "greenberg-moller-1989-na-k-cl")
            .unwrap();
        // The sets hold to 523.15 K; A-phi (Clegg, Rard & Pitzer 1994) to 373.15 K.
        assert_eq!((gm.t_min_k, gm.t_max_k), (273.15, 373.15));
    }

    #[test]
    fn the_seed_salting_out_parameters_load() {
        let (ions, gases) = salting_out(crate::seed_files::SEED_FILES).unwrap();
        for key in ["Na", "K", "Cl", "SO4", "H2PO4", "HPO4"] {
            assert!(ions.iter().any(|i| i.key == key), "{key}");
        }
        for key in ["oxygen", "nitrogen", "carbon-dioxide"] {
            assert!(gases.iter().any(|g| g.key == key), "{key}");
        }
        let files = with_source_a(
            "models/s.toml",
            "[[salting_ion]]\nkey = \"Xx\"\nh = 0.1\nsource = \"a\"\nlocator = \"\"\nprovenance = \"from-memory\"\nt_min_k = 273.15\nt_max_k = 363.15\n",
        );
        let e = salting_out(&files).unwrap_err().to_string();
        assert!(
            e.contains("salting-out parameter \"Xx\"") && e.contains("not an ion symbol"),
            "{e}"
        );
    }

    #[test]
    fn the_seed_acids_load_whole() {
        let acids = acid_systems(crate::seed_files::SEED_FILES).unwrap();
        for key in [
            "water",
            "phosphoric-acid",
            "citric-acid",
            "acetic-acid",
            "tris",
            "histidine",
            "carbonic-acid",
            "boric-acid",
            "hepes",
            "mes",
        ] {
            assert!(acids.iter().any(|a| a.key == key), "{key}");
        }
        let p = acids.iter().find(|a| a.key == "phosphoric-acid").unwrap();
        assert_eq!(p.step.len(), 3);
        assert!(p.buffer_named("Sodium Phosphate").is_some());
    }

    #[test]
    fn an_acid_with_a_missing_step_is_refused() {
        let files = with_source_a(
            "models/z.toml",
            "[[acid]]\nkey = \"water\"\nname = \"w\"\nspecies = [\"H2O\", \"OH-\", \"O-2\"]\ncharges = [0, -1, -2]\nstep = [{ pk = 14.0, dh_kj_per_mol = 55.8, dcp_j_per_mol_k = -224.0 }]\nsource = \"a\"\nlocator = \"\"\nprovenance = \"from-memory\"\nt_min_k = 273.15\nt_max_k = 323.15\n",
        );
        let e = acid_systems(&files).unwrap_err().to_string();
        assert!(
            e.contains("acid \"water\"") && e.contains("need 2 steps"),
            "{e}"
        );
    }

    #[test]
    fn a_system_naming_a_missing_set_is_refused() {
        let files = with_source_a(
            "models/y.toml",
            "[[system]]\nkey = \"s\"\nname = \"S\"\nsource = \"a\"\nionic_strength_max = 6.0\nsets = [\"nope\"]\nmixing = []\n",
        );
        let e = mixture_systems(&files).unwrap_err().to_string();
        assert!(e.contains("system \"s\"") && e.contains("\"nope\""), "{e}");
    }

    #[test]
    fn an_unknown_source_is_refused() {
        let files = with_source_a(
            "models/x.toml",
            "[[set]]\nkey = \"k\"\nelectrolyte = \"NaCl\"\nsource = \"b\"\nprovenance = \"compiled\"\nreview = \"unreviewed\"\ncation_charge = 1\nanion_charge = 1\ncation_count = 1\nanion_count = 1\nalpha1 = 2.0\nbeta0 = { form = \"constant\", coefficients = 0.1 }\nbeta1 = { form = \"constant\", coefficients = 0.2 }\nc_phi = { form = \"constant\", coefficients = 0.0 }\nt_min_k = 298.15\nt_max_k = 298.15\nmolality_max = 6.0\n",
        );
        let e = parameter_sets(&files).unwrap_err().to_string();
        assert!(e.contains("source \"b\""), "{e}");
        let ok = files[1].1.replace("source = \"b\"", "source = \"a\"");
        let sets = parameter_sets(&with_source_a("models/x.toml", &ok)).unwrap();
        assert_eq!(sets.len(), 1);
    }
}
