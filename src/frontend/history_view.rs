//! `satline history` for people: one row per change, with its time, actor, action, record
//! and what changed in words, numbers rounded for reading (`--format json` keeps every
//! stored digit).

use std::io::{self, Write};

use serde_json::Value;
use tabled::builder::Builder;
use tabled::settings::peaker::PriorityMax;
use tabled::settings::{Style, Width};

use crate::number::{display, round_significant};
use crate::store::audit::AuditEntry;

/// The most characters a change's summary shows before it is cut with `…`.
const SUMMARY_CHARS: usize = 240;

/// Writes the history of `id` as a table, fitted to `width` columns when given.
pub fn write(
    id: &str,
    entries: &[AuditEntry],
    width: Option<usize>,
    out: &mut dyn Write,
) -> io::Result<()> {
    let changes = if entries.len() == 1 {
        "change"
    } else {
        "changes"
    };
    writeln!(out, "history of {id}: {} {changes}", entries.len())?;
    if entries.is_empty() {
        return Ok(());
    }
    let mut builder = Builder::default();
    builder.push_record(["time (UTC)", "actor", "action", "record", "what changed"]);
    for e in entries {
        builder.push_record([
            e.time.replace('T', " ").trim_end_matches('Z').to_string(),
            e.actor.clone(),
            e.action.clone(),
            e.entity.clone(),
            summary(&e.action, e.before.as_ref(), e.after.as_ref()),
        ]);
    }
    let mut table = builder.build();
    table.with(Style::sharp());
    if let Some(width) = width {
        table.with(
            Width::wrap(width)
                .keep_words(true)
                .priority(PriorityMax::new(false)),
        );
    }
    writeln!(out, "{table}")
}

/// What a change did, in words: the fields of an added record, the fields that differ
/// between before and after for any other action.
pub fn summary(action: &str, before: Option<&Value>, after: Option<&Value>) -> String {
    let text = match (before, after) {
        (None, Some(after)) => fields(after).join("; "),
        (Some(before), None) => format!("removed: {}", fields(before).join("; ")),
        (Some(before), Some(after)) => differences(before, after).join("; "),
        (None, None) => action.to_string(),
    };
    let text = if text.is_empty() {
        "no field changed".to_string()
    } else {
        text
    };
    let mut chars = text.chars();
    let head: String = chars.by_ref().take(SUMMARY_CHARS).collect();
    if chars.next().is_some() {
        format!("{head}…")
    } else {
        head
    }
}

/// `name value` for each field that holds something, nested records flattened and lists
/// counted.
fn fields(value: &Value) -> Vec<String> {
    match value {
        Value::Object(map) => map
            .iter()
            .filter(|(_, v)| !is_empty(v))
            .map(|(k, v)| format!("{} {}", k.replace('_', " "), plain(k, v)))
            .collect(),
        other => vec![plain("", other)],
    }
}

/// `name: before → after` for each field that differs.
fn differences(before: &Value, after: &Value) -> Vec<String> {
    match (before, after) {
        (Value::Object(b), Value::Object(a)) => {
            let mut keys: Vec<&String> = b.keys().chain(a.keys()).collect();
            keys.sort();
            keys.dedup();
            keys.into_iter()
                .filter_map(|k| {
                    let (x, y) = (
                        b.get(k).unwrap_or(&Value::Null),
                        a.get(k).unwrap_or(&Value::Null),
                    );
                    (plain(k, x) != plain(k, y)).then(|| {
                        let name = k.replace('_', " ");
                        match (is_empty(x), is_empty(y)) {
                            (true, _) => format!("{name} {}", plain(k, y)),
                            (false, true) => format!("{name} {} removed", plain(k, x)),
                            _ => format!("{name} {} → {}", plain(k, x), plain(k, y)),
                        }
                    })
                })
                .collect()
        }
        (x, y) => vec![format!("{} → {}", plain("", x), plain("", y))],
    }
}

