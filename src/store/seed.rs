//! Seed loading: parses the TOML files of `seed-data/` (format in `seed-data/README.md`),
//! validates every record, converts reported values to the canonical forms (kelvin, mass
//! fraction of the anhydrous solute) and writes everything in one transaction.
//!
//! Validation stops at the first bad record and names the file, the record and the reason;
//! because parsing finishes before the transaction starts, and the transaction rolls back on
//! drop, nothing partial is ever written.
//!
//! The liquid-range rule for a point of a solubility dataset in water, kept simple on
//! purpose:
//! - below −55 °C (218.15 K) a point is refused outright: no seed solution stays liquid there;
//! - where the solute has `[freezing]` data, a point is refused when it lies more than
//!   [`FREEZING_TOLERANCE_K`] below the eutectic, or below the tabulated freezing point of a
//!   solution of the same composition (the ice line), since such a solution would be frozen;
//! - above 100 °C (373.15 K) a point is refused unless the dataset's `note` mentions
//!   pressure (any word starting `pressur`, e.g. "measured in a pressurised cell"), since
//!   water boils at 100 °C under one atmosphere.
//!
//! The same range (with the same pressure exception in `note`) bounds the temperatures of
//! Henry's-law records; freezing points must lie between −55 °C and 0 °C.

use std::collections::{HashMap, HashSet};

use rusqlite::{Connection, params};
use serde::Deserialize;
use sha2::{Digest, Sha256};

use super::read::{Contents, FreezingRecord, Pair};
use super::{StoreError, now_utc, write};
use crate::model::{
    Dataset, FreezingData, GasConstant, GasLaw, Phase, Point, Provenance, Review, Solute,
    SoluteKind, Source, SourceKind,
};
use crate::science::formula::{parse_formula, water_molar_mass};
use crate::science::units::{CompositionUnit, TemperatureUnit};

/// Lowest temperature of a liquid point in seed data: −55 °C.
pub const LOWEST_LIQUID_K: f64 = 218.15;
/// Boiling point of water at one atmosphere: 100 °C.
pub const BOILING_K: f64 = 373.15;
/// Melting point of ice: 0 °C.
pub const ICE_K: f64 = 273.15;
/// How far below the ice line or eutectic a point may lie before it is refused. Sources
/// round and disagree by a few tenths of a kelvin; a whole kelvin is a clear fault.
pub const FREEZING_TOLERANCE_K: f64 = 1.0;

/// Composition units accepted in seed datasets (seed-data/README.md).
const SEED_UNITS: [CompositionUnit; 5] = [
    CompositionUnit::GramsPer100gWater,
    CompositionUnit::MassPercent,
    CompositionUnit::MassFraction,
    CompositionUnit::Molality,
    CompositionUnit::MoleFraction,
];

/// Conventions accepted for a `vant-hoff` Henry's-law record (seed-data/README.md).
pub const HENRY_CONVENTIONS: [&str; 5] = [
    "Hcp mol/(m3 Pa)",
    "Hcp mol/(L atm)",
    "KH atm",
    "KH bar",
    "Hcc",
];

/// Why a seed record was refused. Each variant's doc comment shows an input that triggers it.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SeedProblem {
    /// Not valid TOML, or a field missing, misspelt or of the wrong type, e.g.
    /// `kind = "salty"` or a solute file without `formula`.
    #[error("{message}")]
    Syntax { message: String },

    /// The seed has no `sources.toml`.
    #[error("the seed has no sources.toml")]
    MissingSources,

    /// A `.toml` file outside the layout, e.g. `notes/extra.toml`.
    #[error(
        "not a seed file: expected sources.toml, solutes/<id>.toml or thermochemistry/<name>.toml"
    )]
    UnexpectedFile,

    /// A dataset names a source that `sources.toml` lacks, e.g. `source = "crc-98"`.
    #[error("unknown source key \"{key}\" (not in sources.toml)")]
    UnknownSource { key: String },

    /// A unit satline does not know, e.g. `unit = "furlongs"` or `temperature_unit = "R"`.
    #[error("unknown unit \"{unit}\"; expected one of {expected}")]
    UnknownUnit { unit: String, expected: String },

    /// A per-volume unit in a dataset, e.g. `unit = "g/L"`: it needs a density.
    #[error(
        "unit \"{unit}\" is per volume of solution and needs a density; seed datasets use g/100g water, %w/w, w, mol/kg or x"
    )]
    VolumeUnit { unit: String },

    /// The same id twice, e.g. two `[[dataset]]` tables with `key = "crc-97"` in one file,
    /// two sources with one key, or a synonym that another solute uses as its name.
    #[error("duplicate {what} \"{id}\"")]
    Duplicate { what: String, id: String },

    /// A formula that does not parse, e.g. `formula = "KN(O3"`.
    #[error("malformed formula \"{formula}\": {reason}")]
    MalformedFormula { formula: String, reason: String },

    /// A temperature where the solution cannot be liquid, e.g. the point `[120, 40.0]` in °C
    /// with no note of pressure, or `[-60, 10.0]`.
    #[error("temperature {temperature} {unit} is outside the liquid range: {reason}")]
    TemperatureOutOfRange {
        temperature: f64,
        unit: String,
        reason: String,
    },

    /// A value that is not a number, e.g. `points = [[20, "high"]]`.
    #[error("{what} is not a number: found {found}")]
    NotNumeric { what: String, found: String },

    /// A point of the wrong shape, e.g. `points = [[20]]` or `points = [20, 31.6]`.
    #[error("expected {expected}; found {found}")]
    MalformedPoint { expected: String, found: String },

    /// A solute whose `id` differs from its file name, e.g. `id = "saltpetre"` in
    /// `solutes/potassium-nitrate.toml`.
    #[error("id \"{id}\" does not match the file name (expected \"{expected}\")")]
    IdMismatch { id: String, expected: String },

    /// Points out of order, e.g. `points = [[20, 31.6], [10, 20.9]]`.
    #[error("{what} must ascend: {current} follows {previous}")]
    NotAscending {
        what: String,
        previous: f64,
        current: f64,
    },

    /// A key or id that is not a slug, e.g. `id = "Potassium Nitrate"`.
    #[error("\"{id}\" is not a valid key: use lower-case letters, digits and '-'")]
    BadKey { id: String },

    /// A number that cannot be what it claims, e.g. a value of `-3.0`, `120` in `%w/w`, a
    /// Henry's-law record on a salt, or a salt without `ions`.
    #[error("{reason}")]
    BadValue { reason: String },
}

