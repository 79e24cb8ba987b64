//! The solution-density coefficients of the reference (`seed-data/densities.toml`, table
//! `density_coefficients`): parsing and validating the seed file, writing, reading back and
//! exporting. One set per solute, cited like every other number.

use std::collections::HashSet;
use std::fmt::Write as _;

use rusqlite::{Connection, params};
use serde::Deserialize;

use super::StoreError;
use super::read::{records, word_at};
use super::seed::{SeedProblem, first_use};
use crate::model::{DensityCoefficients, Provenance, Review};

/// The seed file's path relative to `seed-data/`.
pub const FILE: &str = "densities.toml";

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct DensitiesFile {
    #[serde(default)]
    density: Vec<RawDensity>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawDensity {
    solute: String,
    source: String,
    table_name: Option<String>,
    cas: Option<String>,
    c0: f64,
    c1: f64,
    c2: f64,
    c3: f64,
    c4: f64,
    t_min: f64,
    t_max: f64,
    w_max: f64,
    points: Option<u32>,
    provenance: Provenance,
    review: Review,
    note: Option<String>,
}

fn problem(record: &str, problem: SeedProblem) -> StoreError {
    StoreError::Seed {
        file: FILE.to_string(),
        record: record.to_string(),
        problem,
    }
}

fn out_of_range(record: &str, what: &str) -> StoreError {
    problem(
        record,
        SeedProblem::Syntax {
            message: what.to_string(),
        },
    )
}

/// Parses and validates `densities.toml`. Every set must cite a known source and name a
/// solute in `solutes` (the ids the seed or the database holds), once; its coefficients must
/// be finite, its temperature range not descending (one temperature for some sets) within
/// −55 °C to 200 °C (the published fits reach 140 °C under pressure) and its largest mass
/// fraction in (0, 1).
pub fn parse(
    text: &str,
    source_keys: &HashSet<&str>,
    solutes: &HashSet<&str>,
) -> Result<Vec<DensityCoefficients>, StoreError> {
    let raw: DensitiesFile = toml::from_str(text).map_err(|e| {
        problem(
            "whole file",
            SeedProblem::Syntax {
                message: e.message().to_string(),
            },
        )
    })?;
    let mut seen = HashSet::new();
    let mut out = Vec::with_capacity(raw.density.len());
    for d in raw.density {
        let record = format!("density of \"{}\"", d.solute);
        if !solutes.contains(d.solute.as_str()) {
            return Err(out_of_range(
                &record,
                &format!("unknown solute \"{}\" (no solutes/{0}.toml)", d.solute),
            ));
        }
        if !source_keys.contains(d.source.as_str()) {
            return Err(problem(
                &record,
                SeedProblem::UnknownSource { key: d.source },
            ));
        }
        first_use(
            &mut seen,
            FILE,
            &record,
            "density set for solute",
            &d.solute,
        )?;
        let c = [d.c0, d.c1, d.c2, d.c3, d.c4];
        if c.iter().any(|x| !x.is_finite()) {
            return Err(out_of_range(
                &record,
                "a coefficient is not a finite number",
            ));
        }
        // A set fitted at one temperature has t_min = t_max.
        if !(d.t_min >= -55.0 && d.t_max <= 200.0 && d.t_min <= d.t_max) {
            return Err(out_of_range(
                &record,
                &format!(
                    "temperature range {} C to {} C must not descend, within -55 C to 200 C",
                    d.t_min, d.t_max
                ),
            ));
        }
        // A liquid miscible with water (acetic acid) is fitted up to itself: w_max = 1.
        if !(d.w_max > 0.0 && d.w_max <= 1.0) {
            return Err(out_of_range(
                &record,
                &format!("w_max {} must be above 0 and at most 1", d.w_max),
            ));
        }
        out.push(DensityCoefficients {
            solute: d.solute,
            source: d.source,
            c,
            t_min_c: d.t_min,
            t_max_c: d.t_max,
            w_max: d.w_max,
            table_name: d.table_name.filter(|s| !s.trim().is_empty()),
            cas: d.cas.filter(|s| !s.trim().is_empty()),
            points: d.points,
            provenance: d.provenance,
            review: d.review,
            note: d.note.filter(|s| !s.trim().is_empty()),
        });
    }
    out.sort_by(|a, b| a.solute.cmp(&b.solute));
    Ok(out)
}

/// Inserts a solute's set, or replaces the one it has.
pub(crate) fn replace(conn: &Connection, d: &DensityCoefficients) -> Result<(), StoreError> {
    let mut stmt = conn.prepare_cached(
        "INSERT OR REPLACE INTO density_coefficients (solute, source, c0, c1, c2, c3, c4,
             t_min_c, t_max_c, w_max, table_name, cas, points, provenance, review, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16)",
    )?;
    stmt.execute(params![
        d.solute,
        d.source,
        d.c[0],
        d.c[1],
        d.c[2],
        d.c[3],
        d.c[4],
        d.t_min_c,
        d.t_max_c,
        d.w_max,
        d.table_name,
        d.cas,
        d.points,
        d.provenance.as_str(),
        d.review.as_str(),
        d.note,
    ])?;
    Ok(())
}

