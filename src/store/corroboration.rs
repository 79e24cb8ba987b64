//! Corroboration checks as data: the seed files `checks/<name>.toml` (format in
//! `seed-data/README.md`), their validation, how they are written to and read from the
//! `checks` table, exported, and counted for `satline check`.
//!
//! A check says that one stored record (a solubility dataset, a freezing table or a
//! Henry's-law record) was compared with something outside it, and what came of it. Checks
//! are written by `tests/reference/make_fixtures.py` and re-checked by `cargo test`
//! (`tests/corroboration.rs`); they never touch a record's review state.

use std::collections::{BTreeMap, HashSet};
use std::fmt::Write as _;

use rusqlite::{Connection, params};
use serde::{Deserialize, Serialize};

use super::StoreError;
use super::read::{Contents, word};
use super::seed::{SeedProblem, check_slug, first_use, optional, problem, syntax};
use crate::model::{Check, CheckSubject, Review, Verdict};

/// The folder of check files inside a seed or export directory.
pub const CHECK_DIR: &str = "checks";

/// The temperatures a "curve over 0–40 °C" must cover, K.
pub const COVERAGE_RANGE_K: (f64, f64) = (273.15, 313.15);

/// True for a seed path `checks/<name>.toml`.
pub fn is_check_path(path: &str) -> bool {
    path.strip_prefix("checks/")
        .and_then(|rest| rest.strip_suffix(".toml"))
        .is_some_and(|stem| !stem.is_empty() && !stem.contains('/'))
}