/// What a seed load wrote.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SeedSummary {
    pub sources: usize,
    pub solutes: usize,
    pub datasets: usize,
    pub points: usize,
    pub gas_constants: usize,
    pub freezing: usize,
    /// [`fingerprint`] of the seed files.
    pub fingerprint: String,
}

/// A SHA-256 over the seed files (each path and contents, length-prefixed, in path order),
/// as lower-case hex. Identifies the seed a database was built from.
pub fn fingerprint<P: AsRef<str>, C: AsRef<str>>(files: &[(P, C)]) -> String {
    let mut sorted: Vec<(&str, &str)> = files
        .iter()
        .map(|(p, c)| (p.as_ref(), c.as_ref()))
        .collect();
    sorted.sort();
    let mut hasher = Sha256::new();
    for (path, contents) in sorted {
        for part in [path, contents] {
            hasher.update((part.len() as u64).to_le_bytes());
            hasher.update(part.as_bytes());
        }
    }
    hex(&hasher.finalize())
}

pub(crate) fn hex(bytes: &[u8]) -> String {
    use std::fmt::Write as _;
    let mut out = String::with_capacity(bytes.len() * 2);
    for b in bytes {
        let _ = write!(out, "{b:02x}");
    }
    out
}

/// Reads a seed directory from disk as (path relative to `dir`, contents) pairs, every
/// `*.toml` file at any depth, in path order.
pub fn read_seed_dir(dir: &std::path::Path) -> Result<Vec<(String, String)>, StoreError> {
    fn walk(
        root: &std::path::Path,
        dir: &std::path::Path,
        out: &mut Vec<(String, String)>,
    ) -> Result<(), StoreError> {
        let io = |source| StoreError::Io {
            path: dir.to_path_buf(),
            source,
        };
        let mut entries: Vec<_> = std::fs::read_dir(dir)
            .map_err(io)?
            .collect::<Result<_, _>>()
            .map_err(io)?;
        entries.sort_by_key(|e| e.path());
        for entry in entries {
            let path = entry.path();
            if path.is_dir() {
                walk(root, &path, out)?;
            } else if path.extension().and_then(|e| e.to_str()) == Some("toml") {
                let text = std::fs::read_to_string(&path).map_err(|source| StoreError::Io {
                    path: path.clone(),
                    source,
                })?;
                let rel = path
                    .strip_prefix(root)
                    .unwrap_or(&path)
                    .to_string_lossy()
                    .replace('\\', "/");
                out.push((rel, text));
            }
        }
        Ok(())
    }
    let mut out = Vec::new();
    walk(dir, dir, &mut out)?;
    Ok(out)
}

