//! Tables for people: the statement, a table of its rows, then caveats and citations.
//! Errors are drawn with the faulty line and a caret under the fault.

use std::collections::BTreeSet;
use std::io::{self, Write};

use tabled::builder::Builder;
use tabled::settings::Style;

use crate::answer::{Answer, AnswerKind, ErrorReport, Row};
use crate::number::display;

/// Reads one cell of a row, or nothing when the row has no such field.
type Cell = Box<dyn Fn(&Row) -> Option<String>>;

/// A column of the table: its heading and how to read a row's cell.
struct Column {
    heading: String,
    cell: Cell,
}

fn columns_for(rows: &[Row]) -> Vec<Column> {
    let mut columns: Vec<Column> = Vec::new();
    let mut add = |heading: &str, cell: Cell| {
        if rows.iter().any(|r| cell(r).is_some()) {
            columns.push(Column {
                heading: heading.to_string(),
                cell,
            });
        }
    };
    add("solute", Box::new(|r| r.solute.clone()));
    add(
        "quantity",
        Box::new(|r| r.quantity.as_deref().map(str::to_string)),
    );
    add("value", Box::new(|r| r.value.map(display)));
    add("unit", Box::new(|r| r.unit.as_deref().map(str::to_string)));
    add(
        "holds",
        Box::new(|r| r.holds.map(|h| if h { "yes" } else { "NO" }.to_string())),
    );
    add("headroom %", Box::new(|r| r.headroom_pct.map(display)));
    add("at C", Box::new(|r| r.temperature_c.map(display)));
    add("phase", Box::new(|r| r.phase.clone()));
    add(
        "basis",
        Box::new(|r| r.basis.map(|b| b.as_str().to_string())),
    );
    let extra_keys: BTreeSet<String> = rows.iter().flat_map(|r| r.extra.keys().cloned()).collect();
    for key in extra_keys {
        let lookup = key.clone();
        add(
            &key.replace('_', " "),
            Box::new(move |r| r.extra.get(&lookup).map(plain)),
        );
    }
    columns
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

/// Draws the rows of an answer as a table (empty string when there are none).
///
/// Consecutive rows with the same fields share one table; rows of another shape (the record
/// line of `describe`, the "no data" rows of a screening) start a table of their own, so no
/// table is padded with columns its rows leave empty.
pub fn rows_table(rows: &[Row]) -> String {
    let mut tables = Vec::new();
    let mut start = 0;
    for end in 1..=rows.len() {
        if end == rows.len() || shape(&rows[end]) != shape(&rows[start]) {
            tables.push(one_table(&rows[start..end]));
            start = end;
        }
    }
    tables.join("\n")
}

/// Which fields a row fills: rows of one shape go in one table.
fn shape(row: &Row) -> (bool, bool, Vec<&str>) {
    (
        row.value.is_some(),
        row.holds.is_some(),
        row.extra.keys().map(String::as_str).collect(),
    )
}

fn one_table(rows: &[Row]) -> String {
    if rows.is_empty() {
        return String::new();
    }
    let columns = columns_for(rows);
    let mut builder = Builder::default();
    builder.push_record(columns.iter().map(|c| c.heading.clone()));
    for row in rows {
        builder.push_record(columns.iter().map(|c| (c.cell)(row).unwrap_or_default()));
    }
    let mut table = builder.build();
    table.with(Style::sharp());
    table.to_string()
}

/// The line and caret for an error span in a script.
pub fn caret(script: &str, error: &ErrorReport) -> String {
    let line_text = script
        .lines()
        .nth(error.line.saturating_sub(1))
        .unwrap_or("");
    let pad: String = line_text
        .chars()
        .take(error.column.saturating_sub(1))
        .map(|c| if c == '\t' { '\t' } else { ' ' })
        .collect();
    let (start, end) = error.span;
    let width = script
        .get(start..end.max(start))
        .map(|s| s.lines().next().unwrap_or("").chars().count())
        .unwrap_or(1)
        .max(1);
    format!(
        "{:>4} | {line_text}\n     | {pad}{}",
        error.line,
        "^".repeat(width)
    )
}

/// Writes one answer for people.
pub fn write_answer(out: &mut impl Write, answer: &Answer, script: &str) -> io::Result<()> {
    writeln!(out, "» {}", answer.statement)?;
    if let Some(error) = &answer.error {
        writeln!(
            out,
            "{} error at line {}, column {}: {}",
            error.stage, error.line, error.column, error.message
        )?;
        writeln!(out, "{}", caret(script, error))?;
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
    let table = rows_table(&answer.rows);
    if !table.is_empty() {
        writeln!(out, "{table}")?;
    }
    if let Some(spec) = &answer.plot {
        write!(out, "{}", crate::plot::sketch(spec))?;
    }
    if let Some(file) = &answer.picture {
        writeln!(out, "  picture written to {file}")?;
    }
    for caveat in &answer.caveats {
        writeln!(out, "  note: {caveat}")?;
    }
    // A `sources` answer's rows are the citations already.
    if answer.kind != AnswerKind::Sources {
        for source in &answer.sources {
            writeln!(out, "  [{}] {}", source.key, source.citation)?;
        }
    }
    writeln!(out)
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
    fn caret_under_fault() {
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
        let drawn = caret(script, &error);
        let lines: Vec<&str> = drawn.lines().collect();
        assert_eq!(lines[0], "   2 | solubility of KNO3 at 5 g/L");
        assert_eq!(lines[1], "     |                       ^^^^^");
        let mut buf = Vec::new();
        let answer = Answer::failed("solubility of KNO3 at 5 g/L", AnswerKind::Invalid, error);
        write_answer(&mut buf, &answer, script).unwrap();
        assert!(
            String::from_utf8(buf)
                .unwrap()
                .contains("parse error at line 2, column 23")
        );
    }
}
