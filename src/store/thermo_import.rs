//! Imports of the thermochemical records (`thermochemistry/*.toml`): which incoming values
//! and heat-capacity sets are new, changed or unchanged against the store, and the write of
//! one record (updated in place, so an export keeps its order). Every change gets its audit
//! row from the import that applies it: `thermo:<quantity>/<state>/<stage>/<species>/<source>`
//! for a value, `heat-capacity:<solute>` for a set of Laliberté's coefficients.

use rusqlite::{Connection, params};

use super::StoreError;
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

/// A planned change of one record: `same` is `None` for a new record, else whether it equals
/// the stored one (review aside unless the import keeps states).
pub(crate) struct Planned {
    pub same: Option<bool>,
    pub entity: String,
    pub summary: String,
    pub before: Option<serde_json::Value>,
    pub after: serde_json::Value,
    pub record: ThermoRecord,
}

/// A record with another review state, for comparing what the figures say.
trait WithReview: Clone {
    fn with_review(&self, review: Review) -> Self;
}

impl WithReview for ThermoValue {
    fn with_review(&self, review: Review) -> Self {
        ThermoValue {
            review,
            ..self.clone()
        }
    }
}

impl WithReview for HeatCapacityFit {
    fn with_review(&self, review: Review) -> Self {
        HeatCapacityFit {
            review,
            ..self.clone()
        }
    }
}

fn json<T: serde::Serialize>(v: &T) -> serde_json::Value {
    serde_json::to_value(v).unwrap_or(serde_json::Value::Null)
}

/// The stored identity of a value (the table's unique key).
fn same_key(a: &ThermoValue, b: &ThermoValue) -> bool {
    a.quantity == b.quantity
        && a.state == b.state
        && a.stage == b.stage
        && a.species == b.species
        && a.source == b.source
}

fn value_entity(v: &ThermoValue) -> String {
    format!(
        "thermo:{}/{}/{}/{}/{}",
        v.quantity.as_str(),
        v.state.map_or("-", ThermoState::as_str),
        v.stage.map_or_else(|| "-".to_string(), |s| s.to_string()),
        v.species,
        v.source
    )
}

/// The changes `incoming` makes to `existing`. Without `keep_state` every incoming record
/// arrives unreviewed and a stored record's review is not counted as a difference.
pub(crate) fn plan(
    incoming: &Thermochemistry,
    existing: &Thermochemistry,
    keep_state: bool,
) -> Vec<Planned> {
    let mut out = Vec::new();
    for v in &incoming.values {
        let mut v = v.clone();
        if !keep_state {
            v.review = Review::Unreviewed;
        }
        let before = existing.values.iter().find(|b| same_key(b, &v));
        let same = before.map(|b| v == *b || (!keep_state && v.with_review(b.review) == *b));
        out.push(Planned {
            same,
            entity: value_entity(&v),
            summary: format!(
                "{} {} {}, {}",
                v.value,
                v.quantity.unit(),
                v.species,
                v.review.as_str()
            ),
            before: before.map(json),
            after: json(&v),
            record: ThermoRecord::Value(v),
        });
    }
    for h in &incoming.heat_capacity {
        let mut h = h.clone();
        if !keep_state {
            h.review = Review::Unreviewed;
        }
        let before = existing.heat_capacity.iter().find(|b| b.solute == h.solute);
        let same = before.map(|b| h == *b || (!keep_state && h.with_review(b.review) == *b));
        out.push(Planned {
            same,
            entity: format!("heat-capacity:{}", h.solute),
            summary: format!(
                "Laliberté heat-capacity coefficients, {}, source {}",
                h.review.as_str(),
                h.source
            ),
            before: before.map(json),
            after: json(&h),
            record: ThermoRecord::HeatCapacity(h),
        });
    }
    out
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