/// True for a TOML text of check records only (`[[check]]` tables and nothing else), so
/// an import recognises a check file by what it holds wherever it lies.
pub fn is_check_text(text: &str) -> bool {
    toml::from_str::<toml::Table>(text)
        .is_ok_and(|t| t.contains_key("check") && t.keys().all(|k| k == "check"))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFile {
    #[serde(default)]
    check: Vec<RawCheck>,
}

fn dataset_subject() -> CheckSubject {
    CheckSubject::Dataset
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCheck {
    subject: String,
    #[serde(default = "dataset_subject")]
    record: CheckSubject,
    key: String,
    kind: String,
    reference: String,
    method: String,
    other: Option<String>,
    temperature_k: Option<f64>,
    figure: Option<f64>,
    satline_figure: Option<f64>,
    unit: Option<String>,
    tolerance: Option<f64>,
    tolerance_unit: Option<String>,
    verdict: Verdict,
    explanation: Option<String>,
    tool: Option<String>,
}

fn bad(file: &str, record: &str, reason: String) -> StoreError {
    problem(file, record, SeedProblem::BadValue { reason })
}

/// Parses the check files (`(path, text)` pairs). Each subject must be one of the records in
/// `contents`, unless `subjects_elsewhere` (an import, whose subjects may already be stored:
/// the import checks them against the database, see [`unknown_subject`]).
pub fn parse_files(
    files: &[(&str, &str)],
    contents: &Contents,
    subjects_elsewhere: bool,
) -> Result<Vec<Check>, StoreError> {
    let mut seen = HashSet::new();
    let mut out = Vec::new();
    for (file, text) in files {
        let raw: RawFile = toml::from_str(text).map_err(|e| syntax(file, text, &e))?;
        for c in raw.check {
            let record = format!("check \"{}/{}\"", c.subject, c.key);
            let Some((solute, local)) = c.subject.split_once('/') else {
                return Err(bad(
                    file,
                    &record,
                    format!(
                        "subject \"{}\" is not a record key of the form <solute>/<key>",
                        c.subject
                    ),
                ));
            };
            check_slug(file, &record, solute)?;
            check_slug(file, &record, local)?;
            check_slug(file, &record, &c.key)?;
            check_slug(file, &record, &c.kind)?;
            for (what, v) in [
                ("temperature_k", c.temperature_k),
                ("figure", c.figure),
                ("satline_figure", c.satline_figure),
                ("tolerance", c.tolerance),
            ] {
                if v.is_some_and(|v| !v.is_finite()) {
                    return Err(bad(
                        file,
                        &record,
                        format!("{what} must be a finite number"),
                    ));
                }
            }
            if c.temperature_k.is_some_and(|t| t <= 0.0) {
                return Err(bad(
                    file,
                    &record,
                    "temperature_k must be above absolute zero".to_string(),
                ));
            }
            if c.tolerance.is_some_and(|t| t < 0.0) {
                return Err(bad(file, &record, "tolerance must not be negative".into()));
            }
            if c.reference.trim().is_empty() || c.method.trim().is_empty() {
                return Err(bad(
                    file,
                    &record,
                    "a check names its reference and its method".into(),
                ));
            }
            let explanation = optional(c.explanation);
            if c.verdict == Verdict::NotApplicable && explanation.is_none() {
                return Err(bad(
                    file,
                    &record,
                    "a not-applicable check says why in `explanation`".into(),
                ));
            }
            let check = Check {
                key: format!("{}/{}", c.subject, c.key),
                solute: solute.to_string(),
                subject_kind: c.record,
                subject: c.subject,
                kind: c.kind,
                reference: c.reference,
                other: optional(c.other),
                method: c.method,
                temperature_k: c.temperature_k,
                figure: c.figure,
                satline_figure: c.satline_figure,
                unit: optional(c.unit),
                tolerance: c.tolerance,
                tolerance_unit: optional(c.tolerance_unit),
                verdict: c.verdict,
                explanation,
                tool: optional(c.tool),
            };
            first_use(&mut seen, file, &record, "check", &check.key)?;
            if !subjects_elsewhere && let Some(reason) = unknown_subject(&check, &[contents]) {
                return Err(bad(
                    file,
                    &record,
                    format!(
                        "{reason}; after renaming or removing a record, rerun tests/reference/make_fixtures.py to rewrite the checks"
                    ),
                ));
            }
            out.push(check);
        }
    }
    out.sort_by(|a, b| a.key.cmp(&b.key));
    Ok(out)
}

/// Why a check's subject (or the other record it names) cannot be found in any of `within`;
/// `None` when both are there.
pub fn unknown_subject(check: &Check, within: &[&Contents]) -> Option<String> {
    let has = |kind: CheckSubject, key: &str| {
        within.iter().any(|c| match kind {
            CheckSubject::Dataset => c.datasets.iter().any(|d| d.key == key),
            CheckSubject::Freezing => c.freezing.iter().any(|f| f.data.key == key),
            CheckSubject::Henry => c.gas_constants.iter().any(|g| g.key == key),
        })
    };
    if !has(check.subject_kind, &check.subject) {
        return Some(format!(
            "the checked {} \"{}\" is not in the reference",
            check.subject_kind.as_str(),
            check.subject
        ));
    }
    if let Some(other) = &check.other
        && !has(CheckSubject::Dataset, other)
        && !has(check.subject_kind, other)
    {
        return Some(format!(
            "the record \"{other}\" the check compares with is not in the reference"
        ));
    }
    None
}

/// Inserts a check, replacing one with the same key.
pub(crate) fn replace_check(conn: &Connection, c: &Check) -> Result<(), StoreError> {
    conn.prepare_cached(
        "INSERT OR REPLACE INTO checks (key, solute, subject_kind, subject, kind, reference, other,
             method, temperature_k, figure, satline_figure, unit, tolerance, tolerance_unit,
             verdict, explanation, tool)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17)",
    )?
    .execute(params![
        c.key,
        c.solute,
        c.subject_kind.as_str(),
        c.subject,
        c.kind,
        c.reference,
        c.other,
        c.method,
        c.temperature_k,
        c.figure,
        c.satline_figure,
        c.unit,
        c.tolerance,
        c.tolerance_unit,
        c.verdict.as_str(),
        c.explanation,
        c.tool
    ])?;
    Ok(())
}

