//! JSON output: one object per answer, on one line. The shape is the contract documented in
//! grammar/README.md ("The answer").

use std::io::{self, Write};

use crate::answer::Answer;

/// Writes one answer as a single line of JSON.
pub fn write_answer(out: &mut impl Write, answer: &Answer) -> io::Result<()> {
    serde_json::to_writer(&mut *out, answer).map_err(io::Error::other)?;
    out.write_all(b"\n")
}

/// One answer as a JSON value (for the server and for tests).
pub fn to_value(answer: &Answer) -> serde_json::Value {
    serde_json::to_value(answer).unwrap_or(serde_json::Value::Null)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::answer::{AnswerKind, Basis, Row};

    #[test]
    fn one_line_with_contract_fields() {
        let mut answer = Answer::new("solubility of KNO3 at 20 C", AnswerKind::Lookup);
        answer.rows.push(Row {
            solute: Some("potassium nitrate".into()),
            value: Some(31.6),
            unit: Some("g/100g water".into()),
            basis: Some(Basis::Tabulated),
            ..Row::default()
        });
        let mut buf = Vec::new();
        write_answer(&mut buf, &answer).unwrap();
        let text = String::from_utf8(buf).unwrap();
        assert_eq!(text.lines().count(), 1);
        let v: serde_json::Value = serde_json::from_str(&text).unwrap();
        assert_eq!(v["kind"], "lookup");
        assert_eq!(v["ok"], true);
        assert_eq!(v["rows"][0]["value"], 31.6);
        assert_eq!(v["rows"][0]["basis"], "tabulated");
        assert!(v["rows"][0].get("holds").is_none());
    }
}
