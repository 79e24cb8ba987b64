//! Reading the whole reference back out of SQLite into the model records, in one read
//! transaction so the snapshot is consistent.

use std::collections::HashMap;

use rusqlite::{Connection, Params, Row};
use serde::Serialize;

use super::StoreError;
use crate::model::{
    Dataset, DensityCoefficients, FitQuantity, FreezingData, GasConstant, GasFit, GasLaw, Phase,
    Point, Solute, Source, UnknownWord, VantHoffLaw,
};

/// A (composition, temperature) pair.
pub(crate) type Pair = (f64, f64);

/// Tabulated freezing points with the values as the source reported them.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FreezingRecord {
    /// Canonical form: mass fraction and kelvin.
    pub data: FreezingData,
    /// Composition unit of the reported points, e.g. `%w/w`.
    pub unit: String,
    /// Temperature unit of the reported points: `C`, `K` or `F`.
    pub temperature_unit: String,
    /// (composition, temperature) as reported, in the same order as `data.points`.
    pub points_reported: Vec<(f64, f64)>,
    /// The eutectic as reported.
    pub eutectic_reported: Option<(f64, f64)>,
    pub note: Option<String>,
}

/// Everything a store holds, in key order: sources by key, solutes by id, datasets (retired
/// ones included), gas constants and freezing data by key.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Contents {
    pub sources: Vec<Source>,
    pub solutes: Vec<Solute>,
    pub datasets: Vec<Dataset>,
    pub gas_constants: Vec<GasConstant>,
    pub freezing: Vec<FreezingRecord>,
    /// Solution-density coefficients, by solute id.
    pub densities: Vec<DensityCoefficients>,
    /// Corroboration checks, by key (see [`super::corroboration`]).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub checks: Vec<crate::model::Check>,
    /// Enthalpies of formation and hydration, radii, ionisation energies and heat-capacity
    /// coefficients (`thermochemistry/` in the seed; exported and imported like the rest).
    #[serde(
        default,
        skip_serializing_if = "crate::model::thermo::Thermochemistry::is_empty"
    )]
    pub thermochemistry: crate::model::thermo::Thermochemistry,
}

impl Contents {
    /// Puts every list in the order the store reads it back in.
    pub fn sort(&mut self) {
        self.sources.sort_by(|a, b| a.key.cmp(&b.key));
        self.solutes.sort_by(|a, b| a.id.cmp(&b.id));
        self.datasets.sort_by(|a, b| a.key.cmp(&b.key));
        self.gas_constants.sort_by(|a, b| a.key.cmp(&b.key));
        self.freezing.sort_by(|a, b| a.data.key.cmp(&b.data.key));
        self.densities.sort_by(|a, b| a.solute.cmp(&b.solute));
        self.checks.sort_by(|a, b| a.key.cmp(&b.key));
    }
}

pub(super) fn corrupt(what: String) -> StoreError {
    StoreError::Corrupt {
        location: "database".to_string(),
        what,
    }
}

/// A stored word of one of the model's enum ↔ text tables; another word means a damaged
/// database.
pub(crate) fn word<T: std::str::FromStr<Err = UnknownWord>>(s: &str) -> Result<T, StoreError> {
    s.parse().map_err(|e: UnknownWord| corrupt(e.to_string()))
}

/// The word in column `i` of `r` (see [`word`]).
pub(crate) fn word_at<T: std::str::FromStr<Err = UnknownWord>>(
    r: &Row<'_>,
    i: usize,
) -> Result<T, StoreError> {
    word(&r.get::<_, String>(i)?)
}

