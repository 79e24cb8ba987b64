//! Text helpers every layer shares: the one edit distance behind every "did you mean"
//! (keywords, units, solute names, filter values), the cut that keeps an echoed value
//! short, the filling of words into lines, and lists said as a sentence says them.

/// Edit distance over characters, ignoring case: insertions, deletions, substitutions and
/// swaps of two neighbours (`form` for `from`) each count one. Long inputs are cut to 64
/// characters: nothing that long is a misspelt keyword.
pub fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.to_lowercase().chars().take(64).collect();
    let b: Vec<char> = b.to_lowercase().chars().take(64).collect();
    // d[i][j]: distance between the first i characters of a and the first j of b.
    let mut d = vec![vec![0usize; b.len() + 1]; a.len() + 1];
    for (i, row) in d.iter_mut().enumerate() {
        row[0] = i;
    }
    for (j, cell) in d[0].iter_mut().enumerate() {
        *cell = j;
    }
    for i in 1..=a.len() {
        for j in 1..=b.len() {
            let cost = usize::from(a[i - 1] != b[j - 1]);
            let mut best = (d[i - 1][j] + 1)
                .min(d[i][j - 1] + 1)
                .min(d[i - 1][j - 1] + cost);
            if i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1] {
                best = best.min(d[i - 2][j - 2] + 1);
            }
            d[i][j] = best;
        }
    }
    d[a.len()][b.len()]
}

/// The longest value echoed in a message, in characters.
pub const ECHO_CHARS: usize = 60;

/// `text` cut to [`ECHO_CHARS`] characters with an ellipsis and the full length, so a
/// pasted megabyte is never echoed back.
pub fn cut(text: &str) -> String {
    let count = text.chars().count();
    if count <= ECHO_CHARS {
        return text.to_string();
    }
    let head: String = text.chars().take(ECHO_CHARS).collect();
    format!("{head}… ({count} characters)")
}

/// `items` as a sentence lists them: "a", "a and b", "a, b and c" with `conjunction`
/// `and` (`or` makes "a, b or c").
pub fn series(items: &[String], conjunction: &str) -> String {
    match items.split_last() {
        None => String::new(),
        Some((last, [])) => last.clone(),
        Some((last, rest)) => format!("{} {conjunction} {last}", rest.join(", ")),
    }
}

/// `words` laid into lines of at most `width` characters, joined by newlines: the first line
/// after `first`, the others after `indent`. A word longer than a line stays whole on a line
/// of its own; with no width, one line. Callers choose how their text splits into words
/// (notes fold runs of white space, a fault's message keeps them).
pub fn fill<'a>(
    words: impl IntoIterator<Item = &'a str>,
    width: Option<usize>,
    first: &str,
    indent: &str,
) -> String {
    let mut lines: Vec<String> = Vec::new();
    let mut line = first.to_string();
    let mut empty = true;
    for word in words {
        let fits = width.is_none_or(|w| line.chars().count() + 1 + word.chars().count() <= w);
        if !empty && !fits {
            lines.push(std::mem::replace(&mut line, indent.to_string()));
            empty = true;
        }
        if !empty {
            line.push(' ');
        }
        line.push_str(word);
        empty = false;
    }
    lines.push(line);
    lines.join("\n")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_series_joins_its_last_item_with_the_conjunction() {
        let items = |list: &[&str]| list.iter().map(|s| s.to_string()).collect::<Vec<_>>();
        assert_eq!(series(&[], "and"), "");
        assert_eq!(series(&items(&["a"]), "and"), "a");
        assert_eq!(series(&items(&["a", "b"]), "or"), "a or b");
        assert_eq!(series(&items(&["a", "b", "c"]), "and"), "a, b and c");
    }

    #[test]
    fn edit_distance_counts_single_changes_and_swaps() {
        assert_eq!(edit_distance("solubilty", "solubility"), 1);
        assert_eq!(edit_distance("AT", "at"), 0);
        assert_eq!(edit_distance("", "at"), 2);
        assert_eq!(edit_distance("form", "from"), 1);
        assert_eq!(edit_distance("kitten", "sitting"), 3);
    }

    #[test]
    fn long_echoes_are_cut_with_their_length() {
        let long = "x".repeat(ECHO_CHARS + 5);
        assert_eq!(
            cut(&long),
            format!(
                "{}… ({} characters)",
                "x".repeat(ECHO_CHARS),
                ECHO_CHARS + 5
            )
        );
        assert_eq!(cut("KNO3"), "KNO3");
    }
}
