//! Adding and editing bibliographic records. A source is never deleted (datasets cite it);
//! each change is one transaction with its audit row, the record before and after.

use rusqlite::OptionalExtension as _;

use super::{Store, StoreError, audit, lock, write};
use crate::model::Source;
/// The change [`Store::save_source`] makes, defined beside the record it changes.
pub use crate::model::SourceFields;

fn bad(key: &str, reason: &str) -> StoreError {
    StoreError::Import {
        file: "command line".to_string(),
        record: format!("source \"{key}\""),
        problem: reason.to_string(),
    }
}

fn valid_key(key: &str) -> bool {
    !key.is_empty()
        && key
            .bytes()
            .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'-')
}

impl Store {
    fn source(&self, key: &str) -> Result<Option<Source>, StoreError> {
        let found = self
            .conn
            .query_row("SELECT key FROM sources WHERE key = ?1", [key], |r| {
                r.get::<_, String>(0)
            })
            .optional()?;
        Ok(match found {
            None => None,
            Some(_) => self.read_all()?.sources.into_iter().find(|s| s.key == key),
        })
    }

    /// Adds a source (`adding`: the key must be new, and `kind`, `title` and `authors` are
    /// needed) or changes the given fields of a stored one. One transaction with its audit
    /// row, the record before and after.
    pub fn save_source(
        &mut self,
        key: &str,
        fields: &SourceFields,
        adding: bool,
        actor: &str,
    ) -> Result<Source, StoreError> {
        // The write lock first: the checks below read the state this write replaces.
        let tx = lock::begin_write(&self.conn, &self.location)?;
        if adding && !valid_key(key) {
            return Err(bad(
                key,
                "not a valid key: use lower-case letters, digits and '-'",
            ));
        }
        let before = self.source(key)?;
        let mut s = match (adding, &before) {
            (true, Some(_)) => {
                return Err(StoreError::NoChange {
                    what: format!(
                        "source \"{key}\" exists already; change it with `satline source edit {key}`"
                    ),
                });
            }
            (false, None) => {
                return Err(StoreError::UnknownSourceKey {
                    key: key.to_string(),
                });
            }
            (false, Some(before)) => before.clone(),
            (true, None) => Source::new(
                key.to_string(),
                fields
                    .kind
                    .ok_or_else(|| bad(key, "a source needs --kind"))?,
                String::new(),
                String::new(),
            ),
        };
        fields.apply(&mut s);
        if s.title.is_empty() || s.authors.is_empty() {
            return Err(bad(
                key,
                if adding {
                    "a source needs --title and --authors"
                } else {
                    "a source's title and authors cannot be empty"
                },
            ));
        }
        if before.as_ref() == Some(&s) {
            return Err(StoreError::NoChange {
                what: format!("source \"{key}\" already reads so; nothing changed"),
            });
        }
        write::upsert_source(&tx, &s)?;
        let json = |s: &Source| serde_json::to_value(s).unwrap_or_default();
        audit::record(
            &tx,
            actor,
            if adding { "add" } else { "change" },
            &format!("source:{key}"),
            before.as_ref().map(json).as_ref(),
            Some(&json(&s)),
        )?;
        lock::commit(tx, &self.location)?;
        Ok(s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::SourceKind;

    #[test]
    fn add_then_edit_a_source() {
        let mut store = Store::open_in_memory().unwrap();
        let fields = SourceFields {
            kind: Some(SourceKind::Other),
            title: Some("Invented demo table".into()),
            authors: Some("nobody".into()),
            ..SourceFields::default()
        };
        store.save_source("demo", &fields, true, "t").unwrap();
        assert!(matches!(
            store.save_source("demo", &fields, true, "t"),
            Err(StoreError::NoChange { .. })
        ));
        let edited = store
            .save_source(
                "demo",
                &SourceFields {
                    year: Some(2020),
                    ..SourceFields::default()
                },
                false,
                "t",
            )
            .unwrap();
        assert_eq!(edited.year, Some(2020));
        assert_eq!(store.audit_len().unwrap(), 2);
        assert!(matches!(
            store.save_source("nope", &SourceFields::default(), false, "t"),
            Err(StoreError::UnknownSourceKey { .. })
        ));
    }
}