fn is_empty(value: &Value) -> bool {
    match value {
        Value::Null => true,
        Value::String(s) => s.is_empty(),
        Value::Array(a) => a.is_empty(),
        _ => false,
    }
}

/// A value for reading: numbers to four significant figures (no `-0`), a list of points
/// counted with its temperature range, other lists joined, records in brackets.
fn plain(key: &str, value: &Value) -> String {
    match value {
        Value::Null => "-".into(),
        Value::Bool(b) => if *b { "yes" } else { "no" }.into(),
        Value::Number(n) => n.as_f64().map_or_else(|| n.to_string(), number),
        Value::String(s) => s.clone(),
        Value::Array(items) if key == "points" => points(items),
        Value::Array(items) => items
            .iter()
            .map(|v| plain("", v))
            .collect::<Vec<_>>()
            .join(", "),
        Value::Object(_) => format!("({})", fields(value).join(", ")),
    }
}

fn number(x: f64) -> String {
    let rounded = round_significant(x, 4);
    display(if rounded == 0.0 { 0.0 } else { rounded })
}

/// "5 points, 0 to 40 °C" for a dataset's points.
fn points(items: &[Value]) -> String {
    let temperatures: Vec<f64> = items
        .iter()
        .filter_map(|p| p.get("temperature_k").and_then(Value::as_f64))
        .map(|k| k - 273.15)
        .collect();
    let count = items.len();
    let noun = if count == 1 { "point" } else { "points" };
    match (
        temperatures.iter().copied().reduce(f64::min),
        temperatures.iter().copied().reduce(f64::max),
    ) {
        (Some(low), Some(high)) => format!(
            "{count} {noun}, {} to {} °C",
            number((low * 100.0).round() / 100.0),
            number((high * 100.0).round() / 100.0)
        ),
        _ => format!("{count} {noun}"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn an_added_dataset_reads_in_words_with_rounded_numbers() {
        let after = json!({
            "key": "demo/table",
            "phase": {"formula": "RbNO3", "name": "anhydrous", "water": -0.0},
            "points": [
                {"mass_fraction": 0.16317991631799164, "temperature_k": 273.15},
                {"mass_fraction": 0.248120300751879, "temperature_k": 313.15}
            ],
            "note": null
        });
        let text = summary("add", None, Some(&after));
        assert!(text.contains("points 2 points, 0 to 40 °C"), "{text}");
        assert!(text.contains("water 0"), "{text}");
        assert!(
            !text.contains("-0") && !text.contains("0.1631799"),
            "{text}"
        );
        assert!(!text.contains("note"), "{text}");
    }

    #[test]
    fn an_approval_says_what_changed() {
        let before = json!({"review": "unreviewed"});
        let after = json!({"review": "reviewed", "note": "checked"});
        let text = summary("approve", Some(&before), Some(&after));
        assert_eq!(text, "note checked; review unreviewed → reviewed");
    }

    #[test]
    fn the_table_has_a_row_per_change() {
        let entries = vec![AuditEntry {
            id: 1,
            time: "2026-12-02T12:21:52Z".into(),
            actor: "bob".into(),
            action: "approve".into(),
            entity: "dataset:demo/table".into(),
            before: Some(json!({"review": "unreviewed"})),
            after: Some(json!({"review": "reviewed"})),
        }];
        let mut out = Vec::new();
        write("demo", &entries, Some(80), &mut out).unwrap();
        let text = String::from_utf8(out).unwrap();
        assert!(text.starts_with("history of demo: 1 change\n"), "{text}");
        // At 80 columns the time may wrap inside its cell.
        assert!(
            text.contains("2026-12-02") && text.contains("12:21:52"),
            "{text}"
        );
        assert!(text.contains("review unreviewed"), "{text}");
        assert!(text.lines().all(|l| l.chars().count() <= 80), "{text}");
    }
}
