//! The satline command line: reads arguments and dispatches to the library.
use std::process::ExitCode;

fn main() -> ExitCode {
    let _ = satline::seed_files::SEED_FILES.len();
    ExitCode::SUCCESS
}
