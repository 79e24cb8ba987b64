//! Imports into a file database: TOML files in the seed format and CSV files of points,
//! validated as the seed is (through [`super::seed`]) and then some, planned against what
//! the database holds, and written in one transaction with an audit row per change.
//!
//! An import is two steps. [`plan`] reads the files and the database and says what would
//! change (added, changed, retired and unchanged records), with findings worth a look
//! (outliers, conflicts with another source, duplicates); it writes nothing, which is all
//! `--dry-run` does. [`apply`] writes a plan in a single transaction: all or nothing.
//!
//! Refused (nothing is written): everything the seed refuses (unknown source, unit,
//! malformed formula, a temperature outside the liquid range, points out of order, ...), a
//! value outside the sane range of its unit ([`sane_range`]), the same point twice, a CSV
//! row without a source, a name another stored solute already uses. Reported (the import
//! goes on): outliers, conflicts beyond the tolerance, a dataset that repeats a stored one.
//!
//! Imported datasets are unreviewed (and not retired) unless the import keeps the states
//! written in the files ([`ImportOptions::keep_state`], for restoring an export).
//!
//! CSV columns (header row required, any order; names are case-sensitive):
//! `solute` (the solute's id, a slug), `formula` (anhydrous), `phase` (formula of the solid),
//! `temperature`, `temperature_unit` (C, K, F), `value`, `unit` (g/100g water, %w/w, w,
//! mol/kg, x), `source` (a source key), and optionally `uncertainty`, `name`, `kind`
//! (salt, molecular, gas; default molecular), `ions` (needed for a salt), `phase_name`
//! (default `anhydrous`, or `hydrate` for a phase with water), `dataset` (the dataset's key
//! within the solute; default the source key), `provenance` (default `compiled`), `review`,
//! `retired` (both honoured only with `keep_state`) and `note`. Each row is one point; the
//! rows of one solute, phase and source make one dataset, sorted by temperature.

use std::collections::{BTreeMap, HashMap, HashSet};
use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::findings::{self, Finding};
use super::read::{Contents, FreezingRecord};
use super::{Store, StoreError, audit, lock, seed, write};
use crate::model::thermo::{HeatCapacityFit, ThermoValue};
use crate::model::{Check, Dataset, DensityCoefficients, GasConstant, Review, Solute, Source};
use crate::science::units::{CompositionUnit, TemperatureUnit};

/// One file to import, read into memory: its path as given (for messages) and its text.
#[derive(Debug, Clone)]
pub struct ImportFile {
    pub path: String,
    pub text: String,
}

impl ImportFile {
    /// Reads a file from disk.
    pub fn read(path: &Path) -> Result<ImportFile, StoreError> {
        let text = std::fs::read_to_string(path).map_err(|source| StoreError::Io {
            path: path.to_path_buf(),
            source,
        })?;
        Ok(ImportFile {
            path: path.display().to_string(),
            text,
        })
    }
}

/// How an import treats what it reads.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ImportOptions {
    /// A conflict with another source is reported beyond this fraction (0.05 for 5 %).
    pub tolerance: f64,
    /// Keep the `review` and `retired` states written in the files instead of marking every
    /// imported record unreviewed: for restoring an export of this reference.
    pub keep_state: bool,
}

impl Default for ImportOptions {
    fn default() -> Self {
        ImportOptions {
            tolerance: findings::CONFLICT_TOLERANCE,
            keep_state: false,
        }
    }
}

/// What an import does to one record.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum ChangeKind {
    Added,
    Changed,
    /// The record is stored and the file marks it retired (only with `keep_state`).
    Retired,
    Unchanged,
}

impl ChangeKind {
    fn verb(self) -> &'static str {
        match self {
            ChangeKind::Added => "add",
            ChangeKind::Changed => "change",
            ChangeKind::Retired => "retire",
            ChangeKind::Unchanged => "keep",
        }
    }
}

#[derive(Debug, Clone)]
pub(super) enum Record {
    Source(Source),
    Solute(Solute),
    Dataset(Dataset),
    Gas(GasConstant),
    Freezing(FreezingRecord),
    Density(DensityCoefficients),
    Check(Check),
    Thermo(super::thermo_import::ThermoRecord),
}

/// One planned change.
#[derive(Debug, Clone)]
pub struct Change {
    pub kind: ChangeKind,
    /// `dataset:<key>`, `solute:<id>`, ... as in the audit history.
    pub entity: String,
    /// A few words on the record, e.g. `6 points, unreviewed`.
    pub summary: String,
    pub before: Option<serde_json::Value>,
    pub after: serde_json::Value,
    record: Record,
}

/// What an import would do, and what it found worth a look.
#[derive(Debug, Clone, Default)]
pub struct ImportPlan {
    pub changes: Vec<Change>,
    pub findings: Vec<Finding>,
    /// The newest audit row when the plan was read: every write adds one, so a different
    /// newest row when the plan is applied means another writer changed the state the
    /// plan's `before` values describe.
    audit_mark: i64,
}

impl ImportPlan {
    /// How many changes are of this kind.
    pub fn count(&self, kind: ChangeKind) -> usize {
        self.changes.iter().filter(|c| c.kind == kind).count()
    }

    /// Points that would be written (for the progress bar).
    pub fn points_to_write(&self) -> usize {
        self.changes
            .iter()
            .filter(|c| c.kind != ChangeKind::Unchanged)
            .map(|c| match &c.record {
                Record::Dataset(d) => d.points.len(),
                _ => 0,
            })
            .sum()
    }

    /// The plan as one JSON object, for programs (and the server):
    /// `{"changes": [{"kind": "added", "entity": "dataset:x/y", "summary": "..."}],
    ///   "findings": [{"kind": "conflict", "dataset": "x/y", "message": "..."}],
    ///   "added": 1, "changed": 0, "retired": 0, "unchanged": 0}`. Unchanged records are
    /// counted, not listed.
    pub fn to_json(&self) -> serde_json::Value {
        let changes: Vec<serde_json::Value> = self
            .changes
            .iter()
            .filter(|c| c.kind != ChangeKind::Unchanged)
            .map(
                |c| serde_json::json!({ "kind": c.kind, "entity": c.entity, "summary": c.summary }),
            )
            .collect();
        serde_json::json!({
            "changes": changes,
            "findings": self.findings,
            "added": self.count(ChangeKind::Added),
            "changed": self.count(ChangeKind::Changed),
            "retired": self.count(ChangeKind::Retired),
            "unchanged": self.count(ChangeKind::Unchanged),
        })
    }

