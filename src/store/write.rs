//! Writing one record at a time: the inserts, replacements and updates that seed loading and
//! the librarian's commands share. Every function runs inside a transaction its caller owns,
//! so a failure anywhere rolls the whole change back.

use rusqlite::{Connection, params};

use super::StoreError;
use super::read::FreezingRecord;
use crate::model::{Dataset, GasConstant, GasLaw, Solute, Source};

/// Inserts a source, or replaces every field of the source with the same key.
pub(crate) fn upsert_source(conn: &Connection, s: &Source) -> Result<(), StoreError> {
    let mut stmt = conn.prepare_cached(
        "INSERT INTO sources (key, kind, title, authors, publisher, edition, year, locator, doi, isbn, url, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12)
         ON CONFLICT (key) DO UPDATE SET kind = excluded.kind, title = excluded.title,
             authors = excluded.authors, publisher = excluded.publisher, edition = excluded.edition,
             year = excluded.year, locator = excluded.locator, doi = excluded.doi,
             isbn = excluded.isbn, url = excluded.url, note = excluded.note",
    )?;
    stmt.execute(params![
        s.key,
        s.kind.as_str(),
        s.title,
        s.authors,
        s.publisher,
        s.edition,
        s.year,
        s.locator,
        s.doi,
        s.isbn,
        s.url,
        s.note
    ])?;
    Ok(())
}

/// Inserts a solute, or replaces the solute with the same id (its synonyms and tags too).
/// Its datasets are untouched: they refer to the id, which does not change.
pub(crate) fn upsert_solute(conn: &Connection, s: &Solute) -> Result<(), StoreError> {
    let mut stmt = conn.prepare_cached(
        "INSERT INTO solutes (id, name, formula, kind, molar_mass, cation, anion, ions, hazard)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9)
         ON CONFLICT (id) DO UPDATE SET name = excluded.name, formula = excluded.formula,
             kind = excluded.kind, molar_mass = excluded.molar_mass, cation = excluded.cation,
             anion = excluded.anion, ions = excluded.ions, hazard = excluded.hazard",
    )?;
    stmt.execute(params![
        s.id,
        s.name,
        s.formula,
        s.kind.as_str(),
        s.molar_mass,
        s.cation,
        s.anion,
        s.ions,
        s.hazard
    ])?;
    conn.prepare_cached("DELETE FROM solute_synonyms WHERE solute = ?1")?
        .execute(params![s.id])?;
    conn.prepare_cached("DELETE FROM solute_tags WHERE solute = ?1")?
        .execute(params![s.id])?;
    let mut insert_synonym = conn.prepare_cached(
        "INSERT INTO solute_synonyms (solute, position, synonym) VALUES (?1, ?2, ?3)",
    )?;
    for (i, syn) in s.synonyms.iter().enumerate() {
        insert_synonym.execute(params![s.id, i as i64, syn])?;
    }
    let mut insert_tag =
        conn.prepare_cached("INSERT INTO solute_tags (solute, position, tag) VALUES (?1, ?2, ?3)")?;
    for (i, tag) in s.tags.iter().enumerate() {
        insert_tag.execute(params![s.id, i as i64, tag])?;
    }
    Ok(())
}