// ---------------------------------------------------------------------------------------
// The TOML shapes, as written in seed-data/README.md. Unknown fields are refused so a
// misspelt field is reported rather than silently dropped.

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SourcesFile {
    #[serde(default)]
    source: Vec<RawSource>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSource {
    key: String,
    kind: SourceKind,
    title: String,
    authors: String,
    publisher: Option<String>,
    edition: Option<String>,
    year: Option<i32>,
    locator: Option<String>,
    doi: Option<String>,
    isbn: Option<String>,
    url: Option<String>,
    note: Option<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSolute {
    id: String,
    name: String,
    formula: String,
    kind: SoluteKind,
    #[serde(default)]
    synonyms: Vec<String>,
    #[serde(default)]
    tags: Vec<String>,
    cation: Option<String>,
    anion: Option<String>,
    ions: Option<u32>,
    hazard: Option<String>,
    #[serde(default)]
    dataset: Vec<RawDataset>,
    #[serde(default)]
    henry: Vec<RawHenry>,
    freezing: Option<RawFreezing>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawDataset {
    key: String,
    source: String,
    phase: String,
    phase_name: String,
    unit: String,
    temperature_unit: String,
    provenance: Provenance,
    review: Review,
    note: Option<String>,
    points: Vec<toml::Value>,
    stable_range: Option<toml::Value>,
    /// Written by `satline export` for a retired dataset; absent means not retired.
    #[serde(default)]
    retired: bool,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawHenry {
    key: String,
    source: String,
    provenance: Provenance,
    review: Review,
    form: String,
    note: Option<String>,
    convention: Option<String>,
    value: Option<f64>,
    reference_temperature_k: Option<f64>,
    temperature_term_k: Option<f64>,
    a: Option<f64>,
    b: Option<f64>,
    c: Option<f64>,
    d: Option<f64>,
    scale_k: Option<f64>,
    reference_pressure_pa: Option<f64>,
    t_min_k: Option<f64>,
    t_max_k: Option<f64>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFreezing {
    key: String,
    source: String,
    provenance: Provenance,
    review: Review,
    unit: String,
    temperature_unit: String,
    points: Vec<toml::Value>,
    eutectic: Option<toml::Value>,
    note: Option<String>,
}

// ---------------------------------------------------------------------------------------

pub(crate) fn problem(file: &str, record: impl Into<String>, problem: SeedProblem) -> StoreError {
    StoreError::Seed {
        file: file.to_string(),
        record: record.into(),
        problem,
    }
}

pub(crate) fn syntax(file: &str, text: &str, e: &toml::de::Error) -> StoreError {
    let record = match e.span() {
        Some(span) => {
            let before = text.get(..span.start).unwrap_or(text);
            let line = before.matches('\n').count() + 1;
            let column = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
            format!("line {line}, column {column}")
        }
        None => "whole file".to_string(),
    };
    problem(
        file,
        record,
        SeedProblem::Syntax {
            message: e.message().to_string(),
        },
    )
}

fn is_slug(s: &str) -> bool {
    !s.is_empty()
        && s.bytes()
            .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'-')
}

fn check_slug(file: &str, record: &str, id: &str) -> Result<(), StoreError> {
    if is_slug(id) {
        Ok(())
    } else {
        Err(problem(
            file,
            record,
            SeedProblem::BadKey { id: id.to_string() },
        ))
    }
}

/// An empty optional text means "not given".
fn optional(s: Option<String>) -> Option<String> {
    s.filter(|s| !s.trim().is_empty())
}

fn notes_pressure(note: Option<&str>) -> bool {
    note.is_some_and(|n| n.to_lowercase().contains("pressur"))
}

/// Converts a reported composition to the mass fraction of the anhydrous solute.
///
/// With M the anhydrous molar mass (g/mol) and M_w = 18.015 g/mol for water:
/// `g/100g water` r → w = r / (100 + r); `%w/w` p → w = p / 100; `w` as is;
/// `mol/kg` b → w = b·M / (1000 + b·M); `x` → w = x·M / (x·M + (1 − x)·M_w).
/// These follow from the definitions of the units (common practice).
/// Returns `None` for units that need more than M (per-volume units).
pub fn to_mass_fraction(unit: CompositionUnit, value: f64, molar_mass: f64) -> Option<f64> {
    match unit {
        CompositionUnit::GramsPer100gWater => Some(value / (100.0 + value)),
        CompositionUnit::MassPercent => Some(value / 100.0),
        CompositionUnit::MassFraction => Some(value),
        CompositionUnit::Molality => Some(value * molar_mass / (1000.0 + value * molar_mass)),
        CompositionUnit::MoleFraction => {
            let solute = value * molar_mass;
            Some(solute / (solute + (1.0 - value) * water_molar_mass()))
        }
        _ => None,
    }
}

fn composition_unit(file: &str, record: &str, unit: &str) -> Result<CompositionUnit, StoreError> {
    match CompositionUnit::from_symbol(unit) {
        Some(u) if u.needs_density() => Err(problem(
            file,
            record,
            SeedProblem::VolumeUnit {
                unit: unit.to_string(),
            },
        )),
        Some(u) if SEED_UNITS.contains(&u) => Ok(u),
        _ => Err(problem(
            file,
            record,
            SeedProblem::UnknownUnit {
                unit: unit.to_string(),
                expected: SEED_UNITS
                    .iter()
                    .map(|u| u.symbol())
                    .collect::<Vec<_>>()
                    .join(", "),
            },
        )),
    }
}

fn temperature_unit(file: &str, record: &str, unit: &str) -> Result<TemperatureUnit, StoreError> {
    TemperatureUnit::from_symbol(unit).ok_or_else(|| {
        problem(
            file,
            record,
            SeedProblem::UnknownUnit {
                unit: unit.to_string(),
                expected: "C, K, F".to_string(),
            },
        )
    })
}

fn number(file: &str, record: &str, what: &str, v: &toml::Value) -> Result<f64, StoreError> {
    let n = match v {
        toml::Value::Integer(i) => *i as f64,
        toml::Value::Float(f) => *f,
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::NotNumeric {
                    what: what.to_string(),
                    found: other.to_string(),
                },
            ));
        }
    };
    if n.is_finite() {
        Ok(n)
    } else {
        Err(problem(
            file,
            record,
            SeedProblem::NotNumeric {
                what: what.to_string(),
                found: n.to_string(),
            },
        ))
    }
}

/// Splits a `[a, b]` or `[a, b, c]` array into numbers.
fn tuple(
    file: &str,
    record: &str,
    names: &[&str],
    optional_last: bool,
    v: &toml::Value,
) -> Result<Vec<f64>, StoreError> {
    let expected = if optional_last {
        format!(
            "[{}] or [{}]",
            names[..names.len() - 1].join(", "),
            names.join(", ")
        )
    } else {
        format!("[{}]", names.join(", "))
    };
    let items = match v {
        toml::Value::Array(items)
            if items.len() == names.len() || (optional_last && items.len() + 1 == names.len()) =>
        {
            items
        }
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::MalformedPoint {
                    expected,
                    found: other.to_string(),
                },
            ));
        }
    };
    items
        .iter()
        .zip(names)
        .map(|(item, name)| number(file, record, name, item))
        .collect()
}

fn out_of_range(
    file: &str,
    record: &str,
    temperature: f64,
    unit: TemperatureUnit,
    reason: String,
) -> StoreError {
    problem(
        file,
        record,
        SeedProblem::TemperatureOutOfRange {
            temperature,
            unit: unit.symbol().to_string(),
            reason,
        },
    )
}

/// The general liquid-range rule: −55 °C to 100 °C, or above 100 °C with a note of pressure.
fn check_liquid(
    file: &str,
    record: &str,
    reported: f64,
    unit: TemperatureUnit,
    kelvin: f64,
    pressurised: bool,
) -> Result<(), StoreError> {
    if kelvin < LOWEST_LIQUID_K {
        return Err(out_of_range(
            file,
            record,
            reported,
            unit,
            "seed data stops at -55 C (218.15 K)".to_string(),
        ));
    }
    if kelvin > BOILING_K && !pressurised {
        return Err(out_of_range(
            file,
            record,
            reported,
            unit,
            "water boils at 100 C under one atmosphere; if the source worked under pressure, say so in the note".to_string(),
        ));
    }
    Ok(())
}