/// Every stored check, by key.
pub(crate) fn read_checks(conn: &Connection) -> Result<Vec<Check>, StoreError> {
    let mut stmt = conn.prepare_cached(
        "SELECT key, solute, subject_kind, subject, kind, reference, other, method, temperature_k,
                figure, satline_figure, unit, tolerance, tolerance_unit, verdict, explanation, tool
         FROM checks ORDER BY key",
    )?;
    let mut rows = stmt.query([])?;
    let mut out = Vec::new();
    while let Some(r) = rows.next()? {
        let subject_kind: String = r.get(2)?;
        let verdict: String = r.get(14)?;
        out.push(Check {
            key: r.get(0)?,
            solute: r.get(1)?,
            subject_kind: word(&subject_kind)?,
            subject: r.get(3)?,
            kind: r.get(4)?,
            reference: r.get(5)?,
            other: r.get(6)?,
            method: r.get(7)?,
            temperature_k: r.get(8)?,
            figure: r.get(9)?,
            satline_figure: r.get(10)?,
            unit: r.get(11)?,
            tolerance: r.get(12)?,
            tolerance_unit: r.get(13)?,
            verdict: word(&verdict)?,
            explanation: r.get(15)?,
            tool: r.get(16)?,
        });
    }
    Ok(out)
}

fn text(s: &str) -> String {
    toml::Value::String(s.to_string()).to_string()
}

/// The checks as seed files, one per kind: `checks/<kind>.toml`, checks in key order.
pub fn to_toml_files(checks: &[Check]) -> Vec<(String, String)> {
    let mut by_kind: BTreeMap<&str, Vec<&Check>> = BTreeMap::new();
    for c in checks {
        by_kind.entry(c.kind.as_str()).or_default().push(c);
    }
    let number = super::export::number;
    by_kind
        .into_iter()
        .map(|(kind, checks)| {
            let mut out = format!("# Exported by satline: corroboration checks of kind {kind}.\n");
            for c in checks {
                let local = c
                    .key
                    .strip_prefix(&format!("{}/", c.subject))
                    .unwrap_or(&c.key);
                let _ = writeln!(out, "\n[[check]]");
                let _ = writeln!(out, "subject = {}", text(&c.subject));
                if c.subject_kind != CheckSubject::Dataset {
                    let _ = writeln!(out, "record = {}", text(c.subject_kind.as_str()));
                }
                let _ = writeln!(out, "key = {}", text(local));
                let _ = writeln!(out, "kind = {}", text(&c.kind));
                let _ = writeln!(out, "reference = {}", text(&c.reference));
                if let Some(o) = &c.other {
                    let _ = writeln!(out, "other = {}", text(o));
                }
                let _ = writeln!(out, "method = {}", text(&c.method));
                for (name, v) in [
                    ("temperature_k", c.temperature_k),
                    ("figure", c.figure),
                    ("satline_figure", c.satline_figure),
                ] {
                    if let Some(v) = v {
                        let _ = writeln!(out, "{name} = {}", number(v));
                    }
                }
                if let Some(u) = &c.unit {
                    let _ = writeln!(out, "unit = {}", text(u));
                }
                if let Some(t) = c.tolerance {
                    let _ = writeln!(out, "tolerance = {}", number(t));
                }
                if let Some(u) = &c.tolerance_unit {
                    let _ = writeln!(out, "tolerance_unit = {}", text(u));
                }
                let _ = writeln!(out, "verdict = {}", text(c.verdict.as_str()));
                if let Some(e) = &c.explanation {
                    let _ = writeln!(out, "explanation = {}", text(e));
                }
                if let Some(t) = &c.tool {
                    let _ = writeln!(out, "tool = {}", text(t));
                }
            }
            (format!("{CHECK_DIR}/{kind}.toml"), out)
        })
        .collect()
}

/// How much of the reference is corroborated, for `satline check`.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Coverage {
    /// Checks stored, and how many of each verdict.
    pub checks: usize,
    pub passing: usize,
    pub failing: usize,
    pub not_applicable: usize,
    /// Live datasets (not retired or rejected).
    pub datasets: usize,
    /// Live datasets with at least one passing check.
    pub corroborated: usize,
    /// Live datasets with no passing check.
    pub uncorroborated: usize,
    /// Failing checks, each `key (kind, reference): explanation`.
    pub failures: Vec<String>,
    /// Failing checks with no explanation: problems.
    pub unexplained: Vec<String>,
    /// Checks whose subject is not stored: problems.
    pub orphans: Vec<String>,
    /// Checks by kind: (pass, fail, not-applicable).
    pub by_kind: BTreeMap<String, (usize, usize, usize)>,
    /// Solutes with solubility data over the whole of [`COVERAGE_RANGE_K`].
    pub solutes_over_0_40_c: usize,
    /// Solutes with solubility data at all.
    pub solutes_with_data: usize,
}