/// Inserts a dataset and its points; an existing dataset with the same key is replaced
/// (its old points go with it; the caller keeps the old version in the audit history).
/// `tick` is called once per point written, for a progress bar.
pub(crate) fn replace_dataset(
    conn: &Connection,
    d: &Dataset,
    tick: &mut dyn FnMut(),
) -> Result<(), StoreError> {
    conn.prepare_cached("DELETE FROM datasets WHERE key = ?1")?
        .execute(params![d.key])?;
    conn.prepare_cached(
        "INSERT INTO phases (formula, name, water) VALUES (?1, ?2, ?3)
         ON CONFLICT (formula, name) DO NOTHING",
    )?
    .execute(params![d.phase.formula, d.phase.name, d.phase.water])?;
    let phase: i64 = conn
        .prepare_cached("SELECT id FROM phases WHERE formula = ?1 AND name = ?2")?
        .query_row(params![d.phase.formula, d.phase.name], |r| r.get(0))?;
    conn.prepare_cached(
        "INSERT INTO datasets (key, solute, solvent, phase, source, unit, temperature_unit, provenance, review, retired, note,
                               stable_low_reported, stable_high_reported, stable_low_k, stable_high_k)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15)",
    )?
    .execute(params![
        d.key,
        d.solute,
        d.solvent,
        phase,
        d.source,
        d.unit,
        d.temperature_unit,
        d.provenance.as_str(),
        d.review.as_str(),
        d.retired,
        d.note,
        d.stable_range.map(|r| r.0),
        d.stable_range.map(|r| r.1),
        d.stable_range_k.map(|r| r.0),
        d.stable_range_k.map(|r| r.1)
    ])?;
    let mut insert_point = conn.prepare_cached(
        "INSERT INTO points (dataset, position, temperature_reported, temperature_k, value_reported, mass_fraction, uncertainty)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7)",
    )?;
    for (i, p) in d.points.iter().enumerate() {
        insert_point.execute(params![
            d.key,
            i as i64,
            p.temperature_reported,
            p.temperature_k,
            p.value_reported,
            p.mass_fraction,
            p.uncertainty
        ])?;
        tick();
    }
    Ok(())
}

/// Inserts a Henry's-law record, replacing one with the same key.
pub(crate) fn replace_gas_constant(conn: &Connection, g: &GasConstant) -> Result<(), StoreError> {
    conn.prepare_cached("DELETE FROM gas_constants WHERE key = ?1")?
        .execute(params![g.key])?;
    let mut insert_gas = conn.prepare_cached(
        "INSERT INTO gas_constants (key, solute, source, form, convention, value, reference_temperature_k, temperature_term_k,
                                    a, b, c, d, scale_k, reference_pressure_pa, t_min_k, t_max_k, provenance, review, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17, ?18, ?19)",
    )?;
    let (form, vant_hoff, fit) = match &g.law {
        GasLaw::VantHoff(h) => ("vant-hoff", Some(h), None),
        GasLaw::Fit(fit) => (fit.quantity.as_str(), None, Some(fit)),
    };
    insert_gas.execute(params![
        g.key,
        g.solute,
        g.source,
        form,
        vant_hoff.map(|h| &h.convention),
        vant_hoff.map(|h| h.value),
        vant_hoff.map(|h| h.reference_temperature_k),
        vant_hoff.map(|h| h.temperature_term_k),
        fit.map(|f| f.a),
        fit.map(|f| f.b),
        fit.map(|f| f.c),
        fit.map(|f| f.d),
        fit.map(|f| f.scale_k),
        fit.map(|f| f.reference_pressure_pa),
        fit.map(|f| f.t_min_k),
        fit.map(|f| f.t_max_k),
        g.provenance.as_str(),
        g.review.as_str(),
        g.note
    ])?;
    Ok(())
}

/// Inserts a solute's freezing data and its points, replacing a record with the same key.
pub(crate) fn replace_freezing(conn: &Connection, f: &FreezingRecord) -> Result<(), StoreError> {
    let d = &f.data;
    conn.prepare_cached("DELETE FROM freezing WHERE key = ?1")?
        .execute(params![d.key])?;
    conn.prepare_cached(
        "INSERT INTO freezing (key, solute, source, unit, temperature_unit, provenance, review,
                               eutectic_composition_reported, eutectic_temperature_reported,
                               eutectic_mass_fraction, eutectic_temperature_k, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12)",
    )?
    .execute(params![
        d.key,
        d.solute,
        d.source,
        f.unit,
        f.temperature_unit,
        d.provenance.as_str(),
        d.review.as_str(),
        f.eutectic_reported.map(|e| e.0),
        f.eutectic_reported.map(|e| e.1),
        d.eutectic.map(|e| e.0),
        d.eutectic.map(|e| e.1),
        f.note
    ])?;
    let mut insert_point = conn.prepare_cached(
        "INSERT INTO freezing_points (freezing, position, composition_reported, temperature_reported, mass_fraction, temperature_k)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6)",
    )?;
    for (i, (rep, can)) in f.points_reported.iter().zip(&d.points).enumerate() {
        insert_point.execute(params![d.key, i as i64, rep.0, rep.1, can.0, can.1])?;
    }
    Ok(())
}
