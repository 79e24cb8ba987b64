//! The progress of an import on standard error: indicatif's bar when standard error is a
//! terminal, and otherwise (a log file, a CI job, a pipe) plain lines every few seconds
//! while the import plans and writes, so a long import is never silent. A short import
//! prints nothing: the first line comes only after the first interval.

use std::io::{IsTerminal, Write};
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::{Arc, mpsc};
use std::thread::JoinHandle;
use std::time::{Duration, Instant};

use crate::librarian::Progress;
use crate::store::ImportFile;

/// How often a line is written when standard error is not a terminal.
pub const LINE_EVERY: Duration = Duration::from_secs(3);

/// Overrides [`LINE_EVERY`], in milliseconds (for tests and impatient logs).
pub const LINE_EVERY_VAR: &str = "SATLINE_PROGRESS_EVERY_MS";

/// `total` while the import is still planning.
const PLANNING: u64 = u64::MAX;

/// What the line printer and the import share.
struct State {
    started: Instant,
    /// CSV rows and files being planned, for the planning line.
    rows: u64,
    files: usize,
    /// Points to write ([`PLANNING`] until the plan is made) and points written so far.
    total: AtomicU64,
    written: AtomicU64,
    /// Whether any line was written (then the end gets a line too).
    spoke: AtomicBool,
}

impl State {
    fn line(&self) -> String {
        let seconds = self.started.elapsed().as_secs();
        let total = self.total.load(Ordering::Relaxed);
        if total == PLANNING {
            let files = if self.files == 1 { "file" } else { "files" };
            return format!(
                "satline: import: planning {} {files} ({} CSV rows), {seconds} s",
                self.files, self.rows
            );
        }
        let written = self.written.load(Ordering::Relaxed);
        let percent = written
            .saturating_mul(100)
            .checked_div(total)
            .unwrap_or(100);
        format!("satline: import: writing, {written} of {total} points ({percent} %), {seconds} s")
    }
}

/// The progress display of one import; call [`ImportProgress::step`] with each step and
/// [`ImportProgress::finish`] at the end (dropping it stops the lines too).
pub struct ImportProgress {
    state: Arc<State>,
    bar: Option<indicatif::ProgressBar>,
    terminal: bool,
    printer: Option<(mpsc::Sender<()>, JoinHandle<()>)>,
}

impl ImportProgress {
    /// Starts the display for an import of `files`: on a terminal the bar comes once the
    /// plan says how many points; elsewhere a line every [`LINE_EVERY`] from now on.
    pub fn start(files: &[ImportFile]) -> ImportProgress {
        let terminal = std::io::stderr().is_terminal();
        let every = std::env::var(LINE_EVERY_VAR)
            .ok()
            .and_then(|v| v.parse::<u64>().ok())
            .filter(|&ms| ms > 0)
            .map_or(LINE_EVERY, Duration::from_millis);
        Self::new(files, terminal, every)
    }

    fn new(files: &[ImportFile], terminal: bool, every: Duration) -> ImportProgress {
        let rows = files
            .iter()
            .filter(|f| f.path.ends_with(".csv"))
            .map(|f| (f.text.lines().count() as u64).saturating_sub(1))
            .sum();
        let state = Arc::new(State {
            started: Instant::now(),
            rows,
            files: files.len(),
            total: AtomicU64::new(PLANNING),
            written: AtomicU64::new(0),
            spoke: AtomicBool::new(false),
        });
        let printer = if terminal {
            None
        } else {
            let (stop, stopped) = mpsc::channel::<()>();
            let shared = Arc::clone(&state);
            // Without a thread there are no lines, and the import itself goes on.
            std::thread::Builder::new()
                .name("satline-progress".into())
                .spawn(move || {
                    while let Err(mpsc::RecvTimeoutError::Timeout) = stopped.recv_timeout(every) {
                        shared.spoke.store(true, Ordering::Relaxed);
                        // A line that cannot be written cannot be reported either.
                        let _ = writeln!(std::io::stderr().lock(), "{}", shared.line());
                    }
                })
                .ok()
                .map(|thread| (stop, thread))
        };
        ImportProgress {
            state,
            bar: None,
            terminal,
            printer,
        }
    }

    /// One step of the import.
    pub fn step(&mut self, step: Progress) {
        match step {
            Progress::Planned(points) => {
                self.state.total.store(points as u64, Ordering::Relaxed);
                if self.terminal {
                    self.bar = crate::store::import::progress_bar(points);
                }
            }
            Progress::Point => {
                self.state.written.fetch_add(1, Ordering::Relaxed);
                if let Some(bar) = &self.bar {
                    bar.inc(1);
                }
            }
            Progress::Done => self.stop(),
        }
    }

    /// Ends the display; after any progress line, one more says how it ended.
    pub fn finish(mut self) {
        self.stop();
    }

    fn stop(&mut self) {
        if let Some(bar) = self.bar.take() {
            bar.finish_and_clear();
        }
        let Some((stop, thread)) = self.printer.take() else {
            return;
        };
        let _ = stop.send(());
        let _ = thread.join();
        if self.state.spoke.load(Ordering::Relaxed) {
            let seconds = self.state.started.elapsed().as_secs_f64();
            let total = self.state.total.load(Ordering::Relaxed);
            let line = if total == PLANNING {
                format!("satline: import: planned in {seconds:.1} s")
            } else {
                format!(
                    "satline: import: {} points written in {seconds:.1} s",
                    self.state.written.load(Ordering::Relaxed)
                )
            };
            let _ = writeln!(std::io::stderr().lock(), "{line}");
        }
    }
}

impl Drop for ImportProgress {
    fn drop(&mut self) {
        self.stop();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn csv(rows: usize) -> ImportFile {
        let mut text = String::from("solute,value\n");
        for _ in 0..rows {
            text.push_str("x,1\n");
        }
        ImportFile {
            path: "rows.csv".into(),
            text,
        }
    }

    #[test]
    fn lines_say_the_phase_and_how_far() {
        let mut progress = ImportProgress::new(&[csv(5)], true, LINE_EVERY);
        assert!(
            progress
                .state
                .line()
                .starts_with("satline: import: planning 1 file (5 CSV rows), "),
            "{}",
            progress.state.line()
        );
        progress.step(Progress::Planned(4));
        progress.step(Progress::Point);
        assert!(
            progress
                .state
                .line()
                .starts_with("satline: import: writing, 1 of 4 points (25 %), "),
            "{}",
            progress.state.line()
        );
        progress.finish();
    }

    #[test]
    fn a_short_import_says_nothing() {
        let mut progress = ImportProgress::new(&[csv(1)], false, Duration::from_secs(60));
        progress.step(Progress::Planned(1));
        progress.step(Progress::Point);
        progress.step(Progress::Done);
        assert!(!progress.state.spoke.load(Ordering::Relaxed));
    }
}