    /// One line per change (unchanged records counted, not listed), then the findings and
    /// a summary line.
    pub fn write_report(&self, out: &mut dyn Write) -> std::io::Result<()> {
        for c in self
            .changes
            .iter()
            .filter(|c| c.kind != ChangeKind::Unchanged)
        {
            writeln!(out, "  {} {}: {}", c.kind.verb(), c.entity, c.summary)?;
        }
        for f in &self.findings {
            writeln!(out, "  {}: {}", f.kind, f.message)?;
        }
        writeln!(
            out,
            "{} added, {} changed, {} retired, {} unchanged",
            self.count(ChangeKind::Added),
            self.count(ChangeKind::Changed),
            self.count(ChangeKind::Retired),
            self.count(ChangeKind::Unchanged)
        )
    }
}

/// What [`apply`] wrote.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ImportSummary {
    pub added: usize,
    pub changed: usize,
    pub retired: usize,
    pub unchanged: usize,
    pub audit_rows: usize,
}

/// The sane range of a value in each seed unit, exclusive below: (low, high, inclusive
/// high). A solubility is a positive amount; these upper ends are far above any aqueous
/// solubility table (5000 g/100g water is 98 % solute; 100 mol/kg of a light salt is
/// similar), so a value beyond them is a typing or unit mistake, not a measurement
/// (common practice).
pub fn sane_range(unit: CompositionUnit) -> Option<(f64, f64, bool)> {
    match unit {
        CompositionUnit::GramsPer100gWater => Some((0.0, 5000.0, true)),
        CompositionUnit::MassPercent => Some((0.0, 100.0, false)),
        CompositionUnit::MassFraction | CompositionUnit::MoleFraction => Some((0.0, 1.0, false)),
        CompositionUnit::Molality => Some((0.0, 100.0, true)),
        _ => None,
    }
}

fn import_error(file: &str, record: impl Into<String>, problem: impl Into<String>) -> StoreError {
    StoreError::Import {
        file: file.to_string(),
        record: record.into(),
        problem: problem.into(),
    }
}

/// Where seed-style names of synthetic files came from, to put errors back in the user's
/// terms: the real file, and for CSV the line of each point.
#[derive(Default)]
struct Origins {
    files: HashMap<String, String>,
    lines: HashMap<(String, String), u64>,
    /// For a solute file made from CSV rows: the solute and its first line, to stand in for
    /// a position in the made-up TOML text.
    made_from_csv: HashMap<String, (String, u64)>,
    /// For a solute file made from CSV rows: the 1-based column of `value` in its CSV file.
    value_column: HashMap<String, usize>,
}

impl Origins {
    fn relabel(&self, e: StoreError) -> StoreError {
        match e {
            StoreError::Seed {
                file,
                record,
                problem,
            } => {
                let real = self.files.get(&file).cloned().unwrap_or(file.clone());
                let record = match (
                    self.lines.get(&(file.clone(), record.clone())),
                    self.made_from_csv.get(&file),
                ) {
                    (Some(line), _) => format!("line {line} ({record})"),
                    (None, Some((id, line))) if record.starts_with("line ") => {
                        format!("line {line} (solute \"{id}\")")
                    }
                    _ => record,
                };
                StoreError::Import {
                    file: real,
                    record,
                    problem: problem.to_string(),
                }
            }
            other => other,
        }
    }
}

/// Reads and validates `files` and compares them with what `store` holds. Writes nothing.
pub fn plan(
    store: &Store,
    files: &[ImportFile],
    options: &ImportOptions,
) -> Result<ImportPlan, StoreError> {
    let audit_mark = newest_audit_row(&store.conn)?;
    let existing = store.read_all()?;
    let mut origins = Origins::default();

    // TOML first: its sources.toml may hold the sources a CSV file cites.
    let mut toml_files: Vec<(String, String)> = Vec::new();
    let mut csv_files: Vec<&ImportFile> = Vec::new();
    for f in files {
        let path = Path::new(&f.path);
        let ext = path.extension().and_then(|e| e.to_str()).unwrap_or("");
        let stem = path.file_stem().and_then(|e| e.to_str()).unwrap_or("");
        match ext {
            "toml" => {
                let in_checks = path
                    .parent()
                    .and_then(|d| d.file_name())
                    .is_some_and(|d| d == super::corroboration::CHECK_DIR)
                    || super::corroboration::is_check_text(&f.text);
                let name = if stem == "sources" {
                    "sources.toml".to_string()
                } else if stem == "densities" {
                    super::density::FILE.to_string()
                } else if super::thermo_import::is_thermo_text(&f.text) {
                    format!("{}{stem}.toml", super::thermo_seed::FOLDER)
                } else if in_checks {
                    format!("{}/{stem}.toml", super::corroboration::CHECK_DIR)
                } else {
                    format!("solutes/{stem}.toml")
                };
                if origins.files.insert(name.clone(), f.path.clone()).is_some() {
                    return Err(import_error(
                        &f.path,
                        "whole file",
                        format!("a second file named {stem}.toml in one import"),
                    ));
                }
                toml_files.push((name, f.text.clone()));
            }
            "csv" => csv_files.push(f),
            _ => {
                return Err(import_error(
                    &f.path,
                    "whole file",
                    "not an import file: expected a .toml file in the seed format or a .csv file",
                ));
            }
        }
    }
    let db_keys: Vec<&str> = existing.sources.iter().map(|s| s.key.as_str()).collect();
    let mut incoming = if toml_files.is_empty() {
        Contents::default()
    } else {
        let db_solutes: Vec<&str> = existing.solutes.iter().map(|s| s.id.as_str()).collect();
        seed::parse_with_known(&toml_files, &db_keys, &db_solutes)
            .map_err(|e| origins.relabel(e))?
    };
    let mut known: HashSet<String> = db_keys.iter().map(|s| s.to_string()).collect();
    known.extend(incoming.sources.iter().map(|s| s.key.clone()));
    let mut solute_file: HashMap<String, String> = incoming
        .solutes
        .iter()
        .map(|s| {
            let file = origins
                .files
                .get(&format!("solutes/{}.toml", s.id))
                .cloned()
                .unwrap_or_default();
            (s.id.clone(), file)
        })
        .collect();
    for f in csv_files {
        let part = parse_csv(f, &existing, &known, options, &mut origins)?;
        for s in &part.solutes {
            if let Some(other) = solute_file.insert(s.id.clone(), f.path.clone()) {
                return Err(import_error(
                    &f.path,
                    format!("solute \"{}\"", s.id),
                    format!("the solute is also in {other}; import it from one file"),
                ));
            }
        }
        incoming.solutes.extend(part.solutes);
        incoming.datasets.extend(part.datasets);
        incoming.freezing.extend(part.freezing);
    }
    incoming.sort();
    check_names(&incoming, &existing, &solute_file)?;
    if !options.keep_state {
        for d in &mut incoming.datasets {
            d.review = Review::Unreviewed;
            d.retired = false;
        }
        for g in &mut incoming.gas_constants {
            g.review = Review::Unreviewed;
        }
        for f in &mut incoming.freezing {
            f.data.review = Review::Unreviewed;
        }
        for d in &mut incoming.densities {
            d.review = Review::Unreviewed;
        }
    }
    for d in &incoming.datasets {
        check_sane(d, &solute_file, &origins)?;
    }
    for c in &incoming.checks {
        if let Some(reason) = super::corroboration::unknown_subject(c, &[&incoming, &existing]) {
            return Err(import_error(
                "checks",
                format!("check \"{}\"", c.key),
                reason,
            ));
        }
    }
    let mut plan = compare(&incoming, &existing, options);
    plan.audit_mark = audit_mark;
    Ok(plan)
}