fn check_mass_fraction(
    file: &str,
    record: &str,
    value: f64,
    unit: CompositionUnit,
    w: f64,
) -> Result<(), StoreError> {
    if value < 0.0 || !(0.0..1.0).contains(&w) {
        return Err(problem(
            file,
            record,
            SeedProblem::BadValue {
                reason: format!(
                    "{value} {} is not a possible composition of a solution",
                    unit.symbol()
                ),
            },
        ));
    }
    Ok(())
}

/// Linear interpolation of the ice line at mass fraction `w`; `None` outside the table.
fn ice_line_at(points: &[(f64, f64)], w: f64) -> Option<f64> {
    points.windows(2).find_map(|pair| {
        let ((w0, t0), (w1, t1)) = (pair[0], pair[1]);
        (w0 <= w && w <= w1 && w1 > w0).then(|| t0 + (t1 - t0) * (w - w0) / (w1 - w0))
    })
}

/// Everything one solute file holds, validated.
struct SoluteParts {
    file: String,
    solute: Solute,
    datasets: Vec<Dataset>,
    gas_constants: Vec<GasConstant>,
    freezing: Option<FreezingRecord>,
}

fn parse_sources(file: &str, text: &str) -> Result<Vec<Source>, StoreError> {
    let raw: SourcesFile = toml::from_str(text).map_err(|e| syntax(file, text, &e))?;
    let mut seen = HashSet::new();
    let mut out = Vec::with_capacity(raw.source.len());
    for s in raw.source {
        let record = format!("source \"{}\"", s.key);
        check_slug(file, &record, &s.key)?;
        if !seen.insert(s.key.clone()) {
            return Err(problem(
                file,
                &record,
                SeedProblem::Duplicate {
                    what: "source key".to_string(),
                    id: s.key,
                },
            ));
        }
        out.push(Source {
            key: s.key,
            kind: s.kind,
            title: s.title,
            authors: s.authors,
            publisher: optional(s.publisher),
            edition: optional(s.edition),
            year: s.year,
            locator: optional(s.locator),
            doi: optional(s.doi),
            isbn: optional(s.isbn),
            url: optional(s.url),
            note: optional(s.note),
        });
    }
    Ok(out)
}

fn parse_solute(
    file: &str,
    stem: &str,
    text: &str,
    sources: &HashSet<&str>,
) -> Result<SoluteParts, StoreError> {
    let raw: RawSolute = toml::from_str(text).map_err(|e| syntax(file, text, &e))?;
    let record = format!("solute \"{}\"", raw.id);
    if raw.id != stem {
        return Err(problem(
            file,
            &record,
            SeedProblem::IdMismatch {
                id: raw.id,
                expected: stem.to_string(),
            },
        ));
    }
    check_slug(file, &record, &raw.id)?;
    let formula = parse_formula(&raw.formula).map_err(|e| {
        problem(
            file,
            &record,
            SeedProblem::MalformedFormula {
                formula: raw.formula.clone(),
                reason: e.to_string(),
            },
        )
    })?;
    if formula.hydrate_water() > 0.0 {
        return Err(problem(
            file,
            &record,
            SeedProblem::BadValue {
                reason: format!(
                    "formula \"{}\" includes water of crystallisation; the solute's formula is the anhydrous one, the hydrate goes in a dataset's phase",
                    raw.formula
                ),
            },
        ));
    }
    let molar_mass = formula.molar_mass();
    let ions = match (raw.ions, raw.kind) {
        (Some(0), _) => {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "ions must be at least 1".to_string(),
                },
            ));
        }
        (Some(n), _) => n,
        (None, SoluteKind::Salt) => {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "a salt needs `ions` (ions per formula unit)".to_string(),
                },
            ));
        }
        (None, _) => 1,
    };
    let check_source = |record: &str, key: &str| {
        if sources.contains(key) {
            Ok(())
        } else {
            Err(problem(
                file,
                record,
                SeedProblem::UnknownSource {
                    key: key.to_string(),
                },
            ))
        }
    };

    // Freezing data first: the datasets' points are checked against it.
    let freezing = match raw.freezing {
        None => None,
        Some(f) => Some(parse_freezing(file, &raw.id, molar_mass, f, &check_source)?),
    };

    let mut keys = HashSet::new();
    let mut datasets = Vec::with_capacity(raw.dataset.len());
    for d in raw.dataset {
        let record = format!("dataset \"{}\"", d.key);
        check_slug(file, &record, &d.key)?;
        if !keys.insert(d.key.clone()) {
            return Err(problem(
                file,
                &record,
                SeedProblem::Duplicate {
                    what: "dataset key".to_string(),
                    id: d.key,
                },
            ));
        }
        check_source(&record, &d.source)?;
        let unit = composition_unit(file, &record, &d.unit)?;
        let t_unit = temperature_unit(file, &record, &d.temperature_unit)?;
        let phase_formula = parse_formula(&d.phase).map_err(|e| {
            problem(
                file,
                &record,
                SeedProblem::MalformedFormula {
                    formula: d.phase.clone(),
                    reason: e.to_string(),
                },
            )
        })?;
        let note = optional(d.note);
        let pressurised = notes_pressure(note.as_deref());
        if d.points.is_empty() {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "a dataset needs at least one point".to_string(),
                },
            ));
        }
        let stable_range = match &d.stable_range {
            None => None,
            Some(v) => {
                let record = format!("dataset \"{}\", stable_range", d.key);
                let nums = tuple(file, &record, &["t_low", "t_high"], false, v)?;
                if nums[1] <= nums[0] {
                    return Err(problem(
                        file,
                        &record,
                        SeedProblem::NotAscending {
                            what: "the ends of stable_range".to_string(),
                            previous: nums[0],
                            current: nums[1],
                        },
                    ));
                }
                for t in &nums {
                    check_liquid(file, &record, *t, t_unit, t_unit.to_kelvin(*t), pressurised)?;
                }
                Some((nums[0], nums[1]))
            }
        };
        let mut points = Vec::with_capacity(d.points.len());
        for (i, v) in d.points.iter().enumerate() {
            let record = format!("dataset \"{}\", point {}", d.key, i + 1);
            let nums = tuple(
                file,
                &record,
                &["temperature", "value", "uncertainty"],
                true,
                v,
            )?;
            let (t, value) = (nums[0], nums[1]);
            let uncertainty = nums.get(2).copied();
            let kelvin = t_unit.to_kelvin(t);
            if let Some(prev) = points.last().map(|p: &Point| p.temperature_reported)
                && t <= prev
            {
                return Err(problem(
                    file,
                    &record,
                    SeedProblem::NotAscending {
                        what: "temperatures".to_string(),
                        previous: prev,
                        current: t,
                    },
                ));
            }
            check_liquid(file, &record, t, t_unit, kelvin, pressurised)?;
            if let Some((low, high)) = stable_range
                && !(low <= t && t <= high)
            {
                return Err(out_of_range(
                    file,
                    &record,
                    t,
                    t_unit,
                    format!("outside the dataset's stable_range [{low}, {high}]"),
                ));
            }
            let w = to_mass_fraction(unit, value, molar_mass).unwrap_or(f64::NAN);
            check_mass_fraction(file, &record, value, unit, w)?;
            if uncertainty.is_some_and(|u| u < 0.0) {
                return Err(problem(
                    file,
                    &record,
                    SeedProblem::BadValue {
                        reason: "an uncertainty cannot be negative".to_string(),
                    },
                ));
            }
            if let Some(f) = &freezing {
                check_frozen(file, &record, t, t_unit, kelvin, w, &f.data)?;
            }
            points.push(Point {
                temperature_reported: t,
                temperature_k: kelvin,
                value_reported: value,
                mass_fraction: w,
                uncertainty,
            });
        }
        datasets.push(Dataset {
            key: format!("{}/{}", raw.id, d.key),
            solute: raw.id.clone(),
            solvent: "water".to_string(),
            phase: Phase {
                water: phase_formula.hydrate_water(),
                formula: d.phase,
                name: d.phase_name,
            },
            source: d.source,
            unit: unit.symbol().to_string(),
            temperature_unit: t_unit.symbol().to_string(),
            provenance: d.provenance,
            review: d.review,
            retired: d.retired,
            note,
            points,
            stable_range,
            stable_range_k: stable_range.map(|(l, h)| (t_unit.to_kelvin(l), t_unit.to_kelvin(h))),
        });
    }

    if !raw.henry.is_empty() && raw.kind != SoluteKind::Gas {
        return Err(problem(
            file,
            format!("henry \"{}\"", raw.henry[0].key),
            SeedProblem::BadValue {
                reason: "Henry's-law records belong to gases (kind = \"gas\")".to_string(),
            },
        ));
    }
    let mut henry_keys = HashSet::new();
    let mut gas_constants = Vec::with_capacity(raw.henry.len());
    for h in raw.henry {
        let record = format!("henry \"{}\"", h.key);
        check_slug(file, &record, &h.key)?;
        if !henry_keys.insert(h.key.clone()) {
            return Err(problem(
                file,
                &record,
                SeedProblem::Duplicate {
                    what: "henry key".to_string(),
                    id: h.key,
                },
            ));
        }
        check_source(&record, &h.source)?;
        gas_constants.push(parse_henry(file, &record, &raw.id, h)?);
    }

    let solute = Solute {
        id: raw.id,
        name: raw.name,
        formula: raw.formula,
        kind: raw.kind,
        molar_mass,
        synonyms: raw.synonyms,
        tags: raw.tags,
        cation: optional(raw.cation),
        anion: optional(raw.anion),
        ions,
        hazard: optional(raw.hazard),
    };
    Ok(SoluteParts {
        file: file.to_string(),
        solute,
        datasets,
        gas_constants,
        freezing,
    })
}

