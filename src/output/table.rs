//! Tables for people: the statement, a table of its rows, then caveats and citations.
//! A statement that failed is drawn as `query::fault` draws it (marks under the fault).
//!
//! On a terminal ([`Layout::terminal`]) a table is fitted to the width: a quantity or unit
//! that every row shares goes into a heading, columns are left out by priority (said under
//! the table) and long cells wrapped; each note is shown once per run and then referred to
//! by number, and sources are short references. To a pipe or a file ([`Layout::FULL`])
//! nothing is left out, and notes and citations are written in full.

use std::collections::BTreeSet;
use std::io::{self, Write};

use tabled::builder::Builder;
use tabled::settings::peaker::PriorityMax;
use tabled::settings::{Style, Width};

use super::headings::{heading, priority};
use super::notes::{self, Memory, short_citation, wrap};
use crate::answer::{Answer, AnswerKind, ErrorReport, Row};
use crate::number::display;
use crate::query::fault::{self, Fault};

/// How tables, notes and sources are laid out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Layout {
    /// The width to fit, in columns; `None`: as wide as the rows need.
    pub width: Option<usize>,
    /// Every column, and notes and citations in full, on every answer.
    pub full: bool,
}

impl Layout {
    /// For a pipe or a file: the full text.
    pub const FULL: Layout = Layout {
        width: None,
        full: true,
    };

    /// For a person at a terminal `width` columns wide (80 at the least; unknown: 80).
    pub fn terminal(width: Option<usize>, full: bool) -> Layout {
        Layout {
            width: Some(width.unwrap_or(80).max(MIN_WIDTH)),
            full,
        }
    }
}

/// The narrowest width a table is fitted to.
pub const MIN_WIDTH: usize = 40;

/// Writes answers for people, remembering across a run which notes were shown.
#[derive(Debug, Clone)]
pub struct TableWriter {
    layout: Layout,
    memory: Memory,
}

impl Default for TableWriter {
    fn default() -> Self {
        TableWriter::new(Layout::FULL)
    }
}

impl TableWriter {
    pub fn new(layout: Layout) -> Self {
        TableWriter {
            layout,
            memory: Memory::default(),
        }
    }

    pub fn layout(&self) -> Layout {
        self.layout
    }

    /// The same writer (remembering the notes shown) with another layout.
    pub fn relaid(&self, layout: Layout) -> Self {
        TableWriter {
            layout,
            memory: self.memory.clone(),
        }
    }

    /// Writes one answer; `script` is the text its error spans point into.
    pub fn write(&mut self, out: &mut impl Write, answer: &Answer, script: &str) -> io::Result<()> {
        write_with(out, answer, script, self.layout, &mut self.memory)
    }
}

/// Reads one cell of a row, or nothing when the row has no such field.
type Cell = Box<dyn Fn(&Row) -> Option<String>>;

/// A column of the table: its heading, how to read a row's cell, and how long it stays
/// when the table is narrowed.
struct Column {
    heading: String,
    cell: Cell,
    priority: u8,
}

/// The text every row of `rows` shares in a field, if they all have it and agree.
fn shared(rows: &[Row], field: impl Fn(&Row) -> Option<&str>) -> Option<String> {
    let first = field(rows.first()?)?;
    rows.iter()
        .all(|r| field(r) == Some(first))
        .then(|| first.to_string())
}

/// The columns of a table of `rows`, and the title line of what every row shares (the
/// quantity; the unit goes into the value's heading).
fn columns_for(rows: &[Row]) -> (Vec<Column>, Option<String>) {
    let quantity = (rows.len() > 1 || rows.iter().all(|r| r.value.is_some()))
        .then(|| shared(rows, |r| r.quantity.as_deref()))
        .flatten();
    // The unit every value shares heads the value column; a verdict row whose value could
    // not be given in that unit (no density for a per-litre unit) leaves its cell empty.
    let valued: Vec<Row> = rows.iter().filter(|r| r.value.is_some()).cloned().collect();
    let unit = shared(&valued, |r| r.unit.as_deref()).filter(|u| {
        rows.iter()
            .all(|r| r.value.is_some() || r.unit.as_deref().is_none_or(|own| own == u))
    });
    let mut columns: Vec<Column> = Vec::new();
    let mut add = |field: &str, heading: String, cell: Cell| {
        if rows.iter().any(|r| cell(r).is_some()) {
            columns.push(Column {
                heading,
                cell,
                priority: priority(field),
            });
        }
    };
    add("solute", "solute".into(), Box::new(|r| r.solute.clone()));
    if quantity.is_none() {
        add(
            "quantity",
            "quantity".into(),
            Box::new(|r| r.quantity.as_deref().map(str::to_string)),
        );
    }
    let value_heading = unit.clone().unwrap_or_else(|| "value".into());
    add("value", value_heading, Box::new(|r| r.value.map(display)));
    if unit.is_none() {
        add(
            "unit",
            "unit".into(),
            Box::new(|r| r.unit.as_deref().map(str::to_string)),
        );
    }
    add(
        "holds",
        "holds".into(),
        Box::new(|r| r.holds.map(|h| if h { "yes" } else { "NO" }.to_string())),
    );
    add(
        "headroom_pct",
        heading("headroom_pct"),
        Box::new(|r| r.headroom_pct.map(display)),
    );
    add(
        "temperature_c",
        heading("temperature_c"),
        Box::new(|r| r.temperature_c.map(display)),
    );
    add("phase", "phase".into(), Box::new(|r| r.phase.clone()));
    add(
        "basis",
        "basis".into(),
        Box::new(|r| r.basis.map(|b| b.as_str().to_string())),
    );
    let extra_keys: BTreeSet<String> = rows.iter().flat_map(|r| r.extra.keys().cloned()).collect();
    for key in extra_keys {
        let lookup = key.clone();
        add(
            &key,
            heading(&key),
            Box::new(move |r| r.extra.get(&lookup).map(plain)),
        );
    }
    (columns, quantity)
}