/// Every id, name and synonym must point at one solute across the import and the database.
fn check_names(
    incoming: &Contents,
    existing: &Contents,
    files: &HashMap<String, String>,
) -> Result<(), StoreError> {
    let replaced: HashSet<&str> = incoming.solutes.iter().map(|s| s.id.as_str()).collect();
    let mut names: HashMap<String, &str> = HashMap::new();
    for s in existing
        .solutes
        .iter()
        .filter(|s| !replaced.contains(s.id.as_str()))
    {
        for n in std::iter::once(&s.id)
            .chain(std::iter::once(&s.name))
            .chain(&s.synonyms)
        {
            names.insert(n.trim().to_lowercase(), s.id.as_str());
        }
    }
    for s in &incoming.solutes {
        for n in std::iter::once(&s.id)
            .chain(std::iter::once(&s.name))
            .chain(&s.synonyms)
        {
            if let Some(other) = names.get(&n.trim().to_lowercase()) {
                return Err(import_error(
                    files.get(&s.id).map_or("", String::as_str),
                    format!("solute \"{}\"", s.id),
                    format!("duplicate name \"{n}\": the stored solute \"{other}\" uses it"),
                ));
            }
        }
    }
    Ok(())
}

/// Every point's value within [`sane_range`] of its unit; a point from a CSV row is named by
/// its line and the `value` column.
fn check_sane(
    d: &Dataset,
    files: &HashMap<String, String>,
    origins: &Origins,
) -> Result<(), StoreError> {
    let Some(unit) = CompositionUnit::from_symbol(&d.unit) else {
        return Ok(());
    };
    let Some((low, high, inclusive)) = sane_range(unit) else {
        return Ok(());
    };
    for (i, p) in d.points.iter().enumerate() {
        let v = p.value_reported;
        let ok = v > low && if inclusive { v <= high } else { v < high };
        if !ok {
            let local = d.key.split_once('/').map_or(d.key.as_str(), |k| k.1);
            let record = format!("dataset \"{local}\", point {}", i + 1);
            let made = format!("solutes/{}.toml", d.solute);
            let record = match (
                origins.lines.get(&(made.clone(), record.clone())),
                origins.value_column.get(&made),
            ) {
                (Some(line), Some(column)) => {
                    format!("line {line}, column {column} (value; {record})")
                }
                _ => record,
            };
            return Err(import_error(
                files.get(&d.solute).map_or("", String::as_str),
                record,
                format!(
                    "{v} {} is outside the sane range for {} (above {low}, up to {high}{}); check the number and its unit",
                    d.unit,
                    d.unit,
                    if inclusive { "" } else { ", exclusive" }
                ),
            ));
        }
    }
    Ok(())
}

/// What writing dataset `d` does to the stored one: a retired mark or review state counts
/// only when the import keeps the states written in its files.
fn dataset_change(d: &Dataset, before: Option<&Dataset>, keep_state: bool) -> ChangeKind {
    match before {
        None => ChangeKind::Added,
        Some(b) if !same_data(d, b) => ChangeKind::Changed,
        Some(b) if !keep_state || (b.review == d.review && b.retired == d.retired) => {
            ChangeKind::Unchanged
        }
        Some(b) if d.retired && !b.retired => ChangeKind::Retired,
        Some(_) => ChangeKind::Changed,
    }
}

fn dataset_kept(d: &Dataset, before: Option<&Dataset>) -> ChangeKind {
    dataset_change(d, before, true)
}

fn dataset_fresh(d: &Dataset, before: Option<&Dataset>) -> ChangeKind {
    dataset_change(d, before, false)
}

/// Unchanged when equal, or with the same fitted coefficients from the same source over the
/// same range (review state and notes aside).
fn density_fresh(d: &DensityCoefficients, before: Option<&DensityCoefficients>) -> ChangeKind {
    kind_of(before.map(|b| {
        d == b
            || (d.c == b.c
                && d.source == b.source
                && d.t_min_c == b.t_min_c
                && d.t_max_c == b.t_max_c
                && d.w_max == b.w_max)
    }))
}

/// Equal apart from the review state and retired mark.
fn same_data(a: &Dataset, b: &Dataset) -> bool {
    let mut a = a.clone();
    a.review = b.review;
    a.retired = b.retired;
    &a == b
}

fn json<T: Serialize>(v: &T) -> serde_json::Value {
    serde_json::to_value(v).unwrap_or(serde_json::Value::Null)
}

/// Added (no stored record), unchanged or changed, from whether the stored record is the same.
fn kind_of(same: Option<bool>) -> ChangeKind {
    match same {
        None => ChangeKind::Added,
        Some(true) => ChangeKind::Unchanged,
        Some(false) => ChangeKind::Changed,
    }
}

