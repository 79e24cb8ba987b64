//! Imports of the thermochemical records (`thermochemistry/*.toml`): which incoming values
//! and heat-capacity sets are new, changed or unchanged against the store, and the write of
//! one record (updated in place, so an export keeps its order). Every change gets its audit
//! row from the import that applies it: `thermo:<quantity>/<state>/<stage>/<species>/<source>`
//! for a value, `heat-capacity:<solute>` for a set of Laliberté's coefficients.

use rusqlite::{Connection, params};

use super::StoreError;
use super::import::{
    ImportPlan, Record, RecordKind, Reviewed, plan_records, state_aside, summary_citing,
};
use crate::model::Review;
use crate::model::thermo::{HeatCapacityFit, ThermoState, ThermoValue, Thermochemistry};

/// True when `text` reads as a thermochemistry seed file (its tables are `group` and
/// `heat_capacity` only), whatever the file is called.
pub fn is_thermo_text(text: &str) -> bool {
    toml::from_str::<toml::Table>(text)
        .is_ok_and(|t| !t.is_empty() && t.keys().all(|k| k == "group" || k == "heat_capacity"))
}

/// One incoming thermochemical record.
#[derive(Debug, Clone)]
pub(crate) enum ThermoRecord {
    Value(ThermoValue),
    HeatCapacity(HeatCapacityFit),
}

/// A value's identity: `<quantity>/<state>/<stage>/<species>/<source>`.
fn value_key(v: &ThermoValue) -> String {
    format!(
        "{}/{}/{}/{}/{}",
        v.quantity.as_str(),
        v.state.map_or("-", ThermoState::as_str),
        v.stage.map_or_else(|| "-".to_string(), |s| s.to_string()),
        v.species,
        v.source
    )
}

/// The incoming records as the import would write them: as the file has them with
/// `keep_state`, else unreviewed.
fn arriving<T: Reviewed>(records: &[T], keep_state: bool) -> Vec<T> {
    records
        .iter()
        .map(|r| {
            if keep_state {
                r.clone()
            } else {
                r.with_review(Review::Unreviewed)
            }
        })
        .collect()
}

/// Adds the changes `incoming` makes to `existing` to `plan`. Without `keep_state` every
/// incoming record arrives unreviewed and a stored record's review is not counted as a
/// difference. A value's identity is its entity (quantity, state, stage, species, source:
/// the table's unique key).
pub(crate) fn plan(
    plan: &mut ImportPlan,
    incoming: &Thermochemistry,
    existing: &Thermochemistry,
    keep_state: bool,
) {
    plan_records(
        plan,
        &arriving(&incoming.values, keep_state),
        &existing.values,
        RecordKind {
            entity: "thermo",
            key: value_key,
            summary: |v| {
                let unit = v.quantity.unit();
                format!("{} {unit} {}, {}", v.value, v.species, v.review.as_str())
            },
            kind: state_aside(keep_state),
            record: |v| Record::Thermo(ThermoRecord::Value(v)),
        },
    );
    plan_records(
        plan,
        &arriving(&incoming.heat_capacity, keep_state),
        &existing.heat_capacity,
        RecordKind {
            entity: "heat-capacity",
            key: |h: &HeatCapacityFit| h.solute.clone(),
            summary: |h| {
                summary_citing("Laliberté heat-capacity coefficients", h.review, &h.source)
            },
            kind: state_aside(keep_state),
            record: |h| Record::Thermo(ThermoRecord::HeatCapacity(h)),
        },
    );
}

/// Writes one record: the stored one of the same identity is updated in place, else the
/// record is added.
pub(crate) fn write(conn: &Connection, record: &ThermoRecord) -> Result<(), StoreError> {
    match record {
        ThermoRecord::Value(v) => {
            let state = v.state.map(ThermoState::as_str);
            let updated = conn
                .prepare_cached(
                    "UPDATE thermo_values SET file = ?1, value = ?2, unit = ?3, provenance = ?4,
                       review = ?5, note = ?6
                     WHERE quantity = ?7 AND state IS ?8 AND stage IS ?9 AND species = ?10
                       AND source = ?11",
                )?
                .execute(params![
                    v.file,
                    v.value,
                    v.quantity.unit(),
                    v.provenance.as_str(),
                    v.review.as_str(),
                    v.note,
                    v.quantity.as_str(),
                    state,
                    v.stage,
                    v.species,
                    v.source,
                ])?;
            if updated == 0 {
                super::thermo_rows::insert_value(conn, v)?;
            }
        }
        ThermoRecord::HeatCapacity(h) => super::thermo_rows::upsert_heat_capacity(conn, h)?,
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thermo_files_are_known_by_their_tables() {
        assert!(is_thermo_text("[[group]]\nquantity = \"radius\"\n"));
        assert!(is_thermo_text("[[heat_capacity]]\nsolute = \"KCl\"\n"));
        assert!(!is_thermo_text("[[check]]\nkey = \"x\"\n"));
        assert!(!is_thermo_text("[[group]]\n[[dataset]]\n"));
        assert!(!is_thermo_text(""));
    }
}