/// A JSON value as plain text for a cell.
fn plain(value: &serde_json::Value) -> String {
    match value {
        serde_json::Value::String(s) => s.clone(),
        serde_json::Value::Number(n) => n.as_f64().map(display).unwrap_or_else(|| n.to_string()),
        serde_json::Value::Array(items) => items.iter().map(plain).collect::<Vec<_>>().join(", "),
        serde_json::Value::Null => String::new(),
        other => other.to_string(),
    }
}

/// Draws the rows of an answer as tables, as wide as they need (empty string when there
/// are none).
///
/// Consecutive rows with the same fields share one table; rows of another shape (the record
/// line of `describe`, the "no data" rows of a screening) start a table of their own, so no
/// table is padded with columns its rows leave empty.
pub fn rows_table(rows: &[Row]) -> String {
    fitted_tables(rows, Layout::FULL).join("\n")
}

/// The tables of `rows` laid out for `layout`, each with its title line and the line that
/// names columns left out.
fn fitted_tables(rows: &[Row], layout: Layout) -> Vec<String> {
    let mut tables = Vec::new();
    let mut start = 0;
    for end in 1..=rows.len() {
        if end == rows.len() || shape(&rows[end]) != shape(&rows[start]) {
            tables.push(one_table(&rows[start..end], layout));
            start = end;
        }
    }
    tables
}

/// Which fields a row fills: rows of one shape go in one table. A verdict row (`holds`)
/// stays with the other verdicts when its value could not be given in the unit asked.
fn shape(row: &Row) -> (bool, bool, Vec<&str>) {
    (
        row.value.is_some() || row.holds.is_some(),
        row.holds.is_some(),
        row.extra.keys().map(String::as_str).collect(),
    )
}

fn draw(rows: &[Row], columns: &[&Column]) -> tabled::Table {
    let mut builder = Builder::default();
    builder.push_record(columns.iter().map(|c| c.heading.clone()));
    for row in rows {
        builder.push_record(columns.iter().map(|c| (c.cell)(row).unwrap_or_default()));
    }
    let mut table = builder.build();
    table.with(Style::sharp());
    table
}

fn width_of(text: &str) -> usize {
    text.lines().map(|l| l.chars().count()).max().unwrap_or(0)
}

fn one_table(rows: &[Row], layout: Layout) -> String {
    if rows.is_empty() {
        return String::new();
    }
    let (columns, title) = columns_for(rows);
    let mut shown: Vec<&Column> = columns.iter().collect();
    let mut left_out: Vec<&str> = Vec::new();
    let mut table = draw(rows, &shown);
    if let Some(width) = layout.width {
        // Leave out the columns of lowest priority (the rightmost first among equals) until
        // the table fits; never those of priority 100.
        while !layout.full && width_of(&table.to_string()) > width {
            let Some(drop) = shown
                .iter()
                .enumerate()
                .filter(|(_, c)| c.priority < 100)
                .min_by_key(|(i, c)| (c.priority, usize::MAX - i))
                .map(|(i, _)| i)
            else {
                break;
            };
            left_out.push(&shown[drop].heading);
            shown.remove(drop);
            table = draw(rows, &shown);
        }
        if width_of(&table.to_string()) > width {
            table.with(
                Width::wrap(width)
                    .keep_words(true)
                    .priority(PriorityMax::new(false)),
            );
        }
    }
    let mut text = String::new();
    if let Some(title) = title {
        text.push_str(&format!("  {title}\n"));
    }
    text.push_str(&table.to_string());
    if !left_out.is_empty() {
        let line = format!(
            "left out to fit {} columns: {} (--full or --format json shows them)",
            layout.width.unwrap_or(0),
            left_out.join(", ")
        );
        text.push('\n');
        text.push_str(&wrap(&line, layout.width, "  ", "    "));
    }
    text
}