/// Counts the corroboration of `contents`.
pub fn coverage(contents: &Contents) -> Coverage {
    let live: Vec<_> = contents
        .datasets
        .iter()
        .filter(|d| !d.retired && d.review != Review::Rejected)
        .collect();
    let mut cov = Coverage {
        checks: contents.checks.len(),
        datasets: live.len(),
        ..Coverage::default()
    };
    for c in &contents.checks {
        let slot = cov.by_kind.entry(c.kind.clone()).or_default();
        match c.verdict {
            Verdict::Pass => {
                cov.passing += 1;
                slot.0 += 1;
            }
            Verdict::Fail => {
                cov.failing += 1;
                slot.1 += 1;
                let line = format!(
                    "{} ({}, against {}): {}",
                    c.key,
                    c.kind,
                    c.reference,
                    c.explanation.as_deref().unwrap_or("no explanation")
                );
                if c.explanation.is_none() {
                    cov.unexplained.push(line.clone());
                }
                cov.failures.push(line);
            }
            Verdict::NotApplicable => {
                cov.not_applicable += 1;
                slot.2 += 1;
            }
        }
        if let Some(reason) = unknown_subject(c, &[contents]) {
            cov.orphans.push(format!("{}: {reason}", c.key));
        }
    }
    let passed: HashSet<&str> = contents
        .checks
        .iter()
        .filter(|c| c.verdict == Verdict::Pass && c.subject_kind == CheckSubject::Dataset)
        .map(|c| c.subject.as_str())
        .collect();
    cov.corroborated = live
        .iter()
        .filter(|d| passed.contains(d.key.as_str()))
        .count();
    cov.uncorroborated = cov.datasets - cov.corroborated;
    for s in &contents.solutes {
        let spans: Vec<(f64, f64)> = live
            .iter()
            .filter(|d| d.solute == s.id && !d.points.is_empty())
            .filter_map(|d| {
                d.stable_range_k.or_else(|| {
                    Some((
                        d.points.first()?.temperature_k,
                        d.points.last()?.temperature_k,
                    ))
                })
            })
            .collect();
        if !spans.is_empty() {
            cov.solutes_with_data += 1;
        }
        if covers(&spans, COVERAGE_RANGE_K) {
            cov.solutes_over_0_40_c += 1;
        }
    }
    cov
}

/// True when the union of the `spans` covers `range` without a gap (0.01 K of slack for
/// rounded transition temperatures).
pub fn covers(spans: &[(f64, f64)], range: (f64, f64)) -> bool {
    const SLACK: f64 = 0.01;
    let mut spans = spans.to_vec();
    spans.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut reached = range.0;
    for (low, high) in spans {
        if low > reached + SLACK {
            break;
        }
        reached = reached.max(high);
    }
    reached + SLACK >= range.1
}

impl Coverage {
    /// Problems that make `satline check` fail: failing checks left unexplained and
    /// checks whose subject is gone.
    pub fn problems(&self) -> usize {
        self.unexplained.len() + self.orphans.len()
    }

