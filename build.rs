//! Embeds every file under `seed-data/` into the binary, so the default database can be
//! built with no files beside the executable.
use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::{env, fs};

fn collect(dir: &Path, out: &mut Vec<PathBuf>) -> std::io::Result<()> {
    let mut entries: Vec<_> = fs::read_dir(dir)?.collect::<Result<_, _>>()?;
    entries.sort_by_key(|e| e.path());
    for entry in entries {
        let path = entry.path();
        if path.is_dir() {
            collect(&path, out)?;
        } else if path.extension().and_then(|e| e.to_str()) == Some("toml") {
            out.push(path);
        }
    }
    Ok(())
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let root = PathBuf::from(env::var("CARGO_MANIFEST_DIR")?);
    let seed = root.join("seed-data");
    println!("cargo:rerun-if-changed=seed-data");
    let mut files = Vec::new();
    if seed.is_dir() {
        collect(&seed, &mut files)?;
    }
    let mut code = String::from(
        "/// Seed files compiled into the binary: (path relative to seed-data/, contents).\npub static SEED_FILES: &[(&str, &str)] = &[\n",
    );
    for file in &files {
        println!("cargo:rerun-if-changed={}", file.display());
        let rel = file
            .strip_prefix(&seed)?
            .to_string_lossy()
            .replace('\\', "/");
        writeln!(
            code,
            "    ({rel:?}, include_str!({:?})),",
            file.display().to_string()
        )?;
    }
    code.push_str("];\n");
    let out = PathBuf::from(env::var("OUT_DIR")?).join("seed_files.rs");
    fs::write(out, code)?;
    Ok(())
}