fn check_frozen(
    file: &str,
    record: &str,
    t: f64,
    unit: TemperatureUnit,
    kelvin: f64,
    w: f64,
    freezing: &FreezingData,
) -> Result<(), StoreError> {
    if kelvin >= ICE_K {
        return Ok(());
    }
    if let Some((_, eutectic_k)) = freezing.eutectic
        && kelvin < eutectic_k - FREEZING_TOLERANCE_K
    {
        return Err(out_of_range(
            file,
            record,
            t,
            unit,
            format!(
                "below the eutectic ({:.2} C) the solution is frozen",
                eutectic_k - ICE_K
            ),
        ));
    }
    if let Some(ice_k) = ice_line_at(&freezing.points, w)
        && kelvin < ice_k - FREEZING_TOLERANCE_K
    {
        return Err(out_of_range(
            file,
            record,
            t,
            unit,
            format!(
                "a solution of this composition freezes at {:.2} C (freezing data)",
                ice_k - ICE_K
            ),
        ));
    }
    Ok(())
}

fn parse_freezing(
    file: &str,
    solute: &str,
    molar_mass: f64,
    f: RawFreezing,
    check_source: &dyn Fn(&str, &str) -> Result<(), StoreError>,
) -> Result<FreezingRecord, StoreError> {
    let record = format!("freezing \"{}\"", f.key);
    check_slug(file, &record, &f.key)?;
    check_source(&record, &f.source)?;
    let unit = composition_unit(file, &record, &f.unit)?;
    let t_unit = temperature_unit(file, &record, &f.temperature_unit)?;
    let convert = |record: &str, v: &toml::Value| -> Result<(Pair, Pair), StoreError> {
        let nums = tuple(file, record, &["composition", "temperature"], false, v)?;
        let (c, t) = (nums[0], nums[1]);
        let w = to_mass_fraction(unit, c, molar_mass).unwrap_or(f64::NAN);
        check_mass_fraction(file, record, c, unit, w)?;
        let kelvin = t_unit.to_kelvin(t);
        if kelvin < LOWEST_LIQUID_K {
            return Err(out_of_range(
                file,
                record,
                t,
                t_unit,
                "seed data stops at -55 C (218.15 K)".to_string(),
            ));
        }
        // A dissolved solute lowers the freezing point; a few hundredths of rounding are fine.
        if kelvin > ICE_K + 0.05 {
            return Err(out_of_range(
                file,
                record,
                t,
                t_unit,
                "an aqueous solution freezes at or below 0 C".to_string(),
            ));
        }
        Ok(((c, t), (w, kelvin)))
    };
    let mut reported = Vec::with_capacity(f.points.len());
    let mut canonical = Vec::with_capacity(f.points.len());
    for (i, v) in f.points.iter().enumerate() {
        let record = format!("freezing \"{}\", point {}", f.key, i + 1);
        let (rep, can) = convert(&record, v)?;
        if let Some(&(prev, _)) = reported.last()
            && rep.0 <= prev
        {
            return Err(problem(
                file,
                &record,
                SeedProblem::NotAscending {
                    what: "compositions".to_string(),
                    previous: prev,
                    current: rep.0,
                },
            ));
        }
        reported.push(rep);
        canonical.push(can);
    }
    let (eutectic_reported, eutectic) = match &f.eutectic {
        None => (None, None),
        Some(v) => {
            let (rep, can) = convert(&format!("freezing \"{}\", eutectic", f.key), v)?;
            (Some(rep), Some(can))
        }
    };
    Ok(FreezingRecord {
        data: FreezingData {
            key: format!("{solute}/{}", f.key),
            solute: solute.to_string(),
            source: f.source,
            points: canonical,
            eutectic,
            provenance: f.provenance,
            review: f.review,
        },
        unit: unit.symbol().to_string(),
        temperature_unit: t_unit.symbol().to_string(),
        points_reported: reported,
        eutectic_reported,
        note: optional(f.note),
    })
}

