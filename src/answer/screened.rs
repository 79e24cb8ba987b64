//! A screening's rows kept compact until they are printed: each row refers to its solute and
//! its stable phase by position in the catalog's names (built once per snapshot) instead of
//! owning their text, so a screening of 100,000 solutes allocates nothing per solute. A
//! printer turns each into a [`Row`] as it writes it ([`ScreenTable::row`]).

use std::borrow::Cow;
use std::sync::Arc;

use super::{Basis, Row};

/// The names a screening's rows refer to: every solute's name in catalog order and the
/// phases of its curves' branches (from all data, and from reviewed data only).
#[derive(Debug, Default, PartialEq)]
pub struct ScreenNames {
    solutes: Vec<String>,
    /// Per solute: the phases of its curve from all data, in branch order.
    all: Vec<Vec<String>>,
    /// Per solute: the phases of its curve from reviewed data only, in branch order.
    reviewed: Vec<Vec<String>>,
}

impl ScreenNames {
    /// Adds the next solute of the catalog with its curves' phases.
    pub fn push(&mut self, solute: &str, all: Vec<String>, reviewed: Vec<String>) {
        self.solutes.push(solute.to_string());
        self.all.push(all);
        self.reviewed.push(reviewed);
    }

    fn solute(&self, index: u32) -> &str {
        self.solutes.get(index as usize).map_or("", String::as_str)
    }

    fn phase(&self, solute: u32, reviewed_only: bool, branch: u16) -> &str {
        let phases = if reviewed_only {
            &self.reviewed
        } else {
            &self.all
        };
        phases
            .get(solute as usize)
            .and_then(|p| p.get(usize::from(branch)))
            .map_or("", String::as_str)
    }
}

/// What a screening row says of its solute.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Finding {
    /// The curve's lowest point in the range: the stable branch there (its index in the
    /// curve) and the solubility there in the loading's unit (absent when it cannot be
    /// given in that unit).
    Solubility { branch: u16, value: Option<f64> },
    /// Ice forms on cooling below `temperature_c`, before any salt crystallises.
    Ice,
}

/// One solute's row of a screening, by reference.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScreenedRow {
    /// The solute's position in the catalog.
    pub solute: u32,
    pub finding: Finding,
    pub basis: Basis,
    pub holds: bool,
    /// The limiting temperature (or where ice forms), °C, rounded as answers show it.
    pub temperature_c: f64,
    /// Headroom in percent, when finite.
    pub headroom_pct: Option<f64>,
}

/// A screening's ranked rows with the names they refer to.
#[derive(Debug, Clone, PartialEq)]
pub struct ScreenTable {
    names: Arc<ScreenNames>,
    reviewed_only: bool,
    /// The loading's unit, the unit of every solubility row.
    unit: &'static str,
    rows: Vec<ScreenedRow>,
    /// The solutes listed apart, after the ranked rows: each with why it has no data over
    /// the range.
    missing: Vec<(u32, Cow<'static, str>)>,
}

impl ScreenTable {
    /// A table whose rows (in the order they are to be shown) refer to `names`; phases are
    /// those of the curves from reviewed data only when `reviewed_only`.
    pub fn new(
        names: Arc<ScreenNames>,
        reviewed_only: bool,
        unit: &'static str,
        rows: Vec<ScreenedRow>,
        missing: Vec<(u32, Cow<'static, str>)>,
    ) -> Self {
        ScreenTable {
            names,
            reviewed_only,
            unit,
            rows,
            missing,
        }
    }

    pub fn len(&self) -> usize {
        self.rows.len() + self.missing.len()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The rows, each made into a [`Row`] when it is reached: the ranked ones, then those
    /// without data.
    pub fn rows(&self) -> impl Iterator<Item = Row> + '_ {
        let missing = self.missing.iter().map(|(solute, reason)| Row {
            solute: Some(self.names.solute(*solute).to_string()),
            extra: [
                ("status".to_string(), serde_json::json!("no data")),
                ("reason".to_string(), serde_json::json!(reason)),
            ]
            .into_iter()
            .collect(),
            ..Row::default()
        });
        self.rows.iter().map(|r| self.row(r)).chain(missing)
    }

    /// One row as every printer shows it.
    pub fn row(&self, r: &ScreenedRow) -> Row {
        let solute = Some(self.names.solute(r.solute).to_string());
        match r.finding {
            Finding::Ice => Row {
                solute,
                quantity: Some(Cow::Borrowed("ice appears on cooling below")),
                value: Some(r.temperature_c),
                unit: Some(Cow::Borrowed("C")),
                basis: Some(r.basis),
                temperature_c: Some(r.temperature_c),
                holds: Some(false),
                phase: Some("ice".into()),
                ..Row::default()
            },
            Finding::Solubility { branch, value } => Row {
                solute,
                quantity: Some(Cow::Borrowed("solubility at the limiting temperature")),
                value,
                unit: value.map(|_| Cow::Borrowed(self.unit)),
                basis: Some(r.basis),
                temperature_c: Some(r.temperature_c),
                holds: Some(r.holds),
                headroom_pct: r.headroom_pct,
                phase: Some(
                    self.names
                        .phase(r.solute, self.reviewed_only, branch)
                        .to_string(),
                ),
                ..Row::default()
            },
        }
    }
}
