//! Line and column of a byte offset, found without counting from the start of the text for
//! every position: a cursor remembers the start of the line it found last and its number,
//! and the next position is found from there, counting only the newlines between the two.
//! A script's statements are located in order, so a script of any length is located in one
//! pass over its text (O(n), rather than O(n²) counting from the start each time), and the
//! cursor holds two numbers whatever the length (no table of line starts that grows with
//! the script). A position before the cursor is found by counting back to it.

use std::cell::Cell;

/// Where the lines of one text are found: the start of the line located last and its
/// number, moved as positions are asked.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LineIndex {
    /// (byte offset where a line starts, its line number from 1).
    at: Cell<(usize, usize)>,
}

impl LineIndex {
    /// A cursor at the start of `text` (nothing is read yet: the text is read as positions
    /// are asked).
    pub fn new(_text: &str) -> Self {
        LineIndex {
            at: Cell::new((0, 1)),
        }
    }

    /// Line and column (both from 1, the column in characters) of byte `offset` of `text`
    /// (the same text at every call); the same as [`super::line_column`].
    pub fn line_column(&self, text: &str, offset: usize) -> (usize, usize) {
        let mut at = offset.min(text.len());
        while !text.is_char_boundary(at) {
            at -= 1;
        }
        let (mut start, mut line) = self.at.get();
        if start > 0 && text.as_bytes().get(start - 1) != Some(&b'\n') {
            // Not a line start of this text: begin again from the top.
            (start, line) = (0, 1);
        }
        if at >= start {
            // Forward: the newlines between the cursor and the position.
            let gap = &text[start..at];
            if let Some(last) = gap.rfind('\n') {
                line += newlines(&gap[..=last]);
                start += last + 1;
            }
        } else {
            // Back: the newlines passed over, then the start of the position's own line.
            line -= newlines(&text[at..start]);
            start = text[..at].rfind('\n').map_or(0, |i| i + 1);
        }
        self.at.set((start, line));
        (line, text[start..at].chars().count() + 1)
    }
}

fn newlines(text: &str) -> usize {
    text.bytes().filter(|&b| b == b'\n').count()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::query::line_column;

    /// Finds each of `offsets` in `text` in the order given, as counting from the start does.
    fn agrees(text: &str, offsets: impl IntoIterator<Item = usize>) {
        let index = LineIndex::new(text);
        for offset in offsets {
            assert_eq!(
                index.line_column(text, offset),
                line_column(text, offset),
                "offset {offset}"
            );
        }
    }

    #[test]
    fn agrees_with_counting_from_the_start() {
        let text = "a\nb°c x\n\n;; y\r\nlast";
        agrees(text, 0..=text.len() + 3);
    }

    #[test]
    fn agrees_in_any_order_of_positions() {
        let text = "one\n\ntwo°three\nfour\n\n\nfive é\n";
        // Backwards, then jumping about.
        let mut offsets: Vec<usize> = (0..=text.len() + 2).rev().collect();
        offsets.extend([3, 20, 0, 11, 4, 5, 27, 1, text.len(), 6]);
        agrees(text, offsets);
    }

    #[test]
    fn a_cursor_from_a_longer_text_starts_again_from_the_top() {
        let long = "a\nb\nc\nd";
        let index = LineIndex::new(long);
        assert_eq!(index.line_column(long, 6), (4, 1));
        assert_eq!(index.line_column("x\ny", 2), (2, 1));
    }
}