fn parse_henry(
    file: &str,
    record: &str,
    solute: &str,
    h: RawHenry,
) -> Result<GasConstant, StoreError> {
    let missing = |field: &str| {
        problem(
            file,
            record,
            SeedProblem::Syntax {
                message: format!("missing field `{field}` for form \"{}\"", h.form),
            },
        )
    };
    let note = optional(h.note.clone());
    let pressurised = notes_pressure(note.as_deref());
    let check_t = |t: f64| check_liquid(file, record, t, TemperatureUnit::Kelvin, t, pressurised);
    let positive = |what: &str, v: f64| {
        if v > 0.0 && v.is_finite() {
            Ok(v)
        } else {
            Err(problem(
                file,
                record,
                SeedProblem::BadValue {
                    reason: format!("{what} must be a positive number, found {v}"),
                },
            ))
        }
    };
    let law = match h.form.as_str() {
        "vant-hoff" => {
            let convention = h.convention.clone().ok_or_else(|| missing("convention"))?;
            if !HENRY_CONVENTIONS.contains(&convention.as_str()) {
                return Err(problem(
                    file,
                    record,
                    SeedProblem::UnknownUnit {
                        unit: convention,
                        expected: HENRY_CONVENTIONS.join(", "),
                    },
                ));
            }
            let value = positive("value", h.value.ok_or_else(|| missing("value"))?)?;
            let reference_temperature_k = h
                .reference_temperature_k
                .ok_or_else(|| missing("reference_temperature_k"))?;
            check_t(reference_temperature_k)?;
            GasLaw::VantHoff {
                convention,
                value,
                reference_temperature_k,
                temperature_term_k: h
                    .temperature_term_k
                    .ok_or_else(|| missing("temperature_term_k"))?,
            }
        }
        "mole-fraction-fit" | "molality-fit" => {
            let t_min_k = h.t_min_k.ok_or_else(|| missing("t_min_k"))?;
            let t_max_k = h.t_max_k.ok_or_else(|| missing("t_max_k"))?;
            check_t(t_min_k)?;
            check_t(t_max_k)?;
            if t_max_k <= t_min_k {
                return Err(problem(
                    file,
                    record,
                    SeedProblem::NotAscending {
                        what: "t_min_k and t_max_k".to_string(),
                        previous: t_min_k,
                        current: t_max_k,
                    },
                ));
            }
            let (a, b, c, d) = (
                h.a.ok_or_else(|| missing("a"))?,
                h.b.ok_or_else(|| missing("b"))?,
                h.c.ok_or_else(|| missing("c"))?,
                h.d.ok_or_else(|| missing("d"))?,
            );
            let scale_k = positive("scale_k", h.scale_k.ok_or_else(|| missing("scale_k"))?)?;
            let reference_pressure_pa = positive(
                "reference_pressure_pa",
                h.reference_pressure_pa
                    .ok_or_else(|| missing("reference_pressure_pa"))?,
            )?;
            if h.form == "molality-fit" {
                GasLaw::MolalityFit {
                    a,
                    b,
                    c,
                    d,
                    scale_k,
                    reference_pressure_pa,
                    t_min_k,
                    t_max_k,
                }
            } else {
                GasLaw::MoleFractionFit {
                    a,
                    b,
                    c,
                    d,
                    scale_k,
                    reference_pressure_pa,
                    t_min_k,
                    t_max_k,
                }
            }
        }
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::Syntax {
                    message: format!(
                        "unknown form \"{other}\"; expected vant-hoff, mole-fraction-fit or molality-fit"
                    ),
                },
            ));
        }
    };
    Ok(GasConstant {
        key: format!("{solute}/{}", h.key),
        solute: solute.to_string(),
        source: h.source,
        law,
        provenance: h.provenance,
        review: h.review,
        note,
    })
}

/// Parses and validates seed files into the records the store keeps, without touching any
/// database. `files` are (path relative to `seed-data/`, contents) pairs.
pub fn parse_seed<P: AsRef<str>, C: AsRef<str>>(files: &[(P, C)]) -> Result<Contents, StoreError> {
    parse_with_known_sources(files, &[])
}