/// Every row `sql` selects with `params`, each made a record by `record` (which may find
/// the row damaged), in the order selected.
pub(crate) fn records<T>(
    conn: &Connection,
    sql: &str,
    params: impl Params,
    mut record: impl FnMut(&Row<'_>) -> Result<T, StoreError>,
) -> Result<Vec<T>, StoreError> {
    let mut stmt = conn.prepare_cached(sql)?;
    let mut rows = stmt.query(params)?;
    let mut out = Vec::new();
    while let Some(r) = rows.next()? {
        out.push(record(r)?);
    }
    Ok(out)
}

/// The lists `sql` selects as (solute id, item) rows in order, by solute.
fn by_solute(conn: &Connection, sql: &str) -> Result<HashMap<String, Vec<String>>, StoreError> {
    let mut lists: HashMap<String, Vec<String>> = HashMap::new();
    for (solute, item) in records(conn, sql, [], |r| Ok((r.get(0)?, r.get(1)?)))? {
        lists.entry(solute).or_default().push(item);
    }
    Ok(lists)
}

fn missing(key: &str, column: &str) -> StoreError {
    corrupt(format!("gas constant \"{key}\" lacks {column}"))
}

/// Two nullable columns that are given together.
fn pair(r: &rusqlite::Row<'_>, i: usize, j: usize) -> rusqlite::Result<Option<Pair>> {
    Ok(
        match (r.get::<_, Option<f64>>(i)?, r.get::<_, Option<f64>>(j)?) {
            (Some(a), Some(b)) => Some((a, b)),
            _ => None,
        },
    )
}

/// Reads every table into [`Contents`].
pub(crate) fn read_all(conn: &Connection) -> Result<Contents, StoreError> {
    if !conn.is_autocommit() {
        // Inside a write transaction (an import planning where it applies): that
        // transaction is the snapshot.
        return read_inside(conn);
    }
    // A deferred transaction that only reads: one consistent snapshot, even under WAL.
    conn.execute_batch("BEGIN")?;
    let result = read_inside(conn);
    let end = conn.execute_batch("COMMIT");
    let contents = result?;
    end?;
    Ok(contents)
}

fn read_inside(conn: &Connection) -> Result<Contents, StoreError> {
    let mut contents = Contents {
        thermochemistry: super::thermo_rows::read(conn)?,
        ..Contents::default()
    };

    contents.sources = records(
        conn,
        "SELECT key, kind, title, authors, publisher, edition, year, locator, doi, isbn, url, note
         FROM sources ORDER BY key",
        [],
        |r| {
            Ok(Source {
                key: r.get(0)?,
                kind: word_at(r, 1)?,
                title: r.get(2)?,
                authors: r.get(3)?,
                publisher: r.get(4)?,
                edition: r.get(5)?,
                year: r.get(6)?,
                locator: r.get(7)?,
                doi: r.get(8)?,
                isbn: r.get(9)?,
                url: r.get(10)?,
                note: r.get(11)?,
            })
        },
    )?;

    let mut synonyms = by_solute(
        conn,
        "SELECT solute, synonym FROM solute_synonyms ORDER BY solute, position",
    )?;
    let mut tags = by_solute(
        conn,
        "SELECT solute, tag FROM solute_tags ORDER BY solute, position",
    )?;
    contents.solutes = records(
        conn,
        "SELECT id, name, formula, kind, molar_mass, cation, anion, ions, hazard FROM solutes ORDER BY id",
        [],
        |r| {
            let id: String = r.get(0)?;
            Ok(Solute {
                synonyms: synonyms.remove(&id).unwrap_or_default(),
                tags: tags.remove(&id).unwrap_or_default(),
                name: r.get(1)?,
                formula: r.get(2)?,
                kind: word_at(r, 3)?,
                molar_mass: r.get(4)?,
                cation: r.get(5)?,
                anion: r.get(6)?,
                ions: r.get(7)?,
                hazard: r.get(8)?,
                id,
            })
        },
    )?;

    let mut points: HashMap<String, Vec<Point>> = HashMap::new();
    for (dataset, point) in records(
        conn,
        "SELECT dataset, temperature_reported, temperature_k, value_reported, mass_fraction, uncertainty
         FROM points ORDER BY dataset, position",
        [],
        |r| {
            let point = Point {
                temperature_reported: r.get(1)?,
                temperature_k: r.get(2)?,
                value_reported: r.get(3)?,
                mass_fraction: r.get(4)?,
                uncertainty: r.get(5)?,
            };
            Ok((r.get::<_, String>(0)?, point))
        },
    )? {
        points.entry(dataset).or_default().push(point);
    }

    contents.datasets = records(
        conn,
        "SELECT d.key, d.solute, d.solvent, p.formula, p.name, p.water, d.source, d.unit,
                d.temperature_unit, d.provenance, d.review, d.retired, d.note,
                d.stable_low_reported, d.stable_high_reported, d.stable_low_k, d.stable_high_k
         FROM datasets d JOIN phases p ON p.id = d.phase ORDER BY d.key",
        [],
        |r| {
            let key: String = r.get(0)?;
            Ok(Dataset {
                points: points.remove(&key).unwrap_or_default(),
                solute: r.get(1)?,
                solvent: r.get(2)?,
                phase: Phase {
                    formula: r.get(3)?,
                    name: r.get(4)?,
                    water: r.get(5)?,
                },
                source: r.get(6)?,
                unit: r.get(7)?,
                temperature_unit: r.get(8)?,
                provenance: word_at(r, 9)?,
                review: word_at(r, 10)?,
                retired: r.get(11)?,
                note: r.get(12)?,
                stable_range: pair(r, 13, 14)?,
                stable_range_k: pair(r, 15, 16)?,
                key,
            })
        },
    )?;

    contents.gas_constants = records(
        conn,
        "SELECT key, solute, source, form, convention, value, reference_temperature_k, temperature_term_k,
                a, b, c, d, scale_k, reference_pressure_pa, t_min_k, t_max_k, provenance, review, note
         FROM gas_constants ORDER BY key",
        [],
        |r| {
            let key: String = r.get(0)?;
            let form: String = r.get(3)?;
            let f = |i: usize, name: &str| -> Result<f64, StoreError> {
                r.get::<_, Option<f64>>(i)?
                    .ok_or_else(|| missing(&key, name))
            };
            let law = match (form.as_str(), FitQuantity::from_name(&form)) {
                ("vant-hoff", _) => GasLaw::VantHoff(VantHoffLaw {
                    convention: r
                        .get::<_, Option<String>>(4)?
                        .ok_or_else(|| missing(&key, "convention"))?,
                    value: f(5, "value")?,
                    reference_temperature_k: f(6, "reference_temperature_k")?,
                    temperature_term_k: f(7, "temperature_term_k")?,
                }),
                (_, Some(quantity)) => GasLaw::Fit(GasFit {
                    quantity,
                    a: f(8, "a")?,
                    b: f(9, "b")?,
                    c: f(10, "c")?,
                    d: f(11, "d")?,
                    scale_k: f(12, "scale_k")?,
                    reference_pressure_pa: f(13, "reference_pressure_pa")?,
                    t_min_k: f(14, "t_min_k")?,
                    t_max_k: f(15, "t_max_k")?,
                }),
                (other, None) => return Err(corrupt(format!("gas constant form \"{other}\""))),
            };
            Ok(GasConstant {
                solute: r.get(1)?,
                source: r.get(2)?,
                law,
                provenance: word_at(r, 16)?,
                review: word_at(r, 17)?,
                note: r.get(18)?,
                key,
            })
        },
    )?;

    let mut freezing_points: HashMap<String, Vec<(Pair, Pair)>> = HashMap::new();
    for (key, pair) in records(
        conn,
        "SELECT freezing, composition_reported, temperature_reported, mass_fraction, temperature_k
         FROM freezing_points ORDER BY freezing, position",
        [],
        |r| {
            let pair = ((r.get(1)?, r.get(2)?), (r.get(3)?, r.get(4)?));
            Ok((r.get::<_, String>(0)?, pair))
        },
    )? {
        freezing_points.entry(key).or_default().push(pair);
    }
    contents.freezing = records(
        conn,
        "SELECT key, solute, source, unit, temperature_unit, provenance, review,
                eutectic_composition_reported, eutectic_temperature_reported,
                eutectic_mass_fraction, eutectic_temperature_k, note
         FROM freezing ORDER BY key",
        [],
        |r| {
            let key: String = r.get(0)?;
            let pairs = freezing_points.remove(&key).unwrap_or_default();
            let both = |i, j| pair(r, i, j);
            Ok(FreezingRecord {
                unit: r.get(3)?,
                temperature_unit: r.get(4)?,
                points_reported: pairs.iter().map(|p| p.0).collect(),
                eutectic_reported: both(7, 8)?,
                note: r.get(11)?,
                data: FreezingData {
                    solute: r.get(1)?,
                    source: r.get(2)?,
                    points: pairs.iter().map(|p| p.1).collect(),
                    eutectic: both(9, 10)?,
                    provenance: word_at(r, 5)?,
                    review: word_at(r, 6)?,
                    key,
                },
            })
        },
    )?;
    contents.densities = super::density::read(conn)?;
    contents.checks = super::corroboration::read_checks(conn)?;
    Ok(contents)
}
