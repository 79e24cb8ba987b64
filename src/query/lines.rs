//! Line and column of a byte offset, found in one pass over a text: the offsets where its
//! lines start are collected once, then each position is a binary search plus a count of
//! the characters before it on its own line. A script of n statements is located in
//! O(n log n) rather than O(n²) (counting from the start of the text for every statement).

/// The byte offsets where the lines of one text start.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LineIndex {
    starts: Vec<usize>,
}

impl LineIndex {
    /// Indexes `text` (one pass).
    pub fn new(text: &str) -> Self {
        let mut starts = vec![0];
        starts.extend(
            text.bytes()
                .enumerate()
                .filter(|&(_, b)| b == b'\n')
                .map(|(i, _)| i + 1),
        );
        LineIndex { starts }
    }

    /// Line and column (both from 1, the column in characters) of byte `offset` of the
    /// indexed `text`; the same as [`super::line_column`].
    pub fn line_column(&self, text: &str, offset: usize) -> (usize, usize) {
        let mut at = offset.min(text.len());
        while !text.is_char_boundary(at) {
            at -= 1;
        }
        // The last line start at or before `at`.
        let line = self.starts.partition_point(|&s| s <= at);
        let line_start = self.starts[line.saturating_sub(1)];
        let column = text.get(line_start..at).map_or(0, |s| s.chars().count()) + 1;
        (line.max(1), column)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::query::line_column;

    #[test]
    fn agrees_with_counting_from_the_start() {
        let text = "a\nb°c x\n\n;; y\r\nlast";
        let index = LineIndex::new(text);
        for offset in 0..=text.len() + 3 {
            assert_eq!(
                index.line_column(text, offset),
                line_column(text, offset),
                "offset {offset}"
            );
        }
    }
}