/// An answer's fault drawn as `query::fault` draws it: the statement (from the script, so
/// never cut short), marks under the faulty text with its line and column, the message.
pub fn fault_block(
    answer: &Answer,
    error: &ErrorReport,
    script: &str,
    width: Option<usize>,
) -> String {
    let (statement, at) = statement_around(answer, error, script);
    let place = format!("line {}, column {}", error.line, error.column);
    fault::draw(
        &Fault {
            statement,
            at,
            place: &place,
            stage: error.stage,
            message: &error.message,
        },
        width,
    )
}

/// The statement a fault lies in, as written in the script, and the fault's byte range in
/// it: the answer's own span when it holds the fault (a statement that was read), else the
/// piece of the fault's line between `;`s (a statement that could not be read), else the
/// answer's echo with the mark at its end.
fn statement_around<'a>(
    answer: &'a Answer,
    error: &ErrorReport,
    script: &'a str,
) -> (&'a str, (usize, usize)) {
    let (from, to) = answer.span;
    let (e0, e1) = error.span;
    if from < to && from <= e0 && e0 <= to {
        if let Some(text) = script.get(from..to).filter(|t| !t.contains('\n')) {
            return (text, (e0 - from, e1.clamp(e0, to) - from));
        }
    }
    let line_start = script
        .get(..e0)
        .map_or(usize::MAX, |before| before.rfind('\n').map_or(0, |i| i + 1));
    if let Some(line) = script
        .get(line_start..)
        .map(|rest| rest.lines().next().unwrap_or(""))
    {
        let code = &line[..line.find('#').unwrap_or(line.len())];
        let at = e0 - line_start;
        if at <= code.len() {
            let piece_start = code[..at].rfind(';').map_or(0, |i| i + 1);
            let piece_end = code[at..].find(';').map_or(code.len(), |i| at + i);
            let piece = &code[piece_start..piece_end];
            let lead = piece.len() - piece.trim_start().len();
            let text = piece.trim();
            let offset = (at - piece_start).saturating_sub(lead).min(text.len());
            let end =
                (e1.saturating_sub(line_start + piece_start + lead)).clamp(offset, text.len());
            if !text.is_empty() {
                return (text, (offset, end));
            }
        }
    }
    let text = answer.statement.as_str();
    (text, (text.len(), text.len()))
}

/// Writes one answer for people, in full (as to a pipe or a file).
pub fn write_answer(out: &mut impl Write, answer: &Answer, script: &str) -> io::Result<()> {
    write_with(out, answer, script, Layout::FULL, &mut Memory::default())
}

fn write_with(
    out: &mut impl Write,
    answer: &Answer,
    script: &str,
    layout: Layout,
    memory: &mut Memory,
) -> io::Result<()> {
    match &answer.error {
        Some(error) => write!(out, "{}", fault_block(answer, error, script, layout.width))?,
        None => writeln!(out, "{}", wrap(&answer.statement, layout.width, "» ", "  "))?,
    }
    if let Some(holds) = answer.holds {
        writeln!(
            out,
            "{}",
            if holds {
                "requirement holds"
            } else {
                "REQUIREMENT DOES NOT HOLD"
            }
        )?;
    }
    for table in fitted_tables(&answer.rows, layout) {
        writeln!(out, "{table}")?;
    }
    if let Some(spec) = &answer.plot {
        write!(out, "{}", crate::plot::sketch(spec))?;
    }
    if let Some(file) = &answer.picture {
        writeln!(out, "  picture written to {file}")?;
    }
    write_notes(out, answer, layout, memory)?;
    write_sources(out, answer, layout, memory)?;
    writeln!(out)
}

/// The caveats: in full, every one on every answer; on a terminal, each new one numbered and
/// wrapped, and those shown before referred to by number.
fn write_notes(
    out: &mut impl Write,
    answer: &Answer,
    layout: Layout,
    memory: &mut Memory,
) -> io::Result<()> {
    if layout.full {
        for caveat in &answer.caveats {
            writeln!(out, "{}", wrap(caveat, layout.width, "  note: ", "    "))?;
        }
        return Ok(());
    }
    let mut earlier = Vec::new();
    for caveat in &answer.caveats {
        let (number, new) = memory.number(caveat);
        if new {
            let first = format!("  note {number}: ");
            writeln!(out, "{}", wrap(caveat, layout.width, &first, "    "))?;
        } else {
            earlier.push(number);
        }
    }
    if !earlier.is_empty() {
        let which = if earlier.len() == 1 { "note" } else { "notes" };
        let line = format!("{which} {} as above", notes::numbers(&earlier));
        writeln!(out, "{}", wrap(&line, layout.width, "  ", "    "))?;
    }
    Ok(())
}

