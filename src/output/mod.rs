//! Renders answers: a table for people, JSON lines for programs, CSV for spreadsheets.
//! All three read the same `Answer`; none computes anything.

pub mod csv;
pub mod headings;
pub mod json;
pub mod notes;
pub mod report;
pub mod table;

use std::io::{self, Write};

use crate::answer::Answer;

/// The output formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Format {
    #[default]
    Table,
    Json,
    Csv,
}

impl Format {
    pub const NAMES: [&'static str; 3] = ["table", "json", "csv"];

    pub fn from_name(name: &str) -> Option<Self> {
        match name.to_ascii_lowercase().as_str() {
            "table" => Some(Format::Table),
            "json" => Some(Format::Json),
            "csv" => Some(Format::Csv),
            _ => None,
        }
    }

    pub fn name(self) -> &'static str {
        match self {
            Format::Table => "table",
            Format::Json => "json",
            Format::Csv => "csv",
        }
    }
}

/// Writes answers one after another in a format. CSV writes its header once, before the
/// first answer.
pub struct Printer<W: Write> {
    out: W,
    format: Format,
    wrote_header: bool,
    table: table::TableWriter,
}

impl<W: Write> Printer<W> {
    pub fn new(out: W, format: Format) -> Self {
        Printer {
            out,
            format,
            wrote_header: false,
            table: table::TableWriter::default(),
        }
    }

    /// The same printer, laying tables out (and remembering the notes shown) with `table`.
    pub fn with_table(mut self, table: table::TableWriter) -> Self {
        self.table = table;
        self
    }

    /// The table writer, with what it remembers of the notes shown, for the next printer.
    pub fn table(&self) -> &table::TableWriter {
        &self.table
    }

    /// Writes one answer; `script` is the text the answer's error spans point into.
    pub fn print(&mut self, answer: &Answer, script: &str) -> io::Result<()> {
        match self.format {
            Format::Table => self.table.write(&mut self.out, answer, script),
            Format::Json => json::write_answer(&mut self.out, answer),
            Format::Csv => {
                if !self.wrote_header {
                    csv::write_header(&mut self.out)?;
                    self.wrote_header = true;
                }
                csv::write_answer(&mut self.out, answer)
            }
        }
    }

    pub fn flush(&mut self) -> io::Result<()> {
        self.out.flush()
    }

    pub fn into_inner(self) -> W {
        self.out
    }
}