/// One kind of record of an import: how a record is found among the stored ones, how it
/// is named in the plan and the audit history, and what the import does with it.
pub(super) struct RecordKind<T> {
    /// What the plan and the audit history call the record before its key, e.g. `dataset`
    /// for `dataset:<key>`.
    pub entity: &'static str,
    /// The stored identity: the record of the same key is the one replaced.
    pub key: fn(&T) -> String,
    /// A few words on the record.
    pub summary: fn(&T) -> String,
    /// What writing the record does to the stored one (`None` when there is none).
    pub kind: fn(&T, Option<&T>) -> ChangeKind,
    pub record: fn(T) -> Record,
}

/// Adds a planned change for each incoming record of one kind.
pub(super) fn plan_records<T: Serialize + Clone>(
    plan: &mut ImportPlan,
    incoming: &[T],
    existing: &[T],
    how: RecordKind<T>,
) {
    let stored: HashMap<String, &T> = existing.iter().map(|b| ((how.key)(b), b)).collect();
    for r in incoming {
        let key = (how.key)(r);
        let before = stored.get(&key).copied();
        plan.changes.push(Change {
            kind: (how.kind)(r, before),
            entity: format!("{}:{key}", how.entity),
            summary: (how.summary)(r),
            before: before.map(json),
            after: json(r),
            record: (how.record)(r.clone()),
        });
    }
}

/// A record's summary that names its review state and the source it cites, e.g.
/// `density coefficients, unreviewed, source crc-97`.
pub(super) fn summary_citing(what: &str, review: Review, source: &str) -> String {
    format!("{what}, {}, source {source}", review.as_str())
}

/// Unchanged when equal.
fn equal<T: PartialEq>(r: &T, before: Option<&T>) -> ChangeKind {
    kind_of(before.map(|b| b == r))
}

/// A record with a review state of its own, which an import may leave aside.
pub(super) trait Reviewed: Clone + PartialEq {
    fn review_mut(&mut self) -> &mut Review;

    /// The record with another review state.
    fn with_review(&self, review: Review) -> Self {
        let mut copy = self.clone();
        *copy.review_mut() = review;
        copy
    }
}

macro_rules! reviewed {
    ($($record:ty),+) => {$(
        impl Reviewed for $record {
            fn review_mut(&mut self) -> &mut Review {
                &mut self.review
            }
        }
    )+};
}

reviewed!(GasConstant, ThermoValue, HeatCapacityFit);

impl Reviewed for FreezingRecord {
    fn review_mut(&mut self) -> &mut Review {
        &mut self.data.review
    }
}

/// Unchanged when equal apart from the review state.
fn review_aside<T: Reviewed>(r: &T, before: Option<&T>) -> ChangeKind {
    let aside = |r: &T| r.with_review(Review::Unreviewed);
    kind_of(before.map(|b| r == b || aside(r) == aside(b)))
}

/// How a record with a review state compares: with `keep_state` the state written in the
/// file is a difference; without it, an incoming record's review state is not.
pub(super) fn state_aside<T: Reviewed>(keep_state: bool) -> fn(&T, Option<&T>) -> ChangeKind {
    if keep_state { equal } else { review_aside }
}

fn compare(incoming: &Contents, existing: &Contents, options: &ImportOptions) -> ImportPlan {
    let mut plan = ImportPlan::default();
    let keep = options.keep_state;
    plan_records(
        &mut plan,
        &incoming.sources,
        &existing.sources,
        RecordKind {
            entity: "source",
            key: |s: &Source| s.key.clone(),
            summary: |s| s.title.clone(),
            kind: equal,
            record: Record::Source,
        },
    );
    plan_records(
        &mut plan,
        &incoming.solutes,
        &existing.solutes,
        RecordKind {
            entity: "solute",
            key: |s: &Solute| s.id.clone(),
            summary: |s| format!("{} ({}, {})", s.name, s.formula, s.kind.as_str()),
            kind: equal,
            record: Record::Solute,
        },
    );
    plan_records(
        &mut plan,
        &incoming.datasets,
        &existing.datasets,
        RecordKind {
            entity: "dataset",
            key: |d: &Dataset| d.key.clone(),
            summary: |d| {
                let points = format!("{} points", d.points.len());
                let retired = if d.retired { ", retired" } else { "" };
                summary_citing(&points, d.review, &d.source) + retired
            },
            kind: if keep { dataset_kept } else { dataset_fresh },
            record: Record::Dataset,
        },
    );
    plan_records(
        &mut plan,
        &incoming.gas_constants,
        &existing.gas_constants,
        RecordKind {
            entity: "henry",
            key: |g: &GasConstant| g.key.clone(),
            summary: |g| format!("Henry's-law record, {}", g.review.as_str()),
            kind: state_aside(keep),
            record: Record::Gas,
        },
    );
    plan_records(
        &mut plan,
        &incoming.freezing,
        &existing.freezing,
        RecordKind {
            entity: "freezing",
            key: |f: &FreezingRecord| f.data.key.clone(),
            summary: |f| format!("{} freezing points", f.points_reported.len()),
            kind: state_aside(keep),
            record: Record::Freezing,
        },
    );
    // Density coefficients: one set per solute, compared whole (review aside unless kept).
    plan_records(
        &mut plan,
        &incoming.densities,
        &existing.densities,
        RecordKind {
            entity: "density",
            key: |d: &DensityCoefficients| d.solute.clone(),
            summary: |d| summary_citing("density coefficients", d.review, &d.source),
            kind: if keep { equal } else { density_fresh },
            record: Record::Density,
        },
    );
    super::thermo_import::plan(
        &mut plan,
        &incoming.thermochemistry,
        &existing.thermochemistry,
        options.keep_state,
    );
    plan_records(
        &mut plan,
        &incoming.checks,
        &existing.checks,
        RecordKind {
            entity: "check",
            key: |c: &Check| c.key.clone(),
            summary: |c| {
                format!(
                    "{} check against {}: {}",
                    c.kind,
                    c.reference,
                    c.verdict.as_str()
                )
            },
            kind: equal,
            record: Record::Check,
        },
    );

    // Findings, for the datasets that would be written.
    let solutes: HashMap<&str, &Solute> = existing
        .solutes
        .iter()
        .chain(&incoming.solutes)
        .map(|s| (s.id.as_str(), s))
        .collect();
    let written: Vec<&Dataset> = plan
        .changes
        .iter()
        .filter(|c| matches!(c.kind, ChangeKind::Added | ChangeKind::Changed))
        .filter_map(|c| match &c.record {
            Record::Dataset(d) => Some(d),
            _ => None,
        })
        .collect();
    let written_keys: HashSet<&str> = written.iter().map(|d| d.key.as_str()).collect();
    // Datasets are only compared within one solute and solid phase: grouped by both, so
    // planning stays linear in the datasets rather than comparing every pair.
    let same_solid = |d: &Dataset| (d.solute.clone(), d.phase.formula.clone());
    let mut stored: HashMap<(String, String), Vec<&Dataset>> = HashMap::new();
    for d in existing
        .datasets
        .iter()
        .filter(|d| !d.retired && d.review != Review::Rejected)
        .filter(|d| !written_keys.contains(d.key.as_str()))
    {
        stored.entry(same_solid(d)).or_default().push(d);
    }
    let mut written_with: HashMap<(String, String), Vec<usize>> = HashMap::new();
    for (i, d) in written.iter().enumerate() {
        written_with.entry(same_solid(d)).or_default().push(i);
    }
    for (i, d) in written.iter().enumerate() {
        let Some(solute) = solutes.get(d.solute.as_str()) else {
            continue;
        };
        plan.findings
            .extend(findings::outliers(d, solute.molar_mass));
        let group = same_solid(d);
        for o in stored.get(&group).into_iter().flatten() {
            if o.points == d.points || o.source == d.source {
                plan.findings.push(Finding {
                    kind: "duplicate",
                    dataset: d.key.clone(),
                    message: format!(
                        "dataset {} repeats the stored dataset {} ({})",
                        d.key,
                        o.key,
                        if o.points == d.points {
                            "the same points"
                        } else {
                            "same solute, phase and source"
                        }
                    ),
                });
                continue;
            }
            plan.findings.extend(
                findings::conflict(d, o, solute, options.tolerance)
                    .or_else(|| findings::conflict(o, d, solute, options.tolerance)),
            );
        }
        let later = written_with.get(&group).into_iter().flatten();
        for o in later.filter(|&&j| j > i).map(|&j| written[j]) {
            plan.findings.extend(
                findings::conflict(d, o, solute, options.tolerance)
                    .or_else(|| findings::conflict(o, d, solute, options.tolerance)),
            );
        }
    }
    plan
}

