//! Writing and reading the thermochemical tables (`thermo_values`,
//! `laliberte_heat_capacity`, schema/000N_thermochemistry.sql). Parameterised SQL only.

use rusqlite::{Connection, Transaction, params};

use super::StoreError;
use super::read::{corrupt, records, word_at};
use crate::model::thermo::{
    HeatCapacityFit, ThermoQuantity, ThermoState, ThermoValue, Thermochemistry,
};

/// Writes every record (the tables are expected empty: a fresh seed load).
pub(crate) fn write(tx: &Transaction<'_>, thermo: &Thermochemistry) -> Result<(), StoreError> {
    for v in &thermo.values {
        insert_value(tx, v)?;
    }
    for h in &thermo.heat_capacity {
        upsert_heat_capacity(tx, h)?;
    }
    Ok(())
}

/// Adds one value.
pub(crate) fn insert_value(conn: &Connection, v: &ThermoValue) -> Result<(), StoreError> {
    conn.prepare_cached(
        "INSERT INTO thermo_values
           (file, quantity, state, stage, species, value, unit, source, provenance, review, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11)",
    )?
    .execute(params![
        v.file,
        v.quantity.as_str(),
        v.state.map(ThermoState::as_str),
        v.stage,
        v.species,
        v.value,
        v.quantity.unit(),
        v.source,
        v.provenance.as_str(),
        v.review.as_str(),
        v.note,
    ])?;
    Ok(())
}

/// Adds one set of Laliberté's heat-capacity coefficients, or updates the solute's set in
/// place.
pub(crate) fn upsert_heat_capacity(
    conn: &Connection,
    h: &HeatCapacityFit,
) -> Result<(), StoreError> {
    conn.prepare_cached(
        "INSERT INTO laliberte_heat_capacity
           (solute, file, a1, a2, a3, a4, a5, a6, t_min_c, t_max_c, w_max, source, provenance, review, note)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15)
         ON CONFLICT (solute) DO UPDATE SET file = excluded.file, a1 = excluded.a1,
           a2 = excluded.a2, a3 = excluded.a3, a4 = excluded.a4, a5 = excluded.a5,
           a6 = excluded.a6, t_min_c = excluded.t_min_c, t_max_c = excluded.t_max_c,
           w_max = excluded.w_max, source = excluded.source,
           provenance = excluded.provenance, review = excluded.review, note = excluded.note",
    )?
    .execute(params![
        h.solute,
        h.file,
        h.a[0],
        h.a[1],
        h.a[2],
        h.a[3],
        h.a[4],
        h.a[5],
        h.t_min_c,
        h.t_max_c,
        h.w_max,
        h.source,
        h.provenance.as_str(),
        h.review.as_str(),
        h.note,
    ])?;
    Ok(())
}

/// Reads every record, in the order written.
pub(crate) fn read(conn: &Connection) -> Result<Thermochemistry, StoreError> {
    let values = records(
        conn,
        "SELECT file, quantity, state, stage, species, value, source, provenance, review, note
         FROM thermo_values ORDER BY id",
        [],
        |r| {
            let quantity: String = r.get(1)?;
            let quantity = ThermoQuantity::from_name(&quantity)
                .ok_or_else(|| corrupt(format!("thermo_values: unknown quantity {quantity:?}")))?;
            let state = match r.get::<_, Option<String>>(2)? {
                Some(s) => Some(
                    ThermoState::from_name(&s)
                        .ok_or_else(|| corrupt(format!("thermo_values: unknown state {s:?}")))?,
                ),
                None => None,
            };
            Ok(ThermoValue {
                file: r.get(0)?,
                quantity,
                state,
                stage: r.get(3)?,
                species: r.get(4)?,
                value: r.get(5)?,
                source: r.get(6)?,
                provenance: word_at(r, 7)?,
                review: word_at(r, 8)?,
                note: r.get(9)?,
            })
        },
    )?;
    let heat_capacity = records(
        conn,
        "SELECT solute, file, a1, a2, a3, a4, a5, a6, t_min_c, t_max_c, w_max, source,
                provenance, review, note
         FROM laliberte_heat_capacity ORDER BY rowid",
        [],
        |r| {
            let mut a = [0.0; 6];
            for (i, x) in a.iter_mut().enumerate() {
                *x = r.get(2 + i)?;
            }
            Ok(HeatCapacityFit {
                solute: r.get(0)?,
                file: r.get(1)?,
                a,
                t_min_c: r.get(8)?,
                t_max_c: r.get(9)?,
                w_max: r.get(10)?,
                source: r.get(11)?,
                provenance: word_at(r, 12)?,
                review: word_at(r, 13)?,
                note: r.get(14)?,
            })
        },
    )?;
    Ok(Thermochemistry {
        values,
        heat_capacity,
    })
}
