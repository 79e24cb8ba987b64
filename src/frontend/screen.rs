//! The terminal as a screen: its width (tables are fitted to it), the layout the command
//! line's `--width` and `--full` ask for, and clearing it (`clear`, Ctrl-L in the session).

use std::io::{self, IsTerminal, Write};

use crate::output::table::Layout;

/// The width of the terminal standard output writes to, when it is one and says so;
/// `COLUMNS` when the terminal does not say.
pub fn terminal_width() -> Option<usize> {
    let term = console::Term::stdout();
    term.size_checked()
        .map(|(_, columns)| usize::from(columns))
        .or_else(|| {
            std::env::var("COLUMNS")
                .ok()
                .and_then(|c| c.trim().parse().ok())
        })
}

/// The layout of tables for standard output: `--width` when given; on a terminal its width
/// (80 when unknown); to a pipe or a file, the full text. `--full` keeps every column and
/// writes notes and citations in full.
pub fn layout(width: Option<usize>, full: bool) -> Layout {
    match width {
        Some(w) => Layout {
            width: Some(w.max(crate::output::table::MIN_WIDTH)),
            full,
        },
        None if io::stdout().is_terminal() => Layout::terminal(terminal_width(), full),
        None => Layout::FULL,
    }
}

/// The control sequence that clears a terminal and puts the cursor at its top left (ECMA-48:
/// ED 2 erases the display, CUP moves the cursor home).
pub const CLEAR: &str = "\x1b[H\x1b[2J";

/// Clears the screen `out` writes to.
pub fn clear(out: &mut impl Write) -> io::Result<()> {
    write!(out, "{CLEAR}")?;
    out.flush()
}