/// Writes `plan` in one transaction with an audit row per change; nothing is written when
/// any step fails. `tick` is called once per point written (for a progress bar).
///
/// The transaction is IMMEDIATE, and the plan is re-validated inside it: when another
/// writer has changed the database since the plan was read, nothing is written and the
/// answer is [`StoreError::Stale`] (plan again, or use [`Store::import`], which plans
/// inside the transaction and so never is stale).
pub fn apply(
    store: &mut Store,
    plan: &ImportPlan,
    actor: &str,
    tick: &mut dyn FnMut(),
) -> Result<ImportSummary, StoreError> {
    let tx = lock::begin_write(&store.conn, &store.location)?;
    if newest_audit_row(&tx)? != plan.audit_mark {
        return Err(StoreError::Stale {
            location: store.location.clone(),
        });
    }
    let summary =
        write_plan(&tx, plan, actor, tick).map_err(|e| lock::name_file(e, &store.location))?;
    lock::commit(tx, &store.location)?;
    Ok(summary)
}

impl Store {
    /// Plans and writes an import in one IMMEDIATE transaction: the plan reads the state it
    /// replaces while holding the write lock, so concurrent importers are serialised and
    /// every audit `before` is what the write replaced (no other writer's change is lost).
    /// `planned` sees the plan before anything is written (for progress); `tick` is called
    /// once per point written.
    pub fn import(
        &mut self,
        files: &[ImportFile],
        options: &ImportOptions,
        actor: &str,
        planned: &mut dyn FnMut(&ImportPlan),
        tick: &mut dyn FnMut(),
    ) -> Result<(ImportPlan, ImportSummary), StoreError> {
        let tx = lock::begin_write(&self.conn, &self.location)?;
        let plan = plan(self, files, options)?;
        planned(&plan);
        let summary =
            write_plan(&tx, &plan, actor, tick).map_err(|e| lock::name_file(e, &self.location))?;
        lock::commit(tx, &self.location)?;
        Ok((plan, summary))
    }
}

/// The id of the newest audit row (0 when there is none).
fn newest_audit_row(conn: &rusqlite::Connection) -> Result<i64, StoreError> {
    Ok(conn.query_row("SELECT COALESCE(MAX(id), 0) FROM audit", [], |r| r.get(0))?)
}

/// Writes every change of `plan` and its audit row inside `tx`.
fn write_plan(
    tx: &rusqlite::Connection,
    plan: &ImportPlan,
    actor: &str,
    tick: &mut dyn FnMut(),
) -> Result<ImportSummary, StoreError> {
    let mut audit_rows = 0;
    for c in plan
        .changes
        .iter()
        .filter(|c| c.kind != ChangeKind::Unchanged)
    {
        match &c.record {
            Record::Source(s) => write::upsert_source(tx, s)?,
            Record::Solute(s) => write::upsert_solute(tx, s)?,
            Record::Dataset(d) => write::replace_dataset(tx, d, tick)?,
            Record::Gas(g) => write::replace_gas_constant(tx, g)?,
            Record::Freezing(f) => write::replace_freezing(tx, f)?,
            Record::Density(d) => super::density::replace(tx, d)?,
            Record::Check(c) => super::corroboration::replace_check(tx, c)?,
            Record::Thermo(t) => super::thermo_import::write(tx, t)?,
        }
        audit::record(
            tx,
            actor,
            c.kind.verb(),
            &c.entity,
            c.before.as_ref(),
            Some(&c.after),
        )?;
        audit_rows += 1;
    }
    Ok(ImportSummary {
        added: plan.count(ChangeKind::Added),
        changed: plan.count(ChangeKind::Changed),
        retired: plan.count(ChangeKind::Retired),
        unchanged: plan.count(ChangeKind::Unchanged),
        audit_rows,
    })
}

