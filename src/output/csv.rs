//! CSV output: one line per row of every answer, under one fixed header, so a whole script
//! makes one table.

use std::io::{self, Write};

use crate::answer::Answer;
use crate::number::display;

const HEADER: [&str; 12] = [
    "statement",
    "kind",
    "ok",
    "solute",
    "quantity",
    "value",
    "unit",
    "basis",
    "phase",
    "temperature_c",
    "holds",
    "headroom_pct",
];

pub fn write_header(out: &mut impl Write) -> io::Result<()> {
    let mut writer = csv::Writer::from_writer(out);
    writer.write_record(HEADER).map_err(io::Error::other)?;
    writer.flush()
}

/// Writes the rows of one answer; an answer without rows (or a failed one) still gets one
/// line, so every statement is accounted for.
pub fn write_answer(out: &mut impl Write, answer: &Answer) -> io::Result<()> {
    let mut writer = csv::Writer::from_writer(out);
    let number = |v: Option<f64>| v.map(display).unwrap_or_default();
    let flag = |v: Option<bool>| v.map(|b| b.to_string()).unwrap_or_default();
    let ok = answer.ok.to_string();
    if answer.rows.is_empty() {
        let message = answer
            .error
            .as_ref()
            .map(|e| e.message.clone())
            .unwrap_or_default();
        let holds = flag(answer.holds);
        writer
            .write_record([
                answer.statement.as_str(),
                answer.kind.as_str(),
                &ok,
                "",
                &message,
                "",
                "",
                "",
                "",
                "",
                &holds,
                "",
            ])
            .map_err(io::Error::other)?;
    }
    for row in answer.rows.each() {
        let basis = row.basis.map(|b| b.as_str()).unwrap_or_default();
        writer
            .write_record([
                answer.statement.as_str(),
                answer.kind.as_str(),
                &ok,
                row.solute.as_deref().unwrap_or_default(),
                row.quantity.as_deref().unwrap_or_default(),
                &number(row.value),
                row.unit.as_deref().unwrap_or_default(),
                basis,
                row.phase.as_deref().unwrap_or_default(),
                &number(row.temperature_c),
                &flag(row.holds),
                &number(row.headroom_pct),
            ])
            .map_err(io::Error::other)?;
    }
    writer.flush()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::answer::{AnswerKind, Row};

    #[test]
    fn rows_quote_commas() {
        let mut answer = Answer::new("list salts, please", AnswerKind::List);
        answer.rows.push(Row {
            solute: Some("sodium chloride".into()),
            ..Row::default()
        });
        let mut buf = Vec::new();
        write_header(&mut buf).unwrap();
        write_answer(&mut buf, &answer).unwrap();
        let text = String::from_utf8(buf).unwrap();
        let mut lines = text.lines();
        assert!(lines.next().unwrap().starts_with("statement,kind,ok"));
        assert!(
            lines
                .next()
                .unwrap()
                .starts_with("\"list salts, please\",list,true,sodium chloride")
        );
    }
}
