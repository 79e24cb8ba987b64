//! The integrity report of a whole database: SQLite's own integrity check, rows whose
//! references lead nowhere, datasets without a source or without points, outliers, conflicts
//! between sources, and how much is still unreviewed. Reads only.

use std::io::Write;

use serde::Serialize;

use super::findings::{self, Finding};
use super::{Store, StoreError};
use crate::model::Review;

/// What `satline check` found.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct CheckReport {
    /// Lines of `PRAGMA integrity_check` other than `ok`.
    pub integrity: Vec<String>,
    /// Rows whose foreign key points nowhere (`PRAGMA foreign_key_check`), e.g.
    /// `points row 7 -> datasets`.
    pub orphans: Vec<String>,
    /// Datasets, Henry's-law records or freezing data citing a source that is not stored.
    pub without_source: Vec<String>,
    /// Datasets with no points.
    pub empty: Vec<String>,
    pub outliers: Vec<Finding>,
    pub conflicts: Vec<Finding>,
    /// Records not yet reviewed (retired datasets not counted).
    pub unreviewed_datasets: usize,
    pub unreviewed_gas_constants: usize,
    pub unreviewed_freezing: usize,
    pub retired_datasets: usize,
    pub datasets: usize,
    /// Corroboration coverage and the solutes with curves over 0–40 °C.
    pub corroboration: super::corroboration::Coverage,
}

impl CheckReport {
    /// Problems that make `satline check` exit with 1. Unreviewed data are counted, not
    /// problems: a new reference is unreviewed until someone checks it.
    pub fn problems(&self) -> usize {
        self.integrity.len()
            + self.orphans.len()
            + self.without_source.len()
            + self.empty.len()
            + self.outliers.len()
            + self.conflicts.len()
            + self.corroboration.problems()
    }

    /// The report for people.
    pub fn write(&self, out: &mut dyn Write) -> std::io::Result<()> {
        let section = |out: &mut dyn Write, title: &str, lines: &[String]| {
            if lines.is_empty() {
                writeln!(out, "{title}: none")
            } else {
                writeln!(out, "{title}: {}", lines.len())?;
                lines.iter().try_for_each(|l| writeln!(out, "  {l}"))
            }
        };
        let integrity = if self.integrity.is_empty() {
            vec![]
        } else {
            self.integrity.clone()
        };
        if integrity.is_empty() {
            writeln!(out, "integrity: ok")?;
        } else {
            section(out, "integrity problems", &integrity)?;
        }
        section(out, "orphan rows", &self.orphans)?;
        section(out, "records without a source", &self.without_source)?;
        section(out, "datasets without points", &self.empty)?;
        let messages = |f: &[Finding]| f.iter().map(|f| f.message.clone()).collect::<Vec<_>>();
        section(out, "outliers", &messages(&self.outliers))?;
        section(out, "conflicts", &messages(&self.conflicts))?;
        writeln!(
            out,
            "unreviewed: {} of {} datasets, {} Henry's-law records, {} freezing tables ({} datasets retired)",
            self.unreviewed_datasets,
            self.datasets,
            self.unreviewed_gas_constants,
            self.unreviewed_freezing,
            self.retired_datasets
        )?;
        self.corroboration.write(out)?;
        match self.problems() {
            0 => writeln!(out, "no problems found"),
            n => writeln!(out, "{n} problem(s) found"),
        }
    }
}

fn strings(store: &Store, sql: &str) -> Result<Vec<String>, StoreError> {
    let mut stmt = store.conn.prepare(sql)?;
    let rows = stmt.query_map([], |r| r.get::<_, String>(0))?;
    Ok(rows.collect::<Result<_, _>>()?)
}

impl Store {
    /// Checks the whole database; `tolerance` is the conflict tolerance (0.05 for 5 %).
    pub fn check(&self, tolerance: f64) -> Result<CheckReport, StoreError> {
        let mut report = CheckReport {
            integrity: strings(self, "PRAGMA integrity_check")?
                .into_iter()
                .filter(|l| l != "ok")
                .collect(),
            ..CheckReport::default()
        };
        let mut stmt = self.conn.prepare("PRAGMA foreign_key_check")?;
        let rows = stmt.query_map([], |r| {
            Ok(format!(
                "{} row {} -> {}",
                r.get::<_, String>(0)?,
                r.get::<_, Option<i64>>(1)?
                    .map_or("?".to_string(), |v| v.to_string()),
                r.get::<_, String>(2)?
            ))
        })?;
        report.orphans = rows.collect::<Result<_, _>>()?;
        report.without_source = strings(
            self,
            "SELECT 'dataset ' || key || ' cites ' || quote(source) FROM datasets
                 WHERE source IS NULL OR source NOT IN (SELECT key FROM sources)
             UNION ALL
             SELECT 'henry ' || key || ' cites ' || quote(source) FROM gas_constants
                 WHERE source IS NULL OR source NOT IN (SELECT key FROM sources)
             UNION ALL
             SELECT 'freezing ' || key || ' cites ' || quote(source) FROM freezing
                 WHERE source IS NULL OR source NOT IN (SELECT key FROM sources)",
        )?;
        report.empty = strings(
            self,
            "SELECT key FROM datasets WHERE key NOT IN (SELECT dataset FROM points) ORDER BY key",
        )?;

        let contents = self.read_all()?;
        report.corroboration = super::corroboration::coverage(&contents);
        report.datasets = contents.datasets.len();
        let live: Vec<_> = contents
            .datasets
            .iter()
            .filter(|d| !d.retired && d.review != Review::Rejected)
            .collect();
        report.retired_datasets = contents.datasets.iter().filter(|d| d.retired).count();
        report.unreviewed_datasets = contents
            .datasets
            .iter()
            .filter(|d| !d.retired && d.review == Review::Unreviewed)
            .count();
        report.unreviewed_gas_constants = contents
            .gas_constants
            .iter()
            .filter(|g| g.review == Review::Unreviewed)
            .count();
        report.unreviewed_freezing = contents
            .freezing
            .iter()
            .filter(|f| f.data.review == Review::Unreviewed)
            .count();
        for (i, d) in live.iter().enumerate() {
            let Some(solute) = contents.solutes.iter().find(|s| s.id == d.solute) else {
                continue;
            };
            report
                .outliers
                .extend(findings::outliers(d, solute.molar_mass));
            // Each pair once, looked at from whichever side has points inside the other.
            for o in live.iter().skip(i + 1) {
                report.conflicts.extend(
                    findings::conflict(d, o, solute, tolerance)
                        .or_else(|| findings::conflict(o, d, solute, tolerance)),
                );
            }
        }
        Ok(report)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn an_empty_database_has_no_problems() {
        let store = Store::open_in_memory().unwrap();
        let report = store.check(0.05).unwrap();
        assert_eq!(report.problems(), 0, "{report:?}");
        let mut text = Vec::new();
        report.write(&mut text).unwrap();
        assert!(String::from_utf8(text).unwrap().contains("integrity: ok"));
    }
}
