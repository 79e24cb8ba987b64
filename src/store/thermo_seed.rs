//! The seed files under `thermochemistry/`: parsing and validation into
//! [`Thermochemistry`] records, and writing them back in the same layout (export).
//!
//! A file holds `[[group]]` tables (one quantity, state, source and provenance, then
//! `values = [[species, number], ...]`) and `[[heat_capacity]]` tables (Laliberté's
//! coefficients of one solute). The format is described in `seed-data/README.md`.

use std::collections::HashSet;
use std::fmt::Write as _;

use serde::Deserialize;

use super::StoreError;
use super::export::number;
use super::seed::{SeedProblem, problem, syntax};
use crate::model::thermo::{
    HeatCapacityFit, ThermoQuantity, ThermoState, ThermoValue, Thermochemistry,
};
use crate::model::{Provenance, Review};

/// The folder of thermochemistry seed files, relative to `seed-data/`.
pub const FOLDER: &str = "thermochemistry/";

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFile {
    #[serde(default)]
    group: Vec<RawGroup>,
    #[serde(default)]
    heat_capacity: Vec<RawHeatCapacity>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawGroup {
    quantity: String,
    state: Option<String>,
    stage: Option<u8>,
    unit: String,
    source: String,
    provenance: Provenance,
    review: Review,
    note: Option<String>,
    values: Vec<(String, f64)>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawHeatCapacity {
    solute: String,
    source: String,
    provenance: Provenance,
    review: Review,
    note: Option<String>,
    a: Vec<f64>,
    t_min_c: f64,
    t_max_c: f64,
    w_max: f64,
}

fn bad(file: &str, record: &str, reason: String) -> StoreError {
    problem(file, record, SeedProblem::BadValue { reason })
}

/// A group's field that one quantity's groups need (`owner`'s, refused without it for the
/// reason `needs`, and read by `read`) and every other group leaves out.
fn owned_by<T, U>(
    field: &str,
    (quantity, owner): (ThermoQuantity, ThermoQuantity),
    value: Option<T>,
    needs: &str,
    read: impl FnOnce(T) -> Result<U, String>,
) -> Result<Option<U>, String> {
    match (quantity == owner, value) {
        (true, Some(v)) => read(v).map(Some),
        (true, None) => Err(needs.to_string()),
        (false, Some(_)) => Err(format!(
            "`{field}` belongs to {} groups only",
            owner.as_str()
        )),
        (false, None) => Ok(None),
    }
}

/// Parses one file `thermochemistry/<stem>.toml` into `out`, checking sources against
/// `source_keys` and duplicates against what `out` already holds.
pub fn parse_file(
    path: &str,
    stem: &str,
    text: &str,
    source_keys: &HashSet<&str>,
    out: &mut Thermochemistry,
) -> Result<(), StoreError> {
    let raw: RawFile = toml::from_str(text).map_err(|e| syntax(path, text, &e))?;
    for (i, g) in raw.group.into_iter().enumerate() {
        let record = format!("group {}", i + 1);
        let quantity = ThermoQuantity::from_name(&g.quantity).ok_or_else(|| {
            problem(
                path,
                &record,
                SeedProblem::Syntax {
                    message: format!(
                        "unknown quantity \"{}\"; expected one of {}",
                        g.quantity,
                        ThermoQuantity::NAMES.join(", ")
                    ),
                },
            )
        })?;
        if g.unit != quantity.unit() {
            return Err(problem(
                path,
                &record,
                SeedProblem::UnknownUnit {
                    unit: g.unit,
                    expected: format!("{} for {}", quantity.unit(), quantity.as_str()),
                },
            ));
        }
        let state = owned_by(
            "state",
            (quantity, ThermoQuantity::Formation),
            g.state.as_deref(),
            "a formation group needs `state`",
            |s| {
                ThermoState::from_name(s).ok_or_else(|| {
                    format!(
                        "unknown state \"{s}\"; expected one of {}",
                        ThermoState::NAMES.join(", ")
                    )
                })
            },
        )
        .map_err(|why| bad(path, &record, why))?;
        let needs_stage = "an ionisation group needs `stage` from 1 to 8";
        let stage = owned_by(
            "stage",
            (quantity, ThermoQuantity::Ionisation),
            g.stage,
            needs_stage,
            |n| {
                if (1..=8).contains(&n) {
                    Ok(n)
                } else {
                    Err(needs_stage.to_string())
                }
            },
        )
        .map_err(|why| bad(path, &record, why))?;
        if !source_keys.contains(g.source.as_str()) {
            return Err(problem(
                path,
                &record,
                SeedProblem::UnknownSource { key: g.source },
            ));
        }
        for (species, value) in g.values {
            let here = format!("{record}, species \"{species}\"");
            if species.trim().is_empty() || species.trim() != species {
                return Err(bad(
                    path,
                    &here,
                    "a species needs a name without spaces around it".into(),
                ));
            }
            let plausible = match quantity {
                ThermoQuantity::Formation => value.is_finite() && value.abs() < 1.0e5,
                ThermoQuantity::Hydration => value.is_finite() && value < 0.0 && value > -1.0e4,
                ThermoQuantity::Radius => value.is_finite() && value > 0.0 && value < 1000.0,
                ThermoQuantity::Ionisation | ThermoQuantity::ElectronAffinity => {
                    value.is_finite() && value > 0.0 && value < 1000.0
                }
            };
            if !plausible {
                return Err(bad(
                    path,
                    &here,
                    format!(
                        "{} {} is not a plausible {}",
                        number(value),
                        quantity.unit(),
                        quantity.as_str()
                    ),
                ));
            }
            let duplicate = out.values.iter().any(|v| {
                v.quantity == quantity
                    && v.state == state
                    && v.stage == stage
                    && v.species == species
                    && v.source == g.source
            });
            if duplicate {
                return Err(problem(
                    path,
                    &here,
                    SeedProblem::Duplicate {
                        what: format!("{} value from source \"{}\"", quantity.as_str(), g.source),
                        id: species,
                    },
                ));
            }
            out.values.push(ThermoValue {
                file: stem.to_string(),
                quantity,
                state,
                stage,
                species,
                value,
                source: g.source.clone(),
                provenance: g.provenance,
                review: g.review,
                note: g.note.clone(),
            });
        }
    }
    for h in raw.heat_capacity {
        let record = format!("heat_capacity \"{}\"", h.solute);
        let a: [f64; 6] = h.a.as_slice().try_into().map_err(|_| {
            bad(
                path,
                &record,
                format!("`a` needs 6 coefficients, found {}", h.a.len()),
            )
        })?;
        if a.iter().any(|x| !x.is_finite())
            || !(h.t_min_c.is_finite() && h.t_max_c.is_finite() && h.t_min_c <= h.t_max_c)
            || !(h.w_max > 0.0 && h.w_max < 1.0)
        {
            return Err(bad(
                path,
                &record,
                "coefficients must be numbers, t_min_c ≤ t_max_c and 0 < w_max < 1".into(),
            ));
        }
        if !source_keys.contains(h.source.as_str()) {
            return Err(problem(
                path,
                &record,
                SeedProblem::UnknownSource { key: h.source },
            ));
        }
        if out.heat_capacity.iter().any(|o| o.solute == h.solute) {
            return Err(problem(
                path,
                &record,
                SeedProblem::Duplicate {
                    what: "heat-capacity record".into(),
                    id: h.solute,
                },
            ));
        }
        out.heat_capacity.push(HeatCapacityFit {
            file: stem.to_string(),
            solute: h.solute,
            a,
            t_min_c: h.t_min_c,
            t_max_c: h.t_max_c,
            w_max: h.w_max,
            source: h.source,
            provenance: h.provenance,
            review: h.review,
            note: h.note,
        });
    }
    Ok(())
}

fn text(s: &str) -> String {
    toml::Value::String(s.to_string()).to_string()
}

/// The records as seed files (`thermochemistry/<file>.toml`), one per stored `file`, in the
/// layout [`parse_file`] reads: consecutive values of a file that share everything but
/// species and value make one group.
pub fn to_toml_files(thermo: &Thermochemistry) -> Vec<(String, String)> {
    let mut names: Vec<&str> = Vec::new();
    for name in thermo
        .values
        .iter()
        .map(|v| v.file.as_str())
        .chain(thermo.heat_capacity.iter().map(|h| h.file.as_str()))
    {
        if !names.contains(&name) {
            names.push(name);
        }
    }
    names
        .into_iter()
        .map(|name| (format!("{FOLDER}{name}.toml"), file_toml(thermo, name)))
        .collect()
}

fn same_group(a: &ThermoValue, b: &ThermoValue) -> bool {
    a.quantity == b.quantity
        && a.state == b.state
        && a.stage == b.stage
        && a.source == b.source
        && a.provenance == b.provenance
        && a.review == b.review
        && a.note == b.note
}

fn file_toml(thermo: &Thermochemistry, name: &str) -> String {
    let mut body = String::new();
    let mut previous: Option<&ThermoValue> = None;
    for v in thermo.values.iter().filter(|v| v.file == name) {
        if !previous.is_some_and(|p| same_group(p, v)) {
            if previous.is_some() {
                body.push_str("]\n\n");
            }
            let _ = writeln!(body, "[[group]]\nquantity = {}", text(v.quantity.as_str()));
            if let Some(s) = v.state {
                let _ = writeln!(body, "state = {}", text(s.as_str()));
            }
            if let Some(n) = v.stage {
                let _ = writeln!(body, "stage = {n}");
            }
            let _ = writeln!(
                body,
                "unit = {}\nsource = {}\nprovenance = {}\nreview = {}",
                text(v.quantity.unit()),
                text(&v.source),
                text(v.provenance.as_str()),
                text(v.review.as_str())
            );
            if let Some(n) = &v.note {
                let _ = writeln!(body, "note = {}", text(n));
            }
            body.push_str("values = [\n");
        }
        let _ = writeln!(body, "  [{}, {}],", text(&v.species), number(v.value));
        previous = Some(v);
    }
    if previous.is_some() {
        body.push_str("]\n");
    }
    for h in thermo.heat_capacity.iter().filter(|h| h.file == name) {
        if !body.is_empty() {
            body.push('\n');
        }
        let a: Vec<String> = h.a.iter().map(|x| number(*x)).collect();
        let _ = writeln!(
            body,
            "[[heat_capacity]]\nsolute = {}\nsource = {}\nprovenance = {}\nreview = {}",
            text(&h.solute),
            text(&h.source),
            text(h.provenance.as_str()),
            text(h.review.as_str())
        );
        if let Some(n) = &h.note {
            let _ = writeln!(body, "note = {}", text(n));
        }
        let _ = writeln!(
            body,
            "a = [{}]\nt_min_c = {}\nt_max_c = {}\nw_max = {}",
            a.join(", "),
            number(h.t_min_c),
            number(h.t_max_c),
            number(h.w_max)
        );
    }
    body
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::seed_files::SEED_FILES;

    fn parse(files: &[(&str, &str)]) -> Result<Thermochemistry, StoreError> {
        let keys: HashSet<&str> = ["src-a"].into_iter().collect();
        let mut out = Thermochemistry::default();
        for (path, text) in files {
            let stem = path
                .strip_prefix(FOLDER)
                .and_then(|p| p.strip_suffix(".toml"))
                .unwrap();
            parse_file(path, stem, text, &keys, &mut out)?;
        }
        Ok(out)
    }

    const GROUP: &str = r#"
[[group]]
quantity = "formation"
state = "cr"
unit = "kJ/mol"
source = "src-a"
provenance = "from-memory"
review = "unreviewed"
values = [["AB", -100.5], ["AB2", -200]]
"#;

    #[test]
    fn the_real_seed_writes_back_as_it_reads() {
        let sources = crate::store::seed::parse_seed(SEED_FILES).unwrap().sources;
        let keys: HashSet<&str> = sources.iter().map(|s| s.key.as_str()).collect();
        let mut first = Thermochemistry::default();
        for (path, text) in SEED_FILES.iter().filter(|(p, _)| p.starts_with(FOLDER)) {
            let stem = path
                .strip_prefix(FOLDER)
                .unwrap()
                .strip_suffix(".toml")
                .unwrap();
            parse_file(path, stem, text, &keys, &mut first).unwrap();
        }
        assert!(first.values.len() > 50 && first.heat_capacity.len() > 10);
        let mut second = Thermochemistry::default();
        for (path, text) in to_toml_files(&first) {
            let stem = path
                .strip_prefix(FOLDER)
                .unwrap()
                .strip_suffix(".toml")
                .unwrap();
            parse_file(&path, stem, &text, &keys, &mut second).unwrap();
        }
        assert_eq!(first, second);
    }

    #[test]
    fn each_bad_record_is_refused_with_its_place() {
        assert_eq!(
            parse(&[("thermochemistry/a.toml", GROUP)])
                .unwrap()
                .values
                .len(),
            2
        );
        let cases = [
            (GROUP.replace("\"formation\"", "\"warmth\""), "unknown quantity \"warmth\""),
            (GROUP.replace("kJ/mol", "kcal/mol"), "unknown unit \"kcal/mol\""),
            (GROUP.replace("state = \"cr\"\n", ""), "needs `state`"),
            (GROUP.replace("\"cr\"", "\"plasma\""), "unknown state \"plasma\""),
            (GROUP.replace("state = \"cr\"", "stage = 1"), "a formation group needs `state`"),
            (
                GROUP.replace("state = \"cr\"", "state = \"cr\"\nstage = 1"),
                "`stage` belongs to ionisation groups only",
            ),
            (
                GROUP.replace("\"formation\"", "\"ionisation\"").replace("kJ/mol", "eV"),
                "`state` belongs to formation groups only",
            ),
            (
                GROUP
                    .replace("\"formation\"", "\"ionisation\"")
                    .replace("kJ/mol", "eV")
                    .replace("state = \"cr\"", "stage = 9"),
                "an ionisation group needs `stage` from 1 to 8",
            ),
            (GROUP.replace("\"src-a\"", "\"src-b\""), "unknown source key \"src-b\""),
            (GROUP.replace("-200]", "\"much\"]"), "line "),
            (GROUP.replace("-200]", "-1e6]"), "not a plausible formation"),
            (format!("{GROUP}{GROUP}"), "duplicate formation value"),
            (
                "[[heat_capacity]]\nsolute = \"AB\"\nsource = \"src-a\"\nprovenance = \"compiled\"\nreview = \"unreviewed\"\na = [1, 2]\nt_min_c = 0\nt_max_c = 50\nw_max = 0.3\n".to_string(),
                "needs 6 coefficients",
            ),
        ];
        for (text, want) in cases {
            let e = parse(&[("thermochemistry/a.toml", &text)])
                .unwrap_err()
                .to_string();
            assert!(e.contains("thermochemistry/a.toml"), "{e}");
            assert!(e.contains(want), "{e} (wanted {want})");
        }
    }
}
