//! The files an `import` reads: a directory (such as the one `export --to toml` writes)
//! stands for every `.toml` and `.csv` file under it, its `sources.toml` first, so that
//! the sources are known before the records that cite them.

use std::path::{Path, PathBuf};

/// The files named, with each directory replaced by the data files under it (sorted, a
/// `sources.toml` first). A name that is neither a file nor a directory is kept as given,
/// so reading it reports the fault.
pub fn expand(named: &[PathBuf]) -> Result<Vec<PathBuf>, std::io::Error> {
    let mut files = Vec::new();
    for path in named {
        if path.is_dir() {
            let mut found = Vec::new();
            collect(path, &mut found)?;
            found.sort_by_key(|p| (!is_sources(p), p.clone()));
            files.extend(found);
        } else {
            files.push(path.clone());
        }
    }
    Ok(files)
}

fn is_sources(path: &Path) -> bool {
    path.file_name().is_some_and(|n| n == "sources.toml")
}

fn collect(dir: &Path, found: &mut Vec<PathBuf>) -> Result<(), std::io::Error> {
    for entry in std::fs::read_dir(dir)? {
        let path = entry?.path();
        if path.is_dir() {
            collect(&path, found)?;
        } else if path
            .extension()
            .is_some_and(|x| x.eq_ignore_ascii_case("toml") || x.eq_ignore_ascii_case("csv"))
        {
            found.push(path);
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_directory_stands_for_its_data_files_sources_first() {
        let dir = tempfile::tempdir().unwrap();
        std::fs::create_dir(dir.path().join("solutes")).unwrap();
        for name in [
            "solutes/b.toml",
            "solutes/a.toml",
            "sources.toml",
            "notes.txt",
        ] {
            std::fs::write(dir.path().join(name), "").unwrap();
        }
        let files = expand(&[dir.path().to_path_buf()]).unwrap();
        let names: Vec<String> = files
            .iter()
            .map(|p| p.strip_prefix(dir.path()).unwrap().display().to_string())
            .collect();
        assert_eq!(names, ["sources.toml", "solutes/a.toml", "solutes/b.toml"]);
    }
}