/// Every stored set, by solute id.
pub(crate) fn read(conn: &Connection) -> Result<Vec<DensityCoefficients>, StoreError> {
    records(
        conn,
        "SELECT solute, source, c0, c1, c2, c3, c4, t_min_c, t_max_c, w_max, table_name, cas,
                points, provenance, review, note
         FROM density_coefficients ORDER BY solute",
        [],
        |r| {
            Ok(DensityCoefficients {
                solute: r.get(0)?,
                source: r.get(1)?,
                c: [r.get(2)?, r.get(3)?, r.get(4)?, r.get(5)?, r.get(6)?],
                t_min_c: r.get(7)?,
                t_max_c: r.get(8)?,
                w_max: r.get(9)?,
                table_name: r.get(10)?,
                cas: r.get(11)?,
                points: r.get(12)?,
                provenance: word_at(r, 13)?,
                review: word_at(r, 14)?,
                note: r.get(15)?,
            })
        },
    )
}

/// The sets as a seed-format `densities.toml`, or `None` when there are none.
pub fn to_toml(sets: &[DensityCoefficients]) -> Option<String> {
    use super::export::number;
    if sets.is_empty() {
        return None;
    }
    let text = |s: &str| toml::Value::String(s.to_string()).to_string();
    let mut out =
        String::from("# Exported by satline: solution-density coefficients (Laliberté's model).\n");
    for d in sets {
        let _ = writeln!(out, "\n[[density]]");
        let _ = writeln!(out, "solute = {}", text(&d.solute));
        let _ = writeln!(out, "source = {}", text(&d.source));
        if let Some(name) = &d.table_name {
            let _ = writeln!(out, "table_name = {}", text(name));
        }
        if let Some(cas) = &d.cas {
            let _ = writeln!(out, "cas = {}", text(cas));
        }
        for (i, c) in d.c.iter().enumerate() {
            let _ = writeln!(out, "c{i} = {}", float(*c));
        }
        let _ = writeln!(out, "t_min = {}", float(d.t_min_c));
        let _ = writeln!(out, "t_max = {}", float(d.t_max_c));
        let _ = writeln!(out, "w_max = {}", float(d.w_max));
        if let Some(p) = d.points {
            let _ = writeln!(out, "points = {p}");
        }
        let _ = writeln!(out, "provenance = {}", text(d.provenance.as_str()));
        let _ = writeln!(out, "review = {}", text(d.review.as_str()));
        if let Some(note) = &d.note {
            let _ = writeln!(out, "note = {}", text(note));
        }
    }
    // A whole number written as `5` would read back as a TOML integer; floats need a point.
    fn float(v: f64) -> String {
        let s = number(v);
        if s.contains(['.', 'e', 'E']) || !v.is_finite() {
            s
        } else {
            format!("{s}.0")
        }
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    // Invented demo coefficients for the parser's tests: not reference values.
    const DEMO: &str = r#"
[[density]]
solute = "demo-salt"
source = "demo"
c0 = 1.0
c1 = 2.0
c2 = 3.0
c3 = 0.1
c4 = 100.0
t_min = 0
t_max = 80
w_max = 0.3
provenance = "derived"
review = "unreviewed"
"#;

    fn keys() -> (HashSet<&'static str>, HashSet<&'static str>) {
        (HashSet::from(["demo"]), HashSet::from(["demo-salt"]))
    }

    #[test]
    fn a_set_round_trips_through_the_export() {
        let (sources, solutes) = keys();
        let sets = parse(DEMO, &sources, &solutes).unwrap();
        assert_eq!(sets.len(), 1);
        let again = parse(&to_toml(&sets).unwrap(), &sources, &solutes).unwrap();
        assert_eq!(again, sets);
    }

    #[test]
    fn bad_sets_are_refused_with_the_reason() {
        let (sources, solutes) = keys();
        let cases = [
            (
                DEMO.replace("\"demo-salt\"", "\"nosuch\""),
                "unknown solute",
            ),
            (
                DEMO.replace("source = \"demo\"", "source = \"nope\""),
                "unknown source",
            ),
            (DEMO.replace("w_max = 0.3", "w_max = 1.5"), "w_max"),
            (DEMO.replace("t_max = 80", "t_max = -10"), "descend"),
            (format!("{DEMO}{DEMO}"), "duplicate"),
            (DEMO.replace("c4 =", "c5 ="), "unknown field"),
        ];
        for (text, want) in cases {
            let e = parse(&text, &sources, &solutes).unwrap_err().to_string();
            assert!(e.contains(want), "{want}: {e}");
        }
    }
}