    /// The report for people.
    pub fn write(&self, out: &mut dyn std::io::Write) -> std::io::Result<()> {
        writeln!(
            out,
            "solutes with solubility data: {}, over 0–40 °C: {}",
            self.solutes_with_data, self.solutes_over_0_40_c
        )?;
        writeln!(
            out,
            "corroboration: {} of {} datasets have a passing check, {} have none ({} checks: {} pass, {} fail, {} not applicable)",
            self.corroborated,
            self.datasets,
            self.uncorroborated,
            self.checks,
            self.passing,
            self.failing,
            self.not_applicable
        )?;
        for (kind, (pass, fail, na)) in &self.by_kind {
            writeln!(
                out,
                "  {kind}: {pass} pass, {fail} fail, {na} not applicable"
            )?;
        }
        if self.failures.is_empty() {
            writeln!(out, "failing checks: none")?;
        } else {
            writeln!(
                out,
                "failing checks: {} ({} unexplained)",
                self.failures.len(),
                self.unexplained.len()
            )?;
            for f in &self.failures {
                writeln!(out, "  {f}")?;
            }
        }
        if !self.orphans.is_empty() {
            writeln!(
                out,
                "checks of records not in the reference: {}",
                self.orphans.len()
            )?;
            for o in &self.orphans {
                writeln!(out, "  {o}")?;
            }
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spans_cover_a_range_only_without_gaps() {
        assert!(covers(&[(273.15, 300.0), (300.0, 320.0)], COVERAGE_RANGE_K));
        assert!(covers(&[(270.0, 330.0)], COVERAGE_RANGE_K));
        assert!(!covers(
            &[(273.15, 300.0), (305.0, 320.0)],
            COVERAGE_RANGE_K
        ));
        assert!(!covers(&[(280.0, 330.0)], COVERAGE_RANGE_K));
        assert!(!covers(&[], COVERAGE_RANGE_K));
    }

    use crate::store::demo::SOURCES;

    // Invented demo seed, not reference data.
    const SOLUTE: &str = "id = \"demo-salt\"\nname = \"demo salt\"\nformula = \"KCl\"\nkind = \"salt\"\nions = 2\n\n[[dataset]]\nkey = \"d\"\nsource = \"demo\"\nphase = \"KCl\"\nphase_name = \"anhydrous\"\nunit = \"%w/w\"\ntemperature_unit = \"C\"\nprovenance = \"derived\"\nreview = \"unreviewed\"\npoints = [[0, 20.0], [20, 25.0]]\n";

    fn check(fields: &str) -> Result<Contents, StoreError> {
        let text = format!(
            "[[check]]\nkey = \"k\"\nkind = \"demo\"\nreference = \"r\"\nmethod = \"m\"\n{fields}"
        );
        super::super::seed::parse_seed(&[
            ("sources.toml", SOURCES),
            ("solutes/demo-salt.toml", SOLUTE),
            ("checks/demo.toml", text.as_str()),
        ])
    }

    fn reason(r: Result<Contents, StoreError>) -> String {
        r.unwrap_err().to_string()
    }

    #[test]
    fn a_check_of_a_stored_dataset_parses() {
        let c = check("subject = \"demo-salt/d\"\nverdict = \"pass\"\nfigure = 1.5\n").unwrap();
        assert_eq!(c.checks.len(), 1);
        assert_eq!(c.checks[0].key, "demo-salt/d/k");
        assert_eq!(c.checks[0].solute, "demo-salt");
    }

    #[test]
    fn a_check_of_an_unknown_record_is_refused() {
        let r = reason(check("subject = \"demo-salt/nope\"\nverdict = \"pass\"\n"));
        assert!(
            r.contains("\"demo-salt/nope\" is not in the reference"),
            "{r}"
        );
        let r = reason(check("subject = \"nokey\"\nverdict = \"pass\"\n"));
        assert!(r.contains("<solute>/<key>"), "{r}");
    }

    #[test]
    fn a_check_that_does_not_apply_says_why() {
        let r = reason(check(
            "subject = \"demo-salt/d\"\nverdict = \"not-applicable\"\n",
        ));
        assert!(r.contains("says why"), "{r}");
        let r = reason(check("subject = \"demo-salt/d\"\nverdict = \"maybe\"\n"));
        assert!(r.contains("maybe"), "{r}");
        let r = reason(check(
            "subject = \"demo-salt/d\"\nverdict = \"pass\"\ntolerance = -1\n",
        ));
        assert!(r.contains("negative"), "{r}");
    }

    #[test]
    fn check_paths_are_files_directly_under_checks() {
        assert!(is_check_path("checks/heat-sign.toml"));
        assert!(!is_check_path("checks/a/b.toml"));
        assert!(!is_check_path("solutes/checks.toml"));
        assert!(!is_check_path("checks/.toml"));
    }
}