/// A progress bar on standard error for an import of more than 1,000 points, when standard
/// error is a terminal; `None` otherwise.
pub fn progress_bar(points: usize) -> Option<indicatif::ProgressBar> {
    use std::io::IsTerminal as _;
    if points <= 1000 || !std::io::stderr().is_terminal() {
        return None;
    }
    let bar = indicatif::ProgressBar::new(points as u64);
    if let Ok(style) =
        indicatif::ProgressStyle::with_template("importing {bar:40} {pos}/{len} points")
    {
        bar.set_style(style);
    }
    Some(bar)
}

// ---------------------------------------------------------------------------------------
// CSV

const CSV_REQUIRED: [&str; 8] = [
    "solute",
    "formula",
    "phase",
    "temperature",
    "temperature_unit",
    "value",
    "unit",
    "source",
];
const CSV_OPTIONAL: [&str; 10] = [
    "uncertainty",
    "name",
    "kind",
    "ions",
    "phase_name",
    "dataset",
    "provenance",
    "review",
    "retired",
    "note",
];

/// Every CSV column, in the order `satline export --to csv` writes them.
pub fn csv_columns() -> Vec<&'static str> {
    CSV_REQUIRED.iter().chain(&CSV_OPTIONAL).copied().collect()
}

struct CsvPoint {
    line: u64,
    temperature: f64,
    value: f64,
    uncertainty: Option<f64>,
}

/// The rows of one solute, phase and source.
struct CsvDataset {
    line: u64,
    phase: String,
    source: String,
    fields: BTreeMap<&'static str, (String, u64)>,
    points: Vec<CsvPoint>,
}

struct CsvSolute {
    line: u64,
    fields: BTreeMap<&'static str, (String, u64)>,
    datasets: Vec<CsvDataset>,
}

const SOLUTE_FIELDS: [&str; 4] = ["formula", "name", "kind", "ions"];
/// The optional columns every row of one dataset gives alike: those after the point's and
/// the solute's (`uncertainty`, `name`, `kind`, `ions`).
const DATASET_OPTIONAL: &[&str] = CSV_OPTIONAL.split_at(4).1;

/// Most faults of one CSV file listed in a single error: the first in full, then the others.
const FAULTS_LISTED: usize = 20;

/// Every fault of a CSV file's rows as one error (the first's line as its place, the others
/// listed after it), or `None` when there were none.
fn all_faults(file: &str, faults: Vec<StoreError>) -> Option<StoreError> {
    let mut rest = faults.into_iter();
    let first = rest.next()?;
    let others: Vec<String> = rest
        .map(|f| match f {
            StoreError::Import {
                record, problem, ..
            } => format!("{record}: {problem}"),
            other => other.to_string(),
        })
        .collect();
    if others.is_empty() {
        return Some(first);
    }
    let (record, problem) = match first {
        StoreError::Import {
            record, problem, ..
        } => (record, problem),
        other => (String::from("line 0"), other.to_string()),
    };
    let mut text = format!(
        "{problem}\n  and {} more fault{} in this file:",
        others.len(),
        if others.len() == 1 { "" } else { "s" }
    );
    for o in others.iter().take(FAULTS_LISTED) {
        text.push_str("\n  ");
        text.push_str(o);
    }
    if others.len() > FAULTS_LISTED {
        text.push_str(&format!(
            "\n  … {} more not listed",
            others.len() - FAULTS_LISTED
        ));
    }
    Some(import_error(file, record, text))
}

/// A row's units written as their symbols (so that two spellings of one unit agree),
/// checked to be units at all.
struct DatasetUnits {
    unit: &'static str,
    temperature_unit: &'static str,
}

