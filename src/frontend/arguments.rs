//! Statements given as command-line arguments: words typed without quotes
//! (`satline solubility of KNO3 at 20 C`) are joined into the statement they form.

use crate::query::lexicon::STATEMENT_WORDS;
use crate::query::{Env, parse_with};

/// The statements of the arguments, and a hint when words were joined into a statement
/// that does not read.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Grouped {
    pub statements: Vec<String>,
    pub hint: Option<String>,
}

/// Groups the arguments into statements. An argument holding a blank or a `;` is one or
/// more whole statements, as written. A run of one-word arguments is joined by blanks into
/// one statement when that reads; otherwise it is split where a statement word begins an
/// argument, when every piece reads; otherwise it stays joined (its fault is reported
/// once) and the hint says to quote each statement.
pub fn group(arguments: &[String]) -> Grouped {
    let mut env = Env::new();
    let mut grouped = Grouped {
        statements: Vec::new(),
        hint: None,
    };
    let mut run: Vec<&str> = Vec::new();
    for argument in arguments {
        if argument.contains(|c: char| c.is_whitespace() || c == ';') {
            flush(&mut run, &mut env, &mut grouped);
            reads(argument, &mut env);
            grouped.statements.push(argument.clone());
        } else {
            run.push(argument);
        }
    }
    flush(&mut run, &mut env, &mut grouped);
    grouped
}

/// Parses `text` in a copy of `env`; on success the copy (with any `let` it binds) becomes
/// `env`.
fn reads(text: &str, env: &mut Env) -> bool {
    let mut trial = env.clone();
    let ok = parse_with(text, &mut trial).iter().all(Result::is_ok);
    if ok {
        *env = trial;
    }
    ok
}

fn flush(run: &mut Vec<&str>, env: &mut Env, grouped: &mut Grouped) {
    if run.is_empty() {
        return;
    }
    let joined = run.join(" ");
    if run.len() == 1 || reads(&joined, env) {
        grouped.statements.push(joined);
        run.clear();
        return;
    }
    // Several statements typed one after another: split where a statement word begins.
    let mut pieces: Vec<Vec<&str>> = Vec::new();
    for word in run.iter() {
        let starts = STATEMENT_WORDS.contains(&word.to_lowercase().as_str());
        match pieces.last_mut() {
            Some(piece) if !starts => piece.push(word),
            _ => pieces.push(vec![word]),
        }
    }
    let texts: Vec<String> = pieces.iter().map(|p| p.join(" ")).collect();
    let mut trial = env.clone();
    if texts.len() > 1 && texts.iter().all(|t| reads(t, &mut trial)) {
        *env = trial;
        grouped.statements.extend(texts);
    } else {
        grouped.hint = Some(format!(
            "the words given without quotes were read as one statement, `{joined}`; to give \
             several statements, quote each one (satline \"describe NaCl\" \"describe KCl\")"
        ));
        grouped.statements.push(joined);
    }
    run.clear();
}

#[cfg(test)]
mod tests {
    use super::*;

    fn args(words: &str) -> Vec<String> {
        words.split(' ').map(str::to_string).collect()
    }

    #[test]
    fn words_without_quotes_form_one_statement() {
        let g = group(&args("solubility of KNO3 at 20 C"));
        assert_eq!(g.statements, ["solubility of KNO3 at 20 C"]);
        assert_eq!(g.hint, None);
    }

    #[test]
    fn quoted_statements_stay_as_written() {
        let given = vec!["describe NaCl".to_string(), "sources".to_string()];
        let g = group(&given);
        assert_eq!(g.statements, ["describe NaCl", "sources"]);
    }

    #[test]
    fn statements_one_after_another_are_split_where_each_begins() {
        let g = group(&args("describe NaCl solubility of KNO3 at 20 C"));
        assert_eq!(
            g.statements,
            ["describe NaCl", "solubility of KNO3 at 20 C"]
        );
        assert_eq!(g.hint, None);
    }

    #[test]
    fn words_that_do_not_read_stay_one_statement_with_a_hint() {
        let g = group(&args("solubility of KNO3 at 20 g/L"));
        assert_eq!(g.statements, ["solubility of KNO3 at 20 g/L"]);
        assert!(g.hint.is_some_and(|h| h.contains("quote")));
    }

    #[test]
    fn a_name_bound_in_an_earlier_argument_is_known() {
        let given = vec!["let cold = 2-8 C".to_string()];
        let mut all = given.clone();
        all.extend(args("ceiling of KCl over cold"));
        let g = group(&all);
        assert_eq!(
            g.statements,
            ["let cold = 2-8 C", "ceiling of KCl over cold"]
        );
    }
}