/// As [`parse_seed`], for an import into a database that already holds sources: a dataset
/// may also cite one of `known_sources`, and `sources.toml` may be left out. The returned
/// contents hold only what the files hold.
pub fn parse_with_known_sources<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
    known_sources: &[&str],
) -> Result<Contents, StoreError> {
    let mut sources_file: Option<(&str, &str)> = None;
    let mut solute_files: Vec<(&str, &str, &str)> = Vec::new();
    let mut thermo_files: Vec<(&str, &str, &str)> = Vec::new();
    for (path, text) in files {
        let (path, text) = (path.as_ref(), text.as_ref());
        if path == "sources.toml" {
            if sources_file.is_some() {
                return Err(problem(
                    path,
                    "whole file",
                    SeedProblem::Duplicate {
                        what: "file".to_string(),
                        id: path.to_string(),
                    },
                ));
            }
            sources_file = Some((path, text));
        } else if let Some(stem) = path
            .strip_prefix("solutes/")
            .and_then(|rest| rest.strip_suffix(".toml"))
            .filter(|stem| !stem.contains('/'))
        {
            solute_files.push((path, stem, text));
        } else if let Some(stem) = path
            .strip_prefix(super::thermo_seed::FOLDER)
            .and_then(|rest| rest.strip_suffix(".toml"))
            .filter(|stem| !stem.contains('/'))
        {
            thermo_files.push((path, stem, text));
        } else {
            return Err(problem(path, "whole file", SeedProblem::UnexpectedFile));
        }
    }
    let sources = match sources_file {
        Some((path, text)) => parse_sources(path, text)?,
        // No files at all is an empty reference (a fresh checkout before any data).
        None if solute_files.is_empty() || !known_sources.is_empty() => Vec::new(),
        None => {
            return Err(problem(
                "sources.toml",
                "whole file",
                SeedProblem::MissingSources,
            ));
        }
    };
    let source_keys: HashSet<&str> = sources
        .iter()
        .map(|s| s.key.as_str())
        .chain(known_sources.iter().copied())
        .collect();

    solute_files.sort();
    let mut parts = Vec::with_capacity(solute_files.len());
    // Every id, name and synonym (folded) must point at one solute, or lookup is ambiguous.
    let mut names: HashMap<String, String> = HashMap::new();
    for (path, stem, text) in solute_files {
        let part = parse_solute(path, stem, text, &source_keys)?;
        let s = &part.solute;
        let mut own = HashSet::new();
        for name in std::iter::once(&s.id)
            .chain(std::iter::once(&s.name))
            .chain(&s.synonyms)
        {
            let folded = name.trim().to_lowercase();
            if !own.insert(folded.clone()) {
                continue;
            }
            if let Some(other) = names.insert(folded, s.id.clone()) {
                let what = if other == s.id {
                    "solute id".to_string()
                } else {
                    format!("name (also used by solute \"{other}\")")
                };
                return Err(problem(
                    &part.file,
                    format!("solute \"{}\"", s.id),
                    SeedProblem::Duplicate {
                        what,
                        id: name.clone(),
                    },
                ));
            }
        }
        parts.push(part);
    }

    let mut thermochemistry = crate::model::thermo::Thermochemistry::default();
    thermo_files.sort();
    for (path, stem, text) in thermo_files {
        super::thermo_seed::parse_file(path, stem, text, &source_keys, &mut thermochemistry)?;
    }
    let mut contents = Contents {
        sources,
        thermochemistry,
        ..Contents::default()
    };
    for part in parts {
        contents.solutes.push(part.solute);
        contents.datasets.extend(part.datasets);
        contents.gas_constants.extend(part.gas_constants);
        contents.freezing.extend(part.freezing);
    }
    contents.sort();
    Ok(contents)
}