/// The sources: in full, `[key] citation`; on a terminal, one line of short references,
/// and once per run where the full citations are.
fn write_sources(
    out: &mut impl Write,
    answer: &Answer,
    layout: Layout,
    memory: &mut Memory,
) -> io::Result<()> {
    // A `sources` answer's rows are the citations already.
    if answer.kind == AnswerKind::Sources || answer.sources.is_empty() {
        return Ok(());
    }
    if layout.full {
        for source in &answer.sources {
            let first = format!("  [{}] ", source.key);
            writeln!(
                out,
                "{}",
                wrap(&source.citation, layout.width, &first, "    ")
            )?;
        }
        return Ok(());
    }
    let short: Vec<String> = answer
        .sources
        .iter()
        .map(|s| format!("{} [{}]", short_citation(&s.citation), s.key))
        .collect();
    let label = if short.len() == 1 {
        "source"
    } else {
        "sources"
    };
    let line = format!("{label}: {}", short.join("; "));
    writeln!(out, "{}", wrap(&line, layout.width, "  ", "    "))?;
    if memory.hint_citations() {
        let hint = "full citations: `sources of SOLUTE`, --full, or --format json";
        writeln!(out, "{}", wrap(hint, layout.width, "  ", "    "))?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::answer::{Basis, ErrorClass};

    #[test]
    fn table_has_only_used_columns() {
        let rows = vec![Row {
            solute: Some("potassium chloride".into()),
            value: Some(34.2),
            unit: Some("g/100g water".into()),
            basis: Some(Basis::Interpolated),
            ..Row::default()
        }];
        let text = rows_table(&rows);
        assert!(text.contains("solute"));
        assert!(text.contains("34.2"));
        assert!(!text.contains("headroom"));
    }

    #[test]
    fn rows_of_another_shape_get_their_own_table() {
        let mut missing = Row {
            solute: Some("trisodium citrate".into()),
            ..Row::default()
        };
        missing.extra.insert("status".into(), "no data".into());
        let rows = vec![
            Row {
                solute: Some("sodium chloride".into()),
                value: Some(35.7),
                holds: Some(true),
                ..Row::default()
            },
            missing,
        ];
        let text = rows_table(&rows);
        assert_eq!(text.matches("┌").count(), 2, "{text}");
        let second = text.split("┌").nth(2).unwrap();
        assert!(!second.contains("holds"), "{text}");
    }

    #[test]
    fn a_verdict_without_a_figure_stays_in_its_verdicts_table() {
        // A screening in a per-litre unit: a solute whose saturated solution lies beyond its
        // density coefficients has a verdict but no figure; it was once split off into a
        // table of its own, cutting the ranked list into pieces.
        let verdict = |name: &str, value: Option<f64>| Row {
            solute: Some(name.into()),
            quantity: Some("solubility at the limiting temperature".into()),
            value,
            unit: value.map(|_| "mol/L".into()),
            holds: Some(true),
            ..Row::default()
        };
        let rows = vec![
            verdict("zinc chloride", None),
            verdict("sodium chloride", Some(5.395)),
            verdict("magnesium chloride", None),
        ];
        let text = rows_table(&rows);
        assert_eq!(text.matches("┌").count(), 1, "{text}");
        assert!(text.contains("│ mol/L │"), "{text}");
        assert!(text.contains("5.395"), "{text}");
    }

    #[test]
    fn marks_under_the_fault() {
        let script = "describe NaCl\nsolubility of KNO3 at 5 g/L\n";
        let error = ErrorReport {
            class: ErrorClass::Parse,
            stage: "parse",
            code: "test",
            message: "expected a temperature".into(),
            line: 2,
            column: 23,
            span: (36, 41),
        };
        let mut answer = Answer::failed("solubility of KNO3 at 5 g/L", AnswerKind::Invalid, error);
        answer.span = (14, 41);
        let mut buf = Vec::new();
        write_answer(&mut buf, &answer, script).unwrap();
        let text = String::from_utf8(buf).unwrap();
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines[0], "» solubility of KNO3 at 5 g/L");
        assert_eq!(lines[1], "                        ‾‾‾‾‾ line 2, column 23");
        assert_eq!(lines[2], "  not read: expected a temperature");
    }
}
