//! A screening's rows kept compact until they are printed: each row refers to its solute and
//! its stable phase by position in the catalog's names (built once per snapshot) instead of
//! owning their text, so a screening of 100,000 solutes allocates nothing per solute. A
//! printer turns each into a [`Row`] as it writes it ([`ScreenTable::row`]).

use std::borrow::Cow;
use std::sync::Arc;

use super::{Basis, Row};
use crate::number;
#[cfg(doc)]
use crate::number::VALUE_DIGITS;

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
    /// given in that unit), not yet rounded: it is rounded to [`VALUE_DIGITS`] when the row
    /// is made whole, so a screening rounds only the rows it prints.
    Solubility { branch: u16, value: Option<f64> },
    /// Ice forms on cooling below `temperature_c`, before any salt crystallises.
    Ice,
}

/// One solute's row of a screening, by reference, in 32 bytes: its numbers as worked out,
/// rounded as answers show them when the row is made whole ([`ScreenTable::row`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScreenedRow {
    /// The solute's position in the catalog.
    solute: u32,
    /// The stable branch (a solubility row).
    branch: u16,
    basis: Basis,
    /// [`HOLDS`], [`ICE`], [`HAS_VALUE`].
    flags: u8,
    /// The limiting temperature (or where ice forms), °C.
    celsius: f64,
    /// Headroom in percent (not finite for a zero loading, which holds without limit).
    headroom_pct: f64,
    /// The solubility in the loading's unit, when [`HAS_VALUE`].
    value: f64,
}

/// The loading stays dissolved.
const HOLDS: u8 = 1;
/// The row is [`Finding::Ice`].
const ICE: u8 = 2;
/// The solubility row has a value.
const HAS_VALUE: u8 = 4;

impl ScreenedRow {
    /// The row of the solute at `solute` in the catalog: what it found, on what basis,
    /// whether the loading holds, the limiting temperature in °C and the headroom in
    /// percent (an ice row has neither headroom nor a passing loading).
    pub fn new(
        solute: u32,
        finding: Finding,
        basis: Basis,
        holds: bool,
        celsius: f64,
        headroom_pct: f64,
    ) -> Self {
        let (branch, value, flags) = match finding {
            Finding::Ice => (0, f64::NAN, ICE),
            Finding::Solubility { branch, value } => (
                branch,
                value.unwrap_or(f64::NAN),
                if holds { HOLDS } else { 0 } | if value.is_some() { HAS_VALUE } else { 0 },
            ),
        };
        ScreenedRow {
            solute,
            branch,
            basis,
            flags,
            celsius,
            headroom_pct,
            value,
        }
    }

    /// The solute's position in the catalog.
    pub fn solute(&self) -> u32 {
        self.solute
    }

    /// Whether the loading stays dissolved.
    pub fn holds(&self) -> bool {
        self.flags & HOLDS != 0
    }

    /// What the row says of its solute.
    pub fn finding(&self) -> Finding {
        if self.flags & ICE != 0 {
            Finding::Ice
        } else {
            Finding::Solubility {
                branch: self.branch,
                value: (self.flags & HAS_VALUE != 0).then_some(self.value),
            }
        }
    }

    /// The limiting temperature (or where ice forms), °C, as answers show it.
    fn temperature_c(&self) -> f64 {
        number::hundredths_of_degree(self.celsius)
    }

    /// The headroom in percent as answers show it, when finite.
    fn headroom(&self) -> Option<f64> {
        let pct = self.headroom_pct;
        pct.is_finite().then(|| number::tenths_of_percent(pct))
    }
}

/// Why a solute is listed apart, kept as what it is made of until it is shown (a screening
/// may list thousands apart and print none of them).
#[derive(Debug, Clone, PartialEq)]
pub enum Missing {
    /// The reason, in words.
    Said(Cow<'static, str>),
    /// The data do not reach the whole range: the temperatures they cover, °C.
    Uncovered { from_c: f64, to_c: f64 },
}

impl Missing {
    /// Appends the reason as the row shows it to `out`.
    pub fn write_to(&self, out: &mut String) {
        match self {
            Missing::Said(reason) => out.push_str(reason),
            Missing::Uncovered { from_c, to_c } => {
                use std::fmt::Write;
                // Writing into a String does not fail.
                let _ = if from_c == to_c {
                    write!(
                        out,
                        "data hold one temperature only ({from_c} C), too little to extrapolate from"
                    )
                } else {
                    write!(
                        out,
                        "data do not cover the whole range (they cover {from_c} C to {to_c} C)"
                    )
                };
            }
        }
    }
}

impl From<&'static str> for Missing {
    fn from(reason: &'static str) -> Self {
        Missing::Said(Cow::Borrowed(reason))
    }
}

impl From<String> for Missing {
    fn from(reason: String) -> Self {
        Missing::Said(Cow::Owned(reason))
    }
}

/// A row of a solute listed apart, its solute and reason still empty ([`fill_apart`]).
fn apart_row() -> Row {
    Row {
        solute: Some(String::new()),
        extra: [
            ("status".to_string(), serde_json::json!("no data")),
            (
                "reason".to_string(),
                serde_json::Value::String(String::new()),
            ),
        ]
        .into_iter()
        .collect(),
        ..Row::default()
    }
}

