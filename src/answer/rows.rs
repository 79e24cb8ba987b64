//! An answer's rows: a screening's compact table (rows by reference, [`ScreenTable`]) first,
//! then rows made whole. Printers walk them with [`Rows::each`], which makes each compact
//! row as it is reached, so a screening of 100,000 solutes is never held twice. Reading
//! them as a slice (`rows[0]`, `rows.iter()`) makes every row once and keeps them: handy in
//! tests and for small answers.

use std::borrow::Cow;
use std::ops::Deref;
use std::sync::OnceLock;

use serde::ser::{Serialize, SerializeSeq, Serializer};

use super::Row;
use super::screened::ScreenTable;

#[derive(Debug, Clone, Default)]
pub struct Rows {
    screened: Option<ScreenTable>,
    list: Vec<Row>,
    /// Every row made whole, on the first read as a slice of an answer with a table.
    whole: OnceLock<Vec<Row>>,
}

impl Rows {
    /// Rows that are all whole.
    pub fn new() -> Self {
        Rows::default()
    }

    /// Puts a screening's table before the rows made whole.
    pub fn set_table(&mut self, table: ScreenTable) {
        self.screened = Some(table);
        self.whole = OnceLock::new();
    }

    pub fn push(&mut self, row: Row) {
        self.list.push(row);
        self.whole = OnceLock::new();
    }

    pub fn extend(&mut self, rows: impl IntoIterator<Item = Row>) {
        self.list.extend(rows);
        self.whole = OnceLock::new();
    }

    pub fn reserve(&mut self, more: usize) {
        self.list.reserve(more);
    }

    /// How many rows, without making any.
    pub fn len(&self) -> usize {
        self.screened.as_ref().map_or(0, ScreenTable::len) + self.list.len()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Every row in order, a compact one made whole when it is reached.
    pub fn each(&self) -> impl Iterator<Item = Cow<'_, Row>> + '_ {
        self.screened
            .iter()
            .flat_map(ScreenTable::rows)
            .map(Cow::Owned)
            .chain(self.list.iter().map(Cow::Borrowed))
    }
}

impl From<Vec<Row>> for Rows {
    fn from(list: Vec<Row>) -> Self {
        Rows {
            list,
            ..Rows::default()
        }
    }
}

impl Deref for Rows {
    type Target = [Row];

    fn deref(&self) -> &[Row] {
        match &self.screened {
            None => &self.list,
            Some(_) => self
                .whole
                .get_or_init(|| self.each().map(Cow::into_owned).collect()),
        }
    }
}

impl<'a> IntoIterator for &'a Rows {
    type Item = &'a Row;
    type IntoIter = std::slice::Iter<'a, Row>;

    fn into_iter(self) -> Self::IntoIter {
        self.iter()
    }
}

impl PartialEq for Rows {
    fn eq(&self, other: &Self) -> bool {
        self.len() == other.len() && self.each().eq(other.each())
    }
}

impl Serialize for Rows {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        let mut seq = serializer.serialize_seq(Some(self.len()))?;
        // Not through `each`: a batch writes many such rows, and the table's own loop makes
        // them without allocating for each.
        if let Some(table) = &self.screened {
            table.for_each_row(|row| seq.serialize_element(row))?;
        }
        for row in &self.list {
            seq.serialize_element(row)?;
        }
        seq.end()
    }
}

#[cfg(test)]
mod tests {
    use std::sync::Arc;

    use super::*;
    use crate::answer::Basis;
    use crate::answer::screened::{Finding, ScreenNames, ScreenedRow};

    fn table() -> ScreenTable {
        // Invented names for the test.
        let mut names = ScreenNames::default();
        names.push("salt a", vec!["A".into()], vec![]);
        names.push("salt b", vec!["B·H2O".into(), "B".into()], vec!["B".into()]);
        let row = |solute, finding| {
            ScreenedRow::new(solute, finding, Basis::Interpolated, true, 5.0, 12.5)
        };
        ScreenTable::new(
            Arc::new(names),
            false,
            "g/100g water",
            (
                vec![
                    row(0, Finding::Ice),
                    row(
                        1,
                        Finding::Solubility {
                            branch: 0,
                            value: Some(30.0),
                        },
                    ),
                ],
                vec![1, 0],
            ),
            vec![(0, "no reviewed solubility data".into())],
        )
    }

    #[test]
    fn the_table_comes_first_then_the_whole_rows_in_every_reading() {
        let mut rows = Rows::new();
        rows.set_table(table());
        rows.push(Row {
            solute: Some("salt c".into()),
            ..Row::default()
        });
        assert_eq!(rows.len(), 4);
        let each: Vec<Row> = rows.each().map(Cow::into_owned).collect();
        assert_eq!(each.as_slice(), &rows[..]);
        assert_eq!(rows[0].solute.as_deref(), Some("salt b"));
        assert_eq!(rows[0].phase.as_deref(), Some("B·H2O"));
        assert_eq!(rows[0].unit.as_deref(), Some("g/100g water"));
        assert_eq!(rows[1].phase.as_deref(), Some("ice"));
        assert_eq!(rows[1].holds, Some(false));
        assert_eq!(rows[2].solute.as_deref(), Some("salt a"));
        assert_eq!(rows[2].extra["status"], "no data");
        assert_eq!(rows[3].solute.as_deref(), Some("salt c"));
        let json = serde_json::to_value(&rows).unwrap_or_default();
        assert_eq!(json, serde_json::to_value(&rows[..]).unwrap_or_default());
        assert_eq!(json.as_array().map(Vec::len), Some(4));
    }

    #[test]
    fn a_row_pushed_after_a_reading_is_read_too() {
        let mut rows = Rows::new();
        rows.set_table(table());
        assert_eq!(rows.iter().count(), 3);
        rows.push(Row::default());
        assert_eq!(rows.iter().count(), 4);
    }
}