/// Writes validated contents into an empty database in one transaction, with the seed's
/// fingerprint in the metadata and one audit row.
pub(crate) fn write(
    conn: &mut Connection,
    contents: &Contents,
    fingerprint: &str,
    files: usize,
) -> Result<SeedSummary, StoreError> {
    // Dropping `tx` without commit (on any `?` below) rolls everything back.
    let tx = conn.transaction()?;
    {
        for s in &contents.sources {
            write::upsert_source(&tx, s)?;
        }
        for s in &contents.solutes {
            write::upsert_solute(&tx, s)?;
        }
        for d in &contents.datasets {
            write::replace_dataset(&tx, d, &mut || {})?;
        }
        for g in &contents.gas_constants {
            write::replace_gas_constant(&tx, g)?;
        }
        for f in &contents.freezing {
            write::replace_freezing(&tx, f)?;
        }
        super::thermo_rows::write(&tx, &contents.thermochemistry)?;

        let mut set_meta = tx.prepare_cached(
            "INSERT INTO metadata (key, value) VALUES (?1, ?2)
             ON CONFLICT (key) DO UPDATE SET value = excluded.value",
        )?;
        set_meta.execute(params!["seed_fingerprint", fingerprint])?;
        set_meta.execute(params![
            "built_by",
            concat!("satline ", env!("CARGO_PKG_VERSION"))
        ])?;
        set_meta.execute(params!["built_at", now_utc()])?;

        let after = serde_json::json!({
            "files": files,
            "fingerprint": fingerprint,
            "sources": contents.sources.len(),
            "solutes": contents.solutes.len(),
            "datasets": contents.datasets.len(),
        });
        tx.execute(
            "INSERT INTO audit (time, actor, action, entity, before, after) VALUES (?1, ?2, ?3, ?4, NULL, ?5)",
            params![now_utc(), "seed", "load-seed", "seed", after.to_string()],
        )?;
    }
    tx.commit()?;
    Ok(SeedSummary {
        sources: contents.sources.len(),
        solutes: contents.solutes.len(),
        datasets: contents.datasets.len(),
        points: contents.datasets.iter().map(|d| d.points.len()).sum(),
        gas_constants: contents.gas_constants.len(),
        freezing: contents.freezing.len(),
        fingerprint: fingerprint.to_string(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    // Invented demo data for unit tests: not reference values.
    const SOURCES: &str = r#"
[[source]]
key = "demo"
kind = "other"
title = "Invented demo data"
authors = "nobody"
"#;

    fn solute(points: &str) -> String {
        format!(
            r#"
id = "demo-salt"
name = "demo salt"
formula = "KCl"
kind = "salt"
ions = 2
[[dataset]]
key = "d"
source = "demo"
phase = "KCl"
phase_name = "anhydrous"
unit = "g/100g water"
temperature_unit = "C"
provenance = "derived"
review = "unreviewed"
points = {points}
"#
        )
    }

    fn parse(points: &str) -> Result<Contents, StoreError> {
        let text = solute(points);
        parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ])
    }

    #[test]
    fn conversions_follow_the_unit_definitions() {
        let m = 100.0;
        assert_eq!(
            to_mass_fraction(CompositionUnit::GramsPer100gWater, 25.0, m),
            Some(0.2)
        );
        assert_eq!(
            to_mass_fraction(CompositionUnit::MassPercent, 20.0, m),
            Some(0.2)
        );
        assert_eq!(
            to_mass_fraction(CompositionUnit::MassFraction, 0.2, m),
            Some(0.2)
        );
        // 2.5 mol/kg of M = 100 g/mol: 250 g in 1000 g water -> 250/1250.
        assert_eq!(
            to_mass_fraction(CompositionUnit::Molality, 2.5, m),
            Some(0.2)
        );
        // x = 0.5 with M = M_w: equal masses.
        let w = to_mass_fraction(CompositionUnit::MoleFraction, 0.5, water_molar_mass()).unwrap();
        assert!((w - 0.5).abs() < 1e-12);
        assert_eq!(
            to_mass_fraction(CompositionUnit::GramsPerLitre, 1.0, m),
            None
        );
    }

    #[test]
    fn a_good_file_parses() {
        let c = parse("[[0, 10.0], [20, 25]]").unwrap();
        assert_eq!(c.datasets[0].points[1].mass_fraction, 0.2);
        assert_eq!(c.datasets[0].points[1].temperature_k, 293.15);
    }

    #[test]
    fn a_point_above_boiling_needs_a_note_of_pressure() {
        let err = parse("[[20, 10.0], [120, 25]]").unwrap_err();
        assert!(err.to_string().contains("point 2"), "{err}");
        assert!(err.to_string().contains("water boils"), "{err}");
    }

    #[test]
    fn a_point_of_the_wrong_shape_is_refused() {
        let err = parse("[[20]]").unwrap_err();
        assert!(
            err.to_string().contains("expected [temperature, value]"),
            "{err}"
        );
    }

    fn reason(result: Result<Contents, StoreError>) -> String {
        result.unwrap_err().to_string()
    }

    #[test]
    fn solute_files_need_a_sources_file() {
        let text = solute("[[0, 1.0]]");
        let message = reason(parse_seed(&[("solutes/demo-salt.toml", text.as_str())]));
        assert_eq!(
            message,
            "seed file sources.toml, whole file: the seed has no sources.toml"
        );
        // No files at all is an empty reference.
        assert_eq!(parse_seed::<&str, &str>(&[]).unwrap(), Contents::default());
    }

    #[test]
    fn a_file_outside_the_layout_is_refused() {
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("notes/extra.toml", ""),
        ]));
        assert!(message.starts_with("seed file notes/extra.toml, whole file: not a seed file"));
    }

    #[test]
    fn a_key_that_is_not_a_slug_is_refused() {
        let text = solute("[[0, 1.0]]").replace("key = \"d\"", "key = \"Crc 97\"");
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ]));
        assert!(
            message.contains("dataset \"Crc 97\": \"Crc 97\" is not a valid key"),
            "{message}"
        );
    }

    #[test]
    fn impossible_values_are_refused() {
        let message = reason(parse("[[0, -3.0]]"));
        assert!(
            message.contains("point 1: -3 g/100g water is not a possible composition"),
            "{message}"
        );
        let text = solute("[[0, 120]]").replace("g/100g water", "%w/w");
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ]));
        assert!(
            message.contains("120 %w/w is not a possible composition"),
            "{message}"
        );
        let text = solute("[[0, 1.0]]").replace("ions = 2\n", "");
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ]));
        assert!(message.contains("a salt needs `ions`"), "{message}");
        let text = format!(
            "{}\n[[henry]]\nkey = \"h\"\nsource = \"demo\"\nprovenance = \"derived\"\nreview = \"unreviewed\"\nform = \"vant-hoff\"\nconvention = \"Hcc\"\nvalue = 1.0\nreference_temperature_k = 298.15\ntemperature_term_k = 0\n",
            solute("[[0, 1.0]]")
        );
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ]));
        assert!(
            message.contains("henry \"h\": Henry's-law records belong to gases"),
            "{message}"
        );
    }

    #[test]
    fn a_hydrate_formula_for_the_solute_is_refused() {
        let text = solute("[[0, 1.0]]").replace("formula = \"KCl\"", "formula = \"KCl·2H2O\"");
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", text.as_str()),
        ]));
        assert!(
            message.contains("includes water of crystallisation"),
            "{message}"
        );
    }

    #[test]
    fn ice_line_interpolates_inside_the_table_only() {
        let pts = [(0.0, 273.15), (0.1, 263.15)];
        assert_eq!(ice_line_at(&pts, 0.05), Some(268.15));
        assert_eq!(ice_line_at(&pts, 0.2), None);
    }

    #[test]
    fn fingerprint_ignores_file_order_but_not_contents() {
        let a = fingerprint(&[("a", "1"), ("b", "2")]);
        assert_eq!(a, fingerprint(&[("b", "2"), ("a", "1")]));
        assert_ne!(a, fingerprint(&[("a", "1"), ("b", "3")]));
        assert_eq!(a.len(), 64);
    }
}