/// Writes a solute listed apart and its reason into a row from [`apart_row`], reusing the
/// row's text buffers.
fn fill_apart(row: &mut Row, solute: &str, reason: &Missing) {
    let name = row.solute.get_or_insert_with(String::new);
    name.clear();
    name.push_str(solute);
    if let Some(serde_json::Value::String(text)) = row.extra.get_mut("reason") {
        text.clear();
        reason.write_to(text);
    }
}

/// A screening's ranked rows with the names they refer to.
#[derive(Debug, Clone, PartialEq)]
pub struct ScreenTable {
    names: Arc<ScreenNames>,
    reviewed_only: bool,
    /// The loading's unit, the unit of every solubility row.
    unit: &'static str,
    /// The rows in the order they were worked out.
    rows: Vec<ScreenedRow>,
    /// Positions in `rows`, in the order the rows are shown (ranking moves these only).
    order: Vec<u32>,
    /// The solutes listed apart, after the ranked rows: each with why it has no data over
    /// the range.
    missing: Vec<(u32, Missing)>,
}

impl ScreenTable {
    /// A table whose rows refer to `names`, shown in the order of `order` (positions in
    /// `rows`; a position outside is passed over); phases are those of the curves from
    /// reviewed data only when `reviewed_only`.
    pub fn new(
        names: Arc<ScreenNames>,
        reviewed_only: bool,
        unit: &'static str,
        (rows, order): (Vec<ScreenedRow>, Vec<u32>),
        missing: Vec<(u32, Missing)>,
    ) -> Self {
        ScreenTable {
            names,
            reviewed_only,
            unit,
            rows,
            order,
            missing,
        }
    }

    /// The rows in the order shown.
    fn shown(&self) -> impl Iterator<Item = &ScreenedRow> + '_ {
        self.order.iter().filter_map(|&i| self.rows.get(i as usize))
    }

    pub fn len(&self) -> usize {
        self.shown().count() + self.missing.len()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The rows, each made into a [`Row`] when it is reached: the ranked ones, then those
    /// without data.
    pub fn rows(&self) -> impl Iterator<Item = Row> + '_ {
        let missing = self.missing.iter().map(|(solute, reason)| {
            let mut row = apart_row();
            fill_apart(&mut row, self.names.solute(*solute), reason);
            row
        });
        self.shown().map(|r| self.row(r)).chain(missing)
    }

    /// Calls `write` with every row in order, each made whole with the texts' buffers of
    /// the row before (no allocation per row once they are long enough): how a printer of
    /// many rows writes them.
    pub fn for_each_row<E>(&self, mut write: impl FnMut(&Row) -> Result<(), E>) -> Result<(), E> {
        let (mut solute, mut phase) = (String::new(), String::new());
        for r in self.shown() {
            solute.clear();
            solute.push_str(self.names.solute(r.solute));
            phase.clear();
            phase.push_str(self.phase_of(r));
            let row = self.row_with(r, solute, phase);
            write(&row)?;
            (solute, phase) = (
                row.solute.unwrap_or_default(),
                row.phase.unwrap_or_default(),
            );
        }
        let mut row = apart_row();
        for (solute, reason) in &self.missing {
            fill_apart(&mut row, self.names.solute(*solute), reason);
            write(&row)?;
        }
        Ok(())
    }

    /// One row as every printer shows it.
    pub fn row(&self, r: &ScreenedRow) -> Row {
        let solute = self.names.solute(r.solute).to_string();
        self.row_with(r, solute, self.phase_of(r).to_string())
    }

    /// The row's solid phase: ice, or its stable phase at the limiting temperature.
    fn phase_of(&self, r: &ScreenedRow) -> &str {
        match r.finding() {
            Finding::Ice => "ice",
            Finding::Solubility { branch, .. } => {
                self.names.phase(r.solute, self.reviewed_only, branch)
            }
        }
    }

    /// The row with the solute's name and the phase given as texts.
    fn row_with(&self, r: &ScreenedRow, solute: String, phase: String) -> Row {
        let temperature_c = r.temperature_c();
        match r.finding() {
            Finding::Ice => Row {
                solute: Some(solute),
                quantity: Some(Cow::Borrowed(crate::answer::ICE_ROW)),
                value: Some(temperature_c),
                unit: Some(Cow::Borrowed("C")),
                basis: Some(r.basis),
                temperature_c: Some(temperature_c),
                holds: Some(false),
                phase: Some(phase),
                ..Row::default()
            },
            Finding::Solubility { value, .. } => Row {
                solute: Some(solute),
                quantity: Some(Cow::Borrowed("solubility at the limiting temperature")),
                value: value.map(number::value),
                unit: value.map(|_| Cow::Borrowed(self.unit)),
                basis: Some(r.basis),
                temperature_c: Some(temperature_c),
                holds: Some(r.holds()),
                headroom_pct: r.headroom(),
                phase: Some(phase),
                ..Row::default()
            },
        }
    }
}