impl DatasetUnits {
    fn read(file: &str, line: u64, unit: &str, temperature_unit: &str) -> Result<Self, StoreError> {
        // A unit known but not allowed in a dataset (per volume) is left to the seed's rules,
        // which say why.
        let composition = CompositionUnit::from_symbol(unit).ok_or_else(|| {
            import_error(
                file,
                format!("line {line}"),
                format!(
                    "unknown unit \"{unit}\"; a dataset's unit is one of {}",
                    seed::SEED_UNITS
                        .iter()
                        .map(|u| u.symbol())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            )
        })?;
        let temperature = TemperatureUnit::from_symbol(temperature_unit).ok_or_else(|| {
            import_error(
                file,
                format!("line {line}"),
                format!("unknown temperature unit \"{temperature_unit}\"; expected C, K or F"),
            )
        })?;
        Ok(DatasetUnits {
            unit: composition.symbol(),
            temperature_unit: temperature.symbol(),
        })
    }
}

/// A value given on one row must agree with the value given on earlier rows of the same
/// solute or dataset.
fn agree(
    file: &str,
    line: u64,
    fields: &mut BTreeMap<&'static str, (String, u64)>,
    name: &'static str,
    value: &str,
    of: &str,
) -> Result<(), StoreError> {
    if value.is_empty() {
        return Ok(());
    }
    match fields.get(name) {
        Some((first, first_line)) if first != value => Err(import_error(
            file,
            format!("line {line}"),
            format!(
                "{name} \"{value}\" differs from \"{first}\" on line {first_line} for the same {of}"
            ),
        )),
        Some(_) => Ok(()),
        None => {
            fields.insert(name, (value.to_string(), line));
            Ok(())
        }
    }
}

fn slug(s: &str) -> String {
    let mut out = String::new();
    for c in s.chars() {
        if c.is_ascii_alphanumeric() {
            out.push(c.to_ascii_lowercase());
        } else if !out.ends_with('-') {
            out.push('-');
        }
    }
    out.trim_matches('-').to_string()
}

fn parse_csv(
    f: &ImportFile,
    existing: &Contents,
    known_sources: &HashSet<String>,
    options: &ImportOptions,
    origins: &mut Origins,
) -> Result<Contents, StoreError> {
    let file = f.path.as_str();
    let csv_error = |e: csv::Error| {
        let line = e.position().map_or(0, |p| p.line());
        import_error(file, format!("line {line}"), e.to_string())
    };
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .from_reader(f.text.as_bytes());
    let headers = reader.headers().map_err(csv_error)?.clone();
    let mut column: HashMap<&'static str, usize> = HashMap::new();
    for (i, h) in headers.iter().enumerate() {
        let Some(name) = CSV_REQUIRED.iter().chain(&CSV_OPTIONAL).find(|c| **c == h) else {
            return Err(import_error(
                file,
                "line 1",
                format!(
                    "unknown column \"{h}\"; the columns are {}",
                    csv_columns().join(", ")
                ),
            ));
        };
        if column.insert(name, i).is_some() {
            return Err(import_error(
                file,
                "line 1",
                format!("column \"{h}\" appears twice"),
            ));
        }
    }
    if let Some(missing) = CSV_REQUIRED.iter().find(|c| !column.contains_key(*c)) {
        return Err(import_error(
            file,
            "line 1",
            format!("missing column \"{missing}\""),
        ));
    }

    let mut solutes: Vec<(String, CsvSolute)> = Vec::new();
    // Where each solute is in `solutes`: one look-up per row, not a scan (linear in rows).
    let mut solute_index: HashMap<String, usize> = HashMap::new();
    let mut faults: Vec<StoreError> = Vec::new();
    for record in reader.records() {
        let record = match record {
            Ok(r) => r,
            Err(e) => {
                faults.push(csv_error(e));
                continue;
            }
        };
        if let Err(fault) = (|| -> Result<(), StoreError> {
            let line = record.position().map_or(0, |p| p.line());
            let get = |name: &str| -> &str {
                column.get(name).and_then(|&i| record.get(i)).unwrap_or("")
            };
            if record.iter().all(str::is_empty) {
                return Ok(());
            }
            let number = |name: &str| -> Result<Option<f64>, StoreError> {
                let text = get(name);
                if text.is_empty() {
                    return Ok(None);
                }
                match text.parse::<f64>() {
                    Ok(v) if v.is_finite() => Ok(Some(v)),
                    _ => Err(import_error(
                        file,
                        format!("line {line}"),
                        format!("{name} is not a number: found \"{text}\""),
                    )),
                }
            };
            let required = |name: &str| -> Result<&str, StoreError> {
                let v = get(name);
                if v.is_empty() {
                    let why = if name == "source" {
                        "a dataset without a source is refused: every number needs a citation (add the source with `satline source add`)".to_string()
                    } else {
                        format!("the {name} is empty")
                    };
                    Err(import_error(file, format!("line {line}"), why))
                } else {
                    Ok(v)
                }
            };
            let id = required("solute")?;
            let phase = required("phase")?;
            let source = required("source")?;
            required("formula")?;
            // Units compared by meaning, so `g/100 g water` on one row agrees with
            // `g/100g water` on another, and a misspelt unit is named as unknown.
            let units =
                DatasetUnits::read(file, line, required("unit")?, required("temperature_unit")?)?;
            if !known_sources.contains(source) {
                return Err(import_error(
                    file,
                    format!("line {line}"),
                    format!(
                        "unknown source key \"{source}\" (not in the database or the imported sources.toml); add it with `satline source add` first"
                    ),
                ));
            }
            let temperature = number("temperature")?.ok_or_else(|| {
                import_error(file, format!("line {line}"), "the temperature is empty")
            })?;
            let value = number("value")?
                .ok_or_else(|| import_error(file, format!("line {line}"), "the value is empty"))?;
            let uncertainty = number("uncertainty")?;

            let index = match solute_index.get(id) {
                Some(&i) => i,
                None => {
                    solute_index.insert(id.to_string(), solutes.len());
                    solutes.push((
                        id.to_string(),
                        CsvSolute {
                            line,
                            fields: BTreeMap::new(),
                            datasets: Vec::new(),
                        },
                    ));
                    solutes.len() - 1
                }
            };
            let solute = &mut solutes[index].1;
            for name in SOLUTE_FIELDS {
                agree(file, line, &mut solute.fields, name, get(name), "solute")?;
            }
            let d = match solute
                .datasets
                .iter()
                .position(|d| d.phase == phase && d.source == source)
            {
                Some(i) => i,
                None => {
                    solute.datasets.push(CsvDataset {
                        line,
                        phase: phase.to_string(),
                        source: source.to_string(),
                        fields: BTreeMap::new(),
                        points: Vec::new(),
                    });
                    solute.datasets.len() - 1
                }
            };
            let dataset = &mut solute.datasets[d];
            let fields = &mut dataset.fields;
            agree(file, line, fields, "unit", units.unit, "dataset")?;
            agree(
                file,
                line,
                fields,
                "temperature_unit",
                units.temperature_unit,
                "dataset",
            )?;
            for name in DATASET_OPTIONAL {
                agree(file, line, fields, name, get(name), "dataset")?;
            }
            dataset.points.push(CsvPoint {
                line,
                temperature,
                value,
                uncertainty,
            });
            Ok(())
        })() {
            faults.push(fault);
        }
    }
    if let Some(fault) = all_faults(file, faults) {
        return Err(fault);
    }

    // Each solute becomes a seed-format solute file, validated by the seed's own rules.
    let mut synthetic: Vec<(String, String)> = Vec::new();
    for (id, solute) in &mut solutes {
        let name = format!("solutes/{id}.toml");
        origins.files.insert(name.clone(), file.to_string());
        if let Some(&i) = column.get("value") {
            origins.value_column.insert(name.clone(), i + 1);
        }
        let field = |k: &str| solute.fields.get(k).map(|v| v.0.clone());
        let stored = existing.solutes.iter().find(|s| &s.id == id);
        let mut table = toml::Table::new();
        table.insert("id".into(), id.clone().into());
        match stored {
            Some(s) => {
                let formula = field("formula").unwrap_or_default();
                if formula != s.formula {
                    return Err(import_error(
                        file,
                        format!("line {}", solute.line),
                        format!(
                            "formula \"{formula}\" differs from the stored solute \"{id}\"'s \"{}\"",
                            s.formula
                        ),
                    ));
                }
                table.insert("name".into(), s.name.clone().into());
                table.insert("formula".into(), s.formula.clone().into());
                table.insert("kind".into(), s.kind.as_str().into());
                table.insert("ions".into(), i64::from(s.ions).into());
                table.insert(
                    "synonyms".into(),
                    toml::Value::Array(s.synonyms.iter().map(|x| x.clone().into()).collect()),
                );
                table.insert(
                    "tags".into(),
                    toml::Value::Array(s.tags.iter().map(|x| x.clone().into()).collect()),
                );
                for (k, v) in [
                    ("cation", &s.cation),
                    ("anion", &s.anion),
                    ("hazard", &s.hazard),
                ] {
                    if let Some(v) = v {
                        table.insert(k.into(), v.clone().into());
                    }
                }
                // The stored freezing data, so points are checked against the ice line.
                if let Some(fr) = existing.freezing.iter().find(|fr| &fr.data.solute == id) {
                    table.insert("freezing".into(), freezing_table(fr).into());
                }
            }
            None => {
                table.insert(
                    "name".into(),
                    field("name").unwrap_or_else(|| id.replace('-', " ")).into(),
                );
                table.insert(
                    "formula".into(),
                    field("formula").unwrap_or_default().into(),
                );
                table.insert(
                    "kind".into(),
                    field("kind")
                        .unwrap_or_else(|| "molecular".to_string())
                        .into(),
                );
                if let Some(ions) = field("ions") {
                    let n: i64 = ions.parse().map_err(|_| {
                        import_error(
                            file,
                            format!("line {}", solute.fields.get("ions").map_or(0, |v| v.1)),
                            format!("ions is not a whole number: found \"{ions}\""),
                        )
                    })?;
                    table.insert("ions".into(), n.into());
                }
            }
        }
        let per_source: HashMap<String, usize> =
            solute.datasets.iter().fold(HashMap::new(), |mut m, d| {
                *m.entry(d.source.clone()).or_default() += 1;
                m
            });
        let mut datasets = Vec::new();
        for d in &mut solute.datasets {
            let field = |k: &str| d.fields.get(k).map(|v| v.0.clone());
            let key = field("dataset").unwrap_or_else(|| {
                if per_source.get(&d.source) == Some(&1) {
                    d.source.clone()
                } else {
                    format!("{}-{}", d.source, slug(&d.phase))
                }
            });
            d.points
                .sort_by(|a, b| a.temperature.total_cmp(&b.temperature));
            for pair in d.points.windows(2) {
                if pair[0].temperature == pair[1].temperature {
                    return Err(import_error(
                        file,
                        format!("line {}", pair[1].line),
                        format!(
                            "duplicate point at {} for solute \"{id}\", phase \"{}\", source \"{}\" (also on line {})",
                            pair[1].temperature, d.phase, d.source, pair[0].line
                        ),
                    ));
                }
            }
            let mut t = toml::Table::new();
            t.insert("key".into(), key.clone().into());
            t.insert("source".into(), d.source.clone().into());
            t.insert("phase".into(), d.phase.clone().into());
            let hydrate = d.phase.contains('·') || d.phase.contains("H2O");
            t.insert(
                "phase_name".into(),
                field("phase_name")
                    .unwrap_or_else(|| if hydrate { "hydrate" } else { "anhydrous" }.to_string())
                    .into(),
            );
            for k in ["unit", "temperature_unit"] {
                t.insert(k.into(), field(k).unwrap_or_default().into());
            }
            t.insert(
                "provenance".into(),
                field("provenance")
                    .unwrap_or_else(|| "compiled".to_string())
                    .into(),
            );
            let review = field("review")
                .filter(|_| options.keep_state)
                .unwrap_or_else(|| "unreviewed".to_string());
            t.insert("review".into(), review.into());
            if options.keep_state && field("retired").as_deref() == Some("true") {
                t.insert("retired".into(), true.into());
            }
            if let Some(note) = field("note") {
                t.insert("note".into(), note.into());
            }
            let points: Vec<toml::Value> = d
                .points
                .iter()
                .map(|p| {
                    let mut v = vec![toml::Value::Float(p.temperature), p.value.into()];
                    if let Some(u) = p.uncertainty {
                        v.push(u.into());
                    }
                    toml::Value::Array(v)
                })
                .collect();
            t.insert("points".into(), toml::Value::Array(points));
            for (i, p) in d.points.iter().enumerate() {
                origins.lines.insert(
                    (name.clone(), format!("dataset \"{key}\", point {}", i + 1)),
                    p.line,
                );
            }
            origins
                .lines
                .insert((name.clone(), format!("dataset \"{key}\"")), d.line);
            datasets.push(toml::Value::Table(t));
        }
        table.insert("dataset".into(), toml::Value::Array(datasets));
        origins
            .lines
            .insert((name.clone(), format!("solute \"{id}\"")), solute.line);
        origins
            .made_from_csv
            .insert(name.clone(), (id.clone(), solute.line));
        let text = toml::to_string(&table)
            .map_err(|e| import_error(file, format!("solute \"{id}\""), e.to_string()))?;
        synthetic.push((name, text));
    }
    if synthetic.is_empty() {
        return Ok(Contents::default());
    }
    let known: Vec<&str> = known_sources.iter().map(String::as_str).collect();
    seed::parse_with_known_sources(&synthetic, &known).map_err(|e| origins.relabel(e))
}

fn freezing_table(fr: &FreezingRecord) -> toml::Table {
    let mut t = toml::Table::new();
    let key = fr
        .data
        .key
        .split_once('/')
        .map_or(fr.data.key.as_str(), |k| k.1);
    t.insert("key".into(), key.into());
    t.insert("source".into(), fr.data.source.clone().into());
    t.insert("provenance".into(), fr.data.provenance.as_str().into());
    t.insert("review".into(), fr.data.review.as_str().into());
    t.insert("unit".into(), fr.unit.clone().into());
    t.insert(
        "temperature_unit".into(),
        fr.temperature_unit.clone().into(),
    );
    t.insert(
        "points".into(),
        toml::Value::Array(
            fr.points_reported
                .iter()
                .map(|&(c, t)| toml::Value::Array(vec![c.into(), t.into()]))
                .collect(),
        ),
    );
    if let Some((c, temp)) = fr.eutectic_reported {
        t.insert(
            "eutectic".into(),
            toml::Value::Array(vec![c.into(), temp.into()]),
        );
    }
    if let Some(n) = &fr.note {
        t.insert("note".into(), n.clone().into());
    }
    t
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn slugs_fold_formulas() {
        assert_eq!(slug("Na2SO4·10H2O"), "na2so4-10h2o");
    }

    #[test]
    fn sane_ranges_exclude_zero() {
        let (low, _, _) = sane_range(CompositionUnit::GramsPer100gWater).unwrap();
        assert_eq!(low, 0.0);
        assert!(sane_range(CompositionUnit::GramsPerLitre).is_none());
    }
}
